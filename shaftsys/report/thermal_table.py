"""The heat balance as a plain-text table and as rows for the HTML report."""

from __future__ import annotations

import math

from shaftsys.analysis.results import Result
from shaftsys.report.tables import format_table

HEADERS = ["bearing", "case", "M0 N*mm", "M1 N*mm", "M N*mm", "loss W", "T degC",
           "T source", "n rpm", "n heat-bal. rpm", "verdict"]
CAUTION = ("Friction and temperature are estimates (Palmgren's model, one lumped housing "
           "temperature, Palmgren's tabulated f0, f1 unless given): they do not replace a "
           "measured temperature or the bearing supplier's data.")


def _f(value: float, digits: int) -> str:
    if not math.isfinite(value):
        return "inf" if value == math.inf else "-"
    return f"{value:.{digits}f}"


def thermal_rows(result: Result) -> list[list[str]]:
    """One row per bearing and duty case (text cells), then one total row per case."""
    th = result.thermal
    if th is None:
        return []
    rows = []
    speeds = {b.bearing.id: {ld.case: abs(ld.speed_rpm) for ld in b.loads}
              for b in result.bearings}
    for i, bid in enumerate(th.bearing_ids):
        for k, cid in enumerate(th.case_ids):
            if not th.evaluated[k]:
                continue
            n = speeds[bid].get(cid, 0.0)
            limit = th.heat_balance_speed_rpm[i, k]
            ok = th.temperature_ok[k] and (not math.isfinite(limit) or n <= limit) \
                and not th.runaway[k]
            rows.append([f"{th.shaft_ids[i]}/{bid}", cid, _f(th.M0_Nmm[i, k], 1),
                         _f(th.M1_Nmm[i, k], 1), _f(th.friction_moment_Nmm[i, k], 1),
                         _f(th.power_loss_W[i, k], 1), _f(th.used_C[k], 1), th.source[k],
                         _f(n, 0), _f(limit, 0), "ok" if ok else "FAIL"])
    for k, cid in enumerate(th.case_ids):
        if not th.evaluated[k]:
            continue
        state = ("runaway" if th.runaway[k] else
                 "ok" if th.temperature_ok[k] and th.speed_ok[k] else "FAIL")
        rows.append(["machine (+ extra loss)", cid, "", "", "", _f(th.total_power_W[k], 1),
                     _f(th.computed_C[k], 1), "computed", "", "",
                     state if state != "runaway" else "FAIL (runaway)"])
    return rows


def thermal_table(result: Result) -> str:
    """Friction moment, power loss and temperature per bearing and case, with verdicts."""
    th = result.thermal
    if th is None:
        return ""
    title = (f"Friction and operating temperature (heat balance; max {th.max_temperature_C:g} "
             f"degC, heat-balance speed at {th.reference_C:g} degC)")
    return (title + "\n" + format_table(HEADERS, thermal_rows(result), "ll" + "r" * 5 + "lrrl")
            + "\n" + CAUTION)
