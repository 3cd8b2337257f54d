"""Flow around a spinning cylinder: the ideal flow, its surface pressure and Kutta-Joukowski lift."""

import streamlit as st

from liftcore.studies import study as study_module
from liftcore.files import csv_text
from views import inputs, results, tools

study = study_module("flow")

st.title("Flow around a spinning cylinder")
st.caption(
    "Ideal (inviscid) flow: a uniform stream, a doublet and a vortex. It shows why spin makes lift; "
    "it does not give real forces, because a real cylinder's boundary layer separates and makes "
    "far less lift. Change the inputs in the sidebar."
)

values = inputs.render_inputs(study.INPUTS)
result, problem = results.run_for_page(study.KIND, values, label="Computing the flow")
tools.page_tools(study, problem=problem)
if problem:
    results.stop_for(problem)

results.show_headlines(result)
results.show_warnings(results.general_warnings(result))
st.markdown(f"**{study.stagnation_text(result.detail)}**")
st.caption(study.SIGN_CONVENTION)

figs = results.study_figures(study, result)


def _flow_tab():
    left, right = st.columns([1.15, 1])
    with left:
        results.show_figure(figs["Streamlines"], key="flow_streamlines")
    with right:
        results.show_figure(figs["Surface pressure"], key="flow_cp")


def _lift_tab():
    left, right = st.columns(2)
    with left:
        results.show_figure(figs["Pressure integral check"], key="flow_check")
    with right:
        results.show_figure(figs["Ideal lift coefficient"], key="flow_cl")


def _table_tab():
    surface = results.study_tables(study, result)["surface"]
    st.dataframe(surface, hide_index=True, width="stretch")
    st.download_button("Download as CSV", csv_text(surface),
                       file_name="spinning_cylinder_surface.csv", mime="text/csv")


TABS = {"The flow and its pressure": _flow_tab, "Lift: the check and the ideal line": _lift_tab,
        "Surface table (every 5°)": _table_tab}
results.open_tab_only(TABS, "flow_tab")

results.show_sources_and_cautions(study)
