"""Element matrices of a straight shaft: planar Timoshenko/Euler-Bernoulli beam and bar.

Units: lengths [mm], rigidities E*I and G*J [N*mm^2], E*A and k*G*A [N], distributed
loads [N/mm], stiffness entries [N/mm], [N], [N*mm/rad] as the DOF pair requires.

Every function broadcasts over leading axes, so a whole mesh (or a stack of meshes)
is handled by one call: inputs of shape (...,) give matrices of shape (..., 4, 4).

Planar beam element
-------------------
DOFs (u1, phi1, u2, phi2): u is the transverse deflection in the plane [mm] and phi the
rotation of the cross-section [rad], counted positive in the sense of increasing u along
+x. For Euler-Bernoulli phi = du/dx; for Timoshenko phi is the section rotation psi and
the centre-line slope is du/dx = psi + Q / (k G A). The nodal load conjugate to phi is
the moment M_phi [N*mm] in the same sense. The caller maps the two bending planes:
x-y plane u = v, phi = theta_z, M_phi = M_z; x-z plane u = w, phi = -theta_y,
M_phi = -M_y.

The stiffness is the "interdependent interpolation" Timoshenko element
(J. S. Przemieniecki, Theory of Matrix Structural Analysis, McGraw-Hill 1968, sec. 5.6;
Z. Friedman and J. B. Kosmatka, "An improved two-node Timoshenko beam finite element",
Computers & Structures 47 (1993) 473-481)::

              E I        [ 12     6L          -12    6L         ]
    k = --------------   [ 6L    (4+Phi)L^2   -6L   (2-Phi)L^2  ]
        (1 + Phi) L^3    [ -12   -6L           12   -6L         ]
                         [ 6L    (2-Phi)L^2   -6L   (4+Phi)L^2  ]

with Phi = 12 E I / (k G A L^2). Its shape functions solve the homogeneous Timoshenko
equations exactly, so one element gives the exact cantilever tip deflection
P L^3 / (3 E I) + P L / (k G A). Phi = 0 is the Euler-Bernoulli (Hermite cubic) element.

Consistent load of a uniform transverse load q [N/mm] over the element::

    f = (q L / 2,  q L^2 / 12,  q L / 2,  -q L^2 / 12)

This is consistent for Phi = 0 (Hermite cubics) and also for the interdependent element:
integrating its displacement shape functions (Friedman & Kosmatka) over the
element gives L/2, L^2/12, L/2, -L^2/12 for every Phi, because the Phi terms integrate
to zero. ``tests/test_fe_beam.py`` re-derives both the stiffness and this vector with
sympy from the Timoshenko equations.

Bar element
-----------
Axial (DOF u_x [mm], rigidity E A [N]) or torsion (DOF theta_x [rad], rigidity G J
[N*mm^2])::

    k = c / L [[1, -1], [-1, 1]]
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike, NDArray

__all__ = [
    "bar_stiffness",
    "bar_uniform_load",
    "beam_stiffness",
    "shear_parameter",
    "uniform_load",
]


def shear_parameter(EI_Nmm2: ArrayLike, kGA_N: ArrayLike, L_mm: ArrayLike) -> NDArray[np.float64]:
    """Timoshenko shear parameter Phi = 12 E I / (k G A L^2) [-].

    Parameters
    ----------
    EI_Nmm2:
        Bending rigidity E*I [N*mm^2].
    kGA_N:
        Shear rigidity k*G*A [N]; ``inf`` gives Phi = 0 (Euler-Bernoulli).
    L_mm:
        Element length [mm].

    Returns
    -------
    numpy.ndarray
        Phi [-], broadcast shape of the inputs.
    """
    L = np.asarray(L_mm, dtype=float)
    return 12.0 * np.asarray(EI_Nmm2, dtype=float) / (np.asarray(kGA_N, dtype=float) * L * L)


def beam_stiffness(
    EI_Nmm2: ArrayLike, L_mm: ArrayLike, phi_shear: ArrayLike = 0.0
) -> NDArray[np.float64]:
    """Stiffness of the planar Timoshenko (or Euler-Bernoulli) beam element.

    Parameters
    ----------
    EI_Nmm2:
        Bending rigidity E*I [N*mm^2].
    L_mm:
        Element length [mm].
    phi_shear:
        Shear parameter Phi = 12 E I / (k G A L^2) [-] (0 = Euler-Bernoulli).

    Returns
    -------
    numpy.ndarray
        Shape (..., 4, 4) in DOFs (u1 [mm], phi1 [rad], u2 [mm], phi2 [rad]); entries in
        N/mm, N/rad, N*mm/rad.
    """
    EI, L, Phi = np.broadcast_arrays(
        np.asarray(EI_Nmm2, dtype=float),
        np.asarray(L_mm, dtype=float),
        np.asarray(phi_shear, dtype=float),
    )
    c = EI / ((1.0 + Phi) * L**3)
    a = 12.0 * c
    b = 6.0 * c * L
    d = (4.0 + Phi) * c * L * L
    e = (2.0 - Phi) * c * L * L
    k = np.empty((*EI.shape, 4, 4))
    k[..., 0, 0] = a
    k[..., 0, 1] = b
    k[..., 0, 2] = -a
    k[..., 0, 3] = b
    k[..., 1, 1] = d
    k[..., 1, 2] = -b
    k[..., 1, 3] = e
    k[..., 2, 2] = a
    k[..., 2, 3] = -b
    k[..., 3, 3] = d
    for i, j in ((1, 0), (2, 0), (3, 0), (2, 1), (3, 1), (3, 2)):
        k[..., i, j] = k[..., j, i]
    return k


def uniform_load(q_N_mm: ArrayLike, L_mm: ArrayLike) -> NDArray[np.float64]:
    """Consistent nodal loads of a uniform transverse load on a beam element.

    Valid for the Euler-Bernoulli and the interdependent Timoshenko element alike.

    Parameters
    ----------
    q_N_mm:
        Load per length [N/mm], positive in +u.
    L_mm:
        Element length [mm].

    Returns
    -------
    numpy.ndarray
        Shape (..., 4): (q L/2 [N], q L^2/12 [N*mm], q L/2 [N], -q L^2/12 [N*mm]).
    """
    q, L = np.broadcast_arrays(np.asarray(q_N_mm, dtype=float), np.asarray(L_mm, dtype=float))
    f = np.empty((*q.shape, 4))
    f[..., 0] = 0.5 * q * L
    f[..., 1] = q * L * L / 12.0
    f[..., 2] = f[..., 0]
    f[..., 3] = -f[..., 1]
    return f


def bar_stiffness(rigidity: ArrayLike, L_mm: ArrayLike) -> NDArray[np.float64]:
    """Stiffness of the two-node bar element (axial or torsion).

    Parameters
    ----------
    rigidity:
        E*A [N] for axial, G*J [N*mm^2] for torsion.
    L_mm:
        Element length [mm].

    Returns
    -------
    numpy.ndarray
        Shape (..., 2, 2): c/L [[1, -1], [-1, 1]] in N/mm (axial) or N*mm/rad (torsion).
    """
    c = np.asarray(rigidity, dtype=float) / np.asarray(L_mm, dtype=float)
    k = np.empty((*c.shape, 2, 2))
    k[..., 0, 0] = c
    k[..., 1, 1] = c
    k[..., 0, 1] = -c
    k[..., 1, 0] = -c
    return k


def bar_uniform_load(p: ArrayLike, L_mm: ArrayLike) -> NDArray[np.float64]:
    """Consistent nodal loads of a uniform axial load [N/mm] or torque [N*mm/mm] on a bar.

    Parameters
    ----------
    p:
        Load per length, positive along +x (axial) or about +x (torsion).
    L_mm:
        Element length [mm].

    Returns
    -------
    numpy.ndarray
        Shape (..., 2): (p L / 2, p L / 2) in N or N*mm.
    """
    p_, L = np.broadcast_arrays(np.asarray(p, dtype=float), np.asarray(L_mm, dtype=float))
    half = 0.5 * p_ * L
    return np.stack([half, half], axis=-1)
