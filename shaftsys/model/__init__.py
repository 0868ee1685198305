"""Frozen, typed input values of a machine model (no I/O, no numerics)."""

from shaftsys.model.bearing import (
    AxialRole,
    Bearing,
    BearingKind,
    LifeSettings,
    Lubrication,
    SetArrangement,
)
from shaftsys.model.case import Case, CaseKind, Drive, ElementLoad
from shaftsys.model.checks import BearingCheckOverride, CheckSettings, GearCheckOverride
from shaftsys.model.elements import (
    BevelGear,
    Coupling,
    Element,
    ElementBase,
    Gear,
    LumpedMass,
    ProcessLoad,
    Pulley,
    Sprocket,
    Unbalance,
)
from shaftsys.model.machine import Link, Model, SolverSettings
from shaftsys.model.shaft import Material, Shaft, Step

__all__ = [
    "AxialRole",
    "Bearing",
    "BearingCheckOverride",
    "BearingKind",
    "BevelGear",
    "Case",
    "CaseKind",
    "CheckSettings",
    "Coupling",
    "Drive",
    "Element",
    "ElementBase",
    "ElementLoad",
    "Gear",
    "GearCheckOverride",
    "LifeSettings",
    "Link",
    "Lubrication",
    "LumpedMass",
    "Material",
    "Model",
    "ProcessLoad",
    "Pulley",
    "SetArrangement",
    "Shaft",
    "SolverSettings",
    "Sprocket",
    "Step",
    "Unbalance",
]
