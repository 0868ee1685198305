"""Power flow through a machine: speeds, torques and link forces of one case.

The shafts are the nodes of a graph (networkx) and the links its edges. From the input
element (signed speed of its shaft, input torque) speeds propagate through the links'
kinematic ratios, and power flows from the input to the outputs, which take the shares
of the output power the case states. A link passes on ``efficiency`` times the power
it receives; the difference is a loss torque that the housing reacts on the receiving
side, so it changes side when the power flow reverses (back-driving, braking).

Mesh forces come from the driving member's torque; the driven member gets the equal
and opposite force (both expressed in the housing frame and brought into each shaft's
own frame). At standstill (speed 0 with torque) the ratios hold and links pass torque
without loss.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import networkx as nx
import numpy as np

from shaftsys import loads as L
from shaftsys.errors import ModelError
from shaftsys.machine.geometry import LinkGeometry, link_geometry, owners, to_housing, to_shaft
from shaftsys.model import BevelGear, Case, Gear, Model, Pulley, Sprocket
from shaftsys.units import omega_rad_s

RATIO_TOL = 1e-9


@dataclass(frozen=True)
class LinkForces:
    """Forces of one link in one case.

    ``force_housing_N[i]``: force on member i in the housing frame; ``driver``: index of
    the driving member; ``power_W``: power the driver sends into the link; ``loss_W``.
    """

    link_id: str
    members: tuple[str, str]
    driver: int
    force_housing_N: tuple[tuple[float, float, float], tuple[float, float, float]]
    power_W: float
    loss_W: float
    details: dict[str, float] = field(default_factory=dict)


@dataclass(frozen=True)
class ElementAction:
    """Force and moment a linked element (or a loss) puts on its shaft axis (shaft frame)."""

    element: str
    shaft: str
    x_mm: float
    force_N: tuple[float, float, float]
    moment_Nmm: tuple[float, float, float]
    label: str
    #: mesh or strand direction of the link on this shaft [deg] (None: a loss torque)
    angle_deg: float | None = None
    #: the force model's terms for this member (``W_t_N``..., ``T_tight_N``...)
    details: tuple[tuple[str, float], ...] = ()


@dataclass(frozen=True)
class CaseFlow:
    """Speeds, element torques and link forces of one case."""

    case: str
    speed_rpm: dict[str, float]
    element_torque_Nmm: dict[str, float]
    actions: tuple[ElementAction, ...]
    links: tuple[LinkForces, ...]
    power_in_W: float
    power_out_W: float
    loss_W: float
    warnings: tuple[str, ...] = ()


def machine_graph(model: Model) -> tuple[nx.Graph, dict[str, LinkGeometry]]:
    """Graph of shafts (nodes) and links (edges), and each link's geometry."""
    g = nx.Graph()
    g.add_nodes_from(s.id for s in model.shafts)
    geos: dict[str, LinkGeometry] = {}
    for link in model.links:
        geo = link_geometry(model, link)
        geos[link.id] = geo
        a, b = geo.shafts[0].id, geo.shafts[1].id
        if g.has_edge(a, b):
            raise ModelError(f"shafts '{a}' and '{b}' are joined by two links "
                             f"('{g.edges[a, b]['link']}' and '{link.id}'): parallel power "
                             "paths are statically indeterminate and not supported",
                             line=link.line, field=f"links[{link.id}]",
                             expected="one link between two shafts")
        g.add_edge(a, b, link=link.id)
    return g, geos


def case_flow(model: Model, case: Case,
              machine: tuple[nx.Graph, dict[str, LinkGeometry]] | None = None) -> CaseFlow:
    """Speeds, torques and link forces of every shaft in ``case`` (machine models).

    ``machine`` is :func:`machine_graph` of the model, built once for all cases by a
    caller that has it (built here otherwise).
    """
    graph, geos = machine if machine is not None else machine_graph(model)
    own = owners(model)
    (root, drive), = case.drives.items()
    if drive.input_element is None:
        raise ModelError(f"case '{case.id}' has no input", line=case.line,
                         field=f"cases[{case.id}].input", expected="an input element")
    if not nx.is_connected(graph):
        reached = nx.node_connected_component(graph, root)
        missing = [s.id for s in model.shafts if s.id not in reached]
        raise ModelError(f"shaft(s) {', '.join(repr(m) for m in missing)} are not reached "
                         f"by any link from the input shaft '{root}'",
                         field="links", expected="links that join every shaft")
    if graph.number_of_edges() != graph.number_of_nodes() - 1:
        cycle = nx.find_cycle(graph)
        _check_loop(graph, geos, cycle)
        raise ModelError("the links form a closed loop of shafts "
                         f"({' - '.join(a for a, _ in cycle)}): split power paths are "
                         "statically indeterminate and not supported",
                         field="links", expected="a tree of links")
    # --- speeds (kinematic ratios), on real or, at standstill, unit virtual speeds
    standstill = drive.speed_rpm == 0.0
    n_root = 1.0 if standstill else drive.speed_rpm
    speed: dict[str, float] = {root: n_root}
    parent: dict[str, tuple[str, str]] = {}   # child shaft -> (parent shaft, link id)
    for p, c in nx.bfs_edges(graph, root):
        lid = graph.edges[p, c]["link"]
        geo = geos[lid]
        ratio = geo.ratio if geo.shafts[0].id == p else 1.0 / geo.ratio
        speed[c] = speed[p] * ratio
        parent[c] = (p, lid)
    # --- power: input and output shares
    T_in = drive.input_torque_Nmm
    P_in = T_in * omega_rad_s(n_root) / 1000.0
    forward = P_in >= 0.0

    def eff(lid: str) -> float:
        eta = 1.0 if standstill else next(k.efficiency for k in model.links if k.id == lid)
        return eta if forward else 1.0 / eta

    def path_factor(shaft_id: str) -> float:
        f = 1.0
        while shaft_id in parent:
            p, lid = parent[shaft_id]
            f *= eff(lid)
            shaft_id = p
        return f

    outs = [(el, share, own[el][0].id) for el, share in drive.outputs]
    denom = sum(share / path_factor(sid) for _, share, sid in outs)
    P_out_total = P_in / denom if denom > 0 else 0.0
    power: dict[str, float] = {drive.input_element: P_in}   # power entering each shaft
    for el, share, _sid in outs:
        power[el] = power.get(el, 0.0) - share * P_out_total
    # power through each link, child side, from the outputs of the child's subtree
    children: dict[str, list[str]] = {}
    for c, (p, _) in parent.items():
        children.setdefault(p, []).append(c)

    def subtree_demand(sid: str) -> float:
        """Power entering shaft ``sid`` from its parent = what its subtree delivers."""
        total = sum(share * P_out_total for _el, share, s in outs if s == sid)
        for c in children.get(sid, []):
            total += subtree_demand(c) / eff(parent[c][1])
        return total

    links_out: list[LinkForces] = []
    actions: list[ElementAction] = []
    warnings: list[str] = []
    torque: dict[str, float] = {}
    for c, (p, lid) in parent.items():
        geo = geos[lid]
        i_p = 0 if geo.shafts[0].id == p else 1
        i_c = 1 - i_p
        p_child_in = subtree_demand(c)
        p_parent_out = p_child_in / eff(lid)
        power[geo.elements[i_p].id] = power.get(geo.elements[i_p].id, 0.0) - p_parent_out
        power[geo.elements[i_c].id] = power.get(geo.elements[i_c].id, 0.0) + p_child_in
    for el_id, p_w in power.items():
        sid = own[el_id][0].id
        torque[el_id] = p_w * 1000.0 / omega_rad_s(speed[sid])
    for link in model.links:
        geo = geos[link.id]
        lf, acts, warns = _link_forces(geo, torque, speed, standstill)
        links_out.append(lf)
        actions.extend(acts)
        warnings.extend(f"case '{case.id}', link '{link.id}': {w}" for w in warns)
    real_speed = {s: (0.0 if standstill else n) for s, n in speed.items()}
    p_out = P_out_total if not standstill else 0.0
    return CaseFlow(case=case.id, speed_rpm=real_speed, element_torque_Nmm=torque,
                    actions=tuple(actions), links=tuple(links_out),
                    power_in_W=0.0 if standstill else P_in, power_out_W=p_out,
                    loss_W=0.0 if standstill else P_in - P_out_total,
                    warnings=tuple(warnings))


def _check_loop(graph: nx.Graph, geos: dict[str, LinkGeometry], cycle: list) -> None:
    """Refuse a loop whose ratios disagree (one consistent speed per shaft)."""
    product = 1.0
    for a, b in cycle:
        geo = geos[graph.edges[a, b]["link"]]
        product *= geo.ratio if geo.shafts[0].id == a else 1.0 / geo.ratio
    if abs(product - 1.0) > RATIO_TOL:
        raise ModelError("the links form a loop whose ratios disagree (around "
                         f"{' - '.join(a for a, _ in cycle)} the speed ratio is "
                         f"{product:.6g}, not 1): no shaft can have one speed",
                         field="links", expected="consistent ratios around every loop")


def _link_forces(geo: LinkGeometry, torque: dict[str, float], speed: dict[str, float],
                 standstill: bool) -> tuple[LinkForces, list[ElementAction], list[str]]:
    ea, eb = geo.elements
    sa, sb = geo.shafts
    ta, tb = torque.get(ea.id, 0.0), torque.get(eb.id, 0.0)
    pa = ta * speed[sa.id]          # sign of the power entering shaft a through ea
    driver = 0 if pa < 0 or (pa == 0 and tb * speed[sb.id] > 0) else 1
    d, o = driver, 1 - driver
    shafts = (sa, sb)
    els = (ea, eb)
    t_drv = (ta, tb)[d]
    t_flow_driven = (ta, tb)[o]
    # ideal torque of the driven member (no loss): T_o = -T_d * (r_o / r_d) * sign(i)
    r = geo.radii_mm
    sign_ratio = math.copysign(1.0, geo.ratio)
    t_ideal = -t_drv * (r[o] / r[d]) * sign_ratio
    warns: list[str] = []
    acts: list[ElementAction] = []
    if geo.link.kind in {"gear_mesh", "bevel_mesh"}:
        load = _mesh_load(els[d], t_drv, geo.angles_deg[d])
        f_h = to_housing(shafts[d], load.force_N)
        f_o = to_shaft(shafts[o], -f_h)
        p_o = geo.radii_mm[o] * np.array([0.0, math.cos(math.radians(geo.angles_deg[o])),
                                          math.sin(math.radians(geo.angles_deg[o]))])
        m_o = np.cross(p_o, f_o)
        loads = {d: (load.force_N, load.moment_Nmm), o: (f_o, m_o)}
        forces_h = {d: f_h, o: -f_h}
        details = dict(load.details)
        member_details = {d: details, o: {k: v for k, v in details.items()
                                          if k in ("W_t_N", "W_r_N", "W_a_N")}}
    else:
        wraps = geo.wrap_deg or (180.0, 180.0)
        loads = {}
        forces_h = {}
        details = {}
        member_details = {}
        for k, t_k in ((d, t_drv), (o, t_ideal)):
            el = els[k]
            if isinstance(el, Pulley):
                lk = L.belt_hub_load(t_k, el.diameter_mm, geo.angles_deg[k], wraps[k],
                                     geo.link.pretension_N or 0.0, el.friction_coefficient,
                                     el.groove_angle_deg)
            else:
                assert isinstance(el, Sprocket)
                lk = L.chain_hub_load(t_k, el.pitch_diameter_mm, geo.angles_deg[k], wraps[k])
            if k == d:
                warns.extend(lk.warnings)
                details = dict(lk.details)
            loads[k] = (lk.force_N, lk.moment_Nmm)
            member_details[k] = dict(lk.details)
            forces_h[k] = to_housing(shafts[k], lk.force_N)
    for k in (0, 1):
        f, m = loads[k]
        acts.append(ElementAction(els[k].id, shafts[k].id, els[k].x_mm, _t(f), _t(m),
                                  els[k].id, float(geo.angles_deg[k]),
                                  tuple(member_details[k].items())))
    loss_torque = t_flow_driven - float(loads[o][1][0])
    if abs(loss_torque) > 0.0:
        acts.append(ElementAction(els[o].id, shafts[o].id, els[o].x_mm, (0.0, 0.0, 0.0),
                                  (loss_torque, 0.0, 0.0), f"{geo.link.id} loss"))
    p_driver = -t_drv * _omega(speed[shafts[d].id], standstill) / 1000.0
    p_driven = t_flow_driven * _omega(speed[shafts[o].id], standstill) / 1000.0
    lf = LinkForces(link_id=geo.link.id, members=(ea.id, eb.id), driver=d,
                    force_housing_N=(_t(forces_h[0]), _t(forces_h[1])),
                    power_W=p_driver, loss_W=p_driver - p_driven, details=details)
    return lf, acts, warns


def _omega(n: float, standstill: bool) -> float:
    return 0.0 if standstill else omega_rad_s(n)


def _mesh_load(el: object, t: float, angle: float) -> L.AxisLoad:
    if isinstance(el, Gear):
        return L.spur_helical_mesh_load(t, el.pitch_diameter_mm, angle,
                                        el.normal_pressure_angle_deg, el.helix_angle_deg,
                                        el.hand, el.internal)
    assert isinstance(el, BevelGear)
    return L.bevel_mesh_load(t, el.mean_pitch_diameter_mm, el.pitch_cone_angle_deg,
                             el.pressure_angle_deg, angle, el.apex)


def _t(v: object) -> tuple[float, float, float]:
    a = np.asarray(v, dtype=float)
    return (float(a[0]), float(a[1]), float(a[2]))
