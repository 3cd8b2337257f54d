"""Does it clear, over a whole launch sweep: crossings kept in the batch, margins per grid point,
the best launch among those that clear, and the same on the command line and in the handout."""

import json
import math

import numpy as np
import pytest

from liftcore import ballflight as bf
from liftcore import obstacles as ob
from liftcore.cli import main
from liftcore.constants import G0
from liftcore.errors import InputError
from liftcore.report import scenario_report
from liftcore.scenario import Scenario
from liftcore.studies import flight, run_study

VACUUM = bf.make_setup("golf", density_kg_m3=0.0)
AIR = bf.make_setup("soccer", density_kg_m3=1.225, kinematic_viscosity_m2_s=1.46e-5)


def vacuum_height(v, elevation_deg, d, h0=0.0):
    """Analytic (no air): z(D) = h0 + D tan e - g D^2 / (2 v^2 cos^2 e)."""
    e = np.radians(elevation_deg)
    return h0 + d * np.tan(e) - G0 * d ** 2 / (2 * v ** 2 * np.cos(e) ** 2)


def test_gate_crossings_are_the_analytic_vacuum_path():
    v = np.array([20.0, 30.0, 45.0, 12.0])
    e = np.array([35.0, 20.0, 10.0, 30.0])
    res = bf.simulate(VACUUM, bf.Launch(v, e, 0.0, 0.0, 0.0, 0.0, 0.0), gates=[9.15, 40.0])
    want = vacuum_height(v, e, 9.15)
    np.testing.assert_allclose(res.gate_height_m[0], want, rtol=1e-9, atol=1e-9)
    far = vacuum_height(v, e, 40.0)
    lands_first = res.carry_m < 40.0
    assert lands_first.any() and not lands_first.all()  # the cases test both branches
    np.testing.assert_allclose(res.gate_height_m[1][~lands_first], far[~lands_first], rtol=1e-9)
    assert np.isnan(res.gate_height_m[1][lands_first]).all()
    assert (res.gate_lateral_m[0] == 0.0).all()


def test_gate_crossings_equal_the_recorded_path_with_air_and_curl():
    """The batch's crossings equal :func:`at_distance` on the recorded knots of the same flights."""
    la = bf.Launch(np.array([22.0, 26.0, 18.0]), np.array([14.0, 9.0, 20.0]), 0.0, 600.0, -60.0, 0.0, 0.0)
    res = bf.simulate(AIR, la, record=True, gates=[9.15, 20.0])
    for j in range(3):
        for g, d in enumerate((9.15, 20.0)):
            c = bf.at_distance(res.records[j], d)
            if c is None:  # lands first
                assert np.isnan(res.gate_height_m[g, j])
                continue
            assert res.gate_height_m[g, j] == pytest.approx(c["height_m"], abs=1e-9)
            assert res.gate_lateral_m[g, j] == pytest.approx(c["lateral_m"], abs=1e-9)


def test_too_many_gates_are_refused():
    with pytest.raises(InputError, match="at most 8 gate"):
        bf.simulate(VACUUM, bf.Launch(10.0, 10.0, 0.0, 0.0, 0.0, 0.0, 0.0), gates=np.arange(1.0, 10.0))


def test_the_batch_margin_equals_the_one_flight_check():
    """The vectorised margin of a batch and the check of one flight read off its sampled path
    agree to the path's interpolation error (sub-centimetre)."""
    obstacles = ob.preset("free_kick", 20.0)
    la = bf.Launch(np.array([22.0, 19.0, 26.0]), np.array([14.0, 18.0, 6.0]), 0.0, 600.0, -60.0, 0.0, 0.0)
    margins = ob.batch_margins(obstacles, bf.simulate(AIR, la, gates=ob.gate_distances(obstacles)))
    for j in range(3):
        f = bf.fly(AIR, la.take(j))
        for o in obstacles:
            c = ob.check(f.path, f.carry_m, f.lateral_m, o)
            assert margins[o.name][j] == pytest.approx(c["margin_m"], abs=5e-3)


def test_a_vacuum_sweep_maps_the_analytic_clearance_of_a_wall():
    wall = ob.Obstacle("wall", "over", 15.0, 2.0)
    speeds, elevations = np.linspace(12.0, 30.0, 7), np.linspace(5.0, 45.0, 9)
    sw = bf.sweep(VACUUM, bf.Launch(20.0, 20.0, 0.0, 0.0, 0.0, 0.0, 0.0), "elevation_deg", elevations,
                  "speed_m_s", speeds, bf.MARGIN_OUTPUT, obstacles=(wall,))
    E, V = np.meshgrid(elevations, speeds)
    carry = V ** 2 * np.sin(2 * np.radians(E)) / G0
    want = np.where(carry < 15.0, carry - 15.0, vacuum_height(V, E, 15.0) - 2.0)
    np.testing.assert_allclose(sw.grid, want, atol=1e-6)
    assert dict(sw.margins)["wall"] is not None
    counts = sw.clearance_counts()
    assert counts == {"wall": int((want >= 0).sum()), "all": int((want >= 0).sum()), "points": 63}
    assert 0 < counts["all"] < 63


def test_the_best_launch_is_picked_among_those_that_clear():
    """Longest carry through a goal 15 m away with its bar 3 m up (vacuum): the steep fast
    launches carry farthest but fly over the bar, so the best that goes in is another point."""
    wall = ob.Obstacle("goal", "through", 15.0, 3.0, 7.32)
    args = (VACUUM, bf.Launch(20.0, 20.0, 0.0, 0.0, 0.0, 0.0, 0.0), "elevation_deg", np.linspace(1.0, 45.0, 12),
            "speed_m_s", np.linspace(12.0, 30.0, 7), "carry_m")
    free = bf.sweep(*args, obstacles=(wall,), must_clear=False)
    clear = bf.sweep(*args, obstacles=(wall,), must_clear=True)
    m = dict(free.margins)["goal"]
    assert m[free.grid == free.best_value].max() < 0 and free.best_value > clear.best_value
    assert clear.best_clears and not free.best_clears
    best = np.nanmax(np.where(m >= 0, free.grid, np.nan))
    assert clear.best_value == best
    # the search keeps to the launches that clear, and does at least as well as the grid
    opt = bf.best_launch(*args[:2], ("elevation_deg", "speed_m_s"), ((1.0, 45.0), (12.0, 30.0)), "carry_m",
                         obstacles=(wall,), must_clear=True)
    e, v = opt.values
    assert 0.0 <= vacuum_height(v, e, 15.0) <= 3.0 + 1e-6
    assert opt.best_value >= best - 1e-9


def test_the_margin_needs_an_obstacle():
    with pytest.raises(InputError, match="needs an obstacle"):
        bf.sweep(VACUUM, bf.Launch(20.0, 20.0, 0.0, 0.0, 0.0, 0.0, 0.0), "elevation_deg", [10.0, 20.0],
                 "speed_m_s", [10.0, 20.0], bf.MARGIN_OUTPUT)


FREE_KICK = {"ball": "soccer", "speed_m_s": 22.0, "elevation_deg": 14.0, "spin_rpm": 600.0,
             "spin_axis_deg": -60.0, "obstacle": "free_kick", "goal_distance_m": 20.0}
SWEEP = {"sweep_in_report": True, "sweep_x": "elevation_deg", "sweep_y": "speed_m_s", "sweep_points": 9,
         "sweep_elevation_deg_from": 5.0, "sweep_elevation_deg_to": 30.0,
         "sweep_speed_m_s_from": 15.0, "sweep_speed_m_s_to": 30.0}


def test_a_free_kick_sweep_reports_and_draws_the_launches_that_clear():
    r = run_study("flight", {**FREE_KICK, **SWEEP})
    sw = r.detail.sweep
    counts = r.json["sweep"]["points_clearing"]
    assert counts == sw.clearance_counts() and counts["points"] == 81
    assert 0 < counts["all"] < min(counts["wall"], counts["goal"])  # some clear one and not the other
    table = r.tables["sweep"]
    assert list(table.columns[-3:]) == ["margin_wall_m", "margin_goal_m", "clears_all"]
    assert int(table["clears_all"].sum()) == counts["all"]
    names = [t.name for t in flight.sweep_figure(sw, r.inputs).data]
    assert "faded: misses an obstacle" in names and "clears / misses (margin 0)" in names
    assert "highest on the grid that clears" in names


def test_the_flight_command_sweeps_and_counts_the_launches_that_clear(capsys):
    argv = ["flight", "--ball", "soccer", "--speed-m-s", "22", "--elevation-deg", "14", "--spin-rpm", "600",
            "--spin-axis-deg", "-60", "--obstacle", "free_kick", "--sweep-across", "elevation_deg:5:30",
            "--sweep-up", "speed_m_s:15:30", "--sweep-points", "9", "--json"]
    assert main(argv) == 0
    out = json.loads(capsys.readouterr().out)
    want = run_study("flight", {**FREE_KICK, **SWEEP, "wind_speed_m_s": 0.0}).json["sweep"]  # the command's still air
    assert out["sweep"]["points_clearing"] == want["points_clearing"]
    assert out["sweep"]["best_value"] == pytest.approx(want["best_value"], rel=1e-12)


@pytest.mark.parametrize("extra, message", [
    (["--sweep-across", "elevation_deg:5", "--sweep-up", "speed_m_s:15:30"], "--sweep-across expects INPUT:FROM:TO"),
    (["--sweep-across", "elevation_deg:5:30"], "needs both --sweep-across and --sweep-up"),
    (["--sweep-points", "9"], "--sweep-points needs --sweep-across and --sweep-up"),
    (["--sweep-across", "elevation_deg:5:100", "--sweep-up", "speed_m_s:15:30"],
     "--sweep-across to must be between -90 and 90"),
    (["--sweep-across", "elevation_deg:5:30", "--sweep-up", "speed_m_s:15:30", "--sweep-output", "margin_m"],
     "needs an obstacle"),
])
def test_sweep_options_refuse_bad_input_in_one_line(capsys, extra, message):
    argv = ["flight", "--ball", "golf", "--speed-m-s", "60", "--elevation-deg", "12", "--spin-rpm", "2500"]
    assert main(argv + extra) == 2
    err = capsys.readouterr().err.strip()
    assert message in err and "\n" not in err


def test_a_wall_of_my_own_on_the_command_line(capsys):
    """Vacuum from the ground: the margin is the analytic height at the wall minus its height."""
    assert main(["flight", "--ball", "golf", "--speed-m-s", "20", "--elevation-deg", "30", "--spin-rpm", "0",
                 "--launch-height-m", "0", "--density-kg-m3", "0", "--obstacle", "custom",
                 "--wall-distance-m", "12", "--wall-height-m", "3", "--json"]) == 0
    (wall,) = json.loads(capsys.readouterr().out)["obstacles"]
    assert wall["name"] == "your wall"
    assert wall["margin_m"] == pytest.approx(vacuum_height(20.0, 30.0, 12.0) - 3.0, abs=5e-3)


def test_the_handout_lists_the_obstacles_with_their_rules():
    r = run_study("flight", FREE_KICK)
    html = scenario_report(Scenario("flight", r.inputs, "Invented free kick"), r)
    assert "IFAB Law 13 (9.15 m)" in html and "IFAB Law 1 (7.32 m x 2.44 m)" in html
    rows = {row["obstacle"]: row for row in ob.rules_table(r.detail.obstacles, r.detail.checks)}
    assert rows["wall"]["distance_m"] == 9.15 and rows["goal"]["width_m"] == 7.32
    assert rows["wall"]["margin_m"] == pytest.approx(r.json["obstacles"][0]["margin_m"])
    assert math.isnan(rows["goal"]["far_end_m"])
