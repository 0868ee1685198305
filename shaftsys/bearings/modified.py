"""Modified rating life over a spectrum and the required dynamic rating.

Lnm is computed PER CASE, Lnm_i = a1*aISO_i*L10_i, and combined with the revolution
weights of the spectrum: 1/Lnm = sum U_i/Lnm_i (never aISO of the mean load Pm).

Required rating on the same basis: since aISO depends on ec*Cu/P and kappa but not on
C, life = C^p / sum(U_i*P_i^p/(a1*aISO_i)) and so
C_req = (L_target * sum U_i*P_i^p/(a1*aISO_i))^(1/p).
"""

from __future__ import annotations

import math

import numpy as np
import numpy.typing as npt

from shaftsys.bearings._util import FloatArray, as_float_array


def modified_life_per_case(L10_mrev: npt.ArrayLike, a1: float, aISO: npt.ArrayLike) -> FloatArray:
    """Lnm_i = a1*aISO_i*L10_i [10^6 rev] per case.

    Parameters
    ----------
    L10_mrev:
        Basic rating life per case [10^6 rev].
    a1:
        Reliability life factor [-].
    aISO:
        Life modification factor per case [-] (1 for the a1*L10 basis).
    """
    return a1 * as_float_array(aISO, "aISO") * as_float_array(L10_mrev, "L10_mrev")


def combine_lives(L_mrev: npt.ArrayLike, weights: npt.ArrayLike) -> float:
    """Spectrum life from per-case lives: 1/L = sum U_i/L_i [10^6 rev].

    Cases with U_i = 0 are ignored; infinite lives contribute nothing. inf when no case
    has weight.
    """
    L = as_float_array(L_mrev, "L_mrev")
    U = as_float_array(weights, "weights")
    used = U > 0.0
    if np.any(used & ~(L > 0.0)):
        raise ValueError("per-case lives with weight must be > 0")
    with np.errstate(divide="ignore"):
        damage = float(np.where(used, U / np.where(used, L, 1.0), 0.0).sum())
    return math.inf if damage <= 0.0 else 1.0 / damage


def required_rating(
    P_N: npt.ArrayLike,
    weights: npt.ArrayLike,
    life_exponent: float,
    target_life_mrev: float,
    life_factors: npt.ArrayLike | None = None,
) -> float:
    """Dynamic rating C [N] that reaches ``target_life_mrev`` under a spectrum.

    C_req = (L_target * sum U_i*P_i^p/f_i)^(1/p) with f_i = a1*aISO_i (or a1, or 1).

    Parameters
    ----------
    P_N:
        Equivalent dynamic (design) load per case [N].
    weights:
        Revolution weights U_i [-].
    life_exponent:
        p [-].
    target_life_mrev:
        Target life [10^6 rev] (target hours * 60 * n_m / 1e6).
    life_factors:
        Per-case factor f_i [-] multiplying L10_i; ``None`` = 1 (basic rating life).

    Returns
    -------
    float
        C_req [N] (0 when no case has weight).
    """
    P = as_float_array(P_N, "P_N")
    U = as_float_array(weights, "weights")
    f = np.ones_like(P) if life_factors is None else as_float_array(life_factors, "life_factors")
    used = U > 0.0
    if np.any(used & ~(f > 0.0)):
        raise ValueError("life factors with weight must be > 0")
    s = float(
        np.where(
            used, U * np.where(used, P, 0.0) ** life_exponent / np.where(used, f, 1.0), 0.0
        ).sum()
    )
    return (target_life_mrev * s) ** (1.0 / life_exponent)
