"""The pipeline: the one place where the steps are chained.

:func:`run_analysis` runs read -> velocity model -> pick -> measure ->
classify on one line with the choices of an :class:`AnalysisOptions` and
returns the :class:`~clinometry.result.Result` with the section and velocity
model (:class:`LineAnalysis`); :func:`analyze` is the front door (keywords
in, Result out); :func:`measure_horizon` does the same for a horizon the
interpreter picked already.  See :mod:`clinometry.pipeline.chain` and
:mod:`clinometry.pipeline.analysis_options`.
"""

from .analysis_options import OPTION_NAMES, AnalysisOptions
from .chain import CAUTIONS, LineAnalysis, analyze, check_choices, measure, measure_horizon, run_analysis

__all__ = [
    "AnalysisOptions",
    "OPTION_NAMES",
    "LineAnalysis",
    "run_analysis",
    "analyze",
    "measure_horizon",
    "measure",
    "check_choices",
    "CAUTIONS",
]
