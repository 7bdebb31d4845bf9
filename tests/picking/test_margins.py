"""Margin candidates on depth profiles and the checks that reject false ones.

Profiles here are analytic (piecewise-linear gradients, integrated with the
trapezoid rule), so the bends are known exactly: the curvature maximum of a
bend whose gradient changes linearly over a stretch lies at the centre of
that stretch, by symmetry.
"""

import numpy as np
import pytest

from clinometry.picking.assemble import face_unconfirmed, steepest_unconfirmed
from clinometry.picking.margins import MarginCandidate, profile_candidates

DX_M = 25.0
RAMP_DEG = 0.8
SMOOTHING_M = 190.0  # one wavelength of a 15 Hz wavelet at about 2850 m/s
MIN_RELIEF_M = 95.0  # half that wavelength, the picker's default minimum relief


def _profile(x, knots_m, weights):
    """Depth (m) of a surface whose basinward gradient follows ``tan(RAMP_DEG) * interp(x, knots, weights)``."""
    g = np.tan(np.radians(RAMP_DEG))
    grad = sum(g * np.interp(x, k, w) for k, w in zip(knots_m, weights))
    return 200.0 + np.concatenate([[0.0], np.cumsum(0.5 * (grad[1:] + grad[:-1]) * np.diff(x))])


@pytest.mark.parametrize("mirrored", [False, True])
def test_ramp_in_two_gentle_steps_gets_its_outermost_bends(mirrored):
    # a ramp that deepens in two gentle steps with a flat terrace between
    # them: each step (56 m) is below the minimum relief, the whole ramp
    # (112 m) above it; the landward bend is rounded over 1000-3000 m
    # (centre 2000 m), the basinward one over 12000-14000 m (centre 13000 m);
    # the terrace bends at 6000 and 9000 m are sharper than either
    x = np.arange(640) * DX_M
    d = _profile(x, ([1000, 3000, 6000, 6000.1], [9000, 9000.1, 12000, 14000]), ([0, 1, 1, 0], [0, 1, 1, 0]))
    assert d[-1] - d[0] == pytest.approx(2 * 4000.0 * np.tan(np.radians(RAMP_DEG)))
    brk_m, toe_m = 2000.0, 13000.0
    if mirrored:  # the same ramp facing "-"
        d = d[::-1]
        brk_m, toe_m = x[-1] - brk_m, x[-1] - toe_m
    cands = profile_candidates(x, d, np.ones(x.size), path_rank=0, smoothing_m=SMOOTHING_M, min_relief_m=MIN_RELIEF_M)
    assert [c.direction for c in cands] == (["-"] if mirrored else ["+"])
    c = cands[0]
    # within one smoothing length of the bend centres
    assert abs(x[c.shelf_break] - brk_m) <= SMOOTHING_M
    assert abs(x[c.toe] - toe_m) <= SMOOTHING_M
    assert c.relief_m >= MIN_RELIEF_M


def test_one_gentle_step_below_the_minimum_relief_is_not_a_margin():
    x = np.arange(640) * DX_M
    d = _profile(x, ([1000, 3000, 6000, 6000.1],), ([0, 1, 1, 0],))
    assert d[-1] - d[0] < MIN_RELIEF_M
    assert profile_candidates(x, d, np.ones(x.size), path_rank=0, smoothing_m=SMOOTHING_M, min_relief_m=MIN_RELIEF_M) == []


def _candidate(direction="+", brk=20, steepest=25, toe=30, slope_deg=20.0):
    return MarginCandidate(
        path_rank=0, direction=direction, leg=(0, 59), steepest=steepest, shelf_break=brk, toe=toe,
        break_reason="", toe_reason="", relief_m=200.0, slope_max_deg=slope_deg, top_gradient_deg=0.0,
        foreset_quality=0.5, confidence=0.9, mean_depth_m=300.0,
    )


def test_staircase_of_one_period_per_trace_without_coherent_reflections_is_rejected():
    # a tracked surface stepping one period (20 samples) per trace from
    # trace 20 to 30 through incoherent noise (coherence 0.1 everywhere)
    period = 20.0
    z = np.clip(50.0 + period * (np.arange(60) - 20), 50.0, 250.0)
    dip = np.zeros((60, 400), dtype=np.float32)
    coh = np.full((60, 400), 0.1, dtype=np.float32)
    why = steepest_unconfirmed(_candidate(), z, dip, coh, period, 4.0)
    assert "staircase" in why


def test_gentle_surface_without_coherent_reflections_is_not_judged():
    # the same incoherent image under a surface stepping a tenth of a
    # period per trace: no evidence either way, no rejection
    period = 20.0
    z = 50.0 + 2.0 * np.clip(np.arange(60) - 20, 0, 10)
    dip = np.zeros((60, 400), dtype=np.float32)
    coh = np.full((60, 400), 0.1, dtype=np.float32)
    assert steepest_unconfirmed(_candidate(), z, dip, coh, period, 4.0) == ""


@pytest.mark.parametrize("dip_below_deg, confirmed", [(18.0, True), (-18.0, False), (0.0, False)])
def test_face_is_confirmed_only_by_reflections_dipping_basinward_with_it(dip_below_deg, confirmed):
    # a face facing "+" stepping 2 samples per trace (not aliased for a
    # 20-sample period) over coherent reflections dipping the given way;
    # noise dipping landward as steeply does not confirm it
    period = 20.0
    z = 50.0 + 2.0 * np.clip(np.arange(60) - 20, 0, 10)
    dip = np.full((60, 400), dip_below_deg, dtype=np.float32)
    coh = np.full((60, 400), 0.9, dtype=np.float32)
    why = face_unconfirmed(_candidate(), z, dip, coh, period)
    assert (why == "") == confirmed, why


def test_pick_jitter_along_a_dipping_reflection_is_not_a_jump_between_reflectors():
    # a surface dipping 2 samples per trace picked with up to 4 samples of
    # random jitter, over coherent reflections dipping 2 samples per trace:
    # the smoothed step follows the dip (cuts_layering compares the two
    # over the tensor's lateral window)
    from clinometry.picking.assemble import cuts_layering

    period = 20.0
    t = np.arange(60)
    jitter = np.random.default_rng(1).uniform(-4.0, 4.0, t.size)
    z = 50.0 + 2.0 * np.clip(t - 15, 0, 30) + jitter * ((t >= 15) & (t <= 45))
    dip = np.full((60, 400), 2.0, dtype=np.float32)
    coh = np.full((60, 400), 0.9, dtype=np.float32)
    assert cuts_layering(_candidate(brk=15, steepest=30, toe=45), z, dip, coh, period) == ""


def test_surface_stepping_across_flat_coherent_layers_cuts_the_layering():
    from clinometry.picking.assemble import cuts_layering

    period = 20.0
    t = np.arange(60)
    z = 50.0 + 4.0 * np.clip(t - 15, 0, 30)
    dip = np.zeros((60, 400), dtype=np.float32)  # flat reflectors
    coh = np.full((60, 400), 0.9, dtype=np.float32)
    assert "cuts across" in cuts_layering(_candidate(brk=15, steepest=30, toe=45), z, dip, coh, period)


def test_flat_treads_joined_by_jumps_are_a_staircase_even_where_noise_dips_with_it():
    # treads of 4 flat traces joined by jumps of 8 samples (0.4 period),
    # over coherent "reflections" dipping 30 deg basinward (as laterally
    # incoherent noise can look to a structure tensor): the jumps make all
    # the relief and most traces are flat, so it is a staircase
    period = 20.0
    t = np.arange(60)
    z = 50.0 + 8.0 * np.clip((t - 16) // 5 + 1, 0, 6)
    dip = np.full((60, 400), 30.0, dtype=np.float32)
    coh = np.full((60, 400), 0.9, dtype=np.float32)
    why = steepest_unconfirmed(_candidate(brk=15, steepest=30, toe=45), z, dip, coh, period, 4.0)
    assert "staircase" in why
