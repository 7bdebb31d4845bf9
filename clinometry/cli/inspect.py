"""Show what to check before trusting a SEG-Y file: counts, sample interval,
format and byte order, 2D/3D geometry and line ranges, coordinate extents and
trace spacing, delay and the textual header.  Only headers are read.
"""

from __future__ import annotations

import json
import re

from ..io import inspect_file

__all__ = ["DESCRIPTION", "EXAMPLE", "configure", "run", "format_report", "text_header_lines"]

#: a card that holds nothing but its own "C nn" label (SEG-Y rev 1 textual header: 40 cards of 80 characters,
#: each starting with "C" and its number; common practice, no source)
_EMPTY_CARD = re.compile(r"^\s*(?:C\s*(\d{1,2}))?\s*$")

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
        lines.extend("  " + t for t in text_header_lines(info["text_header"]))
    return "\n".join(lines)


def text_header_lines(text: str) -> list:
    """The textual header as report lines, with each run of two or more empty cards collapsed into one line.

    Examples
    --------
    >>> text_header_lines("C 1 LINE A\\nC 2\\nC 3\\nC 4 END\\nC 5\\n")
    ['C 1 LINE A', '(cards 2-3 empty)', 'C 4 END', 'C 5']
    >>> text_header_lines("")
    ['(empty)']
    """
    lines = text.splitlines()
    out, run = [], []

    def flush():
        if len(run) >= 2:
            first, last = run[0], run[-1]
            out.append(f"(cards {first[0]}-{last[0]} empty)")
        else:
            out.extend(t for _, t in run)
        run.clear()

    for i, t in enumerate(lines, start=1):
        m = _EMPTY_CARD.match(t)
        if m:
            run.append((int(m.group(1)) if m.group(1) else i, t.rstrip()))
        else:
            flush()
            out.append(t.rstrip())
    flush()
    return out or ["(empty)"]


def run(args) -> int:
    info = inspect_file(args.path, domain=args.domain, coordinates=args.coordinates)
    if args.no_text:
        info.pop("text_header")
    if args.json:
        print(json.dumps(info, indent=2, ensure_ascii=False))
    else:
        print(format_report(info, text=not args.no_text))
    return 0
