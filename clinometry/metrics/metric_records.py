"""Records that the metrics step returns.

A :class:`MarginMetrics` holds every number measured on one margin, in depth
units and true degrees (names end in their unit), with P10/P50/P90 where the
Monte-Carlo uncertainty was run, and a reason for every value that could not
be measured.  Points are plain dicts with the keys of the results contract:
``trace, distance_m, depth_m, x, y, z`` (``z`` in the section's units).
"""

from __future__ import annotations

from dataclasses import dataclass, field

__all__ = ["MarginMetrics", "Metrics", "POINT_KEYS"]

#: keys of a point (break, toe, ...) in metrics, results and truth files
POINT_KEYS = ("trace", "distance_m", "depth_m", "x", "y", "z")


@dataclass(frozen=True)
class MarginMetrics:
    """Everything measured on one margin.

    Attributes
    ----------
    direction : {"+", "-"}
        Basinward along increasing trace index is ``"+"``.
    values : dict of str -> float, str or None
        Named metrics, unit in the name: ``relief_m``, ``slope_max_deg``,
        ``slope_mean_deg``, ``foreset_width_m``, ``topset_gradient_deg``,
        ``bottomset_gradient_deg``, ``break_curvature_per_km``,
        ``toe_curvature_per_km``, ``clinoform_height_m``, ``profile_shape``
        (``"planar" | "concave" | "sigmoidal"``), ``profile_fit_r2``, ... .
        ``None`` when not measurable (see ``missing``).
    uncertainty : dict of str -> dict
        ``{"relief_m": {"p10": .., "p50": .., "p90": ..}, ...}`` for the values
        that went through the Monte-Carlo propagation.
    platform_top, shelf_break, toe : dict or None
        Points with :data:`POINT_KEYS` (platform_top may add ``gradient_deg``
        and a depth range).
    clinoforms : tuple of dict
        Oldest to youngest: ``{"horizon_id", "break": point|None,
        "toe": point|None, "slope_max_deg", "height_m"}``.
    trajectory : dict or None
        ``{"angle_deg", "class", "progradation_m", "aggradation_m",
        "ratio", "n_breaks"}``; None with a reason in ``missing`` when fewer
        than two clinoform breaks exist.
    missing : dict of str -> str
        Metric name -> why it is missing.
    profile : dict
        The depth profile of the margin used for the numbers, for plots:
        ``{"distance_m": [...], "depth_m": [...], "slope_deg": [...]}``.
    """

    direction: str
    values: dict = field(default_factory=dict)
    uncertainty: dict = field(default_factory=dict)
    platform_top: dict | None = None
    shelf_break: dict | None = None
    toe: dict | None = None
    clinoforms: tuple = ()
    trajectory: dict | None = None
    missing: dict = field(default_factory=dict)
    profile: dict = field(default_factory=dict)
    confidence: float = 0.0


@dataclass(frozen=True)
class Metrics:
    """Metrics of every margin on one section.

    Attributes
    ----------
    margins : tuple of MarginMetrics
        Same order as ``Picks.margins``.
    velocity : dict
        The velocity model used, as ``VelocityModel.to_dict()``.
    uncertainty_settings : dict
        Monte-Carlo settings (n draws, velocity and pick uncertainty, seed),
        empty when the uncertainty was not run.
    """

    margins: tuple = ()
    velocity: dict = field(default_factory=dict)
    uncertainty_settings: dict = field(default_factory=dict)
