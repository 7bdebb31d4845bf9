"""Reports of a run: result files and tables, QC/summary/map figures, review page.

:mod:`clinometry.report.files` writes every output atomically and builds the
margins and errors tables; :mod:`clinometry.report.plots` draws the figures
(matplotlib imported on use); :mod:`clinometry.report.html` writes the
self-contained review page ``index.html``.
"""

from .files import atomic_write, margin_rows, safe_name, write_errors_csv, write_margins_csv, write_margins_parquet
from .html import index_html, write_index
from .plots import map_figure, qc_figure, summary_figure

__all__ = [
    "atomic_write",
    "margin_rows",
    "safe_name",
    "write_errors_csv",
    "write_margins_csv",
    "write_margins_parquet",
    "index_html",
    "write_index",
    "qc_figure",
    "summary_figure",
    "map_figure",
]
