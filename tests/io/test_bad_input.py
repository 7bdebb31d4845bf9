"""Bad input gets a clear SegyReadError naming the file, the values seen and what to try.

Byte positions: SEG-Y rev 1 (SEG Technical Standards Committee, 2002):
binary header sample interval 3217-3218, sample count 3221-3222, format
3225-3226, extended textual headers 3505-3506.
"""

import struct

import numpy as np
import pytest

from clinometry.errors import SegyReadError
from clinometry.io import inspect_file, read_section


@pytest.fixture
def good(tmp_path, write_segy):
    return write_segy(tmp_path / "good.sgy", np.ones((5, 10)), headers={181: np.arange(5) * 25, 71: 1})


def _patch(src, dst, offset, fmt, value):
    raw = bytearray(src.read_bytes())
    struct.pack_into(fmt, raw, offset, value)
    dst.write_bytes(bytes(raw))
    return dst


def test_not_segy(tmp_path):
    path = tmp_path / "notes.txt"
    path.write_text("just some text, not seismic\n" * 200)
    with pytest.raises(SegyReadError, match=r"notes\.txt: not a SEG-Y file.*format code.*3225-3226"):
        read_section(path)


def test_file_smaller_than_headers(tmp_path):
    path = tmp_path / "tiny.sgy"
    path.write_bytes(b"\x00" * 1000)
    with pytest.raises(SegyReadError, match=r"tiny\.sgy: file is 1000 bytes, smaller than the 3600-byte"):
        read_section(path)


def test_truncated_file_names_bytes_and_trace_size(tmp_path, good):
    path = tmp_path / "trunc.sgy"
    path.write_bytes(good.read_bytes()[:-17])
    # 5 traces of 240 + 10 * 4 = 280 bytes, 17 cut off: 1383 bytes after the headers
    with pytest.raises(SegyReadError, match=r"trunc\.sgy: the declared trace size is 280 bytes.*1383 bytes.*truncated"):
        read_section(path)


def test_inconsistent_sample_counts(tmp_path, good):
    path = _patch(good, tmp_path / "count.sgy", 3220, ">H", 11)  # binary says 11, traces hold 10
    with pytest.raises(SegyReadError, match=r"count\.sgy: .*11 samples.*trace header \(bytes 115-116\) says 10 samples"):
        read_section(path)


def test_declared_sizes_larger_than_file(tmp_path, good):
    path = _patch(good, tmp_path / "huge.sgy", 3220, ">H", 60000)
    with pytest.raises(SegyReadError, match=r"huge\.sgy: the declared trace size is 240240 bytes.*larger than the 1400 bytes"):
        read_section(path)
    path = _patch(good, tmp_path / "exthdr.sgy", 3504, ">h", 300)
    with pytest.raises(SegyReadError, match=r"exthdr\.sgy: .*300 extended textual headers"):
        read_section(path)


def test_zero_sample_count(tmp_path, good):
    path = _patch(good, tmp_path / "zero-ns.sgy", 3220, ">H", 0)
    with pytest.raises(SegyReadError, match=r"zero-ns\.sgy: the binary header sample count.*is 0; the first trace header"):
        read_section(path)


def test_zero_sample_interval(tmp_path, write_segy):
    path = write_segy(tmp_path / "zero-dt.sgy", np.ones((3, 4)), dt_us=0, headers={181: [0, 1, 2], 71: 1})
    with pytest.raises(SegyReadError, match=r"zero-dt\.sgy: no usable sample interval: sample interval is 0.*sample_interval="):
        read_section(path)


def test_absurd_sample_interval(tmp_path, write_segy):
    path = write_segy(tmp_path / "slow.sgy", np.ones((3, 4)), dt_us=30000, headers={181: [0, 1, 2], 71: 1})
    with pytest.raises(SegyReadError, match=r"slow\.sgy: sample interval 30 ms .* is absurd.*sample_interval="):
        read_section(path)
    # the override is trusted
    assert read_section(path, sample_interval=2.0).attrs["sample_interval"] == 2.0
    assert inspect_file(path)["problems"][0].startswith("sample interval 30 is absurd")


def test_bad_override_values(tmp_path, good):
    with pytest.raises(SegyReadError, match=r"good\.sgy: sample_interval=-1 must be a positive number of ms"):
        read_section(good, sample_interval=-1)


def test_empty_file_after_headers(tmp_path, good):
    path = tmp_path / "headers-only.sgy"
    path.write_bytes(good.read_bytes()[:3600])
    with pytest.raises(SegyReadError, match=r"headers-only\.sgy: the file has headers but no traces"):
        read_section(path)


def test_unknown_format_code(tmp_path, good):
    path = _patch(good, tmp_path / "fmt.sgy", 3224, ">h", 13)
    with pytest.raises(SegyReadError, match=r"fmt\.sgy: not a SEG-Y file.*13 read big-endian"):
        read_section(path)
