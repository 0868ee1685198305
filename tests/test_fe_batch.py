"""Batched planar bending (design studies) against handbook formulas and the LAPACK path."""

from __future__ import annotations

import math

import numpy as np
import pytest

from shaftsys.errors import NumericalError
from shaftsys.fe.banded_batch import cholesky_banded_batch, solve_banded_batch, solve_planar_batch
from shaftsys.fe.sections import circular_section_arrays
from shaftsys.fe.solve import PlanarBending, Support, planar_stiffness_banded

E, NU = 210_000.0, 0.3
G = E / (2 * (1 + NU))


def test_roark_1e_for_many_diameters() -> None:
    """Simply supported span, point load: deflection under the load
    -P a^2 b^2/(3 E I L) and reactions P b/L, P a/L for every variant (Roark's Formulas
    for Stress and Strain, 7th ed., table 8.1 case 1e; from memory)."""
    L, a, P = 800.0, 300.0, 2000.0
    b = L - a
    x = np.array([0.0, 150.0, 300.0, 500.0, 650.0, 800.0])
    d = np.linspace(20.0, 80.0, 7)
    _, inertia, _, _ = circular_section_arrays(d, 0.0, NU)
    EI = np.repeat((E * inertia)[:, None], x.size - 1, axis=1)
    F = np.zeros(2 * x.size)
    F[4] = -P  # node 2 at x = a
    sol = solve_planar_batch(x, EI, None, [Support(0), Support(5)], F)
    np.testing.assert_allclose(sol.u[:, 4, 0], -P * a**2 * b**2 / (3 * E * inertia * L), rtol=1e-9)
    np.testing.assert_allclose(sol.reactions[:, 0, 0, 0], P * b / L, rtol=1e-9)
    np.testing.assert_allclose(sol.reactions[:, 1, 0, 0], P * a / L, rtol=1e-9)


def test_batch_matches_single_solver() -> None:
    """Random stepped Timoshenko shafts with springs, several load cases and distributed
    loads: same displacements and reactions as PlanarBending (LAPACK dpbtrf/dpbtrs)."""
    rng = np.random.default_rng(3)
    n = 40
    x = np.concatenate([[0.0], np.cumsum(rng.uniform(5.0, 40.0, n - 1))])
    B = 37
    d = rng.uniform(25.0, 70.0, (B, n - 1))
    area, inertia, _, k = circular_section_arrays(d, 0.0, NU)
    EI, kGA = E * inertia, k * G * area
    sup = [Support(2), Support(20, 4e4, 2e7), Support(n - 3, math.inf, 0.0)]
    F = rng.normal(size=(B, 2 * n, 3)) * 1e3
    q = rng.normal(size=(n - 1, 3))
    sol = solve_planar_batch(x, EI, kGA, sup, F, q)
    for i in range(B):
        pb = PlanarBending(x, EI[i], kGA[i], sup)
        u = pb.solve(F[i], q)
        np.testing.assert_allclose(sol.u[i], u, rtol=1e-9, atol=1e-9 * np.abs(u).max())
        R = pb.reactions(u, F[i], q)
        np.testing.assert_allclose(sol.reactions[i], R, rtol=1e-9, atol=1e-9 * np.abs(R).max())
        assert sol.min_pivot[i] == pytest.approx(pb.min_pivot, rel=1e-9)


def test_batched_cholesky_against_numpy() -> None:
    """Band Cholesky of random SPD band matrices against numpy.linalg.cholesky/solve."""
    rng = np.random.default_rng(5)
    x = np.concatenate([[0.0], np.cumsum(rng.uniform(1.0, 3.0, 6))])
    EI = rng.uniform(1.0, 2.0, (4, 6))
    ab = planar_stiffness_banded(np.diff(x), EI)  # (4, 4, 14), singular (free-free)
    ab[:, 3] += 10.0  # make it SPD
    n = ab.shape[-1]
    Lb = cholesky_banded_batch(np.moveaxis(ab, 0, -1))
    b = rng.normal(size=(n, 2, 4))
    xsol = solve_banded_batch(Lb, b)
    for i in range(4):
        K = np.zeros((n, n))
        for dd in range(4):
            idx = np.arange(n - dd)
            K[idx, idx + dd] = ab[i, 3 - dd, dd:]
            K[idx + dd, idx] = ab[i, 3 - dd, dd:]
        Lref = np.linalg.cholesky(K)
        for dd in range(4):
            np.testing.assert_allclose(Lb[dd, : n - dd, i], np.diag(Lref, -dd), rtol=1e-12)
        np.testing.assert_allclose(xsol[:, :, i], np.linalg.solve(K, b[:, :, i]), rtol=1e-10)


def test_batch_flags_bad_variants_and_mechanisms() -> None:
    x = np.linspace(0.0, 500.0, 11)
    EI = np.full((5, 10), 1e10)
    EI[3, 4] = 0.0  # a hinge in variant 3: the span becomes a mechanism
    F = np.zeros(22)
    with pytest.raises(NumericalError, match=r"e\.g\. \[3\]"):
        solve_planar_batch(x, EI, None, [Support(0), Support(10)], F)
    with pytest.raises(NumericalError, match="rotate"):
        solve_planar_batch(x, np.full((2, 10), 1e10), None, [Support(0)], F)
