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
  when rising: ``atan`` of the Theil-Sen slope (the median of the slopes
  between every pair of breaks; Theil 1950, Sen 1968) of break elevation
  (= -depth) against distance in the sense of net movement (basinward, or
  landward when the break backstepped).  With two breaks this is
  ``atan2(aggradation_m, |progradation_m|)``; with more, the median keeps
  a few odd breaks (a clinoform followed onto a side lobe) from deciding
  the class, which a least-squares line does not (up to 29 % of the breaks
  may be wild; Sen 1968, from memory);
* net_angle_deg: ``atan2(aggradation_m, |progradation_m|)`` from the oldest
  and youngest breaks alone;
* ratio = aggradation_m / progradation_m (A/P);
* step_angles_deg: the same angle for each successive pair of breaks.

How sure the sign is
--------------------
A break is picked to about one sample in depth and one trace along the line
(the pick errors of :mod:`clinometry.metrics.uncertainty`), and the velocity
scales every aggradation by its error.  The standard error of the fitted
slope is the larger of

* the *a-priori* error ``sigma_d / sqrt(Sxx)``, with ``sigma_d^2 =
  sigma_z^2 + (slope * sigma_x)^2`` (depth error plus the position error seen
  along the path) and ``Sxx`` the sum of squared distances of the breaks from
  their mean, plus the velocity share ``slope * velocity_sigma_fraction`` in
  quadrature; and
* the *a-posteriori* error from the scatter of the breaks about the line,
  ``s * sqrt(n / (n - 2) / Sxx)`` (three or more breaks), where the scatter
  ``s = 1.4826 * MAD(r)`` is the median absolute deviation of the residuals
  scaled to one normal sigma (Rousseeuw & Croux 1993, from memory), so wild
  breaks do not inflate it either,

the usual standard error of a fitted slope (e.g. Press et al., Numerical
Recipes, ch. 15; from memory) with ``sum(r^2) / n`` replaced by the robust
``s^2``; taking the larger of the two is common practice (no source).  It is reported as ``angle_sigma_deg`` with
``angle_p10_deg`` / ``angle_p90_deg`` (normal, +-1.2816 sigma, the same
P10/P90 as the other uncertainties).

The class follows from the P10-P90 interval of the angle, not from the
point estimate, against the flat band ``+-flat_deg``
(:data:`~clinometry.definitions.TRAJECTORY_FLAT_DEG`, 2 deg: about 35 m of
rise or fall over 1 km of progradation, close to the depth error of breaks
picked on seismic; our choice, part of the threshold table of
:mod:`clinometry.classify.thresholds`):

* ``ascending`` where the whole interval lies above the band, ``descending``
  where it lies below it, ``flat`` where it lies within it;
* ``flat_or_ascending`` / ``flat_or_descending`` where it straddles one edge
  of the band;
* ``unresolved`` where it spans the whole band: the breaks do not tell.

``sign_resolved`` and ``class_reason`` say which case applies; the classes
by sign follow Helland-Hansen & Martinsen (1996).  The half-width of the
interval is ``1.2816`` times the a-priori error (normal) or, when larger,
``t_0.9(n - 2)`` times the a-posteriori error (Student's t with n - 2
degrees of freedom, as an error estimated from the scatter of n points
about a line; Student 1908, from memory).

Where the picker followed two or more older clinoforms through the dip
field (:mod:`clinometry.picking.clinoforms`, ``source == "dip_field"``), only
their breaks are used: the outer profile's break lies on the platform-top
reflection while a break followed beneath it levels off within about half
a wavelet below, and mixing the two would tilt the line
(``break_source`` and ``n_clinoforms_left_out`` say so).  Breaks that
repeat an earlier one (same trace, depth within half a sample: the same
surface tracked twice) are counted once.  When all breaks sit on
one trace, the path is vertical (pure aggradation, +-90 deg) if the depth
change exceeds 1.2816 * sqrt(2) depth errors, else flat.
"""

from __future__ import annotations

import logging

import numpy as np

from ..definitions import TRAJECTORY_FLAT_DEG, theil_sen_line

__all__ = ["TRAJECTORY_FLAT_DEG", "P10_P90_SIGMAS", "trajectory_from_breaks", "trajectory_metrics"]

logger = logging.getLogger(__name__)

#: the 90th percentile of the standard normal distribution: P10/P90 are
#: mean -/+ 1.2816 sigma (standard normal table, e.g. Abramowitz & Stegun
#: 1964, table 26.1; from memory)
P10_P90_SIGMAS = 1.2815515655446004
#: fewest breaks followed through the dip field that give a trajectory: two
#: define a line, its band then comes from the pick errors alone; three and
#: more also from their scatter (with Student's t, n - 2 degrees of freedom).
#: Requiring three left 20-45 % more margins of scripts/bench_accuracy.py
#: without a trajectory and lowered the class agreement at every SNR (our
#: measurement, no source)
MIN_DIP_FIELD_BREAKS = 2
#: a trajectory steeper than this is rejected as a pick error: the shelf break
#: of a prograding margin builds out faster than it climbs, and even strongly
#: aggrading margins and build-ups climb at a few tens of degrees at most
#: (our choice, no source)
MAX_TRAJECTORY_DEG = 60.0
#: median absolute deviation -> standard deviation of a normal distribution,
#: 1 / Phi^-1(3/4) (Rousseeuw & Croux 1993, from memory)
MAD_TO_SIGMA = 1.482602218505602


def _t90(dof):
    """90th percentile of Student's t distribution with ``dof`` degrees of freedom (Student 1908)."""
    from scipy.stats import t

    return float(t.ppf(0.9, dof))


def _angle(aggradation, progradation):
    return float(np.degrees(np.arctan2(aggradation, abs(progradation))))


def interval_class(angle, p10, p90, flat_deg, *, resolved=True, aggr=0.0, depth_sigma_m=0.0):
    """Trajectory class from the P10-P90 interval of the angle, and its reason.

    ``ascending`` only where the whole interval lies above the flat band
    ``+-flat_deg``, ``descending`` only where it lies below it, ``flat``
    where it lies within it; an interval that straddles the band's edge is
    named for both classes it spans (``flat_or_ascending``,
    ``flat_or_descending``), and one that spans the whole band is
    ``unresolved``.  Breaks all on one trace (no interval) give a vertical
    path when ``resolved``.

    Examples
    --------
    >>> interval_class(5.0, 3.0, 7.0, 2.0)[0], interval_class(3.0, 1.0, 5.0, 2.0)[0]
    ('ascending', 'flat_or_ascending')
    >>> interval_class(0.5, -1.0, 1.5, 2.0)[0], interval_class(0.0, -6.0, 6.0, 2.0)[0]
    ('flat', 'unresolved')
    """
    band = float(flat_deg)
    if p10 is None or p90 is None:
        if resolved:
            cls = "ascending" if angle > 0 else "descending"
            return cls, (f"all breaks on one trace, {abs(aggr):.1f} m apart in depth (more than 1.28 * sqrt(2) "
                         f"depth errors of {depth_sigma_m:.1f} m): a vertical path, pure "
                         f"{'aggradation' if aggr > 0 else 'fall'}")
        return "flat", "breaks on one trace; depth change within the pick error"
    where = f"P10-P90 {p10:.1f} to {p90:.1f} deg against the flat band +-{band:.1f} deg"
    if p10 > band:
        return "ascending", f"{where}: the whole range rises more steeply than the band"
    if p90 < -band:
        return "descending", f"{where}: the whole range falls more steeply than the band"
    if p10 >= -band and p90 <= band:
        return "flat", f"{where}: the whole range lies within the band"
    if p10 < -band and p90 > band:
        return "unresolved", f"{where}: the range spans the band, the breaks do not tell the class"
    if p90 > band:
        return "flat_or_ascending", f"{where}: the range straddles the band's upper edge"
    return "flat_or_descending", f"{where}: the range straddles the band's lower edge"


def trajectory_from_breaks(basinward_m, depth_m, *, flat_deg: float = TRAJECTORY_FLAT_DEG,
                           depth_sigma_m: float = 0.0, position_sigma_m: float = 0.0,
                           velocity_sigma_fraction: float = 0.0) -> dict:
    """Trajectory angle, its uncertainty, distances and class from break positions, oldest first.

    Parameters
    ----------
    basinward_m : array_like, shape (n,), m
        Basinward distance of each break (n >= 2).
    depth_m : array_like, shape (n,), m
        Depth of each break, positive down.
    flat_deg : float, degrees
        Smallest half-width of the flat band (the tolerance).
    depth_sigma_m : float, m
        One-sigma depth error of a break pick.
    position_sigma_m : float, m
        One-sigma error of a break position along the line.
    velocity_sigma_fraction : float
        One-sigma relative velocity error (scales the aggradation).

    Returns
    -------
    dict
        ``angle_deg`` (least-squares), ``angle_sigma_deg`` (None for breaks
        on one trace), ``angle_p10_deg``, ``angle_p90_deg``,
        ``net_angle_deg``, ``class``, ``sign_resolved``, ``class_reason``,
        ``flat_tolerance_deg``, ``flat_band_deg``, ``progradation_m``,
        ``aggradation_m``, ``ratio`` (None when progradation is 0),
        ``step_angles_deg``, ``n_breaks``, ``backstepping``.

    References
    ----------
    .. [1] Helland-Hansen, W. & Martinsen, O. J. (1996). Shoreline trajectory
       and sequences: description of variable depositional-dip scenarios.
       Journal of Sedimentary Research 66: 670-688.
    .. [2] Press, W. H., Teukolsky, S. A., Vetterling, W. T. & Flannery,
       B. P. (2007). Numerical Recipes, 3rd ed., ch. 15 (standard error of a
       fitted straight line; from memory).
    .. [3] Theil, H. (1950). A rank-invariant method of linear and
       polynomial regression analysis. Proc. Kon. Ned. Akad. Wetensch. 53.
       (from memory)
    .. [4] Sen, P. K. (1968). Estimates of the regression coefficient based
       on Kendall's tau. J. Am. Stat. Assoc. 63, 1379-1389. (from memory)
    .. [5] Rousseeuw, P. J. & Croux, C. (1993). Alternatives to the median
       absolute deviation. J. Am. Stat. Assoc. 88, 1273-1283. (from memory)
    .. [6] Student (1908). The probable error of a mean. Biometrika 6, 1-25.
       (from memory)

    Notes
    -----
    A straight line through the breaks is the usual way to give one angle
    to a set of trajectory points (common practice, no source); it is
    fitted by Theil-Sen (:func:`scipy.stats.theilslopes`) so that a few
    wild breaks do not set the class.

    .. versionchanged:: 0.1.0
       Theil-Sen slope and a MAD-based scatter instead of least squares.

    Examples
    --------
    >>> t = trajectory_from_breaks([0.0, 1000.0], [300.0, 230.0])
    >>> round(t["angle_deg"], 3), t["class"]
    (4.004, 'ascending')
    >>> t = trajectory_from_breaks([0.0, 400.0], [300.0, 297.5], depth_sigma_m=2.5)
    >>> round(t["angle_deg"], 2), t["class"]
    (0.36, 'flat')
    """
    b = np.asarray(basinward_m, dtype=float)
    d = np.asarray(depth_m, dtype=float)
    if b.size < 2 or b.shape != d.shape:
        raise ValueError(f"need two or more breaks of matching shape, got {b.shape} and {d.shape}")
    prog = float(b[-1] - b[0])
    aggr = float(d[0] - d[-1])
    net = _angle(aggr, prog)
    sense = -1.0 if prog < 0 else 1.0
    x = sense * b
    sxx = float(np.sum((x - x.mean()) ** 2))
    z = P10_P90_SIGMAS
    if sxx > 0:
        # two breaks (sxx > 0 means prog != 0): the line through them
        if b.size > 2:
            slope, icpt = theil_sen_line(x, -d)
        else:
            slope, icpt = aggr / abs(prog), 0.0
        angle = float(np.degrees(np.arctan(slope))) if b.size > 2 else net
        var_prior = (depth_sigma_m ** 2 + (slope * position_sigma_m) ** 2) / sxx + (slope * velocity_sigma_fraction) ** 2
        var_post = 0.0
        if b.size > 2:
            resid = -d - (icpt + slope * x)
            # robust scatter: 1.4826 x median absolute residual estimates one
            # sigma of normal errors (Rousseeuw & Croux 1993, from memory)
            scat = MAD_TO_SIGMA * float(np.median(np.abs(resid - np.median(resid))))
            var_post = scat ** 2 * b.size / (b.size - 2) / sxx
        sig_slope = float(np.sqrt(max(var_prior, var_post)))
        sigma = float(np.degrees(sig_slope / (1.0 + slope * slope)))
        # P10/P90 half-width: the normal quantile for the a-priori error, Student's t
        # with n - 2 degrees of freedom for an error estimated from the scatter
        half = max(z * np.sqrt(var_prior), _t90(b.size - 2) * np.sqrt(var_post)) if b.size > 2 else z * sig_slope
        p10 = float(np.degrees(np.arctan(slope - half)))
        p90 = float(np.degrees(np.arctan(slope + half)))
        band = max(float(flat_deg), float(np.degrees(half / (1.0 + slope * slope))))
        resolved = abs(angle) > band
    else:
        # every break on one trace: a vertical path (pure aggradation) or none
        angle = net if prog == 0 else _angle(aggr, prog)
        sigma = None
        p10 = p90 = None
        band = float(flat_deg)
        resolved = abs(aggr) > z * np.sqrt(2.0) * depth_sigma_m and aggr != 0
        if not resolved:
            angle = 0.0 if aggr == 0 else angle
    cls, why = interval_class(angle, p10, p90, flat_deg, resolved=resolved, aggr=aggr, depth_sigma_m=depth_sigma_m)
    steps = [_angle(d[i] - d[i + 1], b[i + 1] - b[i]) for i in range(b.size - 1)]
    return {
        "angle_deg": angle,
        "angle_sigma_deg": sigma,
        "angle_p10_deg": p10,
        "angle_p90_deg": p90,
        "net_angle_deg": net,
        "class": cls,
        "sign_resolved": bool(resolved),
        "class_reason": why,
        "flat_tolerance_deg": float(flat_deg),
        "flat_band_deg": float(band),
        "progradation_m": prog,
        "aggradation_m": aggr,
        "ratio": aggr / prog if prog != 0 else None,
        "step_angles_deg": steps,
        "n_breaks": int(b.size),
        "backstepping": bool(prog < 0),
    }


def _trajectory_clinoforms(geometry):
    """The clinoforms whose breaks define the trajectory, and their source.

    Breaks measured in two different ways are not mixed: where the picker
    followed two or more older clinoforms through the dip field
    (``source == "dip_field"``), those alone are used -- a break followed
    beneath the platform-top reflection levels off about half a wavelet
    below it, while the outer profile's break lies on the reflection itself,
    so mixing the two would tilt the fitted line (our finding on the
    forward-model lines, no source).  Otherwise every clinoform is used.
    """
    field = [c for c in geometry.clinoforms if getattr(c, "source", "surface") == "dip_field" and c.shelf_break]
    if len(field) >= 2:
        return field, "dip_field"
    return list(geometry.clinoforms), "surface"


def _unique_breaks(geometry):
    """Clinoform breaks oldest first, a break repeating the previous kept one counted once."""
    out, dropped = [], 0
    half = 0.5 * geometry.depth_sample_m
    clinoforms, _ = _trajectory_clinoforms(geometry)
    for c in clinoforms:
        p = c.shelf_break
        if p is None:
            continue
        if any(q["trace"] == p["trace"] and abs(q["depth_m"] - p["depth_m"]) <= half for q in out):
            dropped += 1
            continue
        out.append(p)
    return out, dropped


def trajectory_metrics(geometry, *, flat_deg: float = TRAJECTORY_FLAT_DEG, pick_sigma_samples: float = 1.0,
                       pick_sigma_traces: float = 1.0, velocity_sigma_fraction: float = 0.08) -> dict:
    """Shelf-break trajectory (angle with its uncertainty, progradation, aggradation, class) after Helland-Hansen & Martinsen (1996).

    Parameters
    ----------
    geometry : MarginGeometry
        Its clinoforms, oldest to youngest; those without a picked break are
        skipped, a break repeating an earlier one is counted once.
    flat_deg : float, degrees
        Tolerance of the flat band (:data:`TRAJECTORY_FLAT_DEG`).
    pick_sigma_samples, pick_sigma_traces : float
        One-sigma pick errors of a break, in samples (converted with the
        geometry's depth sample) and trace spacings; the defaults are those
        of :data:`clinometry.metrics.uncertainty.UNCERTAINTY_DEFAULTS`.
    velocity_sigma_fraction : float
        One-sigma relative velocity error (TWT sections only).

    Returns
    -------
    dict
        ``{"trajectory": {...}}`` (see :func:`trajectory_from_breaks`, plus
        ``breaks``: contract points of the breaks used, ``n_repeated_breaks``,
        ``resolvable_angle_deg``), or
        ``{"trajectory": None, "missing": {"trajectory": reason}}``.

    References
    ----------
    .. [1] Helland-Hansen, W. & Martinsen, O. J. (1996). Journal of
       Sedimentary Research 66: 670-688.
    """
    brks, dropped = _unique_breaks(geometry)
    _, source = _trajectory_clinoforms(geometry)
    if source == "dip_field" and len(brks) < MIN_DIP_FIELD_BREAKS:
        return {"trajectory": None, "missing": {"trajectory": (
            f"{len(brks)} distinct clinoform break(s) followed through the dip field; a trajectory from them "
            f"needs {MIN_DIP_FIELD_BREAKS} or more, so that the scatter of the breaks about the line can be measured")}}
    if len(brks) < 2:
        n = len(geometry.clinoforms)
        rep = f" ({dropped} repeating an earlier break)" if dropped else ""
        return {"trajectory": None, "missing": {"trajectory": (
            f"{len(brks) + dropped} clinoform break(s) picked out of {n} clinoform(s){rep}; "
            "a trajectory needs 2 or more distinct breaks")}}
    t = trajectory_from_breaks(
        [p["basinward_m"] for p in brks], [p["depth_m"] for p in brks], flat_deg=flat_deg,
        depth_sigma_m=pick_sigma_samples * geometry.depth_sample_m,
        position_sigma_m=pick_sigma_traces * geometry.trace_spacing_m,
        velocity_sigma_fraction=velocity_sigma_fraction if geometry.domain == "twt" else 0.0)
    if abs(t["angle_deg"]) > MAX_TRAJECTORY_DEG:
        return {"trajectory": None, "missing": {"trajectory": (
            f"the breaks give a trajectory of {t['angle_deg']:.0f} deg, steeper than {MAX_TRAJECTORY_DEG:.0f} deg: "
            "not a shelf-break path (the break would climb faster than it builds out by a factor above 1.7), "
            "a pick error of the older breaks")}}
    t["breaks"] = [geometry.pick_point(p) for p in brks]
    used, source = _trajectory_clinoforms(geometry)
    t["break_source"] = source
    t["n_clinoforms_left_out"] = len(geometry.clinoforms) - len(used)
    t["n_repeated_breaks"] = int(dropped)
    # the smallest angle whose sign one depth sample can resolve over this progradation
    if t["progradation_m"] != 0:
        t["resolvable_angle_deg"] = float(np.degrees(np.arctan(geometry.depth_sample_m / abs(t["progradation_m"]))))
    return {"trajectory": t}
