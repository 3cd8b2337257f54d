"""Does it clear? Where a ball is when it first crosses a downrange distance."""

import json
import math

import numpy as np
import pytest

from liftcore import ballflight as bf
from liftcore.cli import main
from liftcore.constants import G0
from liftcore.errors import InputError
from liftcore.studies import flight, run_study


@pytest.mark.parametrize("speed, elevation, distance", [(30.0, 40.0, 50.0), (12.0, 10.0, 5.0), (60.0, 60.0, 150.0)])
def test_the_vacuum_path_at_the_check_distance(speed, elevation, distance):
    """Analytic (no air): t = D / (v cos e), z = h + v sin e t - g t^2 / 2."""
    setup = bf.make_setup("golf", density_kg_m3=0.0)
    f = bf.fly(setup, bf.Launch(speed, elevation, 0.0, 0.0, 0.0, 0.0, 1.0), check_distance_m=distance)
    th = math.radians(elevation)
    t = distance / (speed * math.cos(th))
    c = f.at_check
    assert c["time_s"] == pytest.approx(t, rel=1e-9)
    assert c["height_m"] == pytest.approx(1.0 + speed * math.sin(th) * t - 0.5 * G0 * t * t, rel=1e-9, abs=1e-9)
    assert c["speed_m_s"] == pytest.approx(math.hypot(speed * math.cos(th), speed * math.sin(th) - G0 * t), rel=1e-9)
    assert c["lateral_m"] == 0.0 and c["distance_m"] == distance


def test_a_ball_that_lands_first_has_no_check_point(capsys):
    assert main(["flight", "--ball", "golf", "--speed-m-s", "70", "--elevation-deg", "11", "--spin-rpm", "2700",
                 "--check-distance-m", "900", "--json"]) == 0
    assert json.loads(capsys.readouterr().out)["at_check"] is None
    assert main(["flight", "--ball", "golf", "--speed-m-s", "70", "--elevation-deg", "11", "--spin-rpm", "2700",
                 "--check-distance-m", "50", "--json"]) == 0
    c = json.loads(capsys.readouterr().out)["at_check"]
    assert set(c) == {"distance_m", "height_m", "lateral_m", "time_s", "speed_m_s"} and c["height_m"] > 0
    assert main(["flight", "--ball", "golf", "--speed-m-s", "70", "--elevation-deg", "11", "--spin-rpm", "2700",
                 "--check-distance-m", "-3"]) == 2
    assert "check-distance-m" in capsys.readouterr().err


def test_the_page_sentence_says_where_the_ball_is_at_the_wall():
    """Free-kick wall at 9.15 m (IFAB Laws of the Game, Law 13: opponents at least 9.15 m from the
    ball; from memory)."""
    r = run_study("flight", {"ball": "soccer", "speed_m_s": 25.0, "elevation_deg": 18.0, "check_distance_m": 9.15})
    c = r.detail.flights[0].at_check
    assert c is not None and r.json["at_check"] == c
    assert "At **9.15 m** downrange it is" in flight.summary(r)
    with pytest.raises(InputError, match="check distance"):
        bf.at_distance((np.zeros(2), np.zeros((7, 2)), np.zeros((7, 2))), 0.0)
