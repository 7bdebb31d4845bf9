"""velocity_from_options and velocity table files."""

import numpy as np
import pytest
from numpy.testing import assert_allclose

from clinometry.depth import (
    DEFAULT_VELOCITY_M_S,
    DEFAULT_VELOCITY_NOTE,
    ConstantVelocity,
    LinearVelocity,
    TableVelocity,
    is_segy_file,
    read_velocity_table,
    velocity_from_options,
)
from clinometry.errors import VelocityError
from clinometry.section import make_section


def _section(domain="twt", name="line_e.sgy"):
    return make_section(np.zeros((3, 4)), z=[0.0, 4.0, 8.0, 12.0], domain=domain, attrs={"source_path": name})


def test_constant_and_linear_options_build_those_models():
    m = velocity_from_options(velocity=2800)
    assert isinstance(m, ConstantVelocity)
    assert_allclose(m.depth_m(1000.0), 1400.0)  # z = v t / 2 (common practice, no source)
    lin = velocity_from_options(velocity_linear=[1800, 0.6])
    assert isinstance(lin, LinearVelocity) and lin.to_dict() == {"model": "linear", "v0_m_s": 1800.0, "k_per_s": 0.6}


def test_no_option_on_twt_gives_the_default_with_a_fallback_note():
    m = velocity_from_options(section=_section())
    assert m.to_dict() == {"model": "constant", "velocity_m_s": DEFAULT_VELOCITY_M_S, "fallback": DEFAULT_VELOCITY_NOTE}
    assert m.fallback == DEFAULT_VELOCITY_NOTE
    assert velocity_from_options(velocity=2800).fallback is None


def test_depth_domain_needs_no_velocity_and_refuses_one():
    assert velocity_from_options(section=_section("depth")) is None
    with pytest.raises(VelocityError, match="line_e.sgy is in depth, so velocity is not used"):
        velocity_from_options(velocity=2500, section=_section("depth"))


def test_domain_contradicting_the_section_is_refused():
    with pytest.raises(VelocityError, match="line_e.sgy: domain 'depth' was given but the section is in 'twt'"):
        velocity_from_options(domain="depth", section=_section())


def test_two_options_at_once_are_refused():
    with pytest.raises(VelocityError, match="give only one velocity option, got velocity and velocity_linear"):
        velocity_from_options(velocity=2500, velocity_linear=(1800, 0.5))


@pytest.mark.parametrize(
    "kwargs, match",
    [
        ({"velocity": "fast"}, "velocity must be a number in m/s, got 'fast'"),
        ({"velocity": -2000}, "-2000 m/s; velocities must be positive"),
        ({"velocity_linear": (1800,)}, "velocity_linear needs two numbers"),
        ({"velocity_kind": "rms"}, "applies to a velocity file only"),
        ({"domain": "feet"}, "domain must be one of"),
    ],
)
def test_nonsense_options_raise_velocity_error(kwargs, match):
    with pytest.raises(VelocityError, match=match):
        velocity_from_options(**kwargs)


def test_interval_table_file_with_header_comments_and_semicolons(tmp_path):
    p = tmp_path / "vint.txt"
    p.write_text("# interval velocities\ntwt_ms; v_m_s\n1000; 2000\n\n2000; 3000  # deeper\n")
    m = velocity_from_options(velocity_file=p)
    assert isinstance(m, TableVelocity)
    # layers of 2000 and 3000 m/s, 1 s each: z = 1000 m + 1500 m (z = v t / 2 per layer)
    assert_allclose(m.depth_m([1000.0, 2000.0]), [1000.0, 2500.0])
    assert m.to_dict()["source"] == "vint.txt"


def test_rms_table_file_is_dix_inverted(tmp_path):
    p = tmp_path / "vrms.csv"
    p.write_text("1000,2000\n2000,2549.51\n")
    m = velocity_from_options(velocity_file=p, velocity_kind="rms")
    # Dix (1955): RMS 2549.5 m/s at 2 s over a 2000 m/s first layer -> 3000 m/s
    assert_allclose(m.v_int_m_s, [2000.0, 3000.0], atol=0.1)


@pytest.mark.parametrize(
    "text, match",
    [
        ("0,2000\n1000,2500,7\n", "bad.csv line 2: expected 2 columns"),
        ("0,2000\n1000,fast\n", "bad.csv line 2: '1000,fast' is not two numbers"),
        ("# nothing here\n", "bad.csv: no velocity rows found"),
        ("0,2000\n1000,2500\n800,2600\n", "bad.csv: velocity table is not monotonic in time: row 3 has 800 ms"),
        ("0,2.0\n1000,2.5\n", r"bad.csv: interval velocity \(value 1\) is 2 m/s, below the plausible 300 m/s"),
    ],
)
def test_bad_table_files_name_file_and_line(tmp_path, text, match):
    p = tmp_path / "bad.csv"
    p.write_text(text)
    with pytest.raises(VelocityError, match=match):
        read_velocity_table(p)


def test_missing_velocity_file_is_named(tmp_path):
    with pytest.raises(VelocityError, match="nope.csv: velocity file not found"):
        velocity_from_options(velocity_file=tmp_path / "nope.csv")


def test_segy_velocity_file_needs_the_section(tmp_path):
    p = tmp_path / "vel.sgy"
    p.write_bytes(b"\x00" * 3600)
    with pytest.raises(VelocityError, match="vel.sgy: a velocity SEG-Y is matched trace by trace"):
        velocity_from_options(velocity_file=p)


def test_file_kind_sniffing_by_suffix_and_content(tmp_path):
    # SEG-Y rev 1: 3200-byte textual header then a 400-byte binary header (SEG-Y rev 1 standard, 2002)
    text = tmp_path / "velocities"
    text.write_text("0 1500\n1000 2500\n")
    binary = tmp_path / "volume"
    binary.write_bytes(b"C 1 " + b" " * 3196 + b"\x00\x01" * 200)
    assert not is_segy_file(text)
    assert is_segy_file(binary)
    assert is_segy_file(tmp_path / "x.SGY") and not is_segy_file(tmp_path / "x.csv")
