"""The ``shaftsys`` command line.

Every command exits 0 when all checks pass, 1 when a target or limit is missed (results
are still written), 2 for bad input, 3 for a numerical failure. Errors shaftsys raises on
purpose are printed as one clear message; anything else is a bug and shows a traceback.

Options every command shares: ``--quiet/-q`` (print nothing but errors) and ``--help``
(with a worked example). Commands that produce results (``check``, ``report``) take
``--json PATH`` (``-`` = standard output, for pipelines; the human-readable text then
goes to standard error). Verdict words are coloured only when the stream they are
written to is a terminal and ``NO_COLOR`` is unset; progress bars are drawn only on a
terminal's standard error (see :mod:`shaftsys.cli.terminal` and
:mod:`shaftsys.cli.progress`).
"""

from __future__ import annotations

import argparse
import json
import logging
import sys
from collections.abc import Callable, Sequence
from pathlib import Path
from typing import Any, TextIO

from shaftsys import __version__
from shaftsys.errors import EXIT_OK, EXIT_TARGET_MISSED, ModelError, OutputError, ShaftsysError

#: The ``--objective`` choices: the values of :class:`shaftsys.model.selection.Objective`
#: (a test holds them equal), written out so that building the parser imports no numpy.
OBJECTIVES = ("smallest", "lightest", "cheapest", "largest_margin")

EXIT_CODES_TEXT = """exit codes:
  0  every check passes
  1  a target or limit is missed (results are still written)
  2  bad input (the message names file, line and field)
  3  numerical failure (singular or ill-posed system, residual above tolerance)"""

CHECK_EXAMPLE = """example:
  shaftsys check models/fan_drive.yaml
  shaftsys check models/fan_drive.yaml --json results.json
  shaftsys check models/fan_drive.yaml --json - --quiet | jq .system
  shaftsys check models/fan_drive.yaml --explain A"""

CHOOSE_EXAMPLE = """examples:
  shaftsys choose models/belt_reducer_open.yaml
  shaftsys choose models/belt_reducer_open.yaml --write chosen.yaml
  shaftsys choose models/belt_reducer_open.yaml --objective lightest --json choice.json
  shaftsys check chosen.yaml"""

VALIDATE_EXAMPLE = """example:
  shaftsys validate models/fan_drive.yaml"""

REPORT_EXAMPLE = """example:
  shaftsys report models/fan_drive.yaml -o fan_report.html
  shaftsys report models/fan_drive.yaml -o fan_report.html --json - | jq .ok"""

PLOT_EXAMPLE = """examples:
  shaftsys plot models/fan_drive.yaml --what drawing -o shaft.svg
  shaftsys plot models/fan_drive.yaml --what diagrams --case full_flow -o full_flow.png
  shaftsys plot models/fan_drive.yaml --what life --bearing A -o A_life.png
  shaftsys plot models/belt_reducer_recorded.yaml --what duty -o duty.png
  shaftsys plot models/spindle_preload.yaml --what elements --bearing FRONT -o front.svg"""

SCHEMA_EXAMPLE = """example:
  shaftsys schema -o model.schema.json"""

NEW_EXAMPLE = """example:
  shaftsys new conveyor.yaml
  shaftsys check conveyor.yaml
  shaftsys new conveyor.yaml --force     # start again from the template"""

#: Default file name of ``shaftsys new``.
NEW_DEFAULT_PATH = "model.yaml"

#: Package file holding the starter model that ``shaftsys new`` writes.
STARTER_MODEL = "data/starter_model.yaml"

#: What runs a command: parsed arguments in, exit code out.
Handler = Callable[[argparse.Namespace], int]


def _command(sub: Any, name: str, help_text: str, description: str, example: str
             ) -> argparse.ArgumentParser:
    """A sub-command whose ``--help`` ends with ``example`` and the exit codes."""
    p: argparse.ArgumentParser = sub.add_parser(
        name, help=help_text, description=description,
        epilog=example + "\n\n" + EXIT_CODES_TEXT,
        formatter_class=argparse.RawDescriptionHelpFormatter)
    return p


def _quiet(p: argparse.ArgumentParser) -> None:
    p.add_argument("--quiet", "-q", action="store_true",
                   help="print nothing but errors (no tables, messages or progress bar)")


def _parser() -> tuple[argparse.ArgumentParser, dict[str, Handler]]:
    """The argument parser and the handler of each command."""
    p = argparse.ArgumentParser(
        prog="shaftsys",
        description="Bearing reactions, ISO 281 bearing life and shaft checks for every "
        "support of a machine over its duty cycle.",
        epilog=EXIT_CODES_TEXT + "\n\nexample:\n  shaftsys new my_machine.yaml\n"
        "  shaftsys check my_machine.yaml\n"
        "  shaftsys report my_machine.yaml -o my_machine.html",
        formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("--version", action="version", version=f"shaftsys {__version__}")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")
    handlers: dict[str, Handler] = {}

    n = _command(sub, "new", "write a commented starter model to edit into your own",
                 "Write a commented, working model file (the head shaft of a chain "
                 "conveyor, every number invented) to start a new model from. It solves "
                 "as written; replace its shaft, bearings, elements and cases with yours.",
                 NEW_EXAMPLE)
    n.add_argument("path", nargs="?", default=NEW_DEFAULT_PATH, metavar="PATH",
                   help=f"file to write (default: {NEW_DEFAULT_PATH}; '-' = standard "
                   "output)")
    n.add_argument("--force", action="store_true", help="overwrite an existing file")
    _quiet(n)
    handlers["new"] = _new

    c = _command(sub, "check", "solve a model and check every bearing against its targets",
                 "Solve every shaft in every operating case, print the reactions of every "
                 "bearing, the life verdict table and the shaft checks.", CHECK_EXAMPLE)
    c.add_argument("model", help="model file (YAML)")
    c.add_argument("--json", metavar="PATH",
                   help="write the results as JSON ('-' = standard output; the tables "
                   "then go to standard error)")
    _quiet(c)
    c.add_argument("--loads-only", action="store_true",
                   help="print only the reaction table")
    c.add_argument("--explain", metavar="ID",
                   help="print the calculation sheet of one bearing, gear or belt pulley "
                   "(with its slope check), of the fatigue section SHAFT@X (x in mm), or "
                   "'system-life', formula by formula")
    handlers["check"] = _check

    o = _command(sub, "choose", "choose every open support's bearing from a catalogue",
                 "For every bearing the model leaves open ('choose:' with a catalogue), "
                 "evaluate every catalogue row that fits the seat over the whole duty "
                 "cycle, choose the best by the objective, solve again with the choices "
                 "in until they settle, then check the machine. Prints the choice, its "
                 "runners-up and, where nothing qualifies, the closest miss and why.",
                 CHOOSE_EXAMPLE)
    o.add_argument("model", help="model file (YAML) with open bearings")
    o.add_argument("--objective", choices=OBJECTIVES,
                   help="ranking of the qualifying bearings (default: the model's "
                   "'selection: objective', else smallest)")
    o.add_argument("--write", metavar="PATH",
                   help="write the model with the chosen bearings filled in as fixed "
                   "bearings to a new file")
    o.add_argument("--overwrite-input", action="store_true",
                   help="allow --write to replace the model file itself")
    o.add_argument("--json", metavar="PATH",
                   help="write the results as JSON ('-' = standard output; the tables "
                   "then go to standard error)")
    _quiet(o)
    handlers["choose"] = _choose

    r = _command(sub, "report", "write a self-contained HTML report for review and sign-off",
                 "Solve a model and write one HTML file (figures inline, no network access "
                 "needed) with inputs, diagrams, verdicts and calculation sheets.",
                 REPORT_EXAMPLE)
    r.add_argument("model", help="model file (YAML)")
    r.add_argument("-o", "--output", metavar="PATH", default="report.html",
                   help="HTML file to write (default: report.html)")
    r.add_argument("--json", metavar="PATH",
                   help="also write the results as JSON ('-' = standard output)")
    _quiet(r)
    handlers["report"] = _report

    pl = _command(sub, "plot", "write a figure (PNG or SVG, by the file's suffix)",
                  "Solve a model and write one figure: the to-scale shaft drawing, the "
                  "diagrams of one case, the load-life chart of one bearing, the "
                  "rolling-element loads of a bearing with an interior (polar), or the "
                  "load-duration figure of the model's recording.",
                  PLOT_EXAMPLE)
    pl.add_argument("model", help="model file (YAML)")
    pl.add_argument("--what", choices=("drawing", "diagrams", "life", "duty", "elements"),
                    required=True,
                    help="which figure")
    pl.add_argument("--shaft", metavar="ID", help="shaft id (default: the first)")
    pl.add_argument("--case", metavar="ID", help="case id for diagrams (default: the first)")
    pl.add_argument("--bearing", metavar="ID", help="bearing id for the load-life chart or "
                    "the element loads")
    pl.add_argument("-o", "--output", metavar="PATH", required=True,
                    help="figure file, .png or .svg")
    _quiet(pl)
    handlers["plot"] = _plot

    v = _command(sub, "validate", "read and check a model file without solving it",
                 "Read a model file and report the first problem found, with its file, "
                 "line and field.", VALIDATE_EXAMPLE)
    v.add_argument("model", help="model file (YAML)")
    _quiet(v)
    handlers["validate"] = _validate


    s = _command(sub, "schema", "print the JSON Schema of the model file",
                 "Print the JSON Schema that editors can use to check a model file while "
                 "it is typed.", SCHEMA_EXAMPLE)
    s.add_argument("-o", "--output", metavar="PATH", help="write to a file instead")
    _quiet(s)
    handlers["schema"] = _schema

    # ---- design studies ------------------------------------------------------------
    from shaftsys.cli.sweep import add_sweep_parser, run_sweep

    add_sweep_parser(sub)
    handlers["sweep"] = run_sweep

    from shaftsys.cli.optimise import add_optimise_parser, run_optimise

    add_optimise_parser(sub)
    handlers["optimise"] = run_optimise

    # ---- recorded duty -------------------------------------------------------------
    from shaftsys.cli.duty import add_duty_parser, run_duty

    add_duty_parser(sub, EXIT_CODES_TEXT)
    handlers["duty"] = run_duty
    return p, handlers


class _LowerLevelFormatter(logging.Formatter):
    """``warning: message`` (level in lower case, like the CLI's own messages)."""

    def format(self, record: logging.LogRecord) -> str:
        record.levelname = record.levelname.lower()
        return super().format(record)


def main(argv: Sequence[str] | None = None) -> int:
    """Entry point of the ``shaftsys`` console script; returns the exit code."""
    parser, handlers = _parser()
    args = parser.parse_args(argv)
    if args.command is None:
        parser.print_help()
        return EXIT_OK
    if not logging.getLogger().handlers:
        handler = logging.StreamHandler()
        handler.setFormatter(_LowerLevelFormatter("%(levelname)s: %(message)s"))
        logging.getLogger().addHandler(handler)
        logging.getLogger().setLevel(logging.WARNING)
    # the life engine returns its warnings in the results; the CLI prints them once.
    # dask's scheduler and workers chatter at INFO: only their warnings are shown.
    # Logger levels are put back afterwards, so that main() can be called in-process.
    loggers = [logging.getLogger("shaftsys.bearings"), logging.getLogger("shaftsys"),
               logging.getLogger("distributed"), logging.getLogger("tornado")]
    levels = [lg.level for lg in loggers]
    loggers[0].setLevel(logging.ERROR)
    loggers[2].setLevel(logging.WARNING)
    loggers[3].setLevel(logging.WARNING)
    if getattr(args, "quiet", False):
        for lg in loggers[1:]:
            lg.setLevel(logging.ERROR)
    try:
        return handlers[args.command](args)
    except ShaftsysError as exc:
        print(f"shaftsys: {_tag('error:', 'bad', sys.stderr)} {exc}", file=sys.stderr)
        return exc.exit_code
    except KeyboardInterrupt:
        print("shaftsys: interrupted", file=sys.stderr)
        return 130
    finally:
        for lg, level in zip(loggers, levels, strict=True):
            lg.setLevel(level)


# ------------------------------------------------------------------------ helpers
def _tag(text: str, role: str, stream: TextIO) -> str:
    """``text`` in the colour of ``role`` when ``stream`` takes colour, else plain."""
    from shaftsys.cli.terminal import colour_wanted, paint

    return paint(text, role) if colour_wanted(stream) else text


def _emit(text: str, stream: TextIO) -> None:
    """Print a block of table text, verdict words coloured on a terminal."""
    from shaftsys.cli.terminal import colour_wanted, paint_verdicts

    print(paint_verdicts(text) if colour_wanted(stream) else text, file=stream)


def _warn(text: str) -> None:
    print(f"{_tag('warning:', 'caution', sys.stderr)} {text}", file=sys.stderr)


def _solve(args: argparse.Namespace, bar: Any) -> Any:
    """Read and solve ``args.model``, counting two steps on ``bar`` (an ``--objective``
    option replaces the model's choice objective). A model that names a recording is
    solved with the cases reduced from it (``io.recording``); the result then carries the
    reduction.
    """
    from shaftsys import analyse
    from shaftsys.io.loader import load_model

    bar.status("reading the model")
    model = load_model(args.model)
    if getattr(args, "objective", None):
        from dataclasses import replace

        from shaftsys.model.selection import Objective

        model = replace(model, selection=replace(model.selection,
                                                 objective=Objective(args.objective)))
    bar.advance()
    spec = model.recording
    if spec is None:
        bar.status("solving")
        result = analyse(model)
    else:
        from shaftsys.io.recording import analyse_recorded

        bar.status("reducing the recording, solving")
        result = analyse_recorded(model, spec)
    bar.advance()
    return result


def _json_out(args: argparse.Namespace, result: Any) -> None:
    """Write ``result`` as JSON to ``args.json`` (a file, or stdout for '-')."""
    if not args.json:
        return
    from shaftsys.io.output import json_ready, write_json
    from shaftsys.io.results_json import result_to_dict

    data = result_to_dict(result)
    if args.json == "-":
        sys.stdout.write(json.dumps(json_ready(data), indent=2, allow_nan=False) + "\n")
        sys.stdout.flush()
    else:
        write_json(Path(args.json), data)


def _verdict_code(result: Any) -> int:
    return EXIT_OK if result.ok else EXIT_TARGET_MISSED


# ------------------------------------------------------------------------ commands
def _validate(args: argparse.Namespace) -> int:
    from shaftsys.io.loader import load_model
    from shaftsys.io.recording import require_series_file

    model = load_model(args.model)
    if model.recording is not None:
        require_series_file(model.recording)
    if not args.quiet:
        nb = sum(len(s.bearings) for s in model.shafts)
        seats = (f", {len(model.open_seats)} of them to choose from a catalogue"
                 if model.open_seats else "")
        print(f"{args.model}: valid model '{model.name}': {len(model.shafts)} shaft(s), "
              f"{nb} bearing(s){seats}, {len(model.cases)} case(s)")
        sys.stdout.flush()
        for w in model.warnings:
            _warn(w)
    return EXIT_OK


def _schema(args: argparse.Namespace) -> int:
    from shaftsys.io.output import write_text
    from shaftsys.io.schema import model_schema

    text = json.dumps(model_schema(), indent=2) + "\n"
    if args.output:
        write_text(args.output, text)
        if not args.quiet:
            print(f"wrote {args.output}")
    else:
        sys.stdout.write(text)
    return EXIT_OK


def starter_model_text(path_name: str = NEW_DEFAULT_PATH) -> str:
    """The commented starter model that ``shaftsys new`` writes.

    Parameters
    ----------
    path_name:
        File name the text will be saved as; it replaces the placeholder in the
        comments' example commands.

    Returns
    -------
    str
        YAML text of a complete single-shaft model (a chain conveyor head shaft with
        invented numbers) that loads and solves as written.
    """
    from importlib.resources import files

    text = files("shaftsys").joinpath(STARTER_MODEL).read_text(encoding="utf-8")
    return text.replace("THIS_FILE", path_name)


def _new(args: argparse.Namespace) -> int:
    from shaftsys.io.output import write_text

    if args.path == "-":
        sys.stdout.write(starter_model_text())
        return EXIT_OK
    target = Path(args.path)
    if target.exists() and not args.force:
        raise OutputError(f"{target} already exists; choose another name or add --force "
                          "to overwrite it")
    write_text(target, starter_model_text(target.name))
    if not args.quiet:
        print(f"wrote {target}: a starter model (chain conveyor head shaft, invented "
              f"numbers)\nnext: shaftsys check {target}")
    return EXIT_OK


def _check(args: argparse.Namespace) -> int:
    from shaftsys.cli.progress import ProgressBar
    from shaftsys.report.tables import (
        loads_table,
        overall_verdict,
        selection_table,
        shaft_checks_table,
        verdict_table,
    )

    with ProgressBar(2, "check", quiet=args.quiet) as bar:
        result = _solve(args, bar)
    from shaftsys.model.elements import Gear, Pulley

    gears = [e.id for sr in result.shafts for e in sr.shaft.elements if isinstance(e, Gear)]
    pulleys = [e.id for sr in result.shafts for e in sr.shaft.elements
               if isinstance(e, Pulley)]
    section = _section_of(result, args.explain) if args.explain else None
    if args.explain and section is None and args.explain != SYSTEM_SHEET and args.explain \
            not in {
            b.bearing.id for b in result.bearings} | set(gears) | set(pulleys):
        raise ModelError(f"no bearing, gear, pulley or fatigue section '{args.explain}' in "
                         "the model", field="--explain",
                         expected="one of: " + ", ".join([b.bearing.id
                                                          for b in result.bearings]
                                                         + gears + pulleys)
                         + ", or SHAFT@X for the fatigue section at x mm, e.g. "
                         + _section_example(result) + f", or {SYSTEM_SHEET}")
    if args.json != "-":
        _json_out(args, result)
    out = sys.stderr if args.json == "-" else sys.stdout
    if not args.quiet:
        _emit(loads_table(result), out)
        if not args.loads_only:
            if result.selection is not None:
                print(file=out)
                _emit(selection_table(result.selection), out)
            print(file=out)
            _emit(verdict_table(result), out)
            if result.internal:
                from shaftsys.report.internal_table import internal_table, nonlinear_solve_lines

                print(file=out)
                _emit(internal_table(result), out)
                if any(s.nonlinear is not None for s in result.shafts):
                    _emit(nonlinear_solve_lines(result), out)
            if result.thermal is not None:
                from shaftsys.report.thermal_table import thermal_table

                print(file=out)
                _emit(thermal_table(result), out)
            if result.checks is not None:
                print(file=out)
                _emit(shaft_checks_table(result.checks), out)
            if result.duty_reduction is not None:
                from shaftsys.report.duty_tables import cases_table, error_table, summary_line

                red = result.duty_reduction
                print(file=out)
                _emit(f"duty from the recording - {summary_line(red)}", out)
                _emit(cases_table(red), out)
                print(file=out)
                _emit(error_table(red), out)
            print(file=out)
            _emit(overall_verdict(result), out)
        out.flush()
        for w in _all_warnings(result):
            _warn(w)
    if args.json == "-":
        _json_out(args, result)
    if args.explain:
        from shaftsys.report import calcsheet as cs

        if section is not None:
            text = cs.explain_section(result, *section)
        elif args.explain == SYSTEM_SHEET:
            text = cs.explain_system(result)
        else:
            sheet = (cs.explain_gear if args.explain in gears else
                     cs.explain_pulley if args.explain in pulleys else cs.explain_bearing)
            text = sheet(result, args.explain)
            if result.checks is not None and args.explain not in pulleys:
                text += "\n\n" + cs.explain_deflection(result, args.explain)
        print(text, file=out)
    return _verdict_code(result)


def _choose(args: argparse.Namespace) -> int:
    from shaftsys.cli.progress import ProgressBar
    from shaftsys.report.tables import selection_table, verdict_table

    with ProgressBar(2, "choose", quiet=args.quiet) as bar:
        result = _solve(args, bar)
    if result.selection is None:
        raise ModelError("the model leaves no bearing open, so there is nothing to choose",
                         file=args.model, field="shafts[].bearings[]",
                         expected="a bearing with 'choose: {catalogue: FILE}' in place of "
                         "its type and ratings (or run 'shaftsys check')")
    if args.write:
        from shaftsys.io.filled_model import write_filled_model

        chosen = result.selection.chosen()
        if chosen:
            write_filled_model(args.model, chosen, args.write,
                               overwrite_input=args.overwrite_input)
    if args.json != "-":
        _json_out(args, result)
    out = sys.stderr if args.json == "-" else sys.stdout
    if not args.quiet:
        _emit(selection_table(result.selection), out)
        print(file=out)
        _emit(verdict_table(result), out)
        if args.write and result.selection.chosen():
            missing = [s.bearing_id for s in result.selection.seats if s.chosen is None]
            print(f"wrote {args.write}: the model with the chosen bearings as fixed "
                  "bearings" + (f" (still open: {', '.join(missing)})" if missing else ""),
                  file=out)
        out.flush()
        for w in _all_warnings(result):
            _warn(w)
    if args.json == "-":
        _json_out(args, result)
    return _verdict_code(result)


def _report(args: argparse.Namespace) -> int:
    from shaftsys.cli.progress import ProgressBar
    from shaftsys.io.output import write_text
    from shaftsys.report.html import render_report, report_steps, study_fragment
    from shaftsys.study.section import read_study_section, study_from_section
    from shaftsys.study.sweep import sweep

    with ProgressBar(2, "report", quiet=args.quiet) as bar:
        result = _solve(args, bar)
        bar.add_total(report_steps(result) + 1)
        section, name = read_study_section(args.model)
        study = None
        if section is not None and not (isinstance(section, dict) and "vary" not in section
                                        and "optimise" in section):
            st = study_from_section(result.model, section, name)
            study = study_fragment(st, sweep(st))
        bar.advance("design study")
        html_text = render_report(result, progress=bar.advance, study=study)
        bar.status("writing")
        write_text(args.output, html_text)
    _json_out(args, result)
    if not args.quiet:
        out = sys.stderr if args.json == "-" else sys.stdout
        verdict = _tag("every check passes", "good", out) if result.ok else \
            _tag("a target or limit is missed", "bad", out)
        print(f"wrote {args.output}: {verdict}", file=out)
        for w in _all_warnings(result):
            _warn(w)
    return _verdict_code(result)


def _plot(args: argparse.Namespace) -> int:
    from shaftsys.cli.progress import ProgressBar
    from shaftsys.io.output import atomic_write
    from shaftsys.report import figures

    suffix = Path(args.output).suffix.lower().lstrip(".")
    if suffix not in {"png", "svg"}:
        raise ModelError(f"cannot write a figure as '.{suffix}'", field="--output",
                         expected="a file name ending in .png or .svg")
    with ProgressBar(3, "plot", quiet=args.quiet) as bar:
        result = _solve(args, bar)
        bar.status("drawing")
        shaft = _pick(result.shafts, args.shaft, lambda s: s.shaft.id, "--shaft")
        if args.what == "duty":
            if result.duty_reduction is None:
                raise ModelError(f"{args.model} names no recording, so it has no "
                                 "load-duration figure", file=args.model, field="recording",
                                 expected="a 'recording:' section in the model file (or "
                                 "'shaftsys duty MODEL SERIES --plot FILE')")
            from shaftsys.report.duty_plot import duty_chart

            fig = duty_chart(result.duty_reduction)
        elif args.what == "elements":
            fig = _element_loads_figure(result, args)
        elif args.what == "drawing":
            fig = figures.shaft_drawing(shaft)
        elif args.what == "diagrams":
            case = _pick(shaft.cases, args.case, lambda c: c.case, "--case")
            fig = figures.diagrams(case)
        else:
            bearing = _pick(result.bearings, args.bearing, lambda b: b.bearing.id,
                            "--bearing")
            fig = figures.load_life_chart(bearing)
        atomic_write(args.output, lambda fh: fig.savefig(  # type: ignore[union-attr]
            fh, format=suffix, bbox_inches="tight", pad_inches=0.1))  # labels not clipped
        bar.advance("drawn")
    if not args.quiet:
        print(f"wrote {args.output}")
    return _verdict_code(result)


#: ``--explain`` value of the system-life sheet
SYSTEM_SHEET = "system-life"


def _section_of(result: Any, text: str) -> tuple[str, float] | None:
    """``SHAFT@X`` naming a fatigue section of the result (within 0.5 mm), else None."""
    shaft, at, x = text.partition("@")
    if not at or result.checks is None:
        return None
    try:
        x_mm = float(x.removesuffix("mm").strip())
    except ValueError:
        return None
    if shaft not in {s.id for s in result.checks.shafts}:
        return None
    sc = result.checks.shaft(shaft)
    return (shaft, x_mm) if any(abs(s.x_mm - x_mm) <= 0.5 for s in sc.sections) else None


def _section_example(result: Any) -> str:
    """A valid ``SHAFT@X`` of the result (for the message), or a generic one."""
    if result.checks is not None:
        for sc in result.checks.shafts:
            if sc.sections:
                return f"{sc.id}@{sc.sections[0].x_mm:g}"
    return "input@50"


def _element_loads_figure(result: Any, args: argparse.Namespace) -> Any:
    """The polar element-load figure of ``--bearing`` (default: the first bearing with an
    interior) in ``--case`` (default: its most loaded case).
    """
    from shaftsys.report.interior_plot import element_load_polar

    internal = result.internal or {}
    if not internal:
        raise ModelError(f"{args.model} gives no bearing an interior, so there are no "
                         "rolling-element loads", file=args.model, field="interior",
                         expected="an 'interior:' map on a bearing (Dw, Z, pitch_diameter..."
                         ", or let the rules estimate it: 'interior: {}')")
    bid = _pick(list(internal), args.bearing, lambda b: b, "--bearing")
    cases = [c["case"] for c in internal[bid]["cases"]]
    if args.case is not None and args.case not in cases:
        raise ModelError(f"no case '{args.case}' in the model", field="--case",
                         expected="one of: " + ", ".join(cases))
    return element_load_polar(bid, internal[bid], args.case)


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
    red = getattr(result, "duty_reduction", None)
    found: list[str] = list(red.warnings) if red is not None else []
    found.extend(getattr(result, "warnings", ()))
    for b in getattr(result, "bearings", ()):
        if b.life is not None:
            found.extend(w if b.bearing.id in w else f"bearing '{b.bearing.id}': {w}"
                         for w in b.life.warnings)
    return list(dict.fromkeys(found))


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
