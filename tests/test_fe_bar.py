"""Axial and torsion bars against hand formulas of elementary strength of materials."""

from __future__ import annotations

import math

import numpy as np
import pytest

from shaftsys.errors import ModelError, NumericalError
from shaftsys.fe.mesh import Steps, build_mesh
from shaftsys.fe.solve import Bar, BarSupport

E, NU = 210_000.0, 0.3
G = E / (2 * (1 + NU))
INF = math.inf


def test_stepped_bar_fixed_both_ends() -> None:
    """Two-segment bar fixed at both ends, axial load P at the step (x = a): compatibility
    gives R1 = -P k1/(k1+k2), R2 = -P k2/(k1+k2), k_i = E A_i / L_i (Gere & Timoshenko,
    Mechanics of Materials, statically indeterminate axial members; from memory)."""
    a, b, P = 120.0, 200.0, 9000.0
    d1, d2 = 30.0, 45.0
    steps = Steps.from_diameters([0.0, a, a + b], [d1, d2], E_MPa=E, poisson=NU)
    mesh, (n0, nP, n1) = build_mesh(steps, [0.0, a, a + b], max_element_mm=35.0)
    bar = Bar.axial(mesh, [BarSupport(n0), BarSupport(n1)])
    k1 = E * math.pi * d1**2 / 4 / a
    k2 = E * math.pi * d2**2 / 4 / b
    F = np.zeros(mesh.n_nodes)
    F[nP] = P
    u = bar.solve(F)
    R = bar.reactions(u, F)
    assert R[:, 0] == pytest.approx([-P * k1 / (k1 + k2), -P * k2 / (k1 + k2)], rel=1e-12)
    assert u[nP, 0] == pytest.approx(P / (k1 + k2), rel=1e-12)
    N = bar.internal_forces(u)
    left = mesh.x_mm[1:] <= a + 1e-9
    np.testing.assert_allclose(N[left, :, 0], P * k1 / (k1 + k2), rtol=1e-12)  # tension
    np.testing.assert_allclose(N[~left, :, 0], -P * k2 / (k1 + k2), rtol=1e-12)  # compression
    assert bar.residual(u, F)[0] < 1e-13


def test_single_reference_node_with_known_bearing_loads() -> None:
    """Only the locating bearing is rigid; the other bearing's axial force is a known
    load. Elongation of the free part = integral N/(EA) (Hooke's law)."""
    L, d = 400.0, 40.0
    A = math.pi * d**2 / 4
    steps = Steps.from_diameters([0.0, L], [d], E_MPa=E, poisson=NU)
    mesh, (nref, nload, nb) = build_mesh(steps, [100.0, 250.0, 350.0], max_element_mm=50.0)
    bar = Bar.axial(mesh, [(nref, INF)], label="shaft 'input', axial")
    F = np.zeros((mesh.n_nodes, 2))
    F[nload, 0], F[nb, 0] = 3000.0, -1000.0  # gear thrust and a known bearing force
    F[nb, 1] = 500.0
    u = bar.solve(F)
    R = bar.reactions(u, F)
    assert R[0] == pytest.approx([-2000.0, -500.0], rel=1e-12)
    # Case 0: segment ref -> load is pulled by the loads right of it, N = 3000 - 1000
    # = +2000 (tension); segment load -> bearing carries N = -1000 (compression).
    assert u[nload, 0] == pytest.approx(2000.0 * 150.0 / (E * A), rel=1e-12)
    assert u[nb, 0] == pytest.approx((2000.0 * 150.0 - 1000.0 * 100.0) / (E * A), rel=1e-12)
    N = bar.internal_forces(u)
    x_mid = 0.5 * (mesh.x_mm[1:] + mesh.x_mm[:-1])
    seg = (x_mid > 100.0) & (x_mid < 250.0)
    np.testing.assert_allclose(N[seg, :, 0], 2000.0, rtol=1e-12)
    assert u[0, 0] == pytest.approx(0.0, abs=1e-15)  # unloaded end rides along with ref


def test_uniform_axial_load() -> None:
    """Bar fixed at x = 0 with a uniform axial load p: N(x) = p (L - x),
    tip displacement p L^2/(2 E A) (Hooke's law integrated; consistent loads keep nodal
    values exact)."""
    L, d, p = 300.0, 20.0, 4.0
    A = math.pi * d**2 / 4
    steps = Steps.from_diameters([0.0, L], [d], E_MPa=E, poisson=NU)
    mesh, _ = build_mesh(steps, [], max_element_mm=60.0)
    bar = Bar.axial(mesh, [(0, INF)])
    pe = np.full(mesh.n_elements, p)
    u = bar.solve(np.zeros(mesh.n_nodes), pe)
    assert u[-1, 0] == pytest.approx(p * L**2 / (2 * E * A), rel=1e-12)
    N = bar.internal_forces(u, pe)
    np.testing.assert_allclose(N[:, 0, 0], p * (L - mesh.x_mm[:-1]), rtol=1e-12)
    np.testing.assert_allclose(N[:, 1, 0], p * (L - mesh.x_mm[1:]), rtol=1e-10, atol=1e-9)
    assert bar.reactions(u, np.zeros(mesh.n_nodes), pe)[0, 0] == pytest.approx(-p * L)


def test_torsion_cantilever_with_spring() -> None:
    """Twist of a shaft under an end torque: phi = T L/(G J), J = pi d^4/32
    (Shigley, torsion of round shafts; from memory), plus T/k of a torsional spring
    in series at the root."""
    L, d, T, k = 500.0, 30.0, 2.0e5, 4.0e8
    J = math.pi * d**4 / 32
    steps = Steps.from_diameters([0.0, L], [d], E_MPa=E, poisson=NU)
    mesh, _ = build_mesh(steps, [], max_element_mm=100.0)
    F = np.zeros(mesh.n_nodes)
    F[-1] = T
    rigid = Bar.torsion(mesh, [(0, INF)])
    u = rigid.solve(F)
    assert u[-1, 0] == pytest.approx(T * L / (G * J), rel=1e-12)
    np.testing.assert_allclose(rigid.internal_forces(u)[:, :, 0], T, rtol=1e-12)
    sprung = Bar.torsion(mesh, [BarSupport(0, k)])
    us = sprung.solve(F)
    assert us[-1, 0] == pytest.approx(T / k + T * L / (G * J), rel=1e-12)
    assert sprung.reactions(us, F)[0, 0] == pytest.approx(-T, rel=1e-12)


def test_unrestrained_bar_raises_naming_direction() -> None:
    steps = Steps.from_diameters([0.0, 100.0], [20.0], E_MPa=E, poisson=NU)
    mesh, _ = build_mesh(steps, [], max_element_mm=50.0)
    with pytest.raises(NumericalError, match="translate along the shaft axis"):
        Bar.axial(mesh, [], label="shaft 'out', axial")
    with pytest.raises(NumericalError, match="rotate about the shaft axis"):
        Bar.torsion(mesh, [(1, 0.0)])
    with pytest.raises(ModelError):
        Bar.axial(mesh, [(0, INF), (0, INF)])
    with pytest.raises(ValueError, match="unknown bar kind"):
        Bar(mesh.x_mm, mesh.EA_N, [(0, INF)], kind="shear")
