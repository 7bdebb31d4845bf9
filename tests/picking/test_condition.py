"""Conditioning: dead traces, gain balancing, envelope, dominant period."""

import numpy as np
import pytest
from numpy.testing import assert_allclose

from clinometry.picking.condition import (
    SignBits,
    balance_traces,
    condition,
    dead_trace_mask,
    dominant_period,
    envelope,
    envelope_in_place,
    fill_dead_traces,
)
from clinometry.picking._blocks import quantile_sample, weighted_gaussian


def test_dead_trace_mask_finds_zero_nan_and_constant_traces():
    rng = np.random.default_rng(3)
    d = rng.standard_normal((6, 50))
    d[1] = 0.0
    d[3] = np.nan
    d[4] = 7.0  # constant: no signal
    expected = [False, True, False, True, True, False]
    assert dead_trace_mask(d).tolist() == expected


def test_dead_trace_mask_adds_known_dead_traces():
    d = np.random.default_rng(4).standard_normal((4, 20))
    assert dead_trace_mask(d, known_dead=[2, 99]).tolist() == [False, False, True, False]


def test_fill_dead_traces_interpolates_linearly_between_live_neighbours():
    d = np.zeros((5, 3))
    d[0] = 1.0
    d[4] = 5.0
    out = fill_dead_traces(d, [False, True, True, True, False])
    # linear interpolation between traces 0 and 4 (common practice, no source)
    assert_allclose(out[:, 0], [1.0, 2.0, 3.0, 4.0, 5.0])
    assert d[2, 0] == 0.0  # input untouched


def test_balance_traces_removes_a_gain_step_along_the_line():
    rng = np.random.default_rng(5)
    base = rng.standard_normal((80, 100))
    gain = np.where(np.arange(80) < 40, 1.0, 20.0)[:, None]
    bal = balance_traces(base * gain, window_traces=11)
    rms = np.sqrt(np.mean(bal**2, axis=1))
    # after balancing the two halves have the same RMS within sampling scatter
    assert rms[:35].mean() == pytest.approx(rms[45:].mean(), rel=0.1)


def test_envelope_of_a_cosine_is_its_amplitude():
    # |cos + i sin| = 1: the analytic signal of a cosine (Taner et al. 1979, from memory)
    t = np.arange(256)
    e = envelope(3.0 * np.cos(2 * np.pi * t / 16.0)[None, :])
    assert_allclose(e[0, 32:-32], 3.0, rtol=1e-3)


@pytest.mark.parametrize("f_hz", [15.0, 25.0, 40.0])
def test_dominant_period_of_a_ricker_wavelet_is_one_over_its_peak_frequency(f_hz, ricker):
    # the amplitude spectrum of a Ricker wavelet peaks at its peak frequency (Ricker 1953, from memory)
    dt = 2.0
    tr = np.zeros(512)
    w = ricker(f_hz, dt)
    tr[200 : 200 + w.size] = w
    assert dominant_period(tr[None, :], dt) == pytest.approx(1000.0 / f_hz, rel=0.06)


def test_condition_reports_dead_traces_and_keeps_input():
    rng = np.random.default_rng(6)
    d = rng.standard_normal((10, 64)).astype(np.float32)
    d[2] = 0.0
    before = d.copy()
    c = condition(d, 2.0)
    assert c.dead.tolist() == [i == 2 for i in range(10)]
    assert "1 dead trace" in c.notes[0]
    np.testing.assert_array_equal(d, before)


def test_condition_period_is_that_of_the_live_traces_alone(ricker):
    # the dominant period is measured on live traces only: the same number as
    # dominant_period of the balanced live traces (their every k-th, k = n // 400),
    # with 999 traces (k = 2) and every 7th dead; Ricker (1953) 25 Hz wavelet, 2 ms
    rng = np.random.default_rng(11)
    w = ricker(25.0, 2.0)
    d = np.zeros((999, 300), np.float32)
    for i in range(d.shape[0]):
        d[i, 100 + i % 40 : 100 + i % 40 + w.size] = w * (1.0 + 0.1 * rng.standard_normal())
    d += 0.01 * rng.standard_normal(d.shape).astype(np.float32)
    d[::7] = 0.0
    c = condition(d, 2.0)
    assert c.dead.sum() == 143
    assert c.period_z == dominant_period(c.amplitude[~c.dead], 2.0)
    assert c.period_z == pytest.approx(40.0, rel=0.06)


@pytest.mark.parametrize("shape", [(3, 10), (3, 7), (1, 4), (2, 5)])
def test_open_rectangle_equals_scipy_binary_opening(shape):
    # reference: scipy.ndimage.binary_opening with the full rectangle as structure
    # (general-purpose reference library); odd and even sides, masks touching the border
    from scipy import ndimage

    from clinometry.picking._blocks import open_rectangle

    rng = np.random.default_rng(11)
    for density in (0.4, 0.7, 0.95):
        mask = rng.random((37, 61)) < density
        expected = ndimage.binary_opening(mask, structure=np.ones(shape, bool))
        np.testing.assert_array_equal(open_rectangle(mask, shape), expected)


def test_quantile_sample_is_the_image_itself_up_to_the_cell_limit():
    # small images: the quantile is exactly numpy's over the whole image
    rng = np.random.default_rng(12)
    a = rng.random((100, 50)).astype(np.float32)
    assert quantile_sample(a, max_cells=5000) is a
    assert np.percentile(quantile_sample(a, max_cells=5000), 99) == np.percentile(a, 99)
    np.testing.assert_array_equal(quantile_sample(a, rows=np.arange(0, 100, 3), max_cells=5000), a[::3])


def test_quantile_sample_of_a_large_image_keeps_the_quantile_within_its_standard_error():
    # every k-th trace of 200 000 uniform cells, at most 20 000 kept: the 99th
    # percentile of U(0, 1) is 0.99 and a sample quantile's standard error is
    # sqrt(p (1 - p) / N) = 7e-4 for N = 20 000 (David & Nagaraja 2003, from memory)
    rng = np.random.default_rng(13)
    a = rng.random((2000, 100)).astype(np.float32)
    s = quantile_sample(a, max_cells=20_000)
    assert s.shape == (200, 100)
    np.testing.assert_array_equal(s, a[::10])
    assert abs(np.percentile(s, 99) - 0.99) < 4 * 7e-4
    assert abs(np.median(s) - 0.5) < 4 * np.sqrt(0.25 / 20_000)


def test_envelope_in_place_equals_envelope_and_returns_the_sign():
    # the envelope against scipy.signal.hilbert directly (Taner, Koehler &
    # Sheriff 1979: |analytic signal|), over several row blocks
    from scipy import signal

    rng = np.random.default_rng(3)
    a = rng.normal(0, 1, (1200, 700)).astype(np.float32)
    ref_env = envelope(a)
    ref_pos = a > 0
    direct = np.abs(signal.hilbert(a[:5], axis=-1)).astype(np.float32)
    b = a.copy()
    pos = envelope_in_place(b)
    np.testing.assert_array_equal(b, ref_env)
    np.testing.assert_array_equal(pos, ref_pos)
    np.testing.assert_allclose(b[:5], direct, rtol=1e-6)


def test_envelope_in_place_refuses_arrays_it_cannot_overwrite():
    with pytest.raises(TypeError, match="2-D float32"):
        envelope_in_place(np.zeros((3, 4)))


def test_condition_without_envelope_leaves_it_to_the_caller():
    rng = np.random.default_rng(4)
    d = rng.normal(0, 1, (20, 128))
    full = condition(d, 2.0)
    part = condition(d, 2.0, with_envelope=False)
    assert part.envelope is None
    np.testing.assert_array_equal(part.amplitude, full.amplitude)
    assert part.period_z == full.period_z


@pytest.mark.parametrize("shape,sigma", [((3000, 300), (7.3, 2.1)), ((40, 50), (20.0, 1.0)), ((2100, 520), (0.5, 0.5))])
def test_weighted_gaussian_on_blocks_equals_the_whole_image_at_once(shape, sigma):
    # reference: scipy.ndimage.gaussian_filter on the whole image (an
    # independent general-purpose filter), weights below min_weight dropped
    from scipy import ndimage

    rng = np.random.default_rng(5)
    v = rng.normal(0, 2, shape).astype(np.float32)
    w = rng.uniform(0, 1, shape).astype(np.float32)
    w0 = np.where(w >= 0.3, w, 0.0).astype(np.float32)
    num = ndimage.gaussian_filter(np.clip(v, np.float32(-3), np.float32(3)) * w0, sigma, mode="nearest")
    den = ndimage.gaussian_filter(w0, sigma, mode="nearest")
    ref = np.where(den > 1e-3, num / np.maximum(den, np.float32(1e-3)), 0.0).astype(np.float32)
    got = weighted_gaussian(v, w, sigma, limit=3.0, min_weight=0.3)
    assert got.dtype == np.float32
    np.testing.assert_array_equal(got, ref)


@pytest.mark.parametrize("nz", [1, 8, 13, 700])
def test_sign_bits_read_back_as_the_boolean_image(nz):
    # reference: numpy fancy indexing of the boolean image itself
    rng = np.random.default_rng(7)
    m = rng.normal(size=(50, nz)) > 0
    bits = SignBits.from_bool(m)
    r, c = rng.integers(0, 50, 3000), rng.integers(0, nz, 3000)
    assert bits.shape == m.shape
    np.testing.assert_array_equal(bits[r, c], m[r, c])


def test_envelope_in_place_packed_sign_equals_the_boolean_sign():
    rng = np.random.default_rng(8)
    a = rng.normal(0, 1, (900, 613)).astype(np.float32)
    b = a.copy()
    pos = envelope_in_place(a)
    bits = envelope_in_place(b, packed=True)
    np.testing.assert_array_equal(a, b)
    r, c = np.divmod(np.arange(a.size), a.shape[1])
    np.testing.assert_array_equal(bits[r, c], pos[r, c])
