"""Make the README's two pictures of the review loop from the demo data.

Usage::

    python scripts/make_review_figures.py [--out DIR] [--docs docs]

Runs ``clinometry demo`` into DIR (default: a temporary folder), writes a
small ``review.csv`` of invented decisions on three of its margins (accept,
needs-work, reject, with notes), runs the demo again with ``--resume
--review`` so the page, figures and ``margins_reviewed.csv`` carry them,
then screenshots ``index.html`` (sorted by review state) in headless Chromium
(``scripts/render_index.py``) into ``docs/review_page.png`` and copies the
QC figure of ``rimmed_shelf`` into ``docs/qc_figure.png``.  The demo lines
are invented forward-model scenarios: no real place.
"""

from __future__ import annotations

import argparse
import csv
import importlib.util
import shutil
import subprocess
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]

#: invented decisions on demo margins: stem -> (decision, note)
DECISIONS = {
    "rimmed_shelf": ("accept", "rim and toe clear on the section"),
    "gentle_ramp": ("needs-work", "break on a very gentle bend: check against the clinoforms"),
    "curved_margin_cube_il100": ("reject", "profile follows the edge of the cube"),
}


def _render():
    spec = importlib.util.spec_from_file_location("render_index", ROOT / "scripts" / "render_index.py")
    mod = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(mod)
    return mod


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--out", help="demo output folder (default: a temporary folder)")
    ap.add_argument("--docs", default=str(ROOT / "docs"), help="where the two PNGs go (default: %(default)s)")
    args = ap.parse_args(argv)
    out = Path(args.out or tempfile.mkdtemp(prefix="clinometry-demo-"))
    demo = [sys.executable, "-m", "clinometry", "demo", "--out", str(out), "--quiet"]
    subprocess.run(demo, check=True)
    with open(out / "margins.csv", newline="", encoding="utf-8") as fh:
        margins = list(csv.DictReader(fh))
    rows = []
    for m in margins:
        if m["stem"] in DECISIONS and not any(r["stem"] == m["stem"] for r in rows):
            decision, note = DECISIONS[m["stem"]]
            rows.append({"file": Path(m["file"]).name, "line": m["line"], "direction": m["direction"],
                         "decision": decision, "note": note, "reviewer": "demo reviewer",
                         "time": "2026-12-04T09:00:00.000Z", "stem": m["stem"], "break_trace": m["break_trace"],
                         "break_depth_m": m["break_depth_m"], "toe_trace": m["toe_trace"],
                         "toe_depth_m": m["toe_depth_m"]})
    review = out / "demo_review.csv"
    with open(review, "w", newline="", encoding="utf-8") as fh:
        w = csv.DictWriter(fh, fieldnames=list(rows[0]))
        w.writeheader()
        w.writerows(rows)
    subprocess.run(demo + ["--resume", "--review", str(review)], check=True)
    docs = Path(args.docs)
    docs.mkdir(parents=True, exist_ok=True)
    _render().render(out / "index.html", docs / "review_page.png", width=1500, height=1000,
                     fragment="sort=review_status")
    shutil.copyfile(out / "rimmed_shelf.png", docs / "qc_figure.png")
    print(docs / "review_page.png")
    print(docs / "qc_figure.png")
    return 0


if __name__ == "__main__":
    sys.exit(main())
