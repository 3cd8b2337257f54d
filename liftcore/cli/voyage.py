"""``liftcore voyage``: expected rotor savings over the wind of a trade (a year at sea).

    python -m liftcore voyage --diameter-m 5 --height-m 30 --rotors 2 --ship-speed-kn 12 \\
        --wind-table wind.csv --hours-at-sea 6000 --fuel hfo [--json]

Exactly one wind input: ``--wind-table`` (true_wind_angle_deg, true_wind_speed_m_s, probability),
``--weibull`` (sector_centre_deg, frequency, scale_m_s, shape; with ``--course-deg``) or
``--wind-series`` (time, ship_speed_kn, ship_heading_deg, true_wind_speed_m_s,
true_wind_direction_deg[, leg]; streamed in blocks, any length). The rotor, wind-profile,
coefficient, limit and air options are those of ``liftcore rotor`` (same names and units).
"""

from __future__ import annotations

import math

from pathlib import Path

from liftcore import coefficients as coef
from liftcore.cli import add_json_flag
from liftcore.cli.common import (Option, add_air_options, add_options, air_values, option_names, option_values,
                                 require_one, text_table, validate_inputs)
from liftcore.cli.rotor import (HULL_NOTE, HULL_OPTIONS, SHARED_OPTIONS, add_coefficient_options, coefficient_values,
                                hull_values)
from liftcore.constants import KNOT_M_S
from liftcore.errors import InputError, check_number
from liftcore.files import read_text
from liftcore.studies import voyage as study
from liftcore.voyage import DASK_AUTO_ROWS, FUELS

KN = ("kn", KNOT_M_S)
#: The voyage's own options (those of the rotor, its wind profile, coefficients and limits are
#: ``liftcore rotor``'s, :data:`liftcore.cli.rotor.SHARED_OPTIONS`).
SHIP_OPTIONS = (
    Option("diameter_m", "--diameter-m", "m", required=True),
    Option("height_m", "--height-m", "m", required=True),
    Option("rotor_count", "--rotors", required=True),
    Option("ship_speed_m_s", "--ship-speed-kn", *KN, text="service speed (tables and Weibull input)",
           without="the series' own speeds; tables and Weibull input need it or --speed-profile"),
    Option("speed_profile_kn", "--speed-profile", "kn:share",
           text="speeds and shares of sea time, e.g. '12:0.6,10:0.4'", without="one service speed"),
    Option("hours_at_sea_h", "--hours-at-sea", "h", text="hours at sea per year",
           without="a series gives its own; tables and Weibull input need it"),
    Option("fuel", "--fuel", text="fuel of main engine and generators", required=True),
    Option("sfoc_main_g_kwh", "--sfoc-g-kwh", "g/kWh", text="main-engine SFOC"),
    Option("sfoc_generator_g_kwh", "--generator-sfoc-g-kwh", "g/kWh", text="generator SFOC"),
)
COURSE_OPTIONS = (
    Option("course_deg", "--course-deg", "deg from north", text="course on the trade for --weibull",
           without="required with --weibull"),
)
MONEY_OPTIONS = (
    Option("currency", "--currency", text="ISO 4217 code of every amount of money (no exchange rates)"),
    Option("fuel_price_per_t", "--fuel-price", "money/t", text="fuel price"),
    Option("carbon_price_per_t_co2", "--carbon-price", "money/t CO2", text="carbon price"),
    Option("installed_cost", "--installed-cost", "money", text="money to buy and fit the rotors"),
    Option("upkeep_per_year", "--upkeep", "money/year", text="money per year to keep the rotors running"),
    Option("discount_rate_pct", "--discount-rate-pct", "%", text="discount rate for the discounted payback"),
)
CII_OPTIONS = (
    Option("cii_ship_type", "--ship-type", text="ship type of the IMO carbon intensity rating"),
    Option("cii_capacity_t", "--capacity-t", "t", text="deadweight, or gross tonnage for the types rated on it"),
    Option("cii_year", "--cii-year", text="year rated (sets the reduction factor)"),
    Option("annual_fuel_kg", "--annual-fuel-t", "t", 1000.0,
           text="the ship's fuel per year without rotors", without="no CII"),
    Option("carbon_covered_pct", "--carbon-covered-pct", "%",
           text="share of CO2 the carbon price is paid on"),
)
SWEEP_OPTIONS = (
    Option("sweep_max_rotors", "--sweep-max-rotors", text="most rotors in the comparison"),
)
OPTIONS = SHIP_OPTIONS + COURSE_OPTIONS + MONEY_OPTIONS + CII_OPTIONS + SWEEP_OPTIONS + SHARED_OPTIONS
#: Largest coefficient CSV file read from the command line. [bytes]
MAX_CSV_BYTES = 1_000_000


def add_parser(sub):
    p = sub.add_parser(
        "voyage", help="yearly energy, fuel, CO2 and money saved by rotor sails on a trade",
        description="Expected rotor thrust, net power gain, energy, fuel, CO2 and money saved per "
                    "year over the wind of a trade (best spin in every wind condition).",
        epilog="Directions: true_wind_angle_deg is the bearing of the wind from the bow (0 = head "
               "wind, 90 = from starboard); true_wind_direction_deg and sector_centre_deg are where "
               "the wind comes from, clockwise from north; headings clockwise from north. "
               f"Series above {DASK_AUTO_ROWS:,} rows run on a local Dask cluster unless "
               "--in-process is given.")
    spec = study.INPUTS
    add_options(p.add_argument_group("rotors and ship"), spec, SHIP_OPTIONS)
    w = p.add_argument_group("wind on the trade (exactly one)")
    w.add_argument("--wind-table", metavar="FILE", help="joint table CSV: true_wind_angle_deg, "
                                                        "true_wind_speed_m_s, probability")
    w.add_argument("--weibull", metavar="FILE", help="Weibull per sector CSV: sector_centre_deg, "
                                                     "frequency, scale_m_s, shape")
    w.add_argument("--wind-series", metavar="FILE", help="hourly series CSV: time, ship_speed_kn, "
                                                         "ship_heading_deg, true_wind_speed_m_s, "
                                                         "true_wind_direction_deg[, leg]")
    add_options(w, spec, COURSE_OPTIONS)
    w.add_argument("--one-way", action="store_true",
                   help="--weibull: the course only (default: half the time on the reciprocal)")
    add_options(p.add_argument_group("money"), spec, MONEY_OPTIONS)
    add_options(p.add_argument_group("carbon intensity (IMO CII; with --annual-fuel-t)"), spec, CII_OPTIONS)
    c = p.add_argument_group("computation")
    c.add_argument("--dask-scheduler", metavar="ADDR",
                   help="run a series on this Dask scheduler (tcp://host:8786, workers must read "
                        "the file) or 'local' for a local cluster")
    c.add_argument("--in-process", action="store_true", help="never use Dask")
    c.add_argument("--sweep", action="store_true",
                   help="also compare rotor sizes and counts (design_options in --json)")
    add_options(c, spec, SWEEP_OPTIONS)
    c.add_argument("--no-spread", action="store_true",
                   help="skip the year with every published coefficient set and spin-power estimate "
                        "(the *_range keys are then null)")
    r = p.add_argument_group("rotor, wind profile, coefficients, limits (as in the rotor command)")
    add_options(r, spec, tuple(o for o in SHARED_OPTIONS if o not in HULL_OPTIONS))
    add_coefficient_options(r)
    from liftcore.cli.rotor import add_hull_options

    add_hull_options(p, spec)
    add_air_options(p, density=False)
    add_json_flag(p)
    return p


def values_from_args(args) -> tuple[dict, str]:
    """(study input values, wind file path) from the parsed options; raises InputError."""
    require_one("--wind-table, --weibull, --wind-series", args.wind_table, args.weibull, args.wind_series)
    kind, path = (("table", args.wind_table) if args.wind_table is not None else
                  ("weibull", args.weibull) if args.weibull is not None else ("series", args.wind_series))
    if not path.strip():
        option = {"table": "--wind-table", "weibull": "--weibull", "series": "--wind-series"}[kind]
        raise InputError(option, f"{option} needs a file name (got an empty one)")
    # No CII for a ship whose fuel is not given (the page's demo ship is invented)
    v = {"wind_kind": kind, "sweep": bool(args.sweep), "published_spread": not args.no_spread,
         "annual_fuel_kg": 0.0, **option_values(args, OPTIONS), **hull_values(args)}
    if args.no_aspect_ratio_correction:
        v["correct_aspect_ratio"] = False
    if args.coefficients:
        v.update(coefficient_values(args.coefficients))
    v.update(air_values(args))
    if args.ship_speed_kn is None and kind != "series" and not args.speed_profile:
        raise InputError("--ship-speed-kn", "give --ship-speed-kn (or --speed-profile) for a wind table "
                                            "or Weibull input")
    if args.hours_at_sea is not None:
        v["hours_from_series"] = False
    elif kind != "series":
        raise InputError("--hours-at-sea", "give --hours-at-sea (hours at sea per year, 1 to 8760 h)")
    if kind != "weibull" and (args.course_deg is not None or args.one_way):
        raise InputError("--course-deg", "--course-deg and --one-way apply to --weibull only "
                                         "(a table or a series holds its own wind angles)")
    if kind == "weibull":
        if args.course_deg is None:
            raise InputError("--course-deg", "give --course-deg (the course on the trade, 0 to 360 deg "
                                             "from north) with --weibull")
        v["round_trip"] = not args.one_way
    return v, path


def _validate(values: dict) -> dict:
    """Study inputs checked one by one; a bad one names its option (marine units, as in rotor)."""
    names = {**option_names(OPTIONS), "user_coefficients_csv": "--coefficients"}
    return validate_inputs(study.INPUTS, values, names)


def execute(args, progress):
    values, path = values_from_args(args)
    clean = _validate(values)
    scheduler = "off" if args.in_process else (args.dask_scheduler or None)
    with study.computing_on(scheduler):
        result = study.run(clean, progress=progress, extra=path)
    data = dict(result.json)
    if result.detail.sweep is not None:
        data["design_options"] = result.detail.sweep.to_dict(orient="records")
    if result.detail.spread is not None:
        data["published_spread"] = result.detail.spread.to_dict(orient="records")
    rows = [(h.label, _text(h)) for h in result.headlines]
    rows += [("Wind", f"{result.detail.wind_source} ({result.detail.conditions:,} "
                      f"{'rows' if result.detail.wind_kind == 'series' else 'conditions'}, "
                      f"computed {result.detail.engine})")]
    if not clean["hull_balance"]:
        rows.append(("Note", HULL_NOTE))
    sentence = study.cii_sentence(result.detail)
    rows += [("Carbon intensity", sentence.replace("**", "") + " " + study.CII_CAUTION) if sentence else
             ("Note", "no carbon intensity rating: give --annual-fuel-t (the ship's fuel per year "
                      "without rotors) with --ship-type and --capacity-t")]
    rows += [("Warning", w.message) for w in result.warnings]
    return data, text_table(rows)


def _text(h) -> str:
    if h.key == "payback" and not math.isfinite(h.value):
        return "never"
    return h.text("SI") + (f" ({h.spread_text('SI')})" if h.spread_text("SI") else "")
