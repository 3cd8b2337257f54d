"""``liftcore rotor``: rotor sails on a ship in one wind condition.

Without ``--spin-ratio`` or ``--rpm`` the best spin within the limits is used. Speeds are given in
knots, the wind angle off the bow (0 head wind, +90 from starboard, -90 from port).
"""

from __future__ import annotations

import math
from pathlib import Path

from liftcore import coefficients as coef
from liftcore.cli import add_json_flag
from liftcore.cli.common import (Option, add_air_options, add_options, density_from_args, option_names,
                                 option_values, text_table, validate_inputs)
from liftcore.constants import KNOT_M_S
from liftcore.errors import InputError
from liftcore.files import read_text
from liftcore.studies import rotor as study

#: Largest coefficient CSV file read from the command line. [bytes]
MAX_CSV_BYTES = 1_000_000

KN = ("kn", KNOT_M_S)
# Options of the rotor, its wind profile, the coefficient set's own geometry, the limits and the
# efficiencies: the same names and units in ``liftcore rotor`` and ``liftcore voyage``.
GEOMETRY_OPTIONS = (
    Option("base_height_m", "--base-height-m", "m"),
    Option("end_plate_ratio", "--end-plate-ratio", text="end-plate diameter / rotor diameter, 1 = none"),
    Option("rotor_spacing_m", "--rotor-spacing-m", "m", text="fore-and-aft spacing between rotors"),
    Option("first_rotor_x_m", "--first-rotor-x-m", "m", text="foremost rotor ahead of midships"),
    Option("interaction_factor", "--interaction-factor",
           text="multiplier on the forces of several rotors, assumed"),
    Option("heel_reference_depth_m", "--heel-reference-depth-m", "m",
           text="heeling moment about a point this far below the waterline"),
)
PROFILE_OPTIONS = (
    Option("wind_profile", "--wind-profile"),
    Option("reference_height_m", "--reference-height-m", "m", text="height of the given true wind"),
    Option("power_law_exponent", "--power-law-exponent"),
    Option("charnock_constant", "--charnock-constant", text="Charnock constant"),
    Option("strips", "--strips"),
)
SET_OPTIONS = (
    Option("user_aspect_ratio", "--set-aspect-ratio",
           text="aspect ratio of the rotor a CSV set was measured on (0 = two-dimensional)"),
    Option("user_end_plate_ratio", "--set-end-plate-ratio",
           text="end-plate ratio of the rotor a CSV set was measured on"),
)
LIMIT_OPTIONS = (
    Option("max_rpm", "--max-rpm", "rpm"),
    Option("max_motor_power_w", "--max-motor-power-kw", "kW", 1000.0),
    Option("max_heeling_moment_nm", "--max-heeling-moment-knm", "kN m", 1000.0),
    Option("max_spin_ratio", "--max-spin-ratio", text="highest spin ratio the best spin may use"),
    Option("propulsive_efficiency", "--propulsive-efficiency", text="thrust power / engine power"),
    Option("electrical_efficiency", "--electrical-efficiency",
           text="rotor shaft power / electric power drawn"),
)
HULL_OPTIONS = (
    Option("hull_length_m", "--hull-length-m", "m", text="length between perpendiculars", without="no hull balance"),
    Option("hull_beam_m", "--hull-beam-m", "m", text="beam", without="no hull balance"),
    Option("hull_draught_m", "--hull-draught-m", "m", text="mean draught", without="no hull balance"),
    Option("block_coefficient", "--block-coefficient", text="block coefficient", without="no hull balance"),
    Option("rudder_area_m2", "--rudder-area-m2", "m2", text="rudder area", without="no hull balance"),
    Option("rudder_x_m", "--rudder-x-m", "m", text="rudder position forward of midships (negative: aft)",
           without="-L/2"),
    Option("rudder_aspect_ratio", "--rudder-aspect-ratio"),
    Option("displacement_kg", "--displacement-t", "t", 1000.0, text="displacement for the heel angle",
           without="C_b L B T x 1025 kg/m3"),
    Option("metacentric_height_m", "--metacentric-height-m", "m", text="fluid GM for the heel angle",
           without="no heel angle"),
)
#: The hull options that together switch the balance on.
HULL_REQUIRED = HULL_OPTIONS[:5]
SHARED_OPTIONS = GEOMETRY_OPTIONS + PROFILE_OPTIONS + SET_OPTIONS + LIMIT_OPTIONS + HULL_OPTIONS


def add_hull_options(p, spec) -> None:
    """The hull group: main dimensions, rudder, displacement, GM and ``--no-hull-balance``."""
    g = p.add_argument_group("hull (leeway and rudder balance; give the first five together)")
    add_options(g, spec, HULL_OPTIONS)
    g.add_argument("--no-hull-balance", action="store_true",
                   help="leave out the resistance leeway and rudder add (as without hull options)")


def hull_values(args) -> dict:
    """The study's hull inputs: the balance on when the main dimensions and rudder area are all
    given (and not --no-hull-balance), off otherwise; no heel angle without --metacentric-height-m."""
    given = [o for o in HULL_REQUIRED if getattr(args, o.dest) is not None]
    if args.no_hull_balance or not given:
        return {"hull_balance": False}
    missing = [o.name for o in HULL_REQUIRED if getattr(args, o.dest) is None]
    if missing:
        raise InputError(missing[0], f"the hull balance needs {', '.join(o.name for o in HULL_REQUIRED)} "
                                     f"together (missing {', '.join(missing)})")
    out = {"hull_balance": True}
    if args.rudder_x_m is None:
        out["rudder_x_m"] = -0.5 * args.hull_length_m
    if args.metacentric_height_m is None:
        out["metacentric_height_m"] = 0.0
    return out


HULL_NOTE = ("no hull balance: the resistance leeway and rudder add to hold the side force is left out "
             "(give --hull-length-m, --hull-beam-m, --hull-draught-m, --block-coefficient and "
             "--rudder-area-m2 to count it)")
ROTOR_OPTIONS = (
    Option("diameter_m", "--diameter-m", "m", required=True),
    Option("height_m", "--height-m", "m", required=True),
    Option("rotor_count", "--rotors"),
)
CONDITION_OPTIONS = (
    Option("ship_speed_m_s", "--ship-speed-kn", *KN, text="ship speed through the water", required=True),
    Option("true_wind_speed_m_s", "--true-wind-speed-kn", *KN,
           text="true wind speed at the reference height", required=True),
    Option("true_wind_angle_deg", "--true-wind-angle-deg", "deg",
           text="true wind angle off the bow, + from starboard", required=True),
)
SPIN_OPTIONS = (
    Option("spin_ratio", "--spin-ratio", text="fixed spin ratio at mid-height", without="the best spin"),
    Option("spin_rpm", "--rpm", "rpm", text="fixed rotor speed", without="the best spin"),
)
OPTIONS = ROTOR_OPTIONS + CONDITION_OPTIONS + SPIN_OPTIONS + SHARED_OPTIONS


def add_coefficient_options(g) -> None:
    """``--coefficients`` (a published set or a CSV file) and ``--no-aspect-ratio-correction``."""
    g.add_argument("--coefficients", metavar="NAME|FILE.csv",
                   help=f"coefficient set: one of {', '.join(coef.builtin_names())}, or a CSV file "
                        f"with columns SR, CL, CD[, CP] (default {coef.DEFAULT_SET})")
    g.add_argument("--no-aspect-ratio-correction", action="store_true",
                   help="use the set's drag as measured, without moving its induced drag to this rotor")


def coefficient_values(name: str | None) -> dict:
    """The study inputs ``--coefficients`` stands for (a published set, or a CSV file read and
    checked, naming the file)."""
    if name is None or name in coef.builtin_names():
        return {"coefficient_set": name or coef.DEFAULT_SET}
    path = Path(name)
    if path.suffix.lower() != ".csv" and not path.exists():
        raise InputError("--coefficients", f"--coefficients must be one of "
                                           f"{', '.join(coef.builtin_names())} or a .csv file (got {name!r})")
    table = read_text(path, "--coefficients", MAX_CSV_BYTES)
    coef.user_coefficient_set(table, source=f"--coefficients file {path.name}")  # check, naming the file
    return {"coefficient_set": "user", "user_coefficients_csv": table}


def add_parser(sub):
    p = sub.add_parser(
        "rotor", help="rotor sails on a ship: forces, spin power, net gain, best spin",
        description="Rotor sails (Flettner rotors) on a ship in one wind condition. Without "
                    "--spin-ratio or --rpm the spin that gives the most net power gain within the "
                    "limits is used. Angles off the bow: 0 head wind, +90 from starboard, -90 from "
                    "port. Estimates for early design: rotor sails change stability, structure and "
                    "manoeuvring; defer to classification rules and a naval architect.")
    spec = study.INPUTS
    add_options(p.add_argument_group("rotor"), spec, ROTOR_OPTIONS + GEOMETRY_OPTIONS)
    g = p.add_argument_group("ship and wind")
    add_options(g, spec, CONDITION_OPTIONS)
    add_options(g.add_mutually_exclusive_group(), spec, SPIN_OPTIONS)
    add_options(p.add_argument_group("wind profile"), spec, PROFILE_OPTIONS)
    g = p.add_argument_group("coefficients")
    add_coefficient_options(g)
    add_options(g, spec, SET_OPTIONS)
    add_options(p.add_argument_group("limits and efficiencies"), spec, LIMIT_OPTIONS)
    add_hull_options(p, spec)
    add_air_options(p)
    add_json_flag(p)
    return p


def values_from_args(args) -> tuple[dict, object]:
    """Validated study input values (core units) and a user table (or None) from the options."""
    raw = {"spin_mode": "best", "wind_angle_reference": "relative", **option_values(args, OPTIONS),
           **hull_values(args)}
    if args.spin_ratio is not None:
        raw["spin_mode"] = "spin_ratio"
    elif args.rpm is not None:
        raw["spin_mode"] = "rpm"
    if args.no_aspect_ratio_correction:
        raw["correct_aspect_ratio"] = False
    values = validate_inputs(study.INPUTS, raw, option_names(OPTIONS))
    chosen = coefficient_values(args.coefficients)
    values["coefficient_set"] = chosen["coefficient_set"]
    return values, chosen.get("user_coefficients_csv")


def execute(args, progress):
    values, table = values_from_args(args)
    rho, air = density_from_args(args)
    if table is not None:
        values["user_coefficients_csv"] = table
    setup, op = study.operating_point(values)
    if args.density_kg_m3 is not None:
        from dataclasses import replace

        setup = replace(setup, air_density_kg_m3=rho,
                        kinematic_viscosity_m2_s=air.dynamic_viscosity_pa_s / rho)
        twa = math.radians(study.relative_wind_angle_deg(values))
        op = study.operate(setup, values, values["ship_speed_m_s"], values["true_wind_speed_m_s"], twa)
    elif args.altitude_m is not None or args.temperature_c is not None or args.pressure_pa is not None \
            or args.humidity_pct:
        from dataclasses import replace

        setup = replace(setup, air_density_kg_m3=air.density_kg_m3,
                        kinematic_viscosity_m2_s=air.kinematic_viscosity_m2_s)
        twa = math.radians(study.relative_wind_angle_deg(values))
        op = study.operate(setup, values, values["ship_speed_m_s"], values["true_wind_speed_m_s"], twa)
    from liftcore.validity import merge

    warnings = merge(op.warnings, air.warnings)
    data = study.json_result(op, warnings, setup)
    one = op.at(())
    state = {0: "stopped", 1: "running", 2: "running at a limit"}[int(one["state"])]
    n = setup.rotor_count
    total = f" ({n} rotors)" if n > 1 else ""
    rows = [
        ("Coefficient set", setup.coefficients.label),
        ("Air density", f"{setup.air_density_kg_m3:.4f} kg/m3"),
        ("Apparent wind at mid-height", f"{one['apparent_wind_speed_m_s'] / KNOT_M_S:.2f} kn "
                                        f"({one['apparent_wind_speed_m_s']:.2f} m/s), "
                                        f"{one['apparent_wind_angle_deg']:+.1f} deg off the bow"),
        ("Rotor", f"{state}, spin ratio {_spin_ratio_text(one['spin_ratio'])}, {one['rpm']:.1f} rpm"),
        ("Lift / drag coefficient", f"{one['lift_coefficient']:.3f} / {one['drag_coefficient']:.3f}"),
        ("Lift" + total, f"{one['lift_n'] / 1000:.2f} kN"),
        ("Drag" + total, f"{one['drag_n'] / 1000:.2f} kN"),
        ("Thrust along the heading" + total, f"{one['thrust_n'] / 1000:.2f} kN"),
        ("Side force (+ to starboard)" + total, f"{one['side_force_n'] / 1000:.2f} kN"),
        ("Heeling moment (+ to starboard)" + total, f"{one['heeling_moment_nm'] / 1000:.1f} kN m"),
        ("Spin power, shaft" + total, f"{one['spin_power_w'] / 1000:.2f} kW "
                                      f"(electric {one['electrical_power_w'] / 1000:.2f} kW)"),
        ("Net power gain" + total, f"{one['net_power_w'] / 1000:.2f} kW"),
    ]
    if "balance_power_kw" in data:
        rows += [("Lost to leeway and rudder", f"{data['balance_power_kw']:.2f} kW (in the net gain)"),
                 ("Leeway / rudder angle", f"{data['leeway_deg']:+.2f} / {data['rudder_angle_deg']:+.2f} deg "
                                           "(+ to starboard)")]
        if "heel_angle_deg" in data:
            rows.append(("Heel angle (steady)", f"{data['heel_angle_deg']:+.2f} deg (+ to starboard)"))
    else:
        rows.append(("Note", HULL_NOTE))
    rows += [("Warning", w.message) for w in warnings]
    rows.append(("Caution", "estimates for early design; rotor sails change stability, structure and "
                            "manoeuvring: defer to classification rules and a naval architect"))
    return data, text_table(rows)


def _spin_ratio_text(sr) -> str:
    """The spin ratio to three decimals; none in still air (omega R / 0)."""
    return "none (still air)" if sr is None or not math.isfinite(sr) else f"{sr:.3f}"
