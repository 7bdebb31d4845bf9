"""Show what to check before trusting a SEG-Y file: counts, sample interval,
format and byte order, 2D/3D geometry and line ranges, coordinate extents and
trace spacing, delay and the textual header.  Only headers are read.
"""

from __future__ import annotations

import json

from ..io import inspect_file

__all__ = ["DESCRIPTION", "EXAMPLE", "configure", "run", "format_report"]

DESCRIPTION = "show the headers, geometry and coordinates of a SEG-Y file"
EXAMPLE = "clinometry inspect line_07.sgy --json"


def configure(parser):
    parser.add_argument("path", metavar="PATH", help="SEG-Y file (opened read-only)")
    parser.add_argument("--json", action="store_true", help="print the report as JSON on stdout")
    parser.add_argument("--domain", choices=("twt", "depth"), default="twt",
                        help="z domain: twt (interval in ms) or depth (interval in m); default twt")
    parser.add_argument("--coordinates", choices=("cdp", "source", "group"), default="cdp",
                        help="trace coordinate pair (CDP X/Y bytes 181/185, source 73/77, group 81/85)")
    parser.add_argument("--no-text", action="store_true", help="leave out the textual header")


def _fmt_range(r):
    return "-" if r is None else f"{r[0]}-{r[1]}"


def format_report(info: dict, *, text: bool = True) -> str:
    """Plain-text report of :func:`clinometry.io.inspect_file` output."""
    u = info["z_units"]
    dz = info["sample_interval"]
    g, c = info["geometry"], info["coordinates"]
    lines = [
        f"file:               {info['path']} ({info['size_bytes']} bytes)",
        f"traces x samples:   {info['n_traces']} x {info['n_samples']}",
        f"sample interval:    {'unknown' if dz is None else f'{dz:g} {u}'} ({info['sample_interval_source']})",
        f"z range:            {info['z_start']:g}"
        + (f" - {info['z_end']:g} {u}" if info["z_end"] is not None else f" {u} (end unknown)")
        + " (starts at the delay recording time)",
        f"sample format:      {info['sample_format']}, {info['byte_order']}-endian",
        f"SEG-Y revision:     {info['segy_revision']}, {info['n_extended_text_headers']} extended textual headers",
        f"geometry:           {g['kind']}",
    ]
    if "inline_range" in g:
        lines.append(f"  inlines:          {_fmt_range(g['inline_range'])} ({g['n_inlines']})")
        lines.append(f"  crosslines:       {_fmt_range(g['crossline_range'])} ({g['n_crosslines']})")
    if "n_missing_traces" in g:
        lines.append(f"  missing traces:   {g['n_missing_traces']}")
    if "cdp_range" in g:
        lines.append(f"  CDP:              {_fmt_range(g['cdp_range'])}")
    if c.get("x_range_m"):
        lines.append(f"coordinates ({c['pair']}, bytes {c['x_byte']}/{c['y_byte']}):")
        lines.append(f"  x:                {c['x_range_m'][0]:.2f} - {c['x_range_m'][1]:.2f} m")
        lines.append(f"  y:                {c['y_range_m'][0]:.2f} - {c['y_range_m'][1]:.2f} m")
        sp = c["trace_spacing_m"]
        lines.append(f"  trace spacing:    {'-' if sp is None else f'{sp:.2f} m'} (median)")
    else:
        lines.append(f"coordinates ({c['pair']}, bytes {c['x_byte']}/{c['y_byte']}): none")
    for n in info["notes"]:
        lines.append(f"note:               {n}")
    for p in info["problems"]:
        lines.append(f"problem:            {p}")
    if text:
        lines.append(f"textual header ({info['text_encoding']}):")
        lines.extend("  " + t for t in (info["text_header"].splitlines() or ["(empty)"]))
    return "\n".join(lines)


def run(args) -> int:
    info = inspect_file(args.path, domain=args.domain, coordinates=args.coordinates)
    if args.no_text:
        info.pop("text_header")
    if args.json:
        print(json.dumps(info, indent=2, ensure_ascii=False))
    else:
        print(format_report(info, text=not args.no_text))
    return 0
