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


def margin(o: Obstacle, carry_m, lateral_m, height_at_m=np.nan, lateral_at_m=np.nan) -> np.ndarray:
    """The margin by which flights clear (+) or miss (-) one obstacle (arrays broadcast).

    Parameters
    ----------
    o : Obstacle
    carry_m, lateral_m : float or array
        Where each flight first lands (drift right +). [m]
    height_at_m, lateral_at_m : float or array
        Where it crosses the obstacle's distance (NaN if it never gets there; unused for "land"). [m]

    Returns
    -------
    numpy.ndarray
        The smallest of the distances that decide it [m]; a ball that lands short of a wall or a
        goal misses by how far short it lands.

    Notes
    -----
    With half width w/2 (0 = endless), height h and the crossing at height z, drift y:

    * over: z - h, or max(z - h, |y| - w/2) for a wall of finite width (over it or round its end);
    * through: min(h - z, w/2 - |y|, z) (under the bar, inside the posts, above the ground);
    * land: min(carry - d, end - carry, w/2 - |lateral|).
    """
    carry = np.asarray(carry_m, dtype=float)
    lat = np.asarray(lateral_m, dtype=float)
    half = 0.5 * o.width_m
    if o.kind == "land":
        return np.minimum(np.minimum(carry - o.distance_m, o.end_m - carry), half - np.abs(lat))
    zh = np.asarray(height_at_m, dtype=float)
    yh = np.asarray(lateral_at_m, dtype=float)
    if o.kind == "over":
        m = zh - o.height_m if half == 0 else np.maximum(zh - o.height_m, np.abs(yh) - half)
    else:
        m = np.minimum(np.minimum(o.height_m - zh, half - np.abs(yh)), zh)
    short = (carry < o.distance_m) | ~np.isfinite(zh)
    return np.where(short, carry - o.distance_m, m)


def check(path: dict, carry_m: float, lateral_m: float, o: Obstacle) -> dict:
    """How one flight clears (+) or misses (-) one obstacle, read off its sampled path.

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
        ``name``, ``kind``, ``clears`` (bool), ``margin_m`` (:func:`margin`), ``height_m`` /
        ``lateral_m`` where it crosses (or lands; None when it lands short), ``rule``, and
        ``lands_short`` when it lands before a wall or goal.
    """
    x, z, y = (np.asarray(path[k], dtype=float) for k in ("x_m", "z_m", "lateral_m"))
    first = x <= carry_m + 1e-9
    x, z, y = x[first], z[first], y[first]
    out = {"name": o.name, "kind": o.kind, "rule": o.rule}
    if o.kind == "land":
        m = float(margin(o, carry_m, lateral_m))
        return {**out, "clears": bool(m >= 0), "margin_m": m, "height_m": 0.0, "lateral_m": float(lateral_m)}
    if carry_m < o.distance_m or x.size < 2:  # never gets there: margin() says by how much
        return {**out, "clears": False, "margin_m": float(margin(o, carry_m, lateral_m)), "height_m": None,
                "lateral_m": None, "lands_short": True}
    zh, yh = float(np.interp(o.distance_m, x, z)), float(np.interp(o.distance_m, x, y))
    m = float(margin(o, carry_m, lateral_m, zh, yh))
    return {**out, "clears": bool(m >= 0), "margin_m": m, "height_m": zh, "lateral_m": yh}


def gate_distances(obstacles) -> tuple:
    """The distances a batch must keep crossings at for ``obstacles``.

    Parameters
    ----------
    obstacles : sequence of Obstacle

    Returns
    -------
    tuple of float
        The downrange distance of every wall, net and goal, in order (landing areas need none:
        their margin comes from the landing point). [m]
    """
    return tuple(o.distance_m for o in obstacles if o.kind != "land")


def batch_margins(obstacles, res) -> dict:
    """Margins of every flight of a batch over each obstacle, the batch flown with
    ``gates=gate_distances(obstacles)`` (:func:`liftcore.ballflight.simulate`).

    Parameters
    ----------
    obstacles : sequence of Obstacle
    res : liftcore.ballflight.BatchResult

    Returns
    -------
    dict
        Obstacle name -> margin per flight [m] (:func:`margin`).
    """
    out, g = {}, 0
    for o in obstacles:
        if o.kind == "land":
            out[o.name] = margin(o, res.carry_m, res.lateral_m)
        else:
            out[o.name] = margin(o, res.carry_m, res.lateral_m, res.gate_height_m[g], res.gate_lateral_m[g])
            g += 1
    return out


def rules_table(obstacles, checks=()) -> list[dict]:
    """One row per obstacle: what it is, its dimensions, the rule they come from and, with
    ``checks`` (:func:`check`), how the flight clears it: for the handout and the page.

    Returns
    -------
    list of dict
        ``obstacle``, ``test``, ``distance_m``, ``height_m``, ``width_m`` (0 = endless),
        ``far_end_m`` (landing areas), ``margin_m``, ``clears``, ``rule``.
    """
    tests = {"over": "pass over", "through": "pass through", "land": "land in"}
    by_name = {c["name"]: c for c in checks}
    rows = []
    for o in obstacles:
        c = by_name.get(o.name)
        rows.append({"obstacle": o.name, "test": tests[o.kind], "distance_m": o.distance_m,
                     "height_m": o.height_m if o.kind != "land" else float("nan"), "width_m": o.width_m,
                     "far_end_m": o.end_m if o.kind == "land" else float("nan"),
                     "margin_m": float("nan") if c is None else c["margin_m"],
                     "clears": "" if c is None else ("yes" if c["clears"] else "no"), "rule": o.rule})
    return rows
