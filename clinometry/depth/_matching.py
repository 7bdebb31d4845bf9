"""Matching velocity traces to seismic traces (private helper of section_velocity).

Each seismic trace gets up to four velocity traces and weights:

* ``lateral="exact"``: the velocity trace with the same (inline, crossline),
  else the same CDP, else the same position when the counts agree.  Nothing
  is interpolated; a trace without its own velocity trace is an error.
* ``lateral="linear"``: as exact where a velocity trace exists; elsewhere,
  linear interpolation between the two nearest velocity CDPs (2D) or
  bilinear interpolation between the four surrounding velocity bins of a
  regular inline/crossline grid (3D).  This is how sparse velocity control
  is usually spread between analysis locations (common practice, no
  source).  Traces outside the velocity control are still an error: the
  model never extrapolates sideways.
"""

from __future__ import annotations

import numpy as np

from ..errors import VelocityError

LATERAL_MODES = ("exact", "linear")


def _coord(sec, name):
    return np.asarray(sec[name].values) if name in sec.coords else None


def _bracket(values, v):
    """Neighbours (lo, hi) in sorted unique ``values`` around ``v`` and the weight of hi."""
    j = int(np.searchsorted(values, v))
    if j < values.size and values[j] == v:
        return values[j], values[j], 0.0
    if j == 0 or j == values.size:
        return None
    lo, hi = values[j - 1], values[j]
    return lo, hi, float((v - lo) / (hi - lo))


def match_traces(vs, section, vname, sname, *, lateral="exact"):
    """Velocity rows and weights per seismic trace.

    Returns
    -------
    index : ndarray, shape (n_trace, 4), int
    weight : ndarray, shape (n_trace, 4), float (rows sum to 1)
    how : str
        ``"inline/crossline"``, ``"cdp"`` or ``"trace"``, with
        ``", interpolated"`` appended when any trace was interpolated.
    """
    if lateral not in LATERAL_MODES:
        raise VelocityError(f"{vname}: lateral must be one of {LATERAL_MODES}, got {lateral!r}")
    n_sec = section.sizes["trace"]
    vil, vxl, vcdp = _coord(vs, "inline"), _coord(vs, "crossline"), _coord(vs, "cdp")
    sil, sxl, scdp = _coord(section, "inline"), _coord(section, "crossline"), _coord(section, "cdp")
    index = np.zeros((n_sec, 4), dtype=np.int64)
    weight = np.zeros((n_sec, 4))
    weight[:, 0] = 1.0
    interpolated = False

    if vil is not None and vxl is not None and sil is not None and sxl is not None:
        keys = list(zip(vil.tolist(), vxl.tolist()))
        if len(set(keys)) == len(keys):
            lookup = {k: i for i, k in enumerate(keys)}
            ils, xls = np.unique(vil), np.unique(vxl)
            for j, k in enumerate(zip(sil.tolist(), sxl.tolist())):
                if k in lookup:
                    index[j] = lookup[k]
                    continue
                bi = _bracket(ils, k[0]) if lateral == "linear" else None
                bx = _bracket(xls, k[1]) if lateral == "linear" else None
                corners = None
                if bi is not None and bx is not None:
                    corners = [(bi[0], bx[0]), (bi[0], bx[1]), (bi[1], bx[0]), (bi[1], bx[1])]
                absent = [] if corners is None else [c for c in corners if c not in lookup]
                if corners is None or absent:
                    hint = (
                        "give a velocity volume that covers the line"
                        if lateral == "linear"
                        else "give a velocity volume that covers the line, or lateral='linear' to interpolate "
                        "inside a coarser velocity grid"
                    )
                    missing = f" (velocity bin inline {absent[0][0]}, crossline {absent[0][1]} is missing)" if absent else ""
                    raise VelocityError(
                        f"{vname} does not match {sname}: trace {j} (inline {k[0]}, crossline {k[1]}) has no "
                        f"velocity trace{missing}; the velocity covers inlines {vil.min()}-{vil.max()}, "
                        f"crosslines {vxl.min()}-{vxl.max()}; {hint}"
                    )
                wi, wx = bi[2], bx[2]
                index[j] = [lookup[c] for c in corners]
                weight[j] = [(1 - wi) * (1 - wx), (1 - wi) * wx, wi * (1 - wx), wi * wx]
                interpolated = True
            return index, weight, "inline/crossline" + (", interpolated" if interpolated else "")

    if vcdp is not None and scdp is not None and np.unique(vcdp).size == vcdp.size:
        lookup = {k: i for i, k in enumerate(vcdp.tolist())}
        cdps = np.sort(vcdp)
        for j, k in enumerate(scdp.tolist()):
            if k in lookup:
                index[j] = lookup[k]
                continue
            b = _bracket(cdps, k) if lateral == "linear" else None
            if b is None:
                hint = "" if lateral == "linear" else ", or lateral='linear' to interpolate between velocity CDPs"
                raise VelocityError(
                    f"{vname} does not match {sname}: CDP {k} (trace {j}) has no velocity trace; the "
                    f"velocity has CDPs {vcdp.min()}-{vcdp.max()}; give the velocity section of this line{hint}"
                )
            index[j] = [lookup[b[0]], lookup[b[1]], lookup[b[0]], lookup[b[1]]]
            weight[j] = [1 - b[2], b[2], 0.0, 0.0]
            interpolated = True
        return index, weight, "cdp" + (", interpolated" if interpolated else "")

    n_vel = vs.sizes["trace"]
    if n_vel != n_sec:
        raise VelocityError(
            f"{vname} does not match {sname}: {n_vel} velocity traces for {n_sec} seismic traces and no "
            "CDP or inline/crossline numbers to match them by; give a velocity section of the same line"
        )
    index[:, 0] = np.arange(n_sec)
    return index, weight, "trace"


def lines_to_read(available, wanted, *, lateral):
    """Velocity line numbers needed for seismic line numbers ``wanted``.

    Exact lines where the volume has them; with ``lateral="linear"`` the
    two bracketing lines otherwise.  Lines the volume cannot supply are left
    out (matching then names the trace that lacks a velocity).
    """
    available = np.asarray(sorted(available))
    need = set()
    for w in np.unique(wanted).tolist():
        if w in available:
            need.add(int(w))
        elif lateral == "linear":
            b = _bracket(available, w)
            if b is not None:
                need.update((int(b[0]), int(b[1])))
    return sorted(need)
