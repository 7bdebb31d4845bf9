"""Margin metrics: true slope angles, relief, profile shape and shelf-break trajectory.

:func:`measure_picks` turns the picks of one section into a
:class:`~clinometry.metrics.metric_records.Metrics` record: each margin is
depth-converted and oriented once
(:mod:`clinometry.metrics.margin_geometry`), the metric plugins run on that
geometry (built-ins :data:`BUILTIN_METRICS`: ``shape``, ``slope``,
``trajectory``), and velocity and pick errors go to P10/P50/P90 by Monte
Carlo (:mod:`clinometry.metrics.uncertainty`).  The dispatch lives in
:mod:`clinometry.metrics.dispatch`; the plugin protocol is described in
:mod:`clinometry.plugins`.

.. caution::
   Slopes, depths and reliefs measured on seismic are interpretation aids
   with the uncertainty reported beside them; they rest on the velocity
   model and the picks.  Do not use them on their own for well planning,
   drilling, geohazard or storage-site decisions: calibrate with well ties,
   have the results reviewed by licensed professionals, and follow local
   regulations.
"""

from .dispatch import BUILTIN_METRICS, RUN_VALUES, load_metrics, measure_margin, measure_picks, run_values
from .margin_geometry import MarginGeometry, SurfaceGeometry
from .metric_records import POINT_KEYS, MarginMetrics, Metrics
from .uncertainty import UNCERTAINTY_DEFAULTS

#: the old name of :func:`measure_picks`, kept for scripts that use it
measure = measure_picks

__all__ = [
    "BUILTIN_METRICS",
    "RUN_VALUES",
    "load_metrics",
    "run_values",
    "measure_picks",
    "measure",
    "measure_margin",
    "MarginGeometry",
    "SurfaceGeometry",
    "MarginMetrics",
    "Metrics",
    "POINT_KEYS",
    "UNCERTAINTY_DEFAULTS",
]
