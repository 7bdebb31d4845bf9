"""ObsPy as an independent SEG-Y reader: samples and headers must agree.

ObsPy takes the sample count from each trace header (bytes 115-116); many
reference files leave it 0 or stale, so for those ObsPy reads an in-memory
copy whose trace headers carry the binary-header count (the files on disk are
untouched), as the reference README describes.
"""

import io
import struct
import warnings

import numpy as np
import pytest

from clinometry.errors import FallbackWarning
from clinometry.io import iter_sections, read_section

obspy = pytest.importorskip("obspy")
pytestmark = pytest.mark.requires_obspy


def _obspy_read(path, *, fix_samples=False, byte_order="big"):
    from obspy.io.segy.segy import _read_segy

    raw = bytearray(path.read_bytes())
    if fix_samples:
        e = ">" if byte_order == "big" else "<"
        ns = struct.unpack_from(e + "H", raw, 3220)[0]
        bps = {1: 4, 2: 4, 3: 2, 5: 4}[struct.unpack_from(e + "h", raw, 3224)[0]]
        for off in range(3600, len(raw), 240 + ns * bps):
            struct.pack_into(e + "H", raw, off + 114, ns)  # trace bytes 115-116
    return _read_segy(io.BytesIO(bytes(raw)), endian=">" if byte_order == "big" else "<", unpack_headers=True)


OBSPY_FILES = ["00001034.sgy_first_trace", "1.sgy_first_trace", "example.y_first_trace",
               "ld0042_file_00018.sgy_first_trace", "planes.segy_first_trace"]


# byte order of each file as ObsPy's readme.txt lists it
OBSPY_BYTE_ORDER = {"00001034.sgy_first_trace": "little", "1.sgy_first_trace": "big",
                    "example.y_first_trace": "big", "ld0042_file_00018.sgy_first_trace": "big",
                    "planes.segy_first_trace": "little"}


def _unnormalized_ibm(path, n):
    """Samples of the first trace that are unnormalised IBM floats (leading hex digit 0)."""
    e = "<" if OBSPY_BYTE_ORDER[path.name] == "little" else ">"
    u = np.frombuffer(path.read_bytes()[3840:3840 + 4 * n], dtype=e + "u4")
    return ((u & 0x00F00000) == 0) & ((u & 0x00FFFFFF) != 0)


@pytest.mark.parametrize("name", OBSPY_FILES)
def test_obspy_files_reproduce_npy_references(data_dir, name):
    path = data_dir / "obspy-segy" / name
    # ObsPy's own reference array for the first trace (obspy/io/segy/tests/data/<name>.npy)
    expected = np.load(str(path) + ".npy").ravel()
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", FallbackWarning)  # single-trace files: no coordinates
        s = read_section(path)
    actual = s.values[0]
    assert s.attrs["byte_order"] == OBSPY_BYTE_ORDER[name]
    np.testing.assert_array_equal(actual, expected)
    if s.attrs["sample_format"].startswith("4-byte IBM"):
        # segyio 1.9.14 mis-decodes unnormalised IBM floats (fraction's leading hex digit 0);
        # the reader recomputes exactly those and says how many in attrs["notes"]
        n_unnorm = int(_unnormalized_ibm(path, expected.size).sum())
        if n_unnorm:
            assert f"{n_unnorm} unnormalised IBM float samples" in " ".join(s.attrs["notes"])
    st = obspy.read(str(path), format="SEGY", unpack_trace_headers=True)
    tr = st[0]
    assert s.sizes["z"] == tr.stats.npts
    assert s.attrs["sample_interval"] == pytest.approx(tr.stats.delta * 1000)
    # ObsPy reports the delay recording time (bytes 109-110) and time scalar (215-216)
    # unscaled; SEG-Y rev 1: negative scalar divides, positive multiplies, 0 means 1;
    # the scalar field exists only from rev 1 on (bytes 3501-3502)
    th = tr.stats.segy.trace_header
    d, sc = th.delay_recording_time, th.scalar_to_be_applied_to_times
    if st.stats.binary_file_header.seg_y_format_revision_number < 256:
        sc = 0
    assert float(s.z[0]) == pytest.approx(d / -sc if sc < 0 else d * (sc or 1))


def test_delay_scalar_matches_obspy_as_is(data_dir):
    path = data_dir / "segy-reference" / "delay-scalar.sgy"
    # reference README: the only reference file ObsPy reads as is; identical samples
    st = obspy.read(str(path), format="SEGY", unpack_trace_headers=True)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", FallbackWarning)
        s = read_section(path)
    np.testing.assert_array_equal(s.values[0], st[0].data)
    text = st.stats.textual_file_header.decode("ascii")
    assert s.attrs["text_header"].splitlines()[0] == text[:80].rstrip()


@pytest.mark.parametrize("name, byte_order", [
    ("f3.sgy", "big"), ("f3-lsb.sgy", "little"), ("small.sgy", "big"), ("small-lsb.sgy", "little"),
    ("multiformats/Format1msb.sgy", "big"), ("multiformats/Format2msb.sgy", "big"),
    ("multiformats/Format5msb.sgy", "big"), ("long.sgy", "big"),
])
def test_reference_files_match_obspy_on_corrected_copy(data_dir, name, byte_order):
    path = data_dir / "segy-reference" / name
    ref = _obspy_read(path, fix_samples=True, byte_order=byte_order)
    expected = np.stack([t.data for t in ref.traces]).astype(np.float32)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", FallbackWarning)
        if name == "long.sgy":
            actual = read_section(path).values
        else:
            actual = np.concatenate([s.values for s in iter_sections(path)])  # inline-sorted files
    np.testing.assert_array_equal(actual, expected)
    # headers: inline/crossline (189/193) as ObsPy unpacks them
    if name != "long.sgy":
        il = [t.header.for_3d_poststack_data_this_field_is_for_in_line_number for t in ref.traces]
        s = read_section(path, inline=il[0]) if name.startswith(("f3", "multi")) else None
        if s is not None:
            xl = [t.header.for_3d_poststack_data_this_field_is_for_cross_line_number for t in ref.traces
                  if t.header.for_3d_poststack_data_this_field_is_for_in_line_number == il[0]]
            np.testing.assert_array_equal(s.crossline.values, xl)
            sc = ref.traces[0].header.scalar_to_be_applied_to_all_coordinates
            x0 = ref.traces[0].header.x_coordinate_of_ensemble_position_of_this_trace
            # SEG-Y rev 1 bytes 71-72: negative divides, positive multiplies, 0 means 1
            expected_x0 = x0 / -sc if sc < 0 else x0 * (sc or 1)
            assert float(s.x[0]) == pytest.approx(expected_x0)


@pytest.mark.parametrize("name", ["teapot-line.sgy", "northsea-line.sgy", "australia-curt-line.sgy"])
def test_real_lines_match_obspy(data_dir, name):
    path = data_dir / "real-lines" / name
    st = obspy.read(str(path), format="SEGY", unpack_trace_headers=True)
    s = read_section(path)
    np.testing.assert_array_equal(s.values, np.stack([t.data for t in st]))
    np.testing.assert_array_equal(
        s.x.values, [t.stats.segy.trace_header.x_coordinate_of_ensemble_position_of_this_trace for t in st])
    np.testing.assert_array_equal(
        s.cdp.values, [t.stats.segy.trace_header.ensemble_number for t in st])
    assert s.attrs["sample_interval"] == pytest.approx(st[0].stats.delta * 1000)
