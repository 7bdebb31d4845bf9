"""Conditioning of a seismic section before picking.

Picking works on an image whose amplitudes mean the same thing everywhere
along the line.  Field and synthetic data break that in three ways this
module repairs, in this order:

1. **Dead traces** (all zero, constant or non-finite) are masked and filled
   by linear interpolation between the nearest live traces, so that a
   surface tracker can bridge them; the mask is returned so picks there get
   quality 0.  Non-finite samples are set to 0.
2. **Gain drift along the line** is removed by dividing each trace by a
   laterally *median-filtered* trace RMS.  A per-trace RMS alone would also
   remove real lateral amplitude changes (a bright platform top over a dim
   basin); the running median follows slow drifts and steps of the gain but
   not single bright traces.  This is the robust trace balancing of common
   practice (common practice, no source); see Yilmaz (2001) for amplitude
   balancing in general.
3. **Polarity** is made irrelevant by working on the instantaneous amplitude
   (envelope) of the analytic trace, ``|x + i H[x]|``, computed with
   :func:`scipy.signal.hilbert` (Taner, Koehler & Sheriff 1979).  A peak and
   a trough of equal size give the same envelope, so a polarity reversal
   along the line does not break a surface.

The dominant period of the data, estimated from the mean amplitude
spectrum, sets every smoothing length of the picker (in z and, through the
velocity, in metres), so the picker scales with the seismic wavelength
instead of with sample or trace counts.

References
----------
.. [1] Taner, M. T., Koehler, F. & Sheriff, R. E. (1979). Complex seismic
   trace analysis. Geophysics 44(6), 1041-1063. (from memory)
.. [2] Yilmaz, O. (2001). Seismic Data Analysis, 2nd ed., SEG, ch. 1
   (gain and trace balancing). (from memory)
"""

from __future__ import annotations

import logging
from dataclasses import dataclass

import numpy as np
from scipy import ndimage, signal

from ._blocks import SignBits, row_blocks

__all__ = [
    "Conditioned",
    "dead_trace_mask",
    "fill_dead_traces",
    "balance_traces",
    "envelope",
    "dominant_period",
    "condition",
    "envelope_in_place",
]

logger = logging.getLogger(__name__)

#: a trace whose RMS is below this fraction of the median live RMS is dead
#: (common practice, no source)
DEAD_RMS_FRACTION = 1e-4
#: lateral window (traces) of the running median of trace RMS; odd
#: (common practice, no source)
BALANCE_WINDOW_TRACES = 31
#: traces of the mean spectrum (the default of :func:`dominant_period`)
_PERIOD_TRACES = 400


@dataclass(frozen=True)
class Conditioned:
    """A conditioned image ready for picking.

    Attributes
    ----------
    amplitude : numpy.ndarray, float32, shape (n_trace, n_z)
        Balanced amplitudes, dead traces filled.
    envelope : numpy.ndarray, float32, shape (n_trace, n_z)
        Instantaneous amplitude of ``amplitude``.
    dead : numpy.ndarray of bool, shape (n_trace,)
        True where the input trace was dead.
    period_z : float
        Dominant period in z units (ms for TWT, m for depth).
    notes : tuple of str
    """

    amplitude: np.ndarray
    envelope: np.ndarray
    dead: np.ndarray
    period_z: float
    notes: tuple = ()


def dead_trace_mask(data, *, known_dead=()) -> np.ndarray:
    """Mask of dead traces: non-finite, constant, or with negligible RMS.

    Parameters
    ----------
    data : array_like, shape (n_trace, n_z)
    known_dead : sequence of int, optional
        Trace indices already known to be dead (e.g. section attr
        ``dead_traces``).

    Returns
    -------
    numpy.ndarray of bool, shape (n_trace,)

    Examples
    --------
    >>> d = np.ones((3, 4)); d[1] = 0.0; d[0, 1] = 2.0; d[2, 0] = 5.0
    >>> dead_trace_mask(d).tolist()
    [False, True, False]
    """
    a = np.asarray(data)
    n = a.shape[0]
    any_finite = np.zeros(n, dtype=bool)
    rms = np.zeros(n, dtype=np.float64)
    spread = np.zeros(n, dtype=a.dtype if a.dtype.kind == "f" else np.float64)
    for rows in row_blocks(a):  # per-trace statistics, a block at a time (memory only)
        finite = np.isfinite(a[rows])
        clean = np.where(finite, a[rows], 0.0)
        any_finite[rows] = finite.any(axis=1)
        rms[rows] = np.sqrt(np.mean(np.square(clean, dtype=np.float64), axis=1))
        spread[rows] = np.ptp(clean, axis=1)
    dead = ~any_finite | (spread == 0)
    live_rms = rms[~dead]
    if live_rms.size:
        dead |= rms < DEAD_RMS_FRACTION * np.median(live_rms)
    known = np.asarray(list(known_dead), dtype=np.int64)
    known = known[(known >= 0) & (known < a.shape[0])]
    dead[known] = True
    return dead


def fill_dead_traces(data, dead) -> np.ndarray:
    """Replace dead traces by linear interpolation between live neighbours.

    Parameters
    ----------
    data : array_like, shape (n_trace, n_z)
    dead : array_like of bool, shape (n_trace,)

    Returns
    -------
    numpy.ndarray, float32, shape (n_trace, n_z)
        A new array; traces beyond the last live one copy it.

    Examples
    --------
    >>> d = np.array([[0.0, 2.0], [0.0, 0.0], [2.0, 4.0]])
    >>> fill_dead_traces(d, [False, True, False])[1].tolist()
    [1.0, 3.0]
    """
    a = np.array(data, dtype=np.float32)
    a[~np.isfinite(a)] = 0.0
    dead = np.asarray(dead, dtype=bool)
    live = np.flatnonzero(~dead)
    gone = np.flatnonzero(dead)
    if gone.size == 0 or live.size == 0:
        return a
    pos = np.searchsorted(live, gone)
    lo = live[np.clip(pos - 1, 0, live.size - 1)]
    hi = live[np.clip(pos, 0, live.size - 1)]
    span = np.where(hi != lo, hi - lo, 1).astype(np.float32)
    w = np.clip((gone - lo) / span, 0.0, 1.0).astype(np.float32)[:, None]
    a[gone] = (1.0 - w) * a[lo] + w * a[hi]
    return a


def balance_traces(data, dead=None, *, window_traces: int = BALANCE_WINDOW_TRACES) -> np.ndarray:
    """Divide each trace by a laterally median-filtered trace RMS.

    Parameters
    ----------
    data : array_like, shape (n_trace, n_z)
    dead : array_like of bool, shape (n_trace,), optional
        Dead traces are left out of the RMS and keep scale 1 relative to
        their neighbours.
    window_traces : int
        Length of the running median (odd; even values are rounded up).

    Returns
    -------
    numpy.ndarray, float32
        Balanced data with a median live trace RMS of 1.

    Examples
    --------
    >>> d = np.vstack([np.sin(np.arange(8.0))] * 4) * np.array([[1], [1], [10], [10]])
    >>> b = balance_traces(d, window_traces=1)
    >>> np.allclose(b[0], b[3])
    True
    """
    a = np.asarray(data, dtype=np.float32)
    scale = _balance_scale(a, dead, window_traces)
    if scale is None:
        return a.copy()
    return a / scale[:, None]  # float32 / float32: a new float32 array


def _balance_scale(a, dead, window_traces):
    """float32 divisor per trace of :func:`balance_traces`, or None (no live trace)."""
    n = a.shape[0]
    dead = np.zeros(n, bool) if dead is None else np.asarray(dead, dtype=bool)
    rms = np.empty(n, dtype=np.float64)
    for rows in row_blocks(a):
        rms[rows] = np.sqrt(np.mean(np.square(a[rows], dtype=np.float64), axis=1))
    live = ~dead & (rms > 0)
    if not live.any():
        return None
    log_rms = np.full(n, np.nan)
    log_rms[live] = np.log(rms[live])
    idx = np.arange(n)
    log_rms = np.interp(idx, idx[live], log_rms[live])
    w = max(1, int(window_traces) | 1)
    smooth = ndimage.median_filter(log_rms, size=max(1, min(w, n)), mode="nearest")
    return np.exp(smooth - np.median(smooth)).astype(np.float32)


def envelope(data) -> np.ndarray:
    """Instantaneous amplitude (envelope) along z (Taner et al. 1979).

    Parameters
    ----------
    data : array_like, shape (n_trace, n_z)

    Returns
    -------
    numpy.ndarray, float32, shape (n_trace, n_z)

    Examples
    --------
    >>> t = np.arange(64)
    >>> e = envelope(np.cos(2 * np.pi * t / 8.0)[None, :])
    >>> bool(np.allclose(e[0, 16:48], 1.0, atol=1e-6))
    True
    """
    a = np.asarray(data, dtype=np.float32)
    if a.ndim < 2:
        return np.abs(signal.hilbert(a, axis=-1)).astype(np.float32)
    out = np.empty(a.shape, dtype=np.float32)
    for rows in row_blocks(a):  # each trace on its own: blocks only bound the temporaries
        out[rows] = np.abs(signal.hilbert(a[rows], axis=-1))
    return out


def envelope_in_place(data, *, packed: bool = False):
    """Overwrite float32 amplitudes with their envelope; return where they were positive.

    The same values as :func:`envelope` (trace by trace, in the same blocks),
    written over the input, which is no longer needed as amplitudes (memory:
    no second full-size image).

    Parameters
    ----------
    data : numpy.ndarray, float32, shape (n_trace, n_z)
        Overwritten with its envelope.

    packed : bool
        Return the sign as :class:`SignBits` (one bit per cell) instead of
        a boolean image.

    Returns
    -------
    numpy.ndarray of bool, shape (n_trace, n_z), or SignBits
        ``data > 0`` before it was overwritten.

    Examples
    --------
    >>> a = np.cos(2 * np.pi * np.arange(64) / 8.0).astype(np.float32)[None, :]
    >>> pos = envelope_in_place(a)
    >>> bool(pos[0, 0]), bool(np.allclose(a[0, 16:48], 1.0, atol=1e-6))
    (True, True)
    """
    if not (isinstance(data, np.ndarray) and data.dtype == np.float32 and data.ndim == 2):
        raise TypeError("envelope_in_place needs a 2-D float32 numpy array")
    n, nz = data.shape
    positive = np.empty((n, -(-nz // 8)), dtype=np.uint8) if packed else np.empty(data.shape, dtype=bool)
    for rows in row_blocks(data):
        if packed:
            positive[rows] = np.packbits(data[rows] > 0, axis=1)
        else:
            np.greater(data[rows], 0, out=positive[rows])
        data[rows] = np.abs(signal.hilbert(data[rows], axis=-1))
    return SignBits(positive, nz) if packed else positive


def dominant_period(data, dz: float, *, max_traces: int = 400) -> float:
    """Dominant period from the peak of the mean amplitude spectrum.

    Parameters
    ----------
    data : array_like, shape (n_trace, n_z)
    dz : float
        Sample interval in z units (ms or m).
    max_traces : int
        At most this many evenly spaced traces enter the mean spectrum.

    Returns
    -------
    float
        Period in z units (1 / peak frequency), or NaN for an all-zero input.

    Notes
    -----
    The spectrum is smoothed with a 3-bin running mean before the peak is
    taken; for a Ricker wavelet the peak of the amplitude spectrum is its
    peak frequency (Ricker 1953, from memory).

    Examples
    --------
    >>> t = np.arange(500) * 2.0                      # ms
    >>> tr = np.sin(2 * np.pi * t / 40.0)[None, :]   # 25 Hz
    >>> round(dominant_period(tr, 2.0), 1)
    40.0
    """
    a = np.asarray(data, dtype=np.float32)
    step = max(1, a.shape[0] // max_traces)
    sub = a[::step]
    n = sub.shape[1]
    nfft = int(2 ** np.ceil(np.log2(max(n, 8)) + 1))
    spec = np.abs(np.fft.rfft(sub * np.hanning(n).astype(np.float32), n=nfft, axis=1)).mean(axis=0)
    spec[0] = 0.0
    spec = ndimage.uniform_filter1d(spec, 3)
    if not np.any(spec > 0):
        return float("nan")
    k = int(np.argmax(spec))
    if 0 < k < spec.size - 1:  # parabolic refinement of the peak
        y0, y1, y2 = spec[k - 1], spec[k], spec[k + 1]
        den = y0 - 2 * y1 + y2
        k = k + (0.5 * (y0 - y2) / den if den != 0 else 0.0)
    freq = k / (nfft * dz)
    return float(1.0 / freq) if freq > 0 else float("nan")


def condition(data, dz: float, *, known_dead=(), with_envelope: bool = True) -> Conditioned:
    """Mask and fill dead traces, balance gain along the line, compute the envelope.

    Parameters
    ----------
    data : array_like, shape (n_trace, n_z)
        Raw amplitudes (left untouched).
    dz : float
        Sample interval in z units.
    known_dead : sequence of int, optional
    with_envelope : bool
        False leaves ``envelope`` None: the caller makes it later with
        :func:`envelope_in_place` once it is done with the amplitudes
        (memory: one full-size image less while both would be alive).

    Returns
    -------
    Conditioned

    See Also
    --------
    dead_trace_mask, fill_dead_traces, balance_traces, envelope, dominant_period
    """
    dead = dead_trace_mask(data, known_dead=known_dead)
    notes = []
    if dead.any():
        notes.append(f"{int(dead.sum())} dead trace(s) masked and filled by interpolation")
    bal = fill_dead_traces(data, dead)  # a new array: balanced in place below
    scale = _balance_scale(bal, dead, BALANCE_WINDOW_TRACES)
    if scale is not None:
        np.divide(bal, scale[:, None], out=bal)
    # the live traces that dominant_period would take from bal[~dead] (every
    # step-th), gathered without a full-size copy of the live traces
    rows = np.flatnonzero(~dead) if (~dead).any() else np.arange(bal.shape[0])
    period = dominant_period(bal[rows[:: max(1, rows.size // _PERIOD_TRACES)]], dz, max_traces=_PERIOD_TRACES)
    env = envelope(bal) if with_envelope else None
    logger.debug("conditioned: %d dead traces, dominant period %.3g", int(dead.sum()), period)
    return Conditioned(amplitude=bal, envelope=env, dead=dead, period_z=period, notes=tuple(notes))
