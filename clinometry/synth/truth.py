"""Ground truth of a grown margin: shelf break, toe, slope, relief, trajectory.

Definitions (geometric, on a margin profile in depth)
-----------------------------------------------------
The *margin profile* is a stratal surface, depth (m, positive down) against
distance (m) measured basinward.  For the final margin it is the youngest
surface of the grown platform (the top before burial); each clinoform uses
its own surface.  The profile is smoothed with a Gaussian of standard
deviation ``smoothing_m`` (default :data:`SMOOTHING_M`) before derivatives
are taken.

* steepest point: maximum of the smoothed basinward dip;
* **shelf break**: maximum of convex-up curvature (largest ``d''(s)`` of depth
  ``d`` against basinward distance ``s``) between the landward end of the
  profile and the steepest point;
* **toe of slope**: maximum of concave-up curvature (most negative
  ``d''(s)``) between the steepest point and the basinward end;
* ``relief_m`` = toe depth - break depth (unsmoothed profile);
* ``slope_max_deg``: the maximum foreset slope of the unsmoothed profile
  by :func:`clinometry.definitions.foreset_slope_deg` (the 80th percentile
  of least-squares dips over a base ``L`` between break and toe) with the
  base of :func:`clinometry.definitions.slope_base_length_m` and no pick
  scatter -- the one definition ``clinometry.metrics.slope`` uses on picked
  surfaces (pinned by ``tests/test_definitions.py``), so truth and
  measurement differ only by the picks;
* ``slope_mean_deg`` = atan(relief / horizontal break-to-toe distance);
* shelf-break trajectory: Theil-Sen line (the median of the slopes
  between every pair of points; [3]_, [4]_) through the breaks of the
  clinoforms (oldest to youngest) in (basinward distance, depth), the same
  estimator (:func:`clinometry.definitions.theil_sen_line`) that
  ``clinometry.metrics.trajectory`` fits to picked breaks;
  ``angle_deg`` = atan(-d depth / d distance) (positive: the break rises as
  it moves basinward).  A least-squares line was used before; it let two
  backstepped early breaks of ``deep_factory_shelf`` turn a net rise of
  33 m over 175 m of progradation into a "descending" class.  Class ``ascending`` if ``angle_deg >``
  :data:`TRAJECTORY_FLAT_DEG`, ``descending`` if ``< -TRAJECTORY_FLAT_DEG``,
  else ``flat``.

These are the usual words of clinoform and trajectory analysis (e.g. [1]_,
[2]_); the numeric smoothing, base length and flat tolerance are choices of
this project, not published thresholds.

References
----------
.. [1] Helland-Hansen, W. & Hampson, G. J. (2009). Trajectory analysis:
   concepts and applications. Basin Research 21, 454-483. (from memory)
.. [2] Schlager, W. (2005). Carbonate Sedimentology and Sequence
   Stratigraphy. SEPM Concepts in Sedimentology and Paleontology 8.
   (from memory)
.. [3] Theil, H. (1950). A rank-invariant method of linear and polynomial
   regression analysis. Proc. Koninklijke Nederlandse Akademie van
   Wetenschappen 53. (from memory)
.. [4] Sen, P. K. (1968). Estimates of the regression coefficient based on
   Kendall's tau. J. Am. Stat. Assoc. 63, 1379-1389. (from memory)
"""

from __future__ import annotations

import numpy as np
from scipy.ndimage import gaussian_filter1d

# the definitions shared with clinometry.metrics (one home: clinometry.definitions)
from ..definitions import TRAJECTORY_FLAT_DEG, foreset_slope_deg, slope_base_length_m, theil_sen_line

__all__ = [
    "SMOOTHING_M",
    "TRAJECTORY_FLAT_DEG",
    "MIN_RELIEF_M",
    "profile_margin",
    "trajectory",
]

#: Gaussian smoothing (standard deviation) before curvature, m (project choice)
SMOOTHING_M = 60.0
#: a profile with less break-to-toe relief has no margin, m (project choice)
MIN_RELIEF_M = 10.0


def profile_margin(distance_m, depth_m, *, smoothing_m=SMOOTHING_M, base_length_m=None,
                   min_relief_m=MIN_RELIEF_M, trace_spacing_m=None, depth_sample_m=None):
    """Break, toe, slope and relief of one margin profile.

    Parameters
    ----------
    distance_m : array_like, shape (n,), m
        Basinward distance, increasing, regular spacing.
    depth_m : array_like, shape (n,), m
        Depth of the surface, positive down.
    smoothing_m, min_relief_m : float, m
        See the module docstring.
    base_length_m : float, m, optional
        Base of the max-slope fit; default
        :func:`clinometry.definitions.slope_base_length_m` (no pick scatter:
        the surface is exact).
    trace_spacing_m : float, m, optional
        Trace spacing of the seismic line; default the profile's spacing.
    depth_sample_m : float or callable, m, optional
        One sample of the seismic in depth, or a function of depth (m) giving
        it; evaluated at the break.  None leaves out the precision term of
        the base.

    Returns
    -------
    dict or None
        ``{"break": i, "toe": j, "steepest": k, "relief_m", "slope_max_deg",
        "slope_mean_deg", "slope_base_length_m"}`` with indices into the
        profile, or None when the profile has no margin (relief below
        ``min_relief_m``).

    Examples
    --------
    >>> s = np.arange(0.0, 2000.0, 10.0)
    >>> d = np.clip((s - 500.0) * np.tan(np.radians(20.0)), 0.0, 300.0)
    >>> m = profile_margin(s, d)
    >>> float(s[m["break"]]), float(s[m["toe"]]), round(m["slope_max_deg"], 1)
    (500.0, 1320.0, 20.0)
    """
    s = np.asarray(distance_m, dtype=np.float64)
    d = np.asarray(depth_m, dtype=np.float64)
    ds = float(s[1] - s[0])
    ds_ = gaussian_filter1d(d, smoothing_m / ds, mode="nearest")
    dip = np.gradient(ds_, ds)
    curv = np.gradient(dip, ds)
    k = int(np.argmax(dip))
    if dip[k] <= 0:
        return None
    i = int(np.argmax(curv[: k + 1]))
    j = k + int(np.argmin(curv[k:]))
    relief = float(d[j] - d[i])
    if relief < min_relief_m or j <= i:
        return None
    width = float(s[j] - s[i])
    dsample = depth_sample_m(float(d[i])) if callable(depth_sample_m) else depth_sample_m
    base = base_length_m if base_length_m is not None else slope_base_length_m(
        ds if trace_spacing_m is None else trace_spacing_m, dsample, relief / width)
    slope_max = float(foreset_slope_deg(s, d, s[i], s[j], base))
    slope_mean = float(np.degrees(np.arctan(relief / width)))
    return {"break": i, "toe": j, "steepest": k, "relief_m": relief,
            "slope_max_deg": slope_max, "slope_mean_deg": slope_mean, "slope_base_length_m": base}


def trajectory(distance_m, depth_m, *, flat_deg=TRAJECTORY_FLAT_DEG):
    """Shelf-break trajectory through break points (oldest to youngest), Theil-Sen line.

    Parameters
    ----------
    distance_m, depth_m : array_like, shape (n,), m
        Basinward distance and depth (positive down) of the breaks.
    flat_deg : float, degrees
        Tolerance of the flat class.

    Returns
    -------
    dict or None
        ``{"angle_deg", "class", "progradation_m", "aggradation_m",
        "n_points"}``; None with fewer than 3 points or no progradation.

    Examples
    --------
    >>> t = trajectory([0.0, 100.0, 200.0], [30.0, 25.0, 20.0])
    >>> round(t["angle_deg"], 2), t["class"]
    (2.86, 'ascending')
    """
    s = np.asarray(distance_m, dtype=np.float64)
    d = np.asarray(depth_m, dtype=np.float64)
    if s.size < 3 or np.ptp(s) <= 0:
        return None
    slope, _ = theil_sen_line(s, d)  # Theil (1950), Sen (1968)
    angle = float(np.degrees(np.arctan(-slope)))
    cls = "ascending" if angle > flat_deg else "descending" if angle < -flat_deg else "flat"
    return {"angle_deg": angle, "class": cls, "flat_tolerance_deg": flat_deg,
            "progradation_m": float(s[-1] - s[0]), "aggradation_m": float(d[0] - d[-1]),
            "n_points": int(s.size)}
