"""Page building blocks shared by every page: the unit switch, input widgets generated from a
study's :class:`~liftcore.inputs.InputSpec`, the cached study run with a progress bar, headline
numbers with their warnings, figures, sources and cautions.

Widget state: the value of every input is kept in core units under ``"{kind}:{key}"`` in
``st.session_state``. The widget itself has the key ``"w:{kind}:{key}:{unit system}"``, seeded from
the core value, so switching units shows the same quantity converted and loses nothing typed.
A widget left as it was seeded does not write back, so switching units never nudges a value.

Scenario files, share links, kept options and the handout report go through
:func:`page_tools` (one call per page) and the helpers below it; the Compare options page
reads the kept options with :func:`kept_options`.
"""

from __future__ import annotations

import hashlib
import math
import threading
import urllib.parse
from collections import OrderedDict

import pandas as pd
import streamlit as st

from liftcore import studies, units
from liftcore.errors import InputError
from liftcore.inputs import Field, InputSpec
from liftcore.studies import StudyResult, format_number, run_study, study
from liftcore.validity import ModelWarning

UNIT_KEY = "unit_system"
#: session keys of the scenario / share-link / options machinery (all prefixed ``_lc:``)
PENDING_UNITS = "_lc:pending_units"
TOOLS_BOX = "_lc:tools_box"
OPTIONS_KEY = "_lc:options"
UNIT_LABELS = {"SI": "SI (m, m/s, N, kW)", "marine": "Marine (kn, kN, kW, t)",
               "imperial": "Imperial (ft, mph, lbf, °F)"}


# ----------------------------------------------------------------------------- chrome
def sidebar_chrome() -> None:
    """Unit system switch, shown on every page (rendered by app.py before the page)."""
    pending = st.session_state.pop(PENDING_UNITS, None)
    if pending in units.UNIT_SYSTEMS:  # set by a scenario or a share link before this run
        st.session_state[UNIT_KEY] = pending
    if UNIT_KEY not in st.session_state:
        st.session_state[UNIT_KEY] = "SI"
    st.sidebar.segmented_control("Units", list(units.UNIT_SYSTEMS), key=UNIT_KEY,
                                 format_func=lambda s: s, help="; ".join(UNIT_LABELS.values()),
                                 selection_mode="single")
    if st.session_state.get(UNIT_KEY) is None:  # a click on the selected option clears it
        st.session_state[UNIT_KEY] = "SI"
    # page_tools draws into this box, so saving, sharing and keeping sit just under the units
    st.session_state[TOOLS_BOX] = st.sidebar.container()


def unit_system() -> str:
    return st.session_state.get(UNIT_KEY) or "SI"


# ----------------------------------------------------------------------------- inputs
def state_key(kind: str, key: str) -> str:
    return f"{kind}:{key}"


def widget_key(kind: str, key: str, system: str) -> str:
    return f"w:{kind}:{key}:{system}"


def current_values(spec: InputSpec) -> dict:
    """Core-unit values of every input of ``spec`` as currently held in the session."""
    _prepare(spec)
    return {f.key: st.session_state.get(state_key(spec.kind, f.key), f.default) for f in spec.fields}


def set_values(spec: InputSpec, values: dict) -> None:
    """Replace the session's inputs (e.g. from a scenario file); widgets are re-seeded."""
    for f in spec.fields:
        if f.key in values:
            st.session_state[state_key(spec.kind, f.key)] = values[f.key]
        prefix = widget_key(spec.kind, f.key, "")  # every widget of this input, in any system
        for k in [k for k in st.session_state if isinstance(k, str) and k.startswith(prefix)]:
            del st.session_state[k]
        for system in units.UNIT_SYSTEMS:
            st.session_state.pop(_seed_key(widget_key(spec.kind, f.key, system)), None)


def _seed_key(wkey: str) -> str:
    return f"_lc:seed:{wkey}"


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
    _prepare(spec)
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
            shown = _clamp(_tidy(shown), lo, hi)  # the core value stays exact unless edited
            shown = int(shown) if f.kind == "int" else float(shown)
            st.session_state[wkey] = shown
            st.session_state[_seed_key(wkey)] = shown
        # No min/max on the widget: an out-of-range entry stays in the box as typed, and a
        # message under it names the field, the value and the allowed range (the results wait).
        if f.kind == "int":
            v = c.number_input(text, step=1, key=wkey, help=f.help or None)
        else:
            step = f.step if f.step is not None else _auto_step(f, system)
            v = c.number_input(text, step=step, key=wkey, help=f.help or None, format=NUMBER_FORMAT)
        candidate = int(v) if f.kind == "int" else float(units.from_display(v, f.quantity, system))
        try:
            f.validate(candidate, system)
        except InputError as exc:
            c.error(str(exc), icon=":material/error:")
            _input_errors(spec.kind)[f.key] = str(exc)
            return st.session_state.get(skey, f.default)
        _input_errors(spec.kind).pop(f.key, None)
        # a widget still showing its seed keeps the exact core value (no drift on unit switches)
        if st.session_state.get(_seed_key(wkey)) != v:
            st.session_state[skey] = candidate
        elif skey not in st.session_state:
            st.session_state[skey] = core_value
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


def _input_errors(kind: str) -> dict:
    """This session's inputs of ``kind`` that are out of range now: key -> message."""
    return st.session_state.setdefault(f"_lc:input_errors:{kind}", {})


def forget_input_error(kind: str, key: str) -> None:
    """A hidden input keeps its last valid value; its old message no longer applies."""
    _input_errors(kind).pop(key, None)


def stop_on_input_errors(kind: str) -> None:
    """Show what is out of range in the main area and stop before computing stale results."""
    errors = _input_errors(kind)
    if errors:
        st.error("Some inputs are out of range, so no results are shown until they are fixed "
                 "(what you typed is kept):\n\n" + "\n".join(f"- {m}" for m in errors.values()),
                 icon=":material/error:")
        st.stop()


def _tidy(x: float) -> float:
    """The shortest number (at most 6 significant digits) within 1e-5 of ``x`` relatively, so a
    converted 6.1733 m/s shows as 12 kn, not 11.9999 kn."""
    x = float(x)
    for digits in range(1, 7):
        y = float(f"{x:.{digits}g}")
        if abs(y - x) <= 1e-5 * abs(x):
            return y
    return float(f"{x:.6g}")


#: How number inputs show their value: up to 7 significant digits, no padding zeros, nothing hidden.
NUMBER_FORMAT = "%.7g"


def _auto_step(f: Field, system: str) -> float:
    """The +/- step of a number input without its own step: the power of ten nearest a hundredth
    of the field's default in the display unit (1013.25 hPa -> 10, 15.55 kn -> 0.1, 0.011 ->
    0.0001), or 1 for a default of 0. Taken from the default, not the value shown, so the step
    does not shrink as a value is stepped down toward zero."""
    d = abs(float(units.to_display(f.default, f.quantity, system)))
    if d == 0 or not math.isfinite(d):
        return 1.0
    return float(10.0 ** round(math.log10(d / 100.0)))


#: Which air-state inputs to show (``render_inputs(show_if=...)``): the altitude for the standard
#: atmosphere, temperature and pressure for measured air. Pages add their own rules to a copy.
AIR_SHOW_IF = {
    "altitude_m": lambda v: v["air_mode"] == "isa",
    "temperature_k": lambda v: v["air_mode"] == "measured",
    "pressure_pa": lambda v: v["air_mode"] == "measured",
}


def air_show_if(when=None) -> dict:
    """:data:`AIR_SHOW_IF`, or, with a precondition ``when(values)`` (e.g. the field page's "the
    fluid is air"), every air input (the mode and humidity too) shown only when it holds."""
    if when is None:
        return dict(AIR_SHOW_IF)
    rules = {key: (lambda v, rule=rule: bool(when(v)) and rule(v)) for key, rule in AIR_SHOW_IF.items()}
    rules["air_mode"] = when
    rules["relative_humidity_pct"] = when
    return rules


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
                else:
                    forget_input_error(spec.kind, f.key)
    for section, fields in spec.sections():
        for f in fields:
            if f.key not in skip and not visible(f):
                forget_input_error(spec.kind, f.key)
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


def run_cached(kind: str, values: dict, extra=None, label: str = "Computing",
               check_inputs: bool = True) -> StudyResult:
    """Run a study through the shared result cache, with a progress bar while it works.

    Results are immutable and keyed by every input, so sessions never see each other's inputs.
    With ``check_inputs`` (the study's own page) it stops the page with a clear message while any
    input of ``kind`` typed on that page is out of range.
    """
    if check_inputs:
        stop_on_input_errors(kind)
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


def table_in_units(df: pd.DataFrame, quantities: dict) -> pd.DataFrame:
    """Convert the columns named in ``quantities`` (column -> kind) to the current unit system,
    renaming them with the display unit (``surface_speed_m_s`` -> ``surface speed [mph]``)."""
    return studies.table_in_units(df, quantities, unit_system())


def study_tables(mod, result: StudyResult) -> dict:
    """The study's tables as people should read them: its ``tables_in_units`` hook in the current
    unit system, else the core-unit tables."""
    make = getattr(mod, "tables_in_units", None)
    return make(result, unit_system()) if callable(make) else dict(result.tables)


def study_figures(mod, result: StudyResult) -> dict:
    """The study's charts (title -> figure) in the current unit system, through its
    ``figures_in_units`` hook when it has one."""
    make = getattr(mod, "figures_in_units", None)
    system = unit_system()
    return dict(make(result, system) if callable(make) else result.figures)


def number_text(value: float, kind: str = "ratio", digits: int = 3) -> str:
    """A core value as text in the current unit system, with its unit."""
    system = unit_system()
    if kind in ("ratio", "money"):
        return format_number(value, digits)
    return f"{format_number(units.to_display(value, kind, system), digits)} {units.unit_label(kind, system)}"


# ============================================================================= scenarios, links, options
# Everything below keeps one session's state under "_lc:..." keys; nothing is shared between
# sessions except the immutable result cache above.
def _k(name: str, kind: str = "") -> str:
    return f"_lc:{name}:{kind}" if kind else f"_lc:{name}"


def _spec(kind_or_spec) -> InputSpec:
    if isinstance(kind_or_spec, InputSpec):
        return kind_or_spec
    if isinstance(kind_or_spec, str):
        return study(kind_or_spec).INPUTS
    return kind_or_spec.INPUTS  # a study module


def flash(kind: str, level: str, message: str) -> None:
    """Queue a message for the page's tools box (shown once, on the next draw)."""
    st.session_state.setdefault(_k("flash", kind), []).append((level, message))


def request_load(kind: str, values: dict, *, title: str | None = None, note: str | None = None,
                 unit_system: str | None = None, message: str = "") -> None:
    """Ask the page of ``kind`` to take these inputs before it draws its widgets (next run)."""
    st.session_state[_k("pending", kind)] = {"values": dict(values), "title": title, "note": note,
                                             "message": message}
    if unit_system in units.UNIT_SYSTEMS:
        st.session_state[PENDING_UNITS] = unit_system


def _prepare(spec: InputSpec) -> None:
    """Apply a pending scenario load and a new share link before the page's widgets are drawn.

    Cheap and idempotent: called from every input helper, does its work once per event.
    """
    kind = spec.kind
    pending = st.session_state.pop(_k("pending", kind), None)
    if pending is not None:
        set_values(spec, pending["values"])
        if pending.get("title") is not None:
            _set_text(kind, "title", pending["title"])
        if pending.get("note") is not None:
            _set_text(kind, "note", pending["note"])
        if pending.get("message"):
            flash(kind, "success", pending["message"])
    _intake_link(spec)
    if st.session_state.get(PENDING_UNITS) not in (None, unit_system()):
        st.rerun()  # the unit switch is drawn before the page: take the new units from the top


def _query_params() -> dict:
    try:
        return st.query_params.to_dict()
    except Exception:  # outside a script run (unit tests of helpers)
        return {}


def _intake_link(spec: InputSpec) -> None:
    from liftcore.scenario import is_link, values_from_link
    from liftcore.studies import STUDY_MODULES

    kind = spec.kind
    if kind not in STUDY_MODULES:  # a page's helper inputs (not a study): not in links or files
        return
    params = _query_params()
    if not is_link(params) or st.session_state.get(_k("link_seen", kind)) == params:
        return
    st.session_state[_k("link_seen", kind)] = params
    try:
        values, system = values_from_link(kind, params)
    except InputError as exc:
        set_values(spec, spec.defaults())
        flash(kind, "error", f"This link could not be used: {exc}. The page shows the defaults instead.")
        return
    set_values(spec, values)
    n = sum(1 for k in params if k in spec.keys)
    differ = ("every input at its default" if n == 0 else
              f"{n} input differs from the defaults" if n == 1 else f"{n} inputs differ from the defaults")
    flash(kind, "success", f"Opened from a share link ({differ}).")
    if system != unit_system():
        st.session_state[PENDING_UNITS] = system


def _sync_link(spec: InputSpec, values: dict) -> tuple[dict, list]:
    """Write the share link of the current inputs into the page URL (only when it changed)."""
    from liftcore.scenario import LINK_MARKER, link_params

    params, omitted = link_params(spec.kind, values, unit_system())
    if set(params) == {LINK_MARKER}:  # nothing differs from the defaults: a clean address
        params = {}
    if _query_params() != params:
        try:
            st.query_params.from_dict(params)
        except Exception:
            pass
    st.session_state[_k("link_seen", spec.kind)] = params
    return params, omitted


def share_url(kind: str, params: dict) -> str:
    """The full share link of ``params`` on the page of ``kind`` (host from the browser)."""
    from views import PAGES

    path = next((u for f, _, u, _ in PAGES if f == f"views/{kind}.py"), kind)
    base = ""
    try:
        base = _app_root(st.context.url or "", {u for _, _, u, _ in PAGES})
    except Exception:
        pass
    query = urllib.parse.urlencode(params)
    return f"{base}/{path}" + (f"?{query}" if query else "")


def _app_root(url: str, page_paths: set) -> str:
    """The app's own address without the page path and query (``st.context.url`` is the address
    of the page being shown: ``http://host:8501/rotor``, or under a base path ``.../lc/rotor``)."""
    parts = urllib.parse.urlsplit(url)
    segments = [seg for seg in parts.path.split("/") if seg]
    if segments and segments[-1] in page_paths:
        segments = segments[:-1]
    root = f"{parts.scheme}://{parts.netloc}" if parts.scheme and parts.netloc else ""
    return root + ("/" + "/".join(segments) if segments else "")


def _text_state(kind: str, name: str, default: str = "") -> str:
    return st.session_state.get(_k(name, kind), default)


def _set_text(kind: str, name: str, value: str) -> None:
    st.session_state[_k(name, kind)] = value
    st.session_state.pop(_k("w" + name, kind), None)


def _text_widget(c, kind: str, name: str, label: str, default: str, area: bool = False, **kw) -> str:
    wkey = _k("w" + name, kind)
    if wkey not in st.session_state:
        st.session_state[wkey] = _text_state(kind, name, default)
    v = (c.text_area if area else c.text_input)(label, key=wkey, **kw)
    st.session_state[_k(name, kind)] = v
    return v


# ----------------------------------------------------------------------------- results outside the page run
def cached_result(kind: str, values: dict, extra=None) -> StudyResult:
    """The study result from the shared cache, computing it without a progress bar if needed
    (for downloads built outside the page's script run)."""
    key = _cache_key(kind, values, extra)
    with _CACHE_LOCK:
        if key in _CACHE:
            return _CACHE[key]
    result = run_study(kind, values, extra=extra)
    with _CACHE_LOCK:
        _CACHE[key] = result
        while len(_CACHE) > _CACHE_SIZE:
            _CACHE.popitem(last=False)
    return result


def _error_page(message: str) -> str:
    import html as _html

    return ("<!DOCTYPE html><html lang=\"en\"><meta charset=\"utf-8\"><title>Report not made</title>"
            f"<body><h1>The report could not be made</h1><p>{_html.escape(message)}</p></body></html>")


def _report_maker(kind, values, extra, system, title, note, data_note):
    from liftcore.report import scenario_report
    from liftcore.scenario import Scenario

    def make() -> str:
        try:
            result = cached_result(kind, values, extra)
            return scenario_report(Scenario(kind=kind, inputs=values, title=title, note=note,
                                            unit_system=system), result, system, data_note=data_note)
        except Exception as exc:  # a download must never fail silently
            return _error_page(f"{type(exc).__name__}: {exc}")
    return make


def _csv_maker(kind, values, extra, system, title, note):
    from liftcore.report import scenario_csv
    from liftcore.scenario import Scenario

    def make() -> str:
        try:
            result = cached_result(kind, values, extra)
            return scenario_csv(Scenario(kind=kind, inputs=values, title=title, note=note,
                                         unit_system=system), result, system)
        except Exception as exc:
            return f"error,{type(exc).__name__}: {exc}\n"
    return make


def file_stem(text: str, fallback: str = "liftcore") -> str:
    """A safe file name stem from a title: letters, digits and dashes."""
    out = "".join(ch.lower() if ch.isalnum() else "-" for ch in text).strip("-")
    while "--" in out:
        out = out.replace("--", "-")
    return (out or fallback)[:60]


# ----------------------------------------------------------------------------- uploads
def read_upload(upload, kind: str | None = None):
    """Parse an uploaded scenario or comparison file; returns the document or ``None`` after
    flashing a one-line error. Oversized files are refused before they are read."""
    from liftcore.scenario import MAX_SCENARIO_BYTES, parse_document

    key = kind or "compare"
    size = getattr(upload, "size", None)
    if size is not None and size > MAX_SCENARIO_BYTES:
        flash(key, "error", f"{upload.name} is {size} bytes; scenario files must be at most "
                            f"{MAX_SCENARIO_BYTES} bytes")
        return None
    try:
        data = upload.read(MAX_SCENARIO_BYTES + 1)
        return parse_document(data, upload.name)
    except InputError as exc:
        flash(key, "error", str(exc))
        return None


def _upload_box(c, kind: str, label: str, help_text: str):
    """A file uploader that hands each new file over once, then resets itself."""
    from liftcore.scenario import MAX_SCENARIO_BYTES

    n = st.session_state.get(_k("upload_n", kind), 0)
    up = c.file_uploader(label, type=["toml"], key=_k(f"upload{n}", kind), help=help_text,
                         max_upload_size=max(1, MAX_SCENARIO_BYTES // 1_000_000))
    if up is None or st.session_state.get(_k("upload_seen", kind)) == up.file_id:
        return None
    st.session_state[_k("upload_seen", kind)] = up.file_id
    return up


def _reset_upload(kind: str) -> None:
    st.session_state[_k("upload_n", kind)] = st.session_state.get(_k("upload_n", kind), 0) + 1


# ----------------------------------------------------------------------------- kept options
def kept_options() -> list[dict]:
    """Options kept in this session: dicts with name, kind, inputs (core units), note, extra."""
    return st.session_state.setdefault(OPTIONS_KEY, [])


def keep_option(kind: str, name: str, values: dict, note: str = "", extra=None) -> str:
    """Keep ``values`` as a named option; a name already kept for this kind is replaced.

    Raises :class:`InputError` for an empty or too long name, or when four options are kept.
    """
    from liftcore.scenario import MAX_OPTION_NAME_CHARS, MAX_OPTIONS

    name = (name or "").strip()
    if not name:
        raise InputError("option name", "option name must not be empty")
    if len(name) > MAX_OPTION_NAME_CHARS:
        raise InputError("option name", f"option name must be at most {MAX_OPTION_NAME_CHARS} "
                                        f"characters (got {len(name)})")
    opts = kept_options()
    entry = {"name": name, "kind": kind, "inputs": dict(values), "note": note, "extra": extra}
    for i, o in enumerate(opts):
        if o["kind"] == kind and o["name"] == name:
            opts[i] = entry
            return f"Replaced option “{name}”."
    if len(opts) >= MAX_OPTIONS:
        raise InputError("options", f"{MAX_OPTIONS} options are kept already; remove one on the "
                                    "Compare options page first")
    opts.append(entry)
    return f"Kept “{name}” as option {len(opts)} of {MAX_OPTIONS}."


def remove_option(index: int) -> None:
    opts = kept_options()
    if 0 <= index < len(opts):
        opts.pop(index)


def _next_option_name(kind: str) -> str:
    names = {o["name"] for o in kept_options()}
    i = 1
    while f"Option {i}" in names:
        i += 1
    return f"Option {i}"


def _keep_callback(kind: str, values: dict, extra, name_key: str) -> None:
    try:
        msg = keep_option(kind, st.session_state.get(name_key, ""), values, extra=extra)
    except InputError as exc:
        flash(kind, "error", str(exc))
        return
    flash(kind, "success", msg + " See them side by side on the Compare options page.")
    st.session_state.pop(name_key, None)


def _reset_callback(kind: str) -> None:
    spec = _spec(kind)
    set_values(spec, spec.defaults())
    flash(kind, "success", "All inputs are back at their defaults.")


# ----------------------------------------------------------------------------- the page tools
def page_tools(kind_or_spec, extra=None, data_note: str = "", container=None) -> None:
    """Save, load, share, keep and report: the one call each study page makes after its inputs.

    Draws (under the unit switch in the sidebar): keep as option, handout report download, and an
    expander with the scenario file download and upload, the numbers as CSV, the share link and a
    reset. Keeps the page URL equal to the share link of the current inputs. ``extra`` is the
    page's uploaded data (passed to the study for the report; not stored in files or links).
    """
    from liftcore.scenario import Comparison, Scenario, scenario_to_toml

    spec = _spec(kind_or_spec)
    kind = spec.kind
    mod = study(kind)
    _prepare(spec)
    box = container or st.session_state.pop(TOOLS_BOX, None) or st.sidebar
    values = current_values(spec)
    system = unit_system()

    with box:
        for level, msg in st.session_state.pop(_k("flash", kind), []):
            (st.error if level == "error" else st.warning if level == "warning" else st.success)(msg)
        name_key = _k("option_name", kind)
        with st.popover("Keep as option", icon=":material/bookmark_add:", width="stretch",
                        help="Store these inputs under a name and compare up to four options "
                             "on the Compare options page"):
            if name_key not in st.session_state:
                st.session_state[name_key] = _next_option_name(kind)
            st.text_input("Option name", key=name_key, max_chars=60)
            st.button("Keep", key=_k("keep", kind), type="primary", on_click=_keep_callback,
                      args=(kind, dict(values), extra, name_key))
            n = len(kept_options())
            st.caption(f"{n} of 4 options kept.")
            page_link("views/compare.py", "Compare options", ":material/compare:")
        title = _text_state(kind, "title", mod.TITLE)
        note = _text_state(kind, "note", "")
        stem = file_stem(title, kind)
        st.download_button("Handout report", data=_report_maker(kind, values, extra, system, title, note, data_note),
                           file_name=f"{stem}.html", mime="text/html", icon=":material/description:",
                           key=_k("report", kind), width="stretch", on_click="ignore",
                           help="A handout (HTML, opens offline, prints to PDF) with inputs, results, "
                                "charts, warnings, sources and cautions")
        with st.expander("Save, load, share", icon=":material/folder_open:"):
            title = _text_widget(st, kind, "title", "Title", mod.TITLE, max_chars=200,
                                 help="Used for the scenario file, the report and its file names")
            note = _text_widget(st, kind, "note", "Note", "", area=True, max_chars=5000, height=80)
            scenario = Scenario(kind=kind, inputs=values, title=title, note=note, unit_system=system)
            st.download_button("Save scenario (.toml)", data=scenario_to_toml(scenario),
                               file_name=f"{file_stem(title, kind)}.toml", mime="application/toml",
                               icon=":material/download:", key=_k("save", kind), on_click="ignore",
                               width="stretch")
            st.download_button("Numbers (.csv)", data=_csv_maker(kind, values, extra, system, title, note),
                               file_name=f"{file_stem(title, kind)}.csv", mime="text/csv",
                               icon=":material/table:", key=_k("csv", kind), on_click="ignore",
                               width="stretch")
            up = _upload_box(st, kind, "Load a scenario file (.toml)",
                             "A file saved from this page (or any liftcore scenario of this kind). "
                             "Inputs it does not set take their defaults.")
            if up is not None:
                doc = read_upload(up, kind)
                if isinstance(doc, Comparison):
                    _load_comparison(doc)
                    flash(kind, "success", f"{up.name} is a comparison: its {len(doc.options)} options "
                                           "are kept for the Compare options page.")
                    _reset_upload(kind)
                    st.rerun()
                elif doc is not None and doc.kind != kind:
                    flash(kind, "error", f"{up.name} is a {doc.kind} scenario; load it on the "
                                         f"“{study(doc.kind).TITLE}” page")
                    st.rerun()
                elif doc is not None:
                    migrated = (f" (a schema_version {doc.migrated_from} file, read and updated)"
                                if doc.migrated_from else "")
                    request_load(kind, doc.inputs, title=doc.title or mod.TITLE, note=doc.note,
                                 unit_system=doc.unit_system,
                                 message=f"Loaded {up.name}{migrated}.")
                    _reset_upload(kind)
                    st.rerun()
                else:
                    st.rerun()  # show the error above; the inputs stay as they were
            params, omitted = _sync_link(spec, values)
            st.markdown("**Share link** (opens these inputs):")
            st.code(share_url(kind, params), language=None, wrap_lines=True)
            if omitted:
                st.caption("Not in the link (too long): " + ", ".join(spec.field(k).label for k in omitted))
            if extra is not None:
                st.caption("Uploaded data is not stored in the scenario file or the link; keep the data "
                           "file with them.")
            st.button("Reset all inputs to defaults", key=_k("reset", kind), icon=":material/restart_alt:",
                      on_click=_reset_callback, args=(kind,))


def page_link(path: str, label: str, icon: str | None = None) -> None:
    """A link to another page; plain text when the page is not in the navigation (tests)."""
    from streamlit.errors import StreamlitAPIException

    try:
        st.page_link(path, label=label, icon=icon)
    except StreamlitAPIException:
        st.caption(label)


def _load_comparison(doc) -> None:
    """Replace the kept options by a comparison file's options."""
    opts = [{"name": o.name, "kind": doc.kind, "inputs": dict(o.inputs), "note": o.note, "extra": None}
            for o in doc.options]
    st.session_state[OPTIONS_KEY] = opts
    st.session_state[_k("cmp_title")] = doc.title
    st.session_state[_k("cmp_note")] = doc.note
    if doc.unit_system != unit_system():
        st.session_state[PENDING_UNITS] = doc.unit_system
