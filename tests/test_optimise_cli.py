"""``shaftsys optimise``: the model's ``study: optimise:`` section from the command line.

The bundled spindle (``models/spindle_3brg.yaml``, ratings invented) moves its rear
bearings B and C. The optimum printed and written to JSON must lie within its bounds,
the constraints named active must be active in the written model when it is loaded
and analysed again by the single-run path (``shaftsys.analyse``, an independent route
from the batched study evaluator the optimiser uses), and the worst life margin must
be reproduced by that analysis.
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import pytest

import shaftsys
from shaftsys.cli.main import main

ROOT = Path(__file__).resolve().parent.parent
SPINDLE = ROOT / "models" / "spindle_3brg.yaml"


@pytest.fixture(scope="module")
def run(tmp_path_factory: pytest.TempPathFactory) -> tuple[int, dict, Path]:
    out = tmp_path_factory.mktemp("opt")
    rc = main(["optimise", str(SPINDLE), "--out", str(out), "-q"])
    return rc, json.loads((out / "optimum.json").read_text()), out


def test_optimum_within_bounds_and_written(run: tuple[int, dict, Path]) -> None:
    rc, data, out = run
    assert rc == 0
    assert data["constraints_met"] is True and data["checks_ok"] is True
    for path, value in data["values"].items():
        lo, hi = data["bounds"][path]
        assert lo - 1e-9 <= value <= hi + 1e-9, path
    assert (out / "objective.png").stat().st_size > 1000
    assert (out / "optimum.yaml").read_text().startswith("# Model file written by shaftsys")


def test_written_model_reproduces_optimum(run: tuple[int, dict, Path]) -> None:
    """Reload the written model: the stations are the optimum's (spacing.B.C = x_C -
    x_B), the worst margin C/C_req is the printed one, and each active limit is met
    with equality (value/limit = 1 within the optimiser's tolerance)."""
    _, data, out = run
    result = shaftsys.analyse(shaftsys.load_model(str(out / "optimum.yaml")))
    x = {b.bearing.id: b.bearing.x_mm for b in result.bearings}
    assert x["B"] == pytest.approx(data["values"]["bearing.B.at"], abs=1e-9)
    assert x["C"] - x["B"] == pytest.approx(data["values"]["spacing.B.C"], abs=1e-9)
    margins = {b.bearing.id: b.life.margin for b in result.bearings}
    assert min(margins.values()) == pytest.approx(data["worst_margin"], rel=1e-6)
    assert min(margins, key=margins.__getitem__) == data["worst_support"]
    assert data["active"], "the spindle's optimum lies on a constraint"
    for label in data["active"]:
        if label.startswith("deflection@gears"):
            worst = max(c.deflection_mm for g in result.checks.gears for c in g.cases)
            # the study's limit on the gear deflection: 0.0065 mm (model file)
            assert worst == pytest.approx(0.0065, rel=1e-5)
        elif label.endswith("at upper bound"):
            path = label.split(" at ")[0]
            assert data["values"][path] == pytest.approx(data["bounds"][path][1])
        elif label.endswith("at lower bound"):
            path = label.split(" at ")[0]
            assert data["values"][path] == pytest.approx(data["bounds"][path][0])
    for path, row in data["sensitivity"].items():
        assert all(v is None or math.isfinite(v) for v in row.values()), path


def _bad(tmp_path: Path, old: str, new: str) -> tuple[Path, int]:
    text = SPINDLE.read_text()
    assert old in text
    bad = tmp_path / "bad.yaml"
    bad.write_text(text.replace(old, new))
    line = next(i for i, ln in enumerate(bad.read_text().splitlines(), 1) if new in ln)
    return bad, line


def test_bad_bounds_exit_2_naming_field(tmp_path: Path, capsys: pytest.CaptureFixture[str]
                                        ) -> None:
    bad, line = _bad(tmp_path, "lower: 200 mm, upper: 270 mm", "lower: 200 mm, upper: 150 mm")
    assert main(["optimise", str(bad), "--out", str(tmp_path / "o"), "-q"]) == 2
    err = capsys.readouterr().err
    assert f"bad.yaml:{line}" in err and "study.optimise.bounds[1].upper" in err
    assert "lower < upper" in err and "Traceback" not in err
    assert not (tmp_path / "o" / "optimum.yaml").exists()


def test_bad_path_exit_2_naming_field(tmp_path: Path, capsys: pytest.CaptureFixture[str]
                                      ) -> None:
    bad, line = _bad(tmp_path, "{path: bearing.B.at, lower", "{path: bearing.Q.at, lower")
    assert main(["optimise", str(bad), "-q", "--out", str(tmp_path / "o")]) == 2
    err = capsys.readouterr().err
    assert f"bad.yaml:{line}" in err and "study.optimise.bounds[0].path" in err


def test_unknown_key_exit_2(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    bad, _ = _bad(tmp_path, "min_life_margin: 1.0", "min_life_margn: 1.0")
    assert main(["optimise", str(bad), "-q", "--out", str(tmp_path / "o")]) == 2
    assert "min_life_margn" in capsys.readouterr().err
