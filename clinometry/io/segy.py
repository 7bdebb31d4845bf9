"""Read SEG-Y lines into sections, one line at a time.

Method
------
1. :func:`clinometry.io.sniff.sniff_segy` checks the file header against
   the file size and finds the byte order (segyio assumes big-endian).
2. Trace headers are read through a read-only ``numpy.memmap`` of the
   240-byte headers, field by field, so any byte position can be used
   (``header_bytes=``) and nothing but the requested columns is loaded.
3. Samples are decoded by segyio (``ignore_geometry=True``, mode ``"r"``),
   only for the traces of the requested line.  segyio 1.9.14 has no decoder
   for the 3-byte integer formats 7 and 15 and silently falls back to IBM
   float, giving wrong values; for those two formats the 3-byte integers are
   assembled with numpy from the raw trace bytes.  segyio also decodes
   *unnormalised* IBM floats (format 1, fraction's leading hex digit 0, which
   the format allows and some recorders write) wrongly; those samples alone
   are recomputed with the IBM formula [3]_ and counted in ``attrs["notes"]``.
   All other samples are segyio's.
4. 3D geometry is worked out from the inline/crossline header fields
   (default bytes 189/193; see :mod:`clinometry.io.survey_geometry` for the rule).
   Missing traces are allowed (the line just has gaps).  Lines are read one
   at a time, so the cube is never loaded: the extra memory of a line read is
   the line itself plus a few bytes of header per trace of the file.

Dead traces and non-finite samples
----------------------------------
NaN and inf samples are replaced by 0 (they would poison every filter
downstream) and the traces that held them are listed in
``attrs["nonfinite_traces"]``, their count in ``attrs["n_nonfinite"]``.
Traces whose samples are all zero are listed in ``attrs["dead_traces"]``;
they stay in the section (removing them would shift trace positions) and
the picker can skip them.  Both facts raise one :class:`DataQualityWarning`.

References
----------
.. [1] SEG Technical Standards Committee (2002). SEG Y rev 1 Data Exchange
   Format. Society of Exploration Geophysicists.
.. [2] SEG Technical Standards Committee (2017). SEG-Y_r2.0 Data Exchange
   Format. Society of Exploration Geophysicists (from memory).
.. [3] IBM (1964-). IBM System/360 Principles of Operation, "Floating-Point
   Arithmetic": short (32-bit) hexadecimal floating-point format (from memory).
"""

from __future__ import annotations

import logging
import os
import warnings

import numpy as np

from ..errors import DataQualityWarning, FallbackWarning, GeometryError, SegyReadError
from ..section import DOMAINS, Z_UNITS, distance_from_xy, make_section
from .survey_geometry import TraceHeaders, check_header_bytes, line_indices, survey_geometry
from .headers import TRACE_HEADER, apply_scalar
from .sniff import SegyLayout, sniff_segy

__all__ = [
    "read_section",
    "iter_sections",
    "MAX_SAMPLE_INTERVAL",
    "DEFAULT_TRACE_SPACING_M",
    "sample_interval_from_headers",
    "delay_from_headers",
]

logger = logging.getLogger(__name__)

#: largest plausible header sample interval per domain (ms for twt, m for
#: depth): reflection seismic is sampled at 0.25-16 ms and depth sections at
#: about 1-10 m, so more than 20 means a damaged header or the wrong domain
#: (common practice, no source).  An explicit ``sample_interval=`` is trusted.
MAX_SAMPLE_INTERVAL = {"twt": 20.0, "depth": 20.0}
#: header interval units: µs for time [1]_; for depth files, by common
#: practice (no source), thousandths of the depth unit (2500 -> 2.5 m)
_HEADER_INTERVAL_PER_UNIT = 1000.0
#: trace spacing assumed when the file has no coordinates and the caller
#: gave none (a common CDP spacing, common practice, no source)
DEFAULT_TRACE_SPACING_M = 25.0
#: international foot in metres (exact by definition, common practice)
_FOOT_M = 0.3048
_IBM_CHECK_TRACES = 1024  # traces per block when checking IBM normalisation
_COORDINATE_UNITS_ARCSEC = 2  # bytes 89-90, SEG-Y rev 1 [1]_
_MEASUREMENT_FEET = 2  # binary bytes 3255-3256, SEG-Y rev 1 [1]_


# --------------------------------------------------------------------------- z axis
def sample_interval_from_headers(layout: SegyLayout, *, domain: str = "twt"):
    """Sample interval from the headers, following segyio's ``tools.dt`` rules.

    Parameters
    ----------
    layout : SegyLayout
        From :func:`clinometry.io.sniff.sniff_segy`.
    domain : {"twt", "depth"}

    Returns
    -------
    value : float or None
        ms for ``"twt"``, m for ``"depth"``; None when there is no usable one.
    source : str
        Where it came from, or why there is none.

    Notes
    -----
    Binary header bytes 3217-3218 and first trace header bytes 117-118 [1]_:
    when one is positive and the other not, the positive one; when both are
    positive and equal, that one; otherwise none (segyio's rule, as its
    ``tools.dt`` behaves on the reference files).
    """
    b = layout.binary["sample_interval"]
    t = layout.first_trace.get("sample_interval", 0)
    unit = "µs" if domain == "twt" else "mm"
    if b > 0 and (t <= 0 or t == b):
        raw, source = b, f"binary header bytes 3217-3218 ({b} {unit})"
    elif b <= 0 and t > 0:
        raw, source = t, f"first trace header bytes 117-118 ({t} {unit}); binary header has {b}"
    elif b > 0 and t > 0:
        return None, (f"binary header bytes 3217-3218 say {b} {unit} but the first trace header "
                      f"bytes 117-118 say {t} {unit}")
    else:
        return None, f"sample interval is {b} in the binary header and {t} in the first trace header"
    return raw / _HEADER_INTERVAL_PER_UNIT, source


def delay_from_headers(layout: SegyLayout) -> float:
    """Delay recording time of the first trace (bytes 109-110), scaled.

    The time scalar (bytes 215-216) exists from SEG-Y rev 1 on [1]_ and is
    applied only to files that declare revision 1 or later; older files may
    hold anything there.

    Returns
    -------
    float
        ms for time data (the z value of the first sample).
    """
    delay = layout.first_trace.get("delay_time", 0)
    if not delay:
        return 0.0
    tscal = layout.first_trace.get("time_scalar", 0) if layout.revision[0] >= 1 else 0
    return float(apply_scalar(delay, tscal))


def _z_axis(layout, name, domain, sample_interval, fallbacks):
    unit = Z_UNITS[domain]
    if sample_interval is not None:
        dz = float(sample_interval)
        if not np.isfinite(dz) or dz <= 0:
            raise SegyReadError(f"{name}: sample_interval={sample_interval!r} must be a positive number of {unit}")
        source = "sample_interval= given by the caller"
    else:
        dz, source = sample_interval_from_headers(layout, domain=domain)
        if dz is None:
            raise SegyReadError(
                f"{name}: no usable sample interval: {source}; pass sample_interval= (in {unit}) if you know it"
            )
        if source.startswith("first trace"):
            fallbacks.append(f"sample interval from the {source}")
    if sample_interval is None and dz > MAX_SAMPLE_INTERVAL[domain]:
        raise SegyReadError(
            f"{name}: sample interval {dz:g} {unit} ({source}) is absurd for {domain} data "
            f"(more than {MAX_SAMPLE_INTERVAL[domain]:g} {unit}); pass sample_interval= (in {unit}) "
            "or check domain="
        )
    z0 = delay_from_headers(layout)
    z = z0 + np.arange(layout.n_samples, dtype=np.float64) * dz
    return z, dz, source


# --------------------------------------------------------------------------- samples
def _read_samples(layout: SegyLayout, hdr: TraceHeaders, idx: np.ndarray) -> np.ndarray:
    if layout.format_code in (7, 15):
        raw = hdr.raw_samples(idx).reshape(len(idx), layout.n_samples, 3).astype(np.int32)
        if layout.byte_order == "big":
            v = (raw[..., 0] << 16) | (raw[..., 1] << 8) | raw[..., 2]
        else:
            v = raw[..., 0] | (raw[..., 1] << 8) | (raw[..., 2] << 16)
        if layout.format_code == 7:  # two's complement, 24 bits [2]_
            v = np.where(v >= 1 << 23, v - (1 << 24), v)
        return v.astype(np.float32), 0
    import segyio

    name = os.path.basename(layout.path)
    try:
        with segyio.open(layout.path, "r", ignore_geometry=True, endian=layout.byte_order) as f:
            if f.tracecount != layout.n_traces or len(f.samples) != layout.n_samples:
                raise SegyReadError(
                    f"{name}: segyio sees {f.tracecount} traces x {len(f.samples)} samples but the headers "
                    f"declare {layout.n_traces} x {layout.n_samples}; the binary header is inconsistent"
                )
            steps = np.diff(idx)
            if idx.size and (idx.size == 1 or np.all(steps == steps[0])) and (idx.size == 1 or steps[0] > 0):
                step = int(steps[0]) if idx.size > 1 else 1
                data = f.trace.raw[int(idx[0]) : int(idx[-1]) + 1 : step]
                data = np.asarray(data).reshape(idx.size, layout.n_samples)
            else:
                data = np.empty((idx.size, layout.n_samples), dtype=f.dtype)
                for row, i in enumerate(idx):
                    data[row] = f.trace.raw[int(i)]
    except RuntimeError as err:
        raise SegyReadError(f"{name}: segyio could not read the traces ({err}); the file may be damaged") from err
    if data.dtype == np.float64:
        return data, 0  # format 6 keeps its precision
    data = data.astype(np.float32, copy=False)
    n_fixed = _fix_unnormalized_ibm(layout, hdr, idx, data) if layout.format_code == 1 else 0
    return data, n_fixed


def _fix_unnormalized_ibm(layout, hdr, idx, data) -> int:
    """Re-decode unnormalised IBM floats, which segyio 1.9.14 decodes wrongly; return their count.

    IBM System/360 single precision: value = (-1)^s * 0.F * 16^(e - 64),
    with a 7-bit exponent e and a 24-bit fraction F [3]_.  Writers normally
    normalise F (leading hex digit non-zero), but the format allows
    otherwise; segyio's converter assumes normalisation and returns wrong
    values (0x40080000 should be 0.03125, segyio gives 0.046875).  Only
    those samples are recomputed here, with the formula above.
    """
    big = layout.byte_order == "big"
    hi = 1 if big else 2  # byte holding the fraction's leading hex digit
    n_bad = 0
    for start in range(0, len(idx), _IBM_CHECK_TRACES):  # in blocks: bounded extra memory
        rows_idx = idx[start:start + _IBM_CHECK_TRACES]
        # cheap first pass on one byte per sample: leading hex digit of the fraction is 0
        lead = hdr.sample_bytes(rows_idx, hi, 4) < 0x10
        if not lead.any():
            continue
        r, c = np.nonzero(lead)
        raw = hdr.sample_words(rows_idx[r], c, 4)  # (k, 4) bytes of the candidates only
        w = (raw.astype(np.int64) << np.array([24, 16, 8, 0] if big else [0, 8, 16, 24])).sum(axis=1)
        bad = (w & 0x00FFFFFF) != 0  # true zeros are normalised by convention
        if not bad.any():
            continue
        w, r, c = w[bad], r[bad], c[bad]
        n_bad += int(w.size)
        sign = np.where(w >> 31, -1.0, 1.0)
        exponent = ((w >> 24) & 0x7F) - 64
        with np.errstate(over="ignore", under="ignore"):
            value = sign * (w & 0x00FFFFFF) / float(1 << 24) * np.power(16.0, exponent)
        data[start + r, c] = value.astype(np.float32)
    return n_bad


def _mask_quality(data, name, label):
    """Set NaN/inf to 0, list those traces and the dead ones; warn once.

    One pass over the data: a row sum is non-finite when the row holds NaN or
    inf (or overflows), and 0 when the row is dead (or cancels out); only
    those candidate rows are examined sample by sample.
    """
    info = {"n_nonfinite": 0, "nonfinite_traces": [], "dead_traces": []}
    with np.errstate(over="ignore", invalid="ignore"):
        row_sum = data.sum(axis=1, dtype=np.float64)
    nonfinite_rows = []
    for r in np.flatnonzero(~np.isfinite(row_sum)):
        bad = ~np.isfinite(data[r])
        if bad.any():
            info["n_nonfinite"] += int(bad.sum())
            nonfinite_rows.append(int(r))
            data[r, bad] = 0
            row_sum[r] = 0.0 if not np.any(data[r] != 0) else np.nan
    info["nonfinite_traces"] = nonfinite_rows
    info["dead_traces"] = [int(r) for r in np.flatnonzero(row_sum == 0) if not np.any(data[r] != 0)]
    msgs = []
    if info["n_nonfinite"]:
        tr = info["nonfinite_traces"]
        msgs.append(f"{info['n_nonfinite']} NaN/inf samples in {len(tr)} traces (first: {tr[:5]}) set to 0")
    if info["dead_traces"]:
        tr = info["dead_traces"]
        msgs.append(f"{len(tr)} dead (all-zero) traces (first: {tr[:5]})")
    if msgs:
        warnings.warn(f"{name}{' ' + label if label else ''}: " + "; ".join(msgs)
                      + "; listed in attrs 'nonfinite_traces'/'dead_traces'", DataQualityWarning, stacklevel=4)
    return info


# --------------------------------------------------------------------------- build
def _coordinates(layout, hdr, idx, chosen, trace_spacing_m, fallbacks):
    scal = hdr.field(TRACE_HEADER["coordinate_scalar"][0], idx)
    x = apply_scalar(hdr.field(chosen["x"], idx), scal)
    y = apply_scalar(hdr.field(chosen["y"], idx), scal)
    units = hdr.field(TRACE_HEADER["coordinate_units"][0], idx)
    problem = None
    if not (np.any(x != 0) or np.any(y != 0)):
        problem = f"no trace coordinates (bytes {chosen['x']}/{chosen['y']} are all zero)"
    elif np.any(units == _COORDINATE_UNITS_ARCSEC):
        problem = f"trace coordinates are in arc seconds (bytes 89-90 = {_COORDINATE_UNITS_ARCSEC})"
    elif idx.size > 1 and distance_from_xy(x, y)[-1] == 0:
        problem = f"all traces have the same coordinates ({x[0]:g}, {y[0]:g})"
    if problem is None:
        if layout.binary.get("measurement_system") == _MEASUREMENT_FEET:
            x, y = x * _FOOT_M, y * _FOOT_M
            fallbacks.append("binary header says feet (bytes 3255-3256 = 2): coordinates converted to m")
        return x, y, distance_from_xy(x, y)
    dist = None
    if trace_spacing_m is not None:
        msg = f"{problem}; trace spacing {float(trace_spacing_m):g} m from trace_spacing_m"
        fallbacks.append(msg)
        logger.info(msg)
        dist = np.arange(idx.size, dtype=np.float64) * float(trace_spacing_m)
    else:
        msg = (f"{problem}; trace spacing {DEFAULT_TRACE_SPACING_M:g} m assumed, "
               "pass trace_spacing_m= or header_bytes=/coordinates= to use other fields")
        fallbacks.append(msg)
        warnings.warn(f"{os.path.basename(layout.path)}: {msg}", FallbackWarning, stacklevel=4)
        dist = np.arange(idx.size, dtype=np.float64) * DEFAULT_TRACE_SPACING_M
    return None, None, dist


def _build(layout, hdr, idx, *, domain, z, dz, geo, chosen, trace_spacing_m, fallbacks, label, coordinates):
    name = os.path.basename(layout.path)
    fallbacks = list(fallbacks)
    x, y, dist = _coordinates(layout, hdr, idx, chosen, trace_spacing_m, fallbacks)
    data, n_ibm = _read_samples(layout, hdr, idx)
    quality = _mask_quality(data, name, label)
    notes = list(layout.notes)
    if n_ibm:
        notes.append(f"{n_ibm} unnormalised IBM float samples decoded with the IBM formula "
                     "(segyio 1.9.14 decodes them wrongly)")
        logger.info("%s: %s", name, notes[-1])
    cdp = hdr.field(chosen["cdp"], idx)
    il, xl = geo["inline"][idx], geo["crossline"][idx]
    three_d = geo["kind"] == "3d"
    attrs = {
        "sample_format": layout.sample_format,
        "byte_order": layout.byte_order,
        "text_header": layout.text_header,
        "source_path": layout.path,
        "fallbacks": fallbacks,
        "notes": notes,
        "segy_revision": f"{layout.revision[0]}.{layout.revision[1]}",
        "coordinates": coordinates,
        "header_bytes": dict(chosen),
        "sample_interval": float(dz),
        **quality,
    }
    if label:
        attrs["line_label"] = label
    return make_section(
        data, z=z, domain=domain, x=x, y=y, distance=dist,
        cdp=cdp if np.any(cdp != 0) else None,
        inline=il if (three_d or np.any(il != 0)) else None,
        crossline=xl if (three_d or np.any(xl != 0)) else None,
        attrs=attrs,
    )


def _prepare(path, domain, sample_interval, coordinates, header_bytes):
    if domain not in DOMAINS:
        raise GeometryError(f"{os.path.basename(os.fspath(path))}: domain must be one of {DOMAINS}, got {domain!r}")
    layout = sniff_segy(path)
    name = os.path.basename(layout.path)
    chosen = check_header_bytes(name, header_bytes, coordinates)
    fallbacks = []
    z, dz, source = _z_axis(layout, name, domain, sample_interval, fallbacks)
    if domain == "depth" and sample_interval is None:
        fallbacks.append(f"depth sample interval read as thousandths of a metre: {source} -> {dz:g} m")
    for fb in fallbacks:
        logger.info("%s: %s", name, fb)
    hdr = TraceHeaders(layout)
    geo = survey_geometry(hdr, chosen)
    return layout, name, chosen, z, dz, hdr, geo, fallbacks


def read_section(path, *, inline=None, crossline=None, domain="twt", sample_interval=None,
                 coordinates="cdp", header_bytes=None, trace_spacing_m=None):
    """Read one seismic line from a SEG-Y file as a section.

    Parameters
    ----------
    path : str or os.PathLike
        SEG-Y file (rev 0/1/2 layout, any byte order; opened read-only).
    inline, crossline : int, optional
        For a 3D volume, the one line to read (give one of them).  The
        traces are ordered by the other number.
    domain : {"twt", "depth"}
        ``"twt"``: z in ms two-way time; ``"depth"``: z in m.
    sample_interval : float, optional
        Sample interval in ms (twt) or m (depth); overrides the headers.
    coordinates : {"cdp", "source", "group"}
        Trace coordinate pair: CDP X/Y (bytes 181/185), source X/Y (73/77)
        or group X/Y (81/85), scaled by bytes 71-72 [1]_.
    header_bytes : dict, optional
        Byte positions (1-based) overriding ``inline`` (189), ``crossline``
        (193), ``cdp`` (21), ``x`` and ``y``.
    trace_spacing_m : float, m, optional
        Spacing used when the file has no usable coordinates.

    Returns
    -------
    xarray.DataArray, dims ("trace", "z")
        See :mod:`clinometry.section`; attrs also hold ``line_label`` (3D),
        ``nonfinite_traces``, ``notes``, ``segy_revision``, ``header_bytes``.

    Raises
    ------
    SegyReadError
        Not SEG-Y, truncated, sizes that contradict the file size, format 4,
        no usable or an absurd sample interval.
    GeometryError
        3D file read without ``inline=``/``crossline=``, a line that is not
        in the file, line asked of a 2D file, bad ``header_bytes``.

    Warns
    -----
    DataQualityWarning
        NaN/inf samples (set to 0) or dead traces.
    FallbackWarning
        No coordinates and no ``trace_spacing_m``: 25 m assumed.

    See Also
    --------
    iter_sections : every line of a 3D volume, one at a time.
    inspect_file : headers and geometry without reading samples.

    Notes
    -----
    z starts at the delay recording time of the first trace (bytes 109-110),
    scaled by the time scalar (bytes 215-216) in files of revision 1 or later
    [1]_.  Coordinates are scaled by bytes 71-72 (negative divides, positive
    multiplies, 0 means 1) and converted from feet when the binary header
    says feet (bytes 3255-3256 = 2); both facts are recorded in attrs.

    References
    ----------
    .. [1] SEG Technical Standards Committee (2002). SEG Y rev 1 Data
       Exchange Format. Society of Exploration Geophysicists.
    """
    if inline is not None and crossline is not None:
        raise GeometryError(f"{os.path.basename(os.fspath(path))}: give inline= or crossline=, not both")
    layout, name, chosen, z, dz, hdr, geo, fallbacks = _prepare(path, domain, sample_interval, coordinates, header_bytes)
    try:
        if inline is not None or crossline is not None:
            direction, number = ("inline", inline) if inline is not None else ("crossline", crossline)
            idx = line_indices(name, geo, direction, number)
            label = f"{direction} {number}"
        else:
            if geo["kind"] == "3d":
                il, xl = geo["inlines"], geo["crosslines"]
                raise GeometryError(
                    f"{name}: this is a 3D volume (inlines {il.min()}-{il.max()}, crosslines "
                    f"{xl.min()}-{xl.max()}); pass inline= or crossline=, or use iter_sections"
                )
            idx = np.arange(layout.n_traces)
            label = ""
        return _build(layout, hdr, idx, domain=domain, z=z, dz=dz, geo=geo, chosen=chosen,
                      trace_spacing_m=trace_spacing_m, fallbacks=fallbacks, label=label,
                      coordinates=coordinates)
    finally:
        hdr.close()


def iter_sections(path, *, direction="inline", lines=None, domain="twt", sample_interval=None,
                  coordinates="cdp", header_bytes=None, trace_spacing_m=None):
    """Yield the lines of a 3D volume one at a time, never loading the cube.

    Parameters
    ----------
    path : str or os.PathLike
    direction : {"inline", "crossline"}
    lines : iterable of int, optional
        Line numbers to read (default: all, increasing).
    domain, sample_interval, coordinates, header_bytes, trace_spacing_m
        As for :func:`read_section`.

    Yields
    ------
    xarray.DataArray, dims ("trace", "z")
        With ``attrs["line_label"]``, e.g. ``"inline 112"``.

    Raises
    ------
    SegyReadError, GeometryError
        As :func:`read_section`; GeometryError also when the file is not 3D.
    """
    if direction not in ("inline", "crossline"):
        raise GeometryError(f"{os.path.basename(os.fspath(path))}: direction must be 'inline' or 'crossline', got {direction!r}")
    layout, name, chosen, z, dz, hdr, geo, fallbacks = _prepare(path, domain, sample_interval, coordinates, header_bytes)
    try:
        if geo["kind"] != "3d":
            raise GeometryError(
                f"{name}: not a 3D post-stack volume ({geo['kind']}); use read_section for a 2D line, "
                "or point header_bytes= at the inline/crossline fields"
            )
        numbers = geo[direction + "s"] if lines is None else list(lines)
        for number in numbers:
            idx = line_indices(name, geo, direction, int(number))
            yield _build(layout, hdr, idx, domain=domain, z=z, dz=dz, geo=geo, chosen=chosen,
                         trace_spacing_m=trace_spacing_m, fallbacks=fallbacks,
                         label=f"{direction} {int(number)}", coordinates=coordinates)
    finally:
        hdr.close()
