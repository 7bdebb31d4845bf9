"""True dip in degrees from apparent time dip, and dip along a depth profile.

On a time section a reflector dips by ``dt/dx`` (two-way ms per m).  With
the velocity ``v`` of the rock just above it, a step ``dt`` in two-way time
is a step ``v dt / 2`` in depth, so the true dip is
``tan(theta) = (v / 2) (dt / dx)``.  The same time dip is a steeper true dip
in faster rock: 10 ms per 100 m is 7.1 deg at 2500 m/s and 11.3 deg at
4000 m/s.  This holds locally for any velocity that does not vary along the
line, using the interval velocity at the reflector.

Along a depth-converted profile the dip is simply the arctangent of the
depth gradient.  Angles leave these functions in degrees.
"""

from __future__ import annotations

import numpy as np

from ..errors import GeometryError
from ._plausibility import MS_PER_S, check_velocities

__all__ = ["true_dip_deg", "time_dip_ms_per_m", "dip_deg_from_depth"]


def true_dip_deg(dt_ms_per_m, velocity_m_s):
    """True dip from apparent two-way-time dip.

    Parameters
    ----------
    dt_ms_per_m : array_like, ms/m
        Two-way time dip along the line (positive where time increases with
        distance).
    velocity_m_s : array_like, m/s
        Interval velocity at the reflector; broadcast with ``dt_ms_per_m``.

    Returns
    -------
    numpy.ndarray or float, degrees
        Signed dip in (-90, 90), positive where the reflector deepens with
        distance.

    Raises
    ------
    VelocityError
        Zero, negative or implausible velocity.

    See Also
    --------
    time_dip_ms_per_m, dip_deg_from_depth

    Notes
    -----
    ``tan(theta) = (v / 2) * dt / dx`` with ``dt`` two-way time [1]_.

    References
    ----------
    .. [1] Sheriff, R. E. & Geldart, L. P. (1995). Exploration Seismology,
       2nd ed. Cambridge University Press (from memory).

    Examples
    --------
    >>> round(float(true_dip_deg(0.1, 2500)), 1), round(float(true_dip_deg(0.1, 4000)), 1)
    (7.1, 11.3)
    """
    v = check_velocities(velocity_m_s, what="velocity", source="true dip")
    g = np.asarray(dt_ms_per_m, dtype=np.float64)
    out = np.degrees(np.arctan(v / 2.0 * g / MS_PER_S))
    return out if out.ndim else float(out)


def time_dip_ms_per_m(dip_deg, velocity_m_s):
    """Apparent two-way-time dip (ms/m) of a reflector with true dip ``dip_deg``.

    The inverse of :func:`true_dip_deg`: ``dt/dx = 2 tan(theta) / v``.

    Parameters
    ----------
    dip_deg : array_like, degrees
    velocity_m_s : array_like, m/s

    Returns
    -------
    numpy.ndarray or float, ms/m

    Examples
    --------
    >>> round(float(time_dip_ms_per_m(45, 2000)), 6)
    1.0
    """
    v = check_velocities(velocity_m_s, what="velocity", source="time dip")
    out = 2.0 * np.tan(np.radians(np.asarray(dip_deg, dtype=np.float64))) / v * MS_PER_S
    return out if out.ndim else float(out)


def dip_deg_from_depth(distance_m, depth_m):
    """Dip along a depth profile: arctangent of the depth gradient.

    Parameters
    ----------
    distance_m : array_like, shape (n,), m
        Along-line distance, strictly increasing, n >= 2.
    depth_m : array_like, shape (n,), m
        Depth, positive down; NaN (missing picks) give NaN next to them.

    Returns
    -------
    numpy.ndarray, shape (n,), degrees
        Positive where the profile deepens with distance.  The gradient is
        second-order central differences inside and one-sided at the ends
        (``numpy.gradient``).

    Raises
    ------
    GeometryError
        Shapes differ, fewer than 2 points, or distance not increasing.

    See Also
    --------
    true_dip_deg

    Examples
    --------
    >>> dip_deg_from_depth([0, 100, 200], [0, 100, 200]).round(6).tolist()
    [45.0, 45.0, 45.0]
    """
    x = np.asarray(distance_m, dtype=np.float64)
    z = np.asarray(depth_m, dtype=np.float64)
    if x.ndim != 1 or x.shape != z.shape or x.size < 2:
        raise GeometryError(f"distance and depth must be 1-D of the same length >= 2, got {x.shape} and {z.shape}")
    if not np.all(np.isfinite(x)) or np.any(np.diff(x) <= 0):
        raise GeometryError("distance must be finite and strictly increasing along the profile; sort the points by distance")
    return np.degrees(np.arctan(np.gradient(z, x)))
