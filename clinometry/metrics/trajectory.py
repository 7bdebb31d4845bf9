"""Shelf-break trajectory from the successive clinoform breaks.

The path of the shelf break through time records how the margin grew:
rising while it built basinward (ascending), building out at a constant
level (flat), or stepping down (descending).  Helland-Hansen & Martinsen
(1996) introduced shoreline/shelf-edge trajectory analysis and its classes
by the sign of the trajectory angle; we measure it from the breaks of the
clinoforms the picker found, oldest to youngest:

* progradation_m = basinward distance of the youngest break minus that of
  the oldest (negative: the break stepped back landward, ``backstepping``);
* aggradation_m = depth of the oldest break minus depth of the youngest
  (positive when the break rose: depth is positive down);
* angle_deg: the elevation angle of the path above the horizontal, positive
  when rising: ``atan`` of the least-squares slope of break elevation
  (= -depth) against distance in the sense of net movement (basinward, or
  landward when the break backstepped).  With two breaks this is
  ``atan2(aggradation_m, |progradation_m|)``; with more, the fit keeps one
  odd break from deciding the class;
* net_angle_deg: ``atan2(aggradation_m, |progradation_m|)`` from the oldest
  and youngest breaks alone;
* ratio = aggradation_m / progradation_m (A/P);
* step_angles_deg: the same angle for each successive pair of breaks.

The class is ``flat`` when ``|angle_deg| <= flat_deg`` and otherwise
``ascending`` or ``descending`` by its sign.  The band
:data:`TRAJECTORY_FLAT_DEG` is chosen here, not taken from the paper (which
classes by sign): 0.1 deg is about one depth sample (~5 m) over 3 km of
progradation, the smallest rise a seismic line of usual resolution can show,
so a smaller angle has no resolvable sign.  It is part of the threshold table
of :mod:`clinometry.classify.thresholds` and can be overridden there.
"""

from __future__ import annotations

import logging

import numpy as np

__all__ = ["TRAJECTORY_FLAT_DEG", "trajectory_from_breaks", "trajectory_metrics"]

logger = logging.getLogger(__name__)

#: half-width of the "flat" trajectory band, degrees (chosen here: ~one depth
#: sample over 3 km of progradation; classes by sign after Helland-Hansen &
#: Martinsen 1996, J. Sed. Res. 66: 670-688, from memory)
TRAJECTORY_FLAT_DEG = 0.1


def _angle(aggradation, progradation):
    return float(np.degrees(np.arctan2(aggradation, abs(progradation))))


def trajectory_from_breaks(basinward_m, depth_m, *, flat_deg: float = TRAJECTORY_FLAT_DEG) -> dict:
    """Trajectory angle, distances and class from break positions, oldest first.

    Parameters
    ----------
    basinward_m : array_like, shape (n,), m
        Basinward distance of each break (n >= 2).
    depth_m : array_like, shape (n,), m
        Depth of each break, positive down.
    flat_deg : float, degrees
        Half-width of the flat band.

    Returns
    -------
    dict
        ``angle_deg`` (least-squares), ``net_angle_deg``, ``class``,
        ``progradation_m``, ``aggradation_m``,
        ``ratio`` (None when progradation is 0), ``step_angles_deg``,
        ``n_breaks``, ``backstepping``, ``flat_band_deg``.

    References
    ----------
    .. [1] Helland-Hansen, W. & Martinsen, O. J. (1996). Shoreline trajectory
       and sequences: description of variable depositional-dip scenarios.
       Journal of Sedimentary Research 66: 670-688.

    Notes
    -----
    The least-squares line through the breaks is the usual way to give one
    angle to a set of trajectory points (common practice, no source).

    Examples
    --------
    >>> t = trajectory_from_breaks([0.0, 1000.0], [300.0, 282.5])
    >>> round(t["angle_deg"], 3), t["class"]
    (1.003, 'ascending')
    """
    b = np.asarray(basinward_m, dtype=float)
    d = np.asarray(depth_m, dtype=float)
    if b.size < 2 or b.shape != d.shape:
        raise ValueError(f"need two or more breaks of matching shape, got {b.shape} and {d.shape}")
    prog = float(b[-1] - b[0])
    aggr = float(d[0] - d[-1])
    net = _angle(aggr, prog)
    sense = -1.0 if prog < 0 else 1.0
    if b.size > 2 and np.ptp(b) > 0:
        angle = float(np.degrees(np.arctan(np.polyfit(sense * b, -d, 1)[0])))
    else:
        angle = net
    cls = "flat" if abs(angle) <= flat_deg else ("ascending" if angle > 0 else "descending")
    steps = [_angle(d[i] - d[i + 1], b[i + 1] - b[i]) for i in range(b.size - 1)]
    return {
        "angle_deg": angle,
        "net_angle_deg": net,
        "class": cls,
        "progradation_m": prog,
        "aggradation_m": aggr,
        "ratio": aggr / prog if prog != 0 else None,
        "step_angles_deg": steps,
        "n_breaks": int(b.size),
        "backstepping": bool(prog < 0),
        "flat_band_deg": float(flat_deg),
    }


def trajectory_metrics(geometry, *, flat_deg: float = TRAJECTORY_FLAT_DEG) -> dict:
    """Shelf-break trajectory (angle, progradation, aggradation, class) after Helland-Hansen & Martinsen (1996).

    Parameters
    ----------
    geometry : MarginGeometry
        Its clinoforms, oldest to youngest; those without a picked break are
        skipped.
    flat_deg : float, degrees
        Half-width of the flat band (:data:`TRAJECTORY_FLAT_DEG`).

    Returns
    -------
    dict
        ``{"trajectory": {...}}`` (see :func:`trajectory_from_breaks`, plus
        ``breaks``: contract points of the breaks used), or
        ``{"trajectory": None, "missing": {"trajectory": reason}}``.

    References
    ----------
    .. [1] Helland-Hansen, W. & Martinsen, O. J. (1996). Journal of
       Sedimentary Research 66: 670-688.
    """
    brks = [c.shelf_break for c in geometry.clinoforms if c.shelf_break is not None]
    if len(brks) < 2:
        n = len(geometry.clinoforms)
        return {"trajectory": None, "missing": {"trajectory": (
            f"{len(brks)} clinoform break(s) picked out of {n} clinoform(s); a trajectory needs 2 or more")}}
    t = trajectory_from_breaks([p["basinward_m"] for p in brks], [p["depth_m"] for p in brks], flat_deg=flat_deg)
    t["breaks"] = [geometry.pick_point(p) for p in brks]
    # the smallest angle whose sign one depth sample can resolve over this progradation
    if t["progradation_m"] != 0:
        t["resolvable_angle_deg"] = float(np.degrees(np.arctan(geometry.depth_sample_m / abs(t["progradation_m"]))))
    return {"trajectory": t}
