"""The import graph runs one way and has no cycle.

Common practice for layered code, no source. The layers, lowest first (DEVELOPERS.md,
"Architecture"): units/errors -> model -> loads, fe, bearings, checks -> machine ->
analysis -> io -> study -> report -> cli. A module may import its own layer and the
layers below it, never one above. The numerical core (model, loads, fe, bearings,
checks) imports neither yaml, pint, matplotlib, pandas nor dask. The package's public
face (``shaftsys/__init__.py``, ``__main__.py``) may import anything; what imports it
(for ``__version__``) does not count as an edge.

Every import counts, also those inside functions (lazy imports of the edges) and those
under ``if TYPE_CHECKING:``: a layer that only needs another's types for annotations
still depends on it.
"""

from __future__ import annotations

import ast
from pathlib import Path

import networkx as nx
import pytest

PKG = Path(__file__).resolve().parent.parent / "shaftsys"
LAYERS: list[set[str]] = [
    {"units", "errors"},
    {"model"},
    {"loads", "fe", "bearings", "checks"},
    {"machine"},
    {"analysis"},
    {"io"},
    {"study"},
    {"report"},
    {"cli"},
]
CORE = ["model", "loads", "fe", "bearings", "checks"]
CORE_FORBIDDEN = {"yaml", "pint", "matplotlib", "pandas", "dask", "distributed"}
FACE = {"shaftsys", "shaftsys.__main__"}


def _module_name(path: Path) -> str:
    rel = path.relative_to(PKG.parent).with_suffix("")
    parts = list(rel.parts)
    if parts[-1] == "__init__":
        parts.pop()
    return ".".join(parts)


def _imports(path: Path) -> set[str]:
    """Absolute module names imported anywhere in ``path`` (relative imports resolved)."""
    tree = ast.parse(path.read_text(encoding="utf-8"))
    here = _module_name(path).split(".")
    package = here if path.name == "__init__.py" else here[:-1]
    names: set[str] = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            names.update(a.name for a in node.names)
        elif isinstance(node, ast.ImportFrom):
            base = node.module or ""
            if node.level:
                base = ".".join([*package[: len(package) - node.level + 1], base]).strip(".")
            names.add(base)
            # ``from shaftsys.x import y`` may import the submodule shaftsys.x.y
            names.update(f"{base}.{a.name}" for a in node.names)
    return names


def _modules() -> dict[str, Path]:
    return {_module_name(p): p for p in PKG.rglob("*.py")}


def _layer_of(module: str) -> int | None:
    parts = module.split(".")
    if len(parts) < 2 or parts[0] != "shaftsys":
        return None
    top = parts[1]
    for i, layer in enumerate(LAYERS):
        if top in layer:
            return i
    return None


def _graph() -> nx.DiGraph:
    modules = _modules()
    g = nx.DiGraph()
    g.add_nodes_from(modules)
    for name, path in modules.items():
        for target in _imports(path):
            if target in modules and target != name and target not in FACE:
                g.add_edge(name, target)
    return g


def test_every_package_has_a_layer() -> None:
    """A new top-level package or module must be placed in the layer list above."""
    tops = {p.stem if p.is_file() else p.name for p in PKG.iterdir()
            if (p.is_dir() and (p / "__init__.py").exists())
            or (p.suffix == ".py" and p.stem not in {"__init__", "__main__"})}
    placed = set().union(*LAYERS)
    assert tops - placed == set()


def test_no_import_cycle() -> None:
    cycles = list(nx.simple_cycles(_graph()))
    assert cycles == []


def test_imports_point_down_the_layers() -> None:
    offenders = []
    for a, b in _graph().edges:
        la, lb = _layer_of(a), _layer_of(b)
        if la is not None and lb is not None and lb > la:
            offenders.append(f"{a} -> {b}")
    assert offenders == []


@pytest.mark.parametrize("package", CORE)
def test_core_does_not_import_edges(package: str) -> None:
    offenders = []
    for path in (PKG / package).rglob("*.py"):
        for name in _imports(path):
            if name.split(".")[0] in CORE_FORBIDDEN:
                offenders.append(f"{path.name}: {name}")
    assert offenders == []


def test_units_and_errors_import_nothing_of_shaftsys() -> None:
    for name in ("units.py", "errors.py"):
        assert not any(n.startswith("shaftsys") for n in _imports(PKG / name))


def test_the_checker_sees_a_cycle_and_an_upward_import(tmp_path: Path) -> None:
    """The graph checks themselves can fail: a planted cycle and an upward edge."""
    g = nx.DiGraph([("shaftsys.fe.a", "shaftsys.fe.b"), ("shaftsys.fe.b", "shaftsys.fe.a")])
    assert list(nx.simple_cycles(g))
    assert _layer_of("shaftsys.fe.a") is not None
    assert _layer_of("shaftsys.cli.main") > _layer_of("shaftsys.fe.a")  # type: ignore[operator]
