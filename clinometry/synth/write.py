"""Write synthetic sections and cubes as SEG-Y, with the ground truth as JSON.

Files are written with segyio as SEG-Y rev 1: a 3200-byte textual (ASCII)
header describing the scenario, a binary header with the sample interval
(µs for time; thousandths of a metre for depth, common practice, no source),
sample count and format code (1 IBM float or 5 IEEE float), and per trace
the CDP number, CDP X/Y with a coordinate scalar of -100 (centimetre
precision), the delay, and inline/crossline numbers at bytes 189/193.  Byte
positions come from :mod:`clinometry.io.headers` (SEG-Y rev 1, tables 1-2).
Each file is written to a temporary name and renamed into place.
"""

from __future__ import annotations

import json
import logging
import os
from pathlib import Path

import numpy as np

from ..errors import GeometryError
from ..io.headers import BINARY_HEADER, TRACE_HEADER

__all__ = ["write_line", "write_segy", "truth_path", "SAMPLE_FORMAT_CODES", "COORDINATE_SCALAR"]

logger = logging.getLogger(__name__)

#: SEG-Y rev 1 sample format codes (table 1, bytes 3225-3226)
SAMPLE_FORMAT_CODES = {"ibm": 1, "ieee": 5}
#: coordinate scalar written to bytes 71-72: negative divides, so -100 keeps cm
COORDINATE_SCALAR = -100
#: header interval units per z unit: µs per ms (SEG-Y rev 1), mm per m (depth,
#: common practice, no source)
_INTERVAL_PER_UNIT = 1000.0


def truth_path(path):
    """``<stem>.truth.json`` beside a SEG-Y path.

    Examples
    --------
    >>> truth_path("out/line_a.sgy").as_posix()
    'out/line_a.truth.json'
    """
    p = Path(path)
    return p.with_name(p.stem + ".truth.json")


def _text_header(lines):
    rows = [f"C{i + 1:2d} {t}"[:80].ljust(80) for i, t in enumerate(lines[:40])]
    rows += [f"C{i + 1:2d}".ljust(80) for i in range(len(rows), 40)]
    return "".join(rows)


def _ints(values, what, path):
    v = np.rint(np.asarray(values, dtype=np.float64))
    if np.any(np.abs(v) > 2**31 - 1):
        raise GeometryError(f"{path}: {what} do not fit a 4-byte header field (max |value| {np.abs(v).max():.0f})")
    return v.astype(np.int64)


def write_segy(path, traces, *, z, domain, cdp_x, cdp_y, cdp=None, inline=None, crossline=None,
               text_lines=(), sample_format="ieee", sorted_by=None):
    """Write traces to a SEG-Y rev 1 file.

    Parameters
    ----------
    path : str or Path
    traces : ndarray, shape (n_trace, n_z)
    z : ndarray, shape (n_z,)
        Regular samples in ms (twt) or m (depth); ``z[0]`` is the delay and
        must be a whole number.
    domain : {"twt", "depth"}
    cdp_x, cdp_y : ndarray, shape (n_trace,), m
    cdp, inline, crossline : ndarray of int, shape (n_trace,), optional
    text_lines : sequence of str
        Lines of the textual header (at most 40, 76 characters shown each).
    sample_format : {"ibm", "ieee"}
    sorted_by : {None, "inline"}
        ``"inline"`` marks a 3D file sorted by inline, then crossline.

    Raises
    ------
    GeometryError
        Irregular z, a delay or interval that SEG-Y cannot hold, unknown format.
    """
    import segyio

    path = Path(path)
    traces = np.asarray(traces, dtype=np.float32)
    n_tr, n_z = traces.shape
    if sample_format not in SAMPLE_FORMAT_CODES:
        raise GeometryError(f"{path.name}: sample_format must be one of {sorted(SAMPLE_FORMAT_CODES)}, got {sample_format!r}")
    z = np.asarray(z, dtype=np.float64)
    dz = float(z[1] - z[0])
    if not np.allclose(np.diff(z), dz):
        raise GeometryError(f"{path.name}: z samples are not regular; SEG-Y needs one sample interval")
    interval = int(round(dz * _INTERVAL_PER_UNIT))
    if not (0 < interval < 65536) or abs(interval - dz * _INTERVAL_PER_UNIT) > 1e-6:
        raise GeometryError(f"{path.name}: sample interval {dz:g} cannot be written as a whole number of "
                            f"{'µs' if domain == 'twt' else 'mm'} below 65536")
    delay = float(z[0])
    if delay != round(delay) or abs(delay) > 32767:
        raise GeometryError(f"{path.name}: delay {delay:g} must be a whole number of "
                            f"{'ms' if domain == 'twt' else 'm'} for SEG-Y bytes 109-110")
    cdp = np.arange(1, n_tr + 1) if cdp is None else np.asarray(cdp)
    xs = _ints(np.asarray(cdp_x) * -COORDINATE_SCALAR, "CDP X coordinates", path.name)
    ys = _ints(np.asarray(cdp_y) * -COORDINATE_SCALAR, "CDP Y coordinates", path.name)

    spec = segyio.spec()
    spec.format = SAMPLE_FORMAT_CODES[sample_format]
    spec.samples = np.arange(n_z) * dz + delay
    if sorted_by == "inline":
        ils, xls = np.unique(inline), np.unique(crossline)
        if ils.size * xls.size != n_tr:
            raise GeometryError(f"{path.name}: {n_tr} traces do not fill {ils.size} inlines x {xls.size} crosslines")
        spec.sorting = segyio.TraceSortingFormat.INLINE_SORTING
        spec.ilines, spec.xlines = ils, xls
        spec.iline, spec.xline = TRACE_HEADER["inline"][0], TRACE_HEADER["crossline"][0]
    else:
        spec.tracecount = n_tr
    tmp = path.with_name(f".{path.name}.tmp{os.getpid()}")
    try:
        with segyio.create(str(tmp), spec) as f:
            f.text[0] = _text_header(list(text_lines)).encode("ascii", "replace")
            f.bin.update({
                BINARY_HEADER["sample_interval"][0]: interval,
                BINARY_HEADER["samples"][0]: n_z,
                BINARY_HEADER["format"][0]: spec.format,
                BINARY_HEADER["measurement_system"][0]: 1,  # metres
                BINARY_HEADER["revision"][0]: 0x0100,  # rev 1.0
                BINARY_HEADER["fixed_length"][0]: 1,
                BINARY_HEADER["sorting_code"][0]: 2 if sorted_by == "inline" else 1,
            })
            th = TRACE_HEADER
            for i in range(n_tr):
                h = {
                    th["trace_sequence_line"][0]: i + 1,
                    th["trace_sequence_file"][0]: i + 1,
                    th["cdp"][0]: int(cdp[i]),
                    th["cdp_trace"][0]: 1,
                    th["trace_id"][0]: 1 if np.any(traces[i]) else 2,  # 2 = dead
                    th["coordinate_scalar"][0]: COORDINATE_SCALAR,
                    th["source_x"][0]: int(xs[i]),
                    th["source_y"][0]: int(ys[i]),
                    th["group_x"][0]: int(xs[i]),
                    th["group_y"][0]: int(ys[i]),
                    th["coordinate_units"][0]: 1,
                    th["delay_time"][0]: int(delay),
                    th["samples"][0]: n_z,
                    th["sample_interval"][0]: interval,
                    th["cdp_x"][0]: int(xs[i]),
                    th["cdp_y"][0]: int(ys[i]),
                    th["shotpoint"][0]: int(cdp[i]),
                }
                if inline is not None:
                    h[th["inline"][0]] = int(inline[i])
                if crossline is not None:
                    h[th["crossline"][0]] = int(crossline[i])
                f.header[i] = h
                f.trace[i] = traces[i]
        os.replace(tmp, path)
    except BaseException:
        if tmp.exists():
            tmp.unlink()
        raise
    logger.info("wrote %s: %d traces x %d samples", path, n_tr, n_z)
    return path


def _write_json(obj, path):
    path = Path(path)
    tmp = path.with_name(f".{path.name}.tmp{os.getpid()}")
    tmp.write_text(json.dumps(obj, indent=1, allow_nan=False) + "\n")
    os.replace(tmp, path)
    return path


def _describe(truth):
    unit = truth.get("units", "ms")
    lines = [
        "CLINOMETRY SYNTHETIC SECTION - INVENTED SCENARIO, NOT REAL DATA",
        f"SCENARIO {truth.get('scenario', '?')}  SEED {truth.get('seed', 0)}",
        f"DOMAIN {truth.get('domain', 'twt').upper()}  Z UNIT {unit.upper()}  "
        f"SAMPLE INTERVAL {truth.get('sample_interval', 0):g} {unit.upper()}",
        "DEPTH FILES: BINARY/TRACE SAMPLE INTERVAL IN MM, DELAY IN M" if truth.get("domain") == "depth"
        else "SAMPLE INTERVAL IN MICROSECONDS, DELAY IN MS",
        f"VELOCITY {json.dumps(truth.get('velocity', {}))}"[:76],
        (f"RICKER WAVELET PEAK {truth.get('wavelet', {}).get('peak_hz', 0):g} HZ  "
         if (truth.get("wavelet") or {}).get("peak_hz") is not None or "wavelet" not in truth
         else "NO WAVELET (WHITE NOISE ONLY)  ")
        + f"POLARITY {truth.get('wavelet', {}).get('polarity', 'normal').upper()}",
        f"SNR (RMS SIGNAL / RMS NOISE) {truth.get('snr')}",
        "CDP X/Y BYTES 181/185 SCALAR -100; INLINE/CROSSLINE BYTES 189/193",
        "GROUND TRUTH IN <STEM>.TRUTH.JSON",
    ]
    return lines


def write_line(section, truth, path, *, sample_format="ieee"):
    """Write a synthetic section as SEG-Y and its truth as ``<stem>.truth.json``.

    Parameters
    ----------
    section : xarray.DataArray, dims ("trace", "z")
        From :func:`clinometry.synth.make_line`.
    truth : dict
        The matching ground truth.
    path : str or Path
        Output ``.sgy`` path.
    sample_format : {"ibm", "ieee"}

    Returns
    -------
    (Path, Path)
        The SEG-Y and the truth JSON paths.
    """
    path = Path(path)
    truth = dict(truth)
    truth["sample_format"] = sample_format
    truth["segy_file"] = path.name
    cdp = section["cdp"].values if "cdp" in section.coords else None
    il = section["inline"].values if "inline" in section.coords else None
    xl = section["crossline"].values if "crossline" in section.coords else None
    write_segy(path, section.transpose("trace", "z").values, z=section["z"].values,
               domain=section.attrs["domain"], cdp_x=section["x"].values, cdp_y=section["y"].values,
               cdp=cdp, inline=il, crossline=xl, text_lines=_describe(truth),
               sample_format=sample_format)
    return path, _write_json(truth, truth_path(path))
