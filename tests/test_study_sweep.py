"""Design studies: paths, variants, the batched evaluator against single-model runs.

References: the single-model path :func:`shaftsys.analyse` (agreement to 1e-9 relative,
as the issue asks); statics of a simply supported shaft for the reactions (Shigley,
*Mechanical Engineering Design*, beam reactions by moment balance; Roark's Formulas for
Stress and Strain, Table 8.1 case 1e, from memory). Expected numbers are typed in.
"""

from __future__ import annotations

import json
import logging
import math
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

import shaftsys
from shaftsys.errors import ModelError
from shaftsys.model import (
    AxialRole,
    Bearing,
    BearingKind,
    Case,
    CaseKind,
    Drive,
    Material,
    Model,
    ProcessLoad,
    Shaft,
    SolverSettings,
    Step,
)
from shaftsys.study.paths import geometry_of, model_with, parse_quantity, parse_values
from shaftsys.study.sweep import Limit, evaluate_values, make_study, sweep, write_results

ROOT = Path(__file__).resolve().parent.parent
FAN = ROOT / "models" / "fan_drive.yaml"
SPINDLE = ROOT / "models" / "spindle_3brg.yaml"


@pytest.fixture(scope="module")
def fan():
    logging.getLogger("shaftsys.bearings").setLevel(logging.ERROR)
    return shaftsys.load_model(str(FAN))


@pytest.fixture(scope="module")
def spindle():
    return shaftsys.load_model(str(SPINDLE))


def _two_bearing_model(xb=400.0):
    """Uniform d = 50 mm shaft, 600 mm; A at 0 (locating), B at xb; 10 kN down at 200 mm."""
    mat = Material("steel", 210000.0, 80769.23, 0.3, 7850.0)
    a = Bearing("A", BearingKind.DEEP_GROOVE_BALL, 0.0, 40.0, 80.0, 30000.0, 19000.0,
                axial=AxialRole.BOTH)
    b = Bearing("B", BearingKind.DEEP_GROOVE_BALL, xb, 40.0, 80.0, 30000.0, 19000.0)
    load = ProcessLoad("load", 200.0, force_N=(0.0, -10000.0, 0.0))
    shaft = Shaft("s", (Step(600.0, 50.0),), mat, (a, b), (load,))
    case = Case("run", CaseKind.DUTY, 1.0, drives={"s": Drive(1000.0)})
    return Model("two bearings", (shaft,), (case,), gravity_m_s2=(0.0, 0.0, 0.0),
                 solver=SolverSettings(shear_deformation=False, include_shaft_weight=False))


# --------------------------------------------------------------------------- paths
def test_values_range_is_inclusive_and_lists_take_units():
    assert np.allclose(parse_values("400:600:5"), [400.0, 450.0, 500.0, 550.0, 600.0])
    assert np.allclose(parse_values(["40 kN", 50000], "force"), [40000.0, 50000.0])
    with pytest.raises(ModelError, match="count"):
        parse_values("1:2:0")


def test_unknown_path_names_field_and_choices(fan):
    with pytest.raises(ModelError) as err:
        parse_quantity(fan, "bearing.Z.at")
    assert err.value.field == "study.vary" and "['A', 'B']" in str(err.value)
    with pytest.raises(ModelError, match="not a gear"):
        parse_quantity(fan, "gear.pulley.helix_angle")
    q = parse_quantity(fan, "step.fan_shaft.2.d")
    assert (q.kind, q.attr, q.target, q.unit) == ("step", "d_mm", ("2",), "mm")


def test_grid_order_and_stable_ids(fan):
    st = make_study(fan, [("bearing.B.at", [500, 560]), ("step.fan_shaft.2.d", [55, 60, 65])])
    v = st.values_block(0, st.n_variants)
    # first quantity varies slowest (C order of the cartesian product)
    assert v.tolist() == [[500, 55], [500, 60], [500, 65], [560, 55], [560, 60], [560, 65]]
    assert st.variant_id(4) == "v000004"
    assert st.values_block(3, 5).tolist() == [[560, 55], [560, 60]]


def test_seat_rule_translates_seat_and_stretches_neighbours(fan):
    """Fan shaft steps 90/60/380/60/150 mm; B (560 mm) sits on step 3 [530, 590].

    Moving B by -40 mm with its seat: step 2 becomes 380 - 40 = 340 mm, step 3 keeps
    60 mm, step 4 becomes 150 + 40 = 190 mm; overall length 740 mm is kept.
    """
    q = parse_quantity(fan, "bearing.B.at", seat=True)
    g = geometry_of(fan, "fan_shaft", [q], np.array([[520.0]]))
    assert g.step_length_mm[0].tolist() == [90.0, 60.0, 340.0, 60.0, 190.0]
    assert g.bearing_x_mm[0].tolist() == [120.0, 520.0]
    q2 = parse_quantity(fan, "bearing.B.at")  # without the rule only the bearing moves
    g2 = geometry_of(fan, "fan_shaft", [q2], np.array([[520.0]]))
    assert g2.step_length_mm[0].tolist() == [90.0, 60.0, 380.0, 60.0, 150.0]


def test_impossible_variants_are_marked_and_the_study_continues(fan):
    st = make_study(fan, {"bearing.B.at": [560, 735, 130, 900]})
    df = sweep(st)
    assert df["valid"].tolist() == [True, False, False, False]
    assert "off the shaft" in df.loc[1, "reason"]        # 735 + 10 > 740 mm
    assert "overlap" in df.loc[2, "reason"]              # A (120, B 23) and B (130, B 20)
    assert "off the shaft" in df.loc[3, "reason"]
    assert math.isnan(df.loc[1, "B.Lnm_h"]) and df.loc[0, "B.Lnm_h"] > 0
    st2 = make_study(fan, {"bearing.B.at": [720]}, seat=["B"])  # step 4: 150 - 160 < 0
    assert "length" in sweep(st2).loc[0, "reason"]


# ----------------------------------------------------------- batched vs single model
def _compare(model, study, rows, rtol=1e-9):
    values = study.values_block(0, study.n_variants)
    a, method = evaluate_values(study, values)
    assert method == "batched"
    bearings = [b.id for b in model.shafts[0].bearings]
    checked = 0
    for i in rows:
        variant, reason = model_with(model, study.quantities, values[i])
        if reason:
            assert a.reason[i] != ""
            continue
        res = shaftsys.analyse(variant, with_shaft_checks=False)
        for j, bid in enumerate(bearings):
            life = res.bearing(bid).life
            for ours, ref in ((a.Lnm_h[i, j], life.Lnm_h), (a.margin[i, j], life.margin),
                              (a.s0[i, j], life.s0),
                              (a.Fr_max_N[i, j], max(ld.Fr_N for ld in res.bearing(bid).loads)),
                              (a.Fa_max_N[i, j], max(ld.Fa_N for ld in res.bearing(bid).loads))):
                assert ours == pytest.approx(ref, rel=rtol, abs=1e-9)
            assert bool(a.ok[i, j]) == life.ok
        assert a.system_life_h[i] == pytest.approx(res.system_life_h, rel=rtol)
        lim = res.limiting_bearing
        assert bearings[a.limiting[i]] == lim
        sr = res.shafts[0]
        for j, el in enumerate(variant.shafts[0].elements):
            x = el.x_mm
            d = max(float(np.hypot(*c.displacement[np.argmin(abs(c.node_x_mm - x)), 1:3]))
                    for c in sr.cases)
            assert a.el_deflection_mm[i, j] == pytest.approx(d, rel=rtol, abs=1e-12)
        checked += 1
    assert checked >= len(rows) // 2


def test_batched_matches_analyse_fan(fan):
    """Reference: shaftsys.analyse of the same variant (1e-9 relative)."""
    # the seat step moves with B (seat rule): without it B would leave its 50 mm seat
    st = make_study(fan, [("bearing.B.at", "480:600:4"), ("step.fan_shaft.2.d", [55, 62]),
                          ("element.pulley.at", [40, 50])], seat=["B"])
    _compare(fan, st, range(st.n_variants))


def test_batched_matches_analyse_spindle(spindle):
    """Three bearings, 20 cases, helical gear thrust; reference shaftsys.analyse."""
    # B moves with its seat step; C stays on its 440..520 mm seat (452..508 mm): a
    # bearing pushed across a shoulder is an invalid variant (seat rule)
    st = make_study(spindle, [("bearing.B.at", "212:248:3"), ("spacing.B.C", "240:260:3"),
                              ("step.spindle.4.d", [66, 74]), ("bearing.A.C", [20000, 24000])],
                    seat=["B"])
    _compare(spindle, st, [0, 7, 13, 22, 35])


def test_batch_of_one_is_bit_identical(spindle):
    st = make_study(spindle, [("bearing.B.at", "212:248:7"), ("step.spindle.2.d", "60:70:6")])
    values = st.values_block(0, st.n_variants)
    full, _ = evaluate_values(st, values)
    for i in (0, 5, 17, 41):
        one, _ = evaluate_values(st, values[i : i + 1])
        for name in ("Lnm_h", "margin", "life_ratio", "s0", "Fr_max_N", "Fa_max_N",
                     "deflection_mm", "slope_rad", "el_deflection_mm", "system_life_h"):
            assert np.array_equal(getattr(one, name)[0], getattr(full, name)[i],
                                  equal_nan=True), name


def test_variant_with_a_rating_error_takes_the_general_life_chain(spindle):
    """A variant whose C is not positive is refused with the single run's message (the
    per-bearing planned path hands it to the general chain); its neighbours in the same
    chunk keep the bits of a batch of one and agree with shaftsys.analyse (1e-9)."""
    st = make_study(spindle, [("bearing.A.C", [22000, 0, 21000])])
    values = st.values_block(0, st.n_variants)
    a, method = evaluate_values(st, values)
    assert method == "batched"
    assert a.reason[1] == ("ModelError: line 43: bearings[A].C_N: bearing 'A' needs positive "
                           "ratings C and C0 (expected C > 0 and C0 > 0 [N])")
    assert np.isnan(a.Lnm_h[1]).all() and np.isnan(a.system_life_h[1])
    assert a.reason[0] == a.reason[2] == ""
    for i in (0, 2):
        one, _ = evaluate_values(st, values[i : i + 1])
        for name in ("Lnm_h", "margin", "life_ratio", "s0", "system_life_h"):
            assert np.array_equal(getattr(one, name)[0], getattr(a, name)[i]), name
    _compare(spindle, st, [0, 2])


def test_largest_deflection_takes_one_hypot_per_variant_and_the_same_bits():
    """No outside source: the study's largest |(u_y, u_z)| over the cases (one hypot per
    variant where the largest squared norm leads by more than 1e-12) equals the maximum
    of hypot over every case bit for bit, also with exact and near ties, zeros, values
    too small to square, infinities and NaN."""
    from shaftsys.study.variant_batch import _largest_hypot

    rng = np.random.default_rng(21)
    m, b = 20, 400
    a = rng.normal(size=(m, b)) * 10 ** rng.uniform(-6, 3, (1, b))
    c = rng.normal(size=(m, b)) * 10 ** rng.uniform(-6, 3, (1, b))
    a[:, 0] = c[:, 0] = 0.0                               # a rigid support's DOF
    a[4, 1], c[4, 1] = a[9, 1], c[9, 1]                   # an exact tie
    a[5, 2], c[5, 2] = -a[2, 2], c[2, 2]                  # a tie by sign
    a[6, 3] = a[1, 3] * (1.0 + 1e-15)                     # a near tie
    c[6, 3] = c[1, 3]
    a[:, 4] *= 1e-160                                     # squares underflow
    c[:, 4] *= 1e-160
    a[7, 5] = np.inf
    a[8, 6] = np.nan
    out = np.empty(b)
    _largest_hypot(a, c, out, np.empty((m, b)))
    assert np.array_equal(out, np.hypot(a, c).max(axis=0), equal_nan=True)
    assert out[0] == 0.0 and np.isinf(out[5]) and np.isnan(out[6])


def test_reactions_follow_statics():
    """Simply supported shaft, F = 10 kN at a = 200 mm, supports at 0 and L = 500 mm.

    Moment balance (Shigley, beam reactions): R_A = F (L - a)/L = 10000*300/500 = 6000 N,
    R_B = F a/L = 10000*200/500 = 4000 N. Deflection under the load (Roark Table 8.1
    case 1e, from memory): F a^2 b^2/(3 E I L) with I = pi*50^4/64 = 306 796.16 mm^4:
    1e4 * 4e4 * 9e4 / (3 * 210000 * 306796.16 * 500) = 3.6e13 / 9.66408e13 = 0.372513 mm.
    """
    model = _two_bearing_model()
    st = make_study(model, {"bearing.B.at": [500.0]})
    a, _ = evaluate_values(st, st.values_block(0, 1))
    assert a.Fr_max_N[0].tolist() == pytest.approx([6000.0, 4000.0], rel=1e-12)
    assert a.el_deflection_mm[0, 0] == pytest.approx(0.372513, rel=1e-5)


def test_fallback_runs_analyse_and_logs(fan, caplog):
    """Non-geometric quantities (case power) run shaftsys.analyse per variant."""
    st = make_study(fan, {"case.full_flow.power": [15000.0, 18500.0]})
    assert not st.batched
    with caplog.at_level(logging.WARNING, logger="shaftsys.study"):
        df = sweep(st)
    assert (df["method"] == "analyse").all() and "batched evaluator" in caplog.text
    # 18.5 kW is the model's own value: the same lives as the unmodified model
    ref = shaftsys.analyse(fan, with_shaft_checks=False)
    assert df.loc[1, "A.Lnm_h"] == pytest.approx(ref.bearing("A").life.Lnm_h, rel=1e-12)
    assert df.loc[0, "A.Lnm_h"] > df.loc[1, "A.Lnm_h"]   # less power, longer life


def test_forced_fallback_agrees_with_batched(fan):
    st = make_study(fan, {"bearing.B.at": [500.0, 600.0], "step.fan_shaft.2.d": [58.0]},
                    seat=["B"])
    fast = sweep(st)
    slow = sweep(st, batched=False)
    cols = [c for c in fast.columns if c.endswith((".Lnm_h", ".margin", "system_life_h"))]
    assert np.allclose(fast[cols].to_numpy(float), slow[cols].to_numpy(float), rtol=1e-9)


def test_limits_and_outputs(fan, tmp_path):
    st = make_study(fan, {"bearing.B.at": "500:600:3"}, seat=["B"],
                    limits=[Limit("slope", ("bearings",), 1e-9)])
    df = sweep(st)
    assert not df["limits_ok"].any() and not df["ok"].any()   # 1e-9 rad is never met
    paths = write_results(df, tmp_path)
    back = pd.read_parquet(paths["parquet"])
    assert back["variant"].tolist() == ["v000000", "v000001", "v000002"]
    assert pd.read_csv(paths["csv"]).shape == df.shape
    recs = json.loads(paths["json"].read_text())
    assert len(recs) == 3 and recs[0]["A.Lnm_h"] == pytest.approx(df.loc[0, "A.Lnm_h"])


# ------------------------------------------- the study meshes, solves and balances as analyse
def _shouldered_model():
    """Two steps (200 mm d 50, 400 mm d 60) with a shoulder at 200 mm; bearings A at 20
    (locating) and B at 560 mm; a load at 300 mm and a second one 0.0004 mm from it;
    Timoshenko elements and the shaft weight in the y plane."""
    mat = Material("steel", 210000.0, 80769.23, 0.3, 7850.0)
    a = Bearing("A", BearingKind.DEEP_GROOVE_BALL, 20.0, 40.0, 80.0, 30000.0, 19000.0,
                axial=AxialRole.BOTH)
    b = Bearing("B", BearingKind.DEEP_GROOVE_BALL, 560.0, 40.0, 80.0, 30000.0, 19000.0)
    loads = (ProcessLoad("load", 300.0, force_N=(0.0, -10000.0, 2000.0)),
             ProcessLoad("near", 300.0004, force_N=(0.0, 1500.0, -4000.0),
                         moment_Nmm=(0.0, 2.0e5, -1.0e5)))
    shaft = Shaft("s", (Step(200.0, 50.0), Step(400.0, 60.0)), mat, (a, b), loads)
    case = Case("run", CaseKind.DUTY, 1.0, drives={"s": Drive(1000.0)})
    return Model("shoulder", (shaft,), (case,), gravity_m_s2=(0.0, -9.81, 0.0),
                 solver=SolverSettings(shear_deformation=True, include_shaft_weight=True))


def test_bearing_within_the_snap_distance_of_a_shoulder_matches_analyse():
    """Bearing B moved to 0.0004 mm either side of the shoulder at 200 mm, and a load
    0.0004 mm from another: both snap (STATION_SNAP_MM = 1e-3 mm) in the study as in the
    single run. Reference: shaftsys.analyse of each variant, 1e-9 relative."""
    model = _shouldered_model()
    st = make_study(model, {"bearing.B.at": [199.9996, 200.0004, 199.9990, 450.0]})
    _compare(model, st, range(st.n_variants))
    a, _ = evaluate_values(st, st.values_block(0, st.n_variants))
    assert (a.reason == "").all()
    # 199.9990 mm is 1 mm * 1e-3 away: not snapped, still equal to analyse (checked above)


def test_two_rigid_bearings_snapped_onto_one_node_are_refused_like_analyse():
    """B 0.0004 mm from A shares A's node: the split of the load between two rigid
    supports at one node is undetermined. The study marks the variant invalid with a
    ModelError, as the single run refuses it (planar_support_dofs in both)."""
    model = _shouldered_model()
    st = make_study(model, {"bearing.B.at": [20.0004, 560.0]})
    a, _ = evaluate_values(st, st.values_block(0, 2))
    assert a.reason[0].startswith("ModelError") and "rigidly hold" in a.reason[0]
    assert a.reason[1] == ""
    variant, reason = model_with(model, st.quantities, st.values_block(0, 2)[0])
    assert reason == ""
    with pytest.raises(ModelError, match="rigidly hold"):
        shaftsys.analyse(variant, with_shaft_checks=False)
