"""Trace ranges of a candidate: its platform top, slope face and basin floor."""

from __future__ import annotations

import numpy as np

__all__ = ["break_trace", "toe_trace", "top_traces", "face_traces", "floor_traces", "profile_extent",
           "REGION_WAVELENGTHS", "EXTENT_STRENGTH_FRACTION"]

#: the platform top and the basin floor are read over at most this many
#: dominant wavelengths beyond the bend (about 1-2 km: enough to see a
#: flat top, short enough to stay on one platform; our choice, no source)
REGION_WAVELENGTHS = 12.0


def break_trace(c) -> int:
    return int(c.bends.shelf_break if c.bends.shelf_break is not None else c.bends.outer_break)


def toe_trace(c) -> int:
    return int(c.bends.toe if c.bends.toe is not None else c.bends.outer_toe)


def _beyond(c, start, away, images, limit):
    """Traces from ``start`` (exclusive of the bend's own smoothing) going ``away`` (+1 / -1)."""
    skip = int(np.ceil(c.bends.sigma_traces))
    length = int(np.ceil(REGION_WAVELENGTHS * images.wavelength_m / images.dx_m))
    a = start + away * skip
    b = start + away * (skip + length)
    if away > 0:
        b = min(b, limit, c.hi - 1)
        return np.arange(a, b + 1) if b >= a else np.arange(0)
    b = max(b, limit, c.lo)
    return np.arange(b, a + 1) if a >= b else np.arange(0)


def top_traces(c, images) -> np.ndarray:
    """Platform-top traces landward of the break, up to the leg's landward extremum (line-end bounded)."""
    brk = break_trace(c)
    if c.direction == "+":
        return _beyond(c, brk, -1, images, c.bends.leg.start)
    return _beyond(c, brk, +1, images, c.bends.leg.end)


def floor_traces(c, images) -> np.ndarray:
    """Basin-floor traces basinward of the toe, up to the window end."""
    toe = toe_trace(c)
    if c.direction == "+":
        return _beyond(c, toe, +1, images, c.hi - 1)
    return _beyond(c, toe, -1, images, c.lo)


#: the imaged extent of a margin's profile ends where its reflection strength,
#: smoothed over a wavelength, falls below this fraction of the strength of its
#: platform top (our choice, no source)
EXTENT_STRENGTH_FRACTION = 0.5


def profile_extent(c, images):
    """Traces ``(first, last)`` over which a candidate's profile stays on its reflection around the slope.

    From the break landward and from the toe basinward, the profile counts
    as long as its strength, averaged over one wavelength, stays at
    :data:`EXTENT_STRENGTH_FRACTION` of the median strength of its platform
    top; where it leaves the reflection (it runs on through the fill beyond
    the far edge of a platform, or into noise) the extent ends.
    """
    from scipy import ndimage

    w = max(1, int(round(images.wavelength_m / images.dx_m)))
    q = ndimage.uniform_filter1d(np.asarray(c.quality, float), w, mode="nearest")
    top = top_traces(c, images)
    ref = float(np.median(c.quality[c.at(top)])) if top.size else float(np.median(c.quality))
    ok = q >= EXTENT_STRENGTH_FRACTION * ref
    a, b = sorted((break_trace(c), toe_trace(c)))
    i, j = a - c.lo, b - c.lo
    while i > 0 and ok[i - 1]:
        i -= 1
    while j < ok.size - 1 and ok[j + 1]:
        j += 1
    return int(i + c.lo), int(j + c.lo)


def face_traces(c) -> np.ndarray:
    a, b = sorted((break_trace(c), toe_trace(c)))
    return np.arange(a, b + 1)
