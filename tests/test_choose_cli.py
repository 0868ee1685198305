"""``shaftsys choose`` on the bundled machine with every bearing left open, end to end.

The demo machine and its catalogue are invented (models/belt_reducer_open.yaml,
models/demo_catalogue.csv). What is checked against the outside world here is the
contract: every chosen bearing, re-checked from the written model file by the ordinary
``check`` (ISO 281:2007 lives, ISO 76:2006 static safety), passes; the JSON carries
the public keys of the choice.
"""

from __future__ import annotations

import json
import shutil
from pathlib import Path

import pytest

from shaftsys.cli import main
from shaftsys.io.loader import load_model

MODELS = Path(__file__).resolve().parent.parent / "models"
OPEN = MODELS / "belt_reducer_open.yaml"
SELECTION_KEYS = {"designation", "type", "d_mm", "D_mm", "B_mm", "C_N", "C0_N", "margin",
                  "s0", "runners_up", "reason_if_none"}


@pytest.fixture
def open_model(tmp_path: Path) -> Path:
    shutil.copy(OPEN, tmp_path / OPEN.name)
    shutil.copy(MODELS / "demo_catalogue.csv", tmp_path / "demo_catalogue.csv")
    return tmp_path / OPEN.name


def test_choose_writes_a_model_that_check_passes(open_model: Path, tmp_path: Path,
                                                 capsys: pytest.CaptureFixture[str]) -> None:
    out = tmp_path / "chosen.yaml"
    js = tmp_path / "choice.json"
    code = main(["choose", str(open_model), "--write", str(out), "--json", str(js)])
    text = capsys.readouterr().out
    assert code == 0
    assert "Bearing choice" in text and "runner-up 1" in text and "settled" in text
    data = json.loads(js.read_text())
    assert data["ok"] is True and data["selection"]["complete"] is True
    assert data["selection"]["passes"] >= 2        # the tapered pair changes the reactions
    for b in data["bearings"]:
        sel = b["selection"]
        assert set(sel) >= SELECTION_KEYS
        assert ("Lnm_h" in sel) or ("L10_h" in sel)
        assert sel["margin"] >= 1.0 and sel["reason_if_none"] is None
        # the checked bearing is the chosen one, with the chosen ratings
        assert b["C_N"] == pytest.approx(sel["C_N"]) and b["life"]["margin"] == \
            pytest.approx(sel["margin"], rel=1e-9)
    filled = load_model(str(out))
    assert filled.open_seats == ()
    assert main(["check", str(out), "--quiet"]) == 0
    # the adjusted pair got pressure centres from its rows
    mid = {b.id: b for _, b in filled.bearings() if b.id.startswith("mid")}
    assert all(b.pressure_centre_offset_mm > 0 for b in mid.values())


def test_check_on_the_open_model_chooses_first(open_model: Path, tmp_path: Path,
                                               capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["check", str(open_model)]) == 0
    assert "Bearing choice" in capsys.readouterr().out


def test_no_candidate_is_exit_1_with_the_closest_miss(open_model: Path,
                                                      capsys: pytest.CaptureFixture[str]
                                                      ) -> None:
    text = open_model.read_text().replace("max_D: 110 mm, max_B: 30 mm", "max_D: 70 mm")
    open_model.write_text(text)
    code = main(["choose", str(open_model), "--json", "-", "--quiet"])
    data = json.loads(capsys.readouterr().out)
    assert code == 1
    sel = next(b for b in data["bearings"] if b["id"] == "in_A")["selection"]
    assert sel["designation"] is None and "envelope" in sel["reason_if_none"]
    assert next(b for b in data["bearings"] if b["id"] == "in_A")["verdict"] == \
        "not evaluated"


def test_choose_needs_an_open_bearing(capsys: pytest.CaptureFixture[str]) -> None:
    code = main(["choose", str(MODELS / "fan_drive.yaml")])
    err = capsys.readouterr().err
    assert code == 2 and "nothing to choose" in err and "Traceback" not in err


def test_write_refuses_the_input_file(open_model: Path,
                                      capsys: pytest.CaptureFixture[str]) -> None:
    before = open_model.read_text()
    code = main(["choose", str(open_model), "--write", str(open_model), "--quiet"])
    assert code == 2 and open_model.read_text() == before
    assert "Traceback" not in capsys.readouterr().err


def test_objective_option_changes_the_ranking(open_model: Path, tmp_path: Path,
                                              capsys: pytest.CaptureFixture[str]) -> None:
    """Common practice, no source: 'largest_margin' picks, per support, the qualifying
    row with the largest C/C_req, never a smaller one than 'smallest' picks."""
    assert main(["choose", str(open_model), "--json", "-", "-q"]) == 0
    small = json.loads(capsys.readouterr().out)
    assert main(["choose", str(open_model), "--objective", "largest_margin", "--json", "-",
                 "-q"]) in (0, 1)
    large = json.loads(capsys.readouterr().out)
    for a, b in zip(small["bearings"], large["bearings"], strict=True):
        assert b["selection"]["margin"] >= a["selection"]["margin"] - 1e-12


def test_report_has_the_choice(open_model: Path, tmp_path: Path) -> None:
    html = tmp_path / "r.html"
    assert main(["report", str(open_model), "-o", str(html), "-q"]) == 0
    text = html.read_text()
    assert "Bearing choice" in text and "runner-up 1" in text
