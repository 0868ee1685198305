"""Bearing friction and the housing's operating temperature per case.

From the solved bearing loads: Palmgren's friction moment per bearing and case
(:mod:`shaftsys.bearings.friction`), its power loss, and the oil temperature where the
housing sheds the heat generated (:mod:`shaftsys.bearings.heat_balance`), solved together
with the Walther viscosity of the lubricant. One housing holds every bearing of the
machine (one lumped temperature per case). The life engine takes the computed
temperature in every duty case without a typed one.

Checks per case: a balance exists below the search limit (else thermal runaway, a failed
check), the temperature used is at most the admissible maximum, and every bearing turns
no faster than its heat-balance speed (the speed at which the friction heat equals what
the housing removes at the reference temperature rise). Units: N, mm, N*mm, rpm, W,
W/K, degC.
"""

from __future__ import annotations

import math

import numpy as np

from shaftsys.analysis.results import BearingResult
from shaftsys.analysis.thermal_results import COMPUTED, NOT_COMPUTED, TYPED, ThermalResult
from shaftsys.bearings._util import FloatArray
from shaftsys.bearings.friction import (
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
from shaftsys.errors import ModelError, NumericalError
from shaftsys.model import CaseKind, Model
from shaftsys.model.thermal import (
    DEFAULT_MAX_TEMPERATURE_GREASE_C,
    DEFAULT_MAX_TEMPERATURE_OIL_C,
)


def evaluate_thermal(model: Model, bearings: tuple[BearingResult, ...]) -> ThermalResult | None:
    """Friction and temperature of every bearing and duty case; ``None`` without data.

    Raises
    ------
    ModelError: heat-balance data without lubrication data, or a friction override for
        a bearing the model does not have.
    NumericalError: the iteration did not converge in a case that has a balance.
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
    ids = tuple(b.bearing.id for b in bearings)
    for bid in hb.friction:
        if bid not in ids:
            raise ModelError(f"friction factors for an unknown bearing '{bid}'",
                             field=f"thermal.friction.{bid}", line=hb.line,
                             expected="one of: " + ", ".join(ids))
    cases = {c.id: c for c in model.cases}
    case_ids = tuple(c.id for c in model.cases)
    m = len(case_ids)
    B = len(bearings)
    grease = lub.method == "grease"
    evaluated = np.array([cases[c].kind is CaseKind.DUTY for c in case_ids])
    f0 = np.zeros((B, 1))
    dm = np.zeros((B, 1))
    M1 = np.zeros((B, m))
    n = np.zeros((B, m))
    f0_given: list[bool] = []
    f1_given: list[bool] = []
    for i, b in enumerate(bearings):
        over = hb.friction.get(b.bearing.id)
        fac = friction_factors(b.bearing, grease, over.f0 if over else None,
                               over.f1 if over else None)
        f0_given.append(fac.f0_given)
        f1_given.append(fac.f1_given)
        f0[i, 0] = fac.f0
        dm[i, 0] = b.bearing.mean_diameter_mm
        by_case = {ld.case: ld for ld in b.loads}
        Fr = np.array([by_case[c].Fr_N if c in by_case else 0.0 for c in case_ids])
        Fa = np.array([by_case[c].Fa_N if c in by_case else 0.0 for c in case_ids])
        n[i] = [abs(by_case[c].speed_rpm) if c in by_case else 0.0 for c in case_ids]
        f1 = f1_value(fac, static_load_ratio(b.bearing, Fr, Fa))
        M1[i] = load_moment(f1, friction_load(b.bearing, Fr, Fa), dm[i, 0])
    n = np.where(evaluated[None, :], n, 0.0)

    def nu(t: FloatArray) -> FloatArray:
        return viscosity_at(t, lub.nu1_at_t1_mm2_s, lub.t1_C, lub.nu2_at_t2_mm2_s, lub.t2_C)

    def moments(t: FloatArray, speed: FloatArray) -> FloatArray:
        M0 = viscous_moment(f0, nu(t)[None, :], speed, dm)
        return np.where(speed > 0.0, M0, 0.0)

    extra = np.where(evaluated, hb.extra_loss_W, 0.0)

    def heat(t: FloatArray) -> FloatArray:
        return friction_power_W(moments(t, n) + M1, n).sum(axis=0) + extra

    sol = solve_temperature(heat, hb.removal_W_K, hb.sink_C, hb.search_limit_C, m)
    stuck = evaluated & ~sol.converged & ~sol.runaway
    if np.any(stuck):
        k = int(np.flatnonzero(stuck)[0])
        raise NumericalError(
            f"heat balance of case '{case_ids[k]}' did not converge in "
            f"{int(sol.iterations[k])} iterations (numerical failure, not a result)")
    computed = np.where(evaluated, sol.temperature_C, np.nan)
    typed = np.array([cases[c].temperature_C for c in case_ids], dtype=float)
    used = np.where(np.isfinite(typed), typed, computed)
    source = tuple(TYPED if math.isfinite(typed[k]) else
                   COMPUTED if evaluated[k] and math.isfinite(computed[k]) else NOT_COMPUTED
                   for k in range(m))
    safe_t = np.where(np.isfinite(used), used, hb.sink_C)
    M0 = np.where(np.isfinite(used)[None, :], moments(safe_t, n), np.nan)
    M = M0 + np.where(np.isfinite(used)[None, :], M1, np.nan)
    power = friction_power_W(M, n)

    reference_C = hb.ambient_C + hb.reference_rise_K
    inlet = hb.oil_inlet_C if hb.oil_inlet_C is not None else hb.ambient_C
    capacity = max(hb.conductance_W_K * (reference_C - hb.ambient_C)
                   + hb.oil_flow_W_K * (reference_C - inlet), 0.0)
    t_ref = np.full(m, reference_C)

    def heat_at(s: FloatArray) -> FloatArray:
        speed = n * s[None, :]
        return friction_power_W(moments(t_ref, speed) + M1, speed).sum(axis=0) + extra

    s = speed_factor(heat_at, np.where(evaluated, capacity, np.inf))
    turning = evaluated[None, :] & (n > 0.0)
    limit_rpm = np.where(turning, s[None, :] * np.where(turning, n, 1.0), np.nan)
    t_max = hb.max_temperature_C
    if t_max is None:
        t_max = DEFAULT_MAX_TEMPERATURE_GREASE_C if grease else DEFAULT_MAX_TEMPERATURE_OIL_C
    temperature_ok = ~evaluated | (np.isfinite(used) & (used <= t_max))
    speed_ok = ~evaluated | (s >= 1.0)
    return ThermalResult(
        bearing_ids=ids, shaft_ids=tuple(b.shaft_id for b in bearings), case_ids=case_ids,
        f0=f0[:, 0], f0_given=tuple(f0_given), f1_given=tuple(f1_given),
        M0_Nmm=M0, M1_Nmm=np.where(np.isfinite(used)[None, :], M1, np.nan),
        friction_moment_Nmm=M, power_loss_W=power, heat_balance_speed_rpm=limit_rpm,
        computed_C=computed, typed_C=typed, used_C=used, source=source,
        converged=sol.converged, runaway=sol.runaway & evaluated,
        iterations=sol.iterations, residual_W=sol.residual_W,
        total_power_W=np.where(np.isfinite(used), np.nansum(power, axis=0) + extra, np.nan),
        extra_loss_W=hb.extra_loss_W, max_temperature_C=float(t_max),
        reference_C=reference_C, search_limit_C=hb.search_limit_C,
        temperature_ok=temperature_ok, speed_ok=speed_ok, evaluated=evaluated)


def thermal_notes(th: ThermalResult) -> list[str]:
    """Warnings for the user: runaway, hot cases, fast bearings, tabulated factors."""
    notes = []
    for k, cid in enumerate(th.case_ids):
        if th.runaway[k]:
            notes.append(f"case '{cid}': thermal runaway - the housing sheds less heat than "
                         f"the bearings generate at any temperature up to "
                         f"{th.search_limit_C:g} degC (failed check)")
        elif th.evaluated[k] and not th.temperature_ok[k]:
            notes.append(f"case '{cid}': operating temperature {th.used_C[k]:.4g} degC above "
                         f"the maximum {th.max_temperature_C:g} degC")
        if th.evaluated[k] and not th.speed_ok[k]:
            notes.append(f"case '{cid}': bearing speeds above the heat-balance speed (the "
                         f"friction heat exceeds what the housing removes at "
                         f"{th.reference_C:g} degC)")
        if th.source[k] == TYPED and math.isfinite(th.computed_C[k]):
            notes.append(f"case '{cid}': typed temperature {th.typed_C[k]:g} degC used; the "
                         f"heat balance gives {th.computed_C[k]:.4g} degC")
    untabled = [b for b, g0, g1 in zip(th.bearing_ids, th.f0_given, th.f1_given, strict=True)
                if not (g0 and g1)]
    if untabled:
        notes.append("friction factors f0/f1 taken from the Palmgren tables for bearing(s) "
                     + ", ".join(untabled) + " - give the supplier's values under "
                     "thermal.friction; the estimate does not replace a measured "
                     "temperature or the supplier's data")
    return notes


__all__ = ["COMPUTED", "NOT_COMPUTED", "TYPED", "ThermalResult", "evaluate_thermal",
           "thermal_notes"]
