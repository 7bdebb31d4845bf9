"""Run the batch on the bundled synthetic lines and 3D volume, then open index.html.

The inputs are the forward-model scenarios of clinometry.synth (invented
margins, one per family and trajectory class, plus a small 3D cube), with
their ground truth beside them.  In a source checkout they are read from the
repository's synthetic_volumes/ folder; when the package is installed
without that folder they are generated first into DIR/inputs (the same
forward model and seeds, so the same lines).

Writes into DIR what clinometry batch writes (per-line JSON, horizons CSV, QC
PNG, margins.csv, errors.csv, summary.png, map.png, index.html).  Compare the
picks with the truth files: *.truth.json beside each input.

The numbers support interpretation only: do not base drilling or storage
decisions on them alone; follow local regulations and licensed practice.
"""

from __future__ import annotations

import logging
from pathlib import Path

DESCRIPTION = "batch over the bundled synthetic lines and volume (the main job, end to end)"
EXAMPLE = "clinometry demo --out demo/   # then open demo/index.html"

__all__ = ["DESCRIPTION", "EXAMPLE", "configure", "run", "bundled_inputs", "generate_inputs", "demo_inputs"]

logger = logging.getLogger(__name__)

#: name of the folder with the bundled synthetic inputs
BUNDLE_DIR = "synthetic_volumes"


def configure(parser) -> None:
    """Add the options of ``clinometry demo`` to ``parser``."""
    from .batch import add_batch_options

    parser.add_argument("--regenerate", action="store_true",
                        help="generate the synthetic inputs into DIR/inputs even when the bundled ones exist")
    add_batch_options(parser)


def _has_segy(folder: Path) -> bool:
    return folder.is_dir() and any(p.suffix.lower() in (".sgy", ".segy") for p in folder.iterdir())


def bundled_inputs():
    """The bundled ``synthetic_volumes/`` folder, or None when it is not there.

    Looked for next to the package (installed as data) and at the root of a
    source checkout (the package's parent folder).
    """
    import clinometry

    pkg = Path(clinometry.__file__).resolve().parent
    for cand in (pkg / BUNDLE_DIR, pkg.parent / BUNDLE_DIR):
        if _has_segy(cand):
            return cand
    return None


def generate_inputs(folder, *, seed=0):
    """Write every forward-model scenario (and the 3D cube) into ``folder``.

    Parameters
    ----------
    folder : str or os.PathLike
        Created if missing.
    seed : int
        Seed of the forward model's noise (the bundled files use 0).

    Returns
    -------
    list of pathlib.Path
        The SEG-Y files written (truth JSON files sit beside them).
    """
    from .. import synth

    folder = Path(folder)
    folder.mkdir(parents=True, exist_ok=True)
    written = []
    for name in synth.SCENARIOS:
        target = folder / f"{name}.sgy"
        section, truth = synth.make_line(name, seed=seed)
        synth.write_line(section, truth, target)
        written.append(target)
    make_cube = getattr(synth, "make_cube", None)
    write_cube = getattr(synth, "write_cube", None)
    if make_cube is not None and write_cube is not None:
        target = folder / "cube.sgy"
        cube, truth = make_cube(seed=seed)
        write_cube(cube, truth, target)
        written.append(target)
    return written


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
    from .batch import batch_kwargs, report

    inputs = demo_inputs(args.out, regenerate=args.regenerate)
    print(f"inputs: {inputs}")
    summary = run_batch([str(inputs)], args.out, inlines="all", title="clinometry demo: synthetic margins",
                        **batch_kwargs(args))
    return report(summary)
