"""What an interpreter checks before trusting a SEG-Y file, without reading samples.

:func:`inspect_file` reports the header facts (counts, interval, format,
byte order, delay, text header), the geometry worked out from the
inline/crossline fields, and the extent and spacing of the trace
coordinates.  It reads only headers (through a read-only memory map), so it
is quick on large volumes.  Problems that would stop :func:`read_section`
but still leave the headers readable (no usable sample interval) are
reported under ``"problems"`` instead of raised.
"""

from __future__ import annotations

import logging
import os

import numpy as np

from .headers import TRACE_HEADER, apply_scalar
from .survey_geometry import TraceHeaders, check_header_bytes, survey_geometry
from .segy import MAX_SAMPLE_INTERVAL, delay_from_headers, sample_interval_from_headers
from .sniff import sniff_segy

__all__ = ["inspect_file"]

logger = logging.getLogger(__name__)


def _range(v):
    return [int(v.min()), int(v.max())] if v.size else None


def inspect_file(path, *, domain="twt", coordinates="cdp", header_bytes=None) -> dict:
    """Header facts, geometry and coordinate extents of a SEG-Y file.

    Parameters
    ----------
    path : str or os.PathLike
    domain : {"twt", "depth"}
        How to read the interval field (µs -> ms, or mm -> m).
    coordinates : {"cdp", "source", "group"}
    header_bytes : dict, optional
        As for :func:`clinometry.io.read_section`.

    Returns
    -------
    dict
        Keys: ``path``, ``size_bytes``, ``n_traces``, ``n_samples``,
        ``sample_interval`` (ms or m, None when unusable),
        ``sample_interval_source``, ``z_units``, ``z_start``, ``z_end``,
        ``format_code``, ``sample_format``, ``byte_order``,
        ``segy_revision``, ``n_extended_text_headers``, ``text_encoding``,
        ``text_header``, ``geometry`` (``kind`` "2d"|"3d"|"pre-stack",
        inline/crossline ranges and counts, ``n_missing_traces``),
        ``coordinates`` (x/y ranges in m, ``trace_spacing_m`` median step,
        ``scalar``), ``notes``, ``problems``.

    Raises
    ------
    SegyReadError
        As :func:`clinometry.io.sniff.sniff_segy`.

    Examples
    --------
    See ``clinometry inspect PATH``.
    """
    layout = sniff_segy(path)
    name = os.path.basename(layout.path)
    chosen = check_header_bytes(name, header_bytes, coordinates)
    problems = []
    dz, source = sample_interval_from_headers(layout, domain=domain)
    if dz is None:
        problems.append(f"no usable sample interval: {source}; pass sample_interval= when reading")
    elif dz > MAX_SAMPLE_INTERVAL[domain]:
        problems.append(f"sample interval {dz:g} is absurd for {domain} data; pass sample_interval= when reading")
    z0 = delay_from_headers(layout)
    hdr = TraceHeaders(layout)
    try:
        geo = survey_geometry(hdr, chosen)
        scal = hdr.field(TRACE_HEADER["coordinate_scalar"][0])
        x = apply_scalar(hdr.field(chosen["x"]), scal)
        y = apply_scalar(hdr.field(chosen["y"]), scal)
        cdp = hdr.field(chosen["cdp"])
    finally:
        hdr.close()
    g = {"kind": geo["kind"]}
    if geo["kind"] in ("3d", "pre-stack"):
        n_il, n_xl = int(geo["inlines"].size), int(geo["crosslines"].size)
        g.update({
            "inline_range": _range(geo["inlines"]), "crossline_range": _range(geo["crosslines"]),
            "n_inlines": n_il, "n_crosslines": n_xl,
        })
        if geo["kind"] == "3d":
            g["n_missing_traces"] = n_il * n_xl - layout.n_traces
    if np.any(cdp != 0):
        g["cdp_range"] = _range(cdp)
    coords = {"pair": coordinates, "x_byte": chosen["x"], "y_byte": chosen["y"]}
    if np.any(x != 0) or np.any(y != 0):
        if geo["kind"] == "3d":
            # spacing along inlines: consecutive traces of the same inline
            same = np.diff(geo["inline"]) == 0
        else:
            same = np.ones(max(layout.n_traces - 1, 0), dtype=bool)
        step = np.hypot(np.diff(x), np.diff(y))[same]
        coords.update({
            "x_range_m": [float(x.min()), float(x.max())],
            "y_range_m": [float(y.min()), float(y.max())],
            "trace_spacing_m": float(np.median(step)) if step.size else None,
            "scalar": sorted({int(s) for s in np.unique(scal)})[:5],
        })
    else:
        coords["trace_spacing_m"] = None
        problems.append(f"no trace coordinates in bytes {chosen['x']}/{chosen['y']}; "
                        "pass trace_spacing_m= or coordinates=/header_bytes= when reading")
    units = "ms" if domain == "twt" else "m"
    return {
        "path": layout.path,
        "size_bytes": layout.size_bytes,
        "n_traces": layout.n_traces,
        "n_samples": layout.n_samples,
        "sample_interval": dz,
        "sample_interval_source": source,
        "z_units": units,
        "z_start": z0,
        "z_end": (z0 + (layout.n_samples - 1) * dz) if dz is not None else None,
        "format_code": layout.format_code,
        "sample_format": layout.sample_format,
        "byte_order": layout.byte_order,
        "segy_revision": f"{layout.revision[0]}.{layout.revision[1]}",
        "n_extended_text_headers": layout.n_extended_text_headers,
        "text_encoding": layout.text_encoding,
        "text_header": layout.text_header,
        "geometry": g,
        "coordinates": coords,
        "notes": list(layout.notes),
        "problems": problems,
    }
