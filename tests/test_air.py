"""Air state against the standard atmosphere tables and open reference libraries (test-only)."""

import numpy as np
import pytest
from numpy.testing import assert_allclose

from liftcore import air
from liftcore.errors import InputError


# ISO 2533:1975 / ICAO Doc 7488/3 standard atmosphere table, by geometric height h:
# density 1.2250 / 1.1117 / 1.0066 kg/m3 at 0 / 1000 / 2000 m (printed to 5 significant digits).
# Temperature and pressure as printed in the same table (from memory: 288.150 K / 101325 Pa,
# 281.651 K / 89876 Pa, 275.154 K / 79501 Pa).
@pytest.mark.parametrize("height_m, rho, t_k, p_pa", [
    (0.0, 1.2250, 288.150, 101325.0),
    (1000.0, 1.1117, 281.651, 89876.0),
    (2000.0, 1.0066, 275.154, 79501.0),
])
def test_isa_table(height_m, rho, t_k, p_pa):
    state = air.air_state(height_m)
    # ISO 2533 table (see above), half a unit in the last printed digit
    assert_allclose(state.density_kg_m3, rho, atol=0.5e-4)
    # ISO 2533 table (see above), half a unit in the last printed digit
    assert_allclose(state.temperature_k, t_k, atol=0.5e-3)
    # ISO 2533 table (see above), half a unit in the last printed digit
    assert_allclose(state.pressure_pa, p_pa, atol=0.5)


def test_geopotential_altitude():
    # ISO 2533 section 2.3: H = r h / (r + h), r = 6 356 766 m; at h = 11 019 m, H = 11 000 m
    # (the tropopause by geometric height, from memory: 11 019 m)
    assert_allclose(air.geopotential_altitude(11019.0), 11000.0, atol=0.1)
    # analytic: H = h at sea level
    assert air.geopotential_altitude(0.0) == 0.0


def test_isa_matches_ambiance_over_troposphere():
    from ambiance import Atmosphere

    heights = np.linspace(-500.0, 11000.0, 47)
    ref = Atmosphere(heights)  # the `ambiance` package takes geometric height
    states = [air.air_state(float(h)) for h in heights]
    # ambiance 1.3.1 (ISO 2533 implementation), test-only reference library
    assert_allclose([s.temperature_k for s in states], ref.temperature, rtol=1e-9)
    # ambiance 1.3.1 (ISO 2533 implementation)
    assert_allclose([s.pressure_pa for s in states], ref.pressure, rtol=1e-6)
    # ambiance 1.3.1 (ISO 2533 implementation)
    assert_allclose([s.density_kg_m3 for s in states], ref.density, rtol=1e-6)
    # ambiance 1.3.1 (ISO 2533 Sutherland viscosity)
    assert_allclose([s.dynamic_viscosity_pa_s for s in states], ref.dynamic_viscosity, rtol=1e-9)
    # ambiance 1.3.1 (ISO 2533 speed of sound)
    assert_allclose([s.speed_of_sound_m_s for s in states], ref.speed_of_sound, rtol=1e-9)


# Grid inside the fit's validated range, -10 to 50 degC, 70 to 105 kPa, 0 to 100 % RH.
@pytest.mark.parametrize("t_c", [-10.0, 0.0, 15.0, 30.0, 50.0])
@pytest.mark.parametrize("p_pa", [70000.0, 90000.0, 101325.0, 105000.0])
def test_humid_density_matches_coolprop(t_c, p_pa):
    from CoolProp.HumidAirProp import HAPropsSI

    t_k = t_c + 273.15
    for rh in (0.0, 0.25, 0.5, 0.75, 1.0):
        # CoolProp 8 HAPropsSI (real-gas humid air, Herrmann et al. 2009 / ASHRAE RP-1485):
        # density = 1 / (volume per kg of humid air). The ideal-gas mixture with the
        # Alduchov-Eskridge vapour pressure stays within 0.15 % of it on this grid (we saw
        # at most 0.09 %; the rest is the virial terms and the ice/water switch below 0 degC).
        ref = 1.0 / HAPropsSI("Vha", "T", t_k, "P", p_pa, "R", rh)
        assert_allclose(air.humid_air_density(t_k, p_pa, rh), ref, rtol=1.5e-3)


def test_humid_air_is_lighter_than_dry():
    # common practice (water vapour, M = 18 g/mol, is lighter than dry air, M = 29 g/mol)
    assert air.humid_air_density(303.15, 101325.0, 1.0) < air.humid_air_density(303.15, 101325.0, 0.0)


def test_sea_level_viscosity_and_speed_of_sound():
    # ISO 2533:1975 sea-level table: dynamic viscosity 1.7894e-5 Pa s
    assert_allclose(air.dynamic_viscosity_sutherland(288.15), 1.7894e-5, rtol=0.5e-4 / 1.7894)
    # ISO 2533:1975 sea-level table: speed of sound 340.294 m/s
    assert_allclose(air.speed_of_sound(288.15), 340.294, atol=0.5e-3)


@pytest.mark.parametrize("t_k", [233.15, 263.15, 288.15, 303.15, 323.15])
def test_sutherland_viscosity_near_coolprop(t_k):
    from CoolProp.CoolProp import PropsSI

    # CoolProp 8 PropsSI viscosity of Air (Lemmon & Jacobsen 2004 pseudo-pure fluid model);
    # Sutherland's law differs from it by about 0.4 % at 1 atm, so we allow 1 %.
    ref = PropsSI("V", "T", t_k, "P", 101325.0, "Air")
    assert_allclose(air.dynamic_viscosity_sutherland(t_k), ref, rtol=1e-2)


def test_air_state_refuses_bad_input_with_one_line():
    with pytest.raises(InputError, match=r"^altitude must be between -500 and 11000 m \(got 20000 m\)$"):
        air.air_state(20000.0)
    with pytest.raises(InputError, match=r"^relative humidity must be a finite number between 0 and 1 \(fraction\) \(got nan\)$"):
        air.air_state(0.0, relative_humidity=float("nan"))


def test_air_state_from_inputs_measured_mode():
    values = {"air_mode": "measured", "altitude_m": 0.0, "temperature_k": 303.15,
              "pressure_pa": 95000.0, "relative_humidity_pct": 50.0}
    state = air.air_state_from_inputs(values)
    # analytic: the measured path is the humid-air formula at the given T, p, RH
    assert_allclose(state.density_kg_m3, air.humid_air_density(303.15, 95000.0, 0.5), rtol=1e-12)
