"""``liftcore flight``: carry, peak height, time aloft and drift of a spinning ball.

Runs the same study as the dashboard page (``liftcore.studies.flight``), so the numbers agree.
"""

from __future__ import annotations

from liftcore.balls import BALL_KEYS, MODEL_KEYS
from liftcore.cli import add_json_flag
from liftcore.cli.common import (Option, add_air_options, add_options, air_values, density_from_args,
                                 option_values, text_table)
from liftcore.errors import InputError, check_choice, check_number
from liftcore.ballflight import MAX_CHECK_DISTANCE_M
from liftcore.bounce import GROUND_KEYS
from liftcore.studies import run_study
from liftcore.studies.flight import INPUTS, SWEEP_LABELS

#: Options generated from the study's inputs (type, range and default from the field).
WALL_OPTIONS = (Option("wall_distance_m", "--wall-distance-m", "m", text="your wall (--obstacle custom): distance"),
                Option("wall_height_m", "--wall-height-m", "m", text="your wall: height"),
                Option("wall_width_m", "--wall-width-m", "m", text="your wall: width, 0 = endless"))
SWEEP_OPTIONS = (Option("sweep_points", "--sweep-points", text="grid points along each sweep input"),
                 Option("sweep_output", "--sweep-output", text="result the sweep maps"))


def add_parser(sub):
    p = sub.add_parser(
        "flight", help="flight of a spinning ball: carry, peak height, drift, landing",
        description="Flight of a spinning ball with drag, Magnus lift, spin decay, wind and air state. "
                    "x downrange, drift and angles right-positive. Results are for analysis, not for "
                    "safety distances.")
    g = p.add_argument_group("ball")
    g.add_argument("--ball", required=True, metavar="NAME", help=f"one of {', '.join(BALL_KEYS)}")
    g.add_argument("--model", metavar="KEY", help=f"coefficient model ({', '.join(MODEL_KEYS)}); default: the ball's own")
    g.add_argument("--diameter-m", type=float, help="diameter of a custom ball [m]")
    g.add_argument("--mass-kg", type=float, help="mass of a custom ball [kg]")
    g.add_argument("--cd", type=float, help="drag coefficient for --model constant")
    g.add_argument("--cl", type=float, help="lift coefficient for --model constant")
    g.add_argument("--aero-table", metavar="FILE.csv",
                   help="your own CD and CL over spin parameter: CSV with columns S, CD, CL and optionally "
                        "Re (a full grid), in place of --model")
    g = p.add_argument_group("launch")
    g.add_argument("--speed-m-s", type=float, required=True, help="launch speed [m/s]")
    g.add_argument("--elevation-deg", type=float, required=True, help="elevation above horizontal, -90..90 [deg]")
    g.add_argument("--spin-rpm", type=float, required=True, help="spin rate [rpm]")
    g.add_argument("--spin-axis-deg", type=float, default=0.0,
                   help="spin-axis tilt, right +: 0 backspin, 90 curves right, 180 topspin [deg]")
    g.add_argument("--rifle-deg", type=float, default=0.0, help="axis toward the flight direction, 0..90 [deg]")
    g.add_argument("--azimuth-deg", type=float, default=0.0, help="aim right of the target line + [deg]")
    g.add_argument("--launch-height-m", type=float, default=1.0, help="height above the landing ground [m]")
    g.add_argument("--no-spin-decay", action="store_true", help="keep the spin rate constant")
    add_air_options(p, density=True)
    g = p.add_argument_group("wind")
    g.add_argument("--wind-speed-m-s", type=float, default=0.0, help="wind speed [m/s]")
    g.add_argument("--wind-from-deg", type=float, default=0.0,
                   help="wind comes from, clockwise from downrange: 0 into the face, 180 from behind [deg]")
    g.add_argument("--wind-profile", default="uniform", help="uniform or power_law")
    g = p.add_argument_group("after landing, obstacles and checks")
    g.add_argument("--ground", choices=("ball_default", "none") + GROUND_KEYS, default="ball_default",
                   help="after the first landing: bounces and roll to rest on this ground (default: the "
                        "ball's usual one, medium turf for golf, a hard court for court balls; none for "
                        "the others)")
    g.add_argument("--obstacle", choices=INPUTS.field("obstacle").choices, default="none", help="check a preset from the governing bodies' rules (or your own wall, "
                                        "custom): margins in 'obstacles'")
    add_options(g, INPUTS, WALL_OPTIONS)
    g.add_argument("--goal-distance-m", type=float, default=20.0,
                   help="free kick: from the ball to the goal line [m] (default 20; the wall stands at 9.15 m)")
    g.add_argument("--check-distance-m", type=float, metavar="D",
                   help="report where the ball is when it first crosses downrange distance D [m] "
                        "(at_check in --json; null if it lands first)")
    g = p.add_argument_group("launch spread")
    g.add_argument("--dispersion", type=int, default=0, metavar="N", help="fly N flights with drawn launch conditions")
    g.add_argument("--seed", type=int, default=1, help="random seed for --dispersion")
    g = p.add_argument_group("launch sweep (a grid of two launch inputs, every point a full flight)")
    g.add_argument("--sweep-across", metavar="INPUT:FROM:TO",
                   help=f"first sweep input and its range in core units; INPUT one of {', '.join(SWEEP_LABELS)}")
    g.add_argument("--sweep-up", metavar="INPUT:FROM:TO", help="second sweep input and its range")
    add_options(g, INPUTS, SWEEP_OPTIONS)
    g.add_argument("--sweep-lowest", action="store_true", help="the best grid point is the lowest value")
    g.add_argument("--sweep-any", action="store_true",
                   help="with an obstacle: the best grid point of all launches, not only those that clear")
    add_json_flag(p)
    return p


def values_from_args(args) -> dict:
    """Study inputs (core units) from the command-line options, checked with one-line errors."""
    check_choice("ball", args.ball, BALL_KEYS)
    check_number("speed-m-s", args.speed_m_s, "m/s", low=0.0, high=150.0)
    check_number("elevation-deg", args.elevation_deg, "deg", low=-90.0, high=90.0)
    check_number("spin-rpm", args.spin_rpm, "rpm", low=0.0, high=20000.0)
    check_number("spin-axis-deg", args.spin_axis_deg, "deg", low=-180.0, high=180.0)
    check_number("rifle-deg", args.rifle_deg, "deg", low=0.0, high=90.0)
    check_number("azimuth-deg", args.azimuth_deg, "deg", low=-90.0, high=90.0)
    check_number("launch-height-m", args.launch_height_m, "m", low=0.0, high=100.0)
    check_number("wind-speed-m-s", args.wind_speed_m_s, "m/s", low=0.0, high=40.0)
    check_number("wind-from-deg", args.wind_from_deg, "deg", low=-180.0, high=180.0)
    check_choice("wind-profile", args.wind_profile, ("uniform", "power_law"))
    check_number("dispersion", args.dispersion, "", low=0, high=100000)
    check_number("seed", args.seed, "", low=0, high=2 ** 31 - 1)
    rho, air = density_from_args(args, allow_zero=True)
    values = {
        "ball": args.ball, "speed_m_s": args.speed_m_s, "elevation_deg": args.elevation_deg,
        "spin_rpm": args.spin_rpm, "spin_axis_deg": args.spin_axis_deg, "rifle_deg": args.rifle_deg,
        "azimuth_deg": args.azimuth_deg, "launch_height_m": args.launch_height_m,
        "spin_decay": not args.no_spin_decay,
        **air_values(args),
        "wind_speed_m_s": args.wind_speed_m_s, "wind_from_deg": args.wind_from_deg,
        "wind_profile": args.wind_profile, "dispersion_n": args.dispersion, "dispersion_seed": args.seed,
        "ground": args.ground, "obstacle": args.obstacle,
        "goal_distance_m": check_number("goal-distance-m", args.goal_distance_m, "m", low=10.15, high=60.0),
    }
    if args.check_distance_m is not None:
        values["check_distance_m"] = check_number("check-distance-m", args.check_distance_m, "m", low=0.0,
                                                  high=MAX_CHECK_DISTANCE_M, low_inclusive=False)
    values.update(option_values(args, WALL_OPTIONS))
    values.update(_sweep_values(args))
    if args.density_kg_m3 is not None:
        values["set_density"] = True
        values["density_kg_m3"] = rho
    if args.model is not None:
        check_choice("model", args.model, MODEL_KEYS)
        values["coefficient_model"] = args.model
    if args.aero_table is not None:
        if args.model is not None:
            raise InputError("--aero-table", "give either --aero-table or --model, not both")
        from liftcore.balls import TABLE_MAX_BYTES, table_model
        from liftcore.files import read_text

        table = read_text(args.aero_table, "--aero-table", TABLE_MAX_BYTES)
        table_model(table, f"--aero-table file {args.aero_table.rsplit('/', 1)[-1]}")  # check, naming the file
        values["coefficient_model"] = "table"
        values["aero_table_csv"] = table
    if args.ball == "custom":
        check_number("diameter-m", args.diameter_m, "m", low=0.01, high=0.4)
        check_number("mass-kg", args.mass_kg, "kg", low=0.0005, high=2.0)
        values["custom_diameter_m"] = args.diameter_m
        values["custom_mass_kg"] = args.mass_kg
    if (args.cd is not None or args.cl is not None) and args.model != "constant":
        raise InputError("--cd", "--cd and --cl set the constant model: add --model constant "
                                 f"(got --model {args.model or 'the ball default'})")
    if args.cd is not None:
        values["constant_cd"] = check_number("cd", args.cd, "", low=0.0, high=3.0)
    if args.cl is not None:
        values["constant_cl"] = check_number("cl", args.cl, "", low=-1.0, high=3.0)
    return values


def _sweep_range(option: str, text: str) -> tuple:
    """``INPUT:FROM:TO`` -> (input key, from, to), checked against the sweep's fields."""
    parts = text.split(":")
    if len(parts) != 3:
        raise InputError(option, f"{option} expects INPUT:FROM:TO, e.g. elevation_deg:5:30 (got {text!r})")
    key = check_choice(option, parts[0], tuple(SWEEP_LABELS))
    ends = []
    for end, word in zip(parts[1:], ("from", "to")):
        f = INPUTS.field(f"sweep_{key}_{word}")
        try:
            x = float(end)
        except ValueError:
            raise InputError(option, f"{option}: the {word} value of {key} must be a number (got {end!r})") from None
        ends.append(check_number(f"{option} {word}", x, "", low=f.low, high=f.high))
    return key, ends[0], ends[1]


def _sweep_values(args) -> dict:
    """The launch-sweep inputs of ``--sweep-across`` / ``--sweep-up`` (both or neither)."""
    if args.sweep_across is None and args.sweep_up is None:
        for o in SWEEP_OPTIONS:
            if getattr(args, o.dest, None) is not None:
                raise InputError(o.name, f"{o.name} needs --sweep-across and --sweep-up")
        return {}
    if args.sweep_across is None or args.sweep_up is None:
        raise InputError("--sweep-across", "a launch sweep needs both --sweep-across and --sweep-up")
    out = {"sweep_in_report": True, "sweep_goal": "min" if args.sweep_lowest else "max",
           "sweep_must_clear": not args.sweep_any, **option_values(args, SWEEP_OPTIONS)}
    for axis, option, text in (("sweep_x", "--sweep-across", args.sweep_across),
                               ("sweep_y", "--sweep-up", args.sweep_up)):
        key, lo, hi = _sweep_range(option, text)
        out.update({axis: key, f"sweep_{key}_from": lo, f"sweep_{key}_to": hi})
    return out


def execute(args, progress):
    values = values_from_args(args)
    slow = args.dispersion > 0 or values.get("sweep_in_report", False)
    result = run_study("flight", values, progress=progress if slow else None)
    js = result.json
    data = {k: js[k] for k in ("carry_m", "peak_height_m", "flight_time_s", "lateral_m",
                               "descent_angle_deg", "landing_speed_m_s", "warnings")}
    data.update({k: js[k] for k in ("ball", "coefficient_model", "air_density_kg_m3", "landing_spin_rpm",
                                    "at_check", "ground", "total_m", "roll_m", "bounce", "obstacles")})
    rows = [("Ball", f"{result.detail.setup.ball.name} ({result.detail.setup.model.label()})"),
            ("Air density", f"{js['air_density_kg_m3']:.4f} kg/m3"),
            ("Carry", f"{js['carry_m']:.2f} m"), ("Peak height", f"{js['peak_height_m']:.2f} m"),
            ("Time aloft", f"{js['flight_time_s']:.2f} s"),
            ("Drift (right +)", f"{js['lateral_m']:.2f} m"),
            ("Descent angle", f"{js['descent_angle_deg']:.1f} deg"),
            ("Speed at landing", f"{js['landing_speed_m_s']:.2f} m/s")]
    if "dispersion" in js:
        d = js["dispersion"]
        data["dispersion"] = d
        rows += [("Flights drawn", f"{d['n']}"),
                 ("Carry P05 / P50 / P95", f"{d['carry_m_p05']:.2f} / {d['carry_m_p50']:.2f} / {d['carry_m_p95']:.2f} m"),
                 ("Drift sd", f"{d['lateral_m_sd']:.2f} m")]
    if js["bounce"] is not None:
        b = js["bounce"]
        rows.append(("First bounce", f"{b['speed_after_m_s']:.2f} m/s at {b['angle_after_deg']:.1f} deg up, spin "
                                     f"{b['spin_after_rpm']:+.0f} rpm (+ backspin) on {js['ground']}"))
        if js["total_m"] is not None:
            rows.append(("Total to rest / roll", f"{js['total_m']:.2f} m / {js['roll_m']:.2f} m"))
    for c in js["obstacles"]:
        where = "" if c["height_m"] is None or c["kind"] == "land" else f" (height {c['height_m']:.2f} m there)"
        rows.append((c["name"].capitalize(), f"{'clears' if c['clears'] else 'misses'} by {abs(c['margin_m']):.3f} m"
                                             f"{where}; {c['rule']}"))
    if args.check_distance_m is not None:
        c = js["at_check"]
        rows.append((f"At {args.check_distance_m:g} m downrange",
                     "the ball lands before it gets there" if c is None else
                     f"height {c['height_m']:.2f} m, drift {c['lateral_m']:+.2f} m, after {c['time_s']:.2f} s "
                     f"at {c['speed_m_s']:.2f} m/s"))
    if "sweep" in js:
        sw = js["sweep"]
        data["sweep"] = sw
        label = lambda k: SWEEP_LABELS[k][0].lower()  # noqa: E731
        rows.append((f"Sweep: best {sw['output']}", f"{sw['best_value']:.3f} at {label(sw['x'])} {sw['best_x']:g}, "
                                                   f"{label(sw['y'])} {sw['best_y']:g}"))
        counts = sw["points_clearing"]
        if counts:
            rows.append(("Sweep: launches clearing", f"{counts['all']} of {counts['points']} clear every obstacle; "
                         + ", ".join(f"{k} {v}" for k, v in counts.items() if k not in ("all", "points"))))
    rows += [("Warning", w["message"]) for w in js["warnings"]]
    rows += [("Caution", "results are for analysis, not for safety distances")]
    return data, text_table(rows)
