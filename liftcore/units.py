"""Display units at the edges (pages, command line, report), through one units library (Pint).

The core works in SI only. A *quantity kind* (``"speed"``, ``"force"``, ...) names what a number is;
a *unit system* (``"SI"``, ``"marine"``, ``"imperial"``) says how a person wants to read it. Kinds
that some users read differently from others get their own name (``"ship_speed"`` is knots in the
marine system, ``"wind_speed"`` too, while ``"ball_speed"`` is m/s there).
"""

from __future__ import annotations

import math
from functools import lru_cache

import numpy as np

UNIT_SYSTEMS = ("SI", "marine", "imperial")

#: SI unit of each quantity kind (how the core stores it), then its display unit per system.
#: Unit strings are Pint expressions; ``LABELS`` holds the short text shown to people.
DISPLAY = {
    #  kind              SI            marine          imperial
    "length":        ("m",          "m",            "ft"),
    "small_length":  ("mm",         "mm",           "inch"),
    "distance":      ("m",          "m",            "yard"),
    "route_distance": ("km",        "nautical_mile", "mile"),
    "speed":         ("m/s",        "knot",         "mph"),
    "ship_speed":    ("m/s",        "knot",         "knot"),
    "wind_speed":    ("m/s",        "knot",         "mph"),
    "ball_speed":    ("m/s",        "m/s",          "mph"),
    "force":         ("N",          "kN",           "lbf"),
    "large_force":   ("kN",         "kN",           "kip"),
    "moment":        ("kN*m",       "kN*m",         "kip*ft"),
    "power":         ("kW",         "kW",           "hp"),
    "energy":        ("MWh",        "MWh",          "MWh"),
    "mass":          ("kg",         "kg",           "lb"),
    "small_mass":    ("g",          "g",            "oz"),
    "fuel_mass":     ("t",          "t",            "short_ton"),
    "temperature":   ("degC",       "degC",         "degF"),
    "pressure":      ("hPa",        "hPa",          "inHg"),
    "density":       ("kg/m^3",     "kg/m^3",       "lb/ft^3"),
    "altitude":      ("m",          "m",            "ft"),
    "angle":         ("deg",        "deg",          "deg"),
    "rotation":      ("rpm",        "rpm",          "rpm"),
    "time":          ("s",          "s",            "s"),
    "duration":      ("h",          "h",            "h"),
    "circulation":   ("m^2/s",      "m^2/s",        "ft^2/s"),
    "area":          ("m^2",        "m^2",          "ft^2"),
    "force_per_span": ("N/m",       "N/m",          "lbf/ft"),
    "fuel_rate":     ("g/kWh",      "g/kWh",        "g/kWh"),
    "money":         ("",           "",             ""),
    "money_rate":    ("1/t",        "1/t",          "1/t"),
    "percent":       ("percent",    "percent",      "percent"),
    "ratio":         ("",           "",             ""),
}

#: The unit in which the core stores each kind (SI base or coherent units).
CORE = {
    "length": "m", "small_length": "m", "distance": "m", "route_distance": "m", "speed": "m/s",
    "ship_speed": "m/s", "wind_speed": "m/s", "ball_speed": "m/s", "force": "N",
    "large_force": "N", "moment": "N*m", "power": "W", "energy": "J", "mass": "kg",
    "small_mass": "kg", "fuel_mass": "kg", "temperature": "K", "pressure": "Pa",
    "density": "kg/m^3", "altitude": "m", "angle": "deg", "rotation": "rpm", "time": "s",
    "duration": "h", "circulation": "m^2/s", "area": "m^2", "force_per_span": "N/m", "fuel_rate": "g/kWh",
    "money": "", "money_rate": "1/t", "percent": "percent", "ratio": "",
}
# Angles, rotation rates, durations and fuel rates are kept in the units people enter them in
# (degrees, rpm, hours, g/kWh); field names carry the unit (``_deg``, ``_rpm``) so nothing is ambiguous.

LABELS = {
    "": "", "m": "m", "mm": "mm", "ft": "ft", "inch": "in", "yard": "yd", "km": "km",
    "nautical_mile": "nmi", "mile": "mi", "m/s": "m/s", "knot": "kn", "mph": "mph", "N": "N",
    "kN": "kN", "lbf": "lbf", "kip": "kip", "kN*m": "kN·m", "kip*ft": "kip·ft", "kW": "kW",
    "hp": "hp", "MWh": "MWh", "kg": "kg", "lb": "lb", "g": "g", "oz": "oz", "t": "t",
    "short_ton": "US ton", "degC": "°C", "degF": "°F", "hPa": "hPa", "inHg": "inHg",
    "kg/m^3": "kg/m³", "lb/ft^3": "lb/ft³", "deg": "°", "rpm": "rpm", "s": "s", "h": "h",
    "m^2/s": "m²/s", "ft^2/s": "ft²/s", "m^2": "m²", "ft^2": "ft²", "N/m": "N/m", "lbf/ft": "lbf/ft", "g/kWh": "g/kWh",
    "1/t": "per t", "percent": "%",
}


def _check(kind: str, system: str) -> None:
    if kind not in DISPLAY:
        raise ValueError(f"unknown quantity kind {kind!r}; valid: {', '.join(sorted(DISPLAY))}")
    if system not in UNIT_SYSTEMS:
        raise ValueError(f"unknown unit system {system!r}; valid: {', '.join(UNIT_SYSTEMS)}")


@lru_cache(maxsize=1)
def registry():
    """The one Pint unit registry (built once; takes a fraction of a second)."""
    import pint

    return pint.UnitRegistry()


@lru_cache(maxsize=None)
def _affine(src: str, dst: str) -> tuple[float, float]:
    """(scale, offset) such that ``dst_value = scale * src_value + offset``."""
    if src == dst or (src in ("", "percent") and dst == src):
        return 1.0, 0.0
    ureg = registry()
    q0 = ureg.Quantity(0.0, src).to(dst).magnitude
    q1 = ureg.Quantity(1.0, src).to(dst).magnitude
    return float(q1 - q0), float(q0)


def display_unit(kind: str, system: str) -> str:
    """Pint unit string used to show ``kind`` in ``system``."""
    _check(kind, system)
    return DISPLAY[kind][UNIT_SYSTEMS.index(system)]


def unit_label(kind: str, system: str) -> str:
    """Short label (``kn``, ``°F``) for ``kind`` in ``system``."""
    return LABELS[display_unit(kind, system)]


def core_unit_label(kind: str) -> str:
    """Short label of the unit the core stores ``kind`` in."""
    return LABELS.get(CORE[kind], CORE[kind])


def to_display(value, kind: str, system: str):
    """Convert a core (SI) value of ``kind`` to the display unit of ``system``."""
    a, b = _affine(CORE[kind], display_unit(kind, system))
    return _apply(value, a, b)


def from_display(value, kind: str, system: str):
    """Convert a value shown in ``system`` back to the core (SI) unit of ``kind``."""
    a, b = _affine(display_unit(kind, system), CORE[kind])
    return _apply(value, a, b)


def convert(value, src: str, dst: str):
    """Convert between two Pint unit strings, e.g. ``convert(10, "knot", "m/s")``."""
    a, b = _affine(src, dst)
    return _apply(value, a, b)


def _apply(value, a: float, b: float):
    if isinstance(value, (list, tuple, np.ndarray)):
        return np.asarray(value, dtype=float) * a + b
    return float(value) * a + b


def format_number(v, digits: int = 3) -> str:
    """A number as people read it: ``digits`` significant digits (never fewer than the integer
    digits: 14,641, not 1.46e+04), thousands separators from 1,000 up, no trailing zeros, and
    ``–`` for a missing value. Sizes below 0.001 are written as 2.5e-04."""
    if v is None or v != v:
        return "–"
    v = float(v)
    if v == 0:
        return "0"
    if math.isinf(v):
        return "∞" if v > 0 else "-∞"
    if abs(v) < 1e-3:
        return f"{v:.2e}"
    if abs(v) < 1:
        return f"{v:.{digits}g}"
    decimals = max(0, digits - len(str(int(abs(v)))))
    text = f"{v:,.{decimals}f}"
    if "." in text:
        text = text.rstrip("0").rstrip(".")
    return "0" if text in ("-0", "") else text


def quantity_text(value, kind: str, system: str, digits: int = 3) -> str:
    """A core value of ``kind`` as text in ``system``, with its unit: ``"150 kW"``, ``"201 hp"``."""
    if kind in ("ratio", "money"):
        return format_number(value, digits)
    return with_unit(format_number(to_display(value, kind, system), digits), unit_label(kind, system))


def with_unit(number: str, unit: str) -> str:
    """``"46°"``, ``"12 kn"``: a number and its unit as written (degrees stick to the number)."""
    if not unit:
        return number
    return f"{number}{unit}" if unit == "°" else f"{number} {unit}"


#: An input is shown with the fewest digits that keep it within this relative error: 6.17 m/s
#: for 12 kn (6.1733 m/s), 3.28 ft for 1 m. A tenth of a per cent is far below the uncertainty
#: of any input here; the core keeps the exact value until the user changes it.
DISPLAY_TOLERANCE = 1e-3


def tidy(x: float, tolerance: float = DISPLAY_TOLERANCE) -> float:
    """The number with the fewest significant digits (1 to 7) within ``tolerance`` of ``x``
    relatively: ``tidy(6.1733) == 6.17``, ``tidy(3.28084) == 3.28``, ``tidy(1013.25) == 1013``."""
    x = float(x)
    if x == 0 or not math.isfinite(x):
        return x
    for digits in range(1, 8):
        y = float(f"{x:.{digits}g}")
        if abs(y - x) <= tolerance * abs(x):
            return y
    return float(f"{x:.7g}")
