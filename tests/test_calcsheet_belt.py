"""The belt calculation sheet (``check --explain PULLEY``) against a hand-worked belt.

Source: Shigley's Mechanical Engineering Design, flexible mechanical elements: torque
T = P/omega, T1 - T2 = T/r, installed pretension T1 + T2 = 2 Ti, V-belt slip limit
T1/T2 <= exp(mu phi / sin(beta/2)) (from memory); the hub force is the vector sum of
the strand tensions, whose directions differ by 180 deg - wrap (plain statics, law of
cosines). Inputs: the bundled reducer's motor pulley (invented numbers): 15 kW at
1460 rpm, D = 180 mm, Ti = 1450 N, mu = 0.5, phi = 160 deg, beta = 38 deg.
"""

from __future__ import annotations

import math
import re
from pathlib import Path

import pytest

import shaftsys
from shaftsys.cli.main import main
from shaftsys.report.calcsheet import explain_pulley

REDUCER = Path(__file__).resolve().parents[1] / "models" / "belt_reducer.yaml"


def _after(block: str, label: str) -> float:
    m = re.search(rf"{label}[^\n]*?= ([-0-9.e+]+)", block)
    assert m, label
    return float(m.group(1))


def test_belt_sheet_equals_the_hand_worked_belt(capsys: pytest.CaptureFixture[str]) -> None:
    result = shaftsys.analyse(shaftsys.load_model(str(REDUCER)))
    sheet = explain_pulley(result, "pulley")
    block = sheet.split("case forward_full:")[1].split("case ")[0]
    T = 15_000.0 / (2.0 * math.pi * 1460.0 / 60.0) * 1000.0          # N*mm
    dT = T / 90.0
    T1, T2 = 1450.0 + dT / 2.0, 1450.0 - dT / 2.0
    assert _after(block, r"T1 - T2 = \|T\|/r = [^=]*") == pytest.approx(dT, rel=1e-5)
    assert _after(block, "; T1") == pytest.approx(T1, rel=1e-5)
    assert _after(block, "N, T2") == pytest.approx(T2, rel=1e-5)
    limit = math.exp(0.5 * math.radians(160.0) / math.sin(math.radians(19.0)))
    m = re.search(r"T1/T2 = ([0-9.]+) against the capstan limit ([0-9.]+) -> holds", block)
    assert m and float(m.group(1)) == pytest.approx(T1 / T2, rel=1e-5)
    assert float(m.group(2)) == pytest.approx(limit, rel=1e-5)
    hub = math.sqrt(T1 * T1 + T2 * T2 + 2.0 * T1 * T2 * math.cos(math.radians(20.0)))
    assert _after(block, r"\|F\|") == pytest.approx(hub, rel=1e-5)
    assert "model line" in sheet
    main(["check", str(REDUCER), "-q", "--explain", "pulley"])
    assert "CALCULATION SHEET - pulley pulley" in capsys.readouterr().out
