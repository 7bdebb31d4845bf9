"""Report figures, drawn on a matplotlib Figure with the Agg canvas (never through pyplot).

:func:`qc_figure` (:mod:`clinometry.report.figures.qc`) is the figure of one
line; :func:`summary_figure` and :func:`map_figure`
(:mod:`clinometry.report.figures.overview`) are the figures of a batch.
The palette and marker styles are shared (:mod:`clinometry.report.figures._style`).
matplotlib is imported when a figure is drawn.
"""

from ._style import FAMILY_COLORS, OKABE_ITO, ROLE_STYLES
from .overview import map_figure, summary_figure
from .qc import qc_figure, vertical_exaggeration

__all__ = ["qc_figure", "vertical_exaggeration", "summary_figure", "map_figure", "OKABE_ITO", "FAMILY_COLORS",
           "ROLE_STYLES"]
