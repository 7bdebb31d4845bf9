"""The cited threshold table and its TOML override."""

import pytest

from clinometry.classify.thresholds import DEFAULT_THRESHOLDS, check_thresholds, default_thresholds, load_thresholds
from clinometry.errors import ThresholdsError


def test_every_threshold_names_its_source():
    for key, t in DEFAULT_THRESHOLDS.items():
        assert t.source and t.cite and t.unit, key
        # each value is either recalled from a publication or chosen here, and says which
        assert "from memory" in t.source or "chosen here" in t.source, key


def test_default_values_from_their_sources():
    t = default_thresholds()
    # Read (1985, AAPG Bull. 69: 1-21); Burchette & Wright (1992): ramps dip < ~1 deg (from
    # memory); the bound is twice that, so that slope uncertainty keeps a ramp a ramp (chosen here)
    assert t["ramp_max_slope_deg"] == 2.0
    # Kenter (1990, Sedimentology 37: 777-794): loose grain slopes stop near the
    # angle of repose, ~30 deg; mud-dominated flanks below ~15 deg; grain-dominated to ~35 deg (from memory)
    assert t["steep_min_slope_deg"] == 30.0
    assert t["fabric_mud_max_deg"] == 15.0
    assert t["fabric_grain_max_deg"] == 35.0
    # Widess (1973, Geophysics 38: 1176-1180): lambda/4 at 40 Hz, 3200 m/s = 3200 / 40 / 4 = 20 m (from memory)
    assert t["min_relief_m"] == pytest.approx(3200.0 / 40.0 / 4.0)


def test_toml_override_in_table(tmp_path):
    p = tmp_path / "mine.toml"
    p.write_text("[thresholds]\nramp_max_slope_deg = 0.5\nsteep_min_slope_deg = 35\n")
    t = load_thresholds(p)
    assert t["ramp_max_slope_deg"] == 0.5 and t["steep_min_slope_deg"] == 35.0
    assert t["fabric_mud_max_deg"] == default_thresholds()["fabric_mud_max_deg"]


def test_toml_override_top_level(tmp_path):
    p = tmp_path / "top.toml"
    p.write_text("min_relief_m = 30.0\n")
    assert load_thresholds(p)["min_relief_m"] == 30.0


def test_unknown_key_names_file_key_and_suggestion(tmp_path):
    p = tmp_path / "typo.toml"
    p.write_text("[thresholds]\nramp_max_slope = 0.5\n")
    with pytest.raises(ThresholdsError, match=r"typo.toml: unknown threshold 'ramp_max_slope' = 0.5; "
                                              r"did you mean 'ramp_max_slope_deg'"):
        load_thresholds(p)


@pytest.mark.parametrize("text,shown", [('steep_min_slope_deg = "steep"', "'steep'"),
                                        ("steep_min_slope_deg = true", "True")])
def test_wrong_type_names_file_key_and_value(tmp_path, text, shown):
    p = tmp_path / "types.toml"
    p.write_text(text + "\n")
    with pytest.raises(ThresholdsError, match=f"types.toml: threshold 'steep_min_slope_deg' must be a finite number .*{shown}"):
        load_thresholds(p)


def test_inconsistent_bounds_name_both(tmp_path):
    p = tmp_path / "order.toml"
    p.write_text("fabric_mud_max_deg = 40\n")
    with pytest.raises(ThresholdsError, match="order.toml: inconsistent bounds: fabric_mud_max_deg = 40.0 must be "
                                              "below fabric_grain_max_deg = 35.0"):
        load_thresholds(p)


def test_out_of_range_values(tmp_path):
    with pytest.raises(ThresholdsError, match="'ramp_max_slope_deg' = -1.0 must be > 0"):
        check_thresholds({"ramp_max_slope_deg": -1})
    with pytest.raises(ThresholdsError, match="'secondary_weight' = 2.0 must be between 0 and 1"):
        check_thresholds({"secondary_weight": 2})


def test_invalid_toml_and_stray_keys(tmp_path):
    p = tmp_path / "broken.toml"
    p.write_text("ramp_max_slope_deg = \n")
    with pytest.raises(ThresholdsError, match="broken.toml: not valid TOML"):
        load_thresholds(p)
    q = tmp_path / "stray.toml"
    q.write_text("min_relief_m = 5\n[thresholds]\nramp_max_slope_deg = 0.5\n")
    with pytest.raises(ThresholdsError, match=r"stray.toml: keys \['min_relief_m'\] are outside"):
        load_thresholds(q)
