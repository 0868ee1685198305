"""Running a study in chunks: in-process or on a dask cluster, with a resumable checkpoint.

Layout of an output folder::

    manifest.json            study fingerprint, size, chunk size, ids of finished chunks
    chunks/chunk_000012.parquet   variants [12*chunk, 13*chunk) (one file per chunk)
    results.csv|json|parquet every variant in variant order (written at the end)
    summary.json             counts and the best variant

Every file is written atomically (:func:`shaftsys.io.output.atomic_write`): a chunk file
first, then the manifest naming it, so after an interruption (Ctrl-C, a killed process,
a lost worker) the manifest lists only chunks whose file is complete; ``resume=True``
evaluates the other chunks and no variant is lost or repeated. A folder holding another
study (different fingerprint) is refused.

Studies larger than ``threshold`` variants, or when a scheduler address or a worker
count is given, run on dask.distributed: by default a ``LocalCluster`` of worker
processes on this machine bound to 127.0.0.1, else the cluster at ``scheduler``. Chunks
are evaluated on the workers (at most two per worker in flight) and written by this
process as they arrive, so memory stays flat whatever the study size. A tqdm progress
bar (variants done, rate) goes to stderr when stderr is a terminal.
"""

from __future__ import annotations

import dataclasses
import json
import logging
import os
import sys
from collections.abc import Callable, Iterator
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING, Any

from shaftsys.errors import ModelError
from shaftsys.io.output import atomic_write, json_ready, write_json
from shaftsys.study.sweep import Study, evaluate_block, frame_records, study_summary

if TYPE_CHECKING:
    import pandas as pd

log = logging.getLogger(__name__)

#: Studies above this many variants run on dask by default.
DEFAULT_THRESHOLD = 200_000
MANIFEST = "manifest.json"


@dataclass(frozen=True)
class StudyRun:
    """Outcome of :func:`run_study`: where the results are and the headline figures."""

    out_dir: Path
    n_variants: int
    n_chunks: int
    chunks_run: int
    paths: dict[str, Path]
    summary: dict[str, Any]
    distributed: bool

    def frame(self) -> pd.DataFrame:
        """All results as one DataFrame (reads ``results.parquet``)."""
        import pandas as pd

        return pd.read_parquet(self.paths["parquet"])


def default_chunk_size(study: Study) -> int:
    """Variants per chunk: 4096 on the batched path, 32 when each variant runs analyse."""
    return 4096 if study.batched else 32


def _chunk_path(out: Path, cid: int) -> Path:
    return out / "chunks" / f"chunk_{cid:06d}.parquet"


def _read_manifest(out: Path) -> dict[str, Any] | None:
    path = out / MANIFEST
    if not path.is_file():
        return None
    try:
        data = json.loads(path.read_text(encoding="utf-8"))
    except (OSError, ValueError) as exc:
        raise ModelError(f"cannot read the study checkpoint {path}: {exc}",
                         expected="a manifest written by shaftsys, or a new folder") from None
    return data if isinstance(data, dict) else None


def _write_manifest(out: Path, study: Study, chunk: int, done: set[int]) -> None:
    write_json(out / MANIFEST, {
        "format": "shaftsys-study-checkpoint 1",
        "fingerprint": study.fingerprint(),
        "n_variants": study.n_variants,
        "chunk_size": chunk,
        "done": sorted(done),
    })


def _write_chunk(out: Path, cid: int, df: pd.DataFrame) -> None:
    import pyarrow as pa
    import pyarrow.parquet as pq

    table = pa.Table.from_pandas(df, preserve_index=False)
    atomic_write(_chunk_path(out, cid), lambda fh: pq.write_table(table, fh))


def _chunk_task(study: Study, lo: int, hi: int, batched: bool | None,
                quiet: bool = False) -> pd.DataFrame:
    """Evaluate one chunk (the study's prepared data is cached per process).

    ``quiet`` (worker processes): the life engine's per-case notes, which repeat for
    every chunk, are not logged; each variant's verdict is in its row.
    """
    if quiet:
        logging.getLogger("shaftsys.bearings").setLevel(logging.ERROR)
    return evaluate_block(study, lo, hi, batched=batched)


def run_study(study: Study, out_dir: str | Path, *, chunk_size: int | None = None,
              scheduler: str | None = None, workers: int | None = None,
              threshold: int = DEFAULT_THRESHOLD, resume: bool = False,
              progress: bool | None = None,
              on_chunk: Callable[[int, int], None] | None = None,
              batched: bool | None = None) -> StudyRun:
    """Evaluate every variant of ``study`` into ``out_dir`` (see the module docstring).

    Parameters
    ----------
    study: the study.
    out_dir: output folder (created if missing).
    chunk_size: variants per chunk (default :func:`default_chunk_size`).
    scheduler: address ``tcp://host:port`` of an existing dask scheduler.
    workers: worker processes of the local cluster (default: CPU count).
    threshold: above this many variants the study runs on dask.
    resume: continue a study whose manifest is in ``out_dir``.
    progress: show a progress bar (default: when stderr is a terminal).
    on_chunk: called as ``on_chunk(chunk_id, variants_done)`` after each chunk is
        checkpointed (an exception raised there stops the run; the checkpoint stays).
    batched: force (True) or forbid (False) the batched evaluator; default automatic.

    Raises
    ------
    ModelError: ``out_dir`` holds another study, or its checkpoint is unreadable.
    OutputError: a file cannot be written.
    """
    out = Path(out_dir)
    (out / "chunks").mkdir(parents=True, exist_ok=True)
    N = study.n_variants
    manifest = _read_manifest(out) if resume else None
    if manifest is not None:
        if manifest.get("fingerprint") != study.fingerprint():
            raise ModelError(f"{out} holds the checkpoint of a different study",
                             field="--resume", expected="the same model and sweep, or a new --out")
        chunk = int(manifest["chunk_size"])
        done = {int(c) for c in manifest.get("done", []) if _chunk_path(out, int(c)).is_file()}
    else:
        chunk = int(chunk_size or default_chunk_size(study))
        done = set()
    if chunk < 1:
        raise ModelError(f"chunk size {chunk} < 1", field="chunk_size", expected=">= 1")
    _write_manifest(out, study, chunk, done)
    n_chunks = (N + chunk - 1) // chunk
    todo = [c for c in range(n_chunks) if c not in done]
    distributed = scheduler is not None or workers is not None or threshold < N
    bar = _progress(N, sum(_size(c, chunk, N) for c in done), progress)
    ran = 0
    try:
        results: Iterator[tuple[int, pd.DataFrame]]
        if distributed and todo:
            results = _dask_results(study, todo, chunk, scheduler, workers, batched)
        else:
            results = ((c, _chunk_task(study, c * chunk, min(N, (c + 1) * chunk), batched))
                       for c in todo)
        for cid, df in results:
            _write_chunk(out, cid, df)
            done.add(cid)
            _write_manifest(out, study, chunk, done)
            ran += 1
            if bar is not None:
                bar.update(len(df))
            if on_chunk is not None:
                on_chunk(cid, sum(_size(c, chunk, N) for c in done))
    finally:
        if bar is not None:
            bar.close()
    paths = _combine(out, n_chunks)
    import pandas as pd

    summary = _summary_streaming(study, out, n_chunks, pd)
    write_json(out / "summary.json", summary)
    paths["summary"] = out / "summary.json"
    return StudyRun(out, N, n_chunks, ran, paths, summary, distributed and bool(todo))


def _size(cid: int, chunk: int, N: int) -> int:
    return min(N, (cid + 1) * chunk) - cid * chunk


def _progress(total: int, initial: int, show: bool | None) -> Any:
    if show is None:
        show = sys.stderr.isatty()
    if not show:
        return None
    from tqdm import tqdm

    return tqdm(total=total, initial=initial, unit="variant", file=sys.stderr,
                desc="study", dynamic_ncols=True)


def _dask_results(study: Study, todo: list[int], chunk: int, scheduler: str | None,
                  workers: int | None, batched: bool | None
                  ) -> Iterator[tuple[int, pd.DataFrame]]:
    """Evaluate chunks on dask; yields (chunk id, frame) as they finish."""
    from dask.distributed import Client, LocalCluster, as_completed

    N = study.n_variants
    cluster = None
    if scheduler is None:
        n = workers or os.cpu_count() or 1
        cluster = LocalCluster(n_workers=n, threads_per_worker=1, processes=True,
                               host="127.0.0.1", dashboard_address=None)
        client = Client(cluster)
    else:
        client = Client(scheduler)
    try:
        log.info("study: %d chunks on dask", len(todo))
        lean = dataclasses.replace(study, _prep=[])
        remote = client.scatter(lean, broadcast=True)
        n_workers = max(1, len(client.scheduler_info().get("workers", {})))
        window = 2 * n_workers
        pending = iter(todo)
        futures = {}

        def submit(cid: int) -> Any:
            fut = client.submit(_chunk_task, remote, cid * chunk, min(N, (cid + 1) * chunk),
                                batched, True, key=f"study-{lean.fingerprint()[:12]}-chunk-{cid}",
                                pure=False)
            futures[fut.key] = cid
            return fut

        ac = as_completed([submit(c) for _, c in zip(range(window), pending, strict=False)])
        for fut in ac:
            cid = futures.pop(fut.key)
            df = fut.result()
            fut.release()
            nxt = next(pending, None)
            if nxt is not None:
                ac.add(submit(nxt))
            yield cid, df
    finally:
        client.close()
        if cluster is not None:
            cluster.close()


def _chunk_frames(out: Path, n_chunks: int, pd: Any) -> Iterator[Any]:
    for cid in range(n_chunks):
        path = _chunk_path(out, cid)
        if not path.is_file():
            raise ModelError(f"chunk file {path} is missing", field="--resume",
                             expected="run the study again with --resume")
        yield pd.read_parquet(path)


def _combine(out: Path, n_chunks: int) -> dict[str, Path]:
    """Stream the chunk files into results.csv, .json and .parquet (variant order)."""
    import pandas as pd
    import pyarrow as pa
    import pyarrow.parquet as pq

    paths = {"csv": out / "results.csv", "json": out / "results.json",
             "parquet": out / "results.parquet"}

    def csv(fh: Any) -> None:
        for k, df in enumerate(_chunk_frames(out, n_chunks, pd)):
            fh.write(df.to_csv(index=False, header=k == 0).encode())

    def js(fh: Any) -> None:
        fh.write(b"[")
        first = True
        for df in _chunk_frames(out, n_chunks, pd):
            for rec in frame_records(df):
                fh.write((b"" if first else b",\n") + json.dumps(
                    json_ready(rec), allow_nan=False).encode())
                first = False
        fh.write(b"]\n")

    def parquet(fh: Any) -> None:
        writer = None
        for cid in range(n_chunks):
            table = pq.read_table(_chunk_path(out, cid))
            if writer is None:
                writer = pq.ParquetWriter(fh, table.schema)
            writer.write_table(table.cast(writer.schema))
        if writer is not None:
            writer.close()
        else:
            pq.write_table(pa.table({}), fh)

    atomic_write(paths["csv"], csv)
    atomic_write(paths["json"], js)
    atomic_write(paths["parquet"], parquet)
    return paths


def _summary_streaming(study: Study, out: Path, n_chunks: int, pd: Any) -> dict[str, Any]:
    """:func:`study_summary` over the chunks without holding them all."""
    best = None
    counts = {"valid": 0, "passing": 0}
    for df in _chunk_frames(out, n_chunks, pd):
        s = study_summary(study, df)
        counts["valid"] += s["valid"]
        counts["passing"] += s["passing"]
        key = (1 if s["passing"] else 0, s["best_worst_margin"] or -1.0)
        if s["best_variant"] is not None and (best is None or key > best[0]):
            best = (key, s)
    res: dict[str, Any] = {"variants": study.n_variants, "valid": counts["valid"],
                           "invalid": study.n_variants - counts["valid"],
                           "passing": counts["passing"]}
    for k in ("best_variant", "best_values", "best_worst_margin"):
        res[k] = None if best is None else best[1][k]
    return res
