"""The year across the published data: every published coefficient set with each spin-power
estimate, carried to fuel, CO2 and net power as a range beside the central value."""

import json

import pytest
from numpy.testing import assert_allclose

from liftcore import coefficients as coef
from liftcore.cli import main
from liftcore.studies import voyage as study

NAMES = {s.label: n for n, s in coef.published_sets().items()}
MODELS = {v: k for k, v in study.SPIN_POWER_WORDS.items()}


def values(**over):
    return study.INPUTS.validate({**study.INPUTS.defaults(), "sweep": False, **over})


def variant_run(v, row):
    """The year run on its own with the row's set and spin-power estimate chosen."""
    return study.run({**v, "coefficient_set": NAMES[row["set"]], "spin_power_model": MODELS[row["spin_power"]],
                      "published_spread": False}).detail.summary


@pytest.mark.parametrize("kind", ["table", "weibull"])
def test_each_row_of_a_table_is_that_set_run_on_its_own(kind):
    v = values(wind_kind=kind)
    r = study.run(v)
    spread = r.detail.spread
    # four published sets, the one with a power coefficient twice
    assert len(spread) == 5 and spread["chosen"].sum() == 1
    for _, row in spread.iterrows():
        s = variant_run(v, row)
        assert_allclose(row["annual_fuel_saved_kg"], s.annual_fuel_saved_kg, rtol=1e-9)
        assert_allclose(row["mean_net_power_w"], s.mean_net_power_w, rtol=1e-9)


def test_series_rows_on_binned_conditions_stay_within_two_percent_of_their_own_run():
    # On an hourly series the variants run on binned conditions, corrected by the entered set's
    # binning error; 2 % is far below the spread itself (tens of percent) and the data's +-10-30 %.
    v = values(wind_kind="series")
    r = study.run(v)
    for _, row in r.detail.spread.iterrows():
        s = variant_run(v, row)
        assert_allclose(row["annual_fuel_saved_kg"], s.annual_fuel_saved_kg, rtol=0.02)
        assert_allclose(row["mean_net_power_w"], s.mean_net_power_w, rtol=0.02)


@pytest.mark.parametrize("kind", ["table", "series"])
def test_range_holds_the_central_value_and_reaches_the_extremes(kind):
    r = study.run(values(wind_kind=kind))
    j = r.json
    for key, column, scale in (("annual_fuel_saved_t", "annual_fuel_saved_kg", 1e-3),
                               ("annual_co2_avoided_t", "annual_co2_avoided_kg", 1e-3),
                               ("mean_net_power_kw", "mean_net_power_w", 1e-3)):
        lo, hi = j[key + "_range"]
        assert lo <= j[key] <= hi
        assert lo < hi  # the published sets do disagree
        assert_allclose([lo, hi], [r.detail.spread[column].min() * scale, r.detail.spread[column].max() * scale])


def test_a_user_set_is_central_and_the_published_sets_still_give_the_range():
    table = "SR,CL,CD\n0,0,0.6\n1,2,0.8\n2,5,1.2\n3,7,2\n4,8,3\n"
    r = study.run(values(wind_kind="table", coefficient_set="user", user_coefficients_csv=table))
    spread = r.detail.spread
    assert len(spread) == 6 and bool(spread["chosen"].iloc[0])
    lo, hi = r.json["annual_fuel_saved_t_range"]
    assert lo <= r.json["annual_fuel_saved_t"] <= hi


def test_headline_says_the_range_in_words_and_units():
    r = study.run(values(wind_kind="table"))
    h = next(h for h in r.headlines if h.key == "annual_fuel_saved")
    lo, hi = r.json["annual_fuel_saved_t_range"]
    assert h.spread_text("SI") == f"{lo:,.0f} t to {hi:,.0f} t across the published data"


def test_spread_off_gives_null_ranges_and_no_extra_runs():
    r = study.run(values(wind_kind="table", published_spread=False))
    assert r.detail.spread is None
    assert r.json["annual_fuel_saved_t_range"] is None
    assert all(h.spread is None for h in r.headlines)


def test_progress_names_the_spread_runs():
    seen = []
    study.run(values(wind_kind="table"), progress=lambda f, text="": seen.append((f, text)))
    assert any("published coefficient set" in t for _, t in seen)
    fractions = [f for f, _ in seen]
    assert fractions == sorted(fractions) and fractions[-1] == 1.0


def test_command_line_json_has_the_ranges_and_the_runs(capsys):
    args = ["voyage", "--diameter-m", "5", "--height-m", "30", "--rotors", "2", "--fuel", "hfo",
            "--ship-speed-kn", "12", "--wind-table", str(study.DEMO_FILES["table"]),
            "--hours-at-sea", "6000", "--json"]
    assert main(args) == 0
    data = json.loads(capsys.readouterr().out)
    lo, hi = data["annual_fuel_saved_t_range"]
    assert lo <= data["annual_fuel_saved_t"] <= hi
    assert len(data["published_spread"]) == 5
    assert main(args + ["--no-spread"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["mean_net_power_kw_range"] is None
