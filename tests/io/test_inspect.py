"""inspect_file: header facts, geometry and coordinates without reading samples."""

import numpy as np
import pytest

from clinometry.io import decode_text_header, inspect_file


def test_inspect_real_line(data_dir):
    info = inspect_file(data_dir / "real-lines" / "teapot-line.sgy")
    # real-lines README: 357 traces x 240 samples, format 5 big-endian, 4 ms, CDP 1..n,
    # X = 500000 + 25 (CDP - 1) m, Y = 6000000 m, ASCII textual header
    assert (info["n_traces"], info["n_samples"]) == (357, 240)
    assert info["sample_interval"] == 4.0
    assert (info["format_code"], info["byte_order"]) == (5, "big")
    assert info["geometry"] == {"kind": "2d", "cdp_range": [1, 357]}
    assert info["coordinates"]["x_range_m"] == [500000.0, 500000.0 + 25 * 356]
    assert info["coordinates"]["y_range_m"] == [6000000.0, 6000000.0]
    assert info["coordinates"]["trace_spacing_m"] == 25.0
    assert info["text_encoding"] == "ASCII"
    assert info["z_start"] == 0.0 and info["z_end"] == 4.0 * 239
    assert info["problems"] == []


def test_inspect_reports_problems_instead_of_raising(data_dir):
    info = inspect_file(data_dir / "segy-reference" / "decrement.sgy")
    # reference README finding 8: binary 32762 us vs trace 32728 us -> no usable interval
    assert info["sample_interval"] is None
    assert "32762" in info["problems"][0] and "32728" in info["problems"][0]
    # reference README: 5 traces of 4 samples (rev-2 extended count), text header all zero bytes
    assert (info["n_traces"], info["n_samples"]) == (5, 4)
    assert (info["text_encoding"], info["text_header"]) == ("empty", "")


def test_inspect_3d_spacing_along_inline(tmp_path, write_cube):
    info = inspect_file(write_cube(tmp_path / "cube.sgy", 3, 4, 5, drop={(2, 3)}))
    g = info["geometry"]
    assert (g["kind"], g["inline_range"], g["crossline_range"], g["n_missing_traces"]) == ("3d", [100, 102], [200, 203], 1)
    assert info["coordinates"]["trace_spacing_m"] == 25.0  # crossline step along x in the writer


def test_decode_text_header_ebcdic_and_ascii():
    card = "C 1 CLIENT: NONE   LINE: DEMO-7".ljust(80)
    # cp037 is the EBCDIC code page SEG-Y rev 1 textual headers use (common practice, no source)
    text, enc = decode_text_header((card * 40).encode("cp037"))
    assert enc == "EBCDIC" and text.splitlines()[0] == card.rstrip() and len(text.splitlines()) == 40
    text, enc = decode_text_header((card * 40).encode("ascii"))
    assert enc == "ASCII" and text.splitlines()[39] == card.rstrip()
    assert decode_text_header(b"\x00" * 3200) == ("", "empty")
