"""Rolling-element loads of one bearing row from the inner-ring displacement (pure numpy).

Displacement of the inner ring against the outer ring, ``u = (uy, uz, ux, thy, thz)``
[mm, mm, mm, rad, rad] (radial in two planes, axial, tilt about y and z); the load
vector ``f = (Fy, Fz, Fa, My, Mz)`` [N, N, N, N*mm, N*mm] is what must act on the inner
ring to hold it there. Element j sits at azimuth psi_j = 2 pi j / Z (from +y toward +z).
A point of the inner ring at radius R, azimuth psi, axial offset x moves radially by
``ur_j + x kappa_j`` and axially by ``ux - R kappa_j`` with ``ur_j = uy cos psi + uz sin
psi`` and ``kappa_j = thz cos psi - thy sin psi`` (rigid rings, no centrifugal force).

* Ball (point contact, Q = K delta^1.5): the raceway curvature centres lie A = (fi + fo
  - 1) Dw apart; at the centred position their radial distance is A cos(alpha) - Pd/2
  and their axial distance A sin(alpha) (``side`` = +1/-1 for the direction of thrust the
  row takes; 0 deg: both). The approach is delta = |s| - A of the displaced distance s.
  The contact angle follows the load (Harris, *Rolling Bearing Analysis*).
* Roller (line contact, Q = K delta^(10/9)): the roller is cut into slices; slice k at x_k
  approaches by (ur_j + x_k kappa_j) cos(alpha) + side (ux - R kappa_j) sin(alpha) -
  (Pd/2) cos(alpha); each slice carries K delta^(10/9) / n_slices (the slicing
  technique, common practice).

The load-deflection constants: :func:`point_contact_constant` (Hertz, closed form with
the complete elliptic integrals; scipy) and :func:`line_contact_constant` (Palmgren's
line contact relation delta = 3.84e-5 Q^0.9 / l^0.8 for steel, as given by Harris,
from memory; checked in the tests by inverting it).

:func:`solve_displacement` is the inverse problem (loads -> displacement) by Newton's
method with the analytic Jacobian and a backtracking line search, vectorised over cases.
"""

from __future__ import annotations

import functools
import math
from dataclasses import dataclass, replace

import numpy as np
from numpy.typing import NDArray

from shaftsys.errors import NumericalError
from shaftsys.model.bearing import AxialRole, Bearing, SetArrangement

FloatArray = NDArray[np.float64]

#: Steel rings and elements (Harris' data for bearing steel).
E_STEEL_MPA = 207_900.0
NU_STEEL = 0.3
N_POINT = 1.5
N_LINE = 10.0 / 9.0
#: Slices of a roller for tilt (line contact).
ROLLER_SLICES = 21


@dataclass(frozen=True)
class RowGeometry:
    """The element set of one bearing row, in the form the distribution needs.

    Dw_mm, Z, dm_mm, alpha_deg, fi, fo (ball), Lwe_mm (roller), clearance_mm (radial
    clearance Pd), side (+1: the row takes thrust toward +x of the inner ring; -1:
    toward -x), line (roller: line contact), K_N (load-deflection constant of one
    element, inner and outer contact in series, [N/mm^n]), preload_mm (axial
    interference of the row at the centred position, from a set's preload [mm]).
    """

    Dw_mm: float
    Z: int
    dm_mm: float
    alpha_deg: float
    fi: float
    fo: float
    Lwe_mm: float | None
    clearance_mm: float
    side: float
    line: bool
    K_N: float
    preload_mm: float = 0.0

    @property
    def n(self) -> float:
        """Load-deflection exponent: 10/9 line, 3/2 point contact."""
        return N_LINE if self.line else N_POINT

    @property
    def A_mm(self) -> float:
        """Distance of the raceway curvature centres (ball) [mm]."""
        return (self.fi + self.fo - 1.0) * self.Dw_mm

    @property
    def R_mm(self) -> float:
        """Radius of the inner raceway's curvature-centre locus (ball) or of the
        contact line (roller) [mm].
        """
        a = math.radians(self.alpha_deg)
        if self.line:
            return 0.5 * (self.dm_mm - self.Dw_mm * math.cos(a))
        return 0.5 * self.dm_mm + (self.fi - 0.5) * self.Dw_mm * math.cos(a)


def ball_curvature_sums(Dw_mm: float, dm_mm: float, alpha_deg: float, f: float,
                        outer: bool) -> tuple[float, float, float, float]:
    """Principal curvatures [1/mm] of a ball on its raceway (Harris): ball 2/Dw twice,
    raceway along the rolling direction +-2/Dw gamma/(1 -+ gamma), groove -1/(f Dw).
    """
    g = Dw_mm * math.cos(math.radians(alpha_deg)) / dm_mm
    s = -1.0 if outer else 1.0
    return (2.0 / Dw_mm, 2.0 / Dw_mm, s * 2.0 / Dw_mm * g / (1.0 - s * g),
            -1.0 / (f * Dw_mm))


def hertz_point(rho: tuple[float, float, float, float], Q_N: float,
                E_MPa: float = E_STEEL_MPA, nu: float = NU_STEEL
                ) -> tuple[float, float, float, float]:
    """Hertz point contact of two bodies of one material (closed form).

    ``rho``: principal curvatures (body I plane 1, 2, body II plane 1, 2) [1/mm].
    Returns (approach delta [mm], semi-axes a, b [mm], max pressure [MPa]):
    F(rho) = ((rho_I1 - rho_I2) + (rho_II1 - rho_II2)) / sum rho fixes the ellipse
    parameter m = 1 - (b/a)^2 through ((2 - m) E(m) - 2 (1 - m) K(m)) / (m E(m)) = F;
    then a = (6 k^2 E Q R / (pi E'))^(1/3), b = a / k, k = a / b, R = 1/sum rho,
    E' = E / (1 - nu^2), delta = K(m) (9 / (2 E(m) R) (Q / (pi k E'))^2)^(1/3),
    p = 3 Q / (2 pi a b) (Harris).
    """
    from scipy.optimize import brentq
    from scipy.special import ellipe, ellipk

    total = sum(rho)
    f_rho = abs((rho[0] - rho[1]) + (rho[2] - rho[3])) / total
    if f_rho < 1e-12:
        m = 0.0
        Km = Em = math.pi / 2.0
    else:
        def mismatch(mm: float) -> float:
            k_, e_ = float(ellipk(mm)), float(ellipe(mm))
            return ((2.0 - mm) * e_ - 2.0 * (1.0 - mm) * k_) / (mm * e_) - f_rho
        m = brentq(mismatch, 1e-14, 1.0 - 1e-15, xtol=1e-16)
        Km, Em = float(ellipk(m)), float(ellipe(m))
    k = 1.0 / math.sqrt(1.0 - m)
    e_prime = E_MPa / (1.0 - nu**2)
    R = 1.0 / total
    a = (6.0 * k**2 * Em * Q_N * R / (math.pi * e_prime)) ** (1.0 / 3.0)
    b = a / k
    delta = Km * (9.0 / (2.0 * Em * R) * (Q_N / (math.pi * k * e_prime)) ** 2) ** (1 / 3)
    return delta, a, b, 3.0 * Q_N / (2.0 * math.pi * a * b)


def point_contact_constant(Dw_mm: float, dm_mm: float, alpha_deg: float, fi: float,
                           fo: float) -> float:
    """K [N/mm^1.5] of one ball, inner and outer contacts in series (Q = K delta^1.5)."""
    Q = 1000.0  # delta ~ Q^(2/3): any load gives the constant
    di = hertz_point(ball_curvature_sums(Dw_mm, dm_mm, alpha_deg, fi, False), Q)[0]
    do = hertz_point(ball_curvature_sums(Dw_mm, dm_mm, alpha_deg, fo, True), Q)[0]
    return Q / (di + do) ** 1.5


def line_contact_constant(Lwe_mm: float) -> float:
    """K [N/mm^(10/9)] of one roller, two contacts in series: each contact deflects
    3.84e-5 Q^0.9 / l^0.8 [mm] (Palmgren, steel, as given by Harris; from memory).
    """
    per_contact = (Lwe_mm**0.8 / 3.84e-5) ** (10.0 / 9.0)
    return per_contact / 2.0 ** (10.0 / 9.0)


def line_contact_pressure(q_N: float, Lwe_mm: float, Dw_mm: float, dm_mm: float,
                          alpha_deg: float, E_MPa: float = E_STEEL_MPA,
                          nu: float = NU_STEEL) -> float:
    """Max Hertz pressure [MPa] of a roller on the inner raceway (two cylinders):
    p = sqrt(w E* / (pi R)), w = q / l, 1/R = 2/Dw + 2/Dw gamma/(1 - gamma),
    E* = E / (2 (1 - nu^2)) (Johnson, *Contact Mechanics*).
    """
    g = Dw_mm * math.cos(math.radians(alpha_deg)) / dm_mm
    inv_R = 2.0 / Dw_mm + 2.0 / Dw_mm * g / (1.0 - g)
    e_star = E_MPa / (2.0 * (1.0 - nu**2))
    return math.sqrt(max(q_N, 0.0) / Lwe_mm * e_star * inv_R / math.pi)


@dataclass(frozen=True)
class Distribution:
    """Element loads for m displacements.

    Q_N (m, Z) element loads; delta_mm (m, Z) approach (negative: a gap); f (m, 5) load
    vector; K (m, 5, 5) tangent stiffness [N/mm, N/rad, N*mm/mm, N*mm/rad];
    alpha_deg (m, Z) working contact angles.
    """

    Q_N: FloatArray
    delta_mm: FloatArray
    f: FloatArray
    K: FloatArray
    alpha_deg: FloatArray


@functools.lru_cache(maxsize=64)
def _angles(Z: int) -> FloatArray:
    out = np.asarray(2.0 * np.pi * np.arange(Z) / Z, dtype=np.float64)
    out.setflags(write=False)
    return out


def distribution(g: RowGeometry, u: FloatArray) -> Distribution:
    """Element loads, load vector and tangent stiffness at displacements ``u`` (m, 5)."""
    u = np.atleast_2d(np.asarray(u, dtype=np.float64))
    psi = _angles(g.Z)
    c, s = np.cos(psi), np.sin(psi)
    a = math.radians(g.alpha_deg)
    R = g.R_mm
    ur = u[:, 0:1] * c + u[:, 1:2] * s                  # (m, Z)
    kap = u[:, 4:5] * c - u[:, 3:4] * s
    ua = u[:, 2:3] - R * kap
    m = u.shape[0]
    zeros = np.zeros_like(c)
    # derivatives of ur and ua with respect to u: (Z, 5)
    dur = np.stack([c, s, zeros, zeros, zeros], axis=1)
    dua = np.stack([zeros, zeros, np.ones_like(c), R * s, -R * c], axis=1)
    dkap = np.stack([zeros, zeros, zeros, -s, c], axis=1)
    n = g.n
    if not g.line:
        A = g.A_mm
        side = g.side if g.alpha_deg > 0.0 else 1.0
        sr = A * math.cos(a) - 0.5 * g.clearance_mm + ur
        sax = A * math.sin(a) + side * ua + g.preload_mm
        dist = np.hypot(sr, sax)
        delta = dist - A
        pos = np.maximum(delta, 0.0)
        Q = g.K_N * pos**n
        dQ = n * g.K_N * pos ** (n - 1.0)
        ca, sa_ = sr / dist, sax / dist
        grad = ca[..., None] * dur + (side * sa_)[..., None] * dua          # (m, Z, 5)
        tang = (-sa_)[..., None] * dur + (side * ca)[..., None] * dua
        f = np.matmul(Q[:, None, :], grad)[:, 0]
        K = (np.matmul(np.swapaxes(dQ[..., None] * grad, 1, 2), grad)
             + np.matmul(np.swapaxes((Q / dist)[..., None] * tang, 1, 2), tang))
        alpha = np.degrees(np.arctan2(sax, sr))
        return Distribution(Q, delta, f, K, alpha)
    L = g.Lwe_mm if g.Lwe_mm is not None else g.Dw_mm
    xk = (np.arange(ROLLER_SLICES) + 0.5) / ROLLER_SLICES * L - 0.5 * L   # (k,)
    side = g.side if g.alpha_deg > 0.0 else 1.0
    cl, sl = math.cos(a), math.sin(a)
    d = ((ur[..., None] + xk * kap[..., None]) * cl + side * ua[..., None] * sl
         - 0.5 * g.clearance_mm * cl + g.preload_mm * sl)  # (m, Z, k)
    pos = np.maximum(d, 0.0)
    w = g.K_N / ROLLER_SLICES
    q = w * pos**n
    dq = n * w * pos ** (n - 1.0)
    grad = (cl * (dur[:, None, :] + xk[None, :, None] * dkap[:, None, :])
            + side * sl * dua[:, None, :])                               # (Z, k, 5)
    nzk = g.Z * ROLLER_SLICES
    f = q.reshape(m, nzk) @ grad.reshape(nzk, 5)
    outer = (grad[..., :, None] * grad[..., None, :]).reshape(nzk, 25)
    K = (dq.reshape(m, nzk) @ outer).reshape(m, 5, 5)
    Q = q.sum(axis=2)
    delta = d.max(axis=2)
    return Distribution(Q, delta, f, K, np.full((m, g.Z), g.alpha_deg))


def solve_displacement(rows: list[RowGeometry], F: FloatArray,
                       fixed: NDArray[np.bool_] | None = None,
                       u_fixed: FloatArray | None = None, *, tol: float = 1e-10,
                       max_iter: int = 100, check: bool = True
                       ) -> tuple[FloatArray, int, float]:
    """Displacement u (m, 5) at which the rows together carry the loads F (m, 5).

    ``fixed`` (5,): components whose displacement is given (``u_fixed``, e.g. the tilt
    from the shaft) instead of their load. Newton's method with the analytic tangent
    stiffness, a tiny diagonal where the rows give none (a direction the rows do not
    hold, e.g. the tilt of a deep-groove bearing, stays where its load keeps it), and
    a backtracking line search on the residual. Returns (u, iterations, largest
    relative residual); NumericalError when it does not converge (``check=False``:
    the last iterate is returned instead, e.g. as the start of a larger solve).
    """
    F = np.atleast_2d(np.asarray(F, dtype=np.float64))
    m = F.shape[0]
    fixed = np.zeros(5, dtype=bool) if fixed is None else np.asarray(fixed, dtype=bool)
    u = np.zeros((m, 5)) if u_fixed is None else np.array(u_fixed, dtype=np.float64)
    free = ~fixed
    R = max(r.R_mm for r in rows)
    scale = np.array([1.0, 1.0, 1.0, 1.0 / R, 1.0 / R])
    ref = np.linalg.norm((F * scale)[:, free], axis=1) + 1e-9

    def total(uu: FloatArray) -> tuple[FloatArray, FloatArray]:
        ds = [distribution(r, uu) for r in rows]
        f_sum = np.zeros((uu.shape[0], 5))
        K_sum = np.zeros((uu.shape[0], 5, 5))
        for d in ds:
            f_sum += d.f
            K_sum += d.K
        return f_sum, K_sum

    # start: a small displacement along the load (every row touches)
    Dw = min(r.Dw_mm for r in rows)
    start = 1e-3 * Dw * np.sign(F) * scale
    u[:, free] = np.where(np.abs(F[:, free]) > 0, start[:, free], u[:, free])
    u[:, free] += sum(0.5 * r.clearance_mm for r in rows) * np.sign(F[:, free]) * (
        np.arange(5)[free] < 2)
    f, K = total(u)
    res = np.linalg.norm(((f - F) * scale)[:, free], axis=1) / ref
    it = 0
    idx = np.flatnonzero(free)
    while it < max_iter and np.any(res > tol):
        it += 1
        Kf = K[:, idx][:, :, idx]
        diag = np.abs(np.diagonal(Kf, axis1=1, axis2=2)).max(axis=1)
        reg = (1e-10 * diag + 1e-6)[:, None, None] * np.eye(len(idx))
        rhs = (F - f)[:, idx]
        step = np.linalg.solve(Kf + reg, rhs[..., None])[..., 0]
        # keep a step within a tenth of the element size per iteration
        size = np.abs(step / scale[idx]).max(axis=1) / (0.1 * Dw)
        step /= np.maximum(size, 1.0)[:, None]
        lam = np.ones(m)
        for _ in range(30):
            trial = u.copy()
            trial[:, idx] += lam[:, None] * step
            ft, _ = total(trial)
            rt = np.linalg.norm(((ft - F) * scale)[:, free], axis=1) / ref
            better = (rt < res) | (res <= tol)
            if np.all(better):
                break
            lam = np.where(better, lam, 0.5 * lam)
        u = np.where((res > tol)[:, None], trial, u)
        f, K = total(u)
        res = np.linalg.norm(((f - F) * scale)[:, free], axis=1) / ref
    worst = float(res.max()) if m else 0.0
    if check and worst > max(tol, 1e-6):
        raise NumericalError(f"the rolling-element load distribution did not converge "
                             f"in {it} Newton steps (residual {worst:.2g})"
                             + _thrust_hint(rows, F, res, tol))
    return u, it, worst


def _thrust_hint(rows: list[RowGeometry], F: FloatArray, res: FloatArray, tol: float
                 ) -> str:
    """Why tapered rows taking thrust one way have no equilibrium: each roller's load
    leans by the contact angle, so Fa = tan(alpha) sum Q cos(alpha) >= Fr tan(alpha)
    whatever the tilt (the limit of a load zone shrinking to one roller).
    """
    one_way = [r for r in rows if r.alpha_deg > 0.0 and r.line]  # fixed contact angle
    if not one_way or len({r.side for r in one_way}) > 1:
        return ""
    t = math.tan(math.radians(min(r.alpha_deg for r in one_way)))
    k = int(np.argmax(res))
    Fr = float(np.hypot(F[k, 0], F[k, 1]))
    Fa = float(one_way[0].side * F[k, 2])
    if Fr > 0.0 and Fa < Fr * t:
        return (f": a row with contact angle {min(r.alpha_deg for r in one_way):.3g} deg "
                f"cannot carry its radial load with less thrust than Fr tan(alpha) (here "
                f"Fa/Fr = {Fa / Fr:.3g} < {t:.3g}); the thrust of its adjusted partner is "
                "missing (solver: {bearing_stiffness: nonlinear} shares an adjusted pair's "
                "thrust by displacement compatibility)")
    return ""


def load_zone_factor(g: RowGeometry, u: FloatArray) -> FloatArray:
    """Load-zone factor epsilon (m,) = (1 + delta0/delta1)/2 of the approach
    delta(psi) = delta0 + delta1 cos(psi - psi0) (Harris); inf under pure thrust.
    """
    u = np.atleast_2d(u)
    a = math.radians(g.alpha_deg)
    side = g.side if g.alpha_deg > 0.0 else 1.0
    d1 = np.hypot(u[:, 0], u[:, 1]) * math.cos(a)
    d0 = ((side * u[:, 2] + g.preload_mm) * math.sin(a)
          - 0.5 * g.clearance_mm * math.cos(a))
    with np.errstate(divide="ignore", invalid="ignore"):
        eps = 0.5 * (1.0 + d0 / d1)
    return np.asarray(np.where(d1 > 0, eps, np.inf), dtype=np.float64)


def row_geometries(bearing: Bearing) -> list[RowGeometry]:
    """The rows of a bearing with an interior: one row; a back-to-back or face-to-face
    set or a double-row unit two rows taking thrust in opposite directions (a preloaded
    set: each row pushed axially until it carries the preload alone); a tandem
    set ``rows`` rows on one side (rows at one seat: their axial spacing is not
    modelled). A single row taking thrust toward -x (``axial: -x``) has side -1.
    """
    g = bearing.interior
    if g is None:
        raise ValueError(f"bearing '{bearing.id}' has no interior")
    line = bearing.kind.is_roller
    if line:
        K = line_contact_constant(g.Lwe_mm if g.Lwe_mm is not None else g.Dw_mm)
    else:
        K = point_contact_constant(g.Dw_mm, g.dm_mm, g.contact_angle_deg, g.fi, g.fo)
    side = -1.0 if bearing.axial is AxialRole.MINUS_X else 1.0
    if bearing.arrangement in {SetArrangement.BACK_TO_BACK, SetArrangement.FACE_TO_FACE,
                               SetArrangement.DOUBLE_ROW} and bearing.rows >= 2:
        sides = [1.0, -1.0]
    else:
        sides = [side] * max(1, bearing.rows)
    rows = [RowGeometry(g.Dw_mm, g.Z, g.dm_mm, g.contact_angle_deg, g.fi, g.fo,
                        g.Lwe_mm, g.clearance_mm, s, line, K) for s in sides]
    if g.preload_N and len(sides) == 2:
        # each row of the set is pushed axially until it carries the preload alone
        one = rows[0]
        u, _, _ = solve_displacement([one], np.array([[0.0, 0.0, g.preload_N, 0.0, 0.0]]),
                                     np.array([False, False, False, True, True]))
        shift = float(u[0, 2])
        rows = [replace(r, preload_mm=shift) for r in rows]
    return rows
