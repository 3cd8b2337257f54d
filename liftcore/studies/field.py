"""Study ``field``: circulation and lift per span from a gridded velocity field (measured or CFD).

``extra`` is the uploaded table (columns x, y, u, v; see :mod:`liftcore.fieldcirc`); without it
the invented demo field is used.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pandas as pd

from liftcore import fieldcirc as fc
from liftcore import figures_flow as ff
from liftcore import units
from liftcore.air import air_inputs, air_state_from_inputs
from liftcore.errors import InputError
from liftcore.inputs import InputSpec, choice, integer, number
from liftcore.studies import Charts, Headline, StudyResult, table_in_units
from liftcore.validity import mach_warning, merge

KIND = "field"
TITLE = "Circulation from a measured field"

INPUTS = InputSpec(KIND, (
    number("body_x_m", "Body centre x", "length", 0.0, -10000.0, 10000.0, section="Body", step=0.01,
           help="Where the body's centre is, in the field's own coordinates."),
    number("body_y_m", "Body centre y", "length", 0.0, -10000.0, 10000.0, section="Body", step=0.01),
    number("body_radius_m", "Body radius", "length", 0.05, 1e-4, 1000.0, section="Body",
           help="Loops must stay at least one grid cell outside this radius."),
    choice("loop_shape", "Loop shape", fc.LOOP_SHAPES, default="circle",
           labels=("Circles", "Rectangles"), section="Loops"),
    number("rectangle_aspect", "Rectangle width / height", "ratio", 1.0, 0.2, 5.0, section="Loops",
           step=0.1, help="Width over height of the rectangular loops (1 = squares)."),
    number("loop_min_m", "Smallest loop size", "length", 0.08, 1e-4, 10000.0, section="Loops",
           help="Circle radius, or rectangle half-height, of the smallest loop."),
    number("loop_max_m", "Largest loop size", "length", 0.28, 1e-4, 10000.0, section="Loops",
           help="Circle radius, or rectangle half-height, of the largest loop; it must fit in the grid."),
    integer("loop_count", "Number of loops", 12, 2, 200, section="Loops",
            help="Loops evenly spaced in size from the smallest to the largest. The outer half "
                 "count toward the estimate and its spread."),
    choice("free_stream_mode", "Free-stream speed", ("edges", "given"), default="edges",
           labels=("From the grid edges", "Given"), section="Free stream and fluid",
           help="The edge estimate is the mean velocity round the outer edge of the grid."),
    number("free_stream_m_s", "Given free-stream speed", "speed", 10.0, 0.001, 1000.0,
           section="Free stream and fluid"),
    choice("density_mode", "Fluid density", ("air", "given"), default="air",
           labels=("Air (air state below)", "Given (e.g. water)"), section="Free stream and fluid"),
    number("density_kg_m3", "Given density", "density", 1.225, 0.01, 2000.0,
           section="Free stream and fluid", help="For water about 998 kg/m³ at 20 °C (common practice)."),
) + air_inputs(when=lambda v: v["density_mode"] == "air")).with_rules({
    "rectangle_aspect": lambda v: v["loop_shape"] == "rectangle",
    "free_stream_m_s": lambda v: v["free_stream_mode"] == "given",
    "density_kg_m3": lambda v: v["density_mode"] == "given",
})

SOURCES = fc.REFERENCES + (
    "ISO 2533:1975 Standard Atmosphere (air density).",
)

CAUTIONS = (
    "Lift from a measured field is only as good as the field: check the loops settle before "
    "trusting the number, and treat the spread as a lower bound on the uncertainty. For "
    "structural, stability or safety decisions defer to classification rules, local codes and "
    "licensed engineers.",
)

DEMO_NOTE = ("The field shown is the invented demo field (ideal flow round a spinning cylinder "
             "with a made-up wake and noise), not a measurement. Upload your own CSV to replace it.")


#: Quantity kinds of the loops table's columns (for display in other units).
LOOP_UNITS = {"loop_size_m": "length", "circulation_m2_s": "circulation"}


@dataclass(frozen=True)
class FieldDetail:
    """The field the loops ran over and what they found (the charts need both)."""

    field: fc.VelocityField
    circulation: fc.CirculationResult


def field_figures(field, res, system: str = "SI") -> tuple:
    """(title, figure) pairs of the study in ``system``'s display units."""
    return Charts((
        ("Velocity field and loops", lambda: ff.field_map_figure(field, res, system=system)),
        ("Circulation against loop size", lambda: ff.circulation_figure(res, system)),
    ))


def figures_in_units(result: StudyResult, system: str) -> tuple:
    """The charts of ``result`` in ``system``'s display units."""
    if system == "SI":
        return result.figures
    return field_figures(result.detail.field, result.detail.circulation, system)


def tables_in_units(result: StudyResult, system: str) -> dict:
    """The loops table in ``system``'s units, with the unit in each column name."""
    out = table_in_units(result.tables["loops"], LOOP_UNITS, system)
    res = result.detail.circulation
    lu = units.unit_label("length", system)
    sizes = units.to_display(np.asarray(res.loop_sizes_m, dtype=float), "length", system)
    if res.loop_shape == "circle":
        out["loop"] = [f"circle, radius {s:.4g} {lu}" for s in sizes]
    else:
        out["loop"] = [f"rectangle, {2 * res.rectangle_aspect * s:.4g} {lu} wide, {2 * s:.4g} {lu} high"
                       for s in sizes]
    return {"loops": out}


def run(values: dict, progress=None, extra=None) -> StudyResult:
    if progress:
        progress(0.02, "Checking the field")
    table = fc.demo_field_table() if extra is None else extra
    field = fc.field_from_table(table)
    lo, hi, n = values["loop_min_m"], values["loop_max_m"], int(values["loop_count"])
    if lo >= hi:
        raise InputError("smallest loop size", f"smallest loop size must be less than the largest "
                                               f"(got {lo:.4g} m and {hi:.4g} m)")
    air = air_state_from_inputs(values)
    rho = air.density_kg_m3 if values["density_mode"] == "air" else values["density_kg_m3"]
    given = values["free_stream_m_s"] if values["free_stream_mode"] == "given" else None

    def loop_progress(frac, text):
        if progress:
            progress(0.1 + 0.7 * frac, text)

    res = fc.circulation_from_field(field, (values["body_x_m"], values["body_y_m"]),
                                    values["body_radius_m"], np.linspace(lo, hi, n), rho,
                                    shape=values["loop_shape"], aspect=values["rectangle_aspect"],
                                    free_stream_speed_m_s=given, progress=loop_progress)
    if progress:
        progress(0.85, "Figures")
    warnings = res.warnings
    if values["density_mode"] == "air":
        warnings = merge(warnings, air.warnings,
                         mach_warning(res.free_stream_speed_m_s, air.speed_of_sound_m_s, "lift_per_span_n_m"))
    figures = field_figures(field, res, "SI")
    loops = pd.DataFrame({"loop_size_m": res.loop_sizes_m, "circulation_m2_s": res.circulations_m2_s,
                          "counted": res.settled, "loop": res.loop_labels})
    headlines = (
        Headline("circulation_m2_s", "Circulation Γ (outer loops)", res.circulation_m2_s, "circulation", 4,
                 "Mean over the outer half of the loops; positive is clockwise."),
        Headline("circulation_spread_m2_s", "Loop-to-loop spread ±", res.circulation_spread_m2_s,
                 "circulation", 2, "Half the range of the outer loops' circulations."),
        Headline("lift_per_span_n_m", "Lift per unit span ρVΓ", res.lift_per_span_n_m,
                 "force_per_span", 4, "Kutta-Joukowski with the free-stream speed and density used."),
        Headline("lift_spread_n_m", "Lift spread ±", res.lift_spread_n_m, "force_per_span", 2),
        Headline("free_stream_speed_m_s", "Free-stream speed", res.free_stream_speed_m_s, "speed", 4),
        Headline("lift_direction_deg", "Lift direction", res.lift_direction_deg, "angle", 3,
                 "Counter-clockwise from +x; at right angles to the free stream, toward the side "
                 "where the flow is faster."),
        Headline("density_kg_m3", "Fluid density", rho, "density", 4),
        Headline("grid_points", "Grid points", float(field.x_m.size * field.y_m.size), "ratio", 6,
                 f"{field.x_m.size} x {field.y_m.size}, spacing {field.spacing_m[0]:.3g} m by "
                 f"{field.spacing_m[1]:.3g} m"),
    )
    data = res.as_json()
    data["field_source"] = "invented demo field" if extra is None else "uploaded field"
    if progress:
        progress(1.0, "Done")
    return StudyResult(kind=KIND, inputs=dict(values), headlines=headlines, warnings=warnings,
                       figures=figures, tables={"loops": loops}, detail=FieldDetail(field, res),
                       json=data)
