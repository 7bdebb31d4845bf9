"""Definitions shared by the measurement and the forward model's ground truth.

The metrics (:mod:`clinometry.metrics`) measure picked surfaces and the
forward model (:mod:`clinometry.synth.truth`) states the truth of the
surfaces it grew.  For truth and measurement to differ only by the picks,
both read the definitions below from this one module
(``tests/test_definitions.py`` pins that they do):

* the base of the maximum-slope secant, :func:`slope_base_length_m`;
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
    "SLOPE_BASE_MIN_M",
    "BASE_LENGTH_TRACES",
    "SLOPE_PRECISION_FRACTION",
    "SLOPE_QUANTUM_DEG",
    "TRAJECTORY_FLAT_DEG",
    "slope_base_length_m",
    "theil_sen_line",
]

#: shortest base of the maximum-slope secant, m (chosen here; common practice,
#: no source: one to two dominant wavelengths of 20-40 Hz data at 2-4 km/s
#: (lambda = v / f, 50-200 m), so the secant spans the lateral smear of the
#: wavelet and several traces of pick jitter; slope declivities in the
#: literature are measured over hundreds of metres -- Kenter 1990,
#: Sedimentology 37; Adams & Schlager 2000, J. Sed. Res. 70; from memory)
SLOPE_BASE_MIN_M = 150.0
#: shortest base of the maximum-slope secant, in trace spacings (chosen here; common
#: practice, no source: long enough that one depth sample over the base is
#: a few degrees at most, short enough to resolve a foreset of ~10 traces)
BASE_LENGTH_TRACES = 4
#: one depth sample over the default base is at most this fraction of the
#: mean foreset gradient (chosen here; common practice, no source: picks
#: carry about one sample of vertical error, so a shorter base reports pick
#: wiggles as slope -- a 0.8 deg ramp needs a base of ~2 km, a 20 deg
#: foreset ~70 m at 2.5 m samples)
SLOPE_PRECISION_FRACTION = 0.1
#: without a mean slope: one depth sample over the base is this slope, degrees
#: (chosen here)
SLOPE_QUANTUM_DEG = 1.0

#: half-width of the "flat" trajectory band when the picks resolve better,
#: degrees (chosen here: ~one 2.5 m depth sample over 1.5 km of progradation;
#: classes by sign after Helland-Hansen & Martinsen 1996, J. Sed. Res. 66:
#: 670-688, from memory).  The truth's breaks are exact, so there the
#: tolerance alone applies; the metric widens the band to the angle's pick
#: uncertainty.
TRAJECTORY_FLAT_DEG = 0.1


def slope_base_length_m(trace_spacing_m: float, depth_sample_m: float | None, mean_gradient=None, *,
                        min_base_m: float = SLOPE_BASE_MIN_M) -> float:
    """The base of the max-slope secant, m: one definition for measurement and truth.

    ``max(min_base_m, BASE_LENGTH_TRACES * trace_spacing_m,
    depth_sample_m / (SLOPE_PRECISION_FRACTION * mean_gradient))``; without a
    mean gradient (break or toe missing, or not deepening basinward) the
    last term is ``depth_sample_m / tan(SLOPE_QUANTUM_DEG)``, and without a
    depth sample (None) it is left out.

    Parameters
    ----------
    trace_spacing_m : float, m
    depth_sample_m : float or None, m
        One sample of the section converted to depth at the shelf break.
    mean_gradient : float, optional
        tan of the break-to-toe mean slope (> 0).
    min_base_m : float, m
        The floor of the base (default :data:`SLOPE_BASE_MIN_M`).

    Returns
    -------
    float, m

    Examples
    --------
    >>> round(slope_base_length_m(12.5, 2.5, np.tan(np.radians(20.0))), 1)
    150.0
    >>> round(slope_base_length_m(12.5, 2.5, np.tan(np.radians(0.8))), 0)
    1790.0
    """
    base = max(float(min_base_m), BASE_LENGTH_TRACES * float(trace_spacing_m))
    if depth_sample_m is None:
        return float(base)
    if mean_gradient is not None and mean_gradient > 0:
        vertical = depth_sample_m / (SLOPE_PRECISION_FRACTION * mean_gradient)
    else:
        vertical = depth_sample_m / np.tan(np.radians(SLOPE_QUANTUM_DEG))
    return float(max(base, vertical))


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
