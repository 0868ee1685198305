"""Slope and deflection limits, and closed-form critical speed bounds.

Sources: Shigley, Mechanical Engineering Design, 9th ed.: Table 7-2 (limits), eqs. 7-22
(uniform shaft), 7-23 (Rayleigh), 7-32 (Dunkerley), Example 7-5 (two gears on a 1 in
shaft, from memory, numbers re-derived by hand below). Simply supported beam deflection:
Roark's Formulas for Stress and Strain, Table 8.1 case 1e (intermediate load).
Exact two-mass natural frequency: numpy.linalg.eigvals (numpy 2.x).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

from shaftsys.checks import (
    BEARING_SLOPE_LIMITS,
    SPUR_GEAR_SLOPE_LIMIT_RAD,
    bearing_slope_limit,
    dunkerley_combine_rad_s,
    dunkerley_critical_speed_rad_s,
    gear_deflection_limit_mm,
    rayleigh_critical_speed_rad_s,
    rayleigh_from_influence_rad_s,
    rpm_from_rad_s,
    simply_supported_solid_shaft_critical_speed_rad_s,
    simply_supported_uniform_critical_speed_rad_s,
    slope_status,
)
from shaftsys.errors import ModelError
from shaftsys.model.bearing import BearingKind

INCH = 25.4
LBF = 4.4482216152605
G = 9.80665

# --------------------------------------------------------------------------------------
# Limits
# --------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("kind", "low", "high"),
    [
        # Shigley 9th ed. Table 7-2 (from memory)
        ("deep_groove_ball", 0.001, 0.003),
        ("cylindrical_roller", 0.0008, 0.0012),
        ("tapered_roller", 0.0005, 0.0012),
        ("self_aligning_ball", 0.026, 0.052),
    ],
)
def test_bearing_slope_limits_shigley_table_7_2(kind: str, low: float, high: float) -> None:
    lim = bearing_slope_limit(kind)
    assert (lim.low_rad, lim.high_rad) == (low, high)
    assert "Table 7-2" in lim.source


def test_every_bearing_kind_has_a_limit_keyed_by_its_string() -> None:
    for kind in BearingKind:
        lim = BEARING_SLOPE_LIMITS[kind.value]  # type: ignore[index]
        assert 0.0 < lim.low_rad <= lim.high_rad
        assert lim.source
    with pytest.raises(ValueError, match="unknown bearing kind"):
        bearing_slope_limit("plain_bushing")


def test_slope_status() -> None:
    lim = bearing_slope_limit("deep_groove_ball")
    assert slope_status(-0.0009, lim) == "ok"
    assert slope_status(0.002, lim) == "marginal"
    assert slope_status(0.0031, lim) == "exceeded"


def test_gear_limits_shigley_table_7_2() -> None:
    """Shigley 9th ed. Table 7-2 (from memory): uncrowned spur slope < 0.0005 rad;
    deflection 0.010 in (P < 10), 0.005 in (11 < P < 19), 0.003 in (20 < P < 50)."""
    assert SPUR_GEAR_SLOPE_LIMIT_RAD == 0.0005
    assert gear_deflection_limit_mm(25.4 / 6.0) == pytest.approx(0.254)  # P = 6
    assert gear_deflection_limit_mm(25.4 / 16.0) == pytest.approx(0.127)  # P = 16
    assert gear_deflection_limit_mm(25.4 / 32.0) == pytest.approx(0.0762)  # P = 32
    assert gear_deflection_limit_mm(3.0) == pytest.approx(0.254)  # module 3 mm, P = 8.5
    with pytest.raises(ModelError):
        gear_deflection_limit_mm(0.0)


# --------------------------------------------------------------------------------------
# Critical speeds
# --------------------------------------------------------------------------------------


def _ss_influence(x: float, xl: float, L: float, EI: float) -> float:
    """Deflection at x per unit load at xl on a simply supported span (Roark Table 8.1
    case 1e): y = F b x (L^2 - b^2 - x^2) / (6 E I L) for x <= a, b = L - a."""
    if x > xl:
        x, xl = L - x, L - xl
    b = L - xl
    return b * x * (L**2 - b**2 - x**2) / (6.0 * EI * L)


def _example_7_5() -> tuple[np.ndarray, np.ndarray]:
    """Shigley 9th ed. Example 7-5 (from memory): 1 in steel shaft (E = 30 Mpsi) on a
    31 in span, gears of 35 lbf at 7 in and 55 lbf at 20 in. Returned in shaftsys units:
    masses [kg] (w / g) and influence matrix [mm/N]."""
    EI = 30e6 * math.pi / 64.0  # lbf*in^2
    xs = (7.0, 20.0)
    a_in_lbf = np.array([[_ss_influence(xi, xj, 31.0, EI) for xj in xs] for xi in xs])
    masses = np.array([35.0, 55.0]) * LBF / G
    return masses, a_in_lbf * INCH / LBF


def test_example_7_5_influence_coefficients() -> None:
    """Shigley 9th ed. Example 7-5 (from memory): a11 = 2.061e-4, a12 = 2.223e-4,
    a22 = 3.534e-4 in/lbf. Checks the test's beam helper, not the code."""
    _, a = _example_7_5()
    a_in = a * LBF / INCH
    assert a_in[0, 0] == pytest.approx(2.061e-4, abs=1e-7)
    assert a_in[0, 1] == pytest.approx(2.223e-4, abs=1.5e-7)
    assert a_in[1, 1] == pytest.approx(3.534e-4, abs=1e-7)


def test_rayleigh_example_7_5_hand_calculation() -> None:
    """Hand calculation in inch units, g = 386.1 in/s^2: y1 = 0.01944 in, y2 = 0.02722 in,
    sum(w y) = 2.1776, sum(w y^2) = 0.053982, omega = sqrt(386.1*2.1776/0.053982)
    = 124.8 rad/s (1192 rpm)."""
    m, a = _example_7_5()
    w = rayleigh_from_influence_rad_s(m, a)
    assert w == pytest.approx(124.8, abs=0.1)
    assert rpm_from_rad_s(w) == pytest.approx(1192.0, abs=1.5)
    # same from the deflections (in mm) directly
    y_mm = np.array([0.019443, 0.027220]) * INCH
    assert rayleigh_critical_speed_rad_s(m, y_mm) == pytest.approx(124.8, abs=0.1)


def test_dunkerley_example_7_5_hand_calculation() -> None:
    """Hand calculation: omega_11 = sqrt(386.1/(35*2.0608e-4)) = 231.4 rad/s,
    omega_22 = sqrt(386.1/(55*3.5341e-4)) = 140.9 rad/s, combined 120.4 rad/s."""
    m, a = _example_7_5()
    w = dunkerley_critical_speed_rad_s(m, np.diag(a))
    assert w == pytest.approx(120.4, abs=0.1)
    assert dunkerley_combine_rad_s([231.4, 140.9]) == pytest.approx(120.4, abs=0.1)


def test_bounds_bracket_exact_two_mass_frequency() -> None:
    """Exact first natural frequency from the eigenvalues of A M (numpy.linalg.eigvals):
    Dunkerley <= exact <= Rayleigh."""
    m, a = _example_7_5()
    lam = np.linalg.eigvals(a @ np.diag(m) / 1000.0)  # 1/omega^2 [s^2]; a in mm/N
    exact = 1.0 / math.sqrt(float(np.max(lam.real)))
    assert dunkerley_critical_speed_rad_s(m, np.diag(a)) <= exact
    assert exact <= rayleigh_from_influence_rad_s(m, a)


@given(
    x1=st.floats(0.05, 0.95),
    x2=st.floats(0.05, 0.95),
    m1=st.floats(0.5, 200.0),
    m2=st.floats(0.5, 200.0),
    L=st.floats(200.0, 3000.0),
    d=st.floats(15.0, 150.0),
)
def test_dunkerley_below_rayleigh_two_discs(
    x1: float, x2: float, m1: float, m2: float, L: float, d: float
) -> None:
    """Invariant (Shigley sec. 7-6: Dunkerley underestimates, Rayleigh overestimates):
    for two discs on a simply supported shaft, Dunkerley <= Rayleigh."""
    EI = 207000.0 * math.pi * d**4 / 64.0  # N*mm^2
    xs = (x1 * L, x2 * L)
    a = np.array([[_ss_influence(xi, xj, L, EI) for xj in xs] for xi in xs])
    m = np.array([m1, m2])
    wd = dunkerley_critical_speed_rad_s(m, np.diag(a))
    wr = rayleigh_from_influence_rad_s(m, a)
    assert wd <= wr * (1.0 + 1e-9)


def test_uniform_shaft_si_closed_form() -> None:
    """Shigley eq. 7-22 in SI: omega = (pi/L)^2 sqrt(E I/(rho A)); steel d = 50 mm,
    L = 1 m, E = 207 GPa, rho = 7850 kg/m^3 -> (pi/1)^2 * sqrt(207e9*I/(7850*A))."""
    d = 0.05
    inertia = math.pi * d**4 / 64.0
    area = math.pi * d**2 / 4.0
    expected = math.pi**2 * math.sqrt(207e9 * inertia / (7850.0 * area))
    got = simply_supported_solid_shaft_critical_speed_rad_s(1000.0, 50.0, 207000.0, 7850.0)
    assert got == pytest.approx(expected, rel=1e-12)
    assert got == pytest.approx(633.5, abs=0.1)  # hand value
    mu = 7850.0 * 1e-9 * math.pi * 50.0**2 / 4.0  # kg/mm
    assert simply_supported_uniform_critical_speed_rad_s(
        1000.0, 207000.0, math.pi * 50.0**4 / 64.0, mu
    ) == pytest.approx(expected, rel=1e-12)


def test_critical_speed_input_errors() -> None:
    with pytest.raises(ModelError):
        rayleigh_critical_speed_rad_s([1.0, 2.0], [0.1])
    with pytest.raises(ModelError):
        rayleigh_critical_speed_rad_s([1.0], [0.0])
    with pytest.raises(ModelError):
        dunkerley_critical_speed_rad_s([1.0, -2.0], [1e-4, 1e-4])
    with pytest.raises(ModelError):
        simply_supported_uniform_critical_speed_rad_s(0.0, 2e5, 1e5, 1e-2)
