"""Reference rating life from the rolling-element loads (the ISO/TS 16281 approach; pure).

Per ring, the element loads of a case are reduced to a dynamic equivalent reference load
of one element (Lundberg-Palmgren, as given by Harris, *Rolling Bearing Analysis*; from
memory): the ring rotating relative to the load (the inner ring: shaftsys' shafts turn,
the loads stand) ``Qe = (sum Q^w / Z)^(1/w)``, the standing ring
``Qe = (sum Q^v / Z)^(1/v)`` with w = 3, v = 10/3 (ball) or w = 4, v = 4.5 (roller). Each
ring's life is ``(Qc / Qe)^p`` (p = 3 ball, 4 roller, 10^6 rev) and the row's life
``(Li^-e + Lo^-e)^(-1/e)`` (e = 10/9 ball, 9/8 roller).

The element ratings Qc of the rings come from the bearing's C by the relation ISO 281's
C rests on (zero clearance, a half load zone eps = 0.5, the integral load zone): at
Fr = C the life is 10^6 rev; their ratio is the Lundberg-Palmgren ratio of the ring
conformities, Qci/Qco = ((1 - g)/(1 + g))^1.72 (fi (2 fo - 1) / (fo (2 fi - 1)))^0.41
(ball) or ((1 - g)/(1 + g))^(143/108) (roller), g = Dw cos(a)/dm (the same terms as in
ISO 281's fc). Clearance, preload, thrust and tilt change the element loads, and so the
life; the ratio to the ISO 281 life L10 = (C/P)^p is what the designer reads.
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import NDArray

FloatArray = NDArray[np.float64]


def _exponents(line: bool) -> tuple[float, float, float, float]:
    """(w rotating ring, v standing ring, ring life exponent p, Weibull slope e)."""
    return (4.0, 4.5, 4.0, 9.0 / 8.0) if line else (3.0, 10.0 / 3.0, 3.0, 10.0 / 9.0)


def equivalent_element_loads(Q_N: FloatArray, line: bool) -> tuple[FloatArray, FloatArray]:
    """(Qe of the rotating inner ring, Qe of the standing outer ring) [N], per case."""
    w, v, _, _ = _exponents(line)
    Q = np.atleast_2d(np.asarray(Q_N, dtype=np.float64))
    Z = Q.shape[1]
    return (np.sum(Q**w, axis=1) / Z) ** (1.0 / w), (np.sum(Q**v, axis=1) / Z) ** (1.0 / v)


def _zone_integral(n: float, k: float, radial: bool) -> float:
    """(1/2pi) int over the half load zone of (1 - (1 - cos psi))^(n k) [cos psi]."""
    from scipy.integrate import quad

    val, _ = quad(lambda p: (math.cos(p)) ** (n * k) * (math.cos(p) if radial else 1.0),
                  -math.pi / 2.0, math.pi / 2.0)
    return float(val / (2.0 * math.pi))


def conformity_ratio(Dw_mm: float, dm_mm: float, alpha_deg: float, fi: float, fo: float,
                     line: bool) -> float:
    """Qci / Qco of Lundberg-Palmgren (see the module note)."""
    g = Dw_mm * math.cos(math.radians(alpha_deg)) / dm_mm
    if line:
        return ((1.0 - g) / (1.0 + g)) ** (143.0 / 108.0)
    return ((1.0 - g) / (1.0 + g)) ** 1.72 * (fi * (2 * fo - 1) / (fo * (2 * fi - 1))) ** 0.41


def ring_ratings(C_N: float, Z: int, rows: int, alpha_deg: float, ratio: float,
                 line: bool) -> tuple[float, float]:
    """(Qci, Qco) [N] such that a row set of ``rows`` rows at zero clearance carrying
    Fr = C in a half load zone lives 10^6 rev (integral load zone).
    """
    n = 10.0 / 9.0 if line else 1.5
    w, v, p, e = _exponents(line)
    Jr = _zone_integral(n, 1.0, True)          # eps = 0.5: q = cos(psi)^n
    J1 = _zone_integral(n, w, False) ** (1.0 / w)
    J2 = _zone_integral(n, v, False) ** (1.0 / v)
    c = math.cos(math.radians(alpha_deg))
    Qmax = C_N / (rows * Z * Jr * c)
    # L = ((Qci/(Qmax J1))^-pe + (Qco/(Qmax J2))^-pe)^(-1/e) = 1 with Qco = Qci/ratio:
    s = (Qmax * J1) ** (p * e) + (Qmax * J2 * ratio) ** (p * e)
    Qci = s ** (1.0 / (p * e))
    return Qci, Qci / ratio


def reference_life(Q_N: FloatArray, Qci_N: float, Qco_N: float, line: bool) -> FloatArray:
    """Basic reference rating life [10^6 rev] of one row per case from its element
    loads (m, Z); inf where no element is loaded.
    """
    _, _, p, e = _exponents(line)
    Qei, Qeo = equivalent_element_loads(Q_N, line)
    with np.errstate(divide="ignore"):
        inv = (Qei / Qci_N) ** (p * e) + (Qeo / Qco_N) ** (p * e)
        return np.asarray(np.where(inv > 0, inv ** (-1.0 / e), np.inf), dtype=np.float64)


def combined_rows(lives: list[FloatArray], line: bool) -> FloatArray:
    """Life of rows working together (their survival probabilities multiply)."""
    e = _exponents(line)[3]
    with np.errstate(divide="ignore"):
        inv = sum(np.asarray(L, dtype=np.float64) ** -e for L in lives)
        return np.asarray(np.where(np.asarray(inv) > 0, np.asarray(inv) ** (-1.0 / e),
                                   np.inf), dtype=np.float64)
