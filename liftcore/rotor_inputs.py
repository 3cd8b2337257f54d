"""The inputs of a rotor in the rotor and voyage studies, and the :class:`~liftcore.rotor.RotorSetup`
they make (core units; the air state comes from :func:`liftcore.air.air_inputs`)."""

from __future__ import annotations

import math

from liftcore import coefficients as coef
from liftcore import wind
from liftcore.inputs import Field, choice, flag, integer, number, text
from liftcore.rotor import SPIN_POWER_MODELS, RotorSetup

#: Rotor, ship, wind-profile, coefficient-set, limit and efficiency inputs (core units); reused by
#: the voyage study. Air-state inputs come from :func:`liftcore.air.air_inputs`.
ROTOR_FIELDS: tuple[Field, ...] = (
    number("diameter_m", "Rotor diameter", "length", 5.0, 0.2, 15.0, section="Rotor",
           help="Outer diameter D of the spinning cylinder."),
    number("height_m", "Rotor height", "length", 30.0, 1.0, 80.0, section="Rotor",
           help="Height H of the spinning cylinder (span); its aspect ratio is H/D."),
    number("base_height_m", "Rotor base above the waterline", "length", 10.0, 0.0, 60.0,
           section="Rotor", help="Height of the bottom of the cylinder above the waterline "
                                 "(deck height plus foundation)."),
    number("end_plate_ratio", "End-plate diameter / rotor diameter", "ratio", 1.6, 1.0, 4.0,
           section="Rotor", step=0.1, help="Top end plate diameter divided by the rotor "
                                           "diameter; 1 means no end plate."),
    integer("rotor_count", "Number of rotors", 2, 1, 8, section="Rotor",
            help="Identical rotors on the centreline, all at the same spin."),
    number("first_rotor_x_m", "Foremost rotor, forward of midships", "length", 60.0, -200.0, 200.0,
           section="Rotor", help="Distance of the foremost rotor ahead of midships (negative: "
                                 "aft). Sets the yaw moment and which rotor is downwind."),
    number("rotor_spacing_m", "Spacing between rotors", "length", 40.0, 0.0, 200.0,
           section="Rotor", help="Fore-and-aft distance between neighbouring rotors (at least "
                                 "one diameter when there is more than one rotor)."),
    number("interaction_factor", "Interaction factor (assumed)", "ratio", 1.0, 0.3, 1.0,
           section="Rotor", step=0.05, help="Forces of all rotors are multiplied by this when "
                                            "there is more than one: 1 = rotors do not disturb "
                                            "each other. An assumption, not computed."),
    choice("wind_profile", "Wind profile over the sea", wind.PROFILES, default="log",
           labels=wind.PROFILE_LABELS, section="Wind profile",
           help="How the true wind grows with height. The ship speed does not, so the apparent "
                "wind changes along the rotor."),
    number("reference_height_m", "Height of the given true wind", "length",
           wind.STANDARD_WIND_HEIGHT_M, 1.0, 100.0, section="Wind profile",
           help="Height at which the true wind speed is given (10 m is the standard height of "
                "wind observations, WMO-No. 8)."),
    number("power_law_exponent", "Power-law exponent", "ratio", wind.POWER_LAW_EXPONENT_SEA,
           0.04, 0.3, section="Wind profile", step=0.01,
           help="About 0.10 to 0.14 over open sea (common practice)."),
    number("charnock_constant", "Charnock constant", "ratio", wind.CHARNOCK_SMITH_1988, 0.005,
           0.04, section="Wind profile", step=0.001,
           help="Sea roughness z0 = a u*²/g: 0.011 (Smith 1988; Fairall et al. 2003 below 10 m/s) "
                "to 0.018 (Fairall et al. 2003 at 18 m/s)."),
    choice("coefficient_set", "Coefficient set", coef.builtin_names() + ("user",),
           default=coef.DEFAULT_SET,
           labels=tuple(s.label for s in coef.builtin_sets().values()) + ("Your own table (CSV)",),
           section="Coefficient set",
           help="Lift, drag and power coefficients against spin ratio; every set's source is "
                "listed on the page."),
    text("user_coefficients_csv", "Your coefficient table (CSV text)", "", section="Coefficient set", lines=7,
         help="Columns SR, CL, CD and optionally CP; at least 3 rows with SR increasing."),
    number("user_aspect_ratio", "Aspect ratio of your tested rotor (0 = two-dimensional)", "ratio",
           0.0, 0.0, 50.0, section="Coefficient set",
           help="H/D of the rotor your table was measured on; 0 for two-dimensional data."),
    number("user_end_plate_ratio", "End-plate ratio of your tested rotor", "ratio", 1.0, 1.0, 4.0,
           section="Coefficient set", step=0.1, help="End-plate diameter / rotor diameter; 1 = none."),
    choice("spin_power_model", "Spin power from", SPIN_POWER_MODELS, default="set",
           labels=("The set's power coefficient, where it has one", "The skin-friction model"),
           section="Coefficient set",
           help="Which spin power drives the net gain (both are shown). Sets without a power "
                "coefficient always use the skin-friction model."),
    flag("correct_aspect_ratio", "Correct induced drag to this rotor's aspect ratio", True,
         section="Coefficient set",
         help="CD + CL²/(π e)(1/AR_eff,rotor - 1/AR_eff,set) with e = 1 and Hoerner's end-plate "
              "rule for AR_eff; lift is kept."),
    number("max_rpm", "Maximum rotor speed", "rotation", 180.0, 1.0, 1000.0, section="Limits",
           help="The rotor never spins faster than this."),
    number("max_motor_power_w", "Maximum motor power per rotor", "power", 150_000.0, 1000.0, 5.0e6,
           section="Limits", help="Shaft power the drive of one rotor can deliver."),
    number("max_heeling_moment_nm", "Maximum heeling moment (all rotors)", "moment", 6.0e6, 1000.0,
           1.0e9, section="Limits",
           help="Set by the ship's stability assessment; spin is reduced to stay below it."),
    number("max_spin_ratio", "Highest spin ratio to use", "ratio", 5.0, 0.1, 12.0, section="Limits",
           step=0.1, help="The best-spin search stays at or below this and the top of the "
                          "coefficient data."),
    number("min_worthwhile_gain_w", "Smallest worthwhile gain (all rotors)", "power", 0.0, 0.0,
           5.0e6, section="Limits",
           help="Where no spin gains more than this, the rotors are stopped (their drag as still "
                "cylinders is still counted): no rotor is ever run at a net loss."),
    number("propulsive_efficiency", "Propulsive efficiency", "ratio", 0.70, 0.3, 1.0,
           section="Efficiencies", step=0.01,
           help="Thrust power / engine shaft power; about 0.6 to 0.75 for merchant ships "
                "(common practice)."),
    number("electrical_efficiency", "Electrical efficiency of the rotor drive", "ratio", 0.90, 0.5,
           1.0, section="Efficiencies", step=0.01,
           help="Rotor shaft power / electric power drawn from the ship's plant; about 0.85 to "
                "0.95 for motor plus converter (common practice)."),
    flag("hull_balance", "Count the hull's answer to the side force", True, section="Hull",
         help="The hull holds the rotors' side force by sailing with leeway and the rudder holds "
              "the yaw moment; the resistance they add is taken off the net gain and the best spin "
              "allows for it (linear theory: Clarke et al. 1983, Fujii & Tsuda 1961)."),
    number("hull_length_m", "Length between perpendiculars", "length", 180.0, 20.0, 500.0, section="Hull",
           help="L of the ship (the demo ship is invented)."),
    number("hull_beam_m", "Beam", "length", 30.0, 3.0, 80.0, section="Hull"),
    number("hull_draught_m", "Draught", "length", 11.0, 1.0, 30.0, section="Hull",
           help="Mean draught of the loading condition."),
    number("block_coefficient", "Block coefficient", "ratio", 0.80, 0.35, 0.9, section="Hull", step=0.01,
           help="Displaced volume / (L B T)."),
    number("rudder_area_m2", "Rudder area", "area", 45.0, 0.5, 300.0, section="Hull", step=1.0,
           help="Lateral area of the movable rudder (often 1.5 to 2 % of L T, common practice)."),
    number("rudder_x_m", "Rudder position, forward of midships", "length", -88.0, -350.0, 0.0,
           section="Hull", help="Negative: aft of midships; about -L/2 (between -0.7 L and -0.3 L)."),
    number("rudder_aspect_ratio", "Rudder aspect ratio", "ratio", 1.6, 0.5, 4.0, section="Hull", step=0.1,
           advanced=True, help="Span² / area; up to twice the geometric value when the rudder meets "
                               "the hull (common practice)."),
    number("displacement_kg", "Displacement (0 = from C_b L B T)", "fuel_mass", 0.0, 0.0, 1.0e9,
           section="Hull", step=1.0e6, help="For the heel angle; 0 takes C_b L B T × 1025 kg/m³."),
    number("metacentric_height_m", "Metacentric height GM (0 = no heel angle)", "length", 2.5, 0.0, 20.0,
           section="Hull", step=0.1,
           help="Fluid GM of the loading condition, from the stability booklet. The heel angle is "
                "small-angle statics in a steady wind: gusts, free surface and the booklet govern."),
    number("heel_reference_depth_m", "Heel taken about a point below the waterline", "length",
           0.0, 0.0, 30.0, section="Model details", advanced=True,
           help="Depth below the waterline of the point the heeling moment is taken about: 0 = "
                "the waterline; about half the draught approximates the centre of lateral "
                "resistance (common practice)."),
    integer("strips", "Strips along the rotor height", 10, 1, 200, section="Model details",
            advanced=True, help="The rotor is cut into this many strips of equal height, each "
                                "with its own apparent wind and spin ratio (midpoint rule)."),
)

#: Which of :data:`ROTOR_FIELDS` matter for given values (``InputSpec.with_rules``).
ROTOR_SHOW_IF = {
    "power_law_exponent": lambda v: v["wind_profile"] == "power",
    "charnock_constant": lambda v: v["wind_profile"] == "log",
    "rotor_spacing_m": lambda v: v["rotor_count"] > 1,
    "interaction_factor": lambda v: v["rotor_count"] > 1,
    "user_coefficients_csv": lambda v: v["coefficient_set"] == "user",
    "user_aspect_ratio": lambda v: v["coefficient_set"] == "user",
    "user_end_plate_ratio": lambda v: v["coefficient_set"] == "user",
    **{k: (lambda v: v["hull_balance"]) for k in ("hull_length_m", "hull_beam_m", "hull_draught_m",
                                                   "block_coefficient", "rudder_area_m2", "rudder_x_m",
                                                   "rudder_aspect_ratio", "displacement_kg",
                                                   "metacentric_height_m")},
}


def hull_from_inputs(values: dict):
    """The hull the inputs describe.

    Parameters
    ----------
    values : dict
        Validated rotor or voyage inputs (``hull_balance``, ``hull_length_m`` [m], ``hull_beam_m``
        [m], ``hull_draught_m`` [m], ``block_coefficient`` [-], ``rudder_area_m2`` [m^2],
        ``rudder_x_m`` [m], ``rudder_aspect_ratio`` [-], ``displacement_kg`` [kg, 0: from the
        form], ``metacentric_height_m`` [m, 0: no heel angle]).

    Returns
    -------
    liftcore.hull.Hull or None
        None when the balance is off.

    Notes
    -----
    Displacement from the form: C_b L B T rho_sea (rho_sea = 1025 kg/m^3).
    """
    from liftcore.hull import Hull

    if not values.get("hull_balance", False):
        return None
    hull = Hull(length_m=float(values["hull_length_m"]), beam_m=float(values["hull_beam_m"]),
                draught_m=float(values["hull_draught_m"]), block_coefficient=float(values["block_coefficient"]),
                rudder_area_m2=float(values["rudder_area_m2"]), rudder_x_m=float(values["rudder_x_m"]),
                rudder_aspect_ratio=float(values["rudder_aspect_ratio"]))
    gm = float(values["metacentric_height_m"]) or None
    disp = float(values["displacement_kg"]) or hull.displacement_from_form_kg
    from dataclasses import replace

    return replace(hull, displacement_kg=disp, metacentric_height_m=gm)


def coefficient_set_from_inputs(values: dict, coefficient_table=None) -> coef.CoefficientSet:
    """The coefficient set the inputs name; ``user`` reads ``coefficient_table`` (a DataFrame or
    CSV text) or else the ``user_coefficients_csv`` input."""
    name = values.get("coefficient_set", coef.DEFAULT_SET)
    if name != "user":
        return coef.coefficient_set(name)
    ar = values.get("user_aspect_ratio", 0.0)
    data = coefficient_table if coefficient_table is not None else values.get("user_coefficients_csv", "")
    return coef.user_coefficient_set(data, source="your coefficient table",
                                     aspect_ratio=math.inf if not ar else ar,
                                     end_plate_ratio=values.get("user_end_plate_ratio", 1.0),
                                     label="Your own table")


def check_inputs(values: dict) -> None:
    """Refuse inputs whose own coefficient table (``user_coefficients_csv``, when the set chosen is
    ``user``) cannot be read, so a scenario file is refused before it replaces what is on a page.

    A table given apart from the inputs (an upload, not kept in scenario files) is checked when
    the study runs.

    Raises
    ------
    InputError
        The table's own message (row, column, value, range).
    """
    if values.get("coefficient_set") == "user" and str(values.get("user_coefficients_csv", "")).strip():
        coefficient_set_from_inputs(values)


def setup_from_inputs(values: dict, coefficient_table=None) -> RotorSetup:
    """A :class:`RotorSetup` from validated rotor-study input values (core units).

    Missing keys take the defaults of :data:`ROTOR_FIELDS`; the air state comes from the air
    inputs (:func:`liftcore.air.air_inputs`) when present, else the ISA at sea level.
    """
    from liftcore.air import air_state_from_inputs

    v = {f.key: f.default for f in ROTOR_FIELDS}
    v.update(values)
    air = air_state_from_inputs(v)
    profile = v["wind_profile"]
    param = {"power": v["power_law_exponent"], "log": v["charnock_constant"]}.get(profile, 0.0)
    return RotorSetup(
        diameter_m=float(v["diameter_m"]), height_m=float(v["height_m"]),
        base_height_m=float(v["base_height_m"]), end_plate_ratio=float(v["end_plate_ratio"]),
        rotor_count=int(v["rotor_count"]), interaction_factor=float(v["interaction_factor"]),
        coefficients=coefficient_set_from_inputs(v, coefficient_table),
        wind_profile=profile, reference_height_m=float(v["reference_height_m"]),
        profile_parameter=float(param), air_density_kg_m3=air.density_kg_m3,
        kinematic_viscosity_m2_s=air.kinematic_viscosity_m2_s, max_rpm=float(v["max_rpm"]),
        max_motor_power_w=float(v["max_motor_power_w"]),
        max_heeling_moment_nm=float(v["max_heeling_moment_nm"]),
        propulsive_efficiency=float(v["propulsive_efficiency"]),
        electrical_efficiency=float(v["electrical_efficiency"]), strips=int(v["strips"]),
        max_spin_ratio=float(v["max_spin_ratio"]), correct_aspect_ratio=bool(v["correct_aspect_ratio"]),
        first_rotor_x_m=float(v["first_rotor_x_m"]), rotor_spacing_m=float(v["rotor_spacing_m"]),
        heel_reference_depth_m=float(v["heel_reference_depth_m"]),
        min_gain_w=float(v["min_worthwhile_gain_w"]), spin_power_model=v["spin_power_model"],
        hull=hull_from_inputs(v))


