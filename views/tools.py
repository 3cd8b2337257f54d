"""Page tools for design reviews: keep as option, handout report, save / load / share, reset.

One call per study page, :func:`page_tools`, draws them under the unit switch. Everything here
keeps one session's state under ``"_lc:..."`` keys; nothing is shared between sessions except
the immutable result cache of :mod:`views.results`.

While any input of the page is out of range, the downloads, the share link and "Keep" are
disabled with the reason: a file or link never carries results for inputs other than the ones
on the screen.
"""

from __future__ import annotations

import html
import re
import urllib.parse

import streamlit as st

from liftcore import units
from liftcore.errors import InputError
from liftcore.inputs import InputSpec
from liftcore.studies import study
from views.inputs import (PENDING_UNITS, current_values, input_errors, set_values, unit_system)
from views.results import cached_result

TOOLS_BOX = "_lc:tools_box"
OPTIONS_KEY = "_lc:options"
MAX_KEPT = 4


def key(name: str, kind: str = "") -> str:
    """The session key of one piece of page-tool state (``_lc:name:kind``)."""
    return f"_lc:{name}:{kind}" if kind else f"_lc:{name}"


def spec_of(kind_or_spec) -> InputSpec:
    if isinstance(kind_or_spec, InputSpec):
        return kind_or_spec
    if isinstance(kind_or_spec, str):
        return study(kind_or_spec).INPUTS
    return kind_or_spec.INPUTS  # a study module


def open_tools_box(container) -> None:
    """Where :func:`page_tools` draws: just under the unit switch (set by ``sidebar_chrome``)."""
    st.session_state[TOOLS_BOX] = container


# ----------------------------------------------------------------------------- messages
def flash(kind: str, level: str, message: str) -> None:
    """Queue a message for the page's tools box (shown once, on the next draw)."""
    st.session_state.setdefault(key("flash", kind), []).append((level, message))


def show_flashes(kind: str) -> None:
    for level, msg in st.session_state.pop(key("flash", kind), []):
        (st.error if level == "error" else st.warning if level == "warning" else st.success)(msg)


def plural(n: int, one: str, many: str | None = None) -> str:
    """``plural(1, "option") == "1 option"``, ``plural(2, "option") == "2 options"``."""
    return f"{n:,} {one if n == 1 else (many or one + 's')}"


# ----------------------------------------------------------------------------- loads and links
def request_load(kind: str, values: dict, *, title: str | None = None, note: str | None = None,
                 unit_system: str | None = None, message: str = "") -> None:
    """Ask the page of ``kind`` to take these inputs before it draws its widgets (next run)."""
    st.session_state[key("pending", kind)] = {"values": dict(values), "title": title, "note": note,
                                              "message": message}
    if unit_system in units.UNIT_SYSTEMS:
        st.session_state[PENDING_UNITS] = unit_system


def take_pending_load(spec: InputSpec) -> None:
    kind = spec.kind
    pending = st.session_state.pop(key("pending", kind), None)
    if pending is None:
        return
    set_values(spec, pending["values"])
    if pending.get("title") is not None:
        _set_text(kind, "title", pending["title"])
    if pending.get("note") is not None:
        _set_text(kind, "note", pending["note"])
    if pending.get("message"):
        flash(kind, "success", pending["message"])


def _query_params() -> dict:
    try:
        return st.query_params.to_dict()
    except Exception:  # outside a script run (unit tests of helpers)
        return {}


def take_link(spec: InputSpec) -> None:
    """Open the inputs of a share link in the address bar (once per new link)."""
    from liftcore.scenario import is_link, values_from_link
    from liftcore.studies import STUDY_MODULES

    kind = spec.kind
    if kind not in STUDY_MODULES:  # a page's helper inputs (not a study): not in links or files
        return
    params = _query_params()
    if not is_link(params) or st.session_state.get(key("link_seen", kind)) == params:
        return
    st.session_state[key("link_seen", kind)] = params
    try:
        values, system = values_from_link(kind, params)
    except InputError as exc:
        set_values(spec, spec.defaults())
        flash(kind, "error", f"This link could not be used: {exc}. The page shows the defaults instead.")
        return
    set_values(spec, values)
    n = sum(1 for k in params if k in spec.keys)
    differ = ("every input at its default" if n == 0 else
              f"{plural(n, 'input')} {'differs' if n == 1 else 'differ'} from the defaults")
    flash(kind, "success", f"Opened from a share link ({differ}).")
    if system != unit_system():
        st.session_state[PENDING_UNITS] = system


def sync_link(spec: InputSpec, values: dict) -> tuple[dict, list]:
    """Write the share link of ``values`` into the page address (only when it changed)."""
    from liftcore.scenario import LINK_MARKER, link_params

    params, omitted = link_params(spec.kind, values, unit_system())
    if set(params) == {LINK_MARKER}:  # nothing differs from the defaults: a clean address
        params = {}
    if _query_params() != params:
        try:
            st.query_params.from_dict(params)
        except Exception:
            pass
    st.session_state[key("link_seen", spec.kind)] = params
    return params, omitted


def share_url(kind: str, params: dict) -> str:
    """The full share link of ``params`` on the page of ``kind`` (host from the browser)."""
    from views import PAGES

    path = next((u for f, _, u, _ in PAGES if f == f"views/{kind}.py"), kind)
    base = ""
    try:
        base = app_root(st.context.url or "", {u for _, _, u, _ in PAGES})
    except Exception:
        pass
    query = urllib.parse.urlencode(params)
    return f"{base}/{path}" + (f"?{query}" if query else "")


def app_root(url: str, page_paths: set) -> str:
    """The app's own address without the page path and query (``st.context.url`` is the address
    of the page being shown: ``http://host:8501/rotor``, or under a base path ``.../lc/rotor``)."""
    parts = urllib.parse.urlsplit(url)
    segments = [seg for seg in parts.path.split("/") if seg]
    if segments and segments[-1] in page_paths:
        segments = segments[:-1]
    root = f"{parts.scheme}://{parts.netloc}" if parts.scheme and parts.netloc else ""
    return root + ("/" + "/".join(segments) if segments else "")


# ----------------------------------------------------------------------------- title and note
def _text_state(kind: str, name: str, default: str = "") -> str:
    """Title or note as typed, the newest keystrokes included (the widget's state is updated
    before the run starts, so the report drawn above the box already has them)."""
    wkey = key("w" + name, kind)
    if wkey in st.session_state:
        st.session_state[key(name, kind)] = st.session_state[wkey]
    return st.session_state.get(key(name, kind), default)


def _set_text(kind: str, name: str, value: str) -> None:
    st.session_state[key(name, kind)] = value
    st.session_state.pop(key("w" + name, kind), None)


def _text_widget(c, kind: str, name: str, label: str, default: str, area: bool = False, **kw) -> str:
    wkey = key("w" + name, kind)
    if wkey not in st.session_state:
        st.session_state[wkey] = _text_state(kind, name, default)
    v = (c.text_area if area else c.text_input)(label, key=wkey, **kw)
    st.session_state[key(name, kind)] = v
    return v


# ----------------------------------------------------------------------------- downloads
def error_page(message: str) -> str:
    """A one-paragraph HTML page saying why a report could not be made."""
    return ("<!DOCTYPE html><html lang=\"en\"><meta charset=\"utf-8\"><title>Report not made</title>"
            f"<body><h1>The report could not be made</h1><p>{html.escape(message)}</p></body></html>")


def _report_maker(kind, values, extra, system, title, note, data_note):
    from liftcore.report import scenario_report
    from liftcore.scenario import Scenario

    def make() -> str:
        try:
            result = cached_result(kind, values, extra)
            return scenario_report(Scenario(kind=kind, inputs=values, title=title, note=note,
                                            unit_system=system), result, system, data_note=data_note)
        except Exception as exc:  # a download must never fail silently
            return error_page(f"{type(exc).__name__}: {exc}")
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
    out = re.sub("-{2,}", "-", out)
    return (out or fallback)[:60]


# ----------------------------------------------------------------------------- uploads
def read_upload(upload, kind: str | None = None):
    """Parse an uploaded scenario or comparison file; returns the document or ``None`` after
    flashing a one-line error. Oversized files are refused before they are read."""
    from liftcore.scenario import MAX_SCENARIO_BYTES, parse_document

    where = kind or "compare"
    size = getattr(upload, "size", None)
    if size is not None and size > MAX_SCENARIO_BYTES:
        flash(where, "error", f"{upload.name} is {size:,} bytes; scenario files must be at most "
                              f"{MAX_SCENARIO_BYTES:,} bytes")
        return None
    try:
        data = upload.read(MAX_SCENARIO_BYTES + 1)
        return parse_document(data, upload.name)
    except InputError as exc:
        flash(where, "error", str(exc))
        return None


def upload_box(c, kind: str, label: str, help_text: str):
    """A file uploader that hands each new file over once, then resets itself."""
    from liftcore.scenario import MAX_SCENARIO_BYTES

    n = st.session_state.get(key("upload_n", kind), 0)
    up = c.file_uploader(label, type=["toml"], key=key(f"upload{n}", kind), help=help_text,
                         max_upload_size=max(1, MAX_SCENARIO_BYTES // 1_000_000))
    if up is None or st.session_state.get(key("upload_seen", kind)) == up.file_id:
        return None
    st.session_state[key("upload_seen", kind)] = up.file_id
    return up


def reset_upload(kind: str) -> None:
    st.session_state[key("upload_n", kind)] = st.session_state.get(key("upload_n", kind), 0) + 1


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


def next_option_name() -> str:
    """The first of "Option 1", "Option 2", ... not kept yet."""
    names = {o["name"] for o in kept_options()}
    i = 1
    while f"Option {i}" in names:
        i += 1
    return f"Option {i}"


def load_comparison(doc) -> str:
    """Replace the kept options by a comparison file's options; returns a sentence saying what
    changed (the unit system of the file is taken, and said)."""
    opts = [{"name": o.name, "kind": doc.kind, "inputs": dict(o.inputs), "note": o.note, "extra": None}
            for o in doc.options]
    st.session_state[OPTIONS_KEY] = opts
    st.session_state[key("cmp_title")] = doc.title
    st.session_state[key("cmp_note")] = doc.note
    if doc.unit_system != unit_system():
        st.session_state[PENDING_UNITS] = doc.unit_system
        return (f" Shown in {doc.unit_system} units, as the file asks; switch at the top of the "
                "sidebar.")
    return ""


def _keep_callback(kind: str, values: dict, extra, name_key: str) -> None:
    try:
        msg = keep_option(kind, st.session_state.get(name_key, ""), values, extra=extra)
    except InputError as exc:
        flash(kind, "error", str(exc))
        return
    flash(kind, "success", msg + " See them side by side on the Compare options page.")


def _reset_callback(kind: str) -> None:
    spec = spec_of(kind)
    set_values(spec, spec.defaults())
    flash(kind, "success", "All inputs are back at their defaults.")


def page_link(path: str, label: str, icon: str | None = None) -> None:
    """A link to another page; plain text when the page is not in the navigation (tests)."""
    from streamlit.errors import StreamlitAPIException

    try:
        st.page_link(path, label=label, icon=icon)
    except StreamlitAPIException:
        st.caption(label)


# ----------------------------------------------------------------------------- the page tools
def page_tools(kind_or_spec, extra=None, data_note: str = "", container=None,
               problem: str | None = None) -> None:
    """Save, load, share, keep and report: the one call each study page makes after its inputs.

    Draws (under the unit switch in the sidebar): keep as option, handout report download, and an
    expander with the scenario file download and upload, the numbers as CSV, the share link and a
    reset. Keeps the page URL equal to the share link of the current inputs. ``extra`` is the
    page's uploaded data (passed to the study for the report; not stored in files or links).
    ``problem`` (from :func:`views.results.run_for_page`): why there is no result now; like an
    input out of range it disables the downloads, the link and "Keep", with the reason.
    """
    from liftcore.scenario import Comparison, Scenario, scenario_to_toml

    spec = spec_of(kind_or_spec)
    kind = spec.kind
    mod = study(kind)
    values = current_values(spec)
    system = unit_system()
    box = container or st.session_state.pop(TOOLS_BOX, None) or st.sidebar
    errors = dict(input_errors(kind))
    if problem and not errors:
        errors["(study)"] = problem
    blocked = ("Fix the inputs first: " + "; ".join(errors.values())) if errors else None

    with box:
        show_flashes(kind)
        offered = next_option_name()
        # A new box after every keep (the count and the offered name are in its key), so the name
        # just kept is never sent again by the browser and the next free name is offered.
        name_key = key(f"option_name:{len(kept_options())}:{offered}", kind)
        with st.popover("Keep as option", icon=":material/bookmark_add:", width="stretch",
                        help="Store these inputs under a name and compare up to four options "
                             "on the Compare options page"):
            st.text_input("Option name", value=offered, key=name_key, max_chars=60)
            st.button("Keep", key=key("keep", kind), type="primary", on_click=_keep_callback,
                      args=(kind, dict(values), extra, name_key), disabled=bool(errors),
                      help=blocked)
            st.caption(f"{len(kept_options())} of {MAX_KEPT} options kept.")
            page_link("views/compare.py", "Compare options", ":material/compare:")
        title = _text_state(kind, "title", mod.TITLE)
        note = _text_state(kind, "note", "")
        st.download_button("Handout report", data=_report_maker(kind, values, extra, system, title, note, data_note),
                           file_name=f"{file_stem(title, kind)}.html", mime="text/html",
                           icon=":material/description:", key=key("report", kind), width="stretch",
                           on_click="ignore", disabled=bool(errors),
                           help=blocked or "A handout (HTML, opens offline, prints to PDF) with inputs, "
                                           "results, charts, warnings, sources and cautions")
        if errors:
            st.caption("Downloads and the share link wait until every input is in range.")
        with st.expander("Save, load, share", icon=":material/folder_open:"):
            title = _text_widget(st, kind, "title", "Title", mod.TITLE, max_chars=200,
                                 help="Used for the scenario file, the report and its file names")
            note = _text_widget(st, kind, "note", "Note", "", area=True, max_chars=5000, height=80)
            scenario = Scenario(kind=kind, inputs=values, title=title, note=note, unit_system=system)
            st.download_button("Save scenario (.toml)", data=scenario_to_toml(scenario),
                               file_name=f"{file_stem(title, kind)}.toml", mime="application/toml",
                               icon=":material/download:", key=key("save", kind), on_click="ignore",
                               width="stretch", disabled=bool(errors), help=blocked)
            st.download_button("Numbers (.csv)", data=_csv_maker(kind, values, extra, system, title, note),
                               file_name=f"{file_stem(title, kind)}.csv", mime="text/csv",
                               icon=":material/table:", key=key("csv", kind), on_click="ignore",
                               width="stretch", disabled=bool(errors), help=blocked)
            up = upload_box(st, kind, "Load a scenario file (.toml)",
                            "A file saved from this page (or any liftcore scenario of this kind). "
                            "Inputs it does not set take their defaults.")
            if up is not None:
                _take_upload(up, kind, mod)
            if errors:
                st.caption("The share link appears again once every input is in range.")
            else:
                params, omitted = sync_link(spec, values)
                st.markdown("**Share link** (opens these inputs):")
                st.code(share_url(kind, params), language=None, wrap_lines=True)
                if omitted:
                    st.caption("Not in the link (too long): " + ", ".join(spec.field(k).label for k in omitted))
            if extra is not None:
                st.caption("Uploaded data is not stored in the scenario file or the link; keep the data "
                           "file with them.")
            st.button("Reset all inputs to defaults", key=key("reset", kind), icon=":material/restart_alt:",
                      on_click=_reset_callback, args=(kind,))


def _take_upload(up, kind: str, mod) -> None:
    from liftcore.scenario import Comparison

    doc = read_upload(up, kind)
    if isinstance(doc, Comparison):
        said = load_comparison(doc)
        n = len(doc.options)
        flash(kind, "success", f"{up.name} is a comparison: {'its option is' if n == 1 else f'its {n} options are'} "
                               f"kept for the Compare options page.{said}")
        reset_upload(kind)
    elif doc is not None and doc.kind != kind:
        flash(kind, "error", f"{up.name} is a {doc.kind} scenario; load it on the "
                             f"“{study(doc.kind).TITLE}” page")
    elif doc is not None:
        migrated = (f" (a schema_version {doc.migrated_from} file, read and updated)"
                    if doc.migrated_from else "")
        said = (f" Shown in {doc.unit_system} units, as the file asks."
                if doc.unit_system != unit_system() else "")
        request_load(kind, doc.inputs, title=doc.title or mod.TITLE, note=doc.note,
                     unit_system=doc.unit_system, message=f"Loaded {up.name}{migrated}.{said}")
        reset_upload(kind)
    st.rerun()  # a bad file: show the error above; the inputs stay as they were
