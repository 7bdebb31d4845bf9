"""Output files of a run: atomic writes, safe names, margins and errors tables.

Every file is written atomically: the bytes go to a temporary file in the
same directory, which is flushed, synced and then renamed over the target
with :func:`os.replace`.  A rename within one file system is atomic on POSIX
and Windows, so a run killed part-way leaves either the old file or the new
one, never half a file (common practice, no source).

Output names are derived from input file names and header values, which come
from outside; :func:`safe_name` reduces them to letters, digits, ``-``, ``_``
and ``.`` with no leading dot, so no name can climb out of the output folder
or hide itself.

The margins table has one row per margin of every line, flattened from the
result JSON contract (``margins[*]``); the errors table has one row per line
that failed.
"""

from __future__ import annotations

import csv
import io
import logging
import math
import os
import re
import tempfile
from pathlib import Path

from ..picking.export import HORIZON_COLUMNS  # columns of <stem>.horizons.csv

__all__ = [
    "atomic_write",
    "safe_name",
    "MARGIN_COLUMNS",
    "ERROR_COLUMNS",
    "margin_rows",
    "csv_text",
    "write_csv",
    "write_margins_csv",
    "write_margins_parquet",
    "write_errors_csv",
    "HORIZON_COLUMNS",
    "write_result_files",
]

logger = logging.getLogger(__name__)

#: columns of margins.csv, in order (names end in their unit)
MARGIN_COLUMNS = (
    "file",
    "line",
    "stem",
    "direction",
    "family",
    "subtype",
    "confidence",
    "break_trace",
    "break_distance_m",
    "break_x",
    "break_y",
    "break_depth_m",
    "toe_trace",
    "toe_distance_m",
    "toe_x",
    "toe_y",
    "toe_depth_m",
    "slope_max_deg",
    "slope_max_deg_p10",
    "slope_max_deg_p90",
    "slope_mean_deg",
    "slope_mean_deg_p10",
    "slope_mean_deg_p90",
    "relief_m",
    "relief_m_p10",
    "relief_m_p90",
    "trajectory_class",
    "trajectory_angle_deg",
    "n_clinoforms",
)

#: columns of errors.csv, in order
ERROR_COLUMNS = ("file", "line", "error_type", "message")

_SAFE = re.compile(r"[^A-Za-z0-9._-]+")


def atomic_write(path, data) -> Path:
    """Write ``data`` to ``path`` atomically (temporary file + rename).

    Parameters
    ----------
    path : str or os.PathLike
        Target file; its folder must exist.
    data : str or bytes
        Text is written as UTF-8.

    Returns
    -------
    pathlib.Path
        The target path.

    Raises
    ------
    OSError
        When the folder is not writable; the temporary file is removed.

    Notes
    -----
    The temporary file lives in the target's folder so that the final
    :func:`os.replace` is a rename within one file system (common practice,
    no source).

    Examples
    --------
    >>> import tempfile, pathlib
    >>> d = pathlib.Path(tempfile.mkdtemp())
    >>> atomic_write(d / "a.txt", "hello").read_text()
    'hello'
    """
    path = Path(path)
    payload = data.encode("utf-8") if isinstance(data, str) else bytes(data)
    fd, tmp = tempfile.mkstemp(dir=path.parent, prefix=f".{path.name}.", suffix=".tmp")
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(payload)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass
        raise
    return path


def safe_name(text, *, default: str = "line") -> str:
    """Reduce ``text`` to a file-name part with no path separators or traversal.

    Parameters
    ----------
    text : str
        A file stem or header value.
    default : str
        Returned when nothing usable is left.

    Returns
    -------
    str
        Only ``A-Z a-z 0-9 . _ -``, no leading dot or dash, no ``..``, at
        most 120 characters.

    Examples
    --------
    >>> safe_name("../../etc/passwd")
    'etc_passwd'
    >>> safe_name(".hidden line 7.sgy")
    'hidden_line_7.sgy'
    """
    s = _SAFE.sub("_", str(text))
    s = re.sub(r"\.{2,}", "_", s)
    s = re.sub(r"_+", "_", s).strip("._-")
    s = s[:120].rstrip("._-")
    return s or default


def _number(v):
    if v is None:
        return None
    if isinstance(v, bool):
        return v
    if isinstance(v, (int, float)):
        return None if isinstance(v, float) and not math.isfinite(v) else v
    return v


def _percentile(margin, key, which):
    """P10/P90 of a value from a margin dict: nested ``uncertainty`` or flat keys."""
    unc = margin.get("uncertainty") or {}
    entry = unc.get(key) if isinstance(unc, dict) else None
    if isinstance(entry, dict) and which in entry:
        return _number(entry[which])
    val = margin.get(key)
    if isinstance(val, dict) and which in val:
        return _number(val[which])
    return _number(margin.get(f"{key}_{which}"))


def _value(margin, key):
    val = margin.get(key)
    if isinstance(val, dict):  # {"value": .., "p10": ..} style
        val = val.get("value", val.get("p50"))
    return _number(val)


def margin_rows(result, *, file="", line="", stem="") -> list:
    """Flatten the margins of one result (contract dict) into table rows.

    Parameters
    ----------
    result : dict
        A result in the JSON contract (``Result.to_dict()``).
    file, line, stem : str
        Source file name, line label (e.g. ``"inline 112"``, empty for a 2D
        line) and output stem, copied into every row.

    Returns
    -------
    list of dict
        One dict per margin with the keys of :data:`MARGIN_COLUMNS`; values
        that were not measured are ``None``.

    Examples
    --------
    >>> r = {"margins": [{"direction": "+", "family": "ramp", "confidence": 0.8,
    ...      "break": {"trace": 3, "depth_m": 120.0}, "toe": None,
    ...      "slope_max_deg": 1.5, "relief_m": 40.0, "trajectory": None}]}
    >>> row = margin_rows(r, file="a.sgy")[0]
    >>> row["family"], row["break_depth_m"], row["toe_depth_m"], row["slope_max_deg"]
    ('ramp', 120.0, None, 1.5)
    """
    rows = []
    for m in result.get("margins", []) or []:
        row = dict.fromkeys(MARGIN_COLUMNS)
        row.update(file=file, line=line, stem=stem)
        row["direction"] = m.get("direction")
        row["family"] = m.get("family")
        row["subtype"] = m.get("subtype")
        row["confidence"] = _number(m.get("confidence"))
        for name in ("break", "toe"):
            pt = m.get(name) or {}
            for k in ("trace", "distance_m", "x", "y", "depth_m"):
                row[f"{name}_{k}"] = _number(pt.get(k))
        for key in ("slope_max_deg", "slope_mean_deg", "relief_m"):
            row[key] = _value(m, key)
            row[f"{key}_p10"] = _percentile(m, key, "p10")
            row[f"{key}_p90"] = _percentile(m, key, "p90")
        traj = m.get("trajectory") or {}
        row["trajectory_class"] = traj.get("class")
        row["trajectory_angle_deg"] = _number(traj.get("angle_deg"))
        row["n_clinoforms"] = len(m.get("clinoforms") or [])
        rows.append(row)
    return rows


def _cell(v):
    if v is None:
        return ""
    if isinstance(v, float):
        return repr(v)
    return str(v)


def csv_text(rows, columns) -> str:
    """Rows (dicts) as CSV text with a header; ``None`` becomes an empty cell.

    Examples
    --------
    >>> csv_text([{"a": 1, "b": None}], ("a", "b")).splitlines()
    ['a,b', '1,']
    """
    # column by column, each formatted by one C-level map (floats by
    # float.__repr__, as _cell) and joined at once: the same text as the csv
    # writer row by row, about 4x faster on a horizons table; cells the csv
    # writer would quote (delimiter, quote or line break in them), and a
    # table of one column (an empty sole cell is quoted), go through it
    columns = list(columns)
    cells = [_column_cells([r.get(c) for r in rows]) for c in columns]
    if len(columns) > 1 and not any(_needs_quotes(col) for col in cells + [columns]):
        body = "\n".join(map(",".join, zip(*cells)))
        return ",".join(columns) + "\n" + (body + "\n" if body else "")
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(columns)
    if cells:
        w.writerows(zip(*cells))
    else:
        w.writerows([] for _ in rows)
    return buf.getvalue()


def _column_cells(values):
    """The cells of one column as :func:`_cell` makes them."""
    kinds = set(map(type, values))
    if kinds <= {float}:
        return list(map(float.__repr__, values))
    if kinds <= {int, str}:
        return list(map(str, values))
    return [_cell(v) for v in values]


_QUOTED = re.compile(r'[,"\r\n]')


def _needs_quotes(cells):
    """Whether the csv writer (minimal quoting) would quote one of these cells."""
    # the special characters are single characters: joined cells hold one
    # exactly where a cell does
    return _QUOTED.search("".join(cells)) is not None


def write_csv(rows, path, columns) -> Path:
    """Write rows (dicts) to a CSV file atomically; see :func:`csv_text`."""
    return atomic_write(path, csv_text(rows, columns))


def write_margins_csv(rows, path) -> Path:
    """Write ``margins.csv`` (columns :data:`MARGIN_COLUMNS`) atomically."""
    return write_csv(rows, path, MARGIN_COLUMNS)


def write_errors_csv(rows, path) -> Path:
    """Write ``errors.csv`` (columns :data:`ERROR_COLUMNS`) atomically."""
    return write_csv(rows, path, ERROR_COLUMNS)


def write_margins_parquet(rows, path):
    """Write the margins table as Parquet when pyarrow is installed.

    Returns
    -------
    pathlib.Path or None
        None (and an INFO log line) when pyarrow is not installed: install
        the ``parquet`` extra (``pip install clinometry[parquet]``) for it.
    """
    try:
        import pyarrow as pa
        import pyarrow.parquet as pq
    except ImportError:
        logger.info("pyarrow is not installed; margins.parquet skipped (pip install clinometry[parquet])")
        return None
    text_cols = {"file", "line", "stem", "direction", "family", "subtype", "trajectory_class"}
    int_cols = {"break_trace", "toe_trace", "n_clinoforms"}
    arrays = {}
    for c in MARGIN_COLUMNS:
        vals = [r.get(c) for r in rows]
        if c in text_cols:
            arrays[c] = pa.array([None if v is None else str(v) for v in vals], type=pa.string())
        elif c in int_cols:
            arrays[c] = pa.array([None if v is None else int(v) for v in vals], type=pa.int64())
        else:
            arrays[c] = pa.array([None if v is None else float(v) for v in vals], type=pa.float64())
    table = pa.table(arrays)
    buf = pa.BufferOutputStream()
    pq.write_table(table, buf)
    return atomic_write(path, buf.getvalue().to_pybytes())


def write_result_files(result, out_dir, *, stem, plot=True, section=None, velocity=None) -> dict:
    """Write the files of one analysed line: JSON, horizons CSV and QC plot.

    Parameters
    ----------
    result : clinometry.result.Result
    out_dir : str or os.PathLike
        Created if missing.
    stem : str
        File stem (reduced with :func:`safe_name`).
    plot : bool
        Write ``<stem>.png`` with :func:`clinometry.report.plots.qc_figure`.
    section : xarray.DataArray, dims ("trace", "z"), optional
        The analysed section; needed for the horizons table and the plot.
    velocity : velocity model, optional
        The model of the run (None for depth sections), for ``depth_m``.

    Returns
    -------
    dict
        ``{"json": path, "horizons": path or None, "plot": path or None}``;
        a file that could not be written for lack of input is None and the
        reason is logged at INFO.

    Notes
    -----
    Every file is written with :func:`atomic_write`.  The horizons table has
    the columns :data:`HORIZON_COLUMNS` (rows from
    :func:`clinometry.picking.export.horizon_rows`); with no horizons it
    holds only the header.
    """
    out = Path(out_dir)
    out.mkdir(parents=True, exist_ok=True)
    stem = safe_name(stem)
    paths = {"json": atomic_write(out / f"{stem}.json", result.to_json(indent=2) + "\n"), "horizons": None, "plot": None}
    if section is None:
        logger.info("%s: no section given; horizons table and QC plot skipped", stem)
        return paths
    rows = []
    if result.picks is not None and result.picks.horizons:
        from ..picking.export import horizon_rows

        rows = horizon_rows(result.picks, section, velocity)
    paths["horizons"] = write_csv(rows, out / f"{stem}.horizons.csv", HORIZON_COLUMNS)
    if plot:
        try:
            from .plots import qc_figure
        except ImportError as err:
            logger.info("%s: QC plot skipped (clinometry.report.plots.qc_figure not available: %s)", stem, err)
        else:
            target = out / f"{stem}.png"
            qc_figure(result, section, target)
            paths["plot"] = target
    return paths
