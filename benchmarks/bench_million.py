"""Benchmark: a 10^6-variant design study end to end through the command line.

The bundled spindle (``models/spindle_3brg.yaml``, 20 cases), a grid of
50 x 50 x 20 x 20 = 10^6 variants over the stations of bearings B and C and two body
diameters (as ``bench_study.py``, every variant its own stiffness), run as
``python -m shaftsys sweep ... --out DIR -q`` in a subprocess. While it runs, the
resident memory of the whole process tree (the command and any worker, nanny or
scheduler process it starts) is polled every 50 ms (psutil when installed, else
``/proc``). Prints the wall time, the peak RSS of the tree, the time spent evaluating
and writing (from the ``--timings`` line the command prints to stderr) and the size of
each result file.

Run: ``python benchmarks/bench_million.py [--grid 50,50,20,20] [--format parquet]
[--workers N] [--root PATH]``. ``--root`` points at another checkout of shaftsys to
run the same study with it (the peer run, e.g. the base commit), alternately with
this one when ``--peer`` is given; ratios are printed. No time is asserted.
"""

from __future__ import annotations

import argparse
import contextlib
import os
import shutil
import subprocess
import sys
import tempfile
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent.parent
MODEL = HERE / "models" / "spindle_3brg.yaml"


def sweep_args(grid: list[int]) -> list[str]:
    """The --vary options of the grid (B station, C station, two body diameters)."""
    nb, nc, n2, n4 = grid
    return ["--vary", f"bearing.B.at=212:248:{nb}", "--vary", f"bearing.C.at=452:508:{nc}",
            "--vary", f"step.spindle.2.d=60:70:{n2}", "--vary", f"step.spindle.4.d=64:76:{n4}"]


def _tree_rss_psutil(pid: int) -> int:
    import psutil

    try:
        root = psutil.Process(pid)
        procs = [root, *root.children(recursive=True)]
    except psutil.NoSuchProcess:
        return 0
    total = 0
    for p in procs:
        with contextlib.suppress(psutil.NoSuchProcess):
            total += p.memory_info().rss
    return total


def _tree_rss_proc(pid: int) -> int:
    children: dict[int, list[int]] = {}
    rss: dict[int, int] = {}
    page = os.sysconf("SC_PAGE_SIZE")
    for entry in os.listdir("/proc"):
        if not entry.isdigit():
            continue
        try:
            with open(f"/proc/{entry}/stat") as fh:
                fields = fh.read().rsplit(")", 1)[1].split()
        except OSError:
            continue
        ppid, pages = int(fields[1]), int(fields[21])
        children.setdefault(ppid, []).append(int(entry))
        rss[int(entry)] = pages * page
    total, todo = 0, [pid]
    while todo:
        p = todo.pop()
        total += rss.get(p, 0)
        todo.extend(children.get(p, []))
    return total


def tree_rss(pid: int) -> int:
    """Resident bytes of ``pid`` and all its descendants."""
    try:
        return _tree_rss_psutil(pid)
    except ImportError:
        return _tree_rss_proc(pid)


def run_once(root: Path, grid: list[int], formats: str | None, workers: int | None,
             ) -> dict[str, object]:
    out = Path(tempfile.mkdtemp(prefix="shaftsys_million_"))
    cmd = [sys.executable, "-m", "shaftsys", "sweep", str(MODEL), *sweep_args(grid),
           "--out", str(out / "study"), "-q"]
    new_cli = (root / "shaftsys" / "study" / "writers.py").is_file()
    if new_cli:
        cmd.append("--timings")
        if formats:
            cmd += ["--format", formats]
    if workers is not None:
        cmd += ["--workers", str(workers)]
    env = dict(os.environ, PYTHONPATH=str(root))
    t0 = time.perf_counter()
    # cwd = the scratch folder: ``python -m`` puts the cwd first on sys.path, so a run
    # started in a checkout would import that checkout instead of ``root``
    proc = subprocess.Popen(cmd, env=env, stdout=subprocess.PIPE, stderr=subprocess.PIPE,
                            text=True, cwd=out)
    peak = 0
    while proc.poll() is None:
        peak = max(peak, tree_rss(proc.pid))
        time.sleep(0.05)
    wall = time.perf_counter() - t0
    _, stderr = proc.communicate()
    files = {p.name: p.stat().st_size for p in sorted((out / "study").glob("results.*"))}
    timings = [ln for ln in stderr.splitlines() if ln.startswith("timings:")]
    shutil.rmtree(out, ignore_errors=True)
    if proc.returncode != 0:
        raise SystemExit(f"sweep failed ({proc.returncode}):\n{stderr[-2000:]}")
    return {"wall": wall, "peak": peak, "files": files,
            "timings": timings[-1] if timings else "(no --timings in this version)"}


def main() -> None:
    p = argparse.ArgumentParser(description=__doc__)
    p.add_argument("--grid", default="50,50,20,20", help="points per quantity (4 numbers)")
    p.add_argument("--format", default=None, help="--format of the sweep (default: its own)")
    p.add_argument("--workers", type=int, default=None)
    p.add_argument("--root", default=str(HERE), help="checkout of shaftsys to run")
    p.add_argument("--peer", default=None, help="a second checkout, run alternately")
    p.add_argument("--repeat", type=int, default=1)
    args = p.parse_args()
    grid = [int(x) for x in args.grid.split(",")]
    n = grid[0] * grid[1] * grid[2] * grid[3]
    print(f"study: {MODEL.name}, grid {'x'.join(map(str, grid))} = {n:,} variants, "
          f"{os.cpu_count()} CPUs, load average {os.getloadavg()[0]:.2f}")
    roots = [("this", Path(args.root))] + ([("peer", Path(args.peer))] if args.peer else [])
    walls: dict[str, list[float]] = {name: [] for name, _ in roots}
    for _ in range(args.repeat):
        for name, root in roots:
            r = run_once(root, grid, args.format, args.workers)
            walls[name].append(float(r["wall"]))  # type: ignore[arg-type]
            files = ", ".join(f"{k} {v / 1e6:.1f} MB" for k, v in r["files"].items())  # type: ignore[union-attr]
            print(f"[{name}] wall {r['wall']:.1f} s ({n / float(r['wall']):,.0f} variants/s), "  # type: ignore[arg-type]
                  f"peak RSS of the process tree {int(r['peak']) / 2**20:.0f} MB")  # type: ignore[call-overload]
            print(f"[{name}]   {r['timings']}")
            print(f"[{name}]   files: {files}")
    if args.peer:
        a, b = min(walls["this"]), min(walls["peer"])
        print(f"ratio peer / this (best wall): {b / a:.2f}x")


if __name__ == "__main__":
    main()
