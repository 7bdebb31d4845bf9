"""Evidence of a platform top: a flat, continuous, strong reflection of one polarity landward of the break.

The top of a carbonate platform is its strongest and most continuous
reflection: the impedance contrast between the platform and the fill or
drape above it (common practice, no source).  Along it the pick stays on
one wavelet lobe, so its polarity does not change, and it is flat compared
with the slope (topset gradients of fractions of a degree; Schlager 2005).
Noise, in contrast, gives picks whose polarity flips at random and whose
strength barely stands above the background.

References
----------
.. [1] Schlager, W. (2005). Carbonate Sedimentology and Sequence
   Stratigraphy. SEPM Concepts in Sedimentology and Paleontology 8.
   (from memory)
"""

from __future__ import annotations

import numpy as np

from ._regions import top_traces
from .record import Evidence, mean_score, ramp

__all__ = ["platform_top", "MIN_STRENGTH", "polarity_consistency", "profile_gradient_deg"]

#: a pick counts as on a reflection when its strength above the background
#: reaches this (0..1 between the image's median and its 99.5th percentile;
#: our choice, no source)
MIN_STRENGTH = 0.2


def polarity_consistency(images, traces, z_index) -> float:
    """Share of picks with the majority sign (0.5 .. 1)."""
    if len(traces) == 0:
        return float("nan")
    zi = np.clip(np.rint(z_index).astype(np.int64), 0, images.n_z - 1)
    pos = images.positive[np.asarray(traces), zi]
    f = float(np.mean(pos))
    return max(f, 1.0 - f)


def profile_gradient_deg(c, traces, images) -> float:
    """Least-squares basinward depth gradient (deg) of a candidate's profile over some traces."""
    if len(traces) < 3:
        return float("nan")
    x = images.distance_m[traces]
    d = c.depth_m[c.at(traces)]
    g = float(np.polyfit(x - x.mean(), d, 1)[0])
    return float(np.degrees(np.arctan(g if c.direction == "+" else -g)))


def platform_top(images, c) -> Evidence:
    """Evidence of a platform top landward of a candidate's break.

    Parameters
    ----------
    images : SectionImages
    c : Candidate

    Returns
    -------
    Evidence
        ``values``: ``length_m``, ``strength`` (mean 0..1), ``continuity``
        (share of picks on a reflection), ``coherence`` (mean structure
        tensor coherence), ``polarity`` (share of the majority sign),
        ``gradient_deg`` (basinward).
    """
    tr = top_traces(c, images)
    if tr.size < 3:
        return Evidence("platform_top", 0.0, {"length_m": float(tr.size * images.dx_m)},
                        "no platform top landward of the break on the line")
    k = c.at(tr)
    q = c.quality[k]
    zi = c.z_index[k]
    coh = images.coherence[tr, np.clip(np.rint(zi).astype(np.int64), 0, images.n_z - 1)]
    vals = {
        "length_m": float(tr.size * images.dx_m),
        "strength": float(np.mean(q)),
        "continuity": float(np.mean(q >= MIN_STRENGTH)),
        "coherence": float(np.mean(coh)),
        "polarity": polarity_consistency(images, tr, zi),
        "gradient_deg": profile_gradient_deg(c, tr, images),
    }
    score = mean_score([
        ramp(vals["strength"], 0.4, 0.9),
        vals["continuity"],
        ramp(vals["coherence"], 0.4, 0.9),
        ramp(vals["polarity"], 0.7, 1.0),
        ramp(vals["length_m"], 0.0, 4.0 * images.wavelength_m),
    ])
    return Evidence("platform_top", score, vals,
                    f"platform top over {vals['length_m']:.0f} m: strength {vals['strength']:.2f}, "
                    f"{100 * vals['continuity']:.0f}% on a reflection, polarity {100 * vals['polarity']:.0f}% one sign, "
                    f"gradient {vals['gradient_deg']:.2f} deg")
