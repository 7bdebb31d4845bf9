"""Lines without a margin give no margin: white noise, band-limited noise, flat layers.

White noise with independent samples has no reflection that continues from
trace to trace, so nothing on it is a stratal surface (common practice, no
source); band-limited noise (white noise through a Ricker wavelet) has the
spectrum of a seismic image but still no lateral continuity.  Flat
layering, however strong, has no relief.  A picker that reports margins on
any of them reports its own noise.

The sections are made here with numpy (no project generator): 4 ms
sampling, 25 m traces, a 25 Hz Ricker wavelet ``(1 - 2 pi^2 f^2 t^2)
exp(-pi^2 f^2 t^2)`` (Ricker 1953, from memory).
"""

from __future__ import annotations

import numpy as np
import pytest

from clinometry.picking import pick
from clinometry.section import make_section

N_TRACE, N_Z, DT_MS, DX_M = 300, 400, 4.0, 25.0


def _ricker(f_hz, dt_s, n=64):
    t = (np.arange(n) - n // 2) * dt_s
    a = (np.pi * f_hz * t) ** 2
    return (1.0 - 2.0 * a) * np.exp(-a)


def _section(data):
    return make_section(np.asarray(data, "float32"), z=np.arange(N_Z) * DT_MS, trace_spacing_m=DX_M)


@pytest.mark.parametrize("seed", range(4))
def test_white_noise_gives_no_margin(seed):
    data = np.random.default_rng(seed).standard_normal((N_TRACE, N_Z))
    assert pick(_section(data)).margins == ()


@pytest.mark.parametrize("seed", range(2))
def test_band_limited_noise_gives_no_margin(seed):
    w = _ricker(25.0, DT_MS / 1000.0)
    data = np.random.default_rng(100 + seed).standard_normal((N_TRACE, N_Z))
    data = np.array([np.convolve(tr, w, mode="same") for tr in data])
    assert pick(_section(data)).margins == ()


@pytest.mark.parametrize("seed", range(2))
def test_flat_layers_with_noise_give_no_margin(seed):
    rng = np.random.default_rng(200 + seed)
    r = np.zeros(N_Z)
    idx = rng.choice(np.arange(20, N_Z - 20), 50, replace=False)
    r[idx] = rng.standard_normal(50)
    tr = np.convolve(r, _ricker(25.0, DT_MS / 1000.0), mode="same")
    # SNR 3 as an amplitude ratio of signal to noise rms
    data = np.tile(tr, (N_TRACE, 1)) + rng.standard_normal((N_TRACE, N_Z)) * tr.std() / 3.0
    assert pick(_section(data)).margins == ()


def test_a_margin_at_the_same_sampling_and_noise_is_found(make_test_line):
    # the control: the same sampling, wavelet and SNR with a 300 m, 20 deg margin
    # (independent generator of tests/picking/lines.py), so the cases above
    # fail for want of a margin, not for want of a picker
    sec, truth = make_test_line("rimmed", n_trace=N_TRACE, dx_m=DX_M, dt_ms=DT_MS, f_hz=25.0, snr=3.0, seed=1)
    got = pick(sec, velocity=2800.0).margins
    assert [m.direction for m in got] == [m["direction"] for m in truth["margins"]]
