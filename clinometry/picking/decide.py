"""Combine the evidence of each candidate into a confidence, and choose the margins.

Every candidate (:mod:`~clinometry.picking.candidates`) gets five pieces of
evidence (:mod:`~clinometry.picking.evidence`) and the rejection rules of
:mod:`~clinometry.picking.vetting`.  A candidate no rule rejects gets a
confidence: the weighted mean of its evidence scores (:data:`WEIGHTS`), so
one weak piece lowers it without removing the margin.  A break or toe at
the edge of the record halves it (:data:`EDGE_FACTOR`): the slope is not
imaged to its end.

Candidates facing the same way whose slopes overlap along the line are one
margin seen on several surfaces: the most confident is kept, and the
others are noted.
"""

from __future__ import annotations

import logging
from dataclasses import dataclass

import numpy as np

from .candidates import Candidate
from .evidence.character import layering_contrast
from .evidence.faces import slope_face
from .evidence.floors import basin_floor
from .evidence.record import Evidence
from .evidence.terminations import onlap
from .evidence.tops import platform_top
from .evidence._regions import break_trace, face_traces, toe_trace
from .vetting import concentrated_relief, vet, vet_against

__all__ = ["Assessed", "assess", "choose_margins", "dropped_candidates", "WEIGHTS", "EDGE_FACTOR",
           "DEFAULT_MIN_CONFIDENCE"]

logger = logging.getLogger(__name__)

#: weight of each piece of evidence in the confidence (our choice, no source:
#: the platform top and the slope face carry a margin; floor, onlap and the
#: change of character confirm it)
WEIGHTS = {"platform_top": 0.3, "slope_face": 0.3, "basin_floor": 0.1, "onlap": 0.15, "character": 0.15}
#: confidence factor of a margin whose break or toe lies at the edge of the
#: record or within one smoothing length of a line end (common practice, no source)
EDGE_FACTOR = 0.5
#: confidence margin by which a reading with a distinct break is preferred to
#: a ramp reading of the same slope (our choice, no source)
BREAK_PREFERENCE = 0.15
#: candidates with lower confidence are not reported (listed in the notes)
DEFAULT_MIN_CONFIDENCE = 0.5


@dataclass(frozen=True, eq=False)
class Assessed:
    """A candidate with its evidence, the rules against it and its confidence."""

    candidate: Candidate
    evidence: dict
    rejected: tuple
    confidence: float
    relief_m: float
    edge: str = ""

    @property
    def direction(self):
        return self.candidate.direction


def _edge(images, c) -> str:
    """Which bends lie at the record edge or within one smoothing length of a line end."""
    n = images.n_trace
    margin = max(1, int(np.ceil(images.smoothing_m / images.dx_m)))
    half = 0.5 * images.period_samples
    out = []
    for name, t in (("shelf break", c.bends.shelf_break), ("toe", c.bends.toe)):
        if t is None:
            continue
        z = float(c.z_index[c.at(t)])
        if t < margin or t > n - 1 - margin or not (half <= z <= images.n_z - 1 - half):
            out.append(name)
    return " and ".join(out)


def assess(images, c: Candidate) -> Assessed:
    """Evidence, rejection reasons and confidence of one candidate."""
    ev = {e.name: e for e in (platform_top(images, c), slope_face(images, c), basin_floor(images, c),
                              onlap(images, c), layering_contrast(images, c))}
    b, t = break_trace(c), toe_trace(c)
    relief = float(c.depth_m[c.at(t)] - c.depth_m[c.at(b)])
    # without a distinct break (a ramp) the relief is that of the whole leg
    gate_relief = relief if c.bends.shelf_break is not None and c.bends.toe is not None else c.bends.leg.relief_m
    rejected = vet(ev, images, slope_max_deg=c.bends.slope_max_deg, relief_m=gate_relief, min_relief_m=images.min_relief_m,
                   n_slope_traces=int(face_traces(c).size) - 1, has_break=c.bends.shelf_break is not None)
    step = concentrated_relief(c, images)
    if step:
        rejected.append(step)
    conf = sum(WEIGHTS[k] * ev[k].score for k in WEIGHTS) / sum(WEIGHTS.values())
    edge = _edge(images, c)
    if edge:
        conf *= EDGE_FACTOR
    return Assessed(candidate=c, evidence=ev, rejected=tuple(rejected), confidence=float(conf), relief_m=relief,
                    edge=edge)


def _span(a: Assessed, images):
    c = a.candidate
    lo, hi = sorted((break_trace(c), toe_trace(c)))
    pad = int(np.ceil(images.wavelength_m / images.dx_m))
    return lo - pad, hi + pad


def choose_margins(images, assessed, *, min_confidence: float = DEFAULT_MIN_CONFIDENCE, dropped=None) -> list:
    """The margins among assessed candidates, ordered along the line.

    Rejected candidates and those below ``min_confidence`` are dropped; of
    candidates facing the same way whose slopes overlap, the most confident
    is kept; candidates beneath or above an accepted margin are dropped
    (:func:`~clinometry.picking.vetting.vet_against`).  ``dropped``, a dict,
    receives ``id(assessed) -> reason`` for every candidate no rule rejected
    on its own but that was still not kept.
    """
    dropped = {} if dropped is None else dropped
    kept = []
    # a reading with a distinct break is preferred to a ramp reading of the
    # same slope unless clearly less confident: a profile with a distinct
    # break is not a ramp (Read 1985)
    for a in sorted(assessed, key=lambda a: -(a.confidence + BREAK_PREFERENCE * (a.candidate.bends.shelf_break is not None))):
        c = a.candidate
        where = f"margin candidate facing {c.direction} at trace {c.bends.steepest}"
        if a.rejected:
            logger.debug("%s rejected: %s", where, "; ".join(a.rejected))
            continue
        lo, hi = _span(a, images)
        same = [k for k in kept if k.direction == a.direction and min(hi, _span(k, images)[1]) > max(lo, _span(k, images)[0])]
        if same:
            dropped[id(a)] = (f"another reading of the margin with its steepest point at trace "
                              f"{same[0].candidate.bends.steepest}")
            continue
        why = vet_against(c, kept, images)
        if why:
            logger.debug("%s dropped: %s", where, why)
            dropped[id(a)] = why
            continue
        if a.confidence < min_confidence:
            dropped[id(a)] = f"confidence {a.confidence:.2f} below {min_confidence:.2f}"
            continue
        kept.append(a)
    return sorted(kept, key=lambda a: a.candidate.bends.steepest)


def dropped_candidates(assessed, margins, images, dropped, *, limit: int = 6) -> list:
    """The most confident dropped candidates not covered by a margin, one per slope: (Assessed, reason).

    ``dropped`` is the dict :func:`choose_margins` filled.
    """
    out = []
    kept = {id(m) for m in margins}
    for a in sorted(assessed, key=lambda a: -a.confidence):
        if id(a) in kept:
            continue
        why = a.rejected[0] if a.rejected else dropped.get(id(a), "")
        if not why:
            continue
        lo, hi = _span(a, images)
        if any(m.direction == a.direction and min(hi, _span(m, images)[1]) > max(lo, _span(m, images)[0])
               for m in [*margins, *(o[0] for o in out)]):
            continue
        out.append((a, why))
        if len(out) >= limit:
            break
    return out
