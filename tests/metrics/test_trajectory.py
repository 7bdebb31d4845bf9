"""Shelf-break trajectory on hand-computed break sets (Helland-Hansen & Martinsen 1996)."""

import dataclasses

import numpy as np
import pytest
from numpy.testing import assert_allclose

from clinometry.metrics.margin_geometry import margin_geometry
from clinometry.metrics.trajectory import TRAJECTORY_FLAT_DEG, trajectory_from_breaks, trajectory_metrics


def test_ascending_hand_computed():
    # by hand: breaks rise 70 m per 1000 m -> atan(0.07) = 4.0042 deg, A/P = 0.07; beyond
    # the +-2 deg flat band (TRAJECTORY_FLAT_DEG, chosen here) with no scatter: ascending
    t = trajectory_from_breaks([0.0, 1000.0, 2000.0], [300.0, 230.0, 160.0])
    assert_allclose(t["angle_deg"], np.degrees(np.arctan(0.07)), rtol=1e-9)
    assert t["class"] == "ascending"
    assert t["progradation_m"] == pytest.approx(2000.0)
    assert t["aggradation_m"] == pytest.approx(140.0)
    assert t["ratio"] == pytest.approx(0.07)
    assert_allclose(t["step_angles_deg"], [np.degrees(np.arctan(0.07))] * 2, rtol=1e-9)
    assert t["n_breaks"] == 3 and t["backstepping"] is False


def test_descending_hand_computed():
    # by hand: breaks drop 200 m over 2000 m -> -atan(0.1) = -5.7106 deg
    t = trajectory_from_breaks([0.0, 2000.0], [300.0, 500.0])
    assert_allclose(t["angle_deg"], -np.degrees(np.arctan(0.1)), rtol=1e-9)
    assert t["class"] == "descending"


def test_flat_within_band_and_exactly_at_band():
    # by hand: 2 m over 3000 m -> 0.0382 deg, inside the +-2 deg band (band chosen here)
    t = trajectory_from_breaks([0.0, 3000.0], [300.0, 298.0])
    assert_allclose(t["angle_deg"], np.degrees(np.arctan(2.0 / 3000.0)), rtol=1e-12)
    assert t["class"] == "flat"
    # exactly at the band edge counts as flat (|angle| <= band)
    rise = 1000.0 * np.tan(np.radians(TRAJECTORY_FLAT_DEG))
    assert trajectory_from_breaks([0.0, 1000.0], [300.0, 300.0 - rise])["class"] == "flat"
    assert trajectory_from_breaks([0.0, 1000.0], [300.0, 300.0 - 1.01 * rise])["class"] == "ascending"


def test_backstepping_keeps_elevation_angle():
    # break moves 500 m landward while rising 50 m: elevation angle atan(50 / 500) = 5.71 deg
    t = trajectory_from_breaks([1000.0, 500.0], [300.0, 250.0])
    assert t["backstepping"] is True
    assert_allclose(t["angle_deg"], np.degrees(np.arctan(0.1)), rtol=1e-12)
    assert t["ratio"] == pytest.approx(-0.1)


def test_trajectory_metrics_from_clinoform_breaks(build_margin, planar):
    # three clinoforms, breaks at basinward 500, 750, 1000 m and depths 300, 275, 250 m:
    # 50 m rise over 500 m -> atan(0.1) = 5.7106 deg, well beyond the +-2 deg band
    clinos = [(planar(20.0, top_m=300.0, x_break=500.0, x_toe=900.0), 20, 36),
              (planar(20.0, top_m=275.0, x_break=750.0, x_toe=1150.0), 30, 46),
              (planar(20.0, top_m=250.0, x_break=1000.0, x_toe=1400.0), 40, 56)]
    for direction in ("+", "-"):
        picks, section = build_margin(planar(20.0, top_m=250.0), clinoforms=clinos, direction=direction)
        g = margin_geometry(picks, picks.margins[0], section)
        t = trajectory_metrics(g)["trajectory"]
        assert_allclose(t["angle_deg"], np.degrees(np.arctan(50.0 / 500.0)), rtol=1e-9)
        assert t["class"] == "ascending"
        assert t["progradation_m"] == pytest.approx(500.0)
        assert [p["depth_m"] for p in t["breaks"]] == pytest.approx([300.0, 275.0, 250.0])


def test_dip_field_breaks_are_not_mixed_with_the_profile_break(build_margin, planar):
    # two older clinoforms followed through the dip field (breaks at 500 and 750 m, 300 and 290 m
    # deep) and the outer profile's break on the platform-top reflection 40 m shallower at 1000 m:
    # only the two dip-field breaks define the line, 10 m rise over 250 m -> atan(0.04) = 2.2906 deg
    # (with the profile break, the median of the pairwise slopes 0.04, 0.1, 0.16 gives atan(0.1) = 5.71 deg)
    clinos = [(planar(20.0, top_m=300.0, x_break=500.0, x_toe=900.0), 20, 36),
              (planar(20.0, top_m=290.0, x_break=750.0, x_toe=1150.0), 30, 46),
              (planar(20.0, top_m=250.0, x_break=1000.0, x_toe=1400.0), 40, 56)]
    picks, section = build_margin(planar(20.0, top_m=250.0), clinoforms=clinos)
    m = picks.margins[0]
    tagged = tuple(dataclasses.replace(c, source="dip_field") for c in m.clinoforms[:2]) + m.clinoforms[2:]
    picks = dataclasses.replace(picks, margins=(dataclasses.replace(m, clinoforms=tagged),))
    t = trajectory_metrics(margin_geometry(picks, picks.margins[0], section))["trajectory"]
    assert_allclose(t["angle_deg"], np.degrees(np.arctan(10.0 / 250.0)), rtol=1e-9)
    assert (t["n_breaks"], t["break_source"], t["n_clinoforms_left_out"]) == (2, "dip_field", 1)
    # untagged (all from tracked surfaces) the same three breaks are used together
    plain, section = build_margin(planar(20.0, top_m=250.0), clinoforms=clinos)
    t_all = trajectory_metrics(margin_geometry(plain, plain.margins[0], section))["trajectory"]
    assert (t_all["n_breaks"], t_all["break_source"], t_all["n_clinoforms_left_out"]) == (3, "surface", 0)
    assert_allclose(t_all["angle_deg"], np.degrees(np.arctan(0.1)), rtol=1e-9)


def test_trajectory_missing_with_fewer_than_two_breaks(build_margin, planar):
    clinos = [(planar(20.0), 40, 80), (planar(20.0, top_m=190.0), None, 80)]
    picks, section = build_margin(planar(20.0), clinoforms=clinos)
    out = trajectory_metrics(margin_geometry(picks, picks.margins[0], section))
    assert out["trajectory"] is None
    assert "1 clinoform break(s) picked out of 2" in out["missing"]["trajectory"]


def test_theil_sen_angle_through_several_breaks_hand_computed():
    # by hand: b = 0, 1000, 2000, 3000 m; elevation -d = -300, -290, -295, -280 m;
    # the six pairwise slopes are 0.01, 0.0025, 0.02/3, -0.005, 0.005, 0.015; their median
    # (0.005 + 0.02/3) / 2 = 0.0058333 -> atan = 0.3342236 deg (Theil 1950; Sen 1968, from memory)
    t = trajectory_from_breaks([0.0, 1000.0, 2000.0, 3000.0], [300.0, 290.0, 295.0, 280.0])
    assert_allclose(t["angle_deg"], np.degrees(np.arctan((0.005 + 0.02 / 3) / 2)), rtol=1e-9)
    assert_allclose(t["angle_deg"], 0.3342216, rtol=1e-6)
    # net path: 20 m over 3000 m -> atan(20 / 3000) = 0.381966 deg
    assert_allclose(t["net_angle_deg"], 0.3819660, rtol=1e-6)
    # a third of a degree lies inside the +-2 deg band: not ascending
    assert t["class"] in ("flat", "unresolved", "flat_or_ascending", "flat_or_descending")
    assert t["angle_p10_deg"] < 2.0
    # backstepping breaks are fitted in their own (landward) sense: still rising
    back = trajectory_from_breaks([3000.0, 2000.0, 1000.0, 0.0], [300.0, 290.0, 295.0, 280.0])
    assert_allclose(back["angle_deg"], 0.3342216, rtol=1e-6)
    assert back["backstepping"] is True


def test_one_wild_break_does_not_decide_the_class():
    # seven breaks on a line rising 5 deg basinward, the youngest 120 m too deep (a break
    # followed onto a side lobe): the median of pairwise slopes stays on the line, while a
    # least-squares line (numpy.polyfit as the reference fitter) is pulled to a fall
    b = np.arange(7) * 100.0
    d = 300.0 - b * np.tan(np.radians(5.0))
    d[-1] += 120.0
    t = trajectory_from_breaks(b, d, depth_sigma_m=1.0)
    assert np.polyfit(b, -d, 1)[0] < 0
    # 15 of the 21 pairwise slopes are exactly tan(5 deg): the median is that slope
    assert_allclose(t["angle_deg"], 5.0, rtol=1e-9)
    assert t["class"] == "ascending"


def test_flat_band_widens_to_the_pick_uncertainty_hand_computed():
    # two breaks 400 m apart, 2.5 m rise, 10 m depth error each, no position error:
    # Sxx = 2 * 200^2 = 80000 m^2, sigma_slope = 10 / sqrt(80000) = 0.0353553,
    # sigma_angle = deg(0.0353553 / (1 + 0.00625^2)) = 2.0256 deg; band = 1.2816 sigma
    # = 2.596 deg, wider than the 2 deg tolerance (standard error of a least-squares slope,
    # Press et al. 2007, Numerical Recipes ch. 15, from memory; 1.2816 = z of the 90th
    # percentile, standard normal table)
    t = trajectory_from_breaks([0.0, 400.0], [300.0, 297.5], depth_sigma_m=10.0)
    assert_allclose(t["angle_deg"], np.degrees(np.arctan(2.5 / 400.0)), rtol=1e-12)
    assert_allclose(t["angle_sigma_deg"], np.degrees(0.0353553390593 / (1 + 0.00625 ** 2)), rtol=1e-9)
    assert_allclose(t["flat_band_deg"], 1.2815515655 * t["angle_sigma_deg"], rtol=1e-9)
    assert t["sign_resolved"] is False
    # the P10-P90 range spans the whole band: the breaks cannot tell the class
    assert t["angle_p10_deg"] < -2.0 and t["angle_p90_deg"] > 2.0
    assert t["class"] == "unresolved" and "the breaks do not tell the class" in t["class_reason"]
    # over 4 km: sigma = deg(2.5 / sqrt(2 * 2000^2)) = 0.0506 deg, band = the 2 deg tolerance,
    # and a 300 m rise (atan(300 / 4000) = 4.29 deg) is ascending
    far = trajectory_from_breaks([0.0, 4000.0], [300.0, 0.0], depth_sigma_m=2.5)
    assert far["flat_band_deg"] == pytest.approx(2.0)
    assert far["class"] == "ascending" and far["sign_resolved"] is True
    assert far["angle_p10_deg"] > 2.0


def test_scatter_of_many_breaks_sets_the_band():
    # nine breaks on a line rising 5 deg basinward with 40 m of seeded normal scatter: the
    # a-posteriori error from the residuals exceeds the 1 m a-priori error, and the P10-P90
    # range reaches into the flat band (flat_or_ascending)
    rng = np.random.default_rng(0)
    b = np.arange(9) * 100.0
    d = 300.0 - b * np.tan(np.radians(5.0)) + rng.normal(0.0, 40.0, 9)
    t = trajectory_from_breaks(b, d, depth_sigma_m=1.0)
    # by hand: Theil-Sen slope (median of pairwise slopes, intercept median(y) - slope *
    # median(x), as scipy.stats.theilslopes), residuals r, robust sigma 1.4826 * MAD(r)
    # (Rousseeuw & Croux 1993, from memory), standard error sigma * sqrt(n / (n - 2) / Sxx)
    x, y = b, -d
    i, j = np.triu_indices(9, 1)
    slope = np.median((y[j] - y[i]) / (x[j] - x[i]))
    r = y - (np.median(y) - slope * np.median(x)) - slope * x
    sig = 1.482602218505602 * np.median(np.abs(r - np.median(r)))
    se = sig * np.sqrt(9 / 7 / np.sum((x - x.mean()) ** 2))
    assert_allclose(t["angle_deg"], np.degrees(np.arctan(slope)), rtol=1e-9)
    assert_allclose(t["angle_sigma_deg"], np.degrees(se / (1 + slope ** 2)), rtol=1e-9)
    # P10/P90 of a slope whose error comes from the scatter: Student's t with n - 2 = 7 degrees
    # of freedom, t_0.9 = 1.415 (t table, from memory)
    assert_allclose(t["flat_band_deg"], 1.415 * np.degrees(se / (1 + slope ** 2)), rtol=1e-3)
    assert_allclose(t["angle_p90_deg"], np.degrees(np.arctan(slope + 1.415 * se)), rtol=1e-3)
    assert t["angle_p10_deg"] < 2.0 < t["angle_p90_deg"] and t["class"] == "flat_or_ascending"
    # without the scatter the same line is ascending
    assert trajectory_from_breaks(b, 300.0 - b * np.tan(np.radians(5.0)), depth_sigma_m=1.0)["class"] == "ascending"


def test_breaks_on_one_trace_are_vertical_or_flat():
    # all breaks on one trace: pure aggradation (+90 deg) when the rise exceeds
    # 1.28 * sqrt(2) depth errors, else flat (nothing resolved)
    up = trajectory_from_breaks([500.0, 500.0], [300.0, 280.0], depth_sigma_m=2.5)
    assert (up["angle_deg"], up["class"], up["angle_sigma_deg"]) == (90.0, "ascending", None)
    assert "pure aggradation" in up["class_reason"] and "20.0 m apart" in up["class_reason"]
    same = trajectory_from_breaks([500.0, 500.0], [300.0, 298.0], depth_sigma_m=2.5)
    assert same["class"] == "flat" and same["sign_resolved"] is False


def test_repeated_clinoform_break_counted_once(build_margin, planar):
    # two clinoforms tracked on the same surface (same break) plus one older: two distinct breaks
    clinos = [(planar(20.0, top_m=300.0, x_break=500.0, x_toe=900.0), 20, 36),
              (planar(20.0, top_m=250.0, x_break=1000.0, x_toe=1400.0), 40, 56),
              (planar(20.0, top_m=250.0, x_break=1000.0, x_toe=1400.0), 40, 56)]
    picks, section = build_margin(planar(20.0, top_m=250.0), clinoforms=clinos, dz=1.0)
    t = trajectory_metrics(margin_geometry(picks, picks.margins[0], section))["trajectory"]
    assert t["n_breaks"] == 2 and t["n_repeated_breaks"] == 1
    # 50 m rise over 500 m: atan(0.1) = 5.71 deg, well outside the +-2 deg band
    assert_allclose(t["angle_deg"], np.degrees(np.arctan(0.1)), rtol=1e-9)
    assert t["class"] == "ascending"
    only = [(planar(20.0, top_m=280.0, x_break=1000.0, x_toe=1400.0), 40, 56)] * 2
    picks, section = build_margin(planar(20.0, top_m=280.0), clinoforms=only, dz=1.0)
    out = trajectory_metrics(margin_geometry(picks, picks.margins[0], section))
    assert out["trajectory"] is None
    assert "1 repeating an earlier break" in out["missing"]["trajectory"]
