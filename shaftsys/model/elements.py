"""Load elements on a shaft (gears, pulleys, sprockets, couplings, loads, masses).

All positions are stations x [mm] on the element's shaft; angles are in degrees measured
from +y toward +z. ``mesh_angle_deg`` always means the direction, seen from this shaft's
axis, toward the mating member (the pitch point of a gear mesh, the other pulley's or
sprocket's axis for belts and chains).
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True, slots=True)
class ElementBase:
    """Fields every element has.

    Attributes
    ----------
    id: unique element id in the model.
    x_mm: axial station of the element's centre plane [mm].
    mass_kg: mass [kg] (its weight loads the shaft; it also enters critical speeds).
    polar_inertia_kgm2: polar mass moment of inertia [kg*m^2].
    diametral_inertia_kgm2: diametral (transverse) mass moment of inertia [kg*m^2].
    width_mm: axial width [mm] (drawing and overlap checks), or ``None``.
    line: line of the element in its model file, or ``None``.
    """

    id: str
    x_mm: float
    mass_kg: float = 0.0
    polar_inertia_kgm2: float = 0.0
    diametral_inertia_kgm2: float = 0.0
    width_mm: float | None = None
    line: int | None = None

    @property
    def carries_torque(self) -> bool:
        """True when the element can put torque into or take it out of the shaft."""
        return False

    @property
    def kind(self) -> str:
        """The element type name a model file writes."""
        return "element"


@dataclass(frozen=True, slots=True)
class Gear(ElementBase):
    """Spur or helical cylindrical gear.

    Attributes
    ----------
    pitch_diameter_mm: working pitch diameter [mm].
    normal_pressure_angle_deg: normal pressure angle [deg].
    helix_angle_deg: helix angle at the pitch diameter [deg] (0 = spur).
    hand: ``"right"``, ``"left"`` or ``None`` (spur).
    mesh_angle_deg: direction toward the pitch point of the mesh [deg].
    internal: an internal (ring) gear.
    normal_module_mm, teeth: for reports and machine links (``None`` if not given).
    """

    pitch_diameter_mm: float = 0.0
    normal_pressure_angle_deg: float = 20.0
    helix_angle_deg: float = 0.0
    hand: str | None = None
    mesh_angle_deg: float = 0.0
    internal: bool = False
    normal_module_mm: float | None = None
    teeth: int | None = None

    @property
    def carries_torque(self) -> bool:  # noqa: D102
        return True

    @property
    def kind(self) -> str:  # noqa: D102
        return "gear"


@dataclass(frozen=True, slots=True)
class BevelGear(ElementBase):
    """Straight bevel gear.

    Attributes
    ----------
    mean_pitch_diameter_mm: pitch diameter at mid face width [mm].
    pitch_cone_angle_deg: pitch cone angle [deg].
    pressure_angle_deg: pressure angle [deg].
    mesh_angle_deg: direction toward the pitch point [deg].
    apex: ``+1`` if the cone apex lies toward +x from the gear, ``-1`` toward -x.
    """

    mean_pitch_diameter_mm: float = 0.0
    pitch_cone_angle_deg: float = 45.0
    pressure_angle_deg: float = 20.0
    mesh_angle_deg: float = 0.0
    apex: int = 1

    @property
    def carries_torque(self) -> bool:  # noqa: D102
        return True

    @property
    def kind(self) -> str:  # noqa: D102
        return "bevel_gear"


@dataclass(frozen=True, slots=True)
class Pulley(ElementBase):
    """Belt pulley (flat belt, or V-belt when ``groove_angle_deg`` is given).

    Attributes
    ----------
    diameter_mm: pitch diameter [mm].
    mesh_angle_deg: direction toward the other pulley's axis [deg].
    wrap_angle_deg: wrap angle of the belt on this pulley [deg].
    pretension_N: installation tension of each strand [N]; it stays in every case.
    friction_coefficient: belt-pulley friction coefficient [-].
    groove_angle_deg: V-groove angle [deg] or ``None`` for a flat belt.
    slack_tension_N: slack-side tension held by a take-up [N] (a gravity take-up: the
        same in every case), or ``None`` for the fixed-centre pretension model.
    hubs_mm: stations [mm] of the hubs of a drum that sits on the shaft with several
        hubs; belt force, weight and torque are shared equally among them (empty: one
        hub at ``x_mm``).
    """

    diameter_mm: float = 0.0
    mesh_angle_deg: float = 0.0
    wrap_angle_deg: float = 180.0
    pretension_N: float = 0.0
    friction_coefficient: float = 0.3
    groove_angle_deg: float | None = None
    slack_tension_N: float | None = None
    hubs_mm: tuple[float, ...] = ()

    @property
    def carries_torque(self) -> bool:  # noqa: D102
        return True

    @property
    def kind(self) -> str:  # noqa: D102
        return "pulley"


@dataclass(frozen=True, slots=True)
class Sprocket(ElementBase):
    """Chain sprocket: only the tight strand loads the shaft (common practice)."""

    pitch_diameter_mm: float = 0.0
    mesh_angle_deg: float = 0.0
    wrap_angle_deg: float = 180.0

    @property
    def carries_torque(self) -> bool:  # noqa: D102
        return True

    @property
    def kind(self) -> str:  # noqa: D102
        return "sprocket"


@dataclass(frozen=True, slots=True)
class Coupling(ElementBase):
    """Coupling: torque only, with an optional constant radial force at an angle."""

    radial_force_N: float = 0.0
    radial_angle_deg: float = 0.0

    @property
    def carries_torque(self) -> bool:  # noqa: D102
        return True

    @property
    def kind(self) -> str:  # noqa: D102
        return "coupling"


@dataclass(frozen=True, slots=True)
class ProcessLoad(ElementBase):
    """External force and moment at a station (a process load, an impeller thrust...).

    ``force_N`` and ``moment_Nmm`` act in every case unless a case gives its own values.
    """

    force_N: tuple[float, float, float] = (0.0, 0.0, 0.0)
    moment_Nmm: tuple[float, float, float] = (0.0, 0.0, 0.0)

    @property
    def kind(self) -> str:  # noqa: D102
        return "load"


@dataclass(frozen=True, slots=True)
class LumpedMass(ElementBase):
    """A mass on the shaft (its weight loads the shaft in the direction of gravity)."""

    @property
    def kind(self) -> str:  # noqa: D102
        return "mass"


@dataclass(frozen=True, slots=True)
class Unbalance(ElementBase):
    """Rotating unbalance U [g*mm]: F = U * omega^2, taken at the stated phase angle."""

    unbalance_gmm: float = 0.0
    phase_deg: float = 0.0

    @property
    def kind(self) -> str:  # noqa: D102
        return "unbalance"


Element = Gear | BevelGear | Pulley | Sprocket | Coupling | ProcessLoad | LumpedMass | Unbalance
