"""Carbonate bodies built from analytic profiles: prograding margins, ramps, mounds, layered strata.

Each body gives its growth stages as stratal surfaces (depth in m below the
z origin, positive down, oldest first) with the facies of the unit below each
surface, and names the flanks that are margins in the ground truth.

* :class:`Margin` -- a platform margin that progrades through
  ``n_clinoforms`` stages.  Stage ``k`` is one profile of
  :mod:`clinometry.synth.profiles` whose break moves basinward by
  ``progradation_m`` and up by ``aggradation_m`` from the oldest to the
  youngest stage (negative aggradation: a falling break, descending
  trajectory; zero: flat), over a basin floor that shallows by one
  ``bottomset_m`` per stage, after ``n_interior`` aggrading stages at the
  oldest break.  The topsets of the stages are the platform interior
  reflectors; the clinoforms are the prograding foresets; shelf-break
  trajectory classes after Helland-Hansen & Martinsen (1996) [1]_.
* :class:`Ramp` -- the same construction with a rollover and toe several
  kilometres wide and a maximum dip of a degree or less: a profile that
  descends gently with no distinct break (ramps after Read 1985 [2]_ and
  Burchette & Wright 1992 [3]_, from memory).
* :class:`Mounds` -- one isolated build-up, or two with a saddle between
  them.  A mound stage is ``max(left profile, right profile)`` about a flat
  or domed top; older stages are lower and narrower (aggrading and
  widening build-up), so each flank has its own clinoforms.  Between two
  crests the shallower of the two mounds is kept, so their facing flanks
  meet in a V or on a flat saddle floor.
* :class:`Layers` -- flat or gently folded layered strata with no margin.

Surfaces are combined by :func:`clinometry.synth.analytic.build`, which
keeps every younger surface at or above the older ones (deposition only).

References
----------
.. [1] Helland-Hansen, W. & Martinsen, O. J. (1996). Shoreline trajectories
   and sequences. Journal of Sedimentary Research 66, 670-688. (from memory)
.. [2] Read, J. F. (1985). Carbonate platform facies models. AAPG Bulletin
   69, 1-21. (from memory)
.. [3] Burchette, T. P. & Wright, V. P. (1992). Carbonate ramp depositional
   systems. Sedimentary Geology 79, 3-57. (from memory)
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..errors import GeometryError
from .growth import FACIES
from .profiles import Foreset, foreset_lengths_m, profile_depth_m

__all__ = ["Margin", "Ramp", "Mound", "Mounds", "Layers", "Flank"]

_PLATFORM, _SLOPE, _BASIN = FACIES.index("platform"), FACIES.index("slope"), FACIES.index("basin")


@dataclass(frozen=True)
class Flank:
    """A margin of a body, for the ground truth.

    Attributes
    ----------
    direction : {"+", "-"}
        Basinward direction ("+": towards increasing trace index).
    role : str
        ``"margin"``, ``"outer"`` (outer flank of a mound), ``"saddle"``
        (mound flank facing the other mound across the saddle) or ``"ramp"``.
    indices : numpy.ndarray of int
        Trace indices of the profile, in basinward order (from the crest or
        landward end to the basin or saddle floor).
    stage_rows : tuple of int
        Rows of the section's surface stack holding this body's stages,
        oldest first; the last is the body's outer surface.
    has_break : bool
        False for a ramp: no distinct break or toe.
    span : (int, int) or None
        For a ramp, the trace indices where the youngest profile starts and
        ends descending.
    """

    direction: str
    role: str
    indices: np.ndarray
    stage_rows: tuple
    has_break: bool = True
    span: tuple | None = None


def _stage_back(k, n):
    """How far stage k lies back from the youngest (1 oldest, 0 youngest)."""
    return 1.0 - k / (n - 1) if n > 1 else 0.0


def _prograding(x, *, direction, break_x_m, break_depth_m, floor_depth_m, foreset, n, progradation_m,
                aggradation_m, bottomset_m, n_interior=0, interior_m=0.0):
    """Stages of a prograding body: ``n_interior`` aggrading stages, then ``n`` prograding ones."""
    sign = 1.0 if direction == "+" else -1.0
    x0 = break_x_m - sign * progradation_m * _stage_back(0, n)
    d0 = break_depth_m + aggradation_m * _stage_back(0, n)
    params = [(x0, d0 + interior_m * (1.0 - i / n_interior)) for i in range(n_interior)]
    params += [(break_x_m - sign * progradation_m * _stage_back(k, n),
                break_depth_m + aggradation_m * _stage_back(k, n)) for k in range(n)]
    total = len(params)
    out = []
    for k, (xb, db) in enumerate(params):
        floor = floor_depth_m + bottomset_m * (total - 1 - k)
        relief = floor - db
        if relief <= 0:
            raise GeometryError(f"stage {k}: basin floor {floor:.1f} m is not below the break {db:.1f} m")
        u = sign * (x - xb)
        d = profile_depth_m(u, break_depth_m=db, relief_m=relief, foreset=foreset)
        end = sum(foreset_lengths_m(relief, foreset))
        fac = np.where(u < 0, _PLATFORM, np.where(u < end, _SLOPE, _BASIN)).astype(np.int8)
        out.append((d, fac))
    return out


def _check_direction(direction):
    if direction not in ("+", "-"):
        raise GeometryError(f"direction must be '+' or '-', got {direction!r}")


@dataclass(frozen=True)
class Margin:
    """A prograding platform margin (see the module docstring).

    Parameters
    ----------
    direction : {"+", "-"}
        Basinward direction of the youngest margin.
    break_x_m, break_depth_m : float, m
        Position along the line and depth of the youngest break (start of
        its rollover).
    floor_depth_m : float, m
        Basin-floor depth at the youngest toe.
    foreset : Foreset
    n_clinoforms : int
    progradation_m, aggradation_m : float, m
        Break shift basinward and rise from the oldest to the youngest stage.
    bottomset_m : float, m
        Thickness of the bottomset laid in the basin per stage.
    n_interior : int
        Aggrading stages before the progradation (their topsets are the
        platform interior reflectors beneath the oldest clinoform; they are
        not clinoforms of the truth).
    interior_m : float, m
        Thickness of that aggrading phase.
    """

    direction: str
    break_x_m: float
    break_depth_m: float
    floor_depth_m: float
    foreset: Foreset
    n_clinoforms: int = 24
    progradation_m: float = 1000.0
    aggradation_m: float = 50.0
    bottomset_m: float = 1.0
    n_interior: int = 10
    interior_m: float = 120.0

    def __post_init__(self):
        _check_direction(self.direction)
        if self.n_clinoforms < 1:
            raise GeometryError(f"n_clinoforms must be >= 1, got {self.n_clinoforms}")

    def substrate_depth_m(self, x):
        n = self.n_clinoforms + self.n_interior
        return np.full_like(x, self.floor_depth_m + self.bottomset_m * n, dtype=float)

    def stages(self, x):
        return _prograding(x, direction=self.direction, break_x_m=self.break_x_m,
                           break_depth_m=self.break_depth_m, floor_depth_m=self.floor_depth_m,
                           foreset=self.foreset, n=self.n_clinoforms, progradation_m=self.progradation_m,
                           aggradation_m=self.aggradation_m, bottomset_m=self.bottomset_m,
                           n_interior=self.n_interior, interior_m=self.interior_m)

    def flanks(self, x, final, rows):
        n = x.size
        idx = np.arange(n) if self.direction == "+" else np.arange(n - 1, -1, -1)
        return [Flank(self.direction, "margin", idx, tuple(rows[self.n_interior:]))]


@dataclass(frozen=True)
class Ramp:
    """A carbonate ramp: a gentle descent over kilometres with no distinct break.

    Parameters
    ----------
    direction : {"+", "-"}
    inner_x_m, inner_depth_m : float, m
        Where and at what depth the youngest profile starts to steepen.
    floor_depth_m : float, m
        Basin-floor depth beyond the ramp.
    slope_deg : float, degrees
        Steepest dip (mid / outer ramp).
    rise_m, fall_m : float, m
        Widths over which the dip rises to ``slope_deg`` and falls back to 0.
    top_dip_deg : float, degrees
        Dip of the inner ramp (0: flat inner ramp, homoclinal; > 0 with a
        steeper distal part: distally steepened).
    n_clinoforms : int
    progradation_m, aggradation_m, bottomset_m : float, m
    n_interior : int
    interior_m : float, m
        As for :class:`Margin`.
    """

    direction: str
    inner_x_m: float
    inner_depth_m: float
    floor_depth_m: float
    slope_deg: float
    rise_m: float = 3000.0
    fall_m: float = 3000.0
    top_dip_deg: float = 0.0
    n_clinoforms: int = 16
    progradation_m: float = 3000.0
    aggradation_m: float = 20.0
    bottomset_m: float = 0.5
    n_interior: int = 4
    interior_m: float = 30.0

    def __post_init__(self):
        _check_direction(self.direction)

    @property
    def foreset(self):
        return Foreset(self.slope_deg, break_width_m=self.rise_m, toe_width_m=self.fall_m,
                       top_dip_deg=self.top_dip_deg)

    def substrate_depth_m(self, x):
        n = self.n_clinoforms + self.n_interior
        return np.full_like(x, self.floor_depth_m + self.bottomset_m * n, dtype=float)

    def stages(self, x):
        return _prograding(x, direction=self.direction, break_x_m=self.inner_x_m,
                           break_depth_m=self.inner_depth_m, floor_depth_m=self.floor_depth_m,
                           foreset=self.foreset, n=self.n_clinoforms, progradation_m=self.progradation_m,
                           aggradation_m=self.aggradation_m, bottomset_m=self.bottomset_m,
                           n_interior=self.n_interior, interior_m=self.interior_m)

    def flanks(self, x, final, rows):
        n = x.size
        sign = 1.0 if self.direction == "+" else -1.0
        end = sum(foreset_lengths_m(self.floor_depth_m - self.inner_depth_m, self.foreset))
        dx = float(x[1] - x[0])
        a = int(np.clip(round((self.inner_x_m - x[0]) / dx), 0, n - 1))
        b = int(np.clip(round((self.inner_x_m + sign * end - x[0]) / dx), 0, n - 1))
        idx = np.arange(n) if self.direction == "+" else np.arange(n - 1, -1, -1)
        return [Flank(self.direction, "ramp", idx, tuple(rows[self.n_interior:]), has_break=False,
                      span=(min(a, b), max(a, b)))]


@dataclass(frozen=True)
class Mound:
    """One build-up of :class:`Mounds`.

    Parameters
    ----------
    centre_x_m : float, m
    top_width_m : float, m
        Width of the youngest top between the two breaks (0: a pinnacle).
    crest_depth_m : float, m
        Depth of the youngest breaks.
    left_slope_deg, right_slope_deg : float, degrees
        Foreset dip of each flank.
    left_floor_depth_m, right_floor_depth_m : float, m
        Floor each flank descends to (the basin floor, or a saddle floor).
    break_width_m, toe_width_m : float, m
        Rollover and toe widths of both flanks.
    dome_deg : float, degrees
        Dip of the top towards each break (0: flat top).
    n_stages : int
    growth_m, widening_m : float, m
        Crest rise and widening of each side from the oldest to the youngest stage.
    bottomset_m : float, m
        Basin sediment laid beside the mound per stage.
    """

    centre_x_m: float
    top_width_m: float
    crest_depth_m: float
    left_slope_deg: float
    right_slope_deg: float
    left_floor_depth_m: float
    right_floor_depth_m: float
    break_width_m: float = 30.0
    toe_width_m: float = 100.0
    dome_deg: float = 1.0
    n_stages: int = 12
    growth_m: float = 60.0
    widening_m: float = 200.0
    bottomset_m: float = 1.0

    def stage(self, x, k):
        back = _stage_back(k, self.n_stages)
        crest = self.crest_depth_m + self.growth_m * back
        half = max(0.5 * self.top_width_m - self.widening_m * back, 0.0)
        out, facies = [], []
        for sign, slope, floor in ((-1.0, self.left_slope_deg, self.left_floor_depth_m),
                                   (1.0, self.right_slope_deg, self.right_floor_depth_m)):
            f = Foreset(slope, break_width_m=self.break_width_m, toe_width_m=self.toe_width_m,
                        top_dip_deg=self.dome_deg)
            relief = floor + self.bottomset_m * (self.n_stages - 1 - k) - crest
            if relief <= 0:
                raise GeometryError(f"mound at {self.centre_x_m} m, stage {k}: floor not below the crest")
            u = sign * (x - (self.centre_x_m + sign * half))
            out.append(profile_depth_m(u, break_depth_m=crest, relief_m=relief, foreset=f))
            end = sum(foreset_lengths_m(relief, f))
            facies.append(np.where(u < 0, _PLATFORM, np.where(u < end, _SLOPE, _BASIN)))
        right = out[1] > out[0]
        d = np.where(right, out[1], out[0])
        fac = np.where(right, facies[1], facies[0])
        fac = np.where((facies[0] == _PLATFORM) & (facies[1] == _PLATFORM), _PLATFORM, fac)
        return d, fac.astype(np.int8)


@dataclass(frozen=True)
class Mounds:
    """One isolated build-up, or two with a saddle between them (see the module docstring).

    Parameters
    ----------
    mounds : tuple of Mound
        One or two mounds, left to right, with the same number of stages.
    """

    mounds: tuple

    def __post_init__(self):
        if len(self.mounds) not in (1, 2):
            raise GeometryError(f"Mounds takes one or two mounds, got {len(self.mounds)}")
        if len({m.n_stages for m in self.mounds}) != 1:
            raise GeometryError("the mounds must have the same number of stages")
        if len(self.mounds) == 2 and not self.mounds[0].centre_x_m < self.mounds[1].centre_x_m:
            raise GeometryError("mounds must be given left to right")

    def substrate_depth_m(self, x):
        m = self.mounds
        deepest = max(max(a.left_floor_depth_m, a.right_floor_depth_m) + a.bottomset_m * a.n_stages for a in m)
        return np.full_like(x, deepest, dtype=float)

    def stages(self, x):
        out = []
        for k in range(self.mounds[0].n_stages):
            parts = [m.stage(x, k) for m in self.mounds]
            d, fac = parts[0]
            if len(parts) == 2:
                (d_a, f_a), (d_b, f_b) = parts
                c_a, c_b = self.mounds[0].centre_x_m, self.mounds[1].centre_x_m
                use_b = (x >= c_b) | ((x > c_a) & (d_b < d_a))
                d = np.where(use_b, d_b, d_a)
                fac = np.where(use_b, f_b, f_a).astype(np.int8)
            out.append((d, fac))
        return out

    def flanks(self, x, final, rows):
        n = x.size
        dx = float(x[1] - x[0])
        crest = [int(np.clip(round((m.centre_x_m - x[0]) / dx), 0, n - 1)) for m in self.mounds]
        rows = tuple(rows)
        if len(crest) == 1:
            c = crest[0]
            return [Flank("-", "outer", np.arange(c, -1, -1), rows), Flank("+", "outer", np.arange(c, n), rows)]
        a, b = crest
        inner = final[a: b + 1]
        deepest = np.flatnonzero(inner >= inner.max() - 1e-6)
        s = a + int(round(0.5 * (deepest[0] + deepest[-1])))  # middle of the saddle floor
        return [Flank("-", "outer", np.arange(a, -1, -1), rows), Flank("+", "saddle", np.arange(a, s + 1), rows),
                Flank("-", "saddle", np.arange(b, s - 1, -1), rows), Flank("+", "outer", np.arange(b, n), rows)]


@dataclass(frozen=True)
class Layers:
    """Flat or gently folded layered strata: a line with no margin.

    Parameters
    ----------
    top_depth_m, base_depth_m : float, m
        Mean depth of the youngest and oldest layer boundary.
    n_layers : int
    fold_amplitude_m : float, m
        Amplitude of a sinusoidal fold of the oldest layers (0: flat).
    fold_wavelength_m : float, m
    fold_phase_deg : float, degrees
    fold_decay : float
        Fraction by which the fold amplitude decreases from the oldest to the
        youngest layer (growth folding).
    layer_seed : int
        Seeds the layer thicknesses and facies (the geometry is fixed per scenario).
    """

    top_depth_m: float
    base_depth_m: float
    n_layers: int = 40
    fold_amplitude_m: float = 0.0
    fold_wavelength_m: float = 4000.0
    fold_phase_deg: float = 0.0
    fold_decay: float = 0.5
    layer_seed: int = 0

    def _levels(self):
        rng = np.random.default_rng(self.layer_seed)
        th = rng.uniform(0.4, 1.6, self.n_layers)
        cum = np.concatenate([[0.0], np.cumsum(th)])[:-1] / th.sum()
        return self.base_depth_m - cum * (self.base_depth_m - self.top_depth_m), rng

    def substrate_depth_m(self, x):
        return self._fold(x, self.base_depth_m + 20.0, 0)

    def _fold(self, x, level, k):
        decay = 1.0 - self.fold_decay * (k / max(self.n_layers - 1, 1))
        return level - self.fold_amplitude_m * decay * np.sin(2 * np.pi * x / self.fold_wavelength_m
                                                                + np.radians(self.fold_phase_deg))

    def stages(self, x):
        levels, rng = self._levels()
        codes = rng.choice([_PLATFORM, _SLOPE, _BASIN], size=self.n_layers)
        return [(self._fold(x, lev, k), np.full(x.shape, codes[k], dtype=np.int8)) for k, lev in enumerate(levels)]

    def flanks(self, x, final, rows):
        return []
