"""Make a synthetic seismic line (or the 3D cube) of a carbonate margin, with its ground truth.

A margin is grown with the light-dependent production law of Bosscher &
Schlager (1992), reworking above a reworking depth and angle-of-repose-limited
deposition -- or laid out from analytic profiles (isolated mounds and saddles,
basin fill, drape, ramps, layered and noise lines with no margin) -- rendered
by convolution with a Ricker wavelet, and written as SEG-Y with
``<stem>.truth.json`` beside it (true shelf break, toe, slope, relief and
trajectory).  Scenarios are invented settings; ``--list`` shows them.
"""

from __future__ import annotations

import contextlib
import logging
import os

from ..errors import GeometryError
from ..synth import ALL_SCENARIOS, ANALYTIC_SCENARIOS, GROUPS, SCENARIOS, make_cube, make_line, write_cube, write_line

__all__ = ["DESCRIPTION", "EXAMPLE", "configure", "run", "CUBE_SCENARIO"]

logger = logging.getLogger(__name__)

DESCRIPTION = "make a synthetic margin line or cube as SEG-Y with ground-truth JSON"
EXAMPLE = "clinometry synth --scenario rimmed_shelf --out rimmed.sgy --snr 4 --wavelet-hz 25"
#: name of the 3D cube in --scenario
CUBE_SCENARIO = "curved_margin_cube"


def configure(parser):
    parser.add_argument("--list", action="store_true", help="list the scenarios and exit")
    parser.add_argument("--scenario", metavar="NAME", help=f"scenario name (see --list; '{CUBE_SCENARIO}' for the 3D cube)")
    parser.add_argument("--out", metavar="FILE.sgy", help="output SEG-Y path; the truth goes to <stem>.truth.json")
    parser.add_argument("--snr", type=float, metavar="S", help="signal-to-noise ratio, RMS signal / RMS noise (default: the scenario's)")
    parser.add_argument("--no-noise", action="store_true", help="write the noise-free section")
    parser.add_argument("--seed", type=int, default=0, metavar="N", help="random seed for impedance variation and noise (default 0)")
    parser.add_argument("--wavelet-hz", type=float, metavar="HZ", help="Ricker peak frequency, Hz (default: the scenario's, 20-35 Hz)")
    parser.add_argument("--velocity", type=float, metavar="M_PER_S", help="velocity for depth -> time, m/s (default: the scenario's)")
    parser.add_argument("--velocity-gradient", type=float, metavar="PER_S", help="velocity increase with depth k in v = v0 + k z, 1/s")
    parser.add_argument("--domain", choices=("twt", "depth"), default="twt", help="z axis: two-way time (ms) or depth (m)")
    parser.add_argument("--format", choices=("ibm", "ieee"), default="ieee", help="SEG-Y sample format (default ieee)")
    parser.add_argument("--sample-interval", type=float, metavar="MS_OR_M", help="sample interval, ms (twt) or m (depth)")
    parser.add_argument("--samples", type=int, metavar="N", help="number of samples per trace")
    parser.add_argument("--trace-spacing", type=float, metavar="M", help="trace spacing, m (regrows the model on that grid)")
    parser.add_argument("--delay", type=float, metavar="MS_OR_M", help="time (ms) or depth (m) of the first sample, a whole number (default 0)")
    parser.add_argument("--azimuth", type=float, metavar="DEG", help="line azimuth, degrees clockwise from grid north")
    parser.add_argument("--reverse-polarity", action="store_true", help="flip the sign (SEG reverse polarity)")
    parser.add_argument("--gain-drift", type=float, default=0.0, metavar="FRACTION", help="linear gain drift along the line, fraction (e.g. 0.5)")
    parser.add_argument("--dead-traces", metavar="I,J,...", default="", help="comma-separated trace indices set to zero")
    parser.add_argument("--gain-step", metavar="TRACE,FACTOR", help="multiply every trace from TRACE on by FACTOR "
                        "(a gain step across the line, e.g. 200,3)")
    parser.add_argument("--amplitude-scale", type=float, default=1.0, metavar="FACTOR",
                        help="multiply the whole line by FACTOR (default 1)")


def _row(name, sc):
    print(f"{name:24s} {str(sc.family or '-'):14s} {str(sc.trajectory or '-'):11s} {sc.description}")


def _list():
    print(f"{'scenario':24s} {'family':14s} {'trajectory':11s} description")
    print("# grown margins (the bundled lines)")
    for name, sc in SCENARIOS.items():
        _row(name, sc)
    print(f"{CUBE_SCENARIO:24s} {'rimmed_shelf':14s} {'ascending':11s} 3D cube, margin strike bending across 40 inlines")
    for group, names in GROUPS.items():
        print(f"# analytic: {group}")
        for name in names:
            _row(name, ANALYTIC_SCENARIOS[name])


@contextlib.contextmanager
def _naming_the_output(out):
    """segyio's own write errors name no file: give them the ``--out`` path."""
    try:
        yield
    except OSError as err:
        if getattr(err, "filename", None) or not err.errno:
            raise
        raise type(err)(err.errno, err.strerror or os.strerror(err.errno), os.fspath(out)) from err


def run(args) -> int:
    if args.list:
        _list()
        return 0
    if not args.scenario or not args.out:
        raise GeometryError("synth needs --scenario NAME and --out FILE.sgy (see --list for the names)")
    if args.scenario == CUBE_SCENARIO:
        kw = {}
        if args.wavelet_hz:
            kw["peak_hz"] = args.wavelet_hz
        if args.velocity:
            kw["velocity_m_s"] = args.velocity
        if args.sample_interval:
            kw["dt_ms"] = args.sample_interval
        if args.samples:
            kw["n_samples"] = args.samples
        cube, truth = make_cube(snr=None if args.no_noise else (args.snr or 8.0), seed=args.seed, **kw)
        with _naming_the_output(args.out):
            sgy, js = write_cube(cube, truth, args.out, sample_format=args.format)
        print(f"wrote {sgy} ({cube.sizes['inline']} inlines x {cube.sizes['crossline']} crosslines x {cube.sizes['z']} samples)")
        print(f"wrote {js}")
        return 0
    if args.scenario not in ALL_SCENARIOS:
        raise GeometryError(f"unknown scenario {args.scenario!r}; choose one of "
                            f"{sorted(SCENARIOS) + [CUBE_SCENARIO] + sorted(ANALYTIC_SCENARIOS)}")
    try:
        dead = [int(t) for t in args.dead_traces.split(",") if t.strip()]
    except ValueError as err:
        raise GeometryError(f"--dead-traces must be comma-separated integers, got {args.dead_traces!r}") from err
    gain_step = None
    if args.gain_step:
        try:
            trace, factor = args.gain_step.split(",")
            gain_step = (int(trace), float(factor))
        except ValueError as err:
            raise GeometryError(f"--gain-step must be TRACE,FACTOR (e.g. 200,3), got {args.gain_step!r}") from err
    sec, truth = make_line(
        args.scenario, snr=args.snr, seed=args.seed, peak_hz=args.wavelet_hz,
        velocity_m_s=args.velocity, velocity_k_per_s=args.velocity_gradient, domain=args.domain,
        dt_ms=args.sample_interval if args.domain == "twt" else None,
        dz_m=args.sample_interval if args.domain == "depth" else None,
        n_samples=args.samples, delay_ms=args.delay, trace_spacing_m=args.trace_spacing, azimuth_deg=args.azimuth,
        polarity_reversed=args.reverse_polarity, gain_drift_fraction=args.gain_drift,
        dead_traces=dead, noise=not args.no_noise, gain_step=gain_step, amplitude_scale=args.amplitude_scale)
    with _naming_the_output(args.out):
        sgy, js = write_line(sec, truth, args.out, sample_format=args.format)
    print(f"wrote {sgy} ({sec.sizes['trace']} traces x {sec.sizes['z']} samples, {args.domain}, "
          f"{len(truth['margins'])} margin(s))")
    print(f"wrote {js}")
    return 0
