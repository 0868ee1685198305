"""The JSON Schema of the model file, generated from :mod:`shaftsys.io.spec`.

A copy ships as ``shaftsys/model.schema.json`` so editors can check a model while it
is typed; a test keeps the copy equal to what this module generates.
"""

from __future__ import annotations

from typing import Any

from shaftsys.io import spec as S

_QUANTITY = {"oneOf": [{"type": "number"}, {"type": "string", "pattern": r"^\s*[-+0-9.]"}]}


def _unit_note(f: S.Field) -> str:
    """How a quantity is written: with its unit (a bare number only under ``units:``)."""
    if f.dim in S.UNITLESS:
        return "[-]"
    unit = S.DEFAULT_UNIT_NOTE.get(f.dim or "", "")
    return f"[with its unit, e.g. '... {unit}'; a bare number only under 'units:']"


def _field(f: S.Field) -> dict[str, Any]:
    out: dict[str, Any]
    if f.kind == "quantity":
        out = {**_QUANTITY, "description": f"{f.doc} {_unit_note(f)}"}
    elif f.kind == "number":
        out = {"type": ["number", "string"], "description": f.doc}
    elif f.kind == "int":
        out = {"type": "integer", "description": f.doc}
    elif f.kind in {"str", "id"}:
        out = {"type": ["string", "integer"], "description": f.doc}
    elif f.kind == "bool":
        out = {"type": "boolean", "description": f.doc}
    elif f.kind == "choice":
        out = {"enum": list(f.choices), "description": f.doc}
    elif f.kind == "choices":
        out = {"type": "array", "items": {"enum": list(f.choices)}, "minItems": 1,
               "uniqueItems": True, "description": f.doc}
    elif f.kind == "quantities":
        out = {"type": "array", "items": _QUANTITY, "minItems": 1,
               "description": f"{f.doc} {_unit_note(f)}"}
    elif f.kind == "vector":
        out = {"type": "array", "items": _QUANTITY, "minItems": 3, "maxItems": 3,
               "description": f.doc}
    elif f.kind == "map":
        out = {"$ref": f"#/$defs/{f.of}", "description": f.doc}
    elif f.kind == "idmap":
        out = {"type": "object", "additionalProperties": {"$ref": f"#/$defs/{f.of}"},
               "description": f.doc}
    elif f.kind == "list":
        out = {"type": "array", "items": {"$ref": f"#/$defs/{f.of}"}, "description": f.doc}
    else:
        out = {"description": f.doc}
    bounds = _bounds(f)
    if bounds and f.kind == "quantity":
        out["oneOf"] = [{"type": "number", **bounds}, _QUANTITY["oneOf"][1]]
    elif bounds and f.kind in {"number", "int"}:
        out.update(bounds)
    if f.kind == "list" and f.max_items is not None:
        out["maxItems"] = f.max_items
    if f.default is not None and f.kind not in {"list", "map", "idmap"}:
        out["default"] = list(f.default) if isinstance(f.default, tuple) else f.default
    return out


def _bounds(f: S.Field) -> dict[str, float]:
    """The field's range for a bare number (in its default unit), as the loader checks
    it: the schema and the loader refuse the same bare numbers.
    """
    out: dict[str, float] = {}
    if f.positive:
        out["exclusiveMinimum"] = 0.0
    if f.non_negative:
        out["minimum"] = 0.0
    if f.minimum is not None:
        out["minimum"] = max(f.minimum, out.get("minimum", f.minimum))
    if f.above is not None:
        out["exclusiveMinimum"] = max(f.above, out.get("exclusiveMinimum", f.above))
    if f.maximum is not None:
        out["maximum"] = f.maximum
    if f.below is not None:
        out["exclusiveMaximum"] = f.below
    return out


def _section(fields: dict[str, S.Field], forms: S.Alternative | None = None
             ) -> dict[str, Any]:
    out: dict[str, Any] = {
        "type": "object",
        "additionalProperties": False,
        "properties": {k: _field(f) for k, f in fields.items()},
        "required": [k for k, f in fields.items() if f.required],
    }
    if forms is not None:
        # with forms.key none of forms.excludes, without it all of forms.requires
        out["if"] = {"required": [forms.key]}
        out["then"] = {"not": {"anyOf": [{"required": [k]} for k in forms.excludes]}}
        out["else"] = {"required": list(forms.requires)}
    return out


def model_schema() -> dict[str, Any]:
    """JSON Schema (draft 2020-12) of a shaftsys model file."""
    defs = {name: _section(fields, S.ALTERNATIVES.get(name))
            for name, fields in S.SECTIONS.items() if name != "model"}
    element_variants = []
    for etype, extra in S.ELEMENT_TYPES.items():
        fields = {**S._ELEMENT_COMMON, **extra}
        sec = _section(fields)
        sec["properties"]["type"] = {"const": etype}
        element_variants.append(sec)
    defs["element"] = {"oneOf": element_variants}
    top = _section(S.MODEL)
    return {
        "$schema": "https://json-schema.org/draft/2020-12/schema",
        "title": "shaftsys model file",
        **top,
        "$defs": defs,
    }
