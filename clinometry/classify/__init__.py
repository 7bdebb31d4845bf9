"""Margin family of one margin: ramp, rimmed shelf or steep margin.

:func:`classify` takes the metrics of ONE margin (a
:class:`~clinometry.metrics.metric_records.MarginMetrics` or a plain mapping such
as ``{"slope_max_deg": 4.0, "topset_gradient_deg": 0.02}``) and dispatches
to a classifier plugin of the ``clinometry.classifiers`` entry-point group
(built-in ``rules``, :func:`clinometry.classify.rules.classify_rules`).
Thresholds come from the cited table
:data:`~clinometry.classify.thresholds.DEFAULT_THRESHOLDS`, overridden by a
mapping or a TOML file.

.. caution::
   A margin family is an interpretation from geometry alone, with a
   confidence and reasons to check; it is not a prediction of reservoir,
   seal or slope stability.  Do not base drilling or storage decisions on it
   without calibration to wells and outcrops, review by licensed
   professionals, and the local regulations.
"""

from __future__ import annotations

import logging

from .._plugins import check_options, load_plugin
from ..errors import ClinometryError, PluginError
from .classification import FAMILIES, Classification
from .rules import metric_mapping
from .thresholds import (
    DEFAULT_THRESHOLDS,
    ResolvedThresholds,
    check_thresholds,
    default_thresholds,
    load_thresholds,
    resolve_thresholds,
)

__all__ = [
    "classify",
    "Classification",
    "FAMILIES",
    "DEFAULT_THRESHOLDS",
    "default_thresholds",
    "load_thresholds",
    "check_thresholds",
    "ResolvedThresholds",
    "resolve_thresholds",
]

logger = logging.getLogger(__name__)


def classify(margin_metrics_or_mapping, *, classifier: str = "rules", thresholds=None) -> Classification:
    """Classify one margin.

    Parameters
    ----------
    margin_metrics_or_mapping : MarginMetrics or mapping
        Metrics of one margin (names end in their unit, e.g. ``slope_max_deg``).
    classifier : str
        Name of a ``clinometry.classifiers`` plugin.
    thresholds : None, mapping, str, os.PathLike or ResolvedThresholds
        None for the defaults, a mapping of overrides, a TOML file
        (:func:`load_thresholds`), or a table resolved once for a whole run
        (:func:`resolve_thresholds`).

    Returns
    -------
    Classification

    Raises
    ------
    ThresholdsError
        Invalid threshold overrides.
    PluginError
        Unknown classifier, one whose signature does not fit (see
        :mod:`clinometry.plugins`), one that fails, or one that does not
        return a :class:`Classification`.

    Examples
    --------
    >>> classify({"slope_max_deg": 12.0, "topset_gradient_deg": 0.0}).family
    'rimmed_shelf'
    """
    table = resolve_thresholds(thresholds).table
    func = load_plugin("classifier", classifier)
    check_options("classifier", classifier, func, {}, passed=("thresholds",))
    m = metric_mapping(margin_metrics_or_mapping)
    try:
        out = func(m, thresholds=dict(table))
    except ClinometryError:
        raise
    except Exception as err:
        raise PluginError(f"classifier plugin {classifier!r} failed: {type(err).__name__}: {err}") from err
    if not isinstance(out, Classification):
        raise PluginError(f"classifier plugin {classifier!r} returned {type(out).__name__}, expected a Classification")
    return out
