"""End to end: plugins from a separate distribution, used by the CLI and the Python API.

``tests/plugins/clinometry_demo_plugin`` is a small package of its own
(pyproject.toml) that registers the classifiers ``demo`` and ``demo_colour``
and the metric ``demo_width_km``.  The test builds and installs it with pip
into a temporary folder put on ``sys.path`` (so the shared environment is
never changed), clears the discovery cache, and runs ``clinometry analyze``
on a synthetic line: the demo classifier works, the extra metric runs only
when named, and the classifier that wants an unknown keyword is refused.
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
    assert "  demo_colour  [clinometry_demo_plugin:classify_by_colour]" in out
    assert "options: thresholds=None, colour=required" in out


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


def test_installed_extra_metric_runs_only_when_named(demo_installed, synthetic_line_file, tmp_path, capsys):
    from clinometry.cli import main
    from clinometry.metrics import BUILTIN_METRICS

    path, truth = synthetic_line_file
    base = ["analyze", str(path), "--velocity", str(truth["velocity_m_s"]), "--no-uncertainty", "--no-plot"]
    assert "demo_width_km" in _plugins.plugin_names("metric")
    assert main(base + ["--out", str(tmp_path / "plain")]) == 0
    assert main(base + ["--metric", "demo_width_km", "--out", str(tmp_path / "extra")]) == 0
    capsys.readouterr()
    plain = json.loads((tmp_path / "plain" / f"{path.stem}.json").read_text())
    extra = json.loads((tmp_path / "extra" / f"{path.stem}.json").read_text())
    # installing the package changed nothing: the built-in set ran, by name
    assert plain["run"]["metrics_plugins"] == list(BUILTIN_METRICS)
    assert all("break_to_toe_km" not in m for m in plain["margins"])
    assert extra["run"]["metrics_plugins"] == list(BUILTIN_METRICS) + ["demo_width_km"]
    for m, p in zip(extra["margins"], plain["margins"]):
        # the demo's distance is the built-in foreset width in km (same break and toe; 1 km = 1000 m)
        assert m["break_to_toe_km"] == pytest.approx(m["foreset_width_m"] / 1000.0)
        assert {k: v for k, v in m.items() if k != "break_to_toe_km"} == p


def test_plugin_that_wants_an_unknown_keyword_is_refused(demo_installed, synthetic_line_file, tmp_path, capsys):
    from clinometry import analyze
    from clinometry.cli import main
    from clinometry.errors import PluginError

    path, truth = synthetic_line_file
    code = main(["analyze", str(path), "--velocity", str(truth["velocity_m_s"]), "--classifier", "demo_colour",
                 "--no-plot", "--out", str(tmp_path)])
    err = capsys.readouterr().err
    assert code == 2
    assert err == ("clinometry: error: classifier plugin 'demo_colour' needs the option(s) 'colour', "
                   "which were not given\n")
    assert not list(tmp_path.iterdir()), "refused before anything was read or written"
    # an option the plugin does not declare is refused by name, with the options it has
    with pytest.raises(PluginError, match=r"metric plugin 'demo_width_km' has no option 'scale_km'; its options: scale_m"):
        analyze(path, velocity=2500.0, metrics=("slope", "demo_width_km"), metric_options={"demo_width_km": {"scale_km": 1}})
