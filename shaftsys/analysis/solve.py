"""The solve: mesh each shaft, factor its bending stiffness once, solve every case as a
right-hand side, apply the axial arrangement rule, integrate axial force and torque,
and prove equilibrium. Units: N, mm, N*mm, rad, rpm.

Axial and torsion are bars held at one node each: statically determinate once the
axial rule of the case has decided which bearing carries how much thrust, so they are
solved per case by integration from that node. Shafts joined by bearings between them
are solved as one coupled bending system (:mod:`shaftsys.machine.coupled`).
"""

from __future__ import annotations

import logging
import math
from dataclasses import dataclass, field, replace
from typing import TYPE_CHECKING, Any

import numpy as np
from numpy.typing import NDArray

from shaftsys.analysis.element_forces import element_loads, shaft_speed, vec3
from shaftsys.analysis.nonlinear import NonlinearSolution, nonlinear_bearings, solve_nonlinear
from shaftsys.analysis.results import (
    AppliedLoad,
    BearingCaseLoad,
    BearingResult,
    CaseSolution,
    ShaftResult,
)
from shaftsys.bearings.axial import axial_reactions
from shaftsys.errors import ModelError, NumericalError
from shaftsys.fe.balance import global_balance
from shaftsys.fe.mesh import MAX_ELEMENTS as MAX_ELEMENTS  # noqa: PLC0414 (re-export)
from shaftsys.fe.mesh import STATION_SNAP_MM as STATION_SNAP_MM  # noqa: PLC0414 (re-export)
from shaftsys.fe.mesh import BeamMesh, Steps, build_mesh, snap_stations
from shaftsys.model import AxialRole, BearingKind, Case, Model, Shaft
from shaftsys.units import DENSITY_KG_PER_MM3

if TYPE_CHECKING:
    from shaftsys.machine.flow import CaseFlow

log = logging.getLogger(__name__)

#: Round-off allowance of the global force and moment balance: the reactions are
#: computed from the solution, whose relative error grows like eps * condition number,
#: so the accepted relative residual is
#: max(tolerance, min(ROUNDOFF_FACTOR * eps * cond, MAX_ROUNDOFF_RESIDUAL)).
ROUNDOFF_FACTOR = 1000.0
#: Largest relative residual round-off may excuse (bearing loads to about four digits);
#: beyond it the system is too ill-conditioned to trust (NumericalError, exit 3).
MAX_ROUNDOFF_RESIDUAL = 1e-4



@dataclass(frozen=True, eq=False)
class ShaftMesh:
    """A meshed shaft: the beam mesh and the node of every bearing and element."""

    mesh: BeamMesh
    bearing_nodes: dict[str, int]
    element_nodes: dict[str, int]
    extra_nodes: tuple[int, ...] = ()


def mesh_shaft(shaft: Shaft, max_element_mm: float,
               extra_stations_mm: Any = ()) -> ShaftMesh:
    """Mesh ``shaft`` with nodes at every step edge, bearing pressure centre and element.

    Stations within :data:`STATION_SNAP_MM` of a step edge or of another station share
    its node (:func:`snap_stations`).
    """
    if not shaft.length_mm / max_element_mm <= MAX_ELEMENTS:
        raise ModelError(
            f"shaft '{shaft.id}' ({shaft.length_mm:g} mm long) would need "
            f"{shaft.length_mm / max_element_mm:.3g} beam elements of at most "
            f"{max_element_mm:g} mm; shaftsys meshes a shaft into at most {MAX_ELEMENTS}",
            line=shaft.line, field=f"shafts[{shaft.id}].steps",
            expected=f"solver max_element of at least {shaft.length_mm / MAX_ELEMENTS:.3g} mm "
            "or a shorter shaft")
    mat = shaft.material
    n = len(shaft.steps)
    steps = Steps.from_diameters(
        edges_mm=np.asarray(shaft.step_edges_mm),
        d_outer_mm=np.array([s.d_mm for s in shaft.steps]),
        d_bore_mm=np.array([s.bore_mm for s in shaft.steps]),
        E_MPa=np.full(n, mat.E_MPa),
        G_MPa=np.full(n, mat.G_MPa),
        poisson=np.full(n, mat.poisson),
        rho_kg_m3=np.full(n, mat.density_kg_m3),
    )
    extra = list(extra_stations_mm)
    hubs = [x for e in shaft.elements for x in getattr(e, "hubs_mm", ())]
    stations = snap_stations([b.support_x_mm for b in shaft.bearings]
                             + [e.x_mm for e in shaft.elements] + extra + hubs,
                             shaft.step_edges_mm)
    mesh, nodes = build_mesh(steps, stations, max_element_mm)
    nb = len(shaft.bearings)
    ne = len(shaft.elements)
    return ShaftMesh(
        mesh=mesh,
        bearing_nodes={b.id: int(nodes[i]) for i, b in enumerate(shaft.bearings)},
        element_nodes={e.id: int(nodes[nb + i]) for i, e in enumerate(shaft.elements)},
        extra_nodes=tuple(int(nodes[nb + ne + i]) for i in range(len(extra))),
    )


def shaft_groups(model: Model) -> list[list[str]]:
    """Shafts joined by bearings between them, as groups solved together (model order)."""
    parent = {s.id: s.id for s in model.shafts}

    def root(a: str) -> str:
        while parent[a] != a:
            a = parent[a]
        return a

    for s_ in model.shafts:
        for b in s_.bearings:
            if b.within is not None and b.within in parent:
                parent[root(s_.id)] = root(b.within)
    groups: dict[str, list[str]] = {}
    for s_ in model.shafts:
        groups.setdefault(root(s_.id), []).append(s_.id)
    return list(groups.values())


@dataclass(frozen=True, eq=False)
class SolvedModel:
    """Every shaft solved in every case, before lives and shaft checks.

    ``shafts`` and ``bearings`` carry the solutions and the bearing loads (no life yet);
    ``flows`` the power flow of every case of a machine model (empty otherwise).
    """

    shafts: tuple[ShaftResult, ...]
    bearings: tuple[BearingResult, ...]
    warnings: tuple[str, ...]
    flows: tuple[CaseFlow, ...]


def solve_model(model: Model) -> SolvedModel:
    """Loads, bending (factor once per shaft or coupled group), axial rule, torsion and
    the equilibrium proof of every shaft in every case.

    Raises
    ------
    ModelError: an input the solve reveals to be wrong (unbalanced torques...).
    NumericalError: a singular or ill-posed system, or an equilibrium residual above
        ``model.solver.residual_tolerance``.
    """
    shaft_results: list[ShaftResult] = []
    bearing_results: list[BearingResult] = []
    warnings: list[str] = []
    flows: list[CaseFlow | None] = [None] * len(model.cases)
    if model.links:
        from shaftsys.machine.flow import case_flow, machine_graph

        graph = machine_graph(model)
        flows = [case_flow(model, c, graph) for c in model.cases]
    # bearings held by another shaft (pilot bearings) need a node on that shaft too
    held: dict[str, list[float]] = {}
    for s_ in model.shafts:
        for b in s_.bearings:
            if b.within is not None and b.within_x_mm is not None:
                held.setdefault(b.within, []).append(b.within_x_mm)
    meshes = {s_.id: mesh_shaft(s_, model.solver.max_element_mm, held.get(s_.id, ()))
              for s_ in model.shafts}
    applied_by_shaft: dict[str, list[list[AppliedLoad]]] = {}
    for shaft in model.shafts:
        applied_all: list[list[AppliedLoad]] = []
        for case, flow in zip(model.cases, flows, strict=True):
            applied, w = element_loads(model, shaft, case, flow)
            applied_all.append(applied)
            warnings.extend(w)
        applied_by_shaft[shaft.id] = applied_all
    bendings: dict[str, Any] = {}
    nonlinear = model.solver.bearing_stiffness == "nonlinear"
    for group in shaft_groups(model):
        if len(group) == 1:
            shaft = model.shaft(group[0])
            bending = solve_shaft_bending(shaft, meshes[shaft.id], model,
                                          applied_by_shaft[shaft.id])
            if nonlinear and nonlinear_bearings(shaft):
                bending = _nonlinear_bending(model, shaft, meshes[shaft.id], bending,
                                             applied_by_shaft[shaft.id])
            bendings[shaft.id] = bending
        else:
            bendings.update(solve_coupled_group(model, group, meshes, applied_by_shaft))
            if nonlinear and any(nonlinear_bearings(model.shaft(s_)) for s_ in group):
                warnings.append("the nonlinear bearing stiffness is not applied to shafts "
                                "joined by a bearing between them (" + ", ".join(
                                    f"'{s_}'" for s_ in group) + "): their supports stay "
                                "as typed")
    for shaft in model.shafts:
        sm = meshes[shaft.id]
        applied_all = applied_by_shaft[shaft.id]
        bending = bendings[shaft.id]
        cases: list[CaseSolution] = []
        per_bearing: dict[str, list[BearingCaseLoad]] = {b.id: [] for b in shaft.bearings}
        for k, case in enumerate(model.cases):
            sol, bl = _finish_case(model, shaft, sm, case, applied_all[k], bending, k,
                                   flows[k])
            cases.append(sol)
            for bid, ld in bl.items():
                per_bearing[bid].append(ld)
        nl = bending.nonlinear if isinstance(bending, BendingSolution) else None
        shaft_results.append(ShaftResult(shaft, tuple(cases), bending.condition,
                                         nonlinear=None if nl is None else nl.info))
        for b in shaft.bearings:
            state = None if nl is None else nl.states.get(b.id)
            bearing_results.append(BearingResult(shaft.id, b, tuple(per_bearing[b.id]),
                                                 interior_state=state))
    return SolvedModel(tuple(shaft_results), tuple(bearing_results),
                       tuple(dict.fromkeys(warnings)),
                       tuple(f for f in flows if f is not None))


def _finish_case(model: Model, shaft: Shaft, sm: ShaftMesh, case: Case,
                 applied: list[AppliedLoad], bending: Any, k: int,
                 flow: CaseFlow | None = None
                 ) -> tuple[CaseSolution, dict[str, BearingCaseLoad]]:
    """Axial arrangement, torsion, internal forces and equilibrium for one case."""
    mesh = sm.mesh
    x = mesh.x_mm
    n = mesh.n_nodes
    drive = case.drives.get(shaft.id)
    speed = shaft_speed(shaft, case, flow)
    # --- nodal axial forces and torques of the applied loads (+ shaft weight, axial part)
    fx = np.zeros(n)
    mx = np.zeros(n)
    for a in applied:
        node = _node_of(sm, a)
        fx[node] += a.force_N[0]
        mx[node] += a.moment_Nmm[0]
    fx += bending.axial_weight_nodal
    net_torque = float(mx.sum())
    torque_scale = float(np.abs(mx).sum())
    if abs(net_torque) > model.solver.residual_tolerance * max(torque_scale, 1.0):
        raise ModelError(
            f"the torques on shaft '{shaft.id}' do not balance (net {net_torque:.6g} N*mm "
            "about +x): nothing holds the shaft against turning",
            file=model.source, line=case.line, field=f"cases[{case.id}]",
            expected="torque entering through 'input' and leaving through 'outputs'; "
            "process moments about x balanced by the drive")
    # --- bending reactions (force the support puts on the shaft), per bearing
    radial: dict[str, tuple[float, float, float, float]] = {}
    for b in shaft.bearings:
        ry, rz, my, mz = bending.reaction(b.id, k)
        radial[b.id] = (ry, rz, my, mz)
    # --- axial arrangement rule (or, with nonlinear bearings, their displacement
    # compatibility): axial force each bearing puts on the shaft
    Ka = float(fx.sum())
    nl = getattr(bending, "nonlinear", None)
    nl_axial = None if nl is None else nl.axial_on_shaft
    if nl_axial is not None:
        axial_on_shaft = {b.id: float(nl_axial[b.id][k]) if b.id in nl_axial else 0.0
                          for b in shaft.bearings}
        induced: dict[str, Any] = {}
    else:
        axial_on_shaft, induced = axial_reactions(shaft.bearings, Ka, {
            bid: math.hypot(r[0], r[1]) for bid, r in radial.items()})
    for b in shaft.bearings:
        fx[sm.bearing_nodes[b.id]] += axial_on_shaft[b.id]
    # --- axial and torsion by integration (statically determinate bars)
    N_node = -np.cumsum(fx)[:-1]        # internal axial force in each element
    T_elem = -np.cumsum(mx)[:-1]        # internal torque in each element
    ref_node = _axial_reference_node(shaft, sm, axial_on_shaft)
    ux = np.concatenate([[0.0], np.cumsum(N_node * mesh.L_mm / mesh.EA_N)])
    ux -= ux[ref_node]
    if nl is not None and nl.ux is not None:   # the bearings' axial deflection included
        ux = nl.ux[:, k].copy()
    torque_ref = _torsion_reference_node(sm, drive)
    rx = np.concatenate([[0.0], np.cumsum(T_elem * mesh.L_mm / mesh.GJ_Nmm2)])
    rx -= rx[torque_ref]
    disp = np.zeros((n, 6))
    disp[:, 0] = ux
    disp[:, 1] = bending.v[:, k]
    disp[:, 2] = bending.w[:, k]
    disp[:, 3] = rx
    disp[:, 4] = -bending.w_slope[:, k]   # theta_y = -dw/dx
    disp[:, 5] = bending.v_slope[:, k]    # theta_z = dv/dx
    stations, Vy, Mz, Vz, My = bending.internal(k)
    N_st = np.repeat(N_node, 2)
    T_st = np.repeat(T_elem, 2)
    # --- equilibrium check against an independently built load list, each load and
    # reaction at the node that carries it (a station may be snapped by STATION_SNAP_MM)
    reactions = [
        AppliedLoad(f"bearing {b.id}", float(x[sm.bearing_nodes[b.id]]),
                    (axial_on_shaft[b.id], radial[b.id][0], radial[b.id][1]),
                    (0.0, radial[b.id][2], radial[b.id][3]))
        for b in shaft.bearings
    ]
    at_nodes = [replace(a, x_mm=float(x[_node_of(sm, a)])) for a in applied]
    for bid, x_b, f_b, m_b in getattr(bending, "external", lambda _k: [])(k):
        reactions.append(AppliedLoad(f"bearing {bid} (outer ring)", x_b, f_b, m_b))
    weight = shaft_weight_loads(model, shaft)
    f_res, m_res, rel = equilibrium_residual([*at_nodes, *weight], reactions)
    tol = model.solver.residual_tolerance
    roundoff = ROUNDOFF_FACTOR * float(np.finfo(float).eps) * bending.condition
    accepted = max(tol, min(roundoff, MAX_ROUNDOFF_RESIDUAL))
    nodal_rel = float(bending.nodal_residual[k])
    if not (rel <= accepted and nodal_rel <= tol):
        what = (f"equilibrium residual {rel:.3g} of the applied load exceeds the accepted "
                f"{accepted:.2g} (tolerance {tol:.1g}, round-off allowance for the "
                f"condition estimate {bending.condition:.3g} of the bending stiffness)"
                if not rel <= accepted else
                f"nodal residual {nodal_rel:.3g} (backward error of the solve) exceeds the "
                f"tolerance {tol:.1g}")
        why = ("the bending stiffness is too ill-conditioned to trust the reactions (look "
               f"for very soft bearing springs or extreme stiffness ratios between steps: "
               f"{_stiffness_suspects(shaft)})"
               if roundoff > MAX_ROUNDOFF_RESIDUAL else "the reactions cannot be trusted")
        raise NumericalError(
            f"shaft '{shaft.id}', case '{case.id}': {what} (force {f_res:.3g} N, moment "
            f"{m_res:.3g} N*mm): {why}")
    loads: dict[str, BearingCaseLoad] = {}
    for b in shaft.bearings:
        ry, rz, my, mz = radial[b.id]
        node = sm.bearing_nodes[b.id]
        fxb = -axial_on_shaft[b.id]
        ring_speed = speed
        if b.within is not None:
            ring_speed = speed - shaft_speed(model.shaft(b.within), case, flow)
        loads[b.id] = BearingCaseLoad(
            case=case.id, Fy_N=-ry, Fz_N=-rz, Fx_N=fxb, Fr_N=math.hypot(ry, rz),
            Fa_N=abs(fxb), speed_rpm=ring_speed, induced_N=induced.get(b.id, 0.0),
            My_Nmm=-my, Mz_Nmm=-mz, deflection_mm=float(math.hypot(disp[node, 1],
                                                                    disp[node, 2])),
            slope_rad=float(math.hypot(disp[node, 4], disp[node, 5])),
            theta_y_rad=float(disp[node, 4]), theta_z_rad=float(disp[node, 5]))
    sol = CaseSolution(
        case=case.id, speed_rpm=speed, torque_Nmm=float(np.abs(T_elem).max(initial=0.0)),
        node_x_mm=x, displacement=disp, stations_mm=stations, N_N=N_st, Vy_N=Vy, Vz_N=Vz,
        T_Nmm=T_st, My_Nmm=My, Mz_Nmm=Mz, applied=tuple(applied), force_residual_N=f_res,
        moment_residual_Nmm=m_res, residual_relative=rel, nodal_residual_relative=nodal_rel)
    return sol, loads


def _nonlinear_bending(model: Model, shaft: Shaft, sm: ShaftMesh, rigid: BendingSolution,
                       applied_all: list[list[AppliedLoad]]) -> BendingSolution:
    """The bending solution with the shaft's bearings of modelled interior as nonlinear
    supports (:mod:`shaftsys.analysis.nonlinear`), from the rigid solution ``rigid``.
    """
    n = sm.mesh.n_nodes
    fx = np.zeros((n, len(applied_all)))
    for k, applied in enumerate(applied_all):
        for a in applied:
            fx[_node_of(sm, a), k] += a.force_N[0]
    fx += rigid.axial_weight_nodal[:, None]
    nls = solve_nonlinear(shaft, sm.mesh, sm.bearing_nodes, rigid, fx,
                          [c.id for c in model.cases], model.solver.nonlinear_tolerance,
                          model.solver.nonlinear_max_iterations)
    return replace(rigid, u_xy=nls.u_xy, u_xz=nls.u_xz, _reactions_xy=nls.r_xy,
                   _reactions_xz=nls.r_xz,
                   nodal_residual=nls.nodal_residual,
                   nonlinear=nls)


def _node_of(sm: ShaftMesh, load: AppliedLoad) -> int:
    """Node that carries ``load``: its element's node, else the node nearest its station."""
    if load.element is not None and load.element in sm.element_nodes:
        node = sm.element_nodes[load.element]
        if abs(float(sm.mesh.x_mm[node]) - load.x_mm) <= 2.0 * STATION_SNAP_MM:
            return node
    return int(np.argmin(np.abs(sm.mesh.x_mm - load.x_mm)))  # e.g. a drum's hubs


def _axial_reference_node(shaft: Shaft, sm: ShaftMesh, axial: dict[str, float]) -> int:
    """Node held axially: the locating bearing, else the one carrying the most thrust."""
    for b in shaft.bearings:
        if b.axial is AxialRole.BOTH:
            return sm.bearing_nodes[b.id]
    best = max(shaft.bearings, key=lambda b: abs(axial.get(b.id, 0.0)))
    return sm.bearing_nodes[best.id]


def _torsion_reference_node(sm: ShaftMesh, drive: Any) -> int:
    """Node where the twist is zero: the input element (twist is relative)."""
    if drive is not None and drive.input_element in sm.element_nodes:
        return sm.element_nodes[drive.input_element]
    return 0


def shaft_weight_loads(model: Model, shaft: Shaft) -> list[AppliedLoad]:
    """The shaft's own weight, one resultant per step at the step's centroid.

    Built independently of the finite-element load vector: used by the equilibrium
    check.
    """
    g = np.asarray(model.gravity_m_s2, dtype=float)
    if not model.solver.include_shaft_weight or not np.any(g):
        return []
    out = []
    rho = shaft.material.density_kg_m3 * DENSITY_KG_PER_MM3
    for step, x0 in zip(shaft.steps, shaft.step_edges_mm, strict=False):
        area = math.pi / 4.0 * (step.d_mm**2 - step.bore_mm**2)
        mass = rho * area * step.length_mm
        out.append(AppliedLoad("shaft weight", x0 + step.length_mm / 2,
                               vec3(mass * g), (0.0, 0.0, 0.0)))
    return out


def equilibrium_residual(applied: list[AppliedLoad], reactions: list[AppliedLoad]
                         ) -> tuple[float, float, float]:
    """Global force and moment balance of a free body (:func:`shaftsys.fe.balance.global_balance`).

    Returns the force residual [N], the moment residual about the origin [N*mm] and the
    larger of the two relative to the applied loads (force / sum|F|, moment / (sum|F|*L +
    sum|M|), with L the largest lever arm).
    """
    items = [*applied, *reactions]
    if not items:
        return 0.0, 0.0, 0.0
    f_res, m_res, rel = global_balance([a.x_mm for a in items], [a.force_N for a in items],
                                       [a.moment_Nmm for a in items])
    return float(f_res), float(m_res), float(rel)


@dataclass(frozen=True, eq=False)
class BendingSolution:
    """Both bending planes of one shaft in every case (columns = cases).

    ``v``, ``w``: deflections [mm] along y and z, shape (n_nodes, n_cases); ``v_slope``
    (= theta_z) and ``w_slope`` (= dw/dx = -theta_y) the section rotations [rad].
    """

    xy: Any
    xz: Any
    F_xy: NDArray[np.float64]
    F_xz: NDArray[np.float64]
    q_y: NDArray[np.float64] | None
    q_z: NDArray[np.float64] | None
    u_xy: NDArray[np.float64]
    u_xz: NDArray[np.float64]
    support_index: dict[str, int]
    axial_weight_nodal: NDArray[np.float64]
    condition: float
    nodal_residual: NDArray[np.float64]
    _reactions_xy: NDArray[np.float64] = field(repr=False, default=None)  # type: ignore
    _reactions_xz: NDArray[np.float64] = field(repr=False, default=None)  # type: ignore
    #: the nonlinear bearing solve (``solver.bearing_stiffness: nonlinear``), else None
    nonlinear: NonlinearSolution | None = None

    @property
    def v(self) -> NDArray[np.float64]:  # noqa: D102
        return self.u_xy[0::2]

    @property
    def w(self) -> NDArray[np.float64]:  # noqa: D102
        return self.u_xz[0::2]

    @property
    def v_slope(self) -> NDArray[np.float64]:  # noqa: D102
        return self.u_xy[1::2]

    @property
    def w_slope(self) -> NDArray[np.float64]:  # noqa: D102
        return self.u_xz[1::2]

    def reaction(self, bearing_id: str, k: int) -> tuple[float, float, float, float]:
        """(Fy, Fz, My, Mz) the support of ``bearing_id`` puts on the shaft in case k."""
        j = self.support_index.get(bearing_id)
        if j is None:  # thrust bearing: no radial support
            return (0.0, 0.0, 0.0, 0.0)
        rxy = self._reactions_xy[j, :, k]
        rxz = self._reactions_xz[j, :, k]
        return (float(rxy[0]), float(rxz[0]), float(-rxz[1]), float(rxy[1]))

    def internal(self, k: int) -> tuple[NDArray[np.float64], ...]:
        """Stations and (Vy, Mz, Vz, My) at both ends of every element in case k."""
        fxy = self.xy.internal_forces(self.u_xy[:, k], None if self.q_y is None
                                      else self.q_y)
        fxz = self.xz.internal_forces(self.u_xz[:, k], None if self.q_z is None
                                      else self.q_z)
        x = self.xy.x_mm
        stations = np.column_stack([x[:-1], x[1:]]).ravel()
        Vy = fxy.Q_N[:, :, 0].ravel()
        Mz = fxy.M_Nmm[:, :, 0].ravel()
        Vz = fxz.Q_N[:, :, 0].ravel()
        My = -fxz.M_Nmm[:, :, 0].ravel()
        return stations, Vy, Mz, Vz, My


def _nodal_loads(sm: ShaftMesh, model: Model, applied_all: list[list[AppliedLoad]]
                 ) -> tuple[NDArray[np.float64], NDArray[np.float64],
                            NDArray[np.float64] | None, NDArray[np.float64] | None,
                            NDArray[np.float64]]:
    """Nodal load vectors of both planes (Fy, Mz) and (Fz, -My) for every case, the
    shaft's weight per length in y and z [N/mm] and its axial weight per node [N].
    """
    mesh = sm.mesh
    n = mesh.n_nodes
    m = len(applied_all)
    F_xy = np.zeros((2 * n, m))
    F_xz = np.zeros((2 * n, m))
    for k, applied in enumerate(applied_all):
        for a in applied:
            node = _node_of(sm, a)
            F_xy[2 * node, k] += a.force_N[1]
            F_xy[2 * node + 1, k] += a.moment_Nmm[2]
            F_xz[2 * node, k] += a.force_N[2]
            F_xz[2 * node + 1, k] -= a.moment_Nmm[1]
    g = np.asarray(model.gravity_m_s2, dtype=float)
    axial_weight = np.zeros(n)
    q_y = q_z = None
    if model.solver.include_shaft_weight and np.any(g):
        line_mass = mesh.rho_kg_m3 * DENSITY_KG_PER_MM3 * mesh.A_mm2   # kg/mm
        q_y = line_mass * g[1]
        q_z = line_mass * g[2]
        px = line_mass * g[0] * mesh.L_mm
        axial_weight[:-1] += px / 2
        axial_weight[1:] += px / 2
    return F_xy, F_xz, q_y, q_z, axial_weight


def solve_coupled_group(model: Model, group: list[str], meshes: dict[str, ShaftMesh],
                        applied_by_shaft: dict[str, list[list[AppliedLoad]]]
                        ) -> dict[str, Any]:
    """Bending of shafts joined by bearings between them, solved as one system."""
    from shaftsys.machine.coupled import CoupledBending, Joint, Member, solve_plane

    members = []
    joints: list[Joint] = []
    joint_x: dict[str, float] = {}
    axial: dict[str, NDArray[np.float64]] = {}
    for sid in group:
        shaft = model.shaft(sid)
        sm = meshes[sid]
        F_xy, F_xz, q_y, q_z, ax = _nodal_loads(sm, model, applied_by_shaft[sid])
        axial[sid] = ax
        mesh = sm.mesh
        members.append(Member(sid, mesh.x_mm, mesh.EI_Nmm2, mesh.kGA_N, F_xy, F_xz, q_y, q_z,
                              ax))
        for b in shaft.bearings:
            if b.kind is BearingKind.THRUST_BALL:
                continue
            outer = None
            if b.within is not None and b.within_x_mm is not None:
                osm = meshes[b.within]
                onode = int(np.argmin(np.abs(osm.mesh.x_mm - b.within_x_mm)))
                outer = (b.within, onode)
                joint_x[b.id] = float(osm.mesh.x_mm[onode])
            joints.append(Joint(b.id, (sid, sm.bearing_nodes[b.id]), outer,
                                b.radial_stiffness_N_mm or math.inf,
                                b.tilt_stiffness_Nmm_rad))
    label = "shafts " + ", ".join(f"'{g}'" for g in group)
    shear = model.solver.shear_deformation
    xy = solve_plane(members, joints, "xy", shear, label)
    xz = solve_plane(members, joints, "xz", shear, label)
    return {sid: CoupledBending(sid, meshes[sid].mesh.x_mm, xy, xz, joints, joint_x,
                                axial[sid]) for sid in group}


def _backward_error(system: Any, u: NDArray[np.float64], F: NDArray[np.float64],
                    q: NDArray[np.float64] | None) -> NDArray[np.float64]:
    """Nodal residual ||K u - F - R|| per case, relative to ||F|| + || |K| |u| ||.

    This is the normwise backward error of the solve: floating-point round-off in
    K u grows with |K| |u|, not with the load, so a fine mesh under a small distributed
    load is not mistaken for an unbalanced one. The global force and moment balance,
    checked separately, stays relative to the applied load.
    """
    from shaftsys.fe.solve import banded_matmul

    rel = system.residual(u, F, q)  # relative to ||F_total||
    F_total = F if q is None else F + system.load_vector(q)
    norm_f = np.linalg.norm(F_total, axis=0)
    absolute = rel * np.where(norm_f > 0.0, norm_f, 1.0)
    ku = np.linalg.norm(banded_matmul(np.abs(system.ab), np.abs(u)), axis=0)
    return np.asarray(absolute / np.maximum(norm_f + ku, np.finfo(float).tiny))


def _stiffness_suspects(shaft: Shaft) -> str:
    """The steps and bearing springs to look at first, in the model's words: the
    thinnest and thickest step (bending stiffness goes with d^4) and the softest
    bearing spring.
    """
    edges = shaft.step_edges_mm
    order = sorted(range(len(shaft.steps)), key=lambda k: shaft.steps[k].d_mm)
    thin, thick = order[0], order[-1]
    ratio = (shaft.steps[thick].d_mm / shaft.steps[thin].d_mm) ** 4
    out = [f"step {thin + 1} (x = {edges[thin]:g} to {edges[thin + 1]:g} mm, d = "
           f"{shaft.steps[thin].d_mm:g} mm) against step {thick + 1} (d = "
           f"{shaft.steps[thick].d_mm:g} mm), a bending stiffness ratio of {ratio:.2g}"]
    springs = [b for b in shaft.bearings if b.radial_stiffness_N_mm is not None]
    if springs:
        soft = min(springs, key=lambda b: b.radial_stiffness_N_mm or math.inf)
        out.append(f"bearing '{soft.id}' at x = {soft.support_x_mm:g} mm with "
                   f"radial_stiffness {soft.radial_stiffness_N_mm:g} N/mm")
    return "; ".join(out)


def _not_held_message(shaft: Shaft, x_mm: float, plane: str, detail: str) -> str:
    """A singular bending stiffness in the model's words: which shaft and plane, which
    span is free, which bearing and step to look at (``x_mm``: where the factorisation
    broke down [mm]; ``detail``: the solver's own message).
    """
    radial = sorted((b for b in shaft.bearings if b.kind is not BearingKind.THRUST_BALL),
                    key=lambda b: b.support_x_mm)
    left = [b for b in radial if b.support_x_mm <= x_mm]
    right = [b for b in radial if b.support_x_mm > x_mm]
    if left and right:
        lo, hi = left[-1].support_x_mm, right[0].support_x_mm
        span = (f"between x = {lo:g} mm (bearing '{left[-1].id}') and x = {hi:g} mm "
                f"(bearing '{right[0].id}')")
    elif left:
        lo, hi = left[-1].support_x_mm, shaft.length_mm
        span = f"between bearing '{left[-1].id}' at x = {lo:g} mm and the free end x = {hi:g} mm"
    elif right:
        lo, hi = 0.0, right[0].support_x_mm
        span = f"between the free end x = 0 mm and bearing '{right[0].id}' at x = {hi:g} mm"
    else:
        span = f"along its whole length (0 to {shaft.length_mm:g} mm: no radial bearing)"
    edges = shaft.step_edges_mm
    j = next((k for k in range(len(shaft.steps)) if x_mm < edges[k + 1]),
             len(shaft.steps) - 1)
    step = shaft.steps[j]
    thin = min(range(len(shaft.steps)), key=lambda k: shaft.steps[k].d_mm)
    look = []
    near = min(radial, key=lambda b: abs(b.support_x_mm - x_mm), default=None)
    if near is not None:
        spring = ("" if near.radial_stiffness_N_mm is None else
                  f", radial_stiffness {near.radial_stiffness_N_mm:g} N/mm")
        look.append(f"bearing '{near.id}' at x = {near.support_x_mm:g} mm{spring}")
    look.append(f"step {j + 1} (x = {edges[j]:g} to {edges[j + 1]:g} mm, d = "
                f"{step.d_mm:g} mm, length {step.length_mm:g} mm)")
    if thin != j:
        look.append(f"the thinnest step {thin + 1} (d = {shaft.steps[thin].d_mm:g} mm)")
    return (f"shaft '{shaft.id}' is not held in the {plane} plane {span} (the bending "
            f"stiffness is singular or nearly so near x = {x_mm:g} mm): add a support, "
            f"or check {'; '.join(look)} (a support too soft, or steps whose stiffness "
            f"differs by many orders of magnitude) [solver: {detail}]")


def solve_shaft_bending(shaft: Shaft, sm: ShaftMesh, model: Model,
                        applied_all: list[list[AppliedLoad]]) -> BendingSolution:
    """Factor the bending stiffness of ``shaft`` once and solve every case.

    The x-y plane carries (Fy, Mz), the x-z plane (Fz, -My) so that its rotation dof is
    dw/dx; both share one stiffness (round sections), factored once per plane.
    """
    from shaftsys.fe.solve import PlanarBending, Support

    mesh = sm.mesh
    m = len(applied_all)
    supports: list[Support] = []
    support_index: dict[str, int] = {}
    for b in shaft.bearings:
        if b.kind is BearingKind.THRUST_BALL:
            continue
        support_index[b.id] = len(supports)
        supports.append(Support(sm.bearing_nodes[b.id],
                                b.radial_stiffness_N_mm or math.inf,
                                b.tilt_stiffness_Nmm_rad))
    shear = model.solver.shear_deformation
    try:
        xy = PlanarBending.from_mesh(mesh, supports, shear=shear,
                                     label=f"shaft '{shaft.id}', bending in the x-y plane")
        xz = PlanarBending.from_mesh(mesh, supports, shear=shear,
                                     label=f"shaft '{shaft.id}', bending in the x-z plane")
    except NumericalError as exc:
        if exc.dof is None:
            raise
        raise NumericalError(_not_held_message(shaft, float(mesh.x_mm[exc.dof // 2]),
                                               "x-y", str(exc)), dof=exc.dof) from None
    F_xy, F_xz, q_y, q_z, axial_weight = _nodal_loads(sm, model, applied_all)
    qy_cols = None if q_y is None else np.repeat(q_y[:, None], m, axis=1)
    qz_cols = None if q_z is None else np.repeat(q_z[:, None], m, axis=1)
    u_xy = xy.solve(F_xy, qy_cols)
    u_xz = xz.solve(F_xz, qz_cols)
    r_xy = xy.reactions(u_xy, F_xy, qy_cols)
    r_xz = xz.reactions(u_xz, F_xz, qz_cols)
    res = np.maximum(_backward_error(xy, u_xy, F_xy, qy_cols),
                     _backward_error(xz, u_xz, F_xz, qz_cols))
    cond = float(xy.condition_estimate)
    xy.warn_if_ill_conditioned()  # logs a warning with the estimate above 1e12
    return BendingSolution(xy=xy, xz=xz, F_xy=F_xy, F_xz=F_xz, q_y=q_y, q_z=q_z,
                           u_xy=u_xy, u_xz=u_xz, support_index=support_index,
                           axial_weight_nodal=axial_weight, condition=cond,
                           nodal_residual=res, _reactions_xy=r_xy, _reactions_xz=r_xz)
