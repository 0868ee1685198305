"""The ``shaftsys`` command line.

Every command exits 0 when all checks pass, 1 when a target or limit is missed (results
are still written), 2 for bad input, 3 for a numerical failure. Errors shaftsys raises on
purpose are printed as one clear message; anything else is a bug and shows a traceback.
"""

from __future__ import annotations

import argparse
import json
import logging
import sys
from collections.abc import Sequence
from pathlib import Path
from typing import Any

from shaftsys import __version__
from shaftsys.errors import EXIT_OK, EXIT_TARGET_MISSED, ModelError, ShaftsysError

EXIT_CODES_TEXT = """exit codes:
  0  every check passes
  1  a target or limit is missed (results are still written)
  2  bad input (the message names file, line and field)
  3  numerical failure (singular or ill-posed system, residual above tolerance)"""

CHECK_EXAMPLE = """example:
  shaftsys check models/fan_drive.yaml
  shaftsys check models/fan_drive.yaml --json results.json
  shaftsys check models/fan_drive.yaml --json - --quiet | jq .system"""

VALIDATE_EXAMPLE = """example:
  shaftsys validate models/fan_drive.yaml"""

REPORT_EXAMPLE = """example:
  shaftsys report models/fan_drive.yaml -o fan_report.html"""

PLOT_EXAMPLE = """examples:
  shaftsys plot models/fan_drive.yaml --what drawing -o shaft.svg
  shaftsys plot models/fan_drive.yaml --what diagrams --case full_flow -o full_flow.png
  shaftsys plot models/fan_drive.yaml --what life --bearing A -o A_life.png"""

SCHEMA_EXAMPLE = """example:
  shaftsys schema -o model.schema.json"""


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(
        prog="shaftsys",
        description="Bearing reactions, ISO 281 bearing life and shaft checks for every "
        "support of a machine over its duty cycle.",
        epilog=EXIT_CODES_TEXT + "\n\nexample:\n  shaftsys check models/fan_drive.yaml",
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    p.add_argument("--version", action="version", version=f"shaftsys {__version__}")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")

    c = sub.add_parser(
        "check", help="solve a model and check every bearing against its targets",
        description="Solve every shaft in every operating case, print the reactions of "
        "every bearing and the life verdict table.",
        epilog=CHECK_EXAMPLE + "\n\n" + EXIT_CODES_TEXT,
        formatter_class=argparse.RawDescriptionHelpFormatter)
    c.add_argument("model", help="model file (YAML)")
    c.add_argument("--json", metavar="PATH", help="write the results as JSON ('-' = stdout)")
    c.add_argument("--quiet", "-q", action="store_true", help="print nothing but errors")
    c.add_argument("--loads-only", action="store_true",
                   help="print only the reaction table")
    c.add_argument("--explain", metavar="BEARING",
                   help="print the calculation sheet of one bearing, formula by formula")

    r = sub.add_parser(
        "report", help="write a self-contained HTML report for review and sign-off",
        description="Solve a model and write one HTML file (figures inline, no network "
        "access needed) with inputs, diagrams, verdicts and calculation sheets.",
        epilog=REPORT_EXAMPLE + "\n\n" + EXIT_CODES_TEXT,
        formatter_class=argparse.RawDescriptionHelpFormatter)
    r.add_argument("model", help="model file (YAML)")
    r.add_argument("-o", "--output", metavar="PATH", default="report.html",
                   help="HTML file to write (default: report.html)")
    r.add_argument("--quiet", "-q", action="store_true", help="print nothing but errors")

    pl = sub.add_parser(
        "plot", help="write a figure (PNG or SVG, by the file's suffix)",
        description="Solve a model and write one figure: the to-scale shaft drawing, the "
        "diagrams of one case, or the load-life chart of one bearing.",
        epilog=PLOT_EXAMPLE + "\n\n" + EXIT_CODES_TEXT,
        formatter_class=argparse.RawDescriptionHelpFormatter)
    pl.add_argument("model", help="model file (YAML)")
    pl.add_argument("--what", choices=("drawing", "diagrams", "life"), required=True,
                    help="which figure")
    pl.add_argument("--shaft", metavar="ID", help="shaft id (default: the first)")
    pl.add_argument("--case", metavar="ID", help="case id for diagrams (default: the first)")
    pl.add_argument("--bearing", metavar="ID", help="bearing id for the load-life chart")
    pl.add_argument("-o", "--output", metavar="PATH", required=True,
                    help="figure file, .png or .svg")

    v = sub.add_parser(
        "validate", help="read and check a model file without solving it",
        description="Read a model file and report the first problem found, with its file, "
        "line and field.", epilog=VALIDATE_EXAMPLE + "\n\n" + EXIT_CODES_TEXT,
        formatter_class=argparse.RawDescriptionHelpFormatter)
    v.add_argument("model", help="model file (YAML)")
    v.add_argument("--quiet", "-q", action="store_true", help="print nothing but errors")

    s = sub.add_parser(
        "schema", help="print the JSON Schema of the model file",
        description="Print the JSON Schema that editors can use to check a model file "
        "while it is typed.", epilog=SCHEMA_EXAMPLE,
        formatter_class=argparse.RawDescriptionHelpFormatter)
    s.add_argument("-o", "--output", metavar="PATH", help="write to a file instead")
    return p


def main(argv: Sequence[str] | None = None) -> int:
    """Entry point of the ``shaftsys`` console script; returns the exit code."""
    args = _parser().parse_args(argv)
    logging.basicConfig(level=logging.WARNING, format="warning: %(message)s")
    # the life engine returns its warnings in the results; the CLI prints them once
    logging.getLogger("shaftsys.bearings").setLevel(logging.ERROR)
    if args.command is None:
        _parser().print_help()
        return EXIT_OK
    try:
        if args.command == "check":
            return _check(args)
        if args.command == "validate":
            return _validate(args)
        if args.command == "schema":
            return _schema(args)
        if args.command == "report":
            return _report(args)
        if args.command == "plot":
            return _plot(args)
    except ShaftsysError as exc:
        print(f"shaftsys: error: {exc}", file=sys.stderr)
        return exc.exit_code
    except KeyboardInterrupt:
        print("shaftsys: interrupted", file=sys.stderr)
        return 130
    return EXIT_OK  # pragma: no cover


def _validate(args: argparse.Namespace) -> int:
    from shaftsys.io.loader import load_model

    model = load_model(args.model)
    if not args.quiet:
        nb = sum(len(s.bearings) for s in model.shafts)
        print(f"{args.model}: valid model '{model.name}': {len(model.shafts)} shaft(s), "
              f"{nb} bearing(s), {len(model.cases)} case(s)")
    return EXIT_OK


def _schema(args: argparse.Namespace) -> int:
    from shaftsys.io.output import write_text
    from shaftsys.io.schema import model_schema

    text = json.dumps(model_schema(), indent=2) + "\n"
    if args.output:
        write_text(args.output, text)
    else:
        sys.stdout.write(text)
    return EXIT_OK


def _check(args: argparse.Namespace) -> int:
    from shaftsys.analysis import analyse
    from shaftsys.io.loader import load_model
    from shaftsys.io.output import json_ready, write_json
    from shaftsys.report.tables import loads_table, verdict_table
    from shaftsys.results_json import result_to_dict

    model = load_model(args.model)
    result = analyse(model)
    data = result_to_dict(result)
    if args.json and args.json != "-":
        write_json(Path(args.json), data)
    to_stdout_json = args.json == "-"
    out = sys.stderr if to_stdout_json else sys.stdout
    if not args.quiet:
        print(loads_table(result), file=out)
        if not args.loads_only:
            print(file=out)
            print(verdict_table(result), file=out)
            if result.checks is not None:
                print(file=out)
                print(result.checks.table(), file=out)
        out.flush()
        for w in _all_warnings(result):
            print(f"warning: {w}", file=sys.stderr)
    if to_stdout_json:
        sys.stdout.write(json.dumps(json_ready(data), indent=2) + "\n")
    if args.explain:
        from shaftsys.report.calcsheet import explain_bearing

        if args.explain not in {b.bearing.id for b in result.bearings}:
            raise ModelError(f"no bearing '{args.explain}' in the model",
                             field="--explain", expected="one of: " + ", ".join(
                                 b.bearing.id for b in result.bearings))
        print(explain_bearing(result, args.explain), file=out)
    return EXIT_OK if result.ok else EXIT_TARGET_MISSED


def _report(args: argparse.Namespace) -> int:
    from shaftsys.analysis import analyse
    from shaftsys.io.loader import load_model
    from shaftsys.io.output import write_text
    from shaftsys.report.html import render_report

    model = load_model(args.model)
    result = analyse(model)
    write_text(args.output, render_report(result))
    if not args.quiet:
        print(f"wrote {args.output}: "
              + ("all supports pass" if result.ok else "a target is missed"))
    return EXIT_OK if result.ok else EXIT_TARGET_MISSED


def _plot(args: argparse.Namespace) -> int:
    from shaftsys.analysis import analyse
    from shaftsys.io.loader import load_model
    from shaftsys.io.output import atomic_write
    from shaftsys.report import figures

    suffix = Path(args.output).suffix.lower().lstrip(".")
    if suffix not in {"png", "svg"}:
        raise ModelError(f"cannot write a figure as '.{suffix}'", field="--output",
                         expected="a file name ending in .png or .svg")
    model = load_model(args.model)
    result = analyse(model)
    shaft = _pick(result.shafts, args.shaft, lambda s: s.shaft.id, "--shaft")
    if args.what == "drawing":
        fig = figures.shaft_drawing(shaft)
    elif args.what == "diagrams":
        case = _pick(shaft.cases, args.case, lambda c: c.case, "--case")
        fig = figures.diagrams(case)
    else:
        bearing = _pick(result.bearings, args.bearing, lambda b: b.bearing.id, "--bearing")
        fig = figures.load_life_chart(bearing)
    atomic_write(args.output, lambda fh: fig.savefig(fh, format=suffix))  # type: ignore[union-attr]
    return EXIT_OK if result.ok else EXIT_TARGET_MISSED


def _pick(items: Sequence[Any], wanted: str | None, key: Any, option: str) -> Any:
    """The item whose key is ``wanted`` (the first when ``None``), else a ModelError."""
    if wanted is None:
        return items[0]
    for item in items:
        if key(item) == wanted:
            return item
    raise ModelError(f"no '{wanted}' in the model", field=option,
                     expected="one of: " + ", ".join(str(key(i)) for i in items))


def _all_warnings(result: object) -> list[str]:
    """Every warning of a result, once, model-level first."""
    found: list[str] = list(getattr(result, "warnings", ()))
    for b in getattr(result, "bearings", ()):
        if b.life is not None:
            found.extend(w if b.bearing.id in w else f"bearing '{b.bearing.id}': {w}"
                         for w in b.life.warnings)
    return list(dict.fromkeys(found))


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
