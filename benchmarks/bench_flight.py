"""Ball flight speed: batched flights against a per-flight scipy solve_ivp loop, measured side by side.

Run: ``python benchmarks/bench_flight.py`` (or through ``python -m benchmarks``).
The loop is timed on a subset of the same flights and scaled to the full count (stated in the
output); both use the same right-hand side and the same tolerances.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from liftcore import ballflight as bf  # noqa: E402
from liftcore.air import air_state  # noqa: E402

N = 10_000
LOOP_SUBSET = 300
TOL = 1e-6
#: Downrange distances whose crossings the obstacle check keeps (two walls). [m]
GATES_M = (100.0, 200.0)


def _setup():
    a = air_state(0.0)
    return bf.make_setup("golf", density_kg_m3=a.density_kg_m3, kinematic_viscosity_m2_s=a.kinematic_viscosity_m2_s,
                         speed_of_sound_m_s=a.speed_of_sound_m_s, wind=bf.Wind(4.0, -60.0, "power_law"))


def _draws(n, seed=3):
    rng = np.random.default_rng(seed)
    return bf.Launch(65.0 + 1.5 * rng.standard_normal(n), 12.0 + 1.0 * rng.standard_normal(n),
                     1.5 * rng.standard_normal(n), 2700.0 + 250.0 * rng.standard_normal(n),
                     5.0 + 4.0 * rng.standard_normal(n), 0.0, 0.0)


def _loop(setup, launch, idx, method="RK45"):
    from scipy.integrate import solve_ivp

    y0, axis = bf.launch_vectors(launch)
    rhs = bf._Rhs(setup)
    out = []

    def ground(t, y):
        return y[2]

    ground.terminal, ground.direction = True, -1
    for j in idx:
        P = bf._params(setup, axis[:, [j]], 1)
        s = solve_ivp(lambda t, y: rhs(y.reshape(7, 1), P)[:, 0], (0.0, 60.0), y0[:, j], method=method,
                      rtol=TOL, atol=TOL, events=ground)
        out.append(s.y_events[0][0][0])
    return np.array(out)


def _load() -> str:
    try:
        import os

        return f"{os.getloadavg()[0]:.1f}"
    except (OSError, AttributeError):
        return "unknown"


def main() -> None:
    setup = _setup()
    launch = _draws(N)
    bf.simulate(setup, _draws(50))  # warm-up (imports, caches)
    t0 = time.perf_counter()
    res = bf.simulate(setup, launch, rtol=TOL, atol=TOL)
    t_batch = time.perf_counter() - t0
    t0 = time.perf_counter()
    gated = bf.simulate(setup, launch, rtol=TOL, atol=TOL, gates=GATES_M)
    t_gates = time.perf_counter() - t0
    idx = np.arange(LOOP_SUBSET)
    t0 = time.perf_counter()
    loop_carry = _loop(setup, launch, idx)
    t_loop_sub = time.perf_counter() - t0
    t_loop = t_loop_sub * N / LOOP_SUBSET
    diff = np.max(np.abs(res.carry_m[idx] - loop_carry) / loop_carry)
    print(f"ball flight: {N:,} dispersed golf drives (power-law crosswind), tolerance {TOL:g}")
    print(f"  batched Dormand-Prince (numpy):          {t_batch:8.3f} s   ({res.steps} steps)")
    print(f"  solve_ivp RK45 loop, {LOOP_SUBSET} flights timed:    {t_loop_sub:8.3f} s")
    print(f"  solve_ivp loop scaled to {N:,} flights:   {t_loop:8.3f} s   (measured on {LOOP_SUBSET}, scaled)")
    print(f"  speed-up batched vs loop:                {t_loop / t_batch:8.1f} x   (target >= 30 x)")
    print(f"  largest carry difference on the subset:  {100 * diff:8.5f} %")
    crossed = int(np.isfinite(gated.gate_height_m).sum())
    print(f"  same batch keeping {len(GATES_M)} gate crossings:     {t_gates:8.3f} s   "
          f"({t_gates / t_batch:.2f} x the batch, target <= 1.25 x; {crossed:,} crossings)")
    single = bf.Launch(65.0, 12.0, 0.0, 2700.0, 5.0, 0.0, 0.0)
    times = []
    for _ in range(40):
        t0 = time.perf_counter()
        bf.simulate(setup, single)
        times.append(time.perf_counter() - t0)
    times_fly = []
    for _ in range(20):
        t0 = time.perf_counter()
        bf.fly(setup, single)
        times_fly.append(time.perf_counter() - t0)
    print(f"  one flight to landing, median of 40:     {1000 * np.median(times):8.2f} ms  (target < 10 ms; "
          f"fastest {1000 * np.min(times):.2f} ms)")
    print(f"  one flight with path and warnings:       {1000 * np.median(times_fly):8.2f} ms  "
          f"(fastest {1000 * np.min(times_fly):.2f} ms)")
    print(f"  (wall-clock times; other work on this machine inflates the medians, load average "
          f"{_load():s})")


if __name__ == "__main__":
    main()
