"""The analyst's own aerodynamic table: CD and CL over spin parameter (and Reynolds number)."""

import json

import numpy as np
import pytest
from numpy.testing import assert_allclose

from liftcore import balls
from liftcore.cli import main
from liftcore.errors import InputError
from liftcore.studies import run_study

LAUNCH = {"ball": "golf", "speed_m_s": 70.0, "elevation_deg": 11.0, "spin_rpm": 2700.0, "wind_speed_m_s": 0.0}


def test_a_table_of_one_cd_and_cl_flies_exactly_like_the_constant_model():
    table = run_study("flight", {**LAUNCH, "coefficient_model": "table",
                                 "aero_table_csv": "S,CD,CL\n0,0.27,0.21\n0.5,0.27,0.21\n"})
    const = run_study("flight", {**LAUNCH, "coefficient_model": "constant", "constant_cd": 0.27, "constant_cl": 0.21})
    for key in ("carry_m", "peak_height_m", "flight_time_s", "lateral_m", "landing_speed_m_s"):
        assert table.json[key] == const.json[key]


def test_the_table_is_interpolated_linearly_and_held_at_its_edges():
    m = balls.table_model("S,CD,CL\n0,0.30,0.00\n0.2,0.28,0.20\n0.4,0.32,0.30\n")
    cd, cl = m.coefficients(np.array([0.1, 0.3, 0.8, 0.0]), 1e5, 0, 0)
    assert_allclose(cd, [0.29, 0.30, 0.32, 0.30])
    assert_allclose(cl, [0.10, 0.25, 0.30, 0.0])  # no spin, no lift
    assert m.s_range == (0.0, 0.4)


def test_a_reynolds_grid_is_interpolated_bilinearly():
    rows = "".join(f"{s},{re},{0.2 + s + re / 1e6},{s}\n" for re in (1e5, 2e5) for s in (0.1, 0.3))
    m = balls.table_model("S,Re,CD,CL\n" + rows)
    cd, _ = m.coefficients(np.array([0.2, 0.2, 0.5]), np.array([1.5e5, 1e6, 1.5e5]), 0, 0)
    # linear in both: CD = 0.2 + S + Re / 1e6 inside, held at Re 2e5 and S 0.3 outside
    assert_allclose(cd, [0.2 + 0.2 + 0.15, 0.2 + 0.2 + 0.2, 0.2 + 0.3 + 0.15])
    assert m.re_range == (1e5, 2e5)


@pytest.mark.parametrize("text, message", [
    ("S,CD\n0,0.3\n1,0.3\n", "missing CL"),
    ("S,CD,CL\n0,0.3,0\n", "it needs 2 to"),
    ("S,CD,CL\n0,0.3,0\n0,0.2,0.1\n", "S 0 appears twice"),
    ("S,CD,CL\n0,0.3,0\n1,9,0.1\n", "CD in data row 2 must be a number from 0 to 5 (got 9)"),
    ("S,Re,CD,CL\n0,1e5,0.3,0\n1,1e5,0.3,0.1\n1,2e5,0.3,0.1\n", "full grid"),
    ("", "is empty"),
])
def test_bad_tables_are_refused_naming_the_cell(text, message):
    with pytest.raises(InputError, match=message.replace("(", r"\(").replace(")", r"\)")):
        balls.table_model(text)


def test_flights_leaving_the_table_are_warned(capsys, tmp_path):
    table = tmp_path / "ours.csv"
    table.write_text("S,CD,CL\n0,0.3,0\n0.05,0.29,0.08\n")
    assert main(["flight", "--ball", "custom", "--diameter-m", "0.0427", "--mass-kg", "0.0459", "--speed-m-s", "70",
                 "--elevation-deg", "11", "--spin-rpm", "2700", "--aero-table", str(table), "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["coefficient_model"] == "table"
    assert "spin_parameter_outside_model" in {w["code"] for w in data["warnings"]}
