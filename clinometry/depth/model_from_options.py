"""Build a velocity model from command-line-like options.

One function, :func:`velocity_from_options`, turns what a user typed (a
constant, a linear gradient, a file) into a model, so every command and the
pipeline make the same decision in the same way.  When a two-way-time section
comes with no velocity at all, a constant ``DEFAULT_VELOCITY_M_S`` is used
and the model carries a ``fallback`` note that the pipeline copies into the
result: one record per result rather than one warning per line of a batch.
"""

from __future__ import annotations

import logging
import os
from collections.abc import Mapping, Sequence

from ..errors import VelocityError
from ..io.sniff import has_segy_suffix
from ..section import DOMAINS, section_name
from .models import (
    DEFAULT_VELOCITY_M_S,
    DEFAULT_VELOCITY_NOTE,
    ConstantVelocity,
    LinearVelocity,
    VelocityModel,
)
from ._matching import LATERAL_MODES
from .section_velocity import SectionVelocity
from .table import TableVelocity, read_velocity_table

logger = logging.getLogger(__name__)

__all__ = ["velocity_from_options", "velocity_from_dict", "is_segy_file", "VELOCITY_KINDS"]

VELOCITY_KINDS = ("interval", "rms")
#: file-name endings of velocity tables (text); SEG-Y endings are
#: :data:`clinometry.io.sniff.SEGY_SUFFIXES`
_TABLE_SUFFIXES = (".csv", ".txt", ".dat", ".tsv", ".tbl", ".vel")
#: bytes read to tell a text table from SEG-Y: the SEG-Y rev 1 textual header
#: is 3200 bytes and the binary header 400 more (SEG Technical Standards
#: Committee 2002, SEG-Y rev 1, section 3)
_SNIFF_BYTES = 3600


def is_segy_file(path) -> bool:
    """True when ``path`` looks like SEG-Y rather than a text table.

    Decided by suffix (:data:`clinometry.io.sniff.SEGY_SUFFIXES`, or a
    table ending such as ``.csv``) and, for other names, by whether the
    first 3600 bytes (textual + binary header in SEG-Y rev 1) are all
    printable text (common practice, no source).
    """
    if has_segy_suffix(path):
        return True
    if os.fspath(path).lower().endswith(_TABLE_SUFFIXES):
        return False
    with open(path, "rb") as fh:
        head = fh.read(_SNIFF_BYTES)
    printable = set(range(32, 127)) | {9, 10, 13}
    return not all(b in printable for b in head)


def velocity_from_options(
    velocity=None,
    velocity_linear=None,
    velocity_file=None,
    domain=None,
    section=None,
    *,
    velocity_kind: str = "interval",
    velocity_lateral: str = "exact",
):
    """Choose the velocity model from command-line-like options.

    Parameters
    ----------
    velocity : float, VelocityModel or mapping, optional
        Constant velocity in m/s; an existing model is returned as is; a
        ``to_dict()`` mapping is rebuilt.
    velocity_linear : (float, float), optional
        ``(v0_m_s, k_per_s)`` of ``v(z) = v0 + k z``.
    velocity_file : str or os.PathLike, optional
        Velocity SEG-Y (section or 3D volume, matched to ``section``) or a
        two-column text table of two-way time (ms) and velocity (m/s).
    domain : {"twt", "depth"}, optional
        Domain of the section; default ``section.attrs["domain"]``, else
        ``"twt"``.
    section : xarray.DataArray, optional
        The seismic section; needed for a velocity SEG-Y.
    velocity_kind : {"interval", "rms"}
        How to read ``velocity_file`` velocities.
    velocity_lateral : {"exact", "linear"}
        For a velocity SEG-Y: require a velocity trace for every seismic
        trace (``"exact"``), or interpolate inside sparse velocity control
        (``"linear"``, see :meth:`SectionVelocity.from_section`).

    Returns
    -------
    VelocityModel or None
        None for a depth section with no velocity option.  For a TWT section
        with no option, ``ConstantVelocity(DEFAULT_VELOCITY_M_S)`` whose
        ``fallback`` says so (recorded in results).

    Raises
    ------
    VelocityError
        More than one option, options for a depth section, a domain that
        contradicts the section, a SEG-Y file without a section, a missing
        file, or any model check.

    Examples
    --------
    >>> velocity_from_options(velocity_linear=(1800, 0.4)).describe()
    'linear velocity v(z) = 1800 m/s + 0.4 1/s * z'
    >>> velocity_from_options(domain="twt").to_dict()["velocity_m_s"]
    3000.0
    >>> velocity_from_options(domain="depth") is None
    True
    """
    given = [n for n, v in (("velocity", velocity), ("velocity_linear", velocity_linear), ("velocity_file", velocity_file)) if v is not None]
    if len(given) > 1:
        raise VelocityError(f"give only one velocity option, got {' and '.join(given)}")
    if velocity_kind not in VELOCITY_KINDS:
        raise VelocityError(f"velocity kind must be one of {VELOCITY_KINDS}, got {velocity_kind!r}")
    sec_domain = section.attrs.get("domain") if section is not None else None
    if domain is None:
        domain = sec_domain or "twt"
    if domain not in DOMAINS:
        raise VelocityError(f"domain must be one of {DOMAINS}, got {domain!r}")
    if sec_domain is not None and sec_domain != domain:
        raise VelocityError(
            f"{section_name(section)}: domain {domain!r} was given but the section is in {sec_domain!r}; "
            "read the file with the same domain"
        )
    if velocity_lateral not in LATERAL_MODES:
        raise VelocityError(f"velocity lateral mode must be one of {LATERAL_MODES}, got {velocity_lateral!r}")
    if velocity_lateral != "exact" and velocity_file is None:
        raise VelocityError(f"lateral velocity interpolation {velocity_lateral!r} applies to a velocity SEG-Y only")
    if velocity_kind != "interval" and velocity_file is None:
        raise VelocityError(f"velocity kind {velocity_kind!r} applies to a velocity file only; drop it or give --velocity-file")
    if domain == "depth":
        if given:
            where = section_name(section) if section is not None else "the section"
            raise VelocityError(
                f"{where} is in depth, so {given[0].replace('_', '-')} is not used; drop it, "
                "or read the file as two-way time (--domain twt)"
            )
        return None

    if isinstance(velocity, VelocityModel):
        return velocity
    if isinstance(velocity, Mapping):
        return velocity_from_dict(velocity)
    if velocity is not None:
        try:
            v = float(velocity)
        except (TypeError, ValueError) as err:
            raise VelocityError(f"velocity must be a number in m/s, got {velocity!r}") from err
        model = ConstantVelocity(v)
    elif velocity_linear is not None:
        if isinstance(velocity_linear, (str, bytes)) or not isinstance(velocity_linear, Sequence) or len(velocity_linear) != 2:
            raise VelocityError(f"velocity_linear needs two numbers (v0 in m/s, k in 1/s), got {velocity_linear!r}")
        try:
            v0, k = (float(a) for a in velocity_linear)
        except (TypeError, ValueError) as err:
            raise VelocityError(f"velocity_linear needs two numbers (v0 in m/s, k in 1/s), got {velocity_linear!r}") from err
        model = LinearVelocity(v0, k)
    elif velocity_file is not None:
        model = _model_from_file(velocity_file, section, velocity_kind, velocity_lateral)
    else:
        model = ConstantVelocity(DEFAULT_VELOCITY_M_S, fallback=DEFAULT_VELOCITY_NOTE)
    logger.info("velocity model: %s", model.describe())
    return model


def _model_from_file(path, section, kind, lateral):
    fname = os.path.basename(os.fspath(path))
    if not os.path.isfile(path):
        raise VelocityError(f"{fname}: velocity file not found (looked for {os.fspath(path)!r}); check the path")
    if is_segy_file(path):
        if section is None:
            raise VelocityError(
                f"{fname}: a velocity SEG-Y is matched trace by trace to the seismic, so the section is needed "
                "(pass section=)"
            )
        return SectionVelocity.from_segy(path, section=section, kind=kind, lateral=lateral)
    if lateral != "exact":
        raise VelocityError(f"{fname}: lateral velocity interpolation applies to a velocity SEG-Y, not to a table")
    return read_velocity_table(path, kind=kind)


def velocity_from_dict(d) -> VelocityModel:
    """Rebuild a one-dimensional model from its ``to_dict()`` record.

    Parameters
    ----------
    d : mapping
        ``{"model": "constant"|"linear"|"table", ...}`` as written by
        ``to_dict``.

    Returns
    -------
    VelocityModel

    Raises
    ------
    VelocityError
        Unknown model name, missing keys, or a velocity section (those are
        rebuilt from their SEG-Y file with ``SectionVelocity.from_segy``).

    Examples
    --------
    >>> velocity_from_dict({"model": "linear", "v0_m_s": 1800, "k_per_s": 0.6}).describe()
    'linear velocity v(z) = 1800 m/s + 0.6 1/s * z'
    """
    try:
        name = d["model"]
        if name == "constant":
            return ConstantVelocity(d["velocity_m_s"], fallback=d.get("fallback"))
        if name == "linear":
            return LinearVelocity(d["v0_m_s"], d["k_per_s"])
        if name == "table":
            return TableVelocity(d["twt_ms"], d["velocity_m_s"], d.get("kind", "interval"), source=d.get("source", ""))
    except (KeyError, TypeError) as err:
        raise VelocityError(f"velocity record {dict(d)!r} is missing {err}; write it with model.to_dict()") from err
    if name == "section":
        raise VelocityError(
            f"velocity record for a velocity section ({d.get('source', 'unknown file')}) cannot be rebuilt "
            "from its summary; load it again with SectionVelocity.from_segy"
        )
    raise VelocityError(f"unknown velocity model {name!r}; expected constant, linear, table or section")
