r"""Hub loads of belt pulleys and chain sprockets on their own shaft.

Strand geometry (worked out for this module; all vectors in the shaft frame, see
:mod:`shaftsys.loads.base`). ``theta`` = ``mesh_angle_deg`` is the direction from this
pulley's axis toward the other pulley's axis; ``phi`` the wrap angle of the belt on this
pulley; ``delta = (pi - phi) / 2``. Looking from +x toward the origin (y to the right,
z up), with theta = 0 (other pulley to the right)::

                  p+ = r u_t(theta + delta)
            .-----o--------------------->   strand "+", direction u_r(theta + delta)
          /   ^   |                         (tilted by +delta toward +z)
         |  +x (.)------> u_r(theta)        centre line, toward the other pulley
          \       |
            '-----o--------------------->   strand "-", direction u_r(theta - delta)
                  p- = -r u_t(theta - delta)

    The belt wraps the far side of the pulley, from p+ round through theta + 180 deg to
    p-: an arc of (theta - delta + 270) - (theta + delta + 90) = 180 - 2 delta = phi.
    delta > 0 (phi < 180, small pulley): strands diverge toward the big pulley;
    delta < 0 (big pulley): they converge toward the small one; delta = 0: parallel.

Each strand pulls the pulley with its tension ``T_s`` along its own direction, away
from the pulley. Moments about +x (``u_t x u_r = -x_hat``)::

    strand "+":  p+ x (T_s u_r(theta + delta)) =  r T_s u_t x u_r = -r T_s x_hat
    strand "-":  p- x (T_s u_r(theta - delta)) = -r T_s u_t x u_r = +r T_s x_hat

so the tight strand is "-" when ``T_el > 0`` and "+" when ``T_el < 0``: the strand whose
moment has the sign of T_el. The torque about +x is ``r (T_- - T_+) = T_el``; the moment
has no y or z part since every strand force and point lie in the y-z plane.

Units: torques [N*mm], lengths [mm], forces [N], angles [deg].
"""

from __future__ import annotations

import math

import numpy as np

from shaftsys.errors import ModelError
from shaftsys.loads.base import (
    AxisLoad,
    require_angle_range,
    require_finite,
    require_non_negative,
    require_positive,
    u_r,
)


def _wrap_delta_deg(wrap_angle_deg: float) -> float:
    """Half the angle [deg] between the strands' deviation: ``(180 - wrap) / 2``."""
    wrap = require_angle_range(wrap_angle_deg, "wrap_angle_deg", 0.0, 360.0)
    return 0.5 * (180.0 - wrap)


def _strand_load(T_el_Nmm: float, T1_N: float, T2_N: float, theta_deg: float,
                 delta_deg: float, warnings: list[str], extra: dict[str, float]) -> AxisLoad:
    """Hub load of two strands: tight T1 and slack T2 [N] leaving at theta -/+ delta
    [deg] (by the sense of T_el [N*mm]); ``extra`` details go before the strand angles.
    """
    tight_deg, slack_deg = _strand_angles_deg(T_el_Nmm, theta_deg, delta_deg)
    force = T1_N * u_r(tight_deg) + T2_N * u_r(slack_deg)
    return AxisLoad(
        force_N=force,
        moment_Nmm=np.array([T_el_Nmm, 0.0, 0.0]),
        warnings=tuple(warnings),
        details={
            "T_tight_N": T1_N,
            "T_slack_N": T2_N,
            **extra,
            "tight_strand_angle_deg": tight_deg,
            "slack_strand_angle_deg": slack_deg,
            "hub_force_N": float(np.linalg.norm(force)),
        },
    )


def _strand_angles_deg(T_el_Nmm: float, theta_deg: float, delta_deg: float) -> tuple[float, float]:
    """(tight, slack) strand directions [deg]; for ``T_el >= 0`` the tight one is "-"."""
    if T_el_Nmm >= 0.0:
        return theta_deg - delta_deg, theta_deg + delta_deg
    return theta_deg + delta_deg, theta_deg - delta_deg


def capstan_limit(
    friction_coefficient: float, wrap_angle_deg: float, groove_angle_deg: float | None = None
) -> float:
    """Largest tension ratio T1/T2 [-] a belt carries without slipping.

    Parameters
    ----------
    friction_coefficient:
        Friction coefficient mu [-] between belt and pulley, >= 0.
    wrap_angle_deg:
        Wrap angle phi [deg] of the belt on the pulley (use the smaller pulley's).
    groove_angle_deg:
        Included groove angle beta [deg] of a V-belt pulley; ``None`` for a flat belt.

    Returns
    -------
    float
        ``exp(mu phi)`` (flat belt, Euler-Eytelwein / capstan equation) or
        ``exp(mu phi / sin(beta / 2))`` (V-belt, wedge action raises the effective
        friction). Source: Shigley's Mechanical Engineering Design, flexible elements,
        flat and V-belts (from memory).
    """
    mu = require_non_negative(friction_coefficient, "friction_coefficient")
    phi = math.radians(require_angle_range(wrap_angle_deg, "wrap_angle_deg", 0.0, 360.0))
    if groove_angle_deg is None:
        return math.exp(mu * phi)
    beta = require_angle_range(groove_angle_deg, "groove_angle_deg", 0.0, 180.0)
    return math.exp(mu * phi / math.sin(math.radians(0.5 * beta)))


def min_pretension_N(
    T_el_Nmm: float,
    pulley_radius_mm: float,
    friction_coefficient: float,
    wrap_angle_deg: float,
    groove_angle_deg: float | None = None,
) -> float:
    """Smallest installation pretension [N] that transmits ``T_el_Nmm`` without slip.

    With ``T1 + T2 = 2 T_i``, ``T1 - T2 = |T| / r`` and ``T1 / T2 <= R`` (``R`` from
    :func:`capstan_limit`): ``T_i,min = (|T| / (2 r)) (R + 1) / (R - 1)``, the form of
    Shigley's flat-belt relation ``F_i = (T / D) (e^(f phi) + 1) / (e^(f phi) - 1)``
    (Shigley's Mechanical Engineering Design, flat belts; from memory).

    Parameters
    ----------
    T_el_Nmm:
        Torque [N*mm] (sign ignored).
    pulley_radius_mm:
        Pitch radius r [mm] of the pulley whose wrap is given.
    friction_coefficient, wrap_angle_deg, groove_angle_deg:
        As :func:`capstan_limit` ([-], [deg], [deg] or ``None``).

    Returns
    -------
    float
        Pretension per strand [N]; ``inf`` when mu = 0 and the torque is not zero.
    """
    T = abs(require_finite(T_el_Nmm, "T_el_Nmm"))
    r = require_positive(pulley_radius_mm, "pulley_radius_mm")
    R = capstan_limit(friction_coefficient, wrap_angle_deg, groove_angle_deg)
    if T == 0.0:
        return 0.0
    if R <= 1.0:
        return math.inf
    return T / (2.0 * r) * (R + 1.0) / (R - 1.0)


def open_belt_wrap_angle_deg(
    own_diameter_mm: float, other_diameter_mm: float, center_distance_mm: float
) -> float:
    """Wrap angle [deg] of an open (uncrossed) belt on this pulley.

    ``phi = 180 deg - 2 asin((d_other - d_own) / (2 C))``: below 180 deg on the smaller
    pulley, above on the larger. Source: Shigley's Mechanical Engineering Design, flat
    belt geometry (from memory); it is the ``delta`` of the module sketch,
    ``sin(delta) = (R_other - r_own) / C``.

    Parameters
    ----------
    own_diameter_mm, other_diameter_mm:
        Pitch diameters [mm] of this pulley and of the other one.
    center_distance_mm:
        Centre distance C [mm], larger than the sum of the radii.

    Returns
    -------
    float
        Wrap angle [deg] on this pulley.
    """
    d = require_positive(own_diameter_mm, "own_diameter_mm")
    D = require_positive(other_diameter_mm, "other_diameter_mm")
    c = require_positive(center_distance_mm, "center_distance_mm")
    if c <= 0.5 * (d + D):
        raise ModelError(
            f"centre distance {c} mm lets the pulleys ({d} mm, {D} mm) overlap",
            expected=f"more than {0.5 * (d + D)} mm",
        )
    return 180.0 - 2.0 * math.degrees(math.asin((D - d) / (2.0 * c)))


def belt_hub_load(
    T_el_Nmm: float,
    pulley_diameter_mm: float,
    mesh_angle_deg: float,
    wrap_angle_deg: float,
    pretension_N: float,
    friction_coefficient: float,
    groove_angle_deg: float | None = None,
) -> AxisLoad:
    """Hub load of a belt pulley on its shaft (flat belt or V-belt).

    Parameters
    ----------
    T_el_Nmm:
        Torque the pulley applies to its shaft about +x [N*mm].
    pulley_diameter_mm:
        Pitch diameter d [mm] of the pulley.
    mesh_angle_deg:
        Direction from this shaft's axis toward the other pulley's axis [deg].
    wrap_angle_deg:
        Wrap angle phi of the belt on THIS pulley [deg], 0 < phi < 360
        (see :func:`open_belt_wrap_angle_deg`).
    pretension_N:
        Installation pretension T_i per strand [N], >= 0.
    friction_coefficient:
        Friction coefficient mu [-], used only for the slip check.
    groove_angle_deg:
        V-groove included angle beta [deg]; ``None`` for a flat belt.

    Returns
    -------
    AxisLoad
        Force [N] = ``T1 u_r(tight) + T2 u_r(slack)`` (y-z plane, toward the belt),
        moment [N*mm] ``(T_el, 0, 0)`` with ``moment_Nmm[0] == T_el_Nmm`` exactly.
        ``details``: ``T_tight_N``, ``T_slack_N``, ``tension_ratio`` (T1/T2, ``inf``
        when slack, 1 when both are equal), ``capstan_limit``, ``min_pretension_N``,
        ``tight_strand_angle_deg``, ``slack_strand_angle_deg``, ``hub_force_N``.
        ``warnings``: slip (ratio above the capstan limit) and slack-side warnings,
        with numbers.

    Notes
    -----
    Tensions: the pretension stays in every case and the sum is constant,
    ``T1 + T2 = 2 T_i``, ``T1 - T2 = |T_el| / r`` (Shigley's Mechanical Engineering
    Design, flat belts: the constant-sum assumption; from memory). Centrifugal tension
    is neglected on purpose: it stretches both strands equally but is balanced by the
    centrifugal force of the belt on the wrap arc, so it does not load the shaft (it
    only lowers the grip). If the slack side would go slack (``T_i <= |T_el| / (2 r)``)
    the belt cannot carry the torque; the load is then computed with ``T2 = 0`` and
    ``T1 = |T_el| / r`` (the torque balance is kept) and a warning is returned.
    """
    T = require_finite(T_el_Nmm, "T_el_Nmm")
    d = require_positive(pulley_diameter_mm, "pulley_diameter_mm")
    theta = require_finite(mesh_angle_deg, "mesh_angle_deg")
    delta = _wrap_delta_deg(wrap_angle_deg)
    T_i = require_non_negative(pretension_N, "pretension_N")
    R = capstan_limit(friction_coefficient, wrap_angle_deg, groove_angle_deg)

    r = 0.5 * d
    dT = abs(T) / r
    warnings: list[str] = []
    T_min = min_pretension_N(T, r, friction_coefficient, wrap_angle_deg, groove_angle_deg)
    kind = "flat belt" if groove_angle_deg is None else f"V-belt (groove {groove_angle_deg} deg)"
    if dT > 0.0 and T_i - 0.5 * dT <= 0.0:
        T1, T2 = dT, 0.0
        warnings.append(
            f"{kind}: slack side goes slack (pretension {T_i:.6g} N <= |T|/(2r) = "
            f"{0.5 * dT:.6g} N for T = {T:.6g} N*mm, r = {r:.6g} mm): the belt slips; "
            f"load computed with T1 = {T1:.6g} N, T2 = 0; minimum pretension "
            f"{T_min:.6g} N"
        )
    else:
        T1, T2 = T_i + 0.5 * dT, T_i - 0.5 * dT
    if T1 == T2:
        ratio = 1.0
    elif T2 == 0.0:
        ratio = math.inf
    else:
        ratio = T1 / T2
    if T2 > 0.0 and ratio > R:
        warnings.append(
            f"{kind}: slip, tension ratio T1/T2 = {T1:.6g}/{T2:.6g} = {ratio:.6g} exceeds "
            f"the capstan limit {R:.6g} (mu = {friction_coefficient}, wrap = "
            f"{wrap_angle_deg} deg); minimum pretension {T_min:.6g} N, given {T_i:.6g} N"
        )

    return _strand_load(T, T1, T2, theta, delta, warnings,
                        {"tension_ratio": ratio, "capstan_limit": R, "min_pretension_N": T_min})


def takeup_belt_hub_load(
    T_el_Nmm: float,
    pulley_diameter_mm: float,
    mesh_angle_deg: float,
    wrap_angle_deg: float,
    slack_tension_N: float,
    friction_coefficient: float,
    groove_angle_deg: float | None = None,
) -> AxisLoad:
    """Hub load of a belt drum whose slack-side tension is held by a take-up.

    A gravity take-up (a weight hanging in a loop of the slack strand, or a tension
    known per case) fixes the slack-side tension ``T2``; the drum's torque then adds
    ``T1 - T2 = |T_el| / r`` to the tight side: ``T1 = T2 + |T_el| / r``. A drum
    without torque (a bend or tail drum) has ``T1 = T2``. The belt grips without slip
    while ``T1 / T2 <= e^(mu phi)`` (Euler-Eytelwein capstan relation, e.g. Meriam &
    Kraige, *Engineering Mechanics: Statics*, flexible belts; ``e^(mu phi/sin(beta/2))``
    for a V-belt); the smallest slack tension that grips is ``(|T_el| / r) / (R - 1)``.

    Parameters
    ----------
    T_el_Nmm:
        Torque the drum applies to its shaft about +x [N*mm].
    pulley_diameter_mm:
        Drum diameter d [mm] (to the belt's pitch line).
    mesh_angle_deg:
        Direction [deg] from the shaft's axis toward where the strands go (the bisector
        of the two strands), as ``belt_angle`` of :func:`belt_hub_load`.
    wrap_angle_deg:
        Wrap angle phi [deg] of the belt on the drum, 0 < phi < 360.
    slack_tension_N:
        Slack-side tension T2 [N] set by the take-up, > 0.
    friction_coefficient:
        Friction coefficient mu [-] belt/drum (slip check only).
    groove_angle_deg:
        V-groove angle [deg], or ``None`` for a flat belt.

    Returns
    -------
    AxisLoad
        Force [N] ``T1 u_r(tight) + T2 u_r(slack)``, moment ``(T_el, 0, 0)`` [N*mm];
        ``details`` as :func:`belt_hub_load` with ``min_slack_tension_N`` in place of
        ``min_pretension_N``; a slip warning with the numbers when T1/T2 exceeds the
        capstan limit.
    """
    T = require_finite(T_el_Nmm, "T_el_Nmm")
    d = require_positive(pulley_diameter_mm, "pulley_diameter_mm")
    theta = require_finite(mesh_angle_deg, "mesh_angle_deg")
    delta = _wrap_delta_deg(wrap_angle_deg)
    T2 = require_positive(slack_tension_N, "slack_tension_N")
    R = capstan_limit(friction_coefficient, wrap_angle_deg, groove_angle_deg)
    r = 0.5 * d
    dT = abs(T) / r
    T1 = T2 + dT
    ratio = T1 / T2
    T2_min = 0.0 if dT == 0.0 else (math.inf if R <= 1.0 else dT / (R - 1.0))
    warnings: list[str] = []
    if ratio > R:
        kind = "flat belt" if groove_angle_deg is None else \
            f"V-belt (groove {groove_angle_deg:.4g} deg)"
        warnings.append(
            f"{kind} on a take-up: slip, tension ratio T1/T2 = {T1:.4g}/{T2:.4g} = "
            f"{ratio:.4g} exceeds the capstan limit e^(mu phi) = {R:.4g} (mu = "
            f"{friction_coefficient:.3g}, wrap = {wrap_angle_deg:.4g} deg); a slack-side "
            f"tension of at least {T2_min:.4g} N grips")
    return _strand_load(T, T1, T2, theta, delta, warnings,
                        {"tension_ratio": ratio, "capstan_limit": R,
                         "min_slack_tension_N": T2_min})


def chain_hub_load(
    T_el_Nmm: float,
    sprocket_pitch_diameter_mm: float,
    mesh_angle_deg: float,
    wrap_angle_deg: float = 180.0,
) -> AxisLoad:
    """Hub load of a chain sprocket on its shaft (tight strand only).

    Parameters
    ----------
    T_el_Nmm:
        Torque the sprocket applies to its shaft about +x [N*mm].
    sprocket_pitch_diameter_mm:
        Pitch diameter d [mm] of the sprocket.
    mesh_angle_deg:
        Direction from this shaft's axis toward the other sprocket's axis [deg].
    wrap_angle_deg:
        Wrap angle of the chain on this sprocket [deg]; it sets the strand directions as
        for belts (module sketch).

    Returns
    -------
    AxisLoad
        Force [N] ``(|T_el| / r) u_r(tight)`` with the tight strand chosen as for belts
        (``theta - delta`` if ``T_el >= 0``, else ``theta + delta``); moment [N*mm]
        ``(T_el, 0, 0)``, exact. ``details``: ``T_tight_N``, ``tight_strand_angle_deg``.

    Notes
    -----
    The slack strand's tension (sag, centrifugal) is neglected, as is the chordal
    (polygon) variation of the lever arm: common practice, no source.
    """
    T = require_finite(T_el_Nmm, "T_el_Nmm")
    d = require_positive(sprocket_pitch_diameter_mm, "sprocket_pitch_diameter_mm")
    theta = require_finite(mesh_angle_deg, "mesh_angle_deg")
    delta = _wrap_delta_deg(wrap_angle_deg)
    T1 = abs(T) / (0.5 * d)
    tight_deg, _ = _strand_angles_deg(T, theta, delta)
    return AxisLoad(
        force_N=T1 * u_r(tight_deg),
        moment_Nmm=np.array([T, 0.0, 0.0]),
        details={"T_tight_N": T1, "tight_strand_angle_deg": tight_deg},
    )


__all__ = [
    "belt_hub_load",
    "capstan_limit",
    "chain_hub_load",
    "min_pretension_N",
    "open_belt_wrap_angle_deg",
    "takeup_belt_hub_load",
]
