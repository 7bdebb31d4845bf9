"""Evidence of a change of seismic character across the slope.

Platform interior and basin fill are different rocks: the layering on the
platform side of a slope does not continue into the basin at the same
level (common practice, no source).  Where a profile only steps between
two flat reflectors of a layered succession, or crosses a fold, the
layering continues across the step.  The envelope of a few traces landward
of the break is correlated with that of a few traces basinward of the toe
over the depth range of the slope: a high correlation says the layering
continues across.
"""

from __future__ import annotations

import numpy as np

from ._regions import break_trace, toe_trace
from .record import NEUTRAL, Evidence, ramp

__all__ = ["layering_contrast"]


def _mean_trace(images, traces, z0, z1):
    traces = traces[(traces >= 0) & (traces < images.n_trace) & ~images.dead[np.clip(traces, 0, images.n_trace - 1)]]
    if traces.size == 0:
        return None
    return np.mean(images.envelope[traces, z0:z1].astype(float), axis=0)


def _corr(a, b):
    a = a - a.mean()
    b = b - b.mean()
    den = float(np.sqrt(np.sum(a * a) * np.sum(b * b)))
    return float(np.sum(a * b) / den) if den > 0 else float("nan")


def layering_contrast(images, c) -> Evidence:
    """Correlation of the layering landward of the break with that basinward of the toe, at the same depths.

    Returns
    -------
    Evidence
        ``values``: ``same_level`` (correlation at the same z), ``along_surface``
        (correlation after shifting by the relief of the profile: high for
        drape and folds, where everything bends together).
    """
    b, t = break_trace(c), toe_trace(c)
    k = max(2, int(round(images.wavelength_m / images.dx_m)))
    sgn = 1 if c.direction == "+" else -1
    land = np.arange(b - sgn * 3 * k, b - sgn * k, sgn)
    basin = np.arange(t + sgn * k, t + sgn * 3 * k, sgn)
    zb = float(c.z_index[c.at(b)])
    zt = float(c.z_index[c.at(t)])
    p = images.period_samples
    z0, z1 = int(max(0, zb - p)), int(min(images.n_z, zt + p))
    if z1 - z0 < 4:
        return Evidence("character", NEUTRAL, {}, "slope too short to compare the layering across it")
    a = _mean_trace(images, land, z0, z1)
    bb = _mean_trace(images, basin, z0, z1)
    if a is None or bb is None:
        return Evidence("character", NEUTRAL, {}, "no live traces on one side of the slope")
    same = _corr(a, bb)
    shift = int(round(zt - zb))
    w0, w1 = int(max(0, zb - 2 * p)), int(min(images.n_z, zb + 2 * p))
    v0, v1 = w0 + shift, w1 + shift
    along = float("nan")
    if v0 >= 0 and v1 <= images.n_z and w1 - w0 >= 4:
        along = _corr(_mean_trace(images, land, w0, w1), _mean_trace(images, basin, v0, v1))
    vals = {"same_level": same, "along_surface": along}
    score = 1.0 - ramp(same, 0.0, 1.0) if same == same else NEUTRAL
    return Evidence("character", score, vals,
                    f"layering correlation across the slope {same:.2f} at the same level, {along:.2f} along the surface")
