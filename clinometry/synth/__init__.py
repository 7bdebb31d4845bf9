"""Forward model of carbonate platform margins and synthetic seismic with ground truth.

Grow a margin through time (:mod:`~clinometry.synth.growth`, production law of
Bosscher & Schlager 1992, reworking, angle-of-repose-limited deposition),
render it as seismic (:mod:`~clinometry.synth.seismic`, convolution with a
Ricker wavelet), measure its true break, toe, slope and trajectory
(:mod:`~clinometry.synth.truth`) and write SEG-Y plus a truth JSON
(:mod:`~clinometry.synth.write`).
"""

from .growth import GrowthParameters, Stratigraphy, grow, production_rate
from .cube import make_cube, write_cube
from .lines import grown_surfaces, make_line
from .scenarios import SCENARIOS, Scenario, get_scenario
from .seismic import SynthVelocity, ricker
from .preview import plot_preview
from .write import truth_path, write_line, write_segy

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
    "Scenario",
    "get_scenario",
    "SynthVelocity",
    "ricker",
]
