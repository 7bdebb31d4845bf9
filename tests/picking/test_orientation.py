"""Structure-tensor dip and coherence against analytic plane waves."""

import numpy as np
import pytest

from clinometry.picking.orientation import reflector_orientation


@pytest.mark.parametrize("dip", [-1.5, -0.3, 0.0, 0.8, 2.0])
def test_dip_of_a_plane_wave_is_recovered(dip):
    # a plane wave cos(2 pi (z - p x) / T) has dz/dx = p everywhere (analytic geometry)
    tr, z = np.meshgrid(np.arange(60), np.arange(120), indexing="ij")
    img = np.cos(2 * np.pi * (z - dip * tr) / 12.0)
    d, coh = reflector_orientation(img, sigma_z_samples=3, sigma_trace=3)
    inner = (slice(15, 45), slice(30, 90))
    # within 10 % (+0.05): the derivative filters are biased once the wave
    # is sampled by only a few traces per horizontal wavelength
    assert float(np.median(d[inner])) == pytest.approx(dip, rel=0.1, abs=0.05)
    assert float(np.median(coh[inner])) > 0.9


def test_coherence_of_white_noise_is_low():
    # isotropic noise has no preferred orientation (van Vliet & Verbeek 1995, from memory)
    img = np.random.default_rng(11).standard_normal((80, 120))
    _, coh = reflector_orientation(img, sigma_z_samples=3, sigma_trace=3)
    assert float(np.median(coh)) < 0.5


def test_coherence_is_zero_where_there_is_no_signal():
    img = np.zeros((30, 60))
    img[:, 10] = 1.0
    _, coh = reflector_orientation(img, sigma_z_samples=2, sigma_trace=2)
    assert float(coh[:, 45:].max()) == 0.0
