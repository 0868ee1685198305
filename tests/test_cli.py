"""The command line and the public JSON contract.

``shaftsys check`` needs the life engine (``shaftsys/life_check.py``); until that module
exists the tests that run ``check`` are skipped (``needs_life``). The JSON contract
itself is also checked at the Python level through ``result_to_dict`` on a solve without
life, so it is covered today.

Expected values typed in below come from the demo file ``models/fan_drive.yaml`` itself
(speeds, shares, bearing stations and types, the impeller thrust) or from statics.
"""

from __future__ import annotations

import hashlib
import importlib.util
import json
import math
import os
import stat
import subprocess
import sys
from pathlib import Path
from typing import Any

import jsonschema
import pytest
import yaml

import shaftsys
from shaftsys.cli import main

HAS_LIFE = importlib.util.find_spec("shaftsys.life_check") is not None
needs_life = pytest.mark.skipif(
    not HAS_LIFE, reason="shaftsys.life_check (attach_life) is not written yet")



def _plain(value: Any, unit: str) -> float:
    """A demo-file value such as ``"120 mm"`` read with PyYAML only (unit checked)."""
    if isinstance(value, int | float):
        return float(value)
    number, written = str(value).split(maxsplit=1)
    assert written == unit, f"the demo writes {value!r}; this test expects {unit}"
    return float(number)


def demo_facts(demo_path: Path) -> dict[str, Any]:
    """What the results must echo, read from the demo file with PyYAML (not shaftsys).

    The demo is still being edited, so its numbers are read here rather than copied.
    """
    raw = yaml.safe_load(demo_path.read_text(encoding="utf-8"))
    gravity_x = _plain(raw.get("gravity", [0, 0, 0])[0], "m/s^2")
    assert gravity_x == 0.0  # so the only axial loads are the process loads
    (shaft,) = raw["shafts"]
    defaults = {e["id"]: _plain(e.get("force", [0])[0], "N")
                for e in shaft["elements"] if e["type"] == "load"}
    cases = raw["cases"]
    duty_total = sum(float(c["share"]) for c in cases if c.get("kind", "duty") == "duty")
    facts: dict[str, Any] = {
        "shaft": shaft["id"],
        "cases": [c["id"] for c in cases],
        "speed": {c["id"]: _plain(c["speed"], "rpm") for c in cases},
        "share": {c["id"]: (float(c["share"]) / duty_total
                            if c.get("kind", "duty") == "duty" else 0.0) for c in cases},
        "bearings": [(b["id"], _plain(b["at"], "mm"), b["type"], b.get("axial", "float"))
                     for b in shaft["bearings"]],
        "thrust": {},
    }
    for c in cases:
        given = {k: _plain(v["force"][0], "N") for k, v in (c.get("loads") or {}).items()}
        facts["thrust"][c["id"]] = sum({**defaults, **given}.values())
    return facts


def _is_number(value: Any) -> bool:
    return isinstance(value, int | float) and not isinstance(value, bool)


def check_contract(data: dict[str, Any], model_bytes: bytes, facts: dict[str, Any]
                   ) -> None:
    """Assert the public keys and types of the results JSON for the demo model."""
    assert isinstance(data["schema_version"], str) and data["schema_version"]
    assert data["tool_version"] == shaftsys.__version__
    assert data["model_sha256"] == hashlib.sha256(model_bytes).hexdigest()
    units = data["units"]
    assert {k: units[k] for k in ("force", "length", "moment", "speed")} == {
        "force": "N", "length": "mm", "moment": "N*mm", "speed": "rpm"}

    cases = data["cases"]
    assert [c["id"] for c in cases] == facts["cases"]
    for c in cases:
        assert isinstance(c["id"], str)
        assert _is_number(c["share"])
        assert c["share"] == pytest.approx(facts["share"][c["id"]], abs=1e-12)
    assert sum(c["share"] for c in cases) == pytest.approx(1.0, abs=1e-12)
    assert [c["share"] for c in cases if c["kind"] != "duty"] == [0.0]  # the peak case

    assert [s["id"] for s in data["shafts"]] == [facts["shaft"]]
    shaft_cases = data["shafts"][0]["cases"]
    assert [c["case"] for c in shaft_cases] == facts["cases"]
    for c in shaft_cases:
        for key in ("speed_rpm", "max_deflection_mm", "force_residual_N",
                    "moment_residual_Nmm"):
            assert _is_number(c[key]), key
        assert c["speed_rpm"] == facts["speed"][c["case"]]
        assert 0.0 < c["max_deflection_mm"] < 1.0
        assert 0.0 <= c["force_residual_N"] < 1e-6
        assert 0.0 <= c["moment_residual_Nmm"] < 1e-3

    assert [(b["id"], b["x_mm"], b["type"]) for b in data["bearings"]] == [
        (bid, x, kind) for bid, x, kind, _ in facts["bearings"]]
    roles = {bid: role for bid, _, _, role in facts["bearings"]}
    assert sorted(roles.values()) == ["both", "float"]
    for b in data["bearings"]:
        assert b["shaft"] == facts["shaft"]
        assert [ld["case"] for ld in b["loads"]] == facts["cases"]
        for ld in b["loads"]:
            assert isinstance(ld["case"], str)
            for key in ("Fy_N", "Fz_N", "Fr_N", "Fx_N", "Fa_N", "speed_rpm"):
                assert _is_number(ld[key]), key
            assert ld["Fr_N"] == pytest.approx(math.hypot(ld["Fy_N"], ld["Fz_N"]),
                                               rel=1e-12)
            assert ld["Fa_N"] == pytest.approx(abs(ld["Fx_N"]), abs=1e-9)
            assert ld["speed_rpm"] == facts["speed"][ld["case"]]
            assert ld["Fr_N"] > 100.0   # belt pretension alone loads both supports
            # statics, sum Fx = 0: the locating bearing is pushed with the whole
            # thrust, the floating one with none
            thrust = facts["thrust"][ld["case"]] if roles[b["id"]] == "both" else 0.0
            assert ld["Fx_N"] == pytest.approx(thrust, abs=1e-6)


def _hours_edit(m: dict[str, Any]) -> None:
    """Base model of conftest with hours: run 1500 h, slow 500 h, and a peak case."""
    for case, hours in zip(m["cases"], ("1500 h", "500 h"), strict=True):
        case.pop("share")
        case["hours"] = hours
    m["cases"].append({"id": "kick", "kind": "peak", "speed": 0,
                       "input": {"element": "coupling1", "torque": "80 N*m"},
                       "outputs": {"gear1": 1.0}})


# 1500 / (1500 + 500) = 0.75, 500 / 2000 = 0.25; a peak case has no share.
HOURS_SHARES = {"run": 0.75, "slow": 0.25, "kick": 0.0}


# ----------------------------------------------------------------- contract (no life)
def test_json_contract_from_python(demo_path: Path) -> None:
    from shaftsys.analysis import analyse
    from shaftsys.io.loader import load_model
    from shaftsys.io.output import json_ready
    from shaftsys.results_json import result_to_dict

    data = result_to_dict(analyse(load_model(demo_path), with_life=False))
    text = json.dumps(json_ready(data), allow_nan=False)
    check_contract(json.loads(text), demo_path.read_bytes(), demo_facts(demo_path))


def test_hours_are_normalised_to_shares(model_yaml: Any) -> None:
    from shaftsys.analysis import analyse
    from shaftsys.io.loader import load_model
    from shaftsys.results_json import result_to_dict

    path, _ = model_yaml(edit=_hours_edit)
    data = result_to_dict(analyse(load_model(path), with_life=False))
    shares = {c["id"]: c["share"] for c in data["cases"]}
    assert shares == pytest.approx(HOURS_SHARES, abs=1e-12)
    assert data["model_sha256"] == hashlib.sha256(path.read_bytes()).hexdigest()


# ----------------------------------------------------------------- check (needs life)
@needs_life
def test_check_writes_json_contract(tmp_path: Path, demo_path: Path,
                                    capsys: pytest.CaptureFixture[str]) -> None:
    out = tmp_path / "out.json"
    code = main(["check", str(demo_path), "--json", str(out)])
    stdout, err = capsys.readouterr()
    assert "Traceback" not in err
    data = json.loads(out.read_text(encoding="utf-8"))
    check_contract(data, demo_path.read_bytes(), demo_facts(demo_path))
    assert code == (0 if data["ok"] else 1)   # README: 0 all pass, 1 a target missed
    assert "A" in stdout and "B" in stdout     # the reaction and verdict tables
    for b in data["bearings"]:
        assert "life" in b


@needs_life
def test_check_hours_model_normalised_shares(tmp_path: Path, model_yaml: Any) -> None:
    path, _ = model_yaml(edit=_hours_edit)
    out = tmp_path / "hours.json"
    assert main(["check", str(path), "--json", str(out), "--quiet"]) in (0, 1)
    data = json.loads(out.read_text(encoding="utf-8"))
    assert {c["id"]: c["share"] for c in data["cases"]} == pytest.approx(HOURS_SHARES,
                                                                           abs=1e-12)


@needs_life
def test_check_json_to_stdout_only(demo_path: Path, capsys: pytest.CaptureFixture[str]
                                   ) -> None:
    code = main(["check", str(demo_path), "--json", "-"])
    stdout, err = capsys.readouterr()
    data = json.loads(stdout)   # the whole of stdout is one JSON document
    check_contract(data, demo_path.read_bytes(), demo_facts(demo_path))
    assert code == (0 if data["ok"] else 1)
    assert "Traceback" not in err


@needs_life
def test_check_json_into_missing_folder(tmp_path: Path, demo_path: Path,
                                        capsys: pytest.CaptureFixture[str]) -> None:
    target = tmp_path / "no_such_folder" / "out.json"
    code = main(["check", str(demo_path), "--json", str(target), "--quiet"])
    _, err = capsys.readouterr()
    assert code == 2
    assert "Traceback" not in err
    assert "no_such_folder" in err and "does not exist" in err
    assert not target.parent.exists()


@needs_life
def test_check_unbalanced_torque_is_an_error_not_a_crash(
        model_yaml: Any, capsys: pytest.CaptureFixture[str]) -> None:
    """A process-load torque nothing balances (no bearing takes torque): exit 2 (bad
    input) or 3 (ill-posed system), one message, no traceback, nothing on stdout."""
    path, _ = model_yaml(edit=lambda m: m["shafts"][0]["elements"][2].update(
        moment=["1000 N*mm", 0, 0]))
    assert main(["check", str(path)]) in (2, 3)
    out, err = capsys.readouterr()
    assert out == ""
    assert "Traceback" not in err
    assert len(err.strip().splitlines()) == 1


@needs_life
def test_check_bad_model_exit_2(model_yaml: Any, capsys: pytest.CaptureFixture[str]
                                ) -> None:
    path, _ = model_yaml(edit=lambda m: m["shafts"][0]["steps"][1].update(d="45 kg"))
    assert main(["check", str(path)]) == 2
    out, err = capsys.readouterr()
    assert out == ""
    assert len(err.strip().splitlines()) == 1
    assert "Traceback" not in err


# ----------------------------------------------------------------- other commands
@pytest.mark.parametrize("argv", [["--help"], ["check", "--help"], ["validate", "--help"],
                                  ["schema", "--help"]])
def test_help_has_an_example(argv: list[str], capsys: pytest.CaptureFixture[str]) -> None:
    with pytest.raises(SystemExit) as info:
        main(argv)
    assert info.value.code == 0
    assert "example" in capsys.readouterr().out


def test_validate_demo(demo_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["validate", str(demo_path)]) == 0
    out, err = capsys.readouterr()
    assert "valid model" in out
    assert "1 shaft(s), 2 bearing(s), 4 case(s)" in out
    assert err == ""
    assert main(["validate", str(demo_path), "--quiet"]) == 0
    assert capsys.readouterr().out == ""


def test_schema_is_valid_and_accepts_the_demo(demo_path: Path,
                                              capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["schema"]) == 0
    schema = json.loads(capsys.readouterr().out)
    jsonschema.Draft202012Validator.check_schema(schema)
    validator = jsonschema.Draft202012Validator(schema)
    demo = yaml.safe_load(demo_path.read_text(encoding="utf-8"))
    errors = sorted(validator.iter_errors(demo), key=str)
    assert errors == []
    # and it rejects a typo like the loader does
    demo["shafts"][0]["bearings"][0]["diamter"] = 50
    assert list(validator.iter_errors(demo))


def test_schema_to_file_and_missing_folder(tmp_path: Path,
                                           capsys: pytest.CaptureFixture[str]) -> None:
    target = tmp_path / "model.schema.json"
    assert main(["schema", "-o", str(target)]) == 0
    jsonschema.Draft202012Validator.check_schema(json.loads(target.read_text("utf-8")))
    # written like any new file (mkstemp's 0600 is not kept): 0o666 minus the umask
    if os.name == "posix":
        mask = os.umask(0)
        os.umask(mask)
        assert stat.S_IMODE(target.stat().st_mode) == 0o666 & ~mask
    missing = tmp_path / "nowhere" / "model.schema.json"
    assert main(["schema", "-o", str(missing)]) == 2
    _, err = capsys.readouterr()
    assert "Traceback" not in err
    assert "nowhere" in err and "does not exist" in err
    assert len(err.strip().splitlines()) == 1


def test_no_command_prints_help(capsys: pytest.CaptureFixture[str]) -> None:
    assert main([]) == 0
    assert "example" in capsys.readouterr().out


def test_python_dash_m(demo_path: Path) -> None:
    """``python -m shaftsys`` is the same command line (shaftsys/__main__.py)."""
    root = Path(shaftsys.__file__).resolve().parent.parent
    done = subprocess.run([sys.executable, "-m", "shaftsys", "validate", str(demo_path)],
                          cwd=root, capture_output=True, text=True, check=False)
    assert done.returncode == 0, done.stderr
    assert "valid model" in done.stdout
