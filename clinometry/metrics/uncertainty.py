"""Monte-Carlo uncertainty of slope, relief and break depth.

Two errors dominate a margin measured on seismic: the velocity used for
depth conversion and the position of the picks.  We propagate both by Monte
Carlo (Metropolis & Ulam 1949) -- draw the inputs, recompute the numbers,
read percentiles -- because the metrics are non-linear (a maximum over
windows, an arctangent) and a linearised error formula would hide the skew.

Model of the errors (defaults in :data:`UNCERTAINTY_DEFAULTS`):

velocity
    One factor ``f`` per draw, normal with mean 1 and standard deviation
    ``velocity_sigma_fraction`` (8 % as one sigma by default, a common figure
    for velocities from stacking or well ties; common practice, no source),
    clipped at 3 sigma.  The model is ``velocity.scaled(f)``; scaling
    velocity by ``f`` at every time scales every depth by ``f``, which is
    checked once per margin and then used to vectorise over the draws (if a
    model does not scale that way, the draws call the scaled model one by
    one).  Depth-domain sections have no velocity error here.
picks
    The break and the toe each move along the profile by a normal error of
    ``pick_sigma_traces`` trace spacings, and their depths by a normal error
    of ``pick_sigma_samples`` samples (converted to metres with the local
    velocity).  Between them the depth error is interpolated linearly along
    the foreset: a tracked horizon's error is correlated along it, and
    independent point errors would overstate the spread of a secant slope.

The draws are vectorised (no re-picking, no loop over draws), so the default
200 draws cost a few milliseconds per margin and the propagation is on by
default, also in batches.  Results are reproducible with ``seed``
(``numpy.random.default_rng``).

The numbers reported are P10/P50/P90 (10th, 50th, 90th percentiles) of
``slope_max_deg``, ``slope_mean_deg``, ``relief_m`` and ``break_depth_m``,
the usual low/mid/high case of reserves and resource reporting (SPE PRMS
2018 uses P90/P50/P10 for 1P/2P/3P; from memory).
"""

from __future__ import annotations

import logging

import numpy as np

from ..depth import to_depth
from ..definitions import _interp_rows, foreset_slope_deg
from .slope import base_length_m_for, grid_surface, slope_noise_for

__all__ = ["UNCERTAINTY_DEFAULTS", "uncertainty_settings", "propagate"]

logger = logging.getLogger(__name__)

#: default error model (common practice, no source: 8 % one-sigma velocity
#: error; one sample and one trace of pick error; 200 draws give P10/P90 to
#: within about +-0.1 sigma)
UNCERTAINTY_DEFAULTS = {
    "n_draws": 200,
    "velocity_sigma_fraction": 0.08,
    "pick_sigma_samples": 1.0,
    "pick_sigma_traces": 1.0,
}
#: clip of the velocity factor, in sigmas (chosen here: keeps f > 0 for any
#: allowed sigma; moves 0.27 % of the draws)
_TRUNCATE_SIGMA = 3.0
_PERCENTILES = (10.0, 50.0, 90.0)


def uncertainty_settings(uncertainty=True, *, seed: int = 0) -> dict:
    """The Monte-Carlo settings for an ``uncertainty=`` option; {} when off.

    Parameters
    ----------
    uncertainty : bool or dict
        True for :data:`UNCERTAINTY_DEFAULTS`, False for none, or a dict
        overriding some of them.
    seed : int

    Raises
    ------
    ValueError
        Unknown key or a value out of range.

    Examples
    --------
    >>> uncertainty_settings({"n_draws": 50}, seed=3)["n_draws"]
    50
    """
    if uncertainty is False or uncertainty is None:
        return {}
    out = dict(UNCERTAINTY_DEFAULTS)
    if isinstance(uncertainty, dict):
        unknown = set(uncertainty) - set(out)
        if unknown:
            raise ValueError(f"unknown uncertainty setting(s) {sorted(unknown)}; known: {sorted(out)}")
        out.update(uncertainty)
    elif uncertainty is not True:
        raise ValueError(f"uncertainty must be True, False or a dict, got {uncertainty!r}")
    if int(out["n_draws"]) < 2:
        raise ValueError(f"uncertainty n_draws must be >= 2, got {out['n_draws']}")
    for k in ("velocity_sigma_fraction", "pick_sigma_samples", "pick_sigma_traces"):
        if not (np.isfinite(out[k]) and out[k] >= 0):
            raise ValueError(f"uncertainty {k} must be a finite number >= 0, got {out[k]!r}")
    if out["velocity_sigma_fraction"] * _TRUNCATE_SIGMA >= 1:
        raise ValueError(f"uncertainty velocity_sigma_fraction {out['velocity_sigma_fraction']} is too large "
                         f"(must be < {1 / _TRUNCATE_SIGMA:.3f} so velocities stay positive)")
    out["n_draws"] = int(out["n_draws"])
    out["seed"] = int(seed)
    out["velocity_distribution"] = "normal, mean 1, clipped at 3 sigma"
    out["pick_distribution"] = "normal at break and toe, linear along the foreset"
    return out


def _velocity_factors(rng, n, sigma):
    f = 1.0 + sigma * rng.standard_normal(n)
    return np.clip(f, 1.0 - _TRUNCATE_SIGMA * sigma, 1.0 + _TRUNCATE_SIGMA * sigma)


def _scales_linearly(section, velocity, surface, factor) -> bool:
    """Whether ``velocity.scaled(factor)`` multiplies the surface depths by ``factor``."""
    d = to_depth(section, surface.trace, surface.z, velocity.scaled(factor))
    return bool(np.allclose(d, factor * surface.depth_m, rtol=1e-6, atol=1e-6))


def _percentiles(a) -> dict:
    a = np.asarray(a, dtype=float)
    a = a[np.isfinite(a)]
    if a.size == 0:
        return {}
    p10, p50, p90 = np.percentile(a, _PERCENTILES)
    return {"p10": float(p10), "p50": float(p50), "p90": float(p90)}


def propagate(geometry, *, settings: dict, section=None, velocity=None, base_length_m: float | None = None) -> dict:
    """P10/P50/P90 of slope max/mean, relief and break depth by Monte Carlo.

    Parameters
    ----------
    geometry : MarginGeometry
    settings : dict
        From :func:`uncertainty_settings` (includes ``seed``).
    section : xarray.DataArray, optional
        Required with a velocity model (TWT sections): the picks are
        re-converted with the scaled models.
    velocity : velocity model, optional
        The run's model (None for depth sections: no velocity error).
    base_length_m : float, m, optional
        As for :func:`clinometry.metrics.slope.slope_metrics`.

    Returns
    -------
    dict
        ``{"slope_max_deg": {"p10", "p50", "p90"}, "slope_mean_deg": ...,
        "relief_m": ..., "break_depth_m": ...}``; a metric is left out when
        its pick is missing.

    Raises
    ------
    ValueError
        A velocity model without the section.

    References
    ----------
    .. [1] Metropolis, N. & Ulam, S. (1949). The Monte Carlo method. Journal
       of the American Statistical Association 44: 335-341.
    """
    prof = geometry.profile
    brk, toe = prof.shelf_break, prof.toe
    if brk is None and toe is None:
        return {}
    n = settings["n_draws"]
    rng = np.random.default_rng(settings["seed"])
    base = base_length_m_for(geometry, base_length_m)
    step = geometry.trace_spacing_m / 2.0
    xs, ds = grid_surface(prof, step)

    # velocity factor per draw
    sig_v = settings["velocity_sigma_fraction"] if geometry.domain == "twt" and velocity is not None else 0.0
    if sig_v > 0 and section is None:
        raise ValueError(f"{geometry.name}: propagate needs the section to apply velocity errors; pass section=")
    f = _velocity_factors(rng, n, sig_v) if sig_v > 0 else np.ones(n)
    per_draw_depth = None
    if sig_v > 0 and not _scales_linearly(section, velocity, prof, 1.0 + sig_v):
        logger.debug("%s: velocity.scaled does not scale depth linearly; converting per draw", geometry.name)
        per_draw_depth = np.stack([
            np.interp(xs, prof.basinward_m, to_depth(section, prof.trace, prof.z, velocity.scaled(fi))) for fi in f
        ])

    # pick errors: position (traces) and depth (samples -> m) at break and toe
    dz_m = np.interp(xs, prof.basinward_m, prof.dz_depth_m) * geometry.sample_interval
    sig_b = settings["pick_sigma_traces"] * geometry.trace_spacing_m
    sig_z = settings["pick_sigma_samples"]

    def _end(pick, default_pos):
        if pick is None:
            return np.full(n, default_pos), np.zeros(n), 0.0
        pos = pick["basinward_m"] + sig_b * rng.standard_normal(n)
        pos = np.clip(pos, xs[0], xs[-1])
        err = sig_z * rng.standard_normal(n) * np.interp(pos, xs, dz_m)
        # the pick's own offset from the profile (picked z vs tracked z)
        off = pick["depth_m"] - float(np.interp(pick["basinward_m"], xs, ds))
        return pos, err, off

    b_pos, b_err, b_off = _end(brk, xs[0])
    t_pos, t_err, t_off = _end(toe, xs[-1])
    # depth error field: linear between break and toe, constant beyond
    span = np.where(t_pos > b_pos, t_pos - b_pos, 1.0)
    w = np.clip((xs[None, :] - b_pos[:, None]) / span[:, None], 0.0, 1.0)
    field = b_err[:, None] * (1 - w) + t_err[:, None] * w
    base_depth = per_draw_depth if per_draw_depth is not None else f[:, None] * ds[None, :]
    dd = base_depth + field

    out = {}
    smax = foreset_slope_deg(xs, dd, b_pos, t_pos, base, noise_gradient=slope_noise_for(geometry, base))
    out["slope_max_deg"] = _percentiles(smax)
    if brk is not None:
        d_brk = _interp_rows(xs[0], step, dd, b_pos) + f * b_off
        out["break_depth_m"] = _percentiles(d_brk)
    if brk is not None and toe is not None:
        d_toe = _interp_rows(xs[0], step, dd, t_pos) + f * t_off
        relief = d_toe - d_brk
        width = t_pos - b_pos
        mean = np.where(width > 0, np.degrees(np.arctan2(relief, np.where(width > 0, width, 1.0))), np.nan)
        out["relief_m"] = _percentiles(relief)
        out["slope_mean_deg"] = _percentiles(mean)
    return {k: v for k, v in out.items() if v}
