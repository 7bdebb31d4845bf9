"""One hierarchy of exceptions and warnings for clinometry.

Every error that the package raises on purpose is a :class:`ClinometryError`.
Errors about bad input also subclass :class:`ValueError`, so callers that only
know the standard library can still catch them.  A message names the file
(and the line or trace where that matters), the problem with the values seen,
and what to try, for example::

    line_07.sgy: sample interval is 0 in both binary and trace headers;
    pass sample_interval= if you know it

Warnings that flag data a caller should look at (masked dead traces, a
fallback that was taken) are :class:`ClinometryWarning` subclasses; the same
fact is also recorded in the section attrs or the result, so it survives a
batch run.
"""

__all__ = [
    "ClinometryError",
    "SegyReadError",
    "GeometryError",
    "VelocityError",
    "PickingError",
    "ThresholdsError",
    "PluginError",
    "HorizonFileError",
    "ReviewFileError",
    "ClinometryWarning",
    "DataQualityWarning",
    "FallbackWarning",
    "FigureWarning",
]


class ClinometryError(Exception):
    """Root of every error raised on purpose by clinometry."""


class SegyReadError(ClinometryError, ValueError):
    """A SEG-Y file cannot be read, or its headers contradict its size."""


class GeometryError(ClinometryError, ValueError):
    """Line/trace geometry is missing, inconsistent or does not match."""


class VelocityError(ClinometryError, ValueError):
    """A velocity model or velocity file is invalid."""


class PickingError(ClinometryError, ValueError):
    """The input to the picker is unusable (not a missing pick: those are records)."""


class ThresholdsError(ClinometryError, ValueError):
    """A classification threshold table (TOML) is invalid."""


class PluginError(ClinometryError):
    """A plugin cannot be found, loaded or called."""


class HorizonFileError(ClinometryError, ValueError):
    """A user horizon file (CSV) cannot be read or matched to the section."""


class ReviewFileError(ClinometryError, ValueError):
    """A review file (``review.csv`` of accept / reject / needs-work decisions) cannot be read."""


class ClinometryWarning(UserWarning):
    """Root of every warning issued by clinometry."""


class DataQualityWarning(ClinometryWarning):
    """Data the caller should look at: dead traces, non-finite samples, clipping."""


class FallbackWarning(ClinometryWarning):
    """A default or fallback value was used because the file did not say."""


class FigureWarning(ClinometryWarning):
    """A figure could not be drawn; the results it would show are kept."""
