"""Options shared by several commands (air state), and text formatting helpers."""

from __future__ import annotations

from liftcore.air import AirState, air_state
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


def air_from_args(args) -> AirState:
    """The air state the options describe (ISA where something is not given)."""
    rh = check_number("humidity-pct", args.humidity_pct, "%", low=0.0, high=100.0) / 100.0
    t = None
    if args.temperature_c is not None:
        t = check_number("temperature-c", args.temperature_c, "degC", low=-73.15, high=76.85) + 273.15
    if args.pressure_pa is not None:
        check_number("pressure-pa", args.pressure_pa, "Pa", low=20000.0, high=110000.0)
    if args.altitude_m is not None:
        check_number("altitude-m", args.altitude_m, "m", low=-500.0, high=11000.0)
    return air_state(args.altitude_m, t, args.pressure_pa, rh)


#: Lowest density a command accepts (0 only where vacuum is allowed). [kg/m^3]
MIN_DENSITY_KG_M3 = 0.01


def density_from_args(args, allow_zero: bool = False) -> tuple[float, AirState]:
    """(density, air state): ``--density-kg-m3`` overrides the air state's density when given."""
    air = air_from_args(args)
    rho = getattr(args, "density_kg_m3", None)
    if rho is None:
        return air.density_kg_m3, air
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
