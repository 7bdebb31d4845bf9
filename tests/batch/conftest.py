"""Small synthetic lines for the batch tests (written once per test session)."""

import pytest

#: forward-model scenarios used by the batch tests: one ramp, one rimmed shelf
BATCH_SCENARIOS = ("gentle_ramp", "rimmed_shelf")


@pytest.fixture(scope="session")
def good_lines(tmp_path_factory):
    """Folder with two small synthetic 2D lines (SEG-Y + truth JSON)."""
    from clinometry.synth import make_line
    from clinometry.synth.write import write_line

    folder = tmp_path_factory.mktemp("lines")
    for name in BATCH_SCENARIOS:
        section, truth = make_line(name, seed=3)
        write_line(section, truth, folder / f"{name}.sgy")
    return folder


@pytest.fixture
def corrupt_file(tmp_path):
    """A file named .sgy holding 5000 bytes of seeded random junk."""
    import numpy as np

    path = tmp_path / "corrupt.sgy"
    path.write_bytes(np.random.default_rng(11).integers(0, 256, 5000, dtype=np.uint8).tobytes())
    return path
