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
                             headline_diff_rows, input_diff_rows, overlay_figure, _key_figure)
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
    tools.load_comparison(doc)
    tools.flash("compare", "success", f"Loaded the invented demo comparison ({len(doc.options)} options).")


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
            tools.load_comparison(doc)
            tools.flash("compare", "success", f"Loaded {up.name}: {len(doc.options)} options.")
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


def _table(head: list[str], rows: list[tuple[list[str], bool]]) -> str:
    ths = "".join(f"<th>{html.escape(h)}</th>" for h in head)
    trs = []
    for cells, differs in rows:
        tds = [f"<td>{'≠ ' if differs else ''}{html.escape(cells[0])}</td>"]
        tds += [f"<td class='num'>{html.escape(c)}</td>" for c in cells[1:]]
        trs.append(f"<tr class='{'differs' if differs else 'same'}'>{''.join(tds)}</tr>")
    return f"<table class='lc-compare'><thead><tr>{ths}</tr></thead><tbody>{''.join(trs)}</tbody></table>"


index_of = {id(o): i for i, o in enumerate(tools.kept_options())}
for gi, (kind, group) in enumerate(group_by_kind(runs)):
    mod = study(kind)
    group_opts = [o for o in options if o["kind"] == kind]
    st.header(f"{mod.TITLE}", divider="gray")
    cols = st.columns(len(group))
    for col, r, o in zip(cols, group, group_opts):
        with col:
            st.markdown(f"<p class='lc-option-name'>{html.escape(r.name)}</p>", unsafe_allow_html=True)
            b1, b2 = st.columns(2)
            b1.button("Open", key=f"_lc:open:{index_of[id(o)]}", on_click=_open_option,
                      args=(index_of[id(o)],), icon=":material/open_in_new:",
                      help="Open these inputs on the study's page")
            b2.button("Remove", key=f"_lc:remove:{index_of[id(o)]}", on_click=tools.remove_option,
                      args=(index_of[id(o)],), icon=":material/close:")
    # one row per result, options side by side, so the same number lines up across the room
    first = group[0].result
    for h0 in first.headlines:
        row = st.columns(len(group))
        for col, r in zip(row, group):
            try:
                h = r.result.headline(h0.key)
            except KeyError:
                col.metric(h0.label, "–", border=True)
                continue
            delta = None if r is group[0] else difference_text(h0, h, system)
            warned = [w.message for w in r.result.warnings if w.subject == h.key]
            tip = "\n\n".join(([h.help] if h.help else []) + [f"⚠ {m}" for m in warned]) or None
            col.metric(f"{h.label}{'  ⚠' if warned else ''}", h.text(system),
                       delta=None if delta in (None, "same", "–") else delta, delta_color="off",
                       help=tip, border=True)
    # warnings once each, naming the options they apply to
    seen: dict[tuple, list[str]] = {}
    for r in group:
        for w in r.result.warnings:
            seen.setdefault((w.severity, w.message), []).append(r.name)
    if seen:
        with st.expander(f"Model warnings ({len(seen)}); ⚠ marks the results they qualify",
                         expanded=any(sev == "invalid" for sev, _ in seen)):
            for (sev, msg), who in seen.items():
                where = "all options" if len(who) == len(group) else ", ".join(who)
                (st.error if sev == "invalid" else st.warning)(f"**{where}**: {msg}", icon=":material/warning:")

    irows = input_diff_rows(kind, group, system)
    differ = [r for r in irows if r["differs"]]
    names = [r.name for r in group]
    st.subheader(f"Inputs that differ ({len(differ)} of {len(irows)})")
    if differ:
        st.markdown(_table(["Input"] + names, [([r["label"] + (f" [{r['unit']}]" if r["unit"] else "")] + r["texts"], True)
                                               for r in differ]), unsafe_allow_html=True)
    else:
        st.markdown("All inputs are the same in every option.")
    if len(group) > 1:
        hrows = headline_diff_rows(group, system)
        st.subheader(f"Results, with the difference to {names[0]}")
        st.markdown(_table(["Result"] + names,
                           [([r["label"], r["texts"][0]] + [f"{t} ({d})" for t, d in zip(r["texts"][1:], r["diffs"][1:])],
                             r["differs"]) for r in hrows]), unsafe_allow_html=True)
    ov = overlay_figure(group, system)
    if ov is not None:
        results.show_figure(ov[1], key=f"_lc:overlay:{gi}")
    else:
        figs = [(r.name, _key_figure(kind, r.result, system)) for r in group]
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
    st.download_button(f"Save these {len(group)} options as a comparison file (.toml)",
                       data=comparison_to_toml(comp), file_name=f"{tools.file_stem(cmp_title)}-{kind}.toml",
                       mime="application/toml", icon=":material/download:", on_click="ignore",
                       key=f"_lc:cmp_save:{kind}")
    results.show_sources_and_cautions(mod)
