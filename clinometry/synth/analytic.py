"""Analytic forward-model lines: mounds, saddles, basin fill, drape, ramps, layered and noise lines.

Where :mod:`clinometry.synth.growth` grows a margin through time, this path
lays out its geometry directly from analytic profiles
(:mod:`~clinometry.synth.profiles`, :mod:`~clinometry.synth.bodies`,
:mod:`~clinometry.synth.fill`), so that settings the growth model does not
make -- isolated mounds with saddles, onlapping and back-tilted fill, thick
drape, compaction drape, ramps without a break, folded strata -- come with
exact truth.  A :class:`Setting` is one body (or none) plus fills; it is
built into a stack of stratal surfaces (substrate, body stages, fill
layers, oldest first, each younger surface at or above the older ones) and
rendered by the same seismic model as grown lines
(:func:`clinometry.synth.seismic.render`).

The truth is measured on the exact surfaces before any seismic modelling,
with the definitions of :mod:`clinometry.synth.truth`: per flank the break,
toe, relief, max slope (:func:`~clinometry.synth.truth.profile_margin`) and
the trajectory through the clinoform breaks
(:func:`~clinometry.synth.truth.trajectory`).  Drape and fill are never
margins: only the flanks of the carbonate body are listed.  A ramp has no
distinct break: its break and toe are null with a reason, and its slope
and relief are measured over the stretch where its youngest profile
descends (``span``).

Family of a flank: ``steep_margin`` when its max slope is above
:data:`STEEP_MIN_SLOPE_DEG`, ``rimmed_shelf`` otherwise; ``ramp`` for ramps
(the bounds of the classifier's table, see there for their sources).
"""

from __future__ import annotations

import dataclasses
import logging
from dataclasses import dataclass

import numpy as np

from ..errors import GeometryError
from ..section import make_section
from .bodies import Layers, Margin, Mounds, Ramp
from .conditions import apply_conditions, check_dead_traces, describe_conditions, noise_wavelet
from .fill import ToeSubsidence, lay_fill
from .growth import FACIES
from .truth_records import TRUTH_SCHEMA_VERSION, _point, clinoform_rows, line_geometry, margin_record, truth_definitions
from .seismic import SynthVelocity, bandlimited_noise, render
from .truth import profile_margin

__all__ = ["Setting", "Built", "build", "flank_truth", "family_of_slope", "make_analytic_line", "surfaces_z",
           "STEEP_MIN_SLOPE_DEG", "RAMP_MAX_SLOPE_DEG"]

logger = logging.getLogger(__name__)

#: steepest slope of a rimmed shelf, degrees: beyond the angle of repose of
#: loose carbonate sand (Kenter 1990, Sedimentology 37: 777-794; Schlager &
#: Ginsburg 1981; from memory) -- the value of the classifier's
#: ``steep_min_slope_deg``
STEEP_MIN_SLOPE_DEG = 30.0
#: steepest slope of a ramp, degrees: twice the "generally < 1 deg" of Read
#: 1985, AAPG Bull. 69: 1-21 and Burchette & Wright 1992 (from memory; the
#: factor is our choice) -- the classifier's ``ramp_max_slope_deg``; a
#: distally steepened ramp may exceed it
RAMP_MAX_SLOPE_DEG = 2.0
_NOISE_KINDS = ("white", "bandlimited")


@dataclass(frozen=True)
class Setting:
    """Geometry of one analytic line.

    Parameters
    ----------
    length_m : float, m
    dx_m : float, m
        Trace spacing (the geometry is sampled on it).
    body : Margin, Ramp, Mounds, Layers or None
    fills : tuple of Fill
        Laid in order over the body.
    subsidence : ToeSubsidence, optional
        Subsidence at the toe during the filling (back-tilted fill).
    noise_only : {None, "white", "bandlimited"}
        A line of noise alone (no body, no reflections).
    """

    length_m: float
    dx_m: float = 12.5
    body: object = None
    fills: tuple = ()
    subsidence: ToeSubsidence | None = None
    noise_only: str | None = None

    def __post_init__(self):
        if self.dx_m <= 0 or self.length_m <= 4 * self.dx_m:
            raise GeometryError(f"need dx_m > 0 and length_m > 4 dx_m, got {self.dx_m}, {self.length_m}")
        if self.noise_only not in (None,) + _NOISE_KINDS:
            raise GeometryError(f"noise_only must be None or one of {_NOISE_KINDS}, got {self.noise_only!r}")
        if self.body is not None and not isinstance(self.body, (Margin, Ramp, Mounds, Layers)):
            raise GeometryError(f"unknown body {type(self.body).__name__}")


@dataclass(frozen=True)
class Built:
    """A built setting: the stack of stratal surfaces and the flanks that are margins.

    Attributes
    ----------
    x_m : ndarray, shape (n_x,), m
    depth_m : ndarray, shape (n_surf, n_x), m
        Depth of every surface (row 0 the substrate top), positive down.
    facies : ndarray of int8, shape (n_surf, n_x)
        Facies code of the unit below each surface.
    flanks : tuple of Flank
    body_rows : tuple of int
        Rows holding the body's stages, oldest first.
    """

    x_m: np.ndarray
    depth_m: np.ndarray
    facies: np.ndarray
    flanks: tuple
    body_rows: tuple


def build(setting: Setting, *, dx_m=None) -> Built:
    """Build the stack of surfaces of a setting.

    Parameters
    ----------
    setting : Setting
    dx_m : float, m, optional
        Trace spacing instead of the setting's.

    Returns
    -------
    Built

    Examples
    --------
    >>> from clinometry.synth.bodies import Margin
    >>> from clinometry.synth.profiles import Foreset
    >>> m = Margin("+", 1500.0, 200.0, 400.0, Foreset(20.0), n_clinoforms=5, n_interior=2, interior_m=40.0)
    >>> b = build(Setting(3000.0, 25.0, m))
    >>> b.depth_m.shape, [f.direction for f in b.flanks], b.flanks[0].stage_rows
    ((8, 120), ['+'], (3, 4, 5, 6, 7))
    >>> bool(np.all(np.diff(b.depth_m, axis=0) <= 1e-9))
    True
    """
    dx = float(dx_m or setting.dx_m)
    x = np.arange(0.0, setting.length_m, dx)
    body = setting.body
    if body is None:
        return Built(x, np.zeros((0, x.size)), np.zeros((0, x.size), np.int8), (), ())
    rows = [body.substrate_depth_m(x)]
    facies = [np.full(x.size, FACIES.index("substrate"), np.int8)]
    body_rows = []
    for d, fac in body.stages(x):
        rows.append(np.minimum(d, rows[-1]))
        facies.append(fac)
        body_rows.append(len(rows) - 1)
    carbonate = rows[-1].copy()
    for fill in setting.fills:
        for d, fac in lay_fill(rows[-1], x, fill, buried=carbonate):
            rows.append(d)
            facies.append(fac)
    depth = np.array(rows)
    if setting.subsidence is not None:
        depth = setting.subsidence.apply(depth, x, first_fill_row=body_rows[-1] + 1)
    flanks = tuple(body.flanks(x, depth[body_rows[-1]], body_rows))
    return Built(x, depth, np.array(facies, dtype=np.int8), flanks, tuple(body_rows))


def family_of_slope(slope_max_deg):
    """``steep_margin`` above :data:`STEEP_MIN_SLOPE_DEG`, else ``rimmed_shelf`` (``ramp`` below 1 deg)."""
    if slope_max_deg > STEEP_MIN_SLOPE_DEG:
        return "steep_margin"
    return "rimmed_shelf" if slope_max_deg >= RAMP_MAX_SLOPE_DEG else "ramp"


def _ramp_record(depths, flank, *, pt, depth_sample_m):
    """Truth of a ramp: no break or toe; slope and relief over the descending span."""
    final = depths[flank.stage_rows[-1]]
    idx = flank.indices
    a, b = flank.span
    pos = np.flatnonzero((idx >= a) & (idx <= b))
    span = idx[pos]
    distance = pt["distance"]
    s = np.abs(distance[span] - distance[span[0]])
    m = profile_margin(s, final[span], depth_sample_m=depth_sample_m)
    d = final[span]
    dip = np.gradient(d, s)
    curv = np.gradient(dip, s)
    relief = float(d[-1] - d[0])
    width = float(s[-1] - s[0])
    return {
        "direction": flank.direction,
        "family": "ramp",
        "role": flank.role,
        "break": None,
        "toe": None,
        "break_reason": "no distinct break: a ramp whose dip changes gradually over kilometres",
        "toe_reason": "no distinct toe: the ramp flattens gradually into the basin",
        "span": {"trace_from": int(span.min()), "trace_to": int(span.max()),
                 "distance_from_m": float(distance[span].min()), "distance_to_m": float(distance[span].max()),
                 "definition": "where the youngest ramp profile descends (start of steepening to basin floor)"},
        "platform_top": {"depth_m": float(d[0]), "trace_from": int(min(idx[0], span[0])),
                         "trace_to": int(max(idx[0], span[0]))},
        "steepest": _point(span[int(np.argmax(dip))], float(d[int(np.argmax(dip))]), **pt),
        "relief_m": relief,
        "relief_definition": "depth at the end of the span minus depth at its start",
        "slope_max_deg": (m["slope_max_deg"] if m is not None else float(np.degrees(np.arctan(relief / width)))),
        "slope_max_definition": "clinometry.synth.truth.profile_margin over the span",
        "slope_mean_deg": float(np.degrees(np.arctan(relief / width))),
        "max_curvature_per_km": float(np.max(np.abs(curv)) * 1000.0),
        "clinoforms": [],
        "trajectory": None,
    }


def flank_truth(built: Built, *, pt, depth_sample_m=None):
    """Truth of every flank of a built setting (list of dicts, see the module docstring)."""
    out = []
    for fl in built.flanks:
        if not fl.has_break:
            out.append(_ramp_record(built.depth_m, fl, pt=pt, depth_sample_m=depth_sample_m))
            continue
        rec = margin_record(built.depth_m, fl.indices, direction=fl.direction, family=None,
                            clinoform_rows=clinoform_rows(fl.stage_rows), pt=pt,
                            depth_sample_m=depth_sample_m, final_row=fl.stage_rows[-1])
        if rec is None:
            continue
        rec["family"] = family_of_slope(rec["slope_max_deg"])
        rec["role"] = fl.role
        out.append(rec)
    return out


def make_analytic_line(sc, *, snr=None, seed=0, peak_hz=None, velocity_m_s=None, velocity_k_per_s=None,
                       domain="twt", dt_ms=None, dz_m=None, n_samples=None, delay_ms=None, trace_spacing_m=None,
                       azimuth_deg=None, polarity_reversed=False, gain_drift_fraction=0.0, dead_traces=(),
                       noise=True, gain_step=None, amplitude_scale=1.0):
    """Render an analytic scenario as a seismic section with its truth.

    Takes the options of :func:`clinometry.synth.make_line` (see there).
    ``n_samples`` defaults to what reaches the scenario's ``max_depth_m``
    in the chosen domain.

    Returns
    -------
    section : xarray.DataArray, dims ("trace", "z")
    truth : dict
    """
    if domain not in ("twt", "depth"):
        raise GeometryError(f"domain must be 'twt' or 'depth', got {domain!r}")
    st = sc.setting
    vel = SynthVelocity(velocity_m_s or sc.velocity_m_s,
                        sc.velocity_k_per_s if velocity_k_per_s is None else velocity_k_per_s)
    peak = float(peak_hz or sc.peak_hz)
    if not (1.0 <= peak <= 200.0):
        raise GeometryError(f"peak_hz must be within 1-200 Hz, got {peak}")
    snr = sc.snr if snr is None else snr
    if snr is not None and snr <= 0:
        raise GeometryError(f"snr must be > 0, got {snr}")
    dz = float((dt_ms or sc.dt_ms) if domain == "twt" else (dz_m or sc.dz_m))
    delay = float(sc.delay_ms if delay_ms is None else delay_ms)
    if n_samples is None:
        bottom = float(vel.twt_ms(sc.max_depth_m)) if domain == "twt" else sc.max_depth_m
        n_samples = int(np.ceil((bottom - delay) / dz)) + 1
    n_z = int(n_samples)
    z_out = delay + np.arange(n_z) * dz
    built = build(st, dx_m=trace_spacing_m)
    dx = float(built.x_m[1] - built.x_m[0])
    n_tr = built.x_m.size
    x, y = line_geometry(n_tr, trace_spacing_m=dx, azimuth_deg=sc.azimuth_deg if azimuth_deg is None else azimuth_deg,
                         origin_xy_m=sc.origin_xy_m)
    distance = np.arange(n_tr) * dx
    rng = np.random.default_rng(seed)
    wavelet = noise_wavelet(peak_hz=peak, domain=domain, dz=dz, velocity=vel, z_out=z_out)
    dead = check_dead_traces(dead_traces, n_tr)
    if st.noise_only:
        amp = (rng.standard_normal((n_tr, n_z)) if st.noise_only == "white"
               else bandlimited_noise((n_tr, n_z), wavelet=wavelet, rng=rng)).astype(np.float32)
        amp = apply_conditions(amp, rng=rng, gain_drift_fraction=gain_drift_fraction,
                               polarity_reversed=polarity_reversed, gain_step=gain_step,
                               amplitude_scale=amplitude_scale, dead=dead)
        noise_snr = None
    else:
        amp = render(built.depth_m, built.facies, z_out=z_out, domain=domain, velocity=vel, peak_hz=peak, rng=rng)
        noise_snr = snr if noise else None
        amp = apply_conditions(amp, rng=rng, snr=noise_snr, wavelet=wavelet, gain_drift_fraction=gain_drift_fraction,
                               polarity_reversed=polarity_reversed, gain_step=gain_step,
                               amplitude_scale=amplitude_scale, dead=dead)
    to_z = vel.twt_ms if domain == "twt" else (lambda d: np.asarray(d, dtype=float))
    pt = dict(distance=distance, x=x, y=y, to_z=lambda d: float(to_z(d)))
    margins = flank_truth(built, pt=pt,
                          depth_sample_m=lambda d: dz / (float(to_z(d + 0.5)) - float(to_z(d - 0.5))))
    cdp = sc.first_cdp + np.arange(n_tr)
    attrs = {"sample_format": "float32 (in memory, not yet written)", "text_header": "", "source_path": "",
             "dead_traces": dead, "synthetic_scenario": sc.name, "seed": int(seed)}
    section = make_section(amp, z=z_out, domain=domain, x=x, y=y, distance=distance, cdp=cdp, attrs=attrs)
    wave = ({"type": "none", "peak_hz": None, "polarity": "reverse" if polarity_reversed else "normal"}
            if st.noise_only == "white" else
            {"type": "ricker", "peak_hz": peak, "polarity": "reverse" if polarity_reversed else "normal"})
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
        "trace_spacing_m": dx,
        "velocity": vel.to_dict(),
        "wavelet": wave,
        "snr": float(noise_snr) if noise_snr is not None else None,
        "snr_definition": "RMS(noise-free section) / RMS(noise) over live traces",
        "noise_only": st.noise_only,
        "gain_drift_fraction": float(gain_drift_fraction),
        "dead_traces": dead,
        "definitions": truth_definitions(),
        "expected_family": sc.family,
        "expected_trajectory": sc.trajectory,
        "setting": {"kind": type(st.body).__name__ if st.body is not None else "noise",
                    **dataclasses.asdict(st)},
        "margins": margins,
    }
    conditions = describe_conditions(gain_step=gain_step, amplitude_scale=amplitude_scale)
    if conditions:
        truth["conditions"] = conditions
    logger.info("synthetic line %s: %d traces x %d samples, %d margin(s)", sc.name, n_tr, n_z, len(margins))
    return section, truth


def surfaces_z(sc, truth):
    """Stratal surfaces of an analytic line in its z units (for preview figures)."""
    built = build(sc.setting, dx_m=truth["trace_spacing_m"])
    if truth["domain"] == "depth":
        return built.depth_m
    v = truth["velocity"]
    return SynthVelocity(v.get("v_m_s", v.get("v0_m_s")), v.get("k_per_s", 0.0)).twt_ms(built.depth_m)
