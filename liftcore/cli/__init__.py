"""``python -m liftcore <command> ... [--json]``.

Each command lives in its own module under ``liftcore.cli`` with two functions::

    def add_parser(subparsers) -> argparse.ArgumentParser
    def execute(args, progress) -> tuple[dict, str]   # (JSON-able dict, human-readable text)

Bad input exits with status 2 and one line on stderr naming the field, the value and the allowed
range; never a traceback. Progress of long work goes to stderr, never into ``--json`` output.
"""

from __future__ import annotations

import argparse
import importlib
import json
import re
import math
import os
import sys

from liftcore.errors import InputError

#: command name -> module under liftcore.cli
COMMANDS = ("air", "flow", "rotor", "voyage", "flight", "fit", "run")
#: One line per command for ``liftcore --help`` (the command's own module is imported only when
#: it runs: a one-flight command does not pay for pandas, Pint and the rotor's data).
COMMAND_HELP = {
    "air": "air density, viscosity and speed of sound",
    "flow": "ideal flow round a spinning cylinder: circulation and Kutta-Joukowski lift",
    "rotor": "rotor sails on a ship: forces, spin power, net gain, best spin",
    "voyage": "yearly energy, fuel, CO2 and money saved by rotor sails on a trade",
    "flight": "flight of a spinning ball: carry, peak height, drift, landing",
    "fit": "drag and lift of a ball fitted to its tracked flights (CSV)",
    "run": "run a scenario or comparison file (.toml)",
}


class UsageError(Exception):
    """Raised by the parser instead of printing a usage block and exiting."""


class _Parser(argparse.ArgumentParser):
    def error(self, message):  # one line, exit status 2 (handled in main)
        raise UsageError(f"{self.prog}: {message}")


def build_parser(argv=None) -> argparse.ArgumentParser:
    """The parser; with ``argv``, only the command it names is imported and built in full (the
    others are listed by name and help only)."""
    parser = _Parser(prog="liftcore", description="Lift, drag, thrust and power of spinning "
                     "cylinders and spheres.")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    sub.required = True
    chosen = next((a for a in (argv or ()) if not a.startswith("-")), None)
    for name in COMMANDS:
        if argv is not None and name != chosen:
            sub.add_parser(name, help=COMMAND_HELP[name], add_help=False)
            continue
        mod = importlib.import_module(f"liftcore.cli.{name}")
        p = mod.add_parser(sub)
        p.set_defaults(_execute=mod.execute)
    return parser


def add_json_flag(p: argparse.ArgumentParser) -> None:
    p.add_argument("--json", action="store_true", help="print machine-readable JSON on stdout")


class Progress:
    """A one-line progress indicator on stderr: ``progress(fraction, text)``."""

    def __init__(self, stream=None):
        self.stream = stream or sys.stderr
        self._last = -1
        self.used = False

    def __call__(self, fraction: float, text: str = "") -> None:
        pct = int(round(100 * max(0.0, min(1.0, fraction))))
        if pct == self._last:
            return
        self._last = pct
        self.used = True
        self.stream.write(f"\r{text[:60]:<60} {pct:3d} %")
        if pct >= 100:
            self.stream.write("\n")
        self.stream.flush()

    def close(self) -> None:
        if self.used and self._last < 100:
            self.stream.write("\n")
            self.stream.flush()


def _clean_json(obj):
    """Replace NaN/inf by None so the output is strict JSON."""
    if isinstance(obj, float):
        return obj if math.isfinite(obj) else None
    if isinstance(obj, dict):
        return {k: _clean_json(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [_clean_json(v) for v in obj]
    if hasattr(obj, "tolist"):
        return _clean_json(obj.tolist())
    if hasattr(obj, "item"):
        return _clean_json(obj.item())
    return obj


_NEGATIVE_NUMBER = re.compile(r"^-(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$|^-(inf|nan)$", re.IGNORECASE)


def join_negative_values(argv: list[str]) -> list[str]:
    """``--opt -1e-05`` as ``--opt=-1e-05``: argparse takes a negative number in exponent
    notation for an option, so the value would be refused before liftcore sees it."""
    out = []
    for a in argv:
        if (out and _NEGATIVE_NUMBER.match(a) and out[-1].startswith("--") and "=" not in out[-1]
                and not any(c.isdigit() for c in out[-1][2:3])):
            out[-1] = f"{out[-1]}={a}"
        else:
            out.append(a)
    return out


def main(argv=None) -> int:
    progress = Progress()
    try:
        argv = join_negative_values(list(sys.argv[1:] if argv is None else argv))
        args = build_parser(argv).parse_args(argv)
        data, text = args._execute(args, progress)
    except UsageError as exc:
        print(str(exc).replace("\n", " "), file=sys.stderr)
        return 2
    except InputError as exc:
        progress.close()
        print(f"liftcore: {exc}", file=sys.stderr)
        return 2
    except OSError as exc:  # missing, a folder, no permission, name too long, a symlink loop...
        progress.close()
        name = str(exc.filename) if exc.filename is not None else "a file"
        if len(name) > 80:
            name = name[:38] + "…" + name[-38:]
        print(f"liftcore: cannot read {name}: {exc.strerror or exc}", file=sys.stderr)
        return 2
    except KeyboardInterrupt:
        progress.close()
        print("liftcore: interrupted", file=sys.stderr)
        return 130
    progress.close()
    try:
        if getattr(args, "json", False):
            print(json.dumps(_clean_json(data), indent=2, ensure_ascii=False))
        else:
            print(text)
        sys.stdout.flush()
    except BrokenPipeError:  # output piped into a reader that stopped early (e.g. `| head`)
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
        return 0
    return 0
