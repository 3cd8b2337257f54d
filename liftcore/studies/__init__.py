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

The dashboard pages, ``python -m liftcore run``, the comparison page and the report all go through
:func:`run_study`, so every number shown anywhere comes from the same call.
"""

from __future__ import annotations

import importlib
from dataclasses import dataclass, field as dc_field  # not `field`: that is a study kind
from typing import Any, Callable

from liftcore import units
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

    def shown(self, system: str = "SI") -> tuple[float, str]:
        """(value, unit label) in ``system``."""
        if self.quantity in ("ratio", "money"):
            return self.value, ""
        return units.to_display(self.value, self.quantity, system), units.unit_label(self.quantity, system)

    def text(self, system: str = "SI") -> str:
        v, u = self.shown(system)
        return f"{format_number(v, self.digits)}{(' ' + u) if u else ''}"


def format_number(v: float, digits: int = 3) -> str:
    """Readable number: thousands separators for large values, ``digits`` significant otherwise."""
    if v is None or v != v:
        return "–"
    if abs(v) >= 10 ** digits:
        return f"{v:,.0f}"
    return f"{v:.{digits}g}" if abs(v) >= 1e-3 or v == 0 else f"{v:.2e}"


@dataclass(frozen=True)
class StudyResult:
    """What one study run returns to every consumer (page, CLI, comparison, report).

    ``figures`` are (title, plotly Figure) pairs, each answering one question.
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
    if kind not in STUDY_MODULES:
        raise ValueError(f"unknown study kind {kind!r}; valid: {', '.join(STUDY_MODULES)}")
    return importlib.import_module(f"liftcore.studies.{STUDY_MODULES[kind]}")


def run_study(kind: str, values: dict, progress: Callable | None = None, extra=None) -> StudyResult:
    """Validate ``values`` (missing keys take defaults) and run the study."""
    mod = study(kind)
    clean = mod.INPUTS.validate(values)
    return mod.run(clean, progress=progress, extra=extra)
