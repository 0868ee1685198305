"""The cases generated from a recording as a model-file fragment (YAML text), and the
reduction summary as JSON-ready values.

The fragment is a ``cases:`` list in the model file's format (quantity strings with
units), to paste over the model's duty cases; the model's peak and static cases stay.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from pathlib import Path
from typing import Any

from shaftsys.analysis.duty import DutyReduction, LoadTarget, case_loads
from shaftsys.model import Case


def _q(value: float, unit: str) -> str:
    """Quantity text that reads back to the same float."""
    return f"{float(value)!r} {unit}"


def _case_lines(c_id: str, kind: str, share: float, T_Nmm: float, n_rpm: float,
                template: Case, note: str, temperature_C: float = math.nan,
                targets: Sequence[LoadTarget] = (), loads_N: Sequence[float] = ()
                ) -> list[str]:
    (_, drive), = template.drives.items()
    outputs = ", ".join(f"{k}: {v:.10g}" for k, v in drive.outputs)
    lines = [f"  - id: {c_id}                 # {note}"]
    if kind != "duty":
        lines.append(f"    kind: {kind}")
    else:
        lines.append(f"    share: {share!r}")
    lines += [f"    speed: {_q(n_rpm, 'rpm')}",
              f"    input: {{element: {drive.input_element}, torque: {_q(T_Nmm / 1000.0, 'N*m')}}}",
              f"    outputs: {{{outputs}}}"]
    temp = temperature_C if math.isfinite(temperature_C) else template.temperature_C
    if not math.isnan(temp):
        lines.append(f"    temperature: {float(temp)!r} degC")
    loads = case_loads(template, targets, loads_N)
    if loads:
        lines.append("    loads:")
        for ld in loads:
            f = ", ".join(_q(v, "N") for v in ld.force_N)
            m = ", ".join(_q(v, "N*mm") for v in ld.moment_Nmm)
            lines.append(f"      {ld.element}: {{force: [{f}], moment: [{m}]}}")
    return lines


def cases_fragment_text(red: DutyReduction, series: str, template: Case,
                        targets: Sequence[LoadTarget] = ()) -> str:
    """The generated cases as a ``cases:`` YAML fragment with a header comment
    (``targets``: the process-load components the load channels set).
    """
    out = [f"# Operating cases reduced from the recording {Path(series).name}",
           f"# ({red.samples} samples, {red.time_s / 3600.0:.6g} h, {red.revs:.6g} "
           f"revolutions of the input shaft; template case '{red.template}').",
           "# Paste over the model's duty cases (keep its peak and static cases).",
           "# Each running case: torque = revolution-weighted p-th power mean of its bin,",
           "# speed = revolutions / time, share = time share; standstill counts for time.",
           "cases:"]
    for c in red.cases:
        if c.kind == "peak":
            note = "largest |torque| of the series above the peak threshold"
        elif c.region == "standstill":
            note = f"standstill, {c.time_s / 3600.0:.4g} h"
        else:
            note = (f"{c.region}, |T| {c.T_lo_Nmm / 1000:.4g}..{c.T_hi_Nmm / 1000:.4g} N*m, "
                    f"{c.time_s / 3600.0:.4g} h, {c.revs:.4g} rev")
        out += _case_lines(c.id, c.kind, c.share, c.torque_Nmm, c.speed_rpm, template, note,
                           c.temperature_C, targets, c.loads_N)
    return "\n".join(out) + "\n"


def reduction_dict(red: DutyReduction, series: str | None = None) -> dict[str, Any]:
    """JSON-ready summary of the reduction (units in the keys; ``series``: the file name
    to show, default the reduction's own).
    """
    return {
        "series": red.series if series is None else series,
        "samples": red.samples,
        "duration_h": red.time_s / 3600.0,
        "revolutions": red.revs,
        "template_case": red.template,
        "affine_mismatch": red.affine_mismatch,
        "interpolation_error": red.interpolation_error,
        "cases": [{"id": c.id, "kind": c.kind, "region": c.region,
                   "torque_Nmm": c.torque_Nmm, "speed_rpm": c.speed_rpm,
                   "time_h": c.time_s / 3600.0, "revolutions": c.revs, "share": c.share,
                   "samples": c.samples, "T_lo_Nmm": c.T_lo_Nmm, "T_hi_Nmm": c.T_hi_Nmm,
                   "temperature_C": c.temperature_C, "loads_N": list(c.loads_N)}
                  for c in red.cases],
        "reduction_error": [{"shaft": e.shaft, "bearing": e.bearing, "p": e.exponent,
                             "P_cases_N": e.P_cases_N, "P_direct_N": e.P_direct_N,
                             "P_error_pct": e.P_error_pct, "L10_cases_h": e.L10_cases_h,
                             "L10_direct_h": e.L10_direct_h,
                             "L10_error_pct": e.L10_error_pct} for e in red.errors],
        "warnings": list(red.warnings),
    }


__all__ = ["cases_fragment_text", "reduction_dict"]
