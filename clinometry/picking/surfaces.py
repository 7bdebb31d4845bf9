"""The default picker: surfaces, margin profile, clinoforms, break and toe.

Steps (each in its own module, explained there):

1. :mod:`~clinometry.picking.condition`: dead traces masked and filled,
   gain balanced along the line, envelope, dominant period.
2. :mod:`~clinometry.picking.orientation`: structure-tensor coherence,
   used as part of the pick quality.
3. :mod:`~clinometry.picking.tracking`: the strongest reflector surfaces
   as minimum-cost paths across the line (steep, aliased foresets
   included), with terminations where a surface merges into another.
4. :mod:`~clinometry.picking.margins`: each surface in depth, margin legs,
   steepest point, break and toe from curvature; candidates from several
   surfaces grouped into margins with their clinoforms.
5. :mod:`~clinometry.picking.faces` and :mod:`~clinometry.picking.assemble`:
   where a basin fill onlaps the slope, the slope face is found from the
   coherent dip field and joined to the platform top and basin floor; the
   outer profile of each margin is chosen and inconsistent margins dropped.
6. :mod:`~clinometry.picking.clinoforms`: the older clinoforms of each
   margin are followed through the reflection dip field beneath its outer
   profile (streamlines seeded a quarter wavelength apart on the foresets),
   each with break and toe by the same curvature rule as the profile.  Only
   where none is found are they taken from the other tracked surfaces of
   the group beneath it, one break each; a surface whose break lies above
   the outer profile, or that runs within about half a period of a kept
   surface (a wavelet side lobe of the same reflector), is dropped with a
   note (:func:`~clinometry.picking.assemble.select_clinoforms`).

All lengths derive from the dominant wavelength of the data and the
velocity, never from trace or sample counts, so the picker behaves the same
at 6.25 m or 25 m trace spacing and at 15 or 40 Hz.
"""

from __future__ import annotations

import dataclasses
import logging

import numpy as np
from scipy import ndimage

from ..errors import PickingError
from ..section import check_section, section_name
from .clinoforms import foreset_clinoforms
from .condition import condition, envelope_in_place
from .faces import slope_faces
from .margins import EDGE_CONFIDENCE_FACTOR, profile_candidates, to_depth, velocity_at
from .orientation import reflector_orientation
from .assemble import (
    select_clinoforms,
    FACE_MIN_DIP_DEG,
    choose_profile,
    dip_agreement,
    cuts_layering,
    drop_buried,
    drop_opposed,
    envelope_quality,
    face_profile,
    face_unconfirmed,
    foreset_span,
    limit_slope,
    regularise,
    steepest_unconfirmed,
    true_dip_deg,
    TrueDipRows,
)
from .picks import ClinoformPicks, Horizon, MarginPicks, PickPoint, Picks
from .tracking import track_paths

__all__ = ["pick_default"]

logger = logging.getLogger(__name__)

#: candidates with lower confidence are not reported as margins
#: (common practice, no source)
DEFAULT_MIN_CONFIDENCE = 0.3
#: a reflector piece shorter than this many dominant wavelengths is not kept
#: as a horizon (common practice, no source)
MIN_HORIZON_WAVELENGTHS = 1.0
#: quality below which a path point is not part of an exported reflector
MIN_POINT_QUALITY = 0.15
#: local foreset gradients of an exported profile are limited to this
#: multiple of the steepest gradient of the same surface median-filtered and
#: smoothed (Gaussian sigma) over CAP_SMOOTHING_WAVELENGTHS dominant
#: wavelengths: steps between wavelet lobes where a basin fill onlaps the
#: slope are spread over the foreset, the relief is kept.  Three quarters of
#: a wavelength lies between the half-wavelength scale of two resolved
#: reflections (Widess 1973, from memory) and the one-wavelength smoothing of
#: break and toe; with 1.35 x the one-wavelength gradient the median
#: max-slope error of scripts/bench_accuracy.py was 2.4-3.0 deg, with this
#: 1.9-2.2 deg at SNR >= 3 (our choice, measured, no source)
SLOPE_LIMIT_FACTOR = 1.0
CAP_SMOOTHING_WAVELENGTHS = 0.75


def _max_jump_samples(section, velocity, max_dip_deg, dx_m):
    dz = float(section.attrs["sample_interval"])
    tan = np.tan(np.radians(max_dip_deg))
    if section.attrs["domain"] == "depth":
        return tan * dx_m / dz
    z = section["z"].values
    v = float(np.min(np.atleast_1d(velocity_at(section, velocity, z))))
    return 2.0 * tan * dx_m / v * 1000.0 / dz


def _wavelength_m(section, velocity, period_z):
    """Dominant wavelength (m): v * T for TWT, 2 * period for depth sections."""
    if section.attrs["domain"] == "depth":
        return 2.0 * period_z
    z = section["z"].values
    v = float(np.median(np.atleast_1d(velocity_at(section, velocity, z))))
    return v * period_z * 1e-3


def _horizon_pieces(zs, q, min_len, start_id, z_axis):
    """Split a path into continuous reflector pieces of good quality."""
    good = q >= MIN_POINT_QUALITY
    out = []
    if not good.any():
        return out
    idx = np.flatnonzero(good)
    breaks = np.flatnonzero(np.diff(idx) > 2)
    for piece in np.split(idx, breaks + 1):
        if piece.size >= min_len:
            out.append((piece, np.interp(zs[piece], np.arange(z_axis.size), z_axis), q[piece]))
    return out


def _record_edge(cand, z_index, n_z, period_samples):
    """The candidate with its confidence reduced when its break or toe lies
    within half a dominant period (the main lobe of the wavelet) of the top or
    bottom of the record: a bend
    there is where the surface leaves the image, not a measured bend."""
    at = [
        name
        for name, t in (("shelf break", cand.shelf_break), ("toe", cand.toe))
        if t is not None and not (0.5 * period_samples <= z_index[t] <= n_z - 1 - 0.5 * period_samples)
    ]
    if not at:
        return cand
    why = " and ".join(at) + " within half a period of the top or bottom of the record (not imaged beyond it)"
    return dataclasses.replace(
        cand,
        confidence=cand.confidence * EDGE_CONFIDENCE_FACTOR,
        break_reason=cand.break_reason or (why if "shelf break" in at else ""),
        toe_reason=cand.toe_reason or (why if "toe" in at else ""),
    )


def _steepest_gradient(depth_m, distance_m, cand, sigma_m):
    """Steepest basinward gradient (dz/dx) between break and toe of a depth
    profile median-filtered and Gaussian-smoothed over ``sigma_m``."""
    dx = float(np.median(np.abs(np.diff(distance_m)))) or 1.0
    sig = max(0.5, sigma_m / dx)
    med = ndimage.median_filter(depth_m, size=int(max(3, 2 * round(sig / 2) + 1)), mode="nearest")
    g = np.gradient(ndimage.gaussian_filter1d(med, sig, mode="nearest"), distance_m)
    lo, hi = sorted((int(cand.shelf_break), int(cand.toe)))
    sgn = 1.0 if cand.direction == "+" else -1.0
    return float(max(np.max(sgn * g[lo : hi + 1]), 1e-6))


def _agreement(paths, depth_list, dist, dip_deg, coh, period_samples, smoothing_traces, peak_smoothing_traces):
    """Candidate -> :func:`~clinometry.picking.assemble.dip_agreement` of its surface, cached."""
    cache = {}

    def agreement(m):
        key = (m.path_rank, m.leg)
        if key not in cache:
            cache[key] = dip_agreement(
                m, depth_list[m.path_rank], dist, paths[m.path_rank].z_index, dip_deg, coh, period_samples, smoothing_traces,
                peak_smoothing_traces=peak_smoothing_traces,
            )
        return cache[key]

    return agreement


def pick_default(
    section,
    *,
    velocity=None,
    smoothing_m: float | None = None,
    max_dip_deg: float = 70.0,
    min_relief_m: float | None = None,
    n_surfaces: int = 16,
    min_confidence: float = DEFAULT_MIN_CONFIDENCE,
):
    """Surfaces, margins, clinoforms, shelf breaks and toes picked from the image with no seeds.

    Parameters
    ----------
    section : xarray.DataArray, dims ("trace", "z")
        A section (TWT or depth), see :mod:`clinometry.section`.
    velocity : velocity model, float (m/s) or None
        For depth conversion of the surfaces (``clinometry.depth``); None
        means the package default constant velocity for TWT sections (noted
        in ``Picks.notes``) and nothing for depth sections.
    smoothing_m : float, m, optional
        Gaussian smoothing length (sigma) along the line for break and toe
        detection.  Default: one dominant wavelength of the data.
    max_dip_deg : float, degrees
        Steepest true dip a surface may follow.
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
        Horizons: the surfaces of each margin (ids from 0, roles
        ``margin_profile`` and ``clinoform``, one z per trace), its
        ``platform_top`` (ids from 10000) and the remaining tracked
        reflector pieces (ids from 20000, role ``reflector``).  Margins with
        break, toe and clinoforms (oldest first), or none with a note why.

    Raises
    ------
    PickingError
        When the section has no live trace or too few samples per period.

    Notes
    -----
    See the module docstrings of :mod:`~clinometry.picking.condition`,
    :mod:`~clinometry.picking.orientation`,
    :mod:`~clinometry.picking.tracking` and
    :mod:`~clinometry.picking.margins` for the methods and references.

    References
    ----------
    .. [1] Widess, M. B. (1973). How thin is a thin bed? Geophysics 38(6),
       1176-1180. (from memory)
    """
    check_section(section)
    name = section_name(section)
    data = section.transpose("trace", "z").values
    z_axis = section["z"].values.astype(float)
    dz = float(section.attrs["sample_interval"])
    notes = []
    # the envelope is made after the orientation, over the amplitudes (memory)
    cond = condition(data, dz, known_dead=section.attrs.get("dead_traces", []), with_envelope=False)
    notes.extend(cond.notes)
    if cond.dead.all():
        raise PickingError(f"{name}: every trace is dead (zero, constant or non-finite); nothing to pick")
    if not np.isfinite(cond.period_z) or cond.period_z < 2 * dz:
        raise PickingError(
            f"{name}: dominant period {cond.period_z:.3g} {section.attrs['units']} is not resolved by the "
            f"sample interval {dz:g}; check the sample interval"
        )
    if velocity is None and section.attrs["domain"] == "twt":
        notes.append(f"no velocity given: surfaces converted to depth with the default {velocity_at(section, None, z_axis):.0f} m/s")
    period_samples = cond.period_z / dz
    dist = section["distance"].values.astype(float)
    dx_m = float(np.median(np.abs(np.diff(dist)))) or 1.0
    wavelength = _wavelength_m(section, velocity, cond.period_z)
    smoothing = float(smoothing_m) if smoothing_m is not None else wavelength
    min_relief = float(min_relief_m) if min_relief_m is not None else max(10.0, 0.5 * wavelength)
    notes.append(
        f"dominant period {cond.period_z:.3g} {section.attrs['units']}, wavelength {wavelength:.0f} m, "
        f"smoothing {smoothing:.0f} m, minimum relief {min_relief:.0f} m"
    )
    max_jump = _max_jump_samples(section, velocity, max_dip_deg, dx_m)
    dip, coh = reflector_orientation(cond.amplitude, sigma_z_samples=max(1.0, period_samples / 4), sigma_trace=1.5)
    # only the sign of the balanced amplitudes is used after this (the
    # polarity of each tracked surface): kept as one bit per cell, and the
    # amplitudes overwritten by their envelope (the same values as
    # condition.envelope; memory: no second full-size image)
    amplitude = cond.amplitude
    positive = envelope_in_place(amplitude, packed=True)
    cond = dataclasses.replace(cond, amplitude=None, envelope=amplitude)
    del amplitude
    paths = track_paths(
        cond.envelope,
        positive,
        period_samples=period_samples,
        max_jump_samples=max_jump,
        n_paths=n_surfaces,
        dip=dip,
        coherence=coh,
        dead=cond.dead,
    )
    del positive
    n = data.shape[0]
    rows = np.arange(n)
    # the faces read the true dip block by block; the full image is made
    # once the envelope is released (memory: never both at once)
    faces = slope_faces(
        TrueDipRows(section, velocity, dip, dx_m),
        coh,
        cond.envelope,
        min_dip_deg=FACE_MIN_DIP_DEG,
        period_samples=period_samples,
        dip_samples=dip,
        max_jump_samples=max_jump,
    )
    face_ranks = set()
    # the envelope quality is read along the faces only: made when there is
    # one, released after (memory)
    e_q = envelope_quality(cond.envelope, cond.dead) if faces else None
    for f in faces:
        face_ranks.add(len(paths))
        paths.append(face_profile(f, paths, e_q, coh, period_samples, rank=len(paths)))
    del e_q
    # nor is the envelope used after the faces: released (memory)
    cond = dataclasses.replace(cond, envelope=None)
    dip_deg = true_dip_deg(section, velocity, dip, dx_m)
    zs_list, depth_list, q_list = [], [], []
    for p in paths:
        zs = np.interp(regularise(p.z_index, wavelength / dx_m), np.arange(z_axis.size), z_axis)
        zi = np.clip(np.round(p.z_index).astype(int), 0, z_axis.size - 1)
        q = p.quality * (0.5 + 0.5 * coh[rows, zi])
        zs_list.append(zs)
        q_list.append(q)
        # margins are judged on the raw picks (a jump between reflectors
        # must stay a jump); horizons carry the regularised surface
        raw = np.interp(p.z_index, np.arange(z_axis.size), z_axis)
        depth_list.append(to_depth(section, rows, raw, velocity))

    cands = []
    for p, dep, q in zip(paths, depth_list, q_list):
        for c in profile_candidates(dist, dep, q, path_rank=p.rank, smoothing_m=smoothing, min_relief_m=min_relief):
            # a face is built from the dip field itself; the test is for tracked surfaces
            if p.rank in face_ranks:
                why = face_unconfirmed(c, p.z_index, dip_deg, coh, period_samples)
            else:
                why = cuts_layering(c, p.z_index, dip, coh, period_samples) or steepest_unconfirmed(
                    c, p.z_index, dip_deg, coh, period_samples, smoothing / dx_m
                )
            if why:
                logger.debug("surface %d candidate at %s rejected: %s", p.rank, c.leg, why)
                continue
            cands.append(_record_edge(c, p.z_index, z_axis.size, period_samples))

    # group candidates that face the same way and overlap laterally
    groups = []
    for c in sorted(cands, key=lambda c: -c.confidence):
        lo, hi = min(c.leg), max(c.leg)
        for g in groups:
            g0 = g[0]
            if g0.direction == c.direction and min(hi, max(g0.leg)) - max(lo, min(g0.leg)) > 0 and all(
                m.path_rank != c.path_rank for m in g
            ):
                g.append(c)
                break
        else:
            groups.append([c])

    groups = drop_opposed(groups, notes)
    horizons = []
    margins = []
    used_ranks = {}
    next_id = 0
    chosen = []
    agreements = {}
    streamline_horizons = {}
    for g in groups:
        span = (min(min(m.leg) for m in g), max(max(m.leg) for m in g))
        steep = [m.steepest for m in g]
        core = slice(min(steep), max(steep) + 1)
        agreement = _agreement(
            paths, depth_list, dist, dip_deg, coh, period_samples, smoothing / dx_m, CAP_SMOOTHING_WAVELENGTHS * wavelength / dx_m
        )
        prof = choose_profile(g, core, paths, depth_list, face_ranks, period_samples, agreement=agreement)
        agreements[id(prof)] = agreement
        chosen.append((g, span, core, prof))
    chosen = drop_buried(chosen, paths, period_samples, notes)
    for g, span, core, profile in sorted(chosen, key=lambda c: c[1][0]):
        if profile.shelf_break is not None and profile.toe is not None:
            zs = zs_list[profile.path_rank]
            if section.attrs["domain"] == "depth":
                per_m = np.ones_like(zs)
            else:  # ms of TWT per m of depth at each pick: 2000 / v
                per_m = 2000.0 / np.broadcast_to(np.atleast_1d(velocity_at(section, velocity, zs)), zs.shape)
            # local gradients limited to a multiple of the wavelength-scale steepest one
            g_lim = _steepest_gradient(depth_list[profile.path_rank], dist, profile, CAP_SMOOTHING_WAVELENGTHS * wavelength)
            # nor steeper than the reflections along the foreset
            refl_max = agreements[id(profile)](profile)[3]
            if np.isfinite(refl_max) and 0.0 < refl_max < 90.0:
                g_lim = min(g_lim, np.tan(np.radians(refl_max)))
            zs_list[profile.path_rank] = limit_slope(zs, dist, profile.shelf_break, profile.toe, SLOPE_LIMIT_FACTOR * g_lim * per_m)
        conf = profile.confidence
        if conf < min_confidence:
            notes.append(
                f"margin facing {profile.direction} near traces {span[0]}-{span[1]} left out: "
                f"confidence {conf:.2f} below {min_confidence:.2f}"
                + "".join(f"; {r}" for r in profile.reasons)
            )
            continue
        # clinoforms: every surface of the group, oldest (deepest) first
        # only surfaces beneath the outer profile along its foreset are its
        # older clinoforms (superposition); a surface above it lies in the fill
        lo_p, hi_p = foreset_span(profile)
        span_p = slice(lo_p, hi_p + 1)
        prof_z = float(np.mean(paths[profile.path_rank].z_index[span_p]))
        below = [m for m in g if float(np.mean(paths[m.path_rank].z_index[span_p])) >= prof_z - 1.0]
        below = select_clinoforms(profile, below, paths, period_samples, notes)
        ordered = sorted(below, key=lambda m: -float(np.mean(depth_list[m.path_rank][core])))
        # older clinoforms followed through the dip field beneath the outer
        # profile (clinoforms.py); the tracked surfaces only when none is found
        older, c_notes = foreset_clinoforms(
            section, velocity, profile, paths[profile.path_rank].z_index, dip=dip, dip_deg=dip_deg, coh=coh,
            period_samples=period_samples, wavelength_m=wavelength, smoothing_m=smoothing, min_relief_m=min_relief,
            max_dip_samples=max_jump,
        )
        notes.extend(c_notes)
        clinos = []
        if older:
            ordered = [profile]
            for f in older:
                hid = next_id
                next_id += 1
                streamline_horizons[hid] = f
                zs_f = np.interp(f.z_index, np.arange(z_axis.size), z_axis)
                m = f.candidate
                clinos.append(ClinoformPicks(
                    hid,
                    PickPoint(int(m.shelf_break), float(zs_f[m.shelf_break]), float(f.quality[m.shelf_break])),
                    PickPoint(int(m.toe), float(zs_f[m.toe]), float(f.quality[m.toe])) if m.toe is not None else None,
                    m.break_reason, m.toe_reason, source="dip_field"))
        for m in ordered:
            if m.path_rank not in used_ranks:
                used_ranks[m.path_rank] = next_id
                next_id += 1
            hid = used_ranks[m.path_rank]
            zs = zs_list[m.path_rank]
            q = q_list[m.path_rank]
            bp = PickPoint(int(m.shelf_break), float(zs[m.shelf_break]), float(q[m.shelf_break])) if m.shelf_break is not None else None
            tp = PickPoint(int(m.toe), float(zs[m.toe]), float(q[m.toe])) if m.toe is not None else None
            clinos.append(ClinoformPicks(hid, bp, tp, m.break_reason, m.toe_reason))
        prof_id = used_ranks[profile.path_rank]
        prof_clino = next(c for c in clinos if c.horizon_id == prof_id)
        top_id = None
        if profile.shelf_break is not None:
            zs = zs_list[profile.path_rank]
            q = q_list[profile.path_rank]
            a, b = profile.leg
            if profile.direction == "+":
                top_tr = np.arange(max(0, min(a, profile.shelf_break)), profile.shelf_break + 1)
            else:
                top_tr = np.arange(profile.shelf_break, min(n - 1, max(b, profile.shelf_break)) + 1)
            if top_tr.size >= 2:
                top_id = 10_000 + next_id
                next_id += 1
                horizons.append(Horizon(top_id, "platform_top", top_tr, zs[top_tr], q[top_tr], paths[profile.path_rank].polarity))
        margins.append(
            MarginPicks(
                direction=profile.direction,
                profile_id=prof_id,
                platform_top_id=top_id,
                shelf_break=prof_clino.shelf_break,
                toe=prof_clino.toe,
                clinoforms=tuple(clinos),
                confidence=round(float(conf), 3),
                break_reason=prof_clino.break_reason,
                toe_reason=prof_clino.toe_reason,
                notes=(
                    f"relief {profile.relief_m:.0f} m, steepest slope {profile.slope_max_deg:.1f} deg, "
                    f"landward gradient {profile.top_gradient_deg:.2f} deg, foreset reflection strength "
                    f"{profile.foreset_quality:.2f}",
                    *profile.reasons,
                ),
            )
        )

    # horizons of the surfaces used by margins (whole path), then reflector pieces
    profile_ids = {m.profile_id for m in margins}
    for hid, f in streamline_horizons.items():
        # only over the leg it was measured on: beyond it the streamline runs
        # on through incoherent or unrelated reflections, which would clutter
        # the QC figure and the horizons file
        a, b = sorted(f.candidate.leg)
        tr = rows[a : b + 1]
        zs_f = np.interp(f.z_index[tr], np.arange(z_axis.size), z_axis)
        horizons.append(Horizon(hid, "clinoform", tr, zs_f, f.quality[tr], "unknown"))
    for rank, hid in sorted(used_ranks.items(), key=lambda kv: kv[1]):
        if not any(c.horizon_id == hid for mg in margins for c in mg.clinoforms):
            continue
        role = "margin_profile" if hid in profile_ids else "clinoform"
        horizons.append(Horizon(hid, role, rows, zs_list[rank], q_list[rank], paths[rank].polarity))
    min_len = max(3, int(np.ceil(MIN_HORIZON_WAVELENGTHS * wavelength / dx_m)))
    for p in paths:
        if p.rank in used_ranks:
            continue
        for tr, zz, qq in _horizon_pieces(p.z_index, q_list[p.rank], min_len, next_id, z_axis):
            horizons.append(Horizon(20_000 + next_id, "reflector", tr, zz, qq, p.polarity))
            next_id += 1
    if not margins:
        notes.append(
            "no margin: no traced surface deepens by at least "
            f"{min_relief:.0f} m from a flatter top over a slope with reflections"
            if not cands
            else "no margin above the confidence threshold"
        )
    horizons.sort(key=lambda h: h.id)
    params = {
        "smoothing_m": smoothing,
        "max_dip_deg": float(max_dip_deg),
        "min_relief_m": min_relief,
        "n_surfaces": int(n_surfaces),
        "min_confidence": float(min_confidence),
        "dominant_period": float(cond.period_z),
        "wavelength_m": float(wavelength),
    }
    logger.info("%s: %d surfaces, %d margin(s)", name, len(paths), len(margins))
    return Picks(horizons=tuple(horizons), margins=tuple(margins), picker="default", parameters=params, notes=tuple(notes))
