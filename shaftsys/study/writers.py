"""Streaming writers of a study's result table: Parquet, CSV and JSON from chunk files.

A result table larger than memory is never assembled: each writer reads the chunk
files (``chunks/chunk_NNNNNN.parquet``, variant order) one at a time and appends the
chunk to the final file with a whole-chunk writer (pyarrow's ``ParquetWriter`` and CSV
writer, pandas' ``to_json``), never one Python call per value. Every file goes through
:func:`shaftsys.io.output.atomic_write`, so an interrupted or failed write leaves no
partial file.

Formats:

* ``parquet``: the exact column types and floats (the file ``StudyRun.frame`` reads);
* ``csv``: header row, strings quoted, floats in the shortest text that reads back to
  the same float, booleans ``true``/``false``, NaN as an empty field, ``inf``;
* ``json``: an array of records; NaN as ``null``, infinities as ``"inf"``/``"-inf"``;
  floats with 15 significant digits (pandas' JSON writer; Parquet and CSV hold every
  bit).
"""

from __future__ import annotations

from collections.abc import Iterator, Sequence
from pathlib import Path
from typing import TYPE_CHECKING, Any, BinaryIO

import numpy as np

from shaftsys.errors import ModelError
from shaftsys.io.output import atomic_write

if TYPE_CHECKING:
    import pandas as pd
    import pyarrow as pa

#: The formats a study writes its result table in, in the order they are written.
FORMATS = ("parquet", "csv", "json")
#: What ``run_study`` writes unless told otherwise (the library's contract).
LIBRARY_FORMATS = ("csv", "json", "parquet")


def parse_formats(text: str | Sequence[str]) -> tuple[str, ...]:
    """``"csv,json"`` (or a sequence of names) -> ``("csv", "json")``, checked.

    Raises
    ------
    ModelError: an unknown or empty format list.
    """
    items = text.split(",") if isinstance(text, str) else list(text)
    names = tuple(dict.fromkeys(s.strip().lower() for s in items if s.strip()))
    bad = [s for s in names if s not in FORMATS]
    if bad or not names:
        raise ModelError(f"result format {', '.join(bad) or repr(text)} is not known",
                         field="--format", expected="a comma-separated list of "
                         + ", ".join(FORMATS) + " (e.g. parquet,csv)")
    return names


def _tables(paths: Sequence[Path]) -> Iterator[pa.Table]:
    import pyarrow.parquet as pq

    for path in paths:
        if not path.is_file():
            raise ModelError(f"chunk file {path} is missing", field="--resume",
                             expected="run the study again with --resume")
        yield pq.read_table(path)


def write_parquet(fh: BinaryIO, paths: Sequence[Path]) -> None:
    """Append every chunk table to one Parquet file (one row group per chunk)."""
    import pyarrow as pa
    import pyarrow.parquet as pq

    writer = None
    for table in _tables(paths):
        if writer is None:
            writer = pq.ParquetWriter(fh, table.schema)
        writer.write_table(table.cast(writer.schema))
    if writer is not None:
        writer.close()
    else:
        pq.write_table(pa.table({}), fh)


def write_csv(fh: BinaryIO, paths: Sequence[Path]) -> None:
    """Append every chunk table to one CSV file (pyarrow's CSV writer, one header)."""
    import pyarrow.csv as pcsv

    writer = None
    schema = None
    for table in _tables(paths):
        if writer is None:
            schema = table.schema
            writer = pcsv.CSVWriter(fh, schema)
        writer.write_table(table.cast(schema))
    if writer is not None:
        writer.close()


def json_records_text(df: pd.DataFrame) -> str:
    """The records of ``df`` as the body of a JSON array (no brackets).

    Infinities become the strings ``"inf"``/``"-inf"`` (only columns holding one are
    converted, by a whole-column ``np.where``), NaN and missing values ``null``.
    """
    import pandas as pd

    cols: dict[str, Any] = {}
    for name in df.columns:
        v = df[name].to_numpy()
        if v.dtype.kind == "f" and np.isinf(v).any():
            o = v.astype(object)
            o[np.isposinf(v)] = "inf"
            o[np.isneginf(v)] = "-inf"
            cols[name] = o
        else:
            cols[name] = df[name]
    text: str = pd.DataFrame(cols).to_json(orient="records", double_precision=15)
    return text[1:-1]


def write_json(fh: BinaryIO, paths: Sequence[Path]) -> None:
    """Every chunk's records into one JSON array (pandas' writer per chunk)."""
    fh.write(b"[")
    first = True
    for table in _tables(paths):
        if table.num_rows == 0:
            continue
        body = json_records_text(table.to_pandas())
        fh.write((b"" if first else b",\n") + body.encode("utf-8"))
        first = False
    fh.write(b"]\n")


_WRITERS = {"parquet": write_parquet, "csv": write_csv, "json": write_json}


def stream_results(paths: Sequence[Path], out: Path, formats: Sequence[str],
                   stem: str = "results") -> dict[str, Path]:
    """Write ``<stem>.<format>`` in ``out`` for each format from the chunk files ``paths``.

    Returns the written files by format. Each file is written atomically.
    """
    written: dict[str, Path] = {}
    for fmt in parse_formats(formats):
        target = out / f"{stem}.{fmt}"
        writer = _WRITERS[fmt]
        atomic_write(target, lambda fh, w=writer: w(fh, paths))  # type: ignore[misc]
        written[fmt] = target
    return written


__all__ = ["FORMATS", "LIBRARY_FORMATS", "json_records_text",
           "parse_formats", "stream_results", "write_csv", "write_json", "write_parquet"]
