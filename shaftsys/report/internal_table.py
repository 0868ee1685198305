"""Plain-text table of the rolling-element loads inside the bearings (renders only)."""

from __future__ import annotations

from shaftsys.analysis.results import Result
from shaftsys.report.tables import format_table, sig

#: column headers of the table (terminal and report)
HEADERS = ("bearing", "case", "dr mm", "dx mm", "tilt mrad", "eps", "Qmax N", "pmax MPa",
           "Lref/L10")
TITLE = ("Inside the bearings (rolling-element loads; reference life by the ISO/TS 16281 "
         "approach against the ISO 281 L10)")


def internal_rows(result: Result) -> list[list[str]]:
    """Per bearing with an interior and case: ring displacement, tilt, load zone, largest
    element load, contact pressure, reference life and its ratio to the ISO 281 life.
    """
    rows = []
    for b in result.bearings:
        data = (result.internal or {}).get(b.bearing.id)
        if data is None:
            continue
        for c in data["cases"]:
            dy, dz, dx = c["ring_displacement_mm"]
            ty, tz = c["ring_tilt_rad"]
            eps = c["load_zone_factor"]
            rows.append([f"{b.shaft_id}/{b.bearing.id}", c["case"],
                         sig((dy**2 + dz**2) ** 0.5), sig(dx),
                         sig(1e3 * (ty**2 + tz**2) ** 0.5), "thrust" if eps is None
                         else sig(eps), sig(c["max_element_load_N"], 4),
                         sig(c["max_contact_pressure_MPa"], 4), sig(c["life_ratio"])])
    return rows


def life_lines(result: Result) -> list[str]:
    """Per bearing with a life from its element loads: that life beside ISO 281's, the
    ratio, and which one the verdict uses.
    """
    lives = []
    for b in result.bearings:
        data = (result.internal or {}).get(b.bearing.id)
        if data is None or "modified_reference_life_h" not in data:
            continue
        basis = ("the verdict uses it" if data["verdict_basis"] == "element_loads"
                 else "the verdict uses ISO 281")
        lives.append(f"{b.shaft_id}/{b.bearing.id}: life from the element loads "
                     f"(a1 aISO Lref) {_hours(data['modified_reference_life_h'])} beside "
                     f"ISO 281 {_hours(data['iso281_life_h'])}, ratio "
                     f"{sig(data['modified_life_ratio'])}; {basis}")
    return lives


def internal_table(result: Result) -> str:
    """The plain-text table of :func:`internal_rows` with its title and the lives from
    the element loads (:func:`life_lines`).
    """
    return "\n".join([TITLE, format_table(list(HEADERS), internal_rows(result), "llrrrrrrr"),
                      *life_lines(result)])


def _hours(value: float | None) -> str:
    return "unbounded" if value is None or value == float("inf") else f"{sig(value)} h"


def nonlinear_solve_lines(result: Result) -> str:
    """One line per shaft solved with nonlinear bearing stiffness: its bearings, how
    the thrust was shared, and the Newton iterations and residual of every case.
    """
    lines = []
    for s in result.shafts:
        info = s.nonlinear
        if info is None:
            continue
        per_case = ", ".join(f"{c.case} {int(info.iterations[k])} it {info.residual[k]:.1e}"
                             for k, c in enumerate(s.cases))
        axial = ("thrust by displacement compatibility" if info.axial == "compatibility"
                 else "thrust by the axial rule")
        lines.append(f"Nonlinear bearing stiffness, shaft '{s.shaft.id}' (bearings "
                     f"{', '.join(info.bearings)}; {axial}): {per_case}")
    if lines:
        lines.append("(rigid rings and housing, aligned outer rings; an estimate that does not "
                     "replace the bearing maker's calculation)")
    return "\n".join(lines)
