"""Ground truth: each family grown as meant, trajectories, truth vs seismic."""

import numpy as np
import pytest

from clinometry.synth import SCENARIOS, grow, make_line
from clinometry.synth.truth import profile_margin, trajectory

# family limits as stated for the forward model (issue 3; common practice, no
# source): ramps < 1.5 deg, steep margins > 35 deg, rimmed shelves in between
RAMP_MAX_DEG = 1.5
STEEP_MIN_DEG = 35.0

LINES = {name: make_line(name, noise=False) for name in SCENARIOS}


def test_profile_margin_on_a_piecewise_linear_profile():
    # a flat top, a 20 deg straight slope of 300 m relief, a flat floor: the break
    # and toe are the corners, slope = 20 deg, mean slope = 20 deg (plane geometry)
    s = np.arange(0.0, 3000.0, 5.0)
    d = 100.0 + np.clip((s - 800.0) * np.tan(np.radians(20.0)), 0.0, 300.0)
    m = profile_margin(s, d)
    toe_x = 800.0 + 300.0 / np.tan(np.radians(20.0))
    assert abs(s[m["break"]] - 800.0) <= 5.0
    assert abs(s[m["toe"]] - toe_x) <= 5.0
    np.testing.assert_allclose(m["slope_max_deg"], 20.0, atol=1e-9)
    np.testing.assert_allclose(m["relief_m"], 300.0, atol=2.0)
    np.testing.assert_allclose(m["slope_mean_deg"], 20.0, atol=0.2)
    assert profile_margin(s, np.full_like(s, 100.0)) is None


def test_trajectory_angle_of_a_straight_rising_path():
    # break rising 5 m per 100 m basinward: atan(0.05) = 2.862 deg (plane geometry)
    t = trajectory([0.0, 100.0, 200.0, 300.0], [50.0, 45.0, 40.0, 35.0])
    np.testing.assert_allclose(t["angle_deg"], np.degrees(np.arctan(0.05)))
    assert t["class"] == "ascending"
    assert trajectory([0.0, 100.0, 200.0], [10.0, 10.0, 10.0])["class"] == "flat"
    assert trajectory([0.0, 100.0, 200.0], [10.0, 20.0, 30.0])["class"] == "descending"


def test_trajectory_is_the_theil_sen_line_one_wild_break_does_not_set_it():
    # four breaks rising 5 m per 100 m and a fifth 65 m below the line: the ten pairwise
    # slopes are six of -0.05 and 0.125, 0.183, 0.3, 0.65 (worked by hand), so their median
    # (Theil 1950; Sen 1968, from memory) is -0.05: angle atan(0.05) = 2.862 deg, ascending,
    # where a least-squares line would descend
    s = [0.0, 100.0, 200.0, 300.0, 400.0]
    d = [50.0, 45.0, 40.0, 35.0, 100.0]
    t = trajectory(s, d)
    np.testing.assert_allclose(t["angle_deg"], np.degrees(np.arctan(0.05)))
    assert t["class"] == "ascending"
    assert np.polyfit(s, d, 1)[0] > 0  # least squares: depth increases basinward


@pytest.mark.parametrize("name", [n for n, s in SCENARIOS.items() if s.family])
def test_each_scenario_grows_the_family_it_was_meant_to(name):
    sec, truth = LINES[name]
    sc = SCENARIOS[name]
    assert truth["margins"], f"{name}: no margin grown"
    for m in truth["margins"]:
        assert m["family"] == sc.family
        if sc.family == "ramp":
            assert m["slope_max_deg"] < RAMP_MAX_DEG
        elif sc.family == "steep_margin":
            assert m["slope_max_deg"] > STEEP_MIN_DEG
        else:
            assert RAMP_MAX_DEG < m["slope_max_deg"] < STEEP_MIN_DEG
            # flat top: within 1 m over the kilometre behind the break
            # (common practice, no source: rimmed shelves have flat tops)
            # (not for the deep-factory crest nor the forced-regression top, which steps down)
            if name not in ("deep_factory_shelf", "falling_shelf") and sc.growth.sides == "+":
                g = grow(sc.growth)
                water = g.final_sea_level_m - g.elevation_m[-1]
                b = profile_margin(g.x_m, water)["break"]
                # the kilometre behind the break, leaving out the 200 m of rim
                n1, n2 = int(1000.0 / sc.growth.dx_m), int(200.0 / sc.growth.dx_m)
                behind = water[max(0, b - n1): b - n2]
                assert behind.size > 40 and np.ptp(behind) < 1.0
        assert m["slope_max_deg"] >= m["slope_mean_deg"] - 1e-9
        if sc.family == "ramp":
            # a ramp deepens without a break in slope or a toe (common practice, no
            # source): the truth says so instead of placing them, and measures over its span
            assert m["break"] is None and m["toe"] is None
            assert "no distinct break" in m["break_reason"] and "no distinct toe" in m["toe_reason"]
            assert m["span"]["distance_to_m"] > m["span"]["distance_from_m"]
            continue
        # geometry is consistent: relief = toe - break, mean slope = atan(relief / run)
        np.testing.assert_allclose(m["relief_m"], m["toe"]["depth_m"] - m["break"]["depth_m"])
        run = abs(m["toe"]["distance_m"] - m["break"]["distance_m"])
        np.testing.assert_allclose(m["slope_mean_deg"], np.degrees(np.arctan(m["relief_m"] / run)))
        assert m["slope_max_deg"] >= m["slope_mean_deg"] - 1e-9
        sign = 1 if m["direction"] == "+" else -1
        assert sign * (m["toe"]["trace"] - m["break"]["trace"]) > 0


@pytest.mark.parametrize("name", [n for n, s in SCENARIOS.items() if s.trajectory])
def test_trajectory_class_matches_the_scenario(name):
    _, truth = LINES[name]
    for m in truth["margins"]:
        if m["break"] is None:
            # no shelf break (a ramp), so no shelf-edge trajectory (Helland-Hansen &
            # Martinsen 1996 define it on the break, from memory)
            assert m["trajectory"] is None and SCENARIOS[name].family == "ramp"
            continue
        assert m["trajectory"]["class"] == SCENARIOS[name].trajectory
        steps = [c["step"] for c in m["clinoforms"]]
        assert steps == sorted(steps) and len(steps) >= 5  # oldest to youngest


def test_directions_isolated_flipped_and_no_margin_lines():
    assert [m["direction"] for m in LINES["isolated_platform"][1]["margins"]] == ["-", "+"]
    assert [m["direction"] for m in LINES["level_shelf"][1]["margins"]] == ["-"]
    assert [m["direction"] for m in LINES["rimmed_shelf"][1]["margins"]] == ["+"]
    assert LINES["flat_basin"][1]["margins"] == []


def test_truth_break_sits_on_the_platform_top_reflection():
    # overburden (low impedance) over platform limestone: a positive peak at the
    # top of the platform on a zero-phase, normal-polarity section (SEG normal
    # polarity convention, common practice, no source)
    sec, truth = LINES["rimmed_shelf"]
    m = truth["margins"][0]
    tr = m["break"]["trace"] - 15  # on the flat top behind the break
    z = sec["z"].values
    top_depth = m["platform_top"]["depth_m"]
    t_top = 2000.0 * top_depth / truth["velocity"]["v_m_s"]
    win = np.abs(z - t_top) <= 12.0
    z_peak = z[win][np.argmax(sec.values[tr, win])]
    assert abs(z_peak - t_top) <= sec.attrs["sample_interval"]
    assert sec.values[tr, np.argmin(np.abs(z - t_top))] > 0
