"""Run a batch: a local process pool or an existing Dask cluster, then the tables.

:func:`run_batch` plans the tasks (:func:`clinometry.batch.tasks.plan_tasks`),
skips the complete ones when resuming, and runs :func:`run_task` on each of
the others -- in this process for one worker, in a
:class:`concurrent.futures.ProcessPoolExecutor` plus this process for
several, or on a
``dask.distributed`` cluster given by its scheduler address.  The task
function, its options and its seed are the same on every path, so the
per-line files are the same whichever way they were computed.

The worker processes are forked on Linux when this process has no other
thread yet (so they start at once with the analysis already imported,
instead of importing numpy, scipy, scikit-image and xarray again for about
2 s each), and spawned otherwise (macOS, Windows, or a process with threads,
where forking is unsafe).  Both run the same code.

When the tasks are done, the tables are rebuilt from what is on disk: the
margins table from every task's result JSON, the errors table from the
records of this run (plus inputs that named nothing).  A resumed run thus
neither loses nor duplicates rows.  Then the summary figure, the map figure
(3D volumes only) and the review page are written.  Every file is written
atomically.
"""

from __future__ import annotations

import json
import logging
import multiprocessing
import os
import queue
import sys
import threading
from collections import deque
from concurrent.futures import ProcessPoolExecutor, as_completed
from dataclasses import dataclass, field, replace
from pathlib import Path

from ..errors import ClinometryError
from ..pipeline import AnalysisOptions, check_choices
from ..pipeline.chain import check_velocity
from ..report._text import default_velocity_used, velocity_label
from ..report.geojson import check_crs, write_margins_geojson
from ..report.page import margin_details
from ..report.review import load_decisions, review_outputs
from ..report.tables import margin_rows, write_errors_csv, write_margins_csv, write_margins_parquet
from .tasks import TaskOptions, is_complete, output_names, plan_tasks, run_task

__all__ = ["BatchSummary", "run_batch", "collect_tables", "check_scheduler_address", "SCHEDULER_SCHEMES"]

logger = logging.getLogger(__name__)


@dataclass(frozen=True)
class BatchSummary:
    """What a batch run did.

    Attributes
    ----------
    out_dir : str
    n_tasks : int
        Lines planned (2D files and lines of 3D volumes).
    n_ok, n_failed, n_skipped : int
        Lines analysed now, failed now, and skipped as complete (resume).
    n_problems : int
        Inputs that could not become tasks (missing, unreadable geometry).
    n_margins : int
        Rows of the margins table.
    files : dict
        Name -> path of the run-level outputs written.
    records : tuple of dict
        One record per line (see :func:`clinometry.batch.tasks.run_task`).
    errors : tuple of dict
        Rows of the errors table (``file, line, error_type, message``).
    default_velocity : tuple of str
        Stems of the lines converted with the package default velocity
        (no velocity was given for them).
    review : dict
        Margins per review state (:func:`clinometry.report.review.review_counts`);
        empty when no decision was given or kept.
    """

    out_dir: str
    n_tasks: int
    n_ok: int
    n_failed: int
    n_skipped: int
    n_problems: int
    n_margins: int
    files: dict = field(default_factory=dict)
    records: tuple = ()
    errors: tuple = ()
    default_velocity: tuple = ()
    review: dict = field(default_factory=dict)

    @property
    def exit_code(self) -> int:
        """0 all lines done, 1 some failed, 2 nothing could run."""
        done = self.n_ok + self.n_skipped
        if done == 0:
            return 2
        return 1 if (self.n_failed or self.n_problems) else 0


def _progress(total, quiet):
    from tqdm.auto import tqdm

    return tqdm(total=total, unit="line", desc="clinometry batch", file=sys.stderr,
                disable=True if quiet else None, dynamic_ncols=True)


def _warm_up(plot):
    """Pool initializer: import the analysis (and, with plots, matplotlib) once per worker."""
    from .. import pipeline  # noqa: F401  (the imports are the point)
    from .._plugins import load_plugin
    from ..report import line_files  # noqa: F401

    load_plugin("picker", "default")
    load_plugin("classifier", "rules")
    if plot:
        from ..report import figures  # noqa: F401


def _ready():
    """A no-op job: its result means a worker has started and warmed up."""
    return os.getpid()


def _pool_context():
    """``fork`` on Linux while this process has a single thread, else ``spawn``.

    A forked worker starts with the imports of this process (no start-up
    of about 2 s); forking a process with other threads running can
    deadlock the child (a lock held by another thread at the fork is never
    released), and macOS system libraries are not fork-safe, so then the
    workers are spawned (common practice, no source; see the Python
    documentation of :mod:`multiprocessing`, "Contexts and start methods").
    """
    if sys.platform.startswith("linux") and threading.active_count() == 1:
        return multiprocessing.get_context("fork")
    return multiprocessing.get_context("spawn")


def _iter_local(tasks, options, workers):
    """Run the tasks on ``workers`` local processes, this one included.

    The worker processes are started when this function is called (not at
    the first ``next``), before any thread of the caller such as a progress
    bar exists, so they can be forked (see :func:`_pool_context`).

    This process is one of the workers: a thread here takes lines from the
    same queue that feeds ``workers - 1`` worker processes.  A worker
    process is given lines only once it has started and imported the
    analysis (a no-op job run after its initializer comes back), so no line
    waits behind a start-up while this process could have run it, and a
    batch of one or two lines is not slower than on one worker.  Lines are
    handed out one at a time (dynamic scheduling, common practice, no
    source), so a slow line does not hold back a queue of others.
    """
    if workers <= 1:
        return (run_task(t, options) for t in tasks)
    ctx = _pool_context()
    if ctx.get_start_method() == "fork":
        _warm_up(bool(options.plot))  # imported once here, inherited by the workers
    pool = ProcessPoolExecutor(max_workers=workers - 1, mp_context=ctx, initializer=_warm_up,
                               initargs=(bool(options.plot),))
    ready = [pool.submit(_ready) for _ in range(workers - 1)]  # the worker processes start now
    logger.debug("batch: %d worker process(es) started by %s", workers - 1, ctx.get_start_method())
    return _drain_local(tasks, options, pool, ready)


def _drain_local(tasks, options, pool, ready):
    """The records of :func:`_iter_local` for several workers, as they come."""
    pending = deque(tasks)
    lock = threading.Lock()
    results = queue.Queue()
    stop = threading.Event()

    def take():
        with lock:
            return pending.popleft() if pending and not stop.is_set() else None

    def here():
        try:
            while (t := take()) is not None:
                results.put(("record", run_task(t, options)))
        except BaseException as err:  # handed to the caller, which re-raises it
            results.put(("error", err))

    running = set()
    n_ready = 0

    def top_up():
        while len(running) < n_ready and (t := take()) is not None:
            fut = pool.submit(run_task, t, options)
            running.add(fut)
            fut.add_done_callback(lambda f: results.put(("future", f)))

    local = threading.Thread(target=here, name="clinometry-batch-local", daemon=True)
    clean = False
    try:
        for fut in ready:  # a worker takes lines once it has started (and imported)
            fut.add_done_callback(lambda f: results.put(("ready", f)))
        local.start()
        done = 0
        while done < len(tasks):
            kind, value = results.get()
            if kind == "error":
                raise value
            if kind == "ready":
                if value.exception() is None:
                    n_ready += 1
                    top_up()
                else:  # the lines go on in this process
                    logger.warning("a worker process did not start (%s); going on with fewer",
                                   value.exception())
                continue
            if kind == "future":
                running.discard(value)
                top_up()
                value = value.result()
            done += 1
            yield value
        clean = True
    finally:  # on Ctrl-C or an error, do not start the lines still queued
        stop.set()
        # after a clean run only start-up jobs can be left: do not wait for them
        pool.shutdown(wait=not clean, cancel_futures=True)
        if local.is_alive():
            local.join()


#: address schemes a dask.distributed scheduler listens on (distributed.comm registry, from memory)
SCHEDULER_SCHEMES = ("tcp", "tls", "ws", "wss", "ucx")


def check_scheduler_address(address) -> str:
    """Check a ``--scheduler`` address before connecting: ``SCHEME://HOST:PORT`` or ``HOST:PORT``.

    Parameters
    ----------
    address : str

    Returns
    -------
    str
        The address as given (stripped).

    Raises
    ------
    ClinometryError
        A scheme other than :data:`SCHEDULER_SCHEMES` (``http://`` is a web
        dashboard, not the scheduler), no host, or no port from 1 to 65535.

    Examples
    --------
    >>> check_scheduler_address("tcp://10.0.0.5:8786")
    'tcp://10.0.0.5:8786'
    >>> check_scheduler_address("http://10.0.0.5:8787")
    Traceback (most recent call last):
    ...
    clinometry.errors.ClinometryError: --scheduler http://10.0.0.5:8787: scheme 'http' is not a Dask scheduler's ...
    """
    text = str(address or "").strip()
    hint = "give the scheduler's address as tcp://HOST:PORT (the dashboard's http:// address is not it)"
    scheme, sep, rest = text.rpartition("://") if "://" in text else ("tcp", "", text)
    if scheme not in SCHEDULER_SCHEMES:
        raise ClinometryError(f"--scheduler {text}: scheme {scheme!r} is not a Dask scheduler's "
                              f"({', '.join(SCHEDULER_SCHEMES)}); {hint}")
    host, colon, port = rest.rpartition(":")
    host = host[1:-1] if host.startswith("[") and host.endswith("]") else host
    if not colon or not host or any(c in host for c in " /@") or not port.isdigit() or not 0 < int(port) < 65536:
        raise ClinometryError(f"--scheduler {text}: expected HOST:PORT with a port from 1 to 65535; {hint}")
    return text


def _iter_dask(tasks, options, scheduler):
    try:
        from distributed import Client, as_completed as dask_completed
    except ImportError as err:
        raise ClinometryError(
            "--scheduler needs dask.distributed; install it with pip install 'clinometry[dask]'"
        ) from err
    try:
        client = Client(scheduler, timeout="20s", set_as_default=False)
    except (OSError, ValueError, TypeError) as err:
        raise ClinometryError(f"cannot reach the Dask scheduler at {scheduler}: {err}; check the address") from err
    try:
        futures = client.map(run_task, tasks, options=options, pure=False)
        for fut in dask_completed(futures, loop=client.loop):
            yield fut.result()
    finally:
        client.close()


def collect_tables(tasks, out_dir, *, plot=True):
    """Margin rows and per-line entries rebuilt from the result JSONs on disk.

    Parameters
    ----------
    tasks : sequence of Task
    out_dir : str or os.PathLike
    plot : bool

    Returns
    -------
    margins : list of dict
        Rows of the margins table, in task order, each with ``json`` and
        ``png`` (relative links), ``reasons`` and ``missing`` (for the
        review page, :func:`clinometry.report.page.margin_details`).
    lines : list of dict
        Per task: ``stem, file, line, status, json, png, csv, n_margins``,
        ``default_velocity`` and ``velocity`` (label of the model)
        (``status`` "ok" when its files are complete and valid, see
        :func:`clinometry.batch.tasks.is_complete`; only those lines give
        margin rows).
    cautions : list of str
        The cautions recorded in the results (each once).
    """
    out = Path(out_dir)
    margins, lines, cautions = [], [], []
    for t in tasks:
        names = output_names(t.stem, plot=plot)
        entry = {"stem": t.stem, "file": os.path.basename(t.path), "line": t.label, "status": "failed",
                 "json": None, "png": None, "csv": None, "n_margins": 0, "x": None, "y": None}
        if not is_complete(t, out, plot=plot):
            lines.append(entry)
            continue
        d = json.loads((out / names["json"]).read_text(encoding="utf-8"))
        rows = margin_rows(d, file=t.path, line=t.label, stem=t.stem)
        png = names["png"] if names["png"] and (out / names["png"]).is_file() else None
        for r, details in zip(rows, margin_details(d)):
            r.update(json=names["json"], png=png, **details)
        margins.extend(rows)
        for c in (d.get("run") or {}).get("cautions") or []:
            if c not in cautions:
                cautions.append(c)
        entry.update(status="ok", json=names["json"], n_margins=len(rows),
                     default_velocity=default_velocity_used(d.get("velocity")), velocity=velocity_label(d.get("velocity")))
        if names["png"] and (out / names["png"]).is_file():
            entry["png"] = names["png"]
        if (out / names["csv"]).is_file():
            entry["csv"] = names["csv"]
        lines.append(entry)
    return margins, lines, cautions


def run_batch(
    paths,
    out_dir,
    options: AnalysisOptions | None = None,
    *,
    workers=None,
    scheduler=None,
    resume=False,
    inlines=None,
    crosslines=None,
    file_velocity=None,
    plot=True,
    quiet=False,
    title="clinometry batch review",
    review=None,
    crs=None,
    **option_keywords,
) -> BatchSummary:
    """Analyse many lines and write per-line files, tables, figures and the review page.

    Parameters
    ----------
    paths : sequence of str or os.PathLike
        SEG-Y files, folders and glob patterns.
    out_dir : str or os.PathLike
        Output folder (created).
    options : AnalysisOptions, optional
        How every line is analysed (see :func:`clinometry.pipeline.run_analysis`).
    workers : int, optional
        Local processes, this one included; default every core
        (``os.cpu_count()``).  1 runs in this process only.
    scheduler : str, optional
        Address of a running ``dask.distributed`` scheduler
        (``tcp://host:port``); then ``workers`` is ignored.
    resume : bool
        Skip lines whose files are complete, valid and made with the same
        settings (see :func:`clinometry.batch.tasks.is_complete`).
    inlines, crosslines : str, optional
        ``all`` or ``A:B:STEP`` for 3D volumes (default every inline).
    file_velocity : dict, optional
        File path -> ``{"velocity": v_m_s}`` or ``{"velocity_linear":
        (v0_m_s, k_per_s)}`` for files that need their own velocity.
    plot : bool
        Write a QC PNG per line and the summary/map figures.
    quiet : bool
        No progress bar.
    title : str
        Title of the review page.
    review : str or os.PathLike, optional
        A ``review.csv`` exported from the review page.  Its decisions, and
        those kept in ``out_dir/review.csv`` by earlier runs, are applied
        to the margins (see :mod:`clinometry.report.review`):
        ``margins_reviewed.csv`` gets the accepted ones with their notes,
        the figures and the page show every decision, and a margin whose
        picks moved since its review is "changed since review".
    crs : str, optional
        The survey's projected coordinate reference system (``"EPSG:NNNN"``):
        the breaks and toes are written as RFC 7946 GeoJSON in WGS 84
        longitude/latitude (``margins.geojson``, needs pyproj); without it
        they are written in projected x/y (``margins_projected.geojson``),
        see :mod:`clinometry.report.geojson`.
    **option_keywords
        Fields of :class:`~clinometry.pipeline.AnalysisOptions`, on top of
        ``options`` (e.g. ``velocity=2800.0``).

    Returns
    -------
    BatchSummary

    Raises
    ------
    OSError
        When the output folder cannot be created.
    ClinometryError
        Bad line selection, an unreachable Dask scheduler, a horizon file
        (it belongs to one line: use ``analyze``), thresholds, plugin
        choices or velocity options that are refused, or a review file that
        cannot be read (all checked once, before any line runs).

    Notes
    -----
    The thresholds are resolved once here and the resolved table goes to
    every task, so a TOML file is read once and a bad one stops the run at
    the start.
    """
    analysis = AnalysisOptions(**option_keywords) if options is None else replace(options, **option_keywords)
    if analysis.horizons is not None:
        raise ClinometryError("a batch cannot use one horizon file for every line; measure it with "
                              "clinometry analyze FILE --horizons PICKS.csv")
    analysis = replace(
        analysis,
        velocity=float(analysis.velocity) if isinstance(analysis.velocity, (int, float)) else analysis.velocity,
        velocity_file=None if analysis.velocity_file is None else str(Path(analysis.velocity_file).resolve()),
    )
    analysis = replace(analysis, thresholds=check_choices(analysis))
    for own in (file_velocity or {}).values():  # a file's own velocity is refused before any line runs too
        check_velocity(replace(analysis, **{"velocity": None, "velocity_linear": None, "velocity_file": None,
                                            **dict(own)}))
    if scheduler is not None:
        scheduler = check_scheduler_address(scheduler)  # a bad address stops the run before any work
    out = Path(out_dir)
    out.mkdir(parents=True, exist_ok=True)
    decisions = load_decisions(out, review)
    if crs is not None:
        check_crs(crs)  # pyproj there and the CRS known and projected, before any line runs
    tasks, problems = plan_tasks(paths, inlines=inlines, crosslines=crosslines)
    options = TaskOptions(
        out_dir=str(out.resolve()),
        analysis=analysis,
        plot=bool(plot),
        file_velocity={os.path.abspath(k): dict(v) for k, v in (file_velocity or {}).items()},
        protect=tuple(sorted({t.path for t in tasks})),
    )
    todo, skipped = [], 0
    for t in tasks:
        if resume and is_complete(t, out, plot=plot, options=options):
            skipped += 1
        else:
            todo.append(t)
    if resume:
        logger.info("resume: %d line(s) complete, %d to do", skipped, len(todo))
    records = []
    n_failed = 0
    if todo:
        n_workers = 1 if scheduler else max(1, min(int(workers or os.cpu_count() or 1), len(todo)))
        it = _iter_dask(todo, options, scheduler) if scheduler else _iter_local(todo, options, n_workers)
        bar = _progress(len(todo), quiet)
        try:
            for rec in it:
                records.append(rec)
                if rec["status"] != "ok":
                    n_failed += 1
                bar.set_postfix(done=len(records) - n_failed, failed=n_failed, refresh=False)
                bar.update(1)
        finally:
            bar.close()
    order = {t.stem: i for i, t in enumerate(tasks)}
    records.sort(key=lambda r: order.get(r["stem"], -1))

    margins, lines, cautions = collect_tables(tasks, out, plot=plot)
    margins, review_counts, review_files = review_outputs(margins, decisions, out)
    errors = list(problems) + [
        {"file": r["file"], "line": r["line"], "error_type": r["error_type"], "message": r["message"]}
        for r in records if r["status"] != "ok"
    ]
    files = {
        "margins_csv": write_margins_csv(margins, out / "margins.csv"),
        "errors_csv": write_errors_csv(errors, out / "errors.csv"),
    }
    parquet = write_margins_parquet(margins, out / "margins.parquet")
    if parquet is not None:
        files["margins_parquet"] = parquet
    files.update(review_files)
    geojson = write_margins_geojson(margins, out, crs=crs)
    if geojson is not None:
        files["geojson"] = geojson
    summary_png = map_png = None
    if plot and margins:
        from ..report.figures import map_figure, summary_figure

        summary_png = summary_figure(margins, out / "summary.png")
        if any(t.direction for t in tasks):
            map_png = map_figure([r for r, t in _rows_with_tasks(margins, tasks) if t.direction], out / "map.png")
    if summary_png:
        files["summary_png"] = summary_png
    if map_png:
        files["map_png"] = map_png
    from ..report.page import write_index

    files["index_html"] = write_index(
        out / "index.html", margins=margins, lines=lines, errors=errors,
        summary_png=summary_png.name if summary_png else None, map_png=map_png.name if map_png else None,
        title=title, cautions=cautions,
    )
    return BatchSummary(
        out_dir=str(out), n_tasks=len(tasks), n_ok=sum(r["status"] == "ok" for r in records),
        n_failed=n_failed, n_skipped=skipped, n_problems=len(problems), n_margins=len(margins),
        files={k: str(v) for k, v in files.items()}, records=tuple(records), errors=tuple(errors),
        default_velocity=tuple(ln["stem"] for ln in lines if ln.get("default_velocity")), review=review_counts,
    )


def _rows_with_tasks(margins, tasks):
    by_stem = {t.stem: t for t in tasks}
    for r in margins:
        t = by_stem.get(r.get("stem"))
        if t is not None:
            yield r, t
