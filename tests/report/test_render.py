"""Render the review page in headless Chromium (skipped where none is installed)."""

import importlib.util
import shutil
from pathlib import Path

import pytest

from clinometry.report.page import write_index

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


@pytest.mark.requires_chromium
def test_review_page_filter_and_sort_run_in_chromium(tmp_path):
    mod = _script()
    if mod.find_browser() is None:
        pytest.skip("no Chromium on the PATH")
    from html.parser import HTMLParser

    margins = [{"stem": f"l{i}", "family": fam, "confidence": conf, "slope_max_deg": slope}
               for i, (fam, conf, slope) in enumerate([("ramp", 0.9, 1.5), ("steep_margin", 0.95, 40.0),
                                                        ("ramp", 0.3, 0.5), ("ramp", 0.7, 2.5)])]
    page = write_index(tmp_path / "index.html", margins=margins, lines=[], errors=[])
    dom = mod.dump_dom(page.resolve().as_uri() + "#family=ramp&conf=0.5&sort=slope_max_deg")

    class Rows(HTMLParser):
        def __init__(self):
            super().__init__()
            self.rows, self.shown = [], None
            self._span = False

        def handle_starttag(self, tag, attrs):
            a = dict(attrs)
            if tag == "tr" and "data-family" in a:
                self.rows.append((a["data-family"], float(a["data-confidence"]), a.get("style") or ""))
            self._span = tag == "span" and a.get("id") == "n-shown"

        def handle_data(self, data):
            if self._span:
                self.shown = data.strip()
                self._span = False

    p = Rows()
    p.feed(dom)
    visible = [(f, c) for f, c, style in p.rows if "display: none" not in style]
    # ramps with confidence >= 0.5, in increasing maximum slope (1.5 then 2.5 deg)
    assert visible == [("ramp", 0.9), ("ramp", 0.7)]
    assert [c for _, c, _ in p.rows] == [0.3, 0.9, 0.7, 0.95]  # whole table sorted by slope, hidden rows kept
    assert p.shown == "2"
