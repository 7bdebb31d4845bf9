"""Rule classifier: families, subtypes, confidence at bounds, reasons and hints."""

import numpy as np
import pytest

from clinometry.classify import classify
from clinometry.classify.rules import classify_rules
from clinometry.errors import PluginError, ThresholdsError
from clinometry.metrics.metric_records import MarginMetrics

RIMMED_GOOD = {"topset_gradient_deg": 0.02, "break_curvature_per_km": 0.4, "relief_m": 250.0}


def test_gentle_slope_is_ramp():
    # Read (1985, AAPG Bull. 69: 1-21): ramps dip generally < 1 deg (from memory); the
    # table's bound is twice that, 2 deg (chosen here); the score is logistic in ln(slope / bound)
    c = classify({"slope_max_deg": 0.4, "break_curvature_per_km": 0.01})
    assert (c.family, c.subtype) == ("ramp", "homoclinal_ramp")
    assert c.confidence > 0.9
    assert c.scores["ramp"] == pytest.approx(1 - 1 / (1 + np.exp(-np.log(0.4 / 2.0) / 0.25)))


def test_flat_topped_break_is_rimmed_shelf():
    # Read (1985); Schlager (2005): rimmed shelf = flat top, break into a slope of
    # a few to ~30 deg (from memory)
    c = classify({"slope_max_deg": 12.0, **RIMMED_GOOD})
    assert c.family == "rimmed_shelf" and c.subtype is None
    assert c.confidence > 0.9


def test_steeper_than_repose_is_steep_margin():
    # Kenter (1990, Sedimentology 37: 777-794): slopes above the angle of repose
    # (~30-35 deg) need framework or cement; Schlager & Ginsburg (1981) bypass margins (from memory)
    c = classify({"slope_max_deg": 45.0, **RIMMED_GOOD})
    assert c.family == "steep_margin"
    assert c.hints["slope_fabric"] == "rubble or in-situ framework (boundstone) slope"


@pytest.mark.parametrize("slope", [2.0, 30.0])
def test_exactly_at_a_bound_confidence_is_half(slope):
    # at a bound the two families on either side are equally likely (by construction
    # of the logistic score; bounds from Read 1985 and Kenter 1990, from memory)
    c = classify({"slope_max_deg": slope, **RIMMED_GOOD})
    assert c.confidence == pytest.approx(0.5, abs=0.01)
    c = classify({"slope_max_deg": slope})
    assert c.confidence == pytest.approx(0.5, abs=0.01)


def test_reasons_quote_values_bounds_and_sources():
    c = classify({"slope_max_deg": 28.4, **RIMMED_GOOD})
    text = "\n".join(c.reasons)
    assert ("max foreset slope 28.4° is above the ramp upper bound 2.0° (factor 14) "
            "[ramp_max_slope_deg; Read 1985; Burchette & Wright 1992, from memory; bound chosen here]") in text
    assert ("max foreset slope 28.4° is below the steep-margin lower bound 30.0° (factor 1.1) "
            "[steep_min_slope_deg; Schlager & Ginsburg 1981; Kenter 1990, from memory]") in text
    assert "agrees: break curvature 0.400/km is above the sharp-break bound 0.100/km" in text
    assert "agrees: relief 250 m is above the resolution bound 20 m (Widess 1973" in text
    assert c.reasons[0].startswith("rimmed_shelf: slope score")


def test_disagreeing_secondary_criteria_lower_confidence_not_family():
    good = classify({"slope_max_deg": 12.0, **RIMMED_GOOD})
    bad = classify({"slope_max_deg": 12.0, "topset_gradient_deg": 0.05,
                    "break_curvature_per_km": 0.01, "relief_m": 8.0})
    assert bad.family == good.family == "rimmed_shelf"
    assert bad.confidence < good.confidence - 0.1
    assert any(r.startswith("disagrees: relief 8 m is below") for r in bad.reasons)


def test_dipping_top_and_moderate_slope_is_distally_steepened_ramp():
    # Read (1985): distally steepened ramp, gradient increasing in deep water
    # without a flat-topped rim (from memory)
    c = classify({"slope_max_deg": 6.0, "topset_gradient_deg": 0.6, "relief_m": 120.0})
    assert (c.family, c.subtype) == ("ramp", "distally_steepened_ramp")
    assert any("a ramp that steepens distally" in r for r in c.reasons)


@pytest.mark.parametrize("slope,fabric", [(10.0, "mud-dominated (cohesive) slope"),
                                          (25.0, "grain-dominated (non-cohesive sand) slope"),
                                          (40.0, "rubble or in-situ framework (boundstone) slope")])
def test_kenter_slope_fabric_hint(slope, fabric):
    # Kenter (1990, Sedimentology 37: 777-794): mud < ~15 deg, grain to ~35 deg, steeper rubble/framework (from memory)
    assert classify({"slope_max_deg": slope}).hints["slope_fabric"] == fabric


def test_missing_slope_gives_no_family_with_reason():
    mm = MarginMetrics(direction="+", values={}, missing={"slope_max_deg": "profile too short to measure a slope"})
    c = classify(mm)
    assert c.family is None and c.confidence == 0.0
    assert c.reasons == ("no family: profile too short to measure a slope",)


def test_threshold_override_moves_the_bound(tmp_path):
    # with the ramp bound at 0.3 deg, a 0.5 deg slope is past it by ln(0.5/0.3)/0.25 -> score 0.89
    c = classify({"slope_max_deg": 0.5}, thresholds={"ramp_max_slope_deg": 0.3})
    assert c.family == "rimmed_shelf"
    assert c.scores["rimmed_shelf"] == pytest.approx(1 / (1 + np.exp(-np.log(0.5 / 0.3) / 0.25)), rel=1e-6)
    assert c.thresholds["ramp_max_slope_deg"] == 0.3
    p = tmp_path / "t.toml"
    p.write_text("[thresholds]\nramp_max_slope_deg = 0.3\n")
    assert classify({"slope_max_deg": 0.5}, thresholds=p).family == "rimmed_shelf"
    with pytest.raises(ThresholdsError, match="unknown threshold 'ramp'"):
        classify({"slope_max_deg": 0.5}, thresholds={"ramp": 1})


@pytest.mark.parametrize("cls", ["ascending", "flat", "descending", "flat_or_ascending", "unresolved"])
def test_trajectory_hint_is_the_metric_class_with_its_reason(cls):
    # Helland-Hansen & Martinsen (1996, from memory): classes by the sign of the angle; the
    # metric (clinometry.metrics.trajectory.interval_class) has already set the class from
    # its P10-P90 range against the flat band, so the hint repeats it and quotes why
    why = "P10-P90 -0.3 to 4.0 deg against the flat band +-2.0 deg: some reason"
    m = {"slope_max_deg": 12.0, "trajectory": {"angle_deg": 1.7, "class": cls, "class_reason": why}}
    c = classify(m)
    assert c.hints["trajectory_class"] == cls
    assert "1.70°" in c.hints["trajectory_reason"] and why in c.hints["trajectory_reason"]
    assert "Helland-Hansen & Martinsen 1996" in c.hints["trajectory_reason"]


def test_classify_from_margin_metrics_and_unknown_classifier():
    mm = MarginMetrics(direction="-", values={"slope_max_deg": 0.3}, trajectory=None)
    assert classify(mm).family == "ramp"
    assert classify_rules(mm).classifier == "rules"
    with pytest.raises(PluginError, match="no classifier plugin named 'nope'; installed: .*rules"):
        classify(mm, classifier="nope")


def test_rough_profile_is_flagged_in_reasons():
    # secant max 36 deg vs a smooth-fit max of 21 deg: factor 1.7 > 1.5 (flag chosen here)
    c = classify({"slope_max_deg": 36.0, "slope_max_fit_deg": 21.0, **RIMMED_GOOD})
    assert c.hints["profile_rough"] is True
    assert any(r.startswith("check the picks: the secant max slope 36.0° and the max slope 21.0°") for r in c.reasons)
    assert "profile_rough" not in classify({"slope_max_deg": 20.0, "slope_max_fit_deg": 19.0}).hints
