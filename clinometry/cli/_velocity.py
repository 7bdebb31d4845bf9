"""Velocity and domain options shared by every command that measures.

``add_velocity_options(parser)`` adds ``--velocity``, ``--velocity-linear``,
``--velocity-file`` (mutually exclusive), ``--velocity-kind`` and
``--domain``; ``velocity_from_args(args, section)`` turns them into a model
through :func:`clinometry.depth.velocity_from_options`, so the command line
and the Python API decide the same way.  Values are checked there, once, and
errors come back as one-line :class:`~clinometry.errors.VelocityError`
messages (exit code 2).
"""

from __future__ import annotations

import argparse

from ..depth import DEFAULT_VELOCITY_M_S, VELOCITY_KINDS, velocity_from_options

__all__ = ["add_velocity_options", "velocity_from_args"]


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
    return velocity_from_options(
        velocity=getattr(args, "velocity", None),
        velocity_linear=getattr(args, "velocity_linear", None),
        velocity_file=getattr(args, "velocity_file", None),
        domain=getattr(args, "domain", None),
        section=section,
        velocity_kind=getattr(args, "velocity_kind", "interval") or "interval",
    )
