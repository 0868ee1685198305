"""The one statement of shaftsys's internal units.

Every number inside the package is a plain ``float`` (or numpy array) in these units.
Model files may write any unit pint understands; the loader converts to these once,
and every output key names its unit (``Fr_N``, ``x_mm``, ``L10_h``).

==================  =====================  =========================================
quantity            internal unit          note
==================  =====================  =========================================
force               N
length              mm
moment, torque      N*mm
stress, modulus     MPa                    (= N/mm^2)
speed               rpm                    signed: angular velocity about +x
power               W
time (life, share)  h
kinematic visc.     mm^2/s                 (= cSt)
temperature         degC
angle               deg                    bare angles in a model file are degrees
mass                kg
density             kg/m^3                 converted where used (see ``DENSITY_KG_PER_MM3``)
acceleration        m/s^2                  gravity; weight in N = m[kg] * g[m/s^2]
rotational inertia  kg*m^2                 (polar and diametral inertia of elements)
stiffness           N/mm, N*mm/rad
bearing ratings     N                      C, C0, Cu
rating life         10^6 revolutions       L10, Lnm in millions of revolutions; *_h in hours
==================  =====================  =========================================

Frame of every shaft: x along the axis from the shaft's start (the first step's free
end), y and z right-handed, angles about the shaft measured from +y toward +z, rotation
sense = sign of the angular velocity about +x.
"""

from __future__ import annotations

import math
from functools import lru_cache
from typing import Any

FORCE = "N"
LENGTH = "mm"
MOMENT = "N*mm"
STRESS = "MPa"
SPEED = "rpm"
POWER = "W"
TIME = "h"
VISCOSITY = "mm^2/s"
TEMPERATURE = "degC"
ANGLE = "deg"
MASS = "kg"
DENSITY = "kg/m^3"
ACCELERATION = "m/s^2"
INERTIA = "kg*m^2"
LINEAR_STIFFNESS = "N/mm"
ANGULAR_STIFFNESS = "N*mm/rad"

#: Units written in output keys and the JSON ``units`` object.
OUTPUT_UNITS: dict[str, str] = {
    "force": FORCE,
    "length": "mm",
    "moment": MOMENT,
    "speed": SPEED,
    "stress": STRESS,
    "time": TIME,
    "power": POWER,
    "angle": "deg",
    "slope": "rad",
    "life": "10^6 rev",
}

STANDARD_GRAVITY_M_S2 = 9.80665
DENSITY_KG_PER_MM3 = 1e-9  # 1 kg/m^3 expressed in kg/mm^3
MEGA_REVOLUTIONS = 1e6


def omega_rad_s(speed_rpm: float) -> float:
    """Angular velocity [rad/s] of a signed speed [rpm]."""
    return speed_rpm * 2.0 * math.pi / 60.0


def torque_from_power_Nmm(power_W: float, speed_rpm: float) -> float:
    """Torque [N*mm] that carries ``power_W`` [W] at ``speed_rpm`` [rpm] (signs kept).

    T = P / omega, converted from N*m to N*mm.
    """
    if speed_rpm == 0.0:
        raise ZeroDivisionError("power cannot be carried at zero speed; give a torque")
    return power_W / omega_rad_s(speed_rpm) * 1000.0


def power_W(torque_Nmm: float, speed_rpm: float) -> float:
    """Power [W] = torque [N*mm] * omega [rad/s] / 1000 (signed)."""
    return torque_Nmm * omega_rad_s(speed_rpm) / 1000.0


@lru_cache(maxsize=1)
def registry():
    """The pint unit registry used by the loader (lazily built, one per process).

    ``autoconvert_offset_to_baseunit`` lets ``"70 degC"`` parse; speeds are handled in
    :func:`shaftsys.io.quantities.to_internal` because pint's rpm->Hz carries a 2*pi factor.
    """
    import pint

    # pint caches its parsed definitions in the user's cache folder (``:auto:``, via
    # platformdirs): a later process loads them instead of parsing them again (about
    # 0.5 s). Where that folder cannot be used, the registry is built without a cache.
    try:
        ureg: Any = pint.UnitRegistry(autoconvert_offset_to_baseunit=True,
                                      cache_folder=":auto:")
    except (OSError, ValueError, TypeError):
        ureg = pint.UnitRegistry(autoconvert_offset_to_baseunit=True)
    return ureg
