"""Figures for the ideal spinning cylinder and for circulation from a measured field.

Each builder answers one question (its title says which) and starts from
:func:`liftcore.figures.base_figure`. Geometry of the ideal flow is drawn in body radii (x/R, y/R)
so the pictures read the same at any size (the radius and stream speed are named in the display
units); measured fields are drawn in the display length unit. Builders take core (SI) results and
a unit system and convert at the edge through :mod:`liftcore.units`.
"""

from __future__ import annotations

import math

import numpy as np
import plotly.graph_objects as go

from liftcore import potential as pot
from liftcore import units
from liftcore.units import format_number
from liftcore.figures import PALETTE, SEQUENTIAL, band, base_figure, finish

BODY_FILL = "#9a9a9a"
BODY_LINE = "#333333"
#: Height of the square maps (streamlines, measured field) without their legend: a map in one
#: of two columns is as wide as about this leaves it high. [px]
MAP_HEIGHT_PX = 540
#: Grid points per axis of the ideal-flow picture: smooth lines at a chart width of about 600 px
#: (six points per streamline spacing), and half the bytes of 141 points to send to the browser.
FLOW_GRID = 101


def _u(value, kind: str, system: str):
    return units.to_display(np.asarray(value, dtype=float), kind, system)


def _unit(kind: str, system: str) -> str:
    return units.unit_label(kind, system)


def _num(value, kind: str, system: str, digits: int = 3) -> str:
    return f"{float(units.to_display(value, kind, system)):.{digits}g} {_unit(kind, system)}"


def _body(fig: go.Figure, cx: float, cy: float, r: float) -> None:
    fig.add_shape(type="circle", x0=cx - r, y0=cy - r, x1=cx + r, y1=cy + r,
                  fillcolor=BODY_FILL, line=dict(color=BODY_LINE, width=2), layer="above")


def _equal_axes(fig: go.Figure, x_range, y_range) -> None:
    fig.update_xaxes(range=[float(a) for a in x_range], constrain="domain")
    fig.update_yaxes(range=[float(a) for a in y_range], scaleanchor="x", scaleratio=1, constrain="domain")


def flow_picture_half_width(res: pot.IdealCylinderResult) -> float:
    """Half-width of the streamline picture in body radii: 3, or wide enough to show an
    off-body stagnation point (capped at 12)."""
    return float(min(12.0, max(3.0, 1.35 * res.stagnation_distance_m / res.radius_m)))


def streamlines_figure(res: pot.IdealCylinderResult, n: int = FLOW_GRID, system: str = "SI") -> go.Figure:
    """Streamlines (stream-function contours) over the local speed, body and stagnation points.

    Axes in body radii; the radius and the stream speed are named in ``system``'s units, and the
    stagnation points' hover gives their position in the display length unit."""
    r, v, g = res.radius_m, res.speed_m_s, res.circulation_m2_s
    half = flow_picture_half_width(res)
    s = np.linspace(-half, half, n)
    xx, yy = np.meshgrid(s * r, s * r)
    u, w = pot.velocity_field(xx, yy, v, r, g)
    speed = np.hypot(u, w) / v
    psi = pot.stream_function(xx, yy, v, r, g) / (v * r)
    radius = _num(r, "length", system)
    if res.spin_rad_s != 0.0:
        spin = f"Spin {'clockwise' if res.spin_rad_s > 0 else 'counter-clockwise'}, spin ratio {res.spin_ratio:.3g}"
    else:
        spin = "No spin"
    fig = base_figure("Where the air goes: streamlines round the spinning cylinder",
                      f"x / R (R = {radius})<br>stream flows left to right", f"y / R (R = {radius})",
                      height=MAP_HEIGHT_PX,
                      subtitle=f"{spin}; colour: local speed; orange line: the dividing streamline; "
                               "✕: stagnation points")
    fig.add_trace(go.Heatmap(x=s, y=s, z=speed.astype(np.float32), colorscale=SEQUENTIAL, zmin=0.0,
                             zmax=3.0, name="speed",
                             colorbar=dict(title=dict(text=f"speed / free stream ({_num(v, 'speed', system)})",
                                                      side="right"), thickness=18),
                             hovertemplate="x/R %{x:.2f}, y/R %{y:.2f}<br>speed/free stream %{z:.2f}"
                                           "<extra></extra>"))
    finite = psi[np.isfinite(psi)]
    psi32 = psi.astype(np.float32)
    step = 2.0 * half / 24.0
    fig.add_trace(go.Contour(x=s, y=s, z=psi32, showscale=False, hoverinfo="skip",
                             contours=dict(coloring="lines", start=float(finite.min()),
                                           end=float(finite.max()), size=step, showlabels=False),
                             colorscale=[[0, "#ffffff"], [1, "#ffffff"]], line=dict(width=1.6),
                             name="streamlines"))
    # the streamline through the stagnation point(s): the edge of the air carried round the body
    sx, sy = res.stagnation_points_m[0]
    psi_s = float(pot.stream_function(sx, sy, v, r, g)) / (v * r) if not res.stagnation_on_surface else 0.0
    fig.add_trace(go.Contour(x=s, y=s, z=psi32, showscale=False, hoverinfo="skip",
                             contours=dict(coloring="lines", start=psi_s, end=psi_s, size=1.0,
                                           showlabels=False),
                             colorscale=[[0, PALETTE[4]], [1, PALETTE[4]]], line=dict(width=3.5),
                             name="dividing streamline", showlegend=False))
    _body(fig, 0.0, 0.0, 1.0)
    px = [p[0] / r for p in res.stagnation_points_m]
    py = [p[1] / r for p in res.stagnation_points_m]
    lu = _unit("length", system)
    at = _u([list(p) for p in res.stagnation_points_m], "length", system)
    # no legend: the subtitle names the lines and marks (a legend costs the browser a fifth of
    # this chart's drawing time)
    fig.add_trace(go.Scatter(x=px, y=py, mode="markers", name="stagnation point", customdata=at,
                             showlegend=False,
                             marker=dict(symbol="x-thin", size=20, color=PALETTE[1],
                                         line=dict(width=5, color=PALETTE[1])),
                             hovertemplate=("stagnation point<br>x/R %{x:.2f}, y/R %{y:.2f}<br>"
                                            f"x %{{customdata[0]:.3g}} {lu}, y %{{customdata[1]:.3g}} {lu}"
                                            "<extra></extra>")))
    sign = 1.0 if res.lift_per_span_n_m >= 0 else -1.0
    if res.spin_rad_s != 0.0:
        fig.add_annotation(x=0.0, y=sign * min(half * 0.85, 2.6), ax=0.0, ay=sign * 1.15,
                           xref="x", yref="y", axref="x", ayref="y", showarrow=True, arrowhead=3,
                           arrowsize=1.4, arrowwidth=4, arrowcolor=PALETTE[1], text="lift",
                           font=dict(size=17, color=PALETTE[1]), bgcolor="rgba(255,255,255,0.85)")
    fig.add_annotation(x=-half * 0.55, y=half * 0.9, ax=-half * 0.95, ay=half * 0.9,
                       xref="x", yref="y", axref="x", ayref="y", showarrow=True, arrowhead=3,
                       arrowsize=1.3, arrowwidth=3, arrowcolor="#ffffff", text="")
    fig.add_annotation(x=-half * 0.75, y=half * 0.78, text="stream", showarrow=False,
                       font=dict(size=15, color="#ffffff"))
    _equal_axes(fig, (-half, half), (-half, half))
    return finish(fig)


def surface_pressure_figure(res: pot.IdealCylinderResult, n: int = 361) -> go.Figure:
    """Cp round the surface against angle, with the no-spin curve for comparison."""
    theta_deg = np.linspace(0.0, 360.0, n)
    th = np.radians(theta_deg)
    cp = pot.surface_pressure_coefficient(th, res.speed_m_s, res.radius_m, res.circulation_m2_s)
    cp0 = pot.surface_pressure_coefficient(th, res.speed_m_s, res.radius_m, 0.0)
    fig = base_figure("Pressure round the surface: where the suction is",
                      "angle from the rear point [°]  (90 top, 180 front, 270 bottom)",
                      "pressure coefficient Cp [-]")
    fig.add_trace(go.Scatter(x=theta_deg, y=cp0, name="no spin", mode="lines",
                             line=dict(color="#888888", width=2.5, dash="dash")))
    fig.add_trace(go.Scatter(x=theta_deg, y=cp, name=f"spin ratio {res.spin_ratio:.3g}", mode="lines",
                             line=dict(color=PALETTE[0], width=4)))
    if res.stagnation_on_surface:
        fig.add_trace(go.Scatter(x=list(res.stagnation_angles_deg), y=[1.0] * len(res.stagnation_angles_deg),
                                 mode="markers", name="stagnation point (Cp = 1)",
                                 marker=dict(symbol="x-thin", size=18, color=PALETTE[1],
                                             line=dict(width=4, color=PALETTE[1]))))
    fig.update_xaxes(tickvals=[0, 45, 90, 135, 180, 225, 270, 315, 360], range=[0, 360])
    return finish(fig)


def pressure_check_figure(res: pot.IdealCylinderResult) -> go.Figure:
    """Lift and drag coefficients from the pressure integral beside Kutta-Joukowski."""
    tiny = pot.ROUND_OFF_RESOLUTION
    diff = res.pressure_lift_relative_difference
    cd = res.drag_coefficient_from_pressure
    agree = abs(diff) < tiny and abs(cd) < tiny
    up = res.lift_coefficient >= 0
    fig = base_figure("Check: surface-pressure integral against Kutta-Joukowski",
                      "", "coefficient on the diameter [-]",
                      subtitle=(f"The two lifts agree, and the drag is 0, to round-off (below {tiny:g})."
                                if agree else f"Lift: relative difference {diff:.1e}; drag {cd:.1e}."))
    # short lines, so the three labels stand upright side by side in a narrow chart
    labels = ["lift from<br>Γ / (R V)", "lift from<br>pressure", "drag from<br>pressure"]
    vals = [res.lift_coefficient, res.lift_coefficient_from_pressure, cd]
    shown = [format_number(0.0 if abs(v) < tiny else v, 6) for v in vals]
    fig.add_trace(go.Bar(x=labels, y=vals, marker_color=[PALETTE[0], PALETTE[2], PALETTE[1]],
                         text=shown, textposition="outside",
                         textfont=dict(size=18), cliponaxis=False, showlegend=False,
                         hovertemplate="%{x}: %{y:.10g}<extra></extra>"))
    top = max(abs(res.lift_coefficient), 1.0)
    fig.update_yaxes(range=[-0.12 * top, 1.3 * top] if up else [-1.3 * top, 0.12 * top],
                     zeroline=True, zerolinecolor="#444")
    return finish(fig)


def ideal_lift_figure(res: pot.IdealCylinderResult) -> go.Figure:
    """The ideal line CL = 2 pi SR, this case on it, and a plain note on real cylinders."""
    top = max(4.0, 1.25 * abs(res.spin_ratio))
    sr = np.linspace(-top if res.spin_ratio < 0 else 0.0, top, 201)
    fig = base_figure("Ideal lift coefficient CL = 2π SR", "spin ratio SR = ωR / V [-]",
                      "lift coefficient CL on the diameter [-]",
                      subtitle=("Real cylinders fall far below this line: the boundary layer leaves the "
                                "surface, so measured lift coefficients level off. Use measured "
                                "coefficients for real forces."))
    fig.add_trace(go.Scatter(x=sr, y=pot.lift_coefficient_ideal(sr), mode="lines",
                             name="ideal flow, no-slip circulation", line=dict(color=PALETTE[0], width=4)))
    fig.add_trace(go.Scatter(x=[res.spin_ratio], y=[res.lift_coefficient], mode="markers",
                             name="this case", marker=dict(size=16, color=PALETTE[1],
                                                           line=dict(width=2, color="#000"))))
    for s2 in ([2.0, -2.0] if res.spin_ratio < 0 else [2.0]):
        fig.add_vline(x=s2, line=dict(color="#777", dash="dot", width=2))
    # the note sits left of SR = 2 at the top, where the line CL = 2 pi SR (through the origin and
    # the top right) leaves the plot empty; this case's marker lies on the line
    fig.add_annotation(x=2.0, yref="paper", y=0.98, xanchor="right", yanchor="top", showarrow=False,
                       align="right", text="SR = 2: stagnation points <br>meet and leave the surface ",
                       font=dict(size=14, color="#444"))
    return finish(fig)


# ----------------------------------------------------------------------------- measured field
def _stride(n: int, target: int) -> int:
    return max(1, int(math.ceil(n / target)))


def field_map_figure(field, res, max_cells: int = 101, arrows: int = 19, system: str = "SI") -> go.Figure:
    """Speed colour map of the field with arrows, the body and the integration loops, drawn in
    ``system``'s length and speed units."""
    from liftcore.fieldcirc import loop_family

    lu, vu = _unit("length", system), _unit("speed", system)

    def L(a):  # lengths in the display unit (a pure scale: arrows and loops keep their shape)
        return _u(a, "length", system)

    sx, sy = _stride(field.x_m.size, max_cells), _stride(field.y_m.size, max_cells)
    xs, ys = L(field.x_m[::sx]), L(field.y_m[::sy])
    speed = _u(np.hypot(field.u_m_s, field.v_m_s)[::sx, ::sy].T, "speed", system)
    fig = base_figure(f"The velocity field and the loops ({len(res.loop_sizes_m)} integrated, 3 drawn)",
                      f"x [{lu}]", f"y [{lu}]", height=MAP_HEIGHT_PX)
    fig.add_trace(go.Heatmap(x=xs, y=ys, z=speed.astype(np.float32), colorscale=SEQUENTIAL, name="speed",
                             colorbar=dict(title=dict(text=f"speed [{vu}]", side="right"), thickness=18),
                             hovertemplate=f"x %{{x:.4g}} {lu}, y %{{y:.4g}} {lu}<br>speed %{{z:.3g}} {vu}"
                                           "<extra></extra>"))
    ax, ay = _stride(field.x_m.size, arrows), _stride(field.y_m.size, arrows)
    gx, gy = np.meshgrid(field.x_m[::ax], field.y_m[::ay], indexing="ij")
    gu, gv = field.u_m_s[::ax, ::ay].ravel(), field.v_m_s[::ax, ::ay].ravel()
    gx, gy = gx.ravel(), gy.ravel()
    moving = np.hypot(gu, gv) > 0.0  # points inside the body hold 0 in most files: no arrow
    gx, gy, gu, gv = gx[moving], gy[moving], gu[moving], gv[moving]
    x0, x1, y0, y1 = field.extent_m
    cell = min((x1 - x0) * ax / max(field.x_m.size - 1, 1), (y1 - y0) * ay / max(field.y_m.size - 1, 1))
    vmax = float(np.max(np.hypot(gu, gv))) if gu.size else 1.0
    scale = 0.85 * cell / (vmax or 1.0)
    tailx, taily = gx - 0.5 * scale * gu, gy - 0.5 * scale * gv  # arrows centred on their point
    tipx, tipy = gx + 0.5 * scale * gu, gy + 0.5 * scale * gv
    nan = np.full(gx.size, np.nan)
    lx = np.column_stack([tailx, tipx, nan]).ravel()
    ly = np.column_stack([taily, tipy, nan]).ravel()
    fig.add_trace(go.Scatter(x=L(lx), y=L(ly), mode="lines", line=dict(color="#ffffff", width=2),
                             name="velocity", showlegend=False, hoverinfo="skip"))
    ang = 90.0 - np.degrees(np.arctan2(gv, gu))
    fig.add_trace(go.Scatter(x=L(tipx), y=L(tipy), mode="markers", showlegend=False, hoverinfo="skip",
                             marker=dict(symbol="triangle-up", size=10, angle=ang, color="#ffffff")))
    # three loops drawn (all are integrated): the smallest, the smallest counted, the largest
    loops = loop_family(res.loop_shape, res.body_centre_m, res.loop_sizes_m,
                        min(field.spacing_m), res.rectangle_aspect)
    sizes = np.asarray(res.loop_sizes_m)
    settled = np.asarray(res.settled)
    first_counted = int(np.flatnonzero(settled)[np.argmin(sizes[settled])])
    picks = {}
    smallest = int(np.argmin(sizes))
    if not settled[smallest]:
        picks[smallest] = (f"smallest loop {_num(sizes[smallest], 'length', system)} (not counted)",
                           "#d0d0d0", "dot")
    picks.setdefault(first_counted, (f"smallest counted loop {_num(sizes[first_counted], 'length', system)}",
                                     PALETTE[4], "dash"))
    largest = int(np.argmax(sizes))
    picks.setdefault(largest, (f"largest loop {_num(sizes[largest], 'length', system)}", PALETTE[4], "solid"))
    for k, (name, col, dash) in picks.items():
        ox, oy = loops[k].outline()
        fig.add_trace(go.Scatter(x=L(ox), y=L(oy), mode="lines", hoverinfo="skip", name=name,
                                 line=dict(color=col, width=3.5, dash=dash)))
    bx, by = res.body_centre_m
    _body(fig, float(L(bx)), float(L(by)), float(L(res.body_radius_m)))
    _equal_axes(fig, L([x0, x1]), L([y0, y1]))
    return finish(fig)


def circulation_figure(res, system: str = "SI") -> go.Figure:
    """Circulation against loop size, with the estimate and its loop-to-loop spread, in
    ``system``'s length and circulation units."""
    lu, cu = _unit("length", system), _unit("circulation", system)
    sizes = _u(res.loop_sizes_m, "length", system)
    gam = _u(res.circulations_m2_s, "circulation", system)
    settled = np.asarray(res.settled)
    est = float(_u(res.circulation_m2_s, "circulation", system))
    spread = float(_u(res.circulation_spread_m2_s, "circulation", system))
    body_r = float(_u(res.body_radius_m, "length", system))
    fig = base_figure("Does the circulation settle as the loop grows?",
                      f"loop size (circle radius or rectangle half-height) [{lu}]", f"circulation Γ [{cu}]")
    xs = sizes[settled]
    band(fig, [xs.min(), xs.max()], [est - spread] * 2, [est + spread] * 2, "loop-to-loop spread",
         PALETTE[4], 0.3)
    fig.add_trace(go.Scatter(x=[xs.min(), xs.max()], y=[est] * 2, mode="lines",
                             name=f"estimate {est:.4g} {cu}",
                             line=dict(color=PALETTE[1], width=3, dash="dash")))
    fig.add_trace(go.Scatter(x=sizes, y=gam, mode="lines+markers", name="each loop",
                             line=dict(color=PALETTE[0], width=3),
                             marker=dict(size=11, color=[PALETTE[0] if s else "#ffffff" for s in settled],
                                         line=dict(width=2, color=PALETTE[0])),
                             hovertemplate=f"size %{{x:.4g}} {lu}<br>Γ %{{y:.5g}} {cu}<extra></extra>"))
    fig.add_vline(x=body_r, line=dict(color=BODY_LINE, width=2, dash="dot"))
    fig.add_annotation(x=body_r, yref="paper", y=0.02, xanchor="left", showarrow=False,
                       text=" body radius", font=dict(size=14, color=BODY_LINE))
    lo = min(gam.min(), est - spread)
    hi = max(gam.max(), est + spread)
    pad = max(0.05 * abs(est), 0.5 * (hi - lo), 1e-9)
    fig.update_yaxes(range=[lo - pad, hi + pad])
    fig.update_xaxes(range=[0.0, float(sizes.max()) * 1.05])
    return finish(fig)
