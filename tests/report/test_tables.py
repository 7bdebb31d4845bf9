"""Tests of clinometry.report.atomic and .tables: atomic writes, safe names, margins/errors/horizons tables."""

import csv
import io
import os

import numpy as np
import pytest

from clinometry.report import atomic
from clinometry.report.atomic import atomic_write, safe_name
from clinometry.report.tables import (
    ERROR_COLUMNS,
    MARGIN_COLUMNS,
    margin_rows,
    write_errors_csv,
    write_margins_csv,
    write_margins_parquet,
)


def _point(trace, d, depth, z):
    return {"trace": trace, "distance_m": d, "depth_m": depth, "x": 1000.0 + d, "y": 500.0, "z": z}


def _result():
    """A hand-built result in the JSON contract (invented numbers)."""
    return {
        "schema_version": 1,
        "source": {"path": "a.sgy", "n_traces": 10, "n_samples": 20, "domain": "twt"},
        "velocity": {"model": "constant", "v_m_s": 2500.0},
        "margins": [
            {"direction": "+", "family": "rimmed_shelf", "subtype": None, "confidence": 0.81,
             "reasons": ["slope 12 deg above 10 deg"], "platform_top": None,
             "break": _point(40, 1000.0, 250.0, 200.0), "toe": _point(60, 1500.0, 700.0, 560.0),
             "relief_m": 450.0, "slope_max_deg": 21.5, "slope_mean_deg": 12.25,
             "uncertainty": {"relief_m": {"p10": 400.0, "p50": 450.0, "p90": 505.0},
                             "slope_max_deg": {"p10": 19.0, "p50": 21.5, "p90": 24.0}},
             "clinoforms": [{"break": None, "toe": None}, {"break": None, "toe": None}],
             "trajectory": {"angle_deg": 3.5, "class": "ascending"}},
            {"direction": "-", "family": None, "subtype": None, "confidence": 0.0, "reasons": [],
             "platform_top": None, "break": None, "toe": None, "relief_m": None,
             "slope_max_deg": float("nan"), "slope_mean_deg": None, "clinoforms": [], "trajectory": None},
        ],
    }


def test_atomic_write_writes_text_and_bytes(tmp_path):
    atomic_write(tmp_path / "a.txt", "héllo")
    atomic_write(tmp_path / "b.bin", b"\x00\x01")
    assert (tmp_path / "a.txt").read_text(encoding="utf-8") == "héllo"
    assert (tmp_path / "b.bin").read_bytes() == b"\x00\x01"
    assert sorted(os.listdir(tmp_path)) == ["a.txt", "b.bin"]  # no temporary file left


def test_atomic_write_failure_keeps_old_file_and_leaves_no_temp(tmp_path, monkeypatch):
    target = tmp_path / "margins.csv"
    target.write_text("old complete content")

    def broken_replace(src, dst):
        raise OSError("disk full (simulated)")

    monkeypatch.setattr(atomic.os, "replace", broken_replace)
    with pytest.raises(OSError, match="disk full"):
        atomic_write(target, "new content that never lands")
    # a reader sees the old file whole, and no temp file is left behind
    # (temp + rename is the usual atomic-update pattern: common practice, no source)
    assert target.read_text() == "old complete content"
    assert os.listdir(tmp_path) == ["margins.csv"]


@pytest.mark.parametrize(
    "text, expected",
    [
        ("../../etc/passwd", "etc_passwd"),
        ("/abs/path/line.sgy", "abs_path_line.sgy"),
        ("..\\..\\win\\x", "win_x"),
        (".hidden", "hidden"),
        ("line 7 (reprocessed)", "line_7_reprocessed"),
        ("..", "line"),
        ("", "line"),
        ("a..b", "a_b"),
    ],
)
def test_safe_name_removes_separators_traversal_and_leading_dots(text, expected):
    # no path separator, no "..", no leading dot (common practice, no source)
    out = safe_name(text)
    assert out == expected
    assert os.path.basename(out) == out and ".." not in out and not out.startswith(".")


def test_margin_rows_flattens_points_percentiles_and_trajectory():
    rows = margin_rows(_result(), file="a.sgy", line="inline 5", stem="a_il5")
    assert len(rows) == 2
    r = rows[0]
    assert set(r) == set(MARGIN_COLUMNS)
    assert (r["file"], r["line"], r["stem"], r["family"]) == ("a.sgy", "inline 5", "a_il5", "rimmed_shelf")
    assert (r["break_x"], r["break_depth_m"], r["toe_depth_m"]) == (2000.0, 250.0, 700.0)
    assert (r["relief_m_p10"], r["relief_m_p90"]) == (400.0, 505.0)
    assert (r["slope_max_deg_p10"], r["slope_max_deg_p90"]) == (19.0, 24.0)
    assert r["slope_mean_deg_p10"] is None  # not computed, not invented
    assert (r["trajectory_class"], r["trajectory_angle_deg"], r["n_clinoforms"]) == ("ascending", 3.5, 2)
    r2 = rows[1]
    assert r2["slope_max_deg"] is None  # NaN never reaches a table as a number
    assert r2["break_x"] is None and r2["trajectory_class"] is None


def test_margins_csv_reads_back_with_stdlib_csv(tmp_path):
    rows = margin_rows(_result(), file="a.sgy", stem="a")
    write_margins_csv(rows, tmp_path / "margins.csv")
    # Python's csv module as an independent reader
    with open(tmp_path / "margins.csv", newline="") as fh:
        back = list(csv.DictReader(fh))
    assert tuple(back[0]) == MARGIN_COLUMNS
    assert len(back) == 2
    assert back[0]["relief_m"] == "450"  # 1 m
    assert back[0]["slope_mean_deg"] == "12.2"  # 0.1 deg (12.25 is exact in binary: rounds half to even)
    assert back[1]["relief_m"] == "" and back[1]["family"] == ""


def test_margins_csv_rounds_each_column_to_a_precision_that_means_something(tmp_path):
    # 0.1 deg, 1 m, 0.01 confidence (precision a reviewer can use; common practice, no source)
    row = dict.fromkeys(MARGIN_COLUMNS)
    row.update(file="a.sgy", confidence=0.83666666, slope_max_deg=21.94441234, relief_m=339.6421,
               break_depth_m=155.51, break_x=431234.5678, break_trace=17, trajectory_angle_deg=5.6789,
               velocity_model="constant 3000 m/s", default_velocity="yes")
    write_margins_csv([row], tmp_path / "m.csv")
    with open(tmp_path / "m.csv", newline="") as fh:
        back = next(csv.DictReader(fh))
    assert (back["confidence"], back["slope_max_deg"], back["relief_m"]) == ("0.84", "21.9", "340")
    assert (back["break_depth_m"], back["break_x"], back["break_trace"]) == ("156", "431235", "17")
    assert back["trajectory_angle_deg"] == "5.7"
    assert (back["velocity_model"], back["default_velocity"]) == ("constant 3000 m/s", "yes")
    assert row["slope_max_deg"] == 21.94441234  # the rows themselves keep every digit


def test_margin_rows_carry_the_velocity_model_and_the_default_flag():
    res = _result()
    res["velocity"] = {"model": "constant", "velocity_m_s": 3000.0, "default_fallback": True}
    r = margin_rows(res)[0]
    assert (r["velocity_model"], r["default_velocity"]) == ("constant 3000 m/s", "yes")
    res["velocity"] = {"model": "linear", "v0_m_s": 1800.0, "k_per_s": 0.6, "default_fallback": False}
    r = margin_rows(res)[0]
    assert (r["velocity_model"], r["default_velocity"]) == ("linear 1800 m/s + 0.6/s z", "no")


def test_errors_csv_quotes_commas_and_newlines(tmp_path):
    rows = [{"file": "bad, file.sgy", "line": "", "error_type": "SegyReadError",
             "message": 'bad, file.sgy: "truncated"'}]
    write_errors_csv(rows, tmp_path / "errors.csv")
    back = list(csv.DictReader(io.StringIO((tmp_path / "errors.csv").read_text())))
    assert tuple(back[0]) == ERROR_COLUMNS
    assert back[0]["file"] == "bad, file.sgy"
    assert back[0]["message"] == 'bad, file.sgy: "truncated"'


def test_margins_parquet_matches_csv_rows(tmp_path):
    pq = pytest.importorskip("pyarrow.parquet")
    rows = margin_rows(_result(), file="a.sgy", stem="a")
    path = write_margins_parquet(rows, tmp_path / "margins.parquet")
    table = pq.read_table(path)
    assert table.column_names == list(MARGIN_COLUMNS)
    np.testing.assert_allclose(table.column("relief_m").to_pylist()[0], 450.0)
    assert table.column("relief_m").to_pylist()[1] is None
    assert table.column("family").to_pylist() == ["rimmed_shelf", None]


def test_csv_text_is_the_text_of_the_standard_csv_writer():
    # reference: Python's csv module (minimal quoting, "\n" line ends), row
    # by row, as csv_text wrote before it formatted column by column
    from clinometry.report.tables import _cell, csv_text

    def reference(rows, columns):
        buf = io.StringIO()
        w = csv.writer(buf, lineterminator="\n")
        w.writerow(columns)
        for r in rows:
            w.writerow([_cell(r.get(c)) for c in columns])
        return buf.getvalue()

    rng = np.random.default_rng(0)
    horizons = [
        {"horizon_id": i // 50, "role": "reflector", "trace": i, "distance_m": round(float(d), 3),
         "z": float(z), "quality": None if i % 7 == 0 else 0.25}
        for i, (d, z) in enumerate(zip(rng.uniform(0, 1e4, 200), rng.normal(500, 100, 200)))
    ]
    cols = ("horizon_id", "role", "trace", "distance_m", "z", "quality", "absent")
    cases = [
        (horizons, cols),
        ([], ("a", "b")),
        ([{"a": None}], ("a",)),  # a sole empty cell is quoted by the csv writer
        ([{"a": "x,y", "b": 1.5}], ("a", "b")),
        ([{"a": 'say "hi"', "b": None}, {"a": True, "b": float("nan")}], ("a", "b")),
        ([{"a": "two\nlines", "b": 1e16}], ("a", "b")),
        ([{"a": 1, "b": "s"}, {"a": "t", "b": 2}], ("a", "b")),
        ([{"a": 1}], ("a,b", "c")),
    ]
    for rows, columns in cases:
        assert csv_text(rows, columns) == reference(rows, columns)


def test_horizon_rows_take_their_depths_from_the_result():
    # two horizons on a TWT section at 2500 m/s: depth = v t / 2 (Sheriff & Geldart 1995,
    # from memory), so 400 ms -> 500 m and 404 ms -> 505 m; the table holds what the result
    # holds, and no depth (empty cell) for a result without depths (re-read from JSON)
    from clinometry.metrics import Metrics
    from clinometry.picking.picks import Horizon, Picks
    from clinometry.result import Result
    from clinometry.section import make_section
    from clinometry.report.tables import HORIZON_COLUMNS, csv_text, horizon_rows

    sec = make_section(np.zeros((4, 300), np.float32), z=np.arange(300) * 2.0, trace_spacing_m=12.5,
                       x=100.0 + 12.5 * np.arange(4), y=np.full(4, 50.0))
    picks = Picks(horizons=(Horizon(3, "reflector", np.array([1, 2]), np.array([400.0, 404.0]), np.array([1.0, 0.25])),
                            Horizon(5, "clinoform", np.array([], int), np.array([]), np.array([]))))
    res = Result(source={}, velocity={}, picks=picks, metrics=Metrics(),
                 horizon_depths_m=(np.array([500.0, 505.0]), np.zeros(0)))
    rows = horizon_rows(res, sec)
    assert [(r["horizon_id"], r["trace"], r["distance_m"], r["x"], r["y"], r["z"], r["depth_m"], r["quality"])
            for r in rows] == [(3, 1, 12.5, 112.5, 50.0, 400.0, 500.0, 1.0), (3, 2, 25.0, 125.0, 50.0, 404.0, 505.0, 0.25)]
    bare = Result(source={}, velocity={}, picks=picks, metrics=Metrics())
    text = csv_text(horizon_rows(bare, sec), HORIZON_COLUMNS)
    assert text.splitlines()[1] == "3,reflector,1,12.5,112.5,50.0,400.0,,1.0"


@pytest.mark.parametrize("text, expected", [
    # the leading-quote rule against CSV formula injection (OWASP, "CSV Injection", from memory)
    ("=HYPERLINK(\"http://x\")", "'=HYPERLINK(\"http://x\")"),
    ("+1+1", "'+1+1"), ("-2+3", "'-2+3"), ("@SUM(A1)", "'@SUM(A1)"), ("\tx", "'\tx"), ("\rx", "'\rx"),
    ("line_07.sgy", "line_07.sgy"), ("", ""),
    ("-", "-"), ("+", "+"),  # the basin side of a margin holds no formula (common practice, no source)
])
def test_neutralise_formula_puts_an_apostrophe_before_formula_starts(text, expected):
    from clinometry.report.tables import neutralise_formula

    assert neutralise_formula(text) == expected


def test_every_csv_writer_neutralises_formula_cells_but_keeps_numbers(tmp_path):
    # issue 15 item 12: a file name and a message that start like a formula
    from clinometry.report.review import read_review, write_review_csv
    from clinometry.report.tables import HORIZON_COLUMNS, write_csv

    write_errors_csv([{"file": "=cmd|' /C calc'!A0.sgy", "line": "", "error_type": "SegyReadError",
                       "message": "@evil: truncated"}], tmp_path / "errors.csv")
    back = list(csv.DictReader(io.StringIO((tmp_path / "errors.csv").read_text())))[0]
    assert (back["file"], back["message"]) == ("'=cmd|' /C calc'!A0.sgy", "'@evil: truncated")
    rows = margin_rows(_result(), file="+file.sgy", line="-7", stem="a")
    write_margins_csv(rows, tmp_path / "margins.csv")
    back = list(csv.DictReader(io.StringIO((tmp_path / "margins.csv").read_text())))
    assert [(r["file"], r["line"], r["direction"]) for r in back] == [("'+file.sgy", "'-7", r["direction"])
                                                                    for r in rows]
    write_csv([{"horizon_id": 0, "role": "=x", "trace": 1, "distance_m": -5.0, "x": -1.5, "y": 0.0, "z": 4.0,
                "depth_m": 5.0, "quality": 1.0}], tmp_path / "h.csv", HORIZON_COLUMNS)
    back = list(csv.DictReader(io.StringIO((tmp_path / "h.csv").read_text())))[0]
    assert (back["role"], back["distance_m"], back["x"]) == ("'=x", "-5.0", "-1.5")  # numbers stay numbers
    decision = {"file": "=a.sgy", "line": "", "direction": "-", "decision": "accept", "note": "-looks fine",
                "reviewer": "@me", "time": "", "stem": "a", "break_trace": None, "break_depth_m": None,
                "toe_trace": None, "toe_depth_m": None}
    write_review_csv([decision], tmp_path / "review.csv")
    text = (tmp_path / "review.csv").read_text()
    assert "'=a.sgy" in text and "'-looks fine" in text and "'@me" in text
    again = read_review(tmp_path / "review.csv")[0]  # the apostrophe is taken off when read back
    assert (again["file"], again["note"], again["reviewer"], again["direction"]) == ("=a.sgy", "-looks fine",
                                                                                     "@me", "-")
