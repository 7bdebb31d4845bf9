"""Definitions shared by the measurement and the forward model's ground truth.

The metrics (:mod:`clinometry.metrics`) measure picked surfaces and the
forward model (:mod:`clinometry.synth.truth`) states the truth of the
surfaces it grew.  For truth and measurement to differ only by the picks,
both read the definitions below from this one module
(``tests/test_definitions.py`` pins that they do):

* the maximum foreset slope, :func:`foreset_slope_deg`, over the base of
  :func:`slope_base_length_m` (with the pick scatter of :func:`pick_scatter_m`);
* the line through the shelf breaks, :func:`theil_sen_line` (Theil 1950;
  Sen 1968);
* the tolerance of the flat trajectory class, :data:`TRAJECTORY_FLAT_DEG`
  (the threshold table of :mod:`clinometry.classify.thresholds` starts
  from it too).

This module imports nothing from the package, so both sides may use it.
"""

from __future__ import annotations

import numpy as np

__all__ = [
    "BASE_LENGTH_TRACES",
    "SLOPE_PRECISION_FRACTION",
    "SLOPE_QUANTUM_DEG",
    "SLOPE_MAX_QUANTILE",
    "TRAJECTORY_FLAT_DEG",
    "slope_base_length_m",
    "pick_scatter_m",
    "pick_sigma_m",
    "slope_noise_gradient",
    "foreset_slope_deg",
    "theil_sen_line",
]

#: shortest base of the maximum-slope fit, in trace spacings: three traces,
#: the fewest that give a fitted dip rather than a two-point difference
#: (common practice, no source)
BASE_LENGTH_TRACES = 3
#: the pick scatter changes the fitted slope by at most this fraction of the
#: mean foreset gradient (chosen here; common practice, no source: a shorter
#: base reports pick wiggles as slope)
SLOPE_PRECISION_FRACTION = 0.1
#: without a mean slope, the gradient the precision refers to, degrees (chosen here)
SLOPE_QUANTUM_DEG = 1.0
#: the maximum foreset slope is this quantile of the fitted dips along the
#: foreset: its steepest fifth (our choice, no source; see
#: :func:`foreset_slope_deg`)
SLOPE_MAX_QUANTILE = 0.8

#: half-width of the "flat" shelf-break trajectory band, degrees: a break that
#: rises or falls by less than about 2 deg while it builds out -- 35 m over
#: 1 km of progradation, close to the depth error of breaks picked on seismic
#: -- is read as building out at one level (classes by sign after
#: Helland-Hansen & Martinsen 1996, J. Sed. Res. 66: 670-688, from memory; the
#: band is our choice).  The measured trajectory is ascending or descending
#: only where its whole P10-P90 range lies beyond the band.
TRAJECTORY_FLAT_DEG = 2.0


def slope_base_length_m(trace_spacing_m: float, depth_sample_m: float | None, mean_gradient=None, *,
                        pick_scatter_m: float = 0.0) -> float:
    """The base of the max-slope fit, m: one definition for measurement and truth.

    ``max(BASE_LENGTH_TRACES * trace_spacing_m, L_noise)``, where ``L_noise``
    is the shortest base over which a least-squares line through picks one
    trace apart, each with a depth error ``sigma``, has a slope error of at
    most :data:`SLOPE_PRECISION_FRACTION` of the mean gradient ``g``:
    ``sigma_slope = sigma sqrt(12 / N) / L`` with ``N = L / dx`` points (the
    standard error of a least-squares slope on evenly spaced points, e.g.
    Press et al. 2007, from memory), so
    ``L_noise = (sigma sqrt(12 dx) / (f g)) ** (2/3)``.  ``sigma`` is the
    larger of the quantisation error of one depth sample (``dz / sqrt(12)``)
    and the measured pick scatter.  Without a mean gradient (break or toe
    missing) ``g`` is ``tan(SLOPE_QUANTUM_DEG)``; without a depth sample
    (None) only the measured scatter counts.

    Parameters
    ----------
    trace_spacing_m : float, m
    depth_sample_m : float or None, m
        One sample of the section converted to depth at the shelf break.
    mean_gradient : float, optional
        tan of the break-to-toe mean slope (> 0).
    pick_scatter_m : float, m
        Scatter of the picks about a smooth profile (0 for an exact surface),
        e.g. from :func:`pick_scatter_m`.

    Returns
    -------
    float, m

    References
    ----------
    .. [1] Press, W. H., Teukolsky, S. A., Vetterling, W. T. & Flannery, B. P.
       (2007). Numerical Recipes, 3rd ed., section 15.2 (straight-line fit).
       (from memory)

    Examples
    --------
    >>> round(slope_base_length_m(25.0, 2.5, np.tan(np.radians(20.0))), 1)
    75.0
    >>> round(slope_base_length_m(12.5, 2.5, np.tan(np.radians(0.8))), 0)
    342.0
    """
    g = mean_gradient if mean_gradient is not None and mean_gradient > 0 else np.tan(np.radians(SLOPE_QUANTUM_DEG))
    sigma = pick_sigma_m(depth_sample_m, pick_scatter_m)
    noise = (sigma * np.sqrt(12.0 * trace_spacing_m) / (SLOPE_PRECISION_FRACTION * g)) ** (2.0 / 3.0)
    return float(max(BASE_LENGTH_TRACES * float(trace_spacing_m), noise))


def pick_sigma_m(depth_sample_m, pick_scatter_m=0.0) -> float:
    """Depth error (m) of one pick: the larger of one sample's quantisation and the measured scatter.

    The quantisation error of rounding to a grid of step ``dz`` is uniform,
    with standard deviation ``dz / sqrt(12)`` (e.g. Press et al. 2007, from
    memory).

    Examples
    --------
    >>> round(pick_sigma_m(2.5, 0.2), 3)
    0.722
    """
    return float(max(float(depth_sample_m or 0.0) / np.sqrt(12.0), float(pick_scatter_m or 0.0)))


def slope_noise_gradient(sigma_m: float, base_m: float, trace_spacing_m: float) -> float:
    """Standard error of a least-squares gradient over one base, from picks one trace apart.

    ``sigma / sqrt(sum (x - mean x)^2)`` with ``N = base / dx + 1`` evenly
    spaced picks, ``sum (x - mean x)^2 = dx^2 N (N^2 - 1) / 12`` (the standard
    error of a fitted slope, e.g. Press et al. 2007, from memory).

    Examples
    --------
    >>> round(slope_noise_gradient(1.0, 100.0, 25.0), 4)   # 5 picks
    0.0126
    """
    if not sigma_m or sigma_m <= 0 or trace_spacing_m <= 0:
        return 0.0
    n = max(2.0, float(base_m) / float(trace_spacing_m) + 1.0)
    return float(sigma_m / (trace_spacing_m * np.sqrt(n * (n * n - 1.0) / 12.0)))


def pick_scatter_m(depth_m) -> float:
    """Robust scatter (m) of picks one trace apart about a smooth profile.

    ``1.4826 * median(|second difference|) / sqrt(6)``: the second difference
    of independent errors of scatter ``sigma`` has variance ``6 sigma^2``, and
    1.4826 MAD is the normal-consistent robust sigma (Rousseeuw & Croux
    1993, from memory); a smooth profile has second differences far below
    its pick scatter.  0 with fewer than five picks.

    Examples
    --------
    >>> pick_scatter_m(np.arange(10.0))
    0.0
    """
    d = np.asarray(depth_m, dtype=float)
    if d.size < 5:
        return 0.0
    return float(1.4826 * np.median(np.abs(np.diff(d, 2))) / np.sqrt(6.0))


def _interp_rows(x0, step, ds, pos):
    """Row-wise linear interpolation on a uniform grid: ds (..., n), pos (...)."""
    n = ds.shape[-1]
    f = np.clip((np.asarray(pos, dtype=float) - x0) / step, 0.0, n - 1.0)
    i = np.minimum(np.floor(f).astype(np.int64), n - 2) if n > 1 else np.zeros(np.shape(f), np.int64)
    w = f - i
    lo = np.take_along_axis(ds, i[..., None], axis=-1)[..., 0]
    hi = np.take_along_axis(ds, np.minimum(i + 1, n - 1)[..., None], axis=-1)[..., 0]
    return lo * (1 - w) + hi * w


def foreset_slope_deg(xs, ds, lo_m, hi_m, base_m, *, quantile: float | None = None, noise_gradient: float = 0.0):
    """Maximum foreset slope: the steep end of the least-squares dips over a base length within ``[lo_m, hi_m]``.

    A straight line is fitted (least squares) to the profile over every
    window of ``base_m`` lying wholly inside ``[lo_m, hi_m]``; the
    :data:`SLOPE_MAX_QUANTILE` quantile of the fitted dips is returned (the
    steepest fifth of the foreset), but never less than the mean slope from
    ``lo_m`` to ``hi_m`` (a maximum is at least the mean; where the steep part
    is narrower than a fifth of the window the quantile would fall below it).  Fitting all points of the base, rather
    than taking the difference of its two ends, keeps pick scatter from
    reading as slope; a high quantile rather than the maximum, because the
    maximum of N noisy dips exceeds the true one by about
    ``sigma sqrt(2 ln N)`` (the expected maximum of N normal deviates, e.g.
    David & Nagaraja 2003, from memory), while along the straight part of a
    foreset, where the slope is steepest and nearly constant (Adams &
    Schlager 2000, from memory), quantile and maximum agree.  Vectorised over
    leading dimensions (Monte-Carlo draws).

    Parameters
    ----------
    xs : numpy.ndarray, shape (n,), m
        Uniform basinward grid.
    ds : numpy.ndarray, shape (..., n), m
        Depth on that grid (positive down).
    lo_m, hi_m : float or numpy.ndarray, shape (...), m
        Window (break and toe positions).
    base_m : float, m
        Base length; rounded to a whole number of grid steps (at least 2).
    quantile : float, optional
        Default :data:`SLOPE_MAX_QUANTILE`; 1 gives the steepest fit.
    noise_gradient : float, optional
        Standard error of one fitted gradient from the pick scatter
        (:func:`slope_noise_gradient`; 0 for an exact surface).  Noise
        widens the spread of the fitted dips, so their ``q`` quantile along
        the straight part of a foreset, where the true dip is nearly
        constant, exceeds it by ``z_q`` standard errors (``z_q`` the normal
        quantile, 0.84 at q = 0.8); that excess is taken off (for ``q`` < 1),
        and the result is still never below the mean slope.

    Returns
    -------
    numpy.ndarray, shape (...), degrees
        Positive when deepening basinward.  Where the window is shorter than
        one base, the least-squares slope over the whole window; NaN where
        ``hi_m <= lo_m``.

    Examples
    --------
    >>> xs = np.arange(0.0, 1001.0, 10.0)
    >>> ds = np.where(xs < 500, 0.0, (xs - 500) * np.tan(np.radians(10)))
    >>> round(float(foreset_slope_deg(xs, ds, 500.0, 1000.0, 40.0)), 6)
    10.0
    """
    xs = np.asarray(xs, dtype=float)
    ds = np.asarray(ds, dtype=float)
    lo = np.asarray(lo_m, dtype=float)
    hi = np.asarray(hi_m, dtype=float)
    step = float(xs[1] - xs[0]) if xs.size > 1 else 1.0
    k = max(2, int(round(base_m / step)))
    eps = 1e-6 * step
    shape = np.broadcast_shapes(ds.shape[:-1], lo.shape, hi.shape)
    best = np.full(shape, -np.inf)
    n = xs.size
    q = SLOPE_MAX_QUANTILE if quantile is None else float(quantile)
    if n > k:
        w = k + 1
        idx = np.arange(n, dtype=float)
        zero = np.zeros(ds.shape[:-1] + (1,))
        c0 = np.concatenate([zero, np.cumsum(ds, axis=-1)], axis=-1)
        c1 = np.concatenate([zero, np.cumsum(ds * idx, axis=-1)], axis=-1)
        s0 = c0[..., w:] - c0[..., :-w]
        s1 = c1[..., w:] - c1[..., :-w]
        centre = idx[: n - k] + 0.5 * k
        sxx = step * w * (w * w - 1) / 12.0
        slope = (s1 - centre * s0) / sxx
        ok = (xs[: n - k] >= lo[..., None] - eps) & (xs[k:] <= hi[..., None] + eps)
        vals = np.broadcast_to(np.where(ok, slope, np.nan), shape + (n - k,))
        has = np.any(np.isfinite(vals), axis=-1)
        # rows with no window inside get zeros (no all-NaN quantile), then -inf
        safe = np.where(has[..., None], vals, 0.0)
        best = np.where(has, np.nanquantile(safe, q, axis=-1), -np.inf)
        if noise_gradient and 0.0 < q < 1.0:
            from statistics import NormalDist

            best = best - NormalDist().inv_cdf(q) * float(noise_gradient)
    lo_b, hi_b = np.broadcast_to(lo, shape), np.broadcast_to(hi, shape)
    dd = np.broadcast_to(ds, shape + (n,))
    with np.errstate(invalid="ignore", divide="ignore"):
        chord = (_interp_rows(xs[0], step, dd, hi_b) - _interp_rows(xs[0], step, dd, lo_b)) / (hi_b - lo_b)
    # a maximum is never below the mean: where the steep part is narrower than a
    # fifth of the window the quantile falls below the chord from lo to hi (the
    # mean slope), the better lower bound of the steepest part
    best = np.where(np.isfinite(best) & np.isfinite(chord), np.maximum(best, chord), best)
    short = ~np.isfinite(best)
    if np.any(short):
        # window shorter than one base: the least-squares slope over the window
        inside = (xs >= lo_b[..., None] - eps) & (xs <= hi_b[..., None] + eps)
        cnt = inside.sum(axis=-1)
        with np.errstate(invalid="ignore", divide="ignore"):
            xm = (inside * xs).sum(-1) / np.maximum(cnt, 1)
            dm = (inside * dd).sum(-1) / np.maximum(cnt, 1)
            num = (inside * (xs - xm[..., None]) * (dd - dm[..., None])).sum(-1)
            den = (inside * (xs - xm[..., None]) ** 2).sum(-1)
            fit = np.where((cnt >= 2) & (den > 0), num / np.where(den > 0, den, 1.0), np.nan)
        fit = np.where(np.isfinite(fit), fit, chord)
        best = np.where(short, fit, best)
    best = np.where(np.broadcast_to(hi, shape) > np.broadcast_to(lo, shape), best, np.nan)
    return np.degrees(np.arctan(best))


def theil_sen_line(x, y) -> tuple[float, float]:
    """Theil-Sen line through points: the median of the pairwise slopes and the median intercept.

    Parameters
    ----------
    x, y : array_like, shape (n,)
        n >= 2 points.

    Returns
    -------
    slope, intercept : float
        Of ``y = intercept + slope * x`` (:func:`scipy.stats.theilslopes`).

    References
    ----------
    .. [1] Theil, H. (1950). A rank-invariant method of linear and
       polynomial regression analysis. Proc. Kon. Ned. Akad. Wetensch. 53.
       (from memory)
    .. [2] Sen, P. K. (1968). Estimates of the regression coefficient based
       on Kendall's tau. J. Am. Stat. Assoc. 63, 1379-1389. (from memory)

    Examples
    --------
    One point far off a line of slope 0.5 does not move the median slope
    (worked by hand: six pairwise slopes of 0.5, and 2.5, 3.17, 4.5, 8.5
    with the wild point; the median of the ten is 0.5):

    >>> slope, _ = theil_sen_line([0.0, 1.0, 2.0, 3.0, 4.0], [0.0, 0.5, 1.0, 1.5, 10.0])
    >>> slope
    0.5
    """
    from scipy.stats import theilslopes

    res = theilslopes(y, x)
    return float(res[0]), float(res[1])
