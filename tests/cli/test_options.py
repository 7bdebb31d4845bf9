"""Shared CLI analysis options: velocity parsing, exclusivity, help text with units, the options object."""

import argparse
import re

import numpy as np
import pytest
from numpy.testing import assert_allclose

from clinometry.cli._options import add_velocity_options, velocity_from_args
from clinometry.depth import DEFAULT_VELOCITY_M_S
from clinometry.errors import VelocityError
from clinometry.section import make_section


def _parser():
    return add_velocity_options(argparse.ArgumentParser(prog="clinometry analyze"))


def test_velocity_option_builds_a_constant_model():
    args = _parser().parse_args(["--velocity", "2800"])
    m = velocity_from_args(args)
    assert m.to_dict() == {"model": "constant", "velocity_m_s": 2800.0}
    assert_allclose(m.depth_m(1000.0), 1400.0)  # z = v t / 2 (common practice, no source)


def test_velocity_linear_takes_v0_and_k():
    args = _parser().parse_args(["--velocity-linear", "1800", "0.6"])
    assert args.velocity_linear == [1800.0, 0.6]
    m = velocity_from_args(args)
    # z(t) = (v0/k)(exp(k t/2) - 1) (Sheriff & Geldart 1995, from memory): t = 1 s -> 1166.196 m
    assert_allclose(m.depth_m(1000.0), 1800.0 / 0.6 * np.expm1(0.3), rtol=1e-12)


def test_no_option_falls_back_to_the_default_velocity():
    args = _parser().parse_args([])
    m = velocity_from_args(args, section=make_section(np.zeros((2, 3)), z=[0.0, 4.0, 8.0]))
    assert m.to_dict()["velocity_m_s"] == DEFAULT_VELOCITY_M_S
    assert "fallback" in m.to_dict()


def test_velocity_file_with_rms_kind(tmp_path):
    p = tmp_path / "v.csv"
    p.write_text("twt_ms,vrms_m_s\n1000,2000\n2000,2549.51\n")
    m = velocity_from_args(_parser().parse_args(["--velocity-file", str(p), "--velocity-kind", "rms"]))
    # Dix (1955): 2000 / 2549.5 m/s RMS at 1 s / 2 s -> 3000 m/s in the second layer
    assert_allclose(m.v_int_m_s, [2000.0, 3000.0], atol=0.1)


def test_depth_domain_gives_no_model():
    args = _parser().parse_args(["--domain", "depth"])
    assert args.domain == "depth"
    assert velocity_from_args(args) is None


def test_depth_domain_with_a_velocity_is_a_velocity_error():
    args = _parser().parse_args(["--domain", "depth", "--velocity", "2500"])
    with pytest.raises(VelocityError, match="is in depth, so velocity is not used"):
        velocity_from_args(args)


def test_negative_velocity_is_a_one_line_velocity_error():
    args = _parser().parse_args(["--velocity", "-2500"])
    with pytest.raises(VelocityError, match="-2500 m/s; velocities must be positive") as info:
        velocity_from_args(args)
    assert "\n" not in str(info.value)


@pytest.mark.parametrize(
    "argv",
    [
        ["--velocity", "2500", "--velocity-linear", "1800", "0.5"],
        ["--velocity", "2500", "--velocity-file", "v.csv"],
        ["--velocity-linear", "1800", "0.5", "--velocity-file", "v.csv"],
    ],
)
def test_velocity_options_are_mutually_exclusive(argv, capsys):
    with pytest.raises(SystemExit) as info:
        _parser().parse_args(argv)
    assert info.value.code == 2  # argparse usage error (common practice, no source)
    assert "not allowed with argument" in capsys.readouterr().err


def test_bad_choices_are_usage_errors(capsys):
    with pytest.raises(SystemExit) as info:
        _parser().parse_args(["--domain", "feet"])
    assert info.value.code == 2
    assert "invalid choice: 'feet'" in capsys.readouterr().err


def test_help_states_units_for_every_velocity_option(capsys):
    with pytest.raises(SystemExit) as info:
        _parser().parse_args(["--help"])
    assert info.value.code == 0
    out = " ".join(capsys.readouterr().out.split())
    assert "--velocity V constant velocity, m/s" in out
    assert "V0 in m/s at time zero, K in 1/s" in out
    assert "two-way time (ms) and velocity (m/s)" in out
    assert "two-way time in ms (twt) or depth in m (depth)" in out
    assert f"constant {DEFAULT_VELOCITY_M_S:g} m/s" in out


# -- through the command line (clinometry.cli.main) ----------------------------

def _tiny_line(tmp_path):
    """A small 2D SEG-Y line written with segyio: 30 traces, CDPs 200-229, 4 ms, 150 samples."""
    segyio = pytest.importorskip("segyio")
    p = tmp_path / "tiny_line.sgy"
    spec = segyio.spec()
    spec.format = 5  # IEEE float (SEG-Y rev 1 format code 5)
    spec.samples = list(range(150))
    spec.tracecount = 30
    with segyio.create(p, spec) as f:
        f.bin.update(hdt=4000, hns=150)
        for i in range(30):
            f.header[i] = {
                segyio.TraceField.CDP: 200 + i,
                segyio.TraceField.CDP_X: 25 * i,
                segyio.TraceField.CDP_Y: 0,
                segyio.TraceField.TRACE_SAMPLE_INTERVAL: 4000,
                segyio.TraceField.TRACE_SAMPLE_COUNT: 150,
            }
            trace = np.zeros(150, dtype=np.float32)
            trace[40 + i // 2] = 1.0
            f.trace[i] = trace
    return p


def _main(capsys, argv):
    from clinometry.cli import main

    code = main(argv)
    out, err = capsys.readouterr()
    return code, out, err


@pytest.mark.parametrize(
    "extra, expected",
    [
        (["--velocity", "-2500"], "velocity is -2500 m/s; velocities must be positive"),
        (["--velocity", "2.5"], "2.5 m/s, below the plausible 300 m/s for seismic"),
        (["--velocity-linear", "1800", "-0.5"], "gradient k = -0.5 1/s is negative"),
        (["--velocity-file", "{tmp}/nope.csv"], "nope.csv: velocity file not found"),
        (["--velocity-file", "{tmp}/unsorted.csv"], "unsorted.csv: velocity table is not monotonic in time: row 3"),
        (["--velocity-file", "{tmp}/falling.csv", "--velocity-kind", "rms"],
         "falling.csv: Dix inversion gives an imaginary interval velocity for the layer 1000-2000 ms"),
        (["--velocity-file", "{tmp}/other_line_vel.sgy"],
         "other_line_vel.sgy does not match tiny_line.sgy: CDP 200 \\(trace 0\\) has no velocity trace"),
        (["--domain", "depth", "--velocity", "2500"], "tiny_line.sgy is in depth, so velocity is not used"),
    ],
)
def test_bad_velocity_input_exits_2_with_one_line_naming_it(tmp_path, capsys, extra, expected):
    line = _tiny_line(tmp_path)
    (tmp_path / "unsorted.csv").write_text("0,2000\n1000,2500\n900,2600\n")
    (tmp_path / "falling.csv").write_text("1000,3000\n2000,2000\n")  # RMS falling too fast (Dix 1955)
    segyio = pytest.importorskip("segyio")
    spec = segyio.spec()
    spec.format, spec.samples, spec.tracecount = 5, list(range(10)), 2
    with segyio.create(tmp_path / "other_line_vel.sgy", spec) as f:
        f.bin.update(hdt=4000, hns=10)
        for i in range(2):
            f.header[i] = {segyio.TraceField.CDP: 900 + i, segyio.TraceField.CDP_X: 25 * i,
                           segyio.TraceField.TRACE_SAMPLE_INTERVAL: 4000, segyio.TraceField.TRACE_SAMPLE_COUNT: 10}
            f.trace[i] = np.full(10, 2500.0, dtype=np.float32)
    argv = ["analyze", str(line), *[a.format(tmp=tmp_path) for a in extra], "--out", str(tmp_path / "out")]
    code, out, err = _main(capsys, argv)
    assert code == 2
    assert out == ""
    assert err.count("\n") == 1 and err.startswith("clinometry: error: ")
    assert re.search(expected, err), err


def test_two_velocity_options_on_the_command_line_is_a_usage_error(tmp_path, capsys):
    line = _tiny_line(tmp_path)
    with pytest.raises(SystemExit) as info:
        _main(capsys, ["analyze", str(line), "--velocity", "2500", "--velocity-linear", "1800", "0.5", "--out", str(tmp_path)])
    assert info.value.code == 2
    assert "argument --velocity-linear: not allowed with argument --velocity" in capsys.readouterr().err
