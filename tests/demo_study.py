"""A small study used only by the tests of scenarios, share links, reports and the command line,
so that machinery is tested on the study contract before (and besides) the real pages.

Physics: the ideal spinning cylinder (Kutta-Joukowski), lift per span L' = rho V Gamma with the
no-slip idealisation Gamma = 2 pi R (omega R); analytic, so results can be checked exactly.
"""

from __future__ import annotations

import math
import sys

import numpy as np
import pandas as pd
import plotly.graph_objects as go

from liftcore.inputs import InputSpec, choice, flag, integer, number, text
from liftcore.studies import Headline, StudyResult
from liftcore.validity import ModelWarning

KIND = "demo"
MODULE = "demo_for_tests"
TITLE = "Demo study for tests (invented)"
INPUTS = InputSpec(KIND, (
    number("diameter_m", "Cylinder diameter", "length", 2.0, 0.1, 20.0, section="Cylinder"),
    number("span_m", "Span", "length", 10.0, 0.5, 50.0, section="Cylinder"),
    number("spin_rpm", "Spin", "rotation", 120.0, 0.0, 1000.0, section="Cylinder"),
    number("wind_speed_m_s", "Wind speed", "wind_speed", 8.0, 0.5, 40.0, section="Air"),
    number("temperature_k", "Air temperature", "temperature", 288.15, 223.15, 323.15, section="Air"),
    integer("count", "Number of cylinders", 1, 1, 4, section="Cylinder"),
    choice("surface", "Surface", ("smooth", "rough"), labels=("Smooth", "Rough"), section="Cylinder"),
    flag("with_band", "Show a band", False, section="Chart"),
    text("label", "Label", "invented", section="Chart"),
))
SOURCES = ("Kutta-Joukowski theorem (any aerodynamics textbook): L' = rho V Gamma.",)
CAUTIONS = ("Test-only study: ideal flow overstates real lift.",)
COMPARE_FIGURE = 0
#: air density used by the demo (ideal gas at 101325 Pa, R = 287.05 J/(kg K))
P0, R_AIR = 101325.0, 287.05


def run(values: dict, progress=None, extra=None) -> StudyResult:
    d, span, rpm = values["diameter_m"], values["span_m"], values["spin_rpm"]
    v, t, n = values["wind_speed_m_s"], values["temperature_k"], values["count"]
    rho = P0 / (R_AIR * t)
    r = d / 2
    omega = rpm * 2 * math.pi / 60
    gamma = 2 * math.pi * r * (omega * r)
    lift = rho * v * gamma * span * n
    sr = omega * r / v
    if progress:
        progress(0.5, "lift")
    speeds = np.linspace(0.5, 40.0, 30)
    lift_curve = rho * speeds * gamma * span * n
    fig = go.Figure(go.Scatter(x=speeds, y=lift_curve / 1000, name="ideal lift"))
    if values["with_band"]:
        fig.add_trace(go.Scatter(x=list(speeds) + list(speeds[::-1]),
                                 y=list(0.5 * lift_curve / 1000) + list(lift_curve[::-1] / 1000),
                                 fill="toself", name="band"))
    fig.update_layout(xaxis_title="wind speed [m/s]", yaxis_title="lift [kN]")
    heat = go.Figure(go.Heatmap(z=[[1, 2], [3, 4]]))
    warnings = ()
    if sr > 4:
        warnings = (ModelWarning("spin_ratio_high", f"spin ratio {sr:.3g} is above 4", "spin_ratio"),)
    if values["surface"] == "rough":
        warnings += (ModelWarning("rough", "rough surface is not modelled"),)
    if progress:
        progress(1.0, "done")
    table = pd.DataFrame({"wind_speed_m_s": speeds, "lift_n": lift_curve})
    return StudyResult(
        kind=KIND, inputs=dict(values),
        headlines=(Headline("lift_n", "Lift", lift, "force", 4),
                   Headline("spin_ratio", "Spin ratio", sr, "ratio", 3),
                   Headline("temperature_k", "Air temperature", t, "temperature", 4)),
        warnings=warnings,
        figures=(("Ideal lift against wind speed", fig), ("A map", heat)),
        tables={"lift curve": table},
        json={"lift_n": lift, "spin_ratio": sr, "density_kg_m3": rho},
    )


def register(monkeypatch) -> None:
    """Make this module the study of kind ``demo`` for one test."""
    from liftcore import studies

    monkeypatch.setitem(studies.STUDY_MODULES, KIND, MODULE)
    monkeypatch.setitem(sys.modules, f"liftcore.studies.{MODULE}", sys.modules[__name__])
