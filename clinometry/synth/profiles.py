"""Analytic margin profiles: a platform top, a sharp break, a planar or concave foreset, a rounded toe.

Method
------
A profile is given by its basinward dip, ``tan(theta(u))`` against the
basinward distance ``u`` from the break (m), and integrated in closed form:

* ``u < 0``: the platform top, dip ``t0 = tan(top_dip_deg)`` (0 for a flat
  top; a small positive value deepens the top basinward, as on a ramp or a
  domed build-up);
* ``0 <= u < w_b``: the rollover, the dip rising from ``t0`` to
  ``T = tan(slope_deg)`` along a half cosine (a *sharp* break when ``w_b`` is
  a few tens of metres);
* ``w_b <= u < w_b + P``: the planar foreset at ``T``;
* ``w_b + P <= u < w_b + P + w_t``: the toe, the dip falling from ``T`` to 0
  along a half cosine.  A toe wide compared with the foreset makes the
  lower slope concave (dip decreasing downslope), the common shape of
  carbonate slopes shed by grain flows and turbidites [1]_;
* beyond: the flat basin floor, ``relief_m`` below the break.

The planar length ``P`` follows from the relief: the integral of the dip is
``relief = w_b (t0 + T) / 2 + P T + w_t T / 2`` (each half-cosine
transition has the mean of its end values).  Where the relief is too small
for the rollover and toe (``P < 0``) both are narrowed by one factor.

Why this form: every derivative is smooth except where the designer asks for
sharpness, depth is exact (no numerical integration), and the three numbers
an interpreter reads off a margin -- slope, relief, break and toe rounding --
are the parameters.  Profile shapes after Adams & Schlager (2000) [1]_:
planar (small ``w_t``), concave (large ``w_t``).

References
----------
.. [1] Adams, E. W. & Schlager, W. (2000). Basic types of submarine slope
   curvature. Journal of Sedimentary Research 70, 814-828. (from memory)
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..errors import GeometryError

__all__ = ["Foreset", "foreset_lengths_m", "profile_depth_m", "profile_dip"]


@dataclass(frozen=True)
class Foreset:
    """Shape of one margin profile (see the module docstring).

    Parameters
    ----------
    slope_deg : float, degrees
        Dip of the planar foreset (the steepest dip of the profile).
    break_width_m : float, m
        Width of the rollover at the break (``w_b``).
    toe_width_m : float, m
        Width of the toe rounding (``w_t``); wide for a concave lower slope.
    top_dip_deg : float, degrees
        Basinward dip of the platform top (``t0``), below ``slope_deg``.
    """

    slope_deg: float
    break_width_m: float = 40.0
    toe_width_m: float = 150.0
    top_dip_deg: float = 0.0

    def __post_init__(self):
        if not (0.0 < self.slope_deg < 80.0):
            raise GeometryError(f"slope_deg must be in (0, 80), got {self.slope_deg}")
        if self.break_width_m < 0 or self.toe_width_m < 0:
            raise GeometryError(f"break_width_m and toe_width_m must be >= 0, got "
                                f"{self.break_width_m}, {self.toe_width_m}")
        if not (0.0 <= self.top_dip_deg < self.slope_deg):
            raise GeometryError(f"top_dip_deg must be in [0, slope_deg), got {self.top_dip_deg}")


def foreset_lengths_m(relief_m, foreset: Foreset):
    """Horizontal lengths (rollover, planar foreset, toe) of a profile, m.

    Parameters
    ----------
    relief_m : float, m
        Depth of the basin floor below the break (> 0).
    foreset : Foreset

    Returns
    -------
    (float, float, float), m
        ``w_b``, ``P`` and ``w_t``; the rollover and toe are narrowed by one
        factor when the relief cannot hold them (then ``P = 0``).

    Examples
    --------
    >>> w = foreset_lengths_m(100.0, Foreset(45.0, break_width_m=20.0, toe_width_m=20.0))
    >>> [round(v, 6) for v in w]
    [20.0, 80.0, 20.0]
    """
    if not relief_m > 0:
        raise GeometryError(f"relief_m must be > 0, got {relief_m}")
    t0 = np.tan(np.radians(foreset.top_dip_deg))
    t = np.tan(np.radians(foreset.slope_deg))
    wb, wt = float(foreset.break_width_m), float(foreset.toe_width_m)
    rounded = wb * (t0 + t) / 2.0 + wt * t / 2.0
    if rounded > relief_m:
        f = relief_m / rounded
        return float(wb * f), 0.0, float(wt * f)
    return wb, float((relief_m - rounded) / t), wt


def _half_cos_rise(u, w):
    """Integral of (1 - cos(pi u / w)) / 2 from 0 to u, for 0 <= u <= w."""
    if w <= 0:
        return np.zeros_like(u)
    return 0.5 * (u - (w / np.pi) * np.sin(np.pi * u / w))


def _half_cos_fall(v, w):
    """Integral of (1 + cos(pi v / w)) / 2 from 0 to v, for 0 <= v <= w."""
    if w <= 0:
        return np.zeros_like(v)
    return 0.5 * (v + (w / np.pi) * np.sin(np.pi * v / w))


def profile_depth_m(u_m, *, break_depth_m, relief_m, foreset: Foreset):
    """Depth of a margin profile at basinward distance ``u_m`` from its break.

    Parameters
    ----------
    u_m : array_like, m
        Basinward distance from the break (negative: landward, on the top).
    break_depth_m : float, m
        Depth of the profile at ``u = 0`` (positive down).
    relief_m : float, m
        Depth of the basin floor below ``break_depth_m``.
    foreset : Foreset

    Returns
    -------
    numpy.ndarray, m
        Closed-form integral of the dip of the module docstring.

    Examples
    --------
    A 45 deg planar foreset without rounding drops 1 m per metre:

    >>> f = Foreset(45.0, break_width_m=0.0, toe_width_m=0.0)
    >>> profile_depth_m([-10.0, 0.0, 30.0, 200.0], break_depth_m=100.0, relief_m=50.0, foreset=f).round(6).tolist()
    [100.0, 100.0, 130.0, 150.0]
    """
    u = np.asarray(u_m, dtype=np.float64)
    wb, p, wt = foreset_lengths_m(relief_m, foreset)
    t0 = np.tan(np.radians(foreset.top_dip_deg))
    t = np.tan(np.radians(foreset.slope_deg))
    d1 = wb * (t0 + t) / 2.0  # depth below the break at the end of the rollover
    d2 = d1 + p * t  # ... at the end of the planar foreset
    ur = np.clip(u, 0.0, wb)
    rise = t0 * ur + (t - t0) * _half_cos_rise(ur, wb)
    up = np.clip(u - wb, 0.0, p)
    uv = np.clip(u - wb - p, 0.0, wt)
    fall = t * _half_cos_fall(uv, wt)
    d = np.where(u < 0, t0 * u, np.where(u < wb, rise, np.where(u < wb + p, d1 + t * up, d2 + fall)))
    return break_depth_m + np.minimum(d, relief_m)


def profile_dip(u_m, *, relief_m, foreset: Foreset):
    """Basinward dip ``tan(theta)`` of the profile at ``u_m`` (the integrand of :func:`profile_depth_m`).

    Examples
    --------
    >>> f = Foreset(20.0, break_width_m=40.0, toe_width_m=100.0)
    >>> bool(np.isclose(profile_dip([200.0], relief_m=300.0, foreset=f)[0], np.tan(np.radians(20.0))))
    True
    """
    u = np.asarray(u_m, dtype=np.float64)
    wb, p, wt = foreset_lengths_m(relief_m, foreset)
    t0 = np.tan(np.radians(foreset.top_dip_deg))
    t = np.tan(np.radians(foreset.slope_deg))
    with np.errstate(invalid="ignore", divide="ignore"):
        rise = t0 + (t - t0) * 0.5 * (1.0 - np.cos(np.pi * np.clip(u, 0.0, wb) / wb)) if wb > 0 else np.full_like(u, t)
        fall = t * 0.5 * (1.0 + np.cos(np.pi * np.clip(u - wb - p, 0.0, wt) / wt)) if wt > 0 else np.zeros_like(u)
    return np.where(u < 0, t0, np.where(u < wb, rise, np.where(u < wb + p, t, np.where(u < wb + p + wt, fall, 0.0))))
