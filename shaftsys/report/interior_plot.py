"""Polar figure of the rolling-element loads of one bearing (renders only).

Reads the ``internal`` object of a bearing (:func:`shaftsys.analysis.interior.
bearing_internal`): element angles from +y toward +z (shaft frame; 0 deg drawn at the
top, angles counter-clockwise, as seen looking along -x) and, per case, the load of every
rolling element of every row [N]. The highlighted case is the one with the largest
element load unless a case is named; the other cases are drawn as thin outlines.
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import TYPE_CHECKING, Any

import numpy as np

if TYPE_CHECKING:
    from matplotlib.figure import Figure

#: colours of the report's palette for the highlighted rows (row 1, row 2)
_ROW_COLOURS = ("#c2571a", "#2a6f97")
_OTHER = "#8a97a6"


def worst_case(internal: Mapping[str, Any]) -> str:
    """The case with the largest rolling-element load."""
    return str(max(internal["cases"], key=lambda c: c["max_element_load_N"])["case"])


def element_load_polar(bearing_id: str, internal: Mapping[str, Any],
                       case: str | None = None) -> Figure:
    """A stand-alone Figure (Agg canvas): element loads of ``case`` (default the worst) as
    bars at the element angles, one colour per row, the other cases as outlines.

    Raises ``KeyError`` for a case the bearing does not have.
    """
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    chosen = case or worst_case(internal)
    by_case = {c["case"]: c for c in internal["cases"]}
    if chosen not in by_case:
        raise KeyError(chosen)
    rows = int(internal["rows"])
    angles = np.radians(np.asarray(internal["element_angles_deg"], dtype=float))
    z = angles.size // rows
    fig = Figure(figsize=(5.2, 5.0), layout="constrained")
    FigureCanvasAgg(fig)
    ax: Any = fig.add_subplot(projection="polar")
    ax.set_theta_zero_location("N")
    ax.set_theta_direction(1)
    width = 2.0 * np.pi / max(z, 1) * (0.8 / rows)
    for cid, c in by_case.items():
        if cid == chosen:
            continue
        q = np.asarray(c["element_loads_N"], dtype=float)
        for r in range(rows):
            a = np.append(angles[r * z:(r + 1) * z], angles[r * z])
            v = np.append(q[r * z:(r + 1) * z], q[r * z])
            ax.plot(a, v, color=_OTHER, linewidth=0.6, alpha=0.7)
    q = np.asarray(by_case[chosen]["element_loads_N"], dtype=float)
    for r in range(rows):
        offset = (r - (rows - 1) / 2.0) * width
        ax.bar(angles[r * z:(r + 1) * z] + offset, q[r * z:(r + 1) * z], width=width,
               color=_ROW_COLOURS[r % len(_ROW_COLOURS)], alpha=0.85,
               label=f"row {r + 1}" if rows > 1 else "elements")
    eps = by_case[chosen].get("load_zone_factor")
    qmax = by_case[chosen]["max_element_load_N"]
    ax.set_title(f"{bearing_id}: element loads [N], case {chosen}\n"
                 f"Qmax {qmax:.4g} N" + ("" if eps is None else f", load zone eps {eps:.3g}")
                 + " (0 deg = +y, toward +z)", fontsize=9)
    if rows > 1:
        ax.legend(loc="lower left", fontsize="small", bbox_to_anchor=(-0.1, -0.1))
    return fig


__all__ = ["element_load_polar", "worst_case"]
