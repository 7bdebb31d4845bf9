"""Basin fill and drape laid over a carbonate body: onlap, dipping and back-tilted fill, compaction drape.

A :class:`Fill` is a set of layers from an oldest level to a youngest one,
each laid over the stack of surfaces so far (younger surfaces never deeper
than older ones: where a layer would lie below the existing top it has no
thickness, which is how fill *onlaps* a slope and *downlaps* a floor).

Layer shapes (depth ``f(x)`` of layer ``j`` at level ``L_j``, with ``s`` the
basinward distance from ``reference_x_m``):

* ``"flat"``: ``f = L_j`` -- ponded fill levelled by gravity flows, onlapping
  the slope.
* ``"dipping"``: ``f = L_j + tan(dip) s`` -- fill that dips gently basinward
  from its onlap on the slope and downlaps the basin floor.

Fill that **dips back towards the platform** above the toe is made by
:class:`ToeSubsidence`: subsidence at the foot of the platform during the
filling (loading by the platform and compaction of the slope apron beneath
the basin fill; common practice, no source) lowers the platform, slope and
basin floor by ``amplitude_m`` at the toe, less basinward (a half Gaussian
of width ``width_m``), and each fill layer by what remained after it was
laid: the oldest layers are tilted most, the youngest not at all.

**Drape** (``compaction > 0``): a layer laid flat over buried relief ends up
bent over it by the differential compaction of the sediment beside the
rigid carbonate (mud porosity falls with burial, Athy 1930 [1]_; shale
porosity ~0.6 at the surface falls to ~0.35-0.4 by 1 km, Sclater & Christie
1980 [2]_; from memory), i.e. (1 - 0.6) / (1 - 0.35) = 0.62 of the fresh
thickness, 35-40 % shortening of the fill beside the body.  A layer only records the
compaction after it was laid down, so the relief it shows decreases upward:
``f <- (1 - a_j) f + a_j B_j`` with ``a_j = compaction exp(-h_j / H)``, ``h_j``
the height of the layer above the buried crest (0 below it), ``H =
compaction_decay_m`` and ``B_j`` the buried surface smoothed laterally by a
Gaussian of ``drape_smoothing_m + h_j`` (the drape broadens upward).  Values
of ``compaction`` near 1 give a depositional drape that mantles the relief.
The exponential decay and the broadening are choices of this project (no
source), shapes seen on drape above build-ups and margins.

References
----------
.. [1] Athy, L. F. (1930). Density, porosity, and compaction of sedimentary
   rocks. AAPG Bulletin 14, 1-24. (from memory)
.. [2] Sclater, J. G. & Christie, P. A. F. (1980). Journal of Geophysical
   Research 85, 3711-3739: exponential porosity-depth constants of shale
   and sand. (from memory)
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.ndimage import gaussian_filter1d

from ..errors import GeometryError
from .growth import FACIES

__all__ = ["Fill", "ToeSubsidence", "lay_fill"]

_KINDS = ("flat", "dipping")


@dataclass(frozen=True)
class Fill:
    """Layers of basin fill or drape (see the module docstring).

    Parameters
    ----------
    n_layers : int
    base_depth_m, top_depth_m : float, m
        Level ``L`` of the oldest and the youngest layer (``top`` shallower).
    kind : {"flat", "dipping"}
    dip_deg : float, degrees
        Basinward dip of ``dipping`` fill.
    direction : {"+", "-"}
        Basinward direction of the slope the fill lies against.
    reference_x_m : float, m
        Position of the toe ``dipping`` fill is measured from (its level
        ``L`` holds there).
    compaction : float
        Drape fraction at the buried crest, 0..1 (0: no drape).
    compaction_decay_m : float, m
        Height over which the drape relief falls by a factor e.
    drape_smoothing_m : float, m
        Lateral smoothing of the buried relief at the crest level.
    facies : str
        Facies of the layers (a name in :data:`clinometry.synth.growth.FACIES`).
    """

    n_layers: int
    base_depth_m: float
    top_depth_m: float
    kind: str = "flat"
    dip_deg: float = 0.0
    direction: str = "+"
    reference_x_m: float = 0.0
    compaction: float = 0.0
    compaction_decay_m: float = 200.0
    drape_smoothing_m: float = 60.0
    facies: str = "basin"

    def __post_init__(self):
        if self.kind not in _KINDS:
            raise GeometryError(f"fill kind must be one of {_KINDS}, got {self.kind!r}")
        if self.facies not in FACIES:
            raise GeometryError(f"fill facies must be one of {FACIES}, got {self.facies!r}")
        if not (0.0 <= self.compaction <= 1.0):
            raise GeometryError(f"compaction must be within 0..1, got {self.compaction}")
        if self.n_layers < 1 or self.top_depth_m > self.base_depth_m:
            raise GeometryError("a fill needs n_layers >= 1 and top_depth_m <= base_depth_m")

    def levels_m(self):
        """Level of each layer, oldest (deepest) first, m."""
        return np.linspace(self.base_depth_m, self.top_depth_m, self.n_layers)

    def layer_depth_m(self, x, j, buried):
        """Depth of layer ``j`` before it is laid on the stack (m), without onlap."""
        lev = self.levels_m()[j]
        sign = 1.0 if self.direction == "+" else -1.0
        s = sign * (x - self.reference_x_m)
        if self.kind == "flat":
            f = np.full_like(x, lev, dtype=float)
        else:
            f = lev + np.tan(np.radians(self.dip_deg)) * s
        if self.compaction > 0:
            crest = float(np.min(buried))
            h = max(crest - lev, 0.0)
            a = self.compaction * np.exp(-h / self.compaction_decay_m)
            sigma = (self.drape_smoothing_m + h) / float(x[1] - x[0])
            b = gaussian_filter1d(buried, sigma, mode="nearest")
            f = (1.0 - a) * f + a * b
        return f


def _component(mask, i):
    """Boolean mask of the run of True values of ``mask`` that contains index ``i``."""
    out = np.zeros_like(mask)
    if not mask[i]:
        return out
    lo = i
    while lo > 0 and mask[lo - 1]:
        lo -= 1
    hi = i
    while hi < mask.size - 1 and mask[hi + 1]:
        hi += 1
    out[lo: hi + 1] = True
    return out


def lay_fill(top, x, fill: Fill, *, buried):
    """Lay the layers of ``fill`` on ``top``; return their surfaces and facies.

    Parameters
    ----------
    top : ndarray, shape (n_x,), m
        Current top of the stack (depth).
    x : ndarray, shape (n_x,), m
    fill : Fill
    buried : ndarray, shape (n_x,), m
        The rigid buried relief the drape follows (the carbonate top).

    Returns
    -------
    list of (ndarray, ndarray)
        Depth of each layer's top after onlap, and its facies code.

    Notes
    -----
    A flat layer fills every low below its level (ponded); a dipping layer
    keeps only the stretch connected to the reference toe, so it never
    reappears on the platform top.
    """
    code = FACIES.index(fill.facies)
    out = []
    dx = float(x[1] - x[0])
    i_ref = int(np.clip(round((fill.reference_x_m - x[0]) / dx), 0, x.size - 1))
    for j in range(fill.n_layers):
        f = fill.layer_depth_m(x, j, buried)
        above = f < top
        if fill.kind == "flat":
            keep = above
        else:
            keep = _component(above, i_ref)
        top = np.where(keep, f, top)
        out.append((top.copy(), np.full(x.shape, code, dtype=np.int8)))
    return out


@dataclass(frozen=True)
class ToeSubsidence:
    """Subsidence at the foot of a platform during filling (see the module docstring).

    Parameters
    ----------
    direction : {"+", "-"}
        Basinward direction of the margin.
    reference_x_m : float, m
        Position of the toe: landward of it everything subsides by
        ``amplitude_m``; basinward the subsidence falls as
        ``exp(-s^2 / (2 width^2))``.
    amplitude_m, width_m : float, m
    """

    direction: str
    reference_x_m: float
    amplitude_m: float
    width_m: float = 1000.0

    def profile_m(self, x):
        """Full subsidence along the line, m (positive: deeper)."""
        sign = 1.0 if self.direction == "+" else -1.0
        s = np.maximum(sign * (np.asarray(x, dtype=float) - self.reference_x_m), 0.0)
        return self.amplitude_m * np.exp(-0.5 * (s / self.width_m) ** 2)

    def apply(self, depth_m, x, *, first_fill_row):
        """Lower the rows of a surface stack (rows before ``first_fill_row`` fully,
        fill row ``j`` of ``n`` by the fraction ``1 - (j + 1) / n``); a new array."""
        out = np.array(depth_m, dtype=float)
        full = self.profile_m(x)
        n_fill = out.shape[0] - first_fill_row
        out[:first_fill_row] += full
        for j in range(n_fill):
            out[first_fill_row + j] += full * (1.0 - (j + 1) / n_fill)
        return out
