"""Gear mesh loads: signs, magnitudes, action/reaction.

Frame: x along the shaft, u_r(t) = (0, cos t, sin t), u_t(t) = (0, -sin t, cos t).
T_el is the torque the gear applies to its shaft; a gear whose power T_el*speed < 0 is
driven by its shaft and drives its mate: the DRIVER of the hand rule.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

from shaftsys.errors import ModelError
from shaftsys.loads import (
    AxisLoad,
    bevel_mesh_load,
    gear_pitch_diameter_mm,
    helix_hand_sign,
    reference_pitch_diameter_mm,
    spur_helical_mesh_load,
    working_pitch_diameter_mm,
)
from shaftsys.units import omega_rad_s, power_W

# --------------------------------------------------------------------------------------
# Sign table of the helical thrust: hand x sense of rotation x driving/driven.
#
# Free body diagram worked by hand (friction neglected). A right-hand tooth line on the
# pitch cylinder runs along t = cos(psi) x + sin(psi) u_t (it advances toward +x while
# turning in the +x sense, like a right-hand screw). The mate's tooth pushes on the
# flank normal to the tooth surface, so the pitch-plane part of that push is
# perpendicular to t: F = a x + b u_t with a cos(psi) + b sin(psi) = 0, i.e.
# a = -b tan(psi). For a left-hand tooth t = cos(psi) x - sin(psi) u_t and a = +b tan(psi).
# The tangential part b has the sign of T_el (b = T_el / r): for a driver it opposes the
# rotation (b has the sign of -speed), for a driven gear it follows the rotation.
#
#   row  hand speed role     sign(b)  thrust a                 hand rule (driver)
#   1    R    +     driver   -        -b tan > 0   -> +x       right thumb, fingers +x sense: +x
#   2    R    -     driver   +        -b tan < 0   -> -x       right thumb, fingers -x sense: -x
#   3    L    +     driver   -        +b tan < 0   -> -x       left thumb, fingers +x sense: -x
#   4    L    -     driver   +        +b tan > 0   -> +x       left thumb, fingers -x sense: +x
#   5    R    +     driven   +        -b tan < 0   -> -x       opposite of its driver (L, -): -x
#   6    R    -     driven   -        -b tan > 0   -> +x       opposite of its driver (L, +): +x
#   7    L    +     driven   +        +b tan > 0   -> +x       opposite of its driver (R, -): +x
#   8    L    -     driven   -        +b tan < 0   -> -x       opposite of its driver (R, +): -x
#
# Hand rule of the trade: Shigley's Mechanical Engineering Design, helical gear force
# analysis (from memory): for the driver, curl the fingers of the hand matching the
# helix in the sense of rotation; the thumb gives the thrust on the driver; the driven
# gear (opposite hand in an external pair, opposite rotation) takes the opposite thrust.
# (A left thumb pointing -x curls its fingers counter-clockwise seen from +x, i.e. in
# the +x sense, hence rows 3 and 4.)
# --------------------------------------------------------------------------------------
SIGN_TABLE = [
    ("right", +1, "driver", +1),
    ("right", -1, "driver", -1),
    ("left", +1, "driver", -1),
    ("left", -1, "driver", +1),
    ("right", +1, "driven", -1),
    ("right", -1, "driven", +1),
    ("left", +1, "driven", +1),
    ("left", -1, "driven", -1),
]


@pytest.mark.parametrize(("hand", "speed_sign", "role", "thrust_sign"), SIGN_TABLE)
@pytest.mark.parametrize("mesh_angle", [0.0, 73.0, 200.0])
def test_helical_thrust_sign_table(
    hand: str, speed_sign: int, role: str, thrust_sign: int, mesh_angle: float
) -> None:
    # Source: hand-worked free-body diagram above, cross-checked with the hand rule of
    # Shigley's Mechanical Engineering Design, helical gear force analysis (from memory).
    speed_rpm = 1500.0 * speed_sign
    power_sign = -1 if role == "driver" else +1
    T_el = 80_000.0 * power_sign * speed_sign  # sign(T_el * speed) = power_sign
    assert math.copysign(1.0, power_W(T_el, speed_rpm)) == power_sign
    load = spur_helical_mesh_load(T_el, 120.0, mesh_angle, 20.0, 15.0, hand)
    assert math.copysign(1.0, load.force_N[0]) == thrust_sign
    assert load.details["F_a_x_N"] == pytest.approx(load.force_N[0])


def test_helical_magnitudes_worked_case() -> None:
    # Shigley's Mechanical Engineering Design, helical gear force relations:
    # W_t = T / r, W_r = W_t tan(phi_n) / cos(psi), W_a = W_t tan(psi).
    # T = 100 N*m = 100000 N*mm, d = 100 mm -> r = 50 mm, W_t = 100000 / 50 = 2000 N.
    # tan 20 deg = 0.363970, cos 30 deg = 0.866025 -> tan/cos = 0.420277,
    # W_r = 2000 * 0.420277 = 840.553 N. tan 30 deg = 0.577350 -> W_a = 1154.701 N.
    load = spur_helical_mesh_load(-100_000.0, 100.0, 0.0, 20.0, 30.0, "right")
    assert load.details["W_t_N"] == pytest.approx(2000.0, rel=1e-12)
    assert load.details["W_r_N"] == pytest.approx(840.553, rel=1e-6)
    assert load.details["W_a_N"] == pytest.approx(1154.701, rel=1e-6)
    # Vectors by hand, mesh angle 0: u_r = (0, 1, 0), u_t = (0, 0, 1).
    # W_t = T/r = -2000 along u_t; radial 840.553 toward the axis (-y); thrust
    # -h W_t tan(psi) = +1154.701 along x (row 1 of the sign table: RH driver at speed > 0).
    np.testing.assert_allclose(load.force_N, [1154.701, -840.553, -2000.0], rtol=1e-6)
    # Moment = p x F with p = (0, 50, 0):
    #   x: 50 * (-2000) - 0 = -100000; y: 0 - 0 = 0; z: 0 - 50 * 1154.701 = -57735.05.
    np.testing.assert_allclose(load.moment_Nmm, [-100_000.0, 0.0, -57735.03], rtol=1e-6, atol=1e-9)


def test_spur_gear_has_no_thrust_and_tan_phi_radial() -> None:
    # Shigley, spur gear force analysis: W_r = W_t tan(phi). T = 30 N*m, d = 60 mm:
    # W_t = 30000 / 30 = 1000 N, W_r = 1000 * tan 20 deg = 363.970 N.
    load = spur_helical_mesh_load(30_000.0, 60.0, 90.0, 20.0)
    # mesh angle 90: u_r = (0, 0, 1), u_t = (0, -1, 0): W_t = +1000 along u_t -> -y,
    # radial 363.970 toward the axis -> -z.
    np.testing.assert_allclose(load.force_N, [0.0, -1000.0, -363.970], rtol=1e-6, atol=1e-9)
    np.testing.assert_allclose(load.moment_Nmm, [30_000.0, 0.0, 0.0], atol=1e-9)


def test_internal_gear_radial_force_points_outward() -> None:
    # The separating force pushes a ring gear away from its own axis (+u_r); same
    # magnitude as external: W_t = 50000 / 100 = 500 N, W_r = 500 * tan 20 = 181.985 N.
    load = spur_helical_mesh_load(50_000.0, 200.0, 0.0, 20.0, internal=True)
    np.testing.assert_allclose(load.force_N, [0.0, 181.985, 500.0], rtol=1e-5, atol=1e-9)


def _global_moment_sum(loads_and_centres: list[tuple[AxisLoad, np.ndarray]]) -> np.ndarray:
    """Sum of moments about the global origin of loads acting at given axis points."""
    total = np.zeros(3)
    for load, centre in loads_and_centres:
        total += load.moment_Nmm + np.cross(centre, load.force_N)
    return total


def test_external_helical_pair_action_reaction() -> None:
    # Newton's third law at the pitch point. Pinion (r1 = 40, RH) with its centre at the
    # origin, gear (r2 = 100, LH) at c2 = 140 u_r(30 deg); mesh angles 30 and 210 deg.
    # The contact force F on the pinion acts at r1 u_r, -F on the gear at -r2 u_r (gear
    # frame): moments r1 u_r x F and r2 u_r x F have the SAME sign, so with both x axes
    # pointing the same way T_el2 = +T_el1 * r2 / r1 (pinion speed +, gear speed - ->
    # both torques negative: the pinion is braked by the mate, the gear driven in -x).
    r1, r2 = 40.0, 100.0
    T1 = -50_000.0
    T2 = T1 * r2 / r1
    p = spur_helical_mesh_load(T1, 2 * r1, 30.0, 20.0, 12.0, "right")
    g = spur_helical_mesh_load(T2, 2 * r2, 210.0, 20.0, 12.0, "left")
    np.testing.assert_allclose(p.force_N + g.force_N, 0.0, atol=1e-9)
    th = math.radians(30.0)
    c2 = (r1 + r2) * np.array([0.0, math.cos(th), math.sin(th)])
    np.testing.assert_allclose(_global_moment_sum([(p, np.zeros(3)), (g, c2)]), 0.0, atol=1e-7)
    # Energy check: omega2 = -omega1 r1 / r2, power in = power out.
    n1 = 1000.0
    n2 = -n1 * r1 / r2
    assert power_W(T1, n1) + power_W(T2, n2) == pytest.approx(0.0, abs=1e-9)
    assert omega_rad_s(n2) == pytest.approx(-omega_rad_s(n1) * 0.4)


def test_internal_helical_pair_action_reaction() -> None:
    # Pinion (r1 = 30, RH) inside a ring (r2 = 90, RH: same hand for an internal pair).
    # Ring centre at the origin, pinion centre at (r2 - r1) u_r(45 deg); both see the pitch
    # point in the same direction, mesh angle 45. Moments r1 u_r x F and r2 u_r x (-F)
    # have opposite signs: T_el2 = -T_el1 * r2 / r1.
    r1, r2 = 30.0, 90.0
    T1 = 20_000.0
    T2 = -T1 * r2 / r1
    p = spur_helical_mesh_load(T1, 2 * r1, 45.0, 20.0, 20.0, "right")
    ring = spur_helical_mesh_load(T2, 2 * r2, 45.0, 20.0, 20.0, "right", internal=True)
    np.testing.assert_allclose(p.force_N + ring.force_N, 0.0, atol=1e-9)
    th = math.radians(45.0)
    c1 = (r2 - r1) * np.array([0.0, math.cos(th), math.sin(th)])
    np.testing.assert_allclose(_global_moment_sum([(p, c1), (ring, np.zeros(3))]), 0.0, atol=1e-7)


def test_pitch_diameter_helpers() -> None:
    # Shigley, helical gears: d = m_n z / cos(psi) (from memory).
    # m_n = 3, z = 25, psi = 20 deg: cos 20 = 0.9396926 -> d = 75 / 0.9396926 = 79.8134 mm.
    assert reference_pitch_diameter_mm(3.0, 25, 20.0) == pytest.approx(79.8134, rel=1e-6)
    assert reference_pitch_diameter_mm(2.0, 30) == pytest.approx(60.0)
    assert gear_pitch_diameter_mm(3.0, 25, 20.0, working_diameter_mm=81.0) == 81.0
    assert gear_pitch_diameter_mm(2.0, 30) == pytest.approx(60.0)
    # Rolling pitch circles: d_w1/d_w2 = z1/z2, a = (d_w1 + d_w2)/2 (external) or
    # (d_w2 - d_w1)/2 (internal). a = 102, z1 = 20, z2 = 40: d_w1 = 204*20/60 = 68 mm;
    # internal a = 51, z1 = 20, z2 = 60: d_w1 = 102*20/40 = 51 mm, ring 102*60/40 = 153 mm.
    assert working_pitch_diameter_mm(102.0, 20, 40) == pytest.approx(68.0)
    assert working_pitch_diameter_mm(51.0, 20, 60, internal_mesh=True) == pytest.approx(51.0)
    assert working_pitch_diameter_mm(51.0, 60, 20, internal_mesh=True) == pytest.approx(153.0)


def test_hand_parsing_and_errors() -> None:
    assert helix_hand_sign("Right", 10.0) == 1
    assert helix_hand_sign("L", 10.0) == -1
    assert helix_hand_sign(-1, 10.0) == -1
    assert helix_hand_sign(None, 0.0) == 0
    with pytest.raises(ModelError):
        helix_hand_sign(None, 10.0)
    with pytest.raises(ModelError):
        helix_hand_sign("sideways", 10.0)
    with pytest.raises(ModelError):
        spur_helical_mesh_load(1.0, 50.0, 0.0, 20.0, -15.0, "right")
    with pytest.raises(ModelError):
        spur_helical_mesh_load(float("nan"), 50.0, 0.0, 20.0)
    with pytest.raises(ModelError):
        spur_helical_mesh_load(1.0, 0.0, 0.0, 20.0)
    with pytest.raises(ModelError):
        bevel_mesh_load(1.0, 50.0, 30.0, 20.0, 0.0, 0)


def test_bevel_magnitudes_worked_case() -> None:
    # Shigley's Mechanical Engineering Design, straight bevel gear force analysis:
    # W_t = T / r_m, W_r = W_t tan(phi) cos(gamma), W_a = W_t tan(phi) sin(gamma).
    # T = 50 N*m, r_m = 40 mm: W_t = 50000 / 40 = 1250 N. tan 20 = 0.363970,
    # cos 30 = 0.866025, sin 30 = 0.5: W_r = 1250 * 0.363970 * 0.866025 = 394.0093 N,
    # W_a = 1250 * 0.363970 * 0.5 = 227.4814 N.
    for T in (50_000.0, -50_000.0):
        load = bevel_mesh_load(T, 80.0, 30.0, 20.0, 0.0, apex_direction=+1)
        assert load.details["W_t_N"] == pytest.approx(1250.0)
        assert load.details["W_r_N"] == pytest.approx(394.0093, rel=1e-6)
        assert load.details["W_a_N"] == pytest.approx(227.4814, rel=1e-6)
        # Apex toward +x: the thrust pushes the gear away from the apex, -x, for both
        # torque signs; radial toward the own axis (-y at mesh angle 0); tangential
        # T/r_m along u_t = +z.
        np.testing.assert_allclose(
            load.force_N, [-227.4814, -394.0093, math.copysign(1250.0, T)], rtol=1e-6
        )
        # Moment = p x F, p = (0, 40, 0): x = 40 * F_z = T; z = -40 * F_x = +9099.26.
        np.testing.assert_allclose(load.moment_Nmm, [T, 0.0, 9099.256], rtol=1e-6, atol=1e-9)
        flipped = bevel_mesh_load(T, 80.0, 30.0, 20.0, 0.0, apex_direction=-1)
        assert flipped.force_N[0] == pytest.approx(+227.4814, rel=1e-6)


def test_bevel_pair_action_reaction_90_degree_shafts() -> None:
    # Newton's third law on a 90 deg bevel pair, with the pinion's radial force being
    # the gear's axial force and vice versa (Shigley, bevel gearing). Geometry by hand:
    # pinion r_mp = 30, gear r_mg = 60, tan(gamma_p) = r_mp / r_mg -> gamma_p = 26.565 deg,
    # gamma_g = 63.435 deg. Global frame = pinion frame (X, Y, Z); pinion mean section at
    # the origin, mean pitch point at (0, 30, 0) (mesh angle 0), apex at (60, 0, 0)
    # (toward +x: apex_direction +1). Gear axis: the line x = 60, z = 0; gear mean
    # section at (60, 30, 0). Gear frame: x_g = -Y (apex toward +x_g), y_g = -X (so the
    # pitch point is at mesh angle 0 of the gear), z_g = x_g cross y_g = -Z.
    r_mp, r_mg = 30.0, 60.0
    gamma_p = math.degrees(math.atan(r_mp / r_mg))
    gamma_g = 90.0 - gamma_p
    T_p = 30_000.0
    # Tangential forces: pinion W_tp along +Z, gear W_tg along z_g = -Z; cancel when
    # W_tg = W_tp, i.e. T_g / r_mg = T_p / r_mp.
    T_g = T_p * r_mg / r_mp
    pin = bevel_mesh_load(T_p, 2 * r_mp, gamma_p, 20.0, 0.0, +1)
    gear = bevel_mesh_load(T_g, 2 * r_mg, gamma_g, 20.0, 0.0, +1)
    R = np.column_stack([[0.0, -1.0, 0.0], [-1.0, 0.0, 0.0], [0.0, 0.0, -1.0]])
    F_gear = R @ gear.force_N
    M_gear = R @ gear.moment_Nmm
    np.testing.assert_allclose(pin.force_N + F_gear, 0.0, atol=1e-9)
    c_gear = np.array([60.0, 30.0, 0.0])
    total_M = pin.moment_Nmm + M_gear + np.cross(c_gear, F_gear)
    np.testing.assert_allclose(total_M, 0.0, atol=1e-7)
    assert pin.details["W_a_N"] == pytest.approx(gear.details["W_r_N"])


def test_axis_load_is_read_only() -> None:
    load = spur_helical_mesh_load(1000.0, 50.0, 0.0, 20.0)
    with pytest.raises(ValueError, match="read-only"):
        load.force_N[0] = 1.0


finite_torque = st.floats(-1e7, 1e7, allow_nan=False, allow_infinity=False)
angle = st.floats(-720.0, 720.0, allow_nan=False, allow_infinity=False)


@given(
    T=finite_torque,
    d=st.floats(1.0, 2000.0),
    theta=angle,
    phi=st.floats(5.0, 35.0),
    psi=st.floats(0.0, 45.0),
    hand=st.sampled_from(["right", "left"]),
    internal=st.booleans(),
)
def test_property_helical_torque_exact_and_moment_is_p_cross_f(
    T: float, d: float, theta: float, phi: float, psi: float, hand: str, internal: bool
) -> None:
    # Reduction rule of statics: moment on the axis = p x F with p = r u_r(theta).
    load = spur_helical_mesh_load(T, d, theta, phi, psi, hand, internal)
    assert load.moment_Nmm[0] == T
    th = math.radians(theta)
    p = 0.5 * d * np.array([0.0, math.cos(th), math.sin(th)])
    expected = np.cross(p, load.force_N)
    scale = 1.0 + abs(T)
    np.testing.assert_allclose(load.moment_Nmm, expected, atol=1e-9 * scale)


@given(
    T=finite_torque,
    d=st.floats(1.0, 2000.0),
    theta=angle,
    gamma=st.floats(1.0, 90.0),
    apex=st.sampled_from([1, -1]),
)
def test_property_bevel_torque_exact_and_thrust_away_from_apex(
    T: float, d: float, theta: float, gamma: float, apex: int
) -> None:
    # Shigley, straight bevel: the thrust points away from the apex whatever the torque.
    load = bevel_mesh_load(T, d, gamma, 20.0, theta, apex)
    assert load.moment_Nmm[0] == T
    assert load.force_N[0] * apex <= 0.0
    th = math.radians(theta)
    p = 0.5 * d * np.array([0.0, math.cos(th), math.sin(th)])
    np.testing.assert_allclose(
        load.moment_Nmm, np.cross(p, load.force_N), atol=1e-9 * (1.0 + abs(T))
    )
