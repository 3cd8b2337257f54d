"""Study ``flow``: the ideal (potential) flow round a spinning cylinder and its Kutta-Joukowski lift."""

from __future__ import annotations

import numpy as np
import pandas as pd

from liftcore import figures_flow as ff
from liftcore import potential as pot
from liftcore import units
from liftcore.air import air_inputs, air_state_from_inputs
from liftcore.inputs import InputSpec, choice, number
from liftcore.studies import Charts, Headline, StudyResult, table_in_units
from liftcore.validity import merge

KIND = "flow"
TITLE = "Flow around a spinning cylinder"

INPUTS = InputSpec(KIND, (
    number("radius_m", "Cylinder radius", "length", 0.5, 0.001, 50.0, section="Cylinder and flow",
           help="Radius of the circular cylinder (half its diameter)."),
    number("speed_m_s", "Flow speed", "speed", 8.0, 0.1, 200.0, section="Cylinder and flow",
           help="Speed of the undisturbed stream, flowing left to right in the pictures."),
    choice("spin_mode", "Give the spin as", ("ratio", "rpm"), default="ratio",
           labels=("Spin ratio", "Rotation rate (rpm)"), section="Spin",
           help="Spin ratio SR = ωR/V, or the rotation rate, from which SR follows."),
    number("spin_ratio", "Spin ratio ωR/V", "ratio", 1.0, -10.0, 10.0, section="Spin", step=0.1,
           help="Positive: clockwise in the pictures, the top surface moves with the stream and "
                "the lift points up. Negative: the other way round."),
    number("spin_rpm", "Rotation rate", "rotation", 150.0, -100000.0, 100000.0, section="Spin",
           step=10.0, help="Revolutions per minute; positive is clockwise in the pictures (lift up)."),
) + air_inputs()).with_rules({
    "spin_ratio": lambda v: v["spin_mode"] == "ratio",
    "spin_rpm": lambda v: v["spin_mode"] == "rpm",
})

ROUND_OFF_RESOLUTION = pot.ROUND_OFF_RESOLUTION

SOURCES = pot.REFERENCES + (
    "ISO 2533:1975 Standard Atmosphere (air density, speed of sound).",
    "Alduchov, O. A. and Eskridge, R. E. (1996). Improved Magnus form approximation of saturation "
    "vapor pressure. J. Appl. Meteor. 35, 601-609 (humid air).",
)

CAUTIONS = (
    "Ideal-flow numbers explain why a spinning cylinder makes lift; they are not design loads. "
    "Real rotating cylinders (rotor sails, spinning balls) make far less lift, have drag and "
    "unsteady loads. For structural, stability or safety decisions use measured coefficients and "
    "defer to classification rules, local codes and licensed engineers.",
)

SIGN_CONVENTION = (
    "Sign convention: the stream flows left to right (+x) and y points up. Positive spin is "
    "clockwise in the pictures: the top surface moves with the stream, the air over the top "
    "speeds up and the lift points up (+y). Negative spin lifts downward. Angles round the "
    "surface run counter-clockwise from the rear point (0°): 90° top, 180° front, 270° bottom."
)


def spin_rate(values: dict) -> float:
    """Rotation rate [rad/s] from the inputs (spin ratio or rpm)."""
    if values["spin_mode"] == "rpm":
        return float(values["spin_rpm"]) * pot.RAD_S_PER_RPM
    return float(pot.spin_rate_from_ratio(values["spin_ratio"], values["radius_m"], values["speed_m_s"]))


def stagnation_text(res: pot.IdealCylinderResult) -> str:
    """Plain words for where the stagnation points are."""
    angles = " and ".join(f"{a:.1f}°" for a in res.stagnation_angles_deg)
    if res.stagnation_on_surface and len(res.stagnation_angles_deg) == 2:
        return f"Two stagnation points on the surface, at {angles}."
    if res.stagnation_on_surface:
        return f"The two stagnation points have merged on the surface at {angles} (spin ratio 2)."
    side = "below" if res.stagnation_points_m[0][1] < 0 else "above"
    return (f"The stagnation point has left the surface: it sits in the flow {side} the body, "
            f"{res.stagnation_distance_m / res.radius_m:.3g} radii from the centre "
            f"({res.stagnation_distance_m:.3g} m); the air inside that streamline turns with the body.")


#: Quantity kinds of the surface table's columns (for display in other units).
SURFACE_UNITS = {"angle_deg": "angle", "surface_speed_m_s": "speed", "pressure_coefficient": "ratio"}
#: Unit of the surface pressure difference per unit system (Pint string, label): a few pascals,
#: so not the barometric hPa or inHg of the ``pressure`` kind.
PRESSURE_DIFFERENCE_UNITS = {"SI": ("Pa", "Pa"), "marine": ("Pa", "Pa"), "imperial": ("lbf/ft^2", "lbf/ft²")}


def flow_figures(res: pot.IdealCylinderResult, system: str = "SI") -> tuple:
    """(title, figure) pairs of the study; positions are in body radii and Cp and CL have no
    unit, so only the named radius, stream speed and point positions follow ``system``."""
    return Charts((
        ("Streamlines", lambda: ff.streamlines_figure(res, system=system)),
        ("Surface pressure", lambda: ff.surface_pressure_figure(res)),
        ("Pressure integral check", lambda: ff.pressure_check_figure(res)),
        ("Ideal lift coefficient", lambda: ff.ideal_lift_figure(res)),
    ))


def figures_in_units(result: StudyResult, system: str) -> tuple:
    """The charts of ``result`` in ``system``'s display units."""
    return result.figures if system == "SI" else flow_figures(result.detail, system)


def tables_in_units(result: StudyResult, system: str) -> dict:
    """The surface table in ``system``'s units, with the unit in each column name."""
    table = result.tables["surface"]
    out = table_in_units(table, SURFACE_UNITS, system)
    unit, label = PRESSURE_DIFFERENCE_UNITS[system]
    out["pressure_difference_pa"] = units.convert(table["pressure_difference_pa"].to_numpy(), "Pa", unit)
    return {"surface": out.rename(columns={"pressure_difference_pa": f"pressure difference [{label}]"})}


def run(values: dict, progress=None, extra=None) -> StudyResult:
    if progress:
        progress(0.05, "Air state")
    air = air_state_from_inputs(values)
    res = pot.ideal_spinning_cylinder(values["radius_m"], values["speed_m_s"], spin_rate(values),
                                      air.density_kg_m3, air.speed_of_sound_m_s)
    if progress:
        progress(0.4, "Flow field")
    figures = flow_figures(res, "SI")
    if progress:
        progress(0.9, "Tables")
    theta_deg = np.linspace(0.0, 360.0, 73)
    th = np.radians(theta_deg)
    q = pot.surface_tangential_velocity(th, res.speed_m_s, res.radius_m, res.circulation_m2_s)
    surface = pd.DataFrame({
        "angle_deg": theta_deg,
        "surface_speed_m_s": np.abs(q),
        "pressure_coefficient": 1.0 - (q / res.speed_m_s) ** 2,
        "pressure_difference_pa": 0.5 * res.density_kg_m3 * res.speed_m_s ** 2 * (1.0 - (q / res.speed_m_s) ** 2),
    })
    headlines = (
        Headline("spin_ratio", "Spin ratio ωR/V", res.spin_ratio, "ratio", 3,
                 "Surface speed over flow speed; positive spins clockwise (lift up)."),
        Headline("spin_rpm", "Rotation rate", res.spin_rpm, "rotation", 4),
        Headline("circulation_m2_s", "Circulation Γ = 2πR·ωR", res.circulation_m2_s, "circulation", 4,
                 "No-slip idealisation: surface speed times circumference."),
        Headline("lift_per_span_n_m", "Ideal lift per unit span ρVΓ", res.lift_per_span_n_m,
                 "force_per_span", 4, "Kutta-Joukowski; positive is up in the pictures."),
        Headline("lift_coefficient", "Lift coefficient CL = 2π SR", res.lift_coefficient, "ratio", 4,
                 "On the diameter: L' / (½ρV²·2R)."),
        Headline("lift_coefficient_from_pressure", "CL from the surface pressure",
                 res.lift_coefficient_from_pressure, "ratio", 6,
                 "Integral of the surface pressure, computed independently of Kutta-Joukowski."),
        Headline("drag_coefficient_from_pressure", "CD from the surface pressure",
                 res.drag_coefficient_from_pressure, "ratio", 2,
                 "Zero in ideal flow (d'Alembert); the integral gives it to round-off.",
                 resolution=ROUND_OFF_RESOLUTION,
                 resolution_note=f"agrees with 0 to round-off (|CD| < {ROUND_OFF_RESOLUTION:g})"),
        Headline("density_kg_m3", "Air density", air.density_kg_m3, "density", 4),
    )
    return StudyResult(kind=KIND, inputs=dict(values), headlines=headlines,
                       warnings=merge(res.warnings, air.warnings), figures=figures,
                       tables={"surface": surface}, detail=res, json=res.as_json())
