"""An interpreter's review of a batch: accept / reject / needs-work per margin, carried into the tables.

The review page (``index.html``) keeps a decision and a free-text note per
margin in the browser and exports them as ``review.csv`` with the columns
:data:`REVIEW_COLUMNS`: ``file, line, direction, decision, note, reviewer,
time``, then the picks the decision was made on (``stem, break_trace,
break_depth_m, toe_trace, toe_depth_m``).  ``clinometry batch ... --review
review.csv`` reads it back (:func:`read_review`), keeps every decision in
the output folder's own ``review.csv`` (:func:`merge_decisions`), gives each
margin of the run its review state (:func:`apply_review`) and writes
``margins_reviewed.csv`` with the accepted margins and their notes
(:func:`write_reviewed_csv`).

A margin is matched to a decision by file name, line and basin side, and
each decision goes to one margin: where a line has several margins facing
the same way, to the one with the reviewed picks, else to the nearest by
break and toe trace (a decision nearest to a margin already decided on its
present picks is an older one and is left out).  Where two files share a
name (``a/x.sgy``, ``b/x.sgy``), a decision naming the output stem of one
of them is for that one only.  A decision holds for the margin only while
its picks stay where they were reviewed: the same break and toe traces and
depths within :data:`DEPTH_TOLERANCE_M`.  Where they moved (a new picker, another
velocity) the margin is "changed since review": the old decision and note
are shown, but the margin is not counted as accepted until it is reviewed
again.
"""

from __future__ import annotations

import csv
import io
import logging
import os
from pathlib import Path

from ..errors import ReviewFileError
from .atomic import atomic_write
from .tables import FORMULA_START, MARGIN_COLUMNS, csv_text, rounded_rows

__all__ = [
    "DECISIONS",
    "REVIEW_STATES",
    "REVIEW_COLUMNS",
    "REVIEWED_COLUMNS",
    "DEPTH_TOLERANCE_M",
    "margin_key",
    "read_review",
    "merge_decisions",
    "apply_review",
    "review_counts",
    "write_review_csv",
    "write_reviewed_csv",
    "REVIEW_FILE",
    "REVIEWED_FILE",
    "load_decisions",
    "review_outputs",
]

#: the decisions kept in a batch's output folder (read again by the next run into that folder)
REVIEW_FILE = "review.csv"
#: the accepted margins with their notes
REVIEWED_FILE = "margins_reviewed.csv"

logger = logging.getLogger(__name__)

#: what a reviewer can decide about a margin
DECISIONS = ("accept", "reject", "needs-work")

#: the review state of a margin: decided (by decision), decided on picks that have since moved, or not reviewed
REVIEW_STATES = {"accept": "accepted", "reject": "rejected", "needs-work": "needs-work"}
CHANGED = "changed since review"

#: columns of review.csv, in order: who decided what about which margin, then the picks it was decided on
REVIEW_COLUMNS = ("file", "line", "direction", "decision", "note", "reviewer", "time",
                  "stem", "break_trace", "break_depth_m", "toe_trace", "toe_depth_m")

#: columns of margins_reviewed.csv: the margins table plus the review
REVIEWED_COLUMNS = MARGIN_COLUMNS + ("decision", "note", "reviewer", "review_time")

#: a break or toe whose depth differs by more than this from the reviewed one has moved (m); review.csv
#: holds depths rounded to 1 m (common practice, no source)
DEPTH_TOLERANCE_M = 1.0

_PICK_COLUMNS = ("break_trace", "break_depth_m", "toe_trace", "toe_depth_m")
#: a leading apostrophe that a spreadsheet-safe export put before these characters is taken off again
_FORMULA_START = FORMULA_START


def margin_key(file, line, direction) -> tuple:
    """What matches a decision to a margin: ``(file name, line label, basin side)``.

    Examples
    --------
    >>> margin_key("/data/survey/line_a.sgy", "", "+")
    ('line_a.sgy', '', '+')
    """
    name = os.path.basename(str(file or "").replace("\\", "/"))
    return (name, str(line or "").strip(), str(direction or "").strip())


def _unescape(text):
    text = "" if text is None else str(text)
    if len(text) > 1 and text[0] == "'" and text[1] in _FORMULA_START:
        return text[1:]
    return text


def _int_or_none(text, where):
    text = _unescape(text).strip()
    if text == "":
        return None
    try:
        return int(float(text))
    except ValueError:
        raise ReviewFileError(f"{where}: expected a whole number, got {text!r}; export the review again from "
                              "index.html") from None


def _float_or_none(text, where):
    text = _unescape(text).strip()
    if text == "":
        return None
    try:
        return float(text)
    except ValueError:
        raise ReviewFileError(f"{where}: expected a number, got {text!r}; export the review again from "
                              "index.html") from None


def read_review(path) -> list:
    """Read a ``review.csv`` exported from the review page.

    Parameters
    ----------
    path : str or os.PathLike

    Returns
    -------
    list of dict
        One per decision: the keys of :data:`REVIEW_COLUMNS` (picks as
        numbers or None).  Rows without a decision are skipped.

    Raises
    ------
    ReviewFileError
        The file is missing or not CSV, a column ``file``, ``line``,
        ``direction`` or ``decision`` is missing, or a row holds an unknown
        decision or a bad number; the message names the file and row.
    """
    name = os.path.basename(os.fspath(path))
    try:
        text = Path(path).read_text(encoding="utf-8-sig")
    except FileNotFoundError:
        raise ReviewFileError(f"{name}: review file not found (looked for {os.fspath(path)!r}); export it from "
                              "index.html with 'Export review.csv'") from None
    except (OSError, UnicodeDecodeError) as err:
        raise ReviewFileError(f"{name}: cannot read the review file ({err}); export it again from index.html") \
            from err
    reader = csv.DictReader(io.StringIO(text))
    need = ("file", "line", "direction", "decision")
    missing = [c for c in need if c not in (reader.fieldnames or [])]
    if missing:
        raise ReviewFileError(f"{name}: no column {', '.join(missing)} (header: {', '.join(reader.fieldnames or [])}); "
                              f"a review file has the columns {', '.join(REVIEW_COLUMNS)}")
    out = []
    for i, row in enumerate(reader, start=2):
        where = f"{name}, row {i}"
        decision = _unescape(row.get("decision")).strip().lower()
        if not decision:
            continue
        if decision not in DECISIONS:
            raise ReviewFileError(f"{where}: decision {decision!r} is not one of {', '.join(DECISIONS)}")
        rec = {c: _unescape(row.get(c)).strip() for c in ("file", "line", "direction", "stem", "reviewer", "time")}
        rec["note"] = _unescape(row.get("note"))
        rec["decision"] = decision
        if rec["direction"] not in ("+", "-"):
            raise ReviewFileError(f"{where}: direction {rec['direction']!r} must be '+' or '-' (the basin side)")
        for c in _PICK_COLUMNS:
            parse = _int_or_none if c.endswith("trace") else _float_or_none
            rec[c] = parse(row.get(c), f"{where}, column {c}")
        out.append(rec)
    return out


def merge_decisions(*sources) -> list:
    """Decisions of several reviews, later ones winning for the same margin and picks.

    Parameters
    ----------
    *sources : list of dict
        Decision lists (:func:`read_review`), oldest first.

    Returns
    -------
    list of dict
        One decision per (margin, picks); order of first appearance.

    Examples
    --------
    >>> a = {"file": "a.sgy", "line": "", "direction": "+", "decision": "accept", "break_trace": 3}
    >>> b = dict(a, decision="reject")
    >>> [d["decision"] for d in merge_decisions([a], [b])]
    ['reject']
    """
    merged = {}
    for src in sources:
        for d in src or []:
            k = margin_key(d.get("file"), d.get("line"), d.get("direction")) + tuple(d.get(c) for c in _PICK_COLUMNS)
            merged[k] = d
    return list(merged.values())


def _same_picks(decision, row) -> bool:
    for c in ("break_trace", "toe_trace"):
        if decision.get(c) != row.get(c):
            return False
    for c in ("break_depth_m", "toe_depth_m"):
        a, b = decision.get(c), row.get(c)
        if (a is None) != (b is None):
            return False
        if a is not None and abs(float(a) - float(b)) > DEPTH_TOLERANCE_M:
            return False
    return True


def apply_review(rows, decisions) -> list:
    """The margin rows with their review: decision, note, reviewer, time and state.

    Parameters
    ----------
    rows : list of dict
        Rows of the margins table (:func:`clinometry.report.tables.margin_rows`).
    decisions : list of dict
        :func:`read_review` / :func:`merge_decisions` output.

    Returns
    -------
    list of dict
        Copies of ``rows`` with ``review_status`` (``accepted``,
        ``rejected``, ``needs-work``, ``changed since review`` or ``""`` when
        not reviewed), ``decision``, ``note``, ``reviewer`` and
        ``review_time`` (empty when not reviewed), and ``review_picks``: the
        picks the decision was made on (None when not reviewed).

    Examples
    --------
    >>> row = {"file": "/d/a.sgy", "line": "", "direction": "+", "break_trace": 3, "break_depth_m": 150.2,
    ...        "toe_trace": 9, "toe_depth_m": 400.0}
    >>> d = {"file": "a.sgy", "line": "", "direction": "+", "decision": "accept", "note": "clear rim",
    ...      "break_trace": 3, "break_depth_m": 150.0, "toe_trace": 9, "toe_depth_m": 400.0}
    >>> apply_review([row], [d])[0]["review_status"]
    'accepted'
    >>> apply_review([dict(row, break_trace=5)], [d])[0]["review_status"]
    'changed since review'

    A decision goes to one margin only: on a line with two margins facing the
    same way, the one reviewed keeps its decision and the other stays not
    reviewed.

    >>> other = dict(row, break_trace=80, toe_trace=95)
    >>> [r["review_status"] for r in apply_review([other, row], [d])]
    ['', 'accepted']
    """
    by_key = {}
    for d in decisions or []:
        by_key.setdefault(margin_key(d.get("file"), d.get("line"), d.get("direction")), []).append(d)
    rows_by_key = {}
    for i, r in enumerate(rows):
        rows_by_key.setdefault(margin_key(r.get("file"), r.get("line"), r.get("direction")), []).append(i)
    chosen = {}  # row index -> (decision, picks unchanged)
    for key, idx in rows_by_key.items():
        found = by_key.get(key, [])
        used = set()
        # files of one name in two folders (a/x.sgy, b/x.sgy): a decision naming the output stem of one
        # of them is for that one only
        stems = {str(rows[j].get("stem") or "") for j in idx} - {""}
        fits = {(k, j): _fits(found[k], rows[j], stems) for k in range(len(found)) for j in idx}
        for i in idx:  # a decision made on these very picks, the latest one
            exact = [k for k, d in enumerate(found) if fits[k, i] and _same_picks(d, rows[i])]
            if exact:
                chosen[i] = (found[exact[-1]], True)
                used.update(exact)
        # every other decision was made on picks that have since moved: it belongs to the margin nearest to
        # them by break and toe trace, unless that margin has a decision on its present picks (then it is
        # an older one); where several point at one margin, the nearest wins, then the latest
        best = {}
        for k, d in enumerate(found):
            if k in used:
                continue
            near = [j for j in idx if fits[k, j]]
            if not near:
                continue
            i = min(near, key=lambda j: _pick_distance(d, rows[j]))
            if i in chosen:
                continue
            rank = (_pick_distance(d, rows[i]), -k)
            if i not in best or rank < best[i][0]:
                best[i] = (rank, d)
        for i, (_, d) in best.items():
            chosen[i] = (d, False)
    out = []
    for i, r in enumerate(rows):
        r = dict(r)
        d, same = chosen.get(i, (None, False))
        if d is None:
            r.update(review_status="", decision="", note="", reviewer="", review_time="", review_picks=None)
        else:
            r.update(review_status=REVIEW_STATES[d["decision"]] if same else CHANGED,
                     decision=d["decision"], note=d.get("note") or "",
                     reviewer=d.get("reviewer") or "", review_time=d.get("time") or "",
                     review_picks={c: d.get(c) for c in _PICK_COLUMNS})
        out.append(r)
    return out


def _fits(decision, row, stems) -> bool:
    """Whether a decision may be for this margin: it names no stem of the run's margins, or this one's."""
    own = str(decision.get("stem") or "")
    return own not in stems or own == str(row.get("stem") or "")


def _pick_distance(decision, row) -> tuple:
    """How far a margin's picks are from those a decision was made on: (picks on one side only, traces apart)."""
    one_sided, traces = 0, 0
    for c in ("break_trace", "toe_trace"):
        a, b = (None if v in (None, "") else float(v) for v in (decision.get(c), row.get(c)))
        if (a is None) != (b is None):
            one_sided += 1
        elif a is not None:
            traces += abs(a - b)
    return one_sided, traces


def review_counts(rows) -> dict:
    """How many margins are in each review state (``"not reviewed"`` for the rest).

    Examples
    --------
    >>> review_counts([{"review_status": "accepted"}, {"review_status": ""}, {}])
    {'accepted': 1, 'rejected': 0, 'needs-work': 0, 'changed since review': 0, 'not reviewed': 2}
    """
    counts = dict.fromkeys((*REVIEW_STATES.values(), CHANGED, "not reviewed"), 0)
    for r in rows:
        counts[r.get("review_status") or "not reviewed"] += 1
    return counts


def write_review_csv(decisions, path) -> Path:
    """Write decisions as ``review.csv`` (columns :data:`REVIEW_COLUMNS`) atomically."""
    return atomic_write(path, csv_text(decisions, REVIEW_COLUMNS))


def write_reviewed_csv(rows, path) -> Path:
    """Write ``margins_reviewed.csv``: the accepted margins (picks unchanged since review) with their notes.

    Parameters
    ----------
    rows : list of dict
        :func:`apply_review` output.
    path : str or os.PathLike

    Returns
    -------
    pathlib.Path
    """
    accepted = [r for r in rows if r.get("review_status") == REVIEW_STATES["accept"]]
    return atomic_write(path, csv_text(rounded_rows(accepted), REVIEWED_COLUMNS))


def load_decisions(out_dir, review=None) -> list:
    """The decisions a batch carries: those kept in ``out_dir/review.csv``, then ``review`` (which wins).

    Read when the batch starts, so a bad review file stops it before any
    line runs.

    Parameters
    ----------
    out_dir : str or os.PathLike
        The batch's output folder (its ``review.csv`` holds the decisions of
        earlier runs, when there were any).
    review : str or os.PathLike, optional
        A ``review.csv`` exported from the review page.

    Returns
    -------
    list of dict

    Raises
    ------
    ReviewFileError
    """
    kept = Path(out_dir) / REVIEW_FILE
    older = read_review(kept) if kept.is_file() else []
    given = read_review(review) if review is not None else []
    return merge_decisions(older, given)


def review_outputs(rows, decisions, out_dir):
    """Apply the decisions to a batch's margins and write ``review.csv`` and ``margins_reviewed.csv``.

    Parameters
    ----------
    rows : list of dict
        The batch's margin rows.
    decisions : list of dict
        :func:`load_decisions` output; with none, nothing is written.
    out_dir : str or os.PathLike

    Returns
    -------
    rows : list of dict
        :func:`apply_review` output (the rows unchanged when there is no
        decision).
    counts : dict
        :func:`review_counts` (empty when there is no decision).
    files : dict
        ``{"review_csv": path, "margins_reviewed_csv": path}`` of what was written.
    """
    if not decisions:
        return list(rows), {}, {}
    out = Path(out_dir)
    reviewed = apply_review(rows, decisions)
    files = {"review_csv": write_review_csv(decisions, out / REVIEW_FILE),
             "margins_reviewed_csv": write_reviewed_csv(reviewed, out / REVIEWED_FILE)}
    counts = review_counts(reviewed)
    logger.info("review: %s", ", ".join(f"{v} {k}" for k, v in counts.items()))
    return reviewed, counts, files
