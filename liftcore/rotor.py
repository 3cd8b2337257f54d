"""Rotor sails (Flettner rotors) on a ship in given wind conditions: forces, spin power, net gain
and the best spin, vectorised over any number of conditions at once.

Conventions
-----------
* Ship axes: x forward, y to starboard, z up from the waterline.
* Wind angles are relative bearings of where the wind comes *from*: 0 = on the bow (head wind),
  +90 deg = from starboard, negative from port (see :mod:`liftcore.wind`).
* Thrust is positive forward; side force positive to starboard; the heeling moment is positive
  when it heels the ship to starboard and is taken about a point ``heel_reference_depth_m`` below
  the waterline (0 = about the waterline); the yaw moment is positive bow to starboard, about
  midships.
* Spin ratio SR = omega R / V_a with V_a the apparent wind at the rotor's mid-height (the
  *operating* spin ratio). The rpm is one value for the whole rotor, so along the span, where the
  true wind grows with height and the ship speed does not, each strip sees its own apparent wind
  and spin ratio SR(z) = omega R / V_a(z).

Model (one evaluator, :func:`_evaluate`, serves every result)
-------------------------------------------------------------
The rotor is cut into ``strips`` horizontal strips of equal height (midpoint rule). Each strip has
the lift and drag of the coefficient set at its own spin ratio, on its own apparent wind:
dL = q(z) D dz CL(SR(z)), dD = q(z) D dz CD(SR(z)), q = 0.5 rho V_a^2. Lift is perpendicular
to the local apparent wind, on the side that gives forward thrust (this fixes the direction of
spin), drag along it:

    thrust = dL |sin b| - dD cos b,     side = -s dL cos b - dD sin b,   s = sign(sin b)

(b the local apparent wind angle). The lift and drag reported are the sums of the strip
magnitudes; the lift and drag coefficients reported are those sums over q(mid-height) D H.

Spin power is P = CP q D H V_a (strip by strip) from the set's power coefficient, or the
skin-friction model (:func:`spin_power_skin_friction`); ``spin_power_model`` chooses which drives
the net gain (the set's CP where it has one, by default) and both are reported. The motors draw
P / electrical efficiency from the ship's electric plant. Net power gain:

    net = thrust x ship speed / propulsive efficiency - P / electrical efficiency

Several rotors: every force and moment of one rotor is multiplied by the number of rotors and by
the interaction factor (an explicit assumption, 1 = no interaction); spin power is not reduced.

Operating rule (:func:`best_operation`): the spin with the largest net gain within the rpm,
motor-power, heeling-moment and spin-ratio limits; where no spin gains more than the smallest
worthwhile gain (default 0), the rotor is stopped, and the still cylinder's drag is counted (in a
head wind a stopped rotor costs power). A rotor is never reported running at a net loss.
"""

from __future__ import annotations

import math
from typing import Any
from dataclasses import dataclass
from functools import cached_property

import numpy as np

from liftcore import coefficients as coef
from liftcore import hull as hull_model
from liftcore import wind
from liftcore.errors import InputError, check_choice, check_number, check_positive
from liftcore.validity import ModelWarning, quantity_warning

#: Rotor states in :class:`Operation`, and their names in JSON.
STOPPED, RUNNING, AT_LIMIT = 0, 1, 2
STATE_NAMES = {STOPPED: "stopped", RUNNING: "running", AT_LIMIT: "at_limit"}

#: Bits of :attr:`Operation.flags` (per condition), for callers that aggregate many conditions.
FLAG_RPM = 1                 # spin limited by (best) or above (fixed) the maximum rpm
FLAG_MOTOR_POWER = 2         # ... by / above the motor power limit
FLAG_HEEL = 4                # ... by / above the heeling-moment limit
FLAG_SPIN_RATIO_LIMIT = 8    # best spin stopped at the highest spin ratio allowed (input or data)
FLAG_SR_OUTSIDE_DATA = 16    # some strip's spin ratio lies outside the coefficient data
FLAG_RE_OUTSIDE_DATA = 32    # Reynolds number outside the coefficient data
FLAG_WIND_TOO_FAR_FORWARD = 64  # apparent wind too far forward for any forward thrust
FLAG_HEEL_WHEN_STOPPED = 128  # the stopped rotor alone heels more than the limit
FLAG_NOT_WORTHWHILE = 256    # stopped because no spin gains more than the smallest worthwhile gain

#: Free-disc torque coefficient C_M = 0.146 Re^-1/5 for both faces of a disc (turbulent; see
#: :func:`spin_power_skin_friction`).
DISC_MOMENT_CONSTANT = 0.146
#: Reynolds numbers below this are held at it in the friction laws (turbulent laws only). [-]
FRICTION_RE_MIN = 1.0e5

#: Best-spin search: spins on the first grid (stopped to the highest allowed), the local maxima
#: of the grid refined, the finer grid between a maximum's neighbours, and the steps that refine
#: them: bisection of a limit boundary and golden-section search of a peak. A step shrinks its interval by 2 or by 1.618; the steps make
#: the spin's error a few millionths of its range, far below what the net gain can feel.
GRID_POINTS = 24
PEAKS_REFINED = 3
SUBGRID_POINTS = 13
BOUNDARY_STEPS = 18
PEAK_STEPS = 12
#: Evaluations are made in blocks of this many conditions (bounded memory).
BLOCK = 4096

ASPECT_RATIO_TOLERANCE = 1.5     # warn when H/D differs from the set's by more than this factor
END_PLATE_TOLERANCE = 0.25       # warn when De/D differs from the set's by more than this
#: Apparent wind below this is a calm (no forces). [m/s]
CALM_M_S = 1e-6
#: A limit counts as met to this relative allowance (the limit boundary is found to far better).
_LIMIT_REL = 1e-6
_RPM_PER_RAD_S = 60.0 / (2.0 * math.pi)
_GOLDEN = (math.sqrt(5.0) - 1.0) / 2.0
SPIN_POWER_MODELS = ("set", "friction")


# ============================================================================ setup
@dataclass(frozen=True)
class RotorSetup:
    """Everything that does not vary per wind condition (SI units).

    ``profile_parameter`` is the power-law exponent (``power``) or the Charnock constant
    (``log``); ignored for ``uniform``. Limits are per rotor for rpm and motor power and for the
    whole ship for the heeling moment.
    """

    diameter_m: float
    height_m: float
    base_height_m: float
    end_plate_ratio: float
    rotor_count: int
    interaction_factor: float
    coefficients: coef.CoefficientSet
    wind_profile: str
    reference_height_m: float
    profile_parameter: float
    air_density_kg_m3: float
    kinematic_viscosity_m2_s: float
    max_rpm: float
    max_motor_power_w: float
    max_heeling_moment_nm: float
    propulsive_efficiency: float
    electrical_efficiency: float
    strips: int
    max_spin_ratio: float = 12.0
    correct_aspect_ratio: bool = True
    first_rotor_x_m: float = 0.0
    rotor_spacing_m: float = 0.0
    heel_reference_depth_m: float = 0.0
    min_gain_w: float = 0.0
    spin_power_model: str = "set"
    #: The hull that answers the side force (leeway and rudder); None: the balance is left out.
    hull: Any = None

    def __post_init__(self):
        check_positive("rotor diameter", self.diameter_m, "m")
        check_positive("rotor height", self.height_m, "m")
        check_number("rotor base above the waterline", self.base_height_m, "m", low=0.0)
        check_number("end-plate ratio", self.end_plate_ratio, "", low=1.0)
        if not isinstance(self.rotor_count, (int, np.integer)) or self.rotor_count < 1:
            raise InputError("rotor_count", f"number of rotors must be a whole number >= 1 (got {self.rotor_count!r})")
        check_number("interaction factor", self.interaction_factor, "", low=0.0, high=1.0,
                     low_inclusive=False)
        check_choice("wind profile", self.wind_profile, wind.PROFILES)
        check_positive("height of the given true wind", self.reference_height_m, "m")
        if self.wind_profile != "uniform":
            check_positive("wind profile parameter", self.profile_parameter)
        check_positive("air density", self.air_density_kg_m3, "kg/m3")
        check_positive("kinematic viscosity", self.kinematic_viscosity_m2_s, "m2/s")
        check_positive("maximum rotor speed", self.max_rpm, "rpm")
        check_positive("maximum motor power", self.max_motor_power_w, "W")
        check_positive("maximum heeling moment", self.max_heeling_moment_nm, "N m")
        check_number("propulsive efficiency", self.propulsive_efficiency, "", low=0.0, high=1.0,
                     low_inclusive=False)
        check_number("electrical efficiency", self.electrical_efficiency, "", low=0.0, high=1.0,
                     low_inclusive=False)
        if not isinstance(self.strips, (int, np.integer)) or not 1 <= self.strips <= 1000:
            raise InputError("strips", f"strips must be a whole number between 1 and 1000 (got {self.strips!r})")
        check_positive("highest spin ratio", self.max_spin_ratio)
        check_number("heel reference depth", self.heel_reference_depth_m, "m", low=0.0)
        check_number("smallest worthwhile gain", self.min_gain_w, "W", low=0.0)
        check_choice("spin power model", self.spin_power_model, SPIN_POWER_MODELS)
        check_number("rotor spacing", self.rotor_spacing_m, "m", low=0.0)
        if self.rotor_count > 1 and self.rotor_spacing_m < self.diameter_m:
            raise InputError("rotor_spacing_m", f"spacing between rotors must be at least the rotor "
                                                f"diameter {self.diameter_m:g} m when there are "
                                                f"{self.rotor_count} rotors (got {self.rotor_spacing_m:g} m)")

    # --- derived geometry
    @cached_property  # read in every evaluation of the best-spin search; the setup is frozen
    def hull_resistance_coefficient(self) -> float:
        """C of the resistance leeway and rudder add, R = C Y^2 / U^2, with the side force at the
        rotors' mean position (:meth:`liftcore.hull.Hull.resistance_coefficient`)."""
        return self.hull.resistance_coefficient(float(np.mean(self.rotor_positions_m)))

    @property
    def radius_m(self) -> float:
        return 0.5 * self.diameter_m

    @property
    def area_m2(self) -> float:
        """Projected area D x H of one rotor. [m^2]"""
        return self.diameter_m * self.height_m

    @property
    def aspect_ratio(self) -> float:
        return self.height_m / self.diameter_m

    @property
    def effective_aspect_ratio(self) -> float:
        return float(coef.effective_aspect_ratio_hoerner(self.aspect_ratio, self.end_plate_ratio))

    @property
    def mid_height_m(self) -> float:
        return self.base_height_m + 0.5 * self.height_m

    @property
    def strip_heights_m(self) -> np.ndarray:
        """Heights of the strip midpoints above the waterline. [m]"""
        return self.base_height_m + (np.arange(self.strips) + 0.5) * self.height_m / self.strips

    @property
    def rotor_positions_m(self) -> np.ndarray:
        """Distance of each rotor ahead of midships, foremost first. [m]"""
        return self.first_rotor_x_m - self.rotor_spacing_m * np.arange(self.rotor_count)

    @property
    def force_factor(self) -> float:
        """Multiplier from one rotor's forces to the ship's: count x interaction factor."""
        f = self.interaction_factor if self.rotor_count > 1 else 1.0
        return self.rotor_count * f

    def spin_ratio_limit(self) -> float:
        """Highest spin ratio the best-spin search may use (input and top of the data)."""
        return min(self.max_spin_ratio, self.coefficients.sr_range[1])

    # --- coefficients as used on this rotor
    def rotor_coefficients(self, spin_ratio):
        """(CL, CD, CP or None) of the set at ``spin_ratio``, with the induced drag moved to this
        rotor's effective aspect ratio when ``correct_aspect_ratio`` is set."""
        cl, cd, cp = self.coefficients.evaluate(spin_ratio)
        if self.correct_aspect_ratio:
            set_ar = coef.effective_aspect_ratio_hoerner(*self.coefficients.drag_geometry)
            cd = coef.drag_at_aspect_ratio(cl, cd, set_ar, self.effective_aspect_ratio)
        return cl, cd, cp

    @property
    def power_from_set(self) -> bool:
        """Whether the set's power coefficient (rather than the skin-friction model) drives the
        net gain."""
        return self.spin_power_model == "set" and self.coefficients.has_power

    def forward_angle_limit_rad(self) -> float:
        """Smallest apparent wind angle at which some spin ratio of the data gives forward thrust:
        atan(min CD/CL) over the tabulated spin ratios (thrust > 0 needs tan|b| > CD/CL). [rad]"""
        lo, hi = self.coefficients.sr_range
        sr = np.linspace(lo, hi, 401)
        cl, cd, _ = self.rotor_coefficients(sr)
        ok = cl > 0
        if not ok.any():
            return math.pi / 2
        return float(np.arctan(np.min(cd[ok] / cl[ok])))


# ============================================================================ results
@dataclass(frozen=True)
class Operation:
    """Rotor-set results, one array element per condition (broadcast shape of the inputs).

    Forces and moments are totals of all rotors (after the interaction factor); coefficients,
    spin ratio, rpm and Reynolds number are per rotor. ``spin_power_w`` is the shaft power of all
    rotors; ``electrical_power_w`` what they draw from the ship's plant. ``state``: 0 stopped,
    1 running free, 2 running at a limit (:data:`STATE_NAMES`). ``flags`` holds the ``FLAG_*``
    bits per condition.
    ``spin_direction``: +1 anticlockwise seen from above, -1 clockwise, 0 stopped.
    """

    apparent_wind_speed_m_s: np.ndarray
    apparent_wind_angle_deg: np.ndarray
    spin_ratio: np.ndarray
    rpm: np.ndarray
    lift_coefficient: np.ndarray
    drag_coefficient: np.ndarray
    lift_n: np.ndarray
    drag_n: np.ndarray
    thrust_n: np.ndarray
    side_force_n: np.ndarray
    heeling_moment_nm: np.ndarray
    spin_power_w: np.ndarray
    net_power_w: np.ndarray
    state: np.ndarray
    warnings: tuple = ()
    power_coefficient: np.ndarray | None = None
    electrical_power_w: np.ndarray | None = None
    propulsion_power_saved_w: np.ndarray | None = None
    yaw_moment_nm: np.ndarray | None = None
    reynolds_number: np.ndarray | None = None
    spin_direction: np.ndarray | None = None
    within_limits: np.ndarray | None = None
    flags: np.ndarray | None = None
    apparent_wind_speed_ref_m_s: np.ndarray | None = None
    apparent_wind_angle_ref_deg: np.ndarray | None = None
    spin_ratio_span_min: np.ndarray | None = None
    spin_ratio_span_max: np.ndarray | None = None
    #: Shaft power of all rotors at this spin from the set's power coefficient (``None`` when
    #: the set has none) and from the skin-friction model: the two estimates side by side.
    spin_power_set_w: np.ndarray | None = None
    spin_power_friction_w: np.ndarray | None = None
    #: With a hull: power lost to leeway and rudder (subtracted from the net gain), leeway (+: the
    #: ship slides to starboard) and rudder angle (+: the rudder's force to starboard).
    balance_power_w: np.ndarray | None = None
    leeway_deg: np.ndarray | None = None
    rudder_angle_deg: np.ndarray | None = None

    def at(self, index) -> dict:
        """The results of one condition as a dict of floats (plus ``warnings``)."""
        out = {}
        for name in self.__dataclass_fields__:
            v = getattr(self, name)
            if name == "warnings" or v is None:
                continue
            out[name] = np.asarray(v)[index].item()
        out["warnings"] = self.warnings
        return out


# ============================================================================ physics
def spin_power_skin_friction(omega_rad_s, diameter_m, height_m, end_plate_ratio, density_kg_m3,
                             kinematic_viscosity_m2_s):
    """Shaft power to spin a rotor against skin friction (model used when a set has no CP).

    Notes
    -----
    Cylinder: turbulent skin friction on the surface speed U = omega R, with the ITTC 1957
    model-ship correlation line C_f = 0.075 / (log10 Re - 2)^2 [1]_ and Re = U pi D / nu (one
    circumference as the run length), P = 0.5 rho C_f U^3 (pi D H). Top end plate (or top cap
    when there is none): a free disc of radius r = max(De, D)/2 wetted on both faces, torque
    M = 0.5 C_M rho omega^2 r^5 with C_M = 0.146 Re_d^-1/5, Re_d = omega r^2 / nu, power
    M omega [2]_. Applying a line made for ship hulls to a spinning surface, and the run length of
    one circumference, are our assumptions; the cross-flow, which adds to the real power, is
    ignored: treat the result as a lower estimate.

    Parameters
    ----------
    omega_rad_s : float or ndarray
        Rotor angular speed. [rad s^-1]
    diameter_m, height_m : float
        Rotor diameter and height. [m]
    end_plate_ratio : float
        End-plate diameter / rotor diameter. [-]
    density_kg_m3, kinematic_viscosity_m2_s : float
        Air density [kg m^-3] and kinematic viscosity [m^2 s^-1].

    Returns
    -------
    power_w : ndarray
        [W]

    References
    ----------
    .. [1] ITTC (1957). Proceedings of the 8th International Towing Tank Conference, Madrid
       (model-ship correlation line). Formula and tables: Hadler, J. B. (1958). Coefficients for
       International Towing Tank Conference 1957 model-ship correlation line. DTMB Report 1185;
       Morrall, A. (1970). 1957 ITTC model-ship correlation line values of frictional resistance
       coefficient. NPL Ship Report 142.
    .. [2] Free-disc torque M = 0.073 rho omega^2 r^5 (nu / (r^2 omega))^(1/5), both faces: the
       exercise "Friction factor for a rotating disk" (text quoted at crazyforstudy.com; its book,
       Bird, Stewart & Lightfoot, Transport Phenomena, and the von Karman / Schlichting origin
       are from memory).
    """
    w = np.abs(np.asarray(omega_rad_s, dtype=float))
    u = w * 0.5 * diameter_m
    re = np.maximum(u * math.pi * diameter_m / kinematic_viscosity_m2_s, FRICTION_RE_MIN)
    cf = 0.075 / (np.log10(re) - 2.0) ** 2
    p_cyl = 0.5 * density_kg_m3 * cf * u ** 3 * math.pi * diameter_m * height_m
    rd = 0.5 * diameter_m * max(end_plate_ratio, 1.0)
    cm = DISC_MOMENT_CONSTANT * np.maximum(w * rd * rd / kinematic_viscosity_m2_s, FRICTION_RE_MIN) ** -0.2
    return p_cyl + 0.5 * cm * density_kg_m3 * w ** 3 * rd ** 5


def rpm_from_spin_ratio(spin_ratio, apparent_wind_speed_m_s, diameter_m):
    """rpm = SR V / R x 60 / (2 pi)."""
    return np.asarray(spin_ratio, float) * np.asarray(apparent_wind_speed_m_s, float) / (0.5 * diameter_m) * _RPM_PER_RAD_S


def spin_ratio_from_rpm(rpm, apparent_wind_speed_m_s, diameter_m):
    """SR = omega R / V with omega = rpm x 2 pi / 60 (inf in a calm)."""
    v = np.asarray(apparent_wind_speed_m_s, float)
    w = np.asarray(rpm, float) / _RPM_PER_RAD_S
    safe = np.where(v > CALM_M_S, v, 1.0)
    return np.where(v > CALM_M_S, w * 0.5 * diameter_m / safe, np.where(w > 0, np.inf, 0.0))


@dataclass(frozen=True)
class _Wind:
    """Per-condition wind along the rotor (flattened to N conditions), with the strip weights the
    evaluator sums its coefficients with (the wind is the same for every spin and every set)."""

    ship: np.ndarray          # (N,)
    va: np.ndarray            # (N, S) apparent wind per strip
    sinb: np.ndarray
    cosb: np.ndarray
    side_sign: np.ndarray     # (N,) +1 wind from starboard (or ahead/astern), -1 from port
    va_mid: np.ndarray        # (N,)
    beta_mid: np.ndarray      # (N,) rad
    va_ref: np.ndarray
    beta_ref: np.ndarray
    r_over_va: np.ndarray     # (N, S) R / V_a (0 in a calm): SR = omega x this
    qa: np.ndarray            # (N, S) q D dz: a strip's force per unit coefficient
    heel_lever: np.ndarray    # (S,) strip height above the heel reference point


def _wind(setup: RotorSetup, vs, vt, g) -> _Wind:
    z = setup.strip_heights_m
    param = setup.profile_parameter
    vt_z = wind.wind_speed_profile(setup.wind_profile, vt[:, None], setup.reference_height_m, z[None, :], param)
    va, beta = wind.apparent_wind(vs[:, None], vt_z, g[:, None])
    vt_mid = wind.wind_speed_profile(setup.wind_profile, vt, setup.reference_height_m, setup.mid_height_m, param)
    va_mid, beta_mid = wind.apparent_wind(vs, vt_mid, g)
    va_ref, beta_ref = wind.apparent_wind(vs, vt, g)
    calm = va <= CALM_M_S
    return _Wind(ship=vs, va=va, sinb=np.sin(beta), cosb=np.cos(beta),
                 side_sign=np.where(np.sin(g) < 0.0, -1.0, 1.0), va_mid=va_mid, beta_mid=beta_mid,
                 va_ref=va_ref, beta_ref=beta_ref,
                 r_over_va=np.where(calm, 0.0, setup.radius_m / np.where(calm, 1.0, va)),
                 qa=0.5 * setup.air_density_kg_m3 * va * va * setup.diameter_m * setup.height_m / setup.strips,
                 heel_lever=z + setup.heel_reference_depth_m)


def _wind_part(w: _Wind, part) -> _Wind:
    """The wind of some of the conditions (a slice gives views, an index array copies)."""
    return _Wind(**{name: (getattr(w, name) if name == "heel_lever" else getattr(w, name)[part])
                    for name in w.__dataclass_fields__})


def _sum(coefficient, weight):
    """Sum over the strips of coefficient (..., N, S) x weight (N, S)."""
    return np.einsum("...ns,ns->...n", coefficient, weight)


def _evaluate(setup: RotorSetup, w: _Wind, omega, full: bool = True) -> dict:
    """The results at angular speeds ``omega`` of shape (..., N): a dict of (..., N) arrays.

    The one evaluator of the rotor (see the module notes): strip lift and drag from the
    coefficient set (induced drag moved to this rotor), thrust and heeling moment, spin power
    from the set's CP and from the skin-friction model, and the net gain with the spin power
    ``setup.spin_power_model`` chooses. ``full`` False gives only what the best-spin search
    needs (net gain, spin power per rotor, heeling moment); True adds the side force, lift,
    drag, both spin powers and the strips' spin ratios.
    """
    omega = np.asarray(omega, dtype=float)
    sr = omega[..., None] * w.r_over_va                                    # (..., N, S)
    cl, cd, cp = setup.rotor_coefficients(sr)
    abs_sin = np.abs(w.sinb)
    thrust = _sum(cl, w.qa * abs_sin) - _sum(cd, w.qa * w.cosb)
    # side force per strip: -s dL cos b - dD sin b; its moment about the heel reference point
    side_l, side_d = -w.side_sign[:, None] * w.qa * w.cosb, -w.qa * w.sinb
    heel = _sum(cl, side_l * w.heel_lever) + _sum(cd, side_d * w.heel_lever)
    friction = spin_power_skin_friction(omega, setup.diameter_m, setup.height_m, setup.end_plate_ratio,
                                        setup.air_density_kg_m3, setup.kinematic_viscosity_m2_s)
    from_set = None if cp is None else _sum(cp, w.qa * w.va)
    power = from_set if setup.power_from_set else friction
    k = setup.force_factor
    net = k * thrust * w.ship / setup.propulsive_efficiency - setup.rotor_count * power / setup.electrical_efficiency
    out = {"thrust": k * thrust, "heel": k * heel, "power1": power, "net": net}
    side = None
    if setup.hull is not None or full:
        side = k * (_sum(cl, side_l) + _sum(cd, side_d))
    if setup.hull is not None:
        # leeway and rudder: R = C Y^2 / U^2, its power R U through the propulsive efficiency
        c = setup.hull_resistance_coefficient
        u = np.where(w.ship >= hull_model.MIN_SPEED_M_S, w.ship, np.inf)
        out["balance"] = c * side * side / u / setup.propulsive_efficiency
        out["net"] = net - out["balance"]
    if full:
        lift1, drag1 = _sum(cl, w.qa), _sum(cd, w.qa)
        out.update(side=side, lift=k * lift1, drag=k * drag1,
                   lift1=lift1, drag1=drag1, power_set1=from_set, power_friction1=friction, sr_strip=sr)
    return out


def _within(setup: RotorSetup, res: dict):
    """Within the motor-power and heeling-moment limits (rpm and spin ratio bound the search)."""
    return ((res["power1"] <= setup.max_motor_power_w * (1 + _LIMIT_REL))
            & (np.abs(res["heel"]) <= setup.max_heeling_moment_nm * (1 + _LIMIT_REL)))


def _prepare(ship_speed_m_s, true_wind_speed_m_s, true_wind_angle_rad, *extra):
    arrays = [np.asarray(a, dtype=float) for a in (ship_speed_m_s, true_wind_speed_m_s, true_wind_angle_rad) + extra]
    shape = np.broadcast_shapes(*(a.shape for a in arrays))
    flat = [np.broadcast_to(a, shape).ravel() for a in arrays]
    names = ("ship speed", "true wind speed", "true wind angle")
    for name, a in zip(names, flat):
        if not np.all(np.isfinite(a)):
            bad = a[~np.isfinite(a)][0]
            raise InputError(name, f"{name} must be a finite number (got {bad})")
    if (flat[0] < 0).any():
        raise InputError("ship speed", f"ship speed must be >= 0 m/s (got {flat[0].min():g} m/s)")
    if (flat[1] < 0).any():
        raise InputError("true wind speed", f"true wind speed must be >= 0 m/s (got {flat[1].min():g} m/s)")
    return shape, flat


# ============================================================================ public calls
def fixed_operation(setup: RotorSetup, ship_speed_m_s, true_wind_speed_m_s, true_wind_angle_rad,
                    spin_ratio=None, rpm=None) -> Operation:
    """Rotor-set results at a given operating spin ratio or rpm (limits are checked, not enforced).

    Parameters
    ----------
    setup : RotorSetup
    ship_speed_m_s, true_wind_speed_m_s : float or ndarray
        Ship speed through the water and true wind speed at ``setup.reference_height_m``. [m s^-1]
    true_wind_angle_rad : float or ndarray
        Relative bearing the true wind comes from (0 on the bow, + from starboard). [rad]
    spin_ratio, rpm : float or ndarray
        Exactly one: the operating spin ratio at mid-height [-] or the rotor speed [rpm]; 0 is a
        stopped rotor. Everything broadcasts together.

    Returns
    -------
    Operation
        Results per condition; ``state`` is stopped, running or at a limit (a limit passed).
    """
    if (spin_ratio is None) == (rpm is None):
        raise InputError("spin", "give exactly one of spin ratio and rpm")
    given = spin_ratio if spin_ratio is not None else rpm
    name = "spin ratio" if spin_ratio is not None else "rotor speed"
    g_arr = np.asarray(given, dtype=float)
    if not np.all(np.isfinite(g_arr)) or (g_arr < 0).any():
        bad = g_arr[~np.isfinite(g_arr) | (g_arr < 0)].ravel()[0]
        raise InputError(name, f"{name} must be a finite number >= 0 (got {bad:g})")
    shape, (vs, vt, g, spin) = _prepare(ship_speed_m_s, true_wind_speed_m_s, true_wind_angle_rad, given)
    w = _wind(setup, vs, vt, g)
    calm = w.va_mid <= CALM_M_S
    if spin_ratio is not None:
        omega = np.where(calm, 0.0, spin * w.va_mid / setup.radius_m)
    else:
        omega = spin / _RPM_PER_RAD_S
    res = _evaluate(setup, w, omega)
    rpm_v = omega * _RPM_PER_RAD_S
    flags = np.zeros(vs.shape, dtype=np.int64)
    flags |= np.where(rpm_v > setup.max_rpm * (1 + 1e-9), FLAG_RPM, 0)
    flags |= np.where(res["power1"] > setup.max_motor_power_w * (1 + 1e-9), FLAG_MOTOR_POWER, 0)
    flags |= np.where(np.abs(res["heel"]) > setup.max_heeling_moment_nm * (1 + 1e-9), FLAG_HEEL, 0)
    within = (flags & (FLAG_RPM | FLAG_MOTOR_POWER | FLAG_HEEL)) == 0
    state = np.where(omega > 0, np.where(within, RUNNING, AT_LIMIT), STOPPED)
    return _finish(setup, w, omega, res, state, flags, within, shape, mode="fixed")


def best_operation(setup: RotorSetup, ship_speed_m_s, true_wind_speed_m_s, true_wind_angle_rad,
                   progress=None) -> Operation:
    """For each condition, the spin with the largest net power gain within the limits, or the
    rotor stopped where no spin gains more than the smallest worthwhile gain.

    Parameters
    ----------
    setup : RotorSetup
    ship_speed_m_s, true_wind_speed_m_s : float or ndarray
        Ship speed and true wind speed at ``setup.reference_height_m``. [m s^-1]
    true_wind_angle_rad : float or ndarray
        Relative bearing the true wind comes from. [rad] Broadcast with the speeds.
    progress : callable, optional
        ``progress(fraction, text)`` during long runs.

    Returns
    -------
    Operation
        Results per condition (shape of the broadcast inputs).

    Notes
    -----
    The spin is searched from stopped to the smallest of the maximum rpm and the highest spin
    ratio allowed (input or top of the data, at mid-height); the motor-power and heeling-moment
    limits are constraints (a stopped rotor is always allowed). All conditions are solved
    together, in blocks:

    1. the net gain on :data:`GRID_POINTS` spins from stopped to the highest allowed, and at the
       spins where the data's lift peaks (digitised data can dip: a sharp hump there);
    2. the :data:`PEAKS_REFINED` best local maxima of the grid within the limits (a net gain can
       have several humps where the data dip);
    3. where a spin within two grid steps of such a maximum breaks a limit, the limit's boundary
       by bisection;
    4. :data:`SUBGRID_POINTS` spins over two grid steps either side (or up to the boundary),
       and a golden-section search round the best of them;
    5. the best point met. If its net gain is not above ``setup.min_gain_w`` the rotor stops
       and the still cylinder's drag is counted.

    The search is a plain grid and golden-section refinement on a smooth one-dimensional
    function; its error in the net gain is far below a thousandth, which the benchmark checks
    against a 4001-point scan of the same function.
    """
    return best_operations((setup,), ship_speed_m_s, true_wind_speed_m_s, true_wind_angle_rad, progress)[0]


def best_operations(setups, ship_speed_m_s, true_wind_speed_m_s, true_wind_angle_rad,
                    progress=None) -> list[Operation]:
    """:func:`best_operation` for several setups that differ only in coefficients, spin-power
    model or limits: the wind triangle and the strip winds are computed once for all of them.

    Parameters
    ----------
    setups : sequence of RotorSetup
        Setups with the same rotor geometry, wind profile and air (what the wind along the rotor
        depends on); e.g. one rotor with every published coefficient set.
    ship_speed_m_s, true_wind_speed_m_s : float or ndarray
        Ship speed and true wind speed at the reference height. [m s^-1]
    true_wind_angle_rad : float or ndarray
        Relative bearing the true wind comes from. [rad]
    progress : callable, optional
        ``progress(fraction, text)`` over all setups and blocks.

    Returns
    -------
    list of Operation
        One per setup, in order.

    Raises
    ------
    ValueError
        When the setups do not share the wind along the rotor.
    """
    setups = tuple(setups)
    shape, (vs, vt, g) = _prepare(ship_speed_m_s, true_wind_speed_m_s, true_wind_angle_rad)
    first = setups[0]
    if any(_wind_key(s) != _wind_key(first) for s in setups[1:]):
        raise ValueError("best_operations needs setups with the same geometry, wind profile and air")
    w = _wind(first, vs, vt, g)
    n = vs.size
    out = []
    for i, setup in enumerate(setups):
        omega = np.empty(n)
        for start in range(0, n, BLOCK):
            sl = slice(start, min(n, start + BLOCK))
            omega[sl] = _best_omega(setup, _wind_part(w, sl))
            if progress is not None and (n > BLOCK or len(setups) > 1):
                progress((i + sl.stop / n) / len(setups), f"Best spin for {n:,} conditions"
                         + (f", set {i + 1} of {len(setups)}" if len(setups) > 1 else ""))
        out.append(operation_at(setup, w, omega, shape))
    return out


def _wind_key(setup: RotorSetup) -> tuple:
    """What :func:`_wind` reads from a setup."""
    return (setup.diameter_m, setup.height_m, setup.base_height_m, setup.strips, setup.wind_profile,
            setup.reference_height_m, setup.profile_parameter, setup.air_density_kg_m3,
            setup.heel_reference_depth_m)


def operation_at(setup: RotorSetup, w: "_Wind", omega, shape) -> Operation:
    """The :class:`Operation` of the best spins ``omega`` found for the conditions of ``w``
    (states and limit flags of the operating rule)."""
    res = _evaluate(setup, w, omega)
    n = omega.size
    rpm_v = omega * _RPM_PER_RAD_S
    sr_op = np.where(w.va_mid > CALM_M_S, omega * setup.radius_m / np.where(w.va_mid > CALM_M_S, w.va_mid, 1.0), 0.0)
    rel = 1e-4
    flags = np.zeros(n, dtype=np.int64)
    running = omega > 0
    flags |= np.where(running & (rpm_v >= setup.max_rpm * (1 - rel)), FLAG_RPM, 0)
    flags |= np.where(running & (res["power1"] >= setup.max_motor_power_w * (1 - rel)), FLAG_MOTOR_POWER, 0)
    flags |= np.where(running & (np.abs(res["heel"]) >= setup.max_heeling_moment_nm * (1 - rel)), FLAG_HEEL, 0)
    flags |= np.where(running & (sr_op >= setup.spin_ratio_limit() * (1 - rel)), FLAG_SPIN_RATIO_LIMIT, 0)
    stopped = _evaluate(setup, w, np.zeros(n))
    flags |= np.where(np.abs(stopped["heel"]) > setup.max_heeling_moment_nm, FLAG_HEEL_WHEN_STOPPED, 0)
    flags |= np.where(~running & (w.va_mid > CALM_M_S), FLAG_NOT_WORTHWHILE, 0)
    at_limit = (flags & (FLAG_RPM | FLAG_MOTOR_POWER | FLAG_HEEL | FLAG_SPIN_RATIO_LIMIT)) != 0
    state = np.where(running, np.where(at_limit, AT_LIMIT, RUNNING), STOPPED)
    within = (res["power1"] <= setup.max_motor_power_w * (1 + 1e-6)) & (
        (np.abs(res["heel"]) <= setup.max_heeling_moment_nm * (1 + 1e-6)) | ~running)
    return _finish(setup, w, omega, res, state, flags, within, shape, mode="best")


def _omega_top(setup: RotorSetup, w: "_Wind") -> np.ndarray:
    """Highest spin the search may use per condition: the rpm limit and the spin-ratio limit at
    mid-height (0 in a calm). [rad/s]"""
    by_rpm = setup.max_rpm / _RPM_PER_RAD_S
    by_sr = setup.spin_ratio_limit() * w.va_mid / setup.radius_m
    return np.where(w.va_mid > CALM_M_S, np.minimum(by_rpm, by_sr), 0.0)


def _score(setup: RotorSetup, w: "_Wind", omega) -> np.ndarray:
    """Net gain at ``omega`` (K, N); -inf where a limit is broken (stopped is always allowed)."""
    res = _evaluate(setup, w, omega, full=False)
    ok = _within(setup, res) | (omega == 0.0)
    return np.where(ok, res["net"], -np.inf)


def _lift_peaks(cs: coef.CoefficientSet) -> np.ndarray:
    """Spin ratios of the set's data points where the lift peaks (higher than both neighbours)."""
    cl = np.asarray(cs.lift, dtype=float)
    inner = np.flatnonzero((cl[1:-1] > cl[:-2]) & (cl[1:-1] >= cl[2:])) + 1
    return np.asarray(cs.spin_ratio, dtype=float)[inner]


def _boundary(setup: RotorSetup, w: "_Wind", inside, outside) -> np.ndarray:
    """Bisection for where a limit starts to bind, between spins ``inside`` (within the limits)
    and ``outside``; returns the last spin found within them."""
    for _ in range(BOUNDARY_STEPS):
        mid = 0.5 * (inside + outside)
        ok = np.isfinite(_score(setup, w, mid))
        inside, outside = np.where(ok, mid, inside), np.where(ok, outside, mid)
    return inside


def _golden(setup: RotorSetup, w: "_Wind", a, b):
    """Golden-section search of the largest net gain in [a, b]; (spin, net gain)."""
    x1, x2 = b - _GOLDEN * (b - a), a + _GOLDEN * (b - a)
    f1, f2 = _score(setup, w, x1), _score(setup, w, x2)
    for _ in range(PEAK_STEPS):
        right = f2 > f1                      # the peak lies in [x1, b], else in [a, x2]
        a, b = np.where(right, x1, a), np.where(right, b, x2)
        keep_x, keep_f = np.where(right, x2, x1), np.where(right, f2, f1)
        new = np.where(right, a + _GOLDEN * (b - a), b - _GOLDEN * (b - a))
        f_new = _score(setup, w, new)
        x1, f1 = np.where(right, keep_x, new), np.where(right, keep_f, f_new)
        x2, f2 = np.where(right, new, keep_x), np.where(right, f_new, keep_f)
    return np.where(f2 > f1, x2, x1), np.maximum(f1, f2)


def _best_omega(setup: RotorSetup, w: "_Wind") -> np.ndarray:
    """The best spin of each condition of ``w`` (see :func:`best_operation`). [rad/s]"""
    n = w.ship.size
    top = _omega_top(setup, w)
    grid = np.linspace(0.0, 1.0, GRID_POINTS)[:, None] * top[None, :]            # (G, N)
    # a sharp hump of the net gain sits where the data's lift peaks between two points (a dip
    # in digitised data): those spins (at mid-height) join the grid
    peaks = _lift_peaks(setup.coefficients)
    if peaks.size:
        at = peaks[:, None] * w.va_mid[None, :] / setup.radius_m
        grid = np.sort(np.vstack([grid, np.minimum(at, top[None, :])]), axis=0)
    last = grid.shape[0] - 1
    score = _score(setup, w, grid)
    pad = np.full((1, n), -np.inf)
    peak = np.isfinite(score) & (score >= np.vstack([pad, score[:-1]])) & (score >= np.vstack([score[1:], pad]))
    ranked = np.argsort(np.where(peak, score, -np.inf), axis=0)[::-1][:PEAKS_REFINED]  # (K, N)
    rows, which = np.nonzero(peak[ranked, np.arange(n)[None, :]])   # the maxima that exist
    at = ranked[rows, which]
    part = _wind_part(w, which)
    g = grid[:, which]                                                # (G, M) spins of each
    f = score[:, which]
    k = np.arange(which.size)
    # the bracket reaches two grid steps either way (a hump next to the grid's best point), and
    # ends at a limit's boundary where a spin in it breaks one
    ends = []
    for side in (-1, 1):
        near, far = np.clip(at + side, 0, last), np.clip(at + 2 * side, 0, last)
        end = g[far, k].copy()
        for inside, outside in ((at, near), (near, far)):
            bad = ~np.isfinite(f[outside, k]) & np.isfinite(f[inside, k]) & (end == g[far, k])
            if bad.any():
                sub = np.flatnonzero(bad)
                end[sub] = _boundary(setup, _wind_part(part, sub), g[inside, k][sub], g[outside, k][sub])
        ends.append(end)
    a, b = ends
    # a finer grid over the bracket (humps closer than a grid step), then golden-section search
    # round its best point
    sub_x = a[None, :] + np.linspace(0.0, 1.0, SUBGRID_POINTS)[:, None] * (b - a)[None, :]
    sub_f = _score(setup, part, sub_x)
    j = np.argmax(sub_f, axis=0)
    lo, hi = sub_x[np.maximum(j - 1, 0), k], sub_x[np.minimum(j + 1, SUBGRID_POINTS - 1), k]
    x_gold, f_gold = _golden(setup, part, lo, hi)
    # the best point met per condition (stopped, the grid, the finer grid, the search)
    best_x, best_f = grid[0].copy(), score[0].copy()
    for xs, fs in ((g[at, k], f[at, k]), (sub_x[j, k], sub_f[j, k]), (x_gold, f_gold)):
        order = np.argsort(fs, kind="stable")         # a condition may come once per maximum:
        cx, cf, cc = xs[order], fs[order], which[order]   # the larger write comes last and wins
        better = cf > best_f[cc]
        best_x[cc[better]], best_f[cc[better]] = cx[better], cf[better]
    # the operating rule: no spin worth less than the smallest worthwhile gain
    return np.where((best_x > 0) & (best_f > setup.min_gain_w), best_x, 0.0)


def _finish(setup: RotorSetup, w: _Wind, omega, res, state, flags, within, shape, mode) -> Operation:
    n = omega.size
    running = omega > 0
    calm = w.va_mid <= CALM_M_S
    va_safe = np.where(calm, 1.0, w.va_mid)
    sr_op = np.where(calm, np.where(running, np.inf, 0.0), omega * setup.radius_m / va_safe)
    q_mid = 0.5 * setup.air_density_kg_m3 * w.va_mid ** 2
    qa = np.where(calm, 1.0, q_mid * setup.area_m2)
    cl_eff = np.where(calm, 0.0, res["lift1"] / qa)
    cd_eff = np.where(calm, 0.0, res["drag1"] / qa)
    cp_eff = np.where(calm, 0.0, res["power1"] / (qa * va_safe))
    re = w.va_mid * setup.diameter_m / setup.kinematic_viscosity_m2_s
    # spin ratio along the span, and validity flags
    sr_strip = res["sr_strip"]
    lo, hi = setup.coefficients.sr_range
    outside = setup.coefficients.outside(sr_strip).any(axis=-1) & running
    flags = flags | np.where(outside, FLAG_SR_OUTSIDE_DATA, 0)
    re_lo, re_hi = setup.coefficients.reynolds_range
    re_out = ((re < re_lo) | (re > re_hi)) & ~calm
    flags = flags | np.where(re_out, FLAG_RE_OUTSIDE_DATA, 0)
    fwd_limit = setup.forward_angle_limit_rad()
    too_fwd = (np.abs(w.beta_mid) < fwd_limit) & ~calm
    flags = flags | np.where(too_fwd, FLAG_WIND_TOO_FAR_FORWARD, 0)
    # yaw moment about midships: rotors share the same force (interaction applied evenly)
    x_mean = float(np.mean(setup.rotor_positions_m))
    yaw = res["side"] * x_mean
    if setup.hull is not None:  # leeway and rudder angle once, for the fields and the warnings
        res["hull"] = setup.hull.balance(res["side"], x_mean, w.ship)
    spin_dir = np.where(running, -w.side_sign, 0.0)
    power_t = setup.rotor_count * res["power1"]
    from liftcore.rotor_warnings import rotor_warnings  # the texts live beside the model
    warnings = rotor_warnings(setup, w, omega, res, re, flags, mode, n)

    def shaped(a):
        return np.asarray(a, dtype=float).reshape(shape)

    return Operation(
        apparent_wind_speed_m_s=shaped(w.va_mid),
        apparent_wind_angle_deg=shaped(np.degrees(w.beta_mid)),
        spin_ratio=shaped(sr_op), rpm=shaped(omega * _RPM_PER_RAD_S),
        lift_coefficient=shaped(cl_eff), drag_coefficient=shaped(cd_eff),
        lift_n=shaped(res["lift"]), drag_n=shaped(res["drag"]), thrust_n=shaped(res["thrust"]),
        side_force_n=shaped(res["side"]), heeling_moment_nm=shaped(res["heel"]),
        spin_power_w=shaped(power_t), net_power_w=shaped(res["net"]),
        state=np.asarray(state, dtype=np.int64).reshape(shape), warnings=warnings,
        power_coefficient=shaped(cp_eff),
        electrical_power_w=shaped(power_t / setup.electrical_efficiency),
        propulsion_power_saved_w=shaped(res["thrust"] * w.ship / setup.propulsive_efficiency),
        yaw_moment_nm=shaped(yaw), reynolds_number=shaped(re), spin_direction=shaped(spin_dir),
        within_limits=np.asarray(within, dtype=bool).reshape(shape),
        flags=np.asarray(flags, dtype=np.int64).reshape(shape),
        apparent_wind_speed_ref_m_s=shaped(w.va_ref),
        apparent_wind_angle_ref_deg=shaped(np.degrees(w.beta_ref)),
        spin_ratio_span_min=shaped(np.where(running, sr_strip.min(axis=-1), 0.0)),
        spin_ratio_span_max=shaped(np.where(running, sr_strip.max(axis=-1), 0.0)),
        spin_power_set_w=None if res["power_set1"] is None else shaped(setup.rotor_count * res["power_set1"]),
        spin_power_friction_w=shaped(setup.rotor_count * res["power_friction1"]),
        **({} if setup.hull is None else
           {"balance_power_w": shaped(res["balance"]), "leeway_deg": shaped(res["hull"]["leeway_deg"]),
            "rudder_angle_deg": shaped(res["hull"]["rudder_angle_deg"])}),
    )



# ============================================================================ along the span
@dataclass(frozen=True)
class SpanProfile:
    """Wind and loads along the rotor height for one condition (arrays over height)."""

    height_m: np.ndarray
    true_wind_speed_m_s: np.ndarray
    apparent_wind_speed_m_s: np.ndarray
    apparent_wind_angle_deg: np.ndarray
    spin_ratio: np.ndarray
    lift_coefficient: np.ndarray
    drag_coefficient: np.ndarray
    thrust_per_m_n_m: np.ndarray
    strip_heights_m: np.ndarray
    base_height_m: float
    top_height_m: float
    reference_height_m: float


def span_profile(setup: RotorSetup, ship_speed_m_s: float, true_wind_speed_m_s: float,
                 true_wind_angle_rad: float, rpm: float, points: int = 60) -> SpanProfile:
    """Wind, apparent wind, spin ratio and thrust per metre along the rotor for one condition.

    The heights run from 1 m above the waterline to the rotor top; spin ratio, coefficients and
    thrust per metre are only defined on the rotor (NaN below it).
    """
    top = setup.base_height_m + setup.height_m
    z_low = min(1.0, 0.5 * top)
    z = np.unique(np.concatenate([np.linspace(z_low, top, points),
                                  [max(setup.base_height_m, z_low)], setup.strip_heights_m]))
    vt = wind.wind_speed_profile(setup.wind_profile, true_wind_speed_m_s, setup.reference_height_m, z,
                                 setup.profile_parameter)
    va, beta = wind.apparent_wind(ship_speed_m_s, vt, true_wind_angle_rad)
    on = z >= setup.base_height_m - 1e-9
    omega = rpm / _RPM_PER_RAD_S
    calm = va <= CALM_M_S
    sr = np.where(calm, 0.0, omega * setup.radius_m / np.where(calm, 1.0, va))
    cl, cd, _ = setup.rotor_coefficients(sr)
    q = 0.5 * setup.air_density_kg_m3 * va * va
    thrust = q * setup.diameter_m * (cl * np.abs(np.sin(beta)) - cd * np.cos(beta)) * setup.force_factor
    nan = np.where(on, 1.0, np.nan)
    return SpanProfile(height_m=z, true_wind_speed_m_s=vt, apparent_wind_speed_m_s=va,
                       apparent_wind_angle_deg=np.degrees(beta), spin_ratio=sr * nan,
                       lift_coefficient=cl * nan, drag_coefficient=cd * nan,
                       thrust_per_m_n_m=thrust * nan, strip_heights_m=setup.strip_heights_m,
                       base_height_m=setup.base_height_m, top_height_m=top,
                       reference_height_m=setup.reference_height_m)


# ============================================================================ sets
def with_coefficients(setup: RotorSetup, coefficients: coef.CoefficientSet) -> RotorSetup:
    """The same setup with another coefficient set (to compare sets side by side)."""
    from dataclasses import replace

    return replace(setup, coefficients=coefficients)


# ============================================================================ curves for charts
@dataclass(frozen=True)
class CoefficientCurves:
    """A set's coefficients over its spin-ratio range as used on this rotor (for charts)."""

    spin_ratio: np.ndarray
    lift_coefficient: np.ndarray
    drag_coefficient: np.ndarray
    power_coefficient: np.ndarray
    power_from_friction_model: bool


def coefficient_curves(setup: RotorSetup, apparent_wind_speed_m_s: float, points: int = 121) -> CoefficientCurves:
    """CL, CD (induced drag moved to this rotor when ``correct_aspect_ratio``) and CP over the
    set's spin-ratio range. Without a power coefficient in the set, CP is the skin-friction
    model's power expressed as P / (q D H V) at the given apparent wind speed."""
    lo, hi = setup.coefficients.sr_range
    sr = np.linspace(lo, hi, points)
    cl, cd, cp = setup.rotor_coefficients(sr)
    friction = cp is None
    if friction:
        v = max(float(apparent_wind_speed_m_s), 0.1)
        omega = sr * v / setup.radius_m
        p = spin_power_skin_friction(omega, setup.diameter_m, setup.height_m, setup.end_plate_ratio,
                                     setup.air_density_kg_m3, setup.kinematic_viscosity_m2_s)
        cp = p / (0.5 * setup.air_density_kg_m3 * v ** 3 * setup.area_m2)
    return CoefficientCurves(sr, cl, cd, cp, friction)
