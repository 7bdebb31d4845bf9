"""GeoJSON of margin breaks and toes, read back with a general-purpose geometry library (shapely).

Checks against outside sources: RFC 7946 (Butler et al. 2016: the GeoJSON format; section 3.3
FeatureCollection, 3.1.2 Point, 3.1.4 LineString, section 4 WGS 84 longitude then latitude) and the
worked example of the Popular Visualisation Pseudo Mercator method in IOGP Geomatics Guidance Note 7
part 2 (EPSG method 1024, CRS EPSG:3857): 24°22'54.433"N, 100°20'00.000"W <-> E -11169055.58 m,
N 2800000.00 m.  The margins are hand-built rows; no picker number is pinned.
"""

import json

import pytest

from clinometry.errors import ClinometryError
from clinometry.report.geojson import margin_features, write_margins_geojson

shapely_geometry = pytest.importorskip("shapely.geometry")


def _row(line, x, family="rimmed_shelf", direction="+", review="", **kw):
    r = {"file": "/data/cube.sgy", "line": line, "stem": f"cube_{line}", "direction": direction, "family": family,
         "confidence": 0.8, "slope_max_deg": 21.44, "relief_m": 301.6, "break_x": x, "break_y": 5000.0 + x / 10,
         "break_depth_m": 150.0, "toe_x": x + 800.0, "toe_y": 5000.0 + x / 10, "toe_depth_m": 450.0,
         "review_status": review}
    r.update(kw)
    return r


def _read(path):
    with open(path, encoding="utf-8") as fh:
        return json.load(fh)


def test_3d_trend_is_one_linestring_per_margin_in_line_order_and_2d_lines_are_points(tmp_path):
    rows = [_row("inline 12", 1200.0, review="accepted"), _row("inline 10", 1000.0, review="accepted"),
            _row("inline 11", 1100.0, family="steep_margin", review="accepted"),
            _row("", 300.0, file="/data/line_a.sgy", family="ramp", review="rejected", note="a fold")]
    path = write_margins_geojson(rows, tmp_path)
    assert path.name == "margins_projected.geojson"
    fc = _read(path)
    assert fc["type"] == "FeatureCollection"  # RFC 7946 section 3.3
    shapes = [(shapely_geometry.shape(f["geometry"]), f["properties"]) for f in fc["features"]]
    lines = [(g, p) for g, p in shapes if g.geom_type == "LineString"]
    points = [(g, p) for g, p in shapes if g.geom_type == "Point"]
    assert sorted(p["feature"] for _, p in lines) == ["shelf_break_trend", "toe_of_slope_trend"]
    brk = next((g, p) for g, p in lines if p["feature"] == "shelf_break_trend")
    assert [c[0] for c in brk[0].coords] == [1000.0, 1100.0, 1200.0]  # ordered along the survey
    props = brk[1]
    assert (props["family"], props["n_lines"], props["review"]) == ("rimmed_shelf", 3, "accepted")
    assert (props["confidence"], props["slope_max_deg"], props["relief_m"]) == (0.8, 21.4, 302)
    assert [v["line"] for v in props["vertices"]] == ["inline 10", "inline 11", "inline 12"]
    assert [v["x"] for v in props["vertices"]] == [1000.0, 1100.0, 1200.0]  # projected x kept
    assert sorted(p["feature"] for _, p in points) == ["shelf_break", "toe_of_slope"]
    pt = next(p for _, p in points if p["feature"] == "shelf_break")
    assert (pt["family"], pt["review"], pt["note"], pt["file"]) == ("ramp", "rejected", "a fold", "line_a.sgy")


def test_without_crs_the_file_says_plainly_it_is_projected_and_not_rfc7946(tmp_path):
    fc = _read(write_margins_geojson([_row("", 1000.0)], tmp_path))
    about = fc["clinometry"]
    assert about["rfc7946"] is False
    assert "projected survey x, y" in about["coordinates"] and "not RFC 7946" in about["note"]
    assert "--crs EPSG:NNNN" in about["note"]
    assert fc["features"][0]["geometry"]["coordinates"] == [1000.0, 5100.0]


def test_crs_transforms_to_wgs84_lon_lat_checked_against_the_published_example(tmp_path):
    pytest.importorskip("pyproj")
    # IOGP GN 7-2, Popular Visualisation Pseudo Mercator example (EPSG:3857):
    # E -11169055.58 m, N 2800000.00 m  <->  100°20'00.000"W, 24°22'54.433"N
    row = _row("", -11169055.58, break_y=2800000.00, toe_x=None, toe_y=None)
    path = write_margins_geojson([row], tmp_path, crs="EPSG:3857")
    assert path.name == "margins.geojson"
    fc = _read(path)
    assert fc["clinometry"]["rfc7946"] is True and fc["clinometry"]["source_crs"] == "EPSG:3857"
    assert "crs" not in fc  # RFC 7946 section 4: no "crs" member; WGS 84 is implied
    (feature,) = fc["features"]
    point = shapely_geometry.shape(feature["geometry"])
    lon_expected = -(100 + 20 / 60 + 0.0 / 3600)
    lat_expected = 24 + 22 / 60 + 54.433 / 3600
    # RFC 7946 section 3.1.1: longitude first, then latitude; 1e-7 deg is about 1 cm, within the 0.01 m rounding
    assert point.x == pytest.approx(lon_expected, abs=1e-7)
    assert point.y == pytest.approx(lat_expected, abs=1e-7)
    assert (feature["properties"]["x"], feature["properties"]["y"]) == (-11169055.58, 2800000.0)  # kept


def test_a_geographic_or_unknown_crs_is_refused():
    pytest.importorskip("pyproj")
    with pytest.raises(ClinometryError, match=r"--crs EPSG:4326 \(WGS 84\) is not a projected CRS"):
        margin_features([_row("", 1.0)], crs="EPSG:4326")
    with pytest.raises(ClinometryError, match=r"--crs EPSG:99999999: not a coordinate reference system"):
        margin_features([_row("", 1.0)], crs="EPSG:99999999")


def test_missing_pyproj_is_a_clear_error(monkeypatch):
    import builtins

    real = builtins.__import__

    def no_pyproj(name, *args, **kwargs):
        if name == "pyproj":
            raise ImportError("No module named 'pyproj'")
        return real(name, *args, **kwargs)

    monkeypatch.setattr(builtins, "__import__", no_pyproj)
    with pytest.raises(ClinometryError, match=r"--crs needs pyproj .* pip install 'clinometry\[gis\]'"):
        margin_features([_row("", 1.0)], crs="EPSG:32631")


def test_rows_without_coordinates_write_nothing(tmp_path):
    row = _row("", 1.0, break_x=None, toe_x=None)
    assert write_margins_geojson([row], tmp_path) is None
    assert list(tmp_path.iterdir()) == []
