"""``liftcore fit``: drag and lift of a ball fitted to its tracked flights.

Runs the same fit as the flight page's "Fit to tracked flights" tab (``liftcore.studies.flight.
track_fit``), so the numbers agree. Tracks: CSV ``flight,t,x,y,z`` in SI units (drift to the
right), see :func:`liftcore.ballflight.read_tracks`.
"""

from __future__ import annotations

from liftcore.balls import BALL_KEYS
from liftcore.cli import add_json_flag
from liftcore.cli.common import (Option, add_air_options, add_options, air_values, option_names, option_values,
                                 text_table, validate_inputs)
from liftcore.errors import InputError, check_choice
from liftcore.studies.flight import INPUTS

OPTIONS = (Option("spin_rpm", "--spin-rpm", "rpm", text="spin rate of the tracked flights"),
           Option("spin_axis_deg", "--spin-axis-deg", "deg", text="spin-axis tilt, right +"),
           Option("rifle_deg", "--rifle-deg", "deg", text="rifle-spin angle"),
           Option("wind_speed_m_s", "--wind-speed-m-s", "m/s", text="wind speed during the tracked flights",
                  without="still air"),
           Option("wind_from_deg", "--wind-from-deg", "deg",
                  text="wind comes from, clockwise from downrange: 0 into the face, 180 from behind"),
           Option("fit_mode", "--mode", text="what is fitted: constant CD and CL, scale factors on the ball's "
                                             "model, or curves (CD = a + b S, CL rising to a level)"))


def add_parser(sub):
    p = sub.add_parser(
        "fit", help="drag and lift of a ball fitted to its tracked flights (CSV)",
        description="Fit drag and lift, and each flight's launch state, to tracked positions by least "
                    "squares (scipy least_squares), with one-sigma uncertainties. Tracks: CSV with the "
                    "header flight,t,x,y,z in SI units (x downrange, y drift to the right, z height).")
    g = p.add_argument_group("tracks")
    src = g.add_mutually_exclusive_group(required=True)
    src.add_argument("--tracks", metavar="FILE.csv", help="your tracked positions")
    src.add_argument("--demo-tracks", action="store_true",
                     help="the invented demo tracks shipped with liftcore (a baseball with known CD and CL; "
                          "their own ball, air and spin are used)")
    g.add_argument("--ball", default="baseball", metavar="NAME",
                   help=f"ball of your tracks: one of {', '.join(BALL_KEYS[:-1])} (default baseball)")
    add_options(g, INPUTS, OPTIONS)
    g.add_argument("--save-table", metavar="OUT.csv",
                   help="with --mode curve: write the fitted curves as an aerodynamic table (S, CD, CL) "
                        "for flight --aero-table")
    add_air_options(p, density=False)
    add_json_flag(p)
    return p


def _values(args) -> dict:
    check_choice("ball", args.ball, BALL_KEYS[:-1])
    if args.tracks is not None and args.spin_rpm is None:
        raise InputError("--spin-rpm", "--spin-rpm is needed with --tracks: the spin rate of the tracked flights")
    values = {"ball": args.ball, **air_values(args), "wind_speed_m_s": 0.0, **option_values(args, OPTIONS)}
    if args.save_table is not None and values.get("fit_mode", "constant") != "curve":
        raise InputError("--save-table", "--save-table needs --mode curve (constants and scale factors "
                                         "are numbers, not curves)")
    return validate_inputs(INPUTS, values, option_names(OPTIONS))


def execute(args, progress):
    from liftcore import ballflight as bf
    from liftcore.studies import flight

    values = _values(args)
    tracks = None if args.demo_tracks else bf.read_tracks(args.tracks)
    progress(0.0, "fitting the tracks")
    fit = flight.track_fit(values, tracks)
    progress(1.0, "fitting the tracks")
    coeffs = fit.names[:fit.coefficient_count]
    data = {"mode": fit.mode, "flights": list(fit.flights), "rms_m": fit.rms_m,
            "coefficients": {n: {"value": v, "sd": sd} for n, (v, sd) in ((n, fit.parameter(n)) for n in coeffs)},
            "evaluations": fit.nfev, "degrees_of_freedom": fit.dof, "success": fit.success,
            "warnings": [w.as_dict() for w in fit.warnings()], "table_written": None}
    if args.save_table is not None:
        from pathlib import Path

        Path(args.save_table).write_text(fit.curve_table(), encoding="utf-8")
        data["table_written"] = args.save_table
    source = "invented demo tracks" if args.demo_tracks else args.tracks
    rows = [("Tracks", f"{source}: {len(fit.flights)} flights"), ("Fit", fit.mode)]
    rows += [(n, f"{v:.4f} ± {sd:.4f} (one sigma)") for n, (v, sd) in ((n, fit.parameter(n)) for n in coeffs)]
    rows += [("RMS miss", f"{fit.rms_m:.4f} m"), ("Evaluations", f"{fit.nfev:,}"), ("Solver", fit.message)]
    if data["table_written"]:
        rows.append(("Table written", f"{args.save_table} (fly it with flight --aero-table)"))
    rows += [("Warning", w.message) for w in fit.warnings()]
    return data, text_table(rows)
