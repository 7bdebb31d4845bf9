"""Tests of the review page: parsed with the standard library's html.parser."""

import json
from html.parser import HTMLParser

from clinometry.report.page import CAUTION_TEXT, TABLE_COLUMNS, index_html, write_index


class _Page(HTMLParser):
    """Collects links, image sources, script blocks and the rows of each table."""

    def __init__(self):
        super().__init__()
        self.hrefs, self.srcs, self.tables, self.text, self.qc_links = [], [], {}, [], []
        self._table = None
        self._row = None
        self._cell = None
        self.n_scripts = 0
        self.tables_attrs = {}
        self.external = []

    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        if tag == "a":
            self.hrefs.append(a.get("href"))
            if "qc" in (a.get("class") or "").split():
                self.qc_links.append((a.get("href"), a.get("data-json")))
        if tag in ("img", "script", "link") and a.get("src"):
            self.srcs.append(a["src"])
        if tag == "script":
            self.n_scripts += 1
        if tag == "table":
            self._table = a.get("id")
            self.tables[self._table] = []
            self.tables_attrs[self._table] = a
        if tag == "tr" and self._table:
            self._row = {"attrs": a, "cells": []}
        if tag in ("td", "th") and self._row is not None:
            self._cell = []

    def handle_endtag(self, tag):
        if tag in ("td", "th") and self._cell is not None:
            self._row["cells"].append("".join(self._cell).strip())
            self._cell = None
        if tag == "tr" and self._row is not None:
            self.tables[self._table].append(self._row)
            self._row = None
        if tag == "table":
            self._table = None

    def handle_data(self, data):
        self.text.append(data)
        if self._cell is not None:
            self._cell.append(data)


def _parse(text):
    p = _Page()
    p.feed(text)
    p.close()
    return p


MARGINS = [
    {"stem": "line_a", "json": "line_a.json", "png": "line_a.png", "direction": "+", "family": "ramp", "confidence": 0.9,
     "slope_max_deg": 1.25, "relief_m": 80.0, "break_depth_m": 150.0},
    {"stem": "line_b", "json": "line_b.json", "direction": "-", "family": "steep_margin", "confidence": 0.4,
     "slope_max_deg": 35.0, "relief_m": 900.0, "break_depth_m": None},
]
LINES = [
    {"stem": "line_a", "file": "line_a.sgy", "line": "", "status": "ok", "json": "line_a.json",
     "png": "line_a.png", "csv": "line_a.horizons.csv", "n_margins": 1},
    {"stem": "line_b", "file": "line_b.sgy", "line": "inline 5", "status": "ok", "json": "line_b.json",
     "png": "line_b.png", "csv": None, "n_margins": 1},
    {"stem": "x<script>", "file": "<script>alert(1)</script>.sgy", "line": "", "status": "failed",
     "json": None, "png": None, "n_margins": 0},
]
ERRORS = [{"file": "<script>alert(1)</script>.sgy", "line": "", "error_type": "SegyReadError",
           "message": "truncated & <bad>"}]


def test_index_has_one_row_per_margin_and_per_error():
    page = _parse(index_html(margins=MARGINS, lines=LINES, errors=ERRORS, summary_png="summary.png",
                             map_png="map.png"))
    rows = page.tables["margins"]
    assert len(rows) == 1 + 2  # header + one row per margin
    assert len(rows[0]["cells"]) == len(TABLE_COLUMNS)
    heads = [h for _, h, _ in TABLE_COLUMNS]
    assert rows[1]["cells"][0] == "line_aJSON" and rows[1]["attrs"]["data-family"] == "ramp"
    assert rows[2]["cells"][heads.index("max slope (°)")] == "35.0" and rows[2]["attrs"]["data-confidence"] == "0.4"
    assert rows[2]["cells"][heads.index("break depth (m)")] == "–"  # missing break depth shown as missing, not 0
    err = page.tables["errors-table"]
    assert len(err) == 2 and err[1]["cells"][2] == "SegyReadError"
    assert err[1]["cells"][3] == "truncated & <bad>"  # escaped in the source, text intact once parsed


def test_index_links_are_relative_and_point_to_each_lines_files():
    page = _parse(index_html(margins=MARGINS, lines=LINES, errors=ERRORS, summary_png="summary.png",
                             map_png="map.png"))
    for ref in ("line_a.png", "line_a.json", "line_a.horizons.csv", "line_b.png", "line_b.json",
                "summary.png", "map.png"):
        assert ref in page.hrefs
    assert set(page.srcs) == {"line_a.png", "line_b.png", "summary.png", "map.png"}
    # the line name opens the QC figure; the JSON is the small link beside it
    assert page.qc_links[:1] == [("line_a.png", "line_a.json")]
    # self-contained: nothing fetched from the network, no absolute paths
    for ref in page.hrefs + page.srcs:
        assert "://" not in ref and not ref.startswith("/")


def test_index_escapes_text_from_files_and_shows_the_caution():
    text = index_html(margins=MARGINS, lines=LINES, errors=ERRORS, cautions=["Recorded caution <b>"])
    page = _parse(text)
    assert page.n_scripts == 1  # only the page's own script: file names cannot inject one
    assert "<script>alert(1)" not in text and "&lt;script&gt;alert(1)" in text
    joined = " ".join(" ".join(page.text).split())
    assert CAUTION_TEXT in joined
    assert "local regulations" in joined and "qualified interpreter" in joined
    assert "Recorded caution <b>" in joined
    assert joined.count("qualified interpreter") == 1  # the caution is shown once


def test_index_shows_the_standard_recorded_cautions_only_once():
    from clinometry.pipeline import CAUTIONS

    joined = " ".join(" ".join(_parse(index_html(margins=MARGINS, lines=LINES, errors=[],
                                                 cautions=list(CAUTIONS) * 3)).text).split())
    assert joined.count("Caution.") == 1
    for c in CAUTIONS:  # the recorded ones say what the page's caution says: not repeated below it
        assert c not in joined


def test_index_flags_the_default_velocity_in_a_banner_and_in_the_table():
    margins = [dict(MARGINS[0], velocity_model="constant 3000 m/s", default_velocity="yes"),
               dict(MARGINS[1], velocity_model="constant 2500 m/s", default_velocity="no")]
    lines = [dict(LINES[0], default_velocity=True), dict(LINES[1], default_velocity=False)]
    page = _parse(index_html(margins=margins, lines=lines, errors=[]))
    joined = " ".join(" ".join(page.text).split())
    assert "Default velocity. 1 of 2 line(s) were converted to depth with the package default velocity" in joined
    heads = [h for _, h, _ in TABLE_COLUMNS]
    rows = page.tables["margins"]
    assert rows[1]["cells"][heads.index("velocity")] == "constant 3000 m/sdefault"
    assert rows[2]["cells"][heads.index("velocity")] == "constant 2500 m/s"
    no_flag = " ".join(_parse(index_html(margins=margins[1:], lines=lines[1:], errors=[])).text)
    assert "Default velocity." not in no_flag


def test_index_rows_carry_p10_p90_reasons_and_review():
    from clinometry.report.review import REVIEW_COLUMNS

    m = dict(MARGINS[0], slope_max_deg_p10=1.0, slope_max_deg_p90=1.6, relief_m_p10=70.0, relief_m_p90=95.0,
             break_depth_m_p10=140.0, break_depth_m_p90=162.0,
             reasons=["ramp: slope below 1 deg (Read 1985, from memory)", "second reason"],
             decision="accept", note="clear", reviewer="A. Reviewer", review_time="2026-12-04T10:00:00Z",
             review_status="accepted", review_picks={"break_trace": 3}, break_trace=3)
    page = _parse(index_html(margins=[m], lines=LINES[:1], errors=[]))
    heads = [h for _, h, _ in TABLE_COLUMNS]
    row = page.tables["margins"][1]
    assert row["cells"][heads.index("max slope P10-P90 (°)")] == "1.0 – 1.6"
    assert row["cells"][heads.index("relief P10-P90 (m)")] == "70 – 95"
    assert row["cells"][heads.index("break depth P10-P90 (m)")] == "140 – 162"
    reasons = row["cells"][heads.index("reasons (click to expand)")]
    assert "second reason" in reasons and "from memory" not in reasons
    a = row["attrs"]
    assert (a["data-decision"], a["data-note"], a["data-reviewer"], a["data-rbt"]) == ("accept", "clear",
                                                                                      "A. Reviewer", "3")
    assert json.loads(page.tables_attrs["margins"]["data-review-columns"]) == list(REVIEW_COLUMNS)


def test_index_without_margins_or_errors(tmp_path):
    path = write_index(tmp_path / "index.html", margins=[], lines=[], errors=[])
    page = _parse(path.read_text(encoding="utf-8"))
    assert len(page.tables["margins"]) == 1  # header only
    assert "errors-table" not in page.tables
    assert "No line failed." in " ".join(page.text)
