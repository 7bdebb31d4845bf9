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

__all__ = ["layering_contrast", "LAYER_PERIODS"]

#: the layering above and below a surface is compared from this many to this
#: many dominant periods off it (beyond its own wavelet; our choice, no source)
LAYER_PERIODS = (0.75, 3.0)


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


def _shifted_corr(images, land, basin, z_land, z_basin, lo_p, hi_p):
    """Correlation of the mean envelopes of two trace sets in windows ``lo_p..hi_p`` periods off two depths."""
    p = images.period_samples
    n = int(round((hi_p - lo_p) * p))
    a0, b0 = int(round(z_land + lo_p * p)), int(round(z_basin + lo_p * p))
    a1, b1 = a0 + n, b0 + n
    if min(a0, b0) < 0 or max(a1, b1) > images.n_z or a1 - a0 < 4:
        return float("nan")
    x = _mean_trace(images, land, a0, a1)
    y = _mean_trace(images, basin, b0, b1)
    if x is None or y is None:
        return float("nan")
    return _corr(x, y)


def layering_contrast(images, c) -> Evidence:
    """Whether the layering continues across the slope: at the same level, and above and below the surface.

    Returns
    -------
    Evidence
        ``values``: ``same_level`` (correlation of the envelope landward of
        the break and basinward of the toe over the depths of the slope: high
        where flat layering continues across a step), ``above`` and
        ``below`` (correlation of the layering :data:`LAYER_PERIODS` above /
        below the surface, landward at the break's depth against basinward at
        the toe's: high for both where every layer bends with the surface, as
        in a fold, over a fault or in drape; a margin has platform interior
        against basin substrate below, drape on the platform against onlapping
        fill above).  The score is one minus ``same_level``.
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
    lo_p, hi_p = LAYER_PERIODS
    above = _shifted_corr(images, land, basin, zb, zt, -hi_p, -lo_p)
    below = _shifted_corr(images, land, basin, zb, zt, lo_p, hi_p)
    vals = {"same_level": same, "above": above, "below": below}
    score = 1.0 - ramp(same, 0.0, 1.0) if same == same else NEUTRAL
    return Evidence("character", score, vals,
                    f"layering correlation across the slope {same:.2f} at the same level; along the surface "
                    f"{above:.2f} above it and {below:.2f} below it")
