"""Named analytic scenarios: mounds and saddles, fill and drape, ramps, lines with no margin.

Invented settings (no real places), each an :class:`AnalyticScenario`: a
:class:`~clinometry.synth.analytic.Setting` and seismic defaults.  The
numbers are this project's choices, kept inside the ranges of the trade
(common practice, no source unless given): build-up flanks of 30-60 deg
(steep margins, cemented or framework-built; Kenter 1990, from memory) and
20-25 deg (rimmed-shelf-like); ramp dips of 0.25-1.3 deg over tens of
kilometres (Read 1985; Burchette & Wright 1992, from memory); reliefs of
100-300 m; onlapping fill, compaction drape of 20-30 % of the buried relief
(see :mod:`clinometry.synth.fill`).  Slopes are kept at least 4 deg from the
30 deg family bound so each flank's family is clear.

The grown scenarios of :mod:`clinometry.synth.scenarios` (the bundled
lines) are unchanged; :data:`ALL_SCENARIOS` holds both.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass, field, replace

import numpy as np

from .analytic import Setting
from .bodies import Layers, Margin, Mound, Mounds, Ramp
from .fill import Fill, ToeSubsidence
from .profiles import Foreset

__all__ = ["AnalyticScenario", "ANALYTIC_SCENARIOS", "GROUPS", "draw_variant", "VARIANT_SPREAD"]


@dataclass(frozen=True)
class AnalyticScenario:
    """A named analytic setting with its seismic defaults.

    Parameters
    ----------
    name, description : str
    family : str or None
        Family of its margins when they share one; ``"mixed"`` when flanks
        differ; None for a line without margins.
    trajectory : str or None
        Expected shelf-break trajectory class of its margins.
    setting : Setting
    max_depth_m : float, m
        The section reaches this depth (sets the default sample count).
    velocity_m_s, velocity_k_per_s, peak_hz, snr, dt_ms, dz_m, delay_ms,
    azimuth_deg, origin_xy_m, first_cdp
        As for :class:`~clinometry.synth.scenarios.Scenario`.
    """

    name: str
    description: str
    family: str | None
    trajectory: str | None
    setting: Setting = field(repr=False)
    max_depth_m: float = 700.0
    velocity_m_s: float = 2500.0
    velocity_k_per_s: float = 0.0
    peak_hz: float = 30.0
    snr: float | None = 8.0
    dt_ms: float = 2.0
    dz_m: float = 2.5
    delay_ms: float = 0.0
    azimuth_deg: float = 120.0
    origin_xy_m: tuple = (508000.0, 6120000.0)
    first_cdp: int = 2001

    def with_options(self, **changes):
        """A copy with some fields changed (``setting=...`` too)."""
        return replace(self, **changes)


def _mound(centre, top, crest, left, right, floor_l, floor_r, **kw):
    return Mound(centre_x_m=centre, top_width_m=top, crest_depth_m=crest, left_slope_deg=left,
                 right_slope_deg=right, left_floor_depth_m=floor_l, right_floor_depth_m=floor_r, **kw)


_SINGLE = _mound(2500.0, 500.0, 300.0, 40.0, 40.0, 560.0, 560.0)
_PAIR_NARROW = Mounds((_mound(2300.0, 300.0, 300.0, 42.0, 34.0, 620.0, 520.0, widening_m=140.0),
                       _mound(3350.0, 300.0, 320.0, 36.0, 48.0, 520.0, 620.0, widening_m=140.0)))
_MARGIN = Margin("+", 2600.0, 250.0, 500.0, Foreset(22.0, break_width_m=40.0, toe_width_m=200.0),
                 n_clinoforms=24, progradation_m=1000.0, aggradation_m=60.0)


def _drape(base, top, n, *, compaction, decay_m=200.0, facies="overburden", smoothing_m=60.0):
    return Fill(n_layers=n, base_depth_m=base, top_depth_m=top, compaction=compaction,
                compaction_decay_m=decay_m, drape_smoothing_m=smoothing_m, facies=facies)


_LIST = (
    AnalyticScenario(
        "mound_single", "isolated build-up, 40 deg flanks on both sides, slightly domed top, 260 m relief",
        "steep_margin", "ascending", Setting(5000.0, 12.5, Mounds((_SINGLE,)))),
    AnalyticScenario(
        "mound_asymmetric", "build-up with a 55 deg windward and a 22 deg leeward flank, flat top",
        "mixed", "ascending",
        Setting(5000.0, 12.5, Mounds((_mound(2300.0, 800.0, 280.0, 55.0, 22.0, 520.0, 520.0, dome_deg=0.3),)))),
    AnalyticScenario(
        "mound_pair_wide", "two build-ups (36-44 deg flanks) with a flat saddle floor ~1.4 km wide at the basin floor",
        "steep_margin", "ascending",
        Setting(7000.0, 12.5, Mounds((_mound(2200.0, 400.0, 320.0, 40.0, 36.0, 600.0, 600.0),
                                      _mound(4800.0, 500.0, 300.0, 44.0, 38.0, 600.0, 600.0))))),
    AnalyticScenario(
        "mound_pair_narrow", "two build-ups on a common bank: facing flanks (34-36 deg) meet in a narrow V "
        "saddle (toes 125 m apart) about 100 m above the outer basin floor",
        "steep_margin", "ascending", Setting(6000.0, 12.5, _PAIR_NARROW)),
    AnalyticScenario(
        "mound_drape", "isolated 45 deg build-up buried by onlapping fill and an overburden draped over it "
        "by differential compaction (relief decreasing upward); the drape is not a margin",
        "steep_margin", "ascending",
        Setting(5000.0, 12.5, Mounds((_mound(2500.0, 400.0, 350.0, 45.0, 45.0, 600.0, 600.0, widening_m=180.0),)),
                fills=(_drape(590.0, 360.0, 24, compaction=0.25, facies="basin"),
                       _drape(345.0, 140.0, 20, compaction=0.25)))),
    AnalyticScenario(
        "mound_pair_drape", "the narrow mound pair under compaction drape; only the four flanks are margins",
        "steep_margin", "ascending",
        Setting(6000.0, 12.5, _PAIR_NARROW,
                fills=(_drape(610.0, 330.0, 26, compaction=0.25, facies="basin"),
                       _drape(310.0, 130.0, 18, compaction=0.25)))),
    AnalyticScenario(
        "margin_drape", "35 deg margin facing '-' mantled by a depositional drape whose relief decays upward",
        "steep_margin", "ascending",
        Setting(6000.0, 12.5, Margin("-", 3000.0, 280.0, 560.0, Foreset(35.0, break_width_m=30.0, toe_width_m=150.0),
                                     n_clinoforms=20, progradation_m=600.0, aggradation_m=80.0),
                fills=(_drape(555.0, 200.0, 18, compaction=0.85, decay_m=80.0, smoothing_m=40.0),))),
    AnalyticScenario(
        "margin_onlap_fill", "22 deg prograding rimmed shelf, flat basin fill onlapping half its slope",
        "rimmed_shelf", "ascending",
        Setting(6000.0, 12.5, _MARGIN, fills=(Fill(14, 490.0, 370.0),))),
    AnalyticScenario(
        "margin_backtilted_fill", "18 deg margin facing '-' whose onlapping fill dips back towards the platform "
        "above the toe (subsidence at the toe during filling)",
        "rimmed_shelf", "ascending",
        Setting(6000.0, 12.5, Margin("-", 3400.0, 240.0, 480.0, Foreset(18.0, break_width_m=40.0, toe_width_m=250.0),
                                     n_clinoforms=24, progradation_m=900.0, aggradation_m=50.0),
                fills=(Fill(16, 470.0, 350.0),),
                subsidence=ToeSubsidence("-", 2500.0, 60.0, width_m=900.0))),
    AnalyticScenario(
        "margin_dipping_fill", "16 deg concave margin; basin fill dipping 0.8 deg basinward, onlapping the "
        "slope and downlapping the floor",
        "rimmed_shelf", "ascending",
        Setting(6000.0, 12.5, Margin("+", 2400.0, 260.0, 520.0, Foreset(16.0, break_width_m=40.0, toe_width_m=500.0),
                                     n_clinoforms=24, progradation_m=900.0, aggradation_m=60.0),
                fills=(Fill(12, 505.0, 420.0, kind="dipping", dip_deg=0.8, direction="+", reference_x_m=3500.0),))),
    AnalyticScenario(
        "margin_thick_drape", "24 deg margin under a thick drape: fill first onlaps the slope, then covers the "
        "platform with compaction relief decreasing upward",
        "rimmed_shelf", "ascending",
        Setting(6000.0, 12.5, Margin("+", 2000.0, 320.0, 560.0, Foreset(24.0, break_width_m=40.0, toe_width_m=200.0),
                                     n_clinoforms=24, progradation_m=900.0, aggradation_m=70.0),
                fills=(_drape(550.0, 330.0, 26, compaction=0.2, facies="basin"),
                       _drape(315.0, 160.0, 20, compaction=0.2, decay_m=250.0)))),
    AnalyticScenario(
        "margin_concave", "margin facing '-' with a concave 20 deg foreset (wide toe) and a falling break: "
        "descending trajectory", "rimmed_shelf", "descending",
        Setting(6000.0, 12.5, Margin("-", 3200.0, 260.0, 500.0, Foreset(20.0, break_width_m=50.0, toe_width_m=700.0),
                                     n_clinoforms=24, progradation_m=1200.0, aggradation_m=-80.0))),
    # 19 steps of 25 m: every break at the same place between traces of 12.5 or 25 m,
    # so the breaks on the trace grid lie level (a flat trajectory in the truth)
    AnalyticScenario(
        "margin_steep_flat", "40 deg steep margin prograding at a still sea level: flat trajectory",
        "steep_margin", "flat",
        Setting(5000.0, 12.5, Margin("+", 2200.0, 240.0, 600.0, Foreset(40.0, break_width_m=30.0, toe_width_m=120.0),
                                     n_clinoforms=20, progradation_m=475.0, aggradation_m=0.0))),
    AnalyticScenario(
        "ramp_homoclinal", "homoclinal ramp: 0.6 deg over 12 km, no distinct break, prograding",
        "ramp", None,
        Setting(24000.0, 25.0, Ramp("+", 5000.0, 180.0, 270.0, 0.6, rise_m=4000.0, fall_m=4000.0)),
        max_depth_m=400.0),
    AnalyticScenario(
        "ramp_low_angle", "very gentle ramp facing '-': 0.25 deg over 21 km at 50 m trace spacing",
        "ramp", None,
        Setting(32000.0, 50.0, Ramp("-", 24000.0, 160.0, 230.0, 0.25, rise_m=5000.0, fall_m=5000.0,
                                    n_clinoforms=14, progradation_m=4000.0, aggradation_m=15.0)),
        max_depth_m=350.0),
    AnalyticScenario(
        "ramp_distally_steepened", "distally steepened ramp: inner ramp dipping 0.15 deg, outer ramp "
        "steepening to 1.3 deg over 1.5 km, no sharp break", "ramp", None,
        Setting(20000.0, 25.0, Ramp("+", 9000.0, 150.0, 260.0, 1.3, rise_m=1500.0, fall_m=2000.0,
                                    top_dip_deg=0.15, n_clinoforms=16, progradation_m=2500.0,
                                    aggradation_m=25.0)),
        max_depth_m=400.0),
    AnalyticScenario(
        "flat_layers", "no margin: flat layered strata of varied thickness and facies",
        None, None, Setting(5000.0, 12.5, Layers(150.0, 650.0, n_layers=50, layer_seed=3))),
    AnalyticScenario(
        "folded_layers", "no margin: layered strata in a gentle fold (4 km wavelength, dips up to 4 deg, "
        "fold amplitude decreasing upward)",
        None, None, Setting(6000.0, 12.5, Layers(150.0, 650.0, n_layers=50, fold_amplitude_m=45.0,
                                                 fold_wavelength_m=4000.0, layer_seed=5))),
    AnalyticScenario(
        "white_noise", "no margin and no signal: white Gaussian noise", None, None,
        Setting(5000.0, 12.5, noise_only="white"), snr=None),
    AnalyticScenario(
        "bandlimited_noise", "no margin and no signal: noise with the spectrum of the Ricker wavelet", None, None,
        Setting(5000.0, 12.5, noise_only="bandlimited"), snr=None),
)

#: analytic scenarios by name
ANALYTIC_SCENARIOS = {s.name: s for s in _LIST}

#: the analytic scenarios by kind of setting (for listings and the bench)
GROUPS = {
    "mounds": ("mound_single", "mound_asymmetric"),
    "mound pairs and saddles": ("mound_pair_wide", "mound_pair_narrow"),
    "drape": ("mound_drape", "mound_pair_drape", "margin_drape"),
    "basin fill": ("margin_onlap_fill", "margin_backtilted_fill", "margin_dipping_fill", "margin_thick_drape"),
    "margins": ("margin_concave", "margin_steep_flat"),
    "ramps": ("ramp_homoclinal", "ramp_low_angle", "ramp_distally_steepened"),
    "no margin": ("flat_layers", "folded_layers", "white_noise", "bandlimited_noise"),
}


#: geometry draws: slopes and the compaction fraction are scaled by up to
#: this fraction, all depths by one common factor within it, and every
#: position along the line shifted by up to ``_SHIFT_M`` (project choices:
#: enough to move breaks by several traces and slopes by a few degrees)
VARIANT_SPREAD = 0.1
_SHIFT_M = 200.0
#: a drawn slope stays this far (deg) on its own side of the 30 deg family bound
_FAMILY_MARGIN_DEG = 4.0


def _draw(obj, rng, *, depth_factor, shift_m, spread):
    from .analytic import STEEP_MIN_SLOPE_DEG

    changes = {}
    for f in dataclasses.fields(obj):
        v = getattr(obj, f.name)
        if dataclasses.is_dataclass(v):
            changes[f.name] = _draw(v, rng, depth_factor=depth_factor, shift_m=shift_m, spread=spread)
        elif isinstance(v, tuple) and v and all(dataclasses.is_dataclass(e) for e in v):
            changes[f.name] = tuple(_draw(e, rng, depth_factor=depth_factor, shift_m=shift_m, spread=spread)
                                    for e in v)
        elif isinstance(v, float) and not isinstance(v, bool):
            if f.name.endswith("slope_deg") and not f.name.startswith("top"):
                new = v * rng.uniform(1.0 - spread, 1.0 + spread)
                if v > STEEP_MIN_SLOPE_DEG:
                    new = max(new, STEEP_MIN_SLOPE_DEG + _FAMILY_MARGIN_DEG)
                elif v > 2.0:
                    new = min(new, STEEP_MIN_SLOPE_DEG - _FAMILY_MARGIN_DEG)
                changes[f.name] = float(new)
            elif f.name.endswith("_x_m"):
                changes[f.name] = v + shift_m
            elif f.name.endswith("depth_m"):
                changes[f.name] = v * depth_factor
            elif f.name == "compaction":
                changes[f.name] = float(min(1.0, v * rng.uniform(1.0 - 2 * spread, 1.0 + 2 * spread)))
    return dataclasses.replace(obj, **changes) if changes else obj


def draw_variant(scenario, seed, *, spread=VARIANT_SPREAD):
    """An analytic scenario with its geometry drawn around the named one.

    Every flank slope is scaled by a factor in ``1 +- spread`` (kept on its
    side of the 30 deg family bound by ``_FAMILY_MARGIN_DEG``), the
    compaction fraction by ``1 +- 2 spread``, every depth by one common
    factor in ``1 +- spread`` (so the stacking order holds), and every
    position along the line shifted by one amount within +-200 m.  The
    seismic defaults are unchanged; the truth of the drawn line is measured
    on its own geometry as for any line.

    Parameters
    ----------
    scenario : str or AnalyticScenario
    seed : int
        Seeds the draw (the same seed gives the same geometry).
    spread : float

    Returns
    -------
    AnalyticScenario
        Named ``"<name>@<seed>"``.

    Examples
    --------
    >>> a, b = draw_variant("mound_single", 1), draw_variant("mound_single", 1)
    >>> a == b, a.name, a.setting.body.mounds[0].left_slope_deg != 40.0
    (True, 'mound_single@1', True)
    """
    sc = ANALYTIC_SCENARIOS[scenario] if isinstance(scenario, str) else scenario
    rng = np.random.default_rng([int(seed), 20261203])
    depth_factor = float(rng.uniform(1.0 - spread, 1.0 + spread))
    shift = float(rng.uniform(-_SHIFT_M, _SHIFT_M))
    setting = _draw(sc.setting, rng, depth_factor=depth_factor, shift_m=shift, spread=spread)
    return replace(sc, name=f"{sc.name}@{int(seed)}", setting=setting,
                   max_depth_m=sc.max_depth_m * max(depth_factor, 1.0),
                   description=f"{sc.description} (geometry drawn with seed {int(seed)})")
