"""Lives: the solved bearing loads through the ISO 281 life engine.

Builds every bearing's load spectrum straight from the solver (nobody types a bearing
load), evaluates it, and combines the bearings of each shaft and of the whole machine
into a system life (Weibull survival, Lundberg-Palmgren slopes).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from shaftsys.analysis.results import BearingResult
from shaftsys.bearings.engine import LoadSpectrum, evaluate_bearing, system_life
from shaftsys.model import CaseKind, Model


def spectrum_of(model: Model, result: BearingResult,
                temperatures: dict[str, float] | None = None) -> LoadSpectrum:
    """The load spectrum of one bearing: Fr, Fa, signed speed, duration per case.

    Peak and static cases, and cases slower than ``model.life.min_speed_rpm``, are
    static-only (the engine records why). ``temperatures`` (case id -> degC, e.g. from
    the heat balance) replaces the cases' typed temperatures where given and finite.
    """
    cases = {c.id: c for c in model.cases}
    loads = result.loads
    static_only = [cases[ld.case].kind is not CaseKind.DUTY for ld in loads]
    return LoadSpectrum.build(
        case_ids=[ld.case for ld in loads],
        Fr_N=[ld.Fr_N for ld in loads],
        Fa_N=[ld.Fa_N for ld in loads],
        speed_rpm=[ld.speed_rpm for ld in loads],
        duration=[cases[ld.case].duration for ld in loads],
        duration_in_hours=model.duration_in_hours,
        static_only=static_only,
        temperature_C=[_temperature(cases[ld.case].temperature_C, ld.case, temperatures)
                       for ld in loads],
    )


def _temperature(typed: float, case: str, temperatures: dict[str, float] | None) -> float:
    if temperatures is None:
        return typed
    value = temperatures.get(case, math.nan)
    return value if math.isfinite(value) else typed


@dataclass(frozen=True, eq=False)
class Lives:
    """Every bearing's life verdict and the system lives of each shaft and the machine.

    ``bearings``: the bearing results with their life; ``shaft_system``: shaft id ->
    (system life [h], limiting bearing id); ``system_life_h``, ``limiting_bearing``: the
    whole machine. A system life is ``math.inf`` when no bearing wears (no dynamic case),
    ``None`` when a bearing of it was not evaluated.
    """

    bearings: tuple[BearingResult, ...]
    shaft_system: dict[str, tuple[float | None, str | None]]
    system_life_h: float | None
    limiting_bearing: str | None


def evaluate_lives(model: Model, bearings: tuple[BearingResult, ...],
                   temperatures: dict[str, float] | None = None) -> Lives:
    """Life verdict of every bearing from its solved loads, and the system lives.

    System life combines the bearings' lives at 90 % reliability on the verdict's basis
    (basic L10 when the verdict uses a1*L10, aISO*L10 when it uses Lnm) and is stated
    at the model's default target reliability. A support still open (no catalogue row
    qualified) has no bearing to evaluate: its life stays ``None`` (not evaluated).
    ``temperatures``: case id -> operating temperature [degC] from the heat balance.
    """
    still_open = {o.bearing_id for o in model.open_seats}
    done = tuple(b if b.bearing.id in still_open else
                 replace(b, life=evaluate_bearing(b.bearing, spectrum_of(model, b, temperatures),
                                                  model.life, model.lubrication))
                 for b in bearings)
    per_shaft: dict[str, tuple[float | None, str | None]] = {}
    all_l90: list[float] = []
    all_kinds: list[str] = []
    all_ids: list[str] = []
    reliability = model.life.target_reliability
    for s in model.shafts:
        mine = [b for b in done if b.shaft_id == s.id]
        l90 = [_life90_h(b) for b in mine]
        kinds = [b.bearing.kind.value for b in mine]
        life_h, idx = _system(l90, kinds, reliability)
        per_shaft[s.id] = (life_h, None if idx is None else mine[idx].bearing.id)
        all_l90 += l90
        all_kinds += kinds
        all_ids += [b.bearing.id for b in mine]
    life_h, idx = _system(all_l90, all_kinds, reliability)
    return Lives(done, per_shaft, life_h, None if idx is None else all_ids[idx])


def _life90_h(b: BearingResult) -> float:
    """Life at 90 % reliability [h] on the verdict basis (Lnm / a1); NaN when the
    bearing was not evaluated.
    """
    if b.life is None:
        return math.nan
    if not math.isfinite(b.life.Lnm_h):
        return math.inf
    return float(b.life.Lnm_h / b.life.a1)


def _system(lives: list[float], kinds: list[str], reliability: float
            ) -> tuple[float | None, int | None]:
    """System life [h] and the index of the limiting bearing; ``None`` when a bearing
    was not evaluated (NaN life).
    """
    if any(math.isnan(v) for v in lives):
        return None, None
    finite = [i for i, v in enumerate(lives) if math.isfinite(v)]
    if not finite:
        return math.inf, None
    life, idx = system_life(np.array([lives[i] for i in finite]),
                            [kinds[i] for i in finite], reliability)
    return float(life), (None if idx is None else finite[idx])


def worst_case(b: BearingResult) -> str | None:
    """The duty case that does the most damage to the bearing (largest U_i / Lnm_i)."""
    if b.life is None:
        return None
    life = b.life
    damage = np.where(life.dynamic, life.weights / np.where(life.case_Lnm_h > 0,
                                                            life.case_Lnm_h, np.inf), -1.0)
    if not np.any(life.dynamic):
        return life.s0_case
    return life.case_ids[int(np.nanargmax(damage))]
