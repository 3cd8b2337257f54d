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
from scipy.interpolate import PchipInterpolator

from liftcore import coefficients as coef
from liftcore import wind
from liftcore.errors import InputError, check_choice, check_number, check_positive
from liftcore.inputs import Field, choice, flag, integer, number, text
from liftcore.validity import ModelWarning, quantity_warning

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
#: and torque M = 0.5 C_M rho omega^2 r^5. Published in the equivalent form M = 0.073 rho omega^2
#: r^5 Re^-1/5 for both faces (1/7-power-law boundary layer) in the textbook exercise "Friction
#: factor for a rotating disk" (problem text quoted at crazyforstudy.com/q-and-a/...-1339844;
#: that it is from Bird, Stewart & Lightfoot, Transport Phenomena, and goes back to von Karman
#: 1921 as given in Schlichting, Boundary-Layer Theory, is from memory).
DISC_MOMENT_CONSTANT = 0.146
#: Smallest Reynolds number used in the ITTC 1957 line (below it laminar flow that the line does
#: not describe; the power there is negligible anyway). Morrall's tables of the line (1970, NPL
#: Ship Report 142) were first computed for Re = 1e5 to 1e9.
FRICTION_RE_MIN = 1.0e5

#: Best-spin search (see :func:`best_operation`). Grid points over the whole spin range.
BEST_GRID_POINTS = 25
#: A maximum or a limit boundary is located to this fraction of the top of the spin range.
BEST_SPIN_XTOL = 1e-9
#: Net gains closer than this fraction of the largest |net gain| on the grid count as equal (a
#: bump predicted to rise less is not pursued).
BEST_SPIN_FTOL = 1e-11
#: A limit boundary is also taken as found where the limit margin is within this of zero.
BOUNDARY_MARGIN_TOL = 1e-12
#: Safety factor on the bound of what bends at table points add between grid points (it leaves
#: out fourth- and higher-order terms and the cubic's error on the smooth part).
BUMP_BOUND_FACTOR = 2.0
#: Largest error of the cubic through the values and slopes at 0 and 1 when the function is
#: (x - x0)_+^k / k! for some x0 in [0, 1], k = 1, 2, 3 (4/27 and 1/192 exactly, the middle one
#: rounded up; found numerically, checked by a test).
HERMITE_KINK_ERROR = (4.0 / 27.0, 1.0 / 61.9, 1.0 / 192.0)
#: Most points sampled inside one cell (only very fine user tables reach it).
BREAKPOINTS_MAX = 64
#: Safeguards on the iterations (each halves its bracket at least every second step).
BOUNDARY_STEPS_MAX = 100
REFINE_STEPS_MAX = 100
#: Conditions solved together (bounds the memory of one call), and strip evaluations per array
#: operation in the search (keeps the temporaries in the processor's cache).
BLOCK = 2048
CHUNK_ELEMENTS = 32768

#: Thresholds of the "unlike the tested rotor" warnings (our choice, not from a source).
ASPECT_RATIO_TOLERANCE = 1.5     # warn when H/D differs from the set's by more than this factor
END_PLATE_TOLERANCE = 0.25       # warn when De/D differs from the set's by more than this
#: Apparent wind speeds below this are treated as calm (rotor stopped, no forces). [m/s]
CALM_M_S = 1e-6

#: Relative slack on the motor-power and heel limits (rounding), as in :func:`_feasible`.
_LIMIT_REL = 1e-9
#: Largest look-up table for the pieces of a coefficient table with uneven spin-ratio steps.
_LOOKUP_CELLS_MAX = 100_000
#: Relative offset of the two points placed either side of a slope jump (where a strip's spin
#: ratio leaves the table); well above rounding (1e-16), far below the search tolerance.
_KINK_SPLIT = 1e-12
#: A limit boundary is placed this far (relative to the limit) on the keeping side, so that the
#: rounding of a later evaluation (sums taken in another order) cannot put it outside.
_MARGIN_ROUNDING = 1e-13
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
    text("user_coefficients_csv", "Your coefficient table (CSV text)", "", section="Coefficient set", lines=7,
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

#: Which of :data:`ROTOR_FIELDS` matter for given values (``InputSpec.with_rules``).
ROTOR_SHOW_IF = {
    "power_law_exponent": lambda v: v["wind_profile"] == "power",
    "charnock_constant": lambda v: v["wind_profile"] == "log",
    "rotor_spacing_m": lambda v: v["rotor_count"] > 1,
    "interaction_factor": lambda v: v["rotor_count"] > 1,
    "user_coefficients_csv": lambda v: v["coefficient_set"] == "user",
    "user_aspect_ratio": lambda v: v["coefficient_set"] == "user",
    "user_end_plate_ratio": lambda v: v["coefficient_set"] == "user",
}


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
    return _skin_friction(omega_rad_s, diameter_m, height_m, end_plate_ratio, density_kg_m3,
                          kinematic_viscosity_m2_s)[0]


def _skin_friction(omega_rad_s, diameter_m, height_m, end_plate_ratio, density_kg_m3,
                   kinematic_viscosity_m2_s, slope=False):
    """(power [W], d(power)/d(omega) [W s] or None) of :func:`spin_power_skin_friction`.

    Each part is a power of omega times the ITTC 1957 line or the disc's Re^-1/5 law, so the
    slope is P/omega times 3 - 2/((log10 Re - 2) ln 10) (cylinder) or 2.8 (disc); 3 for both
    where the Reynolds number is held at ``FRICTION_RE_MIN``.
    """
    w = np.abs(np.asarray(omega_rad_s, dtype=float))
    r = 0.5 * diameter_m
    u = w * r
    re_raw = u * math.pi * diameter_m / kinematic_viscosity_m2_s
    lg = np.log10(np.maximum(re_raw, FRICTION_RE_MIN)) - 2.0
    cf = 0.075 / lg ** 2
    p_cyl = 0.5 * density_kg_m3 * cf * u ** 3 * math.pi * diameter_m * height_m
    rd = 0.5 * diameter_m * max(end_plate_ratio, 1.0)
    red_raw = w * rd * rd / kinematic_viscosity_m2_s
    cm = DISC_MOMENT_CONSTANT * np.maximum(red_raw, FRICTION_RE_MIN) ** -0.2
    p_disc = 0.5 * cm * density_kg_m3 * w ** 3 * rd ** 5
    if not slope:
        return p_cyl + p_disc, None
    e_cyl = np.where(re_raw > FRICTION_RE_MIN, 3.0 - 2.0 / (lg * math.log(10.0)), 3.0)
    e_disc = np.where(red_raw > FRICTION_RE_MIN, 2.8, 3.0)
    safe = np.where(w > 0.0, w, 1.0)
    return p_cyl + p_disc, np.where(w > 0.0, (e_cyl * p_cyl + e_disc * p_disc) / safe, 0.0)


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


def _wind_part(w: _Wind, part) -> _Wind:
    """The wind of some of the conditions (a slice gives views)."""
    return _Wind(**{name: getattr(w, name)[part] for name in w.__dataclass_fields__})


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
    The motor-power and heeling-moment limits are constraints; a stopped rotor (SR = 0; its drag
    as a still cylinder is counted) is always allowed and is chosen when no spin pays more. All
    conditions are solved together (no loop over conditions).

    Along the spin the net gain is smooth except where a strip's spin ratio crosses a point of
    the coefficient table: the monotone cubic's curvature jumps there, and near the top of the
    net gain such bends make close local maxima. The search:

    1. evaluates the net gain and its slope on ``BEST_GRID_POINTS`` spins (the table's cubic
       pieces are looked up directly, with their slopes);
    2. keeps the grid cells where the cubic through the cell's ends (values and slopes), plus
       ``BUMP_BOUND_FACTOR`` times a bound on what the bends crossed inside can add (from the
       sharpest jumps of the table's derivatives), may rise above the best grid point that
       keeps the limits; adds stretches that keep the limits between grid points that break
       them (a heeling moment that falls and rises again: the limit margin is minimised);
    3. where a limit starts binding inside a cell, finds the boundary (Newton steps on the limit
       margin, safeguarded) and keeps the part of the cell within the limits;
    4. evaluates the net gain and its slope at every crossing inside those cells, so that each
       sub-interval is smooth, and refines the sub-interval whose cubic peaks highest (cubic
       interpolation steps safeguarded by bisection) to ``BEST_SPIN_XTOL`` of the spin range or
       until the predicted rise is below ``BEST_SPIN_FTOL`` of the largest |net gain|;
    5. keeps the best of all points met that keep the limits.

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
    pieces = _Pieces(setup.coefficients)
    w = _wind(setup, vs, vt, g)
    for start in range(0, n, BLOCK):
        sl = slice(start, min(n, start + BLOCK))
        report = None
        if progress is not None and n > BLOCK:
            def report(part, start=start, stop=sl.stop):
                progress(min(1.0, (start + part * (stop - start)) / n), f"Best spin for {n:,} conditions")
        omega[sl] = _best_omega(setup, _wind_part(w, sl), pieces, report)
        if report is not None:
            report(1.0)
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


# ============================================================================ best-spin search
class _Pieces:
    """A coefficient set's monotone cubic pieces with their slopes, for the best-spin search.

    The same PCHIP as :meth:`liftcore.coefficients.CoefficientSet.evaluate` (built from the set's
    table), evaluated by looking up the piece and a cubic in the distance from its start: one
    gather of the piece's coefficients per point instead of an interpolator call, and the slope
    d(C)/d(SR) almost for free. Two more pieces, constant, hold the end values below and above
    the table (slope 0 there). A test compares both.
    """

    def __init__(self, cs: coef.CoefficientSet):
        x = np.asarray(cs.spin_ratio, dtype=float)
        cols = [cs.lift, cs.drag] + ([cs.power] if cs.has_power else [])
        y = np.column_stack([np.asarray(c, dtype=float) for c in cols])
        pp = PchipInterpolator(x, y, axis=0)
        m = x.size
        self.x = x
        self.lo, self.hi = float(x[0]), float(x[-1])
        self.columns = len(cols)
        # pieces: 0 held below the table, 1 .. m-1 the table's, m held above it
        c = np.zeros((4, m + 1, len(cols)))
        c[:, 1:m] = pp.c
        c[3, 0], c[3, m] = y[0], y[-1]
        # row 4 j + k: coefficient of t^(3-k) of column j (CL, CD, CP), t = SR - start of the piece
        self.table = np.ascontiguousarray(c.transpose(2, 0, 1).reshape(4 * len(cols), m + 1))
        self.start = np.concatenate([[x[0]], x])                     # where each piece starts
        self.bounds = np.concatenate([[-np.inf], x, [np.inf]])       # ... and ends (next start)
        step = np.diff(x)
        self.uniform = bool(np.all(np.abs(step - step[0]) <= 1e-12 * step[0]))
        self.step = float(step[0])
        cell = self.step if self.uniform else 0.5 * float(step.min())
        self.inv_cell = 1.0 / cell
        self.lut = None
        cells = int(math.ceil((self.hi - self.lo) / cell)) + 1
        if not self.uniform and cells <= _LOOKUP_CELLS_MAX:
            # piece at the start of each look-up cell; a cell is at most half a piece wide, so it
            # holds at most one knot and one comparison each way finds the piece of any point
            start = self.lo + np.arange(cells) * cell
            self.lut = np.searchsorted(x, start, side="right")
        self._bends(pp)

    def _bends(self, pp):
        """How sharply the curves bend at the table points, for :func:`_bend_bound`: ``sharpest[k]``
        is the largest |jump| of the k-th derivative (k = 1, 2, 3) of CL, CD, (CP,) and of CL^2 (the
        part CD' = CD + kar CL^2 adds) over the table points. First derivatives jump only where the
        values are held beyond the table.
        """
        x, c = self.x, pp.c                                          # c: (4, pieces, columns)
        h = np.diff(x)[:, None]
        m = x.size
        cols = c.shape[2]
        right = np.zeros((4, m, cols))                               # one-sided derivatives 1..3
        left = np.zeros((4, m, cols))
        right[1, :-1], right[2, :-1], right[3, :-1] = c[2], 2.0 * c[1], 6.0 * c[0]
        left[1, 1:] = (3.0 * c[0] * h + 2.0 * c[1]) * h + c[2]
        left[2, 1:] = 6.0 * c[0] * h + 2.0 * c[1]
        left[3, 1:] = 6.0 * c[0]
        if self.lo <= 0.0:                                           # no held stretch below the table
            left[:, 0] = right[:, 0]
        jump = np.abs(right - left)
        end = (((c[0, -1] * h[-1] + c[1, -1]) * h[-1] + c[2, -1]) * h[-1] + c[3, -1])[None]
        cl = np.abs(np.vstack([c[3], end])[:, 0])
        cl1 = np.maximum(np.abs(right[1, :, 0]), np.abs(left[1, :, 0]))
        cl2 = np.maximum(np.abs(right[2, :, 0]), np.abs(left[2, :, 0]))
        # bounds on the jumps of the derivatives of CL^2: D(CL^2) = 2 CL D(CL),
        # D2(CL^2) = 2 (D(CL)^2 + CL D2(CL)), D3(CL^2) = 2 (3 D(CL) D2(CL) + CL D3(CL))
        sq = {1: 2.0 * cl * jump[1, :, 0],
              2: 2.0 * (2.0 * cl1 * jump[1, :, 0] + cl * jump[2, :, 0]),
              3: 2.0 * (3.0 * (cl1 * jump[2, :, 0] + cl2 * jump[1, :, 0]) + cl * jump[3, :, 0])}
        self.sharpest = {k: np.append(jump[k].max(axis=0), sq[k].max()) for k in (1, 2, 3)}
        self.min_step = float(np.diff(x).min())

    def piece(self, s):
        """Piece holding each spin ratio ``s`` and the distance from the piece's start."""
        if self.uniform:
            k = s * self.inv_cell
            k += 1.0 - self.lo * self.inv_cell
            i = k.astype(np.intp)
            np.clip(i, 0, self.x.size, out=i)
            t = s - (self.lo - self.step)
            t -= i * self.step
            return i, t
        if self.lut is not None:
            k = np.clip(((s - self.lo) * self.inv_cell).astype(np.intp), 0, self.lut.size - 1)
            i = self.lut[k]
            i += s >= self.bounds[i + 1]
            i -= s < self.bounds[i]
        else:
            i = np.searchsorted(self.x, s, side="right")
        return i, s - self.start[i]

    def __call__(self, spin_ratio, slopes: bool = True):
        """([CL, CD(, CP)], [their slopes] or None) at ``spin_ratio``."""
        i, t = self.piece(spin_ratio)
        c = np.take(self.table, i, axis=1)
        values, derivs = [], []
        t3 = 3.0 * t if slopes else None
        for j in range(self.columns):
            a3, a2, a1, a0 = c[4 * j], c[4 * j + 1], c[4 * j + 2], c[4 * j + 3]
            v = a3 * t
            v += a2
            if slopes:
                dv = a3 * t3
                dv += a2
                dv += a2
                dv *= t
                dv += a1
                derivs.append(dv)
            v *= t
            v += a1
            v *= t
            v += a0
            values.append(v)
        return values, (derivs if slopes else None)

    def knots_inside(self, low, high):
        """Indices of the first table point above ``low`` and of the last one below ``high``."""
        if self.uniform:
            first = np.floor((low - self.lo) * self.inv_cell).astype(np.intp) + 1
            last = np.ceil((high - self.lo) * self.inv_cell).astype(np.intp) - 1
            return np.maximum(first, 0), np.minimum(last, self.x.size - 1)
        return (np.searchsorted(self.x, low, side="right"), np.searchsorted(self.x, high, side="left") - 1)


def _skin_friction_power_and_slope(setup: RotorSetup, omega):
    """:func:`spin_power_skin_friction` for this rotor and its derivative d(P)/d(omega). [W], [W s]"""
    return _skin_friction(omega, setup.diameter_m, setup.height_m, setup.end_plate_ratio,
                          setup.air_density_kg_m3, setup.kinematic_viscosity_m2_s, slope=True)


def _skin_friction_kinks(setup: RotorSetup):
    """Where the skin-friction model's slope jumps: the Reynolds number of the cylinder or of
    the end plate reaches ``FRICTION_RE_MIN`` (held below it). Returns (omega [rad/s], |jump of
    d(P)/d(omega)| [W s]) for the two parts; empty when the set has a power coefficient.

    Below the point a part grows as omega^3; above it the cylinder's slope factor is
    3 - 2/((log10 Re - 2) ln 10) and the disc's 2.8 (see :func:`_skin_friction_power_and_slope`),
    so the slope drops by P/omega times 2/((log10 Re_min - 2) ln 10), or 0.2.
    """
    if setup.coefficients.has_power:
        return np.empty(0), np.empty(0)
    d, nu, rho = setup.diameter_m, setup.kinematic_viscosity_m2_s, setup.air_density_kg_m3
    r, rd = 0.5 * d, 0.5 * d * max(setup.end_plate_ratio, 1.0)
    lg = math.log10(FRICTION_RE_MIN) - 2.0
    w_cyl, w_disc = FRICTION_RE_MIN * nu / (math.pi * d * r), FRICTION_RE_MIN * nu / (rd * rd)
    p_cyl = 0.5 * rho * (0.075 / lg ** 2) * (w_cyl * r) ** 3 * math.pi * d * setup.height_m
    p_disc = 0.5 * DISC_MOMENT_CONSTANT * FRICTION_RE_MIN ** -0.2 * rho * w_disc ** 3 * rd ** 5
    jump = [p_cyl * 2.0 / (lg * math.log(10.0)) / w_cyl, 0.2 * p_disc / w_disc]
    return np.array([w_cyl, w_disc]), np.array(jump)


@dataclass(frozen=True)
class _SpinProblem:
    """Net gain, heel and spin power of many conditions as functions of the angular speed omega,
    with everything that does not depend on omega worked out once.

    Arrays are (strips, conditions). The spin ratio of a strip is omega u. Per strip, net gain =
    wl CL + wd CD' - (rotors / electrical efficiency) pp CP, heeling moment = hl CL + hd CD', spin
    power of one rotor = pp CP (or the skin-friction model of omega), with CD' = CD + kar CL^2 the
    drag moved to this rotor's aspect ratio (kar = 0 without that correction): the sums of
    :func:`_evaluate`, rearranged.
    """

    u: np.ndarray
    wl: np.ndarray
    wd: np.ndarray
    hl: np.ndarray
    hd: np.ndarray
    pp: np.ndarray | None
    kar: float
    power_weight: float             # net gain per watt of shaft power of one rotor (negative)
    inv_max_power: float            # 1 / motor-power limit (with a rounding slack) [1/W]
    inv_max_heel: float             # 1 / heeling-moment limit (with a rounding slack) [1/(N m)]

    def take(self, idx) -> "_SpinProblem":
        """The problem of some of the conditions (index array, mask or slice)."""
        kw = {}
        for name in self.__dataclass_fields__:
            v = getattr(self, name)
            kw[name] = v[:, idx] if isinstance(v, np.ndarray) else v
        return _SpinProblem(**kw)


def _spin_problem(setup: RotorSetup, w: _Wind) -> _SpinProblem:
    cs = setup.coefficients
    va = w.va.T
    calm = va <= CALM_M_S
    u = np.where(calm, 0.0, setup.radius_m / np.where(calm, 1.0, va))
    k = setup.force_factor
    qa = w.q.T * (setup.diameter_m * setup.height_m / setup.strips)
    gain = k * w.ship / setup.propulsive_efficiency
    sinb, cosb = w.sinb.T, w.cosb.T
    lever = (setup.strip_heights_m + setup.heel_reference_depth_m)[:, None]
    kar = 0.0
    if setup.correct_aspect_ratio:
        set_ar = coef.effective_aspect_ratio_hoerner(cs.aspect_ratio, cs.end_plate_ratio)
        kar = float((1.0 / setup.effective_aspect_ratio - 1.0 / set_ar) / (math.pi * coef.SPAN_EFFICIENCY))
    wl, wd = gain * qa * np.abs(sinb), -gain * qa * cosb
    hl, hd = -k * w.side_sign * qa * cosb * lever, -k * qa * sinb * lever
    pp = qa * va if cs.has_power else None
    if u.shape[0] > 1 and np.all(u == u[:1]):
        # one apparent wind all along (uniform profile): the strips' coefficients are the same,
        # so their weights add up and one strip does the work of all
        u, wl, wd, hl, hd = (v.sum(axis=0, keepdims=True) if v is not u else v[:1] for v in (u, wl, wd, hl, hd))
        pp = None if pp is None else pp.sum(axis=0, keepdims=True)
    c = np.ascontiguousarray
    return _SpinProblem(u=c(u), wl=c(wl), wd=c(wd), hl=c(hl), hd=c(hd),
                        pp=None if pp is None else c(pp), kar=kar,
                        power_weight=-setup.rotor_count / setup.electrical_efficiency,
                        inv_max_power=1.0 / (setup.max_motor_power_w * (1 + _LIMIT_REL)),
                        inv_max_heel=1.0 / (setup.max_heeling_moment_nm * (1 + _LIMIT_REL)))


def _spin_values(setup: RotorSetup, pieces: _Pieces, prob: _SpinProblem, omega, slopes=True):
    """(net gain [W], slope or None, limit margin) at angular speeds ``omega`` of shape (..., N):
    the numbers of :func:`_evaluate`, fewer of them. The limit margin max(P / P_max,
    |M_heel| / M_max) - 1 is <= 0 where both limits are kept. ``slopes``: True for d(net
    gain)/d(omega) [W s], ``"margin"`` for d(margin)/d(omega) [s], False for none."""
    omega = np.asarray(omega, dtype=float)
    ex = (slice(None),) + (None,) * (omega.ndim - 1)
    u = prob.u[ex]
    sr = u * omega                                                   # (strips, ..., N)
    values, derivs = pieces(sr, bool(slopes))
    cl, cd = values[0], values[1]
    if prob.kar:
        cd += prob.kar * (cl * cl)
    wl, wd = prob.wl[ex], prob.wd[ex]
    f = wl * cl
    f += wd * cd
    heel = prob.hl[ex] * cl
    heel += prob.hd[ex] * cd
    heel = heel.sum(axis=0)
    if prob.pp is not None:
        strip_power = prob.pp[ex] * values[2]
        f += prob.power_weight * strip_power
        power = strip_power.sum(axis=0)
        net = f.sum(axis=0)
    else:
        power, power_slope = _skin_friction_power_and_slope(setup, omega)
        net = f.sum(axis=0)
        net += prob.power_weight * power
    by_power = power * prob.inv_max_power
    by_heel = np.abs(heel) * prob.inv_max_heel
    margin = np.maximum(by_power, by_heel) - 1.0
    if not slopes:
        return net, None, margin
    dcl, dcd = derivs[0], derivs[1]
    if prob.kar:
        dcd += (2.0 * prob.kar) * (cl * dcl)
    if slopes == "margin":                                           # slope of the binding limit
        dh = prob.hl[ex] * dcl
        dh += prob.hd[ex] * dcd
        dh *= u
        dheel = np.copysign(dh.sum(axis=0), heel) * prob.inv_max_heel
        if prob.pp is not None:
            dpower = (prob.pp[ex] * derivs[2] * u).sum(axis=0)
        else:
            dpower = power_slope
        return net, np.where(by_power >= by_heel, dpower * prob.inv_max_power, dheel), margin
    g = wl * dcl
    g += wd * dcd
    if prob.pp is not None:
        g += (prob.power_weight * prob.pp[ex]) * derivs[2]
    g *= u
    slope = g.sum(axis=0)
    if prob.pp is None:
        slope += prob.power_weight * power_slope
    return net, slope, margin


def _values(setup: RotorSetup, pieces: _Pieces, prob: _SpinProblem, omega, slopes=True):
    """:func:`_spin_values` in pieces of at most ``CHUNK_ELEMENTS`` strip evaluations (the
    temporaries stay in the processor's cache); omega is (rows, N) or (N,)."""
    omega = np.asarray(omega, dtype=float)
    n = omega.shape[-1]
    per = max(1, CHUNK_ELEMENTS // (prob.u.shape[0] * max(1, omega.size // max(n, 1))))
    if per >= n:
        return _spin_values(setup, pieces, prob, omega, slopes)
    parts = [_spin_values(setup, pieces, prob.take(slice(a, a + per)), omega[..., a:a + per], slopes)
             for a in range(0, n, per)]
    return tuple(None if parts[0][j] is None else np.concatenate([p[j] for p in parts], axis=-1)
                 for j in range(3))


def _cubic_peak(x1, x2, f1, f2, d1, d2, turn=False):
    """Maximum of the cubic through (x1, f1) and (x2, f2) with slopes d1, d2 (cubic Hermite
    interpolation): (x of the maximum, its value[, x of its inflection when ``turn``]), NaN where
    the cubic has no local maximum.

    With s = (x - x1)/(x2 - x1) the cubic is f1 + a1 s + a2 s^2 + a3 s^3; its local maximum is the
    root of the derivative where the second derivative is negative, computed without
    cancellation; the inflection, half-way between the maximum and the minimum, is where the
    slope is furthest from zero between them. Either may lie outside [x1, x2]: the caller checks.
    """
    h = x2 - x1
    a1 = h * d1
    a2 = 3.0 * (f2 - f1) - h * (2.0 * d1 + d2)
    a3 = 2.0 * (f1 - f2) + h * (d1 + d2)
    disc = a2 * a2 - 3.0 * a1 * a3
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        root = np.sqrt(np.where(disc > 0.0, disc, np.nan))
        s = np.where(a2 <= 0.0, a1 / (root - a2), -(a2 + root) / (3.0 * a3))
        value = f1 + s * (a1 + s * (a2 + s * a3))
        if not turn:
            return x1 + s * h, value
        bend = -a2 / (3.0 * a3) + 0.0 * root                        # between maximum and minimum
    return x1 + s * h, value, x1 + bend * h


def _cell_peaks(x, f, d, ok):
    """How high the net gain may rise inside each cell between neighbouring rows of ``x``, as
    far as the cubic through the ends' values and slopes tells: its interior maximum or, where
    one end breaks a limit, its highest value on the way there; -inf where that does not rise
    above the feasible end(s) or neither end keeps the limits.
    """
    x1, x2, f1, f2 = x[:-1], x[1:], f[:-1], f[1:]
    px, pv = _cubic_peak(x1, x2, f1, f2, d[:-1], d[1:])
    pv = np.where((px > x1) & (px < x2), pv, -np.inf)
    ok1, ok2 = ok[:-1], ok[1:]
    high = np.where(ok1 & ok2, pv, np.maximum(pv, np.where(ok1, f2, f1)))
    ends = np.maximum(np.where(ok1, f1, -np.inf), np.where(ok2, f2, -np.inf))
    return np.where((ok1 | ok2) & (high > ends), high, -np.inf)


def _breakpoints(pieces: _Pieces, u, a, b, kinks=()):
    """Angular speeds strictly between ``a`` and ``b`` (per entry) at which some strip's spin
    ratio crosses a point of the coefficient table, or at which the spin power's slope jumps
    (``kinks``, the same for all entries): (rows (count, entries) sorted, NaN beyond an entry's
    own count; counts). Between them the net gain is one smooth function.
    """
    if u.shape[0] > 1 and np.all(u == u[:1]):
        u = u[:1]                                     # one spin ratio all along (uniform wind)
    first, last = pieces.knots_inside(u * a, u * b)                 # (strips, entries)
    count = np.where(u > 0.0, np.maximum(last - first + 1, 0), 0)
    most = max(1, int(count.max(initial=0)))
    total = count.sum(axis=0)
    r = np.arange(most)[:, None, None]
    j = np.minimum(first + r, pieces.x.size - 1)
    pts = np.where(r < count, pieces.x[j] / np.where(u > 0.0, u, 1.0), np.nan)
    # where the table ends and its values are held, the slope jumps: a point just before and
    # one just after, so that the cubics on either side get their own one-sided slope
    ends = (j == pieces.x.size - 1) | ((j == 0) & (pieces.lo > 0.0))
    ends &= r < count
    rows = [pts.reshape(-1, a.size)]
    if ends.any():
        rows.append(np.where(ends, pts * (1.0 + _KINK_SPLIT), np.nan).reshape(-1, a.size))
        rows[0] = np.where(ends, pts * (1.0 - _KINK_SPLIT), pts).reshape(-1, a.size)
        total = total + ends.sum(axis=(0, 1))
    for kink in kinks:                                               # the same split either side
        inside = (a < kink) & (kink < b)
        if inside.any():
            rows += [np.where(inside, kink * (1.0 - _KINK_SPLIT), np.nan)[None],
                     np.where(inside, kink * (1.0 + _KINK_SPLIT), np.nan)[None]]
            total = total + 2 * inside
    pts = np.concatenate(rows)
    pts = pts[~np.isnan(pts).all(axis=1)]                            # rows no entry uses
    pts = np.sort(pts.T, axis=1)                                     # (entries, ...), NaN last
    if total.max() > BREAKPOINTS_MAX:                                # very fine user tables
        pick = np.linspace(0.0, 1.0, BREAKPOINTS_MAX)[None, :] * np.maximum(total[:, None] - 1, 0)
        pts = np.take_along_axis(pts, pick.round().astype(np.intp), axis=1)
        pts = np.where(np.arange(BREAKPOINTS_MAX)[None, :] < total[:, None], pts, np.nan)
        total = np.minimum(total, BREAKPOINTS_MAX)
    return pts[:, :int(total.max(initial=0))].T, total


def _where_it_may_beat(pts, a, b, fa, fb, da, db, slack, best):
    """The points of :func:`_breakpoints` (rows, entries) that border a stretch where the net gain
    may still beat ``best``: where the cubic through the cell's ends plus ``slack`` (the bound on
    what the bends inside can add) rises above it. Elsewhere nothing better can be found, so the
    points there are dropped; (points, counts) as :func:`_breakpoints` returns them."""
    if pts.shape[0] == 0:
        return pts, np.zeros(a.size, dtype=np.intp)
    ends = np.vstack([a, np.where(np.isnan(pts), b, pts), b])
    h = b - a
    with np.errstate(divide="ignore", invalid="ignore"):
        s = (ends - a) / h
    cubic = fa + s * (h * da + s * (3.0 * (fb - fa) - h * (2.0 * da + db) + s * (2.0 * (fa - fb) + h * (da + db))))
    top = np.maximum(cubic[:-1], cubic[1:])                         # highest on each stretch ...
    px, pv = _cubic_peak(a, b, fa, fb, da, db)
    top = np.where((px >= ends[:-1]) & (px <= ends[1:]), np.maximum(top, pv), top)   # ... with its peak
    may = top + slack > best
    keep = (may[:-1] | may[1:]) & ~np.isnan(pts)
    pts = np.sort(np.where(keep, pts, np.nan).T, axis=1).T           # NaN last
    count = keep.sum(axis=0)
    return pts[:int(count.max(initial=0))], count


def _bend_weight(pieces: _Pieces, prob: _SpinProblem, h):
    """Per strip and condition, the most that one crossing of a table point inside a cell of
    width ``h`` can make the net gain depart from the cubic through the cell's ends: (any
    crossing, extra where the crossing is an end of the table). See :func:`_bend_bound`."""
    u = prob.u
    wl, wd = np.abs(prob.wl), np.abs(prob.wd)
    wp = np.abs(prob.power_weight * prob.pp) if prob.pp is not None else None
    sq = 2.0 * abs(prob.kar)
    terms = {}
    for order, c in zip((1, 2, 3), HERMITE_KINK_ERROR):
        most = pieces.sharpest[order]
        weight = wl * most[0] + wd * (most[1] + sq * most[-1])
        if wp is not None:
            weight = weight + wp * most[2]
        terms[order] = c * (h * u) ** order * weight
    return terms[2] + terms[3], terms[1]


def _bend_bound(pieces: _Pieces, u, bend, kink, a, b):
    """Upper bound on how far the net gain departs, inside each cell [a, b], from the cubic
    through its ends' values and slopes, because of the bends where strips cross table points.

    Each crossing adds to the net gain a term that starts there with a jump J_k in its k-th
    derivative (k = 1 only where the table ends and its values are held, then 2 and 3). The
    cubic through the cell's ends misses such a term by at most c_k J_k h^k, h = b - a, with
    c_k = ``HERMITE_KINK_ERROR`` (the largest error of cubic Hermite interpolation of
    (x - x0)_+^k / k! on a unit interval: 4/27, 1/61.9 and 1/192, found numerically; a test
    checks them). J_k is at most the sharpest jump of CL, CD, CP and CL^2 in the table times the
    strip's weights and (d SR / d omega)^k: ``bend`` and ``kink`` per strip from
    :func:`_bend_weight`, times the crossings counted here. (The skin-friction model's own slope
    jumps are added by the caller.) Terms of fourth and higher order and the cubic's error on the
    smooth part are left out: the caller applies a safety factor.
    """
    first, last = pieces.knots_inside(u * a, u * b)                  # (strips, cells)
    top = pieces.x.size - 1
    ends = (first <= top) & (last >= top)                            # crosses the top of the table
    if pieces.lo > 0.0:
        ends |= (first <= 0) & (last >= 0)                           # ... or its held bottom
    return (np.maximum(last - first + 1, 0) * bend + ends * kink).sum(axis=0)


def _limit_windows(setup, pieces, prob, x, margin, tol):
    """Stretches that keep the limits between grid points that break them: (conditions, start,
    end) or None. At the grid's lowest local minimum of the limit margin that is above zero, the
    margin is minimised between the neighbouring grid points (golden section); where it reaches
    zero, the limit boundaries either side of that point bound the stretch."""
    k = x.shape[0]
    lower = np.vstack([np.full((1, x.shape[1]), np.inf), margin[:-1]])
    upper = np.vstack([margin[1:], np.full((1, x.shape[1]), np.inf)])
    dip = (margin > 0.0) & (margin <= lower) & (margin <= upper) & (x[-1] > 0.0)
    if not dip.any():
        return None
    r = np.argmin(np.where(dip, margin, np.inf), axis=0)
    cond = np.flatnonzero(dip.any(axis=0))
    r = r[cond]
    lo, hi = x[np.maximum(r - 1, 0), cond], x[np.minimum(r + 1, k - 1), cond]
    m_lo, m_hi = margin[np.maximum(r - 1, 0), cond], margin[np.minimum(r + 1, k - 1), cond]
    pw = prob.take(cond)
    # golden-section search for the lowest margin, stopping early where it drops below zero
    g = (math.sqrt(5.0) - 1.0) / 2.0
    a, b = lo.copy(), hi.copy()
    c, e = b - g * (b - a), a + g * (b - a)
    mc = _values(setup, pieces, pw, c, slopes=False)[2]
    me = _values(setup, pieces, pw, e, slopes=False)[2]
    t = tol[cond]
    for _ in range(BOUNDARY_STEPS_MAX):
        found = np.minimum(mc, me) <= -_MARGIN_ROUNDING
        live = ~found & (b - a > t)
        if not live.any():
            break
        left = mc <= me
        b, a = np.where(live & left, e, b), np.where(live & ~left, c, a)
        new = np.where(left, b - g * (b - a), a + g * (b - a))
        mn = _values(setup, pieces, pw, np.where(live, new, c), slopes=False)[2]
        mn = np.where(live, mn, np.where(left, mc, me))
        c, e, mc, me = (np.where(live & left, new, np.where(live, e, c)),
                        np.where(live & left, c, np.where(live, new, e)),
                        np.where(live & left, mn, np.where(live, me, mc)),
                        np.where(live & left, mc, np.where(live, mn, me)))
    inside = np.where(mc <= me, c, e)
    m_in = np.minimum(mc, me)
    ok = m_in <= -_MARGIN_ROUNDING
    if not ok.any():
        return None
    cond, inside, m_in, pw, t = cond[ok], inside[ok], m_in[ok], pw.take(ok), t[ok]
    start = _limit_boundary(setup, pieces, pw, inside, m_in, lo[ok], m_lo[ok], t)
    end = _limit_boundary(setup, pieces, pw, inside, m_in, hi[ok], m_hi[ok], t)
    return cond, start, end


def _limit_boundary(setup, pieces, prob, keep, m_keep, brk, m_brk, tol):
    """Between a spin that keeps the limits (margin ``m_keep`` <= 0) and one that breaks them,
    the spin on the keeping side within ``tol`` of where the margin changes sign (or whose margin
    is within ``BOUNDARY_MARGIN_TOL`` of zero). Newton steps on the margin (its slope from the
    model) aimed just inside the limit, regula falsi where a step would leave the bracket,
    bisection where the bracket has not halved in two steps."""
    aim = 0.5 * (BOUNDARY_MARGIN_TOL + _MARGIN_ROUNDING)             # a margin just inside
    w1 = np.full(keep.size, np.inf)
    w2 = w1.copy()
    idx = np.arange(keep.size)
    out = keep.copy()
    x_last = m_last = d_last = None
    for _ in range(BOUNDARY_STEPS_MAX):
        width = np.abs(brk - keep)
        live = (width > tol) & (m_keep < -BOUNDARY_MARGIN_TOL)
        if not live.any():
            break
        if live.sum() < 0.5 * live.size:                             # drop the finished ones
            out[idx[~live]] = keep[~live]
            idx, keep, m_keep, brk, m_brk, tol, w1, w2, width = (
                v[live] for v in (idx, keep, m_keep, brk, m_brk, tol, w1, w2, width))
            if x_last is not None:
                x_last, m_last, d_last = x_last[live], m_last[live], d_last[live]
            prob = prob.take(live)
            live = live[live]
        with np.errstate(divide="ignore", invalid="ignore"):
            x = keep - (m_keep + aim) * (brk - keep) / (m_brk - m_keep)
            if x_last is not None:
                newton = x_last - (m_last + aim) / d_last
                x = np.where(np.abs(newton - keep) + np.abs(newton - brk) < width * (1.0 + 1e-12), newton, x)
        inside = (np.abs(x - keep) < width) & (np.abs(x - brk) < width)
        x = np.where(inside & (width <= 0.5 * w2), x, 0.5 * (keep + brk))
        x = np.where(live, x, keep)                                  # finished: marks time
        _, dm, m = _values(setup, pieces, prob, x, slopes="margin")
        kept = (m <= -_MARGIN_ROUNDING) | ~live                      # inside, whatever the rounding
        keep, m_keep = np.where(kept, x, keep), np.where(kept, m, m_keep)
        brk, m_brk = np.where(kept, brk, x), np.where(kept, m_brk, m)
        x_last, m_last, d_last = x, m, dm
        w2, w1 = w1, width
    out[idx] = keep
    return out


def _refine(setup, pieces, prob, tol, ftol, p, q, fp, fq, dp, dq):
    """The highest local maximum of the net gain in each interval [p, q] whose cubic (through
    the ends' values and slopes) peaks inside, to ``tol``. Returns (x, net) of the best point
    met that keeps the limits (net -inf where none did). ``ftol``: net gains closer than this
    count as equal (a bump the cubic predicts to rise less above the ends is not pursued).

    While the slope changes sign between the ends (> 0 at p, <= 0 at q) the next point is the
    peak of the cubic through the last two points (superlinear), or the middle when that falls
    outside the bracket or the bracket has not halved in two steps; the half where the sign
    changes is kept. Otherwise (a bump and a dip inside, slopes of one sign at both ends) the
    next point is the cubic's peak and the half whose cubic peaks higher is kept.
    """
    n = p.size
    st = {"idx": np.arange(n), "tol": tol, "ftol": ftol, "p": p, "q": q, "fp": fp, "fq": fq, "dp": dp, "dq": dq,
          "x1": p, "f1": fp, "d1": dp, "x2": q, "f2": fq, "d2": dq,
          "w1": np.full(n, np.inf), "w2": np.full(n, np.inf), "bx": p.copy(), "bf": np.full(n, -np.inf),
          "done": np.zeros(n, dtype=bool)}
    best_x, best_f = p.copy(), np.full(n, -np.inf)
    true2 = np.ones((2, 1), dtype=bool)
    for _ in range(REFINE_STEPS_MAX):
        p, q = st["p"], st["q"]
        bracket = (st["dp"] > 0) & (st["dq"] <= 0)
        near, _ = _cubic_peak(st["x1"], st["x2"], st["f1"], st["f2"], st["d1"], st["d2"])
        whole, rise, bend = _cubic_peak(p, q, st["fp"], st["fq"], st["dp"], st["dq"], turn=True)
        # without a sign change, probe where the cubic's slope is furthest from zero between
        # its maximum and minimum: the slope there most likely has the sign that makes a bracket
        xc = np.where(bracket, near, bend)
        inside = (xc > p) & (xc < q)
        width = q - p
        xc = np.where(bracket & (~inside | (width > 0.5 * st["w2"])), 0.5 * (p + q), xc)
        # done: the cubic over the interval rises less than ftol above its ends
        st["done"] |= ~(rise > np.maximum(st["fp"], st["fq"]) + st["ftol"]) | ~(bracket | inside)
        xc = np.where(st["done"], st["bx"], xc)                      # finished: marks time
        fc, dc, mc = _values(setup, pieces, prob, xc)
        better = (mc <= 0.0) & (fc > st["bf"])
        st["bx"], st["bf"] = np.where(better, xc, st["bx"]), np.where(better, fc, st["bf"])
        left = (st["dp"] > 0) & (dc <= 0)                            # the left half brackets
        right = (dc > 0) & (st["dq"] <= 0)
        peak_left = _cell_peaks(np.stack([p, xc]), np.stack([st["fp"], fc]), np.stack([st["dp"], dc]), true2)[0]
        peak_right = _cell_peaks(np.stack([xc, q]), np.stack([fc, st["fq"]]), np.stack([dc, st["dq"]]), true2)[0]
        go_left = np.where(left, True, np.where(right, False, peak_left >= peak_right))
        step = np.abs(xc - st["x2"])
        st["p"], st["fp"], st["dp"] = (np.where(go_left, p, xc), np.where(go_left, st["fp"], fc),
                                       np.where(go_left, st["dp"], dc))
        st["q"], st["fq"], st["dq"] = (np.where(go_left, xc, q), np.where(go_left, fc, st["fq"]),
                                       np.where(go_left, dc, st["dq"]))
        st["x1"], st["f1"], st["d1"] = st["x2"], st["f2"], st["d2"]
        st["x2"], st["f2"], st["d2"] = xc, fc, dc
        st["w2"], st["w1"] = st["w1"], width
        # done: located to tol, or (no sign change) no bump left in either half
        done = (st["q"] - st["p"] <= st["tol"]) | (step <= st["tol"])
        done |= ~left & ~right & ~np.isfinite(np.maximum(peak_left, peak_right))
        st["done"] |= done
        if st["done"].any():
            live = ~st["done"]
            if not live.any():
                break
            if live.sum() < 0.5 * live.size:                         # drop the finished ones
                best_x[st["idx"][~live]], best_f[st["idx"][~live]] = st["bx"][~live], st["bf"][~live]
                st = {key: v[live] for key, v in st.items()}
                prob = prob.take(live)
    best_x[st["idx"]], best_f[st["idx"]] = st["bx"], st["bf"]
    return best_x, best_f


def _best_omega(setup: RotorSetup, w: _Wind, pieces: _Pieces, progress=None) -> np.ndarray:
    """Best angular speed for each condition (vectorised search, see best_operation)."""
    va = w.va_mid
    calm = va <= CALM_M_S
    top = np.minimum(setup.spin_ratio_limit() * np.where(calm, 1.0, va) / setup.radius_m,
                     setup.max_rpm / _RPM_PER_RAD_S)
    top = np.where(calm, 0.0, top)
    tol = BEST_SPIN_XTOL * top
    n = va.size
    cols = np.arange(n)
    prob = _spin_problem(setup, w)

    # 1. net gain and its slope on a grid over the whole range; the best grid point that keeps
    #    the limits
    k = BEST_GRID_POINTS
    x = np.linspace(0.0, 1.0, k)[:, None] * top
    x[-1] *= 1.0 - _KINK_SPLIT            # the slope from below at the top (a strip may leave the table there)
    f, d, margin = _values(setup, pieces, prob, x)
    ok = margin <= 0.0
    fg = np.where(ok, f, -np.inf)
    fg[0] = f[0]                                                     # stopping is always allowed
    i = np.argmax(fg, axis=0)
    best_f = fg[i, cols]
    cand = [(cols, x[i, cols], best_f)]
    ftol = BEST_SPIN_FTOL * np.abs(f).max(axis=0)
    if progress is not None:
        progress(0.4)

    # 2. the cells that may hold more than the best grid point: where the cubic through the
    #    ends' values and slopes (towards an end that breaks a limit: up to that end), plus the
    #    most that bends at table points crossed inside can add to it, rises above it. A cap on
    #    that bound for any cell first rules out most cells cheaply.
    px, pv = _cubic_peak(x[:-1], x[1:], f[:-1], f[1:], d[:-1], d[1:])
    pv = np.where((px > x[:-1]) & (px < x[1:]), pv, -np.inf)
    high = np.maximum(pv, np.maximum(f[:-1], f[1:]))
    usable = (ok[:-1] | ok[1:]) & (top > 0.0)
    h = top / (k - 1)
    bend, kink = _bend_weight(pieces, prob, h)                       # (strips, N)
    kinks, jumps = _skin_friction_kinks(setup)
    power_kink = HERMITE_KINK_ERROR[0] * h * abs(prob.power_weight) * jumps.sum()
    # first a cap: every strip crosses each table point that any strip crosses in the cell
    first, last = pieces.knots_inside(x[:-1] * prob.u.min(axis=0), x[1:] * prob.u.max(axis=0))
    cap = BUMP_BOUND_FACTOR * (np.maximum(last - first + 1, 0) * bend.sum(axis=0) + kink.sum(axis=0) + power_kink)
    rows, cond = np.nonzero(usable & (high + cap > best_f))
    xa, xb = x[rows, cond], x[rows + 1, cond]
    bound = _bend_bound(pieces, prob.u[:, cond], bend[:, cond], kink[:, cond], xa, xb)
    for at, jump in zip(kinks, jumps):                               # the friction model's kinks
        bound = bound + ((xa < at) & (at < xb)) * HERMITE_KINK_ERROR[0] * (xb - xa) * abs(prob.power_weight) * jump
    bound *= BUMP_BOUND_FACTOR
    keep = high[rows, cond] + bound > best_f[cond]
    rows, cond, slack = rows[keep], cond[keep], bound[keep]
    a, b = x[rows, cond], x[rows + 1, cond]
    fa, fb, da, db = f[rows, cond], f[rows + 1, cond], d[rows, cond], d[rows + 1, cond]
    ma, mb = margin[rows, cond], margin[rows + 1, cond]

    # 2b. a stretch that keeps the limits between grid points that all break them (a heeling
    #     moment that falls and rises again with spin): where the grid's limit margin has a
    #     local minimum above zero, the margin is minimised between its neighbours; where it
    #     dips to zero, the stretch between the two boundaries is searched like a cell
    window = _limit_windows(setup, pieces, prob, x, margin, tol)
    if window is not None:
        wc, wa, wb = window
        fw, dw, mw = _values(setup, pieces, prob.take(wc), np.vstack([wa, wb]))
        cand.append((np.concatenate([wc, wc]), np.concatenate([wa, wb]),
                     np.where(mw.ravel() <= 0.0, fw.ravel(), -np.inf)))
        cond, a, b = np.concatenate([cond, wc]), np.concatenate([a, wa]), np.concatenate([b, wb])
        slack = np.concatenate([slack, np.full(wc.size, np.inf)])    # no bound worked out there
        fa, fb = np.concatenate([fa, fw[0]]), np.concatenate([fb, fw[1]])
        da, db = np.concatenate([da, dw[0]]), np.concatenate([db, dw[1]])
        ma, mb = np.concatenate([ma, mw[0]]), np.concatenate([mb, mw[1]])
    if cond.size:
        pe = prob.take(cond)
        te = tol[cond]

        # 3. where a limit starts binding inside a cell, the boundary (a candidate), and only
        #    the part of the cell that keeps the limits is searched further
        e = np.flatnonzero((ma <= 0.0) != (mb <= 0.0))
        if e.size:
            left = ma[e] <= 0.0
            pb = pe.take(e)
            edge = _limit_boundary(setup, pieces, pb, np.where(left, a[e], b[e]), np.where(left, ma[e], mb[e]),
                                   np.where(left, b[e], a[e]), np.where(left, mb[e], ma[e]), te[e])
            fe, de, me = _values(setup, pieces, pb, edge)
            cand.append((cond[e], edge, np.where(me <= 0.0, fe, -np.inf)))
            b[e], fb[e], db[e], mb[e] = (np.where(left, edge, b[e]), np.where(left, fe, fb[e]),
                                         np.where(left, de, db[e]), np.where(left, me, mb[e]))
            a[e], fa[e], da[e], ma[e] = (np.where(left, a[e], edge), np.where(left, fa[e], fe),
                                         np.where(left, da[e], de), np.where(left, ma[e], me))
        if progress is not None:
            progress(0.6)

        # 4. inside each cell, the net gain and its slope at every spin where a strip crosses a
        #    point of the coefficient table (its curvature jumps there and small bumps start);
        #    between these points it is smooth and the cubic through neighbours models it
        #    closely. Cells with as many such points are evaluated together.
        pts, count = _breakpoints(pieces, pe.u, a, b, kinks)
        pts, count = _where_it_may_beat(pts, a, b, fa, fb, da, db, slack, best_f[cond])
        order = np.argsort(count, kind="stable")
        counts = count[order]
        ps = pe.take(order)
        # groups of entries with about as many points (the few missing ones repeat the cell's end)
        sizes = np.unique(np.concatenate([[0], np.minimum(2 * ((counts + 1) // 2), counts[-1])]))
        starts = np.searchsorted(counts, np.append(sizes[:-1] + 1, counts[-1] + 1), side="left")
        starts = np.concatenate([[0], starts])
        found = []                                                   # best sub-interval per entry
        for c, lo, hi in zip(sizes, starts[:-1], starts[1:]):
            if hi == lo:
                continue
            sel = order[lo:hi]
            xs = np.vstack([a[sel], np.where(np.isnan(pts[:c, sel]), b[sel], pts[:c, sel]), b[sel]])
            fs, ds, ms = np.vstack([fa[sel], fb[sel]]), np.vstack([da[sel], db[sel]]), np.vstack([ma[sel], mb[sel]])
            if c:
                fz, dz, mz = _values(setup, pieces, ps.take(slice(lo, hi)), xs[1:-1])
                fs, ds, ms = (np.vstack([u[:1], v, u[1:]]) for u, v in ((fs, fz), (ds, dz), (ms, mz)))
                inner = np.where(mz <= 0.0, fz, -np.inf)
                j = np.argmax(inner, axis=0)
                ent = np.arange(sel.size)
                cand.append((cond[sel], xs[1 + j, ent], inner[j, ent]))
            # 5. the sub-interval whose cubic peaks highest (refined below)
            sub = _cell_peaks(xs, fs, ds, ms <= 0.0)
            r = np.argmax(sub, axis=0)
            ent = np.arange(sel.size)
            live = np.isfinite(sub[r, ent])
            r, ent = r[live], ent[live]
            found.append((sel[live], xs[r, ent], xs[r + 1, ent], fs[r, ent], fs[r + 1, ent], ds[r, ent],
                          ds[r + 1, ent]))
        if progress is not None:
            progress(0.9)
        live, p, q, fp, fq, dp, dq = (np.concatenate(parts) for parts in zip(*found))
        if live.size:
            rx, rf = _refine(setup, pieces, pe.take(live), te[live], ftol[cond[live]], p, q, fp, fq, dp, dq)
            cand.append((cond[live], rx, rf))

    # 6. the best candidate of each condition (every condition has its grid point)
    c = np.concatenate([c for c, _, _ in cand])
    cx = np.concatenate([v for _, v, _ in cand])
    cf = np.concatenate([v for _, _, v in cand])
    order = np.lexsort((cf, c))                                      # by condition, best last
    last = np.append(c[order][1:] != c[order][:-1], True)
    best = np.zeros(n)
    best[c[order][last]] = cx[order][last]
    return np.where(calm, 0.0, best)


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
        out.append(quantity_warning("motor_power_limit", f"Spin {verb} the maximum motor power "
                                    f"{{limit}} per rotor{_count(m, n)}.",
                                    {"limit": (setup.max_motor_power_w, "power")}, "spin_power_w"))
    m = (flags & FLAG_HEEL) != 0
    if m.any():
        what = "Spin limited by" if mode == "best" else "Heeling moment above"
        out.append(quantity_warning("heel_limit", f"{what} the heeling-moment limit "
                                    f"{{limit}}{_count(m, n)}" + ("." if mode == "best" else ": reduce spin."),
                                    {"limit": (setup.max_heeling_moment_nm, "moment")}, "heeling_moment_nm"))
    m = (flags & FLAG_HEEL_WHEN_STOPPED) != 0
    if m.any():
        out.append(quantity_warning("heel_above_limit_when_stopped",
                                    f"Even the stopped rotors heel the ship more than the limit "
                                    f"{{limit}}{_count(m, n)}.",
                                    {"limit": (setup.max_heeling_moment_nm, "moment")}, "heeling_moment_nm"))
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
            out.append(quantity_warning("rotors_in_each_others_wake",
                                        "With the apparent wind this close to the ship's axis the rotors "
                                        "stand in each other's wake (offset across the wind "
                                        "{offset} < diameter {diameter}): "
                                        f"the interaction factor matters here{_count(m, n)}.",
                                        {"offset": (offset[m].min(), "length", 2),
                                         "diameter": (setup.diameter_m, "length")}, "thrust_n"))
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
