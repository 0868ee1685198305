"""Locate errors of the numerical core in the model file.

The core names what is wrong by object and attribute of the frozen model
(``bearings[A].C_N``, ``cases[run].temperature``) and, where it concerns an operating
case, by the case id (:attr:`shaftsys.errors.ModelError.case`). :func:`locate_error`
turns that into the model file's terms: the file, the line of the object, and the field
path as the file spells it (``shafts[s1].bearings[A].C``). The key of an attribute is
found in the model-file format itself (:mod:`shaftsys.io.spec`), never by reading the
message text.
"""

from __future__ import annotations

import re
from typing import Any

from shaftsys.errors import ModelError
from shaftsys.io import spec as S
from shaftsys.model import Model

#: The field path the core writes: ``<group>[<id>]`` with an optional ``.<attribute>``.
_OBJECT_PATH = re.compile(r"^(bearings|cases|links|elements|shafts)\[([^\]]*)\](?:\.(\w+))?$")
#: Unit suffixes of model attributes (see :mod:`shaftsys.units`), longest first.
_UNIT_SUFFIXES = ("_Nmm_rad", "_N_mm", "_kg_m3", "_mm2_s", "_Nmm", "_rpm", "_deg", "_mm",
                  "_kg", "_N", "_h", "_C")
#: Attributes whose file key is not the attribute without its unit.
_RENAMED = {"x_mm": "at", "kind": "type", "target_reliability": "reliability",
            "poisson": "nu", "mesh_angle_deg": "mesh_angle"}
#: The spec table of each object group.
_TABLES: dict[str, dict[str, S.Field]] = {"bearings": S.BEARING, "cases": S.CASE,
                                          "links": S.LINK, "shafts": S.SHAFT,
                                          "elements": S._ELEMENT_COMMON}


def file_key(group: str, attribute: str) -> str:
    """The model-file key of ``attribute`` of an object in ``group`` (``bearings``...).

    ``C_N`` -> ``C``, ``limiting_speed_rpm`` -> ``limiting_speed``, ``x_mm`` -> ``at``.
    An attribute with no key in the format is returned unchanged.
    """
    table = _TABLES.get(group, {})
    if attribute in table:
        return attribute
    if attribute in _RENAMED:
        return _RENAMED[attribute]
    for suffix in _UNIT_SUFFIXES:
        if attribute.endswith(suffix) and attribute[: -len(suffix)] in table:
            return attribute[: -len(suffix)]
    return attribute


def locate_error(exc: ModelError, model: Model) -> ModelError:
    """``exc`` with the model file, line and file field path added where it has none.

    Returns ``exc`` itself when it is already located or the model has no source file.
    """
    if exc.file is not None or model.source is None:
        return exc
    field_path, line = exc.field, exc.line
    found = _OBJECT_PATH.match(field_path or "")
    if found is not None:
        group, ident, attr = found.groups()
        key = f".{file_key(group, attr)}" if attr else ""
        for s in model.shafts:
            owned: list[tuple[Any, str]] = [(s, "shafts"),
                                            *((b, "bearings") for b in s.bearings),
                                            *((e, "elements") for e in s.elements)]
            for obj, kind in owned:
                if kind == group and obj.id == ident:
                    line = obj.line if obj.line is not None else line
                    field_path = (f"shafts[{s.id}]{key}" if kind == "shafts" else
                                  f"shafts[{s.id}].{kind}[{ident}]{key}")
        for c in model.cases:
            if group == "cases" and c.id == ident and c.line is not None:
                line = c.line
        for k in model.links:
            if group == "links" and k.id == ident and k.line is not None:
                line = k.line
    elif field_path == "links" and model.links and line is None:
        line = model.links[0].line
    if line is None and exc.case is not None:
        case = next((c for c in model.cases if c.id == exc.case), None)
        line = case.line if case is not None else None
    return ModelError(exc.message, file=model.source, line=line, field=field_path,
                      expected=exc.expected, case=exc.case)


__all__ = ["file_key", "locate_error"]
