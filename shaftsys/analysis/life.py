"""Lives: the solved bearing loads through the ISO 281 life engine.

Builds every bearing's load spectrum straight from the solver (nobody types a bearing
load), evaluates it, and combines the bearings of each shaft and of the whole machine
into a system life (Weibull survival, Lundberg-Palmgren slopes).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from shaftsys.analysis.results import (
    LIMITING_SPEED,
    MINIMUM_LOAD,
    BearingResult,
    OperatingCheck,
    SystemLife,
)
from shaftsys.bearings.engine import LoadSpectrum, evaluate_bearing
from shaftsys.bearings.static import MIN_LOAD_FRACTION_BALL, MIN_LOAD_FRACTION_ROLLER
from shaftsys.bearings.system import system_life
from shaftsys.model import CaseKind, CheckSettings, Model


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


def operating_checks(model: Model, b: BearingResult) -> tuple[OperatingCheck, ...]:
    """The limiting-speed and minimum-load checks of an evaluated bearing over its
    running (dynamic) cases, in the modes the model's ``checks:`` section sets.

    Speed: largest running |n| against the maker's limiting speed (passes at n <= limit;
    not evaluated without a limiting speed). Minimum load: smallest running equivalent
    load P = X Fr + Y Fa against f*C with f = 0.01 ball, 0.02 roller (passes at
    P >= f*C; common practice, no source). No running case: neither is evaluated.
    """
    life = b.life
    if life is None:
        return ()
    bid = b.bearing.id
    dyn = np.asarray(life.dynamic, dtype=bool)
    speed_mode = model.checks.mode("speed", bid)
    load_mode = model.checks.mode("min_load", bid)
    if not np.any(dyn):
        why = "no running case (no case enters the fatigue spectrum)"
        return (OperatingCheck(LIMITING_SPEED, None, b.bearing.limiting_speed_rpm, None,
                               None, speed_mode, why),
                OperatingCheck(MINIMUM_LOAD, None, None, None, None, load_mode, why))
    speeds = np.array([abs(ld.speed_rpm) for ld in b.loads], dtype=float)
    k = int(np.argmax(np.where(dyn, speeds, -np.inf)))
    n_max = float(speeds[k])
    lim = b.bearing.limiting_speed_rpm
    speed = (OperatingCheck(LIMITING_SPEED, n_max, None, None, life.case_ids[k], speed_mode,
                            "no limiting speed given")
             if lim is None else
             OperatingCheck(LIMITING_SPEED, n_max, lim, n_max / lim, life.case_ids[k],
                            speed_mode))
    P = np.asarray(life.P_N, dtype=float)
    j = int(np.argmin(np.where(dyn, P, np.inf)))
    frac = MIN_LOAD_FRACTION_ROLLER if b.bearing.kind.is_roller else MIN_LOAD_FRACTION_BALL
    p_min = frac * b.bearing.C_N
    load = OperatingCheck(MINIMUM_LOAD, float(P[j]), p_min, float(P[j]) / p_min,
                          life.case_ids[j], load_mode)
    return speed, load


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
    shaft_lives: dict[str, SystemLife] | None = None
    machine: SystemLife | None = None


def evaluate_lives(model: Model, bearings: tuple[BearingResult, ...],
                   temperatures: dict[str, float] | None = None) -> Lives:
    """Life verdict of every bearing from its solved loads, and the system lives.

    System life combines the bearings' lives at 90 % reliability on the verdict's basis
    (basic L10 when the verdict uses a1*L10, aISO*L10 when it uses Lnm) with the Weibull
    slopes of ``model.checks`` (Lundberg-Palmgren 10/9 ball, 9/8 roller by default); it
    is stated at the model's target reliability (``system_life_h``) and, in
    ``shaft_lives``/``machine``, also at 90 % with the target and the basis of its
    verdict. Each bearing also gets its limiting-speed and minimum-load checks. A
    support still open (no catalogue row qualified) has no bearing to evaluate: its
    life stays ``None`` (not evaluated).
    ``temperatures``: case id -> operating temperature [degC] from the heat balance.
    """
    still_open = {o.bearing_id for o in model.open_seats}
    evaluated = tuple(
        b if b.bearing.id in still_open else
        replace(b, life=evaluate_bearing(b.bearing, spectrum_of(model, b, temperatures),
                                         model.life, model.lubrication))
        for b in bearings)
    done = tuple(replace(b, operating=operating_checks(model, b)) for b in evaluated)
    per_shaft: dict[str, tuple[float | None, str | None]] = {}
    shaft_lives: dict[str, SystemLife] = {}
    all_l90: list[float] = []
    all_slopes: list[float] = []
    all_ids: list[str] = []
    cs = model.checks
    reliability = model.life.target_reliability
    for s in model.shafts:
        mine = [b for b in done if b.shaft_id == s.id]
        l90 = [_life90_h(b) for b in mine]
        slopes = [cs.weibull_slope(b.bearing.kind.is_roller) for b in mine]
        ids = [b.bearing.id for b in mine]
        shaft_lives[s.id] = _system_life(l90, slopes, ids, reliability,
                                         cs.shaft_target_h(s.id), cs)
        life_h, idx = _system(l90, slopes, reliability)
        per_shaft[s.id] = (life_h, None if idx is None else ids[idx])
        all_l90 += l90
        all_slopes += slopes
        all_ids += ids
    life_h, idx = _system(all_l90, all_slopes, reliability)
    machine = _system_life(all_l90, all_slopes, all_ids, reliability,
                           cs.system_life_target_h, cs)
    return Lives(done, per_shaft, life_h, None if idx is None else all_ids[idx],
                 shaft_lives, machine)


def _system_life(l90: list[float], slopes: list[float], ids: list[str],
                 reliability: float, target_h: float | None, cs: CheckSettings
                 ) -> SystemLife:
    """The system life of some bearings at the target reliability and at 90 %."""
    at_target, idx = _system(l90, slopes, reliability)
    at_90, _ = _system(l90, slopes, 0.9)
    return SystemLife(at_target, at_90, reliability, cs.system_reliability, target_h,
                      None if idx is None else ids[idx], cs.weibull_slope_ball,
                      cs.weibull_slope_roller)


def _life90_h(b: BearingResult) -> float:
    """Life at 90 % reliability [h] on the verdict basis (Lnm / a1); NaN when the
    bearing was not evaluated.
    """
    if b.life is None:
        return math.nan
    if not math.isfinite(b.life.Lnm_h):
        return math.inf
    return float(b.life.Lnm_h / b.life.a1)


def _system(lives: list[float], slopes: list[float], reliability: float
            ) -> tuple[float | None, int | None]:
    """System life [h] and the index of the limiting bearing; ``None`` when a bearing
    was not evaluated (NaN life). ``slopes``: the Weibull slope of each bearing.
    """
    if any(math.isnan(v) for v in lives):
        return None, None
    finite = [i for i, v in enumerate(lives) if math.isfinite(v)]
    if not finite:
        return math.inf, None
    life, idx = system_life(np.array([lives[i] for i in finite]),
                            np.array([slopes[i] for i in finite]), reliability)
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
