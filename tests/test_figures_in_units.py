"""Every study draws its charts and shows its tables in the unit system chosen on the page.

Each study's ``figures_in_units(result, system)`` must return the charts of ``result.figures``
(same titles, same order) with dimensional axes in the display units; ``tables_in_units`` the
tables with the unit in each column name. Expected values are the core (SI) numbers converted
by :mod:`liftcore.units` (Pint), which uses the exact definitions 1 ft = 0.3048 m, 1 yd = 0.9144 m
(international yard and pound agreement, 1959; NIST SP 811, appendix B), 1 mph = 0.44704 m/s
and 1 kn = 1852/3600 m/s (BIPM SI brochure, table 8); a test in tests/test_foundation.py checks
those factors.
"""

from __future__ import annotations

import numpy as np
import pytest
from numpy.testing import assert_allclose

from liftcore import units
from liftcore import voyage as vy
from liftcore.studies import STUDY_MODULES, column_label, quantity_table, run_study, study, table_in_units

#: Small, quick inputs per kind (defaults otherwise); the flight gets a second flight and a spread.
INPUTS = {
    "flow": {},
    "field": {},
    "rotor": {},
    "voyage": {"sweep": False},
    "flight": {"compare_with": "altitude", "dispersion_n": 200},
}


@pytest.fixture(scope="module")
def results():
    return {kind: run_study(kind, values) for kind, values in INPUTS.items()}


def figure(pairs, title):
    return dict(pairs)[title]


def trace(fig, name):
    for t in fig.data:
        if t.name == name:
            return t
    raise AssertionError(f"no trace {name!r}; have {[t.name for t in fig.data]}")


def test_every_study_has_both_hooks():
    for kind in STUDY_MODULES:
        mod = study(kind)
        assert callable(getattr(mod, "figures_in_units", None)), kind
        assert callable(getattr(mod, "tables_in_units", None)), kind


@pytest.mark.parametrize("system", ["SI", "marine", "imperial"])
def test_hooks_return_the_same_charts_and_tables_as_the_result(results, system):
    for kind, r in results.items():
        mod = study(kind)
        figs = mod.figures_in_units(r, system)
        assert [t for t, _ in figs] == [t for t, _ in r.figures], kind
        assert all(len(f.data) == len(g.data) for (_, f), (_, g) in zip(figs, r.figures)), kind
        tables = mod.tables_in_units(r, system)
        assert set(tables) >= {n for n in r.tables if not n.startswith("path: ")}, kind
        # same rows, except where a one-row summary is shown as quantity, value, unit rows
        wide = [n for n in r.tables if n in tables and list(tables[n].columns) != ["quantity", "value", "unit"]]
        assert all(len(tables[n]) == len(r.tables[n]) for n in wide), kind


def test_flow_names_the_radius_and_point_positions_in_feet(results):
    r = results["flow"]
    fig = figure(study("flow").figures_in_units(r, "imperial"), "Streamlines")
    si = figure(r.figures, "Streamlines")
    radius_ft = units.to_display(r.detail.radius_m, "length", "imperial")
    assert f"R = {radius_ft:.3g} ft" in fig.layout.xaxis.title.text
    assert f"R = {r.detail.radius_m:.3g} m" in si.layout.xaxis.title.text
    # positions stay in radii (dimensionless); the hover carries them in the display unit
    st_imp, st_si = trace(fig, "stagnation point"), trace(si, "stagnation point")
    assert_allclose(np.asarray(st_imp.x, float), np.asarray(st_si.x, float))
    points = np.array([list(p) for p in r.detail.stagnation_points_m])
    assert_allclose(np.asarray(st_imp.customdata, float), units.to_display(points, "length", "imperial"))
    assert_allclose(np.asarray(st_si.customdata, float), points)
    assert "ft" in st_imp.hovertemplate and "mph" in fig.data[0].colorbar.title.text


def test_field_charts_in_feet(results):
    r = results["field"]
    res = r.detail.circulation
    figs = study("field").figures_in_units(r, "imperial")
    circ = figure(figs, "Circulation against loop size")
    assert "[ft]" in circ.layout.xaxis.title.text and "[ft²/s]" in circ.layout.yaxis.title.text
    each = trace(circ, "each loop")
    assert_allclose(np.asarray(each.x, float), units.to_display(res.loop_sizes_m, "length", "imperial"))
    assert_allclose(np.asarray(each.y, float),
                    units.to_display(res.circulations_m2_s, "circulation", "imperial"))
    # the map: axes and colour scale converted from the SI chart's own numbers
    fmap, smap = figure(figs, "Velocity field and loops"), figure(r.figures, "Velocity field and loops")
    assert fmap.layout.xaxis.title.text == "x [ft]" and smap.layout.xaxis.title.text == "x [m]"
    assert_allclose(np.asarray(fmap.data[0].x, float), units.convert(np.asarray(smap.data[0].x, float), "m", "ft"))
    assert_allclose(np.asarray(fmap.data[0].z, float),
                    units.convert(np.asarray(smap.data[0].z, float), "m/s", "mph"), rtol=1e-6)
    assert fmap.layout.shapes[0].x1 - fmap.layout.shapes[0].x0 == pytest.approx(
        2 * units.to_display(res.body_radius_m, "length", "imperial"))


def test_rotor_charts_in_kips_and_feet(results):
    r = results["rotor"]
    d = r.detail
    figs = study("rotor").figures_in_units(r, "imperial")
    polar = figure(figs, "Thrust and net power gain around the compass")
    assert "[kip]" in polar.layout.annotations[0].text and "[hp]" in polar.layout.annotations[1].text
    chosen = next(c for c in d.comparisons if c.coefficients is d.setup.coefficients)
    line = next(t for t in polar.data if t.name == chosen.coefficients.label and t.subplot == "polar")
    assert_allclose(np.asarray(line.r, float), units.to_display(chosen.sweep.thrust_n, "large_force", "imperial"))
    span = figure(figs, "Wind along the rotor height")
    assert "[ft]" in span.layout.yaxis.title.text
    true_wind = trace(span, "True wind")
    assert_allclose(np.asarray(true_wind.y, float), units.to_display(d.span.height_m, "length", "imperial"))
    assert_allclose(np.asarray(true_wind.x, float),
                    units.to_display(d.span.true_wind_speed_m_s, "wind_speed", "imperial"))


def test_voyage_charts_in_mph_and_horsepower(results):
    r = results["voyage"]
    figs = study("voyage").figures_in_units(r, "imperial")
    heat, heat_si = figure(figs, "Net gain over wind angle and speed"), figure(r.figures, "Net gain over wind angle and speed")
    assert "[mph]" in heat.layout.yaxis.title.text and "[m/s]" in heat_si.layout.yaxis.title.text
    n = len(heat.data[0].y)
    assert_allclose(np.asarray(heat.data[0].y, float),
                    units.to_display(vy.HEAT_SPEEDS_M_S[:n], "wind_speed", "imperial"))
    assert_allclose(np.asarray(heat.data[0].z, float),
                    units.convert(np.asarray(heat_si.data[0].z, float), "kW", "hp"), rtol=1e-9)


def test_flight_charts_in_yards_feet_and_names_in_feet(results):
    r = results["flight"]
    figs = study("flight").figures_in_units(r, "imperial")
    side = figure(figs, "Side view")
    assert "[yd]" in side.layout.xaxis.title.text and "[ft]" in side.layout.yaxis.title.text
    main = r.detail.flights[0]
    line = side.data[0]
    assert_allclose(np.asarray(line.x, float), units.to_display(main.path["x_m"], "distance", "imperial"))
    assert_allclose(np.asarray(line.y, float), units.to_display(main.path["z_m"], "length", "imperial"))
    # the second flight is named in the display unit too, from the input (1600 m by default)
    feet = units.to_display(r.inputs["compare_altitude_m"], "altitude", "imperial")
    assert side.data[2].name == f"At {feet:.0f} ft altitude"
    spread = figure(figs, "Landing spread")
    assert_allclose(np.asarray(spread.data[0].x, float),
                    units.to_display(r.detail.dispersion.carry_m[:len(spread.data[0].x)], "distance", "imperial"))


# ----------------------------------------------------------------------------- tables
def test_table_helpers_convert_and_name_the_unit():
    import pandas as pd

    df = pd.DataFrame({"surface_speed_m_s": [1.0, 2.0], "pressure_coefficient": [0.5, -1.0], "note": ["a", "b"]})
    out = table_in_units(df, {"surface_speed_m_s": "speed", "pressure_coefficient": "ratio"}, "imperial")
    assert list(out.columns) == ["surface speed [mph]", "pressure coefficient", "note"]
    assert_allclose(out["surface speed [mph]"], units.to_display(np.array([1.0, 2.0]), "speed", "imperial"))
    assert column_label("circulation_m2_s", "circulation", "marine") == "circulation [m²/s]"
    q = quantity_table([("thrust_n", 2000.0, "large_force"), ("spin ratio", 2.5, "ratio")], "imperial")
    assert list(q["quantity"]) == ["thrust", "spin ratio"] and list(q["unit"]) == ["kip", ""]
    assert_allclose(q["value"], [units.to_display(2000.0, "large_force", "imperial"), 2.5])


def test_tables_in_imperial_units(results):
    flow = study("flow").tables_in_units(results["flow"], "imperial")["surface"]
    core = results["flow"].tables["surface"]
    assert_allclose(flow["surface speed [mph]"], units.to_display(core["surface_speed_m_s"].to_numpy(), "speed", "imperial"))
    # surface pressures are a few pascals: pounds per square foot, not inches of mercury
    assert_allclose(flow["pressure difference [lbf/ft²]"],
                    units.convert(core["pressure_difference_pa"].to_numpy(), "Pa", "lbf/ft^2"))
    loops = study("field").tables_in_units(results["field"], "imperial")["loops"]
    res = results["field"].detail.circulation
    assert_allclose(loops["circulation [ft²/s]"], units.to_display(np.asarray(res.circulations_m2_s), "circulation", "imperial"))
    assert loops["loop"][0] == f"circle, radius {units.to_display(res.loop_sizes_m[0], 'length', 'imperial'):.4g} ft"
    rot = study("rotor").tables_in_units(results["rotor"], "imperial")
    sweep = results["rotor"].tables["wind_angle_sweep"]
    assert_allclose(rot["wind_angle_sweep"]["heeling moment [kip·ft]"],
                    units.to_display(sweep["heeling_moment_nm"].to_numpy(), "moment", "imperial"))
    op = rot["operating_point"].set_index("quantity")
    assert op.loc["thrust", "unit"] == "kip"
    assert op.loc["thrust", "value"] == pytest.approx(
        units.to_display(results["rotor"].json["thrust_n"], "large_force", "imperial"))
    voy = study("voyage").tables_in_units(results["voyage"], "imperial")["summary"].set_index("quantity")
    s = results["voyage"].detail.summary
    assert voy.loc["fuel saved per year", "unit"] == "US ton"
    assert voy.loc["fuel saved per year", "value"] == pytest.approx(
        units.to_display(s.annual_fuel_saved_kg, "fuel_mass", "imperial"))
    assert voy.loc["rotors running", "value"] == pytest.approx(100.0 * s.running_share)
    fl = study("flight").tables_in_units(results["flight"], "imperial")["flights"]
    assert_allclose(fl["carry [yd]"], units.to_display(results["flight"].tables["flights"]["carry_m"].to_numpy(),
                                                       "distance", "imperial"))
