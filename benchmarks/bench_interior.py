"""Benchmark: the bearing interior of a 3-bearing shaft over 20 cases.

Prints the time of the element-load analysis (Newton solve of every bearing's
displacement, element loads, stiffness, reference life), vectorised over the cases,
on the invented demo `models/spindle_3brg.yaml` given estimated interiors. Then the
shaft solve with rigid supports against the nonlinear one (the bearings' tangent
stiffness iterated with the beam, `solver: {bearing_stiffness: nonlinear}`; target
under 50 ms for the 20 cases). Run: PYTHONPATH=. python3 benchmarks/bench_interior.py
"""

from __future__ import annotations

import dataclasses
import time
from pathlib import Path

from shaftsys.analysis import analyse
from shaftsys.analysis.interior import internal_results
from shaftsys.analysis.solve import solve_model
from shaftsys.io.loader import load_model
from shaftsys.model.interior_rules import estimate_interior


def main() -> None:
    path = Path(__file__).resolve().parent.parent / "models" / "spindle_3brg.yaml"
    model = load_model(path)
    shaft = model.shafts[0]
    bearings = tuple(dataclasses.replace(b, interior=estimate_interior(
        b.kind, b.d_mm, b.D_mm, b.B_mm, b.contact_angle_deg, b.e,
        clearance_mm=0.01)) for b in shaft.bearings)
    model = dataclasses.replace(model, shafts=(dataclasses.replace(shaft, bearings=bearings),
                                               *model.shafts[1:]))
    result = analyse(model, with_shaft_checks=False)
    n_cases = len(result.bearings[0].loads)
    best = float("inf")
    for _ in range(5):
        t0 = time.perf_counter()
        internal_results(result.bearings)
        best = min(best, time.perf_counter() - t0)
    print(f"bearings: {len(result.bearings)}, cases: {n_cases}")
    print(f"interior analysis (best of 5): {best * 1e3:.1f} ms "
          f"({best * 1e3 / (len(result.bearings) * n_cases):.2f} ms per bearing and case)")
    # the nonlinear shaft solve: the same shaft with the bearings' tangent stiffness
    # (condensation onto the bearing nodes, Newton over all cases at once)
    nonlinear = dataclasses.replace(model, solver=dataclasses.replace(
        model.solver, bearing_stiffness="nonlinear"))
    rigid_t = nonlinear_t = nonlinear_cpu = float("inf")
    solved = solve_model(nonlinear)
    for _ in range(7):
        t0 = time.perf_counter()
        solve_model(model)
        rigid_t = min(rigid_t, time.perf_counter() - t0)
        t0, c0 = time.perf_counter(), time.process_time()
        solved = solve_model(nonlinear)
        nonlinear_t = min(nonlinear_t, time.perf_counter() - t0)
        nonlinear_cpu = min(nonlinear_cpu, time.process_time() - c0)
    info = solved.shafts[0].nonlinear
    print(f"shaft solve, rigid supports (best of 7): {rigid_t * 1e3:.1f} ms")
    print(f"shaft solve, nonlinear bearings (best of 7): {nonlinear_t * 1e3:.1f} ms wall, "
          f"{nonlinear_cpu * 1e3:.1f} ms CPU "
          f"(target < 50 ms; Newton iterations per case {int(info.iterations.min())}.."
          f"{int(info.iterations.max())}, largest residual {float(info.residual.max()):.2g}, "
          f"axial by {info.axial})")


if __name__ == "__main__":
    main()
