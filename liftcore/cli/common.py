"""Options shared by several commands (air state), options declared from a study's inputs, and
text formatting helpers."""

from __future__ import annotations

from dataclasses import dataclass

from liftcore.air import AirState, air_inputs, air_state
from liftcore.errors import InputError, check_number


# ----------------------------------------------------------------------------- options from the InputSpec
@dataclass(frozen=True)
class Option:
    """A command-line option that sets one study input.

    Type, choices, range and default come from the study's :class:`~liftcore.inputs.Field`, so
    the command line, the page, scenario files and share links accept the same values; only the
    option's name, its unit and the factor to the core unit are declared here.

    ``scale``: core value = option value x scale (1852/3600 for knots, 1000 for kW).
    ``unit``: the option's unit, shown in the help. ``text``: help text when the field's label
    says too little on a command line. ``required``: the command needs it (no default).
    """

    key: str
    name: str
    unit: str = ""
    scale: float = 1.0
    text: str = ""
    required: bool = False
    #: What happens without the option, when that is not the field's default ("best spin").
    without: str = ""

    @property
    def dest(self) -> str:
        return self.name.lstrip("-").replace("-", "_")


def _shown(x) -> str:
    if isinstance(x, float) and x.is_integer() and abs(x) < 1e12:
        return str(int(x))  # 2500000, not 2.5e+06
    return f"{x:.6g}" if isinstance(x, float) else str(x)


def option_help(option: Option, field) -> str:
    """Help of ``option``: what it sets, its unit, the accepted range and the default, all from
    the study's field (in the option's unit)."""
    text = option.text or field.label[:1].lower() + field.label[1:]
    unit = f" [{option.unit}]" if option.unit else ""
    notes = []
    if field.kind in ("number", "int") and field.low is not None and field.high is not None:
        notes.append(f"{_shown(field.low / option.scale)} to {_shown(field.high / option.scale)}")
    if option.required:
        notes.append("required")
    elif option.without:
        notes.append(f"without it: {option.without}")
    elif field.kind in ("number", "int"):
        default = field.default / option.scale
        notes.append(f"default {_shown(int(default) if field.kind == 'int' else default)}")
    else:
        notes.append(f"default {field.default}")
    return f"{text}{unit} ({', '.join(notes)})".replace("%", "%%")


def add_options(group, spec, options) -> None:
    """Add ``options`` (:class:`Option`) to an argparse group, typed and explained by ``spec``."""
    for o in options:
        f = spec.field(o.key)
        kw = {}
        if f.kind == "int":
            kw["type"] = int
        elif f.kind == "number":
            kw["type"] = float
        elif f.kind == "choice":
            kw["choices"] = f.choices
        group.add_argument(o.name, dest=o.dest, required=o.required, help=option_help(o, f), **kw)


def option_values(args, options) -> dict:
    """The study inputs (core units) of the ``options`` given on the command line."""
    out = {}
    for o in options:
        x = getattr(args, o.dest, None)
        if x is not None:
            out[o.key] = x * o.scale if isinstance(x, (int, float)) and o.scale != 1.0 else x
    return out


def option_names(options) -> dict:
    """Study input key -> option name, for messages."""
    return {o.key: o.name for o in options}


def add_air_options(p, density: bool = True) -> None:
    """``--altitude-m`` or ``--temperature-c --pressure-pa --humidity-pct`` [or ``--density-kg-m3``]."""
    g = p.add_argument_group("air state (ISA at an altitude, or measured)")

    def span(key):  # the shared air field's range, in the option's unit
        f, (_, offset) = AIR_FIELDS[key], _AIR_OPTION_UNITS[key]
        return f"{_shown(f.low + offset)} to {_shown(f.high + offset)}"

    g.add_argument("--altitude-m", type=float, help=f"ISA altitude above sea level [m] ({span('altitude_m')}, default 0)")
    g.add_argument("--temperature-c", type=float, help=f"measured air temperature [degC] ({span('temperature_k')})")
    g.add_argument("--pressure-pa", type=float, help=f"measured barometric pressure [Pa] ({span('pressure_pa')})")
    g.add_argument("--humidity-pct", type=float, default=0.0,
                   help=f"relative humidity [%%] ({span('relative_humidity_pct')}, default 0)")
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
