"""Voyage savings: expectation over wind statistics, fuel, CO2, money, payback, the IMO term."""

import math
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose

from liftcore import rotor, voyage as vy, windstats as ws
from liftcore import rotor_inputs
from liftcore.constants import CO2_FACTOR_T_PER_T
from liftcore.errors import InputError
from liftcore.scenario import load_scenario
from liftcore.studies import run_study
from liftcore.studies import voyage as study

ROOT = Path(__file__).resolve().parents[1]


def toy_operate(vs, tws, twa):
    """A stand-in rotor with round numbers (not physics): thrust 100 N per (m/s)^2 of true wind
    times |sin(angle)|, running (10 kW electric) whenever there is thrust; propulsive
    efficiency 0.7."""
    thrust = 100.0 * tws ** 2 * np.abs(np.sin(twa))
    running = thrust > 1e-9
    elec = np.where(running, 10e3, 0.0)
    saved = thrust * vs / 0.7
    return {"thrust_n": thrust, "propulsion_power_saved_w": saved, "electrical_power_w": elec,
            "net_power_w": saved - elec, "state": np.where(running, 1, 0),
            "heeling_moment_nm": 20.0 * thrust, "side_force_n": 0.5 * thrust}


def test_hand_derived_two_condition_table():
    # 75 % beam wind of 10 m/s, 25 % head wind of 5 m/s, ship at 7 m/s
    joint = ws.JointWind(np.array([90.0, 0.0]), np.array([10.0, 5.0]), np.array([0.75, 0.25]))
    t = vy.tally_joint(toy_operate, joint, [7.0], [1.0])
    ship = vy.ShipEconomics(sfoc_main_g_kwh=175.0, sfoc_generator_g_kwh=205.0, fuel="hfo",
                            hours_at_sea_per_year=6000.0, fuel_price_per_t=600.0,
                            carbon_price_per_t_co2=50.0, installed_cost=1.0e6, upkeep_per_year=10000.0)
    s = vy.summarise(t, ship)
    # by hand: beam: thrust 100*10^2*1 = 10 kN, engine saved 10 kN*7 m/s/0.7 = 100 kW, spin 10 kW,
    # net 90 kW; head wind: nothing. Means: thrust 0.75*10 = 7.5 kN, net 0.75*90 = 67.5 kW
    assert_allclose(s.mean_thrust_n, 7500.0, rtol=1e-12)
    assert_allclose(s.mean_net_power_w, 67500.0, rtol=1e-12)
    # energy: 67.5 kW * 6000 h = 405 MWh
    assert_allclose(s.annual_energy_saved_j / 3.6e9, 405.0, rtol=1e-12)
    # fuel: 75 kW*6000 h*175 g/kWh = 78.75 t, minus 7.5 kW*6000 h*205 g/kWh = 9.225 t -> 69.525 t
    assert_allclose(s.annual_fuel_saved_kg, 69525.0, rtol=1e-12)
    # CO2: 69.525 t * 3.114 = 216.50085 t (HFO factor, IMO MEPC.364(79))
    assert_allclose(s.annual_co2_avoided_kg, 216500.85, rtol=1e-12)
    # money: 69.525*600 = 41715 + 216.50085*50 = 10825.0425 - 10000 upkeep = 42540.0425
    assert_allclose(s.annual_cost_saved, 42540.0425, rtol=1e-12)
    # payback: 1e6 / 42540.0425 = 23.5072... years
    assert_allclose(s.payback_years, 1.0e6 / 42540.0425, rtol=1e-12)
    assert_allclose([s.running_share, s.stopped_share, s.limited_share], [0.75, 0.25, 0.0])
    # highest heeling moment met: 20 m * 10 kN
    assert_allclose(s.peak_heeling_moment_nm, 200e3)


# Published conversion factors C_F, t CO2 per t fuel:
# IMO MEPC.308(73) (2018 EEDI guidelines), 2.2, and MEPC.364(79) (2022 EEDI guidelines), 2.3, table of C_F.
@pytest.mark.parametrize("fuel, factor", [("hfo", 3.114), ("lfo", 3.151), ("mdo", 3.206),
                                          ("lng", 2.750), ("methanol", 1.375)])
def test_co2_factors_are_the_imo_values(fuel, factor):
    assert CO2_FACTOR_T_PER_T[fuel] == factor
    assert_allclose(vy.co2_from_fuel(1000.0, fuel), 1000.0 * factor, rtol=1e-15)


def test_fuel_from_energy():
    # analytic: 1 MWh at 200 g/kWh = 200 kg
    assert_allclose(vy.fuel_from_energy_kg(3.6e9, 200.0), 200.0)


def test_imo_wind_propulsion_term_worked_example():
    # Worked by hand, formula of MEPC.1/Circ.815 Annex 11 App. 2, 3.1 (= MEPC.1/Circ.896):
    # V_ref 12 kn, eta_T 0.7; W = [0.1 0.2; 0.3 0.4]; F = [10 20; 0 50] kN; P = [5 5; 0 10] kW.
    # sum F W = 1 + 4 + 0 + 20 = 25 kN; 0.5144*12/0.7 = 8.8182857...; x 25 = 220.4571429 kW
    # sum P W = 0.5 + 1 + 0 + 4 = 5.5 kW; f_eff P_eff = 214.9571429 kW
    w = np.array([[0.1, 0.2], [0.3, 0.4]])
    f = np.array([[10.0, 20.0], [0.0, 50.0]])
    p = np.array([[5.0, 5.0], [0.0, 10.0]])
    assert_allclose(vy.imo_wind_propulsion_power_kw(12.0, 0.7, f, p, w), 214.9571428571, rtol=1e-11)
    with pytest.raises(InputError, match="sums to 0.9; it must sum to 1"):
        vy.imo_wind_propulsion_power_kw(12.0, 0.7, f, p, w * 0.9)


def test_imo_term_equals_mean_net_gain_when_its_assumptions_match():
    # analytic identity: with eta_T = propulsive efficiency, V_ref = ship speed and W the same
    # probabilities, (0.5144 V/eta) sum F W - sum P W = mean(thrust V / eta - P), up to
    # 0.5144 vs 1852/3600 = 0.514444... (relative 8.6e-5 on the first term); the IMO term has no
    # leeway or rudder resistance, so neither has the year compared with it
    r = run_study("voyage", {"wind_kind": "table", "sweep": False, "imo_total_efficiency": 0.7,
                             "propulsive_efficiency": 0.7, "hull_balance": False})
    s = r.detail.summary
    first = s.mean_engine_power_saved_w * 0.5144 / (1852 / 3600)
    assert_allclose(r.detail.imo_effective_power_w, first - s.mean_spin_power_w, rtol=1e-9)


@pytest.mark.parametrize("cost, saving, rate, years", [
    # analytic: C/S
    (1.0e6, 2.0e5, 0.0, 5.0),
    # analytic: -ln(1 - rC/S)/ln(1+r) = -ln(0.6)/ln(1.08) = 6.6373...
    (1.0e6, 2.0e5, 0.08, -math.log(0.6) / math.log(1.08)),
    # never: rC/S >= 1
    (1.0e6, 5.0e4, 0.08, math.inf),
    (1.0e6, -1.0, 0.0, math.inf),
])
def test_payback(cost, saving, rate, years):
    n = vy.discounted_payback_years(cost, saving, rate)
    assert n == years if math.isinf(years) else abs(n - years) < 1e-12
    if rate > 0 and math.isfinite(n):
        # analytic: the annuity of n years repays the cost, S (1 - (1+r)^-n) / r = C
        assert_allclose(saving * (1 - (1 + rate) ** -n) / rate, cost, rtol=1e-12)


def test_speed_profile():
    v, s = vy.parse_speed_profile("12:0.6, 10:0.4", 1.0)
    # 1 kn = 1852/3600 m/s (international nautical mile)
    assert_allclose(v, [12 * 1852 / 3600, 10 * 1852 / 3600])
    assert_allclose(s, [0.6, 0.4])
    assert vy.parse_speed_profile("  ", 6.0)[0].tolist() == [6.0]
    with pytest.raises(InputError, match=r"speed profile shares sum to 0.9; they must sum to 1"):
        vy.parse_speed_profile("12:0.5, 10:0.4", 1.0)
    with pytest.raises(InputError, match=r"speed profile entry '12' must read knots:share"):
        vy.parse_speed_profile("12", 1.0)
    with pytest.raises(InputError, match=r"speed profile speed must be > 0 kn and <= 40 kn \(got 50 kn\)"):
        vy.parse_speed_profile("50:1", 1.0)


def test_speed_profile_is_the_weighted_mix_of_single_speeds():
    joint = ws.read_wind_table(study.DEMO_FILES["table"])
    both = vy.tally_joint(toy_operate, joint, [5.0, 7.0], [0.3, 0.7])
    a = vy.tally_joint(toy_operate, joint, [5.0], [1.0])
    b = vy.tally_joint(toy_operate, joint, [7.0], [1.0])
    for key in ("net_power_w", "thrust_n", "spin_power_w"):
        assert_allclose(both.mean(key), 0.3 * a.mean(key) + 0.7 * b.mean(key), rtol=1e-12)


def test_tallies_of_parts_add_up_to_the_whole():
    rng = np.random.default_rng(3)
    n = 200
    vs, tws, twa = rng.uniform(3, 8, n), rng.uniform(0, 25, n), rng.uniform(-180, 180, n)
    month, leg = rng.integers(1, 13, n), rng.choice(["out", "back"], n)
    whole = vy.tally_conditions(toy_operate, vs, tws, twa, 1.0, month=month, leg=leg, with_grid=True)
    a = vy.tally_conditions(toy_operate, vs[:77], tws[:77], twa[:77], 1.0, month=month[:77], leg=leg[:77], with_grid=True)
    b = vy.tally_conditions(toy_operate, vs[77:], tws[77:], twa[77:], 1.0, month=month[77:], leg=leg[77:], with_grid=True)
    s = a + b
    for name in ("sums", "state", "heat_weight", "heat_net", "rose", "months", "grid", "flags"):
        assert_allclose(getattr(s, name), getattr(whole, name), rtol=1e-12, atol=1e-6)
    assert s.legs.keys() == whole.legs.keys()
    assert_allclose(s.months[:, 0].sum(), n)
    # the heat map cells add up to the mean net gain
    assert_allclose(s.heat_net.sum() / s.weight, whole.mean("net_power_w"), rtol=1e-12)


def test_series_and_table_give_the_same_answer(tmp_path):
    # the series is the table's conditions repeated in proportion (40 hours), read from a file in
    # blocks of 7 rows; the real rotor model gives the operation
    joint = ws.JointWind(np.array([0.0, 45.0, 90.0, -120.0, 180.0]), np.array([4.0, 8.0, 12.0, 9.0, 15.0]),
                         np.array([0.1, 0.2, 0.35, 0.25, 0.1]))
    setup = rotor_inputs.setup_from_inputs({"rotor_count": 3})
    operate = study.operate_for(setup)
    vs = 6.0
    table = vy.tally_joint(operate, joint, [vs], [1.0])
    df = ws.series_from_joint(joint, 40, vs, heading_deg=200.0)
    path = tmp_path / "series.csv"
    df.to_csv(path, index=False)
    series = vy.tally_series(operate, path, chunk_rows=7)
    assert series.rows == 40
    for key in vy.SUM_KEYS:
        assert_allclose(series.mean(key), table.mean(key), rtol=1e-9, atol=1e-9)
    assert_allclose(series.state / series.weight, table.state / table.weight, atol=1e-12)
    ship = vy.ShipEconomics()
    assert_allclose(vy.summarise(series, ship).annual_fuel_saved_kg,
                    vy.summarise(table, ship).annual_fuel_saved_kg, rtol=1e-9)


def test_series_hours_at_sea_per_year():
    # two years of hours (leap-free 2031-2032? 2032 is a leap year: use 2033-2034), every other
    # hour at sea -> half of 8760 h per year
    n = 2 * 8760
    df = pd.DataFrame({"time": pd.date_range("2033-01-01", periods=n, freq="h").strftime("%Y-%m-%dT%H:%M"),
                       "ship_speed_kn": np.tile([12.0, 0.0], n // 2), "ship_heading_deg": 90.0,
                       "true_wind_speed_m_s": 8.0, "true_wind_direction_deg": 0.0})
    t = vy.tally_series(toy_operate, df)
    assert_allclose(vy.series_hours_at_sea_per_year(t), 4380.0)
    assert t.rows == n and t.weight == n / 2
    assert vy.series_warnings(t) == ()
    # a month of ten-minute rows: counted as hours, so both cautions apply
    short = df.iloc[:6 * 24 * 30].assign(
        time=pd.date_range("2033-01-01", periods=6 * 24 * 30, freq="10min").strftime("%Y-%m-%dT%H:%M"))
    codes = [w.code for w in vy.series_warnings(vy.tally_series(toy_operate, short))]
    assert codes == ["series_not_hourly", "series_shorter_than_a_year"]


def test_warning_shares_are_shares_of_time_at_sea():
    joint = ws.read_wind_table(study.DEMO_FILES["table"])
    setup = rotor_inputs.setup_from_inputs({})
    vs = 6.0
    t = vy.tally_joint(study.operate_for(setup), joint, [vs], [1.0])
    s = vy.summarise(t, vy.ShipEconomics())
    op = rotor.best_operation(setup, vs, joint.true_wind_speed_m_s, np.radians(joint.true_wind_angle_deg))
    share = joint.probability[(op.flags & rotor.FLAG_MOTOR_POWER) != 0].sum()
    msg = [w.message for w in s.warnings if w.code == "motor_power_limit"]
    assert share > 0 and msg == [f"Spin limited by the maximum motor power {100 * share:.1f} % of the time at sea."]
    assert not any("conditions)" in w.message for w in s.warnings)


def test_weibull_study_keeps_the_weibull_mean_wind():
    r = run_study("voyage", {"wind_kind": "weibull", "sweep": False})
    sectors = ws.read_weibull_sectors(study.DEMO_FILES["weibull"])
    # analytic: sum_i f_i c_i Gamma(1 + 1/k_i)
    expected = sum(f * c * math.gamma(1 + 1 / k) for f, c, k in
                   zip(sectors.frequency, sectors.scale_m_s, sectors.shape))
    assert_allclose(r.detail.summary.mean_true_wind_speed_m_s, expected, rtol=1e-10)


def test_design_sweep_contains_the_entered_design():
    r = run_study("voyage", {"wind_kind": "table", "sweep_max_rotors": 3})
    sw = r.detail.sweep
    assert len(sw) == len(study.SWEEP_SIZE_FACTORS) * 3
    entered = sw[np.isclose(sw["diameter_m"], 5.0) & (sw["rotors"] == 2)].iloc[0]
    s = r.detail.summary
    assert_allclose(entered["annual_fuel_saved_kg"], s.annual_fuel_saved_kg, rtol=1e-12)
    assert_allclose(entered["installed_cost"], r.inputs["installed_cost"], rtol=1e-12)
    # cost per rotor scales with D x H (stated assumption): 0.6 x size -> 0.36 x cost per rotor
    small = sw[np.isclose(sw["diameter_m"], 3.0) & (sw["rotors"] == 1)].iloc[0]
    assert_allclose(small["installed_cost"], r.inputs["installed_cost"] / 2 * 0.36, rtol=1e-12)


def test_study_json_has_the_command_line_keys_and_headline_kinds():
    r = run_study("voyage", {"wind_kind": "table", "sweep": False})
    for key in ("mean_net_power_kw", "mean_thrust_kn", "annual_energy_saved_mwh", "annual_fuel_saved_t",
                "annual_co2_avoided_t", "annual_cost_saved", "running_share", "warnings"):
        assert key in r.json
    assert r.headline("annual_cost_saved").quantity == "money"
    assert r.headline("annual_fuel_saved").quantity == "fuel_mass"
    assert_allclose(r.json["mean_net_power_kw"] * 1000, r.headline("mean_net_power").value)
    keys = {h.key for h in r.headlines}
    assert all(w.subject in keys or w.subject == "" for w in r.warnings)


def test_bad_speed_profile_is_one_clear_line():
    with pytest.raises(InputError, match=r"^speed profile shares sum to 0.5; they must sum to 1"):
        run_study("voyage", {"speed_profile_kn": "12:0.5"})


SCENARIOS = sorted((ROOT / "scenarios").glob("voyage*.toml"))


def test_there_is_a_scenario_per_wind_input_kind():
    kinds = {load_scenario(p).inputs["wind_kind"] for p in SCENARIOS}
    assert kinds == set(study.WIND_KINDS)


@pytest.mark.parametrize("path", SCENARIOS, ids=[p.name for p in SCENARIOS])
def test_scenarios_load_and_run(path):
    sc = load_scenario(path)
    assert sc.kind == "voyage" and "invented" in sc.title.lower()
    r = run_study(sc.kind, sc.inputs)
    assert math.isfinite(r.headline("annual_fuel_saved").value)
    assert r.json["wind_source"].startswith("invented demo")


def test_uploaded_table_errors_name_the_upload():
    # the page reads an upload's bytes into a DataFrame named after the file
    df = ws.read_csv_frame(b"# my trade\ntrue_wind_angle_deg,true_wind_speed_m_s,probability\n"
                           b"0,5,0.5\n90,-2,0.5\n", "my_trade.csv")
    df.attrs["source_name"] = "my_trade.csv"
    with pytest.raises(InputError, match=r"^my_trade.csv, row 2: true_wind_speed_m_s must be between 0 "
                                         r"and 80 m/s \(got -2 m/s\)$"):
        run_study("voyage", {"wind_kind": "table"}, extra=df)
    ok = ws.read_csv_frame(b"true_wind_angle_deg,true_wind_speed_m_s,probability\n90,10,1\n", "one.csv")
    ok.attrs["source_name"] = "one.csv"
    r = run_study("voyage", {"wind_kind": "table", "sweep": False}, extra=ok)
    assert r.json["wind_source"] == "one.csv" and r.json["conditions"] == 1
    assert not any(w.code == "invented_wind" for w in r.warnings)
