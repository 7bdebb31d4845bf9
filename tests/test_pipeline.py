"""analyze() and measure_horizon() on sections: the whole chain, checked against the
forward model's ground truth and against textbook time-depth formulas.

The synthetic line (``rimmed_shelf`` scenario, constant 2500 m/s) comes from
:mod:`clinometry.synth`; its truth JSON gives family, direction, break and
toe.  The formula checks use depth = v * t / 2 for a constant velocity and
true dip tan(theta) = (v / 2) * dt/dx (Sheriff & Geldart 1995, Exploration
Seismology, 2nd ed., from memory).
"""

import numpy as np
import numpy.testing as npt
import pytest
import xarray as xr

from clinometry.errors import ClinometryError
from clinometry.pipeline import AnalysisOptions
from clinometry.picking.picks import Horizon
from clinometry.pipeline import analyze, measure_horizon, run_analysis
from clinometry.result import Result, validate_result_dict
from clinometry.section import make_section

V_M_S = 2500.0  # the scenario's constant velocity


@pytest.fixture(scope="module")
def shelf_result(synthetic_shelf):
    section, truth = synthetic_shelf
    return analyze(section, velocity=V_M_S, uncertainty=False)


def test_synthetic_shelf_margin_and_break_match_truth(synthetic_shelf, shelf_result):
    _, truth = synthetic_shelf
    d = validate_result_dict(shelf_result.to_dict())
    assert len(d["margins"]) == len(truth["margins"]) == 1
    m, t = d["margins"][0], truth["margins"][0]
    assert m["direction"] == t["direction"] == "+"
    # break within a few hundred metres of the truth (pick tolerance: common practice, no source);
    # families of the bundled lines are checked in test_bundled_line_family_and_trajectory_match_truth
    assert abs(m["break"]["distance_m"] - t["break"]["distance_m"]) <= 300.0
    assert m["family"] in ("ramp", "rimmed_shelf", "steep_margin")


def test_point_depth_is_v_t_over_2_and_distance_from_section(synthetic_shelf, shelf_result):
    section, _ = synthetic_shelf
    for key in ("break", "toe"):
        p = shelf_result.to_dict()["margins"][0][key]
        # constant velocity: depth = v * t / 2, t in s (Sheriff & Geldart 1995, from memory)
        npt.assert_allclose(p["depth_m"], V_M_S * p["z"] / 1000.0 / 2.0, rtol=1e-6)
        npt.assert_allclose(p["distance_m"], float(section["distance"][p["trace"]]), rtol=1e-9)
        npt.assert_allclose([p["x"], p["y"]], [float(section["x"][p["trace"]]), float(section["y"][p["trace"]])])


def test_result_records_run_and_cautions(shelf_result):
    d = shelf_result.to_dict()
    assert (d["velocity"]["model"], d["velocity"]["velocity_m_s"]) == ("constant", V_M_S)
    assert d["velocity"]["default_fallback"] is False
    assert d["run"]["picker"] == "default" and d["run"]["classifier"] == "rules"
    assert d["run"]["seed"] == 0 and d["run"]["horizon_source"] == "automatic"
    assert any("drilling" in c and "regulations" in c for c in d["run"]["cautions"])
    assert Result.from_dict(d).to_dict() == d


def test_default_velocity_is_recorded_as_fallback(synthetic_shelf):
    from clinometry.depth import DEFAULT_VELOCITY_M_S, DEFAULT_VELOCITY_NOTE

    section, _ = synthetic_shelf
    d = analyze(section, uncertainty=False).to_dict()
    assert d["velocity"]["default_fallback"] is True
    assert DEFAULT_VELOCITY_NOTE in d["run"]["fallbacks"]
    p = d["margins"][0]["break"]
    # depth = v t / 2 with the default velocity (Sheriff & Geldart 1995, from memory)
    npt.assert_allclose(p["depth_m"], DEFAULT_VELOCITY_M_S * p["z"] / 2000.0, rtol=1e-6)


def test_depth_section_keeps_z_as_depth(synthetic_shelf, shelf_result):
    from clinometry.depth import ConstantVelocity, section_to_depth

    section, truth = synthetic_shelf
    dsec = section_to_depth(section, ConstantVelocity(V_M_S), dz_m=2.5)
    d = analyze(dsec, uncertainty=False).to_dict()
    assert d["source"]["domain"] == "depth"
    assert d["velocity"]["model"] == "none" and d["velocity"]["default_fallback"] is False
    m = d["margins"][0]
    tm = shelf_result.to_dict()["margins"][0]
    # the same margin in depth as in time: same direction and family
    assert (m["direction"], m["family"]) == (tm["direction"], tm["family"])
    npt.assert_allclose(m["break"]["depth_m"], m["break"]["z"])
    # same line in time and in depth: relief agrees within a few samples
    npt.assert_allclose(m["relief_m"], shelf_result.to_dict()["margins"][0]["relief_m"], rtol=0.1)


def _flat_layers():
    # flat reflectors every 60 ms: no margin anywhere (common practice, no source)
    z = np.arange(300) * 2.0
    trace = np.zeros(z.size, np.float32)
    for t0 in range(100, 560, 60):
        trace += np.exp(-(((z - t0) / 6.0) ** 2)).astype(np.float32) * (1 if t0 % 120 else -1)
    rng = np.random.default_rng(7)
    data = np.tile(trace, (200, 1)) + rng.normal(0, 0.02, (200, z.size)).astype(np.float32)
    return make_section(data, z=z, trace_spacing_m=12.5, attrs={"source_path": "flat.sgy"})


def test_line_without_margin_gives_empty_margins_with_note():
    r = analyze(_flat_layers(), velocity=V_M_S, uncertainty=False)
    d = validate_result_dict(r.to_dict())
    assert d["margins"] == []
    assert any(n.startswith("no margin found on this line") for n in d["run"]["notes"])


def test_analyze_leaves_input_section_untouched(synthetic_shelf):
    section, _ = synthetic_shelf
    before = section.copy(deep=True)
    run_analysis(section, AnalysisOptions(velocity=V_M_S, uncertainty=False))
    xr.testing.assert_identical(section, before)


def test_domain_that_contradicts_section_names_it(synthetic_shelf):
    section, _ = synthetic_shelf
    with pytest.raises(ClinometryError, match="domain='depth' was given but the section is in 'twt'"):
        analyze(section, domain="depth")


def _foreset_horizon(dip_deg=20.0, relief_ms=300.0, n=200, dx=25.0):
    """Flat top at 400 ms, a planar foreset of ``dip_deg`` true dip, flat basin floor."""
    x = np.arange(n) * dx
    # true dip -> time dip: dt/dx = 2 tan(theta) / v (Sheriff & Geldart 1995, from memory)
    z = 400.0 + np.clip((x - 2000.0) * np.tan(np.radians(dip_deg)) * 2000.0 / V_M_S, 0, relief_ms)
    sec = make_section(np.zeros((n, 600), np.float32), z=np.arange(600) * 2.0, trace_spacing_m=dx,
                       attrs={"source_path": "blank.sgy"})
    return sec, Horizon(id=0, role="user", trace=np.arange(n), z=z, quality=np.ones(n))


def test_measure_user_horizon_recovers_true_dip_and_relief():
    sec, h = _foreset_horizon(dip_deg=20.0, relief_ms=300.0)
    d = measure_horizon(h, sec, velocity=V_M_S, uncertainty=False).to_dict()
    (m,) = d["margins"]
    assert m["direction"] == "+"
    # 20 deg true dip and 300 ms * 2500 m/s / 2 = 375 m relief by construction (formulas above)
    npt.assert_allclose(m["slope_max_deg"], 20.0, atol=1.0)
    npt.assert_allclose(m["relief_m"], 375.0, rtol=0.05)
    # break at the top of the foreset (x = 2000 m), toe where it reaches 700 ms (x = 3030 m)
    npt.assert_allclose(m["break"]["distance_m"], 2000.0, atol=100.0)
    npt.assert_allclose(m["toe"]["distance_m"], 2000.0 + 375.0 / np.tan(np.radians(20.0)), atol=100.0)
    assert d["run"]["picker"] == "horizons"


def test_measure_from_csv_equals_measure_from_horizon(tmp_path):
    sec, h = _foreset_horizon()
    csv = tmp_path / "my_pick.csv"
    csv.write_text("trace,z\n" + "".join(f"{t},{float(z)!r}\n" for t, z in zip(h.trace, h.z)))
    a = measure_horizon(h, sec, velocity=V_M_S, uncertainty=False).to_dict()
    b = measure_horizon(csv, sec, velocity=V_M_S, uncertainty=False).to_dict()
    assert b["run"]["horizon_source"] == str(csv)
    assert a["margins"] == b["margins"]


def test_measure_flat_user_horizon_has_no_margin_and_says_why():
    sec, h = _foreset_horizon(relief_ms=0.0)
    d = measure_horizon(h, sec, velocity=V_M_S, uncertainty=False).to_dict()
    assert d["margins"] == []
    assert any("no leg of the horizon deepens basinward" in n for n in d["run"]["notes"])


def test_measure_mirrored_horizon_faces_minus():
    sec, h = _foreset_horizon()
    hm = Horizon(id=0, role="user", trace=h.trace, z=h.z[::-1].copy(), quality=h.quality)
    (m,) = measure_horizon(hm, sec, velocity=V_M_S, uncertainty=False).to_dict()["margins"]
    assert m["direction"] == "-"
    npt.assert_allclose(m["slope_max_deg"], 20.0, atol=1.0)


def test_uncertainty_gives_ordered_percentiles():
    sec, h = _foreset_horizon()
    d = measure_horizon(h, sec, velocity=V_M_S, uncertainty=True, seed=3).to_dict()
    unc = d["margins"][0]["uncertainty"]
    assert "relief_m" in unc
    p = unc["relief_m"]
    assert p["p10"] <= p["p50"] <= p["p90"]
    # the same seed gives the same draws
    assert measure_horizon(h, sec, velocity=V_M_S, uncertainty=True, seed=3).to_dict()["margins"] == d["margins"]


# --------------------------------------------------------------------------
# The bundled synthetic lines (synthetic_volumes/, made by clinometry.synth)

import functools  # noqa: E402
import json  # noqa: E402
from pathlib import Path  # noqa: E402

BUNDLED = Path(__file__).resolve().parents[1] / "synthetic_volumes"
LINES = sorted(p.stem for p in BUNDLED.glob("*.sgy") if (BUNDLED / f"{p.stem}.truth.json").exists()
               and json.loads((BUNDLED / f"{p.stem}.truth.json").read_text()).get("n_traces")
               and "cube" not in p.stem)


@functools.lru_cache(maxsize=None)
def _bundled(name):
    truth = json.loads((BUNDLED / f"{name}.truth.json").read_text())
    v = truth["velocity"]
    kw = {"velocity": v["v_m_s"]} if v["model"] == "constant" else {"velocity_linear": (v["v0_m_s"], v["k_per_s"])}
    return analyze(BUNDLED / f"{name}.sgy", uncertainty=False, **kw).to_dict(), truth


@pytest.mark.skipif(not LINES, reason="synthetic_volumes/ not present")
@pytest.mark.parametrize("name", LINES)
def test_bundled_line_contract_margins_and_directions(name):
    d, truth = _bundled(name)
    validate_result_dict(d)
    assert (d["source"]["n_traces"], d["source"]["n_samples"]) == (truth["n_traces"], truth["n_samples"])
    assert sorted(m["direction"] for m in d["margins"]) == sorted(m["direction"] for m in truth["margins"])
    for m in d["margins"]:
        (t,) = [t for t in truth["margins"] if t["direction"] == m["direction"]]
        if t["break"] is None:
            # a ramp has no shelf break (common practice, no source): none may be picked either
            assert m["break"] is None and m["family"] == t["family"] == "ramp"
            continue
        # break within a few hundred metres of the truth (pick tolerance: common practice, no source)
        assert abs(m["break"]["distance_m"] - t["break"]["distance_m"]) <= 300.0


def _pairs(name):
    d, truth = _bundled(name)
    tm = {t["direction"]: t for t in truth["margins"]}
    return [(m, tm[m["direction"]]) for m in d["margins"] if m["direction"] in tm]


def _got_vs_truth(name, key):
    out = []
    for m, t in _pairs(name):
        if key == "family":
            out.append((m["direction"], m["family"], round(m["slope_max_deg"], 1), t["family"], round(t["slope_max_deg"], 1)))
        else:
            mt, tt = m["trajectory"] or {}, t.get("trajectory") or {}
            out.append((m["direction"], mt.get("class"), None if mt.get("angle_deg") is None else round(mt["angle_deg"], 2),
                        None if mt.get("flat_band_deg") is None else round(mt["flat_band_deg"], 2),
                        tt.get("class"), None if tt.get("angle_deg") is None else round(tt["angle_deg"], 2)))
    return out


# Known mismatches, measured on the bundled lines with the picker of this commit, as
# {name: "(direction, got family, got slope_max_deg, truth family, truth slope_max_deg)"};
# none at present (every bundled line's family matches its truth).
_FAMILY_XFAIL = {}
# (direction, got class, got angle, got flat band, truth class, truth angle) of known
# mismatches, measured 2026-12-04 (issue 12 open): the older clinoforms' breaks are
# followed onto other reflectors on these two lines.  Older clinoforms are followed through the dip field beneath
# the outer profile (picking/clinoforms.py) and the trajectory is a Theil-Sen line through
# their breaks (Theil 1950, Sen 1968, from memory); the truth uses the same estimator
# (synth/truth.py), so deep_factory_shelf, whose true breaks step back landward early on and
# then rise, is "ascending" on both sides (a least-squares truth called it descending).
_TRAJECTORY_XFAIL = {
    # the P10-P90 range -2.8 to 5.6 deg spans the band: unresolved, not wrong, but not the class
    "deep_factory_shelf": "('+', 'unresolved', 1.42, 4.2, 'ascending', 9.63)",
    # wrong: older breaks picked on reflectors 1.3 km landward of the true ones
    "falling_shelf": "('+', 'flat_or_ascending', 1.42, 2.0, 'descending', -3.63)",
}


def _params(xfails):
    return [pytest.param(n, marks=pytest.mark.xfail(strict=True, reason=f"{n}: measured {xfails[n]}"))
            if n in xfails else n for n in LINES]


@pytest.mark.skipif(not LINES, reason="synthetic_volumes/ not present")
@pytest.mark.parametrize("name", _params(_FAMILY_XFAIL))
def test_bundled_line_family_matches_truth(name):
    # truth family from the forward model (clinometry.synth, slope bounds of Read 1985 /
    # Schlager 2005 / Kenter 1990, from memory); the classifier must recover it from the picks
    d, truth = _bundled(name)
    got = sorted((m["direction"], m["family"]) for m in d["margins"])
    assert got == sorted((t["direction"], t["family"]) for t in truth["margins"]), _got_vs_truth(name, "family")


@pytest.mark.skipif(not LINES, reason="synthetic_volumes/ not present")
@pytest.mark.parametrize("name", _params(_TRAJECTORY_XFAIL))
def test_bundled_line_trajectory_class_matches_truth(name):
    # trajectory classes by sign after Helland-Hansen & Martinsen (1996, from memory)
    pairs = _pairs(name)
    assert len(pairs) == len(_bundled(name)[1]["margins"])
    for m, t in pairs:
        mt, tt = m["trajectory"], t.get("trajectory")
        assert (mt or {}).get("class") == (tt or {}).get("class"), _got_vs_truth(name, "trajectory")
        if mt is not None:
            # the classifier's hint reads the same band as the metric
            assert m["hints"]["trajectory_class"] == mt["class"]


def test_thresholds_toml_override_changes_family_and_is_recorded(tmp_path):
    sec, h = _foreset_horizon(dip_deg=20.0)
    base = measure_horizon(h, sec, velocity=V_M_S, uncertainty=False).to_dict()
    toml = tmp_path / "my_limits.toml"
    toml.write_text("[thresholds]\nsteep_min_slope_deg = 15.0\ndistal_steepening_max_slope_deg = 10.0\n")
    d = measure_horizon(h, sec, velocity=V_M_S, uncertainty=False, thresholds=toml).to_dict()
    # a 20 degree foreset: below the default steep-margin bound (30 deg, Schlager & Ginsburg 1981;
    # Kenter 1990, from memory), above the 15 deg bound given in the file
    assert base["margins"][0]["family"] == "rimmed_shelf"
    assert d["margins"][0]["family"] == "steep_margin"
    assert d["run"]["thresholds_source"] == str(toml)
    assert d["run"]["thresholds"]["steep_min_slope_deg"] == 15.0


def test_unknown_classifier_fails_before_picking_and_lists_installed():
    from clinometry.errors import PluginError

    sec, h = _foreset_horizon()
    with pytest.raises(PluginError, match=r"no classifier plugin named 'nope'; installed: .*rules"):
        measure_horizon(h, sec, velocity=V_M_S, classifier="nope")


def test_default_run_reports_p10_p50_p90_of_slope_relief_and_break_depth():
    # uncertainty is on by default: 8 % one-sigma velocity error (common practice, no source)
    # scales every depth, so relief P10/P90 ~ relief * (1 -/+ 1.2816 * 0.08) (z of the 90th
    # percentile, standard normal table) plus a little pick error
    sec, h = _foreset_horizon(dip_deg=20.0, relief_ms=300.0)
    d = measure_horizon(h, sec, velocity=V_M_S).to_dict()
    (m,) = d["margins"]
    unc = m["uncertainty"]
    for key in ("slope_max_deg", "slope_mean_deg", "relief_m", "break_depth_m"):
        p = unc[key]
        assert p["p10"] < p["p50"] < p["p90"], key
    npt.assert_allclose(unc["relief_m"]["p50"], m["relief_m"], rtol=0.02)
    npt.assert_allclose([unc["relief_m"]["p10"], unc["relief_m"]["p90"]],
                        [m["relief_m"] * (1 - 1.2816 * 0.08), m["relief_m"] * (1 + 1.2816 * 0.08)], rtol=0.03)
    npt.assert_allclose(unc["break_depth_m"]["p50"], m["break"]["depth_m"], rtol=0.02)
    assert d["run"]["uncertainty"]["n_draws"] == 200


@pytest.mark.skipif(not LINES, reason="synthetic_volumes/ not present")
def test_trajectory_flat_tolerance_from_threshold_table_reaches_the_metric():
    # a 60 deg flat tolerance from the threshold table: the metric's class and the
    # classifier's hint must both read it (first bundled line whose picks give a trajectory;
    # classes by sign outside the band, Helland-Hansen & Martinsen 1996, from memory)
    checked = 0
    for name in LINES:
        truth = json.loads((BUNDLED / f"{name}.truth.json").read_text())
        v = truth["velocity"]
        kw = {"velocity": v["v_m_s"]} if v["model"] == "constant" else {"velocity_linear": (v["v0_m_s"], v["k_per_s"])}
        d = analyze(BUNDLED / f"{name}.sgy", uncertainty=False, thresholds={"trajectory_flat_deg": 60.0}, **kw).to_dict()
        for m in d["margins"]:
            t = m["trajectory"]
            if t is None or t["angle_sigma_deg"] is None:
                continue
            assert t["flat_tolerance_deg"] == 60.0 and t["flat_band_deg"] >= 60.0
            expected = "flat" if abs(t["angle_deg"]) <= t["flat_band_deg"] else (
                "ascending" if t["angle_deg"] > 0 else "descending")
            assert t["class"] == m["hints"]["trajectory_class"] == expected
            checked += 1
        if checked:
            break
    assert checked
