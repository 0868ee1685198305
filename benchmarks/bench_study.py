"""Benchmark: design-study throughput of the batched evaluator against PyNiteFEA.

Model: the bundled three-bearing spindle (``models/spindle_3brg.yaml``, 20 cases).
Study: a 4-D grid over the stations of bearings B and C and two body diameters, so
EVERY variant has its own geometry (stiffness rebuilt and factored each time); each
variant-analysis is the full study result: reactions of every case, the axial rule,
deflections and slopes, ISO 281 lives of the three bearings and the system life.

Prints: variant-analyses per second on one core (evaluator alone, and with the results
table; and per CPU second of the evaluator, the steadier figure on a shared machine),
the variants per second of PyNiteFEA (``from Pynite import FEModel3D``; build +
analyze of the same shaft, all cases as load combinations) modelled as its users would
(nodes at the step edges, bearings and loads only: the *lean* peer, about 14 nodes) and,
for reference, on shaftsys's fine analysis mesh, with the ratios; the peer samples are
timed between the repeats of shaftsys so that both see the same machine load. Then the
largest reaction difference to PyNiteFEA (Euler-Bernoulli, no shaft weight in both for
that comparison), a checksum, a random sample against batch-of-one runs (bit for bit)
and against ``shaftsys.analyse`` (largest relative difference of reactions, lives and
system life), a flop estimate per variant against the measured time, and the peak
memory. ``--scaling`` prints the table of microseconds per variant against the number
of cases, bearings and shaft steps (DEVELOPERS.md); ``--thermal`` the variants per
second with an invented heat balance off and on (DEVELOPERS.md). Targets (not asserted): >= 50 000
variant-analyses/s per core, >= 5000x the lean PyNiteFEA model.

Run: ``python benchmarks/bench_study.py [--n 20] [--pynite 4] [--sample 25] [--scaling]
[--thermal]``.
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
from pynite_reference import pynite_solve, pynite_solve_lean

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


def flop_estimate(prep, model) -> float:
    """Floating-point operations of one variant (counted from the algorithm, approximate).

    Band assembly ~30 per element; banded Cholesky (bandwidth u = 3) ~2u^2 + 2u + 2 per
    DOF; forward and back substitution 4u + 2 per DOF and unit column; reactions and
    balance ~20 per support and column; superposition 2 per (output node, case, plane,
    unit column); lives ~60 per (bearing, case) with each pow/exp/log counted as 20.
    """
    shaft = prep.shaft
    n_nodes = len(shaft.steps) + 1 + len(shaft.bearings) + len(shaft.elements)
    ndof = 2 * n_nodes
    m = len(model.cases)
    nc = 2 * len({e.x_mm for e in shaft.elements}) + 2
    u = 3
    nb, ne = len(shaft.bearings), len(shaft.elements)
    fe = 30 * (n_nodes - 1) + (2 * u * u + 2 * u + 2) * ndof + (4 * u + 2) * ndof * nc
    fe += 20 * nb * nc + 2 * (2 * nb + 2 * (nb + ne)) * 2 * m * nc
    life = 60 * nb * m + 6 * 20 * nb * m
    return float(fe + life)


def _scaled_model(model, *, cases: int | None = None, bearings: int | None = None,
                  split: int = 1):
    """The spindle with k cases (repeated), 2..4 bearings, or every step split in parts."""
    shaft = model.shafts[0]
    if split > 1:
        steps = tuple(dataclasses.replace(st, length_mm=st.length_mm / split)
                      for st in shaft.steps for _ in range(split))
        shaft = dataclasses.replace(shaft, steps=steps)
    if bearings == 2:
        shaft = dataclasses.replace(shaft, bearings=tuple(b for b in shaft.bearings
                                                          if b.id != "B"))
    elif bearings == 4:
        c = next(b for b in shaft.bearings if b.id == "C")
        d = dataclasses.replace(c, id="D", x_mm=410.0, d_mm=62.0, D_mm=110.0)
        shaft = dataclasses.replace(shaft, bearings=(*shaft.bearings, d))
    out = dataclasses.replace(model, shafts=(shaft,))
    if cases is not None:
        base = model.cases
        out = dataclasses.replace(out, cases=tuple(
            dataclasses.replace(base[k % len(base)], id=f"{base[k % len(base)].id}_{k}")
            for k in range(cases)))
    return out


def scaling_table(model) -> None:
    """Microseconds per variant against cases, bearings and steps (2000 variants each)."""
    rows = [("cases", k, _scaled_model(model, cases=k)) for k in (5, 20, 80)]
    rows += [("bearings", k, _scaled_model(model, bearings=k)) for k in (2, 3, 4)]
    rows += [("steps", 8 * k, _scaled_model(model, split=k)) for k in (1, 2, 4, 8)]
    print("| varied | value | us per variant (wall) | us per variant (CPU) |")
    print("|---|---|---|---|")
    for what, k, mdl in rows:
        st = make_study(mdl, [("bearing.C.at", "452:508:50"), ("bearing.A.C", "20000:24000:40")])
        vals = st.values_block(0, st.n_variants)
        evaluate_values(st, vals[:16])
        times = [_timed(st, vals) for _ in range(3)]
        wall, cpu = min(t[0] for t in times), min(t[1] for t in times)
        print(f"| {what} | {k} | {wall / st.n_variants * 1e6:.1f} | "
              f"{cpu / st.n_variants * 1e6:.1f} |")


def thermal_model(model):
    """The spindle with an invented heat balance: the duty cases' typed temperatures
    dropped, so every variant's lives use the temperatures the balance computes."""
    from shaftsys.model.thermal import HeatBalance

    hb = HeatBalance(ambient_C=25.0, conductance_W_K=60.0, extra_loss_W=150.0,
                     search_limit_C=200.0)
    cases = tuple(dataclasses.replace(c, temperature_C=float("nan"))
                  if c.kind.value == "duty" else c for c in model.cases)
    return dataclasses.replace(model, thermal=hb, cases=cases)


def thermal_table(model, n: int, repeat: int, sample: int) -> None:
    """Variants per second with the heat balance off (typed temperatures) and on."""
    hot = thermal_model(model)
    off, on = study_for(model, n), study_for(hot, n)
    N = off.n_variants
    values = off.values_block(0, N)
    for st in (off, on):
        evaluate_values(st, values[:64])
    t_off, t_on = np.inf, np.inf
    arrays = None
    for _ in range(repeat):   # alternately, so that both see the same machine load
        t_off = min(t_off, _timed(off, values)[0])
        t0 = time.perf_counter()
        arrays, method = evaluate_values(on, values)
        t_on = min(t_on, time.perf_counter() - t0)
    assert arrays is not None and arrays.thermal is not None
    df = results_frame(on, np.arange(N), values, arrays, method)
    rng = np.random.default_rng(11)
    worst = 0.0
    for i in rng.choice(N, size=min(sample, N), replace=False):
        variant, reason = model_with(hot, on.quantities, values[i])
        if reason:
            continue
        res = analyse(variant, with_shaft_checks=False)
        t_ref = float(np.max(res.thermal.used_C[res.thermal.evaluated]))
        worst = max(worst, abs(df["temperature_max_C"].iloc[i] / t_ref - 1.0), *(
            abs(df[f"{b.bearing.id}.Lnm_h"].iloc[i] / b.life.Lnm_h - 1.0)
            for b in res.bearings if b.life is not None))
    print(f"study {off.shape} = {N} variants of {MODEL.name}, evaluator: {method}")
    print(f"variants per second, heat balance off (typed temperatures): {N / t_off:10,.0f}")
    print(f"variants per second, heat balance on (computed):            {N / t_on:10,.0f}")
    print(f"cost of the heat balance: {t_on / t_off:.2f}x the time; temperatures "
          f"{df['temperature_max_C'].min():.2f}..{df['temperature_max_C'].max():.2f} degC, "
          f"runaway {int(df['thermal_runaway'].sum())}, thermal fails "
          f"{int((~df['thermal_ok']).sum())}")
    print(f"sample of {min(sample, N)}: largest relative difference to shaftsys.analyse "
          f"(temperature_max_C, Lnm_h): {worst:.2e}")


def _timed(st, vals) -> tuple[float, float]:
    """(wall, CPU) seconds of one evaluation (CPU time is steadier on a shared machine)."""
    t0, c0 = time.perf_counter(), time.process_time()
    evaluate_values(st, vals)
    return time.perf_counter() - t0, time.process_time() - c0


def main() -> None:
    p = argparse.ArgumentParser(description=__doc__)
    p.add_argument("--n", type=int, default=20, help="points per bearing station axis")
    p.add_argument("--pynite", type=int, default=4, help="variants solved by PyNiteFEA")
    p.add_argument("--sample", type=int, default=25, help="variants checked one by one")
    p.add_argument("--repeat", type=int, default=3)
    p.add_argument("--scaling", action="store_true", help="print the scaling table only")
    p.add_argument("--thermal", action="store_true",
                   help="print variants/s with the heat balance off and on only")
    args = p.parse_args()
    logging.getLogger("shaftsys").setLevel(logging.ERROR)
    model = shaftsys.load_model(str(MODEL))
    if args.scaling:
        scaling_table(model)
        return
    if args.thermal:
        thermal_table(model, args.n, args.repeat, args.sample)
        return
    study = study_for(model, args.n)
    N = study.n_variants
    values = study.values_block(0, N)
    warm, how = evaluate_values(study, values[:64])  # warm-up (imports, preparation)
    results_frame(study, np.arange(64), values[:64], warm, how)
    like = dataclasses.replace(model, gravity_m_s2=(0.0, 0.0, 0.0), solver=dataclasses.replace(
        model.solver, shear_deformation=False))
    rng = np.random.default_rng(7)
    pyn = rng.choice(N, size=min(args.pynite, N), replace=False)
    best = best_cpu = np.inf
    arrays = None
    t_lean: list[float] = []
    t_fine: list[float] = []
    lean_nodes = 0
    for r in range(max(args.repeat, len(pyn))):
        if r < args.repeat:
            t0, c0 = time.perf_counter(), time.process_time()
            arrays, method = evaluate_values(study, values)
            best = min(best, time.perf_counter() - t0)
            best_cpu = min(best_cpu, time.process_time() - c0)
        if r < len(pyn):   # one peer variant of each kind between our repeats
            variant, _ = model_with(like, study.quantities, values[pyn[r]])
            t0 = time.perf_counter()
            _, lean_nodes = pynite_solve_lean(variant, variant.shafts[0])
            t_lean.append(time.perf_counter() - t0)
            t0 = time.perf_counter()
            pynite_solve(variant, variant.shafts[0])
            t_fine.append(time.perf_counter() - t0)
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
        fr = np.array([max(ld.Fr_N for ld in b.loads) for b in res.bearings])
        worst_rel = max(worst_rel, float(np.max(np.abs(ref / arrays.Lnm_h[i] - 1.0))),
                        float(np.max(np.abs(fr / arrays.Fr_max_N[i] - 1.0))),
                        abs(res.system_life_h / arrays.system_life_h[i] - 1.0))
    # --- PyNiteFEA: same reactions, Euler-Bernoulli, no shaft weight in both
    like_study = dataclasses.replace(study, model=like, _prep=[])
    worst_rx = 0.0
    for i in pyn:
        variant, _ = model_with(like, study.quantities, values[i])
        ref, _ = pynite_solve_lean(variant, variant.shafts[0])
        res = analyse(variant, with_life=False, with_shaft_checks=False)
        ours = np.array([[[-ld.Fy_N, -ld.Fz_N] for ld in b.loads] for b in res.bearings])
        worst_rx = max(worst_rx, float(np.abs(ours - ref).max() / np.abs(ref).max()))
        one, _ = evaluate_values(like_study, values[i : i + 1])
        fr_ref = np.hypot(ref[..., 0], ref[..., 1]).max(axis=1)
        worst_rx = max(worst_rx, float(np.max(np.abs(one.Fr_max_N[0] - fr_ref) / fr_ref.max())))
    lean_s = float(np.median(t_lean))
    fine_s = float(np.median(t_fine))
    flops = flop_estimate(study.prepared(), model)
    peak_mb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    print(f"model: {MODEL.name}, {len(model.cases)} cases, "
          f"{len(model.shafts[0].bearings)} bearings; study {study.shape} = {N} variants "
          f"({valid} valid), evaluator: {method}")
    print(f"variant-analyses per second (one core, evaluator):   {rate:12,.0f}")
    print(f"variant-analyses per second (with results table):     {rate_frame:12,.0f}")
    print(f"variant-analyses per CPU second (evaluator; steadier when the machine is "
          f"shared): {N / best_cpu:12,.0f}")
    print(f"PyNiteFEA, lean model ({lean_nodes} nodes), variants per second: "
          f"{1.0 / lean_s:12,.2f}  ({lean_s * 1e3:.1f} ms each)")
    print(f"PyNiteFEA, shaftsys's fine mesh, variants per second:  {1.0 / fine_s:12,.2f}  "
          f"({fine_s * 1e3:.1f} ms each)")
    print(f"ratio shaftsys / lean PyNiteFEA:                      {lean_s * rate:12,.0f}x")
    print(f"ratio shaftsys / fine-mesh PyNiteFEA (flattering):    {fine_s * rate:12,.0f}x")
    print(f"largest reaction difference to PyNiteFEA (lean):      {worst_rx:12.2e} "
          "of the largest reaction")
    print(f"flop estimate per variant:                            {flops:12,.0f} "
          f"({flops * rate / 1e9:.2f} GFLOP/s achieved; one Haswell core peaks near 40, "
          f"so {40e9 / (flops * rate):.0f}x from the arithmetic limit)")
    print(f"checksum (sha256 of lives, margins, deflections):     {digest.hexdigest()[:16]}")
    print(f"sum of system lives [h]:                              "
          f"{float(np.nansum(arrays.system_life_h)):.10e}")
    print(f"sample of {len(sample)}: bit-identical to a batch of one: {bit_equal}/{len(sample)}; "
          f"largest relative difference to shaftsys.analyse "
          f"(Fr_max, Lnm_h, system life): {worst_rel:.2e}")
    print(f"peak memory (RSS):                                    {peak_mb:12.1f} MB")


if __name__ == "__main__":
    main()
