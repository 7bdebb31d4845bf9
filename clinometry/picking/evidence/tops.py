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

__all__ = ["platform_top", "MIN_STRENGTH", "polarity_consistency", "lateral_correlation", "profile_gradient_deg"]

#: the correlation window reaches at least this many samples either side of
#: the pick (a window of a few samples correlates by chance; our choice)
MIN_HALF_WINDOW = 3
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


def lateral_correlation(images, traces, z_index) -> float:
    """Mean correlation of neighbouring traces' amplitudes in a window of one period about the picks.

    The windows are aligned on the picks, so the reflection's dip is taken
    out; a laterally continuous reflection gives values near 1 (its
    waveform repeats from trace to trace), noise gives low values.
    """
    tr = np.asarray(traces)
    if tr.size < 2:
        return float("nan")
    half = max(MIN_HALF_WINDOW, int(round(0.5 * images.period_samples)))
    offs = np.arange(-half, half + 1)
    zc = np.clip(np.rint(np.asarray(z_index)).astype(np.int64)[:, None] + offs[None, :], 0, images.n_z - 1)
    w = np.asarray(images.amplitude[tr[:, None], zc], dtype=float)
    w = w - w.mean(axis=1, keepdims=True)
    a, b = w[:-1], w[1:]
    den = np.sqrt(np.sum(a * a, axis=1) * np.sum(b * b, axis=1))
    ok = (den > 0) & ~images.dead[tr[:-1]] & ~images.dead[tr[1:]] & (np.diff(tr) == 1)
    if not ok.any():
        return float("nan")
    return float(np.mean(np.sum(a * b, axis=1)[ok] / den[ok]))


def dominance(images, traces, z_index) -> float:
    """Envelope along the picks over the strongest envelope of the layers one to four periods above and below.

    The top of a carbonate platform is the strongest reflection of its
    neighbourhood (the largest impedance contrast of the succession,
    common practice, no source); a reflector of a layered clastic
    succession has neighbours about as strong.
    """
    tr = np.asarray(traces)
    if tr.size == 0:
        return float("nan")
    p = images.period_samples
    zi = np.asarray(z_index, dtype=float)
    own = np.asarray(images.envelope[tr, np.clip(np.rint(zi).astype(np.int64), 0, images.n_z - 1)], dtype=float)
    offs = np.arange(int(round(p)), int(round(4 * p)) + 1)
    best = np.zeros(tr.size)
    for sgn in (-1, 1):
        zz = np.clip(np.rint(zi[:, None] + sgn * offs[None, :]).astype(np.int64), 0, images.n_z - 1)
        best = np.maximum(best, np.max(images.envelope[tr[:, None], zz], axis=1))
    den = float(np.median(best))
    return float(np.median(own)) / den if den > 0 else float("nan")


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
        "lateral_correlation": lateral_correlation(images, tr, zi),
        "dominance": dominance(images, tr, zi),
        "gradient_deg": profile_gradient_deg(c, tr, images),
    }
    score = mean_score([
        ramp(vals["strength"], 0.4, 0.9),
        vals["continuity"],
        ramp(vals["coherence"], 0.4, 0.9),
        ramp(vals["lateral_correlation"], 0.5, 0.9),
        ramp(vals["length_m"], 0.0, 4.0 * images.wavelength_m),
    ])
    return Evidence("platform_top", score, vals,
                    f"platform top over {vals['length_m']:.0f} m: strength {vals['strength']:.2f}, "
                    f"{100 * vals['continuity']:.0f}% on a reflection, polarity {100 * vals['polarity']:.0f}% one sign, "
                    f"gradient {vals['gradient_deg']:.2f} deg")
