"""Layout rules the chart builders keep, checked by arithmetic on the figures (no browser).

The browser test (tests/browser/test_layout.py) measures the drawn charts; these rules are what
makes them pass at any width, so a builder that breaks one fails here in seconds:
every chart of every demo scenario (SI and imperial) and the flight page's own charts keep their
titles and axis titles within the line lengths that fit the narrowest chart, let every axis push
its margins, keep the legend in rows at the chart's bottom edge with room for it, leave room for the
compass labels of polar charts, and mark points on heat maps so they show on every colour.
"""

from __future__ import annotations

import re
from pathlib import Path

import numpy as np
import plotly.colors as pc
import pytest

from liftcore import ballflight as bf
from liftcore import figures
from liftcore import figures_ball as fb
from liftcore import figures_rotor as fr
from liftcore import scenario as sc
from liftcore.studies import flight as flight_study
from liftcore.studies import run_study, study

ROOT = Path(__file__).resolve().parents[1]
SCENARIOS = sorted((ROOT / "scenarios").glob("*.toml"))


def _studies():
    out = []
    for path in SCENARIOS:
        doc = sc.load_document(path)
        if isinstance(doc, sc.Comparison):
            continue
        out.append((path.stem, doc.kind, doc.inputs))
    return out


@pytest.fixture(scope="module")
def charts():
    """(name, figure) of every chart of every demo scenario in SI and imperial units, and the
    flight page's sweep (with a searched best), spread, coefficient and track-fit charts."""
    out = []
    for stem, kind, inputs in _studies():
        result = run_study(kind, inputs)
        for system in ("SI", "imperial"):
            for title, fig in study(kind).figures_in_units(result, system):
                out.append((f"{stem} {system}: {title}", fig))
    setup, _ = flight_study.setup_from_values(flight_study.INPUTS.validate({}))
    launch = flight_study.launch_from_values(flight_study.INPUTS.validate({}))
    sw = bf.sweep(setup, launch, "elevation_deg", np.linspace(10, 45, 5), "spin_rpm",
                  np.linspace(0, 4000, 5), "carry_m", True)
    labels = {k: (v[0], v[1]) for k, v in bf.SWEEP_INPUTS.items()}
    out.append(("sweep", fb.sweep_heatmap(sw, labels, "Carry", "distance", "SI", searched=(30.0, 1500.0))))
    flight = run_study("flight", {"dispersion_n": 200})
    out.append(("spread", fb.carry_histogram(flight.detail.dispersion)))
    out.append(("coefficients", fb.coefficient_curves(flight.detail.setup.model, flight.detail.flights[0])))
    out.append(("fit residuals", fb.fit_residuals(_fit())))
    out.append(("fit side", fb.fit_tracks_side(_fit(), bf.demo_tracks())))
    return out


_FIT = []


def _fit():
    if not _FIT:
        _FIT.append(bf.fit_tracks(bf.demo_tracks_setup(), bf.demo_tracks(), bf.DEMO_TRACKS["spin_rpm"],
                                  bf.DEMO_TRACKS["spin_axis_deg"], mode="constant"))
    return _FIT[0]


def _plain_lines(text: str) -> list[str]:
    return [re.sub(r"<[^>]+>", "", line) for line in (text or "").split("<br>")]


def _fits(line: str, width: int) -> bool:
    return len(line) <= width or " " not in line.strip()


def test_wrap_breaks_at_spaces_and_keeps_given_breaks():
    text = figures.wrap("Speed, spin and spin parameter along the flight<br>second part", 20)
    lines = text.split("<br>")
    assert " ".join(lines) == "Speed, spin and spin parameter along the flight second part"
    assert all(len(line) <= 20 for line in lines) and lines[-1] == "second part"
    assert figures.wrap("Downrange [m]", 33) == "Downrange [m]"


def test_legend_rows_wrap_entries_that_do_not_fit_the_row():
    # entries are a symbol plus their text: two short names share a row, a long one takes its own
    short = "x" * 10
    one = figures.LEGEND_SYMBOL_PX + figures.CHAR_EM * figures.LEGEND_SIZE * 10
    assert figures.legend_rows([short, short], width_px=2 * one + 1) == 1
    assert figures.legend_rows([short, short, short], width_px=2 * one + 1) == 2
    assert figures.legend_rows([short, "y" * 200, short], width_px=2 * one + 1) == 3


def test_titles_and_axis_titles_fit_the_narrowest_chart(charts):
    for name, fig in charts:
        title = fig.layout.title.text or ""
        parts = title.split("<br>")
        for raw, line in zip(parts, _plain_lines(title)):
            width = figures.SUBTITLE_CHARS if "font-size" in raw else figures.TITLE_CHARS
            assert _fits(line, width), f"{name}: title line {line!r} longer than {width} characters"
        assert not (fig.layout.title.subtitle and fig.layout.title.subtitle.text), (
            f"{name}: Plotly's own subtitle is placed by rules that shift with its lines")
        lines = len(parts)
        assert fig.layout.margin.t >= figures.top_margin(lines), f"{name}: top margin too small for the title"
        for axis in [*fig.select_xaxes(), *fig.select_yaxes()]:
            for line in _plain_lines(axis.title.text):
                assert _fits(line, figures.AXIS_TITLE_CHARS), f"{name}: axis title line {line!r} too long"


def test_every_axis_pushes_its_margins(charts):
    assert figures.HOUSE_TEMPLATE.layout.xaxis.automargin is True
    assert figures.HOUSE_TEMPLATE.layout.yaxis.automargin is True
    for name, fig in charts:
        assert fig.layout.template.layout.xaxis.automargin is True, name
        for axis in [*fig.select_xaxes(), *fig.select_yaxes()]:
            assert axis.automargin is not False, f"{name}: an axis with automargin off"


def test_legends_sit_in_rows_at_the_bottom_edge_with_room_for_the_plot(charts):
    for name, fig in charts:
        entries = figures.legend_entries(fig)
        if not entries or fig.layout.showlegend is False:
            continue
        lg = fig.layout.legend
        # at the chart's bottom edge, Plotly reserves the legend's rows under the axis titles
        assert (lg.orientation, lg.yref, lg.y, lg.yanchor) == ("h", "container", 0, "bottom"), name
        assert (lg.xref, lg.x, lg.xanchor) == ("container", 0, "left"), name
        # the plot and its axis labels keep at least 120 px in the narrowest chart (a one-bar chart
        # needs about that), under the title and over the legend
        legend_px = figures.LEGEND_ROW_PX * figures.legend_rows(entries)
        plot_px = fig.layout.height - fig.layout.margin.t - fig.layout.margin.b - legend_px
        assert plot_px >= 120, f"{name}: {plot_px:.0f} px left for the plot"


def _label_px(text: str, size: float) -> float:
    return max(figures.CHAR_EM * size * len(line) for line in _plain_lines(text))


def test_compass_charts_leave_room_for_their_side_labels():
    # in the 680 px handout chart the two compass charts' side labels must not meet
    result = run_study("rotor", {})
    fig = dict(result.figures)["Thrust and net power gain around the compass"]
    width = 680
    plot_px = width - fig.layout.margin.l - fig.layout.margin.r
    left, right = fig.layout.polar.domain.x, fig.layout.polar2.domain.x
    labels = fr.COMPASS_LABELS
    side = max(_label_px(labels[2], figures.FONT_SIZE), _label_px(labels[6], figures.FONT_SIZE))
    assert (right[0] - left[1]) * plot_px >= 2 * side + 10
    assert min(fig.layout.margin.l, fig.layout.margin.r) >= side
    # and under each circle there is room for the stern label above the legend
    assert fig.layout.polar.domain.y[0] * (fig.layout.height - fig.layout.margin.t) >= fr.COMPASS_LABEL_PX * 0.8


def _rgb(colour: str) -> list[float]:
    named = {"white": "#ffffff", "black": "#000000"}
    colour = named.get(colour, colour)
    if colour.startswith("rgb"):
        return [float(v) for v in re.findall(r"[\d.]+", colour)[:3]]
    return [float(v) for v in pc.hex_to_rgb(colour)]


def _contrast(a: str, b: str) -> float:
    """Contrast ratio (L1 + 0.05) / (L2 + 0.05) of two sRGB colours, with the relative luminance
    of W3C (2018), Web Content Accessibility Guidelines 2.1."""
    def lum(colour):
        lin = [c / 12.92 if c <= 0.04045 else ((c + 0.055) / 1.055) ** 2.4
               for c in (v / 255.0 for v in _rgb(colour))]
        return 0.2126 * lin[0] + 0.7152 * lin[1] + 0.0722 * lin[2]
    hi, lo = sorted((lum(a), lum(b)), reverse=True)
    return (hi + 0.05) / (lo + 0.05)


def test_heat_map_markers_show_on_every_colour_of_the_scale(charts):
    fig = dict(charts)["sweep"]
    heat = next(t for t in fig.data if t.type == "heatmap")
    scale = [c for _, c in heat.colorscale]
    samples = pc.sample_colorscale(scale, np.linspace(0.0, 1.0, 21))
    markers = [t for t in fig.data if t.type == "scatter"]
    assert {t.name for t in markers} == {"highest on the grid", "searched best"}
    for t in markers:
        m = t.marker
        assert not str(m.symbol).endswith("open"), f"{t.name}: an open symbol has no fill"
        assert m.line.width >= 2, t.name
        for c in samples:
            # WCAG 2.1 asks 3:1 for graphical objects; either the fill or the outline must reach it
            best = max(_contrast(m.color, c), _contrast(m.line.color, c))
            assert best >= 3.0, f"{t.name} on {c}: contrast {best:.2f}"


def test_fit_residuals_are_signed_model_minus_observed_per_axis(charts):
    fit = _fit()
    fig = dict(charts)["fit residuals"]
    assert "model minus observed" in fig.layout.title.text
    name = fit.flights[0]
    r = fit.residuals[fit.residuals["flight"] == name]
    drawn = [t for t in fig.data if t.name == name]
    assert [t.yaxis for t in drawn] == ["y", "y2", "y3"]
    for t, col in zip(drawn, ("dx", "dy", "dz")):
        np.testing.assert_allclose(np.asarray(t.y, float), r[col].to_numpy())
    # signed: the noise of the invented tracks puts the model on both sides of the observations
    allv = np.concatenate([np.asarray(t.y, float) for t in drawn])
    assert allv.min() < 0 < allv.max()
