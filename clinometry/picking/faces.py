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

from .condition import gaussian_blockwise, open_rectangle, quantile_sample

__all__ = ["SlopeFace", "slope_faces"]


def _follow_face(env, dip, coh, top, half, max_jump, period):
    """Minimum-cost path through the envelope in a band around the mask top."""
    from .tracking import min_cost_path

    n, nz = env.shape
    smooth_top = ndimage.gaussian_filter1d(ndimage.median_filter(top.astype(float), size=5, mode="nearest"), 1.0)
    zz = np.arange(nz)[None, :]
    # the structure tensor's window spreads the dipping region above the
    # reflection that makes it by up to about half a period, so the
    # reflection itself lies between a quarter period above the mask top
    # and one period below it
    off = zz - smooth_top[:, None]
    band = (off >= -max(1, half // 2)) & (off <= 2 * half)
    scale = float(np.percentile(env[band], 99)) if band.any() else 1.0
    cost = np.where(band, 1.0 - np.clip(env / (scale or 1.0), 0, 1), 10.0)
    k = int(np.ceil(max_jump)) + 1
    w = coh**2 * (1.5 / max(period, 1.0))
    return min_cost_path(cost, max_jump=k, jump_cost=0.3 / max(period, 1.0), dip=dip, dip_cost=w).astype(float)

logger = logging.getLogger(__name__)

#: cells per block of traces of the strength smoothing (speed only: a block
#: stays in cache; the result is that of the whole image at once)
_BLOCK_CELLS = 1 << 19


def _smooth_blockwise(a, sigma):
    """``scipy.ndimage.gaussian_filter(a, sigma)`` (float32) on blocks of traces (:func:`~clinometry.picking.condition.gaussian_blockwise`)."""
    return gaussian_blockwise(lambda b: ndimage.gaussian_filter(b, sigma), (a,), sigma_traces=sigma[0])


def _dip_masks(dip_deg, min_dip_deg):
    """``[dip >= min_dip_deg, dip <= -min_dip_deg]`` of an image read on blocks of traces.

    ``dip_deg`` is an array, or anything with ``shape`` whose slices of rows
    are arrays (e.g. the true dip made block by block where read).
    """
    n, nz = dip_deg.shape
    up = np.empty((n, nz), dtype=bool)
    down = np.empty((n, nz), dtype=bool)
    step = max(8, _BLOCK_CELLS // max(nz, 1))
    for s0 in range(0, n, step):
        s1 = min(n, s0 + step)
        d = np.asarray(dip_deg[s0:s1], dtype=np.float32)
        np.greater_equal(d, min_dip_deg, out=up[s0:s1])
        np.less_equal(d, -min_dip_deg, out=down[s0:s1])
    return [up, down]


def _drop_small_regions(mask, min_pixels):
    """``mask`` without its connected regions (``scipy.ndimage.label``) of fewer than ``min_pixels`` pixels.

    The regions are labelled inside the bounding box of the mask only (the
    same regions, sizes and order as in the whole image; a full-size int32
    label image is the largest temporary of the slope faces otherwise).
    None when the mask is empty.
    """
    rows = np.flatnonzero(mask.any(axis=1))
    if rows.size == 0:
        return None
    cols = np.flatnonzero(mask.any(axis=0))
    box = (slice(rows[0], rows[-1] + 1), slice(cols[0], cols[-1] + 1))
    lab, nlab = ndimage.label(mask[box])
    sizes = np.bincount(lab.ravel(), minlength=nlab + 1)[1:]  # pixels per label (= ndimage.sum of the mask)
    keep = np.zeros(nlab + 1, bool)
    keep[1:] = sizes >= min_pixels
    out = np.zeros(mask.shape, dtype=bool)
    out[box] = keep[lab]
    return out


#: coherence above which a dip is trusted (common practice, no source)
MIN_COHERENCE = 0.5
#: a face pixel must lie where the envelope, smoothed with a Gaussian of
#: STRENGTH_SIGMA_TRACES traces and STRENGTH_SIGMA_PERIODS dominant periods,
#: reaches this multiple of its median over the section: a foreset is made
#: of reflections, whereas chaotic or transparent facies (a platform
#: interior, noise) give coherent-looking dips at a weak envelope
#: (common practice, no source)
STRENGTH_FRACTION_OF_MEDIAN = 1.0
STRENGTH_SIGMA_TRACES = 1.5
STRENGTH_SIGMA_PERIODS = 0.5


@dataclass(frozen=True)
class SlopeFace:
    """Top of the dipping region facing one way: traces and sub-sample z index."""

    direction: str
    trace: np.ndarray
    z_index: np.ndarray


def slope_faces(
    dip_deg,
    coherence,
    envelope,
    *,
    min_dip_deg: float,
    period_samples: float,
    min_traces: int = 4,
    dip_samples=None,
    max_jump_samples: float | None = None,
):
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
    dip_samples : array_like, shape (n_trace, n_z), optional
        Dip in samples per trace.  When given (with ``max_jump_samples``)
        the face is followed as a minimum-cost path through the envelope
        inside a band of half a period around the top of the mask, with
        steps that agree with the local dip (so it follows one reflection
        instead of hopping between wavelet lobes); otherwise each trace is
        snapped to its envelope maximum near the mask top.
    max_jump_samples : float, optional
        Largest z step between neighbouring traces, in samples.

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
    coh = np.asarray(coherence, dtype=np.float32)
    env = np.asarray(envelope, dtype=np.float32)
    n, nz = dip_deg.shape
    hz = max(1, int(round(period_samples / 2)))
    # reflection strength judged over about a period and a few traces, so
    # the gaps between wavelet lobes of one reflection do not count as weak
    env_s = _smooth_blockwise(env, (STRENGTH_SIGMA_TRACES, max(1.0, STRENGTH_SIGMA_PERIODS * period_samples)))
    strong = env_s >= STRENGTH_FRACTION_OF_MEDIAN * float(np.median(quantile_sample(env_s)))
    del env_s  # only the mask is used from here on (memory)
    strong &= coh >= MIN_COHERENCE
    # sgn * dip >= min_dip_deg for both directions, read on blocks of traces
    # (dip_deg may be made block by block where read: no full-size float image)
    masks = _dip_masks(dip_deg, min_dip_deg)
    out = []
    for direction, sgn in (("+", 1.0), ("-", -1.0)):
        mask = masks.pop(0)
        mask &= strong
        mask = open_rectangle(mask, (3, hz))  # = ndimage.binary_opening, separable
        mask = _drop_small_regions(mask, max(4 * hz * min_traces, 1))
        if mask is None:
            continue
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
        if dip_samples is not None and max_jump_samples is not None:
            best = _follow_face(env[run], np.asarray(dip_samples, np.float32)[run], coh[run], t0, hz, max_jump_samples, period_samples)
        else:
            # snap to the envelope maximum within [-P/4, +P/2] of the mask top
            offs = np.arange(-max(1, hz // 2), hz + 1)
            cand = np.clip(t0[:, None] + offs[None, :], 0, nz - 1)
            best = cand[np.arange(run.size), np.argmax(env[run[:, None], cand], axis=1)]
        # a slope face deepens basinward: the part landward of its
        # shallowest point (tops of older clinoforms beneath the platform
        # top) and basinward of its deepest point is not this slope
        zs = ndimage.gaussian_filter1d(ndimage.median_filter(np.asarray(best, float), size=5, mode="nearest"), 1.0)
        a, b = (int(np.argmin(zs)), int(np.argmax(zs))) if sgn > 0 else (int(np.argmax(zs)), int(np.argmin(zs)))
        lo, hi = min(a, b), max(a, b)
        if hi - lo + 1 < min_traces:
            continue
        run, best = run[lo : hi + 1], best[lo : hi + 1]
        out.append(SlopeFace(direction, run.astype(np.int64), best.astype(np.float64)))
    return out
