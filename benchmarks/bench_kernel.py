"""Time the vectorised life chain on a catalogue-sized table: 10 000 rows x 20 cases.

Invented catalogue (mixed kinds, made-up ratings) and an invented 20-case spectrum with
lubrication; prints the wall time of :func:`shaftsys.bearings.kernel.evaluate`.
Run: ``PYTHONPATH=. python3 benchmarks/bench_kernel.py``.
"""

from __future__ import annotations

import time

import numpy as np

from shaftsys.bearings.arrays import BearingArrays
from shaftsys.bearings.kernel import DutyCycle, evaluate
from shaftsys.model.bearing import Bearing, BearingKind, LifeSettings, Lubrication

ROWS = 10_000
CASES = 20


def catalogue(n: int) -> list[Bearing]:
    """Invented rows of five kinds with made-up sizes and ratings."""
    rng = np.random.default_rng(3)
    kinds = [BearingKind.DEEP_GROOVE_BALL, BearingKind.ANGULAR_CONTACT_BALL,
             BearingKind.CYLINDRICAL_ROLLER, BearingKind.TAPERED_ROLLER,
             BearingKind.SPHERICAL_ROLLER]
    out = []
    for i in range(n):
        kind = kinds[i % len(kinds)]
        d = float(rng.uniform(15.0, 150.0))
        D = d * float(rng.uniform(1.5, 2.2))
        C = 6.0 * (D - d) ** 1.6 * float(rng.uniform(0.8, 1.3))
        extra: dict[str, object] = {}
        if kind is BearingKind.ANGULAR_CONTACT_BALL:
            extra["contact_angle_deg"] = float(rng.choice([15.0, 25.0, 40.0]))
        elif kind is BearingKind.CYLINDRICAL_ROLLER:
            extra["ribs"] = True
        elif kind in (BearingKind.TAPERED_ROLLER, BearingKind.SPHERICAL_ROLLER):
            extra["contact_angle_deg"] = float(rng.uniform(10.0, 16.0))
        out.append(Bearing(id=f"CAT{i:05d}", kind=kind, x_mm=0.0, d_mm=d, D_mm=D, C_N=C,
                           C0_N=0.8 * C, limiting_speed_rpm=6000.0,
                           **extra))  # type: ignore[arg-type]
    return out


def main() -> None:
    """Build the table, evaluate it a few times, print the best wall time."""
    rng = np.random.default_rng(5)
    params = BearingArrays.from_bearings(catalogue(ROWS))
    duty = DutyCycle(tuple(f"c{k}" for k in range(CASES)),
                     rng.uniform(100.0, 3000.0, CASES), rng.uniform(0.5, 2.0, CASES),
                     False, np.zeros(CASES, bool), rng.uniform(50.0, 80.0, CASES))
    Fr = rng.uniform(300.0, 3000.0, CASES)
    Fa = rng.uniform(0.0, 0.2, CASES) * Fr
    settings = LifeSettings(target_life_h=20000.0)
    oil = Lubrication(nu1_at_t1_mm2_s=100.0, nu2_at_t2_mm2_s=11.0, cleanliness="-/15/12")
    times = []
    for _ in range(5):
        t0 = time.perf_counter()
        la = evaluate(params, Fr, Fa, duty, settings, oil)
        times.append(time.perf_counter() - t0)
    ok = int(np.sum(la.ok))
    failed = int(np.sum(~la.valid))
    print(f"{ROWS} rows x {CASES} cases: best {min(times) * 1e3:.1f} ms, "
          f"median {sorted(times)[2] * 1e3:.1f} ms; {ok} rows ok, {failed} rows with a reason")


if __name__ == "__main__":
    main()
