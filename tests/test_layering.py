"""Data flows one way: a module imports only from modules earlier in the list.

The order (common practice of this project, see DEVELOPERS.md):
errors, _plugins, section -> io, depth -> picking -> metrics -> classify ->
result -> pipeline -> report -> batch -> cli.  ``synth`` uses only errors,
section and io.headers.  Package ``__init__`` files only re-export.
"""

import ast
from pathlib import Path

import pytest

PKG = Path(__file__).resolve().parents[1] / "clinometry"

ORDER = ["errors", "_plugins", "section", "io", "depth", "picking", "metrics",
         "classify", "result", "pipeline", "accessor", "report", "batch", "cli"]
SYNTH_ALLOWED = {"errors", "section", "io.headers", "synth"}


def _layer(parts):
    return ORDER.index(parts[0]) if parts and parts[0] in ORDER else None


def _imports(path):
    rel = path.relative_to(PKG).with_suffix("")
    pkg_parts = list(rel.parts[:-1]) if rel.name != "__init__" else list(rel.parts[:-1])
    tree = ast.parse(path.read_text())
    for node in ast.walk(tree):
        if isinstance(node, ast.ImportFrom):
            if node.level:
                base = pkg_parts[: len(pkg_parts) - (node.level - 1)] if node.level > 1 else pkg_parts
                mod = (node.module or "").split(".") if node.module else []
                target = base + [m for m in mod if m]
                if not node.module:
                    for alias in node.names:
                        yield target + [alias.name]
                    continue
                yield target
            elif node.module and node.module.startswith("clinometry"):
                yield node.module.split(".")[1:]
        elif isinstance(node, ast.Import):
            for alias in node.names:
                if alias.name.startswith("clinometry."):
                    yield alias.name.split(".")[1:]


MODULES = sorted(p for p in PKG.rglob("*.py") if p.name not in ("__init__.py", "__main__.py"))


@pytest.mark.parametrize("path", MODULES, ids=lambda p: str(p.relative_to(PKG)))
def test_imports_follow_data_flow(path):
    rel = path.relative_to(PKG).with_suffix("").parts
    if rel[0] == "synth":
        for target in _imports(path):
            name = ".".join(target[:2]) if target[:1] == ["io"] else target[0] if target else ""
            assert name in SYNTH_ALLOWED, f"{'/'.join(rel)} imports clinometry.{'.'.join(target)}"
        return
    own = _layer(list(rel))
    if own is None:
        return
    for target in _imports(path):
        other = _layer(target)
        if other is None:
            continue
        assert other <= own, f"{'/'.join(rel)} imports clinometry.{'.'.join(target)}, which comes later in the data flow"
