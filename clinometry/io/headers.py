"""SEG-Y byte positions and sample formats, as tables.

The positions are 1-based byte numbers, as printed in the standard, with the
field width in bytes.  The binary-header positions count from the start of
the file (the binary header occupies bytes 3201-3600); the trace-header
positions count from the start of each 240-byte trace header.

The reader (:mod:`clinometry.io.segy`) uses these tables to find fields, and
:mod:`clinometry.synth` uses them to write files, so both sides agree on one
layout.

References
----------
.. [1] SEG Technical Standards Committee (2002). SEG Y rev 1 Data Exchange
   Format. Society of Exploration Geophysicists, Tulsa.  Tables 1 (binary
   file header) and 2 (trace header).
.. [2] SEG Technical Standards Committee (2017). SEG-Y_r2.0: SEG-Y revision 2.0
   Data Exchange Format. Society of Exploration Geophysicists.  Sample format
   codes 6-16, extended sample count (bytes 3269-3272) (from memory).
"""

from __future__ import annotations

__all__ = [
    "TEXT_HEADER_BYTES",
    "BINARY_HEADER_BYTES",
    "TRACE_HEADER_BYTES",
    "EXTENDED_TEXT_HEADER_BYTES",
    "BINARY_HEADER",
    "TRACE_HEADER",
    "SAMPLE_FORMATS",
    "SAMPLE_FORMAT_NAMES",
    "SAMPLE_FORMAT_BYTES",
    "COORDINATE_PAIRS",
    "DEFAULT_HEADER_BYTES",
    "apply_scalar",
]

#: sizes of the file parts, SEG-Y rev 1 [1]_ section 3
TEXT_HEADER_BYTES = 3200
BINARY_HEADER_BYTES = 400
TRACE_HEADER_BYTES = 240
EXTENDED_TEXT_HEADER_BYTES = 3200

#: binary file header fields: name -> (first byte counted from the start of
#: the file, width in bytes); SEG-Y rev 1 [1]_ table 1, rev 2.0 [2]_ for
#: ``extended_samples`` and ``byte_order_marker``
BINARY_HEADER = {
    "job_id": (3201, 4),
    "line_number": (3205, 4),
    "reel_number": (3209, 4),
    "traces_per_ensemble": (3213, 2),
    "aux_traces_per_ensemble": (3215, 2),
    "sample_interval": (3217, 2),  # µs (time) or, by common practice, mm (depth)
    "sample_interval_original": (3219, 2),
    "samples": (3221, 2),  # read unsigned (long.sgy holds 60000)
    "samples_original": (3223, 2),
    "format": (3225, 2),
    "ensemble_fold": (3227, 2),
    "sorting_code": (3229, 2),
    "measurement_system": (3255, 2),  # 1 metres, 2 feet
    "extended_samples": (3269, 4),  # rev 2.0 [2]_
    "byte_order_marker": (3297, 4),  # rev 2.0 [2]_: 0x01020304 as written
    "revision": (3501, 2),  # major byte 3501, minor byte 3502
    "fixed_length": (3503, 2),
    "extended_text_headers": (3505, 2),
}

#: trace header fields: name -> (first byte within the trace header, width
#: in bytes); SEG-Y rev 1 [1]_ table 2
TRACE_HEADER = {
    "trace_sequence_line": (1, 4),
    "trace_sequence_file": (5, 4),
    "field_record": (9, 4),
    "trace_number": (13, 4),
    "energy_source_point": (17, 4),
    "cdp": (21, 4),
    "cdp_trace": (25, 4),
    "trace_id": (29, 2),
    "offset": (37, 4),
    "receiver_elevation": (41, 4),
    "source_elevation": (45, 4),
    "elevation_scalar": (69, 2),
    "coordinate_scalar": (71, 2),
    "source_x": (73, 4),
    "source_y": (77, 4),
    "group_x": (81, 4),
    "group_y": (85, 4),
    "coordinate_units": (89, 2),  # 1 length (m or ft), 2 arc seconds, ...
    "delay_time": (109, 2),  # delay recording time, ms
    "samples": (115, 2),
    "sample_interval": (117, 2),  # µs
    "cdp_x": (181, 4),
    "cdp_y": (185, 4),
    "inline": (189, 4),
    "crossline": (193, 4),
    "shotpoint": (197, 4),
    "shotpoint_scalar": (201, 2),
    "time_scalar": (215, 2),  # scales bytes 95-114 (incl. the delay), rev 1
}

#: sample format code -> (name, bytes per sample); codes 1-5 SEG-Y rev 1 [1]_,
#: 6-16 rev 2.0 [2]_
SAMPLE_FORMATS = {
    1: ("4-byte IBM float", 4),
    2: ("4-byte signed int", 4),
    3: ("2-byte signed int", 2),
    4: ("4-byte fixed point with gain (obsolete)", 4),
    5: ("4-byte IEEE float", 4),
    6: ("8-byte IEEE float", 8),
    7: ("3-byte signed int", 3),
    8: ("1-byte signed int", 1),
    9: ("8-byte signed int", 8),
    10: ("4-byte unsigned int", 4),
    11: ("2-byte unsigned int", 2),
    12: ("8-byte unsigned int", 8),
    15: ("3-byte unsigned int", 3),
    16: ("1-byte unsigned int", 1),
}
SAMPLE_FORMAT_NAMES = {code: name for code, (name, _) in SAMPLE_FORMATS.items()}
SAMPLE_FORMAT_BYTES = {code: size for code, (_, size) in SAMPLE_FORMATS.items()}

#: coordinate pairs a caller may choose (``coordinates=``): name -> (x, y)
#: trace-header bytes, SEG-Y rev 1 [1]_ table 2
COORDINATE_PAIRS = {
    "cdp": (TRACE_HEADER["cdp_x"][0], TRACE_HEADER["cdp_y"][0]),
    "source": (TRACE_HEADER["source_x"][0], TRACE_HEADER["source_y"][0]),
    "group": (TRACE_HEADER["group_x"][0], TRACE_HEADER["group_y"][0]),
}

#: default header bytes of the keys that ``header_bytes=`` may override
DEFAULT_HEADER_BYTES = {
    "inline": TRACE_HEADER["inline"][0],
    "crossline": TRACE_HEADER["crossline"][0],
    "cdp": TRACE_HEADER["cdp"][0],
    "x": TRACE_HEADER["cdp_x"][0],
    "y": TRACE_HEADER["cdp_y"][0],
}


def apply_scalar(values, scalar):
    """Apply a SEG-Y rev 1 scalar (coordinate or time scalar) to values.

    Parameters
    ----------
    values : array_like
        Raw header values.
    scalar : int or array_like of int
        The scalar field: positive multiplies, negative divides by its
        absolute value, 0 means 1 [1]_ (bytes 71-72 and 215-216).

    Returns
    -------
    numpy.ndarray of float64

    References
    ----------
    .. [1] SEG Technical Standards Committee (2002). SEG Y rev 1 Data Exchange
       Format, table 2, bytes 69-72 and 215-216.

    Examples
    --------
    >>> apply_scalar([10000, 250], [-10, 0]).tolist()
    [1000.0, 250.0]
    >>> apply_scalar([12], 100).tolist()
    [1200.0]
    """
    import numpy as np

    v = np.asarray(values, dtype=np.float64)
    s = np.asarray(scalar, dtype=np.float64)
    factor = np.where(s > 0, s, np.where(s < 0, 1.0 / np.where(s < 0, -s, 1.0), 1.0))
    return v * factor
