"""Benchmark: design-study throughput of the batched evaluator against PyNiteFEA.

Model: the bundled three-bearing spindle (``models/spindle_3brg.yaml``, 20 cases).
Study: a 4-D grid over the stations of bearings B and C and two body diameters, so
EVERY variant has its own geometry (stiffness rebuilt and factored each time); each
variant-analysis is the full study result: reactions of every case, the axial rule,
deflections and slopes, ISO 281 lives of the three bearings and the system life.

Prints: variant-analyses per second on one core (evaluator alone, and with the results
table), the time PyNiteFEA (``from Pynite import FEModel3D``; build + analyze of the
same shaft, all cases as load combinations) needs per variant for a sample and the
ratio, the largest reaction difference to PyNiteFEA (Euler-Bernoulli, no shaft weight in
both for that comparison), a checksum of the results, a comparison of a random sample
against batch-of-one runs (bit for bit) and against ``shaftsys.analyse`` (relative),
and the peak memory (resource.getrusage). Targets (not asserted): >= 20 000
variant-analyses/s per core, >= 1000x PyNiteFEA.

Run: ``python benchmarks/bench_study.py [--n 20] [--pynite 4] [--sample 25]``.
"""

from __future__ import annotations

import os

os.environ.setdefault("OMP_NUM_THREADS", "1")
os.environ.setdefault("OPENBLAS_NUM_THREADS", "1")

import argparse
import dataclasses
import hashlib
import logging
import resource
import time
from pathlib import Path

import numpy as np
from pynite_reference import pynite_solve

import shaftsys
from shaftsys.analysis import analyse
from shaftsys.study.paths import model_with
from shaftsys.study.sweep import evaluate_values, make_study, results_frame

MODEL = Path(__file__).resolve().parent.parent / "models" / "spindle_3brg.yaml"


def study_for(model, n: int):
    return make_study(model, [
        ("bearing.B.at", f"212:248:{n}"),
        ("bearing.C.at", f"452:508:{n}"),
        ("step.spindle.2.d", f"60:70:{max(n // 2, 2)}"),
        ("step.spindle.4.d", f"64:76:{max(n // 2, 2)}"),
    ])


def main() -> None:
    p = argparse.ArgumentParser(description=__doc__)
    p.add_argument("--n", type=int, default=20, help="points per bearing station axis")
    p.add_argument("--pynite", type=int, default=4, help="variants solved by PyNiteFEA")
    p.add_argument("--sample", type=int, default=25, help="variants checked one by one")
    p.add_argument("--repeat", type=int, default=3)
    args = p.parse_args()
    logging.getLogger("shaftsys").setLevel(logging.ERROR)
    model = shaftsys.load_model(str(MODEL))
    study = study_for(model, args.n)
    N = study.n_variants
    values = study.values_block(0, N)
    warm, how = evaluate_values(study, values[:64])  # warm-up (imports, preparation)
    results_frame(study, np.arange(64), values[:64], warm, how)
    best = np.inf
    arrays = None
    for _ in range(args.repeat):
        t0 = time.perf_counter()
        arrays, method = evaluate_values(study, values)
        best = min(best, time.perf_counter() - t0)
    assert arrays is not None
    t0 = time.perf_counter()
    df = results_frame(study, np.arange(N), values, arrays, method)
    t_frame = time.perf_counter() - t0
    valid = int(df["valid"].sum())
    rate = N / best
    rate_frame = N / (best + t_frame)
    digest = hashlib.sha256()
    for a in (arrays.Lnm_h, arrays.margin, arrays.system_life_h, arrays.deflection_mm,
              arrays.el_deflection_mm):
        digest.update(np.ascontiguousarray(a).tobytes())
    # --- random sample: batch of one (bit for bit) and shaftsys.analyse (relative)
    rng = np.random.default_rng(7)
    sample = rng.choice(N, size=min(args.sample, N), replace=False)
    bit_equal = 0
    worst_rel = 0.0
    for i in sample:
        one, _ = evaluate_values(study, values[i : i + 1])
        same = all(np.array_equal(getattr(one, f)[0], getattr(arrays, f)[i], equal_nan=True)
                   for f in ("Lnm_h", "margin", "s0", "system_life_h", "deflection_mm",
                             "Fr_max_N"))
        bit_equal += int(same)
        variant, reason = model_with(model, study.quantities, values[i])
        if reason:
            continue
        res = analyse(variant, with_shaft_checks=False)
        ref = np.array([b.life.Lnm_h for b in res.bearings])
        worst_rel = max(worst_rel, float(np.max(np.abs(ref / arrays.Lnm_h[i] - 1.0))),
                        abs(res.system_life_h / arrays.system_life_h[i] - 1.0))
    # --- PyNiteFEA: same reactions, Euler-Bernoulli, no shaft weight in both
    like = dataclasses.replace(model, gravity_m_s2=(0.0, 0.0, 0.0), solver=dataclasses.replace(
        model.solver, shear_deformation=False))
    like_study = dataclasses.replace(study, model=like, _prep=[])
    pyn = rng.choice(N, size=min(args.pynite, N), replace=False)
    t_pyn = 0.0
    worst_rx = 0.0
    for i in pyn:
        variant, _ = model_with(like, study.quantities, values[i])
        t0 = time.perf_counter()
        ref = pynite_solve(variant, variant.shafts[0])
        t_pyn += time.perf_counter() - t0
        res = analyse(variant, with_life=False, with_shaft_checks=False)
        ours = np.array([[[-ld.Fy_N, -ld.Fz_N] for ld in b.loads] for b in res.bearings])
        worst_rx = max(worst_rx, float(np.abs(ours - ref).max() / np.abs(ref).max()))
        one, _ = evaluate_values(like_study, values[i : i + 1])
        fr_ref = np.hypot(ref[..., 0], ref[..., 1]).max(axis=1)
        worst_rx = max(worst_rx, float(np.max(np.abs(one.Fr_max_N[0] - fr_ref) / fr_ref.max())))
    t_pyn /= len(pyn)
    peak_mb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    print(f"model: {MODEL.name}, {len(model.cases)} cases, "
          f"{len(model.shafts[0].bearings)} bearings; study {study.shape} = {N} variants "
          f"({valid} valid), evaluator: {method}")
    print(f"variant-analyses per second (one core, evaluator):   {rate:12,.0f}")
    print(f"variant-analyses per second (with results table):     {rate_frame:12,.0f}")
    print(f"PyNiteFEA build + analyze per variant:                {t_pyn * 1e3:12.1f} ms")
    print(f"ratio PyNiteFEA / shaftsys per variant:               {t_pyn * rate:12,.0f}x")
    print(f"largest reaction difference to PyNiteFEA:             {worst_rx:12.2e} "
          "of the largest reaction")
    print(f"checksum (sha256 of lives, margins, deflections):     {digest.hexdigest()[:16]}")
    print(f"sum of system lives [h]:                              "
          f"{float(np.nansum(arrays.system_life_h)):.10e}")
    print(f"sample of {len(sample)}: bit-identical to a batch of one: {bit_equal}/{len(sample)}; "
          f"largest relative difference to shaftsys.analyse: {worst_rel:.2e}")
    print(f"peak memory (RSS):                                    {peak_mb:12.1f} MB")


if __name__ == "__main__":
    main()
