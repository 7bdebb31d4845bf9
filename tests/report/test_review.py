"""Tests of the review loop: review.csv read back, decisions matched to margins, margins_reviewed.csv.

The margins are hand-built rows (no picker numbers are pinned); one end-to-end
test runs ``clinometry batch`` on a forward-model line and reviews whatever
margins it finds.  CSV files are read back with Python's csv module, an
independent reader.
"""

import csv

import pytest

from clinometry.cli import main
from clinometry.errors import ReviewFileError
from clinometry.report.review import (
    REVIEW_COLUMNS,
    REVIEWED_COLUMNS,
    apply_review,
    load_decisions,
    merge_decisions,
    read_review,
    review_counts,
    write_review_csv,
    write_reviewed_csv,
)
from clinometry.report.tables import MARGIN_COLUMNS


def _row(file="/survey/line_a.sgy", line="", direction="+", bt=40, bd=150.4, tt=60, td=420.0, **kw):
    r = dict.fromkeys(MARGIN_COLUMNS)
    r.update(file=file, line=line, stem="line_a", direction=direction, family="rimmed_shelf", confidence=0.8,
             break_trace=bt, break_depth_m=bd, toe_trace=tt, toe_depth_m=td, slope_max_deg=21.94, relief_m=269.6)
    r.update(kw)
    return r


def _decision(decision="accept", note="rim clear on the section", bt=40, bd=150.0, tt=60, td=420.0, **kw):
    d = {"file": "line_a.sgy", "line": "", "direction": "+", "decision": decision, "note": note,
         "reviewer": "B. Reviewer", "time": "2026-12-04T09:30:00.000Z", "stem": "line_a",
         "break_trace": bt, "break_depth_m": bd, "toe_trace": tt, "toe_depth_m": td}
    d.update(kw)
    return d


def test_review_csv_round_trip_keeps_every_column(tmp_path):
    decisions = [_decision(note='steep, "rubbly" front'), _decision("reject", direction="-", note="=fold, not a margin")]
    path = write_review_csv(decisions, tmp_path / "review.csv")
    with open(path, newline="", encoding="utf-8") as fh:
        header = next(csv.reader(fh))
    assert tuple(header) == REVIEW_COLUMNS
    assert tuple(REVIEW_COLUMNS[:7]) == ("file", "line", "direction", "decision", "note", "reviewer", "time")
    back = read_review(path)
    assert [b["note"] for b in back] == ['steep, "rubbly" front', "=fold, not a margin"]
    assert back[0]["break_trace"] == 40 and back[0]["break_depth_m"] == 150.0 and back[1]["direction"] == "-"


def test_review_csv_from_a_spreadsheet_safe_export_loses_its_apostrophes(tmp_path):
    # the page writes a leading apostrophe before = + - @ so a spreadsheet does not run the cell
    (tmp_path / "r.csv").write_text("file,line,direction,decision,note\nline_a.sgy,,'-,needs-work,'=check toe\n",
                                    encoding="utf-8")
    (d,) = read_review(tmp_path / "r.csv")
    assert (d["direction"], d["note"], d["break_trace"]) == ("-", "=check toe", None)


@pytest.mark.parametrize("text, match", [
    ("file,line,decision\na.sgy,,accept\n", r"r.csv: no column direction"),
    ("file,line,direction,decision\na.sgy,,+,approve\n", r"r.csv, row 2: decision 'approve' is not one of accept"),
    ("file,line,direction,decision\na.sgy,,up,accept\n", r"r.csv, row 2: direction 'up' must be"),
    ("file,line,direction,decision,break_trace\na.sgy,,+,accept,abc\n", r"row 2, column break_trace: expected"),
])
def test_bad_review_file_names_file_row_and_problem(tmp_path, text, match):
    (tmp_path / "r.csv").write_text(text, encoding="utf-8")
    with pytest.raises(ReviewFileError, match=match):
        read_review(tmp_path / "r.csv")


def test_missing_review_file_says_how_to_make_one(tmp_path):
    with pytest.raises(ReviewFileError, match=r"gone.csv: review file not found .*Export review.csv"):
        read_review(tmp_path / "gone.csv")


def test_decision_holds_while_the_picks_stay_and_flags_them_once_they_moved():
    rows = [_row(), _row(direction="-", bt=10), _row(file="/survey/line_b.sgy")]
    decisions = [_decision(), _decision("reject", direction="-", bt=12)]
    got = apply_review(rows, decisions)
    assert [g["review_status"] for g in got] == ["accepted", "changed since review", ""]
    assert got[0]["note"] == "rim clear on the section" and got[0]["reviewer"] == "B. Reviewer"
    assert got[1]["decision"] == "reject"  # the old decision is shown, flagged
    # a depth moved by more than 1 m (review.csv holds depths to 1 m) is a move too
    assert apply_review([_row(bd=152.0)], decisions)[0]["review_status"] == "changed since review"
    assert apply_review([_row(bd=150.9)], decisions)[0]["review_status"] == "accepted"
    assert review_counts(got) == {"accepted": 0 + 1, "rejected": 0, "needs-work": 0, "changed since review": 1,
                                  "not reviewed": 1}


def test_each_decision_goes_to_one_margin_where_a_line_has_several_facing_the_same_way():
    # a line with three margins facing "-" (as on a real line with several build-ups); one was reviewed
    rows = [_row(direction="-", bt=75, tt=36), _row(direction="-", bt=628, tt=621), _row(direction="-", bt=739, tt=723)]
    accepted = _decision(direction="-", bt=75, bd=150.4, tt=36, td=420.0)
    got = apply_review(rows, [accepted])
    assert [g["review_status"] for g in got] == ["accepted", "", ""]  # the others were never reviewed
    assert review_counts(got)["not reviewed"] == 2
    # picks of the second moved a little since it was rejected: only that one is flagged
    rejected = _decision("reject", direction="-", bt=630, bd=150.4, tt=621, td=420.0, note="fold")
    got = apply_review(rows, [accepted, rejected])
    assert [g["review_status"] for g in got] == ["accepted", "changed since review", ""]
    assert got[1]["note"] == "fold" and got[1]["review_picks"]["break_trace"] == 630
    # an older decision on picks since reviewed again is left out, not handed to a neighbour
    older = _decision("needs-work", direction="-", bt=74, bd=150.4, tt=36, td=420.0)
    got = apply_review(rows, [older, accepted])
    assert [g["review_status"] for g in got] == ["accepted", "", ""]


def test_files_of_one_name_in_two_folders_keep_their_own_decisions():
    # a/line_a.sgy and b/line_a.sgy (outputs a_line_a, b_line_a), copies with the same picks
    rows = [_row(file="/s/a/line_a.sgy", stem="a_line_a"), _row(file="/s/b/line_a.sgy", stem="b_line_a")]
    got = apply_review(rows, [_decision(stem="b_line_a", note="b only")])
    assert [g["review_status"] for g in got] == ["", "accepted"]
    # a decision from before the names clashed (stem line_a, no margin has it now) still finds its margin
    assert [g["review_status"] for g in apply_review(rows[:1], [_decision(stem="line_a")])] == ["accepted"]


def test_later_review_wins_for_the_same_margin_and_picks():
    merged = merge_decisions([_decision("accept")], [_decision("needs-work", note="check the toe")])
    assert [(d["decision"], d["note"]) for d in merged] == [("needs-work", "check the toe")]
    both = merge_decisions([_decision("accept")], [_decision("reject", bt=41)])
    assert len(both) == 2  # decisions on other picks are kept side by side


def test_margins_reviewed_csv_has_the_accepted_margins_with_their_notes(tmp_path):
    rows = apply_review([_row(), _row(direction="-")], [_decision(), _decision("reject", direction="-")])
    write_reviewed_csv(rows, tmp_path / "margins_reviewed.csv")
    with open(tmp_path / "margins_reviewed.csv", newline="", encoding="utf-8") as fh:
        back = list(csv.DictReader(fh))
    assert tuple(back[0]) == REVIEWED_COLUMNS
    assert len(back) == 1 and back[0]["direction"] == "+"
    assert (back[0]["decision"], back[0]["note"], back[0]["reviewer"]) == ("accept", "rim clear on the section",
                                                                           "B. Reviewer")
    assert (back[0]["slope_max_deg"], back[0]["relief_m"]) == ("21.9", "270")  # rounded like margins.csv


def test_decisions_kept_in_the_output_folder_are_read_with_a_new_review(tmp_path):
    write_review_csv([_decision()], tmp_path / "review.csv")
    write_review_csv([_decision("reject", direction="-")], tmp_path / "new.csv")
    got = load_decisions(tmp_path, tmp_path / "new.csv")
    assert sorted(d["direction"] for d in got) == ["+", "-"]
    assert load_decisions(tmp_path / "nothing-here") == []


def _csv_rows(path):
    with open(path, newline="", encoding="utf-8") as fh:
        return list(csv.DictReader(fh))


def test_batch_review_loop_end_to_end(tmp_path, capsys):
    from clinometry.synth import make_line
    from clinometry.synth.write import write_line

    section, truth = make_line("rimmed_shelf", seed=4)
    write_line(section, truth, tmp_path / "shelf.sgy")
    out = tmp_path / "out"
    args = ["batch", str(tmp_path / "shelf.sgy"), "--out", str(out), "--workers", "1", "--quiet", "--no-plot",
            "--velocity", "2500", "--no-uncertainty"]
    assert main(args) == 0
    margins = _csv_rows(out / "margins.csv")
    if not margins:
        pytest.skip("the picker found no margin on this line; the review loop needs one")
    capsys.readouterr()
    # the reviewer accepts every margin the batch found (as the page would export it)
    decisions = [{"file": "shelf.sgy", "line": "", "direction": m["direction"], "decision": "accept",
                  "note": "checked", "reviewer": "C", "time": "2026-12-04T10:00:00Z", "stem": m["stem"],
                  "break_trace": m["break_trace"], "break_depth_m": m["break_depth_m"],
                  "toe_trace": m["toe_trace"], "toe_depth_m": m["toe_depth_m"]} for m in margins]
    write_review_csv(decisions, tmp_path / "review.csv")
    assert main(args + ["--resume", "--review", str(tmp_path / "review.csv")]) == 0
    out_text = capsys.readouterr().out
    assert f"review: {len(margins)} accepted, 0 rejected" in out_text
    reviewed = _csv_rows(out / "margins_reviewed.csv")
    assert [r["direction"] for r in reviewed] == [m["direction"] for m in margins]
    assert {r["note"] for r in reviewed} == {"checked"}
    # a re-run without --review keeps the decisions (kept in out/review.csv) for the unchanged margins
    assert main(args + ["--resume"]) == 0
    assert "accepted" in capsys.readouterr().out
    assert len(_csv_rows(out / "margins_reviewed.csv")) == len(margins)
    # picks that moved since the review: the margin is flagged, not accepted
    moved = [dict(d, break_trace=str(int(d["break_trace"] or 0) + 7)) for d in decisions]
    write_review_csv(moved, out / "review.csv")
    assert main(args + ["--resume"]) == 0
    assert f"{len(margins)} changed since review" in capsys.readouterr().out
    assert _csv_rows(out / "margins_reviewed.csv") == []
