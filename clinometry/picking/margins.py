"""Margins on tracked surfaces: direction, shelf break and toe from curvature.

Each tracked surface is converted to depth (``clinometry.depth``) and
analysed as a profile ``depth(distance)``:

1. **Legs.**  The profile, median-filtered (to remove single-trace
   outliers) and smoothed with a Gaussian of ``4 * smoothing_m``, is cut
   at its significant depth extrema (:func:`scipy.signal.find_peaks` with a
   prominence of half the minimum relief).  A leg between a shallow and a
   deep extremum whose relief reaches ``min_relief_m`` is a margin
   candidate; its basinward direction is the way it deepens (``"+"``
   towards increasing trace index).  Two legs falling away on both sides
   of a high are the two margins of an isolated platform.
2. **Steepest point, break and toe.**  On the profile smoothed over
   ``smoothing_m`` (default: one dominant wavelength, so the picks do not
   depend on trace count) the steepest point is the maximum basinward
   gradient; the shelf break is the maximum of convex-up curvature
   ``kappa = d'' / (1 + d'^2)^(3/2)`` between the landward end of the leg
   and the steepest point, the toe the maximum of concave-up curvature
   between the steepest point and the basinward end.  This is the
   geometric definition of break and toe used for clinoform rollover
   points (e.g. Pirmez, Pratson & Steckler 1998; Adams & Schlager 2000).
   Two refinements keep the picks on the right margin: where the sharpest
   bends bound less than the minimum relief of a leg that has it (a ramp
   deepening in gentle steps with a terrace between), break and toe are
   the outermost clear bends of the leg; and where an opposite flank
   follows (the far side of an isolated platform), break and toe are
   searched short of that flank's bend when the top or floor between them
   is a flat stretch of its own, so the far margin's bend is not taken.
3. **Acceptance.**  A candidate needs a landward top flatter than half its
   steepest slope (otherwise it is regional dip, not a margin), a foreset
   spanning several traces (a one-trace step is a jump between two
   reflectors), and reflections along the foreset.  The search for break,
   toe and top stops at the opposite flank (where the surface rises
   basinward more steeply than half the slope).  Its confidence combines
   relief, slope contrast and reflection strength, and is reduced when the
   slope is a local step on a long gentler profile (mean over steepest
   gradient between break and toe below 0.5), when a break or toe lies
   within one smoothing length of a line end (not imaged), and when the
   platform top or basin floor is narrower than the slope before the
   opposite flank (a fold crest or trough, not a platform and a basin).

Candidates from different surfaces that overlap laterally and face the
same way belong to one margin: the shallowest surface over the margin is
the outer margin profile (youngest clinoform), the others are the older
clinoforms beneath, ordered oldest (deepest) to youngest.

References
----------
.. [1] Adams, E. W. & Schlager, W. (2000). Basic types of submarine slope
   curvature. Journal of Sedimentary Research 70(4), 814-828. (from memory)
.. [2] Pirmez, C., Pratson, L. F. & Steckler, M. S. (1998). Clinoform
   development by advection-diffusion of suspended sediment. Journal of
   Geophysical Research 103(B10), 24141-24157. (from memory)
.. [3] do Carmo, M. P. (1976). Differential Geometry of Curves and
   Surfaces. Prentice-Hall (curvature of a plane curve). (from memory)
"""

from __future__ import annotations

import logging
from dataclasses import dataclass

import numpy as np
from scipy import ndimage, signal

from ..depth import DEFAULT_VELOCITY_M_S, ConstantVelocity, horizon_to_depth

__all__ = ["MarginCandidate", "profile_candidates", "to_depth", "velocity_at"]

logger = logging.getLogger(__name__)

#: a top counts as flat when its gradient is below this fraction of the
#: steepest foreset gradient (common practice, no source)
TOP_FLATNESS_FRACTION = 0.5
#: fewest traces between break and toe of an accepted foreset
#: (common practice, no source)
MIN_FORESET_TRACES = 3
#: mean pick quality (reflection strength above background) along an
#: accepted foreset, and the fraction of its traces with a real pick
#: (common practice, no source)
MIN_FORESET_QUALITY = 0.2
#: largest share of the relief allowed in one trace-to-trace step of the
#: picked surface (common practice, no source)
MAX_STEP_FRACTION = 0.35
#: an opposite flank starts where the surface rises basinward by more
#: than this fraction of the steepest slope, and its bend extends this many
#: smoothing lengths from the steep part of the flank (our choice, no source)
FLANK_START_FRACTION = 0.1
FLANK_BEND_SIGMAS = 2.0
#: a bend is clear when its curvature is at least this fraction of the
#: sharpest bend on its side of the steepest point (used only when the
#: sharpest bends bound less than the minimum relief of a leg that has it)
#: (our choice, no source)
OUTER_BEND_FRACTION = 0.25
#: the curvature smoothing is at least the slope width divided by this
#: (common practice, no source)
SLOPE_WIDTH_SMOOTHING_DIVISOR = 8.0
MIN_FORESET_PICKED = 0.6
#: mean over steepest gradient between break and toe below which the
#: confidence is reduced in proportion (a tanh profile gives about 0.9
#: between its curvature extremes) (our choice, no source)
MIN_SLOPE_CONCENTRATION = 0.5
#: the platform top and the basin floor of a margin are expected to be at
#: least this fraction of the slope width wide where an opposite flank ends
#: them; narrower ones reduce the confidence in proportion (our choice, no
#: source)
MIN_FLANK_WIDTH_FRACTION = 1.0
#: confidence factor of a margin whose break or toe lies within one
#: smoothing length of a line end (our choice, common practice, no source)
EDGE_CONFIDENCE_FACTOR = 0.5


def to_depth(section, trace, z, velocity):
    """Depth (m) of points given as trace index and z in section units.

    Uses :func:`clinometry.depth.horizon_to_depth`; identity for depth
    sections.  ``velocity`` may be a velocity model, a number (m/s,
    constant) or None (:data:`clinometry.depth.DEFAULT_VELOCITY_M_S`).
    """
    z = np.asarray(z, dtype=float)
    if section.attrs.get("domain") == "depth":
        return z.copy()
    if velocity is None:
        velocity = DEFAULT_VELOCITY_M_S
    if isinstance(velocity, (int, float)):
        velocity = ConstantVelocity(float(velocity))
    return np.asarray(horizon_to_depth(section, np.asarray(trace), z, velocity), dtype=float)


def velocity_at(section, velocity, z):
    """Interval velocity (m/s) at z (section units); a number for depth sections too."""
    if velocity is None:
        return float(DEFAULT_VELOCITY_M_S)
    if isinstance(velocity, (int, float)):
        return float(velocity)
    z = np.atleast_1d(np.asarray(z, dtype=float))
    if section.attrs.get("domain") == "depth":
        twt = velocity.twt_ms(z)
    else:
        twt = z
    return np.asarray(velocity.interval_velocity(twt), dtype=float)


@dataclass(frozen=True)
class MarginCandidate:
    """A margin found on one surface (indices are trace indices)."""

    path_rank: int
    direction: str
    leg: tuple
    steepest: int
    shelf_break: int | None
    toe: int | None
    break_reason: str
    toe_reason: str
    relief_m: float
    slope_max_deg: float
    top_gradient_deg: float
    foreset_quality: float
    confidence: float
    mean_depth_m: float
    reasons: tuple = ()


def _fill_low_quality(values, quality, q_min):
    good = quality >= q_min
    if good.sum() < 2:
        return values.copy()
    idx = np.arange(values.size)
    return np.interp(idx, idx[good], values[good])


def _legs(d_det, prominence):
    """Indices of alternating significant extrema including both ends."""
    n = d_det.size
    hi, _ = signal.find_peaks(d_det, prominence=prominence)
    lo, _ = signal.find_peaks(-d_det, prominence=prominence)
    ext = sorted([(0, 0)] + [(int(i), 1) for i in hi] + [(int(i), -1) for i in lo] + [(n - 1, 0)])
    return [e[0] for e in ext]


def _flank_start(gb, cut, p, sig):
    """Trace index short of the bend where an opposite flank starts.

    ``cut`` is the first trace of the flank (rising basinward more steeply
    than :data:`TOP_FLATNESS_FRACTION` of the slope) on one side of the
    steepest point ``p``.  The flank's bend lies before ``cut``: the result
    is two smoothing lengths ``sig`` (traces; a Gaussian-smoothed kink bends
    over about +-2 sigma) towards ``p``, or further where the surface still
    rises by more than :data:`FLANK_START_FRACTION` of the slope.
    """
    step = 1 if p > cut else -1
    k = cut
    while k != p and gb[k] < -FLANK_START_FRACTION * gb[p]:
        k += step
    k2 = cut + step * int(np.ceil(FLANK_BEND_SIGMAS * sig))
    k = max(k, k2) if step > 0 else min(k, k2)
    return int(min(k, p) if step > 0 else max(k, p))


def _bend(kappa, gb, near, full, sign, p, sig):
    """Trace of the sharpest bend of one sign on one side of the steepest point.

    ``full`` is the whole side, ``near`` the part short of an opposite
    flank's bend.  The bend is searched in ``near`` first and kept only if
    it is a bend of its own (a local extremum inside ``near``) and the
    surface beyond it up to the end of ``near`` (the bend's own +-2 sigma
    excepted) is flat (nowhere steeper than :data:`TOP_FLATNESS_FRACTION`
    of the slope) over at least two sigma: a platform top or basin floor
    that runs on to the opposite flank, as across an isolated platform.  Otherwise (a fold
    limb, a stepped surface) the whole side is searched as before.  None
    when ``full`` is empty.
    """
    if near.size >= 3 and near.size < full.size:
        i = int(np.argmax(sign * kappa[near]))
        if 0 < i < near.size - 1:
            k = int(near[i])
            reach = int(np.ceil(FLANK_BEND_SIGMAS * sig))
            beyond = near[np.abs(near - p) > abs(k - p) + reach]
            if beyond.size >= max(3, reach) and float(np.max(np.abs(gb[beyond]))) <= TOP_FLATNESS_FRACTION * gb[p]:
                return k
    return int(full[np.argmax(sign * kappa[full])]) if full.size else None


def _outer_bends(kappa, land, basin, direction, brk, toe):
    """Outermost clear convex bend landward and concave bend basinward.

    Clear: a local curvature extremum at least :data:`OUTER_BEND_FRACTION`
    as sharp as the strongest bend on its side.  Returns ``(break, toe)``
    trace indices (the given ones when no other bend is clear).
    """
    out = []
    for idx, sign, strongest, landward in ((land, 1.0, brk, True), (basin, -1.0, toe, False)):
        k = sign * kappa[idx]
        peaks, _ = signal.find_peaks(k, height=OUTER_BEND_FRACTION * sign * kappa[strongest])
        pts = [int(idx[i]) for i in peaks] + [int(strongest)]
        # outermost: landward of the break is towards trace 0 for "+"
        outer_low = landward == (direction == "+")
        out.append(min(pts) if outer_low else max(pts))
    return out[0], out[1]


def profile_candidates(
    distance_m,
    depth_m,
    quality,
    *,
    path_rank: int,
    smoothing_m: float,
    min_relief_m: float,
    min_quality: float = 0.1,
):
    """Margin candidates on one depth profile.

    Parameters
    ----------
    distance_m : array_like, shape (n_trace,), m
        Along-line distance of each trace.
    depth_m : array_like, shape (n_trace,), m
        Depth of the surface, positive down.
    quality : array_like, shape (n_trace,)
        0..1 pick quality; points below ``min_quality`` are interpolated.
    path_rank : int
    smoothing_m : float, m
        Gaussian smoothing length (sigma) for break and toe.
    min_relief_m : float, m
        Smallest relief of a margin.
    min_quality : float

    Returns
    -------
    list of MarginCandidate
        Candidates that passed; rejected ones are logged at DEBUG.

    Examples
    --------
    >>> x = np.arange(200) * 25.0
    >>> d = 500 + np.clip((x - 2000) * np.tan(np.radians(20)), 0, 300)
    >>> c = profile_candidates(x, d, np.ones(200), path_rank=0, smoothing_m=50, min_relief_m=50)
    >>> [(m.direction, m.shelf_break, m.toe) for m in c]
    [('+', 80, 113)]
    """
    x = np.asarray(distance_m, dtype=float)
    q = np.asarray(quality, dtype=float)
    d = _fill_low_quality(np.asarray(depth_m, dtype=float), q, min_quality)
    n = d.size
    if n < 5:
        return []
    dx = float(np.median(np.abs(np.diff(x)))) or 1.0
    sig = max(smoothing_m / dx, 0.5)
    med = ndimage.median_filter(d, size=int(max(3, 2 * round(sig / 2) + 1)), mode="nearest")
    d_fine = ndimage.gaussian_filter1d(med, sig, mode="nearest")
    d_det = ndimage.gaussian_filter1d(med, 4 * sig, mode="nearest")
    ext = _legs(d_det, 0.5 * min_relief_m)
    uniform = not np.all(np.diff(x) != 0)

    def derivs(prof):
        gr = np.gradient(prof, dx) if uniform else np.gradient(prof, x)
        cu = np.gradient(gr, dx) if uniform else np.gradient(gr, x)
        return gr, cu / (1.0 + gr**2) ** 1.5

    g_det, _ = derivs(d_det)
    pad = int(np.ceil(4 * sig))
    out = []
    for a, b in zip(ext[:-1], ext[1:]):
        if b - a < 2:
            continue
        rel = d_det[b] - d_det[a]
        if abs(rel) < min_relief_m:
            continue
        direction = "+" if rel > 0 else "-"
        sgn = 1.0 if direction == "+" else -1.0
        # a gentle, wide slope (ramp) needs a longer smoothing for its
        # curvature than the wavelength: at least 1/8 of the slope width
        width = abs(rel) / max(float(np.max(sgn * g_det[a : b + 1])), 1e-9)
        sig_leg = max(sig, width / (SLOPE_WIDTH_SMOOTHING_DIVISOR * dx))
        d_leg = d_fine if sig_leg <= sig else ndimage.gaussian_filter1d(med, sig_leg, mode="nearest")
        g, kappa = derivs(d_leg)
        # basinward gradient in the oriented frame
        gb = sgn * g
        lo, hi = max(0, a - pad), min(n - 1, b + pad)
        seg = np.arange(lo, hi + 1)
        p = int(seg[np.argmax(gb[seg])])
        slope_max = float(np.degrees(np.arctan(gb[p])))
        # within one smoothing length of a line end the smoothed profile is
        # padded with its end value: a steepest point there is not imaged
        edge = int(np.ceil(sig_leg))
        if p < edge or p > n - 1 - edge:
            logger.debug("surface %d leg %d-%d rejected: steepest point at trace %d within %d traces of the line end", path_rank, a, b, p, edge)
            continue
        # the search for break, toe and top stops where the surface rises
        # basinward more steeply than half the slope: that is the opposite
        # flank (the far margin of an isolated platform, the far side of a
        # basin), whose bends belong to another margin
        # (only on a side where the leg ends at a significant extremum, not
        # at the line end: a short rise in noise is not a flank)
        opp = np.flatnonzero(gb < -TOP_FLATNESS_FRACTION * gb[p])
        before = opp[opp < p] if a > 0 else opp[:0]
        after = opp[opp > p] if b < n - 1 else opp[:0]
        lo_s = max(lo, int(before[-1]) + 1) if before.size else lo
        hi_s = min(hi, int(after[0]) - 1) if after.size else hi
        land = np.arange(lo_s, p + 1) if direction == "+" else np.arange(p, hi_s + 1)
        basin = np.arange(p, hi_s + 1) if direction == "+" else np.arange(lo_s, p + 1)
        # the bend where the opposite flank starts (the far break of an
        # isolated platform, the far toe of a basin) is not this margin's:
        # break and toe are searched short of it
        lo_b = lo_s if not before.size else min(p, _flank_start(gb, int(before[-1]), p, sig_leg))
        hi_b = hi_s if not after.size else max(p, _flank_start(gb, int(after[0]), p, sig_leg))
        land_b = land[(land >= lo_b) & (land <= hi_b)]
        basin_b = basin[(basin >= lo_b) & (basin <= hi_b)]
        reasons = []
        brk = _bend(kappa, gb, land_b, land, 1.0, p, sig_leg)
        toe = _bend(kappa, gb, basin_b, basin, -1.0, p, sig_leg)
        break_reason = toe_reason = ""
        if brk is None or kappa[brk] <= 0 or brk == p:
            break_reason = "no convex-up bend landward of the steepest point"
            brk = None
        if toe is None or kappa[toe] >= 0 or toe == p:
            toe_reason = "no concave-up bend basinward of the steepest point (toe beyond the line or no basin floor)"
            toe = None
        if brk is not None and toe is not None and abs(d_leg[toe] - d_leg[brk]) < min_relief_m <= abs(d_leg[b] - d_leg[a]):
            # the strongest bends bound only one step of a leg that deepens
            # by a resolvable relief: a ramp or slope in gentle steps (a
            # terrace between them); its break and toe are the outermost
            # clear bends of the leg
            brk, toe = _outer_bends(kappa, land, basin, direction, brk, toe)
        at_end = []
        for name_, pt in (("shelf break", brk), ("toe", toe)):
            if pt is not None and (pt < edge or pt > n - 1 - edge):
                at_end.append(name_)
        # landward top: from the landward end of the leg to the break (or steepest point)
        edge = brk if brk is not None else p
        top = np.arange(lo_s, edge + 1) if direction == "+" else np.arange(edge, hi_s + 1)
        top = top[np.abs(top - edge) >= sig]
        top_grad = float(np.median(gb[top])) if top.size >= 3 else float("nan")
        ref_a = brk if brk is not None else (a if direction == "+" else b)
        ref_b = toe if toe is not None else (b if direction == "+" else a)
        relief = float(abs(d_leg[ref_b] - d_leg[ref_a]))
        fs = np.arange(min(ref_a, ref_b), max(ref_a, ref_b) + 1)
        fq = float(np.mean(q[fs])) if fs.size else 0.0
        picked = float(np.mean(q[fs] >= min_quality)) if fs.size else 0.0
        if fq < MIN_FORESET_QUALITY or picked < MIN_FORESET_PICKED:
            reasons.append(
                f"weak or missing reflections along the foreset (mean quality {fq:.2f}, "
                f"{100 * picked:.0f}% of traces picked)"
            )
        if not np.isfinite(top_grad):
            reasons.append("no landward top on the line")
            flat_ok = False
        else:
            flat_ok = top_grad <= TOP_FLATNESS_FRACTION * gb[p]
            if not flat_ok:
                reasons.append(
                    f"landward gradient {np.degrees(np.arctan(top_grad)):.2f} deg is not flatter than half "
                    f"the steepest slope {slope_max:.2f} deg (regional dip, not a margin)"
                )
        if fs.size >= 2 and relief > 0:
            step = float(np.max(np.abs(np.diff(d[fs]))))
            if step > MAX_STEP_FRACTION * relief:
                reasons.append(
                    f"{100 * step / relief:.0f}% of the relief is one step between neighbouring traces: "
                    "a jump between reflectors, not a slope"
                )
        if fs.size < MIN_FORESET_TRACES:
            reasons.append(f"foreset spans {fs.size} trace(s): a jump between reflectors, not a slope")
        if relief < min_relief_m:
            reasons.append(f"relief {relief:.0f} m below the minimum {min_relief_m:.0f} m")
        if reasons:
            logger.debug("surface %d leg %d-%d rejected: %s", path_rank, a, b, "; ".join(reasons))
            continue
        contrast = gb[p] / max(abs(top_grad), np.tan(np.radians(0.05)))
        conf = (
            min(1.0, relief / (3 * min_relief_m)) ** 0.5
            * min(1.0, np.log10(max(contrast, 1.0)) / np.log10(10.0)) ** 0.5
            * min(1.0, fq / 0.4) ** 0.5
        )
        # a clinoform between its break and toe is one slope: its mean
        # gradient is a sizeable part of its steepest (about 0.9 for a tanh
        # profile between its curvature extremes); a low ratio means the
        # steepest point is a local step on a long, gentler profile
        run = abs(x[ref_b] - x[ref_a])
        concentration = relief / max(run * gb[p], 1e-9)
        conf *= min(1.0, concentration / MIN_SLOPE_CONCENTRATION)
        # a platform top landward of the break and a basin floor basinward of
        # the toe, each about as wide as the slope between them: a bend
        # followed at once by the opposite flank is a fold crest or trough
        fs_w = max(abs(x[ref_b] - x[ref_a]), dx)
        top_w = abs(x[ref_a] - x[lo_s if direction == "+" else hi_s])
        floor_w = abs(x[hi_s if direction == "+" else lo_s] - x[ref_b])
        flanked = []
        for what, w_, cut in (
            ("platform top", top_w, before.size if direction == "+" else after.size),
            ("basin floor", floor_w, after.size if direction == "+" else before.size),
        ):
            if cut and w_ < MIN_FLANK_WIDTH_FRACTION * fs_w:
                conf *= w_ / (MIN_FLANK_WIDTH_FRACTION * fs_w)
                flanked.append(f"{what} only {w_:.0f} m wide before the opposite flank (slope {fs_w:.0f} m wide)")
        if brk is None or toe is None:
            conf *= 0.8
        if at_end:
            # a bend within one smoothing length of the line end is where the
            # profile stops, not a measured bend: the slope is not imaged to
            # its end, so the margin is only half supported
            conf *= EDGE_CONFIDENCE_FACTOR
            reasons_soft = " and ".join(at_end) + " at the line end (not imaged beyond it)"
            if "toe" in at_end:
                toe_reason = toe_reason or reasons_soft
            if "shelf break" in at_end:
                break_reason = break_reason or reasons_soft
        out.append(
            MarginCandidate(
                path_rank=path_rank,
                direction=direction,
                leg=(int(a), int(b)),
                steepest=p,
                shelf_break=brk,
                toe=toe,
                break_reason=break_reason,
                toe_reason=toe_reason,
                relief_m=relief,
                slope_max_deg=slope_max,
                top_gradient_deg=float(np.degrees(np.arctan(top_grad))),
                foreset_quality=fq,
                confidence=float(conf),
                mean_depth_m=float(np.mean(d_leg[min(a, b) : max(a, b) + 1])),
                reasons=tuple(flanked),
            )
        )
    return out
