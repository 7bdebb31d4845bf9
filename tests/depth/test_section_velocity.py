"""Velocity sections: per-trace integration and matching to the seismic."""

import numpy as np
import pytest
from numpy.testing import assert_allclose
from scipy.integrate import cumulative_trapezoid

from clinometry.depth import SectionVelocity, TableVelocity, interval_to_rms
from clinometry.errors import VelocityError
from clinometry.section import make_section


def test_velocity_linear_in_time_integrates_exactly():
    # v(t) = 2000 + 1500 t (t in s) gives z = integral_0^t v/2 dt = 1000 t + 375 t^2 (calculus,
    # by hand); the trapezoid rule is exact for a velocity linear in time
    t = np.arange(0.0, 2001.0, 4.0)
    v = np.vstack([2000.0 + 1.5 * t, np.full_like(t, 2500.0)])
    m = SectionVelocity(v, twt_ms=t)
    ts = t / 1000.0
    expected = 1000.0 * ts + 375.0 * ts**2
    assert_allclose(m.depth_m(t, trace=0), expected, rtol=1e-12)
    assert_allclose(m.depth_m(t, trace=1), 2500.0 * ts / 2.0, rtol=1e-12)


def test_depth_matches_scipy_cumulative_trapezoid_per_trace():
    # independent integrator: scipy.integrate.cumulative_trapezoid of v/2 over t (s)
    rng = np.random.default_rng(7)
    t = np.arange(0.0, 1500.0, 4.0)
    v = 1800.0 + np.cumsum(rng.uniform(0.0, 8.0, size=(4, t.size)), axis=1)
    m = SectionVelocity(v, twt_ms=t)
    for k in range(4):
        expected = cumulative_trapezoid(v[k] / 2.0, t / 1000.0, initial=0.0)
        assert_allclose(m.depth_m(t, trace=k), expected, rtol=1e-12)
    # off-sample times and a round trip to 1e-6 m
    depths = np.linspace(0.0, 1400.0, 57)
    for k in range(4):
        assert_allclose(m.depth_m(m.twt_ms(depths, trace=k), trace=k), depths, atol=1e-6)


def test_first_velocity_is_extended_up_to_time_zero_and_last_below():
    # velocity samples start at 100 ms: 0-100 ms uses the first velocity (z = v t / 2)
    m = SectionVelocity([[2000.0, 2000.0, 3000.0]], twt_ms=[100.0, 200.0, 300.0])
    assert_allclose(m.depth_m([100.0, 200.0, 300.0, 400.0], trace=0), [100.0, 200.0, 325.0, 475.0])


def test_rms_velocity_section_equals_its_interval_table():
    # per-trace Dix (1955) inversion reproduces the interval layers of a TableVelocity
    t = np.array([250.0, 600.0, 1100.0, 1800.0])
    layers = np.array([[1900.0, 2300.0, 3100.0, 3600.0], [1700.0, 2900.0, 2900.0, 4400.0]])
    m = SectionVelocity(interval_to_rms(t, layers), twt_ms=t, kind="rms")
    times = np.linspace(0.0, 2500.0, 51)
    for k in range(2):
        assert_allclose(m.depth_m(times, trace=k), TableVelocity(t, layers[k]).depth_m(times), rtol=1e-10)
        assert_allclose(m.interval_velocity([250.0, 900.0, 3000.0], trace=k), layers[k][[0, 2, 3]], rtol=1e-10)


def test_scaled_section_velocity_scales_depth():
    m = SectionVelocity([[2000.0, 2600.0], [2200.0, 3000.0]], twt_ms=[0.0, 1000.0])
    assert_allclose(m.scaled(1.08).depth_m([500.0, 1500.0], trace=[0, 1]), 1.08 * m.depth_m([500.0, 1500.0], trace=[0, 1]))
    d = m.to_dict()
    assert d["model"] == "section" and d["n_traces"] == 2
    assert d["interval_velocity_range_m_s"] == [2000.0, 3000.0]


def test_section_velocity_needs_a_trace_index():
    m = SectionVelocity([[2000.0, 2600.0]], twt_ms=[0.0, 1000.0], source="vel.sgy")
    with pytest.raises(VelocityError, match=r"vel.sgy: a velocity section needs the trace index"):
        m.depth_m([100.0])
    with pytest.raises(VelocityError, match="vel.sgy: trace 3 is outside the 1 traces"):
        m.depth_m([100.0], trace=3)


def test_zero_velocity_sample_names_trace_and_sample():
    v = np.full((3, 5), 2500.0)
    v[2, 4] = 0.0
    with pytest.raises(VelocityError, match=r"vel.sgy: interval velocity \(trace 2, sample 4\) is 0 m/s"):
        SectionVelocity(v, twt_ms=np.arange(5) * 4.0, source="vel.sgy")


# -- matching -----------------------------------------------------------------

def _vel_section(values, *, cdp=None, inline=None, crossline=None, name="vel.sgy"):
    values = np.asarray(values, dtype=float)
    return make_section(
        values[:, None].repeat(3, 1), z=[0.0, 500.0, 1000.0], cdp=cdp, inline=inline, crossline=crossline,
        trace_spacing_m=25.0, attrs={"source_path": name},
    )


def _seis(n, *, cdp=None, inline=None, crossline=None, name="line.sgy"):
    return make_section(np.zeros((n, 4)), z=[0.0, 4.0, 8.0, 12.0], cdp=cdp, inline=inline, crossline=crossline,
                        trace_spacing_m=25.0, attrs={"source_path": name})


def test_match_by_cdp_picks_the_right_velocity_traces():
    vel = _vel_section([2000, 2100, 2200, 2300, 2400], cdp=[10, 11, 12, 13, 14])
    seis = _seis(3, cdp=[13, 11, 12])
    m = SectionVelocity.from_section(vel, seis)
    assert m.matched_by == "cdp"
    # z = v t / 2 at 1000 ms for velocities of CDPs 13, 11, 12
    assert_allclose(m.depth_m(1000.0, trace=[0, 1, 2]), [1150.0, 1050.0, 1100.0])


def test_match_by_inline_crossline_in_3d():
    il, xl = np.meshgrid([5, 6], [20, 21, 22], indexing="ij")
    vel = _vel_section(2000 + 100 * np.arange(6), inline=il.ravel(), crossline=xl.ravel())
    seis = _seis(2, inline=[6, 5], crossline=[22, 21])
    m = SectionVelocity.from_section(vel, seis)
    assert m.matched_by == "inline/crossline"
    # (6, 22) is the 6th velocity trace (2500 m/s), (5, 21) the 2nd (2100 m/s)
    assert_allclose(m.depth_m(1000.0, trace=[0, 1]), [1250.0, 1050.0])


def test_match_by_position_when_counts_agree_and_no_numbers():
    m = SectionVelocity.from_section(_vel_section([2000, 3000]), _seis(2))
    assert m.matched_by == "trace"
    assert_allclose(m.depth_m(1000.0, trace=[0, 1]), [1000.0, 1500.0])


def test_missing_cdp_names_cdp_trace_and_files():
    vel = _vel_section([2000, 2100, 2200], cdp=[10, 11, 12], name="/v/vel_line7.sgy")
    seis = _seis(2, cdp=[12, 13], name="/s/line7.sgy")
    with pytest.raises(VelocityError, match="vel_line7.sgy does not match line7.sgy: CDP 13 \\(trace 1\\) has no velocity trace"):
        SectionVelocity.from_section(vel, seis)


def test_missing_inline_crossline_is_named():
    vel = _vel_section([2000, 2100], inline=[5, 5], crossline=[20, 21])
    seis = _seis(1, inline=[7], crossline=[20])
    with pytest.raises(VelocityError, match="trace 0 \\(inline 7, crossline 20\\) has no velocity trace"):
        SectionVelocity.from_section(vel, seis)


def test_trace_count_mismatch_without_numbers_is_refused():
    with pytest.raises(VelocityError, match="vel.sgy does not match line.sgy: 3 velocity traces for 2 seismic traces"):
        SectionVelocity.from_section(_vel_section([2000, 2100, 2200]), _seis(2))


def test_depth_domain_velocity_section_is_refused():
    vel = make_section(np.full((2, 3), 2500.0), z=[0.0, 10.0, 20.0], domain="depth", attrs={"source_path": "vdepth.sgy"})
    with pytest.raises(VelocityError, match="vdepth.sgy: velocity section is in depth"):
        SectionVelocity.from_section(vel, _seis(2))
