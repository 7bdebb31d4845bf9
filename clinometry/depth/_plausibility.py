"""Plausibility limits and checks of velocities, and unit constants, shared by the velocity models (private)."""

from __future__ import annotations

import numpy as np

from ..errors import VelocityError

#: Plausible range of seismic velocities in sedimentary rock, m/s.  Below
#: 300 m/s is slower than sound in air (a value in km/s is the usual cause);
#: above 9000 m/s is faster than any common rock-forming mineral assemblage
#: at crustal depths (a value in ft/s is the usual cause).
#: Common practice, no source.
PLAUSIBLE_VELOCITY_M_S = (300.0, 9000.0)

#: Steepest plausible linear velocity gradient k in v(z) = v0 + k z, 1/s.  At
#: 5 1/s the velocity doubles every 0.28 s of two-way time; gradients in
#: sedimentary sections are far gentler, so a larger k is almost always a
#: typing or unit slip.  Common practice, no source.
MAX_GRADIENT_PER_S = 5.0

#: A velocity table whose last two-way time is below this (ms) was almost
#: certainly written in seconds.  Common practice, no source.
MIN_TABLE_SPAN_MS = 20.0

#: milliseconds per second (unit conversion)
MS_PER_S = 1000.0


def check_velocities(values, *, what: str, source: str = "") -> np.ndarray:
    """Return ``values`` as float64, raising VelocityError for impossible ones.

    The message names ``source`` (file name or model), ``what`` (which
    parameter or table row) and the first offending value.
    """
    v = np.asarray(values, dtype=np.float64)
    prefix = f"{source}: " if source else ""
    lo, hi = PLAUSIBLE_VELOCITY_M_S
    bad = ~np.isfinite(v)
    if bad.any():
        idx = _first(bad)
        raise VelocityError(
            f"{prefix}{what}{_where(idx, v.ndim)} is {v[idx]} (not a number); "
            "fill gaps in the velocity model before converting"
        )
    bad = v <= 0
    if bad.any():
        idx = _first(bad)
        raise VelocityError(
            f"{prefix}{what}{_where(idx, v.ndim)} is {v[idx]:g} m/s; velocities must be positive"
            + (" (check for muted or padded zones in the velocity file)" if v.ndim else "; give it in m/s")
        )
    bad = v < lo
    if bad.any():
        idx = _first(bad)
        raise VelocityError(
            f"{prefix}{what}{_where(idx, v.ndim)} is {v[idx]:g} m/s, below the plausible "
            f"{lo:g} m/s for seismic; velocities are in m/s (was it given in km/s?)"
        )
    bad = v > hi
    if bad.any():
        idx = _first(bad)
        raise VelocityError(
            f"{prefix}{what}{_where(idx, v.ndim)} is {v[idx]:g} m/s, above the plausible "
            f"{hi:g} m/s for seismic; velocities are in m/s (was it given in ft/s?)"
        )
    return v


def _first(mask):
    if np.ndim(mask) == 0:
        return ()
    return tuple(int(i[0]) for i in np.nonzero(mask))


def _where(idx, ndim):
    if ndim == 0:
        return ""
    if ndim == 1:
        return f" (value {idx[0] + 1})"
    return f" (trace {idx[0]}, sample {idx[-1]})"


def broadcast_trace(values, trace):
    """Broadcast ``values`` (float) with ``trace`` (int or None)."""
    v = np.asarray(values, dtype=np.float64)
    if trace is None:
        return v, None
    t = np.asarray(trace)
    if t.size and np.issubdtype(t.dtype, np.floating):
        if not np.all(np.isfinite(t)):
            raise VelocityError("trace indices must be finite integers")
        t = np.rint(t)
    t = t.astype(np.int64)
    v, t = np.broadcast_arrays(v, t)
    return v, t
