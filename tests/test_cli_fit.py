"""``liftcore fit``: the fit of tracked flights on the command line agrees with the page's fit."""

import json

import pytest

from liftcore import ballflight as bf
from liftcore.cli import main
from liftcore.studies import flight, run_study


def run(capsys, *argv):
    code = main(["fit", *argv])
    out, err = capsys.readouterr()
    return code, out, err


def test_the_demo_fit_finds_the_coefficients_the_tracks_were_made_with(capsys):
    code, out, err = run(capsys, "--demo-tracks", "--json")
    assert code == 0 and "%" in err  # progress on stderr, clean JSON on stdout
    d = json.loads(out)
    page = flight.track_fit(flight.INPUTS.validate({}), None)
    for name in ("CD", "CL"):
        value, sd = page.parameter(name)
        assert d["coefficients"][name] == {"value": pytest.approx(value), "sd": pytest.approx(sd)}
        # the invented tracks were made with known constants: found within three sigma
        assert abs(value - bf.DEMO_TRACKS[name.lower()]) < 3 * sd


def test_a_curve_fit_saved_as_a_table_flies_again(capsys, tmp_path):
    table = tmp_path / "curves.csv"
    code, out, _ = run(capsys, "--demo-tracks", "--mode", "curve", "--save-table", str(table), "--json")
    assert code == 0 and json.loads(out)["table_written"] == str(table)
    assert table.read_text().startswith("S,CD,CL\n")
    launch = ["flight", "--ball", "baseball", "--speed-m-s", "40", "--elevation-deg", "25", "--spin-rpm", "1800"]
    assert main(launch + ["--aero-table", str(table), "--json"]) == 0
    carry = json.loads(capsys.readouterr().out)["carry_m"]
    same = run_study("flight", {"ball": "baseball", "speed_m_s": 40.0, "elevation_deg": 25.0, "spin_rpm": 1800.0,
                                "wind_speed_m_s": 0.0, "coefficient_model": "table",
                                "aero_table_csv": table.read_text()})
    assert carry == pytest.approx(same.json["carry_m"], rel=1e-12)


def test_your_own_tracks_are_fitted_with_your_ball_and_spin(capsys, tmp_path):
    tracks = tmp_path / "tracks.csv"
    bf.write_demo_tracks(tracks)
    code, out, _ = run(capsys, "--tracks", str(tracks), "--ball", "baseball", "--spin-rpm",
                       str(bf.DEMO_TRACKS["spin_rpm"]), "--json")
    assert code == 0
    d = json.loads(out)
    assert abs(d["coefficients"]["CD"]["value"] - bf.DEMO_TRACKS["cd"]) < 3 * d["coefficients"]["CD"]["sd"]


@pytest.mark.parametrize("argv, message", [
    (["--demo-tracks", "--save-table", "x.csv"], "--save-table needs --mode curve"),
    (["--tracks", "t.csv"], "--spin-rpm is needed with --tracks"),
    (["--tracks", "/no/such/tracks.csv", "--spin-rpm", "1800"], "cannot read tracks file"),
    (["--demo-tracks", "--spin-rpm", "-5"], "--spin-rpm: Spin rate must be between 0 and 20000 rpm (got -5 rpm)"),
    ([], "one of the arguments --tracks --demo-tracks is required"),
])
def test_bad_input_exits_2_with_one_line(capsys, argv, message):
    code, out, err = run(capsys, *argv)
    assert code == 2 and out == ""
    assert message in err and err.count("\n") == 1
