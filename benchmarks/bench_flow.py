"""Ideal-flow field: vectorised numpy against a plain-Python loop, on the same 300 x 300 grid,
plus the streamline figure, the field-circulation study and a page rerun (AppTest).

Prints times and ratios measured side by side in this run; asserts nothing.
"""

from __future__ import annotations

import math
import time

import numpy as np

N = 300
R, V = 0.5, 8.0
GAMMA = 2.0 * math.pi * R * (1.5 * V)  # spin ratio 1.5, no-slip circulation


def best_of(fn, repeat: int = 3) -> tuple[float, object]:
    best, out = float("inf"), None
    for _ in range(repeat):
        t = time.perf_counter()
        out = fn()
        best = min(best, time.perf_counter() - t)
    return best, out


def field_numpy(xx, yy):
    from liftcore import potential as pot

    u, v = pot.velocity_field(xx, yy, V, R, GAMMA)
    psi = pot.stream_function(xx, yy, V, R, GAMMA)
    return u, v, psi


def field_loops(xs, ys):
    """The same formulas, one point at a time in plain Python."""
    ny, nx = len(ys), len(xs)
    u = [[math.nan] * nx for _ in range(ny)]
    v = [[math.nan] * nx for _ in range(ny)]
    psi = [[math.nan] * nx for _ in range(ny)]
    k = GAMMA / (2.0 * math.pi)
    for j in range(ny):
        y = ys[j]
        for i in range(nx):
            x = xs[i]
            r2 = x * x + y * y
            if r2 < R * R * (1.0 - 1e-12):
                continue
            a = R * R / (r2 * r2)
            u[j][i] = V * (1.0 - a * (x * x - y * y)) + k * y / r2
            v[j][i] = -2.0 * V * a * x * y - k * x / r2
            psi[j][i] = V * y * (1.0 - R * R / r2) + 0.5 * k * math.log(r2 / (R * R))
    return u, v, psi


def main() -> None:
    s = np.linspace(-3 * R, 3 * R, N)
    xx, yy = np.meshgrid(s, s)
    t_np, (u, v, psi) = best_of(lambda: field_numpy(xx, yy))
    t_py, (u2, v2, psi2) = best_of(lambda: field_loops(list(s), list(s)), repeat=1)
    diff = np.nanmax(np.abs(np.array(u2, dtype=float) - u)) + np.nanmax(np.abs(np.array(psi2, dtype=float) - psi))
    print(f"velocity + stream function on {N} x {N} = {N * N} points")
    print(f"  numpy (vectorised)    {t_np * 1e3:9.2f} ms")
    print(f"  plain Python loops    {t_py * 1e3:9.2f} ms")
    print(f"  ratio loops / numpy   {t_py / t_np:9.1f} x   (largest difference {diff:.1e})")

    from liftcore import figures_flow as ff
    from liftcore import potential as pot

    res = pot.ideal_spinning_cylinder(R, V, pot.spin_rate_from_ratio(1.5, R, V), 1.225, 340.0)
    t_fig, fig = best_of(lambda: ff.streamlines_figure(res, n=N))
    t_fig_page, fig_page = best_of(lambda: ff.streamlines_figure(res))
    print(f"streamline figure {N} x {N}           {t_fig * 1e3:9.2f} ms  ({len(fig.to_json()) / 1e3:.0f} kB JSON)")
    print(f"streamline figure {ff.FLOW_GRID} x {ff.FLOW_GRID} (page)    {t_fig_page * 1e3:9.2f} ms  "
          f"({len(fig_page.to_json()) / 1e3:.0f} kB JSON)")

    from liftcore.studies import run_study

    t_flow, _ = best_of(lambda: run_study("flow", {}))
    t_field, _ = best_of(lambda: run_study("field", {}))
    t_field40, _ = best_of(lambda: run_study("field", {"loop_count": 40}))
    print(f"flow study (default inputs)           {t_flow * 1e3:9.2f} ms")
    print(f"field study, demo field, 12 loops     {t_field * 1e3:9.2f} ms")
    print(f"field study, demo field, 40 loops     {t_field40 * 1e3:9.2f} ms  "
          f"(ratio 40/12 loops {t_field40 / t_field:.2f})")

    try:
        from streamlit.testing.v1 import AppTest
    except ImportError:  # streamlit is a runtime dependency; say so rather than hide it
        print("page rerun: streamlit not importable, skipped")
        return
    from pathlib import Path

    page = str(Path(__file__).resolve().parents[1] / "views" / "flow.py")
    at = AppTest.from_file(page, default_timeout=120)
    t = time.perf_counter()
    at.run()
    t_first = time.perf_counter() - t
    at.number_input(key="w:flow:spin_ratio:SI").set_value(2.2)
    t = time.perf_counter()
    at.run()
    t_changed = time.perf_counter() - t
    t = time.perf_counter()
    at.run()
    t_same = time.perf_counter() - t
    print(f"flow page first run (AppTest)          {t_first * 1e3:9.1f} ms")
    print(f"flow page rerun, spin ratio changed    {t_changed * 1e3:9.1f} ms")
    print(f"flow page rerun, nothing changed       {t_same * 1e3:9.1f} ms  "
          f"(ratio changed / cached {t_changed / t_same:.1f})")
    if at.exception:
        print(f"  the page raised: {at.exception[0].message}")


if __name__ == "__main__":
    main()
