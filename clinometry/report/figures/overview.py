"""The figures of a whole run: the summary and the map of a batch.

* :func:`summary_figure`, one per batch: distributions of maximum slope and
  relief per margin family (points are margins, bar is the median).
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

import numpy as np

from ._style import _FONT_SIZE, FAMILY_COLORS, _figure, _save

__all__ = ["summary_figure", "map_figure"]

logger = logging.getLogger(__name__)


def _family_values(rows, key):
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
            out.setdefault(r.get("family") or None, []).append(v)
    return out


def summary_figure(rows, path, *, title="Margins of this run"):
    """Distributions of maximum slope and relief per margin family (PNG).

    Parameters
    ----------
    rows : list of dict
        Rows of the margins table (:func:`clinometry.report.tables.margin_rows`).
    path : str or os.PathLike
        Output PNG.
    title : str

    Returns
    -------
    pathlib.Path
    """
    fig = _figure((11.0, 4.2))
    axes = fig.subplots(1, 2)
    order = ["ramp", "rimmed_shelf", "steep_margin", None]
    for ax, key, label in ((axes[0], "slope_max_deg", "maximum slope (°)"), (axes[1], "relief_m", "relief (m)")):
        vals = _family_values(rows, key)
        fams = [f for f in order if f in vals]
        if not fams:
            ax.text(0.5, 0.5, f"no {label} measured", ha="center", va="center", transform=ax.transAxes)
        for j, f in enumerate(fams):
            v = np.asarray(vals[f])
            color = FAMILY_COLORS.get(f, FAMILY_COLORS[None])
            if v.size >= 3:
                parts = ax.violinplot([v], positions=[j], widths=0.7, showextrema=False)
                for b in parts["bodies"]:
                    b.set_facecolor(color)
                    b.set_alpha(0.35)
            jitter = np.random.default_rng(j).uniform(-0.12, 0.12, v.size)  # seeded: same figure every run
            ax.scatter(j + jitter, v, color=color, s=16, edgecolor="black", linewidth=0.3, zorder=3)
            ax.hlines(np.median(v), j - 0.3, j + 0.3, color="black", lw=1.5, zorder=4)
        ax.set_xticks(range(len(fams)))
        ax.set_xticklabels([f"{f or 'unclassified'}\n(n={len(vals[f])})" for f in fams], fontsize=_FONT_SIZE)
        ax.set_ylabel(label, fontsize=_FONT_SIZE)
        ax.set_xlabel("margin family", fontsize=_FONT_SIZE)
        ax.set_xlim(-0.6, max(len(fams), 1) - 0.4)
        ax.grid(axis="y", alpha=0.3)
    fig.suptitle(f"{title}: points are margins, bar is the median", fontsize=10)
    fig.tight_layout()
    return _save(fig, path)


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
        pts.append((x, y, float(d) if d not in (None, "") else np.nan, r.get("family") or None))
    if not pts:
        return None
    from matplotlib.lines import Line2D

    x = np.array([p[0] for p in pts])
    y = np.array([p[1] for p in pts])
    dep = np.array([p[2] for p in pts])
    fam = [p[3] for p in pts]
    fig = _figure((12.0, 5.2))
    axes = fig.subplots(1, 2)
    for f in ["ramp", "rimmed_shelf", "steep_margin", None]:
        sel = np.array([g == f for g in fam])
        if sel.any():
            axes[0].scatter(x[sel], y[sel], color=FAMILY_COLORS[f], s=28, edgecolor="black", linewidth=0.3,
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
    fig.tight_layout()
    return _save(fig, path)
