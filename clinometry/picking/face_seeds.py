"""Slope faces seen in the reflection dip field: seeds for margin profiles.

The surfaces of :mod:`~clinometry.picking.tracking` are the strongest
routes across the line.  The flank of a mound, or a slope between a
platform and a basin whose fill reflectors are stronger than the slope's own
reflection, may lie on none of them: a route across the line prefers to run
on along the fill.  Such a slope is still seen in the image as a region of
coherent reflections that dip steeply in one direction (structure-tensor
dip and coherence, :mod:`~clinometry.picking.orientation`).

:func:`face_surfaces` labels the connected regions of coherent,
basinward-dipping reflections (:func:`skimage.measure.label`) that span at
least the minimum relief vertically, and extracts for each the margin
profile through its strongest cell with the direction bias of
:func:`~clinometry.picking.tracking.path_through`: up its slope to the
platform top, down to the basin floor.  Whether it is a margin is then
judged like any other candidate.

References
----------
.. [1] Fehmers, G. C. & Höcker, C. F. W. (2003). Fast structural
   interpretation with structure-oriented filtering. Geophysics 68(4),
   1286-1293. (from memory)
"""

from __future__ import annotations

import numpy as np
from skimage.measure import label, regionprops

from .tracking import Surface, _polarity, path_through, refine, run_support

__all__ = ["face_surfaces", "FACE_MIN_DIP_DEG", "FACE_COHERENCE", "FACE_STRENGTH", "MAX_FACES"]

#: a face dips at least this steeply (true dip): well above topset and
#: bottomset gradients (fractions of a degree) and ramp slopes (about 1 deg),
#: at the low end of rimmed-shelf fronts (common practice, no source)
FACE_MIN_DIP_DEG = 4.0
#: coherence of a face's reflections (our choice, no source)
FACE_COHERENCE = 0.6
#: and their strength above the background, 0..1 (our choice, no source)
FACE_STRENGTH = 0.0
#: at most this many faces are followed per direction (our choice)
MAX_FACES = 6


def face_surfaces(images, *, existing=(), max_faces: int = MAX_FACES) -> list[Surface]:
    """Margin profiles through the slope faces of the dip field.

    Parameters
    ----------
    images : SectionImages
    existing : sequence of Surface
        Surfaces already tracked; ranks continue after them (a slope they
        already gave is not read twice: :func:`~clinometry.picking.candidates.propose_candidates`).
    max_faces : int
        Per direction, the largest faces (vertical extent times strength).

    Returns
    -------
    list of Surface
    """
    img = images.cost
    n, m = img.cost.shape
    strength = 1.0 - img.cost
    true_dip = np.degrees(np.arctan(img.dip * img.vertical_m[None, :]))
    good = (img.coherence >= FACE_COHERENCE) & (strength > FACE_STRENGTH)
    good[images.dead] = False
    min_cells = max(2, int(np.ceil(images.min_relief_m / (float(np.median(img.vertical_m)) * images.dx_m))))
    rank = max((s.rank for s in existing), default=-1) + 1
    rows = np.arange(n)
    out = []
    for direction, sign in (("+", 1.0), ("-", -1.0)):
        mask = good & (sign * true_dip >= FACE_MIN_DIP_DEG)
        lab = label(mask, connectivity=2)
        faces = []
        for r in regionprops(lab, intensity_image=strength):
            z0, z1 = r.bbox[1], r.bbox[3]
            if z1 - z0 < min_cells:
                continue
            faces.append(((z1 - z0) * r.intensity_mean, r))
        faces.sort(key=lambda f: -f[0])
        for _, r in faces[:max_faces]:
            coords = r.coords
            zmid = 0.5 * (r.bbox[1] + r.bbox[3])
            mid = coords[np.abs(coords[:, 1] - zmid) <= max(1.0, (r.bbox[3] - r.bbox[1]) / 6.0)]
            t, cell = mid[np.argmax(strength[mid[:, 0], mid[:, 1]])]
            cells = path_through(img, int(t), int(cell), direction=direction)
            q = strength[rows, cells].astype(np.float64)
            support = run_support(strength, cells)
            q[images.dead] = 0.0
            support[images.dead] = 0.0
            zi, best = refine(images.envelope, cells, img.factor)
            out.append(Surface(z_index=zi.astype(np.float64), quality=q, support=support,
                               polarity=_polarity(images.positive, rows, best, q), rank=rank))
            rank += 1
    return out
