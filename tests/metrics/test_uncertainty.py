"""Monte-Carlo P10/P50/P90: reproducibility, ordering, spread and known quantiles."""

import numpy as np
import pytest
from numpy.testing import assert_allclose

from clinometry.depth import ConstantVelocity, LinearVelocity
from clinometry.metrics import measure_picks
from clinometry.metrics.margin_geometry import margin_geometry
from clinometry.metrics.uncertainty import propagate, uncertainty_settings

KEYS = ("slope_max_deg", "slope_mean_deg", "relief_m", "break_depth_m")


def _run(build_margin, planar, *, velocity=ConstantVelocity(2500.0), seed=0, **settings):
    picks, section = build_margin(planar(15.0), velocity=velocity)
    g = margin_geometry(picks, picks.margins[0], section, velocity)
    return propagate(g, settings=uncertainty_settings(settings or True, seed=seed), section=section,
                     velocity=velocity)


def test_seeded_draws_are_reproducible(build_margin, planar):
    a = _run(build_margin, planar, seed=11)
    b = _run(build_margin, planar, seed=11)
    c = _run(build_margin, planar, seed=12)
    assert a == b
    assert a["relief_m"] != c["relief_m"]


def test_percentiles_are_ordered_and_p50_near_best(build_margin, planar):
    u = _run(build_margin, planar)
    best = {"slope_max_deg": 15.0, "slope_mean_deg": 15.0, "relief_m": 1000 * np.tan(np.radians(15.0)),
            "break_depth_m": 200.0}
    for k in KEYS:
        assert u[k]["p10"] <= u[k]["p50"] <= u[k]["p90"], k
        assert u[k]["p10"] < u[k]["p90"], k
        # 200 draws: the median is within a few percent of the best estimate
        assert u[k]["p50"] == pytest.approx(best[k], rel=0.04), k


def test_spread_grows_with_velocity_uncertainty(build_margin, planar):
    low = _run(build_margin, planar, velocity_sigma_fraction=0.03)
    high = _run(build_margin, planar, velocity_sigma_fraction=0.12)
    for k in ("relief_m", "break_depth_m", "slope_mean_deg"):
        assert high[k]["p90"] - high[k]["p10"] > 1.5 * (low[k]["p90"] - low[k]["p10"]), k


def test_velocity_only_relief_quantiles_match_normal_quantiles(build_margin, planar):
    # with no pick error, relief = f * relief0 with f ~ N(1, 0.08): P10/P90 at
    # 1 -/+ 1.2816 * 0.08 (standard normal quantile z_0.9 = 1.2816, Abramowitz &
    # Stegun 1964, Handbook of Mathematical Functions, Table 26.1; from memory)
    u = _run(build_margin, planar, n_draws=20000, pick_sigma_samples=0.0, pick_sigma_traces=0.0)
    r0 = 1000 * np.tan(np.radians(15.0))
    assert_allclose([u["relief_m"]["p10"], u["relief_m"]["p90"]],
                    [r0 * (1 - 1.2816 * 0.08), r0 * (1 + 1.2816 * 0.08)], rtol=0.005)
    # the depth scaling also scales tan(slope): atan(f tan 15 deg) at the quantiles
    assert_allclose(u["slope_mean_deg"]["p90"], np.degrees(np.arctan((1 + 1.2816 * 0.08) * np.tan(np.radians(15.0)))),
                    rtol=0.005)


def test_nonlinear_velocity_model_still_scales(build_margin, planar):
    # a linear-gradient model scaled by f multiplies every depth by f, so the
    # same quantiles as the constant model follow (Sheriff & Geldart 1995, from memory)
    u = _run(build_margin, planar, velocity=LinearVelocity(1800.0, 0.5), n_draws=20000,
             pick_sigma_samples=0.0, pick_sigma_traces=0.0)
    assert_allclose(u["break_depth_m"]["p90"], 200.0 * (1 + 1.2816 * 0.08), rtol=0.005)


def test_depth_section_has_no_velocity_error(build_margin, planar):
    picks, section = build_margin(planar(15.0))
    g = margin_geometry(picks, picks.margins[0], section)
    u = propagate(g, settings=uncertainty_settings({"pick_sigma_samples": 0.0, "pick_sigma_traces": 0.0}))
    for k in KEYS:
        assert u[k]["p10"] == pytest.approx(u[k]["p90"]), k
    assert u["relief_m"]["p50"] == pytest.approx(1000 * np.tan(np.radians(15.0)))


def test_bad_settings_named():
    with pytest.raises(ValueError, match="n_drawz"):
        uncertainty_settings({"n_drawz": 10})
    with pytest.raises(ValueError, match="velocity_sigma_fraction"):
        uncertainty_settings({"velocity_sigma_fraction": 0.5})
    assert uncertainty_settings(False) == {}


def test_measure_attaches_uncertainty_and_settings(build_margin, planar):
    vel = ConstantVelocity(3000.0)
    picks, section = build_margin(planar(8.0), velocity=vel)
    m = measure_picks(picks, section, velocity=vel, seed=5)
    assert m.uncertainty_settings["seed"] == 5 and m.uncertainty_settings["n_draws"] == 200
    u = m.margins[0].uncertainty
    assert set(u) == set(KEYS)
    assert u["slope_max_deg"]["p10"] <= m.margins[0].values["slope_max_deg"] <= u["slope_max_deg"]["p90"]
    assert measure_picks(picks, section, velocity=vel, uncertainty=False).margins[0].uncertainty == {}


class _GradientScaledLinear(LinearVelocity):
    """A model whose scaled() also scales the gradient: depth is not proportional to f."""

    def scaled(self, factor):
        return _GradientScaledLinear(self.v0_m_s * factor, self.k_per_s * factor)


def test_model_that_does_not_scale_depth_linearly_is_drawn_one_by_one(build_margin, planar):
    vel = _GradientScaledLinear(1800.0, 0.5)
    picks, section = build_margin(planar(15.0, top_m=1500.0), velocity=vel)
    g = margin_geometry(picks, picks.margins[0], section, vel)
    settings = uncertainty_settings({"n_draws": 4000, "pick_sigma_samples": 0.0, "pick_sigma_traces": 0.0})
    u = propagate(g, settings=settings, section=section, velocity=vel)
    t_break = picks.horizon(0).z[40]
    # the depth is monotone in f, so its P90 is the depth at the P90 of f = 1 + 1.2816 * 0.08
    # (standard normal quantile, Abramowitz & Stegun 1964, Table 26.1; from memory)
    f90 = 1 + 1.2816 * 0.08
    assert u["break_depth_m"]["p90"] == pytest.approx(float(vel.scaled(f90).depth_m(t_break)), rel=0.005)
    # and it differs from f * depth, which the vectorised path would have used
    assert abs(u["break_depth_m"]["p90"] - f90 * 1500.0) > 20.0


def test_flat_foreset_gives_shape_reason(build_margin):
    from clinometry.metrics.shape import shape_metrics

    picks, section = build_margin(lambda x: np.full(np.shape(x), 250.0))
    g = margin_geometry(picks, picks.margins[0], section)
    assert shape_metrics(g)["missing"]["profile_shape"] == "profile is flat between break and toe; no slope to fit"
