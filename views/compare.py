"""Compare options page: up to four kept options side by side, grouped by study kind.

Options come from "Keep as option" on each study page or from a comparison file (.toml). Inputs
that differ are highlighted; each headline shows its difference to the first option of its
group; the study's key chart is drawn with every option over each other where the kind allows.
"""

from __future__ import annotations

import html
from pathlib import Path

import streamlit as st

from liftcore.errors import InputError
from liftcore.report import (Run, comparison_csv, comparison_report, difference_text, group_by_kind,
                             headline_diff_rows, input_diff_rows, overlay_figure, key_figure)
from liftcore.scenario import MAX_OPTIONS, Comparison, Option, comparison_to_toml
from liftcore.studies import STUDY_MODULES, study
from views import inputs, results, tools

DEMO = Path(__file__).resolve().parents[1] / "scenarios" / "compare_demo_invented.toml"
CSS = """
<style>
table.lc-compare { border-collapse: collapse; width: 100%; font-size: 1.25rem; margin-bottom: 0.8rem; }
table.lc-compare th, table.lc-compare td { border: 1px solid #c8c8c8; padding: 0.35rem 0.6rem; text-align: left; }
table.lc-compare th { background: #eef3f8; }
table.lc-compare td.num { text-align: right; font-variant-numeric: tabular-nums; }
table.lc-compare tr.differs td { background: #fff3c4; font-weight: 700; }
table.lc-compare span.diff { font-size: 1.0rem; color: #333; font-weight: 400; }
table.lc-compare sup.warn { color: #8a4b00; font-weight: 700; }
table.lc-compare ol.lc-warnings { text-align: left; font-size: 1.0rem; margin: 0; padding-left: 1.4rem;
  font-weight: 400; }
table.lc-compare ol.lc-warnings li.sev-invalid { color: #a40000; }
ol.lc-warnings { font-size: 1.05rem; }
p.lc-common { margin: 0.2rem 0 0 0; }
.lc-option-name { font-size: 1.6rem; font-weight: 700; margin: 0; }
</style>
"""

st.title("Compare options")
st.markdown(CSS, unsafe_allow_html=True)
system = inputs.unit_system()


# ----------------------------------------------------------------------------- loading
def _load_demo() -> None:
    from liftcore.scenario import load_document

    try:
        doc = load_document(DEMO)
    except (InputError, OSError) as exc:
        tools.flash("compare", "error", f"The demo comparison could not be loaded: {exc}")
        return
    said = tools.load_comparison(doc)
    tools.flash("compare", "success", f"Loaded the invented demo comparison "
                                      f"({tools.plural(len(doc.options), 'option')}).{said}")


def _clear() -> None:
    st.session_state[tools.OPTIONS_KEY] = []
    tools.flash("compare", "success", "All kept options removed.")


def _open_option(index: int) -> None:
    o = tools.kept_options()[index]
    tools.request_load(o["kind"], o["inputs"], title=o["name"], note=o.get("note", ""),
                        message=f"Opened option “{o['name']}” from the Compare options page.")
    st.session_state[tools.key("switch_to")] = o["kind"]


target = st.session_state.pop(tools.key("switch_to"), None)
if target:
    st.switch_page(f"views/{target}.py")

top = st.container()
def _option_name(title: str) -> str:
    """A scenario title shortened to fit an option name (the full title stays in the note)."""
    from liftcore.scenario import MAX_OPTION_NAME_CHARS

    title = " ".join(title.split())
    if len(title) <= MAX_OPTION_NAME_CHARS:
        return title
    return title[:MAX_OPTION_NAME_CHARS - 1].rsplit(" ", 1)[0].rstrip(",;:-") + "…"


with st.sidebar:
    st.markdown("**Options**")
    up = tools.upload_box(st, "compare", "Load a comparison or scenario file (.toml)",
                            "A comparison file replaces the kept options; a single scenario is added "
                            "as one more option.")
    if up is not None:
        doc = tools.read_upload(up, None)
        if isinstance(doc, Comparison):
            said = tools.load_comparison(doc)
            tools.flash("compare", "success", f"Loaded {up.name}: {tools.plural(len(doc.options), 'option')}.{said}")
        elif doc is not None:
            try:
                msg = tools.keep_option(doc.kind, _option_name(doc.title or Path(up.name).stem),
                                         doc.inputs, doc.note or doc.title)
                tools.flash("compare", "success", f"{up.name}: {msg}")
            except InputError as exc:
                tools.flash("compare", "error", f"{up.name}: {exc}")
        tools.reset_upload("compare")
        st.rerun()
    st.button("Load the invented demo comparison", on_click=_load_demo, icon=":material/science:",
              width="stretch", disabled=not DEMO.exists(), key="_lc:cmp_demo")
    st.button("Remove all options", on_click=_clear, icon=":material/delete_sweep:", width="stretch",
              disabled=not tools.kept_options())

with top:
    for level, msg in st.session_state.pop(tools.key("flash", "compare"), []):
        (st.error if level == "error" else st.success)(msg)

options = [o for o in tools.kept_options() if o["kind"] in STUDY_MODULES]
if not options:
    st.info("No options kept yet. On any study page, set the inputs, then use **Keep as option** "
            "at the top of the sidebar (up to four). Or load a comparison file, or the invented demo "
            "comparison, from the sidebar here.", icon=":material/lightbulb:")
    st.stop()

# ----------------------------------------------------------------------------- results
runs: list[Run] = []
for o in options:
    result = results.run_cached(o["kind"], o["inputs"], extra=o.get("extra"), label=f"Computing {o['name']}",
                              check_inputs=False)
    runs.append(Run(o["name"], o["kind"], o["inputs"], result, o.get("note", "")))

cmp_title = st.session_state.get(tools.key("cmp_title")) or "Options compared"
cmp_note = st.session_state.get(tools.key("cmp_note")) or ""
st.caption(f"{len(runs)} of {MAX_OPTIONS} options · differences are to the first option of each group · "
           f"{inputs.UNIT_LABELS[system]}")


def _report() -> str:
    try:
        return comparison_report(runs, cmp_title, cmp_note, system)
    except Exception as exc:  # a download must never fail silently
        return tools.error_page(f"{type(exc).__name__}: {exc}")


def _csv() -> str:
    try:
        return comparison_csv(runs, system)
    except Exception as exc:
        return f"error,{type(exc).__name__}: {exc}\n"


d1, d2, _ = st.columns([1, 1, 2])
d1.download_button("Comparison report", data=_report, file_name=f"{tools.file_stem(cmp_title)}.html",
                   mime="text/html", icon=":material/description:", on_click="ignore", width="stretch",
                   key="_lc:cmp_report",
                   help="A handout (HTML, opens offline, prints to PDF): every group's differences, "
                        "key chart, warnings, sources and cautions")
d2.download_button("Numbers (.csv)", data=_csv, file_name=f"{tools.file_stem(cmp_title)}.csv",
                   mime="text/csv", icon=":material/table:", on_click="ignore", width="stretch",
                   key="_lc:cmp_csv")


def _table(head: list[str], rows: list[tuple[list[str], bool]], raw_cells: bool = False) -> str:
    """An HTML table: the first column words, the others numbers; ``raw_cells`` takes the
    option cells as ready HTML (escaped by the caller)."""
    ths = "".join(f"<th>{html.escape(h)}</th>" for h in head)
    trs = []
    for cells, differs in rows:
        tds = [f"<td>{'≠ ' if differs else ''}{html.escape(cells[0])}</td>"]
        tds += [f"<td class='num'>{c if raw_cells else html.escape(c)}</td>" for c in cells[1:]]
        trs.append(f"<tr class='{'differs' if differs else 'same'}'>{''.join(tds)}</tr>")
    return f"<table class='lc-compare'><thead><tr>{ths}</tr></thead><tbody>{''.join(trs)}</tbody></table>"


def _results_table(group: list[Run]) -> str:
    """One row per result, one column per option with its difference to the first. Each warning
    has a number; a result it qualifies carries the number, and the warnings are written out in
    full (nobody hovers on a shared screen): those of one option in its column, those that hold
    for every option once, under the table."""
    texts = {}  # warning text -> number, in order of first appearance
    per_option = []
    for r in group:
        own = []
        for w in r.result.warnings:
            t = w.text(system)
            texts.setdefault(t, len(texts) + 1)
            own.append((texts[t], t, w))
        per_option.append(own)
    shared = set.intersection(*({t for _, t, _ in own} for own in per_option)) if len(group) > 1 else set()
    rows = []
    for row in headline_diff_rows(group, system):
        cells = [row["label"]]
        for j, (text, diff) in enumerate(zip(row["texts"], row["diffs"])):
            marks = [str(n) for n, _, w in per_option[j] if w.subject == row["key"]]
            cell = html.escape(text)
            if j and diff not in ("same", "–"):
                cell += f"<br><span class='diff'>{html.escape(diff)}</span>"
            if marks:
                cell += f" <sup class='warn'>⚠ {', '.join(marks)}</sup>"
            cells.append(cell)
        rows.append((cells, row["differs"]))

    def items(entries) -> str:
        return "".join(f"<li value='{n}' class='sev-{html.escape(w.severity)}'>{html.escape(t)}</li>"
                       for n, t, w in entries)
    own_rows = [items([e for e in own if e[1] not in shared]) for own in per_option]
    if any(own_rows):
        rows.append((["Warnings"] + [f"<ol class='lc-warnings'>{o}</ol>" if o else "none" for o in own_rows], False))
    out = _table(["Result"] + [r.name for r in group], rows, raw_cells=True)
    common = [e for e in per_option[0] if e[1] in shared]
    if common:
        out += f"<p class='lc-common'><b>For every option:</b></p><ol class='lc-warnings'>{items(common)}</ol>"
    return out


index_of = {id(o): i for i, o in enumerate(tools.kept_options())}
for gi, (kind, group) in enumerate(group_by_kind(runs)):
    mod = study(kind)
    group_opts = [o for o in options if o["kind"] == kind]
    names = [r.name for r in group]
    st.header(f"{mod.TITLE}", divider="gray")
    # the option names with their buttons, in the order of the table's columns
    cols = st.columns([1.2] + [1] * len(group))
    cols[0].markdown("**Options**")
    for col, r, o in zip(cols[1:], group, group_opts):
        with col:
            st.markdown(f"<p class='lc-option-name'>{html.escape(r.name)}</p>", unsafe_allow_html=True)
            st.button("Open", key=f"_lc:open:{index_of[id(o)]}", on_click=_open_option,
                      args=(index_of[id(o)],), icon=":material/open_in_new:", width="stretch",
                      help="Open these inputs on the study's page")
            st.button("Remove", key=f"_lc:remove:{index_of[id(o)]}", on_click=tools.remove_option,
                      args=(index_of[id(o)],), icon=":material/close:", width="stretch")
    st.subheader("Results" + (f", with the difference to {names[0]}" if len(group) > 1 else ""))
    st.markdown(_results_table(group), unsafe_allow_html=True)

    irows = input_diff_rows(kind, group, system)
    differ = [r for r in irows if r["differs"]]
    st.subheader(f"Inputs that differ ({len(differ)} of {len(irows)})")
    if differ:
        st.markdown(_table(["Input"] + names, [([r["label"] + (f" [{r['unit']}]" if r["unit"] else "")] + r["texts"], True)
                                               for r in differ]), unsafe_allow_html=True)
    else:
        st.markdown("All inputs are the same in every option." if len(group) > 1 else
                    "One option only: keep another to see what differs.")
    ov = overlay_figure(group, system)
    if ov is not None:
        results.show_figure(ov[1], key=f"_lc:overlay:{gi}")
    else:
        figs = [(r.name, key_figure(kind, r.result, system)) for r in group]
        figs = [(n, f) for n, f in figs if f is not None]
        if figs:
            fcols = st.columns(len(figs))
            for fc, (n, (t, fig)) in zip(fcols, figs):
                with fc:
                    st.markdown(f"**{html.escape(n)}**: {html.escape(t)}")
                    results.show_figure(fig, key=f"_lc:kf:{gi}:{n}")
    with st.expander(f"All inputs ({len(irows)})"):
        st.markdown(_table(["Input"] + names, [([r["label"] + (f" [{r['unit']}]" if r["unit"] else "")] + r["texts"],
                                                r["differs"]) for r in irows]), unsafe_allow_html=True)
    comp = Comparison(kind=kind, options=tuple(Option(r.name, r.inputs, r.note) for r in group),
                      title=cmp_title, note=cmp_note, unit_system=system)
    st.download_button("Save this option as a comparison file (.toml)" if len(group) == 1 else
                       f"Save these {len(group)} options as a comparison file (.toml)",
                       data=comparison_to_toml(comp), file_name=f"{tools.file_stem(cmp_title)}-{kind}.toml",
                       mime="application/toml", icon=":material/download:", on_click="ignore",
                       key=f"_lc:cmp_save:{kind}")
    results.show_sources_and_cautions(mod)
