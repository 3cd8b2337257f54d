"""``python -m liftcore run``: any scenario kind and comparison files, JSON, report, CSV, and one-line
refusals with exit status 2. Expected numbers come from a direct call of the same study."""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest

from liftcore.cli import main
from liftcore.scenario import load_document
from liftcore.studies import run_study
from tests import demo_study

ROOT = Path(__file__).resolve().parents[1]
SCENARIOS = sorted((ROOT / "scenarios").glob("*.toml"))

DEMO = """schema_version = 2
kind = "demo"
title = "Invented demo"
unit_system = "marine"
[inputs]
diameter_m = 3.0
spin_rpm = 700.0
"""
COMPARE = """schema_version = 2
kind = "demo"
title = "Two sizes, invented"
[inputs]
spin_rpm = 200.0
[[options]]
name = "Small"
[options.inputs]
diameter_m = 2.0
[[options]]
name = "Large"
[options.inputs]
diameter_m = 4.0
"""


@pytest.fixture(autouse=True)
def demo(monkeypatch):
    demo_study.register(monkeypatch)


def write(tmp_path, text, name="s.toml"):
    p = tmp_path / name
    p.write_bytes(text if isinstance(text, bytes) else text.encode())
    return p


def test_json_is_the_study_json_plus_warnings(tmp_path, capsys):
    p = write(tmp_path, DEMO)
    assert main(["run", str(p), "--json"]) == 0
    out, err = capsys.readouterr()
    data = json.loads(out)
    res = run_study("demo", load_document(p).inputs)
    assert data == {**res.json, "warnings": [w.as_dict() for w in res.warnings]}
    assert data["warnings"][0]["code"] == "spin_ratio_high"
    assert "%" in err  # progress went to stderr, not into the JSON


def test_text_uses_the_files_unit_system_unless_told(tmp_path, capsys):
    p = write(tmp_path, DEMO)
    res = run_study("demo", load_document(p).inputs)
    assert main(["run", str(p)]) == 0
    out = capsys.readouterr().out
    assert res.headline("lift_n").text("marine") in out and "kN" in out
    assert demo_study.CAUTIONS[0] in out
    assert main(["run", str(p), "--units", "imperial"]) == 0
    assert res.headline("lift_n").text("imperial") in capsys.readouterr().out


def test_report_and_csv_are_written(tmp_path, capsys):
    p = write(tmp_path, DEMO)
    html, csv = tmp_path / "r.html", tmp_path / "n.csv"
    assert main(["run", str(p), "--report", str(html), "--csv", str(csv)]) == 0
    text = html.read_text()
    assert text.startswith("<!DOCTYPE html>") and "Invented demo" in text
    assert "lift_n" in csv.read_text()
    assert f"Report written to {html}" in capsys.readouterr().out


def test_comparison_runs_every_option(tmp_path, capsys):
    p = write(tmp_path, COMPARE)
    html = tmp_path / "c.html"
    assert main(["run", str(p), "--json", "--report", str(html)]) == 0
    data = json.loads(capsys.readouterr().out)
    assert [o["name"] for o in data["options"]] == ["Small", "Large"]
    doc = load_document(p)
    for o, opt in zip(data["options"], doc.options):
        assert o["lift_n"] == run_study("demo", opt.inputs).json["lift_n"]
    assert "Inputs that differ (1 of 9)" in html.read_text()
    assert main(["run", str(p)]) == 0
    assert "(differences in brackets are to Small)" in capsys.readouterr().out


def test_old_version_is_read_and_said(tmp_path, capsys):
    p = write(tmp_path, 'schema_version = 1\nkind = "demo"\n')
    assert main(["run", str(p)]) == 0
    assert "read a schema_version 1 file" in capsys.readouterr().out


@pytest.mark.parametrize("content, args, message", [
    (b"\x00\x01\x02junk", [], "s.toml is binary data"),
    ("schema_version = 2\nkind = [", [], "s.toml is not valid TOML"),
    ('schema_version = 9\nkind = "demo"', [], "s.toml has schema_version 9, newer than this liftcore reads"),
    ('schema_version = 2\nkind = "demo"\n[inputs]\ndiameter_m = nan', [], "must be a finite number"),
    ('schema_version = 2\nkind = "demo"\n[inputs]\ndiameter_m = 99.0', [], "must be between 0.1 and 20 m (got 99 m)"),
    ('schema_version = 2\nkind = "demo"\n[inputs]\nsize = 1', [], "unknown key 'size'"),
    (DEMO, ["--report", "/no/such/folder/r.html"], "--report /no/such/folder/r.html: folder /no/such/folder does not exist"),
    (DEMO, ["--units", "metric"], "argument --units: invalid choice: 'metric'"),
])
def test_bad_input_exits_2_with_one_line(tmp_path, capsys, content, args, message):
    p = write(tmp_path, content)
    assert main(["run", str(p), *args]) == 2
    out, err = capsys.readouterr()
    assert out == ""
    lines = [ln for ln in err.splitlines() if ln.strip()]
    assert len(lines) == 1 and message in lines[0], err


def test_missing_file_and_oversized_file(tmp_path, capsys):
    assert main(["run", str(tmp_path / "none.toml")]) == 2
    assert "cannot read" in capsys.readouterr().err
    big = tmp_path / "big.toml"
    with big.open("wb") as fh:
        fh.truncate(50_000_000)
    assert main(["run", str(big)]) == 2
    assert "scenario file big.toml is 50,000,000 bytes; at most 1,000,000 are read" in capsys.readouterr().err


def test_report_never_overwrites_the_scenario(tmp_path, capsys):
    p = write(tmp_path, DEMO)
    assert main(["run", str(p), "--report", str(p)]) == 2
    assert "is the input file SCENARIO itself; choose another name" in capsys.readouterr().err
    assert p.read_text() == DEMO


@pytest.mark.parametrize("path", SCENARIOS, ids=[p.name for p in SCENARIOS])
def test_every_shipped_scenario_runs_and_reports(path, tmp_path, capsys):
    html, csv = tmp_path / "r.html", tmp_path / "n.csv"
    assert main(["run", str(path), "--json", "--report", str(html), "--csv", str(csv)]) == 0
    data = json.loads(capsys.readouterr().out)
    assert "warnings" in data or "options" in data
    text = html.read_text()
    assert text.startswith("<!DOCTYPE html>") and "<script src=" not in text
    assert csv.stat().st_size > 0


def test_the_module_entry_point_refuses_junk_with_exit_2(tmp_path):
    junk = tmp_path / "junk.toml"
    junk.write_bytes(bytes(range(256)) * 10)
    out = subprocess.run([sys.executable, "-m", "liftcore", "run", str(junk), "--json"],
                         capture_output=True, text=True, cwd=ROOT, timeout=120)
    assert out.returncode == 2 and out.stdout == ""
    assert out.stderr.strip() == "liftcore: junk.toml is binary data, not a scenario .toml text file"
