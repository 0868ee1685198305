"""Streaming result writers, result formats of the sweep command, and where a study runs.

Common practice, no source: the written files must hold the numbers of the in-memory
table (Parquet and CSV every bit, JSON 15 significant digits), and the choice between
this process and a dask cluster follows the documented rule.
"""

from __future__ import annotations

import argparse
import json
import logging
import math
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

import shaftsys
from shaftsys.cli.sweep import add_sweep_parser, run_sweep
from shaftsys.errors import ModelError
from shaftsys.study.runner import AUTO_MIN_CPUS, DEFAULT_THRESHOLD, run_study, runs_on_dask
from shaftsys.study.sweep import make_study, sweep
from shaftsys.study.writers import json_records_text, parse_formats

SPINDLE = Path(__file__).resolve().parent.parent / "models" / "spindle_3brg.yaml"


@pytest.fixture(scope="module")
def study():
    logging.getLogger("shaftsys.bearings").setLevel(logging.ERROR)
    model = shaftsys.load_model(str(SPINDLE))
    # 9 x 5 = 45 variants, some invalid (C off the shaft end)
    return make_study(model, {"bearing.B.at": "205:255:9", "spacing.B.C": "200:290:5"})


@pytest.fixture(scope="module")
def reference(study):
    return sweep(study)


def test_every_format_holds_the_table(study, reference, tmp_path):
    run = run_study(study, tmp_path, chunk_size=7, progress=False,
                    formats=("parquet", "csv", "json"))
    assert not reference["valid"].all() and reference["valid"].any()
    pd.testing.assert_frame_equal(pd.read_parquet(run.paths["parquet"]), reference)
    got = pd.read_csv(run.paths["csv"], keep_default_na=False, na_values=[""])
    assert list(got.columns) == list(reference.columns)
    for col in reference.columns:
        ref = reference[col]
        if ref.dtype.kind == "f":   # every bit: shortest round-trip text
            np.testing.assert_array_equal(got[col].to_numpy(float), ref.to_numpy(float))
        elif ref.dtype.kind in "bi":
            assert got[col].tolist() == ref.tolist(), col
        else:
            assert got[col].fillna("").astype(str).tolist() == ref.astype(str).tolist(), col
    recs = json.loads(run.paths["json"].read_text())
    assert len(recs) == len(reference)
    for rec, (_, row) in zip(recs, reference.iterrows(), strict=True):
        for col, ref in row.items():
            v = rec[col]
            if isinstance(ref, float) and math.isnan(ref):
                assert v is None, col
            elif isinstance(ref, float) and math.isinf(ref):
                assert v == ("inf" if ref > 0 else "-inf"), col
            elif isinstance(ref, float):
                assert v == pytest.approx(ref, rel=1e-14), col
            else:
                assert v == ref, col


def test_json_text_of_infinities_and_gaps():
    df = pd.DataFrame({"a": [math.inf, math.nan, 0.25, -math.inf], "b": [True, False, True, False],
                       "s": ["x", 'q"uote', "", "z"]})
    assert json.loads("[" + json_records_text(df) + "]") == [
        {"a": "inf", "b": True, "s": "x"}, {"a": None, "b": False, "s": 'q"uote'},
        {"a": 0.25, "b": True, "s": ""}, {"a": "-inf", "b": False, "s": "z"}]


def test_formats_are_checked():
    assert parse_formats("CSV, json,csv") == ("csv", "json")
    for bad in ("xlsx", "", ","):
        with pytest.raises(ModelError, match="--format"):
            parse_formats(bad)


def test_library_default_writes_three_formats(study, tmp_path):
    run = run_study(study, tmp_path, progress=False)
    assert set(run.paths) == {"csv", "json", "parquet", "summary"}
    assert {"evaluate", "chunks", "results", "summary", "total"} <= set(run.timings)


def _sweep(argv):
    sub = argparse.ArgumentParser().add_subparsers()
    add_sweep_parser(sub)
    return run_sweep(sub.choices["sweep"].parse_args(argv))


def test_sweep_command_writes_parquet_unless_asked(tmp_path, capsys):
    base = [str(SPINDLE), "--vary", "bearing.B.at=212:248:3", "-q"]
    assert _sweep([*base, "--out", str(tmp_path / "a")]) == 0
    assert sorted(p.name for p in (tmp_path / "a").glob("results.*")) == ["results.parquet"]
    assert _sweep([*base, "--out", str(tmp_path / "b"), "--format", "csv,json",
                   "--timings"]) == 0
    assert sorted(p.name for p in (tmp_path / "b").glob("results.*")) == [
        "results.csv", "results.json"]
    assert "timings: evaluate" in capsys.readouterr().err
    assert _sweep([*base, "--out", str(tmp_path / "c"), "--format", "xml"]) == 2


def test_stale_partial_files_are_removed(study, tmp_path):
    """A killed writer's temporary file (never renamed) is cleared by the next run."""
    (tmp_path / "chunks").mkdir()
    stale = [tmp_path / ".results.csv.abc123.part",
             tmp_path / "chunks" / ".chunk_000001.parquet.xyz.part"]
    for p in stale:
        p.write_bytes(b"half a file")
    run_study(study, tmp_path, progress=False, formats=("parquet",))
    assert not any(p.exists() for p in stale)
    assert not list(tmp_path.rglob("*.part"))


def test_where_a_study_runs():
    big = DEFAULT_THRESHOLD + 1
    assert not runs_on_dask(big, None, None, cpus=AUTO_MIN_CPUS)      # 2 CPUs: in-process
    assert runs_on_dask(big, None, None, cpus=AUTO_MIN_CPUS + 2)
    assert not runs_on_dask(DEFAULT_THRESHOLD, None, None, cpus=64)   # small: in-process
    assert runs_on_dask(10, None, 2) and not runs_on_dask(big, None, 0, cpus=64)
    assert runs_on_dask(10, "tcp://127.0.0.1:8786", None)
