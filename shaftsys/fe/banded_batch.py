"""Planar bending of many shaft variants at once (design studies).

Units: as :mod:`shaftsys.fe.solve` -- mm, N, N*mm, rad, N/mm, N*mm/rad, N*mm^2.

All variants share the node positions, the supports and the load layout; their element
rigidities differ (e.g. diameters varied by a study). One Python loop runs over the DOFs
(a few hundred), every operation inside it works on all variants together, so the cost
per variant is a few hundred floating-point operations instead of a few hundred
microseconds of interpreter overhead per :class:`~shaftsys.fe.solve.PlanarBending`.

The algebra is the same as in :mod:`shaftsys.fe.solve`: banded assembly, exact
elimination of rigid DOFs (identity rows) and Jacobi scaling to unit diagonal by the
same function (:func:`~shaftsys.fe.solve.supported_scaled_band`), then a banded
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
from shaftsys.fe.solve import (
    DEFAULT_PIVOT_TOL,
    Support,
    check_planar_mechanism,
    planar_support_dofs,
    supported_scaled_band,
)

__all__ = [
    "CHUNK",
    "BatchSolution",
    "cholesky_banded_batch",
    "planar_band",
    "solve_banded_batch",
    "solve_planar_batch",
    "solve_supported_band",
]

Array = NDArray[np.float64]


def planar_band(EI: Array, L: Array, Phi: Array | float) -> Array:
    """Upper band (4, 2n, B) of the shaft stiffness; EI, Phi (n_e, B), L (n_e, 1) or
    (n_e, B) (one length per element and variant).
    """
    n_e, B = EI.shape
    c = EI / ((1.0 + Phi) * L**3)
    k00 = 12.0 * c
    k01 = 6.0 * c * L
    k11 = (4.0 + Phi) * c * L * L
    k13 = (2.0 - Phi) * c * L * L
    ab = np.zeros((4, 2 * (n_e + 1), B))
    stop = 2 * n_e
    ab[3, 0:stop:2] += k00  # (0, 0)
    ab[2, 1 : stop + 1 : 2] += k01  # (0, 1)
    ab[1, 2 : stop + 2 : 2] -= k00  # (0, 2)
    ab[0, 3 : stop + 3 : 2] += k01  # (0, 3)
    ab[3, 1 : stop + 1 : 2] += k11  # (1, 1)
    ab[2, 2 : stop + 2 : 2] -= k01  # (1, 2)
    ab[1, 3 : stop + 3 : 2] += k13  # (1, 3)
    ab[3, 2 : stop + 2 : 2] += k00  # (2, 2)
    ab[2, 3 : stop + 3 : 2] -= k01  # (2, 3)
    ab[3, 3 : stop + 3 : 2] += k11  # (3, 3)
    return ab


def cholesky_banded_batch(ab: Array) -> Array:
    """Cholesky factors of a stack of SPD band matrices (no pivot check).

    Parameters
    ----------
    ab:
        Upper band storage with the variants LAST, shape (u+1, n, B):
        ``ab[u + i - j, j, b] = A_b[i, j]``.

    Returns
    -------
    numpy.ndarray
        Lower band storage of L, shape (u+1, n, B): ``Lb[d, j, b] = L_b[j + d, j]``
        (A = L L^T). A non-positive pivot gives NaN in that variant's factor.
    """
    p, n, B = ab.shape
    u = p - 1
    Lb = np.zeros_like(ab)
    # Window W[r, c, b] = Schur complement entry (j + r, j + c), r, c = 0..u.
    W = np.zeros((p, p, B))
    for r in range(p):
        for c in range(r, p):
            if c < n:
                W[r, c] = ab[u - (c - r), c]
                W[c, r] = W[r, c]
            elif r == c:
                W[r, c] = 1.0  # padding beyond the matrix end
    # the next window is written into a second buffer (no temporaries; the same
    # operations on the same values, so the same bits)
    W2 = np.empty_like(W)
    outer = np.empty((u, u, B))
    with np.errstate(invalid="ignore", divide="ignore"):
        for j in range(n):
            piv = np.sqrt(W[0, 0], out=Lb[0, j])
            col = np.divide(W[1:, 0], piv, out=Lb[1:, j])
            np.multiply(col[:, None], col[None, :], out=outer)
            np.subtract(W[1:, 1:], outer, out=W2[:u, :u])
            W, W2 = W2, W
            nxt = j + p  # the DOF entering the window
            if nxt < n:
                W[:, u] = ab[:, nxt]  # A[nxt - u + r, nxt] for r = 0..u
                W[u, :] = ab[:, nxt]
            else:
                W[:, u] = 0.0
                W[u, :] = 0.0
                W[u, u] = 1.0
    for d in range(1, p):
        Lb[d, n - d :] = 0.0  # entries past the matrix end
    return Lb


def solve_banded_batch(Lb: Array, b: Array, *, overwrite_b: bool = False) -> Array:
    """Solve L L^T x = b for a stack of band Cholesky factors.

    Parameters
    ----------
    Lb:
        Factors from :func:`cholesky_banded_batch`, shape (u+1, n, B).
    b:
        Right-hand sides, shape (n, m, B).
    overwrite_b:
        Solve in ``b`` itself (a float64 array the caller no longer needs) instead of a
        copy; the same operations, so the same bits.

    Returns
    -------
    numpy.ndarray
        x, shape (n, m, B) (``b`` itself with ``overwrite_b``).
    """
    p, n, _ = Lb.shape
    y = b if overwrite_b and b.dtype == np.float64 else np.array(b, dtype=float, copy=True)
    u = p - 1
    term = np.empty((u, *y.shape[1:]))   # L[j + d, j] times a row, d = 1..k
    acc = np.empty(y.shape[1:])
    for j in range(n):  # forward: L y = b (y[j + d] -= L[j + d, j] y[j], in place)
        y[j] /= Lb[0, j]
        k = min(u, n - 1 - j)
        if k:
            t = np.multiply(Lb[1 : 1 + k, j][:, None, :], y[j][None], out=term[:k])
            y[j + 1 : j + 1 + k] -= t
    for j in range(n - 1, -1, -1):  # backward: L^T x = y
        k = min(u, n - 1 - j)
        if k:   # sum over d = 1..k in that order, the products in one pass
            t = np.multiply(Lb[1 : 1 + k, j][:, None, :], y[j + 1 : j + 1 + k], out=term[:k])
            if k == 1:
                y[j] -= t[0]
            else:
                np.add(t[0], t[1], out=acc)
                for d in range(2, k):
                    acc += t[d]
                y[j] -= acc
        y[j] /= Lb[0, j]
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


#: Variants handled per chunk (keeps the working set in cache).
CHUNK = 2048


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
        Optional uniform transverse load per element [N/mm], shape (n - 1, m) shared or
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
        The supports leave a rigid-body motion free (checked once, the message names
        the direction), or some variants' factorisation fails (the message lists them).
    """
    x = np.asarray(x_mm, dtype=float)
    L = np.diff(x)
    EI = np.atleast_2d(np.asarray(EI_Nmm2, dtype=float))
    B, n_e = EI.shape
    if n_e != L.size:
        raise ValueError(f"EI_Nmm2 must have shape (B, {L.size}), got {EI.shape}")
    kGA = None if kGA_N is None else np.broadcast_to(np.asarray(kGA_N, dtype=float), EI.shape)
    sups, rigid, springs = planar_support_dofs(supports, x.size, label)
    check_planar_mechanism(sups, x, label)  # once: topology is shared by all variants
    n = 2 * x.size
    Fa = np.asarray(F, dtype=float)
    if Fa.ndim == 1:
        Fa = Fa[:, None]
    shared_F = Fa.ndim == 2
    if (shared_F and Fa.shape[0] != n) or (not shared_F and Fa.shape[:2] != (B, n)):
        raise ValueError(f"F must have shape ({n}, m) or ({B}, {n}, m), got {np.shape(F)}")
    m = Fa.shape[-1]
    qa = None if q is None else np.asarray(q, dtype=float)
    if qa is not None and qa.ndim == 1:
        qa = qa[:, None]

    u_out = np.empty((B, n, m))
    r_out = np.empty((B, len(sups), 2, m))
    piv_out = np.empty(B)
    bad: list[int] = []
    for lo in range(0, B, CHUNK):
        hi = min(B, lo + CHUNK)
        EIc = EI[lo:hi].T  # (n_e, b)
        Phi = 0.0 if kGA is None else 12.0 * EIc / (kGA[lo:hi].T * L[:, None] ** 2)
        ab_shaft = planar_band(EIc, L[:, None], Phi)  # (4, n, b)
        Ft = np.array(
            np.broadcast_to(Fa[:, :, None], (n, m, hi - lo))
            if shared_F
            else np.moveaxis(Fa[lo:hi], 0, -1),
            dtype=float,
        )  # (n, m, b)
        if qa is not None:
            qc = qa[:, :, None] if qa.ndim == 2 else np.moveaxis(qa[lo:hi], 0, -1)
            qL = 0.5 * qc * L[:, None, None]  # (n_e, m, b) or (n_e, m, 1)
            qL2 = qc * (L**2 / 12.0)[:, None, None]
            Ft[0 : 2 * n_e : 2] += qL
            Ft[1 : 2 * n_e : 2] += qL2
            Ft[2 : 2 * n_e + 2 : 2] += qL
            Ft[3 : 2 * n_e + 3 : 2] -= qL2
        u_c, min_piv = solve_supported_band(ab_shaft, rigid, springs, Ft)
        piv_out[lo:hi] = min_piv
        bad.extend((lo + np.flatnonzero(~(min_piv >= pivot_tol))).tolist())
        # Reactions: K_shaft u - F at rigid DOFs, -k u at springs.
        Ku = ab_shaft[3][:, None, :] * u_c
        for d in range(1, 4):
            off = ab_shaft[3 - d, d:][:, None, :]
            Ku[:-d] += off * u_c[d:]
            Ku[d:] += off * u_c[:-d]
        rigid_r = Ku - Ft
        for j, sup in enumerate(sups):
            for c, (dof, k) in enumerate(
                ((2 * sup.node, sup.k_t_N_mm), (2 * sup.node + 1, sup.k_r_Nmm_rad or 0.0))
            ):
                val = rigid_r[dof] if math.isinf(k) else -k * u_c[dof]
                r_out[lo:hi, j, c] = val.T
        u_out[lo:hi] = np.moveaxis(u_c, -1, 0)
    if bad:
        raise NumericalError(
            f"{label}: stiffness not positive definite or (nearly) a mechanism in "
            f"{len(bad)} variant(s), e.g. {bad[:10]}"
        )
    return BatchSolution(u=u_out, reactions=r_out, min_pivot=piv_out)


def solve_supported_band(
    ab_shaft: Array, rigid: NDArray[np.bool_], springs: Array, F: Array
) -> tuple[Array, Array]:
    """Solve K u = F for a stack of supported band stiffnesses (the one batched solve).

    Supports as :func:`~shaftsys.fe.solve.supported_scaled_band` (springs on the
    diagonal, rigid DOFs eliminated, Jacobi scaling), then :func:`cholesky_banded_batch`
    and :func:`solve_banded_batch`. Used by :func:`solve_planar_batch` and the design
    study (:mod:`shaftsys.study.batched`).

    Parameters
    ----------
    ab_shaft:
        Upper band of the shaft stiffness (no supports), shape (u+1, n, B) [N/mm,
        N, N*mm/rad]; not modified.
    rigid:
        Shape (n,): DOFs held rigidly (shared by all variants).
    springs:
        Shape (n,): diagonal spring stiffness [N/mm at even, N*mm/rad at odd DOFs].
    F:
        Nodal loads [N, N*mm], shape (n, m, B).

    Returns
    -------
    u : numpy.ndarray
        Displacements [mm, rad], shape (n, m, B), 0 at rigid DOFs.
    min_pivot : numpy.ndarray
        Smallest pivot of the unit-diagonal matrix per variant [-], shape (B,); NaN
        where the factorisation failed (a non-positive diagonal or pivot).
    """
    ab, s = supported_scaled_band(ab_shaft, rigid, springs)
    with np.errstate(invalid="ignore", divide="ignore"):
        Lb = cholesky_banded_batch(ab)
        min_piv = np.min(Lb[0] ** 2, axis=0)
        min_piv[~np.all(np.isfinite(s), axis=0)] = np.nan
        rhs = s[:, None, :] * F
        rhs[rigid] = 0.0
        x = solve_banded_batch(Lb, rhs, overwrite_b=True)
        x *= s[:, None, :]
    return x, min_piv
