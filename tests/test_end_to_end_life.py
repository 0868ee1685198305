"""End to end: geometry -> mesh force -> reactions -> spectrum -> ISO 281 life -> verdict.

Every intermediate number is worked by hand below and typed in literally.

Model: a uniform shaft, bearing A (deep-groove ball, locating) at x = 0 and bearing B
(cylindrical roller, floating) at x = 200 mm, a spur gear of pitch diameter 200 mm and
20 deg pressure angle at x = 100 mm whose pitch point lies toward +y (mesh angle 0), and
a coupling at x = 280 mm that takes the torque out. No gravity.

Hand calculation (Shigley, spur gear force analysis; statics of a simply supported
span with the load at mid-span):

* case c1: 1000 rpm, the gear drives the shaft with T = 200 N*m (power enters).
  W_t = T / r = 200 000 / 100 = 2000 N, along u_t(0) = +z (the force on the gear of a
  driven gear points along its rotation). W_r = 2000 tan 20 deg = 727.94046853 N toward
  the gear's own axis (-y). Each bearing carries half: the shaft pushes each bearing
  with Fy = -363.97023427 N, Fz = +1000 N, Fr = 1064.17777248 N, Fa = 0.
* case c2: 500 rpm, T = 400 N*m: every load doubles, Fr = 2128.35554495 N.
* shares 0.6 and 0.4: revolution weights U1 = 600/800 = 0.75, U2 = 0.25;
  n_m = 0.6*1000 + 0.4*500 = 800 rpm.
* A (ball, p = 3, C = 30 kN, Fa = 0 so P = Fr): Pm = Fr1*(0.75 + 0.25*8)^(1/3)
  = 1490.93398664 N; L10 = (30000/Pm)^3 = 8146.82748033 e6 rev;
  L10h = L10*1e6/(60*800) = 169 725.572507 h. C_req for 20 000 h at 90 %:
  Pm*(20000*60*800/1e6)^(1/3) = 14 707.8375996 N.
* B (roller, p = 10/3, C = 40 kN): Pm = 1518.35113313 N; L10h = 1 133 403.82522 h;
  C_req = 11 913.8900504 N.
"""

from __future__ import annotations

import json

import pytest

from shaftsys.analysis import analyse
from shaftsys.cli import main
from shaftsys.io.loader import load_model_text

REL = 1e-6

MODEL = """
shaftsys: 1
name: end-to-end check shaft
gravity: [0, 0, 0]
materials:
  steel: {{E: 210 GPa, nu: 0.3, density: 7850 kg/m^3}}
life: {{target: {target} h, reliability: 0.9}}
checks: {{fatigue: not_required}}   # no Su, Sy: this test is about the lives
shafts:
  - id: s
    material: steel
    steps: [{{length: 300 mm, d: 40 mm}}]
    bearings:
      - {{id: A, type: deep_groove_ball, at: 0 mm, d: 40 mm, D: 80 mm, C: 30 kN,
          C0: 19 kN, axial: both}}
      - {{id: B, type: cylindrical_roller, at: 200 mm, d: 40 mm, D: 80 mm, C: 40 kN,
          C0: 40 kN, axial: float}}
    elements:
      - {{id: gear, type: gear, at: 100 mm, pitch_diameter: 200 mm, pressure_angle: 20 deg,
          mesh_angle: 0 deg}}
      - {{id: out, type: coupling, at: 280 mm}}
cases:
  - {{id: c1, share: 0.6, speed: 1000 rpm, input: {{element: gear, torque: 200 N*m}},
      outputs: {{out: 1.0}}}}
  - {{id: c2, share: 0.4, speed: 500 rpm, input: {{element: gear, torque: 400 N*m}},
      outputs: {{out: 1.0}}}}
"""


def _result(target: float = 20000):
    return analyse(load_model_text(MODEL.format(target=target), "e2e.yaml"))


def test_reactions_from_gear_geometry():
    r = _result()
    for bid in ("A", "B"):
        c1, c2 = r.bearing(bid).loads
        assert c1.Fy_N == pytest.approx(-363.97023427, rel=REL)
        assert c1.Fz_N == pytest.approx(1000.0, rel=REL)
        assert c1.Fr_N == pytest.approx(1064.17777248, rel=REL)
        assert c1.Fa_N == pytest.approx(0.0, abs=1e-9)
        assert c2.Fr_N == pytest.approx(2128.35554495, rel=REL)
        assert c1.speed_rpm == 1000.0 and c2.speed_rpm == 500.0


def test_spectrum_life_and_required_rating():
    r = _result()
    a = r.bearing("A").life
    b = r.bearing("B").life
    assert a is not None and b is not None
    assert list(a.weights) == pytest.approx([0.75, 0.25], rel=REL)
    assert a.n_m_rpm == pytest.approx(800.0, rel=REL)
    assert a.P_eq_N == pytest.approx(1490.93398664, rel=REL)
    assert a.L10_mrev == pytest.approx(8146.82748033, rel=REL)
    assert a.L10_h == pytest.approx(169725.572507, rel=REL)
    assert a.C_required_N == pytest.approx(14707.8375996, rel=REL)
    assert a.margin == pytest.approx(30000 / 14707.8375996, rel=REL)
    assert b.P_eq_N == pytest.approx(1518.35113313, rel=REL)
    assert b.L10_h == pytest.approx(1133403.82522, rel=REL)
    assert b.C_required_N == pytest.approx(11913.8900504, rel=REL)
    # no lubrication data: the verdict is on a1*L10 with a1 = 1 at 90 %
    assert a.Lnm_h == pytest.approx(169725.572507, rel=REL)
    assert "a1" in a.life_basis and a.ok and b.ok


def test_unreachable_target_flips_exit_code_and_names_support(tmp_path, capsys):
    path = tmp_path / "e2e.yaml"
    path.write_text(MODEL.format(target=200000))
    out = tmp_path / "r.json"
    code = main(["check", str(path), "--json", str(out)])
    assert code == 1
    text = capsys.readouterr().out
    assert "FAILING: A" in text
    data = json.loads(out.read_text())
    verdicts = {b["id"]: b["life"]["ok"] for b in data["bearings"]}
    assert verdicts == {"A": False, "B": True}
    assert main(["check", str(tmp_path / "e2e.yaml").replace("e2e", "e2e"), "--quiet"]) == 1
    path.write_text(MODEL.format(target=20000))
    assert main(["check", str(path), "--quiet"]) == 0
