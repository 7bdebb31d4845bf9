"""The QC figure of one line: section with picks, margin depth profiles, text.

The section is drawn in its own domain (time or depth) in grey, so the
coloured picks stand out on it: tracked surfaces, platform top, clinoforms,
shelf-break and toe markers, with the vertical exaggeration stated.  Below
it, per margin, the depth profile with its slope along distance on a twin
axis (break-to-toe shaded), and a text panel with family, confidence,
reasons and key metrics (P10-P90 where the Monte-Carlo uncertainty was
run).  Colours follow the Okabe-Ito palette (see
:mod:`clinometry.report.figures._style`).
"""

from __future__ import annotations

import logging
import os
import textwrap

import numpy as np

from .._text import DEFAULT_VELOCITY_FLAG, user_text, velocity_text
from ..tables import margin_percentile, margin_value
from ._style import (
    literal_text,
    _BREAK_STYLE,
    _FONT_SIZE,
    _REJECTED_STYLE,
    _TEXT_LINE_IN,
    _TOE_STYLE,
    FAMILY_COLORS,
    OKABE_ITO,
    ROLE_STYLES,
    _as_dict,
    _figure,
    _save,
)

__all__ = ["qc_figure", "vertical_exaggeration"]

logger = logging.getLogger(__name__)


def _m_per_z(result, section):
    """Metres of depth per z unit: 1 for depth sections, else from the result's points."""
    if section.attrs.get("domain") == "depth":
        return 1.0
    ratios = []
    for m in result.get("margins", []) or []:
        pts = [m.get("break"), m.get("toe"), m.get("platform_top")]
        pts += [c.get(k) for c in m.get("clinoforms") or [] for k in ("break", "toe")]
        for p in pts:
            if isinstance(p, dict) and p.get("z") and p.get("depth_m") is not None and p["z"] > 0:
                ratios.append(p["depth_m"] / p["z"])
    if ratios:
        return float(np.median(ratios))
    vel = result.get("velocity") or {}
    v = vel.get("velocity_m_s", vel.get("v_m_s"))
    if v:
        return float(v) / 2000.0  # one-way metres per ms TWT: v/2 per s (common practice, no source)
    return None


def vertical_exaggeration(x_span_m, z_span_m, width_in, height_in):
    """Vertical exaggeration of a plot: vertical scale over horizontal scale.

    Parameters
    ----------
    x_span_m, z_span_m : float, m
        Horizontal distance and depth range shown.
    width_in, height_in : float, inch
        Size of the plot area.

    Returns
    -------
    float
        1 means true scale; 5 means one metre of depth is drawn five times
        as long as one metre of distance.

    Notes
    -----
    VE = (height / depth range) / (width / distance range), the ratio of the
    vertical to the horizontal scale (common practice, no source).

    Examples
    --------
    >>> vertical_exaggeration(10000.0, 1000.0, 10.0, 5.0)
    5.0
    """
    return (height_in / z_span_m) / (width_in / x_span_m)


def _horizon_groups(horizons):
    """Rows of a horizons table -> {horizon_id: (role, distance_m, z, depth_m)}."""
    groups = {}
    for r in horizons or []:
        hid = r.get("horizon_id")
        g = groups.setdefault(hid, {"role": r.get("role"), "d": [], "z": [], "depth": []})
        g["d"].append(float(r["distance_m"]) if r.get("distance_m") not in (None, "") else np.nan)
        g["z"].append(float(r["z"]) if r.get("z") not in (None, "") else np.nan)
        g["depth"].append(float(r["depth_m"]) if r.get("depth_m") not in (None, "") else np.nan)
    return groups


def _rows_from_picks(picks, section):
    """Horizon rows (distance_m, z, role; no depth) straight from a Picks record."""
    if picks is None or not getattr(picks, "horizons", None):
        return []
    dist = np.asarray(section["distance"].values, dtype=float)
    rows = []
    for h in picks.horizons:
        t = np.asarray(h.trace, dtype=int)
        ok = (t >= 0) & (t < dist.size)
        for ti, zi in zip(t[ok], np.asarray(h.z, dtype=float)[ok]):
            rows.append({"horizon_id": h.id, "role": h.role, "distance_m": dist[ti], "z": zi, "depth_m": None})
    return rows


def _margin_profile(margin, groups):
    """Depth profile of a margin: (distance_m, depth_m, slope_deg) or None."""
    prof = margin.get("profile") or {}
    d = prof.get("distance_m")
    z = prof.get("depth_m")
    if d is not None and z is not None and len(d) > 2:
        d = np.asarray(d, dtype=float)
        z = np.asarray(z, dtype=float)
        s = prof.get("slope_deg")
        s = np.asarray(s, dtype=float) if s is not None and len(s) == len(d) else None
    else:
        cand = [g for g in groups.values() if g["role"] == "margin_profile"]
        if not cand:
            return None
        # the margin profile nearest to this margin's break, else the longest
        brk = margin.get("break") or {}
        if brk.get("distance_m") is not None and len(cand) > 1:
            cand.sort(key=lambda g: np.nanmin(np.abs(np.asarray(g["d"]) - brk["distance_m"])))
        else:
            cand.sort(key=lambda g: -len(g["d"]))
        d = np.asarray(cand[0]["d"], dtype=float)
        z = np.asarray(cand[0]["depth"], dtype=float)
        s = None
    ok = np.isfinite(d) & np.isfinite(z)
    if ok.sum() < 3:
        return None
    d, z = d[ok], z[ok]
    if s is not None:
        s = s[ok]
    else:
        # apparent slope along the line from the depth profile: atan(dz/dx)
        # (common practice, no source)
        s = np.degrees(np.arctan(np.abs(np.gradient(z, d))))
    return d, z, s


def _fmt(v, unit="", digits=1):
    if v is None:
        return "n/a"
    try:
        return f"{float(v):.{digits}f}{unit}"
    except (TypeError, ValueError):
        return str(v)


def _metric_line(margin, key, label, unit, digits=1):
    v = margin_value(margin, key)
    p10, p90 = margin_percentile(margin, key, "p10"), margin_percentile(margin, key, "p90")
    text = f"{label}: {_fmt(v, unit, digits)}"
    if p10 is not None and p90 is not None:
        text += f"  (P10-P90 {_fmt(p10, '', digits)}-{_fmt(p90, unit, digits)})"
    return text


def _wrapped(text, width, first="  - ", rest="    "):
    return textwrap.wrap(user_text(text), width, initial_indent=first, subsequent_indent=rest) or [first.rstrip()]


def _margin_text(margin, number=1, width=56):
    """The lines of a margin's text panel: every reason and every missing value, wrapped (never cut)."""
    fam = margin.get("family") or "unclassified"
    sub = margin.get("subtype")
    conf = margin.get("confidence")
    direction = "increasing" if margin.get("direction") == "+" else "decreasing"
    lines = [
        f"Margin {number}: basin towards {direction} trace numbers",
        f"Family: {fam}" + (f" ({sub})" if sub else "") + f"   confidence {_fmt(conf, '', 2)}",
        _metric_line(margin, "slope_max_deg", "Max slope", "°"),
        _metric_line(margin, "slope_mean_deg", "Mean slope", "°"),
        _metric_line(margin, "relief_m", "Relief", " m", 0),
        _metric_line(margin, "break_depth_m", "Break depth", " m", 0),
    ]
    traj = margin.get("trajectory") or {}
    if traj:
        lines.append(f"Break trajectory: {traj.get('class', 'n/a')}, {_fmt(traj.get('angle_deg'), '°')}")
    else:
        lines.append("Break trajectory: n/a")
    reasons = list(margin.get("reasons") or [])
    if reasons:
        lines.append("Reasons:")
        for r in reasons:
            lines.extend(_wrapped(r, width))
    missing = margin.get("missing") or {}
    if isinstance(missing, dict) and missing:
        lines.append("Not measured:")
        same_reason = {}  # values missing for one reason are listed together, the reason once
        for k, why in missing.items():
            same_reason.setdefault(str(why), []).append(str(k))
        for why, keys in same_reason.items():
            lines.extend(_wrapped(f"{', '.join(keys)}: {why}", width))
    return lines


def _rejected(res):
    """The candidates the picker dropped, from the results (``run.rejected_candidates``)."""
    items = (res.get("run") or {}).get("rejected_candidates") or []
    return [c for c in items if isinstance(c, dict) and (c.get("profile") or {}).get("trace")]


def _draw_rejected(ax, rejected, dist_km):
    """Draw each dropped candidate's profile on the section, labelled C1, C2, ... at its steepest point."""
    from matplotlib import patheffects

    for k, c in enumerate(rejected, start=1):
        t = np.asarray(c["profile"]["trace"], dtype=int)
        z = np.asarray([np.nan if v is None else v for v in c["profile"]["z"]], dtype=float)
        ok = (t >= 0) & (t < dist_km.size)
        ax.plot(dist_km[t[ok]], z[ok], **_REJECTED_STYLE,
                path_effects=[patheffects.withStroke(linewidth=3.2, foreground="white")])
        st = c.get("steepest") or {}
        if st.get("trace") is not None and 0 <= st["trace"] < dist_km.size and st.get("z") is not None:
            x, y = dist_km[st["trace"]], st["z"]
            ax.scatter([x], [y], marker="X", s=60, color=_REJECTED_STYLE["color"], edgecolor="white",
                       linewidth=0.8, zorder=7)
            ax.annotate(f"C{k}", (x, y), xytext=(6, -10), textcoords="offset points", fontsize=8.5,
                        fontweight="bold", color=_REJECTED_STYLE["color"],
                        bbox=dict(boxstyle="round,pad=0.15", fc="white", ec="none", alpha=0.85), zorder=8)


def _rejected_lines(rejected, dist_km, width):
    """One wrapped entry per dropped candidate: where it was, its confidence and why it was dropped."""
    lines = []
    for k, c in enumerate(rejected, start=1):
        st = c.get("steepest") or {}
        where = ""
        if st.get("trace") is not None and 0 <= st["trace"] < dist_km.size:
            where = f" at {dist_km[st['trace']]:.2f} km (trace {st['trace']})"
        side = "increasing" if c.get("direction") == "+" else "decreasing"
        head = (f"C{k}{where}, basin towards {side} traces, confidence {_fmt(c.get('confidence'), '', 2)}: "
                f"dropped because {c.get('reason') or 'no reason given'}")
        lines.extend(_wrapped(head, width, first="", rest="    "))
    return lines


def qc_figure(result, section, path, *, horizons=None, title=None):
    """Draw the QC figure of one line and write it as PNG (atomically).

    Parameters
    ----------
    result : Result or dict
        The result of the line (JSON contract).
    section : xarray.DataArray, dims ("trace", "z")
        The section the result was computed on (ms TWT or m depth).
    path : str or os.PathLike
        Output PNG.
    horizons : list of dict, optional
        Rows of the horizons table (``horizon_id, role, trace, distance_m,
        x, y, z, depth_m, quality``) drawn on the section.  Default: the
        horizons of ``result.picks`` when ``result`` is a Result.
    title : str, optional
        Default: the source file name and line label.

    Returns
    -------
    pathlib.Path

    Notes
    -----
    The vertical exaggeration is the ratio of vertical to horizontal scale
    (common practice, no source); for time sections it is computed after
    converting the time range to depth with the run's velocity and said to
    be approximate.
    """
    from matplotlib.lines import Line2D
    from matplotlib.patches import Rectangle

    res = _as_dict(result)
    margins = list(res.get("margins", []) or [])
    if horizons is None:
        horizons = _rows_from_picks(getattr(result, "picks", None), section)
    groups = _horizon_groups(horizons)
    domain = section.attrs.get("domain", "twt")
    zunit = "ms TWT" if domain == "twt" else "m"
    dist_km = np.asarray(section["distance"].values, dtype=float) / 1000.0
    z = np.asarray(section["z"].values, dtype=float)
    data = np.asarray(section.values, dtype=float)
    finite = data[np.isfinite(data)]
    clip = float(np.percentile(np.abs(finite), 98)) if finite.size else 1.0
    clip = clip if clip > 0 else 1.0

    rejected = _rejected(res)
    texts = [_margin_text(m, i + 1) for i, m in enumerate(margins)]
    if not margins:
        run = res.get("run") or {}
        general = [n for n in (run.get("notes") or []) if "dropped:" not in str(n)]
        texts = [["No margin on this line."]
                 + [w for n in general for w in _wrapped(n, 150, first="", rest="    ")]
                 + ([""] + ["Candidates considered and dropped (drawn on the section as C1, C2, ...):"]
                    + _rejected_lines(rejected, dist_km, 150) if rejected else
                    ["", "The picker reported no candidate that came close to a margin."])]
    # each lower row is as tall as its text needs (every reason is shown, wrapped), at least 2.9 in; the
    # gaps between rows (titles, axis labels) are fixed in inches, so a long text panel never runs into
    # the row below it
    row_in = [max(2.9, _TEXT_LINE_IN * (len(t) + 1)) for t in texts]
    heights = [4.8 * 0.62] + row_in
    gap_in, top_in, bottom_in = 1.1, 0.55, 0.45
    fig_h = sum(heights) + gap_in * (len(heights) - 1) + top_in + bottom_in
    fig = _figure((13.0, fig_h))
    gs = fig.add_gridspec(len(heights), 2, width_ratios=[2.4, 1.0], height_ratios=heights,
                          hspace=gap_in / float(np.mean(heights)), wspace=0.06, left=0.07, right=0.97,
                          top=1.0 - top_in / fig_h, bottom=bottom_in / fig_h)
    ax = fig.add_subplot(gs[0, 0])
    lax = fig.add_subplot(gs[0, 1])  # legend and notes beside the section
    lax.axis("off")
    ax.imshow(data.T, cmap="gray_r", vmin=-clip, vmax=clip, aspect="auto", interpolation="bilinear",
              extent=[dist_km[0], dist_km[-1], z[-1], z[0]])
    handles = []
    seen_roles = set()
    for g in groups.values():
        color, lw, label = ROLE_STYLES.get(g["role"], ROLE_STYLES["reflector"])
        ax.plot(np.asarray(g["d"]) / 1000.0, g["z"], color=color, lw=lw, zorder=3 if g["role"] != "reflector" else 2)
        if g["role"] not in seen_roles:
            seen_roles.add(g["role"])
            handles.append(Line2D([], [], color=color, lw=max(lw, 1.2), label=label))
    for k, m in enumerate(margins, start=1):
        brk = m.get("break")
        if len(margins) > 1 and isinstance(brk, dict) and brk.get("distance_m") is not None and brk.get("z") is not None:
            ax.annotate(f"M{k}", (brk["distance_m"] / 1000.0, brk["z"]), xytext=(0, 12), textcoords="offset points",
                        ha="center", fontsize=9, fontweight="bold", color=OKABE_ITO["vermillion"],
                        bbox=dict(boxstyle="round,pad=0.15", fc="white", ec="none", alpha=0.8))
        for key, style in (("break", _BREAK_STYLE), ("toe", _TOE_STYLE)):
            clino = [c.get(key) for c in m.get("clinoforms") or []]
            for pts, size in (([m.get(key)], style["s"]), (clino, 30)):
                pts = [p for p in pts if isinstance(p, dict) and p.get("distance_m") is not None
                       and p.get("z") is not None]
                if pts:
                    ax.scatter([p["distance_m"] / 1000.0 for p in pts], [p["z"] for p in pts],
                               **{**style, "s": size})
        for lab, style, size in (("shelf break", _BREAK_STYLE, 9), ("toe of slope", _TOE_STYLE, 9),
                                 ("clinoform break / toe", _BREAK_STYLE, 5)):
            if lab not in seen_roles and (size == 9 or any(m.get("clinoforms") for m in margins)):
                seen_roles.add(lab)
                handles.append(Line2D([], [], linestyle="none", marker=style["marker"], color=style["color"],
                                      markeredgecolor="white", markersize=size, label=lab))
    if rejected:
        _draw_rejected(ax, rejected, dist_km)
        handles.append(Line2D([], [], marker="X", markeredgecolor="white", markersize=8, label="dropped candidate (C1, ...)",
                              **{k: v for k, v in _REJECTED_STYLE.items() if k in ("color", "ls", "lw")}))
    ax.set_xlim(dist_km[0], dist_km[-1])
    ax.set_ylim(z[-1], z[0])
    ax.set_xlabel("distance along line (km)", fontsize=_FONT_SIZE)
    ax.set_ylabel(f"{'two-way time' if domain == 'twt' else 'depth'} ({zunit})", fontsize=_FONT_SIZE)
    ax.tick_params(labelsize=_FONT_SIZE)
    if handles:
        lax.legend(handles=handles, loc="upper left", fontsize=8.5, frameon=False, title="on the section",
                   title_fontsize=9, alignment="left")

    # vertical exaggeration of the section panel
    literal_text(fig)
    fig.canvas.draw()
    bbox = ax.get_window_extent().transformed(fig.dpi_scale_trans.inverted())
    m_per_z = _m_per_z(res, section)
    x_span = (dist_km[-1] - dist_km[0]) * 1000.0
    if m_per_z and x_span > 0:
        ve = vertical_exaggeration(x_span, (z[-1] - z[0]) * m_per_z, bbox.width, bbox.height)
        ve_text = f"vertical exaggeration {'≈ ' if domain == 'twt' else ''}{ve:.1f}×"
        if domain == "twt":
            ve_text += f" (time converted at {m_per_z * 2000:.0f} m/s mean)"
    else:
        ve_text = "vertical exaggeration unknown (no velocity for this time section)"
    src = res.get("source") or {}
    base = os.path.basename(str(src.get("path") or section.attrs.get("source_path", "") or "section"))
    name = title or " ".join(s for s in (base, str(src.get("line_label") or "")) if s)
    vel = res.get("velocity") or {}
    if vel.get("default_fallback"):
        name += f"   [{DEFAULT_VELOCITY_FLAG}]"
    ax.set_title(f"{name}\n{ve_text}", fontsize=10, loc="left")
    notes = [velocity_text(vel)]
    notes += [f"fallback: {user_text(f)}" for f in ((res.get("run") or {}).get("fallbacks") or [])
              if "no velocity given" not in str(f)]
    notes.append("Automatic picks: check them against the section before use.")
    lax.text(0.0, 0.0, "\n".join(textwrap.fill(n, 52, subsequent_indent="  ") for n in notes), va="bottom",
             ha="left", fontsize=7.6, transform=lax.transAxes)

    if not margins:
        tax = fig.add_subplot(gs[1, :])
        tax.axis("off")
        tax.text(0.0, 1.0, "\n".join(texts[0]), va="top", fontsize=_FONT_SIZE, transform=tax.transAxes,
                 linespacing=1.25)
    for i, m in enumerate(margins):
        pax = fig.add_subplot(gs[1 + i, 0])
        color = FAMILY_COLORS.get(m.get("family"), FAMILY_COLORS[None])
        prof = _margin_profile(m, groups)
        if prof is None:
            pax.text(0.5, 0.5, "no depth profile for this margin", ha="center", va="center", transform=pax.transAxes)
            pax.set_xlabel("distance along line (km)", fontsize=_FONT_SIZE)
            pax.set_ylabel("depth (m)", fontsize=_FONT_SIZE)
        else:
            d, dep, slope = prof
            pax.plot(d / 1000.0, dep, color=ROLE_STYLES["margin_profile"][0], lw=2.0, label="margin depth")
            pax.invert_yaxis()
            pax.set_xlim(dist_km[0], dist_km[-1])  # same distance axis as the section above
            pax.set_xlabel("distance along line (km)", fontsize=_FONT_SIZE)
            pax.set_ylabel("depth (m)", fontsize=_FONT_SIZE)
            for key, style in (("break", _BREAK_STYLE), ("toe", _TOE_STYLE)):
                p = m.get(key)
                if isinstance(p, dict) and p.get("distance_m") is not None and p.get("depth_m") is not None:
                    pax.scatter([p["distance_m"] / 1000.0], [p["depth_m"]], **style)
            sax = pax.twinx()
            sax.plot(d / 1000.0, slope, color=OKABE_ITO["black"], lw=0.9, ls="--", label="slope")
            sax.set_ylabel("slope along line (°)", fontsize=_FONT_SIZE)
            sax.tick_params(labelsize=_FONT_SIZE, axis="y")
            sax.set_ylim(0, max(5.0, float(np.nanmax(slope)) * 1.15 if np.isfinite(slope).any() else 5.0))
            brk, toe = m.get("break") or {}, m.get("toe") or {}
            if brk.get("distance_m") is not None and toe.get("distance_m") is not None:
                lo, hi = sorted((brk["distance_m"] / 1000.0, toe["distance_m"] / 1000.0))
                pax.axvspan(lo, hi, color="#dddddd", zorder=0, lw=0)
            label = f"Margin {i + 1}: " if len(margins) > 1 else ""
            pax.set_title(f"{label}depth profile (orange, left axis), slope (black dashed, right axis); "
                          "grey band: break to toe", fontsize=_FONT_SIZE, loc="left")
        pax.tick_params(labelsize=_FONT_SIZE)
        tax = fig.add_subplot(gs[1 + i, 1])
        tax.axis("off")
        tax.add_patch(Rectangle((0.0, 0.93), 0.04, 0.06, color=color, transform=tax.transAxes, clip_on=False))
        tax.text(0.06, 1.0, "\n".join(texts[i]), va="top", ha="left", fontsize=7.6, family="DejaVu Sans",
                 transform=tax.transAxes, linespacing=1.25)
    return _save(fig, path)
