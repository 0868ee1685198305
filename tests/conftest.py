"""Shared fixtures: a small valid single-shaft model written as YAML into ``tmp_path``.

The base model (block style, one key per line, so that every key has its own line):

* shaft ``s1``: three steps 100 mm / 200 mm / 100 mm long, d = 40 / 50 / 40 mm
  (overall 400 mm), material ``steel`` from the ``materials`` section;
* bearings ``A`` (deep groove ball at 50 mm, ``axial: both``) and ``B`` (deep groove
  ball at 350 mm, ``axial: float``);
* elements ``gear1`` (spur gear at 200 mm), ``coupling1`` (at 390 mm) and ``thrust``
  (a process load at 200 mm);
* duty cases ``run`` (share 0.7) and ``slow`` (share 0.3), power in at the coupling and
  out at the gear.

Use the ``model_yaml`` fixture: ``path, text = model_yaml(edit=..., text_edit=...)``;
``edit`` changes the model as a plain dict before it is dumped, ``text_edit`` the YAML
text after. ``line_of(text, needle)`` gives the 1-based line of the one line holding
``needle``.
"""

from __future__ import annotations

import copy
from collections.abc import Callable
from pathlib import Path
from typing import Any

import pytest
import yaml

BASE_MODEL: dict[str, Any] = {
    "shaftsys": 1,
    "name": "test shaft",
    "materials": {"steel": {"E": "210 GPa", "nu": 0.3, "density": "7850 kg/m^3"}},
    "shafts": [
        {
            "id": "s1",
            "material": "steel",
            "steps": [
                {"length": "100 mm", "d": "40 mm"},
                {"length": "200 mm", "d": "50 mm"},
                {"length": "100 mm", "d": "40 mm"},
            ],
            "bearings": [
                {"id": "A", "type": "deep_groove_ball", "at": "50 mm", "d": "40 mm",
                 "D": "80 mm", "C": "30 kN", "C0": "19 kN", "axial": "both"},
                {"id": "B", "type": "deep_groove_ball", "at": "350 mm", "d": "40 mm",
                 "D": "80 mm", "C": "30 kN", "C0": "19 kN", "axial": "float"},
            ],
            "elements": [
                {"id": "gear1", "type": "gear", "at": "200 mm", "pitch_diameter": "120 mm",
                 "mesh_angle": "0 deg"},
                {"id": "coupling1", "type": "coupling", "at": "390 mm"},
                {"id": "thrust", "type": "load", "at": "200 mm",
                 "force": ["500 N", 0, 0]},
            ],
        }
    ],
    "cases": [
        {"id": "run", "share": 0.7, "speed": "1450 rpm",
         "input": {"element": "coupling1", "power": "7.5 kW"},
         "outputs": {"gear1": 1.0}},
        {"id": "slow", "share": 0.3, "speed": "700 rpm",
         "input": {"element": "coupling1", "power": "3 kW"},
         "outputs": {"gear1": 1.0}},
    ],
}


def base_model() -> dict[str, Any]:
    """A fresh deep copy of the base model as plain YAML-ready values."""
    return copy.deepcopy(BASE_MODEL)


def dump_model(model: dict[str, Any]) -> str:
    """Block-style YAML text of a model dict (one key per line, keys in given order)."""
    # Lists of scalars (vectors) stay in flow style so a vector is one line.
    class _Dumper(yaml.SafeDumper):
        pass

    def _list(dumper: yaml.SafeDumper, data: list[Any]) -> yaml.Node:
        flow = all(not isinstance(v, dict | list) for v in data)
        return dumper.represent_sequence("tag:yaml.org,2002:seq", data, flow_style=flow)

    _Dumper.add_representer(list, _list)
    return yaml.dump(model, Dumper=_Dumper, sort_keys=False, default_flow_style=False)


def find_line(text: str, needle: str, occurrence: int = 1) -> int:
    """1-based line number of the ``occurrence``-th line of ``text`` containing ``needle``."""
    hits = [i + 1 for i, line in enumerate(text.splitlines()) if needle in line]
    assert len(hits) >= occurrence, f"{needle!r} occurs {len(hits)} times in the text"
    return hits[occurrence - 1]


ModelYaml = Callable[..., tuple[Path, str]]


@pytest.fixture
def model_yaml(tmp_path: Path) -> ModelYaml:
    """Write the base model (optionally edited) to ``tmp_path`` and return (path, text)."""

    def make(edit: Callable[[dict[str, Any]], object] | None = None,
             text_edit: Callable[[str], str] | None = None,
             name: str = "model.yaml") -> tuple[Path, str]:
        model = base_model()
        if edit is not None:
            edit(model)
        text = dump_model(model)
        if text_edit is not None:
            text = text_edit(text)
        path = tmp_path / name
        path.write_text(text, encoding="utf-8")
        return path, text

    return make


@pytest.fixture
def line_of() -> Callable[..., int]:
    """The helper :func:`find_line` as a fixture."""
    return find_line


@pytest.fixture(scope="session")
def demo_path() -> Path:
    """The bundled demo model."""
    path = Path(__file__).resolve().parent.parent / "models" / "fan_drive.yaml"
    assert path.is_file()
    return path
