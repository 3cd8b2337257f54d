"""Best spin for many wind conditions: the vectorised search against per-condition SciPy loops.

All sides use the same physics (``liftcore.rotor``'s strip model, one condition at a time on the
loop side) and the same limits (rpm through the search range, motor power and heel as
constraints, the stopped rotor always allowed).

* The **scan + Brent loop** is what a careful engineer would write with SciPy, one condition at a
  time: the net gain on a scan of ``rotor.BEST_GRID_POINTS`` spins over the whole range (the
  vectorised search's grid), every limit boundary between scan points located with
  ``scipy.optimize.brentq``, then ``scipy.optimize.minimize_scalar(method="bounded")`` on the
  stretch within the limits, one scan step either way, around the best of the scan points and
  boundaries; the best of all is kept. The speed-up and the net-gain target are measured
  against it.
* The **naive Brent loop** (the earlier version of this benchmark): ``brentq`` for where a limit
  starts to bind (assuming it grows with spin), then bounded Brent alone over the whole range
  below it. It stops on whichever local maximum it meets first; its shortfall against a dense
  scan of the net gain is printed.

Times and ratios are measured side by side in one run (the vectorised time is the best of three).
Where results differ, a dense scan of ``DENSE_POINTS`` spins per condition says which is right.

    python -m benchmarks.bench_rotor [--conditions N] [--naive-conditions M]
"""

from __future__ import annotations

import argparse
import time

import numpy as np
from scipy.optimize import brentq, minimize_scalar

from liftcore import rotor
from liftcore import rotor_inputs

TARGET_SPEEDUP = 50.0
TARGET_DIFFERENCE_PCT = 0.5
#: Net gains smaller than this are compared against it instead (relative differences of nearly
#: zero gains say nothing). [W]
NET_FLOOR_W = 1000.0
#: Spins per condition in the dense scan that judges where results differ.
DENSE_POINTS = 4001
#: Relative difference in net gain counted as "differs" (far above the searches' tolerances).
SAME = 1e-6


def conditions(n: int, seed: int = 2026):
    """Random ship speeds, true wind speeds (at 10 m) and true wind angles."""
    rng = np.random.default_rng(seed)
    return rng.uniform(3.0, 9.0, n), rng.uniform(0.0, 20.0, n), rng.uniform(-np.pi, np.pi, n)


class _One:
    """Net gain and limit margin of one condition at one angular speed (the core's own sums)."""

    def __init__(self, setup: rotor.RotorSetup, vs, vt, g):
        self.setup = setup
        self.w = rotor._wind(setup, np.array([vs]), np.array([vt]), np.array([g]))
        va = float(self.w.va_mid[0])
        self.calm = va <= rotor.CALM_M_S
        self.top = 0.0 if self.calm else min(setup.spin_ratio_limit() * va / setup.radius_m,
                                             setup.max_rpm * 2.0 * np.pi / 60.0)

    def evaluate(self, omega):
        res = rotor._evaluate(self.setup, self.w, np.asarray(omega, dtype=float).reshape(-1, 1))
        margin = np.maximum(res["power1"][:, 0] / self.setup.max_motor_power_w,
                            np.abs(res["heel"][:, 0]) / self.setup.max_heeling_moment_nm) - 1.0
        return res["net"][:, 0], margin

    def net(self, x):
        return float(self.evaluate([x])[0][0])

    def margin(self, x):
        return float(self.evaluate([x])[1][0])


def _keeps(margin):
    return margin <= 1e-9


def scan_and_brent(setup: rotor.RotorSetup, vs, vt, g) -> np.ndarray:
    """Net gain of the best spin, one condition at a time: a scan; every limit boundary between
    scan points located with brentq; bounded Brent on the stretch within the limits around the
    best of the scan points and boundaries."""
    k = rotor.BEST_GRID_POINTS
    out = np.empty(vs.size)
    for i in range(vs.size):
        one = _One(setup, vs[i], vt[i], g[i])
        if one.calm:
            out[i] = one.net(0.0)
            continue
        grid = np.linspace(0.0, one.top, k)
        net, margin = one.evaluate(grid)
        keeps = _keeps(margin)
        ok = keeps.copy()
        ok[0] = True                                      # the stopped rotor is always allowed
        j = int(np.argmax(np.where(ok, net, -np.inf)))
        best_x, best = grid[j], net[j]
        edges = []                                        # (boundary, True if it keeps below)
        for c in np.flatnonzero(keeps[:-1] != keeps[1:]):
            inside = grid[c] if keeps[c] else grid[c + 1]
            edge = brentq(one.margin, grid[c], grid[c + 1], xtol=1e-12 * one.top)
            if not _keeps(one.margin(edge)):              # brentq may land just outside
                edge = inside + (edge - inside) * (1.0 - 1e-9)
            if _keeps(one.margin(edge)):
                edges.append((edge, bool(keeps[c])))
                if one.net(edge) > best:
                    best_x, best = edge, one.net(edge)
        cell = grid[1]
        lo, hi = max(0.0, best_x - cell), min(one.top, best_x + cell)
        for edge, below in edges:
            if edge == best_x:
                lo, hi = (lo, edge) if below else (edge, hi)
            elif edge < best_x:
                lo = max(lo, edge)
            else:
                hi = min(hi, edge)
        if best_x == 0.0 and not keeps[0]:                # only the stopped rotor there
            hi = lo
        if hi > lo:
            opt = minimize_scalar(lambda x: -one.net(x), bounds=(lo, hi), method="bounded",
                                  options={"xatol": 1e-9 * one.top})
            if _keeps(one.margin(opt.x)):
                best = max(best, -opt.fun)
        out[i] = best
    return out


def brent_only(setup: rotor.RotorSetup, vs, vt, g) -> np.ndarray:
    """Net gain of the best spin, one condition at a time, by bounded Brent alone over the whole
    range below where a limit starts to bind (the naive loop)."""
    out = np.empty(vs.size)
    for i in range(vs.size):
        one = _One(setup, vs[i], vt[i], g[i])
        stopped = one.net(0.0)
        if one.calm:
            out[i] = stopped
            continue
        hi = one.top
        if one.margin(hi) > 0:
            hi = 0.0 if one.margin(0.0) > 0 else brentq(one.margin, 0.0, hi, xtol=1e-10 * max(hi, 1.0))
        candidates = [stopped]
        if hi > 0:
            opt = minimize_scalar(lambda x: -one.net(x), bounds=(0.0, hi), method="bounded",
                                  options={"xatol": 1e-8 * hi})
            candidates += [-opt.fun, one.net(hi)]
        out[i] = max(candidates)
    return out


def dense_scan(setup: rotor.RotorSetup, vs, vt, g) -> np.ndarray:
    """Best net gain on a dense grid of spin within the limits (a check, not a method)."""
    out = np.empty(vs.size)
    for start in range(0, vs.size, 100):
        sl = slice(start, start + 100)
        w = rotor._wind(setup, vs[sl], vt[sl], g[sl])
        va = np.maximum(w.va_mid, 1e-9)
        top = np.minimum(setup.spin_ratio_limit() * va / setup.radius_m, setup.max_rpm * 2 * np.pi / 60)
        grid = np.linspace(0.0, 1.0, DENSE_POINTS)[:, None] * top[None, :]
        res = rotor._evaluate(setup, w, grid)
        ok = rotor._feasible(setup, res) | (grid == 0.0)
        out[sl] = np.where(ok, res["net"], -np.inf).max(axis=0)
    return out


def _relative(a, b):
    return (a - b) / np.maximum(np.abs(b), NET_FLOOR_W)


def main(argv=()) -> dict:
    """Run the benchmark; ``argv`` are this module's own options (none when run by the suite)."""
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--conditions", type=int, default=10_000)
    p.add_argument("--naive-conditions", type=int, default=None,
                   help="conditions for the naive loop (default: all)")
    args = p.parse_args(argv)
    n = args.conditions
    m = n if args.naive_conditions is None else min(n, args.naive_conditions)
    setup = rotor_inputs.setup_from_inputs({})
    vs, vt, g = conditions(n)
    rotor.best_operation(setup, vs[:100], vt[:100], g[:100])  # warm up imports and caches

    times = []
    for _ in range(3):
        t0 = time.perf_counter()
        op = rotor.best_operation(setup, vs, vt, g)
        times.append(time.perf_counter() - t0)
    t_vec = min(times)
    t0 = time.perf_counter()
    careful = scan_and_brent(setup, vs, vt, g)
    t_loop = time.perf_counter() - t0
    t0 = time.perf_counter()
    naive = brent_only(setup, vs[:m], vt[:m], g[:m])
    t_naive = time.perf_counter() - t0

    vec = op.net_power_w
    diff = _relative(vec, careful)
    worst = float(np.max(np.abs(diff))) * 100
    speedup = t_loop / t_vec
    print(f"rotor best spin, {n:,} conditions ({setup.rotor_count} rotors, {setup.wind_profile} "
          f"profile, {setup.strips} strips, set {setup.coefficients.name})")
    print(f"  vectorised search                            {t_vec:9.3f} s   (best of 3)")
    print(f"  per-condition loop, scan + bounded Brent     {t_loop:9.3f} s")
    print(f"  speed-up                                     {speedup:9.1f} x   "
          f"(target >= {TARGET_SPEEDUP:g} x: {'met' if speedup >= TARGET_SPEEDUP else 'NOT met'})")
    met = worst <= TARGET_DIFFERENCE_PCT
    print(f"  max difference in net gain                   {worst:9.4f} %   "
          f"(of |net|, floor {NET_FLOOR_W / 1000:g} kW; target <= {TARGET_DIFFERENCE_PCT:g} %: "
          f"{'met' if met else 'NOT met'})")
    higher, lower = int(np.sum(diff > SAME)), int(np.sum(diff < -SAME))
    print(f"  vectorised higher in {higher:,}, lower in {lower:,} conditions (beyond {SAME:g} relative)")

    naive_diff = _relative(naive, vec[:m])
    t_naive_all = t_naive * n / m
    scaled = "" if m == n else f" ({m:,} conditions, scaled to {n:,})"
    print(f"  naive loop, bounded Brent alone              {t_naive_all:9.3f} s{scaled}; "
          f"speed-up {t_naive_all / t_vec:.1f} x")
    print(f"  naive loop below the vectorised search by up to {max(0.0, -float(naive_diff.min())) * 100:.4f} % "
          f"(in {int(np.sum(naive_diff < -SAME)):,} conditions)")

    differ = np.flatnonzero((np.abs(diff) > SAME) | (np.abs(np.append(naive_diff, np.zeros(n - m))) > SAME))
    shortfall = {}
    if differ.size:
        truth = dense_scan(setup, vs[differ], vt[differ], g[differ])
        in_naive = differ < m
        for name, values, mask in (("vectorised", vec[differ], None), ("scan + Brent", careful[differ], None),
                                   ("naive Brent", naive[differ[in_naive]], in_naive)):
            t = truth if mask is None else truth[mask]
            shortfall[name] = max(0.0, float(np.max(-_relative(values, t), initial=0.0))) * 100
        print(f"  where any differ ({differ.size:,} conditions), short of a {DENSE_POINTS}-point scan by at most: "
              + ", ".join(f"{k} {v:.4f} %" for k, v in shortfall.items()))
        print("  (the net gain along the spin has close local maxima where the strips' spin ratios cross "
              "the coefficient table's points)")
    return {"conditions": n, "vectorised_s": t_vec, "loop_s": t_loop, "speedup": speedup,
            "max_difference_pct": worst, "naive_loop_s": t_naive_all, "dense_shortfall_pct": shortfall}


if __name__ == "__main__":
    import sys

    main(sys.argv[1:])
