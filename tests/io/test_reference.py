"""read_section and inspect_file on segyio's reference SEG-Y files.

Expected facts come from outside the project: the files' own textual headers,
``reader-results.json`` (what segyio 1.9.14 and ObsPy 1.5.1 report, shipped
with the reference copy), and the findings of the reference README quoted
beside each check.
"""

import json
import warnings

import numpy as np
import pytest

from clinometry.errors import FallbackWarning, GeometryError, SegyReadError
from clinometry.io import inspect_file, iter_sections, read_section


def _quiet_read(path, **kw):
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", FallbackWarning)
        return read_section(path, **kw)


def _stack(path, **kw):
    """Every inline of a 3D file, stacked in file (inline-sorted) order."""
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", FallbackWarning)
        return np.concatenate([s.values for s in iter_sections(path, **kw)])



def _reference(ref_dir):
    doc = json.loads((ref_dir / "reader-results.json").read_text())
    return {e["file"]: e for e in doc["files"]}


def test_f3_geometry_and_axis(ref_dir):
    info = inspect_file(ref_dir / "f3.sgy")
    # f3.sgy textual header: "inlines: 111 .. 133, crosslines: 875 .. 892"; reader-results.json
    assert info["geometry"]["inline_range"] == [111, 133]
    assert info["geometry"]["crossline_range"] == [875, 892]
    assert info["geometry"]["n_missing_traces"] == 0
    # reader-results.json: 414 traces x 75 samples, dt 4000 us, t0 4 ms, format 3
    assert (info["n_traces"], info["n_samples"]) == (414, 75)
    assert info["sample_interval"] == 4.0
    assert info["z_start"] == 4.0
    assert info["format_code"] == 3 and info["byte_order"] == "big"
    s = read_section(ref_dir / "f3.sgy", inline=112)
    assert s.attrs["line_label"] == "inline 112"
    np.testing.assert_array_equal(s.crossline.values, np.arange(875, 893))
    np.testing.assert_array_equal(s.inline.values, np.full(18, 112))
    np.testing.assert_allclose(s.z.values, 4.0 + 4.0 * np.arange(75))
    assert s.attrs["sample_format"] == "2-byte signed int (format 3)"
    # reference README: trace headers say 462 samples, binary header 75 -> noted, binary used
    assert any("462" in n for n in s.attrs["notes"])
    c = read_section(ref_dir / "f3.sgy", crossline=880)
    np.testing.assert_array_equal(c.inline.values, np.arange(111, 134))
    # the crossline section crosses the inline section at (112, 880)
    np.testing.assert_array_equal(c.sel(trace=1).values, s.sel(trace=5).values)


def test_f3_msb_and_lsb_give_identical_samples(ref_dir):
    # reference README: f3-lsb.sgy is f3.sgy with every header and sample byte-swapped
    big, little = _stack(ref_dir / "f3.sgy"), _stack(ref_dir / "f3-lsb.sgy")
    np.testing.assert_array_equal(big, little)
    assert read_section(ref_dir / "f3-lsb.sgy", inline=111).attrs["byte_order"] == "little"


def test_small_msb_and_lsb_give_identical_samples(ref_dir):
    # reference README: small-lsb.sgy is small.sgy byte-swapped
    np.testing.assert_array_equal(_stack(ref_dir / "small.sgy"), _stack(ref_dir / "small-lsb.sgy"))


def test_small_values_encode_their_position(ref_dir):
    # segyio's make-file.py writes sample = inline + crossline / 100 + t / 1e5 (segyio test-data README, from memory)
    s = _quiet_read(ref_dir / "small.sgy", inline=3)
    np.testing.assert_allclose(s.isel(z=0).values, 3 + np.arange(20, 25) / 100, rtol=1e-6)
    np.testing.assert_allclose(s.isel(trace=0).values, 3.20 + np.arange(50) / 1e5, rtol=1e-6)


# reference README finding 4: the integer files hold f3's int16 values cast with wrap-around
_CAST = {1: np.float32, 2: np.int32, 5: np.float32, 6: np.float64, 7: np.int32, 8: np.int8, 9: np.int64,
         10: np.uint32, 11: np.uint16, 12: np.uint64, 16: np.uint8}


@pytest.mark.parametrize("name", [
    "Format1msb", "Format2msb", "Format5msb", "Format6msb", "Format7msb", "Format7lsb", "Format8msb",
    "Format9msb", "Format10msb", "Format11msb", "Format12msb", "Format15msb", "Format15lsb", "Format16msb",
])
def test_every_sample_format_reproduces_f3(ref_dir, name):
    code = int(name[6:-3])
    f3 = _stack(ref_dir / "f3.sgy").astype(np.int16)
    if code == 15:
        expected = (f3.astype(np.int64) % (1 << 24)).astype(np.float32)  # README: f3 wrapped modulo 2^24
    else:
        expected = f3.astype(_CAST[code]).astype(np.float64 if code == 6 else np.float32)
    actual = _stack(ref_dir / "multiformats" / f"{name}.sgy")
    np.testing.assert_array_equal(actual, expected)
    s = read_section(ref_dir / "multiformats" / f"{name}.sgy", inline=111)
    assert s.attrs["sample_format"].endswith(f"(format {code})")
    assert s.attrs["byte_order"] == ("big" if name.endswith("msb") else "little")


def test_format4_is_refused_with_a_clear_message(ref_dir):
    # reference README finding 3: segyio has no format-4 decoder and falls back to IBM float
    with pytest.raises(SegyReadError, match=r"Format4lsb\.sgy: sample format code 4.*convert"):
        read_section(ref_dir / "multiformats" / "Format4lsb.sgy", inline=111)


def test_delay_scalar_starts_at_1000_ms_and_ascii_text(ref_dir):
    s = _quiet_read(ref_dir / "delay-scalar.sgy")
    # reference README: delay 10000 x time scalar -10 (divide) -> first sample at 1000 ms, dt 4 ms
    assert float(s.z[0]) == 1000.0
    assert s.attrs["sample_interval"] == 4.0
    assert s.sizes == {"trace": 1, "z": 251}
    # reference README finding 7: its textual header is ASCII
    assert inspect_file(ref_dir / "delay-scalar.sgy")["text_encoding"] == "ASCII"
    assert s.attrs["text_header"].startswith("C")


@pytest.mark.parametrize("name, expected_ms", [
    ("interval-pos-bin-neg-trace.sgy", 2.0),  # README finding 8: binary 2000 us used
    ("interval-neg-bin-pos-trace.sgy", 4.0),  # README finding 8: trace 4000 us used
])
def test_sample_interval_rules(ref_dir, name, expected_ms):
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")  # 1 trace, no coordinates, all zero: warnings tested elsewhere
        s = read_section(ref_dir / name)
    assert s.attrs["sample_interval"] == expected_ms
    if name.startswith("interval-neg-bin"):
        assert any("trace header" in f for f in s.attrs["fallbacks"])


@pytest.mark.parametrize("name", ["interval-neg-bin-neg-trace.sgy", "decrement.sgy", "increment.sgy"])
def test_no_usable_interval_asks_for_override(ref_dir, name):
    # README finding 8: segyio.tools.dt finds no interval for these (both <= 0, or disagreeing)
    with pytest.raises(SegyReadError, match=rf"{name}: no usable sample interval.*sample_interval="):
        read_section(ref_dir / name)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        s = read_section(ref_dir / name, sample_interval=2.0)
    assert s.attrs["sample_interval"] == 2.0


def test_rev2_extended_sample_count_and_empty_text(ref_dir):
    # reference README: decrement/increment hold 5 traces of 4 samples (rev-2 extended count),
    # their textual header is all zero bytes
    for name in ("decrement.sgy", "increment.sgy"):
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            s = read_section(ref_dir / name, sample_interval=4.0)
        assert s.sizes == {"trace": 5, "z": 4}
        assert s.attrs["text_header"] == ""


def test_long_file_sample_count_is_unsigned(ref_dir):
    # reference README: binary header declares 60000 samples (> 32767, read unsigned), dt 1000 us
    s = _quiet_read(ref_dir / "long.sgy")
    assert s.sizes == {"trace": 3, "z": 60000}
    assert s.attrs["sample_interval"] == 1.0


def test_multi_text_skips_extended_headers(ref_dir):
    info = inspect_file(ref_dir / "multi-text.sgy")
    # reference README: 4 extended textual headers, 1 trace x 1 sample, 4000 us
    assert info["n_extended_text_headers"] == 4
    assert (info["n_traces"], info["n_samples"], info["sample_interval"]) == (1, 1, 4.0)


def test_broken_file_is_refused(ref_dir):
    # reference README: broken.sgy is truncated (last trace cut)
    with pytest.raises(SegyReadError, match=r"broken\.sgy: the declared trace size is 256 bytes.*truncated"):
        read_section(ref_dir / "broken.sgy")


def test_pre_stack_file_is_not_3d(ref_dir):
    # reference README: small-ps.sgy is pre-stack (4 inlines x 3 crosslines x 2 offsets)
    assert inspect_file(ref_dir / "small-ps.sgy")["geometry"]["kind"] == "pre-stack"
    with pytest.raises(GeometryError, match=r"small-ps\.sgy: inline=1 .*not a 3D post-stack"):
        read_section(ref_dir / "small-ps.sgy", inline=1)
    assert _quiet_read(ref_dir / "small-ps.sgy").sizes == {"trace": 24, "z": 10}


@pytest.mark.parametrize("name, scalar_divisor", [
    ("acute-small.sgy", 10), ("left-small.sgy", 1), ("inv-acute-small.sgy", 1)])
def test_rotated_coordinates_follow_scalar(ref_dir, name, scalar_divisor):
    import segyio

    # independent: raw CDP X/Y and scalar read by segyio's header API, scaled by the
    # SEG-Y rev 1 rule (bytes 71-72: negative divides, positive multiplies, 0 means 1)
    s = read_section(ref_dir / name, inline=2)
    with segyio.open(str(ref_dir / name), ignore_geometry=True) as f:
        h = [f.header[i] for i in range(5, 10)]  # inline 2 is traces 5-9 (inline sorted)
    sc = np.array([x[segyio.TraceField.SourceGroupScalar] for x in h], dtype=float)
    factor = np.where(sc < 0, 1 / np.abs(np.where(sc == 0, 1, sc)), np.where(sc == 0, 1, sc))
    np.testing.assert_allclose(s.x.values, [x[segyio.TraceField.CDP_X] for x in h] * factor)
    np.testing.assert_allclose(s.y.values, [x[segyio.TraceField.CDP_Y] for x in h] * factor)
    assert np.all(np.diff(s.distance.values) > 0)


@pytest.mark.parametrize("name", ["1x1.sgy", "small.sgy", "small-lsb.sgy", "acute-small.sgy",
                                  "f3.sgy", "f3-lsb.sgy", "long.sgy", "multi-text.sgy", "small-ps.sgy",
                                  "delay-scalar.sgy"])
def test_counts_match_reader_results(ref_dir, name):
    ref = _reference(ref_dir)[name]["segyio"]
    info = inspect_file(ref_dir / name)
    # reader-results.json (segyio 1.9.14): traces, samples, dt, t0, format, byte order
    assert info["n_traces"] == ref["traces"]
    assert info["n_samples"] == ref["samples"]
    assert info["sample_interval"] == ref["dt_us"] / 1000
    assert info["z_start"] == ref["t0_ms"]
    assert info["format_code"] == ref["format"]
    assert info["byte_order"] == ref["endian"]
    geom = ref.get("geometry")
    if isinstance(geom, dict) and len(geom["offsets"]) == 1 and len(geom["ilines"]) > 1:
        assert info["geometry"]["inline_range"] == [min(geom["ilines"]), max(geom["ilines"])]
        assert info["geometry"]["crossline_range"] == [min(geom["xlines"]), max(geom["xlines"])]
