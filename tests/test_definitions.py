"""The definitions that truth and measurement share live in one module, and both use it.

``clinometry.definitions`` holds the base of the maximum-slope secant, the
Theil-Sen line through the shelf breaks and the tolerance of the flat
trajectory class.  The metrics (``clinometry.metrics``) and the forward
model's ground truth (``clinometry.synth.truth``) must read them from there,
not from copies: these tests pin the objects by identity, check that no other
module of the package defines them again, and check the values against
hand-worked examples and the reference library (SciPy).
"""

import ast
from pathlib import Path

import numpy as np
import pytest

from clinometry import definitions

PKG = Path(definitions.__file__).resolve().parent
SHARED_NAMES = ("BASE_LENGTH_TRACES", "SLOPE_MAX_QUANTILE", "SLOPE_PRECISION_FRACTION", "SLOPE_QUANTUM_DEG",
                "TRAJECTORY_FLAT_DEG")


def test_metrics_and_truth_use_the_shared_objects():
    from clinometry.metrics import slope, trajectory
    from clinometry.synth import truth

    assert slope.slope_base_length_m is definitions.slope_base_length_m
    assert truth.slope_base_length_m is definitions.slope_base_length_m
    assert trajectory.theil_sen_line is definitions.theil_sen_line
    assert truth.theil_sen_line is definitions.theil_sen_line
    assert slope.foreset_slope_deg is definitions.foreset_slope_deg
    assert truth.foreset_slope_deg is definitions.foreset_slope_deg
    assert truth.TRAJECTORY_FLAT_DEG is trajectory.TRAJECTORY_FLAT_DEG is definitions.TRAJECTORY_FLAT_DEG


def test_flat_tolerance_defaults_all_read_the_shared_value():
    import inspect

    from clinometry.classify.thresholds import DEFAULT_THRESHOLDS
    from clinometry.metrics.trajectory import trajectory_from_breaks, trajectory_metrics
    from clinometry.synth.truth import trajectory

    flat = definitions.TRAJECTORY_FLAT_DEG
    assert DEFAULT_THRESHOLDS["trajectory_flat_deg"].value == flat
    for func in (trajectory_metrics, trajectory_from_breaks, trajectory):
        assert inspect.signature(func).parameters["flat_deg"].default == flat, func.__name__


def _assigned_names(path):
    tree = ast.parse(path.read_text())
    for node in ast.walk(tree):
        if isinstance(node, (ast.Assign, ast.AnnAssign)):
            targets = node.targets if isinstance(node, ast.Assign) else [node.target]
            for t in targets:
                if isinstance(t, ast.Name):
                    yield t.id
        elif isinstance(node, ast.FunctionDef):
            yield node.name


@pytest.mark.parametrize("path", sorted(p for p in PKG.rglob("*.py") if p.name != "definitions.py"),
                         ids=lambda p: str(p.relative_to(PKG)))
def test_no_other_module_defines_them_again(path):
    names = set(_assigned_names(path))
    again = names & (set(SHARED_NAMES) | {"slope_base_length_m", "slope_base_m", "theil_sen_line"})
    assert not again, f"{path.relative_to(PKG)} defines {sorted(again)} again; import them from clinometry.definitions"
    # the Theil-Sen estimator is imported (and so called) in one place only
    tree = ast.parse(path.read_text())
    imported = {a.name for n in ast.walk(tree) if isinstance(n, ast.ImportFrom) for a in n.names}
    assert "theilslopes" not in imported, f"{path.relative_to(PKG)} fits its own Theil-Sen line"


def _precision_base(dsample_m, spacing_m, gradient):
    # the base over which a least-squares line through points one trace apart, each with the
    # quantisation error of one depth sample (sigma = dz / sqrt(12), uniform error, from
    # memory), has a slope error of a tenth of the mean gradient: sigma sqrt(12 / N) / L with
    # N = L / dx (Press et al. 2007, Numerical Recipes 15.2, from memory), so
    # L = (dz sqrt(dx) / (0.1 g)) ** (2/3); the 10 % is a project choice (common practice, no source)
    return (dsample_m * np.sqrt(spacing_m) / (0.1 * gradient)) ** (2.0 / 3.0)


@pytest.mark.parametrize("spacing_m,dsample_m,slope_deg,expected_m", [
    (12.5, 2.5, 20.0, _precision_base(2.5, 12.5, np.tan(np.radians(20.0)))),  # 38.9 m, just above 3 traces
    (12.5, 2.5, 0.8, _precision_base(2.5, 12.5, np.tan(np.radians(0.8)))),    # 342.2 m, the precision term
    (50.0, 1.0, 10.0, 3 * 50.0),                                              # three trace spacings
])
def test_slope_base_worked_examples(spacing_m, dsample_m, slope_deg, expected_m):
    # L = max(3 traces, precision base) (worked by hand; three points are the fewest that fix a
    # line and show its misfit, common practice, no source)
    got = definitions.slope_base_length_m(spacing_m, dsample_m, np.tan(np.radians(slope_deg)))
    assert got == pytest.approx(expected_m)


def test_slope_base_without_mean_slope_or_depth_sample():
    # no mean gradient: the precision base is taken for a 1 deg slope (the quantum slopes are
    # reported in, chosen here); no depth sample and no measured scatter: only the trace term
    assert definitions.slope_base_length_m(25.0, 4.0, None) == pytest.approx(
        _precision_base(4.0, 25.0, np.tan(np.radians(1.0))))
    assert definitions.slope_base_length_m(25.0, None, 0.01) == 75.0
    # a measured pick scatter larger than the quantisation takes its place
    assert definitions.slope_base_length_m(25.0, None, 0.01, pick_scatter_m=2.0) == pytest.approx(
        _precision_base(2.0 * np.sqrt(12.0), 25.0, 0.01))


def test_theil_sen_line_matches_scipy_and_a_hand_example():
    from scipy.stats import theilslopes

    rng = np.random.default_rng(7)
    x = np.sort(rng.uniform(0.0, 3000.0, 9))
    y = 200.0 - 0.02 * x + rng.normal(0.0, 3.0, 9)
    slope, icpt = definitions.theil_sen_line(x, y)
    ref = theilslopes(y, x)  # SciPy's implementation of Theil (1950) / Sen (1968)
    assert (slope, icpt) == (float(ref[0]), float(ref[1]))
    # four points on y = 1 + 0.5 x and one wild point: the median of the ten pairwise slopes
    # is 0.5 (worked by hand)
    assert definitions.theil_sen_line([0, 1, 2, 3, 4], [1.0, 1.5, 2.0, 2.5, -9.0])[0] == 0.5


def test_slope_noise_gradient_is_the_standard_error_of_a_fitted_slope():
    # standard error of a least-squares slope, sigma / sqrt(sum (x - xbar)^2)
    # (Press et al. 2007, Numerical Recipes 15.2, from memory), checked against
    # the scatter of slopes fitted to many noisy straight lines
    rng = np.random.default_rng(0)
    dx, base, sigma = 25.0, 100.0, 2.0
    x = np.arange(0.0, base + dx / 2, dx)
    fits = [np.polyfit(x, 0.3 * x + sigma * rng.standard_normal(x.size), 1)[0] for _ in range(20000)]
    expected = sigma / np.sqrt(np.sum((x - x.mean()) ** 2))
    assert definitions.slope_noise_gradient(sigma, base, dx) == pytest.approx(expected, rel=1e-12)
    # 20 000 draws: the sample standard deviation is within about 1 % (2 sigma of its own error)
    assert np.std(fits) == pytest.approx(expected, rel=0.02)
    assert definitions.slope_noise_gradient(0.0, base, dx) == 0.0


def test_max_slope_of_noisy_picks_is_debiased_to_the_exact_surface():
    # a planar 20 deg foreset: on the exact surface every fitted dip is 20 deg;
    # pick noise spreads the fitted dips, so their 80th percentile reads
    # steeper by about 0.84 standard errors (normal quantile) unless debiased
    dx, sigma = 12.5, 3.0
    xs = np.arange(0.0, 3000.0 + dx / 2, dx)
    exact = np.clip((xs - 1000.0) * np.tan(np.radians(20.0)), 0.0, 1000.0 * np.tan(np.radians(20.0)))
    lo, hi = 1000.0, 2000.0
    base = 75.0
    assert float(definitions.foreset_slope_deg(xs, exact, lo, hi, base)) == pytest.approx(20.0, abs=1e-9)
    rng = np.random.default_rng(1)
    noisy = exact[None, :] + sigma * rng.standard_normal((400, xs.size))
    se = definitions.slope_noise_gradient(sigma, base, dx)
    raw = definitions.foreset_slope_deg(xs, noisy, lo, hi, base)
    fixed = definitions.foreset_slope_deg(xs, noisy, lo, hi, base, noise_gradient=se)
    g = np.tan(np.radians(20.0))
    assert np.median(np.tan(np.radians(raw))) - g == pytest.approx(0.8416 * se, rel=0.15)
    assert abs(np.median(np.tan(np.radians(fixed))) - g) < 0.15 * se
