"""Reference rating life from the element loads (ISO/TS 16281 approach).

Reference: with zero clearance, no tilt and a pure radial load, the life from the load
distribution reproduces ISO 281:2007's L10 = (C/P)^3 of a ball bearing up to the known
ratio between the discrete load zone of Z balls and the integral load zone ISO 281's C
assumes (Lundberg-Palmgren). The test computes that ratio on its own from Stribeck's
half load zone Q_j = Qmax cos(psi_j)^1.5 (Harris, *Rolling Bearing Analysis*) with plain
sums, independently of the Newton solve and the Hertz constants.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from shaftsys.bearings.interior import (
    RowGeometry,
    distribution,
    point_contact_constant,
    solve_displacement,
)
from shaftsys.bearings.interior_life import (
    conformity_ratio,
    reference_life,
    ring_ratings,
)

RADIAL_ONLY = np.array([False, False, True, True, True])


def _row(Z: int, clearance: float = 0.0) -> RowGeometry:
    K = point_contact_constant(12.0, 60.0, 0.0, 0.52, 0.53)
    return RowGeometry(12.0, Z, 60.0, 0.0, 0.52, 0.53, None, clearance, 1.0, False, K)


def _discrete_ratio(Z: int, Qci: float, Qco: float, Fr: float, C: float) -> float:
    """L(discrete Stribeck zone) / (C/Fr)^3 by hand: Q_j = Qmax cos^1.5, sum Q = Fr."""
    psi = 2 * math.pi * np.arange(Z) / Z
    shape = np.clip(np.cos(psi), 0.0, None) ** 1.5
    Qmax = Fr / np.sum(shape * np.cos(psi))
    Q = Qmax * shape
    Qei = (np.sum(Q**3) / Z) ** (1 / 3)
    Qeo = (np.sum(Q ** (10 / 3)) / Z) ** 0.3
    e = 10 / 9
    L = ((Qei / Qci) ** (3 * e) + (Qeo / Qco) ** (3 * e)) ** (-1 / e)
    return float(L / (C / Fr) ** 3)


@pytest.mark.parametrize("Z", [9, 12, 400])
def test_zero_clearance_reproduces_iso281_within_the_known_ratio(Z: int) -> None:
    C, Fr = 30_000.0, 3_000.0
    g = _row(Z)
    ratio = conformity_ratio(12.0, 60.0, 0.0, 0.52, 0.53, line=False)
    Qci, Qco = ring_ratings(C, Z, 1, 0.0, ratio, line=False)
    u, _, _ = solve_displacement([g], np.array([[Fr, 0, 0, 0, 0]]), fixed=RADIAL_ONLY)
    L = reference_life(distribution(g, u).Q_N, Qci, Qco, line=False)[0]
    known = _discrete_ratio(Z, Qci, Qco, Fr, C)
    assert L / (C / Fr) ** 3 == pytest.approx(known, rel=2e-3)
    assert abs(known - 1.0) < 0.1  # a discrete zone of 9 or more balls: within 10 %
    if Z == 400:  # the integral load zone ISO 281's C assumes
        assert L / (C / Fr) ** 3 == pytest.approx(1.0, rel=5e-3)


def test_clearance_shortens_the_life() -> None:
    C, Fr, Z = 30_000.0, 3_000.0, 12
    ratio = conformity_ratio(12.0, 60.0, 0.0, 0.52, 0.53, line=False)
    Qci, Qco = ring_ratings(C, Z, 1, 0.0, ratio, line=False)
    lives = []
    for c in (0.0, 0.02, 0.05):
        g = _row(Z, c)
        u, _, _ = solve_displacement([g], np.array([[Fr, 0, 0, 0, 0]]), fixed=RADIAL_ONLY)
        lives.append(reference_life(distribution(g, u).Q_N, Qci, Qco, line=False)[0])
    assert lives[0] > lives[1] > lives[2]
