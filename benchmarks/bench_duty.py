"""Time the reduction of a long recording: 10^7 samples into cases, with the direct integral.

Invented series (the demo conveyor duty of ``models/make_demo_recording.py`` at a high
sample rate) on the bundled belt reducer. Prints, for the in-memory arrays streamed in
chunks of 10^6 and for the same series read back from a Parquet file in chunks: the
wall time of the two passes (scan; bins + direct integral of P^p for every bearing),
excluding the analysis of the generated cases, which is timed separately, and the peak
resident memory of the process.
Run: ``PYTHONPATH=. python3 benchmarks/bench_duty.py [SAMPLES]``.
"""

from __future__ import annotations

import logging
import resource
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "models"))

from make_demo_recording import recording

import shaftsys
from shaftsys.analysis.duty import reduce_duty
from shaftsys.analysis.duty_reduction import BinSettings
from shaftsys.io.timeseries import open_series

CHUNK = 1_000_000


def _rss_mb() -> float:
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0


def main() -> None:
    """Print the timings."""
    logging.disable(logging.WARNING)
    samples = int(float(sys.argv[1])) if len(sys.argv) > 1 else 10_000_000
    model = shaftsys.load_model("models/belt_reducer.yaml")
    rate = samples / (2.0 * 3600.0)
    t, T, n = recording(hours=2.0, rate_hz=rate)
    T = T * 1000.0
    dt = 0.5 * (np.diff(t, prepend=t[0]) + np.diff(t, append=t[-1]))

    def chunks():  # type: ignore[no-untyped-def]
        for s in range(0, t.size, CHUNK):
            yield dt[s:s + CHUNK], T[s:s + CHUNK], n[s:s + CHUNK]

    settings = BinSettings(torque_bins=16, peak_above_Nmm=200e3)
    start = time.perf_counter()
    red = reduce_duty(model, chunks, settings, analyse_model=False)
    reduce_s = time.perf_counter() - start
    start = time.perf_counter()
    full = reduce_duty(model, chunks, settings)
    both_s = time.perf_counter() - start
    print(f"{t.size:,} samples in memory: reduction {reduce_s:.2f} s "
          f"({len(red.cases)} cases), with the analysis of the cases and the error "
          f"statement {both_s:.2f} s; peak RSS {_rss_mb():.0f} MB")
    worst = max(full.errors, key=lambda e: abs(e.P_error_pct))
    print(f"  worst reduction error: bearing {worst.bearing} dP = {worst.P_error_pct:+.4f} %; "
          f"table bound of the direct integral {full.interpolation_error:.2g}")

    import pandas as pd

    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "rec.parquet"
        pd.DataFrame({"time [s]": t, "torque [N*m]": T / 1000.0, "speed [rpm]": n}
                     ).to_parquet(path, index=False)
        src = open_series(path, chunk_rows=CHUNK)
        start = time.perf_counter()
        red = reduce_duty(model, src.chunks, settings, analyse_model=False)
        parquet_s = time.perf_counter() - start
        print(f"{red.samples:,} samples from Parquet in chunks of {CHUNK:,}: reduction "
              f"{parquet_s:.2f} s; peak RSS so far {_rss_mb():.0f} MB")


if __name__ == "__main__":
    main()
