"""The three real 2D lines in tests/data/real-lines read with the right sizes and axes."""

import numpy as np
import pytest

from clinometry.io import read_section


# real-lines README (tests/data/README.md): traces x samples, 4 ms nominal interval,
# CDP 1..n, CDP X = 500000 + 25 (CDP - 1) m, Y = 6000000 m
@pytest.mark.parametrize("name, n_trace, n_z", [
    ("teapot-line.sgy", 357, 240), ("northsea-line.sgy", 951, 242), ("australia-curt-line.sgy", 2900, 210)])
def test_real_line_sizes_and_axes(data_dir, name, n_trace, n_z):
    s = read_section(data_dir / "real-lines" / name)
    assert s.sizes == {"trace": n_trace, "z": n_z}
    np.testing.assert_allclose(s.z.values, 4.0 * np.arange(n_z))
    np.testing.assert_array_equal(s.cdp.values, np.arange(1, n_trace + 1))
    np.testing.assert_allclose(s.x.values, 500000 + 25.0 * np.arange(n_trace))
    np.testing.assert_allclose(s.distance.values, 25.0 * np.arange(n_trace))
    assert s.attrs["sample_format"] == "4-byte IEEE float (format 5)"
    assert s.attrs["byte_order"] == "big"
    assert s.attrs["fallbacks"] == [] and s.attrs["dead_traces"] == [] and s.attrs["n_nonfinite"] == 0
    assert "inline" not in s.coords  # README: inline/crossline (189/193) left at 0
    assert np.isfinite(s.values).all() and s.dtype == np.float32
