"""Three-dimensional flight of spinning balls: many flights at once, landing, sweeps, spread, fits.

Equation of motion (one ball, SI)::

    m dv/dt = -q A CD v_rel_hat + q A CL (omega_hat x v_rel_hat) + m g,   q = rho |v_rel|^2 / 2
    v_rel = v - wind(z),   S = r omega / |v_rel|,   Re = |v_rel| d / nu
    d omega / dt = -c omega |v_rel| / r        (spin decay; c per ball, see liftcore.balls)

Coordinates: x downrange along the target line, y to the LEFT, z up (a right-handed frame). Every
user-facing number is given with *right positive* instead: lateral drift ``lateral_m = -y``,
azimuth and spin-axis tilt positive to the right. A positive spin-axis tilt therefore curves the
ball to the right looking downrange. The spin axis is fixed in space during the flight (the
gyroscopic stiffness of a spinning ball; common practice) while the spin rate decays.

Spin direction from two angles (our wording):
``spin_axis_deg`` (tilt of the lift direction about the launch direction): 0 backspin (lift up),
+90 sidespin curving right, -90 sidespin curving left, 180 topspin.
``rifle_deg``: 0 axis square to the launch direction, 90 axis along it (rifle spin: no Magnus force).

Wind: speed at a reference height, blowing *from* ``from_deg`` measured clockwise from the
downrange direction seen from above (0 headwind, 90 from the right, 180 tailwind). Profiles:
uniform, or a power law u(z) = u_ref (z / z_ref)^alpha (a small private profile of this module;
exponent about 1/7 over open ground is common practice).

A density of 0 means vacuum (no aerodynamic force, no spin decay). The ground is the plane z = 0;
each flight stops there, the landing found by cubic Hermite interpolation inside the last step.

Integrators (vectorised over flights in numpy):
``dopri5``  adaptive Dormand-Prince 5(4) with a step size per flight (default);
``rk4``     classical fixed-step Runge-Kutta on a common time grid (smooth in the parameters, used
            by the least-squares fit).
"""

from __future__ import annotations

import io
import math
from pathlib import Path
from dataclasses import dataclass, field, replace
from typing import Callable

import numpy as np

from liftcore.balls import MODELS, RPM_RAD_S, BallSpec, CoefficientModel, ball, model as get_model
from liftcore.constants import G0
from liftcore.errors import InputError, check_choice, check_number, echo
from liftcore.validity import MACH_INCOMPRESSIBLE_LIMIT, ModelWarning, merge

#: Flights still in the air after this time are stopped and flagged. [s]
T_MAX_S = 60.0
#: Integration steps after which the flights still in the air are stopped where they are (a
#: normal flight takes a few hundred; a ball looping under a lift far above its weight never ends).
MAX_STEPS = 20_000
#: Height below which the power-law wind profile is held constant (avoids a singular slope). [m]
WIND_PROFILE_FLOOR_M = 0.05
#: chi-square quantile with 2 degrees of freedom for a 95 % ellipse, -2 ln(0.05) (analytic).
CHI2_2DOF_95 = -2.0 * math.log(0.05)

OUTPUTS = {
    "carry_m": ("Carry", "distance"),
    "peak_height_m": ("Peak height", "length"),
    "flight_time_s": ("Time aloft", "time"),
    "lateral_m": ("Drift to the side (right +)", "distance"),
    "descent_angle_deg": ("Descent angle", "angle"),
    "landing_speed_m_s": ("Speed at landing", "ball_speed"),
}

LAUNCH_FIELDS = ("speed_m_s", "elevation_deg", "azimuth_deg", "spin_rpm", "spin_axis_deg",
                 "rifle_deg", "height_m")


#: Most gate distances one batch keeps crossings at (each costs two arrays of the batch's size).
MAX_GATES = 8


# ----------------------------------------------------------------------------- inputs
@dataclass(frozen=True)
class Wind:
    """Wind over the field (see the module notes for the direction convention)."""

    speed_m_s: float = 0.0
    from_deg: float = 0.0
    profile: str = "uniform"
    ref_height_m: float = 10.0
    exponent: float = 1.0 / 7.0

    def velocity_direction(self) -> tuple[float, float]:
        """Unit vector (x, y) the wind blows toward, in the internal frame (y to the left)."""
        phi = math.radians(self.from_deg)
        return -float(_cos(phi)), float(_sin(phi))


WIND_PROFILES = ("uniform", "power_law")


def _wind_speed_power_law(height_m, speed_ref_m_s, ref_height_m, exponent):
    """u(z) = u_ref (max(z, floor) / z_ref)^alpha (private; common-practice power law). [m s^-1]"""
    z = np.maximum(np.asarray(height_m, dtype=float), WIND_PROFILE_FLOOR_M)
    return speed_ref_m_s * (z / ref_height_m) ** exponent


def wind_speed_at(wind: Wind, height_m):
    """Wind speed at ``height_m`` for the chosen profile. [m s^-1]"""
    if wind.profile == "power_law":
        return _wind_speed_power_law(height_m, wind.speed_m_s, wind.ref_height_m, wind.exponent)
    return np.full_like(np.asarray(height_m, dtype=float), wind.speed_m_s)


@dataclass(frozen=True)
class FlightSetup:
    """Everything about a flight except the launch: ball, coefficients, air, wind.

    ``cd_scale`` and ``cl_scale`` multiply the model's coefficients (for the ``constant`` model
    they *are* CD and CL).
    """

    ball: BallSpec
    model_key: str
    density_kg_m3: float
    kinematic_viscosity_m2_s: float
    speed_of_sound_m_s: float
    wind: Wind = Wind()
    cd_scale: float = 1.0
    cl_scale: float = 1.0
    spin_decay: bool = True
    gravity_m_s2: float = G0
    #: The user's own coefficient table (:func:`liftcore.balls.table_model`), model key "table".
    aero_table: CoefficientModel | None = None

    @property
    def model(self) -> CoefficientModel:
        return self.aero_table if self.aero_table is not None else get_model(self.model_key)


def make_setup(ball_key: str = "baseball", model_key: str | None = None, *, density_kg_m3: float,
               kinematic_viscosity_m2_s: float = 1.46e-5, speed_of_sound_m_s: float = 340.3,
               wind: Wind | None = None, cd_scale: float = 1.0, cl_scale: float = 1.0,
               spin_decay: bool = True, diameter_m: float | None = None,
               mass_kg: float | None = None, aero_table: CoefficientModel | None = None) -> FlightSetup:
    """Validated :class:`FlightSetup` from plain values (``ball_key='custom'`` needs size and mass;
    ``aero_table`` a model from :func:`liftcore.balls.table_model` replaces the ball's)."""
    from liftcore.balls import custom_ball

    if ball_key == "custom":
        b = custom_ball(diameter_m, mass_kg, "achenbach1972" if aero_table is not None else model_key or "achenbach1972")
    else:
        b = ball(ball_key)
    mk = "table" if aero_table is not None else model_key or b.model
    if aero_table is None:
        check_choice("coefficient model", mk, MODELS)
    rho = check_number("air density", density_kg_m3, "kg/m3", low=0.0, high=2.0)
    nu = check_number("kinematic viscosity", kinematic_viscosity_m2_s, "m2/s", low=1e-6, high=1e-3)
    a = check_number("speed of sound", speed_of_sound_m_s, "m/s", low=200.0, high=400.0)
    w = wind or Wind()
    check_number("wind speed", w.speed_m_s, "m/s", low=0.0, high=60.0)
    check_number("wind direction", w.from_deg, "deg", low=-360.0, high=360.0)
    check_choice("wind profile", w.profile, WIND_PROFILES)
    check_number("wind reference height", w.ref_height_m, "m", low=0.1, high=200.0)
    check_number("wind profile exponent", w.exponent, "", low=0.0, high=1.0)
    check_number("drag scale", cd_scale, "", low=0.0, high=10.0)
    check_number("lift scale", cl_scale, "", low=-10.0, high=10.0)
    return FlightSetup(b, mk, rho, nu, a, w, float(cd_scale), float(cl_scale), bool(spin_decay),
                       aero_table=aero_table)


@dataclass(frozen=True)
class Launch:
    """Launch conditions; each field a float or an array (broadcast together)."""

    speed_m_s: object = 40.0
    elevation_deg: object = 25.0
    azimuth_deg: object = 0.0
    spin_rpm: object = 2000.0
    spin_axis_deg: object = 0.0
    rifle_deg: object = 0.0
    height_m: object = 1.0

    def arrays(self) -> dict:
        arrs = np.broadcast_arrays(*(np.atleast_1d(np.asarray(getattr(self, k), dtype=float))
                                     for k in LAUNCH_FIELDS))
        return {k: np.array(a, dtype=float) for k, a in zip(LAUNCH_FIELDS, arrs)}

    def validate(self) -> "Launch":
        a = self.arrays()
        _check_arr("launch speed", a["speed_m_s"], "m/s", 0.0, 200.0)
        _check_arr("elevation", a["elevation_deg"], "deg", -90.0, 90.0)
        _check_arr("azimuth", a["azimuth_deg"], "deg", -180.0, 180.0)
        _check_arr("spin rate", a["spin_rpm"], "rpm", 0.0, 30000.0)
        _check_arr("spin axis tilt", a["spin_axis_deg"], "deg", -360.0, 360.0)
        _check_arr("rifle-spin angle", a["rifle_deg"], "deg", 0.0, 90.0)
        _check_arr("launch height", a["height_m"], "m", 0.0, 500.0)
        return self

    def take(self, i) -> "Launch":
        a = self.arrays()
        return Launch(**{k: float(a[k][i]) for k in LAUNCH_FIELDS})


def _check_arr(name, arr, unit, lo, hi):
    arr = np.asarray(arr, dtype=float)
    if arr.size == 1:
        check_number(name, float(arr.ravel()[0]), unit, low=lo, high=hi)
        return
    bad = ~np.isfinite(arr) | (arr < lo) | (arr > hi)
    if bad.any():
        i = int(np.flatnonzero(bad.ravel())[0])
        check_number(f"{name} (flight {i + 1})", float(arr.ravel()[i]), unit, low=lo, high=hi)


def _sin(a):
    """sin with round-off below 1e-12 set to zero (so 180 deg gives exactly no sideways part)."""
    s = np.sin(a)
    return np.where(np.abs(s) < 1e-12, 0.0, s)


def _cos(a):
    c = np.cos(a)
    return np.where(np.abs(c) < 1e-12, 0.0, c)


def launch_vectors(launch: Launch):
    """Initial state (7, n) [x, y, z, vx, vy, vz, omega] and spin-axis unit vectors (3, n).

    Directions (internal frame, y to the left): heading h = (cos az, -sin az, 0); launch
    direction e_v = cos(el) h + sin(el) z; e_left = z x h; e_up = e_v x e_left. The lift
    direction omega_hat x e_v equals cos(tilt) e_up - sin(tilt) e_left for the square part of
    the spin axis, omega_perp = -cos(tilt) e_left - sin(tilt) e_up (so tilt 0 is backspin).
    """
    a = launch.arrays()
    el, az = np.radians(a["elevation_deg"]), np.radians(a["azimuth_deg"])
    tilt, rifle = np.radians(a["spin_axis_deg"]), np.radians(a["rifle_deg"])
    hx, hy = _cos(az), -_sin(az)
    ev = np.array([_cos(el) * hx, _cos(el) * hy, _sin(el)])
    el_ = np.array([-hy, hx, np.zeros_like(hx)])  # z x h
    eu = np.cross(ev.T, el_.T).T
    operp = -_cos(tilt) * el_ - _sin(tilt) * eu
    axis = _cos(rifle) * operp + _sin(rifle) * ev
    v = a["speed_m_s"]
    n = v.size
    y0 = np.empty((7, n))
    y0[0] = 0.0
    y0[1] = 0.0
    y0[2] = a["height_m"]
    y0[3:6] = v * ev
    y0[6] = a["spin_rpm"] * RPM_RAD_S
    return y0, axis


# ----------------------------------------------------------------------------- right-hand side
class _Rhs:
    """Vectorised right-hand side for one setup. Columns are flights; per-flight parameters
    ``P`` rows: [k_drag, k_lift, oy, oz, ox, oz, ox, oy] with k = rho A scale / (2 m) and the
    spin-axis components arranged so that omega_hat x r = P[2:5] r[(z, x, y)] - P[5:8] r[(y, z, x)]."""

    def __init__(self, setup: FlightSetup):
        b = setup.ball
        self.g = setup.gravity_m_s2
        self.r = b.radius_m
        self.d_over_nu = b.diameter_m / setup.kinematic_viscosity_m2_s
        self.aero = setup.density_kg_m3 > 0.0
        self.coef = setup.model.coefficients
        self.decay = (b.spin_decay / b.radius_m) if (setup.spin_decay and self.aero) else 0.0
        w = setup.wind
        self.wind_on = w.speed_m_s > 0.0
        self.power = w.profile == "power_law"
        self.wref = w.speed_m_s
        wdx, wdy = w.velocity_direction()
        self.wvec = np.array([[wdx], [wdy], [0.0]])
        self.zfloor = WIND_PROFILE_FLOOR_M
        self.inv_zref = 1.0 / w.ref_height_m
        self.alpha = w.exponent
        self.evals = 0
        self.last = ()

    def rel5(self, Y):
        """Air-relative velocity as rows [rx, ry, rz, rx, ry] (the repeat serves the cross product)."""
        R5 = np.empty((5, Y.shape[1]))
        if self.wind_on:
            if self.power:
                u = self.wref * (np.maximum(Y[2], self.zfloor) * self.inv_zref) ** self.alpha
            else:
                u = self.wref
            np.subtract(Y[3:6], u * self.wvec, out=R5[0:3])
        else:
            R5[0:3] = Y[3:6]
        R5[3:5] = R5[0:2]
        return R5

    def coefficients_of(self, S, Re, V, w, P):
        """(CD, CL) per column: the setup's model (``P`` rows beyond 8 unused here)."""
        return self.coef(S, Re, V, w * (1.0 / RPM_RAD_S))

    def coefficients(self, Y):
        """(V_rel, S, Re, CD, CL) at states Y (unscaled model coefficients)."""
        R = self.rel5(Y)[0:3]
        V = np.maximum(np.sqrt((R * R).sum(0)), 1e-9)
        S = self.r * Y[6] / V
        Re = V * self.d_over_nu
        CD, CL = self.coef(S, Re, V, Y[6] * (1.0 / RPM_RAD_S))
        return V, S, Re, CD, CL

    def __call__(self, Y, P):
        self.evals += 1
        F = np.empty_like(Y)
        F[0:3] = Y[3:6]
        if not self.aero:
            F[3:5] = 0.0
            F[5] = -self.g
            F[6] = 0.0
            return F
        R5 = self.rel5(Y)
        R = R5[0:3]
        V = np.sqrt((R * R).sum(0))
        np.maximum(V, 1e-9, out=V)
        w = Y[6]
        S = self.r * w / V
        Re = V * self.d_over_nu
        self.last = (V, S, Re)
        CD, CL = self.coefficients_of(S, Re, V, w, P)
        a = P[0] * CD * V
        b = P[1] * CL * V
        cross = P[2:5] * R5[2:5] - P[5:8] * R5[1:4]
        F[3:6] = b * cross - a * R
        F[5] -= self.g
        F[6] = (-self.decay) * w * V
        return F


class _CurveRhs(_Rhs):
    """The right-hand side with each column's own curves (the track fit's ``curve`` mode):
    CD = P[8] + P[9] S and CL = P[11] tanh(P[10] S / P[11]) (lift rising with slope P[10] and
    levelling off at P[11])."""

    def coefficients_of(self, S, Re, V, w, P):
        return curve_coefficients(S, P[8], P[9], P[10], P[11])


def curve_coefficients(S, cd0, cd_s, cl_slope, cl_max):
    """Drag with a spin term and lift rising to a saturation, over spin parameter S.

    Parameters
    ----------
    S : float or ndarray
        Spin parameter r omega / V. [-]
    cd0, cd_s : float or ndarray
        CD at no spin, and its rise per unit S. [-]
    cl_slope, cl_max : float or ndarray
        dCL/dS at S = 0, and the level CL tends to. [-]

    Returns
    -------
    (CD, CL)

    Notes
    -----
    CD = cd0 + cd_s S;  CL = cl_max tanh(cl_slope S / cl_max): linear at small S, saturating at
    high S, the two behaviours spinning-ball lift measurements show (e.g. Nathan 2008; Sawicki
    et al. 2003), in the plainest smooth form with two parameters.
    """
    S = np.asarray(S, dtype=float)
    return cd0 + cd_s * S, cl_max * np.tanh(cl_slope * S / cl_max)


def _params(setup: FlightSetup, axis, n, cd_scale=None, cl_scale=None):
    """Per-flight parameter rows for :class:`_Rhs` (see its docstring)."""
    k = setup.density_kg_m3 * setup.ball.area_m2 / (2 * setup.ball.mass_kg)
    P = np.empty((8, n))
    P[0] = k * (setup.cd_scale if cd_scale is None else np.asarray(cd_scale, dtype=float))
    P[1] = k * (setup.cl_scale if cl_scale is None else np.asarray(cl_scale, dtype=float))
    ox, oy, oz = axis
    P[2], P[3], P[4] = oy, oz, ox
    P[5], P[6], P[7] = oz, ox, oy
    return P


def _hermite(t0, t1, y0, y1, f0, f1, tq):
    """Cubic Hermite between (t0, y0, f0) and (t1, y1, f1) at tq (broadcasting over columns)."""
    h = t1 - t0
    s = np.where(h > 0, (tq - t0) / np.where(h > 0, h, 1.0), 0.0)
    s2, s3 = s * s, s * s * s
    return ((2 * s3 - 3 * s2 + 1) * y0 + (s3 - 2 * s2 + s) * h * f0
            + (-2 * s3 + 3 * s2) * y1 + (s3 - s2) * h * f1)


def _landing_fraction(z0, z1, dz0, dz1, h):
    """Fraction s in (0, 1] of the step where the Hermite cubic of z crosses 0.

    Newton's method from the linear-interpolation guess, kept inside [0, 1]; the cubic is close
    to linear over one step, so a few iterations reach machine precision.
    """
    s = np.clip(z0 / np.where(z0 - z1 != 0, z0 - z1, 1.0), 0.0, 1.0)
    a0, a1 = z0, h * dz0
    b0, b1 = z1, h * dz1
    for _ in range(8):
        s2, s3 = s * s, s * s * s
        p = (2 * s3 - 3 * s2 + 1) * a0 + (s3 - 2 * s2 + s) * a1 + (-2 * s3 + 3 * s2) * b0 + (s3 - s2) * b1
        dp = (6 * s2 - 6 * s) * a0 + (3 * s2 - 4 * s + 1) * a1 + (-6 * s2 + 6 * s) * b0 + (3 * s2 - 2 * s) * b1
        s = np.clip(s - p / np.where(dp != 0, dp, -1e-300), 0.0, 1.0)
    return s


# Dormand-Prince 5(4) tableau (Dormand & Prince 1980, J. Comput. Appl. Math. 6, 19-26).
_A = (
    (),
    (1 / 5,),
    (3 / 40, 9 / 40),
    (44 / 45, -56 / 15, 32 / 9),
    (19372 / 6561, -25360 / 2187, 64448 / 6561, -212 / 729),
    (9017 / 3168, -355 / 33, 46732 / 5247, 49 / 176, -5103 / 18656),
)
_B = (35 / 384, 0.0, 500 / 1113, 125 / 192, -2187 / 6784, 11 / 84)
_E = (71 / 57600, 0.0, -71 / 16695, 71 / 1920, -17253 / 339200, 22 / 525, -1 / 40)
_A_MAT = np.zeros((7, 7))
for _i, _row in enumerate(_A):
    _A_MAT[_i, :len(_row)] = _row
_B_VEC = np.array(_B)
_E_VEC = np.array(_E)


@dataclass(frozen=True)
class BatchResult:
    """Landing of n flights (arrays of length n, user-facing signs: right positive).

    ``records`` (when asked for) holds, per flight, the step knots ``(t, Y, F)`` for dense
    output. ``s_min`` ... ``re_max`` are the ranges of spin parameter and Reynolds number met
    at the step points of each flight; ``speed_rel_max_m_s`` the largest air-relative speed.
    """

    carry_m: np.ndarray
    lateral_m: np.ndarray
    flight_time_s: np.ndarray
    peak_height_m: np.ndarray
    descent_angle_deg: np.ndarray
    landing_speed_m_s: np.ndarray
    landing_spin_rpm: np.ndarray
    landed: np.ndarray
    s_min: np.ndarray
    s_max: np.ndarray
    re_min: np.ndarray
    re_max: np.ndarray
    speed_rel_max_m_s: np.ndarray
    steps: int = 0
    rhs_evals: int = 0
    records: tuple = ()
    #: Flights stopped unfinished at :data:`MAX_STEPS` integration steps.
    stalled: int = 0
    #: Height and drift (right +) where each flight first crosses each gate distance asked of
    #: :func:`simulate`, shape (gates, n); NaN where it lands (or stops) before the gate. [m]
    gate_height_m: np.ndarray | None = None
    gate_lateral_m: np.ndarray | None = None

    @property
    def n(self) -> int:
        return int(self.carry_m.size)

    def output(self, key: str) -> np.ndarray:
        check_choice("output", key, OUTPUTS)
        return getattr(self, key)


def simulate(setup: FlightSetup, launch: Launch, *, rtol: float = 1e-6, atol: float = 1e-6,
             t_max: float = T_MAX_S, record: bool = False, progress: Callable | None = None,
             cd_scale=None, cl_scale=None, gates=()) -> BatchResult:
    """Fly every launch in ``launch`` (arrays broadcast) to the ground with adaptive Dormand-Prince.

    Parameters
    ----------
    setup : FlightSetup
    launch : Launch
        Floats or arrays; n flights.
    rtol, atol : float
        Local error tolerances per flight (relative; absolute in SI units).
    record : bool
        Keep the step knots of every flight for dense output (memory grows with n x steps).
    cd_scale, cl_scale : array, optional
        Per-flight coefficient scales overriding ``setup.cd_scale`` / ``setup.cl_scale``.
    gates : sequence of float
        Downrange distances (at most :data:`MAX_GATES`) where every flight's height and drift
        are kept as it first crosses them (walls, nets, goal lines), without recording paths. [m]

    Returns
    -------
    BatchResult

    Notes
    -----
    A gate crossing is found inside the accepted step whose downrange distance brackets it, on
    the step's cubic Hermite interpolant (the one the landing and the charts use), by the same
    Newton iteration as the landing.

    References
    ----------
    .. [1] Dormand, J. R. & Prince, P. J. (1980), A family of embedded Runge-Kutta formulae,
       J. Comput. Appl. Math. 6, 19-26.
    .. [2] Hairer, E., Norsett, S. P. & Wanner, G. (1993), Solving Ordinary Differential
       Equations I, 2nd ed., Springer, Sec. II.4 and II.6 (step size, dense output).
    """
    y0, axis = launch_vectors(launch)
    n = y0.shape[1]
    gates = np.asarray(gates, dtype=float).ravel()
    if gates.size > MAX_GATES:
        raise InputError("gates", f"at most {MAX_GATES} gate distances per batch (got {gates.size})")
    gate_z = np.full((gates.size, n), np.nan)
    gate_y = np.full((gates.size, n), np.nan)
    rhs = _Rhs(setup)
    P = _params(setup, axis, n, cd_scale, cl_scale)
    out = {k: np.full(n, np.nan) for k in ("t", "x", "y", "vx", "vy", "vz", "w")}
    landed = np.zeros(n, dtype=bool)
    peak = y0[2].copy()
    smin = np.full(n, np.inf)
    smax = np.full(n, -np.inf)
    remin = np.full(n, np.inf)
    remax = np.full(n, -np.inf)
    vmax = np.zeros(n)

    def track(Yc, ids):
        if not rhs.aero:
            return
        V, S, Re, _, _ = rhs.coefficients(Yc)
        smin[ids] = np.minimum(smin[ids], S)  # ids are unique within one call
        smax[ids] = np.maximum(smax[ids], S)
        remin[ids] = np.minimum(remin[ids], Re)
        remax[ids] = np.maximum(remax[ids], Re)
        vmax[ids] = np.maximum(vmax[ids], V)

    # flights that start on the ground heading down land at once
    ground = (y0[2] <= 0.0) & (y0[5] <= 0.0)
    ids = np.flatnonzero(~ground)
    for j in np.flatnonzero(ground):
        out["t"][j], out["x"][j], out["y"][j] = 0.0, 0.0, 0.0
        out["vx"][j], out["vy"][j], out["vz"][j], out["w"][j] = y0[3, j], y0[4, j], y0[5, j], y0[6, j]
        landed[j] = True
    Y = y0[:, ids].copy()
    Pa = P[:, ids].copy()
    track(Y, ids)
    # running extremes of the active flights (written back when a flight finishes)
    pk = peak[ids].copy()
    smn, smx, rmn, rmx, vmx = smin[ids], smax[ids], remin[ids], remax[ids], vmax[ids]
    rec_t, rec_y, rec_f, rec_id = [], [], [], []
    F = rhs(Y, Pa) if ids.size else np.empty((7, 0))
    if record and ids.size:
        rec_t.append(np.zeros(ids.size)); rec_y.append(Y.copy()); rec_f.append(F.copy()); rec_id.append(ids.copy())
    t = np.zeros(ids.size)
    # initial step from the acceleration scale (Hairer, Norsett & Wanner, Sec. II.4, simplified)
    scale0 = atol + rtol * np.abs(Y)
    d0 = np.sqrt(np.mean((Y / scale0) ** 2, axis=0)) if ids.size else np.zeros(0)
    d1 = np.sqrt(np.mean((F / scale0) ** 2, axis=0)) if ids.size else np.zeros(0)
    h = np.where((d0 < 1e-5) | (d1 < 1e-5), 1e-4, 0.01 * d0 / np.maximum(d1, 1e-30))
    h = np.clip(h, 1e-5, 0.05)
    steps = 0
    stalled = 0
    last_report = 0.0
    while ids.size:
        steps += 1
        m = ids.size
        Kst = np.empty((7, 7, m))
        Kst[0] = F
        K2 = Kst.reshape(7, 7 * m)
        for i in range(1, 6):
            Kst[i] = rhs(Y + h * (_A_MAT[i, :i] @ K2[:i]).reshape(7, m), Pa)
        Y5 = Y + h * (_B_VEC @ K2[:6]).reshape(7, m)
        F5 = rhs(Y5, Pa)
        seen5 = rhs.last
        Kst[6] = F5
        E = h * (_E_VEC @ K2).reshape(7, m)
        sc = atol + rtol * np.maximum(np.abs(Y), np.abs(Y5))
        err = np.sqrt(np.mean((E / sc) ** 2, axis=0))
        ok = err <= 1.0
        fac = np.where(err > 0, 0.9 * np.maximum(err, 1e-10) ** -0.2, 5.0)
        h_next = h * np.where(ok, np.clip(fac, 0.2, 5.0), np.clip(fac, 0.1, 0.9))
        t_new = t + h
        # accepted steps
        Ynew = np.where(ok, Y5, Y)
        Fnew = np.where(ok, F5, F)
        # apex inside the step: vz changes sign; z at the root of a linear vz (z is stationary there)
        up = ok & (Y[5] > 0) & (Y5[5] <= 0)
        if up.any():
            s = Y[5, up] / (Y[5, up] - Y5[5, up])
            zap = _hermite(0.0, 1.0, Y[2, up], Y5[2, up], h[up] * Y[5, up], h[up] * Y5[5, up], s)
            pk[up] = np.maximum(pk[up], zap)
        all_ok = bool(ok.all())
        if all_ok:
            np.maximum(pk, Y5[2], out=pk)
            if rhs.aero:
                V5, S5, Re5 = seen5
                np.minimum(smn, S5, out=smn)
                np.maximum(smx, S5, out=smx)
                np.minimum(rmn, Re5, out=rmn)
                np.maximum(rmx, Re5, out=rmx)
                np.maximum(vmx, V5, out=vmx)
        else:
            pk = np.where(ok, np.maximum(pk, Y5[2]), pk)
            if rhs.aero:
                V5, S5, Re5 = seen5
                smn = np.where(ok, np.minimum(smn, S5), smn)
                smx = np.where(ok, np.maximum(smx, S5), smx)
                rmn = np.where(ok, np.minimum(rmn, Re5), rmn)
                rmx = np.where(ok, np.maximum(rmx, Re5), rmx)
                vmx = np.where(ok, np.maximum(vmx, V5), vmx)
        land = ok & (Y5[2] < 0.0)
        if land.any():
            li = np.flatnonzero(land)
            s = _landing_fraction(Y[2, li], Y5[2, li], Y[5, li], Y5[5, li], h[li])
            Yl = _hermite(0.0, 1.0, Y[:, li], Y5[:, li], h[li] * F[:, li], h[li] * F5[:, li], s)
            gid = ids[li]
            out["t"][gid] = t[li] + s * h[li]
            out["x"][gid], out["y"][gid] = Yl[0], Yl[1]
            out["vx"][gid], out["vy"][gid], out["vz"][gid], out["w"][gid] = Yl[3], Yl[4], Yl[5], Yl[6]
            landed[gid] = True
            Yl[2] = 0.0
            Ynew[:, li] = Yl
            Fnew[:, li] = rhs(Yl, Pa[:, li])
            t_new = t_new.copy()
            t_new[li] = out["t"][gid]
        for g, d in enumerate(gates):
            cross = ok & (Y[0] < d) & (Ynew[0] >= d)
            if cross.any():
                ci = np.flatnonzero(cross)
                hh = (t_new - t)[ci]
                s = _landing_fraction(Y[0, ci] - d, Ynew[0, ci] - d, F[0, ci], Fnew[0, ci], hh)
                Yg = _hermite(0.0, 1.0, Y[:, ci], Ynew[:, ci], hh * F[:, ci], hh * Fnew[:, ci], s)
                gate_z[g, ids[ci]], gate_y[g, ids[ci]] = Yg[2], -Yg[1] + 0.0
        t = np.where(ok, t_new, t)
        Y, F = Ynew, Fnew
        if record and ok.any():
            rec_t.append(t[ok].copy()); rec_y.append(Y[:, ok].copy()); rec_f.append(F[:, ok].copy())
            rec_id.append(ids[ok].copy())
        h = h_next
        timeout = t >= t_max
        done = land | timeout
        if timeout.any():
            ti = np.flatnonzero(timeout & ~land)
            gid = ids[ti]
            out["t"][gid] = t[ti]
            out["x"][gid], out["y"][gid] = Y[0, ti], Y[1, ti]
            out["vx"][gid], out["vy"][gid], out["vz"][gid], out["w"][gid] = Y[3, ti], Y[4, ti], Y[5, ti], Y[6, ti]
        if done.any():
            gd = ids[done]
            peak[gd], smin[gd], smax[gd], remin[gd], remax[gd], vmax[gd] = (
                pk[done], smn[done], smx[done], rmn[done], rmx[done], vmx[done])
            keep = ~done
            ids, Y, F, Pa, t, h = ids[keep], Y[:, keep], F[:, keep], Pa[:, keep], t[keep], h[keep]
            pk, smn, smx, rmn, rmx, vmx = pk[keep], smn[keep], smx[keep], rmn[keep], rmx[keep], vmx[keep]
            if progress is not None and n >= 200:
                frac = 1.0 - ids.size / n
                if frac - last_report >= 0.05:
                    last_report = frac
                    progress(frac, f"flying {n:,} balls")
        if ids.size and steps >= MAX_STEPS:
            # Stalled: a ball whose lift is far above its weight loops on a tiny circle (or the
            # step size collapsed). Stop the rest where they are; flight_warnings says so.
            gid = ids
            out["t"][gid] = t
            out["x"][gid], out["y"][gid] = Y[0], Y[1]
            out["vx"][gid], out["vy"][gid], out["vz"][gid], out["w"][gid] = Y[3], Y[4], Y[5], Y[6]
            peak[gid], smin[gid], smax[gid], remin[gid], remax[gid], vmax[gid] = pk, smn, smx, rmn, rmx, vmx
            stalled = int(ids.size)
            break
    horiz = np.hypot(out["vx"], out["vy"])
    records = ()
    if record:
        records = _split_records(n, rec_t, rec_y, rec_f, rec_id)
    return BatchResult(
        carry_m=out["x"], lateral_m=-out["y"] + 0.0, flight_time_s=out["t"], peak_height_m=peak,
        descent_angle_deg=np.degrees(np.arctan2(-out["vz"], horiz)) + 0.0,
        landing_speed_m_s=np.sqrt(horiz ** 2 + out["vz"] ** 2),
        landing_spin_rpm=out["w"] / RPM_RAD_S, landed=landed, s_min=smin, s_max=smax,
        re_min=remin, re_max=remax, speed_rel_max_m_s=vmax, steps=steps, rhs_evals=rhs.evals,
        records=records, stalled=stalled, gate_height_m=gate_z if gates.size else None,
        gate_lateral_m=gate_y if gates.size else None)


def _split_records(n, rec_t, rec_y, rec_f, rec_id):
    if not rec_t:
        return tuple((np.zeros(1), np.zeros((7, 1)), np.zeros((7, 1))) for _ in range(n))
    T = np.concatenate(rec_t)
    Yk = np.concatenate(rec_y, axis=1)
    Fk = np.concatenate(rec_f, axis=1)
    I = np.concatenate(rec_id)
    order = np.lexsort((T, I))
    T, Yk, Fk, I = T[order], Yk[:, order], Fk[:, order], I[order]
    bounds = np.searchsorted(I, np.arange(n + 1))
    return tuple((T[bounds[j]:bounds[j + 1]], Yk[:, bounds[j]:bounds[j + 1]],
                  Fk[:, bounds[j]:bounds[j + 1]]) for j in range(n))


def simulate_rk4(setup: FlightSetup, launch: Launch, t_end: float, dt: float = 0.005,
                 cd_scale=None, cl_scale=None):
    """Fixed-step RK4 on a common grid 0..t_end (no ground stop).

    Returns ``(t (m,), Y (m, 7, n), F (m, 7, n))``: states and derivatives at the grid points,
    for dense output by cubic Hermite interpolation (see :func:`states_at`).
    """
    y0, axis = launch_vectors(launch)
    P = _params(setup, axis, y0.shape[1], cd_scale, cl_scale)
    return _rk4_grid(_Rhs(setup), y0, P, t_end, dt)


def _rk4_grid(rhs, y0, P, t_end: float, dt: float):
    """Classical RK4 for all columns of ``y0`` on the grid 0, dt, ... >= t_end: (t, Y, F)."""
    n = y0.shape[1]
    m = int(math.ceil(t_end / dt - 1e-9))
    tg = np.arange(m + 1) * dt
    Ys = np.empty((m + 1, 7, n))
    Fs = np.empty((m + 1, 7, n))
    Y = y0
    F = rhs(Y, P)
    Ys[0], Fs[0] = Y, F
    hh = 0.5 * dt
    for i in range(m):
        k2 = rhs(Y + hh * F, P)
        k3 = rhs(Y + hh * k2, P)
        k4 = rhs(Y + dt * k3, P)
        Y = Y + (dt / 6.0) * (F + 2.0 * k2 + 2.0 * k3 + k4)
        F = rhs(Y, P)
        Ys[i + 1], Fs[i + 1] = Y, F
    return tg, Ys, Fs


def states_at(tg, Ys, Fs, flight_index, times):
    """States (7, k) of one flight of :func:`simulate_rk4` at ``times`` (cubic Hermite)."""
    times = np.asarray(times, dtype=float)
    dt = tg[1] - tg[0]
    k = np.clip(np.floor(times / dt).astype(int), 0, len(tg) - 2)
    j = flight_index
    return _hermite(tg[k], tg[k + 1], Ys[k, :, j].T, Ys[k + 1, :, j].T, Fs[k, :, j].T,
                    Fs[k + 1, :, j].T, times)


# ----------------------------------------------------------------------------- one flight
@dataclass(frozen=True)
class Flight:
    """One flight: landing numbers (right positive), the path sampled for charts, and warnings."""

    label: str
    carry_m: float
    peak_height_m: float
    flight_time_s: float
    lateral_m: float
    descent_angle_deg: float
    landing_speed_m_s: float
    landing_spin_rpm: float
    landed: bool
    path: dict
    warnings: tuple = ()
    ball_key: str = ""
    model_key: str = ""
    density_kg_m3: float = 0.0
    #: Where the ball crosses the check distance (:func:`at_distance`), or None.
    at_check: dict | None = None
    #: Bounces and roll to rest (:func:`_after_landing`), or None without a ground.
    run_out: dict | None = None

    def headline_dict(self) -> dict:
        return {k: getattr(self, k) for k in OUTPUTS}


def _sample_path(setup: FlightSetup, knots, n_samples: int = 160) -> dict:
    T, Yk, Fk = knots
    if T.size < 2:
        t = T.copy()
        Y = Yk.copy()
    else:
        t = np.union1d(np.linspace(T[0], T[-1], n_samples), [T[-1]])
        k = np.clip(np.searchsorted(T, t, side="right") - 1, 0, T.size - 2)
        Y = _hermite(T[k], T[k + 1], Yk[:, k], Yk[:, k + 1], Fk[:, k], Fk[:, k + 1], t)
    rhs = _Rhs(setup)
    ground_speed = np.sqrt(Y[3] ** 2 + Y[4] ** 2 + Y[5] ** 2)
    if rhs.aero:
        V, S, Re, CD, CL = rhs.coefficients(Y)
        CD = CD * setup.cd_scale
        CL = CL * setup.cl_scale
    else:
        V = ground_speed
        S = setup.ball.radius_m * Y[6] / np.maximum(V, 1e-9)
        Re = CD = CL = np.zeros_like(t)
    return {"t_s": t, "x_m": Y[0], "lateral_m": -Y[1] + 0.0, "z_m": Y[2], "speed_m_s": ground_speed,
            "air_speed_m_s": V, "spin_rpm": Y[6] / RPM_RAD_S, "spin_parameter": S,
            "reynolds": Re, "cd": CD, "cl": CL}


#: Largest check distance accepted (beyond any ball's carry). [m]
MAX_CHECK_DISTANCE_M = 1000.0


def at_distance(knots, distance_m: float) -> dict | None:
    """Where a flight is when it first crosses the downrange distance ``distance_m``.

    Parameters
    ----------
    knots : tuple
        ``(t, Y, F)`` step knots of one flight (``BatchResult.records``), in flight order.
    distance_m : float
        Downrange distance of the check (a wall, a net, a goal line). [m]

    Returns
    -------
    dict or None
        ``distance_m``, ``height_m``, ``lateral_m`` (right +), ``time_s``, ``speed_m_s`` (over the
        ground); None when the ball lands (or stops) before it gets there.

    Notes
    -----
    The step whose downrange distance brackets D is found, and the crossing inside it by
    bisection on the same cubic Hermite interpolant the charts use (x is monotonic within a step
    of a ball moving downrange; 50 halvings fix the time far below the step's error).
    """
    d = check_number("check distance", distance_m, "m", low=0.0, high=MAX_CHECK_DISTANCE_M, low_inclusive=False)
    T, Yk, Fk = knots
    if T.size < 2:
        return None
    after = np.flatnonzero((Yk[0, :-1] < d) & (Yk[0, 1:] >= d))
    if not after.size:
        return None
    k = int(after[0])
    lo, hi = T[k], T[k + 1]
    for _ in range(50):
        mid = 0.5 * (lo + hi)
        x = _hermite(T[k], T[k + 1], Yk[0, k], Yk[0, k + 1], Fk[0, k], Fk[0, k + 1], mid)
        lo, hi = (mid, hi) if x < d else (lo, mid)
    t = 0.5 * (lo + hi)
    Y = _hermite(T[k], T[k + 1], Yk[:, k], Yk[:, k + 1], Fk[:, k], Fk[:, k + 1], t)
    return {"distance_m": d, "height_m": float(Y[2]), "lateral_m": float(-Y[1]) + 0.0, "time_s": float(t),
            "speed_m_s": float(np.sqrt(Y[3] ** 2 + Y[4] ** 2 + Y[5] ** 2))}


def _after_landing(setup: FlightSetup, launch: Launch, res: BatchResult, ground_key: str):
    """(run-out dict, path of the flight after the first bounce or None) for one landed flight."""
    from liftcore import bounce as bo

    T, Yk, _ = res.records[0]
    state = Yk[:, -1]
    axis = launch_vectors(launch)[1][:, 0]
    v_t, v_n, w_b, heading = bo.landing_components(state, axis)
    r, k = setup.ball.radius_m, bo.inertia_factor(setup.ball.key)
    g = bo.ground(ground_key)
    run = bo.run_out(v_t, v_n, r * w_b, g, k, setup.gravity_m_s2)
    vt1, vn1, rw1 = run["bounces"][0]
    end = state[:2] + run["distance_m"] * heading[:2]
    first = {"speed_after_m_s": math.hypot(vt1, vn1), "angle_after_deg": math.degrees(math.atan2(vn1, vt1)),
             "spin_after_rpm": rw1 / r / RPM_RAD_S, "speed_before_m_s": math.hypot(v_t, v_n),
             "spin_before_rpm": w_b / RPM_RAD_S}
    court = ground_key == "hard_court"  # a court ball leaves the court after its bounce: no rest point
    out = {"ground": ground_key, "total_m": None if court else float(end[0]),
           "lateral_total_m": None if court else float(-end[1]) + 0.0,
           "roll_m": None if court else float(end[0] - state[0]), "bounces": len(run["bounces"]),
           "bounce": first, "time_to_rest_s": None if court else run["time_s"]}
    after = None
    if ground_key == "hard_court" and vn1 > bo.MIN_HOP_M_S:
        # the arc after the first bounce, flown with the full air model (sidespin not kept)
        az = -math.degrees(math.atan2(heading[1], heading[0]))
        la = Launch(first["speed_after_m_s"], first["angle_after_deg"], az, abs(first["spin_after_rpm"]),
                    0.0 if rw1 >= 0 else 180.0, 0.0, 0.0)
        second = simulate(setup, la, record=True)
        t2, y2, f2 = second.records[0]
        y2 = y2.copy()
        y2[0] += state[0]
        y2[1] += state[1]
        after = _sample_path(setup, (t2 + T[-1], y2, f2), n_samples=80)
    return out, after


def fly(setup: FlightSetup, launch: Launch, label: str = "Flight", check_distance_m: float | None = None,
        ground_key: str | None = None, **kw) -> Flight:
    """One flight with its sampled path and warnings (see :func:`flight_warnings`); with
    ``check_distance_m``, where it crosses that distance (:func:`at_distance`) in ``at_check``;
    with ``ground_key`` (:data:`liftcore.bounce.GROUNDS`), the bounces and roll to rest in
    ``run_out`` (and, on a hard court, the arc after the first bounce in the path)."""
    launch.validate()
    res = simulate(setup, launch, record=True, **kw)
    path = _sample_path(setup, res.records[0])
    check = at_distance(res.records[0], check_distance_m) if check_distance_m else None
    run = None
    if ground_key and bool(res.landed[0]):
        run, after = _after_landing(setup, launch, res, ground_key)
        if after is not None:
            path = {k: np.concatenate([path[k], after[k]]) for k in path}
    return Flight(label=label, carry_m=float(res.carry_m[0]), peak_height_m=float(res.peak_height_m[0]),
                  flight_time_s=float(res.flight_time_s[0]), lateral_m=float(res.lateral_m[0]),
                  descent_angle_deg=float(res.descent_angle_deg[0]),
                  landing_speed_m_s=float(res.landing_speed_m_s[0]),
                  landing_spin_rpm=float(res.landing_spin_rpm[0]), landed=bool(res.landed[0]),
                  path=path, warnings=flight_warnings(setup, res, launch),
                  ball_key=setup.ball.key, model_key=setup.model_key,
                  density_kg_m3=setup.density_kg_m3, at_check=check, run_out=run)


# ----------------------------------------------------------------------------- warnings
def flight_warnings(setup: FlightSetup, res: BatchResult, launch: Launch | None = None,
                    subject_prefix: str = "") -> tuple[ModelWarning, ...]:
    """Validity warnings for a batch: S and Re outside the model's range, drag crisis, Mach > 0.3,
    spin decay borrowed from another ball, seams, flights that never landed."""
    m = setup.model
    b = setup.ball
    ws: list[ModelWarning] = []
    mark = " (model from memory)" if m.from_memory else ""
    if setup.density_kg_m3 > 0 and np.isfinite(res.s_min).any():
        smin, smax = float(np.nanmin(res.s_min)), float(np.nanmax(res.s_max))
        remin, remax = float(np.nanmin(res.re_min)), float(np.nanmax(res.re_max))
        lo, hi = m.s_range
        spinning = launch is None or np.any(launch.arrays()["spin_rpm"] > 0)
        if spinning and m.key != "constant" and (smin < lo or smax > hi):
            ws.append(ModelWarning(
                "spin_parameter_outside_model",
                f"spin parameter S {smin:.3g} to {smax:.3g} leaves the range {lo:.3g} to {hi:.3g} "
                f"of {m.title}{mark}: lift is extrapolated", "carry_m"))
        lo, hi = m.re_range
        if m.key != "constant" and (remin < lo or remax > hi):
            ws.append(ModelWarning(
                "reynolds_outside_model",
                f"Reynolds number {remin:.3g} to {remax:.3g} leaves the range {lo:.3g} to {hi:.3g} "
                f"of {m.title}{mark}: drag and lift are extrapolated", "carry_m"))
        if m.crisis_re is not None:
            c0, c1 = m.crisis_re
            if remax >= c0 and remin <= c1:
                ws.append(ModelWarning(
                    "drag_crisis_region",
                    f"the flight passes through the drag-crisis region (Re {c0:.3g} to {c1:.3g}): "
                    "drag changes steeply there and depends on surface details, so carry is "
                    "uncertain", "carry_m"))
        mach = float(np.nanmax(res.speed_rel_max_m_s)) / setup.speed_of_sound_m_s
        if mach > MACH_INCOMPRESSIBLE_LIMIT:
            ws.append(ModelWarning(
                "mach_above_0_3", f"Mach number {mach:.2f} exceeds {MACH_INCOMPRESSIBLE_LIMIT} "
                "(common practice): compressibility is not modelled", "landing_speed_m_s"))
        if setup.spin_decay and not b.spin_decay_measured:
            ws.append(ModelWarning(
                "spin_decay_extrapolated",
                f"spin decay for the {b.name.lower()} is {b.spin_decay_source}: the spin along the "
                "flight is extrapolated", "lateral_m"))
    if b.seams:
        ws.append(ModelWarning(
            "seam_effects_not_modelled",
            "seam and panel effects (side forces from the seam orientation, swing, knuckling) are "
            "not modelled", "lateral_m"))
    if m.from_memory and setup.density_kg_m3 > 0:
        ws.append(ModelWarning(
            "coefficients_from_memory",
            f"{m.title}: {m.note}", ""))
    if res.stalled:
        ws.append(ModelWarning("flight_stopped_unfinished",
                               f"{res.stalled} flight(s) stopped unfinished after {MAX_STEPS:,} integration "
                               "steps (the ball loops on a small circle: its lift is far above its "
                               "weight, an unphysical mix of mass, size and coefficients): results are "
                               "not landings", "carry_m", "invalid"))
    late = int(np.sum(~res.landed)) - res.stalled
    if late > 0:
        ws.append(ModelWarning("did_not_land", f"{late} flight(s) still in the air after {T_MAX_S:.0f} s: "
                               "results are not landings", "carry_m", "invalid"))
    return merge(ws)


# ----------------------------------------------------------------------------- sweeps
SWEEP_INPUTS = {
    "speed_m_s": ("Launch speed", "ball_speed", 0.0, 200.0),
    "elevation_deg": ("Elevation", "angle", -90.0, 90.0),
    "azimuth_deg": ("Azimuth (right +)", "angle", -180.0, 180.0),
    "spin_rpm": ("Spin rate", "rotation", 0.0, 30000.0),
    "spin_axis_deg": ("Spin-axis tilt (right +)", "angle", -180.0, 180.0),
    "height_m": ("Launch height", "length", 0.0, 500.0),
}


#: What a launch sweep (and the best-launch search) can map: the landing outputs and, when
#: obstacles are set, the smallest margin over them (positive: clears every one).
MARGIN_OUTPUT = "margin_m"
SWEEP_OUTPUTS = {**OUTPUTS, MARGIN_OUTPUT: ("Smallest margin over the obstacles", "length")}


@dataclass(frozen=True)
class SweepResult:
    x_key: str
    x_values: np.ndarray
    y_key: str
    y_values: np.ndarray
    output: str
    grid: np.ndarray  # (ny, nx)
    best_x: float
    best_y: float
    best_value: float
    maximise: bool
    warnings: tuple = ()
    #: (obstacle name, margin grid (ny, nx)) pairs [m], in the order the ball meets them.
    margins: tuple = ()
    #: The best point was picked among the launches that clear every obstacle.
    best_clears: bool = False

    @property
    def margin_grid(self) -> np.ndarray | None:
        """The smallest margin over every obstacle at each grid point (>= 0: clears them all)."""
        if not self.margins:
            return None
        return np.minimum.reduce([g for _, g in self.margins])

    def clearance_counts(self) -> dict:
        """How many grid points clear each obstacle, and all of them (``"all"``), of ``"points"``."""
        out = {name: int(np.sum(g >= 0)) for name, g in self.margins}
        if self.margins:
            out["all"] = int(np.sum(self.margin_grid >= 0))
        out["points"] = int(self.grid.size)
        return out


def _with(launch: Launch, **changes) -> Launch:
    return replace(launch, **changes)


def _check_output(output: str, obstacles) -> None:
    check_choice("output", output, SWEEP_OUTPUTS)
    if output == MARGIN_OUTPUT and not obstacles:
        raise InputError("output", "the smallest margin over the obstacles needs an obstacle: choose one "
                                   "('Does it clear?' on the page, --obstacle on the command line) or map "
                                   "another result")


def _batch(setup: FlightSetup, launch: Launch, output: str, obstacles=(), progress=None):
    """(values of ``output``, {obstacle: margins}, smallest margin or None, BatchResult) of one
    batch of flights."""
    from liftcore.obstacles import batch_margins, gate_distances

    res = simulate(setup, launch, progress=progress, gates=gate_distances(obstacles))
    margins = batch_margins(obstacles, res) if obstacles else {}
    smallest = np.minimum.reduce(list(margins.values())) if margins else None
    return (smallest if output == MARGIN_OUTPUT else res.output(output)), margins, smallest, res


def sweep(setup: FlightSetup, base: Launch, x_key: str, x_values, y_key: str, y_values,
          output: str = "carry_m", maximise: bool = True, progress=None, obstacles=(),
          must_clear: bool = False) -> SweepResult:
    """``output`` over a grid of two launch inputs, all flights in one batch; best point marked.

    Parameters
    ----------
    setup : FlightSetup
    base : Launch
        The launch every grid point starts from (its two swept inputs replaced).
    x_key, y_key : str
        Two different keys of :data:`SWEEP_INPUTS`.
    x_values, y_values : array_like
        Grid values in core units (2 or more each, at most 40,000 points in all).
    output : str
        A key of :data:`SWEEP_OUTPUTS` (``margin_m`` only with obstacles).
    maximise : bool
        Whether the best point is the highest (else the lowest) value.
    obstacles : sequence of liftcore.obstacles.Obstacle
        Walls, goals and landing areas: every grid point's margin over each is kept in
        ``margins`` (crossings found in the batch, :func:`simulate` ``gates``).
    must_clear : bool
        The best point is the best of the points that clear every obstacle (of all points when
        none does).

    Returns
    -------
    SweepResult
        The grid (ny, nx) of ``output``, the best grid point and the margins.
    """
    check_choice("sweep input", x_key, SWEEP_INPUTS)
    check_choice("sweep input", y_key, SWEEP_INPUTS)
    _check_output(output, obstacles)
    if x_key == y_key:
        raise InputError("sweep input", f"the two sweep inputs must differ (both are {x_key!r})")
    xv = np.asarray(x_values, dtype=float)
    yv = np.asarray(y_values, dtype=float)
    if xv.size < 2 or yv.size < 2 or xv.size * yv.size > 40000:
        raise InputError("grid size", f"sweep grid must have 2 to 200 points per input and at most "
                                      f"40000 in all (got {xv.size} x {yv.size})")
    X, Yg = np.meshgrid(xv, yv)
    launch = _with(base, **{x_key: X.ravel(), y_key: Yg.ravel()}).validate()
    flat, margins, smallest, res = _batch(setup, launch, output, obstacles, progress)
    vals = flat.reshape(Yg.shape)
    score = np.where(np.isfinite(vals), vals if maximise else -vals, -np.inf)
    best_clears = False
    if must_clear and smallest is not None:
        clear = smallest.reshape(Yg.shape) >= 0
        if clear.any():
            score = np.where(clear, score, -np.inf)
            best_clears = True
    i = int(np.argmax(score))
    iy, ix = np.unravel_index(i, vals.shape)
    return SweepResult(x_key, xv, y_key, yv, output, vals, float(xv[ix]), float(yv[iy]),
                       float(vals[iy, ix]), maximise, flight_warnings(setup, res, launch),
                       tuple((name, m.reshape(Yg.shape)) for name, m in margins.items()), best_clears)


@dataclass(frozen=True)
class OptimumResult:
    keys: tuple
    values: tuple
    output: str
    best_value: float
    maximise: bool
    evaluations: int
    success: bool
    message: str
    start_value: float


def best_launch(setup: FlightSetup, base: Launch, keys, bounds, output: str = "carry_m",
                maximise: bool = True, start=None, obstacles=(), must_clear: bool = False) -> OptimumResult:
    """Search the launch inputs ``keys`` within ``bounds`` for the best ``output``.

    Parameters
    ----------
    setup : FlightSetup
    base : Launch
    keys : sequence of str
        One to three keys of :data:`SWEEP_INPUTS`.
    bounds : sequence of (float, float)
        Low and high of each key, core units.
    output : str
        A key of :data:`SWEEP_OUTPUTS`.
    maximise : bool
    start : array_like, optional
        Start point (else the best point of a 9-per-input grid).
    obstacles : sequence of liftcore.obstacles.Obstacle
    must_clear : bool
        Only launches that clear every obstacle count (the others score as the worst).

    Returns
    -------
    OptimumResult

    Notes
    -----
    A coarse batched grid picks the start; scipy's bounded Nelder-Mead refines it
    (derivative-free, robust to the small noise of adaptive steps).

    References
    ----------
    .. [1] Nelder, J. A. & Mead, R. (1965), A simplex method for function minimization,
       Comput. J. 7, 308-313 (scipy.optimize.minimize, method "Nelder-Mead", with bounds).
    """
    from scipy.optimize import minimize

    keys = tuple(keys)
    for k in keys:
        check_choice("search input", k, SWEEP_INPUTS)
    _check_output(output, obstacles)
    if not 1 <= len(keys) <= 3:
        raise InputError("search inputs", f"search 1 to 3 inputs (got {len(keys)})")
    bnds = [(float(lo), float(hi)) for lo, hi in bounds]
    for k, (lo, hi) in zip(keys, bnds):
        if not lo < hi:
            raise InputError(k, f"search range for {SWEEP_INPUTS[k][0]} must have low < high (got {lo} to {hi})")
    sign = -1.0 if maximise else 1.0
    evals = 0

    def f_batch(points):
        nonlocal evals
        pts = np.atleast_2d(points)
        evals += pts.shape[0]
        launch = _with(base, **{k: pts[:, i] for i, k in enumerate(keys)})
        v, _, smallest, _ = _batch(setup, launch, output, obstacles)
        good = np.isfinite(v)
        if must_clear and smallest is not None:
            good &= smallest >= 0
        return np.where(good, v, -np.inf if maximise else np.inf)

    if start is None:
        axes = [np.linspace(lo, hi, 9) for lo, hi in bnds]
        mesh = np.stack([g.ravel() for g in np.meshgrid(*axes, indexing="ij")], axis=1)
        v = f_batch(mesh)
        i = int(np.argmax(v) if maximise else np.argmin(v))
        x0 = mesh[i]
        v0 = float(v[i])
    else:
        x0 = np.asarray(start, dtype=float)
        v0 = float(f_batch(x0)[0])
    span = np.array([hi - lo for lo, hi in bnds])
    # start simplex: 5 % of each range from the grid's best point, stepping inward at an upper bound
    simplex = [x0]
    for i in range(len(x0)):
        step = 0.05 * span[i] * (1.0 if x0[i] + 0.05 * span[i] <= bnds[i][1] else -1.0)
        simplex.append(x0 + np.eye(len(x0))[i] * step)
    res = minimize(lambda x: sign * float(f_batch(x)[0]), x0, method="Nelder-Mead", bounds=bnds,
                   options={"xatol": 1e-4 * float(span.min()), "fatol": 1e-6, "maxfev": 400,
                            "initial_simplex": np.vstack(simplex)})
    best = sign * float(res.fun)
    if (maximise and best < v0) or (not maximise and best > v0):
        return OptimumResult(keys, tuple(float(v) for v in x0), output, v0, maximise, evals, True,
                             "grid start was best", v0)
    return OptimumResult(keys, tuple(float(v) for v in res.x), output, best, maximise, evals,
                         bool(res.success), str(res.message), v0)


# ----------------------------------------------------------------------------- dispersion
DISPERSION_FIELDS = ("speed_m_s", "elevation_deg", "azimuth_deg", "spin_rpm", "spin_axis_deg")


@dataclass(frozen=True)
class DispersionResult:
    n: int
    seed: int
    carry_m: np.ndarray
    lateral_m: np.ndarray
    flight_time_s: np.ndarray
    landed: np.ndarray
    carry_percentiles_m: dict
    lateral_percentiles_m: dict
    lateral_sd_m: float
    carry_sd_m: float
    mean_m: tuple
    covariance_m2: np.ndarray
    ellipse_95: dict
    draws: dict
    warnings: tuple = ()

    def summary(self) -> dict:
        p = self.carry_percentiles_m
        return {"n": self.n, "carry_m_p05": p[5], "carry_m_p50": p[50], "carry_m_p95": p[95],
                "lateral_m_sd": self.lateral_sd_m}


def confidence_ellipse(x, y, chi2: float = CHI2_2DOF_95) -> dict:
    """Ellipse of a bivariate normal fit to (x, y): centre, semi-axes, angle and outline points.

    The semi-axes are sqrt(chi2 * eigenvalues) of the sample covariance; with chi2 = 5.991 the
    ellipse holds 95 % of a normal population (analytic).
    """
    x = np.asarray(x, float)
    y = np.asarray(y, float)
    cov = np.cov(np.vstack([x, y]))
    vals, vecs = np.linalg.eigh(cov)
    vals = np.maximum(vals, 0.0)
    a, b = np.sqrt(chi2 * vals[::-1])
    major = vecs[:, 1]
    ang = math.atan2(major[1], major[0])
    th = np.linspace(0, 2 * math.pi, 121)
    ex = x.mean() + a * np.cos(th) * math.cos(ang) - b * np.sin(th) * math.sin(ang)
    ey = y.mean() + a * np.cos(th) * math.sin(ang) + b * np.sin(th) * math.cos(ang)
    return {"centre": (float(x.mean()), float(y.mean())), "semi_major": float(a),
            "semi_minor": float(b), "angle_deg": math.degrees(ang), "x": ex, "y": ey,
            "covariance": cov}


def dispersion(setup: FlightSetup, base: Launch, sd: dict, n: int = 1000, seed: int = 1,
               progress: Callable | None = None, chunk: int = 5000) -> DispersionResult:
    """Landing spread of ``n`` flights whose launch inputs are drawn from normal distributions.

    ``sd`` maps launch fields (:data:`DISPERSION_FIELDS`) to standard deviations in the same
    units as the field. Draws are seeded (numpy PCG64) so a run repeats exactly. Speeds and spin
    rates drawn below zero are clipped to zero; elevations to -90..90.
    """
    n = int(check_number("number of flights", n, "", low=2, high=200000))
    seed = int(check_number("seed", seed, "", low=0, high=2 ** 32 - 1))
    for k, v in sd.items():
        check_choice("spread input", k, DISPERSION_FIELDS)
        check_number(f"spread of {k}", v, "", low=0.0, high=1e4)
    rng = np.random.default_rng(seed)
    base_a = base.arrays()
    draws = {}
    for k in DISPERSION_FIELDS:
        centre = float(base_a[k][0])
        s = float(sd.get(k, 0.0))
        draws[k] = centre + s * rng.standard_normal(n) if s > 0 else np.full(n, centre)
    draws["speed_m_s"] = np.maximum(draws["speed_m_s"], 0.0)
    draws["spin_rpm"] = np.maximum(draws["spin_rpm"], 0.0)
    draws["elevation_deg"] = np.clip(draws["elevation_deg"], -90.0, 90.0)
    carry = np.empty(n)
    lat = np.empty(n)
    tt = np.empty(n)
    landed = np.empty(n, dtype=bool)
    ws = []
    for start in range(0, n, chunk):
        stop = min(n, start + chunk)
        launch = _with(base, **{k: v[start:stop] for k, v in draws.items()})
        launch = _with(launch, rifle_deg=np.full(stop - start, float(base_a["rifle_deg"][0])),
                       height_m=np.full(stop - start, float(base_a["height_m"][0])))

        def sub(frac, text="", _s=start, _e=stop):
            if progress is not None:
                progress((_s + frac * (_e - _s)) / n, f"flying {n:,} balls")

        r = simulate(setup, launch, progress=sub if progress is not None else None)
        carry[start:stop], lat[start:stop], tt[start:stop] = r.carry_m, r.lateral_m, r.flight_time_s
        landed[start:stop] = r.landed
        ws.append(flight_warnings(setup, r, launch))
        if progress is not None:
            progress(stop / n, f"flown {stop:,} of {n:,}")
    pct = (5, 25, 50, 75, 95)
    cp = {p: float(v) for p, v in zip(pct, np.percentile(carry, pct))}
    lp = {p: float(v) for p, v in zip(pct, np.percentile(lat, pct))}
    ell = confidence_ellipse(carry, lat)
    return DispersionResult(n, seed, carry, lat, tt, landed, cp, lp, float(np.std(lat, ddof=1)),
                            float(np.std(carry, ddof=1)), (float(carry.mean()), float(lat.mean())),
                            ell["covariance"], ell, draws, merge(*ws))


# ----------------------------------------------------------------------------- tracked flights
TRACK_COLUMNS = ("flight", "t", "x", "y", "z")
MAX_TRACK_ROWS = 20000
#: Bounds of tracked observations: positions [m] (further than any ball flies), times [s], the
#: shortest time between two observations of a flight [s] (faster than any tracker samples; it
#: also bounds the fit's integration, whose fixed step covers each flight's span).
TRACK_POSITION_LIMIT_M = 2000.0
TRACK_TIME_LIMIT_S = 86400.0
MIN_TRACK_STEP_S = 1e-4
#: Largest launch speed component the track fit may try. [m/s]
FIT_SPEED_LIMIT_M_S = 200.0
#: Range of the fitted coefficients: CD (or its scale), CL (or its scale); in the curve mode
#: CD at no spin, its rise per unit S, the lift slope and the lift's level. [-]
FIT_BOUNDS = ((0.0, 5.0), (-3.0, 5.0))
CURVE_BOUNDS = ((0.0, 2.0), (-2.0, 5.0), (0.0, 20.0), (0.01, 3.0))
CURVE_NAMES = ("CD at no spin", "CD rise per unit S", "CL slope at S = 0", "CL level")
#: RMS miss of the fitted flights above which the fit is warned about. [m]
FIT_RMS_WARN_M = 1.0
FIT_MODES = ("constant", "scale", "curve")


def read_tracks(source) -> "pd.DataFrame":
    """Read and check tracked positions (CSV path, file-like or DataFrame).

    Format (our own): a header row ``flight,t,x,y,z`` then one row per observation, SI units:
    ``flight`` a label (text or number) grouping rows of one flight; ``t`` time since the first
    observation of that flight [s]; ``x`` downrange, ``y`` drift to the RIGHT, ``z`` height
    above the ground [m]. Lines starting with ``#`` are comments. At least 6 rows per flight,
    times strictly increasing within a flight, at least 1e-4 s apart and spanning at most
    60 s, positions within 2 km, at most 20 000 rows.
    """
    import pandas as pd

    if isinstance(source, pd.DataFrame):
        df = source.copy()
    else:
        if isinstance(source, (str, Path)):
            from liftcore.files import read_bytes  # regular files only, the cap applied while reading

            source = io.BytesIO(read_bytes(source, "tracks file"))
        try:
            df = pd.read_csv(source, comment="#", skipinitialspace=True)
        except Exception as exc:  # pandas raises several types for malformed text
            raise InputError("tracks file", f"tracks file is not readable CSV ({exc.__class__.__name__}: "
                                            f"{str(exc).splitlines()[0] if str(exc) else ''})") from None
    df.columns = [str(c).strip().lower() for c in df.columns]
    missing = [c for c in TRACK_COLUMNS if c not in df.columns]
    if missing:
        raise InputError("tracks file", f"tracks file needs the columns {', '.join(TRACK_COLUMNS)} "
                                        f"(missing: {', '.join(missing)})")
    if len(df) == 0:
        raise InputError("tracks file", "tracks file has no data rows under the header "
                                        f"{','.join(TRACK_COLUMNS)}; it needs at least 6 rows per flight")
    if len(df) > MAX_TRACK_ROWS:
        raise InputError("tracks file", f"tracks file must have at most {MAX_TRACK_ROWS} rows (got {len(df)})")
    df = df[list(TRACK_COLUMNS)].copy()
    df["flight"] = df["flight"].astype(str)
    for c in ("t", "x", "y", "z"):
        vals = pd.to_numeric(df[c], errors="coerce")
        bad = ~np.isfinite(vals.to_numpy(dtype=float))
        if bad.any():
            i = int(np.flatnonzero(bad)[0])
            raise InputError("tracks file", f"tracks file column {c} row {i + 1} must be a finite number "
                                            f"(got {df[c].iloc[i]!r})")
        limit = TRACK_TIME_LIMIT_S if c == "t" else TRACK_POSITION_LIMIT_M
        big = np.flatnonzero(np.abs(vals.to_numpy(dtype=float)) > limit)
        if big.size:
            i = int(big[0])
            unit = "s" if c == "t" else "m"
            raise InputError("tracks file", f"tracks file column {c} row {i + 1} is {float(vals.iloc[i]):.6g} {unit}; "
                                            f"{c} must be between {-limit:g} and {limit:g} {unit}")
        df[c] = vals.astype(float)
    for name, g in df.groupby("flight", sort=False):
        label = echo(name)
        if len(g) < 6:
            raise InputError("tracks file", f"flight {label} has {len(g)} rows; at least 6 are needed")
        steps = np.diff(g["t"].to_numpy())
        if np.any(steps <= 0):
            raise InputError("tracks file", f"flight {label}: times must increase strictly")
        if steps.min() < MIN_TRACK_STEP_S:
            raise InputError("tracks file", f"flight {label}: observations {steps.min():.3g} s apart; at least "
                                            f"{MIN_TRACK_STEP_S:g} s are needed (is t in seconds?)")
        span = float(g["t"].iloc[-1] - g["t"].iloc[0])
        if span > T_MAX_S:
            raise InputError("tracks file", f"flight {label} spans {span:.6g} s; a tracked flight may span at most "
                                            f"{T_MAX_S:g} s (is t in seconds?)")
    if df["flight"].nunique() > 20:
        raise InputError("tracks file", f"at most 20 flights per file (got {df['flight'].nunique()})")
    return df.reset_index(drop=True)


@dataclass(frozen=True)
class FitResult:
    mode: str
    names: tuple
    values: np.ndarray
    sd: np.ndarray
    rms_m: float
    residuals: "pd.DataFrame"
    fitted: "pd.DataFrame"
    flights: tuple
    cost: float
    success: bool
    message: str
    nfev: int
    dof: int

    def parameter(self, name: str) -> tuple[float, float]:
        i = self.names.index(name)
        return float(self.values[i]), float(self.sd[i])

    def table(self) -> "pd.DataFrame":
        import pandas as pd

        return pd.DataFrame({"parameter": self.names, "value": self.values, "sd": self.sd})

    @property
    def coefficient_count(self) -> int:
        """How many of :attr:`names` are coefficients (the rest are launch states)."""
        return 4 if self.mode == "curve" else 2

    def curve_table(self, s_max: float = 0.6, points: int = 13) -> str:
        """The fitted curves as an aerodynamic table (CSV text S, CD, CL) to fly again with
        :func:`liftcore.balls.table_model`; only for the ``curve`` mode."""
        if self.mode != "curve":
            raise ValueError("only curve fits give a table (constants and scales are numbers)")
        S = np.linspace(0.0, s_max, points)
        cd, cl = curve_coefficients(S, *self.values[:4])
        return "S,CD,CL\n" + "".join(f"{a:.4g},{b:.5g},{c:.5g}\n" for a, b, c in zip(S, cd, cl))

    def warnings(self) -> tuple:
        """What makes the fitted values doubtful: a search that stopped before it converged, a
        coefficient held at its bound, or positions missed by more than :data:`FIT_RMS_WARN_M`."""
        out = []
        if not self.success:
            out.append(ModelWarning("fit_not_converged", f"the fit stopped before it converged after "
                                    f"{self.nfev} evaluations ({self.message.rstrip('.')}): the values "
                                    "are the last tried, not a best fit", "", "invalid"))
        for i, (low, high) in enumerate(CURVE_BOUNDS if self.mode == "curve" else FIT_BOUNDS):
            v = float(self.values[i])
            if math.isclose(v, low, abs_tol=1e-6) or math.isclose(v, high, abs_tol=1e-6):
                out.append(ModelWarning("fit_at_bound", f"{self.names[i]} ended at its bound {v:g} "
                                        f"(allowed {low:g} to {high:g}): the tracks do not fix it", ""))
        if self.rms_m > FIT_RMS_WARN_M:
            out.append(ModelWarning("fit_misses_tracks", f"the fitted flights miss the tracked positions by "
                                    f"{self.rms_m:.3g} m RMS: look for outliers, a wrong spin or "
                                    "positions not in metres", ""))
        return tuple(out)


def _initial_state_guess(g):
    t = g["t"].to_numpy()
    P = g[["x", "y", "z"]].to_numpy()
    k = min(len(t), 8)
    tt = t[:k] - t[0]
    out = []
    for c in range(3):
        coef = np.polyfit(tt, P[:k, c], 2)
        out.append((coef[2], coef[1]))
    return np.array([o[0] for o in out] + [o[1] for o in out])


def fit_tracks(setup: FlightSetup, tracks, spin_rpm: float, spin_axis_deg: float = 0.0,
               rifle_deg: float = 0.0, mode: str = "constant", dt: float = 0.004) -> FitResult:
    """Fit drag and lift, and each flight's launch state, to tracked positions by least squares.

    Parameters
    ----------
    setup : FlightSetup
        Ball, air and wind. In ``mode="scale"`` the fitted factors multiply ``setup.model``'s
        CD and CL; in ``mode="constant"`` CD and CL are constants.
    tracks : DataFrame
        From :func:`read_tracks`.
    spin_rpm, spin_axis_deg, rifle_deg : float
        Spin at the first observation, the same for every flight (not fitted).

    Notes
    -----
    Unknowns: CD (or its scale), CL (or its scale), and per flight the position and velocity at
    its first observation (6 each). Residuals are model minus observed positions (3 per row).
    Flights are integrated together with fixed-step RK4 (smooth in the parameters), and the
    Jacobian by forward differences is evaluated in one batch of perturbed copies. Parameter
    standard deviations from cov = s^2 (J^T J)^-1, s^2 = SSR / (m - p).
    """
    from scipy.optimize import least_squares
    import pandas as pd

    check_choice("fit mode", mode, FIT_MODES)
    df = read_tracks(tracks)
    groups = [(str(k), g.sort_values("t")) for k, g in df.groupby("flight", sort=False)]
    nf = len(groups)
    bounds = FIT_BOUNDS
    if mode == "constant":
        setup = replace(setup, model_key="constant", aero_table=None)
        names = ["CD", "CL"]
        p0 = [0.35, 0.2]
    elif mode == "curve":
        names = list(CURVE_NAMES)
        p0 = [0.3, 0.1, 1.5, 0.3]
        bounds = CURVE_BOUNDS
    else:
        names = ["CD scale", "CL scale"]
        p0 = [1.0, 1.0]
    nc = len(names)  # coefficient parameters before each flight's six launch-state ones
    t0s = [float(g["t"].iloc[0]) for _, g in groups]
    obs_t = [g["t"].to_numpy() - t0 for (_, g), t0 in zip(groups, t0s)]
    obs_p = [np.column_stack([g["x"].to_numpy(), -g["y"].to_numpy(), g["z"].to_numpy()])
             for _, g in groups]
    t_end = max(float(t[-1]) for t in obs_t) + dt
    x0 = list(p0)
    for (_, g) in groups:
        x0.extend(_initial_state_guess(g.assign(y=-g["y"])))
    x0 = np.asarray(x0, dtype=float)
    w0 = spin_rpm * RPM_RAD_S
    # spin axis from the tilt about each flight's initial direction, as in launch_vectors
    sizes = [len(t) for t in obs_t]
    m_obs = 3 * sum(sizes)
    p = x0.size
    if m_obs <= p:
        raise InputError("tracks file", f"{m_obs} position values cannot fit {p} unknowns; add observations")

    def unpack(theta_cols):
        """theta_cols (p, k) -> Launch-free arrays for k copies of every flight."""
        k = theta_cols.shape[1]
        Y0 = np.empty((7, nf * k))
        axis = np.empty((3, nf * k))
        coefs = [np.tile(theta_cols[i][:, None], (1, nf)).ravel() for i in range(nc)]
        for j in range(nf):
            st = theta_cols[nc + 6 * j: nc + 6 + 6 * j]  # (6, k)
            cols = np.arange(k) * nf + j
            Y0[0:3, cols] = st[0:3]
            Y0[3:6, cols] = st[3:6]
            Y0[6, cols] = w0
            v = st[3:6]
            sp = np.linalg.norm(v, axis=0)
            el = np.degrees(np.arcsin(np.clip(v[2] / np.maximum(sp, 1e-9), -1, 1)))
            az = np.degrees(np.arctan2(-v[1], v[0]))
            _, ax = launch_vectors(Launch(sp, el, az, spin_rpm, spin_axis_deg, rifle_deg, 0.0))
            axis[:, cols] = ax
        return Y0, axis, coefs

    rhs = _CurveRhs(setup) if mode == "curve" else _Rhs(setup)

    def model_positions(theta_cols):
        Y0, axis, coefs = unpack(theta_cols)
        n = Y0.shape[1]
        if mode == "curve":  # scales 1; the curves' parameters in rows 8-11
            P = np.vstack([_params(setup, axis, n, np.ones(n), np.ones(n)), np.vstack(coefs)])
        else:
            P = _params(setup, axis, n, coefs[0], coefs[1])
        tg, Ys, Fs = _rk4_grid(rhs, Y0, P, t_end, dt)
        k = theta_cols.shape[1]
        out = np.empty((m_obs, k))
        for c in range(k):
            rows = []
            for j in range(nf):
                S = states_at(tg, Ys, Fs, c * nf + j, obs_t[j])
                rows.append(S[0:3].T.ravel())
            out[:, c] = np.concatenate(rows)
        return out

    target = np.concatenate([P_.ravel() for P_ in obs_p])

    def fun(theta):
        return model_positions(theta[:, None])[:, 0] - target

    def jac(theta):
        steps = 1e-6 * np.maximum(np.abs(theta), 1e-2)
        cols = np.tile(theta[:, None], (1, p + 1))
        cols[np.arange(p), np.arange(1, p + 1)] += steps
        pos = model_positions(cols)
        return (pos[:, 1:] - pos[:, [0]]) / steps

    # Bounds: the coefficients within what any ball shows, each flight's first position within the
    # tracks' limit and its velocity within the launch speeds the product accepts (an outlier
    # cannot send the search to speeds that overflow the integration).
    state_hi = np.array([TRACK_POSITION_LIMIT_M] * 3 + [FIT_SPEED_LIMIT_M_S] * 3)
    lo = np.concatenate([[b[0] for b in bounds], np.tile(-state_hi, nf)])
    hi = np.concatenate([[b[1] for b in bounds], np.tile(state_hi, nf)])
    x0 = np.clip(x0, lo, hi)
    sol = least_squares(fun, x0, jac=jac, bounds=(lo, hi), method="trf", x_scale="jac",
                        max_nfev=60)
    r = sol.fun
    dof = m_obs - p
    s2 = float(r @ r) / dof
    J = sol.jac
    try:
        cov = np.linalg.inv(J.T @ J) * s2
        sd = np.sqrt(np.maximum(np.diag(cov), 0.0))
    except np.linalg.LinAlgError:
        sd = np.full(p, np.nan)
    all_names = list(names)
    for fname, _ in groups:
        all_names += [f"{fname}: {s}" for s in ("x0 [m]", "y0 (right +) [m]", "z0 [m]",
                                                  "vx0 [m/s]", "vy0 (right +) [m/s]", "vz0 [m/s]")]
    vals = sol.x.copy()
    # report lateral quantities right positive
    for j in range(nf):
        vals[nc + 6 * j + 1] *= -1.0  # y0
        vals[nc + 6 * j + 4] *= -1.0  # vy0
    res_rows, fit_rows = [], []
    model_pos = (r + target).reshape(-1, 3)
    rr = r.reshape(-1, 3)
    start = 0
    for (fname, g), tt, ts in zip(groups, obs_t, t0s):
        k = len(tt)
        mp = model_pos[start:start + k]
        rj = rr[start:start + k]
        res_rows.append(pd.DataFrame({"flight": fname, "t": tt + ts, "dx": rj[:, 0], "dy": -rj[:, 1],
                                      "dz": rj[:, 2], "distance": np.linalg.norm(rj, axis=1)}))
        fit_rows.append(pd.DataFrame({"flight": fname, "t": tt + ts, "x": mp[:, 0], "y": -mp[:, 1],
                                      "z": mp[:, 2]}))
        start += k
    return FitResult(mode, tuple(all_names), vals, sd, float(np.sqrt(np.mean(rr ** 2) * 3)),
                     pd.concat(res_rows, ignore_index=True), pd.concat(fit_rows, ignore_index=True),
                     tuple(fname for fname, _ in groups), float(sol.cost), bool(sol.success),
                     str(sol.message), int(sol.nfev), dof)


def make_demo_tracks(setup: FlightSetup, launches: list[Launch], cd: float, cl: float,
                     rate_hz: float = 60.0, duration_s: float = 1.5, noise_m: float = 0.02,
                     seed: int = 7) -> "pd.DataFrame":
    """Invented tracked flights from a known constant-coefficient model plus Gaussian noise.

    Used to make ``liftcore/data/demo_tracks_invented.csv`` and to test that
    :func:`fit_tracks` recovers ``cd`` and ``cl``.
    """
    import pandas as pd

    su = replace(setup, model_key="constant", aero_table=None, cd_scale=cd, cl_scale=cl)
    rng = np.random.default_rng(seed)
    rows = []
    times = np.arange(0.0, duration_s + 1e-9, 1.0 / rate_hz)
    for i, la in enumerate(launches):
        tg, Ys, Fs = simulate_rk4(su, la, duration_s + 0.01, dt=0.002)
        S = states_at(tg, Ys, Fs, 0, times)
        noise = noise_m * rng.standard_normal((3, times.size))
        rows.append(pd.DataFrame({"flight": f"invented-{i + 1}", "t": np.round(times, 6),
                                  "x": np.round(S[0] + noise[0], 4), "y": np.round(-S[1] + noise[1], 4),
                                  "z": np.round(S[2] + noise[2], 4)}))
    return pd.concat(rows, ignore_index=True)


# ----------------------------------------------------------------------------- invented demo tracks
#: How ``liftcore/data/demo_tracks_invented.csv`` was made (invented; regenerate with
#: :func:`write_demo_tracks`): a baseball at sea level (ISA), backspin 1800 rpm, constant
#: CD 0.33 and CL 0.21, three launches, positions at 60 Hz for 1.5 s with 2 cm Gaussian noise.
DEMO_TRACKS = {
    "ball": "baseball", "altitude_m": 0.0, "spin_rpm": 1800.0, "spin_axis_deg": 0.0, "cd": 0.33,
    "cl": 0.21, "rate_hz": 60.0, "duration_s": 1.5, "noise_m": 0.02, "seed": 7,
    "launches": ((36.0, 18.0, -2.0, 1.0), (40.0, 24.0, 0.0, 1.0), (44.0, 30.0, 3.0, 0.9)),
}
DEMO_TRACKS_FILE = "demo_tracks_invented.csv"


def demo_tracks_setup() -> FlightSetup:
    """The setup the invented demo tracks were generated with (constant-coefficient model)."""
    from liftcore.air import air_state

    air = air_state(DEMO_TRACKS["altitude_m"])
    return make_setup(DEMO_TRACKS["ball"], "constant", density_kg_m3=air.density_kg_m3,
                      kinematic_viscosity_m2_s=air.kinematic_viscosity_m2_s,
                      speed_of_sound_m_s=air.speed_of_sound_m_s)


def _demo_launches():
    d = DEMO_TRACKS
    return [Launch(v, el, az, d["spin_rpm"], d["spin_axis_deg"], 0.0, h) for v, el, az, h in d["launches"]]


def write_demo_tracks(path) -> None:
    """Regenerate the invented demo tracks file (header comments say it is invented)."""
    d = DEMO_TRACKS
    df = make_demo_tracks(demo_tracks_setup(), _demo_launches(), d["cd"], d["cl"], d["rate_hz"],
                          d["duration_s"], d["noise_m"], d["seed"])
    head = ("# INVENTED demo data for liftcore (not measurements): tracked positions of three baseball\n"
            "# flights generated from a known model (sea-level ISA air, backspin 1800 rpm, constant\n"
            f"# CD {d['cd']} and CL {d['cl']}) plus 2 cm Gaussian noise. Columns: flight label, t [s],\n"
            "# x downrange [m], y drift to the right [m], z height [m].\n")
    with open(path, "w", encoding="utf-8") as fh:
        fh.write(head)
        df.to_csv(fh, index=False)


def demo_tracks():
    """The invented demo tracks shipped with liftcore, as a checked DataFrame."""
    from pathlib import Path

    return read_tracks(Path(__file__).parent / "data" / DEMO_TRACKS_FILE)
