"""Handout reports: one self-contained HTML file (plotly.js inline, no network needed, prints cleanly
to PDF) and a CSV of the numbers beside it, for one scenario or a comparison of options.

Everything here reads :class:`~liftcore.studies.StudyResult` objects made by
:func:`~liftcore.studies.run_study`, so the report shows the numbers the page and the command line
show. The comparison helpers (input differences, headline differences to the first option, the
overlaid key chart) are shared with the Compare options page.
"""

from __future__ import annotations

import datetime as _dt
import html
import io
import re
from dataclasses import dataclass
from functools import lru_cache

import numpy as np
import pandas as pd
import plotly.graph_objects as go

import liftcore
from liftcore import units
from liftcore.files import SafeWriter, csv_text
from liftcore.figures import LEGEND_ROW_PX, PALETTE, legend_entries, legend_rows, set_title
from liftcore.inputs import Field
from liftcore.scenario import Comparison, Scenario
from liftcore.studies import Headline, StudyResult, format_number, run_study, study

#: Tables with more rows than this are left to the CSV (the report says so).
MAX_REPORT_TABLE_ROWS = 30
#: Chart size in the report: fits an A4 or Letter page in portrait with 15 mm margins. [px]
REPORT_FIG_WIDTH = 680
REPORT_FIG_HEIGHT = 420
#: Taller charts (maps, polar pairs, legends under the plot) keep their own height up to this. [px]
REPORT_FIG_MAX_HEIGHT = 760
#: Trace types that can be laid over each other from several options.
OVERLAY_TYPES = ("scatter", "scattergl", "scatter3d", "scatterpolar", "bar")
DASHES = ("solid", "dash", "dot", "dashdot", "longdash")


@dataclass(frozen=True)
class Run:
    """One named option and its result (the unit the comparison helpers work on)."""

    name: str
    kind: str
    inputs: dict
    result: StudyResult
    note: str = ""


# ----------------------------------------------------------------------------- running
def run_scenario(s: Scenario, progress=None, extra=None) -> StudyResult:
    """Run a scenario's study (the same path as the page and the command line)."""
    return run_study(s.kind, s.inputs, progress=progress, extra=extra)


def run_comparison(c: Comparison, progress=None) -> list[Run]:
    """Run every option of a comparison; ``progress`` sees one overall fraction."""
    runs, n = [], len(c.options)
    for i, o in enumerate(c.options):
        def part(fraction, text="", i=i, name=o.name):
            if progress is not None:
                progress((i + min(max(float(fraction), 0.0), 1.0)) / n, f"{name}: {text}" if text else name)
        if progress is not None:
            progress(i / n, f"{o.name}")
        runs.append(Run(o.name, c.kind, dict(o.inputs), run_study(c.kind, o.inputs, progress=part), o.note))
    if progress is not None:
        progress(1.0, "done")
    return runs


# ----------------------------------------------------------------------------- numbers as text
def input_text(f: Field, value, system: str = "SI", currency: str = "") -> tuple[str, str]:
    """(value text, unit) of one input in ``system`` (money in ``currency``)."""
    if f.kind == "number":
        return (format_number(units.tidy(units.to_display(value, f.quantity, system)), 7),
                f.unit(system, currency))
    if f.kind == "int":
        return str(int(value)), f.unit(system)
    if f.kind == "bool":
        return ("yes" if value else "no"), ""
    if f.kind == "choice":
        return f.choice_label(value), ""
    return str(value), ""


def input_rows(kind: str, values: dict, system: str = "SI") -> list[dict]:
    """Every input of ``kind``: section, label, key, shown value and unit, core value, changed."""
    rows = []
    fields = [f for _, group in study(kind).INPUTS.sections() for f in group]
    for f in fields:
        v = values.get(f.key, f.default)
        text, unit = input_text(f, v, system, values.get("currency", ""))
        core_unit = units.core_unit_label(f.quantity) if f.kind == "number" and f.quantity in units.CORE else ""
        rows.append({"section": f.section, "label": f.label, "key": f.key, "text": text, "unit": unit,
                     "core_value": v, "core_unit": core_unit, "changed": v != f.default})
    return rows


def headline_rows(result: StudyResult, system: str = "SI") -> list[dict]:
    rows = []
    for h in result.headlines:
        v, unit = h.shown(system)
        core_unit = units.core_unit_label(h.quantity) if h.quantity in units.CORE else ""
        rows.append({"key": h.key, "label": h.label, "value": v, "unit": unit, "text": h.text(system),
                     "core_value": h.value, "core_unit": core_unit})
    return rows


def _signed(d: float, digits: int) -> str:
    return ("+" if d > 0 else "-" if d < 0 else "±") + format_number(abs(d), digits)


def difference_text(h0: Headline, h: Headline, system: str = "SI") -> str:
    """``+1.2 kN (+8.1 %)``: ``h`` minus the first option's ``h0``, in display units."""
    v0, unit = h0.shown(system)
    v, _ = h.shown(system)
    if v0 is None or v is None or v0 != v0 or v != v:
        return "–"
    d = v - v0
    if d == 0:
        return "same"
    text = _signed(d, h.digits) + (f" {unit}" if unit else "")
    if v0 != 0:
        text += f" ({_signed(100.0 * d / abs(v0), 2)} %)"
    return text


def group_by_kind(runs: list[Run]) -> list[tuple[str, list[Run]]]:
    """Runs grouped by study kind, kinds in first-seen order."""
    out: dict[str, list[Run]] = {}
    for r in runs:
        out.setdefault(r.kind, []).append(r)
    return list(out.items())


def input_diff_rows(kind: str, runs: list[Run], system: str = "SI") -> list[dict]:
    """One row per input: label, unit, each option's value text, and whether any differs."""
    rows = []
    for f in study(kind).INPUTS.fields:
        vals = [r.inputs.get(f.key, f.default) for r in runs]
        currency = runs[0].inputs.get("currency", "") if runs else ""
        texts = [input_text(f, v, system)[0] for v in vals]
        rows.append({"key": f.key, "section": f.section, "label": f.label, "unit": f.unit(system, currency),
                     "values": vals, "texts": texts, "differs": any(v != vals[0] for v in vals)})
    return rows


def headline_diff_rows(runs: list[Run], system: str = "SI") -> list[dict]:
    """One row per headline of the first option: each option's text and difference to the first."""
    rows = []
    first = runs[0].result
    for h0 in first.headlines:
        texts, diffs = [], []
        for r in runs:
            try:
                h = r.result.headline(h0.key)
            except KeyError:
                texts.append("–")
                diffs.append("–")
                continue
            texts.append(h.text(system))
            diffs.append(difference_text(h0, h, system))
        _, unit = h0.shown(system)
        rows.append({"key": h0.key, "label": h0.label, "unit": unit, "texts": texts, "diffs": diffs,
                     "differs": any(d not in ("same", "–") for d in diffs[1:])})
    return rows


# ----------------------------------------------------------------------------- overlaid chart
def figures_for(kind: str, result: StudyResult, system: str = "SI") -> tuple:
    """The study's charts in ``system``: its optional ``figures_in_units(result, system)`` when it
    has one (charts with converted axes), else the charts of the result (core units)."""
    make = getattr(study(kind), "figures_in_units", None)
    if system != "SI" and callable(make):
        return tuple(make(result, system))
    return tuple(result.figures)


def tables_for(kind: str, result: StudyResult, system: str = "SI") -> dict:
    """The study's tables as people read them: its optional ``tables_in_units(result, system)``
    when it has one (converted, the unit in each column name), else the result's core-unit tables."""
    make = getattr(study(kind), "tables_in_units", None)
    return dict(make(result, system)) if callable(make) else dict(result.tables)


def key_figure(kind: str, result: StudyResult, system: str = "SI"):
    """The study's key chart for comparisons: ``COMPARE_FIGURE`` (index or title; ``None`` for
    none) when the study sets it, else its first flat chart that can be overlaid, else its first."""
    figures = figures_for(kind, result, system)
    if not figures:
        return None
    mod = study(kind)
    if not hasattr(mod, "COMPARE_FIGURE"):
        for title, fig in figures:
            if fig.data and all(t.type in OVERLAY_TYPES and t.type != "scatter3d" for t in fig.data):
                return title, fig
        return figures[0]
    which = mod.COMPARE_FIGURE
    if which is None:
        return None
    if isinstance(which, str):
        for title, fig in figures:
            if title == which:
                return title, fig
        return None
    if 0 <= which < len(figures):
        return figures[which]
    return None


def _rgba(hex_colour: str, alpha: float) -> str:
    r, g, b = (int(hex_colour[i:i + 2], 16) for i in (1, 3, 5))
    return f"rgba({r},{g},{b},{alpha})"


def overlay_figure(runs: list[Run], system: str = "SI"):
    """The key chart of every option (one kind) drawn over each other, one colour per option.

    Returns ``(title, figure)``, or ``None`` when the kind has no key chart or its traces cannot be
    overlaid (maps, contour plots): then the charts are shown side by side instead.
    """
    if not runs:
        return None
    picked = [key_figure(r.kind, r.result, system) for r in runs]
    if any(p is None for p in picked):
        return None
    for _, fig in picked:
        if any(t.type not in OVERLAY_TYPES for t in fig.data):
            return None
    title0, fig0 = picked[0]
    out = go.Figure(fig0)
    out.data = ()
    layout_title = f"{title0}: options compared"
    meta = fig0.layout.meta if isinstance(fig0.layout.meta, dict) else {}
    set_title(out, layout_title, meta.get("subtitle", ""), meta.get("top_extra", 0))
    out.update_layout(showlegend=True)
    # annotations and shapes tied to data belong to one option; keep only paper-anchored ones
    out.layout.annotations = [a for a in (fig0.layout.annotations or ())
                              if a.xref in ("paper", None) and a.yref in ("paper", None)]
    out.layout.shapes = [s for s in (fig0.layout.shapes or ())
                         if s.xref == "paper" and s.yref == "paper"]
    for i, (r, (_, fig)) in enumerate(zip(runs, picked)):
        colour = PALETTE[i % len(PALETTE)]
        # traces the chart keeps out of its legend (peak markers, ...) stay out, unless the option
        # would otherwise have no legend entry at all
        listed = [t.showlegend is not False and bool(t.name) for t in fig.data]
        if not any(listed) and listed:
            listed[0] = True
        for j, t in enumerate(fig.data):
            if t.meta == "context" and len(runs) > 1:  # one option's context (spread, zero line)
                continue
            t = go.Figure(data=[t]).data[0]  # a detached copy
            name = f"{r.name} · {t.name}" if t.name else r.name
            t.update(name=name, legendgroup=r.name, showlegend=listed[j])
            fill = getattr(t, "fill", None)
            if t.type == "bar":
                t.update(marker=dict(color=colour))
            elif fill and fill != "none":  # a band: shade it in the option's colour
                t.update(fillcolor=_rgba(colour, 0.15), line=dict(color=_rgba(colour, 0.0)))
            else:
                t.update(line=dict(color=colour, dash=DASHES[j % len(DASHES)]), marker=dict(color=colour))
            out.add_trace(t)
    if any(t.type == "bar" for t in out.data):
        out.update_layout(barmode="group")
    # the legend under the plot (house style) grows by the rows the other options add
    legend = out.layout.legend
    if legend.yref == "container":
        add = LEGEND_ROW_PX * max(0, legend_rows(legend_entries(out)) - legend_rows(legend_entries(fig0)))
        out.update_layout(height=(out.layout.height or REPORT_FIG_HEIGHT) + add)
    # a range fitted to the first option's data would cut the others off: let every axis fit all
    out.for_each_xaxis(_fit_all_options)
    out.for_each_yaxis(_fit_all_options)
    out.update_polars(radialaxis_range=None, radialaxis_autorange=True)
    return layout_title, out


def _fit_all_options(axis) -> None:
    if axis.range is not None and axis.autorange != "reversed":
        axis.update(range=None, autorange=True)


# ----------------------------------------------------------------------------- HTML pieces
_CSS = """
:root { color-scheme: light; }
* { box-sizing: border-box; }
body { font-family: Arial, Helvetica, sans-serif; font-size: 15px; line-height: 1.45; color: #111;
       background: #fff; margin: 0 auto; max-width: 760px; padding: 24px; }
h1 { font-size: 28px; margin: 0 0 6px; }
h2 { font-size: 21px; margin: 28px 0 10px; border-bottom: 2px solid #0072B2; padding-bottom: 4px;
     break-after: avoid; page-break-after: avoid; }
h3 { font-size: 17px; margin: 18px 0 6px; break-after: avoid; page-break-after: avoid; }
.meta { color: #444; font-size: 13px; }
.note { white-space: pre-wrap; margin: 8px 0; }
.spread { color: #333; font-size: 0.9em; margin-top: 2px; }
.lead { font-size: 1.15em; line-height: 1.45; margin: 6px 0 12px 0; }
.invented { display: inline-block; border: 1.5px solid #555; padding: 0 6px; font-size: 12px;
            border-radius: 3px; margin-left: 6px; vertical-align: middle; }
.headlines { display: grid; grid-template-columns: repeat(auto-fill, minmax(165px, 1fr)); gap: 10px; }
.card { border: 1.5px solid #999; border-radius: 6px; padding: 8px 10px; break-inside: avoid;
        page-break-inside: avoid; }
.card .label { font-size: 13px; color: #333; }
.card .value { font-size: 24px; font-weight: bold; }
.card .warn { font-size: 12px; color: #7a3b00; margin-top: 4px; }
table { border-collapse: collapse; width: 100%; margin: 6px 0 12px; font-size: 13.5px; }
th, td { border: 1px solid #bbb; padding: 3px 6px; text-align: left; vertical-align: top; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; }
thead th { background: #eef3f8; }
tr { break-inside: avoid; page-break-inside: avoid; }
tr.differs td { background: #fff3c4; font-weight: bold; }
.mark { font-weight: bold; }
.warnings li { margin-bottom: 4px; }
.warnings .sev-invalid { color: #8b0000; font-weight: bold; }
.caution { border: 2px solid #D55E00; border-radius: 6px; padding: 8px 12px; margin: 8px 0;
           break-inside: avoid; page-break-inside: avoid; }
figure.chart { margin: 10px 0 18px; break-inside: avoid; page-break-inside: avoid; }
figure.chart figcaption { font-size: 13px; color: #333; }
.group { break-before: page; page-break-before: always; }
.group:first-of-type { break-before: auto; page-break-before: auto; }
footer { margin-top: 30px; font-size: 12px; color: #555; border-top: 1px solid #ccc; padding-top: 6px; }
@page { size: auto; margin: 15mm; }
@media print {
  body { max-width: none; padding: 0; font-size: 12.5px; }
  * { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
  a { color: #111; text-decoration: none; }
  .noprint { display: none; }
}
"""


@lru_cache(maxsize=1)
def _plotly_js() -> str:
    import plotly.offline

    return plotly.offline.get_plotlyjs()


def _e(x) -> str:
    return html.escape(str(x), quote=True)


def bold_html(markdown: str) -> str:
    """A sentence made by a study with ``**`` round its numbers, as HTML: ``<b>`` for the
    numbers, everything else escaped."""
    return re.sub(r"\*\*(.+?)\*\*", r"<b>\1</b>", _e(markdown))


def _summary_html(mod, result: StudyResult, system: str) -> str:
    """The study's sentence about the result (its ``summary``), where it has one."""
    if not callable(getattr(mod, "summary", None)):
        return ""
    text = mod.summary(result, system)
    return f"<p class=\"lead\">{bold_html(text)}</p>" if text else ""


def _figure_html(fig, div_id: str) -> str:
    f = go.Figure(fig)
    height = min(max(fig.layout.height or REPORT_FIG_HEIGHT, REPORT_FIG_HEIGHT), REPORT_FIG_MAX_HEIGHT)
    f.update_layout(width=REPORT_FIG_WIDTH, height=height, autosize=False,
                    paper_bgcolor="white", plot_bgcolor="white")
    return f.to_html(full_html=False, include_plotlyjs=False, include_mathjax=False, div_id=div_id,
                     config={"displaylogo": False, "responsive": False, "plotlyServerURL": ""})


def _page(title: str, body: str) -> str:
    return ("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
            f"<title>{_e(title)}</title>\n<meta name=\"generator\" content=\"liftcore {_e(liftcore.__version__)}\">\n"
            f"<style>{_CSS}</style>\n<script type=\"text/javascript\">{_plotly_js()}</script>\n"
            f"</head>\n<body>\n{body}\n</body>\n</html>\n")


def _meta_line(system: str, extra: str = "") -> str:
    now = _dt.datetime.now().strftime("%Y-%m-%d %H:%M")
    units_text = {"SI": "SI units", "marine": "marine units (kn, kN, kW, t)",
                  "imperial": "imperial units (ft, mph, lbf, °F)"}[system]
    return (f"<p class=\"meta\">{_e(extra)}{' · ' if extra else ''}Shown in {_e(units_text)} · "
            f"made with liftcore {_e(liftcore.__version__)} on {_e(now)}</p>")


def _invented_badge(*texts: str) -> str:
    return "<span class=\"invented\">invented data</span>" if any("invented" in (t or "").lower()
                                                                  for t in texts) else ""


def _headline_cards(result: StudyResult, system: str) -> str:
    cards = []
    for h in result.headlines:
        warns = "".join(f"<div class=\"warn\">⚠ {_e(w.text(system))}</div>" for w in result.warnings
                        if w.subject == h.key)
        if h.note(system):
            warns = f"<div class=\"note\">{_e(h.note(system))}</div>" + warns
        if h.spread_text(system):
            warns = f"<div class=\"spread\">{_e(h.spread_text(system))}</div>" + warns
        cards.append(f"<div class=\"card\"><div class=\"label\">{_e(h.label)}</div>"
                     f"<div class=\"value\">{_e(h.text(system))}</div>{warns}</div>")
    return f"<div class=\"headlines\">{''.join(cards)}</div>"


def _warnings_html(result: StudyResult, system: str = "SI") -> str:
    keys = {h.key for h in result.headlines}
    general = [w for w in result.warnings if w.subject not in keys]
    if not result.warnings:
        return "<p>No model warnings for these inputs.</p>"
    items = [f"<li class=\"sev-{_e(w.severity)}\">{'Not valid: ' if w.severity == 'invalid' else ''}{_e(w.text(system))}</li>"
             for w in general]
    shown = len(result.warnings) - len(general)
    extra = f"<p>{shown} more beside the numbers they qualify, above.</p>" if shown else ""
    return (f"<ul class=\"warnings\">{''.join(items)}</ul>" if items else "") + extra


def _inputs_table(kind: str, values: dict, system: str) -> str:
    rows, section = [], None
    for r in input_rows(kind, values, system):
        if r["section"] != section:
            section = r["section"]
            rows.append(f"<tr><th colspan=\"3\">{_e(section)}</th></tr>")
        mark = " <span class=\"mark\" title=\"changed from the default\">•</span>" if r["changed"] else ""
        rows.append(f"<tr><td>{_e(r['label'])}{mark}</td><td class=\"num\">{_e(r['text'])}</td>"
                    f"<td>{_e(r['unit'])}</td></tr>")
    return ("<table><thead><tr><th>Input</th><th class=\"num\">Value</th><th>Unit</th></tr></thead>"
            f"<tbody>{''.join(rows)}</tbody></table><p class=\"meta\">• changed from the default</p>")


def _table_title(name: str) -> str:
    """``wind_angle_sweep`` -> ``Wind angle sweep`` (the CSV keeps the name as it is)."""
    text = name.replace("_", " ")
    return text[:1].upper() + text[1:]


def _df_html(name: str, df: pd.DataFrame) -> str:
    if len(df) > MAX_REPORT_TABLE_ROWS:
        return (f"<h3>{_e(_table_title(name))}</h3><p>{len(df)} rows × {len(df.columns)} columns: in the CSV file "
                "that comes with this report.</p>")
    numeric = [pd.api.types.is_numeric_dtype(df[c]) and not pd.api.types.is_bool_dtype(df[c])
               for c in df.columns]

    def cell(v, num: bool) -> str:
        if num:
            text = "–" if v is None or v != v else format_number(float(v), 4)
            return f"<td class=\"num\">{_e(text)}</td>"
        if isinstance(v, (bool, np.bool_)):
            return f"<td>{'yes' if v else 'no'}</td>"
        return f"<td>{_e('–' if v is None or v != v else v)}</td>"

    head = "".join(f"<th class=\"num\">{_e(c)}</th>" if n else f"<th>{_e(c)}</th>"
                   for c, n in zip(df.columns, numeric))
    rows = "".join("<tr>" + "".join(cell(v, n) for v, n in zip(row, numeric)) + "</tr>"
                   for row in df.itertuples(index=False, name=None))
    # numbers right-aligned (class num), words left-aligned
    return f"<h3>{_e(_table_title(name))}</h3><table><thead><tr>{head}</tr></thead><tbody>{rows}</tbody></table>"


def _sources_cautions(kind: str) -> str:
    mod = study(kind)
    src = "".join(f"<li>{_e(s)}</li>" for s in getattr(mod, "SOURCES", ()))
    cau = "".join(f"<div class=\"caution\">{_e(c)}</div>" for c in getattr(mod, "CAUTIONS", ()))
    return cau, f"<ul>{src}</ul>" if src else "<p>No published model is named for this study.</p>"


def scenario_report(s: Scenario, result: StudyResult, unit_system: str | None = None,
                    data_note: str = "") -> str:
    """The handout for one scenario: a complete HTML document (plotly.js inline, prints to PDF)."""
    system = unit_system or s.unit_system
    mod = study(s.kind)
    title = s.title or mod.TITLE
    if not data_note and callable(getattr(mod, "data_note", None)):
        data_note = mod.data_note(result)  # e.g. which wind data a voyage used
    cautions, sources = _sources_cautions(s.kind)
    figs = "".join(f"<figure class=\"chart\">{_figure_html(fig, f'fig{i}')}<figcaption>{_e(t)}</figcaption></figure>"
                   for i, (t, fig) in enumerate(figures_for(s.kind, result, system)))
    tables = "".join(_df_html(n, df) for n, df in tables_for(s.kind, result, system).items())
    body = [
        f"<header><h1>{_e(title)}{_invented_badge(s.title, s.note)}</h1>",
        _meta_line(system, f"Study: {mod.TITLE}"),
        f"<p class=\"note\">{_e(s.note)}</p>" if s.note else "",
        f"<p class=\"note\">{_e(data_note)}</p>" if data_note else "",
        "</header>",
        "<section><h2>Results</h2>", _summary_html(mod, result, system), _headline_cards(result, system),
        "</section>",
        "<section><h2>Warnings</h2>", _warnings_html(result, system), "</section>",
        f"<section><h2>Cautions</h2>{cautions or '<p>None stated.</p>'}</section>",
        f"<section><h2>Charts</h2>{figs or '<p>This study draws no charts.</p>'}</section>",
        "<section><h2>Inputs</h2>", _inputs_table(s.kind, s.inputs, system), "</section>",
        f"<section><h2>Tables</h2>{tables}</section>" if tables else "",
        f"<section><h2>Sources of the models</h2>{sources}</section>",
        f"<footer>Scenario kind “{_e(s.kind)}”. Every number comes from liftcore's {_e(s.kind)} study; "
        "the CSV file beside this report holds the same numbers.</footer>",
    ]
    return _page(title, "\n".join(b for b in body if b))


def _diff_table(head: list[str], rows: list[tuple[list[str], bool]], first_label: str) -> str:
    """A table whose rows marked ``differs`` are shaded, bold and start with ≠ (not colour alone)."""
    ths = "".join(f"<th>{_e(h)}</th>" for h in head)
    trs = []
    for cells, differs in rows:
        tds = []
        for i, c in enumerate(cells):
            if i == 0:
                tds.append(f"<td>{'≠ ' if differs else ''}{_e(c)}</td>")
            else:
                tds.append(f"<td class=\"num\">{_e(c)}</td>")
        trs.append(f"<tr class=\"{'differs' if differs else 'same'}\">{''.join(tds)}</tr>")
    return f"<table><thead><tr><th>{_e(first_label)}</th>{ths}</tr></thead><tbody>{''.join(trs)}</tbody></table>"


def comparison_report(runs: list[Run], title: str = "", note: str = "", unit_system: str = "SI") -> str:
    """The handout comparing options (grouped by kind): input differences highlighted, headline
    numbers with the difference to the first option, the overlaid key chart, warnings, sources."""
    system = unit_system
    title = title or "Options compared"
    body = [f"<header><h1>{_e(title)}{_invented_badge(title, note, *(r.name for r in runs))}</h1>",
            _meta_line(system, f"{len(runs)} option{'s' if len(runs) != 1 else ''}"),
            f"<p class=\"note\">{_e(note)}</p>" if note else "", "</header>"]
    for gi, (kind, group) in enumerate(group_by_kind(runs)):
        mod = study(kind)
        names = [r.name for r in group]
        body.append(f"<section class=\"group\"><h2>{_e(mod.TITLE)}: {len(group)} option"
                    f"{'s' if len(group) != 1 else ''}</h2>")
        for r in group:
            if r.note:
                body.append(f"<p class=\"note\"><b>{_e(r.name)}:</b> {_e(r.note)}</p>")
        hrows = headline_diff_rows(group, system)
        head = [names[0]] + [f"{n} (vs {names[0]})" for n in names[1:]]
        cells = [([f"{r['label']}", r["texts"][0]] + [f"{t}  ({d})" for t, d in zip(r["texts"][1:], r["diffs"][1:])],
                  r["differs"]) for r in hrows]
        body.append("<h3>Results</h3>" + _diff_table(head, [(c[0], c[1]) for c in cells], "Result"))
        irows = input_diff_rows(kind, group, system)
        changed = [r for r in irows if r["differs"]]
        body.append(f"<h3>Inputs that differ ({len(changed)} of {len(irows)})</h3>")
        body.append(_diff_table(names, [([r["label"] + (f" [{r['unit']}]" if r["unit"] else "")] + r["texts"], True)
                                        for r in changed], "Input") if changed
                    else "<p>All inputs are the same in every option.</p>")
        ov = overlay_figure(group, system)
        if ov is not None:
            body.append(f"<h3>Key chart</h3><figure class=\"chart\">{_figure_html(ov[1], f'ov{gi}')}"
                        f"<figcaption>{_e(ov[0])}</figcaption></figure>")
        else:
            for i, r in enumerate(group):
                kf = key_figure(kind, r.result, system)
                if kf is not None:
                    body.append(f"<h3>{_e(r.name)}: {_e(kf[0])}</h3><figure class=\"chart\">"
                                f"{_figure_html(kf[1], f'kf{gi}_{i}')}</figure>")
        body.append("<h3>Warnings</h3>")
        any_w = False
        for r in group:
            if r.result.warnings:
                any_w = True
                items = "".join(f"<li class=\"sev-{_e(w.severity)}\">{_e(w.text(system))}</li>" for w in r.result.warnings)
                body.append(f"<p><b>{_e(r.name)}</b></p><ul class=\"warnings\">{items}</ul>")
        if not any_w:
            body.append("<p>No model warnings for these options.</p>")
        cautions, sources = _sources_cautions(kind)
        body.append(f"<h3>Cautions</h3>{cautions or '<p>None stated.</p>'}")
        body.append(f"<h3>All inputs</h3>")
        body.append(_diff_table(names, [([r["label"] + (f" [{r['unit']}]" if r["unit"] else "")] + r["texts"],
                                         r["differs"]) for r in irows], "Input"))
        body.append(f"<h3>Sources of the models</h3>{sources}</section>")
    body.append("<footer>≠ and a shaded row mark values that differ between options. Differences are to "
                "the first option of each group. The CSV file beside this report holds the same numbers.</footer>")
    return _page(title, "\n".join(b for b in body if b))


# ----------------------------------------------------------------------------- CSV
def _csv_writer():
    buf = io.StringIO()
    return buf, SafeWriter(buf)


def _sig(x, digits: int = 12) -> float:
    """A display-unit value without the last-bit noise of unit conversion (12 significant digits)."""
    x = float(x)
    return float(f"{x:.{digits}g}") if x == x else x


def _num(x):
    if isinstance(x, float):
        return repr(x) if x == x else ""
    return x


def scenario_csv(s: Scenario, result: StudyResult, unit_system: str | None = None) -> str:
    """The numbers of a report as CSV blocks: inputs, headlines, warnings, then each table.

    Inputs and headlines are shown in ``unit_system`` with their unit and again in core units;
    the study's tables keep their own columns (units in the column names).
    """
    system = unit_system or s.unit_system
    buf, w = _csv_writer()
    w.writerow(["liftcore numbers", s.title or study(s.kind).TITLE])
    w.writerow(["kind", s.kind])
    w.writerow(["unit system", system])
    w.writerow([])
    w.writerow(["inputs"])
    w.writerow(["section", "input", "key", "value", "unit", "core value", "core unit"])
    for r in input_rows(s.kind, s.inputs, system):
        w.writerow([r["section"], r["label"], r["key"], r["text"], r["unit"], _num(r["core_value"]), r["core_unit"]])
    w.writerow([])
    w.writerow(["headlines"])
    w.writerow(["key", "headline", "value", "unit", "core value", "core unit"])
    for r in headline_rows(result, system):
        w.writerow([r["key"], r["label"], _num(_sig(r["value"])), r["unit"], _num(float(r["core_value"])),
                    r["core_unit"]])
    w.writerow([])
    w.writerow(["warnings"])
    w.writerow(["subject", "severity", "code", "message"])
    for wn in result.warnings:
        w.writerow([wn.subject, wn.severity, wn.code, wn.text(system)])
    out = [buf.getvalue()]
    for name, df in result.tables.items():
        out.append(f"\ntable,{_csv_cell(name)}\n")
        out.append(csv_text(df))
    return "".join(out)


def _csv_cell(text: str) -> str:
    buf, w = _csv_writer()
    w.writerow([text])
    return buf.getvalue().rstrip("\n")


def comparison_csv(runs: list[Run], unit_system: str = "SI") -> str:
    """Per kind, blocks titled ``inputs,<kind>`` (one column per option), ``headlines,<kind>``
    (values, then each option minus the first) and ``warnings,<kind>``."""
    buf, w = _csv_writer()
    w.writerow(["liftcore comparison", f"{len(runs)} options"])
    w.writerow(["unit system", unit_system])
    for kind, group in group_by_kind(runs):
        names = [r.name for r in group]
        w.writerow([])
        w.writerow(["inputs", kind])
        w.writerow(["input", "key", "unit", *names, "differs"])
        for r in input_diff_rows(kind, group, unit_system):
            w.writerow([r["label"], r["key"], r["unit"], *r["texts"], "yes" if r["differs"] else "no"])
        w.writerow([])
        w.writerow(["headlines", kind])
        w.writerow(["headline", "key", "unit", *names, *[f"{n} minus {names[0]}" for n in names[1:]]])
        for h0 in group[0].result.headlines:
            vals, diffs = [], []
            v0 = h0.shown(unit_system)[0]
            for r in group:
                try:
                    v = r.result.headline(h0.key).shown(unit_system)[0]
                except KeyError:
                    v = float("nan")
                vals.append(_num(_sig(v)))
                diffs.append(_num(_sig(v - v0)))
            w.writerow([h0.label, h0.key, h0.shown(unit_system)[1], *vals, *diffs[1:]])
        w.writerow([])
        w.writerow(["warnings", kind])
        w.writerow(["option", "subject", "severity", "code", "message"])
        for r in group:
            for wn in r.result.warnings:
                w.writerow([r.name, wn.subject, wn.severity, wn.code, wn.text(unit_system)])
    return buf.getvalue()
