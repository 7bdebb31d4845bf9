"""Analytic forward model: profiles, mounds and saddles, fill and drape, ramps, truth."""

import dataclasses

import numpy as np
import pytest
from scipy.integrate import cumulative_trapezoid

from clinometry.classify.thresholds import DEFAULT_THRESHOLDS
from clinometry.errors import GeometryError
from clinometry.synth import ANALYTIC_SCENARIOS, GROUPS, make_line
from clinometry.synth.analytic import RAMP_MAX_SLOPE_DEG, STEEP_MIN_SLOPE_DEG, build
from clinometry.synth.bodies import Layers
from clinometry.synth.growth import FACIES
from clinometry.synth.profiles import Foreset, foreset_lengths_m, profile_depth_m, profile_dip
from clinometry.synth.truth import profile_margin

LINES = {name: make_line(name, noise=False) for name in ANALYTIC_SCENARIOS}


def _built(name):
    return build(ANALYTIC_SCENARIOS[name].setting)


@pytest.mark.parametrize("foreset", [Foreset(20.0, 40.0, 150.0), Foreset(40.0, 30.0, 100.0, top_dip_deg=1.0),
                                     Foreset(0.6, 4000.0, 4000.0), Foreset(16.0, 40.0, 500.0)])
def test_profile_depth_is_the_integral_of_its_dip(foreset):
    # fundamental theorem of calculus: depth(u) - depth(u0) = integral of the dip;
    # the floor lies exactly relief_m below the break (definition)
    u = np.linspace(-500.0, 15000.0, 200001)
    d = profile_depth_m(u, break_depth_m=100.0, relief_m=90.0, foreset=foreset)
    integral = d[0] + cumulative_trapezoid(profile_dip(u, relief_m=90.0, foreset=foreset), u, initial=0.0)
    np.testing.assert_allclose(d, integral, atol=1e-3)
    assert d[-1] == pytest.approx(190.0, abs=1e-9)
    assert profile_depth_m(0.0, break_depth_m=100.0, relief_m=90.0, foreset=foreset) == pytest.approx(100.0)


def test_planar_foreset_dips_at_its_slope_and_the_lengths_hold_the_relief():
    # plane geometry: relief = w_b (t0 + T) / 2 + P T + w_t T / 2 for half-cosine transitions
    f = Foreset(22.0, break_width_m=40.0, toe_width_m=200.0)
    wb, p, wt = foreset_lengths_m(240.0, f)
    t = np.tan(np.radians(22.0))
    assert wb * t / 2 + p * t + wt * t / 2 == pytest.approx(240.0)
    u = np.linspace(wb + 1.0, wb + p - 1.0, 50)
    np.testing.assert_allclose(profile_dip(u, relief_m=240.0, foreset=f), t)
    with pytest.raises(GeometryError, match="slope_deg"):
        Foreset(85.0)


def test_single_mound_has_two_flanks_facing_away_at_their_design_slope():
    # an isolated build-up sheds to both sides: basinward "-" on its left, "+" on its right
    # (common practice, no source); a planar flank wider than the 150 m slope base has a
    # max secant equal to its dip (plane geometry)
    m = LINES["mound_single"][1]["margins"]
    assert [x["direction"] for x in m] == ["-", "+"]
    for x in m:
        assert x["slope_max_deg"] == pytest.approx(40.0, abs=0.1)
        assert x["family"] == "steep_margin"  # > 30 deg: Kenter 1990 (from memory)
        sign = 1 if x["direction"] == "+" else -1
        assert sign * (x["toe"]["trace"] - x["break"]["trace"]) > 0
        assert x["trajectory"]["class"] == "ascending"  # older stages lower and narrower
    asym = LINES["mound_asymmetric"][1]["margins"]
    # designed 55 and 22 deg flanks (settings table); planar, so the fitted dips are the design dips
    assert [x["family"] for x in asym] == ["steep_margin", "rimmed_shelf"]
    np.testing.assert_allclose([x["slope_max_deg"] for x in asym], [55.0, 22.0], atol=1.0)


@pytest.mark.parametrize("name", ["mound_pair_wide", "mound_pair_narrow", "mound_pair_drape"])
def test_mound_pair_flanks_face_each_other_across_the_saddle(name):
    m = LINES[name][1]["margins"]
    assert [(x["direction"], x["role"]) for x in m] == [("-", "outer"), ("+", "saddle"), ("-", "saddle"), ("+", "outer")]
    a, b = m[1], m[2]
    # facing flanks: A's break left of B's, both toes between the two breaks
    assert a["break"]["trace"] < a["toe"]["trace"] <= b["toe"]["trace"] < b["break"]["trace"]
    np.testing.assert_allclose([a["slope_max_deg"], b["slope_max_deg"]], [34.0, 36.0] if "narrow" in name or
                               "drape" in name else [36.0, 44.0], atol=0.2)


def test_narrow_saddle_is_narrow_and_shallower_than_the_outer_floor():
    m = LINES["mound_pair_narrow"][1]["margins"]
    dx = LINES["mound_pair_narrow"][1]["trace_spacing_m"]
    assert (m[2]["toe"]["trace"] - m[1]["toe"]["trace"]) * dx <= 200.0
    assert m[1]["toe"]["depth_m"] < m[0]["toe"]["depth_m"] - 80.0
    wide = LINES["mound_pair_wide"][1]["margins"]
    assert (wide[2]["toe"]["trace"] - wide[1]["toe"]["trace"]) * dx >= 1000.0


@pytest.mark.parametrize("name", sorted(n for n in ANALYTIC_SCENARIOS if LINES[n][1]["margins"]))
def test_truth_relief_is_toe_minus_break_of_the_exact_surface(name):
    built = _built(name)
    for fl, m in zip(built.flanks, LINES[name][1]["margins"]):
        final = built.depth_m[fl.stage_rows[-1]]
        if m["break"] is None:  # a ramp: relief over its descending span
            sp = m["span"]
            lo, hi = (sp["trace_from"], sp["trace_to"]) if m["direction"] == "+" else (sp["trace_to"], sp["trace_from"])
            assert m["relief_m"] == pytest.approx(final[hi] - final[lo])
            continue
        assert m["break"]["depth_m"] == pytest.approx(final[m["break"]["trace"]])
        assert m["relief_m"] == pytest.approx(final[m["toe"]["trace"]] - final[m["break"]["trace"]])
        run = abs(m["toe"]["distance_m"] - m["break"]["distance_m"])
        assert m["slope_mean_deg"] == pytest.approx(np.degrees(np.arctan(m["relief_m"] / run)))
        # the truth is profile_margin on the exact surface, as for grown lines
        s = np.abs(np.arange(fl.indices.size) * built.x_m[1])
        pm = profile_margin(s, final[fl.indices], depth_sample_m=None)
        assert fl.indices[pm["break"]] == m["break"]["trace"] and fl.indices[pm["toe"]] == m["toe"]["trace"]


@pytest.mark.parametrize("name", sorted(ANALYTIC_SCENARIOS))
def test_surfaces_never_cross_and_families_follow_the_slope_bounds(name):
    built = _built(name)
    assert np.all(np.diff(built.depth_m, axis=0) <= 1e-9)  # deposition only: younger never deeper
    sc = ANALYTIC_SCENARIOS[name]
    for m in LINES[name][1]["margins"]:
        if m["family"] == "ramp":
            assert m["slope_max_deg"] < 1.5  # ramps: gentle, ~1 deg or less (Read 1985, from memory)
        else:
            # family bound 30 deg (Kenter 1990; Schlager & Ginsburg 1981, from memory), kept >= 4 deg away
            assert abs(m["slope_max_deg"] - STEEP_MIN_SLOPE_DEG) >= 4.0 - 1e-6
            assert m["family"] == ("steep_margin" if m["slope_max_deg"] > STEEP_MIN_SLOPE_DEG else "rimmed_shelf")
        if sc.family not in (None, "mixed"):
            assert m["family"] == sc.family
        if sc.trajectory:
            assert m["trajectory"]["class"] == sc.trajectory


def test_family_bounds_are_the_classifier_table():
    assert STEEP_MIN_SLOPE_DEG == DEFAULT_THRESHOLDS["steep_min_slope_deg"].value
    assert RAMP_MAX_SLOPE_DEG == DEFAULT_THRESHOLDS["ramp_max_slope_deg"].value


@pytest.mark.parametrize("name", ["mound_drape", "mound_pair_drape", "margin_drape", "margin_thick_drape"])
def test_drape_is_not_a_margin_and_its_relief_decreases_upward(name):
    sc = ANALYTIC_SCENARIOS[name]
    bare = sc.with_options(setting=dataclasses.replace(sc.setting, fills=()))
    # the truth lists the flanks of the carbonate body only: the same with or without the drape
    assert make_line(bare, noise=False)[1]["margins"] == LINES[name][1]["margins"]
    built = _built(name)
    drape = built.depth_m[built.body_rows[-1] + 1:]
    crest = built.depth_m[built.body_rows[-1]].min()
    above = drape[drape.min(axis=1) < crest - 1e-6]  # layers that cover the body
    relief = above.max(axis=1) - above.min(axis=1)
    assert relief.size >= 3 and relief[0] > 10.0
    assert np.all(np.diff(relief) < 0)  # differential compaction after deposition (Athy 1930, from memory)


def test_onlapping_fill_stops_on_the_slope_and_thick_drape_covers_the_platform():
    built = _built("margin_onlap_fill")
    m = LINES["margin_onlap_fill"][1]["margins"][0]
    carb = built.depth_m[built.body_rows[-1]]
    top = built.depth_m[-1]
    assert np.all(top[: m["break"]["trace"]] == carb[: m["break"]["trace"]])  # no fill on the platform top
    assert top[m["toe"]["trace"] + 10] < carb[m["toe"]["trace"] + 10] - 100.0  # the basin is filled
    thick = _built("margin_thick_drape")
    carb = thick.depth_m[thick.body_rows[-1]]
    assert np.all(thick.depth_m[-1] < carb - 100.0)  # covered everywhere by > 100 m


def test_back_tilted_fill_dips_towards_the_platform_above_the_toe_older_layers_most():
    built = _built("margin_backtilted_fill")
    m = LINES["margin_backtilted_fill"][1]["margins"][0]  # faces "-": the basin lies at small x
    fill = built.depth_m[built.body_rows[-1] + 1:]
    toe = m["toe"]["trace"]
    near, far = toe - 20, toe - 60
    dips = fill[:, near] - fill[:, far]  # deeper near the toe: dips back towards the platform
    assert np.all(dips[:-1] > 0) and np.all(np.diff(dips) < 1e-9)
    assert np.degrees(np.arctan(dips[0] / (40 * built.x_m[1]))) > 1.0


def test_dipping_fill_dips_basinward_and_downlaps_the_floor():
    built = _built("margin_dipping_fill")
    first = built.body_rows[-1] + 1
    oldest = built.depth_m[first]
    carb = built.depth_m[first - 1]
    thick = carb - oldest
    on = np.flatnonzero(thick > 1e-6)
    assert on.size and on[-1] < built.x_m.size - 1  # pinches out basinward: downlap
    seg = oldest[on[0] + 5: on[-1] - 5]
    assert np.all(np.diff(seg) > 0)  # deepens basinward


@pytest.mark.parametrize("name", GROUPS["ramps"])
def test_ramps_have_no_break_a_gentle_slope_and_low_curvature(name):
    (m,) = LINES[name][1]["margins"]
    assert m["break"] is None and m["toe"] is None and m["break_reason"]
    assert m["family"] == "ramp" and 0.2 <= m["slope_max_deg"] <= 1.5
    # a break is sharp above 0.1 /km (the classifier's bound, chosen there); these stay far below it
    assert m["max_curvature_per_km"] < 0.25 * DEFAULT_THRESHOLDS["sharp_break_min_curvature_per_km"].value
    span_km = (m["span"]["distance_to_m"] - m["span"]["distance_from_m"]) / 1000.0
    assert span_km > 5.0  # "over many km" (Burchette & Wright 1992, from memory)


def test_no_margin_lines_and_fold_dip_formula():
    for name in GROUPS["no margin"]:
        assert LINES[name][1]["margins"] == []
    # a fold A sin(2 pi x / L) dips at most atan(2 pi A / L) (calculus)
    lay = ANALYTIC_SCENARIOS["folded_layers"].setting.body
    built = _built("folded_layers")
    dip = np.degrees(np.arctan(np.abs(np.diff(built.depth_m[1], axis=-1)) / built.x_m[1]))
    assert dip.max() == pytest.approx(np.degrees(np.arctan(2 * np.pi * lay.fold_amplitude_m / lay.fold_wavelength_m)),
                                      abs=0.05)
    assert isinstance(lay, Layers)


def test_white_noise_line_is_standard_normal_with_a_flat_spectrum():
    sec, truth = make_line("white_noise", seed=3)
    a = sec.values.astype(np.float64)
    assert truth["snr"] is None and truth["wavelet"]["type"] == "none"
    assert abs(a.mean()) < 0.01 and a.std() == pytest.approx(1.0, abs=0.01)  # N(0, 1) by construction
    spec = (np.abs(np.fft.rfft(a, axis=1)) ** 2).mean(axis=0)
    half = spec.size // 2
    assert spec[1:half].mean() == pytest.approx(spec[half:].mean(), rel=0.05)  # white: flat power spectrum


def test_reverse_polarity_gain_step_scale_and_dead_traces_on_an_analytic_line():
    base, _ = make_line("mound_single", seed=2, snr=4.0)
    rev, _ = make_line("mound_single", seed=2, snr=4.0, polarity_reversed=True)
    np.testing.assert_array_equal(rev.values, -base.values)  # SEG reverse polarity (common practice, no source)
    step, truth = make_line("mound_single", seed=2, snr=4.0, gain_step=(150, 3.0))
    np.testing.assert_array_equal(step.values[:150], base.values[:150])
    np.testing.assert_allclose(step.values[150:], 3.0 * base.values[150:], rtol=1e-6)
    assert truth["conditions"]["gain_step"]["trace"] == 150
    scaled, truth = make_line("mound_single", seed=2, snr=4.0, amplitude_scale=1e-3)
    np.testing.assert_allclose(scaled.values, 1e-3 * base.values, rtol=1e-5, atol=1e-12)
    assert truth["conditions"]["amplitude_scale"] == 1e-3
    dead, truth = make_line("mound_single", seed=2, dead_traces=[0, 7])
    np.testing.assert_array_equal(dead.values[[0, 7]], 0.0)
    assert truth["dead_traces"] == [0, 7] and np.all(np.any(dead.values[1:7] != 0, axis=1))
    with pytest.raises(GeometryError, match="gain_step"):
        make_line("mound_single", gain_step=(10_000, 3.0))


def test_noise_at_the_stated_snr_on_an_analytic_line():
    clean, _ = make_line("margin_onlap_fill", seed=4, noise=False)
    noisy, truth = make_line("margin_onlap_fill", seed=4, snr=1.5)
    noise = noisy.values.astype(np.float64) - clean.values
    # SNR = RMS(noise-free section) / RMS(noise) (the stated definition)
    assert np.sqrt(np.mean(clean.values.astype(np.float64) ** 2)) / np.sqrt(np.mean(noise ** 2)) == pytest.approx(1.5,
                                                                                                             rel=1e-3)


def test_depth_domain_analytic_line_and_mound_top_is_a_positive_peak():
    sd, td = make_line("mound_single", domain="depth", dz_m=2.0, noise=False)
    m = td["margins"][0]
    assert sd.attrs["domain"] == "depth" and m["break"]["z"] == m["break"]["depth_m"]
    assert td["n_samples"] * 2.0 >= ANALYTIC_SCENARIOS["mound_single"].max_depth_m
    # overburden over limestone: impedance rises, a peak on zero-phase SEG normal polarity
    # (common practice, no source)
    crest = int(np.mean([td["margins"][0]["break"]["trace"], td["margins"][1]["break"]["trace"]]))
    top = m["platform_top"]["depth_m"]
    z = sd["z"].values
    win = np.abs(z - top) <= 8.0
    assert abs(z[win][np.argmax(sd.values[crest, win])] - top) <= 4.0
    assert FACIES.index("platform") == 1


@pytest.mark.parametrize("seed", [1, 2])
@pytest.mark.parametrize("name", ["mound_pair_narrow", "margin_backtilted_fill", "ramp_distally_steepened",
                                  "margin_steep_flat"])
def test_drawn_geometry_keeps_flanks_families_and_trajectory_class(name, seed):
    from clinometry.synth.settings import draw_variant

    sc = draw_variant(name, seed)
    assert sc == draw_variant(name, seed) and sc.name == f"{name}@{seed}"
    assert sc.setting != ANALYTIC_SCENARIOS[name].setting
    nominal = LINES[name][1]["margins"]
    drawn = make_line(sc, noise=False)[1]["margins"]
    assert [(m["direction"], m["family"]) for m in drawn] == [(m["direction"], m["family"]) for m in nominal]
    for m in drawn:
        assert m["family"] == "ramp" or abs(m["slope_max_deg"] - STEEP_MIN_SLOPE_DEG) >= 4.0
        if ANALYTIC_SCENARIOS[name].trajectory:
            assert m["trajectory"]["class"] == ANALYTIC_SCENARIOS[name].trajectory
