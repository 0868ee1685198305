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


def internal_table(result: Result) -> str:
    """The plain-text table of :func:`internal_rows` with its title."""
    return TITLE + "\n" + format_table(list(HEADERS), internal_rows(result), "llrrrrrrr")
