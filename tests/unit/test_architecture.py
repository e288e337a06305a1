"""The package's architecture: layers import only from below, no module imports itself
back through others, and the top level stays small.

Every import is read from the source, those inside functions and under TYPE_CHECKING
included, so that a cycle cannot hide behind a deferred import.
"""

from __future__ import annotations

import ast
from pathlib import Path

import ionwright

PACKAGE = Path(ionwright.__file__).resolve().parent

#: Layers, lowest first. A module may import from its own layer and the layers before it.
LAYERS = (
    ("errors", "status", "notices"),
    ("chemistry",),
    ("data",),
    ("activity",),
    ("plugins",),
    ("core",),
    ("inputs",),
    ("outputs",),
    ("engine",),
    ("design", "batch"),
    ("cli",),
    ("__init__", "__main__"),
)
MAX_TOP_LEVEL_MODULES = 12


def _modules() -> dict[str, tuple[Path, bool]]:
    """Dotted name → (file, is a package) of every module of ionwright."""
    out = {}
    for path in PACKAGE.rglob("*.py"):
        parts = list(path.relative_to(PACKAGE.parent).with_suffix("").parts)
        is_package = parts[-1] == "__init__"
        out[".".join(parts[:-1] if is_package else parts)] = (path, is_package)
    return out


MODULES = _modules()


def _targets(name: str, is_package: bool, node: ast.AST) -> list[str]:
    """The ionwright modules an import statement loads."""
    if isinstance(node, ast.Import):
        found = [a.name for a in node.names]
    elif isinstance(node, ast.ImportFrom):
        if node.level:
            base = name.split(".") if is_package else name.split(".")[:-1]
            base = base[:len(base) - node.level + 1]
            module = ".".join(base + ([node.module] if node.module else []))
        else:
            module = node.module or ""
        found = [f"{module}.{a.name}" if f"{module}.{a.name}" in MODULES else module
                 for a in node.names]
    else:
        return []
    out = []
    for target in found:
        while target not in MODULES and "." in target:
            target = target.rsplit(".", 1)[0]
        if target in MODULES and target != name:
            out.append(target)
    return out


def _graph() -> dict[str, set[str]]:
    graph = {}
    for name, (path, is_package) in MODULES.items():
        tree = ast.parse(path.read_text(encoding="utf-8"))
        graph[name] = {t for node in ast.walk(tree) for t in _targets(name, is_package, node)}
    return graph


GRAPH = _graph()


def _cycles(graph: dict[str, set[str]]) -> list[list[str]]:
    """Strongly connected components of more than one module (Tarjan's algorithm)."""
    index: dict[str, int] = {}
    low: dict[str, int] = {}
    stack: list[str] = []
    on_stack: set[str] = set()
    found: list[list[str]] = []

    def visit(v: str) -> None:
        index[v] = low[v] = len(index)
        stack.append(v)
        on_stack.add(v)
        for w in sorted(graph[v]):
            if w not in index:
                visit(w)
                low[v] = min(low[v], low[w])
            elif w in on_stack:
                low[v] = min(low[v], index[w])
        if low[v] == index[v]:
            component = []
            while True:
                w = stack.pop()
                on_stack.discard(w)
                component.append(w)
                if w == v:
                    break
            if len(component) > 1:
                found.append(sorted(component))

    for v in sorted(graph):
        if v not in index:
            visit(v)
    return found


def _layer(name: str) -> int:
    first = name.split(".")[1] if "." in name else "__init__"
    for rank, members in enumerate(LAYERS):
        if first in members:
            return rank
    raise AssertionError(f"{name} belongs to no layer; add its folder to LAYERS")


def test_the_import_graph_is_read_from_every_module():
    assert len(GRAPH) > 60
    assert "ionwright.core._system" in GRAPH["ionwright.core._solver"]
    # a function-level import is seen (the cycle finder would otherwise miss it)
    assert "ionwright.engine._resolve" in GRAPH["ionwright.batch._run"]


def test_the_cycle_finder_finds_a_cycle():
    assert _cycles({"a": {"b"}, "b": {"c"}, "c": {"a"}, "d": {"a"}}) == [["a", "b", "c"]]


def test_no_module_imports_itself_back():
    assert _cycles(GRAPH) == []


def test_each_layer_imports_only_from_its_own_layer_and_those_below():
    upward = sorted(f"{a} -> {b}" for a, targets in GRAPH.items() for b in targets
                    if _layer(b) > _layer(a))
    assert upward == []


def test_at_most_twelve_modules_at_the_top_of_the_package():
    top = [p.name for p in PACKAGE.glob("*.py")]
    assert len(top) <= MAX_TOP_LEVEL_MODULES, top
