"""Assembling margins from surfaces: slope-face profiles, checks and choices.

Helpers of :func:`clinometry.picking.surfaces.pick_default`:

* a slope face (:mod:`~clinometry.picking.faces`) is continued landward and
  basinward along the tracked surfaces that meet its ends, joined where they
  meet so the profile has no step;
* a candidate from a tracked surface whose foreset cuts across coherent
  reflectors of another dip is a jump between reflectors, and a face whose
  underlying reflections do not dip like it is an artefact (both tested with
  the structure-tensor dip, Fehmers & Höcker 2003, from memory);
* of the candidates of one margin the outer (shallowest strong) surface is
  the profile; margins facing both ways over one slope, or buried beneath a
  more confident profile, are dropped with a note.

All thresholds are facts of the trade with no single source and are named
constants below.
"""

from __future__ import annotations

import numpy as np
from scipy import ndimage

from .condition import quantile_sample
from .margins import velocity_at
from .tracking import TrackedPath

__all__ = [
    "SIDE_LOBE_PERIODS",
    "select_clinoforms",
    "limit_slope",
    "choose_profile",
    "dip_agreement",
    "cuts_layering",
    "steepest_unconfirmed",
    "drop_buried",
    "drop_opposed",
    "envelope_quality",
    "face_profile",
    "face_unconfirmed",
    "foreset_span",
    "regularise",
    "true_dip_deg",
    "TrueDipRows",
]

#: coherent dips steeper than this (true degrees) mark a slope face
#: (common practice, no source)
FACE_MIN_DIP_DEG = 3.0
#: reflections below a face must dip at least this fraction of its slope
#: (common practice, no source)
FACE_DIP_AGREEMENT = 0.4
#: the reflection dip at the steepest point is read within this fraction of
#: the foreset width (break to toe) on either side of it, at least one
#: smoothing length (our choice, no source)
STEEPEST_WINDOW_FORESET_FRACTION = 0.25
#: lateral Gaussian sigma (traces) of the structure tensor of
#: :func:`clinometry.picking.orientation.reflector_orientation` as called by
#: the default picker (sigma_trace=1.5)
TENSOR_SIGMA_TRACES = 1.5
#: a foreset whose relief is at least this share in jumps of a quarter
#: period or more, with at least STAIRCASE_TREAD_SHARE of its traces flat
#: (steps below a tenth of a period), is a staircase (our choice, no source)
STAIRCASE_JUMP_SHARE = 0.6
STAIRCASE_TREAD_SHARE = 0.5
#: structure-tensor coherence above which a dip is trusted in these tests
#: (common practice, no source)
FACE_COHERENCE = 0.5


def true_dip_deg(section, velocity, dip_samples, dx_m):
    """True dip (degrees) from dip in samples per trace: tan = (v/2) dt/dx for TWT.

    Computed in place in the one output array, in the same operation order
    as ``degrees(arctan(0.5 * v * dip * dz * 1e-3 / dx))`` (identical
    values, no full-size temporaries: memory).
    """
    dz = float(section.attrs["sample_interval"])
    dip_samples = np.asarray(dip_samples)
    if section.attrs["domain"] == "depth":
        out = np.multiply(dip_samples, dz)
    else:
        v = np.atleast_1d(velocity_at(section, velocity, section["z"].values)).astype(np.float32)
        v = np.broadcast_to(v, (dip_samples.shape[1],))[None, :]
        out = np.multiply(0.5 * v, dip_samples)
        np.multiply(out, dz, out=out)
        np.multiply(out, 1e-3, out=out)
    np.divide(out, dx_m, out=out)
    np.arctan(out, out=out)
    np.degrees(out, out=out)
    return out.astype(np.float32, copy=False)


class TrueDipRows:
    """The true dip of :func:`true_dip_deg`, made for a slice of traces where read.

    For a reader that goes through the image block by block
    (:func:`clinometry.picking.faces.slope_faces`): the values are those of
    :func:`true_dip_deg` on the whole image, without a full-size image
    (memory).  Only ``shape`` and slicing by rows (``obj[a:b]``) are provided.
    """

    def __init__(self, section, velocity, dip_samples, dx_m):
        self._args = (section, velocity, dx_m)
        self._dip = dip_samples
        self.shape = dip_samples.shape

    def __getitem__(self, rows):
        if not isinstance(rows, slice):
            raise TypeError("TrueDipRows is read by slices of traces only")
        section, velocity, dx_m = self._args
        return true_dip_deg(section, velocity, self._dip[rows], dx_m)


#: a surface is regularised by a running median over this many wavelengths
#: and a Gaussian with a sigma of REGULARISE_SIGMA_WAVELENGTHS, to remove single-trace jumps between
#: wavelet lobes without flattening slopes (common practice, no source)
REGULARISE_WAVELENGTHS = 1.0
REGULARISE_SIGMA_WAVELENGTHS = 0.5


def regularise(z_index, wavelength_traces):
    """Running median then Gaussian along the line (sizes from the wavelength)."""
    size = int(max(3, 2 * round(REGULARISE_WAVELENGTHS * wavelength_traces / 2) + 1))
    med = ndimage.median_filter(z_index, size=size, mode="nearest")
    return ndimage.gaussian_filter1d(med, max(0.5, REGULARISE_SIGMA_WAVELENGTHS * wavelength_traces), mode="nearest")


def envelope_quality(env, dead):
    # quantiles from every k-th trace of a large image (as the tracker's,
    # tracking.py), the quality made in place in one float32 array (memory)
    scale = float(np.percentile(quantile_sample(env), 99.5)) or 1.0
    q = np.clip(env / scale, 0.0, 1.0)
    bg = float(np.median(quantile_sample(q, rows=np.flatnonzero(~dead)))) if (~dead).any() else 0.0
    np.subtract(q, bg, out=q)
    np.divide(q, max(1.0 - bg, 1e-6), out=q)
    np.clip(q, 0.0, 1.0, out=q)
    q[dead] = 0.0
    return q


def face_profile(face, paths, e_q, coh, period_samples, *, rank):
    """Profile through a slope face, continued landward and basinward along
    the tracked surfaces that meet its two ends (within half a period)."""
    n = e_q.shape[0]
    rows = np.arange(n)
    z = np.full(n, np.nan)
    q = np.zeros(n)
    z[face.trace] = face.z_index
    zi = np.clip(np.round(face.z_index).astype(int), 0, e_q.shape[1] - 1)
    q[face.trace] = e_q[face.trace, zi] * (0.5 + 0.5 * coh[face.trace, zi])
    i0, i1 = int(face.trace[0]), int(face.trace[-1])
    reach = max(3, int(round(2 * period_samples)))
    half = max(1, face.trace.size // 2)
    ends = (
        (i0, slice(max(0, i0 - reach), i0), face.trace[:half], True),
        (i1, slice(i1 + 1, i1 + 1 + reach), face.trace[-half:], False),
    )
    for end, near, join_zone, before in ends:
        # the strongest surface within one period of the face end, judged
        # just beyond the end (platform top landward, basin floor basinward)
        close = [p for p in paths if abs(p.z_index[end] - z[end]) <= period_samples]
        if not close:
            continue
        best = max(close, key=lambda p: float(np.mean(p.quality[near])) if p.quality[near].size else 0.0)
        # join where the face meets the surface (within half a period),
        # as far into the face as possible, so the profile has no step
        gap = np.abs(best.z_index[join_zone] - z[join_zone])
        agree = gap <= 0.5 * period_samples
        end_k = 0 if before else agree.size - 1
        if agree[end_k]:
            # the surface agrees with the face up to the face end: join at
            # the inner end of that run of agreement (a surface that only
            # crosses the face further in, jumping between reflectors, is
            # not followed there)
            off = np.flatnonzero(~agree)
            if before:
                j = int(join_zone[off[0] - 1]) if off.size else int(join_zone[-1])
            else:
                j = int(join_zone[off[-1] + 1]) if off.size else int(join_zone[0])
        else:
            # no agreement at the end (the surface is within a period there):
            # join at the face end; a surface crossing the face further in
            # is a jump across the foreset, not its continuation
            j = end
        side = rows < j if before else rows > j
        z[side] = best.z_index[side]
        q[side] = best.quality[side]
    good = np.isfinite(z)
    z = np.interp(rows, rows[good], z[good])
    return TrackedPath(z_index=z, quality=q, polarity="unknown", rank=rank)


def face_unconfirmed(cand, z_index, dip_deg, coh, period_samples):
    """Reason why the reflections just below a face do not dip like it, or ''.

    Foresets below a slope face run roughly parallel to it; a face whose
    underlying coherent dips are much gentler than its own slope is an
    artefact of the mask (common practice, no source).
    """
    lo, hi = foreset_span(cand)
    tr = np.arange(lo, hi + 1)
    nz = dip_deg.shape[1]
    below = np.clip(np.round(z_index[tr])[:, None] + np.arange(1, int(period_samples) + 2)[None, :], 0, nz - 1).astype(int)
    sgn = 1.0 if cand.direction == "+" else -1.0
    # signed basinward dip (noise dipping either way does not confirm a
    # face), its magnitude only where the face steps by half a period or
    # more per trace (spatially aliased: the tensor's dip sign is unreliable)
    aliased = tr.size >= 2 and np.percentile(np.abs(np.gradient(np.asarray(z_index, float))[tr]), 75) >= 0.5 * period_samples
    d = sgn * dip_deg[tr[:, None], below]
    if aliased:
        d = np.abs(d)
    c = coh[tr[:, None], below]
    sure = c >= 0.5
    if sure.sum() < 3:
        return "no coherent reflections below the face"
    med = float(np.median(d[sure]))
    if med < FACE_DIP_AGREEMENT * abs(cand.slope_max_deg):
        return f"reflections below the face dip {med:.1f} deg, much less than its slope {cand.slope_max_deg:.1f} deg"
    return ""


def steepest_unconfirmed(cand, z_index, dip_deg, coh, period_samples, half_width_traces):
    """Reason why the reflections at the steepest point do not dip like the surface, or ''.

    A depositional slope is made of reflections that dip with it
    (foresets, Mitchum, Vail & Sangree 1977, from memory): just beneath the
    steepest point of a margin profile the coherent structure-tensor dip
    (Fehmers & Höcker 2003, from memory) points basinward and is of the
    same order as the slope.  Where a tracked surface steps from one
    reflector to a deeper one (across a fault, or between flat layers) its
    smoothed slope is steep but the reflections there are flat or dip the
    other way.  The test uses the signed basinward dip, so noise around
    zero does not confirm a slope.  The dip is read within a quarter of the
    foreset width of the steepest point (at least ``half_width_traces``),
    along the whole foreset where that holds too few coherent pixels.  A
    surface whose relief between break and toe is mostly in jumps of a
    quarter period or more between flat treads is a staircase between
    reflectors whatever the dips say (laterally incoherent noise can look
    steeply dipping to the structure tensor); so is an aliased surface with
    no coherent reflection along it.
    """
    n, nz = dip_deg.shape
    sgn = 1.0 if cand.direction == "+" else -1.0
    lo_f, hi_f = foreset_span(cand)
    # a wide gentle slope (a ramp) is judged over a share of its own width:
    # one wavelength of a ramp a hundred wavelengths wide holds too few
    # coherent pixels in noise
    w = max(2, int(round(half_width_traces)), int(round(STEEPEST_WINDOW_FORESET_FRACTION * (hi_f - lo_f))))
    tr = np.arange(max(lo_f, cand.steepest - w), min(hi_f, cand.steepest + w) + 1)
    if tr.size < 3:
        return ""

    def evidence(tr):
        # the reflection itself: from the pick down through the main lobe of
        # the wavelet (half a period); deeper pixels image older, often
        # flatter strata beneath a gentle slope, not the slope
        below = np.round(z_index[tr])[:, None] + np.arange(0, int(np.ceil(0.5 * period_samples)) + 1)[None, :]
        inside = (below >= 0) & (below <= nz - 1)  # pixels outside the record are not evidence
        below = np.clip(below, 0, nz - 1).astype(int)
        return sgn * dip_deg[tr[:, None], below], (coh[tr[:, None], below] >= FACE_COHERENCE) & inside

    # flat treads joined by jumps of a quarter period or more, the jumps
    # making most of the relief: a staircase between flat reflectors
    # (common practice, no source)
    st = np.abs(np.diff(np.asarray(z_index, float)[lo_f : hi_f + 1]))
    if st.size >= 4 and st.sum() >= period_samples:
        jump = st >= 0.25 * period_samples
        tread = st <= 0.1 * period_samples
        if st[jump].sum() >= STAIRCASE_JUMP_SHARE * st.sum() and tread.mean() >= STAIRCASE_TREAD_SHARE:
            return (
                f"{100 * st[jump].sum() / st.sum():.0f}% of the surface's relief between break and toe is in jumps of a "
                f"quarter period or more between flat treads ({100 * tread.mean():.0f}% of the traces): a staircase "
                "between reflectors, not a slope"
            )
    d, sure = evidence(tr)
    # where the surface steps by half a period or more per trace the
    # foreset is spatially aliased and the tensor's dip sign is unreliable:
    # only the dip magnitude is used (flat coherent reflections still show
    # a step between layers)
    aliased = np.percentile(np.abs(np.gradient(z_index)[tr]), 75) >= 0.5 * period_samples
    if sure.sum() < 3 and not aliased and hi_f - lo_f + 1 > tr.size:
        # too few coherent pixels near the steepest point: the nearest
        # evidence lies elsewhere along the foreset (break to toe)
        tr = np.arange(lo_f, hi_f + 1)
        d, sure = evidence(tr)
    if sure.sum() < 3:
        # a surface that steps a period per trace with no coherent
        # reflection along it is a staircase across layers in noise
        return (
            "the surface steps half a period or more per trace at its steepest point with no coherent "
            "reflection along it (a staircase between reflectors, not a slope)"
        ) if aliased else ""
    med = float(np.median(np.abs(d[sure]) if aliased else d[sure]))
    if med < FACE_DIP_AGREEMENT * abs(cand.slope_max_deg):
        return (
            f"reflections at the steepest point dip {med:.1f} deg basinward, much less than the surface's "
            f"slope {cand.slope_max_deg:.1f} deg (a step between reflectors, not a depositional slope)"
        )
    return ""


def cuts_layering(cand, z_index, dip, coh, period_samples):
    """Reason why a candidate's foreset cuts across coherent layering, or ''.

    Only judged where the foreset is not spatially aliased (steps below half
    a period per trace): there the structure-tensor dip is reliable.
    """
    ends = [v for v in (cand.shelf_break, cand.toe) if v is not None] + [cand.steepest]
    fs = np.arange(min(ends), max(ends) + 1)
    if fs.size < 3:
        return ""
    step = np.gradient(z_index)[fs]
    if np.percentile(np.abs(step), 75) >= 0.5 * period_samples:
        return ""
    # compared like with like: the surface's step smoothed over the lateral
    # window of the structure tensor (trace-to-trace pick jitter in noise
    # is not a jump between reflectors)
    step = ndimage.gaussian_filter1d(np.gradient(np.asarray(z_index, float)), TENSOR_SIGMA_TRACES, mode="nearest")[fs]
    zi = np.clip(np.round(z_index[fs]).astype(int), 0, dip.shape[1] - 1)
    d = dip[fs, zi]
    c = coh[fs, zi]
    sure = c >= 0.6
    if sure.sum() < 3:
        return ""
    miss = np.abs(step[sure] - d[sure])
    if np.median(miss) > max(1.0, 0.5 * np.median(np.abs(step[sure]))):
        return "the surface cuts across coherent reflectors of another dip (a jump between reflectors)"
    return ""


#: a candidate is a credible outer profile when its foreset reflection
#: strength is at least this fraction of the group's strongest and its
#: confidence at least this fraction of the group's most confident
#: (common practice, no source)
PROFILE_STRENGTH_FRACTION = 0.6
PROFILE_CONFIDENCE_FRACTION = 0.5
#: a surface agrees with the reflections along its foreset when the median
#: difference between its own slope and their structure-tensor dip, and the
#: excess of its steepest slope over their dip there, are each at most this
#: fraction of the reflection dip plus DIP_AGREEMENT_FLOOR_DEG
#: (our choice, no source)
DIP_AGREEMENT_FRACTION = 0.25
DIP_AGREEMENT_FLOOR_DEG = 2.0


def dip_agreement(cand, depth_m, distance_m, z_index, dip_deg, coh, period_samples, smoothing_traces, peak_smoothing_traces=None):
    """How a surface's slope compares with the dip of the reflections along its foreset.

    The slope is that of the depth profile smoothed over ``smoothing_traces``
    (a Gaussian sigma); the reflection dip on each trace is the median
    coherent true dip (structure tensor, Fehmers & Höcker 2003, from
    memory) from the pick to half a period below it.  A surface that jumps
    from one reflector to a deeper one is much steeper than the reflections
    it crosses; a surface that follows a foreset reflection dips with it
    (foresets, Mitchum, Vail & Sangree 1977, from memory).

    Returns
    -------
    tuple of float, degrees
        ``(disagreement, excess, reflection_dip, steepest_reflection_dip)``:
        median absolute difference between surface slope and reflection dip
        over the foreset, steepest slope of the candidate minus the median
        reflection dip within ``smoothing_traces`` of its steepest point,
        the median reflection dip over the foreset, and the largest
        reflection dip along the foreset smoothed over
        ``peak_smoothing_traces`` (default ``smoothing_traces``);
        all NaN when fewer than three foreset traces have coherent
        reflections.
    """
    nan = (float("nan"),) * 4
    lo, hi = foreset_span(cand)
    tr = np.arange(lo, hi + 1)
    if tr.size < 3:
        return nan
    # where the surface steps by half a period or more per trace the
    # foreset is spatially aliased and the tensor's dip is unreliable
    aliased = np.percentile(np.abs(np.gradient(np.asarray(z_index, float))[tr]), 75) >= 0.5 * period_samples
    nz = dip_deg.shape[1]
    sgn = 1.0 if cand.direction == "+" else -1.0
    sm = ndimage.gaussian_filter1d(np.asarray(depth_m, float), max(0.5, smoothing_traces), mode="nearest")
    surf = np.degrees(np.arctan(sgn * np.gradient(sm, distance_m)))[tr]
    offs = np.arange(0, max(1, int(round(period_samples / 2))) + 1)
    pix = np.round(z_index[tr])[:, None] + offs[None, :]
    inside = (pix >= 0) & (pix <= nz - 1)
    pix = np.clip(pix, 0, nz - 1).astype(int)
    ok = (coh[tr[:, None], pix] >= FACE_COHERENCE) & inside
    have = ok.sum(axis=1) > 0
    if have.sum() < 3:
        return nan
    d = np.where(ok, sgn * dip_deg[tr[:, None], pix], np.nan)[have]
    refl = np.nanmedian(d, axis=1)
    near = np.abs(tr[have] - cand.steepest) <= max(1.0, smoothing_traces)
    excess = abs(cand.slope_max_deg) - float(np.median(refl[near])) if near.any() else 0.0
    peak_sig = max(0.5, smoothing_traces if peak_smoothing_traces is None else peak_smoothing_traces)
    steepest = float("nan") if aliased else float(np.max(ndimage.gaussian_filter1d(refl, peak_sig, mode="nearest")))
    return float(np.median(np.abs(surf[have] - refl))), float(excess), float(np.median(refl)), steepest


def _agrees(a):
    """True when the surface dips with its reflections."""
    dis, excess, refl, _ = a
    if not np.isfinite(dis):
        return False
    tol = DIP_AGREEMENT_FRACTION * abs(refl) + DIP_AGREEMENT_FLOOR_DEG
    return dis <= tol and excess <= tol


def choose_profile(g, core, paths, depth_list, face_ranks, period_samples, *, agreement=None):
    """The outer surface of a margin group: the shallowest credible
    candidate (youngest clinoform).

    Credible: strong and confident compared with the group's best and, when
    ``agreement`` (candidate -> :func:`dip_agreement` tuple) is given,
    dipping with the reflections along its foreset if any candidate of the
    group does.  When the outer one is a slope face, a tracked reflection
    within one period of it along its foreset (the same surface, picked
    twice) is preferred: it follows the reflection's envelope maximum.
    """
    pool = g
    if agreement is not None:
        pool = [m for m in g if _agrees(agreement(m))] or g
    best_q = max(m.foreset_quality for m in pool)
    best_c = max(m.confidence for m in pool)
    strong = [
        m
        for m in pool
        if m.foreset_quality >= PROFILE_STRENGTH_FRACTION * best_q and m.confidence >= PROFILE_CONFIDENCE_FRACTION * best_c
    ] or [m for m in pool if m.confidence >= PROFILE_CONFIDENCE_FRACTION * best_c]
    profile = min(strong, key=lambda m: float(np.mean(depth_list[m.path_rank][core])))
    lo_f, hi_f = foreset_span(profile)
    fz = paths[profile.path_rank].z_index[lo_f : hi_f + 1]
    same = [
        m
        for m in strong
        if np.mean(np.abs(paths[m.path_rank].z_index[lo_f : hi_f + 1] - fz)) <= period_samples
    ]
    if profile.path_rank in face_ranks:
        near = [m for m in same if m.path_rank not in face_ranks]
        if near:
            profile = max(near, key=lambda m: m.foreset_quality)
    return profile


def drop_buried(chosen, paths, period_samples, notes):
    """A margin's break must lie on the outer surface: drop one whose break
    is buried more than a period beneath the profile of a more confident
    margin (it is a surface inside the body, not a margin)."""
    keep = []
    for item in sorted(chosen, key=lambda c: -c[3].confidence):
        prof = item[3]
        t = prof.shelf_break if prof.shelf_break is not None else prof.steepest
        z_here = paths[prof.path_rank].z_index[t]
        buried = [k for k in keep if paths[k[3].path_rank].z_index[t] < z_here - period_samples]
        if buried:
            notes.append(
                f"margin facing {prof.direction} at trace {t} dropped: it lies beneath the profile of the "
                f"more confident margin facing {buried[0][3].direction}"
            )
            continue
        keep.append(item)
    return keep


def foreset_span(m):
    ends = [v for v in (m.shelf_break, m.toe) if v is not None] or [m.steepest]
    return min(ends + [m.steepest]), max(ends + [m.steepest])


def drop_opposed(groups, notes):
    """One slope cannot face both ways: of two opposite-facing margins whose
    foresets overlap, keep the more confident."""
    best = [max(g, key=lambda m: m.confidence) for g in groups]
    keep = [True] * len(groups)
    for i in range(len(groups)):
        for j in range(len(groups)):
            if i == j or not keep[i] or not keep[j] or best[i].direction == best[j].direction:
                continue
            (a0, a1), (b0, b1) = foreset_span(best[i]), foreset_span(best[j])
            if min(a1, b1) >= max(a0, b0) and best[i].confidence >= best[j].confidence:
                keep[j] = False
                notes.append(
                    f"margin facing {best[j].direction} at traces {b0}-{b1} dropped: its foreset overlaps "
                    f"the more confident margin facing {best[i].direction} at traces {a0}-{a1}"
                )
    return [g for g, k in zip(groups, keep) if k]


def limit_slope(z, distance_m, brk, toe, max_gradient):
    """Surface between break and toe with no local gradient above the limit.

    A surface tracked through interfering reflections (onlapping fill near
    the slope, the toe where the slope reflection merges into the basin
    floor) jumps between wavelet lobes; each jump is a local step far
    steeper than the slope.  Here the basinward steps between break and
    toe are clipped to ``max_gradient`` (the steepest slope of the surface
    smoothed over one wavelength) and rescaled so the break and toe keep
    their z: the relief is kept, the steps are spread over the foreset.

    Parameters
    ----------
    z : array_like, shape (n_trace,)
        Surface in section z units.
    distance_m : array_like, shape (n_trace,), m
    brk, toe : int
        Trace indices of break and toe (either order).
    max_gradient : float or array_like, shape (n_trace,)
        Largest basinward dz/dx (z units per m).

    Returns
    -------
    numpy.ndarray
        A new surface; unchanged outside break..toe.

    Examples
    --------
    >>> z = np.array([0.0, 0, 1, 1, 5, 5, 6, 6])
    >>> np.round(limit_slope(z, np.arange(8.0), 1, 6, 2.0), 2).tolist()   # the 4-unit step is capped at 2
    [0.0, 0.0, 1.33, 2.0, 4.0, 4.67, 6.0, 6.0]
    """
    z = np.array(z, dtype=float)
    x = np.asarray(distance_m, dtype=float)
    lo, hi = sorted((int(brk), int(toe)))
    if hi - lo < 2:
        return z
    sgn = 1.0 if z[hi] >= z[lo] else -1.0
    gmax = np.broadcast_to(np.asarray(max_gradient, dtype=float), z.shape)[lo:hi]
    dx = np.abs(np.diff(x[lo : hi + 1]))
    step = sgn * np.diff(z[lo : hi + 1])
    cap = gmax * dx
    clipped = np.clip(step, 0.0, cap)
    total = sgn * (z[hi] - z[lo])
    if clipped.sum() <= 0 or total <= 0:
        return z
    room = cap - clipped
    deficit = total - clipped.sum()
    if deficit > 0 and room.sum() > 0:
        clipped = clipped + room * min(1.0, deficit / room.sum())
    clipped *= total / clipped.sum()
    z[lo + 1 : hi + 1] = z[lo] + sgn * np.cumsum(clipped)
    return z


# two surfaces closer than this (in dominant periods, median along the foreset)
# image one reflector: zero-phase wavelet lobes are about half a period apart,
# with a margin for tracking jitter (Widess 1973, from memory)
SIDE_LOBE_PERIODS = 0.6


def select_clinoforms(profile, members, paths, period_samples, notes):
    """Older clinoforms of a margin: distinct surfaces, one break each.

    A member surface is kept as an older clinoform only if

    - its break does not lie above the outer profile at that trace by more
      than half a period: older clinoforms lie beneath the younger ones
      (law of superposition, Steno 1669; a surface above the profile is in
      the overlying fill, not part of the margin);
    - it is not a wavelet side lobe or a duplicate of a surface already
      kept: two tracked surfaces that stay within half a period of each
      other along the kept one's foreset (break to toe) image the same
      reflector (adjacent lobes of a zero-phase wavelet are about half a
      period apart; Widess 1973, from memory), so only the more confident
      one (the outer profile first) is kept.

    Members failing a test are dropped with a note saying why rather than
    kept with a scattered break. Returns the kept members (profile first).
    """
    half = 0.5 * period_samples
    prof_zi = paths[profile.path_rank].z_index
    kept = [profile]
    rest = sorted((m for m in members if m is not profile), key=lambda m: -m.confidence)
    for m in rest:
        zi = paths[m.path_rank].z_index
        if m.shelf_break is not None and zi[m.shelf_break] < prof_zi[m.shelf_break] - half:
            notes.append(
                f"clinoform break at trace {m.shelf_break} dropped: it lies above the outer profile of the "
                f"margin facing {profile.direction} (a younger surface cannot lie beneath an older one)"
            )
            continue
        lobe = None
        for k in kept:
            lo, hi = foreset_span(k)
            lo2, hi2 = foreset_span(m)
            a, b = min(lo, lo2), max(hi, hi2)
            d = np.abs(zi[a : b + 1] - paths[k.path_rank].z_index[a : b + 1])
            if d.size and float(np.median(d)) <= SIDE_LOBE_PERIODS * period_samples:
                lobe = k
                break
        if lobe is not None:
            notes.append(
                f"clinoform break at trace {m.shelf_break} dropped: its surface runs within half a period of "
                f"the surface with the break at trace {lobe.shelf_break} (a wavelet side lobe of the same reflector)"
            )
            continue
        kept.append(m)
    return kept
