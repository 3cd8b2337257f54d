"""Voyage savings study: is it worth fitting rotors to this ship on this trade, which size, how many?

Inputs are the rotor inputs of the rotor study (:data:`liftcore.rotor_inputs.ROTOR_FIELDS`), the air
state, and the ship, trade and money inputs below. The wind comes from an invented demo file of
the chosen kind, or from ``extra``: a DataFrame (an uploaded CSV; ``df.attrs["source_name"]``
names it in messages) or a path (the command line; series files are streamed, never loaded
whole).
"""

from __future__ import annotations

import contextlib
import contextvars
import math
import os
from dataclasses import dataclass, replace
from functools import partial
from pathlib import Path

import numpy as np
import pandas as pd

from liftcore import coefficients as coef
from liftcore import figures_voyage as fv
from liftcore import cii, rotor, windstats
from liftcore import rotor_inputs
from liftcore import voyage as vy
from liftcore.air import air_inputs
from liftcore.constants import CO2_FACTOR_T_PER_T, KNOT_M_S
from liftcore.errors import InputError
from liftcore.inputs import InputSpec, choice, flag, integer, number, text
from liftcore.studies import Charts, Headline, StudyResult, column_label, quantity_table, table_in_units
from liftcore.validity import ModelWarning

KIND = "voyage"
#: Currencies offered for the money inputs (ISO 4217 codes); the first is the default.
CURRENCIES = ("EUR", "USD", "GBP", "CNY", "JPY", "KRW", "SGD", "NOK", "DKK", "SEK", "CHF", "INR")
#: Shares of the time at sea are shown to 0.01 % (about an hour a year); smaller ones show as 0.
_SHARE = {"resolution": 0.01, "resolution_note": "less than 0.01 % of the time at sea"}
TITLE = "Voyage savings"

DATA_DIR = Path(__file__).resolve().parents[1] / "data"
#: The invented demo file of each wind-input kind.
DEMO_FILES = {"table": DATA_DIR / "wind_table_invented.csv",
              "weibull": DATA_DIR / "wind_weibull_invented.csv",
              "series": DATA_DIR / "wind_series_invented.csv"}
WIND_KINDS = tuple(DEMO_FILES)
WIND_KIND_LABELS = ("Joint table: true wind angle × speed with probabilities",
                    "Weibull wind speeds per direction sector",
                    "Hourly series along a route")
#: Design sweep: rotor sizes as factors of the entered diameter and height.
SWEEP_SIZE_FACTORS = (0.6, 0.8, 1.0, 1.2)

_W = "Wind on the trade"
_S = "Ship and trade"
_M = "Money"
_I = "IMO wind-propulsion term"
_C = "Carbon intensity (IMO CII)"
_D = "Design options"

VOYAGE_FIELDS = (
    choice("wind_kind", "Wind input", WIND_KINDS, default="table", labels=WIND_KIND_LABELS,
           section=_W, help="What your wind file describes. Without an upload the page uses the "
                            "invented demo file of this kind."),
    number("course_deg", "Course on the trade (Weibull input)", "angle", 235.0, 0.0, 360.0,
           section=_W, step=5.0, help="Where the ship heads, clockwise from north; with the wind directions "
                            "of the sectors it gives the wind angle off the bow."),
    flag("round_trip", "Half the time on the reciprocal course (Weibull input)", True, section=_W,
         help="A shuttle trade: the ship sails the course and back, equal time each way."),
    flag("hours_from_series", "Take hours at sea per year from the series", True, section=_W,
         help="Hours under way in the series divided by the years it spans; off: use the "
              "hours entered below."),
    number("ship_speed_m_s", "Service speed", "ship_speed", 12.0 * KNOT_M_S, 0.5 * KNOT_M_S,
           30.0 * KNOT_M_S, section=_S, step=0.1,
           help="Speed through the water when no speed profile is "
                                             "given (tables and Weibull input)."),
    text("speed_profile_kn", "Speed profile (knots:share, e.g. 12:0.6, 10:0.4)", "", section=_S,
         help="Several speeds with their shares of sea time (summing to 1), in knots; empty = the "
              "service speed all the time. Series carry their own speed."),
    number("hours_at_sea_h", "Hours at sea per year", "duration", 6000.0, 1.0, 8760.0, section=_S,
           step=100.0, help="Hours under way per year; the rotors save nothing in port."),
    number("main_engine_power_w", "Mean main-engine power at sea (0 = not given)", "power",
           6000e3, 0.0, 1.0e8, section=_S,
           help="Without rotors; used only to express the saving as a share."),
    number("sfoc_main_g_kwh", "Main-engine SFOC", "fuel_rate", 175.0, 100.0, 400.0, section=_S,
           step=1.0, help="Specific fuel oil consumption of the main engine at its usual load; "
                          "about 160 to 190 g/kWh for two-stroke diesels (common practice)."),
    number("sfoc_generator_g_kwh", "Generator SFOC", "fuel_rate", 205.0, 100.0, 400.0, section=_S,
           step=1.0, help="SFOC of the generators that supply the spin power; about 190 to 230 "
                          "g/kWh (common practice)."),
    choice("fuel", "Fuel", vy.FUELS, default="hfo", labels=tuple(vy.FUEL_LABELS[f] for f in vy.FUELS),
           section=_S, help="Burnt by both main engine and generators; sets the CO₂ factor "
                            "(IMO MEPC.364(79))."),
    choice("currency", "Currency", CURRENCIES, default="EUR", section=_M,
           help="The ISO 4217 code written beside every amount of money; all prices and costs "
                "are in it. No exchange rates are applied."),
    number("fuel_price_per_t", "Fuel price", "money_rate", 600.0, 0.0, 1.0e5, section=_M,
           step=10.0, help="Money per tonne of fuel, in the currency above."),
    number("carbon_price_per_t_co2", "Carbon price per t of CO₂", "money_rate", 0.0, 0.0, 1.0e5,
           section=_M, step=5.0, help="Money per tonne of CO₂ emitted (an emissions scheme or "
                                      "levy); 0 if none."),
    number("installed_cost", "Installed cost of the rotors", "money", 2.5e6, 0.0, 1.0e10,
           section=_M, step=50000.0, help="Buying and fitting all the rotors entered, in the "
                                         "currency of the prices."),
    number("upkeep_per_year", "Upkeep per year", "money", 20000.0, 0.0, 1.0e9, section=_M,
           step=1000.0, help="Maintenance and running costs of the rotors each year."),
    number("discount_rate_pct", "Discount rate", "percent", 8.0, 0.0, 50.0, section=_M, step=0.5,
           help="For the discounted payback; 0 gives the simple payback."),
    number("carbon_covered_pct", "Share of CO₂ under the allowance scheme", "percent", 100.0, 0.0, 100.0,
           section=_M, step=5.0, help="Share of the ship's emissions the carbon price is paid on (a "
                                      "scheme may cover part of a trade's voyages); 100 = all."),
    choice("cii_ship_type", "Ship type (IMO CII)", cii.SHIP_TYPE_KEYS, default="bulk_carrier",
           labels=tuple(cii.SHIP_TYPES[k].label for k in cii.SHIP_TYPE_KEYS), section=_C,
           help="Sets the reference line and the rating boundaries (MEPC.353(78), MEPC.354(78))."),
    number("cii_capacity_t", "Capacity for the CII (DWT or GT, as the type takes)", "ratio", 60000.0, 1.0,
           cii.MAX_CAPACITY_T, section=_C, step=1000.0,
           help="Deadweight in tonnes for cargo ships and tankers; gross tonnage for cruise, "
                "ro-ro passenger ships and vehicle carriers (MEPC.352(78)). The demo value is invented."),
    integer("cii_year", "Year rated", 2026, 2023, 2030, section=_C,
            help="Sets the reduction factor below the 2019 reference line (MEPC.338(76), MEPC.400(83))."),
    number("annual_fuel_kg", "The ship's fuel per year without rotors (0 = no CII)", "fuel_mass", 6.0e6,
           0.0, 1.0e9, section=_C, step=100e3,
           help="All fuel of the year, main engine and generators, of the fuel chosen above. The "
                "demo value is invented."),
    number("reference_speed_m_s", "Reference speed V_ref (0 = service speed)", "ship_speed", 0.0,
           0.0, 30.0 * KNOT_M_S, section=_I, advanced=True, step=0.1,
           help="Ship speed of the IMO term (MEPC.1/Circ.896); 0 takes the service speed."),
    number("imo_total_efficiency", "Total efficiency of the main drive η_T", "ratio",
           vy.IMO_DEFAULT_TOTAL_EFFICIENCY, 0.1, 1.0, section=_I, advanced=True, step=0.01,
           help="0.7 unless another value is verified (MEPC.1/Circ.815, Annex 11, App. 2)."),
    flag("published_spread", "Show the spread across the published coefficient sets", True, section=_D,
         help="The year again with every published set and both spin-power estimates: the range "
              "beside fuel, CO₂ and net power (the uncertainty of the aerodynamic data)."),
    flag("sweep", "Compare rotor sizes and counts", True, section=_D,
         help="Annual savings for 0.6, 0.8, 1.0 and 1.2 times the entered rotor, from 1 rotor up to "
              "the number below."),
    integer("sweep_max_rotors", "Most rotors to compare", 6, 1, 8, section=_D),
)

# The trade first (what this page is about), then the rotor inputs shared with the rotor page.
_FIRST = tuple(f for f in VOYAGE_FIELDS if f.section in (_W, _S, _M))
_LAST = tuple(f for f in VOYAGE_FIELDS if f.section not in (_W, _S, _M))
INPUTS = InputSpec(KIND, _FIRST + tuple(rotor_inputs.ROTOR_FIELDS) + tuple(air_inputs("Air")) + _LAST).with_rules({
    **rotor_inputs.ROTOR_SHOW_IF,
    "course_deg": lambda v: v["wind_kind"] == "weibull",
    "round_trip": lambda v: v["wind_kind"] == "weibull",
    "hours_from_series": lambda v: v["wind_kind"] == "series",
    "ship_speed_m_s": lambda v: v["wind_kind"] != "series",
    "speed_profile_kn": lambda v: v["wind_kind"] != "series",
    "hours_at_sea_h": lambda v: v["wind_kind"] != "series" or not v["hours_from_series"],
    "sweep_max_rotors": lambda v: v["sweep"],
})

#: Checked when a scenario file or a comparison is read (before it replaces a page's inputs).
check_inputs = rotor_inputs.check_inputs

SOURCES = (
    "IMO MEPC.308(73) (2018) and MEPC.364(79) (2022), Guidelines on the method of calculation of "
    "the attained EEDI for new ships: CO₂ conversion factors C_F (HFO 3.114, LFO 3.151, MDO/MGO "
    "3.206, LNG 2.750, methanol 1.375 t CO₂ per t fuel).",
    "IMO MEPC.1/Circ.815 (2013), Annex 11, Appendix 2, and MEPC.1/Circ.896 (2021): available "
    "effective power of wind propulsion systems, (0.5144 V_ref / η_T) Σ F·W − Σ P·W, with the "
    "wind angle as a relative bearing (0° on the bow) and η_T = 0.7 unless verified.",
    "Justus, C. G., Hargraves, W. R., Mikhail, A. & Graber, D. (1978). Methods for estimating wind "
    "speed frequency distributions. J. Appl. Meteor. 17, 350-353 (Weibull wind speeds).",
    "Rotor forces, spin power and best spin: the rotor model of the 'Rotor sail on a ship' page "
    "and the source of the coefficient set chosen (listed with the set).",
    "Fuel = power × SFOC; spin power bought from the generators at their own SFOC (common practice).",
)

CAUTIONS = (
    "Rotor sails change a ship's stability, structure and manoeuvring. These are estimates for "
    "early design: they do not replace classification rules, flag-state requirements or a naval "
    "architect's analysis. The heeling moments here come from table or hourly mean winds; gusts "
    "are stronger, so check the limits with the ship's stability booklet.",
    "Savings depend on routing, weather, loading, fouling and how the crew runs the rotors; the "
    "wind statistics of a trade and the coefficient set dominate the uncertainty. Treat the "
    "money figures as a comparison between options, not a quote.",
)


@dataclass(frozen=True)
class VoyageDetail:
    """What the page needs beyond the headlines."""

    summary: vy.VoyageSummary
    tally: vy.Tally
    wind_kind: str
    wind_source: str
    conditions: int
    engine: str
    hours_source: str
    imo_effective_power_w: float
    imo_reference_speed_m_s: float
    sweep: pd.DataFrame | None
    sweep_note: str
    coefficient_set: dict
    #: The year with every published set and spin-power estimate (:func:`published_spread`).
    spread: pd.DataFrame | None = None
    spread_note: str = ""
    #: The year's carbon intensity without and with the rotors (None without the ship's fuel).
    cii: cii.CIIComparison | None = None
    #: Carbon cost of the year without and with the rotors (None without the ship's fuel).
    carbon_cost_before: float | None = None
    carbon_cost_after: float | None = None


def economics_from_values(values: dict) -> vy.ShipEconomics:
    me = values["main_engine_power_w"]
    return vy.ShipEconomics(
        sfoc_main_g_kwh=values["sfoc_main_g_kwh"], sfoc_generator_g_kwh=values["sfoc_generator_g_kwh"],
        fuel=values["fuel"], hours_at_sea_per_year=values["hours_at_sea_h"],
        fuel_price_per_t=values["fuel_price_per_t"],
        carbon_price_per_t_co2=values["carbon_price_per_t_co2"],
        carbon_covered_share=values["carbon_covered_pct"] / 100.0,
        installed_cost=values["installed_cost"], upkeep_per_year=values["upkeep_per_year"],
        discount_rate=values["discount_rate_pct"] / 100.0, main_engine_power_w=me if me > 0 else None)


def operate_for(setup: rotor.RotorSetup):
    """The ``operate`` callable of a rotor setup: the best spin in each condition (picklable)."""
    return partial(rotor.best_operation, setup)


def sweep_setup(setup: rotor.RotorSetup, option: vy.DesignOption) -> rotor.RotorSetup:
    """The rotor setup of one design option. The option keeps the entered rotor's proportions:
    the motor-power limit scales with D x H, the rpm limit with 1/D (same spin ratios reachable),
    spacing is at least one diameter; the ship's heeling-moment limit is kept."""
    f = option.diameter_m / setup.diameter_m
    return replace(setup, diameter_m=option.diameter_m, height_m=option.height_m,
                   rotor_count=option.rotors, max_motor_power_w=setup.max_motor_power_w * f * f,
                   max_rpm=setup.max_rpm / f,
                   rotor_spacing_m=max(setup.rotor_spacing_m, option.diameter_m))


def _wind_source(values: dict, extra):
    """(source, label): a DataFrame or path of the chosen wind kind."""
    kind = values["wind_kind"]
    if extra is None:
        path = DEMO_FILES[kind]
        return path, f"invented demo ({path.name})"
    if isinstance(extra, pd.DataFrame):
        return extra, str(extra.attrs.get("source_name") or "uploaded file")
    if isinstance(extra, (str, Path)):
        return Path(extra), Path(extra).name
    raise InputError("wind", f"wind data must be a table or a CSV file (got {type(extra).__name__})")


#: Where long series run: None (this process, or a local cluster above DASK_AUTO_ROWS rows),
#: "off", "local" or a scheduler address. Deliberately not a study input: a scenario file or a
#: share link must never make the server connect to an address; only the command line
#: (``--dask-scheduler``, ``--in-process``) or the server's environment
#: (``LIFTCORE_DASK_SCHEDULER``) choose it.
_SCHEDULER: contextvars.ContextVar = contextvars.ContextVar("voyage_scheduler", default=None)


@contextlib.contextmanager
def computing_on(scheduler: str | None):
    """Run voyage studies inside this block on ``scheduler`` ("off", "local" or an address)."""
    token = _SCHEDULER.set(scheduler)
    try:
        yield
    finally:
        _SCHEDULER.reset(token)


def _use_dask(source) -> str | None:
    """None to stay in this process, else ``"local"`` or a scheduler address."""
    addr = (_SCHEDULER.get() or os.environ.get("LIFTCORE_DASK_SCHEDULER") or "").strip()
    if addr.lower() == "off":
        return None
    if addr:
        return addr
    return "local" if vy.estimate_rows(source) > vy.DASK_AUTO_ROWS else None


#: Summary fields carried across the published data, and the headline each qualifies.
SPREAD_FIELDS = {"mean_net_power_w": "mean_net_power", "annual_fuel_saved_kg": "annual_fuel_saved",
                 "annual_co2_avoided_kg": "annual_co2_avoided"}
SPIN_POWER_WORDS = {"set": "set's power coefficient", "friction": "skin-friction model"}


def spread_setups(setup: rotor.RotorSetup) -> list[tuple[coef.CoefficientSet, str, rotor.RotorSetup]]:
    """The entered rotor with every published coefficient set and both spin-power estimates
    (sets without a power coefficient have only the skin-friction one): (set, model, setup)."""
    out = []
    for cs in coef.published_sets().values():
        for model in rotor.SPIN_POWER_MODELS:
            if model == "set" and not cs.has_power:
                continue
            out.append((cs, model, replace(rotor.with_coefficients(setup, cs), spin_power_model=model)))
    return out


def published_spread(setup: rotor.RotorSetup, central: vy.VoyageSummary, conditions: dict,
                     ship: vy.ShipEconomics, hours: float, binned: bool, progress=None) -> tuple[pd.DataFrame, str]:
    """The year with every published set and spin-power estimate beside the central one.

    Parameters
    ----------
    setup : liftcore.rotor.RotorSetup
        The entered rotor (the central result).
    central : VoyageSummary
        The year of ``setup`` over the exact conditions.
    conditions : dict
        Weighted conditions to run the variants on (see :func:`liftcore.voyage.summaries_over`):
        the exact ones for a table, the binned ones for an hourly series.
    ship : VoyageSummary
        Economics of the year.
    hours : float
        Hours at sea per year. [h]
    binned : bool
        Whether ``conditions`` are binned (then the variants are corrected, see Notes).
    progress : callable, optional
        ``progress(fraction, text)``.

    Returns
    -------
    (pandas.DataFrame, str)
        One row per variant (``set``, ``spin_power``, ``chosen`` and the fields of
        :data:`SPREAD_FIELDS` in core units), and a note on how it was computed.

    Notes
    -----
    On binned conditions each variant is reported as central + (variant - entered), both of
    the latter on the bins: the binning error, the same to first order for every set, cancels.
    The wind along the rotor is computed once for all variants.
    """
    variants = spread_setups(setup)
    runs = vy.summaries_over([setup] + [v[2] for v in variants], conditions, ship, hours, progress)
    base = runs[0]
    chosen_model = "set" if setup.power_from_set else "friction"
    rows = []
    for (cs, model, _), s in zip(variants, runs[1:]):
        row = {"set": cs.label, "spin_power": SPIN_POWER_WORDS[model],
               "chosen": cs.name == setup.coefficients.name and model == chosen_model}
        row.update({k: getattr(central, k) + getattr(s, k) - getattr(base, k) for k in SPREAD_FIELDS})
        if row["chosen"]:
            row.update({k: getattr(central, k) for k in SPREAD_FIELDS})
        rows.append(row)
    if not any(r["chosen"] for r in rows):
        rows.insert(0, {"set": setup.coefficients.label, "spin_power": SPIN_POWER_WORDS[chosen_model],
                        "chosen": True, **{k: getattr(central, k) for k in SPREAD_FIELDS}})
    note = (f"{len(variants)} runs: every published coefficient set with each spin-power estimate it has. ")
    if binned:
        note += ("For speed they run on the hourly rows binned (ship speed 0.5 m/s × angle 10° × "
                 "wind 1 m/s); each is shown as the exact central value plus its difference from "
                 "the entered set on the same bins.")
    return pd.DataFrame(rows), note.strip()


def spread_range(d: "VoyageDetail", field: str) -> tuple[float, float] | None:
    """(low, high) of a summary field over the spread (the central value included), or None."""
    if d.spread is None or not len(d.spread):
        return None
    v = np.append(d.spread[field].to_numpy(dtype=float), getattr(d.summary, field))
    return float(v.min()), float(v.max())


def run(values: dict, progress=None, extra=None) -> StudyResult:
    def step(lo, hi):
        if progress is None:
            return None
        return lambda f, text="": progress(lo + (hi - lo) * max(0.0, min(1.0, f)), text)

    kind = values["wind_kind"]
    ship = economics_from_values(values)
    setup = rotor_inputs.setup_from_inputs(values)
    operate = operate_for(setup)
    source, label = _wind_source(values, extra)
    speeds, shares = vy.parse_speed_profile(values["speed_profile_kn"], values["ship_speed_m_s"])
    sweep_on = values["sweep"]
    spread_on = values["published_spread"]
    main_end = (0.45 if sweep_on else 0.7) if spread_on else (0.55 if sweep_on else 0.9)
    spread_end = main_end + (0.2 if spread_on else 0.0)
    engine = "in memory"
    hours = ship.hours_at_sea_per_year
    hours_source = "entered"
    if kind == "series":
        scheduler = _use_dask(source)
        if scheduler is None:
            tally = vy.tally_series(operate, source, label, progress=step(0.0, main_end))
        else:
            engine = "Dask (local cluster)" if scheduler == "local" else f"Dask ({scheduler})"
            tally = vy.tally_series_dask(operate, source, label, scheduler=scheduler,
                                         progress=step(0.0, main_end))
        if tally.weight <= 0:
            raise InputError("wind", f"{label}: no hours at sea (ship_speed_kn is 0 in every row)")
        if values["hours_from_series"]:
            hours = vy.series_hours_at_sea_per_year(tally)
            hours_source = "from the series"
        imo_conditions = vy.grid_conditions(tally)
        n_conditions = tally.rows
    else:
        if kind == "table":
            joint = windstats.read_wind_table(source, label)
        else:
            sectors = windstats.read_weibull_sectors(source, label)
            joint = windstats.apply_course(windstats.discretise_weibull(sectors), values["course_deg"],
                                           values["round_trip"])
        if step(0, main_end):
            step(0, main_end)(0.1, "Best spin in every wind condition")
        tally = vy.tally_joint(operate, joint, speeds, shares, with_grid=sweep_on)
        c = vy.conditions_from_joint(joint, speeds, shares)
        imo_conditions = {k: c[k] for k in ("ship_speed_m_s", "true_wind_speed_m_s",
                                            "true_wind_angle_deg", "weight")}
        n_conditions = joint.size * speeds.size
    summary = vy.summarise(tally, ship, hours)
    if kind == "series":
        summary = replace(summary, warnings=summary.warnings + vy.series_warnings(tally))
    elif kind == "weibull":
        summary = replace(summary, warnings=summary.warnings + sectors.warnings())
    spread, spread_note = None, ""
    if spread_on:
        if progress:
            progress(main_end, "The year with every published coefficient set")
        binned = kind == "series"
        spread_conditions = imo_conditions if binned else c
        spread, spread_note = published_spread(setup, summary, spread_conditions, ship, hours, binned,
                                               progress=step(main_end, spread_end))
    if progress:
        progress(spread_end, "IMO wind-propulsion term")

    # IMO term: force and power matrices at V_ref over the same wind probabilities
    if values["reference_speed_m_s"] > 0:
        v_ref = values["reference_speed_m_s"]
    elif kind == "series":
        v_ref = summary.mean_ship_speed_m_s
    else:
        v_ref = float(np.sum(speeds * shares))
    w = imo_conditions["weight"] / np.sum(imo_conditions["weight"])
    op_ref = rotor.best_operation(setup, np.full(w.size, v_ref), imo_conditions["true_wind_speed_m_s"],
                                  np.radians(imo_conditions["true_wind_angle_deg"]))
    elec = op_ref.electrical_power_w if op_ref.electrical_power_w is not None else op_ref.spin_power_w
    imo_kw = vy.imo_wind_propulsion_power_kw(v_ref / KNOT_M_S, values["imo_total_efficiency"],
                                             np.asarray(op_ref.thrust_n) / 1000.0,
                                             np.asarray(elec) / 1000.0, w)

    sweep_df, sweep_note = None, ""
    if sweep_on:
        counts = range(1, values["sweep_max_rotors"] + 1)
        options = vy.option_costs(setup.diameter_m, setup.height_m, setup.rotor_count,
                                  values["installed_cost"], SWEEP_SIZE_FACTORS, counts)
        sweep_conditions = vy.grid_conditions(tally)
        if sweep_conditions["weight"].size < n_conditions:
            sweep_note = ("For speed the options are compared on the wind conditions binned (ship "
                          "speed 0.5 m/s × angle 10° × wind 1 m/s, each bin at its mean condition).")
        sweep_df = vy.sweep_design_options(lambda o: operate_for(sweep_setup(setup, o)), options,
                                           sweep_conditions, ship, hours, progress=step(spread_end + 0.05, 1.0))
        at = sweep_df[np.isclose(sweep_df["diameter_m"], setup.diameter_m)
                      & (sweep_df["rotors"] == setup.rotor_count)]
        if len(at) and sweep_note:
            binned = float(at["annual_fuel_saved_kg"].iloc[0])
            exact = summary.annual_fuel_saved_kg
            if exact != 0:
                sweep_note += (f" At the entered design the binned conditions give "
                               f"{100 * (binned - exact) / abs(exact):+.2f} % fuel saved against the "
                               "exact headline.")
        sweep_note += (" Sizes keep the entered proportions; motor power scales with D × H and the "
                       "rpm limit with 1/D; cost per rotor scales with D × H from the entered "
                       "installation (an assumption for comparing options, not a quote).")
    if progress:
        progress(1.0, "Done")

    intensity, cost_before, cost_after = carbon_intensity(values, summary, ship)
    if intensity is not None and intensity.attained_after <= 0:
        summary = replace(summary, warnings=summary.warnings + (ModelWarning(
            "fuel_saved_above_fuel_burnt", "the rotors save as much fuel as the ship burns in the year "
            "entered: check the ship's fuel per year", "annual_fuel_saved", "invalid"),))
    detail = VoyageDetail(summary=summary, tally=tally, wind_kind=kind, wind_source=label,
                          conditions=int(n_conditions), engine=engine, hours_source=hours_source,
                          imo_effective_power_w=imo_kw * 1000.0, imo_reference_speed_m_s=float(v_ref),
                          sweep=sweep_df, sweep_note=sweep_note.strip(),
                          coefficient_set=setup.coefficients.describe(), spread=spread,
                          spread_note=spread_note, cii=intensity, carbon_cost_before=cost_before,
                          carbon_cost_after=cost_after)
    return _result(values, detail)


def carbon_intensity(values: dict, summary: vy.VoyageSummary, ship: vy.ShipEconomics):
    """The year's CII without and with the rotors, and its carbon cost either way.

    Parameters
    ----------
    values : dict
        Validated voyage inputs (``annual_fuel_kg`` the ship's fuel of the year without rotors,
        ``cii_*`` the ship type, capacity and year).
    summary : VoyageSummary
        The rotors' year (fuel and CO2 saved, mean speed, hours at sea).
    ship : ShipEconomics
        Fuel (CO2 factor), carbon price and the share of CO2 it is paid on.

    Returns
    -------
    tuple
        (:class:`liftcore.cii.CIIComparison` or None, carbon cost before, after [money]); None
        throughout when no yearly fuel is given.

    Notes
    -----
    Distance D = mean speed at sea x hours at sea / 1852 [nm]; CO2 before = fuel x CF, after =
    before - CO2 avoided by the rotors; carbon cost = CO2 x price x covered share.

    References
    ----------
    .. [1] IMO Resolution MEPC.352(78) (2022), G1; see :mod:`liftcore.cii` for G2-G4.
    """
    fuel_kg = values["annual_fuel_kg"]
    if fuel_kg <= 0:
        return None, None, None
    distance_nm = summary.mean_ship_speed_m_s * summary.hours_at_sea_per_year * 3600.0 / 1852.0
    before_t = float(vy.co2_from_fuel(fuel_kg, ship.fuel)) / 1000.0
    after_t = max(before_t - summary.annual_co2_avoided_kg / 1000.0, 0.0)
    comparison = cii.compare(values["cii_ship_type"], values["cii_capacity_t"], values["cii_year"],
                             distance_nm, before_t, after_t)
    rate = ship.carbon_price_per_t_co2 * ship.carbon_covered_share
    return comparison, before_t * rate, after_t * rate


#: Said wherever the CII is shown: what the rating rests on and whose it is.
CII_CAUTION = ("Reference lines, reduction factors and rating boundaries of IMO MEPC.353(78), "
               "MEPC.338(76)/MEPC.400(83) and MEPC.354(78) (the tables' values from memory: check them "
               "against the resolutions). An estimate from the fuel entered: the statutory rating is "
               "the flag State's, on verified fuel data and with the corrections of MEPC.355(78).")


def cii_sentence(d: VoyageDetail) -> str:
    """One sentence with the year's carbon intensity and rating without and with the rotors
    (``**`` marks the numbers), or "" without the ship's fuel."""
    c = d.cii
    if c is None:
        return ""
    kind = cii.SHIP_TYPES[c.ship_type]
    return (f"Carbon intensity in {c.year} ({kind.label.lower()}, {c.capacity_t:,.0f} {kind.capacity}, "
            f"{c.distance_nm:,.0f} nm a year): **{c.attained_before:.3g}** g CO₂/(t·nm), rated "
            f"**{c.rating_before}**, without the rotors; **{c.attained_after:.3g}**, rated "
            f"**{c.rating_after}**, with them (required {c.required:.3g}).")


def _result(values: dict, d: VoyageDetail) -> StudyResult:
    s = d.summary
    fuel = values["fuel"]
    spread = {k: spread_range(d, f) for f, k in SPREAD_FIELDS.items()}
    heads = [
        Headline("mean_net_power", "Net power gain, mean at sea", s.mean_net_power_w, "power",
                 help="Main-engine power saved (thrust × speed / propulsive efficiency) minus the "
                      "electric power to spin the rotors, averaged over the time at sea.",
                 spread=spread["mean_net_power"]),
        Headline("mean_thrust", "Thrust, mean at sea", s.mean_thrust_n, "large_force",
                 help="Forward force of all rotors, averaged over the time at sea."),
        Headline("annual_energy_saved", "Net energy saved per year", s.annual_energy_saved_j, "energy",
                 help=f"Mean net power gain × {s.hours_at_sea_per_year:,.0f} h at sea per year "
                      f"({d.hours_source})."),
        Headline("annual_fuel_saved", "Fuel saved per year", s.annual_fuel_saved_kg, "fuel_mass",
                 help="Main-engine energy saved × its SFOC minus spin energy × generator SFOC.",
                 spread=spread["annual_fuel_saved"]),
        Headline("annual_co2_avoided", "CO₂ avoided per year", s.annual_co2_avoided_kg, "fuel_mass",
                 help=f"Fuel saved × {CO2_FACTOR_T_PER_T[fuel]} t CO₂ per t of "
                      f"{vy.FUEL_LABELS[fuel]} (IMO MEPC.364(79)).", spread=spread["annual_co2_avoided"]),
        Headline("annual_cost_saved", "Money saved per year", s.annual_cost_saved, "money",
                 help="Fuel cost saved + carbon cost avoided − upkeep.", unit=values["currency"]),
        Headline("payback", "Simple payback, years",
                 s.payback_years if math.isfinite(s.payback_years) else math.nan, "ratio", digits=3,
                 help=f"Installed cost / money saved per year (– when it never pays back). Discounted at "
                      f"{values['discount_rate_pct']:g} %: {_years(s.discounted_payback_years)}."),
        Headline("running_share", "Rotors running", 100.0 * s.running_share, "percent", digits=3,
                 help="Share of time at sea the rotors spin (freely or at a limit).", **_SHARE),
        Headline("limited_share", "Running at a limit", 100.0 * s.limited_share, "percent", digits=3,
                 help="Share of time at sea the spin is held back by the rpm, motor-power, "
                      "heeling-moment or spin-ratio limit.", **_SHARE),
        Headline("stopped_share", "Rotors stopped", 100.0 * s.stopped_share, "percent", digits=3,
                 help="Share of time at sea no spin pays for itself (head winds, calms).", **_SHARE),
        Headline("engine_power_share", "Share of main-engine power saved",
                 100.0 * s.engine_power_share if math.isfinite(s.engine_power_share) else math.nan,
                 "percent", digits=3, help="Mean engine power saved / the mean main-engine power entered."),
        Headline("imo_effective_power", "IMO available effective power f_eff·P_eff",
                 d.imo_effective_power_w, "power",
                 help=f"(0.5144 V_ref / η_T) Σ F·W − Σ P·W at V_ref = "
                      f"{d.imo_reference_speed_m_s / KNOT_M_S:.3g} kn over this trade's wind "
                      "probabilities W (MEPC.1/Circ.896)."),
        Headline("mean_balance_power", "Lost to leeway and rudder, mean at sea", s.mean_balance_power_w, "power",
                 help="Engine power spent on the resistance the hull's leeway and the rudder add to hold "
                      "the rotors' side force (already taken off the net gain); 0 when the hull is "
                      "left out."),
        Headline("balance_share", "Share of the gross saving lost to it", 100.0 * s.balance_share, "percent",
                 digits=3, help="Leeway and rudder power / the thrust power the rotors give."),
        Headline("peak_heeling_moment", "Highest heeling moment met", s.peak_heeling_moment_nm,
                 "moment", help="Largest heeling moment of all rotors in any condition of the input "
                                "(mean winds; gusts are higher)."),
    ]
    warnings = list(s.warnings)
    if d.wind_source.startswith("invented"):
        warnings.append(ModelWarning("invented_wind", f"The wind is the {d.wind_source}: upload "
                                     "your trade's wind for real numbers.", ""))
    j = s.as_json()
    j.update({
        "imo_effective_power_kw": d.imo_effective_power_w / 1000.0,
        "imo_reference_speed_kn": d.imo_reference_speed_m_s / KNOT_M_S,
        "engine_power_share": s.engine_power_share,
        "mean_true_wind_speed_m_s": s.mean_true_wind_speed_m_s,
        "mean_ship_speed_kn": s.mean_ship_speed_m_s / KNOT_M_S,
        "wind_kind": d.wind_kind, "wind_source": d.wind_source, "conditions": d.conditions,
        "computed": d.engine, "hours_at_sea_source": d.hours_source,
        "coefficient_set": d.coefficient_set["name"], "currency": values["currency"],
        "annual_fuel_saved_t_range": _json_range(spread["annual_fuel_saved"], 1e-3),
        "annual_co2_avoided_t_range": _json_range(spread["annual_co2_avoided"], 1e-3),
        "mean_net_power_kw_range": _json_range(spread["mean_net_power"], 1e-3),
        **(d.cii.as_json() if d.cii is not None else dict.fromkeys(cii.JSON_KEYS)),
        "annual_carbon_cost_before": d.carbon_cost_before, "annual_carbon_cost_after": d.carbon_cost_after,
        "warnings": [w.as_dict() for w in warnings],
    })
    return StudyResult(kind=KIND, inputs=dict(values), headlines=tuple(heads), warnings=tuple(warnings),
                       figures=figures(d, values), tables=tables(d), detail=d, json=j)


def _json_range(r, scale: float):
    return None if r is None else [r[0] * scale, r[1] * scale]


def _years(y: float) -> str:
    return "never" if not math.isfinite(y) else f"{y:.1f} years"


def figures(d: VoyageDetail, values: dict, system: str = "SI") -> Charts:
    """(title, figure) pairs in page order, each drawn when first looked at."""
    t = d.tally
    out = [("Wind rose of the input", lambda: fv.wind_rose(t, system)),
           ("Net gain over wind angle and speed", lambda: fv.gain_heat_map(t, system)),
           ("Operating time", lambda: fv.operating_time(d.summary))]
    if d.spread is not None:
        out.append(("Across the published data",
                    lambda: fv.spread_bars(d.spread, d.summary.annual_fuel_saved_kg, system)))
    if d.cii is not None:
        out.append(("Carbon intensity rating", lambda: fv.cii_bands(d.cii)))
    if d.wind_kind == "series":
        out.append(("By month", lambda: fv.month_bars(vy.month_table(t, d.summary.hours_at_sea_per_year), system)))
        legs = vy.leg_table(t, d.summary.hours_at_sea_per_year)
        if len(legs):
            out.append(("By leg", lambda: fv.leg_bars(legs, system)))
    if d.sweep is not None:
        entered = {"diameter_m": values["diameter_m"], "height_m": values["height_m"],
                   "rotors": values["rotor_count"]}
        out.append(("Design options: fuel", lambda: fv.sweep_savings(d.sweep, entered, system)))
        if values["fuel_price_per_t"] > 0 or values["carbon_price_per_t_co2"] > 0:
            out.append(("Design options: money", lambda: fv.sweep_savings(
                d.sweep, entered, system, "annual_cost_saved", "money",
                "Money saved per year by rotor size and count", values.get("currency", ""))))
        if values["installed_cost"] > 0:
            out.append(("Design options: payback", lambda: fv.sweep_payback(d.sweep, entered, system)))
    return Charts(out)


def tables(d: VoyageDetail) -> dict:
    out = {"summary": pd.DataFrame([{k: v for k, v in d.summary.as_json().items() if k != "warnings"}]),
           "gain_by_condition": vy.heat_table(d.tally)}
    if d.wind_kind == "series":
        out["by_month"] = vy.month_table(d.tally, d.summary.hours_at_sea_per_year)
        legs = vy.leg_table(d.tally, d.summary.hours_at_sea_per_year)
        if len(legs):
            out["by_leg"] = legs
    if d.spread is not None:
        out["published_spread"] = d.spread
    if d.sweep is not None:
        out["design_options"] = d.sweep
    return out


# ----------------------------------------------------------------------------- display units
def figures_in_units(result: StudyResult, system: str) -> tuple:
    """The charts of ``result`` with powers, speeds and masses in ``system``'s units."""
    return result.figures if system == "SI" else figures(result.detail, result.inputs, system)


#: Plain words and quantity kind of the summary's core-unit fields (shares are shown in %).
SUMMARY_UNITS = {
    "mean_net_power_w": ("net power gain, mean at sea", "power"),
    "mean_thrust_n": ("thrust, mean at sea", "large_force"),
    "mean_spin_power_w": ("spin power, mean at sea", "power"),
    "mean_engine_power_saved_w": ("engine power saved, mean at sea", "power"),
    "mean_side_force_n": ("side force, mean at sea", "large_force"),
    "peak_side_force_n": ("highest side force met", "large_force"),
    "peak_heeling_moment_nm": ("highest heeling moment met", "moment"),
    "running_share": ("rotors running", "percent"),
    "free_share": ("running freely", "percent"),
    "limited_share": ("running at a limit", "percent"),
    "stopped_share": ("rotors stopped", "percent"),
    "hours_at_sea_per_year": ("hours at sea per year", "duration"),
    "annual_energy_saved_j": ("net energy saved per year", "energy"),
    "annual_engine_energy_saved_j": ("engine energy saved per year", "energy"),
    "annual_spin_energy_j": ("spin energy per year", "energy"),
    "annual_fuel_saved_kg": ("fuel saved per year", "fuel_mass"),
    "annual_co2_avoided_kg": ("CO₂ avoided per year", "fuel_mass"),
    "annual_fuel_cost_saved": ("fuel cost saved per year", "money"),
    "annual_carbon_cost_saved": ("carbon cost avoided per year", "money"),
    "annual_cost_saved": ("money saved per year", "money"),
    "payback_years": ("simple payback, years", "ratio"),
    "discounted_payback_years": ("discounted payback, years", "ratio"),
    "engine_power_share": ("share of main-engine power saved", "percent"),
    "mean_ship_speed_m_s": ("ship speed, mean at sea", "ship_speed"),
    "mean_true_wind_speed_m_s": ("true wind speed, mean at sea", "wind_speed"),
    "rows": ("wind conditions or hours read", "ratio"),
}
#: Quantity kinds of the other tables' columns; shares of time are shown in %.
COLUMN_UNITS = {
    "true_wind_angle_deg": "angle", "true_wind_speed_m_s": "wind_speed", "net_power_w": "power",
    "contribution_w": "power", "mean_net_power_w": "power", "energy_saved_j": "energy",
    "diameter_m": "length", "height_m": "length", "rotors": "ratio", "installed_cost": "money",
    "annual_fuel_saved_kg": "fuel_mass", "annual_co2_avoided_kg": "fuel_mass",
    "annual_cost_saved": "money", "payback_years": "ratio",
}
SHARE_COLUMNS = ("share_of_time", "share_of_sea_time", "running_share")


def tables_in_units(result: StudyResult, system: str) -> dict:
    """The study's tables in ``system``'s units with the unit in each column name; the summary
    as quantity, value, unit rows."""
    s = result.detail.summary
    rows = []
    for key, (label, kind) in SUMMARY_UNITS.items():
        v = getattr(s, key)
        rows.append((label, 100.0 * v if kind == "percent" else v, kind))
    summary = quantity_table(rows, system)
    currency = result.inputs.get("currency", "")
    money = [kind == "money" for _, _, kind in rows]
    summary.loc[money, "unit"] = currency  # money carries its currency
    out = {"summary": summary}
    for name, df in result.tables.items():
        if name == "summary":
            continue
        df = df.copy()
        kinds = {c: k for c, k in COLUMN_UNITS.items() if c in df.columns}
        for c in SHARE_COLUMNS:
            if c in df.columns:
                df[c] = 100.0 * df[c]
                kinds[c] = "percent"
        money_cols = {column_label(c) for c, k in kinds.items() if k == "money"}
        out[name] = table_in_units(df, kinds, system).rename(
            columns=lambda c: (f"{c} [{currency}]" if c in money_cols and currency else c).replace("co2", "CO₂"))
    return out


def summary(result: StudyResult, system: str = "SI") -> str:
    """The sentence the handout leads its results with: the carbon intensity and its rating
    without and with the rotors, with what the rating rests on ("" without the ship's fuel)."""
    body = cii_summary(result)
    return f"{body} {CII_CAUTION}" if body else ""


def cii_summary(result: StudyResult) -> str:
    """:func:`cii_sentence` and the carbon cost of the year without and with the rotors."""
    sentence = cii_sentence(result.detail)
    d = result.detail
    if sentence and d.carbon_cost_before:
        cur = result.inputs.get("currency", "")
        sentence += (f" Carbon cost of the year: **{d.carbon_cost_before:,.0f} {cur}** without the rotors, "
                     f"**{d.carbon_cost_after:,.0f} {cur}** with them.")
    return sentence


def data_note(result: StudyResult) -> str:
    """Which wind data and hours the result rests on (the page caption and the handout report)."""
    d = result.detail
    s = d.summary
    hours_note = "from the series" if d.hours_source == "from the series" else "as entered"
    rows = "hourly rows" if d.wind_kind == "series" else "wind conditions"
    return (f"Wind: {d.wind_source}, {d.conditions:,} {rows}; {s.hours_at_sea_per_year:,.0f} h at "
            f"sea per year ({hours_note}); computed {d.engine}. Coefficient set: "
            f"{d.coefficient_set['label']}.")
