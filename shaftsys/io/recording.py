"""The ``recording`` section of a model file: a recorded series that becomes the duty.

``read_recording(top, raw, file)`` checks the section (located errors, exit 2) and
returns a :class:`~shaftsys.model.recording.RecordingSpec` (the loader keeps it as
``Model.recording``, ``None`` when the model names no recording).
``reduce_recording(model, spec)`` reads the series and reduces it to the model's duty
cases (``analysis.duty.reduce_duty``);
``analyse_recorded(model, spec)`` analyses the model with those cases (what ``check``,
``report`` and ``plot`` do); ``io.model_duty.load_model_with_duty`` gives the study
commands the model with the recorded cases.
"""

from __future__ import annotations

import itertools
from pathlib import Path
from typing import TYPE_CHECKING, Any

from shaftsys.io import spec as S
from shaftsys.io.spec import Where, read_section, require_mapping
from shaftsys.model.recording import RecordingSpec

if TYPE_CHECKING:
    from shaftsys.analysis.duty import DutyReduction
    from shaftsys.analysis.duty_reduction import BinSettings
    from shaftsys.analysis.results import Result
    from shaftsys.model import Model


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
        line=rw.line_of("file"), model_file=file)


def require_series_file(spec: RecordingSpec) -> None:
    """Raise a ModelError at the section's ``file`` key when the series file is missing."""
    if not spec.path.is_file():
        from shaftsys.errors import ModelError

        raise ModelError(f"the recording '{spec.path}' does not exist", file=spec.model_file,
                         line=spec.line, field="recording.file",
                         expected="a CSV or Parquet file, relative to the model file's "
                         "folder (the bundled demo's is written by "
                         "'python3 models/make_demo_recording.py')")


def bin_settings(spec: RecordingSpec, model: Model) -> BinSettings:
    """The binning of a recording section (p from the bearings when not given)."""
    from shaftsys.analysis.duty import default_exponent
    from shaftsys.analysis.duty_reduction import BinSettings

    p = spec.exponent if spec.exponent is not None else default_exponent(model)
    return BinSettings(torque_bins=spec.bins, torque_edges_Nmm=spec.edges_Nmm,
                       speed_bins=spec.speed_bins, exponent=p,
                       peak_above_Nmm=spec.peak_above_Nmm)


def reduce_recording(model: Model, spec: RecordingSpec, *, analyse_model: bool = True,
                     chunk_rows: int = 1_000_000) -> DutyReduction:
    """Read the series of ``spec`` and reduce it to cases of ``model`` (analysed with
    them unless ``analyse_model`` is false). Raises ModelError (file, row, column) for a
    bad series.
    """
    from shaftsys.analysis.duty import reduce_duty
    from shaftsys.io.timeseries import open_series

    require_series_file(spec)
    source = open_series(spec.path, time=spec.time, torque=spec.torque, power=spec.power,
                         speed=spec.speed, temperature=spec.temperature,
                         loads=tuple(col for col, _, _ in spec.loads),
                         chunk_rows=chunk_rows)
    kinds = tuple("load" if r.startswith("load:") else r for r in source.extras)
    return reduce_duty(model, source.chunks, bin_settings(spec, model),
                       template=spec.template, prefix=spec.prefix,
                       tolerance_pct=spec.tolerance_pct, series_name=source.name,
                       analyse_model=analyse_model, channels=kinds,
                       load_targets=[(el, k) for _, el, k in spec.loads])


def analyse_recorded(model: Model, spec: RecordingSpec) -> Result:
    """The analysis of ``model`` with the cases reduced from the recording ``spec``; the
    result carries the reduction (``Result.duty_reduction``).
    """
    from dataclasses import replace

    red = reduce_recording(model, spec)
    assert red.result is not None
    return replace(red.result, duty_reduction=red)


__all__ = ["RecordingSpec", "analyse_recorded", "bin_settings", "read_recording",
           "reduce_recording", "require_series_file"]
