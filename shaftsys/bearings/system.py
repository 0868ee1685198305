"""System life of several bearings (Lundberg-Palmgren two-parameter Weibull survival).

Each bearing survives to life L with S_i(L) = exp(ln(0.9)*(L/L10_i)^e_i), e = 10/9 ball,
9/8 roller. The system life L_sys is where prod S_i(L_sys) = R, i.e.
sum ln(0.9)*(L_sys/L10_i)^e_i = ln R, solved with scipy.optimize.brentq. For equal
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
    target = math.log(reliability)
    Lf, ef = L[finite], e[finite]

    def g(x: float) -> float:
        return float(np.sum(_LN09 * (x / Lf) ** ef)) - target

    # bracket: the root is below the weakest bearing's own life at R and above
    # the equal-share lower bound; widen geometrically to be safe.
    lo = float(np.min(Lf)) * 1e-6
    hi = float(np.min(Lf)) * max(1.0, (target / _LN09) ** (1.0 / float(np.min(ef)))) * 2.0
    for _ in range(200):
        if g(lo) > 0.0:
            break
        lo *= 1e-3
    for _ in range(200):
        if g(hi) < 0.0:
            break
        hi *= 2.0
    if not (g(lo) > 0.0 > g(hi)):
        raise NumericalError("system life: could not bracket the root")
    from scipy.optimize import brentq  # lazy: only a system-life solve needs it

    root = float(brentq(g, lo, hi, xtol=1e-14 * hi, rtol=1e-13, maxiter=500))
    hazard = np.zeros_like(L)
    hazard[finite] = -_LN09 * (root / Lf) ** ef
    return root, int(np.argmax(hazard))
