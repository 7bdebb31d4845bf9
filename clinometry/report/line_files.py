"""The files of one analysed line: results JSON, horizons table and QC figure.

``<stem>.json`` is the results contract (:meth:`clinometry.result.Result.to_json`),
``<stem>.horizons.csv`` the picked (or given) horizons with their depths
(:func:`clinometry.report.tables.horizon_rows`), ``<stem>.png`` the QC figure
(:func:`clinometry.report.figures.qc_figure`).  Every file is written
atomically.
"""

from __future__ import annotations

import logging
import os
import warnings
from pathlib import Path

from ..errors import ClinometryError, FigureWarning
from .atomic import atomic_write, safe_name, same_file
from .tables import HORIZON_COLUMNS, horizon_rows, write_csv

__all__ = ["write_line_files", "check_no_input_replaced"]

logger = logging.getLogger(__name__)


def check_no_input_replaced(targets, inputs) -> None:
    """Refuse to write an output over an input file.

    Parameters
    ----------
    targets : sequence of str or os.PathLike
        The files about to be written.
    inputs : sequence of str or os.PathLike
        Files that must never be replaced (the line's SEG-Y, every input of a batch).

    Raises
    ------
    ClinometryError
        Naming the output, the input it would replace and what to try.

    Examples
    --------
    >>> import tempfile, pathlib
    >>> d = pathlib.Path(tempfile.mkdtemp()); _ = (d / "line.png").write_bytes(b"SEG-Y")
    >>> check_no_input_replaced([d / "line.json", d / "line.png"], [d / "line.png"])
    Traceback (most recent call last):
    ...
    clinometry.errors.ClinometryError: ...line.png: this output would replace the input file ...
    """
    inputs = [os.fspath(i) for i in inputs if i]
    for t in targets:
        if t is not None and os.path.lexists(t) and any(same_file(t, i) for i in inputs):
            raise ClinometryError(f"{t}: this output would replace the input file {t}; write the results to "
                                  "another folder (--out) or rename the input")


def write_line_files(result, out_dir, *, stem, plot=True, section=None, protect=()) -> dict:
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
    protect : sequence of str, optional
        Files that must not be replaced besides the line's own input
        (``result.source["path"]``), e.g. every input of a batch.

    Returns
    -------
    dict
        ``{"json": path, "horizons": path or None, "plot": path or None}``;
        a file that could not be written for lack of input is None and the
        reason is logged at INFO.

    Raises
    ------
    ClinometryError
        When an output would replace an input file (nothing is written).

    Warns
    -----
    FigureWarning
        When the QC figure cannot be drawn: the JSON and the horizons CSV
        are kept, ``paths["plot"]`` is None and ``paths["plot_error"]``
        says why.

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
    targets = [out / f"{stem}.json", out / f"{stem}.horizons.csv", out / f"{stem}.png" if plot else None]
    check_no_input_replaced(targets, [(result.source or {}).get("path"), *protect])
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
            try:
                qc_figure(result, section, target)
            except Exception as err:  # a figure is a view of results already written: never lose them for it
                msg = " ".join(str(err).split()) or type(err).__name__
                warnings.warn(f"{stem}: the QC figure could not be drawn ({type(err).__name__}: {msg}); the "
                              "results JSON and horizons CSV are kept; rerun with --no-plot or report it",
                              FigureWarning, stacklevel=2)
                paths["plot_error"] = f"{type(err).__name__}: {msg}"
            else:
                paths["plot"] = target
    return paths
