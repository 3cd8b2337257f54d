"""Property-based checks that keep every entry point honest (bounded time in CI): whatever a
field, a command-line option, a share link or a CSV cell holds, the answer is a result or a
clear InputError (exit 2 on the command line), never a traceback; CSV neutralising never changes
a number."""

import contextlib
import io
import math

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as hs

from liftcore import units
from liftcore.cli import main
from liftcore.errors import InputError
from liftcore.files import csv_text, safe_cell
from liftcore.studies import STUDY_MODULES, run_study, study

HOSTILE_NUMBERS = hs.one_of(
    hs.floats(allow_nan=True, allow_infinity=True),
    hs.sampled_from([0.0, -0.0, 5e-324, -5e-324, 1e308, -1e308, 2 ** 63, -(2 ** 63), 10 ** 400]),
    hs.integers(min_value=-10 ** 30, max_value=10 ** 30),
    hs.text(max_size=40), hs.none(), hs.booleans(), hs.lists(hs.integers(), max_size=3))
FAST_KINDS = ("flow", "rotor", "flight")  # each run well under a second


def _field_values(kind):
    fields = [f for f in study(kind).INPUTS.fields]
    return hs.dictionaries(hs.sampled_from([f.key for f in fields]), HOSTILE_NUMBERS, max_size=4)


@pytest.mark.parametrize("kind", list(STUDY_MODULES))
@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(data=hs.data())
def test_validation_answers_with_a_value_or_an_input_error(kind, data):
    values = data.draw(_field_values(kind))
    try:
        clean = study(kind).INPUTS.validate(values)
    except InputError as exc:
        assert str(exc) and len(str(exc)) < 2000
        return
    assert set(clean) == set(study(kind).INPUTS.keys)


def _in_range(f, u):
    lo = f.low if f.low is not None else -1e3
    hi = f.high if f.high is not None else 1e3
    x = lo + (hi - lo) * u
    return int(round(x)) if f.kind == "int" else x


@pytest.mark.parametrize("kind", FAST_KINDS)
@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(data=hs.data())
def test_any_in_range_inputs_give_a_result_or_an_input_error(kind, data):
    fields = [f for f in study(kind).INPUTS.fields if f.kind in ("number", "int")]
    picked = data.draw(hs.lists(hs.sampled_from(fields), max_size=3, unique_by=lambda f: f.key))
    values = {f.key: _in_range(f, data.draw(hs.sampled_from([0.0, 1.0]) | hs.floats(0.0, 1.0))) for f in picked}
    if kind == "flight":
        values["dispersion_n"] = min(values.get("dispersion_n", 0), 50)  # keep CI time bounded
        values.setdefault("sweep", False)
    try:
        r = run_study(kind, values)
    except InputError:
        return
    for h in r.headlines:
        assert isinstance(h.text("SI"), str)


ROTOR_OPTIONS = ["--diameter-m", "--height-m", "--ship-speed-kn", "--true-wind-speed-kn",
                 "--true-wind-angle-deg", "--max-rpm", "--rotors", "--strips", "--altitude-m"]
OPTION_VALUES = hs.one_of(hs.sampled_from(["nan", "inf", "-inf", "-1e-05", "1e308", "5e-324", "", " ",
                                           "0", "-0", "1e999", "0x10", "12abc", "\x00"]),
                          hs.floats(allow_nan=False, allow_infinity=False).map(repr))


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(hs.lists(hs.tuples(hs.sampled_from(ROTOR_OPTIONS), OPTION_VALUES), max_size=3))
def test_the_rotor_command_exits_0_or_2(pairs):
    args = ["rotor", "--diameter-m", "5", "--height-m", "30", "--ship-speed-kn", "12",
            "--true-wind-speed-kn", "20", "--true-wind-angle-deg", "90"]
    for opt, value in pairs:
        args += [opt, value]
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        try:
            code = main(args + ["--json"])
        except SystemExit as exc:  # argparse on an unparseable value
            code = exc.code
    assert code in (0, 2), err.getvalue()
    assert "Traceback" not in err.getvalue()


SWEEP_TEXT = hs.one_of(
    hs.builds(lambda k, a, b: f"{k}:{a}:{b}", hs.sampled_from(["speed_m_s", "elevation_deg", "spin_rpm", "height_m",
                                                                "azimuth_deg", "spin", ""]), OPTION_VALUES, OPTION_VALUES),
    hs.sampled_from(["elevation_deg:5:30", "speed_m_s:15:30", "spin_rpm:0:2000", "height_m:0:3"]),
    hs.text(max_size=20))


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(hs.tuples(SWEEP_TEXT, SWEEP_TEXT, hs.sampled_from(["carry_m", "margin_m", "lateral_m"]),
                 hs.sampled_from(["none", "free_kick", "custom"])))
def test_the_flight_command_sweep_exits_0_or_2(case):
    across, up, output, obstacle = case
    args = ["flight", "--ball", "soccer", "--speed-m-s", "22", "--elevation-deg", "14", "--spin-rpm", "600",
            "--obstacle", obstacle, "--sweep-across", across, "--sweep-up", up, "--sweep-points", "5",
            "--sweep-output", output, "--json"]
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        try:
            code = main(args)
        except SystemExit as exc:
            code = exc.code
    assert code in (0, 2), err.getvalue()
    assert "Traceback" not in err.getvalue()


@settings(max_examples=200, deadline=None)
@given(hs.text(max_size=30) | hs.floats(allow_nan=False).map(repr) | hs.integers().map(str))
def test_csv_neutralising_never_changes_a_number_and_always_disarms_a_formula(text):
    cell = safe_cell(text)
    try:
        float(text)
        assert cell == text
    except ValueError:
        assert not cell.startswith(("=", "+", "-", "@", "\t", "\r"))


@settings(max_examples=50, deadline=None)
@given(hs.lists(hs.floats(allow_nan=False, allow_infinity=False), min_size=1, max_size=5))
def test_csv_tables_keep_their_numbers(xs):
    import pandas as pd

    df = pd.DataFrame({"x": xs, "name": ["=a"] * len(xs)})
    back = pd.read_csv(io.StringIO(csv_text(df)))
    np.testing.assert_array_equal(back["x"].to_numpy(dtype=float), np.asarray(xs, dtype=float))
    assert all(v == "'=a" for v in back["name"])
