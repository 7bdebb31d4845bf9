"""Profile-shape fits (Adams & Schlager 2000) on analytic profiles, checked with scipy."""

import numpy as np
import pytest
from numpy.testing import assert_allclose
from scipy.optimize import curve_fit

from clinometry.metrics.margin_geometry import margin_geometry
from clinometry.metrics.shape import fit_profile_shape, shape_metrics

X = np.linspace(0.0, 1500.0, 61)


def test_line_is_planar_with_its_gradient():
    d = 150.0 + np.tan(np.radians(20.0)) * X
    fit = fit_profile_shape(X, d)
    # Adams & Schlager (2000, J. Sed. Res. 70: 814-828): a linear best fit = planar slope
    assert fit["profile_shape"] == "planar"
    assert fit["profile_fit_model"] == "linear"
    assert_allclose(fit["fits"]["linear"]["params"]["gradient"], np.tan(np.radians(20.0)), rtol=1e-9)
    assert_allclose(fit["profile_fit_r2"], 1.0, atol=1e-12)


def test_exponential_is_concave_and_matches_scipy_curve_fit():
    d = 600.0 - 400.0 * np.exp(-X / 300.0)
    fit = fit_profile_shape(X, d)
    # Adams & Schlager (2000): exponential best fit = concave slope
    assert fit["profile_shape"] == "concave"
    p = fit["fits"]["exponential"]["params"]
    assert_allclose([p["c_m"], p["a_m"], p["length_m"]], [600.0, 400.0, 300.0], rtol=1e-5)
    # independent check: scipy.optimize.curve_fit in raw units, plain Levenberg-Marquardt
    ref, _ = curve_fit(lambda x, c, a, L: c - a * np.exp(-x / L), X, d, p0=[500.0, 300.0, 200.0])
    assert_allclose([p["c_m"], p["a_m"], p["length_m"]], ref, rtol=1e-5)


def test_gaussian_is_sigmoidal_and_matches_scipy_curve_fit():
    d = 700.0 - 450.0 * np.exp(-X**2 / (2 * 500.0**2))
    fit = fit_profile_shape(X, d)
    # Adams & Schlager (2000): Gaussian best fit = sigmoidal slope
    assert fit["profile_shape"] == "sigmoidal"
    p = fit["fits"]["gaussian"]["params"]
    assert_allclose([p["c_m"], p["a_m"], p["sigma_m"]], [700.0, 450.0, 500.0], rtol=1e-5)
    ref, _ = curve_fit(lambda x, c, a, s: c - a * np.exp(-x**2 / (2 * s**2)), X, d, p0=[600.0, 400.0, 400.0])
    assert_allclose([p["c_m"], p["a_m"], p["sigma_m"]], ref, rtol=1e-5)


@pytest.mark.parametrize("kind,expected", [("linear", "planar"), ("exponential", "concave"), ("gaussian", "sigmoidal")])
def test_shape_class_survives_one_metre_noise(kind, expected):
    rng = np.random.default_rng(7)
    clean = {"linear": 150.0 + 0.3 * X,
             "exponential": 600.0 - 400.0 * np.exp(-X / 300.0),
             "gaussian": 700.0 - 450.0 * np.exp(-X**2 / (2 * 500.0**2))}[kind]
    fit = fit_profile_shape(X, clean + rng.normal(0.0, 1.0, X.size))
    assert fit["profile_shape"] == expected
    # R^2 of the true model with 1 m noise on ~400 m of relief (coefficient of determination)
    assert fit["profile_fit_r2"] > 0.999


def test_too_few_points_gives_reason():
    fit = fit_profile_shape([0.0, 10.0, 20.0], [0.0, 1.0, 2.0])
    assert fit["profile_shape"] is None
    assert "3 profile point(s)" in fit["reason"]


def test_shape_metrics_on_margin_and_missing_toe(build_margin):
    def fn(x):
        x = np.asarray(x, dtype=float)
        return np.where(x < 1000, 200.0, 600.0 - 400.0 * np.exp(-(x - 1000.0) / 250.0))

    picks, section = build_margin(fn, toe_trace=100)
    g = margin_geometry(picks, picks.margins[0], section)
    out = shape_metrics(g)
    assert out["profile_shape"] == "concave"
    assert out["profile_fit_r2_exponential"] == pytest.approx(1.0, abs=1e-9)
    picks, section = build_margin(fn, toe_trace=None)
    g = margin_geometry(picks, picks.margins[0], section)
    miss = shape_metrics(g)["missing"]
    assert "no toe found (test)" in miss["profile_shape"]


@pytest.mark.parametrize("kind,expected_deg", [
    # d/dx of 150 + 0.3 x is 0.3 -> atan(0.3) = 16.699 deg
    ("linear", np.degrees(np.arctan(0.3))),
    # d/dx of 600 - 400 exp(-x/300) at x = 0 is 400/300 -> 53.130 deg
    ("exponential", np.degrees(np.arctan(400.0 / 300.0))),
    # d/dx of 700 - 450 exp(-x^2/(2 500^2)) peaks at x = 500: 450/500 exp(-1/2) -> 28.63 deg
    ("gaussian", np.degrees(np.arctan(450.0 / 500.0 * np.exp(-0.5)))),
])
def test_fitted_max_slope_from_model_calculus(build_margin, kind, expected_deg):
    # derivatives of the analytic curves (calculus, common practice, no source)
    f = {"linear": lambda u: 150.0 + 0.3 * u,
         "exponential": lambda u: 600.0 - 400.0 * np.exp(-u / 300.0),
         "gaussian": lambda u: 700.0 - 450.0 * np.exp(-u**2 / (2 * 500.0**2))}[kind]

    def fn(x):
        x = np.asarray(x, dtype=float)
        return np.where(x < 500.0, f(0.0), f(x - 500.0))

    picks, section = build_margin(fn, n_trace=121, break_trace=20, toe_trace=80)
    out = shape_metrics(margin_geometry(picks, picks.margins[0], section))
    assert out["slope_max_fit_deg"] == pytest.approx(expected_deg, rel=1e-5)
