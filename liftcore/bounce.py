"""What a ball does after it first lands: bounces on the ground, slides, rolls to rest.

Each impact is a rigid-body collision with the ground (Brody 1984; Cross 2002 for its limits)::

    v_n' = e v_n                                         (normal coefficient of restitution e)
    u    = v_t + r w_b                                   (slip of the contact point; w_b backspin)
    J/m  = min(mu (1 + e) |v_n|, k |u| / (1 + k))        (friction impulse, at most what stops the slip)
    v_t' = v_t - sign(u) J/m,   r w_b' = r w_b - sign(u) J/(m k)

with k = I / (m r^2) (2/5 for a solid ball, 2/3 for a thin shell). If friction is large enough
the contact point ends at rest: the ball leaves rolling (it "grips"); otherwise it slides
throughout. Between bounces the ball hops in vacuum (short, low hops: the air changes them
little); when a hop is lower than :data:`MIN_HOP_M_S` the ball slides until it rolls and then
rolls to rest against rolling resistance, deceleration mu_r g / (1 + k).

The first bounce of a court ball is also given for the charts, whose path after it is flown
again with the full air model.

On turf the ball does not meet a flat rigid ground: it digs a pitch mark and meets the mark's
far wall, a plane inclined at the crater angle theta_c (Penner 2002, from Haake's measurements of
golf balls on turf)::

    theta_c = 15.4 deg x (v / 18.6 m/s) x (theta_i / 44.4 deg)   (v impact speed, theta_i below horizontal)
    e(v_n)  = 0.510 - 0.0375 v_n + 0.000903 v_n^2   (v_n <= 20 m/s; 0.120 above)

with v_n the speed into that plane and sliding friction mu = 0.43. The impact above is applied
in the plane's frame and turned back to the horizontal: a fast, steep landing loses most of its
forward speed (a drive "checks"); a slow, shallow one skips on. Firmness: soft and firm turf
scale the crater angle and e(v_n) (factors assumed, not from a source); rolling resistance per
turf.

Provenance: the rigid-body impact is textbook mechanics (Brody 1984); Penner's crater angle,
e(v_n) and friction are **from memory** of the paper (not checked against it); the turfs'
firmness factors and rolling resistances are **assumed**; the hard court's e follows from the
ITF ball rebound rule (dropped from 254 cm, a ball rebounds 135-147 cm on concrete:
e = sqrt(141 / 254) = 0.745), its mu and mu_r are from memory (Cross 2002).

Validity: the crater relations were fitted to golf balls landing at roughly 10-30 m/s and
20-60 deg below horizontal (from memory); beyond that the bounce is extrapolated. Only
golf balls on turf use them.

References
----------
.. [1] Brody, H. (1984). That's how the ball bounces. The Physics Teacher 22, 494-497.
.. [2] Cross, R. (2002). Grip-slip behavior of a bouncing ball. Am. J. Phys. 70, 1093-1102.
.. [3] Penner, A. R. (2002). The run of a golf ball. Can. J. Phys. 80, 931-940.
.. [4] ITF (2024). Rules of Tennis, Appendix I (ball rebound, from memory).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from liftcore.constants import G0
from liftcore.errors import check_choice

#: Hops with a vertical speed below this end the bouncing (the ball then slides and rolls). [m/s]
MIN_HOP_M_S = 0.3
#: Most bounces followed. [-]
MAX_BOUNCES = 30


@dataclass(frozen=True)
class Ground:
    """A surface: normal restitution ``e``, sliding friction ``mu`` and rolling resistance ``mu_r``.

    ``crater_scale`` > 0 makes it turf (Penner 2002, module notes): each impact meets the pitch
    mark's wall at ``crater_scale`` x Penner's crater angle, and ``e`` is then a factor on
    Penner's e(v_n) rather than the restitution itself.
    """

    label: str
    e: float
    mu: float
    mu_r: float
    source: str
    crater_scale: float = 0.0

    def describe(self) -> str:
        """The model and its numbers, in words (for warnings and the handout)."""
        if self.crater_scale:
            return (f"pitch-mark impact after Penner (2002): crater angle x{self.crater_scale:g}, e(v_n) "
                    f"x{self.e:g}, friction {self.mu:g}, rolling resistance {self.mu_r:g} ({self.source})")
        return (f"rigid-ground impact (Brody 1984) with e {self.e:g}, friction {self.mu:g}, rolling "
                f"resistance {self.mu_r:g} ({self.source})")

    def restitution(self, v_n: float) -> float:
        """Normal coefficient of restitution at the speed ``v_n`` into the surface [m s^-1]:
        ``e`` on a rigid ground, ``e`` x :func:`turf_restitution` on turf. [-]"""
        return self.e * turf_restitution(v_n) if self.crater_scale else self.e


#: On turf mu_r is an effective value that also stands for the grass the ball ploughs through
#: (fairway decelerations of a few m/s^2), which a rigid ground does not have.
GROUNDS = {
    "turf_soft": Ground("Soft turf (wet fairway)", 0.85, 0.43, 0.80,
                        "Penner 2002 from memory; firmness factors and mu_r assumed", crater_scale=1.3),
    "turf_medium": Ground("Medium turf (fairway)", 1.0, 0.43, 0.50,
                          "Penner 2002 from memory; mu_r assumed", crater_scale=1.0),
    "turf_firm": Ground("Firm turf (dry fairway)", 1.15, 0.43, 0.30,
                        "Penner 2002 from memory; firmness factors and mu_r assumed", crater_scale=0.7),
    "hard_court": Ground("Hard court", 0.745, 0.60, 0.02,
                         "e from the ITF rebound rule; mu and mu_r from memory (Cross 2002)"),
}
GROUND_KEYS = tuple(GROUNDS)
#: Moment-of-inertia factor k = I / (m r^2): thin shells (hollow balls) and solid balls (common practice).
SHELL_BALLS = ("tennis", "table_tennis", "volleyball", "soccer")
#: Ground each ball meets by default (None: no bounce or roll).
BALL_GROUND = {"golf": "turf_medium", "tennis": "hard_court", "table_tennis": "hard_court"}


def inertia_factor(ball_key: str) -> float:
    """k = I / (m r^2): 2/3 for a thin shell, 2/5 for a solid ball (common practice). [-]"""
    return 2.0 / 3.0 if ball_key in SHELL_BALLS else 0.4


#: Penner (2002): crater angle at Haake's reference impact, and that impact's speed and angle.
CRATER_DEG, CRATER_SPEED_M_S, CRATER_ANGLE_DEG = 15.4, 18.6, 44.4
#: Impacts the crater relations were fitted to, roughly (from memory): speed [m/s], angle below
#: the horizontal [deg]. Landings outside are warned about.
PENNER_SPEED_M_S, PENNER_ANGLE_DEG = (10.0, 30.0), (20.0, 60.0)
#: Penner (2002): e(v_n) = a + b v_n + c v_n^2 up to ``PENNER_E_V_MAX``, ``PENNER_E_FAST`` above.
PENNER_E = (0.510, -0.0375, 0.000903)
PENNER_E_V_MAX, PENNER_E_FAST = 20.0, 0.120


def turf_restitution(v_n: float) -> float:
    """Normal coefficient of restitution of a golf ball on turf (Penner 2002, from memory).

    Parameters
    ----------
    v_n : float
        Speed into the pitch mark's wall. [m s^-1]

    Returns
    -------
    float
        e [-].

    Notes
    -----
    e = 0.510 - 0.0375 v_n + 0.000903 v_n^2 for v_n <= 20 m/s, 0.120 above (the two meet there).

    References
    ----------
    .. [1] Penner, A. R. (2002). The run of a golf ball. Can. J. Phys. 80, 931-940 (from memory).
    """
    v = abs(v_n)
    if v > PENNER_E_V_MAX:
        return PENNER_E_FAST
    a, b, c = PENNER_E
    return a + b * v + c * v * v


def crater_angle(v_t: float, v_n: float, ground: Ground) -> float:
    """The pitch mark's wall angle met by a landing ball (0 on a rigid ground). [rad]

    Parameters
    ----------
    v_t, v_n : float
        Horizontal and downward speed at the impact. [m s^-1]
    ground : Ground

    Returns
    -------
    float
        theta_c [rad], at most 90 deg less the impact angle (the wall never faces backwards).

    Notes
    -----
    theta_c = s 15.4 deg (v / 18.6 m/s)(theta_i / 44.4 deg), s = ``ground.crater_scale``.

    References
    ----------
    .. [1] Penner, A. R. (2002). The run of a golf ball. Can. J. Phys. 80, 931-940 (from memory).
    """
    if not ground.crater_scale or v_n <= 0:
        return 0.0
    speed = math.hypot(v_t, v_n)
    theta_i = math.degrees(math.atan2(v_n, abs(v_t)))
    theta_c = ground.crater_scale * CRATER_DEG * (speed / CRATER_SPEED_M_S) * (theta_i / CRATER_ANGLE_DEG)
    return math.radians(min(theta_c, 89.0 - theta_i))


def impact(v_t: float, v_n: float, r_w: float, ground: Ground, k: float) -> tuple[float, float, float, bool]:
    """One bounce: (v_t', v_n', r w_b', gripped); on turf, off the pitch mark's wall.

    Parameters
    ----------
    v_t : float
        Horizontal speed along the path before the impact. [m s^-1]
    v_n : float
        Downward speed before the impact (> 0). [m s^-1]
    r_w : float
        Radius x backspin rate (+: backspin, -: topspin). [m s^-1]
    ground : Ground
        e, mu of the surface.
    k : float
        I / (m r^2). [-]

    Returns
    -------
    tuple
        Speeds after the impact [m s^-1] and whether the contact point ended at rest.

    Notes
    -----
    See the module notes (Brody 1984; Penner 2002 on turf). In the frame of the surface met (the
    ground, or on turf the pitch mark's wall at :func:`crater_angle`) the normal speed is scaled
    by e exactly and the angular momentum about the contact point (v_t - k r w_b) is unchanged.
    After a turf impact v_n' is the upward speed over the level ground (it may be below
    :data:`MIN_HOP_M_S`, or negative for a ball that digs in: it then slides and rolls).

    References
    ----------
    .. [1] Brody, H. (1984). That's how the ball bounces. The Physics Teacher 22, 494-497.
    .. [2] Penner, A. R. (2002). The run of a golf ball. Can. J. Phys. 80, 931-940.
    """
    c = crater_angle(v_t, v_n, ground)
    cos_c, sin_c = math.cos(c), math.sin(c)
    # into the frame of the surface met: tangent (cos c, sin c), normal (-sin c, cos c)
    vt_p = v_t * cos_c - abs(v_n) * sin_c
    vn_p = v_t * sin_c + abs(v_n) * cos_c
    e = ground.restitution(vn_p)
    u = vt_p + r_w
    grip = k * abs(u) / (1.0 + k)
    slide = ground.mu * (1.0 + e) * vn_p
    j = min(slide, grip)
    s = math.copysign(1.0, u) if u else 0.0
    vt_out, vn_out = vt_p - s * j, e * vn_p
    # back to the level ground
    return vt_out * cos_c - vn_out * sin_c, vt_out * sin_c + vn_out * cos_c, r_w - s * j / k, slide >= grip


def run_out(v_t: float, v_n: float, r_w: float, ground: Ground, k: float, g: float = G0) -> dict:
    """Bounces, slide and roll from the first landing to rest, along the landing heading.

    Parameters
    ----------
    v_t, v_n, r_w : float
        At the first landing, as :func:`impact`. [m s^-1]
    ground : Ground
    k : float
        I / (m r^2). [-]
    g : float
        [m s^-2]

    Returns
    -------
    dict
        ``distance_m`` (from the first landing to rest along the heading; negative if the ball
        screws back), ``bounces`` (list of (v_t', v_n', r w')), ``bounce_m``, ``slide_m``,
        ``roll_m`` (each part's distance), ``time_s``.

    Notes
    -----
    Hops: t = 2 v_n' / g, distance v_t' t. Slide to roll: v_roll = v_t - k u / (1 + k) at
    deceleration mu g; roll: v_roll^2 / (2 mu_r g / (1 + k)).
    """
    bounces, hop_m, t = [], 0.0, 0.0
    for _ in range(MAX_BOUNCES):
        v_t, v_n, r_w, _ = impact(v_t, v_n, r_w, ground, k)
        bounces.append((v_t, v_n, r_w))
        if v_n < MIN_HOP_M_S:
            break
        hop = 2.0 * v_n / g
        hop_m += v_t * hop
        t += hop
    u = v_t + r_w
    v_roll = v_t - k * u / (1.0 + k)
    slide_m = 0.0
    if u:
        # sliding friction mu g changes v_t until the contact point stops (v_t -> v_roll)
        slide_t = abs(v_t - v_roll) / (ground.mu * g)
        slide_m = 0.5 * (v_t + v_roll) * slide_t
        t += slide_t
    decel = ground.mu_r * g / (1.0 + k)
    roll_m = math.copysign(v_roll * v_roll / (2.0 * decel), v_roll) if decel > 0 else math.inf
    t += abs(v_roll) / decel if decel > 0 else math.inf
    return {"distance_m": hop_m + slide_m + roll_m, "bounces": bounces, "bounce_m": hop_m,
            "slide_m": slide_m, "roll_m": roll_m, "time_s": t}


def landing_components(state, axis) -> tuple[float, float, float, np.ndarray]:
    """The landing speeds and backspin of a flight, in the frame of its heading.

    Parameters
    ----------
    state : ndarray, shape (7,)
        [x, y, z, vx, vy, vz, omega] at the landing (internal frame, y to the left). [m], [m s^-1],
        [rad s^-1]
    axis : ndarray, shape (3,)
        Unit spin axis.

    Returns
    -------
    tuple
        (v_t horizontal speed [m s^-1], v_n downward speed [m s^-1], backspin rate w_b
        [rad s^-1], unit horizontal heading).

    Notes
    -----
    w_b = omega axis . (-(z x heading)): the spin about the horizontal axis square to the path,
    positive for backspin (the launch's tilt 0).
    """
    vx, vy, vz, w = float(state[3]), float(state[4]), float(state[5]), float(state[6])
    v_t = math.hypot(vx, vy)
    heading = np.array([vx, vy, 0.0]) / v_t if v_t > 0 else np.array([1.0, 0.0, 0.0])
    left = np.cross([0.0, 0.0, 1.0], heading)
    return v_t, -vz, w * float(np.dot(axis, -left)), heading


def ground(key: str) -> Ground:
    """The ground called ``key``.

    Parameters
    ----------
    key : str
        One of :data:`GROUND_KEYS`.

    Returns
    -------
    Ground
        Its restitution, friction and rolling resistance [-] with their provenance.
    """
    check_choice("ground", key, GROUNDS)
    return GROUNDS[key]
