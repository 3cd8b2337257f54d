"""The two theory pages through Streamlit's AppTest: what they show is what the core computes."""

import re
from pathlib import Path

import numpy as np
import pytest
from numpy.testing import assert_allclose
from streamlit.testing.v1 import AppTest

from liftcore import fieldcirc as fc
from liftcore import potential as pot
from liftcore import units
from liftcore.air import air_state
from liftcore.scenario import load_scenario
from liftcore.studies import run_study
from tests.conftest import ROOT

FLOW = str(ROOT / "views" / "flow.py")
FIELD = str(ROOT / "views" / "field.py")
TIMEOUT = 60


def metrics(at) -> dict:
    return {m.label: m.value for m in at.metric}


def number_of(text: str) -> float:
    """The number in a metric's text ('1,234.5 N/m' -> 1234.5)."""
    m = re.match(r"^\s*(-?[\d,]*\.?\d+(?:e[-+]?\d+)?)", text)
    assert m, text
    return float(m.group(1).replace(",", ""))


def shown_close(text: str, value: float, digits: int = 4):
    # the page rounds to `digits` significant figures
    assert_allclose(number_of(text), value, rtol=0.6 * 10 ** (1 - digits))


# ----------------------------------------------------------------------------- flow page
def test_flow_page_smoke():
    at = AppTest.from_file(FLOW, default_timeout=TIMEOUT).run()
    assert not at.exception
    assert at.title[0].value == "Flow around a spinning cylinder"
    assert len(at.metric) >= 6
    assert not at.error


def test_flow_page_spin_ratio_matches_core():
    at = AppTest.from_file(FLOW, default_timeout=TIMEOUT).run()
    at.number_input(key="w:flow:radius_m:SI").set_value(0.3)
    at.number_input(key="w:flow:speed_m_s:SI").set_value(12.0)
    at.number_input(key="w:flow:spin_ratio:SI").set_value(2.5)
    at.run()
    assert not at.exception
    air = air_state(0.0)
    core = pot.ideal_spinning_cylinder(0.3, 12.0, pot.spin_rate_from_ratio(2.5, 0.3, 12.0),
                                       air.density_kg_m3, air.speed_of_sound_m_s)
    m = metrics(at)
    shown_close(m["Ideal lift per unit span ρVΓ"], core.lift_per_span_n_m)
    shown_close(m["Circulation Γ = 2πR·ωR"], core.circulation_m2_s)
    shown_close(m["Lift coefficient CL = 2π SR"], core.lift_coefficient)
    shown_close(m["CL from the surface pressure"], core.lift_coefficient_from_pressure, 6)
    # SR 2.5 > 2: the page says the stagnation point left the surface, at the core's distance
    from liftcore.studies.flow import stagnation_text
    assert any(md.value == f"**{stagnation_text(core)}**" for md in at.markdown)
    assert "left the surface" in stagnation_text(core)


def test_flow_page_rpm_mode_and_measured_air():
    at = AppTest.from_file(FLOW, default_timeout=TIMEOUT).run()
    at.selectbox(key="w:flow:spin_mode:SI").set_value("rpm").run()
    at.number_input(key="w:flow:spin_rpm:SI").set_value(240.0)
    at.selectbox(key="w:flow:air_mode:SI").set_value("measured").run()
    at.number_input(key="w:flow:temperature_k:SI").set_value(30.0)  # shown in degC in SI
    at.number_input(key="w:flow:pressure_pa:SI").set_value(990.0)  # shown in hPa
    at.run()
    assert not at.exception
    air = air_state(0.0, 303.15, 99000.0, 0.0)
    omega = 240.0 * pot.RAD_S_PER_RPM
    core = pot.ideal_spinning_cylinder(0.5, 8.0, omega, air.density_kg_m3, air.speed_of_sound_m_s)
    m = metrics(at)
    shown_close(m["Spin ratio ωR/V"], core.spin_ratio, 3)
    shown_close(m["Air density"], air.density_kg_m3)
    shown_close(m["Ideal lift per unit span ρVΓ"], core.lift_per_span_n_m)


def test_flow_page_imperial_units_show_same_quantity():
    at = AppTest.from_file(FLOW, default_timeout=TIMEOUT).run()
    at.session_state["unit_system"] = "imperial"
    at.run()
    assert not at.exception
    # the radius typed in SI (0.5 m) is shown in feet
    # (0.5 m = 1.6404 ft, shown as typed to 0.1 %: 1.64 ft; the value used stays 0.5 m)
    assert_allclose(at.number_input(key="w:flow:radius_m:imperial").value,
                    units.to_display(0.5, "length", "imperial"), rtol=1e-3)
    assert at.session_state["flow:radius_m"] == 0.5
    core = run_study("flow", {})
    m = metrics(at)
    lift = units.to_display(core.detail.lift_per_span_n_m, "force_per_span", "imperial")
    assert m["Ideal lift per unit span ρVΓ"].endswith("lbf/ft")
    shown_close(m["Ideal lift per unit span ρVΓ"], lift)


# ----------------------------------------------------------------------------- field page
def core_demo(**kw):
    field = fc.field_from_table(fc.demo_field_table())
    args = dict(body_centre_m=(0.0, 0.0), body_radius_m=0.05, loop_sizes_m=np.linspace(0.08, 0.28, 12),
                density_kg_m3=air_state(0.0).density_kg_m3)
    args.update(kw)
    return fc.circulation_from_field(field, **args)


def test_field_page_smoke_uses_invented_demo():
    at = AppTest.from_file(FIELD, default_timeout=TIMEOUT).run()
    assert not at.exception
    assert at.title[0].value == "Circulation from a measured field"
    assert any("invented" in i.value for i in at.info)
    core = core_demo()
    m = metrics(at)
    shown_close(m["Circulation Γ (outer loops)"], core.circulation_m2_s)
    shown_close(m["Lift per unit span ρVΓ"], core.lift_per_span_n_m)
    shown_close(m["Free-stream speed"], core.free_stream_speed_m_s)


def test_field_page_rectangles_and_given_speed_match_core():
    at = AppTest.from_file(FIELD, default_timeout=TIMEOUT).run()
    at.selectbox(key="w:field:loop_shape:SI").set_value("rectangle").run()
    at.number_input(key="w:field:rectangle_aspect:SI").set_value(0.8)
    at.selectbox(key="w:field:free_stream_mode:SI").set_value("given").run()
    at.number_input(key="w:field:free_stream_m_s:SI").set_value(10.0)
    at.number_input(key="w:field:loop_count:SI").set_value(9)
    at.run()
    assert not at.exception
    core = core_demo(shape="rectangle", aspect=0.8, free_stream_speed_m_s=10.0,
                     loop_sizes_m=np.linspace(0.08, 0.28, 9))
    m = metrics(at)
    shown_close(m["Circulation Γ (outer loops)"], core.circulation_m2_s)
    shown_close(m["Lift per unit span ρVΓ"], core.lift_per_span_n_m)


def test_field_page_refuses_loop_outside_grid_and_keeps_inputs():
    at = AppTest.from_file(FIELD, default_timeout=TIMEOUT).run()
    at.number_input(key="w:field:loop_max_m:SI").set_value(0.4).run()
    assert not at.exception
    assert len(at.error) == 1
    assert "leaves the measured grid" in at.error[0].value
    assert "largest circle round this centre that fits has radius 0.3 m" in at.error[0].value
    assert at.number_input(key="w:field:loop_max_m:SI").value == 0.4
    assert not at.metric


def test_field_page_upload_good_and_bad_files():
    axis = np.linspace(-1.0, 1.0, 41)
    field = fc.synthetic_cylinder_field(axis, axis, 4.0, 0.1, -1.3, centre_m=(0.1, 0.0))
    csv = fc.field_to_table(field).sample(frac=1.0, random_state=1).to_csv(index=False).encode()
    at = AppTest.from_file(FIELD, default_timeout=TIMEOUT).run()
    at.number_input(key="w:field:body_x_m:SI").set_value(0.1)
    at.number_input(key="w:field:body_radius_m:SI").set_value(0.1)
    at.number_input(key="w:field:loop_min_m:SI").set_value(0.3)
    at.number_input(key="w:field:loop_max_m:SI").set_value(0.8)
    at.file_uploader[0].set_value(("tunnel.csv", csv, "text/csv")).run()
    assert not at.exception and not at.error
    assert not any("invented" in i.value for i in at.info)
    m = metrics(at)
    # analytic: the uploaded field was built with circulation -1.3 m2/s (counter-clockwise)
    shown_close(m["Circulation Γ (outer loops)"], -1.3, 2)
    core = fc.circulation_from_field(fc.field_from_table(fc.read_field_csv(csv)), (0.1, 0.0), 0.1,
                                     np.linspace(0.3, 0.8, 12), air_state(0.0).density_kg_m3)
    shown_close(m["Lift per unit span ρVΓ"], core.lift_per_span_n_m)

    lines = csv.decode().splitlines()
    broken = "\n".join(lines + [lines[5]]).encode()  # a duplicate point
    at.file_uploader[0].set_value(("tunnel.csv", broken, "text/csv")).run()
    assert not at.exception
    assert len(at.error) == 1 and "duplicate point" in at.error[0].value
    assert "data rows 5 and 1682" in at.error[0].value
    assert at.number_input(key="w:field:loop_max_m:SI").value == 0.8


# ----------------------------------------------------------------------------- scenarios
@pytest.mark.parametrize("name", ["flow_demo_invented.toml", "field_demo_invented.toml"])
def test_our_scenarios_load_and_run(name):
    path = ROOT / "scenarios" / name
    s = load_scenario(path)
    assert "invented" in s.title.lower()
    result = run_study(s.kind, s.inputs)
    assert result.kind == s.kind
    assert all(np.isfinite(h.value) for h in result.headlines)
    if s.kind == "flow":
        # analytic: Kutta-Joukowski from the pressure integral
        assert_allclose(result.detail.lift_coefficient_from_pressure, result.detail.lift_coefficient, rtol=1e-9)


# ----------------------------------------------------------------------------- units in charts and tables
def chart_specs(at) -> list[dict]:
    import json

    return [json.loads(c.proto.spec) for c in at.get("plotly_chart")]


def test_flow_page_in_imperial_converts_the_surface_table_and_names_the_radius_in_feet():
    at = AppTest.from_file(FLOW, default_timeout=TIMEOUT)
    at.session_state["unit_system"] = "imperial"
    at.run()
    assert not at.exception
    stream = chart_specs(at)[0]  # the first tab: the flow and its pressure
    at.session_state["flow_tab"] = "Surface table (every 5°)"
    at.run()
    table = at.dataframe[0].value
    core = run_study("flow", {}).tables["surface"]
    assert_allclose(table["surface speed [mph]"],
                    units.to_display(core["surface_speed_m_s"].to_numpy(), "speed", "imperial"))
    assert_allclose(table["pressure coefficient"], core["pressure_coefficient"])  # no unit: unchanged
    feet = units.to_display(0.5, "length", "imperial")
    assert f"R = {feet:.3g} ft" in stream["layout"]["xaxis"]["title"]["text"]


def test_field_page_in_imperial_converts_the_loops_table_and_chart_axes():
    at = AppTest.from_file(FIELD, default_timeout=TIMEOUT)
    at.session_state["unit_system"] = "imperial"
    at.run()
    assert not at.exception
    core = core_demo()
    table = at.dataframe[0].value
    assert_allclose(table["loop size [ft]"], units.to_display(np.asarray(core.loop_sizes_m), "length", "imperial"))
    assert_allclose(table["circulation [ft²/s]"],
                    units.to_display(np.asarray(core.circulations_m2_s), "circulation", "imperial"))
    specs = chart_specs(at)
    assert specs[0]["layout"]["xaxis"]["title"]["text"] == "x [ft]"
    assert specs[1]["layout"]["yaxis"]["title"]["text"] == "circulation Γ [ft²/s]"


def test_field_page_shows_air_inputs_only_when_the_fluid_is_air():
    at = AppTest.from_file(FIELD, default_timeout=TIMEOUT).run()
    keys = lambda: {w.key for w in at.number_input} | {w.key for w in at.selectbox}  # noqa: E731
    assert {"w:field:air_mode:SI", "w:field:altitude_m:SI"} <= keys()
    at.selectbox(key="w:field:air_mode:SI").set_value("measured").run()
    assert {"w:field:temperature_k:SI", "w:field:pressure_pa:SI"} <= keys()
    assert "w:field:altitude_m:SI" not in keys()
    at.selectbox(key="w:field:density_mode:SI").set_value("given").run()
    assert not at.exception
    shown = keys()
    assert "w:field:density_kg_m3:SI" in shown
    assert not shown & {f"w:field:{k}:SI" for k in ("air_mode", "altitude_m", "temperature_k", "pressure_pa",
                                                     "relative_humidity_pct")}
