"""Unit conversion of model-file values against values worked by hand.

Source of every factor: the SI definitions (BIPM SI Brochure, 9th ed., 2019) and
NIST Special Publication 811 (2008 ed.), "Guide for the Use of the International System
of Units", Appendix B (conversion factors), unless a line says otherwise.
"""

from __future__ import annotations

import math

import pytest

from shaftsys.io.quantities import QuantityProblem, to_internal


@pytest.mark.parametrize(("text", "dimension", "expected"), [
    # 1 rpm = 1 revolution per minute: the internal speed unit itself.
    ("1450 rpm", "speed", 1450.0),
    ("-1450 rpm", "speed", -1450.0),
    # 100 rad/s: one revolution is 2*pi rad (SI Brochure, radian), so
    # 100 rad/s * 60 s/min / (2*pi rad/rev) = 3000/pi = 954.92965855137... rpm.
    ("100 rad/s", "speed", 3000.0 / math.pi),
    # 360 deg/s is one revolution per second = 60 rpm.
    ("360 deg/s", "speed", 60.0),
    # 7.5 kW = 7500 W (SI prefix k = 10^3).
    ("7.5 kW", "power", 7500.0),
    # Absolute temperatures: t/degC = T/K - 273.15 (SI Brochure, 2.3.1);
    # t/degF = 1.8 t/degC + 32 (NIST SP 811, B.9): 158 degF -> (158 - 32)/1.8 = 70 degC.
    ("70 degC", "temperature", 70.0),
    ("158 degF", "temperature", 70.0),
    ("343.15 K", "temperature", 70.0),
    # 210 GPa = 210e9 Pa = 210e9 N/m^2 = 210e3 N/mm^2 = 210000 MPa.
    ("210 GPa", "stress", 210000.0),
    # 150 N*m = 150 N * 1000 mm = 150000 N*mm.
    ("150 N*m", "moment", 150000.0),
    # 1 in = 25.4 mm exactly (NIST SP 811, B.8, international inch): 3 in = 76.2 mm.
    ("3 in", "length", 76.2),
    # 1 St = 1 cm^2/s = 100 mm^2/s (NIST SP 811, B.8), so 1 cSt = 1 mm^2/s.
    ("68 cSt", "viscosity", 68.0),
    ("68 mm^2/s", "viscosity", 68.0),
    # 1 % = 0.01 (ISO 80000-1; NIST SP 811, 7.10.2).
    ("95 %", "dimensionless", 0.95),
    # 12 kN = 12000 N. 1 lbf = 0.45359237 kg * 9.80665 m/s^2 = 4.4482216152605 N
    # (NIST SP 811, B.8; exact by definition of lb and g_n): 2 lbf = 8.896443230521 N.
    ("12 kN", "force", 12000.0),
    ("2 lbf", "force", 8.896443230521),
    # 30 min = 0.5 h; 1 rad = 180/pi deg.
    ("30 min", "time", 0.5),
    ("0.5 rad", "angle", 90.0 / math.pi),
    # 7850 kg/m^3 stays in kg/m^3; 200 kN/mm = 200000 N/mm.
    ("7850 kg/m^3", "density", 7850.0),
    ("200 kN/mm", "linear_stiffness", 200000.0),
])
def test_conversion_worked_by_hand(text: str, dimension: str, expected: float) -> None:
    assert to_internal(text, dimension) == pytest.approx(expected, rel=1e-12, abs=1e-12)


def test_rad_per_s_literal_digits() -> None:
    # 3000/pi typed out (rad = 1, rev = 2 pi rad): 954.929658551372 rpm.
    assert to_internal("100 rad/s", "speed") == pytest.approx(954.929658551372, rel=1e-13)


@pytest.mark.parametrize(("text", "expected"), [
    # The 2*pi trap. pint (like the SI) treats "Hz" as 1/s and "rpm" as
    # revolution/minute with revolution = 2*pi rad and rad = 1, so a plain pint
    # conversion gives 24 Hz = 24/s = 24 rad/s = 229.18 rpm. For a shaft speed a
    # frequency written in Hz means revolutions per second (a 24 Hz shaft turns 24 times
    # a second), which is what shaftsys reads: 24 rev/s * 60 s/min = 1440 rpm.
    ("24 Hz", 1440.0),
    ("1/s", 60.0),
    ("60 1/min", 60.0),
    ("1 turn/s", 60.0),
])
def test_pure_frequency_is_revolutions_per_time(text: str, expected: float) -> None:
    value = to_internal(text, "speed")
    assert value == pytest.approx(expected, rel=1e-12)
    assert value != pytest.approx(expected / (2.0 * math.pi), rel=1e-3)


@pytest.mark.parametrize(("value", "dimension", "expected"), [
    # bare numbers are in the internal unit of the dimension (shaftsys/units.py)
    (45, "length", 45.0),
    ("45", "length", 45.0),
    (12.5, "force", 12.5),
    (1450, "speed", 1450.0),
    (20, "angle", 20.0),          # bare angles are degrees
    (70, "temperature", 70.0),    # degC
    (0.3, "dimensionless", 0.3),
    (" 2e3 ", "moment", 2000.0),
    (-9.81, "acceleration", -9.81),
])
def test_bare_numbers_in_default_units(value: object, dimension: str, expected: float
                                       ) -> None:
    assert to_internal(value, dimension) == expected


@pytest.mark.parametrize(("value", "dimension", "words"), [
    ("45 kg", "length", "not a length"),
    ("7.5 kW", "speed", "not a speed"),
    ("12 mm", "force", "not a force"),
    ("inf mm", "length", "not a finite number"),
    ("nan", "force", "not a finite number"),
    (float("inf"), "force", "not a finite number"),
    ("1e400 mm", "length", "not a finite number"),
    ("forty mm", "length", "cannot read"),
    (True, "length", "is not a length"),
    (None, "force", "is not a force"),
    ([1, 2], "force", "list given"),
])
def test_refused_values(value: object, dimension: str, words: str) -> None:
    with pytest.raises(QuantityProblem) as info:
        to_internal(value, dimension)
    assert words in info.value.message
    assert info.value.expected  # says what would have been valid
