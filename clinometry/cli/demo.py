"""Run the batch on the bundled synthetic lines and 3D volume, then open index.html.

The inputs are the forward-model scenarios of clinometry.synth (invented
margins, one per family and trajectory class, plus a small 3D cube), with
their ground truth beside them.  In a source checkout they are read from the
repository's synthetic_volumes/ folder; when the package is installed
without that folder they are generated first into DIR/inputs (the same
forward model and seeds, so the same lines).  Each line is converted to
depth with the velocity law the forward model states in its truth file,
unless a velocity option is given.

Writes into DIR what clinometry batch writes (per-line JSON, horizons CSV, QC
PNG, margins.csv, errors.csv, summary.png, map.png, index.html).  Compare the
picks with the truth files: *.truth.json beside each input.

The numbers support interpretation only: do not base drilling or storage
decisions on them alone; follow local regulations and licensed practice.
"""

from __future__ import annotations

import logging
from pathlib import Path

from ..io.sniff import has_segy_suffix

DESCRIPTION = "batch over the bundled synthetic lines and volume (the main job, end to end)"
EXAMPLE = "clinometry demo --out demo/   # then open demo/index.html"

__all__ = ["DESCRIPTION", "EXAMPLE", "configure", "run", "bundled_inputs", "generate_inputs", "demo_inputs",
           "truth_velocities"]

logger = logging.getLogger(__name__)

#: how the bundled inputs are named and made: see clinometry.synth.bundle
from ..synth.bundle import BUNDLE_CUBE_NAME, BUNDLE_CUBE_SEED, BUNDLE_DIR, BUNDLE_IBM_LINES  # noqa: E402,F401


def configure(parser) -> None:
    """Add the options of ``clinometry demo`` to ``parser``."""
    from .batch import add_batch_options

    parser.add_argument("--regenerate", action="store_true",
                        help="generate the synthetic inputs into DIR/inputs even when the bundled ones exist")
    add_batch_options(parser)


def _has_segy(folder: Path) -> bool:
    return folder.is_dir() and any(has_segy_suffix(p) for p in folder.iterdir())


def bundled_inputs():
    """The bundled ``synthetic_volumes/`` folder, or None (see :func:`clinometry.synth.bundle.bundled_folder`)."""
    from ..synth.bundle import bundled_folder

    return bundled_folder()


def generate_inputs(folder, *, scenarios=None, cube=True):
    """Write the bundled scenarios into ``folder`` (see :func:`clinometry.synth.bundle.generate_bundle`)."""
    from ..synth.bundle import generate_bundle

    return generate_bundle(folder, scenarios=scenarios, cube=cube)


def truth_velocities(folder) -> dict:
    """Velocity of each synthetic input, from the truth JSON beside it.

    The forward model states the velocity law it rendered with; in the demo
    this plays the part of the interpreter's velocity model (an input, not a
    result), so the depths are compared on the same footing as the truth.

    Returns
    -------
    dict
        SEG-Y path -> ``{"velocity": v}`` or ``{"velocity_linear": (v0, k)}``
        (files without a readable truth JSON are left out).
    """
    import json

    out = {}
    for seg in sorted(Path(folder).iterdir()):
        if not has_segy_suffix(seg):
            continue
        truth = seg.with_name(seg.stem + ".truth.json")
        try:
            vel = json.loads(truth.read_text(encoding="utf-8")).get("velocity") or {}
        except (OSError, ValueError):
            continue
        if vel.get("model") == "constant" and vel.get("v_m_s"):
            out[str(seg)] = {"velocity": float(vel["v_m_s"])}
        elif vel.get("model") == "linear":
            out[str(seg)] = {"velocity_linear": (float(vel["v0_m_s"]), float(vel["k_per_s"]))}
    return out


def demo_inputs(out_dir, *, regenerate=False):
    """The folder of inputs for the demo: bundled, or generated into ``out_dir/inputs``."""
    found = None if regenerate else bundled_inputs()
    if found is not None:
        logger.info("demo inputs: %s", found)
        return found
    target = Path(out_dir) / "inputs"
    if regenerate or not _has_segy(target):
        print(f"generating the synthetic inputs into {target} ...")
        generate_inputs(target)
    return target


def run(args) -> int:
    """Run ``clinometry demo``; exit codes as ``clinometry batch``."""
    from ..batch import run_batch
    from ._options import analysis_options
    from .batch import batch_kwargs, report

    options = analysis_options(args)  # checked before any input is generated
    inputs = demo_inputs(args.out, regenerate=args.regenerate)
    print(f"inputs: {inputs}")
    given = any(v is not None for v in (options.velocity, options.velocity_linear, options.velocity_file))
    file_velocity = {} if given else truth_velocities(inputs)
    summary = run_batch([str(inputs)], args.out, options, inlines="all", title="clinometry demo: synthetic margins",
                        file_velocity=file_velocity, **batch_kwargs(args))
    return report(summary)
