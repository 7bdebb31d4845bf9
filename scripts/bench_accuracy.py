"""Accuracy of the default picker (and the metrics) on forward-model lines with known truth.

Runs ``clinometry.picking.pick`` and ``clinometry.metrics.measure`` over
synthetic lines from ``clinometry.synth.make_line`` across SNR inf, 6, 3 and
1.5, varying the wavelet peak frequency (15-40 Hz), velocity (constant and
linear v(z)), trace spacing, line azimuth and recording delay, and prints
per SNR (medians over the margins): break position error (m, along-line),
break depth error (m), maximum-slope error (deg), relief error (%), the
margin detection rate, the number of false margins on lines that have
none, and how many found margins get the true shelf-break trajectory class
(ascending / flat / descending; a margin without a measured trajectory
counts as wrong), and the median absolute trajectory-angle error (deg) over
the margins where both the truth and the pick have a trajectory (their
number in brackets).  Slope and relief come from ``clinometry.metrics.measure`` (said in
the output).

Usage::

    python scripts/bench_accuracy.py           # full run (a few minutes)
    python scripts/bench_accuracy.py --quick   # a smaller set (~1 minute)

The picker is given the true velocity model of each line: this measures
picking, not velocity error.
"""

from __future__ import annotations

import argparse
import itertools
import math
import sys
import time
import warnings

import numpy as np

from clinometry.depth import ConstantVelocity, LinearVelocity
from clinometry.metrics import measure
from clinometry.picking import pick
from clinometry.picking.margins import to_depth
from clinometry.synth import SCENARIOS, make_line

NO_MARGIN = "flat_basin"
SNRS = (math.inf, 6.0, 3.0, 1.5)
#: (peak_hz, velocity_m_s, velocity_k_per_s, trace_spacing_m, azimuth_deg, delay_ms);
#: delays are kept below the platform-top time of the scenarios (~100 ms) so
#: the margin lies inside the recorded window
VARIANTS = (
    (30.0, None, None, None, None, None),
    (15.0, 3200.0, None, 25.0, 60.0, 40.0),
    (40.0, 2200.0, 0.4, 6.25, 135.0, 0.0),
    (20.0, 2800.0, None, 12.5, 300.0, 50.0),
)


def _velocity(truth):
    v = truth["velocity"]
    if v.get("model") == "linear":
        return LinearVelocity(v["v0_m_s"], v["k_per_s"])
    return ConstantVelocity(v.get("v_m_s", 2500.0))


def _line(scenario, snr, seed, variant):
    hz, vel, k, dx, az, delay = variant
    kw = {"seed": seed, "peak_hz": hz, "velocity_m_s": vel, "velocity_k_per_s": k, "trace_spacing_m": dx,
          "azimuth_deg": az, "delay_ms": delay}
    kw = {a: b for a, b in kw.items() if b is not None}
    if math.isinf(snr):
        return make_line(scenario, noise=False, **kw)
    return make_line(scenario, snr=snr, **kw)


def _match(truth_margin, picked):
    same = [m for m in picked if m.direction == truth_margin["direction"] and m.shelf_break is not None]
    if not same:
        return None
    tb = truth_margin["break"]["trace"]
    tt = truth_margin["toe"]["trace"] if truth_margin.get("toe") else tb
    lo, hi = min(tb, tt), max(tb, tt)
    width = max(hi - lo, 1)

    def dist(m):
        return abs(m.shelf_break.trace - tb)

    best = min(same, key=dist)
    # counts as found when its break lies within the truth's slope span
    # widened by the slope width on either side
    return best if lo - width <= best.shelf_break.trace <= hi + width else None


def run(quick: bool, verbose: bool = False, scenarios=None, seeds=None):
    scen = [s for s in SCENARIOS if s != NO_MARGIN and (not scenarios or s in scenarios)]
    variants = VARIANTS[:2] if quick else VARIANTS
    seeds = tuple(seeds) if seeds else (0,) if quick else (0, 1)
    rows = {snr: {"bpos": [], "bdep": [], "slope": [], "relief": [], "found": 0, "n": 0, "false": 0, "n_none": 0, "t": [],
                  "traj_ok": 0, "traj_n": 0, "angle": []} for snr in SNRS}
    for snr, variant, seed in itertools.product(SNRS, variants, seeds):
        for sc in scen + [NO_MARGIN]:
            sec, truth = _line(sc, snr, seed, variant)
            v = _velocity(truth)
            t0 = time.perf_counter()
            with warnings.catch_warnings():
                warnings.simplefilter("ignore")
                picks = pick(sec, velocity=v)
                met = measure(picks, sec, velocity=v, uncertainty=False)
            r = rows[snr]
            r["t"].append(time.perf_counter() - t0)
            if not truth["margins"]:
                r["n_none"] += 1
                r["false"] += len(picks.margins)
                continue
            for tm in truth["margins"]:
                r["n"] += 1
                m = _match(tm, picks.margins)
                if m is None:
                    if verbose:
                        print(f"{sc} snr={snr} var={variant} seed={seed}: MISSED {tm['direction']} break {tm['break']['trace']}; "
                              f"got {[(x.direction, x.shelf_break.trace if x.shelf_break else None, x.confidence) for x in picks.margins]}")
                    continue
                r["found"] += 1
                if verbose:
                    mm_ = met.margins[picks.margins.index(m)].values
                    print(f"{sc} snr={snr} var={variant} seed={seed}: break {m.shelf_break.trace} vs {tm['break']['trace']}, "
                          f"toe {m.toe.trace if m.toe else None} vs {tm['toe']['trace'] if tm.get('toe') else None}, "
                          f"slope {mm_.get('slope_max_deg')} vs {tm['slope_max_deg']:.1f}, relief {mm_.get('relief_m')} vs {tm['relief_m']:.0f}")
                b = m.shelf_break
                r["bpos"].append(abs(float(sec["distance"].values[b.trace]) - tm["break"]["distance_m"]))
                r["bdep"].append(abs(float(to_depth(sec, [b.trace], [b.z], v)[0]) - tm["break"]["depth_m"]))
                mm = met.margins[picks.margins.index(m)]
                s = mm.values.get("slope_max_deg")
                rel = mm.values.get("relief_m")
                if s is not None and tm.get("slope_max_deg") is not None:
                    r["slope"].append(abs(s - tm["slope_max_deg"]))
                if rel is not None and tm.get("relief_m"):
                    r["relief"].append(100.0 * abs(rel - tm["relief_m"]) / tm["relief_m"])
                t_cls = (tm.get("trajectory") or {}).get("class")
                if t_cls is not None:
                    # a margin without a measured trajectory counts as a miss
                    r["traj_n"] += 1
                    got = (mm.trajectory or {}).get("class")
                    r["traj_ok"] += int(got == t_cls)
                    t_ang = tm["trajectory"].get("angle_deg")
                    g_ang = (mm.trajectory or {}).get("angle_deg")
                    if t_ang is not None and g_ang is not None:
                        r["angle"].append(abs(g_ang - t_ang))
                    if verbose:
                        print(f"    trajectory {got} vs {t_cls}, angle {g_ang} vs {t_ang}")
    return rows, len(scen), variants, seeds


def _med(v):
    return f"{np.median(v):.1f}" if v else "n/a"


def _med2(v):
    return f"{np.median(v):.2f}" if v else "n/a"


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true", help="fewer variants and seeds (about a minute)")
    ap.add_argument("--verbose", action="store_true", help="one line per margin")
    ap.add_argument("--scenarios", nargs="+", metavar="NAME", help="only these margin scenarios (for quick checks)")
    ap.add_argument("--seeds", nargs="+", type=int, metavar="N", help="noise/geometry seeds (default 0 1; 0 with --quick)")
    args = ap.parse_args(argv)
    t0 = time.perf_counter()
    rows, n_scen, variants, seeds = run(args.quick, args.verbose, args.scenarios, args.seeds)
    print(f"# picker accuracy on clinometry.synth lines ({n_scen} margin scenarios + 1 no-margin, "
          f"{len(variants)} wavelet/velocity/spacing/header variants, seeds {list(seeds)})")
    print("slope and relief from clinometry.metrics.measure; errors are medians over found margins\n")
    print("| SNR | break position error (m) | break depth error (m) | max-slope error (deg) | relief error (%) | margins found | false margins (no-margin lines) | trajectory class right | trajectory angle error (deg) | s/line |")
    print("|---|---|---|---|---|---|---|---|---|---|")
    for snr, r in rows.items():
        label = "inf" if math.isinf(snr) else f"{snr:g}"
        print(f"| {label} | {_med(r['bpos'])} | {_med(r['bdep'])} | {_med(r['slope'])} | {_med(r['relief'])} | "
              f"{r['found']}/{r['n']} | {r['false']} on {r['n_none']} | {r['traj_ok']}/{r['traj_n']} | {_med2(r['angle'])} ({len(r['angle'])}) | {np.mean(r['t']):.2f} |")
    print(f"\ntotal {time.perf_counter() - t0:.0f} s")
    return 0


if __name__ == "__main__":
    sys.exit(main())
