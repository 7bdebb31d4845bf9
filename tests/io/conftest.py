"""Shared fixtures for the SEG-Y reader tests: data paths and a small writer."""

from pathlib import Path

import numpy as np
import pytest

DATA = Path(__file__).resolve().parents[1] / "data"


@pytest.fixture
def ref_dir():
    """Folder of the segyio reference files (tests/data/segy-reference)."""
    return DATA / "segy-reference"


@pytest.fixture
def data_dir():
    return DATA


def _write(path, data, *, fmt=5, endian="big", dt_us=4000, headers=None, binary=None, text=None):
    """Write a SEG-Y file with segyio (unstructured): samples, trace headers, binary fields.

    ``headers`` maps a trace-header byte position (SEG-Y rev 1) to one value
    or one value per trace; ``binary`` maps binary-header byte positions to
    values.
    """
    import segyio

    data = np.asarray(data)
    n_tr, ns = data.shape
    spec = segyio.spec()
    spec.format = fmt
    spec.samples = list(range(ns))
    spec.tracecount = n_tr
    spec.endian = endian
    with segyio.create(str(path), spec) as f:
        if text is not None:
            f.text[0] = text
        f.bin.update({segyio.BinField.Interval: dt_us, segyio.BinField.Samples: ns,
                      segyio.BinField.Format: fmt, **(binary or {})})
        for i in range(n_tr):
            h = {segyio.TraceField.TRACE_SAMPLE_COUNT: ns, segyio.TraceField.TRACE_SAMPLE_INTERVAL: dt_us}
            for byte, v in (headers or {}).items():
                h[byte] = int(np.broadcast_to(v, (n_tr,))[i])
            f.header[i] = h
            f.trace[i] = data[i].astype(f.dtype)
    return Path(path)


@pytest.fixture
def write_segy():
    """Function ``write_segy(path, data, *, fmt, endian, dt_us, headers, binary, text)``."""
    return _write


def _cube(path, n_il, n_xl, ns, *, fmt=5, drop=()):
    """3D cube, inline-sorted; sample value = il * 1000 + xl + t / 1000 (encodes its position)."""
    il0, xl0 = 100, 200
    rows, il, xl, x, y = [], [], [], [], []
    for i in range(n_il):
        for j in range(n_xl):
            if (i, j) in drop:
                continue
            rows.append((il0 + i) * 1000 + (xl0 + j) + np.arange(ns) / 1000)
            il.append(il0 + i)
            xl.append(xl0 + j)
            x.append(500000 + 25 * j)  # crossline step 25 m along x
            y.append(6000000 + 50 * i)  # inline step 50 m along y
    return _write(path, np.array(rows, dtype=np.float32), fmt=fmt,
                  headers={189: il, 193: xl, 181: x, 185: y, 71: 1, 21: xl})


@pytest.fixture
def write_cube():
    """Function ``write_cube(path, n_il, n_xl, ns, *, fmt, drop)``: inlines 100.., crosslines 200..."""
    return _cube


def _raw_cube(path, n_il, n_xl, ns):
    """Big-endian format-5 3D cube written with plain numpy (fast for large cubes).

    Layout per SEG-Y rev 1: 3200-byte text header, binary header (interval
    3217, samples 3221, format 3225), then 240-byte trace headers (scalar 71,
    CDP X/Y 181/185, inline 189, crossline 193) each followed by ns samples.
    Sample value = inline * 1000 + crossline (one per trace).
    """
    n = n_il * n_xl
    head = bytearray(b"\x40" * 3200 + b"\x00" * 400)
    head[3216:3218] = (4000).to_bytes(2, "big")
    head[3220:3222] = ns.to_bytes(2, "big")
    head[3224:3226] = (5).to_bytes(2, "big")
    il = np.repeat(np.arange(100, 100 + n_il), n_xl)
    xl = np.tile(np.arange(200, 200 + n_xl), n_il)
    tr = np.zeros((n, 240 + 4 * ns), dtype=np.uint8)
    for byte, vals, width in ((71, np.ones(n, int), 2), (181, 500000 + 25 * (xl - 200), 4),
                              (185, 6000000 + 50 * (il - 100), 4), (189, il, 4), (193, xl, 4)):
        tr[:, byte - 1:byte - 1 + width] = np.asarray(vals, dtype=f">i{width}").view(np.uint8).reshape(n, width)
    samples = np.repeat((il * 1000 + xl).astype(">f4")[:, None], ns, axis=1)
    tr[:, 240:] = samples.view(np.uint8).reshape(n, 4 * ns)
    with open(path, "wb") as fh:
        fh.write(bytes(head))
        tr.tofile(fh)
    return Path(path)


@pytest.fixture
def write_raw_cube():
    """Function ``write_raw_cube(path, n_il, n_xl, ns)``: fast numpy writer for big cubes."""
    return _raw_cube
