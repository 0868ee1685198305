"""Planar bending of many shaft variants at once (design studies).

Units: as :mod:`shaftsys.fe.solve` -- mm, N, N*mm, rad, N/mm, N*mm/rad, N*mm^2.

All variants share the node positions, the supports and the load layout; their element
rigidities differ (e.g. diameters varied by a study). One Python loop runs over the DOFs
(a few hundred), every operation inside it works on all variants together, so the cost
per variant is a few hundred floating-point operations instead of a few hundred
microseconds of interpreter overhead per :class:`~shaftsys.fe.solve.PlanarBending`.

The algebra is the same as in :mod:`shaftsys.fe.solve`: banded assembly, exact
elimination of rigid DOFs (identity rows), Jacobi scaling to unit diagonal, banded
Cholesky A = L L^T (right-looking, with a rolling (u+1) x (u+1) window of the Schur
complement), forward and back substitution. Results agree with
:class:`~shaftsys.fe.solve.PlanarBending` to round-off.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from shaftsys.errors import NumericalError
from shaftsys.fe.beam import beam_stiffness, shear_parameter, uniform_load
from shaftsys.fe.solve import (
    DEFAULT_PIVOT_TOL,
    Support,
    assemble_banded,
    check_planar_mechanism,
    planar_support_dofs,
)

__all__ = ["BatchSolution", "cholesky_banded_batch", "solve_banded_batch", "solve_planar_batch"]

Array = NDArray[np.float64]


def cholesky_banded_batch(ab: Array) -> Array:
    """Cholesky factors of a stack of SPD band matrices (no pivot check).

    Parameters
    ----------
    ab:
        Upper band storage, shape (B, u+1, n): ``ab[b, u + i - j, j] = A_b[i, j]``.

    Returns
    -------
    numpy.ndarray
        Lower band storage of L, shape (B, u+1, n): ``Lb[b, d, j] = L_b[j + d, j]``
        (A = L L^T). A non-positive pivot gives NaN in that variant's factor.
    """
    B, p, n = ab.shape
    u = p - 1
    Lb = np.zeros_like(ab)
    # Window W[b, r, c] = Schur complement entry (j + r, j + c), r, c = 0..u.
    W = np.zeros((B, p, p))
    for r in range(p):
        for c in range(r, p):
            if c < n:
                W[:, r, c] = ab[:, u - (c - r), c]
                W[:, c, r] = W[:, r, c]
            elif r == c:
                W[:, r, c] = 1.0  # padding beyond the matrix end
    with np.errstate(invalid="ignore", divide="ignore"):
        for j in range(n):
            piv = np.sqrt(W[:, 0, 0])
            col = W[:, 1:, 0] / piv[:, None]
            Lb[:, 0, j] = piv
            Lb[:, 1:, j] = col
            W[:, :u, :u] = W[:, 1:, 1:] - col[:, :, None] * col[:, None, :]
            nxt = j + p  # the DOF entering the window
            if nxt < n:
                W[:, :, u] = ab[:, :, nxt]  # A[nxt - u + r, nxt] for r = 0..u
                W[:, u, :] = W[:, :, u]
            else:
                W[:, :, u] = 0.0
                W[:, u, :] = 0.0
                W[:, u, u] = 1.0
    # Entries below the matrix end are meaningless; zero them for clean storage.
    for d in range(1, p):
        Lb[:, d, n - d :] = 0.0
    return Lb


def solve_banded_batch(Lb: Array, b: Array) -> Array:
    """Solve L L^T x = b for a stack of band Cholesky factors.

    Parameters
    ----------
    Lb:
        Factors from :func:`cholesky_banded_batch`, shape (B, u+1, n).
    b:
        Right-hand sides, shape (B, n, m).

    Returns
    -------
    numpy.ndarray
        x, shape (B, n, m).
    """
    _, p, n = Lb.shape
    y = np.array(b, dtype=float, copy=True)
    for j in range(n):  # forward: L y = b
        y[:, j] /= Lb[:, 0, j, None]
        k = min(p - 1, n - 1 - j)
        if k:
            y[:, j + 1 : j + 1 + k] -= Lb[:, 1 : 1 + k, j, None] * y[:, j, None, :]
    for j in range(n - 1, -1, -1):  # backward: L^T x = y
        k = min(p - 1, n - 1 - j)
        if k:
            y[:, j] -= np.einsum("bd,bdm->bm", Lb[:, 1 : 1 + k, j], y[:, j + 1 : j + 1 + k])
        y[:, j] /= Lb[:, 0, j, None]
    return y


@dataclass(frozen=True, eq=False)
class BatchSolution:
    """Displacements and support reactions of every variant.

    Attributes
    ----------
    u:
        Shape (B, 2n, m): u [mm] at even, phi [rad] at odd DOFs.
    reactions:
        Shape (B, n_supports, 2, m): force [N] and moment M_phi [N*mm] each support
        exerts on the shaft (same convention as :meth:`PlanarBending.reactions`).
    min_pivot:
        Smallest pivot of the unit-diagonal matrix per variant [-], shape (B,).
    """

    u: Array
    reactions: Array
    min_pivot: Array


def solve_planar_batch(
    x_mm: ArrayLike,
    EI_Nmm2: ArrayLike,
    kGA_N: ArrayLike | None,
    supports: Sequence[Support | tuple[float, ...]],
    F: ArrayLike,
    q: ArrayLike | None = None,
    *,
    label: str = "planar bending",
    pivot_tol: float = DEFAULT_PIVOT_TOL,
) -> BatchSolution:
    """Solve planar bending for B variants sharing nodes, supports and load layout.

    Parameters
    ----------
    x_mm:
        Node positions [mm], shape (n,).
    EI_Nmm2:
        Bending rigidity [N*mm^2], shape (B, n - 1).
    kGA_N:
        Shear rigidity [N], shape (B, n - 1), or ``None`` for Euler-Bernoulli.
    supports:
        As for :class:`~shaftsys.fe.solve.PlanarBending` (shared by all variants).
    F:
        Nodal loads [N, N*mm], shape (2n, m) shared or (B, 2n, m) per variant.
    q:
        Optional uniform transverse load per element [N/mm], shape (n - 1, m) or
        (B, n - 1, m).
    label:
        Names the system in error messages.
    pivot_tol:
        Smallest accepted pivot of the unit-diagonal matrix [-].

    Returns
    -------
    BatchSolution

    Raises
    ------
    NumericalError
        The supports leave a rigid-body motion free (checked once, message names the
        direction), or some variant's factorisation fails (message names the variants).
    """
    x = np.asarray(x_mm, dtype=float)
    L = np.diff(x)
    EI = np.atleast_2d(np.asarray(EI_Nmm2, dtype=float))
    B, n_e = EI.shape
    if n_e != L.size:
        raise ValueError(f"EI_Nmm2 must have shape (B, {L.size}), got {EI.shape}")
    sups, rigid, springs = planar_support_dofs(supports, x.size, label)
    check_planar_mechanism(sups, x, label)  # once: topology is shared by all variants
    phi = 0.0 if kGA_N is None else shear_parameter(EI, np.atleast_2d(kGA_N), L)
    ke = beam_stiffness(EI, L, phi)  # (B, n_e, 4, 4)
    ab_shaft = assemble_banded(ke, 2)  # (B, 4, 2n)
    n = 2 * x.size
    u_band = 3
    ab = ab_shaft.copy()
    ab[:, u_band] += springs
    r = np.flatnonzero(rigid)
    if r.size:
        ab[:, :, r] = 0.0
        for d in range(1, u_band + 1):
            cols = r + d
            ab[:, u_band - d, cols[cols < n]] = 0.0
        ab[:, u_band, r] = 1.0
    diag = ab[:, u_band]
    if np.any(~(diag > 0.0)):
        bad = np.flatnonzero(np.any(~(diag > 0.0), axis=1))
        raise NumericalError(f"{label}: zero or invalid stiffness in variants {bad[:10].tolist()}")
    s = 1.0 / np.sqrt(diag)  # (B, n)
    for d in range(1, u_band + 1):
        ab[:, u_band - d, d:] *= s[:, d:] * s[:, :-d]
    ab[:, u_band] = 1.0
    Lb = cholesky_banded_batch(ab)
    piv = Lb[:, 0] ** 2
    min_piv = np.min(piv, axis=1)
    bad = np.flatnonzero(~(min_piv >= pivot_tol))
    if bad.size:
        raise NumericalError(
            f"{label}: stiffness not positive definite or (nearly) a mechanism in variants "
            f"{bad[:10].tolist()}{' ...' if bad.size > 10 else ''}"
        )

    Fa = np.asarray(F, dtype=float)
    if Fa.ndim == 1:
        Fa = Fa[:, None]
    if Fa.ndim == 2:
        Fa = np.broadcast_to(Fa, (B, *Fa.shape))
    if Fa.shape[:2] != (B, n):
        raise ValueError(f"F must have shape ({n}, m) or ({B}, {n}, m), got {np.shape(F)}")
    m = Fa.shape[2]
    Ft = np.array(Fa, dtype=float, copy=True)
    if q is not None:
        qa = np.asarray(q, dtype=float)
        if qa.ndim == 1:
            qa = qa[:, None]
        qa = np.broadcast_to(qa, (B, n_e, m))
        fe = uniform_load(qa, L[None, :, None])  # (B, n_e, m, 4)
        for a in range(4):
            Ft[:, a : a + 2 * n_e : 2] += fe[..., a]
    rhs = s[:, :, None] * Ft
    rhs[:, rigid] = 0.0
    u = s[:, :, None] * solve_banded_batch(Lb, rhs)

    # Reactions: K_shaft u - F at rigid DOFs, -k u at springs.
    Ku = ab_shaft[:, u_band, :, None] * u
    for d in range(1, u_band + 1):
        off = ab_shaft[:, u_band - d, d:, None]
        Ku[:, :-d] += off * u[:, d:]
        Ku[:, d:] += off * u[:, :-d]
    rigid_r = Ku - Ft
    reac = np.zeros((B, len(sups), 2, m))
    for j, sup in enumerate(sups):
        for c, (dof, k) in enumerate(
            ((2 * sup.node, sup.k_t_N_mm), (2 * sup.node + 1, sup.k_r_Nmm_rad or 0.0))
        ):
            reac[:, j, c] = rigid_r[:, dof] if math.isinf(k) else -k * u[:, dof]
    return BatchSolution(u=u, reactions=reac, min_pivot=min_piv)
