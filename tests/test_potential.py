"""Ideal spinning-cylinder flow: every expected value is an analytic closed form (named above it)."""

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose

from liftcore import potential as pot
from liftcore.errors import InputError

R, V, RHO = 0.4, 7.0, 1.2


def gamma_for(sr):
    return float(pot.circulation_no_slip(pot.spin_rate_from_ratio(sr, R, V), R))


@pytest.mark.parametrize("sr", [-3.0, -0.7, 0.0, 0.5, 1.0, 2.0, 3.5, 8.0])
def test_pressure_integral_equals_kutta_joukowski_and_drag_is_zero(sr):
    res = pot.ideal_spinning_cylinder(R, V, pot.spin_rate_from_ratio(sr, R, V), RHO)
    # analytic: Kutta-Joukowski L' = rho V Gamma with Gamma = 2 pi R (omega R) = 2 pi R V SR
    expected = RHO * V * 2.0 * math.pi * R * V * sr
    assert_allclose(res.lift_per_span_n_m, expected, rtol=1e-12)
    scale = 0.5 * RHO * V * V * 2.0 * R  # lift scale: dynamic pressure x diameter
    # analytic: the surface-pressure integral gives the same lift (Kutta-Joukowski) ...
    assert abs(res.lift_per_span_from_pressure_n_m - expected) <= 1e-9 * max(abs(expected), scale)
    # analytic: ... and no drag (d'Alembert's paradox)
    assert abs(res.drag_per_span_from_pressure_n_m) <= 1e-12 * scale
    # analytic: CL = Gamma / (R V) = 2 pi SR
    assert_allclose(res.lift_coefficient, 2.0 * math.pi * sr, rtol=1e-12, atol=1e-12)
    assert_allclose(res.lift_coefficient_from_pressure, 2.0 * math.pi * sr, rtol=1e-9, atol=1e-12)
    # analytic: SR = omega R / V
    assert_allclose(res.spin_ratio, sr, rtol=1e-12, atol=1e-15)


def test_pressure_integral_is_independent_of_kj_for_arbitrary_circulation():
    # analytic: Kutta-Joukowski holds for any circulation, not only the no-slip one
    for gamma in (-11.0, 0.3, 4.2, 40.0):
        lift, drag = pot.pressure_force_per_span(V, R, gamma, RHO, n_points=64)
        assert_allclose(lift, RHO * V * gamma, rtol=1e-9)
        assert abs(drag) <= 1e-12 * RHO * V * V * R


@pytest.mark.parametrize("sr", [0.0, 0.4, 1.0, 1.9, -1.2])
def test_stagnation_angles_closed_form(sr):
    st = pot.stagnation_points(V, R, gamma_for(sr))
    # analytic: sin(theta) = -Gamma / (4 pi V R) = -SR/2 on the surface (theta from the rear point,
    # counter-clockwise; positive spin pushes both points down)
    a = math.degrees(math.asin(sr / 2.0))
    expected = sorted([(-a) % 360.0, (180.0 + a) % 360.0])
    assert st.on_surface
    assert_allclose(st.angles_deg, expected, atol=1e-9)
    for (x, y), ang in zip(st.points_m, st.angles_deg):
        # analytic: the points lie on the circle r = R
        assert_allclose(math.hypot(x, y), R, rtol=1e-12)
        u, v = pot.velocity_field(x, y, V, R, gamma_for(sr))
        # analytic: the flow is at rest there
        assert abs(u) < 1e-9 * V and abs(v) < 1e-9 * V


def test_sr_two_gives_one_merged_point_at_the_bottom():
    st = pot.stagnation_points(V, R, gamma_for(2.0))
    # analytic: at SR = 2, sin(theta) = -1: a single point at theta = 270 deg (bottom)
    assert st.on_surface and len(st.angles_deg) == 1
    assert_allclose(st.angles_deg[0], 270.0, atol=1e-9)
    assert_allclose(st.points_m[0], (0.0, -R), atol=1e-12)
    # analytic: negative spin mirrors it to the top
    assert_allclose(pot.stagnation_points(V, R, gamma_for(-2.0)).angles_deg, [90.0], atol=1e-9)


@pytest.mark.parametrize("sr", [2.5, 4.0, 10.0])
def test_beyond_sr_two_the_point_leaves_the_body_on_the_axis(sr):
    gamma = gamma_for(sr)
    st = pot.stagnation_points(V, R, gamma)
    # analytic: on theta = -90 deg, u_r = 0 and V (1 + R^2/r^2) = Gamma / (2 pi r), whose outer
    # root is r = R (k + sqrt(k^2 - 1)) with k = Gamma / (4 pi V R) = SR / 2
    k = sr / 2.0
    r_expected = R * (k + math.sqrt(k * k - 1.0))
    assert not st.on_surface and len(st.points_m) == 1
    assert_allclose(st.points_m[0], (0.0, -r_expected), atol=1e-12)
    assert_allclose(st.angles_deg, [270.0])
    u, v = pot.velocity_field(*st.points_m[0], V, R, gamma)
    # analytic: the flow is at rest at that point
    assert abs(u) < 1e-9 * V and abs(v) < 1e-9 * V


def test_velocity_at_surface_is_tangent_and_equals_surface_formula():
    gamma = gamma_for(1.3)
    theta = np.linspace(0.0, 2 * math.pi, 97)
    x, y = R * np.cos(theta), R * np.sin(theta)
    u, v = pot.velocity_field(x, y, V, R, gamma)
    # analytic: no flow through the wall, u.n = 0
    assert_allclose((u * x + v * y) / R, 0.0, atol=1e-12 * V)
    # analytic: the clockwise tangential component (sin t, -cos t) equals 2 V sin t + Gamma/(2 pi R)
    assert_allclose(u * np.sin(theta) - v * np.cos(theta),
                    pot.surface_tangential_velocity(theta, V, R, gamma), rtol=1e-12, atol=1e-12)
    # analytic: Bernoulli, Cp = 1 - (q/V)^2
    q2 = u * u + v * v
    assert_allclose(pot.surface_pressure_coefficient(theta, V, R, gamma), 1.0 - q2 / V ** 2,
                    rtol=1e-10, atol=1e-10)


def test_positive_spin_lifts_up_and_speeds_the_top():
    gamma = gamma_for(1.0)
    top = pot.surface_tangential_velocity(math.pi / 2, V, R, gamma)
    bottom = pot.surface_tangential_velocity(3 * math.pi / 2, V, R, gamma)
    # analytic: 2V + Gamma/(2 pi R) on top, -2V + Gamma/(2 pi R) below
    assert_allclose([top, bottom], [3.0 * V, -1.0 * V], rtol=1e-12)
    assert pot.kutta_joukowski_lift(RHO, V, gamma) > 0


def test_far_field_tends_to_free_stream():
    gamma = gamma_for(2.0)
    for dist in (1e2, 1e4, 1e6):
        theta = np.linspace(0, 2 * math.pi, 13)
        u, v = pot.velocity_field(dist * R * np.cos(theta), dist * R * np.sin(theta), V, R, gamma)
        # analytic: the disturbance decays like Gamma / (2 pi r) + V R^2 / r^2
        bound = gamma / (2 * math.pi * dist * R) + V / dist ** 2
        assert np.max(np.hypot(u - V, v)) <= 1.0001 * bound


def test_stream_function_constant_on_surface_and_consistent_with_velocity():
    gamma = gamma_for(0.8)
    theta = np.linspace(0, 2 * math.pi, 61)
    # analytic: the body surface is the streamline psi = 0
    assert_allclose(pot.stream_function(R * np.cos(theta), R * np.sin(theta), V, R, gamma), 0.0,
                    atol=1e-12 * V * R)
    # analytic: u = d psi/dy, v = -d psi/dx (central differences, h^2 error)
    x, y, h = np.array([0.9, -0.7, 0.1]), np.array([0.3, -0.6, 0.8]), 1e-5
    u, v = pot.velocity_field(x, y, V, R, gamma)
    dpsi_dy = (pot.stream_function(x, y + h, V, R, gamma) - pot.stream_function(x, y - h, V, R, gamma)) / (2 * h)
    dpsi_dx = (pot.stream_function(x + h, y, V, R, gamma) - pot.stream_function(x - h, y, V, R, gamma)) / (2 * h)
    assert_allclose(u, dpsi_dy, rtol=1e-7)
    assert_allclose(v, -dpsi_dx, rtol=1e-7)


def test_points_inside_body_are_nan_and_arrays_keep_shape():
    xx, yy = np.meshgrid(np.linspace(-2, 2, 7), np.linspace(-1, 1, 5))
    u, v = pot.velocity_field(xx, yy, V, R, 1.0)
    psi = pot.stream_function(xx, yy, V, R, 1.0)
    assert u.shape == v.shape == psi.shape == xx.shape
    inside = xx ** 2 + yy ** 2 < R ** 2
    assert inside.any()
    assert np.isnan(u[inside]).all() and np.isnan(psi[inside]).all()
    assert np.isfinite(u[~inside]).all() and np.isfinite(psi[~inside]).all()


def test_no_slip_circulation_and_ideal_lift_coefficient():
    # analytic: Gamma = 2 pi R (omega R); CL = 2 pi SR
    assert_allclose(pot.circulation_no_slip(10.0, 0.5), 2 * math.pi * 0.5 * 5.0)
    assert_allclose(pot.lift_coefficient_ideal([0.0, 1.0, 2.0]), [0.0, 2 * math.pi, 4 * math.pi])


def test_warnings_present_and_mach():
    res = pot.ideal_spinning_cylinder(R, V, 0.0, RHO, speed_of_sound_m_s=340.0)
    codes = {w.code for w in res.warnings}
    assert {"potential_flow_not_real_force", "ideal_lift_coefficient", "ideal_zero_drag"} <= codes
    assert "mach_above_0_3" not in codes
    fast = pot.ideal_spinning_cylinder(R, 120.0, 0.0, RHO, speed_of_sound_m_s=340.0)
    assert "mach_above_0_3" in {w.code for w in fast.warnings}
    # free stream Mach 0.12 but the top surface runs at (2 + SR) V = 8 V = Mach 0.47
    spun = pot.ideal_spinning_cylinder(R, 40.0, pot.spin_rate_from_ratio(6.0, R, 40.0), RHO, 340.0)
    assert "surface_mach_above_0_3" in {w.code for w in spun.warnings}


@pytest.mark.parametrize("kwargs, message", [
    (dict(radius_m=-1.0), r"^cylinder radius must be > 0 m \(got -1 m\)$"),
    (dict(speed_m_s=0.0), r"^flow speed must be > 0 m/s \(got 0 m/s\)$"),
    (dict(spin_rad_s=float("nan")), r"^spin must be a finite number \(got nan\)$"),
])
def test_bad_input_one_line(kwargs, message):
    args = dict(radius_m=R, speed_m_s=V, spin_rad_s=1.0, density_kg_m3=RHO)
    args.update(kwargs)
    with pytest.raises(InputError, match=message):
        pot.ideal_spinning_cylinder(**args)
