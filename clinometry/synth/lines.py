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
from .truth_records import (TRUTH_SCHEMA_VERSION, clinoform_rows, line_geometry, margin_record, margins_truth,
                      truth_definitions)
from .scenarios import Scenario, get_scenario
from .seismic import SynthVelocity, render

__all__ = ["make_line", "grown_surfaces", "TRUTH_SCHEMA_VERSION", "line_geometry", "margins_truth",
           "margin_record", "clinoform_rows", "truth_definitions"]

logger = logging.getLogger(__name__)


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
