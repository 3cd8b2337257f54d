"""Spinning ball flight page: one launch and its landing, sweeps, launch spread, fits to tracks.

Thin: widgets -> liftcore (studies.flight, ballflight) through cached wrappers -> figures_ball.
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import streamlit as st

from liftcore import ballflight as bf
from liftcore import figures_ball as fb
from liftcore import units
from liftcore.balls import BALLS, LAUNCH_KEYS, MODELS, ball_table, typical_launch
from liftcore.errors import InputError
from liftcore.inputs import InputSpec, choice, integer, number
from liftcore.studies import flight as study
from liftcore.studies import format_number
from views.inputs import (input_widget, render_inputs, set_values, state_key, unit_system,
                          widget_changed)
from views.results import (cached, general_warnings, number_text, run_for_page, show_figure, stop_for,
                           show_headlines, show_sources_and_cautions, show_warnings, study_figures,
                           study_tables, table_in_units)
from views.tools import page_tools

KIND = study.KIND
SPEC = study.INPUTS
#: Flights pinned to the charts of this page (not the kept options of the Compare page).
OVERLAY_KEY = "flight:overlaid"
MAX_OVERLAID = 4

# ----------------------------------------------------------------------------- tool inputs
_SWEEP_CHOICES = tuple(bf.SWEEP_INPUTS)
_SWEEP_LABELS = tuple(v[0] for v in bf.SWEEP_INPUTS.values())
_SWEEP_DEFAULT_RANGES = {"speed_m_s": (25.0, 55.0), "elevation_deg": (10.0, 45.0), "azimuth_deg": (-10.0, 10.0),
                         "spin_rpm": (0.0, 4000.0), "spin_axis_deg": (-45.0, 45.0), "height_m": (0.0, 3.0)}
_RANGE_FIELDS = []
for _k, (_label, _q, _lo, _hi) in bf.SWEEP_INPUTS.items():
    _d0, _d1 = _SWEEP_DEFAULT_RANGES[_k]
    _lo = max(_lo, -90.0) if _k == "elevation_deg" else _lo
    _step = {"rotation": 100.0, "angle": 1.0, "ball_speed": 0.5, "length": 0.1}[_q]
    _RANGE_FIELDS.append(number(f"{_k}_from", f"{_label} from", _q, _d0, _lo, _hi, section="Sweep", step=_step))
    _RANGE_FIELDS.append(number(f"{_k}_to", f"{_label} to", _q, _d1, _lo, _hi, section="Sweep", step=_step))
SWEEP_SPEC = InputSpec("flight_sweep", (
    choice("x_input", "Across", _SWEEP_CHOICES, default="elevation_deg", labels=_SWEEP_LABELS, section="Sweep"),
    choice("y_input", "Up", _SWEEP_CHOICES, default="spin_rpm", labels=_SWEEP_LABELS, section="Sweep"),
    integer("points", "Points per input", 21, 5, 61, section="Sweep"),
    choice("output", "Result to map", tuple(bf.OUTPUTS), default="carry_m",
           labels=tuple(v[0] for v in bf.OUTPUTS.values()), section="Sweep"),
    choice("goal", "Best means", ("max", "min"), default="max", labels=("highest", "lowest"), section="Sweep"),
    *_RANGE_FIELDS,
))
FIT_SPEC = InputSpec("flight_fit", (
    choice("source", "Tracks", ("demo", "upload"), default="demo",
           labels=("Invented demo tracks (shipped)", "My CSV file"), section="Fit"),
    choice("mode", "Fit", bf.FIT_MODES, default="constant",
           labels=("Constant CD and CL", "Scale factors on the chosen model"), section="Fit"),
))


# ----------------------------------------------------------------------------- cached core calls
@st.cache_data(show_spinner=False, max_entries=32)
def _sweep(values: dict, x_key, x_vals, y_key, y_vals, output, maximise):
    setup, _ = study.setup_from_values(values)
    return bf.sweep(setup, study.launch_from_values(values), x_key, np.array(x_vals), y_key,
                    np.array(y_vals), output, maximise)


@st.cache_data(show_spinner=False, max_entries=32)
def _best(values: dict, keys, bounds, output, maximise):
    setup, _ = study.setup_from_values(values)
    return bf.best_launch(setup, study.launch_from_values(values), keys, bounds, output, maximise)


def _spread(values: dict):
    """Landing spread through the shared result cache, with a progress bar while it flies."""
    def fly(progress):
        setup, _ = study.setup_from_values(values)
        return bf.dispersion(setup, study.launch_from_values(values), study.spread_sd(values),
                             values["dispersion_n"], values["dispersion_seed"], progress=progress)
    return cached(("flight spread", values), fly, label="Flying")


@st.cache_data(show_spinner=False, max_entries=16)
def _fit(values: dict, tracks: pd.DataFrame, mode: str, demo: bool):
    if demo:
        setup = bf.demo_tracks_setup()
        spin, axis = bf.DEMO_TRACKS["spin_rpm"], bf.DEMO_TRACKS["spin_axis_deg"]
        if mode == "scale":
            setup = bf.make_setup(bf.DEMO_TRACKS["ball"], density_kg_m3=setup.density_kg_m3,
                                  kinematic_viscosity_m2_s=setup.kinematic_viscosity_m2_s)
    else:
        setup, _ = study.setup_from_values(values)
        spin, axis = values["spin_rpm"], values["spin_axis_deg"]
    return bf.fit_tracks(setup, tracks, spin, axis, values["rifle_deg"], mode)


@st.cache_data(show_spinner=False)
def _demo_tracks():
    return bf.demo_tracks()


def _overlay_label(i: int, vals: dict) -> str:
    """The name of an overlaid flight, in the current units (so it follows the unit switch)."""
    ball = BALLS[vals["ball"]].name if vals["ball"] in BALLS else "Custom ball"
    return (f"Overlay {i}: {ball}, {number_text(vals['speed_m_s'], 'ball_speed')} at "
            f"{format_number(vals['elevation_deg'])}°, {number_text(vals['spin_rpm'], 'rotation', 4)}")


def _overlay_extra(overlaid: list):
    """The study's ``extra`` for the overlaid flights: ((label, inputs), ...), or None."""
    if not overlaid:
        return None
    return {"overlay": tuple((_overlay_label(i, v), v) for i, v in enumerate(overlaid, start=1))}


# ----------------------------------------------------------------------------- sidebar
LAUNCH_NOTE = "flight:launch_note"
MY_LAUNCH = "flight:my_launch"


def _launch_text(launch: dict) -> str:
    return (f"{number_text(launch['speed_m_s'], 'ball_speed')} at {format_number(launch['elevation_deg'])}°, "
            f"{number_text(launch['spin_rpm'], 'rotation', 4)}, spin axis {format_number(launch['spin_axis_deg'])}°, "
            f"from {number_text(launch['launch_height_m'], 'length')}")


def _back_to_my_launch() -> None:
    mine = st.session_state.pop(MY_LAUNCH, None)
    if mine:
        set_values(SPEC, mine)
    st.session_state.pop(LAUNCH_NOTE, None)


def _typical_launch_on_ball_change(ball_changed: bool) -> None:
    """A new ball gets its typical launch (common practice) unless "keep my launch" is on; the
    launch typed before stays one click away."""
    ball = st.session_state.get(state_key(KIND, "ball"), SPEC.field("ball").default)
    what, launch = typical_launch(ball)
    if ball_changed and launch and not st.session_state.get("flight:keep_launch", False):
        mine = {k: st.session_state.get(state_key(KIND, k), SPEC.field(k).default) for k in LAUNCH_KEYS}
        if mine != launch:
            st.session_state[MY_LAUNCH] = mine
            set_values(SPEC, launch)
            st.session_state[LAUNCH_NOTE] = (f"Launch set to {what} with this ball (typical values, common "
                                             f"practice): {_launch_text(launch)}.")
    elif ball_changed:
        st.session_state.pop(LAUNCH_NOTE, None)
    note = st.session_state.get(LAUNCH_NOTE)
    if note:
        st.info(note, icon=":material/sports:")
        if st.session_state.get(MY_LAUNCH):
            st.button("Back to my launch", key="flight:back_to_my_launch", on_click=_back_to_my_launch,
                      icon=":material/undo:", help=_launch_text(st.session_state[MY_LAUNCH]))
    st.toggle("Keep my launch when I change the ball", key="flight:keep_launch",
              help="Off: choosing a ball sets its typical launch (speed, elevation, spin).")


def _sidebar() -> dict:
    ball_changed = widget_changed(SPEC, "ball")  # asked before anything syncs the inputs
    with st.sidebar:
        input_widget(SPEC, SPEC.field("ball"))
        _typical_launch_on_ball_change(ball_changed)
        input_widget(SPEC, SPEC.field("coefficient_model"))
    return render_inputs(SPEC, skip=("ball", "coefficient_model") + study.SPREAD_KEYS)


# ----------------------------------------------------------------------------- tabs
def _flight_tab(result, values):
    system = unit_system()
    d = result.detail
    show_headlines(result, columns=3)
    air, b = d.air, d.setup.ball
    st.caption(f"{b.name}: {number_text(b.diameter_m, 'small_length')}, {number_text(b.mass_kg, 'small_mass')}; "
               f"model: {d.setup.model.label()}. Air: {number_text(d.setup.density_kg_m3, 'density', 4)}, "
               f"{number_text(air.temperature_k, 'temperature')}, {number_text(air.pressure_pa, 'pressure', 4)}, "
               f"humidity {100 * air.relative_humidity:.0f} %.")
    gw = general_warnings(result)
    if gw:
        with st.expander(f"Model notes and warnings ({len(gw)})", expanded=False):
            show_warnings(gw)
    flights = list(study.display_flights(result, system))
    figs = study_figures(study, result)
    c1, c2 = st.columns(2)
    with c1:
        show_figure(figs["Side view"], key="fig_side")
    with c2:
        show_figure(figs["Top view"], key="fig_top")
    c1, c2 = st.columns(2)
    with c1:
        show_figure(figs["Along the flight"], key="fig_along")
    with c2:
        if d.setup.density_kg_m3 > 0:
            show_figure(fb.coefficient_curves(d.setup.model, flights[0], system), key="fig_coef")
        else:
            st.info("In vacuum there is no drag or lift to show.")
    if len(flights) > 1:
        st.subheader("Flights side by side")
        rows = []
        for f in flights:
            row = {"Flight": f.label}
            for k, (label, kind) in bf.OUTPUTS.items():
                row[f"{label} [{units.unit_label(kind, system)}]"] = float(units.to_display(getattr(f, k), kind, system))
            rows.append(row)
        st.dataframe(pd.DataFrame(rows).round(2), hide_index=True, width="stretch",
                     column_config={"Flight": st.column_config.TextColumn(width="large")})
        if d.compare_warnings:
            show_warnings([w for w in d.compare_warnings if w.subject], title="Second flight: warnings")
    c1, c2, c3 = st.columns(3)
    overlaid = st.session_state.setdefault(OVERLAY_KEY, [])
    if c1.button("Overlay this flight on the charts", key="flight_overlay", icon=":material/stacked_line_chart:",
                 help=f"Pins this flight to the charts above as an extra line (up to {MAX_OVERLAID}), so "
                      "you can change the inputs and see the difference on this page. Only for this "
                      "page; to set whole options side by side on the Compare options page, use "
                      "“Keep as option” in the sidebar."):
        overlaid.append({k: v for k, v in values.items() if k not in study.SPREAD_KEYS + study.COMPARE_KEYS})
        del overlaid[:-MAX_OVERLAID]
        st.rerun()
    if overlaid and c2.button(f"Clear overlaid flights ({len(overlaid)})", key="flight_overlay_clear",
                              icon=":material/layers_clear:"):
        overlaid.clear()
        st.rerun()
    path = study_tables(study, result)[f"path: {flights[0].label}"]
    c3.download_button("Path of this flight (CSV)", path.to_csv(index=False), "flight_path.csv",
                       "text/csv", key="flight_download",
                       help="Time, position, speed, spin and coefficients along the flight, in the "
                            "units chosen (the unit is in each column name)")


def _flight_3d_tab(result):
    st.caption("The path in three dimensions (drag to turn it). Its own tab: a 3-D chart takes a "
               "while to draw on a computer without graphics acceleration.")
    show_figure(study_figures(study, result)["Flight path in 3-D"], key="fig_3d")


def _sweep_tab(values):
    system = unit_system()
    st.markdown("Map one result over a grid of two launch inputs; every grid point is a full flight. "
                "The star marks the best grid point; the search refines it.")
    c1, c2, c3, c4 = st.columns(4)
    with c1:
        x_key = input_widget(SWEEP_SPEC, SWEEP_SPEC.field("x_input"))
    with c2:
        y_key = input_widget(SWEEP_SPEC, SWEEP_SPEC.field("y_input"))
    with c3:
        output = input_widget(SWEEP_SPEC, SWEEP_SPEC.field("output"))
    with c4:
        goal = input_widget(SWEEP_SPEC, SWEEP_SPEC.field("goal"))
    c1, c2, c3, c4, c5 = st.columns(5)
    with c1:
        x0 = input_widget(SWEEP_SPEC, SWEEP_SPEC.field(f"{x_key}_from"))
    with c2:
        x1 = input_widget(SWEEP_SPEC, SWEEP_SPEC.field(f"{x_key}_to"))
    with c3:
        y0 = input_widget(SWEEP_SPEC, SWEEP_SPEC.field(f"{y_key}_from"))
    with c4:
        y1 = input_widget(SWEEP_SPEC, SWEEP_SPEC.field(f"{y_key}_to"))
    with c5:
        n = input_widget(SWEEP_SPEC, SWEEP_SPEC.field("points"))
    if x_key == y_key:
        st.error("Choose two different inputs to sweep.")
        return
    if not (x0 < x1 and y0 < y1):
        st.error("Each range needs 'from' below 'to'.")
        return
    xs = tuple(np.linspace(x0, x1, n))
    ys = tuple(np.linspace(y0, y1, n))
    maximise = goal == "max"
    try:
        with st.spinner("Flying the grid…"):
            sw = _sweep(values, x_key, xs, y_key, ys, output, maximise)
    except InputError as exc:
        st.error(str(exc))
        return
    out_label, out_kind = bf.OUTPUTS[output]
    labels = {k: (v[0], v[1]) for k, v in bf.SWEEP_INPUTS.items()}
    c1, c2 = st.columns([3, 1])
    with c2:
        st.metric(f"Best {out_label.lower()} on the grid", number_text(sw.best_value, out_kind, 4))
        st.caption(f"{labels[x_key][0]}: {number_text(sw.best_x, labels[x_key][1])}; "
                   f"{labels[y_key][0]}: {number_text(sw.best_y, labels[y_key][1])}")
        if st.button("Search the best launch", key="flight_search",
                     help="Refines the grid's best point within the two ranges (scipy Nelder-Mead)."):
            with st.spinner("Searching…"):
                st.session_state["flight:best"] = (_best(values, (x_key, y_key), ((x0, x1), (y0, y1)),
                                                         output, maximise),
                                                   (x_key, y_key, output, maximise, x0, x1, y0, y1))
        best = st.session_state.get("flight:best")
        opt = None
        if best and best[1] == (x_key, y_key, output, maximise, x0, x1, y0, y1):
            opt = best[0]
            st.metric(f"Searched {out_label.lower()}", number_text(opt.best_value, out_kind, 4))
            st.caption("; ".join(f"{labels[k][0]}: {number_text(v, labels[k][1])}" for k, v in zip(opt.keys, opt.values))
                       + f" ({opt.evaluations} flights). Other inputs as in the sidebar.")
    with c1:
        show_figure(fb.sweep_heatmap(sw, labels, out_label, out_kind, system,
                                     searched=None if opt is None else opt.values), key="fig_sweep")
    show_warnings([w for w in sw.warnings if w.severity == "invalid"])


def _spread_tab(values):
    st.markdown("Launch conditions drawn from normal distributions (seeded, so a run repeats); "
                "each draw is flown to the ground.")
    cols = st.columns(4)
    for i, key in enumerate(study.SPREAD_KEYS):
        with cols[i % 4]:
            input_widget(SPEC, SPEC.field(key))
    v = dict(values)
    for key in study.SPREAD_KEYS:
        v[key] = st.session_state.get(state_key(KIND, key), SPEC.field(key).default)
    if v["dispersion_n"] < 2:
        st.info("Set the number of flights to 2 or more to see the spread.")
        return
    try:
        disp = _spread(v)
    except InputError as exc:
        st.error(str(exc))
        return
    system = unit_system()
    c = st.columns(5)
    c[0].metric("Carry P05", number_text(disp.carry_percentiles_m[5], "distance"))
    c[1].metric("Carry P50", number_text(disp.carry_percentiles_m[50], "distance"))
    c[2].metric("Carry P95", number_text(disp.carry_percentiles_m[95], "distance"))
    c[3].metric("Drift sd", number_text(disp.lateral_sd_m, "distance"))
    c[4].metric("95 % ellipse", f"{number_text(2 * disp.ellipse_95['semi_major'], 'distance')} × "
                                f"{number_text(2 * disp.ellipse_95['semi_minor'], 'distance')}")
    c1, c2 = st.columns([3, 2])
    with c1:
        show_figure(fb.dispersion_figure(disp, system), key="fig_spread")
    with c2:
        show_figure(fb.carry_histogram(disp, system), key="fig_hist")
    show_warnings([w for w in disp.warnings if w.subject])
    st.caption("The ellipse assumes the landings are normally spread; percentiles come straight from the flights.")


def _fit_tab(values):
    st.markdown(
        "Fit drag and lift, and each flight's launch state, to tracked positions by least squares "
        "(scipy `least_squares`). **CSV format (our own):** header `flight,t,x,y,z`, one row per "
        "observation, SI units: `flight` a label per flight, `t` seconds, `x` downrange, `y` drift "
        "to the right, `z` height above the ground, all in metres; lines starting with `#` are "
        "comments; at least 6 rows per flight. Your own tracks use the ball, air and the spin rate "
        "and axis set in the sidebar.")
    c1, c2 = st.columns(2)
    with c1:
        source = input_widget(FIT_SPEC, FIT_SPEC.field("source"))
    with c2:
        mode = input_widget(FIT_SPEC, FIT_SPEC.field("mode"))
    demo = source == "demo"
    if demo:
        tracks = _demo_tracks()
        d = bf.DEMO_TRACKS
        st.caption(f"Invented demo tracks: a baseball at sea level with {d['spin_rpm']:.0f} rpm backspin, made from "
                   f"constant CD {d['cd']} and CL {d['cl']} plus {100 * d['noise_m']:.0f} cm noise; the fit should find them.")
    else:
        up = st.file_uploader("Tracked positions (CSV)", type=["csv", "txt"], key="flight_tracks_file")
        st.download_button("Example file in this format (the invented demo tracks)",
                           _demo_tracks().to_csv(index=False), "tracks_example_invented.csv", "text/csv",
                           key="flight_tracks_template")
        if up is None:
            st.info("Upload a CSV file in the format above, or choose the invented demo tracks.")
            return
        try:
            tracks = bf.read_tracks(up)
        except InputError as exc:
            st.error(str(exc))
            return
    st.caption(f"{tracks['flight'].nunique()} flights, {len(tracks)} positions.")
    if not st.button("Fit the tracks", key="flight_fit_run", type="primary"):
        prev = st.session_state.get("flight:fit")
        if not prev or prev[1] != (source, mode):
            return
        fit = prev[0]
    else:
        try:
            with st.spinner("Fitting…"):
                fit = _fit(values, tracks, mode, demo)
        except InputError as exc:
            st.error(str(exc))
            return
        st.session_state["flight:fit"] = (fit, (source, mode))
    a, sa = fit.parameter(fit.names[0])
    b, sb = fit.parameter(fit.names[1])
    c = st.columns(3)
    c[0].metric(fit.names[0], f"{a:.4f} ± {sa:.4f}")
    c[1].metric(fit.names[1], f"{b:.4f} ± {sb:.4f}")
    c[2].metric("RMS miss", number_text(fit.rms_m, "length"))
    st.caption("± one standard deviation from the Jacobian at the solution (assumes independent, equal "
               f"noise on every coordinate); {fit.nfev} evaluations of the residuals, {fit.dof} degrees of freedom. "
               f"{fit.message}")
    c1, c2 = st.columns(2)
    system = unit_system()
    with c1:
        show_figure(fb.fit_tracks_side(fit, tracks, system), key="fig_fit_side")
    with c2:
        show_figure(fb.fit_residuals(fit, system), key="fig_fit_res")
    with st.expander("All fitted parameters"):
        st.dataframe(_fit_table(fit, system).round(5), hide_index=True, width="stretch")


#: Units the fit names its launch-state parameters in, and their quantity kinds.
_FIT_UNITS = {"[m]": "length", "[m/s]": "ball_speed"}


def _fit_table(fit, system: str) -> pd.DataFrame:
    """The fitted parameters with launch positions and velocities in ``system``'s units."""
    table = fit.table()
    names, vals, sds = [], [], []
    for name, v, sd in zip(table["parameter"], table["value"], table["sd"]):
        for unit, kind in _FIT_UNITS.items():
            if name.endswith(unit):
                name = name[:-len(unit)] + f"[{units.unit_label(kind, system)}]"
                v, sd = float(units.to_display(v, kind, system)), float(units.to_display(sd, kind, system))
                break
        names.append(name)
        vals.append(v)
        sds.append(sd)
    return pd.DataFrame({"parameter": names, "value": vals, "sd": sds})


def _balls_tab():
    st.markdown("Ball sizes and masses from the governing bodies' rules; the middle of each allowed range is used.")
    balls = table_in_units(pd.DataFrame(ball_table()), {"diameter_m": "small_length", "mass_kg": "small_mass"})
    st.dataframe(balls.round(3), hide_index=True, width="stretch")
    rows = [{"model": m.title, "from memory": "yes" if m.from_memory else "no",
             "S range": f"{m.s_range[0]:g} to {m.s_range[1]:g}", "Re range": f"{m.re_range[0]:.3g} to {m.re_range[1]:.3g}",
             "drag crisis Re": "" if m.crisis_re is None else f"{m.crisis_re[0]:.3g} to {m.crisis_re[1]:.3g}",
             "notes": m.note, "source": m.source} for m in MODELS.values()]
    st.dataframe(pd.DataFrame(rows), hide_index=True, width="stretch")
    st.caption("Coordinates: x downrange along the target line, drift and angles positive to the right, z up. "
               "A positive spin-axis tilt curves the ball to the right looking downrange. Carry is measured "
               "along the target line.")


# ----------------------------------------------------------------------------- page
st.title("Spinning ball flight")
st.caption("How far, how high and how much a spinning ball curves, with drag, Magnus lift, spin decay, wind "
           "and the air of the venue. Every example is invented. Drift and angles are positive to the right.")
values = _sidebar()
main_values = dict(values, dispersion_n=0)
extra = _overlay_extra(st.session_state.get(OVERLAY_KEY, []))
result, problem = run_for_page(KIND, main_values, extra=extra, label="Flying")
page_tools(study, extra=extra, problem=problem)
if problem:
    stop_for(problem)

# Tabs track which one is open (so a button inside a tab keeps it open) and only the open one runs.
TABS = ("Flight", "Flight in 3-D", "Launch sweep", "Launch spread", "Fit to tracked flights",
        "Balls and models")
tabs = st.tabs(TABS, key="flight_tab", on_change="rerun")
for tab, draw in zip(tabs, (lambda: _flight_tab(result, values), lambda: _flight_3d_tab(result),
                            lambda: _sweep_tab(main_values), lambda: _spread_tab(values),
                            lambda: _fit_tab(main_values), _balls_tab)):
    if tab.open is not False:
        with tab:
            draw()
show_sources_and_cautions(study)
