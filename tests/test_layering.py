"""Data flows one way: a module imports only from modules earlier in the list, and no import runs in a circle.

The order (common practice of this project, see DEVELOPERS.md):
_version, errors, definitions, _plugins, section -> io, depth -> picking ->
user_horizons -> metrics -> classify -> result -> plugins -> pipeline ->
report -> batch -> cli.  ``synth`` uses only errors, section, definitions
and io.headers.  Package ``__init__`` files are checked like the other
modules of their package (the package root re-exports the public API, so it
may import anything).

The import graph is read from the source with :mod:`ast`: every ``import``
and ``from ... import`` anywhere in a module (also inside functions, which
still run in a circle if they form one), and the package ``__init__`` that
importing a submodule runs first.
"""

import ast
from pathlib import Path

import pytest

PKG = Path(__file__).resolve().parents[1] / "clinometry"

ORDER = ["_version", "errors", "definitions", "_plugins", "section", "io", "depth", "picking", "user_horizons",
         "metrics", "classify", "result", "plugins", "pipeline", "accessor", "report", "batch", "cli"]
SYNTH_ALLOWED = {"_version", "errors", "section", "definitions", "io.headers", "synth"}


def _layer(parts):
    return ORDER.index(parts[0]) if parts and parts[0] in ORDER else None


def _module_parts(path):
    """``clinometry/metrics/dispatch.py`` -> ["metrics", "dispatch"]; a package ``__init__`` -> its package."""
    rel = path.relative_to(PKG).with_suffix("")
    return list(rel.parts[:-1]) if rel.name == "__init__" else list(rel.parts)


def _is_module(parts):
    base = PKG.joinpath(*parts) if parts else PKG
    return base.with_suffix(".py").is_file() or (base / "__init__.py").is_file()


def _imports(path):
    """Targets of the imports of one module, as lists of parts below ``clinometry``."""
    parts = _module_parts(path)
    pkg_parts = parts if path.name == "__init__.py" else parts[:-1]
    tree = ast.parse(path.read_text())
    for node in ast.walk(tree):
        if isinstance(node, ast.ImportFrom):
            if node.level:
                base = pkg_parts[: len(pkg_parts) - (node.level - 1)] if node.level > 1 else pkg_parts
                target = base + [m for m in (node.module or "").split(".") if m]
            elif node.module and (node.module == "clinometry" or node.module.startswith("clinometry.")):
                target = node.module.split(".")[1:]
            else:
                continue
            for alias in node.names:  # "from pkg import submodule" imports the submodule
                yield target + [alias.name] if _is_module(target + [alias.name]) else target
        elif isinstance(node, ast.Import):
            for alias in node.names:
                if alias.name == "clinometry" or alias.name.startswith("clinometry."):
                    yield alias.name.split(".")[1:]


MODULES = sorted(p for p in PKG.rglob("*.py") if p.name != "__main__.py" and p != PKG / "__init__.py")


@pytest.mark.parametrize("path", MODULES, ids=lambda p: str(p.relative_to(PKG)))
def test_imports_follow_data_flow(path):
    rel = _module_parts(path)
    name = "/".join(path.relative_to(PKG).parts)
    for target in _imports(path):
        assert target, (f"{name} imports from the package root, which imports every step; "
                                           "import from the module that owns the name (e.g. clinometry._version)")
    if rel[0] == "synth":
        for target in _imports(path):
            got = ".".join(target[:2]) if target[:1] == ["io"] else target[0] if target else ""
            assert got in SYNTH_ALLOWED, f"{name} imports clinometry.{'.'.join(target)}"
        return
    own = _layer(rel)
    assert own is not None, f"{name} has no place in ORDER; add its layer to this test and to DEVELOPERS.md"
    for target in _imports(path):
        other = _layer(target)
        if other is None:
            continue
        assert other <= own, f"{name} imports clinometry.{'.'.join(target)}, which comes later in the data flow"


def _graph():
    """Module -> modules it imports (dotted names below clinometry; a package is its __init__)."""
    graph = {}
    for path in sorted(PKG.rglob("*.py")):
        if path.name == "__main__.py":
            continue
        src = ".".join(_module_parts(path))
        own_packages = {".".join(_module_parts(path)[:i]) for i in range(len(_module_parts(path)) + 1)}
        edges = set()
        for target in _imports(path):
            if not target:  # a name of the package root (clinometry/__init__.py) itself
                edges.add("")
            # importing a.b.c runs the __init__ of a and a.b first, unless they are
            # packages of the importing module itself (being imported already)
            for i in range(1, len(target) + 1):
                dotted = ".".join(target[:i])
                if dotted not in own_packages and _is_module(target[:i]):
                    edges.add(dotted)
        edges.discard(src)
        graph[src] = edges
    return graph


def _cycles(graph):
    """Strongly connected components with more than one module (Tarjan 1972)."""
    index, low, stack, on, out = {}, {}, [], set(), []

    def visit(v):
        index[v] = low[v] = len(index)
        stack.append(v)
        on.add(v)
        for w in graph.get(v, ()):
            if w not in index:
                visit(w)
                low[v] = min(low[v], low[w])
            elif w in on:
                low[v] = min(low[v], index[w])
        if low[v] == index[v]:
            comp = []
            while True:
                w = stack.pop()
                on.discard(w)
                comp.append(w)
                if w == v:
                    break
            if len(comp) > 1:
                out.append(sorted(comp))

    for v in sorted(graph):
        if v not in index:
            visit(v)
    return out


def test_import_graph_has_no_cycle():
    graph = _graph()
    assert "metrics.dispatch" in graph and "report.tables" in graph["report.line_files"]
    assert _cycles(graph) == []


def test_cycle_finder_finds_a_cycle():
    # a hand-made graph with one loop of three and a tail (Tarjan 1972's algorithm, worked by hand)
    assert _cycles({"a": {"b"}, "b": {"c"}, "c": {"a", "d"}, "d": set()}) == [["a", "b", "c"]]
