"""The ``recording`` section of a model file: a recorded series that becomes the duty.

``read_recording(top, raw, file)`` checks the section (located errors, exit 2) and
returns a :class:`RecordingSpec`; ``model_recording(path)`` reads it from a model file
(``None`` when the model names no recording). The reduction itself is
``analysis.duty.reduce_duty``.
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from shaftsys.io import spec as S
from shaftsys.io.spec import Where, read_section, require_mapping


@dataclass(frozen=True, slots=True)
class RecordingSpec:
    """A recording named in a model file.

    path: the series file (made absolute against the model file's folder); time ..
    temperature: column names (``None``: the default names); loads: (column, element,
    component index 0..2 for Fx, Fy, Fz); bins, speed_bins: bin counts; edges_Nmm: torque
    bin edges [N*mm] or ``None``; exponent: p or ``None`` (from the bearing types);
    peak_above_Nmm [N*mm] or ``None``; tolerance_pct [%] or ``None``; template: case id or
    ``None``; prefix: case-id prefix; line: line of the section (messages).
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


def read_recording(top: Where, raw: Any, file: str | None) -> RecordingSpec | None:
    """The ``recording`` section, checked (``None`` when absent)."""
    if raw is None:
        return None
    v = read_section(top, raw, S.RECORDING, "recording")
    rw = top.child("recording", raw)
    rw.node = require_mapping(top, "recording", raw)
    if v["torque"] is not None and v["power"] is not None:
        raise rw.error("power", "give the input channel once: a torque or a power column",
                       "one of 'torque' and 'power'")
    edges = v["edges"]
    if edges is not None:
        edges = tuple(float(e) for e in edges)
        if len(edges) < 2 or any(b <= a for a, b in itertools.pairwise(edges)):
            raise rw.error("edges", "torque bin edges must rise", "at least two increasing "
                           "torques, e.g. [0 N*m, 50 N*m, 100 N*m]")
    loads: list[tuple[str, str, int]] = []
    if v["loads"] is not None:
        lm = require_mapping(rw, "loads", v["loads"])
        lw = rw.child("loads", lm)
        lw.node = lm
        for col, target in lm.items():
            element, _, comp = str(target).rpartition(".")
            if not isinstance(target, str) or not element or comp not in ("Fx", "Fy", "Fz"):
                raise lw.error(col, f"'{target}' names no force component",
                               "ELEMENT.Fx, ELEMENT.Fy or ELEMENT.Fz of a process load")
            loads.append((str(col), element, ("Fx", "Fy", "Fz").index(comp)))
    folder = Path(file).parent if file else Path.cwd()
    return RecordingSpec(
        path=folder / v["file"], time=v["time"], torque=v["torque"], power=v["power"],
        speed=v["speed"], temperature=v["temperature"], loads=tuple(loads),
        bins=v["bins"], speed_bins=v["speed_bins"], edges_Nmm=edges,
        exponent=v["exponent"], peak_above_Nmm=v["peak_above"],
        tolerance_pct=v["tolerance"], template=v["template"], prefix=v["prefix"],
        line=rw.line_of(None))


def model_recording(path: str | Path) -> RecordingSpec | None:
    """The recording named by the model file at ``path`` (``None``: it names none)."""
    from shaftsys.io.yamlsource import LocatedDict, parse_yaml, read_text_file

    name = str(path)
    raw = parse_yaml(read_text_file(path, "model file"), name)
    if not isinstance(raw, LocatedDict) or raw.get("recording") is None:
        return None
    top = Where(name, "", raw)
    with S.declared_units(S.read_units(top, raw.get("units"))):
        return read_recording(top, raw["recording"], name)


__all__ = ["RecordingSpec", "model_recording", "read_recording"]
