"""The picker plugin ``horizons``: an interpreter's own horizon instead of the automatic picks.

Interpreters often have the margin picked already.  :func:`read_horizon_csv`
reads such a pick from a CSV file (columns ``trace`` or ``x, y``, and ``z``
in the section's units), matches x/y points to the nearest trace within a
tolerance, and refuses anything it cannot place with a message naming the
file, row and column.  :func:`picks_from_horizon` then finds direction,
shelf break and toe on that horizon with the picking step's own margin
analysis (:func:`clinometry.picking.candidates.find_legs` and
    :func:`~clinometry.picking.candidates.leg_readings`), so a
user horizon and an automatic pick are measured the same way.

:func:`pick_from_horizons` joins the two as a picker plugin like any other
(entry point ``horizons`` of ``clinometry.pickers``), selected with
``--picker horizons --horizons FILE`` or ``analyze(path, horizons=FILE)``.
"""

from __future__ import annotations

import csv
import logging
import math
import os
from dataclasses import replace
from pathlib import Path

import numpy as np

from .depth import to_depth
from .errors import HorizonFileError
from .picking.picks import Horizon, Picks

__all__ = [
    "pick_from_horizons",
    "horizon_source",
    "read_horizon_csv",
    "picks_from_horizon",
    "HORIZON_MAX_OFFSET_TRACES",
    "USER_HORIZON_SMOOTHING_TRACES",
    "USER_HORIZON_MIN_RELIEF_M",
]

logger = logging.getLogger(__name__)

#: Gaussian smoothing (sigma) of a user horizon before curvature, in trace
#: spacings: enough to calm single-trace jitter of hand picks, short enough
#: to keep the bends (project choice, no source)
USER_HORIZON_SMOOTHING_TRACES = 3.0

#: smallest break-to-toe relief that makes a leg of a user horizon a margin,
#: m (project choice, no source)
USER_HORIZON_MIN_RELIEF_M = 20.0
#: confidence of a margin on an interpreter's horizon without a distinct break
#: or toe (a ramp or a gradual bend; our choice, no source)
USER_HORIZON_GRADUAL_CONFIDENCE = 0.8

#: how far (in median trace spacings) an x/y horizon point may lie from the
#: nearest trace before it is refused: one spacing (common practice, no source)
HORIZON_MAX_OFFSET_TRACES = 1.0


def pick_from_horizons(section, *, velocity=None, horizons, smoothing_m: float | None = None,
                       min_relief_m: float | None = None) -> Picks:
    """Margins on the interpreter's own horizon (CSV file or Horizon) instead of automatic picks.

    Parameters
    ----------
    section : xarray.DataArray, dims ("trace", "z")
    velocity : VelocityModel, float (m/s) or None
        For the depth conversion; None only for depth sections.
    horizons : str, os.PathLike or Horizon
        The horizon: a CSV file read with :func:`read_horizon_csv`, or a
        :class:`~clinometry.picking.picks.Horizon`.
    smoothing_m, min_relief_m : float, m, optional
        See :func:`picks_from_horizon`.

    Returns
    -------
    Picks
        ``picker="horizons"``; no margin (with a note) when no leg of the
        horizon deepens basinward enough.

    Raises
    ------
    HorizonFileError
        The file cannot be read or does not match the section.
    VelocityError
        TWT section and no velocity.
    """
    horizon = horizons if isinstance(horizons, Horizon) else read_horizon_csv(horizons, section)
    return picks_from_horizon(horizon, section, velocity, smoothing_m=smoothing_m, min_relief_m=min_relief_m)


def horizon_source(horizons) -> str:
    """How ``run.horizon_source`` names the horizon: its file, or that the caller gave it."""
    return "Horizon given by the caller" if isinstance(horizons, Horizon) else os.fspath(horizons)


def picks_from_horizon(horizon: Horizon, section, model, *, smoothing_m=None, min_relief_m=None) -> Picks:
    """Margin picks on a user horizon with the picking step's margin functions.

    The horizon is interpolated linearly onto every trace of its span (the
    interpreter's line between picks), converted to depth with the run's
    velocity model (:func:`clinometry.depth.to_depth`), and handed to
    :func:`clinometry.picking.candidates.find_legs` and
    :func:`~clinometry.picking.candidates.leg_readings`, the same break /
    toe / direction analysis the automatic picker applies to each tracked
    surface.  Each accepted candidate becomes one margin whose only
    clinoform is the horizon itself.

    Parameters
    ----------
    horizon : Horizon
    section : xarray.DataArray, dims ("trace", "z")
    model : VelocityModel, float (m/s) or None
        None only for depth sections.
    smoothing_m : float, m, optional
        Gaussian smoothing before curvature; default
        :data:`USER_HORIZON_SMOOTHING_TRACES` trace spacings.
    min_relief_m : float, m, optional
        Default :data:`USER_HORIZON_MIN_RELIEF_M`.

    Returns
    -------
    Picks
    """
    from .picking.candidates import find_legs, leg_readings
    from .picking.picks import ClinoformPicks, MarginPicks, PickPoint

    horizon = replace(horizon, role="user") if horizon.role != "user" else horizon
    traces = np.arange(int(horizon.trace[0]), int(horizon.trace[-1]) + 1)
    z = np.interp(traces, horizon.trace, horizon.z)
    dist = section["distance"].values[traces].astype(float)
    spacing = float(np.median(np.abs(np.diff(dist)))) if traces.size > 1 else 0.0
    if smoothing_m is None:
        smoothing_m = USER_HORIZON_SMOOTHING_TRACES * spacing
    if min_relief_m is None:
        min_relief_m = USER_HORIZON_MIN_RELIEF_M
    depth = to_depth(section, traces, z, model)
    params = {"horizon_id": horizon.id, "n_points": len(horizon), "smoothing_m": float(smoothing_m),
              "min_relief_m": float(min_relief_m)}
    margins = []
    for leg in find_legs(dist, depth, smoothing_m=float(smoothing_m), min_relief_m=float(min_relief_m)):
        # the slope-scale reading when it has a sharp break, else the leg-scale one (a ramp)
        c = leg_readings(dist, depth, leg, smoothing_m=float(smoothing_m), min_relief_m=float(min_relief_m))[0]
        brk = PickPoint(int(traces[c.shelf_break]), float(z[c.shelf_break])) if c.shelf_break is not None else None
        toe = PickPoint(int(traces[c.toe]), float(z[c.toe])) if c.toe is not None else None
        margins.append(
            MarginPicks(
                direction=leg.direction,
                profile_id=horizon.id,
                platform_top_id=horizon.id,
                shelf_break=brk,
                toe=toe,
                clinoforms=(ClinoformPicks(horizon.id, brk, toe, c.break_reason, c.toe_reason),),
                # the interpreter drew it: the geometry alone, full where break and toe are distinct
                confidence=1.0 if brk is not None and toe is not None else USER_HORIZON_GRADUAL_CONFIDENCE,
                break_reason=c.break_reason,
                toe_reason=c.toe_reason,
                notes=("margin found on the interpreter's horizon",),
            )
        )
    notes = []
    if not margins:
        notes.append(
            f"no leg of the horizon deepens basinward by {min_relief_m:g} m or more from a flatter top "
            "over a foreset of several traces"
        )
    return Picks(horizons=(horizon,), margins=tuple(margins), picker="horizons",
                 parameters=params, notes=tuple(notes))


# ------------------------------------------------------------- horizon CSV
def _float_cell(text, *, name, row, column):
    t = (text or "").strip()
    if t == "":
        return None
    try:
        v = float(t)
    except ValueError:
        raise HorizonFileError(
            f"{name}: row {row}, column {column!r}: {t!r} is not a number; "
            "write plain decimal numbers (empty cells are skipped)"
        ) from None
    if not math.isfinite(v):
        raise HorizonFileError(f"{name}: row {row}, column {column!r}: value {t!r} is not finite")
    return v


def read_horizon_csv(path, section, *, max_offset_m=None, horizon_id=0) -> Horizon:
    """Read an interpreter's horizon (CSV) and match it to the section's traces.

    Parameters
    ----------
    path : str or os.PathLike
        CSV with a header row.  Columns: ``trace`` (0-based index into the
        section) *or* ``x`` and ``y`` (m, same coordinate system as the
        section), and ``z`` in the section's units (ms TWT or m depth,
        positive down).  Rows with an empty ``z`` are skipped (gaps);
        other columns are ignored.
    section : xarray.DataArray, dims ("trace", "z")
    max_offset_m : float, m, optional
        Largest distance from an x/y point to its nearest trace.  Default:
        :data:`HORIZON_MAX_OFFSET_TRACES` median trace spacings.
    horizon_id : int

    Returns
    -------
    Horizon
        ``role="user"``, quality 1, sorted by trace; points that fall on the
        same trace are averaged.

    Raises
    ------
    HorizonFileError
        Missing file or columns, a cell that is not a number, a trace index
        outside the section, an x/y point too far from the line, a z outside
        the section's z range, or fewer than 3 points.  The message names
        the file, and the row and column where one is at fault.
    """
    path = Path(path)
    name = path.name
    try:
        text = path.read_text(encoding="utf-8-sig")
    except FileNotFoundError as err:
        raise HorizonFileError(f"{name}: horizon file not found ({path})") from err
    except (OSError, UnicodeDecodeError) as err:
        raise HorizonFileError(f"{name}: cannot read the horizon file: {err}") from err
    reader = csv.DictReader(text.splitlines())
    cols = [c.strip().lower() for c in (reader.fieldnames or [])]
    if not cols:
        raise HorizonFileError(f"{name}: empty file; expected a header row with 'trace' or 'x,y', and 'z'")
    reader.fieldnames = cols
    if "z" not in cols:
        raise HorizonFileError(f"{name}: no column 'z' (columns seen: {', '.join(cols)}); add the pick in section units")
    by_trace = "trace" in cols
    if not by_trace and not ("x" in cols and "y" in cols):
        raise HorizonFileError(
            f"{name}: needs a column 'trace' or both 'x' and 'y' (columns seen: {', '.join(cols)})"
        )
    n_trace = int(section.sizes["trace"])
    zvals = section["z"].values
    zmin, zmax = float(zvals[0]), float(zvals[-1])
    unit = section.attrs.get("units", "")
    xs = section["x"].values.astype(float)
    ys = section["y"].values.astype(float)
    if max_offset_m is None:
        steps = np.hypot(np.diff(xs), np.diff(ys))
        spacing = float(np.median(steps)) if steps.size else 0.0
        max_offset_m = HORIZON_MAX_OFFSET_TRACES * spacing
    traces, zs = [], []
    for i, rec in enumerate(reader, start=2):  # row 1 is the header
        z = _float_cell(rec.get("z"), name=name, row=i, column="z")
        if z is None:
            continue
        if not zmin <= z <= zmax:
            raise HorizonFileError(
                f"{name}: row {i}, column 'z': {z:g} {unit} is outside the section's z range "
                f"{zmin:g}..{zmax:g} {unit}; is the horizon in the same domain (TWT ms or depth m)?"
            )
        if by_trace:
            t = _float_cell(rec.get("trace"), name=name, row=i, column="trace")
            if t is None or t != int(t) or not 0 <= t < n_trace:
                raise HorizonFileError(
                    f"{name}: row {i}, column 'trace': {rec.get('trace')!r} is not a trace index "
                    f"0..{n_trace - 1} of this section"
                )
            t = int(t)
        else:
            x = _float_cell(rec.get("x"), name=name, row=i, column="x")
            y = _float_cell(rec.get("y"), name=name, row=i, column="y")
            if x is None or y is None:
                raise HorizonFileError(f"{name}: row {i}: 'x' and 'y' are both needed when 'z' is given")
            d = np.hypot(xs - x, ys - y)
            t = int(np.argmin(d))
            if d[t] > max_offset_m:
                raise HorizonFileError(
                    f"{name}: row {i}, columns 'x','y': point ({x:g}, {y:g}) is {d[t]:.1f} m from the "
                    f"nearest trace ({t}), more than the {max_offset_m:.1f} m allowed; check the "
                    "coordinate system or pass max_offset_m="
                )
        traces.append(t)
        zs.append(z)
    if len(set(traces)) < 3:
        raise HorizonFileError(f"{name}: only {len(set(traces))} distinct traces with a z value; a margin needs at least 3")
    traces = np.asarray(traces)
    zs = np.asarray(zs)
    uniq, inv = np.unique(traces, return_inverse=True)
    zmean = np.bincount(inv, weights=zs) / np.bincount(inv)
    if uniq.size < traces.size:
        logger.info("%s: %d points fell on shared traces and were averaged", name, traces.size - uniq.size)
    return Horizon(id=horizon_id, role="user", trace=uniq, z=zmean, quality=np.ones(uniq.size), polarity="unknown")
