"""Older clinoforms of a margin from the reflection dip field beneath its outer profile.

Why not the tracked surfaces
----------------------------
The reflector surfaces of :mod:`~clinometry.picking.tracking` are global
minimum-cost paths across the whole line.  Clinoforms are partial surfaces:
each one ends landward where its topset merges with the next (toplap, or
thin topsets under a flat trajectory) and basinward where it downlaps onto
the basin floor.  A global path beneath the outer profile therefore jumps
between clinoforms, follows side lobes, or runs along the platform top, and
its "break" is not the break of any one clinoform.

Method
------
Every clinoform is a surface everywhere tangent to the local reflection dip
(stratal surfaces are reflections, Vail et al. 1977, from memory), so each
older clinoform is followed as a *streamline* of the structure-tensor dip
field (Fehmers & Höcker 2003, from memory): ``dz/dtrace = dip(trace, z)``,
integrated trace by trace with Heun's method (a second-order Runge-Kutta
step) from a seed point on its foreset, landward through its topset and
basinward through its bottomset.  The dip field is first averaged with the
coherence as weight, so incoherent pixels do not steer it; where no
reflection is coherent the streamline runs level.

Seeds lie on one horizontal row of the section halfway between the break
and toe of the outer profile, where every older foreset of a prograding
margin crosses.  Walking landward from where the outer profile crosses the
row to the landward end of its leg (the platform crest or the line end),
a seed is placed wherever the row lies on foreset reflections: coherent
(:data:`FORESET_COHERENCE`) and dipping basinward by
:data:`FORESET_DIP_FRACTION` to :data:`MAX_DIP_RATIO` times the outer slope
(coherence-weighted averages, so noise between two foresets does not count).
Seeds are spaced so that two neighbouring foresets are a quarter of the
dominant wavelength apart normal to their dip -- the vertical resolution of
two reflections (Widess 1973, from memory); closer foresets are not
resolved by the data and would only repeat one another.

Each streamline is converted to depth and measured with the same curvature
definition as the outer profile
(:func:`~clinometry.picking.candidates.leg_bends`: break at the
maximum of convex-up curvature landward of the steepest point, toe at the
maximum of concave-up curvature basinward of it, after smoothing over one
wavelength).  Because the outer profile and the older clinoforms share that
definition, the line through their breaks -- the shelf-break trajectory
(Helland-Hansen & Martinsen 1996) -- is not biased by a change of method
between the youngest and the older breaks.  A streamline whose break lies
within a quarter wavelength (in depth and distance) of a kept one is the
same clinoform followed twice and is dropped.  A streamline is kept only
when its break lies landward of its seed (the seed is on its foreset) and
its foreset and break lie on coherent reflections (a streamline that
wandered off into incoherent noise has no clinoform); the number of
distinct clinoforms resolved is reported in the notes.

Known limit: a break whose topset is thinner than about half a wavelet
below the platform-top reflection cannot be seen under it; its streamline
levels off beneath that reflection, so such breaks read a little deep and
the trajectory angle from them is too small.  The outer profile's break,
on the reflection itself, is therefore not mixed with them in the
trajectory (:mod:`clinometry.metrics.trajectory`).

References
----------
.. [1] Fehmers, G. C. & Höcker, C. F. W. (2003). Fast structural
   interpretation with structure-oriented filtering. Geophysics 68(4),
   1286-1293. (from memory)
.. [2] Widess, M. B. (1973). How thin is a thin bed? Geophysics 38(6),
   1176-1180. (from memory)
.. [3] Helland-Hansen, W. & Martinsen, O. J. (1996). Shoreline trajectory
   and sequences: description of variable depositional-dip scenarios.
   Journal of Sedimentary Research 66(4), 670-688. (from memory)
.. [4] Mitchum, R. M., Vail, P. R. & Sangree, J. B. (1977). Seismic
   stratigraphy and global changes of sea level, part 6: stratigraphic
   interpretation of seismic reflection patterns in depositional
   sequences. AAPG Memoir 26, 117-133. (from memory)
"""

from __future__ import annotations

import logging
from dataclasses import dataclass

import numpy as np
from scipy import ndimage

from ._blocks import weighted_gaussian
from .candidates import find_legs, leg_bends
from .vetting import TOP_FLATNESS_FRACTION

__all__ = [
    "FORESET_DIP_FRACTION",
    "RESOLUTION_WAVELENGTHS",
    "MIN_COHERENCE",
    "FORESET_COHERENCE",
    "MAX_DIP_RATIO",
    "ForesetClinoform",
    "older_clinoforms",
    "streamlines",
]

logger = logging.getLogger(__name__)

#: a pixel belongs to a foreset when its coherent reflections dip basinward
#: at least this fraction of the outer profile's steepest slope: the same
#: fraction that separates a flat top from a slope in
#: :mod:`~clinometry.picking.vetting` (common practice, no source)
FORESET_DIP_FRACTION = TOP_FLATNESS_FRACTION
#: two reflections closer than a quarter of the dominant wavelength are not
#: resolved (Widess 1973, from memory)
RESOLUTION_WAVELENGTHS = 0.25
#: structure-tensor coherence below which a pixel's dip does not count as a
#: reflection (common practice, no source)
MIN_COHERENCE = 0.3
#: coherence of a foreset reflection where a seed is placed: the coherence
#: the margin picker trusts a dip at (:mod:`~clinometry.picking.evidence.faces`,
#: common practice, no source)
FORESET_COHERENCE = 0.5
#: an older foreset dips at most this multiple of the outer slope: the
#: clinoforms of one margin share a stable slope angle set by their sediment
#: (Kenter 1990, from memory); the factor is our choice
MAX_DIP_RATIO = 2.0
#: the dip field is averaged (coherence-weighted Gaussian) over this many
#: dominant wavelengths along the line and periods in z before streamlines
#: follow it: enough to bridge noise, well below the one-wavelength
#: smoothing of break and toe (our choice, no source)
DIP_SMOOTHING_WAVELENGTHS = 0.25


@dataclass(frozen=True)
class ForesetClinoform:
    """One older clinoform followed through the dip field.

    Attributes
    ----------
    z_index : numpy.ndarray, shape (n_trace,)
        Sub-sample position of the streamline on every trace.
    quality : numpy.ndarray, shape (n_trace,)
        Coherence of the reflections along it (0..1).
    seed : int
        Trace of its seed on the foreset.
    bends : Bends
        Break, toe, steepest point and slope of its depth profile.
    """

    z_index: np.ndarray
    quality: np.ndarray
    seed: int
    bends: object


def _reach(zr, sigma_z, nz):
    """z slice of the cells within reach of z index ``zr`` of a Gaussian of ``sigma_z``
    (scipy.ndimage's radius, ``int(4 sigma + 0.5)``), and the position of ``zr`` in it."""
    r = int(4.0 * float(sigma_z) + 0.5)
    z0 = max(0, zr - r)
    return slice(z0, min(nz, zr + r + 1)), zr - z0


def _weighted_dip(dip, coh, sigma, max_dip):
    """Coherence-weighted Gaussian average of the dip (samples per trace), within +-max_dip."""
    # on blocks of traces (memory; the same numbers as for the whole image)
    return weighted_gaussian(dip, coh, sigma, limit=max_dip, min_weight=MIN_COHERENCE)


def streamlines(dip, seeds_trace, seeds_z, *, floor=None):
    """Streamlines ``dz/dtrace = dip`` through seed points, across the whole line.

    Parameters
    ----------
    dip : array_like, shape (n_trace, n_z), samples per trace
        Local dip (positive: deepening towards increasing trace index).
    seeds_trace : array_like of int, shape (k,)
    seeds_z : array_like of float, shape (k,), samples
    floor : array_like, shape (n_trace,), samples, optional
        A streamline is kept at or below this surface (smaller index is
        shallower).

    Returns
    -------
    numpy.ndarray, shape (k, n_trace), samples
        z of each streamline on every trace (Heun's method, one trace per step).

    Examples
    --------
    >>> dip = np.full((6, 20), 0.5)
    >>> streamlines(dip, [2], [5.0]).round(2).tolist()
    [[4.0, 4.5, 5.0, 5.5, 6.0, 6.5]]
    """
    dip = np.asarray(dip, dtype=np.float32)
    n, nz = dip.shape
    st = np.asarray(seeds_trace, dtype=int)
    out = np.full((st.size, n), np.nan)
    if st.size == 0:
        return out
    out[np.arange(st.size), st] = np.asarray(seeds_z, dtype=float)

    def slope(i, z):
        zz = np.clip(z, 0.0, nz - 1.0)
        return ndimage.map_coordinates(dip, [np.full(z.shape, float(i)), zz], order=1, mode="nearest")

    for step in (1, -1):
        order = range(int(st.min()), n - 1) if step > 0 else range(int(st.max()), 0, -1)
        for i in order:
            j = i + step
            live = np.isfinite(out[:, i]) & ((st <= i) if step > 0 else (st >= i))
            if not live.any():
                continue
            z0 = out[live, i]
            k1 = step * slope(i, z0)
            k2 = step * slope(j, z0 + k1)
            z1 = np.clip(z0 + 0.5 * (k1 + k2), 0.0, nz - 1.0)
            if floor is not None:
                z1 = np.maximum(z1, floor[j])
            out[live, j] = z1
    return out


def older_clinoforms(images, margin):
    """Older clinoforms beneath an outer margin profile, oldest first, with notes.

    Parameters
    ----------
    images : SectionImages
    margin : Candidate
        The outer profile of the margin (youngest clinoform), with a break
        and a toe.

    Returns
    -------
    clinoforms : list of ForesetClinoform
        Distinct older clinoforms, oldest (most landward seed) first.
    notes : list of str
        How many were resolved, and why streamlines were dropped.
    """
    notes = []
    dip, coh = images.dip, images.coherence
    n, nz = dip.shape
    dist = images.distance_m
    dx = images.dx_m
    b = margin.bends
    sgn = 1 if margin.direction == "+" else -1
    if b.shelf_break is None or b.toe is None:
        return [], ["older clinoforms not followed: the outer profile has no break or no toe"]
    # the outer profile on every trace (level beyond its window)
    p = np.empty(n)
    p[margin.lo:margin.hi] = margin.z_index
    p[: margin.lo] = margin.z_index[0]
    p[margin.hi:] = margin.z_index[-1]
    slope_deg = abs(float(b.slope_max_deg))
    min_dip = FORESET_DIP_FRACTION * slope_deg
    z_row = 0.5 * (p[b.shelf_break] + p[b.toe])
    lo, hi = sorted((b.shelf_break, b.toe))
    cross = lo + int(np.argmin(np.abs(p[lo : hi + 1] - z_row)))
    # seeds a quarter wavelength apart normal to the foreset dip (Widess 1973)
    resolution_m = RESOLUTION_WAVELENGTHS * images.wavelength_m
    spacing = max(1, int(round(resolution_m / max(np.sin(np.radians(slope_deg)), 1e-3) / dx)))
    zr = int(round(np.clip(z_row, 0, nz - 1)))
    sigma = (max(0.5, DIP_SMOOTHING_WAVELENGTHS * images.wavelength_m / dx),
             max(0.5, DIP_SMOOTHING_WAVELENGTHS * images.period_samples))
    # the row is judged on the coherence-weighted average true dip, so noise
    # between the foreset reflections does not end the foreset region (only
    # the band of rows within the Gaussian's reach of row zr is smoothed)
    band, j = _reach(zr, sigma[1], nz)
    dip_deg = np.degrees(np.arctan(dip[:, band] * images.vertical_m[band][None, :])).astype(np.float32)
    row_dip = sgn * _weighted_dip(dip_deg, coh[:, band], sigma, 90.0)[:, j]
    row_coh = ndimage.gaussian_filter(coh[:, band], sigma, mode="nearest")[:, j]
    row_ok = (row_dip >= min_dip) & (row_dip <= MAX_DIP_RATIO * slope_deg) & (row_coh >= FORESET_COHERENCE)
    # the walk ends at the landward end of the profile's leg (the platform
    # crest or the line end): beyond it lies another margin
    end = b.leg.landward
    seeds = []
    i = cross - sgn * spacing
    while 0 <= i < n and sgn * (i - end) >= 0:
        # a seed on a foreset, beneath the outer profile, a resolution apart
        if row_ok[i] and (not seeds or abs(i - seeds[-1]) >= spacing) and p[i] < z_row - 0.5 * images.period_samples:
            seeds.append(i)
        i -= sgn
    if not seeds:
        return [], [f"no older clinoform beneath the margin facing {margin.direction}: no foreset reflections "
                    f"landward of trace {cross} at z index {zr}"]
    max_dip = float(np.max(np.abs(np.gradient(margin.z_index)))) + 1.0
    dip_s = _weighted_dip(dip, coh, sigma, max_dip)
    seeds = seeds[::-1]  # oldest (most landward) first
    zs = streamlines(dip_s, seeds, [z_row] * len(seeds), floor=p)
    rows = np.arange(n)
    found = []
    for s, zi in zip(seeds, zs):
        q = ndimage.map_coordinates(coh, [rows.astype(float), np.clip(zi, 0, nz - 1)], order=1, mode="nearest")
        depth = images.depth_of(rows, zi)
        best = None
        for leg in find_legs(dist, depth, smoothing_m=images.smoothing_m, min_relief_m=images.min_relief_m):
            if leg.direction != margin.direction or not leg.start <= s <= leg.end:
                continue
            bb = leg_bends(dist, depth, leg, smoothing_m=images.smoothing_m)
            if bb.shelf_break is None or sgn * (s - bb.shelf_break) <= 0:
                continue
            fs = np.arange(min(bb.shelf_break, bb.toe if bb.toe is not None else bb.outer_toe),
                           max(bb.shelf_break, bb.toe if bb.toe is not None else bb.outer_toe) + 1)
            if float(np.mean(q[fs])) < FORESET_COHERENCE or q[bb.shelf_break] < FORESET_COHERENCE:
                continue
            if best is None or abs(bb.steepest - s) < abs(best.steepest - s):
                best = bb
        if best is None:
            logger.debug("streamline from trace %d: no margin on it", s)
            continue
        found.append(ForesetClinoform(z_index=zi, quality=q, seed=int(s), bends=best))
    # distinct clinoforms: breaks at least the resolution apart
    kept = []

    def _at(t, zi):
        return dist[t], float(images.depth_of([t], [zi])[0])

    prof_brk = _at(b.shelf_break, p[b.shelf_break])
    dropped = 0
    for f in found:
        t = f.bends.shelf_break
        here = _at(t, f.z_index[t])
        others = [prof_brk] + [k[1] for k in kept]
        if any(np.hypot(here[0] - o[0], here[1] - o[1]) < resolution_m for o in others):
            dropped += 1
            continue
        kept.append((f, here))
    lost = len(seeds) - len(found)
    notes.append(
        f"margin facing {margin.direction}: {len(kept)} older clinoform(s) resolved from {len(seeds)} foreset "
        f"seed(s) {spacing * dx:.0f} m apart"
        + (f"; {lost} streamline(s) without a clinoform on coherent reflections" if lost else "")
        + (f"; {dropped} repeating a break within {resolution_m:.0f} m" if dropped else ""))
    return [k[0] for k in kept], notes
