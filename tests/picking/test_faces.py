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


@pytest.mark.parametrize("block_cells", [64, 1 << 19])
def test_slope_faces_read_the_true_dip_by_rows_as_from_the_whole_image(block_cells, monkeypatch):
    # the faces from the true dip made block by block where read
    # (assemble.TrueDipRows) equal those from the whole true-dip image;
    # the dip formula itself is checked in test_assemble.py
    from clinometry.picking.assemble import TrueDipRows, true_dip_deg
    from clinometry.section import make_section

    monkeypatch.setattr(faces, "_BLOCK_CELLS", block_cells)
    tr, z = np.meshgrid(np.arange(80), np.arange(120), indexing="ij")
    dip_samples = np.where(z > 20 + tr, 1.0, 0.0).astype(np.float32)
    env = (1.0 + 0.5 * np.cos(2 * np.pi * z / 8.0)).astype(np.float32)
    coh = np.ones_like(env)
    sec = make_section(np.zeros((80, 120), np.float32), z=np.arange(120) * 4.0, domain="twt", trace_spacing_m=12.5)
    whole = faces.slope_faces(true_dip_deg(sec, 2500.0, dip_samples, 12.5), coh, env, min_dip_deg=3.0, period_samples=8.0)
    rows = faces.slope_faces(TrueDipRows(sec, 2500.0, dip_samples, 12.5), coh, env, min_dip_deg=3.0, period_samples=8.0)
    assert len(whole) == len(rows) == 1
    assert whole[0].direction == rows[0].direction == "+"
    np.testing.assert_array_equal(whole[0].trace, rows[0].trace)
    np.testing.assert_array_equal(whole[0].z_index, rows[0].z_index)
    with pytest.raises(TypeError, match="slices of traces"):
        TrueDipRows(sec, 2500.0, dip_samples, 12.5)[0]
