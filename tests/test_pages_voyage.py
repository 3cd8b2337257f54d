"""The Voyage savings page: renders, and shows what a direct core call computes."""

from pathlib import Path

import pytest
from streamlit.testing.v1 import AppTest

from liftcore.studies import run_study

PAGE = str(Path(__file__).resolve().parents[1] / "views" / "voyage.py")
KNOT = 1852 / 3600  # m/s per knot (international nautical mile)


def page(**state) -> AppTest:
    at = AppTest.from_file(PAGE, default_timeout=180)
    for k, v in state.items():
        at.session_state[k] = v
    return at


def shown(at) -> dict:
    return {m.label: m.value for m in at.metric}


def expected(values: dict, system: str = "SI") -> dict:
    r = run_study("voyage", values)
    return {h.label: h.text(system) for h in r.headlines}


def test_page_renders_the_demo_with_every_chart():
    at = page().run()
    assert not at.exception
    assert at.title[0].value == "Voyage savings"
    assert shown(at) == expected({})
    # the CII rating bands, rose, heat map, operating time; the design options only in their own tab
    assert len(at.get("plotly_chart")) == 4
    at.session_state["voyage_tab"] = "Design options: which size, how many?"
    at.run()
    assert not at.exception and len(at.get("plotly_chart")) == 3  # CII; fuel and payback by option
    assert any("invented demo" in w.value for w in at.warning)


def test_wind_kind_and_rotor_count_by_widget_key():
    at = page(**{"voyage:sweep": False}).run()
    at.selectbox(key="w:voyage:wind_kind:SI").set_value("weibull").run()
    at.number_input(key="w:voyage:rotor_count:SI").set_value(3).run()
    at.number_input(key="w:voyage:course_deg:SI").set_value(100.0).run()
    assert not at.exception
    assert shown(at) == expected({"wind_kind": "weibull", "rotor_count": 3, "course_deg": 100.0,
                                  "sweep": False})


def test_series_shows_monthly_and_leg_bars():
    at = page(**{"voyage:sweep": False}).run()
    at.selectbox(key="w:voyage:wind_kind:SI").set_value("series").run()
    assert not at.exception
    # the series' own inputs appear in the same run; the table's service speed goes
    assert at.toggle(key="w:voyage:hours_from_series:SI").value is True
    assert not [w for w in at.number_input if w.key == "w:voyage:ship_speed_m_s:SI"]
    assert shown(at) == expected({"wind_kind": "series", "sweep": False})
    # CII rating bands, rose, heat map, operating time, months, legs
    assert len(at.get("plotly_chart")) == 6


def test_marine_units_show_the_same_quantity_converted():
    at = page(**{"unit_system": "marine", "voyage:sweep": False}).run()
    assert at.number_input(key="w:voyage:ship_speed_m_s:marine").value == pytest.approx(12.0)
    at.number_input(key="w:voyage:ship_speed_m_s:marine").set_value(10.0).run()
    assert not at.exception
    assert shown(at) == expected({"ship_speed_m_s": 10.0 * KNOT, "sweep": False}, "marine")


def test_bad_speed_profile_shows_one_error_and_keeps_the_input():
    at = page(**{"voyage:sweep": False}).run()
    at.text_input(key="w:voyage:speed_profile_kn:SI").input("12:0.5, 10:0.4").run()
    assert not at.exception
    assert [e.value for e in at.error] == [
        "speed profile shares sum to 0.9; they must sum to 1 (e.g. 12:0.6, 10:0.4)"]
    assert at.text_input(key="w:voyage:speed_profile_kn:SI").value == "12:0.5, 10:0.4"
    at.text_input(key="w:voyage:speed_profile_kn:SI").input("12:0.5, 10:0.5").run()
    assert not at.error
    assert shown(at) == expected({"speed_profile_kn": "12:0.5, 10:0.5", "sweep": False})



def test_imperial_tables_are_converted_with_the_unit_in_the_column_name():
    import numpy as np
    from numpy.testing import assert_allclose

    from liftcore import units

    at = page(**{"unit_system": "imperial", "voyage:sweep": False, "voyage_tab": "Tables to download"}).run()
    assert not at.exception
    r = run_study("voyage", {"sweep": False})
    tables = {tuple(d.value.columns): d.value for d in at.dataframe}
    heat = next(t for cols, t in tables.items() if "true wind speed [mph]" in cols)
    core = r.tables["gain_by_condition"]
    assert_allclose(heat["true wind speed [mph]"], units.to_display(core["true_wind_speed_m_s"].to_numpy(),
                                                                    "wind_speed", "imperial"))
    assert_allclose(heat["net power [hp]"], units.to_display(core["net_power_w"].to_numpy(), "power", "imperial"))
    assert_allclose(heat["share of time [%]"], 100.0 * np.asarray(core["share_of_time"]))
    summary = tables[("quantity", "value", "unit")].set_index("quantity")
    assert summary.loc["CO₂ avoided per year", "unit"] == "US ton"
    assert summary.loc["CO₂ avoided per year", "value"] == pytest.approx(
        units.to_display(r.detail.summary.annual_co2_avoided_kg, "fuel_mass", "imperial"))


def test_headlines_carry_the_published_range_and_the_spread_tab_draws_it():
    at = page().run()
    r = run_study("voyage", {"sweep": False})
    fuel = next(h for h in r.headlines if h.key == "annual_fuel_saved")
    assert fuel.spread_text("SI") in [c.value for c in at.caption]
    at.session_state["voyage_tab"] = "Across the published data"
    at.run()
    assert not at.exception and len(at.get("plotly_chart")) == 2  # the CII bands and the spread
    assert len(at.dataframe) == 1 and len(at.dataframe[0].value) == 5
