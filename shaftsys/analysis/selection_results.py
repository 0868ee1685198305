"""Result types of the bearing choice (values; :mod:`shaftsys.analysis.selection` fills
them). Units in the names: N, mm, h, kg; price in the catalogue's currency.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

from shaftsys.model import Bearing

#: Order in which the constraints rule candidates out (names used in the JSON and text).
STAGES: tuple[str, ...] = ("fits the seat", "can be evaluated", "limiting speed",
                           "static safety", "life", "minimum load")


def _num(v: float) -> float | None:
    return float(v) if math.isfinite(v) else None


@dataclass(frozen=True)
class Candidate:
    """One catalogue row evaluated at a support over its whole spectrum.

    ``life_h``: life at the target reliability on the verdict's basis (``life_basis``:
    ``"Lnm"`` modified, ``"L10"`` a1*L10) [h]; ``margin``: C/C_req [-]; ``s0``: worst
    static safety [-]; ``speed_ratio``: largest running |n| / limiting speed (NaN = the
    catalogue gives none); ``min_load_ratio``: smallest P / minimum load over the
    running cases [-].
    """

    designation: str
    kind: str
    row: int
    catalogue_line: int
    d_mm: float
    D_mm: float
    B_mm: float
    C_N: float
    C0_N: float
    life_h: float
    life_basis: str
    margin: float
    s0: float
    speed_ratio: float
    min_load_ratio: float
    mass_kg: float
    price: float

    def to_dict(self) -> dict[str, Any]:
        """JSON-ready plain types (non-finite numbers become ``None``)."""
        out: dict[str, Any] = {
            "designation": self.designation, "type": self.kind,
            "catalogue_line": self.catalogue_line, "d_mm": self.d_mm, "D_mm": self.D_mm,
            "B_mm": _num(self.B_mm), "C_N": self.C_N, "C0_N": self.C0_N,
            "life_h": _num(self.life_h), "life_basis": self.life_basis,
            f"{self.life_basis}_h": _num(self.life_h), "margin": _num(self.margin),
            "s0": _num(self.s0), "speed_ratio": _num(self.speed_ratio),
            "min_load_ratio": _num(self.min_load_ratio), "mass_kg": _num(self.mass_kg),
            "price": _num(self.price),
        }
        return out


@dataclass(frozen=True)
class SeatChoice:
    """The outcome at one open support.

    ``chosen``: the bearing put at the support (``None`` when nothing qualifies);
    ``candidate``: its figures; ``runners_up``: the next qualifying candidates in rank
    order; ``remaining``: how many candidates were left after each stage of
    :data:`STAGES`; ``reason_if_none``: the closest miss and the constraint that ruled
    out the last candidates; ``notes``: remarks (e.g. rows without a limiting speed).
    """

    bearing_id: str
    shaft_id: str
    chosen: Bearing | None
    candidate: Candidate | None
    runners_up: tuple[Candidate, ...]
    remaining: tuple[int, ...]
    reason_if_none: str | None
    closest: Candidate | None
    notes: tuple[str, ...] = ()

    def to_dict(self) -> dict[str, Any]:
        """The JSON ``selection`` object of this support (public contract)."""
        c = self.candidate
        out: dict[str, Any] = {
            "bearing": self.bearing_id, "shaft": self.shaft_id,
            "designation": None if c is None else c.designation,
            "type": None if c is None else c.kind,
        }
        for key in ("d_mm", "D_mm", "B_mm", "C_N", "C0_N"):
            out[key] = None if c is None else _num(getattr(c, key))
        if c is not None:
            out[f"{c.life_basis}_h"] = _num(c.life_h)
        out.update({
            "life_h": None if c is None else _num(c.life_h),
            "life_basis": None if c is None else c.life_basis,
            "margin": None if c is None else _num(c.margin),
            "s0": None if c is None else _num(c.s0),
            "mass_kg": None if c is None else _num(c.mass_kg),
            "price": None if c is None else _num(c.price),
            "runners_up": [r.to_dict() for r in self.runners_up],
            "reason_if_none": self.reason_if_none,
            "closest_miss": None if self.closest is None else self.closest.to_dict(),
            "remaining_after": dict(zip(STAGES, self.remaining, strict=False)),
            "notes": list(self.notes),
        })
        return out


@dataclass(frozen=True)
class Selection:
    """The choice at every open support of a model.

    ``passes``: solve-choose passes made; ``settled``: the last pass chose what the one
    before it chose (the reactions no longer change the choice); ``cycle``: the choice
    came back to an earlier set without settling; ``total_mass_kg``, ``total_price``:
    of the chosen bearings where the catalogue gives them (``None`` otherwise).
    """

    seats: tuple[SeatChoice, ...]
    objective: str
    passes: int
    settled: bool
    cycle: bool
    total_mass_kg: float | None
    total_price: float | None
    price_unit: str

    @property
    def complete(self) -> bool:
        """Every open support got a bearing."""
        return all(s.chosen is not None for s in self.seats)

    def chosen(self) -> dict[str, Bearing]:
        """Bearing id -> the chosen bearing, for the supports that got one."""
        return {s.bearing_id: s.chosen for s in self.seats if s.chosen is not None}

    def seat(self, bearing_id: str) -> SeatChoice:
        """The outcome at one support."""
        for s in self.seats:
            if s.bearing_id == bearing_id:
                return s
        raise KeyError(bearing_id)

    def to_dict(self) -> dict[str, Any]:
        """JSON-ready summary of the choice (the per-support objects are in ``seats``)."""
        return {"objective": self.objective, "passes": self.passes,
                "settled": self.settled, "cycle": self.cycle, "complete": self.complete,
                "total_mass_kg": self.total_mass_kg, "total_price": self.total_price,
                "price_unit": self.price_unit,
                "seats": [s.to_dict() for s in self.seats]}
