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

from shaftsys.bearings._util import (
    FloatArray,
    as_float_array,
    case_name,
    field,
    zero_tolerance_N,
)
from shaftsys.errors import ModelError
from shaftsys.model.bearing import Bearing, BearingKind, SetArrangement

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

_DOUBLE = frozenset(
    {SetArrangement.BACK_TO_BACK, SetArrangement.FACE_TO_FACE, SetArrangement.DOUBLE_ROW}
)


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


def _switch(
    Fr: FloatArray,
    Fa: FloatArray,
    e: FloatArray,
    x_low: FloatArray,
    y_low: FloatArray,
    x_high: FloatArray,
    y_high: FloatArray,
) -> tuple[FloatArray, FloatArray, FloatArray]:
    """Apply the e-switch: (P, X, Y) with "high" factors where Fa > e*Fr."""
    high = Fa > e * Fr
    X = np.where(high, x_high, x_low)
    Y = np.where(high, y_high, y_low)
    return X * Fr + Y * Fa, X, Y


def _require(bearing: Bearing, name: str, why: str) -> float:
    value = getattr(bearing, name)
    if value is None:
        raise ModelError(
            f"bearing '{bearing.id}' ({bearing.kind.value}) needs '{name}' {why}",
            field=field(bearing, name),
            line=bearing.line,
            expected=f"a number for {name}, or contact_angle_deg to use the ISO 281 formula",
        )
    return float(value)


def _angle_factors(
    bearing: Bearing, names: Sequence[str], formulas: dict[str, float], notes: list[str]
) -> dict[str, float]:
    """Maker's factors ``names``; each missing one from the ISO formula via the angle.

    ``formulas`` maps a factor name to its multiplier on cot(alpha) (or, for ``e``, on
    tan(alpha)).
    """
    out: dict[str, float] = {}
    alpha = bearing.contact_angle_deg
    for name in names:
        value = getattr(bearing, name)
        if value is not None:
            out[name] = float(value)
            continue
        if alpha is None or not (0.0 < alpha < 90.0):
            _require(bearing, name, "(maker's factor) and has no contact angle to derive it")
        assert alpha is not None
        t = math.tan(math.radians(alpha))
        out[name] = formulas[name] * (t if name == "e" else 1.0 / t)
        notes.append(
            f"bearing '{bearing.id}': {name} = {out[name]:.4g} from the ISO 281:2007 "
            f"formula with contact angle {alpha:g} deg (maker's value not given)"
        )
    return out


def equivalent_dynamic_load(
    bearing: Bearing,
    Fr_N: npt.ArrayLike,
    Fa_N: npt.ArrayLike,
    case_ids: Sequence[str] | None = None,
) -> EquivalentLoad:
    """Equivalent dynamic load P [N] of ``bearing`` for every case.

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
    if np.any(Fr < 0.0) or not np.all(np.isfinite(Fr)) or not np.all(np.isfinite(Fa)):
        raise ValueError("Fr_N must be finite and >= 0 and Fa_N finite")
    if not (bearing.C_N > 0.0 and bearing.C0_N > 0.0):
        raise ModelError(
            f"bearing '{bearing.id}' needs positive ratings C and C0",
            field=field(bearing, "C_N" if not bearing.C_N > 0.0 else "C0_N"),
            line=bearing.line,
            expected="C > 0 and C0 > 0 [N]",
        )
    kind = bearing.kind
    tol = zero_tolerance_N(bearing)
    notes: list[str] = []
    ones = np.ones_like(Fr)
    nan = np.full_like(Fr, np.nan)
    f0: float | None = None
    f0_est = False
    double = bearing.arrangement in _DOUBLE
    i_rows = max(int(bearing.rows), 1)

    def done(P: FloatArray, X: FloatArray, Y: FloatArray, e: FloatArray) -> EquivalentLoad:
        for note in notes:
            _log.warning(note)
        return EquivalentLoad(P, X, Y, e, f0, f0_est, tuple(notes))

    # --- types without an e-switch -------------------------------------------------
    if kind in (BearingKind.CYLINDRICAL_ROLLER, BearingKind.NEEDLE_ROLLER):
        bad = np.nonzero(Fa > tol)[0]
        if bad.size and (kind is BearingKind.NEEDLE_ROLLER or not bearing.ribs):
            k = int(bad[0])
            what = (
                "needle roller"
                if kind is BearingKind.NEEDLE_ROLLER
                else ("cylindrical roller bearing without ribs")
            )
            raise ModelError(
                f"bearing '{bearing.id}' ({what}) carries axial load Fa = {Fa[k]:.6g} N in "
                f"case {case_name(case_ids, k)}; it cannot take axial load",
                field=field(bearing, "axial"),
                line=bearing.line,
                expected="axial: float (or ribs: true for a cylindrical roller bearing)",
            )
        if bad.size:
            ratio = np.where(Fr > 0.0, Fa / np.where(Fr > 0.0, Fr, 1.0), np.inf)
            for kk in np.nonzero(ratio > RIBBED_CYLINDRICAL_FA_FR_LIMIT)[0]:
                notes.append(
                    f"bearing '{bearing.id}', case {case_name(case_ids, int(kk))}: axial load "
                    f"on ribbed cylindrical roller bearing Fa/Fr = {ratio[kk]:.3g} > "
                    f"{RIBBED_CYLINDRICAL_FA_FR_LIMIT} (common practice, no source); P "
                    "uses Fr only - check the maker's axial-load rules"
                )
        if bearing.X is not None:
            notes.append(f"bearing '{bearing.id}': X/Y override ignored (P = Fr for {kind})")
        return done(Fr.copy(), ones.copy(), 0.0 * ones, nan)

    # --- user override ----------------------------------------------------------------
    if bearing.X is not None:
        X_u = float(bearing.X)
        Y_u = _require(bearing, "Y", "together with the X override")
        if bearing.e is not None:
            e_u = float(bearing.e)
        elif Y_u > 0.0:
            e_u = (1.0 - X_u) / Y_u
            notes.append(
                f"bearing '{bearing.id}': e not given with X/Y override; e = (1 - X)/Y = "
                f"{e_u:.4g} (where X*Fr + Y*Fa = Fr)"
            )
        else:
            e_u = math.inf
        e_arr = e_u * ones
        P, X, Y = _switch(Fr, Fa, e_arr, ones, 0.0 * ones, X_u * ones, Y_u * ones)
        return done(P, X, Y, e_arr)

    if kind is BearingKind.THRUST_BALL:
        alpha = bearing.contact_angle_deg
        if alpha is not None and abs(alpha - 90.0) > 1e-9:
            raise ModelError(
                f"bearing '{bearing.id}': thrust ball bearings with contact angle {alpha:g} "
                "deg are not built in",
                field=field(bearing, "contact_angle_deg"),
                line=bearing.line,
                expected="90 deg, or give X, Y and e",
            )
        bad = np.nonzero(Fr > tol)[0]
        if bad.size:
            k = int(bad[0])
            raise ModelError(
                f"bearing '{bearing.id}' (thrust ball, 90 deg) carries radial load Fr = "
                f"{Fr[k]:.6g} N in case {case_name(case_ids, k)}; it takes axial load only",
                field=field(bearing, "kind"),
                line=bearing.line,
                expected="a radial support next to the thrust bearing",
            )
        return done(Fa.copy(), 0.0 * ones, ones.copy(), nan)

    if kind is BearingKind.DEEP_GROOVE_BALL:
        if bearing.f0 is None:
            f0 = estimate_f0(bearing.d_mm, bearing.D_mm, 0.0)
            f0_est = True
            notes.append(
                f"bearing '{bearing.id}': f0 not given, estimated f0 = {f0:.3g} from "
                "Dw ~ 0.3*(D-d), Dpw = (d+D)/2 and the ISO 76 f0 table (common practice)"
            )
        else:
            f0 = float(bearing.f0)
        rel = f0 * Fa / bearing.C0_N
        over = np.nonzero(rel > DEEP_GROOVE_REL_LOAD[-1])[0]
        for kk in over:
            notes.append(
                f"bearing '{bearing.id}', case {case_name(case_ids, int(kk))}: f0*Fa/C0 = "
                f"{rel[kk]:.3g} above ISO 281 Table 3 range ({DEEP_GROOVE_REL_LOAD[-1]}); "
                "last table values used - the permissible axial load depends on the design"
            )
        e, Yh = deep_groove_factors(rel)
        P, X, Y = _switch(Fr, Fa, e, ones, 0.0 * ones, DEEP_GROOVE_X * ones, Yh)
        return done(P, X, Y, e)

    if kind is BearingKind.ANGULAR_CONTACT_BALL:
        alpha = bearing.contact_angle_deg
        if alpha is None or not (AC_ANGLES[0] - 1e-9 <= alpha <= AC_ANGLES[-1] + 1e-9):
            raise ModelError(
                f"bearing '{bearing.id}': angular contact ball bearing needs a contact angle "
                f"in 15..45 deg for ISO 281 Table 3 (got {alpha})",
                field=field(bearing, "contact_angle_deg"),
                line=bearing.line,
                expected="15 <= contact_angle_deg <= 45, or give X, Y and e",
            )
        rel = np.zeros_like(Fr)
        if alpha < AC_ANGLES[1] - 1e-9:
            if bearing.f0 is None:
                f0 = estimate_f0(bearing.d_mm, bearing.D_mm, alpha)
                f0_est = True
                notes.append(
                    f"bearing '{bearing.id}': f0 not given, estimated f0 = {f0:.3g} from "
                    "Dw ~ 0.3*(D-d), Dpw = (d+D)/2 and the ISO 76 f0 table (common practice)"
                )
            else:
                f0 = float(bearing.f0)
            rel = f0 * i_rows * Fa / bearing.C0_N
        e, xl, yl, xh, yh = angular_contact_factors(alpha, rel, double)
        P, X, Y = _switch(Fr, Fa, e, xl, yl, xh, yh)
        return done(P, X, Y, e)

    if kind is BearingKind.TAPERED_ROLLER and not double:
        f = _angle_factors(bearing, ("e", "Y"), {"e": 1.5, "Y": 0.4}, notes)
        e = f["e"] * ones
        P, X, Y = _switch(Fr, Fa, e, ones, 0.0 * ones, X_TAPERED_SINGLE * ones, f["Y"] * ones)
        return done(P, X, Y, e)

    if kind in (
        BearingKind.TAPERED_ROLLER,
        BearingKind.SPHERICAL_ROLLER,
        BearingKind.SELF_ALIGNING_BALL,
    ):
        if kind is BearingKind.SELF_ALIGNING_BALL:
            coef = {"e": 1.5, "Y1": 0.42, "Y2": 0.65}
            x2 = X2_SELF_ALIGNING_BALL
        else:
            coef = {"e": 1.5, "Y1": 0.45, "Y2": 0.67}
            x2 = X2_ROLLER
        f = _angle_factors(bearing, ("e", "Y1", "Y2"), coef, notes)
        e = f["e"] * ones
        P, X, Y = _switch(Fr, Fa, e, ones, f["Y1"] * ones, x2 * ones, f["Y2"] * ones)
        return done(P, X, Y, e)

    raise ValueError(f"unknown bearing kind {kind!r}")  # pragma: no cover
