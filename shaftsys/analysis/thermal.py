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
from shaftsys.analysis.thermal_batch import balance, thermal_setup
from shaftsys.analysis.thermal_results import COMPUTED, NOT_COMPUTED, TYPED, ThermalResult
from shaftsys.errors import NumericalError
from shaftsys.model import Model


def evaluate_thermal(model: Model, bearings: tuple[BearingResult, ...]) -> ThermalResult | None:
    """Friction and temperature of every bearing and duty case; ``None`` without data.

    The numbers come from :func:`shaftsys.analysis.thermal_batch.balance` with one
    variant, the core the design study runs with one row per variant.

    Raises
    ------
    ModelError: heat-balance data without lubrication data, or a friction override for
        a bearing the model does not have.
    NumericalError: the iteration did not converge in a case that has a balance.
    """
    setup = thermal_setup(model, [(b.bearing, b.shaft_id) for b in bearings])
    if setup is None:
        return None
    case_ids = setup.case_ids
    m = len(case_ids)
    B = len(bearings)
    Fr = np.zeros((1, B, m))
    Fa = np.zeros((1, B, m))
    n = np.zeros((1, B, m))
    for i, b in enumerate(bearings):
        by_case = {ld.case: ld for ld in b.loads}
        Fr[0, i] = [by_case[c].Fr_N if c in by_case else 0.0 for c in case_ids]
        Fa[0, i] = [by_case[c].Fa_N if c in by_case else 0.0 for c in case_ids]
        n[0, i] = [abs(by_case[c].speed_rpm) if c in by_case else 0.0 for c in case_ids]
    th = balance(setup, Fr, Fa, n)
    if np.any(th.stuck[0]):
        k = int(np.flatnonzero(th.stuck[0])[0])
        raise NumericalError(
            f"heat balance of case '{case_ids[k]}' did not converge in "
            f"{int(th.iterations[0, k])} iterations (numerical failure, not a result)")
    evaluated = setup.evaluated
    computed = th.computed_C[0]
    typed = setup.typed_C
    source = tuple(TYPED if math.isfinite(typed[k]) else
                   COMPUTED if evaluated[k] and math.isfinite(computed[k]) else NOT_COMPUTED
                   for k in range(m))
    return ThermalResult(
        bearing_ids=setup.bearing_ids, shaft_ids=setup.shaft_ids, case_ids=case_ids,
        f0=setup.f0[:, 0], f0_given=tuple(f.f0_given for f in setup.factors),
        f1_given=tuple(f.f1_given for f in setup.factors),
        M0_Nmm=th.M0_Nmm[0], M1_Nmm=th.M1_Nmm[0],
        friction_moment_Nmm=th.friction_moment_Nmm[0], power_loss_W=th.power_loss_W[0],
        heat_balance_speed_rpm=th.heat_balance_speed_rpm[0],
        computed_C=computed, typed_C=typed, used_C=th.used_C[0], source=source,
        converged=th.converged[0], runaway=th.runaway[0],
        iterations=th.iterations[0], residual_W=th.residual_W[0],
        total_power_W=th.total_power_W[0],
        extra_loss_W=setup.extra_loss_W, max_temperature_C=setup.max_temperature_C,
        reference_C=setup.reference_C, search_limit_C=setup.search_limit_C,
        temperature_ok=th.temperature_ok[0], speed_ok=th.speed_ok[0], evaluated=evaluated,
        speed_factor=th.speed_factor[0])


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
