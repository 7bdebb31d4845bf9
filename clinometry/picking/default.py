"""The default picker: evidence for margins gathered independently, then combined.

:func:`pick_default` is a short chain of named stages, each in its own module:

1. :func:`~clinometry.picking.section_images.prepare`: dead traces, gain
   balance, dominant period and wavelength, structure-tensor dip and
   coherence, envelope, the cost image of the minimal paths.
2. :func:`~clinometry.picking.tracking.track_surfaces`: the strongest
   reflector surfaces as minimal paths (they follow a slope face down to the
   basin floor and do not jump between reflectors through weak image).
3. :func:`~clinometry.picking.candidates.propose_candidates`: every leg of
   every surface that deepens by the minimum relief, its profile extracted
   again through its slope, with steepest point, break and toe.
4. :func:`~clinometry.picking.decide.assess`: platform top, slope face,
   basin floor, onlap and change of character measured for each candidate
   (:mod:`~clinometry.picking.evidence`), the rejection rules of
   :mod:`~clinometry.picking.vetting`, and a confidence.
5. :func:`~clinometry.picking.decide.choose_margins`: one margin per slope.
6. :func:`~clinometry.picking.clinoforms.older_clinoforms`: the older
   clinoforms beneath each margin, followed through the dip field.

All lengths derive from the dominant wavelength of the data and the
velocity, so the picker behaves the same at any trace spacing and wavelet.
"""

from __future__ import annotations

import logging

import numpy as np

from ..section import check_section
from .candidates import propose_candidates, smooth_profile
from .clinoforms import older_clinoforms
from .decide import DEFAULT_MIN_CONFIDENCE, assess, choose_margins, dropped_candidates
from .evidence._regions import top_traces
from .picks import ClinoformPicks, Horizon, MarginPicks, PickPoint, Picks, RejectedCandidate
from .section_images import band_limited, prepare
from .face_seeds import face_surfaces
from .tracking import seeded_surfaces, track_surfaces

__all__ = ["pick_default", "DEFAULT_MIN_CONFIDENCE"]

logger = logging.getLogger(__name__)

#: a reflector piece shorter than this many dominant wavelengths is not
#: exported as a horizon (common practice, no source)
MIN_HORIZON_WAVELENGTHS = 1.0
#: strength below which a path point is not part of an exported reflector
MIN_POINT_QUALITY = 0.15
#: the profile of a margin without a break or toe (a ramp) is exported over
#: its leg and this many smoothing lengths beyond (our choice, no source)
RAMP_PROFILE_PAD_SIGMAS = 2.0


def _pieces(z_index, q, min_len):
    """Continuous stretches of a surface with a real pick (trace arrays)."""
    good = np.flatnonzero(q >= MIN_POINT_QUALITY)
    if good.size == 0:
        return []
    parts = np.split(good, np.flatnonzero(np.diff(good) > 2) + 1)
    return [p for p in parts if p.size >= min_len]


def _point(images, c, t):
    k = int(c.at(t))
    return PickPoint(int(t), float(images.z_of(c.z_index[k])), float(c.quality[k]))


def _profile_extent(images, a):
    """Traces over which a margin's profile is exported."""
    c = a.candidate
    if c.bends.shelf_break is not None and c.bends.toe is not None:
        return np.arange(c.lo, c.hi)
    pad = int(np.ceil(RAMP_PROFILE_PAD_SIGMAS * c.bends.sigma_traces))
    lo = max(c.lo, c.bends.leg.start - pad)
    hi = min(c.hi, c.bends.leg.end + pad + 1)
    return np.arange(lo, hi)


def _exported_profile(c):
    """z index of a margin's profile as exported: the picks, or for a margin
    without a distinct break (a ramp) the picks smoothed at the scale its
    slope was judged on (one pick jump is not a ramp's slope)."""
    if c.bends.shelf_break is not None and c.bends.toe is not None:
        return c.z_index
    return smooth_profile(c.z_index, c.bends.sigma_traces)


def pick_default(
    section,
    *,
    velocity=None,
    smoothing_m: float | None = None,
    min_relief_m: float | None = None,
    n_surfaces: int = 12,
    min_confidence: float = DEFAULT_MIN_CONFIDENCE,
):
    """Margins, their platform tops, clinoforms, shelf breaks and toes, picked from the image without seeds.

    Parameters
    ----------
    section : xarray.DataArray, dims ("trace", "z")
        A section (TWT or depth), see :mod:`clinometry.section`.
    velocity : velocity model, float (m/s) or None
        For depth conversion (``clinometry.depth``); None means the package
        default constant velocity for TWT sections (noted in ``Picks.notes``)
        and nothing for depth sections.
    smoothing_m : float, m, optional
        Gaussian smoothing length (sigma) along the line for break and toe.
        Default: one dominant wavelength of the data.
    min_relief_m : float, m, optional
        Smallest relief of a margin.  Default: half a dominant wavelength
        (twice the vertical resolution of a quarter wavelength, Widess 1973,
        from memory), at least 10 m.
    n_surfaces : int
        How many reflector surfaces to trace.
    min_confidence : float
        Margins with lower confidence are left out (listed in notes).

    Returns
    -------
    Picks
        Horizons: each margin's profile (role ``margin_profile``) and older
        clinoforms (``clinoform``), its ``platform_top`` (ids from 10000)
        and the other tracked reflector pieces (ids from 20000, role
        ``reflector``).  Margins with break, toe, clinoforms (oldest first)
        and confidence, or none with notes saying why.

    Raises
    ------
    PickingError
        When the section has no live trace or too few samples per period.

    References
    ----------
    .. [1] Widess, M. B. (1973). How thin is a thin bed? Geophysics 38(6),
       1176-1180. (from memory)
    """
    check_section(section)
    images = prepare(section, velocity, smoothing_m=smoothing_m, min_relief_m=min_relief_m)
    notes = list(images.notes)
    unfit = band_limited(images)
    if unfit:
        notes.append(unfit)
        surfaces, candidates = [], []
    else:
        surfaces = track_surfaces(images.envelope, images.positive, images.cost, period_samples=images.period_samples,
                                  n_surfaces=n_surfaces, dead=images.dead)
        surfaces += seeded_surfaces(images.envelope, images.positive, images.cost, surfaces,
                                    period_samples=images.period_samples, dead=images.dead)
        surfaces += face_surfaces(images, existing=surfaces)
        candidates = propose_candidates(images, surfaces)
    assessed = [assess(images, c) for c in candidates]
    drops = {}
    chosen = choose_margins(images, assessed, min_confidence=min_confidence, dropped=drops)
    rejected = []
    for a, why in dropped_candidates(assessed, chosen, images, drops):
        c = a.candidate
        notes.append(f"candidate facing {c.direction} at trace {c.bends.steepest} (relief {a.relief_m:.0f} m, "
                     f"steepest {c.bends.slope_max_deg:.1f} deg) dropped: {why}")
        tr = _profile_extent(images, a)
        k = c.at(tr)
        rejected.append(RejectedCandidate(c.direction, tr, images.z_of(c.z_index[k]), _point(images, c, c.bends.steepest),
                                          why, round(float(a.confidence), 3)))

    horizons, margins = [], []
    next_id = 0
    rows = np.arange(images.n_trace)
    for a in chosen:
        c = a.candidate
        b = c.bends
        prof_id = next_id
        next_id += 1
        tr = _profile_extent(images, a)
        k = c.at(tr)
        horizons.append(Horizon(prof_id, "margin_profile", tr, images.z_of(_exported_profile(c)[k]), c.quality[k]))
        top = top_traces(c, images)
        top_id = None
        brk_t = b.shelf_break if b.shelf_break is not None else b.outer_break
        top = np.unique(np.r_[top, np.arange(min(brk_t, top.min()), max(brk_t, top.max()) + 1)]) if top.size else top
        if top.size >= 2:
            top_id = 10_000 + prof_id
            kt = c.at(top)
            horizons.append(Horizon(top_id, "platform_top", top, images.z_of(c.z_index[kt]), c.quality[kt]))
        clinos = []
        older, c_notes = older_clinoforms(images, c) if b.shelf_break is not None and b.toe is not None else ([], [])
        notes.extend(c_notes)
        for f in older:
            hid = next_id
            next_id += 1
            fb = f.bends
            lo, hi = fb.leg.start, fb.leg.end
            ftr = rows[lo : hi + 1]
            horizons.append(Horizon(hid, "clinoform", ftr, images.z_of(f.z_index[ftr]), f.quality[ftr]))
            clinos.append(ClinoformPicks(
                hid,
                PickPoint(int(fb.shelf_break), float(images.z_of(f.z_index[fb.shelf_break])), float(f.quality[fb.shelf_break])),
                PickPoint(int(fb.toe), float(images.z_of(f.z_index[fb.toe])), float(f.quality[fb.toe])) if fb.toe is not None else None,
                fb.break_reason, fb.toe_reason, source="dip_field"))
        brk = _point(images, c, b.shelf_break) if b.shelf_break is not None else None
        toe = _point(images, c, b.toe) if b.toe is not None else None
        clinos.append(ClinoformPicks(prof_id, brk, toe, b.break_reason, b.toe_reason))
        ev_notes = tuple(e.reason for e in a.evidence.values())
        margins.append(MarginPicks(
            direction=c.direction, profile_id=prof_id, platform_top_id=top_id, shelf_break=brk, toe=toe,
            clinoforms=tuple(clinos), confidence=round(float(a.confidence), 3),
            break_reason=b.break_reason or (f"{a.edge} at the edge of the image" if "shelf break" in a.edge else ""),
            toe_reason=b.toe_reason or (f"{a.edge} at the edge of the image" if "toe" in a.edge else ""),
            notes=(f"relief {a.relief_m:.0f} m, steepest slope {b.slope_max_deg:.1f} deg", *ev_notes)))

    min_len = max(3, int(np.ceil(MIN_HORIZON_WAVELENGTHS * images.wavelength_m / images.dx_m)))
    for s in surfaces:
        for tr in _pieces(s.z_index, s.quality, min_len):
            horizons.append(Horizon(20_000 + next_id, "reflector", tr, images.z_of(s.z_index[tr]), s.quality[tr],
                                    s.polarity))
            next_id += 1
    if not margins:
        notes.append("no margin: " + ("no traced surface deepens by at least "
                                       f"{images.min_relief_m:.0f} m from a flatter top" if not candidates else
                                       "no candidate has the evidence of a margin (see the notes above)"))
    horizons.sort(key=lambda h: h.id)
    params = {
        "smoothing_m": images.smoothing_m,
        "min_relief_m": images.min_relief_m,
        "n_surfaces": int(n_surfaces),
        "min_confidence": float(min_confidence),
        "dominant_period": float(images.period_samples * float(section.attrs["sample_interval"])),
        "wavelength_m": float(images.wavelength_m),
    }
    logger.info("%s: %d surfaces, %d candidates, %d margin(s)", images.name, len(surfaces), len(candidates), len(margins))
    return Picks(horizons=tuple(horizons), margins=tuple(margins), picker="default", parameters=params,
                 notes=tuple(notes), rejected=tuple(rejected))
