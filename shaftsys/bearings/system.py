"""System life of several bearings (Lundberg-Palmgren two-parameter Weibull survival).

Each bearing survives to life L with S_i(L) = exp(ln(0.9)*(L/L10_i)^e_i), e = 10/9 ball,
9/8 roller. The system life L_sys is where prod S_i(L_sys) = R, i.e.
sum ln(0.9)*(L_sys/L10_i)^e_i = ln R, solved by Newton on ln L_sys. For equal
slopes there is the closed form L_sys = (ln R/ln 0.9)^(1/e) * (sum L10_i^-e)^(-1/e).

The lives given must be 90 %-reliability lives of each bearing (L10, or a modified life
with a1 = 1); the function works the same on basic or modified lives.
"""

from __future__ import annotations

import math

import numpy as np
import numpy.typing as npt

from shaftsys.bearings._util import FloatArray, as_float_array
from shaftsys.errors import ModelError, NumericalError

_LN09 = math.log(0.9)
BASES = ("basic", "modified")


def weibull_survival(life: npt.ArrayLike, L10: float, slope: float) -> FloatArray:
    """Survival probability S(L) = exp(ln(0.9)*(L/L10)^e) [-].

    Parameters
    ----------
    life:
        Life(s) L (same unit as ``L10``: h or 10^6 rev).
    L10:
        Life at 90 % survival (same unit).
    slope:
        Weibull slope e [-].
    """
    L = np.asarray(life, dtype=np.float64)
    if math.isinf(L10):
        return np.ones_like(L)
    return np.exp(_LN09 * (L / L10) ** slope)


def system_life(
    lives: npt.ArrayLike,
    slopes: npt.ArrayLike,
    reliability: float = 0.9,
    basis: str = "basic",
) -> tuple[float, int | None]:
    """System life and the limiting bearing.

    Parameters
    ----------
    lives:
        90 %-reliability life of each bearing (h or 10^6 rev; inf = never fails).
    slopes:
        Weibull slope e of each bearing [-] (``BearingKind.weibull_slope``).
    reliability:
        Required system reliability R [-], 0 < R < 1.
    basis:
        ``"basic"`` or ``"modified"`` (which lives the caller passes; label only).

    Returns
    -------
    (life, limiting_index):
        System life (unit of ``lives``) and the index of the bearing with the largest
        share of the failure probability at that life (``None`` if all lives are inf).
    """
    if basis not in BASES:
        raise ValueError(f"basis must be one of {BASES}, got {basis!r}")
    L = as_float_array(lives, "lives")
    e = as_float_array(slopes, "slopes")
    if L.shape != e.shape or L.size == 0:
        raise ValueError("lives and slopes need the same non-zero length")
    if not (0.0 < reliability < 1.0):
        raise ModelError(
            f"system reliability {reliability:g} outside (0, 1)",
            field="target_reliability",
            expected="0 < R < 1",
        )
    if np.any(~(L > 0.0)) or np.any(~(e > 0.0)):
        raise ValueError("lives and slopes must be > 0")
    finite = np.isfinite(L)
    if not np.any(finite):
        return math.inf, None
    Lf, ef = L[finite], e[finite]
    root = _newton_log_life(Lf, ef, math.log(reliability) / _LN09)
    hazard = np.zeros_like(L)
    hazard[finite] = -_LN09 * (root / Lf) ** ef
    return root, int(np.argmax(hazard))


def _newton_log_life(L: np.ndarray, e: np.ndarray, c: float) -> float:
    """The L with sum_i (L/L_i)^e_i = c (c > 0), by Newton's method on y = ln L.

    h(y) = sum_i exp(e_i (y - ln L_i)) is increasing and convex, so Newton started right
    of the root (at the smallest single-bearing root, where one term alone is c) falls
    monotonically onto it; it stops when a step is below 1e-15 of y (round-off), the
    rule of the batched study (:func:`shaftsys.study.variant_batch.system_life_batch`).
    No scipy: a check of a model does not import scipy.optimize for this one root.
    """
    lnL = np.log(L)
    y = float(np.min(lnL + math.log(c) / e))
    for _ in range(200):
        t = np.exp(e * (y - lnL))
        step = (float(np.sum(t)) - c) / float(np.sum(e * t))
        y -= step
        if not abs(step) > 1e-15 * max(1.0, abs(y)):
            return math.exp(y)
    raise NumericalError("system life: Newton's method did not converge")

