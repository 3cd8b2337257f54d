"""Scenario files (TOML, our own schema): the inputs of one study, saved and loaded.

Format (``schema_version = 1``)::

    schema_version = 1
    kind = "rotor"                      # a study kind from liftcore.studies.STUDY_MODULES
    title = "Two rotors on an invented bulk carrier"
    note = "Invented demo scenario."    # free text, shown with the results
    [inputs]                            # core units; the key names carry them
    diameter_m = 5.0
    ...

Every value in ``[inputs]`` is validated by the study's :class:`~liftcore.inputs.InputSpec`;
unknown keys are reported, not dropped. This module is the only place that reads or writes
scenario files.
"""

from __future__ import annotations

import tomllib
from dataclasses import dataclass, field
from pathlib import Path

import tomli_w

from liftcore.errors import InputError
from liftcore.studies import STUDY_MODULES, study

SCHEMA_VERSION = 1
#: Scenario files larger than this are refused before they are parsed. [bytes]
MAX_SCENARIO_BYTES = 1_000_000


@dataclass(frozen=True)
class Scenario:
    kind: str
    inputs: dict
    title: str = ""
    note: str = ""
    schema_version: int = SCHEMA_VERSION
    extra: dict = field(default_factory=dict)


def parse_scenario(text: str | bytes, source: str = "scenario") -> Scenario:
    """Parse and validate scenario text; raise :class:`InputError` with a clear message."""
    if isinstance(text, bytes):
        if len(text) > MAX_SCENARIO_BYTES:
            raise InputError("file", f"{source} is {len(text)} bytes; scenario files must be at most "
                                     f"{MAX_SCENARIO_BYTES} bytes")
        try:
            text = text.decode("utf-8")
        except UnicodeDecodeError:
            raise InputError("file", f"{source} is not UTF-8 text (is it a scenario .toml file?)") from None
    if len(text) > MAX_SCENARIO_BYTES:
        raise InputError("file", f"{source} is {len(text)} characters; scenario files must be at most "
                                 f"{MAX_SCENARIO_BYTES} bytes")
    try:
        doc = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError("file", f"{source} is not valid TOML: {exc}") from None
    return scenario_from_dict(doc, source)


def scenario_from_dict(doc: dict, source: str = "scenario") -> Scenario:
    version = doc.get("schema_version")
    if version is None:
        raise InputError("schema_version", f"{source} has no schema_version (expected {SCHEMA_VERSION})")
    if not isinstance(version, int) or isinstance(version, bool) or version != SCHEMA_VERSION:
        raise InputError("schema_version", f"{source} has schema_version {version!r}; this version of "
                                           f"liftcore reads schema_version {SCHEMA_VERSION}")
    kind = doc.get("kind")
    if kind not in STUDY_MODULES:
        raise InputError("kind", f"{source}: kind must be one of {', '.join(STUDY_MODULES)} (got {kind!r})")
    known_top = {"schema_version", "kind", "title", "note", "inputs"}
    unknown = sorted(set(doc) - known_top)
    if unknown:
        raise InputError(unknown[0], f"{source}: unknown top-level key {unknown[0]!r}; valid: "
                                     f"{', '.join(sorted(known_top))}")
    inputs = doc.get("inputs", {})
    if not isinstance(inputs, dict):
        raise InputError("inputs", f"{source}: [inputs] must be a table of key = value")
    for key in ("title", "note"):
        if key in doc and not isinstance(doc[key], str):
            raise InputError(key, f"{source}: {key} must be text (got {doc[key]!r})")
    try:
        clean = study(kind).INPUTS.validate(inputs)
    except InputError as exc:
        raise InputError(exc.field, f"{source}: {exc}") from None
    return Scenario(kind=kind, inputs=clean, title=doc.get("title", ""), note=doc.get("note", ""))


def load_scenario(path: str | Path) -> Scenario:
    """Read a scenario file; refuse oversized files before reading them."""
    p = Path(path)
    size = p.stat().st_size
    if size > MAX_SCENARIO_BYTES:
        raise InputError("file", f"{p.name} is {size} bytes; scenario files must be at most "
                                 f"{MAX_SCENARIO_BYTES} bytes")
    return parse_scenario(p.read_bytes(), p.name)


def scenario_to_toml(s: Scenario) -> str:
    """The TOML text of a scenario (inputs in core units)."""
    doc = {"schema_version": SCHEMA_VERSION, "kind": s.kind, "title": s.title, "note": s.note,
           "inputs": {k: v for k, v in s.inputs.items()}}
    return tomli_w.dumps(doc)
