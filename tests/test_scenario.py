"""Scenario and comparison files, versions, share links: round trips and clean refusals.

Expected values here are either the inputs put in (round trips), the schema this module
documents, or the one-line messages the rules ask for (field, value, allowed range).
"""

from __future__ import annotations

import importlib.util
import math
from pathlib import Path

import pytest
import tomli_w
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as hs

from liftcore import scenario as sc
from liftcore.errors import InputError
from liftcore.studies import STUDY_MODULES, study
from tests import demo_study

ROOT = Path(__file__).resolve().parents[1]
SCENARIOS = sorted((ROOT / "scenarios").glob("*.toml"))
#: study kinds whose module exists on this branch (pages arrive one by one)
KINDS = [k for k, m in STUDY_MODULES.items() if importlib.util.find_spec(f"liftcore.studies.{m}")]


@pytest.fixture(autouse=True)
def demo(monkeypatch):
    demo_study.register(monkeypatch)


def doc(**kw) -> str:
    base = {"schema_version": 2, "kind": "demo", "title": "t", "inputs": {}}
    base.update(kw)
    return tomli_w.dumps({k: v for k, v in base.items() if v is not None})


# ----------------------------------------------------------------------------- round trips
def test_scenario_round_trip_keeps_every_input_and_the_header():
    values = {**demo_study.INPUTS.defaults(), "diameter_m": 3.3, "count": 2, "surface": "rough",
              "with_band": True, "label": "a \"quoted\"\nline", "temperature_k": 250.123456789}
    s = sc.Scenario(kind="demo", inputs=values, title="Invented case", note="two\nlines", unit_system="imperial")
    back = sc.parse_scenario(sc.scenario_to_toml(s))
    assert back == s
    assert back.inputs == values  # exact, not approximately


def test_saved_scenario_holds_every_input_even_defaults():
    text = sc.scenario_to_toml(sc.Scenario("demo", demo_study.INPUTS.defaults()))
    assert all(f"{k} = " in text for k in demo_study.INPUTS.keys)


def test_comparison_round_trip_puts_shared_inputs_once():
    d = demo_study.INPUTS.defaults()
    c = sc.Comparison(kind="demo", title="Sizes, invented", unit_system="marine", options=(
        sc.Option("Small", {**d, "diameter_m": 1.5}), sc.Option("Large", {**d, "diameter_m": 4.0}, "note B"),
        sc.Option("Large, rough", {**d, "diameter_m": 4.0, "surface": "rough"})))
    text = sc.comparison_to_toml(c)
    assert text.count("[[options]]") == 3
    assert text.count("span_m = ") == 1  # shared: written once in the top-level [inputs]
    assert sc.parse_document(text) == c


@pytest.mark.parametrize("kind", KINDS)
def test_every_kind_round_trips_with_its_defaults(kind):
    s = sc.Scenario(kind=kind, inputs=study(kind).INPUTS.defaults(), title=f"{kind} defaults")
    assert sc.parse_scenario(sc.scenario_to_toml(s)) == s


def test_missing_inputs_take_defaults():
    s = sc.parse_scenario(doc(inputs={"diameter_m": 4.0}))
    assert s.inputs == {**demo_study.INPUTS.defaults(), "diameter_m": 4.0}


def test_comparison_options_override_shared_inputs():
    c = sc.parse_document(doc(inputs={"span_m": 20.0, "diameter_m": 3.0},
                              options=[{"name": "A"}, {"name": "B", "inputs": {"diameter_m": 5.0}}]))
    assert [o.inputs["diameter_m"] for o in c.options] == [3.0, 5.0]
    assert [o.inputs["span_m"] for o in c.options] == [20.0, 20.0]
    assert c.scenario(1).title == "t: B"


# ----------------------------------------------------------------------------- versions
def test_version_1_is_migrated():
    text = 'schema_version = 1\nkind = "demo"\ntitle = "old"\n[inputs]\ndiameter_m = 2.5\n'
    s = sc.parse_scenario(text)
    assert s.migrated_from == 1 and s.schema_version == 2 and s.inputs["diameter_m"] == 2.5
    assert s.unit_system == "SI"
    assert "schema_version = 2" in sc.scenario_to_toml(s)


@pytest.mark.parametrize("text, message", [
    ('schema_version = 3\nkind = "demo"', "schema_version 3, newer than this liftcore reads (1, 2); update liftcore"),
    ('schema_version = 0\nkind = "demo"', "schema_version 0, which is not a liftcore scenario version"),
    ('schema_version = "2"\nkind = "demo"', "schema_version must be a whole number such as 2 (got '2')"),
    ('schema_version = 2.0\nkind = "demo"', "schema_version must be a whole number such as 2 (got 2.0)"),
    ('kind = "demo"', "has no schema_version"),
    ('schema_version = 1\nkind = "demo"\nunit_system = "SI"',
     "unknown top-level key 'unit_system' in a schema_version 1 file (comparison options and unit_system "
     "need schema_version = 2)"),
])
def test_unknown_or_bad_versions_are_refused(text, message):
    with pytest.raises(InputError) as exc:
        sc.parse_document(text, "f.toml")
    assert message in str(exc.value)


# ----------------------------------------------------------------------------- bad input
@pytest.mark.parametrize("data, message", [
    (b"\x89PNG\r\n\x1a\n\x00\x00\x00\rIHDR", "f.toml is binary data, not a scenario .toml text file"),
    (b"kind = \"demo\"\xff\xfe", "f.toml is not UTF-8 text (bad byte at position 13)"),
    ("schema_version = 2\nkind = ", "f.toml is not valid TOML: Invalid value (at end of document)"),
    ("a = " + "[" * 3000 + "]" * 3000, "its values are nested too deeply"),
    (doc(kind="boat"), "kind must be one of"),
    (doc(colour="red"), "unknown key 'colour' at the top level"),
    (doc(inputs={"diamter_m": 2.0}), "unknown key 'diamter_m' in [inputs] for a demo study (did you mean 'diameter_m'?)"),
    (doc(inputs={"diameter_m": "2"}), "Cylinder diameter (diameter_m) must be a number without quotes (got '2')"),
    (doc(inputs={"diameter_m": True}), "Cylinder diameter (diameter_m) must be a number between 0.1 and 20 m (got True)"),
    (doc(inputs={"diameter_m": math.nan}), "Cylinder diameter (diameter_m) must be a finite number between 0.1 and 20 m (got nan)"),
    (doc(inputs={"diameter_m": math.inf}), "must be a finite number between 0.1 and 20 m (got inf)"),
    (doc(inputs={"diameter_m": 40.0}), "f.toml [inputs]: Cylinder diameter (diameter_m) must be between 0.1 and 20 m (got 40 m)"),
    (doc(inputs={"temperature_k": 10.0}), "Air temperature (temperature_k) must be between 223.15 and 323.15 K (got 10 K)"),
    (doc(inputs={"diameter_m": 10 ** 30}), "must be between 0.1 and 20 m (got 1e+30 m)"),
    (doc(inputs={"diameter_m": [1.0, 2.0]}), "must be a number between 0.1 and 20 m (got [1.0, 2.0])"),
    (doc(inputs={"count": 2.5}), "Number of cylinders must be a whole number (got 2.5)"),
    (doc(inputs={"surface": "wet"}), "Surface must be one of smooth, rough (got 'wet')"),
    (doc(inputs={"with_band": "maybe"}), "Show a band must be true or false (got 'maybe')"),
    (doc(inputs={"label": 5}), "Label must be text (got 5)"),
    (doc(inputs=[1, 2]), "[inputs] must be a table of key = value"),
    (doc(title=5), "title must be text in quotes (got 5)"),
    (doc(title="x" * 201), "title must be at most 200 characters (got 201)"),
    (doc(unit_system="metric"), "unit_system must be one of SI, marine, imperial (got 'metric')"),
    (doc(options=[]), "a comparison holds 1 to 4 options (got 0)"),
    (doc(options=[{"name": str(i)} for i in range(5)]), "a comparison holds 1 to 4 options (got 5)"),
    (doc(options=[{"name": "A"}, {"name": "A"}]), "option name 'A' is used twice"),
    (doc(options=[{"inputs": {}}]), "option 1 has no name"),
    (doc(options=[{"name": "  "}]), "option 1 has an empty name"),
    (doc(options=[{"name": "A", "colour": 1}]), "unknown key 'colour' in option 1"),
    (doc(options=[{"name": "A", "inputs": {"diameter_m": -1.0}}]),
     "option 1 ('A') inputs: Cylinder diameter (diameter_m) must be between 0.1 and 20 m (got -1 m)"),
    (doc(options=[{"name": "A"}], inputs={"span_m": 0.0}), "[inputs] (shared by all options): Span (span_m) must be between"),
    (doc(options="A"), "options must be a list of [[options]] tables"),
])
def test_bad_files_get_one_clear_line(data, message):
    with pytest.raises(InputError) as exc:
        sc.parse_document(data, "f.toml")
    text = str(exc.value)
    assert message in text
    assert "\n" not in text


def test_comparison_is_refused_where_a_single_scenario_is_expected():
    with pytest.raises(InputError, match="is a comparison file"):
        sc.parse_scenario(doc(options=[{"name": "A"}]), "c.toml")


def test_oversized_file_is_refused_without_reading_it(tmp_path, monkeypatch):
    big = tmp_path / "huge.toml"
    with big.open("wb") as fh:  # sparse: 3 GB on paper, nothing on disk
        fh.truncate(3 * 1024 ** 3)

    def no_reading(*a, **k):
        raise AssertionError("the file was opened")
    monkeypatch.setattr(Path, "open", no_reading)
    monkeypatch.setattr(Path, "read_bytes", no_reading)
    with pytest.raises(InputError, match=r"scenario file huge.toml is 3,221,225,472 bytes; at most 1,000,000 are read"):
        sc.load_document(big)


def test_oversized_content_is_refused():
    with pytest.raises(InputError, match="must be at most 1000000 bytes"):
        sc.parse_document(b"#" * (sc.MAX_SCENARIO_BYTES + 1), "big.toml")


def test_a_folder_is_not_a_scenario(tmp_path):
    with pytest.raises(InputError, match="it is a folder; give a regular file"):
        sc.load_document(tmp_path)


# ----------------------------------------------------------------------------- share links
def test_link_holds_only_changed_inputs_and_reads_back_exactly():
    values = {**demo_study.INPUTS.defaults(), "diameter_m": 0.1 + 0.2, "count": 3, "with_band": True,
              "surface": "rough", "label": "a&b=c d"}
    params, omitted = sc.link_params("demo", values, "marine")
    assert omitted == []
    assert params == {"v": "1", "units": "marine", "diameter_m": "0.30000000000000004", "count": "3",
                      "surface": "rough", "with_band": "true", "label": "a&b=c d"}
    assert sc.values_from_link("demo", params) == (values, "marine")


def test_link_of_defaults_is_just_the_marker():
    assert sc.link_params("demo", demo_study.INPUTS.defaults())[0] == {"v": "1"}


def test_long_text_is_left_out_of_links():
    values = {**demo_study.INPUTS.defaults(), "label": "x" * 1000}
    params, omitted = sc.link_params("demo", values)
    assert "label" not in params and omitted == ["label"]


@pytest.mark.parametrize("params, message", [
    ({"diameter_m": "3"}, "the link has no version marker (v=1)"),
    ({"v": "2"}, "the link has version v='2'; this liftcore reads v=1"),
    ({"v": "1", "diamter_m": "3"}, "the link has an input this page does not know: 'diamter_m' (did you mean 'diameter_m'?)"),
    ({"v": "1", "diameter_m": "abc"}, "the link's Cylinder diameter (diameter_m) must be a number (got 'abc')"),
    ({"v": "1", "diameter_m": "nan"}, "must be a finite number (got 'nan')"),
    ({"v": "1", "diameter_m": "1e999"}, "must be a finite number (got '1e999')"),
    ({"v": "1", "diameter_m": "99"}, "the link: Cylinder diameter (diameter_m) must be between 0.1 and 20 m (got 99 m)"),
    ({"v": "1", "with_band": "yes"}, "Show a band (with_band) must be true or false (got 'yes')"),
    ({"v": "1", "units": "metric"}, "the link's units must be one of SI, marine, imperial (got 'metric')"),
])
def test_bad_links_are_refused_clearly(params, message):
    with pytest.raises(InputError) as exc:
        sc.values_from_link("demo", params)
    assert message in str(exc.value)


def test_framework_parameters_are_not_ours():
    assert not sc.is_link({"embed": "true"})
    assert sc.values_from_link("demo", {"v": "1", "embed": "true"})[0] == demo_study.INPUTS.defaults()


# ----------------------------------------------------------------------------- property tests
_scalars = hs.one_of(
    hs.integers(min_value=-(10 ** 30), max_value=10 ** 30), hs.floats(allow_nan=True, allow_infinity=True),
    hs.booleans(), hs.text(max_size=20), hs.sampled_from(["smooth", "rough", "SI", "marine", "demo"]))
_values = hs.recursive(_scalars, lambda inner: hs.lists(inner, max_size=3) | hs.dictionaries(
    hs.text(max_size=8), inner, max_size=3), max_leaves=8)
_input_keys = hs.sampled_from(list(demo_study.INPUTS.keys) + ["colour", ""])
_inputs = hs.dictionaries(_input_keys, _values, max_size=6) | _values
_top = hs.fixed_dictionaries(
    {}, optional={"schema_version": hs.sampled_from([1, 2, 3, 0, -1, "2", 2.0, True]),
                  "kind": hs.sampled_from(["demo", "boat", 5] + KINDS),
                  "title": hs.text(max_size=30) | _scalars, "note": hs.text(max_size=30) | _scalars,
                  "unit_system": hs.sampled_from(["SI", "marine", "imperial", "metric", 1]),
                  "inputs": _inputs,
                  "options": hs.lists(hs.fixed_dictionaries({}, optional={
                      "name": hs.text(max_size=8) | _scalars, "note": _scalars, "inputs": _inputs,
                      "extra": _scalars}), max_size=5) | _scalars,
                  "junk": _values})


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(_top)
def test_any_document_gives_a_result_or_an_input_error(document):
    try:
        out = sc.document_from_dict(document, "p.toml")
    except InputError as exc:
        assert "\n" not in str(exc) and str(exc)
        return
    assert isinstance(out, (sc.Scenario, sc.Comparison))
    # whatever was accepted writes and reads back unchanged
    if isinstance(out, sc.Scenario):
        assert sc.parse_scenario(sc.scenario_to_toml(out)).inputs == out.inputs
    else:
        assert sc.parse_document(sc.comparison_to_toml(out)).options == out.options


@settings(max_examples=200, deadline=None)
@given(hs.binary(max_size=300) | hs.text(max_size=300).map(lambda t: "schema_version = 2\nkind = \"demo\"\n" + t))
def test_any_bytes_give_a_result_or_an_input_error(data):
    try:
        out = sc.parse_document(data, "p.toml")
    except InputError as exc:
        assert "\n" not in str(exc)
        return
    assert isinstance(out, (sc.Scenario, sc.Comparison))


@settings(max_examples=200, deadline=None)
@given(hs.dictionaries(hs.sampled_from(list(demo_study.INPUTS.keys) + ["v", "units", "x"]),
                       hs.text(max_size=12) | hs.sampled_from(["1", "true", "0.5", "3", "rough", "marine"]),
                       max_size=6))
def test_any_link_gives_values_or_an_input_error(params):
    try:
        values, system = sc.values_from_link("demo", params)
    except InputError as exc:
        assert "\n" not in str(exc)
        return
    assert set(values) == set(demo_study.INPUTS.keys) and system in ("SI", "marine", "imperial")


# ----------------------------------------------------------------------------- shipped scenarios
@pytest.mark.parametrize("path", SCENARIOS, ids=[p.name for p in SCENARIOS])
def test_every_shipped_scenario_loads_and_is_labelled_invented(path):
    d = sc.load_document(path)
    assert "invented" in (d.title + " " + d.note).lower() or "invented" in path.name


def _field_value(f):
    if f.kind == "number":
        return hs.floats(min_value=f.low, max_value=f.high, allow_nan=False)
    if f.kind == "int":
        return hs.integers(min_value=int(f.low), max_value=int(f.high))
    if f.kind == "choice":
        return hs.sampled_from(f.choices)
    if f.kind == "bool":
        return hs.booleans()
    return hs.text(max_size=40)


_valid_inputs = hs.fixed_dictionaries({}, optional={f.key: _field_value(f) for f in demo_study.INPUTS.fields})


@settings(max_examples=150, deadline=None)
@given(_valid_inputs, hs.sampled_from(["SI", "marine", "imperial"]))
def test_any_in_range_inputs_are_accepted_and_round_trip(inputs, system):
    s = sc.parse_scenario(doc(inputs=inputs, unit_system=system))
    assert s.inputs == {**demo_study.INPUTS.defaults(), **inputs}
    assert sc.parse_scenario(sc.scenario_to_toml(s)) == s
    params, omitted = sc.link_params("demo", s.inputs, system)
    if not omitted:
        assert sc.values_from_link("demo", params) == (s.inputs, system)
