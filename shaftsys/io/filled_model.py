"""Write a model file back with the bearings chosen for its open seats.

:func:`filled_model_text` reads the source model file (plain ``yaml.safe_load``: it is
the user's own file that has already passed the loader) and replaces the entry of each
chosen bearing: ``choose`` goes, the bearing's type, dimensions, ratings and the factors
it has come in as quantity strings with their unit (``"52000 N"``, ``"50 mm"``,
``"6300 rpm"``, ``"25 deg"``; factors as plain numbers), each written with the shortest
text that reads back to the same float. The designer's other keys (station, axial role,
pair, targets, stiffness...) stay as written. Comments of the source are not kept (the
header of the written file says so). :func:`write_filled_model` checks that the text
loads as a model and writes it atomically, never over its own source unless asked.
Units as in :mod:`shaftsys.units` (mm, N, rpm, deg).
"""

from __future__ import annotations

import math
import os
import unicodedata
from collections.abc import Mapping
from pathlib import Path
from typing import Any

import numpy as np
import yaml

from shaftsys import __version__
from shaftsys.errors import ModelError, OutputError
from shaftsys.io import spec as S
from shaftsys.model import Bearing, SetArrangement

#: Bearing attributes written as quantities: (model-file key, attribute, unit).
QUANTITY_KEYS: tuple[tuple[str, str, str], ...] = (
    ("d", "d_mm", "mm"), ("D", "D_mm", "mm"), ("B", "B_mm", "mm"), ("C", "C_N", "N"),
    ("C0", "C0_N", "N"), ("Cu", "Cu_N", "N"), ("limiting_speed", "limiting_speed_rpm", "rpm"),
    ("contact_angle", "contact_angle_deg", "deg"),
)
#: Bearing factors written as plain numbers (model-file key = attribute).
FACTOR_KEYS: tuple[str, ...] = ("e", "Y", "Y0", "Y1", "Y2", "X", "f0")


def filled_model_text(model_path: str | Path, chosen: Mapping[str, Bearing], note: str, *,
                      designations: Mapping[str, str] | None = None,
                      out_dir: str | Path | None = None) -> str:
    """The model file ``model_path`` as YAML text with the ``chosen`` bearings written in.

    Parameters
    ----------
    model_path: the source model file (it has passed the loader).
    chosen: bearing id -> the bearing to write at that id (from
        :meth:`~shaftsys.model.catalogue.Catalogue.to_bearing`; an open seat's or a
        typed bearing's entry may be replaced).
    note: free text for the header comment (several lines allowed).
    designations: bearing id -> catalogue designation; where not given, the row of the
        seat's catalogue with the bearing's type, d, D, B, C and C0 names it (no
        ``designation`` key when no single row matches).
    out_dir: the folder the text will be written to; relative catalogue paths of seats
        left open are rewritten relative to it (``None``: kept as written).

    Raises
    ------
    ModelError: the file cannot be read, or a chosen id is not a bearing of the model.
    """
    source = Path(model_path)
    data = _read_source(source)
    entries = _bearing_entries(data, str(source))
    lines: list[str] = []
    for bid, bearing in chosen.items():
        if bid not in entries:
            raise ModelError(f"no bearing '{bid}' in the model", file=str(source),
                             field=f"bearings[{bid}]",
                             expected="the id of a bearing of the model: "
                             + ", ".join(entries))
        bearings, i = entries[bid]
        entry = bearings[i]
        catalogue = _catalogue_name(entry)
        designation = (designations or {}).get(bid)
        if designation is None and catalogue is not None:
            designation = _designation(source.parent / catalogue, bearing)
        bearings[i] = _filled_entry(entry, bearing, designation)
        origin = f" from {catalogue}" if catalogue is not None else ""
        lines.append(f"bearing {bid}: {designation or bearing.kind.value}{origin}")
    if out_dir is not None:
        _move_catalogue_paths(entries, source.parent, Path(out_dir))
    header = [f"Model file written by shaftsys {__version__}: {source} with chosen "
              "bearings written in.", *lines, *note.splitlines(),
              "Rewritten from the values of the source file: its comments are not kept."]
    comment = "".join(f"# {text}\n" if text else "#\n" for text in map(_comment_safe, header))
    return comment + _dump(data)


def write_filled_model(model_path: str | Path, chosen: Mapping[str, Bearing],
                       out_path: str | Path, *, note: str = "",
                       overwrite_input: bool = False,
                       designations: Mapping[str, str] | None = None) -> None:
    """Write :func:`filled_model_text` of ``model_path`` to ``out_path`` (atomically).

    The text is loaded as a model first (relative catalogue paths from ``out_path``'s
    folder), so a file that would not load is never written.

    Raises
    ------
    OutputError: ``out_path`` is the source model file and ``overwrite_input`` is not
        set, or the file cannot be written.
    ModelError: as :func:`filled_model_text`, or the filled model does not load.
    """
    source, out = Path(model_path), Path(out_path)
    if _same_file(source, out) and not overwrite_input:
        raise OutputError(f"refusing to write the filled model over its source {source}: "
                          "choose another output file (or allow overwriting the input)")
    text = filled_model_text(source, chosen, note, designations=designations,
                             out_dir=out.parent if str(out.parent) else Path("."))
    _write_if_it_loads(source, out, text, "the model with the chosen bearings")


def moved_model_text(model_path: str | Path, stations_mm: Mapping[str, float],
                     note: str = "") -> str:
    """The model file with bearings and elements moved to new stations.

    ``stations_mm``: bearing or element id -> new ``at`` [mm], written as ``"<x> mm"``
    with the shortest text that reads back to the same float. Other keys stay as the
    source writes them (its comments are lost; the header says so).

    Raises
    ------
    ModelError: the file cannot be read, or an id is neither a bearing nor an element.
    """
    source = Path(model_path)
    data = _read_source(source)
    found: dict[str, dict[str, Any]] = {}
    for shaft in data.get("shafts") or []:
        if not isinstance(shaft, dict):
            continue
        for group in ("bearings", "elements"):
            for entry in shaft.get(group) or []:
                if isinstance(entry, dict) and "id" in entry:
                    found[str(entry["id"])] = entry
    lines = []
    for oid, x in stations_mm.items():
        if oid not in found:
            raise ModelError(f"no bearing or element '{oid}' in the model", file=str(source),
                             field=f"shafts[].bearings[{oid}]",
                             expected="the id of a bearing or element of the model")
        before = found[oid].get("at")
        found[oid]["at"] = f"{_number(x)} mm"
        lines.append(f"{oid}: at {before} -> {found[oid]['at']}")
    header = [f"Model file written by shaftsys {__version__}: {source} with new stations.",
              *lines, *note.splitlines(),
              "Rewritten from the values of the source file: its comments are not kept."]
    comment = "".join(f"# {text}\n" if text else "#\n" for text in map(_comment_safe, header))
    return comment + _dump(data)


def write_moved_model(model_path: str | Path, stations_mm: Mapping[str, float],
                      out_path: str | Path, *, note: str = "") -> None:
    """Write :func:`moved_model_text` to ``out_path`` (atomically), after loading it.

    Raises
    ------
    OutputError: ``out_path`` is the source model file, or it cannot be written.
    ModelError: as :func:`moved_model_text`, or the written model would not load.
    """
    source, out = Path(model_path), Path(out_path)
    if _same_file(source, out):
        raise OutputError(f"refusing to write the moved model over its source {source}: "
                          "choose another output file")
    text = moved_model_text(source, stations_mm, note)
    _write_if_it_loads(source, out, text, "the model with the new stations")


def _write_if_it_loads(source: Path, out: Path, text: str, what: str) -> None:
    """Write ``text`` to ``out`` only after it loads as a model (errors name ``source``)."""
    from shaftsys.io.loader import load_model_text
    from shaftsys.io.output import write_text

    try:
        load_model_text(text, file=str(out))
    except ModelError as exc:
        raise ModelError(f"{what} does not load: {exc.message}", file=str(source),
                         field=exc.field, expected=exc.expected) from None
    write_text(out, text)


# ----------------------------------------------------------------------------- helpers
def _read_source(path: Path) -> dict[str, Any]:
    try:
        text = path.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as exc:
        reason = exc.strerror if isinstance(exc, OSError) else "not UTF-8 text"
        raise ModelError(f"cannot read the model file: {reason}", file=str(path)) from None
    try:
        data = yaml.safe_load(text)
    except yaml.YAMLError as exc:
        raise ModelError(f"invalid YAML: {exc}", file=str(path)) from None
    if not isinstance(data, dict) or not isinstance(data.get("shafts"), list):
        raise ModelError("not a model file (a mapping with 'shafts')", file=str(path),
                         expected="a model file that passes 'shaftsys validate'")
    return data


def _bearing_entries(data: dict[str, Any], file: str
                     ) -> dict[str, tuple[list[Any], int]]:
    """Bearing id -> (the list holding its entry, index) over every shaft."""
    out: dict[str, tuple[list[Any], int]] = {}
    for shaft in data["shafts"]:
        bearings = shaft.get("bearings") if isinstance(shaft, dict) else None
        if not isinstance(bearings, list):
            raise ModelError("a shaft without a list of bearings", file=file,
                             expected="a model file that passes 'shaftsys validate'")
        for i, entry in enumerate(bearings):
            if isinstance(entry, dict) and "id" in entry:
                out[str(entry["id"])] = (bearings, i)
    return out


def _catalogue_name(entry: dict[str, Any]) -> str | None:
    choose = entry.get("choose")
    name = choose.get("catalogue") if isinstance(choose, dict) else None
    return str(name) if name is not None else None


def _filled_entry(entry: dict[str, Any], bearing: Bearing, designation: str | None
                  ) -> dict[str, Any]:
    """The entry with ``choose`` and every catalogue key replaced by ``bearing``'s values.

    Key order: id, designation, type, at, dimensions and ratings, then the designer's
    other keys as written.
    """
    gone = {S.BEARING_FORMS.key, *S.BEARING_FORMS.excludes}
    out: dict[str, Any] = {"id": entry["id"]}
    if designation is not None:
        out["designation"] = designation
    out["type"] = bearing.kind.value
    out["at"] = entry["at"]
    for key, attr, unit in QUANTITY_KEYS:
        value = getattr(bearing, attr)
        if value is not None:
            out[key] = f"{_number(value)} {unit}"
    for key in FACTOR_KEYS:
        value = getattr(bearing, key)
        if value is not None:
            out[key] = float(value)
    if bearing.pressure_centre_offset_mm != 0.0:
        out["pressure_centre_offset"] = f"{_number(bearing.pressure_centre_offset_mm)} mm"
    for key, value in entry.items():
        if key not in out and key not in gone:
            out[key] = value
    # a set or ribs the choice settled on (to_bearing's rows, arrangement, ribs)
    given = {"rows": entry.get("rows", 1),
             "arrangement": entry.get("arrangement", SetArrangement.SINGLE.value),
             "ribs": entry.get("ribs", False)}
    chosen = {"rows": bearing.rows, "arrangement": bearing.arrangement.value,
              "ribs": bearing.ribs}
    for key, value in chosen.items():
        if value != given[key]:
            out[key] = value
    return out


def _number(value: float) -> str:
    """Shortest text of ``value`` that reads back to the same float (``52000``, ``0.1``)."""
    text = repr(float(value))
    return text[:-2] if text.endswith(".0") else text


def _designation(catalogue_path: Path, bearing: Bearing) -> str | None:
    """Designation of the one catalogue row that ``bearing`` was built from, else None."""
    from shaftsys.io.catalogue import read_catalogue

    try:
        cat = read_catalogue(catalogue_path)
    except ModelError:
        return None
    scale = 1.0
    if bearing.arrangement in {SetArrangement.BACK_TO_BACK, SetArrangement.FACE_TO_FACE,
                               SetArrangement.TANDEM} and bearing.rows > 1:
        scale = float(bearing.rows)  # C0 of a matched set = i C0 (ISO 76)
    B = math.nan if bearing.B_mm is None else bearing.B_mm

    def near(column: np.ndarray, value: float) -> np.ndarray:
        return np.isclose(column, value, rtol=1e-12, atol=0.0, equal_nan=True)

    match = (cat.of_kind(bearing.kind) & near(cat.d_mm, bearing.d_mm)
             & near(cat.D_mm, bearing.D_mm) & near(cat.B_mm, B)
             & near(cat.C0_N * scale, bearing.C0_N))
    if scale == 1.0:
        match &= near(cat.C_N, bearing.C_N)
    rows = np.flatnonzero(match)
    return cat.designation[int(rows[0])] if len(rows) == 1 else None


def _move_catalogue_paths(entries: dict[str, tuple[list[Any], int]], source_dir: Path,
                          out_dir: Path) -> None:
    """Relative catalogue paths of seats still open, re-rooted from ``source_dir``."""
    for bearings, i in entries.values():
        choose = bearings[i].get("choose") if isinstance(bearings[i], dict) else None
        if not isinstance(choose, dict):
            continue
        name = choose.get("catalogue")
        if not isinstance(name, str) or Path(name).is_absolute():
            continue
        target = os.path.abspath(source_dir / name)
        try:
            choose["catalogue"] = os.path.relpath(target, os.path.abspath(out_dir))
        except ValueError:  # another drive
            choose["catalogue"] = target


def _same_file(a: Path, b: Path) -> bool:
    try:
        if a.exists() and b.exists():
            return os.path.samefile(a, b)
    except OSError:
        pass
    return os.path.realpath(a) == os.path.realpath(b)


def _comment_safe(text: str) -> str:
    """``text`` with control characters (which a model file may not hold) as spaces."""
    return "".join(" " if unicodedata.category(c) == "Cc" else c for c in text).rstrip()


class _Dumper(yaml.SafeDumper):
    """Block style; lists of plain values on one line; no anchors."""

    def ignore_aliases(self, data: Any) -> bool:
        return True


def _represent_list(dumper: yaml.SafeDumper, data: list[Any]) -> yaml.Node:
    flow = all(not isinstance(v, dict | list) for v in data)
    return dumper.represent_sequence("tag:yaml.org,2002:seq", data, flow_style=flow)


_Dumper.add_representer(list, _represent_list)


def _dump(data: Any) -> str:
    return yaml.dump(data, Dumper=_Dumper, sort_keys=False, default_flow_style=False,
                     allow_unicode=True, width=100)


__all__ = ["FACTOR_KEYS", "QUANTITY_KEYS", "filled_model_text", "moved_model_text",
           "write_filled_model", "write_moved_model"]
