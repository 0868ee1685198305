"""A model file is data: no object tags, no alias bombs, no huge or non-UTF-8 files."""

from __future__ import annotations

import time
from pathlib import Path
from typing import Any

import pytest

from shaftsys.cli import main
from shaftsys.errors import ModelError
from shaftsys.io.loader import load_model, load_model_text
from shaftsys.io.yamlsource import MAX_FILE_BYTES, parse_yaml


def test_object_tag_refused_and_not_executed(tmp_path: Path, model_yaml: Any, line_of: Any,
                                             capsys: pytest.CaptureFixture[str]) -> None:
    marker = tmp_path / "executed"
    tag_line = f'name: !!python/object/apply:os.system ["touch {marker}"]'
    path, text = model_yaml(text_edit=lambda t: t.replace("name: test shaft", tag_line))
    with pytest.raises(ModelError) as info:
        load_model(path)
    assert "python/object/apply:os.system" in info.value.message
    assert "not allowed" in info.value.message
    assert info.value.line == line_of(text, "name: !!python")
    assert info.value.field == "name"
    code = main(["validate", str(path)])
    out, err = capsys.readouterr()
    assert code == 2
    assert out == ""
    assert "Traceback" not in err
    assert len(err.strip().splitlines()) == 1
    assert not marker.exists()


@pytest.mark.parametrize("tagged", [
    "!!python/name:os.system",
    "!!python/object/new:os.system [x]",
    "!!binary aGVsbG8=",
    "!custom 3",
])
def test_every_non_plain_tag_refused(tagged: str) -> None:
    with pytest.raises(ModelError, match="not allowed"):
        parse_yaml(f"a: 1\nb: {tagged}\n", "t.yaml")


def test_tagged_mapping_key_refused() -> None:
    with pytest.raises(ModelError) as info:
        parse_yaml("? !!python/name:os.system\n: 1\n", "t.yaml")
    assert "not allowed" in info.value.message


def _billion_laughs(levels: int = 9) -> str:
    """The classic alias bomb: 10 ** levels leaves from a few hundred bytes."""
    lines = ['a0: &a0 ["lol","lol","lol","lol","lol","lol","lol","lol","lol","lol"]']
    for i in range(1, levels + 1):
        refs = ",".join([f"*a{i - 1}"] * 10)
        lines.append(f"a{i}: &a{i} [{refs}]")
    return "\n".join(lines) + "\n"


def test_alias_bomb_refused() -> None:
    text = _billion_laughs()
    assert len(text) < 1000
    start = time.perf_counter()
    with pytest.raises(ModelError) as info:
        load_model_text(text, "bomb.yaml")
    elapsed = time.perf_counter() - start
    assert "expand" in info.value.message
    # Sanity guard only (not a timing test): a full expansion would take hours.
    assert elapsed < 5.0


def test_alias_bomb_refused_by_cli(tmp_path: Path, capsys: pytest.CaptureFixture[str]
                                   ) -> None:
    path = tmp_path / "bomb.yaml"
    path.write_text(_billion_laughs(), encoding="utf-8")
    assert main(["validate", str(path)]) == 2
    out, err = capsys.readouterr()
    assert out == ""
    assert "expand" in err
    assert "Traceback" not in err


def test_merge_key_for_a_bearing(model_yaml: Any) -> None:
    """Bearing B takes everything but id, station and axial role from A's anchor."""

    def anchor(text: str) -> str:
        start = text.index("  - id: B\n")
        end = text.index("  elements:\n")
        merged = ("  - <<: *brg\n"
                  "    id: B\n"
                  "    at: 350 mm\n"
                  "    axial: float\n")
        text = text[:start] + merged + text[end:]
        return text.replace("  - id: A\n", "  - &brg\n    id: A\n")

    path, text = model_yaml(
        edit=lambda m: m["shafts"][0]["bearings"][0].update(C="31 kN", B="18 mm"),
        text_edit=anchor)
    assert "<<: *brg" in text
    model = load_model(path)
    a, b = model.shafts[0].bearings
    assert (a.id, b.id) == ("A", "B")
    assert b.x_mm == 350.0
    assert b.axial.value == "float"
    assert a.axial.value == "both"
    # merged from A: C = 31 kN = 31000 N, C0 = 19 kN, width 18 mm, bore 40 mm, D 80 mm
    assert (b.C_N, b.C0_N, b.B_mm, b.d_mm, b.D_mm) == (31000.0, 19000.0, 18.0, 40.0, 80.0)


def test_merge_key_errors_point_at_the_merged_value(model_yaml: Any, line_of: Any) -> None:
    """A bad value inherited through ``<<`` is reported at its line in the anchor."""

    def anchor(text: str) -> str:
        start = text.index("  - id: B\n")
        end = text.index("  elements:\n")
        text = text[:start] + "  - <<: *brg\n    id: B\n    at: 350 mm\n" + text[end:]
        return text.replace("  - id: A\n", "  - &brg\n    id: A\n")

    path, text = model_yaml(text_edit=anchor)
    # A is locating (axial: both); B inherits it -> two locating bearings.
    with pytest.raises(ModelError) as info:
        load_model(path)
    assert "both locate in both directions" in info.value.message
    assert info.value.line == line_of(text, "axial: both")
    assert info.value.field == "shafts[s1].bearings[B].axial"


def test_file_over_size_limit_refused(tmp_path: Path, model_yaml: Any,
                                      capsys: pytest.CaptureFixture[str]) -> None:
    filler = "# " + "x" * 97 + "\n"
    count = MAX_FILE_BYTES // len(filler) + 10
    path, _ = model_yaml(text_edit=lambda t: t + filler * count)
    assert path.stat().st_size > MAX_FILE_BYTES
    with pytest.raises(ModelError) as info:
        load_model(path)
    assert "larger than" in info.value.message
    assert info.value.file == str(path)
    assert main(["validate", str(path)]) == 2
    assert "larger than" in capsys.readouterr().err
    # The text entry point has the same limit.
    with pytest.raises(ModelError, match="larger than"):
        load_model_text(path.read_text(encoding="utf-8"), str(path))


def test_non_utf8_bytes_refused_with_line(tmp_path: Path, model_yaml: Any, line_of: Any,
                                          capsys: pytest.CaptureFixture[str]) -> None:
    _, text = model_yaml()
    line = line_of(text, "name: test shaft")
    data = text.encode("utf-8").replace(b"name: test shaft", b"name: test \xff\xfe shaft")
    path = tmp_path / "latin.yaml"
    path.write_bytes(data)
    with pytest.raises(ModelError) as info:
        load_model(path)
    assert info.value.line == line
    assert "UTF-8" in info.value.message
    assert main(["validate", str(path)]) == 2
    err = capsys.readouterr().err
    assert f"{path}:{line}:" in err
    assert "Traceback" not in err


def test_duplicate_key_refused_with_line(model_yaml: Any, line_of: Any) -> None:
    path, text = model_yaml(text_edit=lambda t: t.replace("    C0: 19 kN\n    axial: float",
                                                          "    C0: 19 kN\n    C0: 20 kN\n"
                                                          "    axial: float"))
    with pytest.raises(ModelError) as info:
        load_model(path)
    assert "appears twice" in info.value.message
    assert info.value.line == line_of(text, "C0: 20 kN")
    assert info.value.field == "shafts[0].bearings[1].C0"


def test_empty_file_refused(tmp_path: Path) -> None:
    path = tmp_path / "empty.yaml"
    path.write_text("# nothing here\n", encoding="utf-8")
    with pytest.raises(ModelError, match="empty"):
        load_model(path)
