"""Slope faces the image shows only in part, continued along their imaged dip.

A slope is not always imaged from break to toe.  Where the basin fill
beside its lower part has the impedance of the slope deposits, the face
has no reflection there, and a minimal path that followed its upper part
drops straight down to the basin floor through weak image (or, where the
upper part is dark, drops from the platform top onto the imaged lower
part).  The relief of such a profile is right, but its slope and its toe
(or break) are not: the drop is no slope.

:func:`extend_faces` finds such drops -- a step of more than
:data:`JUMP_PERIODS` dominant periods between neighbouring traces whose
vertical run lies in a gap of the reflection -- next to a stretch of face
imaged over at least :data:`MIN_IMAGED_STEPS` traces, and continues that
stretch at its own dip (the median of its steps) until it meets the profile
again: the basin floor below, or the platform top above.  A face is a
stratal surface, and a planar or gently curved foreset keeps its dip
downslope (Adams & Schlager 2000, from memory), so its continuation is the
interpreter's reading of where the slope runs where it is not imaged.  The
continued picks are marked, carry quality 0, and do not count as reflection
evidence; the reflections that end against them (onlap) do
(:mod:`~clinometry.picking.evidence.terminations`).

References
----------
.. [1] Adams, E. W. & Schlager, W. (2000). Basic types of submarine slope
   curvature. Journal of Sedimentary Research 70(4), 814-828. (from memory)
"""

from __future__ import annotations

import numpy as np

from ._kernels import run_means

__all__ = ["extend_faces", "floor_terminates", "continue_below_onlap", "JUMP_PERIODS", "MIN_IMAGED_STEPS",
           "GAP_STRENGTH_FRACTION", "MAX_ONLAP_STEPS"]

#: a step between neighbouring traces of more than this many dominant periods
#: is a drop, not a slope, when its vertical run lies in a gap (our choice)
JUMP_PERIODS = 0.5
#: a face is imaged when it descends with reflection support over at least this
#: many consecutive steps (our choice, no source)
MIN_IMAGED_STEPS = 2
#: a run is in a gap where its mean strength is below this fraction of the
#: imaged face's (our choice, no source)
GAP_STRENGTH_FRACTION = 0.5
#: a face step descends by at least this many samples (less is the jitter of
#: a flat top; our choice)
MIN_FACE_STEP_SAMPLES = 0.5
#: the imaged stretch may end this many steps before the drop (the face
#: flattens a little where fill onlaps it; our choice)
MAX_STALL_STEPS = 3
#: the reflection a continued slope rests on is at least this strong (0..1;
#: our choice, no source)
FLOOR_STRENGTH = 0.3
#: a slope is continued past at most this many onlapping fill reflectors
#: (our choice, no source)
MAX_ONLAP_STEPS = 3
#: a continuation is at most this many times longer (in traces) than the imaged
#: stretch it continues (our choice, no source)
MAX_EXTENSION_FACTOR = 2.0


def extend_faces(z_index, cells, strength, *, direction: str, period_samples: float):
    """Continue partly imaged slope faces across the drops of a profile.

    Parameters
    ----------
    z_index : numpy.ndarray, shape (n,)
        Sub-sample z index of the profile per trace of its window.
    cells : numpy.ndarray of int, shape (n,)
        Its cells in the cost image.
    strength : numpy.ndarray, shape (n, n_cell)
        Reflection strength (0..1) of the window, of the profile's polarity.
    direction : {"+", "-"}
        Basinward direction.
    period_samples : float
        Dominant period in samples.

    Returns
    -------
    z : numpy.ndarray, shape (n,)
        The profile with its drops replaced by the continued faces.
    inferred : numpy.ndarray of bool, shape (n,)
        Where the picks are continued, not picked.

    Examples
    --------
    A face imaged over three steps of 2 samples, then a drop of 6 samples
    onto a floor at 12:

    >>> z = np.array([0, 0, 2, 4, 6, 12, 12, 12, 12], float)
    >>> s = np.full((9, 30), 0.05); s[np.arange(9), z.astype(int)] = 1.0
    >>> for i in range(1, 5): s[i, int(z[i - 1]):int(z[i]) + 1] = 1.0
    >>> zz, inf = extend_faces(z, z.astype(int), s, direction="+", period_samples=8)
    >>> zz.tolist(), inf.astype(int).tolist()
    ([0.0, 0.0, 2.0, 4.0, 6.0, 8.0, 10.0, 12.0, 12.0], [0, 0, 0, 0, 0, 1, 1, 0, 0])
    """
    z = np.asarray(z_index, dtype=float).copy()
    c = np.asarray(cells)
    s = np.asarray(strength)
    n = z.size
    inferred = np.zeros(n, bool)
    if n < 3:
        return z, inferred
    if direction == "-":  # orient basinward along increasing index
        zz, inf = extend_faces(z[::-1], c[::-1], s[::-1], direction="+", period_samples=period_samples)
        return zz[::-1], inf[::-1]
    step = np.diff(z)
    run = run_means(np.ascontiguousarray(s, dtype=np.float32), np.ascontiguousarray(c, dtype=np.int64))[1:]
    jump_h = JUMP_PERIODS * period_samples
    down = step > 0
    # reference strength of the imaged face: the steps that descend by half
    # a sample or more (not the jitter of a flat top) and are not drops
    face_steps = (step >= MIN_FACE_STEP_SAMPLES) & (step <= jump_h)
    ref = float(np.median(run[face_steps])) if face_steps.any() else 0.0
    if ref <= 0:
        return z, inferred
    ok_step = face_steps & (run >= GAP_STRENGTH_FRACTION * ref)
    drops = np.flatnonzero(down & (step > jump_h) & (run < GAP_STRENGTH_FRACTION * ref))
    for j in drops:  # step j joins trace j to trace j + 1
        if inferred[j + 1]:
            continue
        # imaged face above the drop: consecutive supported steps ending
        # within MAX_STALL_STEPS of it (the face may flatten where fill onlaps it)
        e = j - 1
        while e >= 0 and j - 1 - e < MAX_STALL_STEPS and not ok_step[e]:
            e -= 1
        k = e
        while k >= 0 and ok_step[k]:
            k -= 1
        above = np.arange(k + 1, e + 1)
        if above.size >= MIN_IMAGED_STEPS:
            d = float(np.median(step[above]))
            a0 = e + 1  # the trace the imaged stretch ends on
            end = a0 + int(MAX_EXTENSION_FACTOR * above.size)
            t = a0 + 1
            while t < min(n, end + 1) and z[a0] + d * (t - a0) < z[t]:
                t += 1
            if t < n and t > j and z[a0] + d * (t - a0) >= z[t]:
                fill = np.arange(a0 + 1, t)
                z[fill] = z[a0] + d * (fill - a0)
                inferred[fill] = True
                continue
        # imaged face below the drop: consecutive supported steps starting
        # within MAX_STALL_STEPS of it
        b0 = j + 1
        while b0 < n - 1 and b0 - j - 1 < MAX_STALL_STEPS and not ok_step[b0]:
            b0 += 1
        k = b0
        while k < n - 1 and ok_step[k]:
            k += 1
        below = np.arange(b0, k)
        if below.size >= MIN_IMAGED_STEPS:
            d = float(np.median(step[below]))
            start = b0 - int(MAX_EXTENSION_FACTOR * below.size)
            t = b0 - 1
            while t > max(-1, start - 1) and z[b0] - d * (b0 - t) > z[t]:
                t -= 1
            if t >= 0 and t < j + 1 and z[b0] - d * (b0 - t) <= z[t]:
                fill = np.arange(t + 1, b0)
                z[fill] = z[b0] - d * (b0 - fill)
                inferred[fill] = True
    return z, inferred


def floor_terminates(strength, cells, toe, *, direction: str, reach: int, fraction: float = None) -> bool:
    """Whether the reflection a profile runs onto at its toe ends against the slope (onlap).

    At a toe the slope runs onto a basin floor that lies beneath it as well
    (the slope downlaps onto it, or it is older than the slope).  Where the
    "floor" is a fill reflector lapping onto the slope, it ends there: the
    image at its level landward of the toe, beneath the slope, holds no
    reflection.  ``reach`` traces landward of the toe are read at the toe's
    cell; the floor ends when their mean strength is below ``fraction``
    (:data:`GAP_STRENGTH_FRACTION`) of the floor's own just basinward of it.

    Parameters
    ----------
    strength : numpy.ndarray, shape (n, n_cell)
    cells : numpy.ndarray of int, shape (n,)
        The profile's cells.
    toe : int
        Index of the toe in the window.
    direction : {"+", "-"}
    reach : int
        Traces read on each side.

    Returns
    -------
    bool

    Examples
    --------
    >>> s = np.zeros((20, 10)); s[10:, 6] = 1.0     # a reflector from trace 10 basinward only
    >>> c = np.r_[np.full(10, 2), np.full(10, 6)]
    >>> floor_terminates(s, c, 10, direction="+", reach=4)
    True
    >>> s[:, 6] = 1.0                                # ... or right across
    >>> floor_terminates(s, c, 10, direction="+", reach=4)
    False
    """
    f = GAP_STRENGTH_FRACTION if fraction is None else fraction
    n = strength.shape[0]
    step = 1 if direction == "+" else -1
    z = int(cells[toe])
    basin = [toe + step * k for k in range(1, reach + 1) if 0 <= toe + step * k < n]
    # landward from half a reach on: the toe of a smoothed profile lies a
    # little basinward of the point where the fill meets the slope
    land = [toe - step * k for k in range(max(1, reach // 2), reach + reach // 2 + 1) if 0 <= toe - step * k < n]
    if not basin or not land:
        return False
    own = float(np.mean([strength[t, cells[t]] for t in basin]))
    under = float(np.mean([strength[t, max(0, z - 1) : z + 2].max() for t in land]))
    return own > 0 and under < f * own


def continue_below_onlap(z_index, cells, strength, toe, *, direction: str, dip_samples: float, reach: int,
                         cell_of, limit: int):
    """Continue a slope past a toe that is an onlap point, down to the reflector it really rests on.

    Where the profile's toe is a fill reflector that ends against the slope
    (:func:`floor_terminates`), the slope goes on below it.  It is continued
    at ``dip_samples`` per trace (the slope's own dip along its steep part)
    until it meets a reflection that does not end against it -- strong at the
    continued slope and beneath it landward as well: the basin floor.

    Parameters
    ----------
    z_index, cells, strength, toe, direction, reach
        As for :func:`floor_terminates`.
    dip_samples : float
        The slope's apparent dip, samples per trace, basinward.
    cell_of : callable
        z index -> cell index.
    limit : int
        At most this many traces of continuation.

    Returns
    -------
    (z, inferred, floor) or None
        The continued profile up to the floor trace (beyond it unchanged),
        where it is continued, and the window index where it meets the floor;
        None when the toe is not an onlap point or no floor is met.
    """
    z = np.asarray(z_index, dtype=float).copy()
    c = np.asarray(cells)
    n = z.size
    if dip_samples <= 0 or not floor_terminates(strength, c, toe, direction=direction, reach=reach):
        return None
    step = 1 if direction == "+" else -1
    inferred = np.zeros(n, bool)
    t = toe
    zt = z[toe]
    m = strength.shape[1]
    for _ in range(int(limit)):
        t += step
        zt += dip_samples
        if not 0 <= t < n:
            return None
        cz = int(cell_of(zt))
        if cz >= m - 1:
            return None
        z[t] = zt
        inferred[t] = True
        # a reflection at the continued slope that lies beneath it landward as
        # well is the floor it rests on
        lo, hi = max(0, cz - 1), min(m, cz + 2)
        on = float(strength[t, lo:hi].max())
        land = [t - step * j for j in range(max(1, reach // 2), reach + reach // 2 + 1) if 0 <= t - step * j < n]
        under = float(np.mean([strength[u, lo:hi].max() for u in land])) if land else 0.0
        if on >= FLOOR_STRENGTH and under >= GAP_STRENGTH_FRACTION * on:
            inferred[t] = False
            return z, inferred, t
    return None
