"""A velocity that varies along the line: a velocity section or volume.

Velocity fields usually come as SEG-Y files with one velocity trace per CDP
(2D) or per inline/crossline bin (3D), sampled in two-way time.  Each
velocity trace is matched to a seismic trace -- by inline and crossline
numbers, else by CDP number, else by position when the trace counts agree --
and time-depth conversion is done per trace:

* interval velocities are point samples of v(t); depth is their cumulative
  trapezoidal integral ``z(t) = integral_0^t v / 2 dt`` (second-order
  accurate for smooth fields);
* RMS velocities are first turned into layer (interval) velocities with the
  Dix (1955) equation, trace by trace; each layer then has a constant
  velocity and depth is exact at the samples.

Between samples depth is interpolated linearly in time; above the first
sample the first velocity and below the last the last velocity are
extended.  Matching refuses to guess: a section trace without a velocity
trace is an error that names the trace and the numbers seen.
"""

from __future__ import annotations

import logging
import os

import numpy as np

from ..errors import GeometryError, VelocityError
from ..section import section_name
from ._plausibility import MS_PER_S, check_velocities
from .dix import rms_to_interval
from ._matching import LATERAL_MODES, lines_to_read, match_traces
from .models import VelocityModel

logger = logging.getLogger(__name__)

__all__ = ["SectionVelocity"]


class SectionVelocity(VelocityModel):
    """Velocity per trace and per two-way-time sample.

    Parameters
    ----------
    velocity_m_s : array_like, shape (n_trace, n_t), m/s
        Velocity of each seismic trace (already matched: row ``i`` belongs to
        section trace ``i``) at each time of ``twt_ms``.
    twt_ms : array_like, shape (n_t,), ms
        Sample times of the velocity traces, strictly increasing.
    kind : {"interval", "rms"}
        RMS velocities are converted to interval velocities by Dix (1955).
    source : str, optional
        Velocity file name (messages and ``to_dict``).
    matched_by : str, optional
        How traces were matched (recorded in ``to_dict``).

    Raises
    ------
    VelocityError
        Wrong shapes, times not increasing, implausible velocities (the
        message names trace and sample), or imaginary Dix velocities.

    See Also
    --------
    SectionVelocity.from_section, SectionVelocity.from_segy

    Notes
    -----
    Interval kind: ``z(t_j) = sum (v_{j-1} + v_j) / 2 * (t_j - t_{j-1}) / 2``
    (trapezoid rule), with a constant ``v_0`` from time zero to the first
    sample.  RMS kind: Dix (1955) interval velocities [1]_, each constant over
    the layer that ends at its sample.

    References
    ----------
    .. [1] Dix, C. H. (1955). Seismic velocities from surface measurements.
       Geophysics 20(1), 68-86. doi:10.1190/1.1438126

    Examples
    --------
    >>> v = np.array([[2000.0, 2000.0], [3000.0, 3000.0]])
    >>> m = SectionVelocity(v, twt_ms=[0, 1000])
    >>> m.depth_m([1000, 1000], trace=[0, 1]).tolist()
    [1000.0, 1500.0]
    """

    name = "section"
    laterally_varying = True

    def __init__(self, velocity_m_s, *, twt_ms, kind: str = "interval", source: str = "", matched_by: str = "trace"):
        label = source or "velocity section"
        if kind not in ("interval", "rms"):
            raise VelocityError(f"{label}: velocity kind must be 'interval' or 'rms', got {kind!r}")
        t = np.asarray(twt_ms, dtype=np.float64)
        v = np.asarray(velocity_m_s, dtype=np.float64)
        if v.ndim != 2 or t.ndim != 1 or v.shape[1] != t.size or t.size < 1 or v.shape[0] < 1:
            raise VelocityError(f"{label}: velocity must be (n_trace, n_t) with n_t = {t.size} times, got shape {v.shape}")
        if not np.all(np.isfinite(t)) or np.any(np.diff(t) <= 0):
            raise VelocityError(f"{label}: velocity sample times are not strictly increasing; check the sample interval")
        if kind == "rms":
            v_int = rms_to_interval(t, v, source=label)
            tk = t if t[0] == 0 else np.concatenate([[0.0], t])
            vlay = v_int if t[0] == 0 else np.concatenate([v_int[:, :1], v_int], axis=1)
            dz = vlay[:, 1:] * np.diff(tk) / MS_PER_S / 2.0
        else:
            v_int = check_velocities(v, what="interval velocity", source=label)
            tk = t if t[0] <= 0 else np.concatenate([[0.0], t])
            vk = v_int if tk.size == t.size else np.concatenate([v_int[:, :1], v_int], axis=1)
            dz = 0.5 * (vk[:, 1:] + vk[:, :-1]) * np.diff(tk) / MS_PER_S / 2.0
        zk = np.concatenate([np.zeros((v.shape[0], 1)), np.cumsum(dz, axis=1)], axis=1)
        if tk[0] < 0:  # negative delay: put depth 0 at time zero
            zk = zk - np.array([np.interp(0.0, tk, row) for row in zk])[:, None]
        self._setup(tk, zk, v_int, t, kind, source, matched_by)

    def _setup(self, tk, zk, v_int, t, kind, source, matched_by):
        self.kind = kind
        self.source = source
        self.matched_by = matched_by
        self.twt_axis_ms = t
        self.v_int_m_s = v_int
        self._tk = tk
        self._zk = zk
        self._v_top = v_int[:, 0]
        self._v_bottom = v_int[:, -1]

    @property
    def n_trace(self) -> int:
        """Number of section traces the model covers."""
        return self._zk.shape[0]

    # -- conversions --------------------------------------------------------
    def _traces(self, tr):
        if tr is None:
            raise VelocityError(
                f"{self.source or 'velocity section'}: a velocity section needs the trace index of each value "
                "(pass trace=)"
            )
        if tr.size and (tr.min() < 0 or tr.max() >= self.n_trace):
            bad = int(tr[(tr < 0) | (tr >= self.n_trace)].flat[0])
            raise VelocityError(
                f"{self.source or 'velocity section'}: trace {bad} is outside the {self.n_trace} traces "
                "the velocity was matched to; match it to this section first"
            )
        return tr

    def _depth(self, t, tr):
        tr = self._traces(tr)
        tk, zk = self._tk, self._zk
        i = np.clip(np.searchsorted(tk, t, side="right") - 1, 0, max(tk.size - 2, 0))
        if tk.size > 1:
            w = (t - tk[i]) / (tk[i + 1] - tk[i])
            z = zk[tr, i] * (1 - w) + zk[tr, i + 1] * w
        else:
            z = zk[tr, 0] + self._v_top[tr] * (t - tk[0]) / MS_PER_S / 2.0
        above = t < tk[0]
        below = t > tk[-1]
        z = np.where(above, zk[tr, 0] + self._v_top[tr] * (t - tk[0]) / MS_PER_S / 2.0, z)
        z = np.where(below, zk[tr, -1] + self._v_bottom[tr] * (t - tk[-1]) / MS_PER_S / 2.0, z)
        return z

    def _twt(self, z, tr):
        tr = self._traces(tr)
        out = np.full(z.shape, np.nan)
        if not z.size:
            return out
        tk = self._tk
        flat_z, flat_tr = z.ravel(), tr.ravel()
        order = np.argsort(flat_tr, kind="stable")  # group values by trace once
        traces, starts = np.unique(flat_tr[order], return_index=True)
        flat_out = out.ravel()
        for k, sel in zip(traces, np.split(order, starts[1:])):
            zk = self._zk[k]
            zz = flat_z[sel]
            t = np.interp(zz, zk, tk)
            t = np.where(zz < zk[0], tk[0] + 2.0 * (zz - zk[0]) / self._v_top[k] * MS_PER_S, t)
            t = np.where(zz > zk[-1], tk[-1] + 2.0 * (zz - zk[-1]) / self._v_bottom[k] * MS_PER_S, t)
            flat_out[sel] = np.where(np.isnan(zz), np.nan, t)
        return flat_out.reshape(z.shape)

    def _vint(self, t, tr):
        tr = self._traces(tr)
        ts = self.twt_axis_ms
        if self.kind == "rms":  # layer ending at each sample
            i = np.clip(np.searchsorted(ts, t, side="left"), 0, ts.size - 1)
            v = self.v_int_m_s[tr, i]
        else:
            i = np.clip(np.searchsorted(ts, t, side="right") - 1, 0, max(ts.size - 2, 0))
            if ts.size > 1:
                w = np.clip((t - ts[i]) / (ts[i + 1] - ts[i]), 0.0, 1.0)
                v = self.v_int_m_s[tr, i] * (1 - w) + self.v_int_m_s[tr, i + 1] * w
            else:
                v = self.v_int_m_s[tr, 0] + 0 * t
        return np.where(np.isnan(t), np.nan, v)

    def scaled(self, factor):
        f = self._check_factor(factor)
        new = object.__new__(SectionVelocity)
        new._setup(self._tk, self._zk * f, self.v_int_m_s * f, self.twt_axis_ms, self.kind, self.source, self.matched_by)
        return new

    def to_dict(self):
        return self._base_dict(
            {
                "kind": self.kind,
                "source": self.source,
                "matched_by": self.matched_by,
                "n_traces": int(self.n_trace),
                "twt_range_ms": [float(self.twt_axis_ms[0]), float(self.twt_axis_ms[-1])],
                "interval_velocity_range_m_s": [float(self.v_int_m_s.min()), float(self.v_int_m_s.max())],
            }
        )

    def describe(self):
        return (
            f"{self.kind} velocity section {self.source or ''} ({self.n_trace} traces matched by "
            f"{self.matched_by}, interval {self.v_int_m_s.min():.0f}-{self.v_int_m_s.max():.0f} m/s)"
        ).replace("section  (", "section (")

    # -- building from sections and files -----------------------------------
    @classmethod
    def from_section(cls, velocity_section, section, *, kind: str = "interval", lateral: str = "exact") -> "SectionVelocity":
        """Match a velocity section (DataArray) to a seismic section, trace by trace.

        Parameters
        ----------
        velocity_section : xarray.DataArray, dims ("trace", "z")
            Velocities in m/s in two-way time (``attrs["domain"] == "twt"``),
            e.g. from :func:`clinometry.io.read_section`.
        section : xarray.DataArray, dims ("trace", "z")
            The seismic section the velocities are for.
        kind : {"interval", "rms"}
        lateral : {"exact", "linear"}
            ``"exact"``: every seismic trace needs its own velocity trace.
            ``"linear"``: traces between velocity CDPs (2D) or inside a
            coarser regular inline/crossline grid (3D) get velocities
            interpolated linearly (bilinearly in 3D); never outside it.

        Returns
        -------
        SectionVelocity
            One velocity trace per seismic trace; ``matched_by`` says how.

        Raises
        ------
        VelocityError
            The velocity is not in two-way time, or a seismic trace has no
            velocity trace (the message names trace, numbers and files).

        Notes
        -----
        Matching keys, first usable wins: (inline, crossline) when both
        sections have them and they are unique in the velocity section;
        then CDP; then position when the trace counts agree (common
        practice, no source).  Velocities (interval or RMS as given) are
        interpolated before any Dix conversion.

        Examples
        --------
        >>> from clinometry.section import make_section
        >>> vel = make_section(np.array([[2000.0, 2000.0], [3000.0, 3000.0]]), z=[0, 1000], cdp=[10, 20])
        >>> seis = make_section(np.zeros((3, 2)), z=[0, 4], cdp=[10, 15, 20])
        >>> m = SectionVelocity.from_section(vel, seis, lateral="linear")
        >>> m.matched_by, m.depth_m(1000, trace=[0, 1, 2]).tolist()
        ('cdp, interpolated', [1000.0, 1250.0, 1500.0])
        """
        vname = section_name(velocity_section)
        sname = section_name(section)
        if velocity_section.attrs.get("domain", "twt") != "twt":
            raise VelocityError(
                f"{vname}: velocity section is in {velocity_section.attrs.get('domain')}, not two-way time; "
                "give a velocity file sampled in TWT (ms)"
            )
        vs = velocity_section.transpose("trace", "z")
        index, weight, how = match_traces(vs, section, vname, sname, lateral=lateral)
        values = np.asarray(vs.values, dtype=np.float64)
        vel = np.einsum("tk,tkz->tz", weight, values[index])
        src = os.path.basename(velocity_section.attrs.get("source_path", "")) or vname
        model = cls(vel, twt_ms=np.asarray(vs["z"].values, dtype=np.float64), kind=kind, source=src, matched_by=how)
        logger.info("velocity %s matched to %s by %s", src, sname, how)
        return model

    @classmethod
    def from_segy(cls, path, *, section, kind: str = "interval", lateral: str = "exact", **read_options) -> "SectionVelocity":
        """Read a velocity SEG-Y (2D section or 3D volume) and match it to ``section``.

        Parameters
        ----------
        path : str or os.PathLike
            Velocity SEG-Y, sampled in two-way time, velocities in m/s.
        section : xarray.DataArray, dims ("trace", "z")
            Seismic section to match.  For a 3D volume the section needs
            ``inline`` and ``crossline`` coordinates; it may be an inline, a
            crossline or any line through the volume.
        kind : {"interval", "rms"}
        lateral : {"exact", "linear"}
            See :meth:`from_section`.
        **read_options
            Passed to :func:`clinometry.io.read_section` (e.g. ``header_bytes``).

        Returns
        -------
        SectionVelocity

        Raises
        ------
        VelocityError
            Geometry mismatch between the velocity file and the section.
        SegyReadError
            The file cannot be read (from :mod:`clinometry.io`).

        Notes
        -----
        Only the velocity lines the section needs are read (the same inline
        or crossline, or the ones bracketing it with ``lateral="linear"``),
        never the whole volume at once.
        """
        from ..io import is_3d, iter_sections, line_numbers, read_section

        if lateral not in LATERAL_MODES:
            raise VelocityError(f"lateral must be one of {LATERAL_MODES}, got {lateral!r}")
        fname = os.path.basename(os.fspath(path))
        sname = section_name(section)
        hb = read_options.get("header_bytes")
        if not is_3d(path, header_bytes=hb):
            vsec = read_section(path, domain="twt", **read_options)
            return cls.from_section(vsec, section, kind=kind, lateral=lateral)
        if "inline" not in section.coords or "crossline" not in section.coords:
            raise VelocityError(
                f"{fname} is a 3D velocity volume but {sname} has no inline/crossline "
                "numbers to match it by; read the seismic with its inline/crossline header bytes"
            )
        ils = np.unique(section["inline"].values)
        xls = np.unique(section["crossline"].values)
        # read along the direction that needs the fewest velocity lines
        direction, wanted = ("inline", ils) if ils.size <= xls.size else ("crossline", xls)
        available = line_numbers(path, direction=direction, header_bytes=hb)
        need = lines_to_read(available, wanted, lateral=lateral)
        if not need:
            raise VelocityError(
                f"{fname} does not match {sname}: the line needs {direction}s {wanted.min()}-{wanted.max()} but the "
                f"velocity volume has {direction}s {min(available)}-{max(available)}; give a velocity volume that "
                "covers the line"
            )
        try:
            if len(need) == 1:
                vsec = read_section(path, domain="twt", **{direction: need[0]}, **read_options)
            else:
                import xarray as xr

                parts = list(iter_sections(path, direction=direction, lines=need, domain="twt", **read_options))
                vsec = xr.concat(parts, dim="trace", combine_attrs="override").transpose("trace", "z")
                vsec = vsec.assign_coords(trace=np.arange(vsec.sizes["trace"]))
        except GeometryError as err:
            raise VelocityError(f"{fname} does not match {sname}: {err}") from err
        vsec.attrs.setdefault("source_path", os.fspath(path))
        logger.debug("%s: read %d velocity %s(s) for %s", fname, len(need), direction, sname)
        return cls.from_section(vsec, section, kind=kind, lateral=lateral)
