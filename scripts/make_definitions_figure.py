"""Draw the figure of README section "How the numbers are defined".

It grows the bundled ``rimmed_shelf`` scenario with the forward model, draws
its stratal surfaces in depth (no vertical exaggeration hidden: it is stated)
and marks the quantities clinometry reports, taken from the scenario's truth
file: platform top, shelf break, toe of slope, relief, foreset width, maximum
and mean slope, the clinoform breaks and the shelf-break trajectory.

Usage::

    python scripts/make_definitions_figure.py [--out docs/definitions.png]
"""

from __future__ import annotations

import argparse
import json
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--out", default=str(ROOT / "docs" / "definitions.png"))
    args = ap.parse_args(argv)

    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    from clinometry.synth import grown_surfaces

    truth = json.loads((ROOT / "synthetic_volumes" / "rimmed_shelf.truth.json").read_text())
    m = truth["margins"][0]
    depths = grown_surfaces("rimmed_shelf")
    dx = truth["trace_spacing_m"]
    dist = np.arange(depths.shape[1]) * dx

    # Okabe & Ito (2008) colour-blind-safe palette
    blue, orange, green, verm, purple, grey = "#0072B2", "#E69F00", "#009E73", "#D55E00", "#CC79A7", "#7f7f7f"
    fig, ax = plt.subplots(figsize=(10, 4.6), dpi=120)
    for k in range(1, depths.shape[0] - 1, 4):
        ax.plot(dist / 1000, depths[k], color=grey, lw=0.6, alpha=0.7)
    ax.plot(dist / 1000, depths[-1], color="k", lw=1.8, label="margin profile (youngest surface)")
    b, t = m["break"], m["toe"]
    ax.plot(b["distance_m"] / 1000, b["depth_m"], "^", color=verm, ms=11, label="shelf break (max convex-up curvature)")
    ax.plot(t["distance_m"] / 1000, t["depth_m"], "v", color=blue, ms=11, label="toe of slope (max concave-up curvature)")
    cb = [c["break"] for c in m["clinoforms"] if c.get("break")]
    if cb:
        ax.plot([p["distance_m"] / 1000 for p in cb], [p["depth_m"] for p in cb], "o-", color=orange, ms=4, lw=1,
                label=f"clinoform breaks: trajectory {m['trajectory']['class']} ({m['trajectory']['angle_deg']:.1f} deg)")
    # relief and width
    xr = t["distance_m"] / 1000 + 0.15
    ax.annotate("", (xr, b["depth_m"]), (xr, t["depth_m"]), arrowprops=dict(arrowstyle="<->", color=green, lw=1.5))
    ax.text(xr + 0.05, 0.5 * (b["depth_m"] + t["depth_m"]), f"relief\n{m['relief_m']:.0f} m", color=green, va="center")
    yw = t["depth_m"] + 35
    ax.annotate("", (b["distance_m"] / 1000, yw), (t["distance_m"] / 1000, yw), arrowprops=dict(arrowstyle="<->", color=purple, lw=1.5))
    ax.text(0.5 * (b["distance_m"] + t["distance_m"]) / 1000, yw + 12,
            f"foreset width {t['distance_m'] - b['distance_m']:.0f} m", color=purple, ha="center", va="top")
    ax.plot([b["distance_m"] / 1000, t["distance_m"] / 1000], [b["depth_m"], t["depth_m"]], "--", color=green, lw=1)
    ax.text(0.5 * (b["distance_m"] + t["distance_m"]) / 1000 - 0.15, 0.5 * (b["depth_m"] + t["depth_m"]) - 20,
            f"mean slope {m['slope_mean_deg']:.1f} deg\nmax slope {m['slope_max_deg']:.1f} deg", ha="right", color=green)
    ax.text(0.2, m["platform_top"]["depth_m"] - 6, "platform top", color="k", va="bottom")
    ax.set_xlabel("distance along line (km)")
    ax.set_ylabel("depth below datum (m)")
    ax.set_ylim(np.nanmax(depths) + 70, np.nanmin(depths) - 30)
    ve = (dist[-1] / 1000 * 1000 / (np.nanmax(depths) - np.nanmin(depths))) * (fig.get_size_inches()[1] / fig.get_size_inches()[0])
    ax.set_title(f"How the numbers are defined (invented scenario 'rimmed_shelf'; vertical exaggeration about {ve:.1f}x)", fontsize=10)
    ax.legend(loc="lower left", fontsize=8, framealpha=0.9)
    fig.tight_layout()
    Path(args.out).parent.mkdir(parents=True, exist_ok=True)
    fig.savefig(args.out)
    print(args.out)


if __name__ == "__main__":
    main()
