"""clinometry inspect: report on stdout, one-line errors on stderr, exit codes 0/2."""

import json
from pathlib import Path

import pytest

from clinometry.cli import main

DATA = Path(__file__).resolve().parents[1] / "data"


def test_inspect_prints_geometry(capsys):
    rc = main(["inspect", str(DATA / "segy-reference" / "f3.sgy")])
    out, err = capsys.readouterr()
    assert rc == 0 and err == ""
    # f3.sgy textual header: inlines 111..133, crosslines 875..892; reader-results.json: 414 x 75, 4 ms
    assert "414 x 75" in out
    assert "inlines:          111-133 (23)" in out
    assert "crosslines:       875-892 (18)" in out
    assert "4 ms" in out and "2-byte signed int (format 3), big-endian" in out
    assert "C 1 Cropped F3 2-byte integer data set" in out


def test_inspect_json(capsys):
    rc = main(["inspect", str(DATA / "segy-reference" / "delay-scalar.sgy"), "--json", "--no-text"])
    out, err = capsys.readouterr()
    info = json.loads(out)
    # reference README: delay 10000 x time scalar -10 -> 1000 ms; 251 samples at 4 ms
    assert rc == 0
    assert (info["z_start"], info["sample_interval"], info["n_samples"]) == (1000.0, 4.0, 251)
    assert "text_header" not in info


@pytest.mark.parametrize("name, content, problem", [
    ("notes.txt", b"plain text\n" * 500, "not a SEG-Y file"),
    ("tiny.sgy", b"\x00" * 10, "smaller than the 3600-byte"),
])
def test_inspect_bad_input_one_line_exit_2(tmp_path, capsys, name, content, problem):
    path = tmp_path / name
    path.write_bytes(content)
    rc = main(["inspect", str(path)])
    out, err = capsys.readouterr()
    assert rc == 2 and out == ""
    assert err.startswith(f"clinometry: error: {name}: ") and problem in err
    assert err.count("\n") == 1 and "Traceback" not in err


def test_inspect_truncated_reference_file(capsys):
    rc = main(["inspect", str(DATA / "segy-reference" / "broken.sgy")])
    _, err = capsys.readouterr()
    # reference README: broken.sgy is truncated
    assert rc == 2 and err.startswith("clinometry: error: broken.sgy: ") and "truncated" in err
    assert err.count("\n") == 1


def test_inspect_missing_file(tmp_path, capsys):
    rc = main(["inspect", str(tmp_path / "nowhere.sgy")])
    _, err = capsys.readouterr()
    assert rc == 2 and "nowhere.sgy" in err and err.count("\n") == 1


def test_console_script_inspect_json():
    import os
    import shutil
    import subprocess
    import sys

    # the script installed beside this Python (a venv used without activating it), else the one on the PATH
    exe = shutil.which("clinometry", path=os.path.dirname(sys.executable)) or shutil.which("clinometry")
    if exe is None:
        pytest.skip("console script 'clinometry' is not installed in this environment")
    proc = subprocess.run([exe, "inspect", str(DATA / "segy-reference" / "f3-lsb.sgy"), "--json"],
                          capture_output=True, text=True, timeout=120)
    assert proc.returncode == 0, proc.stderr
    info = json.loads(proc.stdout)
    # reference README: f3-lsb.sgy is f3.sgy byte-swapped: little-endian, inlines 111-133
    assert info["byte_order"] == "little" and info["geometry"]["inline_range"] == [111, 133]


def test_empty_textual_header_cards_are_collapsed():
    from clinometry.cli.inspect import text_header_lines

    # SEG-Y rev 1: 40 cards of 80 characters, "C" and the card number first (common practice, no source)
    cards = [f"C{k:2d} LINE A" if k <= 3 else f"C{k:2d}" for k in range(1, 41)]
    text = "\n".join(c.ljust(80) for c in cards)
    assert text_header_lines(text) == ["C 1 LINE A", "C 2 LINE A", "C 3 LINE A", "(cards 4-40 empty)"]
    assert text_header_lines("\n".join(["C 1"] * 1)) == ["C 1"]  # one empty card stays as it is
