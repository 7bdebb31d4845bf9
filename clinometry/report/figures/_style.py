"""Shared look of the report figures: palette, marker styles, figure helpers (private).

Colours come from the Okabe-Ito palette, chosen because it stays
distinguishable for the common forms of colour-vision deficiency [1]_.
Figures are matplotlib :class:`~matplotlib.figure.Figure` objects on their
own Agg canvas (no pyplot), so drawing never switches the caller's backend
and works from worker threads.

References
----------
.. [1] Okabe, M. & Ito, K. (2008). Color Universal Design (CUD): how to make
   figures and presentations that are friendly to colorblind people.
   https://jfly.uni-koeln.de/color/ (from memory)
"""

from __future__ import annotations

import io

from ..atomic import atomic_write

__all__ = ["OKABE_ITO", "FAMILY_COLORS", "ROLE_STYLES"]

#: Okabe & Ito (2008) colour-blind-safe palette (from memory)
OKABE_ITO = {
    "black": "#000000",
    "orange": "#E69F00",
    "sky_blue": "#56B4E9",
    "bluish_green": "#009E73",
    "yellow": "#F0E442",
    "blue": "#0072B2",
    "vermillion": "#D55E00",
    "reddish_purple": "#CC79A7",
}

#: colour of each margin family (and of margins without a family)
FAMILY_COLORS = {
    "ramp": OKABE_ITO["bluish_green"],
    "rimmed_shelf": OKABE_ITO["blue"],
    "steep_margin": OKABE_ITO["vermillion"],
    None: "#7f7f7f",
}

#: how each horizon role is drawn on the section: (colour, line width, label)
ROLE_STYLES = {
    "reflector": (OKABE_ITO["sky_blue"], 0.6, "tracked reflector"),
    "margin_profile": (OKABE_ITO["orange"], 2.0, "margin profile"),
    "platform_top": (OKABE_ITO["yellow"], 2.0, "platform top"),
    "clinoform": (OKABE_ITO["reddish_purple"], 1.2, "clinoform"),
    "user": (OKABE_ITO["bluish_green"], 1.5, "interpreter horizon"),
}

_BREAK_STYLE = dict(marker="v", s=90, color=OKABE_ITO["vermillion"], edgecolor="white", linewidth=1.0, zorder=6)
_TOE_STYLE = dict(marker="^", s=90, color=OKABE_ITO["blue"], edgecolor="white", linewidth=1.0, zorder=6)
#: how a candidate the picker dropped is drawn on the section (black dashes on a white halo:
#: every palette colour already names a pick)
_REJECTED_STYLE = dict(color=OKABE_ITO["black"], ls=(0, (4, 2)), lw=1.5, zorder=5)
_FONT_SIZE = 9

#: how each review state is marked in the summary and map figures: (marker, label); the colour stays
#: the family's.  Keys are the states of :data:`clinometry.report.review.REVIEW_STATES`.
REVIEW_MARKERS = {
    "accepted": ("o", "accepted"),
    "needs-work": ("s", "needs work"),
    "rejected": ("X", "rejected"),
    "changed since review": ("D", "changed since review"),
    "": ("o", "not reviewed"),
}
#: height of one line of text in a margin's text panel at 7.6 pt with 1.25 line spacing (inch)
_TEXT_LINE_IN = 0.14


def _as_dict(result):
    return result.to_dict() if hasattr(result, "to_dict") else dict(result)


def literal_text(fig):
    """Switch matplotlib's math text off for every text of ``fig`` (names and messages are shown as written).

    A file name such as ``a$b$.sgy`` would otherwise be parsed as math text
    and could fail to draw; clinometry's own labels use no math text.
    Returns ``fig``.
    """
    from matplotlib.text import Text

    for t in fig.findobj(Text):
        t.set_parse_math(False)
    return fig


def _save(fig, path):
    literal_text(fig)
    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=110)
    return atomic_write(path, buf.getvalue())


def _figure(figsize):
    """A matplotlib Figure on its own Agg canvas.

    pyplot is not used: no global backend switch in the caller's session,
    no figure registry to leak, and figures can be drawn from worker threads
    (a Dask worker runs tasks in threads).
    """
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    fig = Figure(figsize=figsize)
    FigureCanvasAgg(fig)
    return fig
