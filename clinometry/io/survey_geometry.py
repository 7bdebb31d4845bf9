"""Trace headers and survey geometry of a checked SEG-Y file.

Trace headers are read through a read-only ``numpy.memmap`` of the file,
field by field, so any byte position can be used (``header_bytes=``) and only
the requested columns are loaded (a few bytes per trace), never the samples.

A file is treated as a 3D post-stack volume when its inline/crossline fields
(default bytes 189/193, SEG-Y rev 1 [1]_) hold at least two inlines and two
crosslines, no (inline, crossline) pair twice, and the pairs fill at least
:data:`MIN_GRID_FILL` of their bounding grid.  Duplicated pairs mean
pre-stack data (offsets); a sparse fill means the fields hold counters or
garbage (segyio's ``long.sgy`` and ``decrement.sgy`` are examples), so the
file is read as a 2D line.

References
----------
.. [1] SEG Technical Standards Committee (2002). SEG Y rev 1 Data Exchange
   Format. Society of Exploration Geophysicists.
"""

from __future__ import annotations

import logging
import os

import numpy as np

from ..errors import GeometryError
from .headers import COORDINATE_PAIRS, DEFAULT_HEADER_BYTES, TRACE_HEADER, TRACE_HEADER_BYTES
from .sniff import SegyLayout, sniff_segy

__all__ = [
    "MIN_GRID_FILL",
    "TraceHeaders",
    "check_header_bytes",
    "survey_geometry",
    "line_indices",
    "is_3d",
    "line_numbers",
]

logger = logging.getLogger(__name__)

#: a volume is 3D when its (inline, crossline) pairs fill at least this
#: fraction of their bounding grid; lower fills are counters or damaged
#: headers, not a survey (our choice, common practice, no source)
MIN_GRID_FILL = 0.5
_FIELD_WIDTH = {start: width for start, width in TRACE_HEADER.values()}


def check_header_bytes(name, header_bytes, coordinates):
    """Header byte positions to use: defaults, coordinate pair, then overrides; checked.

    Raises
    ------
    GeometryError
        Unknown pair or key, or a position outside the 240-byte trace header.
    """
    if coordinates not in COORDINATE_PAIRS:
        raise GeometryError(
            f"{name}: coordinates={coordinates!r} is not one of {sorted(COORDINATE_PAIRS)}"
        )
    xb, yb = COORDINATE_PAIRS[coordinates]
    chosen = dict(DEFAULT_HEADER_BYTES, x=xb, y=yb)
    for key, byte in dict(header_bytes or {}).items():
        if key not in DEFAULT_HEADER_BYTES:
            raise GeometryError(
                f"{name}: header_bytes key {key!r} is not one of {sorted(DEFAULT_HEADER_BYTES)}"
            )
        width = _FIELD_WIDTH.get(byte, 4)
        if not isinstance(byte, (int, np.integer)) or not 1 <= byte <= TRACE_HEADER_BYTES - width + 1:
            raise GeometryError(
                f"{name}: header_bytes[{key!r}] = {byte!r} is not a byte position 1-{TRACE_HEADER_BYTES - 3} "
                "of the 240-byte trace header (SEG-Y rev 1 numbering, 1-based)"
            )
        chosen[key] = int(byte)
    return chosen


class TraceHeaders:
    """Read-only view of the trace headers of a checked file."""

    def __init__(self, layout: SegyLayout):
        self.layout = layout
        self._mm = np.memmap(
            layout.path, dtype=np.uint8, mode="r", offset=layout.data_offset,
            shape=(layout.n_traces, layout.trace_bytes),
        )

    def field(self, byte: int, idx=None) -> np.ndarray:
        width = _FIELD_WIDTH.get(byte, 4)
        cols = self._mm[:, byte - 1 : byte - 1 + width] if idx is None else self._mm[idx, byte - 1 : byte - 1 + width]
        kind = "u" if byte == TRACE_HEADER["samples"][0] else "i"  # sample count is unsigned
        dt = np.dtype(("<" if self.layout.byte_order == "little" else ">") + f"{kind}{width}")
        return np.ascontiguousarray(cols).view(dt).reshape(-1).astype(np.int64)

    def sample_bytes(self, idx, k: int, bytes_per_sample: int) -> np.ndarray:
        """Byte ``k`` of every sample of traces ``idx``, shape (len(idx), n_samples)."""
        return np.asarray(self._mm[idx, TRACE_HEADER_BYTES + k :: bytes_per_sample])

    def sample_words(self, trace_idx, sample_idx, bytes_per_sample: int) -> np.ndarray:
        """Raw bytes of single samples (one per pair), shape (len(trace_idx), bytes_per_sample)."""
        cols = TRACE_HEADER_BYTES + np.asarray(sample_idx)[:, None] * bytes_per_sample + np.arange(bytes_per_sample)
        return np.asarray(self._mm[np.asarray(trace_idx)[:, None], cols])

    def raw_samples(self, idx) -> np.ndarray:
        return np.asarray(self._mm[idx, TRACE_HEADER_BYTES:])

    def close(self):
        """Release the memory map (left to the garbage collector if a view is still alive)."""
        mm = getattr(self._mm, "_mmap", None)
        self._mm = None
        if mm is not None:
            try:
                mm.close()
            except BufferError:  # a view is still referenced (e.g. by a traceback); GC closes it
                logger.debug("memory map of %s still referenced; left to the garbage collector", self.layout.path)


def survey_geometry(hdr: TraceHeaders, chosen):
    """Inline/crossline numbers per trace and the kind of file ("2d", "3d", "pre-stack")."""
    il = hdr.field(chosen["inline"])
    xl = hdr.field(chosen["crossline"])
    uil, uxl = np.unique(il), np.unique(xl)
    n_pairs = len(np.unique(np.stack([il, xl]), axis=1).T) if il.size else 0
    if uil.size >= 2 and uxl.size >= 2:
        if n_pairs != il.size:
            kind = "pre-stack"
        elif il.size >= MIN_GRID_FILL * uil.size * uxl.size:
            kind = "3d"
        else:
            kind = "2d"  # header numbers that do not form a grid (e.g. counters, garbage)
    else:
        kind = "2d"
    return {"kind": kind, "inline": il, "crossline": xl, "inlines": uil, "crosslines": uxl, "n_pairs": n_pairs}


def line_indices(name, geo, direction, number):
    """Trace indices of one inline/crossline, ordered by the other number.

    Raises
    ------
    GeometryError
        The file is not 3D, or the line is not in it.
    """
    key, other = ("inline", "crossline") if direction == "inline" else ("crossline", "inline")
    if geo["kind"] != "3d":
        raise GeometryError(
            f"{name}: {key}={number} asked for, but the file is not a 3D post-stack volume "
            f"({geo['kind']}: {geo['inlines'].size} inline and {geo['crosslines'].size} crossline numbers "
            f"in the header fields used); read it without {key}=, or point header_bytes= at the "
            "inline/crossline fields"
        )
    vals = geo[key + "s"]
    if number not in vals:
        raise GeometryError(
            f"{name}: {key} {number} is not in the file; {key}s run {vals.min()}-{vals.max()} "
            f"({vals.size} lines)"
        )
    idx = np.flatnonzero(geo[key] == number)
    return idx[np.argsort(geo[other][idx], kind="stable")]


def is_3d(path, *, header_bytes=None) -> bool:
    """True when the file is a 3D post-stack volume (see module notes).

    Parameters
    ----------
    path : str or os.PathLike
    header_bytes : dict, optional
        ``inline``/``crossline`` byte overrides.
    """
    layout = sniff_segy(path)
    chosen = check_header_bytes(os.path.basename(layout.path), header_bytes, "cdp")
    hdr = TraceHeaders(layout)
    try:
        return survey_geometry(hdr, chosen)["kind"] == "3d"
    finally:
        hdr.close()


def line_numbers(path, *, direction="inline", header_bytes=None) -> list[int]:
    """Inline (or crossline) numbers of a 3D volume, increasing.

    Raises
    ------
    GeometryError
        The file is not a 3D volume.
    """
    layout = sniff_segy(path)
    name = os.path.basename(layout.path)
    chosen = check_header_bytes(name, header_bytes, "cdp")
    hdr = TraceHeaders(layout)
    try:
        geo = survey_geometry(hdr, chosen)
    finally:
        hdr.close()
    if geo["kind"] != "3d":
        raise GeometryError(f"{name}: not a 3D post-stack volume ({geo['kind']})")
    return geo[direction + "s"].tolist()
