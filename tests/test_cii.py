"""Operational carbon intensity (IMO CII): reference line, reduction factor, rating and the
voyage's year without and with the rotors."""

import json

import numpy as np
import pytest
from numpy.testing import assert_allclose

from liftcore import cii
from liftcore.cli import main
from liftcore.constants import CO2_FACTOR_T_PER_T
from liftcore.errors import InputError
from liftcore.studies import run_study

VOYAGE = ["voyage", "--diameter-m", "5", "--height-m", "30", "--rotors", "2", "--fuel", "hfo",
          "--wind-table", "liftcore/data/wind_table_invented.csv", "--ship-speed-kn", "12",
          "--hours-at-sea", "6000", "--no-spread", "--json"]


def test_required_over_reference_follows_the_published_reduction_factors():
    """Sustainability 2023, 15(14), 11387 (CII of a container ship): reference 7.06, required
    6.71, 6.57, 6.42, 6.28 g/(t nm) for 2023-2026 (printed to two decimals)."""
    ratios = [cii.required_cii("container_ship", 50_000, y) / cii.reference_cii("container_ship", 50_000)
              for y in (2023, 2024, 2025, 2026)]
    assert_allclose(7.06 * np.array(ratios), [6.71, 6.57, 6.42, 6.28], atol=0.006)
    # 2027-2030 read in a report of MEPC.400(83): 13.625, 16.25, 18.875, 21.5 %
    assert cii.required_cii("tanker", 80_000, 2030) == pytest.approx(0.785 * cii.reference_cii("tanker", 80_000))


def test_the_general_cargo_lines_meet_at_20000_dwt():
    """Continuity where two size ranges of MEPC.353(78) meet (a check on the values from memory)."""
    below = cii.reference_cii("general_cargo_ship", 19_999.999)
    above = cii.reference_cii("general_cargo_ship", 20_000)
    assert above == pytest.approx(below, rel=0.002)


def test_the_largest_bulk_carriers_use_the_capped_capacity():
    """MEPC.353(78): bulk carriers of 279,000 DWT and above take 279,000 in the reference line."""
    assert cii.reference_cii("bulk_carrier", 400_000) == pytest.approx(cii.reference_cii("bulk_carrier", 279_000))
    assert cii.reference_cii("bulk_carrier", 100_000) == pytest.approx(4745 * 100_000 ** -0.622)


def test_attained_cii_is_co2_over_capacity_times_distance():
    """MEPC.352(78): 18,684 t CO2 over 60,000 DWT x 72,000 nm = 4.325 g/(t nm) (hand arithmetic)."""
    assert cii.attained_cii(18_684.0, 60_000.0, 72_000.0) == pytest.approx(4.325)
    with pytest.raises(InputError, match="distance must be above 0 nm"):
        cii.attained_cii(1.0, 1.0, 0.0)


def test_ratings_take_the_worse_letter_on_a_boundary():
    """MEPC.354(78): A below the superior boundary ... E at or above the inferior one."""
    b = cii.boundaries("bulk_carrier", 60_000, 2026)
    assert list(cii.rating([b[0] * 0.99, b[0], b[1], b[2], b[3], b[3] * 2], "bulk_carrier", 60_000, 2026)) == \
        ["A", "B", "C", "D", "E", "E"]
    assert_allclose(b / cii.required_cii("bulk_carrier", 60_000, 2026), (0.86, 0.94, 1.06, 1.18))


@pytest.mark.parametrize("bad, message", [
    (dict(ship_type="ferry"), "ship type"), (dict(capacity=0.0), "capacity"), (dict(year=2031), "CII year"),
])
def test_bad_cii_inputs_name_the_field(bad, message):
    args = dict(ship_type="tanker", capacity=50_000.0, year=2026)
    args.update(bad)
    with pytest.raises(InputError, match=message):
        cii.required_cii(**args)


def test_the_voyage_rates_the_year_without_and_with_the_rotors():
    r = run_study("voyage", {"sweep": False, "published_spread": False, "annual_fuel_kg": 6.0e6,
                             "cii_ship_type": "bulk_carrier", "cii_capacity_t": 60_000, "cii_year": 2026})
    c, s = r.detail.cii, r.detail.summary
    co2_before = 6000 * CO2_FACTOR_T_PER_T["hfo"]
    distance = s.mean_ship_speed_m_s * s.hours_at_sea_per_year * 3600 / 1852
    assert c.attained_before == pytest.approx(1e6 * co2_before / (60_000 * distance))
    assert c.attained_after == pytest.approx(c.attained_before * (1 - s.annual_co2_avoided_kg / 1000 / co2_before))
    assert c.attained_after < c.attained_before
    assert r.json["cii_rating_before"] == cii.rating(c.attained_before, "bulk_carrier", 60_000, 2026)
    assert "Carbon intensity rating" in r.figures


def test_the_command_line_rates_only_a_ship_whose_fuel_is_given(capsys):
    assert main(VOYAGE) == 0
    data = json.loads(capsys.readouterr().out)
    assert set(cii.JSON_KEYS) <= set(data) and data["cii_rating_before"] is None
    assert main(VOYAGE + ["--annual-fuel-t", "6000", "--ship-type", "tanker", "--capacity-t", "50000",
                          "--cii-year", "2030"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["cii_rating_before"] in cii.RATINGS and data["cii_rating_after"] in cii.RATINGS
    assert data["cii_required"] == pytest.approx(cii.required_cii("tanker", 50_000, 2030))


def test_the_carbon_price_is_paid_on_the_covered_share_only(capsys):
    assert main(VOYAGE + ["--carbon-price", "80"]) == 0
    full = json.loads(capsys.readouterr().out)["annual_carbon_cost_saved"]
    assert main(VOYAGE + ["--carbon-price", "80", "--carbon-covered-pct", "40"]) == 0
    part = json.loads(capsys.readouterr().out)["annual_carbon_cost_saved"]
    assert full > 0 and part == pytest.approx(0.4 * full)


def test_the_handout_leads_with_the_rating_and_its_caution():
    from liftcore.report import scenario_report
    from liftcore.scenario import Scenario

    inputs = {"sweep": False, "published_spread": False}
    html = scenario_report(Scenario(kind="voyage", inputs=inputs, title="Invented trade"),
                           run_study("voyage", inputs))
    assert "Carbon intensity in 2026" in html and "rated <b>" in html
    assert "the statutory rating is the flag State" in html
    assert "Carbon intensity rating 2026" in html  # the band chart
