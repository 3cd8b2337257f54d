"""Circulation from a gridded field: synthetic fields whose circulation is known in closed form."""

import math

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose

from liftcore import fieldcirc as fc
from liftcore import potential as pot
from liftcore.errors import InputError

V, R, GAMMA, RHO = 10.0, 0.05, 2.5, 1.225
AXIS = np.linspace(-0.3, 0.3, 121)
SIZES = np.linspace(0.08, 0.28, 9)


def ideal(**kw):
    return fc.synthetic_cylinder_field(AXIS, AXIS, V, R, GAMMA, **kw)


@pytest.mark.parametrize("shape", ["circle", "rectangle"])
@pytest.mark.parametrize("wake", [0.0, 0.4])
def test_known_circulation_within_half_percent(shape, wake):
    # a wake centred on the axis has vorticity antisymmetric about it: no net circulation
    res = fc.circulation_from_field(ideal(wake_deficit=wake), (0.0, 0.0), R, SIZES, RHO, shape=shape)
    # analytic: the field was built with circulation GAMMA (Stokes: every enclosing loop sees it)
    assert_allclose(res.circulation_m2_s, GAMMA, rtol=5e-3)
    for g in res.circulations_m2_s:
        assert_allclose(g, GAMMA, rtol=5e-3)


def test_lift_is_kutta_joukowski_and_free_stream_from_edges():
    res = fc.circulation_from_field(ideal(), (0.0, 0.0), R, SIZES, RHO)
    # analytic: round a grid centred on the body the vortex and doublet average to zero on the
    # edge (odd symmetry), so the edge mean is the free stream exactly
    assert_allclose(res.free_stream_speed_m_s, V, rtol=1e-9)
    assert_allclose(res.free_stream_direction_deg % 360.0, 0.0, atol=1e-9)
    # analytic: Kutta-Joukowski L' = rho V Gamma, toward +y (90 deg) for clockwise circulation
    assert_allclose(res.lift_per_span_n_m, RHO * V * res.circulation_m2_s, rtol=1e-12)
    assert_allclose(res.lift_direction_deg, 90.0, atol=1e-9)
    given = fc.circulation_from_field(ideal(), (0.0, 0.0), R, SIZES, RHO, free_stream_speed_m_s=12.0)
    # analytic: a given free-stream speed is used as it is
    assert_allclose(given.lift_per_span_n_m, RHO * 12.0 * given.circulation_m2_s, rtol=1e-12)


def test_rectangle_and_circle_agree():
    f = ideal(noise_m_s=0.02, seed=3)
    sizes = np.linspace(0.08, 0.18, 6)
    c = fc.circulation_from_field(f, (0.0, 0.0), R, sizes, RHO, shape="circle")
    r = fc.circulation_from_field(f, (0.0, 0.0), R, sizes, RHO, shape="rectangle", aspect=1.6)
    # analytic: both enclose the same vorticity (only the body's), so they agree
    assert_allclose(c.circulation_m2_s, r.circulation_m2_s, rtol=2e-3)


def test_noise_increases_spread():
    spreads = [fc.circulation_from_field(ideal(noise_m_s=n, seed=11), (0.0, 0.0), R, SIZES, RHO)
               .circulation_spread_m2_s for n in (0.0, 0.1, 0.5)]
    assert spreads[0] < spreads[1] < spreads[2]
    # analytic: the noise-free ideal field has (almost) no loop-to-loop spread
    assert spreads[0] < 1e-3 * GAMMA


def test_off_centre_body_and_rotated_stream():
    # the body at (0.05, -0.04) and the stream along +y: rotate the ideal field by 90 degrees
    cx, cy = 0.05, -0.04
    xx, yy = np.meshgrid(AXIS, AXIS, indexing="ij")
    xr, yr = yy - cy, -(xx - cx)  # coordinates in the frame where the stream is along +x
    u0, v0 = pot.velocity_field(xr, yr, V, R, GAMMA)
    u, v = -v0, u0  # rotate the velocity back by +90 degrees
    f = fc.VelocityField(AXIS, AXIS, np.nan_to_num(u), np.nan_to_num(v))
    res = fc.circulation_from_field(f, (cx, cy), R, np.linspace(0.08, 0.2, 5), RHO)
    # analytic: circulation does not depend on the stream direction
    assert_allclose(res.circulation_m2_s, GAMMA, rtol=5e-3)
    # analytic: lift is 90 deg counter-clockwise from the stream (stream 90 deg -> lift 180 deg)
    assert_allclose(res.free_stream_direction_deg, 90.0, atol=0.5)
    assert_allclose(res.lift_direction_deg, 180.0, atol=0.5)


def test_loop_cutting_the_body_is_refused():
    with pytest.raises(InputError, match=r"^loop 1 \(circle, radius 0\.052 m\) cuts the body or passes "
                                         r"within one grid cell of it: .*smallest loop size that works "
                                         r"here is 0\.05707 m$"):
        fc.circulation_from_field(ideal(), (0.0, 0.0), R, [0.052, 0.1], RHO)
    with pytest.raises(InputError, match=r"^loop 1 \(rectangle, .*\) cuts the body"):
        fc.circulation_from_field(ideal(), (0.0, 0.0), R, [0.04, 0.1], RHO, shape="rectangle")


def test_loop_leaving_the_grid_is_refused():
    with pytest.raises(InputError, match=r"^loop 2 \(circle, radius 0\.35 m\) leaves the measured grid "
                                         r"\(x from -0\.3 to 0\.3 m, y from -0\.3 to 0\.3 m\): the largest "
                                         r"circle round this centre that fits has radius 0\.3 m$"):
        fc.circulation_from_field(ideal(), (0.0, 0.0), R, [0.1, 0.35], RHO)
    with pytest.raises(InputError, match=r"leaves the measured grid .* half-height \(loop size\) 0\.15 m$"):
        fc.circulation_from_field(ideal(), (0.0, 0.0), R, [0.1, 0.2], RHO, shape="rectangle", aspect=2.0)
    with pytest.raises(InputError, match=r"^body centre \(1, 0\) m is outside the measured grid"):
        fc.circulation_from_field(ideal(), (1.0, 0.0), R, [0.1], RHO)


# ----------------------------------------------------------------------------- reading the file
def small_table():
    f = fc.synthetic_cylinder_field(np.linspace(-1, 1, 6), np.linspace(-1, 1, 5), V, 0.1, 1.0)
    return fc.field_to_table(f)


def test_any_row_order_and_extra_columns_and_comments():
    t = small_table()
    shuffled = t.sample(frac=1.0, random_state=4).reset_index(drop=True)
    shuffled["pressure"] = 1.0
    shuffled = shuffled.rename(columns={"x": " X ", "u": "U"})
    a, b = fc.field_from_table(t), fc.field_from_table(shuffled)
    assert_allclose(a.u_m_s, b.u_m_s)
    assert_allclose(a.v_m_s, b.v_m_s)
    text = "# a comment line\n" + t.to_csv(index=False)
    c = fc.field_from_table(fc.read_field_csv(text.encode()))
    assert_allclose(c.u_m_s, a.u_m_s)
    assert c.shape == (6, 5)


@pytest.mark.parametrize("edit, message", [
    (lambda t: t.drop(columns=["v"]), r"^velocity field is missing column v; it needs x, y, u, v \(found: x, y, u\)$"),
    (lambda t: t.assign(u=t.u.where(t.index != 6, np.nan)),
     r"^velocity field: u in data row 7 is not a finite number \(got empty\); u must be a number in m/s$"),
    (lambda t: t.assign(x=t.x.astype(object).where(t.index != 2, "abc")),
     r"^velocity field: x in data row 3 is not a finite number \(got 'abc'\)"),
    (lambda t: t.assign(x=t.x.where(~np.isclose(t.x, 0.2), 0.3)),
     r"^velocity field: x values are not evenly spaced: x = 0\.3 m in data row \d+ is 0\.25 of a step off"),
    (lambda t: pd.concat([t, t.iloc[[3]]], ignore_index=True),
     r"^velocity field: duplicate point \(x, y\) = \(-1, 0\.5\) m in data rows 4 and 31$"),
    (lambda t: t.drop(index=7), r"^velocity field grid is incomplete: point \(x, y\) = \(-0\.6, 0\) m is "
                                r"missing \(6 x values times 5 y values need 30 rows; got 29\)$"),
    (lambda t: t.iloc[:10], r"^velocity field has 10 rows; it needs at least 16"),
])
def test_bad_tables_are_refused_naming_problem_and_row(edit, message):
    with pytest.raises(InputError, match=message):
        fc.field_from_table(edit(small_table()))


def test_bad_files_are_refused_with_one_line():
    with pytest.raises(InputError, match="^velocity field is not UTF-8 text"):
        fc.read_field_csv(b"\xff\xfe\x00x")
    with pytest.raises(InputError, match="^velocity field is empty"):
        fc.read_field_csv(b"  \n")


def test_shipped_demo_field_is_the_invented_one():
    from liftcore import demo_field

    assert fc.DEMO_FIELD_PATH.stat().st_size < 1.5e6
    assert "INVENTED" in fc.demo_field_note()
    shipped = fc.field_from_table(fc.demo_field_table())
    clean = demo_field.demo_field_without_noise()
    assert shipped.shape == clean.shape == (121, 121)
    resid = np.concatenate([(shipped.u_m_s - clean.u_m_s).ravel(), (shipped.v_m_s - clean.v_m_s).ravel()])
    outside = np.concatenate([clean.u_m_s.ravel() != 0, clean.v_m_s.ravel() != 0])
    # regression: the file is the noise-free generator output plus noise of the stated size
    assert_allclose(resid[outside].std(), demo_field.DEMO["noise_m_s"], rtol=0.05)
    assert abs(resid[outside].mean()) < 0.01
