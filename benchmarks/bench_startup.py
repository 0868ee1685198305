"""Benchmark: wall time of one command-line run, from process start to exit.

Runs ``python -m shaftsys check MODEL -q`` for every bundled model, ``validate``,
``new -`` and ``schema``, each several times in a fresh subprocess (wall clock), next to
a bare interpreter (``python -c pass``), and prints the best and median seconds and the
ratio to the bare interpreter. With ``--peer PATH`` (another checkout of shaftsys, e.g.
the base commit) every command is also run with that checkout, alternately with this
one so that both see the same machine load, and the ratio peer/this is printed.
Targets (not asserted): check < 1 s, validate < 0.6 s, new and schema well under 1 s.

Run: ``python benchmarks/bench_startup.py [--repeat 7] [--peer /path/to/checkout]``.
"""

from __future__ import annotations

import argparse
import os
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


def wall(root: Path, args: list[str]) -> float:
    """Seconds from start to exit of ``python args`` with ``root`` on the path."""
    env = dict(os.environ, PYTHONPATH=str(root))
    t0 = time.perf_counter()
    proc = subprocess.run([sys.executable, *args], env=env, stdout=subprocess.DEVNULL,
                          stderr=subprocess.PIPE, cwd=tempfile.gettempdir(), check=False)
    seconds = time.perf_counter() - t0
    if proc.returncode not in (0, 1):
        raise SystemExit(f"{args} failed ({proc.returncode}): {proc.stderr.decode()[-500:]}")
    return seconds


def main() -> None:
    p = argparse.ArgumentParser(description=__doc__)
    p.add_argument("--repeat", type=int, default=7)
    p.add_argument("--peer", default=None, help="another checkout, run alternately")
    args = p.parse_args()
    roots = [("this", HERE)] + ([("peer", Path(args.peer))] if args.peer else [])
    print(f"{os.cpu_count()} CPUs, load average {os.getloadavg()[0]:.2f}, "
          f"{args.repeat} runs each (best / median seconds)")
    bare: dict[str, float] = {}
    for label, cmd in commands():
        times: dict[str, list[float]] = {name: [] for name, _ in roots}
        for _ in range(args.repeat):
            for name, root in roots:
                times[name].append(wall(root, cmd))
        row = f"{label:32s}"
        for name, _ in roots:
            best, med = min(times[name]), statistics.median(times[name])
            if label.startswith("python"):
                bare[name] = best
            row += f" {name}: {best:5.2f} / {med:5.2f} s ({best / bare[name]:4.1f}x bare)"
        if args.peer and not label.startswith("python"):
            row += f"  peer/this {min(times['peer']) / min(times['this']):4.2f}x"
        print(row)


if __name__ == "__main__":
    main()
