"""Chunked studies: checkpoint and resume, dask LocalCluster identical to in-process."""

from __future__ import annotations

import json
import logging
from pathlib import Path

import pandas as pd
import pytest

import shaftsys
from shaftsys.errors import ModelError
from shaftsys.study.runner import run_study
from shaftsys.study.sweep import make_study, sweep

SPINDLE = Path(__file__).resolve().parent.parent / "models" / "spindle_3brg.yaml"


@pytest.fixture(scope="module")
def study():
    logging.getLogger("shaftsys.bearings").setLevel(logging.ERROR)
    model = shaftsys.load_model(str(SPINDLE))
    # 11 x 8 = 88 variants, some invalid (C off the shaft end)
    return make_study(model, {"bearing.B.at": "205:255:11", "spacing.B.C": "200:270:8"})


@pytest.fixture(scope="module")
def reference(study):
    return sweep(study)


def test_in_process_chunks_equal_one_sweep(study, reference, tmp_path):
    run = run_study(study, tmp_path, chunk_size=10, progress=False)
    assert run.n_chunks == 9 and not run.distributed
    pd.testing.assert_frame_equal(run.frame(), reference)
    for name in ("csv", "json", "parquet", "summary"):
        assert run.paths[name].is_file()
    assert len(json.loads(run.paths["json"].read_text())) == 88
    assert run.summary["valid"] == int(reference["valid"].sum())


def test_resume_after_interruption(study, reference, tmp_path):
    class Stop(Exception):
        pass

    seen = []

    def stop_after_three(cid, done):
        seen.append(cid)
        if len(seen) == 3:
            raise Stop

    with pytest.raises(Stop):
        run_study(study, tmp_path, chunk_size=10, progress=False, on_chunk=stop_after_three)
    manifest = json.loads((tmp_path / "manifest.json").read_text())
    assert manifest["done"] == [0, 1, 2]
    resumed = []
    run = run_study(study, tmp_path, resume=True, progress=False,
                    on_chunk=lambda c, d: resumed.append(c))
    assert resumed == [3, 4, 5, 6, 7, 8]           # finished chunks are not repeated
    df = run.frame()
    assert df["index"].tolist() == list(range(88))  # every variant exactly once
    pd.testing.assert_frame_equal(df, reference)


def test_resume_refuses_another_study(study, tmp_path):
    run_study(study, tmp_path, chunk_size=40, progress=False)
    other = make_study(study.model, {"bearing.B.at": "205:255:3"})
    with pytest.raises(ModelError, match="different study"):
        run_study(other, tmp_path, resume=True, progress=False)


def test_dask_local_cluster_identical(study, reference, tmp_path):
    from dask.distributed import LocalCluster

    with LocalCluster(n_workers=2, processes=True, threads_per_worker=1, host="127.0.0.1",
                      dashboard_address=None) as cluster:
        run = run_study(study, tmp_path, chunk_size=12, scheduler=cluster.scheduler_address,
                        progress=False)
    assert run.distributed
    pd.testing.assert_frame_equal(run.frame(), reference)
