"""Evidence of a slope face: reflection energy along the slope and reflection dip that agrees with it.

Along a real slope the profile follows the face's own reflection: the
vertical run between neighbouring picks lies on reflection energy (a
migrated steep reflection is stretched along the trace by ``1 / cos(dip)``),
and where the dip is not spatially aliased the structure-tensor dip of the
reflection agrees with the profile's.  A step between two flat reflectors
(a staircase) crosses weak image, and where it crosses layering the
reflections there are flat while the profile dips.

Spatial aliasing: a reflection that moves by more than half a period from
one trace to the next cannot have its dip measured from neighbouring traces
(the Nyquist condition on the lateral sampling of a dipping event; Yilmaz
2001).  Such traces count for the energy but not for the dip.

References
----------
.. [1] Yilmaz, O. (2001). Seismic Data Analysis, 2nd ed., SEG (spatial
   aliasing of dipping events). (from memory)
"""

from __future__ import annotations

import numpy as np

from ._regions import face_traces
from .record import Evidence, mean_score, ramp

__all__ = ["slope_face", "ALIASED_PERIODS", "DIP_TOLERANCE", "MIN_COHERENCE"]

#: apparent dips above this many periods per trace are aliased (Nyquist)
ALIASED_PERIODS = 0.5
#: a reflection dip agrees with the profile when within this fraction of it
#: (our choice, no source)
DIP_TOLERANCE = 0.5
#: a cell of a vertical run is in a gap when its strength is below this
#: fraction of the face's median strength (our choice, no source)
GAP_FRACTION = 0.5
#: profile dips below this (samples per trace) are not compared with the
#: reflection dip: a ramp's dip is within the tensor's error (our choice)
MIN_READABLE_DIP = 0.3
#: structure-tensor coherence above which a dip is read (our choice, no source)
MIN_COHERENCE = 0.5


def _path_dip(c):
    """Apparent dip of the profile (samples per trace), lightly smoothed (half the bend scale)."""
    from ..candidates import smooth_profile

    return np.gradient(smooth_profile(c.z_index, max(1.0, 0.5 * c.bends.sigma_traces)))


def _run_gaps(images, c, traces):
    """Share of the cells of the vertical runs between neighbouring picks that lie in a gap of the reflection.

    A run joins the pick at trace ``i - 1`` to the pick at trace ``i``; a
    cell of it is on the reflection when either trace's strength there, of
    the profile's own polarity, reaches :data:`GAP_FRACTION` of the face's
    typical strength (the median at its picks).  A slope face is often much
    weaker than the platform top (its impedance contrast fades downslope),
    but it is continuous and stays on its own wavelet lobe, which the
    migrated image stretches along the trace; a jump between reflectors
    crosses the weak image between them, or layers of both polarities.
    """
    strength = 1.0 - images.cost.with_polarity(c.polarity).cost
    cells = images.cells(c.z_index)
    k = np.asarray(traces) - c.lo
    k = k[k > 0]
    if c.inferred is not None:
        # continued picks are not evidence either way
        k = k[~(c.inferred[k] | c.inferred[k - 1])]
    if k.size == 0:
        return float("nan")
    ref = float(np.median(strength[k + c.lo, cells[k]]))
    if ref <= 0:
        return 1.0
    weak = total = 0
    for kk in k:
        t = int(kk + c.lo)
        a, b = sorted((int(cells[kk - 1]), int(cells[kk])))
        run = np.maximum(strength[t - 1, a : b + 1], strength[t, a : b + 1])
        weak += int(np.sum(run < GAP_FRACTION * ref))
        total += run.size
    return float(weak / total) if total else float("nan")


def slope_face(images, c) -> Evidence:
    """Evidence of a slope face between a candidate's break and toe.

    Returns
    -------
    Evidence
        ``values``: ``width_m``, ``support`` (mean strength along the steps,
        vertical runs included), ``agreement`` (coherence-weighted share of
        unaliased face picks whose reflection dips with the profile),
        ``flat_share`` (the share whose reflection is flat while the profile
        dips), ``n_dip`` (picks with a readable dip), ``aliased_share``.
    """
    tr = face_traces(c)
    k = c.at(tr)
    zi = c.z_index[k]
    pdip = _path_dip(c)[k]
    sup = c.support[k]
    zc = np.clip(np.rint(zi).astype(np.int64), 0, images.n_z - 1)
    rdip = images.dip[tr, zc].astype(float)
    coh = images.coherence[tr, zc].astype(float)
    sgn = 1.0 if c.direction == "+" else -1.0
    steep = sgn * pdip > 0.5 * np.max(sgn * pdip) if pdip.size else pdip > 0
    aliased = np.abs(pdip) > ALIASED_PERIODS * images.period_samples
    readable = steep & ~aliased & (coh >= MIN_COHERENCE) & (np.abs(pdip) >= MIN_READABLE_DIP)
    w = coh[readable]
    if w.size:
        agree = np.abs(rdip[readable] - pdip[readable]) <= DIP_TOLERANCE * np.abs(pdip[readable])
        flat = np.abs(rdip[readable]) <= (1.0 - DIP_TOLERANCE) * np.abs(pdip[readable]) * 0.5
        agreement = float(np.sum(w * agree) / np.sum(w))
        flat_share = float(np.sum(w * flat) / np.sum(w))
    else:
        agreement = flat_share = float("nan")
    al = steep & aliased & (coh >= MIN_COHERENCE)
    flat_aliased = (float(np.sum(coh[al] * (np.abs(rdip[al]) <= (1.0 - DIP_TOLERANCE) * np.abs(pdip[al]) * 0.5))
                          / np.sum(coh[al])) if al.any() else float("nan"))
    gaps = _run_gaps(images, c, tr[steep]) if steep.any() else float("nan")
    inferred = float(np.mean(c.inferred[k])) if c.inferred is not None and k.size else 0.0
    vals = {
        "width_m": float(tr.size * images.dx_m),
        "inferred_share": inferred,
        "gap_share": gaps,
        "support": float(np.mean(sup)) if sup.size else 0.0,
        "support_steep": float(np.mean(sup[steep])) if steep.any() else 0.0,
        "agreement": agreement,
        "flat_share": flat_share,
        "n_dip": int(readable.sum()),
        "aliased_share": float(np.mean(aliased[steep])) if steep.any() else 0.0,
        "flat_aliased": flat_aliased,
        "n_aliased": int(al.sum()),
    }
    # a face continued where it is not imaged is weaker evidence of itself
    score = mean_score([ramp(vals["support"], 0.3, 0.8), 1.0 - gaps, agreement]) * (1.0 - 0.5 * inferred)
    return Evidence("slope_face", score, vals,
                    f"slope face over {vals['width_m']:.0f} m: support {vals['support']:.2f}, dip agreement "
                    f"{agreement:.2f} on {vals['n_dip']} picks, {100 * vals['aliased_share']:.0f}% aliased"
                    + (f", {100 * inferred:.0f}% not imaged (continued along its imaged dip)" if inferred else ""))
