"""Limits and targets set in the model file's ``checks:`` section, and the speed,
minimum-load and system-life verdicts they drive.

The model is a uniform shaft (d = 40 mm, E = 210 GPa, Euler-Bernoulli, no shaft
weight) on two supports 260 mm apart with 2000 N at mid-span, so every number the
verdicts use has a closed form:

* reactions 1000 N each, Fa = 0, so P = Fr = 1000 N for both bearings (statics; ISO
  281:2007 6.2: X = 1, Y = 0 when Fa = 0 for a radial ball bearing, P = Fr for a
  cylindrical roller bearing);
* deflection under the load F L^3 / (48 E I) and slope at the supports F L^2 / (16 E I)
  (Roark's Formulas for Stress and Strain, simply supported beam, centre load);
* L10 = (C/P)^p 10^6 rev, p = 3 ball, 10/3 roller (ISO 281:2007 eq. 1, 2);
* system life with equal Weibull slopes e at R = 0.9: L = (sum L_i^-e)^(-1/e), and at
  reliability R: L_R = (ln R / ln 0.9)^(1/e) L (hand-derived from prod S_i = R with
  S_i = exp(ln 0.9 (L/L_i)^e), the Lundberg-Palmgren two-parameter Weibull of ISO 281);
* minimum load 0.01 C ball, 0.02 C roller and the limiting-speed rule n <= limit are
  common practice, no source.

The CLI runs in-process (``main``), each model once per test.
"""

from __future__ import annotations

import contextlib
import io
import json
import logging
import math
from pathlib import Path
from typing import Any

import pytest

from shaftsys import analyse, load_model
from shaftsys.cli import main
from shaftsys.io.loader import load_model_text
from shaftsys.report.html import render_report
from shaftsys.report.tables import operating_table

F_N = 2000.0
L_MM = 260.0
E_MPA = 210_000.0
D_MM = 40.0
I_MM4 = math.pi * D_MM**4 / 64.0
SPEED_RPM = 1500.0

BASE = """\
shaftsys: 1
units: internal
materials: {{steel: {{E: 210000, nu: 0.3, density: 7850, Su: 650, Sy: 430}}}}
solver: {{shear_deformation: false, shaft_weight: false}}
life: {{target: 20000 h, reliability: {reliability}}}
shafts:
  - id: s
    material: steel
    steps: [{{length: 300, d: 40}}]
    bearings:
      - {{id: A, type: deep_groove_ball, at: 20, d: 40, D: 80, C: {C_A}, C0: 80000,
         axial: both, limiting_speed: {n_lim}}}
      - {{id: B, type: cylindrical_roller, at: 280, d: 40, D: 80, C: 40000, C0: 50000}}
    elements:
      - {{id: L, type: load, at: 150}}
      - {{id: g, type: gear, at: 150, module: 3 mm, teeth: 40, mesh_angle: 0 deg}}
cases:
  - {{id: c1, share: 1, speed: {speed}, loads: {{L: {{force: [0, -2000, 0]}}}}}}
{checks}"""


def model_text(checks: str = "", *, C_A: float = 120_000.0, n_lim: float = 1000.0,
               reliability: float = 0.9, speed: float = SPEED_RPM) -> str:
    return BASE.format(checks=checks, C_A=C_A, n_lim=n_lim, reliability=reliability,
                       speed=speed)


def run(tmp_path: Path, text: str) -> tuple[int, dict[str, Any] | None, str]:
    """``check --json`` in-process; (exit code, JSON or None, stderr)."""
    path = tmp_path / "m.yaml"
    path.write_text(text, encoding="utf-8")
    out = tmp_path / "r.json"
    out.unlink(missing_ok=True)
    levels = {n: logging.getLogger(n).level for n in ("shaftsys", "shaftsys.bearings")}
    err = io.StringIO()
    try:
        with contextlib.redirect_stdout(io.StringIO()), contextlib.redirect_stderr(err):
            code = main(["check", str(path), "--quiet", "--json", str(out)])
    finally:
        for n, level in levels.items():
            logging.getLogger(n).setLevel(level)
    data = json.loads(out.read_text("utf-8")) if out.exists() else None
    return code, data, err.getvalue()


def _op(data: dict[str, Any], bearing: str, check: str) -> dict[str, Any]:
    b = next(b for b in data["bearings"] if b["id"] == bearing)
    return next(c for c in b["operating"] if c["check"] == check)


# ------------------------------------------------------------------ speed, min load
def test_speed_and_minimum_load_fail_the_support(tmp_path: Path) -> None:
    """A: 1500 rpm against 1000 rpm (ratio 1.5, fail); P = 1000 N against 0.01 * 120 kN =
    1200 N (ratio 0.8333, fail). B: P = 1000 N against 0.02 * 40 kN = 800 N (1.25, pass),
    no limiting speed (not evaluated, does not count). Exit 1, both named.
    """
    code, data, _ = run(tmp_path, model_text())
    assert code == 1 and data is not None
    speed = _op(data, "A", "limiting_speed")
    assert speed["value_rpm"] == pytest.approx(SPEED_RPM)
    assert speed["limit_rpm"] == pytest.approx(1000.0)
    assert speed["ratio"] == pytest.approx(1.5)
    assert speed["verdict"] == "fail" and speed["counts"] is True
    load_a = _op(data, "A", "minimum_load")
    assert load_a["value_N"] == pytest.approx(F_N / 2, rel=1e-9)
    assert load_a["limit_N"] == pytest.approx(0.01 * 120_000.0)
    assert load_a["ratio"] == pytest.approx(1000.0 / 1200.0, rel=1e-9)
    assert load_a["verdict"] == "fail"
    load_b = _op(data, "B", "minimum_load")
    assert load_b["limit_N"] == pytest.approx(0.02 * 40_000.0)
    assert load_b["ratio"] == pytest.approx(1.25, rel=1e-9)
    assert load_b["verdict"] == "pass"
    speed_b = _op(data, "B", "limiting_speed")
    assert speed_b["verdict"] == "not evaluated" and speed_b["counts"] is False
    assert "no limiting speed" in speed_b["reason"]
    assert set(data["failed_checks"]) >= {"limiting speed of bearing 'A'",
                                          "minimum load of bearing 'A'"}
    a = next(b for b in data["bearings"] if b["id"] == "A")
    assert a["verdict"] == "fail" and a["life"]["ok"] is True   # life and s0 pass
    assert a["life"]["speed_ratio"] == pytest.approx(1.5)
    assert a["life"]["min_load_ratio"] == pytest.approx(1000.0 / 1200.0, rel=1e-9)


def test_advisory_checks_are_shown_and_do_not_decide(tmp_path: Path) -> None:
    """The same failures marked advisory (model-wide speed, per-bearing min_load): the
    run passes (exit 0), the checks keep their numbers and say fail (advisory).
    """
    checks = "checks: {speed: advisory, bearings: {A: {min_load: advisory}}}\n"
    code, data, _ = run(tmp_path, model_text(checks))
    assert code == 0 and data is not None and data["ok"] is True
    speed = _op(data, "A", "limiting_speed")
    assert speed["verdict"] == "fail" and speed["mode"] == "advisory"
    assert speed["counts"] is False and speed["ratio"] == pytest.approx(1.5)
    assert _op(data, "A", "minimum_load")["mode"] == "advisory"
    assert _op(data, "B", "minimum_load")["mode"] == "required"
    assert set(data["advisory_failed"]) == {
        "limiting speed of bearing 'A' (advisory)", "minimum load of bearing 'A' (advisory)"}


def test_passing_limits_pass(tmp_path: Path) -> None:
    """C = 90 kN: minimum load 900 N < 1000 N (ratio 1.111); limiting speed 2000 rpm
    > 1500 rpm (ratio 0.75): both pass and the run passes.
    """
    code, data, _ = run(tmp_path, model_text(C_A=90_000.0, n_lim=2000.0))
    assert code == 0 and data is not None
    assert _op(data, "A", "limiting_speed")["ratio"] == pytest.approx(0.75)
    assert _op(data, "A", "minimum_load")["ratio"] == pytest.approx(1000.0 / 900.0)


# ------------------------------------------------------------------ slopes, deflections
def test_slope_and_deflection_rules(tmp_path: Path) -> None:
    """Support slope F L^2/(16 E I) = 3.2e-4 rad against a per-type limit of 3e-4 rad for
    cylindrical rollers (B fails, A keeps its type's default range and passes); the gear's
    deflection F L^3/(48 E I) = 0.02775 mm against 0.01 x module 3 mm = 0.03 mm (passes);
    the rules are named in the output.
    """
    slope = F_N * L_MM**2 / (16.0 * E_MPA * I_MM4)
    defl = F_N * L_MM**3 / (48.0 * E_MPA * I_MM4)
    assert 3.0e-4 < slope < 3.3e-4 and 0.0275 < defl < 0.028   # the hand values
    checks = ("checks: {speed: advisory, min_load: advisory, "
              "bearing_slope: {cylindrical_roller: 0.0003}, gear_deflection_per_module: 0.01}\n")
    code, data, _ = run(tmp_path, model_text(checks))
    assert data is not None
    sc = data["shaft_checks"]
    b = next(c for c in sc["bearings"] if c["id"] == "B")
    a = next(c for c in sc["bearings"] if c["id"] == "A")
    assert b["cases"][0]["slope_rad"] == pytest.approx(slope, rel=1e-6)
    assert b["slope_limit_rad"] == pytest.approx(3e-4)
    assert b["slope_rule"] == "checks.bearing_slope.cylindrical_roller"
    assert b["verdict"] == "fail"
    assert a["slope_rule"].startswith("default") and a["verdict"] == "pass"
    g = sc["gears"][0]
    assert g["cases"][0]["deflection_mm"] == pytest.approx(defl, rel=1e-6)
    assert g["deflection_limit_mm"] == pytest.approx(0.03)
    assert g["deflection_rule"].startswith("checks.gear_deflection_per_module: 0.01 x")
    assert g["verdict"] == "pass"
    assert code == 1 and "slope at bearing 'B' of shaft 's'" in data["failed_checks"]


def test_per_item_overrides_win(tmp_path: Path) -> None:
    """B's own slope limit 4e-4 rad (> 3.2e-4: pass) beats the per-type 3e-4; the gear's
    own deflection 0.025 mm (< 0.02775 mm: fail) beats the model-wide fraction; the
    gear's slope 1e-5 rad stands at mid-span where the slope is 0 by symmetry (pass).
    """
    checks = ("checks:\n  speed: advisory\n  min_load: advisory\n"
              "  bearing_slope: {cylindrical_roller: 0.0003}\n"
              "  gear_deflection_per_module: 0.01\n"
              "  bearings: {B: {slope: 0.0004}}\n"
              "  gears: {g: {deflection: 0.025 mm, slope: 0.00001}}\n")
    code, data, _ = run(tmp_path, model_text(checks))
    assert data is not None
    sc = data["shaft_checks"]
    b = next(c for c in sc["bearings"] if c["id"] == "B")
    assert b["slope_rule"] == "checks.bearings.B.slope" and b["verdict"] == "pass"
    g = sc["gears"][0]
    assert g["deflection_limit_mm"] == pytest.approx(0.025)
    assert g["deflection_rule"] == "checks.gears.g.deflection"
    assert g["slope_rule"] == "checks.gears.g.slope"
    assert g["cases"][0]["slope_rad"] == pytest.approx(0.0, abs=1e-12)
    assert g["verdict"] == "fail" and code == 1


def test_model_wide_gear_slope_is_named_even_at_the_default_value(tmp_path: Path) -> None:
    """checks.gear_slope: 0.0005 (the default's value) is still the model's rule; 0.00001
    rad passes at mid-span, where the slope is 0 by symmetry (Roark, centre load).
    """
    for value, rule in (("0.0005", "checks.gear_slope"), ("0.00001", "checks.gear_slope")):
        checks = f"checks: {{speed: advisory, min_load: advisory, gear_slope: {value}}}\n"
        code, data, _ = run(tmp_path, model_text(checks))
        assert code == 0 and data is not None
        g = data["shaft_checks"]["gears"][0]
        assert g["slope_rule"] == rule
        assert g["slope_limit_rad"] == pytest.approx(float(value))


def test_default_gear_deflection_by_module(tmp_path: Path) -> None:
    """Module 3 mm: diametral pitch 25.4/3 = 8.47 <= 10, so 0.010 in = 0.254 mm (Shigley
    9th ed. Table 7-2, from memory; the limit module's own test inverts P = 25.4/m).
    """
    code, data, _ = run(tmp_path, model_text("checks: {speed: advisory, min_load: advisory}\n"))
    assert code == 0 and data is not None
    g = data["shaft_checks"]["gears"][0]
    assert g["deflection_limit_mm"] == pytest.approx(0.010 * 25.4)
    assert "diametral pitch" in g["deflection_rule"]
    assert g["slope_rule"].startswith("default 0.0005 rad")


# ------------------------------------------------------------------ fatigue settings
def test_fatigue_criterion_and_required_safety(tmp_path: Path) -> None:
    """asme_elliptic: n = 1/sqrt((sa/Se)^2 + (sm/Sy)^2) (Shigley 9th ed. eq. 7-10
    generalised) recomputed from each section's own sa, sm, Se; a required fatigue safety
    above every section's n fails the shaft.
    """
    checks = ("checks: {speed: advisory, min_load: advisory, fatigue_criterion: "
              "asme_elliptic, fatigue_safety: 99, yield_safety: 1.1}\n")
    text = model_text(checks).replace("steps: [{length: 300, d: 40}]",
                                      "steps: [{length: 150, d: 40}, {length: 150, d: 44, "
                                      "fillet: 2}]")
    text = text.replace("bearings:\n      - {id: A", "bearings:\n      - {id: A")
    code, data, _ = run(tmp_path, text.replace("at: 280, d: 40", "at: 280, d: 44"))
    assert data is not None
    st = data["shaft_checks"]["settings"]
    assert st["criterion"] == "asme_elliptic"
    assert st["required_fatigue_safety"] == 99 and st["required_yield_safety"] == 1.1
    sections = data["shafts"][0]["checks"]["sections"]
    assert sections
    for x in sections:
        sa, sm, se = x["sigma_a_MPa"], x["sigma_m_MPa"], x["Se_MPa"]
        assert x["n_fatigue"] == pytest.approx(1.0 / math.hypot(sa / se, sm / 430.0))
        assert x["verdict"] == "fail"
    assert code == 1 and "fatigue/yield of shaft 's'" in data["failed_checks"]


# ------------------------------------------------------------------ system life
def _l10_h(C: float, p: float) -> float:
    return (C / 1000.0) ** p * 1e6 / (60.0 * SPEED_RPM)


def test_system_life_targets_and_basis(tmp_path: Path) -> None:
    """Equal slopes e = 1.5 for both kinds (set in the file): L90 = (L_A^-e + L_B^-e)^(-1/e)
    with L_A = (120/1)^3, L_B = (40/1)^(10/3) 10^6 rev; at R = 0.95, L_R = (ln 0.95 /
    ln 0.9)^(1/e) L90. The target lies between the two: stated at 90 % the machine
    passes, stated at the target reliability it fails.
    """
    e = 1.5
    L_A, L_B = _l10_h(120_000.0, 3.0), _l10_h(40_000.0, 10.0 / 3.0)
    L90 = (L_A**-e + L_B**-e) ** (-1.0 / e)
    L95 = (math.log(0.95) / math.log(0.9)) ** (1.0 / e) * L90
    target = math.sqrt(L90 * L95)
    def sl(basis: str) -> str:
        return (f"  system_life: {{target: {target:.9g} h, shaft_target: 1 h, "
                f"weibull_slope_ball: 1.5, weibull_slope_roller: 1.5, reliability: {basis}}}\n")

    head = "checks:\n  speed: advisory\n  min_load: advisory\n"
    code, data, _ = run(tmp_path, model_text(head + sl("90_percent"), reliability=0.95))
    assert data is not None
    system = data["system"]
    assert system["life_90_percent_h"] == pytest.approx(L90, rel=1e-9)
    assert system["life_target_reliability_h"] == pytest.approx(L95, rel=1e-9)
    assert system["life_h"] == pytest.approx(L95, rel=1e-9)   # the existing key: at R
    assert system["stated_at"] == "90_percent" and system["stated_reliability"] == 0.9
    assert system["weibull_slope_ball"] == 1.5
    assert system["verdict"] == "pass" and code == 0
    shaft = data["shafts"][0]["system"]
    assert shaft["target_h"] == pytest.approx(1.0) and shaft["verdict"] == "pass"
    code, data, _ = run(tmp_path, model_text(head + sl("target"), reliability=0.95))
    assert data is not None and data["system"]["verdict"] == "fail" and code == 1
    assert data["system"]["verdict_life_h"] == pytest.approx(L95, rel=1e-9)
    assert "system life of the machine" in data["failed_checks"]


def test_default_weibull_slopes_and_no_target_is_information(tmp_path: Path) -> None:
    """Without a system_life section: Lundberg-Palmgren slopes 10/9 ball, 9/8 roller, no
    target, no verdict key (information only), as before the setting existed.
    """
    code, data, _ = run(tmp_path, model_text("checks: {speed: advisory, min_load: advisory}\n"))
    assert code == 0 and data is not None
    system = data["system"]
    assert system["weibull_slope_ball"] == pytest.approx(10.0 / 9.0)
    assert system["weibull_slope_roller"] == pytest.approx(9.0 / 8.0)
    assert system["target_h"] is None and "verdict" not in system
    # cross-check by a second route: prod S_i(L) = 0.9 at the reported life
    L = system["life_90_percent_h"]
    lives = {"A": _l10_h(120_000.0, 3.0), "B": _l10_h(40_000.0, 10.0 / 3.0)}
    ln_s = sum(math.log(0.9) * (L / lives[k]) ** s
               for k, s in (("A", 10.0 / 9.0), ("B", 9.0 / 8.0)))
    assert ln_s == pytest.approx(math.log(0.9), rel=1e-9)


# ------------------------------------------------------------------ round trip
def test_every_new_field_round_trips() -> None:
    """Every key of the checks section reaches the model with its value in internal
    units (mm, h, rad), per-item overrides included.
    """
    checks = """checks:
  fatigue: required
  fatigue_criterion: gerber
  fatigue_safety: 1.8
  yield_safety: 1.4
  bearing_slope: {deep_groove_ball: 0.002, cylindrical_roller: 0.0009}
  gear_slope: 0.0004
  gear_deflection: 0.05 mm
  speed: advisory
  min_load: required
  system_life: {target: 3 kh, shaft_target: 12000 h, reliability: 90_percent,
                weibull_slope_ball: 1.2, weibull_slope_roller: 1.3}
  bearings: {A: {slope: 0.0011, speed: required, min_load: advisory}}
  gears: {g: {slope: 0.0003, deflection_per_module: 0.02}}
  shafts: {s: {system_life_target: 7000 h}}
"""
    m = load_model_text(model_text(checks))
    c = m.checks
    assert c.fatigue_criterion == "gerber"
    assert (c.fatigue_safety, c.yield_safety) == (1.8, 1.4)
    assert dict(c.bearing_slope_by_type) == {"deep_groove_ball": 0.002,
                                             "cylindrical_roller": 0.0009}
    assert c.gear_slope_rad == 0.0004 and c.gear_deflection_mm == pytest.approx(0.05)
    assert c.gear_deflection_per_module is None
    assert (c.speed, c.min_load) == ("advisory", "required")
    assert c.system_life_target_h == pytest.approx(3000.0)
    assert c.shaft_system_life_target_h == pytest.approx(12000.0)
    assert c.system_reliability == "90_percent"
    assert (c.weibull_slope_ball, c.weibull_slope_roller) == (1.2, 1.3)
    a = c.bearings["A"]
    assert (a.slope_rad, a.speed, a.min_load) == (0.0011, "required", "advisory")
    assert c.mode("speed", "A") == "required" and c.mode("speed", "B") == "advisory"
    assert c.mode("min_load", "A") == "advisory" and c.mode("min_load", "B") == "required"
    g = c.gears["g"]
    assert (g.slope_rad, g.deflection_mm, g.deflection_per_module) == (0.0003, None, 0.02)
    assert c.shaft_target_h("s") == pytest.approx(7000.0)
    # and the analysis takes them: the gear's own fraction, the per-bearing slope
    result = analyse(m)
    gear = result.checks.gears[0] if result.checks else None
    assert gear is not None and gear.deflection_limit_mm == pytest.approx(0.02 * 3.0)
    assert gear.slope_limit_rad == pytest.approx(0.0003)
    bear = {b.id: b for b in result.checks.bearings} if result.checks else {}
    assert bear["A"].slope_limit_rad == pytest.approx(0.0011)
    assert bear["B"].slope_limit_rad == pytest.approx(0.0009)
    assert result.checks is not None and result.checks.settings.criterion == "gerber"
    assert result.shafts[0].system is not None
    assert result.shafts[0].system.target_h == pytest.approx(7000.0)


def test_schema_carries_the_new_keys() -> None:
    """The shipped JSON Schema states the checks section's keys and their ranges."""
    from shaftsys.io.schema import model_schema

    defs = model_schema()["$defs"]
    props = defs["checks"]["properties"]
    for key in ("fatigue_criterion", "fatigue_safety", "yield_safety", "bearing_slope",
                "gear_slope", "gear_deflection", "gear_deflection_per_module", "speed",
                "min_load", "system_life", "bearings", "gears", "shafts"):
        assert key in props
    assert props["fatigue_criterion"]["enum"] == ["goodman", "asme_elliptic", "gerber"]
    assert props["gear_slope"]["exclusiveMinimum"] == 0.0
    assert props["bearings"]["additionalProperties"] == {"$ref": "#/$defs/checks_bearing"}
    assert "reliability" in defs["checks_system_life"]["properties"]


# ------------------------------------------------------------------ bad values
@pytest.mark.parametrize(("checks", "field", "words"), [
    ("checks: {gear_slope: -0.001}\n", "checks.gear_slope", "positive"),
    ("checks: {bearing_slope: {deep_groove_ball: -1}}\n",
     "checks.bearing_slope.deep_groove_ball", "positive"),
    ("checks: {gears: {g: {deflection: -0.1 mm}}}\n", "checks.gears.g.deflection",
     "positive"),
    ("checks: {fatigue_safety: 0}\n", "checks.fatigue_safety", "positive"),
    ("checks: {fatigue_criterion: soderberg}\n", "checks.fatigue_criterion",
     "not a valid choice"),
    ("checks: {bearings: {Z: {speed: advisory}}}\n", "checks.bearings.Z",
     "not a bearing of the model"),
    ("checks: {gears: {L: {slope: 0.001}}}\n", "checks.gears.L", "not a gear of the model"),
    ("checks: {shafts: {t: {system_life_target: 1000 h}}}\n", "checks.shafts.t",
     "not a shaft of the model"),
    ("checks: {speed: sometimes}\n", "checks.speed", "not a valid choice"),
    ("checks: {gear_deflection: 0.1 mm, gear_deflection_per_module: 0.01}\n",
     "checks.gear_deflection_per_module", "both"),
    ("checks: {system_life: {target: -5 h}}\n", "checks.system_life.target", "positive"),
    ("checks: {system_life: {reliability: 0.95}}\n", "checks.system_life.reliability",
     "not a valid choice"),
])
def test_bad_values_exit_2_naming_the_field(tmp_path: Path, checks: str, field: str,
                                           words: str) -> None:
    code, data, err = run(tmp_path, model_text(checks))
    assert code == 2 and data is None
    assert f": {field}:" in err and words in err and "Traceback" not in err
    line = int(err.split("m.yaml:")[1].split(":")[0])
    assert model_text(checks).splitlines()[line - 1].startswith("checks")


def test_fraction_of_a_missing_module_is_refused(tmp_path: Path) -> None:
    text = model_text("checks: {gears: {g: {deflection_per_module: 0.01}}}\n").replace(
        "module: 3 mm, teeth: 40", "pitch_diameter: 120 mm")
    code, _, err = run(tmp_path, text)
    assert code == 2 and "checks.gears.g.deflection_per_module" in err
    assert "no module" in err


# ------------------------------------------------------------------ what users read
def test_tables_and_report_show_the_failing_speed_check() -> None:
    """The terminal table and the HTML report give the failing speed check with its
    numbers (1500 rpm, 1000 rpm, ratio 1.5) and the headline names it.
    """
    result = analyse(load_model_text(model_text()))
    table = operating_table(result)
    row = next(r for r in table.splitlines() if "limiting speed" in r and "s/A" in r)
    assert "1 500 rpm" in row and "1 000 rpm" in row and "1.50" in row and "FAIL" in row
    html = render_report(result, date="2026-01-01")
    part = html.split('id="operating-limits"')[1]
    assert "1500 rpm" in part and "1000 rpm" in part and ">1.5<" in part
    assert "LIMIT OR TARGET MISSED" in html
    # the inputs that decide the verdicts list the modes of the checks
    assert "limiting-speed check</dt><dd>required" in html
    assert "limiting speed of bearing &#x27;A&#x27;" in html


def test_bundled_models_keep_their_verdicts() -> None:
    """The bundled demos pass with the new verdicts (their invented data were adjusted
    where a real minimum-load problem showed, or the check marked advisory with the
    reason in the file).
    """
    root = Path(__file__).resolve().parent.parent / "models"
    for name in ("fan_drive", "conveyor_head", "spindle_preload"):
        assert analyse(load_model(root / f"{name}.yaml")).ok, name


@pytest.mark.parametrize("mode", ["required", "advisory"])
def test_study_variants_carry_the_operating_verdicts_of_check(mode: str) -> None:
    """A design study moves bearing A toward the load: its reaction (statics) rises from
    F 130/260 = 1000 N below the minimum load 0.01 C = 1200 N (common practice, no
    source) to above it. Every variant's ``A.min_load_ratio``, ``A.speed_ratio`` and
    ``A.ok`` equal what ``analyse`` of the moved model gives its operating checks and
    verdict, on the batched path and the one-analyse-per-variant path; an advisory
    minimum load does not fail a variant."""
    from shaftsys.study.paths import model_with
    from shaftsys.study.sweep import make_study, sweep

    checks = "" if mode == "required" else "checks: {min_load: advisory}\n"
    model = load_model_text(model_text(checks, n_lim=2000.0))
    study = make_study(model, [("bearing.A.at", "20:120:6")])
    frames = [sweep(study, batched=b) for b in (True, False)]
    seen_fail = False
    for df in frames:
        for i in range(study.n_variants):
            variant, reason = model_with(model, study.quantities, study.values_block(i, i + 1)[0])
            assert not reason
            br = analyse(variant, with_shaft_checks=False).bearing("A")
            oc = br.operating_check("minimum_load")
            assert df["A.min_load_ratio"].iloc[i] == pytest.approx(oc.ratio, rel=1e-12)
            assert df["A.speed_ratio"].iloc[i] == pytest.approx(
                br.operating_check("limiting_speed").ratio, rel=1e-12)
            assert bool(df["A.ok"].iloc[i]) == (br.verdict == "pass")
            seen_fail |= oc.ratio < 1.0
    assert seen_fail                                   # the study crosses the limit
    ok_first = bool(frames[0]["A.ok"].iloc[0])
    assert ok_first is (mode == "advisory")
    assert frames[0]["A.min_load_ratio"].iloc[0] == pytest.approx(1000.0 / 1200.0, rel=1e-9)
