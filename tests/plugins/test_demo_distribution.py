"""End to end: a classifier from a separate distribution, used by the CLI.

``tests/plugins/clinometry_demo_plugin`` is a small package of its own
(pyproject.toml) that registers the classifier ``demo`` in the
``clinometry.classifiers`` entry-point group.  The test builds and installs
it with pip into a temporary folder put on ``sys.path`` (so the shared
environment is never changed), clears the discovery cache, and runs
``clinometry analyze --classifier demo`` on a synthetic line.
"""

import json
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from clinometry import _plugins

HERE = Path(__file__).parent
DIST = HERE / "clinometry_demo_plugin"


@pytest.fixture(scope="module")
def demo_installed(tmp_path_factory):
    src = tmp_path_factory.mktemp("demo_src") / "clinometry_demo_plugin"
    shutil.copytree(DIST, src)  # pip builds in place: keep the tracked folder clean
    target = tmp_path_factory.mktemp("demo_site")
    proc = subprocess.run(
        [sys.executable, "-m", "pip", "install", "--quiet", "--no-deps", "--no-build-isolation",
         "--no-index", "--target", str(target), str(src)],
        capture_output=True, text=True, timeout=300,
    )
    assert proc.returncode == 0, f"pip could not install the demo plugin:\n{proc.stdout}\n{proc.stderr}"
    sys.path.insert(0, str(target))
    _plugins.clear_cache()
    yield target
    sys.path.remove(str(target))
    sys.modules.pop("clinometry_demo_plugin", None)
    _plugins.clear_cache()


def test_installed_distribution_registers_demo_classifier(demo_installed):
    from importlib.metadata import distribution

    dist = distribution("clinometry-demo-plugin")
    assert dist.version == "0.1.0"
    assert "demo" in _plugins.plugin_names("classifier")
    func = _plugins.load_plugin("classifier", "demo")
    assert _plugins.plugin_description(func) == "Family from the maximum foreset slope only (demo plugin)."
    assert _plugins.plugin_parameters(func) == {"thresholds": None, "ramp_max_deg": 1.0, "steep_min_deg": 10.0}


def test_cli_plugins_lists_the_installed_demo(demo_installed, capsys):
    from clinometry.cli import main

    assert main(["plugins", "--kind", "classifier"]) == 0
    out = capsys.readouterr().out
    assert "  demo  [clinometry_demo_plugin:classify_by_slope]" in out
    assert "options: thresholds=None, ramp_max_deg=1.0, steep_min_deg=10.0" in out


def test_analyze_with_demo_classifier_writes_its_families(demo_installed, synthetic_line_file, tmp_path, capsys):
    from clinometry.cli import main

    path, truth = synthetic_line_file
    out_dir = tmp_path / "out"
    code = main(["analyze", str(path), "--velocity", str(truth["velocity_m_s"]), "--classifier", "demo",
                 "--no-uncertainty", "--no-plot", "--out", str(out_dir)])
    captured = capsys.readouterr()
    assert code == 0, captured.err
    d = json.loads((out_dir / f"{path.stem}.json").read_text())
    assert d["run"]["classifier"] == "demo"
    assert d["margins"], "the synthetic line has a margin"
    for m in d["margins"]:
        assert m["reasons"][0].startswith("demo: ")
        # the demo's own bands (1 and 10 degrees) applied to the measured slope
        s = m["slope_max_deg"]
        expected = "ramp" if s < 1.0 else "rimmed_shelf" if s < 10.0 else "steep_margin"
        assert m["family"] == expected
