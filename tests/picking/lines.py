"""A small, independent generator of test lines with known margin geometry.

Kept apart from ``clinometry.synth`` on purpose: the picker is tested on
lines made by two different forward models.  Geometry is analytic: a flat
platform top, a planar foreset at a chosen angle with a Gaussian-rounded
break and toe, a flat basin floor; older clinoforms are the same profile
shifted landward and deeper (progradation with aggradation); flat basin-fill
layers above the slope onlap it.  The break and toe of the truth are the
kinks of the planar profile, so they do not depend on any smoothing.

Seismic: normal-incidence reflection coefficients placed at each surface's
two-way time in every trace (constant velocity), convolved with a Ricker
wavelet r(t) = (1 - 2 pi^2 f^2 t^2) exp(-pi^2 f^2 t^2) (Ricker 1953, from
memory); noise is white noise through the same wavelet, scaled so that
SNR = RMS(signal) / RMS(noise).
"""

from __future__ import annotations

import numpy as np
from scipy import ndimage, signal

from clinometry.section import make_section


def ricker(f_hz, dt_ms):
    t = np.arange(-1.5 / f_hz, 1.5 / f_hz + 1e-9, dt_ms * 1e-3)
    a = (np.pi * f_hz * t) ** 2
    return (1 - 2 * a) * np.exp(-a)


def _profile(x, kind, xb, width, top, relief, round_m):
    if kind == "isolated":
        # platform between xb and x[-1] - xb; foresets fall away on both sides
        xr = x[-1] - xb
        t = np.maximum(xb - x, x - xr) / width
    else:
        t = (x - xb) / width
    d = top + relief * np.clip(t, 0.0, 1.0)
    dx = x[1] - x[0]
    return ndimage.gaussian_filter1d(d, round_m / dx, mode="nearest") if round_m > 0 else d


def make_test_line(
    kind="rimmed",
    *,
    n_trace=400,
    dx_m=25.0,
    dt_ms=2.0,
    n_samples=400,
    f_hz=30.0,
    v_m_s=2800.0,
    slope_deg=20.0,
    relief_m=300.0,
    top_m=300.0,
    break_at=0.4,
    n_clinoforms=3,
    progradation_m=250.0,
    aggradation_m=20.0,
    snr=None,
    seed=0,
    dead=(),
    flip_polarity_from=None,
    gain_drift=1.0,
    round_m=30.0,
    domain="twt",
):
    """Return (section, truth) for one line.

    kind: "rimmed", "steep", "ramp" (all a single margin facing "+"),
    "isolated" (two margins), "flat" (no margin), "mirrored" (one margin
    facing "-").  ``truth["margins"]`` lists per margin direction, break and
    toe trace, depth_m, relief_m, slope_max_deg.
    """
    rng = np.random.default_rng(seed)
    x = np.arange(n_trace) * dx_m
    width = relief_m / np.tan(np.radians(slope_deg))
    xb = break_at * x[-1]
    truth = {"margins": []}
    surfaces = []  # (depth array, reflection coefficient)
    if kind == "flat":
        for k, dep in enumerate(np.linspace(top_m, top_m + relief_m, 6)):
            surfaces.append((np.full(n_trace, dep) + 5.0 * np.sin(x / 3000.0 + k), 0.08 if k == 0 else 0.04))
    else:
        prof = _profile(x, "isolated" if kind == "isolated" else "margin", xb, width, top_m, relief_m, round_m)
        if kind == "mirrored":
            prof = prof[::-1]
        surfaces.append((prof, 0.15))
        # older clinoforms beneath (landward-shifted and deeper), merged under the profile
        for k in range(1, n_clinoforms + 1):
            shift = k * progradation_m
            if kind == "isolated":
                old = _profile(x, "isolated", xb + shift, width, top_m + k * aggradation_m, relief_m - k * aggradation_m, round_m)
            else:
                old = _profile(x, "margin", xb - shift, width, top_m + k * aggradation_m, relief_m - k * aggradation_m, round_m)
                if kind == "mirrored":
                    old = old[::-1]
            surfaces.append((np.maximum(old, prof + 1.0), 0.05 * (-1) ** k))
        # flat basin-fill layers above the slope, onlapping it
        for dep in np.arange(top_m + 0.35 * relief_m, top_m + relief_m, 0.3 * relief_m):
            layer = np.where(prof > dep + 2.0, dep, np.nan)
            surfaces.append((layer, 0.03))
        surfaces.append((np.full(n_trace, top_m + relief_m + 120.0), -0.06))  # substrate
        if kind == "isolated":
            ib, it = int(round(xb / dx_m)), int(round((xb - width) / dx_m))
            truth["margins"].append(_truth("-", ib, it, prof, slope_deg, relief_m))
            jb, jt = n_trace - 1 - ib, n_trace - 1 - it
            truth["margins"].append(_truth("+", jb, jt, prof, slope_deg, relief_m))
        else:
            ib, it = int(round(xb / dx_m)), int(round((xb + width) / dx_m))
            if kind == "mirrored":
                ib, it = n_trace - 1 - ib, n_trace - 1 - it
            truth["margins"].append(_truth("-" if kind == "mirrored" else "+", ib, it, prof, slope_deg, relief_m))
    z = np.arange(n_samples) * dt_ms if domain == "twt" else np.arange(n_samples) * dt_ms
    refl = np.zeros((n_trace, n_samples))
    rows = np.arange(n_trace)
    for dep, rc in surfaces:
        zz = 2000.0 * dep / v_m_s if domain == "twt" else dep
        pos = zz / dt_ms
        ok = np.isfinite(pos) & (pos >= 0) & (pos < n_samples - 1)
        i0 = np.floor(pos[ok]).astype(int)
        w = pos[ok] - i0
        np.add.at(refl, (rows[ok], i0), rc * (1 - w))
        np.add.at(refl, (rows[ok], i0 + 1), rc * w)
    if domain == "twt":
        wav = ricker(f_hz, dt_ms)
    else:  # a depth-domain wavelet: period v / (2 f) in m, i.e. 2000 f / v cycles per 1000 m
        wav = ricker(2000.0 * f_hz / v_m_s, dt_ms)
    data = signal.fftconvolve(refl, wav[None, :], mode="same", axes=1)
    if snr is not None and np.isfinite(snr):
        noise = signal.fftconvolve(rng.standard_normal(data.shape), wav[None, :], mode="same", axes=1)
        noise *= np.sqrt(np.mean(data**2)) / np.sqrt(np.mean(noise**2)) / snr
        data = data + noise
    data = data * np.exp(np.linspace(0.0, np.log(gain_drift), n_trace))[:, None]
    if flip_polarity_from is not None:
        data[flip_polarity_from:] *= -1
    for d in dead:
        data[d] = 0.0
    sec = make_section(data.astype(np.float32), z=z, domain=domain, distance=x)
    return sec, truth


def _truth(direction, ib, it, prof, slope_deg, relief_m):
    return {
        "direction": direction,
        "break_trace": ib,
        "toe_trace": it,
        "break_depth_m": float(prof[ib]),
        "relief_m": float(relief_m),
        "slope_max_deg": float(slope_deg),
    }
