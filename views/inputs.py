"""Input widgets drawn from a study's :class:`~liftcore.inputs.InputSpec`, and the unit switch.

State
-----
Every input's value lives in core units under ``"{kind}:{key}"`` (:func:`state_key`). Its widget
has the key ``"w:{kind}:{key}:{system}"`` (:func:`widget_key`) and shows the value in the display
unit of the unit system, rounded the way a person would type it (:func:`display_value`).

Streamlit puts a widget's new value into ``st.session_state`` before the script runs. At the top of
each run :func:`prepare` takes every *changed* widget value into the core state (:func:`sync`),
before anything is drawn, so the page tools, summaries and results all see the same inputs. A
box that holds what it was seeded with leaves the core value as it is (exact: switching units
never nudges a value); every change is taken, also one typed or stepped back to where it
started (a number the box showed before, typed back, means the exact value it showed then:
12 kn shows as 6.17 m/s and 6.17 typed back is 12 kn again). A value out of range is not taken: the box keeps what was typed, a message under it names the
field, the value and the range, and :func:`input_errors` lists it for the page.
"""

from __future__ import annotations

import math

import streamlit as st

from liftcore import units
from liftcore.errors import InputError
from liftcore.inputs import Field, InputSpec
from liftcore.units import tidy

UNIT_KEY = "unit_system"
#: A unit system asked for by a scenario file or a share link, taken at the top of the next run.
PENDING_UNITS = "_lc:pending_units"
UNIT_LABELS = {"SI": "SI (m, m/s, N, kW)", "marine": "Marine (kn, kN, kW, t)",
               "imperial": "Imperial (ft, mph, lbf, °F)"}
#: How number boxes show their value: up to 7 significant digits, no padding zeros.
NUMBER_FORMAT = "%.7g"


# ----------------------------------------------------------------------------- unit switch
#: Page style for a shared screen: the title close under the (transparent) top bar instead of
#: 6 rem down, so a 720 px projector shows results, not white space; headline labels and values
#: wrap (and values shrink a little on narrow screens) instead of being cut with "…".
PAGE_CSS = """<style>
[data-testid="stMainBlockContainer"] { padding-top: 2.5rem; }
[data-testid="stMetricLabel"] .stMarkdownEllipsis p,
[data-testid="stMetricValue"] .stMarkdownEllipsis p {
  white-space: normal; overflow: visible; text-overflow: clip; overflow-wrap: anywhere; }
[data-testid="stMetricLabel"] .stMarkdownEllipsis,
[data-testid="stMetricValue"] .stMarkdownEllipsis { overflow: visible; }
[data-testid="stMetricValue"] { font-size: clamp(1.6rem, 2.2vw, 2.25rem); line-height: 1.2; }
p.lc-summary { font-size: 1.45rem; line-height: 1.45; margin: 0.2rem 0 0.6rem 0; }
p.lc-summary-small { font-size: 1.1rem; line-height: 1.45; margin: 0.1rem 0 0.6rem 0; }
</style>"""


def sidebar_chrome() -> None:
    """The unit-system switch at the top of the sidebar and the page style, drawn by ``app.py``
    before each page."""
    from views import tools

    st.html(PAGE_CSS)
    pending = st.session_state.pop(PENDING_UNITS, None)
    if pending in units.UNIT_SYSTEMS:  # set by a scenario or a share link before this run
        st.session_state[UNIT_KEY] = pending
    if UNIT_KEY not in st.session_state:
        st.session_state[UNIT_KEY] = "SI"
    st.sidebar.segmented_control("Units", list(units.UNIT_SYSTEMS), key=UNIT_KEY,
                                 help="; ".join(UNIT_LABELS.values()), selection_mode="single")
    if st.session_state.get(UNIT_KEY) is None:  # a click on the selected option clears it
        st.session_state[UNIT_KEY] = "SI"
    tools.open_tools_box(st.sidebar.container())


def unit_system() -> str:
    """The unit system chosen in this session (``"SI"``, ``"marine"`` or ``"imperial"``)."""
    return st.session_state.get(UNIT_KEY) or "SI"


# ----------------------------------------------------------------------------- keys and values
def state_key(kind: str, key: str) -> str:
    return f"{kind}:{key}"


def widget_key(kind: str, key: str, system: str) -> str:
    return f"w:{kind}:{key}:{system}"


def display_value(f: Field, core_value, system: str):
    """What the widget of ``f`` shows for ``core_value`` in ``system``: the display unit, tidied,
    kept inside the field's range (a tidied bound never reads as out of range)."""
    if f.kind == "int":
        return int(core_value)
    shown = tidy(units.to_display(core_value, f.quantity, system))
    lo = None if f.low is None else units.to_display(f.low, f.quantity, system)
    hi = None if f.high is None else units.to_display(f.high, f.quantity, system)
    if lo is not None and shown < lo:
        shown = lo
    if hi is not None and shown > hi:
        shown = hi
    return float(shown)


def input_errors(kind: str) -> dict:
    """This session's inputs of ``kind`` that are out of range now: key -> message."""
    return st.session_state.setdefault(f"_lc:input_errors:{kind}", {})


def current_values(spec: InputSpec) -> dict:
    """Core-unit values of every input of ``spec`` as this session holds them now."""
    prepare(spec)
    return {f.key: st.session_state.get(state_key(spec.kind, f.key), f.default) for f in spec.fields}


def set_values(spec: InputSpec, values: dict) -> None:
    """Replace the session's inputs named in ``values`` (a scenario file, a link, a reset, a
    preset); their widgets are re-seeded."""
    errors = input_errors(spec.kind)
    for f in spec.fields:
        if f.key not in values:
            continue
        st.session_state[state_key(spec.kind, f.key)] = values[f.key]
        for system in units.UNIT_SYSTEMS:
            wkey = widget_key(spec.kind, f.key, system)
            for k in (wkey, _step_key(wkey), _last_key(wkey)):
                st.session_state.pop(k, None)
        errors.pop(f.key, None)


def sync_field(spec: InputSpec, f: Field, system: str | None = None) -> None:
    """Take a new value of the widget of ``f`` into the core state (see the module notes)."""
    system = system or unit_system()
    wkey = widget_key(spec.kind, f.key, system)
    if wkey not in st.session_state:
        return
    v = st.session_state[wkey]
    if st.session_state.get(_last_key(wkey), _UNSEEN) == v:
        return  # the box holds what it held at the last look: nothing new to take
    st.session_state[_last_key(wkey)] = v
    skey = state_key(spec.kind, f.key)
    if f.kind not in ("number", "int"):
        st.session_state[skey] = bool(v) if f.kind == "bool" else v
        return
    errors = input_errors(spec.kind)
    seen = st.session_state.get(_shown_key(wkey), {})
    try:
        if f.kind == "number" and v in seen:  # a number this box showed before, typed back
            candidate = seen[v]
        elif f.kind == "int":
            candidate = int(v) if float(v).is_integer() else v
        else:
            candidate = units.from_display(v, f.quantity, system)
        st.session_state[skey] = f.validate(candidate, system)
        errors.pop(f.key, None)
    except InputError as exc:
        errors[f.key] = str(exc)
    except (TypeError, ValueError, OverflowError):
        errors[f.key] = f"{f.label} must be a number (got {v!r})"


_UNSEEN = object()


def widget_changed(spec: InputSpec, key: str) -> bool:
    """Whether the user changed the widget of input ``key`` since the last run (ask before the
    inputs of ``spec`` are synced, i.e. before anything of the page is drawn)."""
    wkey = widget_key(spec.kind, key, unit_system())
    return wkey in st.session_state and st.session_state.get(_last_key(wkey), _UNSEEN) != st.session_state[wkey]


def sync(spec: InputSpec) -> None:
    """Take every widget value of ``spec`` the browser sent into the core state."""
    system = unit_system()
    for f in spec.fields:
        sync_field(spec, f, system)


def take_requests(spec: InputSpec) -> None:
    """A pending scenario load or a new share link replaces the inputs before any widget of
    ``spec`` is drawn (cheap when there is none)."""
    from views import tools

    tools.take_pending_load(spec)
    tools.take_link(spec)
    if st.session_state.get(PENDING_UNITS) not in (None, unit_system()):
        st.rerun()  # the unit switch is drawn before the page: take the new units from the top


def prepare(spec: InputSpec) -> None:
    """Before a page draws anything: a pending scenario load, a new share link, then the values
    the widgets hold. Idempotent, so every helper may call it."""
    take_requests(spec)
    sync(spec)


# ----------------------------------------------------------------------------- widgets
def _auto_step(f: Field, system: str) -> float:
    """The +/- step of a number input without its own step: the power of ten nearest a hundredth
    of the field's default in the display unit (1013.25 hPa -> 10, 15.55 kn -> 0.1, 0.011 ->
    0.0001), or 1 for a default of 0. Taken from the default, not the value shown, so the step
    does not shrink as a value is stepped down toward zero."""
    d = abs(float(units.to_display(f.default, f.quantity, system)))
    if d == 0 or not math.isfinite(d):
        return 1.0
    return float(10.0 ** round(math.log10(d / 100.0)))


def step_for(f: Field, system: str, shown) -> float:
    """The +/- step of the box of ``f`` showing ``shown``: the field's own step (or
    :func:`_auto_step`), made finer until ``shown`` is a whole number of steps. The browser rounds
    a value to the step's decimals before it steps, so 6.17 m/s with a step of 0.1 would go up
    to 6.3 and down to 6.2; with 0.01 it goes to 6.18 and back to 6.17."""
    step = f.step if f.step is not None else _auto_step(f, system)
    try:
        x = float(shown)
    except (TypeError, ValueError):
        return step
    for _ in range(4):
        if not math.isfinite(x) or abs(round(x / step) * step - x) <= 1e-9 * max(abs(x), step):
            break
        step /= 10.0
    return float(f"{step:.12g}")


def input_widget(spec: InputSpec, f: Field, container=None, label: str | None = None):
    """Draw one input in the current unit system; return its value in core units."""
    c = container or st
    take_requests(spec)
    system = unit_system()
    wkey = widget_key(spec.kind, f.key, system)
    skey = state_key(spec.kind, f.key)
    core = st.session_state.get(skey, f.default)
    unit = f.unit(system, st.session_state.get(state_key(spec.kind, "currency"), ""))
    text = label or (f"{f.label} [{unit}]" if unit else f.label)
    helptext = f.help or None
    if wkey not in st.session_state:
        st.session_state[wkey] = st.session_state[_last_key(wkey)] = _seed(f, core, system)
        if f.kind == "number":
            _remember_shown(wkey, st.session_state[wkey], core)
    if f.kind == "int":
        c.number_input(text, step=1, key=wkey, help=helptext)
    elif f.kind == "number":
        # the step only ever gets finer while the box lives, so + then - always comes back
        step = min(st.session_state.get(_step_key(wkey), math.inf),
                   step_for(f, system, st.session_state[wkey]))
        st.session_state[_step_key(wkey)] = step
        c.number_input(text, step=step, key=wkey, help=helptext, format=NUMBER_FORMAT)
    elif f.kind == "choice":
        c.selectbox(text, f.choices, key=wkey, format_func=f.choice_label, help=helptext)
    elif f.kind == "bool":
        c.toggle(text, key=wkey, help=helptext)
    elif f.lines > 1:
        c.text_area(text, key=wkey, help=helptext, height=max(68, 24 * f.lines))
    else:
        c.text_input(text, key=wkey, help=helptext)
    sync_field(spec, f, system)  # e.g. a value an upload just put into the box
    message = input_errors(spec.kind).get(f.key)
    if message:
        c.error(message, icon=":material/error:")
    if skey not in st.session_state:
        st.session_state[skey] = core
    return st.session_state[skey]


def _last_key(wkey: str) -> str:
    return f"_lc:last:{wkey}"


def _step_key(wkey: str) -> str:
    return f"_lc:step:{wkey}"


def _shown_key(wkey: str) -> str:
    return f"_lc:shown:{wkey}"


def _remember_shown(wkey: str, shown: float, core: float, most: int = 8) -> None:
    """Remember that this box showed ``shown`` for the exact ``core`` value, so a user who types
    the shown number back gets that exact value again (12 kn shows as 6.17 m/s; typed back, it
    is 12 kn, not 6.17 m/s)."""
    seen = st.session_state.setdefault(_shown_key(wkey), {})
    seen.pop(shown, None)
    seen[shown] = core
    while len(seen) > most:
        seen.pop(next(iter(seen)))


def _seed(f: Field, core, system: str):
    if f.kind in ("number", "int"):
        return display_value(f, core, system)
    if f.kind == "choice":
        return core if core in f.choices else f.default
    if f.kind == "bool":
        return bool(core)
    return str(core)


def render_inputs(spec: InputSpec, container=None, skip=(), only=None) -> dict:
    """Draw the inputs of ``spec`` grouped in expanders by section; return every core value.

    ``skip`` lists keys the page draws itself; ``only``, if given, the keys to draw here.
    Each field's ``show_if`` decides whether it is drawn (a hidden input keeps its value and
    its old message no longer applies).
    """
    c = container or st.sidebar
    values = current_values(spec)
    errors = input_errors(spec.kind)
    for section, fields in spec.sections():
        fields = [f for f in fields if f.key not in skip and (only is None or f.key in only)]
        shown = [f for f in fields if f.shown_for(values)]
        for f in fields:
            if f not in shown:
                errors.pop(f.key, None)
        if not shown:
            continue
        with c.expander(section, expanded=not any(f.advanced for f in shown)):
            for f in shown:
                values[f.key] = input_widget(spec, f)
    return values


def stop_on_input_errors(kind: str) -> None:
    """While an input is out of range: say which in the main area and stop before any result."""
    errors = input_errors(kind)
    if errors:
        st.error("Some inputs are out of range, so no results are shown until they are fixed "
                 "(what you typed is kept):\n\n" + "\n".join(f"- {m}" for m in errors.values()),
                 icon=":material/error:")
        st.stop()
