"""Recording and processing conditions applied to a noise-free synthetic section.

In this order (each step optional):

1. a linear gain drift along the line (signal only);
2. band-limited noise at a stated SNR, ``SNR = RMS(noise-free section) /
   RMS(noise)`` over the live traces, the noise being white Gaussian noise
   filtered by the section's own Ricker wavelet (so it has the signal's
   spectrum);
3. reversed polarity: the whole line multiplied by -1 (SEG reverse
   polarity: an increase of impedance gives a trough; common practice, no
   source);
4. a gain step: every trace from ``gain_step[0]`` on multiplied by
   ``gain_step[1]`` (signal and noise, as a gain change in processing or
   between two merged surveys would);
5. a global amplitude scale (amplitudes carry no absolute unit in SEG-Y;
   common practice, no source);
6. dead traces set to zero.
"""

from __future__ import annotations

import numpy as np

from ..errors import GeometryError
from .seismic import bandlimited_noise, ricker

__all__ = ["noise_wavelet", "apply_conditions", "check_dead_traces", "describe_conditions"]

#: the wavelet is sampled over +-1.5 periods of its peak frequency, where the
#: Ricker (1953) formula gives |r| < 1e-7 (evaluated; the same span as
#: clinometry.synth.seismic.render uses)
_WAVELET_HALF_PERIODS = 1.5


def noise_wavelet(*, peak_hz, domain, dz, velocity, z_out):
    """The Ricker wavelet that shapes the noise, sampled at the section's interval.

    In the depth domain the wavelet is expressed in depth with the velocity
    at mid-section (as :func:`clinometry.synth.seismic.render` does).
    """
    if domain == "twt":
        dt_s = dz / 1000.0
    else:
        dt_s = 2.0 * dz / (velocity.v0_m_s + velocity.k_per_s * float(np.median(z_out)))
    half = int(np.ceil(_WAVELET_HALF_PERIODS / peak_hz / dt_s))
    return ricker(np.arange(-half, half + 1) * dt_s, peak_hz=peak_hz)


def check_dead_traces(dead_traces, n_traces):
    """Sorted unique dead-trace indices, checked against the line length."""
    dead = sorted({int(t) for t in dead_traces})
    if any(t < 0 or t >= n_traces for t in dead):
        raise GeometryError(f"dead_traces must be within 0..{n_traces - 1}, got {dead}")
    return dead


def _check(gain_step, amplitude_scale, n_traces):
    if gain_step is not None:
        trace, factor = gain_step
        if not (0 <= int(trace) < n_traces) or not factor > 0:
            raise GeometryError(f"gain_step must be (trace within 0..{n_traces - 1}, factor > 0), got {gain_step}")
    if not (amplitude_scale > 0 and np.isfinite(amplitude_scale)):
        raise GeometryError(f"amplitude_scale must be a positive number, got {amplitude_scale}")


def apply_conditions(amp, *, rng, snr=None, wavelet=None, gain_drift_fraction=0.0, polarity_reversed=False,
                     gain_step=None, amplitude_scale=1.0, dead=()):
    """Apply the conditions of the module docstring to a noise-free section.

    Parameters
    ----------
    amp : ndarray, shape (n_trace, n_z), float32
        Noise-free amplitudes (changed in place where possible).
    rng : numpy.random.Generator
    snr : float or None
        None: no noise.
    wavelet : ndarray
        Shapes the noise (:func:`noise_wavelet`); needed with ``snr``.
    gain_drift_fraction : float
        Traces scaled linearly from ``1 - g/2`` to ``1 + g/2`` before the noise.
    polarity_reversed : bool
    gain_step : (int, float), optional
        First trace of the step and its gain factor.
    amplitude_scale : float
    dead : sequence of int
        Dead traces (from :func:`check_dead_traces`).

    Returns
    -------
    ndarray, shape (n_trace, n_z), float32

    Examples
    --------
    >>> a = np.ones((4, 3), np.float32)
    >>> b = apply_conditions(a, rng=np.random.default_rng(0), polarity_reversed=True,
    ...                      gain_step=(2, 3.0), dead=[0])
    >>> b[:, 0].tolist()
    [0.0, -1.0, -3.0, -3.0]
    """
    n_tr = amp.shape[0]
    _check(gain_step, amplitude_scale, n_tr)
    if gain_drift_fraction:
        amp *= (1.0 + gain_drift_fraction * np.linspace(-0.5, 0.5, n_tr)).astype(np.float32)[:, None]
    live = np.ones(n_tr, bool)
    live[list(dead)] = False
    if snr is not None:
        nz = bandlimited_noise(amp.shape, wavelet=wavelet, rng=rng)
        rms_s = float(np.sqrt(np.mean(amp[live].astype(np.float64) ** 2)))
        rms_n = float(np.sqrt(np.mean(nz[live] ** 2)))
        amp = (amp + nz * (rms_s / (snr * rms_n))).astype(np.float32)
    if polarity_reversed:
        amp = -amp
    if gain_step is not None:
        amp[int(gain_step[0]):] *= np.float32(gain_step[1])
    if amplitude_scale != 1.0:
        amp *= np.float32(amplitude_scale)
    amp[~live] = 0.0
    return amp


def describe_conditions(*, gain_step=None, amplitude_scale=1.0):
    """The truth record of the conditions beyond those every line has (empty when none)."""
    out = {}
    if gain_step is not None:
        out["gain_step"] = {"trace": int(gain_step[0]), "factor": float(gain_step[1]),
                            "definition": "traces from 'trace' on multiplied by 'factor' (signal and noise)"}
    if amplitude_scale != 1.0:
        out["amplitude_scale"] = float(amplitude_scale)
    return out
