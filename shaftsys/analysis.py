"""Orchestration: model -> element loads -> beam solve -> bearing spectra -> life.

``analyse(model) -> Result`` is the one entry point. Each shaft is meshed and its
bending stiffness factored once; every case is a right-hand side of that factorisation
(two bending planes share the stiffness of a round shaft). Axial and torsion are bars
held at one node each: statically determinate once the axial arrangement rule of the
case has decided which bearing carries how much thrust, so they are solved per case by
integration from that node. Nothing is written back onto the model.
"""

from __future__ import annotations

import logging
import math
import re
from dataclasses import dataclass, field, replace
from typing import TYPE_CHECKING, Any

import numpy as np
from numpy.typing import NDArray

from shaftsys import loads as L
from shaftsys.errors import ModelError, NumericalError
from shaftsys.fe.mesh import BeamMesh, Steps, build_mesh
from shaftsys.model import (
    AxialRole,
    Bearing,
    BearingKind,
    BevelGear,
    Case,
    Coupling,
    Element,
    Gear,
    LumpedMass,
    Model,
    ProcessLoad,
    Pulley,
    Shaft,
    Sprocket,
    Unbalance,
)
from shaftsys.units import DENSITY_KG_PER_MM3

if TYPE_CHECKING:
    import pandas as pd

    from shaftsys.bearings.engine import BearingLife
    from shaftsys.machine.flow import CaseFlow

log = logging.getLogger(__name__)

SCHEMA_VERSION = "1.1"

#: Induced axial force of a single-row angular-contact ball bearing under radial load,
#: Fi = K * Fr * tan(alpha), K = Ja/Jr of Sjoevall's integrals at a half load zone
#: (epsilon = 0.5) for point contact (Harris, Rolling Bearing Analysis, load
#: distribution chapter; from memory). Zero clearance, no preload.
ACBB_INDUCED_FACTOR = 1.32
#: Tapered roller bearings: Fi = 0.5 * Fr / Y with the maker's Y (common practice,
#: the same half-load-zone assumption for line contact).
TRB_INDUCED_FACTOR = 0.5
#: Stations (bearing pressure centres, elements) closer than this [mm] to a step edge or
#: to another station share its node (:func:`snap_stations`): a gap of micrometres would
#: make an element a million times shorter than its neighbours and ruin the
#: conditioning of the bending stiffness.
STATION_SNAP_MM = 1e-3
#: Round-off allowance of the global force and moment balance: the reactions are
#: computed from the solution, whose relative error grows like eps * condition number,
#: so the accepted relative residual is
#: max(tolerance, min(ROUNDOFF_FACTOR * eps * cond, MAX_ROUNDOFF_RESIDUAL)).
ROUNDOFF_FACTOR = 1000.0
#: Largest relative residual round-off may excuse (bearing loads to about four digits);
#: beyond it the system is too ill-conditioned to trust (NumericalError, exit 3).
MAX_ROUNDOFF_RESIDUAL = 1e-4
#: Most beam elements a shaft is meshed into (the dense modal analysis of the shaft
#: checks grows with the cube of it: some 30 s at 2000 elements).
MAX_ELEMENTS = 2000


# ----------------------------------------------------------------------------- results
@dataclass(frozen=True)
class AppliedLoad:
    """A load applied at a station in one case (shaft frame, N and N*mm).

    ``element`` is the id of the element that applies it (its node carries the load), or
    ``None`` for loads placed by station only.
    """

    source: str
    x_mm: float
    force_N: tuple[float, float, float]
    moment_Nmm: tuple[float, float, float]
    element: str | None = None


@dataclass(frozen=True)
class BearingCaseLoad:
    """The load the shaft puts on one bearing in one case.

    ``Fy_N, Fz_N, Fx_N``: components in the shaft frame of the force the shaft puts on
    the bearing [N]; ``Fr_N``: resultant radial load; ``Fa_N``: |axial load| the bearing
    carries, induced forces of adjusted pairs included [N]; ``Mt_Nmm``: tilting moment
    taken by a bearing with tilt stiffness [N*mm].
    """

    case: str
    Fy_N: float
    Fz_N: float
    Fx_N: float
    Fr_N: float
    Fa_N: float
    speed_rpm: float
    induced_N: float = 0.0
    My_Nmm: float = 0.0
    Mz_Nmm: float = 0.0
    deflection_mm: float = 0.0
    slope_rad: float = 0.0


@dataclass(frozen=True, eq=False)
class CaseSolution:
    """Everything along one shaft in one case.

    Arrays along the shaft are given at ``stations_mm`` (each element's two ends, so a
    point load shows as a jump): ``N_N`` axial force (tension +), ``Vy_N``, ``Vz_N``
    shear, ``T_Nmm`` torque, ``My_Nmm``, ``Mz_Nmm`` bending moment, each the action of
    the part right of the cut on the part left of it; ``M_Nmm`` resultant bending
    moment. ``displacement`` is (n_nodes, 6): ux, uy, uz [mm], rx, ry, rz [rad].
    """

    case: str
    speed_rpm: float
    torque_Nmm: float
    node_x_mm: NDArray[np.float64]
    displacement: NDArray[np.float64]
    stations_mm: NDArray[np.float64]
    N_N: NDArray[np.float64]
    Vy_N: NDArray[np.float64]
    Vz_N: NDArray[np.float64]
    T_Nmm: NDArray[np.float64]
    My_Nmm: NDArray[np.float64]
    Mz_Nmm: NDArray[np.float64]
    applied: tuple[AppliedLoad, ...]
    force_residual_N: float
    moment_residual_Nmm: float
    residual_relative: float
    nodal_residual_relative: float
    warnings: tuple[str, ...] = ()

    @property
    def M_Nmm(self) -> NDArray[np.float64]:
        """Resultant bending moment [N*mm] at ``stations_mm``."""
        return np.hypot(self.My_Nmm, self.Mz_Nmm)

    @property
    def deflection_mm(self) -> NDArray[np.float64]:
        """Radial deflection [mm] at the nodes."""
        return np.hypot(self.displacement[:, 1], self.displacement[:, 2])

    @property
    def slope_rad(self) -> NDArray[np.float64]:
        """Resultant slope [rad] at the nodes."""
        return np.hypot(self.displacement[:, 4], self.displacement[:, 5])

    @property
    def max_deflection_mm(self) -> float:
        """Largest radial deflection along the shaft [mm]."""
        return float(self.deflection_mm.max())


@dataclass(frozen=True, eq=False)
class ShaftResult:
    """Results of one shaft in every case."""

    shaft: Shaft
    cases: tuple[CaseSolution, ...]
    condition_estimate: float
    system_life_h: float = math.inf
    limiting_bearing: str | None = None

    def case(self, case_id: str) -> CaseSolution:
        """The solution of one case."""
        for c in self.cases:
            if c.case == case_id:
                return c
        raise KeyError(case_id)


@dataclass(frozen=True, eq=False)
class BearingResult:
    """One support: its loads in every case and its life verdict."""

    shaft_id: str
    bearing: Bearing
    loads: tuple[BearingCaseLoad, ...]
    life: BearingLife | None = None

    @property
    def ok(self) -> bool:
        """The support meets its targets (life and static safety)."""
        return bool(self.life.ok) if self.life is not None else True


@dataclass(frozen=True, eq=False)
class Result:
    """Complete results of a model (nothing is written back onto the model)."""

    model: Model
    shafts: tuple[ShaftResult, ...]
    bearings: tuple[BearingResult, ...]
    system_life_h: float = math.inf
    limiting_bearing: str | None = None
    warnings: tuple[str, ...] = ()
    checks: Any = None  # shaftsys.shaft_checks.ShaftChecks, attached by analyse()
    flows: tuple[CaseFlow, ...] = ()  # machine models: power flow of every case

    @property
    def ok(self) -> bool:
        """Every check passes (bearings, and the shaft checks when they were run)."""
        return all(b.ok for b in self.bearings) and (self.checks is None or self.checks.ok)

    def bearing(self, bearing_id: str) -> BearingResult:
        """The result of one bearing."""
        for b in self.bearings:
            if b.bearing.id == bearing_id:
                return b
        raise KeyError(bearing_id)

    def shaft(self, shaft_id: str) -> ShaftResult:
        """The result of one shaft."""
        for s in self.shafts:
            if s.shaft.id == shaft_id:
                return s
        raise KeyError(shaft_id)

    def loads_frame(self) -> pd.DataFrame:
        """Bearing loads as a pandas DataFrame, one row per bearing and case."""
        import pandas as pd

        rows = []
        for b in self.bearings:
            for ld in b.loads:
                rows.append({"bearing": b.bearing.id, "shaft": b.shaft_id,
                             "x_mm": b.bearing.support_x_mm, **ld.__dict__})
        return pd.DataFrame(rows)

    def life_frame(self) -> pd.DataFrame:
        """Bearing life verdicts as a pandas DataFrame, one row per bearing."""
        import pandas as pd

        rows = []
        for b in self.bearings:
            row: dict[str, Any] = {"bearing": b.bearing.id, "shaft": b.shaft_id,
                                   "type": b.bearing.kind.value}
            if b.life is not None:
                row.update(b.life.to_dict())
            rows.append(row)
        return pd.DataFrame(rows)


# ----------------------------------------------------------------------------- loads
def shaft_speed(shaft: Shaft, case: Case, flow: CaseFlow | None = None) -> float:
    """Signed speed [rpm] of ``shaft`` in ``case``."""
    if flow is not None:
        return flow.speed_rpm[shaft.id]
    drive = case.drives.get(shaft.id)
    return drive.speed_rpm if drive else 0.0


def element_loads(model: Model, shaft: Shaft, case: Case, flow: CaseFlow | None = None
                  ) -> tuple[list[AppliedLoad], list[str]]:
    """Every load applied to ``shaft`` in ``case`` (without bearing reactions).

    Single shafts: the input element applies the input torque, each output ``-share``
    of it; other torque-carrying elements none. Machine models (``flow`` given): torques
    come from the power flow and linked elements carry the link forces (and the loss
    torque on the driven side). Returns the loads and the warnings (belt slip...).
    """
    speed = shaft_speed(shaft, case, flow)
    torque: dict[str, float] = {}
    linked: set[str] = set()
    out: list[AppliedLoad] = []
    warnings: list[str] = []
    if flow is not None:
        torque = dict(flow.element_torque_Nmm)
        for act in flow.actions:
            if act.shaft == shaft.id:
                linked.add(act.element)
                out.append(AppliedLoad(act.element if act.label == act.element else
                                       f"{act.element} {act.label}", act.x_mm, act.force_N,
                                       act.moment_Nmm, element=act.element))
        if shaft is model.shafts[0]:
            warnings.extend(flow.warnings)
    else:
        drive = case.drives.get(shaft.id)
        if drive is not None and drive.input_element is not None:
            torque[drive.input_element] = drive.input_torque_Nmm
            for out_id, share in drive.outputs:
                torque[out_id] = -share * drive.input_torque_Nmm
    overrides = {ld.element: ld for ld in case.loads}
    g = np.asarray(model.gravity_m_s2, dtype=float)
    for el in shaft.elements:
        if el.id not in linked:   # linked elements carry the link forces added above
            axis = _element_axis_load(el, torque.get(el.id, 0.0), speed, overrides)
            if axis is not None:
                out.append(AppliedLoad(el.id, el.x_mm, _vec(axis.force_N),
                                       _vec(axis.moment_Nmm), element=el.id))
                warnings.extend(f"case '{case.id}', element '{el.id}': {w}"
                                for w in axis.warnings)
        if el.mass_kg > 0 and np.any(g):
            w = L.weight_load(el.mass_kg, g)
            out.append(AppliedLoad(f"{el.id} weight", el.x_mm, _vec(w.force_N),
                                   _vec(w.moment_Nmm), element=el.id))
    return out, warnings


def _vec(a: Any) -> tuple[float, float, float]:
    return (float(a[0]), float(a[1]), float(a[2]))


def _element_axis_load(el: Element, torque_Nmm: float, speed_rpm: float,
                       overrides: dict[str, Any]) -> L.AxisLoad | None:
    if isinstance(el, Gear):
        return L.spur_helical_mesh_load(torque_Nmm, el.pitch_diameter_mm, el.mesh_angle_deg,
                                        el.normal_pressure_angle_deg, el.helix_angle_deg,
                                        el.hand, el.internal)
    if isinstance(el, BevelGear):
        return L.bevel_mesh_load(torque_Nmm, el.mean_pitch_diameter_mm,
                                 el.pitch_cone_angle_deg, el.pressure_angle_deg,
                                 el.mesh_angle_deg, el.apex)
    if isinstance(el, Pulley):
        return L.belt_hub_load(torque_Nmm, el.diameter_mm, el.mesh_angle_deg,
                               el.wrap_angle_deg, el.pretension_N, el.friction_coefficient,
                               el.groove_angle_deg)
    if isinstance(el, Sprocket):
        return L.chain_hub_load(torque_Nmm, el.pitch_diameter_mm, el.mesh_angle_deg,
                                el.wrap_angle_deg)
    if isinstance(el, Coupling):
        return L.coupling_load(torque_Nmm, el.radial_force_N, el.radial_angle_deg)
    if isinstance(el, ProcessLoad):
        ov = overrides.get(el.id)
        force = ov.force_N if ov is not None else el.force_N
        moment = ov.moment_Nmm if ov is not None else el.moment_Nmm
        return L.AxisLoad(np.asarray(force, float), np.asarray(moment, float))
    if isinstance(el, Unbalance):
        if el.unbalance_gmm == 0.0 or speed_rpm == 0.0:
            return None
        # U [g*mm] = m [kg] * e [mm] * 1000: take e = 1 mm, m = U / 1000 kg.
        return L.unbalance_load(el.unbalance_gmm / 1000.0, 1.0, speed_rpm, el.phase_deg)
    if isinstance(el, LumpedMass):
        return None
    raise ValueError(f"unknown element type {type(el).__name__}")  # pragma: no cover


# ----------------------------------------------------------------------------- meshing
@dataclass(frozen=True, eq=False)
class ShaftMesh:
    """A meshed shaft: the beam mesh and the node of every bearing and element."""

    mesh: BeamMesh
    bearing_nodes: dict[str, int]
    element_nodes: dict[str, int]
    extra_nodes: tuple[int, ...] = ()


def snap_stations(stations_mm: list[float], edges_mm: tuple[float, ...],
                  tol_mm: float = STATION_SNAP_MM) -> list[float]:
    """Move each station [mm] onto the nearest step edge or earlier station within tol_mm.

    Stations are taken in increasing x; a station farther than ``tol_mm`` [mm] from every
    step edge and every station already placed keeps its position and becomes a place
    itself. Returns the stations [mm] in the order given.
    """
    places = [float(e) for e in edges_mm]
    out = [0.0] * len(stations_mm)
    for i in sorted(range(len(stations_mm)), key=lambda j: stations_mm[j]):
        x = float(stations_mm[i])
        nearest = min(places, key=lambda p: abs(p - x))
        if abs(nearest - x) <= tol_mm:
            out[i] = nearest
        else:
            out[i] = x
            places.append(x)
    return out


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
    stations = snap_stations([b.support_x_mm for b in shaft.bearings]
                             + [e.x_mm for e in shaft.elements] + extra,
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


# ----------------------------------------------------------------------------- solve
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


def analyse(model: Model, *, with_life: bool = True, with_shaft_checks: bool = True
            ) -> Result:
    """Solve every shaft in every case and evaluate every bearing.

    Raises
    ------
    ModelError: an input the solve reveals to be wrong (e.g. axial load on a needle
        bearing).
    NumericalError: a singular or ill-posed system, or an equilibrium residual above
        ``model.solver.residual_tolerance``.
    """
    try:
        return _analyse(model, with_life=with_life, with_shaft_checks=with_shaft_checks)
    except ModelError as exc:
        located = locate_error(exc, model)
        if located is exc:
            raise
        raise located from exc


#: Attribute names of the model's dataclasses -> keys of the model file (for messages).
_FILE_KEYS = {
    "C_N": "C", "C0_N": "C0", "Cu_N": "Cu", "limiting_speed_rpm": "limiting_speed",
    "contact_angle_deg": "contact_angle", "x_mm": "at", "d_mm": "d", "D_mm": "D",
    "B_mm": "B", "kind": "type", "pressure_centre_offset_mm": "pressure_centre_offset",
    "radial_stiffness_N_mm": "radial_stiffness", "tilt_stiffness_Nmm_rad": "tilt_stiffness",
    "target_life_h": "target_life", "target_reliability": "reliability",
}
_FIELD_OBJECT = re.compile(r"^(bearings|cases|links|elements|shafts)\[([^\]]*)\](?:\.(\w+))?")
_CASE_NAMED = re.compile(r"case '([^']*)'")


def locate_error(exc: ModelError, model: Model) -> ModelError:
    """``exc`` with the model file, line and file field path added where it has none.

    Errors of the numerical core name a field by object and attribute (e.g.
    ``bearings[A].C_N``); this finds the object's line in the model file and writes the
    path as the file spells it (``shafts[s1].bearings[A].C``). A section-level error
    (``lubrication``, ``life``) that names a case gets the case's line. Returns ``exc``
    itself when it is already located or the model has no source file.
    """
    if exc.file is not None or model.source is None:
        return exc
    field_path, line = exc.field, exc.line
    found = _FIELD_OBJECT.match(field_path or "")
    if found is not None:
        what, ident, attr = found.groups()
        key = f".{_FILE_KEYS.get(attr, attr)}" if attr else ""
        for s in model.shafts:
            owned: list[tuple[Any, str]] = [(s, "shafts"), *((b, "bearings") for b in
                                                           s.bearings),
                                            *((e, "elements") for e in s.elements)]
            for obj, group in owned:
                if group == what and obj.id == ident:
                    line = obj.line if obj.line is not None else line
                    field_path = (f"shafts[{s.id}]{key}" if group == "shafts" else
                                  f"shafts[{s.id}].{group}[{ident}]{key}")
        for c in model.cases:
            if what == "cases" and c.id == ident and c.line is not None:
                line = c.line
        for k in model.links:
            if what == "links" and k.id == ident and k.line is not None:
                line = k.line
    elif field_path == "links" and model.links and line is None:
        line = model.links[0].line
    if line is None:
        named = _CASE_NAMED.search(exc.message)
        case = next((c for c in model.cases if named and c.id == named.group(1)), None)
        line = case.line if case is not None else None
    return ModelError(exc.message, file=model.source, line=line, field=field_path,
                      expected=exc.expected)


def _analyse(model: Model, *, with_life: bool, with_shaft_checks: bool) -> Result:
    """The body of :func:`analyse` (which adds file locations to its errors)."""
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
    for group in shaft_groups(model):
        if len(group) == 1:
            shaft = model.shaft(group[0])
            bendings[shaft.id] = solve_shaft_bending(shaft, meshes[shaft.id], model,
                                                     applied_by_shaft[shaft.id])
        else:
            bendings.update(solve_coupled_group(model, group, meshes, applied_by_shaft))
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
        shaft_results.append(ShaftResult(shaft, tuple(cases), bending.condition))
        for b in shaft.bearings:
            bearing_results.append(BearingResult(shaft.id, b, tuple(per_bearing[b.id])))
    result = Result(model, tuple(shaft_results), tuple(bearing_results),
                    warnings=tuple(dict.fromkeys(warnings)),
                    flows=tuple(f for f in flows if f is not None))
    if with_life:
        from shaftsys.life_check import attach_life

        result = attach_life(result)
    if with_shaft_checks:
        from shaftsys.shaft_checks import check_shafts

        result = replace(result, checks=check_shafts(result))
    return result


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
    # --- axial arrangement rule: axial force each bearing puts on the shaft
    Ka = float(fx.sum())
    axial_on_shaft, induced = axial_reactions(shaft, Ka, {
        bid: math.hypot(r[0], r[1]) for bid, r in radial.items()})
    for b in shaft.bearings:
        fx[sm.bearing_nodes[b.id]] += axial_on_shaft[b.id]
    # --- axial and torsion by integration (statically determinate bars)
    N_node = -np.cumsum(fx)[:-1]        # internal axial force in each element
    T_elem = -np.cumsum(mx)[:-1]        # internal torque in each element
    ref_node = _axial_reference_node(shaft, sm, axial_on_shaft)
    ux = np.concatenate([[0.0], np.cumsum(N_node * mesh.L_mm / mesh.EA_N)])
    ux -= ux[ref_node]
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
               "for very soft bearing springs or extreme stiffness ratios between steps)"
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
            slope_rad=float(math.hypot(disp[node, 4], disp[node, 5])))
    sol = CaseSolution(
        case=case.id, speed_rpm=speed, torque_Nmm=float(np.abs(T_elem).max(initial=0.0)),
        node_x_mm=x, displacement=disp, stations_mm=stations, N_N=N_st, Vy_N=Vy, Vz_N=Vz,
        T_Nmm=T_st, My_Nmm=My, Mz_Nmm=Mz, applied=tuple(applied), force_residual_N=f_res,
        moment_residual_Nmm=m_res, residual_relative=rel, nodal_residual_relative=nodal_rel)
    return sol, loads


def _node_of(sm: ShaftMesh, load: AppliedLoad) -> int:
    """Node that carries ``load``: its element's node, else the node nearest its station."""
    if load.element is not None and load.element in sm.element_nodes:
        return sm.element_nodes[load.element]
    return int(np.argmin(np.abs(sm.mesh.x_mm - load.x_mm)))


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


def induced_axial_force(b: Bearing, Fr_N: Any) -> Any:
    """Axial force [N] a single-row angular-contact or tapered bearing induces under Fr.

    ``Fr_N`` may be a number or an array (design studies evaluate many variants at once).
    Tapered roller: 0.5*Fr/Y with the maker's Y (common practice). Angular-contact
    ball: 1.32*Fr*tan(alpha) (half load zone, point contact; Harris, from memory).
    Zero clearance and no preload are assumed.
    """
    if b.kind is BearingKind.TAPERED_ROLLER:
        if not b.Y:
            raise ModelError(f"bearing '{b.id}' needs the maker's Y for its induced "
                             "axial force", line=b.line, field=f"bearings[{b.id}].Y")
        return TRB_INDUCED_FACTOR * Fr_N / b.Y
    if b.kind is BearingKind.ANGULAR_CONTACT_BALL:
        alpha = math.radians(b.contact_angle_deg or 0.0)
        return ACBB_INDUCED_FACTOR * Fr_N * math.tan(alpha)
    return 0.0


def axial_reactions(shaft: Shaft, Ka_N: Any, Fr_N: dict[str, Any]
                    ) -> tuple[dict[str, Any], dict[str, Any]]:
    """Axial force each bearing puts on the shaft [N] for a net external thrust Ka_N.

    ``Ka_N`` and the radial loads may be numbers (one case) or arrays of one shape (many
    cases or variants at once); the results have the same form.

    Rules (the trade's, stated in DEVELOPERS.md):

    * one locating bearing (``axial: both``) takes all thrust;
    * cross-locating (one ``+x``, one ``-x`` bearing, no pair): the bearing that stops the
      shaft moving in the thrust's direction takes it;
    * adjusted pair (``pair``): with induced forces Fi of each bearing, bearing P
      (``+x``) and N (``-x``): if Fi_N + Ka >= Fi_P then Fa_P = Fi_N + Ka, Fa_N = Fi_N,
      else Fa_N = Fi_P - Ka, Fa_P = Fi_P.

    Returns the axial force on the shaft of every bearing and the induced forces used.
    """
    on_shaft: dict[str, Any] = {b.id: 0.0 for b in shaft.bearings}
    induced: dict[str, Any] = {}
    both = [b for b in shaft.bearings if b.axial is AxialRole.BOTH]
    if both:
        on_shaft[both[0].id] = -Ka_N
        return on_shaft, induced
    plus = next(b for b in shaft.bearings if b.axial is AxialRole.PLUS_X)
    minus = next(b for b in shaft.bearings if b.axial is AxialRole.MINUS_X)
    if plus.pair is None:
        on_shaft[plus.id] = _where(Ka_N >= 0, -Ka_N, 0.0)
        on_shaft[minus.id] = _where(Ka_N >= 0, 0.0, -Ka_N)
        return on_shaft, induced
    fi_p = induced_axial_force(plus, Fr_N[plus.id])
    fi_n = induced_axial_force(minus, Fr_N[minus.id])
    induced = {plus.id: fi_p, minus.id: fi_n}
    first = fi_n + Ka_N >= fi_p
    fa_p = _where(first, fi_n + Ka_N, fi_p)
    fa_n = _where(first, fi_n, fi_p - Ka_N)
    on_shaft[plus.id] = -fa_p   # P stops +x motion: pushes the shaft toward -x
    on_shaft[minus.id] = fa_n
    return on_shaft, induced


def _where(condition: Any, a: Any, b: Any) -> Any:
    """``np.where`` that gives a plain float for scalar arguments."""
    out = np.where(condition, a, b)
    return float(out) if out.ndim == 0 else out


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
                               _vec(mass * g), (0.0, 0.0, 0.0)))
    return out


def equilibrium_residual(applied: list[AppliedLoad], reactions: list[AppliedLoad]
                         ) -> tuple[float, float, float]:
    """Global force and moment balance of a free body.

    Returns the force residual [N], the moment residual about the origin [N*mm] and the
    larger of the two relative to the applied loads (force / sum|F|, moment / (sum|F|*L +
    sum|M|), with L the largest lever arm).
    """
    items = [*applied, *reactions]
    if not items:
        return 0.0, 0.0, 0.0
    f = np.array([a.force_N for a in items], dtype=float)
    m = np.array([a.moment_Nmm for a in items], dtype=float)
    x = np.array([a.x_mm for a in items], dtype=float)
    arm = float(np.abs(x).max()) or 1.0
    # moment of a force at (x, 0, 0): (x, 0, 0) x (fx, fy, fz) = (0, -x fz, x fy)
    r_cross_f = np.column_stack([np.zeros_like(x), -x * f[:, 2], x * f[:, 1]])
    F = f.sum(axis=0)
    M = m.sum(axis=0) + r_cross_f.sum(axis=0)
    norm_f = np.sqrt((f * f).sum(axis=1))
    scale_f = float(norm_f.sum())
    scale_m = float(np.sqrt((m * m).sum(axis=1)).sum() + norm_f.sum() * arm)
    f_res = float(np.linalg.norm(F))
    m_res = float(np.linalg.norm(M))
    rel = max(f_res / scale_f if scale_f > 0 else f_res,
              m_res / scale_m if scale_m > 0 else m_res)
    return f_res, m_res, rel


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
    xy = PlanarBending.from_mesh(mesh, supports, shear=shear,
                                 label=f"shaft '{shaft.id}', bending in the x-y plane")
    xz = PlanarBending.from_mesh(mesh, supports, shear=shear,
                                 label=f"shaft '{shaft.id}', bending in the x-z plane")
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
