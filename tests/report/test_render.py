"""Render the review page in headless Chromium (skipped where none is installed)."""

import importlib.util
import shutil
from pathlib import Path

import pytest

from clinometry.report.html import write_index

SCRIPT = Path(__file__).resolve().parents[2] / "scripts" / "render_index.py"


def _script():
    spec = importlib.util.spec_from_file_location("render_index", SCRIPT)
    mod = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(mod)
    return mod


@pytest.mark.requires_chromium
def test_review_page_renders_in_headless_chromium(tmp_path):
    mod = _script()
    if mod.find_browser() is None:
        pytest.skip("no Chromium on the PATH")
    mpimg = pytest.importorskip("matplotlib.image")
    page = write_index(tmp_path / "index.html",
                       margins=[{"stem": "line_a", "family": "ramp", "confidence": 0.9, "slope_max_deg": 1.2}],
                       lines=[{"stem": "line_a", "file": "line_a.sgy", "line": "", "status": "ok", "n_margins": 1}],
                       errors=[])
    png = mod.render(page, tmp_path / "shot.png", width=900, height=700)
    img = mpimg.imread(png)
    # Chromium's --screenshot captures exactly --window-size (common practice, no source)
    assert img.shape[:2] == (700, 900)
    # the caution box is drawn in Okabe-Ito orange (#E69F00) somewhere near the top of the page
    top = img[:300, :, :3]
    orange = (abs(top[..., 0] - 0xE6 / 255) < 0.03) & (abs(top[..., 1] - 0x9F / 255) < 0.03) & (top[..., 2] < 0.05)
    assert orange.sum() > 100


def test_render_script_reports_a_missing_browser(tmp_path, monkeypatch, capsys):
    mod = _script()
    monkeypatch.setattr(shutil, "which", lambda name: None)
    assert mod.main([str(tmp_path / "index.html")]) == 1
    assert "no Chromium found" in capsys.readouterr().err
