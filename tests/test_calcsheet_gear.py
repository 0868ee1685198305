"""The gear calculation sheet (``check --explain GEAR``) against a hand-worked free body.

Source: Shigley's Mechanical Engineering Design, force analysis of spur gears:
T = P/omega, Wt = 2T/d (= T/r), Wr = Wt tan(phi). The test shaft of ``tests/conftest.py``
with 40 kW at 1450 rpm through a spur gear of d = 120 mm, phi = 20 deg (invented
numbers): T = 40 000 W / (2 pi 1450/60 1/s) = 263.43 N*m, Wt = 4390.5 N, Wr = 1598.0 N.
The sheet's numbers must equal this hand value and the force the solve applied.
"""

from __future__ import annotations

import copy
import math
import re
from pathlib import Path

import pytest

import shaftsys
from shaftsys.cli.main import main
from shaftsys.report.calcsheet import explain_gear
from tests.conftest import BASE_MODEL, dump_model


def _model(tmp_path: Path) -> Path:
    m = copy.deepcopy(BASE_MODEL)
    for c in m["cases"]:
        c["input"]["power"] = "40 kW"
    path = tmp_path / "gear.yaml"
    path.write_text(dump_model(m), encoding="utf-8")
    return path


def _number(sheet: str, case: str, name: str) -> float:
    block = sheet.split(f"case {case}:")[1]
    m = re.search(rf"{name} = [^\n]*?= ([-0-9.e+]+) N", block)
    assert m, name
    return float(m.group(1))


def test_gear_sheet_equals_hand_free_body_and_result(tmp_path: Path) -> None:
    result = shaftsys.analyse(shaftsys.load_model(str(_model(tmp_path))))
    sheet = explain_gear(result, "gear1")
    for case, n_rpm in (("run", 1450.0), ("slow", 700.0)):
        T = 40_000.0 / (2.0 * math.pi * n_rpm / 60.0) * 1000.0   # N*mm
        Wt = 2.0 * T / 120.0
        Wr = Wt * math.tan(math.radians(20.0))
        # second route for Wt: T/r with r = 60 mm
        assert Wt == pytest.approx(T / 60.0, rel=1e-12)
        assert _number(sheet, case, "Wt") == pytest.approx(Wt, rel=1e-5)
        assert _number(sheet, case, r"Wr") == pytest.approx(Wr, rel=1e-5)
        cs = next(c for c in result.shafts[0].cases if c.case == case)
        (gear_load,) = [a for a in cs.applied if a.element == "gear1"]
        assert math.hypot(*gear_load.force_N) == pytest.approx(math.hypot(Wt, Wr), rel=1e-9)
    assert "model line" in sheet and "equilibrium" in sheet


def test_explain_option_takes_a_gear(tmp_path: Path, capsys: pytest.CaptureFixture[str]
                                     ) -> None:
    path = _model(tmp_path)
    main(["check", str(path), "-q", "--explain", "gear1"])
    assert "CALCULATION SHEET - gear gear1" in capsys.readouterr().out
    assert main(["check", str(path), "-q", "--explain", "nope"]) == 2
    assert "gear1" in capsys.readouterr().err
