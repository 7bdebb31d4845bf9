"""Stratigraphy of a carbonate margin grown through time on a 2-D cross-section.

Method
------
A cross-section of columns (``x`` in m along the line) is grown step by step
under a relative sea level made of a sinusoidal eustatic curve, a linear
eustatic trend and (optionally differential) linear subsidence.  In each step:

1. **In-situ production** follows the light-dependent growth law of
   Bosscher & Schlager (1992) [1]_,
   ``G(w) = Gmax * tanh(I0 * exp(-k w) / Ik)`` for water depth ``w > 0``
   (no production when exposed), optionally plus a second, deeper
   production mode, a Gaussian in water depth, for communities that produce
   below the euphotic zone (see [2]_ for such deeper factories).  Production
   is capped by accommodation (a column cannot build above sea level).
2. **Reworking**: a fraction (``export_fraction``) of what is produced in
   water shallower than the reworking depth (storm wave base, a
   hydraulic-competence threshold) is exported at once; of the rest, what
   exceeds the accommodation is exported too.  Deeper production stays in
   place.
3. **Slope-limited deposition**: the exported volume is laid down basinward
   of the margin crest (the most basinward column inside the reworking zone)
   as a wedge whose front stands at the stable (angle-of-repose) slope of
   the sediment; the wedge top is level with the crest, so the margin
   progrades.  The width of the new topset is found by bisection so that
   the wedge holds exactly the exported volume (angle-of-repose-limited
   deposition, the geometric limit of slope-limited diffusion, e.g. [3]_).
   A fine fraction bypasses the slope and settles basinward of the toe with
   an exponential decay length, so the basin unit thickens basinward of the
   toe; a uniform pelagic rain may be added everywhere.

Each step leaves one stratal surface (the clinoforms).  Elevations are kept
relative to a fixed datum; subsidence lowers every surface already laid
down.  Nothing is eroded, so at each column younger surfaces are never below
older ones.

Why this method: it is the smallest model that uses the published
production law and still produces the three margin families and the three
shelf-break trajectory classes from a handful of parameters, and it is fully
vectorised numpy (a 400-column line with 60 steps grows in milliseconds).

References
----------
.. [1] Bosscher, H. & Schlager, W. (1992). Computer simulation of reef
   growth. Sedimentology 39, 503-512. (from memory)
.. [2] Schlager, W. (2003). Benthic carbonate factories of the Phanerozoic.
   International Journal of Earth Sciences 92, 445-464. (from memory)
.. [3] Kenter, J. A. M. (1990). Carbonate platform flanks: slope angle and
   sediment fabric. Sedimentology 37, 777-794. (from memory)
"""

from __future__ import annotations

import logging
from dataclasses import dataclass, field

import numpy as np

from ..errors import GeometryError

__all__ = [
    "GrowthParameters",
    "Stratigraphy",
    "production_rate",
    "sea_level_m",
    "grow",
    "FACIES",
]

logger = logging.getLogger(__name__)

#: facies codes of the stratal units (index into this tuple)
FACIES = ("substrate", "platform", "slope", "basin", "overburden")


@dataclass(frozen=True)
class GrowthParameters:
    """Parameters of one grown cross-section.

    Depths are water depths in m (positive down), rates in m/kyr, times in kyr.

    Parameters
    ----------
    length_m, dx_m : float, m
        Length of the section and column spacing.
    n_steps : int
        Number of time steps (one stratal surface each).
    step_kyr : float, kyr
        Duration of one step.
    substrate_profile : tuple of (fraction, water depth m) pairs
        Initial water depth along the line, linearly interpolated between
        the fractions of ``length_m``.
    eustasy_amplitude_m, eustasy_period_kyr, eustasy_phase_deg
        Sinusoidal eustatic sea level.
    eustasy_trend_m_per_kyr : float
        Linear eustatic trend (negative: falling).
    subsidence_m_per_kyr, subsidence_gradient_m_per_kyr : float
        Subsidence at ``x = 0`` and its increase to ``x = length_m``.
    gmax_m_per_kyr, surface_light, saturating_light, extinction_per_m
        Bosscher & Schlager (1992) production law: ``Gmax``, ``I0``, ``Ik``
        (same light units) and ``k`` (1/m).
    deep_gmax_m_per_kyr, deep_depth_m, deep_width_m
        Optional Gaussian production mode in water depth (0 disables it).
    reworking_depth_m : float, m
        Water depth above which produced sediment is reworked and exported.
    export_fraction : float
        Fraction of production above the reworking depth that is exported.
    stable_slope_deg : float, degrees
        Stable (angle-of-repose) slope of the exported sediment.
    fine_fraction : float
        Fraction of exported sediment that bypasses the slope.
    fine_decay_m : float, m
        Decay length of the fine sediment basinward of the toe.
    pelagic_m_per_kyr : float
        Uniform pelagic rain.
    sides : str
        ``"+"`` export towards increasing x, ``"-"`` towards decreasing x,
        ``"+-"`` both (isolated platform).
    """

    length_m: float = 5000.0
    dx_m: float = 12.5
    n_steps: int = 60
    step_kyr: float = 10.0
    substrate_profile: tuple = ((0.0, 5.0), (0.25, 20.0), (0.35, 300.0), (1.0, 320.0))
    eustasy_amplitude_m: float = 0.0
    eustasy_period_kyr: float = 100.0
    eustasy_phase_deg: float = 0.0
    eustasy_trend_m_per_kyr: float = 0.0
    subsidence_m_per_kyr: float = 0.0
    subsidence_gradient_m_per_kyr: float = 0.0
    # Bosscher & Schlager (1992): Gmax of reef growth 10-15 mm/yr, I0 ~ 2000
    # and Ik ~ 50-450 uE m^-2 s^-1, k = 0.04-0.16 1/m (from memory)
    gmax_m_per_kyr: float = 1.0
    surface_light: float = 2000.0
    saturating_light: float = 250.0
    extinction_per_m: float = 0.1
    deep_gmax_m_per_kyr: float = 0.0
    deep_depth_m: float = 60.0
    deep_width_m: float = 15.0
    reworking_depth_m: float = 10.0
    export_fraction: float = 0.6
    stable_slope_deg: float = 20.0
    fine_fraction: float = 0.1
    fine_decay_m: float = 800.0
    pelagic_m_per_kyr: float = 0.0
    sides: str = "+"

    def __post_init__(self):
        if self.sides not in ("+", "-", "+-"):
            raise GeometryError(f"sides must be '+', '-' or '+-', got {self.sides!r}")
        if not (0.0 < self.stable_slope_deg < 90.0):
            raise GeometryError(f"stable_slope_deg must be in (0, 90), got {self.stable_slope_deg}")
        if self.dx_m <= 0 or self.length_m <= self.dx_m or self.n_steps < 1:
            raise GeometryError(
                f"need dx_m > 0, length_m > dx_m and n_steps >= 1, got dx_m={self.dx_m}, "
                f"length_m={self.length_m}, n_steps={self.n_steps}")


@dataclass(frozen=True)
class Stratigraphy:
    """Result of :func:`grow`.

    Attributes
    ----------
    x_m : ndarray, shape (n_x,), m
        Column positions.
    elevation_m : ndarray, shape (n_steps + 1, n_x), m
        Elevation of every stratal surface above the fixed datum at the end of
        growth (row 0 is the substrate top, row k the top of step k).
    facies : ndarray of int, shape (n_steps + 1, n_x)
        Facies code (index into :data:`FACIES`) of the unit below each surface.
    sea_level_m : ndarray, shape (n_steps + 1,), m
        Relative to the same datum, at the time each surface was laid down.
    final_sea_level_m : float
    parameters : GrowthParameters
    """

    x_m: np.ndarray
    elevation_m: np.ndarray
    facies: np.ndarray
    sea_level_m: np.ndarray
    final_sea_level_m: float
    parameters: GrowthParameters = field(repr=False)

    def depth_below_m(self, datum_depth_m: float = 0.0) -> np.ndarray:
        """Depths of all surfaces, m, positive down, with final sea level at ``datum_depth_m``."""
        return datum_depth_m + (self.final_sea_level_m - self.elevation_m)


def production_rate(water_depth_m, *, gmax_m_per_kyr, surface_light, saturating_light,
                    extinction_per_m, deep_gmax_m_per_kyr=0.0, deep_depth_m=60.0,
                    deep_width_m=15.0):
    """Carbonate production versus water depth.

    Parameters
    ----------
    water_depth_m : array_like, m (positive down; <= 0 means exposed)
    gmax_m_per_kyr : float, m/kyr
        Maximum growth rate ``Gmax``.
    surface_light, saturating_light : float, same light units
        Surface light ``I0`` and saturating light ``Ik``.
    extinction_per_m : float, 1/m
        Light extinction coefficient ``k``.
    deep_gmax_m_per_kyr, deep_depth_m, deep_width_m : float
        Optional second production mode, a Gaussian in water depth with its
        peak rate, centre and standard deviation (0 rate disables it).

    Returns
    -------
    numpy.ndarray, m/kyr
        ``Gmax * tanh(I0 * exp(-k w) / Ik)`` [1]_ plus the deep mode, 0 where
        the column is exposed.

    References
    ----------
    .. [1] Bosscher, H. & Schlager, W. (1992). Computer simulation of reef
       growth. Sedimentology 39, 503-512. (from memory)

    Examples
    --------
    >>> g = production_rate([-1.0, 0.5, 100.0], gmax_m_per_kyr=1.0, surface_light=2000.0,
    ...                     saturating_light=250.0, extinction_per_m=0.1)
    >>> np.round(g, 4).tolist()
    [0.0, 1.0, 0.0004]
    """
    w = np.asarray(water_depth_m, dtype=np.float64)
    g = gmax_m_per_kyr * np.tanh(surface_light * np.exp(-extinction_per_m * np.maximum(w, 0.0))
                                 / saturating_light)
    if deep_gmax_m_per_kyr > 0:
        g = g + deep_gmax_m_per_kyr * np.exp(-0.5 * ((w - deep_depth_m) / deep_width_m) ** 2)
    return np.where(w > 0, g, 0.0)


def sea_level_m(time_kyr, params: GrowthParameters):
    """Eustatic sea level, m above the datum, at ``time_kyr`` (sinusoid + trend)."""
    t = np.asarray(time_kyr, dtype=np.float64)
    phase = np.deg2rad(params.eustasy_phase_deg)
    return (params.eustasy_amplitude_m * np.sin(2 * np.pi * t / params.eustasy_period_kyr + phase)
            + params.eustasy_trend_m_per_kyr * t)


def _wedge(elev, x, i_crest, top, volume, tan_a, direction):
    """Deposit ``volume`` (m^2) as a wedge basinward of column ``i_crest``.

    The wedge top is level at ``top``; its front dips at ``atan(tan_a)``.
    Returns (new elevation, index of the toe) with the volume found by bisection.
    """
    s = direction * (x - x[i_crest])  # basinward distance from the crest
    ahead = s > 0
    dx = abs(x[1] - x[0])

    def fill(a):
        surf = np.minimum(top, top - tan_a * (s - a))
        return np.where(ahead, np.maximum(elev, surf), elev)

    def vol(a):
        return float(np.sum(fill(a) - elev) * dx)

    lo, hi = 0.0, float(np.max(s)) if np.any(ahead) else 0.0
    if hi <= 0 or volume <= 0:
        return elev, i_crest
    if vol(hi) <= volume:
        lo = hi
    else:
        for _ in range(50):
            mid = 0.5 * (lo + hi)
            if vol(mid) < volume:
                lo = mid
            else:
                hi = mid
    new = fill(lo)
    front = ahead & (new > elev + 1e-9)
    toe = int(np.flatnonzero(front)[-1] if direction > 0 else np.flatnonzero(front)[0]) if np.any(front) else i_crest
    return new, toe


def _fines(x, toe_x, direction, volume, decay_m):
    # exponential decay basinward of the toe, normalised on an unbounded
    # basin: what would settle beyond the end of the section leaves it
    s = direction * (x - toe_x)
    return np.where(s > 0, volume / decay_m * np.exp(-np.maximum(s, 0) / decay_m), 0.0)


def grow(params: GrowthParameters) -> Stratigraphy:
    """Grow the stratigraphy of one cross-section.

    Parameters
    ----------
    params : GrowthParameters

    Returns
    -------
    Stratigraphy
        Every stratal surface (elevation relative to a fixed datum after
        subsidence), the facies of the unit below it, and sea level.

    Notes
    -----
    See the module docstring for the steps: production after Bosscher &
    Schlager (1992), reworking above the reworking depth, and
    angle-of-repose-limited deposition of the exported volume.

    Examples
    --------
    >>> p = GrowthParameters(length_m=1000.0, dx_m=50.0, n_steps=5)
    >>> s = grow(p)
    >>> s.elevation_m.shape
    (6, 20)
    >>> bool(np.all(np.diff(s.elevation_m, axis=0) >= -1e-9))
    True
    """
    p = params
    x = np.arange(0.0, p.length_m, p.dx_m)
    n = x.size
    fr = np.array([a for a, _ in p.substrate_profile], dtype=float)
    wd = np.array([b for _, b in p.substrate_profile], dtype=float)
    elev = -np.interp(x / p.length_m, fr, wd)  # datum = sea level at t = 0
    subs = p.subsidence_m_per_kyr + p.subsidence_gradient_m_per_kyr * x / p.length_m
    tan_a = np.tan(np.deg2rad(p.stable_slope_deg))
    surfaces = np.empty((p.n_steps + 1, n))
    facies = np.empty((p.n_steps + 1, n), dtype=np.int8)
    surfaces[0] = elev
    facies[0] = FACIES.index("substrate")
    sl_hist = np.empty(p.n_steps + 1)
    sl_hist[0] = sea_level_m(0.0, p)
    prod_kw = dict(gmax_m_per_kyr=p.gmax_m_per_kyr, surface_light=p.surface_light,
                   saturating_light=p.saturating_light, extinction_per_m=p.extinction_per_m,
                   deep_gmax_m_per_kyr=p.deep_gmax_m_per_kyr, deep_depth_m=p.deep_depth_m,
                   deep_width_m=p.deep_width_m)
    dirs = {"+": (1,), "-": (-1,), "+-": (1, -1)}[p.sides]
    for k in range(1, p.n_steps + 1):
        t = k * p.step_kyr
        surfaces[:k] -= subs * p.step_kyr
        elev = surfaces[k - 1].copy()
        sl = float(sea_level_m(t, p))
        sl_hist[k] = sl
        w = sl - elev
        produced = production_rate(w, **prod_kw) * p.step_kyr
        shallow = (w < p.reworking_depth_m) & (w > 0)
        # above the reworking depth a fraction is swept off at once; of the
        # rest, what exceeds the accommodation is shed as well (highstand
        # shedding); below the reworking depth all production stays in place
        stays = np.where(shallow, (1.0 - p.export_fraction) * produced, produced)
        kept = np.minimum(stays, np.maximum(w, 0.0))
        exported_here = np.where(shallow, produced - kept, 0.0)
        elev = elev + kept + p.pelagic_m_per_kyr * p.step_kyr
        volume = float(exported_here.sum() * p.dx_m)
        # the crest: outermost column whose top lies in the reworking zone
        w_after = sl - elev
        in_zone = np.flatnonzero(w_after < p.reworking_depth_m)
        insitu = elev - surfaces[k - 1]
        wedge = np.zeros(n)
        fines = np.full(n, p.pelagic_m_per_kyr * p.step_kyr)
        if in_zone.size and volume > 0:
            for d in dirs:
                i_crest = int(in_zone[-1] if d > 0 else in_zone[0])
                share = volume / len(dirs)
                top = min(float(elev[i_crest]), sl)
                before = elev
                elev, i_toe = _wedge(elev, x, i_crest, top, share * (1.0 - p.fine_fraction), tan_a, d)
                wedge += elev - before
                f = _fines(x, x[i_toe], d, share * p.fine_fraction, p.fine_decay_m)
                elev = elev + f
                fines += f
        new = np.maximum(elev, surfaces[k - 1])
        surfaces[k] = new
        # facies of the new unit: the component that made most of it
        insitu = insitu - p.pelagic_m_per_kyr * p.step_kyr
        comp = np.stack([insitu, wedge, fines])
        codes = np.array([FACIES.index("platform"), FACIES.index("slope"), FACIES.index("basin")])
        facies[k] = codes[np.argmax(comp, axis=0)]
    final_sl = float(sl_hist[-1])
    logger.debug("grew %d steps on %d columns", p.n_steps, n)
    return Stratigraphy(x_m=x, elevation_m=surfaces, facies=facies, sea_level_m=sl_hist,
                        final_sea_level_m=final_sl, parameters=p)
