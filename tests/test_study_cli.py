"""The sweep command: exit codes, the model's study section, messages naming the field."""

from __future__ import annotations

import argparse
import json
import shutil
from pathlib import Path

import pytest

from shaftsys.cli.sweep import add_sweep_parser, run_sweep

SPINDLE = Path(__file__).resolve().parent.parent / "models" / "spindle_3brg.yaml"


def _run(argv):
    p = argparse.ArgumentParser(prog="shaftsys")
    sub = p.add_subparsers(dest="command")
    add_sweep_parser(sub)
    return run_sweep(p.parse_args(["sweep", *argv]))


def test_sweep_from_study_section(tmp_path, capsys):
    code = _run([str(SPINDLE), "--out", str(tmp_path / "o"), "--plot",
                 str(tmp_path / "o" / "map.svg")])
    assert code == 0
    summary = json.loads((tmp_path / "o" / "summary.json").read_text())
    assert summary["variants"] == 20 * 15
    assert (tmp_path / "o" / "map.svg").read_text().lstrip().startswith("<?xml")
    assert "300 variants" in capsys.readouterr().out


def test_vary_on_command_line(tmp_path):
    code = _run([str(SPINDLE), "--vary", "bearing.B.at=215,230,245", "--limit",
                 "slope@bearings=0.002", "--out", str(tmp_path), "-q"])
    assert code == 0
    assert json.loads((tmp_path / "summary.json").read_text())["variants"] == 3


def test_bad_path_is_exit_2(tmp_path, capsys):
    assert _run([str(SPINDLE), "--vary", "bearing.Q.at=1:2:3", "--out", str(tmp_path)]) == 2
    assert "no bearing 'Q'" in capsys.readouterr().err


def test_study_section_errors_name_line_and_field(tmp_path, capsys):
    text = SPINDLE.read_text().replace("{kind: slope, at: [bearings], max: 0.001}",
                                       "{kind: slope, at: [bearings], maxx: 0.001}")
    path = tmp_path / "m.yaml"
    path.write_text(text)
    assert _run([str(path), "--out", str(tmp_path / "o")]) == 2
    err = capsys.readouterr().err
    line = next(i + 1 for i, s in enumerate(text.splitlines()) if "maxx" in s)
    assert f"m.yaml:{line}" in err and "study.limits[1].maxx" in err


@pytest.mark.parametrize("bad", ["bearing.B.at", "bearing.B.at=1:2"])
def test_bad_vary_syntax_is_exit_2(tmp_path, bad):
    assert _run([str(SPINDLE), "--vary", bad, "--out", str(tmp_path)]) == 2
    shutil.rmtree(tmp_path, ignore_errors=True)
