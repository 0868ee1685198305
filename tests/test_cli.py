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

HAS_LIFE = importlib.util.find_spec("shaftsys.analysis.life") is not None
needs_life = pytest.mark.skipif(
    not HAS_LIFE, reason="shaftsys.analysis.life (attach_life) is not written yet")



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
    from shaftsys.io.results_json import result_to_dict

    data = result_to_dict(analyse(load_model(demo_path), with_life=False))
    text = json.dumps(json_ready(data), allow_nan=False)
    check_contract(json.loads(text), demo_path.read_bytes(), demo_facts(demo_path))


def test_hours_are_normalised_to_shares(model_yaml: Any) -> None:
    from shaftsys.analysis import analyse
    from shaftsys.io.loader import load_model
    from shaftsys.io.results_json import result_to_dict

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


# =============================================================================== the
# command-line issue: every command, exit codes, new, colour, progress, --json -
import io  # noqa: E402

from shaftsys.cli import EXIT_CODES_TEXT, _parser  # noqa: E402
from shaftsys.cli import progress as progress_mod  # noqa: E402
from shaftsys.cli.terminal import colour_wanted, paint_verdicts  # noqa: E402
from shaftsys.errors import NumericalError  # noqa: E402

ROOT = Path(__file__).resolve().parent.parent
ANSI = "\x1b["


class _Tty(io.StringIO):
    """A text stream that says it is a terminal."""

    def isatty(self) -> bool:
        return True


def _run_cli(*args: str, env: dict[str, str] | None = None
             ) -> subprocess.CompletedProcess[str]:
    """``python -m shaftsys ARGS`` in a child process, stdout and stderr as pipes."""
    full_env = {**os.environ, **(env or {})}
    return subprocess.run([sys.executable, "-m", "shaftsys", *args], cwd=ROOT,
                          capture_output=True, text=True, check=False, env=full_env,
                          stdin=subprocess.DEVNULL)


def _singular(m: dict[str, Any]) -> None:
    """Both supports elastic with a vanishing radial stiffness (1e-9 N/mm).

    The loader accepts it (a positive stiffness), but the bending stiffness matrix is
    numerically singular: the shaft floats on its supports.
    """
    for b in m["shafts"][0]["bearings"]:
        b["radial_stiffness"] = "1e-9 N/mm"


def _long_target(m: dict[str, Any]) -> None:
    """A target life no bearing of the base model reaches (10^10 h)."""
    m["life"] = {"target": "1e10 h"}


# ----------------------------------------------------------------- help on every command
def test_every_command_help_has_a_worked_example_and_exit_codes(
        capsys: pytest.CaptureFixture[str]) -> None:
    _, handlers = _parser()
    assert {"check", "report", "plot", "validate", "schema", "new"} <= set(handlers)
    for name in handlers:       # a command added later (sweep) is checked too
        with pytest.raises(SystemExit) as info:
            main([name, "--help"])
        assert info.value.code == 0
        out = capsys.readouterr().out
        assert "example" in out, name
        assert f"shaftsys {name} " in out, name     # the example runs this command
        if name == "sweep":
            # a study exits 0 whenever it ran, whatever the verdicts (studies issue)
            assert "exit codes:" in out and "0  the study ran" in out
        elif name == "optimise":
            # exit 3 means the optimiser did not converge (its own epilog)
            assert "exit codes:" in out and "3  the optimiser failed" in out
            assert "2  bad input" in out and "1  a constraint cannot be met" in out
        else:
            assert EXIT_CODES_TEXT in out, name
        assert "--quiet" in out and "-q" in out, name


@pytest.mark.parametrize("name", ["check", "report"])
def test_json_option_on_result_commands(name: str, capsys: pytest.CaptureFixture[str]
                                        ) -> None:
    with pytest.raises(SystemExit):
        main([name, "--help"])
    assert "--json PATH" in capsys.readouterr().out


def test_exit_codes_in_help_and_readme(capsys: pytest.CaptureFixture[str]) -> None:
    """The codes the tests below prove are the ones the help and the README promise."""
    main([])
    top = capsys.readouterr().out
    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    for code, words in ((0, "pass"), (1, "missed"), (2, "bad input"), (3, "numerical")):
        assert f"{code}  " in top and words in top
        assert f"**{code}**" in readme and words in readme


# ----------------------------------------------------------------- exit codes, proven
@needs_life
def test_exit_0_when_every_check_passes(tmp_path: Path, demo_path: Path) -> None:
    out = tmp_path / "r.json"
    assert main(["check", str(demo_path), "--json", str(out), "-q"]) == 0
    assert json.loads(out.read_text("utf-8"))["ok"] is True


@needs_life
def test_exit_1_target_missed_results_still_written(tmp_path: Path, model_yaml: Any,
                                                    capsys: pytest.CaptureFixture[str]
                                                    ) -> None:
    path, _ = model_yaml(edit=_long_target)
    out = tmp_path / "r.json"
    assert main(["check", str(path), "--json", str(out)]) == 1
    stdout, err = capsys.readouterr()
    data = json.loads(out.read_text("utf-8"))
    assert data["ok"] is False
    assert all(b["life"]["life_ok"] is False for b in data["bearings"])
    assert "FAILING" in stdout and "Traceback" not in err
    html = tmp_path / "r.html"
    assert main(["report", str(path), "-o", str(html), "-q"]) == 1
    assert "TARGET MISSED" in html.read_text("utf-8")
    png = tmp_path / "d.png"
    assert main(["plot", str(path), "--what", "drawing", "-o", str(png), "-q"]) == 1
    assert png.read_bytes()[:4] == b"\x89PNG"


def test_exit_2_bad_input_on_every_command(tmp_path: Path, model_yaml: Any,
                                           capsys: pytest.CaptureFixture[str]) -> None:
    path, _ = model_yaml(edit=lambda m: m["shafts"][0]["steps"][1].update(d="45 kg"))
    for argv in (["check", str(path)], ["report", str(path), "-o", str(tmp_path / "r.html")],
                 ["plot", str(path), "--what", "drawing", "-o", str(tmp_path / "p.png")],
                 ["validate", str(path)]):
        assert main(argv) == 2, argv
        out, err = capsys.readouterr()
        assert out == "" and "Traceback" not in err
        assert len(err.strip().splitlines()) == 1
        assert err.startswith("shaftsys: error: ")
    assert not (tmp_path / "r.html").exists() and not (tmp_path / "p.png").exists()


def test_exit_3_numerical_failure_from_a_real_model(tmp_path: Path, model_yaml: Any,
                                                    capsys: pytest.CaptureFixture[str]
                                                    ) -> None:
    path, _ = model_yaml(edit=_singular)
    assert main(["validate", str(path), "-q"]) == 0      # the loader lets it through
    html = tmp_path / "r.html"
    for argv in (["check", str(path), "--json", str(tmp_path / "r.json")],
                 ["report", str(path), "-o", str(html)],
                 ["plot", str(path), "--what", "drawing", "-o", str(tmp_path / "p.png")]):
        assert main(argv) == 3, argv
        out, err = capsys.readouterr()
        assert out == "" and "Traceback" not in err
        assert len(err.strip().splitlines()) == 1
        assert "singular" in err or "mechanism" in err
    assert list(tmp_path.glob("r.*")) == [] and not (tmp_path / "p.png").exists()


def test_exit_3_in_a_child_process_no_traceback(model_yaml: Any) -> None:
    path, _ = model_yaml(edit=_singular)
    done = _run_cli("check", str(path))
    assert done.returncode == 3
    assert done.stdout == ""
    assert "Traceback" not in done.stderr
    assert done.stderr.startswith("shaftsys: error: ")


def test_exit_3_when_the_solver_reports_numerical_trouble(
        monkeypatch: pytest.MonkeyPatch, demo_path: Path, tmp_path: Path,
        capsys: pytest.CaptureFixture[str]) -> None:
    """Any NumericalError raised inside the solve ends as exit 3 with one message."""
    import shaftsys.analysis.pipeline

    def broken(*args: Any, **kwargs: Any) -> Any:
        raise NumericalError("equilibrium residual 1e-3 above tolerance 1e-9")

    monkeypatch.setattr(shaftsys.analysis.pipeline, "analyse", broken)
    for argv in (["check", str(demo_path)], ["report", str(demo_path), "-o",
                                              str(tmp_path / "r.html")]):
        assert main(argv) == 3
        out, err = capsys.readouterr()
        assert out == "" and err.strip() == (
            "shaftsys: error: equilibrium residual 1e-3 above tolerance 1e-9")


# ----------------------------------------------------------------- new
# Statics of the starter model (free-body diagram of the whole shaft, sum F = 0),
# full_load case, with the inputs typed in from shaftsys/data/starter_model.yaml:
# 5.5 kW at 60 rpm; chain wheels 320 mm pitch diameter pulling toward +z with half the
# torque each (wrap 180 deg: both strands point at the tail shaft); drive sprocket
# 380 mm, chain toward -y (180 deg), wrap 170 deg, so the tight strand leaves at
# 180 - (180 - 170)/2 = 175 deg for a positive input torque; only the tight strand
# loads the shaft (common practice, no source). Weight: element masses 38 + 38 + 24 kg
# and the steel shaft (7850 kg/m^3) of steps 140 x d70, 820 x d85, 140 x d70, 120 x d60
# mm, g = 9.81 m/s^2. The bearings carry the sum of the applied forces.
STARTER_T_NMM = 5500.0 / (2.0 * math.pi * 60.0 / 60.0) * 1e3
STARTER_SHAFT_KG = 7850e-9 * math.pi / 4.0 * (140 * 70**2 + 820 * 85**2 + 140 * 70**2
                                              + 120 * 60**2)
STARTER_FZ_N = (2 * (0.5 * STARTER_T_NMM / 160.0)
                + STARTER_T_NMM / 190.0 * math.sin(math.radians(175.0)))
STARTER_FY_N = (STARTER_T_NMM / 190.0 * math.cos(math.radians(175.0))
                - 9.81 * (38 + 38 + 24 + STARTER_SHAFT_KG))


@needs_life
def test_new_writes_a_commented_starter_that_solves(tmp_path: Path,
                                                    capsys: pytest.CaptureFixture[str]
                                                    ) -> None:
    path = tmp_path / "conveyor.yaml"
    assert main(["new", str(path)]) == 0
    out, err = capsys.readouterr()
    assert f"wrote {path}" in out and f"shaftsys check {path}" in out and err == ""
    text = path.read_text(encoding="utf-8")
    comments = [ln for ln in text.splitlines() if ln.lstrip().startswith("#")]
    assert len(comments) >= 15
    assert "INVENTED" in text and "conveyor.yaml" in text and "THIS_FILE" not in text
    assert "fan" not in text.lower()            # its own scenario, not the demo's
    results = tmp_path / "r.json"
    code = main(["check", str(path), "--json", str(results), "-q"])
    assert code in (0, 1)                       # never 2 (bad input) or 3 (numerical)
    data = json.loads(results.read_text("utf-8"))
    full = [next(ld for ld in b["loads"] if ld["case"] == "full_load")
            for b in data["bearings"]]
    assert sum(ld["Fz_N"] for ld in full) == pytest.approx(STARTER_FZ_N, rel=1e-6)
    assert sum(ld["Fy_N"] for ld in full) == pytest.approx(STARTER_FY_N, rel=1e-6)


def test_new_starter_passes_the_schema(tmp_path: Path) -> None:
    path = tmp_path / "m.yaml"
    assert main(["new", str(path), "-q"]) == 0
    schema = json.loads((ROOT / "shaftsys" / "model.schema.json").read_text("utf-8"))
    model = yaml.safe_load(path.read_text("utf-8"))
    assert list(jsonschema.Draft202012Validator(schema).iter_errors(model)) == []


def test_new_refuses_to_overwrite_without_force(tmp_path: Path,
                                                capsys: pytest.CaptureFixture[str]
                                                ) -> None:
    path = tmp_path / "mine.yaml"
    path.write_text("my own work\n", encoding="utf-8")
    assert main(["new", str(path)]) == 2
    out, err = capsys.readouterr()
    assert out == "" and "Traceback" not in err
    assert "already exists" in err and "--force" in err
    assert path.read_text(encoding="utf-8") == "my own work\n"
    assert main(["new", str(path), "--force", "-q"]) == 0
    assert capsys.readouterr() == ("", "")
    assert path.read_text(encoding="utf-8").startswith("# shaftsys starter model")


def test_new_to_stdout_and_into_a_missing_folder(tmp_path: Path,
                                                 capsys: pytest.CaptureFixture[str]
                                                 ) -> None:
    assert main(["new", "-"]) == 0
    out, _ = capsys.readouterr()
    assert yaml.safe_load(out)["shaftsys"] == 1
    missing = tmp_path / "nowhere" / "m.yaml"
    assert main(["new", str(missing)]) == 2
    _, err = capsys.readouterr()
    assert "does not exist" in err and "Traceback" not in err
    assert not missing.parent.exists()


def test_new_default_name(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.chdir(tmp_path)
    assert main(["new", "-q"]) == 0
    assert (tmp_path / "model.yaml").is_file()


# ----------------------------------------------------------------- --quiet, --json -
@needs_life
def test_quiet_prints_nothing_on_any_command(tmp_path: Path, demo_path: Path,
                                             capsys: pytest.CaptureFixture[str]) -> None:
    # a real process first: there the library's log warnings would reach stderr
    done = _run_cli("check", str(demo_path), "--quiet")
    assert done.returncode == 0, done.stderr
    assert (done.stdout, done.stderr) == ("", "")
    for argv in (["report", str(demo_path), "-o", str(tmp_path / "r.html")],
                 ["plot", str(demo_path), "--what", "life", "--bearing", "A", "-o",
                  str(tmp_path / "l.svg")],
                 ["validate", str(demo_path)], ["schema", "-o", str(tmp_path / "s.json")],
                 ["new", str(tmp_path / "n.yaml"), "--force"]):
        assert main([*argv, "--quiet"]) == 0, argv
        assert capsys.readouterr() == ("", ""), argv
        assert main(argv) == 0, argv
        assert capsys.readouterr().out != "", argv  # the same command without -q talks


@needs_life
def test_report_json_to_stdout_for_pipelines(tmp_path: Path, demo_path: Path,
                                             capsys: pytest.CaptureFixture[str]) -> None:
    html = tmp_path / "r.html"
    code = main(["report", str(demo_path), "-o", str(html), "--json", "-"])
    stdout, err = capsys.readouterr()
    data = json.loads(stdout)             # stdout is exactly one JSON document
    check_contract(data, demo_path.read_bytes(), demo_facts(demo_path))
    assert code == (0 if data["ok"] else 1)
    assert f"wrote {html}" in err         # the human message moved to stderr
    assert html.read_text("utf-8").startswith("<!DOCTYPE html>")
    as_file = tmp_path / "r.json"
    assert main(["report", str(demo_path), "-o", str(html), "--json", str(as_file),
                 "-q"]) == code
    assert json.loads(as_file.read_text("utf-8"))["bearings"] == data["bearings"]


# ----------------------------------------------------------------- colour
def test_colour_only_on_a_terminal_without_no_color() -> None:
    tty, pipe = _Tty(), io.StringIO()
    assert colour_wanted(tty, {}) is True
    assert colour_wanted(tty, {"TERM": "xterm-256color"}) is True
    assert colour_wanted(tty, {"NO_COLOR": "1"}) is False
    assert colour_wanted(tty, {"NO_COLOR": ""}) is True   # no-color.org: empty = unset
    assert colour_wanted(tty, {"TERM": "dumb"}) is False
    assert colour_wanted(pipe, {}) is False


def test_paint_verdicts_colours_the_verdict_column_only() -> None:
    text = ("bearing  verdict\nA  PASS\nB  FAIL\ns1  1.0e-03  marginal\nFAILING: B\n"
            "Notes\ns1: fatigue ok")
    got = paint_verdicts(text).split("\n")
    assert got[0] == "bearing  verdict"
    assert got[1] == "A  \x1b[1;32mPASS\x1b[0m"
    assert got[2] == "B  \x1b[1;31mFAIL\x1b[0m"
    assert got[3].endswith("\x1b[33mmarginal\x1b[0m")
    assert got[4] == "\x1b[1;31mFAILING: B\x1b[0m"
    assert got[6] == "s1: fatigue ok"                 # free text of the notes stays plain


@needs_life
def test_check_colours_verdicts_on_a_terminal(monkeypatch: pytest.MonkeyPatch,
                                              demo_path: Path) -> None:
    monkeypatch.delenv("NO_COLOR", raising=False)
    monkeypatch.setenv("TERM", "xterm")
    tty = _Tty()
    monkeypatch.setattr(sys, "stdout", tty)
    assert main(["check", str(demo_path)]) == 0
    assert "\x1b[1;32mPASS\x1b[0m" in tty.getvalue()
    monkeypatch.setenv("NO_COLOR", "1")
    tty2 = _Tty()
    monkeypatch.setattr(sys, "stdout", tty2)
    assert main(["check", str(demo_path)]) == 0
    assert "PASS" in tty2.getvalue() and ANSI not in tty2.getvalue()


@needs_life
def test_no_colour_in_pipes_and_files(tmp_path: Path, demo_path: Path) -> None:
    done = _run_cli("check", str(demo_path), env={"TERM": "xterm"})
    assert done.returncode == 0 and "PASS" in done.stdout
    assert ANSI not in done.stdout and ANSI not in done.stderr
    out = tmp_path / "r.json"
    assert _run_cli("check", str(demo_path), "--json", str(out), "-q").returncode == 0
    assert ANSI not in out.read_text("utf-8")


@needs_life
def test_json_on_stdout_stays_plain_on_a_terminal(monkeypatch: pytest.MonkeyPatch,
                                                  demo_path: Path) -> None:
    monkeypatch.delenv("NO_COLOR", raising=False)
    tty_out, tty_err = _Tty(), _Tty()
    monkeypatch.setattr(sys, "stdout", tty_out)
    monkeypatch.setattr(sys, "stderr", tty_err)
    assert main(["check", str(demo_path), "--json", "-"]) == 0
    assert ANSI not in tty_out.getvalue()
    assert json.loads(tty_out.getvalue())["ok"] is True
    assert "\x1b[1;32mPASS" in tty_err.getvalue()      # the tables went to stderr


# ----------------------------------------------------------------- progress
def test_progress_bar_only_on_a_terminal_and_not_when_quiet() -> None:
    tty, pipe = _Tty(), io.StringIO()
    with progress_mod.ProgressBar(3, "work", stream=tty, min_interval_s=0.0) as bar:
        assert bar.enabled
        for k in range(3):
            bar.advance(f"item {k}")
    assert "work" in tty.getvalue() and "item" in tty.getvalue()
    assert bar.count == 3 and bar.total == 3
    with progress_mod.ProgressBar(3, "work", stream=pipe) as bar2:
        bar2.advance()
        bar2.status("x")
        bar2.add_total(2)
    assert pipe.getvalue() == "" and not bar2.enabled
    assert (bar2.count, bar2.total) == (1, 5)
    quiet_tty = _Tty()
    with progress_mod.ProgressBar(1, "work", quiet=True, stream=quiet_tty) as bar3:
        bar3.advance()
    assert quiet_tty.getvalue() == ""
    with pytest.raises(ValueError):
        progress_mod.ProgressBar(-1)


def test_track_yields_every_item_unchanged() -> None:
    tty = _Tty()
    items = ["a", "b", "c"]
    assert list(progress_mod.track(items, "t", stream=tty, min_interval_s=0.0)) == items
    assert "3/3" in tty.getvalue()
    assert list(progress_mod.track(iter(items), "t", stream=io.StringIO())) == items


@needs_life
def test_report_draws_progress_on_a_terminal_stderr(monkeypatch: pytest.MonkeyPatch,
                                                    tmp_path: Path, demo_path: Path,
                                                    capsys: pytest.CaptureFixture[str]
                                                    ) -> None:
    tty_err = _Tty()
    monkeypatch.setattr(sys, "stderr", tty_err)
    assert main(["report", str(demo_path), "-o", str(tmp_path / "r.html")]) == 0
    text = tty_err.getvalue()
    assert "report:" in text and "bearing B" in text        # per-bearing steps counted
    assert "wrote" not in text                               # the message is on stdout
    assert "wrote" in capsys.readouterr().out
    tty_err2 = _Tty()
    monkeypatch.setattr(sys, "stderr", tty_err2)
    assert main(["check", str(demo_path), "-q"]) == 0
    assert tty_err2.getvalue() == ""                         # quiet: no bar at all
