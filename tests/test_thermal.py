"""Bearing friction (Palmgren) and the housing heat balance.

The bearing data and housing data are invented. Each test names its reference.
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np
import pytest
import yaml
from scipy.optimize import brentq

from shaftsys.analysis.pipeline import analyse
from shaftsys.bearings.friction import (
    f1_value,
    friction_factors,
    friction_load,
    friction_power_W,
    load_moment,
    static_load_ratio,
    viscous_moment,
)
from shaftsys.bearings.heat_balance import solve_temperature
from shaftsys.cli import main
from shaftsys.errors import ModelError
from shaftsys.io.loader import load_model, load_model_text
from shaftsys.model import Bearing, BearingKind

MODEL = Path(__file__).resolve().parent.parent / "models" / "belt_reducer_thermal.yaml"


def _walther_by_hand(t_C: float, nu40: float, nu100: float) -> float:
    """ASTM D341 (Walther): log log (nu + 0.7) = A - B log T, written out independently."""
    z1 = math.log10(math.log10(nu40 + 0.7))
    z2 = math.log10(math.log10(nu100 + 0.7))
    l1, l2 = math.log10(313.15), math.log10(373.15)
    B = (z1 - z2) / (l2 - l1)
    A = z1 + B * l1
    return 10.0 ** (10.0 ** (A - B * math.log10(t_C + 273.15))) - 0.7


def test_friction_terms_hand_worked() -> None:
    """Palmgren's friction model as given in the rolling-bearing literature
    (M0 = 1e-7 f0 (nu n)^(2/3) dm^3, M1 = f1 P1 dm; deep groove ball f1 = 0.0009
    (P0/C0)^0.5, P1 = max(3Fa - 0.1Fr, Fr): factors from memory).

    Hand-worked: d = 40, D = 80 -> dm = 60 mm; f0 = 2, nu = 20 mm^2/s, n = 3000 rpm:
    nu*n = 60000, 60000^(2/3) = 1532.6, M0 = 1e-7*2*1532.6*216000 = 66.21 N*mm.
    Fr = 2000 N, Fa = 500 N, C0 = 19000 N: P0 = max(2000, 0.6*2000 + 0.5*500) = 2000 N,
    f1 = 0.0009*(2000/19000)^0.5 = 2.9200e-4, P1 = max(1500 - 200, 2000) = 2000 N,
    M1 = 2.92e-4*2000*60 = 35.04 N*mm; power (66.21 + 35.04)*2*pi*3000/60/1000 = 31.81 W.
    """
    b = Bearing(id="A", kind=BearingKind.DEEP_GROOVE_BALL, x_mm=0.0, d_mm=40.0, D_mm=80.0,
                C_N=30000.0, C0_N=19000.0)
    fac = friction_factors(b, grease=False)
    assert fac.f0 == 2.0 and not fac.f0_given
    M0 = viscous_moment(fac.f0, 20.0, 3000.0, b.mean_diameter_mm)[0]
    assert pytest.approx(66.21, rel=1e-3) == M0
    f1 = f1_value(fac, static_load_ratio(b, 2000.0, 500.0))[0]
    assert f1 == pytest.approx(2.9200e-4, rel=1e-3)
    P1 = friction_load(b, 2000.0, 500.0)[0]
    assert P1 == 2000.0
    M1 = load_moment(f1, P1, 60.0)[0]
    assert pytest.approx(35.04, rel=1e-3) == M1
    assert friction_power_W(M0 + M1, 3000.0)[0] == pytest.approx(31.81, rel=1e-3)
    # axial-heavy: P1 = 3*Fa - 0.1*Fr = 3*2000 - 100 = 5900 N
    assert friction_load(b, 1000.0, 2000.0)[0] == pytest.approx(5900.0)


def test_viscous_moment_branches_meet() -> None:
    """Palmgren's two M0 branches (from memory): 160e-7 f0 dm^3 below nu*n = 2000 is
    the high branch's value at 2000 (2000^(2/3) = 158.7 ~ 160) to within 1 %; a second
    route to the recalled constant.
    """
    low = viscous_moment(1.0, 1.0, 1999.0, 50.0)[0]
    high = viscous_moment(1.0, 1.0, 2000.0, 50.0)[0]
    assert low == pytest.approx(160e-7 * 50.0**3)
    assert high == pytest.approx(1e-7 * 2000.0 ** (2.0 / 3.0) * 50.0**3)
    assert abs(low / high - 1.0) < 0.01


def test_heat_balance_closed_form_linear_friction() -> None:
    """Closed form (hand solution of a linear balance): with a friction heat linear in
    the viscosity, q = a*nu, and a viscosity linear in T, nu = nu0 - b*(T - T0),
    a*(nu0 - b*(T - T0)) = H*(T - Ts) gives T = (a*nu0 + a*b*T0 + H*Ts)/(H + a*b).
    Cross-check: scipy brentq on the same equation.
    """
    a, nu0, bb, T0, H, Ts = 2.5, 120.0, 1.2, 40.0, 8.0, 20.0

    def q(t: np.ndarray) -> np.ndarray:
        return a * np.maximum(nu0 - bb * (t - T0), 0.0)

    sol = solve_temperature(q, H, Ts, 200.0, 3)
    expected = (a * nu0 + a * bb * T0 + H * Ts) / (H + a * bb)
    assert np.all(sol.converged)
    np.testing.assert_allclose(sol.temperature_C, expected, rtol=1e-9)
    root = brentq(lambda t: float(q(np.array([t]))[0]) - H * (t - Ts), Ts, 200.0,
                  xtol=1e-12)
    assert sol.temperature_C[0] == pytest.approx(root, rel=1e-9)


def test_heat_balance_runaway_is_flagged() -> None:
    """Common practice, no source: no steady temperature below the search limit is a
    result (runaway), not an exception; here q = 1000 W constant, H = 1 W/K, Ts = 20,
    the balance would be at 1020 degC above the 250 degC limit.
    """
    sol = solve_temperature(lambda t: np.full(t.shape, 1000.0), 1.0, 20.0, 250.0, 2)
    assert np.all(sol.runaway) and not np.any(sol.converged)
    assert np.all(np.isnan(sol.temperature_C))


@pytest.fixture(scope="module")
def demo():  # type: ignore[no-untyped-def]
    model = load_model(MODEL)
    return model, analyse(model)


def test_demo_balance_against_scipy(demo) -> None:  # type: ignore[no-untyped-def]
    """Independent solve: rebuild the heat generated from Palmgren's M0 (formula by hand),
    the Walther viscosity by hand (ASTM D341) and the load terms of the result, and find
    the root of Q(T) = h*A*(T - T_amb) with scipy brentq; it matches the computed
    temperature of every duty case.
    """
    model, res = demo
    th = res.thermal
    assert th is not None
    G = 15.0 * 0.9
    extra = 350.0
    lub = model.lubrication
    for k, cid in enumerate(th.case_ids):
        if not th.evaluated[k]:
            continue
        n = np.array([abs(next(ld for ld in b.loads if ld.case == cid).speed_rpm)
                      for b in res.bearings])
        dm = np.array([b.bearing.mean_diameter_mm for b in res.bearings])
        M1 = th.M1_Nmm[:, k] if th.source[k] == "computed" else None
        if M1 is None:
            continue

        def f(t: float, n=n, dm=dm, M1=M1) -> float:
            nu = _walther_by_hand(t, lub.nu1_at_t1_mm2_s, lub.nu2_at_t2_mm2_s)
            nun = nu * n
            M0 = np.where(nun >= 2000, 1e-7 * th.f0 * nun ** (2 / 3) * dm**3,
                          160e-7 * th.f0 * dm**3)
            q = float(np.sum((M0 + M1) * 2 * math.pi * n / 60 / 1000)) + extra
            return q - G * (t - 25.0)

        root = brentq(f, 25.0, 250.0, xtol=1e-10)
        assert th.computed_C[k] == pytest.approx(root, abs=1e-5)
        assert th.used_C[k] == th.computed_C[k]


def test_life_uses_walther_viscosity_at_computed_temperature(demo) -> None:  # type: ignore[no-untyped-def]
    """ISO 281:2007 kappa needs nu at the operating temperature: the life engine's nu is
    the Walther (ASTM D341) viscosity at the computed temperature, worked by hand here;
    a typed case keeps its typed temperature and shows the computed one beside it.
    """
    model, res = demo
    th = res.thermal
    lub = model.lubrication
    for b in res.bearings:
        life = b.life
        assert life is not None
        for k, cid in enumerate(life.case_ids):
            if not life.dynamic[k]:
                continue
            j = th.case_ids.index(cid)
            nu = _walther_by_hand(float(th.used_C[j]), lub.nu1_at_t1_mm2_s,
                                  lub.nu2_at_t2_mm2_s)
            assert life.nu_mm2_s[k] == pytest.approx(nu, rel=1e-9)
    j = th.case_ids.index("reverse")
    assert th.source[j] == "typed" and th.used_C[j] == 70.0
    assert math.isfinite(th.computed_C[j]) and th.computed_C[j] != 70.0


def test_demo_json_keys(tmp_path: Path) -> None:
    """The JSON contract per bearing and case (issue 18): friction_moment_Nmm,
    power_loss_W, temperature_C, temperature_source; friction power is M*omega
    (recomputed here from the moment and the speed).
    """
    out = tmp_path / "r.json"
    assert main(["check", str(MODEL), "--json", str(out)]) == 0
    data = json.loads(out.read_text())
    assert data["thermal"]["verdict"] == "pass"
    for b in data["bearings"]:
        speeds = {ld["case"]: ld["speed_rpm"] for ld in b["loads"]}
        for e in b["thermal"]:
            for key in ("friction_moment_Nmm", "power_loss_W", "temperature_C",
                        "temperature_source"):
                assert key in e
            if e["temperature_source"] in ("typed", "computed"):
                omega = 2 * math.pi * abs(speeds[e["case"]]) / 60
                assert e["power_loss_W"] == pytest.approx(
                    e["friction_moment_Nmm"] * omega / 1000, rel=1e-9)
    cases = {c["case"]: c for c in data["thermal"]["cases"]}
    c = cases["forward_full"]
    assert c["converged"] and c["temperature_source"] == "computed"
    assert c["total_power_loss_W"] == pytest.approx(
        c["bearing_power_loss_W"] + 350.0, rel=1e-12)
    assert c["bearing_power_loss_W"] == pytest.approx(
        sum(c["shaft_power_loss_W"].values()), rel=1e-12)


def _variant(tmp_path: Path, thermal: dict) -> Path:  # type: ignore[type-arg]
    raw = yaml.safe_load(MODEL.read_text())
    raw["thermal"] = thermal
    p = tmp_path / "m.yaml"
    p.write_text(yaml.safe_dump(raw))
    return p


def test_runaway_is_a_failed_check_exit_1(tmp_path: Path, capsys) -> None:  # type: ignore[no-untyped-def]
    """Common practice, no source: a housing that sheds 0.15 W/K against 5 kW would settle
    above 30 000 degC, far beyond the search limit: thermal runaway, reported as a failed
    check (exit 1), the lives not evaluated, no traceback.
    """
    p = _variant(tmp_path, {"ambient": "25 degC", "heat_transfer_coefficient": "15 W/(m^2*K)",
                            "area": "0.01 m^2", "extra_loss": "5 kW"})
    out = tmp_path / "r.json"
    assert main(["check", str(p), "--json", str(out)]) == 1
    data = json.loads(out.read_text())
    assert data["thermal"]["verdict"] == "fail"
    assert any(c["runaway"] for c in data["thermal"]["cases"])
    assert data["verdict"] == "fail"
    assert "runaway" in capsys.readouterr().err + json.dumps(data["warnings"])


def test_hot_case_fails_temperature_check(tmp_path: Path) -> None:
    """Common practice, no source: a balance above the user's maximum fails the check."""
    p = _variant(tmp_path, {"ambient": "25 degC", "thermal_resistance": "0.2 K/W",
                            "extra_loss": "350 W", "max_temperature": "60 degC"})
    model = load_model(p)
    th = analyse(model).thermal
    assert th is not None and th.verdict == "fail"
    hot = th.evaluated & ~th.temperature_ok
    assert np.any(hot) and np.all(th.used_C[hot] > 60.0)


@pytest.mark.parametrize(("thermal", "field"), [
    ({"ambient": "20 degC", "heat_transfer_coefficient": 0, "area": "1 m^2"},
     "thermal.heat_transfer_coefficient"),
    ({"ambient": "20 degC", "heat_transfer_coefficient": "-3 W/(m^2*K)", "area": "1 m^2"},
     "thermal.heat_transfer_coefficient"),
    ({"ambient": "20 degC", "heat_transfer_coefficient": "15 W/(m^2*K)"}, "thermal.area"),
    ({"ambient": "20 degC", "oil_flow": "2 l/min"}, "thermal.oil_inlet"),
    ({"ambient": "20 degC", "thermal_resistance": "0.2 K/W", "friction": {"in_A": {"f0": 0}}},
     "thermal.friction.in_A.f0"),
    ({"ambient": "20 degC", "thermal_resistance": "0.2 K/W",
      "friction": {"in_A": {"f1": 0.5}}},
     "thermal.friction.in_A.f1"),
    ({"ambient": "20 degC"}, "thermal"),
])
def test_bad_thermal_input_names_field(tmp_path: Path, thermal: dict, field: str,  # type: ignore[type-arg]
                                       capsys) -> None:  # type: ignore[no-untyped-def]
    """Bad heat-balance input is a user mistake: exit 2 naming the field."""
    p = _variant(tmp_path, thermal)
    with pytest.raises(ModelError) as exc:
        load_model(p)
    assert exc.value.field == field
    assert main(["check", str(p)]) == 2
    assert field in capsys.readouterr().err


def test_oil_flow_sets_the_sink() -> None:
    """Energy balance of a circulating flow (rho*c*Q): with no conductance, the oil leaves
    at T = T_in + Q_gen/(rho*c*Q). Check: rho*c*Q = 870*1950*2e-3/60 = 56.55 W/K, and the
    solved balance closes Q_gen = 56.55*(T - 40) to the solver tolerance.
    """
    text = MODEL.read_text().replace(
        "  heat_transfer_coefficient: 15 W/(m^2*K)   # still air around a cast housing\n"
        "  area: 0.9 m^2\n", "  oil_flow: 2 l/min\n  oil_inlet: 40 degC\n")
    model = load_model_text(text, str(MODEL))
    hb = model.thermal
    assert hb is not None
    assert hb.oil_flow_W_K == pytest.approx(870 * 1950 * 2e-3 / 60)
    th = analyse(model, with_shaft_checks=False).thermal
    k = th.case_ids.index("forward_full")
    assert th.total_power_W[k] == pytest.approx(hb.oil_flow_W_K * (th.used_C[k] - 40.0),
                                                rel=1e-6)


def test_report_and_table_show_the_balance(demo) -> None:  # type: ignore[no-untyped-def]
    """The report and the terminal table carry the friction, loss and temperature of
    every bearing and duty case, and the caution that the estimate does not replace a
    measured temperature (issue 18, done-when; common practice, no source).
    """
    from shaftsys.report.html import render_report
    from shaftsys.report.thermal_table import thermal_table

    _, res = demo
    th = res.thermal
    text = thermal_table(res)
    html = render_report(res, date="2026-01-01")
    assert 'id="thermal"' in html and "measured temperature" in html
    n_rows = int(np.sum(th.evaluated)) * (len(th.bearing_ids) + 1)
    assert len(text.splitlines()) == n_rows + 4
    k = th.case_ids.index("forward_full")
    assert f"{th.power_loss_W[0, k]:.1f}" in text
    assert f"{th.used_C[k]:.1f}" in html


def test_newton_step_onto_the_bracket_end_is_kept():
    """Closed form: a heat a - b*T against H*(T - T_sink) balances at
    T = (a + H*T_sink)/(b + H) (hand-derived). Newton lands on it in one step; where
    f(T) is then a round-off above zero the bracket's lower end is T itself, and the
    step back onto it must be kept (it used to bisect away and crawl back)."""
    rng = np.random.default_rng(3)
    a = rng.uniform(30.0, 300.0, 2000)          # W: rises of 1..10 K at H = 30 W/K
    b = rng.uniform(0.0, 1.0, 2000) * a / 400.0  # heat >= 0 up to the search limit
    H, sink = 30.0, 25.0
    sol = solve_temperature(lambda t: a - b * t, H, sink, 400.0, a.size)
    assert sol.converged.all()
    assert np.allclose(sol.temperature_C, (a + H * sink) / (b + H), rtol=0, atol=1e-9)
    assert sol.iterations.max() <= 4
