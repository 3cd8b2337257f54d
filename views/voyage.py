"""Voyage savings page: is it worth fitting rotors to this ship on this trade, which size, how many?

Widgets -> liftcore.studies.voyage (one cached run) -> figures. No physics here.
"""

import streamlit as st

from liftcore import windstats
from liftcore.errors import InputError
from liftcore.studies import voyage as study
from liftcore.files import csv_text
from views.inputs import render_inputs, unit_system
from views.results import (bold_html, general_warnings, open_tab_only, run_for_page, show_figure,
                           show_headlines, stop_for,
                           show_sources_and_cautions, show_warnings, study_figures, study_tables,
                           units_caption)
from views.tools import page_tools

KIND = study.KIND
UPLOAD_KEY = "voyage:upload"

FORMATS = {
    "table": ("true_wind_angle_deg, true_wind_speed_m_s, probability",
              "One row per wind condition met at sea. The angle is the bearing of the true wind "
              "from the bow (0 = head wind, 90 = from starboard, 180 = from astern; -180 to 360 "
              "accepted). Probabilities are shares of the time at sea and must sum to 1 within 1e-6."),
    "weibull": ("sector_centre_deg, frequency, scale_m_s, shape",
                "One row per direction sector, all sectors equally wide. sector_centre_deg is where "
                "the wind comes from, clockwise from north; frequency is the share of time (sums to "
                "1); scale_m_s and shape are the Weibull c and k of the wind speed. The course below "
                "turns directions into angles off the bow."),
    "series": ("time, ship_speed_kn, ship_heading_deg, true_wind_speed_m_s, true_wind_direction_deg "
               "[, leg]",
               "One row per hour, any length. time in ISO 8601 (2031-01-01T00:00); ship speed 0 = in "
               "port (no saving); heading is where the ship goes and true_wind_direction_deg where the "
               "wind comes from, both clockwise from north; leg (optional) names the leg for the bars."),
}

UPLOAD_WORDS = {"table": "joint table of wind angle × speed", "weibull": "Weibull per direction sector",
                "series": "hourly series along a route"}

st.title("Voyage savings")
st.caption("Expected thrust, net power gain, energy, fuel, CO₂ and money saved per year by rotor "
           "sails over the wind of a trade, with the best spin in every wind condition, and a "
           "comparison of rotor sizes and counts. Opens on invented demo data.")

values = render_inputs(study.INPUTS)
kind = values["wind_kind"]
system = unit_system()

# ----------------------------------------------------------------------------- wind data
cols, info = FORMATS[kind]
up_col, fmt_col = st.columns([1, 1])
with up_col:
    uploaded = st.file_uploader(f"Your wind file ({UPLOAD_WORDS[kind]}, CSV)",
                                type=["csv", "txt"], key=UPLOAD_KEY,
                                help="Without a file the page uses the invented demo of this kind.")
with fmt_col:
    with st.expander("File format and directions", expanded=False):
        st.markdown(f"Columns: `{cols}`\n\n{info}\n\nLines starting with `#` are comments. "
                    "Wind speeds are at the height of the given true wind (Wind profile section).")
        st.download_button("Download the invented demo file of this kind",
                           data=study.DEMO_FILES[kind].read_bytes,  # read on the click only
                           file_name=study.DEMO_FILES[kind].name, mime="text/csv",
                           key=f"voyage:demo:{kind}", on_click="ignore")

extra, problem = None, None
if uploaded is not None:
    try:
        extra = windstats.read_csv_frame(uploaded.getvalue(), uploaded.name)
        extra.attrs["source_name"] = uploaded.name
    except InputError as exc:
        problem = str(exc)
if problem is None:
    # the page's main run leaves out the design options; their tab runs them when it is open
    result, problem = run_for_page(KIND, dict(values, sweep=False), extra=extra,
                                   label="Computing the voyage")
page_tools(study, extra=extra, problem=problem)
if problem:
    stop_for(problem, "Your inputs are kept; fix the file or the field named above.")

d = result.detail
s = d.summary
st.caption(study.data_note(result))

show_headlines(result, keys=("mean_net_power", "annual_fuel_saved", "annual_co2_avoided",
                             "annual_cost_saved"))
show_headlines(result, keys=("payback", "annual_energy_saved", "mean_thrust", "engine_power_share"))
show_headlines(result, keys=("running_share", "limited_share", "stopped_share", "peak_heeling_moment"))
if values["hull_balance"]:
    show_headlines(result, keys=("mean_balance_power", "balance_share"))
else:
    st.caption("The hull's answer to the side force (leeway, rudder) is left out: switch on *Count the "
               "hull's answer to the side force* under Hull in the sidebar.")

c1, c2 = st.columns([1, 3])
with c1:
    show_headlines(result, keys=("imo_effective_power",), columns=1)
with c2:
    st.markdown("**IMO wind-propulsion term**")
    st.caption("(0.5144 V_ref / η_T) Σ F·W − Σ P·W from MEPC.1/Circ.896, with F the thrust and P the "
               "electric power of the best spin at V_ref in each wind condition and W this trade's wind "
               "probabilities (not the IMO global matrix unless you upload it as a joint table).")
figs = study_figures(study, result)
if d.cii is not None:
    c1, c2 = st.columns([2, 3])
    with c1:
        st.markdown("**Carbon intensity (IMO CII)**")
        st.markdown(f"<p class='lc-summary-small'>{bold_html(study.cii_summary(result))}</p>",
                    unsafe_allow_html=True)
        st.caption(study.CII_CAUTION)
    with c2:
        show_figure(figs["Carbon intensity rating"], key="voyage:cii")
else:
    st.caption("No carbon intensity rating: enter the ship's fuel per year without rotors under "
               "*Carbon intensity (IMO CII)* in the sidebar.")
show_warnings(general_warnings(result), title="About the model and the data")


def _gain_tab():
    c1, c2 = st.columns(2)
    with c1:
        show_figure(figs["Wind rose of the input"], key="voyage:rose")
    with c2:
        show_figure(figs["Net gain over wind angle and speed"], key="voyage:heat")
    show_figure(figs["Operating time"], key="voyage:states")
    if "By month" in figs:
        c1, c2 = st.columns(2)
        with c1:
            show_figure(figs["By month"], key="voyage:months")
        if "By leg" in figs:
            with c2:
                show_figure(figs["By leg"], key="voyage:legs")


def _spread_tab():
    if d.spread is None:
        st.info("Switch on *Show the spread across the published coefficient sets* under Design "
                "options in the sidebar.", icon=":material/tune:")
        return
    st.markdown("The same year with every published coefficient set and each spin-power estimate "
                "it has: the spread is the uncertainty of the aerodynamic data alone (the wind "
                "statistics, routing and crew add theirs). The darker bar is the entered set.")
    show_figure(figs["Across the published data"], key="voyage:spread")
    st.caption(d.spread_note)
    st.dataframe(study_tables(study, result)["published_spread"], hide_index=True)


def _design_tab():
    if not values["sweep"]:
        st.info("Switch on *Compare rotor sizes and counts* under Design options in the sidebar.",
                icon=":material/tune:")
        return
    full, trouble = run_for_page(KIND, values, extra=extra, label="Comparing rotor sizes and counts")
    if trouble:
        st.error(trouble, icon=":material/error:")
        return
    sfigs = study_figures(study, full)
    st.caption(full.detail.sweep_note)
    c1, c2 = st.columns(2)
    with c1:
        show_figure(sfigs["Design options: fuel"], key="voyage:sweep_fuel")
    with c2:
        if "Design options: payback" in sfigs:
            show_figure(sfigs["Design options: payback"], key="voyage:sweep_payback")
        elif "Design options: money" in sfigs:
            show_figure(sfigs["Design options: money"], key="voyage:sweep_money")


def _tables_tab():
    st.caption(units_caption())
    for name, table in study_tables(study, result).items():
        st.markdown(f"**{name.replace('_', ' ').capitalize()}**")
        st.dataframe(table, hide_index=True, height=min(300, 40 + 35 * len(table)))
        st.download_button(f"Download {name}.csv", csv_text(table).encode(),
                           file_name=f"voyage_{name}.csv", mime="text/csv", key=f"voyage:csv:{name}")


TABS = {"Where the gain comes from": _gain_tab, "Across the published data": _spread_tab,
        "Design options: which size, how many?": _design_tab,
        "Tables to download": _tables_tab}
open_tab_only(TABS, "voyage_tab")

show_sources_and_cautions(study)
