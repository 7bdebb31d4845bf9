"""The figures of a whole run: the summary and the map of a batch.

* :func:`summary_figure`, one per batch: distributions of maximum slope and
  relief, one panel per margin family on its own scale (points are margins,
  marked by the reviewer's decision when there is one; bar is the median).
* :func:`map_figure`, for 3D volumes: shelf-break points in x-y coloured by
  family and, in a second panel, by break depth, joined in line order, so
  the strike of a margin and changes along it show.

Colours come from the Okabe-Ito palette [1]_ (see
:mod:`clinometry.report.figures._style`).

References
----------
.. [1] Okabe, M. & Ito, K. (2008). Color Universal Design (CUD): how to make
   figures and presentations that are friendly to colorblind people.
   https://jfly.uni-koeln.de/color/ (from memory)
"""

from __future__ import annotations

import logging
import textwrap

import numpy as np

from ._style import _FONT_SIZE, FAMILY_COLORS, REVIEW_MARKERS, _figure, _save

__all__ = ["summary_figure", "map_figure"]

logger = logging.getLogger(__name__)


def _family_values(rows, key):
    """Family -> list of (value, review state) of the rows with a finite ``key``."""
    out = {}
    for r in rows:
        v = r.get(key)
        if v is None or v == "":
            continue
        try:
            v = float(v)
        except (TypeError, ValueError):
            continue
        if np.isfinite(v):
            out.setdefault(r.get("family") or None, []).append((v, str(r.get("review_status") or "")))
    return out


def _review_scatter(ax, x, y, states, color, *, size=22):
    """Points coloured by family, marked by review state (unreviewed: hollow)."""
    x, y, states = np.asarray(x, float), np.asarray(y, float), np.asarray(states, dtype=object)
    for state, (marker, _) in REVIEW_MARKERS.items():
        sel = states == state
        if not sel.any():
            continue
        hollow = state == ""
        ax.scatter(x[sel], y[sel], marker=marker, s=size * (1.6 if state == "rejected" else 1.0),
                   facecolor="white" if hollow else color, edgecolor=color if hollow else "black",
                   linewidth=1.0 if hollow else 0.4, zorder=3)


def _review_legend(fig, rows):
    from matplotlib.lines import Line2D

    present = {str(r.get("review_status") or "") for r in rows}
    if present == {""}:
        return
    handles = [Line2D([], [], ls="none", marker=m, markersize=7, markerfacecolor="white" if s == "" else "#7f7f7f",
                      markeredgecolor="#7f7f7f" if s == "" else "black", label=lab)
               for s, (m, lab) in REVIEW_MARKERS.items() if s in present]
    fig.legend(handles=handles, loc="lower center", ncol=len(handles), fontsize=8, frameon=False,
               title="review decision", title_fontsize=8)


def summary_figure(rows, path, *, title="Margins of this run"):
    """Maximum slope and relief of each margin, one panel per family with its own scale (PNG).

    Parameters
    ----------
    rows : list of dict
        Rows of the margins table (:func:`clinometry.report.tables.margin_rows`),
        optionally with ``review_status`` (see
        :func:`clinometry.report.review.apply_review`): points are then
        marked by the reviewer's decision.
    path : str or os.PathLike
        Output PNG.
    title : str

    Returns
    -------
    pathlib.Path

    Notes
    -----
    Ramps (slopes below about 1 deg) and steep margins (above 30 deg) differ
    by two orders of magnitude, so each family gets its own y axis, from 0
    to a little above its largest value: a ramp's spread stays readable next
    to a steep margin's.
    """
    return _save(summary_axes(rows, title=title), path)


def summary_axes(rows, *, title="Margins of this run"):
    """The summary figure as a matplotlib Figure (not saved); see :func:`summary_figure`."""
    order = ["ramp", "rimmed_shelf", "steep_margin", None]
    keys = (("slope_max_deg", "maximum slope (°)"), ("relief_m", "relief (m)"))
    values = {key: _family_values(rows, key) for key, _ in keys}
    fams = [f for f in order if any(f in values[k] for k, _ in keys)]
    ncol = max(1, len(fams))
    fig = _figure((max(6.0, 3.2 * ncol + 1.0), 7.4))
    axes = np.asarray(fig.subplots(2, ncol, squeeze=False))
    if not fams:
        for ax in axes.ravel():
            ax.text(0.5, 0.5, "no margin measured", ha="center", va="center", transform=ax.transAxes)
            ax.set_axis_off()
    for j, f in enumerate(fams):
        color = FAMILY_COLORS.get(f, FAMILY_COLORS[None])
        for i, (key, label) in enumerate(keys):
            ax = axes[i, j]
            pts = values[key].get(f, [])
            if not pts:
                ax.text(0.5, 0.5, f"no {label} measured", ha="center", va="center", transform=ax.transAxes,
                        fontsize=_FONT_SIZE)
                ax.set_xticks([])
                continue
            v = np.array([p[0] for p in pts])
            states = [p[1] for p in pts]
            if v.size >= 3 and np.ptp(v) > 0:
                parts = ax.violinplot([v], positions=[0], widths=0.7, showextrema=False)
                for b in parts["bodies"]:
                    b.set_facecolor(color)
                    b.set_alpha(0.3)
            jitter = np.random.default_rng(j).uniform(-0.12, 0.12, v.size)  # seeded: same figure every run
            _review_scatter(ax, jitter, v, states, color)
            ax.hlines(np.median(v), -0.3, 0.3, color="black", lw=1.5, zorder=4)
            top = float(v.max())
            ax.set_ylim(0.0, top * 1.15 if top > 0 else 1.0)
            ax.set_xlim(-0.6, 0.6)
            ax.set_xticks([])
            ax.set_ylabel(label, fontsize=_FONT_SIZE)
            ax.tick_params(labelsize=8)
            ax.grid(axis="y", alpha=0.3)
            if i == 0:
                ax.set_title(f"{f or 'unclassified'} (n={len(pts)})", fontsize=10, color=color,
                             fontweight="bold")
    # wrapped to the figure's width: with one family the figure is 6 in wide, narrower than the title
    head = textwrap.wrap(f"{title}: points are margins, bar is the median; each family on its own scale",
                         int(fig.get_figwidth() * 11))
    fig.suptitle("\n".join(head), fontsize=10)
    _review_legend(fig, rows)
    # the panels start below the title: it hangs from 0.98 of the height, 0.17 in per line
    fig.tight_layout(rect=(0, 0.07, 1, 0.98 - (0.17 * len(head) + 0.06) / fig.get_figheight()))
    return fig


def _break_traces(rows):
    """Break points of each volume and basin side joined in line order (the margin's strike)."""
    groups = {}
    for r in rows:
        try:
            x, y = float(r["break_x"]), float(r["break_y"])
        except (TypeError, ValueError, KeyError):
            continue
        label = str(r.get("line") or "")
        parts = label.split()
        if len(parts) != 2 or not parts[1].lstrip("-").isdigit():
            continue
        groups.setdefault((r.get("file"), parts[0], r.get("direction")), []).append((int(parts[1]), x, y))
    for (_, kind, _), pts in groups.items():
        if len(pts) > 1:
            pts.sort()
            yield [p[1] for p in pts], [p[2] for p in pts], [f"{kind} {p[0]}" for p in pts]


def map_figure(rows, path, *, title="Shelf-break map"):
    """Map of shelf-break points in x-y: by family, and by break depth (PNG).

    Parameters
    ----------
    rows : list of dict
        Rows of the margins table with ``break_x``, ``break_y``,
        ``break_depth_m`` and ``family``.
    path : str or os.PathLike
        Output PNG.
    title : str

    Returns
    -------
    pathlib.Path or None
        None when no row has break coordinates.
    """
    pts = []
    for r in rows:
        try:
            x, y = float(r["break_x"]), float(r["break_y"])
        except (TypeError, ValueError, KeyError):
            continue
        d = r.get("break_depth_m")
        pts.append((x, y, float(d) if d not in (None, "") else np.nan, r.get("family") or None,
                    str(r.get("review_status") or "")))
    if not pts:
        return None
    from matplotlib.lines import Line2D

    x = np.array([p[0] for p in pts])
    y = np.array([p[1] for p in pts])
    dep = np.array([p[2] for p in pts])
    fam = [p[3] for p in pts]
    states = np.array([p[4] for p in pts], dtype=object)
    fig = _figure((12.0, 5.2 + (0.5 if set(states) != {""} else 0.0)))
    axes = fig.subplots(1, 2)
    for f in ["ramp", "rimmed_shelf", "steep_margin", None]:
        sel = np.array([g == f for g in fam])
        if sel.any():
            _review_scatter(axes[0], x[sel], y[sel], states[sel], FAMILY_COLORS[f], size=28)
            axes[0].scatter([], [], color=FAMILY_COLORS[f], s=28, edgecolor="black", linewidth=0.3,
                            label=f or "unclassified")
    for xs, ys, labels in _break_traces(rows):
        for ax in axes:
            ax.plot(xs, ys, color="#7f7f7f", lw=0.8, zorder=1)
        for i in (0, -1):  # name the first and last line of each margin
            axes[0].annotate(labels[i], (xs[i], ys[i]), xytext=(4, 4), textcoords="offset points", fontsize=7)
    axes[0].legend(fontsize=8, title="margin family", title_fontsize=8)
    axes[0].set_title("shelf break by margin family", fontsize=10)
    ok = np.isfinite(dep)
    if ok.any():
        sc = axes[1].scatter(x[ok], y[ok], c=dep[ok], cmap="viridis_r", s=28, edgecolor="black", linewidth=0.3)
        cb = fig.colorbar(sc, ax=axes[1])
        cb.set_label("break depth (m)", fontsize=_FONT_SIZE)
        cb.ax.invert_yaxis()
    if (~ok).any():
        axes[1].scatter(x[~ok], y[~ok], marker="x", color="#7f7f7f", s=20)
        axes[1].legend(handles=[Line2D([], [], marker="x", ls="none", color="#7f7f7f", label="no depth")], fontsize=8)
    axes[1].set_title("shelf break by depth", fontsize=10)
    for ax in axes:
        ax.set_xlabel("x (m)", fontsize=_FONT_SIZE)
        ax.set_aspect("equal", adjustable="datalim")
        ax.ticklabel_format(useOffset=False, style="plain")
        ax.tick_params(labelsize=8)
        ax.grid(alpha=0.3)
    axes[0].set_ylabel("y (m)", fontsize=_FONT_SIZE)
    fig.suptitle(f"{title} (grey lines join the breaks of one margin in line order: its strike)", fontsize=10)
    _review_legend(fig, rows)
    fig.tight_layout(rect=(0, 0.08 if set(states) != {""} else 0, 1, 1))
    return _save(fig, path)
