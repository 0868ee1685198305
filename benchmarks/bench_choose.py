"""Benchmark: choosing 6 supports from a 10 000-row catalogue over 20 cases.

Model: the bundled three-shaft reducer (``models/belt_reducer.yaml``, six bearings), its
five cases spread into 20 (speeds and loads scaled, invented), every bearing left open.
Catalogue: the invented demo catalogue (``models/demo_catalogue.csv``, 294 rows)
repeated with small invented changes of the ratings to 10 000 rows (unique
designations). Prints the wall time of :func:`shaftsys.analysis.selection.choose_bearings`
(every pass: solve + all supports' rows through the vectorised life chain), the rows
evaluated per second, and the same evaluation done the way a designer's script would
do it without the vectorised chain: :func:`shaftsys.bearings.engine.evaluate_bearing`
once per catalogue row (timed on a sample, scaled), with the ratio side by side. No
figure is asserted anywhere.

Run: ``python benchmarks/bench_choose.py [--rows 10000] [--cases 20] [--peer 300]``.
"""

from __future__ import annotations

import argparse
import contextlib
import dataclasses
import time
from pathlib import Path

import numpy as np

from shaftsys.analysis.life import spectrum_of
from shaftsys.analysis.selection import choose_bearings
from shaftsys.analysis.solve import solve_model
from shaftsys.bearings.engine import evaluate_bearing
from shaftsys.errors import ModelError
from shaftsys.io.catalogue import read_catalogue
from shaftsys.io.loader import load_model
from shaftsys.model import BearingKind, Model
from shaftsys.model.catalogue import Catalogue
from shaftsys.model.selection import OpenSeat

ROOT = Path(__file__).resolve().parent.parent


def big_catalogue(base: Catalogue, rows: int) -> Catalogue:
    """``base`` repeated to ``rows`` rows, ratings scaled by invented factors 0.9..1.1."""
    reps = -(-rows // len(base))
    idx = np.tile(np.arange(len(base)), reps)[:rows]
    rng = np.random.default_rng(7)
    scale = rng.uniform(0.9, 1.1, rows)
    cat = base.subset(idx)
    fields = {"C_N": cat.C_N * scale, "C0_N": cat.C0_N * scale,
              "designation": tuple(f"{d}#{i}" for i, d in enumerate(cat.designation))}
    return dataclasses.replace(cat, **fields)  # type: ignore[arg-type]


def spread_cases(model: Model, n: int) -> Model:
    """The model's cases repeated to ``n``, speeds scaled 0.6..1.2 (invented)."""
    cases = []
    for i in range(n):
        c = model.cases[i % len(model.cases)]
        f = 0.6 + 0.6 * (i / max(n - 1, 1))
        drives = {k: dataclasses.replace(v, speed_rpm=v.speed_rpm * f)
                  for k, v in c.drives.items()}
        cases.append(dataclasses.replace(c, id=f"{c.id}_{i}", drives=drives,
                                         duration=c.duration / (n // len(model.cases) + 1)))
    return dataclasses.replace(model, cases=tuple(cases))


def open_every_bearing(model: Model, cat: Catalogue) -> Model:
    """Every bearing becomes an open support on its own bore (placeholders kept)."""
    seats = []
    shafts = []
    for sh in model.shafts:
        bearings = []
        for b in sh.bearings:
            seats.append(OpenSeat(b.id, sh.id, cat, bore_mm=b.d_mm))
            if b.kind is BearingKind.TAPERED_ROLLER:
                bearings.append(dataclasses.replace(b, pressure_centre_offset_mm=0.0))
            else:
                bearings.append(dataclasses.replace(b, kind=BearingKind.DEEP_GROOVE_BALL))
        shafts.append(dataclasses.replace(sh, bearings=tuple(bearings)))
    return dataclasses.replace(model, shafts=tuple(shafts), open_seats=tuple(seats))


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--rows", type=int, default=10_000)
    ap.add_argument("--cases", type=int, default=20)
    ap.add_argument("--peer", type=int, default=300, help="rows timed for the per-row peer")
    ap.add_argument("--repeat", type=int, default=3)
    args = ap.parse_args()
    base = load_model(str(ROOT / "models" / "belt_reducer.yaml"))
    cat = big_catalogue(read_catalogue(str(ROOT / "models" / "demo_catalogue.csv")),
                        args.rows)
    model = open_every_bearing(spread_cases(base, args.cases), cat)
    times = []
    for _ in range(args.repeat):
        t0 = time.perf_counter()
        filled, sel = choose_bearings(model)
        times.append(time.perf_counter() - t0)
    best = min(times)
    fitting = sum(s.remaining[0] for s in sel.seats)
    evaluated = fitting * sel.passes
    print(f"model: belt_reducer.yaml, {len(model.cases)} cases, {len(model.open_seats)} open "
          f"supports; catalogue {len(cat)} rows")
    print(f"choose_bearings, best of {args.repeat}:            {best * 1e3:9.1f} ms "
          f"({sel.passes} passes, settled={sel.settled})")
    print(f"rows fitting the seats (all supports):       {fitting:9d}")
    print(f"candidate evaluations per second:            {evaluated / best:12,.0f}")
    for s in sel.seats:
        c = s.candidate
        print(f"  {s.bearing_id:6s} -> {c.designation if c else 'none':18s} "
              f"margin {c.margin if c else float('nan'):6.2f}")
    # peer: evaluate_bearing once per fitting row on a sample (what a script without the
    # vectorised chain would do), scaled to every fitting row
    solved = solve_model(filled)
    peer_rows = 0
    t0 = time.perf_counter()
    for seat in model.open_seats:
        br = next(b for b in solved.bearings if b.bearing.id == seat.bearing_id)
        sp = spectrum_of(filled, br)
        placeholder = br.bearing
        rows = np.flatnonzero(np.abs(cat.d_mm - seat.bore_mm) <= seat.bore_tolerance_mm)
        for r in rows[: max(1, args.peer // len(model.open_seats))]:
            b = cat.to_bearing(int(r), id=placeholder.id, x_mm=placeholder.x_mm,
                               axial=placeholder.axial, pair=placeholder.pair)
            with contextlib.suppress(ModelError):   # a refused row still cost its time
                evaluate_bearing(b, sp, filled.life, filled.lubrication)
            peer_rows += 1
    peer_per_row = (time.perf_counter() - t0) / peer_rows
    vec_per_row = best / max(evaluated, 1)
    print(f"per-row evaluate_bearing (peer), per row:    {peer_per_row * 1e6:9.1f} us")
    print(f"choose_bearings, per evaluated row:          {vec_per_row * 1e6:9.2f} us "
          "(solves included)")
    print(f"ratio peer / shaftsys per row:               {peer_per_row / vec_per_row:9.0f}x")


if __name__ == "__main__":
    main()
