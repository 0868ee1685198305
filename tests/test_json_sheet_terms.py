"""The JSON carries what the calculation sheet uses: the forces each element puts on its
shaft per case (mesh components, belt strand tensions) and, per bearing and case, the
X/Y row decision, f0*Fa/C0, ec*Cu/P and the case's share of the Palmgren-Miner damage.

Each value is checked against an outside relation, not against its own formula:
gear mesh components against Shigley's helical-gear force relations, belt tensions
against the torque balance and the strand geometry, the X, Y row and e against ISO
281:2007 Table 3, ec*Cu/P through the ISO 281:2007 aISO equation, and the damage
fractions through a second route (time shares over case lives in hours).
"""

from __future__ import annotations

import json
import logging
import math
from collections.abc import Iterator
from pathlib import Path
from typing import Any

import numpy as np
import pytest

from shaftsys.cli.main import main
from shaftsys.io.loader import load_model
from shaftsys.model import Gear, Pulley

ROOT = Path(__file__).resolve().parents[1]
REDUCER = ROOT / "models" / "belt_reducer.yaml"
FAN = ROOT / "models" / "fan_drive.yaml"


@pytest.fixture(autouse=True)
def _quiet_engine() -> Iterator[None]:
    logging.disable(logging.WARNING)
    yield
    logging.disable(logging.NOTSET)


def _json(model: Path, tmp_path: Path) -> dict[str, Any]:
    out = tmp_path / f"{model.stem}.json"
    assert main(["check", str(model), "--json", str(out), "-q"]) in (0, 1)
    return dict(json.loads(out.read_text()))


@pytest.fixture(scope="module")
def reducer(tmp_path_factory: pytest.TempPathFactory) -> dict[str, Any]:
    return _json(REDUCER, tmp_path_factory.mktemp("j"))


def test_gear_mesh_components_follow_the_helical_force_relations(reducer: dict[str, Any]
                                                                 ) -> None:
    """Shigley (Mechanical Engineering Design, helical gear forces): W_r = W_t tan(phi_t)
    with tan(phi_t) = tan(phi_n) / cos(psi), W_a = W_t tan(psi); the driving pinion's
    W_t = T / r. The reported tangential/radial/axial components of the force on each
    shaft, decomposed at the link's mesh angle, are these magnitudes."""
    model = load_model(REDUCER)
    gears = {e.id: e for s in model.shafts for e in s.elements if isinstance(e, Gear)}
    seen = 0
    for s in reducer["shafts"]:
        for el in s["elements"]:
            if el["id"] not in gears:
                continue
            g = gears[el["id"]]
            tan_phi_t = math.tan(math.radians(g.normal_pressure_angle_deg)) / math.cos(
                math.radians(g.helix_angle_deg))
            for c in el["cases"]:
                Wt = abs(c["tangential_N"])
                if Wt < 1.0:
                    continue
                assert abs(c["radial_N"]) == pytest.approx(Wt * tan_phi_t, rel=1e-9)
                assert abs(c["axial_N"]) == pytest.approx(
                    Wt * math.tan(math.radians(g.helix_angle_deg)), rel=1e-9)
                assert Wt == pytest.approx(c["W_t_N"], rel=1e-12)
                # the separating force pushes the shaft away from the mesh
                assert c["radial_N"] > 0.0
                seen += 1
    assert seen >= 16
    pinion = next(e for s in reducer["shafts"] for e in s["elements"] if e["id"] == "pinion1")
    c0 = pinion["cases"][0]
    assert abs(c0["M_shaft_Nmm"][0]) / (gears["pinion1"].pitch_diameter_mm / 2) == \
        pytest.approx(c0["W_t_N"], rel=1e-9)


def test_belt_strand_tensions_balance_the_torque_and_give_the_hub_force(
        reducer: dict[str, Any]) -> None:
    """Torque balance of a pulley, T = (T1 - T2) D/2 (Shigley, flexible elements), and the
    hub force as the vector sum of the two strand tensions at their strand angles (plain
    statics): both from the reported tensions against the reported shaft force."""
    model = load_model(REDUCER)
    pulley = next(e for s in model.shafts for e in s.elements if isinstance(e, Pulley))
    el = next(e for s in reducer["shafts"] for e in s["elements"] if e["id"] == pulley.id)
    for c in el["cases"]:
        T1, T2 = c["T_tight_N"], c["T_slack_N"]
        assert T1 >= T2 >= 0.0
        assert (T1 - T2) * pulley.diameter_mm / 2 == pytest.approx(
            abs(c["M_shaft_Nmm"][0]), rel=1e-9, abs=1e-6)
        a1, a2 = (math.radians(c["tight_strand_angle_deg"]),
                  math.radians(c["slack_strand_angle_deg"]))
        hub = np.array([T1 * math.cos(a1) + T2 * math.cos(a2),
                        T1 * math.sin(a1) + T2 * math.sin(a2)])
        assert c["F_shaft_N"][1:] == pytest.approx(hub.tolist(), rel=1e-9, abs=1e-6)


def _cases(data: dict[str, Any], bearing: str) -> list[dict[str, Any]]:
    b = next(b for b in data["bearings"] if b["id"] == bearing)
    return list(b["life"]["cases"])


# ISO 281:2007 Table 3, single-row deep groove ball bearing (normal clearance), from
# memory: (f0*Fa/C0r, e); X = 0.56 above e. Cross-checked below: the engine's e at each
# reported f0*Fa/C0 must be this table's linear interpolation.
ISO281_TABLE3 = ((0.172, 0.19), (0.345, 0.22), (0.689, 0.26), (1.03, 0.28), (1.38, 0.30),
                 (2.07, 0.34), (3.45, 0.38), (5.17, 0.42), (6.89, 0.44))


def test_deep_groove_row_decision_and_e(reducer: dict[str, Any]) -> None:
    """Per case: e is Table 3 at f0*Fa/C0 (clamped at the table's ends) and the case takes
    X = 0.56 exactly when Fa/Fr > e (ISO 281:2007, 6.2, Table 3)."""
    x_tab, e_tab = zip(*ISO281_TABLE3, strict=True)
    checked = 0
    for bid in ("in_A", "in_B"):
        for c in _cases(reducer, bid):
            rel = c["f0_Fa_over_C0"]
            assert rel is not None and rel >= 0.0
            assert c["e"] == pytest.approx(float(np.interp(rel, x_tab, e_tab)), rel=1e-9)
            above = c["Fa_over_Fr_above_e"]
            assert above == (c["Fa_over_Fr"] > c["e"])
            assert (c["X"] == pytest.approx(0.56)) if above else (c["X"] == 1.0)
            checked += 1
    assert checked == 10
    assert any(c["Fa_over_Fr_above_e"] for c in _cases(reducer, "in_A"))


def _a_iso_ball(kappa: float, ec_cu_p: float) -> float:
    """ISO 281:2007 equation for radial ball bearings (from memory), 1 <= kappa < 4."""
    term = (2.5671 - 1.9987 / kappa ** 0.071739) ** 0.83 * ec_cu_p ** (1.0 / 3.0)
    return min(0.1 * (1.0 - term) ** -9.3, 50.0)


def test_ec_cu_over_p_is_the_argument_of_a_iso(reducer: dict[str, Any]) -> None:
    """The reported ec*Cu/P with the reported kappa reproduces the reported aISO through
    the standard's equation, written out here independently of the engine."""
    checked = 0
    for bid in ("in_A", "in_B"):
        for c in _cases(reducer, bid):
            if not c["dynamic"] or c["kappa"] is None or not 1.0 <= c["kappa"] < 4.0:
                continue
            assert c["aISO"] == pytest.approx(_a_iso_ball(c["kappa"], c["ec_Cu_over_P"]),
                                              rel=1e-9)
            checked += 1
    assert checked >= 3


def test_damage_fractions_by_a_second_route(reducer: dict[str, Any]) -> None:
    """Palmgren-Miner in time (ISO 281:2007, 9.4 idea, from memory): the share of damage of
    case i is (t_i / Lnm_h,i) / sum_j (t_j / Lnm_h,j); the engine's fraction in revolutions
    (U_i / (aISO_i L10_i)) must equal it, and the fractions sum to 1."""
    shares = {c["id"]: c["share"] for c in reducer["cases"]}
    for b in reducer["bearings"]:
        cases = [c for c in b["life"]["cases"] if c["dynamic"]]
        frac = np.array([c["damage_fraction"] for c in cases])
        assert frac.sum() == pytest.approx(1.0, rel=1e-12)
        d = np.array([shares[c["case"]] / c["Lnm_h"] for c in cases])
        assert frac == pytest.approx(d / d.sum(), rel=1e-9)
        static = [c for c in b["life"]["cases"] if not c["dynamic"]]
        assert all(c["damage_fraction"] is None for c in static)


def test_single_shaft_elements_use_their_own_angles(tmp_path: Path) -> None:
    """A single-shaft model (no machine links): each element's decomposition uses its own
    mesh/belt angle, and the element forces with the weights and the bearing reactions
    close the force balance of the shaft (statics) in every case."""
    data = _json(FAN, tmp_path)
    shaft = data["shafts"][0]
    for k, case in enumerate(shaft["cases"]):
        total = np.zeros(3)
        for el in shaft["elements"]:
            c = el["cases"][k]
            assert c["case"] == case["case"]
            total += np.array(c["F_shaft_N"]) + np.array(c["weight_N"])
        for b in data["bearings"]:
            ld = next(x for x in b["loads"] if x["case"] == case["case"])
            total -= np.array([ld["Fx_N"], ld["Fy_N"], ld["Fz_N"]])
        scale = max(1.0, max(abs(x["Fr_N"]) for b in data["bearings"] for x in b["loads"]))
        # shaft weight (distributed) is the only other load: it acts along gravity
        assert abs(total[2]) < 1e-6 * scale and abs(total[0]) < 1e-6 * scale
