"""Tasks of a batch run: which lines to analyse, the task function, resume.

A batch is a list of :class:`Task` records, one per 2D file or per inline
(or crossline) of a 3D volume, keyed by ``(file, direction, line)``.  Paths
may be files, folders (every SEG-Y file inside by its name,
:data:`clinometry.io.sniff.SEGY_SUFFIXES`, sorted) or glob
patterns; the expansion is sorted so the same command gives the same tasks
in the same order, and so the same output names.

:func:`run_task` is the one function that runs a task, in this process, in
a worker of a local process pool or on a Dask worker: it reads the line,
runs :func:`clinometry.pipeline.run_analysis` with the run's
:class:`~clinometry.pipeline.AnalysisOptions` (the same seed for the same
task wherever it runs), writes the line's files atomically and returns a small
plain record.  It never raises for a bad line: the error type and message go
into the record and from there into ``errors.csv``, and the batch goes on.

:func:`is_complete` decides for ``--resume`` whether a line's outputs are
complete and valid: the JSON parses and follows the results contract, and the
horizons CSV and (when plots are on) the QC PNG exist.
"""

from __future__ import annotations

import errno
import glob
import hashlib
import json
import logging
import os
from dataclasses import dataclass, field, replace
from pathlib import Path

from ..errors import ClinometryError, GeometryError
from ..io.sniff import SEGY_SUFFIXES, has_segy_suffix
from ..pipeline import AnalysisOptions
from ..report.atomic import safe_name, same_file

__all__ = [
    "Task",
    "TaskOptions",
    "parse_line_spec",
    "expand_paths",
    "plan_tasks",
    "run_task",
    "is_complete",
    "output_names",
    "unique_stems",
    "not_a_file_reason",
]

logger = logging.getLogger(__name__)

_SHORT = {"inline": "il", "crossline": "xl"}

#: stems of the files a batch writes for the whole run (margins.csv, summary.png, index.html, ...): a line
#: whose stem is one of them gets ``_line`` added, so its files never clash with the batch's
BATCH_STEMS = frozenset({"margins", "margins_reviewed", "margins_projected", "errors", "summary", "map", "index",
                         "review", ".clinometry"})


@dataclass(frozen=True)
class Task:
    """One line to analyse.

    Attributes
    ----------
    path : str
        The SEG-Y file (absolute).
    direction : {"inline", "crossline"} or None
        None for a 2D line.
    line : int or None
        Inline or crossline number of a 3D volume.
    stem : str
        Output file stem, safe (see :func:`clinometry.report.atomic.safe_name`).
    """

    path: str
    direction: str | None = None
    line: int | None = None
    stem: str = ""

    @property
    def key(self) -> tuple:
        """``(path, direction, line)``: what identifies the task."""
        return (self.path, self.direction, self.line)

    @property
    def label(self) -> str:
        """``"inline 112"`` for a 3D line, ``""`` for a 2D file."""
        return f"{self.direction} {self.line}" if self.direction else ""


@dataclass(frozen=True)
class TaskOptions:
    """What every task of a run shares (plain values: they are pickled to workers).

    Attributes
    ----------
    out_dir : str
    analysis : AnalysisOptions
        How every line is analysed.
    plot : bool
        Write a QC figure per line.
    file_velocity : dict
        Absolute file path -> ``{"velocity": v_m_s}`` or
        ``{"velocity_linear": (v0_m_s, k_per_s)}`` for files whose velocity
        differs from the run's (used instead of the run's velocity options).
    """

    out_dir: str
    analysis: AnalysisOptions = field(default_factory=AnalysisOptions)
    plot: bool = True
    file_velocity: dict = field(default_factory=dict)
    protect: tuple = ()

    def analysis_for(self, path) -> AnalysisOptions:
        """The analysis options of one file: the run's, with that file's own velocity if it has one."""
        own = self.file_velocity.get(path)
        if not own:
            return self.analysis
        return replace(self.analysis, **{"velocity": None, "velocity_linear": None, "velocity_file": None, **own})


def parse_line_spec(spec):
    """Parse ``--inlines`` / ``--crosslines``: ``all``, ``N``, ``A:B`` or ``A:B:STEP``.

    Parameters
    ----------
    spec : str or None

    Returns
    -------
    None, "all" or range
        ``A:B:STEP`` includes both ends when they fall on the step.

    Raises
    ------
    GeometryError
        For anything else, naming the text seen.

    Examples
    --------
    >>> list(parse_line_spec("100:110:5"))
    [100, 105, 110]
    >>> parse_line_spec("all")
    'all'
    """
    if spec is None:
        return None
    text = str(spec).strip().lower()
    if text == "all":
        return "all"
    parts = text.split(":")
    try:
        nums = [int(p) for p in parts]
    except ValueError:
        raise GeometryError(f"line selection {spec!r}: expected 'all', N, A:B or A:B:STEP with integers") from None
    if len(nums) == 1:
        return range(nums[0], nums[0] + 1)
    if len(nums) in (2, 3):
        a, b = nums[0], nums[1]
        step = nums[2] if len(nums) == 3 else 1
        if step <= 0 or b < a:
            raise GeometryError(f"line selection {spec!r}: need A <= B and STEP > 0")
        return range(a, b + 1, step)
    raise GeometryError(f"line selection {spec!r}: expected 'all', N, A:B or A:B:STEP")


def expand_paths(paths):
    """Expand files, folders and globs into a sorted list of files.

    Parameters
    ----------
    paths : sequence of str or os.PathLike

    Returns
    -------
    files : list of str
        Absolute paths, sorted, without duplicates.
    problems : list of dict
        One errors-table row per argument that named nothing, and per
        SEG-Y-named entry that is no file: a dangling symbolic link, a loop
        of links, a folder (see :func:`not_a_file_reason`)
        (``file, line, error_type, message``).
    """
    files, problems = [], []

    def take(candidates):
        for f in candidates:
            why = not_a_file_reason(f)
            if why:
                problems.append(_problem(f, "", why[0], f"{f}: {why[1]}"))
            else:
                files.append(f)

    for p in paths:
        p = os.fspath(p)
        if os.path.isdir(p):
            found = sorted(os.path.join(p, n) for n in os.listdir(p) if has_segy_suffix(n))
            if not found:
                problems.append(_problem(p, "", "FileNotFoundError",
                                         f"{p}: folder holds no {' or '.join(SEGY_SUFFIXES)} file"))
            take(found)
        elif os.path.lexists(p):
            take([p])
        elif glob.has_magic(p):
            found = sorted(glob.glob(p))
            if not found:
                problems.append(_problem(p, "", "FileNotFoundError", f"{p}: pattern matches no file"))
            take(found)
        else:
            problems.append(_problem(p, "", "FileNotFoundError", f"{p}: no such file or folder"))
    seen, out = set(), []
    for f in files:
        a = os.path.abspath(f)
        if a not in seen:
            seen.add(a)
            out.append(a)
    return sorted(out), problems


def not_a_file_reason(path):
    """Why ``path`` cannot be read as a SEG-Y file, as ``(error type, reason)``; None when it is a file.

    Parameters
    ----------
    path : str

    Returns
    -------
    tuple of str or None
        A dangling symbolic link, a loop of symbolic links, a folder (named
        like a SEG-Y file) or anything else that is not a regular file.

    Examples
    --------
    >>> import tempfile, os
    >>> d = tempfile.mkdtemp(); os.symlink(os.path.join(d, "gone.sgy"), os.path.join(d, "a.sgy"))
    >>> not_a_file_reason(os.path.join(d, "a.sgy"))
    ('FileNotFoundError', 'symbolic link to a missing file; restore the file or remove the link')
    """
    try:
        os.stat(path)
    except FileNotFoundError:
        if os.path.islink(path):
            return ("FileNotFoundError", "symbolic link to a missing file; restore the file or remove the link")
        return ("FileNotFoundError", "no such file")
    except OSError as err:
        if err.errno == errno.ELOOP:
            return ("OSError", "symbolic links form a loop; point the link at a real file")
        return (type(err).__name__, f"cannot be read ({err.strerror or err}); check its permissions")
    if os.path.isdir(path):
        return ("IsADirectoryError", "is a folder, not a SEG-Y file; give the files inside it, or rename the folder")
    if not os.path.isfile(path):
        return ("OSError", "is not a regular file (a device, pipe or socket); copy the data to a file")
    return None


def _problem(file, line, error_type, message):
    return {"file": str(file), "line": str(line), "error_type": error_type, "message": " ".join(str(message).split())}


def _volume_lines(path, direction):
    """Line numbers of a 3D volume in ``direction``, or None for a 2D file."""
    from .. import io as cio

    if not cio.is_3d(path):
        return None
    return [int(n) for n in cio.line_numbers(path, direction=direction)]


def plan_tasks(paths, *, inlines=None, crosslines=None):
    """The tasks of a batch, in a fixed order, and the inputs that cannot run.

    Parameters
    ----------
    paths : sequence of str or os.PathLike
        Files, folders and glob patterns.
    inlines, crosslines : str, optional
        Selections for 3D volumes (see :func:`parse_line_spec`).  Default:
        every inline.

    Returns
    -------
    tasks : list of Task
    problems : list of dict
        Errors-table rows for arguments that named nothing and files whose
        geometry could not be read (these files are not tasks).

    Notes
    -----
    Output stems come from :func:`unique_stems`: the sanitised file stem,
    plus ``_ilN`` / ``_xlN`` for lines of a volume; files whose names clash
    are named by their relative path instead.
    """
    files, problems = expand_paths(paths)
    il = parse_line_spec(inlines)
    xl = parse_line_spec(crosslines)
    if il is None and xl is None:
        il = "all"
    planned = []
    for f in files:
        try:
            selections = []
            for direction, sel in (("inline", il), ("crossline", xl)):
                if sel is None:
                    continue
                nums = _volume_lines(f, direction)
                if nums is None:  # 2D line
                    selections = [(None, None)]
                    break
                chosen = nums if sel == "all" else [n for n in nums if n in sel]
                if not chosen:
                    problems.append(_problem(f, "", "GeometryError",
                                             f"{os.path.basename(f)}: none of the selected {direction}s "
                                             f"{_spec_text(sel)} is in the volume ({nums[0]}..{nums[-1]})"))
                selections.extend((direction, n) for n in chosen)
        except (ClinometryError, OSError, RuntimeError, ValueError) as err:
            problems.append(_problem(f, "", type(err).__name__, _message(err, f)))
            continue
        planned.extend((f, direction, n) for direction, n in selections)
    stems = unique_stems(planned)
    tasks = [Task(path=f, direction=d, line=n, stem=s) for (f, d, n), s in zip(planned, stems)]
    return tasks, problems


def _line_stem(base, direction, line):
    return base if direction is None else f"{base}_{_SHORT[direction]}{line}"


def _path_hash(path, direction, line) -> str:
    """8 hex digits of SHA-1 over the absolute path and line: the same task always gets the same ones."""
    text = f"{os.path.abspath(path)}\0{direction or ''}\0{'' if line is None else line}"
    return hashlib.sha1(text.encode("utf-8", "surrogateescape")).hexdigest()[:8]


def unique_stems(planned) -> list:
    """Output stems for ``(path, direction, line)`` triples: unique, and the same for the same inputs.

    Parameters
    ----------
    planned : sequence of (str, str or None, int or None)
        Absolute file path, direction and line number of each task.

    Returns
    -------
    list of str
        One stem per entry, each made by
        :func:`~clinometry.report.atomic.safe_name` and unique without
        regard to case (a case-insensitive file system would merge ``A``
        and ``a``).

    Notes
    -----
    A file's stem is its sanitised file name without the ending, plus
    ``_ilN`` / ``_xlN`` for a line of a volume (as ``clinometry analyze``
    names it).  Files whose stems clash (the same name in two folders, or
    names that sanitise alike) are named by their path relative to the
    folder they share instead (``a/x.sgy`` -> ``a_x``); a stem that still
    clashes gets ``_`` and 8 hex digits of a SHA-1 hash of its absolute
    path and line.  A stem equal to one of the batch's own files
    (:data:`BATCH_STEMS`, ``summary``, ``map``, ``index``, ...) gets
    ``_line`` added.  The stems depend only on the set of inputs, never on
    the order or on an earlier run, so ``--resume`` finds the same files.

    Examples
    --------
    >>> unique_stems([("/d/a/x.sgy", None, None), ("/d/b/x.sgy", None, None), ("/d/b/x_2.sgy", None, None)])
    ['a_x', 'b_x', 'x_2']
    """
    planned = [(os.path.abspath(f), d, n) for f, d, n in planned]
    bases = {f: safe_name(Path(f).stem) for f, _, _ in planned}
    by_base = {}
    for f in dict.fromkeys(f for f, _, _ in planned):
        by_base.setdefault(bases[f].casefold(), []).append(f)
    for group in by_base.values():
        if len(group) > 1:
            root = os.path.commonpath([os.path.dirname(f) for f in group])
            for f in group:
                rel = os.path.splitext(os.path.relpath(f, root))[0]
                bases[f] = safe_name(rel.replace(os.sep, "_"))
    stems = [_line_stem(bases[f], d, n) for f, d, n in planned]
    stems = [f"{s}_line" if s.casefold() in BATCH_STEMS else s for s in stems]
    counts = {}
    for s in stems:
        counts[s.casefold()] = counts.get(s.casefold(), 0) + 1
    out = []
    for s, (f, d, n) in zip(stems, planned):
        if counts[s.casefold()] > 1:
            s = f"{s[:110]}_{_path_hash(f, d, n)}"
        out.append(s)
    return out


def _spec_text(sel):
    return f"{sel.start}:{sel.stop - 1}:{sel.step}" if isinstance(sel, range) else str(sel)


def _message(err, path):
    msg = " ".join(str(err).split()) or type(err).__name__
    name = os.path.basename(str(path))
    return msg if name in msg else f"{name}: {msg}"


def output_names(stem, *, plot=True):
    """Names of a line's output files: ``{"json", "csv", "png"}`` (png None without plots)."""
    return {"json": f"{stem}.json", "csv": f"{stem}.horizons.csv", "png": f"{stem}.png" if plot else None}


def _settings_differ(d, task, options):
    """Why a stored result was made with other settings than ``options`` ("" when it was not)."""
    run = d.get("run") or {}
    analysis = options.analysis_for(task.path)
    if run.get("seed") != analysis.seed:
        return f"seed {run.get('seed')} != {analysis.seed}"
    for key, want in (("picker", analysis.picker_name), ("classifier", analysis.classifier)):
        if run.get(key) != want:
            return f"{key} {run.get(key)!r} != {want!r}"
    if bool(run.get("uncertainty")) != bool(analysis.uncertainty):
        return "uncertainty on/off differs"
    vel = d.get("velocity") or {}
    want = {"velocity": analysis.velocity, "velocity_linear": analysis.velocity_linear}
    if want.get("velocity") is not None:
        if vel.get("model") != "constant" or vel.get("velocity_m_s") != float(want["velocity"]):
            return f"velocity {vel} is not constant {want['velocity']} m/s"
    elif want.get("velocity_linear") is not None:
        v0, k = (float(v) for v in want["velocity_linear"])
        if vel.get("model") != "linear" or (vel.get("v0_m_s"), vel.get("k_per_s")) != (v0, k):
            return f"velocity {vel} is not linear {v0} m/s + {k} 1/s z"
    return ""


def is_complete(task, out_dir, *, plot=True, options=None) -> bool:
    """True when the outputs of ``task`` exist and its JSON follows the contract.

    Parameters
    ----------
    task : Task
    out_dir : str or os.PathLike
    plot : bool
        Whether the QC PNG is required.
    options : TaskOptions, optional
        When given, the stored result must also have been made with the same
        seed, picker, classifier, uncertainty switch and (constant or linear)
        velocity; otherwise the line is redone, so one table never mixes
        settings.
    """
    from ..result import validate_result_dict

    names = output_names(task.stem, plot=plot)
    out = Path(out_dir)
    for n in names.values():
        if n is not None and not (out / n).is_file():
            return False
    try:
        d = json.loads((out / names["json"]).read_text(encoding="utf-8"))
        validate_result_dict(d)
    except (OSError, ValueError, ClinometryError) as err:
        logger.info("%s: result not valid, redone (%s)", names["json"], err)
        return False
    if options is not None:
        why = _settings_differ(d, task, options)
        if why:
            logger.info("%s: made with other settings (%s), redone", names["json"], why)
            return False
    return True


def _remove_outputs(task, out_dir, protect=()):
    """Remove a failed line's files, so no stale or partial result is taken for it (never an input file)."""
    keep = [task.path, *protect]
    for name in output_names(task.stem, plot=True).values():
        target = os.path.join(out_dir, name)
        if any(same_file(target, k) for k in keep):
            continue
        try:
            os.unlink(target)
        except FileNotFoundError:
            pass


def run_task(task, options) -> dict:
    """Analyse one line and write its files; never raises for a bad line.

    Parameters
    ----------
    task : Task
    options : TaskOptions

    Returns
    -------
    dict
        ``{"key", "stem", "file", "line", "status": "ok"|"failed",
        "n_margins", "error_type", "message"}``: plain values, cheap to send
        back from a worker.

    Notes
    -----
    Every exception of a line is caught and recorded (fault tolerance of a
    batch, common practice, no source); ``KeyboardInterrupt`` and
    ``SystemExit`` are not caught.  The files of a failed line (also older
    ones of the same name) are removed, so no table picks them up.
    """
    from ..pipeline import run_analysis
    from ..report.line_files import write_line_files

    rec = {"key": list(task.key), "stem": task.stem, "file": task.path, "line": task.label, "status": "failed",
           "n_margins": 0, "error_type": "", "message": ""}
    line = {task.direction: task.line} if task.direction in ("inline", "crossline") else {}
    try:
        analysis = run_analysis(task.path, options.analysis_for(task.path), **line)
        result = analysis.result
        write_line_files(result, options.out_dir, stem=task.stem, plot=options.plot, section=analysis.section,
                         protect=options.protect)
    except Exception as err:  # fault tolerance: one bad line must not stop the batch
        logger.info("%s %s: %s: %s", os.path.basename(task.path), task.label, type(err).__name__, err)
        _remove_outputs(task, options.out_dir, options.protect)
        rec["error_type"] = type(err).__name__
        rec["message"] = _message(err, task.path)
        return rec
    rec["status"] = "ok"
    rec["n_margins"] = int(result.n_margins)
    return rec

