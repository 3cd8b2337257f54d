"""Scenario files (TOML, our own schema) and share links: the inputs of a study, saved and loaded.

This module is the only place that reads or writes scenario files. Values are always in core units
(the key names carry them: ``diameter_m``, ``ship_speed_m_s``); the unit system only says how a
page shows them.

Scenario file (``schema_version = 2``)::

    schema_version = 2
    kind = "rotor"                      # a study kind from liftcore.studies.STUDY_MODULES
    title = "Two rotors on an invented bulk carrier"
    note = "Invented demo scenario."    # free text, shown with the results
    unit_system = "marine"              # optional: SI, marine or imperial (how it is shown)
    [inputs]                            # core units; missing inputs take the study's defaults
    diameter_m = 5.0

Comparison file: the same header and a list of up to four named options of one kind. The
optional top-level ``[inputs]`` holds inputs shared by every option; each option's own
``inputs`` table (partial) overrides them::

    schema_version = 2
    kind = "rotor"
    title = "Rotor size, invented"
    [inputs]                            # optional, shared by all options
    ship_speed_m_s = 6.0
    [[options]]
    name = "Small rotor"                # 1 to 60 characters, unique in the file
    note = "optional text"
    [options.inputs]
    diameter_m = 4.0
    [[options]]
    name = "Large rotor"
    [options.inputs]
    diameter_m = 5.0

Versions: ``schema_version = 1`` files (the first format: no ``unit_system``, no options) are
migrated on reading; any other version is refused with a message naming the versions read.
Unknown keys (top level, options, inputs) are errors naming the key and the valid ones, never
silently dropped. Files above :data:`MAX_SCENARIO_BYTES` are refused before they are read.

Share link: the inputs that differ from the defaults, in core units, as URL query parameters,
with the link version under :data:`LINK_MARKER` (``?v=1&diameter_m=6&units=marine``).
"""

from __future__ import annotations

import difflib
import math
import tomllib
from dataclasses import dataclass, field
from pathlib import Path

import tomli_w

from liftcore import units
from liftcore.errors import MAX_ECHO_CHARS, InputError, check_number, echo
from liftcore.studies import STUDY_MODULES, study

#: The schema version this liftcore writes.
SCHEMA_VERSION = 2
#: Versions this liftcore reads (older ones are migrated to :data:`SCHEMA_VERSION`).
READABLE_VERSIONS = (1, 2)
#: Scenario files larger than this are refused before they are read. [bytes]
MAX_SCENARIO_BYTES = 1_000_000
#: At most this many options in a comparison (and kept on the pages at once).
MAX_OPTIONS = 4
MAX_TITLE_CHARS = 200
MAX_NOTE_CHARS = 5000
MAX_OPTION_NAME_CHARS = 60

#: Share links: query parameter holding the link version, its current value, the unit parameter.
LINK_MARKER = "v"
LINK_VERSION = "1"
LINK_UNITS = "units"
#: Text inputs longer than this are left out of a share link (the link would get too long).
MAX_LINK_TEXT_CHARS = 300
#: Query parameters that belong to the dashboard framework, not to us; links ignore them.
FOREIGN_PARAMS = ("embed", "embed_options")

_TOP_KEYS = ("schema_version", "kind", "title", "note", "unit_system", "inputs", "options")
_OPTION_KEYS = ("name", "note", "inputs")


@dataclass(frozen=True)
class Scenario:
    """One study's inputs (complete, validated, core units) with a title and a note."""

    kind: str
    inputs: dict
    title: str = ""
    note: str = ""
    schema_version: int = SCHEMA_VERSION
    extra: dict = field(default_factory=dict)
    unit_system: str = "SI"
    #: the schema version the file was written in, when it was migrated on reading
    migrated_from: int | None = None


@dataclass(frozen=True)
class Option:
    """One named option of a comparison: complete, validated inputs in core units."""

    name: str
    inputs: dict
    note: str = ""


@dataclass(frozen=True)
class Comparison:
    """Up to :data:`MAX_OPTIONS` named options of one study kind."""

    kind: str
    options: tuple[Option, ...]
    title: str = ""
    note: str = ""
    unit_system: str = "SI"
    migrated_from: int | None = None

    def scenario(self, i: int) -> Scenario:
        """Option ``i`` as a stand-alone scenario."""
        o = self.options[i]
        title = f"{self.title}: {o.name}" if self.title else o.name
        return Scenario(kind=self.kind, inputs=dict(o.inputs), title=title,
                        note=o.note or self.note, unit_system=self.unit_system)


# ----------------------------------------------------------------------------- reading
def read_text(data: str | bytes, source: str = "scenario") -> str:
    """Check the size and the encoding of a scenario's raw content; return its text."""
    if len(data) > MAX_SCENARIO_BYTES:
        raise InputError("file", f"{source} is {len(data)} {'bytes' if isinstance(data, bytes) else 'characters'}; "
                                 f"scenario files must be at most {MAX_SCENARIO_BYTES} bytes")
    if isinstance(data, bytes):
        if b"\x00" in data:
            raise InputError("file", f"{source} is binary data, not a scenario .toml text file")
        try:
            data = data.decode("utf-8-sig")
        except UnicodeDecodeError as exc:
            raise InputError("file", f"{source} is not UTF-8 text (bad byte at position {exc.start}); "
                                     "is it a scenario .toml file?") from None
    if "\x00" in data:
        raise InputError("file", f"{source} contains NUL characters; it is not a scenario .toml text file")
    return data


def parse_toml(text: str, source: str = "scenario") -> dict:
    """TOML text to a dict; malformed or absurdly nested text gives an :class:`InputError`."""
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError("file", f"{source} is not valid TOML: {exc}") from None
    except RecursionError:
        raise InputError("file", f"{source} is not a scenario: its values are nested too deeply") from None


def parse_document(data: str | bytes, source: str = "scenario") -> Scenario | Comparison:
    """Parse a scenario or comparison file's content; raise :class:`InputError` on any problem."""
    return document_from_dict(parse_toml(read_text(data, source), source), source)


def load_document(path: str | Path) -> Scenario | Comparison:
    """Read a scenario or comparison file; oversized files are refused before they are read."""
    p = Path(path)
    from liftcore.files import read_bytes  # regular files only, the cap applied while reading

    data = read_bytes(p, "scenario file", MAX_SCENARIO_BYTES)
    return parse_document(data, p.name)


def parse_scenario(text: str | bytes, source: str = "scenario") -> Scenario:
    """Parse a single-study scenario; a comparison file is refused with a pointer to the right place."""
    doc = parse_document(text, source)
    if isinstance(doc, Comparison):
        raise InputError("options", f"{source} is a comparison file ({len(doc.options)} options); "
                                    "load it on the Compare options page or with `python -m liftcore run`")
    return doc


def load_scenario(path: str | Path) -> Scenario:
    """Read a single-study scenario file (see :func:`parse_scenario`)."""
    doc = load_document(path)
    if isinstance(doc, Comparison):
        raise InputError("options", f"{Path(path).name} is a comparison file; load it on the Compare "
                                    "options page or with `python -m liftcore run`")
    return doc


def scenario_from_dict(doc: dict, source: str = "scenario") -> Scenario:
    out = document_from_dict(doc, source)
    if isinstance(out, Comparison):
        raise InputError("options", f"{source} is a comparison file, not a single scenario")
    return out


# ----------------------------------------------------------------------------- versions
def _migrate_1_to_2(doc: dict, source: str) -> dict:
    """Version 1 had only schema_version, kind, title, note and [inputs]; nothing was renamed."""
    known = ("schema_version", "kind", "title", "note", "inputs")
    for key in doc:
        if key not in known:
            hint = " (comparison options and unit_system need schema_version = 2)" if key in _TOP_KEYS else ""
            raise InputError(key, f"{source}: unknown top-level key {key!r} in a schema_version 1 file"
                                  f"{hint}; valid: {', '.join(known)}")
    out = dict(doc)
    out["schema_version"] = 2
    return out


#: version -> function turning a document of that version into the next version.
MIGRATIONS = {1: _migrate_1_to_2}


def migrate(doc: dict, source: str = "scenario") -> tuple[dict, int | None]:
    """Bring a document to :data:`SCHEMA_VERSION`; return it and the version it was written in
    (``None`` when it was current already). Unknown versions are refused."""
    if not isinstance(doc, dict):
        raise InputError("file", f"{source} is not a table of key = value")
    if "schema_version" not in doc:
        raise InputError("schema_version", f"{source} has no schema_version (this liftcore writes "
                                           f"schema_version = {SCHEMA_VERSION})")
    version = doc["schema_version"]
    if not isinstance(version, int) or isinstance(version, bool):
        raise InputError("schema_version", f"{source}: schema_version must be a whole number such as "
                                           f"{SCHEMA_VERSION} (got {version!r})")
    if version > SCHEMA_VERSION:
        raise InputError("schema_version", f"{source} has schema_version {version}, newer than this "
                                           f"liftcore reads ({', '.join(map(str, READABLE_VERSIONS))}); "
                                           "update liftcore to open it")
    if version not in READABLE_VERSIONS:
        raise InputError("schema_version", f"{source} has schema_version {version}, which is not a liftcore "
                                           f"scenario version (this liftcore reads "
                                           f"{', '.join(map(str, READABLE_VERSIONS))})")
    original = version
    while version < SCHEMA_VERSION:
        doc = MIGRATIONS[version](doc, source)
        version = doc["schema_version"]
    return doc, (original if original != SCHEMA_VERSION else None)


# ----------------------------------------------------------------------------- validation
def _suggest(key: str, valid) -> str:
    close = difflib.get_close_matches(str(key), list(valid), n=1, cutoff=0.6)
    return f" (did you mean {close[0]!r}?)" if close else ""


def _unknown(key, valid, where: str, source: str) -> InputError:
    return InputError(str(key)[:MAX_ECHO_CHARS], f"{source}: unknown key {echo(str(key))} {where}"
                                f"{_suggest(key, valid) if len(str(key)) <= MAX_ECHO_CHARS else ''}; "
                                f"valid: {', '.join(valid)}")


def _text(doc: dict, key: str, limit: int, source: str, where: str = "") -> str:
    value = doc.get(key, "")
    if not isinstance(value, str):
        raise InputError(key, f"{source}: {where}{key} must be text in quotes (got {value!r:.60})")
    if len(value) > limit:
        raise InputError(key, f"{source}: {where}{key} must be at most {limit} characters (got {len(value)})")
    return value


def _renamed_sets(inputs: dict) -> dict:
    """A file or link saved before a coefficient set was renamed opens with its new name (the
    same numbers under the name of their published source)."""
    from liftcore.coefficients import RENAMED_SETS

    name = inputs.get("coefficient_set")
    if isinstance(name, str) and name in RENAMED_SETS:
        return {**inputs, "coefficient_set": RENAMED_SETS[name]}
    return inputs


def validate_inputs(kind: str, inputs, source: str = "scenario", where: str = "[inputs]") -> dict:
    """Check a partial inputs table in core units; return complete validated values.

    Messages name the key and the core unit it carries, e.g. ``rotor.toml [inputs]: Rotor
    diameter (diameter_m) must be between 1 and 10 m (got 40 m)``.
    """
    if not isinstance(inputs, dict):
        raise InputError("inputs", f"{source}: {where} must be a table of key = value (got {type(inputs).__name__})")
    spec = study(kind).INPUTS
    prefix = f"{source} {where}".strip()
    inputs = _renamed_sets(inputs)
    for key, value in inputs.items():
        if key not in spec.keys:
            raise _unknown(key, spec.keys, (f"in {where} " if where else "") + f"for a {kind} study", source)
        f = spec.field(key)
        if f.kind in ("number", "int"):
            unit = units.core_unit_label(f.quantity) if f.quantity in units.CORE else ""
            if isinstance(value, str):
                raise InputError(key, f"{prefix}: {f.label} ({key}) must be a number without "
                                      f"quotes (got {value!r:.40})")
            try:
                check_number(f"{f.label} ({key})", value, unit, low=f.low, high=f.high,
                             low_inclusive=not f.low_open, high_inclusive=not f.high_open)
            except InputError as exc:
                raise InputError(key, f"{prefix}: {exc}") from None
    check = getattr(study(kind), "check_inputs", None)  # what a study checks across its fields
    try:
        values = spec.validate(inputs)
        if check is not None:
            check(values)
    except InputError as exc:
        raise InputError(exc.field, f"{prefix}: {exc}") from None
    return values


def _unit_system(doc: dict, source: str) -> str:
    system = doc.get("unit_system", "SI")
    if system not in units.UNIT_SYSTEMS:
        raise InputError("unit_system", f"{source}: unit_system must be one of "
                                        f"{', '.join(units.UNIT_SYSTEMS)} (got {system!r:.60})")
    return system


def document_from_dict(doc: dict, source: str = "scenario") -> Scenario | Comparison:
    """Validate a parsed document (any readable version); return a Scenario or a Comparison."""
    doc, migrated_from = migrate(doc, source)
    for key in doc:
        if key not in _TOP_KEYS:
            raise _unknown(key, _TOP_KEYS, "at the top level", source)
    kind = doc.get("kind")
    if not isinstance(kind, str) or kind not in STUDY_MODULES:
        raise InputError("kind", f"{source}: kind must be one of {', '.join(STUDY_MODULES)} (got {kind!r:.60})")
    title = _text(doc, "title", MAX_TITLE_CHARS, source)
    note = _text(doc, "note", MAX_NOTE_CHARS, source)
    system = _unit_system(doc, source)
    shared = doc.get("inputs", {})
    if "options" not in doc:
        values = validate_inputs(kind, shared, source)
        return Scenario(kind=kind, inputs=values, title=title, note=note, unit_system=system,
                        migrated_from=migrated_from)

    options = doc["options"]
    if not isinstance(options, list) or not all(isinstance(o, dict) for o in options):
        raise InputError("options", f"{source}: options must be a list of [[options]] tables")
    if not 1 <= len(options) <= MAX_OPTIONS:
        raise InputError("options", f"{source}: a comparison holds 1 to {MAX_OPTIONS} options (got {len(options)})")
    if not isinstance(shared, dict):
        raise InputError("inputs", f"{source}: [inputs] must be a table of key = value")
    validate_inputs(kind, shared, source, "[inputs] (shared by all options)")
    out, names = [], set()
    for i, o in enumerate(options, start=1):
        where = f"option {i}: "
        for key in o:
            if key not in _OPTION_KEYS:
                raise _unknown(key, _OPTION_KEYS, f"in option {i}", source)
        if "name" not in o:
            raise InputError("name", f"{source}: option {i} has no name")
        name = _text(o, "name", MAX_OPTION_NAME_CHARS, source, where).strip()
        if not name:
            raise InputError("name", f"{source}: option {i} has an empty name")
        if name in names:
            raise InputError("name", f"{source}: option name {name!r} is used twice; names must differ")
        names.add(name)
        onote = _text(o, "note", MAX_NOTE_CHARS, source, where)
        own = o.get("inputs", {})
        if not isinstance(own, dict):
            raise InputError("inputs", f"{source}: option {i} ({name!r}) inputs must be a table of key = value")
        values = validate_inputs(kind, {**shared, **own}, source, f"option {i} ({name!r}) inputs")
        out.append(Option(name=name, inputs=values, note=onote))
    return Comparison(kind=kind, options=tuple(out), title=title, note=note, unit_system=system,
                      migrated_from=migrated_from)


# ----------------------------------------------------------------------------- writing
_HEADER = ("# liftcore {what} (schema_version {v}). Values are in core units: each key name carries\n"
           "# its unit (diameter_m, ship_speed_m_s, spin_rpm). unit_system only sets how pages show them.\n")


def _plain(values: dict) -> dict:
    return {k: (float(v) if isinstance(v, float) else v) for k, v in values.items()}


def scenario_to_toml(s: Scenario) -> str:
    """The TOML text of a scenario: every input, so it reproduces even if defaults change."""
    doc = {"schema_version": SCHEMA_VERSION, "kind": s.kind, "title": s.title, "note": s.note,
           "unit_system": s.unit_system, "inputs": _plain(s.inputs)}
    return _HEADER.format(what="scenario", v=SCHEMA_VERSION) + tomli_w.dumps(doc)


def comparison_to_toml(c: Comparison) -> str:
    """The TOML text of a comparison: inputs equal in every option go to the shared [inputs],
    each option's ``[[options]]`` table holds the rest (every input is written, so the file
    reproduces even if defaults change)."""
    keys = study(c.kind).INPUTS.keys
    shared = {k: c.options[0].inputs[k] for k in keys
              if all(k in o.inputs and o.inputs[k] == c.options[0].inputs[k] for o in c.options)}
    head = {"schema_version": SCHEMA_VERSION, "kind": c.kind, "title": c.title, "note": c.note,
            "unit_system": c.unit_system, "inputs": _plain(shared)}
    parts = [_HEADER.format(what="comparison", v=SCHEMA_VERSION), tomli_w.dumps(head)]
    for o in c.options:
        entry = {"name": o.name}
        if o.note:
            entry["note"] = o.note
        parts.append("\n[[options]]\n" + tomli_w.dumps(entry))
        own = _plain({k: v for k, v in o.inputs.items() if k not in shared})
        if own:
            parts.append("[options.inputs]\n" + tomli_w.dumps(own))
    return "".join(parts)


def changed_inputs(kind: str, values: dict) -> dict:
    """The inputs of ``values`` that differ from the study's defaults, in input order."""
    spec = study(kind).INPUTS
    return {f.key: values[f.key] for f in spec.fields if f.key in values and values[f.key] != f.default}


# ----------------------------------------------------------------------------- share links
def _link_text(value) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, int):
        return str(value)
    if isinstance(value, float):
        if value == int(value) and abs(value) < 1e15:
            return str(int(value))
        return repr(value)  # shortest text that reads back to the same float
    return str(value)


def link_params(kind: str, values: dict, unit_system: str = "SI") -> tuple[dict, list[str]]:
    """Query parameters of a share link: the version marker, the unit system when not SI, and the
    inputs that differ from the defaults. Returns (params, keys left out because too long)."""
    params = {LINK_MARKER: LINK_VERSION}
    if unit_system != "SI":
        params[LINK_UNITS] = unit_system
    omitted = []
    for key, value in changed_inputs(kind, values).items():
        text = _link_text(value)
        if isinstance(value, str) and len(text) > MAX_LINK_TEXT_CHARS:
            omitted.append(key)
            continue
        params[key] = text
    return params, omitted


def is_link(params: dict) -> bool:
    """Whether query parameters carry anything for us (foreign framework parameters ignored)."""
    return any(k not in FOREIGN_PARAMS for k in params)


def values_from_link(kind: str, params: dict) -> tuple[dict, str]:
    """Complete validated inputs and the unit system from share-link query parameters.

    Raises :class:`InputError` naming the parameter for a missing or unknown version marker,
    an unknown parameter (e.g. from an older liftcore), or a bad value.
    """
    params = {k: v for k, v in params.items() if k not in FOREIGN_PARAMS}
    marker = params.pop(LINK_MARKER, None)
    if marker is None:
        raise InputError(LINK_MARKER, f"the link has no version marker ({LINK_MARKER}={LINK_VERSION}); "
                                      "it was not made by this dashboard")
    if marker != LINK_VERSION:
        raise InputError(LINK_MARKER, f"the link has version {LINK_MARKER}={marker!r:.20}; this liftcore reads "
                                      f"{LINK_MARKER}={LINK_VERSION}")
    system = params.pop(LINK_UNITS, "SI")
    if system not in units.UNIT_SYSTEMS:
        raise InputError(LINK_UNITS, f"the link's {LINK_UNITS} must be one of {', '.join(units.UNIT_SYSTEMS)} "
                                     f"(got {system!r:.30})")
    spec = study(kind).INPUTS
    raw = {}
    for key, text in params.items():
        if key not in spec.keys:
            raise InputError(key, f"the link has an input this page does not know: {key!r:.60}"
                                  f"{_suggest(key, spec.keys)}; it may come from another version")
        f = spec.field(key)
        if f.kind in ("number", "int"):
            try:
                raw[key] = float(text)
            except (TypeError, ValueError):
                raise InputError(key, f"the link's {f.label} ({key}) must be a number (got {text!r:.40})") from None
            if not math.isfinite(raw[key]):
                raise InputError(key, f"the link's {f.label} ({key}) must be a finite number (got {text!r:.40})")
            if f.kind == "int" and raw[key] == int(raw[key]):
                raw[key] = int(raw[key])
        elif f.kind == "bool":
            if text not in ("true", "false"):
                raise InputError(key, f"the link's {f.label} ({key}) must be true or false (got {text!r:.40})")
            raw[key] = text == "true"
        else:
            raw[key] = text
    return validate_inputs(kind, raw, "the link", ""), system
