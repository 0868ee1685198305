"""Bending of shafts joined by bearings between them (pilot bearings, idlers on pins).

A bearing whose outer ring sits in another shaft (``Bearing.within``) couples the two
shafts' bending: both are solved as one system. Each plane's stiffness is the block
diagonal of the shafts' beam stiffness (the same elements as the single-shaft solver,
:func:`shaftsys.fe.beam.beam_stiffness`), plus springs of elastic supports; rigid
housing supports (u_i = 0) and rigid shaft-to-shaft bearings (u_i - u_j = 0) are
constraints with Lagrange multipliers:

    [ K  C^T ] [u]   [F]
    [ C   0  ] [l] = [0]

factored once (LU) and solved for every case. The force a support puts on a shaft is
-C^T l at its dofs (springs: -k times the relative deflection). Only the radial
directions are coupled: a bearing between shafts carries no axial load and no moment
(unless it has a tilt stiffness), which the model loader enforces.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any

import numpy as np
from numpy.typing import NDArray

from shaftsys.errors import NumericalError
from shaftsys.fe.beam import beam_stiffness, shear_parameter, uniform_load

Array = NDArray[np.float64]

#: Reciprocal condition number below which the coupled system counts as singular.
RCOND_SINGULAR = 1e-14


@dataclass(frozen=True)
class Joint:
    """A support of the coupled system.

    ``a``: (shaft id, node) of the supported shaft; ``b``: (shaft id, node) of the shaft
    holding the outer ring, or ``None`` for the housing. ``k_t``: radial stiffness
    [N/mm] (``inf`` = rigid); ``k_r``: tilt stiffness [N*mm/rad] (``None`` = free).
    """

    bearing_id: str
    a: tuple[str, int]
    b: tuple[str, int] | None
    k_t: float = math.inf
    k_r: float | None = None


@dataclass
class Member:
    """One shaft of a coupled group: its mesh arrays and loads of every case."""

    shaft_id: str
    x_mm: Array
    EI: Array
    kGA: Array | None
    F_xy: Array          # (2n, m): Fy, Mz
    F_xz: Array          # (2n, m): Fz, -My
    q_y: Array | None    # (n_e,) N/mm
    q_z: Array | None
    axial_weight_nodal: Array


@dataclass(eq=False)
class GroupPlane:
    """Solution of one bending plane of a group: displacements and support forces."""

    u: dict[str, Array]                  # shaft -> (2n, m)
    joint_force: dict[str, Array]        # bearing -> (2, m): force, moment on shaft a
    ke: dict[str, Array]                 # shaft -> element matrices (n_e, 4, 4)
    q: dict[str, Array | None]
    residual: Array                      # (m,) backward error
    rcond: float


def _assemble(member: Member, shear: bool) -> tuple[Array, Array]:
    L = np.diff(member.x_mm)
    phi = (shear_parameter(member.EI, member.kGA, L) if shear and member.kGA is not None
           else np.zeros_like(L))
    ke = beam_stiffness(member.EI, L, phi)
    n = member.x_mm.size
    K = np.zeros((2 * n, 2 * n))
    for e in range(L.size):
        K[2 * e:2 * e + 4, 2 * e:2 * e + 4] += ke[e]
    return K, ke


def solve_plane(members: list[Member], joints: list[Joint], plane: str, shear: bool,
                label: str) -> GroupPlane:
    """Solve one plane (``"xy"`` or ``"xz"``) of the coupled group for every case."""
    offsets: dict[str, int] = {}
    total = 0
    for mb in members:
        offsets[mb.shaft_id] = total
        total += 2 * mb.x_mm.size
    m = members[0].F_xy.shape[1]
    K = np.zeros((total, total))
    F = np.zeros((total, m))
    kes: dict[str, Array] = {}
    qs: dict[str, Array | None] = {}
    for mb in members:
        o = offsets[mb.shaft_id]
        Ks, ke = _assemble(mb, shear)
        n2 = Ks.shape[0]
        K[o:o + n2, o:o + n2] = Ks
        kes[mb.shaft_id] = ke
        F[o:o + n2] = mb.F_xy if plane == "xy" else mb.F_xz
        q = mb.q_y if plane == "xy" else mb.q_z
        qs[mb.shaft_id] = q
        if q is not None:
            fe = uniform_load(q, np.diff(mb.x_mm))      # (n_e, 4)
            for e in range(fe.shape[0]):
                F[o + 2 * e:o + 2 * e + 4] += fe[e][:, None]
    K_shaft = K.copy()
    rows: list[Array] = []
    springs: list[tuple[int, int | None, float]] = []
    for j in joints:
        ia = offsets[j.a[0]] + 2 * j.a[1]
        ib = None if j.b is None else offsets[j.b[0]] + 2 * j.b[1]
        for dof_shift, k in ((0, j.k_t), (1, j.k_r or 0.0)):
            a_dof = ia + dof_shift
            b_dof = None if ib is None else ib + dof_shift
            if math.isinf(k):
                row = np.zeros(total)
                row[a_dof] = 1.0
                if b_dof is not None:
                    row[b_dof] = -1.0
                rows.append(row)
            elif k > 0:
                springs.append((a_dof, b_dof, k))
    for a_dof, b_dof, k in springs:
        K[a_dof, a_dof] += k
        if b_dof is not None:
            K[b_dof, b_dof] += k
            K[a_dof, b_dof] -= k
            K[b_dof, a_dof] -= k
    C = np.array(rows) if rows else np.zeros((0, total))
    nc = C.shape[0]
    A = np.block([[K, C.T], [C, np.zeros((nc, nc))]])
    scale = np.sqrt(np.maximum(np.abs(np.diag(A)), 1.0))
    As = A / scale[:, None] / scale[None, :]
    import scipy.linalg  # deferred to the first coupled solve (start-up)

    lu, piv = scipy.linalg.lu_factor(As, check_finite=True)
    rcond = _rcond(As, lu, piv)
    if not rcond > RCOND_SINGULAR:
        raise NumericalError(f"{label}, bending in the {plane[0]}-{plane[1]} plane: the "
                             "shafts joined by bearings between them are not held (the "
                             f"coupled stiffness is singular, reciprocal condition {rcond:.2g});"
                             " add housing supports")
    rhs = np.vstack([F, np.zeros((nc, m))]) / scale[:, None]
    sol = scipy.linalg.lu_solve((lu, piv), rhs) / scale[:, None]
    u_all = sol[:total]
    lam = sol[total:]
    # support forces on the shafts: R = -C^T lambda (rigid) and spring forces
    R = -(C.T @ lam) if nc else np.zeros((total, m))
    joint_force: dict[str, Array] = {}
    r_index = 0
    for j in joints:
        ia = offsets[j.a[0]] + 2 * j.a[1]
        ib = None if j.b is None else offsets[j.b[0]] + 2 * j.b[1]
        out = np.zeros((2, m))
        for dof_shift, k in ((0, j.k_t), (1, j.k_r or 0.0)):
            a_dof = ia + dof_shift
            b_dof = None if ib is None else ib + dof_shift
            if math.isinf(k):
                out[dof_shift] = -lam[r_index]
                r_index += 1
            elif k > 0:
                rel = u_all[a_dof] - (u_all[b_dof] if b_dof is not None else 0.0)
                out[dof_shift] = -k * rel
        joint_force[j.bearing_id] = out
    spring_forces = (K - K_shaft) @ u_all
    residual_abs = np.linalg.norm(K_shaft @ u_all + spring_forces - F - R, axis=0)
    ku = np.linalg.norm(np.abs(K_shaft) @ np.abs(u_all), axis=0)
    residual = residual_abs / np.maximum(np.linalg.norm(F, axis=0) + ku,
                                         np.finfo(float).tiny)
    u = {mb.shaft_id: u_all[offsets[mb.shaft_id]:offsets[mb.shaft_id] + 2 * mb.x_mm.size]
         for mb in members}
    return GroupPlane(u=u, joint_force=joint_force, ke=kes, q=qs, residual=residual,
                      rcond=rcond)


def _rcond(A: Array, lu: Array, piv: Array) -> float:
    """Reciprocal 1-norm condition estimate of A from its LU factors (LAPACK gecon)."""
    import scipy.linalg

    gecon = scipy.linalg.get_lapack_funcs("gecon", (lu,))
    anorm = float(np.abs(A).sum(axis=0).max())
    rc, info = gecon(lu, anorm, norm="1")
    return float(rc) if info == 0 else 0.0


@dataclass(eq=False)
class CoupledBending:
    """One shaft's view of a coupled group solution (same interface as the single-shaft
    bending solution used by :mod:`shaftsys.analysis`).
    """

    shaft_id: str
    x_mm: Array
    xy: GroupPlane
    xz: GroupPlane
    joints: list[Joint]
    joint_x_mm: dict[str, float]
    axial_weight_nodal: Array
    extra: dict[str, Any] = field(default_factory=dict)

    @property
    def condition(self) -> float:
        """1-norm condition estimate of the coupled (scaled) system."""
        return 1.0 / max(min(self.xy.rcond, self.xz.rcond), 1e-300)

    @property
    def nodal_residual(self) -> Array:
        """Backward error of the coupled solve per case."""
        return np.maximum(self.xy.residual, self.xz.residual)

    @property
    def v(self) -> Array:  # noqa: D102
        return self.xy.u[self.shaft_id][0::2]

    @property
    def w(self) -> Array:  # noqa: D102
        return self.xz.u[self.shaft_id][0::2]

    @property
    def v_slope(self) -> Array:  # noqa: D102
        return self.xy.u[self.shaft_id][1::2]

    @property
    def w_slope(self) -> Array:  # noqa: D102
        return self.xz.u[self.shaft_id][1::2]

    def reaction(self, bearing_id: str, k: int) -> tuple[float, float, float, float]:
        """(Fy, Fz, My, Mz) the bearing ``bearing_id`` of THIS shaft puts on it in case k."""
        if bearing_id not in self.xy.joint_force:
            return (0.0, 0.0, 0.0, 0.0)
        rxy = self.xy.joint_force[bearing_id][:, k]
        rxz = self.xz.joint_force[bearing_id][:, k]
        return (float(rxy[0]), float(rxz[0]), float(-rxz[1]), float(rxy[1]))

    def external(self, k: int) -> list[tuple[str, float, tuple[float, float, float],
                                              tuple[float, float, float]]]:
        """Forces that bearings of OTHER shafts put on this one (outer rings held here):
        (bearing id, station [mm], force [N], moment [N*mm]) in this shaft's frame.
        """
        out = []
        for j in self.joints:
            if j.b is not None and j.b[0] == self.shaft_id:
                fy, fz, my, mz = (-v for v in self._on_a(j.bearing_id, k))
                out.append((j.bearing_id, self.joint_x_mm[j.bearing_id], (0.0, fy, fz),
                            (0.0, my, mz)))
        return out

    def _on_a(self, bearing_id: str, k: int) -> tuple[float, float, float, float]:
        rxy = self.xy.joint_force[bearing_id][:, k]
        rxz = self.xz.joint_force[bearing_id][:, k]
        return (float(rxy[0]), float(rxz[0]), float(-rxz[1]), float(rxy[1]))

    def internal(self, k: int) -> tuple[Array, ...]:
        """Stations and (Vy, Mz, Vz, My) at both ends of every element in case k."""
        x = self.x_mm
        stations = np.column_stack([x[:-1], x[1:]]).ravel()
        qy, mzz = self._plane_internal(self.xy, k)
        qz, mxz = self._plane_internal(self.xz, k)
        return stations, qy, mzz, qz, -mxz

    def _plane_internal(self, plane: GroupPlane, k: int) -> tuple[Array, Array]:
        u = plane.u[self.shaft_id][:, k]
        ke = plane.ke[self.shaft_id]
        n_e = ke.shape[0]
        idx = 2 * np.arange(n_e)[:, None] + np.arange(4)
        fe = np.einsum("eab,eb->ea", ke, u[idx])
        q = plane.q[self.shaft_id]
        if q is not None:
            fe = fe - uniform_load(q, np.diff(self.x_mm))
        Q = np.column_stack([-fe[:, 0], fe[:, 2]]).ravel()
        M = np.column_stack([-fe[:, 1], fe[:, 3]]).ravel()
        return Q, M
