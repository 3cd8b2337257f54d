"""Charts for ball flight: trajectory (3-D, side, top), values along the flight, landing spread,
sweep heat map, coefficient curves and track-fit residuals.

Every builder takes core (SI) results and a unit system, converts at the edge through
:mod:`liftcore.units`, and starts from :func:`liftcore.figures.base_figure`.
"""

from __future__ import annotations

import numpy as np
import plotly.graph_objects as go

from liftcore import units
from liftcore.figures import DIVERGING, FONT_SIZE, LINE_WIDTH, SEQUENTIAL, base_figure, colour, finish

AXIS_WORDS = {"x_m": "Downrange", "lateral_m": "Drift (right +)", "z_m": "Height"}


def _u(value, kind, system):
    return units.to_display(value, kind, system)


def _lbl(text, kind, system):
    u = units.unit_label(kind, system)
    return f"{text} [{u}]" if u else text


#: Shape of the 3-D box and where it is seen from (in box units): the whole box with its axis
#: labels stays inside a chart down to about 1.2 times as wide as its plot is high (the handout's
#: 680 px chart); WebGL scenes fit their height and crop their sides in narrower charts.
SCENE_ASPECT = dict(x=1.7, y=0.8, z=0.65)
SCENE_EYE = dict(x=-1.6, y=-1.75, z=0.8)
SCENE_CENTRE = dict(x=0.0, y=0.0, z=-0.05)


def _ticks_above_zero(top: float, n: int = 3) -> list[float]:
    """Round tick values (1, 2 or 5 times a power of ten) in (0, ``top``], as near ``n`` of them
    as such steps allow."""
    power = 10.0 ** np.floor(np.log10(top / n))
    steps = [m * power * f for f in (0.1, 1.0, 10.0) for m in (1.0, 2.0, 5.0)]
    step = min(steps, key=lambda st: (abs(np.floor(top / st + 1e-9) - n), st))
    return [float(f"{v:.10g}") for v in np.arange(step, top * (1 + 1e-9), step)]


def trajectory_3d(flights, system: str = "SI") -> go.Figure:
    """Where does the ball go? 3-D path of each flight (x downrange, drift right +, height)."""
    fig = base_figure("Flight path in 3-D", height=540)
    top = max([float(np.max(_u(f.path["z_m"], "length", system))) for f in flights] + [1e-3])
    for i, f in enumerate(flights):
        p = f.path
        fig.add_trace(go.Scatter3d(
            x=_u(p["x_m"], "distance", system), y=_u(p["lateral_m"], "distance", system),
            z=_u(p["z_m"], "length", system), mode="lines", name=f.label,
            line=dict(width=7, color=colour(i))))
        fig.add_trace(go.Scatter3d(
            x=[_u(f.carry_m, "distance", system)], y=[_u(f.lateral_m, "distance", system)], z=[0.0],
            mode="markers", marker=dict(size=6, color=colour(i), symbol="diamond"),
            name=f"{f.label}: landing", showlegend=False))
    fig.update_layout(scene=dict(
        xaxis_title=_lbl("Downrange", "distance", system),
        yaxis_title=_lbl("Drift, right +", "distance", system),
        zaxis_title=_lbl("Height", "length", system), aspectmode="manual",
        aspectratio=SCENE_ASPECT,
        # seen from behind and to the left of the launch point; drift to the right reads rightward
        # few ticks on the two short axes, whose labels meet at the near corner; the height's
        # zero (the ground) is left unlabelled so it does not sit on the drift axis' labels
        yaxis=dict(autorange="reversed", nticks=4),
        zaxis=dict(tickvals=_ticks_above_zero(top), range=[0.0, top * 1.05]),
        camera=dict(eye=SCENE_EYE, center=SCENE_CENTRE)),
        margin=dict(l=10, r=10))
    return finish(fig)


def _num(value, kind, system, digits: int = 3) -> str:
    return units.quantity_text(value, kind, system, digits)


#: Length of the drawn descent direction at the landing point, as a share of the carry.
DESCENT_RAY = 0.12


#: Colour of obstacles and targets (grey: context, not a flight).
OBSTACLE_COLOUR = "#555555"


def _draw_obstacles(fig: go.Figure, obstacles, system: str, view: str) -> None:
    """Walls, nets and goal frames as thick grey lines (side view: their height; top view: their
    width) and landing areas as dotted outlines, each named in the legend (nothing written over
    the flight's own labels)."""
    for i, o in enumerate(obstacles):
        d = float(_u(o.distance_m, "distance", system))
        line = dict(color=OBSTACLE_COLOUR, width=6 if o.kind != "land" else 3, dash="solid" if o.kind != "land" else "dot")
        if o.kind == "land":
            e = float(_u(o.end_m, "distance", system))
            w = float(_u(o.width_m / 2, "distance", system))
            x, y = ([d, e], [0.0, 0.0]) if view == "side" else ([d, e, e, d, d], [-w, -w, w, w, -w])
        elif view == "side":
            x, y = [d, d], [0.0, float(_u(o.height_m, "length", system))]
        elif o.width_m > 0:
            w = float(_u(o.width_m / 2, "distance", system))
            x, y = [d, d], [-w, w]
        else:  # a net across the whole width: drawn over the view's height
            fig.add_vline(x=d, line=dict(color=OBSTACLE_COLOUR, width=4))
            x, y = [d], [0.0]
            line = dict(color=OBSTACLE_COLOUR, width=4)
        what = {"over": "to clear", "through": "to go into", "land": "to land in"}[o.kind]
        fig.add_trace(go.Scatter(x=x, y=y, mode="lines", line=line, name=f"{o.name} ({what})", meta="context",
                                 hovertemplate=f"{o.name}: {o.rule}<extra></extra>"))


def side_view(flights, system: str = "SI", numbers: bool = True, obstacles=()) -> go.Figure:
    """How high and how far? Height against distance downrange. With ``numbers`` the first
    flight carries its results on the picture: the peak height at the apex, the carry at the
    landing point, and the descent angle drawn where it lands (with the landing speed)."""
    fig = base_figure("Side view: height against distance", _lbl("Downrange", "distance", system),
                      _lbl("Height", "length", system), height=440)
    for i, f in enumerate(flights):
        p = f.path
        fig.add_trace(go.Scatter(x=_u(p["x_m"], "distance", system), y=_u(p["z_m"], "length", system),
                                 mode="lines", name=f.label, line=dict(width=LINE_WIDTH, color=colour(i))))
        k = int(np.argmax(p["z_m"]))
        fig.add_trace(go.Scatter(x=[_u(p["x_m"][k], "distance", system)], y=[_u(p["z_m"][k], "length", system)],
                                 mode="markers", marker=dict(size=10, color=colour(i)), showlegend=False,
                                 hovertemplate="peak %{y:.1f} " + units.unit_label("length", system)
                                               + "<extra></extra>"))
    if numbers and flights:
        _numbers_on_side_view(fig, flights[0], system)
    _draw_obstacles(fig, obstacles, system, "side")
    fig.update_yaxes(rangemode="tozero")
    return finish(fig)


def _numbers_on_side_view(fig: go.Figure, f, system: str) -> None:
    p = f.path
    k = int(np.argmax(np.where(p["x_m"] <= f.carry_m + 1e-9, p["z_m"], -np.inf)))  # before any bounce
    x_peak, z_peak = _u(p["x_m"][k], "distance", system), _u(p["z_m"][k], "length", system)
    x_land = float(_u(f.carry_m, "distance", system))  # the first landing (a path may go on after a bounce)
    # the descent direction drawn back from the landing point, and a level line to read it on
    a = np.radians(f.descent_angle_deg)
    ray_x = DESCENT_RAY * max(abs(x_land), 1e-9)
    z_scale = float(_u(1.0, "length", system) / _u(1.0, "distance", system))
    ray_z = ray_x * np.tan(a) * z_scale
    fig.add_trace(go.Scatter(x=[x_land - ray_x, x_land], y=[ray_z, 0.0], mode="lines", showlegend=False,
                             line=dict(color="#222", width=2, dash="dash"), hoverinfo="skip", meta="context"))
    fig.add_trace(go.Scatter(x=[x_land - ray_x, x_land], y=[0.0, 0.0], mode="lines", showlegend=False,
                             line=dict(color="#222", width=2), hoverinfo="skip", meta="context"))
    font = dict(size=FONT_SIZE - 1, color="#111")
    box = dict(bgcolor="rgba(255,255,255,0.85)", bordercolor="#999", borderwidth=1, borderpad=3)
    fig.add_annotation(x=x_peak, y=z_peak, text=f"peak height <b>{_num(f.peak_height_m, 'length', system)}</b>",
                       showarrow=True, arrowhead=0, ax=0, ay=-30, yanchor="bottom", font=font, **box)
    fig.add_annotation(x=x_land, y=0.0, xref="x", yref="y", showarrow=True, arrowhead=2, ax=-20, ay=-70,
                       text=(f"carry <b>{_num(f.carry_m, 'distance', system)}</b><br>"
                             f"down at <b>{f.descent_angle_deg:.0f}°</b>, "
                             f"{_num(f.landing_speed_m_s, 'ball_speed', system)}"),
                       xanchor="right", yanchor="bottom", align="right", font=font, **box)
    fig.update_yaxes(range=[0.0, z_peak * 1.32])  # room above the apex for its label


def top_view(flights, system: str = "SI", numbers: bool = True, obstacles=()) -> go.Figure:
    """How much does it curve? Drift to the side against distance downrange (seen from above).
    With ``numbers`` the first flight's drift is written at its landing point."""
    fig = base_figure("Top view: drift against distance", _lbl("Downrange", "distance", system),
                      _lbl("Drift, right +", "distance", system), height=440)
    for i, f in enumerate(flights):
        p = f.path
        fig.add_trace(go.Scatter(x=_u(p["x_m"], "distance", system), y=_u(p["lateral_m"], "distance", system),
                                 mode="lines", name=f.label, line=dict(width=LINE_WIDTH, color=colour(i))))
    fig.add_hline(y=0, line=dict(color="#777", width=1, dash="dot"))
    if numbers and flights:
        f = flights[0]
        x_land, y_land = _u(f.carry_m, "distance", system), _u(f.lateral_m, "distance", system)
        side = "right" if f.lateral_m > 0 else "left" if f.lateral_m < 0 else ""
        drift = _num(abs(f.lateral_m), "distance", system)
        # below the curve's end as seen (right drift is drawn downward), clear of the path
        fig.add_annotation(x=x_land, y=y_land, showarrow=True, arrowhead=2, ax=-60,
                           ay=45 if f.lateral_m >= 0 else -45,
                           text=f"drift <b>{drift}{' ' + side if side else ''}</b>",
                           xanchor="right", font=dict(size=FONT_SIZE - 1, color="#111"),
                           bgcolor="rgba(255,255,255,0.85)", bordercolor="#999", borderwidth=1, borderpad=3)
        span = max(abs(float(np.max(_u(f.path["lateral_m"], "distance", system)))),
                   abs(float(np.min(_u(f.path["lateral_m"], "distance", system)))), 1.0)
        fig.update_yaxes(range=[1.6 * span, -1.6 * span])  # room for the label; right drawn down
    else:
        # right positive reads naturally with "right" drawn downward when looking downrange from above
        fig.update_yaxes(autorange="reversed")
    _draw_obstacles(fig, obstacles, system, "top")
    return finish(fig)


def along_flight(flights, system: str = "SI") -> go.Figure:
    """How do speed, spin and spin parameter change during the flight?"""
    fig = base_figure("Speed, spin and spin parameter along the flight", height=640)
    fig.set_subplots(rows=3, cols=1, shared_xaxes=True, vertical_spacing=0.06)
    for i, f in enumerate(flights):
        p = f.path
        c = colour(i)
        fig.add_trace(go.Scatter(x=p["t_s"], y=_u(p["speed_m_s"], "ball_speed", system), name=f.label,
                                 line=dict(width=LINE_WIDTH, color=c), legendgroup=f.label), row=1, col=1)
        fig.add_trace(go.Scatter(x=p["t_s"], y=p["spin_rpm"], name=f.label, showlegend=False,
                                 line=dict(width=LINE_WIDTH, color=c), legendgroup=f.label), row=2, col=1)
        fig.add_trace(go.Scatter(x=p["t_s"], y=p["spin_parameter"], name=f.label, showlegend=False,
                                 line=dict(width=LINE_WIDTH, color=c), legendgroup=f.label), row=3, col=1)
    fig.update_yaxes(title_text=_lbl("Speed", "ball_speed", system), row=1, col=1)
    fig.update_yaxes(title_text="Spin [rpm]", row=2, col=1)
    fig.update_yaxes(title_text="Spin parameter S", row=3, col=1)
    fig.update_xaxes(title_text="Time [s]", row=3, col=1)
    return finish(fig)


def coefficient_curves(model, flight, system: str = "SI") -> go.Figure:
    """Which drag and lift did the flight use? CD and CL met along the flight, against S."""
    fig = base_figure("Coefficients met in flight", "Spin parameter S", "Coefficient", height=420,
                      subtitle=f"Model: {model.title}")
    p = flight.path
    fig.add_trace(go.Scatter(x=p["spin_parameter"], y=p["cd"], mode="lines+markers", name="CD (drag)",
                             marker=dict(size=4), line=dict(width=LINE_WIDTH, color=colour(0))))
    fig.add_trace(go.Scatter(x=p["spin_parameter"], y=p["cl"], mode="lines+markers", name="CL (lift)",
                             marker=dict(size=4), line=dict(width=LINE_WIDTH, color=colour(1))))
    lo, hi = model.s_range
    if np.isfinite(hi):
        fig.add_vrect(x0=lo, x1=hi, fillcolor="#009E73", opacity=0.08, line_width=0,
                      annotation_text="model's S range", annotation_position="bottom left")
    return finish(fig)


def dispersion_figure(disp, system: str = "SI", title: str = "Where do the balls land?") -> go.Figure:
    """Landing points of the drawn flights with the 95 % ellipse and the mean (seen from above)."""
    fig = base_figure(title, _lbl("Downrange", "distance", system), _lbl("Drift, right +", "distance", system),
                      height=520)
    n_show = min(disp.n, 5000)
    fig.add_trace(go.Scattergl(x=_u(disp.carry_m[:n_show], "distance", system),
                               y=_u(disp.lateral_m[:n_show], "distance", system), mode="markers",
                               name=f"landings ({n_show:,} shown)" if n_show < disp.n else "landings",
                               marker=dict(size=5, color=colour(0), opacity=0.45)))
    e = disp.ellipse_95
    fig.add_trace(go.Scatter(x=_u(e["x"], "distance", system), y=_u(e["y"], "distance", system), mode="lines",
                             name="95 % ellipse (normal fit)", line=dict(width=LINE_WIDTH, color=colour(1))))
    fig.add_trace(go.Scatter(x=[_u(disp.mean_m[0], "distance", system)], y=[_u(disp.mean_m[1], "distance", system)],
                             mode="markers", name="mean", marker=dict(size=14, symbol="x", color=colour(6))))
    fig.update_yaxes(autorange="reversed", scaleanchor="x", scaleratio=1)
    return finish(fig)


def carry_histogram(disp, system: str = "SI") -> go.Figure:
    """How is carry spread? Histogram with the 5th, 50th and 95th percentiles."""
    fig = base_figure("Spread of carry", _lbl("Carry", "distance", system), "Flights", height=380)
    fig.add_trace(go.Histogram(x=_u(disp.carry_m, "distance", system), nbinsx=50, name="carry",
                               marker_color=colour(0), showlegend=False))
    for p, dash in ((5, "dot"), (50, "solid"), (95, "dot")):
        v = _u(disp.carry_percentiles_m[p], "distance", system)
        fig.add_vline(x=v, line=dict(color=colour(1), width=2.5, dash=dash),
                      annotation_text=f"P{p:02d}", annotation_position="top")
    return finish(fig)


#: Markers on the heat map: a light fill inside a dark outline, so each shows on every part of the
#: colour scale (the fill on its dark end, the outline on its light end).
MARKER_OUTLINE = "#000000"
GRID_BEST_FILL = "#E69F00"
#: Veil over the launches that miss an obstacle: white, half see-through (the colours stay readable).
MISS_VEIL = "rgba(255,255,255,0.6)"
SEARCHED_FILL = "#FFFFFF"


def sweep_heatmap(sw, labels: dict, output_label: str, output_kind: str, system: str = "SI",
                  searched: tuple | None = None) -> go.Figure:
    """Which launch gives the most? The output over the grid of two inputs, best point marked.

    Parameters
    ----------
    sw : liftcore.ballflight.SweepResult
    labels : dict
        Sweep input key -> (label, quantity kind).
    output_label, output_kind : str
        Name and quantity kind of the mapped result.
    system : str
        Display unit system.
    searched : tuple, optional
        A searched best point (x, y) to mark, core units.

    Returns
    -------
    plotly.graph_objects.Figure

    Notes
    -----
    With obstacles (``sw.margins``), the launches that miss one are faded under a white veil and
    the line where the smallest margin is zero (clears / misses) is drawn; a map of the margin
    itself uses a diverging scale symmetric about zero (blue clears, red misses).
    """
    xl, xk = labels[sw.x_key]
    yl, yk = labels[sw.y_key]
    z = _u(sw.grid, output_kind, system)
    xs, ys = _u(sw.x_values, xk, system), _u(sw.y_values, yk, system)
    fig = base_figure(f"{output_label} over {xl.lower()} and {yl.lower()}", _lbl(xl, xk, system),
                      _lbl(yl, yk, system), height=520)
    bar = dict(title=dict(text=_lbl(output_label, output_kind, system), side="right"))
    if sw.output == "margin_m":
        # symmetric about zero, as wide as the best clearance (at least 0.25 m): the launches
        # that clear show in full blue and the misses saturate to red beyond that
        top = max(float(np.nanmax(z)) if np.isfinite(z).any() else 0.0, float(_u(0.25, "length", system)))
        fig.add_trace(go.Heatmap(x=xs, y=ys, z=z, colorscale=DIVERGING, zmin=-top, zmax=top, colorbar=bar))
    else:
        fig.add_trace(go.Heatmap(x=xs, y=ys, z=z, colorscale=SEQUENTIAL, colorbar=bar))
    m = sw.margin_grid
    if m is not None:
        if sw.output != "margin_m" and (m < 0).any():
            fig.add_trace(go.Heatmap(x=xs, y=ys, z=np.where(m < 0, 1.0, np.nan), showscale=False,
                                     colorscale=[[0, MISS_VEIL], [1, MISS_VEIL]], hoverinfo="skip",
                                     name="faded: misses an obstacle", showlegend=False))
            # a heat map has no legend swatch: a marker of the veil's look stands for it
            fig.add_trace(go.Scatter(x=[None], y=[None], mode="markers", name="faded: misses an obstacle",
                                     marker=dict(symbol="square", size=14, color=MISS_VEIL,
                                                 line=dict(width=1, color=OBSTACLE_COLOUR))))
        if (m < 0).any() and (m >= 0).any():
            fig.add_trace(go.Contour(x=xs, y=ys, z=_u(m, "length", system), showscale=False, hoverinfo="skip",
                                     contours=dict(start=0.0, end=0.0, size=1.0, coloring="none"),
                                     line=dict(color=MARKER_OUTLINE, width=3, dash="dash"),
                                     name="clears / misses (margin 0)", showlegend=True))
    word = "highest" if sw.maximise else "lowest"
    fig.add_trace(go.Scatter(x=[_u(sw.best_x, xk, system)], y=[_u(sw.best_y, yk, system)], mode="markers",
                             marker=dict(size=20, symbol="star", color=GRID_BEST_FILL,
                                         line=dict(width=2, color=MARKER_OUTLINE)),
                             name=f"{word} on the grid" + (" that clears" if sw.best_clears else "")))
    if searched is not None:
        fig.add_trace(go.Scatter(x=[_u(searched[0], xk, system)], y=[_u(searched[1], yk, system)], mode="markers",
                                 marker=dict(size=15, symbol="circle", color=SEARCHED_FILL,
                                             line=dict(width=3, color=MARKER_OUTLINE)),
                                 name="searched best"))
    return finish(fig)


#: The residual components drawn, one panel each: column of ``FitResult.residuals``, panel title.
RESIDUAL_PARTS = (("dx", "Downrange"), ("dy", "Drift (right +)"), ("dz", "Height"))
#: Room above the top panel for its title. [px]
PANEL_TITLE_PX = 28


def fit_residuals(fit, system: str = "SI") -> go.Figure:
    """How well does the fitted model follow the tracks? Model minus observed position along each
    axis (signed: positive where the model is further downrange, further right or higher)."""
    fig = base_figure("Fit residuals: model minus observed position", height=600)
    fig.set_subplots(rows=3, cols=1, shared_xaxes=True, vertical_spacing=0.1,
                     subplot_titles=[words for _, words in RESIDUAL_PARTS])
    fig.update_annotations(font_size=FONT_SIZE - 1)
    for i, name in enumerate(fit.flights):
        r = fit.residuals[fit.residuals["flight"] == name]
        for row, (col, _) in enumerate(RESIDUAL_PARTS, start=1):
            fig.add_trace(go.Scatter(x=r["t"], y=_u(r[col].to_numpy(), "length", system), mode="markers",
                                     name=name, legendgroup=name, showlegend=row == 1,
                                     marker=dict(size=6, color=colour(i))), row=row, col=1)
    for row in (1, 2, 3):
        fig.add_hline(y=0, line=dict(color="#777", width=1, dash="dot"), row=row, col=1)
    # one axis title for the three panels, on the middle one
    fig.update_yaxes(title_text=_lbl("Model minus observed", "length", system), row=2, col=1)
    fig.update_xaxes(title_text="Time [s]", row=3, col=1)
    return finish(fig, top_extra=PANEL_TITLE_PX)


def fit_tracks_side(fit, tracks, system: str = "SI") -> go.Figure:
    """Observed positions (markers) and the fitted flights (lines), side view."""
    fig = base_figure("Tracked and fitted flights (side view)", _lbl("Downrange", "distance", system),
                      _lbl("Height", "length", system), height=420)
    for i, name in enumerate(fit.flights):
        o = tracks[tracks["flight"].astype(str) == name]
        m = fit.fitted[fit.fitted["flight"] == name]
        fig.add_trace(go.Scatter(x=_u(o["x"].to_numpy(), "distance", system), y=_u(o["z"].to_numpy(), "length", system),
                                 mode="markers", name=f"{name} observed", marker=dict(size=6, color=colour(i), opacity=0.6)))
        fig.add_trace(go.Scatter(x=_u(m["x"].to_numpy(), "distance", system), y=_u(m["z"].to_numpy(), "length", system),
                                 mode="lines", name=f"{name} fitted", line=dict(width=LINE_WIDTH, color=colour(i))))
    return finish(fig)
