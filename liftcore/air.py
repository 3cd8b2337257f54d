"""Air state: ISA standard atmosphere, humid-air density, viscosity and speed of sound.

All functions take floats or numpy arrays in SI units and return the same shape.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from liftcore.constants import (EARTH_RADIUS_ISA_M, G0, GAMMA_AIR, ISA_LAPSE_RATE, ISA_P0, ISA_T0, ISA_TROPOPAUSE_M,
                                R_DRY_AIR, R_WATER_VAPOUR, SUTHERLAND_BETA, SUTHERLAND_S,
                                ZERO_CELSIUS_K)
from liftcore.errors import InputError, check_number
from liftcore.validity import ModelWarning

#: Exponent of the ISA troposphere pressure law, g0 / (R L) = 5.25588 (ISO 2533).
ISA_PRESSURE_EXPONENT = G0 / (R_DRY_AIR * ISA_LAPSE_RATE)


def geopotential_altitude(geometric_altitude_m):
    """Geopotential altitude of a geometric height above mean sea level.

    Notes
    -----
    H = r h / (r + h) with the nominal Earth radius r = 6 356 766 m [1]. The ISA formulas below
    take H; a height read off a map or an altimeter setting is geometric. The two differ by
    0.6 m at 2000 m and 19 m at 11000 m.

    Parameters
    ----------
    geometric_altitude_m : float or ndarray
        Height above mean sea level. [m]

    Returns
    -------
    geopotential_altitude_m : float or ndarray
        [m]

    References
    ----------
    .. [1] ISO 2533:1975 Standard Atmosphere, section 2.3.
    """
    h = np.asarray(geometric_altitude_m, dtype=float)
    return EARTH_RADIUS_ISA_M * h / (EARTH_RADIUS_ISA_M + h)


def isa_temperature(altitude_m):
    """ISA troposphere temperature.

    Parameters
    ----------
    altitude_m : float or ndarray
        Geopotential altitude, -2000 to 11000. [m]

    Returns
    -------
    temperature_k : float or ndarray
        T = 288.15 - 0.0065 h. [K]

    References
    ----------
    .. [1] ISO 2533:1975 Standard Atmosphere; ICAO Doc 7488/3 (1993).
    """
    return ISA_T0 - ISA_LAPSE_RATE * np.asarray(altitude_m, dtype=float)


def isa_pressure(altitude_m):
    """ISA troposphere pressure, p = 101325 (T / 288.15)^5.25588. [Pa]

    References
    ----------
    .. [1] ISO 2533:1975 Standard Atmosphere.
    """
    return ISA_P0 * (isa_temperature(altitude_m) / ISA_T0) ** ISA_PRESSURE_EXPONENT


def isa_density(altitude_m):
    """ISA troposphere density, rho = p / (R T), dry air. [kg m^-3]

    References
    ----------
    .. [1] ISO 2533:1975 Standard Atmosphere (1.2250 kg m^-3 at sea level).
    """
    return isa_pressure(altitude_m) / (R_DRY_AIR * isa_temperature(altitude_m))


def saturation_vapour_pressure_alduchov1996(temperature_k):
    """Saturation vapour pressure over liquid water (Magnus form, Alduchov & Eskridge 1996).

    Notes
    -----
    e_s = 610.94 exp(17.625 t / (t + 243.04)) Pa with t in degC; within 0.4 % of the
    Wexler/Goff-Gratch values over -40 to 50 degC [1].

    Parameters
    ----------
    temperature_k : float or ndarray
        Air temperature. [K]

    Returns
    -------
    e_s : float or ndarray
        Saturation vapour pressure. [Pa]

    References
    ----------
    .. [1] Alduchov, O. A. and Eskridge, R. E. (1996). Improved Magnus form approximation of
       saturation vapor pressure. J. Appl. Meteor. 35, 601-609.
    """
    t_c = np.asarray(temperature_k, dtype=float) - ZERO_CELSIUS_K
    return 610.94 * np.exp(17.625 * t_c / (t_c + 243.04))


def humid_air_density(temperature_k, pressure_pa, relative_humidity):
    """Density of moist air as a mixture of ideal gases.

    Notes
    -----
    rho = (p - e) / (R_d T) + e / (R_v T), e = RH e_s(T) with e_s from
    :func:`saturation_vapour_pressure_alduchov1996`. Humid air is lighter than dry air at the same
    temperature and pressure.

    Parameters
    ----------
    temperature_k : float or ndarray
        [K]
    pressure_pa : float or ndarray
        Total (barometric) pressure. [Pa]
    relative_humidity : float or ndarray
        Fraction 0 to 1. [-]

    Returns
    -------
    density_kg_m3 : float or ndarray
        [kg m^-3]
    """
    t = np.asarray(temperature_k, dtype=float)
    e = np.asarray(relative_humidity, dtype=float) * saturation_vapour_pressure_alduchov1996(t)
    return (np.asarray(pressure_pa, dtype=float) - e) / (R_DRY_AIR * t) + e / (R_WATER_VAPOUR * t)


def dynamic_viscosity_sutherland(temperature_k):
    """Dynamic viscosity of air by Sutherland's law, mu = beta T^1.5 / (T + S). [Pa s]

    References
    ----------
    .. [1] ISO 2533:1975 (beta = 1.458e-6 kg m^-1 s^-1 K^-0.5, S = 110.4 K).
    """
    t = np.asarray(temperature_k, dtype=float)
    return SUTHERLAND_BETA * t ** 1.5 / (t + SUTHERLAND_S)


def speed_of_sound(temperature_k):
    """Speed of sound in dry air, a = sqrt(gamma R T). [m s^-1]

    References
    ----------
    .. [1] ISO 2533:1975 (gamma = 1.4).
    """
    return np.sqrt(GAMMA_AIR * R_DRY_AIR * np.asarray(temperature_k, dtype=float))


@dataclass(frozen=True)
class AirState:
    """Air properties at one condition (SI)."""

    temperature_k: float
    pressure_pa: float
    relative_humidity: float
    density_kg_m3: float
    dynamic_viscosity_pa_s: float
    kinematic_viscosity_m2_s: float
    speed_of_sound_m_s: float
    warnings: tuple = ()

    def as_dict(self) -> dict:
        return {"density_kg_m3": self.density_kg_m3,
                "dynamic_viscosity_pa_s": self.dynamic_viscosity_pa_s,
                "kinematic_viscosity_m2_s": self.kinematic_viscosity_m2_s,
                "speed_of_sound_m_s": self.speed_of_sound_m_s,
                "temperature_k": self.temperature_k, "pressure_pa": self.pressure_pa,
                "relative_humidity_pct": 100.0 * self.relative_humidity}


def air_state(altitude_m: float | None = None, temperature_k: float | None = None,
              pressure_pa: float | None = None, relative_humidity: float = 0.0) -> AirState:
    """Air state from an ISA altitude, or from measured temperature, pressure and humidity.

    Missing temperature or pressure are taken from the ISA at ``altitude_m`` (0 m if not given).

    Parameters
    ----------
    altitude_m : float, optional
        Geometric height above mean sea level, -500 to 11000; converted to geopotential
        altitude (:func:`geopotential_altitude`) for the ISA formulas. [m]
    temperature_k : float, optional
        Measured air temperature, 200 to 350. [K]
    pressure_pa : float, optional
        Measured barometric pressure, 20000 to 110000. [Pa]
    relative_humidity : float
        Fraction 0 to 1. [-]
    """
    h = 0.0 if altitude_m is None else check_number("altitude", altitude_m, "m", low=-500.0,
                                                    high=ISA_TROPOPAUSE_M)
    hg = float(geopotential_altitude(h))
    t = float(isa_temperature(hg)) if temperature_k is None else check_number(
        "temperature", temperature_k, "K", low=200.0, high=350.0)
    p = float(isa_pressure(hg)) if pressure_pa is None else check_number(
        "pressure", pressure_pa, "Pa", low=20000.0, high=110000.0)
    rh = check_number("relative humidity", relative_humidity, "(fraction)", low=0.0, high=1.0)
    e = rh * float(saturation_vapour_pressure_alduchov1996(t))
    if e >= p:
        raise InputError("relative humidity", f"relative humidity {100 * rh:g} % at {t - ZERO_CELSIUS_K:g} °C puts the vapour "
                         f"pressure at {e:.0f} Pa, at or above the total pressure {p:.0f} Pa (water boils): "
                         f"give a lower humidity or temperature, or a higher pressure")
    rho = float(humid_air_density(t, p, rh))
    mu = float(dynamic_viscosity_sutherland(t))
    warnings = ()
    if t - ZERO_CELSIUS_K > 50.0 or t - ZERO_CELSIUS_K < -40.0:
        warnings = (ModelWarning("air_temperature_outside_humidity_fit",
                                 "temperature outside -40 to 50 °C: the saturation vapour pressure fit "
                                 "(Alduchov & Eskridge 1996) is not validated there", "density_kg_m3"),)
    return AirState(temperature_k=t, pressure_pa=p, relative_humidity=rh, density_kg_m3=rho,
                    dynamic_viscosity_pa_s=mu, kinematic_viscosity_m2_s=mu / rho,
                    speed_of_sound_m_s=float(speed_of_sound(t)), warnings=warnings)


def air_inputs(prefix_section: str = "Air", when=None):
    """The air-state inputs shared by every study that needs air (ISA altitude or measured).

    Each carries its ``show_if`` rule: the altitude for the standard atmosphere, temperature and
    pressure for measured air. With ``when(values)`` (e.g. "the fluid is air"), every air input
    matters only when it holds as well.
    """
    from liftcore.inputs import choice, number

    def rule(own=None):
        if when is None:
            return own
        if own is None:
            return lambda v: bool(when(v))
        return lambda v: bool(when(v)) and own(v)

    isa = lambda v: v["air_mode"] == "isa"  # noqa: E731
    measured = lambda v: v["air_mode"] == "measured"  # noqa: E731
    return (
        choice("air_mode", "Air state from", ("isa", "measured"), default="isa",
               labels=("Standard atmosphere at an altitude", "Measured temperature, pressure, humidity"),
               section=prefix_section, help="ISA: ISO 2533 standard day at the altitude.",
               show_if=rule()),
        number("altitude_m", "Altitude", "altitude", 0.0, -500.0, 11000.0, section=prefix_section,
               help="Height above mean sea level of the site (ISA).", show_if=rule(isa)),
        number("temperature_k", "Air temperature", "temperature", 288.15, 233.15, 323.15,
               section=prefix_section, help="Used when the air state is measured.",
               show_if=rule(measured)),
        number("pressure_pa", "Barometric pressure", "pressure", 101325.0, 50000.0, 110000.0,
               section=prefix_section, help="Station pressure (not reduced to sea level).",
               show_if=rule(measured)),
        number("relative_humidity_pct", "Relative humidity", "percent", 0.0, 0.0, 100.0,
               section=prefix_section, help="0 to 100 %. Humid air is slightly lighter.",
               show_if=rule()),
    )


def air_state_from_inputs(values: dict) -> AirState:
    """Air state from the shared air inputs of a study (see :func:`air_inputs`)."""
    rh = values.get("relative_humidity_pct", 0.0) / 100.0
    if values.get("air_mode", "isa") == "measured":
        return air_state(values.get("altitude_m", 0.0), values["temperature_k"],
                         values["pressure_pa"], rh)
    return air_state(values.get("altitude_m", 0.0), relative_humidity=rh)
