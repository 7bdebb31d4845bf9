"""The bundled synthetic_volumes/ match what the generator makes today."""

import json
from pathlib import Path

import numpy as np
import pytest
import segyio

from clinometry.synth import SCENARIOS, make_line

BUNDLE = Path(__file__).resolve().parents[2] / "synthetic_volumes"


@pytest.mark.parametrize("name", ["rimmed_shelf", "isolated_platform", "flat_basin"])
def test_bundled_line_regenerates_from_its_recorded_seed(name):
    truth = json.loads((BUNDLE / f"{name}.truth.json").read_text())
    sec, fresh = make_line(name, seed=truth["seed"])
    assert fresh["margins"] == truth["margins"]
    with segyio.open(BUNDLE / f"{name}.sgy", ignore_geometry=True) as f:
        data = segyio.tools.collect(f.trace[:])
        np.testing.assert_allclose(f.samples, sec["z"].values)
    # float32 samples; FFT round-off may differ between machines in the last bits
    np.testing.assert_allclose(data, sec.values, rtol=1e-5, atol=1e-6 * np.abs(sec.values).max())


def test_bundle_has_every_scenario_the_cube_and_stays_small():
    for name in list(SCENARIOS) + ["curved_margin_cube"]:
        for ext in (".sgy", ".truth.json", ".png"):
            assert (BUNDLE / f"{name}{ext}").is_file(), f"{name}{ext} missing"
        assert f"`{name}.sgy`" in (BUNDLE / "README.md").read_text()
    total = sum(p.stat().st_size for p in BUNDLE.iterdir())
    assert total < 20e6  # issue 3: the bundled set stays well under 20 MB
