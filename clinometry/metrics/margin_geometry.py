"""Depth-converted geometry of one margin: what every metric plugin measures on.

The picker reports horizons and break/toe positions as trace index and ``z``
in the section's own units (ms two-way time or m depth).  Angles and lengths
only mean something in depth, so this module converts each surface of a
margin once, with the run's velocity model, and orients it so that
*basinward distance* increases towards the basin whatever the direction of
the line.  Every metric plugin then works on the same
:class:`MarginGeometry` and never touches the velocity model or the line
direction itself -- one conversion, one orientation, no chance for two
plugins to disagree about either.

Conventions
-----------
``basinward_m``
    Horizontal distance along the line, measured from the most landward
    point of the margin profile and increasing basinward (so a ``"-"``
    margin, whose basin lies towards decreasing trace index, is read from
    its last trace to its first).
``depth_m``
    Depth below the z origin of the section (time zero, delay included),
    positive down, as in the results contract.

Depth conversion is :func:`clinometry.depth.to_depth` with the run's
velocity model; depth-domain sections are taken as they are and need
no velocity.
"""

from __future__ import annotations

import logging
from dataclasses import dataclass

import numpy as np

from ..depth import to_depth
from ..errors import GeometryError
from ..section import check_section, section_name
from .metric_records import POINT_KEYS

__all__ = ["SurfaceGeometry", "MarginGeometry", "margin_geometry"]

logger = logging.getLogger(__name__)


@dataclass(frozen=True, eq=False)
class SurfaceGeometry:
    """One depth-converted surface (margin profile, platform top or clinoform).

    Attributes
    ----------
    horizon_id : int
    trace : numpy.ndarray of int, shape (n,)
        Trace indices, ordered basinward.
    basinward_m : numpy.ndarray of float, shape (n,), m
        Increasing basinward distance (see module docstring).
    depth_m : numpy.ndarray of float, shape (n,), m
        Depth, positive down.
    z : numpy.ndarray of float, shape (n,)
        Position in the section's z units (ms TWT or m).
    dz_depth_m : numpy.ndarray of float, shape (n,), m per z unit
        Local derivative of depth with respect to ``z`` (1 for depth
        sections; v/2000 for TWT in ms), used to turn a pick error in
        samples into metres.
    shelf_break, toe : dict or None
        ``{"trace", "basinward_m", "depth_m", "z", "quality"}`` of the picked
        break / toe on this surface, None when not picked.
    break_reason, toe_reason : str
        Why a pick is missing.
    source : str
        How the picker found the surface (``ClinoformPicks.source``:
        ``"surface"`` or ``"dip_field"``).
    """

    horizon_id: int
    trace: np.ndarray
    basinward_m: np.ndarray
    depth_m: np.ndarray
    z: np.ndarray
    dz_depth_m: np.ndarray
    shelf_break: dict | None = None
    toe: dict | None = None
    break_reason: str = ""
    toe_reason: str = ""
    source: str = "surface"

    def __len__(self) -> int:
        return int(self.trace.size)

    def depth_at(self, basinward_m) -> np.ndarray:
        """Depth at basinward positions (linear interpolation, NaN outside)."""
        return np.interp(np.asarray(basinward_m, dtype=float), self.basinward_m, self.depth_m,
                         left=np.nan, right=np.nan)


@dataclass(frozen=True, eq=False)
class MarginGeometry:
    """The depth-converted, basinward-oriented geometry of one margin.

    Attributes
    ----------
    direction : {"+", "-"}
        Basinward direction along the trace index.
    profile : SurfaceGeometry
        The margin profile (platform top, foreset, toe onto the basin floor).
    platform_top : SurfaceGeometry or None
        The platform-top horizon when the picker gave a separate one,
        else None (the profile landward of the break is the platform top).
    clinoforms : tuple of SurfaceGeometry
        Oldest to youngest, as picked.
    trace_spacing_m : float, m
        Median horizontal distance between neighbouring traces.
    depth_sample_m : float, m
        One z sample converted to metres at the shelf break (or the middle
        of the profile when no break was picked): the vertical pick
        resolution.
    domain : {"twt", "depth"}
    sample_interval : float
        Section sample interval in z units.
    name : str
        Section name for messages.
    confidence : float
        The picker's confidence that this is a margin (0..1).
    """

    direction: str
    profile: SurfaceGeometry
    platform_top: SurfaceGeometry | None
    clinoforms: tuple
    trace_spacing_m: float
    depth_sample_m: float
    domain: str
    sample_interval: float
    name: str
    confidence: float
    _distance: np.ndarray
    _x: np.ndarray
    _y: np.ndarray
    _origin_m: float
    _sign: float

    def distance_of(self, basinward_m) -> np.ndarray:
        """Along-line distance (m from the first trace) of basinward positions."""
        return self._origin_m + self._sign * np.asarray(basinward_m, dtype=float)

    def point(self, trace: int, z: float, depth_m: float) -> dict:
        """A results-contract point ``{"trace", "distance_m", "depth_m", "x", "y", "z"}``."""
        t = int(trace)
        out = {
            "trace": t,
            "distance_m": float(self._distance[t]),
            "depth_m": float(depth_m),
            "x": float(self._x[t]),
            "y": float(self._y[t]),
            "z": float(z),
        }
        return {k: out[k] for k in POINT_KEYS}

    def pick_point(self, pick: dict | None) -> dict | None:
        """Contract point of a surface's break/toe record (None stays None)."""
        if pick is None:
            return None
        return self.point(pick["trace"], pick["z"], pick["depth_m"])


def _dz_depth(section, velocity, trace, z) -> np.ndarray:
    """d(depth)/d(z) at each position, by a centred difference of half a sample."""
    if section.attrs["domain"] == "depth":
        return np.ones(np.shape(z))
    h = 0.5 * float(section.attrs["sample_interval"])
    z = np.asarray(z, dtype=np.float64)
    lo = to_depth(section, trace, np.maximum(z - h, 0.0), velocity)
    hi = to_depth(section, trace, z + h, velocity)
    return (hi - lo) / ((z + h) - np.maximum(z - h, 0.0))


def _surface(section, velocity, horizon, sign, origin, distance, brk, toe, break_reason, toe_reason, source="surface"):
    order = np.argsort(sign * distance[horizon.trace], kind="stable")
    trace = horizon.trace[order]
    z = horizon.z[order]
    keep = np.isfinite(z)
    trace, z = trace[keep], z[keep]
    depth = to_depth(section, trace, z, velocity)
    dzd = _dz_depth(section, velocity, trace, z)
    b = sign * (distance[trace] - origin) + 0.0  # + 0.0 turns -0.0 into 0.0

    def _pick(p):
        if p is None:
            return None
        d = float(to_depth(section, [p.trace], [p.z], velocity)[0])
        return {
            "trace": int(p.trace),
            "basinward_m": float(sign * (distance[int(p.trace)] - origin)) + 0.0,
            "depth_m": d,
            "z": float(p.z),
            "quality": float(p.quality),
        }

    return SurfaceGeometry(
        horizon_id=int(horizon.id),
        trace=trace,
        basinward_m=b,
        depth_m=depth,
        z=z,
        dz_depth_m=dzd,
        shelf_break=_pick(brk),
        toe=_pick(toe),
        break_reason=break_reason or ("" if brk is not None else "no shelf break picked"),
        toe_reason=toe_reason or ("" if toe is not None else "no toe of slope picked"),
        source=source,
    )


def margin_geometry(picks, margin, section, velocity=None) -> MarginGeometry:
    """Depth-convert and orient one margin of a :class:`~clinometry.picking.picks.Picks`.

    Parameters
    ----------
    picks : Picks
        Holds the horizons the margin refers to.
    margin : MarginPicks
        One entry of ``picks.margins``.
    section : xarray.DataArray, dims ("trace", "z")
        The section the picks were made on (coordinates ``distance``, ``x``,
        ``y``; attrs ``domain``, ``sample_interval``).
    velocity : velocity model or None
        Model of :mod:`clinometry.depth`; None only for depth sections.

    Returns
    -------
    MarginGeometry

    Raises
    ------
    GeometryError
        Unknown direction, a horizon id the picks do not hold, or trace
        indices outside the section.
    VelocityError
        TWT section and no velocity.

    Examples
    --------
    >>> from clinometry.section import make_section
    >>> from clinometry.picking.picks import Horizon, MarginPicks, PickPoint, Picks
    >>> s = make_section(np.zeros((5, 3)), z=[0.0, 10.0, 20.0], domain="depth", trace_spacing_m=100.0)
    >>> h = Horizon(0, "margin_profile", np.arange(5), np.array([0., 0., 5., 10., 10.]), np.ones(5))
    >>> m = MarginPicks("-", 0, 0, PickPoint(3, 10.0), PickPoint(1, 0.0))
    >>> g = margin_geometry(Picks(horizons=(h,), margins=(m,)), m, s)
    >>> g.profile.basinward_m.tolist(), g.profile.depth_m.tolist()
    ([0.0, 100.0, 200.0, 300.0, 400.0], [10.0, 10.0, 5.0, 0.0, 0.0])
    """
    check_section(section)
    name = section_name(section)
    if margin.direction not in ("+", "-"):
        raise GeometryError(f"{name}: margin direction must be '+' or '-', got {margin.direction!r}")
    sign = 1.0 if margin.direction == "+" else -1.0
    distance = np.asarray(section["distance"].values, dtype=np.float64)
    x = np.asarray(section["x"].values, dtype=np.float64) if "x" in section.coords else distance
    y = np.asarray(section["y"].values, dtype=np.float64) if "y" in section.coords else np.zeros_like(distance)
    n_trace = distance.size

    def _horizon(hid, what):
        try:
            h = picks.horizon(hid)
        except KeyError:
            raise GeometryError(f"{name}: the {what} refers to horizon {hid}, which the picks do not hold") from None
        if h.trace.size and (h.trace.min() < 0 or h.trace.max() >= n_trace):
            raise GeometryError(
                f"{name}: horizon {hid} has trace indices {h.trace.min()}..{h.trace.max()} outside the section's "
                f"0..{n_trace - 1}; were the picks made on another line?"
            )
        return h

    for p, what in ((margin.shelf_break, "shelf break"), (margin.toe, "toe")):
        if p is not None and not 0 <= int(p.trace) < n_trace:
            raise GeometryError(f"{name}: {what} at trace {p.trace} is outside the section's 0..{n_trace - 1}")

    prof_h = _horizon(margin.profile_id, "margin profile")
    n_ok = int(np.isfinite(prof_h.z).sum())
    if n_ok < 2:
        raise GeometryError(f"{name}: margin profile horizon {prof_h.id} has {n_ok} finite point(s); need 2 or more")
    origin = float(np.min(sign * distance[prof_h.trace])) * sign
    profile = _surface(section, velocity, prof_h, sign, origin, distance, margin.shelf_break, margin.toe,
                       margin.break_reason, margin.toe_reason)
    top = None
    if margin.platform_top_id is not None and margin.platform_top_id != margin.profile_id:
        top = _surface(section, velocity, _horizon(margin.platform_top_id, "platform top"), sign, origin,
                       distance, None, None, "not a profile", "not a profile")
    clinos = []
    for c in margin.clinoforms:
        clinos.append(_surface(section, velocity, _horizon(c.horizon_id, "clinoform"), sign, origin, distance,
                               c.shelf_break, c.toe, c.break_reason, c.toe_reason,
                               getattr(c, "source", "surface")))

    steps = np.abs(np.diff(distance))
    steps = steps[steps > 0]
    spacing = float(np.median(steps)) if steps.size else 0.0
    if spacing <= 0:
        raise GeometryError(f"{name}: the 'distance' coordinate does not increase along the line; cannot measure lengths")
    dt = float(section.attrs["sample_interval"])
    if section.attrs["domain"] == "depth":
        dsample = dt
    else:
        ref = profile.shelf_break or {"trace": int(profile.trace[len(profile) // 2]), "z": float(profile.z[len(profile) // 2])}
        lo, hi = to_depth(section, [ref["trace"]] * 2, [ref["z"], ref["z"] + dt], velocity)
        dsample = float(hi - lo)
    return MarginGeometry(
        direction=margin.direction,
        profile=profile,
        platform_top=top,
        clinoforms=tuple(clinos),
        trace_spacing_m=spacing,
        depth_sample_m=dsample,
        domain=section.attrs["domain"],
        sample_interval=dt,
        name=name,
        confidence=float(margin.confidence),
        _distance=distance,
        _x=x,
        _y=y,
        _origin_m=origin,
        _sign=sign,
    )
