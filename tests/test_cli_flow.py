"""``python -m liftcore flow``: JSON keys, values from the core, one-line errors with exit status 2."""

import json
import math
import subprocess
import sys

import pytest
from numpy.testing import assert_allclose

from liftcore import potential as pot
from liftcore.air import air_state
from liftcore.cli import main
from tests.conftest import ROOT

KEYS = {"spin_ratio", "circulation_m2_s", "lift_per_span_n_m", "lift_coefficient",
        "lift_coefficient_from_pressure", "drag_coefficient_from_pressure", "stagnation_angles_deg"}


def run_cli(capsys, *argv):
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def test_json_keys_and_values_match_the_core(capsys):
    code, out, err = run_cli(capsys, "flow", "--radius-m", "0.3", "--speed-m-s", "12",
                             "--spin-ratio", "1.5", "--altitude-m", "800", "--json")
    assert code == 0 and err == ""
    data = json.loads(out)
    assert set(data) - {"warnings"} == KEYS
    air = air_state(800.0)
    core = pot.ideal_spinning_cylinder(0.3, 12.0, pot.spin_rate_from_ratio(1.5, 0.3, 12.0),
                                       air.density_kg_m3, air.speed_of_sound_m_s)
    for k in KEYS - {"stagnation_angles_deg"}:
        assert_allclose(data[k], getattr(core, k), rtol=1e-12, atol=1e-15)
    assert_allclose(data["stagnation_angles_deg"], core.stagnation_angles_deg)
    # analytic: CL = 2 pi SR and L' = rho V Gamma with Gamma = 2 pi R V SR
    assert_allclose(data["lift_coefficient"], 2 * math.pi * 1.5, rtol=1e-12)
    assert_allclose(data["lift_per_span_n_m"], air.density_kg_m3 * 12.0 * 2 * math.pi * 0.3 * 12.0 * 1.5,
                    rtol=1e-12)
    assert "potential_flow_not_real_force" in {w["code"] for w in data["warnings"]}


def test_rpm_and_density_override(capsys):
    code, out, _ = run_cli(capsys, "flow", "--radius-m", "0.25", "--speed-m-s", "5",
                           "--spin-rpm", "600", "--density-kg-m3", "1.1", "--json")
    assert code == 0
    data = json.loads(out)
    omega = 600 * 2 * math.pi / 60
    # analytic: SR = omega R / V; L' = rho V 2 pi R (omega R)
    assert_allclose(data["spin_ratio"], omega * 0.25 / 5.0, rtol=1e-12)
    assert_allclose(data["lift_per_span_n_m"], 1.1 * 5.0 * 2 * math.pi * 0.25 * omega * 0.25, rtol=1e-12)


def test_human_text(capsys):
    code, out, err = run_cli(capsys, "flow", "--radius-m", "0.5", "--speed-m-s", "8", "--spin-ratio", "3")
    assert code == 0 and err == ""
    assert "Lift per span (ideal)" in out and "N/m" in out
    assert "left the surface" in out  # SR 3 > 2: stagnation point in the flow
    assert not out.lstrip().startswith("{")


@pytest.mark.parametrize("argv, message", [
    (["--radius-m", "-1", "--speed-m-s", "8", "--spin-ratio", "1"],
     "liftcore: --radius-m must be between 0.001 and 50 m (got -1 m)"),
    (["--radius-m", "0", "--speed-m-s", "8", "--spin-ratio", "1"],
     "liftcore: --radius-m must be between 0.001 and 50 m (got 0 m)"),
    (["--radius-m", "0.5", "--speed-m-s", "nan", "--spin-ratio", "1"],
     "liftcore: --speed-m-s must be a finite number between 0.1 and 200 m/s (got nan)"),
    (["--radius-m", "0.5", "--speed-m-s", "8", "--spin-ratio", "inf"],
     "liftcore: --spin-ratio must be a finite number between -10 and 10 (got inf)"),
    (["--radius-m", "0.5", "--speed-m-s", "8"],
     "liftcore: give exactly one of --spin-rpm or --spin-ratio (got 0)"),
    (["--radius-m", "0.5", "--speed-m-s", "8", "--spin-ratio", "1", "--spin-rpm", "100"],
     "liftcore: give exactly one of --spin-rpm or --spin-ratio (got 2)"),
    (["--radius-m", "0.5", "--speed-m-s", "8", "--spin-ratio", "1", "--colour", "red"],
     "liftcore: unrecognized arguments: --colour red"),
    (["--radius-m", "abc", "--speed-m-s", "8", "--spin-ratio", "1"],
     "liftcore flow: argument --radius-m: invalid float value: 'abc'"),
    (["--speed-m-s", "8", "--spin-ratio", "1"],
     "liftcore flow: the following arguments are required: --radius-m"),
    (["--radius-m", "0.5", "--speed-m-s", "8", "--spin-ratio", "1", "--density-kg-m3", "1.2",
      "--altitude-m", "300"],
     "liftcore: give either --density-kg-m3 or the air-state options (--altitude-m, --temperature-c, "
     "--pressure-pa, --humidity-pct), not both"),
])
def test_bad_input_exits_2_with_one_line(capsys, argv, message):
    code, out, err = run_cli(capsys, "flow", *argv)
    assert code == 2
    assert out == ""
    assert err.strip() == message
    assert err.count("\n") == 1


def test_module_entry_point_no_traceback():
    ok = subprocess.run([sys.executable, "-m", "liftcore", "flow", "--radius-m", "0.5", "--speed-m-s", "8",
                         "--spin-rpm", "100", "--json"], capture_output=True, text=True, cwd=ROOT)
    assert ok.returncode == 0, ok.stderr
    assert set(json.loads(ok.stdout)) - {"warnings"} == KEYS
    bad = subprocess.run([sys.executable, "-m", "liftcore", "flow", "--radius-m", "-2", "--speed-m-s", "8",
                          "--spin-rpm", "100"], capture_output=True, text=True, cwd=ROOT)
    assert bad.returncode == 2
    assert "Traceback" not in bad.stderr and bad.stderr.count("\n") == 1
