"""Seismic side of the forward model: wavelet, reflectivity, velocity, noise."""

import numpy as np
import pytest
from scipy.integrate import quad
from scipy.optimize import brentq, minimize_scalar

from clinometry.synth import make_line
from clinometry.synth.seismic import SynthVelocity, reflectivity, ricker


@pytest.mark.parametrize("f", [15.0, 25.0, 40.0])
def test_ricker_zero_crossings_and_side_lobes(f):
    # Ricker (1953): r(t) = (1 - 2 pi^2 f^2 t^2) exp(-pi^2 f^2 t^2); zero crossings
    # at t = +-1 / (pi f sqrt(2)); side-lobe minima -2 exp(-3/2) ~ -0.446 at
    # t = +-sqrt(3/2) / (pi f)  (from memory, as quoted in the issue)
    r = lambda t: float(ricker([t], peak_hz=f)[0])
    t0 = brentq(r, 0.1 / f, 0.4 / f)
    np.testing.assert_allclose(t0, 1.0 / (np.pi * f * np.sqrt(2.0)), rtol=1e-10)
    np.testing.assert_allclose(brentq(r, -0.4 / f, -0.1 / f), -1.0 / (np.pi * f * np.sqrt(2.0)), rtol=1e-10)
    res = minimize_scalar(r, bounds=(0.2 / f, 1.0 / f), method="bounded", options={"xatol": 1e-12})
    np.testing.assert_allclose(res.x, np.sqrt(1.5) / (np.pi * f), rtol=1e-5)
    np.testing.assert_allclose(res.fun, -2.0 * np.exp(-1.5), rtol=1e-9)
    np.testing.assert_allclose(-2.0 * np.exp(-1.5), -0.446, atol=5e-4)
    assert r(0.0) == 1.0  # peak of the zero-phase wavelet, Ricker (1953)


def test_reflectivity_normal_incidence():
    # R = (Z2 - Z1) / (Z2 + Z1), Sheriff & Geldart (1995) (from memory):
    # marl 3200*2.35 over limestone 5000*2.55 -> 0.2580
    z1, z2 = 3200.0 * 2.35, 5000.0 * 2.55
    r = reflectivity(np.array([z1, z2, z2]))
    np.testing.assert_allclose(r, [(z2 - z1) / (z2 + z1), 0.0, 0.0])
    np.testing.assert_allclose(r[0], 0.2580, atol=5e-5)


@pytest.mark.parametrize("v0,k", [(2500.0, 0.0), (1800.0, 0.6)])
def test_velocity_twt_matches_numerical_integration(v0, k):
    # two-way time = 2 * integral dz / v(z); scipy.integrate.quad as the
    # independent integrator (Sheriff & Geldart 1995, from memory, for the law)
    v = SynthVelocity(v0, k)
    for depth in (100.0, 750.0, 2000.0):
        t_ref = 2000.0 * quad(lambda z: 1.0 / (v0 + k * z), 0.0, depth)[0]
        np.testing.assert_allclose(v.twt_ms(depth), t_ref, rtol=1e-10)
        np.testing.assert_allclose(v.depth_m(t_ref), depth, rtol=1e-10)


def test_noise_is_scaled_to_the_stated_snr():
    # SNR defined here as RMS(noise-free) / RMS(noise) (common practice, no source)
    clean, _ = make_line("rimmed_shelf", seed=3, noise=False)
    noisy, truth = make_line("rimmed_shelf", seed=3, snr=2.5)
    noise = noisy.values.astype(np.float64) - clean.values
    ratio = np.sqrt(np.mean(clean.values.astype(np.float64) ** 2)) / np.sqrt(np.mean(noise ** 2))
    np.testing.assert_allclose(ratio, 2.5, rtol=1e-3)
    assert truth["snr"] == 2.5
    # band-limited: the noise spectrum peaks near the wavelet's peak frequency
    spec = np.abs(np.fft.rfft(noise, axis=1)).mean(axis=0)
    freqs = np.fft.rfftfreq(noise.shape[1], d=truth["sample_interval"] / 1000.0)
    assert abs(freqs[np.argmax(spec)] - truth["wavelet"]["peak_hz"]) < 6.0


def test_reverse_polarity_gain_drift_and_dead_traces():
    base, _ = make_line("steep_margin", seed=1)
    rev, _ = make_line("steep_margin", seed=1, polarity_reversed=True)
    np.testing.assert_array_equal(rev.values, -base.values)
    drift, _ = make_line("steep_margin", seed=1, noise=False, gain_drift_fraction=0.5)
    flat, _ = make_line("steep_margin", seed=1, noise=False)
    gain = np.linspace(0.75, 1.25, flat.sizes["trace"])
    np.testing.assert_allclose(drift.values, flat.values * gain[:, None].astype(np.float32), rtol=1e-5, atol=1e-7)
    dead, _ = make_line("steep_margin", dead_traces=[3, 10])
    np.testing.assert_array_equal(dead.values[[3, 10]], 0.0)
    assert dead.attrs["dead_traces"] == [3, 10]
    assert np.all(np.any(dead.values[[2, 4]] != 0, axis=1))


def test_depth_domain_truth_z_is_depth_and_twt_truth_follows_velocity():
    sd, td = make_line("rimmed_shelf", domain="depth", dz_m=2.0)
    st, tt = make_line("rimmed_shelf", velocity_m_s=3000.0)
    assert sd.attrs["domain"] == "depth" and sd.attrs["units"] == "m"
    bd, bt = td["margins"][0]["break"], tt["margins"][0]["break"]
    assert bd["z"] == bd["depth_m"]
    # constant velocity: t = 2 z / v (common practice, no source)
    np.testing.assert_allclose(bt["z"], 2000.0 * bt["depth_m"] / 3000.0)
    np.testing.assert_allclose(bd["depth_m"], bt["depth_m"])
