"""A small synthetic 3D cube: a margin whose strike curves across inlines.

Every inline is grown on its own (a 2.5-D model: no transport between
inlines) from the same growth parameters, with the substrate margin shifted
along the crosslines by a smooth bend, ``shift = bend_m * sin(pi * i / (n - 1))``
for inline ``i`` of ``n``.  The grown margins therefore line up into a curved
strike, and each inline has its own exact truth (the same keys as a line,
see :mod:`clinometry.synth.lines`).  Crosslines run basinward along the
line azimuth; inlines are stepped at right angles to it.
"""

from __future__ import annotations

import dataclasses
import logging

import numpy as np
import xarray as xr

from ..errors import GeometryError
from .growth import GrowthParameters, grow
from .truth_records import margins_truth
from .seismic import SynthVelocity, bandlimited_noise, render, ricker
from ..definitions import BASE_LENGTH_TRACES, SLOPE_MAX_QUANTILE
from .truth import SMOOTHING_M, TRAJECTORY_FLAT_DEG
from .write import _describe, _write_json, truth_path, write_segy

__all__ = ["make_cube", "write_cube", "CUBE_GROWTH"]

logger = logging.getLogger(__name__)

#: growth of each inline of the default cube (invented setting): a rimmed
#: shelf with a 22 degree front on a 3 km line at 25 m crossline spacing
CUBE_GROWTH = GrowthParameters(
    length_m=3000.0, dx_m=25.0, n_steps=30, gmax_m_per_kyr=0.4, subsidence_m_per_kyr=0.1,
    stable_slope_deg=22.0,
    substrate_profile=((0.0, 5.0), (0.2, 20.0), (0.3, 280.0), (1.0, 300.0)))


def make_cube(*, n_inlines=40, inline_spacing_m=25.0, bend_m=600.0, growth=CUBE_GROWTH,
              datum_depth_m=120.0, velocity_m_s=2500.0, peak_hz=30.0, dt_ms=2.0, n_samples=220,
              snr=8.0, seed=0, azimuth_deg=30.0, origin_xy_m=(436000.0, 5241000.0),
              first_inline=100, first_crossline=1000):
    """Grow and render a small 3D cube with a curved margin, and its truth per inline.

    Parameters
    ----------
    n_inlines : int
    inline_spacing_m : float, m
    bend_m : float, m
        Largest along-crossline shift of the substrate margin (mid-cube).
    growth : GrowthParameters
        Growth of each inline; ``growth.dx_m`` is the crossline spacing.
    datum_depth_m : float, m
        Depth of the final sea level below time zero.
    velocity_m_s : float, m/s
        Constant velocity for depth -> two-way time.
    peak_hz : float, Hz
        Ricker peak frequency.
    dt_ms : float, ms
    n_samples : int
    snr : float or None
        RMS(noise-free) / RMS(noise); None for no noise.
    seed : int
    azimuth_deg : float, degrees from grid north, of the crossline axis
    origin_xy_m : (float, float), m
    first_inline, first_crossline : int

    Returns
    -------
    cube : xarray.DataArray, dims ("inline", "crossline", "z")
        Coordinates ``x``, ``y`` (m, dims inline x crossline), ``z`` (ms),
        attrs ``domain="twt"``, ``units="ms"``, ``sample_interval``.
    truth : dict
        ``{"inlines": [{"inline", "margins": [...]}, ...], ...}``.

    Examples
    --------
    >>> cube, truth = make_cube(n_inlines=2, n_samples=20, snr=None)
    >>> cube.dims, len(truth["inlines"])
    (('inline', 'crossline', 'z'), 2)
    """
    if n_inlines < 1 or n_samples < 2:
        raise GeometryError(f"need n_inlines >= 1 and n_samples >= 2, got {n_inlines}, {n_samples}")
    vel = SynthVelocity(velocity_m_s)
    rng = np.random.default_rng(seed)
    z = np.arange(n_samples) * float(dt_ms)
    a = np.deg2rad(azimuth_deg)
    fr = np.array([p for p, _ in growth.substrate_profile])
    wd = np.array([d for _, d in growth.substrate_profile])
    n_xl = np.arange(0.0, growth.length_m, growth.dx_m).size
    xl_dist = np.arange(n_xl) * growth.dx_m
    data = np.empty((n_inlines, n_xl, n_samples), dtype=np.float32)
    X = np.empty((n_inlines, n_xl))
    Y = np.empty((n_inlines, n_xl))
    inlines = []
    for i in range(n_inlines):
        shift = bend_m * np.sin(np.pi * i / max(n_inlines - 1, 1))
        prof = tuple((float(f + (shift / growth.length_m if 0 < f < 1 else 0.0)), float(d))
                     for f, d in zip(fr, wd))
        g = dataclasses.replace(growth, substrate_profile=prof)
        strat = grow(g)
        depths = strat.depth_below_m(datum_depth_m)
        amp = render(depths, strat.facies, z_out=z, domain="twt", velocity=vel, peak_hz=peak_hz, rng=rng)
        off = i * inline_spacing_m
        X[i] = origin_xy_m[0] + xl_dist * np.sin(a) + off * np.sin(a + np.pi / 2)
        Y[i] = origin_xy_m[1] + xl_dist * np.cos(a) + off * np.cos(a + np.pi / 2)
        margins = margins_truth(depths, sides=g.sides, distance=xl_dist, x=X[i], y=Y[i],
                                to_z=lambda d: float(vel.twt_ms(d)), family="rimmed_shelf",
                                n_steps=g.n_steps,
                                depth_sample_m=lambda d: dt_ms / (float(vel.twt_ms(d + 0.5)) - float(vel.twt_ms(d - 0.5))))
        for m in margins:
            for pt in [m["break"], m["toe"], m["steepest"]] + [c[k] for c in m["clinoforms"] for k in ("break", "toe")]:
                pt["inline"] = first_inline + i
                pt["crossline"] = first_crossline + pt["trace"]
        inlines.append({"inline": first_inline + i, "substrate_shift_m": float(shift), "margins": margins})
        data[i] = amp
    if snr is not None:
        dt_s = dt_ms / 1000.0
        half = int(np.ceil(1.5 / peak_hz / dt_s))
        w = ricker(np.arange(-half, half + 1) * dt_s, peak_hz=peak_hz)
        nz = bandlimited_noise(data.shape, wavelet=w, rng=rng)
        data += (nz * (np.sqrt(np.mean(data.astype(np.float64) ** 2)) / (snr * np.sqrt(np.mean(nz ** 2))))).astype(np.float32)
    il = first_inline + np.arange(n_inlines)
    xl = first_crossline + np.arange(n_xl)
    cube = xr.DataArray(
        data, dims=("inline", "crossline", "z"),
        coords={"inline": il, "crossline": xl,
                "z": ("z", z, {"units": "ms", "long_name": "two-way time"}),
                "x": (("inline", "crossline"), X, {"units": "m", "long_name": "x coordinate"}),
                "y": (("inline", "crossline"), Y, {"units": "m", "long_name": "y coordinate"})},
        attrs={"domain": "twt", "units": "ms", "sample_interval": float(dt_ms),
               "synthetic_scenario": "curved_margin_cube", "seed": int(seed)},
        name="amplitude")
    truth = {
        "truth_schema_version": 1,
        "scenario": "curved_margin_cube",
        "description": "rimmed-shelf margin whose strike bends across the inlines (2.5-D growth per inline)",
        "seed": int(seed), "domain": "twt", "units": "ms",
        "n_inlines": int(n_inlines), "n_crosslines": int(n_xl), "n_samples": int(n_samples),
        "sample_interval": float(dt_ms), "delay": 0.0,
        "inline_spacing_m": float(inline_spacing_m), "crossline_spacing_m": float(growth.dx_m),
        "velocity": vel.to_dict(),
        "wavelet": {"type": "ricker", "peak_hz": float(peak_hz), "polarity": "normal"},
        "snr": None if snr is None else float(snr),
        "snr_definition": "RMS(noise-free cube) / RMS(noise)",
        "datum_depth_m": float(datum_depth_m),
        "definitions": {"smoothing_m": SMOOTHING_M, "base_length_traces": BASE_LENGTH_TRACES,
                        "slope_max_quantile": SLOPE_MAX_QUANTILE,
                        "trajectory_flat_tolerance_deg": TRAJECTORY_FLAT_DEG,
                        "distance_m": "along the inline from its first crossline",
                        "depth_m": "below the z origin (time zero), positive down"},
        "expected_family": "rimmed_shelf",
        "growth": dataclasses.asdict(growth),
        "inlines": inlines,
    }
    return cube, truth


def write_cube(cube, truth, path, *, sample_format="ieee"):
    """Write a cube from :func:`make_cube` as an inline-sorted SEG-Y plus truth JSON.

    Inline and crossline numbers go to bytes 189/193, CDP X/Y to 181/185
    with scalar -100; CDP numbers count the traces from 1.

    Returns
    -------
    (Path, Path)
    """
    n_il, n_xl, n_z = cube.shape
    il = np.repeat(cube["inline"].values, n_xl)
    xl = np.tile(cube["crossline"].values, n_il)
    truth = dict(truth)
    truth["sample_format"] = sample_format
    p = write_segy(path, cube.values.reshape(n_il * n_xl, n_z), z=cube["z"].values, domain="twt",
                   cdp_x=cube["x"].values.ravel(), cdp_y=cube["y"].values.ravel(),
                   cdp=np.arange(1, n_il * n_xl + 1), inline=il, crossline=xl,
                   text_lines=_describe(truth) + ["3D CUBE SORTED BY INLINE THEN CROSSLINE"],
                   sample_format=sample_format, sorted_by="inline")
    truth["segy_file"] = p.name
    return p, _write_json(truth, truth_path(p))
