"""Results on the bundled lines stay byte-identical through refactoring.

``tests/data/bundled_digests.json`` holds the SHA-256 of every output this
test makes -- the results JSON of each bundled 2D line (uncertainty off and
on), its horizons CSV, one inline of the bundled cube, and an interpreter's
horizon measured on a hand-made section -- as written by the code before the
restructuring of issue 14 (options object, report split, plugin checks).  The
check is against the project's own earlier output: its point is that moving
code changes no number.

Keys that were added later are dropped before hashing (:data:`NEW_KEYS`),
and so are the few values whose meaning changed on purpose
(:data:`CHANGED_ON_PURPOSE`).  The source path is written relative to the
checkout, since it names where the checkout lives, not what was computed.
Everything else must match byte for byte.

When the numbers are meant to change (a new picker, a changed metric),
regenerate the digests and say why in the commit::

    python tests/pipeline/test_bundled_identity.py --write
"""

from __future__ import annotations

import hashlib
import json
import sys
from pathlib import Path

import numpy as np
import pytest

ROOT = Path(__file__).resolve().parents[2]
BUNDLED = ROOT / "synthetic_volumes"
DIGESTS = ROOT / "tests" / "data" / "bundled_digests.json"
#: one inline of the bundled cube (its inlines are 100-139, synthetic_volumes/README.md)
CUBE_INLINE = 110

#: keys of the results JSON added after the digests were made: (block, key)
NEW_KEYS = (("run", "rejected_candidates"),)
#: values whose meaning changed on purpose, left out of the digest: (block, key, why)
CHANGED_ON_PURPOSE = (
    ("run", "metrics_plugins",
     "was 'all installed'; metrics now default to the built-in set, recorded by name (issue 14)"),
    ("run", "picker",
     "an interpreter's horizon was recorded as picker 'user_horizon'; it is now the picker plugin "
     "'horizons' (issue 14)"),
)


def _lines():
    if not BUNDLED.is_dir():
        return []
    return sorted(p.stem for p in BUNDLED.glob("*.sgy") if "cube" not in p.stem)


def _velocity(truth):
    v = truth["velocity"]
    return {"velocity": v["v_m_s"]} if v["model"] == "constant" else {"velocity_linear": (v["v0_m_s"], v["k_per_s"])}


def _normalised_json(text):
    d = json.loads(text)
    for block, key in NEW_KEYS:
        d.get(block, {}).pop(key, None)
    for block, key, _ in CHANGED_ON_PURPOSE:
        d.get(block, {}).pop(key, None)
    src = d.get("source", {})
    if src.get("path") and Path(src["path"]).resolve().is_relative_to(ROOT):
        src["path"] = Path(src["path"]).resolve().relative_to(ROOT).as_posix()
    return json.dumps(d, indent=2)


def _sha(text):
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def _user_horizon_case():
    """A flat top at 400 ms, a 20 deg foreset at 2500 m/s, a flat floor (as in the measure docstring)."""
    from clinometry.picking.picks import Horizon
    from clinometry.section import make_section

    x = np.arange(120) * 25.0
    z = 400.0 + np.clip((x - 1000.0) * 0.2912, 0.0, 300.0)
    sec = make_section(np.zeros((120, 400), "float32"), z=np.arange(400) * 2.0, trace_spacing_m=25.0)
    return Horizon(id=0, role="user", trace=np.arange(120), z=z, quality=np.ones(120)), sec


def compute_digests(out_dir) -> dict:
    """Digest of every output: name -> sha256 of the normalised text."""
    import clinometry
    from clinometry.pipeline import run_analysis
    from clinometry.report import write_line_files

    out_dir = Path(out_dir)
    digests = {}

    def _files(analysis, stem):
        paths = write_line_files(analysis.result, out_dir, stem=stem, plot=False, section=analysis.section)
        digests[f"{stem}.json"] = _sha(_normalised_json(Path(paths["json"]).read_text()))
        digests[f"{stem}.horizons.csv"] = _sha(Path(paths["horizons"]).read_text())

    for name in _lines():
        truth = json.loads((BUNDLED / f"{name}.truth.json").read_text())
        for unc in (False, True):
            opts = clinometry.AnalysisOptions(uncertainty=unc, **_velocity(truth))
            _files(run_analysis(BUNDLED / f"{name}.sgy", opts), f"{name}.unc{int(unc)}")
    cube = BUNDLED / "curved_margin_cube.sgy"
    if cube.exists():
        truth = json.loads((BUNDLED / "curved_margin_cube.truth.json").read_text())
        opts = clinometry.AnalysisOptions(uncertainty=False, **_velocity(truth))
        _files(run_analysis(cube, opts, inline=CUBE_INLINE), f"cube_il{CUBE_INLINE}")
    h, sec = _user_horizon_case()
    digests["user_horizon.json"] = _sha(_normalised_json(
        clinometry.measure_horizon(h, sec, velocity=2500.0, seed=3).to_json(indent=2) + "\n"))
    return digests


@pytest.mark.skipif(not _lines(), reason="synthetic_volumes/ not present")
def test_bundled_outputs_are_byte_identical_to_the_stored_digests(tmp_path):
    expected = json.loads(DIGESTS.read_text())["digests"]
    got = compute_digests(tmp_path)
    assert sorted(got) == sorted(expected)
    differ = [k for k in sorted(got) if got[k] != expected[k]]
    assert not differ, f"outputs changed: {differ}; if on purpose, regenerate (see the module docstring)"


if __name__ == "__main__":
    import tempfile

    if sys.argv[1:] != ["--write"]:
        sys.exit("usage: python tests/pipeline/test_bundled_identity.py --write")
    with tempfile.TemporaryDirectory() as tmp:
        d = compute_digests(tmp)
    DIGESTS.write_text(json.dumps({
        "about": "sha256 of outputs on the bundled lines; made by tests/pipeline/test_bundled_identity.py --write",
        "digests": d,
    }, indent=2) + "\n")
    print(f"wrote {len(d)} digests to {DIGESTS}")
