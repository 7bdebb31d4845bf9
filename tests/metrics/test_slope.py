"""Slope, relief, flank gradients and curvature on analytic depth profiles."""

import numpy as np
import pytest
from numpy.testing import assert_allclose

from clinometry.depth import ConstantVelocity, LinearVelocity
from clinometry.metrics import measure_picks
from clinometry.metrics.margin_geometry import margin_geometry
from clinometry.metrics.slope import foreset_slope_deg, slope_metrics


def _slope(picks, section, velocity=None, **kw):
    g = margin_geometry(picks, picks.margins[0], section, velocity)
    return slope_metrics(g, **kw), g


def test_planar_10deg_foreset_depth_section(build_margin, planar):
    picks, section = build_margin(planar(10.0))
    v, _ = _slope(picks, section)
    # trigonometry: relief = width * tan(angle) (common practice, no source)
    relief = 1000.0 * np.tan(np.radians(10.0))
    assert_allclose(v["relief_m"], relief, rtol=1e-9)
    assert_allclose(v["foreset_width_m"], 1000.0, rtol=1e-12)
    assert_allclose(v["slope_mean_deg"], 10.0, rtol=1e-9)
    assert_allclose(v["slope_max_deg"], 10.0, rtol=1e-9)
    assert_allclose(v["topset_gradient_deg"], 0.0, atol=1e-9)
    assert_allclose(v["bottomset_gradient_deg"], 0.0, atol=1e-9)
    assert v["slope_window"] == "break_to_toe"


def _noise_base(dz, dx, deg):
    # the base over which a least-squares line through points dx apart, each with the
    # quantisation error of one depth sample (sigma = dz / sqrt(12), the standard deviation
    # of a uniform error over one sample, from memory), has a slope error of a tenth of the
    # mean gradient g: sigma_slope = sigma sqrt(12 / N) / L with N = L / dx (standard error
    # of a least-squares slope, Press et al. 2007, Numerical Recipes 15.2, from memory),
    # so L = (dz sqrt(dx) / (0.1 g)) ** (2/3); the 10 % is chosen here (common practice, no source)
    return (dz * np.sqrt(dx) / (0.1 * np.tan(np.radians(deg)))) ** (2.0 / 3.0)


@pytest.mark.parametrize("dz,spacing,expected", [
    (4.0, 25.0, _noise_base(4.0, 25.0, 10.0)),  # the precision term: 108.8 m
    (0.5, 25.0, 3 * 25.0),                      # the floor of three trace spacings
    (0.5, 50.0, 3 * 50.0),
])
def test_default_base_length_tied_to_sampling(build_margin, planar, dz, spacing, expected):
    # the longer of three trace spacings (the fewest points that fix a line and show its
    # misfit, common practice, no source) and the precision base above; exact planar picks
    # have no scatter beyond the quantisation of one sample
    v, _ = _slope(*build_margin(planar(10.0), dz=dz, spacing_m=spacing, n_trace=int(121 * 25 / spacing) + 1,
                                break_trace=int(1000 / spacing), toe_trace=int(2000 / spacing)))
    assert v["slope_base_length_m"] == pytest.approx(expected)
    assert v["slope_max_deg"] == pytest.approx(10.0)


def test_metrics_and_truth_share_one_max_slope_definition():
    # the ground truth of the forward model (clinometry.synth.truth) and the metrics must
    # use the same secant base and give the same max slope on the same exact surface:
    # a Gaussian-rounded 25 deg foreset (erf profile), break and toe as the truth finds them
    from scipy.special import erf

    from clinometry.definitions import slope_base_length_m
    from clinometry.synth.truth import profile_margin

    s = np.arange(0.0, 4000.0, 12.5)
    # slope of an erf step of height H and width w peaks at H / (w sqrt(pi)) (calculus)
    h, w = 300.0, 300.0
    d = 100.0 + 0.5 * h * (1 + erf((s - 2000.0) / w))
    t = profile_margin(s, d, depth_sample_m=2.5)
    i, j = t["break"], t["toe"]
    base = slope_base_length_m(12.5, 2.5, (d[j] - d[i]) / (s[j] - s[i]))
    assert t["slope_base_length_m"] == pytest.approx(base)
    got = float(foreset_slope_deg(s, d, s[i], s[j], base))
    assert got == pytest.approx(t["slope_max_deg"], abs=1e-9)
    # the 150 m secant is a little below the point maximum atan(H / (w sqrt(pi))) = 29.4 deg
    assert np.degrees(np.arctan(h / (w * np.sqrt(np.pi)))) - 1.0 < got < np.degrees(np.arctan(h / (w * np.sqrt(np.pi))))


def test_default_base_length_without_mean_slope(build_margin, planar):
    # no toe, so no mean gradient: the precision base is taken for a 1 deg slope, the
    # quantum in which slopes are reported (chosen here, common practice, no source)
    v, _ = _slope(*build_margin(planar(10.0), dz=4.0, toe_trace=None))
    assert v["slope_base_length_m"] == pytest.approx(_noise_base(4.0, 25.0, 1.0))


@pytest.mark.parametrize("v_m_s", [2500.0, 4000.0])
def test_planar_10deg_foreset_twt_section_constant_velocity(build_margin, planar, v_m_s):
    # tan(theta) = (v / 2) * dt / dx for constant velocity (Sheriff & Geldart 1995,
    # Exploration Seismology, from memory): the same 10 deg foreset in time at two
    # velocities must give 10 deg once converted.
    vel = ConstantVelocity(v_m_s)
    picks, section = build_margin(planar(10.0), velocity=vel)
    prof = picks.horizon(0)
    dt_dx = (prof.z[80] - prof.z[40]) / 1000.0  # ms per m
    assert_allclose(np.degrees(np.arctan(v_m_s / 2.0 * dt_dx / 1000.0)), 10.0, rtol=1e-9)
    v, _ = _slope(picks, section, vel)
    assert_allclose(v["slope_max_deg"], 10.0, rtol=1e-9)
    assert_allclose(v["slope_mean_deg"], 10.0, rtol=1e-9)
    assert_allclose(v["relief_m"], 1000.0 * np.tan(np.radians(10.0)), rtol=1e-9)


def test_planar_foreset_twt_section_linear_velocity(build_margin, planar):
    # z(t) = (v0 / k) (exp(k t / 2) - 1) (Sheriff & Geldart 1995, from memory) is how
    # the model converts; the depth geometry must come back exactly.
    vel = LinearVelocity(1800.0, 0.6)
    picks, section = build_margin(planar(25.0, top_m=400.0), velocity=vel)
    t_break = picks.horizon(0).z[40] / 1000.0  # s
    assert_allclose(1800.0 / 0.6 * (np.exp(0.6 * t_break / 2.0) - 1.0), 400.0, rtol=1e-9)
    v, _ = _slope(picks, section, vel)
    assert_allclose(v["slope_max_deg"], 25.0, rtol=1e-6)
    assert_allclose(v["break_depth_m"], 400.0, rtol=1e-9)


def test_direction_minus_gives_same_numbers(build_margin, planar):
    plus, s_plus = build_margin(planar(15.0), direction="+")
    minus, s_minus = build_margin(planar(15.0), direction="-")
    vp, _ = _slope(plus, s_plus)
    vm, gm = _slope(minus, s_minus)
    for k in ("slope_max_deg", "slope_mean_deg", "relief_m", "foreset_width_m"):
        assert_allclose(vm[k], vp[k], rtol=1e-12)
    # basinward distance increases with decreasing trace index on a "-" margin
    assert np.all(np.diff(gm.profile.trace) < 0)
    assert np.all(np.diff(gm.profile.basinward_m) > 0)


def test_flank_gradients_signed_basinward_down(build_margin):
    top = np.tan(np.radians(0.5))
    floor = np.tan(np.radians(-0.2))
    fs = np.tan(np.radians(12.0))

    def fn(x):
        x = np.asarray(x, dtype=float)
        d_break = 200 + top * 1000.0
        d_toe = d_break + fs * 1000.0
        return np.where(x <= 1000, 200 + top * x,
                        np.where(x <= 2000, d_break + fs * (x - 1000), d_toe + floor * (x - 2000)))

    v, _ = _slope(*build_margin(fn))
    # a line's least-squares gradient is the line's own gradient (common practice, no source)
    assert_allclose(v["topset_gradient_deg"], 0.5, rtol=1e-9)
    assert_allclose(v["bottomset_gradient_deg"], -0.2, rtol=1e-9)
    assert_allclose(v["slope_max_deg"], 12.0, rtol=1e-9)


def test_curvature_of_parabola_at_break_and_toe(build_margin):
    # curvature of y = c x^2 at its vertex is 2c (plane-curve curvature
    # y'' / (1 + y'^2)^1.5, Kreyszig, Advanced Engineering Mathematics, from memory)
    c = 1.0e-4  # 1/m -> 0.2 per km
    v_break, _ = _slope(*build_margin(lambda x: 200 + c * (np.asarray(x) - 1000.0) ** 2))
    assert_allclose(v_break["break_curvature_per_km"], 2 * c * 1000, rtol=1e-9)
    v_toe, _ = _slope(*build_margin(lambda x: 600 - c * (np.asarray(x) - 2000.0) ** 2))
    assert_allclose(v_toe["toe_curvature_per_km"], 2 * c * 1000, rtol=1e-9)


def test_max_slope_base_length_smooths_one_sample_step(build_margin):
    # a 5 m step between two traces of an otherwise flat foreset window: the slope is the
    # 80th percentile of the least-squares dips over every base inside the window, and the
    # few bases that hold the step are fewer than a fifth of them, so the step is no slope;
    # what remains is the floor of the maximum, the mean slope from break to toe,
    # atan(5 m / 1000 m) (a maximum is at least the mean, common practice, no source)
    picks, section = build_margin(lambda x: 300.0 + 5.0 * (np.asarray(x) >= 1500.0))
    v, _ = _slope(picks, section, base_length_m=100.0)
    assert_allclose(v["slope_max_deg"], np.degrees(np.arctan(5.0 / 1000.0)), rtol=1e-9)
    # the steepest of those fits: a 100 m base holds 5 points 25 m apart, and with the step
    # next to its middle point (y = 0, 0, 0, 5, 5 m) the least-squares slope is
    # sum(xc y) / sum(xc^2) over the centred positions xc (Press et al. 2007, Numerical
    # Recipes 15.2, from memory)
    xs = np.arange(0.0, 3001.0, 25.0)
    ds = 300.0 + 5.0 * (xs >= 1500.0)
    xc = np.arange(-2, 3) * 25.0
    y = np.array([0, 0, 0, 5, 5.0])
    expect = np.degrees(np.arctan(np.sum(xc * y) / np.sum(xc * xc)))
    assert_allclose(foreset_slope_deg(xs, ds, 1000.0, 2000.0, 100.0, quantile=1.0), expect, rtol=1e-9)
    # over a 50 m base (3 points) the steepest fit is the chord over the step, atan(5 / 50)
    assert_allclose(foreset_slope_deg(xs, ds, 1000.0, 2000.0, 50.0, quantile=1.0),
                    np.degrees(np.arctan(5.0 / 50.0)), rtol=1e-9)


def test_foreset_slope_short_window_is_the_least_squares_line():
    xs = np.arange(0.0, 201.0, 10.0)
    ds = 2.0 * xs
    # window 30 m < base 100 m: the least-squares line over the window, atan(2) (straight line)
    assert_allclose(foreset_slope_deg(xs, ds, 50.0, 80.0, 100.0), np.degrees(np.arctan(2.0)))
    assert np.isnan(foreset_slope_deg(xs, ds, 80.0, 50.0, 100.0))


def test_missing_toe_gives_reasons_not_values(build_margin, planar):
    picks, section = build_margin(planar(20.0), toe_trace=None)
    v, _ = _slope(picks, section)
    for k in ("relief_m", "slope_mean_deg", "foreset_width_m", "bottomset_gradient_deg", "toe_curvature_per_km"):
        assert k not in v
        assert "no toe found (test)" in v["missing"][k]
    # slope max is still measured, to the end of the profile, and says so
    assert v["slope_window"] == "break_to_profile_end"
    assert_allclose(v["slope_max_deg"], 20.0, rtol=1e-9)


def test_clinoform_heights_and_median(build_margin, planar):
    clinos = [(planar(10.0, top_m=300.0, x_break=500.0, x_toe=1000.0), 20, 40),
              (planar(20.0, top_m=250.0, x_break=750.0, x_toe=1250.0), 30, 50),
              (planar(30.0, top_m=200.0, x_break=1000.0, x_toe=1500.0), 40, None)]
    v, _ = _slope(*build_margin(planar(30.0), clinoforms=clinos))
    h = [500.0 * np.tan(np.radians(a)) for a in (10.0, 20.0)]
    c = v["clinoforms"]
    assert [e["horizon_id"] for e in c] == [10, 11, 12]
    assert_allclose([c[0]["height_m"], c[1]["height_m"]], h, rtol=1e-9)
    assert_allclose([c[0]["slope_max_deg"], c[1]["slope_max_deg"]], [10.0, 20.0], rtol=1e-9)
    assert c[2]["height_m"] is None and c[2]["slope_max_deg"] is None
    assert "no toe in test" in c[2]["missing"]["height_m"]
    # median of two values is their mean (common practice, no source)
    assert_allclose(v["clinoform_height_m"], np.mean(h), rtol=1e-9)
    assert c[0]["break"]["distance_m"] == pytest.approx(500.0)


def test_measure_fills_contract_points(build_margin, planar):
    picks, section = build_margin(planar(10.0), direction="-", dz=0.5)
    before = section.copy(deep=True)
    mm = measure_picks(picks, section, uncertainty=False).margins[0]
    # break at basinward trace 40 of a "-" line of 121 traces is section trace 80
    assert mm.shelf_break["trace"] == 80
    assert mm.shelf_break["distance_m"] == pytest.approx(80 * 25.0)
    # x = 1000 + 0.6 * distance, y = 2000 + 0.8 * distance (how the test line was built)
    assert mm.shelf_break["x"] == pytest.approx(1000.0 + 0.6 * 2000.0)
    assert mm.shelf_break["y"] == pytest.approx(2000.0 + 0.8 * 2000.0)
    assert mm.shelf_break["depth_m"] == pytest.approx(200.0)
    assert mm.toe["depth_m"] == pytest.approx(200.0 + 1000.0 * np.tan(np.radians(10.0)))
    # flat top: the first (most landward) of the equally high points within flank + local
    # length = 20 * 25 + 3 * 25 = 575 m landward of the break (the local length is three trace
    # spacings here: 0.5 m / tan(1 deg) = 29 m is shorter), basinward trace 40 - 23 = 17 -> section trace 103
    assert mm.platform_top["trace"] == 103 and mm.platform_top["depth_m"] == pytest.approx(200.0)
    assert mm.platform_top["depth_min_m"] == mm.platform_top["depth_max_m"] == pytest.approx(200.0)
    assert mm.confidence == pytest.approx(0.9)
    assert len(mm.profile["depth_m"]) == 121
    import xarray.testing

    xarray.testing.assert_identical(section, before)


def test_platform_top_point_is_the_rim(build_margin, planar):
    # a rim 8 m high 200 m landward of the break on an otherwise flat top at 200 m
    def top(x):
        x = np.asarray(x, dtype=float)
        return 200.0 - 8.0 * np.exp(-((x - 800.0) / 50.0) ** 2)

    picks, section = build_margin(planar(10.0), top_fn=top)
    mm = measure_picks(picks, section, uncertainty=False).margins[0]
    assert mm.platform_top["trace"] == 32 and mm.platform_top["depth_m"] == pytest.approx(192.0)
    assert mm.platform_top["horizon_id"] == 1


def test_clinoform_without_finite_points_is_missing_not_an_error(build_margin, planar):
    clinos = [(lambda x: np.full(np.shape(x), np.nan), None, None), (planar(20.0), 40, 80)]
    v, _ = _slope(*build_margin(planar(20.0), clinoforms=clinos))
    c = v["clinoforms"]
    assert c[0]["slope_max_deg"] is None
    assert c[0]["missing"]["slope_max_deg"] == "clinoform 10: 0 finite point(s) on the surface; need 2"
    assert c[1]["slope_max_deg"] == pytest.approx(20.0)


# the gentle ramp is left out: a ramp has no shelf break or toe in its truth (a ramp
# deepens without a break in slope, common practice, no source), so there is no
# break-to-toe window to compare
@pytest.mark.parametrize("name", ["rimmed_shelf", "level_shelf", "steep_margin", "deep_factory_shelf"])
def test_metrics_on_the_exact_grown_surface_reproduce_the_truth_slope(name):
    # the forward model's truth (clinometry.synth) and the metrics share one max-slope
    # definition: measured on the exact youngest surface with the truth's break and toe,
    # in a depth section sampled at the truth's depth sample (v * dt / 2 = 2.5 m for
    # 2500 m/s and 2 ms, Sheriff & Geldart 1995, from memory), the metric equals the truth
    # up to the half-trace grid of the metric
    from clinometry.picking.picks import Horizon, MarginPicks, PickPoint, Picks
    from clinometry.section import make_section
    from clinometry.synth import make_line
    from clinometry.synth.lines import grown_surfaces

    _, truth = make_line(name, n_samples=10, noise=False)
    (m,) = truth["margins"]
    assert truth["velocity"]["model"] == "constant"
    dsample = truth["velocity"]["v_m_s"] * truth["sample_interval"] / 2000.0
    final = grown_surfaces(name)[-1]
    n = final.size
    z = np.arange(0.0, float(final.max()) + 50.0, dsample)
    sec = make_section(np.zeros((n, z.size), np.float32), z=z, domain="depth", trace_spacing_m=truth["trace_spacing_m"])
    b, t = m["break"]["trace"], m["toe"]["trace"]
    h = Horizon(0, "margin_profile", np.arange(n), final.astype(float), np.ones(n))
    mp = MarginPicks(m["direction"], 0, 0, PickPoint(b, float(final[b])), PickPoint(t, float(final[t])))
    got = measure_picks(Picks(horizons=(h,), margins=(mp,)), sec, metrics=["slope"], uncertainty=False).margins[0].values
    assert_allclose(got["relief_m"], m["relief_m"], rtol=1e-9)
    assert_allclose(got["slope_mean_deg"], m["slope_mean_deg"], rtol=1e-9)
    assert_allclose(got["slope_max_deg"], m["slope_max_deg"], atol=0.01)
