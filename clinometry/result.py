"""The result of one run on one line, and the results contract (JSON).

A :class:`Result` gathers what each step returned -- the source and velocity
model, the :class:`~clinometry.picking.picks.Picks`, the
:class:`~clinometry.metrics.metric_records.Metrics` and one
:class:`~clinometry.classify.classification.Classification` per margin -- plus how
the run was made (plugins, thresholds, seed, fallbacks).  It is a frozen
record: the pipeline builds it once and nothing changes it afterwards.

:meth:`Result.to_dict` writes the *results contract*, schema version
:data:`SCHEMA_VERSION`::

    {"schema_version": 1,
     "source": {"path", "n_traces", "n_samples", "domain", ...},
     "velocity": {"model", ...parameters..., "default_fallback"},
     "run": {"picker", "classifier", "seed", "fallbacks", "notes",
             "rejected_candidates": [{"direction", "reason", "confidence",
                                      "steepest": {"trace", "z", "distance_m"},
                                      "profile": {"trace": [...], "z": [...]}}, ...], ...},
     "margins": [{"direction", "family", "subtype", "confidence", "reasons",
                  "platform_top", "break", "toe", "relief_m",
                  "slope_max_deg", "slope_mean_deg", ..., "uncertainty",
                  "clinoforms", "trajectory", ...}, ...]}

Keys may be added in later versions; the keys listed in
:data:`REQUIRED_MARGIN_KEYS` and :data:`REQUIRED_SOURCE_KEYS` are never
renamed.  The output is plain JSON: no numpy types, ``NaN`` and infinities
become ``null`` (a value that could not be measured is ``null`` with its
reason under ``"missing"``, never an invented number).

:meth:`Result.from_dict` reads such a dict back (``batch --resume`` uses it).
The horizons themselves are not part of the JSON (they go to
``<stem>.horizons.csv``), so a re-read result has the margin picks (break,
toe, clinoform breaks) but no horizon arrays; ``to_dict`` of a re-read
result gives back the same dict.
"""

from __future__ import annotations

import json
import math
from dataclasses import dataclass, field

import numpy as np

from .classify.classification import FAMILIES, Classification
from .errors import ClinometryError
from .metrics.metric_records import POINT_KEYS, MarginMetrics, Metrics
from .picking.picks import ClinoformPicks, MarginPicks, PickPoint, Picks

__all__ = [
    "SCHEMA_VERSION",
    "Result",
    "REQUIRED_SOURCE_KEYS",
    "REQUIRED_MARGIN_KEYS",
    "TRAJECTORY_CLASSES",
    "validate_result_dict",
    "json_safe",
]

#: version of the results contract written by :meth:`Result.to_dict`
SCHEMA_VERSION = 1

#: keys every ``source`` block has
REQUIRED_SOURCE_KEYS = ("path", "n_traces", "n_samples", "domain")

#: keys every margin has (value may be null where the contract allows it)
REQUIRED_MARGIN_KEYS = (
    "direction",
    "family",
    "subtype",
    "confidence",
    "reasons",
    "platform_top",
    "break",
    "toe",
    "relief_m",
    "slope_max_deg",
    "slope_mean_deg",
    "clinoforms",
    "trajectory",
)

#: metric values that every margin carries (null with a reason if unmeasured)
_CORE_VALUES = ("relief_m", "slope_max_deg", "slope_mean_deg")

#: trajectory classes: the three of Helland-Hansen & Martinsen (1996) where the
#: whole P10-P90 interval of the angle lies in one, else the interval's name
#: (see :func:`clinometry.metrics.trajectory.interval_class`)
TRAJECTORY_CLASSES = ("ascending", "flat", "descending", "flat_or_ascending", "flat_or_descending", "unresolved")

# keys of a margin dict that are not metric values
_MARGIN_RESERVED = frozenset(
    tuple(k for k in REQUIRED_MARGIN_KEYS if k not in _CORE_VALUES)
    + (
        "scores",
        "hints",
        "pick_confidence",
        "uncertainty",
        "missing",
        "profile",
        "break_reason",
        "toe_reason",
        "pick_notes",
        "profile_horizon_id",
        "platform_top_horizon_id",
        "classifier",
    )
)


def json_safe(obj):
    """A copy of ``obj`` made of plain JSON types.

    numpy scalars and arrays become Python numbers and lists, tuples become
    lists, non-finite floats become ``None``, mapping keys become ``str``.

    Examples
    --------
    >>> json_safe({"a": np.float32(1.5), "b": (np.int64(2), float("nan"))})
    {'a': 1.5, 'b': [2, None]}
    """
    if obj is None or isinstance(obj, (bool, str)):
        return obj
    if isinstance(obj, np.bool_):
        return bool(obj)
    if isinstance(obj, (int, np.integer)):
        return int(obj)
    if isinstance(obj, (float, np.floating)):
        v = float(obj)
        return v if math.isfinite(v) else None
    if isinstance(obj, np.ndarray):
        return json_safe(obj.tolist())
    if isinstance(obj, dict):
        return {str(k): json_safe(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [json_safe(v) for v in obj]
    return str(obj)


@dataclass(frozen=True)
class Result:
    """Everything one run found on one line.

    Attributes
    ----------
    source : dict
        At least ``path``, ``n_traces``, ``n_samples``, ``domain``; also
        ``sample_interval``, ``units``, ``line_label``, ``fallbacks`` ... .
    velocity : dict
        The velocity model used (``VelocityModel.to_dict()``) with
        ``"default_fallback": True`` when no velocity was given and the
        package default was used.  ``{"model": "none"}`` for depth sections.
    picks : Picks or None
        A result re-read from JSON has the margin picks (break, toe,
        clinoform breaks) but no horizon arrays.
    metrics : Metrics
        One :class:`MarginMetrics` per margin.
    classifications : tuple of Classification
        Same order as ``metrics.margins``.
    run : dict
        How the run was made: ``clinometry_version``, ``picker``,
        ``picker_parameters``, ``classifier``, ``thresholds_source``,
        ``thresholds``, ``metrics_plugins``, ``uncertainty``, ``seed``,
        ``fallbacks`` (section attrs plus the velocity default), ``notes``, ``cautions``, ``horizon_source`` ... .
    horizon_depths_m : tuple of numpy.ndarray
        Depth (m, positive down) of every point of each horizon of
        ``picks.horizons``, same order, converted with the run's velocity
        model (for the horizons table).  Not part of the JSON, like the
        horizons; empty for a re-read result.

    See Also
    --------
    clinometry.pipeline.analyze : builds a Result from a file or section.
    validate_result_dict : checks a dict against the contract.

    Examples
    --------
    >>> r = Result(source={"path": "a.sgy", "n_traces": 3, "n_samples": 4, "domain": "depth"},
    ...            velocity={"model": "none"}, picks=None, metrics=Metrics())
    >>> d = r.to_dict()
    >>> d["schema_version"], d["margins"], Result.from_dict(d).to_dict() == d
    (1, [], True)
    """

    source: dict
    velocity: dict
    picks: Picks | None
    metrics: Metrics
    classifications: tuple = ()
    run: dict = field(default_factory=dict)
    horizon_depths_m: tuple = field(default=(), compare=False, repr=False)

    def __post_init__(self):
        if len(self.classifications) != len(self.metrics.margins):
            raise ValueError(
                f"Result: {len(self.metrics.margins)} margins measured but "
                f"{len(self.classifications)} classifications given"
            )
        n_horizons = len(self.picks.horizons) if self.picks is not None else 0
        if self.horizon_depths_m and len(self.horizon_depths_m) != n_horizons:
            raise ValueError(
                f"Result: {n_horizons} horizons picked but depths given for {len(self.horizon_depths_m)}"
            )

    # ------------------------------------------------------------------ out
    def to_dict(self) -> dict:
        """The results contract as plain JSON types (see module docstring)."""
        margins = []
        pick_margins = tuple(self.picks.margins) if self.picks is not None else ()
        for i, (mm, cls) in enumerate(zip(self.metrics.margins, self.classifications)):
            mp = pick_margins[i] if i < len(pick_margins) else None
            margins.append(_margin_dict(mm, cls, mp))
        run = dict(self.run)
        run.setdefault("picker", self.picks.picker if self.picks is not None else "")
        run.setdefault("uncertainty", dict(self.metrics.uncertainty_settings))
        out = {
            "schema_version": SCHEMA_VERSION,
            "source": dict(self.source),
            "velocity": dict(self.velocity),
            "run": run,
            "margins": margins,
        }
        return json_safe(out)

    def to_json(self, indent: int | None = 2) -> str:
        """:meth:`to_dict` as a JSON string (strict JSON: no NaN)."""
        return json.dumps(self.to_dict(), indent=indent, allow_nan=False)

    # ------------------------------------------------------------------- in
    @classmethod
    def from_dict(cls, d: dict) -> "Result":
        """Rebuild a Result from :meth:`to_dict` output (after validating it).

        Raises
        ------
        ClinometryError
            When ``d`` does not follow the contract (see
            :func:`validate_result_dict`).
        """
        validate_result_dict(d)
        run = dict(d.get("run", {}))
        thresholds = dict(run.get("thresholds", {}) or {})
        classifier = run.get("classifier", "")
        mms, clss, mps = [], [], []
        for m in d["margins"]:
            values = {k: v for k, v in m.items() if k not in _MARGIN_RESERVED}
            mms.append(
                MarginMetrics(
                    direction=m["direction"],
                    values=values,
                    uncertainty=dict(m.get("uncertainty", {}) or {}),
                    platform_top=m["platform_top"],
                    shelf_break=m["break"],
                    toe=m["toe"],
                    clinoforms=tuple(m["clinoforms"]),
                    trajectory=m["trajectory"],
                    missing=dict(m.get("missing", {}) or {}),
                    profile=dict(m.get("profile", {}) or {}),
                    confidence=float(m.get("pick_confidence", 0.0) or 0.0),
                )
            )
            clss.append(
                Classification(
                    family=m["family"],
                    subtype=m["subtype"],
                    confidence=float(m["confidence"]),
                    reasons=tuple(m["reasons"]),
                    scores=dict(m.get("scores", {}) or {}),
                    hints=dict(m.get("hints", {}) or {}),
                    classifier=m.get("classifier", classifier),
                    thresholds=thresholds,
                )
            )
            mps.append(
                MarginPicks(
                    direction=m["direction"],
                    profile_id=int(m.get("profile_horizon_id", -1) if m.get("profile_horizon_id") is not None else -1),
                    platform_top_id=m.get("platform_top_horizon_id"),
                    shelf_break=_pickpoint(m["break"]),
                    toe=_pickpoint(m["toe"]),
                    clinoforms=tuple(
                        ClinoformPicks(
                            horizon_id=int(c.get("horizon_id", -1) if c.get("horizon_id") is not None else -1),
                            shelf_break=_pickpoint(c.get("break")),
                            toe=_pickpoint(c.get("toe")),
                        )
                        for c in m["clinoforms"]
                    ),
                    confidence=float(m.get("pick_confidence", 0.0) or 0.0),
                    break_reason=m.get("break_reason", "") or "",
                    toe_reason=m.get("toe_reason", "") or "",
                    notes=tuple(m.get("pick_notes", ()) or ()),
                )
            )
        picks = Picks(
            horizons=(),
            margins=tuple(mps),
            picker=run.get("picker", ""),
            parameters=dict(run.get("picker_parameters", {}) or {}),
            notes=tuple(run.get("pick_notes", ()) or ()),
        )
        metrics = Metrics(
            margins=tuple(mms),
            velocity=dict(d["velocity"]),
            uncertainty_settings=dict(run.get("uncertainty", {}) or {}),
        )
        return cls(
            source=dict(d["source"]),
            velocity=dict(d["velocity"]),
            picks=picks,
            metrics=metrics,
            classifications=tuple(clss),
            run=run,
        )

    @classmethod
    def from_json(cls, text: str) -> "Result":
        """Rebuild a Result from :meth:`to_json` output."""
        try:
            d = json.loads(text)
        except json.JSONDecodeError as err:
            raise ClinometryError(f"result JSON is not valid JSON: {err}; rerun the analysis to rewrite it") from err
        return cls.from_dict(d)

    # -------------------------------------------------------------- helpers
    @property
    def n_margins(self) -> int:
        """Number of margins found."""
        return len(self.metrics.margins)

    def summary_lines(self) -> list[str]:
        """One short human-readable line per margin (used by the CLI)."""
        lines = []
        for m in self.to_dict()["margins"]:
            lines.append(_summary_line(m))
        return lines


def _summary_line(m: dict) -> str:
    def num(key, fmt):
        v = m.get(key)
        return "n/a" if v is None else format(v, fmt)

    family = m["family"] or "unclassified"
    if m.get("subtype"):
        family = f"{family} ({m['subtype']})"
    return (
        f"margin {m['direction']}: {family}, confidence {m['confidence']:.2f}, "
        f"slope max {num('slope_max_deg', '.1f')} deg, mean {num('slope_mean_deg', '.1f')} deg, "
        f"relief {num('relief_m', '.0f')} m"
    )


def _pickpoint(p):
    if not p or p.get("trace") is None or p.get("z") is None:
        return None
    return PickPoint(trace=int(p["trace"]), z=float(p["z"]), quality=float(p.get("quality", 1.0) or 0.0))


def _point(p):
    if p is None:
        return None
    out = dict(p)
    for k in POINT_KEYS:
        out.setdefault(k, None)
    return out


def _margin_dict(mm: MarginMetrics, cls: Classification, mp: MarginPicks | None) -> dict:
    m = {
        "direction": mm.direction,
        "family": cls.family,
        "subtype": cls.subtype,
        "confidence": float(cls.confidence),
        "reasons": list(cls.reasons),
        "scores": dict(cls.scores),
        "hints": dict(cls.hints),
        "classifier": cls.classifier,
        "pick_confidence": float(mm.confidence),
        "platform_top": _point(mm.platform_top),
        "break": _point(mm.shelf_break),
        "toe": _point(mm.toe),
    }
    missing = dict(mm.missing)
    for k in _CORE_VALUES:
        if k not in mm.values:
            missing.setdefault(k, "not measured by the metric plugins that were run")
    for k, v in mm.values.items():
        if k in _MARGIN_RESERVED:
            raise ValueError(f"metric name {k!r} clashes with a key of the results contract; rename the metric")
        m[k] = v
    for k in _CORE_VALUES:
        m.setdefault(k, None)
    m["uncertainty"] = {k: dict(v) for k, v in mm.uncertainty.items()}
    m["missing"] = missing
    m["clinoforms"] = [
        {**c, "break": _point(c.get("break")), "toe": _point(c.get("toe"))} for c in mm.clinoforms
    ]
    m["trajectory"] = dict(mm.trajectory) if mm.trajectory is not None else None
    m["profile"] = dict(mm.profile)
    if mp is not None:
        m["break_reason"] = mp.break_reason
        m["toe_reason"] = mp.toe_reason
        m["pick_notes"] = list(mp.notes)
        m["profile_horizon_id"] = mp.profile_id
        m["platform_top_horizon_id"] = mp.platform_top_id
    return m


# ---------------------------------------------------------------- validation
def _fail(where: str, msg: str):
    raise ClinometryError(f"results contract: {where}: {msg}")


def _is_num(v) -> bool:
    return isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v)


def _check_point(where: str, p, *, nullable: bool = True):
    if p is None:
        if not nullable:
            _fail(where, "is null")
        return
    if not isinstance(p, dict):
        _fail(where, f"must be an object or null, got {type(p).__name__}")
    for k in POINT_KEYS:
        if k not in p:
            _fail(where, f"has no key {k!r} (a point needs {', '.join(POINT_KEYS)})")
    if not isinstance(p["trace"], int) or isinstance(p["trace"], bool):
        _fail(where, f"'trace' must be an integer, got {p['trace']!r}")
    for k in ("distance_m", "depth_m", "x", "y", "z"):
        if p[k] is not None and not _is_num(p[k]):
            _fail(where, f"{k!r} must be a number or null, got {p[k]!r}")


def _check_rejected(items):
    """``run.rejected_candidates``: the candidates the picker dropped (a later addition: optional, checked when present)."""
    if not isinstance(items, list):
        _fail("run.rejected_candidates", "must be a list")
    for i, c in enumerate(items):
        w = f"run.rejected_candidates[{i}]"
        if not isinstance(c, dict):
            _fail(w, "must be an object")
        for k in ("direction", "reason", "confidence", "steepest", "profile"):
            if k not in c:
                _fail(w, f"has no key {k!r}")
        if c["direction"] not in ("+", "-"):
            _fail(w, f"'direction' must be '+' or '-', got {c['direction']!r}")
        if not isinstance(c["reason"], str):
            _fail(w, "'reason' must be a string")
        if not _is_num(c["confidence"]) or not 0.0 <= c["confidence"] <= 1.0:
            _fail(w, f"'confidence' must be a number in [0, 1], got {c['confidence']!r}")
        st = c["steepest"]
        if not isinstance(st, dict) or not isinstance(st.get("trace"), int) or isinstance(st.get("trace"), bool) \
                or not _is_num(st.get("z")):
            _fail(f"{w}.steepest", "must be an object with an integer 'trace' and a number 'z'")
        prof = c["profile"]
        if not isinstance(prof, dict) or not isinstance(prof.get("trace"), list) or not isinstance(prof.get("z"), list):
            _fail(f"{w}.profile", "must be an object with lists 'trace' and 'z'")
        if len(prof["trace"]) != len(prof["z"]):
            _fail(f"{w}.profile", f"'trace' has {len(prof['trace'])} points but 'z' has {len(prof['z'])}")
        if not all(isinstance(t, int) and not isinstance(t, bool) for t in prof["trace"]):
            _fail(f"{w}.profile", "'trace' must hold integers")
        if not all(v is None or _is_num(v) for v in prof["z"]):
            _fail(f"{w}.profile", "'z' must hold numbers or null")


def validate_result_dict(d) -> dict:
    """Check a dict against the results contract; return it unchanged.

    Parameters
    ----------
    d : dict
        As written by :meth:`Result.to_dict` or read from ``<stem>.json``.

    Returns
    -------
    dict
        ``d`` itself.

    Raises
    ------
    ClinometryError
        Naming the first key that is missing or has a wrong type or value,
        e.g. ``results contract: margins[0]: has no key 'relief_m'``.

    Examples
    --------
    >>> d = {"schema_version": 1, "velocity": {"model": "none"}, "margins": [],
    ...      "source": {"path": "a.sgy", "n_traces": 3, "n_samples": 4, "domain": "depth"}}
    >>> validate_result_dict(d)["schema_version"]
    1
    """
    if not isinstance(d, dict):
        _fail("top level", f"must be an object, got {type(d).__name__}")
    if d.get("schema_version") != SCHEMA_VERSION:
        _fail("schema_version", f"must be {SCHEMA_VERSION}, got {d.get('schema_version')!r}")
    src = d.get("source")
    if not isinstance(src, dict):
        _fail("source", "missing or not an object")
    for k in REQUIRED_SOURCE_KEYS:
        if k not in src:
            _fail("source", f"has no key {k!r}")
    if src["domain"] not in ("twt", "depth"):
        _fail("source", f"'domain' must be 'twt' or 'depth', got {src['domain']!r}")
    for k in ("n_traces", "n_samples"):
        if not isinstance(src[k], int) or isinstance(src[k], bool) or src[k] < 0:
            _fail("source", f"{k!r} must be a non-negative integer, got {src[k]!r}")
    vel = d.get("velocity")
    if not isinstance(vel, dict) or "model" not in vel:
        _fail("velocity", "missing, or has no key 'model'")
    run = d.get("run")
    if run is not None and not isinstance(run, dict):
        _fail("run", "must be an object")
    if run and "rejected_candidates" in run:
        _check_rejected(run["rejected_candidates"])
    margins = d.get("margins")
    if not isinstance(margins, list):
        _fail("margins", "missing or not a list")
    for i, m in enumerate(margins):
        w = f"margins[{i}]"
        if not isinstance(m, dict):
            _fail(w, "must be an object")
        for k in REQUIRED_MARGIN_KEYS:
            if k not in m:
                _fail(w, f"has no key {k!r}")
        if m["direction"] not in ("+", "-"):
            _fail(w, f"'direction' must be '+' or '-', got {m['direction']!r}")
        if m["family"] is not None and m["family"] not in FAMILIES:
            _fail(w, f"'family' must be one of {FAMILIES} or null, got {m['family']!r}")
        if m["family"] is None and not m["reasons"]:
            _fail(w, "'family' is null but 'reasons' does not say why")
        if not _is_num(m["confidence"]) or not 0.0 <= m["confidence"] <= 1.0:
            _fail(w, f"'confidence' must be a number in [0, 1], got {m['confidence']!r}")
        if not isinstance(m["reasons"], list) or not all(isinstance(r, str) for r in m["reasons"]):
            _fail(w, "'reasons' must be a list of strings")
        if m["platform_top"] is not None and not isinstance(m["platform_top"], dict):
            _fail(w, "'platform_top' must be an object or null")
        _check_point(f"{w}.break", m["break"])
        _check_point(f"{w}.toe", m["toe"])
        for k in _CORE_VALUES:
            if m[k] is not None and not _is_num(m[k]):
                _fail(w, f"{k!r} must be a number or null, got {m[k]!r}")
        if not isinstance(m["clinoforms"], list):
            _fail(w, "'clinoforms' must be a list")
        for j, c in enumerate(m["clinoforms"]):
            wc = f"{w}.clinoforms[{j}]"
            if not isinstance(c, dict):
                _fail(wc, "must be an object")
            for k in ("break", "toe", "slope_max_deg"):
                if k not in c:
                    _fail(wc, f"has no key {k!r}")
            _check_point(f"{wc}.break", c["break"])
            _check_point(f"{wc}.toe", c["toe"])
            if c["slope_max_deg"] is not None and not _is_num(c["slope_max_deg"]):
                _fail(wc, f"'slope_max_deg' must be a number or null, got {c['slope_max_deg']!r}")
        t = m["trajectory"]
        if t is not None:
            if not isinstance(t, dict) or "angle_deg" not in t or "class" not in t:
                _fail(f"{w}.trajectory", "must be null or an object with 'angle_deg' and 'class'")
            if t["class"] not in TRAJECTORY_CLASSES:
                _fail(f"{w}.trajectory", f"'class' must be one of {TRAJECTORY_CLASSES}, got {t['class']!r}")
            if t["angle_deg"] is not None and not _is_num(t["angle_deg"]):
                _fail(f"{w}.trajectory", f"'angle_deg' must be a number or null, got {t['angle_deg']!r}")
    return d
