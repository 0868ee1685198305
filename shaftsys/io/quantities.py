"""Turn a model-file value (``45``, ``"45 mm"``, ``"7.5 kW"``) into an internal float.

Bare numbers are in the default unit of their dimension (:data:`DEFAULT_UNITS`, the
internal units of :mod:`shaftsys.units`). Two traps of pint are handled here:

* speed: pint converts ``rpm`` to ``Hz`` with a factor 2*pi (``rpm`` is revolutions,
  ``Hz`` is 1/s). shaftsys reads any pure frequency (``Hz``, ``1/s``, ``1/min``) as
  revolutions per unit time, so ``"24 Hz"`` is 1440 rpm, and angular units
  (``rad/s``, ``rpm``, ``deg/s``) through pint's angle conversion.
* temperature: offset units (``degC``, ``degF``, ``K``) are converted as absolute
  temperatures, never as differences.
"""

from __future__ import annotations

import math
import re

from shaftsys import units as U

#: dimension name -> (internal unit, pint dimensionality string or None)
DEFAULT_UNITS: dict[str, str] = {
    "length": U.LENGTH,
    "force": U.FORCE,
    "moment": U.MOMENT,
    "stress": U.STRESS,
    "speed": U.SPEED,
    "power": U.POWER,
    "time": U.TIME,
    "viscosity": "mm**2/s",
    "temperature": U.TEMPERATURE,
    "angle": "degree",
    "mass": U.MASS,
    "density": "kg/m**3",
    "acceleration": "m/s**2",
    "inertia": "kg*m**2",
    "linear_stiffness": "N/mm",
    "angular_stiffness": "N*mm/radian",
    "unbalance": "g*mm",
    "dimensionless": "",
    "area": "m**2",
    "heat_transfer_coefficient": "W/(m**2*K)",
    "thermal_resistance": "K/W",
    "volume_flow": "l/min",
    "temperature_difference": "K",
    "specific_heat": "J/(kg*K)",
}

_NUMBER = re.compile(r"^\s*[-+]?(\d+(?:\.\d*)?|\.\d+)([eE][-+]?\d+)?\s*$")
#: A leading number, then the unit text.
_LEADING_NUMBER = re.compile(r"\s*([-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?)")
#: Tokens of a unit expression: a unit name, a small integer exponent, an operator,
#: brackets, blanks, or the ``1`` of ``1/s``.
_UNIT_TOKEN = re.compile(
    r"(?P<name>[A-Za-z_\u00b5\u03bc\u00b0\u2126\u03a9][A-Za-z0-9_\u00b5\u03bc\u00b0\u2126\u03a9]*)"
    r"|(?P<exp>(?:\^|\*\*)\s*\(?[-+]?\d{1,2}\)?)"
    r"|(?P<op>[*/\u00b7\u22c5])|(?P<open>\()|(?P<close>\))|(?P<one>1(?![0-9.eE]))|(?P<blank>\s+)")
#: Longest text of a quantity (number and unit) [characters]; units are short words.
MAX_QUANTITY_TEXT = 100
#: Longest unit expression [characters].
MAX_UNIT_TEXT = 40
#: Longest excerpt of a value quoted in a message [characters].
EXCERPT_CHARS = 40


def excerpt(value: object, limit: int = EXCERPT_CHARS) -> str:
    """``repr`` of a value, cut to ``limit`` characters (with its length) when longer,
    so that a message never echoes a huge value whole.
    """
    if isinstance(value, str) and len(value) > limit:
        return f"{value[:limit]!r}... ({len(value)} characters)"
    text = repr(value)
    if len(text) > limit + 2:
        return f"{text[:limit]}... ({len(text)} characters)"
    return text


def split_quantity(text: str) -> tuple[float | None, str]:
    """``"45 mm"`` -> ``(45.0, "mm")``; ``"1/s"`` -> ``(None, "1/s")``.

    The number is read by ``float``; the unit must be a product and quotient of unit
    names with small integer exponents (at most two digits) and brackets, at most
    :data:`MAX_UNIT_TEXT` characters. Nothing is evaluated as arithmetic, so the work is
    bounded whatever the text.

    Raises
    ------
    QuantityProblem: the text is not a number followed by a unit of that form.
    """
    m = _LEADING_NUMBER.match(text)
    number = float(m.group(1)) if m else None
    unit = text[m.end():].strip() if m else text.strip()
    if number is not None and unit.startswith("/"):
        unit = "1" + unit
    expected = "a number and a unit such as '45 mm', '1450 rpm' or '68 mm^2/s'"
    if len(unit) > MAX_UNIT_TEXT:
        raise QuantityProblem(f"the unit of {excerpt(text)} is longer than "
                              f"{MAX_UNIT_TEXT} characters", expected)
    pos = 0
    depth = 0
    previous = ""
    while pos < len(unit):
        tok = _UNIT_TOKEN.match(unit, pos)
        if tok is None or (tok.lastgroup == "exp" and previous not in ("name", "close")):
            raise QuantityProblem(f"cannot read {excerpt(text)} as a number and a unit "
                                  "(arithmetic is not evaluated)", expected)
        kind = tok.lastgroup or ""
        depth += (kind == "open") - (kind == "close")
        if depth < 0 or depth > 3:
            raise QuantityProblem(f"unbalanced or deep brackets in {excerpt(text)}",
                                  expected)
        if kind != "blank":
            previous = kind
        pos = tok.end()
    if depth:
        raise QuantityProblem(f"unbalanced brackets in {excerpt(text)}", expected)
    return number, unit

_NUMBER_UNIT = re.compile(r"^\s*([-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?)\s*(\S.*?)\s*$")

#: Exact factors of the common units: (dimension, unit as written) -> internal units
#: per unit. A value written in one of them is read without pint (building pint's
#: registry costs some 0.4 s of start-up); every other unit, and every error message,
#: goes through pint, which stays the authority. A test checks each factor against
#: pint and that a value read here equals pint's reading. The catalogue reader uses the
#: same table (:mod:`shaftsys.io.catalogue`).
EXACT_FACTORS: dict[tuple[str, str], float] = {
    **{("length", u): f for u, f in (("mm", 1.0), ("cm", 10.0), ("m", 1000.0),
                                      ("in", 25.4))},
    **{("force", u): f for u, f in (("N", 1.0), ("kN", 1000.0), ("MN", 1e6),
                                     ("daN", 10.0))},
    **{("moment", u): f for u, f in (("N*mm", 1.0), ("N*m", 1000.0), ("kN*m", 1e6))},
    **{("stress", u): f for u, f in (("MPa", 1.0), ("GPa", 1000.0), ("N/mm^2", 1.0),
                                      ("N/mm**2", 1.0))},
    **{("speed", u): f for u, f in (("rpm", 1.0), ("1/min", 1.0),
                                     ("Hz", 60.0))},
    **{("power", u): f for u, f in (("W", 1.0), ("kW", 1000.0), ("MW", 1e6))},
    ("time", "h"): 1.0,
    ("time", "min"): 1.0 / 60.0,
    ("time", "s"): 1.0 / 3600.0,
    **{("viscosity", u): 1.0 for u in ("mm^2/s", "mm**2/s", "cSt")},
    ("temperature", "degC"): 1.0,
    **{("angle", u): 1.0 for u in ("deg", "degree")},
    **{("mass", u): f for u, f in (("kg", 1.0), ("g", 1e-3), ("t", 1000.0))},
    **{("density", u): 1.0 for u in ("kg/m^3", "kg/m**3")},
    **{("acceleration", u): 1.0 for u in ("m/s^2", "m/s**2")},
    **{("inertia", u): 1.0 for u in ("kg*m^2", "kg*m**2")},
    **{("linear_stiffness", u): f for u, f in (("N/mm", 1.0), ("kN/mm", 1000.0))},
    **{("angular_stiffness", u): f for u, f in (("N*mm/rad", 1.0), ("N*m/rad", 1000.0))},
    ("unbalance", "g*mm"): 1.0,
    ("dimensionless", "1"): 1.0,
    ("dimensionless", "%"): 0.01,
    ("length", "um"): 1e-3,
    ("stress", "kPa"): 1e-3,
    ("area", "m^2"): 1.0,
    ("heat_transfer_coefficient", "W/(m^2*K)"): 1.0,
    ("thermal_resistance", "K/W"): 1.0,
    ("volume_flow", "l/min"): 1.0,
    ("temperature_difference", "K"): 1.0,
    ("specific_heat", "J/(kg*K)"): 1.0,
}


class QuantityProblem(Exception):
    """Why a value could not be read as a quantity (the loader adds file and line)."""

    def __init__(self, message: str, expected: str) -> None:
        super().__init__(message)
        self.message = message
        self.expected = expected


#: Magnitudes a model value may have in internal units (0 is always allowed): beyond
#: them products such as E*I, F*x or (C/P)^p leave the range of floating point.
MAX_MAGNITUDE = 1e15
MIN_MAGNITUDE = 1e-15


def to_internal(value: object, dimension: str) -> float:
    """Convert ``value`` to a float in the internal unit of ``dimension``.

    Parameters
    ----------
    value: a number (default unit) or a string ``"<number> <unit>"``.
    dimension: a key of :data:`DEFAULT_UNITS`.

    Returns
    -------
    The value in the internal unit, 0 or of magnitude within
    [:data:`MIN_MAGNITUDE`, :data:`MAX_MAGNITUDE`].

    Raises
    ------
    QuantityProblem: the value is not a finite quantity of that dimension, or its
        magnitude is outside the range above.
    """
    number = _to_internal(value, dimension)
    if number != 0.0 and not MIN_MAGNITUDE <= abs(number) <= MAX_MAGNITUDE:
        unit = DEFAULT_UNITS[dimension] or "(no unit)"
        raise QuantityProblem(
            f"{excerpt(value)} is {number:.3g} {unit}, outside the range shaftsys computes with",
            f"0 or a magnitude from {MIN_MAGNITUDE:g} to {MAX_MAGNITUDE:g} {unit}")
    return number


def _to_internal(value: object, dimension: str) -> float:
    expected = f"a {dimension.replace('_', ' ')} such as '{_example(dimension)}'"
    if isinstance(value, bool) or value is None:
        raise QuantityProblem(f"{excerpt(value)} is not a {dimension}", expected)
    if isinstance(value, int) and abs(value) > 10**300:
        raise QuantityProblem(f"a whole number of about {value.bit_length() * 0.30103:.0f} "
                              "digits is not a finite number", expected)
    if isinstance(value, int | float):
        number = float(value)
        if not math.isfinite(number):
            raise QuantityProblem(f"{excerpt(value)} is not a finite number", expected)
        return number
    if not isinstance(value, str):
        raise QuantityProblem(f"{type(value).__name__} given, not a {dimension}", expected)
    if len(value) > MAX_QUANTITY_TEXT:
        raise QuantityProblem(f"a text of {len(value)} characters is not a {dimension} "
                              f"({excerpt(value)})", expected + f", at most "
                              f"{MAX_QUANTITY_TEXT} characters")
    text = value.strip()
    if _NUMBER.match(text):
        return _to_internal(float(text), dimension)
    if text.lower().split(" ")[0].lstrip("+-") in {"nan", "inf", "infinity"}:
        raise QuantityProblem(f"{excerpt(value)} is not a finite number", expected)
    match = _NUMBER_UNIT.match(text)
    factor = EXACT_FACTORS.get((dimension, match.group(2))) if match else None
    if match and factor is not None:
        number = float(match.group(1))
        if not math.isfinite(number):
            raise QuantityProblem(f"{excerpt(value)} is not a finite number", expected)
        return number * factor
    return _pint_to_internal(value, text, dimension, expected)


def _pint_to_internal(value: object, text: str, dimension: str, expected: str) -> float:
    """``text`` (a number with a unit) read by pint, in the internal unit of ``dimension``."""
    unit = DEFAULT_UNITS[dimension]
    text = text.replace("%", " percent")
    try:
        given, unit_text = split_quantity(text)
    except QuantityProblem as exc:
        raise QuantityProblem(exc.message, expected) from None
    ureg = U.registry()
    try:
        # the unit alone is parsed (a bounded expression); the number is a float
        q = ureg.Quantity(1.0 if given is None else given, unit_text or "dimensionless")
    except Exception:  # pint raises many types for unparsable text
        raise QuantityProblem(f"cannot read {excerpt(value)} as a quantity",
                              expected) from None
    if not hasattr(q, "magnitude") or not isinstance(q.magnitude, int | float):
        raise QuantityProblem(f"cannot read {excerpt(value)} as a quantity", expected)
    try:
        finite = math.isfinite(float(q.magnitude))
    except OverflowError:  # an integer too large for a float
        finite = False
    if not finite:
        raise QuantityProblem(f"{excerpt(value)} is not a finite number", expected)
    try:
        if dimension == "speed":
            return _speed_rpm(q)
        if dimension == "dimensionless":
            return float(q.to("dimensionless").magnitude)
        return float(q.to(unit).magnitude)
    except Exception:
        raise QuantityProblem(
            f"{excerpt(value)} has units of {q.units:~} which are not a {dimension}", expected
        ) from None


def _speed_rpm(q: object) -> float:
    ureg = U.registry()
    quantity = ureg.Quantity(q)
    names = {str(u) for u in quantity.units._units}
    angular = {"revolution", "radian", "degree", "turn", "revolutions_per_minute", "cycle"}
    if names & angular or "rpm" in str(quantity.units):
        return float(quantity.to("revolution/minute").magnitude)
    # a pure frequency: revolutions per unit time
    return float(quantity.to("1/minute").magnitude)


def _example(dimension: str) -> str:
    return {
        "length": "45 mm",
        "force": "12 kN",
        "moment": "150 N*m",
        "stress": "210 GPa",
        "speed": "1450 rpm",
        "power": "7.5 kW",
        "time": "20000 h",
        "viscosity": "68 mm^2/s",
        "temperature": "70 degC",
        "angle": "20 deg",
        "mass": "12 kg",
        "density": "7850 kg/m^3",
        "acceleration": "9.81 m/s^2",
        "inertia": "0.4 kg*m^2",
        "linear_stiffness": "200 kN/mm",
        "angular_stiffness": "5e6 N*mm/rad",
        "unbalance": "500 g*mm",
        "dimensionless": "0.3",
        "area": "0.6 m^2",
        "heat_transfer_coefficient": "15 W/(m^2*K)",
        "thermal_resistance": "0.2 K/W",
        "volume_flow": "2 l/min",
        "temperature_difference": "50 K",
        "specific_heat": "1950 J/(kg*K)",
    }[dimension]
