"""The ``shaftsys duty`` command: a recorded torque/speed series -> cases -> checks.

``add_duty_parser(subparsers)`` adds the sub-command; ``run_duty(args) -> int`` runs it
(exit 0 every check passes, 1 a target missed, 2 bad input, 3 numerical failure).
"""

from __future__ import annotations

import argparse
import itertools
import json
import sys
from dataclasses import replace
from typing import Any

from shaftsys.errors import EXIT_OK, EXIT_TARGET_MISSED, ModelError

DUTY_EPILOG = """worked example (the bundled reducer and an invented conveyor recording):
  python3 models/make_demo_recording.py models/conveyor_recording.csv
  shaftsys duty models/belt_reducer.yaml models/conveyor_recording.csv \\
      --bins 12 --peak-above "200 N*m" --tolerance 2 --write recorded_cases.yaml

  reads the recording (columns time, torque or power, speed with units in the header or
  a units row), bins it per sign of torque and speed (reversed and back-driven running
  become cases of their own), gives each bin the torque that keeps its damage (the
  revolution-weighted p-th power mean) and its time share, runs every check on the
  model with these cases (its own duty cases are replaced, its peak and static cases
  kept; the first duty case, or --template, gives the input element and output shares),
  and prints for every bearing the equivalent load and basic life from the cases against
  the direct integral of P^p over the raw samples."""


def add_duty_parser(subparsers: Any, exit_codes: str = "") -> argparse.ArgumentParser:
    """Add the ``duty`` sub-command to an argparse sub-parsers object (``exit_codes``:
    the command line's exit-code text, appended to the help's example).
    """
    p: argparse.ArgumentParser = subparsers.add_parser(
        "duty", help="turn a recorded torque/speed series into cases and check them",
        description="Reduce a measured duty (CSV or Parquet: time, torque or power, speed) "
        "to operating cases, state the reduction error per bearing, run the checks.",
        epilog=DUTY_EPILOG + ("\n\n" + exit_codes if exit_codes else ""),
        formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("model", help="model file (YAML)")
    p.add_argument("series", nargs="?", help="recording (.csv, .parquet); default: the "
                   "model's recording: section, which then also gives columns and bins")
    for role in ("time", "torque", "power", "speed", "temperature"):
        p.add_argument(f"--{role}", metavar="COLUMN", help=f"name of the {role} column")
    p.add_argument("--load", action="append", default=[], metavar="COLUMN=ELEMENT.Fy",
                   help="a force column that sets a component (Fx, Fy, Fz) of a process "
                   "load element (repeat for more)")
    p.add_argument("--bins", type=int, default=16, metavar="N",
                   help="torque bins per sign region (default 16)")
    p.add_argument("--edges", metavar="LIST",
                   help="torque bin edges on |T|, e.g. '0,50,100,200 N*m' (replaces --bins)")
    p.add_argument("--speed-bins", type=int, default=1, metavar="N",
                   help="speed bins per sign region (2-D binning when > 1)")
    p.add_argument("--exponent", type=float, metavar="P",
                   help="p of the bins' power mean (default 10/3 with any roller bearing, "
                   "else 3)")
    p.add_argument("--peak-above", metavar="TORQUE",
                   help="|torque| above which a peak case is made (e.g. '250 N*m')")
    p.add_argument("--template", metavar="CASE", help="case giving input element and "
                   "output shares (default: the first duty case)")
    p.add_argument("--prefix", default="rec", help="prefix of the case ids (default rec)")
    p.add_argument("--tolerance", type=float, metavar="PCT",
                   help="warn when a bearing's equivalent load from the cases differs from "
                   "the direct integral by more than PCT %%")
    p.add_argument("--write", metavar="PATH", help="write the cases as a YAML fragment")
    p.add_argument("--json", metavar="PATH|-", help="write results and reduction as JSON")
    p.add_argument("--plot", metavar="FILE", help="load-duration figure (.png/.svg)")
    p.add_argument("--chunk", type=int, default=1_000_000, metavar="ROWS",
                   help="rows read at a time (default 1 000 000)")
    p.add_argument("--quiet", "-q", action="store_true", help="print nothing but errors")
    return p


def _torque(text: str, option: str) -> float:
    from shaftsys.io.quantities import QuantityProblem, to_internal

    try:
        return to_internal(text.strip(), "moment")
    except QuantityProblem as exc:
        raise ModelError(f"{option} '{text}': {exc.message}", field=option,
                         expected="a torque such as '250 N*m'") from None


def _edges(text: str) -> tuple[float, ...]:
    parts = text.strip().rsplit(" ", 1)
    unit = parts[1] if len(parts) == 2 and not parts[1][-1:].isdigit() else ""
    body = parts[0] if unit else text
    values = tuple(_torque(f"{v} {unit}".strip(), "--edges") for v in body.split(",") if v)
    if len(values) < 2 or any(b <= a for a, b in itertools.pairwise(values)):
        raise ModelError(f"--edges '{text}'", field="--edges",
                         expected="at least two increasing values, e.g. '0,50,100 N*m'")
    return values


def _load_options(specs: list[str]) -> tuple[tuple[str, ...], list[tuple[str, int]]]:
    """``COLUMN=ELEMENT.Fy`` options -> (columns, [(element, component index)])."""
    columns: list[str] = []
    targets: list[tuple[str, int]] = []
    for spec in specs:
        col, _, target = spec.partition("=")
        element, _, comp = target.rpartition(".")
        if not col.strip() or not element or comp not in ("Fx", "Fy", "Fz"):
            raise ModelError(f"--load '{spec}'", field="--load",
                             expected="COLUMN=ELEMENT.Fx|Fy|Fz, e.g. belt_pull=tail_load.Fy")
        columns.append(col.strip())
        targets.append((element.strip(), ("Fx", "Fy", "Fz").index(comp)))
    return tuple(columns), targets


def _settings(args: argparse.Namespace, model: Any) -> Any:
    from shaftsys.analysis.duty_reduction import BinSettings

    if args.bins < 1 or args.speed_bins < 1:
        raise ModelError(f"--bins {args.bins} --speed-bins {args.speed_bins}",
                         field="--bins", expected="at least 1 bin")
    if args.chunk < 2:
        raise ModelError(f"--chunk {args.chunk}", field="--chunk", expected=">= 2 rows")
    p = args.exponent
    if p is None:
        from shaftsys.analysis.duty import default_exponent

        p = default_exponent(model)
    elif not 1.0 <= p <= 20.0:
        raise ModelError(f"--exponent {p}", field="--exponent", expected="3 or 10/3")
    return BinSettings(
        torque_bins=args.bins, torque_edges_Nmm=_edges(args.edges) if args.edges else None,
        speed_bins=args.speed_bins, exponent=p,
        peak_above_Nmm=_torque(args.peak_above, "--peak-above") if args.peak_above else None)


def _apply_recording(args: argparse.Namespace, rec: Any) -> None:
    """Fill the options from a model's ``recording:`` section (``io.recording``)."""
    args.series = str(rec.path)
    for role in ("time", "torque", "power", "speed", "temperature"):
        setattr(args, role, getattr(rec, role))
    args.load = [f"{col}={el}.{('Fx', 'Fy', 'Fz')[k]}" for col, el, k in rec.loads]
    args.bins, args.speed_bins, args.exponent = rec.bins, rec.speed_bins, rec.exponent
    args.edges = (",".join(f"{e!r}" for e in rec.edges_Nmm) + " N*mm"
                  if rec.edges_Nmm else None)
    args.peak_above = f"{rec.peak_above_Nmm!r} N*mm" if rec.peak_above_Nmm else None
    args.tolerance, args.template, args.prefix = (rec.tolerance_pct, rec.template,
                                                  rec.prefix)


def run_duty(args: argparse.Namespace) -> int:
    """Run the ``duty`` command; returns the exit code."""
    from shaftsys.analysis.duty import reduce_duty
    from shaftsys.io.loader import load_model
    from shaftsys.io.timeseries import open_series
    from shaftsys.report.duty_tables import cases_table, error_table, summary_line
    from shaftsys.report.tables import overall_verdict, shaft_checks_table, verdict_table

    model = load_model(args.model)
    if args.series is None:
        rec = model.recording
        if rec is None:
            raise ModelError(f"{args.model} names no recording", file=args.model,
                             field="recording", expected="a series file argument, or a "
                             "'recording:' section in the model file")
        _apply_recording(args, rec)
    settings = _settings(args, model)
    load_columns, targets = _load_options(args.load)
    source = open_series(args.series, time=args.time, torque=args.torque,
                         power=args.power, speed=args.speed, temperature=args.temperature,
                         loads=load_columns, chunk_rows=args.chunk)
    kinds = tuple("load" if r.startswith("load:") else r for r in source.extras)
    red = reduce_duty(model, source.chunks, settings, template=args.template,
                      prefix=args.prefix, tolerance_pct=args.tolerance,
                      series_name=source.name, channels=kinds, load_targets=targets)
    assert red.result is not None
    result = replace(red.result, duty_reduction=red)
    if args.write:
        from shaftsys.io.duty_cases import cases_fragment_text
        from shaftsys.io.output import write_text

        tmpl = next(c for c in model.cases if c.id == red.template)
        write_text(args.write, cases_fragment_text(red, args.series, tmpl, targets))
    if args.plot:
        from shaftsys.report.duty_plot import save_duty_plot

        save_duty_plot(red, args.plot)
    if args.json:
        from shaftsys.io.output import json_ready, write_json
        from shaftsys.io.results_json import result_to_dict

        data = result_to_dict(result)  # with the reduction: the check's JSON, same keys
        if args.json == "-":
            sys.stdout.write(json.dumps(json_ready(data), indent=2, allow_nan=False) + "\n")
        else:
            write_json(args.json, data)
    out = sys.stderr if args.json == "-" else sys.stdout
    if not args.quiet:
        print(summary_line(red), file=out)
        print(cases_table(red), file=out)
        print(file=out)
        print(error_table(red), file=out)
        print(file=out)
        print(verdict_table(result), file=out)
        if result.checks is not None:
            print(file=out)
            print(shaft_checks_table(result.checks), file=out)
        print(file=out)
        print(overall_verdict(result), file=out)
        if args.write:
            print(f"cases written to {args.write}", file=out)
        out.flush()
        notes = list(red.warnings)
        for w in notes:
            print(f"warning: {w}", file=sys.stderr)
        others = list(dict.fromkeys(result.warnings))
        for w in others[:5]:
            print(f"warning: {w}", file=sys.stderr)
        if len(others) > 5:
            print(f"warning: {len(others) - 5} more warnings (see --json)", file=sys.stderr)
    return EXIT_OK if result.ok else EXIT_TARGET_MISSED


__all__ = ["add_duty_parser", "run_duty"]
