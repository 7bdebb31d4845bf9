"""Forward model of carbonate platform margins and synthetic seismic with ground truth.

Grow a margin through time (:mod:`~clinometry.synth.growth`, production law of
Bosscher & Schlager 1992, reworking, angle-of-repose-limited deposition),
render it as seismic (:mod:`~clinometry.synth.seismic`, convolution with a
Ricker wavelet), measure its true break, toe, slope and trajectory
(:mod:`~clinometry.synth.truth`) and write SEG-Y plus a truth JSON
(:mod:`~clinometry.synth.write`).

Settings the growth model does not make -- isolated mounds and saddles,
onlapping, dipping and back-tilted basin fill, thick and compaction drape,
ramps without a break, flat and folded strata, noise -- are laid out from
analytic profiles (:mod:`~clinometry.synth.analytic`, named in
:mod:`~clinometry.synth.settings`).  :data:`SCENARIOS` holds the grown
(bundled) scenarios, :data:`ANALYTIC_SCENARIOS` the analytic ones and
:data:`ALL_SCENARIOS` both; :func:`make_line` makes any of them, with the
recording conditions of :mod:`~clinometry.synth.conditions` (noise,
reversed polarity, gain step, dead traces, amplitude scale).
"""

from .growth import GrowthParameters, Stratigraphy, grow, production_rate
from .cube import make_cube, write_cube
from .lines import grown_surfaces, make_line
from .scenarios import SCENARIOS, Scenario, get_scenario
from .settings import ANALYTIC_SCENARIOS, GROUPS, AnalyticScenario
from .seismic import SynthVelocity, ricker
from .preview import plot_preview
from .write import truth_path, write_line, write_segy
from .bundle import demo_files, generate_bundle

#: every scenario by name: the grown (bundled) ones first, then the analytic ones
ALL_SCENARIOS = {**SCENARIOS, **ANALYTIC_SCENARIOS}

__all__ = [
    "GrowthParameters",
    "Stratigraphy",
    "grow",
    "production_rate",
    "make_line",
    "grown_surfaces",
    "plot_preview",
    "make_cube",
    "write_line",
    "write_cube",
    "write_segy",
    "truth_path",
    "SCENARIOS",
    "ANALYTIC_SCENARIOS",
    "ALL_SCENARIOS",
    "GROUPS",
    "Scenario",
    "AnalyticScenario",
    "get_scenario",
    "SynthVelocity",
    "ricker",
    "demo_files",
    "generate_bundle",
]
