"""Stress concentration factors Kt, notch sensitivity q and fatigue notch factors Kf.

Sources (all recalled, not re-read: marked "from memory" where a number is recalled):
- Shigley, Mechanical Engineering Design, 9th ed.: Table 7-1 (first-iteration Kt),
  Example 7-1 (chart readings of Figs. A-15-8/A-15-9, q from Fig. 6-20), eqs. 6-32 to
  6-35 (Neuber / Kuhn-Hardrath).
- Norton, Machine Design: An Integrated Approach, App. C, Figs. C-1..C-3 (power-law fits).
"""

from __future__ import annotations

import itertools
import logging
import math

import pytest

from shaftsys.checks import (
    Feature,
    LoadMode,
    fatigue_notch_factor,
    feature_kt,
    notch_factors,
    notch_sensitivity,
    shoulder_fillet_kt,
)
from shaftsys.errors import ModelError

KPSI = 6.894757293168361  # MPa per kpsi
INCH = 25.4


# --------------------------------------------------------------------------------------
# Shoulder fillet Kt against published chart readings
# --------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("mode", "expected"),
    [
        # Shigley 9th ed. Example 7-1 (from memory): D/d = 1.65/1.100 = 1.5,
        # r/d = 0.11/1.100 = 0.1, read from Fig. A-15-9 (bending) Kt = 1.68 and
        # Fig. A-15-8 (torsion) Kts = 1.42. Tolerance 3 % (chart read by eye).
        (LoadMode.BENDING, 1.68),
        (LoadMode.TORSION, 1.42),
    ],
)
def test_shoulder_kt_shigley_example_7_1(mode: LoadMode, expected: float) -> None:
    assert shoulder_fillet_kt(1.5, 0.1, mode) == pytest.approx(expected, rel=0.03)


@pytest.mark.parametrize(
    ("r_over_d", "mode", "expected", "rel"),
    [
        # Shigley 9th ed. Table 7-1 first-iteration estimates (from memory), taken here
        # for D/d = 1.5 (an assumption: the table is for typical shoulders).
        # Well-rounded fillet r/d = 0.1: 1.7 bending, 1.5 torsion, 1.9 axial: 3 %.
        (0.1, LoadMode.BENDING, 1.7, 0.03),
        (0.1, LoadMode.TORSION, 1.5, 0.03),
        (0.1, LoadMode.AXIAL, 1.9, 0.03),
        # Sharp fillet r/d = 0.02: 2.7 bending, 2.2 torsion, 3.0 axial. The charts are
        # steep at r/d = 0.02 and the table rounds to 2 digits: 6 % for bending/torsion.
        (0.02, LoadMode.BENDING, 2.7, 0.06),
        (0.02, LoadMode.TORSION, 2.2, 0.06),
        (0.02, LoadMode.AXIAL, 3.0, 0.03),
    ],
)
def test_shoulder_kt_shigley_table_7_1(
    r_over_d: float, mode: LoadMode, expected: float, rel: float
) -> None:
    assert shoulder_fillet_kt(1.5, r_over_d, mode) == pytest.approx(expected, rel=rel)


@pytest.mark.parametrize(
    ("D_over_d", "r_over_d", "mode", "A", "b"),
    [
        # Norton App. C (from memory): at a tabulated D/d row the result is A*(r/d)^b.
        (1.5, 0.05, LoadMode.BENDING, 0.93836, -0.25759),
        (3.0, 0.15, LoadMode.BENDING, 0.89334, -0.30860),
        (1.33, 0.05, LoadMode.TORSION, 0.84897, -0.23161),
        (2.0, 0.2, LoadMode.TORSION, 0.86331, -0.23865),
        (1.2, 0.03, LoadMode.AXIAL, 0.96272, -0.25527),
    ],
)
def test_shoulder_kt_equals_fit_at_rows(
    D_over_d: float, r_over_d: float, mode: LoadMode, A: float, b: float
) -> None:
    assert shoulder_fillet_kt(D_over_d, r_over_d, mode) == pytest.approx(A * r_over_d**b, rel=1e-9)


def test_shoulder_kt_interpolates_linearly_between_rows() -> None:
    # Linear in D/d between Norton rows 1.5 and 2.0 (bending, r/d = 0.05).
    k15 = 0.93836 * 0.05**-0.25759
    k20 = 0.90879 * 0.05**-0.28598
    assert shoulder_fillet_kt(1.6, 0.05, "bending") == pytest.approx(
        k15 + 0.2 * (k20 - k15), rel=1e-9
    )


@pytest.mark.parametrize("mode", list(LoadMode))
def test_shoulder_kt_trends_of_peterson_charts(mode: LoadMode) -> None:
    """Peterson's charts: Kt falls as r/d grows and rises with D/d (qualitative)."""
    rds = [0.01, 0.02, 0.05, 0.1, 0.2, 0.3]
    Dds = [1.02, 1.05, 1.1, 1.2, 1.33, 1.5, 2.0]
    for Dd in Dds:
        kts = [shoulder_fillet_kt(Dd, rd, mode) for rd in rds]
        assert all(a > b for a, b in itertools.pairwise(kts))
    for rd in rds:
        kts = [shoulder_fillet_kt(Dd, rd, mode) for Dd in Dds]
        assert all(a <= b + 1e-12 for a, b in itertools.pairwise(kts))


def test_shoulder_kt_range_handling(caplog: pytest.LogCaptureFixture) -> None:
    with pytest.raises(ModelError):
        shoulder_fillet_kt(1.0, 0.1, "bending")
    with pytest.raises(ModelError):
        shoulder_fillet_kt(1.5, 0.0, "bending")
    with pytest.raises(ValueError, match="unknown load mode"):
        shoulder_fillet_kt(1.5, 0.1, "shear")
    with caplog.at_level(logging.WARNING):
        # r/d above 0.3 is clamped to 0.3 (conservative)
        assert shoulder_fillet_kt(1.5, 0.5, "bending") == pytest.approx(
            0.93836 * 0.3**-0.25759, rel=1e-9
        )
        # D/d above the torsion table (2.0) uses the 2.0 row
        assert shoulder_fillet_kt(3.0, 0.1, "torsion") == pytest.approx(
            0.86331 * 0.1**-0.23865, rel=1e-9
        )
        # D/d below the torsion table (1.09) uses the 1.09 row (conservative)
        assert shoulder_fillet_kt(1.05, 0.1, "torsion") == pytest.approx(
            0.90337 * 0.1**-0.12692, rel=1e-9
        )
    assert len([r for r in caplog.records if r.levelno == logging.WARNING]) == 3


# --------------------------------------------------------------------------------------
# Other features
# --------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("feature", "mode", "expected"),
    [
        # Shigley 9th ed. Table 7-1 (from memory)
        (Feature.KEYSEAT_END_MILL, LoadMode.BENDING, 2.14),
        (Feature.KEYSEAT_END_MILL, LoadMode.TORSION, 3.0),
        (Feature.KEYSEAT_SLED_RUNNER, LoadMode.BENDING, 1.7),
        (Feature.RETAINING_RING_GROOVE, LoadMode.BENDING, 5.0),
        (Feature.RETAINING_RING_GROOVE, LoadMode.TORSION, 3.0),
        (Feature.RETAINING_RING_GROOVE, LoadMode.AXIAL, 5.0),
        # common practice, no source
        (Feature.PRESS_FIT, LoadMode.BENDING, 2.0),
        (Feature.PLAIN, LoadMode.TORSION, 1.0),
    ],
)
def test_feature_kt_table(feature: Feature, mode: LoadMode, expected: float) -> None:
    assert feature_kt(feature, mode) == expected


def test_feature_kt_rejects_shoulder_and_unknown() -> None:
    with pytest.raises(ValueError, match="shoulder_fillet_kt"):
        feature_kt("shoulder", "bending")
    with pytest.raises(ValueError, match="unknown shaft feature"):
        feature_kt("spline", "bending")


# --------------------------------------------------------------------------------------
# Notch sensitivity and Kf
# --------------------------------------------------------------------------------------


def test_q_bending_shigley_example_7_1() -> None:
    """Shigley 9th ed. Example 7-1 (from memory): Sut = 105 kpsi, r = 0.11 in, q = 0.85
    (read from Fig. 6-20, printed to 2 decimals)."""
    q = notch_sensitivity(0.11 * INCH, 105.0 * KPSI, "bending")
    assert q == pytest.approx(0.85, abs=0.006)


@pytest.mark.parametrize("sut_kpsi", [60.0, 105.0, 180.0])
@pytest.mark.parametrize("r_in", [0.02, 0.11])
def test_q_closed_form_in_inch_units(sut_kpsi: float, r_in: float) -> None:
    """Shigley 9th ed. eqs. 6-34, 6-35a/b written in their own units (kpsi, in)."""
    s = sut_kpsi
    sa_b = 0.246 - 3.08e-3 * s + 1.51e-5 * s**2 - 2.67e-8 * s**3
    sa_t = 0.190 - 2.51e-3 * s + 1.35e-5 * s**2 - 2.67e-8 * s**3
    q_b = 1.0 / (1.0 + sa_b / math.sqrt(r_in))
    q_t = 1.0 / (1.0 + sa_t / math.sqrt(r_in))
    assert notch_sensitivity(r_in * INCH, s * KPSI, "bending") == pytest.approx(q_b, rel=1e-9)
    assert notch_sensitivity(r_in * INCH, s * KPSI, "axial") == pytest.approx(q_b, rel=1e-9)
    assert notch_sensitivity(r_in * INCH, s * KPSI, "torsion") == pytest.approx(q_t, rel=1e-9)


@pytest.mark.parametrize("sut_kpsi", [60.0, 100.0, 150.0, 200.0])
def test_q_torsion_is_bending_at_sut_plus_20_kpsi(sut_kpsi: float) -> None:
    """Shigley 8th ed. (Table 6-15 note, from memory): for torsion use the bending
    Neuber constant at Sut + 20 kpsi. Agreement with eq. 6-35b to 0.01 in q."""
    r = 1.0  # mm
    qt = notch_sensitivity(r, sut_kpsi * KPSI, "torsion")
    qb20 = notch_sensitivity(r, (sut_kpsi + 20.0) * KPSI, "bending")
    assert qt == pytest.approx(qb20, abs=0.01)


def test_q_clamps_sut_outside_fit(caplog: pytest.LogCaptureFixture) -> None:
    with caplog.at_level(logging.WARNING):
        low = notch_sensitivity(1.0, 200.0, "bending")
    assert low == pytest.approx(notch_sensitivity(1.0, 50.0 * KPSI, "bending"), rel=1e-9)
    assert any("clamped" in r.message for r in caplog.records)
    with pytest.raises(ModelError):
        notch_sensitivity(0.0, 600.0, "bending")


def test_kf_shigley_example_7_1() -> None:
    """Shigley 9th ed. Example 7-1 (from memory): Kf = 1 + 0.85 (1.68 - 1) = 1.58."""
    assert fatigue_notch_factor(1.68, 0.85) == pytest.approx(1.58, abs=0.005)
    with pytest.raises(ModelError):
        fatigue_notch_factor(0.9, 0.5)


def test_notch_factors_shoulder_chain() -> None:
    """Example 7-1 geometry (Shigley 9th ed., from memory): Kf within 3 % of 1.58."""
    nf = notch_factors(
        "shoulder", 105.0 * KPSI, d_mm=1.100 * INCH, D_mm=1.65 * INCH, r_mm=0.11 * INCH
    )
    assert nf.Kf == pytest.approx(1.58, rel=0.03)
    assert nf.Kf == pytest.approx(1.0 + nf.q * (nf.Kt - 1.0), rel=1e-12)
    assert nf.Kfs == pytest.approx(1.0 + nf.qs * (nf.Kts - 1.0), rel=1e-12)
    assert nf.D_over_d == pytest.approx(1.5)
    with pytest.raises(ModelError):
        notch_factors("shoulder", 700.0, d_mm=30.0)


def test_notch_factors_other_features() -> None:
    # keyseat: q at r = 0.02 d (the r/d of Shigley's Table 7-1 estimate)
    nf = notch_factors("keyseat_end_mill", 700.0, d_mm=50.0)
    assert nf.r_mm == pytest.approx(1.0)
    assert nf.q == pytest.approx(notch_sensitivity(1.0, 700.0, "bending"))
    assert nf.Kfs == pytest.approx(1.0 + nf.qs * 2.0)
    # retaining-ring groove without a root radius: q = 1, Kf = Kt (conservative)
    ring = notch_factors("retaining_ring_groove", 700.0, d_mm=50.0)
    assert (ring.Kf, ring.Kfs, ring.Kf_axial) == (5.0, 3.0, 5.0)
    # press fit: Kf applied directly (common practice, no source)
    pf = notch_factors("press_fit", 700.0, d_mm=50.0, r_mm=2.0)
    assert (pf.Kf, pf.Kfs) == (2.0, 1.5)
    plain = notch_factors("plain", 700.0, d_mm=50.0)
    assert (plain.Kf, plain.Kfs, plain.Kf_axial) == (1.0, 1.0, 1.0)


def test_notch_sensitivity_is_full_where_the_neuber_fit_runs_out():
    """q lies in (0, 1] by definition (Shigley, notch sensitivity): where the Kuhn-Hardrath
    torsion fit for sqrt(a) reaches zero (Sut above about 1650 MPa) q = 1 is taken."""
    from shaftsys.checks.stress_concentration import notch_sensitivity

    assert notch_sensitivity(1.0, 1700.0, "torsion") == 1.0
    assert 0.0 < notch_sensitivity(1.0, 600.0, "torsion") < 1.0
