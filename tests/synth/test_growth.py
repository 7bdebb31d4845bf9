"""Growth of carbonate margins: production law and facts of the trade."""

import dataclasses

import numpy as np
import pytest

from clinometry.errors import GeometryError
from clinometry.synth import SCENARIOS, GrowthParameters, grow, production_rate
from clinometry.synth.growth import FACIES, sea_level_m
from clinometry.synth.truth import profile_margin

LAW = dict(gmax_m_per_kyr=1.0, surface_light=2000.0, saturating_light=250.0, extinction_per_m=0.1)


def test_production_law_closed_form():
    # Bosscher & Schlager (1992): G(z) = Gmax tanh(I0 exp(-k z) / Ik)  (from memory)
    z = np.array([1.0, 10.0, 25.0, 50.0])
    expected = 1.0 * np.tanh(2000.0 * np.exp(-0.1 * z) / 250.0)
    np.testing.assert_allclose(production_rate(z, **LAW), expected, rtol=1e-14)
    # evaluated by hand: tanh(8/e) = 0.9945, tanh(8 e^-2.5) = 0.5761, tanh(8 e^-5) = 0.0539
    np.testing.assert_allclose(production_rate(z, **LAW), [1.0, 0.9945, 0.5761, 0.0539], atol=1e-4)


def test_production_saturates_at_gmax_near_surface_when_light_is_ample():
    # limit of the law: I0 >> Ik -> G -> Gmax near the surface (Bosscher & Schlager 1992)
    g = production_rate(0.01, gmax_m_per_kyr=12.0, surface_light=2000.0, saturating_light=2.0,
                        extinction_per_m=0.1)
    np.testing.assert_allclose(g, 12.0, rtol=1e-12)


def test_production_decays_with_the_extinction_coefficient_at_depth():
    # deep water: tanh(x) ~ x, so G(z + 1) / G(z) -> exp(-k) (Bosscher & Schlager 1992)
    for k in (0.04, 0.1, 0.16):
        law = dict(LAW, extinction_per_m=k)
        z = 150.0 / k * 0.5
        ratio = production_rate(z + 1.0, **law) / production_rate(z, **law)
        np.testing.assert_allclose(ratio, np.exp(-k), rtol=1e-6)


def test_no_production_when_exposed_and_deep_mode_is_gaussian():
    np.testing.assert_array_equal(production_rate([-5.0, 0.0], **LAW), [0.0, 0.0])
    law = dict(LAW, extinction_per_m=1.0, deep_gmax_m_per_kyr=0.7, deep_depth_m=65.0, deep_width_m=12.0)
    # Gaussian in depth: peak 0.7 at 65 m, exp(-1/2) of it one width away (definition)
    np.testing.assert_allclose(production_rate([65.0, 77.0], **law), [0.7, 0.7 * np.exp(-0.5)], rtol=1e-9)


def test_surfaces_never_cross_and_flat_basin_thickness_is_pelagic_rain():
    s = grow(SCENARIOS["rimmed_shelf"].growth)
    assert np.all(np.diff(s.elevation_m, axis=0) >= -1e-9)
    g = SCENARIOS["flat_basin"].growth
    b = grow(g)
    # no production, uniform rain: thickness = rate * time (closed form)
    np.testing.assert_allclose(b.elevation_m[-1] - b.elevation_m[0],
                               g.pelagic_m_per_kyr * g.n_steps * g.step_kyr, rtol=1e-12)


def test_surface_production_builds_platform_top_to_sea_level():
    # common practice, no source: with production concentrated at the surface the
    # platform top of a grown margin builds to within about a metre of sea level
    s = grow(SCENARIOS["rimmed_shelf"].growth)
    water = s.final_sea_level_m - s.elevation_m[-1]
    m = profile_margin(s.x_m, water)
    top = water[: m["break"] - 10]
    assert top.size > 50
    assert np.all(np.abs(top) <= 1.0)


def test_deep_production_mode_puts_crest_and_steepest_slope_deeper():
    # common practice, no source: with a second production maximum at ~50-80 m the
    # margin crest and steepest slope sit correspondingly deeper
    shallow = grow(SCENARIOS["rimmed_shelf"].growth)
    deep_params = SCENARIOS["deep_factory_shelf"].growth
    deep = grow(deep_params)
    w_sh = shallow.final_sea_level_m - shallow.elevation_m[-1]
    w_dp = deep.final_sea_level_m - deep.elevation_m[-1]
    m_sh, m_dp = profile_margin(shallow.x_m, w_sh), profile_margin(deep.x_m, w_dp)
    assert w_sh[m_sh["break"]] < 10.0
    assert w_dp[m_dp["break"]] > w_sh[m_sh["break"]] + 20.0
    dip = np.gradient(w_dp, deep.x_m)
    steepest_wd = w_dp[np.argmax(dip)]
    lo = deep_params.deep_depth_m - 2 * deep_params.deep_width_m
    hi = deep_params.deep_depth_m + 2 * deep_params.deep_width_m
    assert lo <= steepest_wd <= hi
    # in-situ growth in the deep factory stands steeper than loose sediment
    assert np.degrees(np.arctan(dip.max())) > deep_params.stable_slope_deg


def test_fines_go_to_the_basin_which_thickens_basinward_of_the_toe():
    # common practice, no source: produced sediment is exported from the shallow
    # factory to the slope and the finest to the basin
    s = grow(SCENARIOS["rimmed_shelf"].growth)
    water = s.final_sea_level_m - s.elevation_m[-1]
    m = profile_margin(s.x_m, water)
    th = np.diff(s.elevation_m, axis=0)
    fac = s.facies[1:]
    basin = np.where(fac == FACIES.index("basin"), th, 0.0).sum(axis=0)
    slope = np.where(fac == FACIES.index("slope"), th, 0.0).sum(axis=0)
    platform = np.where(fac == FACIES.index("platform"), th, 0.0).sum(axis=0)
    i, j = m["break"], m["toe"]
    assert basin[: i - 10].max() == 0.0
    assert basin[j: j + 40].mean() > 2 * basin[i: j - 10].mean()
    assert slope[i + 5: j - 5].mean() > basin[i + 5: j - 5].mean()
    assert platform[: i - 10].mean() > slope[: i - 10].mean()


def test_growth_parameters_refuse_bad_values():
    with pytest.raises(GeometryError, match="sides"):
        GrowthParameters(sides="x")
    with pytest.raises(GeometryError, match="stable_slope_deg"):
        GrowthParameters(stable_slope_deg=95.0)
    with pytest.raises(GeometryError, match="dx_m"):
        dataclasses.replace(GrowthParameters(), dx_m=0.0)


def test_sea_level_is_sinusoid_plus_trend():
    # eustasy A sin(2 pi t / P + phase) + trend t (definition of the model)
    g = GrowthParameters(eustasy_amplitude_m=5.0, eustasy_period_kyr=100.0, eustasy_phase_deg=90.0,
                         eustasy_trend_m_per_kyr=-0.1)
    np.testing.assert_allclose(sea_level_m([0.0, 25.0, 50.0, 100.0], g), [5.0, 0.0 - 2.5, -5.0 - 5.0, 5.0 - 10.0],
                               atol=1e-12)
