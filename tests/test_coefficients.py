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
    assert set(sets) == {"potential_flow", "tillig_ringsberg_2020", "prandtl_1926", "bordogna_2019",
                         "gerhardt_2022"}
    assert coef.DEFAULT_SET in coef.published_sets()  # the default is a published set
    for s in sets.values():
        assert s.kind in coef.KINDS
        assert len(s.source) > 40
        assert s.end_plate_ratio >= 1.0
        lo, hi = s.reynolds_range
        assert 0 <= lo <= hi
        assert s.sr_range[0] == 0.0  # every built-in set includes the still cylinder
        if s.kind == "digitised":
            assert "digitised from the published figure" in s.source
        if s.drag_from:  # lift-only data say where the drag comes from
            assert s.drag_from in coef.published_sets() and "borrowed" in s.notes
    assert set(coef.published_sets()) == set(sets) - {"potential_flow"}


# The published record (values read off each paper's figure are digitised, about +-3 % of full
# scale; the tables round them to 3-4 decimals).
#: Tillig, F. and Ringsberg, J. W. (2020), Ocean Engineering 211: published polynomial fits.
TILLIG_CL = (-0.0046, 0.1145, -0.9817, 3.1309, -0.1039, 0.0)
TILLIG_CD = (-0.0017, 0.0464, -0.4424, 1.7243, -1.641, 0.6375)
#: Prandtl, L. (1926), NACA TM 367: CL digitised from the published figure.
PRANDTL = ((0.680, 0.489), (1.445, 2.387), (2.021, 4.514), (2.766, 7.239), (3.340, 8.437), (4.581, 8.804))
#: Bordogna, G. et al. (2019), J. Wind Eng. Ind. Aerodyn.: CL digitised from the published figure.
BORDOGNA = ((0.465, 1.40), (0.962, 2.85), (1.202, 3.52), (1.443, 4.13), (1.736, 5.06), (2.038, 5.71),
            (2.284, 6.33), (2.526, 7.27), (2.732, 6.93), (3.193, 7.67), (3.651, 8.02), (4.125, 8.60),
            (4.597, 9.52))
#: Gerhardt, F. C. et al. (2022), HIPER 2022: CL and CD of full-scale CFD, digitised.
GERHARDT = ((1, 2.28, 0.44), (2, 5.84, 1.14), (3, 8.75, 2.75), (4, 9.62, 3.55), (5, 9.64, 3.72),
            (6, 9.85, 3.86), (7, 10.12, 3.97), (8, 10.32, 4.27), (9, 10.34, 4.53))


def test_the_full_scale_fit_is_the_published_polynomial():
    s = coef.coefficient_set("tillig_ringsberg_2020")
    assert s.kind == "published fit" and s.sr_range == (0.0, 5.0)
    sr = np.linspace(0.0, 5.0, 501)
    cl, cd, _ = s.evaluate(sr)
    # Published: Tillig & Ringsberg (2020) CL and CD polynomials. At the table's points (every 0.1,
    # 4 decimals) the set is the polynomial; between them the monotone cubic stays within 0.005
    # (the polynomial itself dips a hair below zero just above SR 0)
    on = np.isclose(sr * 10, np.round(sr * 10))
    assert_allclose(cl[on], np.polyval(TILLIG_CL, sr[on]), atol=1e-4)
    assert_allclose(cd[on], np.polyval(TILLIG_CD, sr[on]), atol=1e-4)
    assert_allclose(cl, np.polyval(TILLIG_CL, sr), atol=5e-3)
    assert_allclose(cd, np.polyval(TILLIG_CD, sr), atol=5e-3)
    assert s.has_power and "from memory" in s.source  # its power column was not published with the fit


@pytest.mark.parametrize("name, points", [("prandtl_1926", PRANDTL), ("bordogna_2019", BORDOGNA)])
def test_lift_only_sets_are_the_digitised_points_with_the_fits_drag(name, points):
    s = coef.coefficient_set(name)
    sr = np.array([p[0] for p in points])
    cl, cd, cp = s.evaluate(sr)
    # Published figures, digitised (see the constants above)
    assert_allclose(cl, [p[1] for p in points], atol=1e-4)
    assert_allclose(s.evaluate(0.0)[0], 0.0)  # a still cylinder is symmetric: no lift
    # the drag is borrowed: the published fit's at the same spin ratios
    assert s.drag_from == "tillig_ringsberg_2020" and cp is None
    assert_allclose(cd, np.polyval(TILLIG_CD, sr), atol=1e-4)


def test_the_cfd_set_is_the_digitised_lift_and_drag():
    s = coef.coefficient_set("gerhardt_2022")
    g = np.array(GERHARDT, dtype=float)
    cl, cd, cp = s.evaluate(g[:, 0])
    # Published figure of Gerhardt et al. (2022), digitised
    assert_allclose(cl, g[:, 1], atol=1e-4)
    assert_allclose(cd, g[:, 2], atol=1e-4)
    assert cp is None and s.kind == "digitised" and not s.drag_from
    # the still cylinder (SR 0): no lift, the fit's drag (said in the source)
    assert_allclose(s.evaluate(0.0)[1], np.polyval(TILLIG_CD, 0.0))


def test_the_tables_are_what_the_generator_writes_from_the_published_numbers(tmp_path, monkeypatch):
    from liftcore.data.coefficients import make_published as mp

    monkeypatch.setattr(mp, "HERE", tmp_path)
    mp.main()
    for name in ("tillig_ringsberg_2020", "prandtl_1926", "bordogna_2019", "gerhardt_2022"):
        shipped = (coef.DATA_DIR / f"{name}.csv").read_text()
        assert (tmp_path / f"{name}.csv").read_text() == shipped, name


@pytest.mark.parametrize("name", [n for n in coef.builtin_names()])
def test_interpolation_passes_through_data_and_never_overshoots(name):
    s = coef.coefficient_set(name)
    cl, cd, cp = s.evaluate(s.spin_ratio)
    # read from a dense table of the interpolant: within 1e-5 of it (CoefficientSet.evaluate)
    assert_allclose(cl, s.lift, rtol=0, atol=1e-5)
    assert_allclose(cd, s.drag, rtol=0, atol=1e-5)
    # Fritsch & Carlson (1980): the monotone cubic stays within the data of each interval.
    x = np.linspace(*s.sr_range, 2001)
    ycl, ycd, _ = s.evaluate(x)
    idx = np.clip(np.searchsorted(s.spin_ratio, x, side="right") - 1, 0, len(s.spin_ratio) - 2)
    for y, data in ((ycl, s.lift), (ycd, s.drag)):
        lo = np.minimum(data[idx], data[idx + 1]) - 1e-5
        hi = np.maximum(data[idx], data[idx + 1]) + 1e-5
        assert np.all((y >= lo) & (y <= hi))


def test_outside_the_data_end_values_are_held_and_flagged():
    s = coef.coefficient_set("gerhardt_2022")
    lo, hi = s.sr_range
    cl, cd, _ = s.evaluate([hi + 1.0, hi + 5.0])
    assert_allclose(cl, s.lift[-1])
    assert_allclose(cd, s.drag[-1])
    assert list(s.outside([lo, hi, hi + 0.01, -0.1])) == [False, False, True, True]


def test_hoerner_end_plate_rule():
    # Published form AR_eff = AR (1 + 1.9 h/b) (Katz, New Directions in Race Car Aerodynamics, as
    # quoted at mulsannescorner.com/wingendplates.html; Hoerner as its origin is from memory); with
    # h = (De - D)/2 and b = H (our assumption for a rotor) it is AR + 0.95 (De/D - 1).
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
    with pytest.raises(InputError, match="coefficient set must be one of potential_flow, .*tillig_ringsberg_2020"):
        coef.coefficient_set("nonesuch")


def test_describe_reports_provenance_fields():
    d = coef.coefficient_set("prandtl_1926").describe()
    for key in ("source", "kind", "aspect_ratio", "end_plate_ratio", "reynolds_range", "sr_range", "drag_from"):
        assert key in d
    assert d["kind"] == "digitised" and d["drag_from"] == "tillig_ringsberg_2020"
