"""A recorded series named by the model file (``recording:``): where it is, which column
plays which role, and how it is binned. Read by ``io.recording``; reduced to cases by
``analysis.duty``.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path


@dataclass(frozen=True, slots=True)
class RecordingSpec:
    """A recording named in a model file.

    path: the series file (made absolute against the model file's folder); time ..
    temperature: column names (``None``: the default names); loads: (column, element,
    component index 0..2 for Fx, Fy, Fz); bins, speed_bins: bin counts; edges_Nmm: torque
    bin edges [N*mm] or ``None``; exponent: p or ``None`` (from the bearing types);
    peak_above_Nmm [N*mm] or ``None``; tolerance_pct [%] or ``None``; template: case id or
    ``None``; prefix: case-id prefix; line: line of the section, model_file: the model
    file (messages).
    """

    path: Path
    time: str | None
    torque: str | None
    power: str | None
    speed: str | None
    temperature: str | None
    loads: tuple[tuple[str, str, int], ...]
    bins: int
    speed_bins: int
    edges_Nmm: tuple[float, ...] | None
    exponent: float | None
    peak_above_Nmm: float | None
    tolerance_pct: float | None
    template: str | None
    prefix: str
    line: int | None = None
    model_file: str | None = None


__all__ = ["RecordingSpec"]
