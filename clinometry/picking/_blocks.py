"""Memory plumbing of the picker: blocks of traces, sampled quantiles, packed signs, pooling.

Nothing here knows any geology.  Per-trace and Gaussian work is done on
blocks of consecutive traces (each with a margin as wide as the filter), so
temporaries stay a few MB and a long line costs the same per trace as a
short one; quantiles of a whole image use every k-th trace beyond about two
million cells; the sign of an image is kept as one bit per cell.  Every
function returns the same values as its whole-image counterpart.
"""

from __future__ import annotations

import numpy as np
from scipy import ndimage

__all__ = [
    "row_blocks",
    "SignBits",
    "quantile_sample",
    "open_rectangle",
    "weighted_gaussian",
    "gaussian_blockwise",
    "pool_cells",
    "QUANTILE_MAX_CELLS",
]

#: cells per block of traces for per-trace work (memory only, not the result)
_BLOCK_CELLS = 1 << 19
#: at most this many cells of an image enter a quantile of the whole image
#: (every k-th trace beyond it, see :func:`quantile_sample`): about 2 million
#: cells put the quantile within a few 1e-4 of its rank (the asymptotic
#: standard error of a sample quantile, sqrt(p (1 - p) / N) in rank, David &
#: Nagaraja 2003, from memory), while a whole 16 000-trace line would be a
#: 96 MB copy partitioned out of cache (speed and memory; our choice)
QUANTILE_MAX_CELLS = 1 << 21
#: Gaussian support in sigmas (the default truncation of
#: :func:`scipy.ndimage.gaussian_filter`)
_TRUNCATE = 4.0


def row_blocks(a):
    """Slices of consecutive rows (traces) of about ``_BLOCK_CELLS`` cells."""
    n = a.shape[0]
    step = max(1, _BLOCK_CELLS // max(int(np.prod(a.shape[1:])), 1))
    return [slice(s, min(n, s + step)) for s in range(0, n, step)]




class SignBits:
    """Where an image was positive, one bit per cell (:func:`numpy.packbits` along z).

    Read as ``bits[rows, cols]`` with integer index arrays (bool values, the
    same as indexing the boolean image): an eighth of its memory.

    Examples
    --------
    >>> b = SignBits.from_bool(np.array([[True, False] * 5]))
    >>> b[np.array([0, 0]), np.array([0, 9])].tolist(), b.shape
    ([True, False], (1, 10))
    """

    dtype = np.dtype(bool)

    def __init__(self, packed, n_z):
        self._packed = packed
        self.shape = (packed.shape[0], int(n_z))

    @classmethod
    def from_bool(cls, mask):
        mask = np.asarray(mask, dtype=bool)
        return cls(np.packbits(mask, axis=1), mask.shape[1])

    def rows(self, rows):
        """The boolean image of some traces (a slice), unpacked."""
        return np.unpackbits(self._packed[rows], axis=1, count=self.shape[1]).astype(bool)

    def __getitem__(self, key):
        rows, cols = (np.asarray(k) for k in key)
        byte = self._packed[rows, cols >> 3]
        return ((byte >> (7 - (cols & 7)).astype(np.uint8)) & 1).astype(bool)




def quantile_sample(a, *, rows=None, max_cells: int = QUANTILE_MAX_CELLS):
    """Every k-th trace of an image, for a quantile (median, percentile) of the whole image.

    Parameters
    ----------
    a : numpy.ndarray, shape (n_trace, ...)
    rows : array_like of int, optional
        Only these traces (e.g. the live ones); default all.
    max_cells : int
        k is the smallest stride that leaves at most this many cells.

    Returns
    -------
    numpy.ndarray
        ``a`` itself (or ``a[rows]``) when it has at most ``max_cells``
        cells, so the quantile is exactly that of the image; otherwise every
        k-th of its traces (a view, or a copy of the sampled traces only).

    Notes
    -----
    Traces are taken at a regular stride, so every part of the line enters
    the sample; the standard error of a sample quantile of rank p from N
    values is about sqrt(p (1 - p) / N) in rank [1]_.

    References
    ----------
    .. [1] David, H. A. & Nagaraja, H. N. (2003). Order Statistics, 3rd ed.
       Wiley, section 10.2. (from memory)

    Examples
    --------
    >>> a = np.arange(12.0).reshape(6, 2)
    >>> quantile_sample(a, max_cells=6).tolist()
    [[0.0, 1.0], [4.0, 5.0], [8.0, 9.0]]
    >>> quantile_sample(a, rows=[1, 2]).shape
    (2, 2)
    """
    n = a.shape[0] if rows is None else len(rows)
    per = max(1, int(np.prod(a.shape[1:])))
    k = max(1, -(-n * per // max(1, int(max_cells))))
    if rows is None:
        return a if k == 1 else a[::k]
    return a[np.asarray(rows)[::k]]




def open_rectangle(mask, shape) -> np.ndarray:
    """Binary opening by a rectangle, as separable minimum and maximum filters.

    Same result as ``scipy.ndimage.binary_opening(mask,
    structure=np.ones(shape, bool))`` (outside the image counts as False),
    but a rectangle is separable, so erosion and dilation are running
    minima and maxima along each axis (van Herk 1992; Gil & Werman 1993)
    with a cost independent of the rectangle size.

    Parameters
    ----------
    mask : array_like of bool, 2-D
    shape : tuple of int
        Rectangle size per axis.

    Returns
    -------
    numpy.ndarray of bool

    References
    ----------
    .. [1] van Herk, M. (1992). A fast algorithm for local minimum and
       maximum filters on rectangular and octagonal kernels. Pattern
       Recognition Letters 13(7), 517-521. (from memory)
    .. [2] Gil, J. & Werman, M. (1993). Computing 2-D min, median, and max
       filters. IEEE PAMI 15(5), 504-507. (from memory)

    Examples
    --------
    >>> m = np.zeros((5, 7), bool); m[1:4, 1:6] = True; m[0, 0] = True
    >>> open_rectangle(m, (3, 3)).astype(int).sum(axis=0).tolist()
    [0, 3, 3, 3, 3, 3, 0]
    """
    m = np.ascontiguousarray(mask, dtype=bool).view(np.uint8)
    shape = tuple(int(s) for s in shape)
    # the dilation of an opening uses the reflected rectangle: for an even
    # side the reflection moves the centre by one (as scipy.ndimage does)
    origin = [-1 if s % 2 == 0 else 0 for s in shape]
    eroded = ndimage.minimum_filter(m, size=shape, mode="constant", cval=0)
    return ndimage.maximum_filter(eroded, size=shape, mode="constant", cval=0, origin=origin).view(bool)




def weighted_gaussian(values, weights, sigma, *, limit: float, min_weight: float, min_den: float = 1e-3):
    """Weighted Gaussian average of an image, on blocks of traces.

    ``G * (clip(values, -limit, limit) w) / G * w`` with ``w = weights``
    where ``weights >= min_weight`` (0 elsewhere), ``G`` the Gaussian of
    :func:`scipy.ndimage.gaussian_filter` (``mode="nearest"``), and 0 where
    ``G * w <= min_den``.  Each block of traces carries a margin as wide as
    the Gaussian's radius along the line, so every value is computed from
    the same inputs in the same order as for the whole image at once, while
    the temporaries stay a few MB instead of two full-size images.

    Parameters
    ----------
    values, weights : numpy.ndarray, shape (n_trace, n_z)
        The image (e.g. dip, samples per trace) and its weights (e.g.
        coherence, 0..1).
    sigma : tuple of float, (traces, samples)
        Gaussian sigmas along the line and along z.
    limit : float
        Values are clipped to +-limit (same units as ``values``).
    min_weight : float
        Weights below this count as 0.
    min_den : float
        Where the smoothed weight is at most this the result is 0.

    Returns
    -------
    numpy.ndarray, float32, shape (n_trace, n_z)

    Examples
    --------
    >>> v = np.array([[1.0, 1.0], [3.0, 3.0]], np.float32)
    >>> w = np.array([[1.0, 1.0], [0.1, 0.1]], np.float32)
    >>> weighted_gaussian(v, w, (0.5, 0.5), limit=2.0, min_weight=0.3)[:, 0].tolist()
    [1.0, 1.0]
    """
    return gaussian_blockwise(
        lambda v, w: _weighted_block(v, w, sigma, limit, min_weight, min_den),
        (np.asarray(values), np.asarray(weights)), sigma_traces=sigma[0])




def gaussian_blockwise(func, arrays, *, sigma_traces):
    """``func(*arrays)`` (a Gaussian filter of the image) computed on blocks of traces.

    Each block carries a margin of as many traces as the Gaussian's radius
    along the line (``_TRUNCATE`` sigmas, scipy.ndimage's default), so every
    output value comes from the same inputs in the same order as for the
    whole image; a block fits in cache, so a long line costs the same per
    trace as a short one and no full-size temporaries are made.

    Parameters
    ----------
    func : callable
        ``func(*blocks) -> ndarray`` of the blocks' shape.
    arrays : sequence of numpy.ndarray, shape (n_trace, n_z)
        Images sliced together by traces.
    sigma_traces : float
        Gaussian sigma along the line (traces).

    Returns
    -------
    numpy.ndarray, float32, shape (n_trace, n_z)

    Examples
    --------
    >>> a = np.random.default_rng(0).normal(size=(300, 4000)).astype(np.float32)
    >>> b = gaussian_blockwise(lambda x: ndimage.gaussian_filter(x, (3.0, 2.0)), (a,), sigma_traces=3.0)
    >>> bool(np.array_equal(b, ndimage.gaussian_filter(a, (3.0, 2.0))))
    True
    """
    n, nz = arrays[0].shape
    out = np.empty((n, nz), dtype=np.float32)
    halo = int(_TRUNCATE * float(sigma_traces) + 0.5)
    step = max(8, _BLOCK_CELLS // max(nz, 1))
    for s0 in range(0, n, step):
        s1 = min(n, s0 + step)
        lo, hi = max(0, s0 - halo), min(n, s1 + halo)
        out[s0:s1] = func(*(a[lo:hi] for a in arrays))[s0 - lo : s1 - lo]
    return out




def _weighted_block(values, weights, sigma, limit, min_weight, min_den):
    w = np.where(weights >= min_weight, weights, 0.0).astype(np.float32, copy=False)
    # float32 like the values (a numpy float64 bound would make it float64)
    limit = float(limit)
    num = np.clip(values, np.float32(-limit), np.float32(limit))
    np.multiply(num, w, out=num)
    ndimage.gaussian_filter(num, sigma, mode="nearest", output=num)
    den = ndimage.gaussian_filter(w, sigma, mode="nearest", output=w)
    keep = den > min_den
    np.maximum(den, min_den, out=den)
    np.divide(num, den, out=num)
    num[~keep] = 0.0
    return num


def pool_cells(a, factor, how, pad_mode, out=None):
    """Reduce ``factor`` z samples to one cell (``np.pad`` to a whole cell, reshape, reduce) without a padded copy.

    The whole cells are reduced through a reshaped view; only the last,
    incomplete cell is padded (with ``pad_mode``), so the values are those
    of padding the whole array.  ``out``, shape (n, m) and the dtype of
    ``a``, may be given (e.g. a view into a padded layout).
    """
    n, nz = a.shape
    m = -(-nz // factor)
    full = (nz // factor) * factor
    if out is None:
        out = np.empty((n, m), dtype=a.dtype)
    reduce = getattr(np, how)
    if full and factor >= 8:  # numpy sums 8 or more values pairwise: let it
        reduce(a[:, :full].reshape(n, full // factor, factor), axis=2, out=out[:, : full // factor])
    elif full:
        # cell by cell over the `factor` samples, in the order np.max / np.mean
        # reduce a short axis (first, then each next one), so the values are equal
        head = out[:, : full // factor]
        np.copyto(head, a[:, 0:full:factor])
        for j in range(1, factor):
            (np.maximum if how == "max" else np.add)(head, a[:, j:full:factor], out=head)
        if how == "mean":
            np.true_divide(head, factor, out=head, casting="unsafe")
    if full < nz:
        tail = np.pad(a[:, full:], ((0, 0), (0, m * factor - nz)), mode=pad_mode)
        out[:, -1] = reduce(tail, axis=1)
    return out


