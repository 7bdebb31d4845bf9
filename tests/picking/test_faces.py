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


@pytest.mark.parametrize("min_pixels", [1, 5, 40])
def test_dropping_small_regions_equals_labelling_the_whole_image(min_pixels):
    # reference: scipy.ndimage.label over the whole image and the pixel count
    # per label (general-purpose library), here labelled in the bounding box only
    from scipy import ndimage

    rng = np.random.default_rng(22)
    mask = np.zeros((60, 80), bool)
    mask[10:50, 5:70] = rng.random((40, 65)) > 0.55
    lab, n = ndimage.label(mask)
    sizes = np.bincount(lab.ravel(), minlength=n + 1)
    expected = (sizes >= min_pixels)[lab] & (lab > 0)
    np.testing.assert_array_equal(faces._drop_small_regions(mask, min_pixels), expected)
    assert faces._drop_small_regions(np.zeros((5, 5), bool), 1) is None
