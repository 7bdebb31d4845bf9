"""Run the metric plugins on every margin of a section's picks, and the Monte Carlo.

:func:`measure_picks` turns the picks of one section into a
:class:`~clinometry.metrics.metric_records.Metrics` record.  For each margin it
depth-converts and orients the picked surfaces once
(:func:`~clinometry.metrics.margin_geometry.margin_geometry`), runs the metric
plugins on that geometry, merges their named values, and propagates velocity
and pick errors to P10/P50/P90 by Monte Carlo
(:mod:`clinometry.metrics.uncertainty`).

The metrics run are the built-in set :data:`BUILTIN_METRICS` unless the
caller names others: installing a package never changes what runs, an extra
metric is opt-in by name.  Every metric, built-in or not, goes through the
same door (:func:`load_metrics`): it is loaded and its signature checked,
the options given for it are checked against its keywords, and it receives
the values of the run listed in :data:`RUN_VALUES` for every keyword of
that name it declares.  Options given for a metric win over run values.

A metric plugin is a plain callable ``(geometry, *, explicit keyword
options) -> dict``.  The keys ``"clinoforms"``, ``"trajectory"`` and
``"missing"`` of its dict fill the matching fields of
:class:`~clinometry.metrics.metric_records.MarginMetrics`; every other key is a
named value whose name ends in its unit (see :mod:`clinometry.plugins`).
The cautions of :mod:`clinometry.metrics` apply to every number made here.
"""

from __future__ import annotations

import logging

import numpy as np

from .._plugins import check_options, load_plugin, plugin_parameters
from ..errors import ClinometryError, PluginError
from ..section import check_section, section_name
from .margin_geometry import MarginGeometry, margin_geometry
from .metric_records import MarginMetrics, Metrics
from .slope import FLANK_LENGTH_TRACES, local_length_m
from .uncertainty import UNCERTAINTY_DEFAULTS, propagate, uncertainty_settings

__all__ = ["BUILTIN_METRICS", "RUN_VALUES", "load_metrics", "run_values", "measure_picks", "measure_margin"]

logger = logging.getLogger(__name__)

#: the metrics run when none are named, in this order (also the order of
#: their values in the results): the built-ins registered in setup.cfg
BUILTIN_METRICS = ("shape", "slope", "trajectory")

#: values of the run that a metric receives for each keyword of this name it
#: declares: the base of the max-slope secant (m, when the caller fixes it),
#: the flat trajectory tolerance (degrees, from the threshold table), and the
#: one-sigma pick and velocity errors of the uncertainty settings (samples,
#: trace spacings, fraction)
RUN_VALUES = ("base_length_m", "flat_deg", "pick_sigma_samples", "pick_sigma_traces", "velocity_sigma_fraction")

_STRUCTURED = ("clinoforms", "trajectory", "missing")


def load_metrics(metrics=None, metric_options=None, *, run_value_names=RUN_VALUES) -> dict:
    """Load the named metric plugins and check the options given for them.

    Parameters
    ----------
    metrics : str or sequence of str, optional
        Plugin names, in the order they run; default :data:`BUILTIN_METRICS`.
    metric_options : dict of str -> dict, optional
        Keyword options per metric name.
    run_value_names : iterable of str
        Names of the run values that will be offered (they count as given).

    Returns
    -------
    dict of str -> callable

    Raises
    ------
    PluginError
        An unknown or broken metric, a signature that does not fit
        (:func:`clinometry.plugins.check_signature`), options for a metric
        that is not run, or options a metric does not declare.
    """
    names = BUILTIN_METRICS if metrics is None else (metrics,) if isinstance(metrics, str) else tuple(metrics)
    plugins = {name: load_plugin("metric", name) for name in names}
    options = dict(metric_options or {})
    stray = [k for k in options if k not in plugins]
    if stray:
        raise PluginError(f"options given for metric(s) {', '.join(map(repr, stray))}, which are not run "
                          f"(running: {', '.join(plugins) or 'none'}); add them to the metrics")
    for name, func in plugins.items():
        check_options("metric", name, func, options.get(name, {}), passed=run_value_names)
    return plugins


def run_values(*, settings=None, base_length_m=None, flat_deg=None) -> dict:
    """The values of the run offered to the metrics (:data:`RUN_VALUES`).

    Parameters
    ----------
    settings : dict, optional
        Monte-Carlo settings (:func:`~clinometry.metrics.uncertainty.uncertainty_settings`);
        without them the pick and velocity errors of
        :data:`~clinometry.metrics.uncertainty.UNCERTAINTY_DEFAULTS`.
    base_length_m : float, m, optional
        Offered only when given.
    flat_deg : float, degrees, optional
        Offered only when given.

    Returns
    -------
    dict

    Examples
    --------
    >>> sorted(run_values(flat_deg=0.5))
    ['flat_deg', 'pick_sigma_samples', 'pick_sigma_traces', 'velocity_sigma_fraction']
    """
    st = settings or UNCERTAINTY_DEFAULTS
    out = {k: float(st[k]) for k in ("pick_sigma_samples", "pick_sigma_traces", "velocity_sigma_fraction")}
    if base_length_m is not None:
        out["base_length_m"] = base_length_m
    if flat_deg is not None:
        out["flat_deg"] = float(flat_deg)
    return out


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
                   base_length_m: float | None = None, values_of_run: dict | None = None) -> MarginMetrics:
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
    values_of_run : dict, optional
        Values of the run (:func:`run_values`); each plugin gets those it
        declares a keyword for.  Its own ``options`` win.

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
    offered = dict(values_of_run or {})
    if base_length_m is not None:
        offered["base_length_m"] = base_length_m
    for name, func in plugins.items():
        declared = plugin_parameters(func)
        kw = {k: v for k, v in offered.items() if k in declared}
        kw.update(options.get(name, {}))
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


def measure_picks(picks, section, *, velocity=None, metrics=None, metric_options: dict | None = None,
                  uncertainty=True, seed: int = 0, base_length_m: float | None = None,
                  flat_deg: float | None = None) -> Metrics:
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
        Names of metric plugins to run, in order; default
        :data:`BUILTIN_METRICS` (other installed metrics run only when
        named).
    metric_options : dict of str -> dict, optional
        Keyword options per metric plugin, e.g. ``{"slope": {"flank_length_m": 800}}``.
    uncertainty : bool or dict
        Monte-Carlo propagation on (default), off, or settings overriding
        :data:`~clinometry.metrics.uncertainty.UNCERTAINTY_DEFAULTS`.
    seed : int
        Seed of the Monte-Carlo draws.
    base_length_m : float, m, optional
        Base of the max-slope secant (default: see
        :func:`clinometry.metrics.slope.base_length_m_for`).
    flat_deg : float, degrees, optional
        Tolerance of the flat trajectory class, offered to the metrics that
        declare ``flat_deg`` (the pipeline passes the threshold table's
        ``trajectory_flat_deg``); default each metric's own.

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
        Unknown or failing metric plugin, or options it does not declare.

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
    settings = uncertainty_settings(uncertainty, seed=seed)
    offered = run_values(settings=settings, base_length_m=base_length_m, flat_deg=flat_deg)
    plugins = load_metrics(metrics, metric_options, run_value_names=offered)
    out = []
    for margin in picks.margins:
        geom = margin_geometry(picks, margin, section, velocity)
        out.append(measure_margin(geom, plugins=plugins, options=metric_options, settings=settings, section=section,
                                  velocity=velocity, base_length_m=base_length_m, values_of_run=offered))
    if velocity is not None and hasattr(velocity, "to_dict"):
        vdict = dict(velocity.to_dict())
    elif section.attrs["domain"] == "depth":
        vdict = {"model": "none", "note": "depth-domain section: no conversion"}
    else:
        vdict = {}
    logger.debug("%s: measured %d margin(s) with %s", section_name(section), len(out), ", ".join(plugins))
    return Metrics(margins=tuple(out), velocity=vdict, uncertainty_settings=settings)
