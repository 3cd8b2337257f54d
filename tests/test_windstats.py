"""Wind statistics: direction conventions, readers and their errors, Weibull discretisation,
streamed series."""

import math

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose
from scipy import integrate, special

from liftcore import windstats as ws
from liftcore.errors import InputError
from liftcore.studies.voyage import DEMO_FILES


# ----------------------------------------------------------------------------- conventions
@pytest.mark.parametrize("direction, heading, angle", [
    # analytic (definition): wind from the east, ship heading north -> from starboard, +90
    (90.0, 0.0, 90.0),
    # wind from the west, ship heading north -> from port, -90
    (270.0, 0.0, -90.0),
    # wind from the north, ship heading south -> from astern, 180 (not -180)
    (0.0, 180.0, 180.0),
    # wind from 350 deg, heading 10 deg -> 20 deg on the port bow
    (350.0, 10.0, -20.0),
    # head wind
    (235.0, 235.0, 0.0),
])
def test_true_wind_angle_from_direction_and_heading(direction, heading, angle):
    assert_allclose(ws.relative_wind_angle_deg(direction, heading), angle, atol=1e-12)


def test_wrap_keeps_angles_in_half_open_interval():
    a = ws.wrap_angle_deg(np.array([-540.0, -180.0, -179.0, 0.0, 180.0, 181.0, 359.0, 360.0]))
    # analytic: (-180, 180] with the same direction modulo 360
    assert_allclose(a, [180.0, 180.0, -179.0, 0.0, 180.0, -179.0, -1.0, 0.0])


# ----------------------------------------------------------------------------- demo files
@pytest.mark.parametrize("kind", sorted(DEMO_FILES))
def test_demo_files_are_labelled_invented(kind):
    head = DEMO_FILES[kind].read_text().splitlines()[0]
    assert head.startswith("#") and "INVENTED" in head


def test_demo_inputs_read_and_sum_to_one():
    t = ws.read_wind_table(DEMO_FILES["table"])
    assert abs(t.probability.sum() - 1.0) <= ws.PROBABILITY_TOLERANCE
    s = ws.read_weibull_sectors(DEMO_FILES["weibull"])
    assert abs(s.frequency.sum() - 1.0) <= ws.PROBABILITY_TOLERANCE
    blocks = list(ws.iter_series(DEMO_FILES["series"], chunk_rows=1000))
    assert sum(len(b) for b in blocks) == 8760  # one invented (non-leap) year of hours
    assert max(len(b) for b in blocks) <= 1000


# ----------------------------------------------------------------------------- table errors
def _write(tmp_path, name, text):
    p = tmp_path / name
    p.write_text(text)
    return p


@pytest.mark.parametrize("body, message", [
    ("angle,speed,p\n0,5,1\n",
     "bad.csv: missing columns 'true_wind_angle_deg', 'true_wind_speed_m_s', 'probability'; a joint "
     "wind table needs columns true_wind_angle_deg, true_wind_speed_m_s, probability (found angle, speed, p)"),
    ("true_wind_angle_deg,true_wind_speed_m_s,probability\n0,5,0.5\n90,5,0.4\n",
     "bad.csv: column probability sums to 0.9; it must sum to 1 within 1e-06 (divide each value by "
     "the total, or by 100 if they are percentages)"),
    ("true_wind_angle_deg,true_wind_speed_m_s,probability\n0,5,0.5\n90,-3,0.5\n",
     "bad.csv, row 2: true_wind_speed_m_s must be between 0 and 80 m/s (got -3 m/s)"),
    ("true_wind_angle_deg,true_wind_speed_m_s,probability\n0,5,0.5\n90,,0.5\n",
     "bad.csv, row 2: true_wind_speed_m_s must be a number between 0 and 80 m/s (got 'empty')"),
    ("true_wind_angle_deg,true_wind_speed_m_s,probability\n0,5,0.5\nNaN,5,0.5\n",
     "bad.csv, row 2: true_wind_angle_deg must be a number between -180 and 360 deg (got 'empty')"),
    ("true_wind_angle_deg,true_wind_speed_m_s,probability\n0,5,half\n90,5,0.5\n",
     "bad.csv, row 1: probability must be a number between 0 and 1 (got 'half')"),
    ("true_wind_angle_deg,true_wind_speed_m_s,probability\n",
     "bad.csv: no data rows under the header"),
    ("", "bad.csv: the file is empty"),
])
def test_bad_tables_fail_with_one_line_naming_file_row_and_column(tmp_path, body, message):
    p = _write(tmp_path, "bad.csv", body)
    with pytest.raises(InputError) as exc:
        ws.read_wind_table(p)
    assert str(exc.value) == message
    assert "\n" not in str(exc.value)


def test_missing_file_is_named():
    with pytest.raises(InputError, match=r"^cannot read nowhere\.csv: file not found$"):
        ws.read_wind_table("nowhere.csv")


def test_table_angles_are_wrapped_and_single_condition():
    df = pd.DataFrame({"true_wind_angle_deg": [270.0, 90.0], "true_wind_speed_m_s": [5.0, 6.0],
                       "probability": [0.5, 0.5]})
    t = ws.read_wind_table(df, "t")
    assert_allclose(t.true_wind_angle_deg, [-90.0, 90.0])
    one = ws.single_condition(-30.0, 9.0)
    assert one.size == 1 and one.probability[0] == 1.0


# ----------------------------------------------------------------------------- Weibull
def _sectors():
    return ws.WeibullSectors(np.array([0.0, 90.0, 180.0, 270.0]), np.array([0.2, 0.3, 0.1, 0.4]),
                             np.array([8.0, 10.0, 6.0, 11.0]), np.array([2.0, 1.6, 2.4, 3.0]))


def test_weibull_discretisation_conserves_probability_and_the_mean():
    s = _sectors()
    j = ws.discretise_weibull(s)
    assert_allclose(j.probability.sum(), 1.0, rtol=0, atol=1e-12)
    # analytic: mean of a Weibull distribution = c Gamma(1 + 1/k) (Justus et al. 1978, eq. 3)
    expected = sum(f * c * math.gamma(1 + 1 / k) for f, c, k in zip(s.frequency, s.scale_m_s, s.shape))
    assert_allclose(j.mean_wind_speed_m_s(), expected, rtol=1e-10)
    # each sector keeps its own frequency
    for centre, f in zip(s.sector_centre_deg, s.frequency):
        near = np.abs(ws.wrap_angle_deg(j.true_wind_direction_deg - centre)) < 45.0
        assert_allclose(j.probability[near].sum(), f, rtol=1e-12)


def test_rayleigh_mean_closed_form():
    # analytic: k = 2 (Rayleigh) gives mean c sqrt(pi) / 2
    s = ws.WeibullSectors(np.array([0.0]), np.array([1.0]), np.array([7.0]), np.array([2.0]))
    assert_allclose(ws.discretise_weibull(s).mean_wind_speed_m_s(), 7.0 * math.sqrt(math.pi) / 2, rtol=1e-10)


@pytest.mark.parametrize("c, k, a, b", [(8.0, 2.0, 3.0, 4.0), (10.0, 1.6, 0.0, 1.0), (6.0, 2.4, 12.0, 13.0)])
def test_weibull_bins_match_numerical_integration(c, k, a, b):
    pdf = lambda v: (k / c) * (v / c) ** (k - 1) * math.exp(-((v / c) ** k))  # Weibull density
    p_quad = integrate.quad(pdf, a, b, epsabs=1e-14)[0]
    m_quad = integrate.quad(lambda v: v * pdf(v), a, b, epsabs=1e-14)[0]
    assert_allclose(ws.weibull_cdf(b, c, k) - ws.weibull_cdf(a, c, k), p_quad, rtol=1e-9)
    assert_allclose(ws.weibull_partial_first_moment(a, b, c, k), m_quad, rtol=1e-8)
    # the open top bin closes the first moment: integral to infinity = c Gamma(1 + 1/k)
    assert_allclose(ws.weibull_partial_first_moment(0.0, np.inf, c, k), c * special.gamma(1 + 1 / k), rtol=1e-12)


def test_weibull_reader_errors(tmp_path):
    p = _write(tmp_path, "w.csv", "sector_centre_deg,frequency,scale_m_s,shape\n0,0.5,8,2\n180,0.5,0,2\n")
    with pytest.raises(InputError) as exc:
        ws.read_weibull_sectors(p)
    assert str(exc.value) == "w.csv, row 2: scale_m_s must be > 0 m/s and <= 80 m/s (got 0 m/s)"
    p = _write(tmp_path, "w2.csv", "sector_centre_deg,frequency,scale_m_s,shape\n0,0.5,8,2\n0,0.5,8,2\n")
    with pytest.raises(InputError, match="w2.csv: column sector_centre_deg repeats a sector"):
        ws.read_weibull_sectors(p)


def test_course_turns_directions_into_angles_off_the_bow():
    s = ws.WeibullSectors(np.array([0.0]), np.array([1.0]), np.array([8.0]), np.array([2.0]))
    j = ws.discretise_weibull(s, direction_step_deg=360.0)  # the sector centre only
    # analytic: a northerly wind on a ship heading east comes from port (-90 deg)
    one = ws.apply_course(j, 90.0)
    assert_allclose(np.unique(one.true_wind_angle_deg), [-90.0])
    both = ws.apply_course(j, 90.0, round_trip=True)
    assert_allclose(sorted(np.unique(both.true_wind_angle_deg)), [-90.0, 90.0])
    assert_allclose(both.probability[both.true_wind_angle_deg > 0].sum(), 0.5)


# ----------------------------------------------------------------------------- series
def _series_frame(n=25):
    t = pd.date_range("2031-03-01T00:00", periods=n, freq="h").strftime("%Y-%m-%dT%H:%M")
    return pd.DataFrame({"time": t, "ship_speed_kn": np.linspace(0, 14, n),
                         "ship_heading_deg": np.linspace(0, 350, n),
                         "true_wind_speed_m_s": np.linspace(1, 20, n),
                         "true_wind_direction_deg": np.linspace(10, 300, n)})


def test_series_blocks_equal_one_block_in_memory_and_from_file(tmp_path):
    df = _series_frame()
    p = tmp_path / "s.csv"
    p.write_text("# invented test series\n" + df.to_csv(index=False))
    whole = ws.check_series_frame(df)
    for source in (df, p):
        blocks = list(ws.iter_series(source, chunk_rows=7))
        assert [len(b) for b in blocks] == [7, 7, 7, 4]
        assert_allclose(np.concatenate([b.true_wind_angle_deg for b in blocks]), whole.true_wind_angle_deg)
        # 1 kn = 1852/3600 m/s exactly (international nautical mile)
        assert_allclose(np.concatenate([b.ship_speed_m_s for b in blocks]), df["ship_speed_kn"] * 1852 / 3600)
    assert set(whole.month) == {3}


def test_series_error_names_the_row_in_the_whole_file(tmp_path):
    df = _series_frame()
    df["true_wind_direction_deg"] = df["true_wind_direction_deg"].astype(object)
    df.loc[22, "true_wind_direction_deg"] = "north"
    p = tmp_path / "route.csv"
    p.write_text(df.to_csv(index=False))
    with pytest.raises(InputError) as exc:
        list(ws.iter_series(p, chunk_rows=7))
    assert str(exc.value) == ("route.csv, row 23: true_wind_direction_deg must be a number between 0 "
                              "and 360 deg (got 'north')")
    df = _series_frame()
    df.loc[3, "time"] = "yesterday"
    with pytest.raises(InputError, match=r"^s, row 4: time must be an ISO 8601 date and time such as "
                                         r"2031-01-01T00:00 \(got 'yesterday'\)$"):
        list(ws.iter_series(df, "s", chunk_rows=7))
    with pytest.raises(InputError, match="s: missing column 'ship_heading_deg'"):
        list(ws.iter_series(df.drop(columns="ship_heading_deg"), "s"))


def test_series_repeating_a_table_in_proportion():
    t = ws.JointWind(np.array([0.0, 90.0, -120.0]), np.array([5.0, 10.0, 15.0]), np.array([0.25, 0.5, 0.25]))
    df = ws.series_from_joint(t, 8, 6.0, heading_deg=30.0)
    b = ws.check_series_frame(df)
    assert len(b) == 8
    assert_allclose(np.sort(b.true_wind_angle_deg), [-120, -120, 0, 0, 90, 90, 90, 90], atol=1e-9)
