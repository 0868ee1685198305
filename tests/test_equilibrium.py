"""The equilibrium proof of every solve, and the axial arrangement rules.

(a) ``equilibrium_residual`` really trips when a reaction is wrong;
(b) property test: random stepped shafts, supports, loads and gravity always balance;
(c) axial arrangement rules (locating, cross-locating, adjusted tapered pair).

Reference for (a) and (b): static equilibrium of a free body, sum F = 0 and sum M = 0
(Newton's laws; e.g. Shigley's Mechanical Engineering Design, 10th ed., section 3-1).
"""

from __future__ import annotations

import math
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from shaftsys.analysis import (
    AppliedLoad,
    analyse,
    element_loads,
    equilibrium_residual,
    shaft_weight_loads,
)
from shaftsys.bearings.axial import axial_reactions
from shaftsys.errors import ModelError, NumericalError
from shaftsys.io.loader import load_model
from shaftsys.model import (
    AxialRole,
    Bearing,
    BearingKind,
    Case,
    CaseKind,
    Drive,
    Element,
    ElementLoad,
    LumpedMass,
    Material,
    Model,
    ProcessLoad,
    Shaft,
    Step,
)

STEEL = Material(name="steel", E_MPa=210000.0, G_MPa=210000.0 / 2.6, poisson=0.3,
                 density_kg_m3=7850.0)


def _bearing(bid: str, x: float, axial: AxialRole = AxialRole.FLOAT,
             kind: BearingKind = BearingKind.DEEP_GROOVE_BALL,
             k_radial: float | None = None, Y: float | None = None) -> Bearing:
    return Bearing(id=bid, kind=kind, x_mm=x, d_mm=40.0, D_mm=80.0, C_N=30000.0,
                   C0_N=19000.0, axial=axial, radial_stiffness_N_mm=k_radial, Y=Y)


def _shaft(bearings: list[Bearing], elements: list[Element] | None = None,
           steps: list[Step] | None = None) -> Shaft:
    steps = steps or [Step(100.0, 40.0), Step(200.0, 50.0), Step(100.0, 40.0)]
    return Shaft(id="s", steps=tuple(steps), material=STEEL, bearings=tuple(bearings),
                 elements=tuple(elements or ()))


def _model(shaft: Shaft, cases: list[Case], gravity: tuple[float, float, float]
           = (0.0, -9.80665, 0.0)) -> Model:
    return Model(name="t", shafts=(shaft,), cases=tuple(cases), gravity_m_s2=gravity)


def _case(cid: str, speed: float = 1000.0, loads: tuple[ElementLoad, ...] = (),
          share: float = 1.0) -> Case:
    return Case(id=cid, kind=CaseKind.DUTY, duration=share,
                drives={"s": Drive(speed_rpm=speed)}, loads=loads)


# ----------------------------------------------------------------- (a) the check trips
def test_residual_of_a_hand_balanced_beam() -> None:
    """Simply supported 200 mm beam, 1000 N down at mid-span, 500 N up at each end
    (statics by hand): the residual is zero; moving one reaction 1 % off is not."""
    applied = [AppliedLoad("P", 100.0, (0.0, -1000.0, 0.0), (0.0, 0.0, 0.0))]
    good = [AppliedLoad("R1", 0.0, (0.0, 500.0, 0.0), (0.0, 0.0, 0.0)),
            AppliedLoad("R2", 200.0, (0.0, 500.0, 0.0), (0.0, 0.0, 0.0))]
    f_res, m_res, rel = equilibrium_residual(applied, good)
    assert (f_res, m_res, rel) == (0.0, 0.0, 0.0)
    bad = [good[0], AppliedLoad("R2", 200.0, (0.0, 505.0, 0.0), (0.0, 0.0, 0.0))]
    f_res, m_res, rel = equilibrium_residual(applied, bad)
    # 5 N unbalanced force; its moment about x = 0 is 5 N * 200 mm = 1000 N*mm.
    assert f_res == pytest.approx(5.0, rel=1e-12)
    assert m_res == pytest.approx(1000.0, rel=1e-12)
    # relative: force 5 / (1000 + 500 + 505) = 2.494e-3
    assert rel == pytest.approx(5.0 / 2005.0, rel=1e-12)


@pytest.fixture(scope="module")
def demo_solved(demo_path: Path) -> tuple[Model, object]:
    model = load_model(demo_path)
    return model, analyse(model, with_life=False)


def _reaction_list(result: object, shaft: Shaft, case_id: str) -> list[AppliedLoad]:
    """Forces the bearings put on the shaft: minus the published bearing loads."""
    out = []
    for b in shaft.bearings:
        ld = next(x for x in result.bearing(b.id).loads if x.case == case_id)  # type: ignore[attr-defined]
        out.append(AppliedLoad(f"bearing {b.id}", b.support_x_mm,
                               (-ld.Fx_N, -ld.Fy_N, -ld.Fz_N), (0.0, -ld.My_Nmm, -ld.Mz_Nmm)))
    return out


@pytest.mark.parametrize("case_id", ["full_flow", "start_up"])
def test_corrupted_reaction_trips_the_check(demo_solved: tuple[Model, object],
                                            case_id: str) -> None:
    model, result = demo_solved
    shaft = model.shafts[0]
    case = next(c for c in model.cases if c.id == case_id)
    applied, _ = element_loads(model, shaft, case)
    applied = applied + shaft_weight_loads(model, shaft)
    reactions = _reaction_list(result, shaft, case_id)
    _, _, rel = equilibrium_residual(applied, reactions)
    assert rel < 1e-9  # the published loads balance the applied loads
    # Perturb bearing A's Fy reaction by 1 %.
    a = reactions[0]
    delta = 0.01 * a.force_N[1]
    assert abs(delta) > 1.0  # a load worth perturbing
    bad = [replace(a, force_N=(a.force_N[0], a.force_N[1] + delta, a.force_N[2])),
           *reactions[1:]]
    f_res, m_res, rel_bad = equilibrium_residual(applied, bad)
    assert rel_bad > 1e-5
    assert rel_bad > 1e4 * max(rel, 1e-12)
    # The residual is exactly the perturbation: |delta| as force and x_A*|delta| as
    # moment about the origin (bearing A acts at x = 120 mm in the demo).
    assert a.x_mm == 120.0
    assert f_res == pytest.approx(abs(delta), rel=1e-6)
    assert m_res == pytest.approx(120.0 * abs(delta), rel=1e-6)


# ----------------------------------------------------------------- (b) property test
@st.composite
def random_models(draw: st.DrawFn) -> tuple[Model, dict[str, float]]:
    """A random stepped shaft on 2-4 radial supports with random loads and gravity.

    Returns the model and, for each case, the sum of the applied axial forces [N]
    computed by hand: process-load Fx + g_x * (element masses + shaft mass).
    """
    n_steps = draw(st.integers(2, 5))
    # Diameters 10-100 mm; neighbouring steps differ by at most a factor 2, as shoulders
    # of real shafts do. (With an 8:1 step the stiffness condition reaches ~1e7 and the
    # residual sits at the 1e-9 tolerance by round-off alone: reported, not tested here.)
    diameters = [draw(st.floats(10.0, 100.0))]
    for _ in range(n_steps - 1):
        d = diameters[-1]
        diameters.append(draw(st.floats(max(10.0, d / 2.0), min(100.0, 2.0 * d))))
    steps = [Step(length_mm=float(draw(st.integers(20, 200))), d_mm=d) for d in diameters]
    length = sum(s.length_mm for s in steps)
    # Stations lie on a 1 mm grid, and the outer supports span at least 40 % of the
    # shaft with supports at least 10 mm apart: ordinary shafts. (Stations 0.01 mm apart
    # make elements 1000 times shorter than their neighbours, and supports 1 mm apart
    # are nearly a clamp; both push the residual past 1e-9 by round-off: reported.)
    station = st.integers(0, int(length)).map(float)
    first = float(draw(st.integers(0, int(0.3 * length))))
    last = float(draw(st.integers(math.ceil(0.7 * length), int(length))))
    inner = (draw(st.lists(st.integers(int(first) + 10, int(last) - 10).map(float),
                           max_size=2, unique=True))
             if int(last) - int(first) >= 20 else [])   # a short shaft: two supports only
    stations = [first]
    for x in sorted(inner):
        if x - stations[-1] >= 10.0 and last - x >= 10.0:
            stations.append(x)
    stations.append(last)
    locating = draw(st.integers(0, len(stations) - 1))
    bearings = []
    for i, x in enumerate(stations):
        elastic = draw(st.booleans())
        k = draw(st.floats(1e4, 1e7)) if elastic else None
        bearings.append(_bearing(f"b{i}", x, AxialRole.BOTH if i == locating
                                 else AxialRole.FLOAT, k_radial=k))
    force = st.floats(-5000.0, 5000.0)
    moment = st.floats(-2e5, 2e5)
    elements: list[Element] = []
    n_loads = draw(st.integers(1, 4))
    # Bending moments are free; a torque about x must be balanced on the shaft (no
    # bearing takes torque), so torques come as an equal and opposite pair T1/T2.
    for j in range(n_loads):
        elements.append(ProcessLoad(
            id=f"L{j}", x_mm=draw(station),
            force_N=(draw(force), draw(force), draw(force)),
            moment_Nmm=(0.0, draw(moment), draw(moment))))
    torque = draw(moment)
    elements.append(ProcessLoad(id="T1", x_mm=draw(station),
                                moment_Nmm=(torque, 0.0, 0.0)))
    elements.append(ProcessLoad(id="T2", x_mm=draw(station),
                                moment_Nmm=(-torque, 0.0, 0.0)))
    masses = draw(st.lists(st.tuples(station, st.floats(0.1, 50.0)),
                           max_size=2))
    for j, (x, m) in enumerate(masses):
        elements.append(LumpedMass(id=f"m{j}", x_mm=x, mass_kg=m))
    gravity = (draw(st.floats(-20.0, 20.0)), draw(st.floats(-20.0, 20.0)),
               draw(st.floats(-20.0, 20.0)))
    # case 1 uses the loads as defined, case 2 overrides the first load
    override = ElementLoad("L0", force_N=(draw(force), draw(force), draw(force)),
                           moment_Nmm=(0.0, draw(moment), draw(moment)))
    cases = [_case("c1", share=0.5), _case("c2", speed=-300.0, loads=(override,),
                                             share=0.5)]
    shaft = _shaft(bearings, elements, steps)
    model = _model(shaft, cases, gravity)
    # hand sums of the axial (x) loads
    shaft_mass = sum(STEEL.density_kg_m3 * 1e-9 * math.pi / 4.0 * s.d_mm**2 * s.length_mm
                     for s in steps)
    mass_total = shaft_mass + sum(m for _, m in masses)
    fx_loads = sum(e.force_N[0] for e in elements if isinstance(e, ProcessLoad))
    fx_c2 = fx_loads - elements[0].force_N[0] + override.force_N[0]  # type: ignore[union-attr]
    gx = gravity[0] * mass_total
    return model, {"c1": fx_loads + gx, "c2": fx_c2 + gx}


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(random_models())
def test_random_shafts_are_in_equilibrium(data: tuple[Model, dict[str, float]]) -> None:
    model, axial_sum = data
    result = analyse(model, with_life=False)
    shaft_result = result.shafts[0]
    for sol in shaft_result.cases:
        assert sol.residual_relative < 1e-9
        assert sol.nodal_residual_relative < 1e-9
        fx_bearings = sum(ld.Fx_N for b in result.bearings for ld in b.loads
                          if ld.case == sol.case)
        # the force the shaft puts on the bearings equals the applied axial load
        assert fx_bearings == pytest.approx(axial_sum[sol.case], rel=1e-9, abs=1e-6)
        # Fr is the resultant of Fy and Fz
        for b in result.bearings:
            ld = next(x for x in b.loads if x.case == sol.case)
            assert ld.Fr_N == pytest.approx(math.hypot(ld.Fy_N, ld.Fz_N), rel=1e-12,
                                            abs=1e-12)


def test_unbalanced_torque_is_refused() -> None:
    """No bearing takes torque about x: a process-load torque that nothing on the shaft
    balances has no static solution (sum Mx != 0) and must not pass silently."""
    sh = _shaft([_bearing("A", 50.0, AxialRole.BOTH), _bearing("B", 350.0)],
                [ProcessLoad(id="T", x_mm=200.0, moment_Nmm=(1000.0, 0.0, 0.0))])
    with pytest.raises((ModelError, NumericalError)):
        analyse(_model(sh, [_case("c")]), with_life=False)


def test_weight_only_case_on_a_fine_mesh_is_not_a_numerical_failure() -> None:
    """Sound model (supports 40 mm apart, overhung 80 mm disc, gravity only, 2 mm
    elements): a static solution exists, so the solve must not fail; the reactions then
    balance the weight (statics)."""
    steps = [Step(20.0, 10.0), Step(20.0, 10.0), Step(31.0, 80.0)]
    sh = _shaft([_bearing("A", 0.0, AxialRole.BOTH), _bearing("B", 40.0)], [], steps)
    model = _model(sh, [_case("c")], gravity=(0.0, 0.0, 1.0))
    model = replace(model, solver=replace(model.solver, max_element_mm=2.0))
    result = analyse(model, with_life=False)
    # weight in z: rho * g * V = 7850e-9 kg/mm^3 * 1 m/s^2 * pi/4 (10^2*40 + 80^2*31) mm^3
    weight = 7850e-9 * math.pi / 4.0 * (100.0 * 40.0 + 6400.0 * 31.0)
    fz = sum(b.loads[0].Fz_N for b in result.bearings)
    assert fz == pytest.approx(weight, rel=1e-9)


# ----------------------------------------------------------------- (c) axial rules
def test_locating_bearing_takes_all_thrust() -> None:
    shaft = _shaft([_bearing("A", 50.0, AxialRole.BOTH), _bearing("B", 350.0)])
    on_shaft, induced = axial_reactions(shaft.bearings, 750.0, {"A": 1000.0, "B": 2000.0})
    assert on_shaft == {"A": -750.0, "B": 0.0}
    assert induced == {}


@pytest.mark.parametrize(("Ka", "expected"), [
    # net thrust +800 N pushes the shaft toward +x: the "+x" bearing P stops it and
    # pushes back with -800 N; N carries nothing (and vice versa for -800 N).
    (800.0, {"P": -800.0, "N": 0.0}),
    (-800.0, {"P": 0.0, "N": 800.0}),
])
def test_cross_locating_bearing_facing_the_thrust_takes_it(
        Ka: float, expected: dict[str, float]) -> None:
    shaft = _shaft([_bearing("P", 50.0, AxialRole.PLUS_X),
                    _bearing("N", 350.0, AxialRole.MINUS_X)])
    on_shaft, _ = axial_reactions(shaft.bearings, Ka, {"P": 1000.0, "N": 1000.0})
    assert on_shaft == pytest.approx(expected)


def _tapered_pair() -> Shaft:
    return _shaft([
        replace(_bearing("P", 50.0, AxialRole.PLUS_X, BearingKind.TAPERED_ROLLER, Y=1.6),
                pair="N"),
        replace(_bearing("N", 350.0, AxialRole.MINUS_X, BearingKind.TAPERED_ROLLER, Y=1.6),
                pair="P"),
    ])


# Adjusted tapered pair, induced force Fi = 0.5 * Fr / Y (common practice, no source;
# Shigley 10th ed. section 11-9 uses the close variant 0.47 Fr / K, from memory).
# Symmetric case worked by hand: Fr_P = Fr_N = 5000 N, Y = 1.6 for both:
#   Fi_P = Fi_N = 0.5 * 5000 / 1.6 = 1562.5 N.
#   Ka = +1000 N (toward +x):  Fi_N + Ka = 2562.5 >= Fi_P  ->  Fa_P = 2562.5 N,
#       Fa_N = Fi_N = 1562.5 N; on the shaft: P pushes -2562.5, N pushes +1562.5
#       (net -1000 N, balancing Ka).
#   Ka = -1000 N: Fi_N + Ka = 562.5 < Fi_P  ->  Fa_P = Fi_P = 1562.5 N,
#       Fa_N = Fi_P - Ka = 2562.5 N; on the shaft -1562.5 and +2562.5 (net +1000 N).
#   Ka = 0: both carry their induced force 1562.5 N.
@pytest.mark.parametrize(("Ka", "fa_p", "fa_n"), [
    (1000.0, 2562.5, 1562.5),
    (-1000.0, 1562.5, 2562.5),
    (0.0, 1562.5, 1562.5),
])
def test_adjusted_tapered_pair_symmetric(Ka: float, fa_p: float, fa_n: float) -> None:
    on_shaft, induced = axial_reactions(_tapered_pair().bearings, Ka, {"P": 5000.0, "N": 5000.0})
    assert induced == pytest.approx({"P": 1562.5, "N": 1562.5})
    assert on_shaft == pytest.approx({"P": -fa_p, "N": fa_n})
    assert on_shaft["P"] + on_shaft["N"] == pytest.approx(-Ka)


def test_adjusted_tapered_pair_unequal_radial_loads() -> None:
    """Fr_P = 8000 N, Fr_N = 2000 N, Y = 1.6, Ka = +500 N (common practice rule):
    Fi_P = 2500 N, Fi_N = 625 N; Fi_N + Ka = 1125 < Fi_P, so Fa_P = 2500 N and
    Fa_N = Fi_P - Ka = 2000 N: the thrust toward +x is carried, but the larger induced
    force of P loads N beyond the external thrust."""
    on_shaft, induced = axial_reactions(_tapered_pair().bearings, 500.0, {"P": 8000.0, "N": 2000.0})
    assert induced == pytest.approx({"P": 2500.0, "N": 625.0})
    assert on_shaft == pytest.approx({"P": -2500.0, "N": 2000.0})


def _symmetric_model(bearings: list[Bearing], thrust_N: float) -> Model:
    """Symmetric shaft (steps 100/200/100 mm), supports at 50 and 350 mm, 10 kN radial
    load (-y) and an axial thrust at mid-span, no gravity: Fr = 5000 N at each support
    by symmetry (statics by hand)."""
    load = ProcessLoad(id="F", x_mm=200.0, force_N=(thrust_N, -10000.0, 0.0))
    return _model(_shaft(bearings, [load]), [_case("c")], gravity=(0.0, 0.0, 0.0))


def test_adjusted_pair_through_analyse() -> None:
    result = analyse(_symmetric_model(list(_tapered_pair().bearings), 1000.0),
                     with_life=False)
    p = result.bearing("P").loads[0]
    n = result.bearing("N").loads[0]
    assert p.Fr_N == pytest.approx(5000.0, rel=1e-9)
    assert n.Fr_N == pytest.approx(5000.0, rel=1e-9)
    # values worked by hand above (Ka = +1000 N): Fa_P = 2562.5 N, Fa_N = 1562.5 N;
    # the shaft pushes P toward +x and N toward -x.
    assert (p.Fa_N, n.Fa_N) == pytest.approx((2562.5, 1562.5), rel=1e-9)
    assert (p.Fx_N, n.Fx_N) == pytest.approx((2562.5, -1562.5), rel=1e-9)
    assert (p.induced_N, n.induced_N) == pytest.approx((1562.5, 1562.5), rel=1e-9)


@pytest.mark.parametrize(("thrust", "fx_p", "fx_n"), [
    (800.0, 800.0, 0.0),
    (-800.0, 0.0, -800.0),
])
def test_cross_locating_through_analyse(thrust: float, fx_p: float, fx_n: float) -> None:
    bearings = [_bearing("P", 50.0, AxialRole.PLUS_X), _bearing("N", 350.0, AxialRole.MINUS_X)]
    result = analyse(_symmetric_model(bearings, thrust), with_life=False)
    p = result.bearing("P").loads[0]
    n = result.bearing("N").loads[0]
    assert (p.Fx_N, n.Fx_N) == pytest.approx((fx_p, fx_n), abs=1e-9)
    assert (p.Fa_N, n.Fa_N) == pytest.approx((abs(fx_p), abs(fx_n)), abs=1e-9)
    assert np.isclose(p.Fr_N, 5000.0, rtol=1e-9)
