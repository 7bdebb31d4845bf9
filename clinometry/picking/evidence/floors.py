"""Evidence of a toe and a basin floor: a flatter surface basinward of the slope."""

from __future__ import annotations

import numpy as np

from ._regions import floor_traces
from .record import NEUTRAL, Evidence, mean_score, ramp
from .tops import MIN_STRENGTH, profile_gradient_deg

__all__ = ["basin_floor"]


def basin_floor(images, c) -> Evidence:
    """Evidence of a basin floor basinward of a candidate's toe.

    Returns
    -------
    Evidence
        ``values``: ``length_m``, ``strength``, ``continuity``,
        ``gradient_deg`` (basinward; negative where the floor rises).
    """
    tr = floor_traces(c, images)
    if tr.size < 3:
        return Evidence("basin_floor", NEUTRAL, {"length_m": float(tr.size * images.dx_m)},
                        "no basin floor basinward of the toe on the line")
    q = c.quality[c.at(tr)]
    vals = {
        "length_m": float(tr.size * images.dx_m),
        "strength": float(np.mean(q)),
        "continuity": float(np.mean(q >= MIN_STRENGTH)),
        "gradient_deg": profile_gradient_deg(c, tr, images),
    }
    slope = max(c.bends.slope_max_deg, 1e-3)
    score = mean_score([ramp(vals["strength"], 0.3, 0.8), vals["continuity"],
                        1.0 - ramp(abs(vals["gradient_deg"]), 0.25 * slope, slope)])
    return Evidence("basin_floor", score, vals,
                    f"basin floor over {vals['length_m']:.0f} m: strength {vals['strength']:.2f}, "
                    f"gradient {vals['gradient_deg']:.2f} deg")
