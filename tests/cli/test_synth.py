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
    out = tmp_path / "shelf.sgy"
    rc = main(["synth", "--scenario", "rimmed_shelf", "--out", str(out), "--snr", "3", "--seed", "4",
               "--wavelet-hz", "25", "--velocity", "2200", "--format", "ibm", "--delay", "40"])
    assert rc == 0
    stdout = capsys.readouterr().out
    assert f"wrote {out}" in stdout and "shelf.truth.json" in stdout
    truth = json.loads((tmp_path / "shelf.truth.json").read_text())
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


def test_synth_list_shows_the_analytic_scenarios_by_group(capsys):
    from clinometry.synth import ANALYTIC_SCENARIOS, GROUPS

    assert main(["synth", "--list"]) == 0
    out = capsys.readouterr().out
    for name in ANALYTIC_SCENARIOS:
        assert f"\n{name} " in out
    for group in GROUPS:
        assert f"# analytic: {group}" in out


def test_synth_writes_an_analytic_depth_line_with_a_gain_step(tmp_path, capsys):
    from clinometry.io import read_section

    out = tmp_path / "pair.sgy"
    rc = main(["synth", "--scenario", "mound_pair_narrow", "--out", str(out), "--domain", "depth",
               "--sample-interval", "2.5", "--gain-step", "200,3", "--no-noise"])
    assert rc == 0
    assert "4 margin(s)" in capsys.readouterr().out
    truth = json.loads((tmp_path / "pair.truth.json").read_text())
    assert truth["conditions"]["gain_step"]["trace"] == 200 and truth["conditions"]["gain_step"]["factor"] == 3.0
    assert [m["role"] for m in truth["margins"]] == ["outer", "saddle", "saddle", "outer"]
    with segyio.open(out, ignore_geometry=True) as f:
        # depth sample interval in thousandths of a metre (common practice, no source)
        assert f.bin[segyio.BinField.Interval] == 2500
    sec = read_section(out, domain="depth")
    np.testing.assert_allclose(sec["z"].values[1] - sec["z"].values[0], 2.5)
    m = truth["margins"][0]
    assert m["break"]["z"] == m["break"]["depth_m"]  # depth domain: z is depth


def test_synth_bad_gain_step_exits_2(tmp_path, capsys):
    rc = main(["synth", "--scenario", "mound_single", "--out", str(tmp_path / "x.sgy"), "--gain-step", "3"])
    assert rc == 2
    assert "--gain-step must be TRACE,FACTOR" in capsys.readouterr().err
