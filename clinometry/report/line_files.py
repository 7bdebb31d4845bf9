"""The files of one analysed line: results JSON, horizons table and QC figure.

``<stem>.json`` is the results contract (:meth:`clinometry.result.Result.to_json`),
``<stem>.horizons.csv`` the picked (or given) horizons with their depths
(:func:`clinometry.report.tables.horizon_rows`), ``<stem>.png`` the QC figure
(:func:`clinometry.report.figures.qc_figure`).  Every file is written
atomically.
"""

from __future__ import annotations

import logging
from pathlib import Path

from .atomic import atomic_write, safe_name
from .tables import HORIZON_COLUMNS, horizon_rows, write_csv

__all__ = ["write_line_files"]

logger = logging.getLogger(__name__)


def write_line_files(result, out_dir, *, stem, plot=True, section=None) -> dict:
    """Write the files of one analysed line: JSON, horizons CSV and QC plot.

    Parameters
    ----------
    result : clinometry.result.Result
    out_dir : str or os.PathLike
        Created if missing.
    stem : str
        File stem (reduced with :func:`~clinometry.report.atomic.safe_name`).
    plot : bool
        Write ``<stem>.png`` with :func:`clinometry.report.figures.qc_figure`.
    section : xarray.DataArray, dims ("trace", "z"), optional
        The analysed section; needed for the horizons table and the plot.

    Returns
    -------
    dict
        ``{"json": path, "horizons": path or None, "plot": path or None}``;
        a file that could not be written for lack of input is None and the
        reason is logged at INFO.

    Notes
    -----
    The horizons table has the columns
    :data:`~clinometry.report.tables.HORIZON_COLUMNS`; its depths are those
    of the result (the pipeline converts every horizon with the run's
    velocity model); with no horizons it holds only the header.
    """
    out = Path(out_dir)
    out.mkdir(parents=True, exist_ok=True)
    stem = safe_name(stem)
    paths = {"json": atomic_write(out / f"{stem}.json", result.to_json(indent=2) + "\n"), "horizons": None, "plot": None}
    if section is None:
        logger.info("%s: no section given; horizons table and QC plot skipped", stem)
        return paths
    paths["horizons"] = write_csv(horizon_rows(result, section), out / f"{stem}.horizons.csv", HORIZON_COLUMNS)
    if plot:
        try:
            from .figures import qc_figure
        except ImportError as err:
            logger.info("%s: QC plot skipped (clinometry.report.figures.qc_figure not available: %s)", stem, err)
        else:
            target = out / f"{stem}.png"
            qc_figure(result, section, target)
            paths["plot"] = target
    return paths
