"""How the hull answers the rotors' side force: leeway, rudder angle, the resistance they add, heel.

On a straight course the side force Y_s of the rotors and its yaw moment N_s about midships are
held by the hull sailing with a small sway velocity v (leeway) and by the rudder. Linear theory
(small angles, steady, no yaw rate)::

    Y_v v + Y_R = -Y_s                  (sway)
    N_v v + x_e Y_R = -N_s              (yaw about midships)

Y_v = Y'_v 1/2 rho L^2 U and N_v = N'_v 1/2 rho L^3 U from the regressions of Clarke, Gedling
& Hine (1983) on main dimensions; Y_R the rudder's side force with the hull's share a_H, acting
at x_e = (x_R + a_H x_H) / (1 + a_H). The rudder's inflow angle is Y_R / K with
K = 1/2 rho A_R U^2 f_a (1 + a_H), f_a = 6.13 L / (L + 2.25) (Fujii & Tsuda 1961) and the
rudder angle removes the drift the hull brings to the rudder: delta = alpha + gamma_R beta.

Added resistance: the hull's side force is taken normal to its centreline (no leading-edge
suction), so its resistance is Y_H sin(beta) (between the ideal slender wing, half of it, and
measured full hulls, about 1.1 times it); the rudder's is (1 - t_R) F_N sin(delta). Both grow
with the square of the side force and fall with the square of the speed, so the whole balance is
one coefficient per hull and speed: R = C Y_s^2 / U^2 (vectorised over every condition).

Heel: phi = asin(M / (Delta g GM)), small-angle statics (GZ = GM sin phi).

Provenance: the Clarke regressions, Fujii's slope and the interaction constants (a_H, x_H,
gamma_R, t_R, rudder inflow at ship speed) are **from memory** of the papers or common practice
(values in the constants below); the small-angle heel relation is read in Derrett & Barrass and
Tupper. The model is a first estimate for early design: leeway beyond ~10 deg and rudder angles
beyond ~15 deg leave the linear range (common practice); heel in gusts, free surface and the
stability booklet govern the ship.

References
----------
.. [1] Clarke, D., Gedling, P. and Hine, G. (1983). The application of manoeuvring criteria in
   hull design using linear theory. Trans. RINA 125, 45-68.
.. [2] Fujii, H. and Tsuda, T. (1961). Experimental researches on rudder performance (2).
   J. Zosen Kiokai 110, 31-42.
.. [3] Yasukawa, H. and Yoshimura, Y. (2015). Introduction of MMG standard method for ship
   maneuvering predictions. J. Mar. Sci. Technol. 20, 37-52 (rudder-hull interaction terms).
.. [4] Derrett, D. R., rev. Barrass, C. B. Ship Stability for Masters and Mates, ch. 6
   (GZ = GM sin(theta) at small heel).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from liftcore.constants import G0
from liftcore.errors import check_number

#: Sea water density. [kg m^-3]
SEA_WATER_DENSITY_KG_M3 = 1025.0
#: Rudder-hull interaction: hull side force induced by the rudder as a share of its normal force,
#: its point of action (x / L), the flow straightening of the drift at the rudder, and the
#: steering resistance deduction (common practice; MMG-type values from memory).
A_H = 0.3
X_H_OVER_L = -0.45
GAMMA_R = 0.5
T_R = 0.3
#: Thresholds of the linear model (common practice). [deg]
LEEWAY_LINEAR_DEG = 10.0
RUDDER_LINEAR_DEG = 15.0
#: Heel beyond which small-angle statics is not to be relied on (Wilson 2018: 5-7 deg). [deg]
HEEL_SMALL_ANGLE_DEG = 7.0
#: Speeds below which no balance is solved (the ship is not making way). [m s^-1]
MIN_SPEED_M_S = 0.25


def clarke_derivatives(length_m: float, beam_m: float, draught_m: float, block_coefficient: float) -> dict:
    """Non-dimensional linear sway and yaw derivatives of a hull from its main dimensions.

    Parameters
    ----------
    length_m, beam_m, draught_m : float
        Length between perpendiculars L, beam B and draught T. [m]
    block_coefficient : float
        C_b. [-]

    Returns
    -------
    dict
        ``Yv``, ``Nv``, ``Yr``, ``Nr`` (prime system: Y_v / (1/2 rho L^2 U), N_v / (1/2 rho L^3 U),
        Y_r / (1/2 rho L^3 U), N_r / (1/2 rho L^4 U)). [-]

    Notes
    -----
    With k = pi (T/L)^2::

        Y'_v = -k (1 + 0.40 C_b B/T)           N'_v = -k (1/2 + 2.4 T/L)
        Y'_r = -k (-1/2 + 2.2 B/L - 0.080 B/T)  N'_r = -k (1/4 + 0.039 B/T - 0.56 B/L)

    References
    ----------
    .. [1] Clarke, Gedling & Hine (1983), Trans. RINA 125 (coefficients from memory).
    """
    L, B, T, cb = float(length_m), float(beam_m), float(draught_m), float(block_coefficient)
    k = math.pi * (T / L) ** 2
    return {"Yv": -k * (1.0 + 0.40 * cb * B / T), "Nv": -k * (0.5 + 2.4 * T / L),
            "Yr": -k * (-0.5 + 2.2 * B / L - 0.080 * B / T), "Nr": -k * (0.25 + 0.039 * B / T - 0.56 * B / L)}


def fujii_normal_force_slope(aspect_ratio: float) -> float:
    """Slope of a rudder's normal-force coefficient, f_a = 6.13 L / (L + 2.25), per radian.

    Parameters
    ----------
    aspect_ratio : float
        Rudder aspect ratio L = span^2 / area. [-]

    Returns
    -------
    float
        [rad^-1]

    References
    ----------
    .. [1] Fujii & Tsuda (1961), J. Zosen Kiokai 110 (from memory).
    """
    return 6.13 * aspect_ratio / (aspect_ratio + 2.25)


@dataclass(frozen=True)
class Hull:
    """Main dimensions, rudder and stability of the ship that carries the rotors.

    ``rudder_x_m`` is the rudder's position ahead of midships (negative: aft). ``displacement_kg``
    and ``metacentric_height_m`` are for the heel angle (``None``: no heel angle).
    """

    length_m: float
    beam_m: float
    draught_m: float
    block_coefficient: float
    rudder_area_m2: float
    rudder_x_m: float
    rudder_aspect_ratio: float = 1.6
    displacement_kg: float | None = None
    metacentric_height_m: float | None = None

    def __post_init__(self):
        check_number("hull length", self.length_m, "m", low=20.0, high=500.0)
        check_number("hull beam", self.beam_m, "m", low=3.0, high=80.0)
        check_number("hull draught", self.draught_m, "m", low=1.0, high=30.0)
        check_number("block coefficient", self.block_coefficient, "", low=0.35, high=0.9)
        check_number("rudder area", self.rudder_area_m2, "m2", low=0.5, high=300.0)
        check_number("rudder position", self.rudder_x_m, "m", low=-0.7 * self.length_m, high=-0.3 * self.length_m)
        check_number("rudder aspect ratio", self.rudder_aspect_ratio, "", low=0.5, high=4.0)

    def _balance_terms(self, yaw_lever_m: float):
        """Per unit side force and unit speed: v U / Y_s, Y_H / Y_s, Y_R / Y_s and (alpha U^2)/Y_s."""
        d = clarke_derivatives(self.length_m, self.beam_m, self.draught_m, self.block_coefficient)
        L, q = self.length_m, 0.5 * SEA_WATER_DENSITY_KG_M3
        yv, nv = d["Yv"] * q * L ** 2, d["Nv"] * q * L ** 3          # x U: N s/m, N s
        x_e = (self.rudder_x_m + A_H * X_H_OVER_L * L) / (1.0 + A_H)
        det = yv * x_e - nv
        vu = (yaw_lever_m - x_e) / det                                 # v U / Y_s
        y_hull = yv * vu                                               # Y_H / Y_s
        y_rudder = -1.0 - y_hull                                       # Y_R / Y_s
        k = q * self.rudder_area_m2 * fujii_normal_force_slope(self.rudder_aspect_ratio) * (1.0 + A_H)
        return vu, y_hull, y_rudder, y_rudder / k, k

    def balance(self, side_force_n, yaw_lever_m: float, ship_speed_m_s) -> dict:
        """Leeway, rudder angle and the resistance they add, for every condition at once.

        Parameters
        ----------
        side_force_n : float or ndarray
            Side force of all rotors, + to starboard. [N]
        yaw_lever_m : float
            Where it acts ahead of midships (the yaw moment is side force x lever). [m]
        ship_speed_m_s : float or ndarray
            Speed through the water. [m s^-1]

        Returns
        -------
        dict of ndarray
            ``leeway_deg`` (+: the ship slides to starboard), ``rudder_angle_deg`` (+: the rudder's
            own side force to starboard), ``resistance_n`` (added by leeway and rudder, >= 0),
            ``hull_resistance_n``, ``rudder_resistance_n``. Zero where the ship makes no way.

        Notes
        -----
        See the module notes: beta = v / U, delta = alpha + gamma_R beta, R = Y_H beta +
        (1 - t_R) F_N delta, F_N = Y_R / (1 + a_H) (angles small: linear theory throughout, so
        R = :meth:`resistance_coefficient` Y_s^2 / U^2 exactly).

        References
        ----------
        .. [1] Clarke, Gedling & Hine (1983); Fujii & Tsuda (1961); Yasukawa & Yoshimura (2015).
        """
        ys = np.asarray(side_force_n, dtype=float)
        u = np.asarray(ship_speed_m_s, dtype=float)
        moving = u >= MIN_SPEED_M_S
        uu = np.where(moving, u, 1.0)
        vu, y_hull, y_rudder, alpha_u2, _ = self._balance_terms(yaw_lever_m)
        beta = np.where(moving, ys * vu / uu ** 2, 0.0)                # small angles: tan x ~ x
        delta = np.where(moving, ys * alpha_u2 / uu ** 2, 0.0) + GAMMA_R * beta
        hull_r = np.abs(ys * y_hull * beta)                            # sin x ~ x
        rudder_r = (1.0 - T_R) * np.abs(ys * y_rudder / (1.0 + A_H) * delta)
        return {"leeway_deg": np.degrees(beta), "rudder_angle_deg": np.degrees(delta),
                "hull_resistance_n": hull_r, "rudder_resistance_n": rudder_r,
                "resistance_n": hull_r + rudder_r}

    def resistance_coefficient(self, yaw_lever_m: float) -> float:
        """C of the added resistance R = C Y_s^2 / U^2 of :meth:`balance`. [s^2 m^-2 N^-1]"""
        vu, y_hull, y_rudder, alpha_u2, _ = self._balance_terms(yaw_lever_m)
        delta_u2 = alpha_u2 + GAMMA_R * vu
        return float(abs(y_hull * vu) + (1.0 - T_R) * abs(y_rudder / (1.0 + A_H) * delta_u2))

    def heel_angle_deg(self, heeling_moment_nm):
        """Steady heel angle from a heeling moment, or None without displacement and GM.

        Parameters
        ----------
        heeling_moment_nm : float or ndarray
            [N m]

        Returns
        -------
        ndarray or None
            phi = asin(M / (Delta g GM)) [deg]; NaN where the moment exceeds Delta g GM.

        References
        ----------
        .. [1] Derrett & Barrass, Ship Stability for Masters and Mates, ch. 6.
        """
        if not self.displacement_kg or not self.metacentric_height_m:
            return None
        x = np.asarray(heeling_moment_nm, dtype=float) / (self.displacement_kg * G0 * self.metacentric_height_m)
        with np.errstate(invalid="ignore"):
            return np.degrees(np.where(np.abs(x) <= 1.0, np.arcsin(np.clip(x, -1.0, 1.0)), np.nan))

    @property
    def displacement_from_form_kg(self) -> float:
        """C_b L B T rho_sea: the displacement the main dimensions imply. [kg]"""
        return (self.block_coefficient * self.length_m * self.beam_m * self.draught_m
                * SEA_WATER_DENSITY_KG_M3)
