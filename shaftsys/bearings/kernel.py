"""The life chain of ISO 281:2007 / ISO 76:2006, vectorised over rows and cases.

One implementation for the single run (:func:`shaftsys.bearings.engine.evaluate_bearing`
is this kernel with N = 1), the batched design study (N = variants) and bearing
selection (N = catalogue rows). Rows are bearings (:class:`BearingArrays`), cases the
duty cycle (:class:`DutyCycle`); loads are (N, m) arrays. No Python loop runs per row
except to build the error of a failing row.

Rules (as DEVELOPERS.md, "Bearing life engine"): which cases are dynamic, the revolution
weights U_i, n_m with standstill time, P_design = af*P, aISO per case with EP relief,
Lnm_i = a1*aISO_i*L10_i combined by 1/L = sum U_i/L_i, C_req on the verdict basis, s0 =
C0/P0 worst over all cases. Units: N, mm, rpm, h, mm^2/s, degC; lives in 10^6 rev or h.

User mistakes are per row: ``LifeArrays.errors[i]`` holds the ModelError the single run
raises for that bearing (the first, in the same order), and its numbers are NaN. Errors
of the settings or the lubricant (application factor, unknown method) reach every row.
"""

from __future__ import annotations

import logging
import math
from dataclasses import dataclass

import numpy as np
import numpy.typing as npt

from shaftsys.bearings._util import BoolArray, FloatArray, case_name
from shaftsys.bearings.arrays import BearingArrays, RowErrors
from shaftsys.bearings.equivalent import (
    DEEP_GROOVE_E,
    DEEP_GROOVE_REL_LOAD,
    DEEP_GROOVE_X,
    DEEP_GROOVE_Y,
    MODE_DEEP_GROOVE,
    MODE_RADIAL,
    MODE_SWITCH,
    MODE_THRUST,
    EquivalentLoadArrays,
    dynamic_load_notes,
    equivalent_dynamic_load_arrays,
)
from shaftsys.bearings.lubrication import (
    EP_AISO_MAX,
    EP_EC_MIN,
    KAPPA_MAX,
    KAPPA_MIN,
    AisoTerms,
    a_iso_apply,
    a_iso_terms,
    a_iso_with_ep_arrays,
    contamination_constants,
    contamination_factor,
    estimate_fatigue_load_limit_arrays,
    reference_viscosity,
    viscosity_at,
)
from shaftsys.bearings.reliability import life_factor
from shaftsys.bearings.static import (
    MIN_LOAD_FRACTION_BALL,
    MIN_LOAD_FRACTION_ROLLER,
    S0_MIN_BALL,
    S0_MIN_ROLLER,
    StaticFactors,
    equivalent_static_load_arrays,
)
from shaftsys.errors import ModelError
from shaftsys.model.bearing import BearingKind, LifeSettings, Lubrication
from shaftsys.units import MEGA_REVOLUTIONS

_log = logging.getLogger(__name__)

LIFE_BASIS_MODIFIED = "Lnm = a1*aISO*L10 (ISO 281:2007)"
LIFE_BASIS_BASIC = "a1*L10"

IntArray = npt.NDArray[np.intp]


@dataclass(frozen=True, eq=False)
class DutyCycle:
    """The cases of a spectrum without their loads (arrays of shape (m,)).

    Attributes
    ----------
    case_ids: case names.
    speed_rpm: signed speed of the rotating ring relative to the other [rpm].
    duration: time share or hours per case.
    duration_in_hours: ``duration`` is in hours (enables duty repetitions).
    static_only: cases checked for statics only.
    temperature_C: operating temperature [degC] (NaN = not given), shape (m,), or one
        row of temperatures per bearing row, shape (N, m) (a study's heat balance).
    """

    case_ids: tuple[str, ...]
    speed_rpm: FloatArray
    duration: FloatArray
    duration_in_hours: bool
    static_only: BoolArray
    temperature_C: FloatArray

    def __len__(self) -> int:
        return len(self.case_ids)


@dataclass(frozen=True, eq=False)
class LifeArrays:
    """Life and static verdict of N rows over m cases (units in the names).

    Per (row, case), shape (N, m): ``P_N`` (X*Fr + Y*Fa), ``P_design_N`` (af*P), ``X``,
    ``Y``, ``e``, ``case_L10_mrev``, ``case_L10_h``, ``aISO``, ``kappa`` (clamped at 4),
    ``kappa_raw``, ``nu_mm2_s``, ``nu1_mm2_s``, ``ec``, ``case_Lnm_h``, ``P0_N``,
    ``case_s0``, ``ep_relief``. NaN where a case is not dynamic.

    Per case, shape (m,): ``dynamic``, ``weights`` (U_i); ``static_only_cases`` gives the
    reason of each non-dynamic case; ``n_m_rpm`` the mean speed.

    Per row, shape (N,): ``P_eq_N`` (Pm), ``L10_mrev``, ``L10_h``, ``Lnm_mrev``, ``Lnm_h``
    (target reliability, verdict basis), ``a1``, ``reliability``, ``target_h``,
    ``life_exponent``, ``C_required_N``, ``margin`` (C/C_req), ``life_ratio``
    (margin^p), ``s0``, ``s0_min``, ``s0_case`` (index, -1 none), ``cycles_of_duty``
    (NaN unless durations in hours), ``f0``, ``f0_estimated``, ``Cu_N`` (NaN = not
    needed), ``Cu_estimated``, ``min_load_ratio`` (smallest P/(f*C) of the running cases
    with f = 0.01 ball, 0.02 roller; below 1 = under the minimum load, common practice),
    ``speed_ratio`` (largest running |n| / limiting speed, NaN without a limiting speed),
    ``life_ok``, ``static_ok``, ``ok``, ``errors`` (first ModelError per row or None).
    """

    ids: tuple[str, ...]
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
    kappa_raw: FloatArray
    nu_mm2_s: FloatArray
    nu1_mm2_s: FloatArray
    ec: FloatArray
    case_Lnm_h: FloatArray
    P0_N: FloatArray
    case_s0: FloatArray
    ep_relief: BoolArray
    dynamic: BoolArray
    weights: FloatArray
    static_only_cases: tuple[tuple[str, str], ...]
    n_m_rpm: float
    P_eq_N: FloatArray
    L10_mrev: FloatArray
    L10_h: FloatArray
    Lnm_mrev: FloatArray
    Lnm_h: FloatArray
    a1: FloatArray
    reliability: FloatArray
    target_h: FloatArray
    life_exponent: FloatArray
    C_required_N: FloatArray
    margin: FloatArray
    life_ratio: FloatArray
    s0: FloatArray
    s0_min: FloatArray
    s0_case: IntArray
    cycles_of_duty: FloatArray
    f0: FloatArray
    f0_estimated: BoolArray
    Cu_N: FloatArray
    Cu_estimated: BoolArray
    min_load_ratio: FloatArray
    speed_ratio: FloatArray
    life_ok: BoolArray
    static_ok: BoolArray
    ok: BoolArray
    application_factor: float
    reliability_method: str
    life_basis: str
    errors: tuple[ModelError | None, ...]
    equivalent: EquivalentLoadArrays
    static_factors: StaticFactors
    ec_notes: tuple[str, ...]
    ec_from_constants: BoolArray

    @property
    def valid(self) -> BoolArray:
        """Mask of rows without a user error."""
        failed = getattr(self.errors, "failed", None)
        if failed is not None:
            return ~np.asarray(failed, dtype=bool)
        return np.array([x is None for x in self.errors], dtype=bool)

    @property
    def reason(self) -> npt.NDArray[np.object_]:
        """Per-row reason string: the error message, ``""`` for a valid row."""
        return np.array(["" if x is None else str(x) for x in self.errors], dtype=object)


def dynamic_cases(duty: DutyCycle, min_speed_rpm: float
                  ) -> tuple[BoolArray, tuple[tuple[str, str], ...]]:
    """Mask of the cases in the fatigue spectrum and the reason of each other case."""
    n_abs = np.abs(duty.speed_rpm)
    reasons: list[tuple[str, str]] = []
    dyn = np.zeros(len(duty), dtype=bool)
    for k, cid in enumerate(duty.case_ids):
        if duty.static_only[k]:
            reasons.append((cid, "flagged static-only"))
        elif not (n_abs[k] >= min_speed_rpm and n_abs[k] > 0.0):
            reasons.append((cid, f"|speed| {n_abs[k]:g} rpm below min_speed_rpm {min_speed_rpm:g}"))
        elif not duty.duration[k] > 0.0:
            reasons.append((cid, "zero duration"))
        else:
            dyn[k] = True
    return dyn, tuple(reasons)


def _reliability(p: BearingArrays, settings: LifeSettings, err: RowErrors
                 ) -> tuple[FloatArray, FloatArray]:
    """(R, a1) per row; rows whose reliability is outside the method's range fail."""
    own = ~np.isnan(p.target_reliability)
    R = np.where(own, p.target_reliability, float(settings.target_reliability))
    a1 = np.full(len(p), np.nan)
    for value in np.unique(R):
        rows = np.equal(R, value)
        try:
            a1[rows] = life_factor(float(value), settings.reliability_method)
            continue
        except ModelError:
            pass
        for i in map(int, np.flatnonzero(rows)):
            r_field = (f"bearings[{p.ids[i]}].target_reliability" if own[i]
                       else "life.target_reliability")
            try:
                life_factor(float(value), settings.reliability_method, r_field)
            except ModelError as exc:
                err.put(i, ModelError(
                    f"bearing '{p.ids[i]}': {exc.message}",
                    field=exc.field,
                    line=p.lines[i] if own[i] else None,
                    expected=exc.expected,
                ))
    return R, a1


def _life_hours(L_mrev: FloatArray, n_abs: FloatArray) -> FloatArray:
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(n_abs > 0.0,
                        L_mrev * MEGA_REVOLUTIONS / (60.0 * np.where(n_abs > 0.0, n_abs, 1.0)),
                        np.inf)


def evaluate(
    params: BearingArrays,
    Fr_N: npt.ArrayLike,
    Fa_N: npt.ArrayLike,
    duty: DutyCycle,
    settings: LifeSettings,
    lubrication: Lubrication | None,
    *,
    per_case: bool = True,
) -> LifeArrays:
    """Rating life, modified life, required rating and static safety of N rows.

    Parameters
    ----------
    params:
        Bearing parameters of N rows (N, mm, deg, rpm, h).
    Fr_N, Fa_N:
        Radial load magnitude and axial load (sign ignored) [N], broadcastable to
        (N, m): one spectrum for all rows (m,) or one per row (N, m).
    duty:
        Speeds [rpm], durations, static-only flags, temperatures [degC] of the m cases.
    settings:
        Model-wide life settings (target life h, reliability, method, af, ...).
    lubrication:
        Lubricant data for the modified life, or ``None`` (a1*L10 basis).
    per_case:
        ``False`` (a design study that keeps only the per-row verdicts) skips the
        per-case outputs that are only reported: ``case_L10_h``, ``case_Lnm_h``,
        ``kappa``, ``kappa_raw``, ``nu_mm2_s``, ``nu1_mm2_s``, ``ec`` are then read-only
        NaN views (no memory, no work); every per-row result is the same.

    Returns
    -------
    LifeArrays
        Rows with a user error carry it in ``errors`` (numbers NaN, verdicts False).
    """
    N, m = len(params), len(duty)
    p = params
    err = RowErrors(N)
    Fr = np.broadcast_to(np.asarray(Fr_N, dtype=np.float64), (N, m))
    Fa = np.broadcast_to(np.abs(np.asarray(Fa_N, dtype=np.float64)), (N, m))
    own_t = ~np.isnan(p.target_life_h)
    target_h = np.where(own_t, p.target_life_h, float(settings.target_life_h))
    err.add(~(target_h > 0.0), lambda i: ModelError(
        f"bearing '{p.ids[i]}': target life must be > 0 h",
        field=f"bearings[{p.ids[i]}].target_life_h",
        line=p.lines[i],
    ))
    R, a1 = _reliability(p, settings, err)
    af = float(settings.application_factor)
    if not af >= 1.0:
        af_error = ModelError(
            f"application factor {af:g} below 1",
            field="life.application_factor",
            expected="application_factor >= 1",
        )
        err.add(np.ones(N, bool), lambda i: af_error)

    eq = equivalent_dynamic_load_arrays(p, Fr, Fa, duty.case_ids)
    err.merge(eq.errors)
    P_design = af * eq.P_N
    n_abs = np.abs(duty.speed_rpm)
    dyn, reasons = dynamic_cases(duty, settings.min_speed_rpm)
    pexp = p.life_exponent
    pc = pexp[:, None]
    C = p.C_N[:, None]

    # revolution weights and mean speed (shared by all rows)
    revs = np.where(dyn, n_abs * duty.duration, 0.0)
    total_rev = float(revs.sum())
    U = revs / total_rev if total_rev > 0.0 else np.zeros_like(revs)
    total_t = float(duty.duration.sum())
    n_m = float(revs.sum()) / total_t if total_t > 0.0 else 0.0
    used = U > 0.0
    any_used = bool(np.any(used))
    Pz = np.where(dyn, P_design, 0.0)
    with np.errstate(divide="ignore", invalid="ignore"):
        if any_used:
            # U_i * P_i^p of the cases that count, once (Pm and C_req share it)
            UPp = np.where(used, np.where(used, Pz, 0.0) ** pc, 0.0)
            UPp *= U
            Pm = UPp.sum(axis=1) ** (1.0 / pexp)
            L10 = np.where(Pm > 0.0, (p.C_N / np.where(Pm > 0.0, Pm, 1.0)) ** pexp, np.inf)
            L10_h = L10 * MEGA_REVOLUTIONS / (60.0 * n_m)
        else:
            Pm, L10, L10_h = np.zeros(N), np.full(N, np.inf), np.full(N, np.inf)
        P1 = np.where(dyn, P_design, 1.0)
        L10_case = np.where(dyn, np.where(P1 > 0.0, (C / np.where(P1 > 0.0, P1, 1.0)) ** pc,
                                          np.inf), np.nan)
    report_nan = np.broadcast_to(np.nan, (N, m))   # per-case outputs not asked for
    L10h_case = (np.where(dyn, _life_hours(np.where(dyn, L10_case, 0.0), n_abs), np.nan)
                 if per_case else report_nan)

    # modified life per case
    use_mod = lubrication is not None and settings.use_modified_life
    nan = np.full((N, m), np.nan)
    aiso = np.where(dyn, 1.0, nan)
    if per_case:
        kappa_out, kappa_raw_out = nan.copy(), nan.copy()
        nu_out, nu1_out, ec_out = nan.copy(), nan.copy(), nan.copy()
    else:
        kappa_out = kappa_raw_out = nu_out = nu1_out = ec_out = report_nan
    relief_out = np.zeros((N, m), dtype=bool)
    Cu = p.Cu_N.copy()
    Cu_est = np.zeros(N, dtype=bool)
    ec_notes: tuple[str, ...] = ()
    ec_from_c = np.zeros(N, dtype=bool)
    if use_mod and lubrication is not None and np.any(dyn):
        idx = np.flatnonzero(dyn)
        temps = duty.temperature_C[..., idx]
        missing = np.flatnonzero(~np.all(np.isfinite(np.atleast_2d(temps)), axis=0))
        block = True
        if missing.size:
            cid = duty.case_ids[int(idx[missing[0]])]
            err.add(np.ones(N, bool), lambda i: ModelError(
                f"bearing '{p.ids[i]}', case '{cid}': operating temperature needed for the "
                "modified life (lubricant viscosity)",
                field=f"cases[{cid}].temperature",
                expected="a temperature, or life: {modified_life: false}",
            ))
            block = False
        else:
            try:
                nu = viscosity_at(temps, lubrication.nu1_at_t1_mm2_s, lubrication.t1_C,
                                  lubrication.nu2_at_t2_mm2_s, lubrication.t2_C)
            except ModelError as exc:
                lub_error = exc
                err.add(np.ones(N, bool), lambda i: lub_error)
                block = False
        if block:
            dm = p.mean_diameter_mm[:, None]
            # nu1 depends on dm and the case speed only: once per distinct dm
            dm_u, dm_inv = np.unique(np.where(dm > 0.0, dm, 1.0), return_inverse=True)
            nu1 = reference_viscosity(n_abs[idx], dm_u[:, None])[dm_inv.ravel()]
            nu_rows = nu[None, :] if nu.ndim == 1 else nu   # (1 or N, dynamic cases)
            kappa_raw = nu_rows / nu1
            low = ~(kappa_raw >= KAPPA_MIN)  # NaN is low too
            jl = np.argmax(low, axis=1)
            err.add(np.any(low, axis=1), lambda i: ModelError(
                f"bearing '{p.ids[i]}', case {case_name(duty.case_ids, int(idx[jl[i]]))}: "
                f"viscosity ratio kappa = {kappa_raw[i, jl[i]]:.4g} "
                f"(nu = {nu_rows[min(i, len(nu_rows) - 1), jl[i]]:.4g}, "
                f"nu1 = {nu1[i, jl[i]]:.4g} mm^2/s) below {KAPPA_MIN}: outside ISO 281:2007 "
                "modified life",
                field="lubrication.viscosity",
                expected="a more viscous oil, lower temperature, or life: {modified_life: "
                "false}",
                case=duty.case_ids[int(idx[jl[i]])],
            ))
            kappa = np.minimum(kappa_raw, KAPPA_MAX)
            Cu_est = np.isnan(p.Cu_N)
            Cu = np.where(Cu_est, estimate_fatigue_load_limit_arrays(
                p.C0_N, p.mean_diameter_mm, p.roller), p.Cu_N)
            own_ec = ~np.isnan(p.ec)
            k_ec = np.full((N, idx.size), np.nan)
            k_ec[own_ec] = p.ec[own_ec, None]
            if lubrication.ec is not None:
                k_ec[~own_ec] = float(lubrication.ec)
            else:
                ec_from_c = ~own_ec
                if np.any(ec_from_c):
                    try:
                        c1, c2, notes = contamination_constants(
                            lubrication.method, lubrication.cleanliness,
                            lubrication.filtration_beta)
                        ec_notes = tuple(notes)
                        k_ec[ec_from_c] = contamination_factor(c1, c2, kappa, dm)[ec_from_c]
                    except ModelError as exc:
                        ec_error = exc
                        err.add(ec_from_c, lambda i: ec_error)
                        ec_from_c = np.zeros(N, dtype=bool)
            err.add(np.any((k_ec < 0.0) | (k_ec > 1.0), axis=1), lambda i: ModelError(
                f"bearing '{p.ids[i]}': contamination factor ec outside [0, 1]",
                field=f"bearings[{p.ids[i]}].ec",
                line=p.lines[i],
                expected="0 <= ec <= 1",
            ))
            Pd = P_design[:, idx]
            bad = err.failed[:, None] | ~np.isfinite(kappa) | (kappa < KAPPA_MIN)
            with np.errstate(divide="ignore", invalid="ignore"):
                cu_p = np.where(Pd > 0.0, Cu[:, None] / np.where(Pd > 0.0, Pd, 1.0), np.inf)
                ai, relief = a_iso_with_ep_arrays(
                    np.where(bad, 1.0, kappa), np.where(bad, 0.0, k_ec),
                    np.where(bad, 0.0, cu_p), p.roller[:, None],
                    p.is_kind(BearingKind.THRUST_BALL)[:, None], lubrication.ep_additives)
            aiso[:, idx] = ai
            relief_out[:, idx] = relief & ~bad
            if per_case:
                kappa_out[:, idx] = kappa
                kappa_raw_out[:, idx] = kappa_raw
                nu_out[:, idx] = nu_rows
                nu1_out[:, idx] = nu1
                ec_out[:, idx] = k_ec

    a1c = a1[:, None]
    with np.errstate(divide="ignore", invalid="ignore"):
        factors = np.where(dyn, a1c * aiso, np.nan)
        Lnm_case = np.where(dyn, a1c * np.where(dyn, aiso, 1.0) * np.where(dyn, L10_case, 0.0),
                            np.nan)
        Lnm_case_h = (np.where(dyn, _life_hours(np.where(dyn, Lnm_case, 0.0), n_abs), np.nan)
                      if per_case else report_nan)
        if any_used:
            Lu = np.where(dyn, Lnm_case, 1.0)
            damage = np.where(used, U / np.where(used, Lu, 1.0), 0.0).sum(axis=1)
            Lnm = np.where(damage > 0.0, 1.0 / np.where(damage > 0.0, damage, 1.0), np.inf)
            Lnm_h = Lnm * MEGA_REVOLUTIONS / (60.0 * n_m)
            target_mrev = target_h * 60.0 * n_m / MEGA_REVOLUTIONS
            f1 = np.where(dyn, factors, 1.0)
            UPp /= np.where(used, f1, 1.0)
            s = UPp.sum(axis=1)
            C_req = (target_mrev * s) ** (1.0 / pexp)
        else:
            Lnm, Lnm_h, C_req = np.full(N, np.inf), np.full(N, np.inf), np.zeros(N)
        margin = np.where(C_req > 0.0, p.C_N / np.where(C_req > 0.0, C_req, 1.0), np.inf)
        life_ratio = margin**pexp

    # static safety over every case
    P0, sf, st_errors = equivalent_static_load_arrays(p, Fr, Fa, duty.case_ids)
    err.merge(st_errors)
    with np.errstate(divide="ignore", invalid="ignore"):
        s0_case = np.where(P0 > 0.0, p.C0_N[:, None] / np.where(P0 > 0.0, P0, 1.0), np.inf)
    if m:
        k0 = np.argmin(s0_case, axis=1)
        s0 = s0_case[np.arange(N), k0]
    else:
        k0, s0 = np.full(N, -1, dtype=np.intp), np.full(N, np.inf)
    default_s0 = (float(settings.s0_min) if settings.s0_min is not None else np.nan)
    s0_min = np.where(~np.isnan(p.s0_min), p.s0_min,
                      np.where(np.isnan(default_s0),
                               np.where(p.roller, S0_MIN_ROLLER, S0_MIN_BALL), default_s0))

    # operating limits of the running cases
    frac = np.where(p.roller, MIN_LOAD_FRACTION_ROLLER, MIN_LOAD_FRACTION_BALL)
    with np.errstate(divide="ignore", invalid="ignore"):
        if np.any(dyn):
            min_load = np.min(np.where(dyn, eq.P_N, np.inf), axis=1) / (frac * p.C_N)
            speed_ratio = float(n_abs[dyn].max()) / p.limiting_speed_rpm
        else:
            min_load = np.full(N, np.nan)
            speed_ratio = np.full(N, np.nan)
    if duty.duration_in_hours:
        cycles = Lnm_h / total_t if total_t > 0.0 else np.full(N, np.inf)
    else:
        cycles = np.full(N, np.nan)
    life_ok = Lnm_h >= target_h
    static_ok = s0 >= s0_min
    errors = err.freeze()
    bad_rows = err.failed
    if np.any(bad_rows):
        for arr in (P_design, L10_case, L10h_case, aiso, Lnm_case_h, s0_case, P0):
            if arr.flags.writeable:
                arr[bad_rows] = np.nan
        Pm, L10, L10_h, Lnm, Lnm_h, C_req, margin, life_ratio, s0 = (
            np.where(bad_rows, np.nan, v)
            for v in (Pm, L10, L10_h, Lnm, Lnm_h, C_req, margin, life_ratio, s0))
        life_ok = life_ok & ~bad_rows
        static_ok = static_ok & ~bad_rows
        k0 = np.where(bad_rows, -1, k0)
    return LifeArrays(
        ids=p.ids, case_ids=duty.case_ids,
        P_N=eq.P_N, P_design_N=P_design, X=eq.X, Y=eq.Y, e=eq.e,
        case_L10_mrev=L10_case, case_L10_h=L10h_case, aISO=aiso, kappa=kappa_out,
        kappa_raw=kappa_raw_out, nu_mm2_s=nu_out, nu1_mm2_s=nu1_out, ec=ec_out,
        case_Lnm_h=Lnm_case_h, P0_N=P0, case_s0=s0_case, ep_relief=relief_out,
        dynamic=dyn, weights=U, static_only_cases=reasons, n_m_rpm=n_m,
        P_eq_N=Pm, L10_mrev=L10, L10_h=L10_h, Lnm_mrev=Lnm, Lnm_h=Lnm_h, a1=a1,
        reliability=R, target_h=target_h, life_exponent=pexp, C_required_N=C_req,
        margin=margin, life_ratio=life_ratio, s0=s0, s0_min=s0_min,
        s0_case=k0.astype(np.intp), cycles_of_duty=cycles, f0=eq.factors.f0,
        f0_estimated=eq.factors.f0_estimated, Cu_N=Cu, Cu_estimated=Cu_est,
        min_load_ratio=min_load, speed_ratio=speed_ratio, life_ok=life_ok,
        static_ok=static_ok, ok=life_ok & static_ok, application_factor=af,
        reliability_method=settings.reliability_method,
        life_basis=LIFE_BASIS_MODIFIED if use_mod else LIFE_BASIS_BASIC,
        errors=errors, equivalent=eq, static_factors=sf, ec_notes=ec_notes,
        ec_from_constants=ec_from_c,
    )


@dataclass(frozen=True, eq=False)
class RowPlan:
    """What :func:`evaluate` computes for one bearing that does not depend on its loads
    or its C, for :func:`evaluate_planned` to apply to many load spectra at once.

    A design study evaluates the same bearing (kind, factors, C0, Cu, lubrication,
    kappa and ec per case, a1, target, life exponent) for every variant; only the loads
    and C change. Built by :func:`plan_row` from a zero-load :func:`evaluate` of the
    bearing (so every load-independent number is the one the general chain computes).
    Shapes: (m,) per case, (k,) per dynamic case; the rest are numbers.
    """

    mode: int
    no_axial: bool          # radial mode: needle or rib-less cylindrical (no axial load)
    thrust_ball: bool
    rel_coef: float         # deep groove: f0
    C0_N: float
    e: float                # e-switch factors (maker's or derived)
    x_low: float
    y_low: float
    x_high: float
    y_high: float
    af: float
    dynamic: BoolArray      # (m,)
    used: BoolArray         # (m,) U_i > 0
    weights: FloatArray     # (m,) U_i
    idx: IntArray | slice   # (k,) dynamic cases
    used_cols: IntArray | slice   # cases with U_i > 0 ...
    used_pos: IntArray | slice    # ... and their positions in idx
    p: FloatArray           # (1, 1) life exponent (an array, as the general chain's)
    inv_p: FloatArray       # (1,) 1/p
    a1: float
    target_h: float
    target_mrev: float
    n_m_rpm: float
    modified: bool          # aISO from the lubrication
    Cu_N: float
    ec: FloatArray          # (k,)
    terms: AisoTerms | None
    ep_terms: AisoTerms | None   # aISO terms at kappa = 1 where the EP relief applies
    ep_use: BoolArray       # (k,)
    X0: float
    Y0: float
    floor_at_Fr: bool
    s0_min: float
    min_load_fraction: float = math.nan   # f of the minimum load f*C (common practice)
    speed_ratio: float = math.nan         # largest running |n| / limiting speed


@dataclass(frozen=True, eq=False)
class PlannedLife:
    """Per-row results of :func:`evaluate_planned` (shape (b,), units in the names).

    ``fallback``: rows the plan does not cover (a load-dependent user error is possible,
    or C or a load is not a finite positive number): evaluate them with
    :func:`evaluate`; their other numbers are not meaningful. ``min_load_ratio``,
    ``speed_ratio``: as :class:`LifeArrays` (the operating limits).
    """

    Lnm_h: FloatArray
    margin: FloatArray
    life_ratio: FloatArray
    s0: FloatArray
    life_ok: BoolArray
    static_ok: BoolArray
    ok: BoolArray
    fallback: BoolArray
    min_load_ratio: FloatArray
    speed_ratio: FloatArray


def _as_slice(index: IntArray) -> IntArray | slice:
    """A slice where ``index`` is a contiguous range (a view instead of a gather)."""
    if index.size and np.array_equal(index, np.arange(index[0], index[0] + index.size)):
        return slice(int(index[0]), int(index[0]) + index.size)
    return index


def plan_row(params: BearingArrays, duty: DutyCycle, settings: LifeSettings,
             lubrication: Lubrication | None) -> RowPlan | None:
    """The load-independent part of the life chain of ONE bearing (``len(params) == 1``).

    ``None`` where the plan would not cover the general chain: the bearing has an error
    at zero load, an angular-contact Table 3 interpolation (load-dependent factors), or
    no case with a revolution weight.
    """
    if len(params) != 1:
        raise ValueError("plan_row takes one bearing")
    m = len(duty)
    la = evaluate(params, np.zeros(m), np.zeros(m), duty, settings, lubrication)
    f = la.equivalent.factors
    mode = int(f.mode[0])
    if la.errors[0] is not None or mode not in (MODE_RADIAL, MODE_THRUST, MODE_SWITCH,
                                                 MODE_DEEP_GROOVE):
        return None
    dyn = np.asarray(la.dynamic, dtype=bool)
    U = np.asarray(la.weights, dtype=np.float64)
    used = U > 0.0
    if not np.any(used):
        return None
    idx = np.flatnonzero(dyn)
    used_cols = np.flatnonzero(used)
    pos = {int(k): i for i, k in enumerate(idx)}
    use_mod = lubrication is not None and settings.use_modified_life
    pexp = float(la.life_exponent[0])
    terms = ep_terms = None
    ep_use = np.zeros(idx.size, dtype=bool)
    ec = np.full(idx.size, np.nan)
    if use_mod and lubrication is not None:
        kappa = la.kappa[0, idx]
        ec = np.array(la.ec[0, idx], dtype=np.float64)
        roller = bool(params.roller[0])
        tb = bool(params.is_kind(BearingKind.THRUST_BALL)[0])
        terms = a_iso_terms(kappa, roller, tb)
        if lubrication.ep_additives:
            ep_use = (kappa < 1.0) & (ec >= EP_EC_MIN)
            ep_terms = a_iso_terms(np.ones_like(kappa), roller, tb)
    n_m = float(la.n_m_rpm)
    target_h = np.float64(la.target_h[0])
    kind = params.is_kind
    return RowPlan(
        mode=mode,
        no_axial=bool((kind(BearingKind.NEEDLE_ROLLER) | ~params.ribs)[0]),
        thrust_ball=bool(kind(BearingKind.THRUST_BALL)[0]),
        rel_coef=float(f.rel_coef[0]), C0_N=float(params.C0_N[0]), e=float(f.e[0]),
        x_low=float(f.x_low[0]), y_low=float(f.y_low[0]), x_high=float(f.x_high[0]),
        y_high=float(f.y_high[0]), af=float(la.application_factor),
        dynamic=dyn, used=used, weights=U, idx=_as_slice(idx), used_cols=_as_slice(used_cols),
        used_pos=_as_slice(np.array([pos[int(k)] for k in used_cols], dtype=np.intp)),
        p=np.full((1, 1), pexp), inv_p=np.full(1, 1.0 / pexp), a1=float(la.a1[0]),
        target_h=float(target_h), target_mrev=float(target_h * 60.0 * n_m / MEGA_REVOLUTIONS),
        n_m_rpm=n_m, modified=bool(use_mod), Cu_N=float(la.Cu_N[0]), ec=ec, terms=terms,
        ep_terms=ep_terms, ep_use=ep_use, X0=float(la.static_factors.X0[0]),
        Y0=float(la.static_factors.Y0[0]),
        floor_at_Fr=bool(la.static_factors.floor_at_Fr[0]), s0_min=float(la.s0_min[0]),
        min_load_fraction=float(MIN_LOAD_FRACTION_ROLLER if params.roller[0]
                                else MIN_LOAD_FRACTION_BALL),
        speed_ratio=float(np.broadcast_to(la.speed_ratio, (1,))[0]))


def evaluate_planned(plan: RowPlan, Fr_N: npt.ArrayLike, Fa_N: npt.ArrayLike,
                     C_N: npt.ArrayLike) -> PlannedLife:
    """The per-row verdicts of :func:`evaluate` for b load spectra of one planned bearing.

    The same operations in the same order as the general chain on its rows, so the
    same bits; only what depends on the loads and C is computed per row.

    Parameters
    ----------
    plan:
        From :func:`plan_row`.
    Fr_N, Fa_N:
        Radial load and axial load (sign ignored) [N], shape (b, m).
    C_N:
        Basic dynamic load rating of each row [N], shape (b,).
    """
    # any memory layout: every operation on the loads is elementwise or a max/min (exact
    # in any order); the two sums over the cases run over fresh C-contiguous (b, m)
    # arrays, the general chain's order. A (b, m) view of case-major (m, b) data (the
    # study's layout) is not copied, and its max/min over the cases are the fast
    # reductions over the outer axis (several times faster than over a short inner one)
    Fr = np.asarray(Fr_N, dtype=np.float64)
    Fa = np.abs(np.asarray(Fa_N, dtype=np.float64))
    C = np.asarray(C_N, dtype=np.float64)
    pl = plan
    with np.errstate(all="ignore"):
        # rows the general chain may refuse: take them there (errors, messages). A NaN
        # fails every comparison and propagates through min/max, an infinity fails
        # isfinite: the same rows as its checks (a false alarm would only cost time)
        fr_max = Fr.max(axis=1)
        fa_max = Fa.max(axis=1)
        fall = ~(C > 0.0) | ~(Fr.min(axis=1) >= 0.0) | ~np.isfinite(fr_max)
        fall |= ~np.isfinite(fa_max)
        tol = 1e-9 * np.maximum(np.abs(C), 1.0)
        if pl.mode == MODE_RADIAL and pl.no_axial:
            fall |= fa_max > tol
        if pl.mode == MODE_THRUST or pl.thrust_ball:
            fall |= fr_max > tol
        # equivalent dynamic load (ISO 281:2007 6.2, 7.2)
        if pl.mode == MODE_RADIAL:
            P = Fr
        elif pl.mode == MODE_THRUST:
            P = Fa
        else:
            if pl.mode == MODE_DEEP_GROOVE:
                rel = pl.rel_coef * Fa / pl.C0_N
                e: FloatArray | float = np.interp(rel, DEEP_GROOVE_REL_LOAD, DEEP_GROOVE_E)
                xl, yl, xh = 1.0, 0.0, DEEP_GROOVE_X
                yh: FloatArray | float = np.interp(rel, DEEP_GROOVE_REL_LOAD, DEEP_GROOVE_Y)
            else:
                e, xl, yl, xh, yh = pl.e, pl.x_low, pl.y_low, pl.x_high, pl.y_high
            high = Fa > e * Fr
            P = np.where(high, xh, xl) * Fr + np.where(high, yh, yl) * Fa
        P_design = P if pl.af == 1.0 else pl.af * P   # 1.0 * P is P
        b, m = Fr.shape
        Pd = P_design[:, pl.idx]                     # (b, k) the dynamic cases
        all_pos = bool(Pd.size) and bool(Pd.min() > 0.0)
        pos = Pd > 0.0 if not all_pos else None      # (where(True, x, y) is x)
        Pw = Pd if pos is None else np.where(pos, Pd, 1.0)
        # U_i * P_i^p of the cases that count (zero elsewhere, as the general chain)
        UPp = np.zeros((b, m))
        UPp[:, pl.used_cols] = Pd[:, pl.used_pos] ** pl.p * pl.weights[pl.used_cols]
        L10 = (C[:, None] / Pw) ** pl.p
        if pos is not None:
            L10 = np.where(pos, L10, np.inf)
        if pl.modified and pl.terms is not None:
            cu_p = pl.Cu_N / Pw
            ecu = pl.ec * (cu_p if pos is None else np.where(pos, cu_p, np.inf))
            neg = ~(ecu.min(axis=1) >= 0.0)
            if np.any(neg):      # the general chain raises on these: let it
                fall |= neg
                ecu[neg] = 0.0
            ai = a_iso_apply(pl.terms, ecu, checked=True)
            if pl.ep_terms is not None and np.any(pl.ep_use):
                relieved = np.minimum(a_iso_apply(pl.ep_terms, ecu, checked=True),
                                      EP_AISO_MAX)
                ai = np.where(pl.ep_use, np.maximum(ai, relieved), ai)
            factors: FloatArray | float = pl.a1 * ai
        else:
            factors = pl.a1 * 1.0
        Lnm_case = factors * L10                     # (b, k)
        fac_used = (factors[:, pl.used_pos] if isinstance(factors, np.ndarray)
                    else factors)
        # Palmgren-Miner over the cases with a revolution weight (sums over all m cases,
        # zeros elsewhere: the general chain's order of summation)
        D = np.zeros((b, m))
        D[:, pl.used_cols] = pl.weights[pl.used_cols] / Lnm_case[:, pl.used_pos]
        damage = D.sum(axis=1)
        Lnm = np.where(damage > 0.0, 1.0 / np.where(damage > 0.0, damage, 1.0), np.inf)
        Lnm_h = Lnm * MEGA_REVOLUTIONS / (60.0 * pl.n_m_rpm)
        UPp[:, pl.used_cols] /= fac_used
        C_req = (pl.target_mrev * UPp.sum(axis=1)) ** pl.inv_p
        margin = np.where(C_req > 0.0, C / np.where(C_req > 0.0, C_req, 1.0), np.inf)
        life_ratio = margin ** pl.p[0]
        # static safety (ISO 76:2006): min over the cases of C0/P0 is C0/max P0 (a
        # correctly rounded division is monotone; P0 >= 0), the same bits
        if pl.X0 == 1.0 and pl.Y0 == 0.0:     # P0 = 1*Fr + 0*Fa is Fr (Fa finite here)
            P0max = fr_max
        else:
            P0 = pl.X0 * Fr + pl.Y0 * Fa
            if pl.floor_at_Fr:
                P0 = np.maximum(P0, Fr)
            P0max = P0.max(axis=1)
        s0 = np.where(P0max > 0.0, pl.C0_N / np.where(P0max > 0.0, P0max, 1.0), np.inf)
        # operating limits of the running cases (as the general chain: P without af)
        P_dyn = P[:, pl.idx]
        min_load = (P_dyn.min(axis=1) / (pl.min_load_fraction * C) if P_dyn.size
                    else np.full(b, np.nan))
    life_ok = Lnm_h >= pl.target_h
    static_ok = s0 >= pl.s0_min
    return PlannedLife(Lnm_h=Lnm_h, margin=margin, life_ratio=life_ratio, s0=s0,
                       life_ok=life_ok, static_ok=static_ok, ok=life_ok & static_ok,
                       fallback=fall, min_load_ratio=min_load,
                       speed_ratio=np.full(b, pl.speed_ratio))


def row_notes(params: BearingArrays, la: LifeArrays, i: int, speed_rpm: npt.ArrayLike
              ) -> list[str]:
    """Warnings of row ``i`` in the order the single-bearing engine gives them.

    The notes of the equivalent load and of the operating limits are also logged (as the
    single-bearing functions do); call it for the rows a user will see.

    Parameters
    ----------
    params:
        The rows evaluated.
    la:
        Their results.
    i:
        Row index.
    speed_rpm:
        Signed case speeds [rpm] (for the limiting-speed warning).
    """
    bid = params.ids[i]
    ids = la.case_ids
    notes = dynamic_load_notes(params, la.equivalent, i, ids)
    for note in notes:
        logging.getLogger("shaftsys.bearings.equivalent").warning(note)
    for k in np.flatnonzero(la.kappa_raw[i] > KAPPA_MAX):
        notes.append(
            f"bearing '{bid}', case {case_name(ids, int(k))}: kappa = "
            f"{la.kappa_raw[i, k]:.3g} taken as {KAPPA_MAX:g} (ISO 281:2007)"
        )
    if la.Cu_estimated[i]:
        notes.append(
            f"bearing '{bid}': Cu not given, estimated Cu = {la.Cu_N[i]:.4g} N from C0 "
            "(ISO 281:2007 Annex B simplified approach)"
        )
    if la.ec_from_constants[i]:
        notes.extend(la.ec_notes)
    for k in np.flatnonzero(la.ep_relief[i]):
        notes.append(
            f"bearing '{bid}', case {case_name(ids, int(k))}: EP additives - "
            "kappa taken as 1 in aISO, limited to 3 (ISO 281:2007, 9.3.2)"
        )
    if la.static_factors.y0_from_e[i]:
        notes.append(
            f"bearing '{bid}': Y0 not given; derived from e via e = 1.5*tan(alpha) "
            "(ISO 281 Table 4) and the ISO 76 formula"
        )
    if la.s0_case[i] >= 0 and la.s0[i] < la.s0_min[i]:
        notes.append(
            f"bearing '{bid}': static safety s0 = {la.s0[i]:.3g} < required "
            f"{la.s0_min[i]:g} in case {case_name(ids, int(la.s0_case[i]))}"
        )
    operating: list[str] = []
    frac = MIN_LOAD_FRACTION_ROLLER if params.roller[i] else MIN_LOAD_FRACTION_BALL
    C = float(params.C_N[i])
    P = la.P_N[i]
    for k in np.flatnonzero(la.dynamic & (frac * C > P)):
        operating.append(
            f"bearing '{bid}', case {case_name(ids, int(k))}: P = {P[k]:.4g} N "
            f"below minimum load {frac:g}*C = {frac * C:.4g} N (risk of skidding; "
            "common practice, no source)"
        )
    lim = params.given(i, "limiting_speed_rpm")
    if lim is not None:
        n = np.abs(np.asarray(speed_rpm, dtype=float))
        for k in np.flatnonzero(la.dynamic & (n > lim)):
            operating.append(
                f"bearing '{bid}', case {case_name(ids, int(k))}: speed "
                f"{n[k]:.6g} rpm above limiting speed {lim:g} rpm"
            )
    for note in operating:
        logging.getLogger("shaftsys.bearings.static").warning(note)
    notes.extend(operating)
    if not np.any(la.dynamic):
        notes.append(
            f"bearing '{bid}': no case enters the fatigue spectrum; life is infinite "
            "and the verdict rests on static safety"
        )
    return notes


__all__ = [
    "LIFE_BASIS_BASIC",
    "LIFE_BASIS_MODIFIED",
    "DutyCycle",
    "LifeArrays",
    "PlannedLife",
    "RowPlan",
    "dynamic_cases",
    "evaluate",
    "evaluate_planned",
    "plan_row",
    "row_notes",
]
