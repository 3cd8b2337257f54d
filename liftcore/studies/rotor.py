"""Study: rotor sails on a ship in one wind condition (the "Rotor sail on a ship" page).

One run computes the operating point (best spin within the limits, or a fixed spin ratio or
rpm), the same point with every coefficient set side by side, a sweep of true wind angles at the
current wind speed, the coefficient curves and the wind along the rotor height.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import pandas as pd

from liftcore import coefficients as coef
from liftcore import figures_rotor
from liftcore import rotor
from liftcore import rotor_inputs
from liftcore import units
from liftcore.air import AirState, air_inputs, air_state_from_inputs
from liftcore.constants import KNOT_M_S
from liftcore.errors import InputError
from liftcore.inputs import InputSpec, choice, number
from liftcore.studies import Charts, Headline, StudyResult, column_label, quantity_table, table_in_units
from liftcore.validity import merge

KIND = "rotor"
TITLE = "Rotor sail on a ship"
#: Options are compared by thrust and net gain round the compass (the coefficient charts look
#: alike for any rotor size).
COMPARE_FIGURE = "Thrust and net power gain around the compass"

_CONDITION_FIELDS = (
    number("ship_speed_m_s", "Ship speed", "ship_speed", 12.0 * KNOT_M_S, 0.0, 30.0 * KNOT_M_S,
           section="Ship and wind", step=0.1, help="Speed through the water."),
    number("true_wind_speed_m_s", "True wind speed", "wind_speed", 20.0 * KNOT_M_S, 0.0, 40.0,
           section="Ship and wind", step=0.1, help="Wind over the sea at the height set under Wind profile "
                                         "(10 m by default)."),
    choice("wind_angle_reference", "Wind direction given as", ("relative", "compass"),
           labels=("Angle off the bow", "Compass: ship heading and wind from"),
           section="Ship and wind", help="Off the bow: 0° head wind, +90° from starboard, "
                                         "-90° from port. Compass: both as bearings."),
    number("true_wind_angle_deg", "True wind angle off the bow", "angle", 90.0, -180.0, 180.0,
           section="Ship and wind", step=5.0,
           help="Where the true wind comes from: 0° on the bow, +90° from starboard, -90° from "
                "port, 180° from astern."),
    number("heading_deg", "Ship heading", "angle", 0.0, 0.0, 360.0, section="Ship and wind",
           step=5.0, help="Compass course of the ship (0° north, 90° east)."),
    number("true_wind_direction_deg", "True wind from", "angle", 90.0, 0.0, 360.0,
           section="Ship and wind", step=5.0,
           help="Compass bearing the true wind blows from (meteorological convention)."),
    choice("spin_mode", "Spin", ("best", "spin_ratio", "rpm"),
           labels=("Best spin within the limits", "Fixed spin ratio", "Fixed rotor speed"),
           section="Spin", help="Best: the spin ratio that gives the largest net power gain "
                                "without passing the limits; the rotor stops when nothing pays."),
    number("spin_ratio", "Spin ratio", "ratio", 3.0, 0.0, 12.0, section="Spin", step=0.1,
           help="Surface speed / apparent wind speed at the rotor's mid-height."),
    number("spin_rpm", "Rotor speed", "rotation", 120.0, 0.0, 1000.0, section="Spin",
           help="Revolutions per minute of the rotor."),
)

INPUTS = InputSpec(KIND, _CONDITION_FIELDS + rotor_inputs.ROTOR_FIELDS + air_inputs("Air")).with_rules({
    **rotor_inputs.ROTOR_SHOW_IF,
    "true_wind_angle_deg": lambda v: v["wind_angle_reference"] == "relative",
    "heading_deg": lambda v: v["wind_angle_reference"] == "compass",
    "true_wind_direction_deg": lambda v: v["wind_angle_reference"] == "compass",
    "spin_ratio": lambda v: v["spin_mode"] == "spin_ratio",
    "spin_rpm": lambda v: v["spin_mode"] == "rpm",
})

#: Checked when a scenario file or a comparison is read (before it replaces a page's inputs).
check_inputs = rotor_inputs.check_inputs

SOURCES = (
    "Apparent wind: vector triangle of ship speed and true wind (leeway and current neglected).",
    "Charnock, H. (1955). Wind stress on a water surface. Q. J. R. Meteorol. Soc. 81, 639-640.",
    "Smith, S. D. (1988). Coefficients for sea surface wind stress, heat flux, and wind profiles as "
    "a function of wind speed and temperature. J. Geophys. Res. 93, 15467-15472.",
    "Fairall, C. W. et al. (2003). Bulk parameterization of air-sea fluxes: updates and "
    "verification for the COARE algorithm. J. Climate 16, 571-591 (Charnock 0.011 to 0.018).",
    "Power-law wind profile over the sea, exponent about 0.10 to 0.14 (common practice).",
    "Kutta-Joukowski lift of a spinning cylinder in potential flow, CL = 2π·SR (theory).",
    "Prandtl lifting line: induced drag CL²/(π AR e), e = 1 (elliptic loading, assumed); "
    "end plates by Hoerner's rule AR_eff = AR (1 + 1.9 h/b) (Hoerner & Borst 1985, Fluid-Dynamic "
    "Lift; from memory).",
    "ITTC (1957) model-ship correlation line for the skin friction of a spinning rotor, and the "
    "turbulent free-disc moment C_M = 0.146 Re^-1/5 (Schlichting, Boundary-Layer Theory; from "
    "memory): spin power when a set has no power coefficient.",
    "Coefficient sets: see the table of sets on the page (each with its source and kind).",
    "PCHIP monotone interpolation: Fritsch, F. N. and Carlson, R. E. (1980). SIAM J. Numer. "
    "Anal. 17, 238-246.",
)

CAUTIONS = (
    "Rotor sails change a ship's stability, structure and manoeuvring. These are estimates for "
    "early design: they do not replace classification rules, flag-state requirements or a naval "
    "architect's analysis.",
    "Structural loads on the rotor and its foundation, and heel in gusts, are not assessed here: "
    "a gust raises forces with the square of the wind speed before the rotor can slow down.",
    "The aerodynamic data are uncertain: the published sets differ by 10 to 30 % and more at "
    "high spin ratios; compare them side by side before relying on one.",
)

#: True wind angles of the sweep. [deg]
SWEEP_ANGLES_DEG = np.arange(-180.0, 180.0 + 1e-9, 5.0)

#: Command-line JSON keys (and the units they are in).
JSON_KEYS = ("state", "coefficient_set", "spin_power_model", "spin_power_set_kw", "spin_power_friction_kw",
             "apparent_wind_speed_m_s", "apparent_wind_angle_deg", "spin_ratio", "rpm",
             "lift_coefficient", "drag_coefficient", "lift_n", "drag_n", "thrust_n", "side_force_n",
             "heeling_moment_knm", "spin_power_kw", "net_power_kw", "warnings")


@dataclass(frozen=True)
class SetComparison:
    """The operating point with one coefficient set."""

    coefficients: coef.CoefficientSet
    operation: rotor.Operation
    sweep: rotor.Operation          # over SWEEP_ANGLES_DEG
    curves: rotor.CoefficientCurves


@dataclass(frozen=True)
class RotorStudyDetail:
    setup: rotor.RotorSetup
    air: AirState
    ship_speed_m_s: float
    true_wind_speed_m_s: float
    true_wind_angle_deg: float
    spin_mode: str
    operation: rotor.Operation
    sweep: rotor.Operation
    sweep_angles_deg: np.ndarray
    comparisons: tuple
    span: rotor.SpanProfile


def relative_wind_angle_deg(values: dict) -> float:
    """True wind angle off the bow in (-180, 180], from either way of giving it."""
    if values.get("wind_angle_reference", "relative") == "compass":
        a = values["true_wind_direction_deg"] - values["heading_deg"]
    else:
        a = values["true_wind_angle_deg"]
    a = (a + 180.0) % 360.0 - 180.0
    return 180.0 if a == -180.0 else a


def operate(setup: rotor.RotorSetup, values: dict, ship_speed_m_s, true_wind_speed_m_s,
            true_wind_angle_rad) -> rotor.Operation:
    """Best spin or the fixed spin the inputs ask for."""
    mode = values.get("spin_mode", "best")
    if mode == "best":
        return rotor.best_operation(setup, ship_speed_m_s, true_wind_speed_m_s, true_wind_angle_rad)
    if mode == "spin_ratio":
        return rotor.fixed_operation(setup, ship_speed_m_s, true_wind_speed_m_s, true_wind_angle_rad,
                                     spin_ratio=values["spin_ratio"])
    return rotor.fixed_operation(setup, ship_speed_m_s, true_wind_speed_m_s, true_wind_angle_rad,
                                 rpm=values["spin_rpm"])


def _user_table(values: dict, extra):
    if isinstance(extra, pd.DataFrame):
        return extra
    return None


def operating_point(values: dict, extra=None) -> tuple[rotor.RotorSetup, rotor.Operation]:
    """The setup and the operating point of validated inputs (what the command line prints)."""
    setup = rotor_inputs.setup_from_inputs(values, _user_table(values, extra))
    twa = math.radians(relative_wind_angle_deg(values))
    return setup, operate(setup, values, values["ship_speed_m_s"], values["true_wind_speed_m_s"], twa)


def json_result(op: rotor.Operation, warnings, setup: rotor.RotorSetup | None = None) -> dict:
    """The command-line JSON of one operating point (rotor-set totals): ``state`` is running,
    at_limit or stopped; both spin-power estimates beside the one used."""
    one = op.at(())
    extra = {}
    if setup is not None:
        extra = {"state": rotor.STATE_NAMES[int(one["state"])], "coefficient_set": setup.coefficients.name,
                 "spin_power_model": "set" if setup.power_from_set else "friction",
                 "spin_power_set_kw": (None if op.spin_power_set_w is None else one["spin_power_set_w"] / 1000.0),
                 "spin_power_friction_kw": one["spin_power_friction_w"] / 1000.0}
    return {**extra,
        "apparent_wind_speed_m_s": one["apparent_wind_speed_m_s"],
        "apparent_wind_angle_deg": one["apparent_wind_angle_deg"],
        "spin_ratio": one["spin_ratio"], "rpm": one["rpm"],
        "lift_coefficient": one["lift_coefficient"], "drag_coefficient": one["drag_coefficient"],
        "lift_n": one["lift_n"], "drag_n": one["drag_n"], "thrust_n": one["thrust_n"],
        "side_force_n": one["side_force_n"], "heeling_moment_knm": one["heeling_moment_nm"] / 1000.0,
        "spin_power_kw": one["spin_power_w"] / 1000.0, "net_power_kw": one["net_power_w"] / 1000.0,
        **hull_json(op, setup),
        "warnings": [w.as_dict() for w in warnings],
    }


def hull_json(op: rotor.Operation, setup: rotor.RotorSetup | None) -> dict:
    """Leeway, rudder angle, the power they cost and (with displacement and GM) the heel angle of
    one operating point; empty without a hull."""
    if setup is None or setup.hull is None or op.balance_power_w is None:
        return {}
    one = op.at(())
    out = {"leeway_deg": one["leeway_deg"], "rudder_angle_deg": one["rudder_angle_deg"],
           "balance_power_kw": one["balance_power_w"] / 1000.0}
    heel = setup.hull.heel_angle_deg(one["heeling_moment_nm"])
    if heel is not None:
        out["heel_angle_deg"] = float(heel)
    return out


def _comparison_sets(values: dict, chosen: coef.CoefficientSet, extra) -> list:
    sets = list(coef.builtin_sets().values())
    if chosen.kind == "user":
        sets.append(chosen)
    elif (values.get("user_coefficients_csv") or "").strip() or isinstance(extra, pd.DataFrame):
        try:
            sets.append(rotor_inputs.coefficient_set_from_inputs({**values, "coefficient_set": "user"},
                                                          _user_table(values, extra)))
        except InputError:
            pass  # an unused, unreadable user table does not stop the chosen set's results
    return sets


def hull_headlines(op: rotor.Operation, setup: rotor.RotorSetup) -> tuple:
    """Leeway, rudder angle, the power they cost and the heel angle (empty without a hull)."""
    j = hull_json(op, setup)
    if not j:
        return ()
    out = [
        Headline("balance_power_w", "Lost to leeway and rudder", 1000.0 * j["balance_power_kw"], "power",
                 help="Power the engine spends on the resistance that leeway and rudder add (through "
                      "the propulsive efficiency); already taken off the net gain."),
        Headline("leeway_deg", "Leeway", j["leeway_deg"], "angle",
                 help="Angle the ship slides off its heading to hold the side force (+ to starboard); "
                      "linear hull theory (Clarke et al. 1983)."),
        Headline("rudder_angle_deg", "Rudder angle", j["rudder_angle_deg"], "angle",
                 help="Rudder angle that holds the yaw moment (+: the rudder pushes to starboard)."),
    ]
    if "heel_angle_deg" in j:
        out.append(Headline("heel_angle_deg", "Heel angle (steady)", j["heel_angle_deg"], "angle",
                            help="Small-angle statics: M / (Δ g GM), + to starboard. Gusts, free surface "
                                 "and the stability booklet govern."))
    return tuple(out)


def headlines(op: rotor.Operation) -> tuple:
    one = op.at(())
    state_text = {rotor.STOPPED: "stopped", rotor.RUNNING: "running",
                  rotor.AT_LIMIT: "running at a limit"}[int(one["state"])]
    side = "to port" if one["side_force_n"] < 0 else "to starboard"
    heel = "to port" if one["heeling_moment_nm"] < 0 else "to starboard"
    spin = {1.0: "anticlockwise", -1.0: "clockwise", 0.0: "stopped"}[float(one["spin_direction"])]
    return (
        Headline("net_power_w", "Net power gain", one["net_power_w"], "power",
                 help="Engine power saved by the thrust (thrust × ship speed / propulsive "
                      "efficiency) minus the electric power drawn to spin the rotors."),
        Headline("thrust_n", "Thrust along the heading", one["thrust_n"], "large_force",
                 help="All rotors, after the interaction factor; positive pushes the ship ahead."),
        Headline("spin_power_w", "Spin power (shaft)", one["spin_power_w"], "power",
                 help=f"All rotors; the ship's plant supplies {one['electrical_power_w'] / 1000:,.1f} kW "
                      "after the electrical efficiency."),
        Headline("heeling_moment_nm", "Heeling moment", one["heeling_moment_nm"], "moment",
                 help=f"Heels the ship {heel}; about the point set under Rotor (the waterline by "
                      "default)."),
        Headline("side_force_n", "Side force", one["side_force_n"], "large_force",
                 help=f"Pushes the ship {side} (positive = to starboard); taken by the hull's "
                      "leeway and rudder."),
        Headline("lift_n", "Lift", one["lift_n"], "large_force",
                 help="All rotors; perpendicular to the apparent wind."),
        Headline("drag_n", "Drag", one["drag_n"], "large_force",
                 help="All rotors; along the apparent wind."),
        Headline("rpm", "Rotor speed", one["rpm"], "rotation",
                 help=f"Rotor {state_text}; spins {spin} seen from above."),
        Headline("apparent_wind_speed_m_s", "Apparent wind at mid-height", one["apparent_wind_speed_m_s"],
                 "wind_speed", help="Ship's own wind plus the true wind at the rotor's mid-height."),
        Headline("apparent_wind_angle_deg", "Apparent wind angle", one["apparent_wind_angle_deg"],
                 "angle", help="Off the bow at mid-height: + from starboard, - from port."),
        Headline("spin_ratio", "Spin ratio", one["spin_ratio"], "ratio",
                 help="Surface speed / apparent wind at mid-height; along the span it runs from "
                      f"{one['spin_ratio_span_min']:.2f} to {one['spin_ratio_span_max']:.2f}."),
        Headline("lift_coefficient", "Lift coefficient", one["lift_coefficient"], "ratio",
                 help="Lift of one rotor / (q at mid-height × D × H)."),
        Headline("drag_coefficient", "Drag coefficient", one["drag_coefficient"], "ratio",
                 help="Drag of one rotor / (q at mid-height × D × H), with the induced drag for "
                      "this rotor's aspect ratio."),
    )


def summary(result: StudyResult, system: str = "SI") -> str:
    """What the rotors do at this point, in words (``**`` marks the numbers): the state and why,
    and both spin-power estimates with the net gain each gives. The page writes it under the
    headlines and the handout under its title.

    Parameters
    ----------
    result : StudyResult
        A rotor study result.
    system : {"SI", "imperial"}
        Unit system of the numbers.

    Returns
    -------
    str
        Two to three sentences.

    Notes
    -----
    The net gain with the other spin-power estimate is the same thrust with the other power:
    net' = net + (P_used - P_other) / eta_el, with eta_el the electrical efficiency; the spin is
    not searched again for it.
    """
    d = result.detail
    one = d.operation.at(())
    setup = d.setup

    def q(x, kind):
        return units.quantity_text(x, kind, system)

    state = int(one["state"])
    if state == rotor.STOPPED:
        net = float(one["net_power_w"])
        why = (f"no spin gains more than **{q(setup.min_gain_w, 'power')}**, the smallest worthwhile gain"
               if d.spin_mode == "best" else "the spin asked for is zero")
        cost = (f" Still, their drag costs **{q(-net, 'power')}** of engine power in this wind."
                if net < 0 else "")
        return f"The rotors are **stopped**: {why}.{cost}"
    limits = [name for bit, name in ((rotor.FLAG_RPM, "rotor speed"), (rotor.FLAG_MOTOR_POWER, "motor power"),
                                     (rotor.FLAG_HEEL, "heeling moment"),
                                     (rotor.FLAG_SPIN_RATIO_LIMIT, "spin ratio"))
              if int(one.get("flags", 0)) & bit]
    lead = (f"The rotors run **at their {' and '.join(limits) or 'a'} limit**." if state == rotor.AT_LIMIT
            else "The rotors **run** at the best spin within the limits." if d.spin_mode == "best"
            else "The rotors run at the spin asked for.")
    used = float(one["spin_power_w"])
    other = other_spin_power(result)
    if other is None:
        return (f"{lead} Spin power **{q(used, 'power')}** from the skin-friction model: the set has no "
                "power coefficient to compare with.")
    used_name = "the set's power coefficient" if setup.power_from_set else "the skin-friction model"
    other_name = "the skin-friction model" if setup.power_from_set else "the set's power coefficient"
    return (f"{lead} Spin power **{q(used, 'power')}** from {used_name} (drives the net gain); "
            f"{other_name} gives **{q(other[0], 'power')}**, which would make the net gain "
            f"**{q(other[1], 'power')}** at the same spin.")


def other_spin_power(result: StudyResult) -> tuple[float, float] | None:
    """The spin-power estimate not chosen, and the net gain it gives at the same spin.

    Parameters
    ----------
    result : StudyResult
        A rotor study result.

    Returns
    -------
    tuple of float or None
        (spin power of all rotors [W], net power gain [W]); ``None`` when the set has no power
        coefficient (only the skin-friction model exists).

    Notes
    -----
    Same thrust, other power: net' = net + (P_used - P_other) / eta_el, eta_el the electrical
    efficiency.
    """
    d = result.detail
    one = d.operation.at(())
    if d.operation.spin_power_set_w is None:
        return None
    other = float(one["spin_power_friction_w"] if d.setup.power_from_set else one["spin_power_set_w"])
    net = float(one["net_power_w"]) + (float(one["spin_power_w"]) - other) / d.setup.electrical_efficiency
    return other, net


def run(values: dict, progress=None, extra=None) -> StudyResult:
    prog = progress or (lambda fraction, text="": None)
    prog(0.05, "Rotor setup")
    setup, op = operating_point(values, extra)
    air = air_state_from_inputs(values)
    vs, vt = values["ship_speed_m_s"], values["true_wind_speed_m_s"]
    twa_deg = relative_wind_angle_deg(values)
    angles = np.radians(SWEEP_ANGLES_DEG)
    prog(0.25, "Every coefficient set")
    comparisons = []
    for cs in _comparison_sets(values, setup.coefficients, extra):
        s = rotor.with_coefficients(setup, cs)
        one = operate(s, values, vs, vt, math.radians(twa_deg))
        comparisons.append(SetComparison(cs, one, operate(s, values, vs, vt, angles),
                                         rotor.coefficient_curves(s, float(one.apparent_wind_speed_m_s))))
    prog(0.7, "Wind along the rotor")
    sweep = next(c.sweep for c in comparisons if c.coefficients is setup.coefficients)
    span = rotor.span_profile(setup, vs, vt, math.radians(twa_deg), float(op.rpm))
    detail = RotorStudyDetail(setup=setup, air=air, ship_speed_m_s=vs, true_wind_speed_m_s=vt,
                              true_wind_angle_deg=twa_deg, spin_mode=values["spin_mode"],
                              operation=op, sweep=sweep, sweep_angles_deg=SWEEP_ANGLES_DEG,
                              comparisons=tuple(comparisons), span=span)
    warnings = merge(op.warnings, air.warnings)
    prog(0.85, "Charts")
    figures = rotor_charts(detail, "SI")
    tables = {"operating_point": operating_table(detail), "coefficient_sets": sets_table(detail),
              "wind_angle_sweep": sweep_table(detail), "along_the_rotor": span_table(detail)}
    prog(1.0, "Done")
    return StudyResult(kind=KIND, inputs=dict(values), headlines=headlines(op) + hull_headlines(op, setup),
                       warnings=warnings,
                       figures=figures, tables=tables, detail=detail, json=json_result(op, warnings, setup))


# ----------------------------------------------------------------------------- display units
def figures_in_units(result: StudyResult, system: str) -> tuple:
    """The charts of ``result`` with forces, powers, speeds and heights in ``system``'s units."""
    return result.figures if system == "SI" else rotor_charts(result.detail, system)


def rotor_charts(detail, system: str = "SI") -> Charts:
    """The rotor study's charts in ``system``, each drawn when first looked at."""
    f = figures_rotor
    return Charts((
        ("Lift and drag against spin ratio", lambda: f.lift_drag_figure(detail, system)),
        ("Spin-power coefficient against spin ratio", lambda: f.coefficient_figure(detail, "power", system)),
        ("Thrust and net power gain around the compass", lambda: f.polar_figure(detail, system)),
        ("Wind along the rotor height", lambda: f.span_figure(detail, system)),
    ))


#: Plain words and quantity kind of every core-unit key of the operating point (rotor-set totals).
OPERATING_UNITS = {
    "apparent_wind_speed_m_s": ("apparent wind speed at mid-height", "wind_speed"),
    "apparent_wind_angle_deg": ("apparent wind angle at mid-height", "angle"),
    "apparent_wind_speed_ref_m_s": ("apparent wind speed at the height of the given wind", "wind_speed"),
    "apparent_wind_angle_ref_deg": ("apparent wind angle at the height of the given wind", "angle"),
    "spin_ratio": ("spin ratio at mid-height", "ratio"),
    "spin_ratio_span_min": ("spin ratio along the rotor, lowest", "ratio"),
    "spin_ratio_span_max": ("spin ratio along the rotor, highest", "ratio"),
    "rpm": ("rotor speed", "rotation"), "reynolds_number": ("Reynolds number", "ratio"),
    "lift_coefficient": ("lift coefficient", "ratio"), "drag_coefficient": ("drag coefficient", "ratio"),
    "power_coefficient": ("spin-power coefficient", "ratio"), "lift_n": ("lift", "large_force"),
    "drag_n": ("drag", "large_force"), "thrust_n": ("thrust", "large_force"),
    "side_force_n": ("side force", "large_force"), "heeling_moment_nm": ("heeling moment", "moment"),
    "yaw_moment_nm": ("yaw moment", "moment"), "spin_power_w": ("spin power (shaft)", "power"),
    "spin_power_set_w": ("spin power from the set's power coefficient", "power"),
    "spin_power_friction_w": ("spin power from the skin-friction model", "power"),
    "electrical_power_w": ("electric power drawn", "power"),
    "propulsion_power_saved_w": ("engine power saved", "power"),
    "net_power_w": ("net power gain", "power"),
}
#: Plain names for the core tables' columns before conversion (then the kinds below apply).
DISPLAY_NAMES = {"rpm": "rotor_speed_rpm", "net_power_w": "net_power_gain_w", "sr_range": "spin_ratio_range",
                 "reynolds_range": "Reynolds_number_range", "thrust_per_m_n_m": "thrust_per_length_n_m"}
SETS_UNITS = {"spin_ratio": "ratio", "rotor_speed_rpm": "rotation", "thrust_n": "large_force",
              "spin_power_w": "power", "net_power_gain_w": "power"}
#: Where each set comes from (a table of its own: the sources are long).
SOURCE_COLUMNS = {"set": "ratio", "kind": "ratio", "aspect_ratio": "ratio", "end_plate_ratio": "ratio",
                  "spin_ratio_range": "ratio", "Reynolds_number_range": "ratio", "source": "ratio"}
SWEEP_UNITS = {"true_wind_angle_deg": "angle", "apparent_wind_angle_deg": "angle", "spin_ratio": "ratio",
               "rotor_speed_rpm": "rotation", "thrust_n": "large_force", "side_force_n": "large_force", "heeling_moment_nm": "moment",
               "spin_power_w": "power", "net_power_gain_w": "power"}
SPAN_UNITS = {"height_m": "length", "true_wind_speed_m_s": "wind_speed",
              "apparent_wind_speed_m_s": "wind_speed", "apparent_wind_angle_deg": "angle",
              "spin_ratio": "ratio", "thrust_per_length_n_m": "force_per_span"}
STATE_WORDS = {rotor.STOPPED: "stopped", rotor.RUNNING: "running", rotor.AT_LIMIT: "at a limit"}


def tables_in_units(result: StudyResult, system: str) -> dict:
    """The study's tables in ``system``'s units, the unit in each column name (the operating point
    as quantity, value, unit rows); the sweep gives the rotor state in words."""
    d = result.detail
    one = d.operation.at(())
    rows = [(label, one.get(k, math.nan), kind) for k, (label, kind) in OPERATING_UNITS.items()]
    rows.append(("rotor state (0 stopped, 1 running, 2 at a limit)", float(one["state"]), "ratio"))
    op = quantity_table(rows, system)
    def shown(name, kinds):
        return table_in_units(result.tables[name].rename(columns=DISPLAY_NAMES), kinds, system)

    every = shown("coefficient_sets", {**SOURCE_COLUMNS, **SETS_UNITS})
    sets = every[["set"] + [column_label(c, k, system) for c, k in SETS_UNITS.items()] + ["chosen"]]
    sources = every[[column_label(c) for c in SOURCE_COLUMNS]]
    sweep = shown("wind_angle_sweep", SWEEP_UNITS)
    sweep["state"] = [STATE_WORDS[int(x)] for x in sweep["state"]]
    span = shown("along_the_rotor", SPAN_UNITS)
    return {"operating_point": op, "coefficient_sets": sets, "coefficient_set_sources": sources,
            "wind_angle_sweep": sweep, "along_the_rotor": span}


# ----------------------------------------------------------------------------- tables (SI)
def operating_table(d: RotorStudyDetail) -> pd.DataFrame:
    one = d.operation.at(())
    rows = [(k, one.get(k, math.nan)) for k in ("apparent_wind_speed_m_s", "apparent_wind_angle_deg",
                                   "apparent_wind_speed_ref_m_s", "apparent_wind_angle_ref_deg",
                                   "spin_ratio", "spin_ratio_span_min", "spin_ratio_span_max", "rpm",
                                   "reynolds_number", "lift_coefficient", "drag_coefficient",
                                   "power_coefficient", "lift_n", "drag_n", "thrust_n",
                                   "side_force_n", "heeling_moment_nm", "yaw_moment_nm",
                                   "spin_power_w", "spin_power_set_w", "spin_power_friction_w",
                                   "electrical_power_w", "propulsion_power_saved_w",
                                   "net_power_w", "state")]
    return pd.DataFrame(rows, columns=["quantity", "value"])


def sets_table(d: RotorStudyDetail) -> pd.DataFrame:
    rows = []
    for c in d.comparisons:
        one = c.operation.at(())
        cs = c.coefficients
        rows.append({"set": cs.label, "short": cs.label.split(" (")[0], "kind": cs.kind,
                     "aspect_ratio": cs.aspect_ratio,
                     "end_plate_ratio": cs.end_plate_ratio,
                     "sr_range": f"{cs.sr_range[0]:g} to {cs.sr_range[1]:g}",
                     "reynolds_range": f"{cs.reynolds_range[0]:.2g} to {cs.reynolds_range[1]:.2g}",
                     "spin_ratio": one["spin_ratio"], "rpm": one["rpm"], "thrust_n": one["thrust_n"],
                     "spin_power_w": one["spin_power_w"], "net_power_w": one["net_power_w"],
                     "chosen": cs is d.setup.coefficients, "source": cs.source})
    return pd.DataFrame(rows)


def sweep_table(d: RotorStudyDetail) -> pd.DataFrame:
    s = d.sweep
    return pd.DataFrame({"true_wind_angle_deg": d.sweep_angles_deg,
                         "apparent_wind_angle_deg": s.apparent_wind_angle_deg,
                         "spin_ratio": s.spin_ratio, "rpm": s.rpm, "thrust_n": s.thrust_n,
                         "side_force_n": s.side_force_n, "heeling_moment_nm": s.heeling_moment_nm,
                         "spin_power_w": s.spin_power_w, "net_power_w": s.net_power_w,
                         "state": s.state})


def span_table(d: RotorStudyDetail) -> pd.DataFrame:
    p = d.span
    return pd.DataFrame({"height_m": p.height_m, "true_wind_speed_m_s": p.true_wind_speed_m_s,
                         "apparent_wind_speed_m_s": p.apparent_wind_speed_m_s,
                         "apparent_wind_angle_deg": p.apparent_wind_angle_deg,
                         "spin_ratio": p.spin_ratio, "thrust_per_m_n_m": p.thrust_per_m_n_m})
