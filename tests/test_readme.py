"""The README's Python code blocks run as written (so they stay true).

Each fenced ``python`` block of README.md is run, in order and in one
namespace, in a fresh working folder.  The demo files come from
``clinometry.demo_files()`` (the bundled ``synthetic_volumes/`` in a source
checkout).
"""

import re
from pathlib import Path

import pytest

README = Path(__file__).resolve().parents[1] / "README.md"
_BLOCK = re.compile(r"^```python\n(.*?)^```", re.MULTILINE | re.DOTALL)


def _blocks():
    return _BLOCK.findall(README.read_text(encoding="utf-8"))


def test_readme_has_python_blocks():
    assert len(_blocks()) >= 1


def test_readme_python_blocks_run_as_written(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    namespace = {"__name__": "readme"}
    for k, block in enumerate(_blocks(), start=1):
        try:
            exec(compile(block, f"README.md python block {k}", "exec"), namespace)
        except Exception as err:  # the block as a user would see it fail
            pytest.fail(f"README.md python block {k} fails: {type(err).__name__}: {err}")
    out = capsys.readouterr().out
    assert out.strip(), "the README's example prints its margins and a family"
    # what the blocks promise: a result, an options object, an analysed inline and a classification
    assert isinstance(namespace["result"], namespace["clinometry"].Result)
    assert namespace["line"].result.source["inline"] == 110
    assert namespace["label"].family in ("ramp", "rimmed_shelf", "steep_margin", None)
