"""The bundled demo lines: where they are, and how to make them where they are not.

``synthetic_volumes/`` (a source checkout) holds ten invented 2D lines and a
small 3D cube made by this forward model, each with its ground truth beside
it.  :func:`demo_files` gives their paths by name, so the examples of the
README run as written; a package installed without that folder makes the
same files (same scenarios, seeds, sample formats and names) on first use
into a cache folder, and :func:`generate_bundle` writes them anywhere.
"""

from __future__ import annotations

import logging
import os
from pathlib import Path

__all__ = ["BUNDLE_DIR", "BUNDLE_IBM_LINES", "BUNDLE_CUBE_SEED", "BUNDLE_CUBE_NAME", "bundled_folder",
           "generate_bundle", "demo_files", "cache_folder"]

logger = logging.getLogger(__name__)

#: name of the folder with the bundled synthetic inputs
BUNDLE_DIR = "synthetic_volumes"
#: how the bundled inputs were made (scripts/make_synthetic_volumes.py): the scenario at position i of
#: ``SCENARIOS`` with seed i, these lines in IBM float, and the cube with its own seed and name
BUNDLE_IBM_LINES = ("steep_margin",)
BUNDLE_CUBE_SEED = 99
BUNDLE_CUBE_NAME = "curved_margin_cube"


def _has_segy(folder: Path) -> bool:
    return folder.is_dir() and any(p.suffix.lower() in (".sgy", ".segy") for p in folder.iterdir())


def bundled_folder():
    """The bundled ``synthetic_volumes/`` folder, or None when it is not there.

    Looked for next to the package (installed as data) and at the root of a
    source checkout (the package's parent folder).
    """
    pkg = Path(__file__).resolve().parents[1]  # the clinometry package folder
    for cand in (pkg / BUNDLE_DIR, pkg.parent / BUNDLE_DIR):
        if _has_segy(cand):
            return cand
    return None


def generate_bundle(folder, *, scenarios=None, cube=True):
    """Write the bundled scenarios (and the 3D cube) into ``folder``, as ``synthetic_volumes/`` has them.

    Parameters
    ----------
    folder : str or os.PathLike
        Created if missing.
    scenarios : sequence of str, optional
        Scenario names; default every one in ``clinometry.synth.SCENARIOS``.
    cube : bool
        Also write the small 3D cube.

    Returns
    -------
    list of pathlib.Path
        The SEG-Y files written (``<stem>.truth.json`` beside each).
    """
    from .cube import make_cube, write_cube
    from .lines import make_line
    from .scenarios import SCENARIOS
    from .write import write_line

    folder = Path(folder)
    folder.mkdir(parents=True, exist_ok=True)
    order = list(SCENARIOS)
    written = []
    for name in (order if scenarios is None else scenarios):
        section, truth = make_line(name, seed=order.index(name))
        fmt = "ibm" if name in BUNDLE_IBM_LINES else "ieee"
        written.append(write_line(section, truth, folder / f"{name}.sgy", sample_format=fmt)[0])
    if cube:
        volume, truth = make_cube(seed=BUNDLE_CUBE_SEED)
        written.append(write_cube(volume, truth, folder / f"{BUNDLE_CUBE_NAME}.sgy")[0])
    return written


def cache_folder() -> Path:
    """Where :func:`demo_files` makes the demo lines when the bundle is not installed.

    ``$XDG_CACHE_HOME/clinometry/demo-<version>`` (default ``~/.cache``; the
    XDG base directory convention, common practice, no source).
    """
    from .._version import __version__

    base = os.environ.get("XDG_CACHE_HOME") or os.path.join(os.path.expanduser("~"), ".cache")
    return Path(base) / "clinometry" / f"demo-{__version__}"


def demo_files(folder=None) -> dict:
    """Paths of the bundled demo SEG-Y files, by scenario name.

    Parameters
    ----------
    folder : str or os.PathLike, optional
        Where to make the files when the package was installed without its
        ``synthetic_volumes/`` folder; default :func:`cache_folder`.  They
        are made once (about half a minute) and reused.

    Returns
    -------
    dict of str -> pathlib.Path
        E.g. ``"rimmed_shelf"`` -> ``.../rimmed_shelf.sgy``, and
        ``"curved_margin_cube"`` (the 3D cube, inlines 100-139); the ground
        truth of each is ``<stem>.truth.json`` beside it.  Invented
        scenarios of the forward model: no real place.

    Examples
    --------
    >>> files = demo_files()
    >>> sorted(files)[:3], files["rimmed_shelf"].name
    (['curved_margin_cube', 'deep_factory_shelf', 'falling_shelf'], 'rimmed_shelf.sgy')
    """
    found = bundled_folder()
    if found is None:
        found = Path(folder) if folder is not None else cache_folder()
        if not _has_segy(found):
            logger.info("making the demo lines into %s", found)
            generate_bundle(found)
    return {p.stem: p for p in sorted(found.iterdir()) if p.suffix.lower() in (".sgy", ".segy")}
