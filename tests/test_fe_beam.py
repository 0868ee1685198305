"""Element matrices against textbook matrices and an independent sympy derivation."""

from __future__ import annotations

import numpy as np
import pytest
import sympy as sp

from shaftsys.fe.beam import (
    bar_stiffness,
    bar_uniform_load,
    beam_stiffness,
    shear_parameter,
    uniform_load,
)
from shaftsys.fe.modal import bar_mass, beam_mass


def _timoshenko_element_sympy(EI: sp.Expr, kGA: sp.Expr, L: sp.Expr):
    """Derive the exact two-node Timoshenko element with sympy (sympy 1.14).

    Method of Friedman & Kosmatka (Computers & Structures 47, 1993): take the general
    solution of the homogeneous Timoshenko equations
        d/dx [k G A (u' - psi)] = 0,   d/dx [E I psi'] + k G A (u' - psi) = 0,
    i.e. u cubic and psi quadratic with the coefficients tied by the equations, fix the
    four constants by the nodal values (u1, psi1, u2, psi2), then form the stiffness from
    the strain energy and the load vector from the work of a uniform load.
    Returns (K, f_per_q, Nu, Npsi, x).
    """
    x = sp.symbols("x", real=True)
    a0, a1, a2, a3 = sp.symbols("a0:4")
    b0, b1, b2 = sp.symbols("b0:3")
    u = a0 + a1 * x + a2 * x**2 + a3 * x**3
    psi = b0 + b1 * x + b2 * x**2
    eqs = (
        sp.Poly(sp.diff(u, x, 2) - sp.diff(psi, x), x).coeffs()
        + sp.Poly(EI * sp.diff(psi, x, 2) + kGA * (sp.diff(u, x) - psi), x).coeffs()
    )
    sol_b = sp.solve(eqs, [b0, b1, b2], dict=True)[0]
    u_ = u
    psi_ = psi.subs(sol_b)
    q = sp.symbols("u1 p1 u2 p2")
    conds = [
        u_.subs(x, 0) - q[0],
        psi_.subs(x, 0) - q[1],
        u_.subs(x, L) - q[2],
        psi_.subs(x, L) - q[3],
    ]
    sol_a = sp.solve(conds, [a0, a1, a2, a3], dict=True)[0]
    u_q = sp.expand(u_.subs(sol_a))
    psi_q = sp.expand(psi_.subs(sol_a))
    Nu = [sp.simplify(sp.diff(u_q, qi)) for qi in q]
    Np = [sp.simplify(sp.diff(psi_q, qi)) for qi in q]
    energy = sp.Rational(1, 2) * sp.integrate(
        EI * sp.diff(psi_q, x) ** 2 + kGA * (sp.diff(u_q, x) - psi_q) ** 2, (x, 0, L)
    )
    K = sp.hessian(energy, q)
    f = [sp.integrate(N, (x, 0, L)) for N in Nu]
    return K, f, Nu, Np, x


# Numbers chosen so that Phi is of order 1 (stubby element): EI = 3e9 N mm^2,
# kGA = 2.5e6 N, L = 60 mm -> Phi = 12 * 3e9 / (2.5e6 * 3600) = 4.
EI_N, KGA_N, L_N = 3_000_000_000, 2_500_000, 60


@pytest.fixture(scope="module")
def sympy_element():
    return _timoshenko_element_sympy(sp.Integer(EI_N), sp.Integer(KGA_N), sp.Integer(L_N))


def test_timoshenko_stiffness_matches_sympy_derivation(sympy_element) -> None:
    K_ref = np.array(sympy_element[0].evalf(), dtype=float)
    phi = shear_parameter(EI_N, KGA_N, L_N)
    assert phi == pytest.approx(4.0, rel=1e-15)
    np.testing.assert_allclose(beam_stiffness(EI_N, L_N, phi), K_ref, rtol=1e-12, atol=0)


def test_uniform_load_is_consistent_for_timoshenko_element(sympy_element) -> None:
    # Work-equivalent load of q over the interdependent element = q * integral of N_u.
    f_ref = np.array([float(v) for v in sympy_element[1]])
    np.testing.assert_allclose(uniform_load(1.0, L_N), f_ref, rtol=1e-13)
    # ... and the textbook EB values qL/2, qL^2/12 (Przemieniecki 1968, sec. 5.6; any FE
    # text; from memory).
    np.testing.assert_allclose(
        uniform_load(2.5, 80.0), [100.0, 1333.3333333333333, 100.0, -1333.3333333333333], rtol=1e-14
    )


def test_timoshenko_consistent_mass_matches_sympy(sympy_element) -> None:
    _, _, Nu, Np, x = sympy_element
    rhoA, rhoI = sp.Rational(7, 3), sp.Rational(11, 5)
    M_ref = np.array(
        [
            [
                float(sp.integrate(rhoA * Nu[i] * Nu[j] + rhoI * Np[i] * Np[j], (x, 0, L_N)))
                for j in range(4)
            ]
            for i in range(4)
        ]
    )
    phi = shear_parameter(EI_N, KGA_N, L_N)
    np.testing.assert_allclose(beam_mass(7 / 3, L_N, phi, 11 / 5), M_ref, rtol=1e-12, atol=0)


def test_euler_bernoulli_stiffness_textbook() -> None:
    # Euler-Bernoulli beam element (Przemieniecki 1968, ch. 5, or any FE text; from memory):
    # EI/L^3 [12 6L -12 6L; 6L 4L^2 -6L 2L^2; ...]
    EI, L = 2.0e9, 50.0
    c = EI / L**3
    K_ref = c * np.array(
        [
            [12, 6 * L, -12, 6 * L],
            [6 * L, 4 * L**2, -6 * L, 2 * L**2],
            [-12, -6 * L, 12, -6 * L],
            [6 * L, 2 * L**2, -6 * L, 4 * L**2],
        ]
    )
    np.testing.assert_allclose(beam_stiffness(EI, L), K_ref, rtol=1e-14)
    # kGA -> inf gives Phi -> 0.
    assert shear_parameter(EI, np.inf, L) == 0.0


def test_euler_bernoulli_consistent_mass_textbook() -> None:
    # Consistent mass rho A L / 420 [156 22L 54 -13L; ...] and rotary inertia
    # rho I / (30 L) [36 3L -36 3L; 3L 4L^2 -3L -L^2; ...] (Przemieniecki 1968, ch. 11;
    # from memory).
    rA, rI, L = 3.0e-9, 4.0e-7, 25.0
    Mt = (
        rA
        * L
        / 420
        * np.array(
            [
                [156, 22 * L, 54, -13 * L],
                [22 * L, 4 * L**2, 13 * L, -3 * L**2],
                [54, 13 * L, 156, -22 * L],
                [-13 * L, -3 * L**2, -22 * L, 4 * L**2],
            ]
        )
    )
    Mr = (
        rI
        / (30 * L)
        * np.array(
            [
                [36, 3 * L, -36, 3 * L],
                [3 * L, 4 * L**2, -3 * L, -(L**2)],
                [-36, -3 * L, 36, -3 * L],
                [3 * L, -(L**2), -3 * L, 4 * L**2],
            ]
        )
    )
    np.testing.assert_allclose(beam_mass(rA, L), Mt, rtol=1e-13, atol=1e-25)
    np.testing.assert_allclose(beam_mass(rA, L, 0.0, rI), Mt + Mr, rtol=1e-13, atol=1e-25)


def test_bar_matrices() -> None:
    # Two-node bar: EA/L [[1,-1],[-1,1]], consistent mass mL/6 [[2,1],[1,2]], load pL/2
    # (Przemieniecki 1968, ch. 5 and 11; from memory).
    np.testing.assert_allclose(bar_stiffness(1.2e6, 40.0), 3e4 * np.array([[1, -1], [-1, 1]]))
    np.testing.assert_allclose(bar_mass(6.0, 2.0), 2.0 * np.array([[2, 1], [1, 2]]))
    np.testing.assert_allclose(bar_uniform_load(3.0, 10.0), [15.0, 15.0])


def test_element_functions_broadcast() -> None:
    EI = np.array([1e9, 2e9, 3e9])
    L = np.array([10.0, 20.0, 30.0])
    K = beam_stiffness(EI, L, 0.5)
    assert K.shape == (3, 4, 4)
    for i in range(3):
        np.testing.assert_array_equal(K[i], beam_stiffness(EI[i], L[i], 0.5))
    np.testing.assert_allclose(K, np.swapaxes(K, -1, -2))
