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
