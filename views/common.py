"""Page building blocks shared by every page: the unit switch, input widgets generated from a
study's :class:`~liftcore.inputs.InputSpec`, the cached study run with a progress bar, headline
numbers with their warnings, figures, sources and cautions.

Widget state: the value of every input is kept in core units under ``"{kind}:{key}"`` in
``st.session_state``. The widget itself has the key ``"w:{kind}:{key}:{unit system}"``, seeded from
the core value, so switching units shows the same quantity converted and loses nothing typed.
"""

from __future__ import annotations

import hashlib
import threading
from collections import OrderedDict

import pandas as pd
import streamlit as st

from liftcore import units
from liftcore.inputs import Field, InputSpec
from liftcore.studies import StudyResult, format_number, run_study
from liftcore.validity import ModelWarning

UNIT_KEY = "unit_system"
UNIT_LABELS = {"SI": "SI (m, m/s, N, kW)", "marine": "Marine (kn, kN, kW, t)",
               "imperial": "Imperial (ft, mph, lbf, °F)"}


# ----------------------------------------------------------------------------- chrome
def sidebar_chrome() -> None:
    """Unit system switch, shown on every page (rendered by app.py before the page)."""
    if UNIT_KEY not in st.session_state:
        st.session_state[UNIT_KEY] = "SI"
    st.sidebar.segmented_control("Units", list(units.UNIT_SYSTEMS), key=UNIT_KEY,
                                 format_func=lambda s: s, help="; ".join(UNIT_LABELS.values()),
                                 selection_mode="single")
    if st.session_state.get(UNIT_KEY) is None:  # a click on the selected option clears it
        st.session_state[UNIT_KEY] = "SI"


def unit_system() -> str:
    return st.session_state.get(UNIT_KEY) or "SI"


# ----------------------------------------------------------------------------- inputs
def state_key(kind: str, key: str) -> str:
    return f"{kind}:{key}"


def widget_key(kind: str, key: str, system: str) -> str:
    return f"w:{kind}:{key}:{system}"


def current_values(spec: InputSpec) -> dict:
    """Core-unit values of every input of ``spec`` as currently held in the session."""
    return {f.key: st.session_state.get(state_key(spec.kind, f.key), f.default) for f in spec.fields}


def set_values(spec: InputSpec, values: dict) -> None:
    """Replace the session's inputs (e.g. from a scenario file); widgets are re-seeded."""
    for f in spec.fields:
        if f.key in values:
            st.session_state[state_key(spec.kind, f.key)] = values[f.key]
        for system in units.UNIT_SYSTEMS:
            st.session_state.pop(widget_key(spec.kind, f.key, system), None)


def _display_bounds(f: Field, system: str):
    lo = None if f.low is None else units.to_display(f.low, f.quantity, system)
    hi = None if f.high is None else units.to_display(f.high, f.quantity, system)
    return lo, hi


def _clamp(x, lo, hi):
    if lo is not None and x < lo:
        x = lo
    if hi is not None and x > hi:
        x = hi
    return x


def input_widget(spec: InputSpec, f: Field, container=None, label: str | None = None):
    """Render one input in the current unit system and return its value in core units."""
    c = container or st
    system = unit_system()
    wkey = widget_key(spec.kind, f.key, system)
    skey = state_key(spec.kind, f.key)
    core_value = st.session_state.get(skey, f.default)
    unit = f.unit(system)
    text = label or (f"{f.label} [{unit}]" if unit else f.label)
    if f.kind in ("number", "int"):
        lo, hi = _display_bounds(f, system)
        if wkey not in st.session_state:
            shown = units.to_display(core_value, f.quantity, system) if f.kind == "number" else core_value
            shown = _clamp(float(f"{shown:.8g}"), lo, hi)
            st.session_state[wkey] = int(shown) if f.kind == "int" else float(shown)
        if f.kind == "int":
            v = c.number_input(text, min_value=None if lo is None else int(lo),
                               max_value=None if hi is None else int(hi), step=1, key=wkey,
                               help=f.help or None)
            st.session_state[skey] = int(v)
        else:
            step = f.step if f.step is not None else _auto_step(st.session_state[wkey])
            v = c.number_input(text, min_value=lo, max_value=hi, step=step, key=wkey,
                               help=f.help or None, format=_auto_format(step))
            st.session_state[skey] = float(units.from_display(v, f.quantity, system))
    elif f.kind == "choice":
        if wkey not in st.session_state:
            st.session_state[wkey] = core_value if core_value in f.choices else f.default
        v = c.selectbox(text, f.choices, key=wkey, format_func=f.choice_label, help=f.help or None)
        st.session_state[skey] = v
    elif f.kind == "bool":
        if wkey not in st.session_state:
            st.session_state[wkey] = bool(core_value)
        v = c.toggle(text, key=wkey, help=f.help or None)
        st.session_state[skey] = bool(v)
    else:
        if wkey not in st.session_state:
            st.session_state[wkey] = str(core_value)
        v = c.text_input(text, key=wkey, help=f.help or None)
        st.session_state[skey] = v
    return st.session_state[skey]


def _auto_step(x: float) -> float:
    x = abs(float(x))
    if x == 0:
        return 0.1
    mag = 10 ** (len(str(int(x))) - 2) if x >= 10 else (1.0 if x >= 1 else 0.01)
    return float(max(mag, 0.001))


def _auto_format(step: float) -> str:
    if step >= 1:
        return "%.0f" if step == int(step) else "%.2f"
    if step >= 0.1:
        return "%.2f"
    if step >= 0.01:
        return "%.3f"
    return "%.4g"


def render_inputs(spec: InputSpec, container=None, skip=(), show_if=None) -> dict:
    """Render every input of ``spec`` grouped in expanders by section; return core-unit values.

    ``skip`` lists keys the page renders itself. ``show_if`` maps a key to a predicate on the
    current values deciding whether the widget is shown (hidden inputs keep their value).
    """
    c = container or st.sidebar
    values = current_values(spec)

    def visible(f: Field) -> bool:
        return show_if is None or f.key not in show_if or bool(show_if[f.key](values))

    for section, fields in spec.sections():
        fields = [f for f in fields if f.key not in skip]
        shown = [f for f in fields if visible(f)]
        if not shown:
            continue
        with c.expander(section, expanded=not any(f.advanced for f in shown)):
            for f in fields:
                # decided again here: a choice just above in this section may have changed `values`
                if visible(f):
                    values[f.key] = input_widget(spec, f)
    return values


# ----------------------------------------------------------------------------- running
_CACHE: "OrderedDict[str, StudyResult]" = OrderedDict()
_CACHE_LOCK = threading.Lock()
_CACHE_SIZE = 64


def _cache_key(kind: str, values: dict, extra) -> str:
    h = hashlib.sha256(kind.encode())
    h.update(repr(sorted(values.items())).encode())
    if extra is not None:
        if isinstance(extra, pd.DataFrame):
            h.update(pd.util.hash_pandas_object(extra, index=True).values.tobytes())
            h.update(repr(list(extra.columns)).encode())
        else:
            h.update(repr(extra).encode())
    return h.hexdigest()


def run_cached(kind: str, values: dict, extra=None, label: str = "Computing") -> StudyResult:
    """Run a study through the shared result cache, with a progress bar while it works.

    Results are immutable and keyed by every input, so sessions never see each other's inputs.
    """
    key = _cache_key(kind, values, extra)
    with _CACHE_LOCK:
        if key in _CACHE:
            _CACHE.move_to_end(key)
            return _CACHE[key]
    bar = st.progress(0.0, text=f"{label}…")

    def progress(fraction: float, text: str = "") -> None:
        bar.progress(min(max(float(fraction), 0.0), 1.0), text=text or f"{label}…")

    try:
        result = run_study(kind, values, progress=progress, extra=extra)
    finally:
        bar.empty()
    with _CACHE_LOCK:
        _CACHE[key] = result
        while len(_CACHE) > _CACHE_SIZE:
            _CACHE.popitem(last=False)
    return result


# ----------------------------------------------------------------------------- results
def show_headlines(result: StudyResult, keys=None, columns: int = 4) -> None:
    """Big numbers, each with the warnings that qualify it directly beneath."""
    system = unit_system()
    heads = [h for h in result.headlines if keys is None or h.key in keys]
    for start in range(0, len(heads), columns):
        cols = st.columns(columns)
        for col, h in zip(cols, heads[start:start + columns]):
            with col:
                st.metric(h.label, h.text(system), help=h.help or None)
                for w in result.warnings:
                    if w.subject == h.key:
                        _warning_box(w, small=True)


def show_warnings(warnings, subjects=None, title: str | None = None) -> None:
    """Warnings not tied to one headline (or all of ``subjects``), plainly stated."""
    ws = [w for w in warnings if subjects is None or w.subject in subjects]
    if title and ws:
        st.markdown(f"**{title}**")
    for w in ws:
        _warning_box(w)


def _warning_box(w: ModelWarning, small: bool = False) -> None:
    icon = ":material/block:" if w.severity == "invalid" else ":material/warning:"
    if small:
        st.caption(f"⚠ {w.message}")
    elif w.severity == "invalid":
        st.error(w.message, icon=icon)
    else:
        st.warning(w.message, icon=icon)


def general_warnings(result: StudyResult) -> list[ModelWarning]:
    """Warnings whose subject is not one of the headlines (shown in their own box)."""
    keys = {h.key for h in result.headlines}
    return [w for w in result.warnings if w.subject not in keys]


def show_figure(fig, key: str | None = None) -> None:
    st.plotly_chart(fig, width="stretch", key=key, config={"displaylogo": False})


def show_sources_and_cautions(study) -> None:
    """The published sources of the models and the safety cautions, at the foot of a page."""
    with st.expander("Sources of the models", expanded=False):
        for s in getattr(study, "SOURCES", ()):
            st.markdown(f"- {s}")
    for c in getattr(study, "CAUTIONS", ()):
        st.info(c, icon=":material/health_and_safety:")


def table_in_units(df: pd.DataFrame, quantities: dict) -> pd.DataFrame:
    """Convert the columns named in ``quantities`` (column -> kind) to the current unit system,
    renaming them with the display unit."""
    system = unit_system()
    out = df.copy()
    ren = {}
    for col, kind in quantities.items():
        if col in out:
            out[col] = units.to_display(out[col].to_numpy(), kind, system)
            ren[col] = f"{col.rsplit('_', 1)[0] if '_' in col else col} [{units.unit_label(kind, system)}]"
    return out.rename(columns=ren)


def number_text(value: float, kind: str = "ratio", digits: int = 3) -> str:
    """A core value as text in the current unit system, with its unit."""
    system = unit_system()
    if kind in ("ratio", "money"):
        return format_number(value, digits)
    return f"{format_number(units.to_display(value, kind, system), digits)} {units.unit_label(kind, system)}"
