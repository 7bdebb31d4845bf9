"""Error wording and exit codes of the command line: its own option names, "file not found: PATH",
a closed pipe ends quietly, and --debug never changes the exit code."""

import os
import subprocess
import sys

import pytest

from clinometry.cli import BROKEN_PIPE_STATUS, cli_message, main


def test_missing_file_is_file_not_found_path(tmp_path, capsys):
    missing = tmp_path / "line_07.sgy"
    for argv in (["inspect", str(missing)], ["analyze", str(missing), "--out", str(tmp_path / "o")]):
        assert main(argv) == 2
        err = capsys.readouterr().err
        assert err == f"clinometry: error: file not found: {missing}\n"
        assert "Errno" not in err


def test_python_keywords_become_the_command_lines_options():
    msg = cli_message(ValueError("a.sgy: inline=5 asked for, but the file is 2D; read it without inline=, "
                                 "or point header_bytes= at the inline/crossline fields"))
    assert msg.startswith("a.sgy: --inline 5 asked for, but the file is 2D; read it without --inline, or point "
                          "header_bytes at the inline/crossline fields")
    assert msg.endswith("(header_bytes: no command-line option; pass it to clinometry.read_section in Python)")
    assert "=" not in msg
    assert cli_message(ValueError("give inline= or crossline=, not both")) == "give --inline or --crossline, not both"


def test_2d_file_with_inline_names_the_cli_option(tmp_path, capsys):
    from clinometry.synth import make_line
    from clinometry.synth.write import write_line

    section, truth = make_line("gentle_ramp", seed=1)
    write_line(section, truth, tmp_path / "ramp.sgy")
    assert main(["analyze", str(tmp_path / "ramp.sgy"), "--inline", "5", "--out", str(tmp_path / "o")]) == 2
    err = capsys.readouterr().err
    assert "read it without --inline" in err and "inline=" not in err


def test_debug_shows_the_traceback_and_keeps_the_exit_code(tmp_path, capsys):
    missing = str(tmp_path / "gone.sgy")
    assert main(["inspect", missing]) == 2
    plain = capsys.readouterr().err
    assert main(["--debug", "inspect", missing]) == 2
    err = capsys.readouterr().err
    assert err.startswith("Traceback (most recent call last):")
    assert err.endswith(plain)  # the same one-line error closes it


@pytest.mark.skipif(os.name != "posix", reason="a closed pipe and SIGPIPE are POSIX")
def test_closed_pipe_ends_quietly(tmp_path):
    from clinometry.synth import make_line
    from clinometry.synth.write import write_line

    section, truth = make_line("gentle_ramp", seed=1)
    write_line(section, truth, tmp_path / "ramp.sgy")
    # a pipe whose reader is gone before anything is written, as after `| head -1` has read its line
    read_end, write_end = os.pipe()
    os.close(read_end)
    try:
        proc = subprocess.run([sys.executable, "-m", "clinometry", "inspect", str(tmp_path / "ramp.sgy")],
                              stdout=write_end, stderr=subprocess.PIPE, timeout=120)
    finally:
        os.close(write_end)
    assert proc.stderr.decode() == ""  # no "Broken pipe", no traceback, nothing at exit
    # 128 + SIGPIPE (13): what a shell reports for a standard tool stopped by a closed pipe (POSIX)
    assert proc.returncode == BROKEN_PIPE_STATUS == 141


def test_closed_pipe_in_process_returns_the_pipe_status(tmp_path, monkeypatch, capsys):
    class Closed:
        def write(self, text):
            raise BrokenPipeError(32, "Broken pipe")

        def flush(self):
            raise BrokenPipeError(32, "Broken pipe")

    monkeypatch.setattr(sys, "stdout", Closed())
    assert main(["plugins"]) == BROKEN_PIPE_STATUS
    assert capsys.readouterr().err == ""


def test_an_unusable_out_path_is_said_as_a_problem_with_out(tmp_path, capsys):
    # what mkdir and open report (POSIX errno names, Python's OSError subclasses), said in the CLI's words
    from clinometry.synth import make_line
    from clinometry.synth.write import write_line

    section, truth = make_line("gentle_ramp", seed=1)
    line = tmp_path / "ramp.sgy"
    write_line(section, truth, line)
    a_file = tmp_path / "notes.txt"
    a_file.write_text("x", encoding="utf-8")
    cases = [
        (["analyze", str(line), "--out", str(a_file), "--no-plot"],
         f"--out {a_file}: is a file, not a folder; give --out a folder (it is made when missing)"),
        (["analyze", str(line), "--out", str(a_file / "sub"), "--no-plot"],
         f"--out {a_file / 'sub'}: a part of that path is a file, not a folder; give --out a folder"),
        (["batch", str(line), "--out", str(a_file), "--quiet"],
         f"--out {a_file}: is a file, not a folder; give --out a folder (it is made when missing)"),
        # segyio's own error names no file (FileNotFoundError without a file name)
        (["synth", "--scenario", "gentle_ramp", "--out", str(tmp_path / "none" / "x.sgy")],
         f"--out {tmp_path / 'none' / 'x.sgy'}: the folder it goes in ({tmp_path / 'none'}) does not exist; "
         "make it first or give another --out"),
    ]
    for argv, said in cases:
        assert main(argv) == 2, argv
        err = capsys.readouterr().err
        assert err == f"clinometry: error: {said}\n"
        assert "Errno" not in err
    # a missing input is still a missing input, even where --out lies beneath it
    missing = tmp_path / "survey"
    assert main(["analyze", str(missing), "--out", str(missing / "results")]) == 2
    assert capsys.readouterr().err == f"clinometry: error: file not found: {missing}\n"
