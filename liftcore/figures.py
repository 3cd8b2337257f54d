"""Shared look of every chart: a projector-friendly Plotly template and a colour-blind-safe palette.

Topic figure builders live beside their topic (``figures_flow.py``, ``figures_rotor.py``, ...) and
start from :func:`base_figure` so that every chart in the pages and the report reads the same.
"""

from __future__ import annotations

import plotly.graph_objects as go

#: Okabe & Ito (2008) colour-universal-design palette (colour-blind safe), reordered for contrast.
PALETTE = ("#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9", "#000000", "#F0E442")
#: A sequential scale for heat maps that stays readable in grey and for colour-blind viewers.
SEQUENTIAL = "Cividis"
DIVERGING = "RdBu"

FONT_SIZE = 17
LINE_WIDTH = 3.5


def base_figure(title: str, x_title: str = "", y_title: str = "", height: int = 460) -> go.Figure:
    """An empty figure with the house style: large fonts, thick lines, unit-labelled axes."""
    fig = go.Figure()
    fig.update_layout(
        title=dict(text=title, font=dict(size=FONT_SIZE + 3), x=0.0, xanchor="left"),
        font=dict(size=FONT_SIZE, family="Arial, Helvetica, sans-serif"),
        colorway=list(PALETTE),
        template="plotly_white",
        height=height,
        margin=dict(l=70, r=30, t=70, b=60),
        legend=dict(font=dict(size=FONT_SIZE - 1), bgcolor="rgba(255,255,255,0.7)"),
        hoverlabel=dict(font_size=FONT_SIZE - 1),
    )
    fig.update_xaxes(title_text=x_title, showline=True, linewidth=1.5, linecolor="#444",
                     gridcolor="#e5e5e5", zeroline=False, ticks="outside")
    fig.update_yaxes(title_text=y_title, showline=True, linewidth=1.5, linecolor="#444",
                     gridcolor="#e5e5e5", zeroline=False, ticks="outside")
    return fig


def colour(i: int) -> str:
    """The i-th palette colour (wraps round)."""
    return PALETTE[i % len(PALETTE)]


def band(fig: go.Figure, x, low, high, name: str, colour_hex: str, opacity: float = 0.2) -> None:
    """Shade the region between ``low`` and ``high`` (e.g. the spread between data sets)."""
    r, g, b = (int(colour_hex[i:i + 2], 16) for i in (1, 3, 5))
    fig.add_trace(go.Scatter(x=list(x) + list(x)[::-1], y=list(high) + list(low)[::-1],
                             fill="toself", fillcolor=f"rgba({r},{g},{b},{opacity})", mode="lines",
                             line=dict(width=0), name=name, hoverinfo="skip"))
