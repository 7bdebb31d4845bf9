"""The pipeline: the one place where the steps are chained.

:func:`analyze` runs read -> velocity model -> pick -> measure -> classify on
one line and returns a :class:`~clinometry.result.Result`.  :func:`measure`
does the same for a horizon the interpreter picked already (a
:class:`~clinometry.picking.picks.Horizon` or a CSV file), so the automatic
picker is skipped but the break, toe, metrics and family are found the same
way.

Each step is a plain function of its own module, dispatched through the
entry-point plugins (``picker=``, ``classifier=``); the pipeline adds only
the bookkeeping an interpreter needs to trust a result: which velocity model
was used and whether it was the package default (a fallback), which plugins
and thresholds ran, with which seed, and every fallback and note the steps
reported.

The default velocity for a TWT section with no velocity given is recorded
in the result (``velocity["default_fallback"] = True`` and a line in
``run["fallbacks"]``) and logged at INFO, without a warning per line, so a
batch of hundreds of lines does not drown the log.

User horizons (:func:`measure`, ``analyze(..., horizons=...)``) are read and
matched to the traces in :mod:`clinometry.pipeline.horizons`.
"""

from __future__ import annotations

import logging
import os
from pathlib import Path

import numpy as np
import xarray as xr

from .._plugins import load_plugin
from ..errors import ClinometryError
from ..picking.picks import Horizon
from ..result import Result
from ..section import check_section, section_name
from .horizons import picks_from_horizon, read_horizon_csv

__all__ = ["analyze", "analyze_full", "measure", "CAUTIONS"]

logger = logging.getLogger(__name__)


def _version() -> str:
    from .. import __version__

    return __version__


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


def _velocity_model(section, *, velocity, velocity_linear, velocity_file, velocity_kind):
    """Velocity model for the section: (model or None, model dict, fallback note or None)."""
    from ..depth import velocity_from_options

    model = velocity_from_options(
        velocity=velocity,
        velocity_linear=velocity_linear,
        velocity_file=velocity_file,
        domain=section.attrs["domain"],
        section=section,
        velocity_kind=velocity_kind,
    )
    if model is None:
        return None, {"model": "none", "reason": "depth-domain section: no conversion needed",
                      "default_fallback": False}, None
    vdict = dict(model.to_dict())
    fallback = getattr(model, "fallback", None) or None
    if fallback:
        logger.info("%s: %s", section_name(section), fallback)
    vdict["default_fallback"] = bool(fallback)
    return model, vdict, fallback


def _thresholds(thresholds):
    """(full threshold table to pass to classify, source text for the record)."""
    from ..classify.thresholds import check_thresholds, default_thresholds, load_thresholds

    if thresholds is None:
        return default_thresholds(), "built-in table (clinometry.classify.thresholds.DEFAULT_THRESHOLDS)"
    if isinstance(thresholds, (str, os.PathLike)):
        return load_thresholds(thresholds), str(thresholds)
    return check_thresholds(thresholds, where="thresholds"), "mapping given by the caller"


def _trajectory_options(table, uncertainty, seed) -> dict:
    """Options of the built-in trajectory metric: the table's flat tolerance and the run's pick errors.

    So the class in ``margins[].trajectory`` and the classifier's hint use
    the same band (see :mod:`clinometry.metrics.trajectory`).
    """
    from ..metrics.trajectory import trajectory_metrics
    from ..metrics.uncertainty import UNCERTAINTY_DEFAULTS, uncertainty_settings

    try:
        builtin = load_plugin("metric", "trajectory") is trajectory_metrics
    except ClinometryError:
        builtin = False
    if not builtin:
        return {}
    st = uncertainty_settings(uncertainty, seed=seed) or UNCERTAINTY_DEFAULTS
    return {"trajectory": {"flat_deg": float(table["trajectory_flat_deg"]),
                           "pick_sigma_samples": float(st["pick_sigma_samples"]),
                           "pick_sigma_traces": float(st["pick_sigma_traces"]),
                           "velocity_sigma_fraction": float(st["velocity_sigma_fraction"])}}


def _finish(section, path, picks, model, vdict, fallback, *, classifier, table, thresholds_source, uncertainty,
            seed, metrics_plugins, run_extra, notes):
    from ..classify import classify
    from ..metrics import measure_picks as measure_metrics

    metrics = measure_metrics(
        picks, section, velocity=model, metrics=metrics_plugins, uncertainty=uncertainty, seed=seed,
        options=_trajectory_options(table, uncertainty, seed),
    )
    classes = tuple(classify(mm, classifier=classifier, thresholds=table) for mm in metrics.margins)
    fallbacks = list(section.attrs.get("fallbacks", []) or [])
    if fallback:
        fallbacks.append(fallback)
    notes = list(notes) + list(picks.notes)
    if not picks.margins:
        notes.append("no margin found on this line: " + ("; ".join(picks.notes) or "the picker gave no reason"))
    run = {
        "clinometry_version": _version(),
        "picker": picks.picker,
        "picker_parameters": picks.parameters,
        "classifier": classifier,
        "thresholds_source": thresholds_source,
        "thresholds": dict(table),
        "metrics_plugins": list(metrics_plugins) if metrics_plugins is not None else "all installed",
        "uncertainty": dict(metrics.uncertainty_settings),
        "seed": int(seed),
        "fallbacks": fallbacks,
        "notes": notes,
        "n_horizons": len(picks.horizons),
        "pick_notes": list(picks.notes),
        "cautions": list(CAUTIONS),
    }
    run.update(run_extra)
    return Result(
        source=_source_info(section, path),
        velocity=vdict,
        picks=picks,
        metrics=metrics,
        classifications=classes,
        run=run,
    )


#: the usual cautions recorded with every result (common practice, no source)
CAUTIONS = (
    "Seismic interpretation aid only: picks, depths and margin classes carry the uncertainty "
    "of the velocity model and of the picking, and are no substitute for well control.",
    "Do not base drilling, injection or storage decisions on these numbers alone; follow local "
    "regulations and the judgement of licensed professionals.",
)


def analyze_full(
    path_or_section,
    *,
    velocity=None,
    velocity_linear=None,
    velocity_file=None,
    velocity_kind="interval",
    domain=None,
    inline=None,
    crossline=None,
    picker="default",
    classifier="rules",
    thresholds=None,
    uncertainty=True,
    seed=0,
    horizons=None,
    metrics=None,
    picker_options=None,
):
    """Like :func:`analyze`, but also return the section and velocity model.

    Returns
    -------
    result : Result
    section : xarray.DataArray, dims ("trace", "z")
        The section that was analysed (for plots and horizon tables).
    velocity_model : object or None
        The velocity model used (None for a depth section).
    """
    section, path = _load_section(path_or_section, domain=domain, inline=inline, crossline=crossline)
    model, vdict, fallback = _velocity_model(
        section, velocity=velocity, velocity_linear=velocity_linear, velocity_file=velocity_file,
        velocity_kind=velocity_kind,
    )
    # checked before the long work starts, so a bad TOML or plugin name fails fast
    table, thresholds_source = _thresholds(thresholds)
    load_plugin("classifier", classifier)
    if horizons is not None:
        horizon = horizons
        if not isinstance(horizon, Horizon):
            horizon = read_horizon_csv(horizons, section)
        picks = picks_from_horizon(horizon, section, model)
        run_extra = {"horizon_source": str(horizons) if not isinstance(horizons, Horizon) else "Horizon given by the caller"}
    else:
        from ..picking import pick

        picks = pick(section, picker=picker, velocity=model, **dict(picker_options or {}))
        run_extra = {"horizon_source": "automatic"}
    result = _finish(
        section, path, picks, model, vdict, fallback,
        classifier=classifier, table=table, thresholds_source=thresholds_source, uncertainty=uncertainty, seed=seed,
        metrics_plugins=metrics, run_extra=run_extra, notes=(),
    )
    logger.info("%s: %d margin(s)", section_name(section), result.n_margins)
    return result, section, model


def analyze(
    path_or_section,
    *,
    velocity=None,
    velocity_linear=None,
    velocity_file=None,
    velocity_kind="interval",
    domain=None,
    inline=None,
    crossline=None,
    picker="default",
    classifier="rules",
    thresholds=None,
    uncertainty=True,
    seed=0,
    horizons=None,
) -> Result:
    """Read, pick, measure and classify one line.

    Parameters
    ----------
    path_or_section : str, os.PathLike or xarray.DataArray
        A SEG-Y file (2D line, or one line of a 3D volume with ``inline=`` /
        ``crossline=``) or a section with dims ("trace", "z").
    velocity : float (m/s) or velocity model, optional
        Constant velocity, or any model from :mod:`clinometry.depth`.
    velocity_linear : (float, float), optional
        ``(v0_m_s, k_per_s)`` of a linear velocity v(z) = v0 + k z.
    velocity_file : str or os.PathLike, optional
        Velocity table or velocity SEG-Y (see
        :func:`clinometry.depth.velocity_from_options`).
    velocity_kind : {"interval", "rms"}
        How the velocities of ``velocity_file`` are to be read (RMS are
        converted with Dix 1955).
    domain : {"twt", "depth"}, optional
        Domain of the file's z axis (default "twt" for files; a section's
        own ``domain`` attr otherwise).
    inline, crossline : int, optional
        Line of a 3D volume.
    picker, classifier : str
        Plugin names (entry-point groups ``clinometry.pickers`` and
        ``clinometry.classifiers``).
    thresholds : str, os.PathLike or mapping, optional
        TOML file or table overriding the classifier thresholds.
    uncertainty : bool or dict
        Run the Monte-Carlo P10/P50/P90 (settings dict passed through).
    seed : int
        Seed of every random draw.
    horizons : Horizon, str or os.PathLike, optional
        The interpreter's own margin horizon (see :func:`measure`); the
        automatic picker is then skipped.

    Returns
    -------
    Result
        ``margins`` is empty (with a note in ``run["notes"]``) when the line
        holds no margin.

    Raises
    ------
    SegyReadError, GeometryError, VelocityError, PluginError, ThresholdsError, HorizonFileError
        Bad input; the message names the file.

    See Also
    --------
    measure : the same for a horizon picked by the interpreter.
    clinometry.result.Result.to_dict : the results contract.

    Notes
    -----
    The result records the usual cautions (``run["cautions"]``): these
    numbers support interpretation; they do not replace well control, local
    regulations or licensed practice for drilling or storage decisions.
    """
    return analyze_full(
        path_or_section,
        velocity=velocity,
        velocity_linear=velocity_linear,
        velocity_file=velocity_file,
        velocity_kind=velocity_kind,
        domain=domain,
        inline=inline,
        crossline=crossline,
        picker=picker,
        classifier=classifier,
        thresholds=thresholds,
        uncertainty=uncertainty,
        seed=seed,
        horizons=horizons,
    )[0]


def measure(
    horizon,
    section,
    *,
    velocity=None,
    velocity_linear=None,
    velocity_file=None,
    velocity_kind="interval",
    classifier="rules",
    thresholds=None,
    uncertainty=True,
    seed=0,
) -> Result:
    """Measure and classify an interpreter's own margin horizon.

    Parameters
    ----------
    horizon : Horizon, str or os.PathLike
        A :class:`~clinometry.picking.picks.Horizon`, or a CSV file with
        columns ``trace`` (0-based index into the section) or ``x, y`` (m),
        and ``z`` (in the section's units: ms TWT or m depth).  x/y points
        are matched to the nearest trace (see :func:`read_horizon_csv`).
    section : xarray.DataArray, dims ("trace", "z"), or SEG-Y path
    velocity, velocity_linear, velocity_file, velocity_kind, classifier, thresholds, uncertainty, seed
        As for :func:`analyze`.

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
    read_horizon_csv : how a CSV horizon is matched to the traces.

    Notes
    -----
    The horizon is interpolated onto every trace of its span and converted
    to depth; direction, break and toe are then found with
    :func:`clinometry.picking.margins.profile_candidates`, the same analysis
    the automatic picker applies to its own surfaces.

    Examples
    --------
    A flat top at 400 ms, a foreset of 20 degrees true dip at 2500 m/s
    (time dip 2 tan(20 deg) / 2500 m/s = 0.2912 ms/m), and a flat basin floor:

    >>> from clinometry.section import make_section
    >>> x = np.arange(120) * 25.0
    >>> z = 400.0 + np.clip((x - 1000.0) * 0.2912, 0.0, 300.0)
    >>> sec = make_section(np.zeros((120, 400), "float32"), z=np.arange(400) * 2.0, trace_spacing_m=25.0)
    >>> h = Horizon(id=0, role="user", trace=np.arange(120), z=z, quality=np.ones(120))
    >>> m = measure(h, sec, velocity=2500.0, uncertainty=False).to_dict()["margins"][0]
    >>> m["direction"], round(m["slope_max_deg"]), abs(m["relief_m"] - 375.0) < 20.0  # 300 ms * 2500 / 2000
    ('+', 20, True)
    """
    return analyze_full(
        section,
        velocity=velocity,
        velocity_linear=velocity_linear,
        velocity_file=velocity_file,
        velocity_kind=velocity_kind,
        classifier=classifier,
        thresholds=thresholds,
        uncertainty=uncertainty,
        seed=seed,
        horizons=horizon,
    )[0]
