"""Read a user's bearing catalogue (CSV or YAML) into a catalogue of column arrays.

A catalogue is a table with one bearing per row. ``read_catalogue(path)`` reads a
``.csv`` file or a ``.yaml``/``.yml`` file, checks every value and converts it to the
internal units of :mod:`shaftsys.units`; anything wrong is a
:class:`~shaftsys.errors.ModelError` naming the file, the line, the column and what was
expected.

CSV form
--------

* The first line that is neither empty nor a comment is the header; it names the columns
  (any order). Lines whose first non-blank character is ``#`` are comments; empty lines
  and rows of empty cells are skipped; line numbers in messages count every line of the
  file. Cells are separated by commas (``"..."`` quotes a cell holding a comma); an
  empty cell means "not given". The file is UTF-8 (a leading byte-order mark is
  ignored).
* Column names are matched without regard to case, except ``d`` (bore) and ``D``
  (outside diameter), which only differ in case.
* A column's unit is given in one of three ways:

  1. a suffix of the column name after the last ``_`` (``C_kN``, ``d_mm``,
     ``limiting_speed_rpm``, ``mass_kg``, ``price_EUR``), or in brackets
     (``C [kN]``, ``C (kN)``);
  2. a unit row: the first row after the header whose ``designation`` cell is
     ``unit`` or ``units`` (or whose ``designation`` and ``type`` cells are both empty),
     e.g. ``units,,mm,mm,mm,kN,kN``; its cells of text columns are ignored, ``-`` or
     empty means no unit; a unit given both ways must agree;
  3. without either, bare numbers of the column are in the internal unit (mm, N, rpm,
     kg, deg) and one warning in the log names such columns (the internal unit is
     rarely what a table of ratings means).

  A cell may carry its own unit (``"52 kN"``, ``"3 in"``), which wins over the column's.
  Every unit is read with pint (:mod:`shaftsys.io.quantities`) and its dimension checked
  (a ``C_mm`` column is refused). The currency of ``price`` is only a name
  (``price_EUR``, or ``"12.50 EUR"`` in a cell): it is kept as ``price_unit``, never
  converted, and all prices must share it.
* Columns that are not in the table below are kept as text in ``Catalogue.extra`` under
  their header name (shown in reports).

Error locations (``file:line: field: message``): ``line`` is the line of the offending
row (or of the header / unit row for a column problem); ``field`` is the column name as
written in the header (``C_kN``); the message names the row's designation. Problems of a
whole row (wrong number of cells) or of the whole file (size, encoding, empty) have no
field.

YAML form
---------

A mapping with ``bearings:`` (a list of mappings, one per bearing, keys as the column
names below, also with unit suffixes) and optionally ``name`` and ``price_unit``. Values
are numbers in the internal unit (without a warning, as in a model file) or quantity
strings (``C: 52 kN``); a price may be ``12.50 EUR``. The file is read by
the model file's safe, located YAML reader (:mod:`shaftsys.io.yamlsource`, with its limit
of 200 000 values: about 9 000 bearings of 22 keys; use CSV for larger catalogues). An
error's field is ``bearings[<designation>].<key as written>`` (``bearings[<i>]`` while
the designation is unknown) and its line that of the key. The JSON Schema of this form
ships as ``shaftsys/catalogue.schema.json`` (:func:`catalogue_schema`); it describes the
canonical spelling of the keys.

Both forms: at most ``MAX_FILE_BYTES`` (2 MB, the model file's limit); at least one
bearing; designations unique. Every value in internal units is 0 or of magnitude 1e-15 to
1e15 (as in a model file).

Columns
-------

| column | also written | unit (internal) | required | meaning and check |
|---|---|---|---|---|
| `designation` |  | text | yes | the catalogue's name of the bearing, unique |
| `type` | `kind` | text | yes | bearing type (the values are listed below) |
| `d` | `bore` | length (mm) | yes | bore diameter; > 0 |
| `D` | `outer` | length (mm) | yes | outside diameter; > 0 and > d |
| `B` | `width` | length (mm) | yes | width; > 0 |
| `C` |  | force (N) | yes | basic dynamic load rating C; > 0 |
| `C0` |  | force (N) | yes | basic static load rating C0; > 0 |
| `Cu` |  | force (N) | no | fatigue load limit Cu; > 0 and < C0 |
| `limiting_speed` |  | speed (rpm) | no | limiting speed; > 0 |
| `reference_speed` |  | speed (rpm) | no | thermal reference speed; > 0 |
| `mass` |  | mass (kg) | no | mass; > 0 |
| `dm` |  | length (mm) | no | pitch diameter of the rolling element set; d < dm < D |
| `contact_angle` |  | angle (deg) | no | nominal contact angle alpha; 0 to 90 (see below) |
| `e` |  | - | no | limit e of Fa/Fr; > 0 |
| `Y` |  | - | no | axial load factor Y; >= 0 |
| `Y0` |  | - | no | static axial load factor Y0; >= 0 |
| `Y1` |  | - | no | axial load factor Y1 for Fa/Fr <= e; >= 0 |
| `Y2` |  | - | no | axial load factor Y2 for Fa/Fr > e; >= 0 |
| `X` |  | - | no | radial load factor X for Fa/Fr > e; >= 0 |
| `f0` |  | - | no | ISO 281 geometry factor f0 of a radial ball bearing; > 0 |
| `Dw` |  | length (mm) | no | rolling element diameter Dw; > 0 |
| `Z` |  | - | no | number of rolling elements per row Z; a whole number >= 1 |
| `Lwe` |  | length (mm) | no | effective roller length Lwe; > 0 |
| `price` |  | currency (as named) | no | price of one bearing; >= 0 |

Bearing types (`type`): `deep_groove_ball`, `angular_contact_ball`,
`self_aligning_ball`, `cylindrical_roller`, `tapered_roller`, `spherical_roller`,
`needle_roller`, `thrust_ball`; written in any case, with `-` or a space for `_`.
`contact_angle` is required for `angular_contact_ball` and `thrust_ball` rows.
"""

from __future__ import annotations

import csv
import difflib
import json
import logging
import math
import re
import textwrap
from collections.abc import Callable, Iterator
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, BinaryIO

import numpy as np

from shaftsys import units as U
from shaftsys.errors import ModelError
from shaftsys.io.quantities import (
    EXACT_FACTORS,
    MAX_MAGNITUDE,
    MIN_MAGNITUDE,
    QuantityProblem,
    to_internal,
)
from shaftsys.io.spec import DEFAULT_UNIT_NOTE, Where, check_keys
from shaftsys.io.yamlsource import (
    MAX_FILE_BYTES,
    LocatedDict,
    LocatedList,
    parse_yaml,
    read_text_file,
)
from shaftsys.model.bearing import BearingKind
from shaftsys.model.catalogue import KIND_CODE, Catalogue

log = logging.getLogger(__name__)

#: Marker of a text column (designation, extra columns), the type column and the price.
TEXT, KIND, CURRENCY = "text", "kind", "currency"


@dataclass(frozen=True)
class ColumnSpec:
    """One known column of a catalogue.

    Attributes
    ----------
    name: canonical column name (also the YAML key).
    attr: attribute of :class:`~shaftsys.model.catalogue.Catalogue` that holds it.
    dim: dimension (a key of :data:`shaftsys.io.quantities.DEFAULT_UNITS`), or
        :data:`TEXT`, :data:`KIND`, :data:`CURRENCY`.
    doc: meaning and check, for the column table.
    required: every row must give it.
    aliases: other names accepted for the column.
    positive, non_negative, minimum, maximum, whole: range of the value in internal units.
    """

    name: str
    attr: str
    dim: str
    doc: str
    required: bool = False
    aliases: tuple[str, ...] = ()
    positive: bool = False
    non_negative: bool = False
    minimum: float | None = None
    maximum: float | None = None
    whole: bool = False

    @property
    def numeric(self) -> bool:
        """True for a column of numbers (quantities, plain numbers, prices)."""
        return self.dim not in {TEXT, KIND}


_C = ColumnSpec
_KIND_NAMES = ", ".join(k.value for k in BearingKind)

#: The known columns, in the order of the documented table.
COLUMNS: tuple[ColumnSpec, ...] = (
    _C("designation", "designation", TEXT, "the catalogue's name of the bearing, unique",
       required=True),
    _C("type", "kind", KIND, "bearing type (the values are listed below)", required=True,
       aliases=("kind",)),
    _C("d", "d_mm", "length", "bore diameter; > 0", required=True, aliases=("bore",),
       positive=True),
    _C("D", "D_mm", "length", "outside diameter; > 0 and > d", required=True,
       aliases=("outer",), positive=True),
    _C("B", "B_mm", "length", "width; > 0", required=True, aliases=("width",),
       positive=True),
    _C("C", "C_N", "force", "basic dynamic load rating C; > 0", required=True,
       positive=True),
    _C("C0", "C0_N", "force", "basic static load rating C0; > 0", required=True,
       positive=True),
    _C("Cu", "Cu_N", "force", "fatigue load limit Cu; > 0 and < C0", positive=True),
    _C("limiting_speed", "limiting_speed_rpm", "speed", "limiting speed; > 0",
       positive=True),
    _C("reference_speed", "reference_speed_rpm", "speed", "thermal reference speed; > 0",
       positive=True),
    _C("mass", "mass_kg", "mass", "mass; > 0", positive=True),
    _C("dm", "dm_mm", "length", "pitch diameter of the rolling element set; d < dm < D",
       positive=True),
    _C("contact_angle", "contact_angle_deg", "angle", "nominal contact angle alpha; 0 to "
       "90 (see below)", minimum=0.0, maximum=90.0),
    _C("e", "e", "dimensionless", "limit e of Fa/Fr; > 0", positive=True),
    _C("Y", "Y", "dimensionless", "axial load factor Y; >= 0", non_negative=True),
    _C("Y0", "Y0", "dimensionless", "static axial load factor Y0; >= 0", non_negative=True),
    _C("Y1", "Y1", "dimensionless", "axial load factor Y1 for Fa/Fr <= e; >= 0",
       non_negative=True),
    _C("Y2", "Y2", "dimensionless", "axial load factor Y2 for Fa/Fr > e; >= 0",
       non_negative=True),
    _C("X", "X", "dimensionless", "radial load factor X for Fa/Fr > e; >= 0",
       non_negative=True),
    _C("f0", "f0", "dimensionless", "ISO 281 geometry factor f0 of a radial ball "
       "bearing; > 0", positive=True),
    _C("Dw", "Dw_mm", "length", "rolling element diameter Dw; > 0", positive=True),
    _C("Z", "Z", "dimensionless", "number of rolling elements per row Z; a whole number "
       ">= 1", minimum=1.0, whole=True),
    _C("Lwe", "Lwe_mm", "length", "effective roller length Lwe; > 0", positive=True),
    _C("price", "price", CURRENCY, "price of one bearing; >= 0", non_negative=True),
)

_BY_NAME = {c.name: c for c in COLUMNS}
_LOOKUP = {n.lower(): c for c in COLUMNS for n in (c.name, *c.aliases) if n not in "dD"}
_CASE_SENSITIVE = {"d": _BY_NAME["d"], "D": _BY_NAME["D"]}
_BRACKETED = re.compile(r"^(.*?)\s*[\[(]\s*(.*?)\s*[\])]$")
_CELL = re.compile(r"^\s*([-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?)\s*(\S.*?)\s*$")
_CURRENCY = re.compile(r"^(?:[^\W\d_]{1,16}|[€$£¥])$")
_CONTROL = re.compile(r"[\x00-\x08\x0b\x0c\x0e-\x1f\x7f]")
_NO_UNIT = {"", "-"}
_UNIT_ROW = {"unit", "units"}
_NEEDS_CONTACT_ANGLE = (BearingKind.ANGULAR_CONTACT_BALL, BearingKind.THRUST_BALL)

#: The exact factors of the common units (one table, :data:`shaftsys.io.quantities.
#: EXACT_FACTORS`): a catalogue in mm, kN, rpm and kg is read without building pint's
#: registry; anything else is read with pint.
_COMMON_FACTORS = EXACT_FACTORS


def resolve_column(header: str) -> tuple[ColumnSpec | None, str | None]:
    """The known column a header cell names, and the unit it writes (``None`` if none).

    ``C_kN`` -> (C, "kN"), ``C [kN]`` -> (C, "kN"), ``Bore`` -> (d, None);
    an unknown name -> (None, None): an extra column kept as text. Text columns
    (``designation``, ``type``) take no suffix.
    """
    text = header.strip()
    spec = _lookup(text)
    if spec is not None:
        return spec, None
    match = _BRACKETED.match(text)
    if match:
        spec = _lookup(match[1])
        if spec is not None and spec.numeric:
            return spec, match[2]
    for k in range(len(text) - 1, 0, -1):
        if text[k] == "_":
            spec = _lookup(text[:k])
            if spec is not None and spec.numeric and text[k + 1:].strip():
                return spec, text[k + 1:].strip()
    return None, None


def _lookup(name: str) -> ColumnSpec | None:
    return _CASE_SENSITIVE.get(name) or _LOOKUP.get(name.lower())


# ---------------------------------------------------------------------------------------
# reading files


def read_catalogue(path: str | Path) -> Catalogue:
    """Read and check a bearing catalogue file (``.csv``, ``.yaml`` or ``.yml``).

    Parameters
    ----------
    path: the file; its suffix selects the form (see the module docstring).

    Returns
    -------
    The catalogue in internal units (N, mm, rpm, kg, deg), ``source`` = ``str(path)``.

    Raises
    ------
    ModelError: an unreadable, too large or non-UTF-8 file, or any bad value, with file,
        line, column and what was expected.
    """
    p = Path(path)
    name = str(path)
    suffix = p.suffix.lower()
    if suffix not in {".csv", ".yaml", ".yml"}:
        raise ModelError(f"cannot tell the form of a catalogue file ending in "
                         f"{suffix or '(nothing)'!r}", file=name,
                         expected="a .csv, .yaml or .yml file")
    text = read_text_file(path, "catalogue file")
    if suffix == ".csv":
        return catalogue_from_csv(text, file=name)
    return catalogue_from_yaml(text, file=name)


def catalogue_from_csv(text: str, file: str | None = None) -> Catalogue:
    """Read a catalogue from CSV text (``file`` names it in messages and ``source``)."""
    _check_text(text, file)
    text = text.removeprefix("\ufeff")
    kept = [(no, raw.rstrip("\r")) for no, raw in enumerate(text.split("\n"), start=1)
            if raw.strip() and not raw.lstrip().startswith("#")]
    rows = _csv_rows(kept, file)
    if not rows:
        raise ModelError("the catalogue is empty (no header line)", file=file, line=1,
                         expected="a header line naming the columns, then one row per "
                         "bearing")
    header_line, header = rows[0]
    columns = _csv_header(header, header_line, file)
    n_cells = len(header)
    body = rows[1:]
    for line, cells in body:
        if len(cells) != n_cells and any(c.strip() for c in cells):
            raise ModelError(f"the row has {len(cells)} cells, the header names {n_cells} "
                             "columns", file=file, line=line,
                             expected=f"{n_cells} comma-separated cells (empty cells for "
                             "values not given)")
    body = [(line, cells) for line, cells in body if any(c.strip() for c in cells)]
    if body and _is_unit_row(columns, body[0][1]):
        _apply_unit_row(columns, body[0], file)
        body = body[1:]
    if not body:
        raise ModelError("the catalogue has no bearing", file=file, line=header_line,
                         expected="one row per bearing below the header")
    row_lines = [line for line, _ in body]
    for j, column_cells in enumerate(zip(*(cells for _, cells in body), strict=True)):
        columns[j].cells = list(column_cells)
        columns[j].lines = row_lines
    kept_columns = []
    for col in columns:
        if not col.name:
            filled = next((i for i, c in enumerate(col.cells) if c.strip()), None)
            if filled is None:
                continue  # a trailing separator of a spreadsheet export
            raise ModelError("a column without a name in the header holds values",
                             file=file, line=row_lines[filled], field=f"column {col.index}",
                             expected="a name for every column in the header")
        kept_columns.append(col)
    return _build(kept_columns, row_lines, file, price_unit=None)


def catalogue_from_yaml(text: str, file: str | None = None) -> Catalogue:
    """Read a catalogue from YAML text (``file`` names it in messages and ``source``)."""
    raw = parse_yaml(text, file)
    top = Where(file, "", raw if isinstance(raw, LocatedDict) else None)
    if not isinstance(raw, LocatedDict):
        raise ModelError("a catalogue file is a mapping with a list 'bearings'", file=file,
                         line=1, expected="a YAML mapping with 'bearings:'")
    check_keys(top, raw, _YAML_TOP)
    if "bearings" not in raw:
        raise ModelError("'bearings' is missing", file=file, line=raw.line,
                         field="bearings", expected="a key 'bearings' with a list")
    items = raw["bearings"]
    if not isinstance(items, LocatedList):
        raise top.error("bearings", "'bearings' is not a list", "a list of '- ' items")
    if not items:
        raise top.error("bearings", "the catalogue has no bearing", "at least one bearing")
    price_unit = raw.get("price_unit")
    if price_unit is not None:
        if not isinstance(price_unit, str) or not _CURRENCY.match(price_unit.strip()):
            raise top.error("price_unit", f"{price_unit!r} is not a currency name",
                            "a word such as 'EUR'")
        price_unit = price_unit.strip()
    return _build(_yaml_columns(items, file), list(items.lines), file,
                  price_unit=price_unit)


_YAML_TOP = {"bearings", "name", "price_unit"}


# ---------------------------------------------------------------------------------------
# CSV details


@dataclass
class _Column:
    """One column while it is read: where each cell stood and in which unit."""

    spec: ColumnSpec | None          # None: an extra column kept as text
    name: str                        # as written (CSV header; YAML canonical or key)
    index: int = 0                   # 1-based position in the CSV header
    unit: str | None = None          # column unit (header or unit row)
    unit_line: int | None = None     # where the column unit was written
    unit_field: str | None = None
    cells: list[Any] = field(default_factory=list)
    lines: list[int] = field(default_factory=list)
    fields: list[str] | None = None  # per-cell field (YAML); None: a CSV column of texts
    cell_units: list[str | None] | None = None  # per-cell unit from a YAML key suffix

    def field_of(self, i: int) -> str:
        """Field path of cell ``i`` for messages."""
        return self.name if self.fields is None else self.fields[i]


def _check_text(text: str, file: str | None) -> None:
    if len(text) > MAX_FILE_BYTES or len(text.encode("utf-8", "replace")) > MAX_FILE_BYTES:
        raise ModelError(f"the catalogue file is larger than {MAX_FILE_BYTES // 1000} kB",
                         file=file, line=1, expected="a smaller catalogue file")
    bad = _CONTROL.search(text)
    if bad:
        raise ModelError(f"character #x{ord(bad.group()):04x} is not allowed in a "
                         "catalogue", file=file, line=text.count("\n", 0, bad.start()) + 1,
                         expected="printable text (no NUL or other control characters)")


def _csv_rows(kept: list[tuple[int, str]], file: str | None) -> list[tuple[int, list[str]]]:
    """CSV rows with the file line where each starts (a quoted cell may span lines)."""
    reader = csv.reader((line for _, line in kept), strict=True)
    rows: list[tuple[int, list[str]]] = []
    consumed = 0
    try:
        for cells in reader:
            rows.append((kept[consumed][0], cells))
            consumed = reader.line_num
    except csv.Error as exc:
        line = kept[min(reader.line_num, len(kept)) - 1][0] if kept else 1
        raise ModelError(f"cannot read the CSV row: {exc}", file=file, line=line,
                         expected="comma-separated cells, quotes closed on their "
                         "line") from None
    return rows


def _csv_header(header: list[str], line: int, file: str | None) -> list[_Column]:
    columns: list[_Column] = []
    seen: dict[str, str] = {}
    for j, cell in enumerate(header, start=1):
        name = cell.strip()
        spec, unit = resolve_column(name) if name else (None, None)
        col = _Column(spec, name, index=j, unit=unit, unit_line=line, unit_field=name)
        key = spec.name if spec is not None else name.lower()
        if name and key in seen:
            what = f"column '{spec.name}'" if spec is not None else f"column {name!r}"
            raise ModelError(f"{what} appears twice in the header ({seen[key]!r} and "
                             f"{name!r})", file=file, line=line, field=name,
                             expected="each column once")
        if name:
            seen[key] = name
        if spec is not None and unit is not None:
            _column_unit_factor(col, file)  # refuse an unreadable unit at the header
        columns.append(col)
    for spec in COLUMNS:
        if spec.required and spec.name not in seen:
            example = {"length": f"{spec.name}_mm", "force": f"{spec.name}_kN"}.get(
                spec.dim, spec.name)
            also = "".join(f" or '{a}'" for a in spec.aliases)
            raise ModelError(f"the header has no column '{spec.name}'{also} ({spec.doc})",
                             file=file, line=line, field=spec.name,
                             expected=f"a column '{example}'")
    return columns


def _is_unit_row(columns: list[_Column], cells: list[str]) -> bool:
    values = {c.spec.name: cells[j].strip() for j, c in enumerate(columns)
              if c.spec is not None and c.spec.dim in {TEXT, KIND}}
    designation = values.get("designation", "")
    if designation.lower() in _UNIT_ROW:
        return True
    if designation or values.get("type", ""):
        return False
    # designation and type empty: units, unless a numeric cell holds a number (then it
    # is a bearing row whose designation is missing, reported as such)
    return not any(_is_number(cells[j]) for j, c in enumerate(columns)
                   if c.spec is not None and c.spec.numeric)


def _is_number(text: str) -> bool:
    try:
        float(text)
    except ValueError:
        return False
    return True


def _apply_unit_row(columns: list[_Column], row: tuple[int, list[str]], file: str | None
                    ) -> None:
    line, cells = row
    for col, cell in zip(columns, cells, strict=True):
        unit = cell.strip()
        if col.spec is None or not col.spec.numeric or unit in _NO_UNIT:
            continue
        if col.unit is not None:
            before = _column_unit_factor(col, file)
            other = _Column(col.spec, col.name, unit=unit, unit_line=line,
                            unit_field=col.name)
            if _column_unit_factor(other, file) != before or (
                    col.spec.dim == CURRENCY and unit != col.unit):
                raise ModelError(f"the unit row gives {unit!r} for a column whose name "
                                 f"says {col.unit!r}", file=file, line=line,
                                 field=col.name, expected="one unit per column")
            continue
        col.unit, col.unit_line, col.unit_field = unit, line, col.name
        _column_unit_factor(col, file)


# ---------------------------------------------------------------------------------------
# YAML details


def _yaml_columns(items: LocatedList, file: str | None) -> list[_Column]:
    n = len(items)
    by_key: dict[str, _Column] = {}
    for i, item in enumerate(items):
        where = Where(file, "bearings", items)
        if not isinstance(item, LocatedDict):
            raise where.error(i, "a catalogue entry is not a mapping",
                              "a mapping of 'key: value' lines")
        label = _yaml_label(item, i)
        seen: dict[str, str] = {}
        for key, value in item.items():
            spec, unit = resolve_column(key)
            ident = spec.name if spec is not None else key
            path = f"bearings[{label}].{key}"
            if ident in seen:
                raise ModelError(f"'{seen[ident]}' and '{key}' give the same value twice",
                                 file=file, line=item.lines[key], field=path,
                                 expected="each value once")
            seen[ident] = key
            if isinstance(value, LocatedDict | LocatedList):
                what = "mapping" if isinstance(value, dict) else "list"
                raise ModelError(f"'{key}' holds a {what}",
                                 file=file, line=item.lines[key], field=path,
                                 expected="a plain value")
            col = by_key.get(ident)
            if col is None:
                col = by_key[ident] = _Column(
                    spec, spec.name if spec is not None else key, cells=[None] * n,
                    lines=list(items.lines), fields=[
                        f"bearings[{_yaml_label(it, k)}].{ident}" for k, it in enumerate(items)],
                    cell_units=[None] * n)
            assert col.fields is not None and col.cell_units is not None
            col.cells[i] = value
            col.lines[i] = item.lines[key]
            col.fields[i] = path
            col.cell_units[i] = unit
    for spec in COLUMNS:  # a required key missing everywhere: its column of None cells
        if spec.required and spec.name not in by_key:
            by_key[spec.name] = _Column(
                spec, spec.name, cells=[None] * n, lines=list(items.lines),
                fields=[f"bearings[{_yaml_label(it, k)}].{spec.name}"
                        for k, it in enumerate(items)])
    return list(by_key.values())


def _yaml_label(item: Any, i: int) -> str:
    value = item.get("designation") if isinstance(item, LocatedDict) else None
    if isinstance(value, str | int) and not isinstance(value, bool) and str(value).strip():
        return str(value).strip()
    return str(i)


# ---------------------------------------------------------------------------------------
# converting and checking columns (both forms)


@dataclass(order=True)
class _Problem:
    line: int
    order: int
    message: str = field(compare=False)
    field_name: str | None = field(compare=False)
    expected: str = field(compare=False)


class _Problems:
    """The problems found so far; the first in file order is raised."""

    def __init__(self, file: str | None) -> None:
        self.file = file
        self.found: list[_Problem] = []

    def add(self, line: int, field_name: str | None, message: str, expected: str) -> None:
        self.found.append(_Problem(line, len(self.found), message, field_name, expected))

    def raise_first(self) -> None:
        if self.found:
            p = min(self.found)
            raise ModelError(p.message, file=self.file, line=p.line, field=p.field_name,
                             expected=p.expected)


def _build(columns: list[_Column], row_lines: list[int], file: str | None, *,
           price_unit: str | None) -> Catalogue:
    n = len(row_lines)
    problems = _Problems(file)
    by_name = {c.spec.name: c for c in columns if c.spec is not None}
    designation = _designations(by_name["designation"], problems)
    in_csv = by_name["designation"].fields is None
    # CSV messages name the row's bearing; a YAML field path already does
    names = [f"bearing {d!r}: " if d and in_csv else "" for d in designation]
    kinds = _kinds(by_name["type"], names, problems)
    values: dict[str, np.ndarray] = {}
    unitless: list[str] = []
    for col in columns:
        if col.spec is None or not col.spec.numeric:
            continue
        if col.spec.dim == CURRENCY:
            array, price_unit = _prices(col, names, price_unit, problems)
        else:
            array, bare = _numbers(col, names, problems, file)
            if bare and in_csv and col.spec.dim != "dimensionless":
                unitless.append(f"{col.name} ({DEFAULT_UNIT_NOTE[col.spec.dim]})")
        _check_range(col, array, names, problems)
        values[col.spec.attr] = array
    for spec in COLUMNS:
        if spec.numeric and spec.attr not in values:
            values[spec.attr] = np.full(n, np.nan)
    _cross_checks(by_name, values, kinds, names, row_lines, problems)
    problems.raise_first()
    if unitless:
        log.warning("%s: no unit given for column%s %s: bare numbers read in the unit "
                    "shown", file or "catalogue", "s" if len(unitless) > 1 else "",
                    ", ".join(unitless))
    extra = {c.name: tuple("" if v is None else str(v).strip() for v in c.cells)
             for c in columns if c.spec is None}
    kind_tuple = tuple(k if k is not None else BearingKind.DEEP_GROOVE_BALL for k in kinds)
    return Catalogue(
        designation=tuple(designation), kind=kind_tuple,
        kind_code=np.array([KIND_CODE[k] for k in kind_tuple], dtype=np.int8),
        line=tuple(row_lines), price_unit=price_unit or "", source=file or "",
        extra=extra, **values,
    )


def _designations(col: _Column, problems: _Problems) -> list[str]:
    out: list[str] = []
    first: dict[str, int] = {}
    for i, raw in enumerate(col.cells):
        text = "" if raw is None or isinstance(raw, bool) else str(raw).strip()
        line = col.lines[i]
        if not text:
            problems.add(line, col.field_of(i), "the designation is missing",
                         "the catalogue's name of the bearing")
        elif len(text) > 200:
            problems.add(line, col.field_of(i), f"a designation of {len(text)} characters",
                         "a name of at most 200 characters")
        elif text in first:
            problems.add(line, col.field_of(i), f"designation {text!r} appears on lines "
                         f"{first[text]} and {line}", "each designation once")
        else:
            first[text] = line
        out.append(text)
    return out


_KIND_BY_TEXT = {k.value: k for k in BearingKind}


def _kinds(col: _Column, names: list[str], problems: _Problems) -> list[BearingKind | None]:
    out: list[BearingKind | None] = []
    cache: dict[str, BearingKind | None] = {}
    for i, raw in enumerate(col.cells):
        text = "" if raw is None or isinstance(raw, bool) else str(raw)
        if text in cache:
            norm = cache[text]
        else:
            key = text.strip().lower().replace("-", "_").replace(" ", "_")
            norm = cache[text] = _KIND_BY_TEXT.get(key)
        if norm is None:
            key = text.strip().lower().replace("-", "_").replace(" ", "_")
            close = difflib.get_close_matches(key, list(_KIND_BY_TEXT), n=1, cutoff=0.6)
            starting = [k for k in _KIND_BY_TEXT if key and k.startswith(key)]
            close = close or (starting if len(starting) == 1 else [])
            hint = f"; did you mean '{close[0]}'?" if close else ""
            what = f"{text.strip()!r} is not a bearing type{hint}" if text.strip() else \
                "the bearing type is missing"
            problems.add(col.lines[i], col.field_of(i), names[i] + what,
                         f"one of: {_KIND_NAMES}")
        out.append(norm)
    return out


def _numbers(col: _Column, names: list[str], problems: _Problems, file: str | None
             ) -> tuple[np.ndarray, bool]:
    """Column values in internal units (NaN where empty or bad), and whether any bare
    number was read in the internal unit for want of a unit.
    """
    spec = col.spec
    assert spec is not None
    column_factor = 1.0 if col.unit is None else _column_unit_factor(col, file)
    fast = _plain_numbers(col)
    if fast is not None:
        given = fast[1]
        if not spec.required or given.all():
            return fast[0] * column_factor, col.unit is None and bool(given.any())
    out = np.full(len(col.cells), np.nan)
    bare = False
    for i, cell in enumerate(col.cells):
        raw = cell.strip() if isinstance(cell, str) else cell
        if raw is None or raw == "":
            if spec.required:
                key = col.field_of(i).rsplit(".", 1)[-1]
                expected = (f"a value in column '{key}' for every bearing"
                            if col.fields is None else f"a key '{key}'")
                problems.add(col.lines[i], col.field_of(i), f"{names[i]}'{key}' is missing "
                             f"({spec.doc.split(';')[0]})", expected)
            continue
        if isinstance(raw, bool) or not isinstance(raw, int | float | str):
            problems.add(col.lines[i], col.field_of(i),
                         f"{names[i]}{type(raw).__name__} {raw!r} is not a number",
                         _expect(spec))
            continue
        cell_unit = col.cell_units[i] if col.cell_units is not None else None
        try:
            number = float(raw)
        except (ValueError, OverflowError):
            converted = _with_unit(str(raw), spec, col, i, names, problems)
            if converted is None:
                continue
            out[i] = converted
            continue
        if not math.isfinite(number):
            problems.add(col.lines[i], col.field_of(i),
                         f"{names[i]}{raw!r} is not a finite number", _expect(spec))
            continue
        if cell_unit is not None:
            try:
                number *= _unit_factor(cell_unit, spec.dim)
            except QuantityProblem as exc:
                problems.add(col.lines[i], col.field_of(i), exc.message, exc.expected)
                continue
        elif col.unit is None:
            bare = True
        out[i] = number * column_factor
    return out, bare


def _plain_numbers(col: _Column) -> tuple[np.ndarray, np.ndarray] | None:
    """Fast path of a CSV column of plain finite numbers and empty cells: the values
    (NaN where empty) and the mask of given cells; ``None`` when any cell needs more.
    """
    if col.fields is not None:  # a YAML column: numbers, quantity strings, None
        return None
    given = np.array([c != "" for c in col.cells], dtype=bool)
    try:
        values = np.array([c or "nan" for c in col.cells], dtype=np.float64)
    except (ValueError, OverflowError):
        return None
    if not np.isfinite(values[given]).all():
        return None  # 'nan', 'inf' or an overflow written in a cell: the loop names it
    return values, given


def _with_unit(text: str, spec: ColumnSpec, col: _Column, i: int, names: list[str],
               problems: _Problems) -> float | None:
    """A cell such as ``"52 kN"`` in internal units, or ``None`` after adding a problem."""
    match = _CELL.match(text)
    if match is None:
        problems.add(col.lines[i], col.field_of(i),
                     f"{names[i]}cannot read {text!r} as a number", _expect(spec))
        return None
    try:
        return float(match[1]) * _unit_factor(match[2], spec.dim)
    except QuantityProblem as exc:
        problems.add(col.lines[i], col.field_of(i), f"{names[i]}{exc.message}", exc.expected)
        return None


def _prices(col: _Column, names: list[str], price_unit: str | None, problems: _Problems
            ) -> tuple[np.ndarray, str | None]:
    currency = col.unit if col.unit is not None else price_unit
    if col.unit is not None and price_unit is not None and col.unit != price_unit:
        problems.add(col.unit_line or 1, col.unit_field, f"the column says {col.unit!r}, "
                     f"price_unit says {price_unit!r}", "one currency")
    if currency is not None and not _CURRENCY.match(currency):
        problems.add(col.unit_line or 1, col.unit_field or col.name,
                     f"{currency!r} is not a currency name", "a word such as 'EUR'")
    fast = _plain_numbers(col)
    if fast is not None:
        return fast[0], currency
    out = np.full(len(col.cells), np.nan)
    for i, cell in enumerate(col.cells):
        raw = cell.strip() if isinstance(cell, str) else cell
        if raw is None or raw == "":
            continue
        if isinstance(raw, bool) or not isinstance(raw, int | float | str):
            problems.add(col.lines[i], col.field_of(i),
                         f"{names[i]}{raw!r} is not a price", "a number such as 12.50")
            continue
        text = str(raw).strip()
        cell_currency = col.cell_units[i] if col.cell_units is not None else None
        try:
            number = float(text)
        except ValueError:
            match = _CELL.match(text)
            if match is None or not _CURRENCY.match(match[2]):
                problems.add(col.lines[i], col.field_of(i),
                             f"{names[i]}cannot read {text!r} as a price",
                             "a number such as 12.50, or '12.50 EUR'")
                continue
            number, cell_currency = float(match[1]), match[2]
        if not math.isfinite(number):
            problems.add(col.lines[i], col.field_of(i),
                         f"{names[i]}{text!r} is not a finite number", "a finite price")
            continue
        if cell_currency is not None:
            if currency is None:
                currency = cell_currency
            elif cell_currency != currency:
                problems.add(col.lines[i], col.field_of(i),
                             f"{names[i]}a price in {cell_currency} among prices in "
                             f"{currency}", f"every price in {currency}")
                continue
        out[i] = number
    return out, currency


def _expect(spec: ColumnSpec) -> str:
    if spec.dim == "dimensionless":
        return "a plain number"
    note = DEFAULT_UNIT_NOTE[spec.dim]
    example = {"length": "45 mm", "force": "52 kN", "speed": "6300 rpm", "mass": "0.5 kg",
               "angle": "25 deg"}.get(spec.dim, f"1 {note}")
    return f"a number (in the column's unit, else {note}) or a quantity such as '{example}'"


def _column_unit_factor(col: _Column, file: str | None) -> float:
    """Factor of the column's unit to the internal unit; a bad unit is a ModelError."""
    assert col.spec is not None and col.unit is not None
    if col.spec.dim == CURRENCY:
        if not _CURRENCY.match(col.unit):
            raise ModelError(f"{col.unit!r} is not a currency name", file=file,
                             line=col.unit_line, field=col.unit_field,
                             expected="a word such as 'EUR'")
        return 1.0
    try:
        return _unit_factor(col.unit, col.spec.dim)
    except QuantityProblem as exc:
        raise ModelError(f"column '{col.name}': {exc.message}", file=file,
                         line=col.unit_line, field=col.unit_field,
                         expected=exc.expected) from None


_FACTOR_CACHE: dict[tuple[str, str], float] = {}


def _unit_factor(unit: str, dim: str) -> float:
    """Internal-unit value of one ``unit`` of dimension ``dim`` (linear units only).

    Raises
    ------
    QuantityProblem: pint cannot read the unit, or it is not of that dimension.
    """
    key = (dim, unit.strip())
    factor = _COMMON_FACTORS.get(key) or _FACTOR_CACHE.get(key)
    if factor is not None:
        return factor
    text = key[1]
    unit_name = DEFAULT_UNIT_NOTE[dim]
    expected = f"a unit of {dim.replace('_', ' ')} such as '{unit_name}'"
    if not text or text.lower() in {"nan", "inf", "infinity"} or re.search(r"\d\s", text):
        raise QuantityProblem(f"cannot read the unit {text!r}", expected)
    try:
        U.registry().parse_units(text)
    except Exception:  # pint raises many types for unparsable text
        raise QuantityProblem(f"cannot read the unit {text!r}", expected) from None
    try:
        factor = to_internal(f"1 {text}", dim)
    except QuantityProblem:
        raise QuantityProblem(f"the unit {text!r} is not a unit of "
                              f"{dim.replace('_', ' ')}", expected) from None
    if not factor > 0:
        raise QuantityProblem(f"the unit {text!r} cannot be used for a column", expected)
    _FACTOR_CACHE[key] = factor
    return factor


def _check_range(col: _Column, values: np.ndarray, names: list[str], problems: _Problems
                 ) -> None:
    spec = col.spec
    assert spec is not None
    unit = "" if spec.dim in {"dimensionless", CURRENCY} else f" {DEFAULT_UNIT_NOTE[spec.dim]}"
    given = ~np.isnan(values)
    magnitude = np.abs(values)
    checks: list[tuple[np.ndarray, Callable[[float], str], str]] = [
        (given & (magnitude != 0) & ((magnitude < MIN_MAGNITUDE) | (magnitude > MAX_MAGNITUDE)),
         lambda v: f"{v:.3g}{unit} is outside the range shaftsys computes with",
         f"0 or a magnitude from {MIN_MAGNITUDE:g} to {MAX_MAGNITUDE:g}{unit}"),
    ]
    if spec.positive:
        checks.append((given & ~(values > 0), lambda v: f"must be positive, got {v:g}{unit}",
                       "a value > 0"))
    if spec.non_negative:
        checks.append((given & (values < 0), lambda v: f"must not be negative, got "
                       f"{v:g}{unit}", "a value >= 0"))
    if spec.minimum is not None:
        low = spec.minimum
        checks.append((given & (values < low), lambda v: f"{v:g}{unit} is below the "
                       f"smallest allowed {low:g}{unit}", f"a value >= {low:g}{unit}"))
    if spec.maximum is not None:
        high = spec.maximum
        checks.append((given & (values > high), lambda v: f"{v:g}{unit} is above the "
                       f"largest allowed {high:g}{unit}", f"a value <= {high:g}{unit}"))
    if spec.whole:
        checks.append((given & (values != np.round(values)),
                       lambda v: f"{v:g} is not a whole number", "a whole number"))
    for bad, message, expected in checks:
        for i in _first(bad):
            problems.add(col.lines[i], col.field_of(i), names[i] + message(float(values[i])),
                         expected)


def _first(mask: np.ndarray) -> Iterator[int]:
    """The first index where ``mask`` holds, if any."""
    hits = np.flatnonzero(mask)
    if hits.size:
        yield int(hits[0])


def _cross_checks(by_name: dict[str, _Column], values: dict[str, np.ndarray],
                  kinds: list[BearingKind | None], names: list[str], row_lines: list[int],
                  problems: _Problems) -> None:
    d, D = values["d_mm"], values["D_mm"]
    col = by_name["D"]
    for i in _first(d >= D):
        problems.add(col.lines[i], col.field_of(i), f"{names[i]}outside diameter "
                     f"{D[i]:g} mm is not larger than the bore {d[i]:g} mm", "D > d")
    if "dm" in by_name:
        dm, col = values["dm_mm"], by_name["dm"]
        for i in _first(~np.isnan(dm) & ((dm <= d) | (dm >= D))):
            problems.add(col.lines[i], col.field_of(i), f"{names[i]}pitch diameter "
                         f"{dm[i]:g} mm is not between the bore {d[i]:g} mm and the "
                         f"outside diameter {D[i]:g} mm", "d < dm < D")
    if "Cu" in by_name:
        Cu, C0, col = values["Cu_N"], values["C0_N"], by_name["Cu"]
        for i in _first(Cu >= C0):
            problems.add(col.lines[i], col.field_of(i), f"{names[i]}fatigue load limit "
                         f"{Cu[i]:g} N is not below the static rating C0 {C0[i]:g} N",
                         "Cu < C0")
    needs = np.array([k in _NEEDS_CONTACT_ANGLE for k in kinds], dtype=bool)
    alpha = values["contact_angle_deg"]
    col_alpha = by_name.get("contact_angle")
    for i in _first(needs & np.isnan(alpha)):
        kind = kinds[i]
        assert kind is not None
        if col_alpha is not None:
            line, where = col_alpha.lines[i], col_alpha.field_of(i)
        else:
            line, where = row_lines[i], "contact_angle"
        problems.add(line, where, f"{names[i]}the contact angle is missing (needed for "
                     f"{kind.value})", "a contact angle such as '25 deg'")


# ---------------------------------------------------------------------------------------
# documentation and schema


def catalogue_columns_markdown() -> str:
    """The column table of the module docstring, as Markdown (for the contributor guide)."""
    lines = ["| column | also written | unit (internal) | required | meaning and check |",
             "|---|---|---|---|---|"]
    for spec in COLUMNS:
        also = ", ".join(f"`{a}`" for a in spec.aliases)
        if spec.dim in {TEXT, KIND}:
            unit = "text"
        elif spec.dim == CURRENCY:
            unit = "currency (as named)"
        elif spec.dim == "dimensionless":
            unit = "-"
        else:
            unit = f"{spec.dim} ({DEFAULT_UNIT_NOTE[spec.dim]})"
        required = "yes" if spec.required else "no"
        lines.append(f"| `{spec.name}` | {also} | {unit} | {required} | {spec.doc} |")
    kinds = ", ".join(f"`{k.value}`" for k in BearingKind)
    lines += ["", *textwrap.wrap(
        f"Bearing types (`type`): {kinds}; written in any case, with `-` or a space for "
        "`_`. `contact_angle` is required for `angular_contact_ball` and `thrust_ball` "
        "rows.", width=88, break_on_hyphens=False)]
    return "\n".join(lines) + "\n"


_QUANTITY = {"oneOf": [{"type": "number"}, {"type": "string", "pattern": r"^\s*[-+0-9.]"}]}


def catalogue_schema() -> dict[str, Any]:
    """JSON Schema (draft 2020-12) of the YAML form of a catalogue (canonical keys)."""
    props: dict[str, Any] = {}
    for spec in COLUMNS:
        if spec.dim == TEXT:
            prop: dict[str, Any] = {"type": ["string", "integer"]}
        elif spec.dim == KIND:
            prop = {"enum": [k.value for k in BearingKind]}
        elif spec.dim == CURRENCY:
            prop = {**_QUANTITY}
        else:
            prop = {**_QUANTITY}
        unit = {TEXT: "", KIND: "", CURRENCY: " [price_unit]"}.get(
            spec.dim, f" [{DEFAULT_UNIT_NOTE.get(spec.dim, '')}]")
        prop["description"] = f"{spec.doc}{unit}"
        props[spec.name] = prop
    bearing = {
        "type": "object",
        "description": "one bearing; other keys are kept as text for reports",
        "properties": props,
        "required": [s.name for s in COLUMNS if s.required],
        "additionalProperties": {"type": ["string", "number", "boolean", "null"]},
    }
    return {
        "$schema": "https://json-schema.org/draft/2020-12/schema",
        "title": "shaftsys bearing catalogue",
        "type": "object",
        "additionalProperties": False,
        "properties": {
            "name": {"type": "string", "description": "title of the catalogue"},
            "price_unit": {"type": "string", "description": "currency of every price"},
            "bearings": {"type": "array", "minItems": 1, "items": {"$ref": "#/$defs/bearing"},
                         "description": "the bearings, one mapping each"},
        },
        "required": ["bearings"],
        "$defs": {"bearing": bearing},
    }


def catalogue_schema_text() -> str:
    """:func:`catalogue_schema` as the JSON text shipped in ``shaftsys/catalogue.schema.json``."""
    return json.dumps(catalogue_schema(), indent=2, ensure_ascii=False) + "\n"


def write_catalogue_schema(path: str | Path) -> Path:
    """Write :func:`catalogue_schema_text` to ``path`` atomically (regenerates the shipped file).

    Raises
    ------
    OutputError: the file cannot be written.
    """
    from shaftsys.io.output import atomic_write

    data = catalogue_schema_text().encode("utf-8")

    def write(fh: BinaryIO) -> None:
        fh.write(data)

    return atomic_write(path, write)
