"""The ``shaftsys sweep`` command (wired into :mod:`shaftsys.cli` by the lead).

``add_sweep_parser(subparsers)`` adds the sub-command; ``run_sweep(args) -> int`` runs
it: exit 0 when the study ran (whatever the verdicts), 2 bad input, 3 could not run.
"""

from __future__ import annotations

import argparse
import logging
import signal
import sys
import threading
from pathlib import Path
from typing import Any

from shaftsys.errors import ModelError, NumericalError, OutputError

#: What ``shaftsys sweep`` writes unless --format says otherwise (the library's
#: ``run_study`` writes ``shaftsys.study.writers.LIBRARY_FORMATS``: csv, json, parquet).
CLI_FORMATS = ("parquet",)

SWEEP_EPILOG = """worked example (the bundled spindle, rear bearing spacing):
  shaftsys sweep models/spindle_3brg.yaml \\
      --vary bearing.B.at=211:249:20 --vary spacing.B.C=200:270:15 \\
      --limit deflection@gears=0.01 --out spindle_study --plot spindle_study/map.png

  writes spindle_study/results.parquet (one row per variant: every bearing's Lnm_h,
  margin and verdict, system life, worst margin and support, deflections and slopes;
  add --format parquet,csv,json for CSV and JSON too), summary.json, a checkpoint
  manifest.json and the contour map of the worst margin. Without --vary the model's
  'study:' section is used.

quantity paths:  bearing.<id>.at|C|C0|...   spacing.<a>.<b>   step.<shaft>.<i>.d|bore|length
                 element.<id>.at|...   gear.<id>.helix_angle|...   case.<id>.torque|power|speed
values:          start:stop:count (inclusive), a list 1,2,3, or one number (internal units)
scale-out:       with --workers N (N >= 1) or --scheduler tcp://HOST:PORT chunks run on dask
                 (a local cluster on 127.0.0.1, no dashboard unless --dashboard ADDR);
                 --workers 0 keeps them in this process. Without either, a study of more
                 than 200 000 variants uses a local cluster only where more than 2 CPUs
                 are available (on 2 the cluster costs more than it brings).
                 --resume continues an interrupted study in the same --out folder; an
                 interrupted write leaves no partial file.

exit codes:
  0  the study ran (whatever the verdicts of the variants)
  2  bad input (the message names file, line and field)
  3  the study could not run (numerical failure, cluster not reachable)"""


def add_sweep_parser(subparsers: Any) -> argparse.ArgumentParser:
    """Add the ``sweep`` sub-command to an argparse sub-parsers object."""
    p: argparse.ArgumentParser = subparsers.add_parser(
        "sweep", help="run a design study: vary bearing positions, diameters, loads...",
        description="Evaluate many variants of a model (a grid over quantity paths) and "
        "write every variant's lives, margins, deflections and verdicts.",
        epilog=SWEEP_EPILOG, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("model", help="model file (YAML)")
    p.add_argument("--vary", action="append", default=[], metavar="PATH=VALUES",
                   help="a quantity and its values (repeat for a grid)")
    p.add_argument("--seat", action="append", default=[], metavar="PATH",
                   help="move the bearing's seat step with it (path or bearing id)")
    p.add_argument("--combine", choices=("grid", "zip"), help="grid (default) or zip")
    p.add_argument("--limit", action="append", default=[], metavar="KIND@AT=MAX",
                   help="deflection [mm] or slope [rad] limit, e.g. deflection@gears=0.05")
    p.add_argument("--out", metavar="DIR", help="output folder (default: <model>_study)")
    p.add_argument("--plot", metavar="FILE", help="figure (.png/.svg): life plot or contour")
    p.add_argument("--scheduler", metavar="tcp://HOST:PORT", help="existing dask scheduler")
    p.add_argument("--workers", type=int, metavar="N",
                   help="local dask worker processes (0: evaluate in this process)")
    p.add_argument("--dashboard", metavar="ADDR",
                   help="serve the local cluster's dask dashboard at ADDR, e.g. :8787 "
                   "(default: off)")
    p.add_argument("--format", metavar="LIST", default=",".join(CLI_FORMATS),
                   help="result files, comma-separated: parquet, csv, json (default: "
                   "%(default)s)")
    p.add_argument("--timings", action="store_true",
                   help="print the seconds spent evaluating and writing to stderr")
    p.add_argument("--chunk", type=int, metavar="N", help="variants per chunk")
    p.add_argument("--resume", action="store_true", help="continue an interrupted study")
    p.add_argument("--overwrite", action="store_true",
                   help="replace the results of an earlier study in --out")
    p.add_argument("--quiet", "-q", action="store_true", help="print nothing but errors")
    return p


def _vary_items(specs: list[str]) -> list[tuple[str, str]]:
    out = []
    for s in specs:
        if "=" not in s:
            raise ModelError(f"--vary '{s}'", field="--vary",
                             expected="PATH=VALUES, e.g. bearing.B.at=400:600:11")
        path, values = s.split("=", 1)
        out.append((path.strip(), values.strip()))
    return out


def _terminate_as_interrupt() -> Any:
    """Make SIGTERM raise KeyboardInterrupt (so a write in progress removes its partial
    file); returns the previous handler, or None off the main thread.
    """
    if threading.current_thread() is not threading.main_thread():
        return None

    def interrupt(signum: int, frame: Any) -> None:
        raise KeyboardInterrupt

    return signal.signal(signal.SIGTERM, interrupt)


def run_sweep(args: argparse.Namespace) -> int:
    """Run the ``sweep`` command; returns the exit code (0 ran, 2 bad input, 3 failed)."""
    from shaftsys.io.model_duty import load_model_with_duty
    from shaftsys.study.runner import run_study
    from shaftsys.study.section import parse_limit_option, read_study_section, study_from_section
    from shaftsys.study.writers import parse_formats

    logging.getLogger("shaftsys.bearings").setLevel(logging.ERROR)
    try:
        model, _ = load_model_with_duty(args.model, analyse_model=False)
        section, name = read_study_section(args.model)
        if args.workers is not None and args.workers < 0:
            raise ModelError(f"--workers {args.workers}", field="--workers",
                             expected=">= 1 dask workers, or 0 for this process")
        formats = parse_formats(args.format)
        study = study_from_section(
            model, section, name, vary=_vary_items(args.vary), seat=args.seat,
            combine=args.combine, limits=[parse_limit_option(t) for t in args.limit])
        out = Path(args.out or f"{Path(args.model).stem}_study")
        previous = _terminate_as_interrupt()
        try:
            run = run_study(study, out, chunk_size=args.chunk, scheduler=args.scheduler,
                            workers=args.workers, resume=args.resume, formats=formats,
                            overwrite=args.overwrite,
                            dashboard=args.dashboard)
        finally:
            if previous is not None:
                signal.signal(signal.SIGTERM, previous)
        if args.plot:
            from shaftsys.study.plots import save_study_plot

            Path(args.plot).parent.mkdir(parents=True, exist_ok=True)
            # only the columns the figure draws: a large study's table need not fit
            ids = [b.id for sh in study.model.shafts for b in sh.bearings]
            cols = [*(q.path for q in study.quantities), "ok", "worst_margin",
                    *(f"{i}.Lnm_h" for i in ids)]
            save_study_plot(run.frame(columns=cols), study, args.plot)
    except (ModelError, OutputError) as exc:
        print(f"shaftsys: error: {exc}", file=sys.stderr)
        return 2
    except NumericalError as exc:
        print(f"shaftsys: error: {exc}", file=sys.stderr)
        return 3
    except (OSError, TimeoutError) as exc:
        print(f"shaftsys: error: the study could not run: {exc}", file=sys.stderr)
        return 3
    if args.timings:
        t = run.timings
        written = ", ".join(k for k in run.paths if k != "summary")
        print(f"timings: evaluate {t['evaluate']:.1f} s, chunk files {t['chunks']:.1f} s, "
              f"results {t['results']:.1f} s ({written}), "
              f"summary {t['summary']:.1f} s, study total {t['total']:.1f} s, "
              f"{'dask' if run.distributed else 'in-process'}", file=sys.stderr)
    if not args.quiet:
        s = run.summary
        print(f"{s['variants']} variants: {s['valid']} valid, {s['invalid']} invalid, "
              f"{s['passing']} pass")
        if "thermal_failing" in s:
            print(f"heat balance: {s['thermal_failing']} valid variants fail the thermal "
                  f"check ({s['thermal_runaway']} of them thermal runaway)")
        if s["best_variant"]:
            vals = ", ".join(f"{k} = {v:g}" for k, v in s["best_values"].items())
            print(f"best: {s['best_variant']} ({vals}), worst margin "
                  f"{s['best_worst_margin']:.4g}")
        files = [p for k, p in run.paths.items() if k != "summary"]
        print("results: " + ", ".join([str(files[0]), *(p.name for p in files[1:])]))
        if args.plot:
            print(f"figure: {args.plot}")
    return 0
