"""Rolling-element load distribution against outside references.

Sources: Stribeck's Qmax = 4.37 Fr/Z for zero clearance (5 Fr/Z with an allowance for
clearance; classic, Harris *Rolling Bearing Analysis*, from memory) - cross-checked by
our own integral of the load zone; Sjoevall's load-zone integrals Jr(eps), Ja(eps)
(Harris, from memory: Jr(0.5) = 0.2288 point contact; a recalled Ja(0.5) = 0.2546 failed
its recomputation and is not used) - recomputed here with scipy's
quad; Hertz point contact (Roark's sphere on a flat plate; Hamrock-Brewe's approximate
ellipticity and elliptic integrals, from memory) against the closed form with the
complete elliptic integrals; the axial stiffness of an angular-contact row (hand
formula from Q = K delta^1.5, constant contact angle); Palmgren's line contact
constant checked by inverting delta = 3.84e-5 Q^0.9 / l^0.8.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad

from shaftsys.bearings.interior import (
    E_STEEL_MPA,
    NU_STEEL,
    RowGeometry,
    ball_curvature_sums,
    distribution,
    hertz_point,
    line_contact_constant,
    load_zone_factor,
    point_contact_constant,
    solve_displacement,
)

RADIAL_ONLY = np.array([False, False, True, True, True])
NO_TILT = np.array([False, False, False, True, True])


def _ball(Z: int = 12, alpha: float = 0.0, clearance: float = 0.0, side: float = 1.0
          ) -> RowGeometry:
    K = point_contact_constant(12.0, 60.0, alpha, 0.52, 0.53)
    return RowGeometry(12.0, Z, 60.0, alpha, 0.52, 0.53, None, clearance, side, False, K)


def _roller(Z: int, alpha: float) -> RowGeometry:
    return RowGeometry(10.0, Z, 60.0, alpha, 0.5, 0.5, 12.0, 0.0, 1.0, True,
                       line_contact_constant(12.0))


def _J(eps: float, n: float, radial: bool) -> float:
    """Sjoevall's integral (1/2pi) int (1 - (1 - cos psi)/(2 eps))^n [cos psi] dpsi."""
    lim = math.pi if eps >= 1.0 else math.acos(1.0 - 2.0 * eps)
    val, _ = quad(lambda p: (1.0 - (1.0 - math.cos(p)) / (2.0 * eps)) ** n
                  * (math.cos(p) if radial else 1.0), -lim, lim)
    return val / (2.0 * math.pi)


def test_stribeck_zero_clearance() -> None:
    g = _ball(Z=200)
    Fr = 5000.0
    u, _, _ = solve_displacement([g], np.array([[Fr, 0, 0, 0, 0]]), fixed=RADIAL_ONLY)
    ratio = distribution(g, u).Q_N.max() * g.Z / Fr
    assert ratio == pytest.approx(1.0 / _J(0.5, 1.5, True), rel=2e-3)
    assert ratio == pytest.approx(4.37, abs=0.01)  # Stribeck (from memory)
    assert float(load_zone_factor(g, u)[0]) == pytest.approx(0.5)
    # a clearance narrows the load zone: Stribeck's 5 Fr/Z allows for it
    gc = _ball(Z=200, clearance=0.02)
    uc, _, _ = solve_displacement([gc], np.array([[Fr, 0, 0, 0, 0]]), fixed=RADIAL_ONLY)
    assert distribution(gc, uc).Q_N.max() * gc.Z / Fr > 4.6
    assert float(load_zone_factor(gc, uc)[0]) < 0.5


def test_sjovall_integral_at_half_load_zone_from_memory() -> None:
    assert _J(0.5, 1.5, True) == pytest.approx(0.2288, abs=1e-4)


@pytest.mark.parametrize("Fa_over_Fr", [0.4, 0.5, 1.0, 2.0])
def test_load_zone_integrals_of_a_tapered_row(Fa_over_Fr: float) -> None:
    """Line contact with a fixed contact angle is Sjoevall's kinematics exactly:
    Fr = Z Qmax Jr(eps) cos a, Fa = Z Qmax Ja(eps) sin a."""
    g = _roller(Z=360, alpha=15.0)
    Fr = 10_000.0
    u, _, _ = solve_displacement([g], np.array([[Fr, 0, Fa_over_Fr * Fr, 0, 0]]),
                                 fixed=NO_TILT)
    eps = float(load_zone_factor(g, u)[0])
    Qmax = distribution(g, u).Q_N.max()
    a = math.radians(15.0)
    assert Fr / (g.Z * Qmax * math.cos(a)) == pytest.approx(_J(eps, 10 / 9, True),
                                                             rel=5e-3)
    assert Fa_over_Fr * Fr / (g.Z * Qmax * math.sin(a)) == pytest.approx(
        _J(eps, 10 / 9, False), rel=5e-3)


def test_hertz_ball_on_flat_is_roarks_sphere_on_plate() -> None:
    Q, D = 500.0, 12.0
    delta, a, b, p = hertz_point((2 / D, 2 / D, 0.0, 0.0), Q)
    e_star = E_STEEL_MPA / (2.0 * (1.0 - NU_STEEL**2))
    R = D / 2
    assert delta == pytest.approx((9 * Q**2 / (16 * R * e_star**2)) ** (1 / 3), rel=1e-9)
    assert a == pytest.approx(b) == pytest.approx((3 * Q * R / (4 * e_star)) ** (1 / 3))
    assert p == pytest.approx(3 * Q / (2 * math.pi * a * a))


def test_hertz_groove_against_hamrock_brewe_approximation() -> None:
    rho = ball_curvature_sums(12.0, 60.0, 0.0, 0.52, outer=False)
    Q = 1000.0
    delta, a, b, _ = hertz_point(rho, Q)
    Rx = 1 / (rho[0] + rho[2])
    Ry = 1 / (rho[1] + rho[3])
    k = 1.0339 * (Ry / Rx) ** 0.636          # Hamrock-Brewe (from memory)
    Ek = 1.0003 + 0.5968 * Rx / Ry
    Fk = 1.5277 + 0.6023 * math.log(Ry / Rx)
    R = 1 / sum(rho)
    e_prime = E_STEEL_MPA / (1 - NU_STEEL**2)
    approx = Fk * (9 / (2 * Ek * R) * (Q / (math.pi * k * e_prime)) ** 2) ** (1 / 3)
    assert a / b == pytest.approx(k, rel=0.03)
    assert delta == pytest.approx(approx, rel=0.03)


def test_line_contact_constant_inverts_palmgren() -> None:
    K = line_contact_constant(12.0)
    Q = 3000.0
    per_contact = 3.84e-5 * Q**0.9 / 12.0**0.8
    assert (Q / K) ** 0.9 == pytest.approx(2 * per_contact, rel=1e-12)


def test_axial_stiffness_of_a_preloaded_angular_contact_pair() -> None:
    """Each row of a pair preloaded by Fp with no external load carries Fp; the axial
    stiffness of one row by hand: Fa = Z K (da sin a)^1.5 sin a gives
    k = 1.5 (Z K)^(2/3) (sin a)^(5/3) Fa^(1/3) (contact angle held constant); the pair
    has twice that."""
    Fp = 300.0
    g = _ball(Z=15, alpha=25.0)
    u, _, _ = solve_displacement([g], np.array([[0, 0, Fp, 0, 0]]), fixed=NO_TILT)
    k_row = distribution(g, u).K[0, 2, 2]
    sa = math.sin(math.radians(25.0))
    hand = 1.5 * (g.Z * g.K_N) ** (2 / 3) * sa ** (5 / 3) * Fp ** (1 / 3)
    assert 2 * k_row == pytest.approx(2 * hand, rel=0.05)
    g2 = _ball(Z=15, alpha=25.0, side=-1.0)
    u2, _, _ = solve_displacement([g2], np.array([[0, 0, -Fp, 0, 0]]), fixed=NO_TILT)
    assert distribution(g2, u2).K[0, 2, 2] == pytest.approx(k_row, rel=1e-9)


@pytest.mark.parametrize("row", [_ball(alpha=20.0, clearance=0.01), _roller(14, 12.0)])
def test_tangent_stiffness_is_the_derivative_of_the_load(row: RowGeometry) -> None:
    u = np.array([[0.02, -0.01, 0.015, 2e-4, -3e-4]])
    d = distribution(row, u)
    h = np.array([1e-7, 1e-7, 1e-7, 1e-9, 1e-9])
    for k in range(5):
        du = np.zeros((1, 5))
        du[0, k] = h[k]
        fd = (distribution(row, u + du).f - distribution(row, u - du).f) / (2 * h[k])
        np.testing.assert_allclose(d.K[0, :, k], fd[0], rtol=1e-5, atol=1e-6 * np.abs(
            d.K).max())


def test_inverse_problem_vectorised_over_cases() -> None:
    rows = [_ball(alpha=25.0), _ball(alpha=25.0, side=-1.0)]
    F = np.array([[2000.0, 500, 800, 1e4, -5e3], [100.0, 3000, -1500, 0, 2e4]])
    u, _, res = solve_displacement(rows, F)
    f = sum(distribution(r, u).f for r in rows)
    np.testing.assert_allclose(f, F, rtol=1e-7, atol=1e-5)
    assert res < 1e-9


def test_preloaded_set_holds_the_preload_and_doubles_the_row_stiffness() -> None:
    """A back-to-back set preloaded by Fp: at no external load both rows carry Fp
    (the net thrust is zero) and the axial stiffness is twice one row's at Fp
    (the hand formula of the test above)."""
    from shaftsys.bearings.interior import row_geometries
    from shaftsys.model import AxialRole, Bearing, BearingKind, SetArrangement
    from shaftsys.model.interior import Interior

    Fp = 300.0
    b = Bearing(id="P", kind=BearingKind.ANGULAR_CONTACT_BALL, x_mm=0.0, d_mm=40.0,
                D_mm=80.0, C_N=3e4, C0_N=2e4, contact_angle_deg=25.0, rows=2,
                arrangement=SetArrangement.BACK_TO_BACK, axial=AxialRole.BOTH,
                interior=Interior(Dw_mm=12.0, Z=15, dm_mm=60.0, contact_angle_deg=25.0,
                                  preload_N=Fp))
    rows = row_geometries(b)
    u0 = np.zeros((1, 5))
    ds = [distribution(r, u0) for r in rows]
    thrust = [float(d.f[0, 2]) for d in ds]
    assert thrust[0] == pytest.approx(Fp, rel=1e-8)
    assert thrust[1] == pytest.approx(-Fp, rel=1e-8)
    k_pair = sum(d.K[0, 2, 2] for d in ds)
    sa = math.sin(math.radians(25.0))
    hand = 1.5 * (15 * rows[0].K_N) ** (2 / 3) * sa ** (5 / 3) * Fp ** (1 / 3)
    assert k_pair == pytest.approx(2 * hand, rel=0.05)
