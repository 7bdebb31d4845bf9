"""Margin candidates on a depth profile: legs, steepest point, shelf break and toe.

A surface converted to depth is a profile ``depth(distance)``.  A margin is
a *leg* of it: a stretch that deepens by at least the minimum relief from a
flatter top to a flatter floor.  Every measure here is geometric and uses
only the profile.  Whether the image supports the leg (reflections, onlap,
a platform top) is judged by :mod:`clinometry.picking.evidence`.

1. **Legs.**  The profile, median-filtered over one smoothing length (single
   trace outliers) and Gaussian-smoothed over :data:`LEG_SMOOTHING_FACTOR`
   smoothing lengths, is cut at its significant depth extrema
   (:func:`scipy.signal.find_peaks`, prominence half the minimum relief).
   A leg between a shallow and a deep extremum with at least the minimum
   relief is a candidate, facing the way it deepens (``"+"`` towards
   increasing trace index).  The two flanks of a mound, the two margins of
   an isolated platform and two flanks facing each other across a saddle
   are legs of their own, whatever the width of the top or the saddle.
2. **Steepest point, break and toe.**  On the profile smoothed over the
   smoothing length (one dominant wavelength by default, at least an eighth
   of the slope's width so that a ramp is judged at its own scale), the
   steepest point is the maximum basinward gradient inside the leg; the
   shelf break is the maximum of convex-up curvature
   ``kappa = d'' / (1 + d'^2)^(3/2)`` between the landward end of the leg and
   the steepest point, the toe the maximum of concave-up curvature between
   the steepest point and the basinward end (both ends padded by the
   smoothing support).  This is the geometric definition of break and toe
   of clinoform rollover points (Adams & Schlager 2000; Pirmez, Pratson &
   Steckler 1998).
3. **Distinct break.**  A bend is a shelf break only when it is sharp: its
   curvature reaches :data:`DISTINCT_BEND_PER_KM` (a change of slope of about
   6 deg within 1 km).  A profile that descends gently over many kilometres
   bends far less (a 1 deg ramp over 2 km: 0.01/km) and has no shelf break
   and no toe: a ramp (Ahr 1973; Burchette & Wright 1992); its break and toe
   are reported missing with that reason and its slope is measured over the
   whole leg.

References
----------
.. [1] Adams, E. W. & Schlager, W. (2000). Basic types of submarine slope
   curvature. Journal of Sedimentary Research 70(4), 814-828. (from memory)
.. [2] Pirmez, C., Pratson, L. F. & Steckler, M. S. (1998). Clinoform
   development by advection-diffusion of suspended sediment. Journal of
   Geophysical Research 103(B10), 24141-24157. (from memory)
.. [3] Ahr, W. M. (1973). The carbonate ramp: an alternative to the shelf
   model. Transactions of the Gulf Coast Association of Geological
   Societies 23, 221-225. (from memory)
.. [4] Burchette, T. P. & Wright, V. P. (1992). Carbonate ramp depositional
   systems. Sedimentary Geology 79, 3-57. (from memory)
"""

from __future__ import annotations

import logging
from dataclasses import dataclass

import numpy as np
from scipy import ndimage, signal

__all__ = [
    "Leg",
    "Bends",
    "smooth_profile",
    "find_legs",
    "leg_bends",
    "LEG_SMOOTHING_FACTOR",
    "DISTINCT_BEND_PER_KM",
    "SLOPE_WIDTH_SMOOTHING_DIVISOR",
    "Candidate",
    "propose_candidates",
    "leg_readings",
]

logger = logging.getLogger(__name__)

#: legs are cut at extrema of the profile smoothed over this many smoothing
#: lengths, so wiggles of a wavelet or two do not split a slope (our choice,
#: no source)
LEG_SMOOTHING_FACTOR = 4.0
#: a bend is a distinct shelf break (or toe) when its curvature reaches this,
#: per km: a change of slope of about 6 deg within 1 km (the same bound as
#: the classifier's sharp break; common practice, no source)
DISTINCT_BEND_PER_KM = 0.1
#: the curvature smoothing is at least the slope width divided by this
#: (a slope is judged at its own scale; common practice, no source)
SLOPE_WIDTH_SMOOTHING_DIVISOR = 8.0
#: the slope zone of a leg: where it gains the middle of its relief (from the
#: 10th to the 90th percentile; our choice, no source)
RELIEF_ZONE = (0.1, 0.9)
#: a profile has flattened (top or floor reached) where its basinward gradient
#: falls below this fraction of the steepest (our choice, no source)
FLAT_FRACTION = 0.1
#: a bend of a Gaussian-smoothed kink spreads over about +-2 sigma
#: (property of the Gaussian; the search reaches that far beyond the flat)
BEND_SUPPORT_SIGMAS = 2.0


@dataclass(frozen=True)
class Leg:
    """A stretch of a profile between a shallow and a deep extremum.

    Attributes
    ----------
    direction : {"+", "-"}
        The way it deepens: ``"+"`` towards increasing trace index.
    start, end : int
        Trace indices of its extrema (``start < end``).
    relief_m : float
        Depth difference of the extrema on the leg-smoothed profile (> 0).
    """

    direction: str
    start: int
    end: int
    relief_m: float

    @property
    def landward(self) -> int:
        return self.start if self.direction == "+" else self.end

    @property
    def basinward(self) -> int:
        return self.end if self.direction == "+" else self.start


@dataclass(frozen=True)
class Bends:
    """Steepest point, break and toe of one leg (trace indices).

    ``shelf_break`` / ``toe`` are None when there is no distinct bend, and
    the reasons say why.  ``break_curvature_per_km`` and
    ``toe_curvature_per_km`` are the signed bend sharpness (positive for
    the expected shapes).
    """

    leg: Leg
    steepest: int
    shelf_break: int | None
    toe: int | None
    break_reason: str
    toe_reason: str
    slope_max_deg: float
    sigma_traces: float
    break_curvature_per_km: float
    toe_curvature_per_km: float
    #: the leg-scale bend points used for the relief and flatness measures,
    #: present even where the bend is not distinct
    outer_break: int = 0
    outer_toe: int = 0


def _spacing(x):
    return float(np.median(np.abs(np.diff(x)))) if x.size > 1 else 1.0


def smooth_profile(depth_m, sigma_traces: float):
    """Median over about one sigma (odd, >= 3 traces), then a Gaussian of ``sigma_traces``.

    Examples
    --------
    >>> d = np.r_[np.zeros(20), 100.0, np.zeros(20)]
    >>> float(smooth_profile(d, 1.0).max()) < 1.0
    True
    """
    d = np.asarray(depth_m, dtype=float)
    size = int(max(3, 2 * round(sigma_traces / 2) + 1))
    med = ndimage.median_filter(d, size=min(size, max(1, d.size | 1)), mode="nearest")
    return ndimage.gaussian_filter1d(med, max(float(sigma_traces), 0.5), mode="nearest")


def find_legs(distance_m, depth_m, *, smoothing_m: float, min_relief_m: float) -> list[Leg]:
    """Legs of a profile between significant extrema with at least the minimum relief.

    Parameters
    ----------
    distance_m, depth_m : array_like, shape (n,), m
    smoothing_m : float, m
        Smoothing length (sigma); legs use :data:`LEG_SMOOTHING_FACTOR` times it.
    min_relief_m : float, m

    Returns
    -------
    list of Leg, ordered along the line

    Examples
    --------
    A mound: up (facing "-") then down (facing "+").

    >>> x = np.arange(300) * 25.0
    >>> d = 800 - 200 * np.exp(-0.5 * ((x - 3750) / 700) ** 2)
    >>> [(g.direction, g.start, g.end) for g in find_legs(x, d, smoothing_m=50, min_relief_m=50)]
    [('-', 0, 150), ('+', 150, 299)]
    """
    x = np.asarray(distance_m, dtype=float)
    d = np.asarray(depth_m, dtype=float)
    n = d.size
    if n < 5:
        return []
    sig = max(smoothing_m / _spacing(x), 0.5)
    d_leg = ndimage.gaussian_filter1d(smooth_profile(d, sig), LEG_SMOOTHING_FACTOR * sig, mode="nearest")
    prom = 0.5 * min_relief_m
    hi, _ = signal.find_peaks(d_leg, prominence=prom)
    lo, _ = signal.find_peaks(-d_leg, prominence=prom)
    ext = sorted({0, n - 1, *map(int, hi), *map(int, lo)})
    legs = []
    for a, b in zip(ext[:-1], ext[1:]):
        rel = float(d_leg[b] - d_leg[a])
        if b - a < 2 or abs(rel) < min_relief_m:
            continue
        legs.append(Leg("+" if rel > 0 else "-", int(a), int(b), abs(rel)))
    return legs


def _flattened(gb, p, step, end, reach):
    """Trace ``reach`` beyond the first one, walking from ``p`` by ``step``, where
    the basinward gradient has fallen below :data:`FLAT_FRACTION` of that at ``p``
    (or ``end``)."""
    k = p
    while k != end and gb[k] > FLAT_FRACTION * gb[p]:
        k += step
    k += step * reach
    return int(min(k, end) if step > 0 else max(k, end))


def _relief_zone(x, d, leg):
    """Traces where a leg's monotone envelope passes :data:`RELIEF_ZONE` of its relief (landward one first)."""
    seg = d[leg.start : leg.end + 1]
    if leg.direction == "-":
        seg = seg[::-1]
    env = np.maximum.accumulate(seg)
    top, bot = float(env[0]), float(env[-1])
    rel = max(bot - top, 1e-9)
    i0 = int(np.searchsorted(env, top + RELIEF_ZONE[0] * rel))
    i1 = int(np.searchsorted(env, top + RELIEF_ZONE[1] * rel))
    i1 = max(i1, i0)
    if leg.direction == "+":
        return leg.start + i0, leg.start + min(i1, seg.size - 1)
    return leg.end - i0, leg.end - min(i1, seg.size - 1)


def _derivatives(d, x):
    g = np.gradient(d, x)
    k = np.gradient(g, x) / (1.0 + g * g) ** 1.5
    return g, k


def leg_bends(distance_m, depth_m, leg: Leg, *, smoothing_m: float, scale: str = "slope") -> Bends:
    """Steepest point, shelf break and toe of a leg by curvature.

    Parameters
    ----------
    distance_m, depth_m : array_like, shape (n,), m
        The whole profile (the leg is searched with a padding of the
        smoothing support on both sides).
    leg : Leg
    smoothing_m : float, m
        Smoothing length (sigma).
    scale : {"slope", "leg"}
        ``"slope"``: the profile is read at the smoothing length, so a
        rimmed shelf or steep margin is seen with its sharp break even where
        a gentle tail (a dipping basin floor, a long topset) makes the leg
        much wider than the slope.  ``"leg"``: the smoothing is at least an
        eighth of the width of the leg's relief zone (where it gains the
        middle :data:`RELIEF_ZONE` of its relief), so a ramp is judged over
        its kilometres and a jump of the picks on it does not count as its
        slope.

    Returns
    -------
    Bends

    Examples
    --------
    >>> x = np.arange(200) * 25.0
    >>> d = 500 + np.clip((x - 2000) * np.tan(np.radians(20)), 0, 300)
    >>> leg = find_legs(x, d, smoothing_m=50, min_relief_m=50)[0]
    >>> b = leg_bends(x, d, leg, smoothing_m=50)
    >>> (b.shelf_break, b.toe, round(b.slope_max_deg))
    (80, 113, 20)
    """
    x = np.asarray(distance_m, dtype=float)
    d = np.asarray(depth_m, dtype=float)
    n = d.size
    dx = _spacing(x)
    sig = max(smoothing_m / dx, 0.5)
    sgn = 1.0 if leg.direction == "+" else -1.0
    base = smooth_profile(d, sig)
    z0, z1 = _relief_zone(x, base, leg)
    if scale == "leg":
        width = abs(x[z1] - x[z0]) / (RELIEF_ZONE[1] - RELIEF_ZONE[0])
        sig_leg = max(sig, width / (SLOPE_WIDTH_SMOOTHING_DIVISOR * dx))
        a0, a1 = sorted((z0, z1))
    else:
        sig_leg = sig
        a0, a1 = leg.start, leg.end
    prof = base if sig_leg <= sig else ndimage.gaussian_filter1d(smooth_profile(d, sig), sig_leg, mode="nearest")
    g, kappa = _derivatives(prof, x)
    gb = sgn * g
    pad = int(np.ceil(2 * sig_leg))
    lo, hi = max(0, leg.start - pad), min(n - 1, leg.end + pad)
    p = int(a0 + np.argmax(gb[a0 : a1 + 1]))
    slope_max = float(np.degrees(np.arctan(max(gb[p], 0.0))))
    # the bends of this slope are the nearest ones: the search on each side
    # stops one bend support beyond where the profile has flattened
    # (a platform top or basin floor), so the far margin of an isolated
    # platform or the far flank of a saddle is never taken
    reach = int(np.ceil(BEND_SUPPORT_SIGMAS * sig_leg))
    lo = max(lo, _flattened(gb, p, -1, lo, reach))
    hi = min(hi, _flattened(gb, p, +1, hi, reach))
    land = np.arange(lo, p + 1) if leg.direction == "+" else np.arange(p, hi + 1)
    basin = np.arange(p, hi + 1) if leg.direction == "+" else np.arange(lo, p + 1)
    brk = int(land[np.argmax(kappa[land])]) if land.size else None
    toe = int(basin[np.argmax(-kappa[basin])]) if basin.size else None
    kb_max = float(kappa[brk]) * 1000.0 if brk is not None else 0.0
    kt_max = float(-kappa[toe]) * 1000.0 if toe is not None else 0.0
    outer_b = brk if brk is not None and brk != p else leg.landward
    outer_t = toe if toe is not None and toe != p else leg.basinward
    break_reason = toe_reason = ""
    if brk is None or brk == p or kb_max <= 0:
        break_reason = "no convex-up bend landward of the steepest point"
        brk = None
    elif kb_max < DISTINCT_BEND_PER_KM:
        break_reason = (f"no distinct shelf break: the profile bends by at most {kb_max:.3f}/km landward of its "
                        f"steepest point (a distinct break bends by {DISTINCT_BEND_PER_KM}/km or more), as on a ramp")
        brk = None
    if toe is None or toe == p or kt_max <= 0:
        toe_reason = "no concave-up bend basinward of the steepest point (toe beyond the line or no basin floor)"
        toe = None
    elif brk is None and break_reason.startswith("no distinct"):
        toe_reason = "no distinct toe: a profile without a distinct break (a ramp) has none either"
        toe = None
    if brk is None:
        # no distinct break (a ramp): its top is read landward of where the
        # leg starts to gain relief, its floor beyond where it ends
        outer_b = z0
        outer_t = z1
    return Bends(leg=leg, steepest=p, shelf_break=brk, toe=toe, break_reason=break_reason, toe_reason=toe_reason,
                 slope_max_deg=slope_max, sigma_traces=float(sig_leg), break_curvature_per_km=kb_max,
                 toe_curvature_per_km=kt_max, outer_break=int(outer_b), outer_toe=int(outer_t))


def leg_readings(distance_m, depth_m, leg: Leg, *, smoothing_m: float, min_relief_m: float) -> list:
    """The readings of a leg worth judging: at the slope scale, and at the leg scale where it differs.

    The slope-scale reading is a margin with a break when its break and toe
    are distinct and bound at least the minimum relief; the leg-scale
    reading (a ramp, or a margin whose slope is wide) is added when the
    slope-scale reading is not such a margin, or when the two disagree on
    where the slope is.  Which one is the margin is for the evidence to say.
    """
    fine = leg_bends(distance_m, depth_m, leg, smoothing_m=smoothing_m, scale="slope")
    coarse = leg_bends(distance_m, depth_m, leg, smoothing_m=smoothing_m, scale="leg")
    d = np.asarray(depth_m, dtype=float)
    sharp = (fine.shelf_break is not None and fine.toe is not None
             and abs(float(d[fine.toe] - d[fine.shelf_break])) >= min_relief_m)
    out = [fine] if sharp else []
    if not sharp or coarse.shelf_break is None or abs(coarse.steepest - fine.steepest) > 2 * fine.sigma_traces:
        if coarse.sigma_traces > fine.sigma_traces or not out:
            out.append(coarse)
    return out


@dataclass(frozen=True)
class Candidate:
    """A margin candidate: its profile through the slope, its leg and bends.

    Attributes
    ----------
    direction : {"+", "-"}
    lo, hi : int
        Trace window of the profile (``hi`` exclusive).
    z_index : numpy.ndarray, shape (hi - lo,)
        Sub-sample z index of the profile per trace of the window.
    depth_m : numpy.ndarray, shape (hi - lo,)
    quality, support : numpy.ndarray, shape (hi - lo,)
        Reflection strength at the pick and along the step from the previous
        trace (0..1 above the background).
    bends : Bends
        Trace indices relative to the whole line.
    source_rank : int
        Rank of the tracked surface on which the candidate was first seen.
    polarity : str
        ``"peak"``, ``"trough"`` or ``"unknown"``: the wavelet lobe the
        profile follows.
    inferred : numpy.ndarray of bool, shape (hi - lo,)
        Picks continued along an imaged face's dip where the face is not
        imaged (:mod:`~clinometry.picking.face_extension`).
    """

    direction: str
    lo: int
    hi: int
    z_index: np.ndarray
    depth_m: np.ndarray
    quality: np.ndarray
    support: np.ndarray
    bends: Bends
    source_rank: int
    polarity: str = "unknown"
    inferred: np.ndarray = None

    def at(self, trace):
        """Index into the window arrays of a trace index of the line."""
        return np.asarray(trace) - self.lo

    @property
    def shelf_break(self):
        return self.bends.shelf_break

    @property
    def toe(self):
        return self.bends.toe


#: the profile of a candidate is extracted over its leg and this many leg
#: widths (at least PROFILE_MARGIN_M) on each side, so its platform top and
#: basin floor are seen (our choice, no source)
PROFILE_MARGIN_LEGS = 1.0
PROFILE_MARGIN_M = 3000.0


def _local_legs(x, d, smoothing_m, min_relief_m, p, direction):
    """The leg of a re-extracted profile that holds trace ``p`` and faces ``direction``."""
    legs = [g for g in find_legs(x, d, smoothing_m=smoothing_m, min_relief_m=min_relief_m) if g.direction == direction]
    inside = [g for g in legs if g.start <= p <= g.end]
    if inside:
        return inside[0]
    if not legs:
        return None
    near = min(legs, key=lambda g: min(abs(g.start - p), abs(g.end - p)))
    return near if min(abs(near.start - p), abs(near.end - p)) <= 2 else None


def propose_candidates(images, surfaces) -> list[Candidate]:
    """Margin candidates from the legs of every tracked surface, each re-extracted through its slope.

    A leg found on a tracked surface says where a slope may be; the surface
    itself may have been pushed off the platform top by an earlier, stronger
    surface.  So each leg's profile is extracted again on the full image as
    the minimal path through the leg's steepest point, biased against
    rising basinward (:func:`~clinometry.picking.tracking.path_through`):
    the platform top landward of it, the slope, the basin floor beyond.
    Its own leg and bends are then measured on that profile.  Candidates
    whose profiles share the steepest point are one candidate.

    Parameters
    ----------
    images : SectionImages
    surfaces : list of Surface

    Returns
    -------
    list of Candidate
    """
    x = images.distance_m
    rows = np.arange(images.n_trace)
    out = []
    seen = []
    tried = []
    for s in surfaces:
        d = images.depth_of(rows, s.z_index)
        for leg in find_legs(x, d, smoothing_m=images.smoothing_m, min_relief_m=images.min_relief_m):
            for b0 in leg_readings(x, d, leg, smoothing_m=images.smoothing_m, min_relief_m=images.min_relief_m):
                # a reading whose slope another surface already gave is not extracted again
                pre = (leg.direction, b0.steepest, float(s.z_index[b0.steepest]), b0.shelf_break is None)
                if any(_same(k, pre, images) for k in tried):
                    continue
                tried.append(pre)
                cand = _reextract(images, s, leg, b0)
                if cand is None:
                    continue
                key = (cand.direction, cand.bends.steepest, float(cand.z_index[cand.at(cand.bends.steepest)]),
                       cand.bends.shelf_break is None)
                if any(_same(k, key, images) for k in seen):
                    continue
                seen.append(key)
                out.append(cand)
    return out


def _same(a, b, images):
    """Two readings (direction, steepest trace, z index there, rampness) of one slope."""
    return (a[0] == b[0] and a[3] == b[3] and abs(a[1] - b[1]) <= max(2.0, images.wavelength_m / images.dx_m)
            and abs(a[2] - b[2]) <= images.period_samples)


def _reextract(images, s, leg, b0):
    """A candidate from one reading of a surface's leg, its profile extracted again through the steepest point.

    None when the re-extracted profile has no leg facing the same way there.
    """
    from .face_extension import MAX_ONLAP_STEPS, continue_below_onlap, extend_faces
    from .tracking import path_through, refine, run_support

    img = images.cost
    p = b0.steepest
    width = leg.end - leg.start
    pad = int(max(PROFILE_MARGIN_LEGS * width, PROFILE_MARGIN_M / images.dx_m))
    lo, hi = max(0, leg.start - pad), min(images.n_trace, leg.end + pad + 1)
    pol_img = img.with_polarity(s.polarity)
    cells = path_through(pol_img, p, int(images.cells(s.z_index[p])), direction=leg.direction, lo=lo, hi=hi)
    zi, _ = refine(images.envelope[lo:hi], cells, img.factor, amplitude=images.amplitude, polarity=s.polarity,
                   rows=np.arange(lo, hi))
    strength = 1.0 - pol_img.cost[lo:hi]
    zi, inferred = extend_faces(zi, cells, strength, direction=leg.direction, period_samples=images.period_samples)
    cells = np.where(inferred, images.cells(zi), cells)
    dep = images.depth_of(np.arange(lo, hi), zi)
    xw = images.distance_m[lo:hi]
    g = _local_legs(xw, dep, images.smoothing_m, images.min_relief_m, p - lo, leg.direction)
    if g is None:
        logger.debug("surface %d leg %d-%d: re-extracted profile has no leg there", s.rank, leg.start, leg.end)
        return None
    scale = "leg" if b0.sigma_traces > max(images.smoothing_m / images.dx_m, 0.5) + 1e-9 else "slope"
    bw = leg_bends(xw, dep, g, smoothing_m=images.smoothing_m, scale=scale)
    # a toe that is a fill reflector lapping onto the slope is not the toe:
    # the slope goes on below it, to the floor it rests on
    reach = max(2, int(round(images.wavelength_m / images.dx_m)))
    for _ in range(MAX_ONLAP_STEPS):
        if bw.toe is None or bw.shelf_break is None:
            break
        sgn = 1.0 if leg.direction == "+" else -1.0
        gz = sgn * np.gradient(smooth_profile(zi, max(1.0, 0.5 * bw.sigma_traces)))
        a_, b_ = sorted((bw.shelf_break, bw.toe))
        steep = gz[a_ : b_ + 1]
        steep = steep[steep >= 0.5 * steep.max()] if steep.size and steep.max() > 0 else steep
        dip = float(np.median(steep)) if steep.size else 0.0
        got = continue_below_onlap(zi, cells, strength, bw.toe, direction=leg.direction, dip_samples=dip,
                                   reach=reach, cell_of=images.cells, limit=2 * abs(b_ - a_) + reach)
        if got is None:
            break
        zc, inf2, f = got
        t_f = lo + f
        if leg.direction == "+":
            floor_cells = path_through(pol_img, t_f, int(images.cells(zc[f])), direction="+", lo=t_f, hi=hi)
            part = slice(f, hi - lo)
        else:
            floor_cells = path_through(pol_img, t_f, int(images.cells(zc[f])), direction="-", lo=lo, hi=t_f + 1)
            part = slice(0, f + 1)
        zf, _ = refine(images.envelope[lo:hi][part], floor_cells, img.factor, amplitude=images.amplitude,
                       polarity=s.polarity, rows=np.arange(lo, hi)[part])
        zc[part] = zf
        zc[f] = zf[0] if leg.direction == "+" else zf[-1]
        cells = np.where(inf2, images.cells(zc), cells)
        cells[part] = floor_cells
        zi = zc
        inferred |= inf2
        dep = images.depth_of(np.arange(lo, hi), zi)
        g2 = _local_legs(xw, dep, images.smoothing_m, images.min_relief_m, p - lo, leg.direction)
        if g2 is None:
            break
        bw = leg_bends(xw, dep, g2, smoothing_m=images.smoothing_m, scale=scale)
    q = strength[np.arange(hi - lo), cells].astype(float)
    sup = run_support(strength, cells)
    q[images.dead[lo:hi] | inferred] = 0.0
    sup[images.dead[lo:hi]] = 0.0
    return Candidate(direction=leg.direction, lo=lo, hi=hi, z_index=zi.astype(float), depth_m=dep,
                     quality=q, support=sup, bends=_shift(bw, lo), source_rank=s.rank, polarity=s.polarity,
                     inferred=inferred)


def _shift(b: Bends, lo: int) -> Bends:
    leg = Leg(b.leg.direction, b.leg.start + lo, b.leg.end + lo, b.leg.relief_m)
    return Bends(leg=leg, steepest=b.steepest + lo, shelf_break=None if b.shelf_break is None else b.shelf_break + lo,
                 toe=None if b.toe is None else b.toe + lo, break_reason=b.break_reason, toe_reason=b.toe_reason,
                 slope_max_deg=b.slope_max_deg, sigma_traces=b.sigma_traces,
                 break_curvature_per_km=b.break_curvature_per_km, toe_curvature_per_km=b.toe_curvature_per_km,
                 outer_break=b.outer_break + lo, outer_toe=b.outer_toe + lo)
