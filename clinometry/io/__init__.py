"""Reading SEG-Y files into sections.

:func:`read_section` reads one 2D line, or one inline/crossline of a 3D
volume; :func:`iter_sections` yields every line of a volume one at a time;
:func:`inspect_file` reports header facts and geometry without reading
samples.  Headers are checked against the file size before anything is
allocated (:mod:`clinometry.io.sniff`); samples are decoded by segyio.
"""

from .survey_geometry import MIN_GRID_FILL, is_3d, line_numbers
from .file_summary import inspect_file
from .segy import (
    DEFAULT_TRACE_SPACING_M,
    MAX_SAMPLE_INTERVAL,
    delay_from_headers,
    iter_sections,
    read_section,
    sample_interval_from_headers,
)
from .sniff import SEGY_SUFFIXES, SegyLayout, decode_text_header, has_segy_suffix, sniff_segy

__all__ = [
    "read_section",
    "iter_sections",
    "inspect_file",
    "is_3d",
    "line_numbers",
    "sniff_segy",
    "SEGY_SUFFIXES",
    "has_segy_suffix",
    "SegyLayout",
    "decode_text_header",
    "sample_interval_from_headers",
    "delay_from_headers",
    "MIN_GRID_FILL",
    "MAX_SAMPLE_INTERVAL",
    "DEFAULT_TRACE_SPACING_M",
]
