"""Does it clear? Margins over walls and nets, into goals and boxes; the rules' dimensions."""

import json

import pytest

from liftcore import obstacles as ob
from liftcore.cli import main
from liftcore.studies import flight, run_study


def test_the_presets_carry_the_rules_dimensions():
    """IFAB Laws of the Game, Laws 1 and 13; ITF Rules of Tennis, Rules 1 and 3 (court 23.77 m x
    8.23 m, service line 6.40 m from the net, net 0.914 m at the centre); FIVB Rules 1.1 and 2.1
    (18 m x 9 m, net 2.43 m for men); ITTF Laws 2.1 and 2.2 (2.74 m x 1.525 m, net 15.25 cm).
    All from memory."""
    wall, goal = ob.preset("free_kick", 20.0)
    assert (wall.distance_m, goal.width_m, goal.height_m) == (9.15, 7.32, 2.44)
    net, box = ob.preset("tennis_serve")
    assert net.distance_m == pytest.approx(23.77 / 2) and net.height_m == 0.914
    assert box.end_m - box.distance_m == pytest.approx(6.40) and box.width_m == 8.23
    net, court = ob.preset("volleyball_serve")
    assert (net.distance_m, net.height_m, court.end_m, court.width_m) == (9.0, 2.43, 18.0, 9.0)
    net, half = ob.preset("table_tennis")
    assert (net.distance_m * 2, net.height_m, half.width_m) == (2.74, 0.1525, 1.525)


def test_margins_are_measured_from_the_path():
    """A straight line z = 0.1 x across the obstacles (hand arithmetic)."""
    path = {"x_m": [0.0, 10.0, 20.0], "z_m": [0.0, 1.0, 2.0], "lateral_m": [0.0, 0.5, 1.0]}
    wall = ob.check(path, 20.0, 1.0, ob.Obstacle("wall", "over", 9.15, 0.5))
    assert wall["clears"] and wall["margin_m"] == pytest.approx(0.915 - 0.5)
    goal = ob.check(path, 20.0, 1.0, ob.Obstacle("goal", "through", 15.0, 2.44, 7.32))
    assert goal["clears"] and goal["margin_m"] == pytest.approx(min(2.44 - 1.5, 3.66 - 0.75, 1.5))
    box = ob.check(path, 20.0, 1.0, ob.Obstacle("box", "land", 12.0, 0.0, 8.0, 18.0))
    assert not box["clears"] and box["margin_m"] == pytest.approx(-2.0)
    short = ob.check(path, 8.0, 0.4, ob.Obstacle("net", "over", 9.15, 0.5))
    assert short["lands_short"] and short["margin_m"] == pytest.approx(-1.15)


def test_a_serve_and_a_free_kick_say_how_they_clear(capsys):
    assert main(["flight", "--ball", "tennis", "--speed-m-s", "45", "--elevation-deg", "-3", "--spin-rpm", "2500",
                 "--spin-axis-deg", "180", "--launch-height-m", "2.7", "--obstacle", "tennis_serve", "--json"]) == 0
    checks = {c["name"]: c for c in json.loads(capsys.readouterr().out)["obstacles"]}
    assert checks["net"]["clears"] and checks["net"]["height_m"] > 0.914
    r = run_study("flight", {"ball": "soccer", "speed_m_s": 24.0, "elevation_deg": 17.0, "spin_rpm": 600.0,
                             "spin_axis_deg": -60.0, "obstacle": "free_kick", "goal_distance_m": 20.0})
    assert [c["name"] for c in r.json["obstacles"]] == ["wall", "goal"]
    assert "the wall by" in flight.summary(r)
    names = [t.name for t in r.figures["Side view"].data]
    assert "wall (to clear)" in names and "goal (to go into)" in names  # drawn and named
