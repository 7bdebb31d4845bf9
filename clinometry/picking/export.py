"""Horizon export: one row per picked point, plain columns any interpretation software can import.

Columns (:data:`HORIZON_COLUMNS`): ``horizon_id, role, trace, distance_m, x, y,
z, depth_m, quality``.  ``z`` is in the section's own units (ms TWT or m),
``depth_m`` below the z origin of the section (time zero, delay included),
positive down, converted with the run's velocity model.
"""

from __future__ import annotations

import numpy as np

from ..section import check_section
from ..depth import horizon_to_depth
from .section_images import velocity_model

__all__ = ["HORIZON_COLUMNS", "horizon_rows"]

#: column order of ``<stem>.horizons.csv``
HORIZON_COLUMNS = ("horizon_id", "role", "trace", "distance_m", "x", "y", "z", "depth_m", "quality")


def horizon_rows(picks, section, velocity) -> list[dict]:
    """Rows for ``<stem>.horizons.csv``, one per horizon point.

    Parameters
    ----------
    picks : Picks
    section : xarray.DataArray, dims ("trace", "z")
        The section the picks were made on (for distance, x, y).
    velocity : velocity model, float (m/s) or None
        For ``depth_m`` (None: identity for depth sections, the package
        default velocity for TWT sections).

    Returns
    -------
    list of dict
        Keys :data:`HORIZON_COLUMNS`; rounded to 0.001 of their unit.

    Examples
    --------
    >>> from clinometry.section import make_section
    >>> from clinometry.picking.picks import Horizon, Picks
    >>> s = make_section(np.zeros((3, 4)), z=[0, 4, 8, 12], trace_spacing_m=10.0)
    >>> p = Picks(horizons=(Horizon(0, "reflector", [0, 2], [4.0, 8.0], [1.0, 0.5]),))
    >>> r = horizon_rows(p, s, 2000.0)
    >>> [(x["trace"], x["distance_m"], x["z"], x["depth_m"]) for x in r]
    [(0, 0.0, 4.0, 4.0), (2, 20.0, 8.0, 8.0)]
    """
    check_section(section)
    dist = section["distance"].values
    xs = section["x"].values if "x" in section.coords else dist
    ys = section["y"].values if "y" in section.coords else np.zeros_like(dist)
    rows = []
    for h in picks.horizons:
        if len(h) == 0:
            continue
        if section.attrs.get("domain") == "depth":
            depth = np.asarray(h.z, dtype=float)
        else:
            depth = horizon_to_depth(section, h.trace, h.z, velocity_model(velocity))
        for t, z, d, q in zip(h.trace.tolist(), h.z.tolist(), np.asarray(depth).tolist(), h.quality.tolist()):
            rows.append(
                {
                    "horizon_id": int(h.id),
                    "role": h.role,
                    "trace": int(t),
                    "distance_m": round(float(dist[t]), 3),
                    "x": round(float(xs[t]), 3),
                    "y": round(float(ys[t]), 3),
                    "z": round(float(z), 3),
                    "depth_m": round(float(d), 3),
                    "quality": round(float(q), 3),
                }
            )
    return rows
