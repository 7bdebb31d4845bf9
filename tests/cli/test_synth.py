"""clinometry synth on the command line."""

import json

import numpy as np
import segyio

from clinometry.cli import main
from clinometry.synth import SCENARIOS


def test_synth_list_shows_every_scenario(capsys):
    assert main(["synth", "--list"]) == 0
    out = capsys.readouterr().out
    for name in list(SCENARIOS) + ["curved_margin_cube"]:
        assert name in out


def test_synth_writes_line_and_truth(tmp_path, capsys):
    out = tmp_path / "ramp.sgy"
    rc = main(["synth", "--scenario", "gentle_ramp", "--out", str(out), "--snr", "3", "--seed", "4",
               "--wavelet-hz", "25", "--velocity", "2200", "--format", "ibm", "--delay", "40"])
    assert rc == 0
    stdout = capsys.readouterr().out
    assert f"wrote {out}" in stdout and "ramp.truth.json" in stdout
    truth = json.loads((tmp_path / "ramp.truth.json").read_text())
    assert truth["snr"] == 3.0 and truth["wavelet"]["peak_hz"] == 25.0
    assert truth["velocity"] == {"model": "constant", "v_m_s": 2200.0}
    with segyio.open(out, ignore_geometry=True) as f:
        assert f.bin[segyio.BinField.Format] == 1  # IBM float, SEG-Y rev 1 table 1
        assert f.tracecount == truth["n_traces"]
        np.testing.assert_allclose(f.samples[:2], [40.0, 42.0])  # delay 40 ms, dt 2 ms
    m = truth["margins"][0]
    # constant velocity: z = 2 depth / v (common practice, no source)
    np.testing.assert_allclose(m["break"]["z"], 2000.0 * m["break"]["depth_m"] / 2200.0)


def test_synth_unknown_scenario_exits_2_with_one_line(tmp_path, capsys):
    rc = main(["synth", "--scenario", "no_such", "--out", str(tmp_path / "x.sgy")])
    assert rc == 2
    err = capsys.readouterr().err
    assert err.startswith("clinometry: error: unknown scenario 'no_such'")
    assert err.count("\n") == 1
    assert not (tmp_path / "x.sgy").exists()


def test_synth_needs_scenario_and_out(capsys):
    assert main(["synth", "--scenario", "rimmed_shelf"]) == 2
    assert "--out" in capsys.readouterr().err
