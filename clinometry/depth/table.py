"""Velocity from a table of (two-way time, velocity) pairs, interval or RMS.

The usual velocity information of a line is a short table: a velocity
function from a stacking-velocity analysis (RMS) or from a well (interval).
Interval velocity is taken as constant between table times, so depth is
piecewise linear in time and converting back is exact.  RMS tables go
through the Dix (1955) equation first (:mod:`clinometry.depth.dix`).
:func:`read_velocity_table` reads such a table from a text or CSV file.
"""

from __future__ import annotations

import logging
import os
import re

import numpy as np

from ..errors import VelocityError
from ._plausibility import MIN_TABLE_SPAN_MS, MS_PER_S, check_velocities
from .dix import check_table_times, interval_to_rms, rms_to_interval
from .models import VelocityModel

__all__ = ["TableVelocity", "read_velocity_table"]

logger = logging.getLogger(__name__)

#: separators between the columns of a velocity table
_SPLIT = re.compile(r"[,;\s]+")


class TableVelocity(VelocityModel):
    """Velocity from a table of (two-way time, velocity) pairs.

    Parameters
    ----------
    twt_ms : array_like, shape (n,), ms
        Two-way times, >= 0 and strictly increasing.
    velocity_m_s : array_like, shape (n,), m/s
        Interval or RMS velocity at each time.
    kind : {"interval", "rms"}
        ``"rms"`` tables are converted to interval velocities with Dix (1955).
    source : str, optional
        File the table came from (for messages and ``to_dict``).

    Raises
    ------
    VelocityError
        Unknown kind, mismatched lengths, times not increasing, implausible
        velocities, or an RMS table whose Dix inversion is imaginary.

    Notes
    -----
    Each velocity belongs to the layer whose base is at its time: the layer
    from the previous table time (or time zero) down to it.  Interval
    velocity is constant inside a layer; above time zero the first velocity
    and below the last time the last velocity are extended.  Depth is
    therefore piecewise linear in time, ``z_n = sum v_i (t_i - t_{i-1}) / 2``,
    and inverting it is exact.  For an RMS table, the interval velocities
    come from the Dix (1955) equation [1]_.

    References
    ----------
    .. [1] Dix, C. H. (1955). Seismic velocities from surface measurements.
       Geophysics 20(1), 68-86. doi:10.1190/1.1438126

    Examples
    --------
    >>> m = TableVelocity([1000, 2000], [2000, 3000])
    >>> m.depth_m([500, 1000, 1500, 2000, 2500]).tolist()
    [500.0, 1000.0, 1750.0, 2500.0, 3250.0]
    """

    name = "table"

    def __init__(self, twt_ms, velocity_m_s, kind: str = "interval", *, source: str = ""):
        if kind not in ("interval", "rms"):
            raise VelocityError(f"{source + ': ' if source else ''}velocity kind must be 'interval' or 'rms', got {kind!r}")
        t = check_table_times(twt_ms, source=source)
        v = np.asarray(velocity_m_s, dtype=np.float64)
        if v.shape != t.shape:
            raise VelocityError(
                f"{source + ': ' if source else ''}velocity table has {t.size} times but {v.size} velocities; "
                "give one velocity per time"
            )
        if t.size > 1 and t[-1] < MIN_TABLE_SPAN_MS:
            raise VelocityError(
                f"{source + ': ' if source else ''}velocity table ends at {t[-1]:g} ms two-way time; the times "
                "look like seconds: give them in ms"
            )
        if kind == "rms":
            v_int = rms_to_interval(t, v, source=source)
        else:
            v_int = check_velocities(v, what="interval velocity", source=source)
        self.kind = kind
        self.source = source
        self.table_twt_ms = t
        self.table_velocity_m_s = v
        self.v_int_m_s = v_int
        # layer tops (the base of layer i is t[i]); the last layer is extended below
        self._tops = np.concatenate([[0.0], t])[: t.size]
        thick = np.diff(self._tops)
        self._ztops = np.concatenate([[0.0], np.cumsum(v_int[:-1] * thick / MS_PER_S / 2.0)])

    def _layer_from_time(self, t):
        k = np.searchsorted(self._tops, t, side="right") - 1
        return np.clip(k, 0, self._tops.size - 1)

    def _depth(self, t, tr):
        k = self._layer_from_time(t)
        return self._ztops[k] + self.v_int_m_s[k] * ((t - self._tops[k]) / MS_PER_S) / 2.0

    def _twt(self, z, tr):
        k = np.clip(np.searchsorted(self._ztops, z, side="right") - 1, 0, self._ztops.size - 1)
        return self._tops[k] + 2.0 * (z - self._ztops[k]) / self.v_int_m_s[k] * MS_PER_S

    def _vint(self, t, tr):
        # a layer includes its base time: (t_{i-1}, t_i] has velocity v_i
        k = np.clip(np.searchsorted(self._tops, t, side="left") - 1, 0, self._tops.size - 1)
        return np.where(np.isnan(t), np.nan, self.v_int_m_s[k])

    def rms_velocity(self) -> np.ndarray:
        """RMS velocity at each table time (Dix 1955), m/s."""
        return interval_to_rms(self.table_twt_ms, self.v_int_m_s, source=self.source)

    def scaled(self, factor):
        f = self._check_factor(factor)
        return TableVelocity(self.table_twt_ms, self.table_velocity_m_s * f, self.kind, source=self.source)

    def to_dict(self):
        d = {
            "kind": self.kind,
            "twt_ms": self.table_twt_ms.tolist(),
            "velocity_m_s": self.table_velocity_m_s.tolist(),
        }
        if self.kind == "rms":
            d["interval_velocity_m_s"] = self.v_int_m_s.tolist()
        if self.source:
            d["source"] = self.source
        return self._base_dict(d)

    def describe(self):
        src = f" from {self.source}" if self.source else ""
        return (
            f"{self.kind} velocity table{src}: {self.table_twt_ms.size} rows, "
            f"{self.table_twt_ms[0]:g}-{self.table_twt_ms[-1]:g} ms, "
            f"interval {self.v_int_m_s.min():g}-{self.v_int_m_s.max():g} m/s"
        )


def read_velocity_table(path, *, kind: str = "interval") -> TableVelocity:
    """Read a two-column text/CSV table of two-way time (ms) and velocity (m/s).

    Parameters
    ----------
    path : str or os.PathLike
        Text file; columns separated by commas, semicolons, tabs or spaces;
        ``#`` starts a comment; one header line of column names is allowed.
    kind : {"interval", "rms"}

    Returns
    -------
    TableVelocity

    Raises
    ------
    VelocityError
        No rows, a row without exactly two numbers (the message names file
        and line), or any check of :class:`TableVelocity`.
    OSError
        The file cannot be opened.

    Examples
    --------
    >>> import tempfile, pathlib
    >>> with tempfile.TemporaryDirectory() as folder:
    ...     p = pathlib.Path(folder) / "v.csv"
    ...     _ = p.write_text("twt_ms,velocity_m_s\\n0,1800\\n1000,2600\\n")
    ...     print(read_velocity_table(p).describe())
    interval velocity table from v.csv: 2 rows, 0-1000 ms, interval 1800-2600 m/s
    """
    fname = os.path.basename(os.fspath(path))
    times, vels = [], []
    with open(path, encoding="utf-8", errors="replace") as fh:
        for lineno, raw in enumerate(fh, start=1):
            line = raw.split("#", 1)[0].strip()
            if not line:
                continue
            cols = [c for c in _SPLIT.split(line) if c]
            try:
                vals = [float(c) for c in cols]
            except ValueError as err:
                if not times and all(re.match(r"^[A-Za-z_]", c) for c in cols):
                    continue  # a header line of column names
                raise VelocityError(
                    f"{fname} line {lineno}: {line!r} is not two numbers (two-way time in ms, velocity in m/s)"
                ) from err
            if len(vals) != 2:
                raise VelocityError(
                    f"{fname} line {lineno}: expected 2 columns (two-way time ms, velocity m/s), found {len(vals)}"
                )
            times.append(vals[0])
            vels.append(vals[1])
    if not times:
        raise VelocityError(f"{fname}: no velocity rows found; expected lines of 'twt_ms, velocity_m_s'")
    model = TableVelocity(times, vels, kind, source=fname)
    logger.info("velocity: %s", model.describe())
    return model
