"""The ``shaftsys sweep`` command (wired into :mod:`shaftsys.cli` by the lead).

``add_sweep_parser(subparsers)`` adds the sub-command; ``run_sweep(args) -> int`` runs
it: exit 0 when the study ran (whatever the verdicts), 2 bad input, 3 could not run.
"""

from __future__ import annotations

import argparse
import logging
import sys
from pathlib import Path
from typing import Any

from shaftsys.errors import ModelError, NumericalError, OutputError

SWEEP_EPILOG = """worked example (the bundled spindle, rear bearing spacing):
  shaftsys sweep models/spindle_3brg.yaml \\
      --vary bearing.B.at=211:249:20 --vary spacing.B.C=200:270:15 \\
      --limit deflection@gears=0.01 --out spindle_study --plot spindle_study/map.png

  writes spindle_study/results.csv, .json and .parquet (one row per variant: every
  bearing's Lnm_h, margin and verdict, system life, worst margin and support,
  deflections and slopes), summary.json, a checkpoint manifest.json and the contour map
  of the worst margin. Without --vary the model's 'study:' section is used.

quantity paths:  bearing.<id>.at|C|C0|...   spacing.<a>.<b>   step.<shaft>.<i>.d|bore|length
                 element.<id>.at|...   gear.<id>.helix_angle|...   case.<id>.torque|power|speed
values:          start:stop:count (inclusive), a list 1,2,3, or one number (internal units)
scale-out:       above 200 000 variants, or with --workers/--scheduler, chunks run on dask
                 (a local cluster on 127.0.0.1 unless --scheduler tcp://HOST:PORT is given);
                 --resume continues an interrupted study in the same --out folder.

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
    p.add_argument("--workers", type=int, metavar="N", help="local dask worker processes")
    p.add_argument("--chunk", type=int, metavar="N", help="variants per chunk")
    p.add_argument("--resume", action="store_true", help="continue an interrupted study")
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


def run_sweep(args: argparse.Namespace) -> int:
    """Run the ``sweep`` command; returns the exit code (0 ran, 2 bad input, 3 failed)."""
    from shaftsys.io.loader import load_model
    from shaftsys.study.runner import run_study
    from shaftsys.study.section import parse_limit_option, read_study_section, study_from_section

    logging.getLogger("shaftsys.bearings").setLevel(logging.ERROR)
    try:
        model = load_model(args.model)
        section, name = read_study_section(args.model)
        if args.workers is not None and args.workers < 1:
            raise ModelError(f"--workers {args.workers}", field="--workers", expected=">= 1")
        study = study_from_section(
            model, section, name, vary=_vary_items(args.vary), seat=args.seat,
            combine=args.combine, limits=[parse_limit_option(t) for t in args.limit])
        out = Path(args.out or f"{Path(args.model).stem}_study")
        run = run_study(study, out, chunk_size=args.chunk, scheduler=args.scheduler,
                        workers=args.workers, resume=args.resume)
        if args.plot:
            from shaftsys.study.plots import save_study_plot

            Path(args.plot).parent.mkdir(parents=True, exist_ok=True)
            save_study_plot(run.frame(), study, args.plot)
    except (ModelError, OutputError) as exc:
        print(f"shaftsys: error: {exc}", file=sys.stderr)
        return 2
    except NumericalError as exc:
        print(f"shaftsys: error: {exc}", file=sys.stderr)
        return 3
    except (OSError, TimeoutError) as exc:
        print(f"shaftsys: error: the study could not run: {exc}", file=sys.stderr)
        return 3
    if not args.quiet:
        s = run.summary
        print(f"{s['variants']} variants: {s['valid']} valid, {s['invalid']} invalid, "
              f"{s['passing']} pass")
        if s["best_variant"]:
            vals = ", ".join(f"{k} = {v:g}" for k, v in s["best_values"].items())
            print(f"best: {s['best_variant']} ({vals}), worst margin "
                  f"{s['best_worst_margin']:.4g}")
        print(f"results: {run.paths['csv']}, {run.paths['json'].name}, "
              f"{run.paths['parquet'].name}")
        if args.plot:
            print(f"figure: {args.plot}")
    return 0
