"""Results on a page: the one result cache, study runs with a progress bar, headline numbers with
their warnings, charts, tables, sources and cautions.

The cache
---------
:class:`ResultCache` is the page layer's only cache of computed things (study results, the
flight page's spread, charts in display units). It is shared by every session and keyed by a
hash of *everything* a value shows (every input, uploaded data with its file name, the unit
system), so sessions never see each other's inputs. Streamlit's own caches are not used for
these because they replay the elements drawn inside the cached function, and a progress bar
drawn outside it cannot be replayed (``CacheReplayClosureError``); a cache hit must show no bar.
"""

from __future__ import annotations

import hashlib
import threading
from collections import OrderedDict
from typing import Callable

import numpy as np
import pandas as pd
import streamlit as st

from liftcore import studies, units
from liftcore.studies import Charts, StudyResult, format_number, run_study
from liftcore.report import bold_html  # one helper serves page and handout
from liftcore.validity import ModelWarning
from liftcore.errors import InputError
from views.inputs import UNIT_LABELS, input_errors, stop_on_input_errors, unit_system


# ----------------------------------------------------------------------------- the cache
def content_key(*parts) -> str:
    """A hash of ``parts``: numbers, text, bytes, dicts, sequences, numpy arrays and DataFrames
    (values, index, column names and ``attrs`` such as an uploaded file's name)."""
    h = hashlib.sha256()

    def feed(x) -> None:
        if isinstance(x, pd.DataFrame):
            h.update(b"df")
            h.update(pd.util.hash_pandas_object(x, index=True).to_numpy().tobytes())
            feed(list(map(str, x.columns)))
            feed(dict(x.attrs))
        elif isinstance(x, np.ndarray):
            h.update(b"nd" + str(x.dtype).encode() + repr(x.shape).encode())
            h.update(np.ascontiguousarray(x).tobytes())
        elif isinstance(x, dict):
            h.update(b"{")
            for k in sorted(x, key=repr):
                feed(k)
                feed(x[k])
            h.update(b"}")
        elif isinstance(x, (list, tuple)):
            h.update(b"(")
            for item in x:
                feed(item)
            h.update(b")")
        elif isinstance(x, bytes):
            h.update(b"b" + len(x).to_bytes(8, "little") + x)
        else:
            h.update(type(x).__name__.encode() + b":" + repr(x).encode() + b";")
    for p in parts:
        feed(p)
    return h.hexdigest()


class ResultCache:
    """A thread-safe least-recently-used store of immutable results, at most ``size`` of them."""

    def __init__(self, size: int):
        self.size = size
        self._items: OrderedDict[str, object] = OrderedDict()
        self._lock = threading.Lock()

    def get(self, key: str):
        with self._lock:
            if key in self._items:
                self._items.move_to_end(key)
                return self._items[key]
        return None

    def put(self, key: str, value) -> None:
        with self._lock:
            self._items[key] = value
            self._items.move_to_end(key)
            while len(self._items) > self.size:
                self._items.popitem(last=False)

    def get_or_compute(self, key: str, compute: Callable, label: str | None = None):
        """The stored value of ``key``, else ``compute(progress)``'s, stored. With ``label`` a
        progress bar shows while it computes (``progress(fraction, text)``); a hit shows none."""
        hit = self.get(key)
        if hit is not None:
            return hit
        if label is None:
            value = compute(None)
        else:
            bar = st.progress(0.0, text=f"{label}…")

            def progress(fraction: float, text: str = "") -> None:
                bar.progress(min(max(float(fraction), 0.0), 1.0), text=text or f"{label}…")
            try:
                value = compute(progress)
            finally:
                bar.empty()
        self.put(key, value)
        return value


#: Everything the pages compute, shared by all sessions (see the module notes).
CACHE = ResultCache(96)


def cached(key_parts: tuple, compute: Callable, label: str | None = None):
    """``compute(progress)`` through the shared cache under a key made of ``key_parts``."""
    return CACHE.get_or_compute(content_key(*key_parts), compute, label)


# ----------------------------------------------------------------------------- running studies
def run_cached(kind: str, values: dict, extra=None, label: str = "Computing",
               check_inputs: bool = True) -> StudyResult:
    """Run a study through the shared cache, with a progress bar while it works.

    With ``check_inputs`` (the study's own page) it first stops the page with a clear message
    while any input of ``kind`` is out of range, so no stale result is ever shown.
    """
    if check_inputs:
        stop_on_input_errors(kind)
    return cached(("study", kind, values, extra),
                  lambda progress: run_study(kind, values, progress=progress, extra=extra), label)


def run_for_page(kind: str, values: dict, extra=None, label: str = "Computing"):
    """``(result, None)``, or ``(None, problem)`` while an input is out of range or the study
    refuses the inputs (one sentence naming the field). The page draws its tools with the
    problem (downloads wait) and then :func:`stop_for` it."""
    errors = input_errors(kind)
    if errors:
        return None, ("Some inputs are out of range, so no results are shown until they are fixed "
                      "(what you typed is kept):\n\n" + "\n".join(f"- {m}" for m in errors.values()))
    try:
        return run_cached(kind, values, extra=extra, label=label, check_inputs=False), None
    except InputError as exc:
        return None, str(exc)


def stop_for(problem: str, hint: str = "Your inputs are kept: change them in the sidebar.") -> None:
    """Say what stops the results, in the main area, and end the page run there."""
    st.error(problem, icon=":material/error:")
    if hint:
        st.caption(hint)
    st.stop()


def cached_result(kind: str, values: dict, extra=None) -> StudyResult:
    """The study result from the shared cache, computed without a progress bar if needed (for
    downloads made outside the page's script run)."""
    return cached(("study", kind, values, extra),
                  lambda progress: run_study(kind, values, extra=extra))


def study_figures(mod, result: StudyResult) -> Charts:
    """The study's charts in the current unit system (its ``figures_in_units`` hook when it has
    one), looked up by title; each chart is drawn only when a page shows it, once per result
    and unit system."""
    make = getattr(mod, "figures_in_units", None)
    system = unit_system()
    if not callable(make):
        charts = result.figures
    else:
        # keyed by the result object itself: the entry keeps it alive, so its id is never reused
        charts = cached(("figures", id(result), system), lambda progress: (result, make(result, system)))[1]
    return charts if isinstance(charts, Charts) else Charts(charts)


def study_tables(mod, result: StudyResult) -> dict:
    """The study's tables as people read them: its ``tables_in_units`` hook in the current unit
    system, else the core-unit tables."""
    make = getattr(mod, "tables_in_units", None)
    return make(result, unit_system()) if callable(make) else dict(result.tables)


def table_in_units(df: pd.DataFrame, quantities: dict) -> pd.DataFrame:
    """Convert the columns named in ``quantities`` (column -> kind) to the current unit system,
    renaming them with the display unit (``surface_speed_m_s`` -> ``surface speed [mph]``)."""
    return studies.table_in_units(df, quantities, unit_system())


# ----------------------------------------------------------------------------- showing results
def number_text(value: float, kind: str = "ratio", digits: int = 3) -> str:
    """A core value as text in the current unit system, with its unit."""
    return units.quantity_text(value, kind, unit_system(), digits)


def show_headlines(result: StudyResult, keys=None, columns: int = 4) -> None:
    """Big numbers, each with the warnings that qualify it directly beneath."""
    system = unit_system()
    heads = [h for h in result.headlines if keys is None or h.key in keys]
    for start in range(0, len(heads), columns):
        cols = st.columns(columns)
        for col, h in zip(cols, heads[start:start + columns]):
            with col:
                st.metric(h.label, h.text(system), help=h.help or None)
                if h.note(system):
                    st.caption(h.note(system))
                if h.spread_text(system):
                    st.caption(h.spread_text(system))
                for w in result.warnings:
                    if w.subject == h.key:
                        warning_box(w, small=True)


def show_warnings(warnings, subjects=None, title: str | None = None) -> None:
    """Warnings not tied to one headline (or all of ``subjects``), plainly stated."""
    ws = [w for w in warnings if subjects is None or w.subject in subjects]
    if title and ws:
        st.markdown(f"**{title}**")
    for w in ws:
        warning_box(w)


def warning_box(w: ModelWarning, small: bool = False) -> None:
    """One warning: a caption under a number (``small``) or a box of its own."""
    text = w.text(unit_system())
    if small:
        st.caption(f"⚠ {text}")
    elif w.severity == "invalid":
        st.error(text, icon=":material/block:")
    else:
        st.warning(text, icon=":material/warning:")


def general_warnings(result: StudyResult) -> list[ModelWarning]:
    """Warnings whose subject is not one of the headlines (shown in their own box)."""
    keys = {h.key for h in result.headlines}
    return [w for w in result.warnings if w.subject not in keys]


def show_figure(fig, key: str | None = None) -> None:
    # theme=None keeps the house style of liftcore.figures (large fonts, dark axes) instead of
    # Streamlit's own chart theme, which shrinks and greys the text on a shared screen.
    st.plotly_chart(fig, width="stretch", key=key, theme=None, config={"displaylogo": False})


def show_sources_and_cautions(study) -> None:
    """The published sources of the models and the safety cautions, at the foot of a page."""
    with st.expander("Sources of the models", expanded=False):
        for s in getattr(study, "SOURCES", ()):
            st.markdown(f"- {s}")
    for c in getattr(study, "CAUTIONS", ()):
        st.info(c, icon=":material/health_and_safety:")


def open_tab_only(tabs: dict, key: str) -> None:
    """Tabs (title -> function that draws it) of which only the open one is drawn, so a change
    pays only for what is on the screen (``st.tabs`` reruns the page when another is opened)."""
    for tab, draw in zip(st.tabs(list(tabs), key=key, on_change="rerun"), tabs.values()):
        if tab.open is not False:
            with tab:
                draw()




def units_caption() -> str:
    """One sentence saying which units the tables are in."""
    return (f"In the units chosen at the top of the sidebar ({UNIT_LABELS[unit_system()]}); the "
            "unit of each number is in its column name. Downloads hold the table as shown.")
