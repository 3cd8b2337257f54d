"""Options shared by several commands (air state), and text formatting helpers."""

from __future__ import annotations

from liftcore.air import AirState, air_inputs, air_state
from liftcore.errors import InputError, check_number


def add_air_options(p, density: bool = True) -> None:
    """``--altitude-m`` or ``--temperature-c --pressure-pa --humidity-pct`` [or ``--density-kg-m3``]."""
    g = p.add_argument_group("air state (ISA at an altitude, or measured)")
    g.add_argument("--altitude-m", type=float, help="ISA altitude above sea level [m] (default 0)")
    g.add_argument("--temperature-c", type=float, help="measured air temperature [degC]")
    g.add_argument("--pressure-pa", type=float, help="measured barometric pressure [Pa]")
    g.add_argument("--humidity-pct", type=float, default=0.0, help="relative humidity [%%] (0-100)")
    if density:
        g.add_argument("--density-kg-m3", type=float,
                       help="air density [kg/m3], overriding the air state (0 means vacuum where allowed)")


#: The air fields every study shares: one range for the page, the files and every command.
AIR_FIELDS = {f.key: f for f in air_inputs("Air")}


#: Option name, option unit and the offset from the option's unit to the core unit.
_AIR_OPTION_UNITS = {"relative_humidity_pct": ("%", 0.0), "temperature_k": ("degC", -273.15),
                     "pressure_pa": ("Pa", 0.0), "altitude_m": ("m", 0.0)}


def _air_field(key: str, option: str, value):
    """``value`` (in the option's unit) checked against the shared air field's range, compared
    in the option's unit; returned in the core unit."""
    f = AIR_FIELDS[key]
    unit, offset = _AIR_OPTION_UNITS[key]
    x = check_number(option, value, unit, low=f.low + offset, high=f.high + offset)
    return x - offset


def air_values(args) -> dict:
    """The study's air inputs from the shared air options: ISA at the altitude, or measured when
    a temperature or pressure is given (checked as :func:`air_from_args` checks them)."""
    air = air_from_args(args)
    out = {"relative_humidity_pct": 100.0 * air.relative_humidity}
    if args.altitude_m is not None:
        out["altitude_m"] = args.altitude_m
    if args.temperature_c is not None or args.pressure_pa is not None:
        out.update(air_mode="measured", temperature_k=air.temperature_k, pressure_pa=air.pressure_pa)
    else:
        out["air_mode"] = "isa"
    return out


def air_from_args(args) -> AirState:
    """The air state the options describe (ISA where something is not given), each option checked
    against the one air-state input spec (:func:`liftcore.air.air_inputs`)."""
    rh = _air_field("relative_humidity_pct", "humidity-pct", args.humidity_pct) / 100.0
    t = None
    if args.temperature_c is not None:
        t = _air_field("temperature_k", "temperature-c", args.temperature_c)
    if args.pressure_pa is not None:
        _air_field("pressure_pa", "pressure-pa", args.pressure_pa)
    if args.altitude_m is not None:
        _air_field("altitude_m", "altitude-m", args.altitude_m)
    return air_state(args.altitude_m, t, args.pressure_pa, rh)


#: Lowest density a command accepts (0 only where vacuum is allowed). [kg/m^3]
MIN_DENSITY_KG_M3 = 0.01


def density_from_args(args, allow_zero: bool = False) -> tuple[float, AirState]:
    """(density, air state): ``--density-kg-m3`` overrides the air state's density when given."""
    air = air_from_args(args)
    rho = getattr(args, "density_kg_m3", None)
    if rho is None:
        return air.density_kg_m3, air
    if (args.altitude_m is not None or args.temperature_c is not None or args.pressure_pa is not None
            or args.humidity_pct not in (None, 0.0)):
        raise InputError("--density-kg-m3", "give either --density-kg-m3 or the air-state options "
                                            "(--altitude-m, --temperature-c, --pressure-pa, "
                                            "--humidity-pct), not both")
    if allow_zero and rho == 0.0:  # vacuum, where the command allows it
        return 0.0, air
    # the lowest is the field page's given density (thinner than the ISA air at 30 km)
    return check_number("density-kg-m3", rho, "kg/m3", low=MIN_DENSITY_KG_M3, high=2.0), air


def require_one(field_names: str, *values) -> None:
    """Exactly one of several mutually exclusive options must be given."""
    given = sum(v is not None for v in values)
    if given != 1:
        raise InputError(field_names, f"give exactly one of {field_names} (got {given})")


def text_table(rows) -> str:
    """Two-column aligned text: [(label, value_text), ...]."""
    width = max((len(r[0]) for r in rows), default=0)
    return "\n".join(f"{label:<{width}}  {value}" for label, value in rows)


def validate_inputs(spec, raw: dict, option_of: dict, system: str = "marine") -> dict:
    """A study's inputs from command-line values, checked one by one (missing ones take their
    defaults); a bad one raises :class:`InputError` naming its option (``--ship-speed-kn: ...``),
    with ranges in ``system``'s units."""
    out = {}
    for f in spec.fields:
        if f.key not in raw:
            out[f.key] = f.default
            continue
        try:
            out[f.key] = f.validate(raw[f.key], system)
        except InputError as exc:
            opt = option_of.get(f.key)
            raise InputError(opt or f.key, f"{opt}: {exc}" if opt else str(exc)) from None
    return out
