"""Design studies with a heat balance: temperature, power loss and thermal verdict per variant.

The models are invented (``tests/models/roll_thermal.yaml``, the bundled
``models/belt_reducer_thermal.yaml``). References, named at each check:

* the single run, :func:`shaftsys.analyse` of the same moved model (``paths.model_with``):
  the study must agree to 1e-9 relative (the rule of issue 18 and of the batched study);
* an independent route for the temperature: Palmgren's friction moment as given in the
  rolling-bearing literature, M = 1e-7 f0 (nu n)^(2/3) dm^3 + f1 P1 dm [N*mm], written
  out here (the model gives f0 and f1 for both bearings, so no tabulated factor enters;
  nothing pushes the shaft along its axis, so P1 = Fr), Walther's viscosity (ASTM D341)
  written out here, and the balance sum(M omega) = h A (T - T_ambient) solved by scipy's
  brentq;
* the duration-weighted mean of the study's power-loss columns is the definition of
  DEVELOPERS.md ("Design studies"), recomputed here from the single run's per-case table.
"""

from __future__ import annotations

import logging
import math
from dataclasses import replace
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from scipy.optimize import brentq

import shaftsys
from shaftsys.cli import main
from shaftsys.errors import NumericalError
from shaftsys.study.paths import model_with
from shaftsys.study.section import read_study_section, study_from_section
from shaftsys.study.sweep import evaluate_values, make_study, results_frame, sweep

ROOT = Path(__file__).resolve().parent.parent
ROLL = ROOT / "tests" / "models" / "roll_thermal.yaml"
BELT = ROOT / "models" / "belt_reducer_thermal.yaml"

THERMAL_COLUMNS = ("temperature_max_C", "computed_temperature_max_C", "power_loss_W",
                   "power_loss_max_W", "heat_balance_speed_factor_min")


@pytest.fixture(scope="module")
def roll():
    logging.getLogger("shaftsys").setLevel(logging.ERROR)
    return shaftsys.load_model(str(ROLL))


@pytest.fixture(scope="module")
def roll_study(roll):
    section, name = read_study_section(ROLL)
    return study_from_section(roll, section, name)


@pytest.fixture(scope="module")
def roll_frame(roll_study):
    return sweep(roll_study)


def _weighted_mean(model, per_case):
    """sum t_k W_k / sum t_k over the duty cases (DEVELOPERS.md, "Design studies")."""
    duty = [k for k, c in enumerate(model.cases) if c.kind.value == "duty"]
    t = np.array([model.cases[k].duration for k in duty])
    return float(np.sum(t * np.asarray(per_case)[duty]) / t.sum())


def _check_against_single_run(model, study, df, i, rtol=1e-9):
    """Variant ``i`` of ``df`` against shaftsys.analyse of the same moved model."""
    values = study.values_block(i, i + 1)[0]
    variant, reason = model_with(model, study.quantities, values)
    assert reason == "" and bool(df.loc[i, "valid"])
    res = shaftsys.analyse(variant, with_shaft_checks=False)
    th = res.thermal
    ev = th.evaluated
    row = df.loc[i]
    assert bool(row["thermal_runaway"]) == th.any_runaway
    assert bool(row["thermal_ok"]) == (th.verdict == "pass")
    lives_ok = True
    for j, b in enumerate(res.bearings):
        bid = b.bearing.id
        if th.any_runaway:       # as check: no steady temperature, no life evaluated
            assert b.life is None and math.isnan(row[f"{bid}.Lnm_h"])
            assert not row[f"{bid}.ok"]
            assert math.isnan(row[f"{bid}.temperature_max_C"])
            lives_ok = False
            continue
        assert row[f"{bid}.Lnm_h"] == pytest.approx(b.life.Lnm_h, rel=rtol)
        assert row[f"{bid}.margin"] == pytest.approx(b.life.margin, rel=rtol)
        assert bool(row[f"{bid}.ok"]) == (b.verdict == "pass")   # life, statics, operating
        lives_ok &= b.verdict == "pass"
        assert row[f"{bid}.temperature_max_C"] == pytest.approx(
            float(np.max(th.used_C[ev])), rel=rtol)
        assert row[f"{bid}.power_loss_W"] == pytest.approx(
            _weighted_mean(variant, th.power_loss_W[j]), rel=rtol)
        assert row[f"{bid}.power_loss_max_W"] == pytest.approx(
            float(np.max(th.power_loss_W[j, ev])), rel=rtol)
    if not th.any_runaway:
        assert row["power_loss_W"] == pytest.approx(
            _weighted_mean(variant, th.total_power_W), rel=rtol)
        assert row["computed_temperature_max_C"] == pytest.approx(
            float(np.max(th.computed_C[ev])), rel=rtol)
        assert row["system_life_h"] == pytest.approx(res.system_life_h, rel=rtol)
    assert row["heat_balance_speed_factor_min"] == pytest.approx(
        float(np.min(th.speed_factor[ev])), rel=rtol)
    # the variant passes as the single run's bearings and heat balance pass
    assert bool(row["ok"]) == (lives_ok and th.verdict == "pass")
    return res


def test_batched_study_matches_the_single_run(roll, roll_study, roll_frame):
    """Reference: shaftsys.analyse of each moved model, 1e-9 relative (issue 18)."""
    df = roll_frame
    assert (df["method"] == "batched").all()
    for i in range(roll_study.n_variants):
        _check_against_single_run(roll, roll_study, df, i)
    # the study's range covers every outcome of the heat balance (so each branch is
    # checked above): a pass, a bearing beyond its heat-balance speed, a hot housing,
    # and runaway
    reasons = " | ".join(df["thermal_reason"])
    assert df["ok"].iloc[0] and df["thermal_reason"].iloc[0] == ""
    assert "heat-balance speed" in reasons and "above the maximum 80 degC" in reasons
    assert df["thermal_runaway"].iloc[-1] and not df["ok"].iloc[-1]
    assert df["thermal_reason"].iloc[-1].startswith("thermal runaway in case 'fast'")
    assert df["valid"].all()        # runaway is a failed variant, not an invalid one


def _walther(t_C, nu40, nu100):
    """ASTM D341 (Walther): log10 log10(nu + 0.7) = A - B log10(T [K]), by hand."""
    z1 = math.log10(math.log10(nu40 + 0.7))
    z2 = math.log10(math.log10(nu100 + 0.7))
    l1, l2 = math.log10(313.15), math.log10(373.15)
    B = (z1 - z2) / (l2 - l1)
    return 10.0 ** (10.0 ** (z1 + B * l1 - B * math.log10(t_C + 273.15))) - 0.7


@pytest.mark.parametrize("i", [0, 3])
def test_temperature_and_life_by_an_independent_route(roll, roll_study, roll_frame, i):
    """Reference: Palmgren's M = 1e-7 f0 (nu n)^(2/3) dm^3 + f1 Fr dm (nu n >= 2000;
    f0 = 2, f1 = 0.001 as the model file gives them), Walther (ASTM D341) and
    sum(M omega) = h A (T - T_amb) solved by scipy brentq per case. The lives: the same
    variant analysed with those temperatures typed into its cases and no heat balance
    (the life engine's typed-temperature route)."""
    values = roll_study.values_block(i, i + 1)[0]
    variant, _ = model_with(roll, roll_study.quantities, values)
    res = shaftsys.analyse(variant, with_shaft_checks=False)
    dm = 0.5 * (50.0 + 90.0)
    hA = 10.0 * 0.3                              # W/K, from the model file
    temps = {}
    for case in variant.cases:
        n = abs(case.drives["roll"].speed_rpm)
        Fr = [next(ld.Fr_N for ld in b.loads if ld.case == case.id) for b in res.bearings]

        def surplus(T, n=n, Fr=Fr):
            nu = _walther(T, 32.0, 5.4)
            assert nu * n >= 2000.0             # the upper branch of M0
            heat = sum((1e-7 * 2.0 * (nu * n) ** (2.0 / 3.0) * dm**3 + 0.001 * f * dm)
                       * 2.0 * math.pi * n / 60.0 / 1000.0 for f in Fr)
            return heat - hA * (T - 25.0)

        temps[case.id] = brentq(surplus, 25.0, 120.0, xtol=1e-13, rtol=1e-15)
    row = roll_frame.loc[i]
    assert row["temperature_max_C"] == pytest.approx(max(temps.values()), rel=1e-10)
    typed = replace(variant, thermal=None, cases=tuple(
        replace(c, temperature_C=temps[c.id]) for c in variant.cases))
    ref = shaftsys.analyse(typed, with_shaft_checks=False)
    for b in ref.bearings:
        assert row[f"{b.bearing.id}.Lnm_h"] == pytest.approx(b.life.Lnm_h, rel=1e-9)


@pytest.mark.parametrize("i", [0, 1])
def test_heat_balance_speed_by_an_independent_route(roll, roll_study, roll_frame, i):
    """Reference: the factor s on a case's speeds at which Palmgren's friction heat at
    T_ref = ambient + 50 K (the model's default reference rise) equals h A (T_ref -
    T_amb), written out and solved by scipy brentq (M0 upper branch, P1 = Fr, f0 = 2,
    f1 = 0.001 as the model file gives them); the study reports the smallest over the
    duty cases (variant 0 passes with s >= 1, variant 1 fails with s < 1)."""
    values = roll_study.values_block(i, i + 1)[0]
    variant, _ = model_with(roll, roll_study.quantities, values)
    res = shaftsys.analyse(variant, with_shaft_checks=False)
    dm = 0.5 * (50.0 + 90.0)
    nu_ref = _walther(75.0, 32.0, 5.4)
    capacity = 10.0 * 0.3 * 50.0
    factors = []
    for case in variant.cases:
        n = abs(case.drives["roll"].speed_rpm)
        Fr = [next(ld.Fr_N for ld in b.loads if ld.case == case.id) for b in res.bearings]

        def surplus(s, n=n, Fr=Fr):
            assert nu_ref * n * s >= 2000.0
            return sum((1e-7 * 2.0 * (nu_ref * n * s) ** (2.0 / 3.0) * dm**3
                        + 0.001 * f * dm) * 2.0 * math.pi * n * s / 60.0 / 1000.0
                       for f in Fr) - capacity

        factors.append(brentq(surplus, 0.3, 20.0, xtol=1e-14, rtol=1e-15))
    got = roll_frame.loc[i, "heat_balance_speed_factor_min"]
    assert got == pytest.approx(min(factors), rel=1e-9)
    assert (got >= 1.0) == (i == 0)


def test_batch_of_one_is_bit_identical_with_the_heat_balance(roll_study):
    values = roll_study.values_block(0, roll_study.n_variants)
    full, _ = evaluate_values(roll_study, values)
    for i in (1, 4, 5):
        one, _ = evaluate_values(roll_study, values[i: i + 1])
        for name in ("temperature_max_C", "power_loss_W", "power_loss_max_W",
                     "total_power_loss_W", "speed_factor_min", "runaway", "ok"):
            assert np.array_equal(getattr(one.thermal, name)[0],
                                  getattr(full.thermal, name)[i], equal_nan=True), name
        assert np.array_equal(one.Lnm_h[0], full.Lnm_h[i], equal_nan=True)


def test_per_variant_path_agrees_with_the_batched_one(roll_study, roll_frame):
    """Reference: the per-variant path (one shaftsys.analyse each), 1e-9 relative."""
    idx = np.arange(roll_study.n_variants)
    values = roll_study.values_block(0, roll_study.n_variants)
    slow, method = evaluate_values(roll_study, values, batched=False)
    assert method == "analyse"
    df = results_frame(roll_study, idx, values, slow, method)
    for col in (*THERMAL_COLUMNS, "A.power_loss_W", "B.temperature_max_C", "A.Lnm_h"):
        assert np.allclose(df[col].to_numpy(float), roll_frame[col].to_numpy(float),
                           rtol=1e-9, atol=0.0, equal_nan=True), col
    for col in ("thermal_ok", "thermal_runaway", "thermal_reason", "ok"):
        assert df[col].tolist() == roll_frame[col].tolist(), col


def test_a_balance_that_does_not_converge_is_an_invalid_variant(roll_study, monkeypatch):
    """The single run's rule: a bracketed case that does not converge is a numerical
    failure (NumericalError, exit 3); in a study it marks the variant invalid."""
    import shaftsys.bearings.heat_balance as hb

    monkeypatch.setattr(hb, "MAX_ITERATIONS", 1)
    values = roll_study.values_block(0, 2)
    a, _ = evaluate_values(roll_study, values)
    assert all(r.startswith("NumericalError: heat balance of case") for r in a.reason)
    variant, _ = model_with(roll_study.model, roll_study.quantities, values[0])
    with pytest.raises(NumericalError, match="did not converge"):
        shaftsys.analyse(variant, with_shaft_checks=False)


def test_models_without_heat_balance_keep_their_columns(roll):
    """The result table of a model without thermal data is unchanged (no new columns)."""
    plain = replace(roll, thermal=None, cases=tuple(
        replace(c, temperature_C=60.0) for c in roll.cases))
    df = sweep(make_study(plain, [("bearing.A.at", [60.0, 90.0])]))
    assert not any(c.endswith(("_C", "_W")) or c.startswith("thermal") for c in df.columns)
    assert "ok" in df.columns


def test_demo_study_runs_every_variant_through_the_single_run(tmp_path):
    """The bundled thermal machine's study section (several shafts: the per-variant
    path). Reference: shaftsys.analyse of a sampled variant, 1e-9 relative."""
    rc = main(["sweep", str(BELT), "--out", str(tmp_path / "s"), "-q"])
    assert rc == 0
    df = pd.read_parquet(tmp_path / "s" / "results.parquet")
    assert len(df) == 6 and (df["method"] == "analyse").all() and df["valid"].all()
    model = shaftsys.load_model(str(BELT))
    section, name = read_study_section(BELT)
    study = study_from_section(model, section, name)
    res = _check_against_single_run(model, study, df, 5)
    # more power and speed: more loss (the friction rises with load and speed)
    assert df["power_loss_W"].iloc[5] > df["power_loss_W"].iloc[0]
    assert res.thermal is not None


def test_sweep_command_counts_thermal_failures(tmp_path, capsys):
    """``shaftsys sweep`` on the roll model's study section: exit 0 (the study ran),
    the summary counts the variants failing the heat balance and those running away
    (the same counts as the results table)."""
    import json

    rc = main(["sweep", str(ROLL), "--out", str(tmp_path / "r")])
    assert rc == 0
    summary = json.loads((tmp_path / "r" / "summary.json").read_text())
    df = pd.read_parquet(tmp_path / "r" / "results.parquet")
    assert summary["thermal_failing"] == int((~df["thermal_ok"]).sum()) >= 1
    assert summary["thermal_runaway"] == int(df["thermal_runaway"].sum()) == 1
    assert "1 of them thermal runaway" in capsys.readouterr().out
