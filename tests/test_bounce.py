"""After the first landing: bounces, slide and roll to rest."""

import json
import math

import pytest

from liftcore import bounce as bo
from liftcore.cli import main
from liftcore.studies import flight, run_study

TURF = bo.GROUNDS["turf_medium"]
COURT = bo.GROUNDS["hard_court"]


IMPACTS = [(20.0, 15.0, 5.0), (30.0, 3.0, -2.0), (5.0, 20.0, 8.0), (10.0, 4.0, -10.0), (18.0, 24.0, 6.0)]


@pytest.mark.parametrize("v_t, v_n, r_w", IMPACTS)
@pytest.mark.parametrize("k", [0.4, 2 / 3])
def test_an_impact_on_a_court_keeps_what_the_model_conserves(v_t, v_n, r_w, k):
    """Brody (1984): v_n' = e v_n; the angular momentum about the contact point (v_t - k r w)
    is unchanged; the slip never reverses (friction at most stops it)."""
    vt1, vn1, rw1, grip = bo.impact(v_t, v_n, r_w, COURT, k)
    assert vn1 == pytest.approx(COURT.e * v_n)
    assert vt1 - k * rw1 == pytest.approx(v_t - k * r_w)
    u0, u1 = v_t + r_w, vt1 + rw1
    assert u0 * u1 >= -1e-12 and abs(u1) <= abs(u0) + 1e-12
    if grip:
        assert u1 == pytest.approx(0.0, abs=1e-12)  # it leaves rolling


def penner_e(v):
    """Penner (2002), from memory: e = 0.510 - 0.0375 v + 0.000903 v^2 up to 20 m/s, 0.120 above."""
    return 0.510 - 0.0375 * v + 0.000903 * v * v if v <= 20.0 else 0.120


@pytest.mark.parametrize("v_t, v_n, r_w", IMPACTS)
@pytest.mark.parametrize("ground", ["turf_soft", "turf_medium", "turf_firm"])
def test_an_impact_on_turf_keeps_what_the_model_conserves_off_the_pitch_mark(v_t, v_n, r_w, ground):
    """Penner (2002), from memory: the ball meets a wall inclined at theta_c = s 15.4 deg (v /
    18.6 m/s)(theta_i / 44.4 deg); in that wall's frame v_n' = e(v_n) v_n and v_t - k r w is
    unchanged (the frame worked out here by hand, not by the module)."""
    g, k = bo.GROUNDS[ground], 0.4
    theta_i = math.degrees(math.atan2(v_n, v_t))
    c = math.radians(min(g.crater_scale * 15.4 * math.hypot(v_t, v_n) / 18.6 * theta_i / 44.4, 89.0 - theta_i))
    to_wall = lambda x, z: (x * math.cos(c) + z * math.sin(c), -x * math.sin(c) + z * math.cos(c))  # noqa: E731
    t0, n0 = to_wall(v_t, -v_n)
    vt1, vn1, rw1, _ = bo.impact(v_t, v_n, r_w, g, k)
    t1, n1 = to_wall(vt1, vn1)
    assert n1 == pytest.approx(-g.e * penner_e(-n0) * n0)
    assert t1 - k * rw1 == pytest.approx(t0 - k * r_w)
    u0, u1 = t0 + r_w, t1 + rw1
    assert u0 * u1 >= -1e-12 and abs(u1) <= abs(u0) + 1e-12


def test_penner_restitution_and_crater_angle():
    """Penner (2002), from memory: e(v_n) meets 0.120 at 20 m/s; Haake's reference impact (18.6
    m/s at 44.4 deg) meets a 15.4 deg wall."""
    assert bo.turf_restitution(20.0) == pytest.approx(0.120, abs=0.002)
    assert bo.turf_restitution(10.0) == pytest.approx(0.510 - 0.375 + 0.0903)
    ref = 18.6 * math.cos(math.radians(44.4)), 18.6 * math.sin(math.radians(44.4))
    assert math.degrees(bo.crater_angle(*ref, bo.GROUNDS["turf_medium"])) == pytest.approx(15.4)
    assert bo.crater_angle(*ref, COURT) == 0.0


def test_a_fast_steep_landing_checks_and_a_shallow_one_skips_on_turf():
    """Penner (2002): the pitch mark takes most of a steep, fast landing's forward speed."""
    steep = bo.impact(15.0, 25.0, 10.0, TURF, 0.4)[0] / 15.0
    shallow = bo.impact(25.0, 6.0, 3.0, TURF, 0.4)[0] / 25.0
    assert steep < 0.5 < shallow
    firm, soft = (bo.run_out(23.0, 15.6, 4.6, bo.GROUNDS[k], 0.4)["distance_m"] for k in ("turf_firm", "turf_soft"))
    assert firm > bo.run_out(23.0, 15.6, 4.6, TURF, 0.4)["distance_m"] > soft > 0


def test_the_ball_comes_to_rest_rolling():
    run = bo.run_out(23.0, 15.6, 4.6, TURF, 0.4)
    assert math.isfinite(run["distance_m"]) and math.isfinite(run["time_s"])
    assert run["distance_m"] == pytest.approx(run["bounce_m"] + run["slide_m"] + run["roll_m"])
    vt, vn, rw = run["bounces"][-1]
    assert vn < bo.MIN_HOP_M_S
    # the roll: v_roll^2 / (2 mu_r g / (1 + k)) from the speed at which the slip stops
    v_roll = vt - 0.4 * (vt + rw) / 1.4
    assert run["roll_m"] == pytest.approx(v_roll ** 2 / (2 * TURF.mu_r * 9.80665 / 1.4))


def test_the_tennis_court_rebound_follows_the_ball_rule():
    """ITF Rules of Tennis, Appendix I (from memory): dropped from 254 cm onto concrete, a ball
    rebounds 135 to 147 cm; e = sqrt(h'/h)."""
    assert math.sqrt(135 / 254) <= COURT.e <= math.sqrt(147 / 254)


def test_a_drive_runs_on_and_a_serve_bounces(capsys):
    assert main(["flight", "--ball", "golf", "--speed-m-s", "70", "--elevation-deg", "11", "--spin-rpm", "2700",
                 "--json"]) == 0
    d = json.loads(capsys.readouterr().out)
    assert d["ground"] == "turf_medium" and d["total_m"] > d["carry_m"] and d["roll_m"] > 0
    assert main(["flight", "--ball", "tennis", "--speed-m-s", "50", "--elevation-deg", "-4", "--spin-rpm", "2500",
                 "--spin-axis-deg", "180", "--launch-height-m", "2.6", "--json"]) == 0
    t = json.loads(capsys.readouterr().out)
    assert t["total_m"] is None and {"speed_after_m_s", "angle_after_deg", "spin_after_rpm"} <= set(t["bounce"])
    assert t["bounce"]["speed_after_m_s"] < t["bounce"]["speed_before_m_s"]
    assert main(["flight", "--ball", "golf", "--speed-m-s", "70", "--elevation-deg", "11", "--spin-rpm", "2700",
                 "--ground", "none", "--json"]) == 0
    assert json.loads(capsys.readouterr().out)["total_m"] is None


def test_the_serve_path_goes_on_after_the_bounce():
    r = run_study("flight", {"ball": "tennis", "speed_m_s": 50.0, "elevation_deg": -4.0, "spin_rpm": 2500.0,
                             "spin_axis_deg": 180.0, "launch_height_m": 2.6})
    f = r.detail.flights[0]
    assert f.path["x_m"].max() > f.carry_m + 1.0  # the arc after the bounce is in the path
    assert "bounces at" in flight.summary(r) and "the path after it is drawn" in flight.summary(r)


def test_turf_under_another_ball_is_said_to_be_extrapolated():
    r = run_study("flight", {"ball": "baseball", "ground": "turf_medium"})
    assert r.detail.flights[0].run_out["total_m"] > r.detail.flights[0].carry_m
    assert any(w.code == "turf_model_outside_golf" for w in r.warnings)
    golf = run_study("flight", {"ball": "golf", "ground": "turf_medium"})
    assert not any(w.code == "turf_model_outside_golf" for w in golf.warnings)


def test_a_landing_outside_the_turf_data_is_said_to_be_extrapolated():
    """A drive lands at about 28 m/s and 40° (inside); a low skimmer at 12° is outside (the range
    from memory, as the module says)."""
    drive = run_study("flight", {"ball": "golf", "speed_m_s": 70.0, "elevation_deg": 11.0, "spin_rpm": 2700.0,
                                 "wind_speed_m_s": 0.0, "launch_height_m": 0.0})
    assert not any(w.code == "turf_impact_outside_data" for w in drive.warnings)
    low = run_study("flight", {"ball": "golf", "speed_m_s": 30.0, "elevation_deg": 2.0, "spin_rpm": 0.0,
                               "wind_speed_m_s": 0.0, "launch_height_m": 0.5})
    assert low.detail.flights[0].descent_angle_deg < bo.PENNER_ANGLE_DEG[0]
    assert any(w.code == "turf_impact_outside_data" for w in low.warnings)
