"""clinometry command line: read SEG-Y lines across carbonate platform margins,
pick platform top, shelf break and toe, measure slope, relief and trajectory,
and classify each margin.

Each subcommand lives in its own module of this package, which defines
``DESCRIPTION``, ``EXAMPLE``, ``configure(parser)`` and ``run(args) -> int``.

Exit codes: 0 when everything worked; 1 when some work failed (the message
says how many lines); 2 for bad input, bad usage, or when nothing could run.
Errors go to stderr as one line, ``clinometry: error: <message>``; a traceback
only with ``--debug``.
"""

from __future__ import annotations

import argparse
import importlib
import logging
import sys

from .._version import __version__
from ..errors import ClinometryError

__all__ = ["main", "SUBCOMMANDS"]

#: subcommand name -> module (relative to this package)
SUBCOMMANDS = {
    "inspect": ".inspect",
    "analyze": ".analyze",
    "batch": ".batch",
    "synth": ".synth",
    "demo": ".demo",
    "plugins": ".plugins",
}


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="clinometry",
        description=__doc__.split("\n\n")[0],
        formatter_class=argparse.RawDescriptionHelpFormatter,
        epilog="example:\n  clinometry analyze line_07.sgy --velocity 2800 --out results/",
    )
    parser.add_argument("--version", action="version", version=f"clinometry {__version__}")
    parser.add_argument("-v", "--verbose", action="count", default=0, help="more log output on stderr (-v INFO, -vv DEBUG)")
    parser.add_argument("--debug", action="store_true", help="show a traceback on errors")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    sub.required = True
    for name, modname in SUBCOMMANDS.items():
        mod = importlib.import_module(modname, __name__)
        doc = (mod.__doc__ or "").strip()
        p = sub.add_parser(
            name,
            help=getattr(mod, "DESCRIPTION", doc.splitlines()[0] if doc else name),
            description=doc,
            epilog="example:\n  " + getattr(mod, "EXAMPLE", f"clinometry {name} --help"),
            formatter_class=argparse.RawDescriptionHelpFormatter,
        )
        # options that belong to every subcommand may also come after it
        p.add_argument("-v", "--verbose", action="count", default=argparse.SUPPRESS, help=argparse.SUPPRESS)
        p.add_argument("--debug", action="store_true", default=argparse.SUPPRESS, help=argparse.SUPPRESS)
        mod.configure(p)
        p.set_defaults(_run=mod.run)
    return parser


def _setup_logging(verbosity: int) -> None:
    level = logging.WARNING if verbosity <= 0 else logging.INFO if verbosity == 1 else logging.DEBUG
    root = logging.getLogger("clinometry")
    root.setLevel(level)
    if not any(getattr(h, "_clinometry_cli", False) for h in root.handlers):
        handler = logging.StreamHandler(sys.stderr)
        handler.setFormatter(logging.Formatter("clinometry: %(levelname)s: %(message)s"))
        handler._clinometry_cli = True
        root.addHandler(handler)
    for h in root.handlers:
        if getattr(h, "_clinometry_cli", False):
            # plain assignment, not setStream(): that flushes the previous
            # stream, which may be closed by now (pytest's capsys, a closed pipe)
            h.stream = sys.stderr


def main(argv=None) -> int:
    """Run the command line; return the exit code (0 ok, 1 partial failure, 2 error)."""
    parser = build_parser()
    args = parser.parse_args(argv)
    _setup_logging(getattr(args, "verbose", 0))
    debug = getattr(args, "debug", False)
    try:
        return int(args._run(args) or 0)
    except (ClinometryError, OSError) as err:
        if debug:
            raise
        msg = str(err) or type(err).__name__
        print(f"clinometry: error: {' '.join(msg.split())}", file=sys.stderr)
        return 2
    except KeyboardInterrupt:
        print("clinometry: error: interrupted", file=sys.stderr)
        return 2
    except Exception as err:  # a bug: still one line on stderr, traceback with --debug
        if debug:
            raise
        msg = " ".join(str(err).split())
        print(
            f"clinometry: error: internal error ({type(err).__name__}: {msg}); "
            "rerun with --debug and report it",
            file=sys.stderr,
        )
        return 2
