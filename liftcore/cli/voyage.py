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
from liftcore.cli.common import add_air_options, air_values, require_one, text_table, validate_inputs
from liftcore.constants import KNOT_M_S
from liftcore.errors import InputError, check_number
from liftcore.files import read_text
from liftcore.studies import voyage as study
from liftcore.voyage import DASK_AUTO_ROWS, FUELS

#: Rotor options shared with ``liftcore rotor`` (same names and units):
#: option dest -> (study input key, factor from the option's unit to the core unit, or None).
ROTOR_OPTIONS = {
    "base_height_m": ("base_height_m", 1.0, "rotor base above the waterline [m]"),
    "end_plate_ratio": ("end_plate_ratio", 1.0, "end-plate diameter / rotor diameter, 1 = none"),
    "rotor_spacing_m": ("rotor_spacing_m", 1.0, "fore-and-aft spacing between rotors [m]"),
    "first_rotor_x_m": ("first_rotor_x_m", 1.0, "foremost rotor ahead of midships [m]"),
    "interaction_factor": ("interaction_factor", 1.0, "multiplier on the forces of several rotors, assumed"),
    "heel_reference_depth_m": ("heel_reference_depth_m", 1.0, "heeling moment about a point this far below the waterline [m]"),
    "reference_height_m": ("reference_height_m", 1.0, "height of the given true wind [m]"),
    "power_law_exponent": ("power_law_exponent", 1.0, "power-law exponent"),
    "charnock_constant": ("charnock_constant", 1.0, "Charnock constant"),
    "strips": ("strips", None, "strips along the rotor height"),
    "max_rpm": ("max_rpm", 1.0, "maximum rotor speed [rpm]"),
    "max_motor_power_kw": ("max_motor_power_w", 1000.0, "maximum motor power per rotor [kW]"),
    "max_heeling_moment_knm": ("max_heeling_moment_nm", 1000.0, "maximum heeling moment of all rotors [kN m]"),
    "max_spin_ratio": ("max_spin_ratio", 1.0, "highest spin ratio the best spin may use"),
    "propulsive_efficiency": ("propulsive_efficiency", 1.0, "thrust power / engine power"),
    "electrical_efficiency": ("electrical_efficiency", 1.0, "rotor shaft power / electric power drawn"),
    "set_aspect_ratio": ("user_aspect_ratio", 1.0, "aspect ratio of the rotor a CSV set was measured on (0 = two-dimensional)"),
    "set_end_plate_ratio": ("user_end_plate_ratio", 1.0, "end-plate ratio of the rotor a CSV set was measured on"),
}
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
    g = p.add_argument_group("rotors and ship")
    g.add_argument("--diameter-m", type=float, required=True, help="rotor diameter D [m]")
    g.add_argument("--height-m", type=float, required=True, help="rotor height H [m]")
    g.add_argument("--rotors", type=int, required=True, help="number of rotors")
    g.add_argument("--ship-speed-kn", type=float, help="service speed (tables and Weibull input) [kn]")
    g.add_argument("--speed-profile", help="speeds and shares of sea time, e.g. '12:0.6,10:0.4' [kn:share]")
    g.add_argument("--hours-at-sea", type=float,
                   help="hours at sea per year [h] (required for tables and Weibull input; a "
                        "series gives its own unless this is set)")
    g.add_argument("--fuel", choices=FUELS, required=True, help="fuel of main engine and generators")
    g.add_argument("--sfoc-g-kwh", type=float, help="main-engine SFOC [g/kWh] (default 175)")
    g.add_argument("--generator-sfoc-g-kwh", type=float, help="generator SFOC [g/kWh] (default 205)")
    w = p.add_argument_group("wind on the trade (exactly one)")
    w.add_argument("--wind-table", metavar="FILE", help="joint table CSV: true_wind_angle_deg, "
                                                        "true_wind_speed_m_s, probability")
    w.add_argument("--weibull", metavar="FILE", help="Weibull per sector CSV: sector_centre_deg, "
                                                     "frequency, scale_m_s, shape")
    w.add_argument("--wind-series", metavar="FILE", help="hourly series CSV: time, ship_speed_kn, "
                                                         "ship_heading_deg, true_wind_speed_m_s, "
                                                         "true_wind_direction_deg[, leg]")
    w.add_argument("--course-deg", type=float, help="course on the trade for --weibull [deg from north]")
    w.add_argument("--one-way", action="store_true",
                   help="--weibull: the course only (default: half the time on the reciprocal)")
    m = p.add_argument_group("money")
    m.add_argument("--currency", choices=study.CURRENCIES, help="ISO 4217 code of every amount of money "
                                                            "(default EUR; no exchange rates)")
    m.add_argument("--fuel-price", type=float, help="money per t of fuel (default 600)")
    m.add_argument("--carbon-price", type=float, help="money per t of CO2 (default 0)")
    m.add_argument("--installed-cost", type=float, help="money to buy and fit the rotors")
    m.add_argument("--upkeep", type=float, help="money per year to keep the rotors running")
    m.add_argument("--discount-rate-pct", type=float, help="for the discounted payback [%%]")
    c = p.add_argument_group("computation")
    c.add_argument("--dask-scheduler", metavar="ADDR",
                   help="run a series on this Dask scheduler (tcp://host:8786, workers must read "
                        "the file) or 'local' for a local cluster")
    c.add_argument("--in-process", action="store_true", help="never use Dask")
    c.add_argument("--sweep", action="store_true",
                   help="also compare rotor sizes and counts (design_options in --json)")
    c.add_argument("--sweep-max-rotors", type=int, help="most rotors in the comparison (default 6)")
    c.add_argument("--no-spread", action="store_true",
                   help="skip the year with every published coefficient set and spin-power estimate "
                        "(the *_range keys are then null)")
    d = {f.key: f.default for f in study.INPUTS.fields}
    r = p.add_argument_group("rotor, wind profile, coefficients, limits (as in the rotor command)")
    for dest, (key, factor, text) in ROTOR_OPTIONS.items():
        shown = d[key] if factor is None else d[key] / factor
        r.add_argument("--" + dest.replace("_", "-"), type=int if factor is None else float,
                       help=f"{text} (default {shown:g})")
    r.add_argument("--wind-profile", choices=("uniform", "power", "log"),
                   help=f"wind profile over the sea (default {d['wind_profile']})")
    r.add_argument("--coefficients", metavar="NAME|FILE.csv",
                   help=f"coefficient set: one of {', '.join(coef.builtin_names())}, or a CSV file "
                        f"with columns SR, CL, CD[, CP] (default {coef.DEFAULT_SET})")
    r.add_argument("--no-aspect-ratio-correction", action="store_true",
                   help="use the set's drag as measured, without moving its induced drag to this rotor")
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
    v = {"diameter_m": args.diameter_m, "height_m": args.height_m, "rotor_count": args.rotors,
         "fuel": args.fuel, "wind_kind": kind, "sweep": bool(args.sweep),
         "published_spread": not args.no_spread}
    for dest, (key, factor, _) in ROTOR_OPTIONS.items():
        x = getattr(args, dest)
        if x is not None:
            v[key] = x if factor is None else x * factor
    if args.wind_profile:
        v["wind_profile"] = args.wind_profile
    if args.no_aspect_ratio_correction:
        v["correct_aspect_ratio"] = False
    if args.coefficients:
        v.update(_coefficients(args.coefficients))
    v.update(air_values(args))
    if args.ship_speed_kn is not None:
        v["ship_speed_m_s"] = check_number("ship-speed-kn", args.ship_speed_kn, "kn", low=0.5,
                                           high=30.0) * KNOT_M_S
    elif kind != "series" and not args.speed_profile:
        raise InputError("ship-speed-kn", "give --ship-speed-kn (or --speed-profile) for a wind table "
                                          "or Weibull input")
    if args.speed_profile:
        v["speed_profile_kn"] = args.speed_profile
    if args.hours_at_sea is not None:
        v["hours_at_sea_h"] = check_number("hours-at-sea", args.hours_at_sea, "h", low=1.0, high=8760.0)
        v["hours_from_series"] = False
    elif kind != "series":
        raise InputError("hours-at-sea", "give --hours-at-sea (hours at sea per year, 1 to 8760 h)")
    if kind != "weibull" and (args.course_deg is not None or args.one_way):
        raise InputError("--course-deg", "--course-deg and --one-way apply to --weibull only "
                                         "(a table or a series holds its own wind angles)")
    if kind == "weibull":
        if args.course_deg is None:
            raise InputError("course-deg", "give --course-deg (the course on the trade, 0 to 360 deg "
                                           "from north) with --weibull")
        v["course_deg"] = check_number("course-deg", args.course_deg, "deg", low=0.0, high=360.0)
        v["round_trip"] = not args.one_way
    for opt, key in (("sfoc_g_kwh", "sfoc_main_g_kwh"), ("generator_sfoc_g_kwh", "sfoc_generator_g_kwh"),
                     ("fuel_price", "fuel_price_per_t"), ("carbon_price", "carbon_price_per_t_co2"),
                     ("installed_cost", "installed_cost"), ("upkeep", "upkeep_per_year"),
                     ("discount_rate_pct", "discount_rate_pct"), ("sweep_max_rotors", "sweep_max_rotors"),
                     ("currency", "currency")):
        x = getattr(args, opt)
        if x is not None:
            v[key] = x
    return v, path


def _coefficients(name: str) -> dict:
    if name in coef.builtin_names():
        return {"coefficient_set": name}
    path = Path(name)
    if path.suffix.lower() != ".csv" and not path.exists():
        raise InputError("--coefficients", f"--coefficients must be one of "
                                           f"{', '.join(coef.builtin_names())} or a .csv file (got {name!r})")
    table = read_text(path, "--coefficients", MAX_CSV_BYTES)
    coef.user_coefficient_set(table, source=f"--coefficients file {path.name}")  # check, naming the file
    return {"coefficient_set": "user", "user_coefficients_csv": table}


def _validate(values: dict) -> dict:
    """Study inputs checked one by one; a bad one names its option (marine units, as in rotor)."""
    option_of = {key: "--" + dest.replace("_", "-") for dest, (key, _, _) in ROTOR_OPTIONS.items()}
    option_of.update(diameter_m="--diameter-m", height_m="--height-m", rotor_count="--rotors",
                     sfoc_main_g_kwh="--sfoc-g-kwh", sfoc_generator_g_kwh="--generator-sfoc-g-kwh",
                     fuel_price_per_t="--fuel-price", carbon_price_per_t_co2="--carbon-price",
                     installed_cost="--installed-cost", upkeep_per_year="--upkeep",
                     discount_rate_pct="--discount-rate-pct", sweep_max_rotors="--sweep-max-rotors",
                     speed_profile_kn="--speed-profile", user_coefficients_csv="--coefficients")
    out = validate_inputs(study.INPUTS, values, option_of)
    return out


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
    rows += [("Warning", w.message) for w in result.warnings]
    return data, text_table(rows)


def _text(h) -> str:
    if h.key == "payback" and not math.isfinite(h.value):
        return "never"
    return h.text("SI") + (f" ({h.spread_text('SI')})" if h.spread_text("SI") else "")
