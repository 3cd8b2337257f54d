"""``liftcore flow``: ideal flow round a spinning cylinder (circulation, Kutta-Joukowski lift,
the surface-pressure check and the stagnation points)."""

from liftcore import potential as pot
from liftcore.cli import add_json_flag
from liftcore.cli.common import add_air_options, density_from_args, require_one, text_table
from liftcore.errors import InputError, check_number
from liftcore.studies.flow import INPUTS, SIGN_CONVENTION, stagnation_text


def add_parser(sub):
    p = sub.add_parser(
        "flow", help="ideal flow round a spinning cylinder: circulation and Kutta-Joukowski lift",
        description="Ideal (potential) flow round a spinning cylinder: spin ratio, circulation "
                    "(no-slip idealisation), Kutta-Joukowski lift per metre of span, the same lift "
                    "and zero drag from integrating the surface pressure, and the stagnation "
                    "points. Positive spin is clockwise with the stream flowing along +x, giving "
                    "lift toward +y. Ideal-flow results are not real forces.")
    p.add_argument("--radius-m", type=float, required=True, help="cylinder radius [m]")
    p.add_argument("--speed-m-s", type=float, required=True, help="free-stream speed [m/s]")
    p.add_argument("--spin-rpm", type=float, help="rotation rate [rpm] (give this or --spin-ratio)")
    p.add_argument("--spin-ratio", type=float, help="spin ratio omega R / V [-] (or --spin-rpm)")
    add_air_options(p, density=True)
    add_json_flag(p)
    return p


def _check(option: str, key: str, value, unit: str) -> float:
    f = INPUTS.field(key)
    return check_number(option, value, unit, low=f.low, high=f.high)


def execute(args, progress):
    r = _check("--radius-m", "radius_m", args.radius_m, "m")
    v = _check("--speed-m-s", "speed_m_s", args.speed_m_s, "m/s")
    require_one("--spin-rpm or --spin-ratio", args.spin_rpm, args.spin_ratio)
    if args.spin_rpm is not None:
        omega = _check("--spin-rpm", "spin_rpm", args.spin_rpm, "rpm") * pot.RAD_S_PER_RPM
    else:
        omega = float(pot.spin_rate_from_ratio(_check("--spin-ratio", "spin_ratio", args.spin_ratio, ""), r, v))
    air_given = (args.altitude_m is not None or args.temperature_c is not None
                 or args.pressure_pa is not None or args.humidity_pct not in (None, 0.0))
    if args.density_kg_m3 is not None and air_given:
        raise InputError("--density-kg-m3", "give either --density-kg-m3 or the air-state options "
                                            "(--altitude-m, --temperature-c, --pressure-pa, "
                                            "--humidity-pct), not both")
    rho, air = density_from_args(args)
    res = pot.ideal_spinning_cylinder(r, v, omega, rho, air.speed_of_sound_m_s)
    data = res.as_json()
    rows = [
        ("Spin ratio", f"{res.spin_ratio:.4g}"),
        ("Rotation rate", f"{res.spin_rpm:.5g} rpm"),
        ("Circulation", f"{res.circulation_m2_s:.5g} m2/s"),
        ("Lift per span (ideal)", f"{res.lift_per_span_n_m:.5g} N/m"),
        ("Lift coefficient 2 pi SR", f"{res.lift_coefficient:.6g}"),
        ("CL from surface pressure", f"{res.lift_coefficient_from_pressure:.6g}"),
        ("CD from surface pressure", f"{res.drag_coefficient_from_pressure:.2g}"),
        ("Stagnation angles", ", ".join(f"{a:.2f} deg" for a in res.stagnation_angles_deg)),
        ("Density", f"{rho:.4f} kg/m3"),
    ]
    text = text_table(rows) + "\n" + stagnation_text(res) + "\n" + SIGN_CONVENTION
    if res.warnings:
        text += "\n" + "\n".join(f"Warning: {w.message}" for w in res.warnings)
    return data, text
