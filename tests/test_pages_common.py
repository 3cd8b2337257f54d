"""Page machinery in a real Streamlit script run (AppTest): unit switch, scenario files, share
links, kept options and the Compare options page, first on the test-only study, then on every
study page of the dashboard. What a page shows is compared with a direct core call."""

from __future__ import annotations

import html
import importlib.util
from pathlib import Path

import pytest
from streamlit.runtime.media_file_manager import MediaFileManager
from streamlit.testing.v1 import AppTest

from liftcore import scenario as sc
from liftcore import units
from liftcore.studies import STUDY_MODULES, run_study, study
from tests import demo_study
from views import PAGES

ROOT = Path(__file__).resolve().parents[1]
TIMEOUT = 120


def demo_page():
    import streamlit as st

    from liftcore.studies import study
    from views import inputs, results, tools

    inputs.sidebar_chrome()
    mod = study("demo")
    st.title(mod.TITLE)
    values = inputs.render_inputs(mod.INPUTS)
    tools.page_tools(mod.INPUTS)
    result = results.run_cached("demo", values)
    results.show_headlines(result)


@pytest.fixture(autouse=True)
def demo(monkeypatch):
    demo_study.register(monkeypatch)
    monkeypatch.setitem(STUDY_MODULES, "demo2", demo_study.MODULE)


@pytest.fixture
def downloads(monkeypatch):
    """What each download button would hand the browser, by file extension or file name."""
    got: dict[str, object] = {}
    add, add_deferred = MediaFileManager.add, MediaFileManager.add_deferred

    def rec_add(self, data, mimetype, coordinates, file_name=None, is_for_static_download=False):
        if file_name:
            got[Path(file_name).suffix] = got[file_name] = data
        return add(self, data, mimetype, coordinates, file_name, is_for_static_download)

    def rec_deferred(self, fn, mimetype, coordinates, file_name=None, **kw):
        if file_name:
            got[Path(file_name).suffix] = got[file_name] = fn
        return add_deferred(self, fn, mimetype, coordinates, file_name, **kw)
    monkeypatch.setattr(MediaFileManager, "add", rec_add)
    monkeypatch.setattr(MediaFileManager, "add_deferred", rec_deferred)

    def get(ext: str) -> str:
        data = got[ext]
        data = data() if callable(data) else data
        return data.decode() if isinstance(data, bytes) else data
    return get


def app() -> AppTest:
    at = AppTest.from_function(demo_page, default_timeout=TIMEOUT)
    return at


def metrics(at) -> list[str]:
    return [m.value for m in at.metric]


def state_values(at, kind: str, spec) -> dict:
    """Every input as the page holds it (inputs never drawn, e.g. hidden ones, at their default)."""
    return {f.key: at.session_state[f"{kind}:{f.key}"] if f"{kind}:{f.key}" in at.session_state
            else f.default for f in spec.fields}


def shown(kind, values, system):
    return [h.text(system) for h in run_study(kind, values).headlines]


def check_metrics(at, kind, values, system, independent=False):
    """Every big number on the page is the study's headline of that label, in ``system``.

    The result comes from the shared cache (the page's own run) unless ``independent``: then the
    study runs again here.
    """
    from views.results import cached_result

    result = run_study(kind, values) if independent else cached_result(kind, values)
    if kind == "flight":  # its numbers are in one sentence above the picture, not in tiles
        from liftcore.studies import flight
        from views.results import bold_html

        sentence = bold_html(flight.summary(result, system))
        assert any(sentence in m.value for m in at.markdown), "no flight summary shown"
        return
    heads = {h.label: h.text(system) for h in result.headlines}
    seen = [(m.label, m.value) for m in at.metric if m.label in heads]
    assert seen, "no headline shown"
    assert seen == [(label, heads[label]) for label, _ in seen]


def messages(at) -> str:
    return " | ".join([e.value for e in at.error] + [w.value for w in at.warning] + [s.value for s in at.success])


# ----------------------------------------------------------------------------- units
def test_unit_switch_keeps_values_exactly_and_converts_headlines():
    at = app()
    at.run()
    at.number_input(key="w:demo:diameter_m:SI").set_value(3.0).run()
    at.number_input(key="w:demo:temperature_k:SI").set_value(20.0).run()  # °C in the SI display
    values = {**demo_study.INPUTS.defaults(), "diameter_m": 3.0, "temperature_k": 293.15}
    assert at.session_state["demo:temperature_k"] == pytest.approx(293.15, abs=1e-12)
    exact = state_values(at, "demo", demo_study.INPUTS)
    for system in ("imperial", "marine", "SI", "imperial", "SI"):
        at.segmented_control(key="unit_system").set_value(system).run()
        assert not at.exception
        assert state_values(at, "demo", demo_study.INPUTS) == exact  # bit for bit: no drift
        assert metrics(at) == shown("demo", values, system)
    at.segmented_control(key="unit_system").set_value("imperial").run()
    # 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959): 3 m = 9.8425 ft,
    # shown as a person would type it, 9.84 ft (within 0.1 %); the value used stays exact
    assert at.number_input(key="w:demo:diameter_m:imperial").value == 9.84
    assert at.session_state["demo:diameter_m"] == 3.0
    at.number_input(key="w:demo:diameter_m:imperial").set_value(10.0).run()
    assert at.session_state["demo:diameter_m"] == pytest.approx(3.048, rel=1e-12)
    # degF = degC * 9/5 + 32: 20 degC is 68 degF
    assert at.number_input(key="w:demo:temperature_k:imperial").value == pytest.approx(68.0)
    at.segmented_control(key="unit_system").set_value("SI").run()
    assert at.number_input(key="w:demo:diameter_m:SI").value == 3.05  # 3.048 m within 0.1 %
    assert at.session_state["demo:diameter_m"] == pytest.approx(3.048, rel=1e-12)


# ----------------------------------------------------------------------------- scenario files
def set_some_inputs(at):
    at.number_input(key="w:demo:diameter_m:SI").set_value(3.5).run()
    at.number_input(key="w:demo:count:SI").set_value(3).run()
    at.selectbox(key="w:demo:surface:SI").set_value("rough").run()
    at.toggle(key="w:demo:with_band:SI").set_value(True).run()
    at.text_input(key="w:demo:label:SI").set_value("changed, invented").run()
    at.segmented_control(key="unit_system").set_value("marine").run()
    at.number_input(key="w:demo:wind_speed_m_s:marine").set_value(20.0).run()  # knots
    at.text_input(key="_lc:wtitle:demo").set_value("My invented case").run()


def test_scenario_file_round_trip_reproduces_the_page(downloads):
    a = app()
    a.run()
    set_some_inputs(a)
    assert not a.exception
    values_a, metrics_a = state_values(a, "demo", demo_study.INPUTS), metrics(a)
    text = downloads(".toml")
    saved = sc.parse_scenario(text)
    assert saved.inputs == values_a and saved.title == "My invented case" and saved.unit_system == "marine"

    b = app()
    b.run()
    assert metrics(b) == shown("demo", demo_study.INPUTS.defaults(), "SI")
    b.file_uploader[0].set_value(("case.toml", text.encode(), "application/toml")).run()
    assert not b.exception
    assert state_values(b, "demo", demo_study.INPUTS) == values_a
    assert b.session_state["unit_system"] == "marine"
    assert metrics(b) == metrics_a
    assert "Loaded case.toml." in messages(b)
    assert b.text_input(key="_lc:wtitle:demo").value == "My invented case"
    # the widgets show the loaded values (20 kn)
    assert b.number_input(key="w:demo:wind_speed_m_s:marine").value == pytest.approx(20.0)
    # the uploader was reset, so a later edit is not overwritten by the same file
    b.number_input(key="w:demo:diameter_m:marine").set_value(2.5).run()
    assert b.session_state["demo:diameter_m"] == 2.5


@pytest.mark.parametrize("content, message", [
    (b"\x00\x01binary junk", "junk.toml is binary data"),
    (b"schema_version = 2\nkind = ", "junk.toml is not valid TOML"),
    (b'schema_version = 7\nkind = "demo"', "schema_version 7, newer than this liftcore reads"),
    (b'schema_version = 2\nkind = "demo"\n[inputs]\ndiameter_m = nan', "must be a finite number"),
    (b'schema_version = 2\nkind = "demo"\n[inputs]\ndiameter_m = 500.0', "must be between 0.1 and 20 m (got 500 m)"),
    (b'schema_version = 2\nkind = "demo"\n[inputs]\nsize = 1.0', "unknown key 'size'"),
    (b'schema_version = 2\nkind = "demo2"\n', "junk.toml is a demo2 scenario; load it on the"),
    (b"#" * (sc.MAX_SCENARIO_BYTES + 10), "scenario files must be at most 1,000,000 bytes"),
])
def test_bad_upload_shows_an_error_and_keeps_what_was_typed(content, message):
    at = app()
    at.run()
    at.number_input(key="w:demo:diameter_m:SI").set_value(3.3).run()
    before = state_values(at, "demo", demo_study.INPUTS)
    at.file_uploader[0].set_value(("junk.toml", content, "application/toml")).run()
    assert not at.exception
    assert message in " ".join(e.value for e in at.error)
    assert state_values(at, "demo", demo_study.INPUTS) == before
    assert at.number_input(key="w:demo:diameter_m:SI").value == 3.3


def test_a_comparison_file_loaded_on_a_page_becomes_kept_options():
    text = ('schema_version = 2\nkind = "demo"\n[[options]]\nname = "A"\n[[options]]\nname = "B"\n'
            '[options.inputs]\ndiameter_m = 4.0\n')
    at = app()
    at.run()
    at.file_uploader[0].set_value(("two.toml", text.encode(), "application/toml")).run()
    assert [o["name"] for o in at.session_state["_lc:options"]] == ["A", "B"]
    assert "its 2 options are kept" in messages(at)


# ----------------------------------------------------------------------------- share links
def test_share_link_round_trip():
    a = app()
    a.run()
    assert dict(a.query_params) == {}  # defaults: a clean address
    set_some_inputs(a)
    params = {k: v[0] if isinstance(v, list) else v for k, v in a.query_params.items()}
    assert params["v"] == "1" and params["units"] == "marine" and "span_m" not in params
    code = a.code[0].value
    assert code.startswith("/demo?v=1&units=marine")

    b = app()
    for k, v in params.items():
        b.query_params[k] = v
    b.run()
    assert not b.exception
    assert state_values(b, "demo", demo_study.INPUTS) == state_values(a, "demo", demo_study.INPUTS)
    assert b.session_state["unit_system"] == "marine"
    assert metrics(b) == metrics(a)
    assert "Opened from a share link" in messages(b)
    # editing after opening a link is not undone by the link on the next run
    b.number_input(key="w:demo:diameter_m:marine").set_value(1.0).run()
    assert b.session_state["demo:diameter_m"] == 1.0


@pytest.mark.parametrize("params, message", [
    ({"v": "1", "diameter_m": "abc"}, "the link's Cylinder diameter (diameter_m) must be a number (got 'abc')"),
    ({"v": "1", "diameter_m": "500"}, "must be between 0.1 and 20 m (got 500 m)"),
    ({"v": "0", "diameter_m": "3"}, "the link has version v='0'; this liftcore reads v=1"),
    ({"v": "1", "old_key_m": "3"}, "the link has an input this page does not know: 'old_key_m'"),
    ({"diameter_m": "3"}, "the link has no version marker"),
])
def test_bad_or_stale_links_fall_back_to_defaults_with_a_message(params, message):
    at = app()
    for k, v in params.items():
        at.query_params[k] = v
    at.run()
    assert not at.exception
    assert message in messages(at)
    assert "The page shows the defaults instead." in messages(at)
    assert state_values(at, "demo", demo_study.INPUTS) == demo_study.INPUTS.defaults()
    assert metrics(at) == shown("demo", demo_study.INPUTS.defaults(), "SI")


def test_a_link_with_only_units_says_every_input_is_at_its_default():
    at = app()
    at.query_params["v"] = "1"
    at.query_params["units"] = "imperial"
    at.run()
    assert not at.exception
    assert "Opened from a share link (every input at its default)." in messages(at)
    assert at.session_state["unit_system"] == "imperial"


# ----------------------------------------------------------------------------- reports
def test_report_and_csv_downloads_match_the_page(downloads):
    at = app()
    at.run()
    at.number_input(key="w:demo:spin_rpm:SI").set_value(700.0).run()
    at.segmented_control(key="unit_system").set_value("imperial").run()
    html, csv = downloads(".html"), downloads(".csv")
    values = state_values(at, "demo", demo_study.INPUTS)
    res = run_study("demo", values)
    assert "<script src=" not in html and html.startswith("<!DOCTYPE html>")
    for h in res.headlines:
        assert h.text("imperial") in html
    assert res.warnings[0].message in html
    assert "unit system,imperial" in csv


# ----------------------------------------------------------------------------- options
def name_box(at):
    """The "Option name" box of the Keep popover (a new box, with a new key, after each keep)."""
    return next(t for t in at.text_input if t.label == "Option name")


def test_keep_options_up_to_four_and_replace_by_name():
    at = app()
    at.run()
    for i, d in enumerate((2.0, 3.0, 4.0, 5.0)):
        at.number_input(key="w:demo:diameter_m:SI").set_value(d).run()
        name_box(at).set_value(f"D{d:g}").run()
        at.button(key="_lc:keep:demo").click().run()
        assert f"as option {i + 1} of 4" in messages(at)
    name_box(at).set_value("one more").run()
    at.button(key="_lc:keep:demo").click().run()
    assert "4 options are kept already; remove one on the Compare options page first" in messages(at)
    at.number_input(key="w:demo:diameter_m:SI").set_value(6.0).run()
    name_box(at).set_value("D2").run()
    at.button(key="_lc:keep:demo").click().run()
    opts = at.session_state["_lc:options"]
    assert [(o["name"], o["inputs"]["diameter_m"]) for o in opts] == [("D2", 6.0), ("D3", 3.0), ("D4", 4.0), ("D5", 5.0)]
    name_box(at).set_value("   ").run()
    at.button(key="_lc:keep:demo").click().run()
    assert "option name must not be empty" in messages(at)


def test_sessions_do_not_share_inputs():
    a, b = app(), app()
    a.run()
    b.run()
    a.number_input(key="w:demo:diameter_m:SI").set_value(5.0).run()
    b.run()
    assert b.session_state["demo:diameter_m"] == 2.0
    assert metrics(b) == shown("demo", demo_study.INPUTS.defaults(), "SI")
    assert metrics(a) == shown("demo", {**demo_study.INPUTS.defaults(), "diameter_m": 5.0}, "SI")


# ----------------------------------------------------------------------------- compare page
def compare_app(options=None) -> AppTest:
    at = AppTest.from_file(str(ROOT / "app.py"), default_timeout=TIMEOUT)
    at.switch_page("views/compare.py")
    if options is not None:
        at.session_state["_lc:options"] = options
    return at


def opt(name, kind="demo", **kw):
    return {"name": name, "kind": kind, "inputs": {**demo_study.INPUTS.defaults(), **kw}, "note": "", "extra": None}


def test_compare_page_without_options_explains_what_to_do():
    at = compare_app()
    at.run()
    assert not at.exception
    assert at.title[0].value == "Compare options"
    assert "Keep as option" in at.info[0].value


def result_row(at, label: str, table: int = 0, raw: bool = False) -> list[str]:
    """The cells of the row ``label`` in the ``table``-th results table of the Compare page: the
    label, then each option's value (``raw``: the cell's HTML, with its difference)."""
    import html as _html
    import re

    tables = [m.value for m in at.markdown if "<th>Result</th>" in m.value]
    rows = re.findall(r"<tr[^>]*>(.*?)</tr>", tables[table], flags=re.S)
    for row in rows:
        cells = re.findall(r"<td[^>]*>(.*?)</td>", row, flags=re.S)
        if cells and _html.unescape(re.sub("<[^>]+>", "", cells[0])).lstrip("≠ ").strip() == label:
            if raw:
                return cells
            return [_html.unescape(re.sub(r"<br>.*|<sup.*?</sup>|<[^>]+>", "", c, flags=re.S)).strip()
                    for c in cells]
    raise AssertionError(f"no row {label!r} in {tables[table][:200]}")


def test_compare_page_shows_differences_to_the_first_option(downloads):
    at = compare_app([opt("Small", diameter_m=2.0), opt("Large", diameter_m=4.0, surface="rough"),
                      opt("Other kind", kind="demo2")])
    at.run()
    assert not at.exception
    html = " ".join(m.value for m in at.markdown)
    assert "≠ Cylinder diameter [m]" in html and "≠ Surface" in html
    assert "Inputs that differ (2 of 9)" in [s.value for s in at.subheader]
    small = run_study("demo", opt("Small", diameter_m=2.0)["inputs"]).headline("lift_n")
    large = run_study("demo", opt("Large", diameter_m=4.0)["inputs"]).headline("lift_n")
    # one compact table per kind: a row per result, a column per option, the difference below
    small_row = result_row(at, "Lift", 0)
    assert small_row[1:] == [small.text("SI"), large.text("SI")]
    # Kutta-Joukowski with Gamma = 2 pi R (omega R): doubling the diameter gives four times the lift
    assert "(+300 %)" in result_row(at, "Lift", 0, raw=True)[2]
    assert result_row(at, "Lift", 1)[1:] == [small.text("SI")]  # the other kind's own table
    assert [h.value for h in at.header] == [study("demo").TITLE, study("demo2").TITLE]  # grouped by kind
    report = downloads(".html")
    assert "Inputs that differ (2 of 9)" in report and "<script src=" not in report
    assert sc.parse_document(downloads("options-compared-demo.toml")).options[1].inputs["surface"] == "rough"


def test_compare_page_loads_comparison_and_scenario_files():
    text = ('schema_version = 2\nkind = "demo"\nunit_system = "imperial"\n[[options]]\nname = "A"\n'
            '[[options]]\nname = "B"\n[options.inputs]\ndiameter_m = 4.0\n')
    at = compare_app()
    at.run()
    at.file_uploader[0].set_value(("two.toml", text.encode(), "application/toml")).run()
    assert not at.exception
    assert [o["name"] for o in at.session_state["_lc:options"]] == ["A", "B"]
    at.file_uploader[0].set_value(("one.toml", b'schema_version = 2\nkind = "demo"\ntitle = "Third"\n',
                                   "application/toml")).run()
    assert [o["name"] for o in at.session_state["_lc:options"]] == ["A", "B", "Third"]
    at.file_uploader[0].set_value(("bad.toml", b"\xff\xfe", "application/toml")).run()
    assert "bad.toml is not UTF-8 text" in " ".join(e.value for e in at.error)
    assert len(at.session_state["_lc:options"]) == 3
    at.button(key="_lc:remove:0").click().run()
    assert [o["name"] for o in at.session_state["_lc:options"]] == ["B", "Third"]


# ----------------------------------------------------------------------------- every study page
STUDY_PAGES = [(f, k) for f, _, k, _ in PAGES if k in STUDY_MODULES and
               importlib.util.find_spec(f"liftcore.studies.{STUDY_MODULES[k]}") and
               "page_tools" in (ROOT / f).read_text()]


def page_app(page_file: str, params: dict | None = None) -> AppTest:
    at = AppTest.from_file(str(ROOT / "app.py"), default_timeout=TIMEOUT)
    for k, v in (params or {}).items():
        at.query_params[k] = v
    at.switch_page(page_file)
    return at


def visible_changes(at, kind: str, most: int = 1) -> list:
    """Up to ``most`` number inputs visible on the page, each moved to another value the study
    accepts (tried through the shared cache, so the page's next run finds it computed)."""
    from liftcore.errors import InputError
    from views.results import cached_result

    spec = study(kind).INPUTS
    values = state_values(at, kind, spec)
    out = []
    for f in spec.fields:
        if f.kind != "number" or len(out) == most:
            continue
        key = f"w:{kind}:{f.key}:SI"
        try:
            w = at.number_input(key=key)
        except KeyError:
            continue
        v = w.value
        candidates = [v * 1.1, v * 0.9, v + 1.0, v - 1.0] if v else [0.1, 1.0, -0.1]
        for new in (float(f"{c:.4g}") for c in candidates):
            if new == v or (w.min is not None and new < w.min) or (w.max is not None and new > w.max):
                continue
            trial = {**values, f.key: float(units.from_display(new, f.quantity, "SI"))}
            try:
                cached_result(kind, trial)
            except InputError:
                continue
            values = trial
            out.append(("number", key, new))
            break
    return out


def apply_changes(at, changes):
    for _, key, value in changes:
        at.number_input(key=key).set_value(value).run()
        assert not at.exception, at.exception


@pytest.mark.parametrize("page_file, kind", STUDY_PAGES, ids=[k for _, k in STUDY_PAGES])
def test_page_round_trips_through_units_a_scenario_file_and_a_share_link(page_file, kind, downloads):
    spec = study(kind).INPUTS
    a = page_app(page_file)
    a.run()
    assert not a.exception, a.exception
    changes = visible_changes(a, kind)
    assert changes, "no number input found to change"
    apply_changes(a, changes)
    values_a = state_values(a, kind, spec)
    assert values_a != spec.defaults()
    for system in ("marine", "imperial"):  # the unit switch keeps every input bit for bit
        a.segmented_control(key="unit_system").set_value(system).run()
        assert not a.exception, a.exception
        assert state_values(a, kind, spec) == values_a
        check_metrics(a, kind, values_a, system)
    metrics_a = metrics(a)
    text = downloads(".toml")
    params = {k: v[0] if isinstance(v, list) else v for k, v in a.query_params.items()}
    assert params["v"] == "1" and params["units"] == "imperial"

    b = page_app(page_file)  # a fresh session loads the file through the page's upload control
    b.run()
    b.file_uploader(key=f"_lc:upload0:{kind}").set_value((f"{kind}.toml", text.encode(), "application/toml")).run()
    assert not b.exception, b.exception
    assert state_values(b, kind, spec) == values_a
    assert b.session_state["unit_system"] == "imperial"
    assert metrics(b) == metrics_a

    c = page_app(page_file, params)  # and another one opens the share link
    c.run()
    assert not c.exception, c.exception
    assert state_values(c, kind, spec) == values_a
    assert metrics(c) == metrics_a


@pytest.mark.parametrize("page_file, kind", STUDY_PAGES, ids=[k for _, k in STUDY_PAGES])
def test_page_loads_its_demo_scenarios(page_file, kind):
    files = [p for p in sorted((ROOT / "scenarios").glob("*.toml"))
             if isinstance(sc.load_document(p), sc.Scenario) and sc.load_document(p).kind == kind]
    assert files, f"no demo scenario of kind {kind} in scenarios/"
    at = page_app(page_file)
    at.run()
    for n, path in enumerate(files):
        doc = sc.load_document(path)
        at.file_uploader(key=f"_lc:upload{n}:{kind}").set_value((path.name, path.read_bytes(), "application/toml")).run()
        assert not at.exception, at.exception
        assert state_values(at, kind, study(kind).INPUTS) == doc.inputs
        check_metrics(at, kind, doc.inputs, doc.unit_system, independent=True)


def test_compare_page_loads_the_demo_comparison_and_draws_the_key_chart():
    demo_file = ROOT / "scenarios" / "compare_demo_invented.toml"
    doc = sc.load_document(demo_file)
    at = compare_app()
    at.run()
    at.button(key="_lc:cmp_demo").click().run()
    assert not at.exception, at.exception
    assert [o["name"] for o in at.session_state["_lc:options"]] == [o.name for o in doc.options]
    assert at.session_state["unit_system"] == doc.unit_system
    first = run_study(doc.kind, doc.options[0].inputs)
    n = len(doc.options)
    # the first row holds the first headline of every option, side by side
    row = result_row(at, first.headlines[0].label)
    assert len(row) == n + 1 and row[1] == first.headlines[0].text(doc.unit_system)
    # every warning is written out once (in its option's column, or once for every option)
    page = " ".join(m.value for m in at.markdown)
    for w in first.warnings:
        assert page.count(html.escape(w.text(doc.unit_system))) == 1, w.code
    assert len(at.get("plotly_chart")) >= 1


def test_rotor_page_takes_a_users_coefficient_table_from_a_scenario():
    """Text inputs drawn under a page's own widget key are re-seeded by a load too."""
    if "rotor" not in STUDY_MODULES or not importlib.util.find_spec("liftcore.studies.rotor"):
        pytest.fail("the rotor study is missing")
    tables = ("SR,CL,CD,CP\n0,0,0.6,0\n1,2.0,0.4,0.03\n2,5.5,1.3,0.25\n3,8.5,2.4,0.75\n",
              "SR,CL,CD,CP\n0,0,0.5,0\n1,1.8,0.4,0.03\n2,5.0,1.2,0.2\n3,8.0,2.2,0.7\n")
    at = page_app("views/rotor.py")
    at.run()
    for n, table in enumerate(tables):
        text = sc.scenario_to_toml(sc.Scenario("rotor", {**study("rotor").INPUTS.defaults(),
                                                         "coefficient_set": "user",
                                                         "user_coefficients_csv": table}))
        at.file_uploader(key=f"_lc:upload{n}:rotor").set_value((f"t{n}.toml", text.encode(), "application/toml")).run()
        assert not at.exception, at.exception
        assert at.session_state["rotor:user_coefficients_csv"] == table
        assert [t.value for t in at.text_area if t.value.startswith("SR,")] == [table]


def test_an_option_opens_on_its_page():
    doc = sc.load_document(ROOT / "scenarios" / "compare_demo_invented.toml")
    at = compare_app()
    at.run()
    at.button(key="_lc:cmp_demo").click().run()
    at.button(key="_lc:open:1").click().run()
    assert not at.exception, at.exception
    assert at.title[0].value == study(doc.kind).TITLE
    assert state_values(at, doc.kind, study(doc.kind).INPUTS) == doc.options[1].inputs
    assert f"Opened option “{doc.options[1].name}”" in messages(at)


# The share link is the app's address plus the page's own path, whichever page the browser is on.
@pytest.mark.parametrize("url, root", [
    ("http://127.0.0.1:8611/rotor", "http://127.0.0.1:8611"),
    ("http://127.0.0.1:8611/voyage", "http://127.0.0.1:8611"),
    ("http://127.0.0.1:8611/", "http://127.0.0.1:8611"),
    ("https://example.org/tools/lc/flight", "https://example.org/tools/lc"),
    ("", ""),
])
def test_share_link_root_drops_the_current_page(url, root):
    from views import PAGES, tools
    assert tools.app_root(url, {u for _, _, u, _ in PAGES}) == root


# ----------------------------------------------------------------------------- shared widget rules
@pytest.mark.parametrize("page_file, kind", [("flow.py", "flow"), ("voyage.py", "voyage"), ("flight.py", "flight")])
def test_air_inputs_follow_the_air_mode_on_every_page(page_file, kind):
    at = AppTest.from_file(str(ROOT / "views" / page_file), default_timeout=TIMEOUT)
    if kind == "voyage":
        at.session_state["voyage:sweep"] = False
    at.run()
    key = lambda k: f"w:{kind}:{k}:SI"  # noqa: E731
    shown = lambda: {w.key for w in at.number_input}  # noqa: E731
    assert key("altitude_m") in shown() and not {key("temperature_k"), key("pressure_pa")} & shown()
    at.selectbox(key=key("air_mode")).set_value("measured").run()
    assert not at.exception, at.exception
    assert {key("temperature_k"), key("pressure_pa")} <= shown() and key("altitude_m") not in shown()


def test_air_rules_with_a_precondition():
    from liftcore.air import air_inputs

    isa = {"air_mode": "isa", "fluid": "air"}
    measured = {"air_mode": "measured", "fluid": "air"}
    plain = {f.key: f for f in air_inputs()}
    assert plain["altitude_m"].shown_for(isa) and not plain["altitude_m"].shown_for(measured)
    assert plain["pressure_pa"].shown_for(measured) and not plain["temperature_k"].shown_for(isa)
    assert plain["air_mode"].shown_for(measured) and plain["relative_humidity_pct"].shown_for(isa)
    rules = {f.key: f for f in air_inputs(when=lambda v: v["fluid"] == "air")}
    assert rules["temperature_k"].shown_for(measured) and rules["air_mode"].shown_for(isa)
    water = {"air_mode": "measured", "fluid": "water"}
    assert not any(rules[k].shown_for(water) for k in rules)
    assert rules.keys() == plain.keys()


def test_number_steps_follow_the_default_in_the_display_unit():
    from liftcore.inputs import number
    from views.inputs import _auto_step

    pressure = number("pressure_pa", "Pressure", "pressure", 101325.0)
    # a step of about a hundredth of the default, as a power of ten: 1013.25 hPa -> 10 hPa,
    # 29.92 inHg -> 0.1 inHg (1 inHg = 33.8639 hPa, NIST SP 811 appendix B)
    assert _auto_step(pressure, "SI") == 10.0 and _auto_step(pressure, "imperial") == 0.1
    speed = number("speed_m_s", "Speed", "speed", 8.0)
    assert _auto_step(speed, "SI") == 0.1 and _auto_step(speed, "marine") == 0.1  # 8 m/s, 15.55 kn
    assert _auto_step(number("c", "Charnock", "ratio", 0.011), "SI") == 0.0001
    assert _auto_step(number("h_m", "Depth", "length", 0.0), "imperial") == 1.0


def test_out_of_range_input_is_named_kept_and_holds_back_results():
    # rule: a bad entry gets a message naming the field, the value and the range; nothing typed is lost
    from liftcore.studies import flow as flow_study

    at = AppTest.from_file(str(ROOT / "views" / "flow.py"), default_timeout=TIMEOUT)
    at.run()
    radius = flow_study.INPUTS.field("radius_m")
    at.number_input(key="w:flow:radius_m:SI").set_value(-1.0).run()
    assert not at.exception
    messages = [e.value for e in at.error]
    assert f"{radius.label} must be between {radius.low:g} and {radius.high:g} m (got -1 m)" in messages
    assert at.number_input(key="w:flow:radius_m:SI").value == -1.0  # kept as typed
    assert len(at.metric) == 0  # no stale results beside a bad input
    at.number_input(key="w:flow:radius_m:SI").set_value(0.25).run()
    assert not at.error and len(at.metric) > 0
