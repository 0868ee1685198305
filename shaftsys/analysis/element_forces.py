"""Element loads: what every gear, pulley, sprocket, coupling, process load, mass and
unbalance puts on its shaft in one case (shaft frame; N, N*mm, rpm).

Dispatches to the pure force models of :mod:`shaftsys.loads`; machine models take the
link forces and torques from the power flow (:mod:`shaftsys.machine.flow`).
"""

from __future__ import annotations

from dataclasses import replace
from typing import TYPE_CHECKING, Any

import numpy as np

from shaftsys import loads
from shaftsys.analysis.results import AppliedLoad
from shaftsys.model import (
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

if TYPE_CHECKING:
    from shaftsys.machine.flow import CaseFlow


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
                                       act.moment_Nmm, element=act.element,
                                       details=act.details, angle_deg=act.angle_deg))
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
    slack = dict(case.slack_tensions)
    for el in shaft.elements:
        if el.id not in linked:   # linked elements carry the link forces added above
            axis = _element_axis_load(el, torque.get(el.id, 0.0), speed, overrides,
                                      slack.get(el.id))
            if axis is not None:
                hubs = _at_hubs(el, el.id, axis.force_N, axis.moment_Nmm)
                hubs[0] = replace(hubs[0], details=tuple(axis.details.items()))
                out.extend(hubs)
                warnings.extend(f"case '{case.id}', element '{el.id}': {w}"
                                for w in axis.warnings)
        if el.mass_kg > 0 and np.any(g):
            w = loads.weight_load(el.mass_kg, g)
            out.extend(replace(h, weight=True)
                       for h in _at_hubs(el, f"{el.id} weight", w.force_N, w.moment_Nmm))
    return out, warnings


def element_case_forces(shaft: Shaft, applied: tuple[AppliedLoad, ...]
                        ) -> list[dict[str, Any]]:
    """What each element of ``shaft`` puts on it in one case (``applied``: the case's
    loads, :attr:`CaseSolution.applied`), JSON-ready, units in the keys.

    Per element: ``F_shaft_N``, ``M_shaft_Nmm`` (working load, hubs summed, shaft frame;
    ``M_shaft_Nmm[0]`` the torque), ``weight_N``; for an element with a mesh or strand
    angle theta (gears, pulleys, sprockets, couplings): ``tangential_N`` (along
    u_t = (0, -sin theta, cos theta)), ``radial_N`` (along -u_r, u_r = (0, cos theta,
    sin theta): positive pushes the shaft away from the mesh, e.g. a gear's separating
    force), ``axial_N`` (Fx); plus the force model's own terms (``W_t_N``, ``W_r_N``,
    ``W_a_N`` of a mesh, ``T_tight_N``, ``T_slack_N`` of a belt...); a linked element
    of a machine takes its angle and terms from the link.
    """
    out = []
    for el in shaft.elements:
        mine = [a for a in applied if a.element == el.id]
        F = np.zeros(3)
        M = np.zeros(3)
        W = np.zeros(3)
        details: dict[str, float] = {}
        theta = getattr(el, "mesh_angle_deg", None)
        if theta is None:
            theta = getattr(el, "radial_angle_deg", None)
        for a in mine:
            if a.weight:
                W += a.force_N
            else:
                F += a.force_N
                M += a.moment_Nmm
                details.update(a.details)
                if a.angle_deg is not None:
                    theta = a.angle_deg
        item: dict[str, Any] = {"id": el.id, "F_shaft_N": F.tolist(), "M_shaft_Nmm": M.tolist(),
                                "weight_N": W.tolist()}
        if theta is not None:
            t = np.radians(float(theta))
            item["angle_deg"] = float(theta)
            item["tangential_N"] = float(-F[1] * np.sin(t) + F[2] * np.cos(t))
            item["radial_N"] = float(-(F[1] * np.cos(t) + F[2] * np.sin(t)))
            item["axial_N"] = float(F[0])
        item.update({k: float(v) for k, v in details.items()})
        out.append(item)
    return out


def _at_hubs(el: Element, label: str, force: Any, moment: Any) -> list[AppliedLoad]:
    """The load of ``el`` at its station, or shared equally among a drum's hubs."""
    hubs = getattr(el, "hubs_mm", ())
    if not hubs:
        return [AppliedLoad(label, el.x_mm, vec3(force), vec3(moment), element=el.id)]
    n = float(len(hubs))
    f = vec3(np.asarray(force, dtype=float) / n)
    m = vec3(np.asarray(moment, dtype=float) / n)
    return [AppliedLoad(f"{label} hub {k + 1}", x, f, m, element=el.id)
            for k, x in enumerate(hubs)]


def vec3(a: Any) -> tuple[float, float, float]:
    """The first three entries of ``a`` as a tuple of floats (a force or moment)."""
    return (float(a[0]), float(a[1]), float(a[2]))


def _element_axis_load(el: Element, torque_Nmm: float, speed_rpm: float,
                       overrides: dict[str, Any], slack_tension_N: float | None = None
                       ) -> loads.AxisLoad | None:
    if isinstance(el, Gear):
        return loads.spur_helical_mesh_load(torque_Nmm, el.pitch_diameter_mm, el.mesh_angle_deg,
                                        el.normal_pressure_angle_deg, el.helix_angle_deg,
                                        el.hand, el.internal)
    if isinstance(el, BevelGear):
        return loads.bevel_mesh_load(torque_Nmm, el.mean_pitch_diameter_mm,
                                 el.pitch_cone_angle_deg, el.pressure_angle_deg,
                                 el.mesh_angle_deg, el.apex)
    if isinstance(el, Pulley):
        slack = slack_tension_N if slack_tension_N is not None else el.slack_tension_N
        if slack is not None:
            return loads.takeup_belt_hub_load(torque_Nmm, el.diameter_mm,
                                              el.mesh_angle_deg, el.wrap_angle_deg, slack,
                                              el.friction_coefficient, el.groove_angle_deg)
        return loads.belt_hub_load(torque_Nmm, el.diameter_mm, el.mesh_angle_deg,
                               el.wrap_angle_deg, el.pretension_N, el.friction_coefficient,
                               el.groove_angle_deg)
    if isinstance(el, Sprocket):
        return loads.chain_hub_load(torque_Nmm, el.pitch_diameter_mm, el.mesh_angle_deg,
                                el.wrap_angle_deg)
    if isinstance(el, Coupling):
        return loads.coupling_load(torque_Nmm, el.radial_force_N, el.radial_angle_deg)
    if isinstance(el, ProcessLoad):
        ov = overrides.get(el.id)
        force = ov.force_N if ov is not None else el.force_N
        moment = ov.moment_Nmm if ov is not None else el.moment_Nmm
        return loads.AxisLoad(np.asarray(force, float), np.asarray(moment, float))
    if isinstance(el, Unbalance):
        if el.unbalance_gmm == 0.0 or speed_rpm == 0.0:
            return None
        # U [g*mm] = m [kg] * e [mm] * 1000: take e = 1 mm, m = U / 1000 kg.
        return loads.unbalance_load(el.unbalance_gmm / 1000.0, 1.0, speed_rpm, el.phase_deg)
    if isinstance(el, LumpedMass):
        return None
    raise ValueError(f"unknown element type {type(el).__name__}")  # pragma: no cover
