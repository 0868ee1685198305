"""PyNiteFEA reference model of one shaft, shared by the benchmarks (test-only library).

Every mesh node of shaftsys becomes a PyNiteFEA node, every beam element a frame member
(Euler-Bernoulli) with the step's section; bearings are pin supports (axial held at the
locating one), the input element's node holds the twist; each case is a load combination.
Run the benchmarks as scripts (``python benchmarks/bench_*.py``) so this module imports.
"""

from __future__ import annotations

import numpy as np

from shaftsys.analysis import element_loads, mesh_shaft


def pynite_solve(model, shaft):
    """Build and analyse the shaft in PyNiteFEA; reactions (n_bearings, m, 2) [N]."""
    from Pynite import FEModel3D

    sm = mesh_shaft(shaft, model.solver.max_element_mm)
    mesh = sm.mesh
    fe = FEModel3D()
    mat = shaft.material
    fe.add_material("steel", mat.E_MPa, mat.G_MPa, mat.poisson, 0.0)
    for i, x in enumerate(mesh.x_mm):
        fe.add_node(f"N{i}", float(x), 0.0, 0.0)
    for e in range(mesh.n_elements):
        fe.add_section(f"S{e}", float(mesh.A_mm2[e]), float(mesh.I_mm4[e]),
                       float(mesh.I_mm4[e]), float(mesh.J_mm4[e]))
        fe.add_member(f"M{e}", f"N{e}", f"N{e + 1}", "steel", f"S{e}")
    drive_ref = 0
    for case in model.cases:
        drive = case.drives[shaft.id]
        drive_ref = sm.element_nodes.get(drive.input_element or "", 0)
        applied, _ = element_loads(model, shaft, case)
        for a in applied:
            node = f"N{sm.element_nodes[a.element or '']}"
            for comp, value in zip(("FX", "FY", "FZ"), a.force_N, strict=True):
                if value:
                    fe.add_node_load(node, comp, value, case=case.id)
            for comp, value in zip(("MX", "MY", "MZ"), a.moment_Nmm, strict=True):
                if value:
                    fe.add_node_load(node, comp, value, case=case.id)
        fe.add_load_combo(case.id, {case.id: 1.0})
    ref = f"N{drive_ref}"
    fe.def_support(ref, support_RX=True)
    for b in shaft.bearings:
        node = f"N{sm.bearing_nodes[b.id]}"
        fe.def_support(node, support_DX=b.axial.value == "both", support_DY=True,
                       support_DZ=True, support_RX=node == ref)
    fe.analyze_linear(check_statics=False)
    out = np.zeros((len(shaft.bearings), len(model.cases), 2))
    for j, b in enumerate(shaft.bearings):
        n = fe.nodes[f"N{sm.bearing_nodes[b.id]}"]
        for k, c in enumerate(model.cases):
            out[j, k] = (n.RxnFY[c.id], n.RxnFZ[c.id])
    return out


def pynite_solve_lean(model, shaft):
    """The shaft as a PyNiteFEA user models it; reactions (n_bearings, m, 2) [N].

    Nodes only where something happens: the step edges, the bearing pressure centres and
    the element stations (about 14 on the spindle), one frame member per interval with
    the section of the step it lies in (A = pi/4 (d^2 - bore^2), I = pi/64 (d^4 - bore^4),
    J = 2I), the loads of each case as a load combination, bearings as pins (axial held
    at the locating one), the twist held at the input element. Euler-Bernoulli, no
    shaft weight (as the comparison with shaftsys is run).
    """
    import math

    from Pynite import FEModel3D

    edges = [0.0]
    for st in shaft.steps:
        edges.append(edges[-1] + st.length_mm)
    stations = {b.id: round(b.support_x_mm, 9) for b in shaft.bearings}
    estations = {e.id: round(e.x_mm, 9) for e in shaft.elements}
    xs = sorted({round(x, 9) for x in edges} | set(stations.values()) | set(estations.values()))
    name = {x: f"N{i}" for i, x in enumerate(xs)}
    fe = FEModel3D()
    mat = shaft.material
    fe.add_material("steel", mat.E_MPa, mat.G_MPa, mat.poisson, 0.0)
    for x in xs:
        fe.add_node(name[x], float(x), 0.0, 0.0)
    for i in range(len(xs) - 1):
        mid = 0.5 * (xs[i] + xs[i + 1])
        k = next(j for j in range(len(shaft.steps)) if mid <= edges[j + 1])
        st = shaft.steps[k]
        A = math.pi / 4.0 * (st.d_mm**2 - st.bore_mm**2)
        inertia = math.pi / 64.0 * (st.d_mm**4 - st.bore_mm**4)
        fe.add_section(f"S{i}", A, inertia, inertia, 2.0 * inertia)
        fe.add_member(f"M{i}", name[xs[i]], name[xs[i + 1]], "steel", f"S{i}")
    drive_ref = xs[0]
    for case in model.cases:
        drive = case.drives[shaft.id]
        drive_ref = estations.get(drive.input_element or "", xs[0])
        applied, _ = element_loads(model, shaft, case)
        for a in applied:
            node = name[estations[a.element or ""]]
            for comp, value in zip(("FX", "FY", "FZ"), a.force_N, strict=True):
                if value:
                    fe.add_node_load(node, comp, value, case=case.id)
            for comp, value in zip(("MX", "MY", "MZ"), a.moment_Nmm, strict=True):
                if value:
                    fe.add_node_load(node, comp, value, case=case.id)
        fe.add_load_combo(case.id, {case.id: 1.0})
    ref = name[drive_ref]
    fe.def_support(ref, support_RX=True)
    for b in shaft.bearings:
        node = name[stations[b.id]]
        fe.def_support(node, support_DX=b.axial.value == "both", support_DY=True,
                       support_DZ=True, support_RX=node == ref)
    fe.analyze_linear(check_statics=False)
    out = np.zeros((len(shaft.bearings), len(model.cases), 2))
    for j, b in enumerate(shaft.bearings):
        n = fe.nodes[name[stations[b.id]]]
        for k, c in enumerate(model.cases):
            out[j, k] = (n.RxnFY[c.id], n.RxnFZ[c.id])
    return out, len(xs)
