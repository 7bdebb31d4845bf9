"""What ``clinometry batch`` tells the user: bad settings refused before any line runs, the first
reasons on stderr when nothing could run, and the default velocity flagged on the console and in
margins.csv."""

import csv

import pytest

from clinometry.cli import main


@pytest.fixture(scope="module")
def line(tmp_path_factory):
    from clinometry.synth import make_line
    from clinometry.synth.write import write_line

    folder = tmp_path_factory.mktemp("msg_lines")
    section, truth = make_line("rimmed_shelf", seed=2)
    write_line(section, truth, folder / "shelf.sgy")
    return folder / "shelf.sgy"


def test_negative_velocity_is_refused_before_any_line_runs(line, tmp_path, capsys):
    out = tmp_path / "o"
    code = main(["batch", str(line), "--out", str(out), "--velocity", "-2500", "--quiet"])
    _, err = capsys.readouterr()
    assert code == 2
    assert err == ("clinometry: error: constant velocity model: velocity is -2500 m/s; velocities must be "
                   "positive; give it in m/s\n")
    assert not out.exists()  # refused up front: no folder, no line run


def test_nothing_could_run_prints_the_first_reasons_on_stderr(tmp_path, capsys):
    bad = []
    for k in range(5):
        p = tmp_path / f"bad{k}.sgy"
        p.write_bytes(b"\x00" * 1000)
        bad.append(str(p))
    code = main(["batch", *bad, "--out", str(tmp_path / "o"), "--quiet", "--workers", "1"])
    _, err = capsys.readouterr()
    assert code == 2
    lines = err.splitlines()
    assert lines[0].startswith("clinometry: error: nothing could run; see ")
    assert len(lines) == 1 + 3 + 1  # the first three reasons, then how many more are in errors.csv
    assert lines[1].startswith("  bad0.sgy") and lines[3].startswith("  bad2.sgy")
    assert lines[4] == "  ... 2 more in errors.csv"


def test_default_velocity_is_flagged_on_the_console_and_in_margins_csv(line, tmp_path, capsys):
    code = main(["batch", str(line), "--out", str(tmp_path), "--quiet", "--no-plot", "--no-uncertainty",
                 "--workers", "1"])
    out, _ = capsys.readouterr()
    assert code == 0
    assert ("default velocity: 1 line(s) converted at 3000 m/s because no velocity was given (shelf); "
            "their depths are approximate") in out
    with open(tmp_path / "margins.csv", newline="", encoding="utf-8") as fh:
        rows = list(csv.DictReader(fh))
    assert all(r["default_velocity"] == "yes" and r["velocity_model"] == "constant 3000 m/s" for r in rows)
    page = (tmp_path / "index.html").read_text(encoding="utf-8")
    assert 'id="default-velocity"' in page

    code = main(["batch", str(line), "--out", str(tmp_path / "v"), "--quiet", "--no-plot", "--no-uncertainty",
                 "--workers", "1", "--velocity", "2500"])
    out, _ = capsys.readouterr()
    assert code == 0 and "default velocity" not in out
    assert 'id="default-velocity"' not in (tmp_path / "v" / "index.html").read_text(encoding="utf-8")


def test_batch_writes_geojson_and_refuses_a_bad_crs_up_front(line, tmp_path, capsys):
    pytest.importorskip("pyproj")
    code = main(["batch", str(line), "--out", str(tmp_path / "g"), "--quiet", "--crs", "EPSG:4326"])
    _, err = capsys.readouterr()
    assert code == 2 and "is not a projected CRS" in err
    assert not (tmp_path / "g" / "shelf.json").exists()  # refused before the line ran
    code = main(["batch", str(line), "--out", str(tmp_path / "p"), "--quiet", "--no-plot", "--no-uncertainty",
                 "--workers", "1", "--velocity", "2500"])
    out, _ = capsys.readouterr()
    assert code == 0
    if (tmp_path / "p" / "margins_projected.geojson").exists():  # only when the picker found a margin
        assert "margins_projected.geojson (projected survey x/y, not RFC 7946" in out
