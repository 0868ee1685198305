"""Start-up discipline of the command line: each command imports only what it needs.

Common practice, no source: the heavy libraries (pint, pandas, matplotlib, networkx,
dask, scipy.optimize, scipy.sparse) cost tenths of a second each to import, so a check
of a one-shaft model in common units must not import them, validation must not import
scipy, and ``new`` must not import numpy. Measured in a fresh interpreter (the modules
a command leaves in ``sys.modules``); times are measured by benchmarks/bench_startup.py.
"""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

import pytest

from shaftsys.cli.main import OBJECTIVES
from shaftsys.model.selection import Objective

ROOT = Path(__file__).resolve().parent.parent
MODELS = ROOT / "models"
HEAVY = ("pint", "pandas", "matplotlib", "networkx", "dask", "pyarrow", "scipy.optimize",
         "scipy.sparse")

SCRIPT = """
import json, sys
from shaftsys.cli import main
code = main(sys.argv[1:])
print(json.dumps([code, sorted(m for m in sys.modules)]))
"""


def _modules_after(*argv: str) -> tuple[int, set[str]]:
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    out = subprocess.run([sys.executable, "-c", SCRIPT, *argv], env=env, check=True,
                         capture_output=True, text=True, timeout=120)
    code, names = json.loads(out.stdout.strip().splitlines()[-1])
    return code, set(names)


def _loaded(names: set[str], top: str) -> bool:
    return top in names or any(n.startswith(top + ".") for n in names)


@pytest.mark.parametrize("model", ["fan_drive.yaml", "spindle_3brg.yaml"])
def test_check_of_a_one_shaft_model_imports_no_heavy_library(model: str) -> None:
    code, names = _modules_after("check", str(MODELS / model), "-q")
    assert code in (0, 1)
    assert [m for m in HEAVY if _loaded(names, m)] == []
    assert "scipy.linalg" in names          # the banded Cholesky is LAPACK's


def test_validate_imports_no_scipy() -> None:
    """``validate`` of a machine model checks its power flow (networkx), of a one-shaft
    model it needs no graph at all; neither imports scipy or the other heavy modules."""
    code, names = _modules_after("validate", str(MODELS / "belt_reducer.yaml"), "-q")
    assert code == 0
    assert [m for m in ("scipy", *HEAVY) if m != "networkx" and _loaded(names, m)] == []
    code, names = _modules_after("validate", str(MODELS / "fan_drive.yaml"), "-q")
    assert code == 0
    assert [m for m in ("scipy", *HEAVY) if _loaded(names, m)] == []


def test_new_imports_no_numpy() -> None:
    code, names = _modules_after("new", "-")
    assert code == 0 and not _loaded(names, "numpy")


def test_objective_choices_are_the_enum() -> None:
    assert tuple(x.value for x in Objective) == OBJECTIVES
