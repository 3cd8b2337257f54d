"""Physical constants and conversion factors, each with its source.

Formulas elsewhere use these names; no bare numbers for physical constants inside formulas.
"""

# --- Standard atmosphere: ISO 2533:1975 / ICAO Doc 7488 (sea-level values, troposphere) ---
G0 = 9.80665  # m s^-2, standard acceleration of gravity (ISO 2533; CGPM 1901)
R_DRY_AIR = 287.05287  # J kg^-1 K^-1, specific gas constant of dry air (ISO 2533)
ISA_T0 = 288.15  # K, sea-level temperature (ISO 2533)
ISA_P0 = 101325.0  # Pa, sea-level pressure (ISO 2533)
ISA_RHO0 = 1.2250  # kg m^-3, sea-level density (ISO 2533 table)
ISA_LAPSE_RATE = 0.0065  # K m^-1, troposphere temperature gradient (ISO 2533)
ISA_TROPOPAUSE_M = 11000.0  # m, top of the troposphere layer (ISO 2533)
EARTH_RADIUS_ISA_M = 6356766.0  # m, nominal Earth radius for geopotential altitude (ISO 2533)
GAMMA_AIR = 1.4  # ratio of specific heats of dry air (ISO 2533)
SUTHERLAND_BETA = 1.458e-6  # kg m^-1 s^-1 K^-1/2 (ISO 2533, Sutherland form)
SUTHERLAND_S = 110.4  # K, Sutherland constant (ISO 2533)

# --- Water vapour ---
R_WATER_VAPOUR = 461.52  # J kg^-1 K^-1 (R / M_w with M_w = 18.01528 g/mol; CODATA R)
ZERO_CELSIUS_K = 273.15  # K

# --- Sea water and marine ---
KNOT_M_S = 1852.0 / 3600.0  # m s^-1 per knot (international nautical mile, 1852 m)

# --- CO2 conversion factors, t CO2 per t fuel (IMO MEPC.308(73), 2018 EEDI guidelines, Table) ---
CO2_FACTOR_T_PER_T = {
    "hfo": 3.114,  # heavy fuel oil
    "lfo": 3.151,  # light fuel oil
    "mdo": 3.206,  # marine diesel / gas oil
    "lng": 2.750,  # liquefied natural gas
    "methanol": 1.375,
}

SECONDS_PER_HOUR = 3600.0
HOURS_PER_YEAR = 8760.0
