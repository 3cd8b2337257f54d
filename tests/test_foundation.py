"""The core's contract: no UI imports, clear one-line errors, units at the edges."""

import subprocess
import sys

import numpy as np
import pytest
from numpy.testing import assert_allclose

from liftcore import units
from liftcore.errors import InputError, check_choice, check_number, check_positive, pick_model
from liftcore.inputs import InputSpec, choice, number


def test_core_does_not_import_streamlit():
    code = ("import sys, importlib, pkgutil, liftcore\n"
            "for m in pkgutil.walk_packages(liftcore.__path__, 'liftcore.'):\n"
            "    importlib.import_module(m.name)\n"
            "print('streamlit' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "False"


@pytest.mark.parametrize("call, message", [
    (lambda: check_positive("rotor diameter", -4, "m"), "rotor diameter must be > 0 m (got -4 m)"),
    (lambda: check_number("relative humidity", 120, "%", low=0, high=100),
     "relative humidity must be between 0 and 100 % (got 120 %)"),
    (lambda: check_number("speed", float("nan"), "m/s", low=0),
     "speed must be a finite number >= 0 m/s (got nan)"),
    (lambda: check_number("elevation", "abc", "deg", low=-90, high=90),
     "elevation must be a number between -90 and 90 deg (got 'abc')"),
    (lambda: check_choice("ball", "foo", ["golf", "tennis"]), "ball must be one of golf, tennis (got 'foo')"),
])
def test_error_messages_name_field_value_and_range(call, message):
    with pytest.raises(InputError) as exc:
        call()
    assert str(exc.value) == message


def test_pick_model_lists_valid_keys():
    with pytest.raises(ValueError, match="valid: a, b"):
        pick_model("model", "c", {"a": 1, "b": 2})


# Conversion factors: 1 kn = 1852/3600 m/s exactly (international nautical mile, BIPM SI brochure
# Table 8); 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959); degF = degC*9/5+32.
@pytest.mark.parametrize("kind, system, si, shown", [
    ("speed", "marine", 1852 / 3600, 1.0),
    ("length", "imperial", 0.3048, 1.0),
    ("temperature", "imperial", 273.15 + 100.0, 212.0),
    ("temperature", "SI", 273.15, 0.0),
    ("power", "SI", 1000.0, 1.0),
    ("fuel_mass", "marine", 1000.0, 1.0),
])
def test_units_round_trip(kind, system, si, shown):
    assert_allclose(units.to_display(si, kind, system), shown, rtol=1e-12, atol=1e-12)
    assert_allclose(units.from_display(shown, kind, system), si, rtol=1e-12)


def test_every_kind_converts_in_every_system():
    for kind in units.DISPLAY:
        for system in units.UNIT_SYSTEMS:
            x = np.array([0.5, 2.0])
            assert_allclose(units.from_display(units.to_display(x, kind, system), kind, system), x)
            assert isinstance(units.unit_label(kind, system), str)


def test_input_spec_validates_in_display_units():
    spec = InputSpec("demo", (number("speed_m_s", "Ship speed", "ship_speed", 5.0, 0.0, 15.0),
                              choice("fuel", "Fuel", ("hfo", "lng"))))
    assert spec.validate({})["speed_m_s"] == 5.0
    # values are always core units; the unit system only sets how the message reads
    with pytest.raises(InputError, match=r"Ship speed must be between 0 and 29.1577 kn \(got 40 kn\)"):
        spec.validate({"speed_m_s": 40.0 * 1852 / 3600}, system="marine")
    with pytest.raises(InputError, match="unknown input 'colour'"):
        spec.validate({"colour": 1})
    with pytest.raises(InputError, match="Fuel must be one of hfo, lng"):
        spec.validate({"fuel": "coal"})
