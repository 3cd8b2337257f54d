"""Circulation from a measured field: line integrals of a gridded velocity field round the body."""

import re

import streamlit as st

from liftcore import fieldcirc
from liftcore.errors import InputError
from liftcore.studies import study as study_module
from liftcore.files import csv_text
from views import inputs, results, tools

study = study_module("field")

FORMAT_HELP = (
    "Plain CSV with a header row **x, y, u, v** (any order, any case; other columns are ignored): "
    "positions in metres, velocity components in m/s (files are always in these SI units, whichever "
    "units the page shows), one row per grid point in any order. The x "
    "values must be evenly spaced, the y values too, and every (x, y) pair must appear exactly once. "
    "Lines starting with # are comments. Points inside the body may hold any number (0 is usual). "
    "Loops are run clockwise: positive circulation lifts to the left of the stream (up, for a "
    "stream from left to right)."
)


@st.cache_data(max_entries=4, show_spinner="Reading the field…")
def _read_upload(data: bytes, name: str):
    return fieldcirc.read_field_csv(data, name)


st.title("Circulation from a measured field")
st.caption(
    "Line integrals of the velocity round loops that enclose the body give its circulation; once "
    "the loops clear the body and its viscous layer the value settles, and Kutta-Joukowski turns "
    "it into lift per unit length of span."
)

upload = st.file_uploader("Velocity field (CSV with columns x, y, u, v)", type=["csv", "txt"],
                          key="field_upload", help="See 'File format' below.")

values = inputs.render_inputs(study.INPUTS)

extra, problem = None, None
try:
    if upload is not None:
        extra = _read_upload(upload.getvalue(), upload.name)
        shown_name = re.sub(r"([\\`*_{}\[\]()#+\-.!<>|~$])", r"\\\1", upload.name)
        st.caption(f"Field from your file {shown_name} ({len(extra):,} rows).")
    else:
        st.info(study.DEMO_NOTE, icon=":material/science:")
except InputError as exc:
    problem = str(exc)
if problem is None:
    result, problem = results.run_for_page(study.KIND, values, extra=extra,
                                           label="Integrating round the loops")
tools.page_tools(study, extra=extra, problem=problem)
if problem:
    st.error(problem, icon=":material/error:")
    st.caption("Your inputs are kept: change them in the sidebar, or upload a corrected file.")
    with st.expander("File format", expanded=True):
        st.markdown(FORMAT_HELP)
    st.stop()

results.show_headlines(result)
results.show_warnings(results.general_warnings(result))

figs = results.study_figures(study, result)
left, right = st.columns([1.1, 1])
with left:
    results.show_figure(figs["Velocity field and loops"], key="field_map")
with right:
    results.show_figure(figs["Circulation against loop size"], key="field_circulation")
    st.caption(
        "Filled markers: the outer half of the loops, which count toward the estimate. The band "
        "is their loop-to-loop spread (half their range)."
    )

with st.expander("Circulation of each loop"):
    loops = results.study_tables(study, result)["loops"]
    st.dataframe(loops, hide_index=True, width="stretch")
    st.download_button("Download as CSV", csv_text(loops),
                       file_name="circulation_per_loop.csv", mime="text/csv")
with st.expander("File format"):
    st.markdown(FORMAT_HELP)
    st.download_button("Download the invented demo field (CSV)",
                       data=fieldcirc.DEMO_FIELD_PATH.read_bytes,  # read on the click, not on every run
                       file_name=fieldcirc.DEMO_FIELD_PATH.name, mime="text/csv", on_click="ignore")

results.show_sources_and_cautions(study)
