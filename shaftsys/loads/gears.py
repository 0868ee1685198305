"""Mesh loads of spur, helical and straight bevel gears on their own shaft.

Every function returns the load the gear puts ON ITS SHAFT (which equals the load the
mating gear puts on this gear, carried through a rigid gear body), reduced to the shaft
axis at the gear's axial position (see :mod:`shaftsys.loads.base`).

Conventions
-----------
``T_el_Nmm`` [N*mm]
    Torque the gear applies to its shaft about +x. The power the gear delivers to the
    shaft is ``T_el * speed``: positive means the gear is driven by its mate and drives
    its shaft (the "driven gear" of a pair); negative means the shaft drives the gear,
    which drives its mate (the "driver"). No separate driver flag exists.
``mesh_angle_deg`` [deg]
    Direction, from this shaft's axis, toward the pitch point (where the mate's teeth
    touch). For an external pair it is the direction toward the mate's axis; for an
    internal (ring) gear, toward the pinion's axis.
Tangential force on the gear
    ``W_t = T_el / r`` along ``u_t(mesh_angle)`` (signed), applied at ``r u_r``.
Consequence for a mating pair with parallel shafts whose x axes point the same way:
    external pair, mesh angles 180 deg apart: ``T_el2 = +T_el1 * r2 / r1``;
    internal pair (pinion inside ring), same mesh angle: ``T_el2 = -T_el1 * r2 / r1``.

Helical thrust (derivation kept here because the sign is easy to get wrong): a
right-hand tooth line on the pitch cylinder runs along ``t = cos(psi) x_hat +
sin(psi) u_t`` (it advances toward +x while turning in the +x sense, like a right-hand
screw thread). Without friction the tooth force is normal to the tooth surface, so its
component in the pitch plane (spanned by ``x_hat`` and ``u_t``) is perpendicular to
``t``: ``F_plane = W_t (u_t - tan(psi) x_hat)``. For a left-hand tooth ``psi`` changes
sign. Hence the axial force on the gear along +x is ``F_a = -h W_t tan(psi)`` with
``h = +1`` (right hand) or ``-1`` (left hand). The same holds for internal gears, as
the hand is a property of the helix, not of the tooth side.

This agrees with the hand rule of the trade (Shigley's Mechanical Engineering Design,
helical gear force analysis; recalled from memory): for the DRIVER, curl the fingers of
the hand matching its helix in its sense of rotation, the thumb shows the thrust on the
driver; the driven gear's thrust is opposite. E.g. right hand, speed > 0, driver
(``T_el < 0``): ``W_t < 0``, ``F_a = -W_t tan(psi) > 0`` = +x = right thumb. Q.E.D.
"""

from __future__ import annotations

import math

from shaftsys.errors import ModelError
from shaftsys.loads.base import (
    X_HAT,
    AxisLoad,
    require_angle_range,
    require_finite,
    require_positive,
    u_r,
    u_t,
)

_RIGHT = {"right", "r", "rh", "right_hand", "right-hand"}
_LEFT = {"left", "l", "lh", "left_hand", "left-hand"}


def helix_hand_sign(hand: str | int | None, helix_angle_deg: float) -> int:
    """Sign ``h`` of a helix hand: +1 right hand, -1 left hand, 0 for a spur gear.

    Parameters
    ----------
    hand:
        ``"right"``/``"R"``/``+1`` or ``"left"``/``"L"``/``-1`` (case-insensitive);
        ``None`` is allowed only when ``helix_angle_deg`` is 0 (spur gear).
    helix_angle_deg:
        Helix angle [deg], >= 0 (the hand is never encoded in its sign).

    Returns
    -------
    int
        +1, -1, or 0 for a spur gear (whatever ``hand`` says).
    """
    psi = require_angle_range(helix_angle_deg, "helix_angle_deg", 0.0, 90.0, low_inclusive=True)
    if psi == 0.0:
        if hand is None:
            return 0
        helix_hand_sign(hand, 1.0)  # validate the spelling anyway
        return 0
    if hand is None:
        raise ModelError(
            f"helical gear (helix angle {psi} deg) needs a hand", expected="'right' or 'left'"
        )
    if isinstance(hand, bool):
        raise ModelError(f"unknown helix hand {hand!r}", expected="'right' or 'left'")
    if isinstance(hand, int):
        if hand in (1, -1):
            return hand
        raise ModelError(f"unknown helix hand {hand!r}", expected="+1 (right) or -1 (left)")
    key = str(hand).strip().lower()
    if key in _RIGHT:
        return 1
    if key in _LEFT:
        return -1
    raise ModelError(f"unknown helix hand {hand!r}", expected="'right' or 'left'")


def reference_pitch_diameter_mm(
    normal_module_mm: float, tooth_count: int, helix_angle_deg: float = 0.0
) -> float:
    """Return the reference pitch diameter ``d = m_n z / cos(psi)`` [mm].

    Parameters
    ----------
    normal_module_mm:
        Normal module m_n [mm] (the transverse module of a spur gear).
    tooth_count:
        Number of teeth z [-] (> 0; give the ring's count for an internal gear).
    helix_angle_deg:
        Helix angle psi at the reference diameter [deg], 0 for spur gears.

    Returns
    -------
    float
        Pitch diameter [mm]. Source: Shigley, helical gears, ``p_t = p_n / cos(psi)``,
        i.e. transverse module ``m_t = m_n / cos(psi)`` (from memory).
    """
    m_n = require_positive(normal_module_mm, "normal_module_mm")
    z = require_positive(tooth_count, "tooth_count")
    psi = require_angle_range(helix_angle_deg, "helix_angle_deg", 0.0, 90.0, low_inclusive=True)
    return m_n * z / math.cos(math.radians(psi))


def working_pitch_diameter_mm(
    center_distance_mm: float,
    tooth_count: int,
    mate_tooth_count: int,
    internal_mesh: bool = False,
) -> float:
    """Working (operating) pitch diameter [mm] of a gear at a given centre distance.

    The working pitch circles roll on each other: ``d_w / d_w,mate = z / z_mate`` and
    ``a = (d_w + d_w,mate) / 2`` (external pair) or ``|d_w,ring - d_w,pinion| / 2``
    (internal pair), so ``d_w = 2 a z / (z + z_mate)`` or ``2 a z / |z_mate - z|``.

    Parameters
    ----------
    center_distance_mm:
        Operating centre distance a [mm].
    tooth_count, mate_tooth_count:
        Tooth counts [-] of this gear and its mate.
    internal_mesh:
        True when one of the pair is an internal (ring) gear.

    Returns
    -------
    float
        Working pitch diameter [mm]. When you use it as ``pitch_diameter_mm``, also pass
        the working pressure angle, not the reference one.
    """
    a = require_positive(center_distance_mm, "center_distance_mm")
    z = require_positive(tooth_count, "tooth_count")
    z_m = require_positive(mate_tooth_count, "mate_tooth_count")
    if internal_mesh:
        if z == z_m:
            raise ModelError("internal pair with equal tooth counts has no centre distance")
        return 2.0 * a * z / abs(z_m - z)
    return 2.0 * a * z / (z + z_m)


def gear_pitch_diameter_mm(
    normal_module_mm: float,
    tooth_count: int,
    helix_angle_deg: float = 0.0,
    working_diameter_mm: float | None = None,
) -> float:
    """Pitch diameter [mm] to give the mesh-load function: the override or the reference.

    Parameters
    ----------
    normal_module_mm, tooth_count, helix_angle_deg:
        As :func:`reference_pitch_diameter_mm` ([mm], [-], [deg]).
    working_diameter_mm:
        Working pitch diameter [mm]; when given it wins (profile-shifted pairs at a
        non-standard centre distance).

    Returns
    -------
    float
        Pitch diameter [mm].
    """
    if working_diameter_mm is not None:
        return require_positive(working_diameter_mm, "working_diameter_mm")
    return reference_pitch_diameter_mm(normal_module_mm, tooth_count, helix_angle_deg)


def spur_helical_mesh_load(
    T_el_Nmm: float,
    pitch_diameter_mm: float,
    mesh_angle_deg: float,
    normal_pressure_angle_deg: float,
    helix_angle_deg: float = 0.0,
    hand: str | int | None = None,
    internal: bool = False,
) -> AxisLoad:
    """Load of a spur or helical gear mesh on the gear's shaft.

    Parameters
    ----------
    T_el_Nmm:
        Torque the gear applies to its shaft about +x [N*mm] (see module conventions).
    pitch_diameter_mm:
        Pitch diameter d [mm] (reference or working, see :func:`gear_pitch_diameter_mm`).
    mesh_angle_deg:
        Direction from this shaft's axis toward the pitch point [deg].
    normal_pressure_angle_deg:
        Normal pressure angle phi_n [deg] (equals the transverse one for spur gears).
    helix_angle_deg:
        Helix angle psi [deg], 0 <= psi < 90.
    hand:
        Helix hand, ``"right"`` or ``"left"`` (``None`` allowed for spur gears).
    internal:
        True for an internal (ring) gear: the separating force pushes it outward.

    Returns
    -------
    AxisLoad
        Force [N] ``W_t u_t + s W_r u_r + F_a x_hat`` with ``s = -1`` (external) or
        ``+1`` (internal), moment [N*mm] ``T_el x_hat - r F_a u_t`` (the axial force at
        the pitch point bends the shaft). ``moment_Nmm[0]`` is ``T_el_Nmm`` exactly.
        ``details``: ``W_t_N``, ``W_r_N``, ``W_a_N`` (magnitudes), ``F_a_x_N`` (signed
        thrust along +x), ``transverse_pressure_angle_deg``, ``pitch_radius_mm``.

    Notes
    -----
    Magnitudes (Shigley's Mechanical Engineering Design, helical gear force analysis):
    ``W_r = W_t tan(phi_n) / cos(psi)`` (= ``W_t tan(phi_t)``) and ``W_a = W_t tan(psi)``.
    Friction is neglected. Signs: see the module docstring.
    """
    T = require_finite(T_el_Nmm, "T_el_Nmm")
    d = require_positive(pitch_diameter_mm, "pitch_diameter_mm")
    theta = require_finite(mesh_angle_deg, "mesh_angle_deg")
    phi_n = require_angle_range(normal_pressure_angle_deg, "normal_pressure_angle_deg", 0.0, 90.0)
    psi = require_angle_range(helix_angle_deg, "helix_angle_deg", 0.0, 90.0, low_inclusive=True)
    h = helix_hand_sign(hand, psi)
    if not isinstance(internal, bool):
        raise ModelError(f"internal must be True or False, got {internal!r}")

    r = 0.5 * d
    psi_rad = math.radians(psi)
    W_t = T / r  # signed, along u_t
    W_r = abs(W_t) * math.tan(math.radians(phi_n)) / math.cos(psi_rad)
    F_a = -h * W_t * math.tan(psi_rad)
    radial_sign = 1.0 if internal else -1.0

    ur = u_r(theta)
    ut = u_t(theta)
    force = W_t * ut + radial_sign * W_r * ur + F_a * X_HAT
    moment = -r * F_a * ut
    moment[0] = T  # r u_r x (W_t u_t) = r W_t x_hat = T_el; written exactly
    phi_t = math.degrees(math.atan(math.tan(math.radians(phi_n)) / math.cos(psi_rad)))
    return AxisLoad(
        force_N=force,
        moment_Nmm=moment,
        details={
            "W_t_N": abs(W_t),
            "W_r_N": W_r,
            "W_a_N": abs(F_a),
            "F_a_x_N": F_a,
            "transverse_pressure_angle_deg": phi_t,
            "pitch_radius_mm": r,
        },
    )


def bevel_mesh_load(
    T_el_Nmm: float,
    mean_pitch_diameter_mm: float,
    pitch_cone_angle_deg: float,
    pressure_angle_deg: float,
    mesh_angle_deg: float,
    apex_direction: int,
) -> AxisLoad:
    """Load of a straight bevel gear mesh on the gear's shaft.

    Parameters
    ----------
    T_el_Nmm:
        Torque the gear applies to its shaft about +x [N*mm].
    mean_pitch_diameter_mm:
        Pitch diameter at the mid face width, d_m = 2 r_m [mm].
    pitch_cone_angle_deg:
        Pitch cone angle gamma of this gear [deg], 0 < gamma <= 90.
    pressure_angle_deg:
        Pressure angle phi [deg].
    mesh_angle_deg:
        Direction from this shaft's axis toward the mean pitch point [deg].
    apex_direction:
        +1 if the cone apex lies toward +x from the gear, -1 if toward -x.

    Returns
    -------
    AxisLoad
        Applied at ``r_m u_r``: tangential ``W_t = T_el / r_m`` along ``u_t`` (signed),
        radial ``W_r = |W_t| tan(phi) cos(gamma)`` toward the own axis, axial
        ``W_a = |W_t| tan(phi) sin(gamma)`` away from the apex (along
        ``-apex_direction x_hat``) whatever the torque sign. Moment [N*mm]
        ``T_el x_hat - r_m F_a u_t``; ``moment_Nmm[0]`` is ``T_el_Nmm`` exactly.
        ``details``: ``W_t_N``, ``W_r_N``, ``W_a_N``, ``F_a_x_N``, ``mean_radius_mm``.

    Notes
    -----
    Source: Shigley's Mechanical Engineering Design, bevel gear force analysis (straight
    bevel, forces at the midpoint of the tooth, friction neglected).
    """
    T = require_finite(T_el_Nmm, "T_el_Nmm")
    d_m = require_positive(mean_pitch_diameter_mm, "mean_pitch_diameter_mm")
    gamma = require_angle_range(
        pitch_cone_angle_deg, "pitch_cone_angle_deg", 0.0, 90.0, high_inclusive=True
    )
    phi = require_angle_range(pressure_angle_deg, "pressure_angle_deg", 0.0, 90.0)
    theta = require_finite(mesh_angle_deg, "mesh_angle_deg")
    if isinstance(apex_direction, bool) or apex_direction not in (1, -1):
        raise ModelError(f"apex_direction must be +1 or -1, got {apex_direction!r}")

    r_m = 0.5 * d_m
    W_t = T / r_m
    tan_phi = math.tan(math.radians(phi))
    g = math.radians(gamma)
    W_r = abs(W_t) * tan_phi * math.cos(g)
    W_a = abs(W_t) * tan_phi * math.sin(g)
    F_a = -float(apex_direction) * W_a

    ur = u_r(theta)
    ut = u_t(theta)
    force = W_t * ut - W_r * ur + F_a * X_HAT
    moment = -r_m * F_a * ut
    moment[0] = T
    return AxisLoad(
        force_N=force,
        moment_Nmm=moment,
        details={
            "W_t_N": abs(W_t),
            "W_r_N": W_r,
            "W_a_N": W_a,
            "F_a_x_N": F_a,
            "mean_radius_mm": r_m,
        },
    )


__all__ = [
    "bevel_mesh_load",
    "gear_pitch_diameter_mm",
    "helix_hand_sign",
    "reference_pitch_diameter_mm",
    "spur_helical_mesh_load",
    "working_pitch_diameter_mm",
]
