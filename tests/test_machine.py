"""Machine model: speeds, torques, power and mesh forces flow from the duty cycle.

Reference machine: the bundled two-stage helical reducer (models/belt_reducer.yaml):
stage 1 pinion z1 = 19 / wheel z2 = 71 (m_n 3 mm, 15 deg), stage 2 pinion z3 = 17 /
wheel z4 = 67 (m_n 4 mm, 12 deg), each mesh 98.5 % efficient; all shafts along housing
+X, input at Z = 0, intermediate at Z = a1, output at Z = a1 + a2.
"""

from __future__ import annotations

import dataclasses
import math
from pathlib import Path

import numpy as np
import pytest

from shaftsys.analysis import analyse, element_loads, mesh_shaft
from shaftsys.errors import ModelError
from shaftsys.io.loader import load_model, load_model_text
from shaftsys.io.results_json import result_to_dict
from shaftsys.machine.flow import case_flow

MODEL = Path(__file__).resolve().parent.parent / "models" / "belt_reducer.yaml"
REL = 1e-6
ETA = 0.985
N_IN = 1460.0
# input torque of forward_full: T = P / omega = 15 000 W / (1460 * 2 pi / 60) * 1000
T_IN = 15000.0 / (N_IN * 2 * math.pi / 60) * 1000.0


@pytest.fixture(scope="module")
def model():
    return load_model(MODEL)


@pytest.fixture(scope="module")
def result(model):
    return analyse(model)


def test_gear_train_speeds_and_torques(model):
    """Gear-train relations (Shigley, gear trains: n_out/n_in = product of driver teeth over
    driven teeth, sign reversed at every external mesh; torque ratio = speed ratio
    inverted times efficiency)."""
    flow = case_flow(model, model.cases[0])
    assert flow.speed_rpm["input"] == pytest.approx(1460.0, rel=REL)
    assert flow.speed_rpm["intermediate"] == pytest.approx(-1460.0 * 19 / 71, rel=REL)
    assert flow.speed_rpm["output"] == pytest.approx(1460.0 * 19 / 71 * 17 / 67, rel=REL)
    t = flow.element_torque_Nmm
    assert t["pulley"] == pytest.approx(T_IN, rel=REL)
    assert t["pinion1"] == pytest.approx(-T_IN, rel=REL)
    # wheel 1 receives eta * T_in * 71/19 (same sign as its speed: it is driven)
    assert t["wheel1"] == pytest.approx(-ETA * T_IN * 71 / 19, rel=REL)
    assert t["pinion2"] == pytest.approx(ETA * T_IN * 71 / 19, rel=REL)
    assert t["out_coupling"] == pytest.approx(-ETA**2 * T_IN * 71 / 19 * 67 / 17, rel=REL)


def test_power_balance_with_efficiencies(model):
    """Power balance: P_out = eta^2 P_in forward; back-driven (power enters at the
    output) P_in = eta^2 P_out (common practice for series losses, no source)."""
    fwd = case_flow(model, model.cases[0])
    assert fwd.power_in_W == pytest.approx(15000.0, rel=REL)
    assert fwd.power_out_W == pytest.approx(15000.0 * ETA**2, rel=REL)
    assert fwd.loss_W == pytest.approx(15000.0 * (1 - ETA**2), rel=REL)
    back = case_flow(model, next(c for c in model.cases if c.id == "back_driven"))
    assert back.power_in_W == pytest.approx(-5000.0, rel=REL)
    assert back.power_out_W == pytest.approx(-5000.0 / ETA**2, rel=REL)
    drivers = {lf.link_id: lf.members[lf.driver] for lf in back.links}
    assert drivers == {"stage1": "wheel1", "stage2": "wheel2"}


def test_mesh_forces_equal_and_opposite_and_by_hand(result):
    """Forward case, stage 1, hand calculation (Shigley, helical gear forces):
    W_t = T_in / r1 with r1 = m_n z1 / (2 cos 15 deg) = 29.505371 mm -> 3325.1306 N,
    W_r = W_t tan 20 / cos 15, W_a = W_t tan 15. Pinion 1 is the driver turning about +X:
    the force on it opposes its motion; at the pitch point (toward +Z) the motion is -Y,
    so the tangential force is +Y; the radial force points to its own axis (-Z); a
    right-hand driver turning about +X is thrust toward +X (hand rule of the trade)."""
    data = result_to_dict(result)
    stage1 = next(lk for lk in data["links"] if lk["id"] == "stage1")
    case = stage1["cases"][0]
    wt = 3325.1305677
    f_pinion = case["members"][0]["F_housing_N"]
    f_wheel = case["members"][1]["F_housing_N"]
    expected = [wt * math.tan(math.radians(15)), wt,
                -wt * math.tan(math.radians(20)) / math.cos(math.radians(15))]
    assert f_pinion == pytest.approx(expected, rel=REL)
    assert np.add(f_pinion, f_wheel) == pytest.approx([0, 0, 0], abs=1e-9)


@pytest.mark.parametrize(("case_id", "thrust_sign"), [
    ("forward_full", +1.0),   # right-hand driver turning about +X: thrust +X
    ("reverse", -1.0),        # same driver turning about -X: thrust -X
    ("back_driven", -1.0),    # wheel 1 (left hand, turning about -X) drives: +X on it
])
def test_pinion1_thrust_follows_hand_and_rotation(result, case_id, thrust_sign):
    """Hand rule (Shigley, helical gears, from memory): for the DRIVER, curl the fingers of
    the hand of its helix in the direction of rotation; the thumb gives the thrust on
    the driver; the driven gear takes the opposite thrust."""
    data = result_to_dict(result)
    stage1 = next(lk for lk in data["links"] if lk["id"] == "stage1")
    case = next(c for c in stage1["cases"] if c["case"] == case_id)
    fx = case["members"][0]["F_housing_N"][0]   # on pinion 1
    assert math.copysign(1.0, fx) == thrust_sign


def _pynite_reactions(model, shaft, applied):
    """Reactions of one shaft in PyNiteFEA (Euler-Bernoulli frame members)."""
    from Pynite import FEModel3D

    sm = mesh_shaft(shaft, model.solver.max_element_mm)
    mesh = sm.mesh
    fe = FEModel3D()
    mat = shaft.material
    fe.add_material("steel", mat.E_MPa, mat.G_MPa, mat.poisson, 0.0)
    for i, x in enumerate(mesh.x_mm):
        fe.add_node(f"N{i}", float(x), 0.0, 0.0)
    for e in range(mesh.n_elements):
        fe.add_section(f"S{e}", float(mesh.A_mm2[e]), float(mesh.I_mm4[e]),
                       float(mesh.I_mm4[e]), float(mesh.J_mm4[e]))
        fe.add_member(f"M{e}", f"N{e}", f"N{e + 1}", "steel", f"S{e}")
    first = True
    for b in shaft.bearings:
        fe.def_support(f"N{sm.bearing_nodes[b.id]}", support_DX=first, support_DY=True,
                       support_DZ=True, support_RX=first)
        first = False
    for x, force, moment in applied:
        node = f"N{int(np.argmin(np.abs(mesh.x_mm - x)))}"
        for comp, value in zip(("FX", "FY", "FZ", "MX", "MY", "MZ"), (*force, *moment),
                               strict=True):
            if value:
                fe.add_node_load(node, comp, value)
    fe.analyze_linear(check_statics=False)
    return {b.id: (fe.nodes[f"N{sm.bearing_nodes[b.id]}"].RxnFY["Combo 1"],
                   fe.nodes[f"N{sm.bearing_nodes[b.id]}"].RxnFZ["Combo 1"])
            for b in shaft.bearings}


def test_three_shafts_against_pynite_with_hand_mesh_forces(model):
    """Each shaft of the reducer, forward_full case, no gravity, Euler-Bernoulli, loaded
    in PyNiteFEA 3.x with mesh forces worked out by hand (Shigley's helical relations):

    stage 1: W_t1 = T_in / r1 = 3325.1305677 N (r1 = 29.5053711 mm),
             W_r1 = W_t1 tan20/cos15, W_a1 = W_t1 tan15; pitch point toward +Z of the
             input shaft (toward -Z of the intermediate shaft).
    stage 2: pinion 2 torque T_p2 = eta T_in 71/19; r3 = 4*17/(2 cos12) = 34.7595802 mm;
             W_t2 = T_p2 / r3; W_r2 = W_t2 tan20/cos12, W_a2 = W_t2 tan12; pitch point
             toward +Z of the intermediate shaft (toward -Z of the output shaft).
    Forces on each gear (tangential along the mate's motion for the driven gear, against
    its own motion for the driver; radial toward its own axis; thrust by the hand rule),
    applied at the pitch radius, so the thrust bends the shaft (moment r u_r x F).
    The V-belt hub load: T1 + T2 = 2*1450 N, T1 - T2 = T_in/90 mm, strands at 180 +- 10
    deg (wrap 160 deg), tight strand at 170 deg for a positive input torque.
    """
    m = dataclasses.replace(model, gravity_m_s2=(0.0, 0.0, 0.0),
                            solver=dataclasses.replace(model.solver,
                                                       shear_deformation=False))
    res = analyse(m, with_life=False, with_shaft_checks=False)
    t15, t12, t20 = (math.tan(math.radians(a)) for a in (15, 12, 20))
    c15, c12 = math.cos(math.radians(15)), math.cos(math.radians(12))
    r1 = 3 * 19 / (2 * c15)
    r2 = 3 * 71 / (2 * c15)
    r3 = 4 * 17 / (2 * c12)
    r4 = 4 * 67 / (2 * c12)
    wt1 = T_IN / r1
    tp2 = ETA * T_IN * 71 / 19
    wt2 = tp2 / r3
    dT = T_IN / 90.0
    t1, t2 = 1450 + dT / 2, 1450 - dT / 2
    a170, a190 = math.radians(170), math.radians(190)
    belt = (0.0, t1 * math.cos(a170) + t2 * math.cos(a190),
            t1 * math.sin(a170) + t2 * math.sin(a190))
    # pinion 1 (driver, pitch point +z, r1): F = (+Wa, +Wt, -Wr); moment r1 z x F
    fp1 = (wt1 * t15, wt1, -wt1 * t20 / c15)
    mp1 = np.cross([0, 0, r1], fp1)
    # wheel 1 (driven, pitch point -z, r2): equal and opposite force
    fw1 = tuple(-v for v in fp1)
    mw1 = np.cross([0, 0, -r2], fw1)
    # pinion 2 (driver on the intermediate shaft, turning about -X, left hand, torque
    # +T_p2 about +X... it takes power out: its torque on the shaft is +tp2 (speed < 0)):
    # tangential on the driver opposes motion: at +z the motion of a -X rotation is +Y,
    # so the force is -Y; radial -Z; left-hand driver turning about -X: thrust +X.
    fp2 = (wt2 * t12, -wt2, -wt2 * t20 / c12)
    mp2 = np.cross([0, 0, r3], fp2)
    fw2 = tuple(-v for v in fp2)
    mw2 = np.cross([0, 0, -r4], fw2)
    # loss torque on the driven side closes each driven shaft's torque balance
    t_out = ETA**2 * T_IN * 71 / 19 * 67 / 17
    hand_loads = {
        "input": [(25.0, belt, (T_IN, 0, 0)), (160.0, fp1, tuple(mp1))],
        "intermediate": [(160.0, fw1, tuple(mw1)), (90.0, fp2, tuple(mp2))],
        "output": [(90.0, fw2, tuple(mw2)), (335.0, (0, 0, 0), (-t_out, 0, 0))],
    }
    for shaft in m.shafts:
        ref = _pynite_reactions(m, shaft, hand_loads[shaft.id])
        for b in res.bearings:
            if b.shaft_id != shaft.id:
                continue
            ld = b.loads[0]   # forward_full
            ry, rz = ref[b.bearing.id]
            # shaftsys reports the force on the bearing = - reaction on the shaft
            assert -ld.Fy_N == pytest.approx(ry, rel=REL, abs=1e-6 * abs(wt2))
            assert -ld.Fz_N == pytest.approx(rz, rel=REL, abs=1e-6 * abs(wt2))


BASE = MODEL.read_text()


@pytest.mark.parametrize(("edit", "message"), [
    (("origin: [0, 0, 139.7622843553612 mm]", "origin: [0, 0, 140.5 mm]"),
     "centre distance"),
    (("hand: left, width: 40 mm", "hand: right, width: 40 mm"), "opposite hands"),
    (("module: 3 mm, teeth: 71, helix_angle: 15 deg", "pitch_diameter: "
      "220.51382642734768 mm, helix_angle: 14 deg"), "helix angles differ"),
    (("at: 160 mm, module: 3 mm, teeth: 71", "at: 220 mm, module: 3 mm, teeth: 71"),
     "do not overlap"),
])
def test_refused_geometry(tmp_path, edit, message):
    text = BASE.replace(*edit)
    assert text != BASE
    with pytest.raises(ModelError) as err:
        load_model_text(text, "reducer.yaml")
    assert message in str(err.value)
    assert "reducer.yaml" in str(err.value)


def test_link_kind_must_match_members():
    text = BASE.replace("members: [pinion2, wheel2]", "members: [pinion2, out_coupling]")
    text = text.replace("hand: right, width: 55 mm", "hand: right, width: 55 mm, "
                        "mesh_angle: 270 deg")
    with pytest.raises(ModelError, match="cannot join") as err:
        load_model_text(text, "reducer.yaml")
    assert "reducer.yaml:" in str(err.value) and "links[stage2].members[1]" in str(err.value)


def test_unequal_modules_refused():
    text = BASE.replace("at: 160 mm, module: 3 mm, teeth: 71, helix_angle: 15 deg",
                        "at: 160 mm, pitch_diameter: 220.51382642734768 mm, module: 2.5 "
                        "mm, helix_angle: 15 deg")
    with pytest.raises(ModelError, match="normal modules differ"):
        load_model_text(text, "reducer.yaml")


def test_mesh_angle_entered_by_hand_is_refused():
    text = BASE.replace("hand: right, width: 45 mm", "hand: right, width: 45 mm, "
                        "mesh_angle: 90 deg")
    with pytest.raises(ModelError, match="follows from the shaft positions"):
        load_model_text(text, "reducer.yaml")


def test_every_shaft_reached():
    text = BASE.replace("  - {id: stage2, type: gear_mesh, members: [pinion2, wheel2], "
                        "efficiency: 0.985}\n", "")
    text = text.replace("hand: left, width: 60 mm", "hand: left, width: 60 mm, "
                        "mesh_angle: 90 deg")
    text = text.replace("hand: right, width: 55 mm", "hand: right, width: 55 mm, "
                        "mesh_angle: 270 deg")
    # the loader runs every case's power flow, so the model file is refused on reading
    # (validate equals check), with the file and the links' line
    with pytest.raises(ModelError, match="not reached") as info:
        load_model_text(text, "reducer.yaml")
    assert info.value.file == "reducer.yaml" and info.value.line is not None


def test_machine_loads_balance_on_every_shaft(model):
    """Torque balance of each shaft in each case, losses included (statics)."""
    for case in model.cases:
        flow = case_flow(model, case)
        for shaft in model.shafts:
            applied, _ = element_loads(model, shaft, case, flow)
            net = sum(a.moment_Nmm[0] for a in applied)
            scale = sum(abs(a.moment_Nmm[0]) for a in applied)
            assert abs(net) <= 1e-9 * scale


BELT_MACHINE = """
shaftsys: 1
gravity: [0, 0, 0]
materials: {{steel: {{E: 210 GPa, nu: 0.3}}}}
shafts:
  - id: motor_side
    material: steel
    steps: [{{length: 200 mm, d: 30 mm}}]
    bearings:
      - {{id: a1, type: deep_groove_ball, at: 100 mm, d: 30 mm, D: 62 mm, C: 20 kN, C0: 11 kN,
          axial: both}}
      - {{id: a2, type: deep_groove_ball, at: 200 mm, d: 30 mm, D: 62 mm, C: 20 kN, C0: 11 kN}}
    elements:
      - {{id: small, type: pulley, at: 0 mm, diameter: 100 mm}}
      - {{id: motor, type: coupling, at: 150 mm}}
  - id: fan_side
    material: steel
    origin: [0, 300 mm, 0]
    steps: [{{length: 200 mm, d: 30 mm}}]
    bearings:
      - {{id: b1, type: deep_groove_ball, at: 100 mm, d: 30 mm, D: 62 mm, C: 20 kN, C0: 11 kN,
          axial: both}}
      - {{id: b2, type: deep_groove_ball, at: 200 mm, d: 30 mm, D: 62 mm, C: 20 kN, C0: 11 kN}}
    elements:
      - {{id: big, type: pulley, at: 0 mm, diameter: 200 mm}}
      - {{id: fan, type: coupling, at: 150 mm}}
links:
  - {{id: belt, type: belt, members: [small, big], efficiency: {eta}, pretension: 500 N}}
cases:
  - {{id: run, share: 1, speed: 1000 rpm, input: {{element: motor, torque: 20 N*m}},
      outputs: {{fan: 1.0}}}}
"""


def test_belt_link_ratio_wrap_and_hub_loads():
    """Open belt (Shigley, flexible elements): same sense of rotation, n2 = n1 d1/d2;
    wrap on the small pulley 180 - 2 asin((D - d)/(2C)) = 180 - 2 asin(50/300) deg;
    T1 - T2 = T/r = 20 000/50 = 400 N with T1 + T2 = 2*500 N; the hub load on each pulley
    points toward the other pulley's axis (the small one toward +Y) with the component
    (T1 + T2) cos(delta) along the centre line, delta = (180 - wrap)/2."""
    m = load_model_text(BELT_MACHINE.format(eta=1.0), "belt.yaml")
    flow = case_flow(m, m.cases[0])
    assert flow.speed_rpm["fan_side"] == pytest.approx(500.0, rel=REL)
    data = result_to_dict(analyse(m, with_shaft_checks=False))
    link = data["links"][0]["cases"][0]
    delta = math.asin(50 / 300)
    along = 1000.0 * math.cos(delta)
    f_small = link["members"][0]["F_housing_N"]
    f_big = link["members"][1]["F_housing_N"]
    assert f_small[1] == pytest.approx(along, rel=REL)
    assert f_big[1] == pytest.approx(-along, rel=REL)
    assert abs(f_small[2]) == pytest.approx(400.0 * math.sin(delta), rel=REL)
    assert link["driver"] == "small"


def test_belt_link_efficiency_loss_torque():
    """With 95 % belt efficiency the fan receives 0.95 * P; the big pulley carries the full
    belt torque 2 * 20 N*m and the housing reacts the loss on the driven side."""
    m = load_model_text(BELT_MACHINE.format(eta=0.95), "belt.yaml")
    flow = case_flow(m, m.cases[0])
    assert flow.element_torque_Nmm["fan"] == pytest.approx(-0.95 * 40000.0, rel=REL)
    loss = [a for a in flow.actions if a.label == "belt loss"]
    assert len(loss) == 1 and loss[0].shaft == "fan_side"
    # the loss torque opposes the driven shaft's rotation (+500 rpm about +X)
    assert loss[0].moment_Nmm[0] == pytest.approx(-0.05 * 40000.0, rel=REL)


PILOT = """
shaftsys: 1
gravity: [0, 0, 0]
materials: {steel: {E: 210 GPa, nu: 0.3}}
shafts:
  - id: inner
    material: steel
    steps: [{length: 200 mm, d: 30 mm}]
    bearings:
      - {id: A1, type: deep_groove_ball, at: 20 mm, d: 30 mm, D: 62 mm, C: 20 kN, C0: 11 kN,
         axial: both}
      - {id: P, type: needle_roller, at: 190 mm, d: 30 mm, D: 40 mm, C: 15 kN, C0: 18 kN,
         within: outer}
    elements:
      - {id: F, type: load, at: 100 mm, force: [0, -1000 N, 0]}
      - {id: in, type: coupling, at: 0 mm}
      - {id: out_a, type: coupling, at: 150 mm}
  - id: outer
    material: steel
    origin: [180 mm, OFFSET, 0]
    steps: [{length: 300 mm, d: 60 mm, bore: 40 mm}]
    bearings:
      - {id: B1, type: deep_groove_ball, at: 100 mm, d: 60 mm, D: 95 mm, C: 30 kN, C0: 20 kN,
         axial: both}
      - {id: B2, type: deep_groove_ball, at: 280 mm, d: 60 mm, D: 95 mm, C: 30 kN, C0: 20 kN}
    elements:
      - {id: in_b, type: coupling, at: 150 mm}
      - {id: out_b, type: coupling, at: 290 mm}
cases:
  - id: run
    share: 1
    shafts:
      inner: {speed: 1000 rpm, input: {element: in, torque: 10 N*m}, outputs: {out_a: 1}}
      outer: {speed: 300 rpm, input: {element: in_b, torque: 30 N*m}, outputs: {out_b: 1}}
"""


def test_pilot_bearing_between_coaxial_shafts():
    """Statics (free bodies worked by hand): the inner shaft rests on A1 (x = 20) and on the
    pilot bearing P (x = 190) inside the outer shaft; a 1000 N load at x = 100 gives
    R_P = 1000*80/170 = 470.588235 N, R_A1 = 1000*90/170 = 529.411765 N. The outer shaft
    (B1 at its x = 100, B2 at 280) carries R_P downward at its station 10 (overhang 90 to
    the left of B1): R_B2 = -R_P*90/180 = -235.294118 N, R_B1 = R_P*270/180 = 705.882353 N.
    The pilot bearing runs at the relative speed 1000 - 300 = 700 rpm."""
    m = load_model_text(PILOT.replace("OFFSET", "0"), "pilot.yaml")
    r = analyse(m, with_shaft_checks=False)
    loads = {b.bearing.id: b.loads[0] for b in r.bearings}
    assert loads["P"].Fy_N == pytest.approx(-470.588235294, rel=REL)
    assert loads["A1"].Fy_N == pytest.approx(-529.411764706, rel=REL)
    assert loads["B1"].Fy_N == pytest.approx(-705.882352941, rel=REL)
    assert loads["B2"].Fy_N == pytest.approx(235.294117647, rel=REL)
    assert loads["P"].speed_rpm == pytest.approx(700.0, rel=REL)
    for s in r.shafts:
        assert s.cases[0].residual_relative < 1e-9


def test_pilot_bearing_needs_coaxial_shafts():
    with pytest.raises(ModelError, match="not coaxial"):
        load_model_text(PILOT.replace("OFFSET", "5 mm"), "pilot.yaml")


BEVEL = """
shaftsys: 1
gravity: [0, 0, 0]
materials: {{steel: {{E: 210 GPa, nu: 0.3}}}}
shafts:
  - id: a
    material: steel
    origin: [-300 mm, 0, 0]
    axis: [1, 0, 0]
    steps: [{{length: 280 mm, d: 30 mm}}]
    bearings:
      - {{id: a1, type: deep_groove_ball, at: 100 mm, d: 30 mm, D: 62 mm, C: 20 kN, C0: 11 kN,
          axial: both}}
      - {{id: a2, type: deep_groove_ball, at: 200 mm, d: 30 mm, D: 62 mm, C: 20 kN, C0: 11 kN}}
    elements:
      - {{id: drive, type: coupling, at: 20 mm}}
      - {{id: ga, type: bevel_gear, at: 230.7179676972449 mm, mean_pitch_diameter: 80 mm,
          pitch_cone_angle: {cone_a} deg, apex: +x}}
  - id: b
    material: steel
    origin: [0, -300 mm, 0]
    axis: [0, 1, 0]
    up: [0, 0, 1]
    steps: [{{length: 290 mm, d: 30 mm}}]
    bearings:
      - {{id: b1, type: deep_groove_ball, at: 100 mm, d: 30 mm, D: 62 mm, C: 20 kN, C0: 11 kN,
          axial: both}}
      - {{id: b2, type: deep_groove_ball, at: 200 mm, d: 30 mm, D: 62 mm, C: 20 kN, C0: 11 kN}}
    elements:
      - {{id: gb, type: bevel_gear, at: 260 mm, mean_pitch_diameter: 138.5640646055102 mm,
          pitch_cone_angle: 60 deg, apex: +x}}
      - {{id: out, type: coupling, at: 20 mm}}
links:
  - {{id: bevel, type: bevel_mesh, members: [ga, gb]}}
cases:
  - {{id: run, share: 1, speed: 1000 rpm, input: {{element: drive, torque: 40 N*m}},
      outputs: {{out: 1.0}}}}
"""


def test_bevel_pair_on_crossed_axes():
    """Straight bevel pair at 90 deg (Shigley, bevel gear forces): pinion r_a = 40 mm,
    cone 30 deg; wheel r_b = 80 sin 60 = 69.282 mm, cone 60 deg; the pitch points meet at
    (-69.282, -40, 0). Ratio n_b/n_a = -r_a/r_b (equal pitch-line velocities; the sign
    from the frames: a turns about +X, the contact moves toward -Z, which b reaches
    turning about -Y). W_t = 40 000/40 = 1000 N; on the driving pinion: W_a = W_t tan20
    sin30 away from the apex (-X), W_r = W_t tan20 cos30 toward its axis (+Y), tangential
    against its motion (+Z); the wheel takes the opposite force."""
    m = load_model_text(BEVEL.format(cone_a=30), "bevel.yaml")
    flow = case_flow(m, m.cases[0])
    assert flow.speed_rpm["b"] == pytest.approx(-1000.0 * 40 / 69.2820323027551, rel=REL)
    lf = flow.links[0]
    t20 = math.tan(math.radians(20))
    expected = [-1000 * t20 * 0.5, 1000 * t20 * math.cos(math.radians(30)), 1000.0]
    assert list(lf.force_housing_N[0]) == pytest.approx(expected, rel=REL)
    assert np.add(lf.force_housing_N[0], lf.force_housing_N[1]) == pytest.approx(
        [0, 0, 0], abs=1e-9)
    r = analyse(m, with_shaft_checks=False)
    assert all(c.residual_relative < 1e-9 for s in r.shafts for c in s.cases)


def test_bevel_cone_angles_must_match_the_shaft_angle():
    with pytest.raises(ModelError, match="cone angles add up"):
        load_model_text(BEVEL.format(cone_a=35), "bevel.yaml")
