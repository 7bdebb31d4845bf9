"""Tests of batch task planning: paths, folders, globs, 3D line selection, stems."""

import os
from pathlib import Path

import pytest

from clinometry.batch.tasks import Task, expand_paths, parse_line_spec, plan_tasks
from clinometry.errors import GeometryError

DATA = Path(__file__).resolve().parents[1] / "data" / "segy-reference"


def test_parse_line_spec_ranges_include_both_ends():
    assert list(parse_line_spec("111:133:11")) == [111, 122, 133]
    assert list(parse_line_spec("5:7")) == [5, 6, 7]
    assert list(parse_line_spec("9")) == [9]
    assert parse_line_spec("ALL") == "all" and parse_line_spec(None) is None


@pytest.mark.parametrize("bad", ["1:x", "10:5", "1:5:0", "1:2:3:4", ""])
def test_parse_line_spec_rejects_bad_text_with_the_text_seen(bad):
    with pytest.raises(GeometryError, match="line selection"):
        parse_line_spec(bad)


def test_expand_paths_files_folders_globs_and_missing(tmp_path):
    (tmp_path / "a.sgy").write_bytes(b"")
    (tmp_path / "B.SEGY").write_bytes(b"")
    (tmp_path / "notes.txt").write_text("x")
    sub = tmp_path / "sub"
    sub.mkdir()
    (sub / "c.sgy").write_bytes(b"")
    files, problems = expand_paths([tmp_path, str(sub / "*.sgy"), tmp_path / "a.sgy", tmp_path / "nope.sgy",
                                    str(tmp_path / "*.xyz")])
    assert [os.path.basename(f) for f in files] == ["B.SEGY", "a.sgy", "c.sgy"]  # sorted, no duplicates
    assert [p["message"] for p in problems] == [f"{tmp_path / 'nope.sgy'}: no such file or folder",
                                                f"{tmp_path / '*.xyz'}: pattern matches no file"]


def test_plan_tasks_every_inline_of_a_3d_volume():
    # segyio's f3.sgy crop: inlines 111-133, crosslines 875-892 (tests/data/README.md, segyio test-data)
    tasks, problems = plan_tasks([DATA / "f3.sgy"])
    assert problems == []
    assert [t.line for t in tasks] == list(range(111, 134))
    assert tasks[0] == Task(path=str((DATA / "f3.sgy").resolve()), direction="inline", line=111, stem="f3_il111")
    assert tasks[0].label == "inline 111"


def test_plan_tasks_selected_inlines_and_crosslines():
    tasks, _ = plan_tasks([DATA / "f3.sgy"], inlines="111:133:11", crosslines="875:892:17")
    assert [(t.direction, t.line) for t in tasks] == [("inline", 111), ("inline", 122), ("inline", 133),
                                                       ("crossline", 875), ("crossline", 892)]
    assert [t.stem for t in tasks][-1] == "f3_xl892"


def test_plan_tasks_selection_outside_the_volume_is_a_problem_row():
    tasks, problems = plan_tasks([DATA / "f3.sgy"], inlines="500:510")
    assert tasks == []
    assert problems[0]["error_type"] == "GeometryError"
    assert "f3.sgy" in problems[0]["message"] and "111..133" in problems[0]["message"]


def test_plan_tasks_2d_lines_with_the_same_name_in_two_folders_get_distinct_stems(tmp_path):
    # segyio's 1xN.sgy has a single inline, so it is read as one 2D line (tests/data/README.md)
    for d in ("x", "y"):
        (tmp_path / d).mkdir()
        (tmp_path / d / "1xN.sgy").write_bytes((DATA / "1xN.sgy").read_bytes())
    tasks, problems = plan_tasks([tmp_path / "x", tmp_path / "y" / "1xN.sgy", tmp_path / "x" / "1xN.sgy"])
    assert problems == []
    assert [(t.direction, t.line, t.stem) for t in tasks] == [(None, None, "1xN"), (None, None, "1xN_2")]


def test_plan_tasks_unreadable_file_is_a_problem_row(corrupt_file):
    tasks, problems = plan_tasks([corrupt_file])
    assert tasks == []
    assert problems[0]["file"] == str(corrupt_file)
    assert problems[0]["error_type"] == "SegyReadError"
    assert "corrupt.sgy" in problems[0]["message"]
