"""The analysis options of every command that measures: velocity, domain, plugins, thresholds, seed.

``add_analysis_options(parser)`` adds them to a subcommand (``--horizons``
only where one line is analysed); :func:`analysis_options` turns the parsed
arguments into the one :class:`~clinometry.pipeline.AnalysisOptions` that
the pipeline and the batch receive, so the command line and the Python API
decide the same way.  Values are checked there, once, and errors come back
as one-line :class:`~clinometry.errors.ClinometryError` messages (exit
code 2).
"""

from __future__ import annotations

import argparse

from .._plugins import plugin_names
from ..depth import DEFAULT_VELOCITY_M_S, VELOCITY_KINDS

__all__ = ["add_velocity_options", "add_analysis_options", "analysis_options", "velocity_from_args"]


def add_velocity_options(parser: argparse.ArgumentParser) -> argparse.ArgumentParser:
    """Add the velocity and domain options to ``parser``; return it.

    Parameters
    ----------
    parser : argparse.ArgumentParser

    Returns
    -------
    argparse.ArgumentParser
        The same parser, for chaining.
    """
    group = parser.add_argument_group(
        "velocity (time-depth conversion)",
        f"Without any of these, a TWT section is converted with a constant {DEFAULT_VELOCITY_M_S:g} m/s "
        "and the result records that this default was used.",
    )
    excl = group.add_mutually_exclusive_group()
    excl.add_argument(
        "--velocity",
        type=float,
        metavar="V",
        help="constant velocity, m/s (e.g. 2800)",
    )
    excl.add_argument(
        "--velocity-linear",
        type=float,
        nargs=2,
        metavar=("V0", "K"),
        help="linear velocity v(z) = V0 + K*z: V0 in m/s at time zero, K in 1/s (e.g. 1800 0.6)",
    )
    excl.add_argument(
        "--velocity-file",
        metavar="F",
        help="velocity SEG-Y (section or 3D volume in two-way time, m/s, matched to the seismic by "
        "CDP or inline/crossline) or a two-column text/CSV table of two-way time (ms) and velocity (m/s)",
    )
    group.add_argument(
        "--velocity-kind",
        choices=VELOCITY_KINDS,
        default="interval",
        help="velocities in --velocity-file are interval or RMS (m/s); RMS is converted by Dix (1955) "
        "(default: interval)",
    )
    group.add_argument(
        "--domain",
        choices=("twt", "depth"),
        default=None,
        help="z axis of the input: two-way time in ms (twt) or depth in m (depth); a depth section needs "
        "no velocity (default: twt unless the file says otherwise)",
    )
    return parser


def add_analysis_options(parser: argparse.ArgumentParser, *, horizons: bool = False) -> argparse.ArgumentParser:
    """Add the velocity, plugin, threshold, uncertainty and seed options to ``parser``; return it.

    Parameters
    ----------
    parser : argparse.ArgumentParser
    horizons : bool
        Also add ``--horizons`` (one line only).

    Returns
    -------
    argparse.ArgumentParser
    """
    add_velocity_options(parser)
    if horizons:
        parser.add_argument(
            "--horizons", metavar="PICKS.csv",
            help="your own margin horizon: CSV with columns 'trace' (0-based) or 'x','y' (m), and 'z' "
            "(ms TWT or m depth, as the section); read by the 'horizons' picker instead of the automatic one",
        )
    parser.add_argument("--picker", default=None, choices=plugin_names("picker"),
                        help="picker plugin (default: default, or horizons with --horizons)")
    parser.add_argument("--metric", action="append", default=[], metavar="NAME", choices=plugin_names("metric"),
                        help="also run this installed metric plugin (repeatable); the built-in metrics always run")
    parser.add_argument("--classifier", default="rules", choices=plugin_names("classifier"),
                        help="classifier plugin (default: %(default)s)")
    parser.add_argument("--thresholds", metavar="FILE.toml",
                        help="TOML file overriding the classification thresholds")
    parser.add_argument("--no-uncertainty", action="store_true",
                        help="skip the Monte-Carlo P10/P50/P90 of slope and relief")
    parser.add_argument("--seed", type=int, default=0, help="seed of the random draws (default: %(default)s)")
    return parser


def analysis_options(args: argparse.Namespace):
    """The :class:`~clinometry.pipeline.AnalysisOptions` of parsed arguments.

    Options a subcommand does not have take their defaults.

    Raises
    ------
    PluginError
        ``--horizons`` with another picker, or ``--picker horizons`` without
        ``--horizons``.
    """
    from ..metrics import BUILTIN_METRICS
    from ..pipeline import AnalysisOptions

    extra = [m for m in getattr(args, "metric", None) or [] if m not in BUILTIN_METRICS]
    return AnalysisOptions(
        velocity=getattr(args, "velocity", None),
        velocity_linear=getattr(args, "velocity_linear", None),
        velocity_file=getattr(args, "velocity_file", None),
        velocity_kind=getattr(args, "velocity_kind", None) or "interval",
        domain=getattr(args, "domain", None),
        picker=getattr(args, "picker", None),
        horizons=getattr(args, "horizons", None),
        metrics=BUILTIN_METRICS + tuple(dict.fromkeys(extra)) if extra else None,
        classifier=getattr(args, "classifier", None) or "rules",
        thresholds=getattr(args, "thresholds", None),
        uncertainty=not getattr(args, "no_uncertainty", False),
        seed=getattr(args, "seed", 0),
    )


def velocity_from_args(args: argparse.Namespace, section=None):
    """Velocity model from parsed options (see :func:`add_velocity_options`).

    Parameters
    ----------
    args : argparse.Namespace
        Parsed arguments with ``velocity``, ``velocity_linear``,
        ``velocity_file``, ``velocity_kind`` and ``domain``.
    section : xarray.DataArray, dims ("trace", "z"), optional
        The section being measured (needed for a velocity SEG-Y, and to take
        the domain from when ``--domain`` is not given).

    Returns
    -------
    VelocityModel or None
        None for a depth section.

    Raises
    ------
    VelocityError
        Options that contradict each other or the section, or bad values.
    """
    return analysis_options(args).velocity_model(section)
