"""One test per rejection rule of :mod:`clinometry.picking.vetting`.

Each rule is fed hand-made evidence just inside and just outside its
threshold.  The thresholds carry their sources in the module (most are our
own choices, marked so there); the tests check that each rule acts on the
side of its threshold the docstring says, and that the physical facts the
rules rest on hold where a formula is involved:

* signal-to-noise of a reflection from the correlation of neighbouring
  traces, ``rho = S / (S + N)`` (e.g. Yilmaz 2001, from memory);
* carbonate slopes stand at up to about 60 deg where framework-built or
  cemented (Kenter 1990, from memory).
"""

from __future__ import annotations

from types import SimpleNamespace

import numpy as np
import pytest

from clinometry.picking import vetting as V
from clinometry.picking.candidates import Bends, Candidate, Leg
from clinometry.picking.evidence.record import Evidence

#: a section's image scales: 25 m traces, 100 m wavelength, 4-sample period
IMAGES = SimpleNamespace(dx_m=25.0, wavelength_m=100.0, smoothing_m=100.0, period_samples=4.0)


def ev(name, **values):
    return Evidence(name=name, score=0.5, values=values)


def candidate(*, z_top=100.0, z_floor=150.0, lo=0, hi=200, brk=80, toe=100, direction="+",
              shelf_break=True, depth=None, quality=None):
    """A flat top, a straight slope from ``brk`` to ``toe`` and a flat floor (z in samples, 2 m each)."""
    t = np.arange(lo, hi)
    z = np.interp(t, [brk, toe], [z_top, z_floor]) if direction == "+" else np.interp(t, [brk, toe], [z_floor, z_top])
    d = 2.0 * z if depth is None else depth
    leg = Leg(direction=direction, start=min(brk, toe) - 20, end=max(brk, toe) + 20, relief_m=float(np.ptp(d)))
    bends = Bends(leg=leg, steepest=(brk + toe) // 2, shelf_break=brk if shelf_break else None,
                  toe=toe if shelf_break else None, break_reason="", toe_reason="", slope_max_deg=10.0,
                  sigma_traces=2.0, break_curvature_per_km=1.0, toe_curvature_per_km=1.0,
                  outer_break=brk, outer_toe=toe)
    q = np.ones(t.size) if quality is None else quality
    return Candidate(direction=direction, lo=lo, hi=hi, z_index=z, depth_m=d, quality=q, support=q,
                     bends=bends, source_rank=0)


# -- evidence on one candidate -------------------------------------------------


def test_noise_reflection_rejects_a_top_whose_noise_outweighs_its_signal():
    # rho = S/(S+N) (Yilmaz 2001, from memory): S = N gives 0.5
    s, n = 1.0, 1.0
    assert V.NOISE_CORRELATION == pytest.approx(s / (s + n))
    assert V.noise_reflection(ev("platform_top", lateral_correlation=0.49))
    assert V.noise_reflection(ev("platform_top", lateral_correlation=0.51)) is None
    # a top that could not be measured is not taken as a reflection
    assert V.noise_reflection(ev("platform_top"))


def test_no_platform_top_needs_ten_traces_and_a_wavelength():
    need = max(V.MIN_TOP_TRACES * IMAGES.dx_m, V.MIN_TOP_WAVELENGTHS * IMAGES.wavelength_m)
    assert need == 250.0
    assert V.no_platform_top(ev("platform_top", length_m=need - 1), IMAGES)
    assert V.no_platform_top(ev("platform_top", length_m=need), IMAGES) is None
    assert V.no_platform_top(ev("platform_top"), IMAGES)  # no top at all


def test_regional_dip_rejects_a_top_as_steep_as_the_slope():
    slope = 10.0
    edge = V.TOP_FLATNESS_FRACTION * slope
    assert V.regional_dip(ev("platform_top", gradient_deg=edge + 0.01), slope)
    assert V.regional_dip(ev("platform_top", gradient_deg=edge - 0.01), slope) is None
    assert V.regional_dip(ev("platform_top"), slope) is None  # unmeasured: neutral


def test_staircase_rejects_jumps_through_weak_image_or_across_continuing_layering():
    char = ev("character")
    assert V.staircase(ev("slope_face", gap_share=V.STAIRCASE_GAP_SHARE), char)
    assert V.staircase(ev("slope_face", gap_share=V.STAIRCASE_GAP_SHARE - 0.01), char) is None
    face = ev("slope_face", gap_share=0.0)
    assert V.staircase(face, ev("character", same_level=V.STAIRCASE_LAYERING))
    assert V.staircase(face, ev("character", same_level=V.STAIRCASE_LAYERING - 0.01)) is None


def test_cuts_layering_on_readable_dips():
    n = V.MIN_DIP_READINGS
    cut = ev("slope_face", n_dip=n, agreement=V.CUTS_AGREEMENT - 0.01, flat_share=V.CUTS_FLAT_SHARE)
    assert V.cuts_layering(cut)
    # reflections that dip with the slope (a stratal surface) pass
    assert V.cuts_layering(ev("slope_face", n_dip=n, agreement=V.CUTS_AGREEMENT, flat_share=0.9)) is None
    # too few readings to say
    assert V.cuts_layering(ev("slope_face", n_dip=n - 1, agreement=0.0, flat_share=1.0)) is None


def test_cuts_layering_counts_the_aliased_steps():
    k = V.MIN_STEP_READINGS
    # no readable dips, but flat coherent layering at every aliased step
    assert V.cuts_layering(ev("slope_face", n_dip=0, n_aliased=k, flat_aliased=1.0))
    assert V.cuts_layering(ev("slope_face", n_dip=0, n_aliased=k - 1, flat_aliased=1.0)) is None
    # the share is weighted over both kinds of reading: 1 flat of 4 stays below one half
    mixed = ev("slope_face", n_dip=3, agreement=0.0, flat_share=0.0, n_aliased=1, flat_aliased=1.0)
    assert V.cuts_layering(mixed) is None
    mixed = ev("slope_face", n_dip=1, agreement=0.0, flat_share=0.0, n_aliased=2, flat_aliased=1.0)
    assert V.cuts_layering(mixed)


def test_unimaged_face_rejects_a_slope_mostly_continued():
    assert V.unimaged_face(ev("slope_face", inferred_share=V.MAX_INFERRED_SHARE + 0.01))
    assert V.unimaged_face(ev("slope_face", inferred_share=V.MAX_INFERRED_SHARE)) is None


def test_implausible_slope_allows_framework_slopes():
    # framework-built carbonate slopes stand at up to ~60 deg (Kenter 1990, from memory)
    assert V.implausible_slope(60.0) is None
    assert V.implausible_slope(V.MAX_SLOPE_DEG) is None
    assert V.implausible_slope(V.MAX_SLOPE_DEG + 1.0)
    assert V.MAX_SLOPE_DEG > 60.0


def test_drape_needs_enough_concordant_cells_above():
    n = V.DRAPE_MIN_CELLS
    assert V.drape(ev("onlap", above_discordant=V.DRAPE_MAX_DISCORDANT, n_above=n))
    assert V.drape(ev("onlap", above_discordant=V.DRAPE_MAX_DISCORDANT + 0.01, n_above=n)) is None
    assert V.drape(ev("onlap", above_discordant=0.0, n_above=n - 1)) is None


def test_fold_needs_parallel_layers_above_and_below_and_continuing_layering():
    n, d = V.DRAPE_MIN_CELLS, V.DRAPE_MAX_DISCORDANT
    parallel = ev("onlap", above_discordant=d, n_above=n, below_discordant=d, n_below=n)
    assert V.fold(parallel, ev("character", below=V.FOLD_LAYERING))
    assert V.fold(parallel, ev("character", below=V.FOLD_LAYERING - 0.01)) is None
    # older clinoforms beneath a prograding slope are parallel below, the fill above laps on
    onlapped = ev("onlap", above_discordant=0.8, n_above=n, below_discordant=0.0, n_below=n)
    assert V.fold(onlapped, ev("character", below=0.99)) is None


def test_too_small_below_the_minimum_relief():
    assert V.too_small(49.0, 50.0)
    assert V.too_small(50.0, 50.0) is None
    assert V.too_small(float("nan"), 50.0)


def test_jitter_rejects_single_trace_slopes():
    assert V.jitter(V.MIN_SLOPE_TRACES - 1)
    assert V.jitter(V.MIN_SLOPE_TRACES) is None


def test_concentrated_relief_rejects_a_ramp_reading_made_of_one_step():
    t = np.arange(200)
    step = np.where(t < 100, 200.0, 300.0)  # 100 m in one trace
    c = candidate(shelf_break=False, depth=step)
    assert V.concentrated_relief(c, IMAGES)
    spread = np.interp(t, [20, 180], [200.0, 300.0])  # the same relief over 4 km
    c = candidate(shelf_break=False, depth=spread)
    assert V.concentrated_relief(c, IMAGES) is None
    # a profile with a distinct break is not judged as a ramp
    assert V.concentrated_relief(candidate(shelf_break=True, depth=step), IMAGES) is None


# -- a candidate against an accepted margin ------------------------------------------


def test_inside_platform_rejects_a_slope_beneath_an_accepted_margin():
    margin = SimpleNamespace(candidate=candidate(z_top=100.0, z_floor=150.0))
    sep = V.SEPARATION_PERIODS * IMAGES.period_samples
    below = candidate(z_top=100.0 + 2 * sep, z_floor=150.0 + 2 * sep, brk=70, toe=110)
    assert V.inside_platform(below, margin, IMAGES)
    # the margin itself (same level) is not beneath itself
    assert V.inside_platform(candidate(), margin, IMAGES) is None
    # a slope beyond where the margin's profile leaves its reflection is not beneath it
    q = np.where(np.arange(200) < 150, 1.0, 0.0)
    margin_short = SimpleNamespace(candidate=candidate(quality=q))
    far = candidate(z_top=120.0, z_floor=170.0, brk=170, toe=190, lo=0, hi=200)
    assert V.inside_platform(far, margin_short, IMAGES) is None


def test_above_margin_rejects_smaller_bends_above_an_accepted_margin():
    margin = SimpleNamespace(candidate=candidate(z_top=100.0, z_floor=150.0))
    sep = V.SEPARATION_PERIODS * IMAGES.period_samples
    above = candidate(z_top=100.0 - 2 * sep, z_floor=130.0 - 2 * sep)  # less relief
    assert V.above_margin(above, margin, IMAGES)
    bigger = candidate(z_top=20.0, z_floor=120.0)  # more relief than the margin: not a smaller bend over it
    assert V.above_margin(bigger, margin, IMAGES) is None


def test_vet_collects_every_reason_and_judges_jitter_only_with_a_break():
    evidence = {
        "platform_top": ev("platform_top", lateral_correlation=0.1, length_m=0.0, gradient_deg=0.0),
        "slope_face": ev("slope_face", gap_share=0.0, inferred_share=0.0),
        "onlap": ev("onlap"),
        "character": ev("character"),
    }
    kw = dict(slope_max_deg=10.0, relief_m=100.0, min_relief_m=50.0, n_slope_traces=1)
    with_break = V.vet(evidence, IMAGES, has_break=True, **kw)
    without = V.vet(evidence, IMAGES, has_break=False, **kw)
    assert len(with_break) == 3  # noise, no top, jitter
    assert len(without) == 2
    clean = {
        "platform_top": ev("platform_top", lateral_correlation=0.9, length_m=1000.0, gradient_deg=0.0),
        "slope_face": ev("slope_face", gap_share=0.0, inferred_share=0.0),
        "onlap": ev("onlap"),
        "character": ev("character"),
    }
    assert V.vet(clean, IMAGES, has_break=True, **{**kw, "n_slope_traces": 20}) == []
