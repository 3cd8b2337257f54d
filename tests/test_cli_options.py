"""Command-line options are declared from the studies' inputs: each option's type, choices,
range and default are the field's, so the command line accepts what the page accepts."""

import argparse
import re

import pytest

from liftcore.cli import build_parser, main
from liftcore.cli import rotor as cli_rotor
from liftcore.cli import voyage as cli_voyage
from liftcore.cli.common import option_help, option_values
from liftcore.errors import InputError
from liftcore.studies import rotor as rotor_study
from liftcore.studies import voyage as voyage_study

CASES = [(cli_rotor, rotor_study, o) for o in cli_rotor.OPTIONS] + \
        [(cli_voyage, voyage_study, o) for o in cli_voyage.OPTIONS]


def numeric(cases):
    return [c for c in cases if c[1].INPUTS.field(c[2].key).kind in ("number", "int")
            and c[1].INPUTS.field(c[2].key).high is not None]


@pytest.mark.parametrize("cli, study, option", CASES, ids=lambda x: getattr(x, "name", None))
def test_every_option_is_a_field_of_its_study_and_its_help_says_range_and_default(cli, study, option):
    field = study.INPUTS.field(option.key)
    text = option_help(option, field)
    help_text = build_parser([cli.__name__.rsplit(".", 1)[1]])._subparsers._group_actions[0].choices[
        cli.__name__.rsplit(".", 1)[1]].format_help()
    assert option.name in help_text
    if field.kind in ("number", "int") and not option.required and not option.without:
        default = field.default / option.scale
        assert f"default {int(default) if float(default).is_integer() else f'{default:.6g}'}" in text
    if field.kind == "choice":
        for c in field.choices:
            assert c in help_text


@pytest.mark.parametrize("cli, study, option", numeric(CASES), ids=lambda x: getattr(x, "name", None))
def test_the_limits_in_the_option_unit_are_accepted_and_beyond_them_refused_naming_the_option(cli, study, option):
    field = study.INPUTS.field(option.key)
    names = {**{o.key: o.name for o in cli.OPTIONS}}
    from liftcore.cli.common import validate_inputs

    for limit in (field.low, field.high):
        x = limit / option.scale
        value = int(round(x)) if field.kind == "int" else x
        args = argparse.Namespace(**{o.dest: None for o in cli.OPTIONS})
        setattr(args, option.dest, value)
        validate_inputs(study.INPUTS, option_values(args, cli.OPTIONS), names)  # accepted as shown
    beyond = field.high / option.scale + max(1.0, abs(field.high / option.scale))
    args = argparse.Namespace(**{o.dest: None for o in cli.OPTIONS})
    setattr(args, option.dest, int(beyond) if field.kind == "int" else beyond)
    with pytest.raises(InputError, match="^" + re.escape(f"{option.name}: {field.label} must be between")):
        validate_inputs(study.INPUTS, option_values(args, cli.OPTIONS), names)


def test_the_rotor_command_takes_the_study_defaults(capsys):
    """One default everywhere: the command's rotor count is the page's (2), not a copy of its own."""
    assert main(["rotor", "--diameter-m", "5", "--height-m", "30", "--ship-speed-kn", "12",
                 "--true-wind-speed-kn", "20", "--true-wind-angle-deg", "90", "--json"]) == 0
    args = build_parser(["rotor"]).parse_args(["rotor", "--diameter-m", "5", "--height-m", "30",
                                               "--ship-speed-kn", "12", "--true-wind-speed-kn", "20",
                                               "--true-wind-angle-deg", "90"])
    values, _ = cli_rotor.values_from_args(args)
    assert values["rotor_count"] == rotor_study.INPUTS.field("rotor_count").default
    assert values["max_motor_power_w"] == rotor_study.INPUTS.field("max_motor_power_w").default
