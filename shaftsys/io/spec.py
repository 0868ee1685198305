"""The model-file format, declared once.

Each section of a model file is a table of :class:`Field` s. The loader reads and
converts a section with :func:`read_section`; :mod:`shaftsys.io.schema` turns the same
tables into the JSON Schema shipped with the package. Adding a field here adds it to
both.
"""

from __future__ import annotations

import difflib
import math
import re
from collections.abc import Iterator
from contextlib import contextmanager
from contextvars import ContextVar
from dataclasses import dataclass
from typing import Any

from shaftsys.errors import ModelError
from shaftsys.io.quantities import (
    DEFAULT_UNITS,
    MAX_MAGNITUDE,
    QuantityProblem,
    excerpt,
    to_internal,
)
from shaftsys.io.yamlsource import LocatedDict, LocatedList
from shaftsys.model.checks import (
    CHECK_MODES,
    FATIGUE_CRITERIA,
    SYSTEM_RELIABILITY_CHOICES,
    WEIBULL_SLOPE_BALL,
    WEIBULL_SLOPE_ROLLER,
)
from shaftsys.model.selection import Objective, SelectionSettings


@dataclass(frozen=True)
class Field:
    """One key of a model-file mapping.

    kind: ``quantity`` (with ``dim``), ``number``, ``int``, ``str``, ``id``, ``bool``,
    ``choice`` (with ``choices``), ``choices`` (a non-empty list of distinct values from
    ``choices``), ``quantities`` (a non-empty list of quantities of ``dim``), ``vector``
    (three quantities of ``dim``), ``list`` (of mappings ``of``), ``map`` (mapping
    ``of``), ``idmap`` (a mapping of ids, each to a mapping ``of``), ``any``.
    """

    kind: str
    doc: str
    dim: str | None = None
    required: bool = False
    default: Any = None
    choices: tuple[str, ...] = ()
    positive: bool = False
    non_negative: bool = False
    of: str | None = None  # name of a nested section in SECTIONS
    minimum: float | None = None
    maximum: float | None = None
    above: float | None = None  # exclusive minimum
    below: float | None = None  # exclusive maximum
    max_items: int | None = None  # longest list


F = Field

#: Longest text of a name or other text value [characters].
MAX_TEXT = 200
#: Plausible ranges (common practice, no source): beyond them a value is a typing
#: mistake, and the numerics would meet ratios they were not built for.
MAX_DIAMETER_MM = 10_000.0
MIN_STEP_DIAMETER_MM = 0.1
MAX_LENGTH_MM = 100_000.0
MAX_SPEED_RPM = 1_000_000.0
#: Absolute zero [degC]; case temperatures must lie above it, and within a plausible
#: range for lubricated machinery [degC] (common practice, no source).
ABSOLUTE_ZERO_C = -273.15
MIN_TEMPERATURE_C = -100.0
MAX_TEMPERATURE_C = 500.0
#: Most items of a list (steps, bearings, elements, shafts, links, cases).
MAX_STEPS = 1000
MAX_BEARINGS = 100
MAX_ELEMENTS = 1000
MAX_SHAFTS = 200
MAX_CASES = 10_000

#: Default unit of a bare number, per dimension (for the schema's descriptions).
DEFAULT_UNIT_NOTE = {
    "length": "mm", "force": "N", "moment": "N*mm", "stress": "MPa", "speed": "rpm",
    "power": "W", "time": "h", "viscosity": "mm^2/s", "temperature": "degC",
    "angle": "deg", "mass": "kg", "density": "kg/m^3", "acceleration": "m/s^2",
    "inertia": "kg*m^2", "linear_stiffness": "N/mm", "angular_stiffness": "N*mm/rad",
    "unbalance": "g*mm", "dimensionless": "-",
    "area": "m^2", "heat_transfer_coefficient": "W/(m^2*K)", "thermal_resistance": "K/W",
    "volume_flow": "l/min", "temperature_difference": "K", "specific_heat": "J/(kg*K)",
}

MATERIAL = {
    "E": F("quantity", "Young's modulus", dim="stress", required=True, positive=True),
    "G": F("quantity", "shear modulus (default E / (2 (1 + nu)))", dim="stress", positive=True),
    "nu": F("number", "Poisson's ratio", default=0.3, minimum=0.0, below=0.5),
    "density": F("quantity", "density", dim="density", default=7850.0, positive=True),
    "Su": F("quantity", "ultimate tensile strength", dim="stress", positive=True),
    "Sy": F("quantity", "yield strength", dim="stress", positive=True),
}

STEP = {
    "length": F("quantity", "axial length of the step (give length or to)", dim="length",
                positive=True, maximum=MAX_LENGTH_MM),
    "to": F("quantity", "station where the step ends (instead of length)", dim="length",
            positive=True, maximum=MAX_LENGTH_MM),
    "d": F("quantity", "outer diameter", dim="length", required=True, positive=True,
           minimum=MIN_STEP_DIAMETER_MM, maximum=MAX_DIAMETER_MM),
    "bore": F("quantity", "bore diameter", dim="length", default=0.0, non_negative=True,
              maximum=MAX_DIAMETER_MM),
    "fillet": F("quantity", "fillet radius at the shoulder where the step starts",
                dim="length", positive=True),
    "keyway": F("choice", "keyway in the step", choices=("profile", "sled_runner")),
    "groove": F("bool", "retaining-ring groove on the step", default=False),
    "surface": F("choice", "surface finish", default="machined",
                 choices=("ground", "machined", "cold_drawn", "hot_rolled", "forged")),
}

#: The bearing types a model file names (values of ``BearingKind``).
BEARING_TYPES = (
    "deep_groove_ball", "angular_contact_ball", "self_aligning_ball", "cylindrical_roller",
    "tapered_roller", "spherical_roller", "needle_roller", "thrust_ball")

BEARING = {
    "id": F("id", "bearing id, unique in the model", required=True),
    "designation": F("str", "the bearing's name in its catalogue (information only)"),
    "type": F("choice", "bearing type (required unless 'choose' is given)",
              choices=BEARING_TYPES),
    "at": F("quantity", "station of the bearing's mid-width", dim="length", required=True,
            non_negative=True),
    "d": F("quantity", "bore diameter (required unless 'choose' is given)", dim="length",
           positive=True, maximum=MAX_DIAMETER_MM),
    "D": F("quantity", "outside diameter (required unless 'choose' is given)",
           dim="length", positive=True, maximum=MAX_DIAMETER_MM),
    "B": F("quantity", "width", dim="length", positive=True),
    "C": F("quantity", "basic dynamic load rating (required unless 'choose' is given)",
           dim="force", positive=True),
    "C0": F("quantity", "basic static load rating (required unless 'choose' is given)",
            dim="force", positive=True),
    "ratings": F("choice", "C and C0 are given for the whole set or per row/bearing",
                 default="set", choices=("set", "per_row")),
    "Cu": F("quantity", "fatigue load limit (estimated from C0 when missing)", dim="force",
            positive=True),
    "limiting_speed": F("quantity", "maker's limiting speed", dim="speed", positive=True,
                         maximum=MAX_SPEED_RPM),
    "e": F("number", "maker's e factor", positive=True),
    "X": F("number", "override: radial factor X above e", non_negative=True),
    "Y": F("number", "maker's axial factor Y (single row), or override", non_negative=True),
    "Y0": F("number", "maker's static axial factor Y0", non_negative=True),
    "Y1": F("number", "axial factor for Fa/Fr <= e (pairs, double row, spherical)",
            non_negative=True),
    "Y2": F("number", "axial factor for Fa/Fr > e (pairs, double row, spherical)",
            non_negative=True),
    "contact_angle": F("quantity", "nominal contact angle", dim="angle", minimum=0.0,
                       maximum=90.0),
    "f0": F("number", "ISO 281 factor f0 of a radial ball bearing", positive=True),
    "rows": F("int", "number of rows or bearings in the set", default=1, minimum=1),
    "arrangement": F("choice", "arrangement of a set at one seat", default="single",
                     choices=("single", "back_to_back", "face_to_face", "tandem",
                              "double_row")),
    "axial": F("choice", "which shaft thrust the bearing takes: both (locating), +x, -x "
               "(takes thrust toward that direction), float", default="float",
               choices=("both", "+x", "-x", "float")),
    "pair": F("id", "id of the adjusted partner (single-row angular contact / tapered at "
              "separate seats)"),
    "pressure_centre_offset": F("quantity", "distance from mid-width to the pressure "
                                "centre on the axis", dim="length", default=0.0,
                                non_negative=True),
    "radial_stiffness": F("quantity", "radial stiffness (rigid when missing)",
                          dim="linear_stiffness", positive=True),
    "tilt_stiffness": F("quantity", "tilting stiffness (free when missing)",
                        dim="angular_stiffness", positive=True),
    "ribs": F("bool", "cylindrical roller bearing with ribs on both rings", default=False),
    "target_life": F("quantity", "target life (model default when missing)", dim="time",
                     positive=True),
    "reliability": F("quantity", "target reliability, e.g. 0.95 or '95 %'",
                     dim="dimensionless", minimum=0.0, maximum=1.0),
    "s0_min": F("number", "required static safety", positive=True),
    "ec": F("number", "contamination factor for this bearing", minimum=0.0, maximum=1.0),
    "within": F("id", "shaft that holds the outer ring (pilot bearing, idler on a pin); "
                "the housing when missing"),
    "mounting": F("choice", "shaft: the bore sits on the shaft step (bore = seat diameter "
                  "within 0.05 mm); sleeve: on a sleeve or adapter (bore larger than the "
                  "step)", default="shaft", choices=("shaft", "sleeve")),
    "choose": F("map", "leave the bearing open: shaftsys chooses it from a catalogue "
                "(instead of type, dimensions and ratings)", of="choose"),
    "interior": F("map", "internal geometry of the rolling-element set (values not given "
                  "come from the catalogue row or are estimated from d, D, B and flagged)",
                  of="interior"),
}

#: Internal geometry of a bearing (``interior:`` on a bearing).
INTERIOR = {
    "Dw": F("quantity", "rolling element diameter (a roller's mean diameter)",
            dim="length", positive=True, maximum=MAX_DIAMETER_MM),
    "Z": F("int", "rolling elements per row", minimum=3, maximum=1000),
    "pitch_diameter": F("quantity", "pitch diameter of the element set (default (d + D)/2)",
                        dim="length", positive=True, maximum=MAX_DIAMETER_MM),
    "fi": F("number", "inner groove radius / Dw (ball bearings)", above=0.5, maximum=0.6),
    "fo": F("number", "outer groove radius / Dw (ball bearings)", above=0.5, maximum=0.6),
    "Lwe": F("quantity", "effective roller length (roller bearings)", dim="length",
             positive=True, maximum=MAX_LENGTH_MM),
    "clearance": F("quantity", "radial internal clearance (total radial play of one ring "
                   "against the other), >= 0", dim="length", maximum=MAX_DIAMETER_MM),
    "preload": F("quantity", "axial preload of an adjusted pair (give it on one bearing "
                 "of the pair)", dim="force", non_negative=True),
}

CHOOSE = {
    "catalogue": F("str", "bearing catalogue file (.csv, .yaml, .yml), relative to the "
                   "model file", required=True),
    "types": F("choices", "bearing types that may be chosen (default: every type in the "
               "catalogue)", choices=BEARING_TYPES),
    "bore": F("quantity", "seat diameter (default: the shaft step diameter at 'at')",
              dim="length", positive=True),
    "max_D": F("quantity", "largest outside diameter", dim="length", positive=True),
    "max_B": F("quantity", "largest width", dim="length", positive=True),
    "housing_bores": F("quantities", "allowed outside diameters (default: any)",
                       dim="length", positive=True),
    "bore_tolerance": F("quantity", "largest |d - bore| accepted as a fit", dim="length",
                        default=0.01, non_negative=True),
}


@dataclass(frozen=True)
class Alternative:
    """A section read in one of two forms, told apart by ``key``.

    With ``key`` none of ``excludes`` may be given; without it every one of
    ``requires`` must be. The loader enforces it, the schema states it (if/then/else).
    """

    key: str
    excludes: tuple[str, ...]
    requires: tuple[str, ...]
    hint: str


#: A bearing has its type, dimensions and ratings typed in, or a ``choose`` mapping
#: (then the catalogue row gives them all).
BEARING_FORMS = Alternative(
    key="choose",
    excludes=("type", "designation", "d", "D", "B", "C", "C0", "Cu", "e", "Y", "Y0", "Y1",
              "Y2", "X", "contact_angle", "f0", "limiting_speed", "ratings",
              "pressure_centre_offset", "interior"),
    requires=("type", "d", "D", "C", "C0"),
    hint="give C and C0, or choose: {catalogue: ...}",
)

#: Sections with two forms (section name in :data:`SECTIONS` -> the forms).
ALTERNATIVES: dict[str, Alternative] = {"bearing": BEARING_FORMS}

_ELEMENT_COMMON = {
    "id": F("id", "element id, unique in the model", required=True),
    "type": F("choice", "element type", required=True, choices=(
        "gear", "bevel_gear", "pulley", "sprocket", "coupling", "load", "mass",
        "unbalance")),
    "at": F("quantity", "station of the element's centre plane", dim="length",
            required=True, non_negative=True),
    "mass": F("quantity", "mass", dim="mass", default=0.0, non_negative=True),
    "polar_inertia": F("quantity", "polar mass moment of inertia", dim="inertia",
                       default=0.0, non_negative=True),
    "diametral_inertia": F("quantity", "diametral mass moment of inertia", dim="inertia",
                           default=0.0, non_negative=True),
    "width": F("quantity", "axial width", dim="length", positive=True),
}

ELEMENT_TYPES: dict[str, dict[str, Field]] = {
    "gear": {
        "pitch_diameter": F("quantity", "working pitch diameter (or module and teeth)",
                            dim="length", positive=True, maximum=MAX_DIAMETER_MM),
        "module": F("quantity", "normal module", dim="length", positive=True),
        "teeth": F("int", "number of teeth", minimum=1),
        "pressure_angle": F("quantity", "normal pressure angle", dim="angle", default=20.0,
                            positive=True, maximum=45.0),
        "helix_angle": F("quantity", "helix angle", dim="angle", default=0.0, minimum=0.0,
                         maximum=60.0),
        "hand": F("choice", "helix hand", choices=("right", "left")),
        "mesh_angle": F("quantity", "direction toward the pitch point of the mesh (single "
                        "shafts; a linked gear takes it from the geometry)", dim="angle"),
        "internal": F("bool", "internal (ring) gear", default=False),
    },
    "bevel_gear": {
        "mean_pitch_diameter": F("quantity", "pitch diameter at mid face width",
                                 dim="length", required=True, positive=True,
                                 maximum=MAX_DIAMETER_MM),
        "pitch_cone_angle": F("quantity", "pitch cone angle", dim="angle", required=True,
                              positive=True, maximum=90.0),
        "pressure_angle": F("quantity", "pressure angle", dim="angle", default=20.0,
                            positive=True, maximum=45.0),
        "mesh_angle": F("quantity", "direction toward the pitch point (single shafts)",
                        dim="angle"),
        "apex": F("choice", "side of the cone apex", required=True, choices=("+x", "-x")),
    },
    "pulley": {
        "diameter": F("quantity", "pitch diameter", dim="length", required=True,
                      positive=True, maximum=MAX_DIAMETER_MM),
        "belt_angle": F("quantity", "direction toward the other pulley's axis (single "
                        "shafts)", dim="angle"),
        "wrap_angle": F("quantity", "wrap angle on this pulley", dim="angle", default=180.0,
                        positive=True, below=360.0),
        "pretension": F("quantity", "installation tension of each strand (single shafts; "
                        "a linked pulley takes the link's)", dim="force", positive=True),
        "friction": F("number", "friction coefficient belt/pulley", default=0.3,
                      positive=True, maximum=2.0),
        "groove_angle": F("quantity", "V-groove angle (V-belt); flat belt when missing",
                          dim="angle", minimum=20.0, maximum=90.0),
        "slack_tension": F("quantity", "slack-side tension held by a take-up (gravity "
                           "take-up: the same in every case; instead of pretension)",
                           dim="force", positive=True),
        "hubs": F("quantities", "stations of the hubs of a drum with several hubs (belt "
                  "force, weight and torque shared equally)", dim="length",
                  non_negative=True),
    },
    "sprocket": {
        "pitch_diameter": F("quantity", "pitch diameter", dim="length", required=True,
                            positive=True, maximum=MAX_DIAMETER_MM),
        "chain_angle": F("quantity", "direction toward the other sprocket's axis (single "
                         "shafts)", dim="angle"),
        "wrap_angle": F("quantity", "wrap angle", dim="angle", default=180.0, positive=True,
                        below=360.0),
    },
    "coupling": {
        "radial_force": F("quantity", "constant radial force (misalignment)", dim="force",
                          default=0.0, non_negative=True),
        "radial_angle": F("quantity", "direction of the radial force", dim="angle",
                          default=0.0),
    },
    "load": {
        "force": F("vector", "force [Fx, Fy, Fz] in every case (cases may override)",
                   dim="force"),
        "moment": F("vector", "moment [Mx, My, Mz] in every case (cases may override)",
                    dim="moment"),
    },
    "mass": {},
    "unbalance": {
        "unbalance": F("quantity", "unbalance U = m*e", dim="unbalance", required=True,
                       non_negative=True),
        "phase": F("quantity", "angle at which the rotating force is taken", dim="angle",
                   default=0.0),
    },
}

SHAFT = {
    "id": F("id", "shaft id", required=True),
    "material": F("any", "a material name from 'materials' or a material mapping",
                  required=True),
    "steps": F("list", "cylindrical steps from x = 0", required=True, of="step",
               max_items=MAX_STEPS),
    "bearings": F("list", "bearings on the shaft", required=True, of="bearing",
                  max_items=MAX_BEARINGS),
    "elements": F("list", "gears, pulleys, loads... on the shaft", default=None,
                  of="element", max_items=MAX_ELEMENTS),
    "origin": F("vector", "housing-frame position of the shaft's x = 0 (machine models)",
                dim="length"),
    "axis": F("vector", "housing-frame direction of the shaft's +x", dim="dimensionless"),
    "up": F("vector", "housing-frame direction of the shaft's +y (default: housing +Y, or "
            "+Z for a vertical shaft)", dim="dimensionless"),
}

LINK = {
    "id": F("id", "link id", required=True),
    "type": F("choice", "kind of link", required=True,
              choices=("gear_mesh", "bevel_mesh", "belt", "chain")),
    "members": F("any", "the two element ids it joins, e.g. [pinion, wheel]", required=True),
    "efficiency": F("quantity", "power efficiency, e.g. 0.98 or '98 %'", dim="dimensionless",
                    default=1.0, positive=True, maximum=1.0),
    "pretension": F("quantity", "belt installation tension per strand", dim="force",
                    positive=True),
}

DRIVE = {
    "speed": F("quantity", "signed shaft speed about +x", dim="speed", required=True,
               minimum=-MAX_SPEED_RPM, maximum=MAX_SPEED_RPM),
    "input": F("map", "where power enters", of="input"),
    "outputs": F("any", "element id -> share of the power leaving there"),
}

INPUT = {
    "element": F("id", "element through which power enters", required=True),
    "power": F("quantity", "power entering (negative: leaving, e.g. braking)", dim="power"),
    "torque": F("quantity", "torque the input element applies to the shaft about +x",
                dim="moment"),
}

CASE_LOAD = {
    "force": F("vector", "force [Fx, Fy, Fz]", dim="force"),
    "moment": F("vector", "moment [Mx, My, Mz]", dim="moment"),
}

CASE = {
    "id": F("id", "case id", required=True),
    "kind": F("choice", "duty (has a time share), peak or static (static checks only)",
              default="duty", choices=("duty", "peak", "static")),
    "share": F("quantity", "time fraction of the duty cycle", dim="dimensionless",
               non_negative=True),
    "hours": F("quantity", "hours in the duty cycle", dim="time", non_negative=True),
    "speed": F("quantity", "signed speed of the shaft (single-shaft models)", dim="speed",
               minimum=-MAX_SPEED_RPM, maximum=MAX_SPEED_RPM),
    "input": F("map", "where power enters (single-shaft models)", of="input"),
    "outputs": F("any", "element id -> share of the power leaving there"),
    "shafts": F("any", "per-shaft speed/input/outputs (several unlinked shafts)"),
    "loads": F("any", "element id -> {force, moment} of this case"),
    "temperature": F("quantity", "operating temperature", dim="temperature",
                     above=ABSOLUTE_ZERO_C, minimum=MIN_TEMPERATURE_C,
                     maximum=MAX_TEMPERATURE_C),
    "slack_tensions": F("any", "pulley id -> slack-side tension in this case (a take-up "
                        "whose tension is known per case)"),
}

LUBRICATION = {
    "viscosity_40C": F("quantity", "kinematic viscosity at 40 degC", dim="viscosity",
                       required=True, positive=True),
    "viscosity_100C": F("quantity", "kinematic viscosity at 100 degC", dim="viscosity",
                        required=True, positive=True),
    "ec": F("number", "contamination factor", minimum=0.0, maximum=1.0),
    "cleanliness": F("str", "ISO 4406 code, e.g. '-/15/12'"),
    "filtration_beta": F("number", "filter rating beta_x", positive=True),
    "method": F("choice", "lubrication method (for ec from cleanliness)",
                default="circulating_filtered", choices=(
                    "circulating_filtered", "circulating_unfiltered", "oil_bath", "grease")),
    "ep_additives": F("bool", "lubricant with effective EP additives", default=False),
}

#: Heat balance of the housing (friction and operating temperature per case).
THERMAL = {
    "ambient": F("quantity", "ambient air temperature", dim="temperature", required=True,
                 above=ABSOLUTE_ZERO_C, minimum=MIN_TEMPERATURE_C,
                 maximum=MAX_TEMPERATURE_C),
    "heat_transfer_coefficient": F("quantity", "heat-transfer coefficient of the housing "
                                   "surface to ambient (with 'area')",
                                   dim="heat_transfer_coefficient", positive=True),
    "area": F("quantity", "housing surface that sheds heat (with "
              "'heat_transfer_coefficient')", dim="area", positive=True),
    "thermal_resistance": F("quantity", "thermal resistance housing to ambient (instead "
                            "of coefficient and area)", dim="thermal_resistance",
                            positive=True),
    "oil_flow": F("quantity", "circulating oil flow (with 'oil_inlet')", dim="volume_flow",
                  positive=True),
    "oil_inlet": F("quantity", "inlet temperature of the circulating oil",
                   dim="temperature", above=ABSOLUTE_ZERO_C, minimum=MIN_TEMPERATURE_C,
                   maximum=MAX_TEMPERATURE_C),
    "oil_density": F("quantity", "density of the circulating oil", dim="density",
                     default=870.0, positive=True),
    "oil_specific_heat": F("quantity", "specific heat of the circulating oil",
                           dim="specific_heat", default=1950.0, positive=True),
    "extra_loss": F("quantity", "further heat into the housing in every duty case "
                    "(gears, seals)", dim="power", default=0.0, non_negative=True),
    "max_temperature": F("quantity", "highest admissible operating temperature (default "
                         "100 degC oil, 80 degC grease; common practice)",
                         dim="temperature", above=ABSOLUTE_ZERO_C,
                         minimum=MIN_TEMPERATURE_C, maximum=MAX_TEMPERATURE_C),
    "reference_rise": F("quantity", "temperature rise above ambient of the heat-balance "
                        "speed", dim="temperature_difference", default=50.0,
                        positive=True, maximum=400.0),
    "search_limit": F("quantity", "no steady temperature below this is thermal runaway",
                      dim="temperature", default=250.0, above=ABSOLUTE_ZERO_C,
                      minimum=MIN_TEMPERATURE_C, maximum=MAX_TEMPERATURE_C),
    "friction": F("any", "bearing id -> {f0, f1}: the supplier's friction factors"),
}

#: The supplier's friction factors of one bearing (Palmgren's model).
THERMAL_FRICTION = {
    "f0": F("number", "load-independent friction factor f0", above=0.0, maximum=50.0),
    "f1": F("number", "load-dependent friction factor f1", above=0.0, maximum=0.01),
}

LIFE = {
    "target": F("quantity", "default target life", dim="time", default=20000.0,
                positive=True),
    "reliability": F("quantity", "default target reliability", dim="dimensionless",
                     default=0.9, minimum=0.0, maximum=1.0),
    "reliability_method": F("choice", "iso281 (a1) or weibull3 (three-parameter Weibull)",
                            default="iso281", choices=("iso281", "weibull3")),
    "application_factor": F("number", "load application factor on P", default=1.0,
                            minimum=1.0),
    "min_speed": F("quantity", "cases slower than this count for static checks only",
                   dim="speed", default=10.0, non_negative=True, maximum=MAX_SPEED_RPM),
    "s0_min": F("number", "required static safety for every bearing", positive=True),
    "modified_life": F("bool", "use Lnm when lubrication data is given", default=True),
    "from_element_loads": F("bool", "the life verdict of a bearing with an interior uses "
                            "its modified reference life from the rolling-element loads "
                            "(a1 aISO times the ISO/TS 16281-style reference life) instead "
                            "of the ISO 281 life", default=False),
}

SOLVER = {
    "shear_deformation": F("bool", "Timoshenko (true) or Euler-Bernoulli (false)",
                           default=True),
    "max_element": F("quantity", "longest beam element", dim="length", default=10.0,
                     positive=True, maximum=MAX_LENGTH_MM),
    "residual_tolerance": F("number", "largest equilibrium residual", default=1e-9,
                            positive=True, maximum=1e-3),
    "shaft_weight": F("bool", "include the shaft's own weight", default=True),
    "bearing_stiffness": F("choice", "rigid: supports as typed (rigid or linear springs); "
                           "nonlinear: every bearing with an interior takes the tangent "
                           "stiffness of its rolling-element loads, iterated per case until "
                           "the reactions converge", default="rigid",
                           choices=("rigid", "nonlinear")),
    "nonlinear_tolerance": F("number", "convergence of the nonlinear bearing solve: largest "
                             "out-of-balance force at the bearings / largest load",
                             default=1e-8, positive=True, maximum=1e-2),
    "nonlinear_max_iterations": F("int", "most Newton iterations of the nonlinear bearing "
                                  "solve per case", default=60, minimum=1, maximum=10_000),
}

#: Largest slope limit a model file may set [rad] (about 29 deg: beyond it the beam
#: model's small-slope assumption is meaningless; common practice, no source).
MAX_SLOPE_LIMIT_RAD = 0.5

CHECKS = {
    "fatigue": F("choice", "fatigue and first-cycle yield of the shafts (needs Su and Sy "
                 "of every shaft material): required, or not_required (then a shaft "
                 "without Su, Sy is reported as not evaluated but does not fail the run)",
                 default="required", choices=("required", "not_required")),
    "fatigue_criterion": F("choice", "fatigue criterion on the von Mises stresses: "
                           "goodman (DE-Goodman), asme_elliptic (DE-ASME elliptic), "
                           "gerber (DE-Gerber)", default="goodman",
                           choices=FATIGUE_CRITERIA),
    "fatigue_safety": F("number", "required fatigue safety factor of every shaft section",
                        default=1.5, positive=True, maximum=100.0),
    "yield_safety": F("number", "required first-cycle yield safety factor of every shaft "
                      "section", default=1.2, positive=True, maximum=100.0),
    "bearing_slope": F("map", "allowable slope [rad] at bearings by type, replacing the "
                       "type's typical range", of="checks_bearing_slope"),
    "gear_slope": F("number", "allowable slope at every gear [rad] (default 0.0005 rad, "
                    "uncrowned spur gears)", positive=True, maximum=MAX_SLOPE_LIMIT_RAD),
    "gear_deflection": F("quantity", "allowable deflection at every gear (default: by the "
                         "module, or 'gear_deflection_per_module')", dim="length",
                         positive=True, maximum=MAX_DIAMETER_MM),
    "gear_deflection_per_module": F("number", "allowable deflection at every gear as this "
                                    "fraction of its normal module (instead of "
                                    "'gear_deflection')", positive=True, maximum=10.0),
    "speed": F("choice", "limiting-speed check of the bearings: required (a running case "
               "above a bearing's limiting speed fails the support) or advisory",
               default="required", choices=CHECK_MODES),
    "min_load": F("choice", "minimum-load check of the bearings (P >= 0.01 C ball, 0.02 C "
                  "roller in every running case): required or advisory",
                  default="required", choices=CHECK_MODES),
    "system_life": F("map", "targets and basis of the system lives (the bearings of a "
                     "shaft, of the machine, surviving together)", of="checks_system_life"),
    "bearings": F("idmap", "bearing id -> settings of that bearing's checks",
                  of="checks_bearing"),
    "gears": F("idmap", "gear id -> limits at that gear", of="checks_gear"),
    "shafts": F("idmap", "shaft id -> targets of that shaft", of="checks_shaft"),
}

#: ``checks.bearing_slope``: one allowable slope [rad] per bearing type.
CHECKS_BEARING_SLOPE = {
    t: F("number", f"allowable slope at a {t.replace('_', ' ')} bearing [rad]",
         positive=True, maximum=MAX_SLOPE_LIMIT_RAD) for t in BEARING_TYPES
}

CHECKS_BEARING = {
    "slope": F("number", "allowable slope at this bearing [rad]", positive=True,
               maximum=MAX_SLOPE_LIMIT_RAD),
    "speed": F("choice", "limiting-speed check of this bearing", choices=CHECK_MODES),
    "min_load": F("choice", "minimum-load check of this bearing", choices=CHECK_MODES),
}

CHECKS_GEAR = {
    "slope": F("number", "allowable slope at this gear [rad]", positive=True,
               maximum=MAX_SLOPE_LIMIT_RAD),
    "deflection": F("quantity", "allowable deflection at this gear", dim="length",
                    positive=True, maximum=MAX_DIAMETER_MM),
    "deflection_per_module": F("number", "allowable deflection at this gear as a fraction "
                               "of its normal module", positive=True, maximum=10.0),
}

CHECKS_SHAFT = {
    "system_life_target": F("quantity", "target of this shaft's system life", dim="time",
                            positive=True),
}

CHECKS_SYSTEM_LIFE = {
    "target": F("quantity", "target of the machine's system life (without it the system "
                "life is information only)", dim="time", positive=True),
    "shaft_target": F("quantity", "target of every shaft's system life (per shaft: "
                      "checks.shafts.<id>.system_life_target)", dim="time", positive=True),
    "reliability": F("choice", "system life stated at the target reliability "
                     "(life.reliability) or at 90 %", default="target",
                     choices=SYSTEM_RELIABILITY_CHOICES),
    "weibull_slope_ball": F("number", "Weibull slope of ball bearings in the system life",
                            default=WEIBULL_SLOPE_BALL, above=0.0, maximum=10.0),
    "weibull_slope_roller": F("number", "Weibull slope of roller bearings in the system "
                              "life", default=WEIBULL_SLOPE_ROLLER, above=0.0,
                              maximum=10.0),
}

MODEL = {
    "shaftsys": F("int", "model format version", required=True, minimum=1, maximum=1),
    "name": F("str", "title of the model", default="unnamed model"),
    "gravity": F("vector", "gravity vector in the shaft frame", dim="acceleration"),
    "materials": F("any", "named materials"),
    "lubrication": F("map", "lubricant and cleanliness (enables Lnm)", of="lubrication"),
    "life": F("map", "life targets and methods", of="life"),
    "solver": F("map", "beam solver settings", of="solver"),
    "shafts": F("list", "the shafts", required=True, of="shaft", max_items=MAX_SHAFTS),
    "links": F("list", "gear meshes, belts and chains between shafts", of="link",
               max_items=MAX_SHAFTS),
    "cases": F("list", "the operating cases", required=True, of="case",
               max_items=MAX_CASES),
    "checks": F("map", "limits and targets of the checks, and which are required (a "
                "required check that fails or cannot be evaluated fails the run)",
                of="checks"),
    "units": F("any", "default units of bare numbers: 'internal' (N, mm, N*mm, MPa, rpm, W, "
               "h, mm^2/s, degC, deg, kg...) or a mapping such as {length: mm, force: kN, "
               "power: kW}; without it every dimensional value needs its unit"),
    "study": F("map", "design study (see the sweep and optimise commands)", of="study"),
    "selection": F("map", "how open bearings ('choose') are chosen", of="selection"),
    "thermal": F("map", "heat balance of the housing: bearing friction and operating "
                 "temperature per case", of="thermal"),
    "recording": F("map", "a recorded torque/speed series reduced into the duty cases "
                   "(see the duty command)", of="recording"),
}

#: A recorded series named in the model file (``shaftsys duty``, ``check``, ``report``).
RECORDING = {
    "file": F("str", "the recording (.csv or .parquet), relative to the model file",
              required=True),
    "time": F("str", "time column (default time or t)"),
    "torque": F("str", "torque column of the input element (default torque)"),
    "power": F("str", "power column of the input element (instead of torque)"),
    "speed": F("str", "speed column of the input element (default speed or n)"),
    "temperature": F("str", "temperature column (each case gets its bin's mean)"),
    "loads": F("any", "force column -> ELEMENT.Fx|Fy|Fz of a process load it drives"),
    "template": F("id", "case giving the input element and output shares (default: the "
                  "first duty case)"),
    "bins": F("int", "torque bins per sign region", default=16, minimum=1,
              maximum=10_000),
    "edges": F("quantities", "torque bin edges on |T| (instead of bins)", dim="moment",
               non_negative=True),
    "speed_bins": F("int", "speed bins per sign region (2-D binning when > 1)", default=1,
                    minimum=1, maximum=10_000),
    "exponent": F("number", "p of the bins' power mean (default 10/3 with any roller "
                  "bearing, else 3)", minimum=1.0, maximum=20.0),
    "peak_above": F("quantity", "|torque| above which a peak case is made", dim="moment",
                    positive=True),
    "tolerance": F("number", "largest reduction error of a bearing's equivalent load [%] "
                   "before a warning", positive=True, maximum=100.0),
    "prefix": F("str", "prefix of the generated case ids", default="rec"),
}

_SELECTION_DEFAULTS = SelectionSettings()

SELECTION = {
    "objective": F("choice", "ranking of the bearings that qualify: smallest (D, B, mass, "
                   "price), lightest, cheapest, largest_margin (C/C_req)",
                   default=_SELECTION_DEFAULTS.objective.value,
                   choices=tuple(o.value for o in Objective)),
    "max_passes": F("int", "most solve-and-choose passes",
                    default=_SELECTION_DEFAULTS.max_passes, minimum=1, maximum=100),
    "runners_up": F("int", "qualifying bearings reported after the chosen one",
                    default=_SELECTION_DEFAULTS.runners_up, minimum=0, maximum=1000),
}

#: The ``study:`` section (read by :mod:`shaftsys.study.section`; bare numbers there
#: are the internal unit of the quantity, so values are ``any`` here).
STUDY_VARY = {
    "path": F("str", "quantity path (bearing.<id>.at, spacing.<a>.<b>, step.<shaft>.<i>.d, "
              "element.<id>.at, case.<id>.speed, ...)", required=True),
    "values": F("any", "'start:stop:count', a list of values (with units) or one value",
                required=True),
    "seat": F("bool", "move the bearing's seat step with it", default=False),
}

STUDY_LIMIT = {
    "kind": F("choice", "what is limited", required=True, choices=("deflection", "slope")),
    "at": F("any", "bearing or element ids, or the groups gears, bearings, elements"),
    "max": F("any", "largest allowed value: a length for deflection, rad for slope",
             required=True),
}

STUDY_BOUND = {
    "path": F("str", "station or spacing path: bearing.<id>.at, element.<id>.at, "
              "gear.<id>.at or spacing.<a>.<b>", required=True),
    "lower": F("any", "lower bound (a length, e.g. '200 mm')", required=True),
    "upper": F("any", "upper bound (a length, e.g. '260 mm')", required=True),
}

STUDY_OPTIMISE = {
    "objective": F("choice", "what is maximised: the smallest life margin C/C_req over "
                   "the bearings", default="worst_life_margin",
                   choices=("worst_life_margin",)),
    "bounds": F("list", "the quantities the optimiser moves, each within its bounds",
                of="study_bound", max_items=20),
    "limits": F("list", "deflection/slope constraints (default: the study's limits)",
                of="study_limit", max_items=1000),
    "min_life_margin": F("number", "constraint: every bearing's C/C_req at least this "
                         "(1 = its life target is met)", default=1.0, above=0.0),
    "grid": F("int", "start-grid points per quantity", default=9, minimum=2, maximum=101),
    "maxiter": F("int", "most optimiser iterations", default=200, minimum=1,
                 maximum=10_000),
}

STUDY = {
    "vary": F("list", "the swept quantities, in order", of="study_vary", max_items=20),
    "combine": F("choice", "grid (cartesian product) or zip", choices=("grid", "zip")),
    "limits": F("list", "deflection/slope limits of the study", of="study_limit",
                max_items=1000),
    "optimise": F("map", "best layout: bounds, constraints and objective of the optimise "
                  "command", of="study_optimise"),
}

SECTIONS: dict[str, dict[str, Field]] = {
    "model": MODEL,
    "material": MATERIAL,
    "step": STEP,
    "bearing": BEARING,
    "choose": CHOOSE,
    "interior": INTERIOR,
    "selection": SELECTION,
    "shaft": SHAFT,
    "case": CASE,
    "drive": DRIVE,
    "input": INPUT,
    "case_load": CASE_LOAD,
    "lubrication": LUBRICATION,
    "thermal": THERMAL,
    "thermal_friction": THERMAL_FRICTION,
    "recording": RECORDING,
    "link": LINK,
    "life": LIFE,
    "solver": SOLVER,
    "checks": CHECKS,
    "checks_bearing_slope": CHECKS_BEARING_SLOPE,
    "checks_bearing": CHECKS_BEARING,
    "checks_gear": CHECKS_GEAR,
    "checks_shaft": CHECKS_SHAFT,
    "checks_system_life": CHECKS_SYSTEM_LIFE,
    "study": STUDY,
    "study_vary": STUDY_VARY,
    "study_limit": STUDY_LIMIT,
    "study_bound": STUDY_BOUND,
    "study_optimise": STUDY_OPTIMISE,
}


# ------------------------------------------------------------------ the unit rule
#: Dimensions whose bare numbers are always read as they stand (no unit to slip).
UNITLESS = frozenset({"dimensionless"})

#: Default units of bare numbers in the model being read (``units:``), or ``None``:
#: then a bare number in a dimensional field is refused.
_DECLARED: ContextVar[dict[str, str] | None] = ContextVar("shaftsys_declared_units",
                                                          default=None)

_BARE = re.compile(r"^\s*[-+]?(\d+(?:\.\d*)?|\.\d+)([eE][-+]?\d+)?\s*$")


#: Plausibility warnings found while a model is read (see :func:`note`).
_NOTES: ContextVar[list[str] | None] = ContextVar("shaftsys_read_notes", default=None)


@contextmanager
def declared_units(units: dict[str, str] | None) -> Iterator[list[str]]:
    """Read the values inside the ``with`` block under the model's ``units:``; yields
    the list that collects the plausibility warnings of :func:`note`.
    """
    notes: list[str] = []
    token = _DECLARED.set(units)
    token_notes = _NOTES.set(notes)
    try:
        yield notes
    finally:
        _DECLARED.reset(token)
        _NOTES.reset(token_notes)


def note(where: Where, key: str | int | None, message: str) -> None:
    """Record a warning located at ``key`` (``file:line: field: message``)."""
    notes = _NOTES.get()
    if notes is None:
        return
    error = where.error(key, message)
    notes.append(error.render())


def read_units(where: Where, raw: Any) -> dict[str, str] | None:
    """The model's ``units:`` key: ``internal`` or ``{dimension: unit}`` (checked)."""
    if raw is None:
        return None
    if raw == "internal":
        return dict(DEFAULT_UNIT_NOTE)
    mapping = require_mapping(where, "units", raw) if not isinstance(raw, str) else None
    if mapping is None:
        raise where.error("units", f"{raw!r} is not a units declaration",
                          "'units: internal' or a mapping such as {length: mm, force: kN, "
                          "power: kW}")
    here = where.child("units", mapping)
    dims = sorted(d for d in DEFAULT_UNITS if d not in UNITLESS)
    out: dict[str, str] = {}
    for dim, unit in mapping.items():
        if dim not in dims:
            close = difflib.get_close_matches(str(dim), dims, n=1, cutoff=0.6)
            hint = f"; did you mean '{close[0]}'?" if close else ""
            raise here.error(dim, f"'{dim}' is not a dimension{hint}",
                             "one of: " + ", ".join(dims))
        if not isinstance(unit, str) or not unit.strip() or _BARE.match(unit):
            raise here.error(dim, f"{unit!r} is not a unit", f"a unit of {dim} such as "
                             f"'{DEFAULT_UNIT_NOTE[dim]}'")
        try:
            factor = to_internal(f"1 {unit}", dim)
        except QuantityProblem:
            factor = 0.0
        if dim != "temperature" and not factor > 0:
            raise here.error(dim, f"'{unit}' is not a unit of {dim}",
                             f"a unit of {dim} such as '{DEFAULT_UNIT_NOTE[dim]}'")
        if dim == "temperature" and unit.strip() not in {"degC", "degF", "K", "kelvin"}:
            raise here.error(dim, f"'{unit}' is not a temperature unit",
                             "degC, degF or K")
        out[str(dim)] = unit.strip()
    return out


def is_bare_number(raw: Any) -> bool:
    """True for a number without a unit (``22``, ``"22"``, ``1.5e3``)."""
    if isinstance(raw, bool):
        return False
    if isinstance(raw, int | float):
        return True
    return isinstance(raw, str) and bool(_BARE.match(raw))


def quantity_value(raw: Any, dim: str) -> float:
    """``raw`` in the internal unit of ``dim`` under the unit rule.

    A bare number in a dimensional field is read in the unit the model declares for
    ``dim`` (``units:``); without a declaration it is refused (0 is 0 in every unit and
    passes, except for a temperature). Raises :class:`QuantityProblem`.
    """
    if dim in UNITLESS or not is_bare_number(raw):
        return to_internal(raw, dim)
    declared = _DECLARED.get()
    if declared is not None and dim in declared:
        number = float(raw)
        if number == 0.0 and dim != "temperature":
            return 0.0
        return to_internal(f"{raw} {declared[dim]}".strip(), dim)
    if dim != "temperature" and float(raw) == 0.0:
        return 0.0
    unit = DEFAULT_UNIT_NOTE[dim]
    usual = _USUAL_UNIT.get(dim, unit)
    raise QuantityProblem(
        f"{raw!r} has no unit: a bare number is not read as "
        f"{'an' if dim[0] in 'aeiou' else 'a'} {dim.replace('_', ' ')}",
        f"the value with its unit, e.g. '{raw} {usual}' or '{raw} {unit}', or a top-level "
        f"'units:' that declares it (units: {{{dim}: {usual}}}, or units: internal for "
        f"{unit})")


#: The unit a designer usually writes, where it is not the internal one (messages).
_USUAL_UNIT = {"force": "kN", "power": "kW", "moment": "N*m", "stress": "MPa",
               "linear_stiffness": "kN/mm"}


@dataclass
class Where:
    """Location context for messages: file, field path and the mapping being read."""

    file: str | None
    path: str
    node: LocatedDict | LocatedList | None = None

    def line_of(self, key: str | int | None = None) -> int | None:
        """Line of ``key`` in the current mapping/list, or of the mapping itself."""
        node = self.node
        if node is None:
            return None
        if isinstance(node, LocatedDict) and isinstance(key, str) and key in node.lines:
            return node.lines[key]
        if isinstance(node, LocatedList) and isinstance(key, int) and key < len(node.lines):
            return node.lines[key]
        return node.line

    def field(self, key: str | int | None) -> str:
        """Field path of ``key`` below this place."""
        if key is None:
            return self.path
        if isinstance(key, int):
            return f"{self.path}[{key}]"
        return f"{self.path}.{key}" if self.path else key

    def error(self, key: str | int | None, message: str, expected: str | None = None
              ) -> ModelError:
        """A :class:`ModelError` located at ``key``."""
        return ModelError(message, file=self.file, line=self.line_of(key),
                          field=self.field(key), expected=expected)

    def child(self, key: str | int, node: Any, label: str | None = None) -> Where:
        """Location of a nested mapping or list (``label`` replaces ``[i]`` by ``[id]``)."""
        path = self.field(key) if label is None else f"{self.field(key)}"
        if label is not None:
            path = f"{self.path}[{label}]" if isinstance(key, int) else path
        return Where(self.file, path, node if isinstance(node, LocatedDict | LocatedList)
                     else None)


def require_mapping(where: Where, key: str | int | None, value: Any) -> LocatedDict:
    """``value`` must be a mapping."""
    if not isinstance(value, LocatedDict):
        raise where.error(key, f"expected a mapping, got {_describe(value)}",
                          "a mapping of 'key: value' lines")
    return value


def require_list(where: Where, key: str | int | None, value: Any) -> LocatedList:
    """``value`` must be a list."""
    if not isinstance(value, LocatedList):
        raise where.error(key, f"expected a list, got {_describe(value)}",
                          "a list of '- ' items")
    return value


def _describe(value: Any) -> str:
    if isinstance(value, LocatedDict):
        return "a mapping"
    if isinstance(value, LocatedList):
        return "a list"
    if value is None:
        return "nothing"
    return f"{type(value).__name__} {excerpt(value)}"


def check_keys(where: Where, mapping: LocatedDict, allowed: dict[str, Field] | set[str]
               ) -> None:
    """Refuse unknown keys, suggesting the closest known one."""
    names = list(allowed)
    for key in mapping:
        if key not in allowed:
            close = difflib.get_close_matches(str(key)[:MAX_TEXT], names, n=1, cutoff=0.6)
            hint = f"; did you mean '{close[0]}'?" if close else ""
            shown = key if len(str(key)) <= 40 else excerpt(str(key))
            raise where.error(key, f"unknown key '{shown}'{hint}",
                              "one of: " + ", ".join(sorted(names)))


def read_value(where: Where, key: str | int, raw: Any, spec: Field) -> Any:
    """Convert one raw value according to its field spec (see :class:`Field`)."""
    kind = spec.kind
    if kind == "quantity":
        assert spec.dim is not None
        try:
            value = quantity_value(raw, spec.dim)
        except QuantityProblem as exc:
            raise where.error(key, exc.message, exc.expected) from None
        _check_range(where, key, value, spec)
        return value
    if kind == "number":
        if isinstance(raw, bool) or not isinstance(raw, int | float | str):
            raise where.error(key, f"expected a number, got {_describe(raw)}", "a number")
        try:
            value = to_internal(raw, "dimensionless")
        except QuantityProblem as exc:
            raise where.error(key, exc.message, "a plain number") from None
        _check_range(where, key, value, spec)
        return value
    if kind == "int":
        if isinstance(raw, bool) or not isinstance(raw, int):
            raise where.error(key, f"expected a whole number, got {_describe(raw)}",
                              "a whole number")
        if abs(raw) > MAX_MAGNITUDE:
            raise where.error(key, f"a whole number of about {raw.bit_length() * 0.30103:.0f} "
                              "digits is outside the range shaftsys computes with",
                              f"a whole number of magnitude up to {MAX_MAGNITUDE:g}")
        _check_range(where, key, float(raw), spec)
        return int(raw)
    if kind in {"str", "id"}:
        if isinstance(raw, bool) or not isinstance(raw, str | int) or raw == "":
            raise where.error(key, f"expected a name, got {_describe(raw)}", "a text")
        text = str(raw)
        if len(text) > MAX_TEXT:
            raise where.error(key, f"a text of {len(text)} characters ({excerpt(text)})",
                              f"at most {MAX_TEXT} characters")
        if kind == "id" and (len(text) > 64 or any(c.isspace() for c in text)):
            raise where.error(key, f"id {excerpt(text)} must be a word of at most 64 characters",
                              "a short id without spaces")
        return text
    if kind == "bool":
        if not isinstance(raw, bool):
            raise where.error(key, f"expected true or false, got {_describe(raw)}",
                              "true or false")
        return raw
    if kind == "choice":
        if not isinstance(raw, str) or raw not in spec.choices:
            text = str(raw)[:MAX_TEXT]
            close = difflib.get_close_matches(text, list(spec.choices), n=1, cutoff=0.6)
            hint = f"; did you mean '{close[0]}'?" if close else ""
            raise where.error(key, f"{excerpt(raw)} is not a valid choice{hint}",
                              "one of: " + ", ".join(spec.choices))
        return raw
    if kind in {"choices", "quantities"}:
        items = require_list(where, key, raw)
        if not items:
            raise where.error(key, "the list is empty; leave the key out for the default",
                              "a list of at least one value")
        inner = where.child(key, items)
        item_spec = Field("choice" if kind == "choices" else "quantity", spec.doc,
                          dim=spec.dim, choices=spec.choices, positive=spec.positive,
                          non_negative=spec.non_negative, minimum=spec.minimum,
                          maximum=spec.maximum)
        values = [read_value(inner, i, item, item_spec) for i, item in enumerate(items)]
        for i, value in enumerate(values):
            if value in values[:i]:
                raise inner.error(i, f"{items[i]!r} is listed twice", "distinct values")
        return tuple(values)
    if kind == "vector":
        assert spec.dim is not None
        items = require_list(where, key, raw)
        if len(items) != 3:
            raise where.error(key, f"expected three components, got {len(items)}",
                              "[x, y, z]")
        inner = where.child(key, items)
        out = []
        for i, item in enumerate(items):
            try:
                out.append(quantity_value(item, spec.dim))
            except QuantityProblem as exc:
                raise inner.error(i, exc.message, exc.expected) from None
        return tuple(out)
    if kind in {"map", "idmap"}:
        return require_mapping(where, key, raw)
    if kind == "list":
        items = require_list(where, key, raw)
        if spec.max_items is not None and len(items) > spec.max_items:
            raise where.error(key, f"{len(items)} items are more than shaftsys takes",
                              f"at most {spec.max_items} items")
        return items
    if kind == "any":
        return raw
    raise ValueError(f"unknown field kind {kind!r}")  # pragma: no cover - spec bug


def _check_range(where: Where, key: str | int, value: float, spec: Field) -> None:
    """Every comparison is written so that NaN fails it (NaN compares false)."""
    unit = f" {DEFAULT_UNIT_NOTE[spec.dim]}" if spec.dim and spec.dim != "dimensionless" \
        else ""
    if math.isnan(value):
        raise where.error(key, "is not a number (NaN)", "a finite number")
    if spec.positive and not value > 0:
        raise where.error(key, f"must be positive, got {value:g}", "a value > 0")
    if spec.non_negative and not value >= 0:
        raise where.error(key, f"must not be negative, got {value:g}", "a value >= 0")
    if spec.above is not None and not value > spec.above:
        what = (" (absolute zero)" if spec.dim == "temperature"
                and spec.above == ABSOLUTE_ZERO_C else "")
        raise where.error(key, f"{value:g}{unit} is not above {spec.above:g}{unit}{what}",
                          _range_text(spec, unit))
    if spec.below is not None and not value < spec.below:
        raise where.error(key, f"{value:g}{unit} is not below {spec.below:g}{unit}",
                          _range_text(spec, unit))
    if spec.minimum is not None and not value >= spec.minimum:
        raise where.error(key, f"{value:g}{unit} is below the smallest allowed "
                          f"{spec.minimum:g}{unit}", _range_text(spec, unit))
    if spec.maximum is not None and not value <= spec.maximum:
        raise where.error(key, f"{value:g}{unit} is above the largest allowed "
                          f"{spec.maximum:g}{unit}", _range_text(spec, unit))


def _range_text(spec: Field, unit: str) -> str:
    """The allowed range of a field, e.g. ``a value > 0 and < 360 deg``."""
    parts = []
    low = max((v for v in (spec.above, spec.minimum) if v is not None), default=None)
    if spec.positive and (low is None or low < 0):
        parts.append("> 0")
    elif spec.non_negative and (low is None or low < 0):
        parts.append(">= 0")
    elif low is not None:
        parts.append(f"{'>=' if low == spec.minimum else '>'} {low:g}")
    if spec.below is not None:
        parts.append(f"< {spec.below:g}")
    elif spec.maximum is not None:
        parts.append(f"<= {spec.maximum:g}")
    return "a value " + " and ".join(parts) + unit


def read_section(where: Where, mapping: Any, fields: dict[str, Field],
                 key: str | int | None = None) -> dict[str, Any]:
    """Read a mapping against its field table: unknown keys refused, required present,
    every value converted, defaults filled in. Returns ``{key: value}``.
    """
    mapping = require_mapping(where, key, mapping)
    here = where if key is None else where.child(key, mapping)
    here.node = mapping
    check_keys(here, mapping, fields)
    out: dict[str, Any] = {}
    for name, spec in fields.items():
        if name in mapping and mapping[name] is not None:
            out[name] = read_value(here, name, mapping[name], spec)
        elif spec.required:
            # the key is absent: point at the mapping's line, name the missing field
            raise ModelError(f"'{name}' is missing ({spec.doc})", file=here.file,
                             line=here.line_of(None), field=here.field(name),
                             expected=f"a key '{name}'")
        else:
            out[name] = spec.default
    return out
