"""The record every evidence function returns."""

from __future__ import annotations

from dataclasses import dataclass, field

__all__ = ["Evidence", "NEUTRAL", "ramp", "mean_score"]

#: the score of evidence that says nothing either way
NEUTRAL = 0.5


@dataclass(frozen=True)
class Evidence:
    """One piece of evidence for (score near 1) or against (near 0) a margin.

    Attributes
    ----------
    name : str
        ``"platform_top"``, ``"slope_face"``, ``"basin_floor"``,
        ``"onlap"`` or ``"character"``.
    score : float
        0..1; :data:`NEUTRAL` when it could not be measured.
    values : dict
        The measured numbers (units in the key names).
    reason : str
        One sentence for the reviewer.
    """

    name: str
    score: float
    values: dict = field(default_factory=dict)
    reason: str = ""


def ramp(value, lo, hi):
    """0 at ``lo``, 1 at ``hi``, linear between (NaN gives NaN)."""
    if value != value:
        return value
    return min(1.0, max(0.0, (value - lo) / (hi - lo)))


def mean_score(terms):
    """Mean of the finite terms, :data:`NEUTRAL` when none is."""
    t = [x for x in terms if x == x]
    return sum(t) / len(t) if t else NEUTRAL
