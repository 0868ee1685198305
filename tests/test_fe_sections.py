"""Round-section properties and Cowper's shear coefficient."""

from __future__ import annotations

import math

import numpy as np
import pytest

from shaftsys.errors import ModelError
from shaftsys.fe.sections import circular_section, circular_section_arrays


def test_solid_section_properties() -> None:
    # Area pi d^2/4, I = pi d^4/64, J = pi d^4/32 (Roark's Formulas for Stress and Strain,
    # 7th ed., table A.1, solid circle; from memory).
    d = 40.0
    s = circular_section(d, 0.0, 0.3)
    assert s.A_mm2 == pytest.approx(math.pi * d**2 / 4, rel=1e-14)
    assert s.I_mm4 == pytest.approx(math.pi * d**4 / 64, rel=1e-14)
    assert s.J_mm4 == pytest.approx(math.pi * d**4 / 32, rel=1e-14)


def test_hollow_section_properties() -> None:
    # Hollow circle: A = pi (D^2 - d^2)/4, I = pi (D^4 - d^4)/64 (Roark table A.1; from memory).
    D, d = 60.0, 35.0
    s = circular_section(D, d, 0.28)
    assert s.A_mm2 == pytest.approx(math.pi * (D**2 - d**2) / 4, rel=1e-14)
    assert s.I_mm4 == pytest.approx(math.pi * (D**4 - d**4) / 64, rel=1e-14)
    assert s.J_mm4 == pytest.approx(math.pi * (D**4 - d**4) / 32, rel=1e-14)


@pytest.mark.parametrize("nu", [0.0, 0.25, 0.3, 0.45])
def test_cowper_solid_circle(nu: float) -> None:
    # Cowper (1966), J. Appl. Mech. 33:335, table 1, solid circle: k = 6(1+nu)/(7+6nu).
    assert circular_section(30.0, 0.0, nu).k_shear == pytest.approx(
        6 * (1 + nu) / (7 + 6 * nu), rel=1e-14
    )


def test_cowper_thin_tube_limit() -> None:
    # Cowper (1966), table 1, thin-walled round tube: k = 2(1+nu)/(4+3nu).
    nu = 0.3
    k = circular_section(100.0, 99.9999, nu).k_shear
    assert k == pytest.approx(2 * (1 + nu) / (4 + 3 * nu), rel=1e-6)


def test_cowper_hollow_general_formula() -> None:
    # Cowper (1966), table 1, hollow circle, m = d_i/d_o = 0.5, nu = 0.3, typed out:
    # k = 6(1+nu)(1+m^2)^2 / ((7+6nu)(1+m^2)^2 + (20+12nu) m^2)
    nu = 0.3
    expected = 6 * 1.3 * 1.25**2 / (8.8 * 1.25**2 + 23.6 * 0.25)
    assert circular_section(80.0, 40.0, nu).k_shear == pytest.approx(expected, rel=1e-14)


def test_vectorised_matches_scalar() -> None:
    do = np.array([20.0, 50.0, 80.0])
    di = np.array([0.0, 10.0, 60.0])
    A, I2, J, k = circular_section_arrays(do, di, 0.3)
    for i in range(3):
        s = circular_section(float(do[i]), float(di[i]), 0.3)
        assert (A[i], I2[i], J[i], k[i]) == pytest.approx((s.A_mm2, s.I_mm4, s.J_mm4, s.k_shear))


@pytest.mark.parametrize(
    ("do", "di", "nu"), [(0.0, 0.0, 0.3), (-5.0, 0.0, 0.3), (20.0, 20.0, 0.3), (20.0, 5.0, 0.5)]
)
def test_invalid_sections_raise(do: float, di: float, nu: float) -> None:
    with pytest.raises(ModelError):
        circular_section(do, di, nu)
