"""``liftcore voyage``: expected rotor savings over the wind of a trade (a year at sea).

    python -m liftcore voyage --diameter-m 5 --height-m 30 --rotors 2 --ship-speed-kn 12 \\
        --wind-table wind.csv --hours-at-sea 6000 --fuel hfo [--json]

Exactly one wind input: ``--wind-table`` (true_wind_angle_deg, true_wind_speed_m_s, probability),
``--weibull`` (sector_centre_deg, frequency, scale_m_s, shape; with ``--course-deg``) or
``--wind-series`` (time, ship_speed_kn, ship_heading_deg, true_wind_speed_m_s,
true_wind_direction_deg[, leg]; streamed in blocks, any length). Every other rotor input of the
rotor page is available as ``--<input-key>`` in core units (``--max-rpm``, ``--end-plate-ratio``).
"""

from __future__ import annotations

import argparse
import math

from liftcore import rotor
from liftcore.air import air_inputs
from liftcore.cli import add_json_flag
from liftcore.cli.common import require_one, text_table
from liftcore.constants import KNOT_M_S
from liftcore.errors import InputError, check_number
from liftcore.studies import format_number
from liftcore.studies import voyage as study
from liftcore.voyage import DASK_AUTO_ROWS, FUELS

#: Inputs given by the options named in the command's usage, not by the generic ones.
_NAMED = {"diameter_m", "height_m", "rotor_count"}


def _option(key: str) -> str:
    return "--" + key.replace("_", "-")


def _add_field_options(group, fields) -> None:
    """One option per input field, named after its key (core units), default from the study."""
    for f in fields:
        if f.key in _NAMED:
            continue
        if f.kind == "bool":
            group.add_argument(_option(f.key), dest=f"in_{f.key}", action=argparse.BooleanOptionalAction,
                               default=None, help=f"{f.label} (default {'on' if f.default else 'off'})")
        elif f.kind == "choice":
            group.add_argument(_option(f.key), dest=f"in_{f.key}", choices=f.choices, default=None,
                               help=f"{f.label} (default {f.default})")
        elif f.kind == "text":
            group.add_argument(_option(f.key), dest=f"in_{f.key}", default=None, metavar="TEXT",
                               help=f.label)
        else:
            group.add_argument(_option(f.key), dest=f"in_{f.key}", type=float, default=None,
                               metavar="X", help=f"{f.label} (default {f.default:g})")


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
    r = p.add_argument_group("other rotor, wind-profile, limit and air inputs (core units; "
                             "defaults as on the rotor page)")
    _add_field_options(r, tuple(rotor.ROTOR_FIELDS) + tuple(air_inputs()))
    add_json_flag(p)
    return p


def values_from_args(args) -> tuple[dict, str]:
    """(study input values, wind file path) from the parsed options; raises InputError."""
    require_one("--wind-table, --weibull, --wind-series", args.wind_table, args.weibull, args.wind_series)
    kind, path = (("table", args.wind_table) if args.wind_table else
                  ("weibull", args.weibull) if args.weibull else ("series", args.wind_series))
    v = {"diameter_m": args.diameter_m, "height_m": args.height_m, "rotor_count": args.rotors,
         "fuel": args.fuel, "wind_kind": kind, "sweep": bool(args.sweep)}
    for f in tuple(rotor.ROTOR_FIELDS) + tuple(air_inputs()):
        x = getattr(args, f"in_{f.key}", None)
        if x is not None:
            v[f.key] = x
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
    if kind == "weibull":
        if args.course_deg is None:
            raise InputError("course-deg", "give --course-deg (the course on the trade, 0 to 360 deg "
                                           "from north) with --weibull")
        v["course_deg"] = check_number("course-deg", args.course_deg, "deg", low=0.0, high=360.0)
        v["round_trip"] = not args.one_way
    for opt, key in (("sfoc_g_kwh", "sfoc_main_g_kwh"), ("generator_sfoc_g_kwh", "sfoc_generator_g_kwh"),
                     ("fuel_price", "fuel_price_per_t"), ("carbon_price", "carbon_price_per_t_co2"),
                     ("installed_cost", "installed_cost"), ("upkeep", "upkeep_per_year"),
                     ("discount_rate_pct", "discount_rate_pct"), ("sweep_max_rotors", "sweep_max_rotors")):
        x = getattr(args, opt)
        if x is not None:
            v[key] = x
    if args.in_process:
        v["dask_scheduler"] = "off"
    elif args.dask_scheduler:
        v["dask_scheduler"] = args.dask_scheduler
    return v, path


def execute(args, progress):
    values, path = values_from_args(args)
    clean = study.INPUTS.validate(values)
    result = study.run(clean, progress=progress, extra=path)
    data = dict(result.json)
    if result.detail.sweep is not None:
        data["design_options"] = result.detail.sweep.to_dict(orient="records")
    rows = [(h.label, _text(h)) for h in result.headlines]
    rows += [("Wind", f"{result.detail.wind_source} ({result.detail.conditions:,} "
                      f"{'rows' if result.detail.wind_kind == 'series' else 'conditions'}, "
                      f"computed {result.detail.engine})")]
    rows += [("Warning", w.message) for w in result.warnings]
    return data, text_table(rows)


def _text(h) -> str:
    if h.key == "payback" and not math.isfinite(h.value):
        return "never"
    return h.text("SI") if h.quantity != "money" else format_number(h.value, 3)
