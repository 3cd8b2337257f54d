"""Fitting curves, not only constants, to tracked flights; the fit saved as a table flies again."""

import numpy as np
import pytest
from numpy.testing import assert_allclose

from liftcore import ballflight as bf
from liftcore import balls
from liftcore.studies import run_study


def test_the_curves_are_linear_at_small_spin_and_level_off():
    cd, cl = bf.curve_coefficients(np.array([0.0, 1e-4, 10.0]), 0.3, 0.1, 2.0, 0.25)
    assert_allclose(cd, [0.3, 0.30001, 1.3])
    assert cl[0] == 0.0 and cl[1] == pytest.approx(2.0e-4, rel=1e-6) and cl[2] == pytest.approx(0.25, rel=1e-9)


def test_a_curve_fit_to_the_invented_tracks_recovers_their_coefficients():
    """The demo tracks were flown with CD 0.33 and CL 0.21 at every S (invented, with 2 cm noise):
    the fitted curves must give those at the flights' spin parameters, within their uncertainty
    and the data's 5 %."""
    fit = bf.fit_tracks(bf.demo_tracks_setup(), bf.demo_tracks(), bf.DEMO_TRACKS["spin_rpm"],
                        bf.DEMO_TRACKS["spin_axis_deg"], mode="curve")
    assert fit.names[:4] == bf.CURVE_NAMES and fit.coefficient_count == 4
    # the demo flights meet S of about 0.2 to 0.3 (1,800 rpm, 36-44 m/s, r 36.6 mm)
    cd, cl = bf.curve_coefficients(np.array([0.2, 0.3]), *fit.values[:4])
    assert_allclose(cd, 0.33, rtol=0.05)
    assert_allclose(cl, 0.21, rtol=0.05)
    assert np.all(np.isfinite(fit.sd[:4])) and fit.rms_m < 0.05
    assert fit.warnings() == () or all(w.code == "fit_at_bound" for w in fit.warnings())


def test_the_fitted_curves_saved_as_a_table_fly_again():
    fit = bf.fit_tracks(bf.demo_tracks_setup(), bf.demo_tracks(), bf.DEMO_TRACKS["spin_rpm"], mode="curve")
    model = balls.table_model(fit.curve_table())
    S = np.linspace(0.0, 0.6, 13)
    cd, cl = model.coefficients(S, 1e5, 0, 0)
    want_cd, want_cl = bf.curve_coefficients(S, *fit.values[:4])
    assert_allclose(cd, want_cd, rtol=1e-4)
    assert_allclose(cl, want_cl, rtol=1e-4, atol=1e-6)
    with pytest.raises(ValueError, match="only curve fits"):
        bf.fit_tracks(bf.demo_tracks_setup(), bf.demo_tracks(), 1800.0).curve_table()


def test_the_study_reports_every_curve_parameter():
    r = run_study("flight", {"fit_in_report": True, "fit_mode": "curve"})
    assert set(bf.CURVE_NAMES) <= set(r.json["fit"])
