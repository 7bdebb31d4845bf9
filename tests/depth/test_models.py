"""Velocity models: closed forms checked against scipy integration and hand formulas."""

import json

import numpy as np
import pytest
from numpy.testing import assert_allclose
from scipy.integrate import quad, solve_ivp

from clinometry.depth import (
    DEFAULT_VELOCITY_M_S,
    ConstantVelocity,
    LinearVelocity,
    TableVelocity,
    velocity_from_dict,
)
from clinometry.errors import VelocityError


def test_constant_velocity_depth_is_v_t_over_2():
    # z = v t / 2 for two-way time t (common practice, no source)
    m = ConstantVelocity(2500)
    t_ms = np.array([0.0, 400.0, 1000.0, 2400.0])
    assert_allclose(m.depth_m(t_ms), 2500 * t_ms / 1000 / 2)
    assert_allclose(m.twt_ms(np.array([0.0, 1250.0])), [0.0, 1000.0])
    assert_allclose(m.interval_velocity(t_ms), 2500.0)
    assert_allclose(m.average_velocity(t_ms), 2500.0)


@pytest.mark.parametrize("v0, k", [(1800.0, 0.6), (2000.0, 0.5), (1600.0, 1.2)])
def test_linear_velocity_matches_solve_ivp(v0, k):
    # z(t) = (v0/k)(exp(k t/2) - 1), t two-way in s (Sheriff & Geldart 1995,
    # Exploration Seismology, from memory), checked against scipy's numerical
    # integration of dz/dt = v(z)/2 with v(z) = v0 + k z
    t_s = np.linspace(0.0, 3.0, 31)
    sol = solve_ivp(lambda t, z: [(v0 + k * z[0]) / 2.0], (0.0, 3.0), [0.0], t_eval=t_s, rtol=1e-11, atol=1e-9)
    m = LinearVelocity(v0, k)
    assert_allclose(m.depth_m(t_s * 1000.0), sol.y[0], rtol=1e-8, atol=1e-6)


def test_linear_velocity_inverse_matches_quad():
    # t(z) = 2 * integral_0^z dz' / v(z'), evaluated by scipy.integrate.quad
    v0, k = 1900.0, 0.45
    m = LinearVelocity(v0, k)
    depths = np.array([10.0, 500.0, 1500.0, 4000.0])
    expected_ms = [2.0 * quad(lambda z: 1.0 / (v0 + k * z), 0.0, d, epsabs=1e-13, epsrel=1e-13)[0] * 1000 for d in depths]
    assert_allclose(m.twt_ms(depths), expected_ms, rtol=1e-10)


def test_linear_velocity_interval_velocity_is_v0_plus_kz_at_that_depth():
    # v(z) = v0 + k z evaluated at z(t) must equal the model's interval velocity
    m = LinearVelocity(2000.0, 0.7)
    t = np.array([0.0, 500.0, 1500.0, 2500.0])
    assert_allclose(m.interval_velocity(t), 2000.0 + 0.7 * m.depth_m(t), rtol=1e-12)


def test_linear_velocity_with_zero_gradient_is_constant():
    # k = 0 reduces to z = v0 t / 2 (common practice, no source)
    assert_allclose(LinearVelocity(2400, 0.0).depth_m([1000.0, 2000.0]), [1200.0, 2400.0])
    assert_allclose(LinearVelocity(2400, 0.0).twt_ms([1200.0]), [1000.0])


@pytest.mark.parametrize(
    "model",
    [
        ConstantVelocity(2750),
        LinearVelocity(1700, 0.8),
        TableVelocity([200, 900, 1700], [1600, 2900, 4200]),
        TableVelocity([500, 1000, 2000], [2000, 2300, 2900], kind="rms"),
    ],
    ids=["constant", "linear", "table-interval", "table-rms"],
)
def test_depth_twt_depth_round_trip_within_a_micrometre(model):
    # round trip depth -> twt -> depth to 1e-6 m (consistency of the inverse)
    depths = np.linspace(-50.0, 6000.0, 241)
    assert_allclose(model.depth_m(model.twt_ms(depths)), depths, atol=1e-6)
    twt = np.linspace(0.0, 3500.0, 177)
    assert_allclose(model.twt_ms(model.depth_m(twt)), twt, atol=1e-6)


def test_table_interval_depth_by_hand():
    # layers of 2000 m/s for 0-1000 ms and 3000 m/s for 1000-2000 ms:
    # z(1 s) = 2000*1/2 = 1000 m, z(2 s) = 1000 + 3000*1/2 = 2500 m (z = v t / 2 per layer,
    # common practice, no source); below the table the last velocity continues
    m = TableVelocity([1000, 2000], [2000, 3000])
    assert_allclose(m.depth_m([1000, 2000, 3000]), [1000.0, 2500.0, 4000.0])
    assert_allclose(m.interval_velocity([999.0, 1000.0, 1000.5, 5000.0]), [2000, 2000, 3000, 3000])


def test_table_rms_equals_the_interval_table_it_was_made_from():
    # Dix (1955): RMS 2000 and 2549.51 m/s at 1 s and 2 s are layers of 2000 and 3000 m/s
    rms = TableVelocity([1000, 2000], [2000.0, np.sqrt((2000**2 + 3000**2) / 2)], kind="rms")
    assert_allclose(rms.v_int_m_s, [2000.0, 3000.0], rtol=1e-12)
    assert_allclose(rms.depth_m([2000.0]), [2500.0])
    assert_allclose(rms.rms_velocity(), [2000.0, 2549.5098], atol=1e-4)


def test_scaled_multiplies_depth_by_the_factor():
    # scaling every interval velocity by f scales z(t) = integral v/2 dt by f
    t = np.array([100.0, 800.0, 2000.0])
    for m in (ConstantVelocity(2500), LinearVelocity(1800, 0.6), TableVelocity([500, 1500], [2000, 3500], kind="rms")):
        assert_allclose(m.scaled(1.08).depth_m(t), 1.08 * m.depth_m(t), rtol=1e-12)
        assert_allclose(m.scaled(0.92).interval_velocity(t), 0.92 * m.interval_velocity(t), rtol=1e-12)


def test_to_dict_is_json_and_rebuilds_the_same_model():
    t = np.array([0.0, 700.0, 2100.0])
    for m in (ConstantVelocity(2600), LinearVelocity(1750, 0.55), TableVelocity([400, 1200], [2100, 2600], kind="rms", source="v.csv")):
        d = json.loads(json.dumps(m.to_dict()))
        assert_allclose(velocity_from_dict(d).depth_m(t), m.depth_m(t))
    assert ConstantVelocity(2600).to_dict() == {"model": "constant", "velocity_m_s": 2600.0}
    assert LinearVelocity(1750, 0.55).to_dict() == {"model": "linear", "v0_m_s": 1750.0, "k_per_s": 0.55}


def test_nan_times_give_nan_depths():
    for m in (ConstantVelocity(2500), LinearVelocity(1800, 0.6), TableVelocity([500, 1500], [2000, 3500])):
        out = m.depth_m([np.nan, 1000.0])
        assert np.isnan(out[0]) and np.isfinite(out[1])


def test_default_velocity_is_plausible_for_carbonate_sections():
    # between slope mudstones (~2000-3000 m/s) and platform carbonates
    # (~3500-6000 m/s) (Anselmetti & Eberli 1993, from memory)
    assert 2000.0 <= DEFAULT_VELOCITY_M_S <= 4000.0


@pytest.mark.parametrize(
    "make, match",
    [
        (lambda: ConstantVelocity(0), "0 m/s; velocities must be positive"),
        (lambda: ConstantVelocity(-2500), "-2500 m/s; velocities must be positive"),
        (lambda: ConstantVelocity(2.5), "2.5 m/s, below the plausible 300 m/s.*km/s"),
        (lambda: ConstantVelocity(12000), "12000 m/s, above the plausible 9000 m/s.*ft/s"),
        (lambda: LinearVelocity(1800, -0.5), "gradient k = -0.5 1/s is negative.*3600 m depth"),
        (lambda: TableVelocity([0, 1000, 900], [2000, 2500, 2600]), "not monotonic in time: row 3 has 900 ms after 1000 ms"),
        (lambda: TableVelocity([0, 1000], [2000, 0]), r"interval velocity \(value 2\) is 0 m/s"),
        (lambda: TableVelocity([1000, 2000], [3000, 2000], kind="rms"), "imaginary interval velocity.*1000-2000 ms"),
        (lambda: TableVelocity([1000, 2000], [3000], kind="rms"), "2 times but 1 velocities"),
        (lambda: TableVelocity([1000], [3000], kind="average"), "'interval' or 'rms'"),
        (lambda: LinearVelocity(1800, 6.0), "gradient k = 6 1/s is implausibly steep"),
        (lambda: TableVelocity([0.0, 1.2, 2.5], [1500, 2500, 3200]), "ends at 2.5 ms two-way time; the times look like seconds"),
    ],
)
def test_invalid_models_raise_one_line_velocity_error(make, match):
    with pytest.raises(VelocityError, match=match) as info:
        make()
    assert "\n" not in str(info.value)
