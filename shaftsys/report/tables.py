"""Plain-text tables for the terminal (no colour codes; the CLI decides)."""

from __future__ import annotations

import math
from collections.abc import Sequence

from shaftsys.analysis.check_results import ShaftChecks
from shaftsys.analysis.life import worst_case
from shaftsys.analysis.results import Result
from shaftsys.analysis.selection_results import Selection


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
            rows.append([f"{b.shaft_id}/{b.bearing.id}", "-", "-", "-", "-", "-", "-", "-",
                         "-", "-", "-", "NOT EVALUATED"])
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
    failing = [b.bearing.id for b in result.bearings if b.verdict == "fail"]
    missing = [b.bearing.id for b in result.bearings if b.life is None]
    if failing:
        lines.append("FAILING: " + ", ".join(failing))
    if missing:
        lines.append("NOT EVALUATED (not a pass): " + ", ".join(missing))
    if not failing and not missing:
        lines.append("all supports pass")
    return "\n".join(lines)


def overall_verdict(result: Result) -> str:
    """The run's verdict over every required check, and what is missing or marginal."""
    verdict = result.verdict
    if verdict == "pass":
        lines = ["VERDICT: PASS (every required check was evaluated and passes)"]
    elif verdict == "fail":
        lines = ["VERDICT: FAIL (a target or limit is missed)"]
    else:
        lines = ["VERDICT: NOT EVALUATED (not a pass)"]
    lines += [f"  not evaluated: {m}" for m in result.not_evaluated]
    if result.checks is not None:
        lines += [f"  marginal: {m}" for m in result.checks.marginal]
    return "\n".join(lines)


def selection_table(selection: Selection) -> str:
    """The choice at every open support, its runners-up and, where nothing qualifies,
    the closest miss and why.
    """
    headers = ["support", "chosen", "type", "d mm", "D mm", "B mm", "C N", "C0 N",
               "life h", "margin", "s0", "mass kg", "price"]
    rows = []
    for seat in selection.seats:
        c = seat.candidate
        if c is None:
            rows.append([f"{seat.shaft_id}/{seat.bearing_id}", "NONE QUALIFIES", *["-"] * 11])
            continue
        for rank, cand in enumerate((c, *seat.runners_up)):
            rows.append([
                f"{seat.shaft_id}/{seat.bearing_id}" if rank == 0 else f"  runner-up {rank}",
                cand.designation, cand.kind.replace("_", " "), _num(cand.d_mm, 1),
                _num(cand.D_mm, 1), _num(cand.B_mm, 1), _num(cand.C_N), _num(cand.C0_N),
                _num(cand.life_h), _num(cand.margin, 2), _num(cand.s0, 1),
                _num(cand.mass_kg, 2), _num(cand.price, 2)])
    lines = [f"Bearing choice (objective: {selection.objective.replace('_', ' ')}; "
             f"life at the target reliability; margin = C / C required)",
             format_table(headers, rows, "llllrrrrrrrrr")]
    for seat in selection.seats:
        if seat.reason_if_none:
            lines.append(f"{seat.bearing_id}: {seat.reason_if_none}")
        lines.extend(f"{seat.bearing_id}: {n}" for n in seat.notes)
    state = ("settled" if selection.settled else
             "CYCLES between choices" if selection.cycle else "NOT SETTLED")
    lines.append(f"{selection.passes} solve-and-choose pass(es), {state}")
    totals = []
    if selection.total_mass_kg is not None:
        totals.append(f"mass of the chosen bearings {selection.total_mass_kg:.3g} kg")
    if selection.total_price is not None:
        totals.append(f"price {selection.total_price:.2f} {selection.price_unit}".rstrip())
    if totals:
        lines.append("; ".join(totals))
    return "\n".join(lines)


def _fmt(v: float | None, spec: str) -> str:
    if v is None:
        return "-"
    if not math.isfinite(v):
        return "inf"
    return format(v, spec)


def shaft_checks_table(sc: ShaftChecks) -> str:
    """Plain-text tables: slopes/deflections, critical speeds, fatigue sections."""
    lines = ["Slopes and deflections (worst case)",
             f"{'shaft':<10} {'what':<8} {'id':<14} {'x mm':>8} {'defl mm':>9} "
             f"{'lim mm':>7} {'slope rad':>10} {'lim rad':>9} {'case':<12} verdict"]
    for c in (*sc.bearings, *sc.gears):
        worst = max(c.cases, key=lambda k: k.slope_rad / c.slope_limit_rad + (
            k.deflection_mm / c.deflection_limit_mm if c.deflection_limit_mm else 0.0),
            default=None)
        if worst is None:
            continue
        verdict = "ok" if c.ok else "EXCEEDED"
        if c.ok and any(k.status == "marginal" for k in c.cases):
            verdict = "marginal"
        lines.append(f"{c.shaft:<10} {c.kind:<8} {c.id:<14} {c.x_mm:>8.1f} "
                     f"{worst.deflection_mm:>9.4f} {_fmt(c.deflection_limit_mm, '7.3f'):>7} "
                     f"{worst.slope_rad:>10.2e} {c.slope_limit_rad:>9.2e} {worst.case:<12} "
                     f"{verdict}")
    lines += ["", "Critical speeds (non-rotating shaft, no gyroscopic effects)",
              f"{'shaft':<10} {'bending rpm':>12} {'torsion rpm':>12} {'max rpm':>9} "
              f"{'ratio':>7} verdict"]
    for s in sc.shafts:
        ratio = s.first_critical_rpm / s.max_speed_rpm if s.max_speed_rpm > 0 else math.inf
        verdict = ("supercritical" if s.supercritical else "ok") if s.critical_speed_ok \
            else "TOO CLOSE"
        lines.append(f"{s.id:<10} {_fmt(s.first_critical_rpm, '12.0f'):>12} "
                     f"{_fmt(s.first_torsional_rpm, '12.0f'):>12} {s.max_speed_rpm:>9.0f} "
                     f"{_fmt(ratio, '7.2f'):>7} {verdict}")
    lines += ["", "Fatigue sections",
              f"{'shaft':<10} {'x mm':>8} {'feature':<20} {'d mm':>6} {'Kt':>5} {'Kf':>5} "
              f"{'Kfs':>5} {'Se MPa':>7} {'sa MPa':>7} {'sm MPa':>7} {'n_f':>6} {'n_y':>6} "
              "verdict"]
    for s in sc.shafts:
        if s.fatigue_not_evaluated is not None:
            lines.append(f"{s.id:<10} fatigue {s.fatigue_not_evaluated}: NOT EVALUATED"
                         + ("" if s.fatigue_required else " (not required)"))
        elif not s.sections:
            lines.append(f"{s.id:<10} (no fatigue sections: see notes)")
        for x in s.sections:
            lines.append(f"{s.id:<10} {x.x_mm:>8.1f} {x.feature:<20} {x.d_mm:>6.1f} "
                         f"{x.Kt:>5.2f} {x.Kf:>5.2f} {x.Kfs:>5.2f} {x.Se_MPa:>7.1f} "
                         f"{x.sigma_a_MPa:>7.1f} {x.sigma_m_MPa:>7.1f} "
                         f"{_fmt(x.n_fatigue, '6.2f'):>6} {_fmt(x.n_yield, '6.2f'):>6} "
                         f"{'ok' if x.ok else 'LOW'}")
    notes = [f"{s.id}: {n}" for s in sc.shafts for n in s.notes]
    if notes:
        lines += ["", "Notes", *notes]
    return "\n".join(lines)
