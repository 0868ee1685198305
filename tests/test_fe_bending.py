"""Planar bending solver against handbook formulas, sympy and PyNiteFEA.

Sign convention under test (see shaftsys/fe/solve.py): u up, phi = du/dx, loads and
reactions positive along +u, M_phi counter-clockwise; internal Q, M_phi act on the part
left of the cut (sagging M_phi > 0, Q = -(left reaction) next to a left support).
"""

from __future__ import annotations

import logging
import math

import numpy as np
import pytest

from shaftsys.errors import ModelError, NumericalError
from shaftsys.fe.mesh import Steps, build_mesh
from shaftsys.fe.sections import circular_section
from shaftsys.fe.solve import PlanarBending, Support

E = 210_000.0  # MPa
NU = 0.3
G = E / (2 * (1 + NU))
D = 40.0  # mm
SEC = circular_section(D, 0.0, NU)
EI = E * SEC.I_mm4
KGA = SEC.k_shear * G * SEC.A_mm2
INF = math.inf


def _uniform(length: float, stations: list[float], max_el: float, d: float = D):
    steps = Steps.from_diameters([0.0, length], [d], E_MPa=E, poisson=NU)
    return build_mesh(steps, stations, max_element_mm=max_el)


def _load(n_nodes: int, *pairs: tuple[int, float], moment: bool = False) -> np.ndarray:
    F = np.zeros(2 * n_nodes)
    for node, value in pairs:
        F[2 * node + (1 if moment else 0)] += value
    return F


# ------------------------------------------------------------------ Euler-Bernoulli


def test_simply_supported_point_load_roark_1e() -> None:
    """Roark's Formulas for Stress and Strain, 7th ed., table 8.1 case 1e (simply
    supported, concentrated intermediate load; formulas from memory):
    R_A = W b/l, R_B = W a/l, M_max = W a b/l, y_a = -W a^2 b^2/(3 E I l),
    theta_A = -W a b (l + b)/(6 E I l), theta_B = W a b (l + a)/(6 E I l),
    y(x) = -W b x (l^2 - b^2 - x^2)/(6 E I l) for x <= a.
    Cubic elements reproduce nodal values exactly, so a coarse mesh must hit 1e-9."""
    L, a, P = 800.0, 300.0, 2000.0
    b = L - a
    mesh, (n0, na, nL) = _uniform(L, [0.0, a, L], 200.0)
    pb = PlanarBending.from_mesh(mesh, [Support(n0), Support(nL)], shear=False)
    F = _load(mesh.n_nodes, (na, -P))
    u = pb.solve(F)
    R = pb.reactions(u, F)
    assert R[0, 0, 0] == pytest.approx(P * b / L, rel=1e-9)
    assert R[1, 0, 0] == pytest.approx(P * a / L, rel=1e-9)
    assert abs(R[0, 1, 0]) < 1e-9 * P * L  # pinned: no moment
    assert u[2 * na, 0] == pytest.approx(-P * a**2 * b**2 / (3 * EI * L), rel=1e-9)
    assert u[2 * n0 + 1, 0] == pytest.approx(-P * a * b * (L + b) / (6 * EI * L), rel=1e-9)
    assert u[2 * nL + 1, 0] == pytest.approx(P * a * b * (L + a) / (6 * EI * L), rel=1e-9)
    x = mesh.x_mm
    left = x <= a
    y_ref = -P * b * x[left] * (L**2 - b**2 - x[left] ** 2) / (6 * EI * L)
    np.testing.assert_allclose(pb.deflections(u)[left, 0], y_ref, rtol=1e-9, atol=1e-12)
    # Internal forces: sagging moment under the load is +P a b / L; shear jumps by -P.
    Qn, Mn = pb.internal_forces(u).at_nodes()
    assert Mn[na, 0, 0] == pytest.approx(P * a * b / L, rel=1e-9)
    assert Mn[na, 1, 0] == pytest.approx(P * a * b / L, rel=1e-9)
    assert Qn[na, 0, 0] == pytest.approx(-P * b / L, rel=1e-9)
    assert Qn[na, 1, 0] == pytest.approx(P * a / L, rel=1e-9)
    assert abs(Mn[n0, 1, 0]) < 1e-9 * P * L and abs(Mn[nL, 0, 0]) < 1e-9 * P * L


def test_overhung_load_shigley_a9_10() -> None:
    """Shigley's Mechanical Engineering Design, table A-9 beam 10 (simple supports,
    overhanging load; from memory): R1 = -F c/l, R2 = F (l + c)/l,
    tip deflection = F c^2 (l + c)/(3 E I) (downward for a downward F)."""
    L, c, P = 500.0, 150.0, 900.0
    mesh, (n1, n2, nt) = _uniform(L + c, [0.0, L, L + c], 120.0)
    pb = PlanarBending.from_mesh(mesh, [Support(n1), Support(n2)], shear=False)
    F = _load(mesh.n_nodes, (nt, -P))
    u = pb.solve(F)
    R = pb.reactions(u, F)
    assert R[0, 0, 0] == pytest.approx(-P * c / L, rel=1e-9)
    assert R[1, 0, 0] == pytest.approx(P * (L + c) / L, rel=1e-9)
    assert u[2 * nt, 0] == pytest.approx(-P * c**2 * (L + c) / (3 * EI), rel=1e-9)
    # Hogging moment over the second support: M_phi = -P c.
    _, Mn = pb.internal_forces(u).at_nodes()
    assert Mn[n2, 0, 0] == pytest.approx(-P * c, rel=1e-9)


def test_end_couple_is_conjugate_to_phi() -> None:
    """Simply supported beam with a couple M0 at end B (counter-clockwise, i.e. in the
    phi sense): theta_B = M0 L/(3EI), theta_A = -M0 L/(6EI), R_A = M0/L = -R_B
    (standard beam-table result, e.g. Roark 7th ed. table 8.1 case 3e with a = l;
    from memory)."""
    L, M0 = 700.0, 4.0e5
    mesh, (nA, nB) = _uniform(L, [0.0, L], 100.0)
    pb = PlanarBending.from_mesh(mesh, [(nA, INF), (nB, INF)], shear=False)
    F = _load(mesh.n_nodes, (nB, M0), moment=True)
    u = pb.solve(F)
    assert u[2 * nB + 1, 0] == pytest.approx(M0 * L / (3 * EI), rel=1e-9)
    assert u[2 * nA + 1, 0] == pytest.approx(-M0 * L / (6 * EI), rel=1e-9)
    R = pb.reactions(u, F)
    assert R[0, 0, 0] == pytest.approx(M0 / L, rel=1e-9)
    assert R[1, 0, 0] == pytest.approx(-M0 / L, rel=1e-9)
    _, Mn = pb.internal_forces(u).at_nodes()
    assert Mn[nB, 0, 0] == pytest.approx(M0, rel=1e-9)  # sagging near B


def test_uniform_load_internal_forces_euler_bernoulli() -> None:
    """Simply supported span under uniform q (downward): midspan deflection
    5 q L^4/(384 E I), M_max = q L^2/8, end shear q L/2 (Roark 7th ed. table 8.1 case 2e;
    from memory). Consistent loads keep the nodal values exact."""
    L, q = 900.0, 3.0
    mesh, (nA, nm, nB) = _uniform(L, [0.0, L / 2, L], 150.0)
    pb = PlanarBending.from_mesh(mesh, [Support(nA), Support(nB)], shear=False)
    qe = np.full(mesh.n_elements, -q)
    F = np.zeros(pb.n_dof)
    u = pb.solve(F, qe)
    assert u[2 * nm, 0] == pytest.approx(-5 * q * L**4 / (384 * EI), rel=1e-9)
    Qn, Mn = pb.internal_forces(u, qe).at_nodes()
    assert Mn[nm, 0, 0] == pytest.approx(q * L**2 / 8, rel=1e-9)
    assert Qn[nA, 1, 0] == pytest.approx(-q * L / 2, rel=1e-9)
    assert Qn[nB, 0, 0] == pytest.approx(q * L / 2, rel=1e-9)
    R = pb.reactions(u, F, qe)
    assert R[:, 0, 0] == pytest.approx([q * L / 2, q * L / 2], rel=1e-9)
    assert pb.residual(u, F, qe)[0] < 1e-12


# ------------------------------------------------------------------------ Timoshenko


def test_stubby_cantilever_shear_term_single_element() -> None:
    """Timoshenko cantilever with tip load: u = F L^3/(3EI) + F L/(k G A), section
    rotation F L^2/(2EI) (Timoshenko beam theory, e.g. Timoshenko & Gere, Mechanics of
    Materials; from memory), k from Cowper (1966). One interdependent element is exact."""
    L, P = 50.0, 10_000.0
    d = 50.0
    sec = circular_section(d, 0.0, NU)
    ei, kga = E * sec.I_mm4, sec.k_shear * G * sec.A_mm2
    mesh, _ = _uniform(L, [], INF, d=d)
    assert mesh.n_elements == 1
    pb = PlanarBending.from_mesh(mesh, [Support(0, INF, INF)], shear=True)
    F = _load(2, (1, P))
    u = pb.solve(F)
    expected = P * L**3 / (3 * ei) + P * L / (kga)
    assert u[2, 0] == pytest.approx(expected, rel=1e-9)
    assert u[2, 0] > 1.1 * P * L**3 / (3 * ei)  # the shear term really matters here
    assert u[3, 0] == pytest.approx(P * L**2 / (2 * ei), rel=1e-9)
    R = pb.reactions(u, F)
    assert R[0, :, 0] == pytest.approx([-P, -P * L], rel=1e-9)
    # Centre-line slope = section rotation + shear strain Q/(kGA), Q = +P along the span.
    s = pb.centerline_slopes(u)
    assert s[0, 0, 0] == pytest.approx(P / kga, rel=1e-9)
    assert s[0, 1, 0] == pytest.approx(P * L**2 / (2 * ei) + P / kga, rel=1e-9)


def test_timoshenko_uniform_load_simply_supported() -> None:
    """Simply supported Timoshenko beam under uniform q: midspan deflection
    5 q L^4/(384 E I) + q L^2/(8 k G A) (bending part from Roark table 8.1 case 2e; shear
    part = M_max/(kGA), Timoshenko beam theory; from memory)."""
    L, q = 120.0, 50.0  # stubby: L/d = 3
    mesh, (nA, nm, nB) = _uniform(L, [0.0, L / 2, L], 30.0)
    pb = PlanarBending.from_mesh(mesh, [Support(nA), Support(nB)], shear=True)
    qe = np.full(mesh.n_elements, -q)
    u = pb.solve(np.zeros(pb.n_dof), qe)
    expected = -(5 * q * L**4 / (384 * EI) + q * L**2 / (8 * KGA))
    assert u[2 * nm, 0] == pytest.approx(expected, rel=1e-9)


def test_point_load_timoshenko_adds_shear_deflection() -> None:
    """Simply supported Timoshenko beam, point load P at a: deflection under the load
    P a^2 b^2/(3 E I L) + P a b/(L k G A) (Roark case 1e + shear deflection
    integral of V/(kGA); from memory)."""
    L, a, P = 200.0, 80.0, 5000.0
    b = L - a
    mesh, (nA, na, nB) = _uniform(L, [0.0, a, L], 40.0)
    pb = PlanarBending.from_mesh(mesh, [Support(nA), Support(nB)], shear=True)
    u = pb.solve(_load(mesh.n_nodes, (na, -P)))
    expected = -(P * a**2 * b**2 / (3 * EI * L) + P * a * b / (L * KGA))
    assert u[2 * na, 0] == pytest.approx(expected, rel=1e-9)


# ---------------------------------------------------------------------- elastic supports


def test_beam_on_two_springs_hand_formula() -> None:
    """Simply supported span on springs k1, k2 with a point load: reactions are
    statically determinate (P b/L, P a/L); deflection under the load = bending part
    (Roark case 1e) + rigid-body part (R1/k1) b/L + (R2/k2) a/L (superposition)."""
    L, a, P = 600.0, 200.0, 1500.0
    b = L - a
    k1, k2 = 2.0e4, 5.0e4
    mesh, (nA, na, nB) = _uniform(L, [0.0, a, L], 100.0)
    pb = PlanarBending.from_mesh(mesh, [Support(nA, k1), Support(nB, k2)], shear=False)
    F = _load(mesh.n_nodes, (na, -P))
    u = pb.solve(F)
    R1, R2 = P * b / L, P * a / L
    expected = -(P * a**2 * b**2 / (3 * EI * L) + R1 / k1 * b / L + R2 / k2 * a / L)
    assert u[2 * na, 0] == pytest.approx(expected, rel=1e-9)
    R = pb.reactions(u, F)
    assert R[:, 0, 0] == pytest.approx([R1, R2], rel=1e-9)
    assert u[2 * nA, 0] == pytest.approx(-R1 / k1, rel=1e-9)
    assert pb.residual(u, F)[0] < 1e-12


def test_cantilever_on_rotational_spring() -> None:
    """Cantilever whose root is pinned with a rotational spring k_r: tip deflection
    F L^3/(3EI) + F L^2/k_r (superposition: root rotation F L / k_r)."""
    L, P, kr = 300.0, 800.0, 5.0e8
    mesh, _ = _uniform(L, [], 75.0)
    pb = PlanarBending.from_mesh(mesh, [Support(0, INF, kr)], shear=False)
    F = _load(mesh.n_nodes, (mesh.n_nodes - 1, P))
    u = pb.solve(F)
    assert u[-2, 0] == pytest.approx(P * L**3 / (3 * EI) + P * L**2 / kr, rel=1e-9)
    R = pb.reactions(u, F)
    assert R[0, :, 0] == pytest.approx([-P, -P * L], rel=1e-9)


# ------------------------------------------------------------ statically indeterminate


def test_three_supports_uniform_shaft_against_sympy() -> None:
    """Reactions and deflections of a continuous beam on three supports against
    sympy.physics.continuum_mechanics.beam.Beam (sympy 1.14, independent solution by
    singularity functions); Euler-Bernoulli."""
    from sympy.physics.continuum_mechanics.beam import Beam

    L, xm = 1000, 400
    loads = [(-1500, 250), (800, 700)]
    q = -2  # N/mm over the whole length
    b = Beam(L, E, SEC.I_mm4)
    r = [b.apply_support(0, "pin"), b.apply_support(xm, "roller"), b.apply_support(L, "roller")]
    for P, xp in loads:
        b.apply_load(P, xp, -1)
    b.apply_load(q, 0, 0, end=L)
    b.solve_for_reaction_loads(*r)
    R_ref = [float(b.reaction_loads[ri]) for ri in r]
    defl = b.deflection()
    x_sym = b.variable

    mesh, idx = _uniform(float(L), [0.0, xm, L, 250.0, 700.0], 60.0)
    pb = PlanarBending.from_mesh(
        mesh, [Support(int(idx[0])), Support(int(idx[1])), Support(int(idx[2]))], shear=False
    )
    F = _load(mesh.n_nodes, (int(idx[3]), -1500.0), (int(idx[4]), 800.0))
    qe = np.full(mesh.n_elements, float(q))
    u = pb.solve(F, qe)
    R = pb.reactions(u, F, qe)
    np.testing.assert_allclose(R[:, 0, 0], R_ref, rtol=1e-6)
    for node, xp in ((idx[3], 250), (idx[4], 700)):
        assert u[2 * node, 0] == pytest.approx(float(defl.subs(x_sym, xp)), rel=1e-6)


def _pynite_stepped_reactions(edges, diams, supports_x, loads):
    """Solve the same stepped shaft with PyNiteFEA 3.2 (Euler-Bernoulli 3D frame)."""
    from Pynite import FEModel3D

    xs = sorted(set(edges) | set(supports_x) | {x for x, _ in loads})
    m = FEModel3D()
    m.add_material("steel", E=E, G=G, nu=NU, rho=7.85e-9)
    for i, x in enumerate(xs):
        m.add_node(f"N{i}", x, 0.0, 0.0)
    for i in range(len(xs) - 1):
        mid = 0.5 * (xs[i] + xs[i + 1])
        k = int(np.searchsorted(edges, mid) - 1)
        d = diams[k]
        inertia, area = math.pi * d**4 / 64, math.pi * d**2 / 4
        m.add_section(f"S{i}", area, inertia, inertia, 2 * inertia)
        m.add_member(f"M{i}", f"N{i}", f"N{i + 1}", "steel", f"S{i}")
    for j, xsup in enumerate(supports_x):
        i = xs.index(xsup)
        m.def_support(f"N{i}", j == 0, True, True, j == 0, False, False)
    for x, P in loads:
        m.add_node_load(f"N{xs.index(x)}", "FY", P)
    m.analyze_linear(check_statics=False)
    R = [m.nodes[f"N{xs.index(xsup)}"].RxnFY["Combo 1"] for xsup in supports_x]
    defl = {x: m.nodes[f"N{xs.index(x)}"].DY["Combo 1"] for x, _ in loads}
    return np.array(R, dtype=float), defl


def test_three_supports_stepped_shaft_against_pynite() -> None:
    """Steps inside both spans change the indeterminate reactions; reference is PyNiteFEA
    3.2.0 (FEModel3D, Euler-Bernoulli members), reactions to 1e-6."""
    edges = [0.0, 60.0, 180.0, 390.0, 520.0, 760.0, 1000.0]
    diams = [35.0, 45.0, 60.0, 50.0, 70.0, 40.0]
    supports_x = [30.0, 430.0, 980.0]
    loads = [(0.0, -700.0), (250.0, -2500.0), (610.0, 1800.0), (850.0, -1200.0)]
    R_ref, defl_ref = _pynite_stepped_reactions(edges, diams, supports_x, loads)

    steps = Steps.from_diameters(edges, diams, E_MPa=E, poisson=NU)
    stations = supports_x + [x for x, _ in loads]
    mesh, idx = build_mesh(steps, stations, max_element_mm=45.0)
    pb = PlanarBending.from_mesh(mesh, [Support(int(i)) for i in idx[:3]], shear=False)
    F = _load(mesh.n_nodes, *[(int(i), P) for i, (_, P) in zip(idx[3:], loads, strict=True)])
    u = pb.solve(F)
    R = pb.reactions(u, F)[:, 0, 0]
    np.testing.assert_allclose(R, R_ref, rtol=1e-6, atol=1e-9 * 6200)
    for i, (x, _) in zip(idx[3:], loads, strict=True):
        assert u[2 * i, 0] == pytest.approx(defl_ref[x], rel=1e-6)
    # The steps matter: a uniform 50 mm shaft gives clearly different reactions.
    mesh_u, idx_u = _uniform(1000.0, stations, 45.0, d=50.0)
    pb_u = PlanarBending.from_mesh(mesh_u, [Support(int(i)) for i in idx_u[:3]], shear=False)
    Fu = _load(mesh_u.n_nodes, *[(int(i), P) for i, (_, P) in zip(idx_u[3:], loads, strict=True)])
    R_u = pb_u.reactions(pb_u.solve(Fu), Fu)[:, 0, 0]
    assert np.max(np.abs(R_u - R_ref)) > 10.0


# ------------------------------------------------------------------ many cases, residual


def test_many_right_hand_sides_and_residual() -> None:
    mesh, idx = _uniform(1000.0, [100.0, 550.0, 900.0], 20.0)
    sup = [Support(int(idx[0])), Support(int(idx[1]), 1e5, 1e7), Support(int(idx[2]))]
    pb = PlanarBending.from_mesh(mesh, sup, shear=True, label="shaft 'input', x-y plane")
    rng = np.random.default_rng(7)
    F = rng.normal(size=(pb.n_dof, 5)) * 1e3
    q = rng.normal(size=(mesh.n_elements, 5))
    u = pb.solve(F, q)
    for j in range(5):
        np.testing.assert_allclose(
            pb.solve(F[:, j], q[:, j])[:, 0], u[:, j], rtol=1e-12, atol=1e-15
        )
    assert np.all(pb.residual(u, F, q) < 1e-10)
    # Global statics (independent of the solver): reactions balance the applied loads.
    R = pb.reactions(u, F, q)
    total_applied = F[0::2].sum(axis=0) + (q * mesh.L_mm[:, None]).sum(axis=0)
    np.testing.assert_allclose(R[:, 0].sum(axis=0), -total_applied, rtol=1e-9)
    # A wrong displacement is detected by the residual.
    assert np.all(pb.residual(1.001 * u, F, q) > 1e-4)


# ----------------------------------------------------------------- singular / bad input


def test_single_support_without_moment_restraint_raises() -> None:
    mesh, (n0,) = _uniform(500.0, [200.0], 50.0)
    label = "shaft 'input', bending in the x-y plane"
    with pytest.raises(NumericalError, match="rotate") as exc:
        PlanarBending.from_mesh(mesh, [Support(n0)], label=label)
    assert label in str(exc.value)
    assert "x = 200 mm" in str(exc.value)


def test_missing_translational_restraint_raises() -> None:
    mesh, _ = _uniform(500.0, [], 50.0)
    with pytest.raises(NumericalError, match="translate and rotate"):
        PlanarBending.from_mesh(mesh, [])
    with pytest.raises(NumericalError, match="translate"):
        PlanarBending.from_mesh(mesh, [Support(0, 0.0, INF)])


def test_vanishing_spring_is_caught_numerically() -> None:
    mesh, _ = _uniform(500.0, [], 50.0)
    with pytest.raises(NumericalError, match=r"mechanism|singular"):
        PlanarBending.from_mesh(mesh, [Support(0, INF, 1e-30)])


def test_bad_supports_raise_model_error() -> None:
    mesh, _ = _uniform(500.0, [], 50.0)
    with pytest.raises(ModelError, match="reaction split"):
        PlanarBending.from_mesh(mesh, [Support(0), Support(0), Support(5)])
    with pytest.raises(ModelError):
        PlanarBending.from_mesh(mesh, [Support(0, -1.0), Support(5)])
    with pytest.raises(ModelError):
        PlanarBending.from_mesh(mesh, [Support(0), Support(99)])
    with pytest.raises(ModelError, match="rigidities"):
        PlanarBending([0.0, 10.0, 5.0], [1e9, 1e9], None, [Support(0), Support(2)])
    with pytest.raises(ModelError, match="rigidities"):
        PlanarBending([0.0, 10.0, 20.0], [1e9, 0.0], None, [Support(0), Support(2)])


def test_condition_estimate_and_warning(caplog: pytest.LogCaptureFixture) -> None:
    mesh, (n0, n1) = _uniform(800.0, [0.0, 800.0], 40.0)
    pb = PlanarBending.from_mesh(mesh, [Support(n0), Support(n1, 3e4)], shear=False, label="demo")
    # Exact 1-norm condition of the same scaled matrix (rigid rows replaced by identity).
    K = pb.stiffness_matrix(include_springs=True)
    K[pb.rigid, :] = 0.0
    K[:, pb.rigid] = 0.0
    K[pb.rigid, pb.rigid] = 1.0
    s = 1 / np.sqrt(np.diag(K))
    exact = np.linalg.cond(s[:, None] * K * s[None, :], 1)
    est = pb.condition_estimate
    assert exact / 3 <= est <= exact * (1 + 1e-9)
    with caplog.at_level(logging.WARNING, logger="shaftsys.fe.solve"):
        assert pb.warn_if_ill_conditioned(threshold=10.0)
        assert not pb.warn_if_ill_conditioned(threshold=1e30)
    assert "demo" in caplog.text and "ill-conditioned" in caplog.text
