"""Rejection rules for margin candidates: one function per thing that imitates a margin.

Each rule looks at a candidate's measured evidence
(:mod:`~clinometry.picking.evidence`) and returns a sentence saying why the
candidate is not a margin, or None.  :func:`vet` applies them all.  They
guard against:

* :func:`noise_reflection`: a "platform top" that is noise (weak, incoherent,
  its polarity flipping from trace to trace);
* :func:`regional_dip`: a surface that dips as steeply landward of its bend
  as beyond it (tilted strata, not a margin);
* :func:`staircase`: a profile that steps from one flat reflector to another
  through weak image or across layering that continues (a jump between
  reflectors);
* :func:`drape`: a bend with the layers above it running parallel to it
  (drape or compaction over older relief, a fold);
* :func:`fold`: a bend that the layers above and beneath it share (a fold,
  a tilted fault block);
* :func:`too_small`: relief below the seismic resolution;
* :func:`jitter`: a slope narrower than the lateral resolution of the
  picks (pick jitter, a single-trace step);
* :func:`concentrated_relief`: a "ramp" whose relief is mostly one step (the
  step is judged as a slope of its own).

Two rules compare a candidate with a margin already accepted:

* :func:`inside_platform`: a slope beneath the platform top (an older
  clinoform or an internal reflector) or beneath the basin floor (the
  substrate) of an accepted margin;
* :func:`above_margin`: a smaller bend above an accepted margin's profile
  (basin fill dipping back towards the slope, drape or compaction over it).
"""

from __future__ import annotations

import math

import numpy as np

__all__ = [
    "noise_reflection",
    "no_platform_top",
    "regional_dip",
    "staircase",
    "cuts_layering",
    "unimaged_face",
    "implausible_slope",
    "drape",
    "fold",
    "too_small",
    "jitter",
    "concentrated_relief",
    "inside_platform",
    "above_margin",
    "vet",
    "vet_against",
    "NOISE_CORRELATION",
]

#: the correlation of neighbouring traces along a reflection at which its
#: signal and the noise are equally strong: rho = S / (S + N) = 1/2
NOISE_CORRELATION = 0.5
#: readings of the reflection dip along the slope needed to say it cuts
#: layering, the agreement below which and the flat share above which it does
#: (our choice, no source)
MIN_DIP_READINGS = 5
CUTS_AGREEMENT = 0.25
#: readings needed when some lie on steps of more than half a period per
#: trace (each such step crosses a period or more of layering; our choice)
MIN_STEP_READINGS = 3
CUTS_FLAT_SHARE = 0.5
#: at most this share of a slope's traces may be continued rather than
#: imaged (our choice, no source)
MAX_INFERRED_SHARE = 0.6
#: steepest slope of a margin, degrees: above the ~60 deg of framework-built
#: carbonate slopes (Kenter 1990, from memory) with room for the slope error
MAX_SLOPE_DEG = 70.0
#: a platform top is at least this many traces and dominant wavelengths long
#: (a narrower top is not resolved laterally; our choice, no source)
MIN_TOP_TRACES = 10
MIN_TOP_WAVELENGTHS = 1.0
#: the top is flatter than the slope when its gradient is below this fraction
#: of the steepest slope (common practice, no source)
TOP_FLATNESS_FRACTION = 0.3
#: a steep slope is a staircase when this share of its vertical runs lies on
#: weak image (our choice, no source) ...
STAIRCASE_GAP_SHARE = 0.5
#: ... or when the layering landward and basinward correlates this well at the
#: same level (the layers continue across the step; our choice, no source)
STAIRCASE_LAYERING = 0.85
#: reflections beside a slope are parallel to it when at most this share of
#: them is discordant (our choice, no source) ...
DRAPE_MAX_DISCORDANT = 0.3
#: ... read on at least this many coherent cells
DRAPE_MIN_CELLS = 20
#: a ramp's relief is spread along it: no single smoothing length holds more
#: than this share of it (our choice, no source)
RAMP_STEP_SHARE = 0.5
#: a candidate lies beneath or above a margin's profile when its slope is
#: at least this many dominant periods away from it (one wavelet lobe)
SEPARATION_PERIODS = 0.5
#: the layering below a surface landward of the break and basinward of the
#: toe correlates at least this well in a fold (our choice, no source)
FOLD_LAYERING = 0.75
#: a slope that spans at least this many traces (a narrower step is one jump of the
#: picks; common practice, no source)
MIN_SLOPE_TRACES = 2


def _v(ev, key, default=math.nan):
    v = ev.values.get(key, default)
    return default if v is None else float(v)


def noise_reflection(top):
    """A platform top that does not stand out of the noise.

    Guards against margins picked in noise: the minimal path through a noise
    image still finds a strongest route, but the waveform at its picks does
    not repeat from one trace to the next.  For a reflection with
    independent noise on each trace the correlation of neighbouring traces is
    ``rho = S / (S + N)`` (signal and noise power; e.g. Yilmaz 2001, from
    memory), so a correlation below :data:`NOISE_CORRELATION` means the noise
    at the top is stronger than the reflection.
    """
    rho = _v(top, "lateral_correlation")
    if not rho >= NOISE_CORRELATION:
        return (f"the platform top is not a reflection above the noise: its waveform correlates at {rho:.2f} "
                f"from trace to trace (a reflection stronger than the noise gives {NOISE_CORRELATION} or more)")
    return None


def no_platform_top(top, images):
    """No platform top, or one too short to be resolved as a flat top.

    Guards against bends of a surface at the edge of the image or between
    two nearby slopes: a platform top extends at least
    :data:`MIN_TOP_TRACES` traces and :data:`MIN_TOP_WAVELENGTHS` dominant
    wavelengths landward of its break (beyond the bend's own smoothing).
    """
    length = _v(top, "length_m", 0.0)
    need = max(MIN_TOP_TRACES * images.dx_m, MIN_TOP_WAVELENGTHS * images.wavelength_m)
    if length < need:
        return f"the platform top is {length:.0f} m long landward of the break (at least {need:.0f} m needed)"
    return None


def regional_dip(top, slope_max_deg):
    """A top that is not flatter than the slope: regional dip or tilted strata, not a margin."""
    g = _v(top, "gradient_deg")
    if math.isfinite(g) and g > TOP_FLATNESS_FRACTION * slope_max_deg:
        return (f"the surface dips {g:.2f} deg landward of its bend, not flatter than half its steepest slope "
                f"{slope_max_deg:.2f} deg (regional dip, not a margin)")
    return None


def staircase(face, character):
    """A slope that is a step between flat reflectors.

    Guards against profiles that jump from one reflector to another: the
    vertical runs of the jump lie on weak image, or the layering continues
    at the same level on both sides of it.
    """
    gaps = _v(face, "gap_share")
    same = _v(character, "same_level")
    if math.isfinite(gaps) and gaps >= STAIRCASE_GAP_SHARE:
        return (f"{100 * gaps:.0f}% of the slope's vertical extent between neighbouring traces is weak image: "
                "a jump between reflectors, not a slope face")
    if math.isfinite(same) and same >= STAIRCASE_LAYERING:
        return (f"the layering continues across the slope at the same level (correlation {same:.2f}): "
                "a step between reflectors, not a margin")
    return None


def cuts_layering(face):
    """A profile that dips across reflections that are flat where it crosses them.

    Guards against a surface that steps down through a layered succession:
    where its dip can be read (not aliased, coherent), the reflections along
    a real slope dip with it (a slope is a stratal surface).  Where the
    profile steps by more than half a period per trace (aliased, so its dip
    cannot be compared), a steep face still reads as dipping in the
    structure tensor, if less steeply than it is; flat, coherent layering at
    those steps says the profile jumps down through the layering, and those
    readings count with the others (at least :data:`MIN_STEP_READINGS`).

    Trade-off (measured on our settings bench): steep mound flanks at SNR 3
    that were found only as such jumps, with slopes 20-30 deg too steep, are
    now rejected, and fold limbs on real lines with them.
    """
    n, agree, flat = _v(face, "n_dip", 0.0), _v(face, "agreement"), _v(face, "flat_share")
    if n >= MIN_DIP_READINGS and agree < CUTS_AGREEMENT and flat >= CUTS_FLAT_SHARE:
        return (f"the reflections along the slope are flat where it crosses them ({100 * flat:.0f}% of {n:.0f} "
                "readings): the profile cuts across layering, it is not a slope")
    # where the profile steps by more than half a period per trace its dip
    # cannot be compared, but a steep face still reads as dipping in the
    # structure tensor (less steeply than it is); flat, coherent layering
    # at the picks of the steps says the profile jumps down through it
    na, flat_a = _v(face, "n_aliased", 0.0), _v(face, "flat_aliased")
    flat = flat if math.isfinite(flat) else 0.0
    agree = agree if math.isfinite(agree) else 0.0
    total = n + na
    if na > 0 and total >= MIN_STEP_READINGS and math.isfinite(flat_a) and agree < CUTS_AGREEMENT:
        share = (flat * n + flat_a * na) / total
        if share >= CUTS_FLAT_SHARE:
            return (f"the reflections are flat and coherent where the slope steps down through them "
                    f"({100 * share:.0f}% of {total:.0f} readings, {na:.0f} of them on steps of more than half "
                    "a period per trace): the profile jumps across layering, it is not a slope")
    return None


def unimaged_face(face):
    """A slope that is mostly not imaged: continued over more than :data:`MAX_INFERRED_SHARE` of it.

    Guards against a drop of the profile through weak image that a short
    dipping stretch next to it made look like a slope (see
    :mod:`~clinometry.picking.face_extension`).
    """
    share = _v(face, "inferred_share", 0.0)
    if share > MAX_INFERRED_SHARE:
        return (f"{100 * share:.0f}% of the slope is not imaged (continued along the dip of the rest): too little "
                "of it is seen to call it a slope")
    return None


def implausible_slope(slope_max_deg):
    """A slope steeper than depositional slopes stand.

    Guards against vertical offsets of reflectors (faults, jumps of the picks
    over a trace or two): carbonate slopes reach about 60 deg where built by
    framework or cement (Kenter 1990, from memory); steeper faces are not
    imaged as slopes at seismic scale.
    """
    if slope_max_deg > MAX_SLOPE_DEG:
        return (f"the slope dips {slope_max_deg:.0f} deg, steeper than the {MAX_SLOPE_DEG:.0f} deg carbonate slopes "
                "stand at: a fault or a jump of the picks, not a slope")
    return None


def drape(onlap):
    """Reflections beside the slope, in the layers above it, that run parallel to it: drape or a fold.

    Guards against the bends of overburden reflectors above a mound or a
    margin (drape, compaction relief) and against folds: the fill in front
    of a margin laps onto its slope, so most reflections one and a half to
    three and a half periods off the slope, into the fill, are discordant
    with it.  A thin drape on the slope itself lies nearer than that.
    """
    above, n_above = _v(onlap, "above_discordant"), _v(onlap, "n_above", 0.0)
    if math.isfinite(above) and n_above >= DRAPE_MIN_CELLS and above <= DRAPE_MAX_DISCORDANT:
        return (f"the reflections in the layers above the slope run parallel to it ({100 * (1 - above):.0f}% "
                "concordant): drape or a fold, not a margin")
    return None


def fold(onlap, character):
    """A bend that the layers above and beneath it share: a fold or a tilted fault block, not a margin.

    Guards against structural relief.  The fill in front of a margin laps
    onto its slope, so the reflections in the fill beside the slope are
    discordant with it; the layers of a fold run parallel to the bend above
    it and beneath it, and on under its low side.  All three must hold: the
    reflections above and below the slope are parallel to it
    (:data:`DRAPE_MAX_DISCORDANT`) and the layering below the surface
    landward of the break matches that below it basinward of the toe
    (:data:`FOLD_LAYERING`).  (Older clinoforms beneath a prograding slope
    are parallel to it too, so the layers below alone do not tell.)
    """
    above, n_above = _v(onlap, "above_discordant"), _v(onlap, "n_above", 0.0)
    below, n_below = _v(onlap, "below_discordant"), _v(onlap, "n_below", 0.0)
    layering = _v(character, "below")
    parallel = (math.isfinite(above) and n_above >= DRAPE_MIN_CELLS and above <= DRAPE_MAX_DISCORDANT
                and math.isfinite(below) and n_below >= DRAPE_MIN_CELLS and below <= DRAPE_MAX_DISCORDANT)
    if parallel and math.isfinite(layering) and layering >= FOLD_LAYERING:
        return (f"the layers above and beneath the slope run parallel to it and on beneath the basin floor "
                f"(layering correlation {layering:.2f}): a fold or a tilted fault block, not a margin")
    return None


def too_small(relief_m, min_relief_m):
    """Relief below the seismic resolution (half a wavelength by default)."""
    if not relief_m >= min_relief_m:
        return f"relief {relief_m:.0f} m below the minimum {min_relief_m:.0f} m"
    return None


def jitter(n_slope_traces):
    """A slope of fewer than :data:`MIN_SLOPE_TRACES` traces: a single jump of the picks."""
    if n_slope_traces < MIN_SLOPE_TRACES:
        return f"the slope spans {n_slope_traces} trace(s): a jump of the picks, not a slope"
    return None


def concentrated_relief(c, images):
    """A profile without a distinct break (a ramp reading) whose relief is mostly one step.

    Guards against reading a jump of the picks between two reflectors,
    smoothed over the width of a ramp, as a gentle ramp: the relief of a
    ramp accrues over kilometres, a step's within a wavelength.
    """
    if c.bends.shelf_break is not None:
        return None
    w = max(1, int(round(images.smoothing_m / images.dx_m)))
    a, b = c.at(c.bends.leg.start), c.at(c.bends.leg.end)
    d = c.depth_m[a : b + 1]
    if d.size <= w:
        return None
    step = float(np.max(np.abs(d[w:] - d[:-w])))
    rel = c.bends.leg.relief_m
    if rel > 0 and step > RAMP_STEP_SHARE * rel:
        return (f"{100 * step / rel:.0f}% of the relief lies within {w * images.dx_m:.0f} m: a step between "
                "reflectors, not a ramp")
    return None


def _z_at(c, trace):
    return float(c.z_index[c.at(trace)]) if c.lo <= trace < c.hi else float("nan")


def inside_platform(c, margin, images):
    """A slope beneath an accepted margin's platform top or basin floor.

    Guards against reporting older clinoforms, internal reflectors of the
    platform, or tilted substrate beneath the basin floor as margins of
    their own: they lie under the outer profile of a margin (the youngest
    clinoform and the surface the basin fill laps onto).  Older clinoforms
    are followed as such (:mod:`~clinometry.picking.clinoforms`).
    """
    from .evidence._regions import profile_extent

    m = margin.candidate
    t = c.bends.steepest
    first, last = profile_extent(m, images)
    if not first <= t <= last:
        return None
    zm = _z_at(m, t)
    zc = float(c.z_index[c.at(t)])
    if zc - zm >= SEPARATION_PERIODS * images.period_samples:
        brk = margin.candidate.bends.shelf_break
        brk = brk if brk is not None else margin.candidate.bends.outer_break
        return (f"lies beneath the profile of the margin facing {m.direction} with its break at trace {brk} "
                "(an older clinoform, an internal reflector or the substrate)")
    return None


def above_margin(c, margin, images):
    """A smaller bend above an accepted margin's profile: fill or drape, not a margin.

    Guards against basin fill that dips back towards the slope above the
    toe, fill wedges onlapping the slope, and drape or compaction relief
    over a margin or a mound: each bends over the margin beneath, with less
    relief.
    """
    from .evidence._regions import profile_extent

    m = margin.candidate
    t = c.bends.steepest
    first, last = profile_extent(m, images)
    if not first <= t <= last:
        return None
    zm = _z_at(m, t)
    zc = float(c.z_index[c.at(t)])
    if zm - zc >= SEPARATION_PERIODS * images.period_samples and c.bends.leg.relief_m < margin.candidate.bends.leg.relief_m:
        return (f"lies above the profile of the margin facing {m.direction} at trace {m.bends.steepest} with less "
                "relief: basin fill or drape over it, not a margin")
    return None


def vet(evidence: dict, images, *, slope_max_deg, relief_m, min_relief_m, n_slope_traces, has_break) -> list[str]:
    """Every rule's reason against a candidate (empty when none applies)."""
    top, face, onl, char = (evidence[k] for k in ("platform_top", "slope_face", "onlap", "character"))
    reasons = [
        noise_reflection(top),
        no_platform_top(top, images),
        regional_dip(top, slope_max_deg),
        staircase(face, char),
        cuts_layering(face),
        unimaged_face(face),
        implausible_slope(slope_max_deg),
        drape(onl),
        fold(onl, char),
        too_small(relief_m, min_relief_m),
        jitter(n_slope_traces) if has_break else None,
    ]
    return [r for r in reasons if r]


def vet_against(c, margins, images) -> str | None:
    """The first reason a candidate is not a margin of its own, given the margins already accepted."""
    for m in margins:
        why = inside_platform(c, m, images) or above_margin(c, m, images)
        if why:
            return why
    return None
