"""The pieces the single run and the design study share: station snapping, the supported
band solve and the global balance.

References: the scalar rules the single run used before they moved to ``shaftsys.fe``
(kept in this file as independent reference implementations); the
LAPACK band solve of :class:`shaftsys.fe.solve.PlanarBending`; static equilibrium of a
free body, sum F = 0 and sum M = 0 (Shigley's Mechanical Engineering Design, 10th ed.,
section 3-1) for the hand-balanced beam.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from shaftsys.analysis import AppliedLoad, equilibrium_residual
from shaftsys.fe.balance import global_balance, planar_balance
from shaftsys.fe.banded_batch import solve_supported_band
from shaftsys.fe.mesh import (
    STATION_SNAP_MM,
    Steps,
    build_mesh,
    snap_stations,
    snap_stations_batch,
)
from shaftsys.fe.solve import (
    PlanarBending,
    Support,
    planar_stiffness_banded,
    planar_support_dofs,
    supported_scaled_band,
)

TOL = STATION_SNAP_MM


# Reference implementations: the scalar rules the single run used before they moved to
# shaftsys.fe (kept here verbatim so that the shared, vectorised code is compared with
# an independent copy and not with itself).
def _reference_snap_stations(stations_mm: list[float], edges_mm: tuple[float, ...],
                             tol_mm: float = STATION_SNAP_MM) -> list[float]:
    places = [float(e) for e in edges_mm]
    out = [0.0] * len(stations_mm)
    for i in sorted(range(len(stations_mm)), key=lambda j: stations_mm[j]):
        x = float(stations_mm[i])
        nearest = min(places, key=lambda p: abs(p - x))
        if abs(nearest - x) <= tol_mm:
            out[i] = nearest
        else:
            out[i] = x
            places.append(x)
    return out


def _reference_equilibrium_residual(applied: list[AppliedLoad],
                                    reactions: list[AppliedLoad]
                                    ) -> tuple[float, float, float]:
    items = [*applied, *reactions]
    if not items:
        return 0.0, 0.0, 0.0
    f = np.array([a.force_N for a in items], dtype=float)
    m = np.array([a.moment_Nmm for a in items], dtype=float)
    x = np.array([a.x_mm for a in items], dtype=float)
    arm = float(np.abs(x).max()) or 1.0
    r_cross_f = np.column_stack([np.zeros_like(x), -x * f[:, 2], x * f[:, 1]])
    F = f.sum(axis=0)
    M = m.sum(axis=0) + r_cross_f.sum(axis=0)
    norm_f = np.sqrt((f * f).sum(axis=1))
    scale_f = float(norm_f.sum())
    scale_m = float(np.sqrt((m * m).sum(axis=1)).sum() + norm_f.sum() * arm)
    f_res = float(np.linalg.norm(F))
    m_res = float(np.linalg.norm(M))
    rel = max(f_res / scale_f if scale_f > 0 else f_res,
              m_res / scale_m if scale_m > 0 else m_res)
    return f_res, m_res, rel


# --------------------------------------------------------------------------- snapping
@st.composite
def _station_sets(draw: st.DrawFn) -> tuple[list[float], list[float]]:
    """Step edges and stations crowded around the snap distance, with exact and near
    ties (a station half-way between two places, at exactly tol from one, duplicated)."""
    n_steps = draw(st.integers(1, 4))
    gaps = draw(st.lists(st.sampled_from([0.001, 0.0015, 0.002, 0.5, 37.25, 100.0]),
                         min_size=n_steps, max_size=n_steps))
    x0 = draw(st.sampled_from([0.0, 10.0]))
    edges = [x0]
    for g in gaps:
        edges.append(edges[-1] + g)
    offsets = st.sampled_from([0.0, TOL, -TOL, 0.5 * TOL, -0.5 * TOL, 0.75 * TOL,
                               TOL * (1 + 1e-12), TOL * (1 - 1e-12), 1.0001 * TOL,
                               2 * TOL, 1e-7, 0.3, -0.3])
    stations: list[float] = []
    for _ in range(draw(st.integers(0, 9))):
        kind = draw(st.integers(0, 3))
        if kind == 0 or not stations:
            base = draw(st.sampled_from(edges))
        elif kind == 1:
            base = draw(st.sampled_from(stations))
        elif kind == 2:  # half-way between two places: an exact tie
            a, b = draw(st.sampled_from(edges)), draw(st.sampled_from(edges + stations))
            base = 0.5 * (a + b)
        else:
            base = draw(st.floats(edges[0], edges[-1]))
        stations.append(min(max(base + draw(offsets), edges[0]), edges[-1]))
    return edges, stations


@settings(max_examples=400, deadline=None)
@given(_station_sets())
def test_vectorised_snapping_equals_the_scalar_rule(data: tuple[list[float], list[float]]
                                                     ) -> None:
    """Reference: the scalar rule of the single run (``_reference_snap_stations``)."""
    edges, stations = data
    expected = _reference_snap_stations(stations, tuple(edges))
    assert snap_stations(stations, edges) == expected


@settings(max_examples=60, deadline=None)
@given(st.lists(_station_sets(), min_size=1, max_size=6))
def test_a_batch_snaps_every_row_by_the_scalar_rule(sets: list[tuple[list[float], list[float]]]
                                                    ) -> None:
    """Rows with different edges and stations in one call; each row equals the scalar
    rule of ``_reference_snap_stations`` (the batch axis does not mix rows)."""
    P = max(len(s) for _, s in sets)
    n_e = max(len(e) for e, _ in sets)
    rows = []
    for edges, stations in sets:  # pad to one shape by repeating an edge / a station
        rows.append((edges + [edges[-1]] * (n_e - len(edges)),
                     stations + [edges[0]] * (P - len(stations))))
    got = snap_stations_batch([s for _, s in rows], [e for e, _ in rows])
    assert got.shape == (len(rows), P)
    for i, (edges, stations) in enumerate(rows):
        assert got[i].tolist() == _reference_snap_stations(stations, tuple(edges))


def test_build_mesh_snaps_as_the_single_run() -> None:
    """build_mesh(snap_mm=STATION_SNAP_MM) gives the mesh of ``_reference_snap_stations``
    followed by build_mesh (the single run's two steps)."""
    steps = Steps.from_diameters([0.0, 100.0, 300.0, 400.0], [40.0, 50.0, 40.0],
                                 E_MPa=210e3, poisson=0.3)
    stations = [100.0004, 0.000001, 200.0, 200.0009, 399.9995, 250.0]
    ref_mesh, ref_nodes = build_mesh(
        steps, _reference_snap_stations(stations, tuple(steps.edges_mm)), 10.0)
    mesh, nodes = build_mesh(steps, stations, 10.0, snap_mm=STATION_SNAP_MM)
    assert np.array_equal(mesh.x_mm, ref_mesh.x_mm)
    assert np.array_equal(nodes, ref_nodes)
    assert np.array_equal(mesh.step_of_element, ref_mesh.step_of_element)
    assert mesh.L_mm.min() > STATION_SNAP_MM


# --------------------------------------------------------------------- supported band
def test_one_scaled_band_for_lapack_and_batched_solves() -> None:
    """supported_scaled_band on a stack gives, variant by variant, the bits it gives for
    one variant (what PlanarBending factors with LAPACK dpbtrf), and
    solve_supported_band agrees with PlanarBending.solve to round-off."""
    rng = np.random.default_rng(7)
    n = 12
    x = np.concatenate([[0.0], np.cumsum(rng.uniform(5.0, 60.0, n - 1))])
    B = 5
    EI = rng.uniform(1e9, 1e11, (B, n - 1))
    kGA = rng.uniform(1e6, 1e8, (B, n - 1))
    sups = [Support(1), Support(6, 3e4, 1e7), Support(n - 1, math.inf, 0.0)]
    _, rigid, springs = planar_support_dofs(sups, n)
    L = np.diff(x)
    bands = np.stack([planar_stiffness_banded(L, EI[i], kGA[i]) for i in range(B)], axis=-1)
    ab_b, s_b = supported_scaled_band(bands, rigid, springs)
    F = rng.normal(size=(2 * n, 3)) * 1e3
    u, piv = solve_supported_band(bands, rigid, springs,
                                  np.repeat(F[:, :, None], B, axis=2))
    for i in range(B):
        ab_1, s_1 = supported_scaled_band(bands[..., i], rigid, springs)
        assert np.array_equal(ab_b[..., i], ab_1) and np.array_equal(s_b[:, i], s_1)
        pb = PlanarBending(x, EI[i], kGA[i], sups)
        ref = pb.solve(F)
        np.testing.assert_allclose(u[..., i], ref, rtol=1e-9, atol=1e-12 * np.abs(ref).max())
        assert piv[i] == pytest.approx(pb.min_pivot, rel=1e-9)


# ----------------------------------------------------------------------------- balance
def _loads(rng: np.random.Generator, k: int) -> list[AppliedLoad]:
    out = []
    for i in range(k):
        zero = rng.random() < 0.2
        f = (0.0, 0.0, 0.0) if zero else tuple(rng.normal(size=3) * 10 ** rng.uniform(-2, 4))
        m = tuple(rng.normal(size=3) * 10 ** rng.uniform(-1, 5)) if rng.random() < 0.6 \
            else (0.0, 0.0, 0.0)
        out.append(AppliedLoad(f"load {i}", float(rng.uniform(-50.0, 600.0)), f, m))
    return out


@settings(max_examples=200, deadline=None)
@given(st.integers(0, 2**32 - 1), st.integers(0, 9), st.integers(0, 4))
def test_global_balance_is_the_single_runs_definition(seed: int, n_applied: int,
                                                      n_reactions: int) -> None:
    """Reference: ``_reference_equilibrium_residual`` on the same loads (and the single run's
    ``equilibrium_residual``, which now calls global_balance) (random, with zero
    loads, loads only at x = 0 and empty lists)."""
    rng = np.random.default_rng(seed)
    applied, reactions = _loads(rng, n_applied), _loads(rng, n_reactions)
    if rng.random() < 0.2:
        applied = [AppliedLoad(a.source, 0.0, a.force_N, a.moment_Nmm) for a in applied]
    ref = _reference_equilibrium_residual(applied, reactions)
    assert equilibrium_residual(applied, reactions) == pytest.approx(ref, rel=1e-13,
                                                                     abs=1e-300)
    items = [*applied, *reactions]
    got = global_balance([a.x_mm for a in items],
                         np.array([a.force_N for a in items]).reshape(-1, 3),
                         np.array([a.moment_Nmm for a in items]).reshape(-1, 3))
    for ours, theirs in zip(got, ref, strict=True):
        assert float(ours) == pytest.approx(theirs, rel=1e-13, abs=1e-300)


def test_global_balance_with_batch_axes_equals_each_set() -> None:
    """A (4, 3, k) stack with positions shared along an axis: every entry equals
    ``_reference_equilibrium_residual`` of its own load set."""
    rng = np.random.default_rng(11)
    k = 6
    x = rng.uniform(0.0, 500.0, (4, 1, k))
    F = rng.normal(size=(4, 3, k, 3)) * 100.0
    M = rng.normal(size=(4, 3, k, 3)) * 1e4
    f_res, m_res, rel = global_balance(x, F, M)
    assert f_res.shape == m_res.shape == rel.shape == (4, 3)
    for i in range(4):
        for j in range(3):
            loads = [AppliedLoad("", float(x[i, 0, p]), tuple(F[i, j, p]), tuple(M[i, j, p]))
                     for p in range(k)]
            ref = _reference_equilibrium_residual(loads, [])
            assert (f_res[i, j], m_res[i, j], rel[i, j]) == pytest.approx(ref, rel=1e-13)


def test_planar_balance_is_global_balance_bit_for_bit() -> None:
    """No outside source: planar_balance is global_balance with Fx = Fz = Mx = My = 0
    and must give the same bits (random loads, batch axes, an unbalanced set, a zero set
    and positions all at x = 0); global_balance itself is checked above."""
    rng = np.random.default_rng(5)
    k = 9
    x = rng.uniform(0.0, 700.0, (7, 1, k))
    x[0] = 0.0
    fy = rng.normal(size=(7, 4, k)) * 10 ** rng.uniform(-2, 4, (7, 4, k))
    mz = rng.normal(size=(7, 4, k)) * 1e4
    fy[1] -= fy[1].sum(axis=-1, keepdims=True) / k       # nearly balanced forces
    fy[2, 0] = 0.0
    mz[2, 0] = 0.0                                       # an empty set: residual 0
    F = np.zeros((7, 4, k, 3))
    M = np.zeros((7, 4, k, 3))
    F[..., 1] = fy
    M[..., 2] = mz
    _, _, rel = global_balance(x, F, M)
    got = planar_balance(x, fy, mz)
    assert got.shape == (7, 4)
    assert np.array_equal(got, rel)
    assert got[2, 0] == 0.0 and np.all(got[3:] > 1e-6)


def test_hand_balanced_beam_and_a_wrong_reaction() -> None:
    """Simply supported 200 mm beam, P = 1000 N down at mid-span, P/2 up at each support
    (statics, Shigley section 3-1): zero residual. A reaction wrong by 1 N leaves a force
    residual of 1 N, relative 1 / (1000 + 500 + 501), and a moment residual of
    1 N * 200 mm about the origin when the wrong one is at x = 200 mm."""
    x = [100.0, 0.0, 200.0]
    F = np.array([[0.0, -1000.0, 0.0], [0.0, 500.0, 0.0], [0.0, 500.0, 0.0]])
    M = np.zeros((3, 3))
    f0, m0, r0 = global_balance(x, F, M)
    assert (float(f0), float(m0), float(r0)) == (0.0, 0.0, 0.0)
    F[2, 1] += 1.0
    f1, m1, r1 = global_balance(x, F, M)
    assert float(f1) == pytest.approx(1.0, rel=1e-12)
    assert float(m1) == pytest.approx(200.0, rel=1e-12)
    assert float(r1) == pytest.approx(max(1.0 / 2001.0, 200.0 / (2001.0 * 200.0)), rel=1e-12)
