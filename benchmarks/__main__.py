"""Run every ``benchmarks/bench_*.py`` module's ``main()`` in turn (``python -m benchmarks [name ...]``).

Give module names (``bench_flow``) or parts of them to run only those.
"""

from __future__ import annotations

import importlib
import sys
import time
import traceback
from pathlib import Path

HERE = Path(__file__).resolve().parent


def modules(selected=()) -> list[str]:
    names = sorted(p.stem for p in HERE.glob("bench_*.py"))
    if selected:
        names = [n for n in names if any(s in n for s in selected)]
    return names


def main(argv=None) -> int:
    root = str(HERE.parent)
    if root not in sys.path:
        sys.path.insert(0, root)
    names = modules(sys.argv[1:] if argv is None else argv)
    if not names:
        print("no benchmarks matched", file=sys.stderr)
        return 2
    failed = []
    for name in names:
        print(f"=== {name} ===", flush=True)
        t0 = time.perf_counter()
        try:
            importlib.import_module(f"benchmarks.{name}").main()
        except Exception:  # report and go on with the next benchmark
            traceback.print_exc()
            failed.append(name)
        print(f"--- {name}: {time.perf_counter() - t0:.1f} s\n", flush=True)
    if failed:
        print(f"benchmarks that failed: {', '.join(failed)}", file=sys.stderr)
        return 1
    return 0


if __name__ == "__main__":
    sys.exit(main())
