"""Running a study in chunks: in-process or on a dask cluster, with a resumable checkpoint.

Layout of an output folder::

    manifest.json            study fingerprint, size, chunk size, ids of finished chunks
    chunks/chunk_000012.parquet   variants [12*chunk, 13*chunk) (one file per chunk)
    results.parquet|csv|json every variant in variant order (written at the end, in the
                             formats asked for: ``formats``; the library default is all
                             three, ``shaftsys sweep`` writes Parquet unless --format)
    summary.json             counts and the best variant

The result files are streamed from the chunk files (:mod:`shaftsys.study.writers`):
the whole table is never held in memory.

Every file is written atomically (:func:`shaftsys.io.output.atomic_write`): a chunk file
first, then the manifest naming it, so after an interruption (Ctrl-C, a killed process,
a lost worker) the manifest lists only chunks whose file is complete; ``resume=True``
evaluates the other chunks and no variant is lost or repeated. A folder holding another
study (different fingerprint) is refused.

Where the chunks run: in this process, or on dask.distributed when a scheduler address
or a worker count (>= 1) is given (``workers=0`` forces this process), or, with
neither, when the study has more than ``threshold`` variants AND this process may use
more than :data:`AUTO_MIN_CPUS` CPUs. On a 2-CPU machine the cluster costs more than it
brings (measured with ``benchmarks/bench_million.py``: see DEVELOPERS.md, "Scale-out
and checkpoint"), so a study stays in-process there unless told otherwise. A dask run
uses a ``LocalCluster`` of worker processes on this machine bound to 127.0.0.1 (no
dashboard unless ``dashboard`` gives an address), else the cluster at ``scheduler``.
Chunks are evaluated on the workers (at most two per worker in flight) and written by
this process as they arrive, so memory stays flat whatever the study size. A tqdm
progress bar (variants done, rate) goes to stderr when stderr is a terminal.
"""

from __future__ import annotations

import contextlib
import dataclasses
import json
import logging
import os
import sys
import time
from collections.abc import Callable, Iterator, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING, Any

from shaftsys.errors import ModelError
from shaftsys.io.output import atomic_write, write_json
from shaftsys.study.sweep import Study, evaluate_block, study_summary
from shaftsys.study.writers import LIBRARY_FORMATS, parse_formats, stream_results

if TYPE_CHECKING:
    import pandas as pd

log = logging.getLogger(__name__)

#: Studies above this many variants may run on dask by default (see AUTO_MIN_CPUS).
DEFAULT_THRESHOLD = 200_000
#: ... and only where this process may use more CPUs than this: on 2 CPUs a local
#: cluster (scheduler, nannies, workers) did not pay for itself (DEVELOPERS.md).
AUTO_MIN_CPUS = 2
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
    #: seconds spent: ``evaluate`` (chunks, in this process or waiting for workers),
    #: ``chunks`` (writing chunk files and the manifest), ``results`` (the result
    #: files), ``summary``, ``total``.
    timings: dict[str, float] = dataclasses.field(default_factory=dict)

    def frame(self, columns: Sequence[str] | None = None) -> pd.DataFrame:
        """The results as one DataFrame (reads ``results.parquet``, else the chunks).

        ``columns``: only these (default: all). All columns of a large study may not fit
        in memory: read the Parquet file in parts then
        (``pyarrow.parquet.ParquetFile(...).iter_batches()``).
        """
        import pandas as pd

        cols = None if columns is None else list(columns)
        if "parquet" in self.paths:
            return pd.read_parquet(self.paths["parquet"], columns=cols)
        frames = [pd.read_parquet(_chunk_path(self.out_dir, c), columns=cols)
                  for c in range(self.n_chunks)]
        return pd.concat(frames, ignore_index=True)


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
        raise ModelError(f"cannot read the study checkpoint {path}: {str(exc)[:80]}",
                         field="--resume", expected="a manifest written by shaftsys, a new "
                         "--out folder, or --overwrite to start again") from None
    return data if isinstance(data, dict) else None


def _write_manifest(out: Path, study: Study, chunk: int, done: set[int]) -> None:
    write_json(out / MANIFEST, {
        "format": "shaftsys-study-checkpoint 1",
        "fingerprint": study.fingerprint(),
        "n_variants": study.n_variants,
        "chunk_size": chunk,
        "done": sorted(done),
    })


def _write_chunk(out: Path, cid: int, df: pd.DataFrame, fingerprint: str = "") -> None:
    """Write chunk ``cid``; its file carries the study's fingerprint in its metadata."""
    import pyarrow as pa
    import pyarrow.parquet as pq

    table = pa.Table.from_pandas(df, preserve_index=False)
    meta = dict(table.schema.metadata or {})
    meta[_CHUNK_KEY] = fingerprint.encode()
    table = table.replace_schema_metadata(meta)
    atomic_write(_chunk_path(out, cid), lambda fh: pq.write_table(table, fh))


#: Metadata key of a chunk file naming the study it belongs to.
_CHUNK_KEY = b"shaftsys_study_fingerprint"
#: The lock file of a folder while a study runs in it.
LOCK = ".study.lock"


def _chunk_belongs(path: Path, fingerprint: str, rows: int) -> bool:
    """The chunk file is readable, has ``rows`` rows and names this study."""
    import pyarrow.parquet as pq

    try:
        meta = pq.read_metadata(path)
    except Exception:  # a truncated or damaged file: pyarrow raises several types
        return False
    stored = (meta.metadata or {}).get(_CHUNK_KEY, b"").decode(errors="replace")
    return meta.num_rows == rows and stored == fingerprint


def _pid_alive(pid: int) -> bool:
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except PermissionError:
        return True
    return True


def _lock(out: Path) -> Path:
    """Take the folder's lock (a second study in it is refused while one runs)."""
    path = out / LOCK
    for _ in range(2):
        try:
            fd = os.open(path, os.O_CREAT | os.O_EXCL | os.O_WRONLY, 0o644)
        except FileExistsError:
            try:
                pid = int(path.read_text(encoding="utf-8").strip() or "0")
            except (OSError, ValueError):
                pid = 0
            if pid and pid != os.getpid() and _pid_alive(pid):
                raise ModelError(f"{out} is in use by a study that is running (process {pid})",
                                 field="--out", expected="another --out folder, or wait for "
                                 "that study to end") from None
            path.unlink(missing_ok=True)      # a lock left by a killed run
            continue
        with os.fdopen(fd, "w", encoding="utf-8") as fh:
            fh.write(str(os.getpid()))
        return path
    raise ModelError(f"cannot take the lock {path}", field="--out",
                     expected="a folder this process may write")


def _chunk_task(study: Study, lo: int, hi: int, batched: bool | None,
                quiet: bool = False) -> pd.DataFrame:
    """Evaluate one chunk (the study's prepared data is cached per process).

    ``quiet`` (worker processes): the life engine's per-case notes, which repeat for
    every chunk, are not logged; each variant's verdict is in its row.
    """
    if quiet:
        logging.getLogger("shaftsys.bearings").setLevel(logging.ERROR)
    return evaluate_block(study, lo, hi, batched=batched)


def usable_cpus() -> int:
    """CPUs this process may run on (its affinity mask where the OS has one)."""
    try:
        return len(os.sched_getaffinity(0))
    except (AttributeError, OSError):  # pragma: no cover - not Linux
        return os.cpu_count() or 1


def runs_on_dask(n_variants: int, scheduler: str | None, workers: int | None,
                 threshold: int = DEFAULT_THRESHOLD, cpus: int | None = None) -> bool:
    """Whether a study of ``n_variants`` runs on dask (rule in the module docstring)."""
    if scheduler is not None:
        return True
    if workers is not None:
        return workers >= 1
    return n_variants > threshold and (cpus or usable_cpus()) > AUTO_MIN_CPUS


def _remove_stale_parts(out: Path) -> None:
    """Remove temporary files a killed writer left (``.<name>.*.part``, ours only)."""
    for folder in (out, out / "chunks"):
        for part in folder.glob(".*.part"):
            with contextlib.suppress(OSError):  # another process may have removed it
                part.unlink()


def run_study(study: Study, out_dir: str | Path, *, chunk_size: int | None = None,
              scheduler: str | None = None, workers: int | None = None,
              threshold: int = DEFAULT_THRESHOLD, resume: bool = False,
              progress: bool | None = None,
              on_chunk: Callable[[int, int], None] | None = None,
              batched: bool | None = None,
              formats: Sequence[str] = LIBRARY_FORMATS,
              dashboard: str | None = None, overwrite: bool = False) -> StudyRun:
    """Evaluate every variant of ``study`` into ``out_dir`` (see the module docstring).

    Parameters
    ----------
    study: the study.
    out_dir: output folder (created if missing).
    chunk_size: variants per chunk (default :func:`default_chunk_size`).
    scheduler: address ``tcp://host:port`` of an existing dask scheduler.
    workers: worker processes of a local dask cluster; 0 = this process (default:
        :func:`runs_on_dask` decides; a cluster then has one worker per usable CPU).
    threshold: above this many variants the study may run on dask (see the module
        docstring).
    resume: continue a study whose manifest is in ``out_dir``.
    progress: show a progress bar (default: when stderr is a terminal).
    on_chunk: called as ``on_chunk(chunk_id, variants_done)`` after each chunk is
        checkpointed (an exception raised there stops the run; the checkpoint stays).
    batched: force (True) or forbid (False) the batched evaluator; default automatic.
    formats: result files to write: any of ``"parquet"``, ``"csv"``, ``"json"``.
    dashboard: address of the local cluster's dask dashboard (e.g. ``":8787"``);
        default none.
    overwrite: replace the results of another study (or of this one) in ``out_dir``.

    While it runs the folder is locked (``.study.lock`` with the process id): a second
    study in it is refused; a lock left by a killed process is taken over. Every chunk
    file carries the study's fingerprint: on ``resume`` a chunk that is missing,
    truncated or of another study is computed again.

    Raises
    ------
    ModelError: ``out_dir`` is in use by a running study, holds another study's (or
        this study's) results without ``resume``/``overwrite``, or its checkpoint is
        damaged.
    OutputError: a file cannot be written.
    """
    formats = parse_formats(formats)
    clock = {"evaluate": 0.0, "chunks": 0.0, "results": 0.0, "summary": 0.0}
    t_start = time.perf_counter()
    out = Path(out_dir)
    (out / "chunks").mkdir(parents=True, exist_ok=True)
    lock = _lock(out)
    try:
        return _run_locked(study, out, chunk_size, scheduler, workers, threshold, resume,
                           progress, on_chunk, batched, formats, dashboard, overwrite, clock,
                           t_start)
    finally:
        lock.unlink(missing_ok=True)


def _run_locked(study: Study, out: Path, chunk_size: int | None, scheduler: str | None,
                workers: int | None, threshold: int, resume: bool, progress: bool | None,
                on_chunk: Callable[[int, int], None] | None, batched: bool | None,
                formats: Sequence[str], dashboard: str | None, overwrite: bool,
                clock: dict[str, float], t_start: float) -> StudyRun:
    """:func:`run_study` with the folder's lock held."""
    _remove_stale_parts(out)
    N = study.n_variants
    fingerprint = study.fingerprint()
    try:
        manifest = _read_manifest(out)
    except ModelError:
        if not overwrite:
            raise
        manifest = None
    if manifest is not None and manifest.get("fingerprint") != fingerprint and not overwrite:
        raise ModelError(f"{out} holds the results of a different study",
                         field="--resume" if resume else "--out",
                         expected="the same model and sweep, a new --out folder, or "
                         "--overwrite to replace that study")
    if manifest is not None and not resume and not overwrite and manifest.get("done"):
        raise ModelError(f"{out} already holds this study's results",
                         field="--out", expected="--resume to continue it, --overwrite to run "
                         "it again, or a new --out folder")
    if resume and manifest is not None and manifest.get("fingerprint") == fingerprint:
        try:
            chunk = int(manifest["chunk_size"])
            listed = {int(c) for c in manifest.get("done", [])}
        except (KeyError, TypeError, ValueError):
            raise ModelError(f"the study checkpoint {out / MANIFEST} is damaged",
                             field="--resume", expected="a manifest written by shaftsys, or "
                             "--overwrite to start again") from None
        done = set()
        for c in listed:
            if c >= 0 and c * chunk < N and _chunk_belongs(_chunk_path(out, c), fingerprint,
                                                             _size(c, chunk, N)):
                done.add(c)
            else:
                log.warning("study: chunk %d in %s is missing, damaged or of another study; "
                            "it is computed again", c, out)
    else:
        chunk = int(chunk_size or default_chunk_size(study))
        done = set()
        for old in (out / "chunks").glob("chunk_*.parquet"):   # an overwritten study
            old.unlink(missing_ok=True)
    if chunk < 1:
        raise ModelError(f"chunk size {chunk} < 1", field="chunk_size", expected=">= 1")
    _write_manifest(out, study, chunk, done)
    n_chunks = (N + chunk - 1) // chunk
    todo = [c for c in range(n_chunks) if c not in done]
    distributed = runs_on_dask(N, scheduler, workers, threshold)
    bar = _progress(N, sum(_size(c, chunk, N) for c in done), progress)
    ran = 0
    try:
        results: Iterator[tuple[int, pd.DataFrame]]
        if distributed and todo:
            results = _dask_results(study, todo, chunk, scheduler, workers, batched,
                                    dashboard)
        else:
            results = ((c, _chunk_task(study, c * chunk, min(N, (c + 1) * chunk), batched))
                       for c in todo)
        t0 = time.perf_counter()
        for cid, df in results:
            t1 = time.perf_counter()
            clock["evaluate"] += t1 - t0
            _write_chunk(out, cid, df, fingerprint)
            done.add(cid)
            _write_manifest(out, study, chunk, done)
            t0 = time.perf_counter()
            clock["chunks"] += t0 - t1
            ran += 1
            if bar is not None:
                bar.update(len(df))
            if on_chunk is not None:
                on_chunk(cid, sum(_size(c, chunk, N) for c in done))
    finally:
        if bar is not None:
            bar.close()
    t0 = time.perf_counter()
    chunk_files = [_chunk_path(out, c) for c in range(n_chunks)]
    paths = stream_results(chunk_files, out, formats)
    t1 = time.perf_counter()
    summary = _summary_streaming(study, chunk_files)
    write_json(out / "summary.json", summary)
    paths["summary"] = out / "summary.json"
    t2 = time.perf_counter()
    clock.update(results=t1 - t0, summary=t2 - t1, total=t2 - t_start)
    return StudyRun(out, N, n_chunks, ran, paths, summary, distributed and bool(todo),
                    clock)


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
                  workers: int | None, batched: bool | None, dashboard: str | None = None
                  ) -> Iterator[tuple[int, pd.DataFrame]]:
    """Evaluate chunks on dask; yields (chunk id, frame) as they finish."""
    from dask.distributed import Client, LocalCluster, as_completed

    N = study.n_variants
    cluster = None
    if scheduler is None:
        n = workers or usable_cpus()
        cluster = LocalCluster(n_workers=n, threads_per_worker=1, processes=True,
                               host="127.0.0.1", dashboard_address=dashboard)
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


def _summary_streaming(study: Study, chunk_files: Sequence[Path]) -> dict[str, Any]:
    """:func:`study_summary` over the chunks (only the columns it reads), one at a time."""
    import pyarrow.parquet as pq

    columns = ["variant", "valid", "ok", "worst_margin", "thermal_ok", "thermal_runaway",
               *(q.path for q in study.quantities)]
    best = None
    counts = {"valid": 0, "passing": 0}
    thermal = {"thermal_failing": 0, "thermal_runaway": 0}
    has_thermal = False
    for path in chunk_files:
        if not path.is_file():
            raise ModelError(f"chunk file {path} is missing", field="--resume",
                             expected="run the study again with --resume")
        have = set(pq.read_schema(path).names)
        df = pq.read_table(path, columns=[c for c in columns if c in have]).to_pandas()
        s = study_summary(study, df)
        counts["valid"] += s["valid"]
        counts["passing"] += s["passing"]
        if "thermal_failing" in s:
            has_thermal = True
            for k in thermal:
                thermal[k] += s[k]
        key = (1 if s["passing"] else 0, s["best_worst_margin"] or -1.0)
        if s["best_variant"] is not None and (best is None or key > best[0]):
            best = (key, s)
    res: dict[str, Any] = {"variants": study.n_variants, "valid": counts["valid"],
                           "invalid": study.n_variants - counts["valid"],
                           "passing": counts["passing"]}
    for k in ("best_variant", "best_values", "best_worst_margin"):
        res[k] = None if best is None else best[1][k]
    if has_thermal:
        res.update(thermal)
    return res
