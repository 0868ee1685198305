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
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np
import numpy.typing as npt

from shaftsys.bearings._util import BoolArray, FloatArray, as_float_array, case_name
from shaftsys.bearings.equivalent import equivalent_dynamic_load
from shaftsys.bearings.life import basic_rating_life, duty_cycle_repetitions, life_hours
from shaftsys.bearings.life import spectrum_life as _spectrum_life
from shaftsys.bearings.lubrication import (
    KAPPA_MAX,
    KAPPA_MIN,
    a_iso_with_ep,
    contamination_constants,
    contamination_factor,
    estimate_fatigue_load_limit,
    reference_viscosity,
    viscosity_at,
)
from shaftsys.bearings.modified import combine_lives, modified_life_per_case
from shaftsys.bearings.modified import required_rating as _required_rating
from shaftsys.bearings.reliability import life_factor
from shaftsys.bearings.static import operating_warnings, static_check
from shaftsys.bearings.system import system_life as _system_life
from shaftsys.errors import ModelError
from shaftsys.model.bearing import Bearing, BearingKind, LifeSettings, Lubrication
from shaftsys.units import MEGA_REVOLUTIONS

_log = logging.getLogger(__name__)

LIFE_BASIS_MODIFIED = "Lnm = a1*aISO*L10 (ISO 281:2007)"
LIFE_BASIS_BASIC = "a1*L10"

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
    ``Cu_N``, ``Cu_estimated``, ``application_factor``, ``life_ok``, ``static_ok``, ``ok``.
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
                }
            )
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
    notes: list[str] = []
    target_h = float(
        bearing.target_life_h if bearing.target_life_h is not None else settings.target_life_h
    )
    if not target_h > 0.0:
        raise ModelError(
            f"bearing '{bearing.id}': target life must be > 0 h",
            field=f"bearings[{bearing.id}].target_life_h",
            line=bearing.line,
        )
    if bearing.target_reliability is not None:
        R = float(bearing.target_reliability)
        r_field = f"bearings[{bearing.id}].target_reliability"
    else:
        R = float(settings.target_reliability)
        r_field = "life.target_reliability"
    try:
        a1 = life_factor(R, settings.reliability_method, r_field)
    except ModelError as exc:
        raise ModelError(
            f"bearing '{bearing.id}': {exc.message}",
            field=exc.field,
            line=bearing.line if r_field.startswith("bearings") else None,
            expected=exc.expected,
        ) from exc
    af = float(settings.application_factor)
    if not af >= 1.0:
        raise ModelError(
            f"application factor {af:g} below 1",
            field="life.application_factor",
            expected="application_factor >= 1",
        )

    eq = equivalent_dynamic_load(bearing, sp.Fr_N, sp.Fa_N, ids)
    notes.extend(eq.warnings)
    P_design = af * eq.P_N
    n_abs = np.abs(sp.speed_rpm)

    reasons: list[tuple[str, str]] = []
    dyn = np.zeros(len(ids), dtype=bool)
    for k, cid in enumerate(ids):
        if sp.static_only[k]:
            reasons.append((cid, "flagged static-only"))
        elif not (n_abs[k] >= settings.min_speed_rpm and n_abs[k] > 0.0):
            reasons.append(
                (cid, f"|speed| {n_abs[k]:g} rpm below min_speed_rpm {settings.min_speed_rpm:g}")
            )
        elif not sp.duration[k] > 0.0:
            reasons.append((cid, "zero duration"))
        else:
            dyn[k] = True

    p = bearing.kind.life_exponent
    nan = np.full(len(ids), np.nan)
    sl = _spectrum_life(
        bearing.C_N, np.where(dyn, P_design, 0.0), sp.speed_rpm, sp.duration, dyn, p
    )
    U = sl.weights
    L10_case = np.where(dyn, basic_rating_life(bearing.C_N, np.where(dyn, P_design, 1.0), p), nan)
    L10h_case = np.where(dyn, life_hours(np.where(dyn, L10_case, 0.0), sp.speed_rpm), nan)

    use_mod = lubrication is not None and settings.use_modified_life
    aiso = np.where(dyn, 1.0, nan)
    kappa_out, nu_out, nu1_out, ec_out = nan.copy(), nan.copy(), nan.copy(), nan.copy()
    Cu_N: float | None = None if bearing.Cu_N is None else float(bearing.Cu_N)
    Cu_est = False
    if use_mod and lubrication is not None and np.any(dyn):
        idx = np.nonzero(dyn)[0]
        temps = sp.temperature_C[idx]
        missing = np.nonzero(~np.isfinite(temps))[0]
        if missing.size:
            cid = ids[int(idx[missing[0]])]
            raise ModelError(
                f"bearing '{bearing.id}', case '{cid}': operating temperature needed for the "
                "modified life (lubricant viscosity)",
                field=f"cases[{cid}].temperature",
                expected="a temperature, or life.use_modified_life: false",
            )
        dm = bearing.mean_diameter_mm
        nu = viscosity_at(
            temps,
            lubrication.nu1_at_t1_mm2_s,
            lubrication.t1_C,
            lubrication.nu2_at_t2_mm2_s,
            lubrication.t2_C,
        )
        nu1 = reference_viscosity(n_abs[idx], dm)
        kappa_raw = nu / nu1
        low = np.nonzero(kappa_raw < KAPPA_MIN)[0]
        if low.size:
            j = int(low[0])
            raise ModelError(
                f"bearing '{bearing.id}', case {case_name(ids, int(idx[j]))}: viscosity ratio "
                f"kappa = {kappa_raw[j]:.4g} (nu = {nu[j]:.4g}, nu1 = {nu1[j]:.4g} mm^2/s) "
                f"below {KAPPA_MIN}: outside ISO 281:2007 modified life",
                field="lubrication.viscosity",
                expected="a more viscous oil, lower temperature, or use_modified_life: false",
                case=ids[int(idx[j])],
            )
        for jj in np.nonzero(kappa_raw > KAPPA_MAX)[0]:
            notes.append(
                f"bearing '{bearing.id}', case {case_name(ids, int(idx[jj]))}: kappa = "
                f"{kappa_raw[jj]:.3g} taken as {KAPPA_MAX:g} (ISO 281:2007)"
            )
        kappa = np.minimum(kappa_raw, KAPPA_MAX)
        if Cu_N is None:
            Cu_N = estimate_fatigue_load_limit(bearing.C0_N, dm, bearing.kind)
            Cu_est = True
            notes.append(
                f"bearing '{bearing.id}': Cu not given, estimated Cu = {Cu_N:.4g} N from C0 "
                "(ISO 281:2007 Annex B simplified approach, from memory)"
            )
        if bearing.ec is not None:
            ec = np.full(idx.size, float(bearing.ec))
        elif lubrication.ec is not None:
            ec = np.full(idx.size, float(lubrication.ec))
        else:
            c1, c2, ec_notes = contamination_constants(
                lubrication.method, lubrication.cleanliness, lubrication.filtration_beta
            )
            notes.extend(ec_notes)
            ec = contamination_factor(c1, c2, kappa, dm)
        if np.any(ec < 0.0) or np.any(ec > 1.0):
            raise ModelError(
                f"bearing '{bearing.id}': contamination factor ec outside [0, 1]",
                field=f"bearings[{bearing.id}].ec",
                line=bearing.line,
                expected="0 <= ec <= 1",
            )
        Pd = P_design[idx]
        with np.errstate(divide="ignore"):
            cu_p = np.where(Pd > 0.0, Cu_N / np.where(Pd > 0.0, Pd, 1.0), np.inf)
        ai, relief = a_iso_with_ep(kappa, ec, cu_p, bearing.kind, lubrication.ep_additives)
        for jj in np.nonzero(relief)[0]:
            notes.append(
                f"bearing '{bearing.id}', case {case_name(ids, int(idx[jj]))}: EP additives - "
                "kappa taken as 1 in aISO, limited to 3 (ISO 281:2007 9.3.2, from memory)"
            )
        aiso[idx] = ai
        kappa_out[idx] = kappa
        nu_out[idx] = nu
        nu1_out[idx] = nu1
        ec_out[idx] = ec

    factors = np.where(dyn, a1 * aiso, nan)
    Lnm_case_mrev = np.where(
        dyn,
        modified_life_per_case(np.where(dyn, L10_case, 0.0), a1, np.where(dyn, aiso, 1.0)),
        nan,
    )
    Lnm_case_h = np.where(dyn, life_hours(np.where(dyn, Lnm_case_mrev, 0.0), sp.speed_rpm), nan)

    if np.any(U > 0.0):
        Lnm_mrev = combine_lives(np.where(dyn, Lnm_case_mrev, 1.0), U)
        Lnm_h = Lnm_mrev * MEGA_REVOLUTIONS / (60.0 * sl.n_m_rpm)
        target_mrev = target_h * 60.0 * sl.n_m_rpm / MEGA_REVOLUTIONS
        C_req = _required_rating(
            np.where(dyn, P_design, 0.0), U, p, target_mrev, np.where(dyn, factors, 1.0)
        )
    else:
        Lnm_mrev, Lnm_h, C_req = math.inf, math.inf, 0.0
    margin = bearing.C_N / C_req if C_req > 0.0 else math.inf
    life_ratio = margin**p

    st = static_check(bearing, sp.Fr_N, sp.Fa_N, ids, settings.s0_min)
    notes.extend(st.warnings)
    notes.extend(operating_warnings(bearing, eq.P_N, sp.speed_rpm, dyn, ids))
    if not np.any(dyn):
        notes.append(
            f"bearing '{bearing.id}': no case enters the fatigue spectrum; life is infinite "
            "and the verdict rests on static safety"
        )

    cycles: float | None = None
    if sp.duration_in_hours:
        cycles = duty_cycle_repetitions(Lnm_h, sp.duration)

    life_ok = bool(Lnm_h >= target_h)
    result = BearingLife(
        bearing_id=bearing.id,
        kind=bearing.kind.value,
        case_ids=ids,
        P_N=eq.P_N,
        P_design_N=P_design,
        X=eq.X,
        Y=eq.Y,
        e=eq.e,
        case_L10_mrev=L10_case,
        case_L10_h=L10h_case,
        aISO=aiso,
        kappa=kappa_out,
        nu_mm2_s=nu_out,
        nu1_mm2_s=nu1_out,
        ec=ec_out,
        case_Lnm_h=Lnm_case_h,
        P0_N=st.P0_N,
        case_s0=st.s0_per_case,
        dynamic=dyn,
        weights=U,
        static_only_cases=tuple(reasons),
        P_eq_N=sl.Pm_N,
        n_m_rpm=sl.n_m_rpm,
        L10_mrev=sl.L10_mrev,
        L10_h=sl.L10_h,
        Lnm_mrev=Lnm_mrev,
        Lnm_h=Lnm_h,
        a1=a1,
        reliability=R,
        reliability_method=settings.reliability_method,
        life_basis=LIFE_BASIS_MODIFIED if use_mod else LIFE_BASIS_BASIC,
        target_h=target_h,
        C_required_N=C_req,
        margin=margin,
        life_ratio=life_ratio,
        s0=st.s0,
        s0_min=st.s0_min,
        s0_case=None if st.s0_case_index is None else ids[st.s0_case_index],
        cycles_of_duty=cycles,
        warnings=_dedupe(notes),
        f0_estimated=eq.f0_estimated,
        Cu_N=Cu_N,
        Cu_estimated=Cu_est,
        application_factor=af,
        life_ok=life_ok,
        static_ok=st.ok,
        ok=life_ok and st.ok,
    )
    return result
