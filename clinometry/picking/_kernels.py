"""Compiled inner loops of the picker (numba), kept apart from the methods that use them.

Only loops that numpy cannot vectorise live here: the dynamic-programming
pass of the minimal paths (:mod:`~clinometry.picking.tracking`), which is
sequential over traces and has a minimum over allowed steps per cell.  The
method and its references are documented in
:mod:`~clinometry.picking.tracking`; this module only evaluates it.
Functions are compiled on first use and cached on disk (``cache=True``), so
a batch of short lines pays the compilation once.
"""

from __future__ import annotations

import numpy as np
from numba import njit

__all__ = ["dp_forward", "backtrack", "run_means"]


@njit(cache=True, nogil=True)
def dp_forward(cost, run_cost, dip, coh, vlen, max_step, anisotropy, floor, dip_weight, down_factor, up_factor, start, back):
    """Accumulated cost of the best path ending at each cell of the last row.

    Parameters
    ----------
    cost : float32 (n, m)
        Cell costs 0..1.
    run_cost : float32 (n, m)
        Cost of a cell crossed by a vertical run between two rows.
    dip, coh : float32 (n, m)
        Reflection dip (cells per row) and coherence 0..1 of each cell.
    vlen : float64 (m,)
        Cell height in units of the row spacing.
    max_step : int
        Largest change of cell between neighbouring rows.
    anisotropy, floor : float
        Vertical length through a cell of cost c costs ``vlen (anisotropy c + floor)``.
    dip_weight : float
        A step that departs by one cell from the reflection dip costs
        ``dip_weight coh^2 vlen``.
    down_factor, up_factor : float
        Multiply the vertical cost of steps down (cell index increasing) / up.
    start : float64 (m,)
        Accumulated cost of row 0.
    back : int32 (n, m)
        Filled with the predecessor cell of each cell (row 0: itself).

    Returns
    -------
    float64 (m,)
        Accumulated cost of the last row.
    """
    n, m = cost.shape
    prev = start.copy()
    cur = np.empty(m)
    csum = np.empty(m)
    for z in range(m):
        back[0, z] = z
    for i in range(1, n):
        # prefix sums of the vertical cost between rows i - 1 and i
        csum[0] = 0.0
        for z in range(1, m):
            a = min(run_cost[i - 1, z - 1], run_cost[i, z - 1])
            b = min(run_cost[i - 1, z], run_cost[i, z])
            csum[z] = csum[z - 1] + 0.5 * (vlen[z - 1] * (anisotropy * a + floor) + vlen[z] * (anisotropy * b + floor))
        for z1 in range(m):
            best = np.inf
            arg = z1
            lo = max(0, z1 - max_step)
            hi = min(m - 1, z1 + max_step)
            c1 = coh[i, z1]
            d1 = dip[i, z1]
            for z0 in range(lo, hi + 1):
                s = z1 - z0
                if s > 0:
                    run = (csum[z1] - csum[z0]) * down_factor
                elif s < 0:
                    run = (csum[z0] - csum[z1]) * up_factor
                else:
                    run = 0.0
                cm = 0.5 * (coh[i - 1, z0] + c1)
                dm = 0.5 * (dip[i - 1, z0] + d1)
                dev = s - dm
                if dev < 0:
                    dev = -dev
                v = prev[z0] + run + dip_weight * cm * cm * dev * 0.5 * (vlen[z0] + vlen[z1])
                if v < best:
                    best = v
                    arg = z0
            cur[z1] = best + cost[i, z1]
            back[i, z1] = arg
        for z in range(m):
            prev[z] = cur[z]
    return prev


@njit(cache=True, nogil=True)
def backtrack(back, z_end):
    """Cell per row of the path ending at ``z_end`` on the last row."""
    n = back.shape[0]
    path = np.empty(n, dtype=np.int64)
    z = z_end
    path[n - 1] = z
    for i in range(n - 1, 0, -1):
        z = back[i, z]
        path[i - 1] = z
    return path


@njit(cache=True, nogil=True)
def run_means(strength, path):
    """Mean over each step's vertical run of the stronger of the two traces' strengths.

    ``out[i]`` for the step from row ``i - 1`` to row ``i`` (cells between
    ``path[i - 1]`` and ``path[i]``, both included); ``out[0]`` is the
    strength at the first pick.
    """
    n = path.size
    out = np.empty(n)
    out[0] = strength[0, path[0]]
    for i in range(1, n):
        a = path[i - 1]
        b = path[i]
        if a > b:
            a, b = b, a
        s = 0.0
        for z in range(a, b + 1):
            u = strength[i - 1, z]
            v = strength[i, z]
            s += u if u > v else v
        out[i] = s / (b - a + 1)
    return out
