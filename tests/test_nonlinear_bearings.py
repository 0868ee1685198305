"""Nonlinear bearing stiffness in the shaft solve (``solver: {bearing_stiffness:
nonlinear}``): the shaft and its bearings' rolling-element loads solved together.

References, one per test:

* stiff limit: bearings made a billion times stiffer (contact constant K x 1e9) give the
  reactions of the same shaft on rigid supports; a roller bearing's slices also hold
  the tilt, so the limit is the rigid support clamped against tilt (the rigid solve is
  itself checked against PyNiteFEA and Roark in tests/test_fe_bending.py);
* redistribution on a statically indeterminate 3-bearing shaft: PyNiteFEA 3.2
  (FEModel3D, Euler-Bernoulli frame) with linear springs equal to the converged secant
  stiffness of each bearing (radial and tilt) reproduces the reactions;
* lives from the converged reactions: ISO 281:2007 eq. (1) L10 = (C/P)^3, P = Fr for a
  radial ball bearing without thrust;
* preloaded adjusted pair at separate seats under thrust: the hand formulation of the
  pair, each bearing under pure thrust by Harris' relation for a ball row (all balls
  alike: s = sqrt((A sin a0 + da)^2 + (A cos a0)^2), Fa = Z K (s - A)^1.5 (A sin a0 +
  da)/s; Harris, *Rolling Bearing Analysis*) and the shaft between the seats as a bar
  (shortening Fa_P L/(EA)), solved by scipy's fsolve; and the classic closed form that a
  pair preloaded by P0 unloads one bearing at Ka = 2^1.5 P0 (constant contact angle,
  rigid shaft; hand derivation: Fa ~ delta^1.5, delta_N = 0 at delta_P = 2 delta0);
* equilibrium of a tapered pair: the thrusts by compatibility add up to the external
  thrust (statics);
* exit codes: non-convergence is exit 3 naming shaft, case and residual; a bad switch
  value is exit 2 naming the field.
"""

from __future__ import annotations

import dataclasses
import json
import math
from pathlib import Path

import numpy as np
import pytest

from shaftsys.analysis import analyse, nonlinear
from shaftsys.analysis.solve import solve_model
from shaftsys.cli import main
from shaftsys.io.loader import load_model_text

MODELS = Path(__file__).resolve().parent.parent / "models"

THREE = """\
shaftsys: 1
name: three-bearing shaft
gravity: [0, 0, 0]
materials:
  steel: {{E: 210 GPa, nu: 0.3, density: 7850 kg/m^3}}
solver: {{bearing_stiffness: nonlinear, shear_deformation: false}}
shafts:
  - id: s
    material: steel
    steps:
      - {{length: 400 mm, d: 30 mm}}
    bearings:
{bearings}
    elements:
      - {{id: F, type: load, at: 100 mm}}
      - {{id: G, type: load, at: 300 mm}}
cases:
  - {{id: a, share: 0.5, speed: 1000 rpm, loads: {{F: {{force: [0 N, -4000 N, 0 N]}},
                                               G: {{force: [0 N, -1000 N, 0 N]}}}}}}
  - {{id: b, share: 0.5, speed: 1000 rpm, loads: {{F: {{force: [0 N, -2000 N, 1500 N]}},
                                               G: {{force: [0 N, 0 N, -3000 N]}}}}}}
"""

BALLS = "\n".join(
    f"      - {{id: {i}, type: deep_groove_ball, at: {x} mm, d: 30 mm, D: 62 mm, B: 16 mm, "
    f"C: 20 kN, C0: 11 kN, axial: {role}, interior: {{Dw: 9.5 mm, Z: 9, "
    "pitch_diameter: 46 mm}}"
    for i, x, role in (("A", 0, "both"), ("B", 200, "float"), ("C", 400, "float")))

ROLLERS = "\n".join(
    [f"      - {{id: {i}, type: cylindrical_roller, at: {x} mm, d: 30 mm, D: 62 mm, "
     "B: 16 mm, C: 20 kN, C0: 11 kN, axial: float, interior: {Dw: 8 mm, Z: 14, "
     "pitch_diameter: 46 mm, Lwe: 10 mm}}"
     for i, x in (("A", 0), ("B", 200), ("C", 400))]
    + ["      - {id: T, type: thrust_ball, at: 20 mm, d: 30 mm, D: 52 mm, B: 16 mm, "
       "C: 20 kN, C0: 40 kN, contact_angle: 90 deg, axial: both}"])


def _rigid(model):  # the same model with the supports as typed
    return dataclasses.replace(model, solver=dataclasses.replace(
        model.solver, bearing_stiffness="rigid"))


def _reactions(solved) -> np.ndarray:
    """(bearing, case, [Fy, Fz, My, Mz]) of every radial bearing."""
    return np.array([[[ld.Fy_N, ld.Fz_N, ld.My_Nmm, ld.Mz_Nmm] for ld in b.loads]
                     for b in solved.bearings if b.bearing.kind.value != "thrust_ball"])


def test_very_stiff_bearings_give_the_rigid_support_reactions(monkeypatch) -> None:
    model = load_model_text(THREE.format(bearings=ROLLERS))
    rigid = _rigid(model)
    shaft = rigid.shafts[0]
    clamped = dataclasses.replace(rigid, shafts=(dataclasses.replace(shaft, bearings=tuple(
        dataclasses.replace(b, tilt_stiffness_Nmm_rad=1e16) for b in shaft.bearings)),))
    ref = _reactions(solve_model(clamped))
    real = _reactions(solve_model(model))
    scale = np.abs(ref[..., :2]).max()
    # with their real compliance the bearings visibly change the reactions ...
    assert np.abs(real[..., :2] - ref[..., :2]).max() > 0.01 * scale
    rows_of = nonlinear.row_geometries
    monkeypatch.setattr(nonlinear, "row_geometries", lambda b: [
        dataclasses.replace(r, K_N=r.K_N * 1e9) for r in rows_of(b)])
    stiff = solve_model(model)
    got = _reactions(stiff)
    # ... and a billion times stiffer they are the rigid, tilt-clamped supports
    np.testing.assert_allclose(got[..., :2], ref[..., :2], rtol=0, atol=1e-6 * scale)
    np.testing.assert_allclose(got[..., 2:], ref[..., 2:], rtol=0,
                               atol=1e-6 * np.abs(ref[..., 2:]).max())
    assert stiff.shafts[0].nonlinear.axial == "axial rule"   # the thrust bearing locates


def test_compliance_redistributes_load_as_a_spring_supported_beam() -> None:
    """Case a (loads in the x-y plane): each bearing's converged secant stiffness, radial
    Fy/uy and tilt Mz/theta_z, as linear springs under the same beam in PyNiteFEA."""
    from Pynite import FEModel3D

    model = load_model_text(THREE.format(bearings=BALLS))
    result = analyse(model, with_shaft_checks=False)
    rigid = solve_model(_rigid(model))
    fe = FEModel3D()
    fe.add_material("steel", 210_000.0, 210_000.0 / 2.6, 0.3, 7.85e-9)
    xs = [0.0, 100.0, 200.0, 300.0, 400.0]
    for i, x in enumerate(xs):
        fe.add_node(f"N{i}", x, 0.0, 0.0)
    inertia = math.pi * 30.0**4 / 64
    fe.add_section("S", math.pi * 30.0**2 / 4, inertia, inertia, 2 * inertia)
    for i in range(4):
        fe.add_member(f"M{i}", f"N{i}", f"N{i + 1}", "steel", "S")
    for i in range(5):  # a planar problem: out-of-plane motion and twist held
        fe.def_support(f"N{i}", i == 0, False, True, i == 0, True, False)
    springs = {}
    for bid, node in (("A", "N0"), ("B", "N2"), ("C", "N4")):
        b = result.bearing(bid)
        c = result.internal[bid]["cases"][0]
        ky = b.loads[0].Fy_N / c["ring_displacement_mm"][0]
        kt = b.loads[0].Mz_Nmm / c["ring_tilt_rad"][1]
        assert ky > 0 and kt > 0
        springs[bid] = (node, ky, kt)
        fe.def_support_spring(node, "DY", ky)
        fe.def_support_spring(node, "RZ", kt)
    fe.add_node_load("N1", "FY", -4000.0)
    fe.add_node_load("N3", "FY", -1000.0)
    fe.analyze_linear(check_statics=False)
    for bid, (node, ky, kt) in springs.items():
        n = fe.nodes[node]
        ld = result.bearing(bid).loads[0]
        # force of the shaft on the spring = k * displacement
        assert ld.Fy_N == pytest.approx(ky * n.DY["Combo 1"], rel=1e-5, abs=1e-3)
        assert ld.Mz_Nmm == pytest.approx(kt * n.RZ["Combo 1"], rel=1e-5, abs=1e-2)
    # the middle bearing gives load to the outer ones: visibly more than round-off
    mid_rigid = next(b for b in rigid.bearings if b.bearing.id == "B").loads[0].Fy_N
    mid = result.bearing("B").loads[0].Fy_N
    assert abs(mid - mid_rigid) > 0.02 * abs(mid_rigid)
    # lives follow the converged reactions: ISO 281 L10 = (C/P)^3, P = Fr without thrust
    for bid in ("A", "B", "C"):
        b = result.bearing(bid)
        Fr = b.loads[0].Fr_N
        assert b.life.case_L10_mrev[0] == pytest.approx((20_000.0 / Fr) ** 3, rel=1e-9)


PAIR = """\
shaftsys: 1
name: preloaded pair at separate seats
gravity: [0, 0, 0]
materials:
  steel: {{E: 210 GPa, nu: 0.3, density: 7850 kg/m^3}}
solver: {{bearing_stiffness: nonlinear}}
shafts:
  - id: s
    material: steel
    steps:
      - {{length: 300 mm, d: 40 mm}}
    bearings:
      - {{id: N, type: angular_contact_ball, at: 50 mm, d: 40 mm, D: 68 mm, B: 15 mm,
         C: 20 kN, C0: 15 kN, contact_angle: 25 deg, axial: -x, pair: P,
         pressure_centre_offset: 0 mm,
         interior: {{Dw: 8 mm, Z: 14, pitch_diameter: 54 mm, fi: 0.52, fo: 0.53}}}}
      - {{id: P, type: angular_contact_ball, at: 250 mm, d: 40 mm, D: 68 mm, B: 15 mm,
         C: 20 kN, C0: 15 kN, contact_angle: 25 deg, axial: +x, pair: N,
         pressure_centre_offset: 0 mm,
         interior: {{Dw: 8 mm, Z: 14, pitch_diameter: 54 mm, fi: 0.52, fo: 0.53,
                    preload: {P0} N}}}}
    elements:
      - {{id: nose, type: load, at: 10 mm}}
cases:
{cases}
"""


def _pair_text(P0: float, thrusts: list[float]) -> str:
    cases = "\n".join(
        f"  - {{id: k{i}, share: {1 / len(thrusts)}, speed: 1000 rpm, loads: "
        f"{{nose: {{force: [{Ka} N, 0 N, 0 N]}}}}}}" for i, Ka in enumerate(thrusts))
    return PAIR.format(P0=P0, cases=cases)


def _thrust_force(da: float, A: float, a0: float, ZK: float) -> float:
    """Harris' pure-thrust relation of a ball row (every ball alike) [N]."""
    s = math.hypot(A * math.sin(a0) + da, A * math.cos(a0))
    return ZK * max(s - A, 0.0) ** 1.5 * (A * math.sin(a0) + da) / s


def test_preloaded_pair_shares_thrust_as_the_hand_formula() -> None:
    from scipy.optimize import brentq, fsolve

    from shaftsys.bearings.interior import point_contact_constant

    P0 = 500.0
    thrusts = [0.0, 600.0, 1200.0]   # below the relief thrust (both bearings loaded)
    model = load_model_text(_pair_text(P0, thrusts))
    solved = solve_model(model)
    got = {b.bearing.id: [ld.Fx_N for ld in b.loads] for b in solved.bearings}
    A = (0.52 + 0.53 - 1.0) * 8.0
    a0 = math.radians(25.0)
    ZK = 14 * point_contact_constant(8.0, 54.0, 25.0, 0.52, 0.53)
    EA = 210_000.0 * math.pi * 40.0**2 / 4
    L = 200.0
    d0 = brentq(lambda d: _thrust_force(d, A, a0, ZK) - P0, 0.0, 1.0, xtol=1e-15)
    shift = d0 + 0.5 * P0 * L / EA  # interference that gives P0 on the mounted shaft
    for k, Ka in enumerate(thrusts):
        def equations(v: np.ndarray, Ka: float = Ka) -> list[float]:
            uN, uP = v
            FP = _thrust_force(shift + uP, A, a0, ZK)
            FN = _thrust_force(shift - uN, A, a0, ZK)
            return [FP - FN - Ka, uP - uN + FP * L / EA]
        uN, uP = fsolve(equations, [0.0, 0.0], xtol=1e-13)
        FP = _thrust_force(shift + uP, A, a0, ZK)
        FN = _thrust_force(shift - uN, A, a0, ZK)
        assert FN > 0.05 * P0
        assert got["P"][k] == pytest.approx(FP, rel=1e-6)     # P takes thrust toward +x
        assert got["N"][k] == pytest.approx(-FN, rel=1e-6)
    assert got["P"][0] == pytest.approx(P0, rel=1e-6)          # the preload as mounted
    assert got["P"][1] - (-got["N"][1]) == pytest.approx(600.0, rel=1e-8)


def test_preloaded_pair_unloads_near_two_to_the_one_and_a_half_preloads() -> None:
    P0 = 400.0
    Ka = 2.0**1.5 * P0
    solved = solve_model(load_model_text(_pair_text(P0, [0.8 * Ka, Ka])))
    N = next(b for b in solved.bearings if b.bearing.id == "N")
    # closed form at 0.8 Ka: (1 + x)^1.5 - (1 - x)^1.5 = 0.8 * 2^1.5, FN = P0 (1 - x)^1.5
    from scipy.optimize import brentq

    x = brentq(lambda x: (1 + x) ** 1.5 - (1 - x) ** 1.5 - 0.8 * 2.0**1.5, 0.0, 1.0)
    assert 0.05 < (1 - x) ** 1.5 < 0.2          # the closed form itself: about 0.10
    # the contact angle grows and the shaft shortens, so agreement to 2 % of P0
    assert -N.loads[0].Fx_N / P0 == pytest.approx((1 - x) ** 1.5, abs=0.02)
    assert -N.loads[1].Fx_N < 0.02 * P0


def test_tapered_pair_at_low_thrust_converges_and_balances() -> None:
    text = """\
shaftsys: 1
name: tapered pair
gravity: [0, 0, 0]
materials:
  steel: {E: 210 GPa, nu: 0.3, density: 7850 kg/m^3}
solver: {bearing_stiffness: nonlinear}
shafts:
  - id: s
    material: steel
    steps:
      - {length: 300 mm, d: 40 mm}
    bearings:
      - {id: P, type: tapered_roller, at: 50 mm, d: 40 mm, D: 80 mm, B: 20 mm, C: 60 kN,
         C0: 70 kN, e: 0.37, Y: 1.6, axial: +x, pair: N, interior: {}}
      - {id: N, type: tapered_roller, at: 250 mm, d: 40 mm, D: 80 mm, B: 20 mm, C: 60 kN,
         C0: 70 kN, e: 0.37, Y: 1.6, axial: -x, pair: P, interior: {}}
    elements:
      - {id: F, type: load, at: 120 mm}
cases:
  - {id: a, share: 0.5, speed: 1000 rpm, loads: {F: {force: [1000 N, -5000 N, 0 N]}}}
  - {id: b, share: 0.5, speed: 1000 rpm, loads: {F: {force: [0 N, -5000 N, 0 N]}}}
"""
    solved = solve_model(load_model_text(text))
    info = solved.shafts[0].nonlinear
    assert info.axial == "compatibility" and np.all(info.residual <= 1e-8)
    P, N = solved.bearings
    for k, Ka in enumerate((1000.0, 0.0)):
        assert P.loads[k].Fx_N + N.loads[k].Fx_N == pytest.approx(Ka, abs=1e-6 * 5000)
        assert P.loads[k].induced_N == 0.0                    # no induced-thrust rule
        # Fa/Fr of the less loaded row stays above tan(alpha): a tapered row's minimum
        for b in (P, N):
            tan_a = 0.37 / 1.5
            assert abs(b.loads[k].Fx_N) >= tan_a * b.loads[k].Fr_N * (1 - 1e-6)


def test_no_convergence_is_exit_3_naming_shaft_case_and_residual(tmp_path: Path,
                                                                 capsys) -> None:
    text = (MODELS / "spindle_preload.yaml").read_text().replace(
        "solver: {bearing_stiffness: nonlinear}",
        "solver: {bearing_stiffness: nonlinear, nonlinear_max_iterations: 1}")
    path = tmp_path / "m.yaml"
    path.write_text(text)
    out = tmp_path / "r.json"
    assert main(["check", str(path), "--json", str(out), "--quiet"]) == 3
    err = capsys.readouterr().err
    assert "shaft 'spindle', case '" in err and "did not converge" in err
    assert "residual" in err and "Traceback" not in err
    assert not out.exists()


def test_bad_switch_value_is_exit_2_naming_the_field(tmp_path: Path, capsys) -> None:
    text = (MODELS / "spindle_preload.yaml").read_text()
    path = tmp_path / "m.yaml"
    path.write_text(text.replace("bearing_stiffness: nonlinear", "bearing_stiffness: soft"))
    assert main(["check", str(path), "--quiet"]) == 2
    err = capsys.readouterr().err
    assert "solver.bearing_stiffness" in err and "nonlinear" in err
    # a pair's preload at separate seats needs the nonlinear solve
    path.write_text(_pair_text(300.0, [0.0]).replace("bearing_stiffness: nonlinear",
                                                     "bearing_stiffness: rigid"))
    assert main(["check", str(path), "--quiet"]) == 2
    err = capsys.readouterr().err
    assert "interior.preload" in err and "bearing_stiffness: nonlinear" in err


def test_json_reports_iterations_and_residual_per_case(tmp_path: Path) -> None:
    path = MODELS / "spindle_preload.yaml"    # the demo asks for the nonlinear solve
    out = tmp_path / "r.json"
    assert main(["check", str(path), "--json", str(out), "--quiet"]) in (0, 1)
    data = json.loads(out.read_text())
    nl = data["nonlinear_solve"]
    assert nl["bearing_stiffness"] == "nonlinear"
    (shaft,) = nl["shafts"]
    assert shaft["shaft"] == "spindle" and shaft["axial"] == "compatibility"
    assert [c["case"] for c in shaft["cases"]] == ["finish", "rough"]
    for c in shaft["cases"]:
        assert c["converged"] and 1 <= c["iterations"] <= 60
        assert c["residual"] <= nl["tolerance"]
    for b in data["bearings"]:
        assert b["internal"]["shaft_solve_stiffness"] == "nonlinear"
        # the element loads of the converged state carry the reported reaction
        for ld, c in zip(b["loads"], b["internal"]["cases"], strict=True):
            assert max(c["element_loads_N"]) > 0.0
            assert ld["Fr_N"] > 0.0
    rigid = tmp_path / "rigid.json"
    main(["check", str(MODELS / "machine_clearance.yaml"), "--json", str(rigid), "--quiet"])
    assert "nonlinear_solve" not in json.loads(rigid.read_text())


def test_a_failed_start_falls_back_to_each_bearing_alone(monkeypatch) -> None:
    """Newton from a useless start (NaN) fails; the second start (each bearing solved
    alone under its rigid-support reaction) reaches the same state (uniqueness of the
    equilibrium of the shaft on its bearings)."""
    model = load_model_text(THREE.format(bearings=BALLS))
    ref = _reactions(solve_model(model))
    monkeypatch.setattr(nonlinear, "_stribeck_start",
                        lambda rows, F, fixed, tilt: np.full((F.shape[0], 5), np.nan))
    alone = nonlinear.solve_displacement
    calls = []
    monkeypatch.setattr(nonlinear, "solve_displacement",
                        lambda *a, **k: calls.append(1) or alone(*a, **k))
    got = _reactions(solve_model(model))
    assert len(calls) == 3                      # the second start: each bearing alone
    np.testing.assert_allclose(got, ref, rtol=0, atol=1e-6 * np.abs(ref).max())
