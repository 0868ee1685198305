"""Examples run as tests and their headline figures are checked."""

from __future__ import annotations

import importlib.util
import math
from pathlib import Path

EXAMPLES = Path(__file__).resolve().parent.parent / "examples"


def _load(name: str):
    spec = importlib.util.spec_from_file_location(name, EXAMPLES / f"{name}.py")
    assert spec is not None and spec.loader is not None
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def test_fan_shaft_life_table(capsys):
    lives = _load("fan_shaft_life_table").main()
    out = capsys.readouterr().out
    assert "full_flow" in out and "C_required_N" in out
    # headline: both supports of the demo have a finite life above the 40 000 h target
    assert set(lives) == {"A", "B"}
    assert all(math.isfinite(v) and v > 40000 for v in lives.values())
