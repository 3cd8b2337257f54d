"""Flow around a spinning cylinder: the ideal flow, its surface pressure and Kutta-Joukowski lift."""

import streamlit as st

from liftcore.errors import InputError
from liftcore.studies import study as study_module
from views import common

study = study_module("flow")

st.title("Flow around a spinning cylinder")
st.caption(
    "Ideal (inviscid) flow: a uniform stream, a doublet and a vortex. It shows why spin makes lift; "
    "it does not give real forces, because a real cylinder's boundary layer separates and makes "
    "far less lift. Change the inputs in the sidebar."
)

with st.sidebar:
    values = common.render_inputs(study.INPUTS, show_if={
        "spin_ratio": lambda v: v["spin_mode"] == "ratio",
        "spin_rpm": lambda v: v["spin_mode"] == "rpm",
        **common.AIR_SHOW_IF,
    })
common.page_tools(study)

try:
    result = common.run_cached(study.KIND, values, label="Computing the flow")
except InputError as exc:
    st.error(str(exc), icon=":material/error:")
    st.stop()

common.show_headlines(result)
common.show_warnings(common.general_warnings(result))
st.markdown(f"**{study.stagnation_text(result.detail)}**")
st.caption(study.SIGN_CONVENTION)

figs = common.study_figures(study, result)
left, right = st.columns([1.15, 1])
with left:
    common.show_figure(figs["Streamlines"], key="flow_streamlines")
with right:
    common.show_figure(figs["Surface pressure"], key="flow_cp")
left, right = st.columns(2)
with left:
    common.show_figure(figs["Pressure integral check"], key="flow_check")
with right:
    common.show_figure(figs["Ideal lift coefficient"], key="flow_cl")

with st.expander("Surface table (every 5°)"):
    surface = common.study_tables(study, result)["surface"]
    st.dataframe(surface, hide_index=True, width="stretch")
    st.download_button("Download as CSV", surface.to_csv(index=False),
                       file_name="spinning_cylinder_surface.csv", mime="text/csv")

common.show_sources_and_cautions(study)
