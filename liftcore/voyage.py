"""Voyage savings: rotor performance expected over the wind of a trade, and what it is worth.

The rotors' operation in one wind condition comes from a callable ``operate(ship_speed_m_s,
true_wind_speed_m_s, true_wind_angle_rad)`` returning arrays per condition (in the dashboard,
``functools.partial(rotor.best_operation, setup)``): ``net_power_w``, ``thrust_n``,
``spin_power_w``, ``state`` (0 stopped, 1 running free, 2 running at a limit) and, when
available, ``side_force_n`` and ``heeling_moment_nm``. This module takes the expectation of those
over a wind description (a joint table, Weibull sectors or an hourly series, see
:mod:`liftcore.windstats`) and turns it into energy, fuel, CO2, money and payback.

Energy and fuel (stated assumptions)
------------------------------------
* *Engine power saved* = thrust x ship speed / propulsive efficiency (the rotor setup's
  efficiency; the ship speed is held, so the main engine delivers less).
* *Net power gain* = engine power saved - electric power drawn to spin the rotors.
* Fuel saved = engine power saved x SFOC of the main engine - spin power x SFOC of the
  generators: the spin power is bought from the generators at their own SFOC, not netted
  against the main engine. Both burn the same fuel.
* CO2 = fuel x the IMO conversion factor C_F of that fuel [1]_ [2]_.
* Cost saved per year = fuel saved x fuel price + CO2 avoided x carbon price - upkeep.
* Annual figures = mean over the time at sea x hours at sea per year; in port the rotors are
  idle and save nothing.

References
----------
.. [1] IMO Resolution MEPC.308(73) (2018), Guidelines on the method of calculation of the
   attained EEDI for new ships, section 2.2 (conversion factors C_F).
.. [2] IMO Resolution MEPC.364(79) (2022), 2022 Guidelines on the method of calculation of the
   attained EEDI for new ships, section 2.3 (same C_F values).
.. [3] IMO MEPC.1/Circ.815 (2013), Annex 11, Appendix 2, and MEPC.1/Circ.896 (2021): available
   effective power of wind propulsion systems, (0.5144 V_ref / eta_T) sum F W - sum P W.
"""

from __future__ import annotations

import io
import math
import os
import re
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import Callable

import numpy as np
import pandas as pd

from liftcore.constants import CO2_FACTOR_T_PER_T, HOURS_PER_YEAR, KNOT_M_S, SECONDS_PER_HOUR
from liftcore.errors import InputError, check_choice, check_number
from liftcore.files import open_regular
from liftcore import rotor, windstats
from liftcore.validity import ModelWarning

FUELS = tuple(CO2_FACTOR_T_PER_T)
FUEL_LABELS = {"hfo": "Heavy fuel oil (HFO)", "lfo": "Light fuel oil (LFO)",
               "mdo": "Marine diesel / gas oil (MDO/MGO)", "lng": "Liquefied natural gas (LNG)",
               "methanol": "Methanol"}

#: Knots to metres per second as written in the IMO wind-propulsion formula [3].
IMO_KNOT_FACTOR = 0.5144
#: Total efficiency of the main drive when no verified value is given (MEPC.1/Circ.815, App. 2, 3.1.4).
IMO_DEFAULT_TOTAL_EFFICIENCY = 0.7

#: Operating states reported by the rotor model.
STATE_STOPPED, STATE_FREE, STATE_LIMITED = 0, 1, 2

# Bins of the summaries every tally keeps (centres; each bin spans +- half a step).
HEAT_ANGLE_STEP_DEG = 10.0
HEAT_ANGLES_DEG = np.arange(0.0, 180.0 + 1e-9, HEAT_ANGLE_STEP_DEG)   # |true wind angle|
HEAT_SPEED_STEP_M_S = 1.0
HEAT_SPEEDS_M_S = np.arange(0.0, 30.0 + 1e-9, HEAT_SPEED_STEP_M_S)    # true wind speed
ROSE_SECTORS = 16
ROSE_SPEED_EDGES_M_S = (0.0, 4.0, 8.0, 12.0, 16.0)                   # last class open above
# Condition grid of a series (for the design sweep): ship speed x true wind angle x speed.
GRID_SHIP_SPEED_STEP_M_S = 0.5
GRID_SHIP_SPEEDS_M_S = np.arange(0.0, 20.0 + 1e-9, GRID_SHIP_SPEED_STEP_M_S)
GRID_ANGLES_DEG = np.arange(-180.0, 180.0, HEAT_ANGLE_STEP_DEG)
GRID_SPEEDS_M_S = HEAT_SPEEDS_M_S

#: Bits of the rotor model's per-condition flags whose share of time is tallied.
FLAG_BITS = 8

#: Weighted sums every tally keeps, in this order.
SUM_KEYS = ("net_power_w", "thrust_n", "spin_power_w", "engine_power_saved_w", "side_force_n",
            "heeling_moment_nm", "ship_speed_m_s", "true_wind_speed_m_s", "balance_power_w")
_S = {k: i for i, k in enumerate(SUM_KEYS)}
#: Per-month and per-leg sums: weight, net power, engine power saved, spin power.
_PART_KEYS = ("weight", "net_power_w", "engine_power_saved_w", "spin_power_w")

#: Series larger than this (rows, estimated from the file size) run on a local Dask cluster
#: when no scheduler is given: about 228 years of hourly rows, e.g. a fleet of 12 ships x 20 years.
DASK_AUTO_ROWS = 2_000_000
#: Rows a Dask block holds at most in memory while it is tallied.
DASK_BLOCK_ROWS = windstats.DEFAULT_CHUNK_ROWS


# ----------------------------------------------------------------------------- economics
@dataclass(frozen=True)
class ShipEconomics:
    """The ship's engines, fuel and prices.

    Attributes
    ----------
    sfoc_main_g_kwh : float
        Specific fuel oil consumption of the main engine near its usual load. [g kWh^-1]
    sfoc_generator_g_kwh : float
        Specific fuel oil consumption of the generators that supply the spin power. [g kWh^-1]
    fuel : str
        One of ``FUELS`` (hfo, lfo, mdo, lng, methanol); sets the CO2 factor.
    hours_at_sea_per_year : float
        Hours under way per year. [h]
    fuel_price_per_t, carbon_price_per_t_co2 : float
        Money per tonne of fuel and per tonne of CO2 (any currency, the same for all money).
    carbon_covered_share : float
        Share of the emissions the carbon price is paid on, 0 to 1. [-]
    installed_cost, upkeep_per_year : float
        Money to buy and fit the rotors, and to keep them running each year.
    discount_rate : float
        Yearly discount rate for the discounted payback, as a fraction (0.08 = 8 %).
    main_engine_power_w : float or None
        Mean main-engine power at sea without rotors (to express the saving as a share). [W]
    """

    sfoc_main_g_kwh: float = 175.0
    sfoc_generator_g_kwh: float = 205.0  # the voyage study's default (one value everywhere)
    fuel: str = "hfo"
    hours_at_sea_per_year: float = 6000.0
    fuel_price_per_t: float = 0.0
    carbon_price_per_t_co2: float = 0.0
    carbon_covered_share: float = 1.0
    installed_cost: float = 0.0
    upkeep_per_year: float = 0.0
    discount_rate: float = 0.0
    main_engine_power_w: float | None = None

    def __post_init__(self):
        check_choice("fuel", self.fuel, FUELS)
        check_number("main-engine SFOC", self.sfoc_main_g_kwh, "g/kWh", low=100.0, high=400.0)
        check_number("generator SFOC", self.sfoc_generator_g_kwh, "g/kWh", low=100.0, high=400.0)
        check_number("hours at sea per year", self.hours_at_sea_per_year, "h", low=0.0, high=HOURS_PER_YEAR)
        check_number("discount rate", self.discount_rate, "", low=0.0, high=1.0)
        check_number("share of CO2 under the allowance scheme", self.carbon_covered_share, "", low=0.0, high=1.0)


def co2_from_fuel(fuel_mass, fuel: str):
    """CO2 emitted by burning ``fuel_mass`` of ``fuel`` (same mass unit out as in).

    C_F [t CO2 / t fuel]: HFO 3.114, LFO 3.151, MDO/MGO 3.206, LNG 2.750, methanol 1.375 [1]_.

    References
    ----------
    .. [1] IMO MEPC.308(73) (2018) and MEPC.364(79) (2022), EEDI calculation guidelines.
    """
    check_choice("fuel", fuel, FUELS)
    return np.asarray(fuel_mass, dtype=float) * CO2_FACTOR_T_PER_T[fuel]


def fuel_from_energy_kg(energy_j, sfoc_g_kwh):
    """Fuel burnt to deliver ``energy_j`` at a specific fuel consumption. [kg]"""
    kwh = np.asarray(energy_j, dtype=float) / (1000.0 * SECONDS_PER_HOUR)
    return kwh * np.asarray(sfoc_g_kwh, dtype=float) / 1000.0


def simple_payback_years(installed_cost: float, annual_saving: float) -> float:
    """Years for the yearly saving to repay the installed cost; ``inf`` if it never does."""
    if annual_saving <= 0.0:
        return math.inf if installed_cost > 0.0 else 0.0
    return installed_cost / annual_saving


def discounted_payback_years(installed_cost: float, annual_saving: float, rate: float) -> float:
    """Years until the discounted yearly savings repay the cost (savings at each year's end,
    continuous in time): n = -ln(1 - r C / S) / ln(1 + r); ``inf`` if they never do."""
    if rate <= 0.0:
        return simple_payback_years(installed_cost, annual_saving)
    if annual_saving <= 0.0:
        return math.inf if installed_cost > 0.0 else 0.0
    x = rate * installed_cost / annual_saving
    if x >= 1.0:
        return math.inf
    return -math.log1p(-x) / math.log1p(rate)


def imo_wind_propulsion_power_kw(reference_speed_kn: float, total_efficiency: float, force_kn,
                                 power_kw, probability) -> float:
    """Available effective power of a wind propulsion system, f_eff x P_eff. [kW]

    (0.5144 V_ref / eta_T) sum_ij F(V_ref)_ij W_ij - sum_ij P(V_ref)_ij W_ij

    Parameters
    ----------
    reference_speed_kn : float
        Ship reference speed V_ref. [kn]
    total_efficiency : float
        Total efficiency of the main drive eta_T (0.7 when not verified otherwise).
    force_kn : ndarray
        Thrust of the wind propulsion system in each wind condition at V_ref. [kN]
    power_kw : ndarray
        Power demand to run the system in each condition. [kW]
    probability : ndarray
        Wind probability matrix W (same shape, sums to 1).

    References
    ----------
    .. [1] IMO MEPC.1/Circ.815 (2013), Annex 11, Appendix 2, 3.1; MEPC.1/Circ.896 (2021).
    """
    v = check_number("reference speed", reference_speed_kn, "kn", low=0.0)
    eta = check_number("total efficiency of the main drive", total_efficiency, "", low=0.0, high=1.0,
                       low_inclusive=False)
    f = np.asarray(force_kn, dtype=float)
    p = np.asarray(power_kw, dtype=float)
    w = np.asarray(probability, dtype=float)
    if not (f.shape == p.shape == w.shape):
        raise ValueError(f"F, P and W must have the same shape (got {f.shape}, {p.shape}, {w.shape})")
    if abs(w.sum() - 1.0) > windstats.PROBABILITY_TOLERANCE:
        raise InputError("probability", f"the wind probability matrix sums to {w.sum():.9g}; it must "
                                        f"sum to 1 within {windstats.PROBABILITY_TOLERANCE:g}")
    return float(IMO_KNOT_FACTOR * v / eta * np.sum(f * w) - np.sum(p * w))


# ----------------------------------------------------------------------------- speed profile
def parse_speed_profile(text: str, default_speed_m_s: float) -> tuple[np.ndarray, np.ndarray]:
    """Ship speeds [m/s] and shares of sea time from ``"12:0.6, 10:0.4"`` (knots : share).

    An empty text means one speed, ``default_speed_m_s``, all the time. Shares must sum to 1.
    """
    text = (text or "").strip()
    if not text:
        return np.array([float(default_speed_m_s)]), np.array([1.0])
    speeds, shares = [], []
    for part in re.split(r"[,;\n]+", text):
        part = part.strip()
        if not part:
            continue
        bits = part.split(":")
        if len(bits) != 2:
            raise InputError("speed profile", f"speed profile entry {part!r} must read knots:share, "
                                              "e.g. 12:0.6, 10:0.4")
        v = check_number("speed profile speed", _num(bits[0]), "kn", low=0.0, high=40.0,
                         low_inclusive=False)
        s = check_number("speed profile share", _num(bits[1]), "", low=0.0, high=1.0)
        speeds.append(v * KNOT_M_S)
        shares.append(s)
    if not speeds:
        return np.array([float(default_speed_m_s)]), np.array([1.0])
    total = sum(shares)
    if abs(total - 1.0) > windstats.PROBABILITY_TOLERANCE:
        raise InputError("speed profile", f"speed profile shares sum to {total:.6g}; they must sum "
                                          "to 1 (e.g. 12:0.6, 10:0.4)")
    return np.array(speeds), np.array(shares)


def _num(s: str):
    try:
        return float(s.strip())
    except ValueError:
        return s.strip()


# ----------------------------------------------------------------------------- tallies
def _bin_index(values, first_centre: float, step: float, n: int) -> np.ndarray:
    return np.clip(np.floor((values - first_centre) / step + 0.5).astype(np.int64), 0, n - 1)


@dataclass
class Tally:
    """Weighted sums over wind conditions; two tallies of disjoint data add up exactly.

    Weights are hours for a series and probabilities for a table. Everything the summary, the
    figures and the design sweep need is kept, in arrays of fixed size, so a tally of twenty
    years of hourly rows is as small as one of a day.
    """

    rows: int = 0
    weight: float = 0.0
    sums: np.ndarray = field(default_factory=lambda: np.zeros(len(SUM_KEYS)))
    state: np.ndarray = field(default_factory=lambda: np.zeros(3))
    peak: np.ndarray = field(default_factory=lambda: np.zeros(2))  # max |heel| [N m], max |side| [N]
    flags: np.ndarray = field(default_factory=lambda: np.zeros(FLAG_BITS))  # weight with each bit set
    heat_weight: np.ndarray = field(default_factory=lambda: np.zeros((HEAT_ANGLES_DEG.size, HEAT_SPEEDS_M_S.size)))
    heat_net: np.ndarray = field(default_factory=lambda: np.zeros((HEAT_ANGLES_DEG.size, HEAT_SPEEDS_M_S.size)))
    rose: np.ndarray = field(default_factory=lambda: np.zeros((ROSE_SECTORS, len(ROSE_SPEED_EDGES_M_S))))
    rose_is_direction: bool = False
    months: np.ndarray | None = None          # (12, len(_PART_KEYS))
    legs: dict = field(default_factory=dict)  # leg -> (len(_PART_KEYS),)
    grid: np.ndarray | None = None            # (4, ship speed, angle, wind speed): w, w*vs, w*dA, w*tws
    time_span_ns: tuple | None = None         # (first, last) time in ns since the epoch
    warnings: tuple = ()

    def __add__(self, other: "Tally") -> "Tally":
        def add(a, b):
            if a is None:
                return None if b is None else b.copy()
            return a.copy() if b is None else a + b

        legs = {k: v.copy() for k, v in self.legs.items()}
        for k, v in other.legs.items():
            legs[k] = legs[k] + v if k in legs else v.copy()
        span = self.time_span_ns
        if other.time_span_ns is not None:
            span = other.time_span_ns if span is None else (min(span[0], other.time_span_ns[0]),
                                                           max(span[1], other.time_span_ns[1]))
        return Tally(rows=self.rows + other.rows, weight=self.weight + other.weight,
                     sums=self.sums + other.sums, state=self.state + other.state,
                     flags=self.flags + other.flags,
                     peak=np.maximum(self.peak, other.peak), heat_weight=self.heat_weight + other.heat_weight,
                     heat_net=self.heat_net + other.heat_net, rose=self.rose + other.rose,
                     rose_is_direction=self.rose_is_direction or other.rose_is_direction,
                     months=add(self.months, other.months), legs=legs, grid=add(self.grid, other.grid),
                     time_span_ns=span, warnings=merge_warnings(self.warnings, other.warnings))

    def mean(self, key: str) -> float:
        return float(self.sums[_S[key]] / self.weight) if self.weight > 0 else math.nan


def merge_warnings(*groups) -> tuple:
    """Concatenate warnings keeping the first of each (code, subject)."""
    out, seen = [], set()
    for g in groups:
        for w in g:
            k = (w.code, w.subject)
            if k not in seen:
                seen.add(k)
                out.append(w)
    return tuple(out)


def _attr(op, name: str, n: int, default=np.nan) -> np.ndarray:
    v = op.get(name) if isinstance(op, dict) else getattr(op, name, None)
    if v is None:
        return np.full(n, default)
    return np.broadcast_to(np.asarray(v, dtype=float), (n,))


def operation_arrays(op, n: int) -> dict:
    """The per-condition arrays voyage needs from an operation result (dict or dataclass).

    * engine power saved: ``propulsion_power_saved_w`` (thrust x ship speed / propulsive
      efficiency) less ``balance_power_w`` (the leeway and rudder resistance, 0 without a hull)
      when given, else ``engine_power_saved_w``, else net power + spin power;
    * spin power: the electric power drawn from the ship's plant, ``electrical_power_w`` when
      given, else ``spin_power_w``;
    so that net power gain = engine power saved - spin power, as in the rotor model.
    """
    net = _attr(op, "net_power_w", n)
    spin = _attr(op, "electrical_power_w", n)
    if np.all(np.isnan(spin)):
        spin = _attr(op, "spin_power_w", n, 0.0)
    # the engine saves the thrust power less what it spends on the leeway and rudder resistance
    balance = _attr(op, "balance_power_w", n, 0.0)
    eng = _attr(op, "propulsion_power_saved_w", n) - balance
    if np.all(np.isnan(eng)):
        eng = _attr(op, "engine_power_saved_w", n)
    if np.all(np.isnan(eng)):
        eng = net + spin
    flags = _attr(op, "flags", n, 0.0)
    return {"net_power_w": net, "thrust_n": _attr(op, "thrust_n", n), "spin_power_w": spin,
            "engine_power_saved_w": eng, "side_force_n": _attr(op, "side_force_n", n, 0.0),
            "heeling_moment_nm": _attr(op, "heeling_moment_nm", n, 0.0), "balance_power_w": balance,
            "state": _attr(op, "state", n, STATE_FREE),
            "flags": np.nan_to_num(flags, nan=0.0).astype(np.int64)}


def _warnings_of(op) -> tuple:
    w = op.get("warnings", ()) if isinstance(op, dict) else getattr(op, "warnings", ())
    return tuple(x for x in (w or ()) if isinstance(x, ModelWarning))


def tally_conditions(operate: Callable, ship_speed_m_s, true_wind_speed_m_s, true_wind_angle_deg,
                     weight, *, direction_deg=None, month=None, leg=None, with_grid: bool = False,
                     rows: int | None = None, time_span_ns=None) -> Tally:
    """Run ``operate`` on each condition at sea (ship speed > 0, weight > 0) and tally the result.

    Parameters
    ----------
    operate : callable
        ``operate(ship_speed_m_s, true_wind_speed_m_s, true_wind_angle_rad)`` -> operation.
    ship_speed_m_s, true_wind_speed_m_s, true_wind_angle_deg, weight : ndarray
        Conditions (angle relative to the bow) and their weights (hours or probabilities).
    direction_deg : ndarray, optional
        True wind direction from north, for a wind rose in compass directions (otherwise the
        rose is drawn relative to the bow).
    month : ndarray of int, optional
        Calendar month of each condition (series), for monthly bars.
    leg : ndarray of str, optional
        Leg name of each condition (series), for per-leg bars.
    with_grid : bool
        Also keep the binned condition grid (series), for the design sweep.
    """
    vs = np.asarray(ship_speed_m_s, dtype=float).ravel()
    tws = np.asarray(true_wind_speed_m_s, dtype=float).ravel()
    twa = windstats.wrap_angle_deg(np.asarray(true_wind_angle_deg, dtype=float).ravel())
    w = np.broadcast_to(np.asarray(weight, dtype=float), vs.shape).ravel()
    t = Tally(rows=int(vs.size if rows is None else rows), time_span_ns=time_span_ns)
    if month is not None:
        t.months = np.zeros((12, len(_PART_KEYS)))
    if with_grid:
        t.grid = np.zeros((4, GRID_SHIP_SPEEDS_M_S.size, GRID_ANGLES_DEG.size, GRID_SPEEDS_M_S.size))
    sea = (vs > 0.0) & (w > 0.0)
    if not sea.any():
        return t
    vs, tws, twa, w = vs[sea], tws[sea], twa[sea], w[sea]
    op = operate(vs, tws, np.radians(twa))
    a = operation_arrays(op, vs.size)
    t.warnings = merge_warnings(_warnings_of(op))
    t.weight = float(w.sum())
    cols = np.stack([a["net_power_w"], a["thrust_n"], a["spin_power_w"], a["engine_power_saved_w"],
                     a["side_force_n"], a["heeling_moment_nm"], vs, tws, a["balance_power_w"]])
    t.sums = cols @ w
    state = np.clip(np.rint(np.nan_to_num(a["state"], nan=STATE_FREE)).astype(np.int64), 0, 2)
    t.state = np.bincount(state, weights=w, minlength=3)[:3].astype(float)
    t.peak = np.array([float(np.nanmax(np.abs(a["heeling_moment_nm"]))),
                       float(np.nanmax(np.abs(a["side_force_n"])))])
    t.peak = np.nan_to_num(t.peak)
    bits = (a["flags"][None, :] >> np.arange(FLAG_BITS)[:, None]) & 1
    t.flags = bits.astype(float) @ w
    ia = _bin_index(np.abs(twa), HEAT_ANGLES_DEG[0], HEAT_ANGLE_STEP_DEG, HEAT_ANGLES_DEG.size)
    iv = _bin_index(tws, HEAT_SPEEDS_M_S[0], HEAT_SPEED_STEP_M_S, HEAT_SPEEDS_M_S.size)
    flat = ia * HEAT_SPEEDS_M_S.size + iv
    size = HEAT_ANGLES_DEG.size * HEAT_SPEEDS_M_S.size
    t.heat_weight = np.bincount(flat, weights=w, minlength=size).reshape(t.heat_weight.shape)
    t.heat_net = np.bincount(flat, weights=w * a["net_power_w"], minlength=size).reshape(t.heat_net.shape)
    rose_dir = twa if direction_deg is None else np.asarray(direction_deg, dtype=float).ravel()[sea]
    t.rose_is_direction = direction_deg is not None
    step = 360.0 / ROSE_SECTORS
    isec = np.floor(np.mod(rose_dir + step / 2.0, 360.0) / step).astype(np.int64) % ROSE_SECTORS
    icls = np.clip(np.searchsorted(ROSE_SPEED_EDGES_M_S, tws, side="right") - 1, 0,
                   len(ROSE_SPEED_EDGES_M_S) - 1)
    t.rose = np.bincount(isec * len(ROSE_SPEED_EDGES_M_S) + icls, weights=w,
                         minlength=t.rose.size).reshape(t.rose.shape)
    parts = np.stack([np.ones_like(w), a["net_power_w"], a["engine_power_saved_w"], a["spin_power_w"]])
    if month is not None:
        m = np.asarray(month, dtype=np.int64).ravel()[sea] - 1
        for j in range(len(_PART_KEYS)):
            t.months[:, j] = np.bincount(m, weights=w * parts[j], minlength=12)[:12]
    if leg is not None:
        names = np.asarray(leg, dtype=object).ravel()[sea]
        uniq, first, inv = np.unique(names.astype(str), return_index=True, return_inverse=True)
        for u in np.argsort(first):  # in order of first appearance
            sel = inv == u
            t.legs[str(uniq[u])] = parts[:, sel] @ w[sel]
    if with_grid:
        g0 = _bin_index(vs, 0.0, GRID_SHIP_SPEED_STEP_M_S, GRID_SHIP_SPEEDS_M_S.size)
        g1 = np.floor(np.mod(twa + 180.0 + HEAT_ANGLE_STEP_DEG / 2.0, 360.0) / HEAT_ANGLE_STEP_DEG).astype(np.int64) % GRID_ANGLES_DEG.size
        g2 = _bin_index(tws, GRID_SPEEDS_M_S[0], HEAT_SPEED_STEP_M_S, GRID_SPEEDS_M_S.size)
        d_angle = windstats.wrap_angle_deg(twa - GRID_ANGLES_DEG[g1])
        gflat = (g0 * GRID_ANGLES_DEG.size + g1) * GRID_SPEEDS_M_S.size + g2
        gsize = t.grid[0].size
        for j, vals in enumerate((np.ones_like(w), vs, d_angle, tws)):
            t.grid[j] = np.bincount(gflat, weights=w * vals, minlength=gsize).reshape(t.grid[0].shape)
    return t


# ----------------------------------------------------------------------------- drivers
def conditions_from_joint(joint: windstats.JointWind, speeds_m_s, shares) -> dict:
    """Every (ship speed, wind condition) pair of a speed profile and a joint table, weighted."""
    speeds = np.asarray(speeds_m_s, dtype=float)
    shares = np.asarray(shares, dtype=float)
    n = joint.size
    return {"ship_speed_m_s": np.repeat(speeds, n),
            "true_wind_speed_m_s": np.tile(joint.true_wind_speed_m_s, speeds.size),
            "true_wind_angle_deg": np.tile(joint.true_wind_angle_deg, speeds.size),
            "weight": np.repeat(shares, n) * np.tile(joint.probability, speeds.size),
            "direction_deg": (None if joint.true_wind_direction_deg is None
                              else np.tile(joint.true_wind_direction_deg, speeds.size))}


def tally_joint(operate: Callable, joint: windstats.JointWind, speeds_m_s, shares,
                with_grid: bool = False) -> Tally:
    """Tally a joint wind table under a ship speed profile (speeds and shares of sea time)."""
    c = conditions_from_joint(joint, speeds_m_s, shares)
    return tally_conditions(operate, c["ship_speed_m_s"], c["true_wind_speed_m_s"],
                            c["true_wind_angle_deg"], c["weight"], direction_deg=c["direction_deg"],
                            with_grid=with_grid)


def tally_block(operate: Callable, block: windstats.SeriesBlock) -> Tally:
    """Tally one checked block of an hourly series (each row weighs one hour)."""
    return tally_conditions(operate, block.ship_speed_m_s, block.true_wind_speed_m_s,
                            block.true_wind_angle_deg, 1.0, direction_deg=block.true_wind_direction_deg,
                            month=block.month, leg=block.leg, with_grid=True,
                            time_span_ns=block.time_span_ns)


def tally_series(operate: Callable, source, name: str | None = None,
                 chunk_rows: int = windstats.DEFAULT_CHUNK_ROWS, progress=None) -> Tally:
    """Stream an hourly series through ``operate`` block by block (bounded memory)."""
    total = Tally(months=np.zeros((12, len(_PART_KEYS))))
    for block in windstats.iter_series(source, name, chunk_rows, progress):
        total = total + tally_block(operate, block)
    return total


# ----------------------------------------------------------------------------- Dask
def estimate_rows(source) -> int:
    """Rows of a series: exact for a DataFrame, estimated from the file size for a path."""
    if isinstance(source, pd.DataFrame):
        return len(source)
    p = Path(source)
    with open_regular(p, p.name) as fh:
        size = os.fstat(fh.fileno()).st_size
        head = fh.read(65536)
    lines = [ln for ln in head.splitlines() if ln.strip() and not ln.lstrip().startswith(b"#")]
    if len(lines) < 2:
        return max(len(lines) - 1, 0)
    per_row = sum(len(ln) + 1 for ln in lines[1:]) / (len(lines) - 1)
    return int(size / per_row)


def _file_blocks(path: Path, block_bytes: int) -> tuple[list[str], list[tuple[int, int]]]:
    """(header columns, [(start, end) byte ranges of whole lines]) of a CSV series file."""
    with open_regular(path, path.name) as fh:
        size = os.fstat(fh.fileno()).st_size
        while True:
            line = fh.readline()
            if not line:
                raise InputError("file", f"{path.name}: the file is empty or has no header")
            if line.strip() and not line.lstrip().startswith(b"#"):
                break
        try:
            header = [str(c).strip() for c in pd.read_csv(io.BytesIO(line), nrows=0).columns]
        except (UnicodeDecodeError, pd.errors.ParserError):
            raise InputError("file", f"{path.name}: the header line is not readable CSV text") from None
        start = fh.tell()
        cuts = [start]
        target = start + block_bytes
        while target < size:
            fh.seek(target)
            fh.readline()
            pos = fh.tell()
            if pos >= size:
                break
            cuts.append(pos)
            target = pos + block_bytes
    cuts.append(size)
    return header, [(a, b) for a, b in zip(cuts[:-1], cuts[1:]) if b > a]


def _run_block(operate, df: pd.DataFrame, chunk_rows: int):
    """Worker side: tally a block; a bad cell comes back as data (local row, column, detail)."""
    total = Tally(months=np.zeros((12, len(_PART_KEYS))))
    for start in range(0, len(df), chunk_rows):
        part = df.iloc[start:start + chunk_rows]
        try:
            block = windstats.check_series_frame(part, start)
        except windstats.CellError as exc:
            return ("bad", start + exc.row, exc.column, exc.detail)
        total = total + tally_block(operate, block)
    return ("ok", len(df), total)


def _dask_file_block(operate, path: str, start: int, end: int, header: list, chunk_rows: int):
    with open(path, "rb") as fh:
        fh.seek(start)
        data = fh.read(end - start)
    keep = windstats.series_usecols(header)
    try:
        df = pd.read_csv(io.BytesIO(data), header=None, names=header, usecols=keep, comment="#",
                         skipinitialspace=True, dtype={"leg": "string"} if "leg" in keep else None)
    except pd.errors.EmptyDataError:
        return ("ok", 0, Tally(months=np.zeros((12, len(_PART_KEYS)))))
    except (UnicodeDecodeError, pd.errors.ParserError) as exc:
        return ("file", " ".join(str(exc).split()))
    return _run_block(operate, df, chunk_rows)


def _dask_frame_block(operate, df: pd.DataFrame, chunk_rows: int):
    return _run_block(operate, df, chunk_rows)


def local_cluster(n_workers: int = 2):
    """A ``dask.distributed.LocalCluster`` of ``n_workers`` single-threaded processes on 127.0.0.1.

    Notes
    -----
    Dask's nanny normally starts workers with ``MALLOC_TRIM_THRESHOLD_=65536``; that makes
    glibc hand every large numpy temporary back to the operating system and fault it in again,
    which slowed the best-spin search about 2.5 times in our measurements. Our local clusters
    start without it (workers of a remote scheduler are configured by whoever runs them).
    """
    import dask
    from dask.distributed import LocalCluster

    with dask.config.set({"distributed.nanny.pre-spawn-environ.MALLOC_TRIM_THRESHOLD_": None}):
        return LocalCluster(n_workers=n_workers, threads_per_worker=1, host="127.0.0.1",
                            processes=True, dashboard_address=None)


def tally_series_dask(operate: Callable, source, name: str | None = None, scheduler: str | None = None,
                      n_workers: int = 2, blocks_per_worker: int = 4,
                      chunk_rows: int = DASK_BLOCK_ROWS, block_bytes: int | None = None,
                      connect_timeout_s: float = 20.0, progress=None) -> Tally:
    """The same tally as :func:`tally_series`, computed on a Dask cluster.

    Parameters
    ----------
    scheduler : str, optional
        Address of a running ``dask.distributed`` scheduler (``tcp://host:8786``); the workers
        must read the file at the same path. ``None`` or ``"local"`` starts a local cluster of
        ``n_workers`` processes on 127.0.0.1 for this call and closes it afterwards.
    block_bytes : int, optional
        Bytes of file (or rows of a DataFrame, / 64) per task; by default the source is cut into
        ``blocks_per_worker`` tasks per worker, 256 KiB to 64 MiB each.

    Notes
    -----
    A file is cut into byte ranges on whole lines; each worker reads its range and tallies it in
    blocks of ``chunk_rows`` rows. A DataFrame is cut into row blocks sent to the workers. Bad
    cells come back as data so that the error names the row in the whole file.
    """
    from dask.distributed import Client, as_completed

    label = windstats._name_of(source, name)
    if isinstance(source, pd.DataFrame):
        df = windstats._series_frame_columns(source, label)
        if len(df) == 0:
            raise InputError("file", f"{label}: no data rows under the header")
    else:
        path = Path(source)
        if not path.exists():
            raise InputError("file", f"{label}: file not found")
    cluster = None
    if scheduler in (None, "", "local"):
        cluster = local_cluster(n_workers)
        client = Client(cluster)
    else:
        try:
            client = Client(scheduler, timeout=connect_timeout_s)
        except (OSError, TimeoutError, ValueError) as exc:
            raise InputError("dask-scheduler", f"cannot reach the Dask scheduler at {scheduler!r} "
                                               f"({' '.join(str(exc).split()) or type(exc).__name__})") from None
    try:
        workers = max(1, len(client.scheduler_info().get("workers", {})) or n_workers)
        target_blocks = workers * blocks_per_worker
        op = client.scatter(operate, broadcast=True)
        futures = []
        if isinstance(source, pd.DataFrame):
            rows = (max(1, block_bytes // 64) if block_bytes else
                    max(1, math.ceil(len(df) / target_blocks)))
            for s in range(0, len(df), rows):
                part = client.scatter(df.iloc[s:s + rows])
                futures.append(client.submit(_dask_frame_block, op, part, chunk_rows, pure=False))
        else:
            size = path.stat().st_size
            if not block_bytes:
                block_bytes = int(min(max(size / target_blocks, 256 << 10), 64 << 20))
            header, ranges = _file_blocks(path, int(block_bytes))
            missing = [c for c in windstats.SERIES_COLUMNS if c not in header]
            if missing:
                windstats._series_frame_columns(pd.DataFrame(columns=header), label)
            for a, b in ranges:
                futures.append(client.submit(_dask_file_block, op, str(path.resolve()), a, b, header,
                                             chunk_rows, pure=False))
        index = {f.key: i for i, f in enumerate(futures)}
        results = [None] * len(futures)
        done = 0
        for fut in as_completed(futures):
            results[index[fut.key]] = fut.result()
            done += 1
            if progress:
                progress(done / len(futures), f"Computing on Dask ({done} of {len(futures)} blocks)")
    finally:
        client.close()
        if cluster is not None:
            cluster.close()
    total = Tally(months=np.zeros((12, len(_PART_KEYS))))
    offset = 0
    for r in results:
        if r[0] == "file":
            raise InputError("file", f"{label}: not a readable CSV table ({r[1]})")
        if r[0] == "bad":
            raise InputError(r[2], f"{label}, row {offset + r[1] + 1}: {r[3]}")
        offset += r[1]
        total = total + r[2]
    if offset == 0:
        raise InputError("file", f"{label}: no data rows under the header")
    return total


# ----------------------------------------------------------------------------- summary
@dataclass(frozen=True)
class VoyageSummary:
    """Expected rotor performance at sea and its yearly worth.

    Means are over the time at sea (weighted by probability or hours); annual figures are the
    means times ``hours_at_sea_per_year``. Money is in the currency of the prices entered.
    """

    mean_net_power_w: float
    mean_thrust_n: float
    mean_spin_power_w: float
    mean_engine_power_saved_w: float
    mean_side_force_n: float
    peak_heeling_moment_nm: float
    peak_side_force_n: float
    running_share: float
    free_share: float
    limited_share: float
    stopped_share: float
    hours_at_sea_per_year: float
    annual_energy_saved_j: float
    annual_engine_energy_saved_j: float
    annual_spin_energy_j: float
    annual_fuel_saved_kg: float
    annual_co2_avoided_kg: float
    annual_fuel_cost_saved: float
    annual_carbon_cost_saved: float
    annual_cost_saved: float
    payback_years: float
    discounted_payback_years: float
    engine_power_share: float
    mean_ship_speed_m_s: float
    mean_true_wind_speed_m_s: float
    rows: int
    weight: float
    warnings: tuple = ()
    #: Power the engine spends on the leeway and rudder resistance, mean at sea (0 without a hull). [W]
    mean_balance_power_w: float = 0.0

    @property
    def balance_share(self) -> float:
        """Share of the gross saving (thrust power) lost to leeway and rudder. [-]"""
        gross = self.mean_engine_power_saved_w + self.mean_balance_power_w
        return self.mean_balance_power_w / gross if gross > 0 else 0.0

    def as_json(self) -> dict:
        """The command-line keys (snake_case with units)."""
        return {
            "mean_net_power_kw": self.mean_net_power_w / 1000.0,
            "mean_balance_power_kw": self.mean_balance_power_w / 1000.0,
            "balance_share_of_gross": self.balance_share,
            "mean_thrust_kn": self.mean_thrust_n / 1000.0,
            "annual_energy_saved_mwh": self.annual_energy_saved_j / 3.6e9,
            "annual_fuel_saved_t": self.annual_fuel_saved_kg / 1000.0,
            "annual_co2_avoided_t": self.annual_co2_avoided_kg / 1000.0,
            "annual_cost_saved": self.annual_cost_saved,
            "running_share": self.running_share,
            "stopped_share": self.stopped_share,
            "limited_share": self.limited_share,
            "mean_spin_power_kw": self.mean_spin_power_w / 1000.0,
            "mean_engine_power_saved_kw": self.mean_engine_power_saved_w / 1000.0,
            "annual_fuel_cost_saved": self.annual_fuel_cost_saved,
            "annual_carbon_cost_saved": self.annual_carbon_cost_saved,
            "payback_years": self.payback_years,
            "discounted_payback_years": self.discounted_payback_years,
            "peak_heeling_moment_knm": self.peak_heeling_moment_nm / 1000.0,
            "peak_side_force_kn": self.peak_side_force_n / 1000.0,
            "hours_at_sea_per_year": self.hours_at_sea_per_year,
            "warnings": [w.as_dict() for w in self.warnings],
        }


#: Rotor warnings that hold per condition: over a voyage they are restated as a share of the time
#: at sea (code -> flag bit, sentence with {share}, headline it qualifies).
FLAG_WARNINGS = {
    "spin_ratio_outside_data": (rotor.FLAG_SR_OUTSIDE_DATA,
                                "Spin ratio along the rotor leaves the data of the coefficient set "
                                "{share} of the time at sea; coefficients are held at the end of "
                                "the data there.", ""),
    "reynolds_outside_data": (rotor.FLAG_RE_OUTSIDE_DATA,
                              "Reynolds number outside the data of the coefficient set {share} of "
                              "the time at sea: coefficients measured at another scale.", ""),
    "apparent_wind_too_far_forward": (rotor.FLAG_WIND_TOO_FAR_FORWARD,
                                      "Apparent wind too close to the bow for any forward thrust "
                                      "{share} of the time at sea.", "mean_thrust"),
    "rpm_limit": (rotor.FLAG_RPM, "Spin limited by the maximum rotor speed {share} of the time "
                                  "at sea.", "limited_share"),
    "motor_power_limit": (rotor.FLAG_MOTOR_POWER, "Spin limited by the maximum motor power "
                                                  "{share} of the time at sea.", "limited_share"),
    "heel_limit": (rotor.FLAG_HEEL, "Spin limited by the heeling-moment limit {share} of the "
                                    "time at sea.", "peak_heeling_moment"),
    "heel_above_limit_when_stopped": (rotor.FLAG_HEEL_WHEN_STOPPED,
                                      "Even the stopped rotors heel the ship more than the "
                                      "heeling-moment limit {share} of the time at sea.",
                                      "peak_heeling_moment"),
    "spin_ratio_limit": (rotor.FLAG_SPIN_RATIO_LIMIT, "Spin held at the highest spin ratio "
                                                      "allowed {share} of the time at sea.",
                         "limited_share"),
}
#: Other rotor warnings: the headline they qualify, or None to leave them out over a voyage
#: (the operating-time shares already say how often the rotors stop).
OTHER_WARNING_SUBJECTS = {"rotor_stopped": None, "calm": None, "zero_ship_speed": None,
                          "rotor_interaction_assumed": "",
                          "rotors_in_each_others_wake": "",
                          "spin_power_from_friction_model": "mean_net_power"}
_COUNT_SUFFIX = re.compile(r" \(in [\d,]+ of [\d,]+ conditions\)")


def _share_text(x: float) -> str:
    if x <= 0:
        return "0 %"
    return "under 0.1 %" if x < 0.001 else f"{100 * x:.1f} %"


def voyage_warnings(t: Tally) -> tuple:
    """The rotor model's warnings restated for a whole voyage (shares of the time at sea)."""
    out = []
    for w in t.warnings:
        if w.code in FLAG_WARNINGS:
            bit, text, subject = FLAG_WARNINGS[w.code]
            share = t.flags[int(bit).bit_length() - 1] / t.weight if t.weight > 0 else 0.0
            out.append(ModelWarning(w.code, text.format(share=_share_text(share)), subject, w.severity))
        elif w.code in OTHER_WARNING_SUBJECTS:
            subject = OTHER_WARNING_SUBJECTS[w.code]
            if subject is not None:
                out.append(ModelWarning(w.code, _COUNT_SUFFIX.sub("", w.message), subject, w.severity))
        else:
            out.append(ModelWarning(w.code, _COUNT_SUFFIX.sub("", w.message), "", w.severity))
    return tuple(out)


def series_span_hours(t: Tally) -> float:
    """Hours from the first to the last row of a series, plus the last row's hour."""
    if t.time_span_ns is None:
        return math.nan
    return (t.time_span_ns[1] - t.time_span_ns[0]) / 3.6e12 + 1.0


def series_hours_at_sea_per_year(t: Tally) -> float:
    """Hours at sea per year in a series: hours under way / years the series spans (each row one
    hour), at most 8760."""
    if t.time_span_ns is None or t.weight <= 0:
        return math.nan
    years = max(series_span_hours(t), 1.0) / HOURS_PER_YEAR
    return min(t.weight / years, HOURS_PER_YEAR)


def series_warnings(t: Tally) -> tuple:
    """Cautions about how a series covers time (short spans, rows closer than an hour)."""
    out = []
    span = series_span_hours(t)
    if not math.isfinite(span):
        return ()
    if t.rows > 1.01 * span:
        out.append(ModelWarning("series_not_hourly",
                                f"The series has {t.rows:,} rows over {span:,.0f} hours: each row is "
                                "counted as one hour, so rows closer than an hour overweight their "
                                "period; resample to hourly rows.", ""))
    if span < 0.99 * HOURS_PER_YEAR:
        out.append(ModelWarning("series_shorter_than_a_year",
                                f"The series spans {span / 24:,.0f} days: yearly figures assume the "
                                "rest of the year has the same winds (seasons are not covered).",
                                "annual_energy_saved"))
    return tuple(out)


def summarise(t: Tally, ship: ShipEconomics, hours_at_sea_per_year: float | None = None) -> VoyageSummary:
    """Annual energy, fuel, CO2, money and payback from a tally."""
    if t.weight <= 0:
        raise InputError("wind", "no time at sea in the wind data (every row has ship speed 0)")
    hours = ship.hours_at_sea_per_year if hours_at_sea_per_year is None else hours_at_sea_per_year
    net, eng, spin = t.mean("net_power_w"), t.mean("engine_power_saved_w"), t.mean("spin_power_w")
    sec = hours * SECONDS_PER_HOUR
    fuel = float(fuel_from_energy_kg(eng * sec, ship.sfoc_main_g_kwh)
                 - fuel_from_energy_kg(spin * sec, ship.sfoc_generator_g_kwh))
    co2 = float(co2_from_fuel(fuel, ship.fuel))
    fuel_cost = fuel / 1000.0 * ship.fuel_price_per_t
    carbon_cost = co2 / 1000.0 * ship.carbon_price_per_t_co2 * ship.carbon_covered_share
    cost = fuel_cost + carbon_cost - ship.upkeep_per_year
    shares = np.clip(t.state / t.weight, 0.0, 1.0)  # sums of weights can overshoot 1 by round-off
    warnings = list(voyage_warnings(t))
    if cost <= 0 and ship.installed_cost > 0:
        warnings.append(ModelWarning("no_payback", "the yearly saving does not exceed the upkeep: "
                                     "the installation never pays back at these prices",
                                     "payback"))
    if fuel < 0:
        warnings.append(ModelWarning("fuel_increase", "the generators burn more fuel to spin the "
                                     "rotors than the main engine saves on this trade",
                                     "annual_fuel_saved"))
    me = ship.main_engine_power_w
    return VoyageSummary(
        mean_net_power_w=net, mean_thrust_n=t.mean("thrust_n"), mean_spin_power_w=spin,
        mean_engine_power_saved_w=eng, mean_side_force_n=t.mean("side_force_n"),
        peak_heeling_moment_nm=float(t.peak[0]), peak_side_force_n=float(t.peak[1]),
        running_share=float(shares[STATE_FREE] + shares[STATE_LIMITED]),
        free_share=float(shares[STATE_FREE]), limited_share=float(shares[STATE_LIMITED]),
        stopped_share=float(shares[STATE_STOPPED]), hours_at_sea_per_year=float(hours),
        annual_energy_saved_j=net * sec, annual_engine_energy_saved_j=eng * sec,
        annual_spin_energy_j=spin * sec, annual_fuel_saved_kg=fuel, annual_co2_avoided_kg=co2,
        annual_fuel_cost_saved=fuel_cost, annual_carbon_cost_saved=carbon_cost,
        annual_cost_saved=cost, payback_years=simple_payback_years(ship.installed_cost, cost),
        discounted_payback_years=discounted_payback_years(ship.installed_cost, cost, ship.discount_rate),
        engine_power_share=(eng / me if me else math.nan),
        mean_ship_speed_m_s=t.mean("ship_speed_m_s"), mean_true_wind_speed_m_s=t.mean("true_wind_speed_m_s"),
        rows=t.rows, weight=t.weight, warnings=merge_warnings(warnings),
        mean_balance_power_w=t.mean("balance_power_w"))


def summaries_over(setups, conditions: dict, ship: ShipEconomics, hours_at_sea_per_year: float | None = None,
                   progress=None) -> list[VoyageSummary]:
    """The year of several rotor setups over the same weighted conditions, the wind along the
    rotor computed once for all (:func:`liftcore.rotor.best_operations`).

    Parameters
    ----------
    setups : sequence of liftcore.rotor.RotorSetup
        Setups sharing geometry, wind profile and air (e.g. one rotor with each published set).
    conditions : dict
        Arrays ``ship_speed_m_s`` [m/s], ``true_wind_speed_m_s`` [m/s], ``true_wind_angle_deg``
        [deg] and ``weight`` [h or probability].
    ship : ShipEconomics
        Fuel, prices and hours at sea.
    hours_at_sea_per_year : float, optional
        Overrides ``ship.hours_at_sea_per_year``. [h]
    progress : callable, optional
        ``progress(fraction, text)``.

    Returns
    -------
    list of VoyageSummary
        One per setup, in order.
    """
    vs = np.asarray(conditions["ship_speed_m_s"], dtype=float).ravel()
    w = np.broadcast_to(np.asarray(conditions["weight"], dtype=float), vs.shape).ravel()
    sea = (vs > 0.0) & (w > 0.0)
    vs, w = vs[sea], w[sea]
    tws = np.asarray(conditions["true_wind_speed_m_s"], dtype=float).ravel()[sea]
    twa = windstats.wrap_angle_deg(np.asarray(conditions["true_wind_angle_deg"], dtype=float).ravel()[sea])
    ops = rotor.best_operations(setups, vs, tws, np.radians(twa), progress=progress)
    return [summarise(tally_conditions(lambda *_a, op=op: op, vs, tws, twa, w), ship, hours_at_sea_per_year)
            for op in ops]


# ----------------------------------------------------------------------------- views of a tally
def heat_table(t: Tally) -> pd.DataFrame:
    """Share of time and contribution to the mean net power gain per (|angle|, speed) cell."""
    ia, iv = np.nonzero(t.heat_weight)
    w = t.heat_weight[ia, iv]
    return pd.DataFrame({
        "true_wind_angle_deg": HEAT_ANGLES_DEG[ia], "true_wind_speed_m_s": HEAT_SPEEDS_M_S[iv],
        "share_of_time": w / t.weight, "net_power_w": t.heat_net[ia, iv] / w,
        "contribution_w": t.heat_net[ia, iv] / t.weight})


def grid_conditions(t: Tally) -> dict:
    """The conditions binned (ship speed 0.5 m/s x angle 10 deg x wind 1 m/s), each bin at its
    weighted mean condition, weights as shares of time at sea."""
    if t.grid is None:
        raise ValueError("this tally has no condition grid (build it with with_grid=True)")
    w = t.grid[0]
    idx = np.nonzero(w)
    ww = w[idx]
    return {"ship_speed_m_s": t.grid[1][idx] / ww,
            "true_wind_angle_deg": windstats.wrap_angle_deg(GRID_ANGLES_DEG[idx[1]] + t.grid[2][idx] / ww),
            "true_wind_speed_m_s": t.grid[3][idx] / ww, "weight": ww / ww.sum()}


def month_table(t: Tally, hours_at_sea_per_year: float) -> pd.DataFrame:
    """Per calendar month: share of sea time, mean net power gain and energy saved per year."""
    if t.months is None or t.weight <= 0:
        return pd.DataFrame()
    m = t.months
    with np.errstate(invalid="ignore", divide="ignore"):
        mean_net = np.where(m[:, 0] > 0, m[:, 1] / np.where(m[:, 0] > 0, m[:, 0], 1.0), np.nan)
    share = m[:, 0] / t.weight
    return pd.DataFrame({"month": np.arange(1, 13), "share_of_sea_time": share,
                         "mean_net_power_w": mean_net,
                         "energy_saved_j": m[:, 1] / t.weight * hours_at_sea_per_year * SECONDS_PER_HOUR})


def leg_table(t: Tally, hours_at_sea_per_year: float) -> pd.DataFrame:
    """Per leg (series with a ``leg`` column): share of sea time, mean net power gain, energy."""
    if not t.legs or t.weight <= 0:
        return pd.DataFrame()
    names = list(t.legs)
    arr = np.array([t.legs[k] for k in names])
    return pd.DataFrame({"leg": names, "share_of_sea_time": arr[:, 0] / t.weight,
                         "mean_net_power_w": arr[:, 1] / arr[:, 0],
                         "energy_saved_j": arr[:, 1] / t.weight * hours_at_sea_per_year * SECONDS_PER_HOUR})


# ----------------------------------------------------------------------------- design sweep
@dataclass(frozen=True)
class DesignOption:
    """One rotor size and count to compare; cost in the currency of the prices."""

    diameter_m: float
    height_m: float
    rotors: int
    installed_cost: float


def option_costs(diameter_m: float, height_m: float, rotors: int, installed_cost: float,
                 size_factors, counts) -> list[DesignOption]:
    """Design options around the entered one. Assumption for comparing options (not a quote):
    the cost per rotor scales with its projected area D x H from the entered installation."""
    per_area = installed_cost / (rotors * diameter_m * height_m)
    out = []
    for f in size_factors:
        d, h = diameter_m * f, height_m * f
        for n in counts:
            out.append(DesignOption(d, h, int(n), per_area * n * d * h))
    return out


def sweep_design_options(make_operate: Callable, options, conditions: dict, ship: ShipEconomics,
                         hours_at_sea_per_year: float | None = None, progress=None) -> pd.DataFrame:
    """Annual savings of each design option over the same conditions.

    ``make_operate(option)`` returns the ``operate`` callable of that option; ``conditions`` has
    arrays ``ship_speed_m_s``, ``true_wind_speed_m_s``, ``true_wind_angle_deg``, ``weight``.
    """
    rows = []
    options = list(options)
    for i, opt in enumerate(options):
        t = tally_conditions(make_operate(opt), conditions["ship_speed_m_s"],
                             conditions["true_wind_speed_m_s"], conditions["true_wind_angle_deg"],
                             conditions["weight"])
        s = summarise(t, replace(ship, installed_cost=opt.installed_cost), hours_at_sea_per_year)
        rows.append({"diameter_m": opt.diameter_m, "height_m": opt.height_m, "rotors": opt.rotors,
                     "installed_cost": opt.installed_cost, "mean_net_power_w": s.mean_net_power_w,
                     "annual_fuel_saved_kg": s.annual_fuel_saved_kg,
                     "annual_co2_avoided_kg": s.annual_co2_avoided_kg,
                     "annual_cost_saved": s.annual_cost_saved, "payback_years": s.payback_years,
                     "running_share": s.running_share})
        if progress:
            progress((i + 1) / len(options), f"Design options: {i + 1} of {len(options)}")
    return pd.DataFrame(rows)
