"""Start-up of the command line: whole commands timed from outside, side by side.

A one-flight ``liftcore flight`` command, the same with 10,000 dispersed flights, and a one-case
``liftcore rotor`` command are each timed against the bare interpreter importing what any
numerical run needs (``python -c "import numpy, scipy.integrate"``). The commands run in turn
with the yardstick (A B A B ...) and the ratio is taken pair by pair, so a machine that slows
down during the run moves both sides alike; the median of the pairs is printed.

Target: the one-flight command at most 1.3x the bare import (a command imports only what it
needs: no pandas, Pint or Plotly for a flight that prints one table).

    python -m benchmarks.bench_startup [--runs N]
"""

from __future__ import annotations

import argparse
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
TARGET_ONE_FLIGHT = 1.3
BARE = [sys.executable, "-c", "import numpy, scipy.integrate"]
FLIGHT = [sys.executable, "-m", "liftcore", "flight", "--ball", "golf", "--speed-m-s", "65",
          "--elevation-deg", "12", "--spin-rpm", "2700", "--json"]
COMMANDS = {
    "one flight": FLIGHT,
    "10,000 dispersed flights": FLIGHT + ["--dispersion", "10000", "--seed", "1"],
    "one rotor case": [sys.executable, "-m", "liftcore", "rotor", "--diameter-m", "5", "--height-m", "30",
                       "--ship-speed-kn", "12", "--true-wind-speed-kn", "20", "--true-wind-angle-deg", "90",
                       "--json"],
}


def wall(cmd) -> float:
    """Wall seconds of one whole run of ``cmd`` (output thrown away; a failure stops the run)."""
    t0 = time.perf_counter()
    subprocess.run(cmd, cwd=ROOT, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, check=True)
    return time.perf_counter() - t0


def paired(cmd, runs: int) -> tuple[float, float, float]:
    """(median seconds of ``cmd``, median of the bare import, median of the pair ratios)."""
    wall(cmd), wall(BARE)  # warm the file cache
    a, b = [], []
    for _ in range(runs):
        a.append(wall(cmd))
        b.append(wall(BARE))
    return statistics.median(a), statistics.median(b), statistics.median(x / y for x, y in zip(a, b))


def main(argv=None) -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--runs", type=int, default=7, help="pairs per command (default 7)")
    args = ap.parse_args(argv if argv is not None else [])
    print(f"{'command':<26} {'median s':>9} {'bare s':>8} {'ratio':>7}")
    ratios = {}
    for name, cmd in COMMANDS.items():
        a, b, r = paired(cmd, args.runs)
        ratios[name] = r
        print(f"{name:<26} {a:9.3f} {b:8.3f} {r:6.2f}x", flush=True)
    r = ratios["one flight"]
    verdict = "meets" if r <= TARGET_ONE_FLIGHT else "MISSES"
    print(f"one-flight command / bare 'import numpy, scipy.integrate': {r:.2f}x "
          f"({verdict} the target <= {TARGET_ONE_FLIGHT}x)")


if __name__ == "__main__":
    main(sys.argv[1:])
