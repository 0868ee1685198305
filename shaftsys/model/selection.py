"""Open supports: bearings the designer leaves for shaftsys to choose from a catalogue.

A model may leave any bearing open: instead of ratings it names the user's catalogue
(read into a :class:`~shaftsys.model.catalogue.Catalogue` by the loader) and what the
bearing may be (types, seat bore, envelope). Units: mm.
"""

from __future__ import annotations

from dataclasses import dataclass
from enum import StrEnum

from shaftsys.model.bearing import BearingKind
from shaftsys.model.catalogue import Catalogue


class Objective(StrEnum):
    """How the candidates that qualify are ranked (ties broken by the next key).

    ``smallest``: outside diameter D, then width B, then mass, then price.
    ``lightest``: mass, then D, then B. ``cheapest``: price, then D, then B.
    ``largest_margin``: largest life margin C/C_req, then D, then B.
    """

    SMALLEST = "smallest"
    LIGHTEST = "lightest"
    CHEAPEST = "cheapest"
    LARGEST_MARGIN = "largest_margin"


@dataclass(frozen=True, eq=False)
class OpenSeat:
    """One support whose bearing is to be chosen.

    Attributes
    ----------
    bearing_id: id of the (placeholder) bearing in its shaft's ``bearings``; its
        station, axial role, pair, targets, s0_min and stiffness are the designer's.
    shaft_id: the shaft that holds it.
    catalogue: the rows it may be chosen from (already read and checked).
    kinds: allowed bearing types (empty: every type of the catalogue).
    bore_mm: seat diameter [mm] (the step diameter at the bearing unless given).
    max_D_mm, max_B_mm: envelope limits [mm] (``None``: no limit).
    housing_bores_mm: allowed outside diameters [mm] (empty: any).
    bore_tolerance_mm: |d - bore_mm| accepted as a fit [mm].
    line: line of the bearing in the model file (for messages).
    """

    bearing_id: str
    shaft_id: str
    catalogue: Catalogue
    kinds: tuple[BearingKind, ...] = ()
    bore_mm: float = 0.0
    max_D_mm: float | None = None
    max_B_mm: float | None = None
    housing_bores_mm: tuple[float, ...] = ()
    bore_tolerance_mm: float = 0.01
    line: int | None = None


@dataclass(frozen=True)
class SelectionSettings:
    """Model-wide options of the choice.

    objective: ranking of the qualifying candidates.
    max_passes: most solve-choose passes (the chosen bearings change the reactions
        through their pressure centres and induced thrust); a choice that still changes
        after this many passes is reported as not settled.
    runners_up: how many qualifying candidates after the chosen one are reported.
    """

    objective: Objective = Objective.SMALLEST
    max_passes: int = 8
    runners_up: int = 5
