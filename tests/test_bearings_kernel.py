"""The vectorised life chain (shaftsys.bearings.kernel) against the single-bearing engine.

Every bearing below is invented demo data (sizes and ratings made up, no real series).
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest

from shaftsys.bearings import LoadSpectrum, evaluate_bearing
from shaftsys.bearings.arrays import BearingArrays
from shaftsys.bearings.kernel import DutyCycle, evaluate, evaluate_planned, plan_row
from shaftsys.bearings.reliability import a1_iso281, reliability_iso281
from shaftsys.errors import ModelError
from shaftsys.model.bearing import Bearing, BearingKind, LifeSettings, Lubrication
from shaftsys.model.bearing import SetArrangement as S

K = BearingKind
REL = 1e-12

CASES = {
    "case_ids": ("run", "slow", "rev", "peak", "stop"),
    "speed_rpm": [1500.0, 120.0, -2400.0, 800.0, 0.0],
    "duration": [0.45, 0.3, 0.2, 0.0, 0.05],
    "static_only": [False, False, False, True, False],
    "temperature_C": [70.0, 55.0, 80.0, 40.0, 30.0],
}
OIL = Lubrication(nu1_at_t1_mm2_s=150.0, nu2_at_t2_mm2_s=15.0, cleanliness="-/15/12",
                  ep_additives=True)
SETTINGS = LifeSettings(target_life_h=15000.0, application_factor=1.1)


def _b(i: int, kind: BearingKind, **kw: object) -> Bearing:
    d = float(kw.pop("d", 20 + 5 * (i % 17)))  # type: ignore[arg-type]
    D = float(kw.pop("D", d * 1.9 + 10))  # type: ignore[arg-type]
    C = float(kw.pop("C", 6.0 * (D - d) ** 1.6))  # type: ignore[arg-type]
    return Bearing(id=f"R{i:02d}", kind=kind, x_mm=0.0, d_mm=d, D_mm=D, C_N=C, C0_N=0.7 * C,
                   **kw)  # type: ignore[arg-type]


def mixed_table() -> list[Bearing]:
    """44 invented bearings covering every kind, arrangement and factor source."""
    specs: list[tuple[BearingKind, dict[str, object]]] = []
    for f0 in (None, 14.0):
        for arr in (S.SINGLE, S.DOUBLE_ROW):
            specs.append((K.DEEP_GROOVE_BALL, {"f0": f0, "arrangement": arr}))
    specs += [(K.DEEP_GROOVE_BALL, {"Cu_N": 900.0, "d": 120.0, "D": 180.0}),
              (K.DEEP_GROOVE_BALL, {"Y0": 0.45, "target_reliability": 0.95})]
    specs += [(K.ANGULAR_CONTACT_BALL, {"contact_angle_deg": a})
              for a in (15.0, 17.5, 20.0, 22.0, 25.0, 30.0, 40.0, 45.0)]
    specs += [(K.ANGULAR_CONTACT_BALL, {"contact_angle_deg": a, "arrangement": arr, "rows": 2,
                                        "f0": 15.0})
              for a, arr in ((15.0, S.BACK_TO_BACK), (18.0, S.FACE_TO_FACE),
                             (30.0, S.TANDEM), (40.0, S.DOUBLE_ROW))]
    specs += [
        (K.ANGULAR_CONTACT_BALL, {"contact_angle_deg": 25.0, "Y0": 0.4, "ec": 0.5}),
        (K.SELF_ALIGNING_BALL, {"e": 0.3, "Y1": 2.1, "Y2": 3.3, "Y0": 2.2}),
        (K.SELF_ALIGNING_BALL, {"contact_angle_deg": 12.0}),
        (K.CYLINDRICAL_ROLLER, {"ribs": True}),
        (K.CYLINDRICAL_ROLLER, {"ribs": True, "d": 140.0, "D": 250.0, "Cu_N": 20000.0}),
        (K.CYLINDRICAL_ROLLER, {}),
        (K.NEEDLE_ROLLER, {}),
        (K.TAPERED_ROLLER, {"e": 0.37, "Y": 1.6, "Y0": 0.9}),
        (K.TAPERED_ROLLER, {"contact_angle_deg": 14.0}),
        (K.TAPERED_ROLLER, {"e": 0.43, "Y": 1.4}),
        (K.TAPERED_ROLLER, {"contact_angle_deg": 16.0, "arrangement": S.BACK_TO_BACK,
                            "rows": 2}),
        (K.TAPERED_ROLLER, {"e": 0.4, "Y1": 1.7, "Y2": 2.5, "Y0": 1.6,
                            "arrangement": S.FACE_TO_FACE, "rows": 2}),
        (K.SPHERICAL_ROLLER, {"e": 0.25, "Y1": 2.7, "Y2": 4.0, "Y0": 2.6, "d": 160.0,
                              "D": 270.0}),
        (K.SPHERICAL_ROLLER, {"contact_angle_deg": 10.0, "target_life_h": 40000.0}),
        (K.SPHERICAL_ROLLER, {"e": 0.3, "Y1": 2.2, "Y2": 3.4, "Y0": 2.2, "s0_min": 3.0}),
        (K.THRUST_BALL, {}),
        (K.THRUST_BALL, {"contact_angle_deg": 90.0, "Cu_N": 1500.0}),
        (K.DEEP_GROOVE_BALL, {"X": 0.5, "Y": 1.8, "e": 0.3}),
        (K.DEEP_GROOVE_BALL, {"X": 0.56, "Y": 1.5}),
        (K.ANGULAR_CONTACT_BALL, {"X": 0.4, "Y": 0.9, "contact_angle_deg": 30.0,
                                  "limiting_speed_rpm": 1200.0}),
        (K.SPHERICAL_ROLLER, {"e": 0.2, "Y1": 3.0, "Y2": 4.5, "Y0": 3.0,
                              "limiting_speed_rpm": 8000.0}),
    ]
    specs += [(K.DEEP_GROOVE_BALL, {"d": 10.0 + 37 * j, "D": (10.0 + 37 * j) * 1.6 + 12,
                                    "C": 3000.0 + 14000.0 * j}) for j in range(6)]
    return [_b(i, kind, **kw) for i, (kind, kw) in enumerate(specs)]


def mixed_loads(bearings: list[Bearing], m: int) -> tuple[np.ndarray, np.ndarray]:
    """Invented loads (N, m) [N] that each kind can take (no axial load on needles...)."""
    rng = np.random.default_rng(11)
    C = np.array([b.C_N for b in bearings])[:, None]
    Fr = rng.uniform(0.02, 0.25, (len(bearings), m)) * C
    Fa = rng.uniform(0.0, 0.6, Fr.shape) * Fr
    Fa[:, 1] *= -1.0
    for i, b in enumerate(bearings):
        if b.kind is K.NEEDLE_ROLLER or (b.kind is K.CYLINDRICAL_ROLLER and not b.ribs):
            Fa[i] = 0.0
        if b.kind is K.THRUST_BALL:
            Fr[i] = 0.0
            Fa[i] = 0.05 * b.C_N * (1 + np.arange(m))
    Fr[0, 0] = 0.0
    return Fr, Fa


def duty(**over: object) -> DutyCycle:
    sp = LoadSpectrum.build(Fr_N=np.zeros(5), Fa_N=np.zeros(5), **CASES)  # type: ignore[arg-type]
    d = sp.duty
    return DutyCycle(**{**d.__dict__, **over})  # type: ignore[arg-type]


def _same(a: object, b: object) -> None:
    x = np.asarray(a, dtype=float)
    y = np.asarray(b, dtype=float)
    assert x.shape == y.shape
    both_nan = np.isnan(x) & np.isnan(y)
    assert np.all(both_nan | (x == y) | np.isclose(x, y, rtol=REL, atol=0.0)), (x, y)


@pytest.mark.parametrize("lubrication", [OIL, None], ids=["modified", "basic"])
def test_every_row_equals_the_single_bearing_engine(lubrication: Lubrication | None) -> None:
    """Kernel rows vs ``evaluate_bearing`` of the same Bearing, to 1e-12 relative.

    Reference: the single-bearing engine, itself checked against ISO 281:2007 and
    ISO 76:2006 in test_bearings_iso281.py / test_bearings_life.py. 44 invented bearings
    of all eight kinds, a 5-case spectrum (one static-only peak, one standstill).
    """
    table = mixed_table()
    assert len(table) >= 40
    assert {b.kind for b in table} == set(BearingKind)
    Fr, Fa = mixed_loads(table, 5)
    params = BearingArrays.from_bearings(table)
    la = evaluate(params, Fr, Fa, duty(), SETTINGS, lubrication)
    assert all(x is None for x in la.errors)
    for i, b in enumerate(table):
        sp = LoadSpectrum.build(Fr_N=Fr[i], Fa_N=Fa[i], **CASES)  # type: ignore[arg-type]
        ref = evaluate_bearing(b, sp, SETTINGS, lubrication)
        for name in ("Lnm_h", "L10_h", "C_required_N", "margin", "s0"):
            _same(getattr(la, name)[i], getattr(ref, name))
        for name in ("X", "Y", "e", "aISO", "P_N", "case_s0"):
            _same(getattr(la, name)[i], getattr(ref, name))
        assert bool(la.life_ok[i]) == ref.life_ok and bool(la.static_ok[i]) == ref.static_ok
    if lubrication is not None:  # the modified life really entered
        assert np.nanmax(la.aISO) > 1.0 and np.nanmin(la.aISO) < 1.0


def test_one_spectrum_broadcasts_over_rows() -> None:
    """A (m,) load spectrum gives the same rows as the same spectrum repeated (N, m).

    Common practice, no source: broadcasting must not change the arithmetic.
    """
    table = [b for b in mixed_table() if b.kind is K.DEEP_GROOVE_BALL]
    params = BearingArrays.from_bearings(table)
    fr = np.array([3000.0, 5000.0, 2000.0, 9000.0, 100.0])
    fa = np.array([500.0, 0.0, 800.0, 0.0, 0.0])
    one = evaluate(params, fr, fa, duty(), SETTINGS, OIL)
    many = evaluate(params, np.tile(fr, (len(table), 1)), np.tile(fa, (len(table), 1)),
                    duty(), SETTINGS, OIL)
    np.testing.assert_array_equal(one.Lnm_h, many.Lnm_h)
    np.testing.assert_array_equal(one.s0, many.s0)
    assert np.unique(one.Lnm_h).size == len(table)  # rows really differ


def test_required_rating_three_cases_95_percent_by_hand() -> None:
    """C_required of a 3-case spectrum at 95 % reliability, worked from ISO 281:2007.

    Deep groove ball bearing, radial load only (X = 1, Y = 0, so P = Fr), af = 1, no
    lubrication data (verdict basis a1*L10, ISO 281:2007 eq. for L10 = (C/P)^3):

    ====  ======  =======  ====  ===========
    case  P [N]   n [rpm]  t     n*t
    ====  ======  =======  ====  ===========
    A     4000    1000     0.5   500
    B     6000     500     0.3   150
    C     2000    1500     0.2   300
    ====  ======  =======  ====  ===========

    U = (500, 150, 300)/950; n_m = 950 rpm (all time is running time).
    sum U P^3 = (500*64e9 + 150*216e9 + 300*8e9)/950 = 66.8e12/950 = 7.0316e10 N^3.
    Target 20 000 h -> L = 20000*60*950/1e6 = 1140 (10^6 rev).
    a1 at R = 95 %: ISO 281:2007 Table 12 gives 0.64; the code's formula
    0.95*(ln(1/0.95)/ln(1/0.9))^(2/3) + 0.05 = 0.6379 (rounds to 0.64).
    C_req = (1140 * 7.0316e10 / 0.6379)^(1/3) = (1.2566e14)^(1/3) = 50 088 N.
    """
    a1 = a1_iso281(0.95)
    assert a1 == pytest.approx(0.64, abs=0.005)  # ISO 281:2007 Table 12
    assert reliability_iso281(a1) == pytest.approx(0.95, rel=1e-12)  # inverse relation
    b = Bearing(id="H", kind=K.DEEP_GROOVE_BALL, x_mm=0.0, d_mm=45.0, D_mm=100.0,
                C_N=60000.0, C0_N=40000.0)
    d = DutyCycle(("A", "B", "C"), np.array([1000.0, 500.0, 1500.0]),
                  np.array([0.5, 0.3, 0.2]), False, np.zeros(3, bool), np.full(3, np.nan))
    settings = LifeSettings(target_life_h=20000.0, target_reliability=0.95)
    la = evaluate(BearingArrays.from_bearings([b]), [4000.0, 6000.0, 2000.0],
                  [0.0, 0.0, 0.0], d, settings, None)
    U = np.array([500.0, 150.0, 300.0]) / 950.0
    L_target = 20000.0 * 60.0 * 950.0 / 1e6
    expected = (L_target * float(np.sum(U * np.array([4000.0, 6000.0, 2000.0]) ** 3)) / a1) \
        ** (1.0 / 3.0)
    assert la.C_required_N[0] == pytest.approx(expected, rel=1e-12)
    assert la.C_required_N[0] == pytest.approx(50088.0, rel=2e-4)  # the worked figure
    assert la.a1[0] == pytest.approx(a1, rel=1e-15)
    assert la.margin[0] == pytest.approx(60000.0 / expected, rel=1e-12)


def test_missing_factor_is_a_row_reason_and_other_rows_evaluate() -> None:
    """A tapered row without e and contact angle fails alone, with the engine's error.

    Reference: the single-bearing engine raises ModelError for the same bearing (field
    bearings[BAD].e); the other rows still equal evaluate_bearing.
    """
    good = mixed_table()[:6]
    bad = Bearing(id="BAD", kind=K.TAPERED_ROLLER, x_mm=0.0, d_mm=30.0, D_mm=62.0,
                  C_N=40000.0, C0_N=44000.0, line=12)
    needle = Bearing(id="NDL", kind=K.NEEDLE_ROLLER, x_mm=0.0, d_mm=30.0, D_mm=42.0,
                     C_N=20000.0, C0_N=25000.0)
    table = [*good[:3], bad, *good[3:], needle]
    Fr, Fa = mixed_loads(table, 5)
    Fa[-1, 2] = 300.0  # axial load on the needle bearing in case 'rev'
    la = evaluate(BearingArrays.from_bearings(table), Fr, Fa, duty(), SETTINGS, OIL)
    assert [x is None for x in la.errors] == [True, True, True, False, True, True, True, False]
    e_bad = la.errors[3]
    assert e_bad is not None and e_bad.field == "bearings[BAD].e" and e_bad.line == 12
    assert "needs 'e'" in la.reason[3] and "contact angle" in la.reason[3]
    assert "axial load" in la.reason[7] and "'rev'" in la.reason[7]
    assert np.isnan(la.Lnm_h[3]) and not la.life_ok[3] and not la.static_ok[3]
    for i in (3, 7):
        sp = LoadSpectrum.build(Fr_N=Fr[i], Fa_N=Fa[i], **CASES)  # type: ignore[arg-type]
        with pytest.raises(ModelError) as info:
            evaluate_bearing(table[i], sp, SETTINGS, OIL)
        assert str(info.value) == la.reason[i]
    for i in (0, 1, 2, 4, 5, 6):
        sp = LoadSpectrum.build(Fr_N=Fr[i], Fa_N=Fa[i], **CASES)  # type: ignore[arg-type]
        _same(la.Lnm_h[i], evaluate_bearing(table[i], sp, SETTINGS, OIL).Lnm_h)


def test_selection_checks_minimum_load_and_speed() -> None:
    """Minimum-load ratio P/(f*C) and speed ratio max|n|/n_lim of the running cases.

    Common practice, no source: f = 0.01 for ball, 0.02 for roller bearings; a bearing
    without limiting speed has no speed ratio (NaN).
    """
    cyl = Bearing(id="CY", kind=K.CYLINDRICAL_ROLLER, x_mm=0.0, d_mm=50.0, D_mm=90.0,
                  C_N=80000.0, C0_N=90000.0, limiting_speed_rpm=2000.0)
    dg = Bearing(id="DG", kind=K.DEEP_GROOVE_BALL, x_mm=0.0, d_mm=50.0, D_mm=90.0,
                 C_N=35000.0, C0_N=23000.0)
    fr = np.array([1200.0, 5000.0, 3000.0, 20000.0, 50.0])
    la = evaluate(BearingArrays.from_bearings([cyl, dg]), fr, np.zeros(5), duty(),
                  SETTINGS, None)
    running = np.array([True, True, True, False, False])  # peak static-only, 'stop' at 0 rpm
    np.testing.assert_array_equal(la.dynamic, running)
    assert la.min_load_ratio[0] == pytest.approx(1200.0 / (0.02 * 80000.0), rel=1e-15)
    assert la.min_load_ratio[1] == pytest.approx(1200.0 / (0.01 * 35000.0), rel=1e-15)
    assert la.speed_ratio[0] == pytest.approx(2400.0 / 2000.0, rel=1e-15)
    assert math.isnan(la.speed_ratio[1])


OIL_EC = Lubrication(nu1_at_t1_mm2_s=46.0, nu2_at_t2_mm2_s=6.8, ec=0.3)
PLAN_FIELDS = ("Lnm_h", "margin", "life_ratio", "s0", "life_ok", "static_ok", "ok")


def _permuted_duty(order: list[int]) -> DutyCycle:
    """The duty above with its cases in another order."""
    d = duty()
    return DutyCycle(case_ids=tuple(d.case_ids[k] for k in order),
                     speed_rpm=d.speed_rpm[order], duration=d.duration[order],
                     duration_in_hours=d.duration_in_hours, static_only=d.static_only[order],
                     temperature_C=d.temperature_C[order])


@pytest.mark.parametrize("order", [[0, 1, 2, 3, 4], [3, 0, 4, 1, 2]],
                         ids=["running-first", "interleaved"])
@pytest.mark.parametrize("lubrication", [OIL, OIL_EC, None], ids=["ep", "ec", "basic"])
def test_planned_rows_equal_the_general_chain_bit_for_bit(
        lubrication: Lubrication | None, order: list[int]) -> None:
    """No outside source: ``evaluate_planned`` (the study's per-bearing path) must give
    the bits of ``evaluate`` (checked against the single-bearing engine and ISO 281
    above) for every row it covers. Every bearing of the mixed table that gets a plan
    (all but the Table 3 angular-contact ones), 40 invented spectra each with its own C
    (0.6..1.4 of the bearing's), loads spanning two decades; a static-only and a
    standstill case (the duty above), first after the running cases and then between
    them."""
    rng = np.random.default_rng(3)
    du = _permuted_duty(order)
    planned = 0
    for b in mixed_table():
        params = BearingArrays.from_bearings([b])
        plan = plan_row(params, du, SETTINGS, lubrication)
        if b.kind is K.ANGULAR_CONTACT_BALL and b.X is None:
            assert plan is None            # load-dependent Table 3 factors: general chain
            continue
        assert plan is not None, b.id
        planned += 1
        n = 40
        C = b.C_N * rng.uniform(0.6, 1.4, n)
        Fr = b.C_N * 10 ** rng.uniform(-2.5, -0.5, (n, 5))
        Fa = Fr * rng.uniform(0.0, 0.8, (n, 5)) * np.where(rng.random((n, 5)) < 0.5, -1, 1)
        if b.kind is K.NEEDLE_ROLLER or (b.kind is K.CYLINDRICAL_ROLLER and not b.ribs):
            Fa[:] = 0.0
        if b.kind is K.THRUST_BALL:
            Fr[:] = 0.0
        Fr[0, 2] = 0.0                     # a running case without radial load
        Fa[1] = 0.0
        got = evaluate_planned(plan, Fr, Fa, C)
        assert not got.fallback.any(), b.id
        ref = evaluate(_rows_with_C(params, C), Fr, Fa, du, SETTINGS, lubrication,
                       per_case=False)
        assert all(x is None for x in ref.errors)
        for name in PLAN_FIELDS:
            assert np.array_equal(getattr(got, name), getattr(ref, name)), (b.id, name)
        assert plan.a1 == ref.a1[0]
    assert planned >= 30


def _rows_with_C(params: BearingArrays, C: np.ndarray) -> BearingArrays:
    """``len(C)`` copies of the one-row ``params`` with their own C [N]."""
    return dataclasses.replace(params.take(np.zeros(C.size, dtype=np.intp)), C_N=C)


def test_planned_rows_leave_load_dependent_errors_to_the_general_chain() -> None:
    """No outside source: rows the plan cannot vouch for are flagged for ``evaluate``,
    which then gives the single run's error (axial load on a needle bearing, radial load
    on a thrust ball bearing, C not positive); the other rows are unaffected."""
    du = duty()
    needle = Bearing(id="NDL", kind=K.NEEDLE_ROLLER, x_mm=0.0, d_mm=30.0, D_mm=42.0,
                     C_N=20000.0, C0_N=25000.0)
    thrust = Bearing(id="TB", kind=K.THRUST_BALL, x_mm=0.0, d_mm=30.0, D_mm=52.0,
                     C_N=25000.0, C0_N=40000.0)
    for b, hurt in ((needle, "Fa"), (thrust, "Fr")):
        params = BearingArrays.from_bearings([b])
        plan = plan_row(params, du, SETTINGS, OIL)
        assert plan is not None
        Fr = np.full((4, 5), 0.0 if b is thrust else 2000.0)
        Fa = np.full((4, 5), 1500.0 if b is thrust else 0.0)
        (Fa if hurt == "Fa" else Fr)[1, 2] = 300.0
        C = np.array([b.C_N, b.C_N, 0.0, b.C_N])
        got = evaluate_planned(plan, Fr, Fa, C)
        assert got.fallback.tolist() == [False, True, True, False]
        ref = evaluate(_rows_with_C(params, C), Fr, Fa, du, SETTINGS, OIL, per_case=False)
        assert [x is None for x in ref.errors] == [True, False, False, True]
        assert ("axial load" if hurt == "Fa" else "radial load") in ref.reason[1]
        assert "positive ratings" in ref.reason[2]
        for name in PLAN_FIELDS:
            assert np.array_equal(getattr(got, name)[[0, 3]], getattr(ref, name)[[0, 3]])
