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
from pynite_reference import pynite_solve

import shaftsys
from shaftsys.analysis import analyse

MODEL = Path(__file__).resolve().parent.parent / "models" / "fan_drive.yaml"


def pynite_reactions(model, shaft) -> tuple[dict[str, np.ndarray], float]:
    """Reactions per bearing from PyNiteFEA (build + analyse) and the seconds it took."""
    import Pynite  # noqa: F401 - imported before the clock starts, as for shaftsys

    t0 = time.perf_counter()
    out = pynite_solve(model, shaft)
    seconds = time.perf_counter() - t0
    return {b.id: out[j] for j, b in enumerate(shaft.bearings)}, seconds


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
