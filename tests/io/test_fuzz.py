"""Fuzzed SEG-Y input: every mutated file ends in a section or a clear ClinometryError.

The cases are generated and run by ``tests/io/fuzz_segy.py`` in a subprocess
(one JSON line per case), so a hang (10 s per case, enforced in the worker
with ``faulthandler.dump_traceback_later``) or an interpreter crash fails the
test instead of stopping pytest.  A seeded 50 cases run by default, 600 in
the slow suite (``pytest -m slow``).

Checks per case (issue 8 of this project; "common practice, no source" for
the bounds): outcome is a section or a ClinometryError whose message names
the file; finite samples with dims (trace, z); under 10 s; tracemalloc peak
at most 8x the file size + 2 MB (declared sizes are checked against the file
size before allocation); only clinometry warnings; ``clinometry inspect``
exits 0 or 2 with at most one stderr line and no traceback; the file's
SHA-256 is unchanged.
"""

import json
import subprocess
import sys
from collections import Counter
from pathlib import Path

import pytest

WORKER = Path(__file__).with_name("fuzz_segy.py")
CASE_TIMEOUT_S = 10
PEAK_FACTOR, PEAK_SLACK_BYTES = 8, 2_000_000


def _run(tmp_path, seed, n):
    proc = subprocess.run(
        [sys.executable, str(WORKER), str(tmp_path / "work"), str(seed), str(n)],
        capture_output=True, text=True, timeout=60 + CASE_TIMEOUT_S * n,
    )
    records = [json.loads(line) for line in proc.stdout.splitlines() if line.startswith("{")]
    assert proc.returncode == 0, (
        f"worker died after {len(records)} of {n} cases (hang or crash), rc={proc.returncode}: "
        f"{proc.stderr[-3000:]}"
    )
    assert len(records) == n
    return records


def _check(records):
    problems = []
    for r in records:
        tag = f"case {r['case']} (seed {r['seed']}, {r['kind']} of {r['base']})"
        if r["outcome"] == "error":
            if r["file"] not in r["message"]:
                problems.append(f"{tag}: message does not name the file: {r['message']}")
        elif r["outcome"] == "section":
            if not (r["all_finite"] and r["dims_ok"]):
                problems.append(f"{tag}: section with non-finite samples or wrong dims")
            if any(shape[1] != r["n_samples_declared"] for shape in r["shapes"]):
                problems.append(f"{tag}: sample count differs from the header: {r['shapes']}")
        else:
            problems.append(f"{tag}: {r['outcome']} {r['error_type']}: {r['message']}\n{r.get('traceback', '')}")
        if r["seconds"] >= CASE_TIMEOUT_S:
            problems.append(f"{tag}: took {r['seconds']:.1f} s")
        if r["peak_bytes"] > PEAK_FACTOR * r["size"] + PEAK_SLACK_BYTES:
            problems.append(f"{tag}: peak {r['peak_bytes']} bytes for a {r['size']}-byte file")
        if not r["warnings_ok"]:
            problems.append(f"{tag}: foreign warnings {r['warnings']}")
        if r["cli_rc"] not in (0, 2) or "Traceback" in r["cli_stderr"] or r["cli_stderr"].count("\n") > 1:
            problems.append(f"{tag}: CLI rc={r['cli_rc']} stderr={r['cli_stderr']!r}")
        if r["cli_rc"] == 2 and not r["cli_stderr"].startswith(f"clinometry: error: {r['file']}: "):
            problems.append(f"{tag}: CLI error line does not start with the file: {r['cli_stderr']!r}")
        if r["outcome"] == "section" and r["cli_rc"] != 0:  # inspect reads less than read_section
            problems.append(f"{tag}: the file reads but 'clinometry inspect' failed")
        if not r["unchanged"]:
            problems.append(f"{tag}: input file was modified")
    assert not problems, "\n".join(problems[:20])


def test_fuzz_seeded_50_cases(tmp_path):
    records = _run(tmp_path, seed=8, n=50)
    _check(records)
    outcomes = Counter(r["outcome"] for r in records)
    # the seeded set exercises both paths: readable mutations and refused ones
    assert outcomes["section"] >= 10 and outcomes["error"] >= 10, outcomes


@pytest.mark.slow
def test_fuzz_600_cases(tmp_path):
    records = _run(tmp_path, seed=2026, n=600)
    _check(records)
    kinds = Counter(r["kind"] for r in records)
    assert len(kinds) == 12 and min(kinds.values()) >= 20, kinds
