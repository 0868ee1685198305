"""Bad input and faults: hostile YAML, numerical trust, nothing lost on failed writes,
and an interrupted study that resumes.

Complements ``test_yaml_safety.py`` (tags on scalars, the billion-laughs list, size
limit, non-UTF-8 bytes, duplicate keys) and ``test_fuzz_models.py`` (generated files).
Reference values of the solves are statics of a beam on two supports, typed in as the
closed-form expression (sum of forces and of moments = 0; e.g. Shigley's Mechanical
Engineering Design, 10th ed., section 3-1, or Roark's Formulas for Stress and Strain,
Table 8.1, simply supported beam cases).
"""

from __future__ import annotations

import errno
import io
import json
import logging
import os
import queue
import signal
import subprocess
import sys
import textwrap
import threading
import time
from collections.abc import Callable
from dataclasses import replace
from pathlib import Path
from typing import Any, BinaryIO

import numpy as np
import pytest
from conftest import base_model, dump_model

import shaftsys.analysis.solve as analysis_mod
import shaftsys.io.output as output_mod
from shaftsys.analysis import (
    MAX_ROUNDOFF_RESIDUAL,
    ROUNDOFF_FACTOR,
    STATION_SNAP_MM,
    analyse,
    mesh_shaft,
    snap_stations,
)
from shaftsys.cli import main
from shaftsys.errors import ModelError, NumericalError, OutputError
from shaftsys.io.loader import load_model, load_model_text
from shaftsys.io.locate import locate_error
from shaftsys.io.output import atomic_write, write_json, write_text
from shaftsys.io.yamlsource import MAX_DEPTH, MAX_FILE_BYTES, parse_yaml
from shaftsys.model import AxialRole, Bearing, BearingKind, Material, Shaft, Step

ROOT = Path(__file__).resolve().parent.parent
EPS = float(np.finfo(float).eps)


def run_cli(argv: list[str]) -> tuple[int, str, str]:
    """``main(argv)`` with captured stdout and stderr, logger levels restored."""
    import contextlib

    names = ("shaftsys", "shaftsys.bearings")
    levels = {n: logging.getLogger(n).level for n in names}
    out, err = io.StringIO(), io.StringIO()
    try:
        with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
            code = main(argv)
    finally:
        for n, level in levels.items():
            logging.getLogger(n).setLevel(level)
    return code, out.getvalue(), err.getvalue()


def one_error_line(err: str) -> str:
    """The single error line of a failed command (no traceback, nothing else)."""
    assert "Traceback" not in err
    lines = err.strip().splitlines()
    assert len(lines) == 1, err
    assert lines[0].startswith("shaftsys: error: ")
    return lines[0]


# =============================================================================== hostile
# YAML: no object construction, bounded expansion, size, depth, long lines, NUL bytes.
@pytest.mark.parametrize("document", [
    # tags on mappings and sequences (test_yaml_safety covers tagged scalars)
    "shaftsys: 1\nname: !!python/object:os.system {{}}\n",
    "shaftsys: 1\nname: !!python/object/apply:subprocess.check_output [[touch, {m}]]\n",
    "shaftsys: 1\nname: !!python/tuple [1, 2]\n",
    "shaftsys: 1\nname: !!set {{a: null}}\n",
    "shaftsys: 1\nname: !!omap [a: 1]\n",
    "shaftsys: 1\nname: !!python/module:os\n",
    "shaftsys: 1\nname: !local {{a: 1}}\n",
    # a %TAG directive that hides the python prefix behind a handle
    "%TAG !p! tag:yaml.org,2002:python/object/apply:\n---\nshaftsys: 1\n"
    "name: !p!os.system [touch {m}]\n",
    # deep inside the model, behind an anchor and an alias, and through a merge key
    "shaftsys: 1\nx: &a !!python/object/apply:os.system [touch {m}]\nname: *a\n",
    "shaftsys: 1\nbase: &b {{c: !!python/object/apply:os.system [touch {m}]}}\n"
    "name: {{<<: *b}}\n",
])
def test_no_python_object_is_ever_built(document: str, tmp_path: Path,
                                        monkeypatch: pytest.MonkeyPatch) -> None:
    marker = tmp_path / "executed"
    built: list[str] = []
    import yaml.constructor as yc

    for name in dir(yc.FullConstructor):
        if name.startswith("construct_python"):
            def spy(self: Any, *a: Any, _n: str = name, **k: Any) -> Any:
                built.append(_n)
                raise AssertionError(f"{_n} called")
            monkeypatch.setattr(yc.FullConstructor, name, spy)
    text = document.format(m=marker)
    with pytest.raises(ModelError) as info:
        parse_yaml(text, "hostile.yaml")
    assert "not allowed" in info.value.message
    assert info.value.line is not None and 1 <= info.value.line <= len(text.splitlines())
    assert built == [] and not marker.exists()


def _merge_bomb(levels: int = 12) -> str:
    """Each level merges the previous mapping and aliases it ten times over."""
    lines = ["l0: &l0 {" + ", ".join(f"k{i}: lol" for i in range(10)) + "}"]
    for n in range(1, levels + 1):
        refs = ", ".join(f"r{i}: *l{n - 1}" for i in range(10))
        lines.append(f"l{n}: &l{n} {{<<: *l{n - 1}, {refs}}}")
    return "\n".join(lines) + "\n"


@pytest.mark.parametrize("text", ids=["merge_and_alias", "merge_lists"], argvalues=[
    _merge_bomb(),
    # merge lists of the same anchor, repeated
    "a: &a {x: [1, 2, 3, 4, 5, 6, 7, 8, 9, 10]}\n"
    + "".join(f"b{n}: &b{n} {{<<: [{', '.join([f'*{prev}'] * 10)}], y{n}: *{prev}}}\n"
              for n, prev in enumerate(["a"] + [f"b{i}" for i in range(12)])),
])
def test_merge_key_expansion_is_bounded(text: str) -> None:
    """Merge keys expand like aliases; the same node budget refuses them (the time is
    measured by benchmarks/fuzz_long.py, not asserted here)."""
    assert len(text) < 5000
    with pytest.raises(ModelError) as info:
        load_model_text(text, "merge_bomb.yaml")
    assert "expand" in info.value.message


def test_alias_cycle_is_refused_not_recursed() -> None:
    with pytest.raises(ModelError) as info:
        parse_yaml("a: &a [1, *a]\n", "cycle.yaml")
    assert "nesting deeper" in info.value.message
    assert info.value.line == 1


@pytest.mark.parametrize("depth", [MAX_DEPTH + 5, 10_000, 400_000])
def test_deep_nesting_refused_without_recursion_error(depth: int) -> None:
    text = "shaftsys: 1\nname: " + "[" * depth + "]" * depth + "\n"
    assert len(text.encode()) < MAX_FILE_BYTES
    with pytest.raises(ModelError) as info:
        load_model_text(text, "deep.yaml")
    assert "nesting deeper than" in info.value.message
    assert info.value.line == 2


def test_moderate_nesting_names_the_field_path() -> None:
    text = "shaftsys: 1\nname: " + "[" * (MAX_DEPTH + 2) + "]" * (MAX_DEPTH + 2) + "\n"
    with pytest.raises(ModelError) as info:
        parse_yaml(text, "deep.yaml")
    assert info.value.field is not None and info.value.field.startswith("name[0][0]")


def test_file_with_a_megabyte_long_line_loads(tmp_path: Path) -> None:
    """A 1 MB comment on one line is no problem (the size limit is about the file)."""
    text = dump_model(base_model()) + "# " + "x" * (MAX_FILE_BYTES // 2) + "\n"
    path = tmp_path / "long_line.yaml"
    path.write_text(text, encoding="utf-8")
    assert path.stat().st_size < MAX_FILE_BYTES
    model = load_model(path)
    assert [b.id for b in model.shafts[0].bearings] == ["A", "B"]


@pytest.mark.parametrize(("line_text", "message"), ids=["digits", "unclosed", "key"],
                         argvalues=[
    ("name: " + "9" * 200_000, "cannot read"),                   # a 200 000-digit integer
    ("name: [" + "1, " * 30_000 + "1", "invalid YAML"),           # a list that never closes
    ("name: " + "x" * 500_000 + ": " + "y", "invalid YAML"),     # 500 000-character key
])
def test_very_long_lines_give_a_located_message(line_text: str, message: str) -> None:
    text = "shaftsys: 1\n" + line_text + "\nshafts: []\ncases: []\n"
    with pytest.raises(ModelError) as info:
        load_model_text(text, "long.yaml")
    assert message in info.value.message
    assert info.value.line is not None and 1 <= info.value.line <= 4


@pytest.mark.parametrize(("data", "line"), [
    (b"shaftsys: 1\nname: te\x00st\n", 2),
    (b"\x00shaftsys: 1\n", 1),
    (b"\x00" * 64, 1),
    (b"shaftsys: 1\nname: a\n# \x1b[31m red comment\n", 3),
    (b"shaftsys: 1\nname: [1,\n", 2),      # the stream ends after the last line
])
def test_nul_and_control_bytes_are_located(data: bytes, line: int, tmp_path: Path) -> None:
    path = tmp_path / "bytes.yaml"
    path.write_bytes(data)
    with pytest.raises(ModelError) as info:
        load_model(path)
    assert info.value.file == str(path)
    assert info.value.line == line
    code, out, err = run_cli(["validate", str(path)])
    assert code == 2 and out == ""
    assert one_error_line(err).startswith(f"shaftsys: error: {path}:{line}: ")


def test_utf8_byte_order_mark_is_accepted(tmp_path: Path) -> None:
    path = tmp_path / "bom.yaml"
    path.write_bytes(b"\xef\xbb\xbf" + dump_model(base_model()).encode("utf-8"))
    assert load_model(path).name == "test shaft"


def test_two_documents_are_one_located_error() -> None:
    with pytest.raises(ModelError) as info:
        parse_yaml("a: 1\n---\nb: 2\n", "two.yaml")
    assert "invalid YAML" in info.value.message
    assert info.value.line in (2, 3)


@pytest.mark.parametrize(("text", "line", "field"), [
    ("&shaftsys: 0\nname: x\n", 1, None),              # found by the long fuzz run
    ("shaftsys: 1\nlife:\n  '': 3\n", 3, "life"),
    ("shaftsys: 1\nlife: {? '  ' : 3}\n", 2, "life"),
])
def test_empty_key_is_refused_with_its_mapping(text: str, line: int, field: str | None
                                               ) -> None:
    with pytest.raises(ModelError) as info:
        parse_yaml(text, "empty_key.yaml")
    assert info.value.message == "a mapping key is empty"
    assert (info.value.line, info.value.field) == (line, field)


@pytest.mark.parametrize("key", ["yes", "on", "null", "~", "0x1F", "1e3"])
def test_unknown_key_is_named_as_written(key: str) -> None:
    """YAML 1.1 reads 'yes' as true, '~' as null, '0x1F' as 31: the message must still
    name the key the file shows."""
    text = dump_model(base_model()) + f"{key}: 1\n"
    with pytest.raises(ModelError) as info:
        load_model_text(text, "keys.yaml")
    assert info.value.field == key
    assert f"unknown key '{key}'" in info.value.message
    assert info.value.line == len(text.splitlines())


# =============================================================================== numbers
def _two_bearing_yaml(*, steps: str, elements: str, bearing_extra: str = "",
                      at_a: str = "50 mm", at_b: str = "350 mm", d: str = "40 mm") -> str:
    return textwrap.dedent(f"""\
        shaftsys: 1
        name: hardening
        gravity: [0, 0, 0]
        materials: {{steel: {{E: 210 GPa, nu: 0.3}}}}
        shafts:
          - id: s1
            material: steel
            steps: {steps}
            bearings:
              - {{id: A, type: deep_groove_ball, at: {at_a}, d: {d}, D: 80 mm, C: 30 kN,
                 C0: 19 kN, axial: both{bearing_extra}}}
              - {{id: B, type: deep_groove_ball, at: {at_b}, d: {d}, D: 80 mm, C: 30 kN,
                 C0: 19 kN{bearing_extra}}}
            elements: {elements}
        cases:
          - {{id: c1, share: 1, speed: 1000 rpm}}
        """)


STEPS_40_50_40 = ("[{length: 100 mm, d: 40 mm}, {length: 200 mm, d: 50 mm}, "
                  "{length: 100 mm, d: 40 mm}]")


def test_two_stations_a_micrometre_apart_solve_to_statics(tmp_path: Path) -> None:
    """Tester's issue (a): loads at 0 mm and 0.000001 mm made an element a million times
    shorter than its neighbours and the equilibrium check failed (exit 3)."""
    text = _two_bearing_yaml(steps=STEPS_40_50_40, elements=(
        "[{id: L1, type: load, at: 0 mm, force: [0, 1000 N, 0]},"
        " {id: L2, type: load, at: 0.000001 mm, force: [0, 0, 1000 N]}]"))
    path = tmp_path / "close.yaml"
    path.write_text(text, encoding="utf-8")
    code, _, err = run_cli(["check", str(path), "--quiet"])
    assert code in (0, 1), err
    result = analyse(load_model(path), with_shaft_checks=False)
    # Statics, overhung load P = 1000 N at x = c, supports at a = 50 and b = 350 mm:
    # load on A = P (b - c) / (b - a), on B = -P (a - c) / (b - a) (signed like P),
    # in y from L1 (c = 0) and in z from L2 (c = 1e-6 mm; the snap moves it to 0, which
    # changes the loads by 1000 N * 1e-6 mm / 300 mm = 3.3e-6 N, 2e-8 of B's load).
    a, b = (result.bearing(i).loads[0] for i in "AB")
    expected = (1000.0 * 350.0 / 300.0, 1000.0 * (350.0 - 1e-6) / 300.0,
                -1000.0 * 50.0 / 300.0, -1000.0 * (50.0 - 1e-6) / 300.0)
    assert (a.Fy_N, a.Fz_N, b.Fy_N, b.Fz_N) == pytest.approx(expected, rel=1e-7)
    mesh = mesh_shaft(load_model(path).shafts[0], 10.0).mesh
    assert mesh.L_mm.min() > STATION_SNAP_MM


def test_snap_stations_merges_within_a_micrometre_scale_gap() -> None:
    edges = (0.0, 100.0, 300.0, 400.0)
    got = snap_stations([0.000001, 50.0, 100.0004, 200.0, 200.0009, 200.0021, 399.9995],
                        edges)
    # 0.000001 -> edge 0; 100.0004 -> edge 100; 200.0009 -> station 200; 200.0021 is
    # more than 1e-3 mm from 200 and stays; 399.9995 -> edge 400.
    assert got == [0.0, 50.0, 100.0, 200.0, 200.0, 200.0021, 400.0]


def test_eight_to_one_step_under_an_end_moment(tmp_path: Path) -> None:
    """Tester's issue (b): steps 140 mm d10, 192 mm d79.5, 20 mm d10, bearings at 0 and
    332 mm, a moment of 1 N*mm about z at x = 0, no gravity. The nodal residual was
    already at round-off (backward error); the global balance of reactions of 1/332 N
    tripped the 1e-9 tolerance by round-off and now has the allowance
    max(tolerance, 1000 eps cond)."""
    text = _two_bearing_yaml(
        steps="[{length: 140 mm, d: 10 mm}, {length: 192 mm, d: 79.5 mm}, "
              "{length: 20 mm, d: 10 mm}]",
        elements="[{id: M, type: load, at: 0 mm, moment: [0, 0, 1 N*mm]}]",
        at_a="0 mm", at_b="332 mm", d="10 mm")
    path = tmp_path / "step8.yaml"
    path.write_text(text, encoding="utf-8")
    code, _, err = run_cli(["check", str(path), "--quiet"])
    assert code in (0, 1), err
    result = analyse(load_model(path), with_shaft_checks=False)
    # Statics of a simply supported span L = 332 mm under an end moment M = 1 N*mm
    # about +z: the supports form the couple M / L (Roark Table 8.1, end moment).
    a, b = (result.bearing(i).loads[0] for i in "AB")
    assert abs(a.Fy_N) == pytest.approx(1.0 / 332.0, rel=1e-6)
    assert a.Fy_N == pytest.approx(-b.Fy_N, rel=1e-6)
    sol = result.shafts[0].cases[0]
    cond = result.shafts[0].condition_estimate
    assert sol.nodal_residual_relative <= 1e-9
    assert sol.residual_relative <= max(1e-9, ROUNDOFF_FACTOR * EPS * cond)


def _soft_model(k: str) -> str:
    return _two_bearing_yaml(steps=STEPS_40_50_40,
                             elements="[{id: L1, type: load, at: 200 mm, "
                                      "force: [0, 1000 N, 0]}]",
                             bearing_extra=f", radial_stiffness: {k}")


def test_ill_conditioned_system_warns_with_its_condition_estimate(
        caplog: pytest.LogCaptureFixture) -> None:
    """Bearing springs of 1e-3 N/mm under a 40/50 mm steel shaft: the bending stiffness
    is ill-conditioned (estimate above 1e12); the solve still balances and warns."""
    caplog.set_level(logging.WARNING, logger="shaftsys.fe.solve")
    result = analyse(load_model_text(_soft_model("1e-3 N/mm"), "soft.yaml"),
                     with_shaft_checks=False)
    cond = result.shafts[0].condition_estimate
    assert cond > 1e12
    warned = [r.getMessage() for r in caplog.records if r.name == "shaftsys.fe.solve"]
    assert any("ill-conditioned" in w and f"{cond:.3g}" in w and "shaft 's1'" in w
               for w in warned), warned
    # Statics: a 1000 N load at mid-span of the bearings (x = 200 mm between 50 and
    # 350 mm) puts P/2 = 500 N on each; four digits survive this conditioning.
    for bid in "AB":
        assert result.bearing(bid).loads[0].Fy_N == pytest.approx(500.0, rel=1e-4)


def test_extreme_stiffness_ratio_warns(caplog: pytest.LogCaptureFixture) -> None:
    """A 0.2 mm neck between a 40 mm bearing seat and a 50 mm step (EI ratio about
    4e9; the seats keep the 40 mm of the bearings' bores, as the seat rule wants)."""
    caplog.set_level(logging.WARNING, logger="shaftsys.fe.solve")
    steps = ("[{length: 100 mm, d: 40 mm}, {length: 10 mm, d: 0.2 mm}, "
             "{length: 190 mm, d: 50 mm}, {length: 100 mm, d: 40 mm}]")
    text = _two_bearing_yaml(steps=steps, elements="[{id: L1, type: load, at: 200 mm, "
                                                   "force: [0, 1000 N, 0]}]")
    result = analyse(load_model_text(text, "neck.yaml"), with_shaft_checks=False)
    assert result.shafts[0].condition_estimate > 1e12
    assert any("condition estimate" in r.getMessage() for r in caplog.records)
    for bid in "AB":   # statics as above
        assert result.bearing(bid).loads[0].Fy_N == pytest.approx(500.0, rel=1e-4)


def test_hopelessly_ill_conditioned_system_is_exit_3(tmp_path: Path) -> None:
    """Springs of 1e-5 N/mm: round-off would excuse more than MAX_ROUNDOFF_RESIDUAL."""
    path = tmp_path / "softer.yaml"
    path.write_text(_soft_model("1e-5 N/mm"), encoding="utf-8")
    code, out, err = run_cli(["check", str(path), "--quiet"])
    assert code == 3 and out == ""
    line = one_error_line(err)
    assert "shaft 's1'" in line and "too ill-conditioned" in line
    assert "condition estimate" in line
    assert MAX_ROUNDOFF_RESIDUAL == 1e-4


def _python_shaft(bearings: list[Bearing]) -> Shaft:
    steel = Material(name="steel", E_MPa=210000.0, G_MPa=210000.0 / 2.6, poisson=0.3,
                     density_kg_m3=7850.0)
    return Shaft(id="lonely", steps=(Step(length_mm=400.0, d_mm=40.0),), material=steel,
                 bearings=tuple(bearings), elements=())


def test_singular_bending_names_the_shaft_and_the_free_direction() -> None:
    """A model built in Python (the loader refuses these) reaches the solver's checks."""
    from shaftsys.model import Case, CaseKind, Drive, Model

    one = Bearing(id="A", kind=BearingKind.DEEP_GROOVE_BALL, x_mm=100.0, d_mm=40.0,
                  D_mm=80.0, C_N=30000.0, C0_N=19000.0, axial=AxialRole.BOTH)
    case = Case(id="c", kind=CaseKind.DUTY, duration=1.0,
                drives={"lonely": Drive(speed_rpm=100.0)})
    with pytest.raises(NumericalError) as info:
        analyse(Model(name="m", shafts=(_python_shaft([one]),), cases=(case,)))
    text = str(info.value)
    assert "shaft 'lonely'" in text
    assert "rotate" in text and "x = 100 mm" in text
    thrust = replace(one, kind=BearingKind.THRUST_BALL, contact_angle_deg=90.0)
    with pytest.raises(NumericalError) as info:
        analyse(Model(name="m", shafts=(_python_shaft([thrust]),), cases=(case,)))
    assert "shaft 'lonely'" in str(info.value) and "translate" in str(info.value)


def test_near_mechanism_from_a_file_is_exit_3_with_the_shaft(tmp_path: Path) -> None:
    """One bearing with a tilt stiffness of 1e-12 N*mm/rad: the loader accepts it (a
    tilt stiffness is given) and the solver names the near-mechanism."""
    text = _two_bearing_yaml(steps=STEPS_40_50_40, elements="[]").replace(
        "C0: 19 kN, axial: both}", "C0: 19 kN, axial: both, tilt_stiffness: 1e-12 N*mm/rad}")
    text = text[:text.index("      - {id: B")] + text[text.index("    elements"):]
    path = tmp_path / "tilt.yaml"
    path.write_text(text, encoding="utf-8")
    code, out, err = run_cli(["check", str(path), "--quiet"])
    assert code == 3 and out == ""
    line = one_error_line(err)
    assert "shaft 's1'" in line and ("mechanism" in line or "singular" in line)


@pytest.mark.parametrize(("axial_a", "axial_b", "free"), [
    ("+x", "float", "toward -x"),
    ("-x", "float", "toward +x"),
    ("float", "float", "toward +x and -x"),
])
def test_shaft_that_can_slide_names_its_free_direction(axial_a: str, axial_b: str,
                                                       free: str) -> None:
    text = _two_bearing_yaml(steps=STEPS_40_50_40, elements="[]").replace(
        "axial: both", f"axial: '{axial_a}'").replace(
        "C0: 19 kN}", f"C0: 19 kN, axial: '{axial_b}'}}")
    with pytest.raises(ModelError) as info:
        load_model_text(text, "slide.yaml")
    assert f"shaft 's1' can slide axially {free}" in info.value.message
    assert info.value.field == "shafts[s1].bearings"


def test_corrupted_reaction_is_exit_3_with_a_clear_message(
        monkeypatch: pytest.MonkeyPatch, tmp_path: Path) -> None:
    """A reaction 1 % off (as a solver bug would make it) trips the equilibrium proof."""
    real = analysis_mod.BendingSolution.reaction

    def off_by_one_percent(self: Any, bearing_id: str, k: int
                           ) -> tuple[float, float, float, float]:
        ry, rz, my, mz = real(self, bearing_id, k)
        return (1.01 * ry, rz, my, mz) if bearing_id == "A" else (ry, rz, my, mz)

    monkeypatch.setattr(analysis_mod.BendingSolution, "reaction", off_by_one_percent)
    path = tmp_path / "base.yaml"
    path.write_text(dump_model(base_model()), encoding="utf-8")
    code, out, err = run_cli(["check", str(path), "--quiet"])
    assert code == 3 and out == ""
    line = one_error_line(err)
    assert "shaft 's1', case 'run'" in line
    assert "equilibrium residual" in line and "the reactions cannot be trusted" in line
    assert run_cli(["validate", str(path), "--quiet"])[0] == 0   # the file is fine


def test_core_errors_get_the_file_line_and_field() -> None:
    """An error the life engine raises by object and attribute (bearings[A].C_N) is
    reported with the model file, the bearing's line and the key as written (C)."""
    text = dump_model(base_model())
    model = load_model_text(text, "m.yaml")
    model = replace(model, source="m.yaml")
    exc = locate_error(
        ModelError("C must be positive", field="bearings[B].C_N"), model)
    assert exc.file == "m.yaml"
    assert exc.field == "shafts[s1].bearings[B].C"
    assert exc.line == next(i + 1 for i, ln in enumerate(text.splitlines())
                            if ln.strip() == "- id: B")


@pytest.mark.parametrize(("step", "key"), [("{length: 6e-11 mm, d: 50 mm}", "length"),
                                           ("{to: 100.0005 mm, d: 50 mm}", "to")])
def test_step_shorter_than_the_snap_distance_is_refused(step: str, key: str) -> None:
    """Found by the long fuzz run: a 6e-11 mm step reached the mesh unlocated."""
    steps = f"[{{length: 100 mm, d: 40 mm}}, {step}, {{length: 300 mm, d: 40 mm}}]"
    text = _two_bearing_yaml(steps=steps, elements="[]")
    with pytest.raises(ModelError) as info:
        load_model_text(text, "short.yaml")
    assert info.value.field == f"shafts[s1].steps[1].{key}"
    assert "shorter than 0.001 mm" in info.value.message
    assert info.value.line == next(i + 1 for i, ln in enumerate(text.splitlines())
                                   if "steps:" in ln)


@pytest.mark.parametrize("at_b", ["50 mm", "50.0008 mm"])
def test_two_rigid_bearings_at_one_station_are_refused(at_b: str) -> None:
    """Found by the long fuzz run: bearings within the snap distance share a node, and two
    rigid supports of one node reached the solver's unlocated error."""
    text = _two_bearing_yaml(steps=STEPS_40_50_40, elements="[]", at_b=at_b).replace(
        "C0: 19 kN}", "C0: 19 kN}\n      - {id: C, type: deep_groove_ball, at: 350 mm, d: 40 mm,"
        " D: 80 mm, C: 30 kN, C0: 19 kN}")
    with pytest.raises(ModelError) as info:
        load_model_text(text, "coincident.yaml")
    assert info.value.field == "shafts[s1].bearings[B].at"
    assert "bearings 'A' and 'B' support the shaft at one station" in info.value.message
    springy = text.replace("C0: 19 kN}\n", "C0: 19 kN, radial_stiffness: 2e5 N/mm}\n", 1)
    assert len(load_model_text(springy, "spring.yaml").shafts[0].bearings) == 3


def test_mesh_size_is_bounded(tmp_path: Path) -> None:
    text = _two_bearing_yaml(steps="[{length: 90000 mm, d: 40 mm}]", elements="[]",
                             at_b="80000 mm")
    path = tmp_path / "huge.yaml"
    path.write_text(text, encoding="utf-8")
    code, _, err = run_cli(["check", str(path), "--quiet"])
    assert code == 2
    line = one_error_line(err)
    assert f"{path}:" in line and "shafts[s1].steps" in line and "beam elements" in line


# =============================================================================== writes
OLD = b'{"previous": "result"}\n'


def _folder_with_old_file(tmp_path: Path) -> tuple[Path, Path]:
    folder = tmp_path / "out"
    folder.mkdir()
    target = folder / "results.json"
    target.write_bytes(OLD)
    return folder, target


def _assert_untouched(folder: Path, target: Path) -> None:
    assert target.read_bytes() == OLD
    assert sorted(p.name for p in folder.iterdir()) == [target.name]


@pytest.mark.parametrize("error", [OSError(errno.EIO, "I/O error"), RuntimeError("bug")])
def test_write_failing_midway_keeps_the_previous_file(tmp_path: Path, error: Exception
                                                      ) -> None:
    folder, target = _folder_with_old_file(tmp_path)

    def half(fh: BinaryIO) -> None:
        fh.write(b'{"new": "res')
        fh.flush()
        raise error

    with pytest.raises(OutputError if isinstance(error, OSError) else RuntimeError):
        atomic_write(target, half)
    _assert_untouched(folder, target)


def test_failed_rename_keeps_the_previous_file(tmp_path: Path,
                                               monkeypatch: pytest.MonkeyPatch) -> None:
    folder, target = _folder_with_old_file(tmp_path)

    def refuse(src: Any, dst: Any) -> None:
        raise OSError(errno.EXDEV, "Invalid cross-device link")

    monkeypatch.setattr(output_mod.os, "replace", refuse)
    with pytest.raises(OutputError) as info:
        write_json(target, {"new": 1})
    assert str(target) in str(info.value)
    _assert_untouched(folder, target)


@pytest.mark.parametrize("where", ["fsync", "write"])
def test_full_disk_keeps_the_previous_file(tmp_path: Path, monkeypatch: pytest.MonkeyPatch,
                                           where: str) -> None:
    folder, target = _folder_with_old_file(tmp_path)

    def no_space(*args: Any, **kwargs: Any) -> Any:
        raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC))

    def writer(fh: BinaryIO) -> None:
        fh.write(b"partial")
        no_space()

    with pytest.raises(OutputError) as info:
        if where == "fsync":
            monkeypatch.setattr(output_mod.os, "fsync", no_space)
            write_text(target, "new text")
        else:
            atomic_write(target, writer)
    assert "No space left on device" in str(info.value)
    assert str(target) in str(info.value)
    _assert_untouched(folder, target)


def _model_file(tmp_path: Path) -> Path:
    path = tmp_path / "model.yaml"
    path.write_text(dump_model(base_model()), encoding="utf-8")
    return path


def test_cli_write_into_a_missing_folder_is_exit_2(tmp_path: Path) -> None:
    model = _model_file(tmp_path)
    target = tmp_path / "missing" / "results.json"
    code, _, err = run_cli(["check", str(model), "--json", str(target), "--quiet"])
    assert code == 2
    line = one_error_line(err)
    assert str(target) in line and "does not exist" in line
    assert not target.parent.exists()


def _read_only_folder(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    """A folder this process cannot write into: chmod 0o500, or, running as root (where
    the mode does not stop writes), the refusal the kernel would give, simulated."""
    folder = tmp_path / "ro"
    folder.mkdir()
    folder.chmod(0o500)
    probe = folder / ".probe"
    try:
        probe.write_bytes(b"")
    except PermissionError:
        return folder
    probe.unlink()
    real = output_mod.tempfile.mkstemp

    def refused(*args: Any, **kwargs: Any) -> Any:
        if Path(kwargs.get("dir", ".")) == folder:
            raise PermissionError(errno.EACCES, os.strerror(errno.EACCES))
        return real(*args, **kwargs)

    monkeypatch.setattr(output_mod.tempfile, "mkstemp", refused)
    return folder


def test_cli_write_into_a_read_only_folder_is_exit_2(tmp_path: Path,
                                                     monkeypatch: pytest.MonkeyPatch) -> None:
    model = _model_file(tmp_path)
    folder = _read_only_folder(tmp_path, monkeypatch)
    try:
        target = folder / "results.json"
        code, _, err = run_cli(["check", str(model), "--json", str(target), "--quiet"])
        assert code == 2
        line = one_error_line(err)
        assert str(target) in line and "permission denied" in line
        assert list(folder.iterdir()) == []
    finally:
        folder.chmod(0o700)


COMMANDS: dict[str, Callable[[Path, Path], list[str]]] = {
    "check --json": lambda m, t: ["check", str(m), "--json", str(t), "--quiet"],
    "report -o": lambda m, t: ["report", str(m), "-o", str(t), "--quiet"],
    "plot -o": lambda m, t: ["plot", str(m), "--what", "drawing", "-o", str(t), "--quiet"],
    "schema -o": lambda m, t: ["schema", "-o", str(t), "--quiet"],
}
SUFFIX = {"check --json": ".json", "report -o": ".html", "plot -o": ".svg",
          "schema -o": ".json"}


@pytest.mark.parametrize("command", sorted(COMMANDS))
def test_every_output_command_writes_atomically(command: str, tmp_path: Path,
                                                monkeypatch: pytest.MonkeyPatch) -> None:
    """Each command's file goes through atomic_write, and a full disk during that write
    gives exit 2 with one clear message and the previous file intact."""
    model = _model_file(tmp_path)
    folder = tmp_path / "out"
    folder.mkdir()
    target = folder / f"result{SUFFIX[command]}"
    seen: list[Path] = []
    real = output_mod.atomic_write

    def spy(path: Any, write: Any) -> Path:
        seen.append(Path(path))
        return real(path, write)

    monkeypatch.setattr(output_mod, "atomic_write", spy)
    code, _, err = run_cli(COMMANDS[command](model, target))
    assert code in (0, 1), err
    assert seen == [target] and target.stat().st_size > 0
    before = target.read_bytes()

    def no_space(fd: int) -> None:
        raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC))

    monkeypatch.setattr(output_mod.os, "fsync", no_space)
    code, _, err = run_cli(COMMANDS[command](model, target))
    assert code == 2
    line = one_error_line(err)
    assert str(target) in line and "No space left on device" in line
    assert target.read_bytes() == before
    assert sorted(p.name for p in folder.iterdir()) == [target.name]


# =============================================================================== studies
STUDY_SCRIPT = """
import sys, time
from shaftsys.io.loader import load_model
from shaftsys.study.runner import run_study
from shaftsys.study.sweep import make_study

model = load_model(sys.argv[1])
study = make_study(model, {"bearing.B.at": "300:380:41"})

def on_chunk(cid, done):
    print(f"chunk {cid} done {done}", flush=True)
    time.sleep(0.3)

run_study(study, sys.argv[2], chunk_size=4, progress=False, on_chunk=on_chunk,
          resume=sys.argv[3] == "resume")
print("finished", flush=True)
"""


def _study_available() -> bool:
    try:
        from shaftsys.study.runner import run_study  # noqa: F401
        from shaftsys.study.sweep import make_study  # noqa: F401
    except ImportError:
        return False
    return True


@pytest.mark.skipif(not _study_available(), reason="shaftsys.study has no runner yet")
def test_study_killed_with_sigkill_resumes_without_losing_or_repeating(tmp_path: Path
                                                                       ) -> None:
    """Kill a study (SIGKILL, no clean-up) after three checkpointed chunks, resume it,
    and find every variant exactly once with the numbers of an uninterrupted run."""
    import pandas as pd

    from shaftsys.study.runner import run_study
    from shaftsys.study.sweep import evaluate_block, make_study

    model = _model_file(tmp_path)
    script = tmp_path / "study.py"
    script.write_text(STUDY_SCRIPT, encoding="utf-8")
    out = tmp_path / "study"
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    proc = subprocess.Popen([sys.executable, str(script), str(model), str(out), "new"],
                            stdout=subprocess.PIPE, stderr=subprocess.DEVNULL, text=True,
                            env=env)
    assert proc.stdout is not None
    lines: queue.Queue[str] = queue.Queue()

    def pump() -> None:   # readline in a thread, so a hung child cannot hang the test
        for ln in proc.stdout or ():
            lines.put(ln)

    threading.Thread(target=pump, daemon=True).start()
    done_lines: list[str] = []
    deadline = time.monotonic() + 120
    while len(done_lines) < 3 and time.monotonic() < deadline:
        try:
            line = lines.get(timeout=max(0.1, deadline - time.monotonic()))
        except queue.Empty:
            break
        if line.startswith("chunk"):
            done_lines.append(line)
    proc.send_signal(signal.SIGKILL)
    proc.wait(timeout=30)
    assert proc.returncode == -signal.SIGKILL
    assert len(done_lines) == 3, done_lines
    manifest = json.loads((out / "manifest.json").read_text("utf-8"))
    assert 3 <= len(manifest["done"]) < 11     # killed part-way: some chunks, not all
    assert not (out / "results.csv").exists()
    # resume in this process (the same call the script makes with "resume")
    study = make_study(load_model(model), {"bearing.B.at": "300:380:41"})
    rerun: list[int] = []
    run = run_study(study, out, chunk_size=4, progress=False, resume=True,
                    on_chunk=lambda cid, done: rerun.append(cid))
    assert sorted(rerun) == sorted(set(range(11)) - set(manifest["done"]))
    assert run.chunks_run == len(rerun)                  # only the missing chunks ran
    got = pd.read_csv(out / "results.csv")
    assert list(got["index"]) == list(range(41))         # none lost, none repeated
    assert got["variant"].is_unique
    fresh = evaluate_block(study, 0, 41)
    assert np.allclose(got["bearing.B.at"], fresh["bearing.B.at"])
    assert np.allclose(got["A.Lnm_h"], fresh["A.Lnm_h"], rtol=1e-12, equal_nan=True)


def test_largest_accepted_force_solves_to_statics() -> None:
    """Forces at the magnitude limit (1e15 N) do not overflow anywhere in the solve."""
    from shaftsys.io.quantities import MAX_MAGNITUDE

    text = _two_bearing_yaml(steps=STEPS_40_50_40, elements=(
        f"[{{id: L1, type: load, at: 400 mm, force: [0, {MAX_MAGNITUDE:g} N, 0]}}]"))
    result = analyse(load_model_text(text, "big.yaml"))
    # Statics, overhung load P at c = 400 mm, supports at a = 50 and b = 350 mm.
    P = 1e15
    assert result.bearing("B").loads[0].Fy_N == pytest.approx(P * 350.0 / 300.0, rel=1e-9)
    assert result.bearing("A").loads[0].Fy_N == pytest.approx(-P * 50.0 / 300.0, rel=1e-9)
    assert not result.ok      # no bearing survives 1e15 N
    with pytest.raises(ModelError) as info:
        load_model_text(text.replace("1e+15 N", "2e15 N"), "bigger.yaml")
    assert "outside the range" in info.value.message
    assert info.value.field == "shafts[s1].elements[0].force[1]"
