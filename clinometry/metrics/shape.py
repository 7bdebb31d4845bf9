"""Profile shape of the foreset: planar, concave or sigmoidal (Adams & Schlager 2000).

Adams & Schlager (2000) described the depth profiles of carbonate and
siliciclastic slopes by the best of three simple curves fitted between the
shelf break and the toe: a straight line (*planar* slope), an exponential
(*concave* slope, steepest at the break and flattening basinward) and a
Gaussian (*sigmoidal* slope, a convex rollover at the break above a concave
lower slope).  The shape carries process information -- planar slopes near
the angle of repose, concave slopes where fine sediment is redistributed
basinward -- and is a useful secondary descriptor of a margin.

With ``x`` the basinward distance from the break and ``d`` the depth, the
three models are

* linear:      ``d = a + b x``
* exponential: ``d = c - a exp(-x / L)``
* Gaussian:    ``d = c - a exp(-x^2 / (2 s^2))``

fitted with :func:`scipy.optimize.curve_fit` (bounded trust-region with
analytic Jacobians, ``x`` and ``d`` scaled to the foreset width and relief
for conditioning).  The curved models are linear in ``c`` and ``a`` once the
scale is fixed, so the start values come from a coarse grid of scales with a
linear least-squares solve at each (variable projection, Golub & Pereyra
1973), which keeps the fit from stalling on a planar profile.
The best model is the one with the lowest Akaike information criterion
``AIC = n ln(RSS / n) + 2 k`` (Akaike 1974), which penalises the extra
parameter of the curved models so a straight slope is called planar; R^2 of
every fit is reported for the record.
"""

from __future__ import annotations

import logging
import warnings

import numpy as np

__all__ = ["SHAPE_MODELS", "SHAPE_CLASSES", "MIN_SHAPE_POINTS", "fit_profile_shape", "fitted_max_gradient", "shape_metrics"]

logger = logging.getLogger(__name__)

#: fitted models and the parameter count ``k`` used in the AIC
SHAPE_MODELS = {"linear": 2, "exponential": 3, "gaussian": 3}
#: profile class per best model (Adams & Schlager 2000, J. Sed. Res. 70: 814-828)
SHAPE_CLASSES = {"linear": "planar", "exponential": "concave", "gaussian": "sigmoidal"}
#: fewest profile points between break and toe for a fit: two more than the
#: largest parameter count (common practice, no source)
MIN_SHAPE_POINTS = 5


def _linear(x, a, b):
    return a + b * x


def _exponential(x, c, a, length):
    return c - a * np.exp(-x / length)


def _gaussian(x, c, a, sigma):
    return c - a * np.exp(-(x * x) / (2.0 * sigma * sigma))


def _linear_jac(x, a, b):
    return np.stack([np.ones_like(x), x], axis=-1)


def _exponential_jac(x, c, a, length):
    e = np.exp(-x / length)
    return np.stack([np.ones_like(x), -e, -a * e * x / length**2], axis=-1)


def _gaussian_jac(x, c, a, sigma):
    g = np.exp(-(x * x) / (2.0 * sigma * sigma))
    return np.stack([np.ones_like(x), -g, -a * g * x * x / sigma**3], axis=-1)


_FUNCS = {"linear": _linear, "exponential": _exponential, "gaussian": _gaussian}
_JACS = {"linear": _linear_jac, "exponential": _exponential_jac, "gaussian": _gaussian_jac}
#: scales (in units of the fitted width) tried for the start of the curved fits
_START_SCALES = np.logspace(-2.0, 2.5, 46)


def _start(name, u, v):
    """Start values: for fixed scale the curved models are linear in (c, a);
    take the scale of a coarse grid with the least squares (variable projection)."""
    if name == "linear":
        b, a = np.polyfit(u, v, 1)
        return [a, b]
    sc = _START_SCALES[:, None]
    basis = np.exp(-u / sc) if name == "exponential" else np.exp(-(u * u) / (2 * sc * sc))  # (n_scales, n)
    # normal equations of v ~ c - a * basis, solved for every scale at once
    n, sb, sbb = u.size, basis.sum(axis=1), (basis * basis).sum(axis=1)
    sv, sbv = v.sum(), (basis * v).sum(axis=1)
    det = n * sbb - sb * sb
    ok = det > 1e-12 * n * sbb
    det = np.where(ok, det, 1.0)
    c = (sbb * sv - sb * sbv) / det
    a = (sb * sv - n * sbv) / det
    rss = np.where(ok, ((c[:, None] - a[:, None] * basis - v) ** 2).sum(axis=1), np.inf)
    i = int(np.argmin(rss))
    return [float(c[i]), float(a[i]), float(_START_SCALES[i])]


def fit_profile_shape(distance_m, depth_m) -> dict:
    """Fit linear, exponential and Gaussian models to a break-to-toe profile.

    Parameters
    ----------
    distance_m : array_like, shape (n,), m
        Basinward distance from the shelf break (0 at the break).
    depth_m : array_like, shape (n,), m
        Depth, positive down.

    Returns
    -------
    dict
        ``profile_shape`` ("planar" | "concave" | "sigmoidal" or None),
        ``profile_fit_model``, ``profile_fit_r2`` (of the chosen model),
        ``fits``: model -> ``{"params": {...}, "r2", "aic"}`` or
        ``{"reason": ...}`` when that fit failed, and ``reason`` when no
        model could be fitted.

    Notes
    -----
    Parameters are returned in metres: linear ``a`` (m), ``b`` (m/m);
    exponential ``c``, ``a`` (m) and ``length_m``; Gaussian ``c``, ``a``
    (m) and ``sigma_m``.

    References
    ----------
    .. [1] Adams, E. W. & Schlager, W. (2000). Basic types of submarine slope
       curvature. Journal of Sedimentary Research 70: 814-828.
    .. [2] Akaike, H. (1974). A new look at the statistical model
       identification. IEEE Transactions on Automatic Control 19: 716-723.
    .. [3] Golub, G. H. & Pereyra, V. (1973). The differentiation of
       pseudo-inverses and nonlinear least squares problems whose variables
       separate. SIAM Journal on Numerical Analysis 10: 413-432.

    Examples
    --------
    >>> x = np.linspace(0.0, 1000.0, 21)
    >>> fit_profile_shape(x, 100.0 + 0.2 * x)["profile_shape"]
    'planar'
    """
    from scipy.optimize import curve_fit

    x = np.asarray(distance_m, dtype=float)
    d = np.asarray(depth_m, dtype=float)
    ok = np.isfinite(x) & np.isfinite(d)
    x, d = x[ok], d[ok]
    n = x.size
    if n < MIN_SHAPE_POINTS:
        return {"profile_shape": None, "reason": f"{n} profile point(s) between break and toe; need {MIN_SHAPE_POINTS}"}
    xs = float(np.ptp(x)) or 1.0
    d0 = float(d[0])
    ds = float(np.ptp(d)) or 1.0
    u = x / xs
    v = (d - d0) / ds
    ss_tot = float(np.sum((v - v.mean()) ** 2))
    if ss_tot <= 0:
        return {"profile_shape": None, "reason": "profile is flat between break and toe; no slope to fit"}
    bounds = {
        "linear": ([-np.inf, -np.inf], [np.inf, np.inf]),
        "exponential": ([-np.inf, -np.inf, 1e-3], [np.inf, np.inf, 1e3]),
        "gaussian": ([-np.inf, -np.inf, 1e-3], [np.inf, np.inf, 1e3]),
    }
    fits = {}
    # floor on the residual sum so that a perfect fit does not give log(0)
    rss_floor = n * (1e-12) ** 2
    for name, func in _FUNCS.items():
        try:
            p0 = _start(name, u, v)
            with warnings.catch_warnings():
                warnings.simplefilter("ignore")  # OptimizeWarning on a singular covariance; RSS is what we use
                popt, _ = curve_fit(func, u, v, p0=p0, bounds=bounds[name], jac=_JACS[name],
                                    method="trf", max_nfev=2000)
        except (RuntimeError, ValueError) as err:
            fits[name] = {"reason": f"{name} fit did not converge: {err}"}
            continue
        rss = float(np.sum((func(u, *popt) - v) ** 2))
        k = SHAPE_MODELS[name]
        aic = n * np.log(max(rss, rss_floor) / n) + 2 * k
        if name == "linear":
            a, b = popt
            params = {"a_m": d0 + ds * a, "gradient": b * ds / xs}
        elif name == "exponential":
            c, a, length = popt
            params = {"c_m": d0 + ds * c, "a_m": ds * a, "length_m": length * xs}
        else:
            c, a, sigma = popt
            params = {"c_m": d0 + ds * c, "a_m": ds * a, "sigma_m": sigma * xs}
        fits[name] = {"params": params, "r2": 1.0 - rss / ss_tot, "aic": float(aic)}
    good = {k: f for k, f in fits.items() if "aic" in f}
    if not good:
        return {"profile_shape": None, "fits": fits, "reason": "no shape model could be fitted"}
    order = list(SHAPE_MODELS)
    best = min(good, key=lambda k: (good[k]["aic"], order.index(k)))
    return {
        "profile_shape": SHAPE_CLASSES[best],
        "profile_fit_model": best,
        "profile_fit_r2": float(good[best]["r2"]),
        "fits": fits,
    }


def fitted_max_gradient(model: str, params: dict, width_m: float) -> float:
    """Steepest gradient (m/m) of a fitted profile model between 0 and ``width_m``.

    linear: ``b``; exponential: ``a / L`` at the break; Gaussian:
    ``a x / s^2 exp(-x^2 / 2 s^2)``, steepest at ``x = s`` (or at
    ``width_m`` when ``s`` lies beyond it).  Calculus of the model curves.

    Examples
    --------
    >>> round(fitted_max_gradient("exponential", {"a_m": 400.0, "length_m": 300.0}, 1500.0), 4)
    1.3333
    """
    if model == "linear":
        return float(params["gradient"])
    if model == "exponential":
        return float(params["a_m"] / params["length_m"])
    s = float(params["sigma_m"])
    x = min(s, float(width_m))
    return float(params["a_m"] * x / s**2 * np.exp(-x * x / (2 * s * s)))


def shape_metrics(geometry, *, min_points: int = MIN_SHAPE_POINTS) -> dict:
    """Profile shape between break and toe (planar / concave / sigmoidal) after Adams & Schlager (2000).

    Parameters
    ----------
    geometry : MarginGeometry
    min_points : int
        Fewest profile points between break and toe for a fit.

    Returns
    -------
    dict
        ``profile_shape``, ``profile_fit_model``, ``profile_fit_r2``, the
        R^2 of each model (``profile_fit_r2_linear``, ...) and
        ``slope_max_fit_deg`` (steepest slope of the chosen smooth model: a
        maximum slope that a single rough pick cannot move), or reasons in
        ``"missing"``.

    References
    ----------
    .. [1] Adams, E. W. & Schlager, W. (2000). Basic types of submarine slope
       curvature. Journal of Sedimentary Research 70: 814-828.
    """
    prof = geometry.profile
    keys = ("profile_shape", "profile_fit_model", "profile_fit_r2")
    brk, toe = prof.shelf_break, prof.toe
    if not (brk and toe):
        why = "; ".join(r for r in (prof.break_reason if not brk else "", prof.toe_reason if not toe else "") if r)
        return {"missing": {k: f"needs both break and toe: {why}" for k in keys}}
    m = (prof.basinward_m >= brk["basinward_m"] - 1e-9) & (prof.basinward_m <= toe["basinward_m"] + 1e-9)
    x = prof.basinward_m[m] - brk["basinward_m"]
    d = prof.depth_m[m]
    if x.size < min_points:
        return {"missing": {k: f"{x.size} profile point(s) between break and toe; need {min_points}" for k in keys}}
    fit = fit_profile_shape(x, d)
    if fit["profile_shape"] is None:
        return {"missing": {k: fit["reason"] for k in keys}}
    out = {k: fit[k] for k in keys}
    model = fit["profile_fit_model"]
    g = fitted_max_gradient(model, fit["fits"][model]["params"], float(x[-1]))
    out["slope_max_fit_deg"] = float(np.degrees(np.arctan(g)))
    for name, f in fit["fits"].items():
        if "r2" in f:
            out[f"profile_fit_r2_{name}"] = float(f["r2"])
    return out
