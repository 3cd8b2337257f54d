"""The rotor page: it renders, and what it shows after an interaction is the core's number."""

import math
from pathlib import Path

import pytest
from numpy.testing import assert_allclose
from streamlit.testing.v1 import AppTest

from liftcore import rotor, units
from liftcore import rotor_inputs
from liftcore.constants import KNOT_M_S
from liftcore.studies import format_number
from liftcore.studies import rotor as study

PAGE = str(Path(__file__).resolve().parents[1] / "views" / "rotor.py")


def key(name, system="SI"):
    return f"w:rotor:{name}:{system}"


@pytest.fixture
def page():
    at = AppTest.from_file(PAGE, default_timeout=120)
    at.run()
    assert not at.exception
    return at


def metric(at, label):
    for m in at.metric:
        if m.label == label:
            return m.value
    raise KeyError(f"{label!r} not on the page; shown: {[m.label for m in at.metric]}")


def core_op(values):
    clean = study.INPUTS.validate(values)
    setup, op = study.operating_point(clean)
    return op


def test_page_renders_with_title_headlines_charts_and_cautions(page):
    assert page.title[0].value == "Rotor sail on a ship"
    labels = [m.label for m in page.metric]
    for label in ("Net power gain", "Thrust along the heading", "Spin power (shaft)", "Heeling moment",
                  "Side force", "Apparent wind angle", "Spin ratio", "Lift coefficient", "Drag coefficient"):
        assert label in labels
    assert len(page.get("plotly_chart")) == 1  # the open tab's chart only (lift and drag of the sets)
    for tab, charts in (("Spin power", 1), ("Around the compass", 1), ("Along the rotor", 1),
                        ("Coefficient sets", 1)):
        page.session_state["rotor_tab"] = tab
        page.run()
        assert not page.exception and len(page.get("plotly_chart")) == charts, tab
    cautions = " ".join(i.value for i in page.info)
    assert "naval architect" in cautions and "gusts" in cautions
    # the default page is the study's default case, as the core computes it
    op = core_op({})
    assert metric(page, "Thrust along the heading") == f"{format_number(op.thrust_n / 1000)} kN"


def test_changing_ship_speed_and_wind_matches_the_core(page):
    page.number_input(key=key("ship_speed_m_s")).set_value(4.0)
    page.number_input(key=key("true_wind_speed_m_s")).set_value(14.0)
    page.number_input(key=key("true_wind_angle_deg")).set_value(-120.0)
    page.run()
    assert not page.exception
    op = core_op({"ship_speed_m_s": 4.0, "true_wind_speed_m_s": 14.0, "true_wind_angle_deg": -120.0})
    assert metric(page, "Net power gain") == f"{format_number(op.net_power_w / 1000)} kW"
    assert metric(page, "Side force") == f"{format_number(op.side_force_n / 1000)} kN"
    assert metric(page, "Apparent wind angle") == f"{format_number(float(op.apparent_wind_angle_deg))}°"


def test_fixed_rotor_speed_shows_and_uses_the_rpm_input(page):
    page.selectbox(key=key("spin_mode")).set_value("rpm")
    page.run()
    # the rotor-speed input appears in the same rerun as the choice
    page.number_input(key=key("spin_rpm")).set_value(90.0)
    page.run()
    assert not page.exception
    op = core_op({"spin_mode": "rpm", "spin_rpm": 90.0})
    assert_allclose(op.rpm, 90.0)
    assert metric(page, "Rotor speed") == "90 rpm"
    assert metric(page, "Thrust along the heading") == f"{format_number(op.thrust_n / 1000)} kN"


def test_marine_units_show_knots_and_keep_the_numbers(page):
    page.session_state["unit_system"] = "marine"
    page.run()
    assert not page.exception
    assert page.number_input(key=key("ship_speed_m_s", "marine")).value == pytest.approx(12.0)
    page.number_input(key=key("ship_speed_m_s", "marine")).set_value(8.0)
    page.run()
    op = core_op({"ship_speed_m_s": 8.0 * KNOT_M_S})
    shown = units.to_display(float(op.apparent_wind_speed_m_s), "wind_speed", "marine")
    assert metric(page, "Apparent wind at mid-height") == f"{format_number(shown)} kn"


def test_user_coefficient_table_on_the_page(page):
    page.selectbox(key=key("coefficient_set")).set_value("user")
    page.run()
    assert not page.exception
    assert any("CSV" in e.value or "empty" in e.value for e in page.error)  # asks for a table
    table = "SR,CL,CD\n0,0,0.7\n1,2.2,0.5\n2,5.0,1.3\n3,7.5,2.4\n"
    page.text_area(key=key("user_coefficients_csv")).set_value(table)
    page.run()
    assert not page.exception and not page.error
    op = core_op({"coefficient_set": "user", "user_coefficients_csv": table})
    assert metric(page, "Net power gain") == f"{format_number(op.net_power_w / 1000)} kW"
    # a broken table gives one clear line and keeps what was typed
    broken = "SR,CL,CD\n0,0,0.7\n2,2.2,0.5\n1,5.0,1.3\n"
    page.text_area(key=key("user_coefficients_csv")).set_value(broken)
    page.run()
    assert not page.exception
    assert page.error[0].value == ("your coefficient table: SR must increase from row to row "
                                   "(data row 3: 1 after 2)")
    assert page.text_area(key=key("user_coefficients_csv")).value == broken


def test_compass_directions_give_the_same_answer_as_the_relative_angle(page):
    page.selectbox(key=key("wind_angle_reference")).set_value("compass")
    page.run()
    page.number_input(key=key("heading_deg")).set_value(200.0)
    page.number_input(key=key("true_wind_direction_deg")).set_value(290.0)
    page.run()
    assert not page.exception
    op = core_op({"true_wind_angle_deg": 90.0})
    assert metric(page, "Thrust along the heading") == f"{format_number(op.thrust_n / 1000)} kN"


def test_limit_warning_sits_beside_its_number(page):
    page.number_input(key=key("max_motor_power_w")).set_value(40.0)  # kW in the SI display
    page.run()
    assert not page.exception
    captions = [c.value for c in page.caption]
    assert any("maximum motor power 40 kW" in c for c in captions)
    setup = rotor_inputs.setup_from_inputs({"max_motor_power_w": 40_000.0})
    op = rotor.best_operation(setup, 12 * KNOT_M_S, 20 * KNOT_M_S, math.radians(90))
    assert metric(page, "Spin power (shaft)") == f"{format_number(op.spin_power_w / 1000)} kW"


def test_imperial_tables_and_charts_are_converted(page):
    import json

    page.session_state["unit_system"] = "imperial"
    page.session_state["rotor_tab"] = "Tables and downloads"
    page.run()
    assert not page.exception
    result = study.run(study.INPUTS.validate({}))
    tables = {tuple(d.value.columns): d.value for d in page.dataframe}
    sweep = next(t for cols, t in tables.items() if "true wind angle [°]" in cols)
    core = result.tables["wind_angle_sweep"]
    assert_allclose(sweep["thrust [kip]"], units.to_display(core["thrust_n"].to_numpy(), "large_force", "imperial"))
    assert_allclose(sweep["net power gain [hp]"], units.to_display(core["net_power_w"].to_numpy(), "power", "imperial"))
    span = next(t for cols, t in tables.items() if "height [ft]" in cols)
    assert_allclose(span["height [ft]"], units.to_display(result.detail.span.height_m, "length", "imperial"))
    op = next(t for cols, t in tables.items() if cols == ("quantity", "value", "unit")).set_index("quantity")
    assert op.loc["heeling moment", "unit"] == "kip·ft"
    assert op.loc["heeling moment", "value"] == pytest.approx(
        units.to_display(result.detail.operation.at(())["heeling_moment_nm"], "moment", "imperial"))
    page.session_state["rotor_tab"] = "Along the rotor"
    page.run()
    specs = [json.loads(c.proto.spec) for c in page.get("plotly_chart")]
    span_chart = next(s for s in specs if "rotor height" in s["layout"]["title"]["text"])
    assert span_chart["layout"]["yaxis"]["title"]["text"] == "Height above the waterline [ft]"


def test_measured_air_hides_the_altitude(page):
    page.selectbox(key=key("air_mode")).set_value("measured")
    page.run()
    assert not page.exception
    shown = {w.key for w in page.number_input}
    assert {key("temperature_k"), key("pressure_pa")} <= shown and key("altitude_m") not in shown


def _run(**over):
    return study.run(study.INPUTS.validate({**study.INPUTS.defaults(), **over}))


@pytest.mark.parametrize("model", ["set", "friction"])
def test_other_spin_power_is_the_other_model_run_at_the_same_spin(model):
    # The net gain the summary quotes for the estimate not chosen equals a run with that
    # estimate chosen at the same rotor speed (behaviour, not arithmetic copied from the code).
    res = _run(spin_power_model=model)
    one = res.detail.operation.at(())
    other_power, other_net = study.other_spin_power(res)
    other_model = "friction" if model == "set" else "set"
    fixed = _run(spin_power_model=other_model, spin_mode="rpm", spin_rpm=one["rpm"]).detail.operation.at(())
    assert_allclose(other_power, fixed["spin_power_w"], rtol=1e-6)
    assert_allclose(other_net, fixed["net_power_w"], rtol=1e-6)
    text = study.summary(res)
    assert units.quantity_text(other_power, "power", "SI") in text
    assert units.quantity_text(other_net, "power", "SI") in text


def test_summary_says_why_a_head_wind_stops_the_rotors_and_what_the_drag_costs():
    res = _run(true_wind_angle_deg=0.0)
    one = res.detail.operation.at(())
    assert one["state"] == rotor.STOPPED and one["net_power_w"] < 0
    text = study.summary(res)
    assert "stopped" in text and "smallest worthwhile gain" in text
    assert units.quantity_text(-one["net_power_w"], "power", "SI") in text


def test_page_and_handout_carry_the_spin_power_summary(page):
    from liftcore.report import scenario_report
    from liftcore.scenario import Scenario

    from liftcore.report import bold_html

    res = _run()
    assert any(bold_html(study.summary(res)) in m.value for m in page.markdown)
    html = scenario_report(Scenario(kind="rotor", inputs=res.inputs), res)
    assert "skin-friction model gives" in html
