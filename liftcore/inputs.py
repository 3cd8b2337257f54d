"""Declared inputs of each study: one description drives the widgets, validation, unit display,
scenario files, share links, the comparison table and the report.

A :class:`Field` names one input in core units (its key carries the unit: ``diameter_m``), with its
quantity kind for display, default, allowed range and help text. An :class:`InputSpec` is the
ordered set of fields of one study kind, grouped into sections for the page.
"""

from __future__ import annotations

from dataclasses import dataclass, field as dc_field, replace
from typing import Any, Callable, Iterable

from liftcore import units
from liftcore.errors import InputError, check_choice, check_number, echo


@dataclass(frozen=True)
class Field:
    """One input.

    Attributes
    ----------
    key : str
        Stable identifier with the core unit as suffix (``ship_speed_m_s``); used in scenario
        files, URLs and widget keys.
    label : str
        Plain words for people (``"Ship speed"``), without the unit.
    kind : str
        ``"number"``, ``"int"``, ``"choice"``, ``"bool"`` or ``"text"``.
    quantity : str
        Quantity kind from :mod:`liftcore.units` for numbers (``"ship_speed"``); ``"ratio"`` if none.
    default : Any
        Value in core units; the invented demo case.
    low, high : float or None
        Allowed range in core units (inclusive unless ``low_open``/``high_open``).
    choices : tuple
        Allowed values for ``choice`` fields; ``choice_labels`` gives their display words.
    section : str
        Group heading on the page.
    help : str
        One sentence shown as the widget's tooltip.
    step : float or None
        Widget step in display units (``None`` lets the widget choose).
    advanced : bool
        Shown in a collapsed section on the page.
    show_if : callable or None
        ``show_if(values) -> bool`` on the complete core-unit values: whether the input matters
        (and is shown) for these values, e.g. the spin rate only when the spin is given as a rate.
        A hidden input keeps its value. ``None``: always shown.
    lines : int
        Text inputs only: lines of the text box (1 = one-line input).
    """

    key: str
    label: str
    kind: str = "number"
    quantity: str = "ratio"
    default: Any = 0.0
    low: float | None = None
    high: float | None = None
    low_open: bool = False
    high_open: bool = False
    choices: tuple = ()
    choice_labels: tuple = ()
    section: str = "Inputs"
    help: str = ""
    step: float | None = None
    advanced: bool = False
    show_if: Callable[[dict], bool] | None = dc_field(default=None, compare=False, repr=False)
    lines: int = 1

    def shown_for(self, values: dict) -> bool:
        """Whether this input matters for ``values`` (see ``show_if``)."""
        return self.show_if is None or bool(self.show_if(values))

    def unit(self, system: str = "SI", currency: str = "") -> str:
        """The unit label shown with this input in ``system``; money carries ``currency``."""
        if self.kind not in ("number", "int") or self.quantity == "ratio":
            return ""
        if self.quantity == "money":
            return currency
        label = units.unit_label(self.quantity, system)
        return f"{currency} {label}" if self.quantity == "money_rate" and currency else label

    def choice_label(self, value) -> str:
        if self.choice_labels and value in self.choices:
            return self.choice_labels[self.choices.index(value)]
        return str(value)

    def validate(self, value, system: str = "SI"):
        """Return the value in core units, or raise :class:`InputError` in ``system``'s units."""
        if self.kind in ("number", "int"):
            try:
                shown = units.to_display(value, self.quantity, system) if _is_num(value) else value
            except OverflowError:  # an integer too large for a float: check_number says so
                shown = value
            # limits as a person reads them (10 significant digits), compared in the unit typed
            lo = None if self.low is None else _round(units.to_display(self.low, self.quantity, system))
            hi = None if self.high is None else _round(units.to_display(self.high, self.quantity, system))
            shown = _snap(shown, lo, not self.low_open, below=True)
            shown = _snap(shown, hi, not self.high_open, below=False)
            x = check_number(self.label, shown, self.unit(system), low=lo, high=hi,
                             low_inclusive=not self.low_open, high_inclusive=not self.high_open)
            x = units.from_display(x, self.quantity, system)
            if self.kind == "int":
                if abs(x - round(x)) > 1e-9:
                    raise InputError(self.label, f"{self.label} must be a whole number (got {value})")
                return int(round(x))
            return float(x)
        if self.kind == "choice":
            return check_choice(self.label, value, self.choices)
        if self.kind == "bool":
            if isinstance(value, bool):
                return value
            if isinstance(value, str) and value.lower() in ("true", "false", "1", "0"):
                return value.lower() in ("true", "1")
            raise InputError(self.label, f"{self.label} must be true or false (got {value!r})")
        if self.kind == "text":
            if not isinstance(value, str):
                raise InputError(self.label, f"{self.label} must be text (got {value!r})")
            if len(value) > 20000:
                raise InputError(self.label, f"{self.label} must be at most 20000 characters (got {len(value)})")
            return value
        raise ValueError(f"unknown field kind {self.kind!r}")


def _is_num(v) -> bool:
    return isinstance(v, (int, float)) and not isinstance(v, bool)


#: A value this close to an inclusive limit (relative to the limit) is the limit: a limit typed
#: as the page shows it (rounded to units.DISPLAY_TOLERANCE), or carried through a unit
#: conversion, is accepted.
LIMIT_ALLOWANCE = units.DISPLAY_TOLERANCE


def _snap(value, limit, inclusive: bool, below: bool):
    """``limit`` when ``value`` lies just outside it (below a lower limit, above an upper one;
    see :data:`LIMIT_ALLOWANCE`), else ``value`` unchanged."""
    if not inclusive or limit is None or not isinstance(value, float) or value != value:
        return value  # integers are compared exactly (and may be too large for a float)
    outside = value < limit if below else value > limit
    if outside and abs(value - limit) <= LIMIT_ALLOWANCE * abs(limit):
        return limit
    return value


def _round(x):
    return None if x is None else float(f"{x:.10g}")


@dataclass(frozen=True)
class InputSpec:
    """All inputs of one study kind, in page order."""

    kind: str
    fields: tuple[Field, ...] = dc_field(default_factory=tuple)

    def __post_init__(self):
        keys = [f.key for f in self.fields]
        dup = {k for k in keys if keys.count(k) > 1}
        if dup:
            raise ValueError(f"duplicate input keys in {self.kind}: {sorted(dup)}")

    @property
    def keys(self) -> tuple[str, ...]:
        return tuple(f.key for f in self.fields)

    def field(self, key: str) -> Field:
        for f in self.fields:
            if f.key == key:
                return f
        raise KeyError(f"{self.kind} has no input {key!r}; valid: {', '.join(self.keys)}")

    def sections(self) -> list[tuple[str, list[Field]]]:
        out: dict[str, list[Field]] = {}
        for f in self.fields:
            out.setdefault(f.section, []).append(f)
        return list(out.items())

    def defaults(self) -> dict[str, Any]:
        return {f.key: f.default for f in self.fields}

    def validate(self, values: dict, *, partial: bool = True, system: str = "SI") -> dict:
        """Check every value; unknown keys are an error. Missing keys take defaults when ``partial``.

        Returns a complete dict in core units. Raises :class:`InputError` for the first bad field.
        """
        unknown = [k for k in values if k not in self.keys]
        if unknown:
            raise InputError(str(unknown[0])[:60], f"unknown input {echo(str(unknown[0]))} for a {self.kind} study; "
                                         f"valid: {', '.join(self.keys)}")
        out = {}
        for f in self.fields:
            if f.key in values:
                out[f.key] = f.validate(values[f.key], system)
            elif partial:
                out[f.key] = f.default
            else:
                raise InputError(f.key, f"{f.label} is missing (key {f.key!r})")
        return out

    def with_rules(self, rules: dict) -> "InputSpec":
        """A copy whose fields named in ``rules`` (key -> ``show_if`` predicate) get that rule."""
        unknown = set(rules) - set(self.keys)
        if unknown:
            raise KeyError(f"{self.kind} has no input {sorted(unknown)[0]!r}")
        return replace(self, fields=tuple(replace(f, show_if=rules[f.key]) if f.key in rules else f
                                          for f in self.fields))

    def diff(self, a: dict, b: dict) -> list[str]:
        """Keys whose values differ between two complete input dicts."""
        return [k for k in self.keys if a.get(k) != b.get(k)]


def number(key, label, quantity="ratio", default=0.0, low=None, high=None, **kw) -> Field:
    """Shorthand for a numeric :class:`Field`."""
    return Field(key=key, label=label, kind="number", quantity=quantity, default=default,
                 low=low, high=high, **kw)


def integer(key, label, default=1, low=None, high=None, **kw) -> Field:
    return Field(key=key, label=label, kind="int", quantity="ratio", default=default, low=low,
                 high=high, **kw)


def choice(key, label, choices: Iterable, default=None, labels: Iterable = (), **kw) -> Field:
    choices = tuple(choices)
    return Field(key=key, label=label, kind="choice", choices=choices,
                 choice_labels=tuple(labels), default=choices[0] if default is None else default,
                 **kw)


def flag(key, label, default=False, **kw) -> Field:
    return Field(key=key, label=label, kind="bool", default=default, **kw)


def text(key, label, default="", **kw) -> Field:
    return Field(key=key, label=label, kind="text", default=default, **kw)
