"""The shipped JSON Schema stays equal to the one generated from the format tables.

Regenerate the shipped copy with ``python -m shaftsys schema -o shaftsys/model.schema.json``
after changing ``shaftsys/io/spec.py``. Validity is checked with the reference
implementation ``jsonschema`` (Draft 2020-12 meta-schema).
"""

from __future__ import annotations

import json
from pathlib import Path
from typing import Any

import jsonschema
import pytest
import yaml

import shaftsys
from shaftsys.io import spec as S
from shaftsys.io.schema import model_schema

SHIPPED = Path(shaftsys.__file__).resolve().parent / "model.schema.json"


def test_shipped_schema_equals_generated() -> None:
    assert SHIPPED.is_file(), "run: python -m shaftsys schema -o shaftsys/model.schema.json"
    shipped = json.loads(SHIPPED.read_text(encoding="utf-8"))
    assert shipped == model_schema(), (
        "shaftsys/model.schema.json is stale: regenerate it with "
        "'python -m shaftsys schema -o shaftsys/model.schema.json'")


def test_shipped_schema_is_a_valid_draft_2020_12_schema() -> None:
    schema = json.loads(SHIPPED.read_text(encoding="utf-8"))
    assert schema["$schema"] == "https://json-schema.org/draft/2020-12/schema"
    jsonschema.Draft202012Validator.check_schema(schema)


def test_every_section_and_element_type_is_in_the_schema() -> None:
    schema = model_schema()
    for name, fields in S.SECTIONS.items():
        section = schema if name == "model" else schema["$defs"][name]
        assert set(section["properties"]) == set(fields), name
        assert section["additionalProperties"] is False
        assert set(section["required"]) == {k for k, f in fields.items() if f.required}
    types = [v["properties"]["type"]["const"] for v in schema["$defs"]["element"]["oneOf"]]
    assert types == list(S.ELEMENT_TYPES)


def _validator() -> jsonschema.Draft202012Validator:
    return jsonschema.Draft202012Validator(model_schema())


def test_base_model_validates(model_yaml: Any) -> None:
    _, text = model_yaml()
    assert list(_validator().iter_errors(yaml.safe_load(text))) == []


@pytest.mark.parametrize("edit", [
    lambda m: m["shafts"][0]["bearings"][0].update(diamter="40 mm"),   # unknown key
    lambda m: m["shafts"][0]["bearings"][0].pop("C"),                  # missing key
    lambda m: m["shafts"][0]["bearings"][0].update(axial="sideways"),  # bad choice
    lambda m: m["shafts"][0]["elements"][0].update(type="cam"),        # bad element type
    lambda m: m.update(shaftsys="one"),                                # not an integer
])
def test_schema_rejects_what_the_loader_rejects(model_yaml: Any, edit: Any) -> None:
    _, text = model_yaml(edit=edit)
    assert list(_validator().iter_errors(yaml.safe_load(text)))
