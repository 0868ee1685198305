"""Natural frequencies of a straight shaft: planar bending and torsion.

Units
-----
Stiffness is in the solver's units (N, mm), so for eigenvalues in (rad/s)^2 the masses
must be in tonnes: 1 N = 1 t * mm/s^2, hence K [N/mm] / M [t] = 1/s^2. Conversions done
here:

=====================  ===================  =======================================
input                  internal             factor
=====================  ===================  =======================================
density   [kg/m^3]     [t/mm^3]             1 kg/m^3 = 1e-12 t/mm^3
mass      [kg]         [t]                  1 kg = 1e-3 t
inertia   [kg*m^2]     [t*mm^2]             1 kg*m^2 = 1e-3 t * 1e6 mm^2 = 1e3 t*mm^2
=====================  ===================  =======================================

Element mass matrices are the consistent ones of the interdependent-interpolation
Timoshenko element (J. S. Przemieniecki, Theory of Matrix Structural Analysis, 1968,
ch. 11; Z. Friedman and J. B. Kosmatka, Computers & Structures 47 (1993) 473-481),
integrated here by 4-point Gauss quadrature of its shape functions (exact: the integrands
are polynomials of degree 6 at most). With Phi = 0 the translational part is the
classical rho A L / 420 [156, 22L, 54, -13L; ...] matrix and the rotary part
rho I / (30 L) [36, 3L, -36, 3L; ...]. Rotary inertia is off by default.

Convergence: Euler-Bernoulli frequencies converge like h^4 (h = element length). With
``shear=True`` they converge only like h^2: the element's shear strain is constant per
element (exact for nodal loads, hence exact statics), while the inertia load makes the
shear force vary along it. About 20 elements per half-wave keep the error near 1e-4 for
a stubby shaft (L/d = 5).

Gyroscopic coupling and the speed dependence of bearing stiffness are not modelled:
"rpm" is simply 60 f, the critical speed of the non-rotating shaft.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from shaftsys.errors import NumericalError
from shaftsys.fe.beam import bar_stiffness, beam_stiffness, shear_parameter
from shaftsys.fe.mesh import BeamMesh
from shaftsys.fe.solve import BarSupport, Support, bar_support_dofs, planar_support_dofs

__all__ = [
    "KG_M2_TO_T_MM2",
    "KG_M3_TO_T_MM3",
    "KG_TO_T",
    "Modes",
    "bar_mass",
    "beam_mass",
    "bending_matrices",
    "bending_modes",
    "classical_estimates",
    "solve_modes",
    "torsion_modes",
]

KG_TO_T = 1e-3
KG_M2_TO_T_MM2 = 1e3
KG_M3_TO_T_MM3 = 1e-12

Array = NDArray[np.float64]

_GAUSS_X, _GAUSS_W = np.polynomial.legendre.leggauss(4)
_XI = 0.5 * (_GAUSS_X + 1.0)  # points on [0, 1]
_W = 0.5 * _GAUSS_W  # weights on [0, 1]


def _shape_functions(L: Array, Phi: Array) -> tuple[Array, Array]:
    """Interdependent Timoshenko shape functions at the Gauss points.

    Returns N_u (..., g, 4) [-, mm] and N_phi (..., g, 4) [1/mm, -] for the DOFs
    (u1, phi1, u2, phi2); xi = x / L (Friedman & Kosmatka 1993).
    """
    xi = _XI
    L_ = L[..., None]
    P = Phi[..., None]
    c = 1.0 / (1.0 + P)
    xi2 = xi * xi
    xi3 = xi2 * xi
    Nu = np.stack(
        [
            c * (2 * xi3 - 3 * xi2 - P * xi + 1 + P),
            c * L_ * (xi3 - (2 + P / 2) * xi2 + (1 + P / 2) * xi),
            c * (-2 * xi3 + 3 * xi2 + P * xi),
            c * L_ * (xi3 - (1 - P / 2) * xi2 - (P / 2) * xi),
        ],
        axis=-1,
    )
    Np = np.stack(
        [
            6 * c / L_ * (xi2 - xi),
            c * (3 * xi2 - (4 + P) * xi + 1 + P),
            -6 * c / L_ * (xi2 - xi),
            c * (3 * xi2 - (2 - P) * xi),
        ],
        axis=-1,
    )
    return Nu, Np


def beam_mass(
    rhoA_t_mm: ArrayLike,
    L_mm: ArrayLike,
    phi_shear: ArrayLike = 0.0,
    rhoI_t_mm: ArrayLike = 0.0,
) -> Array:
    """Consistent mass of the planar Timoshenko / Euler-Bernoulli beam element.

    Parameters
    ----------
    rhoA_t_mm:
        Mass per length rho*A [t/mm].
    L_mm:
        Element length [mm].
    phi_shear:
        Shear parameter Phi [-] of the stiffness (0 = Euler-Bernoulli).
    rhoI_t_mm:
        Rotary inertia per length rho*I [t*mm^2/mm] (0 = no rotary inertia).

    Returns
    -------
    numpy.ndarray
        Shape (..., 4, 4) in DOFs (u1, phi1, u2, phi2); entries in t, t*mm, t*mm^2.
    """
    rA, L, Phi, rI = np.broadcast_arrays(
        *(np.asarray(a, dtype=float) for a in (rhoA_t_mm, L_mm, phi_shear, rhoI_t_mm))
    )
    Nu, Np = _shape_functions(L, Phi)
    w = _W[:, None, None]
    mu = np.sum(w * Nu[..., :, None] * Nu[..., None, :], axis=-3)
    mp = np.sum(w * Np[..., :, None] * Np[..., None, :], axis=-3)
    return (rA * L)[..., None, None] * mu + (rI * L)[..., None, None] * mp


def bar_mass(inertia_per_length: ArrayLike, L_mm: ArrayLike) -> Array:
    """Consistent mass of the two-node bar: m L / 6 [[2, 1], [1, 2]].

    Parameters
    ----------
    inertia_per_length:
        rho*A [t/mm] (axial) or rho*J [t*mm^2/mm] (torsion).
    L_mm:
        Element length [mm].

    Returns
    -------
    numpy.ndarray
        Shape (..., 2, 2) in t or t*mm^2.
    """
    c = np.asarray(inertia_per_length, dtype=float) * np.asarray(L_mm, dtype=float) / 6.0
    m = np.empty((*c.shape, 2, 2))
    m[..., 0, 0] = 2 * c
    m[..., 1, 1] = 2 * c
    m[..., 0, 1] = c
    m[..., 1, 0] = c
    return m


@dataclass(frozen=True, eq=False)
class Modes:
    """Natural frequencies and mass-normalised mode shapes.

    Attributes
    ----------
    omega_rad_s:
        Circular frequencies [rad/s], ascending, shape (k,).
    shapes:
        Mode shapes, shape (n_dof, k), zero at rigid DOFs, normalised to
        shapes.T @ M @ shapes = I with M in tonnes (t, t*mm^2). Bending: u [mm] at even,
        phi [rad] at odd rows; torsion: twist [rad] per node.
    """

    omega_rad_s: Array
    shapes: Array

    @property
    def f_Hz(self) -> Array:
        """Natural frequencies [Hz]."""
        return self.omega_rad_s / (2.0 * math.pi)

    @property
    def rpm(self) -> Array:
        """Natural frequencies expressed as shaft speeds [rpm] (= 60 f; no gyroscopics)."""
        return 60.0 * self.f_Hz


def _dense(ke: Array, dofs_per_node: int, n_dof: int) -> Array:
    """Dense assembly of element matrices (n_e, p, p) of a two-node chain."""
    n_e, p, _ = ke.shape
    idx = dofs_per_node * np.arange(n_e)[:, None] + np.arange(p)
    K = np.zeros((n_dof, n_dof))
    np.add.at(K, (idx[:, :, None], idx[:, None, :]), ke)
    return K


def _nodal(values: ArrayLike | None, n: int, what: str) -> Array:
    if values is None:
        return np.zeros(n)
    v = np.asarray(values, dtype=float)
    if v.shape != (n,) or np.any(~np.isfinite(v)) or np.any(v < 0.0):
        raise ValueError(f"{what} must be {n} finite values >= 0, got shape {v.shape}")
    return v


def solve_modes(
    K: Array, M: Array, rigid: NDArray[np.bool_], n_modes: int | None, label: str
) -> Modes:
    """The lowest ``n_modes`` (all: ``None``) modes of the dense system (K, M) with the
    ``rigid`` DOFs held (e.g. from :func:`bending_matrices`); NumericalError for a
    mass matrix that is not positive definite or a negative eigenvalue.
    """
    free = np.flatnonzero(~rigid)
    nf = free.size
    if nf == 0:
        raise NumericalError(f"{label}: every DOF is held rigidly; there is no mode")
    k = nf if n_modes is None else int(n_modes)
    if not 1 <= k <= nf:
        raise ValueError(f"n_modes = {n_modes!r}; expected 1 .. {nf}")
    Kr = K[np.ix_(free, free)]
    Mr = M[np.ix_(free, free)]
    import scipy.linalg  # deferred to the first modal solve (start-up)

    try:
        lam, vec = scipy.linalg.eigh(Kr, Mr, subset_by_index=[0, k - 1])
    except np.linalg.LinAlgError as exc:
        raise NumericalError(
            f"{label}: mass matrix is not positive definite (some DOFs carry no mass or "
            f"inertia: zero density without point masses?): {exc}"
        ) from exc
    scale = max(float(np.max(np.abs(np.diag(Kr)) / np.diag(Mr))), 1.0)
    if np.any(lam < -1e-9 * scale):
        raise NumericalError(f"{label}: negative eigenvalue {lam.min():.3g} (rad/s)^2")
    shapes = np.zeros((K.shape[0], k))
    shapes[free] = vec
    return Modes(omega_rad_s=np.sqrt(np.clip(lam, 0.0, None)), shapes=shapes)


def bending_modes(
    mesh: BeamMesh,
    supports: Sequence[Support | tuple[float, ...]] = (),
    *,
    point_mass_kg: ArrayLike | None = None,
    point_inertia_kgm2: ArrayLike | None = None,
    shear: bool = False,
    rotary_inertia: bool = False,
    n_modes: int | None = None,
    label: str = "bending modes",
) -> Modes:
    """Planar bending natural frequencies of a shaft on (elastic) supports.

    Parameters
    ----------
    mesh:
        The mesh (E [MPa], I [mm^4], A [mm^2], G [MPa], k [-], rho [kg/m^3] per element).
    supports:
        As for :class:`~shaftsys.fe.solve.PlanarBending` (rigid DOFs eliminated, springs
        [N/mm], [N*mm/rad] added). No supports = free-free (zero-frequency rigid modes).
    point_mass_kg:
        Lumped masses per node [kg], shape (n_nodes,), on the deflection DOFs.
    point_inertia_kgm2:
        Lumped diametral (transverse) inertias per node [kg*m^2] on the rotation DOFs.
    shear:
        Timoshenko stiffness and shape functions (True) or Euler-Bernoulli (False).
    rotary_inertia:
        Include the distributed rotary inertia rho*I of the shaft.
    n_modes:
        Number of lowest modes returned (default: all).
    label:
        Names the system in error messages.

    Returns
    -------
    Modes
        Frequencies [rad/s, Hz, rpm] and mode shapes.

    Raises
    ------
    NumericalError
        Mass matrix not positive definite (massless DOFs) or a negative eigenvalue.
    """
    K, M, rigid = bending_matrices(mesh, supports, point_mass_kg=point_mass_kg,
                                   point_inertia_kgm2=point_inertia_kgm2, shear=shear,
                                   rotary_inertia=rotary_inertia, label=label)
    return solve_modes(K, M, rigid, n_modes, label)


def bending_matrices(
    mesh: BeamMesh,
    supports: Sequence[Support | tuple[float, ...]] = (),
    *,
    point_mass_kg: ArrayLike | None = None,
    point_inertia_kgm2: ArrayLike | None = None,
    shear: bool = False,
    rotary_inertia: bool = False,
    label: str = "bending modes",
) -> tuple[Array, Array, NDArray[np.bool_]]:
    """Dense stiffness K [N/mm, N*mm/rad] and mass M [t, t*mm^2] of the planar bending
    model of :func:`bending_modes` (same arguments), and the rigid-DOF mask.
    """
    n = mesh.n_nodes
    _, rigid, springs = planar_support_dofs(supports, n, label)
    L = mesh.L_mm
    Phi = shear_parameter(mesh.EI_Nmm2, mesh.kGA_N, L) if shear else np.zeros(L.size)
    rho = mesh.rho_kg_m3 * KG_M3_TO_T_MM3
    ke = beam_stiffness(mesh.EI_Nmm2, L, Phi)
    me = beam_mass(rho * mesh.A_mm2, L, Phi, rho * mesh.I_mm4 if rotary_inertia else 0.0)
    K = _dense(ke, 2, 2 * n)
    K[np.arange(2 * n), np.arange(2 * n)] += springs
    M = _dense(me, 2, 2 * n)
    M[0::2, 0::2] += np.diag(_nodal(point_mass_kg, n, "point_mass_kg") * KG_TO_T)
    M[1::2, 1::2] += np.diag(_nodal(point_inertia_kgm2, n, "point_inertia_kgm2") * KG_M2_TO_T_MM2)
    return K, M, rigid


def classical_estimates(K: Array, M: Array, rigid: NDArray[np.bool_]) -> tuple[float, float]:
    """Rayleigh's and Dunkerley's estimates of the first bending frequency [rad/s] of the
    system (K, M) with the rigid DOFs held.

    Rayleigh (Shigley, critical speeds of shafts, from memory): the static deflection
    y = K^-1 M a under a uniform lateral acceleration a (gravity's shape) as the trial
    shape, omega_R^2 = y^T K y / y^T M y = a^T M y / y^T M y: an upper bound of omega_1.
    Dunkerley (same source): 1/omega_D^2 = trace(K^-1 M) = sum over all modes of
    1/omega_k^2 (the sum over the lumped masses m_i a_ii in the classical form): a lower
    bound of omega_1. ``nan`` when the system is not held (a free-free shaft).
    """
    free = np.flatnonzero(~rigid)
    Kr = K[np.ix_(free, free)]
    Mr = M[np.ix_(free, free)]
    try:
        c = np.linalg.cholesky(Kr)
    except np.linalg.LinAlgError:
        return math.nan, math.nan
    import scipy.linalg  # deferred to the first modal solve (start-up)

    a = np.zeros(free.size)
    a[free % 2 == 0] = 1.0          # lateral DOFs: u at even rows of the full vector
    f = Mr @ a
    y = scipy.linalg.cho_solve((c, True), f)
    yMy = float(y @ Mr @ y)
    # no free lateral DOF (a mesh held at every node): no static shape, no estimate
    rayleigh = math.sqrt(float(a @ Mr @ y) / yMy) if yMy > 0.0 else math.nan
    flex_m = scipy.linalg.cho_solve((c, True), Mr)
    dunkerley = 1.0 / math.sqrt(float(np.trace(flex_m)))
    return rayleigh, dunkerley


def torsion_modes(
    mesh: BeamMesh,
    supports: Sequence[BarSupport | tuple[float, ...]] = (),
    *,
    polar_inertia_kgm2: ArrayLike | None = None,
    n_modes: int | None = None,
    label: str = "torsion modes",
) -> Modes:
    """Torsional natural frequencies of a shaft with lumped polar inertias.

    Parameters
    ----------
    mesh:
        The mesh (G [MPa], J [mm^4], rho [kg/m^3] per element).
    supports:
        Torsional restraints ``(node, k [N*mm/rad])``, ``inf`` = rigid. None = free-free
        (one zero-frequency rigid mode).
    polar_inertia_kgm2:
        Lumped polar inertias per node [kg*m^2], shape (n_nodes,) (discs, gears, rotors).
    n_modes:
        Number of lowest modes returned (default: all).
    label:
        Names the system in error messages.

    Returns
    -------
    Modes
        Frequencies and twist mode shapes [rad].

    Raises
    ------
    NumericalError
        Mass matrix not positive definite or a negative eigenvalue.
    """
    n = mesh.n_nodes
    _, rigid, springs = bar_support_dofs(supports, n, label)
    L = mesh.L_mm
    K = _dense(bar_stiffness(mesh.GJ_Nmm2, L), 1, n)
    K[np.arange(n), np.arange(n)] += springs
    M = _dense(bar_mass(mesh.rho_kg_m3 * KG_M3_TO_T_MM3 * mesh.J_mm4, L), 1, n)
    M[np.arange(n), np.arange(n)] += (
        _nodal(polar_inertia_kgm2, n, "polar_inertia_kgm2") * KG_M2_TO_T_MM2
    )
    return solve_modes(K, M, rigid, n_modes, label)
