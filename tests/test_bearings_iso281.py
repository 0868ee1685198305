"""ISO 281:2007 equivalent dynamic load (Table 3 / Table 4) and ISO 76:2006 static load.

Table values below were typed from memory of ISO 281:2007 Table 3 and ISO 76:2006
(source named beside each check). Tolerances: the table's printed rounding for table
values (they are used exactly, so 1e-12), 1e-6 relative for formula values.
"""

from __future__ import annotations

import numpy as np
import pytest

from shaftsys.bearings import (
    angular_contact_factors,
    deep_groove_factors,
    default_s0_min,
    equivalent_dynamic_load,
    equivalent_static_load,
    estimate_f0,
    operating_warnings,
    static_check,
)
from shaftsys.errors import ModelError
from shaftsys.model.bearing import Bearing, BearingKind, SetArrangement

REL = 1e-6


def brg(kind: BearingKind, **kw: object) -> Bearing:
    base: dict[str, object] = {
        "id": "B1",
        "kind": kind,
        "x_mm": 0.0,
        "d_mm": 40.0,
        "D_mm": 80.0,
        "C_N": 30000.0,
        "C0_N": 20000.0,
    }
    base.update(kw)
    return Bearing(**base)  # type: ignore[arg-type]


# --- deep groove ball, ISO 281:2007 Table 3 (from memory) -----------------------------
DG_TABLE = [
    # f0*Fa/C0r, e, Y (X = 0.56)
    (0.172, 0.19, 2.30),
    (0.345, 0.22, 1.99),
    (0.689, 0.26, 1.71),
    (1.03, 0.28, 1.55),
    (1.38, 0.30, 1.45),
    (2.07, 0.34, 1.31),
    (3.45, 0.38, 1.15),
    (5.17, 0.42, 1.04),
    (6.89, 0.44, 1.00),
]


@pytest.mark.parametrize(("rel", "e", "y"), DG_TABLE)
def test_deep_groove_table_points(rel: float, e: float, y: float) -> None:
    """ISO 281:2007 Table 3, deep groove ball bearings: e and Y at the table points."""
    e_c, y_c = deep_groove_factors([rel])
    assert e_c[0] == pytest.approx(e, abs=1e-12)
    assert y_c[0] == pytest.approx(y, abs=1e-12)


def test_deep_groove_interpolated_point() -> None:
    """ISO 281:2007 Table 3 note: linear interpolation.

    Midway between 0.345 and 0.689 (0.517): e = (0.22 + 0.26)/2 = 0.24,
    Y = (1.99 + 1.71)/2 = 1.85.
    """
    e_c, y_c = deep_groove_factors([0.517])
    assert e_c[0] == pytest.approx(0.24, rel=REL)
    assert y_c[0] == pytest.approx(1.85, rel=REL)


def test_deep_groove_equivalent_load_switch() -> None:
    """ISO 281:2007 6.2 with Table 3: f0 = 13, C0 = 13000 N, Fa = 1030 N -> f0*Fa/C0 = 1.03.

    Fa/Fr = 1030/1000 > e = 0.28: P = 0.56*1000 + 1.55*1030 = 2156.5 N.
    Fa/Fr = 1030/4000 = 0.2575 <= 0.28: P = Fr = 4000 N.
    """
    b = brg(BearingKind.DEEP_GROOVE_BALL, C0_N=13000.0, f0=13.0)
    eq = equivalent_dynamic_load(b, [1000.0, 4000.0], [1030.0, -1030.0])
    assert eq.e == pytest.approx([0.28, 0.28], rel=REL)
    assert pytest.approx([2156.5, 4000.0], rel=REL) == eq.P_N
    assert pytest.approx([0.56, 1.0]) == eq.X and pytest.approx([1.55, 0.0]) == eq.Y
    assert not eq.f0_estimated


def test_deep_groove_f0_estimate_flagged() -> None:
    """f0 estimate (common practice): Dw = 0.3*(52-25) = 8.1, Dpw = 38.5, gamma = 0.2103896.

    ISO 76:2006 f0 table (from memory): 13.7 at 0.21, 13.5 at 0.22 ->
    f0 = 13.7 - 0.3896104*0.2 = 13.6922078.
    """
    assert estimate_f0(25.0, 52.0) == pytest.approx(13.6922078, rel=REL)
    b = brg(BearingKind.DEEP_GROOVE_BALL, d_mm=25.0, D_mm=52.0, C0_N=7800.0)
    eq = equivalent_dynamic_load(b, [1000.0], [500.0])
    assert eq.f0_estimated
    assert eq.f0 == pytest.approx(13.6922078, rel=REL)
    assert any("estimated f0" in w for w in eq.warnings)


# --- angular contact ball, ISO 281:2007 Table 3 (from memory) ---------------------------
def test_angular_15deg_table_point_single_and_pair() -> None:
    """ISO 281:2007 Table 3, alpha = 15 deg, f0*i*Fa/C0r = 1.07.

    e = 0.46; single row Fa/Fr > e: X = 0.44, Y = 1.23; double row Fa/Fr <= e: X = 1,
    Y = 1.38; Fa/Fr > e: X = 0.72, Y = 2.00.
    """
    e, xl, yl, xh, yh = angular_contact_factors(15.0, [1.07], double_row=False)
    assert (e[0], xl[0], yl[0], xh[0], yh[0]) == pytest.approx((0.46, 1.0, 0.0, 0.44, 1.23))
    e, xl, yl, xh, yh = angular_contact_factors(15.0, [1.07], double_row=True)
    assert (e[0], xl[0], yl[0], xh[0], yh[0]) == pytest.approx((0.46, 1.0, 1.38, 0.72, 2.00))


def test_angular_15deg_interpolated() -> None:
    """ISO 281:2007 Table 3, 15 deg, midway 0.357..0.714 (0.5355).

    e = (0.40 + 0.43)/2 = 0.415, single Y = (1.40 + 1.30)/2 = 1.35.
    """
    e, _, _, _, yh = angular_contact_factors(15.0, [0.5355], double_row=False)
    assert e[0] == pytest.approx(0.415, rel=REL)
    assert yh[0] == pytest.approx(1.35, rel=REL)


def test_angular_15deg_uses_f0_i_Fa_over_C0() -> None:
    """15 deg pair (i = 2): f0 = 16, C0 = 32000 N (pair), Fa = 1070 N.

    f0*i*Fa/C0 = 16*2*1070/32000 = 1.07 -> e = 0.46; Fa/Fr = 1070/1000 > e:
    P = 0.72*1000 + 2.00*1070 = 2860 N (ISO 281:2007 Table 3, double row).
    """
    b = brg(
        BearingKind.ANGULAR_CONTACT_BALL,
        contact_angle_deg=15.0,
        f0=16.0,
        C0_N=32000.0,
        rows=2,
        arrangement=SetArrangement.BACK_TO_BACK,
    )
    eq = equivalent_dynamic_load(b, [1000.0], [1070.0])
    assert eq.e[0] == pytest.approx(0.46, rel=REL)
    assert eq.P_N[0] == pytest.approx(2860.0, rel=REL)


@pytest.mark.parametrize(
    ("alpha", "e", "xs", "ys", "y1", "x2", "y2"),
    [
        (20.0, 0.57, 0.43, 1.00, 1.09, 0.70, 1.63),
        (25.0, 0.68, 0.41, 0.87, 0.92, 0.67, 1.41),
        (30.0, 0.80, 0.39, 0.76, 0.78, 0.63, 1.24),
        (35.0, 0.95, 0.37, 0.66, 0.66, 0.60, 1.07),
        (40.0, 1.14, 0.35, 0.57, 0.55, 0.57, 0.93),
        (45.0, 1.34, 0.33, 0.50, 0.47, 0.54, 0.81),
    ],
)
def test_angular_fixed_rows(
    alpha: float, e: float, xs: float, ys: float, y1: float, x2: float, y2: float
) -> None:
    """ISO 281:2007 Table 3 angular contact rows 20..45 deg (from memory)."""
    single = brg(BearingKind.ANGULAR_CONTACT_BALL, contact_angle_deg=alpha)
    pair = brg(
        BearingKind.ANGULAR_CONTACT_BALL,
        contact_angle_deg=alpha,
        rows=2,
        arrangement=SetArrangement.FACE_TO_FACE,
    )
    Fr = np.array([1000.0, 1000.0])
    Fa = np.array([0.5 * e * 1000.0, 2.0 * e * 1000.0])  # below and above e
    s = equivalent_dynamic_load(single, Fr, Fa)
    assert pytest.approx([1000.0, xs * 1000.0 + ys * Fa[1]], rel=REL) == s.P_N
    d = equivalent_dynamic_load(pair, Fr, Fa)
    assert pytest.approx([1000.0 + y1 * Fa[0], x2 * 1000.0 + y2 * Fa[1]], rel=REL) == d.P_N


def test_angular_interpolated_angle() -> None:
    """ISO 281:2007 Table 3 note: contact angle 27.5 deg, midway 25..30 deg.

    e = (0.68 + 0.80)/2 = 0.74, X = (0.41 + 0.39)/2 = 0.40, Y = (0.87 + 0.76)/2 = 0.815.
    """
    e, _, _, xh, yh = angular_contact_factors(27.5, [0.0], double_row=False)
    assert (e[0], xh[0], yh[0]) == pytest.approx((0.74, 0.40, 0.815), rel=REL)


def test_angular_needs_contact_angle() -> None:
    b = brg(BearingKind.ANGULAR_CONTACT_BALL)
    with pytest.raises(ModelError, match=r"bearings\[B1\]\.contact_angle_deg"):
        equivalent_dynamic_load(b, [1.0], [1.0])


# --- tapered, spherical, self-aligning (ISO 281:2007 Table 4 / maker's factors) ------
def test_tapered_single_maker_factors() -> None:
    """ISO 281:2007 Table 4: single row tapered, Fa/Fr > e: X = 0.4, Y = maker's.

    e = 0.37, Y = 1.6: Fr = 1000, Fa = 1000 -> P = 400 + 1600 = 2000 N;
    Fa = 300 (0.3 <= e) -> P = Fr = 1000 N.
    """
    b = brg(BearingKind.TAPERED_ROLLER, e=0.37, Y=1.6)
    eq = equivalent_dynamic_load(b, [1000.0, 1000.0], [1000.0, 300.0])
    assert pytest.approx([2000.0, 1000.0], rel=REL) == eq.P_N
    assert pytest.approx([0.4, 1.0]) == eq.X


def test_tapered_pair_Y1_Y2() -> None:
    """ISO 281:2007 Table 4, double row / pair: Fa/Fr <= e: X=1, Y=Y1; else X=0.67, Y=Y2.

    e = 0.37, Y1 = 1.8, Y2 = 2.7: Fa = 300 -> P = 1000 + 540 = 1540 N;
    Fa = 1000 -> P = 670 + 2700 = 3370 N.
    """
    b = brg(
        BearingKind.TAPERED_ROLLER,
        e=0.37,
        Y1=1.8,
        Y2=2.7,
        rows=2,
        arrangement=SetArrangement.BACK_TO_BACK,
    )
    eq = equivalent_dynamic_load(b, [1000.0, 1000.0], [300.0, 1000.0])
    assert pytest.approx([1540.0, 3370.0], rel=REL) == eq.P_N


def test_tapered_factors_from_contact_angle() -> None:
    """ISO 281:2007 Table 4 formulas, alpha = 15 deg: e = 1.5*tan15 = 0.4019238,
    Y = 0.4*cot15 = 1.4928203 -> Fr = Fa = 1000: P = 400 + 1492.8203 = 1892.8203 N.
    """
    b = brg(BearingKind.TAPERED_ROLLER, contact_angle_deg=15.0)
    eq = equivalent_dynamic_load(b, [1000.0], [1000.0])
    assert eq.e[0] == pytest.approx(0.4019238, rel=REL)
    assert eq.P_N[0] == pytest.approx(1892.8203, rel=REL)
    assert any("contact angle" in w for w in eq.warnings)


def test_tapered_missing_Y_raises() -> None:
    """Missing maker's Y and no contact angle: ModelError naming bearing and field."""
    b = brg(BearingKind.TAPERED_ROLLER, id="T7", e=0.4)
    with pytest.raises(ModelError, match=r"bearings\[T7\]\.Y") as exc:
        equivalent_dynamic_load(b, [1000.0], [100.0])
    assert "T7" in str(exc.value)


def test_spherical_and_self_aligning() -> None:
    """Spherical roller (ISO 281:2007 Table 4): X = 0.67 above e; self-aligning ball
    (Table 3): X = 0.65 above e. e = 0.25, Y1 = 2.7, Y2 = 4.0, Fr = 1000:
    Fa = 200 -> P = 1000 + 540 = 1540; Fa = 500 -> spherical 670 + 2000 = 2670,
    self-aligning 650 + 2000 = 2650 N.
    """
    sph = brg(BearingKind.SPHERICAL_ROLLER, e=0.25, Y1=2.7, Y2=4.0)
    sab = brg(BearingKind.SELF_ALIGNING_BALL, e=0.25, Y1=2.7, Y2=4.0)
    assert (pytest.approx([1540.0, 2670.0], rel=REL)) == equivalent_dynamic_load(
        sph, [1000.0, 1000.0], [200.0, 500.0]
    ).P_N
    assert (pytest.approx([1540.0, 2650.0], rel=REL)) == equivalent_dynamic_load(
        sab, [1000.0, 1000.0], [200.0, 500.0]
    ).P_N


def test_spherical_missing_e_raises() -> None:
    b = brg(BearingKind.SPHERICAL_ROLLER, Y1=2.7, Y2=4.0)
    with pytest.raises(ModelError, match=r"bearings\[B1\]\.e"):
        equivalent_dynamic_load(b, [1000.0], [100.0])


# --- cylindrical, needle, thrust, override --------------------------------------------
def test_cylindrical_P_equals_Fr() -> None:
    """ISO 281:2007 7.2: radial roller bearings with alpha = 0 under radial load: P = Fr."""
    b = brg(BearingKind.CYLINDRICAL_ROLLER)
    eq = equivalent_dynamic_load(b, [1234.5, 0.0], [0.0, 0.0])
    assert pytest.approx([1234.5, 0.0], rel=REL) == eq.P_N


def test_needle_axial_load_raises() -> None:
    b = brg(BearingKind.NEEDLE_ROLLER, id="N2")
    with pytest.raises(ModelError, match=r"bearings\[N2\]\.axial") as exc:
        equivalent_dynamic_load(b, [1000.0, 1000.0], [0.0, 50.0], case_ids=("a", "b"))
    assert "N2" in str(exc.value) and "'b'" in str(exc.value)


def test_cylindrical_without_ribs_axial_raises_with_ribs_warns() -> None:
    """Ribbed: Fa/Fr = 0.5 > 0.4 (common practice, no source) -> warning, P = Fr."""
    plain = brg(BearingKind.CYLINDRICAL_ROLLER, id="C3")
    with pytest.raises(ModelError, match=r"bearings\[C3\]\.axial"):
        equivalent_dynamic_load(plain, [1000.0], [500.0])
    ribbed = brg(BearingKind.CYLINDRICAL_ROLLER, id="C3", ribs=True)
    eq = equivalent_dynamic_load(ribbed, [1000.0, 1000.0], [500.0, 300.0])
    assert pytest.approx([1000.0, 1000.0], rel=REL) == eq.P_N
    assert len(eq.warnings) == 1 and "0.5" in eq.warnings[0]


def test_thrust_ball() -> None:
    """ISO 281:2007 6.3: thrust ball bearing with alpha = 90 deg: P = Fa."""
    b = brg(BearingKind.THRUST_BALL, contact_angle_deg=90.0)
    assert pytest.approx([2500.0]) == equivalent_dynamic_load(b, [0.0], [-2500.0]).P_N
    with pytest.raises(ModelError, match=r"bearings\[B1\]\.kind"):
        equivalent_dynamic_load(b, [10.0], [2500.0])


def test_user_override_X_Y_e() -> None:
    """Override X = 0.5, Y = 1.2, e = 0.45: Fa/Fr = 0.4 -> P = Fr; 1.0 -> 500 + 1200."""
    b = brg(BearingKind.DEEP_GROOVE_BALL, X=0.5, Y=1.2, e=0.45)
    eq = equivalent_dynamic_load(b, [1000.0, 1000.0], [400.0, 1000.0])
    assert pytest.approx([1000.0, 1700.0], rel=REL) == eq.P_N


# --- ISO 76:2006 equivalent static load ----------------------------------------------
def test_static_deep_groove() -> None:
    """ISO 76:2006 6.2.1: X0 = 0.6, Y0 = 0.5, P0 >= Fr.

    Fr = 1000, Fa = 1000: 600 + 500 = 1100 N; Fa = 500: 850 < Fr -> 1000 N.
    """
    sl = equivalent_static_load(brg(BearingKind.DEEP_GROOVE_BALL), [1000.0, 1000.0], [1000, 500])
    assert pytest.approx([1100.0, 1000.0], rel=REL) == sl.P0_N


def test_static_angular_contact() -> None:
    """ISO 76:2006 6.2.1, angular contact 25 deg: single X0 = 0.5, Y0 = 0.38 (P0 >= Fr);
    40 deg pair X0 = 1, Y0 = 0.52.

    Single Fr = 1000, Fa = 2000: 500 + 760 = 1260 N. Pair Fr = Fa = 1000: 1520 N.
    """
    s = brg(BearingKind.ANGULAR_CONTACT_BALL, contact_angle_deg=25.0)
    assert pytest.approx([1260.0]) == equivalent_static_load(s, [1000.0], [2000.0]).P0_N
    p = brg(
        BearingKind.ANGULAR_CONTACT_BALL,
        contact_angle_deg=40.0,
        arrangement=SetArrangement.BACK_TO_BACK,
        rows=2,
    )
    assert pytest.approx([1520.0]) == equivalent_static_load(p, [1000.0], [1000.0]).P0_N


def test_static_roller_types() -> None:
    """ISO 76:2006 6.2.2 / 6.3: tapered single X0 = 0.5 with maker's Y0 = 0.9, P0 >= Fr;
    spherical X0 = 1 with Y0 = 2.8; cylindrical P0 = Fr; thrust ball P0 = Fa.

    Tapered Fr = 1000, Fa = 2000: 500 + 1800 = 2300; Fa = 100: 590 < Fr -> 1000.
    Spherical Fr = 1000, Fa = 100: 1000 + 280 = 1280.
    """
    t = brg(BearingKind.TAPERED_ROLLER, e=0.4, Y=1.5, Y0=0.9)
    assert (pytest.approx([2300.0, 1000.0])) == equivalent_static_load(
        t, [1000.0, 1000.0], [2000.0, 100.0]
    ).P0_N
    sph = brg(BearingKind.SPHERICAL_ROLLER, e=0.25, Y1=2.7, Y2=4.0, Y0=2.8)
    assert pytest.approx([1280.0]) == equivalent_static_load(sph, [1000.0], [100.0]).P0_N
    assert (pytest.approx([700.0])) == equivalent_static_load(
        brg(BearingKind.CYLINDRICAL_ROLLER), [700.0], [0.0]
    ).P0_N
    th = brg(BearingKind.THRUST_BALL)
    assert pytest.approx([900.0]) == equivalent_static_load(th, [0.0], [900.0]).P0_N


def test_static_Y0_from_contact_angle() -> None:
    """ISO 76:2006: Y0 = 0.22*cot(alpha) single row: alpha = 15 deg -> 0.8210512.

    Fr = 1000, Fa = 1000: P0 = 500 + 821.0512 = 1321.0512 N.
    """
    t = brg(BearingKind.TAPERED_ROLLER, contact_angle_deg=15.0)
    assert pytest.approx([1321.0512], rel=REL) == equivalent_static_load(t, [1000.0], [1000.0]).P0_N


def test_static_check_worst_case_and_default_s0() -> None:
    """s0 = C0/P0 = 20000/2500 = 8 and 20000/25000 = 0.8 (worst); default s0_min
    (common practice, no source): ball 1.0, roller 1.5.
    """
    b = brg(BearingKind.CYLINDRICAL_ROLLER)
    st = static_check(b, [2500.0, 25000.0], [0.0, 0.0], ("run", "peak"))
    assert st.s0 == pytest.approx(0.8, rel=REL)
    assert st.s0_case_index == 1
    assert st.s0_min == 1.5 and not st.ok
    assert default_s0_min(BearingKind.DEEP_GROOVE_BALL) == 1.0
    assert static_check(b, [2500.0], [0.0], s0_min=2.0).s0_min == 2.0


def test_operating_warnings_min_load_and_speed() -> None:
    """Minimum load 0.01*C ball (common practice, no source): 250 N < 300 N warns;
    limiting speed 5000 rpm: 6000 rpm warns; static-only cases ignored.
    """
    b = brg(BearingKind.DEEP_GROOVE_BALL, limiting_speed_rpm=5000.0)
    w = operating_warnings(b, [250.0, 1000.0, 1.0], [1000.0, -6000.0, 9000.0], [1, 1, 0])
    assert len(w) == 2
    assert "minimum load" in w[0] and "limiting speed" in w[1]
