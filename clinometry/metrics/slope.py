"""Foreset slope, relief, flank gradients and curvature of a margin profile.

All numbers are measured on the depth-converted, basinward-oriented profile
of :mod:`clinometry.metrics.margin_geometry`, so angles are true angles in degrees
and lengths are metres.  The definitions (also in the README section "How
the numbers are defined"):

relief_m
    Toe depth minus shelf-break depth (break and toe as picked).
foreset_width_m
    Horizontal basinward distance from the break to the toe.
slope_mean_deg
    ``atan(relief_m / foreset_width_m)``: the mean declivity of the foreset.
slope_max_deg
    The maximum foreset slope between break and toe: the 80th percentile
    (:data:`~clinometry.definitions.SLOPE_MAX_QUANTILE`) of the dips of
    least-squares lines fitted to the profile over every horizontal base
    ``L`` lying wholly between break and toe, with
    (:func:`clinometry.definitions.slope_base_length_m`)::

        L = max(BASE_LENGTH_TRACES * trace spacing,
                (sigma sqrt(12 dx) / (SLOPE_PRECISION_FRACTION tan(slope_mean))) ** (2/3))

    i.e. at least three traces, and long enough that the pick scatter
    ``sigma`` (measured on the picks, at least the quantisation of one depth
    sample) changes the fitted dip by at most a tenth of the mean foreset
    gradient: ~75 m on a clean 20 deg foreset at 25 m traces, a few hundred
    metres on a noisy one or on a ramp.  One definition, used by the metrics
    on the picked surface and by the forward model's ground truth
    (:mod:`clinometry.synth.truth`) on the exact surface
    (:func:`clinometry.definitions.foreset_slope_deg`).  This is what an
    interpreter reads as "the maximum foreset slope": the dip of the steep,
    straight part of the foreset, not of single-trace wiggles of the picks.
    Pick scatter widens the spread of the fitted dips, so their 80th
    percentile would read steeper than the surface by about 0.84 standard
    errors of one fit; that excess, from the measured scatter
    (:func:`slope_noise_for`, :func:`clinometry.definitions.slope_noise_gradient`),
    is taken off, and the result is never below the mean slope.
    A margin narrower than ``L`` is measured by the least-squares line from
    break to toe.  When break or toe is missing (a ramp), the window runs to
    the end of the profile and ``slope_window`` says so.

    .. versionchanged:: 2026-12
       Was the steepest secant over at least 150 m, which flattened narrow
       steep faces and read pick jitter as slope.
topset_gradient_deg, bottomset_gradient_deg
    Least-squares gradient of depth against basinward distance over
    ``flank_length_m`` landward of the break (platform top) and basinward of
    the toe (basin floor), leaving out one local length
    (:func:`local_length_m`) next to the break / toe so the rollover itself
    does not tilt the fit; signed, positive when deepening basinward.
break_curvature_per_km, toe_curvature_per_km
    Curvature ``kappa = d'' / (1 + d'^2)^(3/2)`` of a quadratic fitted to the
    profile within ``curvature_window_m`` of the break / toe, per km;
    positive when the profile steepens basinward at the break (a rollover)
    and flattens basinward at the toe, the shapes expected of a margin.
clinoform_height_m
    Median over the clinoforms of toe depth minus break depth.

Fitted dips rather than point derivatives are used because picks are
quantised to one sample vertically and one trace laterally and carry pick
noise; a fit over a stated base is the usual way to report a slope from
such elevations (common practice, no source).
"""

from __future__ import annotations

import logging

import numpy as np

from ..definitions import (BASE_LENGTH_TRACES, SLOPE_QUANTUM_DEG, _interp_rows, foreset_slope_deg, pick_scatter_m,
                           slope_base_length_m, slope_noise_gradient)

__all__ = [
    "FLANK_LENGTH_TRACES",
    "CURVATURE_WINDOW_BASES",
    "slope_metrics",
    "grid_surface",
    "foreset_slope_deg",
    "base_length_m_for",
    "local_length_m",
]

logger = logging.getLogger(__name__)

#: length of the topset / bottomset gradient fit, in trace spacings (chosen here)
FLANK_LENGTH_TRACES = 20
#: half-width of the curvature fit window, in local lengths (chosen here)
CURVATURE_WINDOW_BASES = 2.0
#: fewest points for a gradient fit (3) and a curvature fit (5): one more
#: than the parameters of the polynomial (common practice, no source)
_MIN_GRADIENT_POINTS = 3
_MIN_CURVATURE_POINTS = 5


def _mean_gradient(surface):
    """tan of the break-to-toe mean slope of a surface, or None."""
    brk, toe = surface.shelf_break, surface.toe
    if not (brk and toe) or toe["basinward_m"] <= brk["basinward_m"]:
        return None
    g = (toe["depth_m"] - brk["depth_m"]) / (toe["basinward_m"] - brk["basinward_m"])
    return g if g > 0 else None


def local_length_m(geometry) -> float:
    """Length scale of the local fits next to break and toe, m.

    The longer of :data:`~clinometry.definitions.BASE_LENGTH_TRACES` trace
    spacings and the length over which one depth sample is a slope of
    :data:`~clinometry.definitions.SLOPE_QUANTUM_DEG`.
    Used to keep the rollover out of the flank fits and as the unit of the
    curvature window; independent of the slope itself.
    """
    vertical = geometry.depth_sample_m / np.tan(np.radians(SLOPE_QUANTUM_DEG))
    return float(max(BASE_LENGTH_TRACES * geometry.trace_spacing_m, vertical))


def base_length_m_for(geometry, base_length_m=None, *, surface=None) -> float:
    """The base length of the max-slope secant of a margin geometry, m.

    Given, or :func:`clinometry.definitions.slope_base_length_m` with the geometry's trace spacing,
    depth sample and the surface's mean break-to-toe gradient.

    Parameters
    ----------
    geometry : MarginGeometry
    base_length_m : float, m, optional
        Use this instead (must be > 0).
    surface : SurfaceGeometry, optional
        Default the margin profile.

    Returns
    -------
    float, m
    """
    if base_length_m is not None:
        if not np.isfinite(base_length_m) or base_length_m <= 0:
            raise ValueError(f"{geometry.name}: base_length_m must be > 0, got {base_length_m!r}")
        return float(base_length_m)
    surf = surface if surface is not None else geometry.profile
    g = _mean_gradient(surf)
    keep = np.ones(len(surf), bool)
    if surf.shelf_break:
        keep &= surf.basinward_m >= surf.shelf_break["basinward_m"] - 1e-9
    if surf.toe:
        keep &= surf.basinward_m <= surf.toe["basinward_m"] + 1e-9
    return slope_base_length_m(geometry.trace_spacing_m, geometry.depth_sample_m, g,
                               pick_scatter_m=pick_scatter_m(surf.depth_m[keep]))


def slope_noise_for(geometry, base_m, *, surface=None) -> float:
    """Standard error of one fitted gradient of the max-slope measure on a margin geometry.

    :func:`clinometry.definitions.slope_noise_gradient` of the measured
    scatter of the picks between break and toe
    (:func:`clinometry.definitions.pick_scatter_m`) over ``base_m`` at the
    geometry's trace spacing: the noise actually in the picks, 0 on an exact
    surface (the base length, by contrast, allows for at least one depth
    sample of error).
    """
    surf = surface if surface is not None else geometry.profile
    keep = np.ones(len(surf), bool)
    if surf.shelf_break:
        keep &= surf.basinward_m >= surf.shelf_break["basinward_m"] - 1e-9
    if surf.toe:
        keep &= surf.basinward_m <= surf.toe["basinward_m"] + 1e-9
    return slope_noise_gradient(pick_scatter_m(surf.depth_m[keep]), base_m, geometry.trace_spacing_m)


def grid_surface(surface, step_m: float):
    """Resample a surface onto a uniform basinward grid.

    Parameters
    ----------
    surface : SurfaceGeometry
    step_m : float, m

    Returns
    -------
    xs : numpy.ndarray, shape (n,), m
        ``xs[0]`` is the most landward point, spacing ``step_m``.
    ds : numpy.ndarray, shape (n,), m
        Depth, linearly interpolated.

    Examples
    --------
    >>> from types import SimpleNamespace
    >>> s = SimpleNamespace(basinward_m=np.array([0.0, 30.0]), depth_m=np.array([0.0, 3.0]))
    >>> xs, ds = grid_surface(s, 10.0)
    >>> xs.tolist(), ds.tolist()
    ([0.0, 10.0, 20.0, 30.0], [0.0, 1.0, 2.0, 3.0])
    """
    b0, b1 = float(surface.basinward_m[0]), float(surface.basinward_m[-1])
    n = int(np.floor((b1 - b0) / step_m + 1e-9)) + 1
    xs = b0 + step_m * np.arange(n)
    ds = np.interp(xs, surface.basinward_m, surface.depth_m)
    return xs, ds


def _gradient_deg(b, d):
    """Least-squares gradient of depth vs distance, in degrees (positive deepening basinward)."""
    slope = np.polyfit(b - b.mean(), d, 1)[0]
    return float(np.degrees(np.arctan(slope)))


def _curvature_per_km(b, d, at_m):
    """Curvature of a quadratic fit d(b) at ``at_m``, per km (d'' / (1 + d'^2)^1.5)."""
    c2, c1, _ = np.polyfit(b - at_m, d, 2)
    return float(2.0 * c2 / (1.0 + c1 * c1) ** 1.5 * 1000.0)


def _window(surface, lo, hi):
    m = (surface.basinward_m >= lo - 1e-9) & (surface.basinward_m <= hi + 1e-9)
    return surface.basinward_m[m], surface.depth_m[m]


def _foreset(geometry, surface, base_length_m, label):
    """slope max / mean, relief, width of one surface; dict of values and missing reasons."""
    values, missing = {}, {}
    if len(surface) < 2:
        reason = f"{label}: {len(surface)} finite point(s) on the surface; need 2"
        for k in ("slope_max_deg", "slope_mean_deg", "relief_m", "foreset_width_m"):
            missing[k] = reason
        return values, missing, "none"
    base_m = base_length_m_for(geometry, base_length_m, surface=surface)
    values["slope_base_length_m"] = base_m
    brk, toe = surface.shelf_break, surface.toe
    xs, ds = grid_surface(surface, geometry.trace_spacing_m / 2.0)
    lo = brk["basinward_m"] if brk else float(surface.basinward_m[0])
    hi = toe["basinward_m"] if toe else float(surface.basinward_m[-1])
    window = "break_to_toe" if brk and toe else (
        "break_to_profile_end" if brk else "profile_start_to_toe" if toe else "whole_profile")
    if brk and toe and toe["basinward_m"] <= brk["basinward_m"]:
        reason = (f"{label}: toe at trace {toe['trace']} is not basinward of the break at trace {brk['trace']}")
        for k in ("slope_max_deg", "slope_mean_deg", "relief_m", "foreset_width_m"):
            missing[k] = reason
        return values, missing, window
    smax = float(foreset_slope_deg(xs, ds, lo, hi, base_m, noise_gradient=slope_noise_for(geometry, base_m, surface=surface)))
    if np.isfinite(smax):
        values["slope_max_deg"] = smax
    else:
        missing["slope_max_deg"] = f"{label}: profile too short to measure a slope"
    if brk and toe:
        relief = toe["depth_m"] - brk["depth_m"]
        width = toe["basinward_m"] - brk["basinward_m"]
        values["relief_m"] = float(relief)
        values["foreset_width_m"] = float(width)
        values["slope_mean_deg"] = float(np.degrees(np.arctan2(relief, width)))
    else:
        why = "; ".join(r for r in (surface.break_reason if not brk else "", surface.toe_reason if not toe else "") if r)
        for k in ("slope_mean_deg", "relief_m", "foreset_width_m"):
            missing[k] = f"{label}: {why}"
    return values, missing, window


def slope_metrics(
    geometry,
    *,
    base_length_m: float | None = None,
    flank_length_m: float | None = None,
    curvature_window_m: float | None = None,
) -> dict:
    """Foreset slope (max, mean), relief, foreset width, flank gradients and curvature, per clinoform too.

    Parameters
    ----------
    geometry : MarginGeometry
        From :func:`clinometry.metrics.margin_geometry.margin_geometry`.
    base_length_m : float, m, optional
        Base of the maximum-slope secant; default from
        :func:`base_length_m_for`.
    flank_length_m : float, m, optional
        Length of the topset and bottomset fits; default
        :data:`FLANK_LENGTH_TRACES` trace spacings.
    curvature_window_m : float, m, optional
        Half-width of the curvature fit around break and toe; default
        :data:`CURVATURE_WINDOW_BASES` local lengths (:func:`local_length_m`).

    Returns
    -------
    dict
        Named values (see the module docstring), plus ``"clinoforms"`` (list
        of dicts, oldest to youngest, with ``horizon_id``, ``break``,
        ``toe``, ``slope_max_deg``, ``slope_mean_deg``, ``height_m``) and
        ``"missing"`` (name -> reason).

    Notes
    -----
    ``slope_mean_deg = atan(relief / width)``; ``slope_max_deg`` is the
    steepest secant over ``base_length_m``; curvature of a plane curve
    ``kappa = y'' / (1 + y'^2)^(3/2)`` (standard calculus, e.g. Kreyszig,
    Advanced Engineering Mathematics; from memory).

    References
    ----------
    .. [1] Kreyszig, E. (2011). Advanced Engineering Mathematics, 10th ed.,
       Wiley (curvature of a plane curve; from memory).
    """
    base = local_length_m(geometry)
    flank = float(flank_length_m) if flank_length_m is not None else FLANK_LENGTH_TRACES * geometry.trace_spacing_m
    cwin = float(curvature_window_m) if curvature_window_m is not None else CURVATURE_WINDOW_BASES * base
    prof = geometry.profile
    values, missing, window = _foreset(geometry, prof, base_length_m, "margin profile")
    values["slope_window"] = window
    brk, toe = prof.shelf_break, prof.toe
    if brk:
        values["break_depth_m"] = brk["depth_m"]
    if toe:
        values["toe_depth_m"] = toe["depth_m"]

    # topset: platform top (or the profile) landward of the break
    if brk:
        top = geometry.platform_top or prof
        b, d = _window(top, brk["basinward_m"] - base - flank, brk["basinward_m"] - base)
        if b.size >= _MIN_GRADIENT_POINTS and np.ptp(b) > 0:
            values["topset_gradient_deg"] = _gradient_deg(b, d)
        else:
            missing["topset_gradient_deg"] = (
                f"only {b.size} platform-top point(s) from {base + flank:.0f} to {base:.0f} m landward of the break; "
                f"need {_MIN_GRADIENT_POINTS}")
        b, d = _window(prof, brk["basinward_m"] - cwin, brk["basinward_m"] + cwin)
        if b.size >= _MIN_CURVATURE_POINTS:
            values["break_curvature_per_km"] = _curvature_per_km(b, d, brk["basinward_m"])
        else:
            missing["break_curvature_per_km"] = (
                f"only {b.size} profile point(s) within {cwin:.0f} m of the break; need {_MIN_CURVATURE_POINTS}")
    else:
        for k in ("topset_gradient_deg", "break_curvature_per_km"):
            missing[k] = prof.break_reason
    if toe:
        b, d = _window(prof, toe["basinward_m"] + base, toe["basinward_m"] + base + flank)
        if b.size >= _MIN_GRADIENT_POINTS and np.ptp(b) > 0:
            values["bottomset_gradient_deg"] = _gradient_deg(b, d)
        else:
            missing["bottomset_gradient_deg"] = (
                f"only {b.size} profile point(s) from {base:.0f} to {base + flank:.0f} m basinward of the toe; "
                f"need {_MIN_GRADIENT_POINTS}")
        b, d = _window(prof, toe["basinward_m"] - cwin, toe["basinward_m"] + cwin)
        if b.size >= _MIN_CURVATURE_POINTS:
            values["toe_curvature_per_km"] = -_curvature_per_km(b, d, toe["basinward_m"])
        else:
            missing["toe_curvature_per_km"] = (
                f"only {b.size} profile point(s) within {cwin:.0f} m of the toe; need {_MIN_CURVATURE_POINTS}")
    else:
        for k in ("bottomset_gradient_deg", "toe_curvature_per_km"):
            missing[k] = prof.toe_reason

    clinoforms = []
    heights = []
    for c in geometry.clinoforms:
        cv, cm, cwin_name = _foreset(geometry, c, base_length_m, f"clinoform {c.horizon_id}")
        entry = {
            "horizon_id": c.horizon_id,
            "break": geometry.pick_point(c.shelf_break),
            "toe": geometry.pick_point(c.toe),
            "slope_max_deg": cv.get("slope_max_deg") if c.shelf_break and c.toe else None,
            "slope_mean_deg": cv.get("slope_mean_deg"),
            "height_m": cv.get("relief_m"),
            "width_m": cv.get("foreset_width_m"),
        }
        cmiss = {k: v for k, v in cm.items()}
        if entry["slope_max_deg"] is None and "slope_max_deg" not in cmiss:
            cmiss["slope_max_deg"] = "; ".join(
                r for r in (c.break_reason if not c.shelf_break else "", c.toe_reason if not c.toe else "") if r)
        if cmiss:
            entry["missing"] = {("height_m" if k == "relief_m" else "width_m" if k == "foreset_width_m" else k): v
                                for k, v in cmiss.items()}
        if entry["height_m"] is not None:
            heights.append(entry["height_m"])
        clinoforms.append(entry)
    if heights:
        values["clinoform_height_m"] = float(np.median(heights))
    else:
        missing["clinoform_height_m"] = (
            "no clinoforms picked" if not geometry.clinoforms else "no clinoform has both a break and a toe")
    values["clinoforms"] = clinoforms
    values["missing"] = missing
    return values
