"""Rolling-bearing friction moment by Palmgren's model (pure functions, vectorised).

M = M0 + M1 [N*mm], split into

* a load-independent (viscous) term
  M0 = 1e-7 * f0 * (nu*n)^(2/3) * dm^3     for nu*n >= 2000 mm^2/s * rpm,
  M0 = 160e-7 * f0 * dm^3                   for nu*n <  2000,
  with nu the operating kinematic viscosity [mm^2/s], n the speed [rpm], dm the mean
  diameter [mm] and f0 a factor of the bearing type and lubrication method;
* a load-dependent term M1 = f1 * P1 * dm with P1 the equivalent friction load [N] and
  f1 a factor of the type (for ball bearings a power of the static load ratio P0/C0).

Palmgren's model as given in the rolling-bearing literature; the f0 and f1 factors and
the P1 formulas below are recalled FROM MEMORY (mid-points of the recalled ranges) and
must be checked against the bearing supplier's data: every bearing can override f0 and
f1. Friction power W = M * omega = M [N*mm] * 2*pi*n/60 [1/s] / 1000.

The model does not cover seals, mixed friction at very low nu*n beyond the constant
branch, starved or churning lubrication, or preload changes with temperature.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import numpy.typing as npt

from shaftsys.bearings._util import FloatArray
from shaftsys.model.bearing import Bearing, BearingKind

#: Break point of the two M0 branches, nu*n [mm^2/s * rpm].
NU_N_BREAK = 2000.0
#: M0 coefficients [-] of the two branches (Palmgren).
M0_COEFF = 1e-7
M0_COEFF_LOW = 160e-7

#: f0 per type, (grease, oil) [-]; oil = oil bath or circulating oil. FROM MEMORY
#: (mid-points of recalled ranges); override per bearing with the supplier's value.
F0_TABLE: dict[BearingKind, tuple[float, float]] = {
    BearingKind.DEEP_GROOVE_BALL: (1.0, 2.0),
    BearingKind.ANGULAR_CONTACT_BALL: (2.0, 2.0),
    BearingKind.SELF_ALIGNING_BALL: (1.5, 1.75),
    BearingKind.CYLINDRICAL_ROLLER: (0.8, 2.2),
    BearingKind.TAPERED_ROLLER: (6.0, 4.0),
    BearingKind.SPHERICAL_ROLLER: (5.0, 5.0),
    BearingKind.NEEDLE_ROLLER: (12.0, 12.0),
    BearingKind.THRUST_BALL: (5.5, 2.0),
}

#: f1 = z * (P0/C0)^y for ball types, f1 = z for roller types. FROM MEMORY.
F1_TABLE: dict[BearingKind, tuple[float, float]] = {
    BearingKind.DEEP_GROOVE_BALL: (0.0009, 0.5),
    BearingKind.ANGULAR_CONTACT_BALL: (0.001, 0.33),
    BearingKind.SELF_ALIGNING_BALL: (0.0003, 0.4),
    BearingKind.THRUST_BALL: (0.0012, 0.33),
    BearingKind.CYLINDRICAL_ROLLER: (0.0003, 0.0),
    BearingKind.TAPERED_ROLLER: (0.0004, 0.0),
    BearingKind.SPHERICAL_ROLLER: (0.0004, 0.0),
    BearingKind.NEEDLE_ROLLER: (0.0005, 0.0),
}

#: Fallback Y (tapered) and Y2 (spherical roller, self-aligning ball) of P1 when the
#: bearing gives none (FROM MEMORY, typical values).
Y_FALLBACK = 1.6
Y2_FALLBACK = 2.5

#: Plausible ranges of user-given factors (common practice, no source).
F0_RANGE = (0.0, 50.0)
F1_RANGE = (0.0, 0.01)


@dataclass(frozen=True, slots=True)
class FrictionFactors:
    """The friction factors of one bearing and where they come from.

    f0: load-independent factor [-]; f1_z, f1_y: f1 = f1_z * (P0/C0)^f1_y [-]
    (f1_y = 0 for a constant f1); given: True where the user gave the factor.
    """

    f0: float
    f1_z: float
    f1_y: float
    f0_given: bool
    f1_given: bool


def friction_factors(bearing: Bearing, grease: bool, f0: float | None = None,
                     f1: float | None = None) -> FrictionFactors:
    """f0 and f1 of a bearing: the user's values, else the table (from memory).

    A set of ``rows`` bearings side by side has ``rows`` times the table's f0 (the
    recalled rule for paired bearings). A user-given f1 is taken as constant.
    """
    g, o = F0_TABLE[bearing.kind]
    z, y = F1_TABLE[bearing.kind]
    return FrictionFactors(
        f0=float(f0) if f0 is not None else (g if grease else o) * max(bearing.rows, 1),
        f1_z=float(f1) if f1 is not None else z,
        f1_y=0.0 if f1 is not None else y,
        f0_given=f0 is not None, f1_given=f1 is not None)


def static_load_ratio(bearing: Bearing, Fr_N: npt.ArrayLike, Fa_N: npt.ArrayLike
                      ) -> FloatArray:
    """P0/C0 [-] for f1 of ball bearings: P0 = max(Fr, 0.6*Fr + 0.5*Fa) (radial ball,
    ISO 76 factors X0 = 0.6, Y0 = 0.5, from memory), P0 = Fa for thrust ball bearings.
    """
    Fr = np.abs(np.asarray(Fr_N, dtype=np.float64))
    Fa = np.abs(np.asarray(Fa_N, dtype=np.float64))
    thrust = bearing.kind is BearingKind.THRUST_BALL
    P0 = Fa if thrust else np.maximum(Fr, 0.6 * Fr + 0.5 * Fa)
    return np.atleast_1d(P0 / bearing.C0_N)


def friction_load(bearing: Bearing, Fr_N: npt.ArrayLike, Fa_N: npt.ArrayLike) -> FloatArray:
    """Equivalent friction load P1 [N] of Palmgren's model (FROM MEMORY).

    deep groove ball max(3Fa - 0.1Fr, Fr); angular-contact ball max(Fa - 0.1Fr, Fr);
    self-aligning ball max(1.4*Y2*Fa - 0.1Fr, Fr); cylindrical and needle roller Fr;
    tapered roller max(2*Y*Fa, Fr); spherical roller max(1.2*Y2*Fa, Fr); thrust ball Fa.
    """
    Fr = np.atleast_1d(np.abs(np.asarray(Fr_N, dtype=np.float64)))
    Fa = np.atleast_1d(np.abs(np.asarray(Fa_N, dtype=np.float64)))
    k = bearing.kind
    y2 = bearing.Y2 if bearing.Y2 else (bearing.Y if bearing.Y else Y2_FALLBACK)
    if k is BearingKind.DEEP_GROOVE_BALL:
        return np.maximum(3.0 * Fa - 0.1 * Fr, Fr)
    if k is BearingKind.ANGULAR_CONTACT_BALL:
        return np.maximum(Fa - 0.1 * Fr, Fr)
    if k is BearingKind.SELF_ALIGNING_BALL:
        return np.maximum(1.4 * y2 * Fa - 0.1 * Fr, Fr)
    if k is BearingKind.TAPERED_ROLLER:
        return np.maximum(2.0 * (bearing.Y if bearing.Y else Y_FALLBACK) * Fa, Fr)
    if k is BearingKind.SPHERICAL_ROLLER:
        return np.maximum(1.2 * y2 * Fa, Fr)
    if k is BearingKind.THRUST_BALL:
        return Fa
    if k in (BearingKind.CYLINDRICAL_ROLLER, BearingKind.NEEDLE_ROLLER):
        return Fr
    raise ValueError(f"no friction load formula for bearing type {k.value}")


def viscous_moment(f0: npt.ArrayLike, nu_mm2_s: npt.ArrayLike, speed_rpm: npt.ArrayLike,
                   dm_mm: npt.ArrayLike) -> FloatArray:
    """Load-independent friction moment M0 [N*mm] (Palmgren).

    Parameters
    ----------
    f0: factor of the type and lubrication method [-].
    nu_mm2_s: operating kinematic viscosity [mm^2/s].
    speed_rpm: speed [rpm] (sign ignored).
    dm_mm: mean diameter [mm].
    """
    nu_n = np.asarray(nu_mm2_s, dtype=np.float64) * np.abs(np.asarray(speed_rpm, dtype=float))
    dm3 = np.asarray(dm_mm, dtype=np.float64) ** 3
    f = np.asarray(f0, dtype=np.float64)
    with np.errstate(invalid="ignore"):
        high = M0_COEFF * f * np.maximum(nu_n, 0.0) ** (2.0 / 3.0) * dm3
    return np.atleast_1d(np.where(nu_n >= NU_N_BREAK, high, M0_COEFF_LOW * f * dm3))


def load_moment(f1: npt.ArrayLike, P1_N: npt.ArrayLike, dm_mm: npt.ArrayLike) -> FloatArray:
    """Load-dependent friction moment M1 = f1 * P1 * dm [N*mm]."""
    return np.atleast_1d(np.asarray(f1, dtype=np.float64) * np.asarray(P1_N, dtype=float)
                         * np.asarray(dm_mm, dtype=np.float64))


def f1_value(factors: FrictionFactors, load_ratio: npt.ArrayLike) -> FloatArray:
    """f1 = z * (P0/C0)^y [-] (y = 0: constant)."""
    r = np.asarray(load_ratio, dtype=np.float64)
    if factors.f1_y == 0.0:
        return np.atleast_1d(np.full(r.shape, factors.f1_z))
    return np.atleast_1d(factors.f1_z * np.maximum(r, 0.0) ** factors.f1_y)


def friction_power_W(moment_Nmm: npt.ArrayLike, speed_rpm: npt.ArrayLike) -> FloatArray:
    """Friction power loss W = M * omega [W] of a moment [N*mm] at a speed [rpm]."""
    omega = 2.0 * math.pi * np.abs(np.asarray(speed_rpm, dtype=np.float64)) / 60.0
    return np.atleast_1d(np.asarray(moment_Nmm, dtype=np.float64) * omega / 1000.0)


__all__ = [
    "F0_RANGE",
    "F0_TABLE",
    "F1_RANGE",
    "F1_TABLE",
    "FrictionFactors",
    "f1_value",
    "friction_factors",
    "friction_load",
    "friction_power_W",
    "load_moment",
    "static_load_ratio",
    "viscous_moment",
]
