"""The images and scales every stage of the default picker shares.

:func:`prepare` conditions the section (:mod:`~clinometry.picking.condition`),
measures the reflection dip and coherence (structure tensor,
:mod:`~clinometry.picking.orientation`), makes the envelope and the cost
image of the minimal paths (:mod:`~clinometry.picking.tracking`), and
derives the length scales from the data: the dominant period, the dominant
wavelength in metres (``v T`` in time, ``2 x period`` in depth where the
period is that of the two-way image), the smoothing length (one wavelength)
and the minimum relief of a margin (half a wavelength, twice the vertical
resolution of a quarter wavelength, Widess 1973), so that every stage
behaves the same at 12.5 or 50 m trace spacing and at 15 or 40 Hz.

References
----------
.. [1] Widess, M. B. (1973). How thin is a thin bed? Geophysics 38(6),
   1176-1180. (from memory)
"""

from __future__ import annotations

import dataclasses
import logging
from dataclasses import dataclass

import numpy as np

from ..depth import DEFAULT_VELOCITY_M_S, ConstantVelocity, horizon_to_depth
from ..errors import PickingError
from ..section import section_name
from .condition import condition, envelope_in_place
from .orientation import reflector_orientation
from .tracking import CostImage, cost_image

__all__ = ["SectionImages", "prepare", "velocity_model", "band_limited", "MIN_RELIEF_WAVELENGTHS", "MIN_RELIEF_FLOOR_M",
           "MIN_PERIOD_SAMPLES"]

logger = logging.getLogger(__name__)

#: smallest margin relief, in dominant wavelengths: twice the quarter-wavelength
#: vertical resolution (Widess 1973, from memory)
MIN_RELIEF_WAVELENGTHS = 0.5
#: and never below this, m (common practice, no source)
MIN_RELIEF_FLOOR_M = 10.0
#: a section whose dominant period is shorter than this many samples is not
#: band-limited seismic (white noise, or energy near the Nyquist frequency):
#: recorded seismic keeps its dominant frequency well below the anti-alias
#: filter, i.e. several samples per period (common practice, no source)
MIN_PERIOD_SAMPLES = 4.0
#: structure-tensor window along the line, traces (a few traces: the lateral
#: smear of a migrated wavelet; common practice, no source)
TENSOR_SIGMA_TRACES = 1.5
#: and along z, in dominant periods (a quarter period: one wavelet lobe)
TENSOR_SIGMA_PERIODS = 0.25


def velocity_model(velocity):
    """A velocity model from a model, a number (m/s) or None (the package default)."""
    if velocity is None:
        return ConstantVelocity(float(DEFAULT_VELOCITY_M_S))
    if isinstance(velocity, (int, float)):
        return ConstantVelocity(float(velocity))
    return velocity


@dataclass(frozen=True)
class SectionImages:
    """A section ready for picking: images, axes and length scales.

    Attributes
    ----------
    section : xarray.DataArray
    name : str
    velocity : VelocityModel or None
        None only for depth sections.
    z : numpy.ndarray, shape (n_z,)
        z axis in section units.
    distance_m : numpy.ndarray, shape (n_trace,)
    dx_m : float
        Median trace spacing.
    period_samples : float
        Dominant period in samples.
    wavelength_m, smoothing_m, min_relief_m : float, m
    vertical_m : numpy.ndarray, shape (n_z,)
        Depth length of one sample in trace spacings (m / m).
    dead : numpy.ndarray of bool, shape (n_trace,)
    envelope : numpy.ndarray, float32, shape (n_trace, n_z)
        Envelope of the balanced amplitudes.
    positive : SignBits
        Where the balanced amplitudes are positive.
    amplitude : numpy.ndarray, shape (n_trace, n_z)
        The section's own samples (not a copy), for picking peaks and troughs.
    dip : numpy.ndarray, float32, shape (n_trace, n_z)
        Apparent reflection dip, samples per trace.
    coherence : numpy.ndarray, float32, shape (n_trace, n_z)
    cost : CostImage
    notes : tuple of str
    """

    section: object
    name: str
    velocity: object
    z: np.ndarray
    distance_m: np.ndarray
    dx_m: float
    period_samples: float
    wavelength_m: float
    smoothing_m: float
    min_relief_m: float
    vertical_m: np.ndarray
    dead: np.ndarray
    envelope: np.ndarray
    positive: object
    amplitude: np.ndarray
    dip: np.ndarray
    coherence: np.ndarray
    cost: CostImage
    notes: tuple = ()

    @property
    def n_trace(self) -> int:
        return int(self.distance_m.size)

    @property
    def n_z(self) -> int:
        return int(self.z.size)

    def z_of(self, z_index):
        """z (section units) at sub-sample indices."""
        return np.interp(np.asarray(z_index, dtype=float), np.arange(self.n_z), self.z)

    def depth_of(self, trace, z_index):
        """Depth (m) of points given as trace index and sub-sample z index."""
        zz = self.z_of(z_index)
        if self.section.attrs["domain"] == "depth":
            return np.asarray(zz, dtype=float)
        tr = np.broadcast_to(np.asarray(trace), np.shape(zz))
        return np.asarray(horizon_to_depth(self.section, tr, zz, self.velocity), dtype=float)

    def gradient_of(self, dip_samples, z_index):
        """True depth gradient (m/m) of an apparent dip (samples per trace) at z indices."""
        zi = np.clip(np.rint(np.asarray(z_index)).astype(np.int64), 0, self.n_z - 1)
        return np.asarray(dip_samples, dtype=float) * self.vertical_m[zi]

    def cells(self, z_index):
        """Cost-image cell of sub-sample z indices."""
        return np.clip((np.asarray(z_index, dtype=float) // self.cost.factor).astype(np.int64), 0,
                       self.cost.cost.shape[1] - 1)


def _vertical_m(section, velocity, z, dz, dx):
    if section.attrs["domain"] == "depth":
        return np.full(z.size, dz / dx)
    v = np.broadcast_to(np.asarray(velocity.interval_velocity(z), dtype=float), z.shape)
    return v * dz / 2000.0 / dx


def band_limited(images) -> str | None:
    """Why a section is not band-limited seismic that margins can be picked on, or None.

    A dominant period of fewer than :data:`MIN_PERIOD_SAMPLES` samples means
    white noise or energy near the Nyquist frequency, not reflections.
    """
    if images.period_samples < MIN_PERIOD_SAMPLES:
        return (f"the dominant period is {images.period_samples:.1f} samples (fewer than {MIN_PERIOD_SAMPLES:g}): "
                "the section is not band-limited seismic (white noise or energy near the Nyquist frequency); "
                "no margin picked")
    return None


def prepare(section, velocity, *, smoothing_m=None, min_relief_m=None) -> SectionImages:
    """Condition a section and make every image the picker needs.

    Parameters
    ----------
    section : xarray.DataArray, dims ("trace", "z")
    velocity : velocity model, float (m/s) or None
        None: the package default for TWT sections (noted), nothing for depth.
    smoothing_m, min_relief_m : float, m, optional
        Defaults: one wavelength; half a wavelength, at least
        :data:`MIN_RELIEF_FLOOR_M`.

    Returns
    -------
    SectionImages

    Raises
    ------
    PickingError
        Every trace dead, or a dominant period not resolved by the sampling.
    """
    name = section_name(section)
    data = section.transpose("trace", "z").values
    z = section["z"].values.astype(float)
    dz = float(section.attrs["sample_interval"])
    notes = []
    cond = condition(data, dz, known_dead=section.attrs.get("dead_traces", []), with_envelope=False)
    notes.extend(cond.notes)
    if cond.dead.all():
        raise PickingError(f"{name}: every trace is dead (zero, constant or non-finite); nothing to pick")
    if not np.isfinite(cond.period_z) or cond.period_z < 2 * dz:
        raise PickingError(
            f"{name}: dominant period {cond.period_z:.3g} {section.attrs['units']} is not resolved by the "
            f"sample interval {dz:g}; check the sample interval")
    depth_domain = section.attrs["domain"] == "depth"
    if velocity is None and not depth_domain:
        notes.append(f"no velocity given: surfaces converted to depth with the default {DEFAULT_VELOCITY_M_S:.0f} m/s")
    model = None if depth_domain else velocity_model(velocity)
    dist = section["distance"].values.astype(float)
    dx = float(np.median(np.abs(np.diff(dist)))) if dist.size > 1 else 1.0
    dx = dx or 1.0
    period_samples = cond.period_z / dz
    vm = _vertical_m(section, model, z, dz, dx)
    if depth_domain:
        wavelength = 2.0 * cond.period_z
    else:
        wavelength = float(np.median(model.interval_velocity(z))) * cond.period_z * 1e-3
    smoothing = float(smoothing_m) if smoothing_m is not None else wavelength
    min_relief = float(min_relief_m) if min_relief_m is not None else max(
        MIN_RELIEF_FLOOR_M, MIN_RELIEF_WAVELENGTHS * wavelength)
    notes.append(f"dominant period {cond.period_z:.3g} {section.attrs['units']}, wavelength {wavelength:.0f} m, "
                 f"smoothing {smoothing:.0f} m, minimum relief {min_relief:.0f} m")
    dip, coh = reflector_orientation(cond.amplitude, sigma_z_samples=max(1.0, TENSOR_SIGMA_PERIODS * period_samples),
                                     sigma_trace=TENSOR_SIGMA_TRACES)
    amplitude = cond.amplitude
    positive = envelope_in_place(amplitude, packed=True)
    cond = dataclasses.replace(cond, amplitude=None, envelope=amplitude)
    img = cost_image(amplitude, period_samples=period_samples, vertical_m=vm, dip=dip, coherence=coh, dead=cond.dead,
                     positive=positive)
    return SectionImages(section=section, name=name, velocity=model, z=z, distance_m=dist, dx_m=dx,
                         period_samples=float(period_samples), wavelength_m=float(wavelength),
                         smoothing_m=smoothing, min_relief_m=min_relief, vertical_m=vm, dead=cond.dead,
                         envelope=amplitude, positive=positive, amplitude=data, dip=dip, coherence=coh, cost=img,
                         notes=tuple(notes))
