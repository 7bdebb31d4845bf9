"""Slope faces: the top of the region of coherent basinward-dipping reflectors.

Where a basin fill onlaps a margin, the strongest reflectors near the
slope are the flat fill reflectors, not the slope itself, and a surface
tracker that follows the strongest reflections runs along the fill.  The
slope is then seen by its *geometry*: below it, foreset reflections dip
basinward; above it, fill reflections are flat and end against it
(onlap).  An interpreter picks the slope as the line where the dipping
reflections stop.

This module does the same with the structure-tensor dip and coherence
(Fehmers & Höcker 2003): pixels with coherent true dip steeper than
``min_dip_deg`` towards one side form a mask, cleaned with a binary
opening (Serra 1982) and freed of small specks; on each trace the top of
the mask, snapped to the nearest envelope maximum, is a point of the slope
face.  The longest run of such traces is one face per direction.

References
----------
.. [1] Fehmers, G. C. & Höcker, C. F. W. (2003). Fast structural
   interpretation with structure-oriented filtering. Geophysics 68(4),
   1286-1293. (from memory)
.. [2] Serra, J. (1982). Image Analysis and Mathematical Morphology.
   Academic Press. (from memory)
"""

from __future__ import annotations

import logging
from dataclasses import dataclass

import numpy as np
from scipy import ndimage

__all__ = ["SlopeFace", "slope_faces"]

logger = logging.getLogger(__name__)

#: coherence above which a dip is trusted (common practice, no source)
MIN_COHERENCE = 0.5


@dataclass(frozen=True)
class SlopeFace:
    """Top of the dipping region facing one way: traces and sub-sample z index."""

    direction: str
    trace: np.ndarray
    z_index: np.ndarray


def slope_faces(dip_deg, coherence, envelope, *, min_dip_deg: float, period_samples: float, min_traces: int = 4):
    """Slope faces facing "+" and "-" (at most one each, the longest).

    Parameters
    ----------
    dip_deg : array_like, shape (n_trace, n_z), degrees
        True dip, positive when deepening towards increasing trace index.
    coherence : array_like, shape (n_trace, n_z)
    envelope : array_like, shape (n_trace, n_z)
    min_dip_deg : float, degrees
    period_samples : float
        Dominant period in samples (sets the mask cleaning and snapping).
    min_traces : int
        Shortest face kept.

    Returns
    -------
    list of SlopeFace

    Examples
    --------
    >>> tr, z = np.meshgrid(np.arange(60), np.arange(80), indexing="ij")
    >>> dip = np.where(z > 20 + tr, 30.0, 0.0)      # dipping below a 45-degree line
    >>> f = slope_faces(dip, np.ones_like(dip), np.ones_like(dip), min_dip_deg=5, period_samples=4)
    >>> f[0].direction, int(f[0].trace[10]), round(float(f[0].z_index[10]))
    ('+', 10, 30)
    """
    dip = np.asarray(dip_deg, dtype=np.float32)
    coh = np.asarray(coherence, dtype=np.float32)
    env = np.asarray(envelope, dtype=np.float32)
    n, nz = dip.shape
    hz = max(1, int(round(period_samples / 2)))
    out = []
    for direction, sgn in (("+", 1.0), ("-", -1.0)):
        mask = (coh >= MIN_COHERENCE) & (sgn * dip >= min_dip_deg)
        mask = ndimage.binary_opening(mask, structure=np.ones((3, hz), bool))
        lab, nlab = ndimage.label(mask)
        if nlab == 0:
            continue
        sizes = ndimage.sum(mask, lab, index=np.arange(1, nlab + 1))
        keep = np.zeros(nlab + 1, bool)
        keep[1:] = sizes >= max(4 * hz * min_traces, 1)
        mask = keep[lab]
        has = mask.any(axis=1)
        if has.sum() < min_traces:
            continue
        top = np.argmax(mask, axis=1)
        # longest run of traces with a face
        idx = np.flatnonzero(has)
        runs = np.split(idx, np.flatnonzero(np.diff(idx) > 2) + 1)
        run = max(runs, key=len)
        if run.size < min_traces:
            continue
        t0 = top[run]
        # snap to the envelope maximum within [-P/4, +P/2] of the mask top
        offs = np.arange(-max(1, hz // 2), hz + 1)
        cand = np.clip(t0[:, None] + offs[None, :], 0, nz - 1)
        best = cand[np.arange(run.size), np.argmax(env[run[:, None], cand], axis=1)]
        out.append(SlopeFace(direction, run.astype(np.int64), best.astype(np.float64)))
    return out
