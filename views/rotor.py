"""Rotor sail on a ship: one wind condition. Widgets -> liftcore.studies.rotor -> figures."""

from __future__ import annotations

import pandas as pd
import streamlit as st

from liftcore import coefficients as coef
from liftcore import units
from liftcore.studies import format_number
from liftcore.studies import rotor as study
from liftcore.files import csv_text
from views import inputs, results, tools

KIND = study.KIND
SPEC = study.INPUTS
COEFFICIENT_KEYS = ("coefficient_set", "user_coefficients_csv", "user_aspect_ratio",
                    "user_end_plate_ratio", "correct_aspect_ratio")
TEMPLATE_CSV = "SR,CL,CD,CP\n0,0,0.6,0\n1,2.0,0.4,0.03\n2,5.5,1.3,0.25\n3,8.5,2.4,0.75\n"


def _coefficient_inputs(values: dict) -> dict:
    field = SPEC.field
    with st.sidebar.expander("Coefficient set", expanded=True):
        values["coefficient_set"] = inputs.input_widget(SPEC, field("coefficient_set"))
        if values["coefficient_set"] != "user":
            chosen = coef.coefficient_set(values["coefficient_set"])
            st.caption(f"{chosen.label}. Kind: {chosen.kind}; tested rotor H/D "
                       f"{'2-D' if chosen.two_dimensional else f'{chosen.aspect_ratio:g}'}, end plates "
                       f"{chosen.end_plate_ratio:g}; spin ratios {chosen.sr_range[0]:g} to "
                       f"{chosen.sr_range[1]:g}.")
        else:
            up = st.file_uploader("Upload a CSV table", type=["csv"], key="rotor:upload",
                                  help="Columns SR, CL, CD and optionally CP; at least 3 rows, SR "
                                       "increasing. It fills the box below.")
            if up is not None and st.session_state.get("rotor:upload_id") != up.file_id:
                st.session_state["rotor:upload_id"] = up.file_id
                wkey = inputs.widget_key(KIND, "user_coefficients_csv", inputs.unit_system())
                st.session_state[wkey] = up.getvalue().decode("utf-8", errors="replace")
            for key in ("user_coefficients_csv", "user_aspect_ratio", "user_end_plate_ratio"):
                values[key] = inputs.input_widget(SPEC, field(key))
            st.download_button("Template CSV", TEMPLATE_CSV, file_name="coefficients_template.csv",
                               mime="text/csv", key="rotor:template",
                               help="An invented example showing the format, not data.")
        values["correct_aspect_ratio"] = inputs.input_widget(SPEC, field("correct_aspect_ratio"))
    return values


def _compare_table(result, system: str) -> pd.DataFrame:
    """The operating point with every set, numbers as text in ``system`` (a static table that
    shows every column on a narrow screen)."""
    t = units.quantity_text
    rows = []
    for _, r in result.tables["coefficient_sets"].iterrows():
        rows.append({
            "Coefficient set": ("▶ " if r["chosen"] else "") + r["short"],
            "Kind": r["kind"],
            "Spin ratio": format_number(float(r["spin_ratio"])),
            "Rotor speed": t(float(r["rpm"]), "rotation", system),
            "Thrust": t(float(r["thrust_n"]), "large_force", system),
            "Spin power": t(float(r["spin_power_w"]), "power", system),
            "Net power gain": t(float(r["net_power_w"]), "power", system),
        })
    return pd.DataFrame(rows).set_index("Coefficient set")


def _sets_provenance(result) -> None:
    """Where each set comes from: one short paragraph per set (long sources read as text)."""
    t = result.tables["coefficient_sets"]
    for _, r in t.iterrows():
        ar = "2-D" if r["aspect_ratio"] == float("inf") else f"{r['aspect_ratio']:g}"
        st.markdown(f"**{r['short']}** — {r['kind']}; tested H/D {ar}, end plates "
                    f"{r['end_plate_ratio']:g}; spin ratios {r['sr_range']}; Reynolds numbers "
                    f"{r['reynolds_range']}.  \n{r['source']}")


# ============================================================================ page
st.title(study.TITLE)
st.caption("Forces, spin power and net gain of rotor sails in one wind condition. The page opens on "
           "an invented demo ship; change any input in the sidebar. Estimates for early design.")

FIRST = {f.key for f in SPEC.fields if f.section in ("Ship and wind", "Spin", "Rotor", "Wind profile")}
LATER = set(SPEC.keys) - FIRST - set(COEFFICIENT_KEYS)
values = inputs.render_inputs(SPEC, only=FIRST)
values = _coefficient_inputs(values)
values.update({k: v for k, v in inputs.render_inputs(SPEC, only=LATER).items() if k in LATER})
system = inputs.unit_system()
result, problem = results.run_for_page(KIND, values, label="Rotor forces and best spin")
tools.page_tools(study, problem=problem)
if problem:
    results.stop_for(problem)

d = result.detail
one = d.operation.at(())
state = {0: "stopped", 1: "running", 2: "running at a limit"}[int(one["state"])]
spin_dir = {1.0: "anticlockwise", -1.0: "clockwise", 0.0: ""}[float(one["spin_direction"])]
mode_text = {"best": "best spin within the limits", "spin_ratio": "fixed spin ratio",
             "rpm": "fixed rotor speed"}[d.spin_mode]
st.markdown(
    f"**{d.setup.rotor_count} rotor{'s' if d.setup.rotor_count > 1 else ''}**, "
    f"{results.number_text(d.setup.diameter_m, 'length')} × {results.number_text(d.setup.height_m, 'length')}, "
    f"true wind {results.number_text(d.true_wind_speed_m_s, 'wind_speed')} at "
    f"{format_number(d.true_wind_angle_deg)}° off the bow, ship at "
    f"{results.number_text(d.ship_speed_m_s, 'ship_speed')} — {mode_text}: rotor **{state}**"
    + (f", spinning {spin_dir} seen from above." if spin_dir else ".")
    + f" Coefficients: *{d.setup.coefficients.label}*.")
if one["state"] > 0:
    st.markdown(f"The rotors push the ship to **{'port' if one['side_force_n'] < 0 else 'starboard'}** "
                f"and heel it to **{'port' if one['heeling_moment_nm'] < 0 else 'starboard'}** "
                "(negative side force and heeling moment = to port).")

st.subheader("What the rotors give")
results.show_headlines(result, keys=("net_power_w", "thrust_n", "spin_power_w", "heeling_moment_nm"))
st.markdown(f"<p class='lc-summary-small'>{results.bold_html(study.summary(result, system))}</p>",
            unsafe_allow_html=True)
hull_keys = [h.key for h in result.headlines if h.key in ("balance_power_w", "leeway_deg",
                                                          "rudder_angle_deg", "heel_angle_deg")]
if hull_keys:
    st.subheader("What the hull pays for the side force")
    results.show_headlines(result, keys=tuple(hull_keys))
else:
    st.caption("The hull's answer to the side force (leeway, rudder) is left out: switch on "
               "*Count the hull's answer to the side force* under Hull in the sidebar.")
st.subheader("Forces and spin")
results.show_headlines(result, keys=("side_force_n", "lift_n", "drag_n", "rpm"))
st.subheader("Wind at the rotor and coefficients")
results.show_headlines(result, keys=("apparent_wind_speed_m_s", "apparent_wind_angle_deg", "spin_ratio",
                                    "lift_coefficient", "drag_coefficient"), columns=5)
results.show_warnings(results.general_warnings(result), title="Also note")

figs = results.study_figures(study, result)


def _sets_tab():
    st.markdown("Every available coefficient set, corrected to this rotor where the switch under "
                "*Coefficient set* says so. The shaded band is the spread between the sets with "
                "data (theory excluded); the diamond is the operating point.")
    results.show_figure(figs["Lift and drag against spin ratio"], key="rotor:fig:lift_drag")
    st.markdown("**The same operating point with every set** — the spread is the uncertainty of the "
                "aerodynamic data, not of the wind.")
    st.table(_compare_table(result, system))
    st.markdown("**Where each set comes from**")
    _sets_provenance(result)


def _power_tab():
    results.show_figure(figs["Spin-power coefficient against spin ratio"], key="rotor:fig:power")
    st.caption("The power the motor needs to spin the rotor, as a coefficient: from the set's own "
               "power data where it has them, else from the skin-friction model named in the chart.")


def _polar_tab():
    results.show_figure(figs["Thrust and net power gain around the compass"], key="rotor:fig:polar")
    st.caption("True wind angle off the bow (starboard to the right), at the current true wind "
               "and ship speed, with the same spin rule as above. Inside the dotted circle the "
               "value is negative.")


def _span_tab():
    results.show_figure(figs["Wind along the rotor height"], key="rotor:fig:span")
    st.caption(f"The true wind grows with height ({d.setup.wind_profile} profile) while the ship's "
               f"own wind does not, so each of the {d.setup.strips} strips sees its own apparent "
               "wind and spin ratio at the one rotor speed.")


def _tables_tab():
    st.caption(results.units_caption())
    shown_tables = results.study_tables(study, result)
    for name, label in (("operating_point", "Operating point"), ("coefficient_sets", "Coefficient sets"),
                        ("coefficient_set_sources", "Coefficient set sources"),
                        ("wind_angle_sweep", "Wind angle sweep"), ("along_the_rotor", "Along the rotor")):
        df = shown_tables[name]
        st.markdown(f"**{label}**")
        if name == "coefficient_set_sources":  # long texts: a table that wraps them
            st.table(df.set_index(df.columns[0]))
        else:
            st.dataframe(df, hide_index=True, width="stretch", height=min(240, 40 + 35 * len(df)))
        st.download_button(f"Download {label.lower()} as CSV", csv_text(df),
                           file_name=f"rotor_{name}.csv", mime="text/csv", key=f"rotor:dl:{name}")


TABS = {"Coefficient sets": _sets_tab, "Spin power": _power_tab, "Around the compass": _polar_tab,
        "Along the rotor": _span_tab, "Tables and downloads": _tables_tab}
results.open_tab_only(TABS, "rotor_tab")

results.show_sources_and_cautions(study)
