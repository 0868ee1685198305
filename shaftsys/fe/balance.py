"""Global force and moment balance of a free body (the equilibrium proof).

Units: positions [mm], forces [N], moments [N*mm].

A free body carries k point loads: force ``F_i`` and moment ``M_i`` at ``(x_i, 0, 0)``
on the shaft axis (applied loads and reactions alike). Statics requires
``sum F_i = 0`` and ``sum (M_i + r_i x F_i) = 0`` about the origin, with
``r_i x F_i = (0, -x_i F_iz, x_i F_iy)``. The residuals are made relative to the size of
the loads: the force residual to ``sum |F_i|``, the moment residual to
``sum |F_i| * max |x_i| + sum |M_i|`` (norms of the 3-vectors; a largest lever arm of
0 counts as 1 mm). This is the definition of the single run's equilibrium check; the
batched design study applies it to every unit-load column of every variant.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike, NDArray

__all__ = ["global_balance", "planar_balance"]

Array = NDArray[np.float64]


def global_balance(
    x_mm: ArrayLike, F_N: ArrayLike, M_Nmm: ArrayLike
) -> tuple[Array, Array, Array]:
    """Force and moment residual of k point loads, with any leading batch axes.

    Parameters
    ----------
    x_mm:
        Positions on the shaft axis [mm], shape (..., k) (broadcast against
        ``F_N.shape[:-1]``).
    F_N:
        Forces (Fx, Fy, Fz) [N], shape (..., k, 3).
    M_Nmm:
        Moments (Mx, My, Mz) [N*mm], shape (..., k, 3).

    Returns
    -------
    force_residual : numpy.ndarray
        ``|sum F_i|`` [N], shape (...).
    moment_residual : numpy.ndarray
        ``|sum (M_i + r_i x F_i)|`` about the origin [N*mm], shape (...).
    relative : numpy.ndarray
        The larger of force / sum|F_i| and moment / (sum|F_i| max|x_i| + sum|M_i|) [-]
        (a residual whose scale is 0 is taken as it is), shape (...). NaN propagates.
    """
    F = np.asarray(F_N, dtype=float)
    M = np.asarray(M_Nmm, dtype=float)
    x = np.broadcast_to(np.asarray(x_mm, dtype=float), F.shape[:-1])
    if F.shape[-1] != 3 or M.shape != F.shape:
        raise ValueError(f"F_N and M_Nmm must have the same shape (..., k, 3), got "
                         f"{F.shape} and {M.shape}")
    lead = F.shape[:-2]
    if F.shape[-2] == 0:
        zero = np.zeros(lead)
        return zero, zero.copy(), zero.copy()
    fx, fy, fz = F[..., 0], F[..., 1], F[..., 2]
    arm = np.abs(x).max(axis=-1)
    arm = np.where(arm == 0.0, 1.0, arm)
    sum_f = (fx.sum(axis=-1), fy.sum(axis=-1), fz.sum(axis=-1))
    sum_m = (M[..., 0].sum(axis=-1),
             M[..., 1].sum(axis=-1) + (-x * fz).sum(axis=-1),
             M[..., 2].sum(axis=-1) + (x * fy).sum(axis=-1))
    norm_f = np.sqrt(fx * fx + fy * fy + fz * fz).sum(axis=-1)
    norm_m = np.sqrt(M[..., 0] ** 2 + M[..., 1] ** 2 + M[..., 2] ** 2).sum(axis=-1)
    scale_m = norm_m + norm_f * arm
    f_res = np.sqrt(sum_f[0] ** 2 + sum_f[1] ** 2 + sum_f[2] ** 2)
    m_res = np.sqrt(sum_m[0] ** 2 + sum_m[1] ** 2 + sum_m[2] ** 2)
    with np.errstate(invalid="ignore", divide="ignore"):
        rel = np.maximum(np.where(norm_f > 0.0, f_res / norm_f, f_res),
                         np.where(scale_m > 0.0, m_res / scale_m, m_res))
    return f_res, m_res, rel


def planar_balance(x_mm: ArrayLike, Fy_N: ArrayLike, Mz_Nmm: ArrayLike) -> Array:
    """The relative residual of :func:`global_balance` for loads in the x-y plane only.

    Fx = Fz = 0 and Mx = My = 0: the same operations on the non-zero components in
    the same order (adding an exact zero changes no bit), so the result is bit for bit
    that of :func:`global_balance` with those components zero, without passes over
    them.

    Parameters
    ----------
    x_mm:
        Positions [mm], shape (..., k) (broadcast against ``Fy_N``).
    Fy_N:
        Forces along y [N], shape (..., k).
    Mz_Nmm:
        Moments about z [N*mm], shape (..., k).

    Returns
    -------
    numpy.ndarray
        The relative residual of :func:`global_balance`, shape (...).
    """
    fy = np.asarray(Fy_N, dtype=float)
    mz = np.asarray(Mz_Nmm, dtype=float)
    if mz.shape != fy.shape:
        raise ValueError(f"Fy_N and Mz_Nmm must have the same shape, got {fy.shape} and "
                         f"{mz.shape}")
    x0 = np.asarray(x_mm, dtype=float)
    x = np.broadcast_to(x0, fy.shape)
    if fy.shape[-1] == 0:
        return np.zeros(fy.shape[:-1])
    # the largest |x| of the positions before broadcasting (the same set of values)
    arm = np.broadcast_to(np.abs(x0).max(axis=-1), fy.shape[:-1])
    arm = np.where(arm == 0.0, 1.0, arm)
    sum_fy = fy.sum(axis=-1)
    sum_mz = mz.sum(axis=-1) + (x * fy).sum(axis=-1)
    norm_f = np.sqrt(fy * fy).sum(axis=-1)
    norm_m = np.sqrt(mz**2).sum(axis=-1)
    scale_m = norm_m + norm_f * arm
    f_res = np.sqrt(sum_fy**2)
    m_res = np.sqrt(sum_mz**2)
    with np.errstate(invalid="ignore", divide="ignore"):
        return np.maximum(np.where(norm_f > 0.0, f_res / norm_f, f_res),
                          np.where(scale_m > 0.0, m_res / scale_m, m_res))
