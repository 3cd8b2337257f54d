"""``python -m liftcore flight``: JSON contract, agreement with the study, one-line errors."""

import json
import subprocess
import sys

import pytest
from numpy.testing import assert_allclose

from liftcore.cli import main
from liftcore.studies import run_study

KEYS = {"carry_m", "peak_height_m", "flight_time_s", "lateral_m", "descent_angle_deg",
        "landing_speed_m_s", "warnings"}


def run_cli(capsys, *argv):
    code = main(["flight", *argv])
    out = capsys.readouterr()
    return code, out.out, out.err


def test_json_keys_and_agreement_with_the_study(capsys):
    code, out, err = run_cli(capsys, "--ball", "golf", "--speed-m-s", "70", "--elevation-deg", "11",
                             "--spin-rpm", "2700", "--spin-axis-deg", "10", "--azimuth-deg", "-2",
                             "--wind-speed-m-s", "4", "--wind-from-deg", "90", "--json")
    assert code == 0, err
    data = json.loads(out)
    assert KEYS <= set(data)
    study = run_study("flight", {"ball": "golf", "speed_m_s": 70.0, "elevation_deg": 11.0, "spin_rpm": 2700.0,
                                 "spin_axis_deg": 10.0, "azimuth_deg": -2.0, "wind_speed_m_s": 4.0,
                                 "wind_from_deg": 90.0})
    for k in KEYS - {"warnings"}:
        assert_allclose(data[k], study.json[k], rtol=1e-9)
    assert err == ""


def test_density_zero_is_vacuum(capsys):
    code, out, _ = run_cli(capsys, "--ball", "tennis", "--speed-m-s", "20", "--elevation-deg", "45",
                           "--spin-rpm", "2000", "--launch-height-m", "0", "--density-kg-m3", "0", "--json")
    assert code == 0
    # analytic vacuum range v^2 sin(2 theta) / g with g = 9.80665 m/s^2
    assert_allclose(json.loads(out)["carry_m"], 400.0 / 9.80665, rtol=1e-9)


def test_altitude_option_makes_a_baseball_carry_farther(capsys):
    base = ["--ball", "baseball", "--speed-m-s", "44.704", "--elevation-deg", "28", "--spin-rpm", "2000", "--json"]
    _, sea, _ = run_cli(capsys, *base)
    _, high, _ = run_cli(capsys, *base, "--altitude-m", "1600")
    # Meyer & Bohn (2008), "Influence of a humidor on the aerodynamics of baseballs", Am. J. Phys. 76,
    # Sec. I: a typical home run goes 400 ft at sea level and 420 ft one mile up (5 % farther)
    assert 1.03 < json.loads(high)["carry_m"] / json.loads(sea)["carry_m"] < 1.08


def test_dispersion_keys_and_progress_on_stderr_only(capsys):
    code, out, err = run_cli(capsys, "--ball", "golf", "--speed-m-s", "65", "--elevation-deg", "12",
                             "--spin-rpm", "2600", "--dispersion", "3000", "--seed", "4", "--json")
    assert code == 0
    d = json.loads(out)["dispersion"]
    assert set(d) == {"n", "carry_m_p05", "carry_m_p50", "carry_m_p95", "lateral_m_sd"}
    assert d["n"] == 3000 and d["carry_m_p05"] < d["carry_m_p50"] < d["carry_m_p95"]
    assert "%" in err  # progress went to stderr, the JSON stayed clean


@pytest.mark.parametrize("argv, message", [
    (["--ball", "frisbee", "--speed-m-s", "10", "--elevation-deg", "10", "--spin-rpm", "0"],
     "liftcore: ball must be one of baseball, softball, golf, soccer, tennis, cricket, volleyball, table_tennis, custom (got 'frisbee')"),
    (["--ball", "golf", "--speed-m-s", "-5", "--elevation-deg", "10", "--spin-rpm", "0"],
     "liftcore: speed-m-s must be between 0 and 150 m/s (got -5 m/s)"),
    (["--ball", "golf", "--speed-m-s", "nan", "--elevation-deg", "10", "--spin-rpm", "0"],
     "liftcore: speed-m-s must be a finite number between 0 and 150 m/s (got nan)"),
    (["--ball", "golf", "--speed-m-s", "30", "--elevation-deg", "91", "--spin-rpm", "0"],
     "liftcore: elevation-deg must be between -90 and 90 deg (got 91 deg)"),
    (["--ball", "golf", "--speed-m-s", "30", "--elevation-deg", "-90.5", "--spin-rpm", "0"],
     "liftcore: elevation-deg must be between -90 and 90 deg (got -90.5 deg)"),
])
def test_bad_input_exits_2_with_one_line(capsys, argv, message):
    code, out, err = run_cli(capsys, *argv)
    assert code == 2
    assert out == ""
    assert err.strip() == message


def test_command_runs_as_a_module():
    p = subprocess.run([sys.executable, "-m", "liftcore", "flight", "--ball", "soccer", "--speed-m-s", "25",
                        "--elevation-deg", "18", "--spin-rpm", "500", "--spin-axis-deg", "-90"],
                       capture_output=True, text=True, timeout=60)
    assert p.returncode == 0, p.stderr
    assert "Carry" in p.stdout and "not for safety distances" in p.stdout


def test_a_flight_command_imports_only_what_it_needs():
    """Start-up: a one-flight run loads no table, chart or unit library (their import alone took
    more than the flight; see benchmarks/bench_startup.py for the timing side by side)."""
    code = ("import sys; from liftcore.cli import main; "
            "rc = main(['flight', '--ball', 'golf', '--speed-m-s', '65', '--elevation-deg', '12', "
            "'--spin-rpm', '2700', '--dispersion', '50', '--json']); "
            "print(rc, sorted({m.split('.')[0] for m in sys.modules} & "
            "{'pandas', 'plotly', 'pint', 'dask', 'streamlit'}), file=sys.stderr)")
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=60)
    assert done.stderr.strip().splitlines()[-1] == "0 []", done.stderr


def test_help_lists_every_command_without_importing_them(capsys):
    with pytest.raises(SystemExit):
        main(["--help"])
    out = capsys.readouterr().out
    for name in ("air", "flow", "rotor", "voyage", "flight", "run"):
        assert name in out
