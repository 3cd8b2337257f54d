"""Spinning ball flight page: one launch and its landing, sweeps, launch spread, fits to tracks.

Thin: widgets -> liftcore (studies.flight, ballflight) through cached wrappers -> figures_ball.
"""

from __future__ import annotations

import pandas as pd
import streamlit as st

from liftcore import ballflight as bf
from liftcore import figures_ball as fb
from liftcore import units
from liftcore.balls import BALLS, LAUNCH_KEYS, MODELS, ball_table, typical_launch
from liftcore.errors import InputError
from liftcore.studies import flight as study
from liftcore.studies import format_number
from liftcore.files import csv_text
from views.inputs import (input_widget, render_inputs, set_values, state_key, unit_system,
                          widget_changed)
from views.results import (bold_html, cached, general_warnings, open_tab_only, number_text, run_for_page, show_figure, stop_for,
                           show_headlines, show_sources_and_cautions, show_warnings, study_figures,
                           study_tables, table_in_units)
from views.tools import page_tools

KIND = study.KIND
SPEC = study.INPUTS
#: Flights pinned to the charts of this page (not the kept options of the Compare page).
OVERLAY_KEY = "flight:overlaid"
#: The tracked flights uploaded on the fit tab (kept for the handout; never in files or links).
TRACKS_KEY = "flight:tracks"
MAX_OVERLAID = 4

def _cached(name: str, values: dict, compute, label: str | None = None, data=None):
    """A flight-study tool (sweep, best launch, spread, fit) through the shared result cache."""
    return cached(("flight " + name, values, data), compute, label)


def _overlay_label(i: int, vals: dict) -> str:
    """The name of an overlaid flight, in the current units (so it follows the unit switch)."""
    ball = BALLS[vals["ball"]].name if vals["ball"] in BALLS else "Custom ball"
    return (f"Overlay {i}: {ball}, {number_text(vals['speed_m_s'], 'ball_speed')} at "
            f"{format_number(vals['elevation_deg'])}°, {number_text(vals['spin_rpm'], 'rotation', 4)}")


def _page_extra(overlaid: list, values: dict):
    """The study's ``extra``: the overlaid flights ((label, inputs), ...) and, when the fit of
    uploaded tracks is to be in the handout, the tracks; ``None`` when there is neither."""
    extra = {}
    if overlaid:
        extra["overlay"] = tuple((_overlay_label(i, v), v) for i, v in enumerate(overlaid, start=1))
    if values["fit_in_report"] and values["fit_source"] == "file" and TRACKS_KEY in st.session_state:
        extra["tracks"] = st.session_state[TRACKS_KEY]
    return extra or None


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
            set_values(SPEC, {**launch, **study.sweep_ranges_around(launch)})
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
    return render_inputs(SPEC, skip=("ball", "coefficient_model") + study.SPREAD_KEYS
                         + study.SWEEP_KEYS + study.FIT_KEYS)


# ----------------------------------------------------------------------------- tabs
def _flight_tab(result, values):
    system = unit_system()
    d = result.detail
    # every result in one sentence, and on the picture itself (no tile grid)
    with st.container(key="flight_summary"):
        st.markdown(f"<p class='lc-summary'>{bold_html(study.summary(result, system))}</p>",
                    unsafe_allow_html=True)
        heads = {h.key for h in result.headlines}
        for w in result.warnings:
            if w.subject in heads:
                st.caption(f"⚠ {w.text(system)}")
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
    _obstacle_table(result)
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
    c3.download_button("Path of this flight (CSV)", csv_text(path), "flight_path.csv",
                       "text/csv", key="flight_download",
                       help="Time, position, speed, spin and coefficients along the flight, in the "
                            "units chosen (the unit is in each column name)")


def _along_tab(result):
    system = unit_system()
    d = result.detail
    flights = list(study.display_flights(result, system))
    c1, c2 = st.columns(2)
    with c1:
        show_figure(study_figures(study, result)["Along the flight"], key="fig_along")
    with c2:
        if d.setup.density_kg_m3 > 0:
            show_figure(fb.coefficient_curves(d.setup.model, flights[0], system), key="fig_coef")
        else:
            st.info("In vacuum there is no drag or lift to show.")


def _flight_3d_tab(result):
    st.caption("The path in three dimensions (drag to turn it). Its own tab: a 3-D chart takes a "
               "while to draw on a computer without graphics acceleration.")
    show_figure(study_figures(study, result)["Flight path in 3-D"], key="fig_3d")


def _draw_inputs(keys, per_row: int = 4) -> None:
    """Study inputs drawn in the main area of a tab, ``per_row`` to a row (those that apply)."""
    from views.inputs import current_values

    now = current_values(SPEC)
    fields = [SPEC.field(k) for k in keys if SPEC.field(k).shown_for(now)]
    for start in range(0, len(fields), per_row):
        for col, f in zip(st.columns(per_row), fields[start:start + per_row]):
            with col:
                input_widget(SPEC, f)


def _sweep_tab(values):
    st.markdown("Map one result over a grid of two launch inputs; every grid point is a full flight. "
                "The star marks the best grid point; the search refines it. These settings go into "
                "the share link and the scenario file.")
    _draw_inputs(("sweep_x", "sweep_y", "sweep_output", "sweep_goal"))
    from views.inputs import current_values

    now = current_values(SPEC)
    x, y = now["sweep_x"], now["sweep_y"]
    _draw_inputs((f"sweep_{x}_from", f"sweep_{x}_to", f"sweep_{y}_from", f"sweep_{y}_to",
                  "sweep_points"), per_row=5)
    _draw_inputs(("sweep_must_clear", "sweep_in_report"), per_row=2)  # switches: room for their words
    v = {**values, **{k: st.session_state.get(state_key(KIND, k), SPEC.field(k).default) for k in study.SWEEP_KEYS}}
    try:
        sw = _cached("sweep", v, lambda progress: study.launch_sweep(v, progress), "Flying the grid")
    except InputError as exc:
        st.error(str(exc), icon=":material/error:")
        return
    out_label, out_kind = bf.SWEEP_OUTPUTS[v["sweep_output"]]
    labels = study.SWEEP_LABELS
    c1, c2 = st.columns([3, 1])
    with c2:
        best = "Best margin" if sw.output == bf.MARGIN_OUTPUT else f"Best {out_label.lower()}"
        st.metric(f"{best} on the grid", number_text(sw.best_value, out_kind, 4))
        st.caption(f"{labels[sw.x_key][0]}: {number_text(sw.best_x, labels[sw.x_key][1])}; "
                   f"{labels[sw.y_key][0]}: {number_text(sw.best_y, labels[sw.y_key][1])}"
                   + (" (the best of the launches that clear every obstacle)" if sw.best_clears else ""))
        if sw.margins:
            _clearance_note(sw, v)
        opt = None
        if st.button("Search the best launch", key="flight_search",
                     help="Refines the grid's best point within the two ranges (scipy Nelder-Mead)."):
            st.session_state["flight:searched"] = v
        if st.session_state.get("flight:searched") == v:
            opt = _cached("best", v, lambda progress: study.best_launch(v), "Searching")
            st.metric(f"Searched {out_label.lower()}", number_text(opt.best_value, out_kind, 4))
            st.caption("; ".join(f"{labels[k][0]}: {number_text(val, labels[k][1])}"
                                 for k, val in zip(opt.keys, opt.values))
                       + f" ({opt.evaluations:,} flights"
                       + ("; only launches that clear every obstacle" if sw.best_clears else "")
                       + "). Other inputs as in the sidebar.")
    with c1:
        show_figure(study.sweep_figure(sw, v, unit_system(), None if opt is None else opt.values),
                    key="fig_sweep")
    show_warnings([w for w in sw.warnings if w.severity == "invalid"])


def _clearance_note(sw, values) -> None:
    """How many launches of the grid clear each obstacle and all of them."""
    n = sw.clearance_counts()
    share = lambda k: f"{n[k]:,} of {n['points']:,} ({100 * n[k] / n['points']:.0f} %)"  # noqa: E731
    st.metric("Launches that clear every obstacle", share("all"))
    how = ("blue clears, red misses" if sw.output == bf.MARGIN_OUTPUT else
           "faded on the map: launches that miss one")
    st.caption("; ".join(f"{name}: {share(name)}" for name, _ in sw.margins)
               + f". {how[0].upper()}{how[1:]}; the dashed line is where the smallest margin is zero.")
    if n["all"] == 0 and values["sweep_must_clear"]:
        st.warning("No launch on the grid clears every obstacle: the star marks the best of all. Widen "
                   "the ranges or move them.", icon=":material/warning:")


def _obstacle_table(result) -> None:
    """The obstacles' dimensions, the rules they come from and how this flight clears them."""
    if "obstacles" not in result.tables:
        return
    table = study.tables_in_units(result, unit_system())["obstacles"].round(3)
    table = table.astype(object).where(table.notna(), "")  # no "None" where a size does not apply
    with st.expander("Obstacles: dimensions, rules and margins", expanded=False):
        st.dataframe(table, hide_index=True, width="stretch",
                     column_config={"rule": st.column_config.TextColumn(width="large")})
        st.caption("Dimensions from the governing bodies' rules as cited (from memory); width 0 means "
                   "the net spans the whole court. Margin: positive clears (or is inside), negative misses.")


def _spread_tab(values):
    st.markdown("Launch conditions drawn from normal distributions (seeded, so a run repeats); "
                "each draw is flown to the ground.")
    _draw_inputs(study.SPREAD_KEYS)
    v = {**values, **{k: st.session_state.get(state_key(KIND, k), SPEC.field(k).default) for k in study.SPREAD_KEYS}}
    if v["dispersion_n"] < 2:
        st.info("Set the number of flights to 2 or more to see the spread.")
        return
    try:
        disp = _cached("spread", v, lambda progress: study.landing_spread(v, progress), "Flying")
    except InputError as exc:
        st.error(str(exc), icon=":material/error:")
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
    _draw_inputs(study.FIT_KEYS, per_row=3)
    v = {**values, **{k: st.session_state.get(state_key(KIND, k), SPEC.field(k).default) for k in study.FIT_KEYS}}
    tracks = None
    if v["fit_source"] == "demo":
        d = bf.DEMO_TRACKS
        shown = _cached("demo tracks", {}, lambda progress: bf.demo_tracks())
        st.caption(f"Invented demo tracks: a baseball at sea level with {d['spin_rpm']:,.0f} rpm backspin, made from "
                   f"constant CD {d['cd']} and CL {d['cl']} plus {100 * d['noise_m']:.0f} cm noise; the fit should find them.")
    else:
        up = st.file_uploader("Tracked positions (CSV)", type=["csv", "txt"], key="flight_tracks_file")
        st.download_button("Example file in this format (the invented demo tracks)",
                           csv_text(_cached("demo tracks", {}, lambda progress: bf.demo_tracks())),
                           "tracks_example_invented.csv", "text/csv", key="flight_tracks_template")
        if up is None:
            st.info("Upload a CSV file in the format above, or choose the invented demo tracks.")
            return
        try:
            tracks = bf.read_tracks(up)
        except InputError as exc:
            st.error(str(exc), icon=":material/error:")
            return
        tracks.attrs["source_name"] = up.name
        st.session_state[TRACKS_KEY] = tracks  # for the handout, when the fit is to be in it
        shown = tracks
    st.caption(f"{shown['flight'].nunique():,} flights, {len(shown):,} positions.")
    if st.button("Fit the tracks", key="flight_fit_run", type="primary"):
        st.session_state["flight:fitted"] = (v, tracks is None or tracks.attrs.get("source_name"))
    if st.session_state.get("flight:fitted") != (v, tracks is None or tracks.attrs.get("source_name")):
        return
    try:
        fit = _cached("fit", v, lambda progress: study.track_fit(v, tracks), "Fitting", data=tracks)
    except InputError as exc:
        st.error(str(exc), icon=":material/error:")
        return
    cards = [(name, "{:.4f} ± {:.4f}".format(*fit.parameter(name))) for name in fit.names[:fit.coefficient_count]]
    cards.append(("RMS miss", number_text(fit.rms_m, "length")))
    for start in range(0, len(cards), 3):  # at most three a row: "0.3427 ± 0.0103" fits at 1280 px
        for col, (name, text) in zip(st.columns(3), cards[start:start + 3]):
            col.metric(name, text)
    if fit.mode == "curve":
        st.download_button("Save the fitted curves as a table (.csv)", fit.curve_table().encode(),
                           file_name="fitted_curves.csv", mime="text/csv", key="flight_fit_table",
                           help="S, CD, CL: paste it as *Your own table* (or --aero-table) to fly with it.")
    st.caption("± one standard deviation from the Jacobian at the solution (assumes independent, equal "
               f"noise on every coordinate); {fit.nfev:,} evaluations of the residuals, {fit.dof:,} degrees of freedom. "
               f"{fit.message}")
    for w in fit.warnings():
        st.warning(w.message, icon=":material/warning:")
    c1, c2 = st.columns(2)
    system = unit_system()
    with c1:
        show_figure(fb.fit_tracks_side(fit, shown, system), key="fig_fit_side")
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
# the page's main run is the one flight (and a second one); its tabs run the rest when opened
main_values = dict(values, dispersion_n=0, sweep_in_report=False, fit_in_report=False)
extra = _page_extra(st.session_state.get(OVERLAY_KEY, []), values)
result, problem = run_for_page(KIND, main_values, extra=extra, label="Flying")
page_tools(study, extra=extra, problem=problem)
if problem:
    stop_for(problem)

# Tabs track which one is open (so a button inside a tab keeps it open) and only the open one runs.
open_tab_only({"Flight": lambda: _flight_tab(result, values), "Along the flight": lambda: _along_tab(result),
               "Flight in 3-D": lambda: _flight_3d_tab(result), "Launch sweep": lambda: _sweep_tab(main_values),
               "Launch spread": lambda: _spread_tab(values), "Fit to tracked flights": lambda: _fit_tab(main_values),
               "Balls and models": _balls_tab}, "flight_tab")
show_sources_and_cautions(study)
