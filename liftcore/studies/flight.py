"""Study: the flight of a spinning ball (carry, peak height, time aloft, drift, landing).

One launch, optionally a second flight for comparison (another altitude, ball, spin, speed, or no
air) and a landing spread from launch conditions drawn at random. The page's sweep and fit tools
call :mod:`liftcore.ballflight` directly with the same setup built here.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from liftcore import ballflight as bf
from liftcore import units
from liftcore.air import air_inputs, air_state, air_state_from_inputs
from liftcore.balls import BALL_KEYS, BALLS, MODEL_KEYS, MODELS
from liftcore import bounce
from liftcore.bounce import BALL_GROUND, GROUND_KEYS, GROUNDS
from liftcore.errors import InputError
from liftcore.inputs import InputSpec, choice, flag, integer, number, text
from liftcore.obstacles import PRESET_LABELS, PRESETS
from liftcore.studies import Charts, Headline, StudyResult, Tables, table_in_units
from liftcore.validity import ModelWarning, merge

KIND = "flight"
TITLE = "Spinning ball flight"

_BALL_LABELS = tuple(BALLS[k].name for k in BALL_KEYS[:-1]) + ("Custom ball (your size, mass, model)",)
_MODEL_CHOICES = ("ball_default",) + MODEL_KEYS + ("table",)
_MODEL_LABELS = (("The ball's own model",) + tuple(MODELS[k].label() for k in MODEL_KEYS)
                 + ("Your own table (CSV: S, CD, CL[, Re])",))
COMPARE_CHOICES = ("none", "altitude", "ball", "spin", "speed", "vacuum")
COMPARE_LABELS = ("No second flight", "Same launch at another altitude", "Same launch with another ball",
                  "Same launch with another spin rate", "Same launch at another speed",
                  "Same launch without air")

INPUTS = InputSpec(KIND, (
    choice("ball", "Ball", BALL_KEYS, default="baseball", labels=_BALL_LABELS, section="Ball",
           help="Size and mass from the governing body's rules; see Sources."),
    choice("coefficient_model", "Drag and lift model", _MODEL_CHOICES, default="ball_default",
           labels=_MODEL_LABELS, section="Ball",
           help="Published coefficient model; '(from memory)' marks formulas not checked against the paper."),
    number("custom_diameter_m", "Custom ball diameter", "small_length", 0.07, 0.01, 0.4, section="Custom ball and constants",
           help="Used only for a custom ball."),
    number("custom_mass_kg", "Custom ball mass", "small_mass", 0.15, 0.0005, 2.0, section="Custom ball and constants",
           help="Used only for a custom ball."),
    number("constant_cd", "Constant drag coefficient CD", "ratio", 0.35, 0.0, 3.0, section="Custom ball and constants", step=0.01,
           help="Used only with the constant-coefficient model."),
    number("constant_cl", "Constant lift coefficient CL", "ratio", 0.20, -1.0, 3.0, section="Custom ball and constants", step=0.01,
           help="Used only with the constant-coefficient model (lift acts only while the ball spins)."),
    text("aero_table_csv", "Your aerodynamic table (CSV text)", "S,CD,CL\n0,0.30,0\n0.1,0.28,0.12\n0.3,0.30,0.25\n",
         section="Custom ball and constants", lines=7,
         help="Columns S, CD, CL and optionally Re (then a full grid: every S at every Re); "
              "interpolated linearly and held at the edges (flights leaving it are warned about). "
              "The example rows are invented."),
    number("speed_m_s", "Launch speed", "ball_speed", 44.704, 0.0, 150.0, section="Launch", step=0.1,
           help="Ball speed just after launch."),
    number("elevation_deg", "Elevation", "angle", 28.0, -90.0, 90.0, section="Launch", step=0.5,
           help="Angle above the horizontal; negative launches downward."),
    number("azimuth_deg", "Azimuth (right +)", "angle", 0.0, -90.0, 90.0, section="Launch", step=0.5,
           help="Horizontal angle from the target line; positive aims to the right."),
    number("launch_height_m", "Launch height", "length", 1.0, 0.0, 100.0, section="Launch", step=0.1,
           help="Height of the ball above the landing ground at launch."),
    choice("ground", "After landing", ("ball_default", "none") + GROUND_KEYS, default="ball_default",
           labels=("The ball's usual ground", "Stop at the first landing")
           + tuple(GROUNDS[k].label for k in GROUND_KEYS), section="Launch",
           help="Bounces, slide and roll to rest: on turf off the pitch mark the ball digs (Penner "
                "2002), on a hard court a rigid-ground impact (Brody 1984; Cross 2002); golf on medium "
                "turf and court balls on a hard court by default. Firmness: soft, medium or firm turf. "
                "The values are from memory or assumed, except the tennis rebound rule (see Sources)."),
    choice("obstacle", "Does it clear?", PRESETS, default="none", labels=PRESET_LABELS, section="Obstacles",
           help="Obstacles and targets from the governing bodies' rules (cited on the page), drawn on the side "
                "and top views with the margin by which the ball clears or misses each."),
    number("goal_distance_m", "Distance to the goal line", "distance", 20.0, 10.15, 60.0, section="Obstacles",
           step=0.5, help="Free kick: from the ball to the goal line; the wall stands 9.15 m from the ball."),
    number("wall_distance_m", "Your wall: distance", "distance", 10.0, 0.1, 500.0, section="Obstacles", step=0.5),
    number("wall_height_m", "Your wall: height", "length", 2.0, 0.0, 100.0, section="Obstacles", step=0.1),
    number("wall_width_m", "Your wall: width (0 = endless)", "length", 0.0, 0.0, 100.0, section="Obstacles", step=0.5),
    number("check_distance_m", "Check the ball at a distance (0 = none)", "distance", 0.0, 0.0,
           bf.MAX_CHECK_DISTANCE_M, section="Launch", step=1.0,
           help="Downrange distance of a wall, net or goal line: where the ball is (height, drift, "
                "speed) when it first gets there."),
    number("spin_rpm", "Spin rate", "rotation", 2000.0, 0.0, 20000.0, section="Spin", step=100.0,
           help="Revolutions per minute at launch."),
    number("spin_axis_deg", "Spin-axis tilt (right +)", "angle", 0.0, -180.0, 180.0, section="Spin", step=5.0,
           help="0 backspin (lifts), 90 sidespin curving right, -90 curving left, 180 topspin (dips)."),
    number("rifle_deg", "Rifle-spin angle", "angle", 0.0, 0.0, 90.0, section="Spin", step=5.0,
           help="0: axis square to the flight (all spin bends the path); 90: axis along the flight (no bend)."),
    flag("spin_decay", "Spin slows down in flight", True, section="Spin",
         help="Spin decay model per ball (see Sources); off keeps the spin rate constant."),
    *air_inputs("Air"),
    flag("set_density", "Enter air density directly", False, section="Air", advanced=True,
         help="Overrides the air state's density (0 means vacuum)."),
    number("density_kg_m3", "Air density", "density", 1.225, 0.0, 2.0, section="Air", advanced=True, step=0.001,
           help="Used when 'Enter air density directly' is on; 0 means vacuum."),
    number("wind_speed_m_s", "Wind speed", "wind_speed", 3.0, 0.0, 40.0, section="Wind", step=0.5,
           help="At the reference height."),
    number("wind_from_deg", "Wind from", "angle", -90.0, -180.0, 180.0, section="Wind", step=5.0,
           help="Direction the wind comes from, clockwise from downrange: 0 into the face, 90 from the "
                "right, 180 from behind."),
    choice("wind_profile", "Wind over height", bf.WIND_PROFILES, default="uniform",
           labels=("Same at every height", "Power law (grows with height)"), section="Wind"),
    number("wind_ref_height_m", "Wind reference height", "length", 10.0, 0.5, 100.0, section="Wind",
           advanced=True, help="Height where the wind speed is given (power law)."),
    number("wind_exponent", "Power-law exponent", "ratio", 0.143, 0.0, 0.6, section="Wind", advanced=True,
           step=0.01, help="About 1/7 over open ground (common practice); larger over rough ground."),
    number("cd_scale", "Drag scale factor", "ratio", 1.0, 0.0, 5.0, section="Coefficient scale factors", step=0.01, advanced=True,
           help="Multiplies the model's CD (e.g. a factor fitted to tracked flights)."),
    number("cl_scale", "Lift scale factor", "ratio", 1.0, -5.0, 5.0, section="Coefficient scale factors", step=0.01, advanced=True,
           help="Multiplies the model's CL."),
    choice("compare_with", "Second flight", COMPARE_CHOICES, default="none", labels=COMPARE_LABELS,
           section="Second flight", help="Draw a second flight that differs in one thing."),
    number("compare_altitude_m", "Other altitude", "altitude", 1600.0, -500.0, 5000.0, section="Second flight",
           help="Standard atmosphere at this altitude (same humidity)."),
    choice("compare_ball", "Other ball", BALL_KEYS[:-1], default="golf", labels=_BALL_LABELS[:-1],
           section="Second flight"),
    number("compare_spin_rpm", "Other spin rate", "rotation", 0.0, 0.0, 20000.0, section="Second flight",
           step=100.0),
    number("compare_speed_m_s", "Other launch speed", "ball_speed", 40.0, 0.0, 150.0, section="Second flight",
           step=0.1),
    integer("dispersion_n", "Number of flights", 2000, 0, 100000, section="Launch spread",
            help="0 switches the spread off; 1,000 to 10,000 give steady percentiles."),
    integer("dispersion_seed", "Random seed", 1, 0, 2 ** 31 - 1, section="Launch spread",
            help="The same seed repeats the same draws."),
    number("sd_speed_m_s", "Spread of speed (1 sd)", "ball_speed", 1.0, 0.0, 20.0, section="Launch spread", step=0.1),
    number("sd_elevation_deg", "Spread of elevation (1 sd)", "angle", 1.5, 0.0, 20.0, section="Launch spread", step=0.1),
    number("sd_azimuth_deg", "Spread of azimuth (1 sd)", "angle", 1.5, 0.0, 20.0, section="Launch spread", step=0.1),
    number("sd_spin_rpm", "Spread of spin rate (1 sd)", "rotation", 200.0, 0.0, 5000.0, section="Launch spread",
           step=10.0),
    number("sd_spin_axis_deg", "Spread of spin-axis tilt (1 sd)", "angle", 5.0, 0.0, 90.0,
           section="Launch spread", step=0.5),
))

INPUTS = INPUTS.with_rules({
    "custom_diameter_m": lambda v: v["ball"] == "custom",
    "custom_mass_kg": lambda v: v["ball"] == "custom",
    "constant_cd": lambda v: v["coefficient_model"] == "constant",
    "constant_cl": lambda v: v["coefficient_model"] == "constant",
    "aero_table_csv": lambda v: v["coefficient_model"] == "table",
    "goal_distance_m": lambda v: v["obstacle"] == "free_kick",
    "wall_distance_m": lambda v: v["obstacle"] == "custom",
    "wall_height_m": lambda v: v["obstacle"] == "custom",
    "wall_width_m": lambda v: v["obstacle"] == "custom",
    "density_kg_m3": lambda v: bool(v["set_density"]),
    "wind_ref_height_m": lambda v: v["wind_profile"] == "power_law",
    "wind_exponent": lambda v: v["wind_profile"] == "power_law",
    "compare_altitude_m": lambda v: v["compare_with"] == "altitude",
    "compare_ball": lambda v: v["compare_with"] == "ball",
    "compare_spin_rpm": lambda v: v["compare_with"] == "spin",
    "compare_speed_m_s": lambda v: v["compare_with"] == "speed",
})

# ----------------------------------------------------------------------------- sweep and fit inputs
#: Default range of each input the launch sweep can map (core units).
SWEEP_DEFAULT_RANGES = {"speed_m_s": (25.0, 55.0), "elevation_deg": (10.0, 45.0),
                        "azimuth_deg": (-10.0, 10.0), "spin_rpm": (0.0, 4000.0),
                        "spin_axis_deg": (-45.0, 45.0), "height_m": (0.0, 3.0)}
_SWEEP_STEPS = {"rotation": 100.0, "angle": 1.0, "ball_speed": 0.5, "length": 0.1}
_SW = "Launch sweep"


def _range_fields():
    out = []
    for key, (label, q, lo, hi) in bf.SWEEP_INPUTS.items():
        d0, d1 = SWEEP_DEFAULT_RANGES[key]
        lo = max(lo, -90.0) if key == "elevation_deg" else lo
        for end, default in (("from", d0), ("to", d1)):
            out.append(number(f"sweep_{key}_{end}", f"{label} {end}", q, default, lo, hi, section=_SW,
                              step=_SWEEP_STEPS[q], advanced=True,
                              show_if=lambda v, key=key: key in (v["sweep_x"], v["sweep_y"])))
    return tuple(out)


_SWEEP_CHOICES = tuple(bf.SWEEP_INPUTS)
_SWEEP_LABELS = tuple(v[0] for v in bf.SWEEP_INPUTS.values())
SWEEP_FIELDS = (
    choice("sweep_x", "Across", _SWEEP_CHOICES, default="elevation_deg", labels=_SWEEP_LABELS,
           section=_SW, advanced=True, help="The launch input along the map's horizontal axis."),
    choice("sweep_y", "Up", _SWEEP_CHOICES, default="spin_rpm", labels=_SWEEP_LABELS, section=_SW,
           advanced=True, help="The launch input along the map's vertical axis."),
    integer("sweep_points", "Points per input", 21, 5, 61, section=_SW, advanced=True,
            help="Grid points along each input: points² flights in one batch."),
    choice("sweep_output", "Result to map", tuple(bf.SWEEP_OUTPUTS), default="carry_m",
           labels=tuple(v[0] for v in bf.SWEEP_OUTPUTS.values()), section=_SW, advanced=True,
           help="The smallest margin over the obstacles (positive: the launch clears every one) needs "
                "an obstacle under 'Does it clear?'."),
    choice("sweep_goal", "Best means", ("max", "min"), default="max", labels=("highest", "lowest"),
           section=_SW, advanced=True),
    flag("sweep_must_clear", "Best only among launches that clear every obstacle", True, section=_SW,
         advanced=True, show_if=lambda v: v["obstacle"] != "none",
         help="The star and the search pick the best launch that clears the obstacles (the best of "
              "all when none on the grid does)."),
    *_range_fields(),
    flag("sweep_in_report", "Put the sweep in the handout", False, section=_SW, advanced=True,
         help="The map (and its best grid point) in the handout, the numbers file and the output "
              "of `python -m liftcore run`."),
)
_FIT = "Fit to tracked flights"
FIT_FIELDS = (
    choice("fit_source", "Tracks", ("demo", "file"), default="demo",
           labels=("Invented demo tracks (shipped)", "My CSV file"), section=_FIT, advanced=True),
    choice("fit_mode", "Fit", bf.FIT_MODES, default="constant",
           labels=("Constant CD and CL", "Scale factors on the chosen model",
                   "Curves: CD = a + b S, CL rising to a level (tanh)"), section=_FIT,
           advanced=True),
    flag("fit_in_report", "Put the fit in the handout", False, section=_FIT, advanced=True,
         help="The fitted coefficients with their uncertainty in the handout and `run` (your own "
              "tracks only on the page, where the file is uploaded)."),
)
INPUTS = InputSpec(KIND, INPUTS.fields + SWEEP_FIELDS + FIT_FIELDS)
SWEEP_KEYS = tuple(f.key for f in SWEEP_FIELDS)
FIT_KEYS = tuple(f.key for f in FIT_FIELDS)

SPREAD_KEYS = ("dispersion_n", "dispersion_seed", "sd_speed_m_s", "sd_elevation_deg", "sd_azimuth_deg",
               "sd_spin_rpm", "sd_spin_axis_deg")
COMPARE_KEYS = ("compare_with", "compare_altitude_m", "compare_ball", "compare_spin_rpm", "compare_speed_m_s")

SOURCES = (
    "Equation of motion with drag, Magnus lift and gravity; spin parameter S = r omega / |v_rel|, "
    "Reynolds number Re = |v_rel| d / nu (standard sports-ball aerodynamics, e.g. Nathan 2008).",
    *(f"{MODELS[k].title}: {MODELS[k].source} {MODELS[k].note}" for k in MODEL_KEYS if k != "constant"),
    "Spin decay d omega/dt = -c omega |v_rel| / r: form from Smits & Smith (1994) as discussed in "
    "Nathan, A. M. (2008), 'The effect of spin-down on the flight of a baseball' (note); constants from "
    "memory; for balls without their own data the golf-ball constant is borrowed (warned).",
    *(f"{b.name}: {b.rule}." for b in BALLS.values()),
    "Air: ISA (ISO 2533) or measured temperature, pressure and humidity (liftcore.air).",
    "Wind over height: power law u(z) = u_ref (z / z_ref)^alpha, alpha about 1/7 over open ground "
    "(common practice).",
    "Integration: Dormand & Prince (1980), J. Comput. Appl. Math. 6, 19-26, with a step size per flight; "
    "landing by cubic Hermite interpolation.",
    "After landing: rigid-body impact with grip or slip (Brody 1984, The Physics Teacher 22, 494-497; Cross "
    "2002, Am. J. Phys. 70, 1093-1102); golf on turf off the pitch mark (Penner 2002, The run of a golf "
    "ball, Can. J. Phys. 80, 931-940: crater angle, e(v_n) and friction from memory; the turfs' firmness "
    "factors and rolling resistances assumed); the hard court's e from the ITF ball rebound rule.",
    "Obstacles: IFAB Laws of the Game (Laws 1 and 13), ITF Rules of Tennis (Rules 1 and 3), FIVB Official "
    "Volleyball Rules (Rules 1.1 and 2.1), ITTF Handbook (Laws 2.1 and 2.2); dimensions from memory; the "
    "free-kick wall's size is common practice.",
)
CAUTIONS = (
    "Results are for analysis, not for safety distances: real balls scatter more than any model. "
    "Flying balls can injure; keep people clear of the landing area and follow the venue's safety rules.",
)

HEADLINE_HELP = {
    "carry_m": "Distance along the target line (x) from launch to where the ball first meets the ground.",
    "peak_height_m": "Highest point above the ground.",
    "flight_time_s": "Time from launch to landing.",
    "lateral_m": "Sideways distance from the target line at landing; right of the line is positive.",
    "descent_angle_deg": "Angle of the path below the horizontal at landing.",
    "landing_speed_m_s": "Ball speed over the ground at landing.",
}


@dataclass(frozen=True)
class FlightDetail:
    """What the page needs beyond the headlines."""

    flights: tuple
    setup: bf.FlightSetup
    launch: bf.Launch
    air: object
    dispersion: object = None
    compare_warnings: tuple = ()
    sweep: object = None
    fit: object = None
    #: The obstacles of the chosen preset and how the flight clears each (:mod:`liftcore.obstacles`).
    obstacles: tuple = ()
    checks: tuple = ()


def obstacles_of(values: dict) -> tuple:
    """The obstacles the inputs choose (none by default)."""
    from liftcore import obstacles as ob

    return ob.preset(values.get("obstacle", "none"), values.get("goal_distance_m", 20.0),
                     (values.get("wall_distance_m", 10.0), values.get("wall_height_m", 2.0),
                      values.get("wall_width_m", 0.0)))


def ground_of(values: dict) -> str | None:
    """The ground key the inputs choose (the ball's usual one by default), or None for none."""
    g = values.get("ground", "ball_default")
    if g == "ball_default":
        return BALL_GROUND.get(values["ball"])
    return None if g == "none" else g


def setup_from_values(values: dict, ball_key: str | None = None, altitude_m: float | None = None,
                      no_air: bool = False):
    """(FlightSetup, AirState) from the study inputs (optionally another ball or altitude)."""
    v = values
    if altitude_m is not None:
        air = air_state(altitude_m, relative_humidity=v.get("relative_humidity_pct", 0.0) / 100.0)
    else:
        air = air_state_from_inputs(v)
    rho = air.density_kg_m3
    if v.get("set_density") and altitude_m is None:
        rho = v["density_kg_m3"]
    if no_air:
        rho = 0.0
    bk = ball_key or v["ball"]
    mk = v["coefficient_model"]
    aero = None
    if mk == "table":  # the user's own table replaces the model (not for a second ball)
        if ball_key is None:
            from liftcore.balls import table_model

            aero = table_model(v["aero_table_csv"], "your aerodynamic table")
        mk = "ball_default"
    if ball_key is not None or mk == "ball_default":
        mk = None if bk != "custom" else "achenbach1972"
    cd_scale, cl_scale = v["cd_scale"], v["cl_scale"]
    if (mk or (BALLS[bk].model if bk in BALLS else "")) == "constant":
        cd_scale, cl_scale = v["constant_cd"] * cd_scale, v["constant_cl"] * cl_scale
    wind = bf.Wind(v["wind_speed_m_s"], v["wind_from_deg"], v["wind_profile"], v["wind_ref_height_m"],
                   v["wind_exponent"])
    setup = bf.make_setup(bk, mk, density_kg_m3=rho,
                          kinematic_viscosity_m2_s=air.dynamic_viscosity_pa_s / max(air.density_kg_m3, 1e-9),
                          speed_of_sound_m_s=air.speed_of_sound_m_s, wind=wind, cd_scale=cd_scale,
                          cl_scale=cl_scale, spin_decay=v["spin_decay"], diameter_m=v["custom_diameter_m"],
                          mass_kg=v["custom_mass_kg"], aero_table=aero)
    return setup, air


def launch_from_values(values: dict, **changes) -> bf.Launch:
    v = values
    la = bf.Launch(v["speed_m_s"], v["elevation_deg"], v["azimuth_deg"], v["spin_rpm"], v["spin_axis_deg"],
                   v["rifle_deg"], v["launch_height_m"])
    return replace(la, **changes) if changes else la


def spread_sd(values: dict) -> dict:
    return {"speed_m_s": values["sd_speed_m_s"], "elevation_deg": values["sd_elevation_deg"],
            "azimuth_deg": values["sd_azimuth_deg"], "spin_rpm": values["sd_spin_rpm"],
            "spin_axis_deg": values["sd_spin_axis_deg"]}


def sweep_ranges_around(launch: dict) -> dict:
    """Sweep ranges that suit a launch (e.g. a ball's typical one): speed 60 % to 120 % of it,
    elevation from 15° below to 25° above it, spin from 0 to twice it (rounded)."""
    v, e, w = launch["speed_m_s"], launch["elevation_deg"], launch["spin_rpm"]
    return {"sweep_speed_m_s_from": round(0.6 * v, 1), "sweep_speed_m_s_to": round(1.2 * v, 1),
            "sweep_elevation_deg_from": max(-45.0, round(e - 15.0)),
            "sweep_elevation_deg_to": min(75.0, round(e + 25.0)),
            "sweep_spin_rpm_from": 0.0, "sweep_spin_rpm_to": max(500.0, round(2.0 * w, -2))}


def sweep_grid(values: dict) -> tuple:
    """(x key, x values, y key, y values) of the launch sweep the inputs ask for; refuses two
    equal inputs or an empty range."""
    x, y, n = values["sweep_x"], values["sweep_y"], values["sweep_points"]
    if x == y:
        raise InputError("sweep inputs", f"the launch sweep needs two different inputs (got "
                                         f"{bf.SWEEP_INPUTS[x][0]} twice)")
    grids = []
    for key in (x, y):
        lo, hi = values[f"sweep_{key}_from"], values[f"sweep_{key}_to"]
        if not lo < hi:
            label = bf.SWEEP_INPUTS[key][0]
            raise InputError(f"sweep {key}", f"the sweep's {label} range needs 'from' below 'to' "
                                             f"(got {lo:g} to {hi:g})")
        grids.append(np.linspace(lo, hi, n))
    return x, grids[0], y, grids[1]


def launch_sweep(values: dict, progress=None) -> bf.SweepResult:
    """The launch sweep of the inputs: ``sweep_output`` over the grid of :func:`sweep_grid`,
    every grid point a full flight (one batch), the best grid point marked.

    Parameters
    ----------
    values : dict
        Complete, validated study inputs (core units).
    progress : callable, optional
        ``progress(fraction, text)`` while the batch flies.

    Returns
    -------
    liftcore.ballflight.SweepResult
        With the margins over the chosen obstacles at every grid point (none without one); the
        best point among the launches that clear them when ``sweep_must_clear``.

    Notes
    -----
    See :func:`liftcore.ballflight.sweep` and :func:`liftcore.obstacles.margin`.
    """
    setup, _ = setup_from_values(values)
    x, xs, y, ys = sweep_grid(values)
    return bf.sweep(setup, launch_from_values(values), x, xs, y, ys, values["sweep_output"],
                    values["sweep_goal"] == "max", progress=progress, obstacles=obstacles_of(values),
                    must_clear=values["sweep_must_clear"])


def best_launch(values: dict) -> bf.OptimumResult:
    """The best ``sweep_output`` within the sweep's two ranges.

    Parameters
    ----------
    values : dict
        Complete, validated study inputs (core units).

    Returns
    -------
    liftcore.ballflight.OptimumResult
        The searched launch; with an obstacle and ``sweep_must_clear``, only launches that clear
        every obstacle count.

    Notes
    -----
    scipy Nelder-Mead from the best point of a coarse grid (:func:`liftcore.ballflight.best_launch`).

    References
    ----------
    .. [1] Nelder, J. A. & Mead, R. (1965), A simplex method for function minimization,
       Comput. J. 7, 308-313.
    """
    setup, _ = setup_from_values(values)
    x, xs, y, ys = sweep_grid(values)
    return bf.best_launch(setup, launch_from_values(values), (x, y), ((xs[0], xs[-1]), (ys[0], ys[-1])),
                          values["sweep_output"], values["sweep_goal"] == "max", obstacles=obstacles_of(values),
                          must_clear=values["sweep_must_clear"])


def landing_spread(values: dict, progress=None) -> bf.DispersionResult:
    """``dispersion_n`` flights with launch inputs drawn from normal distributions (seeded)."""
    setup, _ = setup_from_values(values)
    return bf.dispersion(setup, launch_from_values(values), spread_sd(values), values["dispersion_n"],
                         values["dispersion_seed"], progress=progress)


def track_fit(values: dict, tracks=None) -> bf.FitResult:
    """Drag and lift (constants or scale factors, ``fit_mode``) and each flight's launch state
    fitted to tracked positions by least squares. ``tracks`` ``None``: the invented demo tracks
    with the ball, air and spin they were made with; else the inputs' ball, air and spin."""
    mode = values["fit_mode"]
    if tracks is None:
        tracks = bf.demo_tracks()
        setup = bf.demo_tracks_setup()
        spin, axis = bf.DEMO_TRACKS["spin_rpm"], bf.DEMO_TRACKS["spin_axis_deg"]
        if mode == "scale":
            setup = bf.make_setup(bf.DEMO_TRACKS["ball"], density_kg_m3=setup.density_kg_m3,
                                  kinematic_viscosity_m2_s=setup.kinematic_viscosity_m2_s)
    else:
        setup, _ = setup_from_values(values)
        spin, axis = values["spin_rpm"], values["spin_axis_deg"]
    return bf.fit_tracks(setup, tracks, spin, axis, values["rifle_deg"], mode)


SWEEP_LABELS = {k: (v[0], v[1]) for k, v in bf.SWEEP_INPUTS.items()}


def sweep_figure(sw: bf.SweepResult, values: dict, system: str = "SI", searched=None):
    """The sweep's heat map in ``system``'s units (``searched``: a best point to mark)."""
    out_label, out_kind = bf.SWEEP_OUTPUTS[values["sweep_output"]]
    from liftcore import figures_ball as fb  # plotly only when a chart is drawn

    return fb.sweep_heatmap(sw, SWEEP_LABELS, out_label, out_kind, system, searched=searched)


def comparison_label(values: dict, system: str = "SI") -> str:
    """The name of the second flight, with its number in ``system``'s display units."""
    mode = values["compare_with"]

    def shown(key, kind, fmt):
        return f"{units.to_display(values[key], kind, system):{fmt}} {units.unit_label(kind, system)}"

    if mode == "altitude":
        return f"At {shown('compare_altitude_m', 'altitude', '.0f')} altitude"
    if mode == "ball":
        return BALLS[values["compare_ball"]].name
    if mode == "spin":
        return f"Spin {shown('compare_spin_rpm', 'rotation', '.0f')}"
    if mode == "speed":
        return f"Speed {shown('compare_speed_m_s', 'ball_speed', '.3g')}"
    return "Without air (vacuum)"


def comparison_flight(values: dict):
    """The second flight the inputs ask for, or None: (Flight, setup)."""
    mode = values["compare_with"]
    if mode == "none":
        return None
    if mode == "altitude":
        setup, air = setup_from_values(values, altitude_m=values["compare_altitude_m"])
        la = launch_from_values(values)
    elif mode == "ball":
        setup, air = setup_from_values(values, ball_key=values["compare_ball"])
        la = launch_from_values(values)
    elif mode == "spin":
        setup, air = setup_from_values(values)
        la = launch_from_values(values, spin_rpm=values["compare_spin_rpm"])
    elif mode == "speed":
        setup, air = setup_from_values(values)
        la = launch_from_values(values, speed_m_s=values["compare_speed_m_s"])
    else:
        setup, air = setup_from_values(values, no_air=True)
        la = launch_from_values(values)
    return bf.fly(setup, la, label=comparison_label(values)), setup


def run(values: dict, progress=None, extra=None) -> StudyResult:
    setup, air = setup_from_values(values)
    launch = launch_from_values(values).validate()
    main = bf.fly(setup, launch, label="This flight", check_distance_m=values["check_distance_m"] or None,
                  ground_key=ground_of(values))
    flights = [main]
    cmp_ws: tuple = ()
    cmp = comparison_flight(values)
    if cmp is not None:
        flights.append(cmp[0])
        cmp_ws = cmp[0].warnings
    for label, vals in (extra or {}).get("overlay", ()) if isinstance(extra, dict) else ():
        from liftcore.studies import study

        clean = study(KIND).INPUTS.validate(vals)
        su, _ = setup_from_values(clean)
        flights.append(bf.fly(su, launch_from_values(clean), label=str(label)))
    disp = None
    if values["dispersion_n"] > 0:
        disp = landing_spread(values, progress=progress)
    sw = launch_sweep(values, progress) if values["sweep_in_report"] else None
    fit = None
    if values["fit_in_report"]:
        tracks = extra.get("tracks") if isinstance(extra, dict) else None
        fit = track_fit(values, tracks if values["fit_source"] == "file" else None)
    warnings = list(main.warnings)
    for w in air.warnings:
        warnings.append(replace(w, subject=""))
    if fit is not None:
        warnings.extend(fit.warnings())
    if main.run_out is not None:
        g = GROUNDS[main.run_out["ground"]]
        b = main.run_out["bounce"]
        (v0, v1), (a0, a1) = bounce.PENNER_SPEED_M_S, bounce.PENNER_ANGLE_DEG
        if g.crater_scale and not (v0 <= b["speed_before_m_s"] <= v1 and a0 <= main.descent_angle_deg <= a1):
            warnings.append(ModelWarning(
                "turf_impact_outside_data",
                f"the ball meets the turf at {b['speed_before_m_s']:.1f} m/s and {main.descent_angle_deg:.0f}°, "
                f"outside the impacts the pitch-mark relations were fitted to (about {v0:g}-{v1:g} m/s "
                f"and {a0:g}-{a1:g}°, from memory): the bounce is extrapolated", "carry_m"))
        if g.crater_scale and setup.ball.key != "golf":
            warnings.append(ModelWarning(
                "turf_model_outside_golf",
                f"the pitch-mark bounce on turf was fitted to golf balls (Penner 2002): for the "
                f"{setup.ball.name.lower()} the bounce and roll are extrapolated", "carry_m"))
        warnings.append(ModelWarning("after_landing_model",
                                     f"bounce and roll on {g.label.lower()}: {g.describe()}; "
                                     + ("turf varies from place to place and day to day, so the roll is uncertain "
                                        "by tens of per cent"
                                        if main.run_out["total_m"] is not None else
                                        "the bounce also depends on the court's surface and the ball's wear"),
                                     "carry_m"))
    if setup.density_kg_m3 == 0.0:
        warnings.append(ModelWarning("vacuum", "air density 0: the flight is in vacuum (no drag, lift or "
                                     "spin decay)", ""))
    heads = tuple(Headline(k, label, getattr(main, k), kind, 3 if k != "carry_m" else 4, HEADLINE_HELP[k])
                  for k, (label, kind) in bf.OUTPUTS.items())
    figs = flight_figures(flights, disp, "SI", sw, values)
    # Tables are built when asked for (pandas is not imported for a one-line command-line run).
    tables = {f"path: {f.label}": (lambda f=f: _frame(f.path)) for f in flights}
    tables["flights"] = lambda: _frame([{"flight": f.label, **f.headline_dict(),
                                         "landing_spin_rpm": f.landing_spin_rpm} for f in flights])
    js = {k: getattr(main, k) for k in bf.OUTPUTS}
    js["warnings"] = [w.as_dict() for w in merge(warnings)]
    js["ball"] = setup.ball.key
    js["coefficient_model"] = setup.model_key
    js["air_density_kg_m3"] = setup.density_kg_m3
    js["landing_spin_rpm"] = main.landing_spin_rpm
    js["at_check"] = main.at_check  # None without a check distance, or when the ball lands first
    from liftcore import obstacles as ob

    obstacles = obstacles_of(values)
    checks = tuple(ob.check(main.path, main.carry_m, main.lateral_m, o) for o in obstacles)
    js["obstacles"] = list(checks)
    if obstacles:
        tables["obstacles"] = lambda: _frame(ob.rules_table(obstacles, checks))
    run = main.run_out
    js["ground"] = None if run is None else run["ground"]
    js["total_m"] = None if run is None else run["total_m"]
    js["roll_m"] = None if run is None else run["roll_m"]
    js["bounce"] = None if run is None else run["bounce"]
    if cmp is not None:
        js["comparison"] = {"label": cmp[0].label, **cmp[0].headline_dict(),
                            "warnings": [w.as_dict() for w in cmp_ws]}
    if sw is not None:
        tables["sweep"] = lambda: sweep_table(sw, values)
        js["sweep"] = {"x": sw.x_key, "y": sw.y_key, "output": values["sweep_output"],
                       "best_value": sw.best_value, "best_x": sw.best_x, "best_y": sw.best_y,
                       "points_clearing": sw.clearance_counts() if sw.margins else None}
    if fit is not None:
        tables["fit"] = fit.table
        js["fit"] = {"mode": fit.mode, "rms_m": fit.rms_m,
                     **{name: {"value": v, "sd": sd} for name, (v, sd) in
                        ((n, fit.parameter(n)) for n in fit.names[:fit.coefficient_count])}}
    if disp is not None:
        js["dispersion"] = disp.summary()
        tables["spread"] = lambda: _frame({"carry_m": disp.carry_m, "lateral_m": disp.lateral_m,
                                           "flight_time_s": disp.flight_time_s,
                                           **{f"launch_{k}": v for k, v in disp.draws.items()}})
    return StudyResult(KIND, dict(values), heads, merge(warnings), figs, Tables(tables),
                       FlightDetail(tuple(flights), setup, launch, air, disp, cmp_ws, sw, fit, obstacles, checks), js)


# ----------------------------------------------------------------------------- display units
#: Quantity kinds of the flight tables' columns (path, flights, spread).
COLUMN_UNITS = {
    "t_s": "time", "x_m": "distance", "lateral_m": "distance", "z_m": "length", "speed_m_s": "ball_speed",
    "air_speed_m_s": "ball_speed", "spin_rpm": "rotation", "spin_parameter": "ratio", "reynolds": "ratio",
    "cd": "ratio", "cl": "ratio", "carry_m": "distance", "peak_height_m": "length", "flight_time_s": "time",
    "descent_angle_deg": "angle", "landing_speed_m_s": "ball_speed", "landing_spin_rpm": "rotation",
    "launch_speed_m_s": "ball_speed", "launch_elevation_deg": "angle", "launch_azimuth_deg": "angle",
    "launch_spin_rpm": "rotation", "launch_spin_axis_deg": "angle",
    "distance_m": "distance", "height_m": "length", "width_m": "length", "far_end_m": "distance",
    "margin_m": "length",
}
#: Plain names for columns whose key says too little once the unit is gone.
DISPLAY_NAMES = {"x_m": "downrange_m", "lateral_m": "drift_right_m", "z_m": "height_m",
                 "speed_m_s": "ball_speed_m_s", "reynolds": "Reynolds_number", "cd": "CD", "cl": "CL"}


def _frame(data):
    """``data`` as a pandas DataFrame (pandas imported only when a table is built)."""
    import pandas as pd

    return pd.DataFrame(data)


def sweep_table(sw: bf.SweepResult, values: dict):
    """The sweep as a long table.

    Parameters
    ----------
    sw : liftcore.ballflight.SweepResult
    values : dict
        The study inputs (for the mapped result's name).

    Returns
    -------
    pandas.DataFrame
        One row per grid point: the two inputs and the mapped result (core units), and with
        obstacles ``margin_<name>_m`` per obstacle [m] and ``clears_all``.
    """
    xx, yy = np.meshgrid(sw.x_values, sw.y_values)
    cols = {sw.x_key: xx.ravel(), sw.y_key: yy.ravel(), values["sweep_output"]: np.asarray(sw.grid).ravel()}
    for name, grid in sw.margins:
        cols[f"margin_{name.replace(' ', '_')}_m"] = np.asarray(grid).ravel()
    if sw.margins:
        cols["clears_all"] = np.asarray(sw.margin_grid).ravel() >= 0
    return _frame(cols)


def flight_figures(flights, disp=None, system: str = "SI", sw=None, values=None) -> Charts:
    """(title, figure) pairs of the study in ``system``'s display units."""
    def draw(name, *args, **kw):  # plotly is imported when the first chart is drawn, not before
        def make():
            from liftcore import figures_ball as fb

            return getattr(fb, name)(*args, system, **kw)
        return make

    figs = [("Flight path in 3-D", draw("trajectory_3d", flights)),
            ("Side view", draw("side_view", flights, obstacles=obstacles_of(values or {}))),
            ("Top view", draw("top_view", flights, obstacles=obstacles_of(values or {}))),
            ("Along the flight", draw("along_flight", flights))]
    if disp is not None:
        figs.append(("Landing spread", draw("dispersion_figure", disp)))
    if sw is not None:
        figs.append(("Launch sweep", lambda: sweep_figure(sw, values, system)))
    return Charts(figs)


def summary(result: StudyResult, system: str = "SI") -> str:
    """One sentence with every headline of the flight, in ``system``'s units (``**`` marks the
    numbers): what the page writes above the flight picture and the handout under its title."""
    f = result.detail.flights[0]
    h = {x.key: x.text(system) for x in result.headlines}
    side = ("right of" if f.lateral_m > 0 else "left of" if f.lateral_m < 0 else "on")
    drift = units.quantity_text(abs(f.lateral_m), "distance", system)
    where = f"**{drift}** {side}" if f.lateral_m else "on"
    return (f"The {result.detail.setup.ball.name.lower()} carries **{h['carry_m']}** along the target "
            f"line, peaks at **{h['peak_height_m']}**, stays up **{h['flight_time_s']}** and lands "
            f"{where} the line at **{h['landing_speed_m_s']}**, coming down at "
            f"**{h['descent_angle_deg']}**.{run_out_sentence(result, system)}{obstacle_sentence(result, system)}"
            f"{check_sentence(result, system)}")


def run_out_sentence(result: StudyResult, system: str = "SI") -> str:
    """How far the ball runs on after landing, as a sentence (leading space), or ""."""
    run = result.detail.flights[0].run_out
    if run is None:
        return ""
    q = lambda x, kind: units.quantity_text(x, kind, system)  # noqa: E731
    b = run["bounce"]
    first = (f" On {GROUNDS[run['ground']].label.lower()} it bounces at **{q(b['speed_after_m_s'], 'ball_speed')}**, "
             f"**{q(b['angle_after_deg'], 'angle')}** up")
    if run["total_m"] is None:
        spin = "backspin" if b["spin_after_rpm"] > 0 else "topspin"
        return f"{first}, with **{q(abs(b['spin_after_rpm']), 'rotation')}** of {spin} (the path after it is drawn)."
    return (f"{first}, and comes to rest **{q(run['total_m'], 'distance')}** downrange "
            f"(**{q(run['roll_m'], 'distance')}** after landing).")


def obstacle_sentence(result: StudyResult, system: str = "SI") -> str:
    """How the ball clears or misses each obstacle, as a sentence (leading space), or ""."""
    parts = []
    words = {("over", True): "clears the {n} by **{m}**", ("over", False): "is **{m}** too low for the {n}",
             ("through", True): "goes into the {n} with **{m}** to spare", ("through", False): "misses the {n} by **{m}**",
             ("land", True): "lands in the {n}, **{m}** inside", ("land", False): "lands **{m}** outside the {n}"}
    for c in result.detail.checks:
        m = units.quantity_text(abs(c["margin_m"]), "length", system)
        text = "lands **{m}** short of the {n}" if c.get("lands_short") else words[(c["kind"], c["clears"])]
        parts.append(text.format(n=c["name"], m=m))
    return (" It " + ", ".join(parts) + ".") if parts else ""


def check_sentence(result: StudyResult, system: str = "SI") -> str:
    """Where the ball is at the check distance, as a sentence (leading space), or ""."""
    d = result.inputs.get("check_distance_m", 0.0)
    if not d:
        return ""
    q = lambda x, kind: units.quantity_text(x, kind, system)  # noqa: E731
    c = result.detail.flights[0].at_check
    if c is None:
        return f" It lands before **{q(d, 'distance')}** downrange."
    side = "right" if c["lateral_m"] > 0 else "left"
    drift = f"**{q(abs(c['lateral_m']), 'distance')}** {side} of the line" if c["lateral_m"] else "on the line"
    return (f" At **{q(d, 'distance')}** downrange it is **{q(c['height_m'], 'length')}** up, {drift}, "
            f"after **{q(c['time_s'], 'time')}** at **{q(c['speed_m_s'], 'ball_speed')}**.")


def display_flights(result: StudyResult, system: str) -> tuple:
    """The flights of ``result`` with the second flight's name in ``system``'s units."""
    flights = list(result.detail.flights)
    if result.inputs.get("compare_with", "none") != "none" and len(flights) > 1:
        flights[1] = replace(flights[1], label=comparison_label(result.inputs, system))
    return tuple(flights)


def figures_in_units(result: StudyResult, system: str) -> tuple:
    """The charts of ``result`` with distances, heights and speeds in ``system``'s units."""
    if system == "SI":
        return result.figures
    return flight_figures(display_flights(result, system), result.detail.dispersion, system,
                          result.detail.sweep, result.inputs)


def tables_in_units(result: StudyResult, system: str) -> dict:
    """The study's tables in ``system``'s units, the unit in each column name."""
    def shown(df):
        df = df.rename(columns=DISPLAY_NAMES)
        kinds = {DISPLAY_NAMES.get(c, c): k for c, k in COLUMN_UNITS.items()}
        return table_in_units(df, {c: k for c, k in kinds.items() if c in df.columns}, system)

    flights = display_flights(result, system)
    out = {f"path: {f.label}": shown(_frame(f.path)) for f in flights}
    table = result.tables["flights"].copy()
    table["flight"] = [f.label for f in flights]
    out["flights"] = shown(table)
    if "spread" in result.tables:
        out["spread"] = shown(result.tables["spread"])
    if "obstacles" in result.tables:
        out["obstacles"] = shown(result.tables["obstacles"])
    return out
