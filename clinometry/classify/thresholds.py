"""The one table of classification thresholds, with their sources, and its TOML override.

Every number the built-in classifier compares a metric with lives in
:data:`DEFAULT_THRESHOLDS`, each with its unit, the published source it
comes from, and whether the value is recalled ("from memory") or chosen
here.  Users override any of them with a TOML file (``--thresholds FILE``
on the command line, :func:`load_thresholds` in scripts)::

    # my_thresholds.toml
    [thresholds]
    ramp_max_slope_deg = 0.5
    steep_min_slope_deg = 35.0

(keys may also be given at the top level).  Unknown keys, values that are
not numbers, and bounds that contradict each other are refused with a
:class:`~clinometry.errors.ThresholdsError` naming the file, the key and the
value, so a typo never silently falls back to a default.
"""

from __future__ import annotations

import difflib
import logging
import math
import os
from dataclasses import dataclass
from types import MappingProxyType

from ..errors import ThresholdsError
from ..definitions import TRAJECTORY_FLAT_DEG

__all__ = [
    "Threshold",
    "DEFAULT_THRESHOLDS",
    "default_thresholds",
    "check_thresholds",
    "load_thresholds",
    "ResolvedThresholds",
    "resolve_thresholds",
]

logger = logging.getLogger(__name__)


@dataclass(frozen=True)
class Threshold:
    """One threshold: value, unit, what it separates, and where it comes from."""

    value: float
    unit: str
    meaning: str
    source: str
    cite: str  # short citation used in readable reasons


#: the threshold table (read-only); values in degrees, metres or per km
DEFAULT_THRESHOLDS = MappingProxyType({
    "ramp_max_slope_deg": Threshold(
        2.0, "deg", "steepest foreset slope of a ramp; above it a margin has a slope break",
        "Read, J. F. (1985) Carbonate platform facies models, AAPG Bulletin 69: 1-21; "
        "Burchette, T. P. & Wright, V. P. (1992) Carbonate ramp depositional systems, "
        "Sedimentary Geology 79: 3-57 (ramps: gentle slopes, generally < 1 deg; from memory); the bound is "
        "set at twice that (our choice), so that a ramp measured with the usual degree or so of seismic "
        "slope uncertainty, or steepening gently on its outer part, stays a ramp, while rimmed shelves, "
        "whose fronts stand at several degrees or more, stay above it",
        "Read 1985; Burchette & Wright 1992, from memory; bound chosen here"),
    "steep_min_slope_deg": Threshold(
        30.0, "deg", "foreset slope above which a margin is steep (bypass/escarpment)",
        "Schlager, W. & Ginsburg, R. N. (1981) Bahama carbonate platforms - the deep and the past, "
        "Marine Geology 44: 1-24 (bypass and escarpment margins); Kenter, J. A. M. (1990) Carbonate platform "
        "flanks: slope angle and sediment fabric, Sedimentology 37: 777-794 (loose sand-grade slopes stop near "
        "the angle of repose, ~30 deg; steeper needs framework or cement); Schlager, W. (2005) Carbonate "
        "Sedimentology and Sequence Stratigraphy, SEPM Concepts 8 (from memory)",
        "Schlager & Ginsburg 1981; Kenter 1990, from memory"),
    "distal_steepening_max_slope_deg": Threshold(
        15.0, "deg", "steepest slope still read as the distal steepening of a ramp when the topset dips",
        "Read (1985) distally steepened ramp: a ramp whose gradient increases in deep water, without a "
        "shallow rim (concept from memory); the 15 deg bound is chosen here: below Kenter's (1990) "
        "grain-dominated slope angles (from memory)",
        "Read 1985, bound chosen here"),
    "flat_topset_max_deg": Threshold(
        0.1, "deg", "largest platform-top dip still read as flat (rimmed shelf / flat-topped platform)",
        "Read (1985): rimmed shelves have a flat top behind the rim (from memory); 0.1 deg (~1.7 m/km) "
        "chosen here, about two 2.5 m depth samples over 3 km",
        "Read 1985, bound chosen here"),
    "sharp_break_min_curvature_per_km": Threshold(
        0.1, "1/km", "break curvature above which the shelf break is sharp (rimmed shelf) not gradual (ramp)",
        "chosen here (common practice, no source): 0.1/km is a slope change of ~6 deg over 1 km",
        "chosen here"),
    "min_relief_m": Threshold(
        20.0, "m", "relief below the vertical seismic resolution; a margin this low is poorly resolved",
        "Widess, M. B. (1973) How thin is a thin bed? Geophysics 38: 1176-1180 (tuning thickness lambda/4; "
        "from memory); 20 m = lambda/4 at 40 Hz and 3200 m/s (assumed)",
        "Widess 1973 lambda/4, from memory"),
    "fabric_mud_max_deg": Threshold(
        15.0, "deg", "steepest slope of mud-dominated (cohesive) carbonate flanks",
        "Kenter (1990) Sedimentology 37: 777-794 (from memory)", "Kenter 1990, from memory"),
    "fabric_grain_max_deg": Threshold(
        35.0, "deg", "steepest slope of grain-dominated (non-cohesive sand) flanks, near the angle of repose",
        "Kenter (1990) Sedimentology 37: 777-794 (from memory)", "Kenter 1990, from memory"),
    "trajectory_flat_deg": Threshold(
        TRAJECTORY_FLAT_DEG, "deg", "smallest half-width of the flat shelf-break trajectory band (the band "
        "widens to 1.28 sigma of the measured angle where the break picks resolve less)",
        "classes by sign after Helland-Hansen, W. & Martinsen, O. J. (1996) J. Sed. Res. 66: 670-688 "
        "(from memory); tolerance chosen here (see clinometry.metrics.trajectory)",
        "Helland-Hansen & Martinsen 1996, band chosen here"),
    "log_slope_width": Threshold(
        0.25, "1", "width of the logistic score in ln(slope): how fast confidence grows away from a bound",
        "chosen here: a slope 1.5 times past a bound scores 0.84", "chosen here"),
    "secondary_weight": Threshold(
        0.4, "1", "how much disagreeing secondary criteria (topset, break sharpness, relief) cut confidence",
        "chosen here", "chosen here"),
})

#: pairs (lower, upper) that must be strictly ordered
_ORDERED = (
    ("ramp_max_slope_deg", "distal_steepening_max_slope_deg"),
    ("distal_steepening_max_slope_deg", "steep_min_slope_deg"),
    ("fabric_mud_max_deg", "fabric_grain_max_deg"),
)
#: keys that must be strictly positive (the rest must be >= 0)
_POSITIVE = ("ramp_max_slope_deg", "steep_min_slope_deg", "distal_steepening_max_slope_deg", "fabric_mud_max_deg",
             "fabric_grain_max_deg", "log_slope_width")
_AT_MOST_ONE = ("secondary_weight",)
_ANGLES = ("ramp_max_slope_deg", "steep_min_slope_deg", "distal_steepening_max_slope_deg", "flat_topset_max_deg",
           "fabric_mud_max_deg", "fabric_grain_max_deg", "trajectory_flat_deg")


def default_thresholds() -> dict:
    """The default values, name -> float (a new dict each call).

    Examples
    --------
    >>> default_thresholds()["ramp_max_slope_deg"]
    2.0
    """
    return {k: float(t.value) for k, t in DEFAULT_THRESHOLDS.items()}


def check_thresholds(mapping, *, where: str = "thresholds") -> dict:
    """Merge overrides onto the defaults and check them.

    Parameters
    ----------
    mapping : mapping of str -> number
        Overrides (a subset of the keys of :data:`DEFAULT_THRESHOLDS`).
    where : str
        Name used in messages (the TOML file).

    Returns
    -------
    dict
        The full table of values, defaults replaced by the overrides.

    Raises
    ------
    ThresholdsError
        Unknown key, a value that is not a finite number, out of range, or
        bounds in the wrong order.

    Examples
    --------
    >>> check_thresholds({"steep_min_slope_deg": 35})["steep_min_slope_deg"]
    35.0
    """
    out = default_thresholds()
    for key, value in dict(mapping).items():
        if key not in out:
            close = difflib.get_close_matches(str(key), list(out), n=1)
            hint = f"; did you mean {close[0]!r}?" if close else f"; known keys: {', '.join(sorted(out))}"
            raise ThresholdsError(f"{where}: unknown threshold {key!r} = {value!r}{hint}")
        if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(float(value)):
            raise ThresholdsError(
                f"{where}: threshold {key!r} must be a finite number ({DEFAULT_THRESHOLDS[key].unit}), "
                f"got {value!r} ({type(value).__name__})")
        out[key] = float(value)
    for key, v in out.items():
        if key in _POSITIVE and v <= 0:
            raise ThresholdsError(f"{where}: threshold {key!r} = {v!r} must be > 0")
        if v < 0:
            raise ThresholdsError(f"{where}: threshold {key!r} = {v!r} must be >= 0")
        if key in _AT_MOST_ONE and v > 1:
            raise ThresholdsError(f"{where}: threshold {key!r} = {v!r} must be between 0 and 1")
        if key in _ANGLES and v >= 90:
            raise ThresholdsError(f"{where}: threshold {key!r} = {v!r} deg must be below 90 deg")
    for lo, hi in _ORDERED:
        if not out[lo] < out[hi]:
            raise ThresholdsError(
                f"{where}: inconsistent bounds: {lo} = {out[lo]!r} must be below {hi} = {out[hi]!r}")
    return out


def load_thresholds(path) -> dict:
    """Read a TOML file of threshold overrides and return the full checked table.

    Parameters
    ----------
    path : str or os.PathLike
        TOML file with keys of :data:`DEFAULT_THRESHOLDS`, at the top level
        or in a ``[thresholds]`` table.

    Returns
    -------
    dict
        name -> value, defaults for keys the file does not set.

    Raises
    ------
    ThresholdsError
        Invalid TOML, unknown key, wrong type, or inconsistent bounds; the
        message names the file, the key and the value.
    OSError
        The file cannot be read.
    """
    import tomllib

    name = os.fspath(path)
    with open(name, "rb") as fh:
        try:
            data = tomllib.load(fh)
        except tomllib.TOMLDecodeError as err:
            raise ThresholdsError(f"{name}: not valid TOML: {err}") from err
        except UnicodeDecodeError as err:  # TOML is UTF-8 (TOML v1.0.0 specification)
            raise ThresholdsError(f"{name}: not UTF-8 text (byte {err.start}: {err.reason}); TOML files are "
                                  "UTF-8: save it as UTF-8") from err
    if "thresholds" in data:
        extra = [k for k in data if k != "thresholds"]
        if extra:
            raise ThresholdsError(f"{name}: keys {extra} are outside the [thresholds] table; put them inside it")
        data = data["thresholds"]
        if not isinstance(data, dict):
            raise ThresholdsError(f"{name}: 'thresholds' must be a table, got {data!r}")
    out = check_thresholds(data, where=name)
    logger.info("%s: %d threshold(s) overridden", name, len(data))
    return out


#: how the built-in table is named in the results (``run.thresholds_source``)
BUILTIN_SOURCE = "built-in table (clinometry.classify.thresholds.DEFAULT_THRESHOLDS)"


@dataclass(frozen=True)
class ResolvedThresholds:
    """A full, checked threshold table and where it came from: resolved once per run.

    Attributes
    ----------
    table : dict of str -> float
        Every key of :data:`DEFAULT_THRESHOLDS`.
    source : str
        The TOML file, ``"mapping given by the caller"`` or the built-in
        table, as recorded in ``run.thresholds_source``.
    """

    table: dict
    source: str


def resolve_thresholds(thresholds=None) -> ResolvedThresholds:
    """The one way from what a caller gives to the full threshold table.

    Parameters
    ----------
    thresholds : None, str, os.PathLike, mapping or ResolvedThresholds
        None for the defaults, a TOML file (:func:`load_thresholds`), a
        mapping of overrides (:func:`check_thresholds`), or a table resolved
        before (returned as it is, not checked again).

    Returns
    -------
    ResolvedThresholds

    Raises
    ------
    ThresholdsError
        As :func:`load_thresholds` and :func:`check_thresholds`.

    Examples
    --------
    >>> r = resolve_thresholds({"steep_min_slope_deg": 35})
    >>> r.table["steep_min_slope_deg"], r.source, resolve_thresholds(r) is r
    (35.0, 'mapping given by the caller', True)
    """
    if isinstance(thresholds, ResolvedThresholds):
        return thresholds
    if thresholds is None:
        return ResolvedThresholds(default_thresholds(), BUILTIN_SOURCE)
    if isinstance(thresholds, (str, os.PathLike)):
        return ResolvedThresholds(load_thresholds(thresholds), str(thresholds))
    return ResolvedThresholds(check_thresholds(thresholds, where="thresholds"), "mapping given by the caller")
