"""Run the metric plugins on every margin of a section's picks, and the Monte Carlo.

:func:`measure_picks` turns the picks of one section into a
:class:`~clinometry.metrics.metric_records.Metrics` record.  For each margin it
depth-converts and orients the picked surfaces once
(:func:`~clinometry.metrics.margin_geometry.margin_geometry`), runs the metric
plugins of the ``clinometry.metrics`` entry-point group on that geometry
(built-ins: ``slope``, ``shape``, ``trajectory``), merges their named
values, and propagates velocity and pick errors to P10/P50/P90 by Monte
Carlo (:mod:`clinometry.metrics.uncertainty`).

A metric plugin is a plain callable ``(geometry, *, explicit keyword
options) -> dict``.  The keys ``"clinoforms"``, ``"trajectory"`` and
``"missing"`` of its dict fill the matching fields of
:class:`~clinometry.metrics.metric_records.MarginMetrics`; every other key is a
named value whose name ends in its unit.

.. caution::
   Slopes, depths and reliefs measured on seismic are interpretation aids
   with the uncertainty reported beside them; they rest on the velocity
   model and the picks.  Do not use them on their own for well planning,
   drilling, geohazard or storage-site decisions: calibrate with well ties,
   have the results reviewed by licensed professionals, and follow local
   regulations.
"""

from __future__ import annotations

import logging

import numpy as np

from .._plugins import list_plugins, load_plugin, plugin_parameters
from ..errors import ClinometryError, PluginError
from ..section import check_section, section_name
from .margin_geometry import MarginGeometry, margin_geometry
from .metric_records import MarginMetrics, Metrics
from .slope import FLANK_LENGTH_TRACES, local_length_m
from .uncertainty import propagate, uncertainty_settings

__all__ = ["measure_picks", "measure_margin"]

logger = logging.getLogger(__name__)

_STRUCTURED = ("clinoforms", "trajectory", "missing")


def _plugins(metrics):
    if metrics is None:
        return list_plugins("metric")
    if isinstance(metrics, str):
        metrics = [metrics]
    return {name: load_plugin("metric", name) for name in metrics}


def _platform_top_point(geometry: MarginGeometry, values: dict, flank_m: float) -> dict | None:
    """The highest point of the platform top within ``flank_m`` landward of the break.

    Without a break: the highest point of the platform top (or profile).
    """
    top = geometry.platform_top or geometry.profile
    brk = geometry.profile.shelf_break
    if brk is not None:
        keep = (top.basinward_m <= brk["basinward_m"] + 1e-9) & (top.basinward_m >= brk["basinward_m"] - flank_m - 1e-9)
    else:
        keep = np.ones(len(top), dtype=bool)
    if not keep.any():
        return None
    idx = np.flatnonzero(keep)
    i = int(idx[np.argmin(top.depth_m[idx])])
    pt = geometry.point(int(top.trace[i]), float(top.z[i]), float(top.depth_m[i]))
    pt["horizon_id"] = top.horizon_id
    pt["depth_min_m"] = float(np.min(top.depth_m[keep]))
    pt["depth_max_m"] = float(np.max(top.depth_m[keep]))
    if values.get("topset_gradient_deg") is not None:
        pt["gradient_deg"] = values["topset_gradient_deg"]
    return pt


def _profile_for_plot(geometry: MarginGeometry) -> dict:
    p = geometry.profile
    with np.errstate(divide="ignore", invalid="ignore"):
        slope = np.degrees(np.arctan(np.gradient(p.depth_m, p.basinward_m))) if len(p) > 1 else np.zeros(len(p))
    return {
        "trace": p.trace.tolist(),
        "distance_m": geometry.distance_of(p.basinward_m).tolist(),
        "basinward_m": p.basinward_m.tolist(),
        "depth_m": p.depth_m.tolist(),
        "slope_deg": slope.tolist(),
    }


def measure_margin(geometry: MarginGeometry, *, plugins: dict, options: dict | None = None,
                   settings: dict | None = None, section=None, velocity=None,
                   base_length_m: float | None = None) -> MarginMetrics:
    """Run metric plugins and the uncertainty on one margin geometry.

    Parameters
    ----------
    geometry : MarginGeometry
    plugins : dict of str -> callable
        Metric plugins by name.
    options : dict of str -> dict, optional
        Keyword options per plugin name.
    settings : dict, optional
        Monte-Carlo settings from
        :func:`~clinometry.metrics.uncertainty.uncertainty_settings`; None
        or {} to skip.
    section, velocity
        For the uncertainty's velocity check.
    base_length_m : float, m, optional
        Passed to every plugin that takes it, and to the uncertainty.

    Returns
    -------
    MarginMetrics

    Raises
    ------
    PluginError
        A plugin raised an error that is not a :class:`ClinometryError`, or
        returned something that is not a dict.
    """
    values, missing, clinoforms, trajectory = {}, {}, (), None
    options = options or {}
    for name, func in plugins.items():
        kw = dict(options.get(name, {}))
        if base_length_m is not None and "base_length_m" in plugin_parameters(func):
            kw.setdefault("base_length_m", base_length_m)
        try:
            out = func(geometry, **kw)
        except ClinometryError:
            raise
        except Exception as err:
            raise PluginError(f"{geometry.name}: metric plugin {name!r} failed on margin {geometry.direction}: "
                              f"{type(err).__name__}: {err}") from err
        if not isinstance(out, dict):
            raise PluginError(f"metric plugin {name!r} returned {type(out).__name__}, expected a dict of named values")
        for k, v in out.items():
            if k == "missing":
                missing.update(v)
            elif k == "clinoforms":
                clinoforms = tuple(v)
            elif k == "trajectory":
                trajectory = v
            else:
                values[k] = v
    for k in list(missing):
        if k in values and values[k] is not None:
            del missing[k]
    flank = (options.get("slope", {}).get("flank_length_m")
             or FLANK_LENGTH_TRACES * geometry.trace_spacing_m) + local_length_m(geometry)
    unc = {}
    if settings:
        unc = propagate(geometry, settings=settings, section=section, velocity=velocity, base_length_m=base_length_m)
    return MarginMetrics(
        direction=geometry.direction,
        values=values,
        uncertainty=unc,
        platform_top=_platform_top_point(geometry, values, flank),
        shelf_break=geometry.pick_point(geometry.profile.shelf_break),
        toe=geometry.pick_point(geometry.profile.toe),
        clinoforms=clinoforms,
        trajectory=trajectory,
        missing=missing,
        profile=_profile_for_plot(geometry),
        confidence=geometry.confidence,
    )


def measure_picks(picks, section, *, velocity=None, metrics=None, uncertainty=True, seed: int = 0,
            options: dict | None = None, base_length_m: float | None = None) -> Metrics:
    """Measure every margin of a section's picks in metres and true degrees.

    Parameters
    ----------
    picks : Picks
        From :func:`clinometry.picking.pick` (or built by hand).
    section : xarray.DataArray, dims ("trace", "z")
        The section the picks were made on.
    velocity : velocity model, optional
        A model of :mod:`clinometry.depth`; required for TWT sections
        (choose a default with ``clinometry.depth.velocity_from_options``),
        None for depth sections.
    metrics : list of str, optional
        Names of metric plugins to run; default all installed.
    uncertainty : bool or dict
        Monte-Carlo propagation on (default), off, or settings overriding
        :data:`UNCERTAINTY_DEFAULTS`.
    seed : int
        Seed of the Monte-Carlo draws.
    options : dict of str -> dict, optional
        Keyword options per metric plugin, e.g. ``{"slope": {"flank_length_m": 800}}``.
    base_length_m : float, m, optional
        Base of the max-slope secant (default: see
        :func:`clinometry.metrics.slope.base_length_m_for`).

    Returns
    -------
    Metrics
        One :class:`MarginMetrics` per margin, same order as ``picks.margins``.

    Raises
    ------
    VelocityError
        TWT section and no velocity.
    GeometryError
        Picks that do not fit the section.
    PluginError
        Unknown or failing metric plugin.

    Examples
    --------
    >>> from clinometry.section import make_section
    >>> from clinometry.picking.picks import Horizon, MarginPicks, PickPoint, Picks
    >>> s = make_section(np.zeros((41, 2)), z=[0.0, 500.0], domain="depth", trace_spacing_m=25.0)
    >>> z = np.clip((np.arange(41) - 10) * 25.0 * np.tan(np.radians(20)), 0, 182)
    >>> h = Horizon(0, "margin_profile", np.arange(41), 100 + z, np.ones(41))
    >>> m = MarginPicks("+", 0, 0, PickPoint(10, 100.0), PickPoint(30, 100 + z[30]))
    >>> mm = measure_picks(Picks(horizons=(h,), margins=(m,)), s, metrics=["slope"], uncertainty=False).margins[0]
    >>> round(mm.values["slope_max_deg"], 3), round(mm.values["relief_m"], 1)
    (20.0, 182.0)
    """
    check_section(section)
    plugins = _plugins(metrics)
    settings = uncertainty_settings(uncertainty, seed=seed)
    out = []
    for margin in picks.margins:
        geom = margin_geometry(picks, margin, section, velocity)
        out.append(measure_margin(geom, plugins=plugins, options=options, settings=settings, section=section,
                                  velocity=velocity, base_length_m=base_length_m))
    if velocity is not None and hasattr(velocity, "to_dict"):
        vdict = dict(velocity.to_dict())
    elif section.attrs["domain"] == "depth":
        vdict = {"model": "none", "note": "depth-domain section: no conversion"}
    else:
        vdict = {}
    logger.debug("%s: measured %d margin(s) with %s", section_name(section), len(out), ", ".join(plugins))
    return Metrics(margins=tuple(out), velocity=vdict, uncertainty_settings=settings)
