"""Tables of a run: margins, errors and horizons rows, and writing them as CSV or Parquet.

The margins table has one row per margin of every line, flattened from the
result JSON contract (``margins[*]``); the errors table has one row per line
that failed; the horizons table (``<stem>.horizons.csv``) has one row per
picked point, with its depth taken from the result
(:attr:`clinometry.result.Result.horizon_depths_m`).  Every file is written
with :func:`clinometry.report.atomic.atomic_write`.
"""

from __future__ import annotations

import csv
import io
import logging
import math
import re
from pathlib import Path

import numpy as np

from ._text import default_velocity_used, velocity_label
from .atomic import atomic_write

__all__ = [
    "MARGIN_COLUMNS",
    "ERROR_COLUMNS",
    "HORIZON_COLUMNS",
    "MARGIN_DECIMALS",
    "margin_rows",
    "rounded_rows",
    "margin_value",
    "margin_percentile",
    "horizon_rows",
    "FORMULA_START",
    "neutralise_formula",
    "csv_text",
    "write_csv",
    "write_margins_csv",
    "write_margins_parquet",
    "write_errors_csv",
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
    "break_depth_m_p10",
    "break_depth_m_p90",
    "velocity_model",
    "default_velocity",
)

#: decimals of each number column of margins.csv: 0.1 deg, 1 m, 0.01 confidence (a precision the
#: picks support; the results JSON keeps every digit).  Columns not listed are written as they are.
MARGIN_DECIMALS = {
    "confidence": 2,
    **{f"{p}_{k}": 0 for p in ("break", "toe") for k in ("distance_m", "x", "y", "depth_m")},
    **{k: 1 for k in ("slope_max_deg", "slope_max_deg_p10", "slope_max_deg_p90", "slope_mean_deg",
                      "slope_mean_deg_p10", "slope_mean_deg_p90", "trajectory_angle_deg")},
    **{k: 0 for k in ("relief_m", "relief_m_p10", "relief_m_p90", "break_depth_m_p10", "break_depth_m_p90")},
}

#: columns of errors.csv, in order
ERROR_COLUMNS = ("file", "line", "error_type", "message")

#: columns of ``<stem>.horizons.csv``, in order: plain columns any
#: interpretation software can import (``z`` in the section's units, ms TWT
#: or m; ``depth_m`` positive down)
HORIZON_COLUMNS = ("horizon_id", "role", "trace", "distance_m", "x", "y", "z", "depth_m", "quality")


def _number(v):
    if v is None:
        return None
    if isinstance(v, bool):
        return v
    if isinstance(v, (int, float)):
        return None if isinstance(v, float) and not math.isfinite(v) else v
    return v


def margin_percentile(margin, key, which):
    """P10/P90 (``which``) of a value from a margin dict: nested ``uncertainty`` or flat keys; None if absent."""
    unc = margin.get("uncertainty") or {}
    entry = unc.get(key) if isinstance(unc, dict) else None
    if isinstance(entry, dict) and which in entry:
        return _number(entry[which])
    val = margin.get(key)
    if isinstance(val, dict) and which in val:
        return _number(val[which])
    return _number(margin.get(f"{key}_{which}"))


def margin_value(margin, key):
    """The value of ``key`` in a margin dict (a ``{"value"|"p50": ..}`` dict gives its value); None if absent."""
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
    velocity = result.get("velocity") or {}
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
            row[key] = margin_value(m, key)
            row[f"{key}_p10"] = margin_percentile(m, key, "p10")
            row[f"{key}_p90"] = margin_percentile(m, key, "p90")
        traj = m.get("trajectory") or {}
        row["trajectory_class"] = traj.get("class")
        row["trajectory_angle_deg"] = _number(traj.get("angle_deg"))
        row["n_clinoforms"] = len(m.get("clinoforms") or [])
        row["break_depth_m_p10"] = margin_percentile(m, "break_depth_m", "p10")
        row["break_depth_m_p90"] = margin_percentile(m, "break_depth_m", "p90")
        row["velocity_model"] = velocity_label(velocity)
        row["default_velocity"] = "yes" if default_velocity_used(velocity) else "no"
        rows.append(row)
    return rows


def rounded_rows(rows, decimals=None) -> list:
    """Copies of table rows with each number column rounded to its decimals (0 decimals -> int).

    Parameters
    ----------
    rows : list of dict
    decimals : dict, optional
        Column -> decimals; default :data:`MARGIN_DECIMALS`.

    Examples
    --------
    >>> rounded_rows([{"confidence": 0.8366, "relief_m": 339.64, "slope_max_deg": 21.94, "file": "a"}])
    [{'confidence': 0.84, 'relief_m': 340, 'slope_max_deg': 21.9, 'file': 'a'}]
    """
    decimals = MARGIN_DECIMALS if decimals is None else decimals
    out = []
    for r in rows:
        r = dict(r)
        for c, n in decimals.items():
            v = r.get(c)
            if isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v):
                r[c] = int(round(v)) + 0 if n == 0 else round(float(v), n) + 0.0
        out.append(r)
    return out


def _rounded(values) -> list:
    """Python floats rounded to 0.001 of their unit."""
    return [round(v, 3) for v in np.asarray(values, dtype=float).tolist()]


def horizon_rows(result, section) -> list:
    """Rows of ``<stem>.horizons.csv``: one per point of every picked horizon.

    Parameters
    ----------
    result : clinometry.result.Result
        Its ``picks.horizons`` give the points, its ``horizon_depths_m``
        their depths (converted by the pipeline with the run's velocity).
    section : xarray.DataArray, dims ("trace", "z")
        The section the picks were made on (for distance, x, y).

    Returns
    -------
    list of dict
        Keys :data:`HORIZON_COLUMNS`; numbers rounded to 0.001 of their
        unit; ``depth_m`` None where the result holds no depths (a result
        re-read from JSON).

    Examples
    --------
    >>> from clinometry.metrics import Metrics
    >>> from clinometry.picking.picks import Horizon, Picks
    >>> from clinometry.result import Result
    >>> from clinometry.section import make_section
    >>> s = make_section(np.zeros((3, 4)), z=[0, 4, 8, 12], trace_spacing_m=10.0)
    >>> p = Picks(horizons=(Horizon(0, "reflector", [0, 2], [4.0, 8.0], [1.0, 0.5]),))
    >>> r = Result(source={}, velocity={}, picks=p, metrics=Metrics(), horizon_depths_m=(np.array([5.0, 10.0]),))
    >>> [(x["trace"], x["distance_m"], x["z"], x["depth_m"]) for x in horizon_rows(r, s)]
    [(0, 0.0, 4.0, 5.0), (2, 20.0, 8.0, 10.0)]
    """
    picks = result.picks
    if picks is None or not picks.horizons:
        return []
    dist = np.asarray(section["distance"].values)
    xs = np.asarray(section["x"].values) if "x" in section.coords else dist
    ys = np.asarray(section["y"].values) if "y" in section.coords else np.zeros_like(dist)
    depths = result.horizon_depths_m or (None,) * len(picks.horizons)
    rows = []
    for h, depth in zip(picks.horizons, depths):
        n = len(h)
        if n == 0:
            continue
        t = np.asarray(h.trace, dtype=np.int64)
        columns = {
            "horizon_id": [int(h.id)] * n,
            "role": [h.role] * n,
            "trace": t.tolist(),
            "distance_m": _rounded(dist[t]),
            "x": _rounded(xs[t]),
            "y": _rounded(ys[t]),
            "z": _rounded(h.z),
            "depth_m": _rounded(depth) if depth is not None else [None] * n,
            "quality": _rounded(h.quality),
        }
        rows.extend(dict(zip(HORIZON_COLUMNS, cells)) for cells in zip(*(columns[c] for c in HORIZON_COLUMNS)))
    return rows


#: first characters that make a spreadsheet read a cell as a formula (OWASP, "CSV Injection", from memory):
#: such a text cell is written with a leading apostrophe, which spreadsheets show as text
FORMULA_START = ("=", "+", "-", "@", "\t", "\r")


def neutralise_formula(text: str) -> str:
    """A text cell as a spreadsheet will not run it: a leading ``'`` before ``= + - @``, tab or CR.

    Parameters
    ----------
    text : str
        A text cell (numbers are not passed here: ``-12.5`` stays a number).

    Returns
    -------
    str
        ``text`` with ``'`` in front when it starts with one of
        :data:`FORMULA_START`; a lone ``+`` or ``-`` (the basin side of a
        margin) holds no formula and is kept as it is (common practice, no
        source).

    Notes
    -----
    This is the leading-quote rule for CSV formula injection (OWASP, "CSV
    Injection", from memory).  :mod:`clinometry.report.review` takes the
    apostrophe off again when it reads a table back.

    Examples
    --------
    >>> neutralise_formula("=HYPERLINK(1)"), neutralise_formula("line_07.sgy"), neutralise_formula("-")
    ("'=HYPERLINK(1)", 'line_07.sgy', '-')
    """
    if text and text[0] in FORMULA_START and text not in ("+", "-"):
        return "'" + text
    return text


def _cell(v):
    if v is None:
        return ""
    if isinstance(v, float):
        return repr(v)
    if isinstance(v, str):
        return neutralise_formula(v)
    return str(v)


def csv_text(rows, columns) -> str:
    """Rows (dicts) as CSV text with a header; ``None`` becomes an empty cell.

    Text cells go through :func:`neutralise_formula`, so no cell taken from a
    file name, a header or a message runs as a spreadsheet formula.

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
    if kinds <= {int}:
        return list(map(str, values))
    if kinds <= {str}:
        return list(map(neutralise_formula, values))
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
    """Write ``margins.csv`` (columns :data:`MARGIN_COLUMNS`) atomically, numbers rounded by :data:`MARGIN_DECIMALS`."""
    return write_csv(rounded_rows(rows), path, MARGIN_COLUMNS)


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
    text_cols = {"file", "line", "stem", "direction", "family", "subtype", "trajectory_class", "velocity_model",
                 "default_velocity"}
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
