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

Model
-----
The rotor is cut into ``strips`` horizontal strips of equal height (midpoint rule). Each strip has
the lift and drag of the coefficient set at its own spin ratio, on its own apparent wind:
dL = q(z) D dz CL(SR(z)), dD = q(z) D dz CD(SR(z)), q = 0.5 rho V_a^2. Lift is perpendicular
to the local apparent wind, on the side that gives forward thrust (this fixes the direction of
spin), drag along it:

    thrust = dL |sin b| - dD cos b,     side = -s dL cos b - dD sin b,   s = sign(sin b)

(b the local apparent wind angle). The lift and drag reported are the sums of the strip
magnitudes; the lift and drag coefficients reported are those sums over q(mid-height) D H.

Spin power is P = CP q D H V_a (strip by strip) when the set has a power coefficient, else a
skin-friction model (:func:`spin_power_skin_friction`). The motors draw P / electrical
efficiency from the ship's electric plant. Net power gain:

    net = thrust x ship speed / propulsive efficiency - P / electrical efficiency

Several rotors: every force and moment of one rotor is multiplied by the number of rotors and by
the interaction factor (an explicit assumption, 1 = no interaction); spin power is not reduced.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from liftcore import coefficients as coef
from liftcore import wind
from liftcore.errors import InputError, check_choice, check_number, check_positive
from liftcore.inputs import Field, choice, flag, integer, number, text
from liftcore.validity import ModelWarning

#: Rotor states in :class:`Operation`.
STOPPED, RUNNING, AT_LIMIT = 0, 1, 2

#: Bits of :attr:`Operation.flags` (per condition), for callers that aggregate many conditions.
FLAG_RPM = 1                 # spin limited by (best) or above (fixed) the maximum rpm
FLAG_MOTOR_POWER = 2         # ... by / above the motor power limit
FLAG_HEEL = 4                # ... by / above the heeling-moment limit
FLAG_SPIN_RATIO_LIMIT = 8    # best spin stopped at the highest spin ratio allowed (input or data)
FLAG_SR_OUTSIDE_DATA = 16    # some strip's spin ratio lies outside the coefficient data
FLAG_RE_OUTSIDE_DATA = 32    # Reynolds number outside the coefficient data
FLAG_WIND_TOO_FAR_FORWARD = 64  # apparent wind too far forward for any forward thrust
FLAG_HEEL_WHEN_STOPPED = 128  # the stopped rotor alone heels more than the limit

#: Turbulent free-disc moment coefficient, both faces: C_M = 0.146 Re^-1/5 with Re = omega r^2/nu
#: and torque M = 0.5 C_M rho omega^2 r^5 (von Karman 1921, as given in Schlichting,
#: Boundary-Layer Theory; from memory).
DISC_MOMENT_CONSTANT = 0.146
#: Smallest Reynolds number used in the ITTC 1957 friction line (below it laminar flow that the
#: line does not describe; the power there is negligible anyway).
FRICTION_RE_MIN = 1.0e5

#: Best-spin search: coarse grid over the whole spin range, fine grid between the best coarse
#: point's neighbours, golden-section steps after it and bisection steps for a limit boundary.
BEST_GRID_POINTS = 25
FINE_GRID_POINTS = 13
GOLDEN_STEPS = 20
BOUNDARY_STEPS = 24
#: Conditions evaluated per block in the best-spin search (keeps grid x block x strips arrays
#: small enough to stay in cache).
BLOCK = 512

#: Thresholds of the "unlike the tested rotor" warnings (our choice, not from a source).
ASPECT_RATIO_TOLERANCE = 1.5     # warn when H/D differs from the set's by more than this factor
END_PLATE_TOLERANCE = 0.25       # warn when De/D differs from the set's by more than this
#: Apparent wind speeds below this are treated as calm (rotor stopped, no forces). [m/s]
CALM_M_S = 1e-6

_GOLDEN = (math.sqrt(5.0) - 1.0) / 2.0
_RPM_PER_RAD_S = 60.0 / (2.0 * math.pi)


# ============================================================================ inputs
#: Rotor, ship, wind-profile, coefficient-set, limit and efficiency inputs (core units); reused by
#: the voyage study. Air-state inputs come from :func:`liftcore.air.air_inputs`.
ROTOR_FIELDS: tuple[Field, ...] = (
    number("diameter_m", "Rotor diameter", "length", 5.0, 0.2, 15.0, section="Rotor",
           help="Outer diameter D of the spinning cylinder."),
    number("height_m", "Rotor height", "length", 30.0, 1.0, 80.0, section="Rotor",
           help="Height H of the spinning cylinder (span); its aspect ratio is H/D."),
    number("base_height_m", "Rotor base above the waterline", "length", 10.0, 0.0, 60.0,
           section="Rotor", help="Height of the bottom of the cylinder above the waterline "
                                 "(deck height plus foundation)."),
    number("end_plate_ratio", "End-plate diameter / rotor diameter", "ratio", 1.6, 1.0, 4.0,
           section="Rotor", step=0.1, help="Top end plate diameter divided by the rotor "
                                           "diameter; 1 means no end plate."),
    integer("rotor_count", "Number of rotors", 2, 1, 8, section="Rotor",
            help="Identical rotors on the centreline, all at the same spin."),
    number("first_rotor_x_m", "Foremost rotor, forward of midships", "length", 60.0, -200.0, 200.0,
           section="Rotor", help="Distance of the foremost rotor ahead of midships (negative: "
                                 "aft). Sets the yaw moment and which rotor is downwind."),
    number("rotor_spacing_m", "Spacing between rotors", "length", 40.0, 0.0, 200.0,
           section="Rotor", help="Fore-and-aft distance between neighbouring rotors (at least "
                                 "one diameter when there is more than one rotor)."),
    number("interaction_factor", "Interaction factor (assumed)", "ratio", 1.0, 0.3, 1.0,
           section="Rotor", step=0.05, help="Forces of all rotors are multiplied by this when "
                                            "there is more than one: 1 = rotors do not disturb "
                                            "each other. An assumption, not computed."),
    choice("wind_profile", "Wind profile over the sea", wind.PROFILES, default="log",
           labels=wind.PROFILE_LABELS, section="Wind profile",
           help="How the true wind grows with height. The ship speed does not, so the apparent "
                "wind changes along the rotor."),
    number("reference_height_m", "Height of the given true wind", "length",
           wind.STANDARD_WIND_HEIGHT_M, 1.0, 100.0, section="Wind profile",
           help="Height at which the true wind speed is given (10 m is the standard height of "
                "wind observations, WMO-No. 8)."),
    number("power_law_exponent", "Power-law exponent", "ratio", wind.POWER_LAW_EXPONENT_SEA,
           0.04, 0.3, section="Wind profile", step=0.01,
           help="About 0.10 to 0.14 over open sea (common practice)."),
    number("charnock_constant", "Charnock constant", "ratio", wind.CHARNOCK_SMITH_1988, 0.005,
           0.04, section="Wind profile", step=0.001,
           help="Sea roughness z0 = a u*²/g: 0.011 (Smith 1988; Fairall et al. 2003 below 10 m/s) "
                "to 0.018 (Fairall et al. 2003 at 18 m/s)."),
    choice("coefficient_set", "Coefficient set", coef.builtin_names() + ("user",),
           default=coef.DEFAULT_SET,
           labels=tuple(s.label for s in coef.builtin_sets().values()) + ("Your own table (CSV)",),
           section="Coefficient set",
           help="Lift, drag and power coefficients against spin ratio; every set's source is "
                "listed on the page."),
    text("user_coefficients_csv", "Your coefficient table (CSV text)", "", section="Coefficient set",
         help="Columns SR, CL, CD and optionally CP; at least 3 rows with SR increasing."),
    number("user_aspect_ratio", "Aspect ratio of your tested rotor (0 = two-dimensional)", "ratio",
           0.0, 0.0, 50.0, section="Coefficient set",
           help="H/D of the rotor your table was measured on; 0 for two-dimensional data."),
    number("user_end_plate_ratio", "End-plate ratio of your tested rotor", "ratio", 1.0, 1.0, 4.0,
           section="Coefficient set", step=0.1, help="End-plate diameter / rotor diameter; 1 = none."),
    flag("correct_aspect_ratio", "Correct induced drag to this rotor's aspect ratio", True,
         section="Coefficient set",
         help="CD + CL²/(π e)(1/AR_eff,rotor - 1/AR_eff,set) with e = 1 and Hoerner's end-plate "
              "rule for AR_eff; lift is kept."),
    number("max_rpm", "Maximum rotor speed", "rotation", 180.0, 1.0, 1000.0, section="Limits",
           help="The rotor never spins faster than this."),
    number("max_motor_power_w", "Maximum motor power per rotor", "power", 150_000.0, 1000.0, 5.0e6,
           section="Limits", help="Shaft power the drive of one rotor can deliver."),
    number("max_heeling_moment_nm", "Maximum heeling moment (all rotors)", "moment", 6.0e6, 1000.0,
           1.0e9, section="Limits",
           help="Set by the ship's stability assessment; spin is reduced to stay below it."),
    number("max_spin_ratio", "Highest spin ratio to use", "ratio", 5.0, 0.1, 12.0, section="Limits",
           step=0.1, help="The best-spin search stays at or below this and the top of the "
                          "coefficient data."),
    number("propulsive_efficiency", "Propulsive efficiency", "ratio", 0.70, 0.3, 1.0,
           section="Efficiencies", step=0.01,
           help="Thrust power / engine shaft power; about 0.6 to 0.75 for merchant ships "
                "(common practice)."),
    number("electrical_efficiency", "Electrical efficiency of the rotor drive", "ratio", 0.90, 0.5,
           1.0, section="Efficiencies", step=0.01,
           help="Rotor shaft power / electric power drawn from the ship's plant; about 0.85 to "
                "0.95 for motor plus converter (common practice)."),
    number("heel_reference_depth_m", "Heel taken about a point below the waterline", "length",
           0.0, 0.0, 30.0, section="Model details", advanced=True,
           help="Depth below the waterline of the point the heeling moment is taken about: 0 = "
                "the waterline; about half the draught approximates the centre of lateral "
                "resistance (common practice)."),
    integer("strips", "Strips along the rotor height", 10, 1, 200, section="Model details",
            advanced=True, help="The rotor is cut into this many strips of equal height, each "
                                "with its own apparent wind and spin ratio (midpoint rule)."),
)


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
        check_number("rotor spacing", self.rotor_spacing_m, "m", low=0.0)
        if self.rotor_count > 1 and self.rotor_spacing_m < self.diameter_m:
            raise InputError("rotor_spacing_m", f"spacing between rotors must be at least the rotor "
                                                f"diameter {self.diameter_m:g} m when there are "
                                                f"{self.rotor_count} rotors (got {self.rotor_spacing_m:g} m)")

    # --- derived geometry
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
            set_ar = coef.effective_aspect_ratio_hoerner(self.coefficients.aspect_ratio,
                                                         self.coefficients.end_plate_ratio)
            cd = coef.drag_at_aspect_ratio(cl, cd, set_ar, self.effective_aspect_ratio)
        return cl, cd, cp

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
    1 running free, 2 running at a limit. ``flags`` holds the ``FLAG_*`` bits per condition.
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
    Cylinder: turbulent flat-plate friction on the surface speed U = omega R, with the ITTC 1957
    line C_f = 0.075 / (log10 Re - 2)^2 and Re = U pi D / nu (one circumference as the run
    length), P = 0.5 rho C_f U^3 (pi D H). Top end plate (or top cap when there is none): a free
    disc of radius r = max(De, D)/2 wetted on both faces, torque M = 0.5 C_M rho omega^2 r^5 with
    C_M = 0.146 Re_d^-1/5, Re_d = omega r^2 / nu, power M omega. Applying a flat-plate line to a
    rotating surface is an assumption, the disc constant is from memory, and the cross-flow, which
    adds to the real power, is ignored: treat the result as a lower estimate.

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
       (model-ship correlation line).
    .. [2] Schlichting, H. Boundary-Layer Theory, rotating disc in turbulent flow (from memory).
    """
    w = np.abs(np.asarray(omega_rad_s, dtype=float))
    r = 0.5 * diameter_m
    u = w * r
    re = np.maximum(u * math.pi * diameter_m / kinematic_viscosity_m2_s, FRICTION_RE_MIN)
    cf = 0.075 / (np.log10(re) - 2.0) ** 2
    p_cyl = 0.5 * density_kg_m3 * cf * u ** 3 * math.pi * diameter_m * height_m
    rd = 0.5 * diameter_m * max(end_plate_ratio, 1.0)
    re_d = np.maximum(w * rd * rd / kinematic_viscosity_m2_s, FRICTION_RE_MIN)
    cm = DISC_MOMENT_CONSTANT * re_d ** -0.2
    p_disc = 0.5 * cm * density_kg_m3 * w ** 3 * rd ** 5
    return p_cyl + p_disc


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
    """Per-condition wind along the rotor (flattened to N conditions)."""

    ship: np.ndarray          # (N,)
    va: np.ndarray            # (N, S) apparent wind per strip
    sinb: np.ndarray
    cosb: np.ndarray
    q: np.ndarray             # (N, S) dynamic pressure
    side_sign: np.ndarray     # (N,) +1 wind from starboard (or ahead/astern), -1 from port
    va_mid: np.ndarray        # (N,)
    beta_mid: np.ndarray      # (N,) rad
    va_ref: np.ndarray
    beta_ref: np.ndarray


def _wind(setup: RotorSetup, vs, vt, g) -> _Wind:
    z = setup.strip_heights_m
    param = setup.profile_parameter
    vt_z = wind.wind_speed_profile(setup.wind_profile, vt[:, None], setup.reference_height_m, z[None, :], param)
    va, beta = wind.apparent_wind(vs[:, None], vt_z, g[:, None])
    vt_mid = wind.wind_speed_profile(setup.wind_profile, vt, setup.reference_height_m, setup.mid_height_m, param)
    va_mid, beta_mid = wind.apparent_wind(vs, vt_mid, g)
    va_ref, beta_ref = wind.apparent_wind(vs, vt, g)
    side = np.where(np.sin(g) < 0.0, -1.0, 1.0)
    return _Wind(ship=vs, va=va, sinb=np.sin(beta), cosb=np.cos(beta),
                 q=0.5 * setup.air_density_kg_m3 * va * va, side_sign=side, va_mid=va_mid,
                 beta_mid=beta_mid, va_ref=va_ref, beta_ref=beta_ref)


def _evaluate(setup: RotorSetup, w: _Wind, omega):
    """Totals for angular speeds ``omega`` of shape (..., N). Returns a dict of (..., N) arrays."""
    omega = np.asarray(omega, dtype=float)
    r = setup.radius_m
    dz = setup.height_m / setup.strips
    calm = w.va <= CALM_M_S
    va_safe = np.where(calm, 1.0, w.va)
    sr = np.where(calm, 0.0, omega[..., None] * r / va_safe)             # (..., N, S)
    cl, cd, cp = setup.rotor_coefficients(sr)
    strip_area = setup.diameter_m * dz
    dl = w.q * strip_area * cl
    dd = w.q * strip_area * cd
    abs_sin = np.abs(w.sinb)
    thrust = np.sum(dl * abs_sin - dd * w.cosb, axis=-1)
    side_strip = -w.side_sign[:, None] * dl * w.cosb - dd * w.sinb
    side = np.sum(side_strip, axis=-1)
    lever = setup.strip_heights_m + setup.heel_reference_depth_m
    heel = np.sum(side_strip * lever, axis=-1)
    lift = np.sum(dl, axis=-1)
    drag = np.sum(dd, axis=-1)
    if cp is not None:
        power = np.sum(cp * w.q * strip_area * w.va, axis=-1)
    else:
        power = spin_power_skin_friction(omega, setup.diameter_m, setup.height_m, setup.end_plate_ratio,
                                         setup.air_density_kg_m3, setup.kinematic_viscosity_m2_s)
    k = setup.force_factor
    n = setup.rotor_count
    thrust_t = k * thrust
    net = thrust_t * w.ship / setup.propulsive_efficiency - n * power / setup.electrical_efficiency
    return {"thrust": thrust_t, "side": k * side, "heel": k * heel, "lift": k * lift, "drag": k * drag,
            "lift1": lift, "drag1": drag, "power1": power, "net": net, "sr_strip": sr}


def _feasible(setup: RotorSetup, res: dict, rel: float = 1e-9):
    """Within the motor-power and heeling-moment limits (rpm is handled by the search range)."""
    ok_p = res["power1"] <= setup.max_motor_power_w * (1 + rel)
    ok_h = np.abs(res["heel"]) <= setup.max_heeling_moment_nm * (1 + rel)
    return ok_p & ok_h


def _search(setup: RotorSetup, w: _Wind, omega):
    """(net gain, within the motor-power and heel limits) for angular speeds (..., N)."""
    res = _evaluate(setup, w, omega)
    return res["net"], _feasible(setup, res)


def _take(w: _Wind, idx) -> _Wind:
    """The wind of a subset of the conditions."""
    return _Wind(**{name: getattr(w, name)[idx] for name in w.__dataclass_fields__})


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

    Exactly one of ``spin_ratio`` (operating SR at the rotor's mid-height) and ``rpm`` is given;
    both broadcast with the conditions. A spin ratio or rpm of 0 is a stopped rotor.
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
    """For each condition, the spin that maximises the net power gain within the limits.

    Notes
    -----
    The operating spin ratio is searched in [0, SR_top] with SR_top the smallest of the highest
    spin ratio allowed, the top of the coefficient data and the spin ratio of the maximum rpm.
    The motor-power and heeling-moment limits are constraints. All conditions are solved at once
    (no loop over conditions): a grid of ``BEST_GRID_POINTS`` spin ratios per condition gives the
    best grid point that keeps the limits; a bisection locates the limit boundary between the two
    grid points where a limit starts (or stops) binding with the most net gain beside it; a fine
    grid of ``FINE_GRID_POINTS`` between the best grid point's neighbours (cut at that boundary)
    and a golden-section search around the best fine point refine it; the best of these
    candidates is kept. A stopped rotor (SR = 0; its drag as a still
    cylinder is counted) is always allowed and is chosen when no spin pays more.

    Parameters
    ----------
    setup : RotorSetup
    ship_speed_m_s, true_wind_speed_m_s, true_wind_angle_rad : float or ndarray
        Broadcast together; the true wind speed is at ``setup.reference_height_m``.
    progress : callable, optional
        ``progress(fraction, text)`` during long runs.
    """
    shape, (vs, vt, g) = _prepare(ship_speed_m_s, true_wind_speed_m_s, true_wind_angle_rad)
    n = vs.size
    omega = np.empty(n)
    for start in range(0, n, BLOCK):
        sl = slice(start, min(n, start + BLOCK))
        w = _wind(setup, vs[sl], vt[sl], g[sl])
        omega[sl] = _best_omega(setup, w)
        if progress is not None and n > BLOCK:
            progress(min(1.0, sl.stop / n), f"Best spin for {n:,} conditions")
    w = _wind(setup, vs, vt, g)
    res = _evaluate(setup, w, omega)
    rpm_v = omega * _RPM_PER_RAD_S
    sr_op = np.where(w.va_mid > CALM_M_S, omega * setup.radius_m / np.where(w.va_mid > CALM_M_S, w.va_mid, 1.0), 0.0)
    rel = 1e-4
    flags = np.zeros(n, dtype=np.int64)
    running = omega > 0
    flags |= np.where(running & (rpm_v >= setup.max_rpm * (1 - rel)), FLAG_RPM, 0)
    flags |= np.where(running & (res["power1"] >= setup.max_motor_power_w * (1 - rel)), FLAG_MOTOR_POWER, 0)
    flags |= np.where(running & (np.abs(res["heel"]) >= setup.max_heeling_moment_nm * (1 - rel)), FLAG_HEEL, 0)
    flags |= np.where(running & (sr_op >= setup.spin_ratio_limit() * (1 - rel)), FLAG_SPIN_RATIO_LIMIT, 0)
    stopped_heel = np.abs(_evaluate(setup, w, np.zeros(n))["heel"])
    flags |= np.where(stopped_heel > setup.max_heeling_moment_nm, FLAG_HEEL_WHEN_STOPPED, 0)
    at_limit = (flags & (FLAG_RPM | FLAG_MOTOR_POWER | FLAG_HEEL | FLAG_SPIN_RATIO_LIMIT)) != 0
    state = np.where(running, np.where(at_limit, AT_LIMIT, RUNNING), STOPPED)
    within = (res["power1"] <= setup.max_motor_power_w * (1 + 1e-6)) & (
        (np.abs(res["heel"]) <= setup.max_heeling_moment_nm * (1 + 1e-6)) | ~running)
    return _finish(setup, w, omega, res, state, flags, within, shape, mode="best")


def _best_omega(setup: RotorSetup, w: _Wind) -> np.ndarray:
    """Best angular speed for each condition of a block (vectorised search, see best_operation)."""
    r = setup.radius_m
    va = w.va_mid
    calm = va <= CALM_M_S
    va_safe = np.where(calm, 1.0, va)
    omega_top = np.minimum(setup.spin_ratio_limit() * va_safe / r, setup.max_rpm / _RPM_PER_RAD_S)
    omega_top = np.where(calm, 0.0, omega_top)
    k = BEST_GRID_POINTS
    grid = np.linspace(0.0, 1.0, k)[:, None] * omega_top[None, :]        # (K, N)
    net_g, okr = _search(setup, w, grid)
    ok = okr.copy()
    ok[0] = True                                                          # stopping is always allowed
    net = np.where(ok, net_g, -np.inf)
    i_best = np.argmax(net, axis=0)                                      # (N,)
    cols = np.arange(grid.shape[1])
    best_x = grid[i_best, cols]
    best_f = net[i_best, cols]
    # A limit binds between two neighbouring grid points of which one keeps it and the other
    # breaks it; the optimum may sit on that boundary. Take the crossing whose feasible side has
    # the most net gain and bisect it (feasible side kept).
    net_r = np.where(okr, net_g, -np.inf)
    up = okr[:-1] & ~okr[1:]                                              # keeps at i, breaks at i+1
    down = ~okr[:-1] & okr[1:]                                            # breaks at i, keeps at i+1
    score = np.concatenate([np.where(up, net_r[:-1], -np.inf), np.where(down, net_r[1:], -np.inf)])
    pick = np.argmax(score, axis=0)
    has_edge = np.isfinite(score[pick, cols])
    is_up = pick < k - 1
    i_t = np.where(is_up, pick, pick - (k - 1))                           # crossing between i_t, i_t+1
    keep_x = np.where(is_up, grid[i_t, cols], grid[np.minimum(i_t + 1, k - 1), cols])
    break_x = np.where(is_up, grid[np.minimum(i_t + 1, k - 1), cols], grid[i_t, cols])
    edge = keep_x.copy()
    sub = np.flatnonzero(has_edge)
    if sub.size:
        ws = _take(w, sub)
        a, b = keep_x[sub], break_x[sub]
        for _ in range(BOUNDARY_STEPS):
            m = 0.5 * (a + b)
            fm = _search(setup, ws, m)[1]
            a = np.where(fm, m, a)
            b = np.where(fm, b, m)
        edge[sub] = a
    # bracket around the best grid point, cut at the boundary where a neighbour breaks a limit
    i_lo = np.maximum(i_best - 1, 0)
    i_hi = np.minimum(i_best + 1, k - 1)
    hi_edge = has_edge & is_up & (i_t == i_best)
    lo_edge = has_edge & ~is_up & (i_t + 1 == i_best)
    lo = np.where(okr[i_lo, cols], grid[i_lo, cols], np.where(lo_edge, edge, best_x))
    hi = np.where(okr[i_hi, cols], grid[i_hi, cols], np.where(hi_edge, edge, best_x))
    # fine grid in the bracket (the net gain can have several small bumps near its top) ...
    fine = lo + np.linspace(0.0, 1.0, FINE_GRID_POINTS)[:, None] * (hi - lo)
    net_f, ok_f = _search(setup, w, fine)
    net_f = np.where(ok_f | (fine == 0.0), net_f, -np.inf)
    j = np.argmax(net_f, axis=0)
    fine_x, fine_f = fine[j, cols], net_f[j, cols]
    a = fine[np.maximum(j - 1, 0), cols]
    b = fine[np.minimum(j + 1, FINE_GRID_POINTS - 1), cols]
    # ... then golden-section maximisation between the best fine point's neighbours
    c = b - _GOLDEN * (b - a)
    d = a + _GOLDEN * (b - a)
    fc = _search(setup, w, c)[0]
    fd = _search(setup, w, d)[0]
    for _ in range(GOLDEN_STEPS):
        left = fc >= fd
        b = np.where(left, d, b)
        a = np.where(left, a, c)
        new = np.where(left, b - _GOLDEN * (b - a), a + _GOLDEN * (b - a))
        fnew = _search(setup, w, new)[0]
        fc, fd = np.where(left, fnew, fd), np.where(left, fc, fnew)
        c, d = np.where(left, new, d), np.where(left, c, new)
    x_g = 0.5 * (a + b)
    candidates = np.stack([best_x, fine_x, x_g, edge])                   # (4, N)
    net_c, ok_c = _search(setup, w, candidates)
    f_c = np.where(ok_c | (candidates == 0.0), net_c, -np.inf)
    jc = np.argmax(f_c, axis=0)
    x = candidates[jc, cols]
    f = f_c[jc, cols]
    x = np.where(f >= np.maximum(best_f, fine_f), x, np.where(fine_f > best_f, fine_x, best_x))
    return np.where(calm, 0.0, x)


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
    spin_dir = np.where(running, -w.side_sign, 0.0)
    power_t = setup.rotor_count * res["power1"]
    warnings = _warnings(setup, w, omega, res, sr_op, re, flags, mode, n)

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
    )


# ============================================================================ warnings
def _count(mask, n) -> str:
    k = int(np.count_nonzero(mask))
    return "" if n == 1 else f" (in {k:,} of {n:,} conditions)"


def _warnings(setup: RotorSetup, w: _Wind, omega, res, sr_op, re, flags, mode, n) -> tuple:
    out: list[ModelWarning] = []
    cs = setup.coefficients
    running = omega > 0
    lo, hi = cs.sr_range
    m = (flags & FLAG_SR_OUTSIDE_DATA) != 0
    if m.any():
        sr = res["sr_strip"][m]
        out.append(ModelWarning(
            "spin_ratio_outside_data",
            f"Spin ratio along the rotor reaches {sr.min():.2f} to {sr.max():.2f}, outside the "
            f"data of the set ({lo:g} to {hi:g}): coefficients are held at the end of the data "
            f"there{_count(m, n)}.", "spin_ratio"))
    m = (flags & FLAG_RE_OUTSIDE_DATA) != 0
    if m.any():
        r_lo, r_hi = cs.reynolds_range
        out.append(ModelWarning(
            "reynolds_outside_data",
            f"Reynolds number {re[m].min():.2g} to {re[m].max():.2g} is outside the data of the "
            f"set ({r_lo:.2g} to {r_hi:.2g}): coefficients measured at another scale{_count(m, n)}.",
            "lift_coefficient"))
    if cs.two_dimensional:
        if setup.correct_aspect_ratio:
            out.append(ModelWarning(
                "two_dimensional_data",
                f"The set is two-dimensional: induced drag CL²/(π·{setup.effective_aspect_ratio:.2f}) "
                "for this rotor's effective aspect ratio is added (lifting-line estimate).",
                "drag_coefficient"))
        else:
            out.append(ModelWarning(
                "two_dimensional_data",
                "The set is two-dimensional and no induced drag is added: forces of an endless "
                "rotor, too optimistic for a real one.", "drag_coefficient"))
    else:
        ratio = setup.aspect_ratio / cs.aspect_ratio
        if not 1 / ASPECT_RATIO_TOLERANCE <= ratio <= ASPECT_RATIO_TOLERANCE:
            fix = ("its induced drag is moved to this rotor's (lift unchanged)" if setup.correct_aspect_ratio
                   else "no correction applied")
            out.append(ModelWarning(
                "aspect_ratio_unlike_data",
                f"Aspect ratio H/D = {setup.aspect_ratio:.2f} is unlike the tested rotor's "
                f"{cs.aspect_ratio:g} (more than ×{ASPECT_RATIO_TOLERANCE:g} apart): {fix}.",
                "drag_coefficient"))
    if abs(setup.end_plate_ratio - cs.end_plate_ratio) > END_PLATE_TOLERANCE:
        out.append(ModelWarning(
            "end_plates_unlike_data",
            f"End-plate ratio {setup.end_plate_ratio:g} is unlike the tested rotor's "
            f"{cs.end_plate_ratio:g}: end plates change the lift of a rotor strongly and the set's "
            "lift is used unchanged.", "lift_coefficient"))
    m = (flags & FLAG_WIND_TOO_FAR_FORWARD) != 0
    if m.any():
        lim = math.degrees(setup.forward_angle_limit_rad())
        ang = np.abs(np.degrees(w.beta_mid[m]))
        out.append(ModelWarning(
            "apparent_wind_too_far_forward",
            f"Apparent wind {ang.min():.0f}° to {ang.max():.0f}° off the bow is within {lim:.0f}° "
            f"of the bow, where no spin ratio of the set gives forward thrust (best lift/drag "
            f"{1 / math.tan(math.radians(lim)):.1f}){_count(m, n)}.", "thrust_n"))
    verb = "limited by" if mode == "best" else "above"
    m = (flags & FLAG_RPM) != 0
    if m.any():
        out.append(ModelWarning("rpm_limit", f"Spin {verb} the maximum rotor speed "
                                             f"{setup.max_rpm:g} rpm{_count(m, n)}.", "rpm"))
    m = (flags & FLAG_MOTOR_POWER) != 0
    if m.any():
        out.append(ModelWarning("motor_power_limit", f"Spin {verb} the maximum motor power "
                                                     f"{setup.max_motor_power_w / 1000:g} kW per rotor{_count(m, n)}.",
                                "spin_power_w"))
    m = (flags & FLAG_HEEL) != 0
    if m.any():
        what = "Spin limited by" if mode == "best" else "Heeling moment above"
        out.append(ModelWarning("heel_limit", f"{what} the heeling-moment limit "
                                              f"{setup.max_heeling_moment_nm / 1000:,.0f} kN·m{_count(m, n)}"
                                              + ("." if mode == "best" else ": reduce spin."),
                                "heeling_moment_nm"))
    m = (flags & FLAG_HEEL_WHEN_STOPPED) != 0
    if m.any():
        out.append(ModelWarning("heel_above_limit_when_stopped",
                                f"Even the stopped rotors heel the ship more than the limit "
                                f"{setup.max_heeling_moment_nm / 1000:,.0f} kN·m{_count(m, n)}.",
                                "heeling_moment_nm"))
    m = (flags & FLAG_SPIN_RATIO_LIMIT) != 0
    if m.any():
        out.append(ModelWarning("spin_ratio_limit",
                                f"Spin stopped at the highest spin ratio allowed, "
                                f"{setup.spin_ratio_limit():g} (input or top of the data){_count(m, n)}.",
                                "spin_ratio"))
    if mode == "best":
        m = ~running & (w.va_mid > CALM_M_S)
        if m.any():
            out.append(ModelWarning("rotor_stopped",
                                    "Rotor stopped: no spin gives more net gain than the still "
                                    f"cylinder, whose drag is still counted{_count(m, n)}.",
                                    "net_power_w"))
    if not cs.has_power:
        out.append(ModelWarning("spin_power_from_friction_model",
                                "The set has no power coefficient: spin power from a skin-friction "
                                "model (ITTC 1957 line on the surface speed plus a disc end plate; "
                                "a lower estimate that ignores the cross-flow).", "spin_power_w"))
    if setup.rotor_count > 1:
        out.append(ModelWarning("rotor_interaction_assumed",
                                f"{setup.rotor_count} rotors with interaction factor "
                                f"{setup.interaction_factor:g} (assumed, not computed): forces are "
                                f"{setup.force_factor:g} times one rotor's.", "thrust_n"))
        offset = setup.rotor_spacing_m * np.abs(np.sin(w.beta_mid))
        m = (offset < setup.diameter_m) & (w.va_mid > CALM_M_S)
        if m.any():
            out.append(ModelWarning("rotors_in_each_others_wake",
                                    "With the apparent wind this close to the ship's axis the rotors "
                                    f"stand in each other's wake (offset across the wind "
                                    f"{offset[m].min():.1f} m < diameter {setup.diameter_m:g} m): "
                                    f"the interaction factor matters here{_count(m, n)}.", "thrust_n"))
    if (w.ship <= 0).any():
        m = w.ship <= 0
        out.append(ModelWarning("zero_ship_speed", "At zero ship speed thrust saves no engine power: "
                                                   f"the net gain is only the spin power drawn{_count(m, n)}.",
                                "net_power_w"))
    m = w.va_mid <= CALM_M_S
    if m.any():
        out.append(ModelWarning("calm", f"No apparent wind: no forces{_count(m, n)}.", "thrust_n"))
    return tuple(out)


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


# ============================================================================ from inputs
def coefficient_set_from_inputs(values: dict, coefficient_table=None) -> coef.CoefficientSet:
    """The coefficient set the inputs name; ``user`` reads ``coefficient_table`` (a DataFrame or
    CSV text) or else the ``user_coefficients_csv`` input."""
    name = values.get("coefficient_set", coef.DEFAULT_SET)
    if name != "user":
        return coef.coefficient_set(name)
    ar = values.get("user_aspect_ratio", 0.0)
    data = coefficient_table if coefficient_table is not None else values.get("user_coefficients_csv", "")
    return coef.user_coefficient_set(data, source="your coefficient table",
                                     aspect_ratio=math.inf if not ar else ar,
                                     end_plate_ratio=values.get("user_end_plate_ratio", 1.0),
                                     label="Your own table")


def setup_from_inputs(values: dict, coefficient_table=None) -> RotorSetup:
    """A :class:`RotorSetup` from validated rotor-study input values (core units).

    Missing keys take the defaults of :data:`ROTOR_FIELDS`; the air state comes from the air
    inputs (:func:`liftcore.air.air_inputs`) when present, else the ISA at sea level.
    """
    from liftcore.air import air_state_from_inputs

    v = {f.key: f.default for f in ROTOR_FIELDS}
    v.update(values)
    air = air_state_from_inputs(v)
    profile = v["wind_profile"]
    param = {"power": v["power_law_exponent"], "log": v["charnock_constant"]}.get(profile, 0.0)
    return RotorSetup(
        diameter_m=float(v["diameter_m"]), height_m=float(v["height_m"]),
        base_height_m=float(v["base_height_m"]), end_plate_ratio=float(v["end_plate_ratio"]),
        rotor_count=int(v["rotor_count"]), interaction_factor=float(v["interaction_factor"]),
        coefficients=coefficient_set_from_inputs(v, coefficient_table),
        wind_profile=profile, reference_height_m=float(v["reference_height_m"]),
        profile_parameter=float(param), air_density_kg_m3=air.density_kg_m3,
        kinematic_viscosity_m2_s=air.kinematic_viscosity_m2_s, max_rpm=float(v["max_rpm"]),
        max_motor_power_w=float(v["max_motor_power_w"]),
        max_heeling_moment_nm=float(v["max_heeling_moment_nm"]),
        propulsive_efficiency=float(v["propulsive_efficiency"]),
        electrical_efficiency=float(v["electrical_efficiency"]), strips=int(v["strips"]),
        max_spin_ratio=float(v["max_spin_ratio"]), correct_aspect_ratio=bool(v["correct_aspect_ratio"]),
        first_rotor_x_m=float(v["first_rotor_x_m"]), rotor_spacing_m=float(v["rotor_spacing_m"]),
        heel_reference_depth_m=float(v["heel_reference_depth_m"]))


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
