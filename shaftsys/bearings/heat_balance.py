"""Steady heat balance of a lubricated housing, solved per case (pure, vectorised).

Heat generated (bearing friction, which depends on the oil's viscosity and so on the
temperature T, plus a fixed extra loss) equals heat removed:

    Q_gen(T) = G*(T - T_ambient) + Wc*(T - T_inlet) = H*(T - T_sink)

with G the housing's conductance to ambient [W/K] (h*A or 1/R_th), Wc = rho*c*Q the
heat capacity rate of a circulating oil flow [W/K] (oil leaves at T, a well-mixed sump),
H = G + Wc and T_sink = (G*T_ambient + Wc*T_inlet)/H. Since the friction of a rolling
bearing falls as the oil thins, f(T) = Q_gen(T) - H*(T - T_sink) is positive at T_sink
and decreasing; the root is found by Newton steps kept inside a bisection bracket
[T_sink, T_max]. When f(T_max) > 0 no balance exists below T_max: thermal runaway (a
result, not a crash). Units: degC, W, W/K.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from shaftsys.bearings._util import BoolArray, FloatArray

HeatFunction = Callable[[FloatArray], FloatArray]

#: Step of the numerical derivative [K].
DERIVATIVE_STEP_K = 1e-3
#: Convergence: temperature change [K] and residual relative to the heat flow [-].
TOL_K = 1e-7
TOL_RELATIVE = 1e-9
MAX_ITERATIONS = 200


@dataclass(frozen=True, eq=False)
class BalanceSolution:
    """Per case (shape (m,)): ``temperature_C`` (NaN where runaway or not converged),
    ``converged``, ``runaway`` (no balance below ``t_max_C``), ``iterations``,
    ``residual_W`` (|Q_gen - H*(T - T_sink)| at the answer), ``heat_W`` (Q_gen at T).
    """

    temperature_C: FloatArray
    converged: BoolArray
    runaway: BoolArray
    iterations: FloatArray
    residual_W: FloatArray
    heat_W: FloatArray
    t_max_C: float


def solve_temperature(heat_W: HeatFunction, removal_W_K: float, sink_C: float,
                      t_max_C: float, m: int) -> BalanceSolution:
    """Temperature [degC] of each of ``m`` cases where ``heat_W(T) = H*(T - T_sink)``.

    Parameters
    ----------
    heat_W: T [degC], shape (m,) -> heat generated [W], shape (m,); must not increase
        with T for the bracket to hold (bearing friction does not).
    removal_W_K: H = G + Wc [W/K], > 0.
    sink_C: T_sink [degC], the temperature the housing settles at without heat.
    t_max_C: the upper end of the search [degC].
    m: number of cases.
    """
    if not removal_W_K > 0.0:
        raise ValueError("heat removal H must be > 0 W/K")
    lo = np.full(m, float(sink_C))
    hi = np.full(m, float(t_max_C))

    def f(t: FloatArray) -> FloatArray:
        return np.asarray(heat_W(t), dtype=np.float64) - removal_W_K * (t - sink_C)

    f_hi = f(hi)
    runaway = f_hi > 0.0
    active = ~runaway & np.isfinite(f_hi)
    # start from the load-independent estimate at the sink temperature
    q0 = np.asarray(heat_W(lo), dtype=np.float64)
    t = np.clip(sink_C + q0 / removal_W_K, lo, hi)
    t = np.where(np.isfinite(t), t, 0.5 * (lo + hi))
    converged = np.zeros(m, dtype=bool)
    iterations = np.zeros(m)
    for _ in range(MAX_ITERATIONS):
        if not np.any(active & ~converged):
            break
        work = active & ~converged
        ft = f(t)
        # tighten the bracket: f > 0 means the root lies above t
        lo = np.where(work & (ft > 0.0), t, lo)
        hi = np.where(work & (ft <= 0.0), t, hi)
        dfdt = (f(t + DERIVATIVE_STEP_K) - ft) / DERIVATIVE_STEP_K
        with np.errstate(divide="ignore", invalid="ignore"):
            newton = t - ft / dfdt
        # a Newton step onto the bracket's end is kept: at the root f(t) may be a
        # round-off above 0, so lo = t and the step returns t itself (bisecting away
        # from it would cost some 25 halvings back to 1e-7 K)
        ok = np.isfinite(newton) & (newton >= lo) & (newton <= hi)
        t_new = np.where(ok, newton, 0.5 * (lo + hi))
        scale = np.maximum(np.abs(removal_W_K * (t - sink_C)), 1e-12)
        done = (np.abs(t_new - t) < TOL_K) & (np.abs(ft) <= TOL_RELATIVE * scale + 1e-9)
        iterations = np.where(work, iterations + 1, iterations)
        t = np.where(work, t_new, t)
        converged = converged | (work & (done | ((hi - lo) < TOL_K)))
        bad = work & ~np.isfinite(ft)
        active = active & ~bad
    heat = np.asarray(heat_W(t), dtype=np.float64)
    residual = np.abs(heat - removal_W_K * (t - sink_C))
    good = converged & ~runaway
    return BalanceSolution(
        temperature_C=np.where(good, t, np.nan), converged=good, runaway=runaway,
        iterations=iterations, residual_W=np.where(good, residual, np.nan),
        heat_W=np.where(good, heat, np.nan), t_max_C=float(t_max_C))


#: Step of the numerical derivative in ln s [-] and convergence of ln s [-].
DERIVATIVE_STEP_LN = 1e-6
TOL_LN = 1e-12


def speed_factor(heat_at_factor: HeatFunction, capacity_W: FloatArray,
                 *, s_min: float = 1e-6, s_max: float = 1e6, steps: int = 100) -> FloatArray:
    """Per case, the factor s on all speeds at which the heat equals ``capacity_W``.

    ``heat_at_factor(s)`` [W] must increase with s (friction heat rises with speed).
    Newton steps on ln(heat) - ln(capacity) in u = ln s (numerical derivative), started
    at s = 1 and kept inside a bisection bracket over [s_min, s_max], each entry
    converged on its own to ``TOL_LN`` in ln s (at most ``steps`` iterations); 0 where
    even s_min generates too much heat, ``inf`` where s_max still generates too little.
    """
    cap = np.asarray(capacity_W, dtype=np.float64)
    m = cap.shape[0]
    lo = np.full(m, np.log(s_min))
    hi = np.full(m, np.log(s_max))
    too_hot = np.asarray(heat_at_factor(np.exp(lo))) > cap
    too_cold = np.asarray(heat_at_factor(np.exp(hi))) < cap
    done = too_hot | too_cold
    u = np.clip(np.zeros(m), lo, hi)
    for _ in range(steps):
        if np.all(done):
            break
        with np.errstate(invalid="ignore", divide="ignore"):
            # ln(heat) - ln(capacity) is close to linear in ln s (friction heat grows
            # like s to s^(5/3)), so Newton converges in a few steps from s = 1
            g = np.log(np.asarray(heat_at_factor(np.exp(u)))) - np.log(cap)
            above = g > 0.0
            hi = np.where(~done & above, u, hi)
            lo = np.where(~done & ~above, u, lo)
            dg = (np.log(np.asarray(heat_at_factor(np.exp(u + DERIVATIVE_STEP_LN))))
                  - np.log(cap) - g) / DERIVATIVE_STEP_LN
            newton = u - g / dg
        ok = np.isfinite(newton) & (newton >= lo) & (newton <= hi)
        u_new = np.where(ok, newton, 0.5 * (lo + hi))
        conv = (np.abs(u_new - u) < TOL_LN) | (hi - lo < TOL_LN)
        u = np.where(done, u, u_new)
        done = done | conv
    s = np.exp(u)
    return np.where(too_hot, 0.0, np.where(too_cold, np.inf, s))


__all__ = ["BalanceSolution", "solve_temperature", "speed_factor"]
