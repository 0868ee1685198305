"""Natural frequencies against closed-form results and PyNiteFEA's modal analysis."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.optimize import brentq

from shaftsys.errors import NumericalError
from shaftsys.fe.mesh import Steps, build_mesh
from shaftsys.fe.modal import bending_modes, torsion_modes
from shaftsys.fe.sections import circular_section
from shaftsys.fe.solve import Support

E, NU = 210_000.0, 0.3
G = E / (2 * (1 + NU))
RHO = 7850.0  # kg/m^3
RHO_T = RHO * 1e-12  # t/mm^3
INF = math.inf


def _mesh(length: float, d: float, n: int, rho: float = RHO, stations=()):
    steps = Steps.from_diameters([0.0, length], [d], E_MPa=E, poisson=NU, rho_kg_m3=rho)
    return build_mesh(steps, list(stations), max_element_mm=length / n)


def test_simply_supported_first_bending_frequency_and_h4_convergence() -> None:
    """Pinned-pinned Euler-Bernoulli beam: omega_1 = (pi/L)^2 sqrt(E I/(rho A))
    (Blevins, Formulas for Natural Frequency and Mode Shape, table 8-1; from memory).
    Cubic Hermite elements with consistent mass converge like h^4."""
    L, d = 1000.0, 40.0
    sec = circular_section(d, 0.0, NU)
    w_ref = (math.pi / L) ** 2 * math.sqrt(E * sec.I_mm4 / (RHO_T * sec.A_mm2))
    errors = []
    for n in (2, 4, 8, 16):
        mesh, _ = _mesh(L, d, n)
        modes = bending_modes(mesh, [Support(0), Support(n)], n_modes=2)
        errors.append(modes.omega_rad_s[0] / w_ref - 1.0)
    assert 0.0 < errors[-1] < 1e-4  # consistent mass: upper bound, 16 elements
    rates = [math.log2(errors[i] / errors[i + 1]) for i in range(3)]
    assert all(3.7 < r < 4.3 for r in rates), rates
    assert modes.f_Hz[0] == pytest.approx(w_ref / (2 * math.pi), rel=1e-4)
    assert modes.rpm[0] == pytest.approx(60 * w_ref / (2 * math.pi), rel=1e-4)
    # Second mode: (2 pi / L)^2 sqrt(EI/(rho A)) (same source).
    assert modes.omega_rad_s[1] == pytest.approx(4 * w_ref, rel=1e-3)


def test_timoshenko_simply_supported_frequency() -> None:
    """Stubby pinned-pinned Timoshenko beam with rotary inertia: mode n has
    v = V sin(a x), psi = P cos(a x), a = n pi/L, and omega^2 solves
    (rho A w^2 - kGA a^2)(rho I w^2 - EI a^2 - kGA) - (kGA a)^2 = 0 (substitution into
    the Timoshenko equations; cf. Han, Benaroya & Wei, J. Sound Vib. 225 (1999) 935;
    from memory). The element's constant shear strain gives h^2 convergence."""
    L, d = 200.0, 40.0
    sec = circular_section(d, 0.0, NU)
    A, inertia = sec.A_mm2, sec.I_mm4
    kga = sec.k_shear * G * A
    a = math.pi / L
    c2 = RHO_T * A * RHO_T * inertia
    c1 = -(RHO_T * A * (E * inertia * a**2 + kga) + kga * a**2 * RHO_T * inertia)
    c0 = kga * a**2 * (E * inertia * a**2 + kga) - (kga * a) ** 2
    w_ref = math.sqrt((-c1 - math.sqrt(c1 * c1 - 4 * c2 * c0)) / (2 * c2))
    errors = []
    for n in (20, 40, 160):
        mesh, _ = _mesh(L, d, n)
        modes = bending_modes(
            mesh, [Support(0), Support(n)], shear=True, rotary_inertia=True, n_modes=1
        )
        errors.append(modes.omega_rad_s[0] / w_ref - 1.0)
    assert abs(errors[-1]) < 1e-5
    assert 1.8 < math.log2(errors[0] / errors[1]) < 2.2
    # Euler-Bernoulli overestimates this stubby shaft by several percent.
    eb = bending_modes(mesh, [Support(0), Support(160)], n_modes=1).omega_rad_s[0]
    assert eb / w_ref - 1.0 > 0.03


def test_torsion_disc_on_massless_shaft() -> None:
    """Disc J_d on a massless shaft fixed at the other end: omega = sqrt(k/J_d),
    k = G J_p / L (Thomson, Theory of Vibration with Applications, single-DOF torsional
    system; from memory). Units: J_d in kg m^2, converted to t mm^2 inside."""
    L, d, Jd = 400.0, 25.0, 0.35  # mm, mm, kg m^2
    mesh, _ = _mesh(L, d, 1, rho=0.0)
    inertia = np.zeros(mesh.n_nodes)
    inertia[-1] = Jd
    modes = torsion_modes(mesh, [(0, INF)], polar_inertia_kgm2=inertia)
    k = G * (math.pi * d**4 / 32) / L  # N mm / rad
    k_SI = k * 1e-3  # N m / rad
    assert modes.omega_rad_s[0] == pytest.approx(math.sqrt(k_SI / Jd), rel=1e-12)


def test_torsion_disc_on_massive_shaft_exact() -> None:
    """Uniform shaft fixed at x = 0 with a disc J_d at x = L, shaft inertia included:
    beta tan(beta) = rho J_p L / J_d, omega = (beta / L) sqrt(G / rho) (Thomson, torsional
    vibration of rods, end-mass boundary condition; from memory)."""
    L, d, Jd = 600.0, 30.0, 2.0e-3  # kg m^2
    Jp = math.pi * d**4 / 32
    J_shaft = RHO_T * Jp * L  # t mm^2
    ratio = J_shaft / (Jd * 1e3)
    beta = brentq(lambda b: b * math.tan(b) - ratio, 1e-9, math.pi / 2 - 1e-12)
    w_ref = beta / L * math.sqrt(G / RHO_T)
    n = 400
    mesh, _ = _mesh(L, d, n)
    inertia = np.zeros(mesh.n_nodes)
    inertia[-1] = Jd
    modes = torsion_modes(mesh, [(0, INF)], polar_inertia_kgm2=inertia, n_modes=2)
    assert modes.omega_rad_s[0] == pytest.approx(w_ref, rel=2e-6)
    # Rayleigh's estimate sqrt(k/(J_d + J_shaft/3)) is close but not equal (Thomson).
    k = G * Jp / L
    assert modes.omega_rad_s[0] == pytest.approx(math.sqrt(k / (Jd * 1e3 + J_shaft / 3)), rel=5e-3)


def test_two_discs_free_free() -> None:
    """Two discs on a massless shaft, no supports: a rigid mode at 0 and
    omega = sqrt(k (J1 + J2)/(J1 J2)) (Thomson, two-disc torsional system; from memory)."""
    L, d, J1, J2 = 300.0, 20.0, 0.05, 0.12
    mesh, _ = _mesh(L, d, 1, rho=0.0)
    modes = torsion_modes(mesh, polar_inertia_kgm2=[J1, J2])
    k = G * math.pi * d**4 / 32 / L * 1e-3  # N m / rad
    assert modes.omega_rad_s[0] == pytest.approx(0.0, abs=1e-6)
    assert modes.omega_rad_s[1] == pytest.approx(math.sqrt(k * (J1 + J2) / (J1 * J2)), rel=1e-12)


def test_torsion_against_pynite_modal() -> None:
    """Fixed-free uniform bar, distributed inertia only, against PyNiteFEA 3.2.0
    FEModel3D.analyze_modal (consistent mass from self weight, same mesh). PyNite's nodal
    masses act on translations only, so a disc's polar inertia cannot be given to it; the
    disc cases are checked against closed forms above."""
    from Pynite import FEModel3D

    L, d, n = 600.0, 30.0, 12
    inertia, area = math.pi * d**4 / 64, math.pi * d**2 / 4
    m = FEModel3D()
    m.add_material("s", E=E, G=G, nu=NU, rho=RHO_T)
    m.add_section("S", area, inertia, inertia, 2 * inertia)
    xs = np.linspace(0.0, L, n + 1)
    for i, x in enumerate(xs):
        m.add_node(f"N{i}", float(x), 0.0, 0.0)
    for i in range(n):
        m.add_member(f"M{i}", f"N{i}", f"N{i + 1}", "s", "S")
    m.def_support("N0", True, True, True, True, True, True)
    for i in range(1, n + 1):
        m.def_support(f"N{i}", True, True, True, False, True, True)
    m.add_member_self_weight("FY", 1.0)
    m.analyze_modal(num_modes=3, mass_direction="Y", gravity=1.0)
    mesh, _ = _mesh(L, d, n)
    ours = torsion_modes(mesh, [(0, INF)], n_modes=3).f_Hz
    np.testing.assert_allclose(ours, np.asarray(m.frequencies, dtype=float), rtol=1e-6)
    # Exact first mode (pi/2L) sqrt(G/rho) is approached from above (Thomson; from memory).
    assert ours[0] == pytest.approx(math.sqrt(G / RHO_T) / (4 * L), rel=1e-3)


def test_stepped_shaft_with_point_mass_against_pynite_modal() -> None:
    """Stepped shaft on two pin supports with a lumped mass, Euler-Bernoulli, no rotary
    inertia, against PyNiteFEA 3.2.0 analyze_modal (nodal load / g converted to mass)."""
    from Pynite import FEModel3D

    edges, diams = [0.0, 150.0, 450.0, 700.0], [40.0, 60.0, 45.0]
    steps = Steps.from_diameters(edges, diams, E_MPa=E, poisson=NU, rho_kg_m3=RHO)
    mesh, idx = build_mesh(steps, [20.0, 300.0, 680.0], max_element_mm=30.0)
    mass_kg = 12.0
    m = FEModel3D()
    m.add_material("s", E=E, G=G, nu=NU, rho=RHO_T)
    for i, x in enumerate(mesh.x_mm):
        m.add_node(f"N{i}", float(x), 0.0, 0.0)
    for e in range(mesh.n_elements):
        inertia = float(mesh.I_mm4[e])
        m.add_section(f"S{e}", float(mesh.A_mm2[e]), inertia, inertia, 2 * inertia)
        m.add_member(f"M{e}", f"N{e}", f"N{e + 1}", "s", f"S{e}")
    for i in range(mesh.n_nodes):
        m.def_support(f"N{i}", True, i in (idx[0], idx[2]), True, True, True, False)
    m.add_member_self_weight("FY", 1.0)
    m.add_node_load(f"N{idx[1]}", "FY", -mass_kg * 1e-3)  # tonnes with g = 1
    m.analyze_modal(num_modes=3, mass_direction="Y", gravity=1.0)
    pm = np.zeros(mesh.n_nodes)
    pm[idx[1]] = mass_kg
    ours = bending_modes(
        mesh, [Support(int(idx[0])), Support(int(idx[2]))], point_mass_kg=pm, n_modes=3
    ).f_Hz
    np.testing.assert_allclose(ours, np.asarray(m.frequencies, dtype=float), rtol=1e-6)


def test_diametral_inertia_lowers_frequency_of_overhung_disc() -> None:
    """Cantilever with a massive tip disc (massless shaft, 1 element): 2-DOF system
    K = EI/L^3 [[12, -6L], [-6L, 4L^2]], M = diag(m, J_d). Reference: eigenvalues of the
    2x2 problem in closed form, lambda = ((a + d) -/+ sqrt((a - d)^2 + 4 b c)) / 2 with
    a = K11/m, d = K22/J, b = K12/m, c = K21/J (linear algebra; beam stiffness from
    Przemieniecki 1968, from memory)."""
    L, d, m_kg, J_kgm2 = 250.0, 35.0, 20.0, 0.08
    mesh, _ = _mesh(L, d, 1, rho=0.0)
    ei = E * math.pi * d**4 / 64
    m_t, J_t = m_kg * 1e-3, J_kgm2 * 1e3
    k11, k12, k22 = 12 * ei / L**3, -6 * ei / L**2, 4 * ei / L
    a, b, c, dd = k11 / m_t, k12 / m_t, k12 / J_t, k22 / J_t
    lam1 = ((a + dd) - math.sqrt((a - dd) ** 2 + 4 * b * c)) / 2
    modes = bending_modes(
        mesh, [Support(0, INF, INF)], point_mass_kg=[0.0, m_kg], point_inertia_kgm2=[0.0, J_kgm2]
    )
    assert modes.omega_rad_s[0] == pytest.approx(math.sqrt(lam1), rel=1e-10)
    assert modes.omega_rad_s[0] < math.sqrt(3 * ei / L**3 / m_t)  # below the point-mass value


def test_massless_dofs_raise() -> None:
    mesh, _ = _mesh(500.0, 30.0, 4, rho=0.0)
    with pytest.raises(NumericalError, match="mass matrix"):
        bending_modes(mesh, [Support(0), Support(4)])


def test_rayleigh_and_dunkerley_bracket_the_first_mode_with_their_closed_forms() -> None:
    """Uniform pinned-pinned beam, omega_k = (k pi/L)^2 sqrt(EI/(rho A)) (Blevins, as
    above). Dunkerley's sum over all modes, sum 1/omega_k^2 = (L^4 rho A/(EI pi^4))
    zeta(4) with zeta(4) = pi^4/90 (exact), gives omega_D = sqrt(90) sqrt(EI/(rho A))/L^2
    = 0.9612 omega_1. Rayleigh's quotient with the uniform-load deflection curve
    y ~ s - 2 s^3 + s^4 (s = x/L; Roark, simply supported beam under uniform load) is
    int(y''^2)/int(y^2) = 3024/31 (hand integration of the polynomials; recomputed
    below by quadrature as a second route), omega_R = 1.00073 omega_1. Both from the FE
    matrices of ``bending_matrices``; Rayleigh >= omega_1 >= Dunkerley.
    """
    from shaftsys.fe.modal import bending_matrices, classical_estimates

    L, d = 1000.0, 40.0
    sec = circular_section(d, 0.0, NU)
    c = math.sqrt(E * sec.I_mm4 / (RHO_T * sec.A_mm2)) / L**2
    # second route for Rayleigh: y(s) = s - 2 s^3 + s^4 (static curve, s = x/L, scaled)
    s = np.linspace(0.0, 1.0, 200_001)
    y = s - 2 * s**3 + s**4
    ypp = -12 * s + 12 * s**2
    ratio_R = math.sqrt(np.trapezoid(ypp**2, s) / np.trapezoid(y**2, s))
    assert ratio_R == pytest.approx(math.sqrt(3024.0 / 31.0), rel=1e-8)
    mesh, _ = _mesh(L, d, 40)
    K, M, rigid = bending_matrices(mesh, [Support(0), Support(40)])
    w1 = bending_modes(mesh, [Support(0), Support(40)], n_modes=1).omega_rad_s[0]
    rayleigh, dunkerley = classical_estimates(K, M, rigid)
    assert w1 == pytest.approx(math.pi**2 * c, rel=1e-5)
    # the FE trial shape is cubic between nodes: 1e-4 still tells Rayleigh from pi^2 (7e-4)
    assert rayleigh == pytest.approx(ratio_R * c, rel=1e-4)
    assert dunkerley == pytest.approx(math.sqrt(90.0) * c, rel=2e-3)  # FE truncates the sum
    assert rayleigh > w1 > dunkerley
