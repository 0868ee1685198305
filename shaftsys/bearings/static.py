"""Static load safety (ISO 76:2006) and operating-limit warnings.

P0 = X0*Fr + Y0*Fa with P0 >= Fr where the standard says so (single-row radial bearings
whose X0 < 1), s0 = C0/P0 over every case, peak and static-only cases included.
Factor values are those of ISO 76:2006 clauses 6.2 to 6.4, typed from memory of the
standard. No application factor enters the static check: peak loads are to be given as
cases of their own.
"""

from __future__ import annotations

import logging
import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np
import numpy.typing as npt

from shaftsys.bearings._util import (
    BoolArray,
    FloatArray,
    as_float_array,
    case_name,
)
from shaftsys.bearings.arrays import BearingArrays, RowErrors
from shaftsys.errors import ModelError
from shaftsys.model.bearing import Bearing, BearingKind

_log = logging.getLogger(__name__)

#: ISO 76:2006 radial deep groove ball bearings (single and double row).
X0_DEEP_GROOVE = 0.6
Y0_DEEP_GROOVE = 0.5
#: ISO 76:2006 angular contact ball bearings: alpha -> (Y0 single row, Y0 double row);
#: X0 = 0.5 single row, X0 = 1 double row / pair.
Y0_ANGULAR: dict[float, tuple[float, float]] = {
    15.0: (0.46, 0.92),
    20.0: (0.42, 0.84),
    25.0: (0.38, 0.76),
    30.0: (0.33, 0.66),
    35.0: (0.29, 0.58),
    40.0: (0.26, 0.52),
    45.0: (0.22, 0.44),
}
#: ISO 76:2006 self-aligning ball and radial roller bearings with alpha != 0:
#: Y0 = 0.22*cot(alpha) single row (X0 = 0.5), 0.44*cot(alpha) double row (X0 = 1).
Y0_COT_SINGLE = 0.22
Y0_COT_DOUBLE = 0.44

#: Required static safety when none is given: common practice, no source.
S0_MIN_BALL = 1.0
S0_MIN_ROLLER = 1.5
#: Minimum load to avoid skidding, fraction of C: common practice, no source.
MIN_LOAD_FRACTION_BALL = 0.01
MIN_LOAD_FRACTION_ROLLER = 0.02


@dataclass(frozen=True)
class StaticLoad:
    """Equivalent static load per case.

    Attributes
    ----------
    P0_N: equivalent static load [N] per case.
    X0, Y0: the static factors used [-].
    floor_at_Fr: True when P0 = max(Fr, X0*Fr + Y0*Fa) was applied.
    warnings: notes on estimated factors.
    """

    P0_N: FloatArray
    X0: float
    Y0: float
    floor_at_Fr: bool
    warnings: tuple[str, ...]


@dataclass(frozen=True)
class StaticCheck:
    """Static safety of one bearing over all cases.

    Attributes
    ----------
    P0_N: equivalent static load per case [N].
    s0_per_case: C0/P0 per case [-] (inf where P0 = 0).
    s0: the worst (smallest) s0 [-].
    s0_case_index: index of the worst case (``None`` if there are no cases).
    s0_min: required static safety used [-].
    ok: s0 >= s0_min.
    warnings: notes.
    """

    P0_N: FloatArray
    s0_per_case: FloatArray
    s0: float
    s0_case_index: int | None
    s0_min: float
    ok: bool
    warnings: tuple[str, ...]


def default_s0_min(kind: BearingKind) -> float:
    """Common-practice required static safety (no source): 1.0 ball, 1.5 roller [-]."""
    return S0_MIN_ROLLER if kind.is_roller else S0_MIN_BALL


@dataclass(frozen=True, eq=False)
class StaticFactors:
    """ISO 76:2006 factors of N rows (shape (N,) each).

    Attributes
    ----------
    X0, Y0: static radial and axial factors [-].
    floor_at_Fr: P0 = max(Fr, X0*Fr + Y0*Fa) applies.
    y0_from_e: Y0 was derived from e (no contact angle).
    errors: first user error per row (``None`` = fine).
    """

    X0: FloatArray
    Y0: FloatArray
    floor_at_Fr: BoolArray
    y0_from_e: BoolArray
    errors: tuple[ModelError | None, ...]


def static_factors_arrays(p: BearingArrays) -> StaticFactors:
    """ISO 76:2006 factors of every row; see :func:`static_factors` for the rules.

    Rows that need Y0 and have neither Y0, a contact angle nor e, angular contact rows
    without Y0 outside 15..45 deg and thrust ball rows not at 90 deg carry a ModelError.
    """
    n = len(p)
    err = RowErrors(n)
    K = BearingKind
    double = p.double
    alpha = p.contact_angle_deg
    has_y0 = ~np.isnan(p.Y0)
    radial = p.is_kind(K.CYLINDRICAL_ROLLER, K.NEEDLE_ROLLER)
    thrust = p.is_kind(K.THRUST_BALL)
    dg = p.is_kind(K.DEEP_GROOVE_BALL)
    ac = p.is_kind(K.ANGULAR_CONTACT_BALL)
    tap1 = p.is_kind(K.TAPERED_ROLLER) & ~double
    other = p.is_kind(K.TAPERED_ROLLER) & double | p.is_kind(K.SPHERICAL_ROLLER,
                                                              K.SELF_ALIGNING_BALL)
    x0 = np.ones(n)
    y0 = np.zeros(n)
    floor = np.zeros(n, dtype=bool)
    err.add(thrust & ~np.isnan(alpha) & (np.abs(alpha - 90.0) > 1e-9), lambda i: ModelError(
        f"bearing '{p.ids[i]}': static load of thrust ball bearings with contact "
        f"angle {alpha[i]:g} deg is not built in",
        field=p.field(i, "contact_angle_deg"),
        line=p.lines[i],
        expected="90 deg",
    ))
    x0[thrust] = 0.0
    y0[thrust] = 1.0
    x0[dg] = X0_DEEP_GROOVE
    y0[dg] = np.where(has_y0, p.Y0, Y0_DEEP_GROOVE)[dg]
    floor[dg] = True
    # angular contact: tabulated Y0 on the angle
    angles = sorted(Y0_ANGULAR)
    ok = ~np.isnan(alpha) & (alpha >= angles[0] - 1e-9) & (alpha <= angles[-1] + 1e-9)
    err.add(ac & ~has_y0 & ~ok, lambda i: ModelError(
        f"bearing '{p.ids[i]}': angular contact ball bearing needs a contact angle "
        f"in 15..45 deg or Y0 (got {p.given(i, 'contact_angle_deg')})",
        field=p.field(i, "contact_angle_deg"),
        line=p.lines[i],
        expected="15 <= contact_angle_deg <= 45, or Y0",
    ))
    a_ok = np.where(ok, alpha, angles[0])
    y0_tab = np.where(double, np.interp(a_ok, angles, [Y0_ANGULAR[a][1] for a in angles]),
                      np.interp(a_ok, angles, [Y0_ANGULAR[a][0] for a in angles]))
    x0[ac] = np.where(double, 1.0, 0.5)[ac]
    y0[ac] = np.where(has_y0, p.Y0, y0_tab)[ac]
    floor[ac] = ~double[ac]
    # roller bearings with alpha != 0 and self-aligning ball: Y0 from cot(alpha)
    angle_ok = ~np.isnan(alpha) & (alpha > 0.0) & (alpha < 90.0)
    e_ok = ~np.isnan(p.e) & (p.e > 0.0)
    need = (tap1 | other) & ~has_y0
    y0_from_e = need & ~angle_ok & e_ok
    err.add(need & ~angle_ok & ~e_ok, lambda i: ModelError(
        f"bearing '{p.ids[i]}' ({p.kind_value(i)}) needs Y0 for the static load",
        field=p.field(i, "Y0"),
        line=p.lines[i],
        expected="Y0, or contact_angle_deg / e to derive it",
    ))
    with np.errstate(divide="ignore", invalid="ignore"):
        cot = np.where(angle_ok, 1.0 / np.tan(np.radians(np.where(angle_ok, alpha, 45.0))),
                       1.5 / np.where(e_ok, p.e, 1.0))
    x0[tap1] = 0.5
    y0[tap1] = np.where(has_y0, p.Y0, Y0_COT_SINGLE * cot)[tap1]
    floor[tap1] = True
    x0[other] = 1.0
    y0[other] = np.where(has_y0, p.Y0, Y0_COT_DOUBLE * cot)[other]
    x0[radial] = 1.0
    y0[radial] = 0.0
    return StaticFactors(x0, y0, floor, y0_from_e, err.freeze())


def _y0_note(bearing_id: str) -> str:
    return (
        f"bearing '{bearing_id}': Y0 not given; derived from e via e = 1.5*tan(alpha) "
        "(ISO 281 Table 4) and the ISO 76 formula"
    )


def static_factors(bearing: Bearing) -> tuple[float, float, bool, tuple[str, ...]]:
    """ISO 76:2006 factors (X0, Y0, floor_at_Fr, notes) for ``bearing``.

    ``floor_at_Fr`` means P0 = max(Fr, X0*Fr + Y0*Fa). Pure thrust ball bearings return
    X0 = 0, Y0 = 1; cylindrical and needle roller bearings X0 = 1, Y0 = 0. A one-row
    wrapper of :func:`static_factors_arrays`.
    """
    sf = static_factors_arrays(BearingArrays.from_bearings([bearing]))
    exc = sf.errors[0]
    if exc is not None:
        raise exc
    notes = (_y0_note(bearing.id),) if sf.y0_from_e[0] else ()
    return float(sf.X0[0]), float(sf.Y0[0]), bool(sf.floor_at_Fr[0]), notes


def equivalent_static_load_arrays(
    p: BearingArrays,
    Fr_N: npt.ArrayLike,
    Fa_N: npt.ArrayLike,
    case_ids: Sequence[str] | None = None,
    factors: StaticFactors | None = None,
) -> tuple[FloatArray, StaticFactors, tuple[ModelError | None, ...]]:
    """Equivalent static load P0 [N] of N rows for m cases (ISO 76:2006).

    Parameters
    ----------
    p:
        Bearing parameters of N rows.
    Fr_N, Fa_N:
        Radial load magnitude [N] and axial load [N] (sign ignored), broadcastable to
        (N, m).
    case_ids:
        Case names for messages.
    factors:
        ``static_factors_arrays(p)`` when already computed.

    Returns
    -------
    (P0_N, factors, errors):
        P0 (N, m) [N], the factors, and the first user error per row (radial load on a
        thrust ball bearing, or an error of the factors).
    """
    Fr = np.asarray(Fr_N, dtype=np.float64)
    Fa = np.abs(np.asarray(Fa_N, dtype=np.float64))
    m = max(np.atleast_1d(Fr).shape[-1], np.atleast_1d(Fa).shape[-1])
    Fr = np.broadcast_to(Fr, (len(p), m))
    Fa = np.broadcast_to(Fa, (len(p), m))
    sf = static_factors_arrays(p) if factors is None else factors
    err = RowErrors(len(p), sf.errors)
    tol = (1e-9 * np.maximum(np.abs(p.C_N), 1.0))[:, None]
    bad = Fr > tol
    k = np.argmax(bad, axis=1) if m else np.zeros(len(p), dtype=np.intp)
    err.add(p.is_kind(BearingKind.THRUST_BALL) & np.any(bad, axis=1), lambda i: ModelError(
        f"bearing '{p.ids[i]}' (thrust ball, 90 deg) carries radial load Fr = "
        f"{Fr[i, k[i]]:.6g} N in case {case_name(case_ids, int(k[i]))}",
        field=p.field(i, "kind"),
        line=p.lines[i],
        expected="a radial support next to the thrust bearing",
    ))
    P0 = sf.X0[:, None] * Fr + sf.Y0[:, None] * Fa
    P0 = np.where(sf.floor_at_Fr[:, None], np.maximum(P0, Fr), P0)
    return P0, sf, err.freeze()


def equivalent_static_load(
    bearing: Bearing,
    Fr_N: npt.ArrayLike,
    Fa_N: npt.ArrayLike,
    case_ids: Sequence[str] | None = None,
) -> StaticLoad:
    """Equivalent static load P0 [N] per case (ISO 76:2006).

    A one-row wrapper of :func:`equivalent_static_load_arrays`.

    Parameters
    ----------
    bearing:
        The support.
    Fr_N, Fa_N:
        Radial load magnitude [N] and axial load [N] (sign ignored) per case.
    case_ids:
        Case names for messages.

    Returns
    -------
    StaticLoad
        P0 [N] per case and the factors used.

    Raises
    ------
    ModelError
        Radial load on a pure thrust ball bearing; missing Y0 that cannot be derived.
    """
    Fr = as_float_array(Fr_N, "Fr_N")
    Fa = np.abs(as_float_array(Fa_N, "Fa_N"))
    if Fr.shape != Fa.shape:
        raise ValueError(f"Fr_N and Fa_N differ in shape: {Fr.shape} vs {Fa.shape}")
    P0, sf, errors = equivalent_static_load_arrays(
        BearingArrays.from_bearings([bearing]), Fr[None, :], Fa[None, :], case_ids)
    if errors[0] is not None:
        raise errors[0]
    notes = (_y0_note(bearing.id),) if sf.y0_from_e[0] else ()
    return StaticLoad(P0[0], float(sf.X0[0]), float(sf.Y0[0]), bool(sf.floor_at_Fr[0]), notes)


def static_safety(C0_N: float, P0_N: npt.ArrayLike) -> FloatArray:
    """Compute the static safety factor s0 = C0/P0 [-] per case (inf where P0 = 0).

    Parameters
    ----------
    C0_N:
        Basic static load rating [N].
    P0_N:
        Equivalent static load per case [N].
    """
    P0 = as_float_array(P0_N, "P0_N")
    with np.errstate(divide="ignore"):
        return np.where(P0 > 0.0, C0_N / np.where(P0 > 0.0, P0, 1.0), np.inf)


def static_check(
    bearing: Bearing,
    Fr_N: npt.ArrayLike,
    Fa_N: npt.ArrayLike,
    case_ids: Sequence[str] | None = None,
    s0_min: float | None = None,
) -> StaticCheck:
    """Worst static safety over all cases against the required s0.

    Parameters
    ----------
    bearing:
        The support (``bearing.s0_min`` wins over ``s0_min``).
    Fr_N, Fa_N:
        Loads per case [N], every case including peak and static-only ones.
    case_ids:
        Case names for messages.
    s0_min:
        Model-wide required static safety [-] or ``None`` for the per-type default.

    Returns
    -------
    StaticCheck
    """
    sl = equivalent_static_load(bearing, Fr_N, Fa_N, case_ids)
    s0_all = static_safety(bearing.C0_N, sl.P0_N)
    required = (
        float(bearing.s0_min)
        if bearing.s0_min is not None
        else (float(s0_min) if s0_min is not None else default_s0_min(bearing.kind))
    )
    if s0_all.size == 0:
        return StaticCheck(sl.P0_N, s0_all, math.inf, None, required, True, sl.warnings)
    k = int(np.argmin(s0_all))
    s0 = float(s0_all[k])
    notes = list(sl.warnings)
    if s0 < required:
        notes.append(
            f"bearing '{bearing.id}': static safety s0 = {s0:.3g} < required {required:g} "
            f"in case {case_name(case_ids, k)}"
        )
    return StaticCheck(sl.P0_N, s0_all, s0, k, required, s0 >= required, tuple(notes))


def operating_warnings(
    bearing: Bearing,
    P_N: npt.ArrayLike,
    speed_rpm: npt.ArrayLike,
    running: npt.ArrayLike,
    case_ids: Sequence[str] | None = None,
) -> list[str]:
    """Warnings for running cases below the minimum load or above the limiting speed.

    Common practice, no source: a rolling bearing needs P > 0.01*C (ball) or
    P > 0.02*C (roller) to avoid skidding.

    Parameters
    ----------
    bearing:
        The support.
    P_N:
        Equivalent dynamic load per case [N] (without application factor).
    speed_rpm:
        Signed speed per case [rpm].
    running:
        Boolean mask of cases in which the bearing rotates (dynamic cases).
    case_ids:
        Case names for messages.

    Returns
    -------
    list[str]
        One warning per offending case and limit.
    """
    P = as_float_array(P_N, "P_N")
    n = np.abs(as_float_array(speed_rpm, "speed_rpm"))
    run: BoolArray = np.atleast_1d(np.asarray(running, dtype=bool))
    frac = MIN_LOAD_FRACTION_ROLLER if bearing.kind.is_roller else MIN_LOAD_FRACTION_BALL
    out: list[str] = []
    for k in np.nonzero(run & (frac * bearing.C_N > P))[0]:
        out.append(
            f"bearing '{bearing.id}', case {case_name(case_ids, int(k))}: P = {P[k]:.4g} N "
            f"below minimum load {frac:g}*C = {frac * bearing.C_N:.4g} N (risk of skidding; "
            "common practice, no source)"
        )
    lim = bearing.limiting_speed_rpm
    if lim is not None:
        for k in np.nonzero(run & (n > lim))[0]:
            out.append(
                f"bearing '{bearing.id}', case {case_name(case_ids, int(k))}: speed "
                f"{n[k]:.6g} rpm above limiting speed {lim:g} rpm"
            )
    for note in out:
        _log.warning(note)
    return out
