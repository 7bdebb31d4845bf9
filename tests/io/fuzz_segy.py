"""Fuzz worker: mutate valid SEG-Y files and read each one; print one JSON line per case.

Run by ``tests/io/test_fuzz.py`` in a subprocess, so that a hang (every case
is armed with ``faulthandler.dump_traceback_later(10 s, exit=True)``) or a
crash of the interpreter ends the worker, not pytest::

    python tests/io/fuzz_segy.py WORKDIR SEED N_CASES

Each case is built from ``numpy.random.default_rng([SEED, i])``, so a failing
case can be replayed alone.  Mutations: truncation at a random offset,
random bytes in the binary and trace headers, absurd sample counts and
intervals, wrong format codes, a byte-swapped format code (the byte-order
flag), zero traces, NaN/inf payloads, a 3D file with missing traces,
extended textual header counts and random byte flips anywhere.
"""

from __future__ import annotations

import contextlib
import faulthandler
import hashlib
import io
import json
import shutil
import struct
import sys
import time
import tracemalloc
import traceback
import warnings
from pathlib import Path

import numpy as np

DATA = Path(__file__).resolve().parents[1] / "data" / "segy-reference"
CASE_TIMEOUT_S = 10
KINDS = ("truncate", "binary_bytes", "trace_bytes", "sample_count", "interval", "format_code",
         "swap_format", "zero_traces", "nonfinite", "drop_traces", "ext_headers", "flip_bytes")


def _bases(workdir: Path) -> list[Path]:
    """Valid files to mutate: written with segyio, plus copies of reference files."""
    import segyio

    out = []
    rng = np.random.default_rng(2024)

    def write(name, data, fmt, endian, headers):
        spec = segyio.spec()
        spec.format, spec.samples, spec.tracecount, spec.endian = fmt, list(range(data.shape[1])), len(data), endian
        path = workdir / name
        with segyio.create(str(path), spec) as f:
            f.bin.update({segyio.BinField.Interval: 4000, segyio.BinField.Samples: data.shape[1],
                          segyio.BinField.Format: fmt})
            for i, row in enumerate(data):
                f.header[i] = {segyio.TraceField.TRACE_SAMPLE_COUNT: data.shape[1],
                               segyio.TraceField.TRACE_SAMPLE_INTERVAL: 4000,
                               **{k: int(v[i]) for k, v in headers.items()}}
                f.trace[i] = row.astype(f.dtype)
        return path

    n = 12
    out.append(write("line-ieee-big.sgy", rng.normal(size=(n, 40)).astype(np.float32), 5, "big",
                     {71: -100 * np.ones(n), 181: 50000000 + 2500 * np.arange(n), 185: 1000 * np.ones(n),
                      21: np.arange(1, n + 1)}))
    out.append(write("line-ibm-little.sgy", rng.normal(size=(n, 30)), 1, "little",
                     {71: np.ones(n), 181: 1000 + 12 * np.arange(n), 185: 77 * np.ones(n)}))
    il, xl = np.repeat(np.arange(5, 9), 5), np.tile(np.arange(30, 35), 4)
    out.append(write("cube-ibm-big.sgy", rng.normal(size=(20, 25)), 1, "big",
                     {189: il, 193: xl, 71: np.ones(20), 181: 25 * xl, 185: 25 * il}))
    out.append(write("line-int16-big.sgy", rng.integers(-3000, 3000, size=(n, 20)), 3, "big",
                     {71: np.ones(n), 181: 10 * np.arange(n), 185: np.zeros(n)}))
    for name in ("f3.sgy", "multiformats/Format7msb.sgy", "small-lsb.sgy"):
        dst = workdir / Path(name).name
        shutil.copyfile(DATA / name, dst)
        out.append(dst)
    return out


def _layout(raw: bytes):
    """(byte order, format code, samples, bytes per sample) from the binary header, best effort."""
    for e in (">", "<"):
        fmt = struct.unpack_from(e + "h", raw, 3224)[0]
        if fmt in (1, 2, 3, 5, 6, 7, 8, 9, 10, 11, 12, 15, 16):
            ns = struct.unpack_from(e + "H", raw, 3220)[0]
            bps = {1: 4, 2: 4, 3: 2, 5: 4, 6: 8, 7: 3, 8: 1, 9: 8, 10: 4, 11: 2, 12: 8, 15: 3, 16: 1}[fmt]
            return e, fmt, ns, bps
    return ">", 5, 0, 4


def mutate(raw: bytes, rng, kind: str) -> bytes:
    """One mutation of a valid file's bytes."""
    b = bytearray(raw)
    e, fmt, ns, bps = _layout(raw)
    tsize = 240 + ns * bps
    n_tr = (len(b) - 3600) // tsize if tsize else 0
    if kind == "truncate":
        return bytes(b[: int(rng.integers(0, len(b)))])
    if kind == "binary_bytes":
        for pos in rng.integers(3200, 3600, size=int(rng.integers(1, 12))):
            b[pos] = int(rng.integers(0, 256))
    elif kind == "trace_bytes":
        for _ in range(int(rng.integers(1, 20))):
            t = int(rng.integers(0, max(n_tr, 1)))
            pos = 3600 + t * tsize + int(rng.integers(0, 240))
            if pos < len(b):
                b[pos] = int(rng.integers(0, 256))
    elif kind == "sample_count":
        value = int(rng.choice([0, 1, ns + 1, ns - 1, 32767, 65535, int(rng.integers(0, 65536))]))
        struct.pack_into(e + "H", b, 3220, max(0, min(value, 65535)))
        if rng.random() < 0.3:  # rev-2 extended count switched on with a huge value
            b[3500] = 2
            struct.pack_into(e + "i", b, 3268, int(rng.integers(-(2 ** 31), 2 ** 31 - 1)))
    elif kind == "interval":
        value = int(rng.choice([0, -1, 1, 32767, -32768, 20001, int(rng.integers(-32768, 32768))]))
        struct.pack_into(e + "h", b, 3216, value)
        if rng.random() < 0.5 and len(b) >= 3840:
            struct.pack_into(e + "h", b, 3600 + 116, int(rng.integers(-32768, 32768)))
    elif kind == "format_code":
        struct.pack_into(e + "h", b, 3224, int(rng.choice([0, 4, 13, 14, 17, -1, 256, 1, 2, 3, 5, 6, 8, 16])))
    elif kind == "swap_format":
        b[3224], b[3225] = b[3225], b[3224]
    elif kind == "zero_traces":
        return bytes(b[:3600])
    elif kind == "nonfinite":
        if fmt in (1, 5, 6) and n_tr:
            pattern = {5: [b"\x7f\xc0\x00\x00", b"\x7f\x80\x00\x00", b"\xff\x80\x00\x00"],
                       1: [b"\x7f\xff\xff\xff", b"\xff\xff\xff\xff"],
                       6: [b"\x7f\xf8" + b"\x00" * 6, b"\x7f\xf0" + b"\x00" * 6]}[fmt]
            for _ in range(int(rng.integers(1, 30))):
                t, s = int(rng.integers(0, n_tr)), int(rng.integers(0, ns))
                word = pattern[int(rng.integers(0, len(pattern)))]
                word = word if e == ">" else word[::-1]
                pos = 3600 + t * tsize + 240 + s * bps
                b[pos:pos + bps] = word
        if rng.random() < 0.5 and n_tr:  # and a dead trace
            t = int(rng.integers(0, n_tr))
            b[3600 + t * tsize + 240: 3600 + (t + 1) * tsize] = bytes(tsize - 240)
    elif kind == "drop_traces":
        if n_tr > 2:
            keep = sorted(rng.choice(n_tr, size=int(rng.integers(1, n_tr)), replace=False))
            body = b"".join(bytes(b[3600 + t * tsize: 3600 + (t + 1) * tsize]) for t in keep)
            return bytes(b[:3600]) + body
    elif kind == "ext_headers":
        struct.pack_into(e + "h", b, 3504, int(rng.choice([-1, 1, 2, 100, 32767, int(rng.integers(-32768, 32768))])))
    elif kind == "flip_bytes":
        for pos in rng.integers(0, len(b), size=int(rng.integers(1, 40))):
            b[pos] ^= 1 << int(rng.integers(0, 8))
    return bytes(b)


def _read_all(path: Path):
    """What a user does with a file: inspect it, then read its line(s)."""
    from clinometry.io import inspect_file, iter_sections, read_section

    info = inspect_file(path)
    kw = {}
    if info["sample_interval"] is None or any("absurd" in p for p in info["problems"]):
        kw["sample_interval"] = 4.0
    if info["geometry"]["kind"] == "3d":
        sections = list(iter_sections(path, **kw))
        sections.append(read_section(path, crossline=info["geometry"]["crossline_range"][0], **kw))
    else:
        sections = [read_section(path, trace_spacing_m=10.0, **kw)]
    return info, sections


def run_case(workdir: Path, bases, seed: int, i: int) -> dict:
    from clinometry.cli import main
    from clinometry.errors import ClinometryError, ClinometryWarning

    rng = np.random.default_rng([seed, i])
    base = bases[i % len(bases)]
    kind = KINDS[int(rng.integers(0, len(KINDS)))]
    path = workdir / f"case-{seed}-{i:04d}-{kind}.sgy"
    path.write_bytes(mutate(base.read_bytes(), rng, kind))
    size = path.stat().st_size
    digest = hashlib.sha256(path.read_bytes()).hexdigest()
    rec = {"case": i, "seed": seed, "base": base.name, "kind": kind, "file": path.name, "size": size}
    faulthandler.dump_traceback_later(CASE_TIMEOUT_S, exit=True)
    t0 = time.perf_counter()
    tracemalloc.start()
    caught = []
    try:
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter("always")
            info, sections = _read_all(path)
        rec["outcome"] = "section"
        rec["shapes"] = [list(s.shape) for s in sections]
        rec["n_samples_declared"] = info["n_samples"]
        rec["all_finite"] = bool(all(np.isfinite(s.values).all() for s in sections))
        rec["dims_ok"] = all(tuple(s.dims) == ("trace", "z") for s in sections)
    except ClinometryError as err:
        rec.update(outcome="error", error_type=type(err).__name__, message=str(err))
    except Exception as err:  # noqa: BLE001 - a crash is what the fuzzer looks for
        rec.update(outcome="crash", error_type=type(err).__name__, message=str(err),
                   traceback=traceback.format_exc())
    finally:
        _, peak = tracemalloc.get_traced_memory()
        tracemalloc.stop()
        rec["seconds"] = time.perf_counter() - t0
        rec["peak_bytes"] = peak
    rec["warnings"] = sorted({w.category.__name__ for w in caught})
    rec["warnings_ok"] = all(issubclass(w.category, ClinometryWarning) for w in caught)
    # the same file through the command line
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err), warnings.catch_warnings():
        warnings.simplefilter("ignore")
        try:
            rec["cli_rc"] = main(["inspect", str(path), "--no-text"])
        except SystemExit as exc:  # argparse only; should not happen
            rec["cli_rc"] = exc.code
    faulthandler.cancel_dump_traceback_later()
    rec["cli_stderr"] = err.getvalue()
    rec["unchanged"] = hashlib.sha256(path.read_bytes()).hexdigest() == digest
    path.unlink()
    return rec


def main_worker(argv):
    workdir, seed, n = Path(argv[0]), int(argv[1]), int(argv[2])
    workdir.mkdir(parents=True, exist_ok=True)
    bases = _bases(workdir)
    # warm-up: first-time imports and caches are not part of any case's time or memory
    from clinometry.cli import build_parser

    build_parser()
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        for base in bases:
            _read_all(base)
    for i in range(n):
        print(json.dumps(run_case(workdir, bases, seed, i)), flush=True)


if __name__ == "__main__":
    main_worker(sys.argv[1:])
