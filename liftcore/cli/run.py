"""``liftcore run``: run a scenario or comparison file; optionally write the HTML handout and CSV.

    python -m liftcore run SCENARIO.toml [--json] [--report FILE.html] [--csv FILE.csv]
                                         [--units SI|marine|imperial]

``--json`` prints the study's JSON keys plus ``warnings`` (for a comparison: one entry per
option under ``options``). Progress of long work goes to stderr.
"""

from __future__ import annotations

from pathlib import Path

from liftcore import units
from liftcore.cli import add_json_flag
from liftcore.cli.common import text_table
from liftcore.errors import InputError
from liftcore.files import check_outputs, write_atomic
from liftcore.report import (comparison_csv, comparison_report, difference_text, group_by_kind,
                             run_comparison, run_scenario, scenario_csv, scenario_report)
from liftcore.scenario import MAX_SCENARIO_BYTES, Comparison, load_document
from liftcore.studies import study


def add_parser(sub):
    p = sub.add_parser("run", help="run a scenario or comparison file (.toml)",
                       description="Run a scenario file (any study kind) or a comparison file and "
                                   "print its results; optionally write a self-contained HTML report "
                                   f"and a CSV of the numbers. Files above {MAX_SCENARIO_BYTES} bytes "
                                   "are refused.")
    p.add_argument("scenario", metavar="SCENARIO.toml", help="scenario or comparison file")
    p.add_argument("--report", metavar="FILE.html", help="write the HTML handout to this file")
    p.add_argument("--csv", metavar="FILE.csv", help="write the numbers (inputs, results, tables) as CSV")
    p.add_argument("--units", choices=units.UNIT_SYSTEMS, default=None,
                   help="unit system of the text, report and CSV (default: the file's unit_system)")
    add_json_flag(p)
    return p


def _check_target(path: str | None, option: str) -> Path | None:
    if path is None:
        return None
    p = Path(path)
    if p.is_dir():
        raise InputError(option, f"--{option} {path} is a folder; give a file name")
    if not p.parent.is_dir():
        raise InputError(option, f"--{option} {path}: folder {p.parent} does not exist")
    return p


def execute(args, progress):
    path = Path(args.scenario)
    report_path = _check_target(args.report, "report")
    csv_path = _check_target(args.csv, "csv")
    # refused before anything runs: an output onto the scenario, or two outputs onto one file
    check_outputs({"--report": report_path, "--csv": csv_path}, {"SCENARIO": path})
    doc = load_document(path)  # a regular file only, at most MAX_SCENARIO_BYTES
    system = args.units or doc.unit_system
    if isinstance(doc, Comparison):
        data, text, runs = _comparison(doc, system, progress)
        html = comparison_report(runs, doc.title, doc.note, system) if report_path else None
        csv_text = comparison_csv(runs, system) if csv_path else None
    else:
        result = run_scenario(doc, progress=progress)
        data = dict(result.json)
        data["warnings"] = [w.as_dict() for w in result.warnings]
        mod = study(doc.kind)
        rows = [(h.label, h.text(system)) for h in result.headlines]
        lines = [f"{doc.title or mod.TITLE}  [{mod.TITLE}; {system} units]"]
        if doc.note:
            lines.append(doc.note)
        lines += ["", text_table(rows)]
        if result.warnings:
            lines += ["", "Warnings:"] + [f"  - {w.text(system)}" for w in result.warnings]
        lines += ["", "Cautions:"] + [f"  - {c}" for c in getattr(mod, "CAUTIONS", ())]
        text = "\n".join(lines)
        html = scenario_report(doc, result, system) if report_path else None
        csv_text = scenario_csv(doc, result, system) if csv_path else None
    if doc.migrated_from is not None:
        text = (f"(read a schema_version {doc.migrated_from} file; saving it again from the dashboard "
                "writes the current version)\n") + text
    if report_path:
        write_atomic(report_path, html, "--report")
        text += f"\n\nReport written to {report_path}"
    if csv_path:
        write_atomic(csv_path, csv_text, "--csv")
        text += f"\nNumbers written to {csv_path}"
    return data, text


def _comparison(doc: Comparison, system: str, progress):
    runs = run_comparison(doc, progress=progress)
    data = {"kind": doc.kind, "title": doc.title, "options": []}
    for r in runs:
        entry = {"name": r.name}
        entry.update(r.result.json)
        entry["warnings"] = [w.as_dict() for w in r.result.warnings]
        data["options"].append(entry)
    mod = study(doc.kind)
    lines = [f"{doc.title or 'Options compared'}  [{mod.TITLE}; {len(runs)} options; {system} units]"]
    if doc.note:
        lines.append(doc.note)
    for kind, group in group_by_kind(runs):
        first = group[0]
        header = ["Result"] + [r.name for r in group]
        table = [header]
        for h0 in first.result.headlines:
            row = [h0.label, h0.text(system)]
            for r in group[1:]:
                try:
                    h = r.result.headline(h0.key)
                    row.append(f"{h.text(system)} ({difference_text(h0, h, system)})")
                except KeyError:
                    row.append("–")
            table.append(row)
        widths = [max(len(str(row[i])) for row in table) for i in range(len(header))]
        lines.append("")
        lines += ["  ".join(str(c).ljust(w) for c, w in zip(row, widths)).rstrip() for row in table]
        lines.append(f"(differences in brackets are to {first.name})")
    for r in runs:
        for w in r.result.warnings:
            lines.append(f"Warning ({r.name}): {w.text(system)}")
    lines += ["", "Cautions:"] + [f"  - {c}" for c in getattr(mod, "CAUTIONS", ())]
    return data, "\n".join(lines), runs
