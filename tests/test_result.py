"""The results contract: Result.to_dict / to_json / from_dict and validation.

The unit tests build Picks, Metrics and Classification records by hand, so
every expected value can be read off the inputs.  The contract test at the
end runs ``clinometry analyze`` on a synthetic line and checks every
required key and type of the JSON it writes.
"""

import json
import math

import numpy as np
import numpy.testing as npt
import pytest

from clinometry.classify.classification import FAMILIES, Classification
from clinometry.errors import ClinometryError
from clinometry.metrics.metric_records import POINT_KEYS, MarginMetrics, Metrics
from clinometry.picking.picks import ClinoformPicks, Horizon, MarginPicks, PickPoint, Picks
from clinometry.result import (
    REQUIRED_MARGIN_KEYS,
    REQUIRED_SOURCE_KEYS,
    SCHEMA_VERSION,
    TRAJECTORY_CLASSES,
    Result,
    json_safe,
    validate_result_dict,
)


def _pt(trace, depth_m, z):
    # a point whose values encode its own position: distance = 25 m * trace
    return {"trace": trace, "distance_m": 25.0 * trace, "depth_m": depth_m, "x": 25.0 * trace, "y": 0.0, "z": z}


def _hand_result(*, nan_slope=False):
    h = Horizon(id=3, role="margin_profile", trace=np.arange(10), z=np.linspace(400, 800, 10),
                quality=np.ones(10))
    mp = MarginPicks(
        direction="+", profile_id=3, platform_top_id=3,
        shelf_break=PickPoint(trace=2, z=480.0, quality=0.9), toe=PickPoint(trace=7, z=720.0, quality=0.8),
        clinoforms=(ClinoformPicks(horizon_id=3, shelf_break=PickPoint(2, 480.0), toe=PickPoint(7, 720.0)),),
        confidence=0.7, break_reason="", toe_reason="", notes=("picked on the outermost surface",),
    )
    picks = Picks(horizons=(h,), margins=(mp,), picker="default", parameters={"smoothing_m": 50.0},
                  notes=("one margin",))
    mm = MarginMetrics(
        direction="+",
        values={"relief_m": np.float64(300.0), "slope_max_deg": float("nan") if nan_slope else np.float32(12.5),
                "slope_mean_deg": 8.0, "profile_shape": "sigmoidal"},
        uncertainty={"relief_m": {"p10": 270.0, "p50": 300.0, "p90": 330.0}},
        platform_top={"trace": 0, "distance_m": 0.0, "depth_m": 500.0, "x": 0.0, "y": 0.0, "z": 400.0},
        shelf_break=_pt(2, 600.0, 480.0),
        toe=_pt(7, 900.0, 720.0),
        clinoforms=({"horizon_id": 3, "break": _pt(2, 600.0, 480.0), "toe": _pt(7, 900.0, 720.0),
                     "slope_max_deg": 12.5, "height_m": 300.0},),
        trajectory=None,
        missing={"trajectory": "fewer than two clinoform breaks"},
        profile={"distance_m": [0.0, 25.0], "depth_m": [500.0, 510.0], "slope_deg": [0.0, 1.0]},
        confidence=0.7,
    )
    metrics = Metrics(margins=(mm,), velocity={"model": "constant", "v_m_s": 2500.0},
                      uncertainty_settings={"n_draws": 200, "seed": 0})
    cls = Classification(family="steep_margin", subtype=None, confidence=np.float64(0.8),
                         reasons=("slope_max_deg 12.5 >= 10.0",), scores={"steep_margin": 0.8},
                         hints={"slope_fabric": "grain-flow"}, classifier="rules",
                         thresholds={"steep_slope_deg": 10.0})
    return Result(
        source={"path": "line.sgy", "n_traces": 10, "n_samples": 100, "domain": "twt"},
        velocity={"model": "constant", "v_m_s": 2500.0, "default_fallback": False},
        picks=picks, metrics=metrics, classifications=(cls,),
        run={"classifier": "rules", "thresholds": {"steep_slope_deg": 10.0}, "seed": 0},
    )


def test_to_dict_has_every_contract_key_with_values_from_records():
    d = _hand_result().to_dict()
    assert d["schema_version"] == SCHEMA_VERSION == 1
    for k in REQUIRED_SOURCE_KEYS:
        assert k in d["source"]
    m = d["margins"][0]
    for k in REQUIRED_MARGIN_KEYS:
        assert k in m
    assert (m["direction"], m["family"], m["confidence"]) == ("+", "steep_margin", 0.8)
    npt.assert_allclose([m["relief_m"], m["slope_max_deg"], m["slope_mean_deg"]], [300.0, 12.5, 8.0])
    assert m["break"] == _pt(2, 600.0, 480.0) and m["toe"] == _pt(7, 900.0, 720.0)
    assert m["uncertainty"]["relief_m"] == {"p10": 270.0, "p50": 300.0, "p90": 330.0}
    assert m["clinoforms"][0]["slope_max_deg"] == 12.5
    assert m["trajectory"] is None
    assert m["pick_notes"] == ["picked on the outermost surface"]
    assert d["run"]["picker"] == "default"


def test_to_dict_is_plain_json_types_without_numpy():
    d = _hand_result().to_dict()

    def walk(o):
        assert o is None or type(o) in (dict, list, str, int, float, bool), type(o)
        if isinstance(o, dict):
            for v in o.values():
                walk(v)
        elif isinstance(o, list):
            for v in o:
                walk(v)

    walk(d)


def test_nan_value_becomes_null_and_json_is_strict():
    r = _hand_result(nan_slope=True)
    text = r.to_json()
    # RFC 8259 (JSON), section 6: NaN and Infinity are not permitted as numbers;
    # Python's json with parse_constant raising proves none slipped through
    d = json.loads(text, parse_constant=lambda c: pytest.fail(f"non-standard JSON constant {c}"))
    assert d["margins"][0]["slope_max_deg"] is None


def test_missing_core_value_is_null_with_reason():
    r = _hand_result()
    mm = r.metrics.margins[0]
    values = {k: v for k, v in mm.values.items() if k != "slope_mean_deg"}
    from dataclasses import replace

    r2 = replace(r, metrics=replace(r.metrics, margins=(replace(mm, values=values),)))
    m = r2.to_dict()["margins"][0]
    assert m["slope_mean_deg"] is None
    assert "slope_mean_deg" in m["missing"]


def test_from_dict_round_trip_gives_same_dict():
    d = _hand_result().to_dict()
    r2 = Result.from_dict(json.loads(json.dumps(d)))
    assert r2.to_dict() == d
    assert r2.classifications[0].family == "steep_margin"
    assert r2.picks.margins[0].shelf_break == PickPoint(trace=2, z=480.0, quality=1.0)
    assert r2.metrics.margins[0].values["profile_shape"] == "sigmoidal"
    assert Result.from_json(_hand_result().to_json()).to_dict() == d


def test_json_safe_converts_numpy_and_nonfinite():
    # IEEE 754: inf and nan are not finite; json (RFC 8259) has no spelling for them
    out = json_safe({"a": np.arange(3), "b": np.float32(np.inf), 1: np.bool_(True)})
    assert out == {"a": [0, 1, 2], "b": None, "1": True}


def test_result_rejects_unequal_margin_and_class_counts():
    r = _hand_result()
    with pytest.raises(ValueError, match="1 margins measured but 0 classifications"):
        Result(source=r.source, velocity=r.velocity, picks=r.picks, metrics=r.metrics, classifications=())


@pytest.mark.parametrize(
    "mutate, match",
    [
        (lambda d: d.update(schema_version=2), r"schema_version: must be 1, got 2"),
        (lambda d: d["source"].pop("domain"), r"source: has no key 'domain'"),
        (lambda d: d["source"].update(domain="time"), r"'domain' must be 'twt' or 'depth'"),
        (lambda d: d.pop("velocity"), r"velocity: missing"),
        (lambda d: d["margins"][0].pop("relief_m"), r"margins\[0\]: has no key 'relief_m'"),
        (lambda d: d["margins"][0].update(direction="up"), r"'direction' must be '\+' or '-'"),
        (lambda d: d["margins"][0].update(family="atoll"), r"'family' must be one of"),
        (lambda d: d["margins"][0].update(confidence=1.5), r"'confidence' must be a number in \[0, 1\]"),
        (lambda d: d["margins"][0]["break"].pop("depth_m"), r"margins\[0\]\.break: has no key 'depth_m'"),
        (lambda d: d["margins"][0]["clinoforms"][0].pop("toe"), r"clinoforms\[0\]: has no key 'toe'"),
        (lambda d: d["margins"][0].update(trajectory={"angle_deg": 1.0, "class": "up"}), r"'class' must be one of"),
        (lambda d: d["margins"][0].update(family=None, reasons=[]), r"'family' is null but 'reasons'"),
    ],
)
def test_validate_names_what_is_wrong(mutate, match):
    d = _hand_result().to_dict()
    mutate(d)
    with pytest.raises(ClinometryError, match=match):
        validate_result_dict(d)
    with pytest.raises(ClinometryError, match=match):
        Result.from_dict(d)


def test_from_json_invalid_text_says_rerun():
    with pytest.raises(ClinometryError, match="not valid JSON"):
        Result.from_json("{not json")


def test_summary_line_reports_family_slope_relief():
    (line,) = _hand_result().summary_lines()
    assert line == "margin +: steep_margin, confidence 0.80, slope max 12.5 deg, mean 8.0 deg, relief 300 m"


def test_families_are_the_three_of_the_trade():
    # ramp / rimmed shelf / steep margin: Read (1985), Schlager (2005) (from memory)
    assert set(FAMILIES) == {"ramp", "rimmed_shelf", "steep_margin"}
    assert all(k in POINT_KEYS for k in ("trace", "distance_m", "depth_m"))
    assert math.isclose(_hand_result().to_dict()["margins"][0]["break"]["distance_m"], 50.0)


# --------------------------------------------------------------------------
# The contract as written by `clinometry analyze` for a synthetic line.

#: keys the contract promises and never renames (issue 6, "The results contract")
CONTRACT_TOP = ("schema_version", "source", "velocity", "margins")
CONTRACT_SOURCE = ("path", "n_traces", "n_samples", "domain")
CONTRACT_MARGIN = ("direction", "family", "subtype", "confidence", "reasons", "platform_top", "break", "toe",
                   "relief_m", "slope_max_deg", "slope_mean_deg", "clinoforms", "trajectory")
CONTRACT_POINT = ("trace", "distance_m", "depth_m", "x", "y", "z")


def test_required_key_tables_keep_the_contract_names():
    assert set(CONTRACT_SOURCE) <= set(REQUIRED_SOURCE_KEYS)
    assert set(CONTRACT_MARGIN) <= set(REQUIRED_MARGIN_KEYS)
    assert tuple(POINT_KEYS) == CONTRACT_POINT


@pytest.fixture(scope="module")
def analyzed_json(synthetic_line_file, tmp_path_factory):
    from clinometry.cli import main

    path, truth = synthetic_line_file
    out = tmp_path_factory.mktemp("contract")
    code = main(["analyze", str(path), "--velocity", str(truth["velocity_m_s"]), "--no-plot", "--out", str(out)])
    assert code == 0
    text = (out / f"{path.stem}.json").read_text()
    return json.loads(text, parse_constant=lambda c: pytest.fail(f"non-standard JSON constant {c}")), truth, path


def _is_num(v):
    return isinstance(v, (int, float)) and not isinstance(v, bool)


def test_contract_json_written_by_cli_has_every_key_and_type(analyzed_json):
    d, truth, path = analyzed_json
    validate_result_dict(d)
    for k in CONTRACT_TOP:
        assert k in d
    assert d["schema_version"] == 1
    src = d["source"]
    assert src["path"] == str(path)
    assert (src["n_traces"], src["n_samples"], src["domain"]) == (truth["n_traces"], truth["n_samples"], "twt")
    assert d["velocity"]["model"] == "constant"
    assert d["margins"], "the synthetic shelf has a margin"
    for m in d["margins"]:
        for k in CONTRACT_MARGIN:
            assert k in m, k
        assert m["direction"] in ("+", "-")
        assert m["family"] in FAMILIES
        assert m["subtype"] is None or isinstance(m["subtype"], str)
        assert _is_num(m["confidence"]) and 0.0 <= m["confidence"] <= 1.0
        assert m["reasons"] and all(isinstance(r, str) for r in m["reasons"])
        assert isinstance(m["platform_top"], dict)
        for key in ("break", "toe"):
            assert set(CONTRACT_POINT) <= set(m[key])
            assert isinstance(m[key]["trace"], int)
            for k in CONTRACT_POINT[1:]:
                assert _is_num(m[key][k]), (key, k)
        for k in ("relief_m", "slope_max_deg", "slope_mean_deg"):
            assert _is_num(m[k]), k
            # uncertainty was on: P10 <= P50 <= P90 where computed
            if k in m["uncertainty"]:
                p = m["uncertainty"][k]
                assert p["p10"] <= p["p50"] <= p["p90"]
        assert isinstance(m["clinoforms"], list) and m["clinoforms"]
        for c in m["clinoforms"]:
            assert {"break", "toe", "slope_max_deg"} <= set(c)
        t = m["trajectory"]
        assert t is None or (t["class"] in TRAJECTORY_CLASSES and "angle_deg" in t)


def test_contract_json_matches_truth_direction_and_rereads(analyzed_json):
    d, truth, _ = analyzed_json
    (m,) = d["margins"]
    (t,) = truth["margins"]
    assert m["direction"] == t["direction"]
    # break within a few hundred metres of the truth (pick tolerance: common practice, no source)
    assert abs(m["break"]["distance_m"] - t["break"]["distance_m"]) <= 300.0
    assert Result.from_dict(d).to_dict() == d


def _with_rejected(**change):
    from clinometry.picking.picks import RejectedCandidate
    from clinometry.pipeline.chain import rejected_candidates
    from clinometry.section import make_section

    sec = make_section(np.zeros((40, 10)), z=np.arange(10) * 4.0, trace_spacing_m=12.5)
    c = RejectedCandidate("-", np.arange(5, 15), np.linspace(8.0, 30.0, 10), PickPoint(9, 17.777, 0.8),
                          "relief 37 m below the minimum 41 m", 0.5734)
    d = _hand_result().to_dict()
    d["run"]["rejected_candidates"] = rejected_candidates(Picks(rejected=(c,)), sec)
    d["run"]["rejected_candidates"][0].update(change)
    return d


def test_rejected_candidates_are_plain_rounded_records_in_the_run_block():
    d = _with_rejected()
    c = d["run"]["rejected_candidates"][0]
    assert c["direction"] == "-" and c["reason"] == "relief 37 m below the minimum 41 m"
    assert c["confidence"] == 0.573
    assert c["steepest"] == {"trace": 9, "z": 17.78, "distance_m": 112.5}  # trace 9 x 12.5 m
    assert c["profile"]["trace"] == list(range(5, 15)) and len(c["profile"]["z"]) == 10
    assert validate_result_dict(json.loads(json.dumps(d))) is not None
    assert Result.from_dict(d).to_dict() == d  # a re-read result keeps them


@pytest.mark.parametrize("change, match", [
    ({"direction": "up"}, r"run.rejected_candidates\[0\]: 'direction'"),
    ({"confidence": 1.5}, r"'confidence' must be a number in \[0, 1\]"),
    ({"profile": {"trace": [1, 2], "z": [1.0]}}, r"'trace' has 2 points but 'z' has 1"),
    ({"steepest": {"trace": 1.5, "z": 3.0}}, r"steepest: must be an object with an integer 'trace'"),
])
def test_validate_names_a_bad_rejected_candidate(change, match):
    with pytest.raises(ClinometryError, match=match):
        validate_result_dict(_with_rejected(**change))
