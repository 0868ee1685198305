"""The fatigue-section and slope sheets (``check --explain SHAFT@X``, and the slope part
of a bearing's or gear's sheet) recomputed by hand from their own printed inputs.

Sources (Shigley's Mechanical Engineering Design, 9th ed., from memory; each recalled
constant is used once here and the code's value must agree with it, a second route):
Se' = 0.5 Sut (eq. 6-8, Sut <= 1400 MPa); ka = 4.51 Sut^-0.265 machined (Table 6-2);
kb = 1.51 d^-0.157 for 51 < d <= 254 mm (eq. 6-20); ke = 0.868 at R = 0.95 (Table 6-5);
Kf = 1 + q (Kt - 1) (eq. 6-32); sigma = Kf 32 M/(pi d^3), tau = Kfs 16 T/(pi d^3);
DE-Goodman 1/n = sa'/Se + sm'/Sut (eq. 7-7). Slopes: the resultant of the two plane
slopes (plain geometry).
"""

from __future__ import annotations

import math
import re
from pathlib import Path

import pytest

import shaftsys
from shaftsys.cli.main import main
from shaftsys.report.calcsheet import explain_deflection, explain_section

REDUCER = Path(__file__).resolve().parents[1] / "models" / "belt_reducer.yaml"


@pytest.fixture(scope="module")
def result():  # type: ignore[no-untyped-def]
    return shaftsys.analyse(shaftsys.load_model(str(REDUCER)))


def _num(text: str, label: str) -> float:
    m = re.search(re.escape(label) + r"\s*=?\s*([-0-9.e+]+)", text)
    assert m, label
    return float(m.group(1))


def test_keyseat_section_sheet_by_hand(result) -> None:  # type: ignore[no-untyped-def]
    sheet = explain_section(result, "output", 335.0)
    block = sheet.split("feature keyseat_end_mill:")[1].split("feature ")[0]
    Sut, d = 650.0, 75.0
    assert _num(block, "Se' =") == pytest.approx(0.5 * Sut, rel=1e-6)
    assert _num(block, "ka =") == pytest.approx(4.51 * Sut ** -0.265, rel=1e-5)
    assert _num(block, "kb =") == pytest.approx(1.51 * d ** -0.157, rel=1e-5)
    assert _num(block, "ke =") == pytest.approx(0.868, rel=1e-6)
    ka, kb, kc, kd, ke = (_num(block, f"{k} =") for k in ("ka", "kb", "kc", "kd", "ke"))
    Se = _num(block, "-> Se =")
    assert Se == pytest.approx(ka * kb * kc * kd * ke * 0.5 * Sut, rel=1e-5)
    Kt, q, Kf = _num(block, "Kt ="), _num(block, "q ="), _num(block, "-> Kf = 1 + q (Kt - 1) =")
    assert Kf == pytest.approx(1.0 + q * (Kt - 1.0), rel=1e-5)
    Ta, Kfs = _num(block, "Ta ="), _num(block, "-> Kfs =")
    tau_a = _num(block, "tau_a = Kfs 16 Ta/(pi d^3) =")
    assert tau_a == pytest.approx(Kfs * 16.0 * abs(Ta) / (math.pi * d**3), rel=1e-5)
    Ma = _num(block, "Ma =")
    assert _num(block, "sigma_a = Kf 32 Ma/(pi d^3) =") == pytest.approx(
        Kf * 32.0 * Ma / (math.pi * d**3), rel=1e-5)
    sa = _num(block, "sigma_a' = sqrt((sigma_a + sigma_ax,a/0.85)^2 + 3 tau_a^2) =")
    sm = _num(block, "sigma_m' =")
    n = _num(block, "-> n_f =")
    assert n == pytest.approx(1.0 / (sa / Se + sm / Sut), rel=1e-5)
    sec = next(s for s in result.checks.shaft("output").sections
               if s.feature == "keyseat_end_mill")
    assert n == pytest.approx(sec.n_fatigue, rel=1e-5)
    assert "model line" in block


def test_slope_sheet_and_explain_option(result, capsys: pytest.CaptureFixture[str]  # type: ignore[no-untyped-def]
                                        ) -> None:
    sheet = explain_deflection(result, "mid_A")
    for line in sheet.splitlines()[3:-1]:
        parts = [float(v) for v in re.findall(r"\(\(?([-0-9.e+]+)\)\^2", line)]
        slope = float(re.search(r"\^2\) = ([-0-9.e+]+) rad", line).group(1))
        assert slope == pytest.approx(math.hypot(parts[0], parts[1]), rel=1e-5)
    assert "rule:" in sheet and "verdict:" in sheet
    assert main(["check", str(REDUCER), "-q", "--explain", "output@335"]) == 0
    assert "DE-Goodman" in capsys.readouterr().out
    assert main(["check", str(REDUCER), "-q", "--explain", "output@336"]) == 2
    assert "SHAFT@X" in capsys.readouterr().err


def test_bearing_sheet_states_the_operating_checks(result) -> None:  # type: ignore[no-untyped-def]
    """The bearing sheet's verdict block carries the minimum-load check with its numbers:
    the smallest running P against 0.01 C for a ball bearing (common practice, no
    source), the mode (advisory here, by the demo's checks: section) and that it then
    does not decide the support's verdict."""
    from shaftsys.report.calcsheet import explain_bearing

    br = result.bearing("in_B")
    oc = br.operating_check("minimum_load")
    sheet = explain_bearing(result, "in_B")
    line = next(s for s in sheet.splitlines() if "smallest running P" in s)
    assert f"(case {oc.case})" in line and "[advisory" in line
    assert oc.limit == pytest.approx(0.01 * br.bearing.C_N, rel=1e-12)
    m = re.search(r"= ([0-9.]+) N \(case [^)]*\) < ([0-9.]+) N", line)
    assert m and float(m.group(1)) == pytest.approx(oc.value, rel=1e-5)
    assert float(m.group(2)) == pytest.approx(oc.limit, rel=1e-5)
    assert f"support in_B: {br.verdict.upper()}" in sheet


def test_system_life_sheet_by_an_independent_root(result) -> None:  # type: ignore[no-untyped-def]
    """Independent bearings in series: S_sys = prod 0.9^((L/L_i)^e_i) (the Weibull
    product behind ISO 281's 90 % lives; Lundberg-Palmgren, from memory). From the
    sheet's printed L_i and e_i, scipy's brentq solves sum (L/L_i)^e_i = ln R/ln 0.9
    and must find the sheet's L (and the result's system life)."""
    from scipy.optimize import brentq

    from shaftsys.report.calcsheet import explain_system

    sheet = explain_system(result)
    block = sheet.split("the machine:")[1]
    R = float(re.search(r"stated at R = ([0-9.]+)", block).group(1))
    terms = [(float(a), float(b)) for a, b in
             re.findall(r"= ([0-9.e+]+) h, e = ([0-9.]+), \(L/L_i\)", block)]
    assert len(terms) == 6
    target = math.log(R) / math.log(0.9)
    L = brentq(lambda x: sum((x / Li) ** e for Li, e in terms) - target, 1.0, 1e9,
               xtol=1e-6)
    assert _num(block, "L =") == pytest.approx(L, rel=1e-5)
    assert result.system_life_h == pytest.approx(L, rel=1e-5)
    assert "information, not a criterion" in block or "target" in block
