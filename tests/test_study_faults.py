"""Study folders under faults: a folder in use, a folder of another study, a damaged
checkpoint, a truncated or foreign chunk file (common practice for resumable batch
jobs, no source). Each ends in a clear exit 2 or in the right table, never a traceback.
"""

from __future__ import annotations

import json
import logging
import os
import subprocess
import sys
from pathlib import Path

import pandas as pd
import pytest

import shaftsys
from shaftsys.cli import main
from shaftsys.errors import ModelError
from shaftsys.study.runner import LOCK, run_study
from shaftsys.study.sweep import make_study

SPINDLE = Path(__file__).resolve().parent.parent / "models" / "spindle_3brg.yaml"


@pytest.fixture(scope="module")
def model():
    logging.getLogger("shaftsys.bearings").setLevel(logging.ERROR)
    return shaftsys.load_model(str(SPINDLE))


@pytest.fixture(scope="module")
def study(model):
    return make_study(model, {"bearing.B.at": "205:225:6"})


def _table(run) -> pd.DataFrame:  # type: ignore[no-untyped-def]
    return pd.read_parquet(run.paths["parquet"]).sort_values("index").reset_index(drop=True)


def test_a_folder_in_use_is_refused(study, tmp_path: Path) -> None:
    """A lock naming a live process (here: a sleeping child) refuses a second study; a
    lock left by a process that is gone is taken over."""
    child = subprocess.Popen([sys.executable, "-c", "import time; time.sleep(30)"])
    try:
        (tmp_path / LOCK).write_text(str(child.pid))
        with pytest.raises(ModelError, match="in use by a study that is running"):
            run_study(study, tmp_path, progress=False)
    finally:
        child.kill()
        child.wait()
    # the child is gone: its lock is stale and the study runs, then releases the lock
    run = run_study(study, tmp_path, progress=False)
    assert run.n_variants == study.n_variants and not (tmp_path / LOCK).exists()


def test_another_study_needs_overwrite(study, model, tmp_path: Path) -> None:
    run_study(study, tmp_path, progress=False)
    other = make_study(model, {"bearing.B.at": "205:225:3"})
    with pytest.raises(ModelError, match="results of a different study"):
        run_study(other, tmp_path, progress=False)
    with pytest.raises(ModelError, match="already holds this study"):
        run_study(study, tmp_path, progress=False)
    run = run_study(other, tmp_path, progress=False, overwrite=True)
    assert len(_table(run)) == other.n_variants == 3
    assert len(list((tmp_path / "chunks").glob("chunk_*.parquet"))) == run.n_chunks


def test_damaged_manifest_on_resume_is_exit_2(tmp_path: Path,
                                              capsys: pytest.CaptureFixture[str]) -> None:
    out = tmp_path / "out"
    args = ["sweep", str(SPINDLE), "--vary", "bearing.B.at=205:225:4", "--out", str(out),
            "-q"]
    assert main(args) == 0
    (out / "manifest.json").write_text("{ not json", encoding="utf-8")
    capsys.readouterr()
    assert main([*args, "--resume"]) == 2
    err = capsys.readouterr().err
    assert "manifest.json" in err and "Traceback" not in err
    assert main([*args, "--overwrite"]) == 0


def test_truncated_or_foreign_chunk_is_computed_again(study, model, tmp_path: Path) -> None:
    """Resume with one chunk cut short and one copied from another study: both are
    computed again and the table equals an uninterrupted run."""
    whole = _table(run_study(study, tmp_path / "whole", chunk_size=2, progress=False))
    out = tmp_path / "resumed"
    run_study(study, out, chunk_size=2, progress=False)
    chunks = sorted((out / "chunks").glob("chunk_*.parquet"))
    chunks[0].write_bytes(chunks[0].read_bytes()[:40])            # truncated
    other = make_study(model, {"bearing.B.at": "206:226:6"})
    run_study(other, tmp_path / "other", chunk_size=2, progress=False)
    foreign = sorted((tmp_path / "other" / "chunks").glob("chunk_*.parquet"))[1]
    chunks[1].write_bytes(foreign.read_bytes())                   # another study's rows
    run = run_study(study, out, resume=True, progress=False)
    assert run.chunks_run == 2
    pd.testing.assert_frame_equal(_table(run), whole)
    summary = json.loads((out / "summary.json").read_text())
    assert summary["variants"] == study.n_variants


def test_lock_is_released_after_a_failure(study, tmp_path: Path) -> None:
    def boom(cid: int, done: int) -> None:
        raise RuntimeError("stop")

    with pytest.raises(RuntimeError):
        run_study(study, tmp_path, chunk_size=2, progress=False, on_chunk=boom)
    assert not (tmp_path / LOCK).exists()
    assert os.listdir(tmp_path / "chunks")        # the checkpoint stays for --resume
