"""Write the published rotor coefficient sets as tables: ``python -m liftcore.data.coefficients.make_published``.

The numbers below are the published record the sets come from: a published fit (evaluated every
0.1 in spin ratio) and values read off published figures (digitised, about +-3 % of full scale).
Each set's ``.toml`` beside its ``.csv`` names the paper and says how the numbers were taken.
Sets that give lift only borrow the drag of the full-scale fit (said in their provenance).
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent

#: Tillig, F. and Ringsberg, J. W. (2020), Design, operation and analysis of wind-assisted cargo
#: ships, Ocean Engineering 211: polynomial fits to full-scale measurements, highest power first.
TILLIG_CL = (-0.0046, 0.1145, -0.9817, 3.1309, -0.1039, 0.0)
TILLIG_CD = (-0.0017, 0.0464, -0.4424, 1.7243, -1.641, 0.6375)
#: The fit is used from SR 0 to 5: beyond about SR 4 it keeps rising where CFD levels off, and
#: past its smallest slope (SR 5.36) the polynomial turns up again.
TILLIG_SR_MAX = 5.0

#: The fit's power coefficient CP = P / (0.5 rho V^3 D H) as earlier recalled from memory (the
#: paper's power fit was not found): (SR, CP).
TILLIG_CP_FROM_MEMORY = ((0, 0), (0.25, 0.0031), (0.5, 0.0075), (0.75, 0.0168), (1, 0.0343),
                         (1.25, 0.0631), (1.5, 0.1058), (1.75, 0.1651), (2, 0.243), (2.25, 0.3415),
                         (2.5, 0.4624), (2.75, 0.607), (3, 0.7767), (3.25, 0.9724), (3.5, 1.1951),
                         (3.75, 1.4453), (4, 1.7236), (4.25, 2.0303), (4.5, 2.3655), (4.75, 2.7292),
                         (5, 3.1215))

#: Prandtl, L. (1926), Application of the "Magnus effect" to the wind propulsion of ships, NACA
#: TM 367: lift of a rotor of aspect ratio 5 with end disks (digitised from the published figure).
PRANDTL_1926 = ((0.680, 0.489), (1.445, 2.387), (2.021, 4.514), (2.766, 7.239), (3.340, 8.437),
                (4.581, 8.804))
#: Bordogna, G. et al. (2019), Experiments on a Flettner rotor at critical and supercritical
#: Reynolds numbers, J. Wind Eng. Ind. Aerodyn.: lift of a floor-to-ceiling rotor at Re 3.6e5
#: (digitised from the published figure).
BORDOGNA_2019 = ((0.465, 1.40), (0.962, 2.85), (1.202, 3.52), (1.443, 4.13), (1.736, 5.06),
                 (2.038, 5.71), (2.284, 6.33), (2.526, 7.27), (2.732, 6.93), (3.193, 7.67),
                 (3.651, 8.02), (4.125, 8.60), (4.597, 9.52))
#: Gerhardt, F. C. et al. (2022), Levelling the playing field: a numerical platform for the fair
#: comparison of wind propulsion systems, HIPER 2022: full-scale CFD (digitised from the
#: published figure). (SR, CL, CD)
GERHARDT_2022 = ((1, 2.28, 0.44), (2, 5.84, 1.14), (3, 8.75, 2.75), (4, 9.62, 3.55), (5, 9.64, 3.72),
                 (6, 9.85, 3.86), (7, 10.12, 3.97), (8, 10.32, 4.27), (9, 10.34, 4.53))


def tillig(sr) -> tuple[np.ndarray, np.ndarray]:
    """(CL, CD) of the Tillig & Ringsberg (2020) fit at ``sr``."""
    sr = np.asarray(sr, dtype=float)
    return np.polyval(TILLIG_CL, sr), np.polyval(TILLIG_CD, sr)


def _write(name: str, sr, cl, cd, cp=None) -> None:
    lines = ["SR,CL,CD" + (",CP" if cp is not None else "")]
    for i in range(len(sr)):
        row = f"{sr[i]:.3f},{cl[i]:.4f},{cd[i]:.4f}"
        lines.append(row + (f",{cp[i]:.4f}" if cp is not None else ""))
    (HERE / f"{name}.csv").write_text("\n".join(lines) + "\n", encoding="utf-8")


def _lift_only(name: str, points) -> None:
    """A lift-only set: SR 0 (no spin, no lift: the cylinder is symmetric) then the digitised
    points; the drag at each of its spin ratios is the full-scale fit's."""
    sr = np.array([0.0] + [p[0] for p in points])
    cl = np.array([0.0] + [p[1] for p in points])
    _write(name, sr, cl, tillig(sr)[1])


def main() -> None:
    sr = np.round(np.arange(0.0, TILLIG_SR_MAX + 1e-9, 0.1), 10)
    cl, cd = tillig(sr)
    known = np.array(TILLIG_CP_FROM_MEMORY)
    cp = np.interp(sr, known[:, 0], known[:, 1])  # power from memory, at the fit's spin ratios
    _write("tillig_ringsberg_2020", sr, cl, cd, cp)
    _lift_only("prandtl_1926", PRANDTL_1926)
    _lift_only("bordogna_2019", BORDOGNA_2019)
    g = np.array(GERHARDT_2022, dtype=float)
    # SR 0: no lift (symmetry); the drag of the still cylinder borrowed from the full-scale fit
    _write("gerhardt_2022", np.r_[0.0, g[:, 0]], np.r_[0.0, g[:, 1]], np.r_[tillig(0.0)[1], g[:, 2]])


if __name__ == "__main__":
    main()
