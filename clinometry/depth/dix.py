"""Dix (1955) conversion between interval and RMS velocities.

Stacking velocity analysis gives RMS (root-mean-square) velocities as a
function of two-way time; depth conversion needs interval velocities.  For
horizontal layers and short offsets, Dix (1955) showed that

    v_rms(t_n)^2 * t_n = sum_{i<=n} v_i^2 * (t_i - t_{i-1}),   t_{-1} = 0,

so the interval velocity of the layer between t_{n-1} and t_n is

    v_n = sqrt((v_rms,n^2 t_n - v_rms,n-1^2 t_{n-1}) / (t_n - t_{n-1})).

When the RMS velocity falls too fast with time the quantity under the root is
negative: no set of real layer velocities produces that table.  We raise a
:class:`~clinometry.errors.VelocityError` naming the layer rather than clip
or invent a value.

Convention: each velocity belongs to the layer whose *base* is at the
matching table time (the layer from the previous time, or time zero, down to
it).

References
----------
.. [1] Dix, C. H. (1955). Seismic velocities from surface measurements.
   Geophysics 20(1), 68-86. doi:10.1190/1.1438126
"""

from __future__ import annotations

import numpy as np

from ..errors import VelocityError
from ._plausibility import check_velocities

__all__ = ["interval_to_rms", "rms_to_interval", "check_table_times"]


def check_table_times(twt_ms, *, source: str = "") -> np.ndarray:
    """Check a table time axis: 1-D, finite, >= 0 and strictly increasing.

    Parameters
    ----------
    twt_ms : array_like, shape (n,), ms
        Two-way times of the table rows.
    source : str, optional
        Name used in messages (file name).

    Returns
    -------
    numpy.ndarray, shape (n,), float64

    Raises
    ------
    VelocityError
        Empty table, non-finite or negative time, or a time that does not
        increase; the message names the row (1-based).
    """
    prefix = f"{source}: " if source else ""
    t = np.asarray(twt_ms, dtype=np.float64)
    if t.ndim != 1 or t.size == 0:
        raise VelocityError(f"{prefix}velocity table needs a 1-D list of two-way times, got shape {t.shape}")
    if not np.all(np.isfinite(t)):
        row = int(np.nonzero(~np.isfinite(t))[0][0])
        raise VelocityError(f"{prefix}velocity table row {row + 1}: two-way time is {t[row]}; give a number in ms")
    if t[0] < 0:
        raise VelocityError(f"{prefix}velocity table row 1: two-way time {t[0]:g} ms is negative; times are ms below time zero")
    step = np.diff(t)
    if np.any(step <= 0):
        row = int(np.nonzero(step <= 0)[0][0]) + 1
        raise VelocityError(
            f"{prefix}velocity table is not monotonic in time: row {row + 1} has {t[row]:g} ms after "
            f"{t[row - 1]:g} ms in row {row}; sort the table by two-way time and drop repeated times"
        )
    return t


def interval_to_rms(twt_ms, v_int, *, source: str = "") -> np.ndarray:
    """RMS velocity at each table time from interval velocities (Dix 1955).

    Parameters
    ----------
    twt_ms : array_like, shape (n,), ms
        Two-way time of the base of each layer, increasing, >= 0.
    v_int : array_like, shape (..., n), m/s
        Interval velocity of each layer (the layer from the previous time, or
        time zero, down to ``twt_ms``); leading dims (e.g. traces) broadcast.
    source : str, optional
        Name used in messages.

    Returns
    -------
    numpy.ndarray, shape (..., n), m/s

    Raises
    ------
    VelocityError
        Times not increasing, or velocities not positive/plausible.

    See Also
    --------
    rms_to_interval

    Notes
    -----
    ``v_rms(t_n)^2 = sum v_i^2 (t_i - t_{i-1}) / t_n`` [1]_.  At ``t_n = 0``
    (a layer of zero thickness) the RMS velocity equals the interval velocity.

    References
    ----------
    .. [1] Dix, C. H. (1955). Seismic velocities from surface measurements.
       Geophysics 20(1), 68-86. doi:10.1190/1.1438126

    Examples
    --------
    >>> interval_to_rms([1000, 2000], [2000, 3000]).round(1).tolist()
    [2000.0, 2549.5]
    """
    t = check_table_times(twt_ms, source=source)
    v = check_velocities(v_int, what="interval velocity", source=source)
    if v.shape[-1:] != t.shape:
        raise VelocityError(f"{source + ': ' if source else ''}{t.size} table times but {v.shape[-1] if v.ndim else 1} velocities")
    dt = np.diff(t, prepend=0.0)
    cum = np.cumsum(v**2 * dt, axis=-1)
    with np.errstate(invalid="ignore", divide="ignore"):
        vrms = np.sqrt(np.where(t > 0, cum / np.where(t > 0, t, 1.0), v**2))
    return vrms


def rms_to_interval(twt_ms, v_rms, *, source: str = "") -> np.ndarray:
    """Interval velocity of each layer from RMS velocities (Dix 1955).

    Parameters
    ----------
    twt_ms : array_like, shape (n,), ms
        Two-way times of the RMS picks, increasing, >= 0.
    v_rms : array_like, shape (..., n), m/s
        RMS velocity at each time; leading dims (e.g. traces) broadcast.
    source : str, optional
        Name used in messages (file name).

    Returns
    -------
    numpy.ndarray, shape (..., n), m/s
        Interval velocity of the layer whose base is at each time.

    Raises
    ------
    VelocityError
        Times not increasing, velocities not positive/plausible, or a layer
        whose squared interval velocity is negative (imaginary velocity):
        the message names the layer's times and RMS velocities.

    See Also
    --------
    interval_to_rms

    Notes
    -----
    ``v_n^2 = (v_rms,n^2 t_n - v_rms,n-1^2 t_{n-1}) / (t_n - t_{n-1})``, and
    the first layer (from time zero) has ``v_0 = v_rms,0`` [1]_.  Interval
    velocities that come out implausible (outside the range in
    ``PLAUSIBLE_VELOCITY_M_S``) also raise, because they mean the RMS table
    is too rough for Dix inversion.

    References
    ----------
    .. [1] Dix, C. H. (1955). Seismic velocities from surface measurements.
       Geophysics 20(1), 68-86. doi:10.1190/1.1438126

    Examples
    --------
    >>> rms_to_interval([1000, 2000], [2000, 2549.51]).round(0).tolist()
    [2000.0, 3000.0]
    """
    prefix = f"{source}: " if source else ""
    t = check_table_times(twt_ms, source=source)
    vr = check_velocities(v_rms, what="RMS velocity", source=source)
    if vr.shape[-1:] != t.shape:
        raise VelocityError(f"{prefix}{t.size} table times but {vr.shape[-1] if vr.ndim else 1} velocities")
    m = vr**2 * t
    t_prev = np.concatenate([[0.0], t[:-1]])
    m_prev = np.concatenate([np.zeros(vr.shape[:-1] + (1,)), m[..., :-1]], axis=-1)
    v2 = np.empty_like(vr)
    v2[..., 0] = vr[..., 0] ** 2
    if t.size > 1:
        v2[..., 1:] = (m[..., 1:] - m_prev[..., 1:]) / (t[1:] - t_prev[1:])
    bad = v2 <= 0
    if bad.any():
        idx = tuple(int(i[0]) for i in np.nonzero(bad))
        k = idx[-1]
        trace = f" at trace {idx[0]}" if vr.ndim > 1 else ""
        raise VelocityError(
            f"{prefix}Dix inversion gives an imaginary interval velocity{trace} for the layer "
            f"{t_prev[k]:g}-{t[k]:g} ms (RMS velocity falls from {vr[idx[:-1] + (k - 1,)]:g} to "
            f"{vr[idx]:g} m/s too fast); smooth the RMS table or give interval velocities"
        )
    v_int = np.sqrt(v2)
    check_velocities(v_int, what="interval velocity from Dix inversion", source=source)
    return v_int
