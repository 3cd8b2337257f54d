"""The ball-flight page: renders, and what it shows equals a direct core call (AppTest)."""

from pathlib import Path

import numpy as np
import pytest
from numpy.testing import assert_allclose
from streamlit.testing.v1 import AppTest

from liftcore import ballflight as bf
from liftcore import units
from liftcore.balls import LAUNCH_KEYS, typical_launch
from liftcore.studies import flight as study
from liftcore.studies import run_study

PAGE = str(Path(__file__).resolve().parents[1] / "views" / "flight.py")


def summary_shown(at) -> str:
    """The sentence above the flight picture (every headline of the flight)."""
    return next(m.value for m in at.markdown if "lc-summary" in m.value)


def expected_summary(values: dict, system: str = "SI") -> str:
    from views.results import bold_html

    return f"<p class='lc-summary'>{bold_html(study.summary(run_study('flight', values), system))}</p>"


def metric(at, label):
    for m in at.metric:
        if m.label == label:
            return m.value
    raise AssertionError(f"no metric {label!r}; have {[m.label for m in at.metric]}")


@pytest.fixture(scope="module")
def page():
    at = AppTest.from_file(PAGE, default_timeout=90)
    at.run()
    assert not at.exception, at.exception
    return at


def test_page_renders_with_title_headlines_and_cautions(page):
    assert page.title[0].value == "Spinning ball flight"
    r = run_study("flight", {"dispersion_n": 0})
    assert summary_shown(page) == expected_summary({"dispersion_n": 0})
    assert r.headline("carry_m").text("SI") in summary_shown(page)
    assert len(page.metric) == 0  # the numbers are in the sentence and on the picture, no tiles
    assert any("not for safety distances" in i.value for i in page.info)


def test_changing_inputs_matches_the_core(page):
    page.selectbox(key="w:flight:ball:SI").set_value("golf").run()
    page.number_input(key="w:flight:speed_m_s:SI").set_value(65.0).run()
    page.number_input(key="w:flight:elevation_deg:SI").set_value(12.0).run()
    page.number_input(key="w:flight:spin_rpm:SI").set_value(2800.0).run()
    page.number_input(key="w:flight:spin_axis_deg:SI").set_value(15.0).run()
    assert not page.exception, page.exception
    # choosing golf set its typical launch (a drive from the ground); four inputs changed since
    values = {**typical_launch("golf")[1], "ball": "golf", "speed_m_s": 65.0, "elevation_deg": 12.0,
              "spin_rpm": 2800.0, "spin_axis_deg": 15.0, "dispersion_n": 0}
    assert summary_shown(page) == expected_summary(values)
    # the sweep tab's best grid point is the core sweep's best point
    page.session_state["flight_tab"] = "Launch sweep"
    page.run()
    clean = study.INPUTS.validate(values)
    setup, _ = study.setup_from_values(clean)
    sw = bf.sweep(setup, study.launch_from_values(clean), "elevation_deg", np.linspace(10, 45, 21),
                  "spin_rpm", np.linspace(0, 4000, 21), "carry_m", True)
    assert metric(page, "Best carry on the grid").startswith(f"{sw.best_value:.4g}")
    # the spread tab equals a direct dispersion with the page's defaults (2000 flights, seed 1)
    page.session_state["flight_tab"] = "Launch spread"
    page.run()
    assert not page.exception, page.exception
    d = bf.dispersion(setup, study.launch_from_values(clean), study.spread_sd(clean), 2000, 1)
    assert metric(page, "Carry P50") == f"{d.carry_percentiles_m[50]:.3g} m"


def launch_of(at) -> dict:
    return {k: at.session_state[f"flight:{k}"] for k in LAUNCH_KEYS if f"flight:{k}" in at.session_state}


def test_a_new_ball_gets_its_typical_launch_and_the_old_one_stays_reachable():
    at = AppTest.from_file(PAGE, default_timeout=90)
    at.run()
    at.number_input(key="w:flight:speed_m_s:SI").set_value(41.0).run()
    mine = {**{k: study.INPUTS.field(k).default for k in LAUNCH_KEYS}, "speed_m_s": 41.0}
    at.selectbox(key="w:flight:ball:SI").set_value("golf").run()
    assert not at.exception, at.exception
    what, drive = typical_launch("golf")
    assert launch_of(at) == drive
    assert at.number_input(key="w:flight:speed_m_s:SI").value == 70.0  # the box shows it too
    assert any("common practice" in i.value and what in i.value for i in at.info)
    assert summary_shown(at) == expected_summary({**drive, "ball": "golf", "dispersion_n": 0})
    at.button(key="flight:back_to_my_launch").click().run()
    assert launch_of(at) == mine and at.session_state["flight:ball"] == "golf"
    # with "keep my launch" on, another ball keeps what is typed
    at.toggle(key="flight:keep_launch").set_value(True).run()
    at.selectbox(key="w:flight:ball:SI").set_value("tennis").run()
    assert launch_of(at) == mine and at.session_state["flight:ball"] == "tennis"


def test_imperial_units_and_second_flight():
    at = AppTest.from_file(PAGE, default_timeout=90)
    at.session_state["unit_system"] = "imperial"
    at.run()
    at.selectbox(key="w:flight:compare_with:imperial").set_value("altitude").run()
    assert not at.exception, at.exception
    r = run_study("flight", {"compare_with": "altitude", "dispersion_n": 0})
    assert summary_shown(at) == expected_summary({"compare_with": "altitude", "dispersion_n": 0}, "imperial")
    assert f"<b>{r.headline('carry_m').text('imperial')}</b>" in summary_shown(at)
    assert r.headline("carry_m").text("imperial").endswith("yd")
    table = at.dataframe[0].value
    # the second flight is named in the units shown (1600 m, the default other altitude, in feet)
    feet = units.to_display(1600.0, "altitude", "imperial")
    assert list(table["Flight"]) == ["This flight", f"At {feet:.0f} ft altitude"]
    second = r.detail.flights[1]
    assert_allclose(table["Carry [yd]"][1], units.to_display(second.carry_m, "distance", "imperial"), atol=0.006)
    side = chart(at, "Side view: height against distance")
    assert side["layout"]["xaxis"]["title"]["text"] == "Downrange [yd]"
    assert side["data"][2]["name"] == f"At {feet:.0f} ft altitude"


def chart(at, title: str) -> dict:
    import json

    specs = [json.loads(c.proto.spec) for c in at.get("plotly_chart")]
    for s in specs:
        if s["layout"]["title"]["text"] == title:
            return s
    raise AssertionError(f"no chart {title!r}")


def test_overlay_button_pins_flights_to_the_charts_in_the_units_shown():
    at = AppTest.from_file(PAGE, default_timeout=90)
    at.session_state["unit_system"] = "imperial"
    at.run()
    button = at.button(key="flight_overlay")
    assert button.label == "Overlay this flight on the charts"
    assert "Keep as option" in button.help and "Compare options" in button.help
    button.click().run()
    at.number_input(key="w:flight:speed_m_s:imperial").set_value(80.0).run()
    assert not at.exception, at.exception
    table = at.dataframe[0].value
    assert list(table["Flight"])[0] == "This flight"
    assert list(table["Flight"])[1].startswith("Overlay 1: Baseball, 100 mph at 28°")
    # the pinned flight keeps the launch it had (100 mph, the default); the current one is 80 mph
    pinned = run_study("flight", {"dispersion_n": 0})
    now = run_study("flight", {"dispersion_n": 0, "speed_m_s": float(units.from_display(80.0, "ball_speed", "imperial"))})
    assert_allclose(table["Carry [yd]"], [units.to_display(now.headline("carry_m").value, "distance", "imperial"),
                                          units.to_display(pinned.headline("carry_m").value, "distance", "imperial")],
                    atol=0.006)
    side = chart(at, "Side view: height against distance")["data"]
    # two paths with their peaks, and this flight's descent drawn at its landing (context lines)
    assert len([t for t in side if t.get("meta") != "context"]) == 4
    assert len([t for t in side if t.get("meta") == "context"]) == 2
    # the overlay is not a kept option of the Compare page
    assert at.session_state["_lc:options"] == []
    at.button(key="flight_overlay_clear").click().run()
    assert not at.exception
    assert not [d for d in at.dataframe if "Flight" in d.value.columns]  # only this flight: no table


def test_fit_tab_recovers_the_demo_coefficients():
    at = AppTest.from_file(PAGE, default_timeout=90)
    at.session_state["flight_tab"] = "Fit to tracked flights"
    at.run()
    at.button(key="flight_fit_run").click().run()
    assert not at.exception, at.exception
    fit = bf.fit_tracks(bf.demo_tracks_setup(), bf.demo_tracks(), bf.DEMO_TRACKS["spin_rpm"], 0.0)
    cd, scd = fit.parameter("CD")
    assert metric(at, "CD") == f"{cd:.4f} ± {scd:.4f}"


def test_fit_tab_shows_every_curve_parameter_and_offers_the_table():
    at = AppTest.from_file(PAGE, default_timeout=90)
    at.session_state["flight_tab"] = "Fit to tracked flights"
    at.query_params["v"] = "1"
    at.query_params["fit_mode"] = "curve"
    at.run()
    at.button(key="flight_fit_run").click().run()
    assert not at.exception, at.exception
    fit = bf.fit_tracks(bf.demo_tracks_setup(), bf.demo_tracks(), bf.DEMO_TRACKS["spin_rpm"], 0.0, mode="curve")
    for name in bf.CURVE_NAMES:
        value, sd = fit.parameter(name)
        assert metric(at, name) == f"{value:.4f} ± {sd:.4f}"
    assert at.get("download_button")


def test_sweep_tab_counts_the_free_kicks_that_clear_and_the_flight_tab_cites_the_rules():
    at = AppTest.from_file(PAGE, default_timeout=90)
    at.query_params["v"] = "1"
    for k, v in {"ball": "soccer", "obstacle": "free_kick", "speed_m_s": "22", "elevation_deg": "14",
                 "spin_rpm": "600", "spin_axis_deg": "-60", "sweep_x": "elevation_deg", "sweep_y": "speed_m_s",
                 "sweep_points": "9", "sweep_elevation_deg_from": "5", "sweep_elevation_deg_to": "30",
                 "sweep_speed_m_s_from": "15", "sweep_speed_m_s_to": "30"}.items():
        at.query_params[k] = v
    at.run()
    assert not at.exception, at.exception
    rules = next(d.value for d in at.dataframe if "rule" in d.value.columns)
    assert list(rules["obstacle"]) == ["wall", "goal"] and "IFAB Law 13 (9.15 m)" in rules["rule"].iloc[0]
    at.session_state["flight_tab"] = "Launch sweep"
    at.run()
    assert not at.exception, at.exception
    values = study.INPUTS.validate({k: at.session_state[f"flight:{k}"] for k in study.INPUTS.keys
                                    if f"flight:{k}" in at.session_state})
    counts = study.launch_sweep(values).clearance_counts()
    assert counts["points"] == 81 and 0 < counts["all"] < 81
    assert metric(at, "Launches that clear every obstacle").startswith(f"{counts['all']:,} of 81")
    # mapping the margin itself, then back to carry: no error, the boxes keep what was typed
    at.selectbox(key="w:flight:sweep_output:SI").set_value("margin_m").run()
    assert not at.exception and not at.error, at.error
    assert metric(at, "Best margin on the grid")
    at.selectbox(key="w:flight:sweep_output:SI").set_value("carry_m").run()
    assert metric(at, "Launches that clear every obstacle").startswith(f"{counts['all']:,} of 81")
