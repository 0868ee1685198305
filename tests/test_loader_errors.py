"""Every bad model file gives one clear ModelError: file, exact line, field path, expectation.

Each case edits the small valid model of ``conftest.py`` in one place. The expected line
is the line of the offending key in the written text (found with ``line_of`` on the text
the test wrote, not computed by shaftsys); the expected field path and the expected
wording are typed in literally. The same files go through ``shaftsys validate``: exit
code 2, one line on stderr, no traceback.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import pytest

from shaftsys.cli import main
from shaftsys.errors import ModelError
from shaftsys.io.loader import load_model

Edit = Callable[[dict[str, Any]], object]
NO_FIELD = "<syntax error: no field>"


def _bearing(m: dict[str, Any], i: int) -> dict[str, Any]:
    return m["shafts"][0]["bearings"][i]


def _element(m: dict[str, Any], i: int) -> dict[str, Any]:
    return m["shafts"][0]["elements"][i]


def _case(m: dict[str, Any], i: int) -> dict[str, Any]:
    return m["cases"][i]


def _rename(mapping: dict[str, Any], old: str, new: str) -> None:
    mapping[new] = mapping.pop(old)


def _three_cross_locating(m: dict[str, Any]) -> None:
    """A (+x) and B (-x) cross-locate; a third bearing C also takes +x thrust."""
    _bearing(m, 0)["axial"] = "+x"
    _bearing(m, 1)["axial"] = "-x"
    third = {**_bearing(m, 1), "id": "C", "at": "250 mm", "axial": "+x"}
    m["shafts"][0]["bearings"].append(third)


def _hours_in_second_case(m: dict[str, Any]) -> None:
    _case(m, 1).pop("share")
    _case(m, 1)["hours"] = "2000 h"


@dataclass(frozen=True)
class Bad:
    """One bad input: how to make it and what the error must say."""

    name: str
    needle: str            # text of the offending line
    field: str             # expected field path
    expected: str          # substring of what would have been valid
    message: str           # substring of the message
    edit: Edit | None = None
    text_edit: Callable[[str], str] | None = None
    occurrence: int = 1    # which line holding ``needle`` is meant


BAD_INPUTS = [
    Bad("invalid YAML syntax", needle="C0: 19 kN: 3", field=NO_FIELD,
        expected="valid YAML", message="invalid YAML",
        text_edit=lambda t: t.replace("    C0: 19 kN\n    axial: float",
                                      "    C0: 19 kN: 3\n    axial: float")),
    Bad("unknown key with suggestion", needle="diamter: 120 mm",
        field="shafts[s1].elements[0].diamter", expected="pitch_diameter",
        message="unknown key 'diamter'; did you mean 'pitch_diameter'?",
        edit=lambda m: _rename(_element(m, 0), "pitch_diameter", "diamter")),
    Bad("unknown step key with suggestion", needle="filet: 1 mm",
        field="shafts[s1].steps[1].filet", expected="fillet",
        message="did you mean 'fillet'?",
        edit=lambda m: m["shafts"][0]["steps"][1].update(filet="1 mm")),
    Bad("unknown top-level key", needle="shaft:", field="shaft", expected="shafts",
        message="did you mean 'shafts'?",
        text_edit=lambda t: t.replace("name: test shaft\n",
                                      "name: test shaft\nshaft: oops\n")),
    Bad("missing required key", needle="  - id: B", field="shafts[s1].bearings[1].C",
        expected="a key 'C'", message="'C' is missing",
        edit=lambda m: _bearing(m, 1).pop("C")),
    Bad("missing top-level section", needle="shaftsys: 1", field="cases",
        expected="a key 'cases'", message="'cases' is missing",
        edit=lambda m: m.pop("cases")),
    Bad("missing bearing id", needle="  - type: deep_groove_ball",
        field="shafts[s1].bearings[1].id", expected="a key 'id'",
        message="'id' is missing", edit=lambda m: _bearing(m, 1).pop("id")),
    Bad("bearing id reused", needle="  - id: A", occurrence=2,
        field="shafts[s1].bearings[A].id", expected="unique",
        message="id 'A' is used twice", edit=lambda m: _bearing(m, 1).update(id="A")),
    Bad("case id reused", needle="- id: run", occurrence=2, field="cases[run].id",
        expected="unique case ids", message="case id 'run' is used twice",
        edit=lambda m: _case(m, 1).update(id="run")),
    Bad("wrong dimension for a length", needle="d: 45 kg", field="shafts[s1].steps[1].d",
        expected="a length such as '45 mm'", message="'45 kg' has units of kg",
        edit=lambda m: m["shafts"][0]["steps"][1].update(d="45 kg")),
    Bad("zero diameter", needle="    d: 0", field="shafts[s1].steps[1].d",
        expected="a value > 0", message="must be positive",
        edit=lambda m: m["shafts"][0]["steps"][1].update(d=0)),
    Bad("negative rating", needle="C: -5 kN", field="shafts[s1].bearings[1].C",
        expected="a value > 0", message="must be positive, got -5000",
        edit=lambda m: _bearing(m, 1).update(C="-5 kN")),
    # The YAML reader refuses .nan before the field is known: its path uses list indices.
    Bad("YAML .nan", needle="C0: .nan", field="shafts[0].bearings[1].C0",
        expected="a finite number", message="is not a finite number",
        text_edit=lambda t: t.replace("    C0: 19 kN\n    axial: float",
                                      "    C0: .nan\n    axial: float")),
    Bad("infinite quantity", needle="D: inf mm", field="shafts[s1].bearings[1].D",
        expected="a length", message="'inf mm' is not a finite number",
        edit=lambda m: _bearing(m, 1).update(D="inf mm")),
    Bad("bearing outside the shaft", needle="at: 450 mm", field="shafts[s1].bearings[B].at",
        expected="between 0 and 400 mm", message="outside the shaft",
        edit=lambda m: _bearing(m, 1).update(at="450 mm")),
    Bad("element outside the shaft", needle="at: 401 mm",
        field="shafts[s1].elements[coupling1].at", expected="between 0 and 400 mm",
        message="outside the shaft", edit=lambda m: _element(m, 1).update(at="401 mm")),
    Bad("share and hours mixed", needle="hours: 2000 h", field="cases[slow].hours",
        expected="the same one of share or hours", message="mixed",
        edit=_hours_in_second_case),
    Bad("shares not summing to 1", needle="share: 0.7", field="cases[run].share",
        expected="shares that sum to 1", message="add up to 0.9, not 1",
        edit=lambda m: _case(m, 1).update(share=0.2)),
    Bad("one radial support", needle="  bearings:", field="shafts[s1].bearings",
        expected="at least two radial bearings", message="cannot be held",
        edit=lambda m: m["shafts"][0]["bearings"].pop()),
    Bad("no bearing takes axial load", needle="  bearings:", field="shafts[s1].bearings",
        expected="axial: both", message="can slide axially",
        edit=lambda m: _bearing(m, 0).update(axial="float")),
    Bad("two locating bearings", needle="axial: both", occurrence=2,
        field="shafts[s1].bearings[B].axial", expected="one locating bearing",
        message="both locate in both directions",
        edit=lambda m: _bearing(m, 1).update(axial="both")),
    Bad("two bearings taking +x thrust", needle="axial: +x", occurrence=2,
        field="shafts[s1].bearings[C].axial", expected="one +x and one -x",
        message="more than one bearing takes thrust in the same direction",
        edit=_three_cross_locating),
    Bad("needle bearing locating", needle="axial: both", field="shafts[s1].bearings[A].axial",
        expected="axial: float", message="cannot locate the shaft axially",
        edit=lambda m: _bearing(m, 0).update(type="needle_roller")),
    Bad("rib-less cylindrical roller locating", needle="axial: both",
        field="shafts[s1].bearings[A].axial", expected="axial: float",
        message="without ribs cannot locate",
        edit=lambda m: _bearing(m, 0).update(type="cylindrical_roller")),
    Bad("unknown input element", needle="element: motor", field="cases[run].input.element",
        expected="one of: gear1, coupling1", message="'motor' is not a torque-carrying",
        edit=lambda m: _case(m, 0)["input"].update(element="motor")),
    Bad("unknown output element", needle="gear2: 1.0", field="cases[run].outputs.gear2",
        expected="one of: gear1, coupling1", message="'gear2' is not a torque-carrying",
        edit=lambda m: _case(m, 0).update(outputs={"gear2": 1.0})),
    Bad("unknown load element", needle="thrst:", field="cases[run].loads.thrst",
        expected="one of: thrust", message="'thrst' is not a load element",
        edit=lambda m: _case(m, 0).update(loads={"thrst": {"force": ["1 N", 0, 0]}})),
    # A missing key is reported at the line of the mapping that lacks it.
    Bad("helical gear without hand", needle="- id: gear1",
        field="shafts[s1].elements[gear1].hand", expected="hand: right or left",
        message="needs its helix hand",
        edit=lambda m: _element(m, 0).update(helix_angle="15 deg")),
    Bad("unknown material", needle="material: stel", field="shafts[s1].material",
        expected="steel", message="material 'stel' is not defined",
        edit=lambda m: m["shafts"][0].update(material="stel")),
]


@pytest.fixture(params=BAD_INPUTS, ids=lambda b: b.name)
def bad_file(request: pytest.FixtureRequest, model_yaml: Any, line_of: Any
             ) -> tuple[Bad, Path, int]:
    bad: Bad = request.param
    path, text = model_yaml(edit=bad.edit, text_edit=bad.text_edit)
    return bad, path, line_of(text, bad.needle, bad.occurrence)


def test_model_error_names_file_line_field_and_expectation(
        bad_file: tuple[Bad, Path, int]) -> None:
    bad, path, line = bad_file
    with pytest.raises(ModelError) as info:
        load_model(path)
    exc = info.value
    assert exc.file == str(path)
    assert exc.line == line
    if bad.field != NO_FIELD:
        assert exc.field == bad.field
    assert exc.expected is not None and bad.expected in exc.expected
    assert bad.message in exc.message
    text = str(exc)
    assert text.startswith(f"{path}:{line}: ")
    if bad.field != NO_FIELD:
        assert f": {bad.field}: " in text
    assert "(expected " in text


def test_validate_command_exit_2_one_message_no_traceback(
        bad_file: tuple[Bad, Path, int], capsys: pytest.CaptureFixture[str]) -> None:
    bad, path, line = bad_file
    code = main(["validate", str(path)])
    out, err = capsys.readouterr()
    assert code == 2
    assert out == ""
    assert "Traceback" not in err
    lines = err.strip().splitlines()
    assert len(lines) == 1
    assert lines[0].startswith(f"shaftsys: error: {path}:{line}: ")
    assert bad.message in lines[0]


def test_the_valid_base_model_passes(model_yaml: Any, capsys: pytest.CaptureFixture[str]
                                     ) -> None:
    """Guard: the unedited base model is valid, so every error above comes from its edit."""
    path, _ = model_yaml()
    model = load_model(path)
    assert [b.id for b in model.shafts[0].bearings] == ["A", "B"]
    assert main(["validate", str(path)]) == 0
    assert "valid model" in capsys.readouterr().out


def test_missing_file_is_a_model_error(tmp_path: Path) -> None:
    path = tmp_path / "nope.yaml"
    with pytest.raises(ModelError) as info:
        load_model(path)
    assert info.value.file == str(path)
    assert "cannot read the model file" in info.value.message
