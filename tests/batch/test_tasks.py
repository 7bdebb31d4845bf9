"""Tests of batch task planning: paths, folders, globs, 3D line selection, stems."""

import os
from pathlib import Path

import pytest

from clinometry.batch.tasks import Task, expand_paths, parse_line_spec, plan_tasks, unique_stems
from clinometry.errors import GeometryError
from clinometry.report.atomic import safe_name

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
    # the clashing names are named by their path relative to the folder they share
    assert [(t.direction, t.line, t.stem) for t in tasks] == [(None, None, "x_1xN"), (None, None, "y_1xN")]


def test_plan_tasks_stem_collision_with_a_numbered_name_gives_unique_stable_stems(tmp_path):
    # issue 15 item 1: a/x.sgy, b/x.sgy and b/x_2.sgy once gave two inputs the stem x_2
    for sub, name in (("a", "x.sgy"), ("b", "x.sgy"), ("b", "x_2.sgy")):
        (tmp_path / sub).mkdir(exist_ok=True)
        (tmp_path / sub / name).write_bytes((DATA / "1xN.sgy").read_bytes())
    tasks, _ = plan_tasks([tmp_path / "a", tmp_path / "b"])
    stems = {os.path.relpath(t.path, tmp_path): t.stem for t in tasks}
    assert stems == {"a/x.sgy": "a_x", "b/x.sgy": "b_x", "b/x_2.sgy": "x_2"}
    again, _ = plan_tasks([tmp_path / "b", tmp_path / "a"])  # the order of the arguments changes nothing
    assert {os.path.relpath(t.path, tmp_path): t.stem for t in again} == stems


def test_unique_stems_stay_unique_when_the_relative_names_clash_too(tmp_path):
    # "a b/x", "a_b/x" and "a_b_x" all sanitise to a_b_x; case-insensitive file systems merge X and x
    planned = [("/d/a b/x.sgy", None, None), ("/d/a_b/x.sgy", None, None), ("/d/a_b_x.sgy", None, None),
               ("/d/X.sgy", None, None), ("/e/x.sgy", None, None), ("/d/v.sgy", "inline", 5),
               ("/d/v_il5.sgy", None, None)]
    stems = unique_stems(planned)
    assert len({s.casefold() for s in stems}) == len(stems)
    assert stems == unique_stems(list(reversed(planned)))[::-1]  # the same stem whatever the order
    assert all(s == safe_name(s) for s in stems)


def test_plan_tasks_unreadable_file_is_a_problem_row(corrupt_file):
    tasks, problems = plan_tasks([corrupt_file])
    assert tasks == []
    assert problems[0]["file"] == str(corrupt_file)
    assert problems[0]["error_type"] == "SegyReadError"
    assert "corrupt.sgy" in problems[0]["message"]


def test_a_line_named_like_a_batch_file_gets_a_stem_of_its_own():
    # issue 15 item 4: a line named summary, map or index once had its QC PNG replaced by the batch's figure
    planned = [(f"/d/{n}.sgy", None, None) for n in ("summary", "Map", "index", "margins", "errors", "line")]
    assert unique_stems(planned) == ["summary_line", "Map_line", "index_line", "margins_line", "errors_line", "line"]


def test_dangling_links_link_loops_and_folders_named_sgy_are_error_rows(tmp_path):
    # issue 15 item 11: these were skipped without a word (POSIX symlink semantics: ELOOP for a loop)
    (tmp_path / "good.sgy").write_bytes((DATA / "1xN.sgy").read_bytes())
    os.symlink(tmp_path / "gone.sgy", tmp_path / "dangling.sgy")
    os.symlink(tmp_path / "loop_b.sgy", tmp_path / "loop_a.sgy")
    os.symlink(tmp_path / "loop_a.sgy", tmp_path / "loop_b.sgy")
    (tmp_path / "folder.sgy").mkdir()
    files, problems = expand_paths([tmp_path])
    assert [os.path.basename(f) for f in files] == ["good.sgy"]
    assert {os.path.basename(p["file"]): (p["error_type"], p["message"].split(": ", 1)[1]) for p in problems} == {
        "dangling.sgy": ("FileNotFoundError", "symbolic link to a missing file; restore the file or remove the link"),
        "loop_a.sgy": ("OSError", "symbolic links form a loop; point the link at a real file"),
        "loop_b.sgy": ("OSError", "symbolic links form a loop; point the link at a real file"),
        "folder.sgy": ("IsADirectoryError", "is a folder, not a SEG-Y file; give the files inside it, or rename the "
                                            "folder"),
    }
    # the same when named on the command line or by a pattern
    files, problems = expand_paths([tmp_path / "dangling.sgy", str(tmp_path / "loop_*.sgy")])
    assert files == [] and [p["error_type"] for p in problems] == ["FileNotFoundError", "OSError", "OSError"]
