"""``python -m liftcore rotor``: JSON contract, agreement with the core, one-line errors."""

import json
import math
import subprocess
import sys
from pathlib import Path

import pytest
from numpy.testing import assert_allclose

from liftcore import rotor
from liftcore import rotor_inputs
from liftcore.cli import main
from liftcore.constants import KNOT_M_S

ROOT = Path(__file__).resolve().parents[1]
BASE = ["rotor", "--diameter-m", "5", "--height-m", "30", "--ship-speed-kn", "12",
        "--true-wind-speed-kn", "20", "--true-wind-angle-deg", "90"]
KEYS = ["state", "coefficient_set", "spin_power_model", "spin_power_set_kw", "spin_power_friction_kw",
        "apparent_wind_speed_m_s", "apparent_wind_angle_deg", "spin_ratio", "rpm", "lift_coefficient",
        "drag_coefficient", "lift_n", "drag_n", "thrust_n", "side_force_n", "heeling_moment_knm",
        "spin_power_kw", "net_power_kw", "warnings"]


def run_json(capsys, *extra):
    code = main(BASE + list(extra) + ["--json"])
    out, err = capsys.readouterr()
    assert code == 0, err
    return json.loads(out)


def core(setup_kw=None, spin=None):
    # the command's defaults are the study's (two rotors); without hull options, no hull balance
    values = {"hull_balance": False, **(setup_kw or {})}
    setup = rotor_inputs.setup_from_inputs(values)
    args = (setup, 12 * KNOT_M_S, 20 * KNOT_M_S, math.radians(90))
    return rotor.best_operation(*args) if spin is None else rotor.fixed_operation(*args, **spin)


def test_json_keys_exactly_and_best_spin_matches_core(capsys):
    data = run_json(capsys)
    assert list(data) == KEYS
    op = core()
    assert_allclose(data["thrust_n"], op.thrust_n, rtol=1e-12)
    assert_allclose(data["net_power_kw"], op.net_power_w / 1000, rtol=1e-12)
    assert_allclose(data["heeling_moment_knm"], op.heeling_moment_nm / 1000, rtol=1e-12)
    assert_allclose(data["spin_power_kw"], op.spin_power_w / 1000, rtol=1e-12)
    assert_allclose(data["rpm"], op.rpm, rtol=1e-12)
    assert all({"code", "message", "subject", "severity"} <= set(w) for w in data["warnings"])
    assert data["state"] == rotor.STATE_NAMES[int(op.state)] and data["coefficient_set"] == "tillig_ringsberg_2020"
    assert_allclose(data["spin_power_set_kw"], op.spin_power_set_w / 1000, rtol=1e-12)
    assert_allclose(data["spin_power_friction_kw"], op.spin_power_friction_w / 1000, rtol=1e-12)


def test_a_head_wind_reports_stopped_rotors_that_cost_power(capsys):
    data = run_json(capsys, "--true-wind-angle-deg", "0")
    assert data["state"] == "stopped" and data["rpm"] == 0.0
    assert data["net_power_kw"] < 0 and data["thrust_n"] < 0  # their drag: said in a warning
    assert any(w["code"] == "rotor_stopped" and "cost" in w["message"] for w in data["warnings"])


def test_fixed_rpm_and_spin_ratio(capsys):
    data = run_json(capsys, "--rpm", "100")
    assert_allclose(data["rpm"], 100.0)
    assert_allclose(data["thrust_n"], core(spin={"rpm": 100.0}).thrust_n, rtol=1e-12)
    data = run_json(capsys, "--spin-ratio", "2.5", "--wind-profile", "uniform")
    assert_allclose(data["spin_ratio"], 2.5, rtol=1e-12)
    op = core({"wind_profile": "uniform"}, {"spin_ratio": 2.5})
    assert_allclose(data["lift_n"], op.lift_n, rtol=1e-12)


def test_several_rotors_are_set_totals(capsys):
    one = run_json(capsys, "--spin-ratio", "2", "--rotors", "1")
    three = run_json(capsys, "--spin-ratio", "2", "--rotors", "3", "--rotor-spacing-m", "30")
    for key in ("lift_n", "thrust_n", "side_force_n", "heeling_moment_knm", "spin_power_kw"):
        assert_allclose(three[key], 3 * one[key], rtol=1e-12)
    half = run_json(capsys, "--spin-ratio", "2", "--rotors", "3", "--rotor-spacing-m", "30",
                    "--interaction-factor", "0.5")
    assert_allclose(half["thrust_n"], 1.5 * one["thrust_n"], rtol=1e-12)
    assert_allclose(half["spin_power_kw"], three["spin_power_kw"], rtol=1e-12)


def test_user_coefficient_file(capsys, tmp_path):
    p = tmp_path / "mine.csv"
    p.write_text("SR,CL,CD\n0,0,0.7\n1,2.2,0.5\n2,5.0,1.3\n3,7.5,2.4\n")
    data = run_json(capsys, "--coefficients", str(p), "--spin-ratio", "2", "--wind-profile", "uniform",
                    "--set-aspect-ratio", "6", "--set-end-plate-ratio", "1.6")
    # uniform wind, same aspect ratio and end plates as the tested rotor: the table's own value
    assert_allclose(data["lift_coefficient"], 5.0, rtol=1e-12)
    assert_allclose(data["drag_coefficient"], 1.3, rtol=1e-12)
    assert any(w["code"] == "spin_power_from_friction_model" for w in data["warnings"])


def test_air_options_change_the_density(capsys):
    sea = run_json(capsys, "--spin-ratio", "2")
    high = run_json(capsys, "--spin-ratio", "2", "--altitude-m", "1000")
    dense = run_json(capsys, "--spin-ratio", "2", "--density-kg-m3", "1.8")
    # ISO 2533: 1.1117 kg/m3 at 1000 m against 1.2250 at sea level; forces scale with density
    assert_allclose(high["lift_n"] / sea["lift_n"], 1.1117 / 1.2250, rtol=2e-4)
    assert_allclose(dense["lift_n"] / sea["lift_n"], 1.8 / 1.2250, rtol=1e-4)


def test_text_output_carries_the_caution(capsys):
    assert main(BASE) == 0
    out = capsys.readouterr().out
    assert "Thrust along the heading" in out and "naval architect" in out


@pytest.mark.parametrize("extra, message", [
    (["--diameter-m", "-4"], "liftcore: --diameter-m: Rotor diameter must be between 0.2 and 15 m (got -4 m)"),
    (["--ship-speed-kn", "45"], "liftcore: --ship-speed-kn: Ship speed must be between 0 and 30 kn (got 45 kn)"),
    (["--coefficients", "nonesuch"], "liftcore: --coefficients must be one of potential_flow, bordogna_2019, "
                                     "gerhardt_2022, prandtl_1926, tillig_ringsberg_2020 or a .csv file (got 'nonesuch')"),
    (["--rotors", "2", "--rotor-spacing-m", "2"], "liftcore: spacing between rotors must be at least the rotor "
                                                  "diameter 5 m when there are 2 rotors (got 2 m)"),
    (["--max-motor-power-kw", "0"], "liftcore: --max-motor-power-kw: Maximum motor power per rotor must be "
                                    "between 1 and 5000 kW (got 0 kW)"),
    (["--spin-ratio", "2", "--rpm", "100"], "liftcore rotor: argument --rpm: not allowed with argument --spin-ratio"),
])
def test_bad_input_exits_2_with_one_line(capsys, extra, message):
    argv = list(BASE)
    for i in range(0, len(extra), 2):
        if extra[i] in argv:
            argv[argv.index(extra[i]) + 1] = extra[i + 1]
        else:
            argv += extra[i:i + 2]
    assert main(argv) == 2
    err = capsys.readouterr().err.strip()
    assert err == message


def test_bad_csv_file_names_the_file(capsys, tmp_path):
    p = tmp_path / "broken.csv"
    p.write_text("SR,CL,CD\n0,0,0.7\n2,2,0.5\n1,5,1.3\n")
    assert main(BASE + ["--coefficients", str(p)]) == 2
    err = capsys.readouterr().err.strip()
    assert err == "liftcore: --coefficients file broken.csv: SR must increase from row to row (data row 3: 1 after 2)"


def test_module_entry_point_exit_codes():
    ok = subprocess.run([sys.executable, "-m", "liftcore"] + BASE + ["--json"], capture_output=True,
                        text=True, cwd=ROOT)
    assert ok.returncode == 0 and list(json.loads(ok.stdout)) == KEYS and ok.stderr == ""
    bad = subprocess.run([sys.executable, "-m", "liftcore", "rotor", "--diameter-m", "5"], capture_output=True,
                         text=True, cwd=ROOT)
    assert bad.returncode == 2 and bad.stderr.count("\n") == 1 and "required" in bad.stderr
