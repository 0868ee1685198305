"""Plain-text tables for the terminal (no colour codes; the CLI decides)."""

from __future__ import annotations

import math
from collections.abc import Sequence

from shaftsys.analysis import Result
from shaftsys.life_check import worst_case


def format_table(headers: Sequence[str], rows: Sequence[Sequence[str]],
                 align: str | None = None) -> str:
    """Columns padded to width; ``align`` is one letter per column, ``l`` or ``r``."""
    align = align or "l" + "r" * (len(headers) - 1)
    widths = [max(len(h), *(len(r[i]) for r in rows)) if rows else len(h)
              for i, h in enumerate(headers)]

    def fmt(cells: Sequence[str]) -> str:
        return "  ".join(c.ljust(w) if a == "l" else c.rjust(w)
                         for c, w, a in zip(cells, widths, align, strict=True)).rstrip()

    rule = "  ".join("-" * w for w in widths)
    return "\n".join([fmt(headers), rule, *(fmt(r) for r in rows)])


def _num(value: float | None, digits: int = 0) -> str:
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return "-"
    if math.isinf(value):
        return "inf"
    if digits == 0 and abs(value) < 0.5:
        return "0"
    if digits == 0:
        return f"{value:,.0f}".replace(",", " ")
    return f"{value:.{digits}f}"


def loads_table(result: Result) -> str:
    """Reaction components and resultant radial/axial load of every bearing and case."""
    headers = ["bearing", "case", "n rpm", "Fy N", "Fz N", "Fx N", "Fr N", "Fa N"]
    rows = []
    for b in result.bearings:
        for ld in b.loads:
            rows.append([f"{b.shaft_id}/{b.bearing.id}", ld.case, _num(ld.speed_rpm),
                         _num(ld.Fy_N), _num(ld.Fz_N), _num(ld.Fx_N), _num(ld.Fr_N),
                         _num(ld.Fa_N)])
    title = "Bearing loads (force of the shaft on each bearing, shaft frame)"
    return title + "\n" + format_table(headers, rows, "llrrrrrr")


def verdict_table(result: Result) -> str:
    """One line per support: worst case, Pm, L10, Lnm, required C, margin, s0, verdict."""
    headers = ["bearing", "type", "worst case", "Pm N", "L10 h", "Lnm h", "target h",
               "C N", "C req N", "margin", "s0", "verdict"]
    rows = []
    for b in result.bearings:
        life = b.life
        if life is None:
            continue
        d = life.to_dict()
        rows.append([
            f"{b.shaft_id}/{b.bearing.id}", b.bearing.kind.value.replace("_", " "),
            str(worst_case(b) or "-"), _num(d["P_eq_N"]), _num(d["L10_h"]),
            _num(d["Lnm_h"]), _num(d["target_h"]), _num(b.bearing.C_N),
            _num(d["C_required_N"]), _num(d["margin"], 2), _num(d["s0"], 1),
            "PASS" if b.ok else "FAIL",
        ])
    basis = {b.life.to_dict()["life_basis"] for b in result.bearings if b.life is not None}
    method = {b.life.to_dict()["reliability_method"] for b in result.bearings
              if b.life is not None}
    lines = ["Bearing life verdicts", format_table(headers, rows, "lllrrrrrrrrl")]
    lines.append(f"life basis: {', '.join(sorted(basis))}; reliability method: "
                 f"{', '.join(sorted(method))}")
    if result.limiting_bearing:
        lines.append(f"system life: {_num(result.system_life_h)} h, limited by "
                     f"{result.limiting_bearing}")
    failing = [b.bearing.id for b in result.bearings if not b.ok]
    lines.append("all supports pass" if not failing else
                 "FAILING: " + ", ".join(failing))
    return "\n".join(lines)
