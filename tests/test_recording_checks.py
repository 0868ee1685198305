"""A model's ``recording:`` section feeds every command that analyses the model: ``check``,
``report``, ``plot``, ``validate`` and the study commands reduce the recording themselves
and state the reduction error.

Sources: a level series (square wave) has each level as its own p-th power mean, so
binned and direct equivalent loads agree to round-off (hand-derived: the mean of a
constant is the constant); the two routes to the same reduction (the model's section and
the ``duty`` command's options) must give the same lives (common practice, no source).
"""

from __future__ import annotations

import json
import logging
from collections.abc import Iterator
from pathlib import Path

import numpy as np
import pytest

from shaftsys.cli.main import main
from shaftsys.io.model_duty import load_model_with_duty

ROOT = Path(__file__).resolve().parents[1]
REDUCER = ROOT / "models" / "belt_reducer.yaml"
LEVELS_NM = (40.0, 95.0)


@pytest.fixture(autouse=True)
def _quiet_engine() -> Iterator[None]:
    logging.disable(logging.WARNING)
    yield
    logging.disable(logging.NOTSET)


@pytest.fixture
def recorded(tmp_path: Path) -> Path:
    """The bundled reducer with a recording section over a two-level square wave."""
    t = np.arange(0.0, 400.0, 0.1)
    high = (np.floor(t / 20.0) % 2) == 1
    T = np.where(high, LEVELS_NM[1], LEVELS_NM[0])
    rows = "\n".join(f"{a:.1f},{b:g},1460" for a, b in zip(t, T, strict=True))
    (tmp_path / "square.csv").write_text("time [s],torque [N*m],speed [rpm]\n" + rows + "\n")
    model = tmp_path / "m.yaml"
    model.write_text(REDUCER.read_text() + "\nrecording:\n  file: square.csv\n  bins: 8\n")
    return model


def run(argv: list[str], capsys: pytest.CaptureFixture[str]) -> tuple[int, str, str]:
    code = main(argv)
    out, err = capsys.readouterr()
    return code, out, err


def test_check_reduces_the_recording_of_the_model(recorded: Path, tmp_path: Path,
                                                  capsys: pytest.CaptureFixture[str]) -> None:
    """``check`` on a model with a recording: the cases are the recording's bins (the
    model's own duty cases replaced, its peak and static cases kept), the reduction and
    its error are in the JSON and the tables, and the exit code follows the verdict."""
    out_json = tmp_path / "r.json"
    code, out, _ = run(["check", str(recorded), "--json", str(out_json)], capsys)
    data = json.loads(out_json.read_text())
    assert code == (0 if data["ok"] else 1)
    red = data["duty_reduction"]
    running = [c for c in red["cases"] if c["kind"] == "duty"]
    assert sorted(c["torque_Nmm"] / 1000.0 for c in running) == pytest.approx(LEVELS_NM,
                                                                             rel=1e-12)
    duty_ids = {c["id"] for c in data["cases"] if c["kind"] == "duty"}
    assert duty_ids == {c["id"] for c in running}
    kept = {c["id"] for c in data["cases"] if c["kind"] != "duty"}
    own = {c.id for c in load_model_with_duty(REDUCER)[0].cases if c.kind.value != "duty"}
    assert own <= kept
    # a level series: binned and direct agree to round-off for every bearing
    assert len(red["reduction_error"]) == 6
    for e in red["reduction_error"]:
        assert abs(e["P_error_pct"]) < 1e-8, e
    assert "duty from the recording" in out and "reduction error" in out
    for e in red["reduction_error"]:
        assert e["bearing"] in out


def test_section_and_duty_command_give_the_same_lives(recorded: Path, tmp_path: Path,
                                                      capsys: pytest.CaptureFixture[str]
                                                      ) -> None:
    """The model's section (``check``) and the ``duty`` command's options over the same
    file reduce to the same cases and the same lives, bit for bit."""
    a, b = tmp_path / "a.json", tmp_path / "b.json"
    assert run(["check", str(recorded), "--json", str(a), "-q"], capsys)[0] in (0, 1)
    assert run(["duty", str(REDUCER), str(recorded.with_name("square.csv")), "--bins", "8",
                "--json", str(b), "-q"], capsys)[0] in (0, 1)
    da, db = json.loads(a.read_text()), json.loads(b.read_text())
    assert da["duty_reduction"]["cases"] == db["duty_reduction"]["cases"]
    la = {x["id"]: x["life"]["Lnm_h"] for x in da["bearings"]}
    lb = {x["id"]: x["life"]["Lnm_h"] for x in db["bearings"]}
    assert la == lb and len(la) == 6


def test_report_and_plot_show_the_load_duration(recorded: Path, tmp_path: Path,
                                                capsys: pytest.CaptureFixture[str]) -> None:
    """The report has the duty section (cases, error table, inline figure); ``plot
    --what duty`` writes the figure; a model without a recording has none (exit 2)."""
    html = tmp_path / "r.html"
    assert run(["report", str(recorded), "-o", str(html), "-q"], capsys)[0] in (0, 1)
    text = html.read_text()
    start = text.index('<section id="duty">')
    section = text[start:text.index("</section>", start)]
    assert "Reduction error per bearing" in section and "<svg" in section
    assert section.count("rec_forward_") == 2
    png = tmp_path / "d.png"
    assert run(["plot", str(recorded), "--what", "duty", "-o", str(png), "-q"],
               capsys)[0] in (0, 1)
    assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n" and png.stat().st_size > 5000
    code, _, err = run(["plot", str(REDUCER), "--what", "duty", "-o", str(png)], capsys)
    assert code == 2 and "names no recording" in err and "recording" in err


def test_missing_recording_is_located(tmp_path: Path, capsys: pytest.CaptureFixture[str]
                                      ) -> None:
    """A recording file that is not there: exit 2 from ``check`` and ``validate`` naming
    the model file, the line of the ``file`` key and the field (the error contract)."""
    text = REDUCER.read_text() + "\nrecording:\n  bins: 4\n  file: nowhere.csv\n"
    model = tmp_path / "m.yaml"
    model.write_text(text)
    line = text.splitlines().index("  file: nowhere.csv") + 1
    for command in ("check", "validate"):
        code, _, err = run([command, str(model)], capsys)
        assert code == 2, (command, err)
        assert f"m.yaml:{line}: recording.file" in err and "nowhere.csv" in err
        assert "Traceback" not in err


def test_study_model_carries_the_recorded_cases(recorded: Path) -> None:
    """What ``sweep`` and ``optimise`` analyse: the model with the recorded cases (no
    analysis run for it when not asked)."""
    model, red = load_model_with_duty(recorded, analyse_model=False)
    assert red is not None and red.result is None
    duty = [c.id for c in model.cases if c.kind.value == "duty"]
    assert duty == [c.id for c in red.cases if c.kind == "duty"]
    plain, none = load_model_with_duty(REDUCER)
    assert none is None and plain.cases[0].id == "forward_full"
