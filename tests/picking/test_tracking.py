"""Minimum-cost paths against exhaustive search."""

import itertools

import numpy as np
import pytest

from clinometry.picking.condition import SignBits
from clinometry.picking.tracking import min_cost_path, track_paths


def _brute_force(cost, max_jump, jump_cost):
    n, m = cost.shape
    best, arg = np.inf, None
    for path in itertools.product(range(m), repeat=n):
        steps = np.abs(np.diff(path))
        if np.any(steps > max_jump):
            continue
        total = cost[np.arange(n), path].sum() + jump_cost * steps.sum()
        if total < best - 1e-9:
            best, arg = total, path
    return best, arg


@pytest.mark.parametrize("seed", [0, 1, 2, 3])
def test_min_cost_path_matches_exhaustive_search(seed):
    # dynamic programming is exact (Bellman 1957, from memory): same total cost as trying every path
    rng = np.random.default_rng(seed)
    cost = rng.random((5, 6)).astype(np.float32)
    best, _ = _brute_force(cost, 2, 0.15)
    path = min_cost_path(cost, max_jump=2, jump_cost=0.15)
    total = cost[np.arange(5), path].sum() + 0.15 * np.abs(np.diff(path)).sum()
    assert total == pytest.approx(best, abs=1e-5)
    assert np.all(np.abs(np.diff(path)) <= 2)


def test_min_cost_path_follows_a_dipping_line_with_dip_guidance():
    n, m = 40, 80
    cost = np.ones((n, m), np.float32)
    truth = (10 + 1.5 * np.arange(n)).round().astype(int)
    cost[np.arange(n), truth] = 0.0
    dip = np.full((n, m), 1.5, np.float32)
    path = min_cost_path(cost, max_jump=3, jump_cost=0.05, dip=dip, dip_cost=np.full((n, m), 0.5, np.float32))
    np.testing.assert_array_equal(path, truth)


def test_track_paths_finds_two_flat_reflectors_strongest_first():
    env = np.zeros((50, 200), np.float32)
    env[:, 60] = 2.0
    env[:, 140] = 1.0
    paths = track_paths(env, env, period_samples=8.0, max_jump_samples=4.0, n_paths=2)
    assert [round(float(np.median(p.z_index))) for p in paths] == [60, 140]
    assert paths[0].quality.min() > 0.9


@pytest.mark.parametrize("factor", [1, 2, 3, 8, 9])
def test_cell_pooling_equals_padding_the_whole_array(factor):
    # reference: numpy's own np.pad + reshape + max/mean (general-purpose library)
    from clinometry.picking.tracking import _pool_cells

    rng = np.random.default_rng(5)
    a = (rng.random((7, 53)) * 9.0).astype(np.float32)
    m = -(-53 // factor)
    pad = ((0, 0), (0, m * factor - 53))
    np.testing.assert_array_equal(_pool_cells(a, factor, "max", "constant"), np.pad(a, pad).reshape(7, m, factor).max(axis=2))
    np.testing.assert_array_equal(_pool_cells(a, factor, "mean", "edge"), np.pad(a, pad, mode="edge").reshape(7, m, factor).mean(axis=2))


@pytest.mark.parametrize("nz, factor", [(100, 3), (101, 8), (97, 9), (10, 1)])
@pytest.mark.parametrize("how, pad", [("mean", "edge"), ("max", "constant")])
def test_pooling_into_a_view_of_a_padded_layout_equals_numpy_pad_and_reduce(nz, factor, how, pad):
    # reference: numpy.pad to whole cells, reshape and reduce (general-purpose numpy)
    from clinometry.picking.tracking import _pool_cells

    a = np.random.default_rng(31).random((7, nz)).astype(np.float32)
    m = -(-nz // factor)
    expected = getattr(np, how)(np.pad(a, ((0, 0), (0, m * factor - nz)), mode=pad).reshape(7, m, factor), axis=2)
    big = np.zeros((7, m + 6), np.float32)
    _pool_cells(a, factor, how, pad, out=big[:, 3 : 3 + m])
    np.testing.assert_array_equal(big[:, 3 : 3 + m], expected)
    np.testing.assert_array_equal(big[:, :3], 0.0)


def test_track_paths_with_only_the_sign_of_the_amplitudes_gives_the_same_surfaces():
    # polarity needs only where the amplitude is positive: a boolean image
    # (a quarter of the memory) must give the same paths, qualities and
    # polarities as the float amplitudes (common practice, no source)
    rng = np.random.default_rng(3)
    n, nz = 60, 200
    z = np.arange(nz)
    amp = np.zeros((n, nz), np.float32)
    for i in range(n):
        amp[i] += np.cos(2 * np.pi * (z - 60 - 0.3 * i) / 12.0) * np.exp(-(((z - 60 - 0.3 * i) / 8.0) ** 2))
        amp[i] -= 0.6 * np.cos(2 * np.pi * (z - 140) / 12.0) * np.exp(-(((z - 140) / 8.0) ** 2))
    amp += 0.05 * rng.standard_normal(amp.shape).astype(np.float32)
    env = np.abs(amp)
    a = track_paths(env, amp, period_samples=12.0, max_jump_samples=3.0, n_paths=3)
    b = track_paths(env, amp > 0, period_samples=12.0, max_jump_samples=3.0, n_paths=3)
    # and one bit per cell (numpy.packbits) the same again
    c = track_paths(env, SignBits.from_bool(amp > 0), period_samples=12.0, max_jump_samples=3.0, n_paths=3)
    assert [p.polarity for p in a] == [p.polarity for p in b] == [p.polarity for p in c]
    assert a[0].polarity == "peak" and a[1].polarity == "trough"
    for p, q, r in zip(a, b, c):
        np.testing.assert_array_equal(p.z_index, q.z_index)
        np.testing.assert_array_equal(p.quality, q.quality)
        np.testing.assert_array_equal(p.z_index, r.z_index)
        np.testing.assert_array_equal(p.quality, r.quality)
