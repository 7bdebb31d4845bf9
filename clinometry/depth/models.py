"""Velocity models for time-depth conversion that do not vary along the line.

Every model answers the same questions through one small interface,
:class:`VelocityModel`: the depth below time zero of a two-way time
(``depth_m``), the inverse (``twt_ms``), the interval and average velocity at
a time, a copy with every velocity scaled (for Monte-Carlo uncertainty) and a
JSON-safe description (``to_dict``) that is stored in every result file.

Depth is measured from the z origin of the section (time zero, any recording
delay included), positive down; times are two-way, in ms.

Three one-dimensional models share it (the first two here, the table in
:mod:`clinometry.depth.table`):

``ConstantVelocity``
    ``z = v t / 2``: the simplest honest choice when only an average velocity
    is known.
``LinearVelocity``
    ``v(z) = v0 + k z``, the classic compaction-trend model with the closed
    form ``z(t) = (v0 / k) (exp(k t / 2) - 1)`` (Slotnick 1959; Sheriff &
    Geldart 1995, from memory).  Closed forms are exact and cheap, so no
    numerical integration is needed.
``TableVelocity``
    Pairs of (two-way time, velocity) as interval or RMS velocities; RMS is
    turned into interval velocity by Dix (1955).  Interval velocity is
    piecewise constant between table times, so depth is piecewise linear in
    time and the inverse is exact.

A velocity that changes along the line (a velocity SEG-Y) is
:class:`~clinometry.depth.section_velocity.SectionVelocity`.

.. caution::
   Depths and angles computed here are interpretation aids.  A depth that
   rests on a guessed or default velocity can be wrong by tens of percent.
   Do not use them on their own for well planning, drilling, or for the
   siting of storage (CO2, gas, waste): those decisions need calibrated
   velocities (well ties, check shots), review by licensed professionals,
   and compliance with local regulations.
"""

from __future__ import annotations

import logging

import numpy as np

from ..errors import VelocityError
from ._plausibility import MAX_GRADIENT_PER_S, MS_PER_S, PLAUSIBLE_VELOCITY_M_S, broadcast_trace, check_velocities

logger = logging.getLogger(__name__)

__all__ = [
    "DEFAULT_VELOCITY_M_S",
    "DEFAULT_VELOCITY_NOTE",
    "PLAUSIBLE_VELOCITY_M_S",
    "VelocityModel",
    "ConstantVelocity",
    "LinearVelocity",
]

#: Default velocity (m/s) used when a two-way-time section comes with no
#: velocity at all.  3000 m/s sits between the velocities of slope and basin
#: marls and mudstones in the upper kilometres (about 2000-3000 m/s) and those
#: of platform limestones and dolomites (about 3500-6000 m/s): carbonate
#: velocities span a wide range controlled by pore type (Anselmetti & Eberli
#: 1993, from memory).  It is a fallback, not an estimate: the pipeline
#: records in the result that it was used, and depths, reliefs and true dips
#: that rest on it can be off by 30 % or more.
DEFAULT_VELOCITY_M_S = 3000.0

#: Text recorded in results (``fallbacks``) when the default velocity is used.
DEFAULT_VELOCITY_NOTE = (
    f"no velocity given; constant {DEFAULT_VELOCITY_M_S:g} m/s assumed "
    "(depths, reliefs and true dips may be off by 30 % or more; give --velocity, "
    "--velocity-linear or --velocity-file)"
)


class VelocityModel:
    """Interface of every velocity model.

    Subclasses implement ``_depth``, ``_twt`` and ``_vint`` on float64 arrays
    and ``scaled``, ``to_dict`` and ``describe``.

    Attributes
    ----------
    name : str
        Model name as recorded in ``to_dict()["model"]``.
    fallback : str or None
        Why this model was chosen by default, when it was; recorded in
        ``to_dict()`` so results say so.
    laterally_varying : bool
        True when the model needs a trace index (velocity sections).
    """

    name = "abstract"
    laterally_varying = False
    fallback: str | None = None

    # -- public interface -------------------------------------------------
    def depth_m(self, twt_ms, trace=None) -> np.ndarray:
        """Depth below time zero, m, of two-way times ``twt_ms`` (ms).

        Parameters
        ----------
        twt_ms : array_like, ms
            Two-way times, positive down from time zero.  NaN gives NaN.
        trace : int or array_like of int, optional
            Section trace index (0-based), broadcast with ``twt_ms``; needed
            only by laterally varying models.

        Returns
        -------
        numpy.ndarray, m, shape of ``broadcast(twt_ms, trace)``
        """
        t, tr = broadcast_trace(twt_ms, trace)
        return self._depth(t, tr)

    def twt_ms(self, depth_m, trace=None) -> np.ndarray:
        """Two-way time, ms, of depths ``depth_m`` (m below time zero).

        Parameters
        ----------
        depth_m : array_like, m
        trace : int or array_like of int, optional

        Returns
        -------
        numpy.ndarray, ms
        """
        z, tr = broadcast_trace(depth_m, trace)
        return self._twt(z, tr)

    def interval_velocity(self, twt_ms, trace=None) -> np.ndarray:
        """Interval (instantaneous) velocity, m/s, at two-way times ``twt_ms``."""
        t, tr = broadcast_trace(twt_ms, trace)
        return self._vint(t, tr)

    def average_velocity(self, twt_ms, trace=None) -> np.ndarray:
        """Average velocity ``2 z / t``, m/s, from time zero to ``twt_ms``.

        At ``t = 0`` the interval velocity there is returned.
        """
        t, tr = broadcast_trace(twt_ms, trace)
        z = self._depth(t, tr)
        with np.errstate(invalid="ignore", divide="ignore"):
            vav = 2.0 * z / (t / MS_PER_S)
        return np.where(t == 0, self._vint(t, tr), vav)

    def scaled(self, factor: float) -> "VelocityModel":  # pragma: no cover - abstract
        """Copy with the interval velocity at every two-way time times ``factor``.

        Depth at every time is then ``factor`` times the original depth.  Used
        by the Monte-Carlo velocity uncertainty.
        """
        raise NotImplementedError

    def to_dict(self) -> dict:  # pragma: no cover - abstract
        """JSON-safe description: ``{"model": name, ...parameters}``."""
        raise NotImplementedError

    def describe(self) -> str:  # pragma: no cover - abstract
        """One line for logs."""
        raise NotImplementedError

    def __repr__(self) -> str:
        return f"<{type(self).__name__}: {self.describe()}>"

    # -- helpers ----------------------------------------------------------
    def _base_dict(self, d: dict) -> dict:
        out = {"model": self.name, **d}
        if self.fallback:
            out["fallback"] = self.fallback
        return out

    @staticmethod
    def _check_factor(factor) -> float:
        f = float(factor)
        if not np.isfinite(f) or f <= 0:
            raise VelocityError(f"velocity scale factor must be a positive number, got {factor!r}")
        return f


class ConstantVelocity(VelocityModel):
    """One velocity everywhere: ``z = v t / 2``.

    Parameters
    ----------
    v_m_s : float, m/s
        Velocity, within ``PLAUSIBLE_VELOCITY_M_S``.
    fallback : str, optional
        Set when the model was chosen by default (recorded in ``to_dict``).

    Raises
    ------
    VelocityError
        Zero, negative, non-finite or implausible velocity.

    Notes
    -----
    Two-way time is there and back, hence the factor 1/2 (common practice,
    no source).

    Examples
    --------
    >>> ConstantVelocity(2500).depth_m([0, 1000, 2000]).tolist()
    [0.0, 1250.0, 2500.0]
    >>> ConstantVelocity(2500).to_dict()
    {'model': 'constant', 'velocity_m_s': 2500.0}
    """

    name = "constant"

    def __init__(self, v_m_s: float, *, fallback: str | None = None):
        self.v_m_s = float(check_velocities(v_m_s, what="velocity", source="constant velocity model"))
        self.fallback = fallback

    def _depth(self, t, tr):
        return self.v_m_s * (t / MS_PER_S) / 2.0

    def _twt(self, z, tr):
        return 2.0 * z / self.v_m_s * MS_PER_S

    def _vint(self, t, tr):
        return np.where(np.isnan(t), np.nan, np.full(t.shape, self.v_m_s))

    def scaled(self, factor):
        return ConstantVelocity(self.v_m_s * self._check_factor(factor))

    def to_dict(self):
        return self._base_dict({"velocity_m_s": self.v_m_s})

    def describe(self):
        tag = " (default)" if self.fallback else ""
        return f"constant velocity {self.v_m_s:g} m/s{tag}"


class LinearVelocity(VelocityModel):
    """Velocity increasing linearly with depth: ``v(z) = v0 + k z``.

    Parameters
    ----------
    v0_m_s : float, m/s
        Velocity at time zero.
    k_per_s : float, 1/s
        Gradient dv/dz, 0 <= k <= ``MAX_GRADIENT_PER_S`` (``k = 0`` is a
        constant velocity).

    Raises
    ------
    VelocityError
        Implausible ``v0``, or a negative, non-finite or implausibly steep
        gradient (a negative gradient drives the velocity to zero at depth
        ``v0 / |k|``; use a table for a velocity inversion).

    Notes
    -----
    With ``dz/dt = v(z) / 2`` (t two-way, in s) the closed forms are [1]_:

    * ``z(t) = (v0 / k) (exp(k t / 2) - 1)``
    * ``t(z) = (2 / k) ln(1 + k z / v0)``
    * interval velocity at time t: ``v0 exp(k t / 2)``

    ``scaled(f)`` multiplies the velocity at every *time* by ``f``, which for
    this model is ``v0 -> f v0`` with ``k`` unchanged, so depths scale by
    ``f`` exactly as for the other models.

    References
    ----------
    .. [1] Sheriff, R. E. & Geldart, L. P. (1995). Exploration Seismology,
       2nd ed. Cambridge University Press (from memory); the result goes
       back to Slotnick, M. M. (1959), Lessons in Seismic Computing, SEG
       (from memory).

    Examples
    --------
    >>> m = LinearVelocity(2000, 0.5)
    >>> round(float(m.depth_m(1000)), 3)
    1136.102
    >>> round(float(m.twt_ms(m.depth_m(1000))), 9)
    1000.0
    """

    name = "linear"

    def __init__(self, v0_m_s: float, k_per_s: float):
        self.v0_m_s = float(check_velocities(v0_m_s, what="v0", source="linear velocity model"))
        k = float(k_per_s)
        if not np.isfinite(k):
            raise VelocityError(f"linear velocity model: gradient k is {k_per_s!r}; give a number in 1/s")
        if k < 0:
            raise VelocityError(
                f"linear velocity model: gradient k = {k:g} 1/s is negative, so the velocity falls to zero "
                f"at {self.v0_m_s / -k:g} m depth; give k >= 0, or a velocity table for a velocity inversion"
            )
        if k > MAX_GRADIENT_PER_S:
            raise VelocityError(
                f"linear velocity model: gradient k = {k:g} 1/s is implausibly steep (above "
                f"{MAX_GRADIENT_PER_S:g} 1/s the velocity doubles in under 0.28 s of two-way time); "
                "k is in 1/s, e.g. 0.6"
            )
        self.k_per_s = k

    def _depth(self, t, tr):
        ts = t / MS_PER_S
        if self.k_per_s == 0:
            return self.v0_m_s * ts / 2.0
        k = self.k_per_s
        return (self.v0_m_s / k) * np.expm1(k * ts / 2.0)

    def _twt(self, z, tr):
        if self.k_per_s == 0:
            return 2.0 * z / self.v0_m_s * MS_PER_S
        k = self.k_per_s
        arg = k * z / self.v0_m_s
        with np.errstate(invalid="ignore", divide="ignore"):
            t = (2.0 / k) * np.log1p(arg) * MS_PER_S
        # above time zero the model v(z) reaches 0 at z = -v0/k: no time there
        return np.where(arg > -1, t, np.nan)

    def _vint(self, t, tr):
        return self.v0_m_s * np.exp(self.k_per_s * (t / MS_PER_S) / 2.0)

    def scaled(self, factor):
        return LinearVelocity(self.v0_m_s * self._check_factor(factor), self.k_per_s)

    def to_dict(self):
        return self._base_dict({"v0_m_s": self.v0_m_s, "k_per_s": self.k_per_s})

    def describe(self):
        return f"linear velocity v(z) = {self.v0_m_s:g} m/s + {self.k_per_s:g} 1/s * z"

