"""Reading an interpreter's horizon CSV and matching it to the section.

The section's traces sit at x = 100 + 12.5 * trace, y = 50 (m), so the
expected trace of any x/y point can be read off its coordinates.
"""

import numpy as np
import numpy.testing as npt
import pytest

from clinometry.errors import HorizonFileError
from clinometry.user_horizons import read_horizon_csv
from clinometry.section import make_section

N_TRACE = 40
SPACING_M = 12.5


@pytest.fixture
def section():
    x = 100.0 + SPACING_M * np.arange(N_TRACE)
    return make_section(np.zeros((N_TRACE, 51), np.float32), z=np.arange(51) * 4.0, x=x, y=np.full(N_TRACE, 50.0),
                        attrs={"source_path": "line_a.sgy"})


def _write(tmp_path, text, name="picks.csv"):
    p = tmp_path / name
    p.write_text(text)
    return p


def test_trace_column_read_sorted(tmp_path, section):
    p = _write(tmp_path, "trace,z\n5,100\n3,80\n4,90\n")
    h = read_horizon_csv(p, section)
    npt.assert_array_equal(h.trace, [3, 4, 5])
    npt.assert_allclose(h.z, [80.0, 90.0, 100.0])
    assert h.role == "user"


def test_xy_points_map_to_nearest_trace(tmp_path, section):
    # trace k sits at x = 100 + 12.5 k: x = 162.0 -> k = 4.96 -> trace 5; 226 -> 10.08 -> 10
    p = _write(tmp_path, "x,y,z\n162.0,51.0,120\n226.0,49.0,150\n100.0,50.0,60\n")
    h = read_horizon_csv(p, section)
    npt.assert_array_equal(h.trace, [0, 5, 10])
    npt.assert_allclose(h.z, [60.0, 120.0, 150.0])


def test_points_on_same_trace_are_averaged_and_gaps_skipped(tmp_path, section):
    p = _write(tmp_path, "trace,z,name\n2,100,a\n2,110,b\n3,,gap\n4,120,c\n6,130,d\n")
    h = read_horizon_csv(p, section)
    npt.assert_array_equal(h.trace, [2, 4, 6])
    npt.assert_allclose(h.z, [105.0, 120.0, 130.0])


def test_xy_point_off_line_is_refused_naming_row(tmp_path, section):
    # one trace spacing (12.5 m) allowed; (150, 80) is 30 m off the line
    p = _write(tmp_path, "x,y,z\n100,50,60\n150,80,70\n")
    with pytest.raises(HorizonFileError, match=r"picks.csv: row 3, columns 'x','y': point \(150, 80\) is 30.0 m"):
        read_horizon_csv(p, section)


def test_non_number_names_file_row_column(tmp_path, section):
    p = _write(tmp_path, "trace,z\n1,100\n2,abc\n")
    with pytest.raises(HorizonFileError, match=r"picks.csv: row 3, column 'z': 'abc' is not a number"):
        read_horizon_csv(p, section)


def test_trace_outside_section_is_refused(tmp_path, section):
    p = _write(tmp_path, "trace,z\n1,100\n40,100\n")
    with pytest.raises(HorizonFileError, match=r"row 3, column 'trace': '40' is not a trace index 0..39"):
        read_horizon_csv(p, section)


def test_z_outside_range_hints_at_domain(tmp_path, section):
    # section z runs 0..200 ms; 1500 looks like a depth in m
    p = _write(tmp_path, "trace,z\n1,1500\n")
    with pytest.raises(HorizonFileError, match=r"row 2, column 'z': 1500 ms is outside .*0..200 ms; is the horizon in the same domain"):
        read_horizon_csv(p, section)


def test_missing_columns_listed(tmp_path, section):
    p = _write(tmp_path, "cdp,time\n1,100\n", name="bad_cols.csv")
    with pytest.raises(HorizonFileError, match=r"bad_cols.csv: no column 'z' \(columns seen: cdp, time\)"):
        read_horizon_csv(p, section)
    p = _write(tmp_path, "x,z\n1,100\n", name="half_xy.csv")
    with pytest.raises(HorizonFileError, match=r"half_xy.csv: needs a column 'trace' or both 'x' and 'y'"):
        read_horizon_csv(p, section)


def test_too_few_points_and_missing_file(tmp_path, section):
    p = _write(tmp_path, "trace,z\n1,100\n1,104\n2,100\n")
    with pytest.raises(HorizonFileError, match=r"picks.csv: only 2 distinct traces"):
        read_horizon_csv(p, section)
    with pytest.raises(HorizonFileError, match=r"nope.csv: horizon file not found"):
        read_horizon_csv(tmp_path / "nope.csv", section)


def test_header_case_and_bom_tolerated(tmp_path, section):
    # Excel writes a UTF-8 byte-order mark (U+FEFF) before the header: common practice, no source
    p = tmp_path / "bom.csv"
    p.write_bytes("\ufeffTrace,Z\n1,10\n2,20\n3,30\n".encode("utf-8"))
    h = read_horizon_csv(p, section)
    npt.assert_array_equal(h.trace, [1, 2, 3])
