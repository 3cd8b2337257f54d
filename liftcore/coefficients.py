"""Coefficient sets of rotating cylinders (rotor sails): lift, drag and spin power against spin
ratio, each with its provenance.

A set is a table of spin ratio SR = omega R / V against

* ``CL`` = L / (q D H), lift on the projected area D x H,
* ``CD`` = D / (q D H), drag on the same area,
* ``CP`` = P / (q D H V) = P / (0.5 rho V^3 D H), shaft power to keep the rotor spinning
  (optional),

with q = 0.5 rho V^2 and V the apparent wind speed. Between the tabulated points the set is
interpolated by a monotone piecewise-cubic (PCHIP, Fritsch & Carlson 1980) that never overshoots
the data; outside the tabulated spin ratios the end values are held and the caller warns.

Built-in sets live in ``liftcore/data/coefficients/NAME.csv`` (columns SR, CL, CD and optionally
CP) with a ``NAME.toml`` beside it holding the provenance: ``name``, ``label``, ``kind``,
``source``, ``aspect_ratio`` (``inf`` for two-dimensional data), ``end_plate_ratio`` (end-plate
diameter / rotor diameter, 1 = none), ``reynolds_range`` = [low, high] and ``notes``. The spin
ratio range is the range of the table.

Moving a set to another aspect ratio changes only its induced drag (see
:func:`drag_at_aspect_ratio`).
"""

from __future__ import annotations

import io
import math
import tomllib
from dataclasses import dataclass, field
from functools import lru_cache
from pathlib import Path

import numpy as np
from scipy.interpolate import PchipInterpolator

from liftcore.errors import InputError

DATA_DIR = Path(__file__).parent / "data" / "coefficients"

#: Kinds of provenance a set can have, from firmest to loosest.
KINDS = ("theory", "published table", "published fit", "digitised", "from-memory approximation", "user")
#: Kinds whose numbers come from the published record (the spread band and the yearly range
#: are drawn over these).
PUBLISHED_KINDS = ("published table", "published fit", "digitised")

#: End-plate factor: AR_eff / AR = 1 + 1.9 h / b for a wing with end plates of depth h on a span b.
#: Published in this form in Katz, J., New Directions in Race Car Aerodynamics (as quoted at
#: mulsannescorner.com/wingendplates.html); its origin in Hoerner & Borst (1985), Fluid-Dynamic
#: Lift, is from memory. Using it on a rotor is our assumption (see
#: :func:`effective_aspect_ratio_hoerner`).
END_PLATE_FACTOR_HOERNER = 1.9
#: Span efficiency in the induced-drag formula: 1 = elliptic loading (assumed).
SPAN_EFFICIENCY = 1.0

#: Step of the dense table a set's interpolant is read from (see :meth:`CoefficientSet.evaluate`). [-]
DENSE_STEP = 1e-3
#: Largest user table accepted. [rows]
MAX_USER_ROWS = 2000
#: Spin ratio range of the tabulated potential-flow line.
IDEAL_SR_MAX = 10.0


@dataclass(frozen=True, eq=False)
class CoefficientSet:
    """One coefficient set and where it comes from.

    Attributes
    ----------
    name : str
        Stable key (``tillig_ringsberg_2020``, ``user``).
    label : str
        Words for people; sets recalled from memory say so in the label.
    kind : str
        One of :data:`KINDS`.
    source : str
        Citation or description of the data.
    aspect_ratio : float
        Height / diameter of the tested rotor; ``inf`` for two-dimensional data. [-]
    end_plate_ratio : float
        End-plate diameter / rotor diameter of the tested rotor; 1 = no end plates. [-]
    reynolds_range : tuple of float
        Reynolds numbers V D / nu of the data; ``(0, inf)`` when not stated. [-]
    spin_ratio, lift, drag : ndarray
        The table. [-]
    power : ndarray or None
        Power coefficient CP, or ``None`` when the set has none. [-]
    notes : str
        Anything else worth knowing.
    """

    name: str
    label: str
    kind: str
    source: str
    aspect_ratio: float
    end_plate_ratio: float
    reynolds_range: tuple
    spin_ratio: np.ndarray
    lift: np.ndarray
    drag: np.ndarray
    power: np.ndarray | None = None
    notes: str = ""
    #: Name of the set the drag is borrowed from, for sets that give lift only ("" = its own).
    drag_from: str = ""
    _interp: object = field(default=None, repr=False, compare=False)

    def __post_init__(self):
        if self.kind not in KINDS:
            raise ValueError(f"coefficient set kind must be one of {', '.join(KINDS)} (got {self.kind!r})")
        cols = [self.lift, self.drag] + ([self.power] if self.power is not None else [])
        y = np.column_stack([np.asarray(c, dtype=float) for c in cols])
        pchip = PchipInterpolator(np.asarray(self.spin_ratio, float), y, axis=0, extrapolate=False)
        lo, hi = self.sr_range
        m = max(2, int(math.ceil((hi - lo) / DENSE_STEP)) + 1)
        dense = np.linspace(lo, hi, m)
        table = pchip(dense)
        object.__setattr__(self, "_interp", (lo, (hi - lo) / (m - 1) if m > 1 else 1.0,
                                             [np.ascontiguousarray(table[:, j]) for j in range(table.shape[1])]))

    @property
    def sr_range(self) -> tuple[float, float]:
        """Lowest and highest tabulated spin ratio. [-]"""
        return float(self.spin_ratio[0]), float(self.spin_ratio[-1])

    @property
    def has_power(self) -> bool:
        return self.power is not None

    @property
    def published(self) -> bool:
        """Whether the numbers come from the published record (a table, a fit or a figure)."""
        return self.kind in PUBLISHED_KINDS

    @property
    def drag_geometry(self) -> tuple[float, float]:
        """(aspect ratio, end-plate ratio) of the rotor the drag was measured on: the lender's
        for a set whose drag is borrowed."""
        if self.drag_from:
            lender = builtin_sets()[self.drag_from]
            return lender.aspect_ratio, lender.end_plate_ratio
        return self.aspect_ratio, self.end_plate_ratio

    @property
    def two_dimensional(self) -> bool:
        return not math.isfinite(self.aspect_ratio)

    def evaluate(self, spin_ratio):
        """(CL, CD, CP) at ``spin_ratio`` as measured (no aspect-ratio change).

        Parameters
        ----------
        spin_ratio : float or ndarray
            Spin ratio omega R / V. [-]

        Returns
        -------
        cl, cd : ndarray
            Lift and drag coefficients on D x H, the shape of ``spin_ratio``. [-]
        cp : ndarray or None
            Power coefficient, ``None`` when the set has no power data. [-]

        Notes
        -----
        Inside the tabulated range: the monotone piecewise cubic (PCHIP) of SciPy [1]_, read
        from a table of it every :data:`DENSE_STEP` in SR by straight lines (the error,
        h^2 max|C''| / 8, is below 1e-5, far under the data's uncertainty; it makes a value
        ten times cheaper, which the best-spin search needs). Outside the range the end values
        are held (the caller warns).

        References
        ----------
        .. [1] Fritsch, F. N. and Carlson, R. E. (1980). Monotone piecewise cubic interpolation.
           SIAM J. Numer. Anal. 17(2), 238-246.
        """
        sr = np.asarray(spin_ratio, dtype=float)
        lo, step, cols = self._interp
        u = (np.clip(sr, lo, self.spin_ratio[-1]) - lo) * (1.0 / step)
        i = np.minimum(u.astype(np.intp), len(cols[0]) - 2)
        f = u - i
        out = []
        for col in cols:
            a = col[i]
            out.append(a + f * (col[i + 1] - a))
        return out[0], out[1], (out[2] if self.has_power else None)

    def outside(self, spin_ratio):
        """Boolean array: where ``spin_ratio`` lies outside the tabulated range."""
        sr = np.asarray(spin_ratio, dtype=float)
        lo, hi = self.sr_range
        tol = 1e-9 * max(1.0, hi)
        return (sr < lo - tol) | (sr > hi + tol)

    def describe(self) -> dict:
        """Provenance as a plain dict (for tables, JSON and the report)."""
        return {"name": self.name, "label": self.label, "kind": self.kind, "source": self.source,
                "aspect_ratio": self.aspect_ratio, "end_plate_ratio": self.end_plate_ratio,
                "reynolds_range": list(self.reynolds_range), "sr_range": list(self.sr_range),
                "has_power_coefficient": self.has_power, "drag_from": self.drag_from,
                "notes": self.notes}


# ----------------------------------------------------------------------------- finite span
def effective_aspect_ratio_hoerner(aspect_ratio, end_plate_ratio):
    """Effective aspect ratio of a rotor with an end plate, after Hoerner's end-plate rule.

    Notes
    -----
    AR_eff = AR (1 + 1.9 h / b) with the end-plate overhang h = (De - D) / 2 and span b = H,
    i.e. AR_eff = AR + 0.95 (De/D - 1). The rule is published for wings with end plates (Katz,
    see :data:`END_PLATE_FACTOR_HOERNER`; the attribution to Hoerner is from memory). On a
    rotor it is an assumption, and so is the choice of the overhang as h; the deck below the
    rotor, which also blocks the flow round the lower end, is not counted. Two-dimensional data
    (AR = inf) stay infinite.

    Parameters
    ----------
    aspect_ratio : float or ndarray
        H / D. [-]
    end_plate_ratio : float or ndarray
        De / D, 1 for none. [-]
    """
    ar = np.asarray(aspect_ratio, dtype=float)
    r = np.asarray(end_plate_ratio, dtype=float)
    return ar + END_PLATE_FACTOR_HOERNER / 2.0 * (r - 1.0)


def induced_drag_coefficient(lift_coefficient, effective_aspect_ratio, span_efficiency=SPAN_EFFICIENCY):
    """Induced drag of a finite lifting surface, CD_i = CL^2 / (pi AR_eff e) (Prandtl lifting line).

    Returns 0 for two-dimensional data (AR_eff = inf).
    """
    cl = np.asarray(lift_coefficient, dtype=float)
    ar = np.asarray(effective_aspect_ratio, dtype=float)
    return cl * cl / (np.pi * ar * span_efficiency)


def drag_at_aspect_ratio(lift_coefficient, drag_coefficient, from_effective_ar, to_effective_ar,
                         span_efficiency=SPAN_EFFICIENCY):
    """Drag coefficient of a set moved from one effective aspect ratio to another.

    Notes
    -----
    CD_new = CD + CL^2 / (pi e) (1 / AR_eff,new - 1 / AR_eff,set): the lift coefficient and the
    profile part of the drag are assumed unchanged, only the induced drag of the Prandtl lifting
    line changes (span efficiency e = 1, elliptic loading, assumed). A two-dimensional set has
    1 / AR_eff = 0.
    """
    cl = np.asarray(lift_coefficient, dtype=float)
    inv_from = 1.0 / np.asarray(from_effective_ar, dtype=float)
    inv_to = 1.0 / np.asarray(to_effective_ar, dtype=float)
    return np.asarray(drag_coefficient, dtype=float) + cl * cl / (np.pi * span_efficiency) * (inv_to - inv_from)


# ----------------------------------------------------------------------------- built-in sets
def ideal_potential_flow() -> CoefficientSet:
    """The potential-flow line: CL = 2 pi SR, CD = 0 (theory; no power coefficient).

    Notes
    -----
    Uniform stream plus doublet plus a point vortex of circulation Gamma = 2 pi R (omega R);
    Kutta-Joukowski L' = rho V Gamma gives CL (on the diameter) = 2 pi SR and d'Alembert zero
    drag. Tabulated every 0.5 up to SR = 10; the monotone cubic reproduces a straight line exactly.
    """
    sr = np.arange(0.0, IDEAL_SR_MAX + 0.25, 0.5)
    return CoefficientSet(
        name="potential_flow", label="Potential flow, CL = 2π·SR, no drag (theory)", kind="theory",
        source="Kutta-Joukowski theorem for a circulation Gamma = 2 pi R (omega R) (e.g. Anderson, "
               "Fundamentals of Aerodynamics, ch. 3): an upper bound real cylinders fall far short of.",
        aspect_ratio=math.inf, end_plate_ratio=1.0, reynolds_range=(0.0, math.inf),
        spin_ratio=sr, lift=2.0 * np.pi * sr, drag=np.zeros_like(sr), power=None,
        notes="Two-dimensional and inviscid; spin power comes from the skin-friction model.")


#: Largest magnitude accepted in a coefficient table: several times the highest published rotor
#: values (CL about 12, CD about 5 at spin ratio 10) and spin ratios far past any data.
TABLE_LIMITS = {"SR": 50.0, "CL": 100.0, "CD": 100.0, "CP": 1000.0}


def _read_table(text: str, source: str) -> dict:
    """Parse and validate a coefficient table (CSV text with SR, CL, CD and optional CP)."""
    import pandas as pd

    try:
        df = pd.read_csv(io.StringIO(text), skipinitialspace=True, comment="#")
    except Exception as exc:  # pandas raises several parser errors
        reason = str(exc).strip().splitlines()[0] if str(exc).strip() else type(exc).__name__
        raise InputError("coefficients", f"{source} is not a readable CSV table ({reason})") from None
    return _table_from_frame(df, source)


def _table_from_frame(df, source: str) -> dict:
    cols = {str(c).strip().upper(): c for c in df.columns}
    missing = [c for c in ("SR", "CL", "CD") if c not in cols]
    if missing:
        got = ", ".join(str(c) for c in df.columns) or "none"
        raise InputError("coefficients", f"{source} needs columns SR, CL, CD (CP optional); "
                                         f"missing {', '.join(missing)} (columns found: {got})")
    if len(df) < 3:
        raise InputError("coefficients", f"{source} needs at least 3 rows of SR, CL, CD (got {len(df)})")
    if len(df) > MAX_USER_ROWS:
        raise InputError("coefficients", f"{source} has {len(df)} rows; at most {MAX_USER_ROWS} are accepted")
    out = {}
    names = ["SR", "CL", "CD"] + (["CP"] if "CP" in cols else [])
    for name in names:
        col = df[cols[name]]
        vals = np.full(len(col), np.nan)
        for i, v in enumerate(col.tolist()):
            try:
                vals[i] = float(v)
            except (TypeError, ValueError):
                vals[i] = np.nan
        bad = ~np.isfinite(vals)
        if bad.any():
            row = int(np.flatnonzero(bad)[0])
            raise InputError("coefficients", f"{source}: {name} in data row {row + 1} is empty or not "
                                             f"a number (got {col.iloc[row]!r})")
        out[name] = vals
    sr = out["SR"]
    step = np.diff(sr)
    if (step <= 0).any():
        row = int(np.flatnonzero(step <= 0)[0]) + 1
        raise InputError("coefficients", f"{source}: SR must increase from row to row (data row "
                                         f"{row + 1}: {sr[row]:g} after {sr[row - 1]:g})")
    if sr[0] < 0:
        raise InputError("coefficients", f"{source}: SR must be >= 0 (got {sr[0]:g} in data row 1)")
    for name in ("CD", "CP"):
        if name in out and (out[name] < 0).any():
            row = int(np.flatnonzero(out[name] < 0)[0])
            raise InputError("coefficients", f"{source}: {name} must be >= 0 (got {out[name][row]:g} "
                                             f"in data row {row + 1})")
    for name, top in TABLE_LIMITS.items():
        if name in out and (np.abs(out[name]) > top).any():
            row = int(np.flatnonzero(np.abs(out[name]) > top)[0])
            raise InputError("coefficients", f"{source}: {name} must lie within ±{top:g} (got "
                                             f"{out[name][row]:.6g} in data row {row + 1})")
    return out


def _set_from_files(csv_path: Path, meta_path: Path) -> CoefficientSet:
    meta = tomllib.loads(meta_path.read_text(encoding="utf-8"))
    table = _read_table(csv_path.read_text(encoding="utf-8"), csv_path.name)
    required = ("name", "label", "kind", "source", "aspect_ratio", "end_plate_ratio", "reynolds_range")
    for key in required:
        if key not in meta:
            raise ValueError(f"{meta_path.name} lacks {key!r}")
    label = meta["label"]
    if meta["kind"] == "from-memory approximation" and "from memory" not in label:
        raise ValueError(f"{meta_path.name}: a from-memory set must say 'from memory' in its label")
    return CoefficientSet(name=meta["name"], label=label, kind=meta["kind"], source=meta["source"],
                          aspect_ratio=float(meta["aspect_ratio"]),
                          end_plate_ratio=float(meta["end_plate_ratio"]),
                          reynolds_range=tuple(float(x) for x in meta["reynolds_range"]),
                          spin_ratio=table["SR"], lift=table["CL"], drag=table["CD"],
                          power=table.get("CP"), notes=meta.get("notes", ""),
                          drag_from=meta.get("drag_from", ""))


@lru_cache(maxsize=1)
def builtin_sets() -> dict:
    """Every built-in set by name: the potential-flow line, then the data files (sorted)."""
    sets = {"potential_flow": ideal_potential_flow()}
    for meta in sorted(DATA_DIR.glob("*.toml")):
        s = _set_from_files(meta.with_suffix(".csv"), meta)
        sets[s.name] = s
    return sets


#: Sets renamed after their published source (files and links that name the old key open the
#: new one). The sets once recalled from memory for a bare cylinder and a wind-tunnel rotor with
#: end plates are gone: published sets replace them.
RENAMED_SETS = {"end_plates_fullscale_fit": "tillig_ringsberg_2020"}

#: The default set: a published one.
DEFAULT_SET = "tillig_ringsberg_2020"


def published_sets() -> dict:
    """The built-in sets from the published record (no theory, nothing from memory)."""
    return {n: s for n, s in builtin_sets().items() if s.published}


def builtin_names() -> tuple[str, ...]:
    return tuple(builtin_sets())


def coefficient_set(name: str) -> CoefficientSet:
    """A built-in set by name; unknown names list the valid ones."""
    sets = builtin_sets()
    if name not in sets:
        raise InputError("coefficients", f"coefficient set must be one of {', '.join(sets)} or a "
                                         f"CSV file (got {name!r})")
    return sets[name]


def user_coefficient_set(data, *, source: str = "user coefficient table", aspect_ratio: float = math.inf,
                         end_plate_ratio: float = 1.0, reynolds_range=(0.0, math.inf),
                         label: str = "") -> CoefficientSet:
    """A set from user data: CSV text, a path to a CSV file, or a pandas DataFrame.

    Columns ``SR``, ``CL``, ``CD`` (``CP`` optional; header names are case-insensitive), at least
    3 rows, SR increasing, no empty cells. Raises :class:`InputError` with one clear line.
    ``aspect_ratio`` (``inf`` for two-dimensional data) and ``end_plate_ratio`` describe the
    tested rotor.
    """
    if isinstance(data, Path):
        table = _read_table(data.read_text(encoding="utf-8"), data.name)
        source = source if source != "user coefficient table" else data.name
    elif isinstance(data, str):
        if not data.strip():
            raise InputError("coefficients", f"{source} is empty: give a CSV with columns SR, CL, CD "
                                             "(CP optional)")
        table = _read_table(data, source)
    else:
        table = _table_from_frame(data, source)
    return CoefficientSet(name="user", label=label or f"User data ({source})", kind="user", source=source,
                          aspect_ratio=float(aspect_ratio), end_plate_ratio=float(end_plate_ratio),
                          reynolds_range=tuple(reynolds_range), spin_ratio=table["SR"],
                          lift=table["CL"], drag=table["CD"], power=table.get("CP"),
                          notes="Supplied by the user.")
