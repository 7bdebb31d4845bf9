"""Named scenarios of the forward model (invented settings, no real places).

Each scenario is a :class:`Scenario`: the growth parameters
(:class:`~clinometry.synth.growth.GrowthParameters`), the family and
trajectory class it is meant to make, and seismic defaults (wavelet, velocity,
sampling, SNR, line geometry).  The settings are our own choices, tuned so
that the grown margins fall clearly into their family: ramps with a maximum
slope below 1.5 degrees, rimmed shelves with a flat top and a 10-30 degree
front, steep margins above 35 degrees (the family limits as used in the
issue; common practice, no source).
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace

from .growth import GrowthParameters

__all__ = ["Scenario", "SCENARIOS", "get_scenario"]


@dataclass(frozen=True)
class Scenario:
    """A named forward-model setting.

    Parameters
    ----------
    name, description : str
    family : str or None
        Family the scenario is meant to make ("ramp", "rimmed_shelf",
        "steep_margin"), None for a line without a margin.
    trajectory : str or None
        Expected shelf-break trajectory class.
    growth : GrowthParameters
    flip : bool
        Mirror the grown section so that basinward is towards decreasing
        trace index (direction "-").
    datum_depth_m : float, m
        Depth of the final sea level below the z origin (the overburden and
        water above the grown platform fill this).
    velocity_m_s, velocity_k_per_s : float
        Time-depth law ``v(z) = v0 + k z``.
    peak_hz : float, Hz
        Ricker peak frequency.
    snr : float or None
        RMS signal / RMS noise; None for no noise.
    dt_ms, dz_m : float
        Sample interval in the twt and depth domains.
    n_samples : int
    delay_ms : float, ms (or m in the depth domain)
    azimuth_deg : float, degrees clockwise from grid north
    origin_xy_m : tuple of float, m
    first_cdp : int
    """

    name: str
    description: str
    family: str | None
    trajectory: str | None
    growth: GrowthParameters = field(repr=False)
    flip: bool = False
    datum_depth_m: float = 150.0
    velocity_m_s: float = 2500.0
    velocity_k_per_s: float = 0.0
    peak_hz: float = 30.0
    snr: float | None = 8.0
    dt_ms: float = 2.0
    dz_m: float = 2.5
    n_samples: int = 260
    delay_ms: float = 0.0
    azimuth_deg: float = 60.0
    origin_xy_m: tuple = (412000.0, 5318000.0)
    first_cdp: int = 1001

    def with_options(self, **changes):
        """A copy with some fields changed (``growth=...`` too)."""
        return replace(self, **changes)


_G = GrowthParameters

SCENARIOS = {
    s.name: s
    for s in (
        Scenario(
            "gentle_ramp",
            "homoclinal ramp: light-dependent production reaching deep water, "
            "storm reworking to 20 m, sediment stable at 0.8 degrees",
            "ramp", "ascending",
            _G(length_m=16000.0, dx_m=40.0, n_steps=40, step_kyr=10.0,
               substrate_profile=((0.0, 5.0), (0.4, 90.0), (1.0, 95.0)), gmax_m_per_kyr=0.2,
               extinction_per_m=0.04, reworking_depth_m=20.0, export_fraction=0.1,
               stable_slope_deg=0.8, subsidence_m_per_kyr=0.1, fine_decay_m=2000.0),
            datum_depth_m=200.0, n_samples=200, peak_hz=35.0),
        Scenario(
            "rimmed_shelf",
            "flat-topped shelf with a 20 degree sand-and-rubble front, slow subsidence",
            "rimmed_shelf", "ascending",
            _G(length_m=5000.0, dx_m=12.5, n_steps=40, gmax_m_per_kyr=0.5,
               subsidence_m_per_kyr=0.1, stable_slope_deg=20.0),
            n_samples=260),
        Scenario(
            "steep_margin",
            "reef-rimmed margin, boundstone front stable at 40 degrees, 500 m of relief",
            "steep_margin", "ascending",
            _G(length_m=4000.0, dx_m=12.5, n_steps=40, gmax_m_per_kyr=0.5,
               substrate_profile=((0.0, 5.0), (0.3, 20.0), (0.4, 500.0), (1.0, 520.0)),
               subsidence_m_per_kyr=0.1, stable_slope_deg=40.0, fine_fraction=0.05),
            n_samples=330, peak_hz=30.0),
        Scenario(
            "isolated_platform",
            "isolated platform on a fault-block high shedding to both sides",
            "rimmed_shelf", "ascending",
            _G(length_m=6000.0, dx_m=12.5, n_steps=40, gmax_m_per_kyr=0.5, sides="+-",
               substrate_profile=((0.0, 300.0), (0.35, 290.0), (0.45, 10.0), (0.55, 10.0),
                                  (0.65, 290.0), (1.0, 300.0)),
               subsidence_m_per_kyr=0.1, stable_slope_deg=25.0),
            n_samples=260),
        Scenario(
            "rising_shelf",
            "rimmed shelf under fast subsidence and 5 m, 100 kyr eustatic cycles: "
            "strongly ascending shelf-break trajectory; linear velocity law",
            "rimmed_shelf", "ascending",
            _G(length_m=5000.0, dx_m=12.5, n_steps=40, gmax_m_per_kyr=1.2,
               subsidence_m_per_kyr=0.4, stable_slope_deg=22.0,
               eustasy_amplitude_m=5.0, eustasy_period_kyr=100.0,
               substrate_profile=((0.0, 5.0), (0.25, 20.0), (0.35, 350.0), (1.0, 370.0))),
            velocity_m_s=2000.0, velocity_k_per_s=0.6, n_samples=340),
        Scenario(
            "level_shelf",
            "rimmed shelf under a still sea level and no subsidence: flat trajectory; "
            "basin towards decreasing trace index",
            "rimmed_shelf", "flat",
            _G(length_m=5000.0, dx_m=12.5, n_steps=40, gmax_m_per_kyr=0.5,
               stable_slope_deg=20.0),
            flip=True, n_samples=260),
        Scenario(
            "falling_shelf",
            "rimmed shelf during a relative sea-level fall: descending trajectory",
            "rimmed_shelf", "descending",
            _G(length_m=5000.0, dx_m=12.5, n_steps=40, gmax_m_per_kyr=0.5,
               eustasy_trend_m_per_kyr=-0.1, stable_slope_deg=20.0),
            datum_depth_m=200.0, n_samples=260),
        Scenario(
            "deep_factory_shelf",
            "shelf whose main factory sits at 65 m water depth (a Gaussian production "
            "mode below the euphotic zone) with a weak surface factory: deep crest, "
            "steepest slope in the deep factory (trajectory not designed)",
            "rimmed_shelf", None,
            _G(length_m=5000.0, dx_m=12.5, n_steps=40, gmax_m_per_kyr=0.2,
               subsidence_m_per_kyr=0.1, stable_slope_deg=18.0,
               deep_gmax_m_per_kyr=0.6, deep_depth_m=65.0, deep_width_m=12.0),
            n_samples=260),
        Scenario(
            "noisy_shelf",
            "the rimmed shelf at SNR 2 with a 20 Hz wavelet",
            "rimmed_shelf", "ascending",
            _G(length_m=5000.0, dx_m=12.5, n_steps=40, gmax_m_per_kyr=0.5,
               subsidence_m_per_kyr=0.1, stable_slope_deg=20.0),
            snr=2.0, peak_hz=20.0, n_samples=260),
        Scenario(
            "flat_basin",
            "no margin: flat-lying basin strata from pelagic rain on a level floor",
            None, None,
            _G(length_m=5000.0, dx_m=12.5, n_steps=40, gmax_m_per_kyr=0.0,
               substrate_profile=((0.0, 300.0), (1.0, 300.0)), pelagic_m_per_kyr=0.05),
            n_samples=260),
    )
}


def get_scenario(name):
    """Scenario by name, grown or analytic; a scenario object passes through."""
    from ..errors import GeometryError
    from .settings import ANALYTIC_SCENARIOS, AnalyticScenario

    if isinstance(name, (Scenario, AnalyticScenario)):
        return name
    if name in SCENARIOS:
        return SCENARIOS[name]
    try:
        return ANALYTIC_SCENARIOS[name]
    except (KeyError, TypeError):
        raise GeometryError(f"unknown scenario {name!r}; choose one of "
                            f"{sorted(SCENARIOS) + sorted(ANALYTIC_SCENARIOS)}") from None
