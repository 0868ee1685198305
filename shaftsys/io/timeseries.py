"""Read a recorded duty (torque or power and speed over time) from CSV or Parquet, in chunks.

Columns are found by name: ``time`` (or ``t``), ``torque`` or ``power``, ``speed`` (or
``n``), each with its unit in the header (``torque [N*m]``, ``speed (rpm)``), in a units
row right under a CSV header, or (Parquet) in the field metadata key ``unit``; other
names can be given. Units are read with pint as in the model file; a column without a
unit, or with a unit of the wrong kind, is refused.

Sample durations (the stated rule): every sample stands for half the interval to its
neighbour on either side, ``dt_i = (t_(i+1) - t_(i-1)) / 2``; the first and the last
sample take half their one interval, so the durations add up to ``t_last - t_first``.

Errors are :class:`~shaftsys.errors.ModelError` naming the file, the line (CSV; a
Parquet file names the data row), the column and what was expected: a missing column,
an empty or non-numeric cell, a time stamp equal to or before the previous one, power at
zero speed. A step between time stamps larger than ``gap_factor`` times the first
chunk's median step is a logged warning naming where it is.
"""

from __future__ import annotations

import csv
import logging
import math
import re
from collections.abc import Iterator
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np
import numpy.typing as npt

from shaftsys.errors import ModelError
from shaftsys.io.quantities import QuantityProblem, to_internal

_log = logging.getLogger(__name__)

#: Largest CSV [bytes] read by numpy in one piece (larger ones stream through pandas)
PLAIN_CSV_MAX_BYTES = 64 * 2**20

FloatArray = npt.NDArray[np.float64]
Chunk = tuple[FloatArray, ...]

#: role -> (accepted bare names, dimension of shaftsys.io.quantities, example)
ROLES: dict[str, tuple[tuple[str, ...], str, str]] = {
    "time": (("time", "t"), "time", "time [s]"),
    "torque": (("torque", "t_in", "torque_in"), "moment", "torque [N*m]"),
    "power": (("power", "p_in", "power_in"), "power", "power [kW]"),
    "speed": (("speed", "n", "n_in", "speed_in"), "speed", "speed [rpm]"),
    "temperature": (("temperature", "temp", "oil_temperature"), "temperature",
                    "temperature [degC]"),
}
_HEADER = re.compile(r"^\s*(.*?)\s*[\[(]\s*(.*?)\s*[\])]\s*$")
DEFAULT_CHUNK_ROWS = 1_000_000
DEFAULT_GAP_FACTOR = 5.0
MAX_GAP_WARNINGS = 5


def split_header(text: str) -> tuple[str, str | None]:
    """``"torque [N*m]"`` -> ``("torque", "N*m")``; ``"time"`` -> ``("time", None)``."""
    m = _HEADER.match(text)
    if m and m.group(2):
        return m.group(1), m.group(2)
    return text.strip(), None


def _role(role: str) -> tuple[str, str]:
    """(dimension, example) of a role; ``load:<column>`` is a force channel."""
    if role.startswith("load:"):
        return "force", f"{role[5:]} [N]"
    return ROLES[role][1], ROLES[role][2]


def _factor(unit: str, role: str) -> tuple[float, float]:
    """(offset, factor) to the internal unit of ``role`` (time in s, torque N*mm, power W,
    speed rpm, force N, temperature degC: absolute, so an offset for K and degF).
    """
    dimension = _role(role)[0]
    zero = to_internal(f"0 {unit}", dimension) if role == "temperature" else 0.0
    value = to_internal(f"1 {unit}", dimension) - zero
    return zero, (value * 3600.0 if role == "time" else value)


@dataclass
class SeriesSource:
    """An opened recording: which column plays which role, in which unit.

    ``columns``: role -> column name in the file; ``factors``: role -> (offset, factor)
    to the internal unit (time to s); ``data_line``: 1-based line of the first data row (CSV);
    ``gaps``: warnings about gaps found (filled on the first pass); ``extras``: roles of
    the extra channels (``temperature``, ``load:<column>``), in the order of the rows of
    the fourth array each chunk carries when there are any.
    """

    path: Path
    kind: str
    columns: dict[str, str]
    units: dict[str, str]
    factors: dict[str, tuple[float, float]]
    data_line: int
    chunk_rows: int = DEFAULT_CHUNK_ROWS
    gap_factor: float = DEFAULT_GAP_FACTOR
    gaps: list[str] = field(default_factory=list)
    extras: tuple[str, ...] = ()
    _passes: int = 0
    #: the raw columns of a recording that fits in one chunk, kept after the first read
    #: (the reduction reads twice; a larger file is streamed again, memory stays bounded)
    _single: dict[str, Any] | None = None

    @property
    def name(self) -> str:
        """The file's path as text (for messages)."""
        return str(self.path)

    def _error(self, row: int, role: str | None, message: str, expected: str) -> ModelError:
        col = f"column '{self.columns[role]}'" if role else None
        if self.kind == "csv":
            return ModelError(message, file=self.name, line=self.data_line + row,
                              field=col, expected=expected)
        where = f"row {row + 1}" + (f", {col}" if col else "")
        return ModelError(message, file=self.name, field=where, expected=expected)

    def _where(self, row: int) -> str:
        return f"line {self.data_line + row}" if self.kind == "csv" else f"row {row + 1}"

    def _raw(self) -> Iterator[dict[str, Any]]:
        if self._single is not None:
            yield self._single
            return
        first: dict[str, Any] | None = None
        count = 0
        for raw in self._read():
            count += 1
            first = raw if count == 1 else None
            yield raw
        if count == 1:
            self._single = first

    def _read(self) -> Iterator[dict[str, Any]]:
        names = list(self.columns.values())
        if self.kind == "csv":
            fast = self._plain_csv(names)
            if fast is not None:
                yield fast
                return
            import pandas as pd

            skip = [1] if self.data_line == 3 else None
            reader = pd.read_csv(self.path, usecols=names, skiprows=skip,
                                 chunksize=self.chunk_rows, skip_blank_lines=False,
                                 low_memory=False)
            for frame in reader:
                yield {n: frame[n].to_numpy() for n in names}
        else:
            import pyarrow.parquet as pq

            for batch in pq.ParquetFile(self.path).iter_batches(
                    batch_size=self.chunk_rows, columns=names):
                yield {n: batch.column(n).to_numpy(zero_copy_only=False) for n in names}

    def _plain_csv(self, names: list[str]) -> dict[str, Any] | None:
        """The columns of a small CSV of plain numbers read by numpy in one piece (no
        pandas import: most of a short recording's reading time), or ``None``: a file
        larger than one chunk or :data:`PLAIN_CSV_MAX_BYTES`, a blank line, a cell numpy
        cannot read (the pandas reader then reads it and locates the problem).
        """
        if self.path.stat().st_size > PLAIN_CSV_MAX_BYTES:
            return None
        lines = self.path.read_text(encoding="utf-8").splitlines()
        body = lines[self.data_line - 1:]
        if not body or len(body) > self.chunk_rows or any(not ln.strip() for ln in body):
            return None
        header = next(csv.reader(lines[:1]), [])
        try:
            cols = [header.index(n) for n in names]
            table = np.loadtxt(body, delimiter=",", usecols=cols, ndmin=2, dtype=np.float64,
                               comments=None)
        except ValueError:
            return None
        if table.shape != (len(body), len(cols)):
            return None
        return {n: table[:, k] for k, n in enumerate(names)}

    def _numbers(self, raw: dict[str, Any], role: str, offset: int) -> FloatArray:
        values = raw[self.columns[role]]
        try:
            arr = np.asarray(values, dtype=np.float64)
        except (TypeError, ValueError):
            import pandas as pd

            arr = pd.to_numeric(values, errors="coerce").astype(np.float64)
        bad = ~np.isfinite(arr)
        if bad.any():
            i = int(np.argmax(bad))
            cell = values[i]
            text = "an empty cell" if cell is None or (isinstance(cell, float) and
                                                       math.isnan(cell)) else f"'{cell}'"
            raise self._error(offset + i, role, f"{text} is not a finite number",
                              f"a number in {self.units[role]} in every row")
        zero, factor = self.factors[role]
        return zero + arr * factor if zero else arr * factor

    def chunks(self) -> Iterator[Chunk]:
        """Yield ``(dt_s, T_Nmm, n_rpm)`` per chunk (durations by the midpoint rule), and
        a fourth array (rows: the :attr:`extras` channels, temperature [degC], forces [N])
        when the recording has extra channels.
        """
        self._passes += 1
        first_pass = self._passes == 1
        offset = 0
        left_t: float | None = None     # time of the sample before the carried one
        carry: tuple[float, ...] | None = None
        carry_x = np.zeros((len(self.extras), 0))
        with_temp = bool(self.extras)
        median: float | None = None
        for raw in self._raw():
            t = self._numbers(raw, "time", offset)
            n = self._numbers(raw, "speed", offset)
            if "torque" in self.columns:
                T = self._numbers(raw, "torque", offset)
            else:
                P = self._numbers(raw, "power", offset)
                still = (n == 0.0) & (P != 0.0)
                if still.any():
                    i = int(np.argmax(still))
                    raise self._error(offset + i, "power", "power at zero speed has no "
                                      "torque", "a torque column, or speed != 0 where "
                                      "power != 0")
                with np.errstate(divide="ignore", invalid="ignore"):
                    T = np.where(n != 0.0, P / (2.0 * math.pi * n / 60.0) * 1000.0, 0.0)
            th = (np.stack([self._numbers(raw, r, offset) for r in self.extras]) if with_temp
                  else np.zeros((0, t.size)))
            size = t.size
            if size == 0:
                continue
            if carry is not None:
                t = np.concatenate([[carry[0]], t])
                T = np.concatenate([[carry[1]], T])
                n = np.concatenate([[carry[2]], n])
                th = np.concatenate([carry_x, th], axis=1)
            base = offset - (1 if carry is not None else 0)   # row of t[0]
            left = np.empty(t.size)
            left[1:] = np.diff(t)
            left[0] = 0.0 if left_t is None else t[0] - left_t
            check = left[1:] if left_t is None else left
            start = 1 if left_t is None else 0
            bad = check <= 0.0
            if bad.any():
                k = int(np.argmax(bad)) + start
                prev = t[k - 1] if k > 0 else left_t
                what = ("repeats the previous time stamp" if left[k] == 0.0 else
                        f"goes back in time from {prev:.9g} s")
                raise self._error(base + k, "time", f"time {t[k]:.9g} s {what}",
                                  "strictly increasing time stamps")
            if median is None and t.size > 1:
                median = float(np.median(np.diff(t)))
            if first_pass and median:
                jumps = np.flatnonzero(check > self.gap_factor * median) + start
                for j in jumps:
                    if len(self.gaps) < MAX_GAP_WARNINGS:
                        msg = (f"{self.name}: {self._where(base + int(j))}: the time stamps "
                               f"jump by {left[j]:.6g} s (median step {median:.6g} s); the "
                               "samples either side take half the gap each")
                        self.gaps.append(msg)
                        _log.warning(msg)
                    elif len(self.gaps) == MAX_GAP_WARNINGS:
                        self.gaps.append(f"{self.name}: more gaps in the time stamps")
                        _log.warning(self.gaps[-1])
            if t.size >= 2:
                dur = 0.5 * (left[:-1] + left[1:])
                yield ((dur, T[:-1], n[:-1], th[:, :-1]) if with_temp
                       else (dur, T[:-1], n[:-1]))
                left_t = float(t[-2])
            carry = (float(t[-1]), float(T[-1]), float(n[-1]))
            carry_x = th[:, -1:]
            offset += size
        if carry is None or left_t is None:
            raise ModelError("the recording has fewer than two samples", file=self.name,
                             field=f"column '{self.columns['time']}'",
                             expected="at least two rows of data")
        last = (np.array([0.5 * (carry[0] - left_t)]), np.array([carry[1]]),
                np.array([carry[2]]))
        yield (*last, carry_x) if with_temp else last


def _find_columns(path: Path, header: list[str], given: dict[str, str | None],
                  line: int) -> dict[str, str]:
    bare = {split_header(h)[0].lower(): h for h in header}
    full = {h.strip(): h for h in header}
    found: dict[str, str] = {}
    for role, (names, _, _) in ROLES.items():
        want = given.get(role)
        if want is not None:
            hit = full.get(want.strip()) or bare.get(want.strip().lower())
            if hit is None:
                raise ModelError(f"no column '{want}' for the {role}", file=str(path),
                                 line=line, field=f"--{role}",
                                 expected="one of: " + ", ".join(header))
            found[role] = hit
            continue
        for n in names:
            if n in bare:
                found[role] = bare[n]
                break
    for role in ("time", "speed"):
        if role not in found:
            raise ModelError(f"no {role} column", file=str(path), line=line,
                             expected=f"a column such as '{ROLES[role][2]}' (found: "
                             + ", ".join(header) + f"), or name it with --{role}")
    if "torque" in found and "power" in found:
        if given.get("power") is None:
            del found["power"]
        elif given.get("torque") is None:
            del found["torque"]
        else:
            raise ModelError("give the torque or the power column, not both",
                             file=str(path), line=line, field="--power",
                             expected="one of --torque, --power")
    if "torque" not in found and "power" not in found:
        raise ModelError("no torque or power column", file=str(path), line=line,
                         expected="a column such as 'torque [N*m]' or 'power [kW]' "
                         "(found: " + ", ".join(header) + ")")
    return found


def open_series(path: str | Path, *, time: str | None = None, torque: str | None = None,
                power: str | None = None, speed: str | None = None,
                temperature: str | None = None, loads: tuple[str, ...] = (),
                chunk_rows: int = DEFAULT_CHUNK_ROWS,
                gap_factor: float = DEFAULT_GAP_FACTOR) -> SeriesSource:
    """Open a recording (``.csv`` or ``.parquet``/``.pq``), find its columns and units.

    The keyword arguments name columns (the header text or its name without the unit);
    by default ``time``/``t``, ``torque`` or ``power``, ``speed``/``n`` and, optional,
    ``temperature``/``temp`` (then each case gets the time-mean temperature of its bin);
    ``loads`` names force columns (process-load channels).
    """
    p = Path(path)
    if not p.is_file():
        raise ModelError("no such file", file=str(p), expected="a CSV or Parquet recording")
    given = {"time": time, "torque": torque, "power": power, "speed": speed,
             "temperature": temperature}
    units_row: list[str] | None = None
    if p.suffix.lower() in (".parquet", ".pq"):
        kind = "parquet"
        import pyarrow.parquet as pq

        try:
            schema = pq.read_schema(p)
        except Exception as exc:  # pyarrow raises several types for a bad file
            raise ModelError(f"cannot read as Parquet: {exc}", file=str(p),
                             expected="a Parquet file") from None
        header = list(schema.names)
        meta = {f.name: (f.metadata or {}).get(b"unit", b"").decode() for f in schema}
        line = 1
    else:
        kind = "csv"
        try:
            with p.open(newline="", encoding="utf-8") as fh:
                rows = csv.reader(fh)
                header = next(rows, [])
                second = next(rows, None)
        except (OSError, UnicodeDecodeError, csv.Error) as exc:
            raise ModelError(f"cannot read: {exc}", file=str(p),
                             expected="a UTF-8 CSV file") from None
        if not header:
            raise ModelError("the file is empty", file=str(p), line=1,
                             expected="a header row: time [s], torque [N*m], speed [rpm]")
        meta = {}
        line = 1
        if second is not None and second and not all(_is_number(c) for c in second if c):
            units_row = second
    columns = _find_columns(p, header, given, line)
    for col in loads:
        hit = ({h.strip(): h for h in header}.get(col.strip())
               or {split_header(h)[0].lower(): h for h in header}.get(col.strip().lower()))
        if hit is None:
            raise ModelError(f"no column '{col}' for a process load", file=str(p), line=line,
                             field="--load", expected="one of: " + ", ".join(header))
        columns[f"load:{col}"] = hit
    units: dict[str, str] = {}
    factors: dict[str, tuple[float, float]] = {}
    for role, col in columns.items():
        _, unit = split_header(col)
        uline = line
        if units_row is not None:
            idx = header.index(col)
            unit = units_row[idx].strip() if idx < len(units_row) and units_row[idx] else unit
            uline = 2
        if not unit and kind == "parquet":
            unit = meta.get(col) or None
        if not unit:
            raise ModelError(f"the {role} column '{col}' has no unit", file=str(p),
                             line=uline if kind == "csv" else None, field=f"column '{col}'",
                             expected=f"the unit in the header ('{_role(role)[1]}') or in a "
                             "units row under it")
        try:
            factors[role] = _factor(unit, role)
        except QuantityProblem as exc:
            raise ModelError(f"unit '{unit}' of the {role} column: {exc.message}",
                             file=str(p), line=uline if kind == "csv" else None,
                             field=f"column '{col}'",
                             expected=f"a {_role(role)[0]} unit, e.g. '{_role(role)[1]}'"
                             ) from None
        units[role] = unit
    data_line = 3 if units_row is not None else 2
    extras = (("temperature",) if "temperature" in columns else ()) + tuple(
        f"load:{c}" for c in loads)
    return SeriesSource(p, kind, columns, units, factors, data_line, chunk_rows, gap_factor,
                        extras=extras)


def _is_number(text: str) -> bool:
    try:
        float(text)
    except ValueError:
        return False
    return True


__all__ = ["ROLES", "SeriesSource", "open_series", "split_header"]
