"""Deflection and misalignment limits, and closed-form bounds on the first critical speed.

Limits
------
Bearing slope limits are *typical ranges* (low..high) of the allowable misalignment of
the shaft relative to the housing at a bearing [rad]. Where Shigley's *Mechanical
Engineering Design* (9th ed., Table 7-2, "typical maximum ranges for slopes and
transverse deflections", from memory) gives a range it is used; the other bearing kinds
are "common practice, no source". A slope up to ``low`` is fine, between ``low`` and
``high`` marginal (check the maker's value), above ``high`` exceeded.

Gear limits (same table, from memory): uncrowned spur gears, slope < 0.0005 rad;
transverse deflection at the gear 0.010 in (0.254 mm) for diametral pitch P <= 10
teeth/in, 0.005 in (0.127 mm) for 10 < P < 20, 0.003 in (0.0762 mm) for P >= 20
(the table lists P < 10, 11 < P < 19, 20 < P < 50; the gaps are closed as written and
P > 50 keeps 0.003 in: common practice, no source). P = 25.4 / m with m the module [mm].

Critical speed bounds
---------------------
Masses in kg, lengths and deflections in mm, E in MPa (N/mm^2), I in mm^4, g in m/s^2.
With deflections in mm the gravity constant enters as g*1000 [mm/s^2]; with an influence
coefficient a [mm/N] a mass m [kg] on its own spring has omega^2 = 1000 / (m a)
[1/s^2] (1 N = 1 kg m/s^2 = 1000 kg mm/s^2). Speeds are returned in rad/s;
:func:`rpm_from_rad_s` converts.

* Rayleigh (Shigley eq. 7-23): omega^2 = g sum(m_i s_i y_i) / sum(m_i y_i^2) with y_i the
  static deflections under loads s_i m_i g (s_i = +-1, all +1 for plain gravity).
  An upper bound on the first natural frequency (Rayleigh quotient).
* Dunkerley (Shigley eq. 7-32): 1/omega^2 = sum 1/omega_ii^2, omega_ii^2 = 1/(m_i a_ii):
  a lower bound.
* Simply supported uniform shaft (Shigley eq. 7-22):
  omega_1 = (pi/L)^2 sqrt(E I / mu), mu = mass per length; in shaftsys units
  omega_1 = (pi/L)^2 sqrt(1000 E I / mu) with mu in kg/mm.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from types import MappingProxyType

import numpy as np
import numpy.typing as npt

from shaftsys.errors import ModelError
from shaftsys.model.bearing import BearingKind
from shaftsys.units import DENSITY_KG_PER_MM3, STANDARD_GRAVITY_M_S2

_T72 = "Shigley 9th ed. Table 7-2"
_CP = "common practice, no source"

#: mm per m: g [m/s^2] * 1000 = g [mm/s^2]; 1 N = 1000 kg*mm/s^2.
_MM_PER_M = 1000.0


@dataclass(frozen=True, slots=True)
class SlopeLimit:
    """Typical range of the allowable slope at a bearing or gear [rad].

    Attributes
    ----------
    low_rad: slopes up to this are acceptable [rad].
    high_rad: slopes above this exceed the typical range [rad].
    source: where the range comes from.
    """

    low_rad: float
    high_rad: float
    source: str


#: Typical slope ranges per bearing kind [rad], keyed by :class:`BearingKind` (a
#: ``StrEnum``: the plain model-file strings such as ``"deep_groove_ball"`` work as keys).
BEARING_SLOPE_LIMITS: Mapping[BearingKind, SlopeLimit] = MappingProxyType(
    {
        BearingKind.DEEP_GROOVE_BALL: SlopeLimit(0.001, 0.003, _T72),
        BearingKind.ANGULAR_CONTACT_BALL: SlopeLimit(0.0005, 0.001, _CP),
        BearingKind.SELF_ALIGNING_BALL: SlopeLimit(0.026, 0.052, _T72),
        BearingKind.CYLINDRICAL_ROLLER: SlopeLimit(0.0008, 0.0012, _T72),
        BearingKind.TAPERED_ROLLER: SlopeLimit(0.0005, 0.0012, _T72),
        BearingKind.SPHERICAL_ROLLER: SlopeLimit(0.009, 0.026, f"typical 0.5..1.5 deg, {_CP}"),
        BearingKind.NEEDLE_ROLLER: SlopeLimit(0.0003, 0.0005, _CP),
        BearingKind.THRUST_BALL: SlopeLimit(0.0003, 0.0005, _CP),
    }
)

#: Allowable slope of an uncrowned spur gear [rad] (Shigley 9th ed. Table 7-2, from memory).
SPUR_GEAR_SLOPE_LIMIT_RAD = 0.0005

SLOPE_STATUSES = ("ok", "marginal", "exceeded")


def bearing_slope_limit(kind: BearingKind | str) -> SlopeLimit:
    """Typical allowable slope range at a bearing of the given kind.

    Parameters
    ----------
    kind:
        A :class:`~shaftsys.model.bearing.BearingKind` or its string value.

    Returns
    -------
    SlopeLimit
        Range in rad and its source.

    Raises
    ------
    ValueError
        Unknown bearing kind.
    """
    try:
        return BEARING_SLOPE_LIMITS[BearingKind(kind)]
    except ValueError:
        raise ValueError(
            f"unknown bearing kind {kind!r}; expected one of {[k.value for k in BearingKind]}"
        ) from None


def slope_status(slope_rad: float, limit: SlopeLimit) -> str:
    """Classify a slope magnitude against a typical range.

    Parameters
    ----------
    slope_rad:
        Slope [rad] (sign ignored).
    limit:
        The range.

    Returns
    -------
    str
        ``"ok"`` (<= low), ``"marginal"`` (<= high) or ``"exceeded"``.
    """
    s = abs(float(slope_rad))
    if not math.isfinite(s):
        raise ModelError(f"slope {slope_rad!r}", expected="a finite slope in rad")
    if s <= limit.low_rad:
        return "ok"
    if s <= limit.high_rad:
        return "marginal"
    return "exceeded"


def gear_deflection_limit_mm(module_mm: float) -> float:
    """Return the allowable transverse deflection at a spur gear [mm] (Shigley Table 7-2).

    Parameters
    ----------
    module_mm:
        Gear module [mm] (diametral pitch P = 25.4 / m teeth/in).

    Returns
    -------
    float
        0.254 mm (P <= 10), 0.127 mm (10 < P < 20) or 0.0762 mm (P >= 20).
    """
    m = float(module_mm)
    if not (math.isfinite(m) and m > 0.0):
        raise ModelError(f"module {m:g} mm", expected="module > 0 mm")
    P = 25.4 / m
    if P <= 10.0:
        return 0.010 * 25.4
    if P < 20.0:
        return 0.005 * 25.4
    return 0.003 * 25.4


# --------------------------------------------------------------------------------------
# Critical speed bounds
# --------------------------------------------------------------------------------------


def rpm_from_rad_s(omega_rad_s: float) -> float:
    """Speed [rpm] of an angular velocity [rad/s]."""
    return omega_rad_s * 60.0 / (2.0 * math.pi)


def _vector(values: Sequence[float] | npt.ArrayLike, name: str) -> npt.NDArray[np.float64]:
    arr = np.asarray(values, dtype=float)
    if arr.ndim != 1 or arr.size == 0 or not np.all(np.isfinite(arr)):
        raise ModelError(f"{name} must be a non-empty list of finite numbers")
    return arr


def rayleigh_critical_speed_rad_s(
    masses_kg: Sequence[float] | npt.ArrayLike,
    deflections_mm: Sequence[float] | npt.ArrayLike,
    *,
    load_signs: Sequence[float] | npt.ArrayLike | None = None,
    g_m_s2: float = STANDARD_GRAVITY_M_S2,
) -> float:
    """Rayleigh's estimate of the first critical speed [rad/s] (Shigley eq. 7-23).

    omega^2 = g sum(m_i s_i y_i) / sum(m_i y_i^2), g in mm/s^2.

    Parameters
    ----------
    masses_kg:
        Lumped masses [kg], > 0.
    deflections_mm:
        Static deflections at the masses [mm] under the loads s_i m_i g applied together.
    load_signs:
        Direction s_i = +1/-1 of each load along the deflection axis (default all +1,
        plain gravity). For overhung masses, reversing their loads gives a shape closer
        to the first mode.
    g_m_s2:
        Gravity [m/s^2].

    Returns
    -------
    float
        omega [rad/s] (an upper bound on the first natural frequency of the lumped model).
    """
    m = _vector(masses_kg, "masses_kg")
    y = _vector(deflections_mm, "deflections_mm")
    s = np.ones_like(m) if load_signs is None else _vector(load_signs, "load_signs")
    if not (m.shape == y.shape == s.shape):
        raise ModelError("masses, deflections and load signs must have the same length")
    if np.any(m <= 0.0):
        raise ModelError("lumped masses must be positive", expected="m > 0 kg")
    num = g_m_s2 * _MM_PER_M * float(np.sum(m * s * y))
    den = float(np.sum(m * y * y))
    if den <= 0.0 or num <= 0.0:
        raise ModelError(
            "Rayleigh's estimate needs deflections in the direction of the loads",
            expected="sum(m s y) > 0",
        )
    return math.sqrt(num / den)


def rayleigh_from_influence_rad_s(
    masses_kg: Sequence[float] | npt.ArrayLike,
    influence_mm_per_N: npt.ArrayLike,
    *,
    load_signs: Sequence[float] | npt.ArrayLike | None = None,
    g_m_s2: float = STANDARD_GRAVITY_M_S2,
) -> float:
    """Rayleigh's estimate [rad/s] with deflections y = A (s m g) from influence coefficients.

    Parameters
    ----------
    masses_kg:
        Lumped masses [kg].
    influence_mm_per_N:
        Square matrix a_ij [mm/N]: deflection at i per unit force at j.
    load_signs:
        See :func:`rayleigh_critical_speed_rad_s`.
    g_m_s2:
        Gravity [m/s^2].

    Returns
    -------
    float
        omega [rad/s].
    """
    m = _vector(masses_kg, "masses_kg")
    a = np.asarray(influence_mm_per_N, dtype=float)
    if a.shape != (m.size, m.size):
        raise ModelError("influence matrix must be n x n for n masses")
    s = np.ones_like(m) if load_signs is None else _vector(load_signs, "load_signs")
    y = a @ (s * m * g_m_s2)
    return rayleigh_critical_speed_rad_s(m, y, load_signs=s, g_m_s2=g_m_s2)


def dunkerley_combine_rad_s(omegas_rad_s: Sequence[float] | npt.ArrayLike) -> float:
    """Dunkerley's combination 1/omega^2 = sum 1/omega_i^2 [rad/s] (Shigley eq. 7-32).

    Parameters
    ----------
    omegas_rad_s:
        Critical speeds of each mass (or the shaft) acting alone [rad/s], > 0.

    Returns
    -------
    float
        omega [rad/s] (a lower bound).
    """
    w = _vector(omegas_rad_s, "omegas_rad_s")
    if np.any(w <= 0.0):
        raise ModelError("critical speeds must be positive", expected="omega > 0 rad/s")
    return float(1.0 / math.sqrt(float(np.sum(1.0 / w**2))))


def dunkerley_critical_speed_rad_s(
    masses_kg: Sequence[float] | npt.ArrayLike,
    self_influence_mm_per_N: Sequence[float] | npt.ArrayLike,
    *,
    shaft_alone_rad_s: float | None = None,
) -> float:
    """Dunkerley's lower bound on the first critical speed [rad/s] (Shigley eq. 7-32).

    omega_ii^2 = 1000 / (m_i a_ii) [1/s^2] with a_ii in mm/N and m_i in kg.

    Parameters
    ----------
    masses_kg:
        Lumped masses [kg], > 0.
    self_influence_mm_per_N:
        Diagonal influence coefficients a_ii [mm/N], > 0.
    shaft_alone_rad_s:
        Critical speed of the shaft's own mass [rad/s] to include, or ``None``.

    Returns
    -------
    float
        omega [rad/s].
    """
    m = _vector(masses_kg, "masses_kg")
    a = _vector(self_influence_mm_per_N, "self_influence_mm_per_N")
    if m.shape != a.shape:
        raise ModelError("masses and influence coefficients must have the same length")
    if np.any(m <= 0.0) or np.any(a <= 0.0):
        raise ModelError("masses and influence coefficients must be positive")
    omegas = list(np.sqrt(_MM_PER_M / (m * a)))
    if shaft_alone_rad_s is not None:
        omegas.append(float(shaft_alone_rad_s))
    return dunkerley_combine_rad_s(omegas)


def simply_supported_uniform_critical_speed_rad_s(
    L_mm: float, E_MPa: float, I_mm4: float, mass_per_length_kg_mm: float
) -> float:
    """First critical speed of a uniform simply supported shaft [rad/s] (Shigley eq. 7-22).

    omega_1 = (pi/L)^2 sqrt(1000 E I / mu).

    Parameters
    ----------
    L_mm:
        Span between the supports [mm].
    E_MPa:
        Young's modulus [MPa].
    I_mm4:
        Second moment of area [mm^4].
    mass_per_length_kg_mm:
        Mass per unit length mu [kg/mm].

    Returns
    -------
    float
        omega_1 [rad/s].
    """
    vals = (L_mm, E_MPa, I_mm4, mass_per_length_kg_mm)
    if not all(math.isfinite(v) and v > 0.0 for v in vals):
        raise ModelError("span, E, I and mass per length must be positive")
    return (math.pi / L_mm) ** 2 * math.sqrt(_MM_PER_M * E_MPa * I_mm4 / mass_per_length_kg_mm)


def simply_supported_solid_shaft_critical_speed_rad_s(
    L_mm: float, d_mm: float, E_MPa: float, density_kg_m3: float
) -> float:
    """First critical speed of a solid round simply supported shaft [rad/s].

    :func:`simply_supported_uniform_critical_speed_rad_s` with I = pi d^4/64 and
    mu = rho pi d^2/4.

    Parameters
    ----------
    L_mm:
        Span [mm].
    d_mm:
        Diameter [mm].
    E_MPa:
        Young's modulus [MPa].
    density_kg_m3:
        Density [kg/m^3].

    Returns
    -------
    float
        omega_1 [rad/s].
    """
    if not (math.isfinite(d_mm) and d_mm > 0.0 and density_kg_m3 > 0.0):
        raise ModelError("diameter and density must be positive")
    inertia = math.pi * d_mm**4 / 64.0
    mu = density_kg_m3 * DENSITY_KG_PER_MM3 * math.pi * d_mm**2 / 4.0
    return simply_supported_uniform_critical_speed_rad_s(L_mm, E_MPa, inertia, mu)
