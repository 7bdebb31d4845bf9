"""clinometry: clinoform geometry of carbonate platform margins from seismic.

Data flows one way: read -> section (xarray) -> depth -> picks -> metrics ->
classification -> result -> reports/batch.  The public API is re-exported
here by name.
"""

from ._version import __version__  # noqa: F401

from .errors import (  # noqa: F401
    ClinometryError,
    ClinometryWarning,
    DataQualityWarning,
    FallbackWarning,
    GeometryError,
    HorizonFileError,
    PickingError,
    PluginError,
    ReviewFileError,
    SegyReadError,
    ThresholdsError,
    VelocityError,
)
from .section import check_section, make_section  # noqa: F401
from .io import read_section  # noqa: F401
from .picking import pick  # noqa: F401
from .classify import classify  # noqa: F401
from .result import Result  # noqa: F401
from .pipeline import AnalysisOptions, LineAnalysis, analyze, measure, measure_horizon, run_analysis  # noqa: F401
from .synth.bundle import demo_files  # noqa: F401

__all__ = [
    "__version__",
    "ClinometryError",
    "ClinometryWarning",
    "DataQualityWarning",
    "FallbackWarning",
    "GeometryError",
    "HorizonFileError",
    "PickingError",
    "PluginError",
    "ReviewFileError",
    "SegyReadError",
    "ThresholdsError",
    "VelocityError",
    "check_section",
    "make_section",
    "read_section",
    "pick",
    "classify",
    "Result",
    "AnalysisOptions",
    "LineAnalysis",
    "run_analysis",
    "analyze",
    "measure_horizon",
    "measure",
    "demo_files",
]
