"""Whole-section and horizon conversion between two-way time and depth."""

import numpy as np
import pytest
import xarray as xr
from numpy.testing import assert_allclose
from scipy.integrate import solve_ivp

from clinometry.depth import (
    ConstantVelocity,
    LinearVelocity,
    SectionVelocity,
    TableVelocity,
    horizon_to_depth,
    horizon_to_twt,
    section_to_depth,
    section_to_twt,
    to_depth,
)
from clinometry.errors import GeometryError, VelocityError
from clinometry.section import make_section

DT_MS = 2.0
SIGMA_MS = 6.0


def _twt_section(reflector_twt_ms, *, n_z=1001, source="line_a.sgy"):
    """Gaussian pulse per trace centred on the reflector time (encodes its own position)."""
    t = np.arange(n_z) * DT_MS
    tr = np.asarray(reflector_twt_ms, dtype=float)[:, None]
    data = np.exp(-0.5 * ((t[None, :] - tr) / SIGMA_MS) ** 2).astype(np.float32)
    return make_section(
        data,
        z=t,
        cdp=np.arange(100, 100 + tr.shape[0]),
        trace_spacing_m=25.0,
        attrs={"source_path": source},
    )


def _peak(values, axis):
    """Peak position by a parabola through the top three samples."""
    i = int(np.nanargmax(values))
    a, b, c = values[i - 1], values[i], values[i + 1]
    return axis[i] + 0.5 * (a - c) / (a - 2 * b + c) * (axis[1] - axis[0])


def test_section_to_depth_puts_a_reflector_at_its_known_depth_constant_velocity():
    # reflector at 1200 m under 2400 m/s is at t = 2 z / v = 1000 ms (common practice, no source)
    sec = _twt_section(np.full(5, 1000.0))
    before = sec.copy(deep=True)
    d = section_to_depth(sec, ConstantVelocity(2400.0))
    assert d.attrs["domain"] == "depth" and d["z"].attrs["units"] == "m"
    assert d.dtype == np.float32
    assert d.attrs["velocity_model"] == {"model": "constant", "velocity_m_s": 2400.0}
    # default dz = v dt / 2 = 2.4 m
    assert d.attrs["sample_interval"] == pytest.approx(2.4)
    for i in range(5):
        assert _peak(d.values[i], d["z"].values) == pytest.approx(1200.0, abs=0.1)
    xr.testing.assert_identical(sec, before)  # input untouched
    xr.testing.assert_equal(d["cdp"], sec["cdp"])
    xr.testing.assert_equal(d["distance"], sec["distance"])


def test_section_to_depth_linear_velocity_dipping_reflector():
    # reflector times on time samples, so the sampled pulse peaks exactly there; the
    # expected depths come from scipy's solve_ivp integration of dz/dt = v(z)/2 with
    # v(z) = 1800 + 0.6 z, independent of the closed form in the model
    v0, k = 1800.0, 0.6
    twt = np.array([900.0, 1000.0, 1100.0, 1200.0, 1300.0, 1400.0])
    sol = solve_ivp(lambda t, z: [(v0 + k * z[0]) / 2.0], (0.0, 1.5), [0.0], t_eval=twt / 1000.0, rtol=1e-11, atol=1e-9)
    d = section_to_depth(_twt_section(twt), LinearVelocity(v0, k), dz_m=1.0)
    assert d.attrs["sample_interval"] == pytest.approx(1.0)
    got = [_peak(d.values[i], d["z"].values) for i in range(twt.size)]
    assert_allclose(got, sol.y[0], atol=0.1)  # parabolic peak on 1 m samples


def test_section_to_depth_with_laterally_varying_velocity_flattens_a_flat_reflector():
    # one reflector at 1500 m; each trace has its own constant velocity, so its TWT differs
    # velocities chosen so that t = 2 z / v (common practice, no source) falls on a sample
    twt = np.array([1500.0, 1400.0, 1250.0, 1200.0, 1000.0, 860.0])
    v = 2.0 * 1500.0 / (twt / 1000.0)
    sec = _twt_section(twt)
    vel = SectionVelocity(np.repeat(v[:, None], 3, axis=1), twt_ms=[0.0, 1000.0, 2000.0])
    d = section_to_depth(sec, vel, dz_m=2.0)
    assert_allclose([_peak(d.values[i], d["z"].values) for i in range(v.size)], 1500.0, atol=0.1)
    # below the deepest converted sample of the fast traces there is no data: NaN, not zero
    assert np.isnan(d.values[0, -1]) and np.isfinite(d.values[-1, -1])


def test_section_to_twt_inverts_section_to_depth():
    sec = _twt_section(np.array([600.0, 800.0, 1200.0]))
    model = TableVelocity([400.0, 1000.0, 1600.0], [1900.0, 2600.0, 3800.0])
    back = section_to_twt(section_to_depth(sec, model), model, dt_ms=DT_MS)
    assert back.attrs["domain"] == "twt"
    # compare where both exist; linear interpolation twice smooths the pulse a little
    common = back.sel(z=sec["z"].values[5:900], method="nearest")
    assert_allclose(common.values, sec.values[:, 5:900], atol=0.02)


def test_section_to_twt_puts_a_depth_spike_at_two_z_over_v():
    # 1000 m at 2500 m/s is 800 ms two-way (t = 2 z / v, common practice, no source)
    z = np.arange(0.0, 2000.0, 2.5)
    data = np.exp(-0.5 * ((z - 1000.0) / 10.0) ** 2)[None].repeat(3, 0)
    sec = make_section(data, z=z, domain="depth")
    t = section_to_twt(sec, ConstantVelocity(2500.0))
    assert t.attrs["sample_interval"] == pytest.approx(2.0)  # dt = 2 dz / v
    assert _peak(t.values[1], t["z"].values) == pytest.approx(800.0, abs=0.05)


def test_depth_section_is_returned_unchanged_by_section_to_depth():
    sec = make_section(np.arange(12.0).reshape(3, 4), z=[0.0, 5.0, 10.0, 15.0], domain="depth")
    xr.testing.assert_identical(section_to_depth(sec, None), sec)


def test_horizon_to_depth_is_identity_for_depth_sections_without_velocity():
    sec = make_section(np.zeros((4, 5)), z=np.arange(5) * 10.0, domain="depth")
    assert_allclose(horizon_to_depth(sec, [0, 1, 3], [12.5, 20.0, np.nan], None), [12.5, 20.0, np.nan])


def test_horizon_round_trip_twt_depth_twt():
    sec = make_section(np.zeros((4, 5)), z=np.arange(5) * 4.0)
    model = LinearVelocity(1700.0, 0.9)
    tr = np.array([0, 1, 2, 3])
    twt = np.array([120.0, 640.0, 1333.0, 2890.0])
    depth = horizon_to_depth(sec, tr, twt, model)
    dsec = make_section(np.zeros((4, 5)), z=np.arange(5) * 10.0, domain="depth")
    assert_allclose(horizon_to_twt(dsec, tr, depth, model), twt, atol=1e-9)
    assert_allclose(horizon_to_twt(sec, tr, twt, None), twt)  # identity in TWT


def test_horizon_to_depth_without_velocity_names_the_file():
    sec = _twt_section(np.full(3, 500.0), source="/data/line_b.sgy")
    with pytest.raises(VelocityError, match=r"line_b.sgy: section is in twt; converting to depth needs a velocity"):
        horizon_to_depth(sec, [0], [500.0], None)


def test_horizon_trace_outside_section_is_a_geometry_error():
    sec = _twt_section(np.full(3, 500.0), source="line_c.sgy")
    with pytest.raises(GeometryError, match="line_c.sgy: horizon trace 7 is outside the section's 3 traces"):
        horizon_to_depth(sec, [0, 7], [500.0, 510.0], ConstantVelocity(2500.0))


def test_velocity_section_with_other_trace_count_is_refused():
    sec = _twt_section(np.full(3, 500.0), source="line_d.sgy")
    vel = SectionVelocity(np.full((5, 2), 2500.0), twt_ms=[0.0, 1000.0], source="vel_d.sgy")
    with pytest.raises(VelocityError, match="line_d.sgy: the velocity section has 5 traces but the section has 3"):
        section_to_depth(sec, vel)


def test_default_velocity_fallback_is_recorded_in_section_attrs():
    from clinometry.depth import DEFAULT_VELOCITY_NOTE, velocity_from_options

    sec = _twt_section(np.full(2, 500.0))
    d = section_to_depth(sec, velocity_from_options(section=sec), dz_m=5.0)
    assert DEFAULT_VELOCITY_NOTE in d.attrs["fallbacks"]
    assert DEFAULT_VELOCITY_NOTE not in sec.attrs["fallbacks"]
    assert d.attrs["velocity_model"]["fallback"] == DEFAULT_VELOCITY_NOTE


def test_to_depth_takes_trace_then_z_then_velocity_and_a_number_as_constant():
    # depth = v t / 2 for a constant velocity (Sheriff & Geldart 1995, from memory):
    # 400 ms at 2500 m/s -> 500 m; a number and ConstantVelocity give the same float64 depths
    sec = _twt_section(np.full(3, 500.0), source="line_e.sgy")
    got = to_depth(sec, [0, 2], np.array([400.0, 800.0], np.float32), 2500.0)
    assert got.dtype == np.float64
    assert got.tolist() == [500.0, 1000.0]
    assert to_depth(sec, [0, 2], [400.0, 800.0], ConstantVelocity(2500.0)).tolist() == got.tolist()
    dsec = make_section(np.zeros((2, 3)), z=[0.0, 5.0, 10.0], domain="depth")
    assert to_depth(dsec, [0, 1], [5.0, 7.5], None).tolist() == [5.0, 7.5]  # identity in depth


def test_to_depth_assumes_no_velocity_for_a_time_section():
    sec = _twt_section(np.full(3, 500.0), source="line_f.sgy")
    with pytest.raises(VelocityError, match=r"line_f.sgy: section is in twt; converting to depth needs a velocity"):
        to_depth(sec, [0], [500.0], None)
