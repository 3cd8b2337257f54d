"""Operational carbon intensity indicator (CII) of a ship and its rating A to E (IMO).

The attained CII of a calendar year is the CO2 emitted per unit of transport work, with the
transport work taken as capacity times distance (supply-based, "AER" for deadweight ships)::

    attained CII = sum_j FC_j CF_j / (C D)                         [g CO2 / (t nm)]   (G1)
    reference CII = a C_ref^-c   (a, c, C_ref by ship type and size)                  (G2)
    required CII  = (1 - Z/100) reference CII   (Z: the year's reduction factor)      (G3)
    boundaries    = exp(d1..d4) required CII; rating A .. E between them            (G4)

C is the deadweight or the gross tonnage as G1 says for the ship type; C_ref is C, or the fixed
capacity G2 gives for the largest or smallest sizes of some types. Everything is vectorised over
the attained values, so a year with and without rotors (or a spread of cases) is one call.

Provenance: the formulas and the capacity per ship type were read in secondary sources quoting
the guidelines; the reduction factors for 2027-2030 were read in a report of MEPC.400(83); the
reference-line parameters a, c, the capacity limits, the factors for 2020-2026 and the rating
vectors are **from memory** of the resolutions' tables (checked for continuity where two lines
meet, e.g. general cargo ships at 20,000 DWT). Check them against the resolutions before a rating
is reported to anyone: the statutory rating is the flag State's, on verified fuel data (and the
correction factors of MEPC.355(78), not modelled here).

References
----------
.. [1] IMO (2022). Resolution MEPC.352(78): 2022 Guidelines on operational carbon intensity
   indicators and the calculation methods (CII guidelines, G1).
.. [2] IMO (2022). Resolution MEPC.353(78): 2022 Guidelines on the reference lines for use with
   operational carbon intensity indicators (CII reference lines guidelines, G2).
.. [3] IMO (2021). Resolution MEPC.338(76): 2021 Guidelines on the operational carbon intensity
   reduction factors relative to reference lines (G3); amended by MEPC.400(83) (2025) for
   2027-2030.
.. [4] IMO (2022). Resolution MEPC.354(78): 2022 Guidelines on the operational carbon intensity
   rating of ships (CII rating guidelines, G4).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from liftcore.errors import InputError, check_choice, check_number

#: Ratings from best to worst (G4).
RATINGS = ("A", "B", "C", "D", "E")


@dataclass(frozen=True)
class Line:
    """One size range of a ship type: capacities ``low <= C < high`` use C_ref = ``fixed`` (or C
    itself when None) in the reference line a C_ref^-c, and the rating vector ``dd``."""

    low: float
    high: float
    a: float
    c: float
    dd: tuple[float, float, float, float]
    fixed: float | None = None


@dataclass(frozen=True)
class ShipType:
    label: str
    capacity: str  # "DWT" or "GT" (G1)
    lines: tuple[Line, ...]


_INF = float("inf")
#: Ship types of G2/G4: reference lines and rating vectors exp(d1..d4) (from memory; see the
#: module notes).
SHIP_TYPES = {
    "bulk_carrier": ShipType("Bulk carrier", "DWT", (
        Line(279_000, _INF, 4745, 0.622, (0.86, 0.94, 1.06, 1.18), fixed=279_000),
        Line(0, 279_000, 4745, 0.622, (0.86, 0.94, 1.06, 1.18)))),
    "gas_carrier": ShipType("Gas carrier", "DWT", (
        Line(65_000, _INF, 14405e7, 2.071, (0.81, 0.91, 1.12, 1.44)),
        Line(0, 65_000, 8104, 0.639, (0.85, 0.95, 1.06, 1.25)))),
    "tanker": ShipType("Tanker", "DWT", (Line(0, _INF, 5247, 0.610, (0.82, 0.93, 1.08, 1.28)),)),
    "container_ship": ShipType("Container ship", "DWT", (Line(0, _INF, 1984, 0.489, (0.83, 0.94, 1.07, 1.19)),)),
    "general_cargo_ship": ShipType("General cargo ship", "DWT", (
        Line(20_000, _INF, 31948, 0.792, (0.83, 0.94, 1.06, 1.19)),
        Line(0, 20_000, 588, 0.3885, (0.83, 0.94, 1.06, 1.19)))),
    "refrigerated_cargo_carrier": ShipType("Refrigerated cargo carrier", "DWT", (
        Line(0, _INF, 4600, 0.557, (0.78, 0.91, 1.07, 1.20)),)),
    "combination_carrier": ShipType("Combination carrier", "DWT", (
        Line(0, _INF, 5119, 0.622, (0.87, 0.96, 1.06, 1.14)),)),
    "lng_carrier": ShipType("LNG carrier", "DWT", (
        Line(100_000, _INF, 9.827, 0.0, (0.89, 0.98, 1.06, 1.13)),
        Line(65_000, 100_000, 14479e10, 2.673, (0.78, 0.92, 1.10, 1.37)),
        Line(0, 65_000, 14479e10, 2.673, (0.78, 0.92, 1.10, 1.37), fixed=65_000))),
    "vehicle_carrier": ShipType("Ro-ro cargo ship (vehicle carrier)", "GT", (
        Line(57_700, _INF, 3627, 0.590, (0.86, 0.94, 1.06, 1.16), fixed=57_700),
        Line(30_000, 57_700, 3627, 0.590, (0.86, 0.94, 1.06, 1.16)),
        Line(0, 30_000, 330, 0.329, (0.86, 0.94, 1.06, 1.16)))),
    "ro_ro_cargo_ship": ShipType("Ro-ro cargo ship", "DWT", (Line(0, _INF, 1967, 0.485, (0.76, 0.89, 1.08, 1.27)),)),
    "ro_ro_passenger_ship": ShipType("Ro-ro passenger ship", "GT", (
        Line(0, _INF, 2023, 0.460, (0.76, 0.92, 1.14, 1.30)),)),
    "cruise_passenger_ship": ShipType("Cruise passenger ship", "GT", (
        Line(0, _INF, 930, 0.383, (0.87, 0.95, 1.06, 1.16)),)),
}
SHIP_TYPE_KEYS = tuple(SHIP_TYPES)

#: Reduction factor Z [%] below the 2019 reference line by year (G3; 2027-2030 from MEPC.400(83)).
REDUCTION_FACTOR_PCT = {2019: 0.0, 2020: 1.0, 2021: 2.0, 2022: 3.0, 2023: 5.0, 2024: 7.0, 2025: 9.0,
                        2026: 11.0, 2027: 13.625, 2028: 16.25, 2029: 18.875, 2030: 21.5}
YEARS = (min(REDUCTION_FACTOR_PCT), max(REDUCTION_FACTOR_PCT))
#: Largest capacity accepted (beyond any ship afloat). [t]
MAX_CAPACITY_T = 600_000.0


def _line(ship_type: str, capacity: float) -> Line:
    check_choice("ship type", ship_type, SHIP_TYPES)
    c = check_number("capacity", capacity, "t", low=0.0, high=MAX_CAPACITY_T, low_inclusive=False)
    return next(ln for ln in SHIP_TYPES[ship_type].lines if ln.low <= c < ln.high)


def reference_cii(ship_type: str, capacity: float) -> float:
    """Reference CII of the ship type at its capacity.

    Parameters
    ----------
    ship_type : str
        One of :data:`SHIP_TYPE_KEYS`.
    capacity : float
        Deadweight or gross tonnage, as G1 gives for the type (``SHIP_TYPES[k].capacity``). [t]

    Returns
    -------
    float
        [g CO2 / (t nm)]

    Notes
    -----
    CII_ref = a C_ref^-c, with C_ref the capacity or the fixed capacity of the size range.

    References
    ----------
    .. [1] IMO Resolution MEPC.353(78) (2022), Table 1 (values from memory; see module notes).
    """
    ln = _line(ship_type, capacity)
    return float(ln.a * (ln.fixed if ln.fixed is not None else capacity) ** -ln.c)


def required_cii(ship_type: str, capacity: float, year: int) -> float:
    """Required CII of a year.

    Parameters
    ----------
    ship_type, capacity
        As :func:`reference_cii`. [-], [t]
    year : int
        Calendar year, 2019 to 2030.

    Returns
    -------
    float
        [g CO2 / (t nm)]

    Notes
    -----
    required = (1 - Z/100) CII_ref (MARPOL Annex VI reg. 28.4).

    References
    ----------
    .. [1] IMO Resolution MEPC.338(76) (2021), amended by MEPC.400(83) (2025).
    """
    y = int(check_number("CII year", year, "", low=YEARS[0], high=YEARS[1]))
    return (1.0 - REDUCTION_FACTOR_PCT[y] / 100.0) * reference_cii(ship_type, capacity)


def boundaries(ship_type: str, capacity: float, year: int) -> np.ndarray:
    """The four rating boundaries (superior, lower, upper, inferior) of a year.

    Parameters
    ----------
    ship_type, capacity, year
        As :func:`required_cii`. [-], [t], [-]

    Returns
    -------
    ndarray, shape (4,)
        exp(d1..d4) x required CII. [g CO2 / (t nm)]

    References
    ----------
    .. [1] IMO Resolution MEPC.354(78) (2022), Table 1 (values from memory; see module notes).
    """
    return np.asarray(_line(ship_type, capacity).dd) * required_cii(ship_type, capacity, year)


def attained_cii(co2_t, capacity: float, distance_nm: float):
    """Attained (supply-based) CII of a year.

    Parameters
    ----------
    co2_t : float or ndarray
        CO2 emitted in the year, sum of fuel mass x conversion factor. [t]
    capacity : float
        Deadweight or gross tonnage. [t]
    distance_nm : float
        Distance sailed in the year. [nm]

    Returns
    -------
    float or ndarray
        [g CO2 / (t nm)]

    Notes
    -----
    attained = 1e6 M / (C D), M in tonnes.

    References
    ----------
    .. [1] IMO Resolution MEPC.352(78) (2022), G1.
    """
    if not distance_nm > 0:
        raise InputError("distance", f"the yearly distance must be above 0 nm for a CII (got {distance_nm:g} nm)")
    return 1e6 * np.asarray(co2_t, dtype=float) / (capacity * distance_nm)


def rating(attained, ship_type: str, capacity: float, year: int):
    """Rating A to E of attained CII values (vectorised).

    Parameters
    ----------
    attained : float or ndarray
        Attained CII. [g CO2 / (t nm)]
    ship_type, capacity, year
        As :func:`required_cii`. [-], [t], [-]

    Notes
    -----
    A below the superior boundary, B from it to the lower, C to the upper, D to the inferior,
    E at or above it (a value on a boundary takes the worse letter).

    Returns
    -------
    str or ndarray of str
        One letter per value.

    References
    ----------
    .. [1] IMO Resolution MEPC.354(78) (2022), rating boundaries.
    """
    i = np.searchsorted(boundaries(ship_type, capacity, year), np.asarray(attained, dtype=float), side="right")
    out = np.asarray(RATINGS)[i]
    return str(out) if out.ndim == 0 else out


@dataclass(frozen=True)
class CIIComparison:
    """A year's CII without and with the rotors (g CO2 per tonne-nautical-mile)."""

    ship_type: str
    capacity_t: float
    year: int
    distance_nm: float
    reference: float
    required: float
    boundaries: tuple
    attained_before: float
    attained_after: float
    rating_before: str
    rating_after: str

    def as_json(self) -> dict:
        """The command-line keys (:data:`JSON_KEYS`)."""
        return {"cii_ship_type": self.ship_type, "cii_capacity_t": self.capacity_t, "cii_year": self.year,
                "cii_distance_nm": self.distance_nm, "cii_reference": self.reference,
                "cii_required": self.required, "cii_boundaries": list(self.boundaries),
                "cii_attained_before": self.attained_before, "cii_attained_after": self.attained_after,
                "cii_rating_before": self.rating_before, "cii_rating_after": self.rating_after}


def compare(ship_type: str, capacity: float, year: int, distance_nm: float, co2_before_t: float,
            co2_after_t: float) -> CIIComparison:
    """The CII and rating of a year without and with the rotors (see :func:`attained_cii`).

    Returns
    -------
    CIIComparison
        Reference, required, boundaries [g CO2 / (t nm)] and both attained values with their letters.

    Parameters
    ----------
    ship_type, capacity, year
        As :func:`required_cii`.
    distance_nm : float
        Distance sailed in the year. [nm]
    co2_before_t, co2_after_t : float
        The year's CO2 without and with the rotors. [t]
    """
    att = attained_cii([co2_before_t, co2_after_t], capacity, distance_nm)
    letters = rating(att, ship_type, capacity, year)
    return CIIComparison(ship_type, float(capacity), int(year), float(distance_nm),
                         reference_cii(ship_type, capacity), required_cii(ship_type, capacity, year),
                         tuple(float(b) for b in boundaries(ship_type, capacity, year)),
                         float(att[0]), float(att[1]), str(letters[0]), str(letters[1]))


#: Keys of :meth:`CIIComparison.as_json` (null in a voyage without the ship's yearly fuel).
JSON_KEYS = ("cii_ship_type", "cii_capacity_t", "cii_year", "cii_distance_nm", "cii_reference", "cii_required",
             "cii_boundaries", "cii_attained_before", "cii_attained_after", "cii_rating_before",
             "cii_rating_after")
