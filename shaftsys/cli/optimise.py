"""The ``shaftsys optimise`` command: the best bearing/element stations of a model.

Reads the model's ``study: optimise:`` section (bounds on stations and spacings,
deflection/slope constraints, the least life margin), runs
:func:`shaftsys.study.optimise.optimise`, prints the optimum, the active constraints
and the sensitivities, writes the model with the optimum filled in as a new file, the
JSON and a figure of the objective with the constraint boundaries (1-D slices through
the optimum, one panel per quantity). Exit 0 optimum found and every check of the
written model passes, 1 a constraint cannot be met (or a check of the written model
fails), 2 bad input, 3 the optimiser did not converge.
"""

from __future__ import annotations

import argparse
import logging
import sys
from pathlib import Path
from typing import Any

from shaftsys.errors import EXIT_OK, EXIT_TARGET_MISSED, ModelError, NumericalError

OPTIMISE_EPILOG = """worked example (the bundled spindle: stations of the rear bearings):
  shaftsys optimise models/spindle_3brg.yaml --out spindle_opt

  writes spindle_opt/optimum.yaml (the model with the optimum stations), optimum.json
  and objective.png (worst life margin along each quantity through the optimum, with
  the bounds and the deflection/slope constraint boundaries).

model section:
  study:
    optimise:
      bounds:
        - {path: bearing.B.at, lower: 211 mm, upper: 249 mm}
        - {path: spacing.B.C, lower: 200 mm, upper: 270 mm}
      limits: [{kind: slope, at: [bearings], max: 0.001}]   # default: study: limits
      min_life_margin: 1.0      # every bearing's C/C_req at least this

exit codes:
  0  optimum found and every check of the optimum model passes
  1  a constraint cannot be met (files are still written)
  2  bad input (the message names file, line and field)
  3  the optimiser failed (did not converge)"""

#: Largest violation of a constraint that still counts as met [-] (relative).
TOLERANCE = 1e-6


def add_optimise_parser(subparsers: Any) -> argparse.ArgumentParser:
    """Add the ``optimise`` sub-command to an argparse sub-parsers object."""
    p: argparse.ArgumentParser = subparsers.add_parser(
        "optimise", help="find the bearing and element stations with the largest worst "
        "life margin within bounds and deflection/slope limits",
        description="Maximise the smallest life margin C/C_req of the bearings over the "
        "stations and spacings of the model's 'study: optimise:' section, subject to its "
        "deflection and slope limits; write the model with the optimum filled in.",
        epilog=OPTIMISE_EPILOG, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument("model", help="model file (YAML) with a 'study: optimise:' section")
    p.add_argument("--out", metavar="DIR",
                   help="output folder (default: <model>_optimum)")
    p.add_argument("--json", metavar="PATH",
                   help="JSON file (default: DIR/optimum.json; '-' = standard output)")
    p.add_argument("--quiet", "-q", action="store_true", help="print nothing but errors")
    return p


def _slices(study: Any, opt: Any, bounds: dict[str, tuple[float, float]],
            points: int = 41) -> list[dict[str, Any]]:
    """Worst margin and limit ratios along each quantity, the others at the optimum."""
    import numpy as np

    from shaftsys.study.sweep import _names, evaluate_values, limit_values

    bearings, elements, gears = _names(study.model)
    q0 = np.array([opt.values[p] for p in bounds])
    out = []
    for j, (path, (lo, hi)) in enumerate(bounds.items()):
        xs = np.linspace(lo, hi, points)
        pts = np.repeat(q0[None, :], points, axis=0)
        pts[:, j] = xs
        a, _ = evaluate_values(study, pts)
        valid = a.reason == ""
        m = np.where(np.isfinite(a.margin), a.margin, np.nan)
        with np.errstate(all="ignore"):
            worst = np.where(valid, np.fmin.reduce(np.nan_to_num(m, nan=np.inf), axis=1),
                             np.nan)
        ratios = {li.label: np.where(valid, limit_values(li, bearings, elements, gears, a)
                                     / li.max_value, np.nan) for li in study.limits}
        out.append({"path": path, "x": xs, "worst": worst, "ratios": ratios,
                    "at": opt.values[path]})
    return out


def _draw(slices: list[dict[str, Any]], opt: Any, min_margin: float) -> Any:
    def draw(fig: Any) -> None:
        import numpy as np

        axes = fig.subplots(len(slices), 1, squeeze=False)[:, 0]
        for ax, sl in zip(axes, slices, strict=True):
            ax.plot(sl["x"], sl["worst"], color="#1b4965", lw=1.6,
                    label="worst life margin C/C_req")
            ax.axhline(min_margin, color="#5b6b7a", ls="--", lw=0.8,
                       label=f"required margin {min_margin:g}")
            for k, (label, r) in enumerate(sl["ratios"].items()):
                bad = r > 1.0
                if np.any(bad):
                    ax.fill_between(sl["x"], 0, 1, where=bad, step="mid", alpha=0.15,
                                    color=("#c1121f", "#e07a1f", "#a23b72")[k % 3],
                                    transform=ax.get_xaxis_transform(),
                                    label=f"{label} violated")
            ax.axvline(sl["at"], color="#3a7d44", lw=1.2,
                       label=f"optimum {sl['at']:.6g}")
            ax.plot([sl["at"]], [opt.worst_margin], "o", color="#3a7d44")
            ax.set_xlabel(f"{sl['path']} [mm] (others at the optimum)")
            ax.set_ylabel("C/C_req [-]")
            ax.grid(True, lw=0.3, alpha=0.5)
            ax.legend(fontsize=7, loc="best")
        axes[0].set_title("Objective through the optimum; shaded: a constraint violated",
                          fontsize=9)
    return draw


def _stations(model: Any, study: Any, values: dict[str, float]) -> dict[str, float]:
    """Id -> new station [mm] of every bearing and element the quantities move."""
    from shaftsys.study.paths import model_with

    moved, reason = model_with(model, study.quantities, [values[q.path]
                                                         for q in study.quantities])
    if reason:
        raise NumericalError(f"the optimum is not a possible layout: {reason}")
    out: dict[str, float] = {}
    for old, new in zip(model.shafts, moved.shafts, strict=True):
        for b0, b1 in zip(old.bearings, new.bearings, strict=True):
            if b1.x_mm != b0.x_mm:
                out[b1.id] = b1.x_mm
        for e0, e1 in zip(old.elements, new.elements, strict=True):
            if e1.x_mm != e0.x_mm:
                out[e1.id] = e1.x_mm
    return out


def run_optimise(args: argparse.Namespace) -> int:
    """Run the ``optimise`` command; returns the exit code."""
    from shaftsys import analyse
    from shaftsys.io.filled_model import write_moved_model
    from shaftsys.io.loader import load_model
    from shaftsys.io.model_duty import load_model_with_duty
    from shaftsys.io.output import json_ready, write_figure, write_json
    from shaftsys.io.recording import analyse_recorded
    from shaftsys.study.optimise import optimise
    from shaftsys.study.section import optimise_from_section, read_study_section
    from shaftsys.study.sweep import make_study

    logging.getLogger("shaftsys.bearings").setLevel(logging.ERROR)
    model, _ = load_model_with_duty(args.model, analyse_model=False)
    section, name = read_study_section(args.model)
    spec = optimise_from_section(model, section, name)
    try:
        opt = optimise(model, spec.bounds, limits=spec.limits, grid=spec.grid,
                       maxiter=spec.maxiter)
    except ModelError as exc:
        if exc.file is not None:
            raise
        raise ModelError(exc.message, file=name, line=getattr(section.get("optimise"),
                                                              "line", None),
                         field=exc.field or "study.optimise", expected=exc.expected) from None
    out_dir = Path(args.out) if args.out else Path(args.model).with_name(
        Path(args.model).stem + "_optimum")
    study = make_study(model, [(p, f"{lo}:{hi}:2") for p, (lo, hi) in spec.bounds.items()],
                       limits=spec.limits)
    stations = _stations(model, study, opt.values)
    model_out = out_dir / "optimum.yaml"
    note = ("Stations from 'shaftsys optimise': worst life margin "
            f"{opt.worst_margin:.6g} (bearing {opt.worst_support}); active: "
            + ("; ".join(opt.active) or "none"))
    out_dir.mkdir(parents=True, exist_ok=True)
    write_moved_model(args.model, stations, model_out, note=note)
    moved = load_model(str(model_out))
    # the recorded cases of the optimum come from the same recording as the input's
    result = (analyse(moved) if model.recording is None else
              analyse_recorded(moved, model.recording))
    limit_ok = all(v <= 1.0 + TOLERANCE for v in opt.limit_values.values())
    margin_ok = opt.worst_margin >= spec.min_life_margin * (1.0 - TOLERANCE)
    data = {**opt.to_dict(), "bounds": {p: list(b) for p, b in spec.bounds.items()},
            "min_life_margin": spec.min_life_margin, "constraints_met": limit_ok and margin_ok,
            "stations_mm": stations, "model_file": str(model_out),
            "checks_ok": bool(result.ok), "verdict": result.verdict}
    json_path = args.json or str(out_dir / "optimum.json")
    if json_path == "-":
        import json

        sys.stdout.write(json.dumps(json_ready(data), indent=2, allow_nan=False) + "\n")
    else:
        write_json(Path(json_path), data)
    plot = out_dir / "objective.png"
    write_figure(plot, _draw(_slices(study, opt, spec.bounds), opt, spec.min_life_margin),
                 (7.5, 3.2 * len(spec.bounds)))
    out = sys.stderr if json_path == "-" else sys.stdout
    if not args.quiet:
        print(f"optimum of {args.model} ({opt.evaluations} evaluations, start "
              + ", ".join(f"{p} = {v:.6g}" for p, v in opt.start.items()) + "):", file=out)
        for p, v in opt.values.items():
            lo, hi = spec.bounds[p]
            print(f"  {p} = {v:.6g} mm   (bounds {lo:g} .. {hi:g} mm)", file=out)
        print(f"  worst life margin C/C_req = {opt.worst_margin:.4g} (bearing "
              f"{opt.worst_support}; required {spec.min_life_margin:g})", file=out)
        for b, m in opt.margins.items():
            print(f"  bearing {b}: margin {m:.4g}, Lnm {opt.lives_h[b]:.4g} h", file=out)
        for label, r in opt.limit_values.items():
            print(f"  limit {label}: value/limit = {r:.4g}", file=out)
        print("active constraints: " + ("; ".join(opt.active) or "none"), file=out)
        print("sensitivities d(ln Lnm_h)/dq [1/mm]:", file=out)
        for b, row in opt.sensitivity.items():
            print(f"  {b}: " + ", ".join(f"{p} {v:+.4g}" for p, v in row.items()), file=out)
        print(f"wrote {model_out}, {json_path if json_path != '-' else 'JSON'}, {plot}",
              file=out)
        print("check of the optimum model: " + result.verdict, file=out)
    if not opt.success:
        raise NumericalError(f"the optimiser did not converge: {opt.message} (files "
                             f"written to {out_dir} hold its last point)")
    if not (limit_ok and margin_ok and result.ok):
        return EXIT_TARGET_MISSED
    return EXIT_OK
