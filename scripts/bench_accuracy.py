"""Accuracy of the default picker (and the metrics and classifier) on forward-model lines with known truth.

Runs ``clinometry.picking.pick``, then ``clinometry.metrics.measure`` and
``clinometry.classify.classify`` as the pipeline does, over synthetic lines
from ``clinometry.synth.make_line``, and prints three tables.

1. **Grown margins** (the original table): the 9 grown margin scenarios and
   the grown no-margin line across SNR inf, 6, 3 and 1.5, in 4 variants of
   wavelet peak frequency (15-40 Hz), velocity (constant and linear v(z)),
   trace spacing, line azimuth and recording delay.  Per SNR (medians over
   the margins found): break position error (m, along-line), break depth
   error (m), maximum-slope error (deg), relief error (%), margins found,
   false margins on the lines that have none, trajectory class right
   (ascending / flat / descending; a found margin without a measured
   trajectory counts as wrong), median absolute trajectory-angle error
   (deg, over the margins where both truth and pick have a trajectory,
   their number in brackets), and -- added -- family right (of the true
   margins; a missed margin counts as wrong).
2. **Settings and conditions** (analytic lines of
   ``clinometry.synth.ANALYTIC_SCENARIOS`` and recording conditions): one
   row per setting -- mounds, mound pairs, the saddle-facing flanks alone,
   drape, onlapping / back-tilted / dipping fill, thick drape, analytic
   margins, ramps, reversed polarity, gain step, dead traces, 15 Hz, 25 m
   and 50 m traces (the lines are at 12.5 m otherwise), depth domain, random amplitude scale, white and
   band-limited noise, flat and folded layers -- with margins found, false
   margins (picked margins matched to no true margin, on every line of the
   row), break position and depth error, max-slope error, relief error (medians),
   family right (of the true margins) and picker errors (exceptions).  A
   ramp has no break in the truth: a pick counts as found when its break
   (or toe) lies on the ramp's descending span, and only slope, relief and
   family are compared.  Seed 0 uses each analytic geometry as named; other
   seeds draw it around the named one (slopes and depths +-10 %, positions
   +-200 m; ``clinometry.synth.settings.draw_variant``), so more seeds test
   more geometries, not only more noise.
3. **Confidence calibration**: every picked margin of the run, binned by
   the confidence the picker reports (``MarginPicks.confidence``), against
   the fraction whose family is right (false margins count as wrong).

Matching: each true margin takes the nearest unused pick facing the same way
whose break lies within the true break-to-toe span widened by its width on
either side (by position along the line, as the original table did: a drape
reflector picked above a buried flank counts as found and shows up in the
slope, relief and family columns).

Usage::

    python scripts/bench_accuracy.py           # full run
    python scripts/bench_accuracy.py --quick   # fewer variants, SNRs and seeds (a few minutes)
    python scripts/bench_accuracy.py --scenarios mound_pair_narrow ramp_homoclinal --verbose
    python scripts/bench_accuracy.py --tables settings --seeds 2 3

The picker is given the true velocity model of each line: this measures
picking, not velocity error.  These are invented forward-model lines; scores
on them are an upper bound for real data.
"""

from __future__ import annotations

import argparse
import itertools
import math
import sys
import time
import warnings

import numpy as np

from clinometry.classify import classify
from clinometry.depth import ConstantVelocity, LinearVelocity, horizon_to_depth
from clinometry.metrics import measure
from clinometry.picking import pick
from clinometry.synth import ANALYTIC_SCENARIOS, SCENARIOS, make_line
from clinometry.synth.settings import draw_variant

NO_MARGIN = "flat_basin"
SNRS = (math.inf, 6.0, 3.0, 1.5)
QUICK_SNRS = (math.inf, 3.0)
#: (peak_hz, velocity_m_s, velocity_k_per_s, trace_spacing_m, azimuth_deg, delay_ms);
#: delays are kept below the platform-top time of the scenarios (~100 ms) so
#: the margin lies inside the recorded window
VARIANTS = (
    (30.0, None, None, None, None, None),
    (15.0, 3200.0, None, 25.0, 60.0, 40.0),
    (40.0, 2200.0, 0.4, 6.25, 135.0, 0.0),
    (20.0, 2800.0, None, 12.5, 300.0, 50.0),
)
#: lines the recording conditions are applied to: a grown shelf, an analytic
#: mound, a margin with onlapping fill and a ramp
CONDITION_BASES = ("rimmed_shelf", "mound_single", "margin_onlap_fill", "ramp_homoclinal")
#: gain step: every trace from this fraction of the line on, multiplied by this factor
GAIN_STEP_AT, GAIN_STEP_FACTOR = 0.4, 3.0
#: dead traces: this fraction of the traces at random, plus one block of this many
DEAD_FRACTION, DEAD_BLOCK = 0.03, 6
#: random global amplitude scale, log10 uniform in this range
AMPLITUDE_LOG10 = (-4.0, 4.0)


def _gain_step(n_tr, rng):
    return {"gain_step": (int(GAIN_STEP_AT * n_tr), GAIN_STEP_FACTOR)}


def _dead(n_tr, rng):
    dead = set(rng.choice(n_tr, size=max(1, int(DEAD_FRACTION * n_tr)), replace=False).tolist())
    start = int(rng.integers(0, n_tr - DEAD_BLOCK))
    dead.update(range(start, start + DEAD_BLOCK))
    return {"dead_traces": sorted(dead)}


def _scale(n_tr, rng):
    return {"amplitude_scale": float(10.0 ** rng.uniform(*AMPLITUDE_LOG10))}


#: recording conditions: name -> make_line options, or a function (n_traces, rng) -> options
CONDITIONS = {
    "reversed polarity": {"polarity_reversed": True},
    f"gain step x{GAIN_STEP_FACTOR:g}": _gain_step,
    "dead traces": _dead,
    "15 Hz wavelet": {"peak_hz": 15.0},
    "25 m traces": {"trace_spacing_m": 25.0},
    "50 m traces": {"trace_spacing_m": 50.0},
    "depth domain": {"domain": "depth", "dz_m": 3.0},
    "amplitude scale": _scale,
}
#: rows of the settings table: (label, scenarios, margin filter)
SETTING_ROWS = (
    ("mounds", ("mound_single", "mound_asymmetric"), None),
    ("mound pairs (all flanks)", ("mound_pair_wide", "mound_pair_narrow"), None),
    ("  saddle-facing flanks", ("mound_pair_wide", "mound_pair_narrow", "mound_pair_drape"), "saddle"),
    ("drape over mounds", ("mound_drape", "mound_pair_drape"), None),
    ("drape over a margin", ("margin_drape",), None),
    ("onlapping fill", ("margin_onlap_fill",), None),
    ("back-tilted fill", ("margin_backtilted_fill",), None),
    ("dipping fill", ("margin_dipping_fill",), None),
    ("thick drape", ("margin_thick_drape",), None),
    ("concave and steep margins", ("margin_concave", "margin_steep_flat"), None),
    ("ramps", ("ramp_homoclinal", "ramp_low_angle", "ramp_distally_steepened"), None),
)
NOISE_ROWS = (
    ("white and band-limited noise", ("white_noise", "bandlimited_noise")),
    ("flat layers", ("flat_layers", NO_MARGIN)),
    ("folded layers", ("folded_layers",)),
)
#: noise lines have no SNR: run once per seed
_NO_SNR = {"white_noise", "bandlimited_noise"}
#: confidence bins of the calibration table
CONF_BINS = (0.0, 0.5, 0.6, 0.7, 0.8, 0.9, 1.0)


def _velocity(truth):
    v = truth["velocity"]
    if v.get("model") == "linear":
        return LinearVelocity(v["v0_m_s"], v["k_per_s"])
    return ConstantVelocity(v.get("v_m_s", 2500.0))


def _variant_kw(variant):
    hz, vel, k, dx, az, delay = variant
    kw = {"peak_hz": hz, "velocity_m_s": vel, "velocity_k_per_s": k, "trace_spacing_m": dx,
          "azimuth_deg": az, "delay_ms": delay}
    return {a: b for a, b in kw.items() if b is not None}


def _make(scenario, snr, seed, kw):
    if math.isinf(snr) or getattr(scenario, "name", scenario).split("@")[0] in _NO_SNR:
        return make_line(scenario, noise=False, seed=seed, **kw)
    return make_line(scenario, snr=snr, seed=seed, **kw)


def _pick_position(m):
    """Trace of a pick used to match it: its break, else its toe, else None."""
    if m.shelf_break is not None:
        return m.shelf_break.trace
    return m.toe.trace if m.toe is not None else None


def _window(tm):
    """(lo, hi) traces a pick must fall in to match true margin ``tm``."""
    if tm.get("break") is None:  # a ramp: its descending span, widened by a quarter
        a, b = tm["span"]["trace_from"], tm["span"]["trace_to"]
        w = 0.25 * (b - a)
        return a - w, b + w, 0.5 * (a + b)
    tb = tm["break"]["trace"]
    tt = tm["toe"]["trace"] if tm.get("toe") else tb
    lo, hi = min(tb, tt), max(tb, tt)
    width = max(hi - lo, 1)
    # found when its break lies within the truth's slope span widened by the slope width on either side
    return lo - width, hi + width, tb


def match(truth_margins, picked):
    """Index of the matched pick for each true margin (None when missed); each pick used once.

    The nearest unused pick facing the same way (by its break; for a ramp by
    its break or toe, and first a pick with neither, matched by direction
    alone) is taken, and kept only when it lies in the window of
    :func:`_window`.  Matching is by position along the line only (as the
    original table did): a drape reflector picked above a buried flank
    counts as found, and shows as a slope, relief and family error.
    """
    used, out = set(), []
    for tm in truth_margins:
        lo, hi, centre = _window(tm)
        ramp = tm.get("break") is None
        cands = []
        for i, m in enumerate(picked):
            if i in used or m.direction != tm["direction"]:
                continue
            pos = _pick_position(m) if ramp else (m.shelf_break.trace if m.shelf_break is not None else None)
            if pos is not None:
                cands.append((abs(pos - centre), i, pos))
            elif ramp:
                # a ramp picked without break or toe (no distinct bend, as the
                # truth of a ramp has none): matched by its direction alone
                cands.append((-1.0, i, centre))
        best = min(cands) if cands else None
        ok = best is not None and lo <= best[2] <= hi
        out.append(best[1] if ok else None)
        if ok:
            used.add(best[1])
    return out


def evaluate(scenario, snr, seed, kw, *, label=""):
    """Make one line, pick, measure, classify; per true margin and per pick records."""
    sec, truth = _make(scenario, snr, seed, kw)
    v = _velocity(truth)
    rec = {"scenario": truth["scenario"], "label": label, "snr": snr, "seed": seed, "margins": [], "picks": [],
           "error": None, "t": 0.0, "n_truth": len(truth["margins"])}
    t0 = time.perf_counter()
    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            picks = pick(sec, velocity=v)
            met = measure(picks, sec, velocity=v, uncertainty=False)
            classes = [classify(mm) for mm in met.margins]
    except Exception as err:  # the bench reports a failing picker, it does not stop
        rec["error"] = f"{type(err).__name__}: {err}"
        rec["t"] = time.perf_counter() - t0
        rec["margins"] = [{"truth": tm, "found": False, "family_ok": False} for tm in truth["margins"]]
        return rec
    rec["t"] = time.perf_counter() - t0
    matched = match(truth["margins"], picks.margins)
    right = {}
    for tm, i in zip(truth["margins"], matched):
        r = {"truth": tm, "found": i is not None, "family_ok": False}
        if i is not None:
            m, mm, cl = picks.margins[i], met.margins[i], classes[i]
            r.update(pick=m, values=mm.values, trajectory=mm.trajectory, family=cl.family,
                     family_ok=cl.family == tm["family"], confidence=m.confidence)
            if tm.get("break") is not None and m.shelf_break is not None:
                b = m.shelf_break
                r["bpos"] = abs(float(sec["distance"].values[b.trace]) - tm["break"]["distance_m"])
                r["bdep"] = abs(float(horizon_to_depth(sec, [b.trace], [b.z], v)[0]) - tm["break"]["depth_m"])
            s, rel = mm.values.get("slope_max_deg"), mm.values.get("relief_m")
            if s is not None and tm.get("slope_max_deg") is not None:
                r["slope"] = abs(s - tm["slope_max_deg"])
            if rel is not None and tm.get("relief_m"):
                r["relief"] = 100.0 * abs(rel - tm["relief_m"]) / tm["relief_m"]
            right[i] = r["family_ok"]
        rec["margins"].append(r)
    for i, m in enumerate(picks.margins):
        rec["picks"].append({"confidence": float(m.confidence), "matched": i in right, "family_ok": right.get(i, False),
                             "direction": m.direction, "break": _pick_position(m)})
    return rec


def _say(rec):
    head = f"{rec['scenario']} [{rec['label']}] snr={rec['snr']} seed={rec['seed']}"
    if rec["error"]:
        print(f"{head}: PICKER ERROR {rec['error']}")
    for r in rec["margins"]:
        tm = r["truth"]
        tb = tm["break"]["trace"] if tm.get("break") else f"span {tm['span']['trace_from']}-{tm['span']['trace_to']}"
        if not r["found"]:
            got = [(p["direction"], p["break"], round(p["confidence"], 2)) for p in rec["picks"]]
            print(f"{head}: MISSED {tm['direction']} {tm.get('role', '')} break {tb}; got {got}")
            continue
        m, vals = r["pick"], r["values"]
        print(f"{head}: {tm['direction']} {tm.get('role', '')} break {_pick_position(m)} vs {tb}, "
              f"slope {vals.get('slope_max_deg')} vs {tm['slope_max_deg']:.1f}, relief {vals.get('relief_m')} vs "
              f"{tm['relief_m']:.0f}, family {r['family']} vs {tm['family']}, confidence {m.confidence:.2f}")
    for p in rec["picks"]:
        if not p["matched"]:
            print(f"{head}: FALSE margin {p['direction']} at trace {p['break']}, confidence {p['confidence']:.2f}")


def run_grown(quick, verbose, scenarios, seeds):
    """Table 1 records: grown margin scenarios x variants x SNRs x seeds."""
    scen = [s for s in SCENARIOS if s != NO_MARGIN and (not scenarios or s in scenarios)]
    if not scen:
        return [], scen, (), ()
    variants = VARIANTS[:2] if quick else VARIANTS
    out = []
    for snr, variant, seed in itertools.product(SNRS, variants, seeds):
        for sc in scen + [NO_MARGIN]:
            rec = evaluate(sc, snr, seed, _variant_kw(variant), label=f"variant {VARIANTS.index(variant)}")
            out.append(rec)
            if verbose:
                _say(rec)
    return out, scen, variants, seeds


def _cases(scenarios):
    """(row label, scenario, condition name or None) of the settings table."""
    keep = (lambda s: True) if not scenarios else (lambda s: s in scenarios)
    cases = []
    for label, names, _ in SETTING_ROWS:
        cases += [(label, s, None) for s in names if keep(s)]
    for cond in CONDITIONS:
        cases += [(cond, s, cond) for s in CONDITION_BASES if keep(s)]
    for label, names in NOISE_ROWS:
        cases += [(label, s, None) for s in names if keep(s)]
    return cases


def _condition_kw(scenario, cond, seed):
    spec = CONDITIONS[cond]
    if not callable(spec):
        return dict(spec)
    n_tr = make_line(scenario, n_samples=8, noise=False)[1]["n_traces"]
    return spec(n_tr, np.random.default_rng([seed, list(CONDITIONS).index(cond)]))


def _geometry(scenario, seed, fixed):
    """The scenario as named (seed 0, grown lines, ``fixed``) or its geometry drawn with ``seed``."""
    if fixed or seed == 0 or scenario not in ANALYTIC_SCENARIOS or scenario in _NO_SNR:
        return scenario
    return draw_variant(scenario, seed)


def run_settings(quick, verbose, scenarios, seeds, fixed_geometry=False):
    """Table 2 records keyed by (scenario, condition): one line per SNR and seed."""
    snrs = QUICK_SNRS if quick else SNRS
    done = {}
    for _, scenario, cond in _cases(scenarios):
        if (scenario, cond) in done:
            continue
        recs = []
        for seed in seeds:
            sc = _geometry(scenario, seed, fixed_geometry)
            kw = _condition_kw(sc, cond, seed) if cond else {}
            for snr in ((math.inf,) if scenario in _NO_SNR else snrs):
                rec = evaluate(sc, snr, seed, kw, label=cond or "setting")
                recs.append(rec)
                if verbose:
                    _say(rec)
        done[(scenario, cond)] = recs
    return done


def _med(v, fmt=".1f"):
    return f"{np.median(v):{fmt}}" if v else "n/a"


def _tally(recs, role=None):
    t = {"lines": len(recs), "n": 0, "found": 0, "family": 0, "false": 0, "errors": 0, "t": [],
         "bpos": [], "bdep": [], "slope": [], "relief": []}
    for rec in recs:
        t["t"].append(rec["t"])
        t["errors"] += rec["error"] is not None
        t["false"] += sum(not p["matched"] for p in rec["picks"])
        for r in rec["margins"]:
            if role is not None and r["truth"].get("role") != role:
                continue
            t["n"] += 1
            t["found"] += r["found"]
            t["family"] += r["family_ok"]
            for k in ("bpos", "bdep", "slope", "relief"):
                if k in r:
                    t[k].append(r[k])
    return t


def print_grown(recs, scen, variants, seeds):
    print(f"# 1. grown margins: clinometry.synth lines ({len(scen)} margin scenarios + 1 no-margin, "
          f"{len(variants)} wavelet/velocity/spacing/header variants, seeds {list(seeds)})")
    print("slope and relief from clinometry.metrics.measure, family from clinometry.classify.classify; "
          "errors are medians over found margins\n")
    print("| SNR | break position error (m) | break depth error (m) | max-slope error (deg) | relief error (%) | "
          "margins found | false margins (no-margin lines) | trajectory class right | trajectory angle error (deg) | "
          "s/line | family right |")
    print("|---|---|---|---|---|---|---|---|---|---|---|")
    for snr in SNRS:
        rs = [r for r in recs if r["snr"] == snr]
        t = _tally([r for r in rs if r["scenario"] != NO_MARGIN])
        none = [r for r in rs if r["scenario"] == NO_MARGIN]
        false = sum(len(r["picks"]) for r in none)
        traj_ok = traj_n = 0
        angle = []
        for rec in rs:
            for r in rec["margins"]:
                t_cls = (r["truth"].get("trajectory") or {}).get("class")
                if not r["found"] or t_cls is None:
                    continue
                # a margin without a measured trajectory counts as a miss
                traj_n += 1
                got = (r["trajectory"] or {}).get("class")
                traj_ok += int(got == t_cls)
                t_ang, g_ang = r["truth"]["trajectory"].get("angle_deg"), (r["trajectory"] or {}).get("angle_deg")
                if t_ang is not None and g_ang is not None:
                    angle.append(abs(g_ang - t_ang))
        label = "inf" if math.isinf(snr) else f"{snr:g}"
        times = [r["t"] for r in rs]
        print(f"| {label} | {_med(t['bpos'])} | {_med(t['bdep'])} | {_med(t['slope'])} | {_med(t['relief'])} | "
              f"{t['found']}/{t['n']} | {false} on {len(none)} | {traj_ok}/{traj_n} | {_med(angle, '.2f')} ({len(angle)}) | "
              f"{np.mean(times):.2f} | {t['family']}/{t['n']} |")


def print_settings(done, scenarios, snrs, seeds):
    print(f"\n# 2. settings and conditions: analytic lines and recording conditions "
          f"(SNR {', '.join('inf' if math.isinf(s) else f'{s:g}' for s in snrs)}; seeds {list(seeds)}; "
          f"conditions on {', '.join(CONDITION_BASES)}; analytic geometry as named for seed 0, drawn around "
          "it for other seeds unless --fixed-geometry)")
    print("false margins: picks matched to no true margin; family right of the true margins (missed = wrong); "
          "errors are medians over found margins\n")
    print("| setting | lines | margins found | false margins | break position error (m) | break depth error (m) | "
          "max-slope error (deg) | relief error (%) | family right | picker errors | s/line |")
    print("|---|---|---|---|---|---|---|---|---|---|---|")
    rows = {}
    for label, scenario, cond in _cases(scenarios):
        rows.setdefault(label, []).append((scenario, cond))
    roles = {label: role for label, _, role in SETTING_ROWS}
    total = []
    for label, keys in rows.items():
        recs = [rec for k in keys for rec in done[k]]
        role = roles.get(label)
        t = _tally(recs, role)
        if role is None:
            total += recs
        false = "-" if role is not None else str(t["false"])
        lines = "-" if role is not None else str(t["lines"])
        print(f"| {label} | {lines} | {t['found']}/{t['n']} | {false} | {_med(t['bpos'])} | {_med(t['bdep'])} | "
              f"{_med(t['slope'])} | {_med(t['relief'])} | {t['family']}/{t['n']} | {t['errors']} | "
              f"{np.mean(t['t']):.2f} |")
    t = _tally(total)
    print(f"| **all rows** | {t['lines']} | {t['found']}/{t['n']} | {t['false']} | {_med(t['bpos'])} | "
          f"{_med(t['bdep'])} | {_med(t['slope'])} | {_med(t['relief'])} | {t['family']}/{t['n']} | {t['errors']} | "
          f"{np.mean(t['t']) if t['t'] else 0:.2f} |")
    if t["n"]:
        print(f"\nfamily accuracy on the settings table: {t['family'] / t['n']:.2f} of true margins; "
              f"{t['family'] / max(t['found'], 1):.2f} of found margins")


def print_calibration(recs, what="every picked margin of this run"):
    picks = [p for rec in recs for p in rec["picks"]]
    print(f"\n# 3. confidence calibration: {what} ({len(picks)}), by the confidence "
          "the picker reports, against the fraction whose family is right (false margins count as wrong)\n")
    print("| confidence | margins | family right | fraction right | false margins |")
    print("|---|---|---|---|---|")
    for lo, hi in zip(CONF_BINS[:-1], CONF_BINS[1:]):
        last = hi == CONF_BINS[-1]
        sel = [p for p in picks if lo <= p["confidence"] < hi or (last and p["confidence"] == hi)]
        ok = sum(p["family_ok"] for p in sel)
        frac = f"{ok / len(sel):.2f}" if sel else "n/a"
        print(f"| {lo:.1f}-{hi:.1f} | {len(sel)} | {ok} | {frac} | {sum(not p['matched'] for p in sel)} |")


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true",
                    help="fewer variants (2), SNRs (inf and 3 in the settings table) and seeds (0): a few minutes")
    ap.add_argument("--verbose", action="store_true", help="one line per margin, missed and false margin")
    ap.add_argument("--scenarios", nargs="+", metavar="NAME",
                    help="only these scenarios, grown or analytic (the grown no-margin line runs with table 1)")
    ap.add_argument("--seeds", nargs="+", type=int, metavar="N", help="noise/impedance seeds (default 0 1; 0 with --quick)")
    ap.add_argument("--tables", choices=("all", "grown", "settings"), default="all",
                    help="which tables to run (the calibration table covers what was run)")
    ap.add_argument("--fixed-geometry", action="store_true",
                    help="settings table: every seed on the named geometry (default: seeds other than 0 draw "
                         "the analytic geometry around it, clinometry.synth.settings.draw_variant)")
    args = ap.parse_args(argv)
    unknown = [s for s in args.scenarios or () if s not in SCENARIOS and s not in ANALYTIC_SCENARIOS]
    if unknown:
        ap.error(f"unknown scenario(s) {unknown}; choose from {sorted(SCENARIOS) + sorted(ANALYTIC_SCENARIOS)}")
    seeds = tuple(args.seeds) if args.seeds else (0,) if args.quick else (0, 1)
    t0 = time.perf_counter()
    grown, done = [], {}
    if args.tables in ("all", "grown"):
        grown, scen, variants, _ = run_grown(args.quick, args.verbose, args.scenarios, seeds)
        if scen:
            print_grown(grown, scen, variants, seeds)
    t1 = time.perf_counter()
    if args.tables in ("all", "settings"):
        done = run_settings(args.quick, args.verbose, args.scenarios, seeds, args.fixed_geometry)
        if done:
            print_settings(done, args.scenarios, QUICK_SNRS if args.quick else SNRS, seeds)
    t2 = time.perf_counter()
    settings = [rec for recs in done.values() for rec in recs]
    print_calibration(grown + settings)
    if grown and settings:
        print_calibration(settings, "the picked margins of the settings table alone")
    print(f"\ntotal {t2 - t0:.0f} s (grown table {t1 - t0:.0f} s, settings table {t2 - t1:.0f} s)")
    return 0


if __name__ == "__main__":
    sys.exit(main())
