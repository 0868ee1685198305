"""Benchmark: one full check of a model (solve every case + life) against PyNiteFEA.

Prints, side by side, the time shaftsys needs for a complete analysis of the bundled
fan shaft (mesh, factor, all cases, axial rules, equilibrium proof, ISO 281 life) and
the time PyNiteFEA (a general 3-D frame library) needs to solve the same reactions
(Euler-Bernoulli, no shaft weight in both, for a like-for-like comparison), the ratio,
the largest relative difference of the reactions, and the peak memory.

Run: ``python benchmarks/bench_check.py [--repeat N]``.
"""

from __future__ import annotations

import argparse
import dataclasses
import logging
import resource
import time
from pathlib import Path

import numpy as np

import shaftsys
from shaftsys.analysis import analyse, element_loads, mesh_shaft

MODEL = Path(__file__).resolve().parent.parent / "models" / "fan_drive.yaml"


def pynite_reactions(model, shaft) -> tuple[dict[str, np.ndarray], float]:
    """Solve the shaft in PyNiteFEA, all cases as load combinations; (reactions, seconds)."""
    from Pynite import FEModel3D

    t0 = time.perf_counter()
    sm = mesh_shaft(shaft, model.solver.max_element_mm)
    mesh = sm.mesh
    fe = FEModel3D()
    mat = shaft.material
    fe.add_material("steel", mat.E_MPa, mat.G_MPa, mat.poisson, 0.0)
    for i, x in enumerate(mesh.x_mm):
        fe.add_node(f"N{i}", float(x), 0.0, 0.0)
    for e in range(mesh.n_elements):
        name = f"S{e}"
        fe.add_section(name, float(mesh.A_mm2[e]), float(mesh.I_mm4[e]),
                       float(mesh.I_mm4[e]), float(mesh.J_mm4[e]))
        fe.add_member(f"M{e}", f"N{e}", f"N{e + 1}", "steel", name)
    drive_ref = None
    for b in shaft.bearings:
        node = f"N{sm.bearing_nodes[b.id]}"
        fe.def_support(node, support_DX=b.axial.value == "both", support_DY=True,
                       support_DZ=True)
    for case in model.cases:
        drive = case.drives[shaft.id]
        drive_ref = sm.element_nodes.get(drive.input_element or "", 0)
        applied, _ = element_loads(model, shaft, case)
        for a in applied:
            node = f"N{sm.element_nodes[a.source.removesuffix(' weight')]}"
            for comp, value in zip(("FX", "FY", "FZ"), a.force_N, strict=True):
                if value:
                    fe.add_node_load(node, comp, value, case=case.id)
            for comp, value in zip(("MX", "MY", "MZ"), a.moment_Nmm, strict=True):
                if value:
                    fe.add_node_load(node, comp, value, case=case.id)
        fe.add_load_combo(case.id, {case.id: 1.0})
    fe.def_support(f"N{drive_ref or 0}", support_DX=False, support_DY=False,
                   support_DZ=False, support_RX=True)
    # keep the supports of the bearings (def_support replaces flags of that node only)
    for b in shaft.bearings:
        node = f"N{sm.bearing_nodes[b.id]}"
        fe.def_support(node, support_DX=b.axial.value == "both", support_DY=True,
                       support_DZ=True, support_RX=node == f"N{drive_ref or 0}")
    fe.analyze_linear(check_statics=False)
    out = {}
    for b in shaft.bearings:
        n = fe.nodes[f"N{sm.bearing_nodes[b.id]}"]
        out[b.id] = np.array([[n.RxnFY[c.id], n.RxnFZ[c.id]] for c in model.cases])
    return out, time.perf_counter() - t0


def main() -> None:
    p = argparse.ArgumentParser(description=__doc__)
    p.add_argument("--repeat", type=int, default=50)
    args = p.parse_args()
    logging.getLogger("shaftsys").setLevel(logging.ERROR)  # warnings are in the results
    model = shaftsys.load_model(str(MODEL))
    model = dataclasses.replace(
        model, gravity_m_s2=(0.0, 0.0, 0.0),
        solver=dataclasses.replace(model.solver, shear_deformation=False))
    analyse(model)  # warm-up (imports)
    t0 = time.perf_counter()
    for _ in range(args.repeat):
        result = analyse(model)
    t_ours = (time.perf_counter() - t0) / args.repeat
    shaft = model.shafts[0]
    ref, t_pynite = pynite_reactions(model, shaft)
    worst = 0.0
    for b in result.bearings:
        ours = np.array([[-ld.Fy_N, -ld.Fz_N] for ld in b.loads])  # reaction on shaft
        scale = max(float(np.abs(ref[b.bearing.id]).max()), 1.0)
        worst = max(worst, float(np.abs(ours - ref[b.bearing.id]).max()) / scale)
    n_cases = len(model.cases)
    peak_mb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    print(f"model: {MODEL.name}, {n_cases} cases, "
          f"{sum(len(s.bearings) for s in model.shafts)} bearings")
    print(f"shaftsys full check (solve + life): {t_ours * 1e3:8.2f} ms per analysis "
          f"({1 / t_ours:,.0f} analyses/s)")
    print(f"PyNiteFEA reactions only:           {t_pynite * 1e3:8.2f} ms per analysis")
    print(f"ratio PyNiteFEA / shaftsys:          {t_pynite / t_ours:8.1f}x")
    print(f"largest reaction difference:         {worst:.2e} of the largest reaction")
    print(f"peak memory (RSS):                   {peak_mb:8.1f} MB")


if __name__ == "__main__":
    main()
