"""Issue 19: a skipped check never reads as a pass, bounded work on any input, singular
systems named in the model's words, and outputs that never replace a link or a FIFO.

Each test is one finding of the mutation fuzzer, run through ``shaftsys.cli.main``
in-process: the right exit code and a located message. The expectations are the
project's contract (DEVELOPERS.md, "Bad input and faults we test"): common practice,
no source, except where a test names one.
"""

from __future__ import annotations

import json
import math
import os
import subprocess
import sys
import threading
import time
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest
from test_hardening import one_error_line, run_cli

from shaftsys.analysis import analyse
from shaftsys.analysis.check_results import CaseDeflection, DeflectionCheck
from shaftsys.bearings.lubrication import a_iso_arrays, viscosity_at
from shaftsys.errors import ModelError, NumericalError
from shaftsys.io import spec as S
from shaftsys.io.loader import load_model_text
from shaftsys.io.output import STALE_PART_AGE_S, write_json
from shaftsys.io.quantities import QuantityProblem, to_internal
from shaftsys.io.schema import model_schema

ROOT = Path(__file__).resolve().parent.parent
FAN = (ROOT / "models" / "fan_drive.yaml").read_text(encoding="utf-8")
NO_STRENGTH = FAN.replace("    Su: 650 MPa\n", "").replace("    Sy: 430 MPa\n", "")


def _write(tmp_path: Path, text: str, name: str = "m.yaml") -> Path:
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def _line(text: str, needle: str) -> int:
    hits = [i + 1 for i, ln in enumerate(text.splitlines()) if needle in ln]
    assert len(hits) == 1, hits
    return hits[0]


# ============================================================================ verdicts
def test_fatigue_without_strength_is_not_evaluated_and_fails_the_run(tmp_path: Path) -> None:
    """The fan model with Su and Sy removed: exit 1, the JSON says not evaluated and what
    is missing (before: 'ok: true', 'all supports pass', exit 0).
    """
    path = _write(tmp_path, NO_STRENGTH)
    out = tmp_path / "r.json"
    code, stdout, _ = run_cli(["check", str(path), "--json", str(out)])
    assert code == 1
    data = json.loads(out.read_text())
    assert data["ok"] is False and data["verdict"] == "not evaluated"
    [missing] = data["not_evaluated"]
    assert "fatigue of shaft 'fan_shaft' not evaluated" in missing
    assert "material 'C45' has no Su, Sy" in missing and "not_required" in missing
    shaft = data["shaft_checks"]["shafts"][0]
    assert shaft["fatigue_verdict"] == "not evaluated" and shaft["verdict"] == "not evaluated"
    assert shaft["fatigue_ok"] is False and shaft["fatigue_required"] is True
    assert shaft["fatigue_not_evaluated_reason"] == "material 'C45' has no Su, Sy"
    assert data["shaft_checks"]["ok"] is False
    assert "VERDICT: NOT EVALUATED (not a pass)" in stdout
    assert "fatigue of shaft 'fan_shaft' not evaluated" in stdout


def test_fatigue_marked_not_required_lets_the_run_pass(tmp_path: Path) -> None:
    """``checks: {fatigue: not_required}``: still reported as not evaluated, no longer
    failing the run (the bearings of the fan model pass).
    """
    text = NO_STRENGTH.replace("lubrication:", "checks: {fatigue: not_required}\n\nlubrication:",
                               1)
    path = _write(tmp_path, text)
    out = tmp_path / "r.json"
    code, stdout, _ = run_cli(["check", str(path), "--json", str(out)])
    assert code == 0
    data = json.loads(out.read_text())
    assert data["verdict"] == "pass" and data["not_evaluated"] == []
    assert data["checks_required"]["fatigue"] is False   # keys are added, never dropped
    shaft = data["shaft_checks"]["shafts"][0]
    assert shaft["fatigue_verdict"] == "not evaluated" and shaft["verdict"] == "pass"
    assert "(not required)" in stdout


def test_checks_section_is_declared_in_the_spec_and_schema(tmp_path: Path) -> None:
    """The ``checks:`` section is read from the spec: an unknown word is refused with its
    line, and the generated schema lists the same choices.
    """
    text = FAN.replace("lubrication:", "checks: {fatigue: optional}\n\nlubrication:", 1)
    path = _write(tmp_path, text)
    code, _, err = run_cli(["check", str(path), "--quiet"])
    assert code == 2
    line = one_error_line(err)
    assert f"{path}:{_line(text, 'checks:')}: checks.fatigue:" in line
    schema = model_schema()
    assert schema["$defs"]["checks"]["properties"]["fatigue"]["enum"] == [
        "required", "not_required"]


def test_unbounded_life_is_stated_never_inf(tmp_path: Path) -> None:
    """Every case slower than ``min_speed``: no bearing wears, so the lives are unbounded;
    the JSON says so with ``life_h: null, life_h_unbounded: true`` and a note, never
    the string "inf" nor a non-finite number.
    """
    path = _write(tmp_path, FAN.replace("min_speed: 10 rpm", "min_speed: 2000 rpm"))
    out = tmp_path / "r.json"
    code, _, _ = run_cli(["check", str(path), "--quiet", "--json", str(out)])
    assert code in (0, 1)
    text = out.read_text()
    assert '"inf"' not in text and "Infinity" not in text and "NaN" not in text
    data = json.loads(text)
    assert data["system"]["life_h"] is None and data["system"]["life_h_unbounded"] is True
    assert "unbounded" in data["system"]["life_note"]
    assert data["shafts"][0]["system"]["life_h_unbounded"] is True


def test_marginal_slope_counts_as_passed_and_is_named() -> None:
    """A bearing slope between the low and high end of its typical range is
    'marginal': within the limit (passes), named as such.
    """
    cases = (CaseDeflection("run", 0.01, 2e-3, "marginal"),)
    check = DeflectionCheck("A", "s1", "bearing", 0.0, 3e-3, 1e-3, None, "test", cases, True)
    assert check.verdict == "marginal" and check.to_dict()["verdict"] == "marginal"
    exceeded = replace(check, ok=False)
    assert exceeded.verdict == "fail"


# ====================================================================== bounded input
@pytest.mark.parametrize(("old", "new", "field", "words"), [
    ("temperature: 60 degC", "temperature: -280 degC", "cases[0].temperature",
     "absolute zero"),
    ("temperature: 60 degC", "temperature: 0 K", "cases[0].temperature", "absolute zero"),
    ("min_speed: 10 rpm", "min_speed: 1e14 rpm", "life.min_speed", "largest allowed"),
    ("{length: 90 mm, d: 45 mm}", '{length: 90 mm, d: "9**9**9 mm"}',
     "shafts[fan_shaft].steps[0].d", "arithmetic is not evaluated"),
    ("{length: 90 mm, d: 45 mm}", "{length: 90 mm, d: 1e15 mm}",
     "shafts[fan_shaft].steps[0].d", "largest allowed"),
    ("    nu: 0.3", "    nu: 0.5", "materials.C45.nu", "not below 0.5"),
    ("wrap_angle: 165 deg", "wrap_angle: 360 deg", "shafts[fan_shaft].elements[0].wrap_angle",
     "not below 360"),
])
def test_out_of_range_values_are_refused_where_they_are(tmp_path: Path, old: str, new: str,
                                                        field: str, words: str) -> None:
    """Each value the fuzzer got through (a NaN viscosity capped at aISO = 50, a life
    never computed, a hang, an unlocated refusal, an exit 3): exit 2 at its own line.
    """
    assert FAN.count(old) == 1
    text = FAN.replace(old, new)
    path = _write(tmp_path, text)
    result: list[tuple[int, str, str]] = []
    worker = threading.Thread(target=lambda: result.append(
        run_cli(["check", str(path), "--quiet"])), daemon=True)
    worker.start()
    worker.join(120.0)  # a hang fails here (no speed is asserted)
    assert result, "the check did not return"
    code, _, err = result[0]
    assert code == 2
    line = one_error_line(err)
    assert f"{path}:{_line(text, new.strip())}: {field}:" in line
    assert words in line


def test_huge_value_is_refused_with_an_excerpt(tmp_path: Path) -> None:
    """A 100 000-character value: refused in ``validate`` with its line, quoting only
    an excerpt and its length.
    """
    text = FAN.replace("{length: 90 mm, d: 45 mm}", '{length: 90 mm, d: "' + "9" * 100_000
                       + ' mm"}')
    path = _write(tmp_path, text)
    code, _, err = run_cli(["validate", str(path), "--quiet"])
    assert code == 2
    line = one_error_line(err)
    assert "shafts[fan_shaft].steps[0].d" in line and "100003 characters" in line
    assert len(line) < 600


@pytest.mark.parametrize("text", ["9**9**9 mm", "1 mm**9**9", "45 mm^999", "(1 mm)**2",
                                  "2 + 3 mm", "1e3 mm" + ")" * 5])
def test_quantity_text_is_never_evaluated_as_arithmetic(text: str) -> None:
    """Only a number and a unit of names with exponents of at most two digits."""
    with pytest.raises(QuantityProblem):
        to_internal(text, "length")


@pytest.mark.parametrize(("text", "dimension", "expected"), [
    # SI Brochure (9th ed.): 1 mm^2/s = 1e-6 m^2/s; 1 kg*m^2 stays; 1/min is 1 rev/min
    ("68 mm^2/s", "viscosity", 68.0), ("0.4 kg*m**2", "inertia", 0.4),
    ("60 1/min", "speed", 60.0), ("45mm", "length", 45.0), ("-1.4 kN", "force", -1400.0),
])
def test_quantity_units_still_read(text: str, dimension: str, expected: float) -> None:
    assert to_internal(text, dimension) == pytest.approx(expected, rel=1e-12)


def test_nan_fails_every_range_check() -> None:
    """NaN compares false, so a check written ``value < minimum`` lets it through; the
    spec's, the viscosity's and aISO's checks are written so that it fails.
    """
    where = S.Where("m.yaml", "materials.x")
    with pytest.raises(ModelError, match="NaN"):
        S._check_range(where, "nu", math.nan, S.MATERIAL["nu"])
    with pytest.raises(ValueError, match="kappa"):
        a_iso_arrays(np.array([math.nan]), np.array([0.5]), np.array([False]),
                     np.array([False]))
    with pytest.raises(ModelError, match="absolute zero"):
        viscosity_at(-280.0, 100.0, 40.0, 11.0, 100.0)


def test_schema_carries_the_loader_bounds() -> None:
    """Poisson's ratio and wrap angle: the schema refuses the same bare numbers as the
    loader (0 <= nu < 0.5; 0 < wrap < 360 deg).
    """
    defs = model_schema()["$defs"]
    nu = defs["material"]["properties"]["nu"]
    assert nu["minimum"] == 0.0 and nu["exclusiveMaximum"] == 0.5
    pulley = next(v for v in defs["element"]["oneOf"]
                  if v["properties"]["type"] == {"const": "pulley"})
    wrap = pulley["properties"]["wrap_angle"]["oneOf"][0]
    assert wrap["exclusiveMinimum"] == 0.0 and wrap["exclusiveMaximum"] == 360.0
    assert defs["shaft"]["properties"]["steps"]["maxItems"] == S.MAX_STEPS


def test_too_many_steps_are_refused(tmp_path: Path) -> None:
    """More steps than the mesh bound allows: refused at the steps list."""
    steps = ", ".join(["{length: 1 mm, d: 45 mm}"] * (S.MAX_STEPS + 1))
    start, end = FAN.index("    steps:\n"), FAN.index("    bearings:\n")
    text = FAN[:start] + f"    steps: [{steps}]\n" + FAN[end:]
    path = _write(tmp_path, text)
    code, _, err = run_cli(["check", str(path), "--quiet"])
    assert code == 2
    line = one_error_line(err)
    assert "shafts[0].steps" in line and f"at most {S.MAX_STEPS} items" in line


# =================================================================== model words
def test_singular_stiffness_is_named_in_the_models_words() -> None:
    """A body step of 0.01 mm between the bearings (built in Python, below the loader's
    bound): exit-3 error naming the shaft, the plane, the free span and what to check.
    """
    model = load_model_text(NO_STRENGTH.replace(
        "lubrication:", "checks: {fatigue: not_required}\n\nlubrication:", 1), "fan.yaml")
    shaft = model.shafts[0]
    steps = list(shaft.steps)
    steps[2] = replace(steps[2], d_mm=0.01, fillet_mm=None)
    model = replace(model, shafts=(replace(shaft, steps=tuple(steps)),))
    with pytest.raises(NumericalError) as info:
        analyse(model)
    text = str(info.value)
    assert text.startswith("shaft 'fan_shaft' is not held in the x-y plane between "
                           "x = 120 mm (bearing 'A') and x = 560 mm (bearing 'B')")
    assert "step 3 (x = 150 to 530 mm, d = 0.01 mm" in text and "bearing 'A'" in text


def test_ill_conditioned_stiffness_names_the_soft_bearing(tmp_path: Path) -> None:
    """A bearing spring of 1e-12 N/mm: exit 3, naming the shaft and the bearing."""
    text = FAN.replace("        limiting_speed: 7500 rpm\n",
                       "        limiting_speed: 7500 rpm\n        radial_stiffness: 1e-12 N/mm\n")
    path = _write(tmp_path, text)
    code, _, err = run_cli(["check", str(path), "--quiet"])
    assert code == 3
    line = one_error_line(err)
    assert "shaft 'fan_shaft'" in line
    assert "bearing 'B' at x = 560 mm with radial_stiffness 1e-12 N/mm" in line


# ============================================================================ outputs
def _dead_pid() -> int:
    proc = subprocess.Popen([sys.executable, "-c", "pass"])
    proc.wait()
    return proc.pid


def test_stale_part_files_of_a_killed_write_are_removed(tmp_path: Path) -> None:
    """A writer killed mid-write leaves its hidden temporary file; the next write of the
    same file removes it (dead process, or an unnamed one older than the age limit),
    and leaves the temporary file of a live writer alone.
    """
    target = tmp_path / "r.json"
    dead = tmp_path / f".r.json.{_dead_pid()}.abc123.part"
    old = tmp_path / ".r.json.xyz789.part"
    live = tmp_path / f".r.json.{os.getppid()}.live00.part"
    other = tmp_path / f".other.json.{_dead_pid()}.abc.part"
    for p in (dead, old, live, other):
        p.write_bytes(b"half a result")
    past = time.time() - 2 * STALE_PART_AGE_S
    os.utime(old, (past, past))
    write_json(target, {"a": 1})
    assert json.loads(target.read_text()) == {"a": 1}
    assert not dead.exists() and not old.exists()
    assert live.exists() and other.exists()


def test_symlink_target_is_written_through(tmp_path: Path) -> None:
    """``--json`` a symbolic link: the file it points to gets the result, the link
    stays a link.
    """
    real = tmp_path / "results" / "real.json"
    real.parent.mkdir()
    real.write_text("{}")
    link = tmp_path / "latest.json"
    link.symlink_to(real)
    path = _write(tmp_path, FAN)
    code, _, _ = run_cli(["check", str(path), "--quiet", "--json", str(link)])
    assert code == 0
    assert link.is_symlink() and os.readlink(link) == str(real)
    assert json.loads(real.read_text())["verdict"] == "pass"


def test_fifo_is_written_as_a_stream(tmp_path: Path) -> None:
    """``--json`` a FIFO: a reader gets the whole JSON, the FIFO stays a FIFO (before,
    it was replaced by a regular file and the reader got nothing).
    """
    fifo = tmp_path / "pipe"
    os.mkfifo(fifo)
    got: list[bytes] = []

    def read() -> None:
        with open(fifo, "rb") as fh:
            got.append(fh.read())

    reader = threading.Thread(target=read, daemon=True)
    reader.start()
    path = _write(tmp_path, FAN)
    code, _, _ = run_cli(["check", str(path), "--quiet", "--json", str(fifo)])
    reader.join(60.0)
    assert code == 0
    assert got and json.loads(got[0])["verdict"] == "pass"
    assert fifo.is_fifo()


def test_folder_as_output_is_refused(tmp_path: Path) -> None:
    path = _write(tmp_path, FAN)
    code, _, err = run_cli(["check", str(path), "--quiet", "--json", str(tmp_path)])
    assert code == 2
    assert "it is a folder" in one_error_line(err)
