"""Turn grown stratigraphy into a seismic section.

Method
------
1. Every stratal unit gets an acoustic impedance from its facies
   (:data:`FACIES_IMPEDANCE`), a random offset per time step (thin cycles,
   so reflections run along the clinoforms) and a small random variation.
   The overburden above the grown platform is flat-layered.
2. Normal-incidence reflectivity ``R = (Z2 - Z1) / (Z2 + Z1)`` between
   successive samples of a fine grid ([1]_, p. 38 in the 2nd ed., from memory).
3. Depth -> two-way time with a simple velocity model
   (:class:`SynthVelocity`: constant, or linear ``v(z) = v0 + k z``) that is
   also used for the ground truth, so a reader that converts back with the
   same model recovers the true depths exactly.  The impedances only make
   reflections; they do not change the time-depth relation.
4. Convolution with a zero-phase Ricker wavelet [2]_, SEG normal polarity
   (an increase of impedance gives a positive peak) unless reversed.
5. Mild lateral Gaussian smoothing (one trace standard deviation by default)
   so that dipping events look migrated rather than staircased.
6. Band-limited noise: white Gaussian noise filtered by the same wavelet and
   scaled to a stated signal-to-noise ratio, defined here as
   ``SNR = RMS(noise-free section) / RMS(noise)`` over all samples of live
   traces.

A convolutional model was chosen because it is the standard way of making
synthetic sections from an impedance model and is fast enough to build the
bundled set in seconds.

References
----------
.. [1] Sheriff, R. E. & Geldart, L. P. (1995). Exploration Seismology, 2nd ed.
   Cambridge University Press. (from memory)
.. [2] Ricker, N. (1953). The form and laws of propagation of seismic
   wavelets. Geophysics 18, 10-40. (from memory)
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.ndimage import gaussian_filter1d
from scipy.signal import fftconvolve

from ..errors import GeometryError, VelocityError
from .growth import FACIES

__all__ = [
    "ricker",
    "SynthVelocity",
    "FACIES_IMPEDANCE",
    "impedance_grid",
    "reflectivity",
    "render",
    "bandlimited_noise",
]

#: typical acoustic impedance per facies, (m/s)*(g/cm3); velocity x density
#: values typical of carbonates and marls (from memory, e.g. Sheriff &
#: Geldart 1995 tables of rock velocities)
FACIES_IMPEDANCE = {
    "substrate": 5500.0 * 2.65,  # dense limestone / dolomite
    "platform": 5000.0 * 2.55,  # shallow-water limestone
    "slope": 4300.0 * 2.45,  # slope grainstone / breccia
    "basin": 3200.0 * 2.35,  # marl
    "overburden": 2600.0 * 2.20,  # younger clastic fill
}


def ricker(t_s, *, peak_hz):
    """Zero-phase Ricker wavelet.

    Parameters
    ----------
    t_s : array_like, s
        Times relative to the wavelet centre.
    peak_hz : float, Hz
        Peak (most energetic) frequency ``f``.

    Returns
    -------
    numpy.ndarray
        ``r(t) = (1 - 2 pi^2 f^2 t^2) exp(-pi^2 f^2 t^2)`` [1]_, 1 at ``t = 0``.

    References
    ----------
    .. [1] Ricker, N. (1953). The form and laws of propagation of seismic
       wavelets. Geophysics 18, 10-40. (from memory)

    Examples
    --------
    >>> ricker([0.0], peak_hz=25.0).tolist()
    [1.0]
    """
    a = (np.pi * peak_hz * np.asarray(t_s, dtype=np.float64)) ** 2
    return (1.0 - 2.0 * a) * np.exp(-a)


@dataclass(frozen=True)
class SynthVelocity:
    """Velocity for depth <-> two-way time: ``v(z) = v0_m_s + k_per_s * z``.

    ``k_per_s = 0`` is a constant velocity.  Depth ``z`` is measured from the
    z origin (time zero).  For the linear law,
    ``t(z) = (2 / k) ln(1 + k z / v0)`` and ``z(t) = (v0 / k)(exp(k t / 2) - 1)``
    (two-way time ``t``; integration of ``dz / v(z)``, e.g. Sheriff & Geldart
    1995, from memory).

    Examples
    --------
    >>> v = SynthVelocity(2000.0)
    >>> float(v.twt_ms(1000.0))
    1000.0
    >>> round(float(SynthVelocity(2000.0, 0.5).depth_m(SynthVelocity(2000.0, 0.5).twt_ms(800.0))), 6)
    800.0
    """

    v0_m_s: float
    k_per_s: float = 0.0

    def __post_init__(self):
        if not (self.v0_m_s > 0) or self.k_per_s < 0:
            raise VelocityError(f"synthetic velocity needs v0_m_s > 0 and k_per_s >= 0, "
                                f"got v0_m_s={self.v0_m_s}, k_per_s={self.k_per_s}")

    def twt_ms(self, depth_m):
        """Two-way time, ms, of depth ``depth_m`` (m)."""
        z = np.asarray(depth_m, dtype=np.float64)
        if self.k_per_s == 0:
            return 2000.0 * z / self.v0_m_s
        return 2000.0 / self.k_per_s * np.log1p(self.k_per_s * z / self.v0_m_s)

    def depth_m(self, twt_ms):
        """Depth, m, of two-way time ``twt_ms`` (ms)."""
        t = np.asarray(twt_ms, dtype=np.float64) / 1000.0
        if self.k_per_s == 0:
            return self.v0_m_s * t / 2.0
        return self.v0_m_s / self.k_per_s * np.expm1(self.k_per_s * t / 2.0)

    def to_dict(self):
        if self.k_per_s == 0:
            return {"model": "constant", "v_m_s": self.v0_m_s}
        return {"model": "linear", "v0_m_s": self.v0_m_s, "k_per_s": self.k_per_s}


def impedance_grid(depth_surfaces_m, facies, z_depth_m, *, rng, cycle_fraction=0.04,
                   noise_fraction=0.01, overburden_layer_m=8.0):
    """Impedance on a (column, depth) grid from stratal surfaces.

    Parameters
    ----------
    depth_surfaces_m : ndarray, shape (n_surf, n_x), m
        Depth of each stratal surface (row 0 = substrate top), positive down;
        younger rows are never deeper at the same column.
    facies : ndarray of int, shape (n_surf, n_x)
        Facies code (index into ``growth.FACIES``) of the unit below each
        surface (row 0: substrate).
    z_depth_m : ndarray, shape (n_z,), m
        Depths at which to sample.
    rng : numpy.random.Generator
    cycle_fraction, noise_fraction : float
        Standard deviation of the per-step (thin cycle) and per-cell
        relative impedance variation.
    overburden_layer_m : float, m
        Thickness of the flat layers of the overburden.

    Returns
    -------
    ndarray, shape (n_x, n_z), float64
    """
    n_surf, n_x = depth_surfaces_m.shape
    base = np.array([FACIES_IMPEDANCE[f] for f in FACIES])
    cycles = 1.0 + cycle_fraction * rng.standard_normal(n_surf)
    # layer index per sample: number of surfaces deeper than the sample
    out = np.empty((n_x, z_depth_m.size))
    n_ob = int(np.ceil((z_depth_m.max() + 1.0) / overburden_layer_m)) + 1
    ob_layers = FACIES_IMPEDANCE["overburden"] * (1.0 + 0.5 * cycle_fraction * rng.standard_normal(n_ob))
    ob = ob_layers[np.clip((z_depth_m // overburden_layer_m).astype(int), 0, n_ob - 1)]
    for c in range(n_x):
        col = depth_surfaces_m[:, c]
        k = np.searchsorted(-col, -z_depth_m, side="left")  # count of col > z
        inside = k < n_surf
        kk = np.minimum(k, n_surf - 1)
        z = base[facies[kk, c]] * cycles[kk]
        out[c] = np.where(inside, z, ob)
    out *= 1.0 + noise_fraction * rng.standard_normal(out.shape)
    return out


def reflectivity(impedance):
    """Normal-incidence reflectivity along the last axis.

    ``R = (Z2 - Z1) / (Z2 + Z1)`` (Sheriff & Geldart 1995, from memory),
    placed at the upper sample of each pair; the last sample is 0.

    Examples
    --------
    >>> reflectivity(np.array([1.0, 3.0, 3.0])).tolist()
    [0.5, 0.0, 0.0]
    """
    z = np.asarray(impedance, dtype=np.float64)
    r = np.zeros_like(z)
    r[..., :-1] = (z[..., 1:] - z[..., :-1]) / (z[..., 1:] + z[..., :-1])
    return r


def bandlimited_noise(shape, *, wavelet, rng):
    """White Gaussian noise filtered by ``wavelet`` along the last axis."""
    white = rng.standard_normal(shape)
    w = np.reshape(wavelet, (1,) * (len(shape) - 1) + (-1,))
    return fftconvolve(white, w, mode="same", axes=-1)


def render(depth_surfaces_m, facies, *, z_out, domain, velocity, peak_hz, rng,
           oversample=4, lateral_sigma_traces=1.0):
    """Noise-free seismic amplitudes of a grown section.

    Parameters
    ----------
    depth_surfaces_m, facies : ndarray, shape (n_surf, n_x)
        As in :func:`impedance_grid`.
    z_out : ndarray, shape (n_z,)
        Output samples: ms TWT (``domain="twt"``) or m depth, regular.
    domain : {"twt", "depth"}
    velocity : SynthVelocity
        Time-depth relation (and, in the depth domain, to scale the wavelet
        from time to depth).
    peak_hz : float, Hz
        Ricker peak frequency.
    rng : numpy.random.Generator
    oversample : int
        Fine-grid oversampling of reflectivity before convolution.
    lateral_sigma_traces : float
        Standard deviation of the lateral smoothing, traces.

    Returns
    -------
    ndarray, shape (n_x, n_z), float32
    """
    if domain not in ("twt", "depth"):
        raise GeometryError(f"domain must be 'twt' or 'depth', got {domain!r}")
    dz = float(z_out[1] - z_out[0])
    fine = z_out[0] + np.arange(z_out.size * oversample) * dz / oversample
    fine_depth = velocity.depth_m(fine) if domain == "twt" else fine
    imp = impedance_grid(depth_surfaces_m, facies, fine_depth, rng=rng, cycle_fraction=0.1)
    refl = reflectivity(imp)
    if domain == "twt":
        dt_s = dz / oversample / 1000.0
    else:  # express the wavelet in depth with the velocity at mid-section
        v_mid = velocity.v0_m_s + velocity.k_per_s * float(np.median(fine))
        dt_s = 2.0 * dz / oversample / v_mid
    half = int(np.ceil(1.5 / peak_hz / dt_s))
    w = ricker(np.arange(-half, half + 1) * dt_s, peak_hz=peak_hz)
    trace = fftconvolve(refl, w[None, :], mode="same", axes=-1)
    if lateral_sigma_traces > 0:
        trace = gaussian_filter1d(trace, lateral_sigma_traces, axis=0, mode="nearest")
    return trace[:, ::oversample].astype(np.float32)
