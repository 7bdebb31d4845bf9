"""Evidence of reflections that end against the slope: onlap of the basin fill, not drape.

The fill of the basin in front of a margin laps onto its slope: its
reflections are flatter than the slope and end against it (onlap; Mitchum,
Vail & Sangree 1977).  A surface that only bends over older relief (drape,
compaction over a mound, a fold) has the reflections of the layers above it
running parallel to it.  So the dips of coherent reflections in the fill,
one and a half to three and a half periods off the slope along its normal, tell onlap (discordant)
from drape (concordant).

References
----------
.. [1] Mitchum, R. M., Vail, P. R. & Sangree, J. B. (1977). Seismic
   stratigraphy and global changes of sea level, part 6: stratigraphic
   interpretation of seismic reflection patterns in depositional
   sequences. AAPG Memoir 26, 117-133. (from memory)
"""

from __future__ import annotations

import numpy as np

from ._regions import face_traces
from .faces import MIN_COHERENCE
from .record import NEUTRAL, Evidence

__all__ = ["onlap", "OFFSET_PERIODS", "MIN_DIP_SAMPLES"]

#: the reflections off the slope are read this many dominant periods from it
#: along its normal: beyond its own wavelet and side lobes (about 0.7 period
#: for a Ricker wavelet) and beyond a thin drape on it (thinner than the
#: tuning thickness of a quarter wavelength; Widess 1973, from memory); our
#: choice, no source
OFFSET_PERIODS = (1.5, 2.5, 3.5)
#: slopes dipping less than this (samples per trace) are not compared (our choice)
MIN_DIP_SAMPLES = 0.15
#: a cell off the slope counts as a reflection when its envelope reaches this
#: fraction of the slope's own (and the image's background); weaker ringing
#: of the slope's wavelet does not (our choice, no source)
RELATIVE_STRENGTH = 0.2
#: dips closer than this (samples per trace) are not told apart: the
#: structure tensor's dip error on coherent reflections (our choice, no source)
DIP_RESOLUTION = 0.1
#: fewest coherent cells for a reading
MIN_CELLS = 5
#: a reflection is discordant when its dip differs from the slope's by more
#: than this fraction of the slope's dip (our choice, no source)
DISCORDANT_FRACTION = 0.5


def _beside(images, c, traces, side):
    """Dip, coherence and the slope's own dip at cells off the slope, along its normal.

    From each slope pick the cells at :data:`OFFSET_PERIODS` dominant
    periods (in depth, along the normal to the slope) off it: into the
    fill (``side = -1``, above the slope and basinward) or into the platform
    (``side = +1``, below and landward).  Along the normal, whatever the
    slope's dip, the samples clear the slope's own wavelet and its side
    lobes, which would otherwise read as reflections parallel to it.
    """
    k = c.at(traces)
    zp = c.z_index[k]
    pd = np.full(k.size, _slope_dip(c, traces))
    sgn = 1.0 if c.direction == "+" else -1.0
    strength = 1.0 - images.cost.cost
    own = images.envelope[traces, np.clip(np.rint(zp).astype(np.int64), 0, images.n_z - 1)].astype(float)
    vm = images.vertical_m[np.clip(np.rint(zp).astype(np.int64), 0, images.n_z - 1)]  # m per sample / dx
    g = np.abs(pd) * vm  # true gradient (m/m)
    theta = np.arctan(g)
    if images.section.attrs["domain"] == "depth":
        period_m = images.period_samples * images.vertical_m[0] * images.dx_m
    else:
        period_m = 0.5 * images.wavelength_m
    rd, co, pp = [], [], []
    for off in OFFSET_PERIODS:
        dist = off * period_m
        # the normal into the fill points up and basinward (side -1)
        dx_tr = -side * sgn * dist * np.sin(theta) / images.dx_m
        dz_s = side * dist * np.cos(theta) / (vm * images.dx_m)
        t2 = np.rint(traces + dx_tr).astype(np.int64)
        z2 = np.rint(zp + dz_s).astype(np.int64)
        ok = (t2 >= 0) & (t2 < images.n_trace) & (z2 >= 0) & (z2 < images.n_z)
        if not ok.any():
            continue
        t2, z2 = t2[ok], z2[ok]
        # a reflection, not the faint ringing of a wavelet: above the image's
        # background and at least a fraction of the slope's own envelope
        on = (strength[t2, images.cells(z2)] > 0) & (
            images.envelope[t2, z2] >= RELATIVE_STRENGTH * own[ok])
        rd.append(images.dip[t2, z2].astype(float)[on])
        co.append(images.coherence[t2, z2].astype(float)[on])
        pp.append(pd[ok][on])
    if not rd:
        return np.zeros(0), np.zeros(0), np.zeros(0)
    return np.concatenate(rd), np.concatenate(co), np.concatenate(pp)


def _slope_dip(c, traces):
    """The slope's own apparent dip (samples per trace): the median over its steep part of the
    profile's gradient smoothed at the scale the slope was read on."""
    from ..candidates import smooth_profile

    g = np.gradient(smooth_profile(c.z_index, max(1.0, 0.5 * c.bends.sigma_traces)))
    return float(np.median(g[c.at(traces)]))


def _discordance(rd, coh, pd):
    keep = coh >= MIN_COHERENCE
    if keep.sum() < MIN_CELLS:
        return float("nan"), int(keep.sum())
    w = coh[keep]
    disc = np.abs(rd[keep] - pd[keep]) > np.maximum(DISCORDANT_FRACTION * np.abs(pd[keep]), DIP_RESOLUTION)
    return float(np.sum(w * disc) / np.sum(w)), int(keep.sum())


def onlap(images, c) -> Evidence:
    """Evidence that reflections beside the slope end against it (onlap) rather than run parallel (drape, folds).

    Returns
    -------
    Evidence
        ``values``: ``above_discordant`` (coherence-weighted share of
        discordant reflections basinward of the slope, in the fill) and
        ``below_discordant`` (landward of it, in the platform), ``n_above``,
        ``n_below``.  The score is ``above_discordant``; neutral where the
        slope dips less than :data:`MIN_DIP_SAMPLES` per trace (the dips of a
        ramp and of its fill cannot be told apart) or too few coherent
        reflections lie beside it.
    """
    from ..candidates import smooth_profile

    tr = face_traces(c)
    pd = np.gradient(smooth_profile(c.z_index, max(1.0, 0.5 * c.bends.sigma_traces)))[c.at(tr)]
    sgn = 1 if c.direction == "+" else -1
    steep = sgn * pd > 0.5 * np.max(sgn * pd) if pd.size else pd > 0
    tr = tr[steep]
    if tr.size == 0 or abs(_slope_dip(c, tr)) < MIN_DIP_SAMPLES:
        return Evidence("onlap", NEUTRAL, {}, "slope too gentle or too short to read the reflections beside it")
    above, n_a = _discordance(*_beside(images, c, tr, -1))
    below, n_b = _discordance(*_beside(images, c, tr, +1))
    vals = {"above_discordant": above, "below_discordant": below, "n_above": n_a, "n_below": n_b}
    score = above if above == above else NEUTRAL
    return Evidence("onlap", score, vals,
                    f"reflections in the fill beside the slope {100 * above:.0f}% discordant (onlap), in the "
                    f"platform {100 * below:.0f}%")
