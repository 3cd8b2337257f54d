"""Sports balls: official specifications, drag and lift coefficient models, spin decay.

Every ball carries the governing body's rule its size and mass come from; every coefficient
model carries its published source, the range of spin parameter S and Reynolds number Re it was
built on, and a ``from_memory`` mark where the formula or its constants could not be checked
against the original paper while this module was written.

Definitions used throughout (SI): spin parameter ``S = r omega / |v_rel|`` (r ball radius,
omega spin rate in rad/s, v_rel velocity relative to the air); Reynolds number
``Re = |v_rel| d / nu``; drag and lift coefficients on the cross-section ``A = pi d^2 / 4`` and
the dynamic pressure ``q = rho |v_rel|^2 / 2``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Callable

import numpy as np

from liftcore.errors import InputError, check_choice, check_number, echo, pick_model

#: Metres per inch and kilograms per ounce (avoirdupois), exact by the 1959 international
#: yard and pound agreement: 1 in = 0.0254 m, 1 lb = 0.45359237 kg, 1 oz = 1/16 lb.
INCH_M = 0.0254
OUNCE_KG = 0.45359237 / 16.0
#: Metres per second per mile per hour (exact: 1 mi = 1609.344 m).
MPH_M_S = 1609.344 / 3600.0
RPM_RAD_S = 2.0 * math.pi / 60.0


# ----------------------------------------------------------------------------- ball specs
@dataclass(frozen=True)
class BallSpec:
    """One ball as its rules define it.

    Attributes
    ----------
    key, name : str
        Identifier and plain name.
    diameter_m, mass_kg : float
        Nominal values used in the calculations: the middle of the rule's range (or the rule's
        limit where only one is given). [m], [kg]
    diameter_range_m, mass_range_kg : tuple
        (low, high) as the rule states them, converted to SI; ``None`` where the rule sets none.
    rule : str
        The governing body's rule (document title and rule number).
    model : str
        Key of the default coefficient model in :data:`MODELS`.
    spin_decay : float
        Dimensionless spin-down constant c in ``d omega/dt = -c omega |v_rel| / r``.
    spin_decay_source : str
        Where c comes from; ``spin_decay_measured`` is False where it is borrowed from another ball.
    seams : bool
        True for balls whose seams or panels steer the flow (seam effects are not modelled).
    """

    key: str
    name: str
    diameter_m: float
    mass_kg: float
    diameter_range_m: tuple
    mass_range_kg: tuple
    rule: str
    model: str
    spin_decay: float
    spin_decay_source: str
    spin_decay_measured: bool
    seams: bool = False
    note: str = ""

    @property
    def radius_m(self) -> float:
        return 0.5 * self.diameter_m

    @property
    def area_m2(self) -> float:
        return math.pi * self.diameter_m ** 2 / 4.0


def _mid(lo, hi):
    return 0.5 * (lo + hi)


def _circ_to_d(circumference_m: float) -> float:
    return circumference_m / math.pi


#: Spin-down constant for a golf ball, c = omega_dot r / (omega v). Form: Smits & Smith's (1994)
#: wind-tunnel data give omega_dot R^2 / v^2 "an approximately linear function of S, and independent
#: of Reynold's number (for fixed S) in the range (1.0-2.5)x10^5" (as reported in A. M. Nathan, "The
#: effect of spin-down on the flight of a baseball", note dated 14 July 2008, Sec. II.A); taking it
#: proportional to S (through the origin) is our assumption. The value 2e-5 is from memory: the
#: note's numerical fit lies past the part of it that could be read, and Smits & Smith's chapter was
#: not found.
SPIN_DECAY_GOLF = 2.0e-5
#: Baseball: exponential decay with time constant 30 s at 100 mph, scaled with speed:
#: c = r / (30 s x 44.704 m/s). The form d omega/dt proportional to v omega is that of Nathan's
#: note (2008), Sec. I, Eq. (4): d omega/dt = -0.020 k v omega (v in mph, omega in rad/s), with an
#: unknown "torque parameter" k; 30 s at 100 mph corresponds to k = 50 / (30 x 100) = 0.0167. The
#: 30 s itself is from memory (no published source found).
SPIN_DECAY_BASEBALL = (0.5 * 9.125 * INCH_M / math.pi) / (30.0 * 100.0 * MPH_M_S)

_BASEBALL_D = (_circ_to_d(9.0 * INCH_M), _circ_to_d(9.25 * INCH_M))
_BASEBALL_M = (5.0 * OUNCE_KG, 5.25 * OUNCE_KG)
_SOFTBALL_D = (_circ_to_d(11.88 * INCH_M), _circ_to_d(12.13 * INCH_M))
_SOFTBALL_M = (6.25 * OUNCE_KG, 7.00 * OUNCE_KG)
_SOCCER_D = (_circ_to_d(0.68), _circ_to_d(0.70))
_SOCCER_M = (0.410, 0.450)
_TENNIS_D = (0.0654, 0.0686)
_TENNIS_M = (0.0560, 0.0594)
_CRICKET_D = (_circ_to_d(8.81 * INCH_M), _circ_to_d(9.0 * INCH_M))
_CRICKET_M = (5.5 * OUNCE_KG, 5.75 * OUNCE_KG)
_VOLLEY_D = (_circ_to_d(0.65), _circ_to_d(0.67))
_VOLLEY_M = (0.260, 0.280)

_ASSUMED = "assumed equal to the golf-ball value (not measured for this ball)"

BALLS: dict[str, BallSpec] = {
    "baseball": BallSpec(
        "baseball", "Baseball", _mid(*_BASEBALL_D), _mid(*_BASEBALL_M), _BASEBALL_D, _BASEBALL_M,
        "Official Baseball Rules, Rule 3.01 (rule number from memory): not less than 5 nor more than "
        "5 1/4 oz avoirdupois, not less than 9 nor more than 9 1/4 in circumference",
        "nathan2008", SPIN_DECAY_BASEBALL,
        "time constant 30 s at 100 mph, scaled with speed (form as in Nathan's 2008 spin-down note, "
        "Eq. 4; the 30 s is from memory)",
        True, seams=True),
    "softball": BallSpec(
        "softball", "Softball (12 in)", _mid(*_SOFTBALL_D), _mid(*_SOFTBALL_M), _SOFTBALL_D, _SOFTBALL_M,
        "Official Rules of Softball (WBSC), Rule 3 Sec. 3, 12-inch ball: 6.25 to 7.00 oz, "
        "11.88 to 12.13 in circumference (rule number from memory)",
        "nathan2008", SPIN_DECAY_BASEBALL, "borrowed from the baseball (not measured for this ball)",
        False, seams=True, note="Baseball coefficients assumed (seamed ball of similar roughness)."),
    "golf": BallSpec(
        "golf", "Golf ball", 1.680 * INCH_M, 1.620 * OUNCE_KG, (1.680 * INCH_M, None),
        (None, 1.620 * OUNCE_KG),
        "Rules of Golf, Equipment Rules Part 4 (Golf Balls; part number from memory): weight not "
        "greater than 1.620 oz (45.93 g), diameter not less than 1.680 in (42.67 mm)",
        "smits1994", SPIN_DECAY_GOLF,
        "form after Smits & Smith (1994) as reported in Nathan's 2008 spin-down note; constant from memory",
        True),
    "soccer": BallSpec(
        "soccer", "Football (soccer, size 5)", _mid(*_SOCCER_D), _mid(*_SOCCER_M), _SOCCER_D, _SOCCER_M,
        "Laws of the Game (IFAB), Law 2.1 (Qualities and measurements): circumference between 68 cm "
        "and 70 cm, between 410 g and 450 g at the start of the match",
        "asai2007", SPIN_DECAY_GOLF, _ASSUMED, False, seams=True),
    "tennis": BallSpec(
        "tennis", "Tennis ball (type 2)", _mid(*_TENNIS_D), _mid(*_TENNIS_M), _TENNIS_D, _TENNIS_M,
        "ITF Rules of Tennis, Appendix I (type 2, medium): mass 56.0 to 59.4 g, size 6.54 to 6.86 cm",
        "cross2014", SPIN_DECAY_GOLF, _ASSUMED, False, seams=True),
    "cricket": BallSpec(
        "cricket", "Cricket ball (men's)", _mid(*_CRICKET_D), _mid(*_CRICKET_M), _CRICKET_D, _CRICKET_M,
        "Laws of Cricket (MCC, 2017 Code), Law 4.1: 5.5 to 5.75 oz (155.9 to 163 g), 8.81 to 9 in "
        "(22.4 to 22.9 cm) circumference",
        "achenbach1972", SPIN_DECAY_GOLF, _ASSUMED, False, seams=True,
        note="Smooth-sphere drag assumed; seam swing not modelled."),
    "volleyball": BallSpec(
        "volleyball", "Volleyball", _mid(*_VOLLEY_D), _mid(*_VOLLEY_M), _VOLLEY_D, _VOLLEY_M,
        "Official Volleyball Rules (FIVB), Rule 3.1 (rule number from memory): circumference 65 to "
        "67 cm, weight 260 to 280 g",
        "asai2007", SPIN_DECAY_GOLF, _ASSUMED, False, seams=True,
        note="Panelled-ball (football) coefficients assumed."),
    "table_tennis": BallSpec(
        "table_tennis", "Table-tennis ball", 0.040, 0.0027, (0.040, 0.040), (0.0027, 0.0027),
        "Laws of Table Tennis (ITTF Handbook), 2.3.1 and 2.3.2: diameter 40 mm, weight 2.7 g",
        "achenbach1972", SPIN_DECAY_GOLF, _ASSUMED, False),
}

BALL_KEYS = tuple(BALLS) + ("custom",)

#: The launch inputs a typical launch sets (core units, keys of the flight study).
LAUNCH_KEYS = ("speed_m_s", "elevation_deg", "azimuth_deg", "launch_height_m", "spin_rpm",
               "spin_axis_deg")

#: A typical launch of each ball, applied when the ball is chosen on the flight page: round
#: numbers of the kind reported in the sports-science literature for a well-struck ball (common
#: practice; not measurements of any player, and no source is claimed for the exact values).
#: Spin-axis tilt: 0 backspin, 180 topspin, 90 sidespin curving right.
TYPICAL_LAUNCH: dict[str, tuple[str, dict]] = {
    "baseball": ("a well-hit fly ball", dict(speed_m_s=44.704, elevation_deg=28.0, azimuth_deg=0.0,
                                             launch_height_m=1.0, spin_rpm=2000.0, spin_axis_deg=0.0)),
    "softball": ("a hit fly ball", dict(speed_m_s=38.0, elevation_deg=28.0, azimuth_deg=0.0,
                                        launch_height_m=1.0, spin_rpm=1500.0, spin_axis_deg=0.0)),
    "golf": ("a drive", dict(speed_m_s=70.0, elevation_deg=11.0, azimuth_deg=0.0,
                             launch_height_m=0.0, spin_rpm=2700.0, spin_axis_deg=0.0)),
    "soccer": ("a curled free kick", dict(speed_m_s=25.0, elevation_deg=16.0, azimuth_deg=-5.0,
                                          launch_height_m=0.11, spin_rpm=500.0, spin_axis_deg=90.0)),
    "tennis": ("a topspin forehand", dict(speed_m_s=30.0, elevation_deg=6.0, azimuth_deg=0.0,
                                          launch_height_m=1.0, spin_rpm=2500.0, spin_axis_deg=180.0)),
    "cricket": ("a lofted drive", dict(speed_m_s=35.0, elevation_deg=30.0, azimuth_deg=0.0,
                                       launch_height_m=0.8, spin_rpm=1500.0, spin_axis_deg=0.0)),
    "volleyball": ("a jump serve", dict(speed_m_s=22.0, elevation_deg=2.0, azimuth_deg=0.0,
                                        launch_height_m=3.0, spin_rpm=400.0, spin_axis_deg=180.0)),
    "table_tennis": ("a topspin drive", dict(speed_m_s=15.0, elevation_deg=8.0, azimuth_deg=0.0,
                                             launch_height_m=0.9, spin_rpm=3000.0, spin_axis_deg=180.0)),
}


def typical_launch(key: str) -> tuple[str, dict]:
    """(what it is, launch inputs in core units) of the typical launch of ball ``key``, or
    ``("", {})`` for a custom ball (common practice; see :data:`TYPICAL_LAUNCH`)."""
    return TYPICAL_LAUNCH.get(key, ("", {}))


def ball(key: str) -> BallSpec:
    """The ball for ``key``; unknown keys raise :class:`ValueError` listing the valid ones."""
    return pick_model("ball", key, BALLS)


def custom_ball(diameter_m: float, mass_kg: float, model: str = "achenbach1972") -> BallSpec:
    """A ball of the user's own size and mass (checked: 10 mm to 400 mm, 0.5 g to 2 kg)."""
    d = check_number("ball diameter", diameter_m, "m", low=0.01, high=0.4)
    m = check_number("ball mass", mass_kg, "kg", low=0.0005, high=2.0)
    check_choice("coefficient model", model, MODELS)
    return BallSpec("custom", "Custom ball", d, m, (d, d), (m, m), "user-defined (no rule)", model,
                    SPIN_DECAY_GOLF, _ASSUMED, False)


# ----------------------------------------------------------------------------- coefficient models
def drag_coefficient_nathan2008(spin_rpm):
    """Baseball drag rising with spin, CD = 0.3008 + 0.0292 (spin / 1000 rpm) (from memory).

    Notes
    -----
    Both constants are from memory: no published source for them was found ([1]'s abstract
    reports lift measurements only). No drag crisis: batted and pitched balls are taken to sit
    above it.

    References
    ----------
    .. [1] Nathan, A. M. (2008). The effect of spin on the flight of a baseball.
       Am. J. Phys. 76, 119-124, doi:10.1119/1.2805242.
    """
    return 0.3008 + 0.0292 * np.asarray(spin_rpm, dtype=float) / 1000.0


def lift_coefficient_nathan2008(spin_parameter):
    """Baseball lift, CL = 1.120 S / (0.583 + 2.333 S) (saturating in S; from memory).

    Notes
    -----
    Meant to follow the data of [1]; the ranges are published in [1]'s abstract: v = 50-110 mph,
    1500-4500 rpm, Re = (1.1-2.4) x 10^5, S = 0.090-0.595. The three constants are from memory of a
    secondary restatement; they were not found in [1] or any other published source.

    References
    ----------
    .. [1] Nathan, A. M. (2008). The effect of spin on the flight of a baseball.
       Am. J. Phys. 76, 119-124, doi:10.1119/1.2805242.
    """
    s = np.asarray(spin_parameter, dtype=float)
    return 1.120 * s / (0.583 + 2.333 * s)


def lift_coefficient_sawicki2003(spin_parameter):
    """Baseball lift, bilinear: CL = 1.5 S for S < 0.1, CL = 0.09 + 0.6 S above (from memory).

    Notes
    -----
    [1]'s abstract confirms that its flight model uses "experimental lift and drag profiles
    (including the drag crisis)"; the formula and its constants were not found in a readable
    published text and stay from memory.

    References
    ----------
    .. [1] Sawicki, G. S., Hubbard, M. and Stronge, W. J. (2003). How to hit home runs: optimum
       baseball bat swing parameters for maximum range trajectories. Am. J. Phys. 71, 1152-1162,
       doi:10.1119/1.1604384.
    """
    s = np.asarray(spin_parameter, dtype=float)
    return np.where(s < 0.1, 1.5 * s, 0.09 + 0.6 * s)


def drag_coefficient_sawicki2003(speed_m_s):
    """Baseball drag with a drag crisis in speed (from memory).

    Notes
    -----
    CD = 0.500 below 60 mph, falling linearly by 0.0125 per mph to 0.250 at 80 mph and constant
    above: the shape of the profile in [1] (constants recalled, not checked; no published text
    giving them was found).

    References
    ----------
    .. [1] Sawicki, Hubbard & Stronge (2003), Am. J. Phys. 71, 1152-1162.
    """
    v_mph = np.asarray(speed_m_s, dtype=float) / MPH_M_S
    return np.clip(0.500 - 0.0125 * (v_mph - 60.0), 0.250, 0.500)


def drag_coefficient_smits1994(spin_parameter):
    """Golf ball drag, CD = 0.24 + 0.18 S (from memory).

    References
    ----------
    .. [1] Smits, A. J. and Smith, D. R. (1994). A new aerodynamic model of a golf ball in
       flight. In Science and Golf II, E & FN Spon, London (pages not checked; the chapter was
       not found, so the formula stays from memory).
    """
    return 0.24 + 0.18 * np.asarray(spin_parameter, dtype=float)


def lift_coefficient_smits1994(spin_parameter):
    """Golf ball lift, CL = 0.54 S^0.4 (from memory).

    References
    ----------
    .. [1] Smits & Smith (1994), Science and Golf II (not found; formula from memory). Compare
       the wind-tunnel data of Bearman, P. W. and Harvey, J. K. (1976). Golf ball aerodynamics.
       Aeronaut. Q. 27, 112-122.
    """
    s = np.maximum(np.asarray(spin_parameter, dtype=float), 0.0)
    return 0.54 * s ** 0.4


def drag_coefficient_stepanek1988(spin_parameter):
    """Tennis ball drag, CD = 0.508 + [22.503 + 4.196 S^-2.5]^-0.4 (from memory; the paper's
    text was not found).

    References
    ----------
    .. [1] Stepanek, A. (1988). The aerodynamics of tennis balls - the topspin lob.
       Am. J. Phys. 56, 138-142.
    """
    s = np.maximum(np.asarray(spin_parameter, dtype=float), 1e-6)
    return 0.508 + (22.503 + 4.196 * s ** -2.5) ** -0.4


def lift_coefficient_stepanek1988(spin_parameter):
    """Tennis ball lift, CL = 1 / (2.022 + 0.981 / S) (from memory; the paper's text was not found).

    References
    ----------
    .. [1] Stepanek (1988), Am. J. Phys. 56, 138-142.
    """
    s = np.maximum(np.asarray(spin_parameter, dtype=float), 1e-9)
    return 1.0 / (2.022 + 0.981 / s)


#: Mean drag coefficient of new tennis balls in free flight, independent of speed (15-30 m/s)
#: and spin (up to 2500 rpm): 0.507 +/- 0.024 (Cross & Lindsey 2014, abstract: "The average drag
#: coefficient was 0.507 +/- 0.024, independent of ball speed or spin").
CD_TENNIS_CROSS2014 = 0.507


def drag_coefficient_cross2014(spin_parameter):
    """Tennis ball drag, CD = 0.507 independent of speed and spin.

    References
    ----------
    .. [1] Cross, R. and Lindsey, C. (2014). Measurements of drag and lift on tennis balls in
       flight. Sports Engineering 17, 89-96.
    """
    return np.full_like(np.asarray(spin_parameter, dtype=float), CD_TENNIS_CROSS2014)


def drag_coefficient_logistic_crisis(reynolds, cd_sub, cd_super, re_crit, re_width):
    """A drag crisis as a smooth step in Re: CD = cd_super + (cd_sub - cd_super) / (1 + exp((Re - Re_c)/w)).

    A shape of our own for a rough or panelled ball's drag crisis; the constants of each use say
    where they come from.
    """
    re = np.asarray(reynolds, dtype=float)
    arg = np.clip((re - re_crit) / re_width, -60.0, 60.0)
    return cd_super + (cd_sub - cd_super) / (1.0 + np.exp(arg))


#: Football drag crisis: critical Re 2.2e5 to 3.0e5 for soccer balls (Asai et al. 2007, abstract:
#: "the critical Reynolds number (Re_crit) of soccer balls ranged from 2.2 x 10^5 to 3.0 x 10^5");
#: the centre 2.6e5 and width 0.2e5 of the step are ours; sub- and super-critical CD 0.47 and 0.25
#: are from memory (the abstract gives no CD levels).
SOCCER_CRISIS = dict(cd_sub=0.47, cd_super=0.25, re_crit=2.6e5, re_width=0.2e5)
SOCCER_CRISIS_RE = (2.2e5, 3.0e5)


def drag_coefficient_asai2007(reynolds):
    """Football drag through the drag crisis (smooth step at Re 2.6e5; see :data:`SOCCER_CRISIS`).

    References
    ----------
    .. [1] Asai, T., Seo, K., Kobayashi, O. and Sakashita, R. (2007). Fundamental aerodynamics
       of the soccer ball. Sports Engineering 10, 101-110.
    .. [2] Goff, J. E. and Carre, M. J. (2009). Trajectory analysis of a soccer ball.
       Am. J. Phys. 77, 1020-1027, doi:10.1119/1.3197187.
    """
    return drag_coefficient_logistic_crisis(reynolds, **SOCCER_CRISIS)


def lift_coefficient_saturating(spin_parameter, a: float = 0.5205, b: float = 2.083):
    """CL = S / (a + b S): the saturating shape of :func:`lift_coefficient_nathan2008`
    (same constants by default), used where a ball has no lift fit of its own (assumption)."""
    s = np.asarray(spin_parameter, dtype=float)
    return s / (a + b * s)


#: Smooth sphere CD against Re through the drag crisis, after the curve of Achenbach (1972)
#: (from memory: subcritical 0.47, crisis near Re 3.7e5, minimum about 0.07, rising again to about
#: 0.19 at Re 4e6). Published and checked: the paper's range, 5 x 10^4 < Re < 6 x 10^6, smooth
#: surface, free-stream turbulence about 0.45 % (abstract, p. 565); Asai et al. (2007, abstract)
#: put the smooth-sphere critical Re at about 3.5 x 10^5 to 4.0 x 10^5, consistent with the table.
_ACH_LOG_RE = np.log10([1e4, 1e5, 2e5, 3e5, 3.5e5, 3.7e5, 4e5, 5e5, 1e6, 2e6, 4e6, 6e6])
_ACH_CD = np.array([0.47, 0.47, 0.46, 0.40, 0.30, 0.18, 0.08, 0.07, 0.11, 0.15, 0.18, 0.19])


def _pchip_slopes(x, y):
    h = np.diff(x)
    delta = np.diff(y) / h
    d = np.zeros_like(y)
    for k in range(1, len(y) - 1):
        if delta[k - 1] * delta[k] > 0:
            w1, w2 = 2 * h[k] + h[k - 1], h[k] + 2 * h[k - 1]
            d[k] = (w1 + w2) / (w1 / delta[k - 1] + w2 / delta[k])
    return d


_ACH_SLOPE = _pchip_slopes(_ACH_LOG_RE, _ACH_CD)


def drag_coefficient_achenbach1972(reynolds):
    """Smooth-sphere drag through the drag crisis (monotone cubic in log10 Re; from memory).

    Notes
    -----
    Outside 1e4 to 6e6 the end values are held (the paper's range is 5e4 to 6e6). Table in
    :data:`_ACH_CD` (read from memory).

    References
    ----------
    .. [1] Achenbach, E. (1972). Experiments on the flow past spheres at very high Reynolds
       numbers. J. Fluid Mech. 54 (part 3), 565-575.
    """
    lr = np.clip(np.log10(np.maximum(np.asarray(reynolds, dtype=float), 1.0)),
                 _ACH_LOG_RE[0], _ACH_LOG_RE[-1])
    k = np.clip(np.searchsorted(_ACH_LOG_RE, lr) - 1, 0, len(_ACH_LOG_RE) - 2)
    x0, x1 = _ACH_LOG_RE[k], _ACH_LOG_RE[k + 1]
    h = x1 - x0
    t = (lr - x0) / h
    y0, y1 = _ACH_CD[k], _ACH_CD[k + 1]
    d0, d1 = _ACH_SLOPE[k] * h, _ACH_SLOPE[k + 1] * h
    t2, t3 = t * t, t * t * t
    return ((2 * t3 - 3 * t2 + 1) * y0 + (t3 - 2 * t2 + t) * d0 + (-2 * t3 + 3 * t2) * y1
            + (t3 - t2) * d1)


@dataclass(frozen=True)
class CoefficientModel:
    """Drag and lift coefficients of one ball type with their provenance and range.

    ``coefficients(S, Re, speed_m_s, spin_rpm)`` returns ``(CD, CL)`` arrays. ``s_range`` and
    ``re_range`` are where the model was built; ``crisis_re`` is the Re band of a drag crisis
    (warned about) or ``None``.
    """

    key: str
    title: str
    source: str
    coefficients: Callable
    s_range: tuple
    re_range: tuple
    from_memory: bool
    crisis_re: tuple | None = None
    note: str = ""
    provenance: dict = field(default_factory=dict)

    def label(self) -> str:
        return self.title + (" (from memory)" if self.from_memory else "")


def _constant(S, Re, V, rpm):
    """CD = 1 and CL = 1 while the ball spins (scaled by the setup's constants); no spin, no lift."""
    s = np.asarray(S, dtype=float)
    return np.ones_like(s), (s > 0.0).astype(float)


MODELS: dict[str, CoefficientModel] = {
    "nathan2008": CoefficientModel(
        "nathan2008", "Baseball: after Nathan (2008)",
        "Nathan, A. M. (2008). The effect of spin on the flight of a baseball. Am. J. Phys. 76, 119-124, "
        "doi:10.1119/1.2805242.",
        lambda S, Re, V, rpm: (drag_coefficient_nathan2008(rpm), lift_coefficient_nathan2008(S)),
        # Nathan (2008), abstract: spin factors S 0.090-0.595, Re = (1.1-2.4) x 10^5
        (0.090, 0.595), (1.1e5, 2.4e5), True,
        note="S and Re ranges published (paper's abstract); drag and lift constants from memory "
             "(not found; the paper's abstract reports lift measurements only).",
        provenance={"cd": "from memory", "cl": "from memory (secondary restatement)",
                    "range": "published (abstract)"}),
    "sawicki2003": CoefficientModel(
        "sawicki2003", "Baseball: Sawicki, Hubbard & Stronge (2003)",
        "Sawicki, G. S., Hubbard, M. and Stronge, W. J. (2003). How to hit home runs. Am. J. Phys. 71, "
        "1152-1162, doi:10.1119/1.1604384.",
        lambda S, Re, V, rpm: (drag_coefficient_sawicki2003(V), lift_coefficient_sawicki2003(S)),
        (0.05, 0.5), (0.5e5, 2.5e5), True, crisis_re=(1.2e5, 1.8e5),
        note="Bilinear lift and speed-dependent drag crisis, both from memory (the paper's "
             "abstract confirms only that it uses measured lift and drag profiles with a drag crisis).",
        provenance={"cd": "from memory", "cl": "from memory", "range": "from memory"}),
    "smits1994": CoefficientModel(
        "smits1994", "Golf: Smits & Smith (1994)",
        "Smits, A. J. and Smith, D. R. (1994). A new aerodynamic model of a golf ball in flight. "
        "Science and Golf II, E & FN Spon; data compare with Bearman, P. W. and Harvey, J. K. (1976). "
        "Golf ball aerodynamics. Aeronaut. Q. 27, 112-122.",
        lambda S, Re, V, rpm: (drag_coefficient_smits1994(S), lift_coefficient_smits1994(S)),
        (0.05, 0.3), (0.7e5, 2.5e5), True,
        note="Formula and ranges from memory.",
        provenance={"cd": "from memory", "cl": "from memory", "range": "from memory"}),
    "stepanek1988": CoefficientModel(
        "stepanek1988", "Tennis: Stepanek (1988)",
        "Stepanek, A. (1988). The aerodynamics of tennis balls - the topspin lob. Am. J. Phys. 56, 138-142.",
        lambda S, Re, V, rpm: (drag_coefficient_stepanek1988(S), lift_coefficient_stepanek1988(S)),
        (0.0, 0.6), (0.6e5, 2.0e5), True,
        note="Formulas from memory.",
        provenance={"cd": "from memory", "cl": "from memory", "range": "from memory"}),
    "cross2014": CoefficientModel(
        "cross2014", "Tennis: Cross & Lindsey (2014) drag, Stepanek (1988) lift",
        "Cross, R. and Lindsey, C. (2014). Measurements of drag and lift on tennis balls in flight. "
        "Sports Engineering 17, 89-96; lift: Stepanek (1988), Am. J. Phys. 56, 138-142.",
        lambda S, Re, V, rpm: (drag_coefficient_cross2014(S), lift_coefficient_stepanek1988(S)),
        (0.0, 0.58), (6.5e4, 1.4e5), True,
        note="CD 0.507 +/- 0.024 published (abstract; 15-30 m/s, up to 2500 rpm); lift formula "
             "from memory.",
        provenance={"cd": "published (abstract)", "cl": "from memory", "range": "published (abstract)"}),
    "asai2007": CoefficientModel(
        "asai2007", "Football: drag crisis after Asai et al. (2007)",
        "Asai, T., Seo, K., Kobayashi, O. and Sakashita, R. (2007). Fundamental aerodynamics of the "
        "soccer ball. Sports Engineering 10, 101-110; Goff, J. E. and Carre, M. J. (2009). Trajectory "
        "analysis of a soccer ball. Am. J. Phys. 77, 1020-1027, doi:10.1119/1.3197187.",
        lambda S, Re, V, rpm: (drag_coefficient_asai2007(Re), lift_coefficient_saturating(S)),
        (0.0, 0.4), (1.0e5, 5.0e5), True, crisis_re=SOCCER_CRISIS_RE,
        note="Critical Re 2.2e5-3.0e5 published (Asai et al. 2007, abstract); CD levels from "
             "memory; lift curve assumed (baseball shape).",
        provenance={"cd": "crisis Re published, levels from memory", "cl": "assumed",
                    "range": "from memory"}),
    "achenbach1972": CoefficientModel(
        "achenbach1972", "Smooth sphere: Achenbach (1972) drag crisis",
        "Achenbach, E. (1972). Experiments on the flow past spheres at very high Reynolds numbers. "
        "J. Fluid Mech. 54, 565-575.",
        lambda S, Re, V, rpm: (drag_coefficient_achenbach1972(Re), lift_coefficient_saturating(S)),
        # Achenbach (1972), abstract (p. 565): 5 x 10^4 < Re < 6 x 10^6
        (0.0, 0.6), (5.0e4, 6.0e6), True, crisis_re=(3.0e5, 5.0e5),
        note="Re range published (abstract); drag curve read from memory; lift curve assumed "
             "(baseball shape); smooth-sphere negative Magnus effect near the crisis not modelled.",
        provenance={"cd": "from memory", "cl": "assumed", "range": "Re published (abstract)"}),
    "constant": CoefficientModel(
        "constant", "Constant CD and CL (your values)", "user-defined constants", _constant,
        (0.0, math.inf), (0.0, math.inf), False,
        note="CD and CL as entered; no dependence on spin or Reynolds number."),
}

MODEL_KEYS = tuple(MODELS)

#: Bounds of an aerodynamic table of the user's own: rows, spin parameter, Reynolds number, CD, CL.
TABLE_MAX_ROWS = 10_000
TABLE_LIMITS = {"S": (0.0, 10.0), "Re": (1.0e3, 1.0e7), "CD": (0.0, 5.0), "CL": (-3.0, 3.0)}
#: Largest aerodynamic table file read. [bytes]
TABLE_MAX_BYTES = 1_000_000


def table_model(source, name: str = "aerodynamic table") -> CoefficientModel:
    """A coefficient model from the user's own table of CD and CL over spin parameter S (and,
    optionally, Reynolds number).

    Parameters
    ----------
    source : str, bytes or pandas.DataFrame
        CSV text with a header ``S, CD, CL`` and optionally ``Re`` (any order, any case); with
        ``Re`` the rows must form a full grid (every S at every Re).
    name : str
        How the table is named in messages.

    Returns
    -------
    CoefficientModel
        ``key="table"``; its S and Re ranges are the table's (flights leaving them are warned
        about, and the coefficients are held at the table's edge there).

    Notes
    -----
    Piecewise-linear interpolation, monotone between the points: in S with :func:`numpy.interp`,
    over (Re, S) bilinear with :class:`scipy.interpolate.RegularGridInterpolator`. Lift acts only
    while the ball spins (CL x [S > 0]), as in the constant model, so a table of one CD and CL
    everywhere flies exactly like the constant model with those values.

    Raises
    ------
    InputError
        Missing columns, cells that are not numbers or outside :data:`TABLE_LIMITS`, repeated or
        missing grid points, fewer than 2 rows or more than :data:`TABLE_MAX_ROWS`.
    """
    import io

    import pandas as pd

    if isinstance(source, pd.DataFrame):
        df = source.copy()
    else:
        text = source.decode("utf-8-sig", errors="replace") if isinstance(source, (bytes, bytearray)) else str(source)
        if len(text) > TABLE_MAX_BYTES:
            raise InputError("aero table", f"{name} is {len(text):,} characters; at most {TABLE_MAX_BYTES:,} are read")
        if not text.strip():
            raise InputError("aero table", f"{name} is empty; it needs a header S, CD, CL (and optionally Re)")
        try:
            df = pd.read_csv(io.StringIO(text), comment="#", skipinitialspace=True)
        except (pd.errors.ParserError, pd.errors.EmptyDataError, ValueError) as exc:
            raise InputError("aero table", f"{name} is not a readable CSV table ({' '.join(str(exc).split())[:120]})") from None
    cols = {str(c).strip().lower(): c for c in df.columns}
    missing = [c for c in ("S", "CD", "CL") if c.lower() not in cols]
    if missing:
        raise InputError("aero table", f"{name} needs the columns S, CD, CL (and optionally Re); missing "
                                       f"{', '.join(missing)} (found {', '.join(map(str, df.columns)) or 'none'})")
    if not 2 <= len(df) <= TABLE_MAX_ROWS:
        raise InputError("aero table", f"{name} has {len(df)} rows; it needs 2 to {TABLE_MAX_ROWS:,}")
    arrays = {}
    for c in ("S", "CD", "CL", "Re"):
        if c.lower() not in cols:
            continue
        vals = pd.to_numeric(df[cols[c.lower()]], errors="coerce").to_numpy(dtype=float)
        low, high = TABLE_LIMITS[c]
        bad = np.flatnonzero(~np.isfinite(vals) | (vals < low) | (vals > high))
        if bad.size:
            k = int(bad[0])
            raise InputError("aero table", f"{name}: {c} in data row {k + 1} must be a number from {low:g} to "
                                           f"{high:g} (got {echo(df[cols[c.lower()]].iloc[k])})")
        arrays[c] = vals
    S, CD, CL = arrays["S"], arrays["CD"], arrays["CL"]
    if "Re" not in arrays:
        order = np.argsort(S, kind="stable")
        S, CD, CL = S[order], CD[order], CL[order]
        if np.any(np.diff(S) == 0):
            raise InputError("aero table", f"{name}: S {S[np.flatnonzero(np.diff(S) == 0)[0]]:g} appears twice; "
                                           "without a Re column each S may appear once")

        def coefficients(s, re, v, rpm):
            s = np.asarray(s, dtype=float)
            return np.interp(s, S, CD), np.interp(s, S, CL) * (s > 0.0)
        re_range = (0.0, math.inf)
    else:
        from scipy.interpolate import RegularGridInterpolator

        Re = arrays["Re"]
        rs, ss = np.unique(Re), np.unique(S)
        if rs.size < 2 or ss.size < 2 or rs.size * ss.size != len(S):
            raise InputError("aero table", f"{name}: with a Re column the rows must be a full grid (every S at "
                                           f"every Re, at least 2 of each): {ss.size} S values x {rs.size} Re "
                                           f"values need {ss.size * rs.size} rows, got {len(S)}")
        i, j = np.searchsorted(rs, Re), np.searchsorted(ss, S)
        grid_cd, grid_cl = np.full((rs.size, ss.size), np.nan), np.full((rs.size, ss.size), np.nan)
        grid_cd[i, j], grid_cl[i, j] = CD, CL
        if np.isnan(grid_cd).any():
            raise InputError("aero table", f"{name}: a point of the (Re, S) grid appears twice and another is missing")
        f_cd = RegularGridInterpolator((rs, ss), grid_cd)
        f_cl = RegularGridInterpolator((rs, ss), grid_cl)

        def coefficients(s, re, v, rpm):
            s = np.asarray(s, dtype=float)
            shape = np.broadcast(s, np.asarray(re, dtype=float)).shape
            pts = np.stack([np.clip(np.broadcast_to(re, shape), rs[0], rs[-1]).ravel(),
                            np.clip(np.broadcast_to(s, shape), ss[0], ss[-1]).ravel()], axis=-1)
            return f_cd(pts).reshape(shape), f_cl(pts).reshape(shape) * (s > 0.0)
        re_range = (float(rs[0]), float(rs[-1]))
    return CoefficientModel("table", "Your own aerodynamic table", f"{name}, entered by the user", coefficients,
                            (float(S.min()), float(S.max())), re_range, False,
                            note="CD and CL as tabulated, interpolated linearly and held at the table's edges.",
                            provenance={"cd": "user data", "cl": "user data", "range": "the table's"})


def model(key: str) -> CoefficientModel:
    """The coefficient model for ``key``; unknown keys raise :class:`ValueError` listing valid ones."""
    return pick_model("coefficient model", key, MODELS)


def ball_table() -> list[dict]:
    """Rows describing every ball (for pages and documentation)."""
    rows = []
    for b in BALLS.values():
        rows.append({"ball": b.name, "key": b.key, "diameter_m": b.diameter_m, "mass_kg": b.mass_kg,
                     "rule": b.rule, "default model": MODELS[b.model].label(),
                     "spin decay": b.spin_decay_source})
    return rows


def check_ball_key(key: str) -> str:
    """Raise :class:`InputError` (one line, listing the valid keys) for an unknown ball."""
    if key not in BALL_KEYS:
        raise InputError("ball", f"ball must be one of {', '.join(BALL_KEYS)} (got {key!r})")
    return key
