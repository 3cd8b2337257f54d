"""Shared look of every chart: a projector-friendly Plotly template and a colour-blind-safe palette.

Topic figure builders live beside their topic (``figures_flow.py``, ``figures_rotor.py``, ...),
start from :func:`base_figure` and end with :func:`finish`, so that every chart in the pages and the
report reads the same and no text is cut or overlaps at any chart width:

- Plotly does not wrap text, and a chart does not know how wide it will be drawn (a column on a
  laptop, the full width of a large screen, the handout). Titles, subtitles and axis titles are
  therefore wrapped at spaces for the narrowest chart the pages draw (:data:`NARROW_CHART_PX`); the
  top margin is sized to the title's lines.
- Axes carry ``automargin``, so tick labels and (wrapped) axis titles push the margins instead of
  running out of the chart.
- The legend sits in the chart's own bottom edge, in rows (``yref="container"``): Plotly reserves
  its height under the axis titles, so it never sits on them; :func:`finish` grows the chart by the
  rows the legend needs at the narrowest width, so the plot keeps its size.
"""

from __future__ import annotations

import math
import textwrap

import plotly.graph_objects as go
import plotly.io as pio

#: Okabe & Ito (2008) colour-universal-design palette (colour-blind safe), reordered for contrast.
PALETTE = ("#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9", "#000000", "#F0E442")
#: A sequential scale for heat maps that stays readable in grey and for colour-blind viewers.
SEQUENTIAL = "Cividis"
DIVERGING = "RdBu"

FONT_SIZE = 17
TITLE_SIZE = FONT_SIZE + 3
SUBTITLE_SIZE = FONT_SIZE - 2
SUBTITLE_COLOUR = "#333333"
LEGEND_SIZE = FONT_SIZE - 1
LINE_WIDTH = 3.5

#: The narrowest chart the pages draw: one of two columns beside the sidebar on a 1280 px screen. [px]
NARROW_CHART_PX = 380
#: Mean advance of a character of Arial / Liberation Sans in this project's titles and legends,
#: measured in Chromium (0.43 to 0.48 em); the larger value errs toward wrapping. [em]
CHAR_EM = 0.47
#: Characters per line before a title, subtitle or axis title wraps (fits NARROW_CHART_PX).
TITLE_CHARS = int((NARROW_CHART_PX - 20) / (CHAR_EM * TITLE_SIZE))          # 38
SUBTITLE_CHARS = int((NARROW_CHART_PX - 20) / (CHAR_EM * SUBTITLE_SIZE))    # 51
#: Axis titles run along the plot, which leaves ~110 px of the chart to tick labels and margins.
AXIS_TITLE_CHARS = int((NARROW_CHART_PX - 110) / (CHAR_EM * FONT_SIZE))     # 33
#: Plotly's line height is 1.3 em (of the title font, for the subtitle lines too). [px]
TITLE_LINE_PX = math.ceil(1.3 * TITLE_SIZE)
#: Space above the title, and between the title block and the plot. [px]
TITLE_TOP_PX = 10
TITLE_GAP_PX = 20
#: Plotly's shift of a title's first line when anchored at its top (``alignment.CAP_SHIFT``). [em]
CAP_SHIFT_EM = 0.70
#: One row of the legend, and the room a legend entry takes beside its text (symbol, gaps). [px]
LEGEND_ROW_PX = 25
LEGEND_SYMBOL_PX = 46
LEGEND_PAD_PX = 8


def _house_template() -> go.layout.Template:
    """plotly_white with the house axes, applied to every axis a figure gets (subplots too)."""
    t = go.layout.Template(pio.templates["plotly_white"])
    axis = dict(showline=True, linewidth=1.5, linecolor="#444", gridcolor="#e5e5e5", zeroline=False,
                ticks="outside", automargin=True, title=dict(standoff=10))
    t.layout.xaxis.update(axis)
    t.layout.yaxis.update(axis)
    return t


HOUSE_TEMPLATE = _house_template()
#: The house template is Plotly's default for the figures made here (base_figure sees that it
#: stays so): a default template is attached without being validated again, while
#: ``template=`` on each figure costs about 18 ms a chart (most of a page's chart time).
pio.templates["liftcore"] = HOUSE_TEMPLATE
pio.templates.default = "liftcore"


def wrap(text: str, width: int) -> str:
    """Break a chart text into lines at spaces.

    Parameters
    ----------
    text : str
        Plain text; ``<br>`` line breaks already in it are kept.
    width : int
        Most characters per line. A word longer than this stays whole on its own line.

    Returns
    -------
    str
        The lines joined by Plotly's ``<br>``.
    """
    if not text:
        return text
    parts = str(text).replace("<br />", "<br>").replace("<br/>", "<br>").split("<br>")
    lines = []
    for part in parts:
        lines += textwrap.wrap(part, width, break_long_words=False, break_on_hyphens=False) or [""]
    return "<br>".join(lines)


def _lines(text) -> int:
    return 0 if not text else str(text).count("<br>") + 1


def base_figure(title: str, x_title: str = "", y_title: str = "", height: int = 460,
                subtitle: str = "") -> go.Figure:
    """An empty figure with the house style: large fonts, thick lines, unit-labelled axes, the
    legend in rows under the plot. ``height`` is the chart without its legend (see :func:`finish`);
    ``subtitle`` holds what the title leaves out (the model, a caution)."""
    if pio.templates.default != "liftcore":  # importing Streamlit's chart module resets it
        pio.templates.default = "liftcore"
    # One Figure(layout=...) call: Plotly checks a layout given whole several times faster than
    # the same properties set by update_layout.
    return go.Figure(layout=dict(
        title=dict(text=title, font=dict(size=TITLE_SIZE), x=0.0, xref="container", xanchor="left",
                   y=1.0, yref="container", yanchor="top", pad=dict(t=TITLE_TOP_PX, l=2),
                   subtitle=dict(text=subtitle)),
        font=dict(size=FONT_SIZE, family="Arial, Helvetica, sans-serif"),
        colorway=list(PALETTE),
        height=height,
        margin=dict(l=20, r=20, t=70, b=16),
        legend=dict(font=dict(size=LEGEND_SIZE), bgcolor="rgba(255,255,255,0.7)", orientation="h",
                    xref="container", x=0.0, xanchor="left", yref="container", y=0.0, yanchor="bottom",
                    traceorder="normal"),
        hoverlabel=dict(font_size=FONT_SIZE - 1),
        xaxis=dict(title=dict(text=x_title)),
        yaxis=dict(title=dict(text=y_title)),
    ))


def legend_entries(fig: go.Figure) -> list[str]:
    """Names the legend shows. Plotly draws a legend once a figure has two traces or more, even
    if only one of them is listed (peak markers, landing points are not), or when told to."""
    seen, names = set(), []
    for t in fig.data:
        shown = t.showlegend if t.showlegend is not None else t.type not in (
            "heatmap", "contour", "surface", "histogram2d", "histogram2dcontour")
        if not shown or not t.name:
            continue
        key = t.legendgroup or t.name
        if key in seen and t.legendgroup:
            continue
        seen.add(key)
        names.append(str(t.name))
    if len(fig.data) < 2 and fig.layout.showlegend is not True:
        return []
    return names


def legend_rows(names, width_px: float = NARROW_CHART_PX) -> int:
    """Rows a horizontal legend takes: Plotly places the entries left to right and starts a new
    row when the next one does not fit.

    Parameters
    ----------
    names : sequence of str
        The legend's entries.
    width_px : float
        Width of the chart. [px]

    Returns
    -------
    int
        Number of rows.

    Notes
    -----
    An entry is :data:`LEGEND_SYMBOL_PX` plus :data:`CHAR_EM` x :data:`LEGEND_SIZE` per character
    of its longest line wide.
    """
    rows, used = 0, width_px
    for name in names:
        longest = max((len(s) for s in str(name).split("<br>")), default=0)
        w = LEGEND_SYMBOL_PX + CHAR_EM * LEGEND_SIZE * longest
        if used + w > width_px:
            rows += 1 + str(name).count("<br>")
            used = 0.0
        used += w
    return rows


def title_block(title: str, subtitle: str = "") -> str:
    """The chart title's text: ``title`` wrapped, then ``subtitle`` wrapped in the smaller, softer
    subtitle font. One text, so Plotly stacks its lines evenly (its own subtitle and multi-line
    titles are placed by rules that shift with the number of lines)."""
    lines = wrap(title or "", TITLE_CHARS).split("<br>") if title else []
    if subtitle:
        style = f"font-size:{SUBTITLE_SIZE}px;color:{SUBTITLE_COLOUR}"
        lines += [f"<span style='{style}'>{line}</span>" for line in wrap(subtitle, SUBTITLE_CHARS).split("<br>")]
    return "<br>".join(lines)


def top_margin(lines: int) -> int:
    """The top margin that holds a title block of ``lines`` lines. [px]"""
    return TITLE_TOP_PX + TITLE_LINE_PX * max(lines, 1) + TITLE_GAP_PX


def set_title(fig: go.Figure, title: str, subtitle: str = "", top_extra: int = 0) -> go.Figure:
    """Give a chart its title block (see :func:`title_block`) and the top margin that holds it.

    Parameters
    ----------
    fig : plotly.graph_objects.Figure
        The chart, changed in place.
    title, subtitle : str
        Plain texts (not yet wrapped).
    top_extra : int
        Room added above the plot for panel titles or labels over it. [px]

    Returns
    -------
    plotly.graph_objects.Figure
        ``fig``. The plain texts are kept in ``layout.meta``, so a chart made from this one (an
        overlay of options) can be titled again.
    """
    text = title_block(title, subtitle)
    lines = _lines(text)
    # Plotly lifts the first line of a multi-line title by its cap height when anchored at the top
    lift = round(CAP_SHIFT_EM * TITLE_SIZE) if lines > 1 else 0
    meta = dict(fig.layout.meta) if isinstance(fig.layout.meta, dict) else {}
    meta.update(title=title, subtitle=subtitle, top_extra=top_extra)
    layout = fig.layout  # properties set one by one: far cheaper than update_layout
    layout.title.text = text
    layout.title.subtitle.text = ""
    layout.title.pad.t = TITLE_TOP_PX + lift
    layout.margin.t = top_margin(lines) + top_extra
    layout.meta = meta
    return fig


def finish(fig: go.Figure, top_extra: int = 0, below_polar: int = 0) -> go.Figure:
    """Fit a built chart's text to any width down to :data:`NARROW_CHART_PX`.

    Wraps the title, the subtitle (see :func:`set_title`) and every cartesian axis title, sizes the
    top margin to the title, and grows the chart by the rows its legend needs at the narrowest
    width, so the plot keeps its size.

    Parameters
    ----------
    fig : plotly.graph_objects.Figure
        A chart started with :func:`base_figure`, changed in place.
    top_extra : int
        Room above the plot for panel titles or labels over it. [px]
    below_polar : int
        Room kept free under each polar chart for its bottom compass label: the legend's rows
        are taken out of the bottom margin, so the margin alone would not keep it. [px]

    Returns
    -------
    plotly.graph_objects.Figure
        ``fig``.
    """
    meta = fig.layout.meta if isinstance(fig.layout.meta, dict) else {}
    if "title" in meta:  # titled before: start again from the plain texts
        set_title(fig, meta["title"], meta.get("subtitle", ""), top_extra)
    else:
        title = fig.layout.title
        set_title(fig, title.text or "", (title.subtitle.text if title.subtitle else "") or "", top_extra)
    for ax in list(fig.select_xaxes()) + list(fig.select_yaxes()):
        if ax.title.text:
            ax.title.text = wrap(ax.title.text, AXIS_TITLE_CHARS)
    height = fig.layout.height or 460
    if below_polar:
        plot_px = height - fig.layout.margin.t - (fig.layout.margin.b or 0)
        fig.for_each_polar(lambda p: p.update(domain_y=[min(below_polar / plot_px, 0.4), 1.0]))
    names = legend_entries(fig)
    if names and fig.layout.showlegend is not False:
        fig.layout.height = height + LEGEND_ROW_PX * legend_rows(names) + LEGEND_PAD_PX
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

