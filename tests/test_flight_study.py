"""The flight study holds the page's tools (sweep, best launch, spread, fit), so a scenario file,
`python -m liftcore run` and the handout reproduce what the page's tabs show."""

import numpy as np
import pytest
from numpy.testing import assert_allclose

from liftcore import ballflight as bf
from liftcore.errors import InputError
from liftcore.report import scenario_report
from liftcore.scenario import Scenario
from liftcore.studies import flight as study
from liftcore.studies import run_study


def clean(**kw):
    return study.INPUTS.validate(kw)


def test_the_sweep_is_the_core_sweep_over_the_ranges_entered():
    v = clean(sweep_x="speed_m_s", sweep_y="elevation_deg", sweep_points=7,
              sweep_speed_m_s_from=30.0, sweep_speed_m_s_to=50.0)
    sw = study.launch_sweep(v)
    setup, _ = study.setup_from_values(v)
    direct = bf.sweep(setup, study.launch_from_values(v), "speed_m_s", np.linspace(30, 50, 7),
                      "elevation_deg", np.linspace(10, 45, 7), "carry_m", True)
    assert_allclose(sw.grid, direct.grid, rtol=1e-12)  # the same batch: identical numbers
    # carry grows with launch speed at every elevation of the grid (common sense of the physics)
    assert np.all(np.diff(sw.grid, axis=1) > 0)


@pytest.mark.parametrize("kw, message", [
    ({"sweep_x": "spin_rpm", "sweep_y": "spin_rpm"}, "two different inputs"),
    ({"sweep_elevation_deg_from": 40.0, "sweep_elevation_deg_to": 20.0}, "'from' below 'to'"),
])
def test_a_sweep_that_cannot_be_drawn_says_why(kw, message):
    with pytest.raises(InputError, match=message):
        study.launch_sweep(clean(**kw))


def test_the_searched_best_is_no_worse_than_the_best_grid_point():
    v = clean(sweep_points=9)
    sw = study.launch_sweep(v)
    opt = study.best_launch(v)
    assert opt.best_value >= sw.best_value - 1e-9
    (x0, x1), (y0, y1) = (v["sweep_elevation_deg_from"], v["sweep_elevation_deg_to"]), \
                         (v["sweep_spin_rpm_from"], v["sweep_spin_rpm_to"])
    assert x0 <= opt.values[0] <= x1 and y0 <= opt.values[1] <= y1


def test_the_fit_of_the_invented_demo_tracks_finds_the_constants_they_were_made_with():
    fit = study.track_fit(clean(fit_mode="constant"))
    d = bf.DEMO_TRACKS
    # made from CD 0.33, CL 0.21 plus 2 cm noise: the fit lands within a few of its sigmas
    for name, true in (("CD", d["cd"]), ("CL", d["cl"])):
        value, sd = fit.parameter(name)
        assert abs(value - true) < max(4 * sd, 0.01), name


def test_run_and_the_handout_carry_the_sweep_and_the_fit_when_asked():
    values = {"sweep_in_report": True, "sweep_points": 7, "fit_in_report": True, "dispersion_n": 0}
    r = run_study("flight", values)
    sw = study.launch_sweep(clean(**values))
    assert r.json["sweep"]["best_value"] == pytest.approx(sw.best_value, rel=1e-12)
    assert "Launch sweep" in r.figures and len(r.tables["sweep"]) == 49
    assert r.json["fit"]["CD"]["value"] == pytest.approx(study.track_fit(clean()).parameter("CD")[0])
    html = scenario_report(Scenario(kind="flight", inputs=r.inputs, title="invented"), r, "SI")
    assert "Launch sweep" in html
    plain = run_study("flight", {"dispersion_n": 0})
    assert "sweep" not in plain.json and "fit" not in plain.json and "Launch sweep" not in plain.figures
