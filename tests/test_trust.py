"""Trust on first use: the silent traps of a model file are caught.

Each trap is a hand-made model (the base model of ``conftest.py``, edited) that used to
pass silently and now gets exit 2 with file, line, field and the value as read, or a
named warning. The belt take-up is checked against a tension balance worked by hand.
"""

from __future__ import annotations

import ast
import math
import re
import subprocess
import sys
from pathlib import Path
from typing import Any

import numpy as np
import pytest

from shaftsys import analyse
from shaftsys.cli import main
from shaftsys.errors import ModelError
from shaftsys.io import spec as S
from shaftsys.io.loader import load_model
from shaftsys.loads import capstan_limit, takeup_belt_hub_load
from shaftsys.report.calcsheet import _distinct
from shaftsys.report.tables import shaft_checks_table, sig, sig_apart

ROOT = Path(__file__).resolve().parent.parent


def _run(path: Path, *args: str) -> int:
    return main([*args, str(path), "--quiet"]) if args else main(["check", str(path),
                                                                 "--quiet"])


def _error(path: Path) -> ModelError:
    with pytest.raises(ModelError) as info:
        load_model(path)
    return info.value


# ------------------------------------------------------------------ 1. the unit rule
def test_bare_power_is_refused_with_its_line(model_yaml: Any, line_of: Any,
                                             capsys: Any) -> None:
    """``power: 22`` was read as 22 W and the check passed; now exit 2 naming it."""
    path, text = model_yaml(edit=lambda m: m["cases"][0]["input"].update(power=22))
    assert main(["check", str(path), "--quiet"]) == 2
    err = capsys.readouterr().err
    assert f"{path}:{line_of(text, 'power: 22')}:" in err
    assert "cases[run].input.power" in err and "22" in err and "no unit" in err
    assert "units:" in err                      # the fix is named


def test_bare_rating_is_refused(model_yaml: Any, line_of: Any) -> None:
    """``C: 190`` (meant as kN) was read as 190 N; now refused at its line."""
    def edit(m: dict[str, Any]) -> None:
        m["shafts"][0]["bearings"][0]["C"] = 190
    path, text = model_yaml(edit=edit)
    exc = _error(path)
    # the field is read before the bearing's id is checked: the list index names it
    assert exc.field == "shafts[s1].bearings[0].C" and "190" in exc.message
    assert exc.line == line_of(text, "C: 190")


def test_declared_units_read_bare_numbers(model_yaml: Any) -> None:
    """``units: {power: kW, force: kN}``: ``power: 7.5`` and ``C: 30`` mean 7.5 kW and
    30 kN, the same model as the base one written with units (a second route to the
    same numbers).
    """
    def edit(m: dict[str, Any]) -> None:
        m["units"] = {"power": "kW", "force": "kN"}
        m["cases"][0]["input"]["power"] = 7.5
        m["shafts"][0]["bearings"][0]["C"] = 30
    declared = load_model(model_yaml(edit=edit, name="declared.yaml")[0])
    written = load_model(model_yaml(name="written.yaml")[0])
    assert declared.shafts[0].bearings[0].C_N == written.shafts[0].bearings[0].C_N == 30e3
    t_declared = declared.cases[0].drives["s1"].input_torque_Nmm
    t_written = written.cases[0].drives["s1"].input_torque_Nmm
    assert t_declared == pytest.approx(t_written, rel=1e-12)
    # T = P / omega by hand: 7500 W / (1450 * 2 pi / 60) rad/s, in N*mm
    assert t_declared == pytest.approx(7500.0 / (1450.0 * 2 * math.pi / 60.0) * 1e3,
                                       rel=1e-12)


def test_units_internal_is_explicit_and_warns_on_a_tiny_power(model_yaml: Any,
                                                              line_of: Any) -> None:
    """``units: internal`` keeps bare numbers in N, mm, W...; a drive power of 22 W is
    then read as written but warned about with its field, line and value.
    """
    def edit(m: dict[str, Any]) -> None:
        m["units"] = "internal"
        m["cases"][0]["input"]["power"] = 3
    path, text = model_yaml(edit=edit)
    model = load_model(path)
    assert len(model.warnings) == 1
    w = model.warnings[0]
    assert w.startswith(f"{path}:{line_of(text, 'power: 3')}: cases[run].input.power")
    assert "3 W" in w


def test_a_unit_of_the_wrong_dimension_in_units_is_refused(model_yaml: Any) -> None:
    """``units: {length: kg}`` and a misspelt dimension are refused at the key."""
    path, _ = model_yaml(edit=lambda m: m.update(units={"length": "kg"}), name="a.yaml")
    assert _error(path).field == "units.length"
    path, _ = model_yaml(edit=lambda m: m.update(units={"lenght": "mm"}), name="b.yaml")
    exc = _error(path)
    assert exc.field == "units.lenght" and "length" in exc.message


def test_a_bearing_bore_above_two_metres_is_warned(model_yaml: Any) -> None:
    """A bore of 2500 mm (metres typed as millimetres?) loads with a named warning."""
    def edit(m: dict[str, Any]) -> None:
        for step in m["shafts"][0]["steps"]:
            step["d"] = "2.5 m"
        for b in m["shafts"][0]["bearings"]:
            b.update(d="2500 mm", D="3000 mm")
    model = load_model(model_yaml(edit=edit)[0])
    hits = [w for w in model.warnings if "bore read as 2500 mm" in w]
    assert len(hits) == 2 and "bearings[A].d" in hits[0]


def test_a_rating_below_the_static_load_is_warned(model_yaml: Any) -> None:
    """C = 190 N under a load of kN: the check names the bearing's C and the value."""
    def edit(m: dict[str, Any]) -> None:
        m["shafts"][0]["bearings"][0]["C"] = "190 N"
    path, _ = model_yaml(edit=edit)
    result = analyse(load_model(path))
    hits = [w for w in result.warnings if "bearings[A].C" in w]
    assert len(hits) == 1 and "190 N" in hits[0] and str(path) in hits[0]


# --------------------------------------------------------------- 2. geometry checks
def test_bore_that_does_not_match_its_seat_is_refused(model_yaml: Any, line_of: Any) -> None:
    """A 45 mm bore on the 40 mm seat step: exit 2, both diameters named."""
    def edit(m: dict[str, Any]) -> None:
        m["shafts"][0]["bearings"][0].update(d="45 mm", id="A")
    path, text = model_yaml(edit=edit)
    exc = _error(path)
    assert exc.field == "shafts[s1].bearings[A].d"
    assert "45 mm" in exc.message and "40 mm" in exc.message
    assert exc.line == line_of(text, "- id: A")
    assert _run(path) == 2


def test_a_bearing_on_a_sleeve_may_have_a_larger_bore(model_yaml: Any) -> None:
    """The same 45 mm bore with ``mounting: sleeve`` is a sleeve over the 40 mm step."""
    def edit(m: dict[str, Any]) -> None:
        m["shafts"][0]["bearings"][0].update(d="45 mm", mounting="sleeve")
    model = load_model(model_yaml(edit=edit)[0])
    assert model.shafts[0].bearings[0].on_sleeve


def test_a_width_over_a_shoulder_is_refused(model_yaml: Any) -> None:
    """Bearing A (40 mm bore, 22 mm wide) at 95 mm reaches the 50 mm step at 100 mm."""
    def edit(m: dict[str, Any]) -> None:
        m["shafts"][0]["bearings"][0].update(at="95 mm", B="22 mm")
    exc = _error(model_yaml(edit=edit)[0])
    assert exc.field == "shafts[s1].bearings[A].B"
    assert "overlaps a shoulder" in exc.message and "84 to 106 mm" in exc.message


def test_a_hub_overlapping_a_bearing_is_refused(model_yaml: Any, line_of: Any) -> None:
    """Coupling 70 mm wide at 390 mm (355..425) overlaps bearing B (340..360) by 5 mm."""
    def edit(m: dict[str, Any]) -> None:
        m["shafts"][0]["bearings"][1]["B"] = "20 mm"
        m["shafts"][0]["elements"][1]["width"] = "70 mm"
    path, text = model_yaml(edit=edit)
    exc = _error(path)
    assert exc.field == "shafts[s1].elements[coupling1].width"
    assert "bearing 'B'" in exc.message and "by 5 mm" in exc.message
    assert exc.line == line_of(text, "- id: coupling1")


def test_a_sweep_variant_moving_a_bearing_across_a_shoulder_is_invalid(
        model_yaml: Any) -> None:
    """Bearing A swept from 50 mm to 110 mm lands on the 50 mm step: that variant is
    flagged invalid with the reason, the other is computed.
    """
    from shaftsys.study.sweep import make_study, sweep

    study = make_study(load_model(model_yaml()[0]), {"bearing.A.at": ["50 mm", "110 mm"]})
    df = sweep(study)
    assert df["valid"].tolist() == [True, False]
    assert "no longer fits its seat" in df["reason"][1] and "bore 40 mm" in df["reason"][1]


# ------------------------------------------------------- 3. validate finds what check would
def test_validate_refuses_missing_temperatures_for_the_modified_life(
        model_yaml: Any, line_of: Any, capsys: Any) -> None:
    """Lubrication given, no case temperature: ``check`` refused it after solving,
    ``validate`` passed it; both now give exit 2 naming the case.
    """
    def edit(m: dict[str, Any]) -> None:
        m["lubrication"] = {"viscosity_40C": "68 mm^2/s", "viscosity_100C": "9 mm^2/s",
                            "ec": 0.5}
        m["cases"][1]["temperature"] = "60 degC"
    path, text = model_yaml(edit=edit)
    assert main(["validate", str(path), "--quiet"]) == 2
    err = capsys.readouterr().err
    assert f"{path}:{line_of(text, '- id: run')}: cases[run].temperature" in err
    assert "modified_life: false" in err
    assert main(["check", str(path), "--quiet"]) == 2


def _hint_strings() -> list[str]:
    """Every string literal (and literal part of an f-string) of the package."""
    out = []
    for file in (ROOT / "shaftsys").rglob("*.py"):
        for node in ast.walk(ast.parse(file.read_text(encoding="utf-8"))):
            if isinstance(node, ast.Constant) and isinstance(node.value, str):
                out.append(node.value)
    return out


def _known_keys() -> set[str]:
    keys: set[str] = set(S._ELEMENT_COMMON)
    for table in (*S.SECTIONS.values(), *S.ELEMENT_TYPES.values()):
        keys |= set(table)
    return keys


_SECTION_HINT = re.compile(r"\b(life|lubrication|solver|selection): \{(\w+): (\w+)\}")
_KEY_HINT = re.compile(r"a key '(\w+)'|\b(?:give|remove) '(\w+)'")


def test_every_suggested_key_exists_and_loads(model_yaml: Any) -> None:
    """Each message that suggests a key names one the format has; a suggested section
    setting (``life: {modified_life: false}``) is put into a model, which loads.
    """
    strings = _hint_strings()
    keys = _known_keys()
    section_hints = {m.groups() for s in strings for m in _SECTION_HINT.finditer(s)}
    assert ("life", "modified_life", "false") in section_hints
    for section, key, value in sorted(section_hints):
        parsed: Any = {"false": False, "true": True}.get(value, value)

        def edit(m: dict[str, Any], section: str = section, key: str = key,
                 parsed: Any = parsed) -> None:
            m.setdefault(section, {})[key] = parsed
        load_model(model_yaml(edit=edit, name=f"{section}_{key}.yaml")[0])
    named = {k for s in strings for m in _KEY_HINT.finditer(s) for k in m.groups() if k}
    assert named, "the hint pattern found nothing"
    assert sorted(named - keys - {"choose"}) == []


# ------------------------------------------------------------------- 4. belts
def test_takeup_tensions_against_the_capstan_relation() -> None:
    """Euler-Eytelwein (capstan) relation T1/T2 <= e^(mu phi) (Meriam & Kraige,
    Engineering Mechanics: Statics, flexible belts), worked by hand for a drive drum:
    r = 320 mm, T = 9.6e6 N*mm -> T1 - T2 = 30 000 N; mu = 0.35, phi = 200 deg ->
    e^(0.35 * 3.49066) = e^1.22173 = 3.39305; smallest slack tension that grips
    T2 = 30 000 / (3.39305 - 1) = 12 536.3 N.
    """
    R_hand = math.exp(0.35 * math.radians(200.0))
    assert capstan_limit(0.35, 200.0) == pytest.approx(R_hand, rel=1e-12)
    assert R_hand == pytest.approx(3.39305, abs=5e-6)          # the hand value above
    T2_min = 30_000.0 / (R_hand - 1.0)
    assert T2_min == pytest.approx(12_536.3, abs=0.05)
    gripping = takeup_belt_hub_load(9.6e6, 640.0, 90.0, 200.0, 18_000.0, 0.35)
    assert gripping.details["T_tight_N"] == pytest.approx(48_000.0, rel=1e-12)
    assert gripping.details["T_slack_N"] == 18_000.0
    assert gripping.details["min_slack_tension_N"] == pytest.approx(T2_min, rel=1e-12)
    assert gripping.warnings == ()
    slipping = takeup_belt_hub_load(9.6e6, 640.0, 90.0, 200.0, 0.99 * T2_min, 0.35)
    assert len(slipping.warnings) == 1 and "slip" in slipping.warnings[0]
    # wrap 200 deg: strands at 90 -/+ (-10) deg; the hub force is their vector sum
    a1, a2 = math.radians(100.0), math.radians(80.0)   # tight strand "-" at theta - delta
    expected = 48_000.0 * np.array([0.0, math.cos(a1), math.sin(a1)]) + \
        18_000.0 * np.array([0.0, math.cos(a2), math.sin(a2)])
    assert np.allclose(gripping.force_N, expected, rtol=1e-12, atol=1e-9)


def test_drum_on_two_hubs_shares_its_load(model_yaml: Any) -> None:
    """A drum on hubs at 120 and 300 mm of the 400 mm shaft (bearings at 50 and 350 mm,
    rigid): statics of two equal hub loads F/2 gives the reaction at A
    F/2 ((350 - 120) + (350 - 300)) / 300 = F * 0.46667 (a beam on two supports,
    Roark, simple beam with point loads). F is the take-up drum's hub force with no
    torque: T1 = T2 = 5 kN, wrap 180 deg toward +z: F = 10 kN along +z.
    """
    def edit(m: dict[str, Any]) -> None:
        m["solver"] = {"shaft_weight": False}
        m["shafts"][0]["elements"] = [
            {"id": "drum", "type": "pulley", "at": "210 mm", "hubs": ["120 mm", "300 mm"],
             "diameter": "200 mm", "belt_angle": "90 deg", "slack_tension": "5 kN"},
            {"id": "coupling1", "type": "coupling", "at": "390 mm"}]
        for case in m["cases"]:
            case["input"] = {"element": "coupling1", "torque": "0 N*m"}
            case["outputs"] = {"drum": 1.0}
    result = analyse(load_model(model_yaml(edit=edit)[0]))
    fz_a = result.bearings[0].loads[0].Fz_N
    assert fz_a == pytest.approx(10_000.0 * (230.0 + 50.0) / 2.0 / 300.0, rel=1e-9)


def test_conveyor_demo_passes_and_types_no_load() -> None:
    """The bundled conveyor head shaft checks to exit 0; its file has no force typed
    on a bearing and no process load element (every load follows from the drum).
    """
    path = ROOT / "models" / "conveyor_head.yaml"
    assert _run(path) == 0
    text = path.read_text(encoding="utf-8")
    assert "type: load" not in text and "force:" not in text


# ----------------------------------------------------------- 5. what users read
def test_significant_figures() -> None:
    """Lives and loads are printed to a few significant figures (common practice, no
    source): 151 441 757 h is 1.51e8 h, 48 795.3 N is 48 800 N.
    """
    assert sig(151_441_757.0) == "1.51e8"
    assert sig(48_795.3, 4) == "48 800"
    assert sig(0.012345) == "0.0123"
    assert sig(-10_990.4, 4) == "-10 990"
    assert sig(float("nan")) == "-" and sig(float("inf")) == "inf"
    # a life just below its target never prints as the target
    assert sig_apart(49_990.0, 50_000.0) == "49 990" and sig_apart(165_821.0, 5e4) == "166 000"
    assert _distinct(49_990.0, 50_000.0) == ("49990", "50000")


def test_long_ids_keep_the_columns(model_yaml: Any) -> None:
    """With a 30-character bearing id every row of the slope table keeps its columns."""
    long_id = "drive_end_locating_bearing_abc"
    def edit(m: dict[str, Any]) -> None:
        m["shafts"][0]["bearings"][0]["id"] = long_id
    result = analyse(load_model(model_yaml(edit=edit)[0]))
    assert result.checks is not None
    table = shaft_checks_table(result.checks).split("\n\n")[0].splitlines()
    header, rows = table[1], table[3:]
    col = header.index("verdict")
    assert any(long_id in r for r in rows)
    assert all(r[col:].split()[0] in {"ok", "marginal", "EXCEEDED"} for r in rows)


def test_no_uncertainty_notes_in_what_users_read(tmp_path: Path, capsys: Any) -> None:
    """Calculation sheets, warnings and the report name standards and handbooks; the
    contributor's notes on how a value was typed in ("from memory") stay out.
    """
    for model in ("fan_drive.yaml", "conveyor_head.yaml"):
        path = ROOT / "models" / model
        main(["check", str(path), "--explain", "A"])
        main(["report", str(path), "-o", str(tmp_path / "r.html")])
        shown = capsys.readouterr()
        html = (tmp_path / "r.html").read_text(encoding="utf-8")
        for text in (shown.out, shown.err, html):
            assert "memory" not in text.lower() and "recalled" not in text.lower()


# --------------------------------------------------------------- 6. start-up
def test_validate_reads_a_model_without_scipy_linalg_or_pint(tmp_path: Path) -> None:
    """Reading the bundled models imports neither scipy.linalg nor pint (their imports
    take most of the start-up time of ``validate``); no time is measured. The model that
    names a recording is read from a copy beside a short demo recording (the recording
    is not committed: ``validate`` refuses a model whose series file is missing).
    """
    models = []
    for p in sorted((ROOT / "models").glob("*.yaml")):
        path = p
        if "\nrecording:" in p.read_text(encoding="utf-8"):
            path = tmp_path / p.name
            path.write_text(p.read_text(encoding="utf-8"), encoding="utf-8")
            subprocess.run([sys.executable, str(ROOT / "models" / "make_demo_recording.py"),
                            str(tmp_path / "conveyor_recording.csv"), "--hours", "0.02"],
                           check=True, capture_output=True)
        models.append(str(path))
    code = ("import sys; from shaftsys.cli import main; "
            f"codes = [main(['validate', p, '-q']) for p in {models!r}]; "
            "assert codes == [0] * len(codes), codes; "
            "print(sorted(m for m in ('pint', 'scipy.linalg') if m in sys.modules))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         check=True, cwd=ROOT, env={"PYTHONPATH": str(ROOT),
                                                    "PATH": "/usr/bin:/bin"})
    assert out.stdout.strip() == "[]", out.stderr


def test_open_seat_bore_follows_the_seat_rule(tmp_path: Path) -> None:
    """An open bearing's seat bore (``choose.bore``) must match the step under it too:
    the demo's in_B seat is a 45 mm step; a bore of 50 mm there is refused, naming it.
    """
    source = (ROOT / "models" / "belt_reducer_open.yaml").read_text(encoding="utf-8")
    needle = "types: [deep_groove_ball, cylindrical_roller]}"
    assert needle in source
    path = tmp_path / "open.yaml"
    (tmp_path / "demo_catalogue.csv").write_bytes(
        (ROOT / "models" / "demo_catalogue.csv").read_bytes())
    model = load_model(ROOT / "models" / "belt_reducer_open.yaml")
    seat = next(s for s in model.open_seats if s.bearing_id == "in_B")
    wrong = seat.bore_mm + 5.0
    path.write_text(source.replace(needle, needle[:-1] + f", bore: {wrong:g} mm}}"),
                    encoding="utf-8")
    exc = _error(path)
    assert exc.field == "shafts[input].bearings[in_B].choose.bore"
    assert f"{wrong:g} mm" in exc.message and f"{seat.bore_mm:g} mm" in exc.message


def test_validate_refuses_a_mesh_the_solve_would_refuse(model_yaml: Any,
                                                        capsys: Any) -> None:
    """``solver.max_element: 0.1 mm`` on the 400 mm shaft means 4000 beam elements, more
    than the solve takes: ``validate`` now says so (before, only ``check`` did).
    """
    path, _ = model_yaml(edit=lambda m: m.update(solver={"max_element": "0.1 mm"}))
    assert main(["validate", str(path), "--quiet"]) == 2
    err = capsys.readouterr().err
    assert "solver.max_element" in err and "4e+03 beam elements" in err


def test_validate_runs_the_power_flow_of_every_case(tmp_path: Path, capsys: Any) -> None:
    """Two links between the same two shafts (a split power path) were refused by
    ``check`` only; ``validate`` now runs the power flow of every case and names the
    second link with its line.
    """
    text = (ROOT / "models" / "belt_reducer.yaml").read_text(encoding="utf-8")
    link = "  - {id: stage2, type: gear_mesh, members: [pinion2, wheel2], efficiency: 0.985}\n"
    assert link in text
    path = tmp_path / "split.yaml"
    path.write_text(text.replace(link, link + link.replace("stage2", "stage2b", 1)),
                    encoding="utf-8")
    assert main(["validate", str(path), "--quiet"]) == 2
    err = capsys.readouterr().err
    line = text.splitlines().index(link.rstrip("\n")) + 2
    assert f"{path}:{line}: links[stage2b]" in err and "two links" in err
