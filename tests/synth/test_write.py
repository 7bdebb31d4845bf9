"""SEG-Y written by synth reads back identically through ObsPy (independent reader)."""

import json

import numpy as np
import pytest

from clinometry.errors import GeometryError
from clinometry.synth import make_cube, make_line, write_cube, write_line, write_segy

obspy_segy = pytest.importorskip("obspy.io.segy.segy")

pytestmark = pytest.mark.requires_obspy


@pytest.fixture(scope="module")
def line():
    return make_line("steep_margin", seed=5, delay_ms=20.0, azimuth_deg=135.0)


def test_ieee_line_reads_back_identically_through_obspy(tmp_path, line):
    sec, truth = line
    sgy, js = write_line(sec, truth, tmp_path / "steep.sgy", sample_format="ieee")
    st = obspy_segy._read_segy(str(sgy))
    data = np.array([t.data for t in st.traces])
    # ObsPy reads SEG-Y rev 1 independently: IEEE samples are bit-identical
    np.testing.assert_array_equal(data, sec.values)
    b = st.binary_file_header
    assert b.data_sample_format_code == 5  # SEG-Y rev 1 table 1: 5 = IEEE float
    assert b.sample_interval_in_microseconds == 2000
    assert b.number_of_samples_per_data_trace == sec.sizes["z"]
    h = [t.header for t in st.traces]
    np.testing.assert_array_equal([x.ensemble_number for x in h], sec["cdp"].values)
    assert {x.scalar_to_be_applied_to_all_coordinates for x in h} == {-100}
    assert {x.delay_recording_time for x in h} == {20}
    # coordinate scalar -100: divide by 100 (SEG-Y rev 1, bytes 71-72)
    x = np.array([t.x_coordinate_of_ensemble_position_of_this_trace for t in h]) / 100.0
    y = np.array([t.y_coordinate_of_ensemble_position_of_this_trace for t in h]) / 100.0
    np.testing.assert_allclose(x, sec["x"].values, atol=0.005)
    np.testing.assert_allclose(y, sec["y"].values, atol=0.005)
    # azimuth 135 deg: x grows and y falls by spacing / sqrt(2) per trace
    np.testing.assert_allclose(np.diff(x), 12.5 / np.sqrt(2.0), atol=0.011)
    np.testing.assert_allclose(np.diff(y), -12.5 / np.sqrt(2.0), atol=0.011)
    t = json.loads(js.read_text())
    assert js.name == "steep.truth.json" and t["segy_file"] == "steep.sgy"
    assert t["margins"][0]["break"] == truth["margins"][0]["break"]
    assert b"SCENARIO steep_margin" in st.textual_file_header


def test_ibm_line_reads_back_within_ibm_precision(tmp_path, line):
    sec, truth = line
    sgy, _ = write_line(sec, truth, tmp_path / "steep_ibm.sgy", sample_format="ibm")
    st = obspy_segy._read_segy(str(sgy))
    assert st.binary_file_header.data_sample_format_code == 1  # IBM float
    data = np.array([t.data for t in st.traces])
    # IBM float has a 24-bit fraction with hex exponent: relative error < 2**-20
    np.testing.assert_allclose(data, sec.values, rtol=2.0**-20, atol=1e-12)


def test_depth_line_interval_in_millimetres(tmp_path):
    sec, truth = make_line("rimmed_shelf", domain="depth", dz_m=2.5, n_samples=120)
    sgy, _ = write_line(sec, truth, tmp_path / "d.sgy")
    st = obspy_segy._read_segy(str(sgy))
    # depth sample interval stored in thousandths of a metre (common practice, no source)
    assert st.binary_file_header.sample_interval_in_microseconds == 2500


def test_cube_inline_crossline_bytes_read_by_obspy(tmp_path):
    cube, truth = make_cube(n_inlines=3, n_samples=40, snr=None)
    sgy, js = write_cube(cube, truth, tmp_path / "cube.sgy")
    st = obspy_segy._read_segy(str(sgy))
    il = np.array([t.header.for_3d_poststack_data_this_field_is_for_in_line_number for t in st.traces])
    xl = np.array([t.header.for_3d_poststack_data_this_field_is_for_cross_line_number for t in st.traces])
    n_xl = cube.sizes["crossline"]
    np.testing.assert_array_equal(il, np.repeat(cube["inline"].values, n_xl))
    np.testing.assert_array_equal(xl, np.tile(cube["crossline"].values, 3))
    data = np.array([t.data for t in st.traces])
    np.testing.assert_array_equal(data, cube.values.reshape(-1, 40))
    t = json.loads(js.read_text())
    assert [d["inline"] for d in t["inlines"]] == cube["inline"].values.tolist()


def test_curved_cube_margin_moves_across_inlines():
    cube, truth = make_cube(n_inlines=9, n_samples=40, snr=None)
    xl = [d["margins"][0]["break"]["crossline"] for d in truth["inlines"]]
    # the substrate bend (a half sine) moves the break basinward mid-cube and back
    assert xl[4] - xl[0] >= 15 and xl[4] - xl[-1] >= 15


def test_write_refuses_fractional_delay_and_names_file(tmp_path):
    with pytest.raises(GeometryError, match="odd.sgy"):
        write_segy(tmp_path / "odd.sgy", np.zeros((2, 5)), z=np.arange(5) * 2.0 + 0.5, domain="twt",
                   cdp_x=np.zeros(2), cdp_y=np.zeros(2))
    assert not list(tmp_path.iterdir())
