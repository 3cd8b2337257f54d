"""Rotor sail on a ship: one wind condition. Widgets -> liftcore.studies.rotor -> figures."""

from __future__ import annotations

import threading
from collections import OrderedDict

import pandas as pd
import streamlit as st

from liftcore import coefficients as coef
from liftcore import units
from liftcore.errors import InputError
from liftcore.studies import format_number
from liftcore.studies import rotor as study
from views import common

KIND = study.KIND
SPEC = study.INPUTS
COEFFICIENT_KEYS = ("coefficient_set", "user_coefficients_csv", "user_aspect_ratio",
                    "user_end_plate_ratio", "correct_aspect_ratio")
#: Choices that decide which other inputs are shown (synchronised before the sidebar is drawn).
CONTROLS = ("wind_angle_reference", "spin_mode", "wind_profile", "rotor_count", "air_mode",
            "coefficient_set")
TEMPLATE_CSV = "SR,CL,CD,CP\n0,0,0.6,0\n1,2.0,0.4,0.03\n2,5.5,1.3,0.25\n3,8.5,2.4,0.75\n"

SHOW_IF = {
    "true_wind_angle_deg": lambda v: v["wind_angle_reference"] == "relative",
    "heading_deg": lambda v: v["wind_angle_reference"] == "compass",
    "true_wind_direction_deg": lambda v: v["wind_angle_reference"] == "compass",
    "spin_ratio": lambda v: v["spin_mode"] == "spin_ratio",
    "spin_rpm": lambda v: v["spin_mode"] == "rpm",
    "power_law_exponent": lambda v: v["wind_profile"] == "power",
    "charnock_constant": lambda v: v["wind_profile"] == "log",
    "rotor_spacing_m": lambda v: v["rotor_count"] > 1,
    "interaction_factor": lambda v: v["rotor_count"] > 1,
    **common.AIR_SHOW_IF,
}

_FIGURES: "OrderedDict[tuple, tuple]" = OrderedDict()
_FIG_LOCK = threading.Lock()


def _sync_controls() -> None:
    """Copy the latest value of each controlling widget to its core value, so inputs that depend
    on it show or hide in the same rerun as the change."""
    system = common.unit_system()
    for key in CONTROLS:
        wkey = common.widget_key(KIND, key, system)
        if wkey in st.session_state:
            st.session_state[common.state_key(KIND, key)] = st.session_state[wkey]


def _coefficient_inputs(values: dict) -> dict:
    with st.sidebar.expander("Coefficient set", expanded=True):
        values["coefficient_set"] = common.input_widget(SPEC, SPEC.field("coefficient_set"))
        if values["coefficient_set"] != "user":
            chosen = coef.coefficient_set(values["coefficient_set"])
            st.caption(f"{chosen.label}. Kind: {chosen.kind}; tested rotor H/D "
                       f"{'2-D' if chosen.two_dimensional else f'{chosen.aspect_ratio:g}'}, end plates "
                       f"{chosen.end_plate_ratio:g}; spin ratios {chosen.sr_range[0]:g} to "
                       f"{chosen.sr_range[1]:g}.")
        if values["coefficient_set"] == "user":
            skey = common.state_key(KIND, "user_coefficients_csv")
            wkey = common.widget_key(KIND, "user_coefficients_csv", "all")
            if wkey not in st.session_state:
                st.session_state[wkey] = st.session_state.get(skey, "")
            up = st.file_uploader("Upload a CSV table", type=["csv"], key="rotor:upload",
                                  help="Columns SR, CL, CD and optionally CP; at least 3 rows, SR "
                                       "increasing. It fills the box below.")
            if up is not None and st.session_state.get("rotor:upload_id") != up.file_id:
                st.session_state["rotor:upload_id"] = up.file_id
                st.session_state[wkey] = up.getvalue().decode("utf-8", errors="replace")
            text = st.text_area("Your table (CSV: SR, CL, CD, optional CP)", key=wkey, height=160,
                                placeholder=TEMPLATE_CSV)
            st.session_state[skey] = text
            values["user_coefficients_csv"] = text
            st.download_button("Template CSV", TEMPLATE_CSV, file_name="coefficients_template.csv",
                               mime="text/csv", key="rotor:template",
                               help="An invented example showing the format, not data.")
            for key in ("user_aspect_ratio", "user_end_plate_ratio"):
                values[key] = common.input_widget(SPEC, SPEC.field(key))
        values["correct_aspect_ratio"] = common.input_widget(SPEC, SPEC.field("correct_aspect_ratio"))
    return values


def _figures(result, system: str) -> tuple:
    key = (id(result), system)
    with _FIG_LOCK:
        if key in _FIGURES:
            return _FIGURES[key][1]
    figs = study.figures_in_units(result, system)
    with _FIG_LOCK:
        _FIGURES[key] = (result, figs)  # keep the result alive so its id is not reused
        while len(_FIGURES) > 16:
            _FIGURES.popitem(last=False)
    return figs


def _compare_table(result, system: str) -> pd.DataFrame:
    rows = []
    for _, r in result.tables["coefficient_sets"].iterrows():
        rows.append({
            "Coefficient set": ("▶ " if r["chosen"] else "") + r["short"],
            "Kind": r["kind"],
            "Spin ratio": round(float(r["spin_ratio"]), 2),
            f"Rotor speed [{units.unit_label('rotation', system)}]": round(float(r["rpm"]), 1),
            f"Thrust [{units.unit_label('large_force', system)}]":
                round(float(units.to_display(r["thrust_n"], "large_force", system)), 1),
            f"Spin power [{units.unit_label('power', system)}]":
                round(float(units.to_display(r["spin_power_w"], "power", system)), 1),
            f"Net power gain [{units.unit_label('power', system)}]":
                round(float(units.to_display(r["net_power_w"], "power", system)), 1),
        })
    return pd.DataFrame(rows)


def _sets_provenance(result) -> pd.DataFrame:
    t = result.tables["coefficient_sets"]
    return pd.DataFrame({"Coefficient set": t["short"], "Kind": t["kind"],
                         "Tested aspect ratio H/D": [("2-D" if v == float("inf") else f"{v:g}") for v in t["aspect_ratio"]],
                         "End-plate ratio": t["end_plate_ratio"], "Spin ratios": t["sr_range"],
                         "Reynolds numbers": t["reynolds_range"], "Source": t["source"]})


# ============================================================================ page
st.title(study.TITLE)
st.caption("Forces, spin power and net gain of rotor sails in one wind condition. The page opens on "
           "an invented demo ship; change any input in the sidebar. Estimates for early design.")

_sync_controls()
FIRST = {f.key for f in SPEC.fields if f.section in ("Ship and wind", "Spin", "Rotor", "Wind profile")}
LATER = {f.key for f in SPEC.fields} - FIRST - set(COEFFICIENT_KEYS)
values = common.render_inputs(SPEC, skip=tuple(LATER) + COEFFICIENT_KEYS, show_if=SHOW_IF)
values = _coefficient_inputs(values)
later = common.render_inputs(SPEC, skip=tuple(FIRST) + COEFFICIENT_KEYS, show_if=SHOW_IF)
values.update({k: later[k] for k in LATER})
common.page_tools(study)
system = common.unit_system()

try:
    result = common.run_cached(KIND, values, label="Rotor forces and best spin")
except InputError as exc:
    st.error(str(exc), icon=":material/error:")
    st.stop()

d = result.detail
one = d.operation.at(())
state = {0: "stopped", 1: "running", 2: "running at a limit"}[int(one["state"])]
spin_dir = {1.0: "anticlockwise", -1.0: "clockwise", 0.0: ""}[float(one["spin_direction"])]
mode_text = {"best": "best spin within the limits", "spin_ratio": "fixed spin ratio",
             "rpm": "fixed rotor speed"}[d.spin_mode]
st.markdown(
    f"**{d.setup.rotor_count} rotor{'s' if d.setup.rotor_count > 1 else ''}**, "
    f"{common.number_text(d.setup.diameter_m, 'length')} × {common.number_text(d.setup.height_m, 'length')}, "
    f"true wind {common.number_text(d.true_wind_speed_m_s, 'wind_speed')} at "
    f"{format_number(d.true_wind_angle_deg)}° off the bow, ship at "
    f"{common.number_text(d.ship_speed_m_s, 'ship_speed')} — {mode_text}: rotor **{state}**"
    + (f", spinning {spin_dir} seen from above." if spin_dir else ".")
    + f" Coefficients: *{d.setup.coefficients.label}*.")
if one["state"] > 0:
    st.markdown(f"The rotors push the ship to **{'port' if one['side_force_n'] < 0 else 'starboard'}** "
                f"and heel it to **{'port' if one['heeling_moment_nm'] < 0 else 'starboard'}** "
                "(negative side force and heeling moment = to port).")

st.subheader("What the rotors give")
common.show_headlines(result, keys=("net_power_w", "thrust_n", "spin_power_w", "heeling_moment_nm"))
st.subheader("Forces and spin")
common.show_headlines(result, keys=("side_force_n", "lift_n", "drag_n", "rpm"))
st.subheader("Wind at the rotor and coefficients")
common.show_headlines(result, keys=("apparent_wind_speed_m_s", "apparent_wind_angle_deg", "spin_ratio",
                                    "lift_coefficient", "drag_coefficient"), columns=5)
common.show_warnings(common.general_warnings(result), title="Also note")

figs = dict(_figures(result, system))
tab_sets, tab_polar, tab_span, tab_tables = st.tabs(
    ["Coefficient sets", "Around the compass", "Along the rotor", "Tables and downloads"])
with tab_sets:
    st.markdown("Every available coefficient set, corrected to this rotor where the switch under "
                "*Coefficient set* says so. The shaded band is the spread between the sets with "
                "data (theory excluded); the diamond is the operating point.")
    for title in ("Lift coefficient against spin ratio", "Drag coefficient against spin ratio",
                  "Spin-power coefficient against spin ratio"):
        common.show_figure(figs[title], key=f"rotor:fig:{title}")
    st.markdown("**The same operating point with every set** — the spread is the uncertainty of the "
                "aerodynamic data, not of the wind.")
    st.dataframe(_compare_table(result, system), hide_index=True, width="stretch")
    st.markdown("**Where each set comes from**")
    st.dataframe(_sets_provenance(result), hide_index=True, width="stretch")
with tab_polar:
    common.show_figure(figs["Thrust and net power gain around the compass"], key="rotor:fig:polar")
    st.caption("True wind angle off the bow (starboard to the right), at the current true wind "
               "and ship speed, with the same spin rule as above. Inside the dotted circle the "
               "value is negative.")
with tab_span:
    common.show_figure(figs["Wind along the rotor height"], key="rotor:fig:span")
    st.caption(f"The true wind grows with height ({d.setup.wind_profile} profile) while the ship's "
               f"own wind does not, so each of the {d.setup.strips} strips sees its own apparent "
               "wind and spin ratio at the one rotor speed.")
with tab_tables:
    st.caption(f"In the units chosen at the top of the sidebar ({common.UNIT_LABELS[system]}); the "
               "unit of each number is in its column name. Downloads hold the table as shown.")
    shown_tables = common.study_tables(study, result)
    for name, label in (("operating_point", "Operating point"), ("coefficient_sets", "Coefficient sets"),
                        ("coefficient_set_sources", "Coefficient set sources"),
                        ("wind_angle_sweep", "Wind angle sweep"), ("along_the_rotor", "Along the rotor")):
        df = shown_tables[name]
        st.markdown(f"**{label}**")
        st.dataframe(df, hide_index=True, width="stretch", height=min(240, 40 + 35 * len(df)))
        st.download_button(f"Download {label.lower()} as CSV", df.to_csv(index=False),
                           file_name=f"rotor_{name}.csv", mime="text/csv", key=f"rotor:dl:{name}")

common.show_sources_and_cautions(study)
