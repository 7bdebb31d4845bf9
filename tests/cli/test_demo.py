"""Tests of ``clinometry demo``: finding or generating the synthetic inputs, and
an end-to-end run of the demo on generated inputs (as after a plain pip install)."""

import csv
import functools
import json
from pathlib import Path

import numpy as np
import pytest

from clinometry.cli import demo, main


@pytest.mark.requires_obspy
def test_generated_inputs_read_back_with_obspy_as_the_forward_model_made_them(tmp_path):
    obspy = pytest.importorskip("obspy")
    from clinometry.synth import SCENARIOS, make_line

    written = demo.generate_inputs(tmp_path, scenarios=["gentle_ramp"], cube=False)
    assert [p.name for p in written] == ["gentle_ramp.sgy"]
    assert (tmp_path / "gentle_ramp.truth.json").is_file()
    section, _ = make_line("gentle_ramp", seed=list(SCENARIOS).index("gentle_ramp"))
    # ObsPy as an independent SEG-Y reader: same samples, trace by trace (IEEE float, exact)
    stream = obspy.read(str(written[0]), format="SEGY", unpack_trace_headers=False)
    data = np.stack([tr.data for tr in stream])
    np.testing.assert_array_equal(data, section.transpose("trace", "z").values.astype(np.float32))


def test_truth_velocities_come_from_each_truth_file(tmp_path):
    demo.generate_inputs(tmp_path, scenarios=["gentle_ramp", "rising_shelf"], cube=False)
    vel = demo.truth_velocities(tmp_path)
    stated = {p: json.loads((tmp_path / f"{Path(p).stem}.truth.json").read_text())["velocity"] for p in vel}
    assert vel[str(tmp_path / "gentle_ramp.sgy")] == {"velocity": stated[str(tmp_path / "gentle_ramp.sgy")]["v_m_s"]}
    lin = stated[str(tmp_path / "rising_shelf.sgy")]
    assert vel[str(tmp_path / "rising_shelf.sgy")] == {"velocity_linear": (lin["v0_m_s"], lin["k_per_s"])}


def test_demo_inputs_generated_into_out_inputs_when_not_bundled(tmp_path, monkeypatch):
    monkeypatch.setattr(demo, "bundled_inputs", lambda: None)
    monkeypatch.setattr(demo, "generate_inputs",
                        functools.partial(demo.generate_inputs, scenarios=["flat_basin"], cube=False))
    folder = demo.demo_inputs(tmp_path)
    assert folder == tmp_path / "inputs"
    assert sorted(p.name for p in folder.iterdir()) == ["flat_basin.sgy", "flat_basin.truth.json"]


def test_generated_inputs_are_the_bundled_files_byte_for_byte(tmp_path):
    bundle = demo.bundled_inputs()
    if bundle is None:
        pytest.skip("no bundled synthetic_volumes/ (installed package)")
    for name in ("gentle_ramp", "steep_margin"):  # one IEEE and one IBM-float line
        demo.generate_inputs(tmp_path, scenarios=[name], cube=False)
        assert (tmp_path / f"{name}.sgy").read_bytes() == (bundle / f"{name}.sgy").read_bytes()


def test_bundled_inputs_found_in_a_source_checkout():
    repo_bundle = Path(demo.__file__).resolve().parents[2] / demo.BUNDLE_DIR
    found = demo.bundled_inputs()
    if repo_bundle.is_dir() and any(p.suffix == ".sgy" for p in repo_bundle.iterdir()):
        assert found == repo_bundle
    else:
        assert found is None


def test_demo_end_to_end_on_generated_inputs(tmp_path, monkeypatch, capsys):
    # as after "pip install ." with no bundled folder: the inputs are generated first
    monkeypatch.setattr(demo, "bundled_inputs", lambda: None)
    gen = demo.generate_inputs
    monkeypatch.setattr(demo, "generate_inputs", lambda folder: gen(folder, scenarios=["rimmed_shelf"], cube=False))
    code = main(["demo", "--out", str(tmp_path), "--workers", "1", "--quiet", "--no-uncertainty"])
    out, err = capsys.readouterr()
    assert code == 0, err
    assert f"inputs: {tmp_path / 'inputs'}" in out
    doc = json.loads((tmp_path / "rimmed_shelf.json").read_text())
    truth = json.loads((tmp_path / "inputs" / "rimmed_shelf.truth.json").read_text())
    # the line was converted with the velocity the forward model states, not the package default
    assert doc["velocity"]["model"] == "constant" and not doc["velocity"].get("default_fallback")
    assert doc["velocity"]["velocity_m_s"] == truth["velocity"]["v_m_s"]
    with open(tmp_path / "margins.csv", newline="") as fh:
        rows = list(csv.DictReader(fh))
    assert [(r["stem"], r["direction"]) for r in rows] == [("rimmed_shelf", m["direction"]) for m in doc["margins"]]
    for name in ("rimmed_shelf.png", "rimmed_shelf.horizons.csv", "index.html"):
        assert (tmp_path / name).is_file()
    if rows:
        assert (tmp_path / "summary.png").is_file()
    assert 'href="rimmed_shelf.png"' in (tmp_path / "index.html").read_text()
