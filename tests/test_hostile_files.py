"""Hostile input at the edges where files, links and uploads come in (each case failed on the
code before the fix): oversized loops refused before they are built, spreadsheet formulas
neutralised in every CSV, outputs that never land on an input or on each other, reads that never
leave a regular file or its byte cap, results keyed on what they show."""

import csv
import io
import os
import subprocess
import sys
from pathlib import Path

import pandas as pd
import pytest

from liftcore import fieldcirc as fc
from liftcore.cli import main
from liftcore.errors import InputError
from liftcore.files import csv_text, safe_cell
from liftcore.report import comparison_csv, run_comparison, scenario_csv
from liftcore.scenario import Comparison, Option, Scenario, load_document
from liftcore.studies import run_study
from liftcore.studies import field as field_study

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "scenarios" / "rotor_demo_invented.toml"
FORMULA = '=HYPERLINK("http://example.invalid","click")'


# ----------------------------------------------------------------------------- memory bounds
@pytest.mark.parametrize("over", [{"loop_max_m": 10000.0}, {"loop_count": 200, "loop_max_m": 100.0}])
def test_loops_too_large_for_the_grid_are_refused_before_any_is_built(monkeypatch, over):
    built = []
    real = fc.circle_loop
    monkeypatch.setattr(fc, "circle_loop", lambda *a, **k: built.append(a) or real(*a, **k))
    values = field_study.INPUTS.validate({**field_study.INPUTS.defaults(), **over})
    with pytest.raises(InputError, match="leaves the measured grid"):
        run_study("field", values)
    assert built == []


def test_the_loops_points_have_a_stated_bound(monkeypatch):
    monkeypatch.setattr(fc, "MAX_LOOP_POINTS", 1000)
    values = field_study.INPUTS.validate(field_study.INPUTS.defaults())
    with pytest.raises(InputError, match="at most 1,000 are used"):
        run_study("field", values)


# ----------------------------------------------------------------------------- CSV formulas
@pytest.mark.parametrize("text", ["=1+2", "+cmd", "-2+3", "@SUM(A1)", "\tx", "\rx", FORMULA])
def test_formula_cells_get_an_apostrophe(text):
    assert safe_cell(text) == "'" + text


@pytest.mark.parametrize("value", ["-5", "+1e3", "-inf", "12", -5.0, 3, "plain text"])
def test_numbers_and_plain_text_are_unchanged(value):
    assert safe_cell(value) == value


def _cells(text: str) -> list[str]:
    return [c for row in csv.reader(io.StringIO(text)) for c in row]


def test_scenario_csv_neutralises_a_formula_title_and_keeps_negative_numbers():
    s = Scenario(kind="rotor", title=FORMULA, inputs={})
    result = run_study("rotor", {})
    cells = _cells(scenario_csv(s, result))
    assert "'" + FORMULA in cells and FORMULA not in cells
    assert any(c.startswith("-") and c[1:2].isdigit() for c in cells)  # the heeling moment, as a number


def test_comparison_csv_neutralises_option_names():
    from liftcore.studies import rotor as rotor_study

    base = rotor_study.INPUTS.validate({})
    doc = Comparison(kind="rotor", options=(Option(name="=cmd|' /C calc'!A0", inputs=base),
                                            Option(name="B", inputs={**base, "diameter_m": 4.0})))
    cells = _cells(comparison_csv(run_comparison(doc)))
    assert not any(c.startswith("=") for c in cells)


def test_table_downloads_neutralise_text_cells_and_column_names():
    df = pd.DataFrame({"leg": ["=evil()", "North"], "-x": [-1.5, 2.0]})
    cells = _cells(csv_text(df))
    assert cells == ["leg", "'-x", "'=evil()", "-1.5", "North", "2.0"]


# ----------------------------------------------------------------------------- outputs
def test_report_and_csv_onto_one_file_are_refused(tmp_path, capsys):
    out = tmp_path / "o"
    assert main(["run", str(DEMO), "--report", str(out), "--csv", str(out)]) == 2
    assert "same file as --report" in capsys.readouterr().err
    assert not out.exists()


def test_a_hard_link_to_the_scenario_is_not_overwritten(tmp_path, capsys):
    scenario = tmp_path / "s.toml"
    scenario.write_bytes(DEMO.read_bytes())
    link = tmp_path / "report.html"
    os.link(scenario, link)
    assert main(["run", str(scenario), "--report", str(link)]) == 2
    assert "input file SCENARIO itself" in capsys.readouterr().err
    assert scenario.read_bytes() == DEMO.read_bytes()


def test_outputs_are_written_whole_with_no_temporary_files_left(tmp_path, capsys):
    report, numbers = tmp_path / "r.html", tmp_path / "n.csv"
    assert main(["run", str(DEMO), "--report", str(report), "--csv", str(numbers)]) == 0
    assert report.read_text().rstrip().endswith("</html>") and numbers.read_text().startswith("liftcore numbers")
    assert sorted(p.name for p in tmp_path.iterdir()) == ["n.csv", "r.html"]


# ----------------------------------------------------------------------------- reads
ROTOR = ["rotor", "--diameter-m", "5", "--height-m", "30", "--ship-speed-kn", "12",
         "--true-wind-speed-kn", "20", "--true-wind-angle-deg", "90"]
VOYAGE = ["voyage", "--diameter-m", "5", "--height-m", "30", "--rotors", "2", "--fuel", "hfo",
          "--ship-speed-kn", "12", "--hours-at-sea", "6000"]


def _run(args, timeout=60):
    """The command in a child process (a hang or a memory blow-up cannot take the suite down)."""
    return subprocess.run([sys.executable, "-m", "liftcore", *args], capture_output=True, text=True,
                          timeout=timeout, cwd=ROOT)


@pytest.mark.parametrize("args", [ROTOR + ["--coefficients", "/dev/zero"],
                                  VOYAGE + ["--coefficients", "/dev/zero", "--wind-table", "x.csv"],
                                  VOYAGE + ["--wind-table", "/dev/zero"],
                                  VOYAGE + ["--weibull", "/dev/zero", "--course-deg", "10"],
                                  VOYAGE + ["--wind-series", "/dev/zero"],
                                  ["run", "/dev/zero"]])
def test_a_device_is_refused_unread(args):
    out = _run(args)
    assert out.returncode == 2, out.stderr
    assert "it is a device; give a regular file" in out.stderr


@pytest.mark.parametrize("option", ["--wind-table", "--wind-series"])
def test_a_named_pipe_is_refused_without_hanging(tmp_path, option):
    fifo = tmp_path / "pipe.csv"
    os.mkfifo(fifo)
    out = _run(VOYAGE + [option, str(fifo)], timeout=30)
    assert out.returncode == 2 and "it is a named pipe" in out.stderr


def test_file_system_errors_exit_2_with_one_line(tmp_path):
    loop = tmp_path / "loop.csv"
    os.symlink(loop, loop)
    plain = tmp_path / "plain.txt"
    plain.write_text("x")
    for path in (str(loop), str(plain / "inside.csv"), str(tmp_path / ("n" * 300 + ".csv"))):
        for args in (VOYAGE + ["--wind-table", path], ["run", path], ROTOR + ["--coefficients", path]):
            out = _run(args)
            assert out.returncode == 2, (args, out.stderr)
            assert "Traceback" not in out.stderr and len(out.stderr.strip().splitlines()) == 1
            assert len(out.stderr) < 300


def test_a_scenario_is_read_up_to_its_cap_only(tmp_path):
    big = tmp_path / "big.toml"
    big.write_bytes(b"#" * 2_000_000)
    with pytest.raises(InputError, match="at most 1,000,000 are read"):
        load_document(big)


# ----------------------------------------------------------------------------- caches
def test_result_cache_keys_on_the_uploaded_file_name():
    from views.results import content_key

    a = pd.DataFrame({"x": [1.0]})
    b = a.copy()
    a.attrs["source_name"], b.attrs["source_name"] = "first_user.csv", "second_user.csv"
    assert content_key("voyage", {}, a) != content_key("voyage", {}, b)


def test_the_same_bytes_under_two_names_give_two_data_notes():
    from liftcore.studies import voyage as study
    from liftcore import windstats

    data = study.DEMO_FILES["table"].read_bytes()
    notes = []
    for name in ("first_user.csv", "second_user.csv"):
        df = windstats.read_csv_frame(data, name)
        df.attrs["source_name"] = name
        notes.append(study.data_note(run_study("voyage", {"sweep": False, "published_spread": False}, extra=df)))
    assert "first_user.csv" in notes[0] and "second_user.csv" in notes[1]
