"""The value every load model returns, the shaft-frame unit vectors and input checks.

Frame (see :mod:`shaftsys.units`): x along the shaft axis, y and z right-handed, angles
``theta`` about the shaft measured from +y toward +z. With ``x_hat = (1, 0, 0)``::

    u_r(theta) = (0, cos theta, sin theta)       radial unit vector
    u_t(theta) = x_hat x u_r = (0, -sin theta, cos theta)   tangential (+x rotation sense)

so that ``(x_hat, u_r, u_t)`` is right-handed: ``u_r x u_t = x_hat``.

Reduction rule: a force ``F`` [N] applied at a point ``p`` [mm] offset from the axis
in the y-z plane acts on the axis as the force ``F`` plus the moment ``p x F`` [N*mm].
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, field
from types import MappingProxyType

import numpy as np
from numpy.typing import ArrayLike, NDArray

from shaftsys.errors import ModelError

Vector = NDArray[np.float64]

X_HAT: Vector = np.array([1.0, 0.0, 0.0])
X_HAT.setflags(write=False)


def u_r(theta_deg: float) -> Vector:
    """Radial unit vector ``(0, cos theta, sin theta)`` [-] at angle ``theta_deg`` [deg]."""
    th = math.radians(theta_deg)
    return np.array([0.0, math.cos(th), math.sin(th)])


def u_t(theta_deg: float) -> Vector:
    """Tangential unit vector ``x_hat x u_r = (0, -sin theta, cos theta)`` [-].

    ``theta_deg`` [deg]. It points in the sense of a positive rotation about +x.
    """
    th = math.radians(theta_deg)
    return np.array([0.0, -math.sin(th), math.cos(th)])


def _frozen_vector(value: ArrayLike, name: str) -> Vector:
    arr = np.array(value, dtype=float).reshape(-1)
    if arr.shape != (3,):
        raise ModelError(f"{name} must have 3 components (x, y, z), got shape {arr.shape}")
    if not np.all(np.isfinite(arr)):
        raise ModelError(f"{name} must be finite, got {arr.tolist()}")
    arr.setflags(write=False)
    return arr


@dataclass(frozen=True, eq=False)
class AxisLoad:
    """Load an element puts on its shaft, reduced to the axis at the element's position.

    Attributes
    ----------
    force_N:
        Force on the shaft [N], shape (3,), shaft frame (x, y, z). Read-only array.
    moment_Nmm:
        Moment on the shaft about the axis point [N*mm], shape (3,). ``moment_Nmm[0]``
        is the torque the element applies to the shaft about +x. Read-only array.
    warnings:
        Human-readable warnings with the numbers that triggered them (e.g. belt slip).
    details:
        Diagnostics for reports, every key ending in its unit (``W_t_N``,
        ``T_tight_N``, ``tension_ratio`` is dimensionless). Read-only mapping.
    """

    force_N: Vector
    moment_Nmm: Vector
    warnings: tuple[str, ...] = ()
    details: Mapping[str, float] = field(default_factory=dict)

    def __post_init__(self) -> None:
        object.__setattr__(self, "force_N", _frozen_vector(self.force_N, "force_N"))
        object.__setattr__(self, "moment_Nmm", _frozen_vector(self.moment_Nmm, "moment_Nmm"))
        object.__setattr__(self, "warnings", tuple(self.warnings))
        object.__setattr__(
            self, "details", MappingProxyType({k: float(v) for k, v in self.details.items()})
        )

    @property
    def torque_Nmm(self) -> float:
        """Torque about +x [N*mm] (= ``moment_Nmm[0]``)."""
        return float(self.moment_Nmm[0])


def require_finite(value: float, name: str) -> float:
    """Return ``value`` as float or raise :class:`ModelError` if it is not finite."""
    try:
        v = float(value)
    except (TypeError, ValueError) as exc:
        raise ModelError(f"{name} must be a number, got {value!r}") from exc
    if not math.isfinite(v):
        raise ModelError(f"{name} must be finite, got {v}")
    return v


def require_positive(value: float, name: str) -> float:
    """Return ``value`` as float or raise :class:`ModelError` unless finite and > 0."""
    v = require_finite(value, name)
    if v <= 0.0:
        raise ModelError(f"{name} must be > 0, got {v}", expected="a positive number")
    return v


def require_non_negative(value: float, name: str) -> float:
    """Return ``value`` as float or raise :class:`ModelError` unless finite and >= 0."""
    v = require_finite(value, name)
    if v < 0.0:
        raise ModelError(f"{name} must be >= 0, got {v}", expected="a number >= 0")
    return v


def require_angle_range(
    value: float,
    name: str,
    low: float,
    high: float,
    *,
    low_inclusive: bool = False,
    high_inclusive: bool = False,
) -> float:
    """Return angle ``value`` [deg] as float or raise :class:`ModelError` outside the range.

    ``low``/``high`` [deg] bound the range; the flags say whether the ends are allowed.
    """
    v = require_finite(value, name)
    ok_low = v >= low if low_inclusive else v > low
    ok_high = v <= high if high_inclusive else v < high
    if not (ok_low and ok_high):
        lb = "[" if low_inclusive else "("
        hb = "]" if high_inclusive else ")"
        raise ModelError(
            f"{name} = {v} deg is out of range", expected=f"degrees in {lb}{low}, {high}{hb}"
        )
    return v
