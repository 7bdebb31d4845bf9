"""The pipeline: the one place where the steps are chained.

:func:`run_analysis` runs read -> velocity model -> pick -> measure ->
classify on one line with the choices of an
:class:`~clinometry.pipeline.analysis_options.AnalysisOptions` and returns a
:class:`LineAnalysis` (the :class:`~clinometry.result.Result` with the
section and velocity model it was computed on, for plots and tables).
:func:`analyze` is the front door: keywords in, a Result out.
:func:`measure_horizon` does the same for a horizon the interpreter picked
already (the ``horizons`` picker, :mod:`clinometry.user_horizons`), so the
automatic picker is skipped but the break, toe, metrics and family are found
the same way.

Each step is a plain function of its own module, dispatched through the
entry-point plugins; the pipeline adds only the bookkeeping an interpreter
needs to trust a result: which velocity model was used and whether it was
the package default (a fallback), which plugins and thresholds ran, with
which seed, and every fallback and note the steps reported.  The choices
that can be refused (thresholds, plugin names and their options) are checked
before the line is read, so a typo fails fast.

The default velocity for a TWT section with no velocity given is recorded
in the result (``velocity["default_fallback"] = True`` and a line in
``run["fallbacks"]``) and logged at INFO, without a warning per line, so a
batch of hundreds of lines does not drown the log.
"""

from __future__ import annotations

import logging
import os
from dataclasses import dataclass, replace
from pathlib import Path

import numpy as np
import xarray as xr

from .._plugins import check_options, load_plugin
from .._version import __version__
from ..errors import ClinometryError
from ..result import Result
from ..section import check_section, section_name
from .analysis_options import AnalysisOptions

__all__ = ["LineAnalysis", "run_analysis", "analyze", "measure_horizon", "measure", "check_choices", "CAUTIONS",
           "rejected_candidates", "check_velocity"]

logger = logging.getLogger(__name__)


@dataclass(frozen=True)
class LineAnalysis:
    """What :func:`run_analysis` returns: the result and what it was computed on.

    Attributes
    ----------
    result : Result
    section : xarray.DataArray, dims ("trace", "z")
        The section that was analysed (for plots and horizon tables).
    velocity_model : VelocityModel or None
        The velocity model used (None for a depth section).
    """

    result: Result
    section: xr.DataArray
    velocity_model: object = None


def _source_info(section: xr.DataArray, path) -> dict:
    attrs = section.attrs
    src = {
        "path": str(path) if path is not None else str(attrs.get("source_path", "") or ""),
        "n_traces": int(section.sizes["trace"]),
        "n_samples": int(section.sizes["z"]),
        "domain": attrs["domain"],
        "units": attrs.get("units"),
        "sample_interval": attrs.get("sample_interval"),
        "z_first": float(section["z"].values[0]),
        "z_last": float(section["z"].values[-1]),
        "length_m": float(section["distance"].values[-1] - section["distance"].values[0]),
        "line_label": attrs.get("line_label", ""),
        "sample_format": attrs.get("sample_format"),
        "fallbacks": list(attrs.get("fallbacks", []) or []),
        "dead_traces": [int(t) for t in (attrs.get("dead_traces", []) or [])],
        "n_nonfinite": int(attrs.get("n_nonfinite", 0) or 0),
    }
    for c in ("inline", "crossline"):
        if c in section.coords:
            vals = np.unique(section[c].values)
            if vals.size == 1:
                src[c] = int(vals[0])
    return src


def _load_section(path_or_section, *, domain, inline, crossline):
    if isinstance(path_or_section, xr.DataArray):
        section = check_section(path_or_section)
        if domain is not None and section.attrs["domain"] != domain:
            raise ClinometryError(
                f"{section_name(section)}: domain={domain!r} was given but the section is "
                f"in {section.attrs['domain']!r}; convert it with clinometry.depth first"
            )
        return section, None
    if not isinstance(path_or_section, (str, os.PathLike)):
        raise TypeError(f"analyze() takes a SEG-Y path or a section DataArray, got {type(path_or_section).__name__}")
    from ..io import read_section

    path = Path(path_or_section)
    section = read_section(path, inline=inline, crossline=crossline, domain=domain or "twt")
    return section, path


def _velocity_model(section, options):
    """Velocity model for the section: (model or None, model dict, fallback note or None)."""
    model = options.velocity_model(section)
    if model is None:
        return None, {"model": "none", "reason": "depth-domain section: no conversion needed",
                      "default_fallback": False}, None
    vdict = dict(model.to_dict())
    fallback = getattr(model, "fallback", None) or None
    if fallback:
        logger.info("%s: %s", section_name(section), fallback)
    vdict["default_fallback"] = bool(fallback)
    return model, vdict, fallback


def check_choices(options):
    """Resolve the thresholds and load and check every plugin and its options, before any reading.

    Parameters
    ----------
    options : AnalysisOptions

    Returns
    -------
    ResolvedThresholds
        To pass on (``replace(options, thresholds=...)``) so the table is
        not resolved again.

    Raises
    ------
    ThresholdsError, PluginError, VelocityError
        A bad threshold file or table, an unknown or unfit plugin, an
        option a plugin does not declare, or velocity options that cannot
        work on any line (see :func:`check_velocity`).
    """
    from ..classify import resolve_thresholds
    from ..metrics import load_metrics, run_values

    resolved = resolve_thresholds(options.thresholds)
    check_velocity(options)
    classifier = load_plugin("classifier", options.classifier)
    check_options("classifier", options.classifier, classifier, {}, passed=("thresholds",))
    picker = load_plugin("picker", options.picker_name)
    check_options("picker", options.picker_name, picker, options.picker_keywords(), passed=("velocity",))
    load_metrics(options.metrics, options.metric_options, run_value_names=run_values(flat_deg=0.0))
    return resolved


def check_velocity(options) -> None:
    """Refuse velocity options that cannot work on any line, before any line is read.

    A constant or linear velocity is built once (a negative or absurd value
    fails here), a velocity table is read, and a velocity SEG-Y must exist
    (it is matched trace by trace to each line later).  Whether a velocity
    fits a line's domain is checked per line, where the message can name
    the file.

    Parameters
    ----------
    options : AnalysisOptions

    Raises
    ------
    VelocityError
        As :func:`clinometry.depth.velocity_from_options`, e.g. ``constant
        velocity model: velocity is -2500 m/s; velocities must be positive``.

    Examples
    --------
    >>> check_velocity(AnalysisOptions(velocity=2800.0)) is None
    True
    """
    from ..depth import velocity_from_options
    from ..depth.model_from_options import is_segy_file

    vf = options.velocity_file
    if vf is not None and os.path.isfile(vf) and is_segy_file(vf):
        return
    velocity_from_options(velocity=options.velocity, velocity_linear=options.velocity_linear, velocity_file=vf,
                          domain="twt", velocity_kind=options.velocity_kind)


def _horizon_depths(picks, section, model) -> tuple:
    """Depth (m) of every point of every picked horizon, in the order of ``picks.horizons``."""
    from ..depth import to_depth

    return tuple(to_depth(section, h.trace, h.z, model) if len(h) else np.zeros(0) for h in picks.horizons)


def _measure_and_classify(section, path, picks, model, vdict, fallback, *, options, resolved):
    """Metrics and families of the picks, and the run record: the Result of one line."""
    from ..classify import classify
    from ..metrics import measure_picks
    from ..user_horizons import horizon_source

    metrics = measure_picks(
        picks, section, velocity=model, metrics=options.metrics, metric_options=options.metric_options,
        uncertainty=options.uncertainty, seed=options.seed, flat_deg=float(resolved.table["trajectory_flat_deg"]),
    )
    classes = tuple(classify(mm, classifier=options.classifier, thresholds=resolved) for mm in metrics.margins)
    fallbacks = list(section.attrs.get("fallbacks", []) or [])
    if fallback:
        fallbacks.append(fallback)
    notes = list(picks.notes)
    if not picks.margins:
        notes.append("no margin found on this line: " + ("; ".join(picks.notes) or "the picker gave no reason"))
    run = {
        "clinometry_version": __version__,
        "picker": picks.picker,
        "picker_parameters": picks.parameters,
        "classifier": options.classifier,
        "thresholds_source": resolved.source,
        "thresholds": dict(resolved.table),
        "metrics_plugins": list(options.metrics),
        "uncertainty": dict(metrics.uncertainty_settings),
        "seed": int(options.seed),
        "fallbacks": fallbacks,
        "notes": notes,
        "n_horizons": len(picks.horizons),
        "pick_notes": list(picks.notes),
        "rejected_candidates": rejected_candidates(picks, section),
        "cautions": list(CAUTIONS),
        "horizon_source": "automatic" if options.horizons is None else horizon_source(options.horizons),
    }
    return Result(
        source=_source_info(section, path),
        velocity=vdict,
        picks=picks,
        metrics=metrics,
        classifications=classes,
        run=run,
        horizon_depths_m=_horizon_depths(picks, section, model),
    )


#: most profile points kept per rejected candidate in the results file (evenly thinned beyond)
MAX_REJECTED_POINTS = 400


def rejected_candidates(picks, section) -> list:
    """The candidates the picker dropped, as plain records for ``run["rejected_candidates"]``.

    Parameters
    ----------
    picks : Picks
        Its ``rejected`` tuple (:class:`~clinometry.picking.picks.RejectedCandidate`).
    section : xarray.DataArray, dims ("trace", "z")
        For the along-line distance of each point.

    Returns
    -------
    list of dict
        ``{"direction", "reason", "confidence", "steepest": {"trace", "z",
        "distance_m"}, "profile": {"trace": [...], "z": [...]}}``, z in the
        section's units rounded to 0.01, distance to 0.1 m, confidence to
        0.001; at most :data:`MAX_REJECTED_POINTS` profile points (evenly
        thinned, ends kept).  Empty when the picker reported none.

    Examples
    --------
    >>> from clinometry.picking.picks import PickPoint, Picks, RejectedCandidate
    >>> from clinometry.section import make_section
    >>> sec = make_section(np.zeros((5, 4)), z=[0, 4, 8, 12], trace_spacing_m=25.0)
    >>> c = RejectedCandidate("+", np.array([1, 2, 3]), np.array([4.0, 6.004, 8.0]), PickPoint(2, 6.004, 0.9),
    ...                       "staircase", 0.41)
    >>> rejected_candidates(Picks(rejected=(c,)), sec)[0]["steepest"]
    {'trace': 2, 'z': 6.0, 'distance_m': 50.0}
    """
    dist = np.asarray(section["distance"].values, dtype=float)
    out = []
    for c in getattr(picks, "rejected", ()) or ():
        t = np.asarray(c.trace, dtype=np.int64)
        z = np.asarray(c.z, dtype=float)
        if t.size > MAX_REJECTED_POINTS:
            keep = np.unique(np.linspace(0, t.size - 1, MAX_REJECTED_POINTS).round().astype(int))
            t, z = t[keep], z[keep]
        st = c.steepest
        st_trace = int(st.trace)
        out.append({
            "direction": c.direction,
            "reason": str(c.reason),
            "confidence": round(float(c.confidence), 3),
            "steepest": {"trace": st_trace, "z": round(float(st.z), 2),
                         "distance_m": round(float(dist[st_trace]), 1) if 0 <= st_trace < dist.size else None},
            "profile": {"trace": t.tolist(), "z": [round(float(v), 2) for v in z]},
        })
    return out


#: the usual cautions recorded with every result (common practice, no source)
CAUTIONS = (
    "Seismic interpretation aid only: picks, depths and margin classes carry the uncertainty "
    "of the velocity model and of the picking, and are no substitute for well control.",
    "Do not base drilling, injection or storage decisions on these numbers alone; follow local "
    "regulations and the judgement of licensed professionals.",
)


def run_analysis(path_or_section, options: AnalysisOptions | None = None, *, inline=None,
                 crossline=None) -> LineAnalysis:
    """Read, pick, measure and classify one line with the given options.

    Parameters
    ----------
    path_or_section : str, os.PathLike or xarray.DataArray
        A SEG-Y file (2D line, or one line of a 3D volume with ``inline=`` /
        ``crossline=``) or a section with dims ("trace", "z").
    options : AnalysisOptions, optional
        Every choice of the run; default the package defaults.
    inline, crossline : int, optional
        Line of a 3D volume.

    Returns
    -------
    LineAnalysis
        The Result, the section and the velocity model.

    Raises
    ------
    SegyReadError, GeometryError, VelocityError, PluginError, ThresholdsError, HorizonFileError
        Bad input; the message names the file.
    """
    from ..picking import pick

    options = AnalysisOptions() if options is None else options
    resolved = check_choices(options)  # a bad TOML, plugin name or option fails before any reading
    section, path = _load_section(path_or_section, domain=options.domain, inline=inline, crossline=crossline)
    model, vdict, fallback = _velocity_model(section, options)
    picks = pick(section, picker=options.picker_name, velocity=model, **options.picker_keywords())
    result = _measure_and_classify(section, path, picks, model, vdict, fallback, options=options, resolved=resolved)
    logger.info("%s: %d margin(s)", section_name(section), result.n_margins)
    return LineAnalysis(result=result, section=section, velocity_model=model)


def analyze(path_or_section, options: AnalysisOptions | None = None, *, inline=None, crossline=None,
            **option_keywords) -> Result:
    """Read, pick, measure and classify one line.

    Parameters
    ----------
    path_or_section, options, inline, crossline
        As for :func:`run_analysis`: the SEG-Y file or section, and the line
        of a 3D volume.
    **option_keywords
        Any field of :class:`AnalysisOptions` (``velocity``,
        ``velocity_linear``, ``velocity_file``, ``velocity_kind``, ``domain``,
        ``picker``, ``picker_options``, ``horizons``, ``metrics``,
        ``metric_options``, ``classifier``, ``thresholds``, ``uncertainty``,
        ``seed``), on top of ``options``.

    Returns
    -------
    Result
        ``margins`` is empty (with a note in ``run["notes"]``) when the line
        holds no margin.

    Raises
    ------
    SegyReadError, GeometryError, VelocityError, PluginError, ThresholdsError, HorizonFileError
        Bad input; the message names the file.
    TypeError
        A keyword that is not an option.

    See Also
    --------
    run_analysis : the same, returning the section and velocity model too.
    measure_horizon : the same for a horizon picked by the interpreter.
    clinometry.result.Result.to_dict : the results contract.

    Notes
    -----
    The result records the usual cautions (``run["cautions"]``): these
    numbers support interpretation; they do not replace well control, local
    regulations or licensed practice for drilling or storage decisions.
    """
    return run_analysis(path_or_section, _options(options, option_keywords), inline=inline,
                        crossline=crossline).result


def _options(options, option_keywords):
    if options is None:
        return AnalysisOptions(**option_keywords)
    return replace(options, **option_keywords) if option_keywords else options


def measure_horizon(horizon, section, options: AnalysisOptions | None = None, **option_keywords) -> Result:
    """Measure and classify an interpreter's own margin horizon.

    The same as ``analyze(section, horizons=horizon, ...)``: the ``horizons``
    picker (:func:`clinometry.user_horizons.pick_from_horizons`) replaces
    the automatic one.

    Parameters
    ----------
    horizon : Horizon, str or os.PathLike
        A :class:`~clinometry.picking.picks.Horizon`, or a CSV file with
        columns ``trace`` (0-based index into the section) or ``x, y`` (m),
        and ``z`` (in the section's units: ms TWT or m depth).  x/y points
        are matched to the nearest trace (see
        :func:`clinometry.user_horizons.read_horizon_csv`).
    section : xarray.DataArray, dims ("trace", "z"), or SEG-Y path
    options : AnalysisOptions, optional
    **option_keywords
        Fields of :class:`AnalysisOptions`, as for :func:`analyze`.

    Returns
    -------
    Result
        Same contract as :func:`analyze`; ``run["horizon_source"]`` names
        the horizon.  When no margin can be found on the horizon (no
        basinward deepening), ``margins`` is empty with the reason in
        ``run["notes"]``.

    Raises
    ------
    HorizonFileError
        The CSV cannot be read or does not match the section (names the
        file, row and column).

    See Also
    --------
    analyze : the same with the automatic picker.

    Notes
    -----
    The horizon is interpolated onto every trace of its span and converted
    to depth; direction, break and toe are then found with
    :func:`clinometry.picking.candidates.leg_readings`, the same analysis
    the automatic picker applies to its own surfaces.

    Examples
    --------
    A flat top at 400 ms, a foreset of 20 degrees true dip at 2500 m/s
    (time dip 2 tan(20 deg) / 2500 m/s = 0.2912 ms/m), and a flat basin floor:

    >>> from clinometry.picking.picks import Horizon
    >>> from clinometry.section import make_section
    >>> x = np.arange(120) * 25.0
    >>> z = 400.0 + np.clip((x - 1000.0) * 0.2912, 0.0, 300.0)
    >>> sec = make_section(np.zeros((120, 400), "float32"), z=np.arange(400) * 2.0, trace_spacing_m=25.0)
    >>> h = Horizon(id=0, role="user", trace=np.arange(120), z=z, quality=np.ones(120))
    >>> m = measure_horizon(h, sec, velocity=2500.0, uncertainty=False).to_dict()["margins"][0]
    >>> m["direction"], round(m["slope_max_deg"]), abs(m["relief_m"] - 375.0) < 20.0  # 300 ms * 2500 / 2000
    ('+', 20, True)
    """
    return run_analysis(section, _options(options, {**option_keywords, "horizons": horizon})).result


#: the old name of :func:`measure_horizon` (``clinometry.measure``), kept for scripts that use it
measure = measure_horizon
