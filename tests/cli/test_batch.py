"""Tests of ``clinometry batch``: exit codes and messages, and a run killed with
SIGKILL part-way then resumed with no lost and no duplicated rows."""

import csv
import json
import os
import signal
import subprocess
import sys
import time

import pytest

from clinometry.cli import main

#: forward-model scenarios used here (three lines, so a kill lands part-way)
SCENARIOS = ("gentle_ramp", "rimmed_shelf", "steep_margin")


@pytest.fixture(scope="module")
def lines(tmp_path_factory):
    from clinometry.synth import make_line
    from clinometry.synth.write import write_line

    folder = tmp_path_factory.mktemp("cli_lines")
    for name in SCENARIOS:
        section, truth = make_line(name, seed=5)
        write_line(section, truth, folder / f"{name}.sgy")
    return folder


def _rows(path):
    with open(path, newline="", encoding="utf-8") as fh:
        return list(csv.DictReader(fh))


def test_batch_cli_all_good_exit_0(lines, tmp_path, capsys):
    code = main(["batch", str(lines / "gentle_ramp.sgy"), "--out", str(tmp_path), "--workers", "1",
                 "--no-plot", "--quiet", "--velocity", "2500"])
    out, err = capsys.readouterr()
    assert code == 0, err
    assert out.startswith("1 line(s): 1 analysed, 0 already complete, 0 failed; 0 input(s) unusable;")
    assert f"review page: {tmp_path / 'index.html'}" in out
    assert err == ""


def test_batch_cli_some_failed_exit_1_says_how_many(lines, tmp_path, capsys):
    bad = tmp_path / "bad.sgy"
    bad.write_bytes(b"\x00" * 1000)
    code = main(["batch", str(lines / "gentle_ramp.sgy"), str(bad), "--out", str(tmp_path / "o"),
                 "--workers", "1", "--no-plot", "--quiet"])
    out, err = capsys.readouterr()
    assert code == 1
    # the bad file never became a line: it is an input whose geometry could not be read
    assert out.startswith("1 line(s): 1 analysed, 0 already complete, 0 failed; 1 input(s) unusable;")
    assert err.strip() == f"clinometry: 1 line(s) or input(s) failed; see {tmp_path / 'o' / 'errors.csv'}"
    assert [r["file"] for r in _rows(tmp_path / "o" / "errors.csv")] == [str(bad)]


def test_batch_cli_nothing_ran_exit_2(tmp_path, capsys):
    code = main(["batch", str(tmp_path / "nothing-*.sgy"), "--out", str(tmp_path / "o"), "--quiet"])
    out, err = capsys.readouterr()
    assert code == 2
    assert err.startswith("clinometry: error: nothing could run; see ")
    assert "pattern matches no file" in (tmp_path / "o" / "errors.csv").read_text()


def test_batch_cli_bad_line_selection_is_one_line_error(lines, tmp_path, capsys):
    code = main(["batch", str(lines), "--out", str(tmp_path), "--inlines", "9:1", "--quiet"])
    _, err = capsys.readouterr()
    assert code == 2
    assert err == "clinometry: error: line selection '9:1': need A <= B and STEP > 0\n"


def test_batch_killed_part_way_then_resumed_has_no_lost_or_duplicated_rows(lines, tmp_path, capsys):
    out = tmp_path / "out"
    cmd = [sys.executable, "-m", "clinometry", "batch", str(lines), "--out", str(out), "--workers", "1",
           "--no-plot", "--quiet", "--velocity", "2500"]
    proc = subprocess.Popen(cmd, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
    deadline = time.monotonic() + 240
    try:
        while time.monotonic() < deadline and proc.poll() is None:
            # a line is complete once its horizons CSV, written after its JSON, is there
            if out.is_dir() and any(n.endswith(".horizons.csv") and not n.startswith(".") for n in os.listdir(out)):
                break
            time.sleep(0.02)
        assert proc.poll() is None, "the batch finished before it could be killed: " + proc.stderr.read().decode()
        os.kill(proc.pid, signal.SIGKILL)
    finally:
        proc.wait(timeout=30)
        proc.stderr.close()
    assert proc.returncode == -signal.SIGKILL
    done_before = sorted(n for n in os.listdir(out) if n.endswith(".horizons.csv") and not n.startswith("."))
    assert 1 <= len(done_before) < len(SCENARIOS)
    assert not (out / "margins.csv").exists()  # tables are written at the end only

    code = main(["batch", str(lines), "--out", str(out), "--workers", "1", "--no-plot", "--quiet",
                 "--velocity", "2500", "--resume"])
    stdout, _ = capsys.readouterr()
    assert code == 0
    assert f"{len(done_before)} already complete" in stdout
    docs = {n[:-5]: json.loads((out / n).read_text()) for n in os.listdir(out)
            if n.endswith(".json") and not n.startswith(".")}
    assert sorted(docs) == sorted(SCENARIOS)  # no line lost
    rows = _rows(out / "margins.csv")
    keys = [(r["stem"], r["direction"]) for r in rows]
    assert len(keys) == len(set(keys))  # no row duplicated
    assert sorted(keys) == sorted((s, m["direction"]) for s, d in docs.items() for m in d["margins"])
    assert _rows(out / "errors.csv") == []


def test_batch_margins_csv_names_the_full_input_path_of_same_named_lines(lines, tmp_path, capsys):
    # issue 15 item 1: the same file name in two folders; each row says which input it came from
    import shutil

    for sub in ("a", "b"):
        (tmp_path / sub).mkdir()
        shutil.copy(lines / "gentle_ramp.sgy", tmp_path / sub / "line.sgy")
    code = main(["batch", str(tmp_path / "a"), str(tmp_path / "b"), "--out", str(tmp_path / "o"), "--workers", "1",
                 "--no-plot", "--quiet", "--velocity", "2500"])
    assert code == 0, capsys.readouterr().err
    rows = _rows(tmp_path / "o" / "margins.csv")
    assert rows, "the ramp line has a margin"
    by_stem = {}
    for r in rows:
        by_stem.setdefault(r["stem"], set()).add(r["file"])
    assert by_stem == {"a_line": {str(tmp_path / "a" / "line.sgy")}, "b_line": {str(tmp_path / "b" / "line.sgy")}}


def test_batch_dangling_link_is_an_errors_row_and_exit_1(lines, tmp_path, capsys):
    # issue 15 item 11: a dangling symbolic link among good lines was skipped without a word
    import shutil

    (tmp_path / "in").mkdir()
    shutil.copy(lines / "gentle_ramp.sgy", tmp_path / "in" / "ramp.sgy")
    os.symlink(tmp_path / "gone.sgy", tmp_path / "in" / "dangling.sgy")
    code = main(["batch", str(tmp_path / "in"), "--out", str(tmp_path / "o"), "--workers", "1", "--no-plot",
                 "--quiet", "--velocity", "2500"])
    assert code == 1
    capsys.readouterr()
    assert [(r["file"], r["error_type"]) for r in _rows(tmp_path / "o" / "errors.csv")] == [
        (str(tmp_path / "in" / "dangling.sgy"), "FileNotFoundError")]


@pytest.mark.parametrize("address", ["http://127.0.0.1:8787", "not a host:::", "tcp://", "tcp://host:99999"])
def test_batch_bad_scheduler_address_is_one_line_error_exit_2(lines, tmp_path, capsys, address):
    # issue 15 item 14: a malformed address was reported as an internal error with a traceback
    import time

    t0 = time.monotonic()
    code = main(["batch", str(lines / "gentle_ramp.sgy"), "--out", str(tmp_path / "o"), "--scheduler", address,
                 "--quiet", "--no-plot"])
    err = capsys.readouterr().err
    assert code == 2
    assert err.count("\n") == 1 and err.startswith(f"clinometry: error: --scheduler {address.strip()}: ")
    assert "internal error" not in err and "Traceback" not in err
    assert time.monotonic() - t0 < 10  # refused before any connection attempt


def test_thresholds_file_that_is_not_utf8_is_one_line_error_exit_2(lines, tmp_path, capsys):
    # issue 15 item 14: TOML is UTF-8 (TOML v1.0.0 specification); Latin-1 "é" is byte 0xE9
    bad = tmp_path / "t.toml"
    bad.write_bytes("# caf\u00e9\n[thresholds]\n".encode("latin-1"))
    code = main(["batch", str(lines / "gentle_ramp.sgy"), "--out", str(tmp_path / "o"), "--thresholds", str(bad),
                 "--quiet", "--no-plot", "--workers", "1"])
    err = capsys.readouterr().err
    assert code == 2
    assert err == (f"clinometry: error: {bad}: not UTF-8 text (byte 5: invalid continuation byte); "
                   "TOML files are UTF-8: save it as UTF-8\n")
