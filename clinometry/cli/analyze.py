"""Analyze one SEG-Y line: pick the platform top, shelf break and toe, measure
slope, relief and trajectory, and classify each margin.

Writes into the output folder
  <stem>.json            the results contract (schema_version 1)
  <stem>.horizons.csv    the picked (or given) horizons, z and depth
  <stem>.png             a QC plot (unless --no-plot)
and prints one line per margin: direction, family, confidence, slope, relief.

With no velocity option a TWT line is converted with the package's default
constant velocity; the result records that fallback.  The numbers support
interpretation only: do not base drilling or storage decisions on them alone;
follow local regulations and licensed practice.
"""

from __future__ import annotations

import logging
from pathlib import Path

DESCRIPTION = "analyze one line: picks, slope, relief, trajectory and margin family"
EXAMPLE = "clinometry analyze line_07.sgy --velocity 2800 --out results/"

__all__ = ["DESCRIPTION", "EXAMPLE", "CAUTION_LINE", "configure", "run"]

#: printed under every summary with margins (common practice, no source)
CAUTION_LINE = (
    "an interpretation aid: do not base drilling or storage decisions on these numbers alone; "
    "follow local regulations and licensed practice"
)

logger = logging.getLogger(__name__)


def configure(parser) -> None:
    """Add the options of ``clinometry analyze`` to ``parser``."""
    from ._options import add_analysis_options

    parser.add_argument("file", help="SEG-Y file (2D line or 3D volume with --inline/--crossline)")
    line = parser.add_mutually_exclusive_group()
    line.add_argument("--inline", type=int, metavar="N", help="inline number of a 3D volume to analyze")
    line.add_argument("--crossline", type=int, metavar="N", help="crossline number of a 3D volume to analyze")
    add_analysis_options(parser, horizons=True)
    parser.add_argument("--out", required=True, metavar="DIR", help="output folder (created if missing)")
    parser.add_argument("--no-plot", action="store_true", help="do not write the QC plot")


def _stem(args) -> str:
    stem = Path(args.file).stem
    if args.inline is not None:
        stem += f"_il{args.inline}"
    if args.crossline is not None:
        stem += f"_xl{args.crossline}"
    return stem


def run(args) -> int:
    """Run ``clinometry analyze``; 0 when the files were written."""
    from ..pipeline import run_analysis
    from ..report.line_files import write_line_files
    from ._options import analysis_options

    analysis = run_analysis(args.file, analysis_options(args), inline=args.inline, crossline=args.crossline)
    result = analysis.result
    paths = write_line_files(result, args.out, stem=_stem(args), plot=not args.no_plot, section=analysis.section)
    name = Path(args.file).name
    print(f"{name}: {result.n_margins} margin(s); results in {paths['json']}")
    for line in result.summary_lines():
        print(f"  {line}")
    if not result.n_margins:
        for note in result.run.get("notes", [])[-1:]:
            print(f"  {note}")
    for fb in result.run.get("fallbacks", []):
        print(f"  fallback: {fb}")
    if result.n_margins:
        print(f"  caution: {CAUTION_LINE}")
    return 0
