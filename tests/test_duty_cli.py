"""``shaftsys duty``: reading recordings, located errors (exit 2), the YAML fragment,
the demo recording end to end.

Bad-input expectations are the project's error contract (file, line, column, what was
expected; exit 2; no traceback) - common practice, no source. Unit conversions are
cross-checked by recomputing T = P / omega by hand.
"""

from __future__ import annotations

import json
import logging
import math
import re
import subprocess
import sys
from collections.abc import Iterator
from pathlib import Path

import numpy as np
import pytest
import yaml

import shaftsys
from shaftsys.cli.main import main
from shaftsys.io.loader import load_model_text
from shaftsys.io.timeseries import open_series

ROOT = Path(__file__).resolve().parents[1]
REDUCER = ROOT / "models" / "belt_reducer.yaml"


@pytest.fixture(autouse=True)
def _quiet_engine() -> Iterator[None]:
    logging.disable(logging.WARNING)
    yield
    logging.disable(logging.NOTSET)


def write_csv(path: Path, header: str, rows: list[str]) -> Path:
    path.write_text(header + "\n" + "\n".join(rows) + "\n", encoding="utf-8")
    return path


def good_rows(count: int = 400) -> list[str]:
    return [f"{0.5 * i:g},{60 + 20 * math.sin(i / 15):.6g},1460" for i in range(count)]


def run(argv: list[str], capsys: pytest.CaptureFixture[str]) -> tuple[int, str, str]:
    code = main(argv)
    out, err = capsys.readouterr()
    return code, out, err


# ------------------------------------------------------------------------ reading
def test_units_row_and_power_column(tmp_path: Path) -> None:
    """A units row under the header and a power column in kW: T = P/omega with
    omega = 2*pi*n/60 (recomputed by hand), time in minutes converted to seconds."""
    p = write_csv(tmp_path / "r.csv", "t,power,n", ["min,kW,rpm", "0,10,1000", "1,20,1000",
                                                   "2,15,-500"])
    src = open_series(p)
    dt, T, n = (np.concatenate(a) for a in zip(*src.chunks(), strict=True))
    assert dt.tolist() == [30.0, 60.0, 30.0]
    assert T[1] == pytest.approx(20e3 / (2 * math.pi * 1000 / 60) * 1000, rel=1e-12)
    assert n.tolist() == [1000.0, 1000.0, -500.0]


def test_parquet_reads_like_csv(tmp_path: Path) -> None:
    """The same table as CSV and Parquet (units in the column names) gives the same
    samples (common practice, no source)."""
    import pandas as pd

    rng = np.random.default_rng(0)
    frame = pd.DataFrame({"time [s]": np.cumsum(rng.uniform(0.1, 0.2, 500)),
                          "torque [N*m]": rng.uniform(20, 90, 500),
                          "speed [rpm]": np.full(500, 1460.0)})
    frame.to_csv(tmp_path / "r.csv", index=False, float_format="%.17g")
    frame.to_parquet(tmp_path / "r.parquet", index=False)
    a = [np.concatenate(x) for x in zip(*open_series(tmp_path / "r.csv", chunk_rows=64)
                                        .chunks(), strict=True)]
    b = [np.concatenate(x) for x in zip(*open_series(tmp_path / "r.parquet", chunk_rows=50)
                                        .chunks(), strict=True)]
    for x, y in zip(a, b, strict=True):
        np.testing.assert_allclose(x, y, rtol=1e-15)
    assert a[0].sum() == pytest.approx(frame["time [s]"].iloc[-1] - frame["time [s]"].iloc[0])


BAD_INPUTS = [
    # (header, rows, expected line, text in the message)
    ("time [s],torque [N*m],speed [rpm]", ["0,50,1460", "1,50,1460", "0.5,50,1460"], 4,
     "goes back in time"),
    ("time [s],torque [N*m],speed [rpm]", ["0,50,1460", "1,50,1460", "1,50,1460"], 4,
     "repeats the previous time stamp"),
    ("time [s],torque [N*m],speed [rpm]", ["0,50,1460", "1,,1460", "2,50,1460"], 3,
     "empty cell"),
    ("time [s],torque [N*m],speed [rpm]", ["0,50,1460", "1,abc,1460", "2,50,1460"], 3,
     "'abc' is not a finite number"),
    ("time [s],torque [N*m],speed [rpm]", ["0,50,1460", "1,nan,1460", "2,50,1460"], 3,
     "not a finite number"),
    ("time [s],torque [kW],speed [rpm]", ["0,50,1460", "1,50,1460"], 1, "not a moment"),
    ("time [s],speed [rpm]", ["0,1460", "1,1460"], 1, "no torque or power column"),
    ("time [s],torque,speed [rpm]", ["0,50,1460", "1,50,1460"], 1, "has no unit"),
]


@pytest.mark.parametrize(("header", "rows", "line", "text"), BAD_INPUTS)
def test_bad_recordings_are_located(tmp_path: Path, capsys: pytest.CaptureFixture[str],
                                    header: str, rows: list[str], line: int,
                                    text: str) -> None:
    """Each bad recording: exit 2, one message naming file:line (and the column where
    one is at fault), no traceback."""
    p = write_csv(tmp_path / "bad.csv", header, rows)
    code, _, err = run(["duty", str(REDUCER), str(p)], capsys)
    assert code == 2
    assert f"bad.csv:{line}" in err
    assert text in err
    assert "Traceback" not in err


def test_series_that_never_turns(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    """Zero revolutions: exit 2 naming the file and the speed column."""
    p = write_csv(tmp_path / "still.csv", "time [s],torque [N*m],speed [rpm]",
                  ["0,50,0", "1,50,5", "2,50,0"])
    code, _, err = run(["duty", str(REDUCER), str(p)], capsys)
    assert code == 2
    assert "still.csv never turns" in err and "speed" in err


def test_gap_in_time_stamps_is_a_located_warning(tmp_path: Path) -> None:
    """A step far above the median step is a warning naming its line, not an error."""
    rows = good_rows(200)
    rows[100:] = [f"{0.5 * i + 30:g},60,1460" for i in range(100, 200)]
    p = write_csv(tmp_path / "gap.csv", "time [s],torque [N*m],speed [rpm]", rows)
    src = open_series(p, chunk_rows=64)
    list(src.chunks())
    assert len(src.gaps) == 1
    assert re.search(r"gap\.csv: line 102: the time stamps jump by 30\.5 s", src.gaps[0])


# -------------------------------------------------------------------- the command
def test_duty_command_fragment_round_trip(tmp_path: Path,
                                          capsys: pytest.CaptureFixture[str]) -> None:
    """The written YAML fragment pasted over the model's duty cases loads and gives the
    same equivalent loads as the command's own analysis (common practice, no source);
    the JSON carries the reduction with units in its keys."""
    p = write_csv(tmp_path / "r.csv", "time [s],torque [N*m],speed [rpm]", good_rows())
    frag, js = tmp_path / "cases.yaml", tmp_path / "out.json"
    code, out, _ = run(["duty", str(REDUCER), str(p), "--bins", "5", "--write", str(frag),
                        "--json", str(js), "--tolerance", "5"], capsys)
    assert code == 0
    assert "reduction error" in out and "P_direct_N" in out
    data = json.loads(js.read_text())
    reduction = data["duty_reduction"]
    assert {"P_cases_N", "P_direct_N", "P_error_pct"} <= set(reduction["reduction_error"][0])
    raw = yaml.safe_load(REDUCER.read_text())
    kept = [c for c in raw["cases"] if c.get("kind") in ("peak", "static")]
    raw["cases"] = yaml.safe_load(frag.read_text())["cases"] + kept
    text = yaml.safe_dump(raw, sort_keys=False)
    model = load_model_text(text, file=str(REDUCER))
    result = shaftsys.analyse(model)
    expected = {e["bearing"]: e["P_cases_N"] for e in reduction["reduction_error"]}
    for b in result.bearings:
        assert b.life.P_eq_N == pytest.approx(expected[b.bearing.id], rel=1e-12)


def test_bad_option_values(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    """Unknown template case and a peak threshold in the wrong unit: exit 2."""
    p = write_csv(tmp_path / "r.csv", "time [s],torque [N*m],speed [rpm]", good_rows(50))
    code, _, err = run(["duty", str(REDUCER), str(p), "--template", "nope"], capsys)
    assert code == 2 and "no case 'nope'" in err
    code, _, err = run(["duty", str(REDUCER), str(p), "--peak-above", "3 kW"], capsys)
    assert code == 2 and "--peak-above" in err


def test_demo_recording_end_to_end(tmp_path: Path) -> None:
    """The invented demo recording (start-ups, load variation, overhauling, reversal)
    through one command: the check passes, reversed and back-driven cases appear, the
    reduction error is printed, and the figure is written (common practice, no source).
    """
    rec = tmp_path / "conveyor.csv"
    subprocess.run([sys.executable, str(ROOT / "models" / "make_demo_recording.py"),
                    str(rec), "--hours", "1"], check=True, capture_output=True)
    fig = tmp_path / "duty.png"
    proc = subprocess.run([sys.executable, "-m", "shaftsys", "duty", str(REDUCER), str(rec),
                           "--bins", "8", "--peak-above", "200 N*m", "--plot", str(fig)],
                          check=False, capture_output=True, text=True, cwd=ROOT)
    assert proc.returncode == 0, proc.stderr
    for word in ("rec_reverse_", "rec_back_driven_", "rec_standstill", "rec_peak_forward",
                 "reduction error", "VERDICT: PASS"):
        assert word in proc.stdout
    assert "the time stamps jump" in proc.stderr
    assert fig.stat().st_size > 1000


def test_temperature_channel_in_degF(tmp_path: Path, capsys: pytest.CaptureFixture[str]
                                     ) -> None:
    """A temperature column in degF: each case takes the time-mean temperature of its
    bin, converted as an absolute temperature (degC = (degF - 32) * 5/9, hand-derived),
    and the fragment carries it; a temperature column in a wrong unit is refused."""
    rows = []
    for i in range(400):
        hot = i >= 200
        rows.append(f"{0.5 * i:g},{90 if hot else 40},1460,{176 if hot else 122}")
    p = write_csv(tmp_path / "r.csv", "time,torque,speed,oil_temperature",
                  ["s,N*m,rpm,degF", *rows])          # units in a units row
    frag, js = tmp_path / "cases.yaml", tmp_path / "out.json"
    code, _, err = run(["duty", str(REDUCER), str(p), "--bins", "4", "--write", str(frag),
                        "--json", str(js)], capsys)
    assert code in (0, 1), err
    cases = {round(c["torque_Nmm"]): c for c in
             json.loads(js.read_text())["duty_reduction"]["cases"] if c["kind"] == "duty"}
    assert cases[40000]["temperature_C"] == pytest.approx((122 - 32) * 5 / 9, rel=1e-12)
    assert cases[90000]["temperature_C"] == pytest.approx((176 - 32) * 5 / 9, rel=1e-12)
    written = yaml.safe_load(frag.read_text())["cases"]
    temps = sorted(float(c["temperature"].split()[0]) for c in written)
    assert temps == pytest.approx([50.0, 80.0], rel=1e-12)
    bad = write_csv(tmp_path / "bad.csv", "time [s],torque [N*m],speed [rpm],temp [bar]",
                    ["0,50,1460,1", "1,50,1460,1"])
    code, _, err = run(["duty", str(REDUCER), str(bad)], capsys)
    assert code == 2 and "bad.csv:1" in err and "temp [bar]" in err


def test_refused_generated_case_names_its_bin(tmp_path: Path,
                                              capsys: pytest.CaptureFixture[str]) -> None:
    """A generated case the life engine refuses (slow running far outside the oil's
    range: kappa below ISO 281's 0.1) is exit 2, and the message says which bin of the
    recording made it and how to bin otherwise (common practice, no source)."""
    rows = [f"{0.5 * i:g},{200 if i < 20 else 60},{60 if i < 20 else 1460}"
            for i in range(400)]
    p = write_csv(tmp_path / "slow.csv", "time [s],torque [N*m],speed [rpm]", rows)
    code, _, err = run(["duty", str(REDUCER), str(p), "--bins", "4"], capsys)
    assert code == 2
    assert "was made from" in err and "slow.csv" in err and "--speed-bins" in err


def test_load_channel_option(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    """--load COLUMN=ELEMENT.Fx: the recorded force sets that process-load component in
    every generated case (a level series comes back as its level; common practice, no
    source) and is written into the fragment; a non-load element is refused (exit 2)."""
    fan = ROOT / "models" / "fan_drive.yaml"
    rows = [f"{0.5 * i:g},{100 if i < 200 else 60},1480,{-1500 if i < 200 else -700}"
            for i in range(400)]
    p = write_csv(tmp_path / "r.csv", "time [s],torque [N*m],speed [rpm],thrust [kN]",
                  [r.replace(r.rsplit(",", 1)[1], str(float(r.rsplit(",", 1)[1]) / 1000))
                   for r in rows])
    frag = tmp_path / "cases.yaml"
    code, _, err = run(["duty", str(fan), str(p), "--load", "thrust=impeller_thrust.Fx",
                        "--bins", "4", "--write", str(frag)], capsys)
    assert code in (0, 1), err
    written = {c["id"]: c for c in yaml.safe_load(frag.read_text())["cases"]}
    thrusts = sorted(float(c["loads"]["impeller_thrust"]["force"][0].split()[0])
                     for c in written.values())
    assert thrusts == pytest.approx([-1500.0, -700.0], rel=1e-12)
    code, _, err = run(["duty", str(fan), str(p), "--load", "thrust=pulley.Fx"], capsys)
    assert code == 2 and "'pulley' is not a process-load element" in err


def test_recording_section_equals_options(tmp_path: Path) -> None:
    """A model's recording: section gives the same reduction as the same settings as
    options (one reading of one file; common practice, no source), and a bad field of
    the section is exit 2 naming file, line and field."""
    rec = tmp_path / "conveyor.csv"
    subprocess.run([sys.executable, str(ROOT / "models" / "make_demo_recording.py"),
                    str(rec), "--hours", "0.5"], check=True, capture_output=True)
    text = REDUCER.read_text() + ("\nrecording:\n  file: conveyor.csv\n  bins: 6\n"
                                  "  peak_above: 200 N*m\n")
    model = tmp_path / "m.yaml"
    model.write_text(text)
    a, b = tmp_path / "a.json", tmp_path / "b.json"
    p1 = subprocess.run([sys.executable, "-m", "shaftsys", "duty", str(model), "--json",
                         str(a), "-q"], capture_output=True, text=True, cwd=ROOT)
    p2 = subprocess.run([sys.executable, "-m", "shaftsys", "duty", str(REDUCER), str(rec),
                         "--bins", "6", "--peak-above", "200 N*m", "--json", str(b), "-q"],
                        capture_output=True, text=True, cwd=ROOT)
    assert p1.returncode == p2.returncode == 0, p1.stderr + p2.stderr
    ca = json.loads(a.read_text())["duty_reduction"]["cases"]
    cb = json.loads(b.read_text())["duty_reduction"]["cases"]
    assert len(ca) > 2 and ca == cb
    bad = tmp_path / "bad.yaml"
    bad.write_text(REDUCER.read_text() + "\nrecording:\n  file: conveyor.csv\n  bins: 0\n")
    p3 = subprocess.run([sys.executable, "-m", "shaftsys", "check", str(bad)],
                        capture_output=True, text=True, cwd=ROOT)
    assert p3.returncode == 2 and "bad.yaml:" in p3.stderr and "recording.bins" in p3.stderr


def test_small_csv_read_by_numpy_equals_the_streamed_read(tmp_path: Path) -> None:
    """A recording that fits in one chunk is read by numpy in one piece; the same file
    streamed through pandas in small chunks gives the same samples (equivalence of two
    readers, common practice, no source), and a blank line still takes the pandas path
    with its located error."""
    rec = tmp_path / "rec.csv"
    subprocess.run([sys.executable, str(ROOT / "models" / "make_demo_recording.py"),
                    str(rec), "--hours", "0.05"], check=True, capture_output=True)
    one = open_series(rec)
    assert one._plain_csv(list(one.columns.values())) is not None
    many = open_series(rec, chunk_rows=500)
    assert many._plain_csv(list(many.columns.values())) is None
    a = [np.concatenate(x) for x in zip(*one.chunks(), strict=True)]
    b = [np.concatenate(x) for x in zip(*many.chunks(), strict=True)]
    for x, y in zip(a, b, strict=True):
        np.testing.assert_array_equal(x, y)
    lines = rec.read_text().splitlines()
    rec.write_text("\n".join([*lines[:5], "", *lines[5:]]) + "\n")
    from shaftsys.errors import ModelError

    with pytest.raises(ModelError, match=r"rec\.csv:6: column 'time \[s\]': an empty cell"):
        list(open_series(rec).chunks())
