"""Evidence of reflections that end against the slope: onlap of the basin fill, not drape.

The fill of the basin in front of a margin laps onto its slope: its
reflections are flatter than the slope and end against it (onlap; Mitchum,
Vail & Sangree 1977).  A surface that only bends over older relief (drape,
compaction over a mound, a fold) has reflections above it that run parallel
to it.  So the dips of coherent reflections in a band just above the slope
(beyond the slope's own wavelet: half to one and a half periods above it)
tell onlap (discordant) from drape (concordant).

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
from .faces import ALIASED_PERIODS, MIN_COHERENCE
from .record import NEUTRAL, Evidence

__all__ = ["onlap", "BAND_PERIODS"]

#: the band above (and below) the slope, in dominant periods from the pick
BAND_PERIODS = (0.5, 1.5)
#: a reflection is discordant when its dip differs from the slope's by more
#: than this fraction of the slope's dip (our choice, no source)
DISCORDANT_FRACTION = 0.5


def _band(images, c, traces, side):
    k = c.at(traces)
    zp = c.z_index[k]
    pdip = np.gradient(c.z_index)[k]
    a, b = BAND_PERIODS
    offs = np.linspace(a, b, 5) * images.period_samples
    zz = zp[:, None] + side * offs[None, :]
    ok = (zz >= 0) & (zz <= images.n_z - 1)
    tr = np.broadcast_to(traces[:, None], zz.shape)[ok]
    zc = np.rint(zz[ok]).astype(np.int64)
    pd = np.broadcast_to(pdip[:, None], zz.shape)[ok]
    return images.dip[tr, zc].astype(float), images.coherence[tr, zc].astype(float), pd


def _discordance(rd, coh, pd):
    keep = coh >= MIN_COHERENCE
    if keep.sum() < 5:
        return float("nan"), int(keep.sum())
    w = coh[keep]
    disc = np.abs(rd[keep] - pd[keep]) > DISCORDANT_FRACTION * np.abs(pd[keep])
    return float(np.sum(w * disc) / np.sum(w)), int(keep.sum())


def onlap(images, c) -> Evidence:
    """Evidence that reflections above the slope end against it (onlap) rather than drape it.

    Returns
    -------
    Evidence
        ``values``: ``above_discordant`` and ``below_discordant`` (coherence
        weighted share of discordant reflections in the band above / below
        the steep part of the slope), ``n_above``, ``n_below``.
    """
    tr = face_traces(c)
    pd = np.gradient(c.z_index)[c.at(tr)]
    sgn = 1.0 if c.direction == "+" else -1.0
    steep = sgn * pd > 0.5 * np.max(sgn * pd) if pd.size else pd > 0
    steep &= np.abs(pd) <= 4 * ALIASED_PERIODS * images.period_samples
    tr = tr[steep]
    if tr.size == 0:
        return Evidence("onlap", NEUTRAL, {}, "slope too steep or too short to read the reflections beside it")
    above, n_a = _discordance(*_band(images, c, tr, -1.0))
    below, n_b = _discordance(*_band(images, c, tr, +1.0))
    vals = {"above_discordant": above, "below_discordant": below, "n_above": n_a, "n_below": n_b}
    score = above if n_a >= 10 and above == above else NEUTRAL
    return Evidence("onlap", score, vals,
                    f"reflections above the slope {100 * above:.0f}% discordant (onlap), below {100 * below:.0f}%")
