"""Circulation and lift per span from a measured (gridded) 2-D velocity field.

A wind-tunnel survey or a CFD export gives the velocity (u, v) on a regular grid round a body.
The circulation is the line integral of the velocity round a closed loop that encloses the body,
Gamma = oint V . ds; once the loop encloses the body and its viscous region, Gamma no longer
depends on the loop (Stokes: only the vorticity inside counts, and the potential flow outside
has none). Kutta-Joukowski then gives the lift per span, L' = rho V_inf Gamma.

Sign convention (the same as :mod:`liftcore.potential`): loops are run **clockwise** in the x-y
plane (y up), so a cylinder in a stream along +x that lifts toward +y has positive circulation.
Lift is reported along the direction 90 deg counter-clockwise from the free stream (toward +y
for a stream along +x), positive or negative.

Field file format (our own, plain CSV, SI units)
-------------------------------------------------
- Optional comment lines starting with ``#`` (anywhere; the demo file says it is invented).
- A header row naming the columns ``x, y, u, v`` (any order, any case; other columns ignored):
  position along x and y [m] and the velocity components along x and y [m/s].
- One row per grid point, any row order. The distinct x values must be evenly spaced, the
  distinct y values too (the two spacings may differ), and every (x, y) pair of the grid must
  appear exactly once: a regular, complete grid without duplicates, at least 4 x 4 points and
  at most 2 000 000.
- Points inside the body may hold any finite value (0 is usual); loops must keep at least one
  grid cell clear of the body, so the interpolation never uses them.
"""

from __future__ import annotations

import io
import math
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

import numpy as np
import pandas as pd

from liftcore.errors import InputError, check_choice, check_number, check_positive
from liftcore.validity import ModelWarning, merge, quantity_warning

#: Largest field file read, and the largest number of grid points accepted.
MAX_FIELD_BYTES = 50_000_000
MAX_FIELD_POINTS = 2_000_000
MIN_POINTS_PER_AXIS = 4
#: A coordinate may sit this fraction of a grid step off the regular grid (printed rounding).
GRID_TOLERANCE = 1e-3
#: Interpolation samples per grid step along a loop.
SAMPLES_PER_CELL = 8
#: Most loops, and most sample points over all loops (a loop that fits a grid of
#: MAX_FIELD_POINTS points has far fewer; this bounds what a user input can make).
MAX_LOOPS = 200
#: Largest velocity component and coordinate a field may hold [m/s], [m]: far beyond any
#: incompressible flow or measurement grid, and small enough that a circulation cannot overflow.
MAX_FIELD_SPEED_M_S = 1000.0
MAX_FIELD_COORDINATE_M = 1.0e6
MAX_LOOP_POINTS = 2_000_000
LOOP_SHAPES = ("circle", "rectangle")
REQUIRED_COLUMNS = ("x", "y", "u", "v")
#: The shipped demo field (invented: ideal flow + synthetic wake + noise; see liftcore.demo_field).
DEMO_FIELD_PATH = Path(__file__).parent / "data" / "demo_field_invented.csv"

REFERENCES = (
    "Kutta-Joukowski theorem: lift per span = density x free-stream speed x circulation; "
    "Anderson, J. D. (2017). Fundamentals of Aerodynamics, 6th ed., chapter 3.",
    "Circulation as the line integral of velocity, equal by Stokes' theorem to the vorticity "
    "enclosed; Batchelor, G. K. (1967). An Introduction to Fluid Dynamics, chapter 2.",
    "SciPy RegularGridInterpolator (bilinear interpolation on a rectilinear grid); Virtanen, P. "
    "et al. (2020). SciPy 1.0. Nature Methods 17, 261-272.",
)


# ----------------------------------------------------------------------------- the field
@dataclass(frozen=True, eq=False)
class VelocityField:
    """A velocity field on a regular grid (SI).

    Attributes
    ----------
    x_m : ndarray, shape (nx,)
        Ascending, evenly spaced grid positions along x. [m]
    y_m : ndarray, shape (ny,)
        Ascending, evenly spaced grid positions along y. [m]
    u_m_s, v_m_s : ndarray, shape (nx, ny)
        Velocity components along x and y; ``u_m_s[i, j]`` is at ``(x_m[i], y_m[j])``. [m s^-1]
    """

    x_m: np.ndarray
    y_m: np.ndarray
    u_m_s: np.ndarray
    v_m_s: np.ndarray

    @property
    def spacing_m(self) -> tuple[float, float]:
        """Grid steps (dx, dy). [m]"""
        return (float(self.x_m[1] - self.x_m[0]), float(self.y_m[1] - self.y_m[0]))

    @property
    def extent_m(self) -> tuple[float, float, float, float]:
        """(x_min, x_max, y_min, y_max). [m]"""
        return (float(self.x_m[0]), float(self.x_m[-1]), float(self.y_m[0]), float(self.y_m[-1]))

    @property
    def shape(self) -> tuple[int, int]:
        return (self.x_m.size, self.y_m.size)


def read_field_csv(source, name: str = "velocity field") -> pd.DataFrame:
    """Read a field file (see the module notes for the format) into a table, unvalidated.

    Parameters
    ----------
    source : str, Path, bytes or file-like
        A path, the file's bytes (e.g. an upload) or an open binary/text file.
    name : str
        How the file is named in error messages.

    Returns
    -------
    pandas.DataFrame
        The rows as read; :func:`field_from_table` validates them.
    """
    if isinstance(source, (str, Path)):
        from liftcore.files import read_bytes  # regular files only, the cap applied while reading

        data = read_bytes(source, name, MAX_FIELD_BYTES)
    elif isinstance(source, (bytes, bytearray)):
        data = bytes(source)
    else:
        data = source.read()
        if isinstance(data, str):
            data = data.encode("utf-8")
    if len(data) > MAX_FIELD_BYTES:
        raise InputError("file", f"{name} is {len(data)} bytes; field files must be at most "
                                 f"{MAX_FIELD_BYTES} bytes")
    if not data.strip():
        raise InputError("file", f"{name} is empty; it needs a header row x,y,u,v and one row per grid point")
    try:
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError:
        raise InputError("file", f"{name} is not UTF-8 text (is it a CSV file with columns x, y, u, v?)") from None
    try:
        # Only an empty cell is missing: a written "nan" or "inf" stays text and is named as typed.
        return pd.read_csv(io.StringIO(text), comment="#", skipinitialspace=True,
                           keep_default_na=False, na_values=[""])
    except (pd.errors.ParserError, pd.errors.EmptyDataError, ValueError) as exc:
        first = str(exc).strip().splitlines()[0] if str(exc).strip() else type(exc).__name__
        raise InputError("file", f"{name} is not a readable CSV table: {first}") from None


def _axis(values: np.ndarray, axis: str, rows_label) -> tuple[np.ndarray, np.ndarray]:
    """Grid positions of one axis and each row's index on it; refuses uneven spacing."""
    lo, hi = float(values.min()), float(values.max())
    span = hi - lo
    if span <= 0.0:
        raise InputError(axis, f"velocity field: all {axis} values are {lo:.6g} m; the grid needs "
                               f"at least {MIN_POINTS_PER_AXIS} distinct {axis} positions")
    # distinct levels, merging values that differ only by rounding (1e-7 of the span)
    levels = np.unique(values)
    keep = np.concatenate(([True], np.diff(levels) > 1e-7 * span))
    n = int(keep.sum())
    if n < MIN_POINTS_PER_AXIS:
        raise InputError(axis, f"velocity field has {n} distinct {axis} positions; the grid needs at "
                               f"least {MIN_POINTS_PER_AXIS}")
    step = span / (n - 1)
    pos = (values - lo) / step
    idx = np.rint(pos).astype(np.int64)
    off = np.abs(pos - idx)
    bad = np.flatnonzero(off > GRID_TOLERANCE)
    if bad.size:
        k = int(bad[0])
        raise InputError(axis, f"velocity field: {axis} values are not evenly spaced: {axis} = "
                               f"{values[k]:.6g} m in data row {rows_label(k)} is {off[k]:.2f} of a "
                               f"step off the regular grid ({n} positions from {lo:.6g} to {hi:.6g} m, "
                               f"step {step:.6g} m)")
    return lo + step * np.arange(n), idx


def field_from_table(table: pd.DataFrame) -> VelocityField:
    """Validate a table of (x, y, u, v) rows and arrange it as a regular grid.

    Raises
    ------
    InputError
        Missing columns, values that are not finite numbers, an uneven grid, duplicate or
        missing grid points, or too few or too many points, naming the problem and the data row
        (1 = the first row after the header, not counting ``#`` comment lines).
    """
    if not isinstance(table, pd.DataFrame):
        raise InputError("file", "velocity field must be a table with columns x, y, u, v")
    cols = {str(c).strip().lower(): c for c in table.columns}
    missing = [c for c in REQUIRED_COLUMNS if c not in cols]
    if missing:
        found = ", ".join(str(c) for c in table.columns) or "none"
        raise InputError("columns", f"velocity field is missing column{'s' if len(missing) > 1 else ''} "
                                    f"{', '.join(missing)}; it needs x, y, u, v (found: {found})")
    n = len(table)
    if n < MIN_POINTS_PER_AXIS ** 2:
        raise InputError("rows", f"velocity field has {n} rows; it needs at least "
                                 f"{MIN_POINTS_PER_AXIS ** 2} ({MIN_POINTS_PER_AXIS} x {MIN_POINTS_PER_AXIS} grid)")
    if n > MAX_FIELD_POINTS:
        raise InputError("rows", f"velocity field has {n} rows; at most {MAX_FIELD_POINTS} grid points "
                                 "are accepted (thin the grid)")

    def row(k: int) -> int:
        return k + 1

    arrays = {}
    for c in REQUIRED_COLUMNS:
        raw = table[cols[c]]
        vals = pd.to_numeric(raw, errors="coerce").to_numpy(dtype=float)
        bad = np.flatnonzero(~np.isfinite(vals))
        if bad.size:
            k = int(bad[0])
            shown = raw.iloc[k]
            shown = "empty" if (shown is None or (isinstance(shown, float) and math.isnan(shown))) else repr(shown)
            raise InputError(c, f"velocity field: {c} in data row {row(k)} is not a finite number "
                                f"(got {shown}); {c} must be a number in "
                                f"{'m' if c in ('x', 'y') else 'm/s'}")
        limit = MAX_FIELD_COORDINATE_M if c in ("x", "y") else MAX_FIELD_SPEED_M_S
        big = np.flatnonzero(np.abs(vals) > limit)
        if big.size:
            k = int(big[0])
            unit = "m" if c in ("x", "y") else "m/s"
            raise InputError(c, f"velocity field: {c} in data row {row(k)} is {vals[k]:.6g} {unit}; "
                                f"{c} must be between {-limit:g} and {limit:g} {unit}")
        arrays[c] = vals
    xs, ix = _axis(arrays["x"], "x", row)
    ys, iy = _axis(arrays["y"], "y", row)
    nx, ny = xs.size, ys.size
    flat = ix * ny + iy
    order = np.argsort(flat, kind="stable")
    sorted_flat = flat[order]
    dup = np.flatnonzero(np.diff(sorted_flat) == 0)
    if dup.size:
        a, b = sorted(int(k) for k in order[dup[0]:dup[0] + 2])
        raise InputError("rows", f"velocity field: duplicate point (x, y) = ({arrays['x'][b]:.6g}, "
                                 f"{arrays['y'][b]:.6g}) m in data rows {row(a)} and {row(b)}")
    if n != nx * ny:
        present = np.zeros(nx * ny, dtype=bool)
        present[flat] = True
        k = int(np.flatnonzero(~present)[0])
        raise InputError("rows", f"velocity field grid is incomplete: point (x, y) = "
                                 f"({xs[k // ny]:.6g}, {ys[k % ny]:.6g}) m is missing ({nx} x values "
                                 f"times {ny} y values need {nx * ny} rows; got {n})")
    u = np.empty(nx * ny)
    v = np.empty(nx * ny)
    u[flat] = arrays["u"]
    v[flat] = arrays["v"]
    return VelocityField(xs, ys, u.reshape(nx, ny), v.reshape(nx, ny))


def field_to_table(field: VelocityField) -> pd.DataFrame:
    """The field as rows (x, y, u, v), x varying slowest."""
    xx, yy = np.meshgrid(field.x_m, field.y_m, indexing="ij")
    return pd.DataFrame({"x": xx.ravel(), "y": yy.ravel(), "u": field.u_m_s.ravel(),
                         "v": field.v_m_s.ravel()})


@lru_cache(maxsize=1)
def _demo_table() -> pd.DataFrame:
    return read_field_csv(DEMO_FIELD_PATH, DEMO_FIELD_PATH.name)


def demo_field_table() -> pd.DataFrame:
    """The shipped demo field (invented; see :mod:`liftcore.demo_field`) as a table (a copy)."""
    return _demo_table().copy()


def demo_field_note() -> str:
    """The ``#`` header lines of the demo file (they say how it was invented)."""
    with open(DEMO_FIELD_PATH, encoding="utf-8") as fh:
        lines = []
        for line in fh:
            if not line.startswith("#"):
                break
            lines.append(line[1:].strip())
    return " ".join(lines)


# ----------------------------------------------------------------------------- loops
@dataclass(frozen=True, eq=False)
class Loop:
    """A closed loop sampled for the circulation integral, run clockwise.

    ``x_m, y_m`` are sample points and ``dsx_m, dsy_m`` the line elements there, so that
    Gamma = sum(u dsx + v dsy).
    """

    shape: str
    size_m: float
    label: str
    centre_m: tuple
    half_width_m: float
    half_height_m: float
    x_m: np.ndarray
    y_m: np.ndarray
    dsx_m: np.ndarray
    dsy_m: np.ndarray

    def outline(self, points: int = 181) -> tuple[np.ndarray, np.ndarray]:
        """Closed polyline for drawing (a few hundred points at most). [m]"""
        cx, cy = self.centre_m
        if self.shape == "circle":
            t = np.linspace(0.0, 2.0 * math.pi, points)
            return cx + self.half_width_m * np.cos(t), cy + self.half_height_m * np.sin(t)
        a, b = self.half_width_m, self.half_height_m
        return cx + np.array([-a, a, a, -a, -a]), cy + np.array([b, b, -b, -b, b])


def circle_loop(centre_m, radius_m: float, step_m: float) -> Loop:
    """A clockwise circle sampled every ``step_m / SAMPLES_PER_CELL`` or finer (at least 256 points).

    Notes
    -----
    Equally spaced angles with the exact tangent: the trapezoid rule on a periodic integrand.
    """
    cx, cy = centre_m
    n = max(256, int(math.ceil(2.0 * math.pi * radius_m * SAMPLES_PER_CELL / step_m)))
    t = 2.0 * math.pi * np.arange(n) / n
    w = radius_m * 2.0 * math.pi / n
    return Loop("circle", float(radius_m), f"circle, radius {radius_m:.4g} m", (cx, cy),
                float(radius_m), float(radius_m), cx + radius_m * np.cos(t), cy + radius_m * np.sin(t), w * np.sin(t), -w * np.cos(t))


def rectangle_loop(centre_m, half_width_m: float, half_height_m: float, step_m: float) -> Loop:
    """A clockwise rectangle with sides along x and y, sampled at the midpoints of short pieces.

    The loop's size is its half-height; the sides are ``2 half_width_m`` by ``2 half_height_m``.
    """
    cx, cy = centre_m
    a, b = half_width_m, half_height_m
    corners = [(-a, b), (a, b), (a, -b), (-a, -b), (-a, b)]  # top side left to right: clockwise
    xs, ys, dx, dy = [], [], [], []
    for (x0, y0), (x1, y1) in zip(corners[:-1], corners[1:]):
        length = math.hypot(x1 - x0, y1 - y0)
        m = max(16, int(math.ceil(length * SAMPLES_PER_CELL / step_m)))
        s = (np.arange(m) + 0.5) / m
        xs.append(cx + x0 + (x1 - x0) * s)
        ys.append(cy + y0 + (y1 - y0) * s)
        dx.append(np.full(m, (x1 - x0) / m))
        dy.append(np.full(m, (y1 - y0) / m))
    return Loop("rectangle", float(b), f"rectangle, {2 * a:.4g} m wide, {2 * b:.4g} m high",
                (cx, cy), float(a), float(b), np.concatenate(xs), np.concatenate(ys), np.concatenate(dx), np.concatenate(dy))


def loop_family(shape: str, centre_m, sizes_m, step_m: float, aspect: float = 1.0) -> list[Loop]:
    """Loops of one shape round ``centre_m``: circles of radius ``size`` or rectangles of
    half-height ``size`` and half-width ``aspect * size``."""
    check_choice("loop shape", shape, LOOP_SHAPES)
    if shape == "circle":
        return [circle_loop(centre_m, float(s), step_m) for s in sizes_m]
    return [rectangle_loop(centre_m, aspect * float(s), float(s), step_m) for s in sizes_m]


def _outline(shape: str, centre_m, size_m: float, aspect: float) -> Loop:
    """A loop's outline without its sample points (what :func:`check_loop` reads)."""
    a = size_m if shape == "circle" else aspect * size_m
    label = (f"circle, radius {size_m:.4g} m" if shape == "circle"
             else f"rectangle, {2 * a:.4g} m wide, {2 * size_m:.4g} m high")
    empty = np.empty(0)
    return Loop(shape, size_m, label, tuple(centre_m), a, size_m, empty, empty, empty, empty)


def _loop_points(outline: Loop, step_m: float) -> int:
    """Sample points :func:`circle_loop` / :func:`rectangle_loop` would make for this outline."""
    a, b = outline.half_width_m, outline.half_height_m
    if outline.shape == "circle":
        return max(256, math.ceil(2.0 * math.pi * a * SAMPLES_PER_CELL / step_m))
    return 2 * (max(16, math.ceil(2 * a * SAMPLES_PER_CELL / step_m))
                + max(16, math.ceil(2 * b * SAMPLES_PER_CELL / step_m)))


def check_loop(field: VelocityField, loop: Loop, body_centre_m, body_radius_m: float,
               number: int | None = None) -> None:
    """Refuse a loop that leaves the grid, does not enclose the body, or comes within one grid
    cell (diagonal) of it, with a message that says what would fit."""
    x0, x1, y0, y1 = field.extent_m
    dx, dy = field.spacing_m
    which = f"loop {number} ({loop.label})" if number is not None else f"loop ({loop.label})"
    eps = 1e-9 * max(x1 - x0, y1 - y0)
    bx, by = body_centre_m
    if not (x0 - eps <= bx <= x1 + eps and y0 - eps <= by <= y1 + eps):
        raise InputError("body centre", f"body centre ({bx:.4g}, {by:.4g}) m is outside the measured grid "
                                        f"(x from {x0:.4g} to {x1:.4g} m, y from {y0:.4g} to {y1:.4g} m)")
    cx, cy = loop.centre_m
    a, b = loop.half_width_m, loop.half_height_m
    lx0, lx1, ly0, ly1 = cx - a, cx + a, cy - b, cy + b
    if lx0 < x0 - eps or lx1 > x1 + eps or ly0 < y0 - eps or ly1 > y1 + eps:
        room_x, room_y = min(cx - x0, x1 - cx), min(cy - y0, y1 - cy)
        if loop.shape == "circle":
            fit = f"the largest circle round this centre that fits has radius {min(room_x, room_y):.4g} m"
        else:
            fit = (f"the largest rectangle of this shape round this centre that fits has "
                   f"half-height (loop size) {min(room_x * b / a, room_y):.4g} m")
        raise InputError("largest loop size", f"{which} leaves the measured grid (x from {x0:.4g} to "
                                              f"{x1:.4g} m, y from {y0:.4g} to {y1:.4g} m): {fit}")
    clearance = math.hypot(dx, dy)
    need = body_radius_m + clearance
    # the body centre must be inside the loop, and every point of the loop at least `need` from it
    if loop.shape == "circle":
        gap = a - math.hypot(bx - cx, by - cy)
    else:
        gap = min(a - abs(bx - cx), b - abs(by - cy))
    if gap < need * (1.0 - 1e-9):
        if loop.shape == "circle":
            smallest = need + math.hypot(bx - cx, by - cy)
        else:
            smallest = max((need + abs(bx - cx)) * b / a, need + abs(by - cy))
        raise InputError("smallest loop size",
                         f"{which} cuts the body or passes within one grid cell of it: a loop must "
                         f"stay {need:.4g} m clear of the body centre (body radius {body_radius_m:.4g} m "
                         f"+ grid cell diagonal {clearance:.4g} m, so the interpolation uses no points "
                         f"inside the body); the smallest loop size that works here is {smallest:.4g} m")


def _interpolator(field: VelocityField):
    from scipy.interpolate import RegularGridInterpolator

    values = np.stack([field.u_m_s, field.v_m_s], axis=-1)
    return RegularGridInterpolator((field.x_m, field.y_m), values, method="linear",
                                   bounds_error=False, fill_value=None)


def loop_circulation(field: VelocityField, loop: Loop, interpolator=None) -> float:
    """Circulation round one loop, Gamma = oint V . ds (clockwise positive), with bilinear
    interpolation of the grid (:class:`scipy.interpolate.RegularGridInterpolator`). [m^2 s^-1]

    The loop is not checked here; use :func:`check_loop` first.
    """
    f = interpolator or _interpolator(field)
    x0, x1, y0, y1 = field.extent_m
    pts = np.column_stack([np.clip(loop.x_m, x0, x1), np.clip(loop.y_m, y0, y1)])
    uv = f(pts)
    return float(np.sum(uv[:, 0] * loop.dsx_m + uv[:, 1] * loop.dsy_m))


def free_stream_from_edges(field: VelocityField) -> tuple[float, float]:
    """Free-stream velocity estimated as the mean velocity over the grid's outer edge.

    Notes
    -----
    For a body centred in the grid, the vortex and doublet parts of the flow average to zero
    round the edge by symmetry, so the mean is the free stream; a wake crossing the edge lowers
    it by roughly the wake's velocity deficit times its width over the perimeter.

    Returns
    -------
    (u_inf, v_inf) : tuple of float
        [m s^-1]
    """
    edge = np.zeros(field.shape, dtype=bool)
    edge[0, :] = edge[-1, :] = edge[:, 0] = edge[:, -1] = True
    return float(field.u_m_s[edge].mean()), float(field.v_m_s[edge].mean())


# ----------------------------------------------------------------------------- the whole analysis
@dataclass(frozen=True)
class CirculationResult:
    """Circulation round a family of loops and the lift per span it implies (SI).

    The settled loops are the outer half of the family (sizes at or above the midpoint of the
    smallest and largest size): they enclose the body and its near wake. The circulation is
    their mean, its spread half the difference between their largest and smallest value.
    """

    loop_shape: str
    rectangle_aspect: float
    loop_sizes_m: tuple
    loop_labels: tuple
    circulations_m2_s: tuple
    settled: tuple
    circulation_m2_s: float
    circulation_spread_m2_s: float
    circulation_std_m2_s: float
    free_stream_u_m_s: float
    free_stream_v_m_s: float
    free_stream_speed_m_s: float
    free_stream_from: str
    free_stream_direction_deg: float
    density_kg_m3: float
    lift_per_span_n_m: float
    lift_spread_n_m: float
    lift_direction_deg: float
    body_centre_m: tuple
    body_radius_m: float
    grid_shape: tuple
    grid_spacing_m: tuple
    warnings: tuple = ()

    def as_json(self) -> dict:
        return {
            "circulation_m2_s": self.circulation_m2_s,
            "circulation_spread_m2_s": self.circulation_spread_m2_s,
            "lift_per_span_n_m": self.lift_per_span_n_m,
            "lift_spread_n_m": self.lift_spread_n_m,
            "lift_direction_deg": self.lift_direction_deg,
            "free_stream_speed_m_s": self.free_stream_speed_m_s,
            "free_stream_direction_deg": self.free_stream_direction_deg,
            "density_kg_m3": self.density_kg_m3,
            "loops": [{"size_m": s, "circulation_m2_s": g, "settled": bool(k)}
                      for s, g, k in zip(self.loop_sizes_m, self.circulations_m2_s, self.settled)],
            "warnings": [w.as_dict() for w in self.warnings],
        }


def settled_mask(sizes_m) -> np.ndarray:
    """Loops counted in the estimate: sizes at or above the midpoint of the smallest and largest."""
    s = np.asarray(sizes_m, dtype=float)
    mid = 0.5 * (s.min() + s.max())
    return s >= mid * (1.0 - 1e-12)


def circulation_from_field(field: VelocityField, body_centre_m, body_radius_m: float,
                           loop_sizes_m, density_kg_m3: float, shape: str = "circle",
                           aspect: float = 1.0, free_stream_speed_m_s: float | None = None,
                           progress=None) -> CirculationResult:
    """Circulation round loops centred on the body, and the Kutta-Joukowski lift per span.

    Parameters
    ----------
    field : VelocityField
        The measured field.
    body_centre_m : (float, float)
        Body centre (x, y). [m]
    body_radius_m : float
        Body radius; loops must stay one grid cell outside it. [m]
    loop_sizes_m : sequence of float
        Circle radii, or rectangle half-heights. [m]
    density_kg_m3 : float
        Fluid density. [kg m^-3]
    shape : {"circle", "rectangle"}
        Loop shape; rectangles have half-width ``aspect`` times their half-height.
    free_stream_speed_m_s : float, optional
        Given free-stream speed; if None, estimated from the grid edges
        (:func:`free_stream_from_edges`). The direction always comes from the edges. [m s^-1]
    progress : callable, optional
        ``progress(fraction, text)``.

    Returns
    -------
    CirculationResult

    References
    ----------
    .. [1] Anderson (2017), Fundamentals of Aerodynamics, chapter 3 (Kutta-Joukowski theorem).
    """
    bx = check_number("body centre x", body_centre_m[0], "m")
    by = check_number("body centre y", body_centre_m[1], "m")
    rb = check_positive("body radius", body_radius_m, "m")
    rho = check_positive("density", density_kg_m3, "kg/m^3")
    check_choice("loop shape", shape, LOOP_SHAPES)
    asp = check_number("rectangle width/height", aspect, "", low=0.2, high=5.0)
    sizes = np.asarray([check_positive("loop size", s, "m") for s in loop_sizes_m], dtype=float)
    if sizes.size < 1:
        raise InputError("number of loops", "number of loops must be at least 1 (got 0)")
    if sizes.size > MAX_LOOPS:
        raise InputError("number of loops", f"number of loops must be at most {MAX_LOOPS} (got {sizes.size})")
    step = min(field.spacing_m)
    # every loop is checked on its outline before any point of any loop is made: a loop too
    # large for the grid is refused without building it
    outlines = [_outline(shape, (bx, by), float(sz), asp) for sz in sizes]
    # the largest and the smallest loop first, so a message names the size the user set
    order = sorted(range(len(outlines)), key=lambda k: -sizes[k])
    order = [order[0], order[-1]] + order[1:-1] if len(order) > 1 else order
    for k in order:
        check_loop(field, outlines[k], (bx, by), rb, number=k + 1)
    points = sum(_loop_points(o, step) for o in outlines)
    if points > MAX_LOOP_POINTS:
        raise InputError("number of loops", f"the loops would need {points:,} sample points; at most "
                                            f"{MAX_LOOP_POINTS:,} are used: fewer or smaller loops")
    loops = loop_family(shape, (bx, by), sizes, step, asp)
    interp = _interpolator(field)
    gammas = []
    for i, lp in enumerate(loops, start=1):
        gammas.append(loop_circulation(field, lp, interp))
        if progress is not None:
            progress(i / len(loops), f"Loop {i} of {len(loops)}")
    gammas = np.asarray(gammas)
    settled = settled_mask(sizes)
    g_set = gammas[settled]
    gamma = float(g_set.mean())
    spread = 0.5 * float(g_set.max() - g_set.min())
    std = float(g_set.std(ddof=1)) if g_set.size > 1 else 0.0

    u_e, v_e = free_stream_from_edges(field)
    edge_speed = math.hypot(u_e, v_e)
    if edge_speed == 0.0:
        raise InputError("velocity field", "velocity field: the mean velocity round the grid edge is "
                                           "zero, so the free-stream direction is unknown")
    if free_stream_speed_m_s is None:
        v_inf, source = edge_speed, "edges"
    else:
        v_inf = check_positive("free-stream speed", free_stream_speed_m_s, "m/s")
        source = "given"
    direction = math.degrees(math.atan2(v_e, u_e))
    lift = rho * v_inf * gamma
    lift_spread = rho * v_inf * spread
    lift_dir = (direction + (90.0 if lift >= 0 else -90.0)) % 360.0

    warnings = [ModelWarning(
        "kutta_joukowski_from_field",
        "Kutta-Joukowski with the loop circulation assumes steady, two-dimensional flow at the "
        "measured cross-section; it gives lift only, not drag.", "lift_per_span_n_m")]
    if source == "edges":
        warnings.append(quantity_warning(
            "free_stream_from_edges",
            "Free-stream speed {speed} is the mean velocity round the grid edge; a wake "
            "leaving the grid lowers it. Give the measured free-stream speed if you know it.",
            {"speed": (v_inf, "speed")}, "free_stream_speed_m_s"))
    if g_set.size < 2:
        warnings.append(ModelWarning(
            "one_settled_loop", "Only one loop counts toward the estimate, so there is no "
            "loop-to-loop spread; use more loops.", "circulation_m2_s"))
    elif gamma != 0.0 and spread > 0.05 * abs(gamma):
        warnings.append(ModelWarning(
            "large_loop_spread",
            f"The settled loops differ by ±{100 * spread / abs(gamma):.1f} % (more than 5 %): the "
            "loops may still cut the viscous region, or the field is noisy or unsteady.",
            "circulation_m2_s"))
    smallest = float(sizes[settled].min())
    if smallest < 2.0 * rb:
        warnings.append(quantity_warning(
            "settled_loops_near_body",
            "The smallest loop counted ({smallest}) is within two body radii "
            "({two_radii}) of the centre, where the viscous layer may still be cut; "
            "prefer larger loops.", {"smallest": (smallest, "length"), "two_radii": (2 * rb, "length")},
            "circulation_m2_s"))
    return CirculationResult(
        loop_shape=shape, rectangle_aspect=asp, loop_sizes_m=tuple(float(s) for s in sizes),
        loop_labels=tuple(lp.label for lp in loops),
        circulations_m2_s=tuple(float(g) for g in gammas), settled=tuple(bool(s) for s in settled),
        circulation_m2_s=gamma, circulation_spread_m2_s=spread, circulation_std_m2_s=std,
        free_stream_u_m_s=u_e, free_stream_v_m_s=v_e, free_stream_speed_m_s=v_inf,
        free_stream_from=source, free_stream_direction_deg=direction % 360.0, density_kg_m3=rho,
        lift_per_span_n_m=lift, lift_spread_n_m=lift_spread, lift_direction_deg=lift_dir,
        body_centre_m=(bx, by), body_radius_m=rb, grid_shape=field.shape,
        grid_spacing_m=field.spacing_m, warnings=merge(tuple(warnings)))


# ----------------------------------------------------------------------------- synthetic fields
def synthetic_cylinder_field(x_m, y_m, speed_m_s: float, radius_m: float, circulation_m2_s: float,
                             centre_m=(0.0, 0.0), wake_deficit: float = 0.0,
                             wake_width_m: float | None = None, wake_offset_m: float = 0.0,
                             noise_m_s: float = 0.0, seed: int = 0) -> VelocityField:
    """An invented field for demos and tests: ideal spinning-cylinder flow plus a synthetic wake.

    Notes
    -----
    The base is :func:`liftcore.potential.velocity_field` (circulation ``circulation_m2_s``,
    positive clockwise). The wake is made up, not a model of a real wake: behind the body the
    streamwise velocity loses ``wake_deficit * V * sqrt(b0 / b) * exp(-((y - y_w) / b)^2)`` with
    width ``b = b0 sqrt(1 + x / (2 R))`` growing downstream and a smooth start at the rear of the
    body. Its vorticity is antisymmetric about the wake centre line ``y_w``, so a loop that
    crosses the whole wake picks up no net circulation from it. Points inside the body are 0.
    Gaussian noise of standard deviation ``noise_m_s`` is added to u and v (seeded).
    """
    from liftcore.potential import velocity_field

    xs = np.asarray(x_m, dtype=float)
    ys = np.asarray(y_m, dtype=float)
    cx, cy = centre_m
    xx, yy = np.meshgrid(xs - cx, ys - cy, indexing="ij")
    u, v = velocity_field(xx, yy, speed_m_s, radius_m, circulation_m2_s)
    inside = np.isnan(u)
    u = np.where(inside, 0.0, u)
    v = np.where(inside, 0.0, v)
    if wake_deficit:
        b0 = radius_m if wake_width_m is None else wake_width_m
        xd = np.maximum(xx, 0.0)
        b = b0 * np.sqrt(1.0 + xd / (2.0 * radius_m))
        start = 0.5 * (1.0 + np.tanh((xx - 0.5 * radius_m) / (0.25 * radius_m)))
        deficit = wake_deficit * speed_m_s * np.sqrt(b0 / b) * np.exp(-((yy - wake_offset_m) / b) ** 2) * start
        u = np.where(inside, 0.0, u - deficit)
    if noise_m_s:
        rng = np.random.default_rng(seed)
        u = np.where(inside, 0.0, u + rng.normal(0.0, noise_m_s, u.shape))
        v = np.where(inside, 0.0, v + rng.normal(0.0, noise_m_s, v.shape))
    return VelocityField(xs, ys, u, v)
