"""Shelf breaks and toes of a batch as GeoJSON, for the rest of the team's maps.

Margins of a 3D volume become lines: the breaks (and, separately, the toes)
of one margin trend -- one file, one line direction, one basin side --
joined in line order along the survey, one ``LineString`` each.  Margins of
2D lines (and a trend seen on a single line) become ``Point`` features.
Every feature carries ``family``, ``confidence``, ``slope_max_deg``,
``relief_m`` and the ``review`` decision; a trend's ``LineString`` carries
the most common family and the medians, with every line's own values in
``vertices``.

Coordinates: with ``crs`` (the survey's projected coordinate reference
system, e.g. ``"EPSG:32631"``) the survey x/y are transformed to WGS 84
longitude and latitude with pyproj, as RFC 7946 (Butler et al. 2016,
section 4) requires, and written as ``margins.geojson``; the projected x/y
stay in the properties (``x``, ``y``).  Without it the file keeps the
projected x/y, is named ``margins_projected.geojson`` and says so plainly
in its ``clinometry`` member: it is GeoJSON-shaped but not RFC 7946.
"""

from __future__ import annotations

import json
import logging
import statistics
from collections import Counter
from pathlib import Path

from ..errors import ClinometryError
from .atomic import atomic_write

__all__ = ["GEOJSON_FILE", "PROJECTED_GEOJSON_FILE", "check_crs", "margin_features", "write_margins_geojson"]

logger = logging.getLogger(__name__)

#: RFC 7946 file (WGS 84 longitude/latitude), written with a CRS
GEOJSON_FILE = "margins.geojson"
#: the same features in projected survey coordinates, written without a CRS (not RFC 7946)
PROJECTED_GEOJSON_FILE = "margins_projected.geojson"

#: decimals of longitude and latitude: 1e-7 deg is about 1 cm (RFC 7946 section 11.2 finds 6 enough)
_LONLAT_DECIMALS = 7
_POINTS = (("break", "shelf_break"), ("toe", "toe_of_slope"))


def _pyproj():
    try:
        import pyproj
    except ImportError as err:
        raise ClinometryError("--crs needs pyproj to transform the survey coordinates to WGS 84; install it with "
                              "pip install 'clinometry[gis]' (or leave out --crs for projected coordinates)") from err
    return pyproj


def check_crs(crs):
    """The transformer from ``crs`` (projected) to WGS 84 longitude/latitude; refuses a CRS that cannot work.

    Parameters
    ----------
    crs : str
        Anything :meth:`pyproj.CRS.from_user_input` reads, e.g. ``"EPSG:32631"``.

    Returns
    -------
    pyproj.Transformer
        ``always_xy=True``: (x, y) in, (longitude, latitude) out.

    Raises
    ------
    ClinometryError
        pyproj is missing, the CRS is unknown, or it is not a projected CRS
        (survey x/y are projected coordinates).
    """
    pyproj = _pyproj()
    try:
        source = pyproj.CRS.from_user_input(crs)
    except pyproj.exceptions.CRSError as err:
        raise ClinometryError(f"--crs {crs}: not a coordinate reference system pyproj knows ({err}); give the "
                              "survey's projected CRS as EPSG:NNNN") from err
    if not source.is_projected:
        raise ClinometryError(f"--crs {crs} ({source.name}) is not a projected CRS; survey x/y are projected "
                              "coordinates: give the survey's projected CRS, e.g. a UTM zone as EPSG:326NN")
    return pyproj.Transformer.from_crs(source, "EPSG:4326", always_xy=True)


def _num(v):
    if v is None or v == "":
        return None
    try:
        f = float(v)
    except (TypeError, ValueError):
        return None
    return f if f == f and abs(f) != float("inf") else None


def _line_number(label):
    parts = str(label or "").split()
    if len(parts) == 2 and parts[0] in ("inline", "crossline") and parts[1].lstrip("-").isdigit():
        return parts[0], int(parts[1])
    return None


def _review(r):
    return r.get("review_status") or "not reviewed"


def _point_properties(r, which):
    name = str(r.get("file") or "").replace("\\", "/").rsplit("/", 1)[-1]
    return {
        "feature": "shelf_break" if which == "break" else "toe_of_slope",
        "file": name,
        "line": r.get("line") or "",
        "stem": r.get("stem") or "",
        "direction": r.get("direction"),
        "family": r.get("family"),
        "subtype": r.get("subtype"),
        "confidence": _round(r.get("confidence"), 2),
        "slope_max_deg": _round(r.get("slope_max_deg"), 1),
        "slope_mean_deg": _round(r.get("slope_mean_deg"), 1),
        "relief_m": _round(r.get("relief_m"), 0),
        "depth_m": _round(r.get(f"{which}_depth_m"), 0),
        "x": _round(r.get(f"{which}_x"), 2),
        "y": _round(r.get(f"{which}_y"), 2),
        "review": _review(r),
        "note": r.get("note") or "",
        "default_velocity": r.get("default_velocity") == "yes",
    }


def _round(v, n):
    f = _num(v)
    if f is None:
        return None
    return int(round(f)) if n == 0 else round(f, n)


def _median(values, n):
    vals = [v for v in (_num(x) for x in values) if v is not None]
    return _round(statistics.median(vals), n) if vals else None


def _trend_properties(vertices, which):
    fams = Counter(v["family"] for v in vertices)
    reviews = Counter(v["review"] for v in vertices)
    lines = [v["line"] for v in vertices]
    return {
        "feature": "shelf_break_trend" if which == "break" else "toe_of_slope_trend",
        "file": vertices[0]["file"],
        "lines": f"{lines[0]} to {lines[-1]}",
        "n_lines": len(vertices),
        "direction": vertices[0]["direction"],
        "family": fams.most_common(1)[0][0],
        "families": dict(fams),
        "confidence": _median([v["confidence"] for v in vertices], 2),
        "slope_max_deg": _median([v["slope_max_deg"] for v in vertices], 1),
        "relief_m": _median([v["relief_m"] for v in vertices], 0),
        "review": next(iter(reviews)) if len(reviews) == 1 else ", ".join(f"{n} {k}" for k, n in reviews.items()),
        "vertices": vertices,
    }


def margin_features(rows, *, crs=None) -> dict:
    """The breaks and toes of margin rows as a GeoJSON FeatureCollection (a dict).

    Parameters
    ----------
    rows : list of dict
        Rows of the margins table (:func:`clinometry.report.tables.margin_rows`),
        optionally with their review (:func:`clinometry.report.review.apply_review`).
    crs : str, optional
        The survey's projected CRS (e.g. ``"EPSG:32631"``): coordinates are
        then WGS 84 longitude, latitude (RFC 7946).  Without it they stay
        projected survey x/y.

    Returns
    -------
    dict
        ``{"type": "FeatureCollection", "features": [...], "clinometry": {...}}``;
        breaks and toes without x/y are left out.

    Examples
    --------
    >>> rows = [{"file": "a.sgy", "line": "", "direction": "+", "family": "ramp", "confidence": 0.81,
    ...          "break_x": 1000.0, "break_y": 2000.0, "slope_max_deg": 0.9, "relief_m": 60.0}]
    >>> fc = margin_features(rows)
    >>> f = fc["features"][0]
    >>> f["geometry"], f["properties"]["family"], f["properties"]["review"]
    ({'type': 'Point', 'coordinates': [1000.0, 2000.0]}, 'ramp', 'not reviewed')
    """
    transform = check_crs(crs) if crs is not None else None

    def coords(x, y):
        if transform is None:
            return [round(x, 2), round(y, 2)]
        lon, lat = transform.transform(x, y)
        return [round(lon, _LONLAT_DECIMALS), round(lat, _LONLAT_DECIMALS)]

    features, trends = [], {}
    for r in rows:
        ln = _line_number(r.get("line"))
        for which, _ in _POINTS:
            x, y = _num(r.get(f"{which}_x")), _num(r.get(f"{which}_y"))
            if x is None or y is None:
                continue
            props = _point_properties(r, which)
            if ln is None:
                features.append({"type": "Feature", "geometry": {"type": "Point", "coordinates": coords(x, y)},
                                 "properties": props})
            else:
                key = (props["file"], ln[0], props["direction"], which)
                trends.setdefault(key, []).append((ln[1], x, y, props))
    for (_, _, _, which), pts in trends.items():
        pts.sort(key=lambda p: p[0])
        # a second margin with the same basin side on one line starts a trend of its own
        runs = {}
        for p in pts:
            runs.setdefault(_nth(pts, p), []).append(p)
        for run in runs.values():
            if not run:
                continue
            if len(run) == 1:
                _, x, y, props = run[0]
                features.append({"type": "Feature", "geometry": {"type": "Point", "coordinates": coords(x, y)},
                                 "properties": props})
                continue
            verts = [p[3] for p in run]
            features.append({"type": "Feature",
                             "geometry": {"type": "LineString", "coordinates": [coords(p[1], p[2]) for p in run]},
                             "properties": _trend_properties(verts, which)})
    if transform is None:
        about = {"coordinates": "projected survey x, y from the SEG-Y trace headers, in the survey's units "
                                "(usually metres); their coordinate reference system was not given",
                 "rfc7946": False,
                 "note": "not RFC 7946 GeoJSON, which requires WGS 84 longitude and latitude: rerun with "
                         "--crs EPSG:NNNN (the survey's projected CRS) to get margins.geojson"}
    else:
        about = {"coordinates": "WGS 84 longitude, latitude (RFC 7946), transformed with pyproj from the survey's "
                                f"projected x, y in {crs}; the projected x, y are in each feature's properties",
                 "rfc7946": True, "source_crs": str(crs)}
    about["caution"] = ("automatic picks: check each margin against its QC figure before use; see the review "
                        "decision of each feature")
    return {"type": "FeatureCollection", "features": features, "clinometry": about}


def _nth(pts, p):
    """Which margin of its line ``p`` is (0 first, by break x) among those of the same basin side."""
    same = [q for q in pts if q[0] == p[0]]
    same.sort(key=lambda q: (q[1], q[2]))
    return next(i for i, q in enumerate(same) if q is p)


def write_margins_geojson(rows, out_dir, *, crs=None):
    """Write the GeoJSON of a batch's margins into ``out_dir``; see :func:`margin_features`.

    Returns
    -------
    pathlib.Path or None
        ``margins.geojson`` with a CRS, ``margins_projected.geojson``
        without; None (nothing written) when no break or toe has x/y.
    """
    fc = margin_features(rows, crs=crs)
    if not fc["features"]:
        return None
    name = GEOJSON_FILE if crs is not None else PROJECTED_GEOJSON_FILE
    return atomic_write(Path(out_dir) / name, json.dumps(fc, indent=1, allow_nan=False) + "\n")
