"""The accuracy bench's matching and calibration rules (scripts/bench_accuracy.py), on hand-made picks."""

import importlib.util
from pathlib import Path

import pytest

from clinometry.picking.picks import MarginPicks, PickPoint

SCRIPT = Path(__file__).resolve().parents[1] / "scripts" / "bench_accuracy.py"


@pytest.fixture(scope="module")
def bench():
    spec = importlib.util.spec_from_file_location("bench_accuracy", SCRIPT)
    mod = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(mod)
    return mod


def _pick(direction, brk, toe=None, confidence=0.8):
    return MarginPicks(direction=direction, profile_id=0, platform_top_id=None,
                       shelf_break=PickPoint(brk, 100.0) if brk is not None else None,
                       toe=PickPoint(toe, 200.0) if toe is not None else None, confidence=confidence)


def _margin(direction, brk, toe):
    return {"direction": direction, "break": {"trace": brk}, "toe": {"trace": toe}}


def test_each_pick_matches_one_true_margin_facing_the_same_way(bench):
    # the window is the true break-to-toe span widened by its width on each side (the bench's rule)
    truth = [_margin("+", 100, 120), _margin("+", 105, 125), _margin("-", 300, 280)]
    picks = [_pick("+", 102), _pick("+", 160), _pick("-", 301)]
    assert bench.match(truth, picks) == [0, None, 2]  # pick 1 lies beyond 125 + 20
    assert bench.match([_margin("+", 100, 120)], [_pick("-", 100)]) == [None]


def test_a_ramp_without_a_break_matches_a_pick_on_its_span(bench):
    ramp = {"direction": "+", "break": None, "toe": None, "span": {"trace_from": 200, "trace_to": 600}}
    assert bench.match([ramp], [_pick("+", None, toe=450)]) == [0]  # by its toe when it has no break
    assert bench.match([ramp], [_pick("+", 750)]) == [None]  # beyond a quarter of the span
    assert bench.match([ramp], [_pick("+", 680)]) == [0]


def test_calibration_bins_count_false_margins_as_wrong(bench, capsys):
    recs = [{"picks": [{"confidence": 1.0, "matched": True, "family_ok": True},
                       {"confidence": 0.95, "matched": False, "family_ok": False},
                       {"confidence": 0.3, "matched": True, "family_ok": False}]}]
    bench.print_calibration(recs)
    out = capsys.readouterr().out
    assert "| 0.9-1.0 | 2 | 1 | 0.50 | 1 |" in out  # confidence 1.0 falls in the last bin
    assert "| 0.0-0.5 | 1 | 0 | 0.00 | 0 |" in out
    assert "| 0.5-0.6 | 0 | 0 | n/a | 0 |" in out

