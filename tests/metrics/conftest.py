"""Hand-built margins with analytic depth profiles (no picker involved).

``build_margin`` encodes a depth profile ``depth(x)`` on a line of evenly
spaced traces, optionally converts it to two-way time with a velocity model,
and returns ``(picks, section)`` with the break and toe at given traces, so
every expected value can be read off the analytic profile.
"""

import numpy as np
import pytest

from clinometry.picking.picks import ClinoformPicks, Horizon, MarginPicks, PickPoint, Picks
from clinometry.section import make_section


def _build(depth_fn, *, n_trace=121, spacing_m=25.0, break_trace=40, toe_trace=80, direction="+",
           velocity=None, clinoforms=(), top_fn=None, dz=4.0):
    """(picks, section).

    depth_fn(x_m) gives depth (m) at basinward distance x from trace 0 (or
    from the last trace when direction is "-").  clinoforms: list of
    (depth_fn, break_trace, toe_trace) in basinward trace counts, oldest first.
    """
    idx = np.arange(n_trace)
    basinward = idx * spacing_m if direction == "+" else (n_trace - 1 - idx) * spacing_m

    def to_trace(k):  # basinward trace count -> section trace index
        return k if direction == "+" else n_trace - 1 - k

    def z_of(depth, trace):
        if velocity is None:
            return depth
        return velocity.twt_ms(depth, trace=trace)

    horizons = []
    d = depth_fn(basinward)
    zc = z_of(d, idx)
    horizons.append(Horizon(0, "margin_profile", idx, zc, np.ones(n_trace)))
    top_id = 0
    if top_fn is not None:
        horizons.append(Horizon(1, "platform_top", idx, z_of(top_fn(basinward), idx), np.ones(n_trace)))
        top_id = 1
    clinos = []
    for j, (fn, b, t) in enumerate(clinoforms):
        hid = 10 + j
        zz = z_of(fn(basinward), idx)
        horizons.append(Horizon(hid, "clinoform", idx, zz, np.ones(n_trace)))
        bp = None if b is None else PickPoint(to_trace(b), float(zz[to_trace(b)]))
        tp = None if t is None else PickPoint(to_trace(t), float(zz[to_trace(t)]))
        clinos.append(ClinoformPicks(hid, bp, tp, "" if bp else "no break in test", "" if tp else "no toe in test"))
    brk = None if break_trace is None else PickPoint(to_trace(break_trace), float(zc[to_trace(break_trace)]))
    toe = None if toe_trace is None else PickPoint(to_trace(toe_trace), float(zc[to_trace(toe_trace)]))
    margin = MarginPicks(direction, 0, top_id, brk, toe, tuple(clinos), 0.9,
                         "" if brk else "no rollover found (test)", "" if toe else "no toe found (test)")
    zall = np.concatenate([h.z for h in horizons])
    zmax = float(np.max(zall[np.isfinite(zall)])) + 50 * dz
    z = np.arange(0.0, zmax, dz)
    section = make_section(np.zeros((n_trace, z.size), dtype=np.float32), z=z,
                           domain="twt" if velocity is not None else "depth",
                           x=1000.0 + idx * spacing_m * 0.6, y=2000.0 + idx * spacing_m * 0.8,
                           attrs={"source_path": "test_line.sgy"})
    return Picks(horizons=tuple(horizons), margins=(margin,), picker="hand"), section


@pytest.fixture
def build_margin():
    return _build


def planar_foreset(angle_deg, *, top_m=200.0, x_break=1000.0, x_toe=2000.0):
    """Flat top at ``top_m``, planar foreset of ``angle_deg`` from x_break to x_toe, flat floor."""
    g = np.tan(np.radians(angle_deg))

    def fn(x):
        x = np.asarray(x, dtype=float)
        return top_m + g * np.clip(x - x_break, 0.0, x_toe - x_break)

    return fn


@pytest.fixture
def planar():
    return planar_foreset
