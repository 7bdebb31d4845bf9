"""The review page in a real headless Chromium: load, filter, sort, decide, export, re-import.

Driven with Selenium WebDriver and Debian's chromedriver (packages ``chromium`` and
``chromium-driver``, installed by ``.ci/run``); skipped where either is missing.  The page is
built from hand-made rows (no picker numbers); the exported ``review.csv`` is read back with
Python's csv module and with :func:`clinometry.report.review.read_review`.
"""

from __future__ import annotations

import csv
import shutil
import time

import pytest

from clinometry.report.page import write_index
from clinometry.report.review import REVIEW_COLUMNS, read_review

webdriver = pytest.importorskip("selenium.webdriver")

pytestmark = pytest.mark.requires_chromium

BROWSERS = ("chromium", "chromium-browser", "google-chrome")


def _paths():
    browser = next((shutil.which(b) for b in BROWSERS if shutil.which(b)), None)
    driver = shutil.which("chromedriver")
    if browser is None or driver is None:
        pytest.skip("no Chromium and chromedriver on the PATH (apt-get install chromium chromium-driver)")
    return browser, driver


def _png(path):
    """A small real PNG (a figure stand-in)."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    fig = Figure(figsize=(2, 1))
    FigureCanvasAgg(fig)
    fig.add_subplot().plot([0, 1], [0, 1])
    fig.savefig(path, format="png", dpi=50)


MARGINS = [  # (stem, family, confidence, max slope)
    ("line_a", "ramp", 0.9, 0.8),
    ("line_b", "steep_margin", 0.95, 40.0),
    ("line_c", "ramp", 0.7, 0.5),
    ("line_d", "rimmed_shelf", 0.6, 12.0),
]


@pytest.fixture
def page(tmp_path):
    rows, lines = [], []
    for k, (stem, fam, conf, slope) in enumerate(MARGINS):
        _png(tmp_path / f"{stem}.png")
        (tmp_path / f"{stem}.json").write_text("{}", encoding="utf-8")
        rows.append({"file": f"/survey/{stem}.sgy", "line": "", "stem": stem, "direction": "+", "family": fam,
                     "confidence": conf, "slope_max_deg": slope, "relief_m": 100.0 + k, "break_trace": 10 + k,
                     "break_depth_m": 150.0 + k, "toe_trace": 30 + k, "toe_depth_m": 400.0 + k,
                     "json": f"{stem}.json", "png": f"{stem}.png", "reasons": [f"reason of {stem}"],
                     "velocity_model": "constant 2500 m/s", "default_velocity": "no"})
        lines.append({"stem": stem, "file": f"{stem}.sgy", "line": "", "status": "ok", "json": f"{stem}.json",
                      "png": f"{stem}.png", "n_margins": 1})
    lines.append({"stem": "line_e", "file": "line_e.sgy", "line": "", "status": "ok", "json": None, "png": None,
                  "n_margins": 0})
    return write_index(tmp_path / "index.html", margins=rows, lines=lines, errors=[])


@pytest.fixture
def browser(tmp_path):
    from selenium.webdriver.chrome.service import Service

    binary, driver_path = _paths()
    downloads = tmp_path / "downloads"
    downloads.mkdir()
    opts = webdriver.ChromeOptions()
    opts.binary_location = binary
    for arg in ("--headless=new", "--no-sandbox", "--disable-gpu", "--disable-dev-shm-usage", "--no-first-run",
                "--disable-background-networking", "--disable-component-update", "--disable-sync",
                f"--user-data-dir={tmp_path / 'profile'}", "--window-size=1400,1000"):
        opts.add_argument(arg)
    opts.add_experimental_option("prefs", {"download.default_directory": str(downloads),
                                           "download.prompt_for_download": False})
    drv = webdriver.Chrome(service=Service(executable_path=driver_path), options=opts)
    drv.execute_cdp_cmd("Browser.setDownloadBehavior", {"behavior": "allow", "downloadPath": str(downloads)})
    drv.set_page_load_timeout(60)
    drv.downloads = downloads
    try:
        yield drv
    finally:
        drv.quit()


def _visible_stems(drv):
    return drv.execute_script(
        "return Array.from(document.querySelectorAll('#margins tbody tr'))"
        ".filter(r => r.style.display !== 'none').map(r => r.getAttribute('data-stem'));")


def _states(drv):
    return drv.execute_script(
        "var o={}; document.querySelectorAll('#margins tbody tr').forEach(r => "
        "{o[r.getAttribute('data-stem')] = r.querySelector('td.state').textContent;}); return o;")


def _row(drv, stem):
    from selenium.webdriver.common.by import By

    return drv.find_element(By.CSS_SELECTOR, f'#margins tbody tr[data-stem="{stem}"]')


def _decide(drv, stem, decision, note):
    from selenium.webdriver.common.by import By
    from selenium.webdriver.support.ui import Select

    row = _row(drv, stem)
    Select(row.find_element(By.CSS_SELECTOR, "select.decision")).select_by_value(decision)
    box = row.find_element(By.CSS_SELECTOR, "input.note")
    box.clear()
    box.send_keys(note)
    drv.execute_script("arguments[0].dispatchEvent(new Event('change'));", box)


def _wait_for(path, timeout_s=20.0):
    end = time.monotonic() + timeout_s
    while time.monotonic() < end:
        if path.is_file() and path.stat().st_size > 0:
            return path
        time.sleep(0.1)
    raise AssertionError(f"{path} was not written")


def test_review_page_load_filter_sort_decide_export_reimport(page, browser):
    from selenium.webdriver.common.by import By
    from selenium.webdriver.support.ui import Select

    drv = browser
    drv.get(page.resolve().as_uri())
    # load: the caution once, every margin, nothing reviewed yet
    assert drv.execute_script("return document.querySelectorAll('.caution').length;") == 1
    assert _visible_stems(drv) == ["line_a", "line_b", "line_c", "line_d"]
    assert drv.find_element(By.ID, "review-counts").text.endswith("not reviewed 4")

    # filter: ramps only; the thumbnails follow (the line without a margin is hidden too)
    Select(drv.find_element(By.ID, "f-family")).select_by_value("ramp")
    assert _visible_stems(drv) == ["line_a", "line_c"]
    thumbs = drv.execute_script("return Array.from(document.querySelectorAll('.thumb'))"
                                ".filter(t => t.style.display !== 'none').map(t => t.getAttribute('data-stem'));")
    assert thumbs == ["line_a", "line_c"]

    # sort: by maximum slope, ascending (0.5 then 0.8 deg)
    drv.find_element(By.CSS_SELECTOR, 'th[data-key="slope_max_deg"][data-num="1"]').click()
    assert _visible_stems(drv) == ["line_c", "line_a"]
    Select(drv.find_element(By.ID, "f-family")).select_by_value("")
    assert _visible_stems(drv) == ["line_c", "line_a", "line_d", "line_b"]

    # the line name opens its QC figure large in the page, the JSON beside it
    _row(drv, "line_d").find_element(By.CSS_SELECTOR, "a.qc").click()
    assert drv.find_element(By.ID, "viewer").is_displayed()
    assert drv.find_element(By.ID, "viewer-img").get_attribute("src").endswith("/line_d.png")
    assert drv.find_element(By.ID, "viewer-json").get_attribute("href").endswith("/line_d.json")
    drv.find_element(By.ID, "viewer-close").click()
    assert not drv.find_element(By.ID, "viewer").is_displayed()

    # decide: a reviewer's name, then accept / reject / needs-work with notes
    drv.find_element(By.ID, "reviewer").send_keys("D. Reviewer")
    _decide(drv, "line_a", "accept", "clear ramp, 0.8 deg")
    _decide(drv, "line_b", "reject", 'fold, "not" a margin')
    _decide(drv, "line_d", "needs-work", "=check the toe")
    assert _states(drv) == {"line_a": "accepted", "line_b": "rejected", "line_c": "not reviewed",
                            "line_d": "needs-work"}
    Select(drv.find_element(By.ID, "f-review")).select_by_value("accepted")
    assert _visible_stems(drv) == ["line_a"]
    Select(drv.find_element(By.ID, "f-review")).select_by_value("")

    # kept in the browser: a reload shows the same decisions
    drv.refresh()
    assert _states(drv)["line_b"] == "rejected"
    assert _row(drv, "line_a").find_element(By.CSS_SELECTOR, "input.note").get_attribute("value") == \
        "clear ramp, 0.8 deg"

    # export: review.csv, read back with the csv module and with clinometry's own reader
    drv.find_element(By.ID, "export").click()
    exported = _wait_for(drv.downloads / "review.csv")
    with open(exported, newline="", encoding="utf-8") as fh:
        rows = list(csv.DictReader(fh))
    assert tuple(rows[0]) == REVIEW_COLUMNS
    got = {r["stem"]: r for r in rows}
    assert sorted(got) == ["line_a", "line_b", "line_d"]
    assert (got["line_a"]["file"], got["line_a"]["direction"], got["line_a"]["decision"]) == ("line_a.sgy", "+",
                                                                                              "accept")
    assert got["line_a"]["reviewer"] == "D. Reviewer" and got["line_a"]["time"].endswith("Z")
    assert got["line_d"]["note"] == "'=check the toe"  # a spreadsheet must not run it as a formula
    assert got["line_a"]["break_trace"] == "10" and got["line_a"]["toe_depth_m"] == "400.0"
    back = {d["stem"]: d for d in read_review(exported)}
    assert back["line_b"]["note"] == 'fold, "not" a margin' and back["line_d"]["note"] == "=check the toe"

    # re-import: a fresh browser store, then the exported file brings the decisions back
    drv.execute_script("localStorage.clear();")
    drv.refresh()
    assert set(_states(drv).values()) == {"not reviewed"}
    drv.find_element(By.ID, "import").send_keys(str(exported))
    end = time.monotonic() + 10
    while time.monotonic() < end and "decision(s) read" not in drv.find_element(By.ID, "import-result").text:
        time.sleep(0.1)
    assert drv.find_element(By.ID, "import-result").text == "3 decision(s) read"
    assert _states(drv) == {"line_a": "accepted", "line_b": "rejected", "line_c": "not reviewed",
                            "line_d": "needs-work"}
    assert drv.find_element(By.ID, "review-counts").text == ("accepted 1 · rejected 1 · needs work 1 · changed "
                                                             "since review 0 · not reviewed 1")


def test_decision_on_moved_picks_shows_changed_since_review(tmp_path, browser):
    # the page of a re-run: the batch carried a decision made on other picks (break trace 9, now 10)
    row = {"file": "/survey/line_a.sgy", "line": "", "stem": "line_a", "direction": "+", "family": "ramp",
           "confidence": 0.9, "break_trace": 10, "break_depth_m": 150.0, "toe_trace": 30, "toe_depth_m": 400.0,
           "decision": "accept", "note": "ok", "reviewer": "E", "review_time": "2026-12-01T08:00:00Z",
           "review_status": "changed since review",
           "review_picks": {"break_trace": 9, "break_depth_m": 150.0, "toe_trace": 30, "toe_depth_m": 400.0}}
    page = write_index(tmp_path / "index.html", margins=[row], lines=[], errors=[])
    browser.get(page.resolve().as_uri())
    assert _states(browser) == {"line_a": "changed since review"}


def test_import_gives_each_decision_to_one_margin_where_a_line_has_several_facing_the_same_way(tmp_path, browser):
    # three margins of one line facing "-"; the decisions mirror clinometry.report.review.apply_review
    # first a copy of that line in another folder (output stem other_line_m): same name, same picks
    rows = [{"file": "/other/line_m.sgy", "line": "", "stem": "other_line_m", "direction": "-",
             "family": "rimmed_shelf", "confidence": 0.9, "break_trace": 75, "break_depth_m": 1000.0,
             "toe_trace": 36, "toe_depth_m": 1200.0}]
    for k, (bt, tt) in enumerate(((75, 36), (628, 621), (739, 723))):
        rows.append({"file": "/survey/line_m.sgy", "line": "", "stem": "line_m", "direction": "-",
                     "family": "rimmed_shelf", "confidence": 0.8 - k / 10, "break_trace": bt,
                     "break_depth_m": 1000.0 + k, "toe_trace": tt, "toe_depth_m": 1200.0 + k})
    page = write_index(tmp_path / "index.html", margins=rows, lines=[], errors=[])
    review = tmp_path / "review.csv"
    review.write_text(",".join(REVIEW_COLUMNS) + "\n"
                      "line_m.sgy,,-,accept,rim,R,2026-12-04T09:00:00Z,line_m,75,1000.0,36,1200.0\n"
                      "line_m.sgy,,-,reject,fold,R,2026-12-04T09:01:00Z,line_m,630,1001.0,621,1201.0\n",
                      encoding="utf-8")
    browser.get(page.resolve().as_uri())
    from selenium.webdriver.common.by import By

    browser.find_element(By.ID, "import").send_keys(str(review))
    end = time.monotonic() + 10
    while time.monotonic() < end and "decision(s) read" not in browser.find_element(By.ID, "import-result").text:
        time.sleep(0.1)
    assert browser.find_element(By.ID, "import-result").text == "2 decision(s) read"
    states = browser.execute_script("return Array.from(document.querySelectorAll('#margins tbody tr'))"
                                    ".map(r => [r.getAttribute('data-stem'), r.getAttribute('data-bt'), "
                                    "r.querySelector('td.state').textContent]);")
    # the accepted one keeps its decision, the rejected one moved 2 traces, the third was never reviewed;
    # the copy in the other folder was not reviewed either (the decisions name the stem line_m)
    assert sorted(states) == [["line_m", "628", "changed since review"], ["line_m", "739", "not reviewed"],
                              ["line_m", "75", "accepted"], ["other_line_m", "75", "not reviewed"]]
