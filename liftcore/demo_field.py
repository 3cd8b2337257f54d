"""The invented demo velocity field shipped in ``liftcore/data/demo_field_invented.csv``.

It is not a measurement: ideal flow past a spinning cylinder (:mod:`liftcore.potential`) with a
made-up wake and random noise (:func:`liftcore.fieldcirc.synthetic_cylinder_field`), so that the
"Circulation from a measured field" page has something to open on. Regenerate it with
``python -m liftcore.demo_field``.
"""

from __future__ import annotations

import sys
from pathlib import Path

import numpy as np

from liftcore.fieldcirc import DEMO_FIELD_PATH, field_to_table, synthetic_cylinder_field

#: The invented parameters of the demo field (SI).
DEMO = {
    "speed_m_s": 10.0,            # free stream along +x
    "radius_m": 0.05,             # a 100 mm cylinder centred at (0, 0)
    "circulation_m2_s": 2.5,      # clockwise: lift toward +y
    "half_size_m": 0.3,           # grid from -0.3 to 0.3 m in x and y
    "points_per_axis": 121,       # 5 mm spacing
    "wake_deficit": 0.35,         # made-up wake: 35 % velocity loss at its start
    "wake_offset_m": -0.01,       # wake centre line 10 mm below the axis (deflected down)
    "noise_m_s": 0.15,            # 1.5 % of the free stream, Gaussian
    "seed": 20240611,
}

HEADER = (
    "# INVENTED demo velocity field (not a measurement): ideal flow past a spinning cylinder "
    "(radius 0.05 m at (0, 0), free stream 10 m/s along +x, circulation 2.5 m2/s clockwise) plus a "
    "made-up wake and 0.15 m/s random noise; made by python -m liftcore.demo_field\n"
    "# columns: x, y [m]; u, v [m/s]; points inside the body are 0\n"
)


def demo_field():
    """The demo field as a :class:`~liftcore.fieldcirc.VelocityField` (before rounding to the file)."""
    d = DEMO
    axis = np.linspace(-d["half_size_m"], d["half_size_m"], d["points_per_axis"])
    return synthetic_cylinder_field(axis, axis, d["speed_m_s"], d["radius_m"], d["circulation_m2_s"],
                                    wake_deficit=d["wake_deficit"], wake_offset_m=d["wake_offset_m"],
                                    noise_m_s=d["noise_m_s"], seed=d["seed"])


def demo_field_without_noise():
    """The same field without the noise (tests compare the shipped file with it)."""
    d = DEMO
    axis = np.linspace(-d["half_size_m"], d["half_size_m"], d["points_per_axis"])
    return synthetic_cylinder_field(axis, axis, d["speed_m_s"], d["radius_m"], d["circulation_m2_s"],
                                    wake_deficit=d["wake_deficit"], wake_offset_m=d["wake_offset_m"])


def write_demo_field(path: Path = DEMO_FIELD_PATH) -> Path:
    """Write the demo field CSV (x, y to 0.1 mm; u, v to 0.1 mm/s)."""
    table = field_to_table(demo_field())
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    with open(path, "w", encoding="utf-8", newline="\n") as fh:
        fh.write(HEADER)
        table.to_csv(fh, index=False, float_format="%.4f", lineterminator="\n")
    return path


def main(argv=None) -> int:
    path = write_demo_field(Path(argv[0]) if argv else DEMO_FIELD_PATH)
    print(f"wrote {path} ({path.stat().st_size} bytes)")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
