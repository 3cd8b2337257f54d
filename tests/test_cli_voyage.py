"""``python -m liftcore voyage``: keys, agreement with the single-condition rotor result, errors."""

import json
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest
from numpy.testing import assert_allclose

from liftcore import rotor
from liftcore import rotor_inputs
from liftcore.cli import main
from liftcore.studies import run_study
from liftcore.studies import voyage as study

ROOT = Path(__file__).resolve().parents[1]
KEYS = ("mean_net_power_kw", "mean_thrust_kn", "annual_energy_saved_mwh", "annual_fuel_saved_t",
        "annual_co2_avoided_t", "annual_cost_saved", "running_share", "warnings")
BASE = ["voyage", "--diameter-m", "5", "--height-m", "30", "--rotors", "2", "--fuel", "hfo"]


def run_cli(capsys, args):
    code = main(args)
    out, err = capsys.readouterr()
    return code, out, err


def test_json_keys_and_progress_on_stderr_only(capsys):
    code, out, err = run_cli(capsys, BASE + ["--ship-speed-kn", "12", "--wind-table",
                                             str(study.DEMO_FILES["table"]), "--hours-at-sea", "6000", "--json"])
    assert code == 0
    data = json.loads(out)  # nothing but JSON on stdout
    for key in KEYS:
        assert key in data
    assert "%" in err  # the progress line went to stderr
    r = run_study("voyage", {"wind_kind": "table", "sweep": False, "rotor_count": 2, "hull_balance": False,
                             "ship_speed_m_s": 12 * (1852 / 3600), "hours_at_sea_h": 6000.0})
    # the command checks its inputs in marine units (as the rotor command does): the unit round
    # trip moves inputs by ~1e-16, which the best-spin search may carry to ~1e-10
    assert_allclose(data["annual_fuel_saved_t"], r.json["annual_fuel_saved_t"], rtol=1e-9)


@pytest.mark.parametrize("angle, speed", [(90.0, 10.0), (-135.0, 14.0), (20.0, 7.0)])
def test_one_row_table_equals_the_single_condition_rotor_result(capsys, tmp_path, angle, speed):
    table = tmp_path / "one.csv"
    table.write_text(f"true_wind_angle_deg,true_wind_speed_m_s,probability\n{angle},{speed},1\n")
    code, out, _ = run_cli(capsys, BASE + ["--ship-speed-kn", "11", "--wind-table", str(table),
                                           "--hours-at-sea", "5000", "--max-rpm", "200",
                                           "--wind-profile", "power", "--json"])
    assert code == 0
    data = json.loads(out)
    setup = rotor_inputs.setup_from_inputs({"diameter_m": 5.0, "height_m": 30.0, "rotor_count": 2,
                                     "max_rpm": 200.0, "wind_profile": "power", "hull_balance": False})
    op = rotor.best_operation(setup, 11 * 1852 / 3600, speed, np.radians(angle))
    assert_allclose(data["mean_net_power_kw"], float(op.net_power_w) / 1000, rtol=1e-12)
    assert_allclose(data["mean_thrust_kn"], float(op.thrust_n) / 1000, rtol=1e-12)
    # analytic: a single condition held for 5000 h
    assert_allclose(data["annual_energy_saved_mwh"], float(op.net_power_w) / 1e6 * 5000, rtol=1e-12)
    assert data["running_share"] == (1.0 if int(op.state) > 0 else 0.0)


@pytest.mark.parametrize("angle, speed_m_s", [(90.0, 10.0), (-60.0, 6.0)])
def test_one_row_table_equals_the_rotor_command(capsys, tmp_path, angle, speed_m_s):
    table = tmp_path / "one.csv"
    table.write_text(f"true_wind_angle_deg,true_wind_speed_m_s,probability\n{angle},{speed_m_s},1\n")
    shared = ["--diameter-m", "4", "--height-m", "26", "--rotors", "3", "--ship-speed-kn", "13",
              "--max-motor-power-kw", "120", "--coefficients", "gerhardt_2022",
              "--temperature-c", "25", "--pressure-pa", "100500", "--json"]
    code, out, _ = run_cli(capsys, ["voyage", "--fuel", "mdo", "--wind-table", str(table),
                                    "--hours-at-sea", "4000"] + shared)
    assert code == 0
    voyage = json.loads(out)
    # the rotor command takes the wind in knots: 1 kn = 1852/3600 m/s
    code, out, _ = run_cli(capsys, ["rotor", "--true-wind-speed-kn", repr(speed_m_s / (1852 / 3600)),
                                    "--true-wind-angle-deg", str(angle)] + shared)
    assert code == 0
    single = json.loads(out)
    assert_allclose(voyage["mean_net_power_kw"], single["net_power_kw"], rtol=1e-9)
    assert_allclose(voyage["mean_thrust_kn"], single["thrust_n"] / 1000, rtol=1e-9)
    assert_allclose(voyage["peak_heeling_moment_knm"], abs(single["heeling_moment_knm"]), rtol=1e-9)


def _table(tmp_path, body, name="trade.csv"):
    p = tmp_path / name
    p.write_text(body)
    return p


HEAD = "true_wind_angle_deg,true_wind_speed_m_s,probability\n"


@pytest.mark.parametrize("body, message", [
    (None, "liftcore: cannot read missing.csv: file not found"),
    ("angle,speed,probability\n0,5,1\n",
     "liftcore: trade.csv: missing columns 'true_wind_angle_deg', 'true_wind_speed_m_s'; a joint wind "
     "table needs columns true_wind_angle_deg, true_wind_speed_m_s, probability (found angle, speed, probability)"),
    (HEAD + "0,5,0.5\n90,8,0.45\n",
     "liftcore: trade.csv: column probability sums to 0.95; it must sum to 1 within 1e-06 (divide each "
     "value by the total, or by 100 if they are percentages)"),
    (HEAD + "0,5,0.5\n90,-8,0.5\n",
     "liftcore: trade.csv, row 2: true_wind_speed_m_s must be between 0 and 80 m/s (got -8 m/s)"),
    (HEAD + "0,5,0.5\nnan,8,0.5\n",
     "liftcore: trade.csv, row 2: true_wind_angle_deg must be a number between -180 and 360 deg (got 'empty')"),
    (HEAD + "0,5,0.5\n90,8,\n",
     "liftcore: trade.csv, row 2: probability must be a number between 0 and 1 (got 'empty')"),
])
def test_bad_tables_exit_2_with_one_line(capsys, tmp_path, body, message):
    path = "missing.csv" if body is None else str(_table(tmp_path, body))
    code, out, err = run_cli(capsys, BASE + ["--ship-speed-kn", "12", "--wind-table", path,
                                             "--hours-at-sea", "6000"])
    assert code == 2 and out == ""
    lines = [ln for ln in err.split("\n") if ln.strip()]
    assert lines[-1].split("\r")[-1] == message
    assert "Traceback" not in err


@pytest.mark.parametrize("extra, message", [
    (["--hours-at-sea", "6000"], "liftcore: give --ship-speed-kn (or --speed-profile) for a wind table or Weibull input"),
    (["--ship-speed-kn", "12"], "liftcore: give --hours-at-sea (hours at sea per year, 1 to 8760 h)"),
    (["--ship-speed-kn", "12", "--hours-at-sea", "9000"],
     "liftcore: --hours-at-sea: Hours at sea per year must be between 1 and 8760 h (got 9000 h)"),
    (["--ship-speed-kn", "12", "--hours-at-sea", "6000", "--max-rpm", "-3"],
     "liftcore: --max-rpm: Maximum rotor speed must be between 1 and 1000 rpm (got -3 rpm)"),
    (["--ship-speed-kn", "12", "--hours-at-sea", "6000", "--coefficients", "nothing"],
     "liftcore: --coefficients must be one of potential_flow, bordogna_2019, gerhardt_2022, "
     "prandtl_1926, tillig_ringsberg_2020 or a .csv file (got 'nothing')"),
    (["--ship-speed-kn", "12", "--hours-at-sea", "6000", "--temperature-c", "300"],
     "liftcore: temperature-c must be between -40 and 50 degC (got 300 degC)"),
])
def test_bad_options_exit_2_with_one_line(capsys, extra, message):
    code, _, err = run_cli(capsys, BASE + ["--wind-table", str(study.DEMO_FILES["table"])] + extra)
    assert code == 2
    assert err.strip().split("\r")[-1].split("\n")[-1] == message


def test_exactly_one_wind_input_and_weibull_needs_a_course(capsys):
    code, _, err = run_cli(capsys, BASE + ["--ship-speed-kn", "12", "--hours-at-sea", "6000"])
    assert code == 2 and "give exactly one of --wind-table, --weibull, --wind-series (got 0)" in err
    code, _, err = run_cli(capsys, BASE + ["--ship-speed-kn", "12", "--hours-at-sea", "6000",
                                           "--weibull", str(study.DEMO_FILES["weibull"])])
    assert code == 2 and "give --course-deg" in err


def test_series_command_equals_the_study(capsys, tmp_path):
    path = tmp_path / "route.csv"
    path.write_text("".join(study.DEMO_FILES["series"].read_text().splitlines(keepends=True)[:1500]))
    code, out, _ = run_cli(capsys, BASE + ["--wind-series", str(path), "--in-process", "--json"])
    assert code == 0
    data = json.loads(out)
    r = run_study("voyage", {"wind_kind": "series", "sweep": False, "rotor_count": 2, "fuel": "hfo",
                             "hull_balance": False}, extra=path)
    for key in KEYS[:-1]:
        assert_allclose(data[key], r.json[key], rtol=1e-12)
    assert data["hours_at_sea_source"] == "from the series"


def test_entry_point_runs_as_a_module():
    out = subprocess.run([sys.executable, "-m", "liftcore"] + BASE +
                         ["--ship-speed-kn", "12", "--weibull", str(study.DEMO_FILES["weibull"]),
                          "--course-deg", "235", "--hours-at-sea", "6000", "--json"],
                         cwd=ROOT, capture_output=True, text=True, timeout=120)
    assert out.returncode == 0, out.stderr
    assert json.loads(out.stdout)["wind_kind"] == "weibull"
