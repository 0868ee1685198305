"""Geometry cross-checks of a model read from a file (rules in
:mod:`shaftsys.machine.seats`): every bearing's bore fits the step at its seat, its
width stays on that seat without overlapping a shoulder, and no two widths of bearings
and hub elements overlap. A failure is a :class:`~shaftsys.errors.ModelError` naming
file, line, field and the values as read.
"""

from __future__ import annotations

import itertools

import numpy as np

from shaftsys.errors import ModelError
from shaftsys.machine.seats import (
    BORE_TOLERANCE_MM,
    HUB_KINDS,
    OVERLAP_TOLERANCE_MM,
    seat_fit,
    widths_overlap,
)
from shaftsys.model import Bearing, Model, Shaft


def check_seats(model: Model, file: str | None) -> None:
    """Refuse the first seat or overlap problem of ``model`` (see module docstring)."""
    open_ids = {s.bearing_id for s in model.open_seats}
    for shaft in model.shafts:
        edges = np.asarray([shaft.step_edges_mm])
        d = np.asarray([[s.d_mm for s in shaft.steps]])
        for b in shaft.bearings:
            _check_bearing(shaft, b, edges, d, file, b.id in open_ids)
        _check_overlaps(shaft, file)


def _check_bearing(shaft: Shaft, b: Bearing, edges: np.ndarray, d: np.ndarray,
                   file: str | None, is_open: bool) -> None:
    half = 0.5 * (b.B_mm or 0.0)
    bad, diameter = seat_fit(edges, d, np.array([b.x_mm]), half, b.d_mm, b.on_sleeve)
    if not bad[0]:
        return
    where = f"shafts[{shaft.id}].bearings[{b.id}]"
    found = float(diameter[0])
    key = "choose.bore" if is_open else "d"
    if b.on_sleeve:
        raise ModelError(f"bearing on a sleeve: its bore {b.d_mm:g} mm is not larger than "
                         f"the {found:g} mm step under it", file=file, line=b.line,
                         field=f"{where}.{key}", expected="a bore larger than the shaft "
                         "under the sleeve, or 'mounting: shaft'")
    span = (f"its width {b.B_mm:g} mm ({b.x_mm - half:g} to {b.x_mm + half:g} mm)"
            if b.B_mm else f"its station {b.x_mm:g} mm")
    if b.B_mm and _seat_under_mid(shaft, b):
        what = ("overlaps a shoulder" if found > b.d_mm else
                "runs off its seat onto a smaller step")
        raise ModelError(f"bearing '{b.id}' {what}: {span} reaches a {found:g} mm step "
                         f"while its bore is {b.d_mm:g} mm", file=file, line=b.line,
                         field=f"{where}.{'at' if is_open else 'B'}",
                         expected="a station whose seat step holds the whole width "
                         "(move 'at', shorten the width, or lengthen the seat step)")
    raise ModelError(f"bearing bore {b.d_mm:g} mm does not fit the shaft: the step at "
                     f"{span} is {found:g} mm", file=file, line=b.line,
                     field=f"{where}.{key}",
                     expected=f"a bore equal to the seat diameter within "
                     f"{BORE_TOLERANCE_MM:g} mm, 'mounting: sleeve' for a sleeve or "
                     "adapter, or an 'at' on the step of that diameter")


def _seat_under_mid(shaft: Shaft, b: Bearing) -> bool:
    """The step at the bearing's mid-width fits its bore (the width is what fails)."""
    bad, _ = seat_fit(np.asarray([shaft.step_edges_mm]),
                      np.asarray([[s.d_mm for s in shaft.steps]]), np.array([b.x_mm]),
                      0.0, b.d_mm, b.on_sleeve)
    return not bool(bad[0])


def _check_overlaps(shaft: Shaft, file: str | None) -> None:
    items: list[tuple[str, str, float, float, int | None]] = []
    for b in shaft.bearings:
        if b.B_mm:
            items.append(("bearing", b.id, b.x_mm, b.B_mm, b.line))
    for e in shaft.elements:
        if e.width_mm and e.kind in HUB_KINDS:
            items.append(("element", e.id, e.x_mm, e.width_mm, e.line))
    for first, second in itertools.combinations(items, 2):
        ka, ida, xa, wa, _ = first
        kc, idc, xc, wc, line = second
        if not widths_overlap(np.array([xa]), wa, np.array([xc]), wc)[0]:
            continue
        group = "bearings" if kc == "bearing" else "elements"
        key = "B" if kc == "bearing" else "width"
        overlap = 0.5 * (wa + wc) - abs(xa - xc)
        raise ModelError(f"{kc} '{idc}' ({xc - 0.5 * wc:g} to {xc + 0.5 * wc:g} mm) "
                         f"overlaps {ka} '{ida}' ({xa - 0.5 * wa:g} to {xa + 0.5 * wa:g} "
                         f"mm) by {overlap:.3g} mm", file=file, line=line,
                         field=f"shafts[{shaft.id}].{group}[{idc}].{key}",
                         expected=f"widths that touch at most (overlap below "
                         f"{OVERLAP_TOLERANCE_MM:g} mm): move 'at' or change the width")


__all__ = ["check_seats"]
