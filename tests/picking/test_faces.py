"""Slope faces: the blockwise strength smoothing against scipy's whole-image filter."""

import numpy as np
import pytest

import clinometry.picking.faces as faces


@pytest.mark.parametrize("sigma", [(1.5, 10.0), (1.5, 1.0), (3.0, 2.5)])
@pytest.mark.parametrize("block_cells", [64, 1 << 19])
def test_blockwise_smoothing_equals_scipy_gaussian_filter(sigma, block_cells, monkeypatch):
    # reference: scipy.ndimage.gaussian_filter on the whole image at once
    # (an independent general-purpose implementation); equal to the bit
    from scipy import ndimage

    monkeypatch.setattr(faces, "_BLOCK_CELLS", block_cells)
    a = np.random.default_rng(21).random((53, 31)).astype(np.float32)
    np.testing.assert_array_equal(faces._smooth_blockwise(a, sigma), ndimage.gaussian_filter(a, sigma))
