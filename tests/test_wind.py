"""Apparent wind and wind profiles over the sea."""

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose

from liftcore import wind
from liftcore.constants import G0


# Hand-worked vector triangles (analytic): head wind adds, tail wind subtracts, 3-4-5 and 1-1-sqrt2.
@pytest.mark.parametrize("vs, vt, g_deg, va, beta_deg", [
    (5.0, 12.0, 0.0, 17.0, 0.0),            # head wind: speeds add, wind on the bow
    (5.0, 12.0, 180.0, 7.0, 180.0),         # wind from astern stronger than the ship: from astern
    (12.0, 5.0, 180.0, 7.0, 0.0),           # wind from astern weaker than the ship: felt from ahead
    (3.0, 4.0, 90.0, 5.0, math.degrees(math.atan2(4.0, 3.0))),   # 3-4-5 triangle
    (10.0, 10.0, 90.0, math.sqrt(200.0), 45.0),                  # isosceles right triangle
    (10.0, 10.0, -90.0, math.sqrt(200.0), -45.0),                # same from port
    (0.0, 8.0, 135.0, 8.0, 135.0),          # ship stopped: apparent = true
    (6.0, 0.0, 70.0, 6.0, 0.0),             # calm: the ship's own wind from ahead
    (10.0, 10.0, 120.0, 10.0, 60.0),        # equilateral: |Vs + Vt e^{i 120°}| = 10 at 60°
])
def test_wind_triangle_hand_worked(vs, vt, g_deg, va, beta_deg):
    speed, angle = wind.apparent_wind(vs, vt, math.radians(g_deg))
    assert_allclose(speed, va, rtol=1e-12, atol=1e-12)
    assert_allclose(math.degrees(angle), beta_deg, atol=1e-9)


def test_wind_triangle_matches_complex_vector_sum():
    # Analytic: apparent wind (from) = Vs + Vt e^{i g} as complex numbers, x ahead, y to starboard.
    rng = np.random.default_rng(7)
    vs, vt = rng.uniform(0, 15, 500), rng.uniform(0, 30, 500)
    g = rng.uniform(-np.pi, np.pi, 500)
    z = vs + vt * np.exp(1j * g)
    speed, angle = wind.apparent_wind(vs, vt, g)
    assert_allclose(speed, np.abs(z), rtol=1e-12, atol=1e-12)
    assert_allclose(np.exp(1j * angle), np.exp(1j * np.angle(z)), atol=1e-12)
    # law of cosines: Va^2 = Vs^2 + Vt^2 + 2 Vs Vt cos g
    assert_allclose(speed ** 2, vs ** 2 + vt ** 2 + 2 * vs * vt * np.cos(g), rtol=1e-10, atol=1e-9)


def test_wind_triangle_broadcasts():
    speed, angle = wind.apparent_wind(np.array([[5.0], [10.0]]), 10.0, np.radians([0.0, 90.0, 180.0]))
    assert speed.shape == angle.shape == (2, 3)


def test_power_law_closed_form():
    # Analytic: V(z) = V_ref (z / z_ref)^alpha, here alpha = 0.11 (common practice over sea).
    z = np.array([2.0, 10.0, 25.0, 40.0])
    v = wind.wind_speed_power_law(8.0, 10.0, z, 0.11)
    assert_allclose(v, 8.0 * (z / 10.0) ** 0.11, rtol=1e-14)
    assert_allclose(v[1], 8.0, rtol=1e-14)
    # Analytic: 40 m is two doublings of 10 m, so V(40)/V(10) = 4^alpha = 2^(2 alpha).
    assert_allclose(v[3] / v[1], 2.0 ** 0.22, rtol=1e-14)


# Charnock constants: 0.011 (Smith 1988; Fairall et al. 2003 COARE 3.0 below 10 m/s) and 0.018
# (Fairall et al. 2003 at 18 m/s and above).
@pytest.mark.parametrize("charnock", [wind.CHARNOCK_SMITH_1988, wind.CHARNOCK_FAIRALL_2003_HIGH_WIND])
@pytest.mark.parametrize("speed", [3.0, 10.0, 25.0])
def test_log_law_closed_form_with_charnock(charnock, speed):
    u = wind.friction_velocity_charnock(speed, 10.0, charnock)
    z0 = charnock * u * u / G0                       # Charnock (1955): z0 = a u*^2 / g
    # Analytic: the neutral log law u*/kappa ln(z/z0) passes through the given wind at 10 m ...
    assert_allclose(u / wind.VON_KARMAN * np.log(10.0 / z0), speed, rtol=1e-12)
    # ... and at every other height is that same closed form (kappa = 0.40, Fairall et al. 2003).
    z = np.array([1.0, 10.0, 30.0, 60.0])
    assert_allclose(wind.wind_speed_log_law(speed, 10.0, z, charnock),
                    u / 0.40 * np.log(z / z0), rtol=1e-12)
    assert_allclose(wind.charnock_roughness_length(u, charnock), z0, rtol=1e-15)


@pytest.mark.parametrize("speed", [8.0, 10.0, 15.0, 20.0])
def test_charnock_drag_coefficient_against_sea_measurements(speed):
    # Published (formula recalled from memory): Smith, S. D. (1980), J. Phys. Oceanogr. 10, 709-726,
    # neutral 10 m drag coefficient over the open sea 10^3 C_DN = 0.61 + 0.063 U10 (6 to 22 m/s).
    measured = (0.61 + 0.063 * speed) * 1e-3
    u = wind.friction_velocity_charnock(speed, 10.0, wind.CHARNOCK_SMITH_1988)
    assert_allclose((u / speed) ** 2, measured, rtol=0.06)


def test_log_law_rougher_sea_gives_more_shear():
    # Analytic: V(z2)/V(z1) = ln(z2/z0)/ln(z1/z0) grows as z0 (and so the Charnock constant) grows.
    smooth = wind.wind_speed_log_law(10.0, 10.0, 40.0, 0.011)
    rough = wind.wind_speed_log_law(10.0, 10.0, 40.0, 0.018)
    assert 10.0 < smooth < rough


def test_profiles_vectorise_and_handle_calm():
    speeds = np.array([0.0, 5.0, 12.0])[:, None]
    z = np.array([5.0, 20.0])[None, :]
    for name in wind.PROFILES:
        v = wind.wind_speed_profile(name, speeds, 10.0, z)
        assert v.shape == (3, 2)
        assert np.all(np.isfinite(v))
        assert_allclose(v[0], 0.0)
    assert_allclose(wind.wind_speed_profile("uniform", 7.0, 10.0, [1.0, 50.0]), [7.0, 7.0])


def test_unknown_profile_lists_valid_ones():
    with pytest.raises(ValueError, match="valid: log, power, uniform"):
        wind.wind_speed_profile("cubic", 10.0, 10.0, 20.0)
