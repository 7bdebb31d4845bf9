"""The record that the classification step returns."""

from __future__ import annotations

from dataclasses import dataclass, field

__all__ = ["Classification", "FAMILIES"]

#: the three geometry families of carbonate platform margins
FAMILIES = ("ramp", "rimmed_shelf", "steep_margin")


@dataclass(frozen=True)
class Classification:
    """Family of one margin, with confidence and readable reasons.

    Attributes
    ----------
    family : {"ramp", "rimmed_shelf", "steep_margin"} or None
        None only when the metrics needed are missing (``reasons`` says why).
    subtype : str or None
        For example ``"distally_steepened_ramp"``.
    confidence : float
        0..1.
    reasons : tuple of str
        Which rule fired and how far each value is from its threshold, in
        words an interpreter can read.
    scores : dict of str -> float
        Score per family (0..1), for the record.
    hints : dict
        Extra interpretation hints, e.g. ``{"slope_fabric": ...}`` after
        Kenter (1990).
    classifier : str
        Name of the classifier plugin.
    thresholds : dict
        The threshold table used (after any user override).
    """

    family: str | None
    subtype: str | None = None
    confidence: float = 0.0
    reasons: tuple = ()
    scores: dict = field(default_factory=dict)
    hints: dict = field(default_factory=dict)
    classifier: str = ""
    thresholds: dict = field(default_factory=dict)
