"""Batch runs over many lines: a local process pool or an existing Dask cluster.

:func:`run_batch` expands files, folders and globs (every inline of a 3D
volume), runs one task function per line, writes each line's files
atomically, and rebuilds ``margins.csv`` / ``errors.csv``, the summary and
map figures and ``index.html`` at the end, so ``resume=True`` neither loses
nor duplicates rows.
"""

from .execution import BatchSummary, collect_tables, run_batch
from .tasks import Task, TaskOptions, expand_paths, is_complete, parse_line_spec, plan_tasks, run_task

__all__ = [
    "BatchSummary",
    "collect_tables",
    "run_batch",
    "Task",
    "TaskOptions",
    "expand_paths",
    "is_complete",
    "parse_line_spec",
    "plan_tasks",
    "run_task",
]
