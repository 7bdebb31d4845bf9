"""Reflector surfaces as minimum-cost paths across the line.

A reflector surface is traced as the path of one z per trace that
crosses the whole line through strong, continuous reflections at the
least total cost.  The cost of a cell is ``1 - e`` with ``e`` the
normalised envelope (so peaks and troughs count alike and a polarity
reversal does not break the surface); a step of ``s`` samples between
neighbouring traces adds ``jump_cost * |s|``.  The optimum is found
exactly by dynamic programming over traces (Bellman 1957; it is Dijkstra's
(1959) shortest path on the trellis of traces x samples whose edges only
go from one trace to the next), vectorised over z with a sliding-window
minimum so that each trace is one numpy operation.

Why a global path instead of local dip-guided tracking: steep foresets
(30-60 degrees) shift by more than half a period from trace to trace, so
the local dip is spatially aliased and a tracker that follows local
slopes (e.g. Fomel 2010) loses them, while a path allowed to jump up to
the steepest dip we accept still follows the foreset reflection trace by
trace.  The allowed jump is computed from ``max_dip_deg``, the trace
spacing and the velocity, not set in samples.

Several surfaces are found one after another: after each path the image
is suppressed within half a dominant period of it, so the next path
follows the next strongest surface.  Where a later path can only run along
an earlier one (a clinoform that downlaps onto the basin floor, a topset
that merges with the one above) its quality drops to 0 there: a
termination (onlap, downlap, truncation) is where quality falls to zero.

To keep the cost linear in trace count and modest in sample count the
search runs on an envelope max-pooled over z by a factor tied to the
dominant period (about 1/8 period per cell); each picked cell is refined
to the envelope maximum in the full-resolution trace with a parabolic
sub-sample fit.

References
----------
.. [1] Bellman, R. (1957). Dynamic Programming. Princeton University Press.
   (from memory)
.. [2] Dijkstra, E. W. (1959). A note on two problems in connexion with
   graphs. Numerische Mathematik 1, 269-271. (from memory)
.. [3] Fomel, S. (2010). Predictive painting of 3D seismic volumes.
   Geophysics 75(4), A25-A30. (from memory)
.. [4] Taner, Koehler & Sheriff (1979), Geophysics 44(6), 1041-1063
   (envelope). (from memory)
"""

from __future__ import annotations

import logging
from dataclasses import dataclass

import numpy as np
from numpy.lib.stride_tricks import sliding_window_view

from .condition import SignBits, quantile_sample

__all__ = ["TrackedPath", "min_cost_path", "track_paths"]

logger = logging.getLogger(__name__)

#: envelope percentile that maps to a cost of 0 (common practice, no source)
NORMALISING_PERCENTILE = 99.5
#: cells per dominant period in the coarse search (common practice, no source)
CELLS_PER_PERIOD = 8
#: cells of dip-penalty terms made at once (a few MB of float32; speed only)
_BLOCK_CELLS = 1 << 20


@dataclass(frozen=True)
class TrackedPath:
    """One surface across the line.

    Attributes
    ----------
    z_index : numpy.ndarray, float, shape (n_trace,)
        Sub-sample position (index into the z axis) per trace.
    quality : numpy.ndarray, float, shape (n_trace,)
        0..1: normalised envelope at the pick above the median (background)
        level of the image; 0 where the path only runs along an earlier
        path or through empty or noise-only image.
    polarity : str
        ``"peak"``, ``"trough"`` or ``"unknown"``.
    rank : int
        Order in which the path was found (0 = strongest).
    """

    z_index: np.ndarray
    quality: np.ndarray
    polarity: str
    rank: int


def min_cost_path(cost, *, max_jump: int, jump_cost: float, dip=None, dip_cost=None) -> np.ndarray:
    """Exact minimum-cost path with one cell per row (dynamic programming).

    Parameters
    ----------
    cost : array_like, shape (n_trace, n_z)
        Non-negative cell costs.
    max_jump : int
        Largest allowed change of z index between neighbouring traces.
    jump_cost : float
        Added cost per index of change.
    dip : array_like, shape (n_trace, n_z), optional
        Local reflector dip (index change per trace) where the step starts.
    dip_cost : array_like, shape (n_trace, n_z), optional
        Added cost per index of disagreement between a step and ``dip``
        (e.g. proportional to the local coherence).

    Returns
    -------
    numpy.ndarray of int, shape (n_trace,)
        z index of the path on each trace; start and end are free.

    Examples
    --------
    >>> c = np.ones((4, 5)); c[0, 1] = c[1, 2] = c[2, 2] = c[3, 4] = 0.0
    >>> min_cost_path(c, max_jump=2, jump_cost=0.1).tolist()
    [1, 2, 2, 4]
    """
    c = np.asarray(cost, dtype=np.float32)
    k = int(max(0, min(max_jump, c.shape[1] - 1)))
    padded = None
    if dip is not None and dip_cost is not None:
        padded = _pad_dip_terms(dip, dip_cost, k)
    return _min_cost_path(c, k, float(jump_cost), padded)


def _pad_dip_terms(dip, dip_cost, k):
    """Dip and dip cost as float32, padded by ``k`` zero cells on both sides of z."""
    out = []
    for a in (dip, dip_cost):
        a = np.asarray(a, dtype=np.float32)
        p = np.zeros((a.shape[0], a.shape[1] + 2 * k), dtype=np.float32)
        p[:, k : k + a.shape[1]] = a
        out.append(p)
    return tuple(out)


def _min_cost_path(c, k, jump_cost, padded, acc=None, *, one_minus=False):
    """:func:`min_cost_path` on float32 costs; ``padded`` from :func:`_pad_dip_terms` or None.

    With ``one_minus`` the costs are ``1 - c`` (float32), made for a block
    of traces at a time instead of as a full-size array.

    The forward pass keeps only the running minimum of each cell (a
    reduction over the window axis, vectorised over z); the step taken is
    found again only along the optimal path when back-tracking, with the
    same float32 operations in the same order, so ties resolve as a full
    arg-min table would (the first, i.e. largest, step wins).  ``acc``, a
    float32 array of shape (n, m + 2k), may be given as workspace (reused
    between calls: no fresh pages to fault in for every path).
    """
    n, m = c.shape
    w = 2 * k + 1
    steps = np.arange(k, -k - 1, -1).astype(np.float32)  # step z - z' for window row j
    pen = (np.float32(jump_cost) * np.abs(steps)).astype(np.float32)
    # accumulated cost, padded with inf by k cells on both sides of z
    if acc is None or acc.shape != (n, m + 2 * k) or acc.dtype != np.float32:
        acc = np.empty((n, m + 2 * k), dtype=np.float32)
    acc.fill(np.inf)
    acc_in = acc[:, k : k + m]
    one = np.float32(1.0)
    if one_minus:
        np.subtract(one, c[0], out=acc_in[0])
    else:
        acc_in[0] = c[0]
    win = sliding_window_view(acc, m, axis=1)  # (n, w, m): win[i, j, z] = acc of cell z + j - k
    tot = np.empty((w, m), dtype=np.float32)
    pen_c = pen[:, None]
    best = np.empty(m, dtype=np.float32)
    minimum = np.minimum.reduce
    # the dip term does not depend on the accumulated cost: it is made for
    # a block of traces at once, then added trace by trace
    block = max(1, min(n - 1, _BLOCK_CELLS // max(w * m, 1)))
    if one_minus:
        cbuf = np.empty((block, m), dtype=np.float32)
    if padded is not None:
        pdip, pw = padded
        win_dip = sliding_window_view(pdip, m, axis=1)  # (n, w, m)
        win_w = sliding_window_view(pw, m, axis=1)
        term = np.empty((block, w, m), dtype=np.float32)
        steps_c = steps[None, :, None]
    for i0 in range(1, n, block):
        i1 = min(n, i0 + block)
        if one_minus:
            cb = np.subtract(one, c[i0:i1], out=cbuf[: i1 - i0])
        else:
            cb = c[i0:i1]
        if padded is not None:
            t = term[: i1 - i0]
            np.subtract(steps_c, win_dip[i0 - 1 : i1 - 1], out=t)
            np.abs(t, out=t)
            np.multiply(win_w[i0 - 1 : i1 - 1], t, out=t)
        for i in range(i0, i1):
            np.add(win[i - 1], pen_c, out=tot)
            if padded is not None:
                np.add(tot, term[i - i0], out=tot)
            minimum(tot, axis=0, out=best)
            np.add(cb[i - i0], best, out=acc_in[i])
    # back-track: re-evaluate the (2k+1) candidate steps along the path only
    path = np.empty(n, dtype=np.int64)
    z = int(np.argmin(acc_in[-1]))
    path[-1] = z
    for i in range(n - 1, 0, -1):
        vals = acc[i - 1, z : z + w] + pen  # candidates z - k .. z + k
        if padded is not None:
            vals += pw[i - 1, z : z + w] * np.abs(steps - pdip[i - 1, z : z + w])
        z += int(vals.argmin()) - k
        path[i - 1] = z
    return path


def _pool_cells(a, factor, how, pad_mode, out=None):
    """Reduce ``factor`` z samples to one cell (``np.pad`` to a whole cell, reshape, reduce) without a padded copy.

    The whole cells are reduced through a reshaped view; only the last,
    incomplete cell is padded (with ``pad_mode``), so the values are those
    of padding the whole array.  ``out``, shape (n, m) and the dtype of
    ``a``, may be given (e.g. a view into a padded layout).
    """
    n, nz = a.shape
    m = -(-nz // factor)
    full = (nz // factor) * factor
    if out is None:
        out = np.empty((n, m), dtype=a.dtype)
    reduce = getattr(np, how)
    if full and factor >= 8:  # numpy sums 8 or more values pairwise: let it
        reduce(a[:, :full].reshape(n, full // factor, factor), axis=2, out=out[:, : full // factor])
    elif full:
        # cell by cell over the `factor` samples, in the order np.max / np.mean
        # reduce a short axis (first, then each next one), so the values are equal
        head = out[:, : full // factor]
        np.copyto(head, a[:, 0:full:factor])
        for j in range(1, factor):
            (np.maximum if how == "max" else np.add)(head, a[:, j:full:factor], out=head)
        if how == "mean":
            np.true_divide(head, factor, out=head, casting="unsafe")
    if full < nz:
        tail = np.pad(a[:, full:], ((0, 0), (0, m * factor - nz)), mode=pad_mode)
        out[:, -1] = reduce(tail, axis=1)
    return out


def _refine(env, coarse, factor, scale=None):
    """Full-resolution envelope maximum inside each coarse cell, sub-sample.

    With ``scale`` the envelope is normalised as ``min(env / scale, 1)``
    (float32) at the cells looked at only.
    """
    n, nz = env.shape
    start = np.clip(coarse * factor, 0, nz - 1)
    offs = np.arange(factor)
    idx = np.clip(start[:, None] + offs[None, :], 0, nz - 1)
    rows = np.arange(n)

    def at(r, c):
        v = env[r, c]
        if scale is None:
            return v
        return np.clip(np.divide(v, scale, dtype=np.float32), 0.0, 1.0)

    best = idx[rows, np.argmax(at(rows[:, None], idx), axis=1)]
    lo = np.clip(best - 1, 0, nz - 1)
    hi = np.clip(best + 1, 0, nz - 1)
    y0, y1, y2 = at(rows, lo), at(rows, best), at(rows, hi)
    den = y0 - 2.0 * y1 + y2
    with np.errstate(divide="ignore", invalid="ignore"):
        shift = np.where((den < 0) & (lo < best) & (best < hi), 0.5 * (y0 - y2) / den, 0.0)
    return best + np.clip(shift, -0.5, 0.5), best


def track_paths(
    envelope,
    amplitude,
    *,
    period_samples: float,
    max_jump_samples: float,
    n_paths: int = 8,
    jump_cost_per_period: float = 0.6,
    dip_cost_per_period: float = 1.5,
    dip=None,
    coherence=None,
    dead=None,
) -> list[TrackedPath]:
    """The ``n_paths`` strongest surfaces across the line, strongest first.

    Parameters
    ----------
    envelope : array_like, shape (n_trace, n_z)
        Envelope of the balanced data.
    amplitude : array_like, shape (n_trace, n_z)
        Balanced data, or only where it is positive (bool, or
        :class:`~clinometry.picking.condition.SignBits`; the same result, a
        quarter or a 32nd of the memory): for the polarity of each surface.
    period_samples : float
        Dominant period in samples.
    max_jump_samples : float
        Largest z change between neighbouring traces, in samples (from the
        steepest accepted dip).
    n_paths : int
    jump_cost_per_period : float
        Cost of a jump of one dominant period between neighbouring traces
        (in units of the cost of one empty cell).
    dip_cost_per_period : float
        Cost of a step that departs by one period from the local reflector
        dip, at full coherence.
    dip, coherence : array_like, shape (n_trace, n_z), optional
        Local dip (samples per trace) and coherence (0..1) from
        :func:`~clinometry.picking.orientation.reflector_orientation`; a
        step across coherent reflectors, against their dip, costs extra, so
        a surface follows its own reflection instead of cutting across
        layering.
    dead : array_like of bool, shape (n_trace,), optional
        Dead (filled) traces get quality 0.

    Returns
    -------
    list of TrackedPath
    """
    env = np.asarray(envelope, dtype=np.float32)
    # the sign may come packed, one bit per cell (condition.SignBits: memory)
    amp = amplitude if isinstance(amplitude, SignBits) else np.asarray(amplitude)
    if amp.dtype != bool:
        amp = amp.astype(np.float32, copy=False)
    n, nz = env.shape
    scale = np.float32(float(np.percentile(quantile_sample(env), NORMALISING_PERCENTILE)) or 1.0)
    factor = int(max(1, round(period_samples / CELLS_PER_PERIOD)))
    m = int(np.ceil(nz / factor))
    # the normalised envelope min(env / scale, 1) is not made as a full-size
    # copy: dividing by a positive number and clipping are monotone, so the
    # maximum of a cell is the normalised maximum (the same float32 values)
    coarse = _pool_cells(env, factor, "max", "constant")
    np.divide(coarse, scale, out=coarse)
    np.clip(coarse, 0.0, 1.0, out=coarse)
    k = int(np.ceil(max_jump_samples / factor)) + 1
    jump_cost = jump_cost_per_period * factor / max(period_samples, 1.0)
    half = max(1, int(round(0.5 * period_samples / factor)))
    dead = np.zeros(n, bool) if dead is None else np.asarray(dead, bool)
    offsets = np.arange(-half, half + 1)
    row_of = np.broadcast_to(np.arange(n)[:, None], (n, offsets.size))
    kk = int(max(0, min(k, m - 1)))
    padded = None
    if dip is not None and coherence is not None:
        # pooled dip (cells per cell step, clipped to the allowed jump) and
        # dip cost, each made in place in one pooled array and written into
        # its padded layout, used by every path (no further copies)
        padded = tuple(np.zeros((n, m + 2 * kk), dtype=np.float32) for _ in range(2))
        p = _pool_cells(np.asarray(dip, np.float32), factor, "mean", "edge", out=padded[0][:, kk : kk + m])
        np.divide(p, factor, out=p)
        np.clip(p, -k, k, out=p)
        p = _pool_cells(np.asarray(coherence, np.float32), factor, "mean", "edge", out=padded[1][:, kk : kk + m])
        np.square(p, out=p)
        np.multiply(p, dip_cost_per_period, out=p)
        np.multiply(p, factor, out=p)
        np.divide(p, max(period_samples, 1.0), out=p)
        del p
    # background level of the image: reflections must stand above it to
    # count (noise at low SNR fills the whole image with envelope)
    background = float(np.median(quantile_sample(coarse, rows=np.flatnonzero(~dead)))) if (~dead).any() else 0.0
    # one accumulated-cost workspace for every path; the cell costs 1 - coarse
    # are made block by block inside the search
    workspace = np.empty((n, m + 2 * kk), dtype=np.float32)
    out = []
    for rank in range(int(n_paths)):
        cpath = _min_cost_path(coarse, kk, float(jump_cost), padded, workspace, one_minus=True)
        q = coarse[np.arange(n), cpath].astype(np.float64)
        q = np.clip((q - background) / max(1.0 - background, 1e-6), 0.0, 1.0)
        q[dead] = 0.0
        zi, best = _refine(env, cpath, factor, scale)
        positive = amp[np.arange(n), best] > 0
        strong = q > 0.3
        frac = float(np.mean(positive[strong])) if strong.any() else 0.5
        polarity = "peak" if frac >= 0.7 else "trough" if frac <= 0.3 else "unknown"
        out.append(TrackedPath(z_index=zi.astype(np.float64), quality=q, polarity=polarity, rank=rank))
        # suppress the cells within half a period of the path (in place)
        band = cpath[:, None] + offsets[None, :]
        inside = (band >= 0) & (band < m)
        coarse[row_of[inside], band[inside]] = 0.0
        if not coarse.any():
            break
    return out
