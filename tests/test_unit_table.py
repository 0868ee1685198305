"""The exact-factor unit table read without pint must agree with pint itself.

Source: the factors are the definitions of the SI prefixes and of the inch
(SI Brochure, 9th ed., Tables 7 and 8; NIST SP 811, B.8: 1 in = 25.4 mm exactly), held
here against pint's own conversion (pint is the authority for every unit).
"""

from __future__ import annotations

import math

import pytest

from shaftsys import units as U
from shaftsys.io import quantities as Q
from shaftsys.io.catalogue import _COMMON_FACTORS


def _pint_factor(dim: str, unit: str) -> float:
    """One ``unit`` in the internal unit of ``dim``, converted by pint alone."""
    return Q._pint_to_internal(f"1 {unit}", f"1 {unit}", dim, "")


def test_every_factor_is_pints() -> None:
    for (dim, unit), factor in Q.EXACT_FACTORS.items():
        assert factor == pytest.approx(_pint_factor(dim, unit), rel=1e-15), (dim, unit)


@pytest.mark.parametrize("number", ["45", "0.1", "1e-3", "-7.25", "123456.789", "3e7"])
def test_values_read_without_pint_equal_pints_reading(number: str) -> None:
    """A value in a table unit reads as pint reads it (to the last bit or one ulp)."""
    for (dim, unit) in Q.EXACT_FACTORS:
        text = f"{number} {unit}"
        fast = Q.to_internal(text, dim)
        slow = Q._pint_to_internal(text, text, dim, "")
        assert abs(fast - slow) <= 2 * math.ulp(slow), (text, fast, slow)


def test_table_units_do_not_build_the_registry() -> None:
    """Reading table units never asks pint (the start-up saving the table is for)."""
    U.registry.cache_clear()
    before = U.registry.cache_info().misses
    assert Q.to_internal("12 kN", "force") == 12000.0
    assert Q.to_internal("45mm", "length") == 45.0
    assert Q.to_internal("2.5 GPa", "stress") == 2500.0
    assert U.registry.cache_info().misses == before


def test_other_units_and_errors_still_go_through_pint() -> None:
    """1 lbf = 4.4482216152605 N (NIST SP 811, B.8); a wrong dimension names the unit."""
    assert Q.to_internal("1 lbf", "force") == pytest.approx(4.4482216152605, rel=1e-14)
    with pytest.raises(Q.QuantityProblem, match="not a length"):
        Q.to_internal("45 kg", "length")
    with pytest.raises(Q.QuantityProblem, match="not a finite number"):
        Q.to_internal("1e400 mm", "length")


def test_catalogue_uses_the_same_table() -> None:
    assert _COMMON_FACTORS is Q.EXACT_FACTORS
