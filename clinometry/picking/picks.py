"""Records that the picking step returns: horizons, margins, break and toe.

All records are frozen dataclasses.  Positions are given as a trace index
(0-based, into the section) and ``z`` in the section's own units (ms TWT or
m depth); converting to depth is the job of :mod:`clinometry.depth`, and the
metrics step does it with the velocity model of the run.

A pick that cannot be made is never invented: the field holds ``None`` and
the matching ``*_reason`` field says why (for example ``"no flat-to-steep
change in curvature along the profile"``).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

__all__ = ["Horizon", "PickPoint", "ClinoformPicks", "MarginPicks", "RejectedCandidate", "Picks", "HORIZON_ROLES"]

#: roles a horizon can play; ``reflector`` is any tracked surface not (yet)
#: assigned to a margin.
HORIZON_ROLES = ("reflector", "margin_profile", "platform_top", "clinoform", "user")


@dataclass(frozen=True, eq=False)
class Horizon:
    """One tracked surface: trace -> z with a quality per point.

    Attributes
    ----------
    id : int
        Unique within one :class:`Picks`.
    role : str
        One of :data:`HORIZON_ROLES`.
    trace : numpy.ndarray of int, shape (n,)
        Trace indices, strictly increasing.
    z : numpy.ndarray of float, shape (n,)
        Position in the section's z units (ms TWT or m depth), positive down.
    quality : numpy.ndarray of float, shape (n,)
        0 (guess) .. 1 (sure); for example local coherence.
    polarity : str
        ``"peak"``, ``"trough"`` or ``"unknown"``.
    """

    id: int
    role: str
    trace: np.ndarray
    z: np.ndarray
    quality: np.ndarray
    polarity: str = "unknown"

    def __post_init__(self):
        t = np.asarray(self.trace, dtype=np.int64)
        z = np.asarray(self.z, dtype=np.float64)
        q = np.asarray(self.quality, dtype=np.float64)
        if not (t.shape == z.shape == q.shape) or t.ndim != 1:
            raise ValueError(f"horizon {self.id}: trace, z and quality must be 1-D of equal length")
        if t.size > 1 and not np.all(np.diff(t) > 0):
            raise ValueError(f"horizon {self.id}: trace indices must be strictly increasing")
        object.__setattr__(self, "trace", t)
        object.__setattr__(self, "z", z)
        object.__setattr__(self, "quality", q)

    def __len__(self) -> int:
        return int(self.trace.size)

    def z_at(self, trace) -> np.ndarray:
        """z at the given trace indices (linear interpolation, NaN outside)."""
        return np.interp(np.asarray(trace, dtype=float), self.trace, self.z, left=np.nan, right=np.nan)


@dataclass(frozen=True)
class PickPoint:
    """A picked point (break or toe): trace index, z in section units, quality 0..1."""

    trace: int
    z: float
    quality: float = 1.0


@dataclass(frozen=True)
class ClinoformPicks:
    """One clinoform surface of a margin, with its break and toe.

    ``shelf_break`` / ``toe`` are ``None`` when they could not be picked;
    then ``break_reason`` / ``toe_reason`` say why.  ``source`` says how the
    surface was found: ``"surface"`` (a tracked reflector or a user
    horizon) or ``"dip_field"`` (followed through the reflection dip field
    beneath the outer profile, :mod:`clinometry.picking.clinoforms`); the
    shelf-break trajectory is fitted through breaks of one source only.
    """

    horizon_id: int
    shelf_break: PickPoint | None
    toe: PickPoint | None
    break_reason: str = ""
    toe_reason: str = ""
    source: str = "surface"


@dataclass(frozen=True)
class MarginPicks:
    """One platform margin on a line.

    Attributes
    ----------
    direction : {"+", "-"}
        Basinward direction: ``"+"`` when the basin lies towards increasing
        trace index.
    profile_id : int
        Id of the horizon that is the margin profile (the outer surface of
        the carbonate body: platform top, foreset and toe onto the basin floor).
    platform_top_id : int or None
        Id of the platform-top horizon (may equal ``profile_id``).
    shelf_break, toe : PickPoint or None
        Break and toe of the final margin profile.
    clinoforms : tuple of ClinoformPicks
        Stacked clinoform surfaces, oldest (deepest / most landward) first.
    confidence : float
        0..1, how sure the picker is that this is a margin.
    """

    direction: str
    profile_id: int
    platform_top_id: int | None
    shelf_break: PickPoint | None
    toe: PickPoint | None
    clinoforms: tuple = ()
    confidence: float = 0.0
    break_reason: str = ""
    toe_reason: str = ""
    notes: tuple = ()


@dataclass(frozen=True, eq=False)
class RejectedCandidate:
    """A margin candidate the picker considered and dropped, for review.

    Attributes
    ----------
    direction : {"+", "-"}
    trace, z : numpy.ndarray, shape (n,)
        Its profile (trace indices, z in section units) over the slope and a
        little beyond.
    steepest : PickPoint
        Its steepest point.
    reason : str
        Why it is not a margin.
    confidence : float
        The confidence its evidence gave (0..1).
    """

    direction: str
    trace: np.ndarray
    z: np.ndarray
    steepest: PickPoint
    reason: str
    confidence: float = 0.0


@dataclass(frozen=True)
class Picks:
    """What the picker found on one section.

    Attributes
    ----------
    horizons : tuple of Horizon
    margins : tuple of MarginPicks
        Empty when the line holds no margin; ``notes`` then says why.
    picker : str
        Name of the picker plugin that made these picks.
    parameters : dict
        The picker's options, for the record.
    notes : tuple of str
        Decisions and reasons worth showing to a reviewer.
    rejected : tuple of RejectedCandidate
        The most confident candidates that were dropped, with the reason
        (for the QC figure of a line with or without margins).
    """

    horizons: tuple = ()
    margins: tuple = ()
    picker: str = ""
    parameters: dict = field(default_factory=dict)
    notes: tuple = ()
    rejected: tuple = ()

    def horizon(self, horizon_id: int) -> Horizon:
        """The horizon with this id (KeyError if there is none)."""
        for h in self.horizons:
            if h.id == horizon_id:
                return h
        raise KeyError(f"no horizon with id {horizon_id}")
