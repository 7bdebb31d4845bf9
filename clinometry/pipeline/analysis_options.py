"""How to analyse a line: one frozen options object, built once and passed down.

:class:`AnalysisOptions` holds every choice of a run -- velocity, domain,
picker, metrics, classifier, thresholds, uncertainty, seed -- and is the
only place these keywords are listed.  The command line builds it from its
arguments (:func:`clinometry.cli._options.analysis_options`), the Python
front doors build it from keywords (``analyze(path, velocity=2800)``), and
the pipeline, the batch tasks and the workers all receive the same object.
It holds plain values, so it is pickled to worker processes unchanged.
Which line to analyse (the file, ``inline=``, ``crossline=``) is not an
option: it goes beside the options.
"""

from __future__ import annotations

import os
from dataclasses import dataclass, field, fields

from ..errors import PluginError
from ..metrics.dispatch import BUILTIN_METRICS

__all__ = ["AnalysisOptions", "OPTION_NAMES"]

#: the picker that reads an interpreter's horizon (:mod:`clinometry.user_horizons`)
HORIZONS_PICKER = "horizons"


@dataclass(frozen=True)
class AnalysisOptions:
    """Every choice of one analysis run (frozen; the defaults are the package defaults).

    Attributes
    ----------
    velocity : float (m/s), VelocityModel or mapping, optional
        Constant velocity, any model of :mod:`clinometry.depth`, or a model
        record (``to_dict()``).
    velocity_linear : (float, float), optional
        ``(v0_m_s, k_per_s)`` of a linear velocity v(z) = v0 + k z.
    velocity_file : str or os.PathLike, optional
        Velocity table or velocity SEG-Y (see
        :func:`clinometry.depth.velocity_from_options`).  At most one of the
        three velocity options; with none, a TWT line is converted with the
        package default constant velocity and the result records it.
    velocity_kind : {"interval", "rms"}
        How the velocities of ``velocity_file`` are meant (RMS are converted
        with Dix 1955).
    domain : {"twt", "depth"}, optional
        Domain of the file's z axis (default "twt" for files; a section's
        own ``domain`` attr otherwise).
    picker : str, optional
        Picker plugin (entry-point group ``clinometry.pickers``).  None (the
        default) picks with ``"default"``, or with ``"horizons"`` when
        ``horizons`` is given; :attr:`picker_name` says which.
    picker_options : dict, optional
        Keyword options of the picker (checked against its signature).
    horizons : str, os.PathLike or Horizon, optional
        The interpreter's own margin horizon, read by the ``horizons``
        picker (a CSV file, see :func:`clinometry.user_horizons.read_horizon_csv`).
    metrics : sequence of str, optional
        Metric plugins to run, in order; default the built-in set
        (:data:`clinometry.metrics.BUILTIN_METRICS`).  Other installed
        metrics run only when named here.
    metric_options : dict of str -> dict, optional
        Keyword options per metric plugin.
    classifier : str
        Classifier plugin (entry-point group ``clinometry.classifiers``).
    thresholds : str, os.PathLike, mapping or ResolvedThresholds, optional
        TOML file or mapping overriding the classification thresholds, or a
        table resolved once for a batch
        (:func:`clinometry.classify.resolve_thresholds`).
    uncertainty : bool or dict
        Run the Monte-Carlo P10/P50/P90 (a dict overrides the settings of
        :data:`clinometry.metrics.UNCERTAINTY_DEFAULTS`).
    seed : int
        Seed of every random draw.

    Raises
    ------
    PluginError
        ``horizons`` with a picker other than ``"horizons"``, or the
        ``horizons`` picker without ``horizons``.

    Examples
    --------
    >>> o = AnalysisOptions(velocity=2800.0, horizons="my_pick.csv")
    >>> o.picker_name, o.metrics, o.seed
    ('horizons', ('shape', 'slope', 'trajectory'), 0)
    """

    velocity: object = None
    velocity_linear: tuple | None = None
    velocity_file: str | os.PathLike | None = None
    velocity_kind: str = "interval"
    domain: str | None = None
    picker: str | None = None
    picker_options: dict = field(default_factory=dict)
    horizons: object = None
    metrics: tuple | None = None
    metric_options: dict = field(default_factory=dict)
    classifier: str = "rules"
    thresholds: object = None
    uncertainty: object = True
    seed: int = 0

    def __post_init__(self):
        if self.horizons is not None and self.picker not in (None, HORIZONS_PICKER):
            raise PluginError(
                f"horizons= (--horizons) is read by the {HORIZONS_PICKER!r} picker, but picker {self.picker!r} was "
                f"chosen; drop the picker or choose {HORIZONS_PICKER!r}"
            )
        if self.horizons is None and self.picker == HORIZONS_PICKER:
            raise PluginError(f"the {HORIZONS_PICKER!r} picker reads the interpreter's horizon: give horizons= "
                              "(--horizons FILE.csv)")
        set_ = object.__setattr__
        metrics = BUILTIN_METRICS if self.metrics is None else self.metrics
        set_(self, "metrics", (metrics,) if isinstance(metrics, str) else tuple(metrics))
        set_(self, "picker_options", dict(self.picker_options or {}))
        set_(self, "metric_options", {k: dict(v) for k, v in dict(self.metric_options or {}).items()})
        if self.velocity_linear is not None and not isinstance(self.velocity_linear, (str, bytes)):
            try:
                set_(self, "velocity_linear", tuple(self.velocity_linear))
            except TypeError:
                pass  # refused with a clear message by clinometry.depth.velocity_from_options
        set_(self, "velocity_kind", self.velocity_kind or "interval")
        set_(self, "seed", int(self.seed))

    @property
    def picker_name(self) -> str:
        """The picker that runs: ``picker``, else ``"horizons"`` with ``horizons``, else ``"default"``."""
        if self.picker is not None:
            return self.picker
        return HORIZONS_PICKER if self.horizons is not None else "default"

    def picker_keywords(self) -> dict:
        """The keyword options the picker is called with (besides ``velocity``)."""
        out = dict(self.picker_options)
        if self.horizons is not None:
            out["horizons"] = self.horizons
        return out

    def velocity_model(self, section=None):
        """The velocity model these options choose for ``section`` (None for a depth section).

        See :func:`clinometry.depth.velocity_from_options`; a TWT section with
        no velocity option gets the package default, with a ``fallback`` note.

        Raises
        ------
        VelocityError
            Options that contradict each other or the section, or bad values.
        """
        from ..depth import velocity_from_options

        return velocity_from_options(
            velocity=self.velocity,
            velocity_linear=self.velocity_linear,
            velocity_file=self.velocity_file,
            domain=self.domain,
            section=section,
            velocity_kind=self.velocity_kind,
        )


#: the names of the options, in order
OPTION_NAMES = tuple(f.name for f in fields(AnalysisOptions))
