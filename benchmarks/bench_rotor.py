"""Best spin for many wind conditions: the vectorised search against a per-condition loop.

Both sides use the same physics (``liftcore.rotor``'s strip model, one condition at a time on the
loop side) and the same limits. The loop is the usual way: for each condition, find where the
motor-power or heel limit starts to bind with ``scipy.optimize.brentq`` (limits assumed to grow
with spin), maximise the net gain below it with ``scipy.optimize.minimize_scalar`` (bounded),
then keep the best of that, the limit point and the stopped rotor. Prints both times, their ratio
and the largest difference in net gain, measured side by side in one run.

    python -m benchmarks.bench_rotor [--conditions N]
"""

from __future__ import annotations

import argparse
import time

import numpy as np
from scipy.optimize import brentq, minimize_scalar

from liftcore import rotor

TARGET_SPEEDUP = 50.0
TARGET_DIFFERENCE_PCT = 0.5
#: Net gains smaller than this are compared against it instead (relative differences of nearly
#: zero gains say nothing). [W]
NET_FLOOR_W = 1000.0


def conditions(n: int, seed: int = 2026):
    """Random ship speeds, true wind speeds (at 10 m) and true wind angles."""
    rng = np.random.default_rng(seed)
    return rng.uniform(3.0, 9.0, n), rng.uniform(0.0, 20.0, n), rng.uniform(-np.pi, np.pi, n)


def best_one_at_a_time(setup: rotor.RotorSetup, vs, vt, g) -> np.ndarray:
    """Net power gain of the best spin, one condition at a time with SciPy's scalar optimisers."""
    out = np.empty(vs.size)
    r = setup.radius_m
    for i in range(vs.size):
        w = rotor._wind(setup, vs[i:i + 1], vt[i:i + 1], g[i:i + 1])
        va = float(w.va_mid[0])
        stopped = float(rotor._evaluate(setup, w, np.zeros(1))["net"][0])
        if va <= rotor.CALM_M_S:
            out[i] = stopped
            continue
        top = min(setup.spin_ratio_limit() * va / r, setup.max_rpm * 2 * np.pi / 60)

        def net(x):
            return float(rotor._evaluate(setup, w, np.array([x]))["net"][0])

        def margin(x):
            res = rotor._evaluate(setup, w, np.array([x]))
            return max(res["power1"][0] / setup.max_motor_power_w,
                       abs(res["heel"][0]) / setup.max_heeling_moment_nm) - 1.0

        hi = top
        if margin(top) > 0:
            hi = 0.0 if margin(0.0) > 0 else brentq(margin, 0.0, top, xtol=1e-10 * max(top, 1.0))
        candidates = [stopped]
        if hi > 0:
            opt = minimize_scalar(lambda x: -net(x), bounds=(0.0, hi), method="bounded",
                                  options={"xatol": 1e-8 * hi})
            candidates += [-opt.fun, net(hi)]
        out[i] = max(candidates)
    return out


DENSE_POINTS = 4001


def dense_scan(setup: rotor.RotorSetup, vs, vt, g) -> np.ndarray:
    """Best net gain on a dense grid of spin within the limits (a check, not a method)."""
    w = rotor._wind(setup, vs, vt, g)
    va = np.maximum(w.va_mid, 1e-9)
    top = np.minimum(setup.spin_ratio_limit() * va / setup.radius_m, setup.max_rpm * 2 * np.pi / 60)
    grid = np.linspace(0.0, 1.0, DENSE_POINTS)[:, None] * top[None, :]
    res = rotor._evaluate(setup, w, grid)
    ok = rotor._feasible(setup, res) | (grid == 0.0)
    return np.where(ok, res["net"], -np.inf).max(axis=0)


def main(argv=()) -> dict:
    """Run the benchmark; ``argv`` are this module's own options (none when run by the suite)."""
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--conditions", type=int, default=10_000)
    args = p.parse_args(argv)
    n = args.conditions
    setup = rotor.setup_from_inputs({})
    vs, vt, g = conditions(n)
    rotor.best_operation(setup, vs[:100], vt[:100], g[:100])  # warm up imports and caches

    times = []
    for _ in range(3):
        t0 = time.perf_counter()
        op = rotor.best_operation(setup, vs, vt, g)
        times.append(time.perf_counter() - t0)
    t_vec = min(times)

    t0 = time.perf_counter()
    ref = best_one_at_a_time(setup, vs, vt, g)
    t_loop = time.perf_counter() - t0

    diff = (op.net_power_w - ref) / np.maximum(np.abs(ref), NET_FLOOR_W)
    worst = float(np.max(np.abs(diff))) * 100
    shortfall = float(max(0.0, -np.min(diff))) * 100
    better = int(np.sum(diff > 1e-6))
    worse = int(np.sum(diff < -1e-6))
    speedup = t_loop / t_vec
    print(f"rotor best spin, {n:,} conditions ({setup.rotor_count} rotors, {setup.wind_profile} "
          f"profile, {setup.strips} strips, set {setup.coefficients.name})")
    print(f"  vectorised (grid, bisection, golden section) {t_vec:9.3f} s   (best of 3)")
    print(f"  per-condition scipy minimize_scalar loop     {t_loop:9.3f} s")
    print(f"  speed-up                                     {speedup:9.1f} x   "
          f"(target >= {TARGET_SPEEDUP:g} x: {'met' if speedup >= TARGET_SPEEDUP else 'NOT met'})")
    met = worst <= TARGET_DIFFERENCE_PCT
    why = "" if met else (" - the loop is the lower one in every differing condition" if worse == 0 else "")
    print(f"  max difference in net gain                   {worst:9.4f} %   "
          f"(of |net|, floor {NET_FLOOR_W / 1000:g} kW; target <= {TARGET_DIFFERENCE_PCT:g} %: "
          f"{'met' if met else 'NOT met'}{why})")
    print(f"  largest shortfall of the vectorised search   {shortfall:9.4f} %   (where it is below the loop)")
    print(f"  vectorised higher in {better:,}, lower in {worse:,} conditions (beyond 1e-6 relative)")
    differ = np.flatnonzero(np.abs(diff) > 1e-6)
    if differ.size:
        truth = dense_scan(setup, vs[differ], vt[differ], g[differ])
        scale = np.maximum(np.abs(truth), NET_FLOOR_W)
        e_vec = float(np.max((truth - op.net_power_w[differ]) / scale)) * 100
        e_loop = float(np.max((truth - ref[differ]) / scale)) * 100
        print(f"  where they differ, against a {DENSE_POINTS}-point scan: vectorised short by at most "
              f"{max(e_vec, 0.0):.4f} %, loop by at most {max(e_loop, 0.0):.4f} %")
        print("  (there the net gain has several local maxima close together, as the strips' spin "
              "ratios cross the coefficient table's points)")
    return {"conditions": n, "vectorised_s": t_vec, "loop_s": t_loop, "speedup": speedup,
            "max_difference_pct": worst, "max_shortfall_pct": shortfall}


if __name__ == "__main__":
    import sys

    main(sys.argv[1:])
