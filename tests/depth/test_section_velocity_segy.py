"""Velocity SEG-Y files (written here with segyio) matched to seismic sections."""

import numpy as np
import pytest
from numpy.testing import assert_allclose

segyio = pytest.importorskip("segyio")

from clinometry.depth import SectionVelocity, velocity_from_options  # noqa: E402
from clinometry.errors import VelocityError  # noqa: E402
from clinometry.section import make_section  # noqa: E402

DT_US = 4000  # 4 ms
N_SAMPLES = 251  # 0-1000 ms


def _write_2d(path, velocities, cdps):
    """2D velocity line: trace i holds velocities[i] at every sample (encodes its own CDP)."""
    spec = segyio.spec()
    spec.format = 5  # IEEE float (SEG-Y rev 1 format code 5)
    spec.samples = list(range(N_SAMPLES))
    spec.tracecount = len(cdps)
    with segyio.create(path, spec) as f:
        f.bin.update(hdt=DT_US, hns=N_SAMPLES)
        for i, (v, cdp) in enumerate(zip(velocities, cdps)):
            f.header[i] = {
                segyio.TraceField.CDP: int(cdp),
                segyio.TraceField.CDP_X: 1000 + 25 * i,
                segyio.TraceField.CDP_Y: 5000,
                segyio.TraceField.TRACE_SAMPLE_INTERVAL: DT_US,
                segyio.TraceField.TRACE_SAMPLE_COUNT: N_SAMPLES,
            }
            f.trace[i] = np.full(N_SAMPLES, v, dtype=np.float32)


def _vel_3d(il, xl):
    return 2000.0 + 100.0 * il + 10.0 * xl  # velocity encodes its own bin


def _write_3d(path, inlines, crosslines):
    spec = segyio.spec()
    spec.format = 5
    spec.sorting = 2  # inline sorting
    spec.samples = list(range(N_SAMPLES))
    spec.ilines = list(inlines)
    spec.xlines = list(crosslines)
    with segyio.create(path, spec) as f:
        f.bin.update(hdt=DT_US, hns=N_SAMPLES)
        k = 0
        for il in inlines:
            for xl in crosslines:
                f.header[k] = {
                    segyio.TraceField.INLINE_3D: il,
                    segyio.TraceField.CROSSLINE_3D: xl,
                    segyio.TraceField.CDP_X: 100 * xl,
                    segyio.TraceField.CDP_Y: 100 * il,
                    segyio.TraceField.TRACE_SAMPLE_INTERVAL: DT_US,
                    segyio.TraceField.TRACE_SAMPLE_COUNT: N_SAMPLES,
                }
                f.trace[k] = np.full(N_SAMPLES, _vel_3d(il, xl), dtype=np.float32)
                k += 1


def _seis(**coords):
    n = len(next(iter(coords.values())))
    return make_section(np.zeros((n, 5)), z=np.arange(5) * 4.0, trace_spacing_m=25.0,
                        attrs={"source_path": "line_f.sgy"}, **coords)


def test_2d_velocity_segy_matched_by_cdp(tmp_path):
    p = tmp_path / "vel2d.sgy"
    _write_2d(p, velocities=[2000, 2200, 2400, 2600, 2800], cdps=[101, 102, 103, 104, 105])
    m = SectionVelocity.from_segy(p, section=_seis(cdp=[104, 102]))
    assert m.matched_by == "cdp"
    # z = v t / 2 at 1000 ms for CDPs 104 (2600 m/s) and 102 (2200 m/s) (common practice, no source)
    assert_allclose(m.depth_m(1000.0, trace=[0, 1]), [1300.0, 1100.0], rtol=1e-6)
    assert m.to_dict()["source"] == "vel2d.sgy"


def test_velocity_file_option_reads_segy(tmp_path):
    p = tmp_path / "vel2d.sgy"
    _write_2d(p, velocities=[2000, 3000], cdps=[7, 8])
    m = velocity_from_options(velocity_file=p, section=_seis(cdp=[7, 8]))
    assert isinstance(m, SectionVelocity)
    assert_allclose(m.depth_m(500.0, trace=[0, 1]), [500.0, 750.0], rtol=1e-6)


def test_velocity_file_option_passes_lateral_interpolation(tmp_path):
    p = tmp_path / "vel2d.sgy"
    _write_2d(p, velocities=[2000, 3000], cdps=[10, 20])
    m = velocity_from_options(velocity_file=p, section=_seis(cdp=[10, 15]), velocity_lateral="linear")
    # 2500 m/s halfway between CDPs 10 and 20 (linear interpolation); z = v t / 2 at 1 s
    assert_allclose(m.depth_m(1000.0, trace=[0, 1]), [1000.0, 1250.0], rtol=1e-6)
    with pytest.raises(VelocityError, match="applies to a velocity SEG-Y only"):
        velocity_from_options(velocity=2500, velocity_lateral="linear")


def test_2d_velocity_segy_missing_cdp_is_named(tmp_path):
    p = tmp_path / "vel2d.sgy"
    _write_2d(p, velocities=[2000, 3000], cdps=[7, 8])
    with pytest.raises(VelocityError, match="vel2d.sgy does not match line_f.sgy: CDP 9 \\(trace 1\\)"):
        SectionVelocity.from_segy(p, section=_seis(cdp=[8, 9]))


def test_3d_velocity_volume_matched_on_an_inline_a_crossline_and_a_diagonal(tmp_path):
    p = tmp_path / "vel3d.sgy"
    _write_3d(p, inlines=[1, 2, 3], crosslines=[10, 11, 12, 13])
    cases = {
        "inline": ([2, 2, 2], [13, 10, 11]),
        "crossline": ([3, 1], [12, 12]),
        "diagonal": ([1, 2, 3], [10, 11, 12]),
    }
    for name, (il, xl) in cases.items():
        m = SectionVelocity.from_segy(p, section=_seis(inline=il, crossline=xl))
        assert m.matched_by == "inline/crossline", name
        expected = _vel_3d(np.array(il), np.array(xl)) * 1.0 / 2.0  # z = v t / 2 at t = 1 s
        assert_allclose(m.depth_m(1000.0, trace=np.arange(len(il))), expected, rtol=1e-6, err_msg=name)


def test_3d_velocity_volume_without_the_line_is_a_velocity_error(tmp_path):
    p = tmp_path / "vel3d.sgy"
    _write_3d(p, inlines=[1, 2], crosslines=[10, 11])
    with pytest.raises(VelocityError, match="vel3d.sgy does not match line_f.sgy"):
        SectionVelocity.from_segy(p, section=_seis(inline=[5, 5], crossline=[10, 11]))
    with pytest.raises(VelocityError, match="trace 1 \\(inline 2, crossline 12\\) has no velocity trace"):
        SectionVelocity.from_segy(p, section=_seis(inline=[2, 2], crossline=[11, 12]))


def test_3d_velocity_volume_needs_inline_crossline_on_the_section(tmp_path):
    p = tmp_path / "vel3d.sgy"
    _write_3d(p, inlines=[1, 2], crosslines=[10, 11])
    with pytest.raises(VelocityError, match="vel3d.sgy is a 3D velocity volume but line_f.sgy has no inline/crossline"):
        SectionVelocity.from_segy(p, section=_seis(cdp=[1, 2]))


def test_coarse_3d_velocity_grid_is_interpolated_bilinearly_when_asked(tmp_path):
    # velocity every 2nd inline and 3rd crossline; v = 2000 + 100 il + 10 xl is linear in
    # (il, xl), so bilinear interpolation must reproduce it exactly at the seismic bins (by hand)
    p = tmp_path / "vel3d_coarse.sgy"
    _write_3d(p, inlines=[1, 3, 5], crosslines=[10, 13, 16])
    cases = {
        "inline between velocity inlines": ([2, 2, 2], [10, 11, 15]),
        "crossline between velocity crosslines": ([1, 3, 4], [14, 14, 14]),
        "diagonal": ([1, 2, 3, 4], [10, 12, 13, 16]),
    }
    for name, (il, xl) in cases.items():
        m = SectionVelocity.from_segy(p, section=_seis(inline=il, crossline=xl), lateral="linear")
        assert m.matched_by == "inline/crossline, interpolated", name
        expected = _vel_3d(np.array(il), np.array(xl)) / 2.0  # z = v t / 2 at t = 1 s
        assert_allclose(m.depth_m(1000.0, trace=np.arange(len(il))), expected, rtol=1e-6, err_msg=name)


def test_coarse_3d_velocity_grid_without_lateral_interpolation_is_refused(tmp_path):
    p = tmp_path / "vel3d_coarse.sgy"
    _write_3d(p, inlines=[1, 3], crosslines=[10, 13])
    with pytest.raises(VelocityError, match="trace 0 \\(inline 3, crossline 11\\) has no velocity trace.*lateral='linear'"):
        SectionVelocity.from_segy(p, section=_seis(inline=[3, 3], crossline=[11, 13]))
    # interpolation never extrapolates sideways
    with pytest.raises(VelocityError, match="trace 1 \\(inline 3, crossline 14\\) has no velocity trace"):
        SectionVelocity.from_segy(p, section=_seis(inline=[3, 3], crossline=[13, 14]), lateral="linear")


def test_sparse_2d_velocity_cdps_are_interpolated_linearly_when_asked(tmp_path):
    # velocity analyses every 10 CDPs; linear in CDP between them (common practice, no source)
    p = tmp_path / "vel2d_sparse.sgy"
    _write_2d(p, velocities=[2000, 3000, 2500], cdps=[100, 110, 120])
    m = SectionVelocity.from_segy(p, section=_seis(cdp=[100, 104, 110, 115, 120]), lateral="linear")
    assert m.matched_by == "cdp, interpolated"
    # by hand: 2400 m/s at CDP 104, 2750 m/s at CDP 115; z = v t / 2 at t = 1 s
    assert_allclose(m.depth_m(1000.0, trace=np.arange(5)), [1000.0, 1200.0, 1500.0, 1375.0, 1250.0], rtol=1e-6)
    with pytest.raises(VelocityError, match="CDP 121 \\(trace 1\\) has no velocity trace; the velocity has CDPs 100-120"):
        SectionVelocity.from_segy(p, section=_seis(cdp=[120, 121]), lateral="linear")
