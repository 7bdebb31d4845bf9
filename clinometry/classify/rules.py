"""Rule-based margin family: ramp, rimmed shelf or steep margin, with confidence and reasons.

The primary criterion is the maximum foreset slope, the property that
separates the platform types of Read (1985) and Schlager (2005): ramps dip
gently (generally < 1 deg) without a pronounced break, rimmed shelves have a
flat top and a break into a slope of a few to ~30 deg, and steep (bypass or
escarpment) margins are steeper than loose sediment can stand (Kenter 1990).
Slope angles span two orders of magnitude, so the distance to each bound is
measured in ``ln(slope)``: a logistic score ``p = 1 / (1 + exp(-ln(s / b) / w))``
per bound ``b`` (``w`` = ``log_slope_width``), giving family scores

* ramp = 1 - p(ramp bound)
* rimmed shelf = p(ramp bound) * (1 - p(steep bound))
* steep margin = p(ramp bound) * p(steep bound)

which sum to 1; a slope exactly at a bound scores 0.5 for the families on
either side.  A rimmed-shelf score is shared with the *distally steepened
ramp* (Read 1985) when the platform top dips basinward instead of being flat
and the slope stays below ``distal_steepening_max_slope_deg``.

Secondary criteria then move the confidence towards or away from 0.5
without changing the family: a flat platform top and a sharp break
(curvature) are expected of rimmed shelves and steep margins, a gradual
break of ramps, and a relief above seismic resolution of any margin with a
break.  ``confidence = 0.5 + (score - 0.5) * (1 - secondary_weight * (1 -
agreement))`` with ``agreement`` the fraction of secondary checks that agree
(0.5 when none can be made).  A margin at a bound therefore always has
confidence 0.5.

Hints go beyond the family: the slope-fabric class after Kenter (1990) and
the shelf-break trajectory class with the table's flat band widened to the
angle's own P10-P90 uncertainty (Helland-Hansen & Martinsen 1996; see
:mod:`clinometry.metrics.trajectory`).  Every reason quotes the value, the bound and its source.
"""

from __future__ import annotations

import logging
import math

import numpy as np

from ..metrics.trajectory import P10_P90_SIGMAS
from .classification import FAMILIES, Classification
from .thresholds import DEFAULT_THRESHOLDS, check_thresholds

__all__ = ["classify_rules", "metric_mapping"]

logger = logging.getLogger(__name__)


def metric_mapping(metrics) -> dict:
    """A plain mapping of named values from a MarginMetrics or a mapping.

    ``MarginMetrics`` gives its ``values`` plus ``trajectory``, ``missing``
    and ``direction``.
    """
    if hasattr(metrics, "values") and hasattr(metrics, "missing") and not isinstance(metrics, dict):
        out = dict(metrics.values)
        out["trajectory"] = metrics.trajectory
        out["missing"] = dict(metrics.missing)
        out["direction"] = metrics.direction
        return out
    return dict(metrics)


def _num(m, key):
    v = m.get(key)
    if v is None or isinstance(v, (bool, str)):
        return None
    try:
        v = float(v)
    except (TypeError, ValueError):
        return None
    return v if math.isfinite(v) else None


def _logistic(ratio_log, width):
    return 1.0 / (1.0 + math.exp(-ratio_log / width))


def _cite(key):
    return DEFAULT_THRESHOLDS[key].cite


#: secant and smooth-fit max slopes further apart than this factor flag a
#: rough profile (chosen here; common practice, no source)
_ROUGH_FACTOR = 1.5

#: words for the bounds in reasons
_BOUND_NAMES = {
    "ramp_max_slope_deg": "ramp upper bound",
    "steep_min_slope_deg": "steep-margin lower bound",
}


def _cmp(label, value, unit, key, bound, fmt=".1f"):
    rel = "above" if value > bound else "below" if value < bound else "exactly at"
    far = f" (factor {max(value, bound) / min(value, bound):.2g})" if value != bound else ""
    return (f"{label} {value:{fmt}}{unit} is {rel} the {_BOUND_NAMES[key]} {bound:{fmt}}{unit}{far} "
            f"[{key}; {_cite(key)}]")


def _fabric(slope, t):
    if slope < t["fabric_mud_max_deg"]:
        return "mud-dominated (cohesive) slope"
    if slope <= t["fabric_grain_max_deg"]:
        return "grain-dominated (non-cohesive sand) slope"
    return "rubble or in-situ framework (boundstone) slope"


def classify_rules(metrics, *, thresholds=None) -> Classification:
    """Margin family by slope bounds from Read (1985), Schlager (2005) and Kenter (1990), with confidence and reasons.

    Parameters
    ----------
    metrics : MarginMetrics or mapping
        Named values of one margin; uses ``slope_max_deg`` (required),
        ``topset_gradient_deg``, ``break_curvature_per_km``, ``relief_m``,
        ``slope_mean_deg`` and ``trajectory`` when present.
    thresholds : mapping, optional
        Full or partial threshold table (defaults from
        :data:`~clinometry.classify.thresholds.DEFAULT_THRESHOLDS`).

    Returns
    -------
    Classification
        ``family`` None (confidence 0) when ``slope_max_deg`` is missing.

    References
    ----------
    .. [1] Read, J. F. (1985). Carbonate platform facies models. AAPG
       Bulletin 69: 1-21.
    .. [2] Schlager, W. (2005). Carbonate Sedimentology and Sequence
       Stratigraphy. SEPM Concepts in Sedimentology and Paleontology 8.
    .. [3] Kenter, J. A. M. (1990). Carbonate platform flanks: slope angle and
       sediment fabric. Sedimentology 37: 777-794.
    .. [4] Helland-Hansen, W. & Martinsen, O. J. (1996). Journal of
       Sedimentary Research 66: 670-688.

    Examples
    --------
    >>> c = classify_rules({"slope_max_deg": 0.4})
    >>> c.family, c.subtype
    ('ramp', 'homoclinal_ramp')
    """
    t = check_thresholds(thresholds or {}, where="thresholds")
    m = metric_mapping(metrics)
    reasons, hints = [], {}
    slope = _num(m, "slope_max_deg")
    if slope is None or slope <= 0:
        why = (m.get("missing") or {}).get("slope_max_deg") or (
            "slope_max_deg is missing" if slope is None else f"slope_max_deg is {slope}, not a basinward dip")
        return Classification(family=None, confidence=0.0, reasons=(f"no family: {why}",), classifier="rules",
                              thresholds=t)
    w = t["log_slope_width"]
    p1 = _logistic(math.log(slope / t["ramp_max_slope_deg"]), w)
    p2 = _logistic(math.log(slope / t["steep_min_slope_deg"]), w)
    scores = {"ramp": 1.0 - p1, "rimmed_shelf": p1 * (1.0 - p2), "steep_margin": p1 * p2}
    reasons.append(_cmp("max foreset slope", slope, "°", "ramp_max_slope_deg", t["ramp_max_slope_deg"]))
    reasons.append(_cmp("max foreset slope", slope, "°", "steep_min_slope_deg", t["steep_min_slope_deg"]))

    topset = _num(m, "topset_gradient_deg")
    curv = _num(m, "break_curvature_per_km")
    sharp = t["sharp_break_min_curvature_per_km"]
    # a distally steepened ramp has no sharp shelf break: its slope steepens
    # gradually in deeper water (Read 1985); a margin with a sharp break and a
    # dipping top is a rimmed shelf whose top dips
    gradual = curv is None or curv < sharp
    subtype_score = 0.0
    if topset is not None and topset > 0 and scores["rimmed_shelf"] > 0 and gradual:
        # how surely the top dips (not flat) and the slope stays ramp-like
        p_dip = _logistic(math.log(topset / t["flat_topset_max_deg"]), w) if t["flat_topset_max_deg"] > 0 else 1.0
        p_gentle = 1.0 - _logistic(math.log(slope / t["distal_steepening_max_slope_deg"]), w)
        subtype_score = scores["rimmed_shelf"] * p_dip * p_gentle
        scores["rimmed_shelf"] -= subtype_score
        scores["ramp"] += subtype_score
    family = max(FAMILIES, key=lambda f: (round(scores[f], 12), -FAMILIES.index(f)))
    score = scores[family]
    subtype = None
    if family == "ramp":
        if subtype_score > scores["ramp"] - subtype_score:
            subtype = "distally_steepened_ramp"
            reasons.append(
                f"platform top dips {topset:.2f}° basinward (more than the flat_topset_max_deg bound "
                f"{t['flat_topset_max_deg']:.2f}°, {_cite('flat_topset_max_deg')}) and the slope "
                f"{slope:.1f}° is below the distal_steepening_max_slope_deg bound "
                f"{t['distal_steepening_max_slope_deg']:.1f}° ({_cite('distal_steepening_max_slope_deg')}): "
                "a ramp that steepens distally")
        else:
            subtype = "homoclinal_ramp"

    # secondary criteria: (agrees?, reason)
    checks = []
    relief = _num(m, "relief_m")
    if family in ("rimmed_shelf", "steep_margin"):
        if topset is not None:
            flat = abs(topset) <= t["flat_topset_max_deg"]
            checks.append((flat, f"platform top gradient {topset:.2f}° is {'within' if flat else 'outside'} the "
                                 f"flat band ±{t['flat_topset_max_deg']:.2f}° ({_cite('flat_topset_max_deg')})"))
        if curv is not None:
            ok = curv >= sharp
            checks.append((ok, f"break curvature {curv:.3f}/km is {'above' if ok else 'below'} the sharp-break bound "
                               f"{sharp:.3f}/km ({_cite('sharp_break_min_curvature_per_km')})"))
        if relief is not None:
            ok = relief >= t["min_relief_m"]
            checks.append((ok, f"relief {relief:.0f} m is {'above' if ok else 'below'} the resolution bound "
                               f"{t['min_relief_m']:.0f} m ({_cite('min_relief_m')})"))
    elif subtype == "homoclinal_ramp":
        if curv is not None:
            ok = curv < sharp
            checks.append((ok, f"break curvature {curv:.3f}/km is {'below' if ok else 'above'} the sharp-break bound "
                               f"{sharp:.3f}/km ({_cite('sharp_break_min_curvature_per_km')}); a ramp has no sharp break"))
    else:  # distally steepened ramp: dipping top (already used), a real break below it
        if relief is not None:
            ok = relief >= t["min_relief_m"]
            checks.append((ok, f"relief {relief:.0f} m is {'above' if ok else 'below'} the resolution bound "
                               f"{t['min_relief_m']:.0f} m ({_cite('min_relief_m')})"))
    if checks:
        agreement = sum(ok for ok, _ in checks) / len(checks)
        for ok, text in checks:
            reasons.append(("agrees: " if ok else "disagrees: ") + text)
    else:
        agreement = 0.5
        reasons.append("no secondary criterion could be checked (topset, break curvature or relief missing)")
    factor = 1.0 - t["secondary_weight"] * (1.0 - agreement)
    confidence = float(np.clip(0.5 + (score - 0.5) * factor, 0.0, 1.0))
    reasons.insert(0, f"{family}{' (' + subtype + ')' if subtype else ''}: slope score {score:.2f}, "
                      f"{sum(ok for ok, _ in checks)} of {len(checks)} secondary criteria agree, "
                      f"confidence {confidence:.2f}")

    fit = _num(m, "slope_max_fit_deg")
    if fit is not None and fit > 0 and max(slope, fit) / min(slope, fit) > _ROUGH_FACTOR:
        reasons.append(
            f"check the picks: the secant max slope {slope:.1f}° and the max slope {fit:.1f}° of the smooth "
            f"profile fit (Adams & Schlager 2000) differ by more than a factor {_ROUGH_FACTOR:g}; a rough or "
            "stitched profile makes the secant maximum unreliable")
        hints["profile_rough"] = True
    hints["slope_fabric"] = _fabric(slope, t)
    hints["slope_fabric_reason"] = (
        f"max slope {slope:.1f}° against Kenter (1990) bounds: mud-dominated below {t['fabric_mud_max_deg']:.0f}°, "
        f"grain-dominated up to {t['fabric_grain_max_deg']:.0f}°, steeper needs rubble or framework (from memory)")
    traj = m.get("trajectory")
    if isinstance(traj, dict) and _num(traj, "angle_deg") is not None and traj.get("class"):
        # the metric's class follows the angle's P10-P90 interval against the
        # flat band (clinometry.metrics.trajectory.interval_class)
        hints["trajectory_class"] = traj["class"]
        hints["trajectory_reason"] = (f"shelf-break trajectory {float(traj['angle_deg']):.2f}°: "
                                      f"{traj.get('class_reason', '')} ({_cite('trajectory_flat_deg')})")
    return Classification(
        family=family,
        subtype=subtype,
        confidence=confidence,
        reasons=tuple(reasons),
        scores={k: float(v) for k, v in scores.items()},
        hints=hints,
        classifier="rules",
        thresholds=t,
    )
