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
    field,
    zero_tolerance_N,
)
from shaftsys.errors import ModelError
from shaftsys.model.bearing import Bearing, BearingKind, SetArrangement

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

_DOUBLE = frozenset(
    {SetArrangement.BACK_TO_BACK, SetArrangement.FACE_TO_FACE, SetArrangement.DOUBLE_ROW}
)


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


def _cot_alpha(bearing: Bearing, notes: list[str]) -> float:
    alpha = bearing.contact_angle_deg
    if alpha is not None and 0.0 < alpha < 90.0:
        return 1.0 / math.tan(math.radians(alpha))
    if bearing.e is not None and bearing.e > 0.0:
        notes.append(
            f"bearing '{bearing.id}': Y0 not given; derived from e via e = 1.5*tan(alpha) "
            "(ISO 281 Table 4) and the ISO 76 formula"
        )
        return 1.5 / float(bearing.e)
    raise ModelError(
        f"bearing '{bearing.id}' ({bearing.kind.value}) needs Y0 for the static load",
        field=field(bearing, "Y0"),
        line=bearing.line,
        expected="Y0, or contact_angle_deg / e to derive it",
    )


def static_factors(bearing: Bearing) -> tuple[float, float, bool, tuple[str, ...]]:
    """ISO 76:2006 factors (X0, Y0, floor_at_Fr, notes) for ``bearing``.

    ``floor_at_Fr`` means P0 = max(Fr, X0*Fr + Y0*Fa). Pure thrust ball bearings return
    X0 = 0, Y0 = 1; cylindrical and needle roller bearings X0 = 1, Y0 = 0.
    """
    kind = bearing.kind
    double = bearing.arrangement in _DOUBLE
    notes: list[str] = []
    if kind in (BearingKind.CYLINDRICAL_ROLLER, BearingKind.NEEDLE_ROLLER):
        return 1.0, 0.0, False, ()
    if kind is BearingKind.THRUST_BALL:
        alpha = bearing.contact_angle_deg
        if alpha is not None and abs(alpha - 90.0) > 1e-9:
            raise ModelError(
                f"bearing '{bearing.id}': static load of thrust ball bearings with contact "
                f"angle {alpha:g} deg is not built in",
                field=field(bearing, "contact_angle_deg"),
                line=bearing.line,
                expected="90 deg",
            )
        return 0.0, 1.0, False, ()
    if kind is BearingKind.DEEP_GROOVE_BALL:
        y0 = Y0_DEEP_GROOVE if bearing.Y0 is None else float(bearing.Y0)
        return X0_DEEP_GROOVE, y0, True, ()
    if kind is BearingKind.ANGULAR_CONTACT_BALL:
        x0 = 1.0 if double else 0.5
        if bearing.Y0 is not None:
            return x0, float(bearing.Y0), not double, ()
        alpha = bearing.contact_angle_deg
        angles = sorted(Y0_ANGULAR)
        if alpha is None or not (angles[0] - 1e-9 <= alpha <= angles[-1] + 1e-9):
            raise ModelError(
                f"bearing '{bearing.id}': angular contact ball bearing needs a contact angle "
                f"in 15..45 deg or Y0 (got {alpha})",
                field=field(bearing, "contact_angle_deg"),
                line=bearing.line,
                expected="15 <= contact_angle_deg <= 45, or Y0",
            )
        col = 1 if double else 0
        y0 = float(np.interp(alpha, angles, [Y0_ANGULAR[a][col] for a in angles]))
        return x0, y0, not double, ()
    if kind is BearingKind.TAPERED_ROLLER and not double:
        y0 = (
            float(bearing.Y0)
            if bearing.Y0 is not None
            else Y0_COT_SINGLE * _cot_alpha(bearing, notes)
        )
        return 0.5, y0, True, tuple(notes)
    if kind in (
        BearingKind.TAPERED_ROLLER,
        BearingKind.SPHERICAL_ROLLER,
        BearingKind.SELF_ALIGNING_BALL,
    ):
        y0 = (
            float(bearing.Y0)
            if bearing.Y0 is not None
            else Y0_COT_DOUBLE * _cot_alpha(bearing, notes)
        )
        return 1.0, y0, False, tuple(notes)
    raise ValueError(f"unknown bearing kind {kind!r}")  # pragma: no cover


def equivalent_static_load(
    bearing: Bearing,
    Fr_N: npt.ArrayLike,
    Fa_N: npt.ArrayLike,
    case_ids: Sequence[str] | None = None,
) -> StaticLoad:
    """Equivalent static load P0 [N] per case (ISO 76:2006).

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
    x0, y0, floor, notes = static_factors(bearing)
    if bearing.kind is BearingKind.THRUST_BALL:
        bad = np.nonzero(Fr > zero_tolerance_N(bearing))[0]
        if bad.size:
            k = int(bad[0])
            raise ModelError(
                f"bearing '{bearing.id}' (thrust ball, 90 deg) carries radial load Fr = "
                f"{Fr[k]:.6g} N in case {case_name(case_ids, k)}",
                field=field(bearing, "kind"),
                line=bearing.line,
                expected="a radial support next to the thrust bearing",
            )
    P0 = x0 * Fr + y0 * Fa
    if floor:
        P0 = np.maximum(P0, Fr)
    return StaticLoad(P0, x0, y0, floor, notes)


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
