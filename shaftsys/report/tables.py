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


def sig(value: float | None, digits: int = 3) -> str:
    """``value`` to ``digits`` significant figures, as a reader takes it in.

    Below a million: rounded, thousands grouped by spaces (``48 800``, ``3.74``,
    ``0.0123``); from a million up: ``1.51e8``. ``None``/NaN give ``-``, infinity
    ``inf``. Lives and loads are printed this way: their last digits are not known
    (ratings, factors and loads carry a few per cent).
    """
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return "-"
    if math.isinf(value):
        return "inf" if value > 0 else "-inf"
    if value == 0:
        return "0"
    magnitude = math.floor(math.log10(abs(value)))
    if magnitude >= 6:
        mantissa, exponent = f"{value:.{digits - 1}e}".split("e")
        return f"{mantissa}e{int(exponent)}"
    decimals = max(digits - 1 - magnitude, 0)
    rounded = round(value, digits - 1 - magnitude)
    if decimals == 0:
        return f"{rounded:,.0f}".replace(",", " ")
    return f"{rounded:.{decimals}f}"


def sig_apart(value: float | None, limit: float | None, digits: int = 3) -> str:
    """``value`` as :func:`sig`, with more figures (up to 6) where ``digits`` would
    print a value that differs from ``limit`` as equal to it (a life just below its
    target must not read as the target).
    """
    for n in range(digits, 7):
        text = sig(value, n)
        if value == limit or text != sig(limit, n):
            return text
    return sig(value, 6)


def loads_table(result: Result) -> str:
    """Reaction components and resultant radial/axial load of every bearing and case."""
    headers = ["bearing", "case", "n rpm", "Fy N", "Fz N", "Fx N", "Fr N", "Fa N"]
    rows = []
    for b in result.bearings:
        for ld in b.loads:
            rows.append([f"{b.shaft_id}/{b.bearing.id}", ld.case, sig(ld.speed_rpm, 4),
                         sig(ld.Fy_N, 4), sig(ld.Fz_N, 4), sig(ld.Fx_N, 4), sig(ld.Fr_N, 4),
                         sig(ld.Fa_N, 4)])
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
            str(worst_case(b) or "-"), sig(d["P_eq_N"], 4),
            sig_apart(d["L10_h"], d["target_h"]), sig_apart(d["Lnm_h"], d["target_h"]),
            sig(d["target_h"]), sig(b.bearing.C_N, 4),
            sig(d["C_required_N"], 4), _num(d["margin"], 2), _num(d["s0"], 1),
            "PASS" if b.ok else "FAIL",
        ])
    basis = {b.life.to_dict()["life_basis"] for b in result.bearings if b.life is not None}
    method = {b.life.to_dict()["reliability_method"] for b in result.bearings
              if b.life is not None}
    lines = ["Bearing life verdicts", format_table(headers, rows, "lllrrrrrrrrl")]
    lines.append(f"life basis: {', '.join(sorted(basis))}; reliability method: "
                 f"{', '.join(sorted(method))}")
    operating = operating_table(result)
    if operating:
        lines += ["", operating]
    if result.limiting_bearing:
        lines.append(f"system life: {sig(result.system_life_h)} h, limited by "
                     f"{result.limiting_bearing}")
        target = result.model.life.target_life_h
        judged = [sl for _, sl in result.system_lives() if sl.verdict is not None]
        if not judged and result.system_life_h is not None and result.system_life_h < target:
            lines.append(f"  the system life (all supports surviving together) is below "
                         f"the {sig(target)} h target: information, not a criterion; each "
                         "support's verdict is its own life against its own target")
    system = system_life_table(result)
    if system:
        lines += [system]
    failing = [b.bearing.id for b in result.bearings if b.verdict == "fail"]
    missing = [b.bearing.id for b in result.bearings if b.life is None]
    if failing:
        lines.append("FAILING: " + ", ".join(failing))
    if missing:
        lines.append("NOT EVALUATED (not a pass): " + ", ".join(missing))
    if not failing and not missing:
        lines.append("all supports pass")
    return "\n".join(lines)


def operating_table(result: Result) -> str:
    """Limiting speed and minimum load of every bearing: the running case that decides,
    value, limit, ratio, mode (required or advisory) and verdict. Empty when no bearing
    has these checks.
    """
    rows = []
    for b in result.bearings:
        for c in b.operating:
            word = c.verdict.upper()
            if c.mode == "advisory" and c.reason is None:
                word += " (advisory)"
            rows.append([f"{b.shaft_id}/{b.bearing.id}", c.check.replace("_", " "),
                         c.case or "-", f"{sig(c.value, 4)} {c.unit}" if c.value is not None
                         else "-", f"{sig(c.limit, 4)} {c.unit}" if c.limit is not None
                         else "-", _num(c.ratio, 2), c.reason or c.mode, word])
    if not rows:
        return ""
    return ("Limiting speed and minimum load (running cases; speed passes at n <= limit, "
            "load at P >= 0.01 C ball, 0.02 C roller)\n"
            + format_table(["bearing", "check", "case", "value", "limit", "ratio", "mode",
                            "verdict"], rows, "lllrrrll"))


def system_life_table(result: Result) -> str:
    """The system lives that have a target: life at the stated reliability against the
    target, with the verdict. Empty when no target is set.
    """
    rows = []
    for label, sl in result.system_lives():
        if sl.verdict is None:
            continue
        rows.append([label, f"{sl.reliability:g}", sig_apart(sl.life_h, sl.target_h),
                     sig(sl.target_h), sl.limiting_bearing or "-", sl.verdict.upper()])
    if not rows:
        return ""
    return ("System life targets (bearings of a shaft / of the machine surviving together)"
            "\n" + format_table(["system", "reliability", "life h", "target h", "limiting",
                                  "verdict"], rows, "lrrrll"))


def overall_verdict(result: Result) -> str:
    """The run's verdict over every required check, and what is missing or marginal."""
    verdict = result.verdict
    if verdict == "pass":
        lines = ["VERDICT: PASS (every required check was evaluated and passes)"]
    elif verdict == "fail":
        lines = ["VERDICT: FAIL (a target or limit is missed)"]
    else:
        lines = ["VERDICT: NOT EVALUATED (not a pass)"]
    lines += [f"  failed: {m}" for m in result.failed_checks]
    lines += [f"  not evaluated: {m}" for m in result.not_evaluated]
    lines += [f"  advisory, not deciding the verdict: {m}" for m in result.advisory_failed]
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
                sig(cand.life_h), _num(cand.margin, 2), _num(cand.s0, 1),
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
    """Plain-text tables: slopes/deflections, critical speeds, fatigue sections.

    Columns are as wide as their longest entry, so long shaft and element ids keep
    every column in line.
    """
    rows: list[list[str]] = []
    for c in (*sc.bearings, *sc.gears):
        worst = max(c.cases, key=lambda k: k.slope_rad / c.slope_limit_rad + (
            k.deflection_mm / c.deflection_limit_mm if c.deflection_limit_mm else 0.0),
            default=None)
        if worst is None:
            continue
        verdict = "ok" if c.ok else "EXCEEDED"
        if c.ok and any(k.status == "marginal" for k in c.cases):
            verdict = "marginal"
        rows.append([c.shaft, c.kind, c.id, f"{c.x_mm:.1f}", f"{worst.deflection_mm:.4f}",
                     _fmt(c.deflection_limit_mm, ".3f"), f"{worst.slope_rad:.2e}",
                     f"{c.slope_limit_rad:.2e}", worst.case, verdict])
    lines = ["Slopes and deflections (worst case)",
             format_table(["shaft", "what", "id", "x mm", "defl mm", "lim mm", "slope rad",
                           "lim rad", "case", "verdict"], rows, "lllrrrrrll")]
    rows = []
    for s in sc.shafts:
        ratio = s.first_critical_rpm / s.max_speed_rpm if s.max_speed_rpm > 0 else math.inf
        verdict = ("supercritical" if s.supercritical else "ok") if s.critical_speed_ok \
            else "TOO CLOSE"
        second = (s.modes.bending_rpm[1] if s.modes is not None
                  and len(s.modes.bending_rpm) > 1 else math.inf)
        rows.append([s.id, _fmt(s.first_critical_rpm, ".0f"), _fmt(second, ".0f"),
                     _fmt(s.first_torsional_rpm, ".0f"), f"{s.max_speed_rpm:.0f}",
                     _fmt(ratio, ".2f"), verdict])
    lines += ["", "Critical speeds (non-rotating shaft, no gyroscopic effects)",
              format_table(["shaft", "bending rpm", "2nd bending rpm", "torsion rpm",
                            "max rpm", "ratio", "verdict"], rows, "lrrrrrl")]
    rows = []
    empty: list[str] = []
    for s in sc.shafts:
        if s.fatigue_not_evaluated is not None:
            empty.append(f"{s.id} fatigue {s.fatigue_not_evaluated}: NOT EVALUATED"
                         + ("" if s.fatigue_required else " (not required)"))
        elif not s.sections:
            empty.append(f"{s.id} (no fatigue sections: see notes)")
        for x in s.sections:
            rows.append([s.id, f"{x.x_mm:.1f}", x.feature, f"{x.d_mm:.1f}", f"{x.Kt:.2f}",
                         f"{x.Kf:.2f}", f"{x.Kfs:.2f}", f"{x.Se_MPa:.1f}",
                         f"{x.sigma_a_MPa:.1f}", f"{x.sigma_m_MPa:.1f}",
                         _fmt(x.n_fatigue, ".2f"), _fmt(x.n_yield, ".2f"),
                         "ok" if x.ok else "LOW"])
    lines += ["", "Fatigue sections",
              format_table(["shaft", "x mm", "feature", "d mm", "Kt", "Kf", "Kfs", "Se MPa",
                            "sa MPa", "sm MPa", "n_f", "n_y", "verdict"], rows,
                           "lrlrrrrrrrrrl"), *empty]
    notes = [f"{s.id}: {n}" for s in sc.shafts for n in s.notes]
    if notes:
        lines += ["", "Notes", *notes]
    return "\n".join(lines)
