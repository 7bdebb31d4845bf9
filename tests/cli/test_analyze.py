"""``clinometry analyze``: files written, stdout summary, exit codes, stderr one-liners.

The JSON contract itself is checked key by key in tests/test_result.py.
"""

import csv
import json
import shutil
import subprocess
import sys
from pathlib import Path

import numpy.testing as npt
import pytest

from clinometry.cli import main


def _run(capsys, argv):
    code = main(argv)
    out, err = capsys.readouterr()
    return code, out, err


def test_analyze_writes_json_horizons_and_summary(synthetic_line_file, tmp_path, capsys):
    path, truth = synthetic_line_file
    out_dir = tmp_path / "res"
    code, out, err = _run(capsys, ["analyze", str(path), "--velocity", "2500", "--no-uncertainty",
                                   "--no-plot", "--out", str(out_dir)])
    assert code == 0, err
    d = json.loads((out_dir / "shelf_line.json").read_text())
    assert d["source"]["n_traces"] == truth["n_traces"]
    lines = out.splitlines()
    assert lines[0] == f"shelf_line.sgy: {len(d['margins'])} margin(s); results in {out_dir / 'shelf_line.json'}"
    m = d["margins"][0]
    assert lines[1] == (
        f"  margin {m['direction']}: {m['family']}{' (' + m['subtype'] + ')' if m['subtype'] else ''}, "
        f"confidence {m['confidence']:.2f}, slope max {m['slope_max_deg']:.1f} deg, "
        f"mean {m['slope_mean_deg']:.1f} deg, relief {m['relief_m']:.0f} m"
    )
    from clinometry.cli.analyze import CAUTION_LINE

    assert lines[-1] == f"  caution: {CAUTION_LINE}"
    assert "drilling" in CAUTION_LINE and "regulations" in CAUTION_LINE
    assert not (out_dir / "shelf_line.png").exists()
    with open(out_dir / "shelf_line.horizons.csv", newline="") as fh:
        rows = list(csv.DictReader(fh))
    assert list(rows[0]) == ["horizon_id", "role", "trace", "distance_m", "x", "y", "z", "depth_m", "quality"]
    # depth = v t / 2 for the constant 2500 m/s (Sheriff & Geldart 1995, from memory)
    r = rows[len(rows) // 2]
    # (the table rounds to 0.001 of each unit, so z's rounding error grows by v/2000 = 1.25)
    npt.assert_allclose(float(r["depth_m"]), 2500.0 * float(r["z"]) / 2000.0, atol=0.002)


def test_analyze_writes_qc_plot_unless_no_plot(synthetic_line_file, tmp_path, capsys):
    path, _ = synthetic_line_file
    code, _, err = _run(capsys, ["analyze", str(path), "--velocity", "2500", "--no-uncertainty",
                                 "--out", str(tmp_path)])
    assert code == 0, err
    png = tmp_path / "shelf_line.png"
    # PNG signature, ISO/IEC 15948 section 5.2
    assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"


def test_default_velocity_fallback_is_printed(synthetic_line_file, tmp_path, capsys):
    from clinometry.depth import DEFAULT_VELOCITY_NOTE

    path, _ = synthetic_line_file
    code, out, err = _run(capsys, ["analyze", str(path), "--no-uncertainty", "--no-plot", "--out", str(tmp_path)])
    assert code == 0, err
    assert f"  fallback: {DEFAULT_VELOCITY_NOTE}" in out.splitlines()
    assert json.loads((tmp_path / "shelf_line.json").read_text())["velocity"]["default_fallback"] is True


def test_missing_file_exit_2_one_line_naming_it(tmp_path, capsys):
    code, out, err = _run(capsys, ["analyze", str(tmp_path / "nothere.sgy"), "--out", str(tmp_path)])
    assert code == 2 and out == ""
    assert err.count("\n") == 1 and err.startswith("clinometry: error: ") and "nothere.sgy" in err


def test_bad_horizon_csv_exit_2_names_file_row_column(synthetic_line_file, tmp_path, capsys):
    path, _ = synthetic_line_file
    bad = tmp_path / "picks_bad.csv"
    bad.write_text("trace,z\n10,400\n11,four hundred\n")
    code, _, err = _run(capsys, ["analyze", str(path), "--velocity", "2500", "--horizons", str(bad),
                                 "--out", str(tmp_path)])
    assert code == 2
    assert err == "clinometry: error: picks_bad.csv: row 3, column 'z': 'four hundred' is not a number; " \
                  "write plain decimal numbers (empty cells are skipped)\n"


def test_horizons_option_measures_the_given_horizon(synthetic_line_file, synthetic_shelf, tmp_path, capsys):
    path, truth = synthetic_line_file
    section, _ = synthetic_shelf
    # the interpreter's pick: the true final margin profile, sampled every 4th trace, in ms
    from clinometry import analyze

    auto = analyze(section, velocity=2500.0, uncertainty=False)
    prof = auto.picks.horizon(auto.picks.margins[0].profile_id)
    picks = tmp_path / "mine.csv"
    picks.write_text("trace,z\n" + "".join(f"{t},{float(z)!r}\n" for t, z in zip(prof.trace[::4], prof.z[::4])))
    code, out, err = _run(capsys, ["analyze", str(path), "--velocity", "2500", "--horizons", str(picks),
                                   "--no-uncertainty", "--no-plot", "--out", str(tmp_path)])
    assert code == 0, err
    d = json.loads((tmp_path / "shelf_line.json").read_text())
    assert d["run"]["horizon_source"] == str(picks) and d["run"]["picker"] == "horizons"
    (m,) = d["margins"]
    assert m["direction"] == truth["margins"][0]["direction"] == "+"
    # the command line gives what the Python API gives for the same file and horizon
    from clinometry import measure_horizon, read_section

    api = measure_horizon(picks, read_section(path), velocity=2500.0, uncertainty=False).to_dict()
    assert api["margins"] == d["margins"]


def test_unknown_classifier_is_a_usage_error(synthetic_line_file, tmp_path, capsys):
    path, _ = synthetic_line_file
    with pytest.raises(SystemExit) as info:
        main(["analyze", str(path), "--classifier", "nope", "--out", str(tmp_path)])
    assert info.value.code == 2
    err = capsys.readouterr().err
    assert "argument --classifier: invalid choice: 'nope' (choose from " in err and "rules" in err


def test_bad_thresholds_file_exit_2_names_it(synthetic_line_file, tmp_path, capsys):
    path, _ = synthetic_line_file
    bad = tmp_path / "limits.toml"
    bad.write_text("this is = = not toml\n")
    code, _, err = _run(capsys, ["analyze", str(path), "--velocity", "2500", "--thresholds", str(bad),
                                 "--no-uncertainty", "--no-plot", "--out", str(tmp_path)])
    assert code == 2
    assert err.startswith("clinometry: error: ") and "limits.toml" in err and err.count("\n") == 1


def test_console_script_runs_plugins_listing():
    # the installed console script (setup.cfg console_scripts), next to this interpreter
    script = shutil.which("clinometry", path=str(Path(sys.executable).parent))
    assert script, f"no 'clinometry' console script beside {sys.executable}; is the package installed?"
    proc = subprocess.run([script, "plugins", "--kind", "picker"], capture_output=True, text=True, timeout=120)
    assert proc.returncode == 0, proc.stderr
    assert proc.stdout.splitlines()[:2] == ["pickers (clinometry.pickers):",
                                            "  default  [clinometry.picking.default:pick_default]"]


def test_depth_domain_file_needs_no_velocity(synthetic_shelf, tmp_path, capsys):
    from clinometry.depth import ConstantVelocity, section_to_depth
    from clinometry.synth.write import write_line

    section, truth = synthetic_shelf
    dsec = section_to_depth(section, ConstantVelocity(2500.0), dz_m=2.5)
    path, _ = write_line(dsec, {**truth, "domain": "depth", "units": "m"}, tmp_path / "shelf_depth.sgy")
    code, out, err = _run(capsys, ["analyze", str(path), "--domain", "depth", "--no-uncertainty", "--no-plot",
                                   "--out", str(tmp_path / "out")])
    assert code == 0, err
    d = json.loads((tmp_path / "out" / "shelf_depth.json").read_text())
    assert d["source"]["domain"] == "depth" and d["velocity"]["model"] == "none"
    assert d["velocity"]["default_fallback"] is False and "m/s assumed" not in out
    for m in d["margins"]:
        # in a depth section z is already depth below the z origin
        npt.assert_allclose(m["break"]["depth_m"], m["break"]["z"])
    # a velocity for a depth section is refused with one line naming the problem
    code, _, err = _run(capsys, ["analyze", str(path), "--domain", "depth", "--velocity", "2500",
                                 "--out", str(tmp_path / "out")])
    assert code == 2 and err.startswith("clinometry: error: ") and err.count("\n") == 1


CUBE = Path(__file__).resolve().parents[2] / "synthetic_volumes" / "curved_margin_cube.sgy"


@pytest.mark.skipif(not CUBE.exists(), reason="synthetic_volumes/ not present")
def test_inline_of_3d_volume_gets_its_own_stem(tmp_path, capsys):
    code, out, err = _run(capsys, ["analyze", str(CUBE), "--inline", "120", "--velocity", "2500",
                                   "--no-uncertainty", "--no-plot", "--out", str(tmp_path)])
    assert code == 0, err
    d = json.loads((tmp_path / "curved_margin_cube_il120.json").read_text())
    # the cube has 120 crosslines per inline (synthetic_volumes/README.md)
    assert (d["source"]["inline"], d["source"]["line_label"], d["source"]["n_traces"]) == (120, "inline 120", 120)
    code, out, err = _run(capsys, ["analyze", str(CUBE), "--out", str(tmp_path)])
    assert code == 2 and "curved_margin_cube.sgy" in err and err.count("\n") == 1


def test_horizons_picker_needs_a_horizon_file_and_another_picker_refuses_one(synthetic_line_file, tmp_path, capsys):
    # usage errors are one line on stderr with exit code 2 (common practice, no source)
    path, _ = synthetic_line_file
    code, _, err = _run(capsys, ["analyze", str(path), "--picker", "horizons", "--out", str(tmp_path)])
    assert code == 2
    # the command line names its own option, not the Python keyword (issue 13)
    assert err == ("clinometry: error: the 'horizons' picker reads the interpreter's horizon: give "
                   "--horizons FILE.csv\n")
    code, _, err = _run(capsys, ["analyze", str(path), "--picker", "default", "--horizons", "mine.csv",
                                 "--out", str(tmp_path)])
    assert code == 2
    assert "is read by the 'horizons' picker, but picker 'default' was chosen" in err
    assert not list(tmp_path.iterdir())


def test_analyze_never_replaces_its_input_with_an_output(tmp_path, capsys):
    # issue 15 item 4: a SEG-Y named line.png analysed into its own folder once overwrote itself;
    # segyio's 1xN.sgy (one inline, read as a 2D line; tests/data/README.md)
    import warnings
    from pathlib import Path

    data = Path(__file__).resolve().parents[1] / "data" / "segy-reference" / "1xN.sgy"
    src = tmp_path / "line.png"
    src.write_bytes(data.read_bytes())
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")  # the trace-spacing fallback of 1xN.sgy
        code = main(["analyze", str(src), "--out", str(tmp_path), "--velocity", "2500"])
    err = capsys.readouterr().err
    assert code == 2
    assert err.strip() == (f"clinometry: error: {src}: this output would replace the input file {src}; "
                           "write the results to another folder (--out) or rename the input")
    assert src.read_bytes() == data.read_bytes()


def test_analyze_file_name_with_dollar_signs_draws_the_qc_figure(tmp_path, capsys):
    # issue 15 item 5: "$a^{$" is unbalanced math text; plot text is literal, so the figure is drawn
    # (segyio's 1xN.sgy, tests/data/README.md; PNG signature from the PNG specification, ISO/IEC 15948)
    import warnings

    data = Path(__file__).resolve().parents[1] / "data" / "segy-reference" / "1xN.sgy"
    src = tmp_path / "in" / "l$a^{$.sgy"
    src.parent.mkdir()
    src.write_bytes(data.read_bytes())
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", UserWarning)  # the trace-spacing fallback of 1xN.sgy
        warnings.simplefilter("error", __import__("clinometry.errors").errors.FigureWarning)
        code = main(["analyze", str(src), "--out", str(tmp_path / "o"), "--velocity", "2500"])
    assert code == 0, capsys.readouterr().err
    png = [p for p in (tmp_path / "o").iterdir() if p.suffix == ".png"]
    assert len(png) == 1 and png[0].read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"


def test_a_figure_that_fails_is_a_warning_and_the_results_are_kept(tmp_path, monkeypatch):
    # issue 15 item 5: a failed figure once removed the line's computed results
    import warnings

    from clinometry.errors import FigureWarning
    from clinometry.report import figures

    def broken(*args, **kwargs):
        raise ValueError("figure drawing failed on purpose")

    monkeypatch.setattr(figures, "qc_figure", broken)
    data = Path(__file__).resolve().parents[1] / "data" / "segy-reference" / "1xN.sgy"
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", UserWarning)
        warnings.simplefilter("always", FigureWarning)
        with pytest.warns(FigureWarning, match="on purpose.*results JSON and horizons CSV are kept"):
            code = main(["analyze", str(data), "--out", str(tmp_path), "--velocity", "2500"])
    assert code == 0
    doc = json.loads((tmp_path / "1xN.json").read_text())
    assert doc["source"]["path"].endswith("1xN.sgy")
    assert (tmp_path / "1xN.horizons.csv").is_file() and not (tmp_path / "1xN.png").exists()
