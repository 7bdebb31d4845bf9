"""Time-depth conversion and true dip.

Velocity models behind one interface (:class:`VelocityModel`): constant,
linear ``v(z) = v0 + k z``, a table of interval or RMS (Dix 1955) velocities,
and a velocity SEG-Y matched to the seismic trace by trace.  Whole sections
and picked horizons convert between two-way time and depth; true dip comes
from apparent time dip.  Depth-domain sections take the same path with an
identity conversion.

.. caution::
   Depths and angles are interpretation aids.  Those resting on a default or
   uncalibrated velocity can be off by tens of percent.  Do not use them on
   their own for well planning, drilling or storage siting: calibrate with
   well ties, have licensed professionals review, and follow local
   regulations.
"""

from ._plausibility import PLAUSIBLE_VELOCITY_M_S
from .convert import horizon_to_depth, horizon_to_twt, section_to_depth, section_to_twt, to_depth
from .dip import dip_deg_from_depth, time_dip_ms_per_m, true_dip_deg
from .dix import interval_to_rms, rms_to_interval
from .models import DEFAULT_VELOCITY_M_S, DEFAULT_VELOCITY_NOTE, ConstantVelocity, LinearVelocity, VelocityModel
from .model_from_options import VELOCITY_KINDS, is_segy_file, velocity_from_dict, velocity_from_options
from .section_velocity import SectionVelocity
from .table import TableVelocity, read_velocity_table

__all__ = [
    "DEFAULT_VELOCITY_M_S",
    "DEFAULT_VELOCITY_NOTE",
    "PLAUSIBLE_VELOCITY_M_S",
    "VELOCITY_KINDS",
    "VelocityModel",
    "ConstantVelocity",
    "LinearVelocity",
    "TableVelocity",
    "SectionVelocity",
    "velocity_from_dict",
    "velocity_from_options",
    "read_velocity_table",
    "is_segy_file",
    "section_to_depth",
    "section_to_twt",
    "horizon_to_depth",
    "horizon_to_twt",
    "to_depth",
    "true_dip_deg",
    "time_dip_ms_per_m",
    "dip_deg_from_depth",
    "interval_to_rms",
    "rms_to_interval",
]
