"""Life adjustment for reliability: ISO 281:2007 a1 and Shigley's three-parameter Weibull.

Both methods give a *life factor* a such that the life reached with reliability R is
``a * L10`` (L10 = basic rating life, 90 % reliability), and the inverse, the
reliability reached at a life ``x * L10``.

ISO 281:2007 (clause 9.2, Table 12): a1 = 0.95*(ln(100/R%)/ln(100/90))^(2/3) + 0.05,
defined for 90 % <= R <= 99.95 %.

Shigley's Mechanical Engineering Design (ch. 11, three-parameter Weibull of a maker's
bearing data): R = exp(-((x - x0)/(theta - x0))^b) with x = L/L10 and the published
defaults x0 = 0.02, theta = 4.459, b = 1.483. The exact form uses ln(1/R); Shigley's
approximation replaces ln(1/R) by (1 - R) (used in his worked examples, R >= 0.9).
As published, the Weibull factor at R = 0.9 is 0.9933 (exact form), not exactly 1.
"""

from __future__ import annotations

import math

import numpy as np
import numpy.typing as npt

from shaftsys.bearings._util import FloatArray
from shaftsys.errors import ModelError

ISO_RELIABILITY_MIN = 0.90
ISO_RELIABILITY_MAX = 0.9995
_LN_09 = math.log(100.0 / 90.0)

#: Shigley ch. 11 published Weibull defaults (x = L/L10).
SHIGLEY_X0 = 0.02
SHIGLEY_THETA = 4.459
SHIGLEY_B = 1.483

#: Names accepted for the reliability method.
METHODS = ("iso281", "weibull3", "weibull3_approx")


def a1_iso281(reliability: float, field: str = "target_reliability") -> float:
    """ISO 281:2007 life modification factor for reliability a1 [-].

    a1 = 0.95*(ln(100/R%)/ln(100/90))^(2/3) + 0.05 (ISO 281:2007, 9.2).

    Parameters
    ----------
    reliability:
        Required reliability as a fraction [-], 0.90 <= R <= 0.9995.
    field:
        Field path named in the error message.

    Returns
    -------
    float
        a1 [-] (1 at R = 0.90).

    Raises
    ------
    ModelError
        Reliability outside [0.90, 0.9995].
    """
    r = float(reliability)
    if not (ISO_RELIABILITY_MIN - 1e-12 <= r <= ISO_RELIABILITY_MAX + 1e-12):
        raise ModelError(
            f"reliability {r:g} outside the range of the ISO 281:2007 a1 method",
            field=field,
            expected=f"{ISO_RELIABILITY_MIN} <= reliability <= {ISO_RELIABILITY_MAX}",
        )
    return 0.95 * (math.log(1.0 / r) / _LN_09) ** (2.0 / 3.0) + 0.05


def reliability_iso281(life_factor: float, strict: bool = True) -> float:
    """Reliability [-] reached at a life ``life_factor * L10`` (inverse of :func:`a1_iso281`).

    R = exp(-ln(100/90) * ((a - 0.05)/0.95)^(3/2)).

    Parameters
    ----------
    life_factor:
        Life as a multiple of L10 [-].
    strict:
        True: raise outside the standard's range a1(0.9995) <= a <= 1. False: use the
        same formula for any a > 0.05 (extrapolation beyond ISO 281).

    Returns
    -------
    float
        Reliability as a fraction [-].
    """
    a = float(life_factor)
    lo = a1_iso281(ISO_RELIABILITY_MAX)
    if strict and not (lo - 1e-12 <= a <= 1.0 + 1e-12):
        raise ModelError(
            f"life factor {a:g} outside the ISO 281:2007 a1 range [{lo:.4g}, 1]",
            field="reliability",
            expected="90 % <= reliability <= 99.95 %",
        )
    if a <= 0.05:
        return 1.0
    return math.exp(-_LN_09 * ((a - 0.05) / 0.95) ** 1.5)


def weibull3_life_factor(
    reliability: float,
    x0: float = SHIGLEY_X0,
    theta: float = SHIGLEY_THETA,
    b: float = SHIGLEY_B,
    approximate: bool = False,
) -> float:
    """Shigley's Weibull life factor x = L/L10 [-] reached with reliability R.

    x = x0 + (theta - x0)*(ln(1/R))^(1/b), or with ``approximate`` (1 - R) for ln(1/R).

    Parameters
    ----------
    reliability:
        Reliability as a fraction [-], 0 < R < 1.
    x0, theta, b:
        Weibull guaranteed value, characteristic value [-] (multiples of L10) and shape.
    approximate:
        Use Shigley's (1 - R) approximation of ln(1/R).

    Returns
    -------
    float
        Life factor [-].
    """
    r = float(reliability)
    if not (0.0 < r < 1.0):
        raise ModelError(
            f"reliability {r:g} outside (0, 1)",
            field="target_reliability",
            expected="0 < reliability < 1",
        )
    u = (1.0 - r) if approximate else math.log(1.0 / r)
    return x0 + (theta - x0) * u ** (1.0 / b)


def weibull3_reliability(
    life_factor: npt.ArrayLike,
    x0: float = SHIGLEY_X0,
    theta: float = SHIGLEY_THETA,
    b: float = SHIGLEY_B,
    approximate: bool = False,
) -> FloatArray:
    """Reliability [-] at life ``x * L10`` by Shigley's Weibull (inverse of the factor).

    R = exp(-((x - x0)/(theta - x0))^b); with ``approximate``, R = 1 - ((x-x0)/(theta-x0))^b
    (the exact inverse of the (1 - R) form). R = 1 for x <= x0.

    Parameters
    ----------
    life_factor:
        x = L/L10 [-], scalar or array.
    x0, theta, b, approximate:
        As in :func:`weibull3_life_factor`.

    Returns
    -------
    numpy.ndarray
        Reliability [-], same shape as ``life_factor``.
    """
    x = np.asarray(life_factor, dtype=np.float64)
    z = np.clip((x - x0) / (theta - x0), 0.0, None) ** b
    if approximate:
        return np.clip(1.0 - z, 0.0, 1.0)
    return np.exp(-z)


def weibull3_required_C10(
    design_load: float,
    life_factor_design: float,
    reliability: float,
    application_factor: float = 1.0,
    life_exponent: float = 3.0,
    x0: float = SHIGLEY_X0,
    theta: float = SHIGLEY_THETA,
    b: float = SHIGLEY_B,
    approximate: bool = False,
) -> float:
    """Catalogue rating C10 needed for a design life at a reliability (Shigley ch. 11).

    C10 = af*FD*(xD/(x0 + (theta - x0)*(ln(1/RD))^(1/b)))^(1/a).

    Parameters
    ----------
    design_load:
        FD, equivalent design load [N] (any force unit; the result has the same unit).
    life_factor_design:
        xD = LD/L10, design life in multiples of the rating life [-].
    reliability:
        RD [-].
    application_factor:
        af [-].
    life_exponent:
        a: 3 ball, 10/3 roller.
    x0, theta, b, approximate:
        Weibull parameters and the (1 - R) option.

    Returns
    -------
    float
        Required C10 [unit of ``design_load``].
    """
    x_r = weibull3_life_factor(reliability, x0, theta, b, approximate)
    return application_factor * design_load * (life_factor_design / x_r) ** (1.0 / life_exponent)


def life_factor(reliability: float, method: str, field: str = "target_reliability") -> float:
    """Life factor [-] (multiple of L10) reached with ``reliability`` by ``method``.

    Parameters
    ----------
    reliability:
        Reliability as a fraction [-].
    method:
        ``"iso281"`` (a1), ``"weibull3"`` (Shigley, ln(1/R)) or ``"weibull3_approx"``
        (Shigley, 1 - R).
    field:
        Field path for error messages.

    Returns
    -------
    float
        Life factor [-].
    """
    if method == "iso281":
        return a1_iso281(reliability, field)
    if method == "weibull3":
        return weibull3_life_factor(reliability)
    if method == "weibull3_approx":
        return weibull3_life_factor(reliability, approximate=True)
    raise ModelError(
        f"unknown reliability method {method!r}",
        field="reliability_method",
        expected=" or ".join(METHODS),
    )


def reliability_at_life_factor(life_factor_: float, method: str, strict: bool = True) -> float:
    """Reliability [-] reached at ``life_factor_ * L10`` by ``method`` (inverse of factor).

    Parameters
    ----------
    life_factor_:
        Life as a multiple of L10 [-].
    method:
        As in :func:`life_factor`.
    strict:
        ISO method only: raise outside the standard's range.

    Returns
    -------
    float
        Reliability [-].
    """
    if method == "iso281":
        return reliability_iso281(life_factor_, strict)
    if method == "weibull3":
        return float(weibull3_reliability(life_factor_))
    if method == "weibull3_approx":
        return float(weibull3_reliability(life_factor_, approximate=True))
    raise ModelError(
        f"unknown reliability method {method!r}",
        field="reliability_method",
        expected=" or ".join(METHODS),
    )
