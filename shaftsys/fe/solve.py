r"""Static solution of the decoupled shaft sub-problems: planar bending and bar.

Units: positions [mm], displacements [mm], rotations [rad], forces [N], moments and
torques [N*mm], translational springs [N/mm], rotational springs [N*mm/rad],
distributed loads [N/mm] (axial / transverse) or [N*mm/mm] (torque).

Linear algebra
--------------
The global stiffness of a chain of two-node elements is banded: half-bandwidth 3 for the
planar beam (2 DOFs per node), 1 for the bar. It is assembled directly in LAPACK upper
band storage (no dense 2n x 2n matrix). Rigid supports are eliminated exactly (their
rows and columns are replaced by identity rows; no penalty numbers; the band is kept),
springs are added to the diagonal, the matrix is scaled to unit diagonal (Jacobi) and
factored ONCE with the banded Cholesky ``dpbtrf``; any number of right-hand sides are
then solved with ``dpbtrs``. Cost is O(n) for the factor and O(n m) for m load cases,
against O(n^3) for a dense ``cho_factor`` -- that is the reason for the banded choice.
Both are backward stable for SPD matrices; the diagonal scaling does not change the
solution, it only makes the pivot test and the condition estimate independent of the
mix of N/mm and N*mm/rad entries.

Trust checks: the supports are first checked for a rigid-body mechanism of the whole
shaft (the elements themselves always connect every node, so no other mechanism
exists); a mechanism raises :class:`~shaftsys.errors.NumericalError` naming the free
direction. As a backstop, a failed factorisation or a pivot below ``pivot_tol`` (on
the unit diagonal; e.g. a vanishing spring) raises too. Round-off makes the pivot of an
exact mechanism come out anywhere between 1e-16 and 1e-10 for long meshes, so the pivot
test alone cannot detect mechanisms -- hence the structural check. The 1-norm condition
number of the scaled matrix is computed on request: exactly (n unit-column solves
with the stored factor) up to ``EXACT_CONDITION_MAX_DOF`` unknowns, above that
estimated (Hager-Higham estimator, ``scipy.sparse.linalg.onenormest`` with t = 1,
deterministic, a lower bound within a factor 3 in practice); it grows like
(number of elements)^4 for a beam (about 1e8 at 100 elements, 1e12 at 1000).

Sign conventions
----------------
Displacements, loads and reactions are positive along +u (or +x), rotations and moments
positive in the phi sense (see :mod:`shaftsys.fe.beam`). Reactions are the forces and
moments the supports exert ON THE SHAFT. Internal forces are those the part of the
shaft right of a cut (larger x) exerts on the part left of it, i.e. the usual stress
resultants on a face with outward normal +x. Drawn for the x-y plane (u = v up)::

    u ^
      |                               Q ^   <--.
      |   +-------------------------+   |       |  M_phi (counter-clockwise)
      |   |  part of the shaft LEFT |---+--> N -'   T: moment about +x
      |   |  of the cut             |   cut at x
      |   +-------------------------+
      +-------------------------------------------> x

With u up and a downward point load P at x = a on a simply supported span L
(b = L - a), the reactions are +P b / L and +P a / L (upward), and::

    Q = -P b / L  for 0 < x < a,     Q = +P a / L  for a < x < L
    M_phi = +P a b / L under the load (sagging is positive)

so dM_phi/dx = -Q and dQ/dx = -q. For the x-y plane (u = v) Q = V_y and M_phi = M_z;
for the x-z plane (u = w) Q = V_z and M_phi = -M_y.

Every result array keeps the right-hand sides in its last axis (m columns); a 1-D load
vector is treated as one column.
"""

from __future__ import annotations

import logging
import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from functools import cached_property

import numpy as np
from numpy.typing import ArrayLike, NDArray

from shaftsys.errors import ModelError, NumericalError
from shaftsys.fe.beam import (
    bar_stiffness,
    bar_uniform_load,
    beam_stiffness,
    shear_parameter,
    uniform_load,
)
from shaftsys.fe.mesh import BeamMesh

__all__ = [
    "DEFAULT_COND_WARN",
    "DEFAULT_PIVOT_TOL",
    "Bar",
    "BarSupport",
    "InternalForces",
    "PlanarBending",
    "Support",
    "assemble_banded",
    "banded_matmul",
    "bar_stiffness_banded",
    "bar_support_dofs",
    "check_planar_mechanism",
    "left_right_at_nodes",
    "planar_stiffness_banded",
    "planar_support_dofs",
    "warn_if_ill_conditioned",
]

logger = logging.getLogger(__name__)

#: Smallest accepted Cholesky pivot of the unit-diagonal reduced matrix [-].
DEFAULT_PIVOT_TOL = 1e-13
#: Default threshold of :func:`warn_if_ill_conditioned` [-].
DEFAULT_COND_WARN = 1e12
#: Up to this many unknowns the condition number is computed exactly (an n x n solve
#: with the stored band factor: 2.9 MB and about 5 Mflop at 600), above it estimated.
EXACT_CONDITION_MAX_DOF = 600

_BAR_KINDS = {
    # kind: (dof name, rigid-body motion in words)
    "axial": ("axial displacement", "translate along the shaft axis"),
    "torsion": ("twist angle", "rotate about the shaft axis"),
}

Array = NDArray[np.float64]


# --------------------------------------------------------------------------- supports


@dataclass(frozen=True)
class Support:
    """A support of the planar bending problem at one node.

    Attributes
    ----------
    node:
        Node index.
    k_t_N_mm:
        Translational stiffness [N/mm]; ``math.inf`` = rigid, 0 = none.
    k_r_Nmm_rad:
        Rotational stiffness [N*mm/rad]; ``None`` or 0 = free, ``math.inf`` = clamped.
    """

    node: int
    k_t_N_mm: float = math.inf
    k_r_Nmm_rad: float | None = None


@dataclass(frozen=True)
class BarSupport:
    """A support of the bar problem at one node.

    Attributes
    ----------
    node:
        Node index.
    k:
        Stiffness [N/mm] (axial) or [N*mm/rad] (torsion); ``math.inf`` = rigid.
    """

    node: int
    k: float = math.inf


def _stiffness_value(value: float | None, what: str, label: str) -> float:
    """Validate one support stiffness (>= 0, inf allowed, None -> 0)."""
    v = 0.0 if value is None else float(value)
    if math.isnan(v) or v < 0.0:
        raise ModelError(f"{label}: {what} = {value!r}", expected="a stiffness >= 0 or inf")
    return v


def _dof_kind(dof: int) -> str:
    return "deflection" if dof % 2 == 0 else "rotation"


def planar_support_dofs(
    supports: Sequence[Support | tuple[float, ...]], n_nodes: int, label: str = "planar bending"
) -> tuple[tuple[Support, ...], NDArray[np.bool_], Array]:
    """Validate planar supports and turn them into rigid DOFs and diagonal springs.

    Parameters
    ----------
    supports:
        :class:`Support` objects or tuples ``(node, k_t[, k_r])``.
    n_nodes:
        Number of nodes of the mesh.
    label:
        Names the system in error messages.

    Returns
    -------
    supports : tuple of Support
        Normalised (k_r None -> 0).
    rigid : numpy.ndarray of bool
        Shape (2 n_nodes,): DOFs held rigidly.
    springs : numpy.ndarray
        Shape (2 n_nodes,): spring stiffness on the diagonal [N/mm] (even DOFs),
        [N*mm/rad] (odd DOFs).

    Raises
    ------
    ModelError
        Node out of range, negative or NaN stiffness, or two rigid supports holding the
        same DOF (their reaction split would be undetermined).
    """
    out = []
    for j, given in enumerate(supports):
        if isinstance(given, Support):
            s = given
        else:
            if not 1 <= len(given) <= 3:
                raise ModelError(f"{label}: support {j} = {given!r}", expected="(node, k_t[, k_r])")
            s = Support(*given)  # type: ignore[arg-type]
        node = int(s.node)
        if node != s.node or not 0 <= node < n_nodes:
            raise ModelError(
                f"{label}: support {j} at node {s.node!r}", expected=f"0 <= node < {n_nodes}"
            )
        out.append(
            Support(
                node,
                _stiffness_value(s.k_t_N_mm, f"support {j} k_t [N/mm]", label),
                _stiffness_value(s.k_r_Nmm_rad, f"support {j} k_r [N*mm/rad]", label),
            )
        )
    rigid = np.zeros(2 * n_nodes, dtype=bool)
    springs = np.zeros(2 * n_nodes)
    owner: dict[int, int] = {}
    for j, s in enumerate(out):
        for dof, k in ((2 * s.node, s.k_t_N_mm), (2 * s.node + 1, s.k_r_Nmm_rad or 0.0)):
            if math.isinf(k):
                if rigid[dof]:
                    raise ModelError(
                        f"{label}: supports {owner[dof]} and {j} both rigidly hold the "
                        f"{_dof_kind(dof)} of node {s.node}; their reaction split is undetermined",
                        expected="one rigid support per node and direction",
                    )
                rigid[dof] = True
                owner[dof] = j
            else:
                springs[dof] += k
    return tuple(out), rigid, springs


def bar_support_dofs(
    supports: Sequence[BarSupport | tuple[float, ...]], n_nodes: int, label: str = "bar"
) -> tuple[tuple[BarSupport, ...], NDArray[np.bool_], Array]:
    """Validate bar supports and turn them into rigid DOFs and diagonal springs.

    Parameters
    ----------
    supports:
        :class:`BarSupport` objects or tuples ``(node, k)``.
    n_nodes:
        Number of nodes.
    label:
        Names the system in error messages.

    Returns
    -------
    supports : tuple of BarSupport
    rigid : numpy.ndarray of bool
        Shape (n_nodes,).
    springs : numpy.ndarray
        Shape (n_nodes,), [N/mm] or [N*mm/rad].

    Raises
    ------
    ModelError
        Node out of range, bad stiffness, or two rigid supports at one node.
    """
    out = []
    for j, given in enumerate(supports):
        if isinstance(given, BarSupport):
            s = given
        else:
            if not 1 <= len(given) <= 2:
                raise ModelError(f"{label}: support {j} = {given!r}", expected="(node, k)")
            s = BarSupport(*given)  # type: ignore[arg-type]
        node = int(s.node)
        if node != s.node or not 0 <= node < n_nodes:
            raise ModelError(
                f"{label}: support {j} at node {s.node!r}", expected=f"0 <= node < {n_nodes}"
            )
        out.append(BarSupport(node, _stiffness_value(s.k, f"support {j} k", label)))
    rigid = np.zeros(n_nodes, dtype=bool)
    springs = np.zeros(n_nodes)
    for j, s in enumerate(out):
        if math.isinf(s.k):
            if rigid[s.node]:
                raise ModelError(
                    f"{label}: two rigid supports at node {s.node} (support {j}); "
                    "their reaction split is undetermined",
                    expected="one rigid support per node",
                )
            rigid[s.node] = True
        else:
            springs[s.node] += s.k
    return tuple(out), rigid, springs


def check_planar_mechanism(
    supports: Sequence[Support], x_mm: ArrayLike, label: str = "planar bending"
) -> None:
    """Raise when the supports leave a rigid-body motion of the whole shaft free.

    The beam elements connect every node with positive stiffness, so the only possible
    mechanisms are the two rigid-body motions (translation, rotation) in the plane.

    Parameters
    ----------
    supports:
        Normalised supports (see :func:`planar_support_dofs`).
    x_mm:
        Node positions [mm] (to name the pivot point in the message).
    label:
        Names the system in the message.

    Raises
    ------
    NumericalError
        Naming the free direction: "translate and rotate", "translate (deflect)", or
        "rotate ... about the single support at x = ... mm".
    """
    t_nodes = sorted({s.node for s in supports if s.k_t_N_mm > 0.0})
    has_rot = any((s.k_r_Nmm_rad or 0.0) > 0.0 for s in supports)
    if not t_nodes and not has_rot:
        raise NumericalError(
            f"{label}: the shaft is free to translate and rotate as a rigid body "
            "(no support restrains the deflection or the rotation); add supports"
        )
    if not t_nodes:
        raise NumericalError(
            f"{label}: the shaft is free to translate (deflect) as a rigid body: "
            "no support carries a transverse force"
        )
    if len(t_nodes) == 1 and not has_rot:
        x0 = float(np.asarray(x_mm, dtype=float)[t_nodes[0]])
        raise NumericalError(
            f"{label}: the shaft is free to rotate as a rigid body about the single "
            f"support at x = {x0:g} mm (node {t_nodes[0]}): add a second support or a "
            "rotational (moment) stiffness"
        )


# ----------------------------------------------------------------- banded assembly


def assemble_banded(ke: Array, dofs_per_node: int) -> Array:
    """Assemble a chain of two-node elements into LAPACK upper band storage.

    Element ``e`` couples nodes ``e`` and ``e + 1``; its DOFs are
    ``dofs_per_node * e + (0 .. 2 * dofs_per_node - 1)``.

    Parameters
    ----------
    ke:
        Element matrices, shape (..., n_e, p, p) with p = 2 * dofs_per_node (any unit).
    dofs_per_node:
        1 (bar) or 2 (planar beam).

    Returns
    -------
    numpy.ndarray
        Shape (..., p, n_dof) with ``ab[..., p-1 + i - j, j] = K[i, j]`` for i <= j,
        n_dof = dofs_per_node * (n_e + 1) (the form of ``scipy.linalg.cholesky_banded``).
    """
    *batch, n_e, p, _ = ke.shape
    u = p - 1
    n = dofs_per_node * (n_e + 1)
    ab = np.zeros((*batch, p, n))
    stop = dofs_per_node * n_e
    for a in range(p):
        for b in range(a, p):
            ab[..., u + a - b, b : b + stop : dofs_per_node] += ke[..., :, a, b]
    return ab


def planar_stiffness_banded(
    L_mm: ArrayLike, EI_Nmm2: ArrayLike, kGA_N: ArrayLike | None = None
) -> Array:
    """Banded global stiffness of a planar beam from element arrays (no supports).

    Parameters
    ----------
    L_mm:
        Element lengths [mm], shape (..., n_e).
    EI_Nmm2:
        Bending rigidity [N*mm^2] per element.
    kGA_N:
        Shear rigidity k*G*A [N] per element, or ``None`` for Euler-Bernoulli.

    Returns
    -------
    numpy.ndarray
        Upper band storage, shape (..., 4, 2 (n_e + 1)).
    """
    phi = 0.0 if kGA_N is None else shear_parameter(EI_Nmm2, kGA_N, L_mm)
    return assemble_banded(beam_stiffness(EI_Nmm2, L_mm, phi), 2)


def bar_stiffness_banded(L_mm: ArrayLike, rigidity: ArrayLike) -> Array:
    """Banded global stiffness of a bar from element arrays (no supports).

    Parameters
    ----------
    L_mm:
        Element lengths [mm], shape (..., n_e).
    rigidity:
        E*A [N] or G*J [N*mm^2] per element.

    Returns
    -------
    numpy.ndarray
        Upper band storage, shape (..., 2, n_e + 1).
    """
    return assemble_banded(bar_stiffness(rigidity, L_mm), 1)


def banded_matmul(ab: Array, x: Array) -> Array:
    """Product of a symmetric matrix in upper band storage with a block of vectors.

    Parameters
    ----------
    ab:
        Upper band storage (u+1, n) (as :func:`assemble_banded`; any unit).
    x:
        Vectors, shape (n, m).

    Returns
    -------
    numpy.ndarray
        K @ x, shape (n, m).
    """
    u = ab.shape[0] - 1
    y = ab[u][:, None] * x
    for d in range(1, u + 1):
        off = ab[u - d, d:][:, None]  # K[j-d, j] for j = d..n-1
        y[:-d] += off * x[d:]
        y[d:] += off * x[:-d]
    return y


_banded_matmul = banded_matmul  # kept for callers that imported the private name


# ------------------------------------------------------------------ factored system


def supported_scaled_band(
    ab_shaft: Array, rigid: NDArray[np.bool_], springs: Array
) -> tuple[Array, Array]:
    """Supports applied to a band stiffness, scaled to unit diagonal (Jacobi).

    The springs are added to the diagonal; the rows and columns of rigid DOFs are
    replaced by identity rows (exact elimination: their equations decouple as
    ``1 * u_r = 0``, no penalty number, the band is kept); then ``A = S K S`` with
    ``S = diag(1 / sqrt(K_ii))``. The one sequence used by :class:`PlanarBending`,
    :class:`Bar` (then LAPACK ``dpbtrf``) and the batched solves of
    :mod:`shaftsys.fe.banded_batch` (then a batched banded Cholesky).

    Parameters
    ----------
    ab_shaft:
        Upper band storage of the shaft stiffness, shape (u+1, n) or (u+1, n, B) (a
        trailing variant axis); not modified.
    rigid:
        Shape (n,): DOFs held rigidly.
    springs:
        Shape (n,): spring stiffness on the diagonal [N/mm or N*mm/rad].

    Returns
    -------
    ab : numpy.ndarray
        The scaled band (unit diagonal), same shape as ``ab_shaft``.
    s : numpy.ndarray
        Scale factors 1/sqrt(K_ii) [1/sqrt(stiffness unit)], shape (n,) or (n, B); not
        finite where a diagonal entry is not positive.
    """
    u = ab_shaft.shape[0] - 1
    n = ab_shaft.shape[1]
    ab = ab_shaft.copy()
    ab[u] += springs.reshape(springs.shape + (1,) * (ab.ndim - 2))
    r = np.flatnonzero(rigid)
    if r.size:
        ab[:, r] = 0.0  # column r: K[r-d, r]
        for d in range(1, u + 1):
            cols = r + d
            ab[u - d, cols[cols < n]] = 0.0  # row r: K[r, r+d]
        ab[u, r] = 1.0
    with np.errstate(invalid="ignore", divide="ignore"):
        s = 1.0 / np.sqrt(ab[u])
        for d in range(1, u + 1):
            ab[u - d, d:] *= s[d:] * s[:-d]
    ab[u] = 1.0
    return ab, s


class _BandedSPD:
    """Scaled and factored banded SPD matrix with rigid DOFs eliminated.

    Elimination keeps the full size: the rows and columns of rigid DOFs are replaced by
    identity rows (their equations decouple as ``1 * u_r = 0``), which is exact
    elimination -- no penalty number -- and keeps the band intact.
    """

    def __init__(
        self,
        ab_full: Array,
        rigid: NDArray[np.bool_],
        spring_diag: Array,
        *,
        pivot_tol: float,
        describe: Callable[[int], str],
        label: str,
    ) -> None:
        u = ab_full.shape[0] - 1
        n = ab_full.shape[1]
        self.u = u
        self.n = n
        self.rigid = rigid
        self.free = np.flatnonzero(~rigid)
        self.label = label
        finite = np.all(np.isfinite(ab_full[:u])) and np.all(np.isfinite(ab_full[u] + spring_diag))
        if not finite:
            raise NumericalError(f"{label}: stiffness matrix has non-finite entries")
        ab, s = supported_scaled_band(ab_full, rigid, spring_diag)
        bad = np.flatnonzero(~np.isfinite(s))  # diagonal <= 0 after elimination
        if bad.size:
            raise NumericalError(
                f"{label}: no stiffness at {describe(int(bad[0]))}: the system is singular",
                dof=int(bad[0]),
            )
        from scipy.linalg import lapack  # deferred to the first solve (start-up)

        c, info = lapack.dpbtrf(ab, lower=0)
        if info != 0:
            where = describe(int(info - 1)) if info > 0 else "(invalid input)"
            raise NumericalError(
                f"{label}: stiffness matrix is singular or not positive definite "
                f"(factorisation failed at {where}); the shaft is not fully restrained",
                dof=int(info - 1) if info > 0 else None,
            )
        piv = c[u] ** 2
        i_min = int(np.argmin(piv))
        if piv[i_min] < pivot_tol:
            raise NumericalError(
                f"{label}: near-zero pivot {piv[i_min]:.3g} at {describe(i_min)}: "
                "the shaft is (nearly) a mechanism; check supports and spring stiffnesses",
                dof=i_min,
            )
        self.scale = s
        self.factor = c
        self.min_pivot = float(piv[i_min])
        self._scaled = ab

    def solve_scaled(self, b: Array) -> Array:
        """Solve (S K S) y = b with the stored factor; b shape (n, m)."""
        from scipy.linalg import lapack

        y, info = lapack.dpbtrs(self.factor, b, lower=0)
        if info != 0:  # pragma: no cover - only on invalid arguments
            raise NumericalError(f"{self.label}: banded solve failed (info={info})")
        return np.asarray(y)

    def solve(self, F: Array) -> Array:
        """Full displacement vector (zeros at rigid DOFs) for loads F (n, m)."""
        s = self.scale[:, None]
        b = s * F
        b[self.rigid] = 0.0
        return s * self.solve_scaled(b)

    @cached_property
    def condition_estimate(self) -> float:
        """Estimated 1-norm condition number of the scaled stiffness (rigid rows = 1) [-]."""
        ab = self._scaled
        u = self.u
        col = np.abs(ab[u]).copy()
        for d in range(1, u + 1):
            off = np.abs(ab[u - d, d:])
            col[d:] += off  # upper part of column j
            col[:-d] += off  # mirrored lower part of column j-d
        n = self.n
        if n == 1:
            return 1.0
        if n <= EXACT_CONDITION_MAX_DOF:
            # the exact 1-norm of the inverse from n unit columns: O(n^2 u) flops, no
            # scipy.sparse import on a check of an ordinary shaft (start-up time)
            inverse = self.solve_scaled(np.eye(n))
            return float(col.max()) * float(np.abs(inverse).sum(axis=0).max())

        from scipy.sparse.linalg import LinearOperator, onenormest  # lazy: sparse is heavy

        def mv(x: Array) -> Array:
            return self.solve_scaled(np.asarray(x, dtype=float).reshape(n, -1))

        op = LinearOperator((n, n), matvec=mv, rmatvec=mv, matmat=mv, rmatmat=mv, dtype=float)
        return float(col.max()) * float(onenormest(op, t=1))


def warn_if_ill_conditioned(
    condition: float, threshold: float = DEFAULT_COND_WARN, label: str = "system"
) -> bool:
    """Log a warning when a condition estimate exceeds a threshold.

    Parameters
    ----------
    condition:
        Estimated condition number [-].
    threshold:
        Warning threshold [-].
    label:
        Name of the system used in the message.

    Returns
    -------
    bool
        True when the warning was issued.
    """
    if condition > threshold:
        logger.warning(
            "%s: stiffness matrix is ill-conditioned (condition estimate %.3g > %.3g); "
            "results may have lost about %d significant digits",
            label,
            condition,
            threshold,
            int(math.log10(condition)),
        )
        return True
    return False


def _as_columns(F: ArrayLike, n: int, what: str) -> Array:
    """Return loads as a float (n, m) array; a 1-D vector becomes one column."""
    a = np.asarray(F, dtype=float)
    if a.ndim == 1:
        a = a[:, None]
    if a.ndim != 2 or a.shape[0] != n:
        raise ValueError(f"{what} must have shape ({n},) or ({n}, m), got {np.shape(F)}")
    return a


# ---------------------------------------------------------------- internal forces


def left_right_at_nodes(ends: Array) -> Array:
    """Nodal values just left and right of every node from element-end values.

    Parameters
    ----------
    ends:
        Shape (n_e, 2, m): value at the left end [e, 0] and right end [e, 1] of each
        element (any unit).

    Returns
    -------
    numpy.ndarray
        Shape (n_e + 1, 2, m): [i, 0] just left of node i, [i, 1] just right of it;
        0 outside the shaft (left of the first node, right of the last).
    """
    n_e, _, m = ends.shape
    out = np.zeros((n_e + 1, 2, m))
    out[1:, 0] = ends[:, 1]
    out[:-1, 1] = ends[:, 0]
    return out


@dataclass(frozen=True, eq=False)
class InternalForces:
    """Shear force and bending moment at both ends of every element.

    Attributes
    ----------
    Q_N:
        Transverse shear [N], shape (n_e, 2, m): [e, 0] at the left end (x_e, inside
        element e), [e, 1] at the right end (x_{e+1}).
    M_Nmm:
        Bending moment M_phi [N*mm], same layout.

    Both are the resultants the part right of the cut exerts on the part left of it
    (positive along +u and in the phi sense): see the module docstring.
    """

    Q_N: Array
    M_Nmm: Array

    def at_nodes(self) -> tuple[Array, Array]:
        """(Q, M) just left [:, 0] and right [:, 1] of every node, shape (n, 2, m)."""
        return left_right_at_nodes(self.Q_N), left_right_at_nodes(self.M_Nmm)


# ------------------------------------------------------------------ planar bending


class PlanarBending:
    """Planar bending of a straight shaft: assemble, factor once, solve many cases.

    Parameters
    ----------
    x_mm:
        Node positions [mm], shape (n,), strictly increasing.
    EI_Nmm2:
        Bending rigidity E*I [N*mm^2] per element, shape (n - 1,).
    kGA_N:
        Shear rigidity k*G*A [N] per element, or ``None`` for Euler-Bernoulli.
    supports:
        :class:`Support` objects or tuples ``(node, k_t, k_r)`` / ``(node, k_t)``.
    label:
        Names the system in error messages, e.g. "shaft 'input', bending in the x-y
        plane".
    pivot_tol:
        Smallest accepted pivot of the unit-diagonal matrix [-].

    Raises
    ------
    ModelError
        Bad support input (node out of range, negative stiffness, two rigid supports in
        the same DOF).
    NumericalError
        The shaft is a mechanism (the message names the free direction) or the
        factorisation is untrustworthy.

    Notes
    -----
    DOF ``2 i`` is the deflection u of node i [mm], DOF ``2 i + 1`` its rotation
    phi [rad]. Rigid supports impose zero displacement.
    """

    def __init__(
        self,
        x_mm: ArrayLike,
        EI_Nmm2: ArrayLike,
        kGA_N: ArrayLike | None,
        supports: Sequence[Support | tuple[float, ...]],
        *,
        label: str = "planar bending",
        pivot_tol: float = DEFAULT_PIVOT_TOL,
    ) -> None:
        x = np.asarray(x_mm, dtype=float)
        self.x_mm = x
        self.L_mm = np.diff(x)
        n_e = self.L_mm.size
        self.EI_Nmm2 = np.broadcast_to(np.asarray(EI_Nmm2, dtype=float), (n_e,))
        self.kGA_N = None if kGA_N is None else np.broadcast_to(np.asarray(kGA_N, float), (n_e,))
        if not (
            np.all(self.L_mm > 0.0)
            and np.all(self.EI_Nmm2 > 0.0)
            and (self.kGA_N is None or np.all(self.kGA_N > 0.0))
        ):
            raise ModelError(
                f"{label}: node positions must increase and element rigidities be > 0",
                expected="x strictly increasing, EI > 0 N*mm^2, kGA > 0 N",
            )
        self.label = label
        self.phi_shear = (
            np.zeros(n_e)
            if self.kGA_N is None
            else shear_parameter(self.EI_Nmm2, self.kGA_N, self.L_mm)
        )
        self.ke = beam_stiffness(self.EI_Nmm2, self.L_mm, self.phi_shear)
        self.ab = assemble_banded(self.ke, 2)
        n = x.size
        self.supports, self.rigid, self.spring_diag = planar_support_dofs(supports, n, label)
        check_planar_mechanism(self.supports, x, label)
        self.system = _BandedSPD(
            self.ab,
            self.rigid,
            self.spring_diag,
            pivot_tol=pivot_tol,
            describe=self.describe_dof,
            label=label,
        )

    @classmethod
    def from_mesh(
        cls,
        mesh: BeamMesh,
        supports: Sequence[Support | tuple[float, ...]],
        *,
        shear: bool = True,
        label: str = "planar bending",
        pivot_tol: float = DEFAULT_PIVOT_TOL,
    ) -> PlanarBending:
        """Build from a :class:`~shaftsys.fe.mesh.BeamMesh`.

        Parameters
        ----------
        mesh:
            The mesh (E [MPa], I [mm^4], k [-], G [MPa], A [mm^2] per element).
        supports:
            As for the constructor.
        shear:
            True for Timoshenko, False for Euler-Bernoulli.
        label, pivot_tol:
            As for the constructor.

        Returns
        -------
        PlanarBending
        """
        return cls(
            mesh.x_mm,
            mesh.EI_Nmm2,
            mesh.kGA_N if shear else None,
            supports,
            label=label,
            pivot_tol=pivot_tol,
        )

    # -- bookkeeping -------------------------------------------------------------

    def describe_dof(self, dof: int) -> str:
        """Human name of a DOF, e.g. "deflection of node 3 (x = 120 mm)"."""
        node = dof // 2
        return f"{_dof_kind(dof)} of node {node} (x = {self.x_mm[node]:g} mm)"

    @property
    def n_nodes(self) -> int:
        """Number of nodes."""
        return int(self.x_mm.size)

    @property
    def n_dof(self) -> int:
        """Number of DOFs (2 per node)."""
        return 2 * self.n_nodes

    @property
    def condition_estimate(self) -> float:
        """Estimated 1-norm condition number of the scaled reduced stiffness [-]."""
        return self.system.condition_estimate

    @property
    def min_pivot(self) -> float:
        """Smallest Cholesky pivot of the unit-diagonal reduced stiffness [-]."""
        return self.system.min_pivot

    def warn_if_ill_conditioned(self, threshold: float = DEFAULT_COND_WARN) -> bool:
        """Log a warning (and return True) when the condition estimate exceeds threshold."""
        return warn_if_ill_conditioned(self.condition_estimate, threshold, self.label)

    def stiffness_matrix(self, include_springs: bool = False) -> Array:
        """Dense global stiffness (2n, 2n) of the shaft, optionally with support springs.

        Units N/mm, N/rad, N*mm/rad by DOF pair. For inspection and tests; the solver
        works on the band.
        """
        n = self.n_dof
        K = np.zeros((n, n))
        for d in range(4):
            idx = np.arange(n - d)
            K[idx, idx + d] = self.ab[3 - d, d:]
            K[idx + d, idx] = self.ab[3 - d, d:]
        if include_springs:
            K[np.arange(n), np.arange(n)] += self.spring_diag
        return K

    # -- loads and solution ------------------------------------------------------

    def _q_columns(self, q: ArrayLike | None, m: int | None) -> Array | None:
        """Element loads as (n_e, m); ``m=None`` keeps the given column count."""
        if q is None:
            return None
        qa = np.asarray(q, dtype=float)
        if qa.ndim == 1:
            qa = qa[:, None]
        n_e = self.L_mm.size
        if qa.ndim != 2 or qa.shape[0] != n_e:
            raise ValueError(f"q must have shape ({n_e},) or ({n_e}, m), got {np.shape(q)}")
        return qa if m is None else np.broadcast_to(qa, (n_e, m))

    def load_vector(self, q_N_mm: ArrayLike) -> Array:
        """Consistent nodal loads (2n, m) of uniform transverse loads per element.

        Parameters
        ----------
        q_N_mm:
            Load per length [N/mm] along +u, shape (n_e,) or (n_e, m).

        Returns
        -------
        numpy.ndarray
            Shape (2n, m): forces [N] at even, moments [N*mm] at odd DOFs.
        """
        q = self._q_columns(q_N_mm, None)
        if q is None:
            raise ValueError("q_N_mm must be an array of element loads")
        fe = uniform_load(q.T, self.L_mm).transpose(1, 2, 0)  # (n_e, 4, m)
        return self._scatter(fe)

    def _scatter(self, fe: Array) -> Array:
        """Sum element DOF vectors (n_e, 4, m) into a global vector (2n, m)."""
        n_e, _, m = fe.shape
        out = np.zeros((self.n_dof, m))
        for a in range(4):
            out[a : a + 2 * n_e : 2] += fe[:, a]
        return out

    def _total_load(self, F: Array, q: Array | None) -> Array:
        return F if q is None else F + self.load_vector(q)

    def solve(self, F: ArrayLike, q: ArrayLike | None = None) -> Array:
        """Displacements for many load cases at once.

        Parameters
        ----------
        F:
            Nodal loads, shape (2n,) or (2n, m): forces [N] at DOF 2i, moments M_phi
            [N*mm] at DOF 2i+1.
        q:
            Optional uniform transverse load per element [N/mm], shape (n_e,) or (n_e, m).

        Returns
        -------
        numpy.ndarray
            Shape (2n, m): u [mm] at even, phi [rad] at odd DOFs (0 at rigid supports).
        """
        Fc = _as_columns(F, self.n_dof, "F")
        return self.system.solve(self._total_load(Fc, self._q_columns(q, Fc.shape[1])))

    def element_end_forces(self, u: ArrayLike, q: ArrayLike | None = None) -> Array:
        """Return the forces the nodes exert on each element, k_e u_e - f_e.

        Parameters
        ----------
        u:
            Displacements (2n, m) [mm, rad].
        q:
            Uniform load per element [N/mm] used in the solve, if any.

        Returns
        -------
        numpy.ndarray
            Shape (n_e, 4, m): (V1 [N], M1 [N*mm], V2 [N], M2 [N*mm]) in DOF directions.
        """
        uc = _as_columns(u, self.n_dof, "u")
        n_e = self.L_mm.size
        idx = 2 * np.arange(n_e)[:, None] + np.arange(4)
        fe = np.einsum("eab,ebm->eam", self.ke, uc[idx])
        qc = self._q_columns(q, uc.shape[1])
        if qc is not None:
            fe -= uniform_load(qc.T, self.L_mm).transpose(1, 2, 0)
        return fe

    def internal_forces(self, u: ArrayLike, q: ArrayLike | None = None) -> InternalForces:
        """Shear Q [N] and moment M_phi [N*mm] at both ends of every element.

        Parameters
        ----------
        u:
            Displacements (2n, m) [mm, rad].
        q:
            Uniform load per element [N/mm] used in the solve, if any.

        Returns
        -------
        InternalForces
            Q and M_phi, shape (n_e, 2, m), acting on the part left of the cut (see the
            module docstring for the sign convention).
        """
        fe = self.element_end_forces(u, q)
        Q = np.stack([-fe[:, 0], fe[:, 2]], axis=1)
        M = np.stack([-fe[:, 1], fe[:, 3]], axis=1)
        return InternalForces(Q_N=Q, M_Nmm=M)

    def _shaft_forces(self, u: Array) -> Array:
        """K_shaft u (2n, m) without springs."""
        return banded_matmul(self.ab, u)

    def reactions(self, u: ArrayLike, F: ArrayLike, q: ArrayLike | None = None) -> Array:
        """Force and moment each support exerts on the shaft.

        Parameters
        ----------
        u:
            Displacements (2n, m) [mm, rad] from :meth:`solve`.
        F, q:
            The loads used in the solve.

        Returns
        -------
        numpy.ndarray
            Shape (n_supports, 2, m): [j, 0] force [N] along +u, [j, 1] moment M_phi
            [N*mm], in the order the supports were given. Rigid: K u - F at the DOF;
            spring: -k u.
        """
        uc = _as_columns(u, self.n_dof, "u")
        Ft = self._total_load(_as_columns(F, self.n_dof, "F"), self._q_columns(q, uc.shape[1]))
        rigid_r = self._shaft_forces(uc) - Ft
        out = np.zeros((len(self.supports), 2, uc.shape[1]))
        for j, s in enumerate(self.supports):
            for c, (dof, k) in enumerate(
                ((2 * s.node, s.k_t_N_mm), (2 * s.node + 1, s.k_r_Nmm_rad or 0.0))
            ):
                out[j, c] = rigid_r[dof] if math.isinf(k) else -k * uc[dof]
        return out

    def residual(self, u: ArrayLike, F: ArrayLike, q: ArrayLike | None = None) -> Array:
        """Relative equilibrium residual ||K u - F - R|| / ||F|| per load case.

        R holds the spring forces and, at rigid DOFs, the reactions (so the residual is
        the out-of-balance force at the free DOFs). Columns with F = 0 are divided by 1.

        Returns
        -------
        numpy.ndarray
            Shape (m,) [-].
        """
        uc = _as_columns(u, self.n_dof, "u")
        Ft = self._total_load(_as_columns(F, self.n_dof, "F"), self._q_columns(q, uc.shape[1]))
        r = self._shaft_forces(uc) + self.spring_diag[:, None] * uc - Ft
        r[self.rigid] = 0.0
        norm_f = np.linalg.norm(Ft, axis=0)
        return np.asarray(np.linalg.norm(r, axis=0) / np.where(norm_f > 0.0, norm_f, 1.0))

    @staticmethod
    def deflections(u: Array) -> Array:
        """Nodal deflections u [mm], shape (n, m)."""
        return u[0::2]

    @staticmethod
    def slopes(u: Array) -> Array:
        """Nodal rotations phi [rad], shape (n, m) (section rotation for Timoshenko)."""
        return u[1::2]

    def centerline_slopes(self, u: ArrayLike, q: ArrayLike | None = None) -> Array:
        """Slope du/dx [rad] of the centre line at both ends of every element.

        For Timoshenko du/dx = phi + Q / (k G A) (it jumps where Q jumps); for
        Euler-Bernoulli it equals phi.

        Returns
        -------
        numpy.ndarray
            Shape (n_e, 2, m): [e, 0] at the left end, [e, 1] at the right end.
        """
        uc = _as_columns(u, self.n_dof, "u")
        phi = self.slopes(uc)
        out = np.stack([phi[:-1], phi[1:]], axis=1)
        if self.kGA_N is not None:
            out = out + self.internal_forces(uc, q).Q_N / self.kGA_N[:, None, None]
        return out


# -------------------------------------------------------------------------- bar


class Bar:
    """Axial or torsional bar along the shaft: assemble, factor once, solve many cases.

    Parameters
    ----------
    x_mm:
        Node positions [mm], shape (n,).
    rigidity:
        E*A [N] (axial) or G*J [N*mm^2] (torsion) per element, shape (n - 1,).
    supports:
        :class:`BarSupport` objects or tuples ``(node, k)``; k [N/mm] or [N*mm/rad],
        ``math.inf`` = rigid. One rigid node is enough (e.g. a reference bearing, with
        the other bearings' axial reactions given as known loads).
    kind:
        "axial" or "torsion" (only the wording of messages differs).
    label:
        Names the system in error messages.
    pivot_tol:
        Smallest accepted pivot of the unit-diagonal matrix [-].

    Notes
    -----
    DOF i is the axial displacement [mm] or twist angle [rad] of node i, positive along
    (about) +x. Internal normal force N is tension-positive; internal torque T is the
    moment about +x that the part right of the cut exerts on the part left of it.
    """

    def __init__(
        self,
        x_mm: ArrayLike,
        rigidity: ArrayLike,
        supports: Sequence[BarSupport | tuple[float, ...]],
        *,
        kind: str = "axial",
        label: str | None = None,
        pivot_tol: float = DEFAULT_PIVOT_TOL,
    ) -> None:
        if kind not in _BAR_KINDS:
            raise ValueError(f"unknown bar kind {kind!r}; expected one of {sorted(_BAR_KINDS)}")
        self.kind = kind
        self.label = label or kind
        x = np.asarray(x_mm, dtype=float)
        self.x_mm = x
        self.L_mm = np.diff(x)
        self.rigidity = np.broadcast_to(np.asarray(rigidity, dtype=float), self.L_mm.shape)
        if not (np.all(self.L_mm > 0.0) and np.all(self.rigidity > 0.0)):
            raise ModelError(
                f"{self.label}: node positions must increase and element rigidities be > 0",
                expected="x strictly increasing, rigidity > 0",
            )
        self.ke = bar_stiffness(self.rigidity, self.L_mm)
        self.ab = assemble_banded(self.ke, 1)
        n = x.size
        self.supports, self.rigid, self.spring_diag = bar_support_dofs(supports, n, self.label)
        if not any(s.k > 0.0 for s in self.supports):
            raise NumericalError(
                f"{self.label}: the shaft is free to {_BAR_KINDS[kind][1]} as a rigid body: "
                "no support restrains it"
            )
        self.system = _BandedSPD(
            self.ab,
            self.rigid,
            self.spring_diag,
            pivot_tol=pivot_tol,
            describe=self.describe_dof,
            label=self.label,
        )

    @classmethod
    def axial(
        cls,
        mesh: BeamMesh,
        supports: Sequence[BarSupport | tuple[float, ...]],
        *,
        label: str = "axial",
        pivot_tol: float = DEFAULT_PIVOT_TOL,
    ) -> Bar:
        """Axial bar of a mesh (rigidity E*A [N])."""
        return cls(mesh.x_mm, mesh.EA_N, supports, kind="axial", label=label, pivot_tol=pivot_tol)

    @classmethod
    def torsion(
        cls,
        mesh: BeamMesh,
        supports: Sequence[BarSupport | tuple[float, ...]],
        *,
        label: str = "torsion",
        pivot_tol: float = DEFAULT_PIVOT_TOL,
    ) -> Bar:
        """Torsion bar of a mesh (rigidity G*J [N*mm^2])."""
        return cls(
            mesh.x_mm, mesh.GJ_Nmm2, supports, kind="torsion", label=label, pivot_tol=pivot_tol
        )

    def describe_dof(self, dof: int) -> str:
        """Human name of a DOF, e.g. "axial displacement of node 0 (x = 0 mm)"."""
        return f"{_BAR_KINDS[self.kind][0]} of node {dof} (x = {self.x_mm[dof]:g} mm)"

    @property
    def n_nodes(self) -> int:
        """Number of nodes (= DOFs)."""
        return int(self.x_mm.size)

    @property
    def condition_estimate(self) -> float:
        """Estimated 1-norm condition number of the scaled reduced stiffness [-]."""
        return self.system.condition_estimate

    def warn_if_ill_conditioned(self, threshold: float = DEFAULT_COND_WARN) -> bool:
        """Log a warning (and return True) when the condition estimate exceeds threshold."""
        return warn_if_ill_conditioned(self.condition_estimate, threshold, self.label)

    def _p_columns(self, p: ArrayLike | None, m: int) -> Array | None:
        if p is None:
            return None
        pa = np.asarray(p, dtype=float)
        if pa.ndim == 1:
            pa = pa[:, None]
        n_e = self.L_mm.size
        if pa.ndim != 2 or pa.shape[0] != n_e:
            raise ValueError(f"p must have shape ({n_e},) or ({n_e}, m), got {np.shape(p)}")
        return np.broadcast_to(pa, (n_e, m))

    def _total_load(self, F: Array, p: Array | None) -> Array:
        if p is None:
            return F
        fe = bar_uniform_load(p.T, self.L_mm).transpose(1, 2, 0)  # (n_e, 2, m)
        out = F.copy()
        out[:-1] += fe[:, 0]
        out[1:] += fe[:, 1]
        return out

    def solve(self, F: ArrayLike, p: ArrayLike | None = None) -> Array:
        """Displacements (n, m) [mm or rad] for nodal loads F (n,) or (n, m) [N or N*mm].

        ``p`` is an optional uniform load per element [N/mm or N*mm/mm], (n_e,) or
        (n_e, m).
        """
        Fc = _as_columns(F, self.n_nodes, "F")
        return self.system.solve(self._total_load(Fc, self._p_columns(p, Fc.shape[1])))

    def reactions(self, u: ArrayLike, F: ArrayLike, p: ArrayLike | None = None) -> Array:
        """Force [N] or torque [N*mm] each support exerts on the shaft, shape (n_sup, m)."""
        uc = _as_columns(u, self.n_nodes, "u")
        Ft = self._total_load(_as_columns(F, self.n_nodes, "F"), self._p_columns(p, uc.shape[1]))
        rigid_r = banded_matmul(self.ab, uc) - Ft
        out = np.zeros((len(self.supports), uc.shape[1]))
        for j, s in enumerate(self.supports):
            out[j] = rigid_r[s.node] if math.isinf(s.k) else -s.k * uc[s.node]
        return out

    def internal_forces(self, u: ArrayLike, p: ArrayLike | None = None) -> Array:
        """Return normal force N [N] (tension +) or torque T [N*mm] at both element ends.

        Returns
        -------
        numpy.ndarray
            Shape (n_e, 2, m): [e, 0] at the left end, [e, 1] at the right end.
        """
        uc = _as_columns(u, self.n_nodes, "u")
        c = (self.rigidity / self.L_mm)[:, None]
        diff = c * (uc[1:] - uc[:-1])  # constant part c (u2 - u1)
        pc = self._p_columns(p, uc.shape[1])
        if pc is None:
            return np.stack([diff, diff], axis=1)
        half = 0.5 * pc * self.L_mm[:, None]
        # end forces f = k u - f_eq; N_left = -f1 = c (u2 - u1) + pL/2, N_right = f2.
        return np.stack([diff + half, diff - half], axis=1)

    def residual(self, u: ArrayLike, F: ArrayLike, p: ArrayLike | None = None) -> Array:
        """Relative residual ||K u - F - R|| / ||F|| per load case (m,) [-]."""
        uc = _as_columns(u, self.n_nodes, "u")
        Ft = self._total_load(_as_columns(F, self.n_nodes, "F"), self._p_columns(p, uc.shape[1]))
        r = banded_matmul(self.ab, uc) + self.spring_diag[:, None] * uc - Ft
        r[self.rigid] = 0.0
        norm_f = np.linalg.norm(Ft, axis=0)
        return np.asarray(np.linalg.norm(r, axis=0) / np.where(norm_f > 0.0, norm_f, 1.0))
