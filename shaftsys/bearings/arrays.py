"""Bearing parameters as arrays, one entry per row (a bearing, a variant, a catalogue row).

The vectorised life chain (:mod:`shaftsys.bearings.kernel`) and the array cores of the
equivalent-load modules take a :class:`BearingArrays`. Units as :mod:`shaftsys.units`:
N, mm, deg, rpm, h. A factor that is not given is NaN (the Bearing's ``None``).

User mistakes found per row are collected by :class:`RowErrors` (the first error of a
row wins, in the order the single-bearing engine raises them), so that one bad row does
not stop the others.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np
import numpy.typing as npt

from shaftsys.errors import ModelError
from shaftsys.model.bearing import Bearing, BearingKind, SetArrangement
from shaftsys.model.catalogue import KINDS as CATALOGUE_KINDS
from shaftsys.model.catalogue import Catalogue

FloatArray = npt.NDArray[np.float64]
BoolArray = npt.NDArray[np.bool_]
IntArray = npt.NDArray[np.intp]

#: Kind codes: ``BearingArrays.kind[i]`` indexes this tuple.
KINDS: tuple[BearingKind, ...] = tuple(BearingKind)
#: Arrangement codes: ``BearingArrays.arrangement[i]`` indexes this tuple.
ARRANGEMENTS: tuple[SetArrangement, ...] = tuple(SetArrangement)
#: Lookup tables code -> flag (indexing is much cheaper than np.isin for small tables).
_DOUBLE_LUT = np.array([a in (SetArrangement.BACK_TO_BACK, SetArrangement.FACE_TO_FACE,
                              SetArrangement.DOUBLE_ROW) for a in ARRANGEMENTS], dtype=bool)
_ROLLER_LUT = np.array([k.is_roller for k in KINDS], dtype=bool)
#: Arrangements of separate identical bearings side by side (set ratings from one row's).
_MATCHED = frozenset({SetArrangement.BACK_TO_BACK, SetArrangement.FACE_TO_FACE,
                      SetArrangement.TANDEM})

_FLOAT_FIELDS = (
    "C_N", "C0_N", "d_mm", "D_mm", "B_mm", "Cu_N", "limiting_speed_rpm", "e", "Y", "Y0",
    "Y1", "Y2", "X", "contact_angle_deg", "f0", "target_life_h", "target_reliability",
    "s0_min", "ec",
)  # fmt: skip


def _opt(value: float | None) -> float:
    return np.nan if value is None else float(value)


@dataclass(frozen=True, eq=False)
class BearingArrays:
    """Per-row bearing parameters (shape (N,) each; NaN = not given).

    Attributes
    ----------
    ids: row names (bearing ids, catalogue designations) used in messages.
    kind: kind code per row, an index into :data:`KINDS`.
    C_N, C0_N: basic dynamic and static load ratings [N].
    d_mm, D_mm, B_mm: bore, outside diameter, width [mm].
    Cu_N: fatigue load limit [N] (NaN = estimate when needed).
    limiting_speed_rpm: limiting speed [rpm] (NaN = none).
    e, Y, Y0, Y1, Y2, X: maker's factors [-] (NaN = standard value / derive).
    contact_angle_deg: nominal contact angle [deg] (NaN = none).
    f0: ISO 76 geometry factor [-] (NaN = estimate).
    rows: number of rows i [-].
    arrangement: arrangement code per row, an index into :data:`ARRANGEMENTS`.
    ribs: cylindrical roller bearing with ribs on both rings.
    target_life_h, target_reliability, s0_min, ec: per-row overrides of the model
        settings [h], [-], [-], [-] (NaN = model value).
    lines: model-file line per row (for messages) or ``None``.
    """

    ids: tuple[str, ...]
    kind: IntArray
    C_N: FloatArray
    C0_N: FloatArray
    d_mm: FloatArray
    D_mm: FloatArray
    B_mm: FloatArray
    Cu_N: FloatArray
    limiting_speed_rpm: FloatArray
    e: FloatArray
    Y: FloatArray
    Y0: FloatArray
    Y1: FloatArray
    Y2: FloatArray
    X: FloatArray
    contact_angle_deg: FloatArray
    f0: FloatArray
    rows: IntArray
    arrangement: IntArray
    ribs: BoolArray
    target_life_h: FloatArray
    target_reliability: FloatArray
    s0_min: FloatArray
    ec: FloatArray
    lines: tuple[int | None, ...]

    def __post_init__(self) -> None:
        n = len(self.ids)
        for name in _FLOAT_FIELDS:
            arr = np.asarray(getattr(self, name), dtype=np.float64)
            if arr.shape != (n,):
                raise ValueError(f"BearingArrays.{name} has shape {arr.shape}, expected ({n},)")
            object.__setattr__(self, name, arr)
        for name, dtype in (("kind", np.intp), ("rows", np.intp), ("arrangement", np.intp),
                            ("ribs", np.bool_)):
            arr = np.asarray(getattr(self, name), dtype=dtype)
            if arr.shape != (n,):
                raise ValueError(f"BearingArrays.{name} has shape {arr.shape}, expected ({n},)")
            object.__setattr__(self, name, arr)
        if len(self.lines) != n:
            raise ValueError(f"BearingArrays.lines has {len(self.lines)} entries, expected {n}")
        if n and not (int(self.kind.min()) >= 0 and int(self.kind.max()) < len(KINDS)):
            raise ValueError("BearingArrays.kind holds an unknown kind code")

    @classmethod
    def from_bearings(cls, bearings: Sequence[Bearing]) -> BearingArrays:
        """Stack the parameters of ``bearings`` (units as :class:`Bearing`)."""
        values: dict[str, object] = {
            name: np.array([_opt(getattr(b, name)) for b in bearings], dtype=np.float64)
            for name in _FLOAT_FIELDS
        }
        return cls(
            ids=tuple(b.id for b in bearings),
            kind=np.array([KINDS.index(BearingKind(b.kind)) for b in bearings], dtype=np.intp),
            rows=np.array([max(int(b.rows), 1) for b in bearings], dtype=np.intp),
            arrangement=np.array([ARRANGEMENTS.index(SetArrangement(b.arrangement))
                                  for b in bearings], dtype=np.intp),
            ribs=np.array([bool(b.ribs) for b in bearings], dtype=bool),
            lines=tuple(b.line for b in bearings),
            **values,  # type: ignore[arg-type]
        )

    @classmethod
    def from_catalogue(cls, catalogue: Catalogue, index: npt.ArrayLike, *,
                       rows: int = 1,
                       arrangement: SetArrangement = SetArrangement.SINGLE,
                       target_life_h: float | None = None,
                       target_reliability: float | None = None,
                       s0_min: float | None = None, ec: float | None = None,
                       ribs: bool = False, line: int | None = None) -> BearingArrays:
        """Catalogue rows ``index`` as they would sit at one support (no loop per row).

        The support's own settings (rows and arrangement of a matched set, targets,
        s0_min, ec) apply to every row. A catalogue row rates one bearing; a matched
        set of ``rows`` = i bearings side by side gets the set's ratings exactly as
        :meth:`~shaftsys.model.catalogue.Catalogue.to_bearing` gives them (ISO 281:2007
        and ISO 76:2006 for identical bearings as one unit): C = i^0.7 C (ball) or
        i^(7/9) C (roller), C0 = i C0, Cu = i Cu.
        """
        idx = np.asarray(index, dtype=np.intp).ravel()
        n = idx.size
        kinds = np.asarray(catalogue.kind_code, dtype=np.intp)[idx]
        code_of = np.array([KINDS.index(k) for k in CATALOGUE_KINDS], dtype=np.intp)
        kind = code_of[kinds]
        roller = _ROLLER_LUT[kind]
        factor_C = np.ones(n)
        factor_0 = 1.0
        if arrangement in _MATCHED and rows > 1:
            factor_C = np.where(roller, rows ** (7.0 / 9.0), rows ** 0.7)
            factor_0 = float(rows)

        def col(name: str) -> FloatArray:
            return np.asarray(getattr(catalogue, name), dtype=np.float64)[idx]

        def same(value: float | None) -> FloatArray:
            return np.full(n, _opt(value))

        return cls(
            ids=tuple(catalogue.designation[int(i)] for i in idx), kind=kind,
            C_N=col("C_N") * factor_C, C0_N=col("C0_N") * factor_0, d_mm=col("d_mm"),
            D_mm=col("D_mm"), B_mm=col("B_mm"), Cu_N=col("Cu_N") * factor_0,
            limiting_speed_rpm=col("limiting_speed_rpm"), e=col("e"), Y=col("Y"),
            Y0=col("Y0"), Y1=col("Y1"), Y2=col("Y2"), X=col("X"),
            contact_angle_deg=col("contact_angle_deg"), f0=col("f0"),
            rows=np.full(n, max(int(rows), 1)),
            arrangement=np.full(n, ARRANGEMENTS.index(SetArrangement(arrangement))),
            ribs=np.full(n, bool(ribs)), target_life_h=same(target_life_h),
            target_reliability=same(target_reliability), s0_min=same(s0_min), ec=same(ec),
            lines=(line,) * n,
        )

    def __len__(self) -> int:
        return len(self.ids)

    def take(self, index: npt.ArrayLike) -> BearingArrays:
        """Rows ``index`` (integer positions, repeats allowed) as a new table."""
        idx = np.asarray(index, dtype=np.intp).ravel()
        changes: dict[str, object] = {}
        for f in dataclasses.fields(self):
            value = getattr(self, f.name)
            if isinstance(value, tuple):
                changes[f.name] = tuple(map(value.__getitem__, idx.tolist()))
            else:
                changes[f.name] = value[idx]
        return dataclasses.replace(self, **changes)  # type: ignore[arg-type]

    def is_kind(self, *kinds: BearingKind) -> BoolArray:
        """Mask of the rows whose kind is one of ``kinds``."""
        lut = np.zeros(len(KINDS), dtype=bool)
        lut[[KINDS.index(k) for k in kinds]] = True
        return lut[self.kind]

    @property
    def roller(self) -> BoolArray:
        """Mask of line-contact (roller) rows: life exponent 10/3."""
        return _ROLLER_LUT[self.kind]

    @property
    def double(self) -> BoolArray:
        """Mask of double-row units and pairs back-to-back / face-to-face."""
        return _DOUBLE_LUT[self.arrangement]

    @property
    def life_exponent(self) -> FloatArray:
        """Load-life exponent p [-]: 3 ball, 10/3 roller."""
        return np.where(self.roller, 10.0 / 3.0, 3.0)

    @property
    def mean_diameter_mm(self) -> FloatArray:
        """Mean diameter dm = (d + D)/2 [mm]."""
        return 0.5 * (self.d_mm + self.D_mm)

    def kind_value(self, i: int) -> str:
        """Kind name of row ``i`` as a model file writes it."""
        return KINDS[int(self.kind[i])].value

    def given(self, i: int, name: str) -> float | None:
        """Value of float attribute ``name`` of row ``i``, ``None`` where not given (NaN)."""
        v = float(getattr(self, name)[i])
        return None if np.isnan(v) else v

    def field(self, i: int, name: str) -> str:
        """Dotted field path of attribute ``name`` of row ``i`` for messages."""
        return f"bearings[{self.ids[i]}].{name}"


class RowErrorTuple(tuple):  # type: ignore[type-arg]
    """The frozen errors of :class:`RowErrors` (a tuple) with the mask of failed rows.

    ``failed`` saves the per-row Python scans when a later stage merges these errors or
    asks which rows failed: a batch of thousands of rows with no error costs nothing.
    """

    failed: BoolArray


class RowErrors:
    """First user error per row (``None`` = row fine so far)."""

    def __init__(self, n: int, start: Sequence[ModelError | None] | None = None) -> None:
        self.items: list[ModelError | None] = [None] * n
        self._failed = np.zeros(n, dtype=bool)
        if start is not None:
            self.merge(start)

    def add(self, mask: npt.ArrayLike, make: Callable[[int], ModelError]) -> None:
        """Record ``make(i)`` for every row ``i`` of ``mask`` that has no error yet."""
        for i in np.flatnonzero(np.asarray(mask, dtype=bool) & ~self._failed):
            self.put(int(i), make(int(i)))

    def put(self, i: int, exc: ModelError) -> None:
        """Record ``exc`` for row ``i`` unless it already has an error."""
        if self.items[i] is None:
            self.items[i] = exc
            self._failed[i] = True

    def merge(self, other: Sequence[ModelError | None]) -> None:
        """Take the errors of a later stage where a row has none yet."""
        mask = getattr(other, "failed", None)
        rows = (np.flatnonzero(mask).tolist() if mask is not None
                else [i for i, exc in enumerate(other) if exc is not None])
        for i in rows:
            exc = other[i]
            if exc is not None:
                self.put(i, exc)

    @property
    def failed(self) -> BoolArray:
        """Mask of rows with an error."""
        return self._failed.copy()

    def freeze(self) -> RowErrorTuple:
        """The errors as an immutable tuple (with its ``failed`` mask)."""
        out = RowErrorTuple(self.items)
        out.failed = self._failed.copy()
        return out


__all__ = ["ARRANGEMENTS", "KINDS", "BearingArrays", "RowErrorTuple", "RowErrors"]
