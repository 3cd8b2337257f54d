"""The hull's answer to the rotors' side force: leeway, rudder, added resistance, heel; and what
it takes off the net gain on the rotor and voyage paths."""

import json
import math
from dataclasses import replace

import numpy as np
import pytest
from numpy.testing import assert_allclose

from liftcore import hull as hm
from liftcore import rotor, rotor_inputs
from liftcore.cli import main
from liftcore.constants import G0, KNOT_M_S
from liftcore.errors import InputError
from liftcore.studies import run_study

#: An invented hull (no real ship): L 150 m, B 25 m, T 9 m, C_b 0.75, rudder 22.5 m2 at -L/2.
HULL = hm.Hull(150.0, 25.0, 9.0, 0.75, 22.5, -75.0, 1.6, displacement_kg=25.95e6, metacentric_height_m=1.5)
ROTOR = ["rotor", "--diameter-m", "5", "--height-m", "30", "--ship-speed-kn", "12",
         "--true-wind-speed-kn", "20", "--true-wind-angle-deg", "90", "--json"]
HULL_ARGS = ["--hull-length-m", "180", "--hull-beam-m", "30", "--hull-draught-m", "11",
             "--block-coefficient", "0.8", "--rudder-area-m2", "45"]


def test_clarke_derivatives_for_a_worked_hull():
    """Clarke, Gedling & Hine (1983), Trans. RINA 125 (regressions from memory): for the hull
    above pi (T/L)^2 = 0.011310, Y'v = -0.020735, N'v = -0.007283, Y'r = 0.004021, N'r = -0.002997
    (hand arithmetic from the regressions)."""
    d = hm.clarke_derivatives(150.0, 25.0, 9.0, 0.75)
    assert_allclose([d["Yv"], d["Nv"], d["Yr"], d["Nr"]], [-0.020735, -0.007283, 0.004021, -0.002997], atol=2e-6)
    # Fujii & Tsuda (1961): f = 6.13 L / (L + 2.25); L = 1.6 gives 2.5475
    assert hm.fujii_normal_force_slope(1.6) == pytest.approx(2.5475, abs=1e-4)


def test_zero_side_force_needs_no_leeway_rudder_or_power():
    b = HULL.balance(0.0, 20.0, 7.0)
    assert float(b["leeway_deg"]) == 0.0 and float(b["rudder_angle_deg"]) == 0.0 and float(b["resistance_n"]) == 0.0


def test_leeway_is_linear_and_the_added_resistance_quadratic_in_the_side_force():
    ys = np.array([50e3, 100e3, 200e3, 400e3])
    b = HULL.balance(ys, 20.0, 7.0)
    assert_allclose(b["leeway_deg"] / ys, b["leeway_deg"][0] / ys[0], rtol=1e-12)
    assert_allclose(b["rudder_angle_deg"] / ys, b["rudder_angle_deg"][0] / ys[0], rtol=1e-12)
    assert_allclose(b["resistance_n"] / ys ** 2, b["resistance_n"][0] / ys[0] ** 2, rtol=1e-12)
    # and falls with the square of the speed
    b2 = HULL.balance(ys, 20.0, 14.0)
    assert_allclose(b2["resistance_n"], b["resistance_n"] / 4, rtol=1e-12)


def test_the_side_force_and_yaw_moment_are_balanced():
    """Sway: Y_v v + Y_R = -Y_s; yaw: N_v v + x_e Y_R = -Y_s x_s (the module's equations)."""
    ys, x_s, u = 300e3, 20.0, 7.0
    vu, y_hull, y_rudder, _, _ = HULL._balance_terms(x_s)
    assert y_hull + y_rudder == pytest.approx(-1.0)
    d = hm.clarke_derivatives(150.0, 25.0, 9.0, 0.75)
    q = 0.5 * hm.SEA_WATER_DENSITY_KG_M3
    v = ys * vu / u
    x_e = (-75.0 + hm.A_H * hm.X_H_OVER_L * 150.0) / (1 + hm.A_H)
    assert d["Nv"] * q * 150.0 ** 3 * u * v + x_e * ys * y_rudder == pytest.approx(-ys * x_s, rel=1e-9)
    b = HULL.balance(ys, x_s, u)
    assert float(b["leeway_deg"]) > 0  # a side force to starboard makes the ship slide to starboard


def test_heel_from_small_angle_statics():
    """Derrett & Barrass, Ship Stability for Masters and Mates: M = Delta g GM sin(phi)."""
    m = 10.35e6
    assert float(HULL.heel_angle_deg(m)) == pytest.approx(math.degrees(math.asin(m / (25.95e6 * G0 * 1.5))))
    assert replace(HULL, metacentric_height_m=None).heel_angle_deg(m) is None
    assert np.isnan(HULL.heel_angle_deg(1e12))


def test_bad_hull_inputs_name_the_field():
    with pytest.raises(InputError, match="rudder position"):
        hm.Hull(150.0, 25.0, 9.0, 0.75, 22.5, 10.0)
    with pytest.raises(InputError, match="block coefficient"):
        hm.Hull(150.0, 25.0, 9.0, 1.2, 22.5, -75.0)


def test_the_best_spin_maximises_the_net_gain_after_the_balance():
    """Less spin can pay more when the side force costs: the search with the hull is never worse,
    on its own measure, than the spin that is best without it."""
    with_hull = rotor_inputs.setup_from_inputs({})
    without = replace(with_hull, hull=None)
    vs, vt = np.full(40, 6.0), np.full(40, 12.0)
    g = np.radians(np.linspace(30.0, 150.0, 40))
    best = rotor.best_operation(with_hull, vs, vt, g)
    plain = rotor.best_operation(without, vs, vt, g)
    again = rotor.fixed_operation(with_hull, vs, vt, g, rpm=plain.rpm)
    assert np.all(best.net_power_w >= again.net_power_w - 1.0)
    assert np.all(best.balance_power_w >= 0)
    assert_allclose(plain.net_power_w - again.net_power_w, again.balance_power_w, rtol=1e-9)


def test_the_command_line_adds_the_balance_only_with_a_hull(capsys):
    assert main(ROTOR) == 0
    plain = json.loads(capsys.readouterr().out)
    assert "leeway_deg" not in plain
    assert main(ROTOR + HULL_ARGS) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["balance_power_kw"] >= 0 and data["net_power_kw"] < plain["net_power_kw"]
    assert {"leeway_deg", "rudder_angle_deg"} <= set(data) and "heel_angle_deg" not in data
    assert main(ROTOR + HULL_ARGS + ["--metacentric-height-m", "2.5"]) == 0
    assert "heel_angle_deg" in json.loads(capsys.readouterr().out)
    assert main(ROTOR + HULL_ARGS + ["--no-hull-balance"]) == 0
    assert json.loads(capsys.readouterr().out) == plain
    assert main(ROTOR + HULL_ARGS[:2]) == 2
    assert "the hull balance needs" in capsys.readouterr().err


def test_the_voyage_reports_the_mean_balance_power():
    on = run_study("voyage", {"sweep": False, "published_spread": False})
    off = run_study("voyage", {"sweep": False, "published_spread": False, "hull_balance": False})
    s_on, s_off = on.detail.summary, off.detail.summary
    assert s_on.mean_balance_power_w > 0 and off.json["mean_balance_power_kw"] == 0.0
    assert s_on.mean_net_power_w < s_off.mean_net_power_w
    assert 0 < on.json["balance_share_of_gross"] < 0.2
    # net = engine power saved (thrust power less the balance) - spin power, as in the rotor model
    assert s_on.mean_net_power_w == pytest.approx(s_on.mean_engine_power_saved_w - s_on.mean_spin_power_w, rel=1e-9)


def test_a_ship_at_rest_counts_no_balance():
    setup = rotor_inputs.setup_from_inputs({})
    op = rotor.best_operation(setup, 0.0, 10.0, math.radians(90))
    assert float(op.balance_power_w) == 0.0
    assert any(w.code == "no_balance_at_rest" for w in op.warnings) or float(op.side_force_n) == 0.0
    assert float(rotor.best_operation(setup, 12 * KNOT_M_S, 10.0, math.radians(90)).balance_power_w) > 0


def test_leeway_and_rudder_beyond_the_linear_range_are_warned():
    """Common practice limits: leeway 10 deg, rudder 15 deg (linear theory)."""
    slow = rotor.best_operation(rotor_inputs.setup_from_inputs({}), 0.6, 20.0, math.radians(90))
    assert abs(float(slow.leeway_deg)) > hm.LEEWAY_LINEAR_DEG
    assert "leeway_beyond_linear" in {w.code for w in slow.warnings}
    small = rotor_inputs.setup_from_inputs({"rudder_area_m2": 0.5})
    op = rotor.best_operation(small, 6.0, 15.0, math.radians(90))
    assert abs(float(op.rudder_angle_deg)) > hm.RUDDER_LINEAR_DEG
    assert "rudder_beyond_linear" in {w.code for w in op.warnings}
    fine = rotor.best_operation(rotor_inputs.setup_from_inputs({}), 6.0, 10.0, math.radians(90))
    assert not {"leeway_beyond_linear", "rudder_beyond_linear"} & {w.code for w in fine.warnings}
