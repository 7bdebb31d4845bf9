"""Local reflector dip and coherence from the structure tensor.

The gradient-square (structure) tensor ``T = G_sigma * (grad I grad I^T)``
averages the outer product of the image gradient over a Gaussian window.
Its dominant eigenvector is normal to the local reflector; the spread of
the two eigenvalues measures how line-like the neighbourhood is (van
Vliet & Verbeek 1995; Bakker, van Vliet & Verbeek 2002).  Fehmers &
Höcker (2003) introduced it for seismic dip and structure-oriented
filtering.  It was chosen here because it is robust to noise, needs no
seed points, and is available as a vectorised filter
(:func:`skimage.feature.structure_tensor`).

The window is anisotropic and tied to the data: along z a quarter of the
dominant period (so a single wavelet cycle dominates), along the line a
few traces.  Dip is returned in samples per trace (what a tracker needs)
and coherence ``(l1 - l2) / (l1 + l2)`` in 0..1.  Dips that are spatially
aliased (more than half a period of shift between neighbouring traces,
as at very steep foresets) cannot be measured this way; the coherence is
then low, and the picker does not rely on the dip there.

References
----------
.. [1] van Vliet, L. J. & Verbeek, P. W. (1995). Estimators for orientation
   and anisotropy in digitized images. Proc. ASCI'95, 442-450. (from memory)
.. [2] Bakker, P., van Vliet, L. J. & Verbeek, P. W. (2002). Confidence and
   curvature of curvilinear structures in 3D. Proc. ICCV 2001, 139-144.
   (from memory)
.. [3] Fehmers, G. C. & Höcker, C. F. W. (2003). Fast structural
   interpretation with structure-oriented filtering. Geophysics 68(4),
   1286-1293. (from memory)
"""

from __future__ import annotations

import logging

import numpy as np
from skimage.feature import structure_tensor

from ._blocks import quantile_sample

__all__ = ["reflector_orientation"]

logger = logging.getLogger(__name__)

#: tensor trace below this fraction of its 99th percentile counts as no
#: signal (common practice, no source)
ENERGY_FLOOR = 1e-3
#: Gaussian support in sigmas (the default truncation of
#: :func:`scipy.ndimage.gaussian_filter`, used by the structure tensor)
_TRUNCATE = 4.0
#: cells per block of traces (speed and memory only, not the result)
_BLOCK_CELLS = 1 << 19


def reflector_orientation(image, *, sigma_z_samples: float, sigma_trace: float = 1.5):
    """Local dip (samples per trace) and coherence (0..1) of reflectors.

    Parameters
    ----------
    image : array_like, shape (n_trace, n_z)
        Balanced amplitudes.
    sigma_z_samples : float
        Gaussian integration scale along z, in samples.
    sigma_trace : float
        Gaussian integration scale along the line, in traces.

    Returns
    -------
    dip : numpy.ndarray, float32, shape (n_trace, n_z)
        dz/dtrace in samples per trace (positive = deepening towards
        increasing trace index).
    coherence : numpy.ndarray, float32, shape (n_trace, n_z)
        ``(l1 - l2) / (l1 + l2)`` of the tensor eigenvalues; 0 for isotropic
        noise, 1 for a perfect line.

    References
    ----------
    .. [1] Fehmers & Höcker (2003), Geophysics 68(4), 1286-1293. (from memory)

    Examples
    --------
    >>> tr, z = np.meshgrid(np.arange(40), np.arange(60), indexing="ij")
    >>> img = np.cos(2 * np.pi * (z - 0.5 * tr) / 10.0)   # dip 0.5 sample/trace
    >>> dip, coh = reflector_orientation(img, sigma_z_samples=3, sigma_trace=3)
    >>> round(float(np.median(dip[10:30, 15:45])), 1), bool(coh[20, 30] > 0.9)
    (0.5, True)
    """
    a = np.asarray(image, dtype=np.float32)
    n, nz = a.shape
    sigma = (float(sigma_trace), float(sigma_z_samples))
    dip = np.empty(a.shape, dtype=np.float32)
    coh = np.empty(a.shape, dtype=np.float32)
    tr = np.empty(a.shape, dtype=np.float32)
    # the tensor is local: it is computed on blocks of traces, each with a
    # margin as wide as the Sobel and Gaussian supports along the line, so
    # the temporaries stay a few MB and the result is the same as for the
    # whole image at once
    halo = int(_TRUNCATE * float(sigma_trace) + 0.5) + 2
    step = max(8, _BLOCK_CELLS // max(nz, 1))
    for s0 in range(0, n, step):
        s1 = min(n, s0 + step)
        lo, hi = max(0, s0 - halo), min(n, s1 + halo)
        _orientation_block(a[lo:hi], sigma, dip[s0:s1], coh[s0:s1], tr[s0:s1], s0 - lo)
    # where there is (almost) no gradient energy the orientation is
    # undefined: coherence 0 there, not round-off
    floor = ENERGY_FLOOR * float(np.percentile(quantile_sample(tr), 99)) if tr.size else 0.0
    coh[~(tr > floor)] = 0.0
    np.clip(coh, 0.0, 1.0, out=coh)
    return dip, coh


def _orientation_block(a, sigma, dip_out, coh_out, tr_out, offset):
    """Dip, ``(l1 - l2) / (l1 + l2)`` and tensor trace of rows ``offset:`` of block ``a``."""
    rows = slice(offset, offset + dip_out.shape[0])
    a_tt, a_tz, a_zz = (t[rows] for t in structure_tensor(a, sigma=sigma, mode="reflect", order="rc"))
    # angle of the dominant eigenvector (the reflector normal) from the trace axis
    theta = 0.5 * np.arctan2(2.0 * a_tz, a_tt - a_zz)
    n_t = np.cos(theta)
    n_z = np.sin(theta)
    # the tangent satisfies n_t dt + n_z dz = 0, so dz/dt = -n_t / n_z
    with np.errstate(divide="ignore", invalid="ignore"):
        dip_out[...] = np.where(np.abs(n_z) > 1e-6, -n_t / n_z, 0.0)
    tr_out[...] = a_tt + a_zz
    disc = np.sqrt((a_tt - a_zz) ** 2 + 4.0 * a_tz**2)
    with np.errstate(divide="ignore", invalid="ignore"):
        coh_out[...] = disc / tr_out
