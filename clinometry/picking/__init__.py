"""Automatic picking of reflector surfaces, platform top, clinoforms, shelf break and toe.

:func:`pick` runs a picker plugin (entry-point group ``clinometry.pickers``;
the built-in ``default`` is :func:`clinometry.picking.default.pick_default`)
on a section and returns a :class:`~clinometry.picking.picks.Picks` record.
:func:`~clinometry.picking.export.horizon_rows` turns picks into the rows of
``<stem>.horizons.csv``.
"""

from __future__ import annotations

from .export import HORIZON_COLUMNS, horizon_rows
from .picks import HORIZON_ROLES, ClinoformPicks, Horizon, MarginPicks, PickPoint, Picks, RejectedCandidate

__all__ = [
    "pick",
    "horizon_rows",
    "HORIZON_COLUMNS",
    "HORIZON_ROLES",
    "Horizon",
    "PickPoint",
    "ClinoformPicks",
    "MarginPicks",
    "Picks",
    "RejectedCandidate",
]


def pick(section, *, picker: str = "default", velocity=None, **options) -> Picks:
    """Pick surfaces and margins on a section with the named picker plugin.

    Parameters
    ----------
    section : xarray.DataArray, dims ("trace", "z")
    picker : str
        Name of an installed picker (entry-point group ``clinometry.pickers``).
    velocity : velocity model, float (m/s) or None
        Passed on to the picker for depth conversion.
    **options
        The picker's own keyword options (see ``clinometry plugins``).

    Returns
    -------
    Picks

    Raises
    ------
    PluginError
        Unknown picker name, or a picker that cannot be imported.
    PickingError
        The section cannot be picked at all (e.g. every trace dead).

    Examples
    --------
    >>> import numpy as np
    >>> from clinometry.section import make_section
    >>> z = np.arange(200) * 2.0
    >>> data = np.zeros((30, 200)); data[:, 100] = 1.0
    >>> picks = pick(make_section(data, z=z, trace_spacing_m=25.0), velocity=2500.0)
    >>> picks.picker, len(picks.margins)
    ('default', 0)
    """
    from .._plugins import load_plugin

    func = load_plugin("picker", picker)
    return func(section, velocity=velocity, **options)
