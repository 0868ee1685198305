"""The heat balance of many variants at once: friction, power loss and temperature.

One numerical core for the single run (:func:`shaftsys.analysis.thermal.evaluate_thermal`
calls it with one variant) and the design study (:mod:`shaftsys.study.variant_batch`
calls it with one row per variant), so both compute the same numbers the same way.

Arrays: V variants, B bearings, m cases. From the bearing loads Fr, Fa [N] and speeds
[rpm] of shape (V, B, m): Palmgren's friction moment M = M0(nu(T)) + M1 per bearing and
case (:mod:`shaftsys.bearings.friction`), the housing temperature T of every (variant,
case) where the heat generated equals the heat removed
(:func:`shaftsys.bearings.heat_balance.solve_temperature` on the V*m flattened entries:
Newton steps inside a bisection bracket, converged entry by entry), and the speed factor
of the heat-balance speed (:func:`~shaftsys.bearings.heat_balance.speed_factor`). A
Python loop runs over the bearings (to pick each type's friction formulas), never over
variants or cases.

Units: N, mm, N*mm, rpm, W, W/K, degC.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np
import numpy.typing as npt

from shaftsys.analysis.thermal_results import ThermalResult
from shaftsys.bearings._util import BoolArray, FloatArray
from shaftsys.bearings.friction import (
    M0_COEFF,
    M0_COEFF_LOW,
    NU_N_BREAK,
    FrictionFactors,
    f1_value,
    friction_factors,
    friction_load,
    friction_power_W,
    load_moment,
    static_load_ratio,
    viscous_moment,
)
from shaftsys.bearings.heat_balance import solve_temperature, speed_factor
from shaftsys.bearings.lubrication import viscosity_at
from shaftsys.errors import ModelError
from shaftsys.model import Bearing, CaseKind, Lubrication, Model
from shaftsys.model.thermal import (
    DEFAULT_MAX_TEMPERATURE_GREASE_C,
    DEFAULT_MAX_TEMPERATURE_OIL_C,
)


@dataclass(frozen=True, eq=False)
class ThermalSetup:
    """What the heat balance of a model needs besides the bearing loads.

    ``bearings`` and their ``factors`` (f0, f1 and whether the user gave them), ``dm``
    (B, 1) mean diameters [mm], ``f0`` (B, 1); per case (m,): ``evaluated`` (duty cases),
    ``extra_W`` (the extra loss in evaluated cases), ``typed_C`` (NaN = not typed),
    ``weights`` (duration shares of the evaluated cases, summing to 1; zero elsewhere).
    """

    bearing_ids: tuple[str, ...]
    shaft_ids: tuple[str, ...]
    case_ids: tuple[str, ...]
    bearings: tuple[Bearing, ...]
    factors: tuple[FrictionFactors, ...]
    f0: FloatArray
    dm: FloatArray
    evaluated: BoolArray
    extra_W: FloatArray
    typed_C: FloatArray
    weights: FloatArray
    lubrication: Lubrication
    removal_W_K: float
    sink_C: float
    search_limit_C: float
    reference_C: float
    capacity_W: float
    max_temperature_C: float
    extra_loss_W: float


def thermal_setup(model: Model, bearings: Sequence[tuple[Bearing, str]]
                  ) -> ThermalSetup | None:
    """The heat-balance data of ``model`` for ``bearings`` ((bearing, shaft id) pairs in
    result order); ``None`` when the model has no ``thermal`` section.

    Raises
    ------
    ModelError: heat-balance data without lubrication data, or a friction override for
        a bearing the model does not have.
    """
    hb = model.thermal
    if hb is None:
        return None
    lub = model.lubrication
    if lub is None:
        raise ModelError("the heat balance needs the lubricant's viscosity",
                         field="thermal", line=hb.line,
                         expected="a 'lubrication' section with viscosity_40C and "
                         "viscosity_100C")
    ids = tuple(b.id for b, _ in bearings)
    for bid in hb.friction:
        if bid not in ids:
            raise ModelError(f"friction factors for an unknown bearing '{bid}'",
                             field=f"thermal.friction.{bid}", line=hb.line,
                             expected="one of: " + ", ".join(ids))
    grease = lub.method == "grease"
    factors = []
    for b, _ in bearings:
        over = hb.friction.get(b.id)
        factors.append(friction_factors(b, grease, over.f0 if over else None,
                                        over.f1 if over else None))
    evaluated = np.array([c.kind is CaseKind.DUTY for c in model.cases], dtype=bool)
    duration = np.array([c.duration for c in model.cases], dtype=float)
    dur = np.where(evaluated, np.maximum(duration, 0.0), 0.0)
    weights = dur / dur.sum() if dur.sum() > 0.0 else dur
    reference_C = hb.ambient_C + hb.reference_rise_K
    inlet = hb.oil_inlet_C if hb.oil_inlet_C is not None else hb.ambient_C
    capacity = max(hb.conductance_W_K * (reference_C - hb.ambient_C)
                   + hb.oil_flow_W_K * (reference_C - inlet), 0.0)
    t_max = hb.max_temperature_C
    if t_max is None:
        t_max = DEFAULT_MAX_TEMPERATURE_GREASE_C if grease else DEFAULT_MAX_TEMPERATURE_OIL_C
    return ThermalSetup(
        bearing_ids=ids, shaft_ids=tuple(s for _, s in bearings),
        case_ids=tuple(c.id for c in model.cases), bearings=tuple(b for b, _ in bearings),
        factors=tuple(factors), f0=np.array([[f.f0] for f in factors], dtype=float),
        dm=np.array([[b.mean_diameter_mm] for b, _ in bearings], dtype=float),
        evaluated=evaluated, extra_W=np.where(evaluated, hb.extra_loss_W, 0.0),
        typed_C=np.array([c.temperature_C for c in model.cases], dtype=float),
        weights=weights, lubrication=lub, removal_W_K=hb.removal_W_K, sink_C=hb.sink_C,
        search_limit_C=hb.search_limit_C, reference_C=reference_C, capacity_W=capacity,
        max_temperature_C=float(t_max), extra_loss_W=hb.extra_loss_W)


@dataclass(frozen=True, eq=False)
class ThermalArrays:
    """The heat balance of V variants.

    Per (variant, bearing, case), shape (V, B, m): ``M0_Nmm``, ``M1_Nmm``,
    ``friction_moment_Nmm``, ``power_loss_W`` (at the temperature used; NaN where there
    is none), ``heat_balance_speed_rpm``. Per (variant, case), shape (V, m):
    ``computed_C`` (NaN where runaway or not a duty case), ``used_C`` (typed wins),
    ``converged``, ``runaway`` (duty cases only), ``stuck`` (a bracketed duty case that
    did not converge: a numerical failure), ``iterations``, ``residual_W``,
    ``total_power_W`` (bearings + extra loss), ``temperature_ok``, ``speed_ok``,
    ``speed_factor`` (s of the heat-balance speed; >= 1 passes).
    """

    M0_Nmm: FloatArray
    M1_Nmm: FloatArray
    friction_moment_Nmm: FloatArray
    power_loss_W: FloatArray
    heat_balance_speed_rpm: FloatArray
    computed_C: FloatArray
    used_C: FloatArray
    converged: BoolArray
    runaway: BoolArray
    stuck: BoolArray
    iterations: FloatArray
    residual_W: FloatArray
    total_power_W: FloatArray
    temperature_ok: BoolArray
    speed_ok: BoolArray
    speed_factor: FloatArray


def balance(setup: ThermalSetup, Fr_N: npt.ArrayLike, Fa_N: npt.ArrayLike,
            speed_rpm: npt.ArrayLike) -> ThermalArrays:
    """Friction, power loss and temperature of V variants.

    Parameters
    ----------
    setup: from :func:`thermal_setup`.
    Fr_N, Fa_N: radial and axial bearing loads [N], shape (V, B, m).
    speed_rpm: bearing speeds [rpm] (sign ignored), broadcastable to (V, B, m).
    """
    Fr = np.asarray(Fr_N, dtype=np.float64)
    Fa = np.asarray(Fa_N, dtype=np.float64)
    V, B, m = Fr.shape
    ev = setup.evaluated
    n = np.where(ev[None, None, :], np.abs(np.broadcast_to(
        np.asarray(speed_rpm, dtype=np.float64), (V, B, m))), 0.0)
    M1 = np.zeros((V, B, m))
    for i, b in enumerate(setup.bearings):
        f1 = f1_value(setup.factors[i], static_load_ratio(b, Fr[:, i], Fa[:, i]))
        M1[:, i] = load_moment(f1, friction_load(b, Fr[:, i], Fa[:, i]), setup.dm[i, 0])
    lub = setup.lubrication
    f0 = setup.f0[None]                      # (1, B, 1)
    dm = setup.dm[None]

    def nu(t: FloatArray) -> FloatArray:
        return viscosity_at(t, lub.nu1_at_t1_mm2_s, lub.t1_C, lub.nu2_at_t2_mm2_s, lub.t2_C)

    def moments(nu_t: FloatArray, speed: FloatArray) -> FloatArray:
        """M0 [N*mm] (V, B, m) at the viscosity nu_t (V, 1, m) (reported values)."""
        M0 = viscous_moment(f0, nu_t, speed, dm)
        return np.where(speed > 0.0, M0, 0.0)

    # The iterations evaluate the heat some 100 times: Palmgren's M0 is factored as
    # k_hi * n^(2/3) * nu^(2/3) (nu*n >= NU_N_BREAK) or k_lo, so that the powers of the
    # speeds are taken once and those of the viscosity once per (variant, case), not
    # per bearing (the same formula as viscous_moment, to round-off).
    on = n > 0.0
    k_hi = M0_COEFF * f0 * dm**3                          # (1, B, 1)
    k_lo = np.where(on, M0_COEFF_LOW * f0 * dm**3, 0.0)   # (V, B, m)
    a_hi = np.where(on, k_hi * n ** (2.0 / 3.0), 0.0)
    w_rad = 2.0 * math.pi * n / 60.0 / 1000.0             # omega/1000: W per N*mm
    M1w = (M1 * w_rad).sum(axis=1)                        # (V, m) load-dependent power

    def heat(t_flat: FloatArray) -> FloatArray:
        nu_t = nu(t_flat).reshape(V, 1, m)
        M0 = np.where(nu_t * n >= NU_N_BREAK, a_hi * nu_t ** (2.0 / 3.0), k_lo)
        q = (M0 * w_rad).sum(axis=1) + M1w + setup.extra_W
        return np.asarray(q, dtype=np.float64).reshape(-1)

    sol = solve_temperature(heat, setup.removal_W_K, setup.sink_C, setup.search_limit_C,
                            V * m)
    evm = np.broadcast_to(ev, (V, m))
    converged = sol.converged.reshape(V, m)
    runaway = sol.runaway.reshape(V, m) & evm
    stuck = evm & ~converged & ~runaway
    computed = np.where(evm, sol.temperature_C.reshape(V, m), np.nan)
    typed = np.broadcast_to(setup.typed_C, (V, m))
    used = np.where(np.isfinite(typed), typed, computed)
    has = np.isfinite(used)[:, None, :]
    safe_t = np.where(np.isfinite(used), used, setup.sink_C)
    M0 = np.where(has, moments(nu(safe_t).reshape(V, 1, m), n), np.nan)
    M1u = np.where(has, M1, np.nan)
    M = M0 + M1u
    power = friction_power_W(M, n)
    nu_ref = nu(np.full(V * m, setup.reference_C)).reshape(V, 1, m)
    x_ref = nu_ref * n                                    # nu*n at the reference, s = 1
    a_ref = a_hi * nu_ref ** (2.0 / 3.0)                  # M0 of the upper branch at s = 1

    def heat_at(s_flat: FloatArray) -> FloatArray:
        """Heat [W] with every speed times s: M0 = a_ref s^(2/3) (or k_lo), W = M omega s."""
        s3 = s_flat.reshape(V, 1, m)
        M0 = np.where(x_ref * s3 >= NU_N_BREAK, a_ref * s3 ** (2.0 / 3.0), k_lo)
        q = ((M0 * w_rad).sum(axis=1, keepdims=True) + M1w[:, None, :]) * s3
        return np.asarray(q[:, 0, :] + setup.extra_W, dtype=np.float64).reshape(-1)

    cap = np.broadcast_to(np.where(ev, setup.capacity_W, np.inf), (V, m)).reshape(-1)
    s = speed_factor(heat_at, cap).reshape(V, m)
    turning = evm[:, None, :] & (n > 0.0)
    limit_rpm = np.where(turning, s[:, None, :] * np.where(turning, n, 1.0), np.nan)
    temperature_ok = ~evm | (np.isfinite(used) & (used <= setup.max_temperature_C))
    speed_ok = ~evm | (s >= 1.0)
    total = np.where(np.isfinite(used), np.nansum(power, axis=1) + setup.extra_W, np.nan)
    return ThermalArrays(
        M0_Nmm=M0, M1_Nmm=M1u, friction_moment_Nmm=M, power_loss_W=power,
        heat_balance_speed_rpm=limit_rpm, computed_C=computed, used_C=used,
        converged=converged, runaway=runaway, stuck=stuck,
        iterations=sol.iterations.reshape(V, m), residual_W=sol.residual_W.reshape(V, m),
        total_power_W=total, temperature_ok=temperature_ok, speed_ok=speed_ok,
        speed_factor=s)


# ------------------------------------------------------------------ per-variant figures
@dataclass(frozen=True, eq=False)
class VariantThermal:
    """The heat balance of V variants in a study's words.

    Per (variant, bearing), shape (V, B): ``temperature_max_C`` (the hottest duty case's
    temperature used; one housing, so equal for every bearing of a variant),
    ``power_loss_W`` (duration-weighted mean over the duty cases: sum t_k W_k / sum t_k,
    standstill cases counting with W = 0), ``power_loss_max_W`` (largest case).
    Per variant (V,): ``total_power_loss_W`` (bearings + extra loss, duration-weighted
    mean), ``total_power_loss_max_W``, ``variant_temperature_max_C`` (as the bearings'),
    ``computed_temperature_max_C`` (the hottest the balance gives, typed or not),
    ``speed_factor_min``
    (smallest factor of the heat-balance speed over the duty cases), ``runaway``,
    ``ok`` (the single run's thermal verdict: every duty case balances below the search
    limit, stays at or below the admissible temperature and below its heat-balance
    speed), ``reason`` (why not ok; "" when ok). Figures of a variant with runaway are
    NaN (no steady state).
    """

    temperature_max_C: FloatArray
    power_loss_W: FloatArray
    power_loss_max_W: FloatArray
    total_power_loss_W: FloatArray
    total_power_loss_max_W: FloatArray
    variant_temperature_max_C: FloatArray
    computed_temperature_max_C: FloatArray
    speed_factor_min: FloatArray
    runaway: BoolArray
    ok: BoolArray
    reason: npt.NDArray[np.object_]

    @classmethod
    def empty(cls, V: int, B: int) -> VariantThermal:
        """V variants without results (NaN figures, not ok, no reason)."""
        def f(*shape: int) -> FloatArray:
            return np.full(shape, np.nan)

        return cls(f(V, B), f(V, B), f(V, B), f(V), f(V), f(V), f(V), f(V),
                   np.zeros(V, dtype=bool), np.zeros(V, dtype=bool),
                   np.full(V, "", dtype=object))

    def put(self, rows: npt.NDArray[np.intp], other: VariantThermal) -> None:
        """Copy ``other`` (len(rows) variants) into ``rows``."""
        for name in self.__dataclass_fields__:
            getattr(self, name)[rows] = getattr(other, name)


def merged(into: VariantThermal | None, rows: npt.NDArray[np.intp],
           other: VariantThermal | None, V: int) -> VariantThermal | None:
    """``into`` (allocated for V variants when ``None``) with ``other`` put at ``rows``."""
    if other is None:
        return into
    if into is None:
        into = VariantThermal.empty(V, other.power_loss_W.shape[1])
    into.put(rows, other)
    return into


def study_balance(setup: ThermalSetup, Fr_N: FloatArray, Fa_N: FloatArray,
                  speed_rpm: FloatArray, rows: npt.NDArray[np.intp]
                  ) -> tuple[VariantThermal, FloatArray, npt.NDArray[np.object_]]:
    """The heat balance of the variants ``rows`` of a study block of V variants.

    Fr_N, Fa_N: (V, B, m) bearing loads [N]; speed_rpm: (m,) the shaft's case speeds
    [rpm] (one shaft: every bearing turns at it). Returns the per-variant figures (V
    variants, NaN outside ``rows``), the temperatures [degC] the lives use (V, m; typed
    wins, NaN where none) and per variant the reason of a numerical failure ("" = none):
    a bracketed duty case that did not converge, as the single run's NumericalError.
    """
    V, B, m = Fr_N.shape
    th = balance(setup, Fr_N[rows], Fa_N[rows], speed_rpm[None, None, :])
    out = VariantThermal.empty(V, B)
    out.put(rows, per_variant(setup, th))
    temps = np.full((V, m), np.nan)
    temps[rows] = th.used_C
    err = np.full(V, "", dtype=object)
    stuck = th.stuck.any(axis=1)
    if np.any(stuck):
        first = np.argmax(th.stuck, axis=1)
        texts = np.array([f"NumericalError: heat balance of case '{c}' did not converge "
                          "(numerical failure, not a result)" for c in setup.case_ids],
                         dtype=object)
        err[rows[stuck]] = texts[first[stuck]]
    return out, temps, err


def from_result(setup: ThermalSetup, tr: ThermalResult) -> VariantThermal:
    """The per-variant figures of one single run's heat balance (a study variant that
    ran :func:`shaftsys.analyse`).
    """
    def one(x: Any) -> Any:
        return np.asarray(x)[None]

    th = ThermalArrays(
        M0_Nmm=one(tr.M0_Nmm), M1_Nmm=one(tr.M1_Nmm),
        friction_moment_Nmm=one(tr.friction_moment_Nmm), power_loss_W=one(tr.power_loss_W),
        heat_balance_speed_rpm=one(tr.heat_balance_speed_rpm), computed_C=one(tr.computed_C),
        used_C=one(tr.used_C), converged=one(tr.converged), runaway=one(tr.runaway),
        stuck=np.zeros((1, len(tr.case_ids)), dtype=bool), iterations=one(tr.iterations),
        residual_W=one(tr.residual_W), total_power_W=one(tr.total_power_W),
        temperature_ok=one(tr.temperature_ok), speed_ok=one(tr.speed_ok),
        speed_factor=one(tr.speed_factor))
    return per_variant(setup, th)


def per_variant(setup: ThermalSetup, th: ThermalArrays) -> VariantThermal:
    """Reduce :class:`ThermalArrays` over the cases (see :class:`VariantThermal`)."""
    ev = setup.evaluated
    V, B, m = th.power_loss_W.shape
    runaway = np.asarray(th.runaway.any(axis=1), dtype=bool)
    w = setup.weights
    with np.errstate(invalid="ignore"):
        if ev.any():
            p_ev = th.power_loss_W[:, :, ev]
            mean = (p_ev * w[ev]).sum(axis=2)
            pmax = p_ev.max(axis=2)
            tot_ev = th.total_power_W[:, ev]
            tot_mean = (tot_ev * w[ev]).sum(axis=1)
            tot_max = tot_ev.max(axis=1)
            tmax = th.used_C[:, ev].max(axis=1)
            cmax = th.computed_C[:, ev].max(axis=1)
            smin = th.speed_factor[:, ev].min(axis=1)
        else:
            mean = pmax = np.full((V, B), np.nan)
            tot_mean = tot_max = tmax = cmax = smin = np.full(V, np.nan)
    t_ok = th.temperature_ok[:, ev].all(axis=1)
    s_ok = th.speed_ok[:, ev].all(axis=1)
    ok = np.asarray(t_ok & s_ok & ~runaway, dtype=bool)
    # why not: the first failing duty case (in case order) of the first failing check
    reason = np.full(V, "", dtype=object)
    texts: list[str] = []
    codes = np.full(V, -1, dtype=np.intp)
    for c, (bad, text) in enumerate((
            (th.runaway, "thermal runaway in case '{}' (no steady temperature up to "
                         f"{setup.search_limit_C:g} degC)"),
            (~th.temperature_ok, "operating temperature above the maximum "
                                 f"{setup.max_temperature_C:g} degC in case '{{}}'"),
            (~th.speed_ok, "bearing speed above the heat-balance speed in case '{}'"))):
        hit = (bad & ev[None, :]).any(axis=1) & (codes < 0)
        first = np.argmax(bad & ev[None, :], axis=1)
        codes = np.where(hit, c * m + first, codes)
        texts.extend(text.format(cid) for cid in setup.case_ids)
    table = np.empty(len(texts), dtype=object)
    table[:] = texts
    reason[codes >= 0] = table[codes[codes >= 0]]
    tmax_b = np.broadcast_to(tmax[:, None], (V, B)).copy()
    return VariantThermal(
        temperature_max_C=tmax_b, power_loss_W=mean, power_loss_max_W=pmax,
        total_power_loss_W=tot_mean, total_power_loss_max_W=tot_max,
        variant_temperature_max_C=tmax, computed_temperature_max_C=cmax,
        speed_factor_min=smin, runaway=runaway, ok=ok,
        reason=reason)


__all__ = ["ThermalArrays", "ThermalSetup", "VariantThermal", "balance", "from_result",
           "merged", "per_variant", "study_balance", "thermal_setup"]
