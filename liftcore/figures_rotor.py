"""Charts of the rotor page: coefficient sets against spin ratio, thrust and net gain around the
compass, and the wind along the rotor height. Each builder takes the study's detail and a unit
system and only draws; every number comes from the study run.
"""

from __future__ import annotations

import numpy as np
import plotly.graph_objects as go
from plotly.subplots import make_subplots

from liftcore import units
from liftcore.figures import FONT_SIZE, LINE_WIDTH, band, base_figure, colour, finish, wrap

#: Colour of the spread between coefficient sets, and of the theory line.
SPREAD_COLOUR = "#56B4E9"
THEORY_COLOUR = "#000000"

_WHICH = {
    "lift": ("lift_coefficient", "Lift coefficient CL", "How much lift each coefficient set gives"),
    "drag": ("drag_coefficient", "Drag coefficient CD", "How much drag each coefficient set gives"),
    "power": ("power_coefficient", "Spin-power coefficient CP",
              "How much power spinning takes in each coefficient set"),
}


#: Marks a trace that gives context to one option's chart (data spread, zero line, current
#: point); charts that overlay several options leave such traces out.
CONTEXT = "context"


def _disp(value, kind, system):
    return units.to_display(np.asarray(value, dtype=float), kind, system)


def _label(kind, system):
    return units.unit_label(kind, system)


#: Room above the plot for one line of panel titles, and the gap under them. [px]
PANEL_TITLE_PX = 30


def _styled_subplots(title: str, height: int, **kw) -> go.Figure:
    fig = make_subplots(figure=base_figure(title, height=height), **kw)
    fig.update_annotations(font_size=FONT_SIZE)
    return fig


def _is_real(cs) -> bool:
    """The spread band is drawn over the published sets (and a user's own data); theory and
    anything from memory are shown apart."""
    return cs.published or cs.kind == "user"


def _coefficient_traces(fig: go.Figure, detail, which: str, row=None, col=None,
                        legend: bool = True) -> None:
    """One coefficient against spin ratio for every set into ``fig`` (a panel when ``row`` and
    ``col`` are given): the spread between the sets with data shaded, the operating point marked,
    and the axis ranges set. ``legend`` False leaves the names out of the legend (a second panel)."""
    attr, y_title, _ = _WHICH[which]
    where = dict(row=row, col=col) if row is not None else {}
    real = [c for c in detail.comparisons if _is_real(c.coefficients)]
    # spread between the sets with data, on a common grid where at least two sets are defined
    top = max(c.curves.spin_ratio[-1] for c in real) if real else 0.0
    x = np.linspace(0.0, top, 161)
    stack = [np.interp(x, c.curves.spin_ratio, getattr(c.curves, attr), left=np.nan, right=np.nan)
             for c in real]
    if len(stack) >= 2:
        arr = np.vstack(stack)
        keep = np.sum(np.isfinite(arr), axis=0) >= 2
        if keep.any():
            lo = np.where(np.isfinite(arr), arr, np.inf).min(axis=0)
            hi = np.where(np.isfinite(arr), arr, -np.inf).max(axis=0)
            r, g, b = (int(SPREAD_COLOUR[i:i + 2], 16) for i in (1, 3, 5))
            xs = x[keep]
            fig.add_trace(go.Scatter(x=np.concatenate([xs, xs[::-1]]), y=np.concatenate([hi[keep], lo[keep][::-1]]),
                                     fill="toself", fillcolor=f"rgba({r},{g},{b},0.25)", mode="lines",
                                     line=dict(width=0), name="Spread between the published sets", hoverinfo="skip",
                                     legendgroup="spread", showlegend=legend, meta=CONTEXT), **where)
    y_cap = 0.0
    friction_drawn = False
    for i, c in enumerate(detail.comparisons):
        cs, cv = c.coefficients, c.curves
        y = getattr(cv, attr)
        chosen = cs is detail.setup.coefficients
        name = cs.label
        dash = "dash" if cs.kind == "theory" else "solid"
        colr = THEORY_COLOUR if cs.kind == "theory" else colour(i)
        if which == "power" and cv.power_from_friction_model:
            # every set without a power coefficient shares the one friction model of this rotor
            if friction_drawn:
                continue
            friction_drawn = True
            name = "Skin-friction model of this rotor at this wind (sets without power data)"
            dash, colr = "dot", "#444444"
            chosen = not detail.setup.coefficients.has_power
        fig.add_trace(go.Scatter(x=cv.spin_ratio, y=y, mode="lines", name=name, legendgroup=name,
                                 showlegend=legend,
                                 line=dict(color=colr, width=LINE_WIDTH * (1.5 if chosen else 1.0), dash=dash),
                                 hovertemplate="SR %{x:.2f}<br>" + attr.split("_")[0] + " %{y:.3f}<extra></extra>"),
                      **where)
        if _is_real(cs):
            y_cap = max(y_cap, float(np.nanmax(y)))
    op = detail.operation
    y_op = float(getattr(op, attr))
    fig.add_trace(go.Scatter(x=[float(op.spin_ratio)], y=[y_op], mode="markers", name="Operating point",
                             legendgroup="operating point", showlegend=legend,
                             marker=dict(symbol="diamond", size=18, color="#D55E00", line=dict(width=2, color="#000"))),
                  **where)
    if y_cap > 0:
        fig.update_yaxes(range=[min(0.0, y_op), max(y_cap, y_op) * 1.15], title_text=y_title, **where)
    else:
        fig.update_yaxes(title_text=y_title, **where)
    xr = dict(range=[0.0, max(top, float(op.spin_ratio)) * 1.04]) if top > 0 else {}
    # the theory line runs on beyond the data; show the range the data cover
    fig.update_xaxes(title_text="Spin ratio SR", **xr, **where)


def coefficient_figure(detail, which: str, system: str = "SI") -> go.Figure:
    """One coefficient against spin ratio for every set, the spread between the sets with data
    shaded, and the operating point marked."""
    _, _, question = _WHICH[which]
    corrected = detail.setup.correct_aspect_ratio and which == "drag"
    fig = base_figure(question, height=430,
                      subtitle="With the induced drag of this rotor's aspect ratio" if corrected else "")
    _coefficient_traces(fig, detail, which)
    return finish(fig)


def lift_drag_figure(detail, system: str = "SI") -> go.Figure:
    """Lift and drag against spin ratio for every set, side by side with one legend: the spread
    between the sets with data shaded and the operating point marked in both. (One chart, not
    two: a browser draws it in a third of the time of two charts with a legend each.)"""
    corrected = detail.setup.correct_aspect_ratio
    fig = _styled_subplots("How much lift and drag each coefficient set gives", height=460, rows=1,
                           cols=2, horizontal_spacing=0.1,
                           subplot_titles=("Lift", "Drag" + (", with this rotor's induced drag" if corrected else "")))
    _coefficient_traces(fig, detail, "lift", 1, 1)
    _coefficient_traces(fig, detail, "drag", 1, 2, legend=False)
    return finish(fig, top_extra=PANEL_TITLE_PX)


#: Compass labels of the polar charts: the side labels in two short lines, so two charts fit side by
#: side in a 680 px handout with their labels apart.
COMPASS_LABELS = ("0° bow", "45°", "90°<br>stbd", "135°", "180° stern", "-135°", "-90°<br>port", "-45°")
#: Room outside the circle for the compass labels: left and right, above and below. [px]
COMPASS_SIDE_PX = 60
COMPASS_LABEL_PX = 32
#: Gap between the two compass charts (fraction of the plot width: two side labels at 680 px).
POLAR_GAP = 0.2
#: Direction of the radial axis (0 = right, counter-clockwise): halfway from the bow to 45°. [°]
RADIAL_ANGLE_DEG = 67.5
POLAR_HEIGHT_PX = 560


def polar_figure(detail, system: str = "SI") -> go.Figure:
    """Thrust and net power gain against the true wind angle at the current wind and ship speed,
    with the spread between the sets with data shaded and the current angle marked."""
    fig = _styled_subplots("Thrust and net power gain around the compass", height=POLAR_HEIGHT_PX,
                           rows=1, cols=2, specs=[[{"type": "polar"}, {"type": "polar"}]],
                           horizontal_spacing=POLAR_GAP,
                           subplot_titles=(f"Thrust [{_label('large_force', system)}]",
                                           f"Net power gain [{_label('power', system)}]"))
    theta = detail.sweep_angles_deg
    real = [c for c in detail.comparisons if _is_real(c.coefficients)]
    chosen = next(c for c in detail.comparisons if c.coefficients is detail.setup.coefficients)
    for col, (attr, kind) in enumerate((("thrust_n", "large_force"), ("net_power_w", "power")), start=1):
        polar = "polar" if col == 1 else "polar2"
        vals = [_disp(getattr(c.sweep, attr), kind, system) for c in real]
        r_all = vals + [_disp(getattr(chosen.sweep, attr), kind, system)]
        if len(vals) >= 2:
            lo, hi = np.min(vals, axis=0), np.max(vals, axis=0)
            fig.add_trace(go.Scatterpolar(r=np.concatenate([lo, hi[::-1]]), theta=np.concatenate([theta, theta[::-1]]),
                                          fill="toself", fillcolor="rgba(86,180,233,0.25)", line=dict(width=0),
                                          name="Spread between the published sets", hoverinfo="skip",
                                          showlegend=col == 1, subplot=polar, meta=CONTEXT))
        r = _disp(getattr(chosen.sweep, attr), kind, system)
        fig.add_trace(go.Scatterpolar(r=r, theta=theta, mode="lines", name=chosen.coefficients.label,
                                      line=dict(color=colour(0), width=LINE_WIDTH), showlegend=col == 1,
                                      subplot=polar, hovertemplate="true wind %{theta:.0f}°<br>%{r:,.1f} "
                                      + _label(kind, system) + "<extra></extra>"))
        now = float(_disp(getattr(detail.operation, attr), kind, system))
        fig.add_trace(go.Scatterpolar(r=[now], theta=[detail.true_wind_angle_deg], mode="markers",
                                      name="Current true wind angle", showlegend=col == 1, subplot=polar,
                                      meta=CONTEXT,
                                      marker=dict(symbol="diamond", size=16, color="#D55E00",
                                                  line=dict(width=2, color="#000"))))
        rmin = min(0.0, float(np.min([np.min(v) for v in r_all] + [now])))
        rmax = max(1e-9, float(np.max([np.max(v) for v in r_all] + [now])))
        pad = 0.08 * (rmax - rmin)
        fig.add_trace(go.Scatterpolar(r=np.zeros(73), theta=np.linspace(-180, 180, 73), mode="lines",
                                      line=dict(color="#444", width=1.5, dash="dot"), name="Zero",
                                      showlegend=col == 1, hoverinfo="skip", subplot=polar, meta=CONTEXT))
        fig.update_layout({polar: dict(
            angularaxis=dict(rotation=90, direction="clockwise", tickmode="array",
                             tickvals=[0, 45, 90, 135, 180, 225, 270, 315], ticktext=COMPASS_LABELS),
            # the radial labels run between the "0° bow" and "45°" labels, clear of both, and
            # stand level (a tick angle equal to the axis angle)
            radialaxis=dict(range=[rmin - pad, rmax + pad], angle=RADIAL_ANGLE_DEG,
                            tickangle=RADIAL_ANGLE_DEG, nticks=5, tickfont=dict(size=FONT_SIZE - 3)))})
    for ann in fig.layout.annotations:  # the panel titles clear of the "0° bow" label
        ann.update(yanchor="bottom", yshift=COMPASS_LABEL_PX)
    fig.update_layout(title_subtitle_text="At this true wind and ship speed",
                      margin=dict(l=COMPASS_SIDE_PX, r=COMPASS_SIDE_PX))
    return finish(fig, top_extra=PANEL_TITLE_PX + COMPASS_LABEL_PX, below_polar=COMPASS_LABEL_PX)


#: Characters per line of the span chart's three panel titles (a third of a 680 px chart each).
SPAN_PANEL_CHARS = 16


def span_figure(detail, system: str = "SI") -> go.Figure:
    """True and apparent wind, apparent wind angle and spin ratio along the rotor height."""
    p = detail.span
    h_kind = "length"
    z = _disp(p.height_m, h_kind, system)
    fig = _styled_subplots("The wind along the rotor height", height=520, rows=1, cols=3,
                           shared_yaxes=True, horizontal_spacing=0.05,
                           subplot_titles=tuple(wrap(t, SPAN_PANEL_CHARS) for t in (
                               f"Wind speed [{_label('wind_speed', system)}]", "Apparent wind angle [°]",
                               "Spin ratio along the rotor")))
    fig.add_trace(go.Scatter(x=_disp(p.true_wind_speed_m_s, "wind_speed", system), y=z, mode="lines",
                             name="True wind", line=dict(color=colour(2), width=LINE_WIDTH)), row=1, col=1)
    fig.add_trace(go.Scatter(x=_disp(p.apparent_wind_speed_m_s, "wind_speed", system), y=z, mode="lines",
                             name="Apparent wind", line=dict(color=colour(0), width=LINE_WIDTH)), row=1, col=1)
    fig.add_trace(go.Scatter(x=p.apparent_wind_angle_deg, y=z, mode="lines", name="Apparent wind angle",
                             line=dict(color=colour(0), width=LINE_WIDTH), showlegend=False), row=1, col=2)
    fig.add_trace(go.Scatter(x=p.spin_ratio, y=z, mode="lines", name="Spin ratio",
                             line=dict(color=colour(1), width=LINE_WIDTH), showlegend=False), row=1, col=3)
    strip_sr = np.interp(p.strip_heights_m, p.height_m, np.nan_to_num(p.spin_ratio))
    fig.add_trace(go.Scatter(x=strip_sr, y=_disp(p.strip_heights_m, h_kind, system), mode="markers",
                             name=f"Strip midpoints ({len(p.strip_heights_m)})",
                             marker=dict(color=colour(1), size=9)), row=1, col=3)
    base, top = float(_disp(p.base_height_m, h_kind, system)), float(_disp(p.top_height_m, h_kind, system))
    for col in (1, 2, 3):
        fig.add_hrect(y0=base, y1=top, fillcolor="rgba(120,120,120,0.12)", line_width=0, row=1, col=col)
    zref = float(_disp(p.reference_height_m, h_kind, system))
    fig.add_hline(y=zref, line=dict(color="#444", width=1.5, dash="dot"), row=1, col=1,
                  annotation_text="height of the given wind", annotation_position="bottom left",
                  annotation_font_size=FONT_SIZE - 3)
    fig.add_annotation(x=0.0, y=top, xref="x domain", yref="y", text="rotor top", showarrow=False,
                       xanchor="left", yanchor="bottom", font=dict(size=FONT_SIZE - 3))
    fig.update_yaxes(title_text=f"Height above the waterline [{_label(h_kind, system)}]", row=1, col=1)
    lines = max(a.text.count("<br>") + 1 for a in fig.layout.annotations if a.yref == "paper")
    return finish(fig, top_extra=PANEL_TITLE_PX * lines)


def all_figures(detail, system: str = "SI") -> tuple:
    """(title, figure) pairs of the rotor study, each answering one question."""
    return (
        ("Lift and drag against spin ratio", lift_drag_figure(detail, system)),
        ("Spin-power coefficient against spin ratio", coefficient_figure(detail, "power", system)),
        ("Thrust and net power gain around the compass", polar_figure(detail, system)),
        ("Wind along the rotor height", span_figure(detail, system)),
    )
