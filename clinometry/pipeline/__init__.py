"""The pipeline: the one place where the steps are chained.

:func:`analyze` runs read -> velocity model -> pick -> measure -> classify on
one line and returns a :class:`~clinometry.result.Result`; :func:`measure`
does the same for a horizon the interpreter picked already.  See
:mod:`clinometry.pipeline.run` and :mod:`clinometry.pipeline.horizons`.
"""

from .horizons import (  # noqa: F401
    HORIZON_MAX_OFFSET_TRACES,
    USER_HORIZON_MIN_RELIEF_M,
    USER_HORIZON_SMOOTHING_TRACES,
    picks_from_horizon,
    read_horizon_csv,
)
from .run import CAUTIONS, analyze, analyze_full, measure  # noqa: F401

__all__ = [
    "analyze",
    "analyze_full",
    "measure",
    "read_horizon_csv",
    "picks_from_horizon",
    "CAUTIONS",
    "HORIZON_MAX_OFFSET_TRACES",
    "USER_HORIZON_SMOOTHING_TRACES",
    "USER_HORIZON_MIN_RELIEF_M",
]
