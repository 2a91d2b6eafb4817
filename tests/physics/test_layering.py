"""The layers of cryoplan, checked from the source with :mod:`ast` (no module is imported).

- ``cryoplan/physics`` imports only the standard library (``sys.stdlib_module_names``),
  numpy, scipy and its own modules;
- the shells (``cryoplan/report``, ``cryoplan/tui``, ``cryoplan/commands``) never import
  ``cryoplan.physics``: they show what the evaluation returns;
- only ``cryoplan/data`` imports CoolProp;
- no import cycle among cryoplan's modules, counting imports at module level and inside
  functions alike (the command line's lazy imports in ``cli.py`` aside: they load a command
  on demand and are not part of any layer).
"""

from __future__ import annotations

import ast
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2] / "cryoplan"
THIRD_PARTY_IN_PHYSICS = {"numpy", "scipy"}


def module_name(path: Path) -> str:
    parts = list(path.relative_to(ROOT.parent).with_suffix("").parts)
    if parts[-1] == "__init__":
        parts.pop()
    return ".".join(parts)


def package_of(path: Path) -> str:
    name = module_name(path)
    return name if path.name == "__init__.py" else name.rpartition(".")[0]


MODULES = {module_name(p): p for p in sorted(ROOT.rglob("*.py"))}


def imports(path: Path, *, nested: bool = True):
    """(absolute module name, line, at module level) for every import in ``path``.

    ``from X import y`` yields ``X.y`` where that is one of cryoplan's modules, else ``X``.
    """
    tree = ast.parse(path.read_text(encoding="utf-8"))
    top = {id(n) for n in tree.body}
    top |= {id(n) for node in tree.body if isinstance(node, ast.If) for n in node.body}
    for node in ast.walk(tree):
        level = id(node) in top
        if not nested and not level:
            continue
        if isinstance(node, ast.Import):
            for alias in node.names:
                yield alias.name, node.lineno, level
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = package_of(path).split(".")
                base = base[: len(base) - (node.level - 1)]
                target = ".".join(base + ([node.module] if node.module else []))
            else:
                target = node.module
            for alias in node.names:
                sub = f"{target}.{alias.name}"
                yield (sub if sub in MODULES else target), node.lineno, level


def where(path: Path, line: int) -> str:
    return f"{path.relative_to(ROOT.parent)}:{line}"


def test_the_walk_sees_the_packages():
    # a guard against a test that cannot fail: the walk finds the physics modules and their
    # imports (numpy in heatloads' radiation, the shared checks inside physics)
    assert "cryoplan.physics.checks" in MODULES
    found = {name for name, _, _ in imports(MODULES["cryoplan.physics.heatloads.radiation"])}
    assert {"numpy", "cryoplan.physics.checks"} <= found


def test_physics_imports_only_stdlib_numpy_scipy_and_itself():
    bad = []
    for name, path in MODULES.items():
        if not name.startswith("cryoplan.physics"):
            continue
        for target, line, _ in imports(path):
            top = target.split(".")[0]
            if target == "cryoplan.physics" or target.startswith("cryoplan.physics."):
                continue
            if top in sys.stdlib_module_names or top in THIRD_PARTY_IN_PHYSICS:
                continue
            bad.append(f"{where(path, line)} imports {target}")
    assert not bad, "\n".join(bad)


def shell_imports_of_physics():
    bad = []
    for name, path in MODULES.items():
        if not name.startswith(("cryoplan.report", "cryoplan.tui", "cryoplan.commands")):
            continue
        for target, line, _ in imports(path):
            if target == "cryoplan.physics" or target.startswith("cryoplan.physics."):
                bad.append(f"{where(path, line)} imports {target}")
    return bad


def test_shells_never_import_physics():
    bad = shell_imports_of_physics()
    assert not bad, "\n".join(bad)


def test_only_the_data_layer_imports_coolprop():
    bad = []
    for name, path in MODULES.items():
        if name.startswith("cryoplan.data"):
            continue
        for target, line, _ in imports(path):
            if target.split(".")[0] == "CoolProp":
                bad.append(f"{where(path, line)} imports {target}")
    assert not bad, "\n".join(bad)


def import_graph() -> dict[str, set[str]]:
    graph: dict[str, set[str]] = {name: set() for name in MODULES}
    for name, path in MODULES.items():
        nested = name != "cryoplan.cli"  # the command line's lazy imports are fine
        for target, _, _ in imports(path, nested=nested):
            if target in MODULES and target != name:
                graph[name].add(target)
    return graph


def cycles(graph: dict[str, set[str]]) -> list[list[str]]:
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

    limit = sys.getrecursionlimit()
    sys.setrecursionlimit(max(limit, 10 * len(graph) + 100))
    try:
        for v in sorted(graph):
            if v not in index:
                visit(v)
    finally:
        sys.setrecursionlimit(limit)
    return found


def test_cycle_finder_finds_a_cycle():
    # the finder itself, on a graph with one known cycle (a -> b -> c -> a) and a tail
    graph = {"a": {"b"}, "b": {"c"}, "c": {"a"}, "d": {"a"}}
    assert cycles(graph) == [["a", "b", "c"]]
    assert cycles({"a": {"b"}, "b": set()}) == []


def test_no_import_cycle_among_cryoplan_modules():
    found = cycles(import_graph())
    assert not found, "\n".join(" <-> ".join(c) for c in found)


if __name__ == "__main__":  # pragma: no cover - a listing for whoever fixes a layer
    print("\n".join(shell_imports_of_physics()))
    for c in cycles(import_graph()):
        print(" <-> ".join(c))
    pytest.main([__file__, "-q"])
