"""Write an invented drive recording for the bundled belt reducer (``models/belt_reducer.yaml``).

A belt conveyor behind the reducer, logged at the motor pulley for two hours at about
20 samples per second (time stamps with jitter, one short logger dropout): start-ups with
a breakaway torque peak, running at 1460 rpm under a slowly varying material load, a spell of
overhauling (the loaded downhill leg drives the motor: negative torque at positive
speed), stops, and once per hour a short reversed run to clear the tail pulley.
Every number is invented for the demonstration; nothing is measured.

    python3 models/make_demo_recording.py [OUT.csv|OUT.parquet] [--hours H] [--rate HZ]

Columns: ``time [s]``, ``torque [N*m]``, ``speed [rpm]``.
"""

from __future__ import annotations

import argparse
from pathlib import Path

import numpy as np

RATED_RPM = 1460.0


def recording(hours: float = 2.0, rate_hz: float = 20.0, seed: int = 7
              ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(time [s], torque [N*m], speed [rpm]) of the invented conveyor duty."""
    rng = np.random.default_rng(seed)
    n = int(hours * 3600.0 * rate_hz)
    step = 1.0 / rate_hz
    t = np.arange(n) * step + rng.uniform(-0.2, 0.2, n) * step   # jittered stamps
    t[n // 3:] += 1.5                                              # a 1.5 s dropout
    t -= t[0]
    cycle = 1800.0                       # half-hour pattern
    tc = np.mod(t, cycle)
    hour = np.mod(t, 3600.0)
    speed = np.full(n, RATED_RPM)
    torque = 75.0 + 22.0 * np.sin(2 * np.pi * t / 410.0) + 9.0 * np.sin(2 * np.pi * t / 53.0)
    torque += rng.normal(0.0, 4.0, n)
    # start-up: a 0.4 s breakaway peak before the belt moves (standstill), then a
    # 6 s soft-start ramp at a raised torque
    brk = tc < 0.4
    speed[brk] = 0.0
    torque[brk] = 210.0
    ramp = (tc >= 0.4) & (tc < 6.4)
    speed[ramp] = RATED_RPM * (tc[ramp] - 0.4) / 6.0
    torque[ramp] = 105.0
    # overhauling leg: the loaded downhill leg drives the motor for 90 s at about 6.4 kW
    # (a lighter one would leave the output bearings below their minimum load)
    over = (tc > 900.0) & (tc < 990.0)
    torque[over] = -42.0 + rng.normal(0.0, 2.0, int(over.sum()))
    # stop: 2 min standstill at the end of each half-hour (brake holds, small torque)
    stop = tc > cycle - 120.0
    speed[stop] = 0.0
    torque[stop] = 3.0
    # once per hour: 2 min reversed run at reduced load (after the first stop)
    rev = (hour > 1810.0) & (hour < 1930.0)
    speed[rev] = -RATED_RPM
    torque[rev] = -40.0 + rng.normal(0.0, 3.0, int(rev.sum()))
    return t, torque, speed


def main() -> None:
    """Write the recording to the path given (default ``models/conveyor_recording.csv``)."""
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("out", nargs="?", default=str(Path(__file__).with_name(
        "conveyor_recording.csv")))
    ap.add_argument("--hours", type=float, default=2.0)
    ap.add_argument("--rate", type=float, default=20.0)
    a = ap.parse_args()
    t, T, n = recording(a.hours, a.rate)
    out = Path(a.out)
    import pandas as pd

    frame = pd.DataFrame({"time [s]": t, "torque [N*m]": T, "speed [rpm]": n})
    if out.suffix.lower() in (".parquet", ".pq"):
        frame.to_parquet(out, index=False)
    else:
        frame.to_csv(out, index=False, float_format="%.6g")
    print(f"{out}: {t.size} samples over {t[-1] / 3600.0:.3g} h")


if __name__ == "__main__":
    main()
