"""Check a SEG-Y file's headers against its size before anything is allocated.

segyio opens files big-endian unless told otherwise and trusts the binary
header's sample count and format.  A malformed file can then make it fail
late, or allocate from a declared size the file cannot hold.  This module
reads only the 3600-byte file header and the first trace header, works out
the byte order from the format code (the only binary-header field whose
valid values, 1-16, are unambiguous in one byte order and impossible in the
other), and checks that the declared trace size divides the bytes after the
headers.  Only then does :mod:`clinometry.io.segy` hand the file to segyio.

The same idea, a cheap sniff of the headers before reading, is what ObsPy's
SEG-Y reader does to recognise files; the checks and messages here are ours.

References
----------
.. [1] SEG Technical Standards Committee (2002). SEG Y rev 1 Data Exchange
   Format. Society of Exploration Geophysicists.
.. [2] SEG Technical Standards Committee (2017). SEG-Y_r2.0 Data Exchange
   Format. Society of Exploration Geophysicists (from memory).
"""

from __future__ import annotations

import logging
import os
import struct
from dataclasses import dataclass, field

from ..errors import SegyReadError
from .headers import (
    BINARY_HEADER,
    BINARY_HEADER_BYTES,
    EXTENDED_TEXT_HEADER_BYTES,
    SAMPLE_FORMAT_NAMES,
    SAMPLE_FORMATS,
    TEXT_HEADER_BYTES,
    TRACE_HEADER,
    TRACE_HEADER_BYTES,
)

__all__ = ["SEGY_SUFFIXES", "has_segy_suffix", "SegyLayout", "sniff_segy", "decode_text_header"]

logger = logging.getLogger(__name__)

#: file-name endings of SEG-Y files, lower case: the one list the package
#: uses (folders in a batch, the demo inputs, velocity files); other names
#: are told by content where it matters (common practice, no source)
SEGY_SUFFIXES = (".sgy", ".segy")

FILE_HEADER_BYTES = TEXT_HEADER_BYTES + BINARY_HEADER_BYTES
#: SEG-Y rev 2.0 byte-order marker as written by the writer [2]_
_BYTE_ORDER_MARKER = 0x01020304
#: revision (major byte) from which the 4-byte extended sample count applies [2]_
_REV2_MAJOR = 2
#: formats the reader refuses: code 4 is obsolete and segyio has no decoder
#: (it silently falls back to IBM float); SEG-Y rev 2.0 [2]_ keeps it only
#: for old tapes (common practice, no source)
UNSUPPORTED_FORMATS = {4: "4-byte fixed point with gain is obsolete and has no decoder in segyio"}
_CHECK_HINT = ("; check that the copy is complete, and the sample count (bytes 3221-3222) and "
               "format (3225-3226) in the binary header")
_STRUCT = {("big", 2): ">h", ("little", 2): "<h", ("big", 4): ">i", ("little", 4): "<i"}


def has_segy_suffix(path) -> bool:
    """True when the file name ends in one of :data:`SEGY_SUFFIXES` (any case).

    Examples
    --------
    >>> has_segy_suffix("line_07.SGY"), has_segy_suffix("v.csv")
    (True, False)
    """
    return os.fspath(path).lower().endswith(SEGY_SUFFIXES)


@dataclass(frozen=True)
class SegyLayout:
    """What the headers of a SEG-Y file declare, checked against its size.

    Attributes
    ----------
    path : str
    size_bytes : int
    byte_order : {"big", "little"}
    format_code : int
    sample_format : str
        e.g. ``"4-byte IBM float (format 1)"``.
    bytes_per_sample : int
    n_samples : int
    n_traces : int
    n_extended_text_headers : int
    data_offset : int
        Byte offset of the first trace header.
    trace_bytes : int
        240 + n_samples * bytes_per_sample.
    revision : tuple of int
        (major, minor) from bytes 3501-3502.
    binary : dict
        Raw binary-header fields (``clinometry.io.headers.BINARY_HEADER``).
    first_trace : dict
        Raw fields of the first trace header.
    text_header : str
    text_encoding : {"EBCDIC", "ASCII", "empty"}
    notes : tuple of str
        Things a reader should know (header values that disagree).
    """

    path: str
    size_bytes: int
    byte_order: str
    format_code: int
    sample_format: str
    bytes_per_sample: int
    n_samples: int
    n_traces: int
    n_extended_text_headers: int
    data_offset: int
    trace_bytes: int
    revision: tuple
    binary: dict = field(repr=False)
    first_trace: dict = field(repr=False)
    text_header: str = field(repr=False, default="")
    text_encoding: str = "empty"
    notes: tuple = ()


def _unpack(buf: bytes, start: int, width: int, order: str, *, unsigned: bool = False) -> int:
    fmt = _STRUCT[(order, width)]
    if unsigned:
        fmt = fmt.upper()
    return struct.unpack(fmt, buf[start - 1 : start - 1 + width])[0]


def decode_text_header(raw: bytes) -> tuple[str, str]:
    """Decode a 3200-byte textual header as EBCDIC or ASCII, whichever it is.

    Parameters
    ----------
    raw : bytes
        The textual header (normally 40 cards of 80 characters).

    Returns
    -------
    text : str
        Cards joined by newlines, trailing blanks removed; ``""`` when the
        header is all zero or blank bytes.
    encoding : {"EBCDIC", "ASCII", "empty"}

    Notes
    -----
    SEG-Y rev 1 [1]_ specifies EBCDIC; many writers use ASCII (rev 1 allows
    it).  The first card starts with ``C`` (0xC3 in EBCDIC, 0x43 in ASCII);
    otherwise the encoding that yields more printable characters wins
    (common practice, no source).

    Examples
    --------
    >>> decode_text_header(b"C 1 TEST".ljust(80))
    ('C 1 TEST', 'ASCII')
    >>> decode_text_header("C 1 TEST".ljust(80).encode("cp037"))
    ('C 1 TEST', 'EBCDIC')
    """
    if not raw.strip(b"\x00 \x40"):
        return "", "empty"
    ascii_text = raw.decode("ascii", errors="replace")
    ebcdic_text = raw.decode("cp037", errors="replace")
    if raw[:1] == b"\xc3":
        text, enc = ebcdic_text, "EBCDIC"
    elif raw[:1] == b"C":
        text, enc = ascii_text, "ASCII"
    else:
        n_ascii = sum(c.isprintable() for c in ascii_text)
        n_ebcdic = sum(c.isprintable() for c in ebcdic_text)
        text, enc = (ebcdic_text, "EBCDIC") if n_ebcdic > n_ascii else (ascii_text, "ASCII")
    text = "".join(c if (c.isprintable() and c != "\ufffd") else " " for c in text)
    cards = [text[i : i + 80].rstrip() for i in range(0, len(text), 80)]
    while cards and not cards[-1]:
        cards.pop()
    return "\n".join(cards), enc


def _detect_byte_order(name: str, buf: bytes) -> str:
    start, width = BINARY_HEADER["format"]
    big = _unpack(buf, start, width, "big")
    little = _unpack(buf, start, width, "little")
    marker = _unpack(buf, BINARY_HEADER["byte_order_marker"][0], 4, "big", unsigned=True)
    big_ok, little_ok = big in SAMPLE_FORMATS, little in SAMPLE_FORMATS
    if big_ok and little_ok:  # impossible for codes 1-16 but keep the rule explicit
        return "little" if marker == int.from_bytes(_BYTE_ORDER_MARKER.to_bytes(4, "little"), "big") else "big"
    if big_ok:
        return "big"
    if little_ok:
        return "little"
    raise SegyReadError(
        f"{name}: not a SEG-Y file we can read: the sample format code (binary header bytes "
        f"3225-3226) is {big} read big-endian and {little} read little-endian, and neither is a "
        f"SEG-Y format code ({', '.join(map(str, sorted(SAMPLE_FORMATS)))}); check that this is a "
        "SEG-Y file (not SU, SEG-D or a headerless dump)"
    )


def sniff_segy(path) -> SegyLayout:
    """Read and check the headers of a SEG-Y file; allocate nothing big.

    Parameters
    ----------
    path : str or os.PathLike
        SEG-Y file, opened read-only.

    Returns
    -------
    SegyLayout

    Raises
    ------
    SegyReadError
        File smaller than its headers, no valid format code in either byte
        order, format 4, zero sample count, extended textual headers past
        the end of the file, no traces, or a declared trace size that does
        not divide the bytes after the headers (truncated file or wrong
        sample count).  The message names the file, the values seen and
        what to try.
    OSError
        The file cannot be opened.

    Notes
    -----
    Sample count: bytes 3221-3222 read unsigned; from revision 2 on, the
    4-byte extended count at 3269-3272 replaces it when positive [2]_ (this
    is also what segyio does with ``decrement.sgy`` and ``increment.sgy``).
    """
    path = os.fspath(path)
    name = os.path.basename(path)
    size = os.path.getsize(path)
    if size < FILE_HEADER_BYTES:
        raise SegyReadError(
            f"{name}: file is {size} bytes, smaller than the {FILE_HEADER_BYTES}-byte SEG-Y file header "
            f"({TEXT_HEADER_BYTES} textual + {BINARY_HEADER_BYTES} binary); it is not SEG-Y or it is "
            "truncated; check the transfer or the file type"
        )
    with open(path, "rb") as fh:
        buf = fh.read(FILE_HEADER_BYTES)
    order = _detect_byte_order(name, buf)
    binary = {}
    for key, (start, width) in BINARY_HEADER.items():
        unsigned = key in ("samples", "byte_order_marker")
        binary[key] = _unpack(buf, start, width, order, unsigned=unsigned)
    rev_major, rev_minor = buf[BINARY_HEADER["revision"][0] - 1], buf[BINARY_HEADER["revision"][0]]
    fmt = binary["format"]
    if fmt in UNSUPPORTED_FORMATS:
        raise SegyReadError(
            f"{name}: sample format code {fmt} ({SAMPLE_FORMAT_NAMES[fmt]}): "
            f"{UNSUPPORTED_FORMATS[fmt]}; convert the file to format 1 or 5 first, or, if the "
            "format code is wrong, fix bytes 3225-3226 in a copy"
        )
    bps = SAMPLE_FORMATS[fmt][1]
    ns = binary["samples"]
    ns_source = "bytes 3221-3222"
    if rev_major >= _REV2_MAJOR and binary["extended_samples"] > 0:
        ns = binary["extended_samples"]
        ns_source = "bytes 3269-3272 (rev 2 extended sample count)"

    n_ext = binary["extended_text_headers"]
    if n_ext == -1:
        raise SegyReadError(
            f"{name}: binary header bytes 3505-3506 say -1 extended textual headers "
            "(a variable count ended by an end-stanza, SEG-Y rev 2); this reader needs a fixed "
            "count; remove the extended headers or set the count in a copy"
        )
    if n_ext < 0:
        raise SegyReadError(
            f"{name}: binary header bytes 3505-3506 say {n_ext} extended textual headers, a negative "
            "count; the binary header is damaged; set the count (usually 0) in a copy"
        )
    data_offset = FILE_HEADER_BYTES + n_ext * EXTENDED_TEXT_HEADER_BYTES
    if data_offset > size:
        raise SegyReadError(
            f"{name}: binary header bytes 3505-3506 declare {n_ext} extended textual headers "
            f"({n_ext * EXTENDED_TEXT_HEADER_BYTES} bytes), more than the {size - FILE_HEADER_BYTES} "
            "bytes after the file header; the binary header is damaged or the file is truncated"
        )
    first = {}
    if size >= data_offset + TRACE_HEADER_BYTES:
        with open(path, "rb") as fh:
            fh.seek(data_offset)
            tbuf = fh.read(TRACE_HEADER_BYTES)
        for key, (start, width) in TRACE_HEADER.items():
            first[key] = _unpack(tbuf, start, width, order, unsigned=(key == "samples"))
    tr_ns = first.get("samples", 0)
    if ns <= 0:
        hint = (f"; the first trace header (bytes 115-116) says {tr_ns}" if tr_ns else "")
        raise SegyReadError(
            f"{name}: the binary header sample count ({ns_source}) is 0{hint}; the file cannot be "
            "read without it; set bytes 3221-3222 in a copy of the file"
        )
    remaining = size - data_offset
    trace_bytes = TRACE_HEADER_BYTES + ns * bps
    if remaining == 0:
        raise SegyReadError(
            f"{name}: the file has headers but no traces ({size} bytes); check that the copy is complete"
        )

    def _fits(n):
        return n > 0 and remaining % (TRACE_HEADER_BYTES + n * bps) == 0

    if remaining < trace_bytes or remaining % trace_bytes:
        alt = ""
        if tr_ns and tr_ns != ns and _fits(tr_ns):
            alt = (f"; the first trace header (bytes 115-116) says {tr_ns} samples, which fits the "
                   "file size: the binary header may be wrong (fix bytes 3221-3222 in a copy)")
        what = ("larger than" if remaining < trace_bytes else "not a divisor of")
        raise SegyReadError(
            f"{name}: the declared trace size is {trace_bytes} bytes (240-byte header + {ns} samples "
            f"({ns_source}) x {bps} bytes, format {fmt}), {what} the {remaining} bytes after the "
            f"headers ({remaining % trace_bytes if remaining >= trace_bytes else remaining} bytes "
            f"left over): the file is truncated or its sample count or format is wrong{alt or _CHECK_HINT}"
        )
    n_traces = remaining // trace_bytes
    notes = []
    if tr_ns and tr_ns != ns:
        notes.append(
            f"trace header sample count (bytes 115-116) is {tr_ns}, binary header {ns}; "
            "the binary header value was used (it fits the file size)"
        )
    text, enc = decode_text_header(buf[:TEXT_HEADER_BYTES])
    return SegyLayout(
        path=path,
        size_bytes=size,
        byte_order=order,
        format_code=fmt,
        sample_format=f"{SAMPLE_FORMAT_NAMES[fmt]} (format {fmt})",
        bytes_per_sample=bps,
        n_samples=int(ns),
        n_traces=int(n_traces),
        n_extended_text_headers=int(n_ext),
        data_offset=int(data_offset),
        trace_bytes=int(trace_bytes),
        revision=(int(rev_major), int(rev_minor)),
        binary=binary,
        first_trace=first,
        text_header=text,
        text_encoding=enc,
        notes=tuple(notes),
    )
