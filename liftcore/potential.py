"""Ideal (potential) flow past a spinning circular cylinder, and the Kutta-Joukowski lift.

The flow is a uniform stream plus a doublet (which makes the circle a streamline) plus a point
vortex of circulation Gamma at the centre. It is the textbook model that explains *why* a
spinning cylinder makes lift; it is not a model of the real forces, because a real cylinder's
boundary layer separates and the real lift is far smaller (and the real drag is not zero).

Conventions (used by every function here, by the pages and by the command line)
-------------------------------------------------------------------------------
- The cylinder's axis is the z axis, its centre the origin, its radius ``R``.
- The free stream of speed ``V`` flows along +x (left to right on the page, y up).
- ``theta`` is the polar angle, counter-clockwise from +x: 0 deg is the rear (downstream)
  point, 90 deg the top, 180 deg the front point facing the stream, 270 deg the bottom.
- Circulation ``Gamma`` and spin ``omega`` are **positive clockwise** in this view. A clockwise
  spin moves the top surface downstream, with the stream; the flow over the top speeds up, the
  pressure there drops, and the lift points **up (+y)**: toward the side where the surface
  moves with the stream. A negative spin (counter-clockwise) gives lift downward (-y).
- Lift per span ``L' = rho V Gamma`` (Kutta-Joukowski), positive along +y.

All functions are vectorised numpy and take SI units.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from liftcore.errors import check_number, check_positive
from liftcore.validity import MACH_INCOMPRESSIBLE_LIMIT, ModelWarning, mach_warning, merge, quantity_warning

#: rad/s per rpm (one revolution is 2 pi rad, one minute 60 s; definition).
RAD_S_PER_RPM = 2.0 * math.pi / 60.0
#: Pressure-integral results (drag, the relative lift difference) smaller than this are round-off
#: of an exact value: the trapezoid rule on the periodic surface integrand converges
#: geometrically (Trefethen & Weideman 2014), so its error is at machine precision; shown as 0.
ROUND_OFF_RESOLUTION = 1e-9
#: Surface points used by default for the pressure integral (the integrand is a trigonometric
#: polynomial of degree 3, so any n >= 8 is exact to rounding; more points only draw nicer).
DEFAULT_SURFACE_POINTS = 720
#: |Gamma| / (4 pi V R) this close to 1 counts as the merged stagnation point (SR = 2).
MERGE_TOLERANCE = 1e-9
#: Points with r^2 < R^2 (1 - INSIDE_TOLERANCE) are inside the body; points on the surface that
#: rounding puts a hair inside still count as flow.
INSIDE_TOLERANCE = 1e-12

REFERENCES = (
    "Anderson, J. D. (2017). Fundamentals of Aerodynamics, 6th ed., McGraw-Hill, chapter 3 "
    "(lifting flow over a cylinder; the Kutta-Joukowski theorem).",
    "Kutta, W. M. (1902) and Joukowski, N. E. (1906): lift per span = density x speed x circulation.",
    "Batchelor, G. K. (1967). An Introduction to Fluid Dynamics, Cambridge University Press, "
    "chapter 6 (flow past a circular cylinder with circulation).",
    "Trefethen, L. N. and Weideman, J. A. C. (2014). The exponentially convergent trapezoidal rule. "
    "SIAM Review 56(3), 385-458 (trapezoid rule on periodic integrands).",
)


# ----------------------------------------------------------------------------- simple relations
def spin_ratio(spin_rad_s, radius_m, speed_m_s):
    """Spin ratio (velocity ratio) SR = omega R / V.

    Parameters
    ----------
    spin_rad_s : float or ndarray
        Rotation rate, positive clockwise (see module notes). [rad s^-1]
    radius_m : float or ndarray
        Cylinder radius. [m]
    speed_m_s : float or ndarray
        Free-stream speed. [m s^-1]

    Returns
    -------
    spin_ratio : float or ndarray
        Surface speed over free-stream speed. [-]
    """
    return np.asarray(spin_rad_s, dtype=float) * radius_m / np.asarray(speed_m_s, dtype=float)


def spin_rate_from_ratio(spin_ratio_, radius_m, speed_m_s):
    """Rotation rate omega = SR V / R that gives a spin ratio. [rad s^-1]"""
    return np.asarray(spin_ratio_, dtype=float) * np.asarray(speed_m_s, dtype=float) / radius_m


def circulation_no_slip(spin_rad_s, radius_m):
    """Circulation of a cylinder whose surface drags the air round with it (no slip).

    Notes
    -----
    Gamma = 2 pi R (omega R): the surface speed times the circumference. It is an idealisation:
    in a real flow the circulation is set by the viscous layers and separation, and is smaller.

    Parameters
    ----------
    spin_rad_s : float or ndarray
        Rotation rate, positive clockwise. [rad s^-1]
    radius_m : float or ndarray
        [m]

    Returns
    -------
    circulation_m2_s : float or ndarray
        Positive clockwise. [m^2 s^-1]
    """
    r = np.asarray(radius_m, dtype=float)
    return 2.0 * math.pi * r * (np.asarray(spin_rad_s, dtype=float) * r)


def kutta_joukowski_lift(density_kg_m3, speed_m_s, circulation_m2_s):
    """Lift per unit span L' = rho V Gamma (Kutta-Joukowski theorem).

    Parameters
    ----------
    density_kg_m3 : float or ndarray
        Fluid density. [kg m^-3]
    speed_m_s : float or ndarray
        Free-stream speed. [m s^-1]
    circulation_m2_s : float or ndarray
        Circulation, positive clockwise with the stream along +x. [m^2 s^-1]

    Returns
    -------
    lift_per_span_n_m : float or ndarray
        Positive toward +y, at right angles to the stream. [N m^-1]

    References
    ----------
    .. [1] Anderson (2017), Fundamentals of Aerodynamics, chapter 3 (Kutta-Joukowski theorem).
    """
    return (np.asarray(density_kg_m3, dtype=float) * np.asarray(speed_m_s, dtype=float)
            * np.asarray(circulation_m2_s, dtype=float))


def lift_coefficient_from_circulation(circulation_m2_s, speed_m_s, radius_m):
    """Lift coefficient on the diameter, CL = L' / (0.5 rho V^2 2R) = Gamma / (R V). [-]"""
    return np.asarray(circulation_m2_s, dtype=float) / (np.asarray(radius_m, dtype=float)
                                                        * np.asarray(speed_m_s, dtype=float))


def lift_coefficient_ideal(spin_ratio_):
    """Ideal lift coefficient of a no-slip spinning cylinder, CL = 2 pi SR (on the diameter). [-]

    Notes
    -----
    Gamma = 2 pi R^2 omega and CL = Gamma / (R V) give CL = 2 pi omega R / V. Real cylinders
    separate and reach a small fraction of this at the same spin ratio.
    """
    return 2.0 * math.pi * np.asarray(spin_ratio_, dtype=float)


# ----------------------------------------------------------------------------- the flow field
def _check_flow(speed_m_s, radius_m, circulation_m2_s):
    v = check_positive("flow speed", speed_m_s, "m/s")
    r = check_positive("cylinder radius", radius_m, "m")
    g = check_number("circulation", circulation_m2_s, "m^2/s")
    return v, r, g


def stream_function(x_m, y_m, speed_m_s, radius_m, circulation_m2_s):
    """Stream function of the spinning-cylinder flow; the body surface is psi = 0.

    Notes
    -----
    psi = V y (1 - R^2 / r^2) + Gamma / (2 pi) ln(r / R), with r^2 = x^2 + y^2 and Gamma positive
    clockwise; u = d psi / dy, v = -d psi / dx. Points inside the body (r < R) are NaN.

    Parameters
    ----------
    x_m, y_m : float or ndarray
        Positions relative to the cylinder centre (broadcast together). [m]
    speed_m_s : float
        Free-stream speed along +x. [m s^-1]
    radius_m : float
        Cylinder radius. [m]
    circulation_m2_s : float
        Positive clockwise. [m^2 s^-1]

    Returns
    -------
    psi : ndarray
        [m^2 s^-1]

    References
    ----------
    .. [1] Anderson (2017), Fundamentals of Aerodynamics, chapter 3 (lifting flow over a cylinder).
    """
    v, r, g = _check_flow(speed_m_s, radius_m, circulation_m2_s)
    x, y = np.broadcast_arrays(np.asarray(x_m, dtype=float), np.asarray(y_m, dtype=float))
    r2 = x * x + y * y
    with np.errstate(divide="ignore", invalid="ignore"):
        psi = v * y * (1.0 - r * r / r2) + g / (4.0 * math.pi) * np.log(r2 / (r * r))
    return np.where(r2 < r * r * (1.0 - INSIDE_TOLERANCE), np.nan, psi)


def velocity_field(x_m, y_m, speed_m_s, radius_m, circulation_m2_s):
    """Velocity (u, v) of the spinning-cylinder flow at points (x, y).

    Notes
    -----
    Complex velocity u - i v = V (1 - R^2 / z^2) + i Gamma / (2 pi z), z = x + i y, which in
    components is

    u = V [1 - R^2 (x^2 - y^2) / r^4] + Gamma y / (2 pi r^2),
    v = -2 V R^2 x y / r^4 - Gamma x / (2 pi r^2).

    Points inside the body (r < R) are NaN.

    Parameters
    ----------
    x_m, y_m : float or ndarray
        Positions relative to the cylinder centre (broadcast together). [m]
    speed_m_s : float
        Free-stream speed along +x. [m s^-1]
    radius_m : float
        [m]
    circulation_m2_s : float
        Positive clockwise. [m^2 s^-1]

    Returns
    -------
    u, v : ndarray
        Velocity components along x and y. [m s^-1]

    References
    ----------
    .. [1] Batchelor (1967), An Introduction to Fluid Dynamics, chapter 6.
    """
    v, r, g = _check_flow(speed_m_s, radius_m, circulation_m2_s)
    x, y = np.broadcast_arrays(np.asarray(x_m, dtype=float), np.asarray(y_m, dtype=float))
    r2 = x * x + y * y
    inside = r2 < r * r * (1.0 - INSIDE_TOLERANCE)
    with np.errstate(divide="ignore", invalid="ignore"):
        a = r * r / (r2 * r2)
        k = g / (2.0 * math.pi * r2)
        u = v * (1.0 - a * (x * x - y * y)) + k * y
        w = -2.0 * v * a * x * y - k * x
    return np.where(inside, np.nan, u), np.where(inside, np.nan, w)


def surface_tangential_velocity(theta_rad, speed_m_s, radius_m, circulation_m2_s):
    """Flow speed along the surface, positive in the clockwise sense (over the top, front to rear).

    Notes
    -----
    q(theta) = 2 V sin(theta) + Gamma / (2 pi R). Its magnitude is the surface speed. With
    positive (clockwise) circulation the flow over the top (theta = 90 deg) is faster.

    Parameters
    ----------
    theta_rad : float or ndarray
        Polar angle counter-clockwise from the rear point (+x). [rad]
    speed_m_s, radius_m, circulation_m2_s : float
        Free-stream speed [m s^-1], radius [m], circulation (positive clockwise) [m^2 s^-1].

    Returns
    -------
    q : float or ndarray
        [m s^-1]

    References
    ----------
    .. [1] Anderson (2017), Fundamentals of Aerodynamics, chapter 3 (there the tangential
       component is counted counter-clockwise, so it carries the opposite sign).
    """
    v, r, g = _check_flow(speed_m_s, radius_m, circulation_m2_s)
    return 2.0 * v * np.sin(np.asarray(theta_rad, dtype=float)) + g / (2.0 * math.pi * r)


def surface_pressure_coefficient(theta_rad, speed_m_s, radius_m, circulation_m2_s):
    """Surface pressure coefficient Cp = (p - p_inf) / (0.5 rho V^2) = 1 - (q / V)^2 (Bernoulli). [-]

    See :func:`surface_tangential_velocity` for ``q`` and the angle convention.
    """
    q = surface_tangential_velocity(theta_rad, speed_m_s, radius_m, circulation_m2_s)
    return 1.0 - (q / float(speed_m_s)) ** 2


@dataclass(frozen=True)
class StagnationPoints:
    """Where the flow comes to rest.

    Attributes
    ----------
    angles_deg : tuple of float
        Polar angle of each point, 0 to 360 deg counter-clockwise from the rear point (+x).
        Two points on the surface for SR below 2, one merged point at SR = 2, one point in the
        flow beyond (on the vertical axis through the centre).
    points_m : tuple of (float, float)
        (x, y) of each point relative to the centre. [m]
    on_surface : bool
        True while the points lie on the body.
    distance_m : float
        Distance of the point(s) from the centre (the radius while on the surface). [m]
    """

    angles_deg: tuple
    points_m: tuple
    on_surface: bool
    distance_m: float


def stagnation_points(speed_m_s, radius_m, circulation_m2_s) -> StagnationPoints:
    """Stagnation points of the spinning-cylinder flow.

    Notes
    -----
    With k = Gamma / (4 pi V R) (k = SR / 2 for the no-slip circulation):

    - |k| < 1: two points on the surface where sin(theta) = -k, i.e. theta = -asin(k) and
      180 deg + asin(k): both slide down (for positive, clockwise Gamma) toward the bottom;
    - |k| = 1 (SR = 2): they merge at the bottom (theta = 270 deg; at the top for k = -1);
    - |k| > 1: the point leaves the body and sits on the vertical axis in the flow, where the
      radial velocity is zero and V (1 + R^2 / r^2) = Gamma / (2 pi r), whose outer root is
      r = R (|k| + sqrt(k^2 - 1)) (the inner root R (|k| - sqrt(k^2 - 1)) lies inside the body).

    References
    ----------
    .. [1] Anderson (2017), Fundamentals of Aerodynamics, chapter 3 (stagnation points of the
       lifting cylinder flow).
    """
    v, r, g = _check_flow(speed_m_s, radius_m, circulation_m2_s)
    k = g / (4.0 * math.pi * v * r)
    if abs(abs(k) - 1.0) <= MERGE_TOLERANCE:
        theta = -0.5 * math.pi if k > 0 else 0.5 * math.pi
        thetas, on_surface, dist = [theta], True, r
    elif abs(k) < 1.0:
        a = math.asin(k)
        thetas, on_surface, dist = [-a, math.pi + a], True, r
    else:
        theta = -0.5 * math.pi if k > 0 else 0.5 * math.pi
        dist = r * (abs(k) + math.sqrt(k * k - 1.0))
        thetas, on_surface = [theta], False
    pairs = sorted(((math.degrees(t) % 360.0), t) for t in thetas)
    angles = tuple(a for a, _ in pairs)
    points = tuple((dist * math.cos(t), dist * math.sin(t)) for _, t in pairs)
    return StagnationPoints(angles_deg=angles, points_m=points, on_surface=on_surface,
                            distance_m=dist)


def surface_angles(n_points: int = DEFAULT_SURFACE_POINTS) -> np.ndarray:
    """Equally spaced polar angles 0 <= theta < 2 pi for a periodic surface integral. [rad]"""
    n = int(n_points)
    if n < 8:
        raise ValueError(f"surface points must be >= 8 (got {n})")
    return 2.0 * math.pi * np.arange(n) / n


def pressure_force_per_span(speed_m_s, radius_m, circulation_m2_s, density_kg_m3,
                            n_points: int = DEFAULT_SURFACE_POINTS):
    """Lift and drag per span from integrating the surface pressure numerically.

    Notes
    -----
    F = -oint (p - p_inf) n ds with the outward normal n = (cos theta, sin theta) and
    ds = R d theta; p - p_inf = 0.5 rho V^2 Cp(theta) from Bernoulli. The trapezoid rule on
    ``n_points`` equally spaced angles is used; on a periodic integrand it converges faster than
    any power of 1/n, and here (a trigonometric polynomial) it is exact for n >= 8 up to rounding,
    which makes it an independent check of Kutta-Joukowski (lift = rho V Gamma, drag = 0).

    Returns
    -------
    lift_per_span_n_m, drag_per_span_n_m : float
        Lift along +y and drag along +x (with the stream). [N m^-1]

    References
    ----------
    .. [1] Trefethen and Weideman (2014), SIAM Review 56(3), 385-458.
    """
    v, r, g = _check_flow(speed_m_s, radius_m, circulation_m2_s)
    rho = check_positive("density", density_kg_m3, "kg/m^3")
    theta = surface_angles(n_points)
    dp = 0.5 * rho * v * v * surface_pressure_coefficient(theta, v, r, g)
    w = 2.0 * math.pi / theta.size
    lift = -r * w * float(np.sum(dp * np.sin(theta)))
    drag = -r * w * float(np.sum(dp * np.cos(theta)))
    return lift, drag


# ----------------------------------------------------------------------------- the whole case
@dataclass(frozen=True)
class IdealCylinderResult:
    """Ideal-flow results for one spinning cylinder (per unit span; SI).

    Lift is positive toward +y with the stream along +x and positive (clockwise) spin; see the
    module notes for the sign convention.
    """

    radius_m: float
    speed_m_s: float
    spin_rad_s: float
    spin_rpm: float
    density_kg_m3: float
    spin_ratio: float
    circulation_m2_s: float
    lift_per_span_n_m: float
    lift_coefficient: float
    lift_per_span_from_pressure_n_m: float
    drag_per_span_from_pressure_n_m: float
    lift_coefficient_from_pressure: float
    drag_coefficient_from_pressure: float
    stagnation_angles_deg: tuple
    stagnation_points_m: tuple
    stagnation_on_surface: bool
    stagnation_distance_m: float
    peak_surface_speed_m_s: float
    min_pressure_coefficient: float
    warnings: tuple = ()

    @property
    def pressure_lift_relative_difference(self) -> float:
        """|pressure-integral lift - Kutta-Joukowski lift| / |Kutta-Joukowski lift| (0 if no lift)."""
        if self.lift_per_span_n_m == 0.0:
            return abs(self.lift_per_span_from_pressure_n_m)
        return abs(self.lift_per_span_from_pressure_n_m / self.lift_per_span_n_m - 1.0)

    def as_json(self) -> dict:
        """The command-line ``--json`` keys (snake_case with units)."""
        return {
            "spin_ratio": self.spin_ratio,
            "circulation_m2_s": self.circulation_m2_s,
            "lift_per_span_n_m": self.lift_per_span_n_m,
            "lift_coefficient": self.lift_coefficient,
            "lift_coefficient_from_pressure": self.lift_coefficient_from_pressure,
            "drag_coefficient_from_pressure": self.drag_coefficient_from_pressure,
            "stagnation_angles_deg": list(self.stagnation_angles_deg),
            "warnings": [w.as_dict() for w in self.warnings],
        }


def ideal_spinning_cylinder(radius_m: float, speed_m_s: float, spin_rad_s: float,
                            density_kg_m3: float, speed_of_sound_m_s: float | None = None,
                            n_points: int = DEFAULT_SURFACE_POINTS) -> IdealCylinderResult:
    """Everything the ideal model says about one spinning cylinder in a uniform stream.

    Parameters
    ----------
    radius_m : float
        Cylinder radius, > 0. [m]
    speed_m_s : float
        Free-stream speed, > 0. [m s^-1]
    spin_rad_s : float
        Rotation rate, positive clockwise with the stream along +x (lift toward +y). [rad s^-1]
    density_kg_m3 : float
        Fluid density, > 0. [kg m^-3]
    speed_of_sound_m_s : float, optional
        For the Mach-number warnings (none if not given). [m s^-1]
    n_points : int
        Surface points of the pressure integral.

    Returns
    -------
    IdealCylinderResult
        Circulation from the no-slip idealisation, Kutta-Joukowski lift, the same lift and the
        (zero) drag from the pressure integral, stagnation points, and warnings.

    References
    ----------
    .. [1] Anderson (2017), Fundamentals of Aerodynamics, chapter 3.
    """
    r = check_positive("cylinder radius", radius_m, "m")
    v = check_positive("flow speed", speed_m_s, "m/s")
    w = check_number("spin", spin_rad_s, "rad/s")
    rho = check_positive("density", density_kg_m3, "kg/m^3")
    sr = float(spin_ratio(w, r, v))
    gamma = float(circulation_no_slip(w, r))
    lift = float(kutta_joukowski_lift(rho, v, gamma))
    lift_p, drag_p = pressure_force_per_span(v, r, gamma, rho, n_points)
    ref = 0.5 * rho * v * v * 2.0 * r
    stag = stagnation_points(v, r, gamma)
    peak = v * (2.0 + abs(gamma) / (2.0 * math.pi * r * v))
    warnings = [
        ModelWarning("potential_flow_not_real_force",
                     "Ideal (inviscid) flow: a real cylinder's boundary layer separates, so its "
                     "lift is far smaller than ρVΓ with the no-slip circulation. Not a real "
                     "force for design.", "lift_per_span_n_m"),
        ModelWarning("ideal_lift_coefficient",
                     "2π SR is the ideal-flow value; measured spinning cylinders separate and "
                     "fall far below it.", "lift_coefficient"),
        ModelWarning("ideal_zero_drag",
                     "Zero drag is the ideal-flow result (d'Alembert's paradox); a real spinning "
                     "cylinder has drag.", "drag_coefficient_from_pressure"),
    ]
    if speed_of_sound_m_s is not None:
        a = check_positive("speed of sound", speed_of_sound_m_s, "m/s")
        warnings += mach_warning(v, a, subject="lift_per_span_n_m")
        if peak / a > MACH_INCOMPRESSIBLE_LIMIT and v / a <= MACH_INCOMPRESSIBLE_LIMIT:
            warnings.append(quantity_warning(
                "surface_mach_above_0_3",
                f"the fastest surface flow ({{peak}}) reaches Mach {peak / a:.2f}, above "
                f"{MACH_INCOMPRESSIBLE_LIMIT}: compressibility is not modelled",
                {"peak": (peak, "speed")}, "lift_per_span_n_m"))
    return IdealCylinderResult(
        radius_m=r, speed_m_s=v, spin_rad_s=w, spin_rpm=w / RAD_S_PER_RPM, density_kg_m3=rho,
        spin_ratio=sr, circulation_m2_s=gamma, lift_per_span_n_m=lift,
        lift_coefficient=float(lift_coefficient_from_circulation(gamma, v, r)),
        lift_per_span_from_pressure_n_m=lift_p, drag_per_span_from_pressure_n_m=drag_p,
        lift_coefficient_from_pressure=lift_p / ref, drag_coefficient_from_pressure=drag_p / ref,
        stagnation_angles_deg=stag.angles_deg, stagnation_points_m=stag.points_m,
        stagnation_on_surface=stag.on_surface, stagnation_distance_m=stag.distance_m,
        peak_surface_speed_m_s=peak, min_pressure_coefficient=1.0 - (peak / v) ** 2,
        warnings=merge(tuple(warnings)))
