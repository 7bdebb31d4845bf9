"""Speed, scaling, memory and parallel speed-up of clinometry.

For lines of 1 000, 4 000 and 16 000 traces x 1 500 samples, written as
IBM-float and IEEE-float SEG-Y, this script measures in one process

(a) segyio reading the whole line into memory (``f.trace.raw[:]``), and
(b) ``clinometry.analyze`` end to end without plotting, once with the
    Monte-Carlo uncertainty off and once with the default uncertainty on,

and prints the ratio (b)/(a), the time per trace at each size (scaling; also
as CPU seconds of the process, which other processes on the same cores
disturb less than wall time), and
the peak resident memory of a fresh process that runs (b) once (with the
memory of the imports alone beside it).  It also times a batch of 16 lines
with ``--workers 1`` and ``--workers 2`` (alternating), and prints the load
average of the machine, since other processes on the same cores slow every
measurement.

Medians of several runs are quoted.  The lines are layered sections with a
prograding sigmoidal clinoform wedge, convolved with a 25 Hz Ricker wavelet:
enough structure for the picker to work as it does on data.

Usage::

    python scripts/bench_speed.py                # full table (several minutes)
    python scripts/bench_speed.py --quick        # 1 000 and 4 000 traces, 1 run each
    python scripts/bench_speed.py --sizes 1000 --formats ieee --repeat 3
"""

from __future__ import annotations

import argparse
import json
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np


def _ricker(f_hz, dt_s):
    t = np.arange(-0.1, 0.1 + dt_s / 2, dt_s)
    a = (np.pi * f_hz * t) ** 2
    return (1 - 2 * a) * np.exp(-a)  # Ricker (1953)


def make_line(path, n_traces, n_samples=1500, fmt="ieee", seed=0, dx_m=12.5, dt_ms=2.0):
    """Write a layered line with a prograding clinoform wedge as SEG-Y."""
    import segyio

    rng = np.random.default_rng(seed)
    x = np.arange(n_traces) * dx_m
    L = x[-1] + dx_m
    z = np.arange(n_samples) * dt_ms  # ms
    refl = np.zeros((n_traces, n_samples), np.float32)
    # flat layers below and above, a sigmoid margin profile in the middle
    top = 600 + 350 / (1 + np.exp(-(x - 0.45 * L) / (0.03 * L)))
    for k in range(40):
        depth = 150 + k * 32 + rng.normal(0, 2)
        amp = rng.normal(0, 1)
        i = np.clip(((depth + 0.15 * (top - 600)) / dt_ms).astype(int), 0, n_samples - 1)
        refl[np.arange(n_traces), i] += amp
    for k in range(8):  # clinoforms: shifted copies of the margin profile
        prof = top - 40 * k
        i = np.clip((prof / dt_ms).astype(int) + 40 * k // 2, 0, n_samples - 1)
        refl[np.arange(n_traces), i] += 0.8
    w = _ricker(25.0, dt_ms / 1000).astype(np.float32)
    from scipy.signal import fftconvolve

    data = fftconvolve(refl, w[None, :], mode="same", axes=1).astype(np.float32)
    data += rng.normal(0, 0.05 * data.std(), data.shape).astype(np.float32)
    spec = segyio.spec()
    spec.format = 1 if fmt == "ibm" else 5
    spec.samples = z
    spec.tracecount = n_traces
    spec.sorting = 0  # unstructured 2D line
    with segyio.create(str(path), spec) as f:
        f.bin[segyio.BinField.Interval] = int(dt_ms * 1000)
        f.bin[segyio.BinField.Samples] = n_samples
        for i in range(n_traces):
            f.header[i] = {
                segyio.TraceField.CDP: i + 1,
                segyio.TraceField.TRACE_SEQUENCE_LINE: i + 1,
                segyio.TraceField.SourceGroupScalar: -100,
                segyio.TraceField.CDP_X: int(round((400000 + x[i]) * 100)),
                segyio.TraceField.CDP_Y: int(round(5000000 * 100)),
                segyio.TraceField.TRACE_SAMPLE_COUNT: n_samples,
                segyio.TraceField.TRACE_SAMPLE_INTERVAL: int(dt_ms * 1000),
            }
        f.trace = data


def _time_read(path):
    import segyio

    t0 = time.perf_counter()
    with segyio.open(str(path), ignore_geometry=True) as f:
        data = f.trace.raw[:]
    dt = time.perf_counter() - t0
    assert data.shape[0] > 0
    return dt


def _time_analyze(path, uncertainty):
    import clinometry

    t0 = time.perf_counter()
    c0 = time.process_time()
    res = clinometry.analyze(str(path), velocity=2500.0, uncertainty=uncertainty)
    dt = time.perf_counter() - t0
    return dt, len(res.to_dict()["margins"]), time.process_time() - c0


_PEAK_SNIPPET = r"""
import json, sys, warnings
warnings.simplefilter("ignore")

def hwm_mb():
    # peak resident set of this process image (VmHWM, reset by exec; unlike
    # ru_maxrss, which keeps the value of the process that forked us)
    with open("/proc/self/status") as f:
        for line in f:
            if line.startswith("VmHWM:"):
                return int(line.split()[1]) / 1024
    import resource
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024

import clinometry
base = hwm_mb()
clinometry.analyze(sys.argv[1], velocity=2500.0, uncertainty=True)
print(json.dumps({"base_mb": base, "peak_mb": hwm_mb()}))
"""


def _peak_memory(path):
    out = subprocess.run([sys.executable, "-c", _PEAK_SNIPPET, str(path)], capture_output=True, text=True, check=True)
    return json.loads(out.stdout.strip().splitlines()[-1])


def _batch_time(paths, workers, out):
    t0 = time.perf_counter()
    r = subprocess.run(
        [sys.executable, "-m", "clinometry", "batch", *map(str, paths), "--out", str(out),
         "--workers", str(workers), "--no-plot", "--quiet", "--velocity", "2500"],
        capture_output=True, text=True,
    )
    dt = time.perf_counter() - t0
    if r.returncode != 0:
        raise RuntimeError(f"batch failed ({r.returncode}): {r.stderr.strip()[-500:]}")
    return dt


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--sizes", type=int, nargs="+", default=[1000, 4000, 16000], help="traces per line")
    ap.add_argument("--samples", type=int, default=1500, help="samples per trace")
    ap.add_argument("--formats", nargs="+", default=["ibm", "ieee"], choices=["ibm", "ieee"])
    ap.add_argument("--repeat", type=int, default=3, help="runs per measurement (median quoted)")
    ap.add_argument("--batch-lines", type=int, default=16)
    ap.add_argument("--batch-traces", type=int, default=1000)
    ap.add_argument("--quick", action="store_true", help="1 000 and 4 000 traces, IEEE only, 1 run, 4-line batch")
    ap.add_argument("--no-batch", action="store_true")
    args = ap.parse_args(argv)
    if args.quick:
        args.sizes, args.formats, args.repeat, args.batch_lines = [1000, 4000], ["ieee"], 1, 4

    rows = []
    with tempfile.TemporaryDirectory() as tmp:
        tmp = Path(tmp)
        for fmt in args.formats:
            for n in args.sizes:
                path = tmp / f"line_{fmt}_{n}.sgy"
                make_line(path, n, args.samples, fmt)
                _time_analyze(path, False)  # warm-up (imports, caches)
                reads = [_time_read(path) for _ in range(args.repeat)]
                an = [_time_analyze(path, False) for _ in range(args.repeat)]
                anu = [_time_analyze(path, True) for _ in range(args.repeat)]
                mem = _peak_memory(path)
                load = os.getloadavg()[0]
                r = statistics.median(reads)
                a = statistics.median(t for t, _, _ in an)
                au = statistics.median(t for t, _, _ in anu)
                # CPU seconds of this process: less sensitive to other load than wall time
                cpu = statistics.median(c for _, _, c in an)
                f32_mb = n * args.samples * 4 / 2**20
                rows.append({
                    "format": fmt, "traces": n, "read_s": r, "analyze_s": a, "analyze_unc_s": au,
                    "ratio": a / r, "ratio_unc": au / r, "ms_per_trace": 1000 * a / n,
                    "analyze_cpu_s": cpu, "cpu_ms_per_trace": 1000 * cpu / n,
                    "margins": an[0][1], "peak_mb": mem["peak_mb"], "base_mb": mem["base_mb"],
                    "float32_mb": f32_mb, "mem_budget_mb": 4 * f32_mb + 300, "load_1min": load,
                })
                print(json.dumps(rows[-1]), file=sys.stderr, flush=True)
        batch = None
        if not args.no_batch:
            paths = []
            for i in range(args.batch_lines):
                p = tmp / f"batch_{i:02d}.sgy"
                make_line(p, args.batch_traces, args.samples, "ieee", seed=i)
                paths.append(p)
            # alternate the two settings so a change of machine load hits both alike
            t1s, t2s = [], []
            for k in range(args.repeat):
                t1s.append(_batch_time(paths, 1, tmp / f"b1_{k}"))
                t2s.append(_batch_time(paths, 2, tmp / f"b2_{k}"))
            batch = (statistics.median(t1s), statistics.median(t2s), os.getloadavg()[0])

    print(f"\nclinometry {__import__('clinometry').__version__}; {os.cpu_count()} cores; "
          f"{args.samples} samples per trace; medians of {args.repeat} run(s)\n")
    print("| format | traces | segyio read (s) | analyze (s) | ratio | analyze + uncertainty (s) | ratio | ms/trace | scaling vs smallest | analyze CPU (s) | CPU scaling | peak RSS (MB) | RSS after imports (MB) | budget 4x float32 + 300 (MB) | load (1 min) |")
    print("|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|")
    for fmt in args.formats:
        sub = [r for r in rows if r["format"] == fmt]
        base = sub[0]["ms_per_trace"]
        base_cpu = sub[0]["cpu_ms_per_trace"]
        for r in sub:
            print(f"| {fmt} | {r['traces']} | {r['read_s']:.3f} | {r['analyze_s']:.2f} | {r['ratio']:.1f} | "
                  f"{r['analyze_unc_s']:.2f} | {r['ratio_unc']:.1f} | {r['ms_per_trace']:.3f} | "
                  f"{r['ms_per_trace'] / base:.2f} | {r['analyze_cpu_s']:.2f} | {r['cpu_ms_per_trace'] / base_cpu:.2f} | "
                  f"{r['peak_mb']:.0f} | {r['base_mb']:.0f} | {r['mem_budget_mb']:.0f} | "
                  f"{r['load_1min']:.1f} |")
    if batch:
        t1, t2, load = batch
        print(f"\nbatch of {args.batch_lines} lines x {args.batch_traces} traces (whole CLI runs, --no-plot): "
              f"--workers 1 {t1:.1f} s, --workers 2 {t2:.1f} s, speed-up {t1 / t2:.2f} (load average {load:.1f})")
    print("\nload: the 1-minute load average of the machine after each row; above about 0.5 on 2 cores, "
          "other processes shared the cores and the times are upper bounds")


if __name__ == "__main__":
    main()
