"""A user's bearing catalogue as frozen column arrays (internal units of :mod:`shaftsys.units`).

One numpy array per numeric column, one entry per catalogue row, ``NaN`` where the
catalogue gives no value. The arrays are what a vectorised selection works on (masks
over rows); :meth:`Catalogue.to_bearing` turns one row into the model's frozen
:class:`~shaftsys.model.Bearing` for a support.

Reading and checking a catalogue file is the job of :mod:`shaftsys.io.catalogue`; this
module only holds the values (numpy and :mod:`shaftsys.model`, nothing else).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any

import numpy as np
import numpy.typing as npt

from shaftsys.model.bearing import AxialRole, Bearing, BearingKind, SetArrangement
from shaftsys.model.interior import Interior
from shaftsys.model.interior_rules import INTERIOR_KINDS, estimate_interior, interior_problems

FloatArray = npt.NDArray[np.float64]

#: Every bearing type, in the order of the integer codes of :attr:`Catalogue.kind_code`.
KINDS: tuple[BearingKind, ...] = tuple(BearingKind)
#: Integer code of each bearing type in :attr:`Catalogue.kind_code`.
KIND_CODE: dict[BearingKind, int] = {kind: code for code, kind in enumerate(KINDS)}

#: Numeric columns of a :class:`Catalogue` (attribute names; the suffix is the unit).
NUMERIC_FIELDS: tuple[str, ...] = (
    "d_mm", "D_mm", "B_mm", "C_N", "C0_N", "Cu_N", "limiting_speed_rpm",
    "reference_speed_rpm", "mass_kg", "dm_mm", "contact_angle_deg", "e", "Y", "Y0", "Y1",
    "Y2", "X", "f0", "Dw_mm", "Z", "Lwe_mm", "price",
)

#: Arrangements whose ``rows`` are separate, identical bearings mounted side by side.
_MATCHED_SETS = frozenset({SetArrangement.BACK_TO_BACK, SetArrangement.FACE_TO_FACE,
                           SetArrangement.TANDEM})


def _empty() -> FloatArray:
    return np.zeros(0)


@dataclass(frozen=True, eq=False)
class Catalogue:
    """Bearings of a user's catalogue, one array entry per row.

    Every numeric array has one float per row in internal units, ``NaN`` = not given.
    The arrays are made read-only when the catalogue is built.

    Attributes
    ----------
    designation: the catalogue's name of each row (unique).
    kind: bearing type of each row.
    kind_code: ``int8`` code of each row's type (index into :data:`KINDS`, see
        :data:`KIND_CODE` and :meth:`of_kind`) for vectorised masks.
    line: 1-based line of each row in its file (comment lines counted).
    source: path of the catalogue file (``""`` for one built in Python).
    d_mm, D_mm, B_mm: bore, outside diameter, width [mm] (always given).
    C_N, C0_N: basic dynamic and static load ratings of one bearing [N] (always given).
    Cu_N: fatigue load limit [N].
    limiting_speed_rpm, reference_speed_rpm: the catalogue's limiting and thermal
        reference speeds [rpm].
    mass_kg: mass [kg].
    dm_mm: pitch (mean) diameter of the rolling element set [mm].
    contact_angle_deg: nominal contact angle alpha [deg].
    e, Y, Y0, Y1, Y2, X: the catalogue's load factors [-].
    f0: ISO 281 geometry factor of a radial ball bearing [-].
    Dw_mm: rolling element diameter [mm]; Z: rolling elements per row [-];
    Lwe_mm: effective roller length [mm] (the ISO 281 rating inputs).
    price: price per bearing in :attr:`price_unit`.
    price_unit: currency of :attr:`price` as the file names it (``""`` when unnamed).
    extra: other columns of the file, by their name as written, kept as text (``""``
        where empty), for reports.
    """

    designation: tuple[str, ...]
    kind: tuple[BearingKind, ...]
    kind_code: npt.NDArray[np.int8]
    line: tuple[int, ...]
    d_mm: FloatArray
    D_mm: FloatArray
    B_mm: FloatArray
    C_N: FloatArray
    C0_N: FloatArray
    Cu_N: FloatArray = field(default_factory=_empty)
    limiting_speed_rpm: FloatArray = field(default_factory=_empty)
    reference_speed_rpm: FloatArray = field(default_factory=_empty)
    mass_kg: FloatArray = field(default_factory=_empty)
    dm_mm: FloatArray = field(default_factory=_empty)
    contact_angle_deg: FloatArray = field(default_factory=_empty)
    e: FloatArray = field(default_factory=_empty)
    Y: FloatArray = field(default_factory=_empty)
    Y0: FloatArray = field(default_factory=_empty)
    Y1: FloatArray = field(default_factory=_empty)
    Y2: FloatArray = field(default_factory=_empty)
    X: FloatArray = field(default_factory=_empty)
    f0: FloatArray = field(default_factory=_empty)
    Dw_mm: FloatArray = field(default_factory=_empty)
    Z: FloatArray = field(default_factory=_empty)
    Lwe_mm: FloatArray = field(default_factory=_empty)
    price: FloatArray = field(default_factory=_empty)
    price_unit: str = ""
    source: str = ""
    extra: dict[str, tuple[str, ...]] = field(default_factory=dict)

    def __post_init__(self) -> None:
        """Check that every column has one entry per row; freeze the arrays.

        An optional column left at its default (empty) becomes all ``NaN``.
        """
        n = len(self.designation)
        if len(self.kind) != n or len(self.line) != n:
            raise ValueError("designation, kind and line need one entry per row")
        codes = np.asarray(self.kind_code, dtype=np.int8)
        if codes.shape != (n,) or not np.array_equal(codes, [KIND_CODE[k] for k in self.kind]):
            raise ValueError("kind_code must hold KIND_CODE of each row's kind")
        codes.setflags(write=False)
        object.__setattr__(self, "kind_code", codes)
        for name in NUMERIC_FIELDS:
            values = np.asarray(getattr(self, name), dtype=np.float64)
            if values.shape == (0,) and n:
                values = np.full(n, np.nan)
            if values.shape != (n,):
                raise ValueError(f"{name} has shape {values.shape}, expected ({n},)")
            values.setflags(write=False)
            object.__setattr__(self, name, values)
        for name, texts in self.extra.items():
            if len(texts) != n:
                raise ValueError(f"extra column {name!r} needs one entry per row")

    def __len__(self) -> int:
        """Number of rows."""
        return len(self.designation)

    def of_kind(self, *kinds: BearingKind | str) -> npt.NDArray[np.bool_]:
        """Mask of the rows whose type is one of ``kinds``."""
        codes = [KIND_CODE[BearingKind(k)] for k in kinds]
        return np.isin(self.kind_code, codes)

    def subset(self, mask_or_index: npt.ArrayLike | slice) -> Catalogue:
        """The catalogue of the selected rows, in the order selected.

        Parameters
        ----------
        mask_or_index: a boolean mask of ``len(self)`` entries, an array or sequence of
            row indices (numpy semantics: negative indices count from the end), or a slice.

        Raises
        ------
        IndexError: a mask of the wrong length or an index out of range.
        """
        n = len(self)
        if isinstance(mask_or_index, slice):
            index = np.arange(n)[mask_or_index]
        else:
            selection = np.asarray(mask_or_index)
            if selection.dtype == np.bool_:
                if selection.shape != (n,):
                    raise IndexError(f"a mask of {selection.shape} for {n} rows")
                index = np.flatnonzero(selection)
            elif selection.size == 0:
                index = np.zeros(0, dtype=np.intp)
            elif np.issubdtype(selection.dtype, np.integer):
                index = np.arange(n)[selection.reshape(-1)]  # IndexError when out of range
            else:
                raise IndexError(f"cannot select rows with {selection.dtype} values")
        rows = [int(i) for i in index]
        values: dict[str, Any] = {name: getattr(self, name)[index] for name in NUMERIC_FIELDS}
        return Catalogue(
            designation=tuple(self.designation[i] for i in rows),
            kind=tuple(self.kind[i] for i in rows),
            kind_code=self.kind_code[index],
            line=tuple(self.line[i] for i in rows),
            price_unit=self.price_unit,
            source=self.source,
            extra={k: tuple(v[i] for i in rows) for k, v in self.extra.items()},
            **values,
        )

    def row(self, i: int) -> dict[str, Any]:
        """Row ``i`` as a dictionary for reports.

        Keys carry their unit (``d_mm``, ``C_N``, ``price_EUR``; ``price`` when the
        currency is unnamed); values not given are ``None``. The row's line in its file
        is ``line``, its type ``type``; extra columns follow under their own names.
        """
        i = range(len(self))[i]  # IndexError for a row that does not exist
        out: dict[str, Any] = {"designation": self.designation[i],
                               "type": self.kind[i].value, "line": self.line[i]}
        for name in NUMERIC_FIELDS:
            key = f"price_{self.price_unit}" if name == "price" and self.price_unit else name
            out[key] = _given(float(getattr(self, name)[i]))
        for name, texts in self.extra.items():
            out.setdefault(name, texts[i])
        return out

    def to_bearing(
        self,
        i: int,
        *,
        id: str,
        x_mm: float,
        axial: AxialRole | str,
        pair: str | None = None,
        rows: int = 1,
        arrangement: SetArrangement | str = SetArrangement.SINGLE,
        target_life_h: float | None = None,
        target_reliability: float | None = None,
        s0_min: float | None = None,
        ec: float | None = None,
        line: int | None = None,
        pressure_centre_offset_mm: float | None = None,
        radial_stiffness_N_mm: float | None = None,
        tilt_stiffness_Nmm_rad: float | None = None,
        ribs: bool = False,
        within: str | None = None,
        within_x_mm: float | None = None,
    ) -> Bearing:
        """The model's :class:`~shaftsys.model.Bearing` of catalogue row ``i`` at a support.

        Values the catalogue does not give (``Cu``, ``e``, ``Y``, ``f0``...) stay ``None``,
        exactly as for a bearing typed into a model file, so the life engine estimates
        and flags them; nothing is estimated here.

        Ratings: a catalogue row rates one bearing. For a matched set of ``rows`` = i
        identical bearings side by side (``back_to_back``, ``face_to_face``, ``tandem``)
        the set's ratings follow the rule of ISO 281:2007 and ISO 76:2006 for identical
        bearings working as one unit (the model loader's ``ratings: per_row``):
        C = i^0.7 C (ball) or i^(7/9) C (roller), C0 = i C0; and Cu = i Cu (common
        practice: Cu, like C0, is a load the i bearings share equally). A
        ``single`` or ``double_row`` entry is one bearing: its ratings are taken as given
        and ``rows`` is only its number of rows.

        Parameters
        ----------
        i: row index.
        id: bearing id in the model.
        x_mm: station of the bearing's mid-width on its shaft [mm].
        axial: which shaft thrust the support takes (``AxialRole`` or its value).
        pair: id of the adjusted partner bearing, or ``None``.
        rows: rows of the bearing, or bearings in a matched set (i of ISO 281), >= 1.
        arrangement: set arrangement (``SetArrangement`` or its value).
        target_life_h: target life [h] (``None`` = model default).
        target_reliability: target reliability [-] (``None`` = model default).
        s0_min: required static safety [-] (``None`` = default for the type).
        ec: contamination factor [-] (``None`` = model lubrication).
        line: line of the support in the model file (messages), not the catalogue line.
        pressure_centre_offset_mm: mid-width to pressure centre [mm] (``None`` = 0).
        radial_stiffness_N_mm: radial stiffness [N/mm] (``None`` = rigid).
        tilt_stiffness_Nmm_rad: tilting stiffness [N*mm/rad] (``None`` = free).
        ribs: cylindrical roller bearing with ribs on both rings.
        within: shaft holding the outer ring (``None`` = housing).
        within_x_mm: station on the ``within`` shaft [mm].

        Raises
        ------
        IndexError: no row ``i``. ValueError: ``rows`` < 1 or an unknown role/arrangement.
        """
        i = range(len(self))[i]
        if rows < 1:
            raise ValueError(f"rows must be at least 1, got {rows}")
        kind = self.kind[i]
        arrangement = SetArrangement(arrangement)
        C, C0, Cu = float(self.C_N[i]), float(self.C0_N[i]), _given(float(self.Cu_N[i]))
        if arrangement in _MATCHED_SETS and rows > 1:
            C *= rows ** (7.0 / 9.0 if kind.is_roller else 0.7)
            C0 *= rows
            Cu = None if Cu is None else Cu * rows

        def opt(name: str) -> float | None:
            return _given(float(getattr(self, name)[i]))

        interior = _catalogue_interior(kind, float(self.d_mm[i]), float(self.D_mm[i]),
                                       opt("B_mm"), opt("contact_angle_deg"), opt("e"),
                                       opt("Dw_mm"), opt("Z"), opt("dm_mm"), opt("Lwe_mm"))

        return Bearing(
            id=id, kind=kind, x_mm=float(x_mm), d_mm=float(self.d_mm[i]),
            D_mm=float(self.D_mm[i]), B_mm=opt("B_mm"), C_N=C, C0_N=C0, Cu_N=Cu,
            limiting_speed_rpm=opt("limiting_speed_rpm"), e=opt("e"), Y=opt("Y"),
            Y0=opt("Y0"), Y1=opt("Y1"), Y2=opt("Y2"), X=opt("X"),
            contact_angle_deg=opt("contact_angle_deg"), f0=opt("f0"), rows=int(rows),
            arrangement=arrangement, axial=AxialRole(axial), pair=pair,
            pressure_centre_offset_mm=(0.0 if pressure_centre_offset_mm is None
                                       else float(pressure_centre_offset_mm)),
            radial_stiffness_N_mm=radial_stiffness_N_mm,
            tilt_stiffness_Nmm_rad=tilt_stiffness_Nmm_rad, ribs=ribs,
            target_life_h=target_life_h, target_reliability=target_reliability,
            s0_min=s0_min, ec=ec, line=line, within=within, within_x_mm=within_x_mm,
            interior=interior,
        )


def _catalogue_interior(kind: BearingKind, d: float, D: float, B: float | None,
                        alpha: float | None, e: float | None, Dw: float | None,
                        Z: float | None, dm: float | None, Lwe: float | None
                        ) -> Interior | None:
    """The internal geometry a catalogue row gives (Dw and Z at least; the rest
    estimated and flagged), or ``None`` when it gives none or an impossible one (the
    load distribution then estimates all of it, as for a typed bearing).
    """
    if Dw is None or Z is None or kind not in INTERIOR_KINDS or int(Z) != Z:
        return None
    interior = estimate_interior(kind, d, D, B, alpha, e, Dw_mm=Dw, Z=int(Z), dm_mm=dm,
                                 Lwe_mm=Lwe if kind.is_roller else None,
                                 source="catalogue")
    return None if interior_problems(kind, d, D, B, interior) else interior


def _given(value: float) -> float | None:
    return None if math.isnan(value) else value
