"""Benchmark: wall time of one command-line run, from process start to exit.

Runs ``python -m shaftsys check MODEL -q`` for every bundled model, ``validate``,
``new -`` and ``schema``, each several times in a fresh subprocess (wall clock), next to
a bare interpreter (``python -c pass``), and prints the best and median seconds and the
ratio to the bare interpreter. With ``--peer PATH`` (another checkout of shaftsys, e.g.
the base commit) every command is also run with that checkout, alternately with this
one so that both see the same machine load, and the ratio peer/this is printed.
Targets (not asserted): check < 1 s, validate < 0.6 s, new and schema well under 1 s.

Bytecode: an installed package has its ``.pyc`` files (pip compiles at install), so by
default each checkout's bytecode is cached in a private folder
(``PYTHONPYCACHEPREFIX``, ``PYTHONDONTWRITEBYTECODE`` removed for the child) and every
command runs once untimed first. ``--no-bytecode`` measures as the calling environment
is (with ``PYTHONDONTWRITEBYTECODE=1`` every run compiles every shaftsys module, some
0.15-0.3 s). The CPU seconds (user + system) of each run are printed too: on a shared
machine they vary less than the wall clock.

Run: ``python benchmarks/bench_startup.py [--repeat 7] [--peer /path/to/checkout]
[--no-bytecode]``.
"""

from __future__ import annotations

import argparse
import os
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent.parent
MODELS = sorted((HERE / "models").glob("*.yaml"))


def commands() -> list[tuple[str, list[str]]]:
    """(label, arguments after ``python``) of every timed command."""
    out: list[tuple[str, list[str]]] = [("python -c pass", ["-c", "pass"])]
    for m in MODELS:
        out.append((f"check {m.name}", ["-m", "shaftsys", "check", str(m), "-q"]))
    out.append(("validate fan_drive.yaml",
                ["-m", "shaftsys", "validate", str(HERE / "models" / "fan_drive.yaml"), "-q"]))
    out.append(("new -", ["-m", "shaftsys", "new", "-"]))
    out.append(("schema", ["-m", "shaftsys", "schema", "-o",
                           os.path.join(tempfile.gettempdir(), "shaftsys_schema.json"), "-q"]))
    return out


def child_env(root: Path, cache: Path | None) -> dict[str, str]:
    """Environment of a timed run: ``root`` on the path, bytecode cached in ``cache``."""
    env = dict(os.environ, PYTHONPATH=str(root))
    if cache is not None:
        env.pop("PYTHONDONTWRITEBYTECODE", None)
        env["PYTHONPYCACHEPREFIX"] = str(cache)
    return env


def wall(env: dict[str, str], args: list[str]) -> tuple[float, float]:
    """(wall, CPU) seconds from start to exit of ``python args``."""
    before = os.times()
    t0 = time.perf_counter()
    proc = subprocess.run([sys.executable, *args], env=env, stdout=subprocess.DEVNULL,
                          stderr=subprocess.PIPE, cwd=tempfile.gettempdir(), check=False)
    seconds = time.perf_counter() - t0
    after = os.times()
    if proc.returncode not in (0, 1):
        raise SystemExit(f"{args} failed ({proc.returncode}): {proc.stderr.decode()[-500:]}")
    cpu = (after.children_user - before.children_user
           + after.children_system - before.children_system)
    return seconds, cpu


def main() -> None:
    p = argparse.ArgumentParser(description=__doc__)
    p.add_argument("--repeat", type=int, default=7)
    p.add_argument("--peer", default=None, help="another checkout, run alternately")
    p.add_argument("--no-bytecode", action="store_true",
                   help="do not cache bytecode (measure compilation too)")
    args = p.parse_args()
    roots = [("this", HERE)] + ([("peer", Path(args.peer))] if args.peer else [])
    prefix = f"pyc_{os.getpid()}_"
    caches = {name: None if args.no_bytecode else Path(tempfile.mkdtemp(prefix=prefix))
              for name, _ in roots}
    envs = {name: child_env(root, caches[name]) for name, root in roots}
    print(f"{os.cpu_count()} CPUs, load average {os.getloadavg()[0]:.2f}, "
          f"{args.repeat} runs each (best / median wall seconds, median CPU seconds), "
          f"bytecode {'not cached' if args.no_bytecode else 'cached (as installed)'}")
    bare: dict[str, float] = {}
    for label, cmd in commands():
        times: dict[str, list[float]] = {name: [] for name, _ in roots}
        cpus: dict[str, list[float]] = {name: [] for name, _ in roots}
        for name, _ in roots:
            wall(envs[name], cmd)  # warm-up: bytecode, page cache
        for _ in range(args.repeat):
            for name, _ in roots:
                w, c = wall(envs[name], cmd)
                times[name].append(w)
                cpus[name].append(c)
        row = f"{label:26s}"
        for name, _ in roots:
            best, med = min(times[name]), statistics.median(times[name])
            if label.startswith("python"):
                bare[name] = best
            row += (f" {name}: {best:4.2f} / {med:4.2f} s, cpu {statistics.median(cpus[name]):4.2f}"
                    f" ({best / bare[name]:4.1f}x bare)")
        if args.peer and not label.startswith("python"):
            row += f"  peer/this {min(times['peer']) / min(times['this']):4.2f}x"
        print(row)


if __name__ == "__main__":
    try:
        main()
    finally:  # the private bytecode caches
        for folder in Path(tempfile.gettempdir()).glob(f"pyc_{os.getpid()}_*"):
            shutil.rmtree(folder, ignore_errors=True)
