"""Does it clear? Walls and nets to pass over, goal frames to pass through, boxes to land in.

Each check reads the flight's path where it crosses the obstacle's downrange distance (linear
interpolation between path samples: millimetres on a path sampled every few tenths of a metre)
and gives a margin in metres: positive clears (or is inside), negative misses, by that much.

Presets follow the governing bodies' rules (the dimensions from memory; each cites its rule):

* free kick: the wall 9.15 m from the ball (IFAB Laws of the Game, Law 13), a wall 1.8 m high and
  3 m wide (common practice: four players), the goal 7.32 m wide and 2.44 m high (Law 1), at the
  goal distance entered;
* tennis serve from the baseline: the net 11.885 m away and 0.914 m high at the centre, the
  service line 6.40 m beyond it, singles width 8.23 m (ITF Rules of Tennis, Rules 1 and 3; both
  service boxes together: the centre service line is not checked);
* volleyball serve from the end line: the net 9 m away, 2.43 m high (men) and the opposite court
  9 m x 9 m (FIVB Official Volleyball Rules, Rules 1.1 and 2.1);
* table tennis from the end line: the net 1.37 m away, 0.1525 m high, the opposite half 1.37 m
  long and 1.525 m wide (ITTF Handbook, Laws 2.1 and 2.2).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from liftcore.errors import check_choice, check_number


@dataclass(frozen=True)
class Obstacle:
    """``kind``: "over" (pass above ``height_m`` within ``width_m``; 0 = any width), "through"
    (pass below ``height_m`` and within ``width_m``) or "land" (land between ``distance_m`` and
    ``end_m``, within ``width_m``). Widths are centred on the target line."""

    name: str
    kind: str
    distance_m: float
    height_m: float = 0.0
    width_m: float = 0.0
    end_m: float = 0.0
    rule: str = ""


FREE_KICK_WALL_M = 9.15
PRESETS = ("none", "free_kick", "tennis_serve", "volleyball_serve", "table_tennis", "custom")
PRESET_LABELS = ("No obstacle", "Free kick: wall and goal", "Tennis serve: net and service boxes",
                 "Volleyball serve: net and court", "Table tennis: net and far half", "A wall of my own")


def preset(key: str, goal_distance_m: float = 20.0, custom=(10.0, 2.0, 0.0)) -> tuple[Obstacle, ...]:
    """The obstacles of a preset.

    Parameters
    ----------
    key : str
        One of :data:`PRESETS`.
    goal_distance_m : float
        Free kick: from the ball to the goal line. [m]
    custom : tuple
        Distance, height and width (0 = endless) of your own wall. [m]

    Returns
    -------
    tuple of Obstacle
        In the order the ball meets them.

    References
    ----------
    .. [1] IFAB Laws of the Game, Laws 1 and 13; ITF Rules of Tennis, Rules 1 and 3; FIVB Official
       Volleyball Rules, Rules 1.1 and 2.1; ITTF Handbook, Laws 2.1 and 2.2 (dimensions from memory).
    """
    check_choice("obstacle", key, PRESETS)
    if key == "none":
        return ()
    if key == "free_kick":
        g = check_number("goal distance", goal_distance_m, "m", low=FREE_KICK_WALL_M + 1.0, high=60.0)
        return (Obstacle("wall", "over", FREE_KICK_WALL_M, 1.8, 3.0, rule="IFAB Law 13 (9.15 m); wall size common practice"),
                Obstacle("goal", "through", g, 2.44, 7.32, rule="IFAB Law 1 (7.32 m x 2.44 m)"))
    if key == "tennis_serve":
        return (Obstacle("net", "over", 11.885, 0.914, 0.0, rule="ITF Rules of Tennis, Rule 3 (0.914 m at the centre)"),
                Obstacle("service boxes", "land", 11.885, 0.0, 8.23, 11.885 + 6.40, rule="ITF Rule 1 (6.40 m, 8.23 m)"))
    if key == "volleyball_serve":
        return (Obstacle("net", "over", 9.0, 2.43, 0.0, rule="FIVB Rule 2.1 (2.43 m, men)"),
                Obstacle("court", "land", 9.0, 0.0, 9.0, 18.0, rule="FIVB Rule 1.1 (9 m x 9 m per side)"))
    if key == "table_tennis":
        return (Obstacle("net", "over", 1.37, 0.1525, 0.0, rule="ITTF Law 2.2 (15.25 cm)"),
                Obstacle("far half", "land", 1.37, 0.0, 1.525, 2.74, rule="ITTF Law 2.1 (2.74 m x 1.525 m)"))
    d, h, w = custom
    return (Obstacle("your wall", "over", check_number("wall distance", d, "m", low=0.1, high=500.0),
                     check_number("wall height", h, "m", low=0.0, high=100.0),
                     check_number("wall width", w, "m", low=0.0, high=100.0), rule="entered"),)


def check(path: dict, carry_m: float, lateral_m: float, o: Obstacle) -> dict:
    """The margin by which a flight clears (+) or misses (-) one obstacle.

    Parameters
    ----------
    path : dict
        The flight's sampled path (``x_m``, ``z_m``, ``lateral_m``), first arc up to ``carry_m``.
    carry_m, lateral_m : float
        Where it first lands. [m]
    o : Obstacle

    Returns
    -------
    dict
        ``name``, ``clears`` (bool), ``margin_m`` (the smallest of the distances that decide it),
        ``height_m`` / ``lateral_m`` where it crosses (or lands), ``rule``.
    """
    x, z, y = (np.asarray(path[k], dtype=float) for k in ("x_m", "z_m", "lateral_m"))
    first = x <= carry_m + 1e-9
    x, z, y = x[first], z[first], y[first]
    half = 0.5 * o.width_m
    if o.kind == "land":
        margin = min(carry_m - o.distance_m, o.end_m - carry_m, half - abs(lateral_m))
        return {"name": o.name, "kind": o.kind, "clears": bool(margin >= 0), "margin_m": float(margin),
                "height_m": 0.0, "lateral_m": float(lateral_m), "rule": o.rule}
    if carry_m < o.distance_m or x.size < 2:
        return {"name": o.name, "kind": o.kind, "clears": False, "margin_m": float(carry_m - o.distance_m),
                "height_m": None, "lateral_m": None, "rule": o.rule, "lands_short": True}
    zh, yh = float(np.interp(o.distance_m, x, z)), float(np.interp(o.distance_m, x, y))
    if o.kind == "over":
        above = zh - o.height_m
        margin = above if half == 0 else max(above, abs(yh) - half)  # over it, or round its end
    else:
        margin = min(o.height_m - zh, half - abs(yh), zh)
    return {"name": o.name, "kind": o.kind, "clears": bool(margin >= 0), "margin_m": float(margin), "height_m": zh,
            "lateral_m": yh, "rule": o.rule}
