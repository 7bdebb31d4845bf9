"""Dix (1955) interval <-> RMS velocity conversion."""

import numpy as np
import pytest
from numpy.testing import assert_allclose

from clinometry.depth import interval_to_rms, rms_to_interval
from clinometry.errors import VelocityError


def test_dix_two_layer_rms_velocity():
    # Dix (1955): 2000 and 3000 m/s layers, 1 s TWT each -> 2549.5 m/s RMS at 2 s
    v_rms = interval_to_rms([1000.0, 2000.0], [2000.0, 3000.0])
    assert v_rms[0] == pytest.approx(2000.0)
    assert v_rms[1] == pytest.approx(2549.5, abs=0.1)


def test_dix_inversion_returns_the_second_layer_velocity():
    # Dix (1955): inverting RMS 2000 / 2549.5 m/s at 1 s / 2 s gives 3000 m/s
    v_int = rms_to_interval([1000.0, 2000.0], [2000.0, 2549.5])
    assert v_int[0] == pytest.approx(2000.0)
    assert v_int[1] == pytest.approx(3000.0, abs=0.1)


def test_rms_is_the_time_weighted_quadratic_mean_of_interval_velocities():
    # v_rms^2(t_n) = sum v_i^2 dt_i / t_n (Dix 1955), computed here with numpy.average
    rng = np.random.default_rng(7)
    t = np.cumsum(rng.uniform(50.0, 400.0, size=12))
    v = rng.uniform(1600.0, 5500.0, size=12)
    dt = np.diff(t, prepend=0.0)
    expected = [np.sqrt(np.average(v[: n + 1] ** 2, weights=dt[: n + 1])) for n in range(12)]
    assert_allclose(interval_to_rms(t, v), expected, rtol=1e-12)
    assert_allclose(rms_to_interval(t, interval_to_rms(t, v)), v, rtol=1e-9)


def test_dix_works_per_trace_along_the_last_axis():
    t = [500.0, 1000.0, 1500.0]
    v = np.array([[2000.0, 2500.0, 3000.0], [1800.0, 1800.0, 4000.0]])
    rms = interval_to_rms(t, v)
    assert rms.shape == (2, 3)
    assert_allclose(rms[1, 1], 1800.0)
    assert_allclose(rms_to_interval(t, rms), v, rtol=1e-10)


def test_imaginary_interval_velocity_names_the_layer():
    # RMS falling from 3000 to 2000 m/s between 1 and 2 s needs v^2 < 0 (Dix 1955)
    with pytest.raises(VelocityError, match="imaginary interval velocity for the layer 1000-2000 ms"):
        rms_to_interval([500.0, 1000.0, 2000.0], [2800.0, 3000.0, 2000.0], source="rms.csv")


def test_imaginary_interval_velocity_names_the_trace():
    v = np.array([[2000.0, 2500.0], [3000.0, 2000.0]])
    with pytest.raises(VelocityError, match="vel.sgy: .*at trace 1 for the layer 1000-2000 ms"):
        rms_to_interval([1000.0, 2000.0], v, source="vel.sgy")


def test_table_not_monotonic_names_the_row():
    with pytest.raises(VelocityError, match="rms.csv: velocity table is not monotonic in time: row 3"):
        interval_to_rms([100.0, 200.0, 200.0], [2000.0, 2100.0, 2200.0], source="rms.csv")
