"""clinometry command line: read SEG-Y lines across carbonate platform margins,
pick platform top, shelf break and toe, measure slope, relief and trajectory,
and classify each margin.

Each subcommand lives in its own module of this package, which defines
``DESCRIPTION``, ``EXAMPLE``, ``configure(parser)`` and ``run(args) -> int``.

Exit codes: 0 when everything worked; 1 when some work failed (the message
says how many lines); 2 for bad input, bad usage, or when nothing could run.
Errors go to stderr as one line, ``clinometry: error: <message>``, worded for
the command line (:func:`cli_message`: its own option names, "file not
found: PATH"); ``--debug`` adds the traceback above that line and never
changes the exit code.  Output cut short by a closed pipe (``clinometry
inspect F | head -1``) ends quietly with the status a shell reports for a
standard tool killed by SIGPIPE (128 + 13 = 141).
"""

from __future__ import annotations

import argparse
import importlib
import logging
import os
import re
import sys
import traceback

from .._version import __version__
from ..errors import ClinometryError

__all__ = ["main", "SUBCOMMANDS", "cli_message"]

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


#: keywords of the Python API that messages may name -> the command line's own option
CLI_OPTIONS = {
    "inline": "--inline",
    "crossline": "--crossline",
    "horizons": "--horizons",
    "velocity": "--velocity",
    "velocity_linear": "--velocity-linear",
    "velocity_file": "--velocity-file",
    "velocity_kind": "--velocity-kind",
    "domain": "--domain",
    "thresholds": "--thresholds",
    "picker": "--picker",
    "classifier": "--classifier",
    "seed": "--seed",
}
#: Python keywords the command line has no option for (they are options of clinometry.read_section)
_PYTHON_ONLY = ("header_bytes", "trace_spacing_m", "sample_interval", "sample_interval_ms", "coordinates",
                "max_offset_m")
_KEYWORD = re.compile(r"(?<![\w-])([a-z][a-z_]*)=(?=[\s,;/)`]|$)")
_KEYWORD_GIVEN = re.compile(r"(?<![\w-])([a-z][a-z_]*)=\s*\((--[^)]*)\)")
_KEYWORD_VALUE = re.compile(r"(?<![\w-])([a-z][a-z_]*)=([0-9][\w.-]*)")
#: exit status of a process ended by SIGPIPE, as a shell reports it (128 + signal 13; POSIX)
BROKEN_PIPE_STATUS = 128 + 13


def _names_out(name, out, inputs=()) -> bool:
    """Whether an OS error's path is ``--out`` itself or a folder above it, and not one of the inputs."""
    try:
        path, target = os.path.abspath(os.fspath(name)), os.path.abspath(os.fspath(out))
        if any(os.path.abspath(os.fspath(i)) == path for i in inputs if i):
            return False
    except (TypeError, ValueError):
        return False
    return path == target or target.startswith(path.rstrip(os.sep) + os.sep)


def _out_message(err, name, out) -> str:
    """An OS error on the ``--out`` path, said as a problem with that option."""
    if isinstance(err, FileExistsError) and os.path.abspath(name) == os.path.abspath(out):
        return f"--out {out}: is a file, not a folder; give --out a folder (it is made when missing)"
    parent = os.path.dirname(os.path.abspath(name))
    if isinstance(err, FileNotFoundError) and os.path.abspath(name) == os.path.abspath(out) \
            and not os.path.isdir(parent):
        return f"--out {out}: the folder it goes in ({parent}) does not exist; make it first or give another --out"
    if isinstance(err, NotADirectoryError):
        return f"--out {out}: a part of that path is a file, not a folder; give --out a folder"
    why = (err.strerror or type(err).__name__).lower()
    return f"--out {out}: cannot be written ({why}: {name}); give --out a place you can write to"


def cli_message(err, *, out=None, inputs=()) -> str:
    """An exception's message as the command line says it (one line).

    Python-API keywords become the command line's option names
    (``inline=`` -> ``--inline``); keywords with no option are named once
    with where to find them; a missing file is "file not found: PATH".  An
    OS error on the ``out`` path (the ``--out`` option) or a folder above it
    is said as a problem with ``--out``, unless that path is one of the
    ``inputs``.

    Examples
    --------
    >>> cli_message(FileNotFoundError(2, "No such file or directory", "line_07.sgy"))
    'file not found: line_07.sgy'
    >>> cli_message(FileExistsError(17, "File exists", "results"), out="results")
    '--out results: is a file, not a folder; give --out a folder (it is made when missing)'
    >>> cli_message(PermissionError(13, "Permission denied", "/srv"), out="/srv/results")
    '--out /srv/results: cannot be written (permission denied: /srv); give --out a place you can write to'
    >>> cli_message(ValueError("a.sgy: 2D file; read it without inline=, or point header_bytes= at the fields"))
    'a.sgy: 2D file; read it without --inline, or point header_bytes at the fields (header_bytes: no \
command-line option; pass it to clinometry.read_section in Python)'
    """
    if isinstance(err, OSError) and not isinstance(err, ClinometryError) and getattr(err, "filename", None):
        name = os.fspath(err.filename)
        if out is not None and _names_out(name, out, inputs):
            return _out_message(err, name, out)
        if isinstance(err, FileNotFoundError):
            return f"file not found: {name}"
        if isinstance(err, IsADirectoryError):
            return f"is a folder, not a file: {name}"
        if isinstance(err, PermissionError):
            return f"permission denied: {name}"
        if isinstance(err, NotADirectoryError):
            return f"not a folder: {name}"
        if err.strerror:
            return f"{err.strerror[:1].lower()}{err.strerror[1:]}: {name}"
    msg = " ".join((str(err) or type(err).__name__).split())
    python_only = []

    def word(m):
        key = m.group(1)
        if key in CLI_OPTIONS:
            return CLI_OPTIONS[key]
        if key in _PYTHON_ONLY:
            if key not in python_only:
                python_only.append(key)
            return key
        return m.group(0)

    msg = _KEYWORD_GIVEN.sub(r"\2", msg)  # "horizons= (--horizons FILE.csv)" says it twice
    msg = _KEYWORD_VALUE.sub(lambda m: f"{CLI_OPTIONS[m.group(1)]} {m.group(2)}" if m.group(1) in CLI_OPTIONS
                             else m.group(0), msg)
    msg = _KEYWORD.sub(word, msg)
    msg = msg.replace("use iter_sections", "use clinometry batch (every line of a volume)")
    if python_only:
        names = ", ".join(python_only)
        them = "it" if len(python_only) == 1 else "them"
        msg += f" ({names}: no command-line option; pass {them} to clinometry.read_section in Python)"
    return msg


def _quiet_broken_pipe() -> int:
    """Stop writing to a closed pipe without a message, as standard tools do."""
    try:  # later writes (and the flush at exit) go nowhere instead of raising again (Python docs, signal module)
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
    except (OSError, ValueError, AttributeError):
        pass  # stdout is not a real file (a test's capture)
    return BROKEN_PIPE_STATUS


def _error(err, debug, text) -> int:
    if debug:  # the traceback, then the same one-line error and the same exit code as without --debug
        traceback.print_exception(type(err), err, err.__traceback__, file=sys.stderr)
    print(f"clinometry: error: {text}", file=sys.stderr)
    return 2


def main(argv=None) -> int:
    """Run the command line; return the exit code (0 ok, 1 partial failure, 2 error; 141 closed pipe)."""
    parser = build_parser()
    args = parser.parse_args(argv)
    _setup_logging(getattr(args, "verbose", 0))
    debug = getattr(args, "debug", False)
    try:
        code = int(args._run(args) or 0)
        sys.stdout.flush()  # a closed pipe shows here, inside the handlers below
        return code
    except BrokenPipeError:
        return _quiet_broken_pipe()
    except (ClinometryError, OSError) as err:
        inputs = [getattr(args, "file", None), *(getattr(args, "paths", None) or [])]
        return _error(err, debug, cli_message(err, out=getattr(args, "out", None), inputs=inputs))
    except KeyboardInterrupt:
        print("clinometry: error: interrupted", file=sys.stderr)
        return 2
    except Exception as err:  # a bug: still one line on stderr, traceback with --debug
        msg = " ".join(str(err).split())
        return _error(err, debug, f"internal error ({type(err).__name__}: {msg}); rerun with --debug and report it")
