"""Entry point of the bearing life engine: one bearing, its load spectrum, one verdict.

Choices a caller must know:

* A case enters the fatigue spectrum ("dynamic") when it is not flagged static-only,
  its |speed| >= ``settings.min_speed_rpm`` (and > 0) and its duration > 0. Other cases
  count for the static check only (their reason is recorded).
* The application factor af multiplies the equivalent dynamic load: P_design = af*P is
  used in L10, in Pm and in ec*Cu/P of aISO (P being the design load). It does not enter
  the static check (give peak loads as cases).
* Mean speed counts standstill: n_m = sum_dyn t_i*|n_i| / sum_all t_i, so lives in hours
  are calendar hours of the duty cycle.
* Verdict basis: Lnm = a1*aISO*L10 (ISO 281:2007) when lubrication is given and
  ``settings.use_modified_life``, else a1*L10. Per-case lives are combined with the
  revolution weights, 1/L = sum U_i/L_i. ``a1`` holds the reliability life factor of
  the chosen method (ISO a1 or Shigley's Weibull factor).
* ``Lnm_h`` is the spectrum life at the target reliability on the verdict basis.
* A bearing without a dynamic case has infinite life; its verdict rests on statics.
"""

from __future__ import annotations

import logging
import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from typing import Any

import numpy as np
import numpy.typing as npt

from shaftsys.bearings._util import BoolArray, FloatArray, as_float_array
from shaftsys.bearings.arrays import BearingArrays
from shaftsys.bearings.kernel import (
    LIFE_BASIS_BASIC,
    LIFE_BASIS_MODIFIED,
    DutyCycle,
    LifeArrays,
    evaluate,
    row_notes,
)
from shaftsys.bearings.life import duty_cycle_repetitions
from shaftsys.bearings.modified import required_rating as _required_rating
from shaftsys.bearings.system import system_life as _system_life
from shaftsys.model.bearing import Bearing, BearingKind, LifeSettings, Lubrication

_log = logging.getLogger(__name__)


__all__ = [
    "LIFE_BASIS_BASIC",
    "LIFE_BASIS_MODIFIED",
    "BearingLife",
    "LoadSpectrum",
    "evaluate_bearing",
    "required_rating",
    "system_life",
]


@dataclass(frozen=True)
class LoadSpectrum:
    """Loads of one bearing, one entry per case (all arrays of shape (n_cases,)).

    Attributes
    ----------
    case_ids: case names.
    Fr_N: radial load magnitude [N].
    Fa_N: axial load [N] (sign ignored by the engine).
    speed_rpm: signed speed of the bearing's rotating ring relative to the other [rpm].
    duration: time share (fraction) or hours per case; 0 for static-only cases.
    duration_in_hours: True when ``duration`` is in hours (enables duty repetitions).
    static_only: True for cases checked for statics only (peak, standstill loads).
    temperature_C: operating temperature [degC], nan where not given.
    """

    case_ids: tuple[str, ...]
    Fr_N: npt.NDArray[np.float64]
    Fa_N: npt.NDArray[np.float64]
    speed_rpm: npt.NDArray[np.float64]
    duration: npt.NDArray[np.float64]
    duration_in_hours: bool
    static_only: npt.NDArray[np.bool_]
    temperature_C: npt.NDArray[np.float64]

    def __post_init__(self) -> None:
        n = len(self.case_ids)
        for name in ("Fr_N", "Fa_N", "speed_rpm", "duration", "temperature_C"):
            arr = as_float_array(getattr(self, name), name)
            if arr.shape != (n,):
                raise ValueError(f"LoadSpectrum.{name} has shape {arr.shape}, expected ({n},)")
            object.__setattr__(self, name, arr)
        so = np.atleast_1d(np.asarray(self.static_only, dtype=bool))
        if so.shape != (n,):
            raise ValueError(f"LoadSpectrum.static_only has shape {so.shape}, expected ({n},)")
        object.__setattr__(self, "static_only", so)
        object.__setattr__(self, "case_ids", tuple(str(c) for c in self.case_ids))
        if np.any(self.duration < 0.0) or not np.all(np.isfinite(self.duration)):
            raise ValueError("LoadSpectrum.duration must be finite and >= 0")
        if not np.all(np.isfinite(self.speed_rpm)):
            raise ValueError("LoadSpectrum.speed_rpm must be finite")

    @property
    def duty(self) -> DutyCycle:
        """The cases without their loads (speeds, durations, flags, temperatures)."""
        return DutyCycle(self.case_ids, self.speed_rpm, self.duration,
                         self.duration_in_hours, self.static_only, self.temperature_C)

    @classmethod
    def build(
        cls,
        case_ids: Sequence[str],
        Fr_N: npt.ArrayLike,
        Fa_N: npt.ArrayLike,
        speed_rpm: npt.ArrayLike,
        duration: npt.ArrayLike,
        duration_in_hours: bool = False,
        static_only: npt.ArrayLike | None = None,
        temperature_C: npt.ArrayLike | None = None,
    ) -> LoadSpectrum:
        """Build a spectrum from lists (static_only defaults to False, temperature to nan).

        Units as in the attributes: N, rpm, share or h, degC.
        """
        n = len(case_ids)
        return cls(
            tuple(case_ids),
            np.asarray(Fr_N, dtype=np.float64),
            np.asarray(Fa_N, dtype=np.float64),
            np.asarray(speed_rpm, dtype=np.float64),
            np.asarray(duration, dtype=np.float64),
            duration_in_hours,
            np.zeros(n, dtype=bool) if static_only is None else np.asarray(static_only, bool),
            np.full(n, np.nan) if temperature_C is None else np.asarray(temperature_C, float),
        )


@dataclass(frozen=True)
class BearingLife:
    """Life and static verdict of one bearing (units in the attribute names).

    Per-case arrays (shape (n_cases,), nan where not applicable, e.g. static-only):
    ``P_N`` (equivalent dynamic load X*Fr + Y*Fa, without af), ``P_design_N`` (af*P),
    ``X``, ``Y``, ``e``, ``case_L10_mrev``, ``case_L10_h``, ``aISO`` (1 on the a1*L10
    basis), ``kappa`` (after the clamp at 4), ``nu_mm2_s``, ``nu1_mm2_s``, ``ec``,
    ``case_Lnm_h`` (at the target reliability, verdict basis), ``P0_N``, ``case_s0``,
    ``dynamic`` (mask of cases in the spectrum), ``weights`` (revolution weights U_i).

    Spectrum values: ``P_eq_N`` (= Pm of the design loads), ``n_m_rpm``, ``L10_mrev``,
    ``L10_h``, ``Lnm_mrev``, ``Lnm_h`` (target reliability, verdict basis), ``a1``,
    ``reliability``, ``reliability_method``, ``life_basis``, ``target_h``,
    ``C_required_N``, ``margin`` (C/C_req), ``life_ratio`` (margin^p = Lnm_h/target_h),
    ``s0``, ``s0_min``, ``s0_case``, ``cycles_of_duty``, ``warnings``, ``f0_estimated``,
    ``Cu_N``, ``Cu_estimated``, ``application_factor``, ``life_ok``, ``static_ok``, ``ok``,
    ``speed_ratio`` (largest running |n| / limiting speed, NaN without one or without a
    running case), ``min_load_ratio`` (smallest running P / (0.01 C ball, 0.02 C
    roller), NaN without a running case; common practice, no source).
    """

    bearing_id: str
    kind: str
    case_ids: tuple[str, ...]
    P_N: FloatArray
    P_design_N: FloatArray
    X: FloatArray
    Y: FloatArray
    e: FloatArray
    case_L10_mrev: FloatArray
    case_L10_h: FloatArray
    aISO: FloatArray
    kappa: FloatArray
    nu_mm2_s: FloatArray
    nu1_mm2_s: FloatArray
    ec: FloatArray
    case_Lnm_h: FloatArray
    P0_N: FloatArray
    case_s0: FloatArray
    dynamic: BoolArray
    weights: FloatArray
    static_only_cases: tuple[tuple[str, str], ...]
    P_eq_N: float
    n_m_rpm: float
    L10_mrev: float
    L10_h: float
    Lnm_mrev: float
    Lnm_h: float
    a1: float
    reliability: float
    reliability_method: str
    life_basis: str
    target_h: float
    C_required_N: float
    margin: float
    life_ratio: float
    s0: float
    s0_min: float
    s0_case: str | None
    cycles_of_duty: float | None
    warnings: tuple[str, ...]
    f0_estimated: bool
    Cu_N: float | None
    Cu_estimated: bool
    application_factor: float
    life_ok: bool
    static_ok: bool
    ok: bool
    #: per case [-]: ``Fa_over_Fr``, ``f0_Fa_over_C0`` (deep groove ball: ISO 281 Table 3's
    #: entry; NaN elsewhere), ``ec_Cu_over_P`` (the aISO argument; NaN without it),
    #: ``damage_fraction`` (share of the spectrum's Palmgren-Miner damage; NaN static)
    case_terms: Mapping[str, FloatArray] = field(default_factory=dict)
    speed_ratio: float = math.nan
    min_load_ratio: float = math.nan

    def to_dict(self) -> dict[str, Any]:
        """JSON-ready plain types; non-finite numbers (inf, nan) become ``None``."""
        cases = []
        for k, cid in enumerate(self.case_ids):
            cases.append(
                {
                    "case": cid,
                    "dynamic": bool(self.dynamic[k]),
                    "P_N": _num(self.P_N[k]),
                    "P_design_N": _num(self.P_design_N[k]),
                    "X": _num(self.X[k]),
                    "Y": _num(self.Y[k]),
                    "e": _num(self.e[k]),
                    "L10_1e6rev": _num(self.case_L10_mrev[k]),
                    "L10_h": _num(self.case_L10_h[k]),
                    "aISO": _num(self.aISO[k]),
                    "kappa": _num(self.kappa[k]),
                    "nu_mm2_s": _num(self.nu_mm2_s[k]),
                    "nu1_mm2_s": _num(self.nu1_mm2_s[k]),
                    "ec": _num(self.ec[k]),
                    "Lnm_h": _num(self.case_Lnm_h[k]),
                    "revolution_weight": _num(self.weights[k]),
                    "P0_N": _num(self.P0_N[k]),
                    "s0": _num(self.case_s0[k]),
                    **{name: _num(v[k]) for name, v in self.case_terms.items()},
                }
            )
            e = self.e[k]
            if "Fa_over_Fr" in self.case_terms and math.isfinite(e):
                # which row of the X, Y table the case took (ISO 281:2007, 6.2 / 7.2)
                cases[-1]["Fa_over_Fr_above_e"] = bool(self.case_terms["Fa_over_Fr"][k] > e)
        return {
            "bearing": self.bearing_id,
            "kind": self.kind,
            "P_eq_N": _num(self.P_eq_N),
            "n_m_rpm": _num(self.n_m_rpm),
            "L10_1e6rev": _num(self.L10_mrev),
            "L10_h": _num(self.L10_h),
            "Lnm_1e6rev": _num(self.Lnm_mrev),
            "Lnm_h": _num(self.Lnm_h),
            "a1": _num(self.a1),
            "reliability": _num(self.reliability),
            "reliability_method": self.reliability_method,
            "life_basis": self.life_basis,
            "target_h": _num(self.target_h),
            "C_required_N": _num(self.C_required_N),
            "margin": _num(self.margin),
            "life_ratio": _num(self.life_ratio),
            "s0": _num(self.s0),
            "s0_min": _num(self.s0_min),
            "s0_case": self.s0_case,
            "cycles_of_duty": None if self.cycles_of_duty is None else _num(self.cycles_of_duty),
            "application_factor": _num(self.application_factor),
            "f0_estimated": self.f0_estimated,
            "Cu_N": None if self.Cu_N is None else _num(self.Cu_N),
            "Cu_estimated": self.Cu_estimated,
            "life_ok": self.life_ok,
            "static_ok": self.static_ok,
            "ok": self.ok,
            "speed_ratio": _num(self.speed_ratio),
            "min_load_ratio": _num(self.min_load_ratio),
            "static_only_cases": [{"case": c, "reason": r} for c, r in self.static_only_cases],
            "warnings": list(self.warnings),
            "cases": cases,
        }


def _num(x: float | np.floating[Any]) -> float | None:
    v = float(x)
    return v if math.isfinite(v) else None


def required_rating(
    P_N: npt.ArrayLike,
    weights: npt.ArrayLike,
    life_exponent: float,
    target_life_mrev: float,
    life_factors: npt.ArrayLike | None = None,
) -> float:
    """Return the required dynamic rating [N] (see ``modified.required_rating``).

    Parameters
    ----------
    P_N:
        Design equivalent load per case [N].
    weights:
        Revolution weights [-].
    life_exponent:
        p [-].
    target_life_mrev:
        Target life [10^6 rev].
    life_factors:
        a1*aISO_i per case [-] (``None`` = 1).

    Returns
    -------
    float
        C_req [N].
    """
    return _required_rating(P_N, weights, life_exponent, target_life_mrev, life_factors)


def system_life(
    lives: npt.ArrayLike,
    kinds: Sequence[BearingKind | str],
    reliability: float = 0.9,
    basis: str = "basic",
) -> tuple[float, int | None]:
    """System life [unit of ``lives``] and index of the limiting bearing.

    Parameters
    ----------
    lives:
        90 %-reliability lives of the bearings [h] (inf = never fails).
    kinds:
        Bearing kinds (their Weibull slopes 10/9 ball, 9/8 roller are used).
    reliability:
        System reliability [-].
    basis:
        ``"basic"`` or ``"modified"``: which lives are passed.
    """
    slopes = [BearingKind(k).weibull_slope for k in kinds]
    return _system_life(lives, slopes, reliability, basis)


def _dedupe(items: Sequence[str]) -> tuple[str, ...]:
    return tuple(dict.fromkeys(items))


def evaluate_bearing(
    bearing: Bearing,
    spectrum: LoadSpectrum,
    settings: LifeSettings,
    lubrication: Lubrication | None,
) -> BearingLife:
    """Rating life, modified life, required rating and static safety of one bearing.

    Parameters
    ----------
    bearing:
        The support (ratings in N, diameters in mm).
    spectrum:
        Its loads per case (N, rpm, share or h, degC).
    settings:
        Model-wide life settings (target life h, reliability, method, af, ...).
    lubrication:
        Lubricant data for the modified life, or ``None`` (a1*L10 basis).

    Returns
    -------
    BearingLife

    Raises
    ------
    ModelError
        Wrong input: loads a type cannot take, missing maker's factors, reliability out
        of the method's range, kappa below 0.1, missing temperature for the modified life.
    """
    sp = spectrum
    ids = sp.case_ids
    params = BearingArrays.from_bearings([bearing])
    la = evaluate(params, sp.Fr_N[None, :], sp.Fa_N[None, :], sp.duty, settings, lubrication)
    exc = la.errors[0]
    if exc is not None:
        raise exc
    notes = row_notes(params, la, 0, sp.speed_rpm)

    def num(arr: FloatArray) -> float:
        return float(arr[0])

    cu = num(la.Cu_N)
    k0 = int(la.s0_case[0])
    cycles: float | None = None
    if sp.duration_in_hours:
        cycles = duty_cycle_repetitions(num(la.Lnm_h), sp.duration)
    life_ok = bool(la.life_ok[0])
    static_ok = bool(la.static_ok[0])
    return BearingLife(
        bearing_id=bearing.id,
        kind=bearing.kind.value,
        case_ids=ids,
        P_N=la.P_N[0],
        P_design_N=la.P_design_N[0],
        X=la.X[0],
        Y=la.Y[0],
        e=la.e[0],
        case_L10_mrev=la.case_L10_mrev[0],
        case_L10_h=la.case_L10_h[0],
        aISO=la.aISO[0],
        kappa=la.kappa[0],
        nu_mm2_s=la.nu_mm2_s[0],
        nu1_mm2_s=la.nu1_mm2_s[0],
        ec=la.ec[0],
        case_Lnm_h=la.case_Lnm_h[0],
        P0_N=la.P0_N[0],
        case_s0=la.case_s0[0],
        dynamic=la.dynamic,
        weights=la.weights,
        static_only_cases=la.static_only_cases,
        P_eq_N=num(la.P_eq_N),
        n_m_rpm=la.n_m_rpm,
        L10_mrev=num(la.L10_mrev),
        L10_h=num(la.L10_h),
        Lnm_mrev=num(la.Lnm_mrev),
        Lnm_h=num(la.Lnm_h),
        a1=num(la.a1),
        reliability=num(la.reliability),
        reliability_method=settings.reliability_method,
        life_basis=la.life_basis,
        target_h=num(la.target_h),
        C_required_N=num(la.C_required_N),
        margin=num(la.margin),
        life_ratio=num(la.life_ratio),
        s0=num(la.s0),
        s0_min=num(la.s0_min),
        s0_case=None if k0 < 0 else ids[k0],
        cycles_of_duty=cycles,
        warnings=_dedupe(notes),
        f0_estimated=bool(la.f0_estimated[0]),
        Cu_N=None if math.isnan(cu) else cu,
        Cu_estimated=bool(la.Cu_estimated[0]),
        application_factor=la.application_factor,
        life_ok=life_ok,
        static_ok=static_ok,
        ok=life_ok and static_ok,
        case_terms=_case_terms(bearing, sp, la),
        speed_ratio=num(np.broadcast_to(la.speed_ratio, (1,))),
        min_load_ratio=num(np.broadcast_to(la.min_load_ratio, (1,))),
    )


def _case_terms(bearing: Bearing, sp: LoadSpectrum, la: LifeArrays) -> dict[str, FloatArray]:
    """The per-case quantities the calculation sheet states beside P and L (see
    ``BearingLife.case_terms``); row 0 of ``la``.
    """
    Fr, Fa = np.asarray(sp.Fr_N, float), np.abs(np.asarray(sp.Fa_N, float))
    with np.errstate(divide="ignore", invalid="ignore"):
        fa_fr = np.where(Fr > 0.0, Fa / np.where(Fr > 0.0, Fr, 1.0), np.where(Fa > 0, np.inf,
                                                                            0.0))
        rel = (float(la.f0[0]) * Fa / bearing.C0_N
               if bearing.kind is BearingKind.DEEP_GROOVE_BALL and bearing.C0_N
               else np.full(Fr.shape, np.nan))
        cu = float(la.Cu_N[0])
        ec_cu_p = la.ec[0] * cu / la.P_design_N[0] if math.isfinite(cu) else \
            np.full(Fr.shape, np.nan)
        # Palmgren-Miner over revolutions: damage_i ~ U_i / (aISO_i * L10_i), a1 common
        life = la.case_L10_mrev[0] * np.where(np.isfinite(la.aISO[0]), la.aISO[0], 1.0)
        d = np.where(la.dynamic & (la.weights > 0), la.weights / life, 0.0)
        total = float(np.sum(d[np.isfinite(d)]))
        frac = np.where(la.dynamic, d / total if total > 0 else np.nan, np.nan)
    return {"Fa_over_Fr": fa_fr, "f0_Fa_over_C0": rel, "ec_Cu_over_P": ec_cu_p,
            "damage_fraction": frac}
