"""Preview figure of a synthetic line: section, clinoform surfaces, true break and toe."""

from __future__ import annotations

import numpy as np

__all__ = ["plot_preview"]


def plot_preview(section, truth, path, *, surfaces_z=None, every=5):
    """Save a PNG of a synthetic section with its ground truth drawn on it.

    Parameters
    ----------
    section : xarray.DataArray, dims ("trace", "z")
    truth : dict
        From :func:`clinometry.synth.make_line`.
    path : str or Path
        Output PNG.
    surfaces_z : ndarray, shape (n_surf, n_trace), optional
        Stratal surfaces in the section's z units (drawn thin, every
        ``every``-th one).
    every : int

    Returns
    -------
    Path
    """
    from pathlib import Path

    from matplotlib.figure import Figure  # no pyplot: leaves the caller's backend alone

    amp = section.transpose("trace", "z").values
    z = section["z"].values
    dist = section["distance"].values / 1000.0
    clip = float(np.percentile(np.abs(amp), 98)) or 1.0
    fig = Figure(figsize=(9, 4.5), dpi=75)
    ax = fig.subplots()
    ax.imshow(amp.T, cmap="gray_r", vmin=-clip, vmax=clip, aspect="auto", interpolation="bilinear",
              extent=[dist[0], dist[-1], z[-1], z[0]])
    if surfaces_z is not None:
        for row in surfaces_z[::every]:
            ax.plot(dist, row, color="tab:cyan", lw=0.3, alpha=0.6)
        ax.plot(dist, surfaces_z[-1], color="tab:cyan", lw=0.8)
    for m in truth.get("margins", []):
        for c in m.get("clinoforms", []):
            ax.plot(c["break"]["distance_m"] / 1000.0, c["break"]["z"], "o", ms=3, color="gold")
            ax.plot(c["toe"]["distance_m"] / 1000.0, c["toe"]["z"], "o", ms=3, color="tab:purple")
        if m.get("break") is None:  # a ramp: no break or toe, its descending span
            sp = m["span"]
            ax.axvspan(sp["distance_from_m"] / 1000.0, sp["distance_to_m"] / 1000.0, color="tab:orange",
                       alpha=0.15, label=f"ramp span ({m['direction']})")
            continue
        ax.plot(m["break"]["distance_m"] / 1000.0, m["break"]["z"], "^", ms=9, color="red",
                label=f"break ({m['direction']})")
        ax.plot(m["toe"]["distance_m"] / 1000.0, m["toe"]["z"], "v", ms=9, color="blue",
                label=f"toe ({m['direction']})")
    ax.set_ylim(z[-1], z[0])
    ax.set_xlabel("distance along line (km)")
    ax.set_ylabel(f"{'two-way time' if section.attrs.get('domain') == 'twt' else 'depth'} "
                  f"({section.attrs.get('units', '')})")
    fams = ", ".join(f"{m['direction']}: {m['family']}, {m['slope_max_deg']:.1f} deg, "
                     f"{(m['trajectory'] or {}).get('class', '-')}" for m in truth.get("margins", []))
    ax.set_title(f"{truth.get('scenario', '')} - synthetic, invented scenario  [{fams or 'no margin'}]",
                 fontsize=9)
    if truth.get("margins"):
        ax.legend(loc="lower left", fontsize=7)
    fig.tight_layout()
    path = Path(path)
    fig.savefig(path, metadata={"Software": None})
    return path
