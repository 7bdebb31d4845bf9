"""read_section / iter_sections on small SEG-Y files written here with segyio.

The files encode their own position (sample = inline * 1000 + crossline +
t / 1000), so expected values can be read off.  Byte positions are those of
SEG-Y rev 1 (SEG Technical Standards Committee, 2002).
"""

import tracemalloc
import warnings

import numpy as np
import pytest

from clinometry.errors import DataQualityWarning, FallbackWarning, GeometryError
from clinometry.io import inspect_file, is_3d, iter_sections, line_numbers, read_section


def test_ibm_float_worked_value(tmp_path, write_segy):
    # IBM System/360 hex float 0xC276A000 = -118.625 (IBM's published example; from memory)
    path = write_segy(tmp_path / "ibm.sgy", np.ones((2, 3)), fmt=1, headers={181: [0, 10], 71: 1})
    raw = bytearray(path.read_bytes())
    first_sample = 3600 + 240
    raw[first_sample:first_sample + 4] = bytes.fromhex("C276A000")
    path.write_bytes(bytes(raw))
    s = read_section(path)
    assert s.values[0, 0] == -118.625
    # and segyio's writer encodes -118.625 as that bit pattern (same example)
    p2 = write_segy(tmp_path / "ibm2.sgy", np.full((2, 3), -118.625), fmt=1, headers={181: [0, 10], 71: 1})
    assert p2.read_bytes()[first_sample:first_sample + 4] == bytes.fromhex("C276A000")


def test_unnormalized_ibm_floats(tmp_path, write_segy):
    # IBM hex float value = (-1)^s * 0.F * 16^(e-64) (IBM System/360 Principles of Operation;
    # from memory): 0x40080000 -> 0x080000 / 2^24 = 0.03125 (unnormalised), 0x41100000 -> 1.0,
    # 0x41010000 -> 16 * 0x010000 / 2^24 = 0.0625 (unnormalised), 0xC0080000 -> -0.03125
    path = write_segy(tmp_path / "unnorm.sgy", np.ones((2, 4)), fmt=1, headers={181: [0, 10], 71: 1})
    raw = bytearray(path.read_bytes())
    raw[3840:3856] = bytes.fromhex("40080000" "41100000" "41010000" "C0080000")
    path.write_bytes(bytes(raw))
    s = read_section(path)
    np.testing.assert_array_equal(s.values[0], [0.03125, 1.0, 0.0625, -0.03125])
    assert s.attrs["notes"] == ["3 unnormalised IBM float samples decoded with the IBM formula "
                                "(segyio 1.9.14 decodes them wrongly)"]


@pytest.mark.parametrize("scalar, expected_x", [
    (-100, [1234.56, 1234.81]),  # SEG-Y rev 1 bytes 71-72: negative divides
    (10, [1234560.0, 1234810.0]),  # positive multiplies
    (0, [123456.0, 123481.0]),  # 0 means 1
])
def test_coordinate_scalar(tmp_path, write_segy, scalar, expected_x):
    path = write_segy(tmp_path / "scal.sgy", np.ones((2, 4)), headers={71: scalar, 181: [123456, 123481], 185: 7})
    s = read_section(path)
    np.testing.assert_allclose(s.x.values, expected_x)
    np.testing.assert_allclose(s.distance.values, [0.0, expected_x[1] - expected_x[0]])


@pytest.mark.parametrize("pair, xb, yb", [("source", 73, 77), ("group", 81, 85), ("cdp", 181, 185)])
def test_coordinate_pair_choice(tmp_path, write_segy, pair, xb, yb):
    # SEG-Y rev 1 table 2: source X/Y 73/77, group X/Y 81/85, CDP X/Y 181/185
    hdr = {71: 1, 73: [1, 2, 3], 77: 0, 81: [10, 20, 30], 85: 0, 181: [100, 300, 500], 185: 0}
    path = write_segy(tmp_path / "pairs.sgy", np.ones((3, 4)), headers=hdr)
    s = read_section(path, coordinates=pair)
    np.testing.assert_allclose(s.x.values, hdr[xb])
    np.testing.assert_allclose(s.y.values, 0.0)


def test_header_byte_overrides(tmp_path, write_segy):
    # inline/crossline stored in field record (byte 9) and trace number (byte 13); x/y in source X/Y
    n_il, n_xl = 3, 4
    il = np.repeat(np.arange(10, 10 + n_il), n_xl)
    xl = np.tile(np.arange(50, 50 + n_xl), n_il)
    data = (il * 1000 + xl)[:, None] + np.zeros((1, 5))
    path = write_segy(tmp_path / "moved.sgy", data, headers={9: il, 13: xl, 73: xl * 20, 77: il * 30, 71: 1})
    hb = {"inline": 9, "crossline": 13, "x": 73, "y": 77}
    assert not is_3d(path)
    assert is_3d(path, header_bytes=hb)
    s = read_section(path, inline=11, header_bytes=hb)
    np.testing.assert_array_equal(s.isel(z=0).values, 11000 + np.arange(50, 54))
    np.testing.assert_allclose(s.distance.values, [0, 20, 40, 60])
    with pytest.raises(GeometryError, match=r"moved\.sgy: header_bytes\['inline'\] = 239"):
        read_section(path, inline=11, header_bytes={"inline": 239})


def test_no_coordinates_falls_back_to_trace_spacing(tmp_path, write_segy):
    path = write_segy(tmp_path / "nocoord.sgy", np.ones((4, 3)))
    with pytest.warns(FallbackWarning, match=r"nocoord\.sgy: no trace coordinates.*25 m assumed"):
        s = read_section(path)
    np.testing.assert_allclose(s.distance.values, [0, 25, 50, 75])
    assert any("25 m assumed" in f for f in s.attrs["fallbacks"])
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        s2 = read_section(path, trace_spacing_m=12.5)
    np.testing.assert_allclose(s2.distance.values, [0, 12.5, 25, 37.5])
    assert any("12.5 m from trace_spacing_m" in f for f in s2.attrs["fallbacks"])


def test_depth_domain_interval_in_thousandths(tmp_path, write_segy):
    # common practice, no source: depth files write 2.5 m as 2500 in the interval field
    path = write_segy(tmp_path / "depth.sgy", np.ones((2, 4)), dt_us=2500, headers={181: [0, 25], 71: 1})
    s = read_section(path, domain="depth")
    np.testing.assert_allclose(s.z.values, [0, 2.5, 5.0, 7.5])
    assert s.attrs["units"] == "m" and s.attrs["domain"] == "depth"
    assert any("thousandths" in f for f in s.attrs["fallbacks"])
    s2 = read_section(path, domain="depth", sample_interval=5.0)
    np.testing.assert_allclose(s2.z.values, [0, 5, 10, 15])


def test_3d_inline_crossline_and_iteration(tmp_path, write_cube):
    path = write_cube(tmp_path / "cube.sgy", 4, 5, 6)
    assert is_3d(path)
    assert line_numbers(path) == [100, 101, 102, 103]
    assert line_numbers(path, direction="crossline") == [200, 201, 202, 203, 204]
    s = read_section(path, inline=102)
    np.testing.assert_allclose(s.isel(z=0).values, 102000 + np.arange(200, 205))
    np.testing.assert_allclose(s.distance.values, 25.0 * np.arange(5))  # crossline step 25 m along x
    c = read_section(path, crossline=203)
    np.testing.assert_allclose(c.isel(z=0).values, np.arange(100, 104) * 1000 + 203)
    np.testing.assert_allclose(c.distance.values, 50.0 * np.arange(4))
    labels = [(sec.attrs["line_label"], float(sec.values[0, 0])) for sec in iter_sections(path, direction="crossline")]
    assert labels == [(f"crossline {x}", 100000.0 + x) for x in range(200, 205)]
    sub = [sec.attrs["line_label"] for sec in iter_sections(path, lines=[103, 101])]
    assert sub == ["inline 103", "inline 101"]
    with pytest.raises(GeometryError, match=r"cube\.sgy: inline 99 is not in the file; inlines run 100-103"):
        read_section(path, inline=99)
    with pytest.raises(GeometryError, match=r"cube\.sgy: this is a 3D volume.*pass inline= or crossline="):
        read_section(path)
    with pytest.raises(GeometryError, match=r"cube\.sgy: give inline= or crossline=, not both"):
        read_section(path, inline=100, crossline=200)


def test_3d_with_missing_traces(tmp_path, write_cube):
    path = write_cube(tmp_path / "holes.sgy", 3, 4, 5, drop={(1, 2), (2, 0)})
    assert inspect_file(path)["geometry"]["n_missing_traces"] == 2
    s = read_section(path, inline=101)
    np.testing.assert_array_equal(s.crossline.values, [200, 201, 203])
    np.testing.assert_allclose(s.distance.values, [0, 25, 75])  # the gap shows in the distance
    c = read_section(path, crossline=200)
    np.testing.assert_array_equal(c.inline.values, [100, 101])


def test_nan_inf_and_dead_traces_are_masked_and_reported(tmp_path, write_segy):
    data = np.arange(1, 25, dtype=np.float32).reshape(4, 6)
    data[1, 2] = np.nan
    data[2, 0] = np.inf
    data[2, 5] = -np.inf
    data[3] = 0.0
    path = write_segy(tmp_path / "bad-samples.sgy", data, headers={181: [0, 25, 50, 75], 71: 1})
    with pytest.warns(DataQualityWarning, match=r"bad-samples\.sgy: 3 NaN/inf samples in 2 traces.*1 dead"):
        s = read_section(path)
    assert s.attrs["n_nonfinite"] == 3
    assert s.attrs["nonfinite_traces"] == [1, 2]
    assert s.attrs["dead_traces"] == [3]
    expected = np.where(np.isfinite(data), data, 0)
    np.testing.assert_array_equal(s.values, expected)


def test_input_file_is_not_modified(tmp_path, write_cube):
    import hashlib

    path = write_cube(tmp_path / "ro.sgy", 3, 3, 4)
    before = hashlib.sha256(path.read_bytes()).hexdigest()
    read_section(path, inline=101)
    list(iter_sections(path))
    inspect_file(path)
    assert hashlib.sha256(path.read_bytes()).hexdigest() == before


def test_inline_read_does_not_load_the_cube(tmp_path, write_raw_cube):
    # common practice, no source: reading one line must touch only that line's traces
    n_il, n_xl, ns = 80, 60, 500
    path = write_raw_cube(tmp_path / "big.sgy", n_il, n_xl, ns)
    cube_bytes = n_il * n_xl * ns * 4
    read_section(path, inline=101)  # warm-up: first-time imports are not part of a read
    tracemalloc.start()
    try:
        s = read_section(path, inline=130)
        _, peak = tracemalloc.get_traced_memory()
    finally:
        tracemalloc.stop()
    assert s.sizes == {"trace": n_xl, "z": ns}
    np.testing.assert_allclose(s.isel(z=0).values, 130000 + np.arange(200, 260))
    np.testing.assert_allclose(s.distance.values, 25.0 * np.arange(n_xl))
    assert peak < 0.25 * cube_bytes, f"peak {peak} bytes vs cube {cube_bytes} bytes"


def test_feet_are_converted_and_arc_seconds_fall_back(tmp_path, write_segy):
    # SEG-Y rev 1: binary bytes 3255-3256 = 2 means feet; trace bytes 89-90 = 2 means arc seconds.
    # International foot = 0.3048 m exactly (common practice, no source)
    path = write_segy(tmp_path / "feet.sgy", np.ones((3, 4)), headers={71: 1, 181: [0, 100, 200], 185: 0},
                      binary={3255: 2})
    s = read_section(path)
    np.testing.assert_allclose(s.x.values, [0.0, 30.48, 60.96])
    assert any("feet" in f for f in s.attrs["fallbacks"])
    path = write_segy(tmp_path / "arcsec.sgy", np.ones((3, 4)), headers={71: 1, 89: 2, 181: [0, 100, 200], 185: 0})
    with pytest.warns(FallbackWarning, match=r"arcsec\.sgy: trace coordinates are in arc seconds"):
        s = read_section(path)
    np.testing.assert_allclose(s.distance.values, [0, 25, 50])


def test_option_errors_name_the_file(tmp_path, write_segy):
    path = write_segy(tmp_path / "opts.sgy", np.ones((3, 4)), headers={71: 1, 181: [0, 1, 2]})
    with pytest.raises(GeometryError, match=r"opts\.sgy: domain must be one of"):
        read_section(path, domain="frequency")
    with pytest.raises(GeometryError, match=r"opts\.sgy: coordinates='receiver' is not one of"):
        read_section(path, coordinates="receiver")
    with pytest.raises(GeometryError, match=r"opts\.sgy: header_bytes key 'offset' is not one of"):
        read_section(path, header_bytes={"offset": 37})
    with pytest.raises(GeometryError, match=r"opts\.sgy: not a 3D post-stack volume \(2d\)"):
        next(iter_sections(path))
    with pytest.raises(GeometryError, match=r"opts\.sgy: inline=3 asked for, but the file is not a 3D"):
        read_section(path, inline=3)
