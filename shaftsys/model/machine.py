"""The whole model: shafts, cases, lubrication, targets and solver settings."""

from __future__ import annotations

from dataclasses import dataclass, field

from shaftsys.model.bearing import Bearing, LifeSettings, Lubrication
from shaftsys.model.case import Case
from shaftsys.model.checks import CheckSettings
from shaftsys.model.recording import RecordingSpec
from shaftsys.model.selection import OpenSeat, SelectionSettings
from shaftsys.model.shaft import Shaft
from shaftsys.model.thermal import HeatBalance


@dataclass(frozen=True, slots=True)
class SolverSettings:
    """Beam-solver settings.

    Attributes
    ----------
    shear_deformation: Timoshenko beam (True, default) or Euler-Bernoulli (False).
    max_element_mm: longest beam element [mm] (nodes are also put at every station).
    residual_tolerance: largest accepted equilibrium residual, relative to the load.
    include_shaft_weight: the shaft's own weight loads it (with gravity).
    bearing_stiffness: ``"rigid"`` (default: the supports as typed, rigid or linear
        springs) or ``"nonlinear"`` (every bearing with an interior takes the tangent
        stiffness of its rolling-element loads; Newton iteration per case).
    nonlinear_tolerance: convergence of the nonlinear solve: largest out-of-balance
        force at the bearing degrees of freedom relative to the largest load.
    nonlinear_max_iterations: most Newton iterations of the nonlinear solve per case.
    """

    shear_deformation: bool = True
    max_element_mm: float = 10.0
    residual_tolerance: float = 1e-9
    include_shaft_weight: bool = True
    bearing_stiffness: str = "rigid"
    nonlinear_tolerance: float = 1e-8
    nonlinear_max_iterations: int = 60


@dataclass(frozen=True, slots=True)
class Link:
    """A power-transmitting connection between elements on two shafts.

    Attributes
    ----------
    id: link id.
    kind: ``"gear_mesh"`` (external or internal spur/helical), ``"bevel_mesh"``,
        ``"belt"`` or ``"chain"``. A worm pair would be one more kind with its own
        ratio and force model.
    members: the two element ids (any order).
    efficiency: power efficiency of the link (0 < eta <= 1).
    pretension_N: belt installation tension per strand [N] (belts only).
    line: line in the model file.
    """

    id: str
    kind: str
    members: tuple[str, str]
    efficiency: float = 1.0
    pretension_N: float | None = None
    line: int | None = None


@dataclass(frozen=True, slots=True)
class Model:
    """A machine model, as read from a model file or built in Python.

    Change it by copying (``dataclasses.replace``), never in place.

    Attributes
    ----------
    name: title of the model.
    shafts: the shafts.
    cases: the operating cases (duty cycle plus peak/static cases).
    duration_in_hours: case durations are hours (True) or fractions (False).
    gravity_m_s2: gravity vector in the shaft frame [m/s^2].
    life: life-engine defaults and targets.
    lubrication: lubricant and cleanliness, or ``None`` (then the verdict uses a1*L10).
    solver: beam-solver settings.
    source: path of the model file, or ``None``.
    sha256: SHA-256 of the model file's bytes, or ``None``.
    links: links between shafts (machine models).
    open_seats: supports whose bearing is to be chosen from a catalogue; each has a
        placeholder :class:`Bearing` of the same id in its shaft (station, axial role,
        targets are the designer's; ratings are not yet known).
    selection: options of the choice.
    fatigue_required: the shafts' fatigue check is required: a shaft whose fatigue
        cannot be evaluated (material without Su, Sy) fails the run as "not evaluated".
    thermal: heat-balance data of the housing (friction and operating temperature per
        case), or ``None``.
    checks: limits and targets of the checks (the model file's ``checks:`` section).
    recording: the recorded series whose reduction gives the duty cases (``recording:``),
        or ``None``.
    warnings: what the loader found plausible but suspicious (a value that looks like a
        unit slip), each naming file, line, field and the value as read.
    """

    name: str
    shafts: tuple[Shaft, ...]
    cases: tuple[Case, ...]
    duration_in_hours: bool = False
    gravity_m_s2: tuple[float, float, float] = (0.0, -9.80665, 0.0)
    life: LifeSettings = field(default_factory=LifeSettings)
    lubrication: Lubrication | None = None
    solver: SolverSettings = field(default_factory=SolverSettings)
    source: str | None = None
    sha256: str | None = None
    links: tuple[Link, ...] = ()
    open_seats: tuple[OpenSeat, ...] = ()
    selection: SelectionSettings = field(default_factory=SelectionSettings)
    fatigue_required: bool = True
    thermal: HeatBalance | None = None
    warnings: tuple[str, ...] = ()
    checks: CheckSettings = field(default_factory=CheckSettings)
    recording: RecordingSpec | None = None

    def shaft(self, shaft_id: str) -> Shaft:
        """The shaft with this id."""
        for s in self.shafts:
            if s.id == shaft_id:
                return s
        raise KeyError(shaft_id)

    def bearings(self) -> list[tuple[Shaft, Bearing]]:
        """Every (shaft, bearing) pair in model order."""
        return [(s, b) for s in self.shafts for b in s.bearings]

    @property
    def duty_cases(self) -> tuple[Case, ...]:
        """Cases with a time share (not peak/static)."""
        from shaftsys.model.case import CaseKind

        return tuple(c for c in self.cases if c.kind is CaseKind.DUTY)

    def shares(self) -> dict[str, float]:
        """Normalised time fraction of each case (0 for peak and static cases)."""
        total = sum(c.duration for c in self.duty_cases)
        return {
            c.id: (c.duration / total if total > 0 and c in self.duty_cases else 0.0)
            for c in self.cases
        }
