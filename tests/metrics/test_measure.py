"""measure_picks(): plugin dispatch, merging, velocity record and errors."""

import numpy as np
import pytest

from clinometry.depth import ConstantVelocity
from clinometry.errors import GeometryError, PluginError, VelocityError
from clinometry.metrics import measure_margin, measure_picks
from clinometry.metrics.margin_geometry import margin_geometry
from clinometry.picking.picks import MarginPicks, PickPoint, Picks


def test_all_builtin_plugins_merge_into_one_record(build_margin, planar):
    clinos = [(planar(12.0, top_m=230.0, x_break=600.0, x_toe=1400.0), 24, 56),
              (planar(12.0, top_m=200.0, x_break=1000.0, x_toe=1800.0), 40, 72)]
    picks, section = build_margin(planar(12.0), clinoforms=clinos)
    m = measure_picks(picks, section, uncertainty=False)
    mm = m.margins[0]
    # a planar foreset is planar (Adams & Schlager 2000, J. Sed. Res. 70: 814-828)
    assert mm.values["profile_shape"] == "planar"
    assert mm.values["slope_max_deg"] == pytest.approx(12.0)
    # breaks rise 30 m over 400 m: atan(30 / 400) = 4.289 deg (by hand)
    assert mm.trajectory["angle_deg"] == pytest.approx(np.degrees(np.arctan(30.0 / 400.0)))
    assert len(mm.clinoforms) == 2
    assert "clinoforms" not in mm.values and "missing" not in mm.values
    assert m.velocity["model"] == "none"


def test_selected_plugin_only(build_margin, planar):
    picks, section = build_margin(planar(12.0))
    mm = measure_picks(picks, section, metrics=["shape"], uncertainty=False).margins[0]
    assert mm.values["profile_shape"] == "planar"
    assert "slope_max_deg" not in mm.values


def test_twt_section_records_velocity_model(build_margin, planar):
    vel = ConstantVelocity(2700.0)
    picks, section = build_margin(planar(12.0), velocity=vel)
    m = measure_picks(picks, section, velocity=vel, uncertainty=False)
    assert m.velocity == vel.to_dict()
    assert m.margins[0].values["slope_max_deg"] == pytest.approx(12.0)


def test_twt_section_without_velocity_names_section(build_margin, planar):
    picks, section = build_margin(planar(12.0), velocity=ConstantVelocity(2500.0))
    with pytest.raises(VelocityError, match="test_line.sgy"):
        measure_picks(picks, section)


def test_unknown_plugin_lists_installed(build_margin, planar):
    picks, section = build_margin(planar(12.0))
    with pytest.raises(PluginError, match="installed: .*slope"):
        measure_picks(picks, section, metrics=["no_such_metric"])


def test_failing_plugin_is_named(build_margin, planar):
    picks, section = build_margin(planar(12.0))
    g = margin_geometry(picks, picks.margins[0], section)

    def broken(geometry):
        """A plugin that fails."""
        raise ZeroDivisionError("boom")

    with pytest.raises(PluginError, match="'broken'.*ZeroDivisionError: boom"):
        measure_margin(g, plugins={"broken": broken})


def test_custom_plugin_values_are_merged(build_margin, planar):
    picks, section = build_margin(planar(12.0))
    g = margin_geometry(picks, picks.margins[0], section)

    def width_km(geometry, *, scale=1000.0):
        """Foreset width in km."""
        p = geometry.profile
        return {"foreset_width_km": (p.toe["basinward_m"] - p.shelf_break["basinward_m"]) / scale}

    mm = measure_margin(g, plugins={"w": width_km}, options={"w": {"scale": 1000.0}})
    assert mm.values == {"foreset_width_km": pytest.approx(1.0)}


def test_picks_off_the_section_name_the_problem(build_margin, planar):
    picks, section = build_margin(planar(12.0))
    bad = MarginPicks("+", 0, 0, PickPoint(500, 200.0), None)
    with pytest.raises(GeometryError, match="trace 500 is outside"):
        measure_picks(Picks(horizons=picks.horizons, margins=(bad,)), section)
    with pytest.raises(GeometryError, match="horizon 99"):
        measure_picks(Picks(horizons=picks.horizons, margins=(MarginPicks("+", 99, None, None, None),)), section)


def test_plugin_options_reach_the_plugin(build_margin, planar):
    # breaks rise 50 m over 500 m: atan(0.1) = 5.71 deg (by hand); with 0.5 m depth samples
    # the P10-P90 range is a fraction of a degree wide, so it lies above the default flat
    # band of +-2 deg (ascending) and within a +-10 deg band passed to the trajectory plugin (flat)
    clinos = [(planar(12.0, top_m=250.0, x_break=500.0, x_toe=1300.0), 20, 52),
              (planar(12.0, top_m=200.0, x_break=1000.0, x_toe=1800.0), 40, 72)]
    picks, section = build_margin(planar(12.0), clinoforms=clinos, dz=0.5)
    default = measure_picks(picks, section, metrics=["trajectory"], uncertainty=False).margins[0].trajectory
    wide = measure_picks(picks, section, metrics=["trajectory"], uncertainty=False,
                   metric_options={"trajectory": {"flat_deg": 10.0}}).margins[0].trajectory
    assert default["angle_deg"] == pytest.approx(np.degrees(np.arctan(0.1)))
    assert (default["class"], wide["class"]) == ("ascending", "flat")
