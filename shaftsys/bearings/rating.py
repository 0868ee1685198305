"""Basic load ratings from a bearing's internal geometry (ISO 281:2007, ISO 76:2006).

What a maker does to fill a catalogue line: from the rolling elements (number Z, diameter
Dw or Dwe, effective length Lwe, rows i), the contact angle alpha and the pitch diameter
Dpw, compute

* the basic dynamic radial load rating C (ISO 281:2007, 6.1.1 ball, 7.1.1 roller):

  - ball, Dw <= 25.4 mm: C = bm fc (i cos a)^0.7 Z^(2/3) Dw^1.8
  - ball, Dw >  25.4 mm: C = 3.647 bm fc (i cos a)^0.7 Z^(2/3) Dw^1.4
  - roller:              C = bm fc (i Lwe cos a)^(7/9) Z^(3/4) Dwe^(29/27)

  with fc from ISO 281:2007 Table 2 (ball) or Table 7 (roller) against
  gamma = Dw cos(a)/Dpw, interpolated linearly as the standard allows;
* the basic static radial load rating C0 (ISO 76:2006, 6.1):

  - ball:   C0 = f0 i Z Dw^2 cos a, f0 from the ISO 76 table against gamma
  - roller: C0 = 44 (1 - Dwe cos a/Dpw) i Z Lwe Dwe cos a

and the geometry-derived quantities a catalogue prints next to them: the pressure centre
offset, the ISO formula factors e, Y, Y0, Y1, Y2 from the contact angle, and (reused
from :mod:`shaftsys.bearings.lubrication`) the fatigue load limit Cu.

Units: lengths in mm, angles in degrees, loads in N. Every function is pure and
vectorised over array arguments (numpy broadcasting) unless it says otherwise.

Provenance. The fc tables and the bm values below were typed FROM MEMORY of ISO 281:2007;
the f0 table is the one already in :mod:`shaftsys.bearings.equivalent` (from memory of
ISO 76:2006) and is imported, not repeated. Each table is checked in
``tests/test_bearings_rating.py`` against a closed form written here:

* fc, roller: the Lundberg-Palmgren line-contact expression of ISO/TR 1281-1 with the
  constant 207.9 and the reduction factor lambda*nu = 0.83 (both from memory) meets the
  recalled Table 7 to its printed rounding (0.05) for gamma <= 0.30; above that the
  recalled entries lie up to 0.4 (0.6 %) above the closed form. Either those entries are
  recalled wrongly or the table is not the bare formula there; the table is what the
  ratings use.
* fc, ball: the Lundberg-Palmgren point-contact expression (constant 39.9) reproduces the
  recalled Table 2 to its printed rounding only with the conformity ratio term of the
  inner/outer life bracket equal to 1 (as for fi = fe = 0.52) and lambda*nu = 0.9573.
  Neither of these two is recalled: they are what the table's shape and level imply. With
  fe = 0.53 in the bracket the table/formula ratio drifts by 9 % from gamma = 0.01 to
  0.40, which no single constant removes.
* f0: the ISO 76 basis, a Hertz contact stress of 4200 MPa at the more heavily stressed
  ring (inner groove radius 0.52 Dw, outer 0.53 Dw, E = 207 GPa, nu = 0.3, the ring
  constants from memory) and Qmax = 5 Fr/(Z cos a), gives f0 = Qmax/(5 Dw^2); it meets the
  whole f0 table within 0.053 (printed rounding 0.05). The outer contact governs below
  gamma ~ 0.092, the inner above, which is why f0 first rises and then falls.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import numpy.typing as npt

from shaftsys.bearings._util import FloatArray
from shaftsys.bearings.equivalent import F0_GAMMA, F0_VALUES
from shaftsys.bearings.lubrication import estimate_fatigue_load_limit
from shaftsys.bearings.static import Y0_COT_DOUBLE, Y0_COT_SINGLE
from shaftsys.model.bearing import BearingKind

# --- ISO 281:2007 Table 2, fc for radial ball bearings (FROM MEMORY) -------------------
#: gamma = Dw cos(a)/Dpw. Column: single-row radial contact groove ball bearings and
#: single- and double-row angular contact groove ball bearings (not double-row deep
#: groove, not self-aligning: their columns differ and are not held here).
FC_BALL_GAMMA = (
    0.01, 0.02, 0.03, 0.04, 0.05, 0.06, 0.07, 0.08, 0.09, 0.10,
    0.12, 0.14, 0.16, 0.18, 0.20, 0.22, 0.24, 0.26, 0.28, 0.30,
    0.32, 0.34, 0.36, 0.38, 0.40,
)  # fmt: skip
FC_BALL_VALUES = (
    29.1, 35.8, 40.3, 43.8, 46.7, 49.1, 51.1, 52.8, 54.3, 55.5,
    57.5, 58.8, 59.6, 59.9, 59.9, 59.6, 59.0, 58.2, 57.1, 56.0,
    54.6, 53.2, 51.7, 50.0, 48.4,
)  # fmt: skip

# --- ISO 281:2007 Table 7, fc for radial roller bearings (FROM MEMORY) -----------------
#: gamma = Dwe cos(a)/Dpw; applies to cylindrical, tapered, spherical and needle rollers.
FC_ROLLER_GAMMA = (
    0.01, 0.02, 0.03, 0.04, 0.05, 0.06, 0.07, 0.08, 0.09, 0.10,
    0.12, 0.14, 0.16, 0.18, 0.20, 0.22, 0.24, 0.26, 0.28, 0.30,
    0.32, 0.34, 0.36, 0.38, 0.40, 0.42, 0.44, 0.46, 0.48, 0.50,
)  # fmt: skip
FC_ROLLER_VALUES = (
    52.1, 60.8, 66.5, 70.7, 74.1, 76.9, 79.2, 81.2, 82.8, 84.2,
    86.4, 87.7, 88.5, 88.8, 88.7, 88.2, 87.5, 86.4, 85.2, 83.8,
    82.3, 80.6, 78.8, 76.9, 74.9, 72.8, 70.7, 68.5, 66.1, 63.8,
)  # fmt: skip

# --- ISO 281:2007 rating factor bm for contemporary bearing steel (FROM MEMORY) --------
BM_RADIAL_BALL = 1.3  # deep groove, angular contact, self-aligning ball
BM_CYLINDRICAL_ROLLER = 1.1
BM_TAPERED_ROLLER = 1.1
BM_SPHERICAL_ROLLER = 1.15
BM_NEEDLE_ROLLER = 1.1  # machined-ring needle roller bearings (drawn cup: 1.0)
#: bm by bearing type (thrust ball not held: its rating formula is a different one).
BM_BY_KIND: dict[BearingKind, float] = {
    BearingKind.DEEP_GROOVE_BALL: BM_RADIAL_BALL,
    BearingKind.ANGULAR_CONTACT_BALL: BM_RADIAL_BALL,
    BearingKind.SELF_ALIGNING_BALL: BM_RADIAL_BALL,
    BearingKind.CYLINDRICAL_ROLLER: BM_CYLINDRICAL_ROLLER,
    BearingKind.TAPERED_ROLLER: BM_TAPERED_ROLLER,
    BearingKind.SPHERICAL_ROLLER: BM_SPHERICAL_ROLLER,
    BearingKind.NEEDLE_ROLLER: BM_NEEDLE_ROLLER,
}

#: ISO 281:2007: ball diameter above which the Dw^1.4 formula applies [mm] (1 inch).
BALL_DW_LIMIT_MM = 25.4
#: 25.4^(1.8 - 1.4) = 3.647: the large-ball constant making both formulas meet at 25.4 mm.
LARGE_BALL_FACTOR = 3.647

#: ISO 76:2006 radial roller bearings: C0 constant [MPa] (4000 MPa contact stress).
C0_ROLLER_CONSTANT_MPA = 44.0

# --- closed forms (ISO/TR 1281-1 and the ISO 76 basis) ---------------------------------
#: Lundberg-Palmgren point-contact constant 0.407 * 98.07 N/mm^1.8 (from memory).
LP_BALL_CONSTANT = 39.9
#: Reduction lambda*nu making the closed form meet the recalled Table 2: INFERRED from the
#: table (its level), not recalled.
LAMBDA_NU_BALL = 0.9573
#: Lundberg-Palmgren line-contact constant and ISO/TR 1281-1 lambda*nu (from memory).
LP_ROLLER_CONSTANT = 207.9
LAMBDA_NU_ROLLER = 0.83
#: ISO 76:2006 basis of radial ball bearing C0 (from memory): contact stress [MPa],
#: groove radii as fractions of Dw, ring and ball steel E [MPa] and Poisson's ratio.
F0_CONTACT_STRESS_MPA = 4200.0
F0_FI = 0.52
F0_FE = 0.53
STEEL_E_MPA = 207000.0
STEEL_POISSON = 0.3
#: Stribeck: Qmax = 5 Fr/(Z cos a) for the static rating (ISO 76 basis).
STRIBECK_CONSTANT = 5.0

# --- ISO formula factors from the contact angle ----------------------------------------
# The same multipliers are written inline in equivalent.py (_angle_factors); the tests
# check that both give the same numbers. Y0 multipliers are static.py's, imported.
E_TAN = 1.5  # e = 1.5 tan a (tapered and spherical roller, ISO 281 Table 4)
Y_COT_TAPERED = 0.4  # Y = 0.4 cot a, single-row tapered (X = 0.4)
Y1_COT_ROLLER = 0.45  # Y1 = 0.45 cot a, double-row roller, Fa/Fr <= e (X = 1)
Y2_COT_ROLLER = 0.67  # Y2 = 0.67 cot a, double-row roller, Fa/Fr > e (X = 0.67)


def _gamma_in_table(gamma: npt.ArrayLike, table: tuple[float, ...], name: str) -> FloatArray:
    g = np.asarray(gamma, dtype=np.float64)
    if not np.all(np.isfinite(g)):
        raise ValueError(f"{name}: gamma must be finite")
    lo, hi = table[0], table[-1]
    if np.any(g < lo - 1e-12) or np.any(g > hi + 1e-12):
        raise ValueError(
            f"{name}: gamma = Dw*cos(alpha)/Dpw outside the ISO 281 table range "
            f"{lo}..{hi} (got {np.min(g):.4g}..{np.max(g):.4g})"
        )
    return g


def fc_radial_ball(gamma: npt.ArrayLike) -> FloatArray:
    """Factor fc of a radial ball bearing (ISO 281:2007 Table 2, from memory).

    Column for single-row deep groove and single-/double-row angular contact ball
    bearings; linear interpolation between table points (the standard's note).

    Parameters
    ----------
    gamma:
        Dw*cos(alpha)/Dpw [-], 0.01 <= gamma <= 0.40.

    Returns
    -------
    numpy.ndarray
        fc [N/mm^1.8 in the Dw <= 25.4 mm formula], same shape as ``gamma``.

    Raises
    ------
    ValueError
        gamma outside the table.
    """
    g = _gamma_in_table(gamma, FC_BALL_GAMMA, "fc_radial_ball")
    return np.asarray(np.interp(g, FC_BALL_GAMMA, FC_BALL_VALUES), dtype=np.float64)


def fc_radial_roller(gamma: npt.ArrayLike) -> FloatArray:
    """Factor fc of a radial roller bearing (ISO 281:2007 Table 7, from memory).

    One table for cylindrical, tapered, spherical and needle roller bearings; linear
    interpolation between table points.

    Parameters
    ----------
    gamma:
        Dwe*cos(alpha)/Dpw [-], 0.01 <= gamma <= 0.50.

    Returns
    -------
    numpy.ndarray
        fc [-, in the N/mm formula of ISO 281], same shape as ``gamma``.

    Raises
    ------
    ValueError
        gamma outside the table.
    """
    g = _gamma_in_table(gamma, FC_ROLLER_GAMMA, "fc_radial_roller")
    return np.asarray(np.interp(g, FC_ROLLER_GAMMA, FC_ROLLER_VALUES), dtype=np.float64)


def fc_ball_formula(
    gamma: npt.ArrayLike,
    fi: float = 0.52,
    fe: float = 0.52,
    lambda_nu: float = LAMBDA_NU_BALL,
) -> FloatArray:
    """Closed form of fc for radial ball bearings (Lundberg-Palmgren, ISO/TR 1281-1).

    fc = 39.9 lambda_nu {1 + [1.04 ((1-g)/(1+g))^1.72 (fi(2fe-1)/(fe(2fi-1)))^0.41]^(10/3)}^-0.3
         * g^0.3 (1-g)^1.39 / (1+g)^(1/3) * (2fi/(2fi-1))^0.41

    (expression from memory). The defaults fi = fe = 0.52 and lambda_nu = 0.9573 are the
    values that reproduce the recalled Table 2 (see the module docstring): inferred, not
    recalled. A physical outer groove fe = 0.53 is accepted but does not reproduce it.

    Parameters
    ----------
    gamma:
        Dw*cos(alpha)/Dpw [-], 0 < gamma < 1.
    fi, fe:
        Inner and outer groove radii as fractions of Dw [-] (> 0.5).
    lambda_nu:
        Reduction factor on the Lundberg-Palmgren constant [-].

    Returns
    -------
    numpy.ndarray
        fc [-], same shape as ``gamma``.
    """
    g = np.asarray(gamma, dtype=np.float64)
    if np.any(g <= 0.0) or np.any(g >= 1.0):
        raise ValueError("fc_ball_formula: need 0 < gamma < 1")
    if not (fi > 0.5 and fe > 0.5):
        raise ValueError("fc_ball_formula: groove radii fi, fe must exceed 0.5")
    conformity = (fi * (2.0 * fe - 1.0) / (fe * (2.0 * fi - 1.0))) ** 0.41
    q = 1.04 * ((1.0 - g) / (1.0 + g)) ** 1.72 * conformity
    bracket = (1.0 + q ** (10.0 / 3.0)) ** -0.3
    shape = g**0.3 * (1.0 - g) ** 1.39 / (1.0 + g) ** (1.0 / 3.0)
    inner = (2.0 * fi / (2.0 * fi - 1.0)) ** 0.41
    return np.asarray(LP_BALL_CONSTANT * lambda_nu * bracket * shape * inner, dtype=np.float64)


def fc_roller_formula(gamma: npt.ArrayLike, lambda_nu: float = LAMBDA_NU_ROLLER) -> FloatArray:
    """Closed form of fc for radial roller bearings (Lundberg-Palmgren, ISO/TR 1281-1).

    fc = 207.9 lambda_nu g^(2/9) (1-g)^(29/27) / (1+g)^(1/4)
         * {1 + [1.04 ((1-g)/(1+g))^(143/108)]^(9/2)}^(-2/9)

    with lambda_nu = 0.83 (expression and value from memory).

    Parameters
    ----------
    gamma:
        Dwe*cos(alpha)/Dpw [-], 0 < gamma < 1.
    lambda_nu:
        Reduction factor for edge stresses and misalignment [-].

    Returns
    -------
    numpy.ndarray
        fc [-], same shape as ``gamma``.
    """
    g = np.asarray(gamma, dtype=np.float64)
    if np.any(g <= 0.0) or np.any(g >= 1.0):
        raise ValueError("fc_roller_formula: need 0 < gamma < 1")
    shape = g ** (2.0 / 9.0) * (1.0 - g) ** (29.0 / 27.0) / (1.0 + g) ** 0.25
    q = 1.04 * ((1.0 - g) / (1.0 + g)) ** (143.0 / 108.0)
    bracket = (1.0 + q**4.5) ** (-2.0 / 9.0)
    return np.asarray(LP_ROLLER_CONSTANT * lambda_nu * shape * bracket, dtype=np.float64)


def _hertz_ball_load_per_dw2(
    gamma: float, f: float, outer: bool, p_max_MPa: float, E_MPa: float, poisson: float
) -> float:
    """Ball load Q/Dw^2 [MPa] giving contact stress ``p_max_MPa`` at one ring (Hertz)."""
    from scipy.optimize import brentq  # lazy: only the rating estimate needs them
    from scipy.special import ellipe, ellipk

    s = -1.0 if outer else 1.0
    # curvatures times Dw: ball 2 + 2, raceway along the rolling direction, groove.
    rho = (2.0, 2.0, s * 2.0 * gamma / (1.0 - s * gamma), -1.0 / f)
    total = sum(rho)
    f_rho = ((rho[0] - rho[1]) + (rho[2] - rho[3])) / total

    def mismatch(m: float) -> float:
        k, e = float(ellipk(m)), float(ellipe(m))
        return ((2.0 - m) * e - 2.0 * (1.0 - m) * k) / (m * e) - f_rho

    m = brentq(mismatch, 1e-12, 1.0 - 1e-14, xtol=1e-15)
    e_m = float(ellipe(m))
    kappa = 1.0 / math.sqrt(1.0 - m)  # a/b
    e_prime = E_MPa / (1.0 - poisson**2)  # two bodies of the same steel
    radius = 1.0 / total  # 1/sum(rho), in units of Dw
    # a^3 = 6 kappa^2 E(m) Q R/(pi E'), p_max = 3 Q kappa/(2 pi a^2)  ->  Q/Dw^2:
    root_q = (6.0 * kappa**2 * e_m * radius / (math.pi * e_prime)) / (
        3.0 * kappa / (2.0 * math.pi * p_max_MPa)
    ) ** 1.5
    return root_q**2


def f0_ball_formula(
    gamma: npt.ArrayLike,
    fi: float = F0_FI,
    fe: float = F0_FE,
    p_max_MPa: float = F0_CONTACT_STRESS_MPA,
    E_MPa: float = STEEL_E_MPA,
    poisson: float = STEEL_POISSON,
) -> FloatArray:
    """Closed form of ISO 76 f0 for radial ball bearings from the Hertz contact.

    The static rating is the radial load at which the most heavily loaded ball
    (Qmax = 5 Fr/(Z cos a), Stribeck) makes ``p_max_MPa`` at the more heavily stressed
    ring contact; so f0 = min(Q_inner, Q_outer)/(5 Dw^2). Q from Hertz's elliptical
    contact (complete elliptic integrals, exact eccentricity). Basis values from memory
    of ISO 76:2006: 4200 MPa, groove radii 0.52 Dw inner and 0.53 Dw outer, steel
    E = 207 GPa, nu = 0.3. Loops over the elements (a root solve each).

    Parameters
    ----------
    gamma:
        Dw*cos(alpha)/Dpw [-], 0 <= gamma < 1.
    fi, fe:
        Inner and outer groove radii as fractions of Dw [-].
    p_max_MPa:
        Permissible contact stress [MPa].
    E_MPa, poisson:
        Elastic constants of ball and rings [MPa, -].

    Returns
    -------
    numpy.ndarray
        f0 [MPa, i.e. N/mm^2 in C0 = f0 i Z Dw^2 cos a], same shape as ``gamma``.
    """
    g = np.asarray(gamma, dtype=np.float64)
    if np.any(g < 0.0) or np.any(g >= 1.0):
        raise ValueError("f0_ball_formula: need 0 <= gamma < 1")
    out = np.empty_like(g)
    for idx, value in np.ndenumerate(g):
        q_in = _hertz_ball_load_per_dw2(float(value), fi, False, p_max_MPa, E_MPa, poisson)
        q_out = _hertz_ball_load_per_dw2(float(value), fe, True, p_max_MPa, E_MPa, poisson)
        out[idx] = min(q_in, q_out) / STRIBECK_CONSTANT
    return out


def f0_radial_ball(gamma: npt.ArrayLike) -> FloatArray:
    """ISO 76:2006 factor f0 of radial ball bearings, linear in the table (from memory).

    The table is :data:`shaftsys.bearings.equivalent.F0_VALUES` (gamma 0..0.40); above
    0.40 the last value is not extended: a ValueError is raised.

    Parameters
    ----------
    gamma:
        Dw*cos(alpha)/Dpw [-], 0 <= gamma <= 0.40.

    Returns
    -------
    numpy.ndarray
        f0 [N/mm^2], same shape as ``gamma``.
    """
    g = _gamma_in_table(gamma, F0_GAMMA, "f0_radial_ball")
    return np.asarray(np.interp(g, F0_GAMMA, F0_VALUES), dtype=np.float64)


def _gamma(d_mm: npt.ArrayLike, alpha_deg: npt.ArrayLike, Dpw_mm: npt.ArrayLike) -> FloatArray:
    dpw = np.asarray(Dpw_mm, dtype=np.float64)
    if np.any(dpw <= 0.0):
        raise ValueError("pitch diameter Dpw must be > 0")
    return np.asarray(
        np.asarray(d_mm, dtype=np.float64) * np.cos(np.radians(alpha_deg)) / dpw,
        dtype=np.float64,
    )


def _positive(name: str, value: npt.ArrayLike) -> FloatArray:
    arr = np.asarray(value, dtype=np.float64)
    if np.any(~np.isfinite(arr)) or np.any(arr <= 0.0):
        raise ValueError(f"{name} must be finite and > 0")
    return arr


def _angle(alpha_deg: npt.ArrayLike) -> FloatArray:
    a = np.asarray(alpha_deg, dtype=np.float64)
    if np.any(a < 0.0) or np.any(a >= 90.0):
        raise ValueError("radial bearing contact angle must satisfy 0 <= alpha < 90 deg")
    return a


def dynamic_rating_ball(
    i: npt.ArrayLike,
    Z: npt.ArrayLike,
    Dw_mm: npt.ArrayLike,
    alpha_deg: npt.ArrayLike,
    Dpw_mm: npt.ArrayLike,
    bm: float = BM_RADIAL_BALL,
) -> FloatArray:
    """Basic dynamic radial load rating C [N] of a radial ball bearing (ISO 281:2007).

    C = bm fc (i cos a)^0.7 Z^(2/3) Dw^1.8 for Dw <= 25.4 mm, and
    C = 3.647 bm fc (i cos a)^0.7 Z^(2/3) Dw^1.4 above (ISO 281:2007, 6.1.1);
    fc from :func:`fc_radial_ball` at gamma = Dw cos a/Dpw.

    Parameters
    ----------
    i:
        Number of rows [-].
    Z:
        Balls per row [-].
    Dw_mm:
        Ball diameter [mm].
    alpha_deg:
        Nominal contact angle [deg].
    Dpw_mm:
        Pitch diameter of the ball set [mm].
    bm:
        Rating factor for contemporary steel [-] (1.3 radial ball bearings, from memory).

    Returns
    -------
    numpy.ndarray
        C [N] (broadcast shape of the arguments).
    """
    dw = _positive("Dw_mm", Dw_mm)
    a = _angle(alpha_deg)
    fc = fc_radial_ball(_gamma(dw, a, Dpw_mm))
    common = (
        bm
        * fc
        * (_positive("i", i) * np.cos(np.radians(a))) ** 0.7
        * _positive("Z", Z) ** (2.0 / 3.0)
    )
    small = dw**1.8
    large = LARGE_BALL_FACTOR * dw**1.4
    return np.asarray(common * np.where(dw <= BALL_DW_LIMIT_MM, small, large), dtype=np.float64)


def dynamic_rating_roller(
    i: npt.ArrayLike,
    Z: npt.ArrayLike,
    Lwe_mm: npt.ArrayLike,
    Dwe_mm: npt.ArrayLike,
    alpha_deg: npt.ArrayLike,
    Dpw_mm: npt.ArrayLike,
    bm: float,
) -> FloatArray:
    """Basic dynamic radial load rating C [N] of a radial roller bearing (ISO 281:2007).

    C = bm fc (i Lwe cos a)^(7/9) Z^(3/4) Dwe^(29/27) (ISO 281:2007, 7.1.1), fc from
    :func:`fc_radial_roller` at gamma = Dwe cos a/Dpw.

    Parameters
    ----------
    i:
        Number of rows [-].
    Z:
        Rollers per row [-].
    Lwe_mm:
        Effective roller length [mm].
    Dwe_mm:
        Roller diameter for the rating (mean diameter of a tapered roller) [mm].
    alpha_deg:
        Nominal contact angle [deg] (0 for cylindrical).
    Dpw_mm:
        Pitch diameter of the roller set [mm].
    bm:
        Rating factor [-]: :data:`BM_BY_KIND` (cylindrical and tapered 1.1, spherical
        1.15; from memory of ISO 281:2007).

    Returns
    -------
    numpy.ndarray
        C [N].
    """
    dwe = _positive("Dwe_mm", Dwe_mm)
    a = _angle(alpha_deg)
    fc = fc_radial_roller(_gamma(dwe, a, Dpw_mm))
    length = _positive("i", i) * _positive("Lwe_mm", Lwe_mm) * np.cos(np.radians(a))
    return np.asarray(
        bm * fc * length ** (7.0 / 9.0) * _positive("Z", Z) ** 0.75 * dwe ** (29.0 / 27.0),
        dtype=np.float64,
    )


def static_rating_ball(
    i: npt.ArrayLike,
    Z: npt.ArrayLike,
    Dw_mm: npt.ArrayLike,
    alpha_deg: npt.ArrayLike,
    Dpw_mm: npt.ArrayLike,
    f0: npt.ArrayLike | None = None,
) -> FloatArray:
    """Basic static radial load rating C0 [N] of a radial ball bearing (ISO 76:2006).

    C0 = f0 i Z Dw^2 cos a, with f0 from the ISO 76 table at gamma = Dw cos a/Dpw
    (:func:`f0_radial_ball`) unless given.

    Parameters
    ----------
    i, Z:
        Rows and balls per row [-].
    Dw_mm:
        Ball diameter [mm].
    alpha_deg:
        Nominal contact angle [deg].
    Dpw_mm:
        Pitch diameter [mm].
    f0:
        Factor [N/mm^2]; ``None`` = from the table.

    Returns
    -------
    numpy.ndarray
        C0 [N].
    """
    dw = _positive("Dw_mm", Dw_mm)
    a = _angle(alpha_deg)
    factor = (
        f0_radial_ball(_gamma(dw, a, Dpw_mm))
        if f0 is None
        else _positive("f0", f0)
    )
    return np.asarray(
        factor * _positive("i", i) * _positive("Z", Z) * dw**2 * np.cos(np.radians(a)),
        dtype=np.float64,
    )


def static_rating_roller(
    i: npt.ArrayLike,
    Z: npt.ArrayLike,
    Lwe_mm: npt.ArrayLike,
    Dwe_mm: npt.ArrayLike,
    alpha_deg: npt.ArrayLike,
    Dpw_mm: npt.ArrayLike,
) -> FloatArray:
    """Basic static radial load rating C0 [N] of a radial roller bearing (ISO 76:2006).

    C0 = 44 (1 - Dwe cos a/Dpw) i Z Lwe Dwe cos a (4000 MPa at the most heavily loaded
    roller contact).

    Parameters
    ----------
    i, Z:
        Rows and rollers per row [-].
    Lwe_mm, Dwe_mm:
        Effective roller length and roller diameter [mm].
    alpha_deg:
        Nominal contact angle [deg].
    Dpw_mm:
        Pitch diameter [mm].

    Returns
    -------
    numpy.ndarray
        C0 [N].
    """
    dwe = _positive("Dwe_mm", Dwe_mm)
    a = _angle(alpha_deg)
    g = _gamma(dwe, a, Dpw_mm)
    if np.any(g >= 1.0):
        raise ValueError("static_rating_roller: Dwe cos(alpha) must be smaller than Dpw")
    return np.asarray(
        C0_ROLLER_CONSTANT_MPA
        * (1.0 - g)
        * _positive("i", i)
        * _positive("Z", Z)
        * _positive("Lwe_mm", Lwe_mm)
        * dwe
        * np.cos(np.radians(a)),
        dtype=np.float64,
    )


def _kind(kind: BearingKind | str) -> BearingKind:
    try:
        return BearingKind(kind)
    except ValueError:
        raise ValueError(f"unknown bearing type {kind!r}") from None


def pressure_centre_offset_mm(
    kind: BearingKind | str,
    d_mm: npt.ArrayLike,
    D_mm: npt.ArrayLike,
    contact_angle_deg: npt.ArrayLike,
) -> FloatArray:
    """Distance from mid-width to the pressure centre [mm], (dm/2) tan(alpha).

    The contact lines of an angular-contact ball or tapered roller bearing meet the axis
    off the mid-width; with dm = (d + D)/2 as the diameter of the contact points that
    distance is (dm/2) tan(alpha) (geometry). It equals the handbook forms a - B/2 with
    a = 0.5 (B + dm tan a) from a side face (angular contact) and a - T/2 with
    a = T/2 + (d + D) e/6, e = 1.5 tan a (tapered), both from memory. Other types: 0.

    Parameters
    ----------
    kind:
        Bearing type (a :class:`BearingKind` or its string value).
    d_mm, D_mm:
        Bore and outside diameter [mm].
    contact_angle_deg:
        Nominal contact angle [deg].

    Returns
    -------
    numpy.ndarray
        Offset [mm] (>= 0).
    """
    k = _kind(kind)
    d = np.asarray(d_mm, dtype=np.float64)
    D = np.asarray(D_mm, dtype=np.float64)
    if np.any(d >= D) or np.any(d < 0.0):
        raise ValueError("need D > d >= 0")
    if k not in (BearingKind.ANGULAR_CONTACT_BALL, BearingKind.TAPERED_ROLLER):
        return np.asarray(np.zeros(np.broadcast(d, D, contact_angle_deg).shape))
    a = _angle(contact_angle_deg)
    return np.asarray(0.25 * (d + D) * np.tan(np.radians(a)), dtype=np.float64)


@dataclass(frozen=True)
class AngleFactors:
    """ISO formula factors from the contact angle (``None`` where the type has none).

    Attributes
    ----------
    e: limit of Fa/Fr [-], 1.5 tan a.
    Y: single-row tapered, Fa/Fr > e (X = 0.4) [-], 0.4 cot a.
    Y1, Y2: double-row (spherical, paired tapered): Fa/Fr <= e (X = 1) and > e
        (X = 0.67) [-], 0.45 cot a and 0.67 cot a.
    Y0: static axial factor [-], 0.22 cot a single row, 0.44 cot a double row.
    """

    e: float
    Y: float | None
    Y1: float | None
    Y2: float | None
    Y0: float


def angle_factors(kind: BearingKind | str, contact_angle_deg: float, rows: int = 1) -> AngleFactors:
    """ISO 281:2007 Table 4 / ISO 76:2006 factors of a roller bearing from its angle.

    Tapered single row: e = 1.5 tan a, Y = 0.4 cot a, Y0 = 0.22 cot a. Spherical roller
    and double-row tapered: e = 1.5 tan a, Y1 = 0.45 cot a, Y2 = 0.67 cot a,
    Y0 = 0.44 cot a. The multipliers are the ones shaftsys applies when a maker's factor
    is missing (equivalent.py, static.py).

    Parameters
    ----------
    kind:
        ``tapered_roller`` or ``spherical_roller``.
    contact_angle_deg:
        Nominal contact angle [deg], 0 < alpha < 90.
    rows:
        Rows (tapered only: 2 = a double-row unit or pair).

    Returns
    -------
    AngleFactors
    """
    k = _kind(kind)
    if not (0.0 < contact_angle_deg < 90.0):
        raise ValueError("contact angle must satisfy 0 < alpha < 90 deg")
    t = math.tan(math.radians(contact_angle_deg))
    e = E_TAN * t
    if k is BearingKind.TAPERED_ROLLER and rows == 1:
        return AngleFactors(e, Y_COT_TAPERED / t, None, None, Y0_COT_SINGLE / t)
    if k in (BearingKind.TAPERED_ROLLER, BearingKind.SPHERICAL_ROLLER):
        return AngleFactors(e, None, Y1_COT_ROLLER / t, Y2_COT_ROLLER / t, Y0_COT_DOUBLE / t)
    raise ValueError(f"angle_factors: ISO formula factors are for tapered/spherical, not {k}")


def fatigue_load_limit(C0_N: float, dm_mm: float, kind: BearingKind | str) -> float:
    """Fatigue load limit Cu [N]: shaftsys's ISO 281 Annex B estimate (from memory).

    Thin wrapper of :func:`shaftsys.bearings.lubrication.estimate_fatigue_load_limit`
    (ball C0/22, roller C0/8.2, reduced above dm = 100 mm), accepting a type string.
    """
    return estimate_fatigue_load_limit(C0_N, dm_mm, _kind(kind))
