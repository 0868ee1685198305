"""Examples run as tests and their headline figures are checked."""

from __future__ import annotations

import importlib.util
import math
from pathlib import Path

import pytest

EXAMPLES = Path(__file__).resolve().parent.parent / "examples"


def _load(name: str):
    spec = importlib.util.spec_from_file_location(name, EXAMPLES / f"{name}.py")
    assert spec is not None and spec.loader is not None
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def test_fan_shaft_life_table(capsys):
    lives = _load("fan_shaft_life_table").main()
    out = capsys.readouterr().out
    assert "full_flow" in out and "C_required_N" in out
    # headline: both supports of the demo have a finite life above the 40 000 h target
    assert set(lives) == {"A", "B"}
    assert all(math.isfinite(v) and v > 40000 for v in lives.values())


def _demo_thrust_N() -> dict[str, float]:
    """Axial force on the fan shaft per case, read from the demo file with PyYAML.

    The impeller thrust is the only axial load of the demo (gravity acts along -y), so
    by statics (sum Fx = 0) the locating bearing A carries all of it.
    """
    import yaml

    raw = yaml.safe_load((EXAMPLES.parent / "models" / "fan_drive.yaml").read_text("utf-8"))
    thrust: dict[str, float] = {}
    for case in raw["cases"]:
        force = (case.get("loads") or {}).get("impeller_thrust", {}).get("force", [0])
        value = force[0]
        thrust[case["id"]] = abs(float(str(value).split()[0])) if value else 0.0
    return thrust


def test_add_own_bearing_type(capsys):
    """Headline figures of the special bearing, redone by hand from its spectrum.

    P = Fr for Fa/Fr <= e, else X*Fr + Y*Fa (ISO 281:2007, 6.2, with the maker's X, Y,
    e); Pm = (sum U_i P_i^3)^(1/3) with revolution weights U_i = n_i t_i / sum n_j t_j
    (Palmgren-Miner, ISO 281:2007 / Shigley ch. 11); L10 = (C/Pm)^3 * 10^6 rev,
    L10_h = L10 / (60 n_m), n_m = sum t_i n_i / sum t_i (ISO 281:2007, 6.3);
    s0 = C0 / max(Fr, 0.6 Fr + Y0 Fa) (ISO 76:2006, X0 = 0.6 for radial ball bearings).
    """
    module = _load("add_own_bearing_type")
    got = module.main()
    out = capsys.readouterr().out
    assert "special ball bearing" in out and "built-in bearing at A" in out
    maker = module.MAKER_DATA
    C, C0, e, X, Y, Y0 = (maker[k] for k in ("C_N", "C0_N", "e", "X", "Y", "Y0"))

    # the spectrum is the solver's: Fa of the locating bearing is the impeller thrust
    thrust = _demo_thrust_N()
    for case, fa in zip(got["cases"], got["Fa_N"], strict=True):
        assert fa == pytest.approx(thrust[case], abs=1e-6), case

    expected_P = []
    for fr, fa in zip(got["Fr_N"], got["Fa_N"], strict=True):
        expected_P.append(fr if fa / fr <= e else X * fr + Y * fa)
    dyn = got["dynamic"]
    for k in range(len(dyn)):
        if dyn[k]:
            assert got["P_N"][k] == pytest.approx(expected_P[k], rel=1e-12)
    # the full-flow case is above e, so the maker's X and Y are really used
    full = got["cases"].index("full_flow")
    assert got["Fa_N"][full] / got["Fr_N"][full] > e
    assert (got["X"][full], got["Y"][full]) == (X, Y)

    n = [abs(v) for v in got["speed_rpm"]]
    t = got["duration"]
    rev = [n[k] * t[k] if dyn[k] else 0.0 for k in range(len(n))]
    Pm = (sum(r * P**3 for r, P in zip(rev, expected_P, strict=True)) / sum(rev)) ** (1 / 3)
    assert got["P_eq_N"] == pytest.approx(Pm, rel=1e-12)
    n_m = sum(rev) / sum(t)
    assert got["n_m_rpm"] == pytest.approx(n_m, rel=1e-12)
    L10_h = (C / Pm) ** 3 * 1e6 / (60.0 * n_m)
    assert got["L10_h"] == pytest.approx(L10_h, rel=1e-12)

    s0 = min(C0 / max(fr, 0.6 * fr + Y0 * fa)
             for fr, fa in zip(got["Fr_N"], got["Fa_N"], strict=True))
    assert got["s0"] == pytest.approx(s0, rel=1e-12)
    # the headline: the special bearing passes the 40 000 h target of the demo
    assert got["ok"] is True
    assert got["Lnm_h"] > 40000 and got["L10_h"] > 40000
