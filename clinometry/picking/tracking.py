"""Reflector surfaces as minimal paths through the reflection-strength image.

A reflector surface is a curve with one z per trace that runs through strong
reflections.  It is found as the *minimal path* (a discrete geodesic) of a
cost image, the approach of Cohen & Kimmel (1997) for contours in images,
restricted to curves that cross the line trace by trace so that the optimum
is exact and found by dynamic programming over traces (Bellman 1957).

Cost.  The envelope (instantaneous amplitude, Taner, Koehler & Sheriff 1979)
is normalised to 0..1 between the image's median (the background: noise and
weak layering) and its 99.5th percentile, so a peak and a trough count
alike and a polarity reversal does not break a surface; the cost of a cell
is one minus that strength.  A step from trace ``i - 1`` to trace ``i``
costs its lateral part, the cell cost at trace ``i`` times one trace
spacing, plus its vertical part: the line integral of the cost along the
vertical run between the two picks, where each cell of the run costs the
*lower* of the two traces' costs (the run is on reflection energy when
either trace images the reflection there), times its length in metres.

Why this cost.  A steep slope face (30-60 degrees) drops by more than half a
period between neighbouring traces, but a migrated image stretches its
wavelet along the trace by ``1 / cos(dip)`` (the reflection has the same
width normal to the face), so the vertical run from one trace's pick to the
next lies on the face's own reflection energy and costs little.  A step
between two flat reflectors (a "staircase") runs through the weak image
between them and costs its full length.  So the path follows a slope face
down from the platform top to the basin floor, and does not jump to a
reflector above or below through weak image, without any limit on the dip.
Vertical metres through weak image cost :data:`VERTICAL_ANISOTROPY` times a
lateral metre: reflections are continuous along the line over many
wavelengths, while reflectors lie a fraction of a wavelength apart
vertically (common practice, no source).

Direction.  For the profile of a margin that deepens towards increasing
trace index (``"+"``), steps that *rise* basinward cost
:data:`AGAINST_FACTOR` times more (and the reverse for ``"-"``): a margin
profile runs from the platform top down its slope to the basin floor, and
the bias keeps it from climbing onto basin-fill or overburden reflectors
that onlap the slope above the toe, while still allowing the small rises of
a back-tilted basin floor or pick jitter.

Efficiency.  The vertical part is a difference of cumulative sums along z,
so the minimum over all predecessors of a cell splits into a running
minimum from above and one from below: one trace costs O(n_z), whatever the
dip (Felzenszwalb & Huttenlocher 2012 use the same idea for distance
transforms).  The search runs on an envelope max-pooled over z to about
:data:`CELLS_PER_PERIOD` cells per dominant period; each picked cell is
refined to the envelope maximum at full resolution with a parabolic
sub-sample fit.

Several surfaces are found one after another: after each, the image within
half a period of it is set to background, so the next path follows the next
strongest surface.  :func:`path_through` gives the best path through a given
point (the sum of a forward and a backward pass), used to extract the
profile of a margin through its slope face.

References
----------
.. [1] Cohen, L. D. & Kimmel, R. (1997). Global minimum for active contour
   models: a minimal path approach. International Journal of Computer
   Vision 24(1), 57-78. (from memory)
.. [2] Bellman, R. (1957). Dynamic Programming. Princeton University Press.
   (from memory)
.. [3] Taner, M. T., Koehler, F. & Sheriff, R. E. (1979). Complex seismic
   trace analysis. Geophysics 44(6), 1041-1063. (from memory)
.. [4] Felzenszwalb, P. F. & Huttenlocher, D. P. (2012). Distance transforms
   of sampled functions. Theory of Computing 8, 415-428. (from memory)
"""

from __future__ import annotations

import logging
from dataclasses import dataclass

import numpy as np

from ._blocks import pool_cells, quantile_sample
from ._kernels import backtrack as _backtrack_kernel
from ._kernels import dp_forward, run_means

__all__ = [
    "Surface",
    "CostImage",
    "cost_image",
    "minimal_path",
    "track_surfaces",
    "path_through",
    "seeded_surfaces",
    "NORMALISING_PERCENTILE",
    "CELLS_PER_PERIOD",
    "VERTICAL_ANISOTROPY",
    "AGAINST_FACTOR",
]

logger = logging.getLogger(__name__)

#: envelope percentile that maps to full strength (common practice, no source)
NORMALISING_PERCENTILE = 99.5
#: cells per dominant period in the search (common practice, no source:
#: an eighth of a period is within the pick error of a wavelet's peak)
CELLS_PER_PERIOD = 8
#: a vertical metre through weak image costs this many lateral metres
#: (reflections are laterally continuous over many wavelengths, vertically
#: a fraction of one apart; our choice, no source)
VERTICAL_ANISOTROPY = 4.0
#: cost of a vertical metre along a perfect reflection, in lateral metres
#: (a small regularisation so the path does not wander within a wavelet;
#: our choice, no source)
VERTICAL_FLOOR = 0.05
#: a step that departs from the local reflection dip by one cell costs as
#: much as this many cells of vertical travel through weak image, at full
#: coherence (a surface follows its own reflection and does not cut across
#: coherent layering; our choice, no source)
DIP_WEIGHT = VERTICAL_ANISOTROPY
#: steepest step between neighbouring traces: above the steepest slope a
#: margin may have (``vetting.MAX_SLOPE_DEG``, 70 deg; carbonate slopes reach
#: about 60 deg, Kenter 1990, from memory)
MAX_DIP_DEG = 72.0
#: a reflection that is the strongest within this many dominant periods along
#: its trace counts at LOCAL_WEIGHT of full strength however weak it is in the
#: whole image (our choice, no source)
LOCAL_WINDOW_PERIODS = 1.5
LOCAL_WEIGHT = 0.5
#: a surface of one polarity counts the other polarity at this fraction of
#: its strength (our choice, no source)
OTHER_POLARITY_WEIGHT = 0.5
#: a step against a margin's direction costs this many times more (our
#: choice, no source: allows back-tilted floors and jitter, not a climb
#: onto the fill)
AGAINST_FACTOR = 4.0


@dataclass(frozen=True)
class CostImage:
    """The pooled, normalised cost image of a section.

    Attributes
    ----------
    cost : numpy.ndarray, float32, shape (n_trace, n_cell)
        ``1 - strength``, strength the envelope above the background,
        normalised to 0..1.
    factor : int
        z samples per cell.
    vertical_m : numpy.ndarray, float64, shape (n_cell,)
        Length of one cell in depth, in trace spacings (m / m).
    scale, background : float
        Envelope at full strength and the background strength (0..1 of
        ``scale``).
    dip, coherence : numpy.ndarray, float32, shape (n_trace, n_cell)
        Reflection dip (cells per trace) and structure-tensor coherence,
        pooled like the cost.
    max_step : int
        Largest change of cell between neighbouring traces
        (:data:`MAX_DIP_DEG` at the shallowest cell height).
    signed : numpy.ndarray, float32, shape (n_trace, n_cell), optional
        Strength with the sign of the amplitude at the cell's envelope
        maximum (-1..1).
    run_cost : numpy.ndarray, float32, shape (n_trace, n_cell), optional
        The cost of a cell crossed by a vertical run between two traces:
        ``cost`` with locally dominant reflections raised
        (:func:`_local_dominance`); ``cost`` when None.
    """

    cost: np.ndarray
    factor: int
    vertical_m: np.ndarray
    scale: float
    background: float
    dip: np.ndarray = None
    coherence: np.ndarray = None
    max_step: int = 0
    signed: np.ndarray = None
    run_cost: np.ndarray = None

    def with_polarity(self, polarity):
        """The same image costed for one polarity: ``"peak"`` or ``"trough"`` strength only.

        A surface of one polarity stays on its own wavelet lobe: along a
        steep face the envelope is one broad band, but the peak and trough
        lobes alternate across it.  The other polarity counts at
        :data:`OTHER_POLARITY_WEIGHT` of its strength, so where the
        reflection of a slope changes sign (the fill beside it changes its
        impedance) the surface follows it on rather than jumping through
        weak image.  ``"unknown"`` (or no signed image) gives the envelope
        cost.
        """
        if self.signed is None or polarity not in ("peak", "trough"):
            return self
        sgn = np.float32(1.0 if polarity == "peak" else -1.0)
        own = np.clip(sgn * self.signed, 0.0, 1.0)
        other = np.clip(-sgn * self.signed, 0.0, 1.0)
        cost = np.subtract(np.float32(1.0), own + np.float32(OTHER_POLARITY_WEIGHT) * other).astype(np.float32)
        return CostImage(cost, self.factor, self.vertical_m, self.scale, self.background, self.dip,
                         self.coherence, self.max_step, self.signed, self.run_cost)


@dataclass(frozen=True)
class Surface:
    """One surface across the line.

    Attributes
    ----------
    z_index : numpy.ndarray, float, shape (n_trace,)
        Sub-sample position (index into the z axis) per trace.
    quality : numpy.ndarray, float, shape (n_trace,)
        Strength (0..1 above the background) at the pick; 0 on dead traces.
    support : numpy.ndarray, float, shape (n_trace,)
        Mean strength along the step from the previous trace (its vertical
        run included); ``support[0] = quality[0]``.
    polarity : str
        ``"peak"``, ``"trough"`` or ``"unknown"``.
    rank : int
        Order in which the surface was found (0 = strongest).
    """

    z_index: np.ndarray
    quality: np.ndarray
    support: np.ndarray
    polarity: str
    rank: int


def cost_image(envelope, *, period_samples: float, vertical_m, dip=None, coherence=None, dead=None,
               positive=None) -> CostImage:
    """Normalised, pooled cost image for the minimal paths.

    Parameters
    ----------
    envelope : numpy.ndarray, shape (n_trace, n_z)
        Envelope of the balanced amplitudes.
    period_samples : float
        Dominant period in samples.
    vertical_m : array_like, shape (n_z,) or scalar
        Depth length of one sample in trace spacings (m per m).
    dip, coherence : numpy.ndarray, shape (n_trace, n_z), optional
        Structure-tensor dip (samples per trace) and coherence; without them
        a step pays no dip term.
    dead : array_like of bool, shape (n_trace,), optional
        Dead traces: left out of the background level.
    positive : SignBits or numpy.ndarray of bool, shape (n_trace, n_z), optional
        Where the amplitudes are positive: gives the signed image.

    Returns
    -------
    CostImage

    Examples
    --------
    >>> env = np.zeros((3, 16), np.float32); env[:, 8] = 1.0
    >>> c = cost_image(env, period_samples=8, vertical_m=0.1)
    >>> c.factor, float(c.cost[0, 8])
    (1, 0.0)
    """
    env = np.asarray(envelope, dtype=np.float32)
    n, nz = env.shape
    dead = np.zeros(n, bool) if dead is None else np.asarray(dead, bool)
    factor = int(max(1, round(period_samples / CELLS_PER_PERIOD)))
    live = np.flatnonzero(~dead) if (~dead).any() else np.arange(n)
    scale = float(np.percentile(quantile_sample(env, rows=live), NORMALISING_PERCENTILE)) or 1.0
    cost = pool_cells(env, factor, "max", "constant")
    np.divide(cost, np.float32(scale), out=cost)
    np.clip(cost, 0.0, 1.0, out=cost)
    background = float(np.median(quantile_sample(cost, rows=live)))
    # strength above the background, 0..1; the cost is one minus it
    pooled = cost.copy()
    np.subtract(cost, np.float32(background), out=cost)
    np.divide(cost, np.float32(max(1.0 - background, 1e-6)), out=cost)
    np.clip(cost, 0.0, 1.0, out=cost)
    run_strength = cost.copy()
    _local_dominance(pooled, run_strength, window=int(round(LOCAL_WINDOW_PERIODS * CELLS_PER_PERIOD)))
    del pooled
    np.subtract(np.float32(1.0), cost, out=cost)
    run_cost = np.subtract(np.float32(1.0), run_strength, out=run_strength)
    vm = np.broadcast_to(np.asarray(vertical_m, dtype=np.float64), (nz,))
    m = cost.shape[1]
    cells = np.add.reduceat(vm, np.arange(0, nz, factor))[:m] if factor > 1 else vm.copy()
    if dip is not None and coherence is not None:
        pdip = pool_cells(np.asarray(dip, np.float32), factor, "mean", "edge")
        np.divide(pdip, np.float32(factor), out=pdip)
        pcoh = pool_cells(np.asarray(coherence, np.float32), factor, "mean", "edge")
    else:
        pdip = np.zeros_like(cost)
        pcoh = np.zeros_like(cost)
    max_step = int(np.ceil(np.tan(np.radians(MAX_DIP_DEG)) / max(float(np.min(cells)), 1e-9)))
    max_step = int(min(max(max_step, 1), m - 1)) if m > 1 else 0
    signed = None
    if positive is not None:
        signed = np.subtract(np.float32(1.0), cost)
        neg = _pooled_sign(env, positive, factor, m) == 0
        signed[neg] *= np.float32(-1.0)
    return CostImage(cost=cost, factor=factor, vertical_m=np.asarray(cells, dtype=np.float64), scale=scale,
                     background=background, dip=pdip, coherence=pcoh, max_step=max_step, signed=signed,
                     run_cost=run_cost)


def _pooled_sign(env, positive, factor, m):
    """Sign (1 positive, 0 not) of the amplitude at each cell's envelope maximum."""
    from ._blocks import row_blocks

    n, nz = env.shape
    out = np.empty((n, m), dtype=np.uint8)
    pad = m * factor - nz
    for rows in row_blocks(env):
        e = env[rows]
        pos = positive.rows(rows) if hasattr(positive, "rows") else np.asarray(positive[rows], bool)
        if pad:
            e = np.pad(e, ((0, 0), (0, pad)))
            pos = np.pad(pos, ((0, 0), (0, pad)))
        k = e.shape[0]
        arg = np.argmax(e.reshape(k, m, factor), axis=2)
        out[rows] = np.take_along_axis(pos.reshape(k, m, factor), arg[..., None], axis=2)[..., 0]
    return out


def _local_dominance(pooled, strength, *, window):
    """Raise, in place, the strength of reflections that dominate their own neighbourhood.

    A slope face whose impedance contrast fades downslope is weak next to
    the platform top and the basin floor, though it is the strongest
    reflection between them; normalised by the whole image it costs nearly
    as much as empty image, and a path would rather drop through the gap
    than follow it.  So a cell above the background also counts at
    :data:`LOCAL_WEIGHT` of its envelope over the largest envelope within
    ``window`` cells along the trace and one trace aside (a gentle automatic
    gain of the cost, common practice in seismic display; no source).
    """
    from scipy import ndimage

    big = ndimage.maximum_filter(pooled, size=(3, 2 * window + 1), mode="nearest")
    with np.errstate(divide="ignore", invalid="ignore"):
        local = np.where(big > 0, pooled / big, 0.0).astype(np.float32)
    local *= np.float32(LOCAL_WEIGHT)
    np.maximum(strength, np.where(strength > 0, local, np.float32(0.0)), out=strength)


def _forward(image: CostImage, rows=slice(None), *, direction=None, reverse=False, start=None):
    """Forward pass of the minimal path over a range of traces (reversed: walking towards lower index).

    Returns (accumulated cost of the last row, back pointers).
    """
    cost = np.ascontiguousarray(image.cost[rows])
    run = np.ascontiguousarray((image.run_cost if image.run_cost is not None else image.cost)[rows])
    # the vertical run is on the path's own reflection or on a locally
    # dominant one, whichever costs less
    run = np.minimum(run, cost)
    dip = image.dip[rows]
    coh = np.ascontiguousarray(image.coherence[rows])
    down, up = _factors(direction)
    if reverse:
        cost, coh, run = cost[::-1].copy(), coh[::-1].copy(), run[::-1].copy()
        # walking the other way the dip changes sign, and rising basinward
        # becomes rising landward
        dip = -dip[::-1]
        down, up = up, down
    dip = np.ascontiguousarray(dip, dtype=np.float32)
    n, m = cost.shape
    back = np.empty((n, m), dtype=np.int32)
    s0 = cost[0].astype(np.float64) if start is None else np.asarray(start, dtype=np.float64)
    d = dp_forward(cost, run, dip, coh, image.vertical_m, int(image.max_step), VERTICAL_ANISOTROPY, VERTICAL_FLOOR,
                   DIP_WEIGHT, float(down), float(up), s0, back)
    return d, back


def _backtrack(back, z_end):
    return _backtrack_kernel(back, int(z_end))


def minimal_path(image: CostImage, *, direction=None) -> np.ndarray:
    """Cell index per trace of the minimal path across the whole line (free ends).

    Parameters
    ----------
    image : CostImage
    direction : {None, "+", "-"}
        ``"+"``: rising towards increasing trace index costs
        :data:`AGAINST_FACTOR` times more; ``"-"`` the reverse.

    Returns
    -------
    numpy.ndarray of int, shape (n_trace,)

    Examples
    --------
    A slope face joining a strong shallow reflector (left) to a deep one
    (right); the path follows the face, not a corner:

    >>> c = np.ones((8, 12), np.float32); c[:3, 2] = 0; c[5:, 9] = 0
    >>> for i, z in zip(range(3, 5), (5, 7)): c[i, z] = 0.2
    >>> img = CostImage(c, 1, np.full(12, 0.2), 1.0, 0.0, np.zeros_like(c), np.zeros_like(c), 6)
    >>> minimal_path(img).tolist()
    [2, 2, 2, 5, 7, 9, 9, 9]
    """
    d, back = _forward(image, direction=direction)
    return _backtrack(back, int(np.argmin(d)))


def _factors(direction):
    if direction == "+":
        return 1.0, AGAINST_FACTOR
    if direction == "-":
        return AGAINST_FACTOR, 1.0
    return 1.0, 1.0


def run_support(strength, path):
    """Mean strength along each step: the pick and the vertical run from the previous pick."""
    path = np.ascontiguousarray(path, dtype=np.int64)
    out = run_means(np.ascontiguousarray(strength, dtype=np.float32), path)
    small = np.r_[True, np.abs(np.diff(path)) <= 1]
    out[small] = strength[np.arange(path.size), path][small]
    return out


def refine(envelope, cells, factor, *, amplitude=None, polarity=None, rows=None):
    """The reflection's peak near each cell, with a parabolic sub-sample fit.

    The peak is searched in the cell and its two neighbours (the path runs
    on cells of ``factor`` samples, so the reflection's peak may lie just
    beyond its own cell; adjacent reflections are at least a quarter period,
    two cells, apart).  A surface of known polarity is refined on the
    amplitude of that sign (``amplitude``: the section's samples, of which
    ``rows`` are the traces of ``envelope``): an interpreter picks a peak or
    a trough, and along a steep face the envelope's maximum drifts from the
    wavelet's peak where neighbouring reflections interfere.  Otherwise the
    envelope is used.

    Returns (sub-sample z index (float), integer sample index) per trace.
    """
    n, nz = envelope.shape
    start = np.asarray(cells) * factor - factor
    idx = np.clip(start[:, None] + np.arange(3 * factor)[None, :], 0, nz - 1)
    rl = np.arange(n)
    if amplitude is not None and polarity in ("peak", "trough"):
        tr = rl if rows is None else np.asarray(rows)
        sgn = 1.0 if polarity == "peak" else -1.0
        img, rr = amplitude, tr
    else:
        sgn, img, rr = 1.0, envelope, rl
    vals = sgn * np.asarray(img[rr[:, None], idx], dtype=np.float64)
    best = idx[rl, np.argmax(vals, axis=1)]
    lo = np.clip(best - 1, 0, nz - 1)
    hi = np.clip(best + 1, 0, nz - 1)
    y0, y1, y2 = (sgn * np.asarray(img[rr, k], dtype=np.float64) for k in (lo, best, hi))
    den = y0 - 2.0 * y1 + y2
    with np.errstate(divide="ignore", invalid="ignore"):
        shift = np.where((den < 0) & (lo < best) & (best < hi), 0.5 * (y0 - y2) / den, 0.0)
    return best + np.clip(shift, -0.5, 0.5), best


def _polarity(positive, rows, best, quality):
    strong = quality > 0.3
    if not strong.any():
        return "unknown"
    frac = float(np.mean(positive[rows[strong], best[strong]]))
    return "peak" if frac >= 0.7 else "trough" if frac <= 0.3 else "unknown"


def track_surfaces(envelope, positive, image: CostImage, *, period_samples: float, n_surfaces: int = 12,
                   dead=None) -> list[Surface]:
    """The ``n_surfaces`` strongest surfaces across the line, strongest first.

    Parameters
    ----------
    envelope : numpy.ndarray, shape (n_trace, n_z)
        Envelope of the balanced amplitudes (for the sub-sample refinement).
    positive : numpy.ndarray of bool or SignBits, shape (n_trace, n_z)
        Where the balanced amplitudes are positive (polarity of a surface).
    image : CostImage
        From :func:`cost_image`.
    period_samples : float
        Dominant period in samples.
    n_surfaces : int
    dead : array_like of bool, shape (n_trace,), optional
        Dead (filled) traces get quality 0.

    Returns
    -------
    list of Surface
    """
    work = CostImage(image.cost.copy(), image.factor, image.vertical_m, image.scale, image.background,
                     image.dip, image.coherence, image.max_step, image.signed, image.run_cost)
    cost = work.cost
    n, m = cost.shape
    rows = np.arange(n)
    dead = np.zeros(n, bool) if dead is None else np.asarray(dead, bool)
    half = max(1, int(round(0.5 * period_samples / image.factor)))
    offsets = np.arange(-half, half + 1)
    out = []
    for rank in range(int(n_surfaces)):
        d, back = _forward(work)
        cells = _backtrack(back, int(np.argmin(d)))
        strength = 1.0 - cost
        q = strength[rows, cells].astype(np.float64)
        support = run_support(strength, cells)
        q[dead] = 0.0
        support[dead] = 0.0
        zi, best = refine(envelope, cells, image.factor)
        out.append(Surface(z_index=zi.astype(np.float64), quality=q, support=support,
                           polarity=_polarity(positive, rows, best, q), rank=rank))
        band = np.clip(cells[:, None] + offsets[None, :], 0, m - 1)
        cost[np.broadcast_to(rows[:, None], band.shape), band] = 1.0
        if np.all(cost >= 1.0):
            break
    return out


def seeded_surfaces(envelope, positive, image: CostImage, surfaces, *, period_samples: float, n_seeds: int = 6,
                    min_strength: float = 0.5, dead=None) -> list[Surface]:
    """Surfaces through the strongest reflections that no tracked surface covers.

    A surface across the whole line takes the best route over its whole
    length, so a short, strong reflection off that route -- the top of a
    mound or a small platform, bounded by flanks on both sides -- may lie on
    none of them.  Each seed is the strongest cell farther than half a
    period from every surface so far (at least ``min_strength``); its
    surface is the minimal path through it (:func:`path_through`, both ways
    to the line ends).

    Returns
    -------
    list of Surface
        Ranks continue after ``surfaces``.
    """
    n, m = image.cost.shape
    rows = np.arange(n)
    dead = np.zeros(n, bool) if dead is None else np.asarray(dead, bool)
    residual = 1.0 - image.cost.copy()
    residual[dead] = 0.0
    half = max(1, int(round(0.5 * period_samples / image.factor)))
    offsets = np.arange(-half, half + 1)

    def suppress(cells):
        band = np.clip(cells[:, None] + offsets[None, :], 0, m - 1)
        residual[np.broadcast_to(rows[:, None], band.shape), band] = 0.0

    for srf in surfaces:
        suppress(np.clip((srf.z_index // image.factor).astype(np.int64), 0, m - 1))
    out = []
    rank = max((s_.rank for s_ in surfaces), default=-1) + 1
    strength = 1.0 - image.cost
    for _ in range(int(n_seeds)):
        flat = int(np.argmax(residual))
        t, cell = divmod(flat, m)
        if residual[t, cell] < min_strength:
            break
        cells = path_through(image, t, cell)
        q = strength[rows, cells].astype(np.float64)
        support = run_support(strength, cells)
        q[dead] = 0.0
        support[dead] = 0.0
        zi, best = refine(envelope, cells, image.factor)
        out.append(Surface(z_index=zi.astype(np.float64), quality=q, support=support,
                           polarity=_polarity(positive, rows, best, q), rank=rank))
        rank += 1
        suppress(cells)
    return out


def path_through(image: CostImage, trace: int, cell: int, *, direction=None, lo: int = 0, hi: int | None = None):
    """The minimal path through one cell, over traces ``lo .. hi - 1``.

    The sum of the best path arriving at the cell from the left and the best
    path leaving it to the right (each a forward pass, the second on the
    reversed rows), so the result is the exact minimal path constrained to
    pass through ``(trace, cell)``.

    Parameters
    ----------
    image : CostImage
    trace, cell : int
        The point (trace index, cell index) the path must pass through.
    direction : {None, "+", "-"}
        As in :func:`minimal_path`.
    lo, hi : int
        Trace window.

    Returns
    -------
    numpy.ndarray of int, shape (hi - lo,)
        Cell index per trace of the window.

    Examples
    --------
    >>> c = np.ones((6, 10), np.float32); c[:, 2] = 0.0; c[:, 7] = 0.0
    >>> img = CostImage(c, 1, np.ones(10), 1.0, 0.0, np.zeros_like(c), np.zeros_like(c), 9)
    >>> path_through(img, 3, 7).tolist()
    [7, 7, 7, 7, 7, 7]
    """
    hi = image.cost.shape[0] if hi is None else hi
    t = int(trace)
    _, back_l = _forward(image, slice(lo, t + 1), direction=direction)
    path_l = _backtrack(back_l, cell)
    _, back_r = _forward(image, slice(t, hi), direction=direction, reverse=True)
    path_r = _backtrack(back_r, cell)[::-1]
    return np.concatenate([path_l, path_r[1:]])
