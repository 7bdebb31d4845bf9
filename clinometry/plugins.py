"""Plugins: what a picker, a metric and a classifier receive and return, and how they are found.

clinometry runs three kinds of plugins, found through entry points of the
installed packages (the built-ins are registered the same way):

=========== ============================ ================================================
kind        entry-point group            built-ins
=========== ============================ ================================================
picker      ``clinometry.pickers``       ``default`` (automatic picking), ``horizons``
                                         (the interpreter's own horizon file)
metric      ``clinometry.metrics``       ``shape``, ``slope``, ``trajectory``
                                         (:data:`BUILTIN_METRICS`)
classifier  ``clinometry.classifiers``   ``rules``
=========== ============================ ================================================

A plugin is a plain callable: its data as the one positional argument, then
its options as named keyword-only parameters with defaults (no ``*args`` or
``**kwargs``), and the first line of its docstring says what it does.  The
three shapes are the protocols :class:`Picker`, :class:`Metric` and
:class:`Classifier` below.

The rules, checked when a plugin is loaded and before it is called:

* The signature must fit its kind (:func:`check_signature`): a picker
  accepts ``velocity=``, a classifier ``thresholds=``.  A plugin that does
  not fit is refused with a :class:`~clinometry.errors.PluginError` saying
  what to change; ``clinometry plugins`` lists it as broken.
* Options are refused unless the plugin declares them
  (:func:`check_options`), and a required option nobody gives is refused
  too, each naming the plugin and its options.
* The metrics that run are :data:`BUILTIN_METRICS` unless others are named
  (``metrics=`` in :class:`~clinometry.pipeline.AnalysisOptions`,
  ``--metric NAME`` on the command line): installing a package never changes
  results; an extra metric is opt-in by name.
* Every metric goes through the same door, the built-ins too: a metric
  receives the run values of :data:`RUN_VALUES` for the keywords of those
  names it declares (the trajectory's flat tolerance from the threshold
  table, the pick and velocity errors of the uncertainty settings), and the
  options given for it, which win.

After installing a plugin in a running session, call :func:`clear_cache`
so it is found.  ``tests/plugins/clinometry_demo_plugin/`` in the source
tree is a complete outside distribution.

.. caution::
   A plugin's numbers enter the same results, tables and review page as the
   built-ins' and carry the same cautions: they support interpretation and
   do not replace well control, local regulations or licensed practice.
"""

from __future__ import annotations

from typing import Protocol

from ._plugins import (
    GROUPS,
    check_options,
    check_signature,
    clear_cache,
    list_plugins,
    load_plugin,
    plugin_description,
    plugin_names,
    plugin_parameters,
)
from .classify.classification import FAMILIES, Classification
from .depth import VelocityModel
from .metrics import BUILTIN_METRICS, RUN_VALUES, MarginGeometry, SurfaceGeometry
from .picking.picks import ClinoformPicks, Horizon, MarginPicks, PickPoint, Picks

__all__ = [
    "Picker",
    "Metric",
    "Classifier",
    "GROUPS",
    "BUILTIN_METRICS",
    "RUN_VALUES",
    "plugin_names",
    "list_plugins",
    "load_plugin",
    "plugin_parameters",
    "plugin_description",
    "check_signature",
    "check_options",
    "clear_cache",
    "Picks",
    "Horizon",
    "MarginPicks",
    "ClinoformPicks",
    "PickPoint",
    "MarginGeometry",
    "SurfaceGeometry",
    "Classification",
    "FAMILIES",
    "VelocityModel",
]


class Picker(Protocol):
    """A picker: a section in, the picked horizons and margins out.

    Parameters
    ----------
    section : xarray.DataArray, dims ("trace", "z")
        The line as read (:mod:`clinometry.section`): ``z`` in ms TWT or m
        depth (attrs ``domain``), coordinates ``distance``, ``x``, ``y`` in m.
        Leave it unchanged.
    velocity : VelocityModel or None
        The run's velocity model (None for a depth section), for a picker
        that measures in depth (:func:`clinometry.depth.to_depth`).
    **options
        Its own keyword-only options, each with a default.

    Returns
    -------
    Picks
        Horizons (trace index and ``z`` in the section's units) and one
        :class:`MarginPicks` per margin (break, toe and clinoforms as
        :class:`PickPoint`); no margin with a note in ``notes`` when there is
        none.  ``picker`` names the plugin, ``parameters`` the options used.
    """

    def __call__(self, section, /, *, velocity: VelocityModel | None = None) -> Picks: ...


class Metric(Protocol):
    """A metric: the depth-converted geometry of one margin in, named values out.

    Parameters
    ----------
    geometry : MarginGeometry
        The margin profile, platform top and clinoforms in metres and
        basinward distance, with ``point()`` to make results-contract points.
    **options
        Its own keyword-only options, each with a default; a keyword named
        in :data:`RUN_VALUES` receives that value of the run.

    Returns
    -------
    dict
        Named values whose names end in their unit (``relief_m``,
        ``slope_max_deg``); ``None`` where not measurable, with the reason
        under the key ``"missing"`` (name -> reason).  The keys
        ``"clinoforms"`` and ``"trajectory"`` fill those fields of the
        margin.  A value name must not clash with a key of the results
        contract.
    """

    def __call__(self, geometry: MarginGeometry, /) -> dict: ...


class Classifier(Protocol):
    """A classifier: the metric values of one margin in, its family out.

    Parameters
    ----------
    values : mapping of str -> float, str or None
        The named values of one margin (as the metrics return them).
    thresholds : dict of str -> float
        The run's full threshold table
        (:data:`clinometry.classify.thresholds.DEFAULT_THRESHOLDS` with the
        user's overrides); a classifier may ignore it.
    **options
        Its own keyword-only options, each with a default.

    Returns
    -------
    Classification
        Family (one of :data:`FAMILIES`, or None with reasons), subtype,
        confidence in [0, 1] and readable reasons.
    """

    def __call__(self, values, /, *, thresholds: dict | None = None) -> Classification: ...
