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

Provenance: the impact relations are textbook rigid-body mechanics (Brody 1984); the grounds'
e, mu and mu_r are **from memory** of published ranges (golf on turf after Penner 2002 and
Haake's measurements; a hard court after Cross 2002) except the tennis court's e, which follows
from the ITF ball rebound rule (dropped from 254 cm, a ball rebounds 135-147 cm on concrete:
e = sqrt(141 / 254) = 0.745). Real turf is not rigid: the ball digs a pitch mark (Penner 2002), so
a first bounce on soft ground is less certain than the roll.

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
    """A surface: normal restitution ``e``, sliding friction ``mu`` and rolling resistance ``mu_r``."""

    label: str
    e: float
    mu: float
    mu_r: float
    source: str


#: On turf mu_r is an effective value that also stands for the grass the ball ploughs through
#: (fairway decelerations of a few m/s^2), which a rigid ground does not have.
GROUNDS = {
    "turf_soft": Ground("Soft turf (wet fairway)", 0.25, 0.40, 0.80, "from memory (Penner 2002 ranges)"),
    "turf_medium": Ground("Medium turf (fairway)", 0.40, 0.40, 0.50, "from memory (Penner 2002 ranges)"),
    "turf_firm": Ground("Firm turf (dry fairway)", 0.55, 0.40, 0.30, "from memory (Penner 2002 ranges)"),
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


def impact(v_t: float, v_n: float, r_w: float, ground: Ground, k: float) -> tuple[float, float, float, bool]:
    """One bounce: (v_t', v_n', r w_b', gripped).

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
    See the module notes (Brody 1984). Conserved: the angular momentum about the contact point
    (v_t - k r w_b is unchanged), and the normal speed is scaled by e exactly.
    """
    u = v_t + r_w
    grip = k * abs(u) / (1.0 + k)
    slide = ground.mu * (1.0 + ground.e) * abs(v_n)
    j = min(slide, grip)
    s = math.copysign(1.0, u) if u else 0.0
    return v_t - s * j, ground.e * abs(v_n), r_w - s * j / k, slide >= grip


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
