"""Best spin for many wind conditions: the vectorised search against a per-condition SciPy loop,
and both against a 4001-point scan of the same net gain.

All sides use the same physics (``liftcore.rotor``'s one evaluator, one condition at a time on
the loop side), the same limits (rpm and spin ratio through the search range, motor power and
heel as constraints, the stopped rotor always allowed) and the same operating rule (stopped
where no spin gains more than the smallest worthwhile gain).

* The **SciPy loop** is what a careful engineer would write, one condition at a time: the net
  gain on a scan of ``rotor.GRID_POINTS`` spins, every limit boundary between scan points
  located with ``scipy.optimize.brentq``, then ``scipy.optimize.minimize_scalar(method="bounded")``
  within the limits one scan step either way round the best scan point.
* The **4001-point scan** evaluates every condition at 4001 spins from stopped to the highest
  allowed and keeps the best that keeps the limits: the reference for accuracy.

Times and ratios are measured side by side in one run (the vectorised time is the best of three).

    python -m benchmarks.bench_rotor [--conditions N] [--loop-conditions M]
"""

from __future__ import annotations

import argparse
import sys
import time

import numpy as np
from scipy.optimize import brentq, minimize_scalar

from liftcore import coefficients as coef
from liftcore import rotor
from liftcore import rotor_inputs

TARGET_SPEEDUP = 30.0
TARGET_SHORTFALL_PCT = 0.05
#: Net gains smaller than this are compared against it instead (relative differences of nearly
#: zero gains say nothing). [W]
NET_FLOOR_W = 1000.0
SCAN_POINTS = 4001


def conditions(n: int, seed: int = 2026):
    """Random ship speeds, true wind speeds (at 10 m) and true wind angles."""
    rng = np.random.default_rng(seed)
    return rng.uniform(0.0, 10.0, n), rng.uniform(0.0, 20.0, n), rng.uniform(-np.pi, np.pi, n)


def _rule(setup, best, stopped):
    return best if best > setup.min_gain_w else stopped


def scipy_loop(setup: rotor.RotorSetup, vs, vt, g) -> np.ndarray:
    """Net gain of the best spin, one condition at a time (see the module notes)."""
    out = np.empty(vs.size)
    for i in range(vs.size):
        w = rotor._wind(setup, vs[i:i + 1], vt[i:i + 1], g[i:i + 1])
        top = float(rotor._omega_top(setup, w)[0])

        def res(x):
            return rotor._evaluate(setup, w, np.array([x]), full=False)

        def net(x):
            return float(res(x)["net"][0])

        def margin(x):
            r = res(x)
            return max(float(r["power1"][0]) / setup.max_motor_power_w,
                       abs(float(r["heel"][0])) / setup.max_heeling_moment_nm) - 1.0

        stopped = net(0.0)
        if top <= 0.0:
            out[i] = stopped
            continue
        grid = np.linspace(0.0, top, rotor.GRID_POINTS)
        nets = np.array([net(x) for x in grid])
        keeps = np.array([margin(x) <= 1e-9 for x in grid])
        keeps[0] = True
        j = int(np.argmax(np.where(keeps, nets, -np.inf)))
        lo, hi = grid[max(j - 1, 0)], grid[min(j + 1, grid.size - 1)]
        best = nets[j]
        for side in (-1, 1):
            k = j + side
            if 0 <= k < grid.size and not keeps[k]:
                edge = brentq(margin, *sorted((grid[j], grid[k])), xtol=1e-12 * top)
                edge = grid[j] + (edge - grid[j]) * (1.0 - 1e-9)    # just inside the limit
                lo, hi = (edge, hi) if side < 0 else (lo, edge)
                if margin(edge) <= 1e-9:
                    best = max(best, net(edge))
        if hi > lo:
            opt = minimize_scalar(lambda x: -net(x), bounds=(lo, hi), method="bounded",
                                  options={"xatol": 1e-9 * top})
            if margin(opt.x) <= 1e-9:
                best = max(best, -opt.fun)
        out[i] = _rule(setup, best, stopped)
    return out


def scan(setup: rotor.RotorSetup, vs, vt, g) -> np.ndarray:
    """Best net gain over ``SCAN_POINTS`` spins per condition within the limits (the reference)."""
    out = np.empty(vs.size)
    for start in range(0, vs.size, 200):
        sl = slice(start, start + 200)
        w = rotor._wind(setup, vs[sl], vt[sl], g[sl])
        top = rotor._omega_top(setup, w)
        best = np.full(top.size, -np.inf)
        stopped = rotor._evaluate(setup, w, np.zeros(top.size), full=False)["net"]
        for frac in np.array_split(np.linspace(0.0, 1.0, SCAN_POINTS), 40):
            best = np.maximum(best, rotor._score(setup, w, frac[:, None] * top[None, :]).max(axis=0))
        out[sl] = np.where(best > setup.min_gain_w, best, stopped)
    return out


def _shortfall(values, reference):
    return (reference - values) / np.maximum(np.abs(reference), NET_FLOOR_W)


def main(argv=()) -> dict:
    """Run the benchmark; ``argv`` are this module's own options (none when run by the suite)."""
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--conditions", type=int, default=10_000)
    p.add_argument("--loop-conditions", type=int, default=1_000,
                   help="conditions for the SciPy loop (its time is scaled to all)")
    p.add_argument("--other-conditions", type=int, default=2_000,
                   help="conditions for the accuracy check of the other published sets")
    args = p.parse_args(argv)
    n = args.conditions
    m = min(n, args.loop_conditions)
    setup = rotor_inputs.setup_from_inputs({})
    vs, vt, g = conditions(n)
    rotor.best_operation(setup, vs[:100], vt[:100], g[:100])  # warm up imports and caches
    print(f"[bench_rotor] vectorised search, {n:,} conditions", file=sys.stderr)
    times = []
    for _ in range(3):
        t0 = time.perf_counter()
        op = rotor.best_operation(setup, vs, vt, g)
        times.append(time.perf_counter() - t0)
    t_vec = min(times)
    print(f"[bench_rotor] SciPy loop, {m:,} conditions", file=sys.stderr)
    t0 = time.perf_counter()
    loop = scipy_loop(setup, vs[:m], vt[:m], g[:m])
    t_loop = (time.perf_counter() - t0) * n / m
    print(f"[bench_rotor] {SCAN_POINTS}-point scan of every condition", file=sys.stderr)
    reference = scan(setup, vs, vt, g)
    vec = op.net_power_w.ravel()
    short_vec = _shortfall(vec, reference)
    short_loop = _shortfall(loop, reference[:m])
    worst = max(0.0, float(short_vec.max())) * 100
    speedup = t_loop / t_vec
    print(f"rotor best spin, {n:,} conditions ({setup.rotor_count} rotors, {setup.wind_profile} "
          f"profile, {setup.strips} strips, set {setup.coefficients.name})")
    print(f"  vectorised search                         {t_vec:9.3f} s   (best of 3)")
    print(f"  per-condition SciPy loop                  {t_loop:9.3f} s   ({m:,} conditions timed, scaled)")
    print(f"  speed-up                                  {speedup:9.1f} x   "
          f"(target >= {TARGET_SPEEDUP:g} x: {'met' if speedup >= TARGET_SPEEDUP else 'NOT met'})")
    over = int(np.sum(short_vec * 100 > TARGET_SHORTFALL_PCT))
    print(f"  short of the {SCAN_POINTS}-point scan by at most     {worst:9.5f} %   "
          f"(of |net|, floor {NET_FLOOR_W / 1000:g} kW; target <= {TARGET_SHORTFALL_PCT:g} % in every "
          f"condition: {'met' if over == 0 else f'NOT met in {over:,}'})")
    print(f"  SciPy loop short of the scan by at most   {max(0.0, float(short_loop.max())) * 100:9.5f} %")
    print(f"  above the scan (between its points) by up to {max(0.0, -float(short_vec.min())) * 100:.5f} %")
    k = min(n, args.other_conditions)
    for name, cs in coef.published_sets().items():
        if name == setup.coefficients.name:
            continue
        other = rotor.with_coefficients(setup, cs)
        print(f"[bench_rotor] set {name}: search and scan, {k:,} conditions", file=sys.stderr)
        short = _shortfall(rotor.best_operation(other, vs[:k], vt[:k], g[:k]).net_power_w.ravel(),
                           scan(other, vs[:k], vt[:k], g[:k]))
        bad = int(np.sum(short * 100 > TARGET_SHORTFALL_PCT))
        over += bad
        worst = max(worst, max(0.0, float(short.max())) * 100)
        print(f"  set {name:<28} short of the scan by at most {max(0.0, float(short.max())) * 100:9.5f} %   "
              f"({k:,} conditions: {'met' if bad == 0 else f'NOT met in {bad:,}'})")
    return {"conditions": n, "vectorised_s": t_vec, "loop_s": t_loop, "speedup": speedup,
            "shortfall_pct": worst, "conditions_over_target": over}


if __name__ == "__main__":
    main(sys.argv[1:])
