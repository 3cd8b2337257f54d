"""Coefficient sets: provenance, monotone interpolation, finite-span correction, user tables."""

import math
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose

from liftcore import coefficients as coef
from liftcore.errors import InputError


def test_ideal_set_reproduces_potential_flow_line_exactly():
    # Analytic (Kutta-Joukowski with Gamma = 2 pi R omega R): CL = 2 pi SR, CD = 0.
    s = coef.coefficient_set("potential_flow")
    sr = np.random.default_rng(3).uniform(0.0, coef.IDEAL_SR_MAX, 1000)
    cl, cd, cp = s.evaluate(sr)
    assert_allclose(cl, 2.0 * np.pi * sr, rtol=1e-13, atol=1e-13)
    assert_allclose(cd, 0.0, atol=0.0)
    assert cp is None and s.kind == "theory" and s.two_dimensional


def test_builtin_sets_carry_provenance():
    sets = coef.builtin_sets()
    assert {"potential_flow", "bare_cylinder", "end_plates_fullscale_fit", "end_plates_model"} <= set(sets)
    assert coef.DEFAULT_SET in sets
    for s in sets.values():
        assert s.kind in coef.KINDS
        assert len(s.source) > 40
        assert s.end_plate_ratio >= 1.0
        lo, hi = s.reynolds_range
        assert 0 <= lo < hi
        assert s.sr_range[0] == 0.0  # every built-in set includes the still cylinder
        if s.kind == "from-memory approximation":
            assert "from memory" in s.label  # the page shows the label
    assert sets["bare_cylinder"].end_plate_ratio == 1.0
    assert sets["end_plates_model"].end_plate_ratio > 1.0


@pytest.mark.parametrize("name", [n for n in coef.builtin_names()])
def test_interpolation_passes_through_data_and_never_overshoots(name):
    s = coef.coefficient_set(name)
    cl, cd, cp = s.evaluate(s.spin_ratio)
    assert_allclose(cl, s.lift, rtol=1e-12, atol=1e-12)
    assert_allclose(cd, s.drag, rtol=1e-12, atol=1e-12)
    # Fritsch & Carlson (1980): the monotone cubic stays within the data of each interval.
    x = np.linspace(*s.sr_range, 2001)
    ycl, ycd, _ = s.evaluate(x)
    idx = np.clip(np.searchsorted(s.spin_ratio, x, side="right") - 1, 0, len(s.spin_ratio) - 2)
    for y, data in ((ycl, s.lift), (ycd, s.drag)):
        lo = np.minimum(data[idx], data[idx + 1]) - 1e-12
        hi = np.maximum(data[idx], data[idx + 1]) + 1e-12
        assert np.all((y >= lo) & (y <= hi))


def test_outside_the_data_end_values_are_held_and_flagged():
    s = coef.coefficient_set("end_plates_model")
    lo, hi = s.sr_range
    cl, cd, _ = s.evaluate([hi + 1.0, hi + 5.0])
    assert_allclose(cl, s.lift[-1])
    assert_allclose(cd, s.drag[-1])
    assert list(s.outside([lo, hi, hi + 0.01, -0.1])) == [False, False, True, True]


def test_hoerner_end_plate_rule():
    # Analytic: AR (1 + 1.9 h/b) with h = (De - D)/2 and b = H is AR + 0.95 (De/D - 1).
    assert_allclose(coef.effective_aspect_ratio_hoerner(6.0, 2.0), 6.0 * (1 + 1.9 * (5.0 / 2) / 30.0))
    assert_allclose(coef.effective_aspect_ratio_hoerner(6.0, 1.0), 6.0)
    assert math.isinf(coef.effective_aspect_ratio_hoerner(math.inf, 2.0))


def test_induced_drag_moves_with_aspect_ratio():
    cl = np.array([0.0, 2.0, 8.0])
    cd = np.array([0.6, 0.5, 2.5])
    # Analytic (Prandtl lifting line, e = 1): CD_i = CL^2 / (pi AR).
    assert_allclose(coef.induced_drag_coefficient(cl, 5.0), cl ** 2 / (np.pi * 5.0))
    moved = coef.drag_at_aspect_ratio(cl, cd, 5.0, 10.0)
    assert_allclose(moved, cd + cl ** 2 / np.pi * (1 / 10.0 - 1 / 5.0))
    # same aspect ratio: unchanged; two-dimensional data to AR 6: the whole induced drag is added
    assert_allclose(coef.drag_at_aspect_ratio(cl, cd, 5.0, 5.0), cd)
    assert_allclose(coef.drag_at_aspect_ratio(cl, cd, math.inf, 6.0), cd + cl ** 2 / (6.0 * np.pi))
    assert moved[1] < cd[1]  # a more slender rotor has less induced drag


GOOD = "SR,CL,CD,CP\n0,0,0.6,0\n1,2,0.4,0.03\n2,5,1.3,0.25\n3,8,2.4,0.7\n"


def test_user_table_round_trip_text_dataframe_and_file(tmp_path):
    a = coef.user_coefficient_set(GOOD)
    b = coef.user_coefficient_set(pd.read_csv(pd.io.common.StringIO(GOOD)))
    p = tmp_path / "mine.csv"
    p.write_text(GOOD)
    c = coef.user_coefficient_set(Path(p))
    for s in (a, b, c):
        assert s.kind == "user" and s.has_power and s.sr_range == (0.0, 3.0)
        assert_allclose(s.evaluate(2.0)[0], 5.0)
    # headers are case-insensitive and CP is optional
    d = coef.user_coefficient_set(" sr , cl , Cd\n0,0,0.5\n1,1,0.6\n2,3,1\n")
    assert not d.has_power and d.evaluate(1.0)[2] is None


@pytest.mark.parametrize("text, message", [
    ("SR,CL\n0,0\n1,1\n2,2\n", "needs columns SR, CL, CD (CP optional); missing CD (columns found: SR, CL)"),
    ("SR,CL,CD\n0,0,0.6\n1,2,0.5\n", "needs at least 3 rows of SR, CL, CD (got 2)"),
    ("SR,CL,CD\n0,0,0.6\n1,,0.5\n2,3,1\n", "CL in data row 2 is empty or not a number"),
    ("SR,CL,CD\n0,0,0.6\n1,abc,0.5\n2,3,1\n", "CL in data row 2 is empty or not a number (got 'abc')"),
    ("SR,CL,CD\n0,0,0.6\n2,2,0.5\n1,3,1\n", "SR must increase from row to row (data row 3: 1 after 2)"),
    ("SR,CL,CD\n0,0,0.6\n1,2,-0.5\n2,3,1\n", "CD must be >= 0 (got -0.5 in data row 2)"),
    ("SR,CL,CD\n-1,0,0.6\n1,2,0.5\n2,3,1\n", "SR must be >= 0 (got -1 in data row 1)"),
    ("   \n", "is empty: give a CSV with columns SR, CL, CD (CP optional)"),
    ('SR,CL,CD\n0,0,0.6\n"1,2,3\n', "is not a readable CSV table"),
])
def test_user_table_errors_are_one_clear_line(text, message):
    with pytest.raises(InputError) as exc:
        coef.user_coefficient_set(text, source="my.csv")
    assert message in str(exc.value)
    assert "\n" not in str(exc.value)
    assert str(exc.value).startswith("my.csv")


def test_unknown_builtin_name_lists_the_valid_ones():
    with pytest.raises(InputError, match="coefficient set must be one of potential_flow, .*end_plates_model"):
        coef.coefficient_set("nonesuch")


def test_describe_reports_provenance_fields():
    d = coef.coefficient_set("end_plates_fullscale_fit").describe()
    for key in ("source", "kind", "aspect_ratio", "end_plate_ratio", "reynolds_range", "sr_range"):
        assert key in d
    assert d["kind"] == "from-memory approximation"
