"""Nonlinear bearing stiffness in the shaft solve (``solver: {bearing_stiffness:
nonlinear}``). Units: N, mm, N*mm, rad.

Every bearing of a shaft with an interior (:mod:`shaftsys.bearings.interior`) becomes a
nonlinear support: the force it puts on the shaft is minus the load vector
``f(u)`` of its rolling elements at the inner-ring displacement ``u = (uy, uz, ux,
theta_y, theta_z)`` of the shaft node it sits on (the outer ring aligned and held by the
housing). The other supports stay as typed (rigid, or linear springs).

Method (per shaft, vectorised over the cases):

1. The shaft is linear: its bending stiffness in both planes and, when the axial
   arrangement is solved by compatibility, its axial bar stiffness are condensed
   (Schur complement, one sparse LU factorisation per shaft) onto the degrees of
   freedom of the nonlinear bearings' nodes: ``Kc q + sum_b T_b' f_b(T_b q) = Fc``.
2. Newton's method on this small system, all cases at once: the tangent is
   ``Kc + sum_b T_b' K_b T_b`` with the bearings' analytic 5 x 5 tangent stiffness
   (radial in both planes, axial, tilt); a step limit (a tenth of the element diameter)
   and a backtracking line search on the out-of-balance force keep it robust where
   elements lift off or a clearance opens. It starts from each bearing's own
   displacement under its rigid-support reaction and the rigid shaft's slope.
3. Converged when the largest out-of-balance force at the bearing degrees of freedom
   (moments divided by the largest raceway radius) is at most
   ``solver.nonlinear_tolerance`` times the largest load; otherwise
   :class:`~shaftsys.errors.NumericalError` (exit 3) naming shaft, case and residual.
4. Axial: when every bearing that locates (``axial`` not ``float``) has an interior
   whose rows take thrust (an ``axial: both`` bearing or both bearings of an adjusted
   ``pair``), the shaft's axial displacement is an unknown shared by them
   (displacement compatibility; a pair's preload is each bearing's axial interference,
   set so that with no external load each carries the preload) and floating bearings
   carry no thrust. Otherwise the axial rule of :mod:`shaftsys.bearings.axial` gives the
   thrust of every bearing from the radial loads; the Newton solve is repeated with the
   rule's thrusts of the converged radial loads until they settle (``axial_passes``).

The reactions handed on are the shaft-side ones, ``K u - F`` at the support degrees of
freedom (so the equilibrium proof of the solve holds to round-off); they differ from the
element-load sums by at most the reported residual.

Limits: rigid rings and housing, aligned outer rings, no centrifugal or gyroscopic
element forces, no fit or temperature change of the clearance; shafts joined by a
bearing between them keep their typed supports.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import Any

import numpy as np
from numpy.typing import NDArray

from shaftsys.bearings.axial import axial_reactions
from shaftsys.bearings.interior import (
    RowGeometry,
    distribution,
    row_geometries,
    solve_displacement,
)
from shaftsys.errors import NumericalError
from shaftsys.model import AxialRole, Bearing, BearingKind, Shaft

FloatArray = NDArray[np.float64]

#: Sign of each bearing displacement component against the shaft's degrees of freedom:
#: (uy, uz, ux, theta_y, theta_z) against (v, w, ux, dw/dx, dv/dx); theta_y = -dw/dx.
_SIGN = np.array([1.0, 1.0, 1.0, -1.0, 1.0])
#: Newton steps of each bearing alone for the start (a start, not a solution).
START_ITERATIONS = 8
#: Most passes of the axial rule around the Newton solve (rule mode).
MAX_AXIAL_PASSES = 30


def nonlinear_bearings(shaft: Shaft) -> list[Bearing]:
    """The bearings of ``shaft`` the nonlinear solve models (those with an interior)."""
    return [b for b in shaft.bearings if b.interior is not None
            and b.kind is not BearingKind.THRUST_BALL and b.within is None]


def takes_thrust(rows: list[RowGeometry]) -> bool:
    """The rows carry thrust on their elements (not a cylindrical roller bearing)."""
    return not (rows[0].line and all(r.alpha_deg == 0.0 for r in rows))


def _stribeck_start(rows: list[RowGeometry], F: FloatArray, fixed: NDArray[np.bool_],
                    tilt: FloatArray) -> FloatArray:
    """A start displacement (m, 5) of rows under the loads F (m, 5): the most loaded
    element's approach by Stribeck's Qmax = 5 Fr / (Z cos a) plus half the clearance
    along the radial load, and, for rows with a contact angle, the approach of every
    element sharing the thrust, Fa / (Z sin a), along the thrust; the tilt as given.
    """
    r = rows[0]
    n_rows = len(rows)
    ca = max(math.cos(math.radians(r.alpha_deg)), 1e-3)
    sa = math.sin(math.radians(r.alpha_deg))
    Fr = np.hypot(F[:, 0], F[:, 1])
    d_r = (5.0 * Fr / (n_rows * r.Z * ca) / r.K_N) ** (1.0 / r.n) / ca
    d_r = d_r + 0.5 * r.clearance_mm
    u = np.array(tilt, dtype=np.float64, copy=True)
    with np.errstate(invalid="ignore", divide="ignore"):
        u[:, 0] = np.where(Fr > 0, F[:, 0] / Fr * d_r, 0.0)
        u[:, 1] = np.where(Fr > 0, F[:, 1] / Fr * d_r, 0.0)
    if not fixed[2] and sa > 0.0:
        d_a = (np.abs(F[:, 2]) / (r.Z * sa) / r.K_N) ** (1.0 / r.n) / sa
        u[:, 2] = np.sign(F[:, 2]) * d_a
    return u


@dataclass(frozen=True, eq=False)
class InteriorState:
    """Rows and converged inner-ring displacement (m, 5) of one nonlinear bearing, with
    the solve's iterations and largest residual (for the ``internal`` results).
    """

    rows: tuple[RowGeometry, ...]
    u: FloatArray
    iterations: int
    residual: float


@dataclass(frozen=True, eq=False)
class NonlinearInfo:
    """How the nonlinear solve of one shaft went, per case."""

    bearings: tuple[str, ...]
    axial: str                     # "compatibility" or "axial rule"
    iterations: NDArray[np.int64]  # (m,) Newton iterations (all passes)
    residual: FloatArray           # (m,) final relative out-of-balance
    axial_passes: NDArray[np.int64]
    tolerance: float


@dataclass(frozen=True, eq=False)
class NonlinearSolution:
    """Both bending planes and the axial solution with nonlinear bearings.

    ``r_xy``, ``r_xz``: (n_supports, 2, m) reactions on the shaft in the order of the
    rigid solve's supports; ``axial_on_shaft``: axial force each bearing puts on the
    shaft (m,) when solved by compatibility, else ``None``; ``ux`` (n, m) the axial
    displacement then.
    """

    u_xy: FloatArray
    u_xz: FloatArray
    r_xy: FloatArray
    r_xz: FloatArray
    nodal_residual: FloatArray
    axial_on_shaft: dict[str, FloatArray] | None
    ux: FloatArray | None
    info: NonlinearInfo
    states: dict[str, InteriorState]


def _band_to_sparse(ab: FloatArray) -> Any:
    """Symmetric matrix of LAPACK upper band storage (4, N) (half-bandwidth 3)."""
    import scipy.sparse as sp

    diags = [ab[3]]
    offsets = [0]
    for d in (1, 2, 3):
        diags += [ab[3 - d, d:], ab[3 - d, d:]]
        offsets += [d, -d]
    return sp.diags(diags, offsets, format="csc")


def _bar_sparse(EA_N: FloatArray, L_mm: FloatArray) -> Any:
    """Stiffness of the axial bar (EA/L per element), free at both ends."""
    import scipy.sparse as sp

    k = EA_N / L_mm
    n = k.size + 1
    main = np.zeros(n)
    main[:-1] += k
    main[1:] += k
    return sp.diags([main, -k, -k], [0, 1, -1], format="csc")


def _pair_rows(shaft: Shaft, nodes: dict[str, int], mesh: Any,
               rows: dict[str, list[RowGeometry]]) -> dict[str, list[RowGeometry]]:
    """Rows of a preloaded pair at separate seats, each pushed axially so that with no
    external load each bearing carries the preload: its own axial approach under the
    preload plus half the shaft's elastic shortening between the seats (P sum L/EA).
    """
    out = dict(rows)
    done: set[str] = set()
    for b in shaft.bearings:
        if b.pair is None or b.id in done or b.id not in rows or b.pair not in rows:
            continue
        partner = next(p for p in shaft.bearings if p.id == b.pair)
        done |= {b.id, partner.id}
        P = next((x.interior.preload_N for x in (b, partner)
                  if x.interior is not None and x.interior.preload_N), None)
        if not P:
            continue
        i, j = sorted((nodes[b.id], nodes[partner.id]))
        flex = float(np.sum(mesh.L_mm[i:j] / mesh.EA_N[i:j]))
        for x in (b, partner):
            r0 = rows[x.id][0]
            u, _, _ = solve_displacement([r0], np.array([[0.0, 0.0, r0.side * P, 0.0, 0.0]]),
                                         np.array([False, False, False, True, True]))
            shift = abs(float(u[0, 2])) + 0.5 * P * flex
            out[x.id] = [replace(r, preload_mm=shift) for r in rows[x.id]]
    return out


def solve_nonlinear(shaft: Shaft, mesh: Any, bearing_nodes: dict[str, int], rigid: Any,
                    fx_nodal: FloatArray, case_ids: list[str], tol: float,
                    max_iter: int) -> NonlinearSolution:
    """The bending (and, by compatibility, axial) solution of ``shaft`` with its
    nonlinear bearings, every case at once (``rigid``: the rigid-support
    ``BendingSolution`` of the same mesh and loads; ``fx_nodal`` (n, m): nodal axial
    loads [N], shaft weight included).

    Raises NumericalError when a case does not converge in ``max_iter`` iterations.
    """
    import scipy.sparse as sp
    from scipy.sparse.linalg import splu

    from shaftsys.fe.solve import Support, banded_matmul, planar_support_dofs

    n = int(mesh.n_nodes)
    xy, xz = rigid.xy, rigid.xz
    m = rigid.F_xy.shape[1]
    Ft_xy = rigid.F_xy.copy()
    Ft_xz = rigid.F_xz.copy()
    if rigid.q_y is not None:
        Ft_xy += xy.load_vector(np.repeat(rigid.q_y[:, None], m, axis=1))
    if rigid.q_z is not None:
        Ft_xz += xz.load_vector(np.repeat(rigid.q_z[:, None], m, axis=1))
    nl = nonlinear_bearings(shaft)
    nl_ids = {b.id for b in nl}
    rows = {b.id: row_geometries(b) for b in nl}
    locating = [b for b in shaft.bearings if b.axial is not AxialRole.FLOAT]
    compat = bool(locating) and all(b.id in nl_ids and takes_thrust(rows[b.id])
                                    for b in locating)
    if compat:
        rows = _pair_rows(shaft, bearing_nodes, mesh, rows)
    # --- the linear shaft: stiffness, fixed dofs of the typed supports, loads
    typed = [Support(bearing_nodes[b.id], b.radial_stiffness_N_mm or math.inf,
                     b.tilt_stiffness_Nmm_rad)
             for b in shaft.bearings if b.kind is not BearingKind.THRUST_BALL
             and b.id not in nl_ids]
    _, rigid_mask, springs = planar_support_dofs(typed, n, f"shaft '{shaft.id}'")
    blocks = [_band_to_sparse(xy.ab) + sp.diags(springs),
              _band_to_sparse(xz.ab) + sp.diags(springs)]
    fixed = [rigid_mask, rigid_mask]
    loads = [Ft_xy, Ft_xz]
    if compat:
        blocks.append(_bar_sparse(mesh.EA_N, mesh.L_mm))
        fixed.append(np.zeros(n, dtype=bool))
        loads.append(fx_nodal)
    K = sp.block_diag(blocks, format="csc")
    F = np.vstack(loads)
    is_fixed = np.concatenate(fixed)
    n_sys = K.shape[0]
    # --- bearing dofs: the condensed unknowns, then one axial unknown per bearing
    # whose thrust is given (floating, or by the rule)
    B: list[int] = []
    pos: dict[int, int] = {}

    def add(dof: int) -> int:
        if dof not in pos:
            pos[dof] = len(B)
            B.append(dof)
        return pos[dof]

    maps: list[tuple[Bearing, NDArray[np.int64]]] = []
    extra: list[Bearing] = []
    for b in nl:
        i = bearing_nodes[b.id]
        dofs = [add(2 * i), add(2 * n + 2 * i), -1, add(2 * n + 2 * i + 1), add(2 * i + 1)]
        if compat and b.axial is not AxialRole.FLOAT:
            dofs[2] = add(4 * n + i)
        elif takes_thrust(rows[b.id]):
            dofs[2] = -(len(extra) + 2)     # placeholder, resolved below
            extra.append(b)
        maps.append((b, np.array(dofs)))
    nB = len(B)
    maps = [(b, np.where(idx <= -2, nB + (-idx - 2), idx)) for b, idx in maps]
    nq = nB + len(extra)
    Barr = np.array(B, dtype=np.int64)
    in_B = np.zeros(n_sys, dtype=bool)
    in_B[Barr] = True
    Iarr = np.flatnonzero(~is_fixed & ~in_B)
    K_II = K[Iarr][:, Iarr].tocsc()
    K_IB = K[Iarr][:, Barr].toarray()
    K_BB = K[Barr][:, Barr].toarray()
    X = np.zeros((0, nB))
    Y = np.zeros((0, m))
    try:
        if Iarr.size:
            lu = splu(K_II)
            X = lu.solve(K_IB)
            Y = lu.solve(F[Iarr])
    except RuntimeError as exc:  # a singular interior: the shaft is not held
        raise NumericalError(f"shaft '{shaft.id}': the shaft between its bearings cannot "
                             f"be condensed onto them for the nonlinear bearing solve "
                             f"({exc})") from None
    Kc = K_BB - K_IB.T @ X
    Kc = 0.5 * (Kc + Kc.T)
    Kq = np.zeros((nq, nq))
    Kq[:nB, :nB] = Kc
    Fq = np.zeros((m, nq))
    Fq[:, :nB] = (F[Barr] - K_IB.T @ Y).T
    R_ref = max(r.R_mm for rs in rows.values() for r in rs)
    Dw = min(r.Dw_mm for rs in rows.values() for r in rs)
    rot = np.zeros(nq, dtype=bool)
    rot[:nB] = [(d < 4 * n) and (d % 2 == 1) for d in B]
    sc = np.where(rot, 1.0 / R_ref, 1.0)
    limit = np.where(rot, 0.1 * Dw / R_ref, 0.1 * Dw)

    def bearing_u(q: FloatArray, idx: NDArray[np.int64]) -> FloatArray:
        u = np.zeros((q.shape[0], 5))
        ok = idx >= 0
        u[:, ok] = q[:, idx[ok]] * _SIGN[ok]
        return u

    def evaluate(q: FloatArray) -> tuple[FloatArray, FloatArray, dict[str, FloatArray]]:
        g = q @ Kq - Fq
        J = np.repeat(Kq[None], q.shape[0], axis=0)
        forces: dict[str, FloatArray] = {}
        for b, idx in maps:
            u = bearing_u(q, idx)
            f = np.zeros((q.shape[0], 5))
            Kb = np.zeros((q.shape[0], 5, 5))
            for r in rows[b.id]:
                d = distribution(r, u)
                f += d.f
                Kb += d.K
            forces[b.id] = f
            ok = np.flatnonzero(idx >= 0)
            iv = idx[ok]
            sv = _SIGN[ok]
            g[:, iv] += f[:, ok] * sv
            J[:, iv[:, None], iv[None, :]] += Kb[:, ok][:, :, ok] * np.outer(sv, sv)
        return g, J, forces

    # --- start: each bearing alone under its rigid-support reaction, at the rigid slope
    Ka = fx_nodal.sum(axis=0)
    Fr_rigid = {}
    for b in shaft.bearings:
        if b.id in rigid.support_index:
            r = np.array([rigid.reaction(b.id, k) for k in range(m)])
            Fr_rigid[b.id] = np.hypot(r[:, 0], r[:, 1])
        else:
            Fr_rigid[b.id] = np.zeros(m)
    on_shaft, _ = axial_reactions(shaft.bearings, Ka, Fr_rigid)
    scale5 = np.array([1.0, 1.0, 1.0, 1.0 / R_ref, 1.0 / R_ref])
    starts: list[tuple[Bearing, NDArray[np.int64], FloatArray, FloatArray, NDArray[np.bool_]]]
    starts = []
    f_ref = np.zeros(m)
    for b, idx in maps:
        node = bearing_nodes[b.id]
        r = np.array([rigid.reaction(b.id, k) for k in range(m)])
        F0 = np.column_stack([-r[:, 0], -r[:, 1],
                              -np.broadcast_to(on_shaft[b.id], (m,)), np.zeros(m),
                              np.zeros(m)])
        f_ref = np.maximum(f_ref, np.abs(F0 * scale5).max(axis=1))
        # a preload loads the bearing with no external load
        f_mounted = sum(distribution(r_, np.zeros((1, 5))).f for r_ in rows[b.id])
        f_ref = np.maximum(f_ref, float(np.abs(f_mounted * scale5).max()))
        tilt = np.zeros((m, 5))
        tilt[:, 3] = -rigid.u_xz[2 * node + 1]
        tilt[:, 4] = rigid.u_xy[2 * node + 1]
        # a preloaded pair starts where it was mounted (axial 0): each bearing alone
        # under the rule's thrust would start from a lifted-off ring
        preloaded = any(r_.preload_mm > 0.0 for r_ in rows[b.id]) and b.pair is not None
        fix = np.array([False, False, idx[2] < 0 or preloaded, True, True])
        if idx[2] < 0 or preloaded:
            F0[:, 2] = 0.0
        starts.append((b, idx, F0, tilt, fix))

    def start(alone: bool) -> FloatArray:
        """The start: each bearing's displacement under its rigid-support reaction at
        the rigid slope, by Stribeck's Qmax = 5 Fr / (Z cos a) (and Fa / (Z sin a) for
        thrust; common practice) or, ``alone``, by Newton steps of each bearing alone.
        """
        q = np.zeros((m, nq))
        for b, idx, F0, tilt, fix in starts:
            if alone:
                u0, _, _ = solve_displacement(rows[b.id], F0, fix, tilt, tol=1e-3,
                                              check=False, max_iter=START_ITERATIONS)
            else:
                u0 = _stribeck_start(rows[b.id], F0, fix, tilt)
            ok = idx >= 0
            q[:, idx[ok]] = u0[:, ok] * _SIGN[ok]
        return q

    def targets(forces: dict[str, FloatArray], reac: tuple[FloatArray, FloatArray]
                ) -> FloatArray:
        """Thrust of each extra axial unknown: 0 floating, else the axial rule's."""
        out = np.zeros((m, len(extra)))
        if compat or not extra:
            return out
        Fr = {}
        for b in shaft.bearings:
            j = rigid.support_index.get(b.id)
            Fr[b.id] = (np.zeros(m) if j is None else
                        np.hypot(reac[0][j, 0], reac[1][j, 0]))
        axial, _ = axial_reactions(shaft.bearings, Ka, Fr)
        for e, b in enumerate(extra):
            out[:, e] = -np.broadcast_to(axial[b.id], (m,))
        return out

    def recover(q: FloatArray) -> tuple[FloatArray, FloatArray, FloatArray]:
        U = np.zeros((n_sys, m))
        UB = q[:, :nB].T
        U[Barr] = UB
        if Iarr.size:
            U[Iarr] = Y - X @ UB
        R = K @ U - F
        return U, R, UB

    def support_reactions(U: FloatArray, R: FloatArray) -> tuple[FloatArray, FloatArray]:
        ns = len(rigid.support_index)
        r_xy = np.zeros((ns, 2, m))
        r_xz = np.zeros((ns, 2, m))
        for b in shaft.bearings:
            j = rigid.support_index.get(b.id)
            if j is None:
                continue
            i = bearing_nodes[b.id]
            for off, r_out in ((0, r_xy), (2 * n, r_xz)):
                for c in (0, 1):
                    dof = off + 2 * i + c
                    r_out[j, c] = R[dof] - springs[2 * i + c] * U[dof]
        return r_xy, r_xz

    ref = np.maximum(np.maximum(np.abs(Fq * sc).max(axis=1, initial=0.0), f_ref), 1e-9)

    def newton(q: FloatArray) -> tuple[FloatArray, FloatArray, NDArray[np.int64],
                                       NDArray[np.int64]]:
        """Newton from ``q`` (passes of the axial rule around it); NumericalError when
        a case does not converge.
        """
        iterations = np.zeros(m, dtype=np.int64)
        passes = np.zeros(m, dtype=np.int64)
        g, J, forces = evaluate(q)
        U, R, _ = recover(q)
        Fq[:, nB:] = targets(forces, support_reactions(U, R))
        change = np.zeros(m)
        for _pass in range(MAX_AXIAL_PASSES):
            g, J, forces = evaluate(q)
            res = np.abs(g * sc).max(axis=1) / ref
            it = 0
            while it < max_iter and np.any(res > tol):
                it += 1
                active = res > tol
                iterations += active
                diag = np.abs(np.diagonal(J, axis1=1, axis2=2)).max(axis=1)
                reg = (1e-12 * diag + 1e-9)[:, None, None] * np.eye(nq)
                step = np.linalg.solve(J + reg, -g[..., None])[..., 0]
                step /= np.maximum(np.abs(step / limit).max(axis=1), 1.0)[:, None]
                lam = np.where(active, 1.0, 0.0)    # converged cases stay where they are
                for _ in range(30):
                    trial = q + lam[:, None] * step
                    gt, Jt, ft = evaluate(trial)
                    rt = np.abs(gt * sc).max(axis=1) / ref
                    better = (rt < res) | ~active
                    if np.all(better):
                        break
                    lam = np.where(better, lam, 0.5 * lam)
                q, g, J, forces = trial, gt, Jt, ft
                res = np.abs(g * sc).max(axis=1) / ref
            bad = np.flatnonzero(~(res <= tol))
            if bad.size:
                k = (int(bad[np.argmax(res[bad])]) if np.all(np.isfinite(res[bad]))
                     else int(bad[0]))
                raise NumericalError(
                    f"shaft '{shaft.id}', case '{case_ids[k]}': the nonlinear bearing solve "
                    f"did not converge in {it} Newton iterations (residual {res[k]:.3g}: "
                    f"the largest out-of-balance force at the bearings relative to the "
                    f"largest load; tolerance {tol:.2g}): look for a bearing with a large "
                    "clearance or no load in this case, or raise "
                    "solver.nonlinear_max_iterations")
            passes += 1
            U, R, _ = recover(q)
            new = targets(forces, support_reactions(U, R))
            change = np.abs(new - Fq[:, nB:]).max(axis=1, initial=0.0) / ref
            Fq[:, nB:] = new
            if not np.any(change > tol):
                return q, res, iterations, passes
        k = int(np.argmax(change))
        raise NumericalError(
            f"shaft '{shaft.id}', case '{case_ids[k]}': the thrusts of the axial rule did "
            f"not settle with the nonlinear bearings in {MAX_AXIAL_PASSES} passes (last "
            f"change {change[k]:.3g} of the load)")

    try:   # the cheap start first; each bearing solved alone when that fails
        q, res, iterations, passes = newton(start(alone=False))
    except NumericalError:
        q, res, iterations, passes = newton(start(alone=True))
    U, R, _ = recover(q)
    r_xy, r_xz = support_reactions(U, R)
    u_xy, u_xz = U[:2 * n], U[2 * n:4 * n]
    # backward error of the shaft's nodal balance (the support dofs hold the reactions)
    nodal = np.zeros(m)
    support_dofs = np.zeros(2 * n, dtype=bool)
    for b in shaft.bearings:
        if b.id in rigid.support_index:
            support_dofs[2 * bearing_nodes[b.id]:2 * bearing_nodes[b.id] + 2] = True
    for plane, u, Ft in ((xy, u_xy, Ft_xy), (xz, u_xz, Ft_xz)):
        r = banded_matmul(plane.ab, u) - Ft
        r[support_dofs] = 0.0
        scale = (np.linalg.norm(Ft, axis=0)
                 + np.linalg.norm(banded_matmul(np.abs(plane.ab), np.abs(u)), axis=0))
        nodal = np.maximum(nodal, np.linalg.norm(r, axis=0)
                           / np.maximum(scale, np.finfo(float).tiny))
    axial_on_shaft = ux = None
    if compat:
        ux = U[4 * n:]
        axial_on_shaft = {b.id: R[4 * n + bearing_nodes[b.id]] for b in locating}
    states = {b.id: InteriorState(tuple(rows[b.id]), bearing_u(q, idx), int(iterations.max()),
                                  float(res.max())) for b, idx in maps}
    info = NonlinearInfo(tuple(b.id for b in nl), "compatibility" if compat else "axial rule",
                         iterations, res, passes, tol)
    return NonlinearSolution(u_xy, u_xz, r_xy, r_xz, nodal, axial_on_shaft, ux, info, states)
