"""Analyze many lines: SEG-Y files, folders and globs, every inline of 3D volumes.

Runs on a local process pool over all cores by default, or on a running
Dask cluster with --scheduler tcp://host:port (same results).  Writes into
the output folder
  <stem>.json, <stem>.horizons.csv, <stem>.png   per line (as clinometry analyze)
  margins.csv (and margins.parquet with pyarrow)  one row per margin
  errors.csv                                      one row per failed line
  summary.png                                     slope and relief per family
  map.png                                         break points in x-y (3D volumes)
  index.html                                      review page (open in a browser)
  margins_reviewed.csv, review.csv                with --review: accepted margins and every decision
  margins.geojson (with --crs) or margins_projected.geojson   breaks and toes for GIS
A bad file becomes a row of errors.csv and the batch goes on.  --resume skips
lines whose files are complete and valid.  Exit code 0 when every line was
analysed, 1 when some failed, 2 when nothing could run.

The numbers support interpretation only: do not base drilling or storage
decisions on them alone; follow local regulations and licensed practice.
"""

from __future__ import annotations

import logging
import os
import sys

DESCRIPTION = "analyze many lines (files, folders, globs, 3D inlines) on all cores or a Dask cluster"
EXAMPLE = "clinometry batch survey/*.sgy volume.sgy --inlines 100:300:10 --velocity 2800 --out review/"

__all__ = ["DESCRIPTION", "EXAMPLE", "configure", "run", "add_batch_options", "batch_kwargs", "report"]

logger = logging.getLogger(__name__)


def _positive_int(text):
    import argparse

    try:
        v = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a whole number, got {text!r}") from None
    if v < 1:
        raise argparse.ArgumentTypeError(f"expected 1 or more, got {v}")
    return v


def add_batch_options(parser) -> None:
    """Options shared by ``batch`` and ``demo`` (everything except the inputs)."""
    from ._options import add_analysis_options

    parser.add_argument("--out", required=True, metavar="DIR", help="output folder (created if missing)")
    parser.add_argument("--workers", type=_positive_int, metavar="N",
                        help="local worker processes (default: every core)")
    parser.add_argument("--scheduler", metavar="ADDRESS",
                        help="run on an existing Dask cluster, e.g. tcp://10.0.0.5:8786 (needs dask.distributed)")
    parser.add_argument("--resume", action="store_true",
                        help="skip lines whose JSON, horizons CSV and PNG are complete and valid")
    add_analysis_options(parser)
    parser.add_argument("--no-plot", action="store_true", help="no QC, summary or map figures")
    parser.add_argument("--quiet", action="store_true", help="no progress bar")
    parser.add_argument("--review", metavar="REVIEW.csv",
                        help="decisions exported from index.html (accept / reject / needs-work and notes): writes "
                        "margins_reviewed.csv with the accepted margins and marks the figures; decisions are kept "
                        "in DIR/review.csv for later runs")
    parser.add_argument("--crs", metavar="EPSG:NNNN",
                        help="the survey's projected coordinate reference system: breaks and toes are written as "
                        "GeoJSON in WGS 84 longitude/latitude (RFC 7946, margins.geojson; needs pyproj); without "
                        "it in projected x/y (margins_projected.geojson)")


def configure(parser) -> None:
    """Add the options of ``clinometry batch`` to ``parser``."""
    parser.add_argument("paths", nargs="+", metavar="PATH", help="SEG-Y files, folders or glob patterns")
    parser.add_argument("--inlines", metavar="all|A:B:STEP",
                        help="inlines of 3D volumes to analyze (default: all)")
    parser.add_argument("--crosslines", metavar="all|A:B:STEP",
                        help="crosslines of 3D volumes to analyze (default: none)")
    add_batch_options(parser)


def batch_kwargs(args) -> dict:
    """How to run the batch (not how to analyse a line) from parsed options: keywords of run_batch."""
    return dict(workers=args.workers, scheduler=args.scheduler, resume=args.resume, plot=not args.no_plot,
                quiet=args.quiet, review=getattr(args, "review", None), crs=getattr(args, "crs", None))


def report(summary) -> int:
    """Print what a batch did (stdout; failures also on stderr) and return the exit code."""
    failed = summary.n_failed + summary.n_problems
    print(
        f"{summary.n_tasks} line(s): {summary.n_ok} analysed, {summary.n_skipped} already complete, "
        f"{summary.n_failed} failed; {summary.n_problems} input(s) unusable; "
        f"{summary.n_margins} margin(s) in {summary.files.get('margins_csv')}"
    )
    print(f"review page: {summary.files.get('index_html')}")
    if summary.files.get("geojson"):
        geo = summary.files["geojson"]
        kind = ("WGS 84 longitude/latitude" if os.path.basename(geo) == "margins.geojson"
                else "projected survey x/y, not RFC 7946: give --crs EPSG:NNNN for longitude/latitude")
        print(f"breaks and toes for GIS: {geo} ({kind})")
    for line in _default_velocity_lines(summary):
        print(line)
    if summary.review:
        counts = ", ".join(f"{v} {k}" for k, v in summary.review.items())
        print(f"review: {counts}; accepted margins in {summary.files.get('margins_reviewed_csv')}")
    code = summary.exit_code
    if code == 2:
        print(f"clinometry: error: nothing could run; see {summary.files.get('errors_csv')}", file=sys.stderr)
        for e in list(summary.errors)[:_FIRST_REASONS]:
            name = os.path.basename(str(e.get("file") or ""))
            where = " ".join(s for s in (name, str(e.get("line") or "")) if s)
            msg = " ".join(str(e.get("message") or "").split())
            print(f"  {msg}" if not name or name in msg else f"  {where}: {msg}", file=sys.stderr)
        if len(summary.errors) > _FIRST_REASONS:
            print(f"  ... {len(summary.errors) - _FIRST_REASONS} more in errors.csv", file=sys.stderr)
    elif code == 1:
        print(f"clinometry: {failed} line(s) or input(s) failed; see {summary.files.get('errors_csv')}",
              file=sys.stderr)
    return code


#: reasons printed on stderr when nothing could run (the rest are in errors.csv)
_FIRST_REASONS = 3


def _default_velocity_lines(summary):
    """The console's flag for lines converted with the package default velocity (none given)."""
    from ..depth import DEFAULT_VELOCITY_M_S

    flagged = list(summary.default_velocity)
    if not flagged:
        return []
    names = ", ".join(flagged[:5]) + (f" and {len(flagged) - 5} more" if len(flagged) > 5 else "")
    return [f"default velocity: {len(flagged)} line(s) converted at {DEFAULT_VELOCITY_M_S:g} m/s because no velocity "
            f"was given ({names}); their depths are approximate; give --velocity, --velocity-linear or "
            "--velocity-file"]


def run(args) -> int:
    """Run ``clinometry batch``; exit code 0 all done, 1 some failed, 2 nothing ran."""
    from ..batch import run_batch
    from ._options import analysis_options

    summary = run_batch(args.paths, args.out, analysis_options(args), inlines=args.inlines,
                        crosslines=args.crosslines, **batch_kwargs(args))
    return report(summary)
