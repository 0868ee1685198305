"""Shafts, steps and materials as frozen input values (units: :mod:`shaftsys.units`)."""

from __future__ import annotations

from dataclasses import dataclass
from itertools import accumulate

from shaftsys.model.bearing import Bearing
from shaftsys.model.elements import Element


@dataclass(frozen=True, slots=True)
class Material:
    """Shaft material.

    Attributes
    ----------
    name: label for reports.
    E_MPa: Young's modulus [MPa].
    G_MPa: shear modulus [MPa] (from E and Poisson's ratio when not given).
    poisson: Poisson's ratio [-].
    density_kg_m3: density [kg/m^3].
    Su_MPa, Sy_MPa: ultimate tensile and yield strength [MPa] (``None`` if unknown).
    """

    name: str
    E_MPa: float
    G_MPa: float
    poisson: float
    density_kg_m3: float
    Su_MPa: float | None = None
    Sy_MPa: float | None = None


@dataclass(frozen=True, slots=True)
class Step:
    """A cylindrical length of the shaft with one outer diameter.

    Attributes
    ----------
    length_mm: axial length [mm].
    d_mm: outer diameter [mm].
    bore_mm: bore diameter [mm] (0 = solid).
    fillet_mm: fillet radius at the step's start shoulder [mm] (for the shaft checks).
    keyway: ``None``, ``"profile"`` or ``"sled_runner"``.
    groove: a retaining-ring groove on the step.
    surface: surface finish (``"ground"``, ``"machined"``, ``"hot_rolled"``, ``"forged"``).
    line: line of the step in its model file, or ``None``.
    """

    length_mm: float
    d_mm: float
    bore_mm: float = 0.0
    fillet_mm: float | None = None
    keyway: str | None = None
    groove: bool = False
    surface: str = "machined"
    line: int | None = None


@dataclass(frozen=True, slots=True)
class Shaft:
    """One shaft: its steps from x = 0, its material, bearings and load elements.

    Placement in the housing frame (used by machine models with links): ``origin_mm`` is
    where the shaft's x = 0 lies, ``axis`` the direction of its +x, ``up`` the direction
    of its +y (made perpendicular to ``axis``; ``None`` = housing +Y, or housing +Z when
    the axis is vertical).
    """

    id: str
    steps: tuple[Step, ...]
    material: Material
    bearings: tuple[Bearing, ...]
    elements: tuple[Element, ...]
    line: int | None = None
    origin_mm: tuple[float, float, float] = (0.0, 0.0, 0.0)
    axis: tuple[float, float, float] = (1.0, 0.0, 0.0)
    up: tuple[float, float, float] | None = None

    @property
    def length_mm(self) -> float:
        """Overall length [mm]."""
        return sum(s.length_mm for s in self.steps)

    @property
    def step_edges_mm(self) -> tuple[float, ...]:
        """Stations of the step edges [mm], from 0 to the overall length."""
        return (0.0, *accumulate(s.length_mm for s in self.steps))

    def step_at(self, x_mm: float) -> Step:
        """The step that covers station ``x_mm`` [mm] (the right one at an edge)."""
        edges = self.step_edges_mm
        for step, x1 in zip(self.steps, edges[1:], strict=True):
            if x_mm < x1:
                return step
        return self.steps[-1]

    def bearing(self, bearing_id: str) -> Bearing:
        """The bearing with this id."""
        for b in self.bearings:
            if b.id == bearing_id:
                return b
        raise KeyError(bearing_id)

    def element(self, element_id: str) -> Element:
        """The element with this id."""
        for e in self.elements:
            if e.id == element_id:
                return e
        raise KeyError(element_id)
