"""Conversion of sections and picked horizons between two-way time and depth.

Whole sections are resampled by *inverse mapping*: for every sample of the
new regular axis we ask the velocity model where it lies on the old axis of
the same trace and interpolate the amplitudes linearly there.  Every output
sample is thus defined once, with no holes or double hits.  The default new
sample interval is chosen so that no layer is undersampled: for depth,
``dz = v_min * dt / 2`` with ``v_min`` the slowest interval velocity on the
section; for time, ``dt = 2 dz / v_max``.  Samples outside a trace's
converted range are NaN (no data), never invented.

Horizons (picks) are converted point by point through the model; for a
section already in depth the conversion to depth is the identity, so the
pipeline uses one code path for both domains.
"""

from __future__ import annotations

import copy
import logging

import numpy as np
import xarray as xr

from ..errors import GeometryError, VelocityError
from ..section import Z_UNITS, check_section, section_name
from ._plausibility import MS_PER_S
from .models import ConstantVelocity, VelocityModel

logger = logging.getLogger(__name__)

__all__ = ["section_to_depth", "section_to_twt", "horizon_to_depth", "horizon_to_twt", "to_depth"]

_Z_ATTRS = {
    "twt": {"units": Z_UNITS["twt"], "long_name": "two-way time"},
    "depth": {"units": Z_UNITS["depth"], "long_name": "depth"},
}


def _need_velocity(section, velocity, to):
    if velocity is None:
        raise VelocityError(
            f"{section_name(section)}: section is in {section.attrs['domain']}; converting to {to} needs a "
            "velocity model (give --velocity, --velocity-linear or --velocity-file)"
        )
    if not isinstance(velocity, VelocityModel):
        raise VelocityError(f"{section_name(section)}: velocity must be a VelocityModel, got {type(velocity).__name__}")
    n = getattr(velocity, "n_trace", None)
    if velocity.laterally_varying and n != section.sizes["trace"]:
        raise VelocityError(
            f"{section_name(section)}: the velocity section has {n} traces but the section has "
            f"{section.sizes['trace']}; match the velocity to this section (SectionVelocity.from_section)"
        )


def _resample(section, new_axis, old_pos, domain, velocity):
    """Interpolate each trace at ``old_pos`` (n_trace, n_new) on the old z axis."""
    data = np.asarray(section.values, dtype=np.float64)
    zold = np.asarray(section["z"].values, dtype=np.float64)
    n_tr = data.shape[0]
    i = np.clip(np.searchsorted(zold, old_pos, side="right") - 1, 0, zold.size - 2)
    w = (old_pos - zold[i]) / (zold[i + 1] - zold[i])
    rows = np.arange(n_tr)[:, None]
    out = data[rows, i] * (1.0 - w) + data[rows, i + 1] * w
    inside = (old_pos >= zold[0] - 1e-9) & (old_pos <= zold[-1] + 1e-9)
    out = np.where(inside, out, np.nan).astype(np.float32)

    coords = {name: c for name, c in section.coords.items() if "z" not in c.dims}
    attrs = copy.deepcopy(section.attrs)
    attrs.update(
        domain=domain,
        units=Z_UNITS[domain],
        sample_interval=float(new_axis[1] - new_axis[0]) if new_axis.size > 1 else float(attrs.get("sample_interval", 0)),
        velocity_model=velocity.to_dict(),
    )
    if velocity.fallback and velocity.fallback not in attrs.get("fallbacks", []):
        attrs.setdefault("fallbacks", []).append(velocity.fallback)
    new = xr.DataArray(out, dims=("trace", "z"), coords=coords, name=section.name, attrs=attrs)
    new = new.assign_coords(z=("z", new_axis, dict(_Z_ATTRS[domain])))
    logger.debug("resampled %s to %s: %d samples at %.4g %s", section_name(section), domain, new_axis.size, new.attrs["sample_interval"], Z_UNITS[domain])
    return new


def _regular_axis(start, stop, step):
    n = int(np.floor((stop - start) / step + 1e-9)) + 1
    return start + step * np.arange(max(n, 2))


def section_to_depth(section, velocity, *, dz_m=None):
    """Resample a two-way-time section onto a regular depth axis.

    Parameters
    ----------
    section : xarray.DataArray, dims ("trace", "z")
        Section in two-way time (ms).  A depth section is returned as a copy.
    velocity : VelocityModel or None
        Velocity model; may be None only for depth sections.  A velocity
        section must be matched to ``section`` (same number of traces).
    dz_m : float, m, optional
        Depth sample interval.  Default ``v_min * dt / 2`` (the slowest
        interval velocity on the section), so no layer is undersampled.

    Returns
    -------
    xarray.DataArray, dims ("trace", "z"), float32
        Same trace coordinates and attrs; ``z`` in m below time zero,
        ``attrs["domain"] == "depth"``, ``attrs["velocity_model"]`` the
        model's ``to_dict()``.  Samples outside the converted range of a
        trace are NaN.  The input is left untouched.

    Raises
    ------
    VelocityError
        No velocity for a TWT section, a non-positive ``dz_m``, or a velocity
        section with another trace count.
    GeometryError
        ``section`` does not follow the data model.

    See Also
    --------
    section_to_twt, horizon_to_depth

    Notes
    -----
    Inverse mapping with linear interpolation: the depth axis is mapped to
    time through ``velocity.twt_ms`` and each trace is sampled there
    (common practice, no source).

    Examples
    --------
    >>> from clinometry.section import make_section
    >>> from clinometry.depth import ConstantVelocity
    >>> s = make_section(np.arange(8.0)[None].repeat(2, 0), z=np.arange(8) * 4.0)
    >>> d = section_to_depth(s, ConstantVelocity(2000))
    >>> d.attrs["domain"], d["z"].values[:3].tolist(), d.values[0, :3].tolist()
    ('depth', [0.0, 4.0, 8.0], [0.0, 1.0, 2.0])
    """
    check_section(section)
    if section.attrs["domain"] == "depth":
        return section.copy(deep=True)
    _need_velocity(section, velocity, "depth")
    t = np.asarray(section["z"].values, dtype=np.float64)
    traces = np.arange(section.sizes["trace"])
    dt_ms = float(np.min(np.diff(t)))
    if dz_m is None:
        vmin = float(np.nanmin(velocity.interval_velocity(t[None, :], trace=traces[:, None])))
        dz_m = vmin * dt_ms / MS_PER_S / 2.0
    elif not (np.isfinite(dz_m) and dz_m > 0):
        raise VelocityError(f"{section_name(section)}: dz_m must be a positive number of metres, got {dz_m!r}")
    d_top = velocity.depth_m(np.full(traces.size, t[0]), trace=traces)
    d_bot = velocity.depth_m(np.full(traces.size, t[-1]), trace=traces)
    start = np.floor(np.min(d_top) / dz_m) * dz_m
    axis = _regular_axis(start, float(np.max(d_bot)), float(dz_m))
    pos = velocity.twt_ms(axis[None, :], trace=traces[:, None])
    return _resample(section, axis, pos, "depth", velocity)


def section_to_twt(section, velocity, *, dt_ms=None):
    """Resample a depth section onto a regular two-way-time axis.

    Parameters
    ----------
    section : xarray.DataArray, dims ("trace", "z")
        Section in depth (m below time zero).  A TWT section is returned as
        a copy.
    velocity : VelocityModel or None
        May be None only for TWT sections.
    dt_ms : float, ms, optional
        Time sample interval.  Default ``2 dz / v_max`` (the fastest interval
        velocity on the section), so no layer is undersampled.

    Returns
    -------
    xarray.DataArray, dims ("trace", "z"), float32
        ``attrs["domain"] == "twt"``, ``z`` in ms; samples outside a trace's
        converted range are NaN.

    Raises
    ------
    VelocityError
        No velocity for a depth section or a non-positive ``dt_ms``.

    See Also
    --------
    section_to_depth, horizon_to_twt

    Examples
    --------
    >>> from clinometry.section import make_section
    >>> from clinometry.depth import ConstantVelocity
    >>> s = make_section(np.arange(8.0)[None].repeat(2, 0), z=np.arange(8) * 5.0, domain="depth")
    >>> t = section_to_twt(s, ConstantVelocity(2500))
    >>> t["z"].values[:3].tolist(), t.values[1, :3].tolist()
    ([0.0, 4.0, 8.0], [0.0, 1.0, 2.0])
    """
    check_section(section)
    if section.attrs["domain"] == "twt":
        return section.copy(deep=True)
    _need_velocity(section, velocity, "two-way time")
    z = np.asarray(section["z"].values, dtype=np.float64)
    traces = np.arange(section.sizes["trace"])
    if dt_ms is None:
        tz = velocity.twt_ms(z[None, :], trace=traces[:, None])
        vmax = float(np.nanmax(velocity.interval_velocity(tz, trace=traces[:, None])))
        dt_ms = 2.0 * float(np.min(np.diff(z))) / vmax * MS_PER_S
    elif not (np.isfinite(dt_ms) and dt_ms > 0):
        raise VelocityError(f"{section_name(section)}: dt_ms must be a positive number of ms, got {dt_ms!r}")
    t_top = velocity.twt_ms(np.full(traces.size, z[0]), trace=traces)
    t_bot = velocity.twt_ms(np.full(traces.size, z[-1]), trace=traces)
    start = np.floor(np.nanmin(t_top) / dt_ms) * dt_ms
    axis = _regular_axis(start, float(np.nanmax(t_bot)), float(dt_ms))
    pos = velocity.depth_m(axis[None, :], trace=traces[:, None])
    return _resample(section, axis, pos, "twt", velocity)


def _check_traces(section, trace, z):
    zz = np.asarray(z, dtype=np.float64)
    tr = np.asarray(trace)
    if tr.size and np.issubdtype(tr.dtype, np.floating):
        if not np.all(np.isfinite(tr)):
            raise GeometryError(f"{section_name(section)}: horizon trace indices must be finite")
        tr = np.rint(tr)
    tr = tr.astype(np.int64)
    n = section.sizes["trace"]
    if tr.size and (tr.min() < 0 or tr.max() >= n):
        bad = int(tr[(tr < 0) | (tr >= n)].flat[0])
        raise GeometryError(f"{section_name(section)}: horizon trace {bad} is outside the section's {n} traces (0-{n - 1})")
    zz, tr = np.broadcast_arrays(zz, tr)
    return zz, tr


def horizon_to_depth(section, trace, z, velocity):
    """Depth (m below time zero) of horizon points given in the section's z units.

    Parameters
    ----------
    section : xarray.DataArray, dims ("trace", "z")
        The section the horizon was picked on.
    trace : int or array_like of int
        Section trace indices (0-based), broadcast with ``z``.
    z : array_like
        Horizon positions in the section's z units (ms TWT or m); NaN stays
        NaN (a missing pick).
    velocity : VelocityModel or None
        Required for TWT sections; ignored (identity) for depth sections.

    Returns
    -------
    numpy.ndarray, m

    Raises
    ------
    VelocityError
        TWT section without a velocity model.
    GeometryError
        A trace index outside the section.

    See Also
    --------
    horizon_to_twt, section_to_depth

    Examples
    --------
    >>> from clinometry.section import make_section
    >>> from clinometry.depth import ConstantVelocity
    >>> s = make_section(np.zeros((3, 5)), z=np.arange(5) * 4.0)
    >>> horizon_to_depth(s, [0, 1, 2], [4.0, 8.0, np.nan], ConstantVelocity(2500)).tolist()
    [5.0, 10.0, nan]
    """
    check_section(section)
    zz, tr = _check_traces(section, trace, z)
    if section.attrs["domain"] == "depth":
        return zz.copy()
    _need_velocity(section, velocity, "depth")
    return velocity.depth_m(zz, trace=tr)


def to_depth(section, trace, z, velocity) -> np.ndarray:
    """Depth in m of points given as trace index and z in the section's units: the one helper for picks.

    :func:`horizon_to_depth` as every step uses it on picks (picking, the
    metrics, the horizons table): float64 out, and a number is taken as a
    constant velocity.

    Parameters
    ----------
    section : xarray.DataArray, dims ("trace", "z")
    trace : array_like of int, shape (n,)
        Section trace indices (0-based).
    z : array_like of float, shape (n,)
        ms TWT or m, in the section's domain; NaN stays NaN.
    velocity : VelocityModel, float (m/s) or None
        None only for depth sections (identity).  Nothing is assumed: a TWT
        section without a velocity is refused; pass
        :data:`~clinometry.depth.DEFAULT_VELOCITY_M_S` to use the package
        default on purpose.

    Returns
    -------
    numpy.ndarray of float64, shape (n,), m

    Raises
    ------
    VelocityError
        TWT section and no velocity.
    GeometryError
        A trace index outside the section.

    See Also
    --------
    horizon_to_depth

    Examples
    --------
    >>> from clinometry.section import make_section
    >>> s = make_section(np.zeros((3, 5)), z=np.arange(5) * 4.0)
    >>> to_depth(s, [0, 2], [4.0, 8.0], 2500.0).tolist()  # depth = v t / 2
    [5.0, 10.0]
    """
    if isinstance(velocity, (int, float, np.number)) and not isinstance(velocity, (bool, np.bool_)):
        velocity = ConstantVelocity(float(velocity))
    return np.asarray(horizon_to_depth(section, trace, z, velocity), dtype=np.float64)


def horizon_to_twt(section, trace, z, velocity):
    """Two-way time (ms) of horizon points given in the section's z units.

    The inverse of :func:`horizon_to_depth`: identity for TWT sections;
    depth sections need a velocity model.

    Parameters
    ----------
    section : xarray.DataArray, dims ("trace", "z")
    trace : int or array_like of int
    z : array_like
        Horizon positions in the section's z units.
    velocity : VelocityModel or None

    Returns
    -------
    numpy.ndarray, ms

    Examples
    --------
    >>> from clinometry.section import make_section
    >>> from clinometry.depth import ConstantVelocity
    >>> s = make_section(np.zeros((2, 5)), z=np.arange(5) * 10.0, domain="depth")
    >>> horizon_to_twt(s, [0, 1], [10.0, 25.0], ConstantVelocity(2500)).tolist()
    [8.0, 20.0]
    """
    check_section(section)
    zz, tr = _check_traces(section, trace, z)
    if section.attrs["domain"] == "twt":
        return zz.copy()
    _need_velocity(section, velocity, "two-way time")
    return velocity.twt_ms(zz, trace=tr)
