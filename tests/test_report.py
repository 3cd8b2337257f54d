"""The handout report (self-contained HTML) and the CSV beside it, for a scenario and a comparison.

Numbers are compared with a direct call of the same study (not copied), converted with the
exact definitions of the units: 1 ft = 0.3048 m and 1 lbf = 4.4482216152605 N (international
yard and pound agreement, 1959; NIST SP 811, appendix B), 1 kn = 1852/3600 m/s (BIPM SI
brochure, table 8).
"""

from __future__ import annotations

import csv
import io
import re
from html.parser import HTMLParser

import pytest
from numpy.testing import assert_allclose

from liftcore import report as rp
from liftcore import scenario as sc
from liftcore.studies import run_study
from tests import demo_study


@pytest.fixture(autouse=True)
def demo(monkeypatch):
    demo_study.register(monkeypatch)


class Tags(HTMLParser):
    def __init__(self):
        super().__init__()
        self.tags = []

    def handle_starttag(self, tag, attrs):
        self.tags.append((tag, dict(attrs)))


def tags(html: str):
    p = Tags()
    p.feed(html)
    return p.tags


def network_refs(html: str) -> list[str]:
    """Every attribute that would make a browser fetch something from the network."""
    out = []
    for tag, attrs in tags(html):
        for name in ("src", "href", "data"):
            v = attrs.get(name) or ""
            if re.match(r"\s*(https?:)?//", v):
                out.append(f"<{tag} {name}={v}>")
    return out


def scenario(**kw):
    values = {**demo_study.INPUTS.defaults(), **kw}
    return sc.Scenario("demo", values, title="Invented <b>test</b> & case", note="A note\nover two lines")


def test_report_is_self_contained_and_printable():
    s = scenario(spin_rpm=700.0, surface="rough")
    res = run_study("demo", s.inputs)
    html = rp.scenario_report(s, res, "SI")
    assert html.startswith("<!DOCTYPE html>")
    assert network_refs(html) == []
    assert [t for t, a in tags(html) if t == "script" and "src" in a] == []
    assert html.count("Plotly.newPlot") == 2  # both charts, drawn by the inline bundle
    assert len(html) > 3_000_000  # plotly.js itself is inline
    assert "@media print" in html and "break-inside: avoid" in html and "@page" in html
    # no dark backgrounds in our page (the plotly.js bundle's own styles are not ours to check)
    ours = re.sub(r"<script.*?</script>", "", html, flags=re.S)
    assert re.findall(r"background(?:-color)?:\s*([^;\"}]+)", ours)
    for colour in re.findall(r"background(?:-color)?:\s*#([0-9a-fA-F]{6})", ours):
        assert sum(int(colour[i:i + 2], 16) for i in (0, 2, 4)) / 3 > 200, colour  # light only
    # title and note are escaped, not interpreted
    assert "Invented &lt;b&gt;test&lt;/b&gt; &amp; case" in html and "<b>test</b>" not in html
    # warnings, sources and cautions of the model are all there
    for w in res.warnings:
        assert rp._e(w.message) in html
    assert rp._e(demo_study.SOURCES[0]) in html and rp._e(demo_study.CAUTIONS[0]) in html
    assert "invented data" in html


@pytest.mark.parametrize("system, unit_lift, unit_len, per_n, per_m", [
    # 1 lbf = 4.4482216152605 N, 1 ft = 0.3048 m (exact definitions)
    ("imperial", "lbf", "ft", 1 / 4.4482216152605, 1 / 0.3048),
    ("SI", "N", "m", 1.0, 1.0),
    ("marine", "kN", "m", 1e-3, 1.0),
])
def test_report_shows_inputs_and_headlines_in_the_chosen_units(system, unit_lift, unit_len, per_n, per_m):
    s = scenario(diameter_m=3.0)
    res = run_study("demo", s.inputs)
    html = rp.scenario_report(s, res, system)
    lift = res.headline("lift_n")
    assert f"{lift.text(system)}" in html and lift.text(system).endswith(unit_lift)
    assert_allclose(lift.shown(system)[0], lift.value * per_n, rtol=1e-12)
    rows = {r["key"]: r for r in rp.input_rows("demo", s.inputs, system)}
    assert rows["diameter_m"]["unit"] == unit_len
    # shown as a person would type it: the fewest digits within 0.1 % (9.84 ft for 3 m)
    assert_allclose(float(rows["diameter_m"]["text"]), 3.0 * per_m, rtol=1e-3)
    assert f"<td class=\"num\">{rows['diameter_m']['text']}</td><td>{unit_len}</td>" in html


def test_long_tables_are_left_to_the_csv(monkeypatch):
    monkeypatch.setattr(rp, "MAX_REPORT_TABLE_ROWS", 5)
    s = scenario()
    html = rp.scenario_report(s, run_study("demo", s.inputs), "SI")
    assert "30 rows × 2 columns: in the CSV file" in html


def read_blocks(text: str) -> dict:
    """The CSV blocks (separated by blank lines) keyed by their first cell."""
    blocks, cur = {}, []
    for row in csv.reader(io.StringIO(text)):
        if not row:
            if cur:
                blocks[cur[0][0] if cur[0][0] != "table" else "table:" + cur[0][1]] = cur
            cur = []
        else:
            cur.append(row)
    if cur:
        blocks[cur[0][0] if cur[0][0] != "table" else "table:" + cur[0][1]] = cur
    return blocks


def test_csv_holds_inputs_headlines_warnings_and_tables():
    s = scenario(spin_rpm=700.0)
    res = run_study("demo", s.inputs)
    blocks = read_blocks(rp.scenario_csv(s, res, "imperial"))
    heads = {r[0]: r for r in blocks["headlines"][2:]}
    assert_allclose(float(heads["lift_n"][4]), res.headline("lift_n").value, rtol=1e-15)
    # 1 lbf = 4.4482216152605 N (exact definition)
    assert_allclose(float(heads["lift_n"][2]), res.headline("lift_n").value / 4.4482216152605, rtol=1e-11)
    assert heads["lift_n"][3] == "lbf" and heads["lift_n"][5] == "N"
    inputs = {r[2]: r for r in blocks["inputs"][2:]}
    assert set(inputs) == set(demo_study.INPUTS.keys)
    assert float(inputs["spin_rpm"][5]) == 700.0
    assert [r[2] for r in blocks["warnings"][2:]] == [w.code for w in res.warnings]
    table = blocks["table:lift curve"]
    assert table[1] == list(res.tables["lift curve"].columns)
    assert len(table) - 2 == len(res.tables["lift curve"])


def runs_for(*values_list):
    return [rp.Run(f"Option {chr(65 + i)}", "demo", {**demo_study.INPUTS.defaults(), **v},
                   run_study("demo", {**demo_study.INPUTS.defaults(), **v})) for i, v in enumerate(values_list)]


def test_input_differences_are_exactly_the_changed_inputs():
    runs = runs_for({"diameter_m": 2.0}, {"diameter_m": 3.0}, {"diameter_m": 2.0, "surface": "rough"})
    rows = rp.input_diff_rows("demo", runs, "SI")
    assert [r["key"] for r in rows if r["differs"]] == ["diameter_m", "surface"]
    assert [r["texts"] for r in rows if r["key"] == "surface"] == [["Smooth", "Smooth", "Rough"]]


def test_headline_differences_are_to_the_first_option():
    runs = runs_for({"diameter_m": 2.0}, {"diameter_m": 4.0})
    rows = {r["key"]: r for r in rp.headline_diff_rows(runs, "SI")}
    l0, l1 = (r.result.headline("lift_n").value for r in runs)
    # Kutta-Joukowski with Gamma = 2 pi R (omega R): lift grows as D^2, so doubling D gives x4
    assert_allclose(l1 / l0, 4.0, rtol=1e-12)
    assert rows["lift_n"]["diffs"][0] == "same"
    assert rows["lift_n"]["diffs"][1] == f"+{rp.format_number(l1 - l0, 4)} N (+300 %)"
    assert rows["temperature_k"]["diffs"] == ["same", "same"] and not rows["temperature_k"]["differs"]


def test_differences_of_temperatures_have_no_offset():
    a = demo_study.run({**demo_study.INPUTS.defaults(), "temperature_k": 283.15})
    b = demo_study.run({**demo_study.INPUTS.defaults(), "temperature_k": 293.15})
    # 10 K difference = 18 degF difference (degF = degC * 9/5 + 32; the offset cancels)
    assert rp.difference_text(a.headline("temperature_k"), b.headline("temperature_k"), "imperial").startswith("+18 °F")


def test_overlay_draws_every_option_in_its_own_colour():
    runs = runs_for({"diameter_m": 2.0}, {"diameter_m": 3.0, "with_band": True})
    title, fig = rp.overlay_figure(runs)
    assert title.startswith("Ideal lift against wind speed")
    names = [t.name for t in fig.data]
    assert names == ["Option A · ideal lift", "Option B · ideal lift", "Option B · band"]
    assert fig.data[0].line.color != fig.data[1].line.color
    assert list(fig.data[1].y) == list(runs[1].result.figures[0][1].data[0].y)  # data untouched
    # the inputs' own figures are not modified
    assert runs[0].result.figures[0][1].data[0].name == "ideal lift"


def test_maps_are_not_overlaid(monkeypatch):
    monkeypatch.setattr(demo_study, "COMPARE_FIGURE", 1, raising=False)
    assert rp.overlay_figure(runs_for({}, {"diameter_m": 3.0})) is None


def test_comparison_report_and_csv():
    runs = runs_for({"diameter_m": 2.0}, {"diameter_m": 3.0, "spin_rpm": 900.0})
    html = rp.comparison_report(runs, "Two sizes, invented", "note", "marine")
    assert network_refs(html) == []
    assert "Inputs that differ (2 of 9)" in html
    assert html.count("<tr class=\"differs\">") >= 2
    assert "Option B (vs Option A)" in html
    assert any(w.message in html for w in runs[1].result.warnings)
    blocks = read_blocks(rp.comparison_csv(runs, "marine"))
    heads = {r[1]: r for r in blocks["headlines"][2:]}
    l0, l1 = (r.result.headline("lift_n").value / 1000 for r in runs)  # kN in the marine system
    assert_allclose([float(heads["lift_n"][3]), float(heads["lift_n"][4]), float(heads["lift_n"][5])],
                    [l0, l1, l1 - l0], rtol=1e-11)
    inputs = {r[1]: r for r in blocks["inputs"][2:]}
    assert inputs["diameter_m"][-1] == "yes" and inputs["span_m"][-1] == "no"


def test_comparisons_group_options_by_kind(monkeypatch):
    runs = runs_for({}, {"diameter_m": 3.0})
    other = rp.Run("Other kind", "demo2", runs[0].inputs, runs[0].result)
    grouped = rp.group_by_kind([runs[0], other, runs[1]])
    assert [(k, [r.name for r in g]) for k, g in grouped] == [("demo", ["Option A", "Option B"]),
                                                             ("demo2", ["Other kind"])]


def test_run_comparison_reports_one_overall_progress():
    c = sc.parse_document('schema_version = 2\nkind = "demo"\n[[options]]\nname = "a"\n[[options]]\nname = "b"\n')
    seen = []
    runs = rp.run_comparison(c, progress=lambda f, t="": seen.append(f))
    assert [r.name for r in runs] == ["a", "b"]
    assert seen == sorted(seen) and seen[0] == 0.0 and seen[-1] == 1.0


def test_default_key_chart_is_the_first_flat_chart_that_overlays(monkeypatch):
    import plotly.graph_objects as go

    from liftcore.studies import StudyResult

    monkeypatch.delattr(demo_study, "COMPARE_FIGURE")
    figs = (("map", go.Figure(go.Heatmap(z=[[1]]))), ("3-D", go.Figure(go.Scatter3d(x=[1], y=[1], z=[1]))),
            ("side", go.Figure(go.Scatter(x=[1], y=[1]))))
    res = StudyResult("demo", {}, (), figures=figs)
    assert rp.key_figure("demo", res)[0] == "side"
    assert rp.key_figure("demo", StudyResult("demo", {}, (), figures=figs[:2]))[0] == "map"


def test_a_study_can_draw_its_charts_in_the_chosen_units(monkeypatch):
    import plotly.graph_objects as go

    from liftcore import units

    def figures_in_units(result, system):
        x = units.to_display(result.tables["lift curve"]["wind_speed_m_s"].to_numpy(), "wind_speed", system)
        return ((f"Lift against wind speed [{units.unit_label('wind_speed', system)}]",
                 go.Figure(go.Scatter(x=x, y=result.tables["lift curve"]["lift_n"], name="lift"))),)
    monkeypatch.setattr(demo_study, "figures_in_units", figures_in_units, raising=False)
    monkeypatch.setattr(demo_study, "COMPARE_FIGURE", 0)
    s = scenario()
    res = run_study("demo", s.inputs)
    assert "Lift against wind speed [kn]" in rp.scenario_report(s, res, "marine")
    assert "Lift against wind speed [kn]" not in rp.scenario_report(s, res, "SI")  # SI: the result's own
    title, fig = rp.overlay_figure(runs_for({}, {"diameter_m": 3.0}), "imperial")
    assert title.startswith("Lift against wind speed [mph]")
    # 1 mph = 0.44704 m/s exactly (NIST SP 811, appendix B)
    assert_allclose(fig.data[0].x[-1], 40.0 / 0.44704, rtol=1e-12)


def test_a_study_can_show_its_tables_in_the_chosen_units(monkeypatch):
    from liftcore import units

    def tables_in_units(result, system):
        t = result.tables["lift curve"]
        return {"lift curve": t.assign(wind_speed_m_s=units.to_display(t["wind_speed_m_s"].to_numpy(), "wind_speed", system))
                .rename(columns={"wind_speed_m_s": f"wind speed [{units.unit_label('wind_speed', system)}]"})}
    monkeypatch.setattr(demo_study, "tables_in_units", tables_in_units, raising=False)
    s = scenario()
    res = run_study("demo", s.inputs)
    html = rp.scenario_report(s, res, "marine")
    assert "wind speed [kn]" in html and "wind_speed_m_s" not in html
    # the CSV beside the report keeps the core-unit columns
    assert "wind_speed_m_s" in rp.scenario_csv(s, res, "marine")


def test_real_study_report_and_overlay_in_imperial_units():
    from liftcore import units
    from liftcore.studies import format_number

    s = sc.Scenario("field", {}, title="Invented field check")
    res = run_study("field", {})
    html = rp.scenario_report(s, res, "imperial")
    gamma = units.to_display(res.detail.circulation.circulations_m2_s[0], "circulation", "imperial")
    assert "circulation [ft²/s]" in html and f"<td class=\"num\">{format_number(gamma, 4)}</td>" in html
    first = units.to_display(res.detail.circulation.loop_sizes_m[0], "length", "imperial")
    assert f"<td>circle, radius {first:.4g} ft</td>" in html  # words left-aligned, numbers right
    assert '"text":"x [ft]"' in html  # the map's axis, in the chart's JSON
    flights = [rp.Run(n, "flight", v, run_study("flight", v)) for n, v in
               (("Low", {"elevation_deg": 20.0, "dispersion_n": 0}), ("High", {"elevation_deg": 35.0, "dispersion_n": 0}))]
    title, fig = rp.overlay_figure(flights, "imperial")
    assert title.startswith("Side view") and fig.layout.xaxis.title.text == "Downrange [yd]"
    path = flights[1].result.detail.flights[0].path
    high = [t for t in fig.data if t.name == "High · This flight"][0]
    assert_allclose(high.x, units.to_display(path["x_m"], "distance", "imperial"))


def test_overlaid_options_are_not_cut_off_at_the_first_options_range():
    # the circulation chart fits its x axis to the loops of its own run (0 to 1.05 x largest loop)
    runs = [rp.Run(n, "field", v, run_study("field", v)) for n, v in
            (("Small loops", {"loop_max_m": 0.18}), ("Large loops", {"loop_max_m": 0.28}))]
    single = rp.key_figure("field", runs[0].result, "SI")[1]
    assert single.layout.xaxis.range[1] == pytest.approx(0.18 * 1.05)
    _, fig = rp.overlay_figure(runs, "SI")
    assert fig.layout.xaxis.range is None and fig.layout.xaxis.autorange is True
    assert max(max(t.x) for t in fig.data if t.name == "Large loops · each loop") == pytest.approx(0.28)


def test_rotor_options_compare_round_the_compass_without_per_option_context():
    # the overlay keeps one curve per option and chart panel; spread bands, zero lines and the
    # current point belong to a single option's chart
    from liftcore.studies import run_study

    runs = [rp.Run(name, "rotor", {"diameter_m": d}, run_study("rotor", {"diameter_m": d}), "")
            for name, d in (("five", 5.0), ("four", 4.0))]
    title, fig = rp.overlay_figure(runs)
    assert title.startswith("Thrust and net power gain around the compass")
    assert len(fig.data) == 2 * 2  # two options x (thrust, net gain)
    assert {t.legendgroup for t in fig.data} == {"five", "four"}


def test_voyage_report_says_which_wind_it_used():
    from liftcore.studies import run_study

    result = run_study("voyage", {"sweep": False})
    html = rp.scenario_report(sc.Scenario(kind="voyage", inputs=result.inputs), result)
    # the same sentence the page shows under its title, built from the run itself
    assert f"{result.detail.conditions:,} wind conditions" in html
    assert result.detail.wind_source in html
