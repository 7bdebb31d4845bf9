"""Synthetic seismic lines with exact ground truth: :func:`make_line`.

A scenario is grown (:mod:`clinometry.synth.growth`), placed below a datum
(final sea level at ``datum_depth_m`` below the z origin, the space above
filled by a flat-layered overburden), rendered to seismic
(:mod:`clinometry.synth.seismic`) and measured
(:mod:`clinometry.synth.truth`).  The truth uses the same key names as the
analysis result JSON, per margin: ``direction`` ("+" when basinward is
towards increasing trace index), ``family``, ``break`` and ``toe`` (``trace``,
``distance_m``, ``depth_m``, ``x``, ``y``, ``z`` in the section's z units),
``relief_m``, ``slope_max_deg``, ``slope_mean_deg``, ``clinoforms`` (oldest to
youngest) and ``trajectory`` (``angle_deg``, ``class``).
"""

from __future__ import annotations

import dataclasses
import logging

import numpy as np

from ..errors import GeometryError
from ..section import make_section
from .conditions import apply_conditions, check_dead_traces, describe_conditions, noise_wavelet
from .growth import grow
from ..definitions import BASE_LENGTH_TRACES, SLOPE_MAX_QUANTILE
from .scenarios import Scenario, get_scenario
from .seismic import SynthVelocity, render
from .truth import SMOOTHING_M, TRAJECTORY_FLAT_DEG, profile_margin, trajectory

__all__ = ["make_line", "grown_surfaces", "TRUTH_SCHEMA_VERSION", "line_geometry", "margins_truth",
           "margin_record", "clinoform_rows", "truth_definitions"]

logger = logging.getLogger(__name__)

TRUTH_SCHEMA_VERSION = 1
#: first clinoform reported, as a fraction of the growth steps (project choice)
_CLINO_START_FRACTION = 0.2
#: number of clinoforms reported per margin (project choice)
_N_CLINOFORMS = 9


def line_geometry(n_traces, *, trace_spacing_m, azimuth_deg, origin_xy_m):
    """Trace coordinates of a straight line with an azimuth (deg from grid north).

    Examples
    --------
    >>> x, y = line_geometry(3, trace_spacing_m=10.0, azimuth_deg=90.0, origin_xy_m=(0.0, 0.0))
    >>> np.round(x, 6).tolist(), np.round(y, 6).tolist()
    ([0.0, 10.0, 20.0], [0.0, 0.0, 0.0])
    """
    d = np.arange(n_traces) * float(trace_spacing_m)
    a = np.deg2rad(azimuth_deg)
    return origin_xy_m[0] + d * np.sin(a), origin_xy_m[1] + d * np.cos(a)


def truth_definitions():
    """The ``definitions`` record of a truth JSON (how break, toe, slope and depth are defined)."""
    return {"smoothing_m": SMOOTHING_M, "base_length_traces": BASE_LENGTH_TRACES,
            "slope_max_quantile": SLOPE_MAX_QUANTILE,
            "trajectory_flat_tolerance_deg": TRAJECTORY_FLAT_DEG,
            "break": "max convex-up curvature between platform top and steepest point",
            "toe": "max concave-up curvature between steepest point and basin floor",
            "slope_max": ("80th percentile of least-squares dips over a horizontal base wholly between break "
                          "and toe, base = max(3 traces, the length over which one depth sample changes the "
                          "dip by a tenth); as clinometry.metrics.slope"),
            "depth_m": "below the z origin (time zero), positive down"}


def _point(i, depth_m, *, distance, x, y, to_z):
    return {"trace": int(i), "distance_m": float(distance[i]), "depth_m": float(depth_m),
            "x": float(x[i]), "y": float(y[i]), "z": float(to_z(depth_m))}


def margins_truth(depths, *, sides, distance, x, y, to_z, family, n_steps, depth_sample_m=None):
    """Truth of every margin of a grown section.

    Parameters
    ----------
    depths : ndarray, shape (n_steps + 1, n_trace), m
        Depth of each stratal surface below the z origin, positive down.
    sides : {"+", "-", "+-"}
        Directions in which the platform exported sediment.
    distance, x, y : ndarray, shape (n_trace,), m
    to_z : callable
        Depth (m) -> z in the section's units.
    family : str or None
    n_steps : int
    depth_sample_m : callable, optional
        Depth (m) -> one seismic sample in m there; sets the precision term
        of the max-slope base (:func:`clinometry.synth.truth.profile_margin`).

    Returns
    -------
    list of dict
        One entry per margin found (see the module docstring); empty when the
        final surface has no margin.
    """
    final = depths[-1]
    n = final.size
    if sides == "+-":
        top = np.flatnonzero(final <= final.min() + 2.0)
        centre = int(round(0.5 * (top[0] + top[-1])))
        segs = {"-": np.arange(centre, -1, -1), "+": np.arange(centre, n)}
    elif sides == "+":
        segs = {"+": np.arange(n)}
    else:
        segs = {"-": np.arange(n - 1, -1, -1)}
    out = []
    steps = np.unique(np.linspace(int(_CLINO_START_FRACTION * n_steps), n_steps,
                                  _N_CLINOFORMS).astype(int))
    pt = dict(distance=distance, x=x, y=y, to_z=to_z)
    for direction, idx in segs.items():
        rec = margin_record(depths, idx, direction=direction, family=family,
                            clinoform_rows=[(int(k), int(k)) for k in steps], pt=pt,
                            depth_sample_m=depth_sample_m)
        if rec is not None:
            out.append(_as_ramp(rec) if family == "ramp" else rec)
    return out


def _as_ramp(rec):
    """A ramp's truth: no distinct break or toe (its dip changes over kilometres), slope and relief over its span.

    The curvature extrema that the margin truth takes for break and toe give
    the span over which the ramp descends; a ramp has no distinct shelf
    break (Ahr 1973; Burchette & Wright 1992, from memory), so break and toe
    are null with a reason, as the picker reports them.
    """
    out = dict(rec)
    b, t = rec["break"], rec["toe"]
    lo, hi = sorted((b["trace"], t["trace"]))
    out["span"] = {"trace_from": int(lo), "trace_to": int(hi),
                   "distance_from_m": float(min(b["distance_m"], t["distance_m"])),
                   "distance_to_m": float(max(b["distance_m"], t["distance_m"])),
                   "definition": "between the curvature extrema of the youngest ramp profile"}
    out["break"] = None
    out["toe"] = None
    out["break_reason"] = "no distinct break: a ramp whose dip changes gradually over kilometres"
    out["toe_reason"] = "no distinct toe: the ramp flattens gradually into the basin"
    out["trajectory"] = None
    return out


def clinoform_rows(rows, *, start_fraction=_CLINO_START_FRACTION, n=_N_CLINOFORMS):
    """(stage, row) pairs of the clinoforms reported for a body whose stages are ``rows``.

    The same choice as for grown lines: from ``start_fraction`` of the stages
    to the youngest, at most ``n`` of them.

    Examples
    --------
    >>> clinoform_rows([3, 4, 5, 6, 7, 8])
    [(1, 4), (2, 5), (3, 6), (4, 7), (5, 8)]
    """
    rows = list(rows)
    last = len(rows) - 1
    steps = np.unique(np.linspace(int(start_fraction * last), last, n).astype(int))
    return [(int(k), int(rows[k])) for k in steps]


def margin_record(depths, idx, *, direction, family, clinoform_rows, pt, depth_sample_m=None, final_row=-1):
    """Truth of one margin profile: break, toe, slope, relief, clinoforms and trajectory.

    Parameters
    ----------
    depths : ndarray, shape (n_surf, n_trace), m
        Depth of each stratal surface, positive down.
    idx : ndarray of int
        Trace indices of the profile in basinward order.
    direction : {"+", "-"}
    family : str or None
    clinoform_rows : list of (int, int)
        ``(step, row)`` of each clinoform surface, oldest first.
    pt : dict
        ``distance``, ``x``, ``y`` (arrays by trace) and ``to_z`` (depth -> z).
    depth_sample_m : callable, optional
        As in :func:`margins_truth`.
    final_row : int
        Row of the margin's outer surface (default the youngest).

    Returns
    -------
    dict or None
        None when the profile has no margin (:func:`clinometry.synth.truth.profile_margin`).
    """
    distance = pt["distance"]
    final = depths[final_row]
    s = np.abs(distance[idx] - distance[idx[0]])
    m = profile_margin(s, final[idx], depth_sample_m=depth_sample_m)
    if m is None:
        return None
    ib, it = idx[m["break"]], idx[m["toe"]]
    clinos = []
    for k, row in clinoform_rows:
        mk = profile_margin(s, depths[row][idx], depth_sample_m=depth_sample_m)
        if mk is None:
            continue
        kb, kt = idx[mk["break"]], idx[mk["toe"]]
        clinos.append({"step": int(k),
                       "break": _point(kb, depths[row][kb], **pt),
                       "toe": _point(kt, depths[row][kt], **pt),
                       "relief_m": mk["relief_m"], "slope_max_deg": mk["slope_max_deg"],
                       "slope_mean_deg": mk["slope_mean_deg"]})
    traj = None
    if len(clinos) >= 3:
        bs = np.array([abs(c["break"]["distance_m"] - distance[idx[0]]) for c in clinos])
        bd = np.array([c["break"]["depth_m"] for c in clinos])
        traj = trajectory(bs, bd)
    top_idx = idx[: m["break"] + 1]
    return {
        "direction": direction,
        "family": family,
        "platform_top": {"depth_m": float(np.median(final[top_idx])),
                         "trace_from": int(min(top_idx[0], top_idx[-1])),
                         "trace_to": int(max(top_idx[0], top_idx[-1]))},
        "break": _point(ib, final[ib], **pt),
        "toe": _point(it, final[it], **pt),
        "steepest": _point(idx[m["steepest"]], final[idx[m["steepest"]]], **pt),
        "relief_m": m["relief_m"],
        "slope_max_deg": m["slope_max_deg"],
        "slope_mean_deg": m["slope_mean_deg"],
        "clinoforms": clinos,
        "trajectory": traj,
    }


def grown_surfaces(scenario, *, trace_spacing_m=None):
    """Depth of every stratal surface of a scenario, as laid out along its line.

    Parameters
    ----------
    scenario : str or Scenario
    trace_spacing_m : float, m, optional
        As in :func:`make_line`.

    Returns
    -------
    ndarray, shape (n_steps + 1, n_trace), m
        Depth below the z origin, positive down; row 0 is the substrate top,
        the last row the youngest surface (flipped like the line).
    """
    sc = get_scenario(scenario)
    g = sc.growth if trace_spacing_m is None else dataclasses.replace(sc.growth, dx_m=float(trace_spacing_m))
    depths = grow(g).depth_below_m(sc.datum_depth_m)
    return depths[:, ::-1] if sc.flip else depths


def make_line(scenario, *, snr=None, seed=0, peak_hz=None, velocity_m_s=None,
              velocity_k_per_s=None, domain="twt", dt_ms=None, dz_m=None, n_samples=None,
              delay_ms=None, trace_spacing_m=None, azimuth_deg=None, polarity_reversed=False,
              gain_drift_fraction=0.0, dead_traces=(), noise=True, gain_step=None, amplitude_scale=1.0):
    """Grow a scenario and render it as a seismic section with its ground truth.

    Parameters
    ----------
    scenario : str, Scenario or AnalyticScenario
        Name in :data:`~clinometry.synth.ALL_SCENARIOS` or a scenario object;
        analytic settings (mounds, fill, drape, ramps, layered and noise
        lines) are made by :func:`clinometry.synth.analytic.make_analytic_line`.
    snr : float, optional
        Signal-to-noise ratio, RMS(noise-free section) / RMS(noise) over live
        traces; default the scenario's.  ``noise=False`` switches noise off.
    seed : int
        Seeds impedance variation and noise (the geometry is deterministic).
    peak_hz : float, Hz, optional
        Ricker peak frequency (typically 15-40 Hz).
    velocity_m_s, velocity_k_per_s : float, optional
        Time-depth law ``v(z) = v0 + k z`` (m/s, 1/s).
    domain : {"twt", "depth"}
    dt_ms, dz_m : float, optional
        Sample interval in the twt (ms) or depth (m) domain.
    n_samples : int, optional
    delay_ms : float, optional
        First sample (ms, or m in the depth domain); a multiple of the
        sample interval is not required but must be an integer for SEG-Y.
    trace_spacing_m : float, m, optional
        Changes the growth grid too.
    azimuth_deg : float, degrees from grid north, optional
    polarity_reversed : bool
        Flip the sign (SEG reverse polarity).
    gain_drift_fraction : float
        Linear gain drift along the line: traces scaled from
        ``1 - g/2`` to ``1 + g/2``.
    dead_traces : sequence of int
        Traces set to zero (listed in attrs ``dead_traces``).
    noise : bool
    gain_step : (int, float), optional
        Traces from the first number on multiplied by the second (a gain
        step across the line, signal and noise).
    amplitude_scale : float
        Global amplitude scale of the whole line.

    Returns
    -------
    section : xarray.DataArray, dims ("trace", "z")
        Built with :func:`clinometry.section.make_section`.
    truth : dict
        Ground truth (JSON-ready), see the module docstring.

    Raises
    ------
    GeometryError
        Unknown scenario or domain, or options out of range.

    Examples
    --------
    >>> sec, truth = make_line("rimmed_shelf", n_samples=50)
    >>> sec.dims, truth["margins"][0]["direction"]
    (('trace', 'z'), '+')
    """
    sc = get_scenario(scenario)
    if not isinstance(sc, Scenario):
        from .analytic import make_analytic_line

        return make_analytic_line(
            sc, snr=snr, seed=seed, peak_hz=peak_hz, velocity_m_s=velocity_m_s,
            velocity_k_per_s=velocity_k_per_s, domain=domain, dt_ms=dt_ms, dz_m=dz_m, n_samples=n_samples,
            delay_ms=delay_ms, trace_spacing_m=trace_spacing_m, azimuth_deg=azimuth_deg,
            polarity_reversed=polarity_reversed, gain_drift_fraction=gain_drift_fraction,
            dead_traces=dead_traces, noise=noise, gain_step=gain_step, amplitude_scale=amplitude_scale)
    if domain not in ("twt", "depth"):
        raise GeometryError(f"domain must be 'twt' or 'depth', got {domain!r}")
    g = sc.growth
    if trace_spacing_m is not None:
        g = dataclasses.replace(g, dx_m=float(trace_spacing_m))
    vel = SynthVelocity(velocity_m_s or sc.velocity_m_s,
                        sc.velocity_k_per_s if velocity_k_per_s is None else velocity_k_per_s)
    peak = float(peak_hz or sc.peak_hz)
    if not (1.0 <= peak <= 200.0):
        raise GeometryError(f"peak_hz must be within 1-200 Hz, got {peak}")
    snr = sc.snr if snr is None else snr
    if snr is not None and snr <= 0:
        raise GeometryError(f"snr must be > 0, got {snr}")
    n_z = int(n_samples or sc.n_samples)
    dz = float((dt_ms or sc.dt_ms) if domain == "twt" else (dz_m or sc.dz_m))
    delay = float(sc.delay_ms if delay_ms is None else delay_ms)
    z_out = delay + np.arange(n_z) * dz

    strat = grow(g)
    depths = strat.depth_below_m(sc.datum_depth_m)
    facies = strat.facies
    sides = g.sides
    if sc.flip:
        depths, facies = depths[:, ::-1], facies[:, ::-1]
        sides = {"+": "-", "-": "+", "+-": "+-"}[sides]
    n_tr = depths.shape[1]
    x, y = line_geometry(n_tr, trace_spacing_m=g.dx_m, azimuth_deg=sc.azimuth_deg if azimuth_deg is None else azimuth_deg,
                         origin_xy_m=sc.origin_xy_m)
    distance = np.arange(n_tr) * g.dx_m
    rng = np.random.default_rng(seed)
    amp = render(depths, facies, z_out=z_out, domain=domain, velocity=vel, peak_hz=peak, rng=rng)
    dead = check_dead_traces(dead_traces, n_tr)
    wavelet = (noise_wavelet(peak_hz=peak, domain=domain, dz=dz, velocity=vel, z_out=z_out)
               if noise and snr is not None else None)
    amp = apply_conditions(amp, rng=rng, snr=snr if noise else None, wavelet=wavelet,
                           gain_drift_fraction=gain_drift_fraction, polarity_reversed=polarity_reversed,
                           gain_step=gain_step, amplitude_scale=amplitude_scale, dead=dead)

    to_z = vel.twt_ms if domain == "twt" else (lambda d: np.asarray(d, dtype=float))
    margins = margins_truth(depths, sides=sides, distance=distance, x=x, y=y,
                            to_z=lambda d: float(to_z(d)), family=sc.family, n_steps=g.n_steps,
                            depth_sample_m=lambda d: dz / (float(to_z(d + 0.5)) - float(to_z(d - 0.5))))
    cdp = sc.first_cdp + np.arange(n_tr)
    attrs = {"sample_format": "float32 (in memory, not yet written)", "text_header": "", "source_path": "",
             "dead_traces": dead, "synthetic_scenario": sc.name, "seed": int(seed)}
    section = make_section(amp, z=z_out, domain=domain, x=x, y=y, distance=distance, cdp=cdp,
                           attrs=attrs)
    truth = {
        "truth_schema_version": TRUTH_SCHEMA_VERSION,
        "scenario": sc.name,
        "description": sc.description,
        "seed": int(seed),
        "domain": domain,
        "units": "ms" if domain == "twt" else "m",
        "n_traces": int(n_tr),
        "n_samples": int(n_z),
        "sample_interval": dz,
        "delay": delay,
        "trace_spacing_m": float(g.dx_m),
        "velocity": vel.to_dict(),
        "wavelet": {"type": "ricker", "peak_hz": peak, "polarity": "reverse" if polarity_reversed else "normal"},
        "snr": (float(snr) if (noise and snr is not None) else None),
        "snr_definition": "RMS(noise-free section) / RMS(noise) over live traces",
        "gain_drift_fraction": float(gain_drift_fraction),
        "dead_traces": dead,
        "datum_depth_m": float(sc.datum_depth_m),
        "definitions": truth_definitions(),
        "expected_family": sc.family,
        "expected_trajectory": sc.trajectory,
        "growth": dataclasses.asdict(g),
        "margins": margins,
    }
    conditions = describe_conditions(gain_step=gain_step, amplitude_scale=amplitude_scale)
    if conditions:
        truth["conditions"] = conditions
    logger.info("synthetic line %s: %d traces x %d samples, %d margin(s)", sc.name, n_tr, n_z, len(margins))
    return section, truth
