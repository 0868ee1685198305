"""Equivalent dynamic load P = X*Fr + Y*Fa with the e-switch (ISO 281:2007, 6.2 and 7.2).

Tables are ISO 281:2007 Table 3 (radial ball bearings) and the formulas of Table 4
(radial roller bearings, contact angle not 0). Values between table points are taken
by linear interpolation, as the standard's note to Table 3 permits. The ISO 281 and
ISO 76 table values below were typed from memory of the standard and checked for
internal consistency (e.g. the 15 deg relative loads are the deep-groove series divided
by cos 15 deg); verify against a copy of the standard before certification work.

Loads are in N; ``Fr`` is the radial load magnitude (>= 0) and ``Fa`` the axial load
(its sign, i.e. direction, is ignored here: the load model decides which support takes
it). Every function is pure and vectorised over the cases.
"""

from __future__ import annotations

import logging
import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np
import numpy.typing as npt

from shaftsys.bearings._util import BoolArray, FloatArray, as_float_array, case_name
from shaftsys.bearings.arrays import BearingArrays, RowErrors
from shaftsys.errors import ModelError
from shaftsys.model.bearing import Bearing, BearingKind

_log = logging.getLogger(__name__)

# --- ISO 281:2007 Table 3, deep groove ball bearings (single and double row) --------
#: relative axial load f0*Fa/C0r (C0r = static rating of the whole bearing)
DEEP_GROOVE_REL_LOAD = (0.172, 0.345, 0.689, 1.03, 1.38, 2.07, 3.45, 5.17, 6.89)
DEEP_GROOVE_E = (0.19, 0.22, 0.26, 0.28, 0.30, 0.34, 0.38, 0.42, 0.44)
#: Y for Fa/Fr > e (single row, and double row which has the same values)
DEEP_GROOVE_Y = (2.30, 1.99, 1.71, 1.55, 1.45, 1.31, 1.15, 1.04, 1.00)
DEEP_GROOVE_X = 0.56

# --- ISO 281:2007 Table 3, angular contact ball bearings, alpha = 15 deg ---------------
#: relative axial load f0*i*Fa/C0r
AC15_REL_LOAD = (0.178, 0.357, 0.714, 1.07, 1.43, 2.14, 3.57, 5.35, 7.14)
AC15_E = (0.38, 0.40, 0.43, 0.46, 0.47, 0.50, 0.55, 0.56, 0.56)
AC15_Y_SINGLE = (1.47, 1.40, 1.30, 1.23, 1.19, 1.12, 1.02, 1.00, 1.00)  # X = 0.44
AC15_Y1_DOUBLE = (1.65, 1.57, 1.46, 1.38, 1.34, 1.26, 1.14, 1.12, 1.12)  # X = 1
AC15_Y2_DOUBLE = (2.39, 2.28, 2.11, 2.00, 1.93, 1.82, 1.66, 1.63, 1.63)  # X = 0.72
AC15_X_SINGLE = 0.44
AC15_X2_DOUBLE = 0.72

#: ISO 281:2007 Table 3, angular contact ball bearings with load-independent factors:
#: alpha [deg] -> (e, X single, Y single, Y1 double (X=1), X2 double, Y2 double)
AC_FIXED: dict[float, tuple[float, float, float, float, float, float]] = {
    20.0: (0.57, 0.43, 1.00, 1.09, 0.70, 1.63),
    25.0: (0.68, 0.41, 0.87, 0.92, 0.67, 1.41),
    30.0: (0.80, 0.39, 0.76, 0.78, 0.63, 1.24),
    35.0: (0.95, 0.37, 0.66, 0.66, 0.60, 1.07),
    40.0: (1.14, 0.35, 0.57, 0.55, 0.57, 0.93),
    45.0: (1.34, 0.33, 0.50, 0.47, 0.54, 0.81),
}
AC_ANGLES = (15.0, 20.0, 25.0, 30.0, 35.0, 40.0, 45.0)

# --- ISO 76:2006 factor f0 for radial ball bearings (deep groove / angular contact) ----
#: Dw*cos(alpha)/Dpw from 0.00 to 0.40 in steps of 0.01 (from memory of ISO 76:2006).
F0_GAMMA = tuple(round(0.01 * k, 2) for k in range(41))
F0_VALUES = (
    14.7, 14.9, 15.1, 15.3, 15.5, 15.7, 15.9, 16.1, 16.3, 16.5,
    16.4, 16.1, 15.9, 15.6, 15.4, 15.2, 14.9, 14.7, 14.4, 14.2,
    14.0, 13.7, 13.5, 13.2, 13.0, 12.8, 12.5, 12.3, 12.1, 11.8,
    11.6, 11.4, 11.2, 10.9, 10.7, 10.5, 10.3, 10.0, 9.8, 9.6, 9.4,
)  # fmt: skip

#: Ball diameter estimate Dw ~ 0.3*(D - d) (common practice, no source).
BALL_DIAMETER_RATIO = 0.3

#: X above e for double-row (paired) bearings with maker's Y1/Y2: ISO 281:2007 Table 4
#: (radial roller, alpha != 0) and Table 3 (self-aligning ball).
X2_ROLLER = 0.67
X2_SELF_ALIGNING_BALL = 0.65
#: X above e for single-row tapered roller bearings (ISO 281:2007 Table 4).
X_TAPERED_SINGLE = 0.4

#: Fa/Fr above which a warning is issued for a cylindrical roller bearing with ribs
#: (common practice, no source: occasional axial load).
RIBBED_CYLINDRICAL_FA_FR_LIMIT = 0.4


@dataclass(frozen=True)
class EquivalentLoad:
    """Equivalent dynamic load per case.

    Attributes
    ----------
    P_N: equivalent dynamic load [N], shape (n_cases,).
    X, Y: radial and axial factors used per case [-].
    e: the e-limit of Fa/Fr used per case [-] (nan for types without an e-switch).
    f0: geometry factor used (given or estimated) or ``None`` when not needed.
    f0_estimated: True when ``f0`` was estimated (results rest on an estimate).
    warnings: human-readable warnings (also logged).
    """

    P_N: FloatArray
    X: FloatArray
    Y: FloatArray
    e: FloatArray
    f0: float | None
    f0_estimated: bool
    warnings: tuple[str, ...]


def estimate_f0(d_mm: float, D_mm: float, contact_angle_deg: float = 0.0) -> float:
    """Estimate ISO 76 factor f0 of a radial ball bearing from its envelope.

    Common practice, no source: ball diameter Dw ~ 0.3*(D - d) and pitch diameter
    Dpw ~ (d + D)/2; f0 is then read (linear interpolation) from the ISO 76:2006 table
    of f0 against Dw*cos(alpha)/Dpw for deep groove and angular contact bearings.

    Parameters
    ----------
    d_mm, D_mm:
        Bore and outside diameter [mm].
    contact_angle_deg:
        Nominal contact angle [deg].

    Returns
    -------
    float
        f0 [-].
    """
    if not (D_mm > d_mm >= 0.0):
        raise ValueError(f"need D > d >= 0 to estimate f0, got d={d_mm} mm, D={D_mm} mm")
    dw = BALL_DIAMETER_RATIO * (D_mm - d_mm)
    dpw = 0.5 * (d_mm + D_mm)
    gamma = dw * math.cos(math.radians(contact_angle_deg)) / dpw
    return float(np.interp(gamma, F0_GAMMA, F0_VALUES))


def deep_groove_factors(rel_axial_load: npt.ArrayLike) -> tuple[FloatArray, FloatArray]:
    """Return e and Y (for Fa/Fr > e, with X = 0.56) of a deep groove ball bearing.

    ISO 281:2007 Table 3, linear interpolation on f0*Fa/C0r; outside the table the end
    values are used (the caller warns above the last point).

    Parameters
    ----------
    rel_axial_load:
        f0*Fa/C0r [-] per case.

    Returns
    -------
    (e, Y):
        Arrays [-].
    """
    x = np.asarray(rel_axial_load, dtype=np.float64)
    e = np.interp(x, DEEP_GROOVE_REL_LOAD, DEEP_GROOVE_E)
    y = np.interp(x, DEEP_GROOVE_REL_LOAD, DEEP_GROOVE_Y)
    return np.atleast_1d(e), np.atleast_1d(y)


def angular_contact_factors(
    contact_angle_deg: float, rel_axial_load: npt.ArrayLike, double_row: bool
) -> tuple[FloatArray, FloatArray, FloatArray, FloatArray, FloatArray]:
    """Factors of an angular contact ball bearing, ISO 281:2007 Table 3.

    Linear interpolation on the 15 deg row's relative load f0*i*Fa/C0r and, between
    table angles (15..45 deg), linearly on the contact angle (the standard's note).

    Parameters
    ----------
    contact_angle_deg:
        Nominal contact angle [deg], 15 <= alpha <= 45.
    rel_axial_load:
        f0*i*Fa/C0r [-] per case (only used where alpha < 20 deg).
    double_row:
        True for double row bearings and pairs back-to-back / face-to-face.

    Returns
    -------
    (e, X_low, Y_low, X_high, Y_high):
        Arrays [-]; "low" applies for Fa/Fr <= e, "high" for Fa/Fr > e.
    """
    alpha = float(contact_angle_deg)
    if not (AC_ANGLES[0] - 1e-9 <= alpha <= AC_ANGLES[-1] + 1e-9):
        raise ValueError(f"contact angle {alpha} deg outside ISO 281 Table 3 range 15..45")
    x = np.atleast_1d(np.asarray(rel_axial_load, dtype=np.float64))

    def row(a: float) -> tuple[FloatArray, ...]:
        ones = np.ones_like(x)
        if a == 15.0:
            e = np.interp(x, AC15_REL_LOAD, AC15_E)
            if double_row:
                return (
                    e,
                    ones,
                    np.interp(x, AC15_REL_LOAD, AC15_Y1_DOUBLE),
                    AC15_X2_DOUBLE * ones,
                    np.interp(x, AC15_REL_LOAD, AC15_Y2_DOUBLE),
                )
            return (
                e,
                ones,
                0.0 * ones,
                AC15_X_SINGLE * ones,
                np.interp(x, AC15_REL_LOAD, AC15_Y_SINGLE),
            )
        e_, xs, ys, y1, x2, y2 = AC_FIXED[a]
        if double_row:
            return (e_ * ones, ones, y1 * ones, x2 * ones, y2 * ones)
        return (e_ * ones, ones, 0.0 * ones, xs * ones, ys * ones)

    idx = int(np.searchsorted(AC_ANGLES, alpha - 1e-9))
    if abs(AC_ANGLES[min(idx, len(AC_ANGLES) - 1)] - alpha) <= 1e-9:
        r = row(AC_ANGLES[min(idx, len(AC_ANGLES) - 1)])
        return (r[0], r[1], r[2], r[3], r[4])
    a_lo, a_hi = AC_ANGLES[idx - 1], AC_ANGLES[idx]
    w = (alpha - a_lo) / (a_hi - a_lo)
    lo, hi = row(a_lo), row(a_hi)
    out = [(1.0 - w) * p + w * q for p, q in zip(lo, hi, strict=True)]
    return (out[0], out[1], out[2], out[3], out[4])


# --- array core: many rows (bearings, variants, catalogue rows) at once ----------------
#: How P is formed per row (``DynamicFactors.mode``).
MODE_RADIAL = 0  # P = Fr (cylindrical, needle roller)
MODE_THRUST = 1  # P = Fa (thrust ball, 90 deg)
MODE_SWITCH = 2  # e-switch with load-independent e, X, Y (maker's factors, overrides)
MODE_DEEP_GROOVE = 3  # ISO 281 Table 3 on f0*Fa/C0r
MODE_ANGULAR = 4  # ISO 281 Table 3, angular contact, interpolated on the angle

#: Names of the factors that may come from the contact angle (``DynamicFactors.derived``).
DERIVED_NAMES = ("e", "Y", "Y1", "Y2")

_AC = np.asarray(AC_ANGLES)
_nan = math.nan
#: AC_FIXED as arrays indexed like AC_ANGLES (index 0 = 15 deg, load dependent, unused).
_AC_FIX = np.array([[_nan] * 6] + [list(AC_FIXED[a]) for a in AC_ANGLES[1:]]).T


@dataclass(frozen=True, eq=False)
class DynamicFactors:
    """Load-independent recipe of P = X*Fr + Y*Fa per row (shape (N,) each).

    Attributes
    ----------
    mode: one of the ``MODE_*`` codes.
    e, x_low, y_low, x_high, y_high: factors of :data:`MODE_SWITCH` rows [-].
    rel_coef: f0 (deep groove) or f0*i (angular contact below 20 deg) [-]; the relative
        axial load is rel_coef*Fa/C0r.
    ac_lo, ac_hi, ac_w: bracketing indices into :data:`AC_ANGLES` and the weight of
        ``ac_hi`` for angular contact rows.
    f0: f0 used [-] (NaN when not needed); f0_estimated: it was estimated.
    derived: (N, 4) values of e, Y, Y1, Y2 taken from the contact angle (NaN = not).
    e_from_xy: e = (1 - X)/Y of an X/Y override; xy_ignored: override on P = Fr types.
    errors: first user error per row (``None`` = fine).
    """

    mode: npt.NDArray[np.intp]
    e: FloatArray
    x_low: FloatArray
    y_low: FloatArray
    x_high: FloatArray
    y_high: FloatArray
    rel_coef: FloatArray
    ac_lo: npt.NDArray[np.intp]
    ac_hi: npt.NDArray[np.intp]
    ac_w: FloatArray
    f0: FloatArray
    f0_estimated: BoolArray
    derived: FloatArray
    e_from_xy: BoolArray
    xy_ignored: BoolArray
    errors: tuple[ModelError | None, ...]


@dataclass(frozen=True, eq=False)
class EquivalentLoadArrays:
    """Equivalent dynamic load of N rows and m cases.

    Attributes
    ----------
    P_N: P [N], (N, m). X, Y, e: factors used [-], (N, m) (e NaN without an e-switch).
    rel_load: f0*Fa/C0r (deep groove) [-], NaN elsewhere; over_table: it exceeds 6.89.
    ribbed_axial: ribbed cylindrical roller case with Fa/Fr above the warning limit;
    Fa_over_Fr: Fa/Fr [-] (inf where Fr = 0).
    factors: the load-independent recipe; errors: first user error per row.
    """

    P_N: FloatArray
    X: FloatArray
    Y: FloatArray
    e: FloatArray
    rel_load: FloatArray
    over_table: BoolArray
    ribbed_axial: BoolArray
    Fa_over_Fr: FloatArray
    factors: DynamicFactors
    errors: tuple[ModelError | None, ...]


def estimate_f0_arrays(d_mm: FloatArray, D_mm: FloatArray, contact_angle_deg: FloatArray
                       ) -> FloatArray:
    """Vectorised :func:`estimate_f0` (NaN where D > d >= 0 does not hold) [-]."""
    ok = (D_mm > d_mm) & (d_mm >= 0.0)
    dw = BALL_DIAMETER_RATIO * (D_mm - d_mm)
    dpw = 0.5 * (d_mm + D_mm)
    with np.errstate(divide="ignore", invalid="ignore"):
        gamma = dw * np.cos(np.radians(contact_angle_deg)) / dpw
    return np.where(ok, np.interp(np.where(ok, gamma, 0.0), F0_GAMMA, F0_VALUES), np.nan)


def _missing_error(p: BearingArrays, i: int, name: str, why: str) -> ModelError:
    return ModelError(
        f"bearing '{p.ids[i]}' ({p.kind_value(i)}) needs '{name}' {why}",
        field=p.field(i, name),
        line=p.lines[i],
        expected=f"a number for {name}, or contact_angle_deg to use the ISO 281 formula",
    )


def dynamic_factors(p: BearingArrays) -> DynamicFactors:
    """Load-independent factors of every row (ISO 281:2007 Tables 3 and 4).

    Parameters
    ----------
    p:
        Bearing parameters (N, mm, deg).

    Returns
    -------
    DynamicFactors
        The recipe :func:`equivalent_dynamic_load_arrays` applies to the loads; rows with
        a user error (missing maker's factor without contact angle, unsupported angle,
        non-positive ratings) carry it in ``errors``.
    """
    n = len(p)
    err = RowErrors(n)
    err.add(~((p.C_N > 0.0) & (p.C0_N > 0.0)), lambda i: ModelError(
        f"bearing '{p.ids[i]}' needs positive ratings C and C0",
        field=p.field(i, "C_N" if not p.C_N[i] > 0.0 else "C0_N"),
        line=p.lines[i],
        expected="C > 0 and C0 > 0 [N]",
    ))
    K = BearingKind
    radial = p.is_kind(K.CYLINDRICAL_ROLLER, K.NEEDLE_ROLLER)
    has_x = ~np.isnan(p.X)
    over = ~radial & has_x
    thrust = p.is_kind(K.THRUST_BALL) & ~over
    dg = p.is_kind(K.DEEP_GROOVE_BALL) & ~over
    ac = p.is_kind(K.ANGULAR_CONTACT_BALL) & ~over
    tap1 = p.is_kind(K.TAPERED_ROLLER) & ~p.double & ~over
    pair = (p.is_kind(K.TAPERED_ROLLER) & p.double
            | p.is_kind(K.SPHERICAL_ROLLER, K.SELF_ALIGNING_BALL)) & ~over
    sab = p.is_kind(K.SELF_ALIGNING_BALL) & pair
    mode = np.full(n, MODE_SWITCH, dtype=np.intp)
    mode[radial] = MODE_RADIAL
    mode[thrust] = MODE_THRUST
    mode[dg] = MODE_DEEP_GROOVE
    mode[ac] = MODE_ANGULAR
    e = np.full(n, np.nan)
    xl, yl, xh, yh = np.ones(n), np.zeros(n), np.ones(n), np.zeros(n)

    # X/Y override
    err.add(over & np.isnan(p.Y),
            lambda i: _missing_error(p, i, "Y", "together with the X override"))
    e_from_xy = over & np.isnan(p.e)
    with np.errstate(divide="ignore", invalid="ignore"):
        e_xy = np.where(p.Y > 0.0, (1.0 - p.X) / np.where(p.Y > 0.0, p.Y, 1.0), math.inf)
    e = np.where(over, np.where(e_from_xy, e_xy, p.e), e)
    xh = np.where(over, p.X, xh)
    yh = np.where(over, p.Y, yh)

    # thrust ball at 90 deg
    alpha = p.contact_angle_deg
    err.add(thrust & ~np.isnan(alpha) & (np.abs(alpha - 90.0) > 1e-9), lambda i: ModelError(
        f"bearing '{p.ids[i]}': thrust ball bearings with contact angle {alpha[i]:g} "
        "deg are not built in",
        field=p.field(i, "contact_angle_deg"),
        line=p.lines[i],
        expected="90 deg, or give X, Y and e",
    ))

    # deep groove and angular contact: f0 and the relative axial load
    ac_ok = ~np.isnan(alpha) & (alpha >= AC_ANGLES[0] - 1e-9) & (alpha <= AC_ANGLES[-1] + 1e-9)
    err.add(ac & ~ac_ok, lambda i: ModelError(
        f"bearing '{p.ids[i]}': angular contact ball bearing needs a contact angle "
        f"in 15..45 deg for ISO 281 Table 3 (got {p.given(i, 'contact_angle_deg')})",
        field=p.field(i, "contact_angle_deg"),
        line=p.lines[i],
        expected="15 <= contact_angle_deg <= 45, or give X, Y and e",
    ))
    ac_table = ac & ac_ok & (alpha < AC_ANGLES[1] - 1e-9)
    needs_f0 = dg | ac_table
    f0_est = needs_f0 & np.isnan(p.f0)
    f0_angle = np.where(ac_table, alpha, 0.0)
    f0 = np.where(f0_est, estimate_f0_arrays(p.d_mm, p.D_mm, f0_angle), p.f0)
    f0 = np.where(needs_f0, f0, np.nan)
    err.add(f0_est & np.isnan(f0), lambda i: ModelError(
        f"bearing '{p.ids[i]}': need D > d >= 0 to estimate f0, got d={p.d_mm[i]} mm, "
        f"D={p.D_mm[i]} mm",
        field=p.field(i, "f0"),
        line=p.lines[i],
        expected="f0, or D > d >= 0 [mm]",
    ))
    rel_coef = np.where(dg, f0, np.where(ac_table, f0 * p.rows, 0.0))
    a = np.where(ac & ac_ok, alpha, AC_ANGLES[0])
    idx = np.searchsorted(_AC, a - 1e-9)
    top = np.minimum(idx, _AC.size - 1)
    exact = np.abs(_AC[top] - a) <= 1e-9
    lo = np.where(exact, top, np.maximum(idx - 1, 0))
    hi = np.where(exact, top, top)
    span = _AC[hi] - _AC[lo]
    w = np.where(exact, 0.0, (a - _AC[lo]) / np.where(span > 0.0, span, 1.0))

    # maker's factors or the ISO formula with the contact angle
    derived = np.full((n, len(DERIVED_NAMES)), np.nan)
    angle_ok = ~np.isnan(alpha) & (alpha > 0.0) & (alpha < 90.0)
    with np.errstate(divide="ignore", invalid="ignore"):
        t = np.tan(np.radians(np.where(angle_ok, alpha, 45.0)))

    def factor(rows_: BoolArray, name: str, coef: FloatArray) -> FloatArray:
        given = getattr(p, name)
        need = rows_ & np.isnan(given)
        err.add(need & ~angle_ok, lambda i: _missing_error(
            p, i, name, "(maker's factor) and has no contact angle to derive it"))
        from_angle = coef * (t if name == "e" else 1.0 / t)
        derived[:, DERIVED_NAMES.index(name)] = np.where(need & angle_ok, from_angle, np.nan)
        return np.where(need, from_angle, given)

    switch = tap1 | pair
    e_s = factor(switch, "e", np.full(n, 1.5))
    y_s = factor(tap1, "Y", np.full(n, 0.4))
    y1_s = factor(pair, "Y1", np.where(sab, 0.42, 0.45))
    y2_s = factor(pair, "Y2", np.where(sab, 0.65, 0.67))
    e = np.where(switch, e_s, e)
    yl = np.where(pair, y1_s, yl)
    xh = np.where(tap1, X_TAPERED_SINGLE,
                  np.where(pair, np.where(sab, X2_SELF_ALIGNING_BALL, X2_ROLLER), xh))
    yh = np.where(tap1, y_s, np.where(pair, y2_s, yh))
    return DynamicFactors(
        mode=mode, e=e, x_low=xl, y_low=yl, x_high=xh, y_high=yh, rel_coef=rel_coef,
        ac_lo=lo.astype(np.intp), ac_hi=hi.astype(np.intp), ac_w=w, f0=f0,
        f0_estimated=f0_est, derived=derived, e_from_xy=e_from_xy,
        xy_ignored=radial & has_x, errors=err.freeze(),
    )


def _ac_row(k: npt.NDArray[np.intp], rel: FloatArray, double: BoolArray
            ) -> tuple[FloatArray, ...]:
    """(e, X_low, Y_low, X_high, Y_high) of ISO 281 Table 3 rows ``k`` (N, 1) at ``rel``."""
    t15 = k == 0
    fix = _AC_FIX[:, k]  # (6, N, 1): e, X single, Y single, Y1 double, X2 double, Y2 double
    e = np.where(t15, np.interp(rel, AC15_REL_LOAD, AC15_E), fix[0])
    ones = np.ones_like(rel)
    y_low = np.where(double, np.where(t15, np.interp(rel, AC15_REL_LOAD, AC15_Y1_DOUBLE),
                                      fix[3]), 0.0)
    x_high = np.where(double, np.where(t15, AC15_X2_DOUBLE, fix[4]),
                      np.where(t15, AC15_X_SINGLE, fix[1]))
    y_high = np.where(double, np.where(t15, np.interp(rel, AC15_REL_LOAD, AC15_Y2_DOUBLE),
                                       fix[5]),
                      np.where(t15, np.interp(rel, AC15_REL_LOAD, AC15_Y_SINGLE), fix[2]))
    return e, ones, y_low * ones, x_high * ones, y_high * ones


def _broadcast_loads(p: BearingArrays, Fr_N: npt.ArrayLike, Fa_N: npt.ArrayLike
                     ) -> tuple[FloatArray, FloatArray]:
    """Fr, |Fa| as (N, m) float arrays; ValueError on negative or non-finite loads."""
    Fr = np.asarray(Fr_N, dtype=np.float64)
    Fa = np.abs(np.asarray(Fa_N, dtype=np.float64))
    if Fr.ndim == 1:
        Fr = Fr[None, :]
    if Fa.ndim == 1:
        Fa = Fa[None, :]
    m = max(Fr.shape[-1], Fa.shape[-1])
    Fr, Fa = np.broadcast_to(Fr, (len(p), m)), np.broadcast_to(Fa, (len(p), m))
    if np.any(Fr < 0.0) or not np.all(np.isfinite(Fr)) or not np.all(np.isfinite(Fa)):
        raise ValueError("Fr_N must be finite and >= 0 and Fa_N finite")
    return Fr, Fa


def _first_case(mask: BoolArray) -> npt.NDArray[np.intp]:
    """Index of the first True per row (0 where none)."""
    return np.argmax(mask, axis=1) if mask.shape[1] else np.zeros(mask.shape[0], np.intp)


def equivalent_dynamic_load_arrays(
    p: BearingArrays,
    Fr_N: npt.ArrayLike,
    Fa_N: npt.ArrayLike,
    case_ids: Sequence[str] | None = None,
    factors: DynamicFactors | None = None,
) -> EquivalentLoadArrays:
    """Equivalent dynamic load P [N] of N rows for m cases (ISO 281:2007 6.2, 7.2).

    Parameters
    ----------
    p:
        Bearing parameters of N rows.
    Fr_N, Fa_N:
        Radial load magnitude (>= 0) and axial load (sign ignored) [N], broadcastable
        to (N, m).
    case_ids:
        Case names for messages.
    factors:
        ``dynamic_factors(p)`` when already computed.

    Returns
    -------
    EquivalentLoadArrays
        Rows with a user error (axial load on a needle or rib-less cylindrical roller
        bearing, radial load on a thrust ball bearing, or an error of the factors) carry
        it in ``errors``; their numbers are not meaningful.
    """
    Fr, Fa = _broadcast_loads(p, Fr_N, Fa_N)
    f = dynamic_factors(p) if factors is None else factors
    err = RowErrors(len(p), f.errors)
    tol = (1e-9 * np.maximum(np.abs(p.C_N), 1.0))[:, None]
    mode = f.mode[:, None]
    K = BearingKind
    # P = Fr types: axial load only on ribbed cylindrical roller bearings
    axial = Fa > tol
    any_axial = np.any(axial, axis=1)
    radial = f.mode == MODE_RADIAL
    no_axial = p.is_kind(K.NEEDLE_ROLLER) | ~p.ribs
    k_ax = _first_case(axial)
    err.add(radial & any_axial & no_axial, lambda i: ModelError(
        f"bearing '{p.ids[i]}' ("
        f"{'needle roller' if p.is_kind(K.NEEDLE_ROLLER)[i] else 'cylindrical roller bearing without ribs'}"  # noqa: E501
        f") carries axial load Fa = {Fa[i, k_ax[i]]:.6g} N in case "
        f"{case_name(case_ids, int(k_ax[i]))}; it cannot take axial load",
        field=p.field(i, "axial"),
        line=p.lines[i],
        expected="axial: float (or ribs: true for a cylindrical roller bearing)",
    ))
    with np.errstate(divide="ignore", invalid="ignore"):
        ratio = np.where(Fr > 0.0, Fa / np.where(Fr > 0.0, Fr, 1.0), np.inf)
    ribbed = (radial & any_axial & ~no_axial)[:, None] & (ratio > RIBBED_CYLINDRICAL_FA_FR_LIMIT)
    # P = Fa types: no radial load
    radial_load = Fr > tol
    k_r = _first_case(radial_load)
    err.add((f.mode == MODE_THRUST) & np.any(radial_load, axis=1), lambda i: ModelError(
        f"bearing '{p.ids[i]}' (thrust ball, 90 deg) carries radial load Fr = "
        f"{Fr[i, k_r[i]]:.6g} N in case {case_name(case_ids, int(k_r[i]))}; it takes axial "
        "load only",
        field=p.field(i, "kind"),
        line=p.lines[i],
        expected="a radial support next to the thrust bearing",
    ))
    if bool(np.all(radial)):   # P = Fr rows only (a study's floating rollers): no tables
        nan = np.full(Fr.shape, np.nan)
        return EquivalentLoadArrays(
            P_N=np.array(Fr, dtype=np.float64), X=np.ones(Fr.shape), Y=np.zeros(Fr.shape),
            e=nan, rel_load=nan.copy(), over_table=np.zeros(Fr.shape, dtype=bool),
            ribbed_axial=ribbed, Fa_over_Fr=ratio, factors=f, errors=err.freeze(),
        )
    with np.errstate(divide="ignore", invalid="ignore"):
        rel = f.rel_coef[:, None] * Fa / p.C0_N[:, None]
    # deep groove (Table 3)
    dg = mode == MODE_DEEP_GROOVE
    e = np.where(dg, np.interp(rel, DEEP_GROOVE_REL_LOAD, DEEP_GROOVE_E), f.e[:, None])
    xl = np.where(dg, 1.0, f.x_low[:, None])
    yl = np.where(dg, 0.0, f.y_low[:, None])
    xh = np.where(dg, DEEP_GROOVE_X, f.x_high[:, None])
    yh = np.where(dg, np.interp(rel, DEEP_GROOVE_REL_LOAD, DEEP_GROOVE_Y), f.y_high[:, None])
    # angular contact (Table 3), interpolated on the angle
    ac = f.mode == MODE_ANGULAR
    if np.any(ac):
        dbl = p.double[ac][:, None]
        w = f.ac_w[ac][:, None]
        lo = _ac_row(f.ac_lo[ac][:, None], rel[ac], dbl)
        hi = _ac_row(f.ac_hi[ac][:, None], rel[ac], dbl)
        vals = [(1.0 - w) * a + w * b for a, b in zip(lo, hi, strict=True)]
        e, xl, yl, xh, yh = (np.array(np.broadcast_to(v, Fr.shape)) for v in (e, xl, yl, xh, yh))
        e[ac], xl[ac], yl[ac], xh[ac], yh[ac] = vals
    with np.errstate(invalid="ignore"):
        high = Fa > e * Fr
        X = np.where(high, xh, xl)
        Y = np.where(high, yh, yl)
        P = X * Fr + Y * Fa
    r_rows, t_rows = mode == MODE_RADIAL, mode == MODE_THRUST
    P = np.where(r_rows, Fr, np.where(t_rows, Fa, P))
    X = np.where(r_rows, 1.0, np.where(t_rows, 0.0, X))
    Y = np.where(r_rows, 0.0, np.where(t_rows, 1.0, Y))
    e = np.where(r_rows | t_rows, np.nan, np.broadcast_to(e, Fr.shape))
    rel_out = np.where(dg, rel, np.nan)
    return EquivalentLoadArrays(
        P_N=P, X=X, Y=Y, e=e, rel_load=rel_out,
        over_table=dg & (rel > DEEP_GROOVE_REL_LOAD[-1]),
        ribbed_axial=ribbed, Fa_over_Fr=ratio, factors=f, errors=err.freeze(),
    )


def dynamic_load_notes(
    p: BearingArrays, eq: EquivalentLoadArrays, i: int, case_ids: Sequence[str] | None = None
) -> list[str]:
    """Warnings of row ``i`` (estimated f0, factors from the angle, table limits)."""
    f = eq.factors
    bid = p.ids[i]
    notes: list[str] = []
    for k in np.flatnonzero(eq.ribbed_axial[i]):
        notes.append(
            f"bearing '{bid}', case {case_name(case_ids, int(k))}: axial load "
            f"on ribbed cylindrical roller bearing Fa/Fr = {eq.Fa_over_Fr[i, k]:.3g} > "
            f"{RIBBED_CYLINDRICAL_FA_FR_LIMIT} (common practice, no source); P "
            "uses Fr only - check the maker's axial-load rules"
        )
    if f.xy_ignored[i]:
        notes.append(f"bearing '{bid}': X/Y override ignored (P = Fr for {p.kind_value(i)})")
    if f.e_from_xy[i]:
        notes.append(
            f"bearing '{bid}': e not given with X/Y override; e = (1 - X)/Y = "
            f"{f.e[i]:.4g} (where X*Fr + Y*Fa = Fr)"
        )
    if f.f0_estimated[i]:
        notes.append(
            f"bearing '{bid}': f0 not given, estimated f0 = {f.f0[i]:.3g} from "
            "Dw ~ 0.3*(D-d), Dpw = (d+D)/2 and the ISO 76 f0 table (common practice)"
        )
    for k in np.flatnonzero(eq.over_table[i]):
        notes.append(
            f"bearing '{bid}', case {case_name(case_ids, int(k))}: f0*Fa/C0 = "
            f"{eq.rel_load[i, k]:.3g} above ISO 281 Table 3 range ({DEEP_GROOVE_REL_LOAD[-1]}); "
            "last table values used - the permissible axial load depends on the design"
        )
    for j, name in enumerate(DERIVED_NAMES):
        if not np.isnan(f.derived[i, j]):
            notes.append(
                f"bearing '{bid}': {name} = {f.derived[i, j]:.4g} from the ISO 281:2007 "
                f"formula with contact angle {p.contact_angle_deg[i]:g} deg (maker's value "
                "not given)"
            )
    return notes


def equivalent_dynamic_load(
    bearing: Bearing,
    Fr_N: npt.ArrayLike,
    Fa_N: npt.ArrayLike,
    case_ids: Sequence[str] | None = None,
) -> EquivalentLoad:
    """Equivalent dynamic load P [N] of ``bearing`` for every case.

    A one-row wrapper of :func:`equivalent_dynamic_load_arrays`.

    Parameters
    ----------
    bearing:
        The support (ratings in N, diameters in mm, angles in deg).
    Fr_N:
        Radial load magnitude per case [N] (>= 0).
    Fa_N:
        Axial load per case [N] (sign ignored).
    case_ids:
        Case names for messages (optional).

    Returns
    -------
    EquivalentLoad
        P [N], X, Y, e [-] per case, f0 used and warnings.

    Raises
    ------
    ModelError
        Axial load on a needle / rib-less cylindrical roller bearing, radial load on a
        pure thrust ball bearing, missing maker's factors, unsupported contact angle.
    """
    Fr = as_float_array(Fr_N, "Fr_N")
    Fa = np.abs(as_float_array(Fa_N, "Fa_N"))
    if Fr.shape != Fa.shape:
        raise ValueError(f"Fr_N and Fa_N differ in shape: {Fr.shape} vs {Fa.shape}")
    p = BearingArrays.from_bearings([bearing])
    eq = equivalent_dynamic_load_arrays(p, Fr[None, :], Fa[None, :], case_ids)
    exc = eq.errors[0]
    if exc is not None:
        raise exc
    notes = dynamic_load_notes(p, eq, 0, case_ids)
    for note in notes:
        _log.warning(note)
    f0 = float(eq.factors.f0[0])
    return EquivalentLoad(
        eq.P_N[0], eq.X[0], eq.Y[0], eq.e[0], None if math.isnan(f0) else f0,
        bool(eq.factors.f0_estimated[0]), tuple(notes),
    )
