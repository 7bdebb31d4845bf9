"""Reports of a run: safe file writing, tables, figures, the review page, and a line's files.

Imports run one way inside this package:
:mod:`~clinometry.report.atomic` (atomic writes, safe names) ->
:mod:`~clinometry.report.tables` (margins, errors and horizons rows; CSV and
Parquet) -> :mod:`~clinometry.report.figures` (QC, summary and map figures;
matplotlib imported on use) -> :mod:`~clinometry.report.page` (the
self-contained review page ``index.html``) and
:mod:`~clinometry.report.line_files` (the JSON, horizons CSV and QC figure
of one line).
"""

from .atomic import atomic_write, safe_name
from .figures import map_figure, qc_figure, summary_figure
from .line_files import write_line_files
from .page import index_html, write_index
from .tables import (
    HORIZON_COLUMNS,
    horizon_rows,
    margin_rows,
    write_errors_csv,
    write_margins_csv,
    write_margins_parquet,
)

__all__ = [
    "atomic_write",
    "safe_name",
    "margin_rows",
    "horizon_rows",
    "HORIZON_COLUMNS",
    "write_errors_csv",
    "write_margins_csv",
    "write_margins_parquet",
    "write_line_files",
    "index_html",
    "write_index",
    "qc_figure",
    "summary_figure",
    "map_figure",
]
