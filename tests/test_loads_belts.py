"""Belt and chain hub loads.

Strand geometry (worked by hand, see the sketch in shaftsys/loads/belts.py): theta =
direction toward the other pulley, delta = (180 - wrap)/2; strand "+" leaves along
u_r(theta + delta) from p+ = r u_t(theta + delta) and has moment -r T about +x; strand
"-" leaves along u_r(theta - delta) from p- = -r u_t(theta - delta), moment +r T.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

from shaftsys.errors import ModelError
from shaftsys.loads import (
    belt_hub_load,
    capstan_limit,
    chain_hub_load,
    min_pretension_N,
    open_belt_wrap_angle_deg,
)


def _ur(deg: float) -> np.ndarray:
    t = math.radians(deg)
    return np.array([0.0, math.cos(t), math.sin(t)])


def _ut(deg: float) -> np.ndarray:
    t = math.radians(deg)
    return np.array([0.0, -math.sin(t), math.cos(t)])


def test_equal_pulleys_hub_load_is_sum_of_tensions_on_centre_line() -> None:
    # Shigley, flat belts (constant-sum tensions, from memory): T1 + T2 = 2 Ti,
    # T1 - T2 = T/r. Ti = 1000 N, T = 100 N*m = 1e5 N*mm, r = 100 mm:
    # T/r = 1000 N -> T1 = 1500 N, T2 = 500 N; wrap 180: strands parallel to the centre
    # line, hub force = (T1 + T2) u_r(90 deg) = 2000 N along +z.
    load = belt_hub_load(1e5, 200.0, 90.0, 180.0, 1000.0, 0.5)
    np.testing.assert_allclose(load.force_N, [0.0, 0.0, 2000.0], atol=1e-9)
    np.testing.assert_allclose(load.moment_Nmm, [1e5, 0.0, 0.0])
    assert load.details["T_tight_N"] == pytest.approx(1500.0)
    assert load.details["T_slack_N"] == pytest.approx(500.0)
    assert load.warnings == ()


def test_wrap_150_worked_by_hand() -> None:
    # Hand work: wrap 150 deg -> delta = 15 deg; theta = 0; T = +1e5 N*mm, r = 100 mm,
    # Ti = 1000 N -> T1 = 1500 N, T2 = 500 N. T_el > 0: tight strand is "-" at -15 deg.
    # F = 1500 (0, cos 15, -sin 15) + 500 (0, cos 15, sin 15)
    #   = (0, 2000 cos 15, -1000 sin 15) = (0, 2000*0.9659258, -1000*0.2588190)
    #   = (0, 1931.852, -258.819) N.
    # Law of cosines check: |F|^2 = 1500^2 + 500^2 - 2*1500*500*cos 150
    #   = 2.25e6 + 0.25e6 + 1.5e6*0.8660254 = 3799038 -> |F| = 1949.112 N.
    # Capstan, mu = 0.5: e^(0.5 * 2.6179939) = e^1.3089969 = 3.70246 > 3 -> no slip.
    load = belt_hub_load(1e5, 200.0, 0.0, 150.0, 1000.0, 0.5)
    np.testing.assert_allclose(load.force_N, [0.0, 1931.852, -258.819], rtol=1e-6, atol=1e-9)
    assert load.details["hub_force_N"] == pytest.approx(1949.112, rel=1e-6)
    assert load.details["tension_ratio"] == pytest.approx(3.0)
    assert load.details["capstan_limit"] == pytest.approx(3.70246, rel=1e-5)
    assert load.warnings == ()


def test_tight_side_switches_with_torque_sign() -> None:
    # Same case as above with T = -1e5 N*mm: the tight strand is "+" at +15 deg,
    # F = (0, 1931.852, +258.819) N (mirror image about the centre line).
    load = belt_hub_load(-1e5, 200.0, 0.0, 150.0, 1000.0, 0.5)
    np.testing.assert_allclose(load.force_N, [0.0, 1931.852, 258.819], rtol=1e-6, atol=1e-9)
    assert load.details["tight_strand_angle_deg"] == pytest.approx(15.0)
    assert load.details["slack_strand_angle_deg"] == pytest.approx(-15.0)
    assert load.moment_Nmm[0] == -1e5


def test_strand_forces_reproduce_the_torque() -> None:
    # Statics: sum of p_i x F_i over the strands (points and directions of the sketch)
    # equals the element torque, for both signs and a non-symmetric wrap.
    r = 75.0
    for T in (4e4, -4e4):
        load = belt_hub_load(T, 2 * r, 40.0, 200.0, 800.0, 0.4)
        delta = (180.0 - 200.0) / 2
        tight = load.details["tight_strand_angle_deg"]
        plus_is_tight = tight == pytest.approx(40.0 + delta)
        T_plus = load.details["T_tight_N"] if plus_is_tight else load.details["T_slack_N"]
        T_minus = load.details["T_slack_N"] if plus_is_tight else load.details["T_tight_N"]
        F_plus = T_plus * _ur(40.0 + delta)
        F_minus = T_minus * _ur(40.0 - delta)
        p_plus = r * _ut(40.0 + delta)
        p_minus = -r * _ut(40.0 - delta)
        M = np.cross(p_plus, F_plus) + np.cross(p_minus, F_minus)
        np.testing.assert_allclose(M, [T, 0.0, 0.0], atol=1e-7)
        np.testing.assert_allclose(F_plus + F_minus, load.force_N, atol=1e-9)


def test_capstan_limits_literal() -> None:
    # Flat belt (Euler-Eytelwein, Shigley flat belts, from memory): mu = 0.3, 180 deg:
    # 0.3 * pi = 0.9424778, e^0.9424778 = 2.566332.
    assert capstan_limit(0.3, 180.0) == pytest.approx(2.566332, rel=1e-6)
    # V-belt, groove beta = 38 deg (Shigley V-belts, effective mu/sin(beta/2), from memory):
    # sin 19 deg = 0.3255682, 0.3 / 0.3255682 = 0.9214660, * pi = 2.894871,
    # e^2.894871 = 18.0812.
    assert capstan_limit(0.3, 180.0, 38.0) == pytest.approx(18.0812, rel=1e-5)
    assert capstan_limit(0.0, 180.0) == 1.0
    with pytest.raises(ModelError):
        capstan_limit(0.3, 180.0, 0.0)
    with pytest.raises(ModelError):
        capstan_limit(-0.1, 180.0)


def test_min_pretension_literal_and_slip_boundary() -> None:
    # Shigley flat belt relation Fi = (T/D) (e^(f phi) + 1) / (e^(f phi) - 1) (from memory):
    # T = 1e5 N*mm, D = 200 mm -> T/D = 500 N; R = 2.566332:
    # Fi = 500 * 3.566332 / 1.566332 = 500 * 2.276868 = 1138.434 N.
    Ti = min_pretension_N(1e5, 100.0, 0.3, 180.0)
    assert Ti == pytest.approx(1138.434, rel=1e-6)
    assert min_pretension_N(0.0, 100.0, 0.3, 180.0) == 0.0
    assert min_pretension_N(1e5, 100.0, 0.0, 180.0) == math.inf
    ok = belt_hub_load(1e5, 200.0, 0.0, 180.0, 1.001 * 1138.434, 0.3)
    assert ok.warnings == ()
    slip = belt_hub_load(1e5, 200.0, 0.0, 180.0, 0.999 * 1138.434, 0.3)
    assert len(slip.warnings) == 1
    assert "slip" in slip.warnings[0]
    assert "2.56633" in slip.warnings[0]


def test_slip_warning_wrap_150_low_friction() -> None:
    # Ratio 1500/500 = 3 with mu = 0.3, wrap 150 deg: e^(0.3 * 2.6179939) = e^0.7853982
    # = 2.193280 < 3 -> slip warning; the load itself is unchanged.
    load = belt_hub_load(1e5, 200.0, 0.0, 150.0, 1000.0, 0.3)
    assert len(load.warnings) == 1
    assert "2.19328" in load.warnings[0]
    np.testing.assert_allclose(load.force_N, [0.0, 1931.852, -258.819], rtol=1e-6, atol=1e-9)


def test_v_belt_grips_where_a_flat_belt_slips() -> None:
    # beta = 38 deg raises the limit from 2.193 to e^(0.7853982/0.3255682) = e^2.412392
    # = 11.16063 (hand arithmetic), so ratio 3 is fine.
    load = belt_hub_load(1e5, 200.0, 0.0, 150.0, 1000.0, 0.3, groove_angle_deg=38.0)
    assert load.warnings == ()
    assert load.details["capstan_limit"] == pytest.approx(11.16063, rel=1e-6)


def test_slack_side_goes_slack() -> None:
    # Ti = 400 N < T/(2r) = 500 N: the slack strand would need -100 N. Model: T2 = 0,
    # T1 = T/r = 1000 N along the tight strand (wrap 180, theta = 0: along +y).
    load = belt_hub_load(1e5, 200.0, 0.0, 180.0, 400.0, 0.3)
    assert any("slack" in w for w in load.warnings)
    np.testing.assert_allclose(load.force_N, [0.0, 1000.0, 0.0], atol=1e-9)
    assert load.details["T_slack_N"] == 0.0
    assert load.moment_Nmm[0] == 1e5


def test_no_torque_no_pretension_no_load() -> None:
    load = belt_hub_load(0.0, 200.0, 0.0, 170.0, 0.0, 0.3)
    np.testing.assert_allclose(load.force_N, 0.0)
    assert load.warnings == ()


def test_open_belt_wrap_angles() -> None:
    # Shigley flat belt geometry (from memory): phi_small = pi - 2 asin((D - d)/(2C)).
    # d = 100, D = 300, C = 400: asin(200/800) = asin(0.25) = 14.47751 deg
    # -> 180 - 28.95502 = 151.04498 deg on the small pulley, 208.95502 deg on the big.
    assert open_belt_wrap_angle_deg(100.0, 300.0, 400.0) == pytest.approx(151.04498, rel=1e-7)
    assert open_belt_wrap_angle_deg(300.0, 100.0, 400.0) == pytest.approx(208.95502, rel=1e-7)
    with pytest.raises(ModelError):
        open_belt_wrap_angle_deg(100.0, 300.0, 150.0)


def test_belt_input_errors() -> None:
    with pytest.raises(ModelError):
        belt_hub_load(1e5, 200.0, 0.0, 360.0, 1000.0, 0.3)
    with pytest.raises(ModelError):
        belt_hub_load(1e5, 200.0, 0.0, 180.0, -1.0, 0.3)
    with pytest.raises(ModelError):
        chain_hub_load(1e5, -10.0, 0.0)


def test_chain_worked_by_hand() -> None:
    # Tight strand only (common practice, no source). T = 200 N*m = 2e5 N*mm,
    # d = 160 mm -> r = 80 mm, tension 2e5/80 = 2500 N. Wrap 180, theta = 90 deg:
    # the strand runs along u_r(90) = +z.
    for T in (2e5, -2e5):
        load = chain_hub_load(T, 160.0, 90.0)
        np.testing.assert_allclose(load.force_N, [0.0, 0.0, 2500.0], atol=1e-9)
        assert load.moment_Nmm[0] == T
    # Wrap 160 -> delta = 10; T > 0: tight strand "-" at 90 - 10 = 80 deg:
    # 2500 (cos 80, sin 80) = 2500 (0.17364818, 0.98480775) = (434.1204, 2462.0194) N.
    load = chain_hub_load(2e5, 160.0, 90.0, 160.0)
    np.testing.assert_allclose(load.force_N, [0.0, 434.1204, 2462.0194], rtol=1e-6)
    # T < 0: strand "+" at 100 deg: (-434.1204, 2462.0194).
    load = chain_hub_load(-2e5, 160.0, 90.0, 160.0)
    np.testing.assert_allclose(load.force_N, [0.0, -434.1204, 2462.0194], rtol=1e-6)


finite_torque = st.floats(-1e7, 1e7, allow_nan=False, allow_infinity=False)
angle = st.floats(-720.0, 720.0, allow_nan=False, allow_infinity=False)
wrap = st.floats(30.0, 330.0)


@given(
    T=finite_torque,
    d=st.floats(10.0, 2000.0),
    theta=angle,
    phi=wrap,
    Ti=st.floats(0.0, 1e6),
    mu=st.floats(0.0, 1.0),
    groove=st.one_of(st.none(), st.floats(30.0, 60.0)),
)
def test_property_belt_torque_exact_and_hub_force_law_of_cosines(
    T: float, d: float, theta: float, phi: float, Ti: float, mu: float, groove: float | None
) -> None:
    load = belt_hub_load(T, d, theta, phi, Ti, mu, groove)
    assert load.moment_Nmm[0] == T
    assert load.force_N[0] == 0.0
    # Hub force from the two strand tensions phi apart in wrap (180 - phi apart in
    # direction): |F|^2 = T1^2 + T2^2 - 2 T1 T2 cos(phi) (Shigley, belt hub load).
    t1, t2 = load.details["T_tight_N"], load.details["T_slack_N"]
    expected = math.sqrt(max(t1 * t1 + t2 * t2 - 2 * t1 * t2 * math.cos(math.radians(phi)), 0.0))
    assert float(np.linalg.norm(load.force_N)) == pytest.approx(expected, rel=1e-9, abs=1e-6)
    assert t1 - t2 == pytest.approx(abs(T) / (0.5 * d), rel=1e-9, abs=1e-9)


@given(T=finite_torque, d=st.floats(10.0, 2000.0), theta=angle, phi=wrap)
def test_property_chain_torque_exact(T: float, d: float, theta: float, phi: float) -> None:
    load = chain_hub_load(T, d, theta, phi)
    assert load.moment_Nmm[0] == T
    assert float(np.linalg.norm(load.force_N)) == pytest.approx(abs(T) / (0.5 * d), rel=1e-12)
