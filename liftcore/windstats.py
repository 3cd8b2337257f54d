"""Wind statistics along a ship's trade: joint tables, Weibull per direction sector, hourly series.

Three ways to describe the wind a ship meets, each read from a CSV file with our own column names:

* **Joint table** (``true_wind_angle_deg, true_wind_speed_m_s, probability``): the probability of
  each combination of true wind angle (relative to the bow) and true wind speed over the ship's
  time at sea. This is the idea behind the wind probability matrix of the IMO guidance on wind
  propulsion [1]_; the probabilities must sum to 1.
* **Weibull per direction sector** (``sector_centre_deg, frequency, scale_m_s, shape``): the wind
  climate of a sea area, sector by sector of *true wind direction*, discretised here into a joint
  table and turned into angles relative to the bow with the ship's course on the trade.
* **Hourly series along a route** (``time, ship_speed_kn, ship_heading_deg, true_wind_speed_m_s,
  true_wind_direction_deg`` and an optional ``leg``): one row per hour, any length, read in
  blocks so memory stays bounded (see :func:`iter_series`).

Direction conventions
---------------------
* *True wind direction*: where the wind comes **from**, in degrees clockwise from true north
  (meteorological convention: 270 is a westerly wind).
* *Ship heading / course*: where the ship goes, degrees clockwise from true north.
* *True wind angle*: the relative bearing of the true wind from the bow,
  ``direction - heading`` wrapped to (-180, 180]: 0 is a head wind, +90 comes from the
  starboard beam, -90 from the port beam, 180 from dead astern (0 on the bow, as in [1]_).
* Wind speeds are at the reference height of the wind profile used for the rotors (usually 10 m).

Every reader refuses bad data with one line naming the file, the row and the column.

References
----------
.. [1] IMO MEPC.1/Circ.815 (2013), Annex 11, Appendix 2 and MEPC.1/Circ.896 (2021): guidance on
   treatment of innovative energy efficiency technologies, wind propulsion systems (category B-2).
.. [2] Justus, C. G., Hargraves, W. R., Mikhail, A. & Graber, D. (1978). Methods for estimating
   wind speed frequency distributions. J. Appl. Meteor. 17, 350-353 (Weibull wind speeds).
"""

from __future__ import annotations

import io
import math
import os
from dataclasses import dataclass
from pathlib import Path
from typing import Iterator

import numpy as np
import pandas as pd
from scipy import special

from liftcore.errors import InputError, check_number
from liftcore.files import data_row_line, open_regular, read_bytes
from liftcore.validity import ModelWarning

#: Columns of a joint wind table, in order.
TABLE_COLUMNS = ("true_wind_angle_deg", "true_wind_speed_m_s", "probability")
#: Columns of a Weibull-per-sector file, in order.
WEIBULL_COLUMNS = ("sector_centre_deg", "frequency", "scale_m_s", "shape")
#: Columns of an hourly route series, in order; ``leg`` may follow (optional, free text).
SERIES_COLUMNS = ("time", "ship_speed_kn", "ship_heading_deg", "true_wind_speed_m_s",
                  "true_wind_direction_deg")
SERIES_OPTIONAL = ("leg",)

#: Probabilities (and sector frequencies) must sum to 1 within this tolerance.
PROBABILITY_TOLERANCE = 1e-6
#: Highest true wind speed accepted in any input [m/s] (above hurricane force; a typo guard).
MAX_WIND_SPEED_M_S = 80.0
#: Highest ship speed accepted in a series [kn].
MAX_SHIP_SPEED_KN = 40.0
#: Years an hourly series may hold (calendar arithmetic in nanoseconds holds 1677 to 2262).
SERIES_YEARS = (1900, 2200)
#: Rows per block when a series is streamed from a file.
DEFAULT_CHUNK_ROWS = 50_000
#: Weibull discretisation: speed bin width [m/s] and the start of the open top bin [m/s].
WEIBULL_SPEED_STEP_M_S = 1.0
WEIBULL_TOP_SPEED_M_S = 30.0
#: Share of the time above MAX_WIND_SPEED_M_S from which Weibull sectors are warned about.
WEIBULL_SHARE_ABOVE_TOP = 0.001
#: Largest direction step when a Weibull sector is spread over sub-directions [deg].
WEIBULL_DIRECTION_STEP_DEG = 10.0

KNOT_M_S = 1852.0 / 3600.0  # m/s per knot (international nautical mile, 1852 m)


# ----------------------------------------------------------------------------- angles
def wrap_angle_deg(angle_deg):
    """Wrap angles to (-180, 180]. [deg]"""
    a = np.mod(np.asarray(angle_deg, dtype=float) + 180.0, 360.0) - 180.0
    return np.where(a == -180.0, 180.0, a)


def relative_wind_angle_deg(true_wind_direction_deg, heading_deg):
    """True wind angle from the bow, from the wind's direction and the ship's heading.

    Parameters
    ----------
    true_wind_direction_deg : float or ndarray
        Where the true wind comes from, clockwise from north. [deg]
    heading_deg : float or ndarray
        Where the ship goes, clockwise from north. [deg]

    Returns
    -------
    true_wind_angle_deg : float or ndarray
        Relative bearing of the wind from the bow, (-180, 180]; 0 = head wind, +90 = from
        starboard. [deg]
    """
    return wrap_angle_deg(np.asarray(true_wind_direction_deg, dtype=float)
                          - np.asarray(heading_deg, dtype=float))


# ----------------------------------------------------------------------------- joint tables
@dataclass(frozen=True)
class JointWind:
    """A discrete joint distribution of wind conditions met at sea.

    Attributes
    ----------
    true_wind_angle_deg : ndarray
        Relative bearing of the true wind from the bow, (-180, 180]. [deg]
    true_wind_speed_m_s : ndarray
        True wind speed at the reference height. [m s^-1]
    probability : ndarray
        Share of time at sea in each condition; sums to 1.
    true_wind_direction_deg : ndarray or None
        Where the wind comes from, clockwise from north, when the source knew it (Weibull sectors
        before the course was applied). [deg]
    source : str
        Where the data came from (file name or "invented demo ...").
    """

    true_wind_angle_deg: np.ndarray
    true_wind_speed_m_s: np.ndarray
    probability: np.ndarray
    true_wind_direction_deg: np.ndarray | None = None
    source: str = ""

    @property
    def size(self) -> int:
        return int(self.probability.size)

    def mean_wind_speed_m_s(self) -> float:
        return float(np.sum(self.probability * self.true_wind_speed_m_s))

    def as_frame(self) -> pd.DataFrame:
        d = {"true_wind_angle_deg": self.true_wind_angle_deg,
             "true_wind_speed_m_s": self.true_wind_speed_m_s, "probability": self.probability}
        if self.true_wind_direction_deg is not None:
            d["true_wind_direction_deg"] = self.true_wind_direction_deg
        return pd.DataFrame(d)


def _name_of(source, name: str | None) -> str:
    if name:
        return name
    if isinstance(source, (str, os.PathLike)):
        return Path(source).name
    return "uploaded table"


def read_csv_frame(source, name: str | None = None, **kw) -> pd.DataFrame:
    """Read a small CSV (a path, file-like or an already-read DataFrame) with clear errors.

    Lines starting with ``#`` are comments (the invented demo files say so there).
    """
    label = _name_of(source, name)
    if isinstance(source, pd.DataFrame):
        return source.copy()
    try:
        if isinstance(source, (str, Path)):
            source = read_bytes(source, label)  # regular files only, at most MAX_DATA_BYTES
        if isinstance(source, (bytes, bytearray)):
            source = io.BytesIO(source)
        return pd.read_csv(source, comment="#", skipinitialspace=True, **kw)
    except FileNotFoundError:
        raise InputError("file", f"{label}: file not found") from None
    except IsADirectoryError:
        raise InputError("file", f"{label}: is a folder, not a CSV file") from None
    except UnicodeDecodeError:
        raise InputError("file", f"{label}: not UTF-8 text (is it a CSV file?)") from None
    except pd.errors.EmptyDataError:
        raise InputError("file", f"{label}: the file is empty") from None
    except pd.errors.ParserError as exc:
        raise InputError("file", f"{label}: not a readable CSV table ({_one_line(exc)})") from None


def _one_line(exc) -> str:
    return " ".join(str(exc).split())


def _require_columns(df: pd.DataFrame, columns, label: str, what: str) -> pd.DataFrame:
    df = df.rename(columns=lambda c: str(c).strip())
    missing = [c for c in columns if c not in df.columns]
    if missing:
        raise InputError(missing[0], f"{label}: missing column{'s' if len(missing) > 1 else ''} "
                                     f"{', '.join(repr(m) for m in missing)}; {what} needs columns "
                                     f"{', '.join(columns)} (found {', '.join(map(str, df.columns)) or 'none'})")
    if len(df) == 0:
        raise InputError("file", f"{label}: no data rows under the header")
    return df


class CellError(Exception):
    """One bad cell: ``row`` counts data rows from 0 within the block that was checked."""

    def __init__(self, row: int, column: str, detail: str):
        super().__init__(row, column, detail)
        self.row = row
        self.column = column
        self.detail = detail

    def input_error(self, label: str, row_offset: int = 0, source=None) -> InputError:
        """The one-line user error, with the row counted from 1 over the whole file and, when the
        ``source`` can be read again, the file's line (comments and blank lines counted)."""
        row = row_offset + self.row
        line = data_row_line(source, row) if source is not None else None
        where = f"row {row + 1}" + (f" (line {line})" if line is not None and line != row + 2 else "")
        return InputError(self.column, f"{label}, {where}: {self.detail}")


def numeric_column(df: pd.DataFrame, column: str, unit: str = "", *, low=None, high=None,
                   low_inclusive: bool = True, high_inclusive: bool = True) -> np.ndarray:
    """A finite float column within a range; raise :class:`CellError` at the first bad cell."""
    raw = df[column]
    values = pd.to_numeric(raw, errors="coerce").to_numpy(dtype=float, na_value=np.nan)
    bad = ~np.isfinite(values)
    if low is not None:
        bad |= (values < low) if low_inclusive else (values <= low)
    if high is not None:
        bad |= (values > high) if high_inclusive else (values >= high)
    if bad.any():
        i = int(np.flatnonzero(bad)[0])
        v = raw.iloc[i]
        shown = values[i] if np.isfinite(values[i]) else ("empty" if _is_blank(v) else v)
        try:
            check_number(column, shown, unit, low=low, high=high, low_inclusive=low_inclusive,
                         high_inclusive=high_inclusive)
        except InputError as exc:
            raise CellError(i, column, str(exc)) from None
        raise CellError(i, column, f"{column} is not a usable number (got {v!r})")
    return values


def _is_blank(v) -> bool:
    return v is None or (isinstance(v, float) and math.isnan(v)) or (isinstance(v, str) and not v.strip()) \
        or v is pd.NA


def _check_sum(p: np.ndarray, label: str, column: str) -> None:
    total = float(np.sum(p))
    if abs(total - 1.0) > PROBABILITY_TOLERANCE:
        raise InputError(column, f"{label}: column {column} sums to {total:.9g}; it must sum to 1 "
                                 f"within {PROBABILITY_TOLERANCE:g} (divide each value by the total, "
                                 "or by 100 if they are percentages)")


def read_wind_table(source, name: str | None = None) -> JointWind:
    """Read and check a joint wind table (true wind angle x speed with probabilities).

    Parameters
    ----------
    source : path, file-like, bytes or DataFrame
        CSV with columns ``true_wind_angle_deg`` (relative bearing from the bow, -180 to 360;
        stored wrapped to (-180, 180]), ``true_wind_speed_m_s`` (>= 0) and ``probability``
        (>= 0, summing to 1 within 1e-6). Other columns are ignored.
    name : str, optional
        How to name the file in messages.

    Returns
    -------
    JointWind
    """
    label = _name_of(source, name)
    df = _require_columns(read_csv_frame(source, label), TABLE_COLUMNS, label, "a joint wind table")
    try:
        angle = numeric_column(df, "true_wind_angle_deg", "deg", low=-180.0, high=360.0)
        speed = numeric_column(df, "true_wind_speed_m_s", "m/s", low=0.0, high=MAX_WIND_SPEED_M_S)
        prob = numeric_column(df, "probability", "", low=0.0, high=1.0)
    except CellError as exc:
        raise exc.input_error(label, source=source) from None
    _check_sum(prob, label, "probability")
    return JointWind(wrap_angle_deg(angle), speed, prob, None, label)


def single_condition(true_wind_angle_deg: float, true_wind_speed_m_s: float) -> JointWind:
    """A one-row table with probability 1 (the wind of a single rotor calculation)."""
    return JointWind(wrap_angle_deg(np.array([float(true_wind_angle_deg)])),
                     np.array([float(true_wind_speed_m_s)]), np.array([1.0]), None,
                     "single condition")


# ----------------------------------------------------------------------------- Weibull sectors
@dataclass(frozen=True)
class WeibullSectors:
    """Weibull wind-speed distributions per sector of true wind direction.

    Attributes
    ----------
    sector_centre_deg : ndarray
        Centre of each sector of true wind direction (from, clockwise from north). [deg]
    frequency : ndarray
        Share of time the wind comes from each sector; sums to 1.
    scale_m_s : ndarray
        Weibull scale parameter c. [m s^-1]
    shape : ndarray
        Weibull shape parameter k. [-]
    source : str
    """

    sector_centre_deg: np.ndarray
    frequency: np.ndarray
    scale_m_s: np.ndarray
    shape: np.ndarray
    source: str = ""

    @property
    def sector_width_deg(self) -> float:
        return 360.0 / self.frequency.size

    def mean_wind_speed_m_s(self) -> float:
        """Frequency-weighted mean of the sector means c Gamma(1 + 1/k). [m s^-1]"""
        return float(np.sum(self.frequency * weibull_mean(self.scale_m_s, self.shape)))

    def share_above(self, speed_m_s: float) -> float:
        """Share of the time the wind blows faster than ``speed_m_s``.

        Parameters
        ----------
        speed_m_s : float
            Wind speed. [m s^-1]

        Returns
        -------
        float
            sum over sectors of f exp(-(v/c)^k). [-]

        References
        ----------
        .. [1] Justus et al. (1978), J. Appl. Meteor. 17, 350-353 (the Weibull distribution of
           wind speed).
        """
        return float(np.sum(self.frequency * (1.0 - weibull_cdf(speed_m_s, self.scale_m_s, self.shape))))

    def warnings(self) -> tuple:
        """A warning when the sectors put a noticeable share of the time (over 0.1 %) above
        :data:`MAX_WIND_SPEED_M_S`, the fastest wind a table or a series may hold."""
        share = self.share_above(MAX_WIND_SPEED_M_S)
        if share <= WEIBULL_SHARE_ABOVE_TOP:
            return ()
        return (ModelWarning("weibull_above_top_speed",
                             f"{self.source}: the Weibull sectors put {100 * share:.3g} % of the time above "
                             f"{MAX_WIND_SPEED_M_S:g} m/s, the fastest wind a table or series may hold: "
                             "check the scale (m/s) and shape of each sector", ""),)


def read_weibull_sectors(source, name: str | None = None) -> WeibullSectors:
    """Read and check Weibull parameters per direction sector.

    Columns: ``sector_centre_deg`` (true wind direction the sector is centred on, from,
    clockwise from north, 0 to 360; the sectors are taken as equally wide, 360 / number of rows),
    ``frequency`` (share of time, summing to 1 within 1e-6), ``scale_m_s`` (> 0) and ``shape``
    (between 0.5 and 10).
    """
    label = _name_of(source, name)
    df = _require_columns(read_csv_frame(source, label), WEIBULL_COLUMNS, label,
                          "a Weibull-per-sector table")
    try:
        centre = numeric_column(df, "sector_centre_deg", "deg", low=0.0, high=360.0)
        freq = numeric_column(df, "frequency", "", low=0.0, high=1.0)
        scale = numeric_column(df, "scale_m_s", "m/s", low=0.0, high=MAX_WIND_SPEED_M_S,
                               low_inclusive=False)
        shape = numeric_column(df, "shape", "", low=0.5, high=10.0)
    except CellError as exc:
        raise exc.input_error(label, source=source) from None
    _check_sum(freq, label, "frequency")
    wrapped = np.mod(centre, 360.0)
    if np.unique(np.round(wrapped, 6)).size != wrapped.size:
        raise InputError("sector_centre_deg", f"{label}: column sector_centre_deg repeats a sector; "
                                              "each direction sector must appear once")
    return WeibullSectors(wrapped, freq, scale, shape, label)


def weibull_cdf(speed_m_s, scale_m_s, shape):
    """Weibull cumulative distribution F(v) = 1 - exp(-(v/c)^k). [-]

    References
    ----------
    .. [1] Justus et al. (1978), J. Appl. Meteor. 17, 350-353.
    """
    v = np.maximum(np.asarray(speed_m_s, dtype=float), 0.0)
    return -np.expm1(-(v / scale_m_s) ** shape)


def weibull_mean(scale_m_s, shape):
    """Mean wind speed of a Weibull distribution, c Gamma(1 + 1/k). [m s^-1]"""
    return np.asarray(scale_m_s, dtype=float) * special.gamma(1.0 + 1.0 / np.asarray(shape, dtype=float))


def weibull_partial_first_moment(low_m_s, high_m_s, scale_m_s, shape):
    """Integral of v f(v) dv from ``low`` to ``high`` for a Weibull density f. [m s^-1]

    Notes
    -----
    With x = (v/c)^k the integral is c Gamma(1 + 1/k) [P(1 + 1/k, x_high) - P(1 + 1/k, x_low)],
    P being the regularised lower incomplete gamma function; ``high`` may be ``inf``.
    """
    c = np.asarray(scale_m_s, dtype=float)
    k = np.asarray(shape, dtype=float)
    s = 1.0 + 1.0 / k
    xl = (np.maximum(np.asarray(low_m_s, dtype=float), 0.0) / c) ** k
    xh = (np.maximum(np.asarray(high_m_s, dtype=float), 0.0) / c) ** k
    return c * special.gamma(s) * (special.gammainc(s, xh) - special.gammainc(s, xl))


def discretise_weibull(sectors: WeibullSectors, speed_step_m_s: float = WEIBULL_SPEED_STEP_M_S,
                       top_speed_m_s: float = WEIBULL_TOP_SPEED_M_S,
                       direction_step_deg: float = WEIBULL_DIRECTION_STEP_DEG) -> JointWind:
    """Turn Weibull sectors into a joint table of true wind direction x speed.

    Speeds are binned in steps of ``speed_step_m_s`` up to ``top_speed_m_s`` with one open bin
    above it. Each bin's probability is F(b) - F(a) times the sector frequency, and its speed is
    the bin's conditional mean (integral of v f(v) over the bin divided by its probability), so
    the table keeps both the total probability and the mean wind speed of the distribution
    exactly. Each sector is spread evenly over sub-directions at most ``direction_step_deg``
    apart across its width.

    Returns
    -------
    JointWind
        With ``true_wind_direction_deg`` set and ``true_wind_angle_deg`` relative to a ship
        heading north; use :func:`apply_course` for the trade's course.
    """
    edges = np.arange(0.0, top_speed_m_s + 0.5 * speed_step_m_s, speed_step_m_s)
    lo = edges
    hi = np.append(edges[1:], np.inf)
    width = sectors.sector_width_deg
    n_sub = max(1, int(math.ceil(width / direction_step_deg - 1e-9)))
    offsets = (np.arange(n_sub) + 0.5) / n_sub * width - width / 2.0
    dirs, speeds, probs = [], [], []
    for centre, f, c, k in zip(sectors.sector_centre_deg, sectors.frequency, sectors.scale_m_s,
                               sectors.shape):
        if f == 0.0:
            continue
        p_bin = weibull_cdf(hi, c, k) - weibull_cdf(lo, c, k)
        moment = weibull_partial_first_moment(lo, hi, c, k)
        keep = p_bin > 0.0
        v_bin = np.where(keep, moment / np.where(keep, p_bin, 1.0), 0.5 * (lo + np.minimum(hi, lo + speed_step_m_s)))
        for off in offsets:
            dirs.append(np.full(keep.sum(), np.mod(centre + off, 360.0)))
            speeds.append(v_bin[keep])
            probs.append(f * p_bin[keep] / n_sub)
    direction = np.concatenate(dirs)
    return JointWind(wrap_angle_deg(direction), np.concatenate(speeds), np.concatenate(probs),
                     direction, sectors.source)


def apply_course(joint: JointWind, course_deg: float, round_trip: bool = False) -> JointWind:
    """Joint table relative to the bow for a ship on ``course_deg`` (and back, if ``round_trip``).

    A round trip spends half the time on the course and half on its reciprocal, so each wind
    condition appears twice with half its probability.
    """
    if joint.true_wind_direction_deg is None:
        raise ValueError("apply_course needs a table of true wind directions")
    d = joint.true_wind_direction_deg
    if not round_trip:
        return JointWind(relative_wind_angle_deg(d, course_deg), joint.true_wind_speed_m_s,
                         joint.probability, d, joint.source)
    return JointWind(np.concatenate([relative_wind_angle_deg(d, course_deg),
                                     relative_wind_angle_deg(d, course_deg + 180.0)]),
                     np.concatenate([joint.true_wind_speed_m_s] * 2),
                     np.concatenate([joint.probability] * 2) / 2.0,
                     np.concatenate([d, d]), joint.source)


# ----------------------------------------------------------------------------- hourly series
@dataclass(frozen=True)
class SeriesBlock:
    """One checked block of an hourly series (rows in file order).

    Attributes
    ----------
    row_offset : int
        Data rows before this block in the whole series.
    month : ndarray of int
        Calendar month 1-12 of each row (UTC when the times carry an offset).
    ship_speed_m_s, heading_deg, true_wind_speed_m_s, true_wind_direction_deg,
    true_wind_angle_deg : ndarray
        Per row, core units (angles in degrees, as named).
    leg : ndarray of str or None
        The optional ``leg`` column.
    time_span_ns : tuple of int
        First and last time of the block, in nanoseconds since 1970-01-01 UTC.
    """

    row_offset: int
    month: np.ndarray
    ship_speed_m_s: np.ndarray
    heading_deg: np.ndarray
    true_wind_speed_m_s: np.ndarray
    true_wind_direction_deg: np.ndarray
    true_wind_angle_deg: np.ndarray
    leg: np.ndarray | None = None
    time_span_ns: tuple | None = None

    def __len__(self) -> int:
        return int(self.month.size)


def check_series_frame(df: pd.DataFrame, row_offset: int = 0) -> SeriesBlock:
    """Check one block of series rows; raise :class:`CellError` at the first bad cell.

    Rows are counted from 0 within ``df`` in the error; :meth:`CellError.input_error` adds the
    offset and the file name.
    """
    times = df["time"]
    parsed = pd.to_datetime(times.astype("string"), format="ISO8601", utc=True, errors="coerce")
    bad = parsed.isna().to_numpy()
    if bad.any():
        i = int(np.flatnonzero(bad)[0])
        raise CellError(i, "time", "time must be an ISO 8601 date and time such as "
                                   f"2031-01-01T00:00 (got {'empty' if _is_blank(times.iloc[i]) else repr(str(times.iloc[i]))})")
    year = parsed.dt.year.to_numpy(dtype=np.int64)
    out = (year < SERIES_YEARS[0]) | (year > SERIES_YEARS[1])
    if out.any():
        i = int(np.flatnonzero(out)[0])
        raise CellError(i, "time", f"time must lie in the years {SERIES_YEARS[0]} to {SERIES_YEARS[1]} "
                                   f"(got {str(times.iloc[i])[:40]!r})")
    month = parsed.dt.month.to_numpy(dtype=np.int64)
    vs_kn = numeric_column(df, "ship_speed_kn", "kn", low=0.0, high=MAX_SHIP_SPEED_KN)
    heading = numeric_column(df, "ship_heading_deg", "deg", low=0.0, high=360.0)
    tws = numeric_column(df, "true_wind_speed_m_s", "m/s", low=0.0, high=MAX_WIND_SPEED_M_S)
    twd = numeric_column(df, "true_wind_direction_deg", "deg", low=0.0, high=360.0)
    leg = None
    if "leg" in df.columns:
        leg = df["leg"].astype("string").fillna("").str.strip().to_numpy(dtype=object)
    return SeriesBlock(row_offset, month, vs_kn * KNOT_M_S, heading, tws, twd,
                       relative_wind_angle_deg(twd, heading), leg,
                       (int(parsed.min().value), int(parsed.max().value)))


def _series_frame_columns(df: pd.DataFrame, label: str) -> pd.DataFrame:
    df = df.rename(columns=lambda c: str(c).strip())
    missing = [c for c in SERIES_COLUMNS if c not in df.columns]
    if missing:
        raise InputError(missing[0], f"{label}: missing column{'s' if len(missing) > 1 else ''} "
                                     f"{', '.join(repr(m) for m in missing)}; an hourly series needs "
                                     f"columns {', '.join(SERIES_COLUMNS)} (and optionally leg); "
                                     f"found {', '.join(map(str, df.columns)) or 'none'}")
    return df


def series_usecols(header) -> list[str]:
    """The columns of ``header`` a series reader keeps."""
    return [c for c in header if str(c).strip() in SERIES_COLUMNS + SERIES_OPTIONAL]


def iter_series(source, name: str | None = None, chunk_rows: int = DEFAULT_CHUNK_ROWS,
                progress=None) -> Iterator[SeriesBlock]:
    """Stream an hourly series in checked blocks of at most ``chunk_rows`` rows.

    ``source`` is a path (read with ``pandas.read_csv(chunksize=...)``, so memory stays bounded
    whatever the length) or a DataFrame (sliced in blocks). ``progress(fraction, text)`` is
    called after each block. Raises :class:`InputError` naming the file, row and column of the
    first bad cell.
    """
    label = _name_of(source, name)
    if isinstance(source, pd.DataFrame):
        df = _series_frame_columns(source, label)
        if len(df) == 0:
            raise InputError("file", f"{label}: no data rows under the header")
        n = len(df)
        for start in range(0, n, chunk_rows):
            part = df.iloc[start:start + chunk_rows]
            try:
                yield check_series_frame(part, start)
            except CellError as exc:
                raise exc.input_error(label, start) from None
            if progress:
                progress(min(1.0, (start + len(part)) / n), f"Reading {label}")
        return
    path = Path(source)
    with open_regular(path, label) as fh:  # a regular file (never a pipe or a device), any length
        size = max(os.fstat(fh.fileno()).st_size, 1)
        try:
            reader = pd.read_csv(fh, comment="#", skipinitialspace=True, chunksize=chunk_rows,
                                 usecols=lambda c: str(c).strip() in SERIES_COLUMNS + SERIES_OPTIONAL,
                                 dtype={"leg": "string"})
        except (pd.errors.EmptyDataError, UnicodeDecodeError):
            raise InputError("file", f"{label}: the file is empty or not text") from None
        except pd.errors.ParserError as exc:
            raise InputError("file", f"{label}: not a readable CSV table ({_one_line(exc)})") from None
        offset = 0
        try:
            for chunk in reader:
                chunk = _series_frame_columns(chunk, label)
                try:
                    block = check_series_frame(chunk, offset)
                except CellError as exc:
                    raise exc.input_error(label, offset, path) from None
                offset += len(chunk)
                yield block
                if progress:
                    progress(min(1.0, fh.tell() / size), f"Reading {label}")
        except UnicodeDecodeError:
            raise InputError("file", f"{label}: not UTF-8 text (is it a CSV file?)") from None
        except pd.errors.ParserError as exc:
            raise InputError("file", f"{label}: not a readable CSV table ({_one_line(exc)})") from None
        if offset == 0:
            # header only: check the columns anyway for the clearer message
            fh.seek(0)
            head = pd.read_csv(fh, comment="#", nrows=0)
            _series_frame_columns(head, label)
            raise InputError("file", f"{label}: no data rows under the header")


def series_from_joint(joint: JointWind, rows: int, ship_speed_m_s: float, heading_deg: float = 0.0,
                      start: str = "2031-01-01T00:00") -> pd.DataFrame:
    """An hourly series that repeats each table condition in proportion to its probability.

    Used to check that a series and a table describing the same wind give the same answer; the
    probabilities times ``rows`` must be whole numbers.
    """
    counts = joint.probability * rows
    if np.max(np.abs(counts - np.round(counts))) > 1e-6:
        raise ValueError("probability x rows must be whole numbers to repeat a table exactly")
    reps = np.round(counts).astype(int)
    twa = np.repeat(joint.true_wind_angle_deg, reps)
    tws = np.repeat(joint.true_wind_speed_m_s, reps)
    n = int(reps.sum())
    return pd.DataFrame({
        "time": pd.date_range(start, periods=n, freq="h").strftime("%Y-%m-%dT%H:%M"),
        "ship_speed_kn": np.full(n, ship_speed_m_s / KNOT_M_S),
        "ship_heading_deg": np.full(n, heading_deg),
        "true_wind_speed_m_s": tws,
        "true_wind_direction_deg": np.mod(twa + heading_deg, 360.0),
    })
