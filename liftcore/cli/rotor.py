"""``liftcore rotor``: rotor sails on a ship in one wind condition.

Without ``--spin-ratio`` or ``--rpm`` the best spin within the limits is used. Speeds are given in
knots, the wind angle off the bow (0 head wind, +90 from starboard, -90 from port).
"""

from __future__ import annotations

import math
from pathlib import Path

from liftcore import coefficients as coef
from liftcore.cli import add_json_flag
from liftcore.cli.common import add_air_options, density_from_args, text_table, validate_inputs
from liftcore.constants import KNOT_M_S
from liftcore.errors import InputError
from liftcore.files import read_text
from liftcore.studies import rotor as study

#: Largest coefficient CSV file read from the command line. [bytes]
MAX_CSV_BYTES = 1_000_000

#: option dest -> (study input key, factor from the option's unit to the core unit)
_OPTIONS = {
    "diameter_m": ("diameter_m", 1.0),
    "height_m": ("height_m", 1.0),
    "base_height_m": ("base_height_m", 1.0),
    "end_plate_ratio": ("end_plate_ratio", 1.0),
    "rotors": ("rotor_count", None),
    "rotor_spacing_m": ("rotor_spacing_m", 1.0),
    "first_rotor_x_m": ("first_rotor_x_m", 1.0),
    "interaction_factor": ("interaction_factor", 1.0),
    "heel_reference_depth_m": ("heel_reference_depth_m", 1.0),
    "ship_speed_kn": ("ship_speed_m_s", KNOT_M_S),
    "true_wind_speed_kn": ("true_wind_speed_m_s", KNOT_M_S),
    "true_wind_angle_deg": ("true_wind_angle_deg", 1.0),
    "spin_ratio": ("spin_ratio", 1.0),
    "rpm": ("spin_rpm", 1.0),
    "wind_profile": ("wind_profile", None),
    "reference_height_m": ("reference_height_m", 1.0),
    "power_law_exponent": ("power_law_exponent", 1.0),
    "charnock_constant": ("charnock_constant", 1.0),
    "strips": ("strips", None),
    "max_rpm": ("max_rpm", 1.0),
    "max_motor_power_kw": ("max_motor_power_w", 1000.0),
    "max_heeling_moment_knm": ("max_heeling_moment_nm", 1000.0),
    "max_spin_ratio": ("max_spin_ratio", 1.0),
    "propulsive_efficiency": ("propulsive_efficiency", 1.0),
    "electrical_efficiency": ("electrical_efficiency", 1.0),
    "set_aspect_ratio": ("user_aspect_ratio", 1.0),
    "set_end_plate_ratio": ("user_end_plate_ratio", 1.0),
}


def add_parser(sub):
    p = sub.add_parser(
        "rotor", help="rotor sails on a ship: forces, spin power, net gain, best spin",
        description="Rotor sails (Flettner rotors) on a ship in one wind condition. Without "
                    "--spin-ratio or --rpm the spin that gives the most net power gain within the "
                    "limits is used. Angles off the bow: 0 head wind, +90 from starboard, -90 from "
                    "port. Estimates for early design: rotor sails change stability, structure and "
                    "manoeuvring; defer to classification rules and a naval architect.")
    d = {f.key: f.default for f in study.INPUTS.fields}
    g = p.add_argument_group("rotor")
    g.add_argument("--diameter-m", type=float, required=True, help="rotor diameter [m]")
    g.add_argument("--height-m", type=float, required=True, help="rotor height [m]")
    g.add_argument("--base-height-m", type=float, help=f"rotor base above the waterline [m] (default {d['base_height_m']:g})")
    g.add_argument("--end-plate-ratio", type=float, help=f"end-plate diameter / rotor diameter, 1 = none (default {d['end_plate_ratio']:g})")
    g.add_argument("--rotors", type=int, default=1, help="number of rotors (default 1)")
    g.add_argument("--rotor-spacing-m", type=float, help=f"fore-and-aft spacing between rotors [m] (default {d['rotor_spacing_m']:g})")
    g.add_argument("--first-rotor-x-m", type=float, help=f"foremost rotor ahead of midships [m] (default {d['first_rotor_x_m']:g})")
    g.add_argument("--interaction-factor", type=float, help="multiplier on the forces of several rotors, assumed (default 1)")
    g.add_argument("--heel-reference-depth-m", type=float, help="heeling moment about a point this far below the waterline [m] (default 0)")
    g = p.add_argument_group("ship and wind")
    g.add_argument("--ship-speed-kn", type=float, required=True, help="ship speed through the water [kn]")
    g.add_argument("--true-wind-speed-kn", type=float, required=True, help="true wind speed at the reference height [kn]")
    g.add_argument("--true-wind-angle-deg", type=float, required=True, help="true wind angle off the bow [deg], + from starboard")
    spin = g.add_mutually_exclusive_group()
    spin.add_argument("--spin-ratio", type=float, help="fixed spin ratio at mid-height (default: best spin)")
    spin.add_argument("--rpm", type=float, help="fixed rotor speed [rpm] (default: best spin)")
    g = p.add_argument_group("wind profile")
    g.add_argument("--wind-profile", choices=("uniform", "power", "log"), default="log", help="wind profile over the sea (default log)")
    g.add_argument("--reference-height-m", type=float, help=f"height of the given true wind [m] (default {d['reference_height_m']:g})")
    g.add_argument("--power-law-exponent", type=float, help=f"power-law exponent (default {d['power_law_exponent']:g})")
    g.add_argument("--charnock-constant", type=float, help=f"Charnock constant (default {d['charnock_constant']:g})")
    g.add_argument("--strips", type=int, help=f"strips along the rotor height (default {d['strips']})")
    g = p.add_argument_group("coefficients")
    g.add_argument("--coefficients", default=coef.DEFAULT_SET, metavar="NAME|FILE.csv",
                   help=f"coefficient set: one of {', '.join(coef.builtin_names())}, or a CSV file "
                        f"with columns SR, CL, CD[, CP] (default {coef.DEFAULT_SET})")
    g.add_argument("--set-aspect-ratio", type=float, help="aspect ratio of the rotor a CSV set was measured on (0 = two-dimensional)")
    g.add_argument("--set-end-plate-ratio", type=float, help="end-plate ratio of the rotor a CSV set was measured on (default 1)")
    g.add_argument("--no-aspect-ratio-correction", action="store_true", help="use the set's drag as measured, without moving its induced drag to this rotor")
    g = p.add_argument_group("limits and efficiencies")
    g.add_argument("--max-rpm", type=float, help=f"maximum rotor speed [rpm] (default {d['max_rpm']:g})")
    g.add_argument("--max-motor-power-kw", type=float, help=f"maximum motor power per rotor [kW] (default {d['max_motor_power_w'] / 1000:g})")
    g.add_argument("--max-heeling-moment-knm", type=float, help=f"maximum heeling moment of all rotors [kN m] (default {d['max_heeling_moment_nm'] / 1000:g})")
    g.add_argument("--max-spin-ratio", type=float, help=f"highest spin ratio the best spin may use (default {d['max_spin_ratio']:g})")
    g.add_argument("--propulsive-efficiency", type=float, help=f"thrust power / engine power (default {d['propulsive_efficiency']:g})")
    g.add_argument("--electrical-efficiency", type=float, help=f"rotor shaft power / electric power drawn (default {d['electrical_efficiency']:g})")
    add_air_options(p)
    add_json_flag(p)
    return p


def values_from_args(args) -> tuple[dict, object]:
    """Validated study input values (core units) and a user table (or None) from the options."""
    raw = {"spin_mode": "best", "wind_angle_reference": "relative"}
    for dest, (key, factor) in _OPTIONS.items():
        v = getattr(args, dest, None)
        if v is None:
            continue
        raw[key] = v if factor is None else v * factor
    if args.spin_ratio is not None:
        raw["spin_mode"] = "spin_ratio"
    elif args.rpm is not None:
        raw["spin_mode"] = "rpm"
    if args.no_aspect_ratio_correction:
        raw["correct_aspect_ratio"] = False
    option_of = {key: "--" + dest.replace("_", "-") for dest, (key, _) in _OPTIONS.items()}
    values = validate_inputs(study.INPUTS, raw, option_of)
    table = None
    name = args.coefficients
    if name in coef.builtin_names():
        values["coefficient_set"] = name
    else:
        path = Path(name)
        if path.suffix.lower() != ".csv" and not path.exists():
            raise InputError("--coefficients", f"--coefficients must be one of "
                                               f"{', '.join(coef.builtin_names())} or a .csv file (got {name!r})")
        values["coefficient_set"] = "user"
        table = read_text(path, "--coefficients", MAX_CSV_BYTES)
        coef.user_coefficient_set(table, source=f"--coefficients file {path.name}")  # check, naming the file
    return values, table


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
    ] + [("Warning", w.message) for w in warnings]
    rows.append(("Caution", "estimates for early design; rotor sails change stability, structure and "
                            "manoeuvring: defer to classification rules and a naval architect"))
    return data, text_table(rows)


def _spin_ratio_text(sr) -> str:
    """The spin ratio to three decimals; none in still air (omega R / 0)."""
    return "none (still air)" if sr is None or not math.isfinite(sr) else f"{sr:.3f}"
