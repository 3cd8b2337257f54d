"""Charts of the voyage page: each answers one question, with units on every axis.

Builders take core-unit results (a :class:`~liftcore.voyage.Tally`, tables from
:mod:`liftcore.voyage`) and a unit system, and return Plotly figures in the house style.
"""

from __future__ import annotations

import numpy as np
import plotly.colors as pc
import plotly.graph_objects as go

from liftcore import units
from liftcore.figures import DIVERGING, SEQUENTIAL, base_figure, colour, finish
from liftcore import voyage as vy

MONTHS = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")


def _u(kind: str, system: str) -> str:
    return units.unit_label(kind, system)


def _show(values, kind: str, system: str):
    return units.to_display(np.asarray(values, dtype=float), kind, system)


def _speed_class_labels(system: str) -> list[str]:
    edges = [float(units.to_display(e, "wind_speed", system)) for e in vy.ROSE_SPEED_EDGES_M_S]
    u = _u("wind_speed", system)
    out = [f"{a:.0f}–{b:.0f} {u}" for a, b in zip(edges[:-1], edges[1:])]
    out.append(f"above {edges[-1]:.0f} {u}")
    return out


#: Room above the rose for its top compass label. [px]
ROSE_LABEL_PX = 30


def wind_rose(t: vy.Tally, system: str = "SI") -> go.Figure:
    """Share of time at sea by wind direction sector and speed class (stacked)."""
    if t.rose_is_direction:
        title = "Where the true wind comes from"
        ticks = dict(tickmode="array", tickvals=[0, 45, 90, 135, 180, 225, 270, 315],
                     ticktext=["N", "NE", "E", "SE", "S", "SW", "W", "NW"])
    else:
        title = "True wind relative to the bow"
        # the side labels in two short lines keep the circle wide in a narrow chart
        ticks = dict(tickmode="array", tickvals=[0, 45, 90, 135, 180, 225, 270, 315],
                     ticktext=["bow 0°", "45°", "90°<br>stbd", "135°", "stern 180°", "225°",
                               "270°<br>port", "315°"])
    fig = base_figure(title, height=480, subtitle="Share of time at sea; colour: true wind speed")
    step = 360.0 / vy.ROSE_SECTORS
    theta = np.arange(vy.ROSE_SECTORS) * step
    share = 100.0 * t.rose / t.weight if t.weight > 0 else t.rose
    labels = _speed_class_labels(system)
    colours = pc.sample_colorscale(SEQUENTIAL, np.linspace(0.0, 0.9, len(labels)))
    for j, lab in enumerate(labels):
        fig.add_trace(go.Barpolar(r=share[:, j], theta=theta, width=[step * 0.95] * theta.size,
                                  name=lab, marker_color=colours[j], marker_line_width=0.5,
                                  marker_line_color="white",
                                  hovertemplate="%{theta:.0f}°: %{r:.2f} % of time<extra>" + lab + "</extra>"))
    # the radial labels run between the first two compass labels, clear of both, and stand level
    # (a tick angle equal to the axis angle); the outer ring leaves room past the longest bar so
    # the last label stays inside the circle
    top = float(np.max(share.sum(axis=1))) if share.size else 1.0
    fig.update_layout(polar=dict(angularaxis=dict(direction="clockwise", rotation=90, **ticks),
                                 radialaxis=dict(ticksuffix=" %", angle=67.5, tickangle=67.5, nticks=4,
                                                 range=[0.0, 1.25 * top if top > 0 else 1.0])),
                      margin=dict(l=60, r=60))
    return finish(fig, top_extra=ROSE_LABEL_PX, below_polar=ROSE_LABEL_PX)


def gain_heat_map(t: vy.Tally, system: str = "SI") -> go.Figure:
    """Each cell: its contribution to the mean net power gain (gain x share of time)."""
    pu = _u("power", system)
    fig = base_figure("Where the gain comes from",
                      "True wind angle off the bow, either side [°]",
                      f"True wind speed [{_u('wind_speed', system)}]", height=520)
    used = np.nonzero(t.heat_weight.sum(axis=0))[0]
    if used.size == 0 or t.weight <= 0:
        return finish(fig)
    top = int(used.max()) + 1
    w = t.heat_weight[:, :top]
    contribution = _show(t.heat_net[:, :top] / t.weight, "power", system)
    with np.errstate(invalid="ignore", divide="ignore"):
        gain = _show(np.where(w > 0, t.heat_net[:, :top] / np.where(w > 0, w, 1.0), np.nan), "power", system)
    z = np.where(w > 0, contribution, np.nan).T
    share = (100.0 * w / t.weight).T
    speeds = _show(vy.HEAT_SPEEDS_M_S[:top], "wind_speed", system)
    negative = np.nanmin(z) < 0 if np.isfinite(z).any() else False
    scale = dict(colorscale=DIVERGING, zmid=0.0) if negative else dict(colorscale=SEQUENTIAL)
    fig.add_trace(go.Heatmap(
        x=vy.HEAT_ANGLES_DEG, y=speeds, z=z, customdata=np.dstack([share, gain.T]),
        colorbar=dict(title=dict(text=f"gain × share of time [{pu}]", side="right")), **scale,
        hovertemplate=("angle %{x:.0f}°, wind %{y:.1f} " + _u("wind_speed", system)
                       + "<br>share of time %{customdata[0]:.2f} %<br>net gain there %{customdata[1]:.0f} "
                       + pu + "<br>contribution %{z:.2f} " + pu + "<extra></extra>")))
    fig.update_xaxes(range=[-5, 185], tickvals=list(range(0, 181, 30)))
    return finish(fig)


def operating_time(summary: vy.VoyageSummary) -> go.Figure:
    """Share of time at sea the rotors run freely, run at a limit, or stand still."""
    fig = base_figure("How the rotors spend the time at sea", "Share of time at sea [%]", height=220)
    parts = (("running freely", summary.free_share, colour(2)),
             ("running at a limit", summary.limited_share, colour(4)),
             ("stopped", summary.stopped_share, "#999999"))
    for name, share, col in parts:
        fig.add_trace(go.Bar(x=[100.0 * share], y=["rotors"], orientation="h", name=name,
                             marker_color=col, text=[f"{100 * share:.0f} %"], textposition="inside",
                             hovertemplate=name + ": %{x:.1f} %<extra></extra>"))
    fig.update_layout(barmode="stack")
    fig.update_xaxes(range=[0, 100])
    fig.update_yaxes(showticklabels=False)
    return finish(fig)


def period_bars(df, label_column: str, title: str, labels=None, system: str = "SI") -> go.Figure:
    """Mean net power gain at sea per month or per leg, with the share of sea time on hover."""
    pu = _u("power", system)
    fig = base_figure(title, "", f"Mean net power gain at sea [{pu}]", height=420)
    if df is None or len(df) == 0:
        return finish(fig)
    x = list(labels) if labels is not None else [str(v) for v in df[label_column]]
    y = _show(df["mean_net_power_w"].to_numpy(), "power", system)
    energy = _show(df["energy_saved_j"].to_numpy(), "energy", system)
    share = 100.0 * df["share_of_sea_time"].to_numpy()
    fig.add_trace(go.Bar(x=x, y=y, marker_color=colour(0), customdata=np.c_[share, energy],
                         hovertemplate=("%{x}: %{y:.0f} " + pu + "<br>%{customdata[0]:.1f} % of sea time"
                                        "<br>%{customdata[1]:.0f} " + _u("energy", system)
                                        + " of the yearly saving<extra></extra>")))
    return finish(fig)


def month_bars(df, system: str = "SI") -> go.Figure:
    return period_bars(df, "month", "Net power gain by calendar month", MONTHS, system)


def leg_bars(df, system: str = "SI") -> go.Figure:
    return period_bars(df, "leg", "Net power gain by leg of the route", None, system)


def _option_name(d, h, system) -> str:
    lu = _u("length", system)
    return f"D {units.to_display(d, 'length', system):.3g} × H {units.to_display(h, 'length', system):.3g} {lu}"


def sweep_savings(df, entered: dict, system: str = "SI", column: str = "annual_fuel_saved_kg",
                  kind: str = "fuel_mass", title: str = "Fuel saved per year by rotor size and count",
                  currency: str = "") -> go.Figure:
    """Yearly saving against the number of rotors, one line per size; the entered option starred
    (money in ``currency``)."""
    is_money = kind == "money"
    unit = "" if is_money else _u(kind, system)
    y_title = (f"Money saved per year{f' [{currency}]' if currency else ''}" if is_money
               else f"{title.split(' by ')[0]} [{unit}]")
    fig = base_figure(title, "Number of rotors", y_title, height=460)
    if df is None or len(df) == 0:
        return finish(fig)
    for i, ((d, h), g) in enumerate(df.groupby(["diameter_m", "height_m"], sort=True)):
        g = g.sort_values("rotors")
        y = g[column].to_numpy() if is_money else _show(g[column].to_numpy(), kind, system)
        fig.add_trace(go.Scatter(x=g["rotors"], y=y, mode="lines+markers", name=_option_name(d, h, system),
                                 line=dict(color=colour(i), width=3.5), marker=dict(size=9),
                                 hovertemplate="%{x} rotors: %{y:,.4g} " + unit + "<extra>%{fullData.name}</extra>"))
    pick = df[(np.isclose(df["diameter_m"], entered["diameter_m"])) & (np.isclose(df["height_m"], entered["height_m"]))
              & (df["rotors"] == entered["rotors"])]
    if len(pick):
        y = pick[column].to_numpy() if is_money else _show(pick[column].to_numpy(), kind, system)
        fig.add_trace(go.Scatter(x=pick["rotors"], y=y, mode="markers", name="entered design",
                                 marker=dict(symbol="star", size=20, color="#000000"),
                                 hovertemplate="entered design: %{y:,.4g} " + unit + "<extra></extra>"))
    fig.update_xaxes(dtick=1)
    return finish(fig)


def sweep_payback(df, entered: dict, system: str = "SI") -> go.Figure:
    """Simple payback against the number of rotors, one line per size (never-paying options omitted)."""
    fig = base_figure("Payback by rotor size and count", "Number of rotors", "Simple payback [years]",
                      height=460)
    if df is None or len(df) == 0:
        return finish(fig)
    finite = df[np.isfinite(df["payback_years"])]
    for i, ((d, h), g) in enumerate(df.groupby(["diameter_m", "height_m"], sort=True)):
        g = g[np.isfinite(g["payback_years"])].sort_values("rotors")
        fig.add_trace(go.Scatter(x=g["rotors"], y=g["payback_years"], mode="lines+markers",
                                 name=_option_name(d, h, system), line=dict(color=colour(i), width=3.5),
                                 marker=dict(size=9),
                                 hovertemplate="%{x} rotors: %{y:.1f} years<extra>%{fullData.name}</extra>"))
    pick = finite[(np.isclose(finite["diameter_m"], entered["diameter_m"]))
                  & (np.isclose(finite["height_m"], entered["height_m"])) & (finite["rotors"] == entered["rotors"])]
    if len(pick):
        fig.add_trace(go.Scatter(x=pick["rotors"], y=pick["payback_years"], mode="markers",
                                 name="entered design", marker=dict(symbol="star", size=20, color="#000000"),
                                 hovertemplate="entered design: %{y:.1f} years<extra></extra>"))
    fig.update_xaxes(dtick=1)
    fig.update_yaxes(rangemode="tozero")
    return finish(fig)


def _short_set(label: str) -> str:
    """The source of a set's label ("Bordogna et al. 2019"), or the label itself."""
    return label[label.index("(") + 1:label.index(")")] if "(" in label and ")" in label else label


def spread_bars(df, central_kg: float, system: str = "SI") -> go.Figure:
    """Fuel saved per year with each published coefficient set and spin-power estimate, the
    entered one darker and the central value a dashed line: the spread of the data in one look."""
    unit = _u("fuel_mass", system)
    fig = base_figure("Fuel saved per year across the published data", f"Fuel saved per year [{unit}]",
                      height=max(260, 90 + 48 * len(df)),
                      subtitle="Each bar: the same year with one coefficient set and spin-power estimate")
    if df is None or len(df) == 0:
        return finish(fig)
    names = [f"{_short_set(s)}, {p}" for s, p in zip(df["set"], df["spin_power"])]
    x = _show(df["annual_fuel_saved_kg"].to_numpy(), "fuel_mass", system)
    cols = [colour(0) if c else "#9fb3c8" for c in df["chosen"]]
    fig.add_trace(go.Bar(x=x, y=names, orientation="h", marker_color=cols, showlegend=False,
                         text=[f"{v:,.0f}" for v in x], textposition="auto",
                         hovertemplate="%{y}: %{x:,.4g} " + unit + "<extra></extra>"))
    fig.add_vline(x=float(_show(central_kg, "fuel_mass", system)), line_dash="dash", line_color="#000000",
                  line_width=2)
    fig.update_yaxes(autorange="reversed", automargin=True)
    return finish(fig)


#: Fill of the rating bands A (best) to E: light to dark grey with the letters written on them,
#: so the chart reads without colour (the two points carry the palette's colours).
_BAND_GREYS = ("#f2f2f2", "#dedede", "#c8c8c8", "#b0b0b0", "#969696")


def cii_bands(c) -> go.Figure:
    """The rating bands A-E of the year as a horizontal scale of carbon intensity, with the ship
    without and with the rotors marked on it (``c``: a :class:`liftcore.cii.CIIComparison`)."""
    from liftcore.cii import RATINGS

    b = list(c.boundaries)
    top = max(b[-1] * 1.25, c.attained_before * 1.1, c.attained_after * 1.1)
    low = min(b[0] * 0.75, c.attained_before * 0.9, c.attained_after * 0.9)
    edges = [low] + b + [top]
    fig = base_figure(f"Carbon intensity rating {c.year}", "Attained CII [g CO₂ / (t·nm)]", height=260,
                      subtitle=f"Bands from the required CII {c.required:.3g} (IMO G4); without and with the rotors")
    for i, letter in enumerate(RATINGS):
        fig.add_vrect(x0=edges[i], x1=edges[i + 1], fillcolor=_BAND_GREYS[i], line_width=0, layer="below",
                      annotation_text=f"<b>{letter}</b>", annotation_position="top left",
                      annotation_font_size=18)
    for i, (name, x, letter) in enumerate((("Without rotors", c.attained_before, c.rating_before),
                                           ("With rotors", c.attained_after, c.rating_after))):
        fig.add_trace(go.Scatter(x=[x], y=[0.95 - 0.5 * i], mode="markers+text", name=name,
                                 marker=dict(size=18, color=colour(i), symbol=("circle", "diamond")[i],
                                             line=dict(width=2, color="#000000")),
                                 text=[f"{x:.3g} ({letter})"], textposition="middle right",
                                 hovertemplate=f"{name}: %{{x:.4g}} g CO₂/(t·nm), rated {letter}<extra></extra>"))
    fig.update_yaxes(visible=False, range=[0.1, 1.5])
    fig.update_xaxes(range=[low, top], showgrid=False)
    return finish(fig)
