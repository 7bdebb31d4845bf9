"""Truth records of synthetic lines: geometry, points, margins and clinoforms.

Shared by the grown lines (:mod:`clinometry.synth.lines`) and the analytic
settings (:mod:`clinometry.synth.analytic`), so that neither imports the
other (the scenario table dispatches to both).
"""

from __future__ import annotations

import numpy as np

from ..definitions import BASE_LENGTH_TRACES, SLOPE_MAX_QUANTILE
from .truth import SMOOTHING_M, TRAJECTORY_FLAT_DEG, profile_margin, trajectory

__all__ = ["TRUTH_SCHEMA_VERSION", "line_geometry", "margins_truth", "margin_record", "clinoform_rows",
           "truth_definitions"]

TRUTH_SCHEMA_VERSION = 1
#: first clinoform reported, as a fraction of the growth steps (project choice)
_CLINO_START_FRACTION = 0.2
#: number of clinoforms reported per margin (project choice)
_N_CLINOFORMS = 9


def line_geometry(n_traces, *, trace_spacing_m, azimuth_deg, origin_xy_m):
    """Trace coordinates of a straight line with an azimuth (deg from grid north).

    Examples
    --------
    >>> x, y = line_geometry(3, trace_spacing_m=10.0, azimuth_deg=90.0, origin_xy_m=(0.0, 0.0))
    >>> np.round(x, 6).tolist(), np.round(y, 6).tolist()
    ([0.0, 10.0, 20.0], [0.0, 0.0, 0.0])
    """
    d = np.arange(n_traces) * float(trace_spacing_m)
    a = np.deg2rad(azimuth_deg)
    return origin_xy_m[0] + d * np.sin(a), origin_xy_m[1] + d * np.cos(a)


def truth_definitions():
    """The ``definitions`` record of a truth JSON (how break, toe, slope and depth are defined)."""
    return {"smoothing_m": SMOOTHING_M, "base_length_traces": BASE_LENGTH_TRACES,
            "slope_max_quantile": SLOPE_MAX_QUANTILE,
            "trajectory_flat_tolerance_deg": TRAJECTORY_FLAT_DEG,
            "break": "max convex-up curvature between platform top and steepest point",
            "toe": "max concave-up curvature between steepest point and basin floor",
            "slope_max": ("80th percentile of least-squares dips over a horizontal base wholly between break "
                          "and toe, base = max(3 traces, the length over which one depth sample changes the "
                          "dip by a tenth); as clinometry.metrics.slope"),
            "depth_m": "below the z origin (time zero), positive down"}


def _point(i, depth_m, *, distance, x, y, to_z):
    return {"trace": int(i), "distance_m": float(distance[i]), "depth_m": float(depth_m),
            "x": float(x[i]), "y": float(y[i]), "z": float(to_z(depth_m))}


def margins_truth(depths, *, sides, distance, x, y, to_z, family, n_steps, depth_sample_m=None):
    """Truth of every margin of a grown section.

    Parameters
    ----------
    depths : ndarray, shape (n_steps + 1, n_trace), m
        Depth of each stratal surface below the z origin, positive down.
    sides : {"+", "-", "+-"}
        Directions in which the platform exported sediment.
    distance, x, y : ndarray, shape (n_trace,), m
    to_z : callable
        Depth (m) -> z in the section's units.
    family : str or None
    n_steps : int
    depth_sample_m : callable, optional
        Depth (m) -> one seismic sample in m there; sets the precision term
        of the max-slope base (:func:`clinometry.synth.truth.profile_margin`).

    Returns
    -------
    list of dict
        One entry per margin found (see the module docstring); empty when the
        final surface has no margin.
    """
    final = depths[-1]
    n = final.size
    if sides == "+-":
        top = np.flatnonzero(final <= final.min() + 2.0)
        centre = int(round(0.5 * (top[0] + top[-1])))
        segs = {"-": np.arange(centre, -1, -1), "+": np.arange(centre, n)}
    elif sides == "+":
        segs = {"+": np.arange(n)}
    else:
        segs = {"-": np.arange(n - 1, -1, -1)}
    out = []
    steps = np.unique(np.linspace(int(_CLINO_START_FRACTION * n_steps), n_steps,
                                  _N_CLINOFORMS).astype(int))
    pt = dict(distance=distance, x=x, y=y, to_z=to_z)
    for direction, idx in segs.items():
        rec = margin_record(depths, idx, direction=direction, family=family,
                            clinoform_rows=[(int(k), int(k)) for k in steps], pt=pt,
                            depth_sample_m=depth_sample_m)
        if rec is not None:
            out.append(_as_ramp(rec) if family == "ramp" else rec)
    return out


def _as_ramp(rec):
    """A ramp's truth: no distinct break or toe (its dip changes over kilometres), slope and relief over its span.

    The curvature extrema that the margin truth takes for break and toe give
    the span over which the ramp descends; a ramp has no distinct shelf
    break (Ahr 1973; Burchette & Wright 1992, from memory), so break and toe
    are null with a reason, as the picker reports them.
    """
    out = dict(rec)
    b, t = rec["break"], rec["toe"]
    lo, hi = sorted((b["trace"], t["trace"]))
    out["span"] = {"trace_from": int(lo), "trace_to": int(hi),
                   "distance_from_m": float(min(b["distance_m"], t["distance_m"])),
                   "distance_to_m": float(max(b["distance_m"], t["distance_m"])),
                   "definition": "between the curvature extrema of the youngest ramp profile"}
    out["break"] = None
    out["toe"] = None
    out["break_reason"] = "no distinct break: a ramp whose dip changes gradually over kilometres"
    out["toe_reason"] = "no distinct toe: the ramp flattens gradually into the basin"
    out["trajectory"] = None
    return out


def clinoform_rows(rows, *, start_fraction=_CLINO_START_FRACTION, n=_N_CLINOFORMS):
    """(stage, row) pairs of the clinoforms reported for a body whose stages are ``rows``.

    The same choice as for grown lines: from ``start_fraction`` of the stages
    to the youngest, at most ``n`` of them.

    Examples
    --------
    >>> clinoform_rows([3, 4, 5, 6, 7, 8])
    [(1, 4), (2, 5), (3, 6), (4, 7), (5, 8)]
    """
    rows = list(rows)
    last = len(rows) - 1
    steps = np.unique(np.linspace(int(start_fraction * last), last, n).astype(int))
    return [(int(k), int(rows[k])) for k in steps]


def margin_record(depths, idx, *, direction, family, clinoform_rows, pt, depth_sample_m=None, final_row=-1):
    """Truth of one margin profile: break, toe, slope, relief, clinoforms and trajectory.

    Parameters
    ----------
    depths : ndarray, shape (n_surf, n_trace), m
        Depth of each stratal surface, positive down.
    idx : ndarray of int
        Trace indices of the profile in basinward order.
    direction : {"+", "-"}
    family : str or None
    clinoform_rows : list of (int, int)
        ``(step, row)`` of each clinoform surface, oldest first.
    pt : dict
        ``distance``, ``x``, ``y`` (arrays by trace) and ``to_z`` (depth -> z).
    depth_sample_m : callable, optional
        As in :func:`margins_truth`.
    final_row : int
        Row of the margin's outer surface (default the youngest).

    Returns
    -------
    dict or None
        None when the profile has no margin (:func:`clinometry.synth.truth.profile_margin`).
    """
    distance = pt["distance"]
    final = depths[final_row]
    s = np.abs(distance[idx] - distance[idx[0]])
    m = profile_margin(s, final[idx], depth_sample_m=depth_sample_m)
    if m is None:
        return None
    ib, it = idx[m["break"]], idx[m["toe"]]
    clinos = []
    for k, row in clinoform_rows:
        mk = profile_margin(s, depths[row][idx], depth_sample_m=depth_sample_m)
        if mk is None:
            continue
        kb, kt = idx[mk["break"]], idx[mk["toe"]]
        clinos.append({"step": int(k),
                       "break": _point(kb, depths[row][kb], **pt),
                       "toe": _point(kt, depths[row][kt], **pt),
                       "relief_m": mk["relief_m"], "slope_max_deg": mk["slope_max_deg"],
                       "slope_mean_deg": mk["slope_mean_deg"]})
    traj = None
    if len(clinos) >= 3:
        bs = np.array([abs(c["break"]["distance_m"] - distance[idx[0]]) for c in clinos])
        bd = np.array([c["break"]["depth_m"] for c in clinos])
        traj = trajectory(bs, bd)
    top_idx = idx[: m["break"] + 1]
    return {
        "direction": direction,
        "family": family,
        "platform_top": {"depth_m": float(np.median(final[top_idx])),
                         "trace_from": int(min(top_idx[0], top_idx[-1])),
                         "trace_to": int(max(top_idx[0], top_idx[-1]))},
        "break": _point(ib, final[ib], **pt),
        "toe": _point(it, final[it], **pt),
        "steepest": _point(idx[m["steepest"]], final[idx[m["steepest"]]], **pt),
        "relief_m": m["relief_m"],
        "slope_max_deg": m["slope_max_deg"],
        "slope_mean_deg": m["slope_mean_deg"],
        "clinoforms": clinos,
        "trajectory": traj,
    }
