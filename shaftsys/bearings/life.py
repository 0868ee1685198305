"""Basic rating life and Palmgren-Miner combination over a load spectrum (ISO 281:2007).

* L10 = (C/P)^p [10^6 rev], p = 3 ball, 10/3 roller; L10h = L10*1e6/(60*|n|) [h].
* Revolution weights over the dynamic cases: U_i = |n_i|*t_i / sum_j |n_j|*t_j.
* Equivalent mean load Pm = (sum U_i*P_i^p)^(1/p).
* Mean speed n_m = sum_dyn t_i*|n_i| / sum_all t_i: the time of every case counts in
  the denominator (standstill, slow and static-only cases with a duration included),
  while only dynamic cases contribute revolutions. A life in hours is therefore
  calendar time of the duty cycle, standstill included.
* Life in hours: L10(Pm)*1e6/(60*n_m); repetitions of a duty cycle given in hours:
  life_h / sum_all t_i.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import numpy.typing as npt

from shaftsys.bearings._util import BoolArray, FloatArray, as_float_array
from shaftsys.units import MEGA_REVOLUTIONS


def basic_rating_life(C_N: float, P_N: npt.ArrayLike, life_exponent: float) -> FloatArray:
    """Compute the basic rating life L10 = (C/P)^p [10^6 rev] (inf where P = 0).

    Parameters
    ----------
    C_N:
        Basic dynamic load rating [N].
    P_N:
        Equivalent dynamic load(s) [N].
    life_exponent:
        p [-]: 3 ball, 10/3 roller.

    Returns
    -------
    numpy.ndarray
        L10 [10^6 rev].
    """
    P = as_float_array(P_N, "P_N")
    if np.any(P < 0.0):
        raise ValueError("P_N must be >= 0")
    with np.errstate(divide="ignore"):
        return np.where(P > 0.0, (C_N / np.where(P > 0.0, P, 1.0)) ** life_exponent, np.inf)


def life_hours(L_mrev: npt.ArrayLike, speed_rpm: npt.ArrayLike) -> FloatArray:
    """Life in hours L*1e6/(60*|n|) [h] of a life in 10^6 rev at speed n [rpm].

    Returns inf where n = 0.
    """
    L = as_float_array(L_mrev, "L_mrev")
    n = np.abs(as_float_array(speed_rpm, "speed_rpm"))
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(n > 0.0, L * MEGA_REVOLUTIONS / (60.0 * np.where(n > 0.0, n, 1.0)), np.inf)


def revolution_weights(
    speed_rpm: npt.ArrayLike, duration: npt.ArrayLike, dynamic: npt.ArrayLike
) -> FloatArray:
    """Revolution weights U_i = |n_i|*t_i / sum_j |n_j|*t_j over the dynamic cases [-].

    Non-dynamic cases get weight 0. All zeros when no dynamic case turns.

    Parameters
    ----------
    speed_rpm:
        Signed speeds [rpm].
    duration:
        Time shares or hours per case (any consistent time unit).
    dynamic:
        Boolean mask of cases entering the spectrum.
    """
    n = np.abs(as_float_array(speed_rpm, "speed_rpm"))
    t = as_float_array(duration, "duration")
    dyn: BoolArray = np.atleast_1d(np.asarray(dynamic, dtype=bool))
    revs = np.where(dyn, n * t, 0.0)
    total = float(revs.sum())
    if total <= 0.0:
        return np.zeros_like(revs)
    return revs / total


def mean_speed(speed_rpm: npt.ArrayLike, duration: npt.ArrayLike, dynamic: npt.ArrayLike) -> float:
    """Time-weighted mean speed n_m = sum_dyn t_i*|n_i| / sum_all t_i [rpm].

    Standstill time counts: every case's duration is in the denominator; only the
    dynamic cases' revolutions are in the numerator. 0 when the total time is 0.
    """
    n = np.abs(as_float_array(speed_rpm, "speed_rpm"))
    t = as_float_array(duration, "duration")
    dyn: BoolArray = np.atleast_1d(np.asarray(dynamic, dtype=bool))
    total_t = float(t.sum())
    if total_t <= 0.0:
        return 0.0
    return float(np.where(dyn, n * t, 0.0).sum()) / total_t


def equivalent_mean_load(P_N: npt.ArrayLike, weights: npt.ArrayLike, life_exponent: float) -> float:
    """Palmgren-Miner equivalent load Pm = (sum U_i*P_i^p)^(1/p) [N].

    Parameters
    ----------
    P_N:
        Equivalent dynamic loads [N] (cases with weight 0 may hold anything finite or nan).
    weights:
        Revolution weights U_i [-] summing to 1.
    life_exponent:
        p [-].
    """
    P = as_float_array(P_N, "P_N")
    U = as_float_array(weights, "weights")
    terms = np.where(U > 0.0, U * np.where(U > 0.0, P, 0.0) ** life_exponent, 0.0)
    return float(terms.sum()) ** (1.0 / life_exponent)


@dataclass(frozen=True)
class SpectrumLife:
    """Basic rating life of a load spectrum.

    Attributes
    ----------
    weights: revolution weights U_i [-].
    Pm_N: equivalent mean load [N].
    n_m_rpm: time-weighted mean speed [rpm] (standstill counts).
    L10_mrev: basic rating life at Pm [10^6 rev].
    L10_h: basic rating life [h] of the duty cycle (inf without dynamic case).
    """

    weights: FloatArray
    Pm_N: float
    n_m_rpm: float
    L10_mrev: float
    L10_h: float


def spectrum_life(
    C_N: float,
    P_N: npt.ArrayLike,
    speed_rpm: npt.ArrayLike,
    duration: npt.ArrayLike,
    dynamic: npt.ArrayLike,
    life_exponent: float,
) -> SpectrumLife:
    """Compute the basic rating life of a spectrum by Palmgren-Miner (see module docstring).

    Parameters
    ----------
    C_N:
        Basic dynamic load rating [N].
    P_N:
        Equivalent dynamic (design) load per case [N].
    speed_rpm:
        Signed speed per case [rpm].
    duration:
        Time share or hours per case.
    dynamic:
        Mask of cases entering the spectrum.
    life_exponent:
        p [-].

    Returns
    -------
    SpectrumLife
    """
    U = revolution_weights(speed_rpm, duration, dynamic)
    n_m = mean_speed(speed_rpm, duration, dynamic)
    if not np.any(U > 0.0):
        return SpectrumLife(U, 0.0, n_m, math.inf, math.inf)
    Pm = equivalent_mean_load(P_N, U, life_exponent)
    L10 = float(basic_rating_life(C_N, Pm, life_exponent)[0])
    L10_h = L10 * MEGA_REVOLUTIONS / (60.0 * n_m)
    return SpectrumLife(U, Pm, n_m, L10, L10_h)


def duty_cycle_repetitions(life_h: float, duration_h: npt.ArrayLike) -> float:
    """Count repetitions of a duty cycle of length sum(duration_h) [h] within life_h [h]."""
    total = float(as_float_array(duration_h, "duration_h").sum())
    if total <= 0.0:
        return math.inf
    return life_h / total
