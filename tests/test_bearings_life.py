"""Rating life, Palmgren-Miner spectra, reliability, required rating, system life, engine.

Sources are named beside each check; expected values are typed literally (hand-computed
with the arithmetic shown) or are the closed-form formula of the reference.
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from scipy import __version__ as scipy_version
from scipy.stats import weibull_min

from shaftsys.bearings import (
    LIFE_BASIS_BASIC,
    LIFE_BASIS_MODIFIED,
    LoadSpectrum,
    a1_iso281,
    basic_rating_life,
    combine_lives,
    evaluate_bearing,
    life_factor,
    life_hours,
    mean_speed,
    reliability_at_life_factor,
    reliability_iso281,
    required_rating,
    revolution_weights,
    spectrum_life,
    system_life,
    weibull3_life_factor,
    weibull3_reliability,
    weibull3_required_C10,
    weibull_survival,
)
from shaftsys.bearings.system import system_life as system_life_slopes
from shaftsys.errors import ModelError
from shaftsys.model.bearing import Bearing, BearingKind, LifeSettings, Lubrication

REL = 1e-6


def ball(**kw: object) -> Bearing:
    base: dict[str, object] = {
        "id": "A",
        "kind": BearingKind.DEEP_GROOVE_BALL,
        "x_mm": 0.0,
        "d_mm": 40.0,
        "D_mm": 80.0,
        "C_N": 30000.0,
        "C0_N": 20000.0,
        "f0": 14.0,
        "Cu_N": 800.0,
    }
    base.update(kw)
    return Bearing(**base)  # type: ignore[arg-type]


OIL = Lubrication(nu1_at_t1_mm2_s=68.0, nu2_at_t2_mm2_s=8.5, ec=0.5)


# --- basic rating life, ISO 281:2007 clause 6 and 7 --------------------------------------
def test_basic_rating_life_and_hours() -> None:
    """ISO 281:2007: L10 = (C/P)^3 ball, (C/P)^(10/3) roller; L10h = L10*1e6/(60 n).

    C/P = 10: ball 1000e6 rev; roller 10^(10/3) = 2154.43469 e6 rev.
    1000e6 rev at 1500 rpm: 1e9/90000 = 11111.1111 h.
    """
    assert basic_rating_life(30000.0, [3000.0], 3.0)[0] == pytest.approx(1000.0, rel=REL)
    assert basic_rating_life(30000.0, [3000.0], 10.0 / 3.0)[0] == pytest.approx(2154.43469, rel=REL)
    assert life_hours([1000.0], [-1500.0])[0] == pytest.approx(11111.1111, rel=REL)
    assert math.isinf(basic_rating_life(30000.0, [0.0], 3.0)[0])


def test_shigley_example_11_1_required_rating() -> None:
    """Shigley's MED 10th ed., Example 11-1 (from memory): 400 lbf, 5000 h at 1725 rpm,
    R = 0.90, rating at 1e6 rev: C10 = 400*(5000*1725*60/1e6)^(1/3) = 3211 lbf (printed).
    The formula is linear in load, so lbf work as well as N.
    """
    target_mrev = 5000.0 * 1725.0 * 60.0 / 1e6
    c = required_rating([400.0], [1.0], 3.0, target_mrev)
    assert c == pytest.approx(3211.0, abs=0.5)


def test_three_case_spectrum_with_standstill_by_hand() -> None:
    """Palmgren-Miner (ISO 281:2007 Annex / Shigley 11-8 cubic mean), ball, C = 40 kN.

    Cases P = 4000, 2000, 1000 N at 500, 1000, 1500 rpm for shares 0.2, 0.4, 0.3 plus a
    standstill case (0 rpm, share 0.1, 5000 N: static only).
    revolutions n*t: 100, 400, 450 -> 950; U = 0.1052632, 0.4210526, 0.4736842.
    Pm^3 = (100*4000^3 + 400*2000^3 + 450*1000^3)/950 = 1.0578947e10 -> Pm = 2195.23399 N.
    n_m = 950/(0.2 + 0.4 + 0.3 + 0.1) = 950 rpm (standstill time counts).
    L10 = (40000/2195.23399)^3 = 6049.75124 e6 rev; L10h = 6049.75124e6/(60*950)
    = 106135.987 h.
    """
    P = np.array([4000.0, 2000.0, 1000.0, 5000.0])
    n = np.array([500.0, -1000.0, 1500.0, 0.0])
    t = np.array([0.2, 0.4, 0.3, 0.1])
    dyn = np.array([True, True, True, False])
    U = revolution_weights(n, t, dyn)
    assert pytest.approx([100 / 950, 400 / 950, 450 / 950, 0.0], rel=REL) == U
    assert mean_speed(n, t, dyn) == pytest.approx(950.0, rel=REL)
    sl = spectrum_life(40000.0, P, n, t, dyn, 3.0)
    assert sl.Pm_N == pytest.approx(2195.23399, rel=REL)
    assert sl.L10_mrev == pytest.approx(6049.75124, rel=REL)
    assert sl.L10_h == pytest.approx(106135.987, rel=REL)


def test_engine_spectrum_in_hours_and_cycles() -> None:
    """Same spectrum through the engine, durations in hours 2, 4, 3, 1 (10 h cycle): the
    standstill case is static (speed < min_speed). L10h = 106135.987 h (above), cycles =
    106135.987/10 = 10613.5987 (hand-computed from the previous test).
    """
    b = ball(id="S", C_N=40000.0, C0_N=60000.0)
    sp = LoadSpectrum.build(
        ("c1", "c2", "c3", "stop"),
        [4000.0, 2000.0, 1000.0, 5000.0],
        [0.0, 0.0, 0.0, 0.0],
        [500.0, -1000.0, 1500.0, 0.0],
        [2.0, 4.0, 3.0, 1.0],
        duration_in_hours=True,
    )
    r = evaluate_bearing(b, sp, LifeSettings(), None)
    assert r.life_basis == LIFE_BASIS_BASIC
    assert r.n_m_rpm == pytest.approx(950.0, rel=REL)
    assert r.P_eq_N == pytest.approx(2195.23399, rel=REL)
    assert r.L10_h == pytest.approx(106135.987, rel=REL)
    assert r.Lnm_h == pytest.approx(106135.987, rel=REL)  # a1 = 1, aISO not used
    assert r.cycles_of_duty == pytest.approx(10613.5987, rel=REL)
    assert [c for c, _ in r.static_only_cases] == ["stop"]
    assert math.isnan(r.case_Lnm_h[3])
    # every case counts for statics: worst s0 = 60000/5000 = 12 in the standstill case
    assert r.s0 == pytest.approx(12.0, rel=REL) and r.s0_case == "stop"


# --- reliability, ISO 281:2007 9.2 Table 12 ----------------------------------------------
@pytest.mark.parametrize(
    ("R", "printed"),
    [
        (0.90, 1.0),
        (0.95, 0.64),
        (0.96, 0.55),
        (0.97, 0.47),
        (0.98, 0.37),
        (0.99, 0.25),
        (0.992, 0.22),
        (0.994, 0.19),
        (0.996, 0.16),
        (0.998, 0.12),
        (0.999, 0.093),
        (0.9992, 0.087),
        (0.9994, 0.080),
        (0.9995, 0.077),
    ],
)
def test_a1_table(R: float, printed: float) -> None:
    """ISO 281:2007 Table 12 a1, to its printed rounding (2 or 3 significant digits)."""
    digits = 3 if printed < 0.1 else 2
    assert round(a1_iso281(R), digits) == pytest.approx(printed, abs=1e-12)


def test_a1_formula_at_97_5() -> None:
    """ISO 281:2007 9.2: a1 = 0.95*(ln(100/97.5)/ln(100/90))^(2/3) + 0.05.

    ln(100/97.5) = 0.02531781, ln(100/90) = 0.10536052, ratio 0.24029723,
    ^(2/3) = 0.38651427, *0.95 = 0.36718856, + 0.05 = 0.41718851.
    """
    assert a1_iso281(0.975) == pytest.approx(0.41718851, rel=REL)


@pytest.mark.parametrize("R", [0.85, 0.9999])
def test_a1_out_of_range(R: float) -> None:
    with pytest.raises(ModelError, match="target_reliability"):
        a1_iso281(R)


def test_engine_reliability_out_of_range_names_bearing() -> None:
    b = ball(id="Q", target_reliability=0.9999)
    sp = LoadSpectrum.build(("c",), [1000.0], [0.0], [1000.0], [1.0])
    with pytest.raises(ModelError, match=r"bearings\[Q\]\.target_reliability") as exc:
        evaluate_bearing(b, sp, LifeSettings(), None)
    assert "'Q'" in str(exc.value)


def test_iso_reliability_inverse_round_trip() -> None:
    for R in (0.9, 0.95, 0.975, 0.99, 0.9995):
        assert reliability_iso281(a1_iso281(R)) == pytest.approx(R, rel=1e-12)
    with pytest.raises(ModelError):
        reliability_iso281(1.5)
    assert reliability_iso281(1.5, strict=False) < 0.9


def test_shigley_example_11_3() -> None:
    """Shigley's MED 10th ed., Example 11-3 (from memory): FD = 413 lbf, af = 1.2,
    30 kh at 300 rpm -> xD = 540, R = 0.99, x0 = 0.02, theta - x0 = 4.439, b = 1.483,
    with Shigley's (1 - R) approximation: C10 = 6696 lbf (printed).

    Exact ln(1/R) variant by hand: ln(1/0.99) = 0.01005034, ^(1/1.483) = 0.04497281,
    *4.439 + 0.02 = 0.21963430, 540/0.21963430 = 2458.6335, ^(1/3) = 13.496844,
    *1.2*413 = 6689.4741 lbf.
    """
    approx = weibull3_required_C10(413.0, 540.0, 0.99, 1.2, 3.0, approximate=True)
    assert approx == pytest.approx(6696.0, abs=0.5)
    exact = weibull3_required_C10(413.0, 540.0, 0.99, 1.2, 3.0)
    assert exact == pytest.approx(6689.4741, rel=REL)


def test_weibull3_against_scipy() -> None:
    """Shigley's three-parameter Weibull equals scipy.stats.weibull_min(c=b, loc=x0,
    scale=theta - x0).sf and .isf (checked with scipy 1.17)."""
    x = np.array([0.05, 0.5, 1.0, 2.0, 5.0])
    ref = weibull_min.sf(x, 1.483, loc=0.02, scale=4.459 - 0.02)
    assert weibull3_reliability(x) == pytest.approx(ref, rel=1e-10), scipy_version
    for R in (0.5, 0.9, 0.99):
        xr = weibull3_life_factor(R)
        assert weibull_min.isf(R, 1.483, loc=0.02, scale=4.439) == pytest.approx(xr, rel=1e-10)
        assert float(weibull3_reliability(xr)) == pytest.approx(R, rel=1e-12)
        xa = weibull3_life_factor(R, approximate=True)
        assert float(weibull3_reliability(xa, approximate=True)) == pytest.approx(R, rel=1e-12)


def test_life_factor_methods_consistent() -> None:
    for method in ("iso281", "weibull3", "weibull3_approx"):
        for R in (0.9, 0.95, 0.99):
            f = life_factor(R, method)
            assert reliability_at_life_factor(f, method) == pytest.approx(R, rel=1e-10)
    with pytest.raises(ModelError, match="reliability_method"):
        life_factor(0.9, "gaussian")


# --- modified life and required rating ----------------------------------------------------
def test_combine_lives_palmgren_miner() -> None:
    """1/L = sum U_i/L_i: U = 0.25, 0.75, L = 1000, 3000 -> 1/(0.00025 + 0.00025) = 2000."""
    assert combine_lives([1000.0, 3000.0], [0.25, 0.75]) == pytest.approx(2000.0, rel=REL)


def test_engine_single_case_modified_life_by_hand() -> None:
    """ISO 281:2007 modified life, one case, ball C = 30 kN, P = Fr = 2000 N, 1500 rpm,
    60 degC, oil 68 mm^2/s at 40 degC / 8.5 at 100 degC (Walther, ASTM D341), ec = 0.5,
    Cu = 800 N, dm = 60 mm.

    nu(60 degC) = 28.3232826 mm^2/s; nu1 = 4500/sqrt(1500*60) = 15 mm^2/s;
    kappa = 1.88821884; ec*Cu/P = 0.2. aISO (1 <= kappa <= 4): kappa^0.071739 = 1.04665540,
    1.9987/1.04665540 = 1.90960655, (2.5671 - 1.90960655)^0.83 = 0.70607346,
    0.2^(1/3) = 0.58480355, base = 0.58708573, 0.1*base^-9.3 = 14.1604091.
    L10 = 15^3 = 3375e6 rev = 37500 h; Lnm(R = 0.9) = 14.1604091*37500 = 531015.342 h;
    Lnm(R = 0.99) = a1 0.24833167 * 531015.342 = 131867.925 h.
    """
    sp = LoadSpectrum.build(("c",), [2000.0], [0.0], [1500.0], [1.0], temperature_C=[60.0])
    r = evaluate_bearing(ball(), sp, LifeSettings(), OIL)
    assert r.life_basis == LIFE_BASIS_MODIFIED
    assert r.nu_mm2_s[0] == pytest.approx(28.3232826, rel=REL)
    assert r.nu1_mm2_s[0] == pytest.approx(15.0, rel=REL)
    assert r.kappa[0] == pytest.approx(1.88821884, rel=REL)
    assert r.aISO[0] == pytest.approx(14.1604091, rel=REL)
    assert r.L10_h == pytest.approx(37500.0, rel=REL)
    assert r.Lnm_h == pytest.approx(531015.342, rel=REL)
    r99 = evaluate_bearing(ball(), sp, LifeSettings(target_reliability=0.99), OIL)
    assert r99.a1 == pytest.approx(0.24833167, rel=REL)
    assert r99.Lnm_h == pytest.approx(131867.925, rel=REL)


def test_engine_application_factor_enters_L10_and_aiso() -> None:
    """af = 1.2: P_design = 2400 N; L10 = 12.5^3 = 1953.125e6 rev = 21701.3889 h;
    ec*Cu/P = 0.5*800/2400 = 0.1666667 -> aISO = 9.70413433 (same kappa 1.88821884);
    Lnm = 9.70413433*21701.3889 = 210593.193 h.
    """
    sp = LoadSpectrum.build(("c",), [2000.0], [0.0], [1500.0], [1.0], temperature_C=[60.0])
    r = evaluate_bearing(ball(), sp, LifeSettings(application_factor=1.2), OIL)
    assert r.P_eq_N == pytest.approx(2400.0, rel=REL)
    assert r.L10_h == pytest.approx(21701.3889, rel=REL)
    assert r.aISO[0] == pytest.approx(9.70413433, rel=REL)
    assert r.Lnm_h == pytest.approx(210593.193, rel=REL)


def test_engine_modified_spectrum_per_case_and_required_rating() -> None:
    """Two cases, ball C = 30 kN, Cu = 800, ec = 0.5, dm = 60, shares 0.5/0.5:
    c1 P = 2000 N, 1500 rpm, 60 degC: kappa 1.88821884, aISO 14.1604091, L10 3375,
       Lnm 47791.3808e6 rev;
    c2 P = 4000 N, 3000 rpm, 80 degC: nu 14.4476041, nu1 = 4500/sqrt(3000*60)
       = 10.6066017, kappa 1.36213317, ec*Cu/P = 0.1, aISO 3.10605275, L10 421.875,
       Lnm 1310.36600e6 rev;
    U = 750/2250, 1500/2250 = 1/3, 2/3; 1/Lnm = (1/3)/47791.3808 + (2/3)/1310.36600
       -> Lnm = 1938.96726e6 rev; n_m = 2250 rpm; Lnm_h = 1938.96726e6/(60*2250)
       = 14362.7204 h (not aISO(Pm)*L10(Pm): that basis is never used).
    C_req (target 20000 h = 2700e6 rev): (2700*((1/3)*2000^3/14.1604091
       + (2/3)*4000^3/3.10605275))^(1/3) = 33500.5819 N; margin = 0.895506833,
       life ratio = margin^3 = 0.718136022 = 14362.7204/20000.
    """
    sp = LoadSpectrum.build(
        ("c1", "c2"),
        [2000.0, 4000.0],
        [0.0, 0.0],
        [1500.0, 3000.0],
        [0.5, 0.5],
        temperature_C=[60.0, 80.0],
    )
    r = evaluate_bearing(ball(), sp, LifeSettings(), OIL)
    assert r.aISO == pytest.approx([14.1604091, 3.10605275], rel=REL)
    assert r.n_m_rpm == pytest.approx(2250.0, rel=REL)
    assert r.Lnm_h == pytest.approx(14362.7204, rel=REL)
    assert r.C_required_N == pytest.approx(33500.5819, rel=REL)
    assert r.margin == pytest.approx(0.895506833, rel=REL)
    assert r.life_ratio == pytest.approx(0.718136022, rel=REL)
    assert not r.ok and not r.life_ok and r.static_ok
    # the required rating reaches the target exactly on the same basis
    r2 = evaluate_bearing(ball(C_N=r.C_required_N), sp, LifeSettings(), OIL)
    assert r2.Lnm_h == pytest.approx(20000.0, rel=1e-9)


def test_engine_to_dict_keys_and_json() -> None:
    sp = LoadSpectrum.build(("c",), [2000.0], [0.0], [1500.0], [1.0], temperature_C=[60.0])
    d = evaluate_bearing(ball(), sp, LifeSettings(), OIL).to_dict()
    for key in (
        "P_eq_N",
        "L10_h",
        "Lnm_h",
        "reliability",
        "reliability_method",
        "life_basis",
        "target_h",
        "C_required_N",
        "margin",
        "s0",
        "ok",
    ):
        assert key in d
    json.dumps(d, allow_nan=False)
    assert d["ok"] is True and d["life_basis"] == LIFE_BASIS_MODIFIED


def test_engine_no_dynamic_case_statics_only() -> None:
    """Only a static-only peak case: infinite life (None in JSON), verdict on s0 alone:
    s0 = 20000/25000 = 0.8 < 1.0 (ball, common practice) -> not ok.
    """
    sp = LoadSpectrum.build(("peak",), [25000.0], [0.0], [0.0], [0.0], static_only=[True])
    r = evaluate_bearing(ball(), sp, LifeSettings(), OIL)
    assert math.isinf(r.Lnm_h) and r.life_ok and not r.static_ok and not r.ok
    assert r.s0 == pytest.approx(0.8, rel=REL)
    d = r.to_dict()
    assert d["Lnm_h"] is None and d["ok"] is False
    json.dumps(d, allow_nan=False)


def test_engine_kappa_below_limit_raises() -> None:
    """nu(100 degC) = 1.7 mm^2/s, nu1 = 45000*20^-0.83/sqrt(60) = 483.4 -> kappa = 0.0035."""
    thin = Lubrication(nu1_at_t1_mm2_s=5.0, nu2_at_t2_mm2_s=1.7)
    sp = LoadSpectrum.build(("slow",), [2000.0], [0.0], [20.0], [1.0], temperature_C=[100.0])
    with pytest.raises(ModelError, match=r"lubrication\.viscosity") as exc:
        evaluate_bearing(ball(id="K"), sp, LifeSettings(), thin)
    assert "'K'" in str(exc.value) and "'slow'" in str(exc.value)


def test_engine_missing_temperature_raises() -> None:
    sp = LoadSpectrum.build(("c",), [2000.0], [0.0], [1500.0], [1.0])
    with pytest.raises(ModelError, match="temperature"):
        evaluate_bearing(ball(), sp, LifeSettings(), OIL)


def test_engine_needle_axial_error_propagates() -> None:
    n = ball(id="NR", kind=BearingKind.NEEDLE_ROLLER)
    sp = LoadSpectrum.build(("c",), [2000.0], [10.0], [1500.0], [1.0])
    with pytest.raises(ModelError, match=r"bearings\[NR\]\.axial"):
        evaluate_bearing(n, sp, LifeSettings(), None)


def test_engine_cu_estimate_flag() -> None:
    sp = LoadSpectrum.build(("c",), [2000.0], [0.0], [1500.0], [1.0], temperature_C=[60.0])
    r = evaluate_bearing(ball(Cu_N=None), sp, LifeSettings(), OIL)
    assert r.Cu_estimated
    assert r.Cu_N == pytest.approx(20000.0 / 22.0, rel=REL)  # Annex B, from memory


# --- system life ---------------------------------------------------------------------------
def test_weibull_survival_against_scipy() -> None:
    """S(L) = exp(ln0.9*(L/L10)^e) = weibull_min.sf(L, c=e, scale=L10/(ln(1/0.9))^(1/e))."""
    L = np.array([100.0, 1000.0, 5000.0, 20000.0])
    for e in (10.0 / 9.0, 9.0 / 8.0):
        scale = 5000.0 / math.log(1.0 / 0.9) ** (1.0 / e)
        assert weibull_survival(L, 5000.0, e) == pytest.approx(
            weibull_min.sf(L, e, scale=scale), rel=1e-12
        )


def test_system_life_closed_form_equal_slopes() -> None:
    """Equal slopes, R = 0.9: L_sys = (sum L_i^-e)^(-1/e) (Lundberg-Palmgren)."""
    lives = [10000.0, 20000.0, 40000.0]
    e = 10.0 / 9.0
    closed = sum(x**-e for x in lives) ** (-1.0 / e)
    life, idx = system_life(lives, [BearingKind.DEEP_GROOVE_BALL] * 3, 0.9)
    assert life == pytest.approx(closed, rel=1e-9)
    assert idx == 0
    # at R = 0.95: closed form times (ln 0.95/ln 0.9)^(1/e)
    life95, _ = system_life(lives, ["deep_groove_ball"] * 3, 0.95)
    expected95 = (math.log(0.95) / math.log(0.9)) ** (1.0 / e) * closed
    assert life95 == pytest.approx(expected95, rel=1e-9)


def test_system_life_mixed_slopes_and_infinite() -> None:
    """Mixed slopes: product of survivals at L_sys equals R; an infinite life is ignored."""
    lives = [12000.0, 30000.0, math.inf]
    kinds = [BearingKind.DEEP_GROOVE_BALL, BearingKind.TAPERED_ROLLER, "cylindrical_roller"]
    life, idx = system_life(lives, kinds, 0.9, basis="modified")
    s = weibull_survival(life, 12000.0, 10.0 / 9.0) * weibull_survival(life, 30000.0, 9.0 / 8.0)
    assert float(s) == pytest.approx(0.9, rel=1e-10)
    assert idx == 0
    assert system_life_slopes([math.inf], [1.1]) == (math.inf, None)
    with pytest.raises(ValueError):
        system_life_slopes([1.0], [1.1], basis="calendar")
