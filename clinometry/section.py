"""The section data model: one seismic line as an ``xarray.DataArray``.

A section has dims ``("trace", "z")``, trace first.  Code selects by name,
never by axis number.  Coordinates:

``trace``
    0-based trace index along the line (dimension coordinate).
``cdp``, ``inline``, ``crossline``
    Header numbers along ``trace`` where the file has them.
``x``, ``y``
    Trace coordinates in metres (scaled by the SEG-Y coordinate scalar).
``distance``
    Metres along the line from the first trace, cumulative over the trace
    coordinates (or ``trace * trace_spacing`` when the file has none).
``z``
    Two-way time in ms (``domain="twt"``) or depth in m (``domain="depth"``),
    positive down, first sample at the delay recording time.

Attrs record what was read and what was decided: ``domain``, ``units``,
``sample_interval`` (in the units of ``z``), ``sample_format``,
``byte_order``, ``text_header``, ``source_path``, ``fallbacks`` (list of
strings), ``dead_traces`` (list of trace indices) and ``n_nonfinite``.
"""

from __future__ import annotations

from typing import Any, Mapping

import numpy as np
import xarray as xr

from .errors import GeometryError

__all__ = [
    "DIMS",
    "DOMAINS",
    "Z_UNITS",
    "make_section",
    "check_section",
    "distance_from_xy",
    "section_name",
]

DIMS = ("trace", "z")
DOMAINS = ("twt", "depth")
#: units of the z axis per domain
Z_UNITS = {"twt": "ms", "depth": "m"}
_Z_LONG_NAMES = {"twt": "two-way time", "depth": "depth"}

_COORD_ATTRS = {
    "trace": {"units": "1", "long_name": "trace index"},
    "cdp": {"units": "1", "long_name": "CDP number"},
    "inline": {"units": "1", "long_name": "inline number"},
    "crossline": {"units": "1", "long_name": "crossline number"},
    "x": {"units": "m", "long_name": "x coordinate"},
    "y": {"units": "m", "long_name": "y coordinate"},
    "distance": {"units": "m", "long_name": "distance along line"},
}


def distance_from_xy(x, y):
    """Cumulative distance along a polyline of trace positions.

    Parameters
    ----------
    x, y : array_like, shape (n_trace,), m
        Trace coordinates.

    Returns
    -------
    numpy.ndarray, shape (n_trace,), m
        0 at the first trace, then the running sum of the straight-line
        steps between consecutive traces.

    Examples
    --------
    >>> distance_from_xy([0, 3, 3], [0, 4, 8]).tolist()
    [0.0, 5.0, 9.0]
    """
    x = np.asarray(x, dtype=np.float64)
    y = np.asarray(y, dtype=np.float64)
    step = np.hypot(np.diff(x), np.diff(y))
    return np.concatenate([[0.0], np.cumsum(step)])


def make_section(
    data,
    *,
    z,
    domain: str = "twt",
    x=None,
    y=None,
    distance=None,
    cdp=None,
    inline=None,
    crossline=None,
    trace_spacing_m: float | None = None,
    attrs: Mapping[str, Any] | None = None,
    name: str = "amplitude",
) -> xr.DataArray:
    """Build a section with the package's dims, coordinates and attrs.

    Parameters
    ----------
    data : array_like, shape (n_trace, n_z)
        Amplitudes, trace first.  Kept in their dtype if floating, otherwise
        converted to float32 (amplitudes keep their values and units).
    z : array_like, shape (n_z,)
        Sample positions: ms two-way time for ``domain="twt"``, m for
        ``domain="depth"``; increasing, positive down.
    domain : {"twt", "depth"}
    x, y : array_like, shape (n_trace,), m, optional
        Trace coordinates.  When absent, ``x = distance`` and ``y = 0``.
    distance : array_like, shape (n_trace,), m, optional
        Along-line distance.  Default: cumulative from ``x, y``, or
        ``trace * trace_spacing_m`` when there are no coordinates.
    cdp, inline, crossline : array_like, shape (n_trace,), optional
    trace_spacing_m : float, m, optional
        Used only when neither ``x, y`` nor ``distance`` are given
        (default 25 m, recorded as a fallback in attrs).
    attrs : mapping, optional
        Extra attrs; ``domain``, ``units`` and ``sample_interval`` are set
        here from ``domain`` and ``z``.

    Returns
    -------
    xarray.DataArray, dims ("trace", "z")

    Raises
    ------
    GeometryError
        Wrong shapes, unknown domain, or a z axis that is not increasing.

    Examples
    --------
    >>> s = make_section(np.zeros((3, 4)), z=[0, 4, 8, 12], trace_spacing_m=12.5)
    >>> s.dims, s.distance.values.tolist(), s.attrs["units"]
    (('trace', 'z'), [0.0, 12.5, 25.0], 'ms')
    """
    if domain not in DOMAINS:
        raise GeometryError(f"domain must be one of {DOMAINS}, got {domain!r}")
    arr = np.asarray(data)
    if not np.issubdtype(arr.dtype, np.floating):
        arr = arr.astype(np.float32)
    if arr.ndim != 2:
        raise GeometryError(f"section data must be 2-D (trace, z), got shape {arr.shape}")
    n_trace, n_z = arr.shape
    z = np.asarray(z, dtype=np.float64)
    if z.shape != (n_z,):
        raise GeometryError(f"z has shape {z.shape}, expected ({n_z},)")
    if n_z > 1 and not np.all(np.diff(z) > 0):
        raise GeometryError("z axis must be strictly increasing (positive down)")
    attrs = dict(attrs or {})
    fallbacks = list(attrs.get("fallbacks", []))

    if x is not None and y is not None:
        x = np.asarray(x, dtype=np.float64)
        y = np.asarray(y, dtype=np.float64)
        if distance is None:
            distance = distance_from_xy(x, y)
    if distance is None:
        if trace_spacing_m is None:
            trace_spacing_m = 25.0
            fallbacks.append("no trace coordinates; trace spacing 25 m assumed")
        distance = np.arange(n_trace, dtype=np.float64) * float(trace_spacing_m)
    distance = np.asarray(distance, dtype=np.float64)
    if x is None or y is None:
        x = distance.copy()
        y = np.zeros(n_trace)
    for nm, v in (("x", x), ("y", y), ("distance", distance)):
        if np.shape(v) != (n_trace,):
            raise GeometryError(f"{nm} has shape {np.shape(v)}, expected ({n_trace},)")

    coords = {
        "trace": ("trace", np.arange(n_trace), _COORD_ATTRS["trace"]),
        "z": ("z", z, {"units": Z_UNITS[domain], "long_name": _Z_LONG_NAMES[domain]}),
        "x": ("trace", x, _COORD_ATTRS["x"]),
        "y": ("trace", y, _COORD_ATTRS["y"]),
        "distance": ("trace", distance, _COORD_ATTRS["distance"]),
    }
    for nm, v in (("cdp", cdp), ("inline", inline), ("crossline", crossline)):
        if v is not None:
            v = np.asarray(v)
            if v.shape != (n_trace,):
                raise GeometryError(f"{nm} has shape {v.shape}, expected ({n_trace},)")
            coords[nm] = ("trace", v, _COORD_ATTRS[nm])

    dz = float(np.median(np.diff(z))) if n_z > 1 else float(attrs.get("sample_interval", 0.0))
    attrs.setdefault("sample_format", "unknown")
    attrs.setdefault("byte_order", "native")
    attrs.setdefault("text_header", "")
    attrs.setdefault("source_path", "")
    attrs.setdefault("dead_traces", [])
    attrs.setdefault("n_nonfinite", 0)
    attrs.update(
        {
            "domain": domain,
            "units": Z_UNITS[domain],
            "sample_interval": dz,
            "fallbacks": fallbacks,
        }
    )
    return xr.DataArray(arr, dims=DIMS, coords=coords, name=name, attrs=attrs)


def check_section(section, *, where: str = "") -> xr.DataArray:
    """Check that ``section`` follows the data model; return it unchanged.

    Parameters
    ----------
    section : xarray.DataArray, dims ("trace", "z")
    where : str, optional
        Name used in messages (for example the source file).

    Raises
    ------
    GeometryError
        If dims, coordinates or the domain attr are missing or wrong.
    """
    label = where or section_name(section) if isinstance(section, xr.DataArray) else where
    if not isinstance(section, xr.DataArray):
        raise GeometryError(f"{label or 'input'}: expected an xarray.DataArray section, got {type(section).__name__}")
    if tuple(section.dims) != DIMS:
        raise GeometryError(f"{label}: section dims must be {DIMS}, got {tuple(section.dims)}; use section.transpose('trace', 'z')")
    for c in ("distance", "z"):
        if c not in section.coords:
            raise GeometryError(f"{label}: section has no '{c}' coordinate; build it with clinometry.make_section")
    if section.attrs.get("domain") not in DOMAINS:
        raise GeometryError(f"{label}: section attr 'domain' must be one of {DOMAINS}, got {section.attrs.get('domain')!r}")
    if section.sizes["trace"] < 2 or section.sizes["z"] < 2:
        raise GeometryError(f"{label}: section needs at least 2 traces and 2 samples, got {dict(section.sizes)}")
    return section


def section_name(section) -> str:
    """Short name of a section for messages: source file name, else 'section'."""
    import os

    src = section.attrs.get("source_path", "") if hasattr(section, "attrs") else ""
    line = section.attrs.get("line_label", "") if hasattr(section, "attrs") else ""
    base = os.path.basename(src) if src else "section"
    return f"{base} {line}".strip()
