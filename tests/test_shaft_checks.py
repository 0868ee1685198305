"""Shaft checks on a solved model (shaftsys.analysis.shaft_checks).

References named beside each check; expected values are closed forms or typed in.
"""

from __future__ import annotations

import dataclasses
import json
import math
from pathlib import Path

import numpy as np
import pytest

from shaftsys.analysis import analyse
from shaftsys.analysis.shaft_checks import ShaftCheckSettings, check_shafts, critical_speeds_rpm
from shaftsys.checks import (
    dunkerley_critical_speed_rad_s,
    rayleigh_critical_speed_rad_s,
    rpm_from_rad_s,
    simply_supported_uniform_critical_speed_rad_s,
)
from shaftsys.io.loader import load_model_text
from shaftsys.report.tables import shaft_checks_table

DEMO = Path(__file__).resolve().parent.parent / "models" / "fan_drive.yaml"

# Uniform steel shaft: SI values used in the closed forms below.
E_PA = 210e9
NU = 0.3
RHO = 7850.0
D_M = 0.040
L_M = 1.0


def _uniform_yaml(*, speed_rpm: float = 1000.0, disc_at_mm: float | None = None,
                  disc_kg: float = 0.0, gravity: bool = False, static: bool = False,
                  unit_load_N: float = 0.0, max_element_mm: float = 10.0) -> str:
    """A uniform 40 mm x 1000 mm steel shaft on rigid supports at both ends."""
    elements = ""
    if disc_at_mm is not None:
        elements += (f"      - {{id: disc, type: mass, at: {disc_at_mm} mm, mass: {disc_kg} kg}}\n"
                     f"      - {{id: push, type: load, at: {disc_at_mm} mm, "
                     f"force: [0, {unit_load_N} N, 0]}}\n")
    else:
        elements += "      - {id: push, type: load, at: 500 mm, force: [0, 0, 0]}\n"
    kind = "static" if static else "duty"
    share = "" if static else "    share: 1.0\n"
    return f"""shaftsys: 1
name: uniform shaft
gravity: [0, {-9.80665 if gravity else 0.0} m/s^2, 0]
solver: {{shear_deformation: false, max_element: {max_element_mm} mm,
         residual_tolerance: 1e-7}}
materials:
  steel: {{E: 210 GPa, nu: {NU}, density: 7850 kg/m^3, Su: 650 MPa, Sy: 430 MPa}}
shafts:
  - id: s
    material: steel
    steps:
      - {{length: 1000 mm, d: 40 mm}}
    bearings:
      - {{id: A, type: deep_groove_ball, at: 0 mm, d: 40 mm, D: 80 mm, C: 30 kN,
          C0: 19 kN, axial: both}}
      - {{id: B, type: deep_groove_ball, at: 1000 mm, d: 40 mm, D: 80 mm, C: 30 kN,
          C0: 19 kN, axial: float}}
    elements:
{elements}cases:
  - id: c
    kind: {kind}
{share}    speed: {speed_rpm} rpm
"""


def _omega_ss_uniform() -> float:
    """(pi/L)^2 sqrt(E I / (rho A)) [rad/s], Euler-Bernoulli, simply supported.

    Source: Rao, Mechanical Vibrations, transverse vibration of a pinned-pinned beam;
    Shigley 9th ed. eq. 7-22.
    """
    I_m4 = math.pi * D_M**4 / 64.0
    A = math.pi * D_M**2 / 4.0
    return (math.pi / L_M) ** 2 * math.sqrt(E_PA * I_m4 / (RHO * A))


def _rpm(omega: float) -> float:
    return omega * 60.0 / (2.0 * math.pi)


@pytest.fixture(scope="module")
def demo_checks():
    model = load_model_text(DEMO.read_text(), str(DEMO))
    result = analyse(model, with_life=False)
    return result, check_shafts(result)


# ----------------------------------------------------------------------------- modes
def test_uniform_simply_supported_first_bending_frequency():
    """Pinned-pinned uniform Euler-Bernoulli shaft, no rotary inertia, rigid supports:
    omega_1 = (pi/L)^2 sqrt(EI/(rho A)) (Rao, Mechanical Vibrations; Shigley eq. 7-22).
    Consistent-mass FE with 100 elements converges far below 1e-4."""
    result = analyse(load_model_text(_uniform_yaml()), with_life=False)
    sc = check_shafts(result).shaft("s")
    assert sc.first_critical_rpm == pytest.approx(_rpm(_omega_ss_uniform()), rel=1e-4)


def test_modal_mesh_of_a_long_fine_mesh_is_capped_and_still_converged():
    """A 1 mm solver mesh (1000 elements) is capped to MODAL_MAX_ELEMENTS for the
    eigenproblem: the first critical speed equals the one of a 1000/300 mm mesh and still
    meets the closed form (Rao; Shigley eq. 7-22) to 1e-4."""
    from shaftsys.analysis.shaft_checks import MODAL_MAX_ELEMENTS

    model = load_model_text(_uniform_yaml(max_element_mm=1.0))
    fine = critical_speeds_rpm(model.shafts[0], model)
    capped = critical_speeds_rpm(model.shafts[0], model,
                                 max_element_mm=1000.0 / MODAL_MAX_ELEMENTS)
    assert fine == capped
    assert fine[0] == pytest.approx(_rpm(_omega_ss_uniform()), rel=1e-4)


def test_uniform_free_free_first_torsional_frequency():
    """Free-free uniform shaft in torsion: omega_1 = (pi/L) sqrt(G/rho), G = E/(2(1+nu))
    (Rao, Mechanical Vibrations, torsional vibration of a shaft, free-free ends); the
    zero-frequency rigid mode is skipped. Linear bar elements, 100 elements: ~4e-5."""
    result = analyse(load_model_text(_uniform_yaml()), with_life=False)
    sc = check_shafts(result).shaft("s")
    G = E_PA / (2.0 * (1.0 + NU))
    assert sc.first_torsional_rpm == pytest.approx(
        _rpm(math.pi / L_M * math.sqrt(G / RHO)), rel=1e-3)


def test_dunkerley_below_fe_below_rayleigh_with_disc():
    """Bounds on the first critical speed of a shaft carrying a disc (Shigley 9th ed.
    section 7-6: Rayleigh eq. 7-23 is an upper bound, Dunkerley eq. 7-32 a lower one).

    Rayleigh: static deflection under the weights of the disc and of the shaft (the
    shaft lumped at the two Gauss points of every element, Hermite-interpolated
    deflection).
    Dunkerley: the shaft alone (closed form) combined with the disc on the massless
    shaft, its influence coefficient from a static solve under a 1000 N load.
    """
    x_disc, m_disc = 300.0, 20.0
    model = load_model_text(_uniform_yaml(disc_at_mm=x_disc, disc_kg=m_disc))
    fe_rpm = check_shafts(analyse(model, with_life=False)).shaft("s").first_critical_rpm

    # Rayleigh from the gravity deflection
    grav = analyse(load_model_text(_uniform_yaml(disc_at_mm=x_disc, disc_kg=m_disc,
                                                 gravity=True, static=True)),
                   with_life=False)
    sol = grav.shaft("s").cases[0]
    x = sol.node_x_mm
    v = sol.displacement[:, 1]
    th = sol.displacement[:, 5]          # dv/dx
    h = np.diff(x)
    area_mm2 = math.pi * 40.0**2 / 4.0
    y_pts, m_pts = [], []
    for xi in (0.5 - 0.5 / math.sqrt(3.0), 0.5 + 0.5 / math.sqrt(3.0)):  # 2-point Gauss
        y_pts.append((1 - 3 * xi**2 + 2 * xi**3) * v[:-1] + h * (xi - 2 * xi**2 + xi**3)
                     * th[:-1] + (3 * xi**2 - 2 * xi**3) * v[1:]
                     + h * (xi**3 - xi**2) * th[1:])              # cubic Hermite
        m_pts.append(RHO * 1e-9 * area_mm2 * h / 2.0)
    i_disc = int(np.argmin(np.abs(x - x_disc)))
    masses = np.concatenate([*m_pts, [m_disc]])
    defl = -np.concatenate([*y_pts, [v[i_disc]]])           # gravity along -y
    w_rayleigh = rayleigh_critical_speed_rad_s(masses, defl)

    # Dunkerley: shaft alone (closed form) + disc on its own
    unit = analyse(load_model_text(_uniform_yaml(disc_at_mm=x_disc, disc_kg=m_disc,
                                                 unit_load_N=1000.0, static=True)),
                   with_life=False)
    a11 = unit.shaft("s").cases[0].displacement[i_disc, 1] / 1000.0
    mu = RHO * 1e-9 * area_mm2
    I_mm4 = math.pi * 40.0**4 / 64.0
    w_shaft = simply_supported_uniform_critical_speed_rad_s(1000.0, 210000.0, I_mm4, mu)
    w_dunk = dunkerley_critical_speed_rad_s([m_disc], [a11], shaft_alone_rad_s=w_shaft)

    assert rpm_from_rad_s(w_dunk) < fe_rpm < rpm_from_rad_s(w_rayleigh)
    # and they are close (a disc-dominated shaft): within 5 %
    assert rpm_from_rad_s(w_rayleigh) / rpm_from_rad_s(w_dunk) < 1.05


def test_bending_frequency_against_pynite_modal():
    """Stepped shaft with a disc on pinned supports against PyNiteFEA 3.2's
    FEModel3D.analyze_modal (consistent mass 156/22L/54/13L, Euler-Bernoulli, node
    mass from a nodal load with gravity = 1). Units N, mm, t: eigenvalues in (rad/s)^2.
    Our model: Euler-Bernoulli, no rotary inertia, no disc inertia (PyNite lumps node
    masses in translation only)."""
    Pynite = pytest.importorskip("Pynite")
    if not hasattr(Pynite.FEModel3D, "analyze_modal"):
        pytest.skip("installed PyNiteFEA has no FEModel3D.analyze_modal")
    text = """shaftsys: 1
name: stepped
gravity: [0, 0, 0]
solver: {shear_deformation: false, max_element: 20 mm}
materials:
  steel: {E: 210 GPa, nu: 0.3, density: 7850 kg/m^3}
shafts:
  - id: s
    material: steel
    steps:
      - {length: 200 mm, d: 40 mm}
      - {length: 400 mm, d: 55 mm}
      - {length: 200 mm, d: 40 mm}
    bearings:
      - {id: A, type: deep_groove_ball, at: 100 mm, d: 40 mm, D: 80 mm, C: 30 kN,
         C0: 19 kN, axial: both}
      - {id: B, type: deep_groove_ball, at: 700 mm, d: 40 mm, D: 80 mm, C: 30 kN,
         C0: 19 kN, axial: float}
    elements:
      - {id: disc, type: mass, at: 450 mm, mass: 30 kg}
cases:
  - {id: c, share: 1.0, speed: 1000 rpm}
"""
    model = load_model_text(text)
    ours = critical_speeds_rpm(model.shafts[0], model, max_element_mm=20.0)[0]

    from shaftsys.analysis import mesh_shaft

    sm = mesh_shaft(model.shafts[0], 20.0)
    mesh = sm.mesh
    fe = Pynite.FEModel3D()
    fe.add_material("steel", 210000.0, 210000.0 / 2.6, 0.3, 7850e-12)
    for i, xi in enumerate(mesh.x_mm):
        fe.add_node(f"N{i}", float(xi), 0.0, 0.0)
    for e in range(mesh.n_nodes - 1):
        sec = f"S{e}"
        fe.add_section(sec, float(mesh.A_mm2[e]), float(mesh.I_mm4[e]),
                       float(mesh.I_mm4[e]), float(mesh.J_mm4[e]))
        fe.add_member(f"M{e}", f"N{e}", f"N{e + 1}", "steel", sec)
    fe.add_member_self_weight("FY", 1.0, case="Case 1")
    fe.add_node_load(f"N{sm.element_nodes['disc']}", "FY", 30.0e-3, case="Case 1")
    na, nb = sm.bearing_nodes["A"], sm.bearing_nodes["B"]
    fe.def_support(f"N{na}", True, True, True, True, False, False)
    fe.def_support(f"N{nb}", False, True, True, False, False, False)
    fe.add_load_combo("Combo 1", {"Case 1": 1.0})
    fe.analyze_modal(num_modes=3, mass_combo_name="Combo 1", mass_direction="Y",
                     gravity=1.0, check_stability=False)
    f_pynite_hz = float(min(fe.frequencies))
    assert ours == pytest.approx(60.0 * f_pynite_hz, rel=1e-6)


def test_critical_speed_margin_and_supercritical_flag():
    """Margin rule (common practice, no source): first critical >= 1.25 x max speed, or
    <= max speed / 1.25 (supercritical, accepted with a warning)."""
    n1 = _rpm(_omega_ss_uniform())
    sub = check_shafts(analyse(load_model_text(_uniform_yaml(speed_rpm=n1 / 1.3)),
                               with_life=False)).shaft("s")
    assert sub.critical_speed_ok and not sub.supercritical
    close = check_shafts(analyse(load_model_text(_uniform_yaml(speed_rpm=n1)),
                                 with_life=False))
    assert not close.shaft("s").critical_speed_ok and not close.ok
    sup = check_shafts(analyse(load_model_text(_uniform_yaml(speed_rpm=1.3 * n1)),
                               with_life=False)).shaft("s")
    assert sup.critical_speed_ok and sup.supercritical
    assert any("supercritical" in n for n in sup.notes)
    assert any("gyroscopic" in n for n in sup.notes)


# ----------------------------------------------------------------------------- slopes
def test_slope_limit_exceeded_flips_ok(demo_checks):
    """Bearing B is deep-groove ball: typical range 0.001..0.003 rad (Shigley 9th ed.
    Table 7-2, from memory); a user limit of 1e-5 rad is exceeded by its slope."""
    result, checks = demo_checks
    b = next(c for c in checks.bearings if c.id == "B")
    assert b.slope_limit_rad == 0.003 and b.slope_limit_low_rad == 0.001
    assert b.ok
    strict = check_shafts(result, ShaftCheckSettings(bearing_slope_limits_rad={"B": 1e-5}))
    b2 = next(c for c in strict.bearings if c.id == "B")
    assert b2.slope_limit_rad == 1e-5
    assert not b2.ok and not strict.ok
    a2 = next(c for c in strict.bearings if c.id == "A")
    assert a2.slope_limit_rad == 0.026      # spherical roller range 0.009..0.026 rad
    with pytest.raises(ValueError):
        check_shafts(result, ShaftCheckSettings(bearing_slope_limits_rad={"nope": 1e-3}))


def test_bearing_slope_equals_solution_at_support(demo_checks):
    """The reported slope is hypot(ry, rz) of the solved displacement at the support node."""
    result, checks = demo_checks
    sr = result.shaft("fan_shaft")
    b = next(c for c in checks.bearings if c.id == "A")
    for cd, sol in zip(b.cases, sr.cases, strict=True):
        i = int(np.argmin(np.abs(sol.node_x_mm - 120.0)))
        assert cd.slope_rad == math.hypot(sol.displacement[i, 4], sol.displacement[i, 5])


def test_gear_limits_module_based(model_yaml):
    """Spur gear of module 3 mm: P = 25.4/3 = 8.5 teeth/in <= 10, deflection limit
    0.010 in = 0.254 mm; slope 0.0005 rad (Shigley 9th ed. Table 7-2, from memory).
    Without a module: 0.13 mm (common practice, no source)."""
    def with_module(m):
        m["shafts"][0]["elements"][0]["module"] = "3 mm"
    _, text = model_yaml(edit=with_module)
    checks = check_shafts(analyse(load_model_text(text), with_life=False))
    g = checks.gears[0]
    assert g.id == "gear1"
    assert g.deflection_limit_mm == pytest.approx(0.254)
    assert g.slope_limit_rad == 0.0005
    _, text0 = model_yaml()
    g0 = check_shafts(analyse(load_model_text(text0), with_life=False)).gears[0]
    assert g0.deflection_limit_mm == 0.13
    tight = check_shafts(analyse(load_model_text(text0), with_life=False),
                         ShaftCheckSettings(default_gear_deflection_limit_mm=1e-6))
    assert not tight.gears[0].ok and not tight.ok


# ----------------------------------------------------------------------------- fatigue
def test_demo_fatigue_sections(demo_checks):
    """Shoulders at the step edges 90/150/530/590 mm of models/fan_drive.yaml with
    d = smaller, D = larger diameter and r = fillet of the step starting at the edge;
    a keyseat at the impeller seat (profile keyway); finite safety factors."""
    _, checks = demo_checks
    sc = checks.shaft("fan_shaft")
    shoulders = [s for s in sc.sections if s.feature == "shoulder"]
    assert [s.x_mm for s in shoulders] == [90.0, 150.0, 530.0, 590.0]
    assert [(s.d_mm, s.D_mm, s.r_mm) for s in shoulders] == [
        (45.0, 50.0, 1.5), (50.0, 60.0, 2.0), (50.0, 60.0, 2.0), (45.0, 50.0, 1.5)]
    assert any(s.feature == "keyseat_end_mill" and s.x_mm == 680.0 for s in sc.sections)
    assert any(s.feature == "press_fit" for s in sc.sections)
    for s in sc.sections:
        assert math.isfinite(s.n_yield) and s.n_yield > 0
        assert s.Kf >= 1.0 and s.Se_MPa > 0
    assert any(math.isfinite(s.n_fatigue) for s in shoulders)
    assert math.isfinite(sc.min_fatigue_safety) and math.isfinite(sc.min_yield_safety)
    # Kt at the 150 mm shoulder: D/d = 1.2, r/d = 0.04; Norton fit A (r/d)^b, row 1.20
    # (A = 0.97098, b = -0.21796; Norton, Machine Design, App. C, from memory)
    s150 = shoulders[1]
    assert s150.Kt == pytest.approx(0.97098 * 0.04**-0.21796, rel=1e-9)


def test_demo_fatigue_loads_at_shoulder(demo_checks):
    """Bending amplitude = resultant moment M at the shoulder station (rotating shaft,
    Shigley ch. 7): sigma_a' = Kf 32 M / (pi d^3) of the worst DUTY case (peak and
    static cases feed the yield check only)."""
    result, checks = demo_checks
    s = next(x for x in checks.shaft("fan_shaft").sections if x.x_mm == 150.0)
    duty = {c.id for c in result.model.duty_cases}
    M = max(float(np.max(sol.M_Nmm[np.abs(sol.stations_mm - 150.0) < 1e-6]))
            for sol in result.shaft("fan_shaft").cases if sol.case in duty)
    assert s.sigma_a_MPa == pytest.approx(s.Kf * 32.0 * M / (math.pi * 50.0**3), rel=1e-9)


def test_asme_setting_and_unknown_options(demo_checks):
    """DE-Goodman 1/n = sa'/Se + sm'/Sut (default) and DE-ASME elliptic
    n = 1/sqrt((sa'/Se)^2 + (sm'/Sy)^2) (Shigley 9th ed. eqs. 7-8 and 7-12 in von Mises
    form), on the reported stresses; C45 of the demo: Sut 650, Sy 430 MPa."""
    result, checks = demo_checks
    asme = check_shafts(result, ShaftCheckSettings(criterion="asme_elliptic"))
    g = checks.shaft("fan_shaft").sections
    a = asme.shaft("fan_shaft").sections
    for x, y in zip(g, a, strict=True):
        assert x.n_fatigue == pytest.approx(
            1.0 / (x.sigma_a_MPa / x.Se_MPa + x.sigma_m_MPa / 650.0), rel=1e-12)
        assert y.n_fatigue == pytest.approx(
            1.0 / math.hypot(y.sigma_a_MPa / y.Se_MPa, y.sigma_m_MPa / 430.0), rel=1e-12)
    with pytest.raises(ValueError):
        ShaftCheckSettings(criterion="soderberg")
    with pytest.raises(ValueError):
        ShaftCheckSettings(fatigue_cases="all")


def test_fatigue_not_evaluated_without_strength(model_yaml):
    """The base test model's material has no Su/Sy: fatigue is "not evaluated" with the
    reason, never a pass (issue 19; before it read as fatigue_ok). Common practice, no
    source.
    """
    _, text = model_yaml()
    sc = check_shafts(analyse(load_model_text(text), with_life=False)).shafts[0]
    assert sc.sections == ()
    assert any("fatigue not evaluated" in n for n in sc.notes)
    assert not sc.fatigue_ok
    assert sc.fatigue_verdict == "not evaluated"
    assert sc.fatigue_not_evaluated == "material 'steel' has no Su, Sy"
    assert not sc.ok


def test_to_dict_and_table(demo_checks):
    _, checks = demo_checks
    d = checks.to_dict()
    json.dumps(d, allow_nan=False)
    s = d["shafts"][0]
    for key in ("id", "first_critical_rpm", "first_torsional_rpm", "min_fatigue_safety",
                "min_yield_safety", "critical_speed_ok", "fatigue_ok", "sections", "notes"):
        assert key in s
    b = d["bearings"][0]
    for key in ("id", "shaft", "slope_limit_rad", "cases", "ok"):
        assert key in b
    assert set(b["cases"][0]) >= {"case", "deflection_mm", "slope_rad"}
    t = shaft_checks_table(checks)
    assert "Critical speeds" in t and "Fatigue sections" in t and "Slopes" in t
    assert "fan_shaft" in t


def test_settings_are_frozen():
    st = ShaftCheckSettings()
    with pytest.raises(dataclasses.FrozenInstanceError):
        st.criterion = "asme_elliptic"  # type: ignore[misc]


def test_modes_in_the_results_second_critical_shape_and_estimates():
    """The checks carry the first three bending criticals with their mode shapes and the
    classical estimates. Pinned-pinned uniform shaft (Rao; Blevins table 8-1, from
    memory): omega_k = k^2 omega_1, shapes sin(k pi x/L); Rayleigh above and Dunkerley
    below the first (Shigley 9th ed., critical speeds: the static-deflection estimate
    bounds from above, Dunkerley's from below); margins are n_crit / n_max."""
    result = analyse(load_model_text(_uniform_yaml(speed_rpm=1000.0)), with_life=False)
    sc = result.checks.shafts[0].to_dict()
    w1 = _rpm(_omega_ss_uniform())
    crit = sc["critical_speeds_rpm"]
    assert crit[0] == pytest.approx(w1, rel=1e-4)
    assert sc["second_critical_rpm"] == crit[1] == pytest.approx(4 * w1, rel=1e-3)
    assert crit[2] == pytest.approx(9 * w1, rel=3e-3)
    assert sc["critical_speed_margins"] == pytest.approx([c / 1000.0 for c in crit])
    modes = sc["modes"]
    assert modes["rayleigh_rpm"] > crit[0] > modes["dunkerley_rpm"]
    assert modes["rayleigh_rpm"] == pytest.approx(crit[0], rel=2e-3)
    for k, shape in enumerate(modes["shapes"][:2], start=1):
        x = np.asarray(shape["x_mm"]) / 1000.0
        y = np.asarray(shape["deflection"])
        ref = np.sin(k * math.pi * x)
        ref = ref / ref[np.argmax(np.abs(ref))]
        assert np.max(np.abs(y - ref)) < 1e-3 * k


def test_per_plane_slopes_at_the_bearings_follow_the_load_plane():
    """A centre load F in +y on the pinned-pinned uniform shaft: slope at the supports
    F L^2 / (16 E I) in the x-y plane (Roark, simply supported beam, centre load), with
    dv/dx > 0 at the left end and < 0 at the right, and nothing in the x-z plane; the
    resultants are the hypot of the plane values."""
    F = 1000.0
    yaml_text = _uniform_yaml(disc_at_mm=500.0, disc_kg=0.0, unit_load_N=F)
    result = analyse(load_model_text(yaml_text), with_life=False)
    I_mm4 = math.pi * 40.0**4 / 64.0
    theta = F * 1000.0**2 / (16.0 * 210_000.0 * I_mm4)
    data = result.checks.to_dict()
    by_id = {b["id"]: b for b in data["bearings"]}
    for bid, sign in (("A", 1.0), ("B", -1.0)):
        c = by_id[bid]["cases"][0]
        assert c["slope_xy_rad"] == pytest.approx(sign * theta, rel=1e-6)
        assert abs(c["slope_xz_rad"]) < 1e-12 * theta
        assert c["slope_rad"] == pytest.approx(math.hypot(c["slope_xy_rad"],
                                                          c["slope_xz_rad"]), rel=1e-12)
        assert abs(c["deflection_y_mm"]) < 1e-9 and abs(c["deflection_z_mm"]) < 1e-9


def test_a_two_node_mesh_is_checked_without_a_crash(tmp_path):
    """A plain shaft on two end supports meshed with one element (max_element longer
    than the shaft, no element between): the modal check still runs (its bending DOFs
    are the two end rotations), the run ends in a verdict (exit 0 or 1, never a
    traceback) and the classical estimates are undefined (no free lateral DOF)."""
    from shaftsys.cli.main import main

    text = """shaftsys: 1
units: internal
materials: {steel: {E: 210000, nu: 0.3, density: 7850, Su: 650, Sy: 430}}
solver: {max_element: 1000}
life: {target: 20000 h}
shafts:
  - id: s
    material: steel
    steps: [{length: 300, d: 40}]
    bearings:
      - {id: A, type: deep_groove_ball, at: 0, d: 40, D: 80, C: 30000, C0: 19000,
         axial: both}
      - {id: B, type: deep_groove_ball, at: 300, d: 40, D: 80, C: 30000, C0: 19000}
cases:
  - {id: c1, share: 1, speed: 1000 rpm}
"""
    path = tmp_path / "two.yaml"
    path.write_text(text, encoding="utf-8")
    out = tmp_path / "two.json"
    assert main(["check", str(path), "--json", str(out), "-q"]) in (0, 1)
    sc = json.loads(out.read_text())["shaft_checks"]["shafts"][0]
    assert sc["modes"]["rayleigh_rpm"] is None and sc["modes"]["dunkerley_rpm"] is not None


def _spring_beam_beta_l(kappa: float) -> float:
    """First flexible root beta*L of a uniform Euler-Bernoulli beam on equal translational
    springs k at both ends, no rotational restraint, kappa = k L^3 / (E I). Hand-derived:
    y = A cosh + B sinh + C cos + D sin (beta x); y''(0) = y''(L) = 0 and the end shears
    balance the springs, E I y'''(0) = -k y(0), E I y'''(L) = k y(L) (signs checked below:
    kappa -> infinity gives the pinned-pinned pi, kappa -> 0 the free-free 4.730)."""
    from scipy.optimize import brentq

    def det(bl: float) -> float:
        c, s, ch, sh = math.cos(bl), math.sin(bl), math.cosh(bl), math.sinh(bl)
        b3 = bl**3
        # unknowns (A, B, C, D); rows: y''(0), y''(L), shear at 0, shear at L (scaled L^3)
        M = np.array([
            [1.0, 0.0, -1.0, 0.0],
            [ch, sh, -c, -s],
            [kappa, b3, kappa, -b3],
            [b3 * sh - kappa * ch, b3 * ch - kappa * sh, b3 * s - kappa * c,
             -b3 * c - kappa * s],
        ])
        return float(np.linalg.det(M))

    grid = np.linspace(0.5, 4.8, 4000)
    vals = [det(x) for x in grid]
    for a, b, fa, fb in zip(grid[:-1], grid[1:], vals[:-1], vals[1:], strict=True):
        if fa == 0.0 or fa * fb < 0.0:
            return float(brentq(det, a, b, xtol=1e-13))
    raise AssertionError("no root")


def test_critical_speed_with_the_nonlinear_bearings_tangent_stiffness():
    """With solver.bearing_stiffness: nonlinear the modal check puts each such bearing's
    tangent radial stiffness (fastest running case) under the shaft. A uniform 40 mm x
    400 mm shaft on two equal deep groove ball bearings at its ends, centre load: the
    first critical equals the spring-supported beam's closed form above with that k,
    (on the translational springs alone), and lies below the rigid-support
    (pinned-pinned) critical."""
    assert _spring_beam_beta_l(1e12) == pytest.approx(math.pi, rel=1e-6)
    assert _spring_beam_beta_l(1e-9) == pytest.approx(4.730040745, rel=1e-6)
    text = """shaftsys: 1
units: internal
materials: {steel: {E: 210000, nu: 0.3, density: 7850, Su: 650, Sy: 430}}
solver: {bearing_stiffness: nonlinear, shear_deformation: false, shaft_weight: false,
         max_element: 5}
gravity: [0, 0, 0]
life: {target: 20000 h}
shafts:
  - id: s
    material: steel
    steps: [{length: 400, d: 40}]
    bearings:
      - {id: A, type: deep_groove_ball, at: 0, d: 40, D: 80, B: 18, C: 30000, C0: 19000,
         axial: both, interior: {Dw: 12, Z: 9, clearance: 0}}
      - {id: B, type: deep_groove_ball, at: 400, d: 40, D: 80, B: 18, C: 30000, C0: 19000,
         interior: {Dw: 12, Z: 9, clearance: 0}}
    elements:
      - {id: L, type: load, at: 200}
cases:
  - {id: c1, share: 1, speed: 1500 rpm, loads: {L: {force: [0, -4000, 0]}}}
"""
    from shaftsys.analysis.modes import tangent_support_stiffness

    model = load_model_text(text)
    result = analyse(model, with_life=False)
    springs = tangent_support_stiffness(model, result.bearings)
    kA, kB = springs["A"][0], springs["B"][0]
    assert kA == pytest.approx(kB, rel=1e-6) and kA > 1e4
    EI = 210_000.0 * math.pi * 40.0**4 / 64.0
    rhoA = 7850e-12 * math.pi * 40.0**2 / 4.0           # t/mm
    bl = _spring_beam_beta_l(kA * 400.0**3 / EI)
    w = (bl / 400.0) ** 2 * math.sqrt(EI / rhoA)
    from shaftsys.analysis.modes import shaft_modes

    # the FE modes on the translational springs alone meet the closed form
    alone = shaft_modes(model.shafts[0], model, stiffness={"A": (kA, None), "B": (kB, None)})
    assert alone.bending_rpm[0] == pytest.approx(_rpm(w), rel=1e-4)
    # the check also keeps the bearings' small tilt stiffness: a little stiffer, and
    # still below the rigid (pinned-pinned) supports
    crit = result.checks.shafts[0].first_critical_rpm
    assert alone.bending_rpm[0] <= crit <= 1.02 * alone.bending_rpm[0]
    assert crit < 0.97 * _rpm((math.pi / 400.0) ** 2 * math.sqrt(EI / rhoA))
    assert any("tangent stiffness" in n for n in result.checks.shafts[0].notes)
