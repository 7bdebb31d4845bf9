"""Horizon rows for <stem>.horizons.csv."""

import numpy as np
import pytest

from clinometry.picking import HORIZON_COLUMNS, horizon_rows, pick
from clinometry.picking.picks import Horizon, Picks
from clinometry.section import make_section


def test_horizon_rows_columns_and_depth_from_constant_velocity():
    s = make_section(np.zeros((4, 10)), z=np.arange(10) * 4.0, x=[0, 30, 60, 90], y=[0, 40, 80, 120])
    picks = Picks(horizons=(Horizon(3, "clinoform", [1, 3], [8.0, 20.0], [0.5, 1.0]),))
    rows = horizon_rows(picks, s, 2500.0)
    assert list(rows[0]) == list(HORIZON_COLUMNS)
    # depth = v * t / 2 for two-way time (common practice, no source): 2500 * 0.008 / 2 = 10 m
    assert rows[0]["depth_m"] == pytest.approx(10.0)
    assert rows[1]["depth_m"] == pytest.approx(25.0)
    # distance along the line from the trace coordinates: 3-4-5 triangles of 50 m
    assert [r["distance_m"] for r in rows] == [50.0, 150.0]
    assert [(r["x"], r["y"]) for r in rows] == [(30.0, 40.0), (90.0, 120.0)]
    assert [r["horizon_id"] for r in rows] == [3, 3]


def test_horizon_rows_of_a_depth_section_keep_z_as_depth(make_test_line):
    section, _ = make_test_line("rimmed", domain="depth", dt_ms=2.0, n_samples=450, seed=1)
    picks = pick(section)
    rows = horizon_rows(picks, section, None)
    assert len(rows) == sum(len(h) for h in picks.horizons)
    np.testing.assert_allclose([r["depth_m"] for r in rows], [r["z"] for r in rows])
    assert {r["role"] for r in rows} >= {"margin_profile", "platform_top"}
