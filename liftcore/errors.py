"""Input checks that fail with one clear line: which field, what value, which range.

Every user-facing entry point (pages, command line, scenario files) validates through these
helpers, so the messages read the same everywhere.
"""

from __future__ import annotations

import math
from typing import Iterable

import numpy as np


class InputError(ValueError):
    """A user input is missing, malformed or out of range.

    Parameters
    ----------
    field : str
        Name of the offending input as the user knows it (e.g. ``rotor diameter``).
    message : str
        The full sentence shown to the user.
    """

    def __init__(self, field: str, message: str):
        super().__init__(message)
        self.field = field
        self.message = message

    def __str__(self) -> str:  # one line, always
        return self.message.replace("\n", " ")


#: Longest piece of a user's value echoed in a message (the rest is elided). [characters]
MAX_ECHO_CHARS = 60


def echo(value) -> str:
    """A user's value as a message quotes it (see :func:`_fmt`): never whole when long, never
    with raw control characters."""
    return _fmt(value)


def _fmt(value) -> str:
    """A value as a message shows it: numbers plainly (numpy's too), text quoted with control
    characters escaped and cut to :data:`MAX_ECHO_CHARS`."""
    if isinstance(value, (float, np.floating)):
        return f"{float(value):.6g}"
    if isinstance(value, np.integer):
        return str(int(value))
    if isinstance(value, str):
        text = repr(value[:MAX_ECHO_CHARS])  # repr escapes control characters and NUL
        return text + (f" … ({len(value):,} characters)" if len(value) > MAX_ECHO_CHARS else "")
    text = str(value)
    return text if len(text) <= MAX_ECHO_CHARS else text[:MAX_ECHO_CHARS] + " …"


def _unit(unit: str) -> str:
    return f" {unit}" if unit else ""


def check_number(field: str, value, unit: str = "", *, low=None, high=None,
                 low_inclusive: bool = True, high_inclusive: bool = True) -> float:
    """Return ``value`` as a float, or raise :class:`InputError` naming the field and the range.

    NaN, infinities, booleans and non-numbers are refused.
    """
    if isinstance(value, bool) or value is None:
        raise InputError(field, f"{field} must be a number{_range_text(low, high, low_inclusive, high_inclusive, unit)} (got {_fmt(value)})")
    try:
        x = float(value)
    except OverflowError:  # an integer too large for a float
        raise InputError(field, f"{field} must be a finite number{_range_text(low, high, low_inclusive, high_inclusive, unit)} (got an integer of about {int(int(value).bit_length() * 0.30103) + 1} digits)") from None
    except (TypeError, ValueError):
        raise InputError(field, f"{field} must be a number{_range_text(low, high, low_inclusive, high_inclusive, unit)} (got {_fmt(value)})") from None
    if not math.isfinite(x):
        raise InputError(field, f"{field} must be a finite number{_range_text(low, high, low_inclusive, high_inclusive, unit)} (got {_fmt(value)})")
    bad_low = low is not None and (x < low or (x == low and not low_inclusive))
    bad_high = high is not None and (x > high or (x == high and not high_inclusive))
    if bad_low or bad_high:
        raise InputError(field, f"{field} must be{_range_text(low, high, low_inclusive, high_inclusive, unit)} (got {_fmt(x)}{_unit(unit)})")
    return x


def _range_text(low, high, low_inc, high_inc, unit) -> str:
    u = _unit(unit)
    if low is not None and high is not None:
        lo_op = ">=" if low_inc else ">"
        hi_op = "<=" if high_inc else "<"
        if low_inc and high_inc:
            return f" between {_fmt(low)} and {_fmt(high)}{u}"
        return f" {lo_op} {_fmt(low)}{u} and {hi_op} {_fmt(high)}{u}"
    if low is not None:
        return f" {'>=' if low_inc else '>'} {_fmt(low)}{u}"
    if high is not None:
        return f" {'<=' if high_inc else '<'} {_fmt(high)}{u}"
    return ""


def check_positive(field: str, value, unit: str = "") -> float:
    """A strictly positive finite number, e.g. ``rotor diameter must be > 0 m (got -4)``."""
    return check_number(field, value, unit, low=0.0, low_inclusive=False)


def check_non_negative(field: str, value, unit: str = "") -> float:
    return check_number(field, value, unit, low=0.0)


def check_choice(field: str, value, choices: Iterable[str]) -> str:
    """One of a fixed set of keys; the message lists the valid ones."""
    valid = list(choices)
    if value not in valid:
        raise InputError(field, f"{field} must be one of {', '.join(map(str, valid))} (got {_fmt(value)})")
    return value


def check_array(field: str, values, unit: str = "", *, low=None, high=None,
                low_inclusive: bool = True, high_inclusive: bool = True) -> np.ndarray:
    """A finite float array within a range; the message names the first bad element."""
    arr = np.asarray(values, dtype=float)
    bad = ~np.isfinite(arr)
    if low is not None:
        bad |= (arr < low) if low_inclusive else (arr <= low)
    if high is not None:
        bad |= (arr > high) if high_inclusive else (arr >= high)
    if bad.any():
        idx = int(np.flatnonzero(bad.ravel())[0])
        check_number(f"{field} (row {idx + 1})", arr.ravel()[idx], unit, low=low, high=high,
                      low_inclusive=low_inclusive, high_inclusive=high_inclusive)
    return arr


def pick_model(kind: str, key: str, table: dict):
    """Select a model variant from a dict of functions; unknown keys list the valid ones."""
    try:
        return table[key]
    except KeyError:
        raise ValueError(f"unknown {kind} {key!r}; valid: {', '.join(sorted(table))}") from None
