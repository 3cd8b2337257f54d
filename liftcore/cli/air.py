"""``liftcore air``: air state from an ISA altitude or measured conditions."""

from liftcore.cli import add_json_flag
from liftcore.cli.common import add_air_options, air_from_args, text_table


def add_parser(sub):
    p = sub.add_parser("air", help="air density, viscosity and speed of sound",
                       description="Air state: ISA (ISO 2533) at an altitude, or measured "
                                   "temperature, pressure and humidity.")
    add_air_options(p, density=False)
    add_json_flag(p)
    return p


def execute(args, progress):
    air = air_from_args(args)
    data = {k: v for k, v in air.as_dict().items() if k != "relative_humidity_pct"}
    data["warnings"] = [w.as_dict() for w in air.warnings]
    text = text_table([
        ("Density", f"{air.density_kg_m3:.4f} kg/m3"),
        ("Dynamic viscosity", f"{air.dynamic_viscosity_pa_s:.4e} Pa s"),
        ("Kinematic viscosity", f"{air.kinematic_viscosity_m2_s:.4e} m2/s"),
        ("Speed of sound", f"{air.speed_of_sound_m_s:.2f} m/s"),
        ("Temperature", f"{air.temperature_k:.2f} K ({air.temperature_k - 273.15:.2f} degC)"),
        ("Pressure", f"{air.pressure_pa:.0f} Pa"),
    ] + [("Warning", w.message) for w in air.warnings])
    return data, text
