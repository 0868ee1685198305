"""The bearing interior through the whole run: the two demo models with an interior
run with `check`, their JSON carries an `internal` object per bearing whose element
loads balance the bearing's reaction (Newton residual), and a model without an
interior has no `internal` key (the rigid-support path is unchanged).

Reference: static equilibrium of the inner ring (the element load vectors add up to
the shaft's force on the bearing; Harris, *Rolling Bearing Analysis*).
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np
import pytest

from shaftsys.cli import main

MODELS = Path(__file__).resolve().parent.parent / "models"


@pytest.mark.parametrize("name", ["spindle_preload.yaml", "machine_clearance.yaml"])
def test_demo_with_interior_runs_and_balances(name: str, tmp_path: Path) -> None:
    out = tmp_path / "r.json"
    assert main(["check", str(MODELS / name), "--json", str(out), "--quiet"]) == 0
    data = json.loads(out.read_text())
    with_internal = [b for b in data["bearings"] if "internal" in b]
    assert with_internal
    for b in with_internal:
        inner = b["internal"]
        assert inner["newton_residual"] < 1e-8
        loads = {ld["case"]: ld for ld in b["loads"]}
        for c in inner["cases"]:
            ld = loads[c["case"]]
            Q = np.asarray(c["element_loads_N"])
            assert Q.min() >= 0.0
            assert c["max_element_load_N"] == pytest.approx(Q.max())
            # a radial load needs at least one element carrying more than Fr / Z
            assert Q.max() * inner["Z"] * inner["rows"] >= ld["Fr_N"] * (1 - 1e-9)
            K = np.asarray(c["stiffness_matrix"])
            assert K.shape == (5, 5)
            np.testing.assert_allclose(K, K.T, rtol=1e-6, atol=1e-6 * abs(K).max())
            assert c["life_ratio"] is None or math.isfinite(c["life_ratio"])


def test_model_without_interior_has_no_internal_key(demo_path: Path, tmp_path: Path
                                                   ) -> None:
    out = tmp_path / "r.json"
    main(["check", str(demo_path), "--json", str(out), "--quiet"])
    data = json.loads(out.read_text())
    assert all("internal" not in b for b in data["bearings"])
