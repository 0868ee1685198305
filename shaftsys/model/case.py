"""Operating cases (the duty cycle) as frozen input values."""

from __future__ import annotations

from dataclasses import dataclass, field
from enum import StrEnum


class CaseKind(StrEnum):
    """``duty`` cases have a time share; ``peak`` and ``static`` feed static checks only."""

    DUTY = "duty"
    PEAK = "peak"
    STATIC = "static"


@dataclass(frozen=True, slots=True)
class Drive:
    """How torque enters and leaves one shaft in one case.

    Attributes
    ----------
    speed_rpm: signed shaft speed about +x [rpm].
    input_element: id of the element through which power enters.
    input_torque_Nmm: torque the input element applies to the shaft about +x [N*mm]
        (the loader converts a power with T = P / omega, power > 0 entering).
    outputs: (element id, share) pairs; the outputs take ``-share * input torque``.
    """

    speed_rpm: float
    input_element: str | None = None
    input_torque_Nmm: float = 0.0
    outputs: tuple[tuple[str, float], ...] = ()


@dataclass(frozen=True, slots=True)
class ElementLoad:
    """A process load given for one element in one case (shaft frame, N and N*mm)."""

    element: str
    force_N: tuple[float, float, float] = (0.0, 0.0, 0.0)
    moment_Nmm: tuple[float, float, float] = (0.0, 0.0, 0.0)


@dataclass(frozen=True, slots=True)
class Case:
    """One operating case.

    Attributes
    ----------
    id: case id.
    kind: duty, peak or static.
    duration: time share as a fraction, or hours (``Model.duration_in_hours`` says which);
        0 for peak and static cases.
    drives: shaft id -> :class:`Drive`.
    loads: per-element process loads of this case.
    temperature_C: operating temperature [degC] (``nan`` = not given).
    line: line of the case in its model file.
    slack_tensions: (pulley id, slack-side tension [N]) given for this case (a take-up
        whose tension the designer knows per case); it replaces the pulley's own model.
    """

    id: str
    kind: CaseKind
    duration: float
    drives: dict[str, Drive] = field(default_factory=dict)
    loads: tuple[ElementLoad, ...] = ()
    temperature_C: float = float("nan")
    line: int | None = None
    slack_tensions: tuple[tuple[str, float], ...] = ()

    def __hash__(self) -> int:
        return hash((self.id, self.kind, self.duration))
