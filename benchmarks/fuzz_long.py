"""Long fuzz campaign of the loader and solver (the generators of tests/test_fuzz_models.py).

Runs at least 10 000 generated model files through ``shaftsys check --json`` (spread
over the generators and over worker processes, each with its own random seed). For each
mutation kind (``generator:operation``) it records the exit codes, the time relative to
the unmutated seed, tracebacks, broken contracts, contradictions in the JSON (ok true
beside a failed or not-evaluated check, NaN/inf, negative lives, ok against the exit
code) and slow paths (more than ``SLOW_FACTOR`` x the seed plus ``SLOW_ALLOWANCE_S``),
and prints their counts, the worst time ratios, the first failures (if any) and the
time the billion-laughs file takes to be refused.

    python benchmarks/fuzz_long.py                 # 10 000 examples, 2 workers
    python benchmarks/fuzz_long.py -n 30000 -w 4 --seed 7

Exit code 0 when no example broke the contract, 1 otherwise.
"""

from __future__ import annotations

import argparse
import multiprocessing as mp
import random
import re
import sys
import tempfile
import time
from collections import Counter
from concurrent.futures import ProcessPoolExecutor, as_completed
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path[:0] = [str(ROOT), str(ROOT / "tests")]


def _signature(message: str) -> str:
    """A message with numbers, paths and quoted names blanked (to group alike ones)."""
    message = re.sub(r"'[^']*'", "'_'", message)
    message = re.sub(r"\S*fuzzed\.yaml(:\d+)?", "FILE", message)
    return re.sub(r"[-+]?\d[\d.e+-]*", "#", message)[:160]


Stats = dict[str, Counter[str]]


def _worker(job: tuple[str, int, int]) -> tuple[Stats, list[str], int, Counter[str],
                                               dict[str, float]]:
    """Run ``count`` examples of one generator with one seed.

    Returns per mutation kind the counts of exit codes and failure categories, the first
    failures, the number of calls, the signatures of the exit-3 (ill-posed) and
    known-open messages, and per kind the largest time ratio to the seed.
    """
    import warnings

    import test_fuzz_models as fz
    from hypothesis import HealthCheck, given, seed, settings
    from hypothesis import strategies as st

    warnings.simplefilter("ignore")
    generator, count, run_seed = job
    failures: list[str] = []
    calls = 0
    notes: Counter[str] = Counter()
    stats: Stats = {}
    worst: dict[str, float] = {}
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)

        @seed(run_seed)
        @settings(max_examples=count, deadline=None, database=None, derandomize=False,
                  suppress_health_check=list(HealthCheck))
        @given(st.data())
        def run(data: st.DataObject) -> None:
            nonlocal calls
            calls += 1
            example = fz.GENERATORS[generator](data)
            try:
                outcome = fz.check_fuzzed(example, folder)
            except Exception as exc:  # a crash escaping main: record it, go on
                import traceback

                outcome = fz.Outcome("FAIL", None, "exception escaped main:\n"
                                     + "".join(traceback.format_exception(exc))[-3000:],
                                     "traceback")
            fz.HISTOGRAM[f"{generator}:{outcome.kind}"] += 1
            row = stats.setdefault(example.kind, Counter())
            row["n"] += 1
            row[f"exit {outcome.code}"] += 1
            if outcome.failed:
                row[outcome.category] += 1
            ratio = outcome.seconds / max(fz.seed_seconds(example.seed, folder), 1e-3)
            worst[example.kind] = max(worst.get(example.kind, 0.0), ratio)
            if outcome.kind in {"ill_posed", "known_open"}:
                notes[f"{outcome.kind}: {_signature(outcome.detail)}"] += 1
            if outcome.failed and len(failures) < 20:
                text = example.text
                sample = text if isinstance(text, str) else text.decode("utf-8", "replace")
                failures.append(f"[{example.kind}, seed {example.seed}] {outcome.category}: "
                                f"{outcome.detail}\n--- file (first 1500 chars) ---\n"
                                f"{sample[:1500]}")

        run()
    return stats, failures, calls, notes, worst


def billion_laughs_seconds() -> tuple[float, str]:
    """Time [s] to refuse the classic alias bomb, and the message."""
    from shaftsys.errors import ModelError
    from shaftsys.io.loader import load_model_text

    lines = ['a0: &a0 ["lol","lol","lol","lol","lol","lol","lol","lol","lol","lol"]']
    for i in range(1, 10):
        lines.append(f"a{i}: &a{i} [{','.join([f'*a{i - 1}'] * 10)}]")
    text = "\n".join(lines) + "\n"
    start = time.perf_counter()
    try:
        load_model_text(text, "bomb.yaml")
    except ModelError as exc:
        return time.perf_counter() - start, exc.message
    return time.perf_counter() - start, "NOT REFUSED"


def main(argv: list[str] | None = None) -> int:
    """Run the campaign and print the count and histogram."""
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("-n", "--examples", type=int, default=10_000)
    p.add_argument("-w", "--workers", type=int, default=2)
    p.add_argument("--seed", type=int, default=None)
    p.add_argument("--jobs-per-worker", type=int, default=4,
                   help="split the work in this many seeds per worker and generator")
    args = p.parse_args(argv)
    import test_fuzz_models as fz

    rng = random.Random(args.seed)
    gens = sorted(fz.GENERATORS)
    n_jobs = len(gens) * args.workers * args.jobs_per_worker
    per_job = -(-args.examples // n_jobs)
    jobs = [(g, per_job, rng.randrange(2**32)) for g in gens
            for _ in range(args.workers * args.jobs_per_worker)]
    start = time.perf_counter()
    stats: Stats = {}
    worst: dict[str, float] = {}
    failures: list[str] = []
    calls = 0
    notes: Counter[str] = Counter()
    lost: list[str] = []
    ctx = mp.get_context("fork")
    with ProcessPoolExecutor(args.workers, mp_context=ctx) as pool:
        futures = {pool.submit(_worker, job): job for job in jobs}
        for future in as_completed(futures):
            try:
                part, fails, n, seen, ratios = future.result()
            except Exception as exc:  # a worker that died (a crash of the interpreter)
                lost.append(f"job {futures[future]} lost: {exc!r}")
                print(lost[-1], flush=True)
                continue
            notes.update(seen)
            for kind, row in part.items():
                stats.setdefault(kind, Counter()).update(row)
            for kind, r in ratios.items():
                worst[kind] = max(worst.get(kind, 0.0), r)
            failures.extend(fails)
            calls += n
            done = sum(row["n"] for row in stats.values())
            print(f"... {done} examples, {time.perf_counter() - start:.0f} s", flush=True)
    elapsed = time.perf_counter() - start
    examples = sum(row["n"] for row in stats.values())
    print(f"\nexamples: {examples} (property calls {calls}) in {elapsed:.0f} s "
          f"with {args.workers} workers")
    print(f"slow path: more than {fz.SLOW_FACTOR:g} x the seed + {fz.SLOW_ALLOWANCE_S:g} s")
    print(f"{'mutation kind':28s} {'n':>6s} {'exit0':>6s} {'exit1':>6s} {'exit2':>6s} "
          f"{'exit3':>6s} {'trace':>6s} {'contr':>6s} {'contra':>6s} {'slow':>6s} "
          f"{'t/seed':>7s}")
    kinds: Counter[str] = Counter()
    for kind in sorted(stats):
        row = stats[kind]
        kinds.update({k: v for k, v in row.items()})
        print(f"  {kind:26s} {row['n']:6d} {row['exit 0']:6d} {row['exit 1']:6d} "
              f"{row['exit 2']:6d} {row['exit 3']:6d} {row['traceback']:6d} "
              f"{row['contract']:6d} {row['contradiction']:6d} {row['slow']:6d} "
              f"{worst.get(kind, 0.0):7.2f}")
    print(f"totals: examples {kinds['n']}, exit 0 {kinds['exit 0']}, exit 1 "
          f"{kinds['exit 1']}, exit 2 {kinds['exit 2']}, exit 3 {kinds['exit 3']}; "
          f"tracebacks {kinds['traceback']}, broken contracts {kinds['contract']}, "
          f"contradictions {kinds['contradiction']}, slow paths {kinds['slow']}")
    bad = (kinds["traceback"] + kinds["contract"] + kinds["contradiction"] + kinds["slow"]
           + len(lost))
    print(f"jobs: {len(jobs)} run, {len(lost)} lost")
    if notes:
        print("exit-3 (ill-posed) and known-open messages, grouped:")
        for sig, n in notes.most_common(15):
            print(f"  {n:6d}  {sig}")
    seconds, message = billion_laughs_seconds()
    print(f"billion-laughs file refused in {seconds * 1000:.1f} ms: {message}")
    for i, f in enumerate(failures[:12]):
        print(f"\n=== failure {i + 1} ===\n{f}")
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main())
