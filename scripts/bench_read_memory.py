"""Peak memory of reading one inline of a 3D SEG-Y cube, against the cube's size.

Builds a 3D cube (default 200 inlines x 200 crosslines x 500 samples, IEEE
float32: 80 MB of samples) in a temporary folder, reads one inline with
``clinometry.io.read_section`` and one with ``iter_sections``, and prints the
tracemalloc peak (Python/numpy allocations) and the growth of the process's
maximum resident set size.  The cube is never loaded: the peak is about the
size of one line plus the inline/crossline header columns.

Usage::

    python scripts/bench_read_memory.py [--inlines 200] [--crosslines 200] [--samples 500]
"""

from __future__ import annotations

import argparse
import resource
import tempfile
import time
import tracemalloc
from pathlib import Path

import numpy as np


def write_cube(path: Path, n_il: int, n_xl: int, ns: int) -> Path:
    """Big-endian format-5 cube, inline-sorted, written inline by inline with numpy.

    SEG-Y rev 1 byte positions: binary interval 3217, samples 3221, format
    3225; trace coordinate scalar 71, CDP X/Y 181/185, inline 189,
    crossline 193.
    """
    head = bytearray(b"\x40" * 3200 + b"\x00" * 400)
    head[3216:3218] = (4000).to_bytes(2, "big")
    head[3220:3222] = ns.to_bytes(2, "big")
    head[3224:3226] = (5).to_bytes(2, "big")
    xl = np.arange(1000, 1000 + n_xl)
    with open(path, "wb") as fh:
        fh.write(bytes(head))
        for i in range(n_il):
            il = np.full(n_xl, 500 + i)
            tr = np.zeros((n_xl, 240 + 4 * ns), dtype=np.uint8)
            for byte, vals, width in ((71, np.ones(n_xl, int), 2), (181, 400000 + 25 * (xl - 1000), 4),
                                      (185, 7000000 + 25 * i * np.ones(n_xl, int), 4), (189, il, 4), (193, xl, 4)):
                tr[:, byte - 1:byte - 1 + width] = np.asarray(vals, dtype=f">i{width}").view(np.uint8).reshape(n_xl, width)
            samples = np.sin(np.arange(ns)[None, :] * 0.05 + xl[:, None] * 0.01).astype(">f4")
            tr[:, 240:] = samples.view(np.uint8).reshape(n_xl, 4 * ns)
            tr.tofile(fh)
    return path


def _maxrss_bytes() -> int:
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss * 1024  # Linux reports KiB


def main(argv=None) -> int:
    p = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    p.add_argument("--inlines", type=int, default=200)
    p.add_argument("--crosslines", type=int, default=200)
    p.add_argument("--samples", type=int, default=500)
    a = p.parse_args(argv)

    from clinometry.io import iter_sections, read_section

    cube_bytes = a.inlines * a.crosslines * a.samples * 4
    with tempfile.TemporaryDirectory() as tmp:
        path = write_cube(Path(tmp) / "cube.sgy", a.inlines, a.crosslines, a.samples)
        size = path.stat().st_size
        read_section(path, inline=500)  # warm-up: imports and caches
        rss0 = _maxrss_bytes()
        mid = 500 + a.inlines // 2
        rows = []
        for label, fn in (
            (f"read_section(inline={mid})", lambda: read_section(path, inline=mid)),
            (f"read_section(crossline={1000 + a.crosslines // 2})", lambda: read_section(path, crossline=1000 + a.crosslines // 2)),
            ("iter_sections: first inline", lambda: next(iter_sections(path))),
        ):
            tracemalloc.start()
            t0 = time.perf_counter()
            sec = fn()
            dt = time.perf_counter() - t0
            _, peak = tracemalloc.get_traced_memory()
            tracemalloc.stop()
            rows.append((label, sec.nbytes, peak, dt))
        rss_growth = _maxrss_bytes() - rss0
    print(f"cube: {a.inlines} x {a.crosslines} x {a.samples} float32 = {cube_bytes / 1e6:.1f} MB of samples "
          f"({size / 1e6:.1f} MB file)")
    print(f"{'read':<34} {'line MB':>8} {'peak MB':>8} {'peak/cube':>10} {'seconds':>8}")
    for label, nbytes, peak, dt in rows:
        print(f"{label:<34} {nbytes / 1e6:8.2f} {peak / 1e6:8.2f} {peak / cube_bytes:10.3f} {dt:8.3f}")
    print(f"max RSS growth over the three reads: {rss_growth / 1e6:.1f} MB "
          "(the file is memory-mapped read-only for headers; pages are the OS's, not allocations)")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
