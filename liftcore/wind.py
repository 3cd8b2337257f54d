"""Apparent wind on a moving ship and wind speed profiles over the sea.

Conventions
-----------
Angles are relative bearings of the direction the wind comes *from*, measured from the bow:
0 = head wind (on the bow), +90 deg = from starboard (beam), 180 = from astern, negative = from
port. Radians inside functions unless the name ends in ``_deg``. All functions take floats or
numpy arrays and broadcast.

Wind statistics (tables, Weibull, hourly series) live in :mod:`liftcore.windstats`; this module
only turns one true wind into the wind a rotor sees.
"""

from __future__ import annotations

import numpy as np

from liftcore.constants import G0
from liftcore.errors import pick_model

#: von Karman constant. 0.40 as used in the COARE 3.0 bulk algorithm (Fairall et al. 2003).
VON_KARMAN = 0.40

#: Charnock constant over the open sea. 0.011: Smith (1988) and the COARE 3.0 value for
#: U10 <= 10 m/s (Fairall et al. 2003); Charnock (1955) estimated about 0.012; COARE 3.0 raises
#: it linearly to 0.018 at U10 = 18 m/s.
CHARNOCK_SMITH_1988 = 0.011
CHARNOCK_1955 = 0.012
CHARNOCK_FAIRALL_2003_HIGH_WIND = 0.018

#: Power-law exponent over open sea: about 0.10 to 0.14 (common practice); 0.11 by default.
POWER_LAW_EXPONENT_SEA = 0.11

#: Standard height of surface wind measurements. [m] (WMO Guide to Instruments and Methods of
#: Observation, WMO-No. 8: 10 m above ground or sea level.)
STANDARD_WIND_HEIGHT_M = 10.0

#: Iterations of the Charnock fixed point; the map is a strong contraction (error shrinks by
#: roughly 2 / ln(z/z0) ~ 0.1 per step), so 30 steps reach machine precision for any sea wind.
CHARNOCK_ITERATIONS = 30

PROFILES = ("uniform", "power", "log")
PROFILE_LABELS = ("Uniform (same wind at every height)", "Power law",
                  "Logarithmic, Charnock sea roughness")


def apparent_wind(ship_speed_m_s, true_wind_speed_m_s, true_wind_angle_rad):
    """Apparent wind seen aboard a ship moving straight ahead.

    Notes
    -----
    With the ship's own motion adding a head wind of the ship speed Vs, the vector sum with the
    true wind Vt from relative bearing g gives

        V_a = sqrt(Vs^2 + Vt^2 + 2 Vs Vt cos g)
        beta = atan2(Vt sin g, Vs + Vt cos g)

    (vector triangle; leeway and drift are neglected).

    Parameters
    ----------
    ship_speed_m_s : float or ndarray
        Ship speed through the water (no current). [m s^-1]
    true_wind_speed_m_s : float or ndarray
        True wind speed at the height of interest. [m s^-1]
    true_wind_angle_rad : float or ndarray
        Relative bearing of the true wind, 0 = from ahead, positive from starboard. [rad]

    Returns
    -------
    speed_m_s : ndarray
        Apparent wind speed. [m s^-1]
    angle_rad : ndarray
        Apparent wind angle, same convention as the true wind angle, in (-pi, pi]. [rad]
    """
    vs = np.asarray(ship_speed_m_s, dtype=float)
    vt = np.asarray(true_wind_speed_m_s, dtype=float)
    g = np.asarray(true_wind_angle_rad, dtype=float)
    x = vs + vt * np.cos(g)
    y = vt * np.sin(g)
    return np.hypot(x, y), np.arctan2(y, x)


def wind_speed_uniform(speed_ref_m_s, height_ref_m, height_m, parameter=None):
    """The same wind speed at every height (no profile). [m s^-1]"""
    v = np.asarray(speed_ref_m_s, dtype=float)
    return v * np.ones_like(np.asarray(height_m, dtype=float))


def wind_speed_power_law(speed_ref_m_s, height_ref_m, height_m, exponent=POWER_LAW_EXPONENT_SEA):
    """Power-law wind profile, V(z) = V_ref (z / z_ref)^alpha.

    Notes
    -----
    An empirical fit; over open sea alpha is about 0.10 to 0.14 (common practice). Heights must
    be positive.

    Parameters
    ----------
    speed_ref_m_s : float or ndarray
        Wind speed at the reference height. [m s^-1]
    height_ref_m : float
        Reference height (usually 10 m). [m]
    height_m : float or ndarray
        Height above the sea surface. [m]
    exponent : float
        Power-law exponent alpha. [-]
    """
    z = np.asarray(height_m, dtype=float)
    return np.asarray(speed_ref_m_s, dtype=float) * (z / float(height_ref_m)) ** exponent


def charnock_roughness_length(friction_velocity_m_s, charnock_constant=CHARNOCK_SMITH_1988):
    """Aerodynamic roughness of the sea surface, z0 = a u*^2 / g (Charnock 1955). [m]

    References
    ----------
    .. [1] Charnock, H. (1955). Wind stress on a water surface. Q. J. R. Meteorol. Soc. 81,
       639-640.
    """
    u = np.asarray(friction_velocity_m_s, dtype=float)
    # a u*^2 / g underflows to 0 below u* ~ 1e-154 m/s: held at the smallest normal float (the
    # wind there is ~0 either way) so that ln z - ln z0 stays finite
    return np.maximum(charnock_constant * u * u / G0, np.finfo(float).tiny)


def friction_velocity_charnock(speed_ref_m_s, height_ref_m, charnock_constant=CHARNOCK_SMITH_1988,
                               iterations: int = CHARNOCK_ITERATIONS):
    """Friction velocity u* of a neutral log profile over a Charnock sea, from one wind speed.

    Notes
    -----
    Solves u* = kappa V_ref / ln(z_ref / z0(u*)), z0 = a u*^2 / g, by fixed-point iteration,
    vectorised over any number of wind speeds (no loop over conditions). Neutral stability is
    assumed; the smooth-flow (viscous) part of z0, which matters only in light winds below about
    3 m/s, is neglected. Zero wind gives u* = 0.

    Parameters
    ----------
    speed_ref_m_s : float or ndarray
        Wind speed at the reference height. [m s^-1]
    height_ref_m : float
        Reference height. [m]
    charnock_constant : float
        Charnock constant a. [-]

    Returns
    -------
    friction_velocity_m_s : ndarray
        [m s^-1]

    References
    ----------
    .. [1] Charnock, H. (1955). Q. J. R. Meteorol. Soc. 81, 639-640.
    .. [2] Smith, S. D. (1988). Coefficients for sea surface wind stress, heat flux, and wind
       profiles as a function of wind speed and temperature. J. Geophys. Res. 93, 15467-15472.
    .. [3] Fairall, C. W. et al. (2003). Bulk parameterization of air-sea fluxes: updates and
       verification for the COARE algorithm. J. Climate 16, 571-591.
    """
    v = np.asarray(speed_ref_m_s, dtype=float)
    calm = v <= 0.0
    vv = np.where(calm, 1.0, v)
    u = 0.035 * vv  # start near the neutral drag coefficient ~1.2e-3 (u*/U ~ 0.035)
    for _ in range(iterations):
        z0 = charnock_roughness_length(u, charnock_constant)
        u = VON_KARMAN * vv / (np.log(height_ref_m) - np.log(z0))
    return np.where(calm, 0.0, u)


def wind_speed_log_law(speed_ref_m_s, height_ref_m, height_m, charnock_constant=CHARNOCK_SMITH_1988):
    """Neutral logarithmic wind profile over the sea with Charnock roughness.

    Notes
    -----
    V(z) = (u*/kappa) ln(z / z0) with z0 = a u*^2 / g and u* chosen so that V(z_ref) = V_ref
    (see :func:`friction_velocity_charnock`). Neutral stratification; heights well above z0.

    Parameters
    ----------
    speed_ref_m_s : float or ndarray
        Wind speed at the reference height. [m s^-1]
    height_ref_m : float
        Reference height. [m]
    height_m : float or ndarray
        Height above the sea surface. [m]
    charnock_constant : float
        Charnock constant a (0.011 to 0.018 published). [-]

    Returns
    -------
    speed_m_s : ndarray
        [m s^-1], broadcast of the speed and height shapes.
    """
    v = np.asarray(speed_ref_m_s, dtype=float)
    u = friction_velocity_charnock(v, height_ref_m, charnock_constant)
    z0 = charnock_roughness_length(np.where(u > 0, u, 1.0), charnock_constant)
    z = np.asarray(height_m, dtype=float)
    return np.where(u > 0, u / VON_KARMAN * (np.log(z) - np.log(z0)), 0.0 * z)


#: Profile name -> function(speed_ref, height_ref, height, parameter).
PROFILE_FUNCTIONS = {
    "uniform": wind_speed_uniform,
    "power": wind_speed_power_law,
    "log": wind_speed_log_law,
}


def wind_speed_profile(profile: str, speed_ref_m_s, height_ref_m, height_m, parameter=None):
    """Wind speed at ``height_m`` from the named profile (``uniform``, ``power``, ``log``).

    ``parameter`` is the power-law exponent or the Charnock constant (ignored for ``uniform``).
    """
    fn = pick_model("wind profile", profile, PROFILE_FUNCTIONS)
    if parameter is None:
        parameter = {"power": POWER_LAW_EXPONENT_SEA, "log": CHARNOCK_SMITH_1988}.get(profile)
    return fn(speed_ref_m_s, height_ref_m, height_m, parameter)
