"""The import graph runs one way: the numerical core never imports the edges.

Common practice for layered code, no source: units/errors -> model -> loads, fe,
bearings, checks -> analysis -> ... -> cli. The core packages must not import yaml,
pint, matplotlib, pandas, the CLI, the io layer or the report.
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

PKG = Path(__file__).resolve().parent.parent / "shaftsys"
CORE = ["model", "loads", "fe", "bearings", "checks"]
FORBIDDEN = {"yaml", "pint", "matplotlib", "pandas", "shaftsys.cli", "shaftsys.io",
             "shaftsys.report", "shaftsys.analysis", "shaftsys.study", "dask"}


def _imports(path: Path) -> set[str]:
    tree = ast.parse(path.read_text())
    names: set[str] = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            names.update(a.name for a in node.names)
        elif isinstance(node, ast.ImportFrom) and node.module:
            names.add(node.module)
    return names


@pytest.mark.parametrize("package", CORE)
def test_core_does_not_import_edges(package):
    offenders = []
    for path in (PKG / package).rglob("*.py"):
        for name in _imports(path):
            if any(name == f or name.startswith(f + ".") for f in FORBIDDEN):
                offenders.append(f"{path.name}: {name}")
    assert offenders == []


def test_units_and_errors_import_nothing_of_shaftsys():
    for name in ("units.py", "errors.py"):
        assert not any(n.startswith("shaftsys") for n in _imports(PKG / name))
