"""Studies: one per page kind. Each bundles its declared inputs, one run and its headline numbers.

A study module defines::

    KIND = "rotor"                      # scenario kind and URL path
    TITLE = "Rotor sail on a ship"      # page title
    INPUTS = InputSpec(KIND, (...))     # every input, in core units
    SOURCES = ("Author (year) ...",)    # published sources of the models used
    CAUTIONS = ("...",)                 # safety cautions shown on the page and in the report
    def run(values: dict, progress=None, extra=None) -> StudyResult

``values`` is a complete, validated dict in core units (``INPUTS.validate`` makes one).
``progress``, when given, is called as ``progress(fraction, text)`` during long work.
``extra`` carries uploaded data (a CSV as a DataFrame) that is not a scalar input.

Optional, read with ``getattr`` by the report and the Compare options page::

    COMPARE_FIGURE = 0                  # the key chart to compare options by: an index into
                                        # result.figures, a title, or None for no chart; without
                                        # it the first chart that can be overlaid is used
    def figures_in_units(result, system) -> tuple   # the same (title, figure) pairs as
                                        # result.figures, with axes, hover and annotations in the
                                        # display units of ``system`` ("SI", "marine", "imperial")
    def tables_in_units(result, system) -> dict     # the tables to show people: converted to
                                        # ``system`` with the unit in each column name (see
                                        # :func:`table_in_units`); result.tables stay in core units

The dashboard pages, ``python -m liftcore run``, the comparison page and the report all go through
:func:`run_study`, so every number shown anywhere comes from the same call.
"""

from __future__ import annotations

import importlib
import threading
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field as dc_field, replace  # not `field`: that is a study kind
from typing import Any, Callable

from liftcore import units
from liftcore.units import format_number  # noqa: F401  (re-exported: pages, report, CLI)
from liftcore.validity import ModelWarning

#: kind -> module name under liftcore.studies, in page order.
STUDY_MODULES = {
    "flow": "flow",
    "field": "field",
    "rotor": "rotor",
    "voyage": "voyage",
    "flight": "flight",
}


@dataclass(frozen=True)
class Headline:
    """A number worth showing large: label, core-unit value, quantity kind for display."""

    key: str
    label: str
    value: float
    quantity: str = "ratio"
    digits: int = 3
    help: str = ""
    #: Below this size (in the display unit) the value is shown as 0 with ``resolution_note``:
    #: round-off of a check that should give 0, or a share too small to show.
    resolution: float = 0.0
    resolution_note: str = "agrees with 0 to round-off"
    #: Text after the number for quantities without a unit of their own (a currency: "EUR").
    unit: str = ""
    #: (low, high) in core units where the number has a stated spread, and what it spans.
    spread: tuple | None = None
    spread_note: str = "across the published data"

    def shown(self, system: str = "SI") -> tuple[float, str]:
        """(value, unit label) in ``system``."""
        if self.quantity in ("ratio", "money"):
            return self.value, self.unit
        label = units.unit_label(self.quantity, system)
        if self.quantity == "money_rate" and self.unit:
            label = f"{self.unit} {label}"
        return units.to_display(self.value, self.quantity, system), label

    def below_resolution(self, system: str = "SI") -> bool:
        v, _ = self.shown(system)
        return v == v and v is not None and 0 < abs(v) < self.resolution

    def text(self, system: str = "SI") -> str:
        v, u = self.shown(system)
        number = "0" if self.below_resolution(system) else format_number(v, self.digits)
        return units.with_unit(number, u)

    def spread_text(self, system: str = "SI") -> str:
        """The spread as a person says it ("380 to 560 t across the published data"), or ""."""
        if self.spread is None:
            return ""
        lo, hi = (replace(self, value=x, spread=None).text(system) for x in self.spread)
        return f"{lo} to {hi} {self.spread_note}"

    def note(self, system: str = "SI") -> str:
        """What to say under the number: ``resolution_note`` when it shows as 0, else nothing."""
        return self.resolution_note if self.below_resolution(system) else ""


#: Core-unit suffixes of column names, longest first (``surface_speed_m_s`` -> ``surface speed``).
_UNIT_SUFFIXES = ("_kg_m3", "_m2_s", "_m_s", "_n_m", "_knm", "_pct", "_deg", "_rpm", "_kw", "_kg",
                  "_pa", "_nm", "_m", "_n", "_w", "_j", "_s", "_h", "_k")


def column_label(column: str, kind: str = "ratio", system: str = "SI") -> str:
    """Plain words and the display unit of a core-unit column name:
    ``column_label("surface_speed_m_s", "speed", "imperial") == "surface speed [mph]"``."""
    base = column
    for suffix in _UNIT_SUFFIXES:
        if base.endswith(suffix) and len(base) > len(suffix):
            base = base[:-len(suffix)]
            break
    base = base.replace("_", " ")
    unit = "" if kind in ("ratio", "money") else units.unit_label(kind, system)
    return f"{base} [{unit}]" if unit else base


def table_in_units(df, quantities: dict, system: str = "SI"):
    """A copy of ``df`` with the columns named in ``quantities`` (column -> quantity kind, values
    in the kind's core unit) converted to ``system`` and renamed by :func:`column_label`
    (``"ratio"`` columns are only renamed). Other columns are left as they are."""
    out = df.copy()
    names = {}
    for col, kind in quantities.items():
        if col in out.columns:
            if kind not in ("ratio", "money"):
                out[col] = units.to_display(out[col].to_numpy(dtype=float), kind, system)
            names[col] = column_label(col, kind, system)
    return out.rename(columns=names)


def quantity_table(rows, system: str = "SI"):
    """A two-column table of named values (``quantity``, ``value``, ``unit``) in ``system`` from
    ``rows`` of (core-unit key, core value, quantity kind)."""
    import pandas as pd

    out = []
    for key, value, kind in rows:
        unit = "" if kind in ("ratio", "money") else units.unit_label(kind, system)
        out.append({"quantity": column_label(key), "value": float(units.to_display(value, kind, system)),
                    "unit": unit})
    return pd.DataFrame(out, columns=["quantity", "value", "unit"])


class Tables(Mapping):
    """A study's tables by name: pandas DataFrames, each built only when first looked at.

    Built from a dict of name -> DataFrame or zero-argument function, so a study whose tables
    are not asked for (a one-line command-line run) does not import pandas for them. Reads like
    the plain dict it stands for; ``tables[name]`` builds just that one.
    """

    def __init__(self, items=None):
        self._items = dict(items or {})
        self._lock = threading.Lock()

    def __getitem__(self, name):
        table = self._items[name]
        if callable(table):
            with self._lock:
                table = self._items[name]
                if callable(table):
                    table = table()
                    self._items[name] = table
        return table

    def __iter__(self):
        return iter(self._items)

    def __len__(self) -> int:
        return len(self._items)

    def __repr__(self) -> str:
        return f"Tables({list(self._items)})"


class Charts(Sequence):
    """A study's charts: (title, figure) pairs, each drawn only when first looked at.

    Built from (title, figure or zero-argument function) pairs. Iterating gives every pair
    (drawing them all); ``charts[title]`` or :meth:`figure` draws just that one, so a page shows
    one tab without paying for the charts of the others. ``title in charts`` asks by title.
    """

    def __init__(self, items=()):
        self._items = [(str(t), f) for t, f in items]
        self._lock = threading.Lock()

    def _draw(self, i: int):
        title, fig = self._items[i]
        if callable(fig):
            with self._lock:
                title, fig = self._items[i]
                if callable(fig):
                    fig = fig()
                    self._items[i] = (title, fig)
        return title, fig

    def __len__(self) -> int:
        return len(self._items)

    def __getitem__(self, i):
        if isinstance(i, str):
            return self.figure(i)
        if isinstance(i, slice):
            return Charts(self._draw(j) for j in range(*i.indices(len(self))))
        return self._draw(i if i >= 0 else len(self) + i)

    def __contains__(self, title) -> bool:
        return title in self.titles()

    def titles(self) -> tuple[str, ...]:
        return tuple(t for t, _ in self._items)

    def figure(self, title: str):
        """The chart called ``title`` (drawn now if it was not yet); ``KeyError`` if none."""
        for i, (t, _) in enumerate(self._items):
            if t == title:
                return self._draw(i)[1]
        raise KeyError(f"no chart {title!r}; have {', '.join(self.titles())}")

    def get(self, title: str, default=None):
        return self.figure(title) if title in self else default


@dataclass(frozen=True)
class StudyResult:
    """What one study run returns to every consumer (page, CLI, comparison, report).

    ``figures`` are (title, plotly Figure) pairs, each answering one question (a :class:`Charts`
    draws each only when it is looked at).
    ``tables`` are named pandas DataFrames (units in column names) for CSV export.
    ``detail`` is the topic module's own result dataclass for pages that need more.
    """

    kind: str
    inputs: dict
    headlines: tuple[Headline, ...]
    warnings: tuple[ModelWarning, ...] = ()
    figures: tuple = ()
    tables: dict = dc_field(default_factory=dict)
    detail: Any = None
    json: dict = dc_field(default_factory=dict)

    def headline(self, key: str) -> Headline:
        for h in self.headlines:
            if h.key == key:
                return h
        raise KeyError(key)


def study(kind: str):
    """The study module for ``kind``; unknown kinds list the valid ones."""
    if not isinstance(kind, str) or kind not in STUDY_MODULES:
        raise ValueError(f"unknown study kind {kind!r:.60}; valid: {', '.join(STUDY_MODULES)}")
    return importlib.import_module(f"liftcore.studies.{STUDY_MODULES[kind]}")


def run_study(kind: str, values: dict, progress: Callable | None = None, extra=None) -> StudyResult:
    """Validate ``values`` (missing keys take defaults) and run the study."""
    mod = study(kind)
    clean = mod.INPUTS.validate(values)
    return mod.run(clean, progress=progress, extra=extra)
