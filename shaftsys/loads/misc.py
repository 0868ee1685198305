"""Couplings, given point loads, weights and mass unbalance, as loads on the shaft axis.

Units: forces [N], moments and torques [N*mm], lengths [mm], masses [kg], speeds [rpm],
angles [deg], gravity [m/s^2]. Frame and reduction rule: :mod:`shaftsys.loads.base`.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

from shaftsys.errors import ModelError
from shaftsys.loads.base import (
    AxisLoad,
    require_finite,
    require_non_negative,
    u_r,
)
from shaftsys.units import omega_rad_s


def _vector3(value: ArrayLike, name: str) -> np.ndarray:
    arr = np.asarray(value, dtype=float).reshape(-1)
    if arr.shape != (3,):
        raise ModelError(f"{name} must have 3 components (x, y, z), got shape {arr.shape}")
    if not np.all(np.isfinite(arr)):
        raise ModelError(f"{name} must be finite, got {arr.tolist()}")
    return arr


def coupling_load(
    T_el_Nmm: float, radial_force_N: float = 0.0, radial_angle_deg: float = 0.0
) -> AxisLoad:
    """Load of a coupling half on its shaft: torque, plus an optional constant radial force.

    Parameters
    ----------
    T_el_Nmm:
        Torque the coupling applies to this shaft about +x [N*mm].
    radial_force_N:
        Magnitude of a radial force [N] (misalignment reaction), >= 0; default none.
    radial_angle_deg:
        Direction of that force [deg]: it acts along ``u_r(radial_angle_deg)``.

    Returns
    -------
    AxisLoad
        Force [N] ``F u_r(angle)`` on the axis, moment [N*mm] ``(T_el, 0, 0)``.
    """
    T = require_finite(T_el_Nmm, "T_el_Nmm")
    F = require_non_negative(radial_force_N, "radial_force_N")
    ang = require_finite(radial_angle_deg, "radial_angle_deg")
    return AxisLoad(
        force_N=F * u_r(ang),
        moment_Nmm=np.array([T, 0.0, 0.0]),
        details={"radial_force_N": F},
    )


def point_load(
    force_N: ArrayLike,
    moment_Nmm: ArrayLike = (0.0, 0.0, 0.0),
    offset_yz_mm: ArrayLike = (0.0, 0.0),
) -> AxisLoad:
    """Reduce a given force and moment, optionally applied off the axis, to the axis.

    Parameters
    ----------
    force_N:
        Force [N], 3 components (x, y, z) in the shaft frame.
    moment_Nmm:
        Moment [N*mm] applied at the same point, 3 components.
    offset_yz_mm:
        (y, z) offset [mm] of the point of application from the axis, at the element's
        axial position.

    Returns
    -------
    AxisLoad
        Force [N] unchanged, moment [N*mm] ``M + p x F`` with ``p = (0, y, z)``.
    """
    F = _vector3(force_N, "force_N")
    M = _vector3(moment_Nmm, "moment_Nmm")
    off = np.asarray(offset_yz_mm, dtype=float).reshape(-1)
    if off.shape != (2,) or not np.all(np.isfinite(off)):
        raise ModelError(f"offset_yz_mm must be 2 finite numbers (y, z), got {off.tolist()}")
    p = np.array([0.0, off[0], off[1]])
    return AxisLoad(force_N=F, moment_Nmm=M + np.cross(p, F))


def weight_load(mass_kg: float, gravity_m_s2: ArrayLike) -> AxisLoad:
    """Weight of an element as a force on the axis (centre of mass assumed on the axis).

    Parameters
    ----------
    mass_kg:
        Mass [kg], >= 0.
    gravity_m_s2:
        Gravity acceleration vector [m/s^2] in the shaft frame, 3 components
        (e.g. ``(0, -9.80665, 0)`` for a horizontal shaft with +y up).

    Returns
    -------
    AxisLoad
        Force [N] ``m g`` (kg * m/s^2 = N), zero moment.
    """
    m = require_non_negative(mass_kg, "mass_kg")
    g = _vector3(gravity_m_s2, "gravity_m_s2")
    return AxisLoad(
        force_N=m * g, moment_Nmm=np.zeros(3), details={"weight_N": m * float(np.linalg.norm(g))}
    )


def unbalance_load(
    mass_kg: float, eccentricity_mm: float, speed_rpm: float, phase_deg: float
) -> AxisLoad:
    """Centrifugal force of an unbalance mass, frozen at the stated phase.

    The force rotates with the shaft; this model takes the shaft at the instant when the
    unbalance points along ``u_r(phase_deg)`` (a quasi-static snapshot: a caller that
    wants the worst case over a revolution scans the phase). The mass is assumed in the
    element's plane, so there is no moment.

    Parameters
    ----------
    mass_kg:
        Unbalance mass m [kg], >= 0.
    eccentricity_mm:
        Radius e [mm] of the mass from the axis, >= 0.
    speed_rpm:
        Shaft speed [rpm] (sign irrelevant: omega^2).
    phase_deg:
        Angular position of the mass [deg] at the frozen instant.

    Returns
    -------
    AxisLoad
        Force [N] ``m e omega^2 u_r(phase)`` with ``kg * mm * (rad/s)^2 = 1e-3 N``,
        zero moment. ``details``: ``F_N``.
    """
    m = require_non_negative(mass_kg, "mass_kg")
    e = require_non_negative(eccentricity_mm, "eccentricity_mm")
    n = require_finite(speed_rpm, "speed_rpm")
    ph = require_finite(phase_deg, "phase_deg")
    w = omega_rad_s(n)
    F = m * e * w * w * 1e-3
    return AxisLoad(force_N=F * u_r(ph), moment_Nmm=np.zeros(3), details={"F_N": F})


__all__ = ["coupling_load", "point_load", "unbalance_load", "weight_load"]
