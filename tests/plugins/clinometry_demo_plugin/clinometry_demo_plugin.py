"""Third-party plugins for clinometry, installed by the test suite.

``classify_by_slope`` classifies a margin by its maximum foreset slope
alone, with the declivity bands below; ``break_to_toe_km`` is an extra
metric (it runs only when named); ``classify_by_colour`` wants an option
clinometry never passes to a classifier, so clinometry refuses it.  They
show how an outside package registers plugins in the ``clinometry.*``
entry-point groups (see pyproject.toml), importing only the public
``clinometry.plugins`` module.
"""

from clinometry.plugins import Classification

#: upper slope bounds per family, degrees.  Ramps dip "less than 1 degree"
#: and rimmed-shelf slopes reach a few tens of degrees: Schlager (2005),
#: Carbonate Sedimentology and Sequence Stratigraphy, SEPM Concepts 8
#: (from memory); the 10 degree boundary is the demo's own choice.
SLOPE_BANDS_DEG = (("ramp", 1.0), ("rimmed_shelf", 10.0), ("steep_margin", 90.0))


def classify_by_slope(metrics, *, thresholds=None, ramp_max_deg=SLOPE_BANDS_DEG[0][1],
                      steep_min_deg=SLOPE_BANDS_DEG[1][1]):
    """Family from the maximum foreset slope only (demo plugin).

    ``metrics`` is the flat mapping of named values that
    :func:`clinometry.classify.classify` hands to every classifier;
    ``thresholds`` is the run's threshold table, which this demo does not use.
    """
    slope = metrics.get("slope_max_deg")
    if slope is None:
        return Classification(family=None, confidence=0.0, classifier="demo",
                              reasons=("slope_max_deg is missing; the demo classifier needs it",))
    if slope < ramp_max_deg:
        family, reason = "ramp", f"slope_max_deg {slope:.2f} < {ramp_max_deg:g}"
    elif slope < steep_min_deg:
        family, reason = "rimmed_shelf", f"{ramp_max_deg:g} <= slope_max_deg {slope:.2f} < {steep_min_deg:g}"
    else:
        family, reason = "steep_margin", f"slope_max_deg {slope:.2f} >= {steep_min_deg:g}"
    return Classification(family=family, confidence=0.5, reasons=(f"demo: {reason}",), classifier="demo",
                          thresholds={"ramp_max_deg": ramp_max_deg, "steep_min_deg": steep_min_deg})


def break_to_toe_km(geometry, *, scale_m=1000.0):
    """Horizontal break-to-toe distance of the margin profile, km (demo plugin)."""
    brk, toe = geometry.profile.shelf_break, geometry.profile.toe
    if brk is None or toe is None:
        return {"break_to_toe_km": None, "missing": {"break_to_toe_km": "break or toe not picked"}}
    return {"break_to_toe_km": (toe["basinward_m"] - brk["basinward_m"]) / scale_m}


def classify_by_colour(metrics, *, thresholds=None, colour):
    """Family from the colour of the margin (demo plugin that clinometry refuses: nobody passes colour=)."""
    return Classification(family=None, confidence=0.0, classifier="demo_colour", reasons=(f"colour {colour}",))
