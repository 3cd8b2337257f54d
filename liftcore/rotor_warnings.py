"""Validity warnings of the rotor model: where the coefficient data, the limits or the wind leave
the model's ground, in words a design review can read (counts over many conditions)."""

from __future__ import annotations

import math

import numpy as np

from liftcore import coefficients as coef
from liftcore.rotor import (ASPECT_RATIO_TOLERANCE, CALM_M_S, END_PLATE_TOLERANCE, FLAG_HEEL,
                            FLAG_HEEL_WHEN_STOPPED, FLAG_MOTOR_POWER, FLAG_RE_OUTSIDE_DATA, FLAG_RPM,
                            FLAG_SPIN_RATIO_LIMIT, FLAG_SR_OUTSIDE_DATA, FLAG_WIND_TOO_FAR_FORWARD)
from liftcore.validity import ModelWarning, quantity_warning


def _count(mask, n) -> str:
    k = int(np.count_nonzero(mask))
    return "" if n == 1 else f" (in {k:,} of {n:,} conditions)"


def rotor_warnings(setup, w, omega, res, re, flags, mode: str, n: int) -> tuple:
    """Validity warnings of one rotor result (see :func:`liftcore.rotor.best_operation`).

    Parameters
    ----------
    setup : liftcore.rotor.RotorSetup
        The rotor and its limits.
    w : liftcore.rotor._Wind
        Wind triangle and strip winds of the conditions.
    omega : numpy.ndarray
        Spin of each condition [rad/s]; 0 = stopped.
    res : dict
        The evaluator's results at ``omega`` (strip spin ratios, net gain [W]).
    re : numpy.ndarray
        Reynolds number at mid-height of each condition [-].
    flags : numpy.ndarray
        Bit flags of each condition (``FLAG_*`` in :mod:`liftcore.rotor`).
    mode : {"best", "fixed"}
        Whether the spin was searched or given.
    n : int
        Number of conditions (counts are shown when more than one).

    Returns
    -------
    tuple of ModelWarning
        One warning per class that occurs, counted over the conditions.
    """
    out: list[ModelWarning] = []
    cs = setup.coefficients
    running = omega > 0
    lo, hi = cs.sr_range
    m = (flags & FLAG_SR_OUTSIDE_DATA) != 0
    if m.any():
        sr = res["sr_strip"][m]
        out.append(ModelWarning(
            "spin_ratio_outside_data",
            f"Spin ratio along the rotor reaches {sr.min():.2f} to {sr.max():.2f}, outside the "
            f"data of the set ({lo:g} to {hi:g}): coefficients are held at the end of the data "
            f"there{_count(m, n)}.", "spin_ratio"))
    m = (flags & FLAG_RE_OUTSIDE_DATA) != 0
    if m.any():
        r_lo, r_hi = cs.reynolds_range
        out.append(ModelWarning(
            "reynolds_outside_data",
            f"Reynolds number {re[m].min():.2g} to {re[m].max():.2g} is outside the data of the "
            f"set ({r_lo:.2g} to {r_hi:.2g}): coefficients measured at another scale{_count(m, n)}.",
            "lift_coefficient"))
    if cs.two_dimensional:
        if setup.correct_aspect_ratio:
            out.append(ModelWarning(
                "two_dimensional_data",
                f"The set is two-dimensional: induced drag CL²/(π·{setup.effective_aspect_ratio:.2f}) "
                "for this rotor's effective aspect ratio is added (lifting-line estimate).",
                "drag_coefficient"))
        else:
            out.append(ModelWarning(
                "two_dimensional_data",
                "The set is two-dimensional and no induced drag is added: forces of an endless "
                "rotor, too optimistic for a real one.", "drag_coefficient"))
    else:
        ratio = setup.aspect_ratio / cs.aspect_ratio
        if not 1 / ASPECT_RATIO_TOLERANCE <= ratio <= ASPECT_RATIO_TOLERANCE:
            fix = ("its induced drag is moved to this rotor's (lift unchanged)" if setup.correct_aspect_ratio
                   else "no correction applied")
            out.append(ModelWarning(
                "aspect_ratio_unlike_data",
                f"Aspect ratio H/D = {setup.aspect_ratio:.2f} is unlike the tested rotor's "
                f"{cs.aspect_ratio:g} (more than ×{ASPECT_RATIO_TOLERANCE:g} apart): {fix}.",
                "drag_coefficient"))
    if abs(setup.end_plate_ratio - cs.end_plate_ratio) > END_PLATE_TOLERANCE:
        out.append(ModelWarning(
            "end_plates_unlike_data",
            f"End-plate ratio {setup.end_plate_ratio:g} is unlike the tested rotor's "
            f"{cs.end_plate_ratio:g}: end plates change the lift of a rotor strongly and the set's "
            "lift is used unchanged.", "lift_coefficient"))
    m = (flags & FLAG_WIND_TOO_FAR_FORWARD) != 0
    if m.any():
        lim = math.degrees(setup.forward_angle_limit_rad())
        ang = np.abs(np.degrees(w.beta_mid[m]))
        out.append(ModelWarning(
            "apparent_wind_too_far_forward",
            f"Apparent wind {ang.min():.0f}° to {ang.max():.0f}° off the bow is within {lim:.0f}° "
            f"of the bow, where no spin ratio of the set gives forward thrust (best lift/drag "
            f"{1 / math.tan(math.radians(lim)):.1f}){_count(m, n)}.", "thrust_n"))
    verb = "limited by" if mode == "best" else "above"
    m = (flags & FLAG_RPM) != 0
    if m.any():
        out.append(ModelWarning("rpm_limit", f"Spin {verb} the maximum rotor speed "
                                             f"{setup.max_rpm:g} rpm{_count(m, n)}.", "rpm"))
    m = (flags & FLAG_MOTOR_POWER) != 0
    if m.any():
        out.append(quantity_warning("motor_power_limit", f"Spin {verb} the maximum motor power "
                                    f"{{limit}} per rotor{_count(m, n)}.",
                                    {"limit": (setup.max_motor_power_w, "power")}, "spin_power_w"))
    m = (flags & FLAG_HEEL) != 0
    if m.any():
        what = "Spin limited by" if mode == "best" else "Heeling moment above"
        out.append(quantity_warning("heel_limit", f"{what} the heeling-moment limit "
                                    f"{{limit}}{_count(m, n)}" + ("." if mode == "best" else ": reduce spin."),
                                    {"limit": (setup.max_heeling_moment_nm, "moment")}, "heeling_moment_nm"))
    m = (flags & FLAG_HEEL_WHEN_STOPPED) != 0
    if m.any():
        out.append(quantity_warning("heel_above_limit_when_stopped",
                                    f"Even the stopped rotors heel the ship more than the limit "
                                    f"{{limit}}{_count(m, n)}.",
                                    {"limit": (setup.max_heeling_moment_nm, "moment")}, "heeling_moment_nm"))
    m = (flags & FLAG_SPIN_RATIO_LIMIT) != 0
    if m.any():
        out.append(ModelWarning("spin_ratio_limit",
                                f"Spin stopped at the highest spin ratio allowed, "
                                f"{setup.spin_ratio_limit():g} (input or top of the data){_count(m, n)}.",
                                "spin_ratio"))
    if mode == "best":
        m = ~running & (w.va_mid > CALM_M_S)
        if m.any():
            costs = m & (res["net"] < 0)
            cost_text = (" In this wind the still rotors cost up to {loss} of engine power (their drag)."
                         if costs.any() else "")
            out.append(quantity_warning(
                "rotor_stopped",
                "Rotors stopped: no spin gains more than {threshold}, the smallest worthwhile gain; the "
                f"still cylinders' drag is counted{_count(m, n)}." + cost_text,
                {"threshold": (setup.min_gain_w, "power"),
                 "loss": (-float(res["net"][costs].min()) if costs.any() else 0.0, "power")},
                "net_power_w"))
    if not cs.has_power:
        out.append(ModelWarning("spin_power_from_friction_model",
                                "The set has no power coefficient: spin power from a skin-friction "
                                "model (ITTC 1957 line on the surface speed plus a disc end plate; "
                                "a lower estimate that ignores the cross-flow).", "spin_power_w"))
    elif setup.spin_power_model == "friction":
        out.append(ModelWarning("spin_power_from_friction_model",
                                "Spin power from the skin-friction model, as chosen (the set's own "
                                "power coefficient is shown beside it).", "spin_power_w"))
    if cs.drag_from:
        lender = coef.coefficient_set(cs.drag_from)
        out.append(ModelWarning("drag_borrowed",
                                f"The set gives lift only: its drag is borrowed from {lender.label}.",
                                "drag_coefficient"))
    if setup.rotor_count > 1:
        out.append(ModelWarning("rotor_interaction_assumed",
                                f"{setup.rotor_count} rotors with interaction factor "
                                f"{setup.interaction_factor:g} (assumed, not computed): forces are "
                                f"{setup.force_factor:g} times one rotor's.", "thrust_n"))
        offset = setup.rotor_spacing_m * np.abs(np.sin(w.beta_mid))
        m = (offset < setup.diameter_m) & (w.va_mid > CALM_M_S)
        if m.any():
            out.append(quantity_warning("rotors_in_each_others_wake",
                                        "With the apparent wind this close to the ship's axis the rotors "
                                        "stand in each other's wake (offset across the wind "
                                        "{offset} < diameter {diameter}): "
                                        f"the interaction factor matters here{_count(m, n)}.",
                                        {"offset": (offset[m].min(), "length", 2),
                                         "diameter": (setup.diameter_m, "length")}, "thrust_n"))
    if (w.ship <= 0).any():
        m = w.ship <= 0
        out.append(ModelWarning("zero_ship_speed", "At zero ship speed thrust saves no engine power: "
                                                   f"the net gain is only the spin power drawn{_count(m, n)}.",
                                "net_power_w"))
    m = w.va_mid <= CALM_M_S
    if m.any():
        out.append(ModelWarning("calm", f"No apparent wind: no forces{_count(m, n)}.", "thrust_n"))
    if setup.hull is not None:
        out.extend(_hull_warnings(setup, w, res, n))
    turning = m & (np.asarray(omega) > 0)
    if turning.any():
        # spin ratio omega R / V has no value at V = 0 (null in JSON, "inf" in text)
        what = ("the set's spin power CP·½ρAV³ is zero there; the skin-friction model's estimate, shown "
                "beside it, is what the motor still draws" if setup.power_from_set else
                "the spin power is the skin-friction model's")
        out.append(ModelWarning("spin_in_still_air",
                                f"The rotor turns in still air{_count(turning, n)}: the spin ratio has "
                                f"no value (no wind to divide by) and {what}.", "spin_ratio"))
    return tuple(out)


def _hull_warnings(setup, w, res, n) -> list:
    """Where the hull's linear balance or the small-angle heel leave their range."""
    from liftcore import hull as hm

    out = []
    b = res["hull"]  # the operating point's balance (computed once in rotor._finish)
    for key, limit, code, what, theory, consequence in (
            ("leeway_deg", hm.LEEWAY_LINEAR_DEG, "leeway_beyond_linear", "Leeway", "linear hull theory",
             "the lost power is underestimated there"),
            ("rudder_angle_deg", hm.RUDDER_LINEAR_DEG, "rudder_beyond_linear", "Rudder angle",
             "linear rudder lift", "little rudder is left for steering")):
        m = np.abs(b[key]) > limit
        if m.any():
            out.append(ModelWarning(code, f"{what} up to {np.abs(b[key][m]).max():.1f}° exceeds {limit:g}° "
                                          f"(common practice limit of {theory}){_count(m, n)}: {consequence}.",
                                    "balance_power_w"))
    slow = (w.ship < hm.MIN_SPEED_M_S) & (np.abs(res["side"]) > 0)
    if slow.any():
        out.append(ModelWarning("no_balance_at_rest", f"Below {hm.MIN_SPEED_M_S:g} m/s the ship makes no way: "
                                f"no leeway or rudder balance is counted{_count(slow, n)}.", "balance_power_w"))
    heel = setup.hull.heel_angle_deg(res["heel"])
    if heel is not None:
        big = ~np.isfinite(heel) | (np.abs(heel) > hm.HEEL_SMALL_ANGLE_DEG)
        if big.any():
            out.append(ModelWarning("heel_beyond_small_angle",
                                    f"Heel beyond {hm.HEEL_SMALL_ANGLE_DEG:g}° from the rotors' steady "
                                    f"moment{_count(big, n)}: small-angle statics no longer holds; use the "
                                    "ship's GZ curve and stability booklet.", "heeling_moment_nm", "invalid"))
        out.append(ModelWarning("heel_caution",
                                "Heel angle from small-angle statics in a steady wind (GZ = GM sin φ): gusts, "
                                "free surface and the stability booklet govern; defer to the naval "
                                "architect and the classification society.", "heeling_moment_nm"))
    return out
