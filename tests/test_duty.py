"""Duty from a recorded series: binning, representative torques, the reduction error.

Each test names its reference. The p-th power means of the ramp and the sinusoid are
hand-derived closed forms (derivations in the docstrings). The revolution weighting of
Palmgren-Miner follows ISO 281:2007 (variable load: Pm = (sum U_i P_i^p)^(1/p) with U_i
the fractions of revolutions; from memory) and is cross-checked against the life
engine's own ``equivalent_mean_load``/``revolution_weights``.
"""

from __future__ import annotations

import itertools
import logging
import math
from collections.abc import Iterator
from pathlib import Path

import numpy as np
import pytest

import shaftsys
from shaftsys.analysis.duty import model_with_cases, reduce_duty, template_case
from shaftsys.analysis.duty_reduction import BinSettings, DutyCase
from shaftsys.bearings.life import equivalent_mean_load, revolution_weights
from shaftsys.model import Model

ROOT = Path(__file__).resolve().parents[1]
REDUCER = ROOT / "models" / "belt_reducer.yaml"

Chunk = tuple[np.ndarray, np.ndarray, np.ndarray]


@pytest.fixture(autouse=True)
def _quiet_engine() -> Iterator[None]:
    logging.disable(logging.WARNING)
    yield
    logging.disable(logging.NOTSET)


@pytest.fixture(scope="module")
def reducer() -> Model:
    return shaftsys.load_model(str(REDUCER))


def midpoint_durations(t: np.ndarray) -> np.ndarray:
    """The stated sample rule: dt_i = (t_(i+1) - t_(i-1))/2, half intervals at the ends."""
    left = np.diff(t, prepend=t[0])
    right = np.diff(t, append=t[-1])
    return 0.5 * (left + right)


def chunked(t: np.ndarray, T: np.ndarray, n: np.ndarray, size: int = 7919):
    """A chunk factory over arrays (durations by the midpoint rule)."""
    dt = midpoint_durations(t)

    def chunks() -> Iterator[Chunk]:
        for s in range(0, t.size, size):
            yield dt[s:s + size], T[s:s + size], n[s:s + size]
    return chunks


def duty_cases(red) -> list[DutyCase]:  # type: ignore[no-untyped-def]
    return [c for c in red.cases if c.kind == "duty"]


# ---------------------------------------------------------------- representative torque
def test_linear_ramp_p_mean_closed_form(reducer) -> None:  # type: ignore[no-untyped-def]
    """A ramp T = Tm*t/t_end at constant speed in one bin (hand-derived).

    Constant speed makes revolutions proportional to time, so the bin's torque is
    (1/t_end * int_0^t_end (Tm t/t_end)^p dt)^(1/p) = Tm / (p + 1)^(1/p).
    The sampled series integrates by the trapezoid rule (midpoint durations), error
    O(h^2): with 200 001 samples the relative error is below 1e-8.
    """
    Tm, p = 120e3, 10.0 / 3.0
    t = np.linspace(0.0, 600.0, 200_001)
    T = Tm * t / t[-1] + 1e-9          # strictly positive: one sign region
    n = np.full(t.size, 1460.0)
    red = reduce_duty(reducer, chunked(t, T, n), BinSettings(torque_bins=1, exponent=p),
                      analyse_model=False)
    (case,) = duty_cases(red)
    expected = Tm / (p + 1.0) ** (1.0 / p)
    assert case.torque_Nmm == pytest.approx(expected, rel=1e-8)
    assert case.share == pytest.approx(1.0)
    assert case.revs == pytest.approx(1460.0 * 600.0 / 60.0, rel=1e-12)


def test_sinusoid_cube_mean_closed_form(reducer) -> None:  # type: ignore[no-untyped-def]
    """T = T0 + a*sin(w t) over whole periods, p = 3 (hand-derived):
    mean of (T0 + a sin)^3 = T0^3 + 3*T0*a^2*mean(sin^2) = T0^3 + 1.5*T0*a^2 (the odd
    powers of sin average to zero), so T_rep = (T0^3 + 1.5*T0*a^2)^(1/3).
    Second route: scipy quadrature of the same mean.
    """
    from scipy.integrate import quad

    T0, a = 80e3, 30e3
    t = np.linspace(0.0, 100.0, 100_001)            # 10 periods of 10 s
    T = T0 + a * np.sin(2 * np.pi * t / 10.0)
    n = np.full(t.size, 1000.0)
    red = reduce_duty(reducer, chunked(t, T, n), BinSettings(torque_bins=1, exponent=3.0),
                      analyse_model=False)
    (case,) = duty_cases(red)
    closed = (T0 ** 3 + 1.5 * T0 * a ** 2) ** (1.0 / 3.0)
    quadrature = (quad(lambda x: (T0 + a * math.sin(x)) ** 3, 0, 2 * math.pi)[0]
                  / (2 * math.pi)) ** (1.0 / 3.0)
    assert closed == pytest.approx(quadrature, rel=1e-12)
    assert case.torque_Nmm == pytest.approx(closed, rel=1e-8)


def test_revolution_weighting_palmgren_miner(reducer) -> None:  # type: ignore[no-untyped-def]
    """Two levels at different speeds in one bin: the bin torque is weighted by
    revolutions, not by time (ISO 281:2007 Palmgren-Miner over revolution fractions U_i,
    from memory). Cross-checked with the life engine's revolution_weights and
    equivalent_mean_load; the bin speed keeps the revolutions (n_rep = revs / time).
    """
    t = np.arange(0.0, 1000.0, 0.5)
    first = t < 700.0
    T = np.where(first, 50e3, 90e3)
    n = np.where(first, 400.0, 1500.0)
    p = 10.0 / 3.0
    red = reduce_duty(reducer, chunked(t, T, n), BinSettings(torque_bins=1, exponent=p),
                      analyse_model=False)
    (case,) = duty_cases(red)
    dt = midpoint_durations(t)
    t1, t2 = dt[first].sum(), dt[~first].sum()
    U = revolution_weights([400.0, 1500.0], [t1, t2], [True, True])
    assert case.torque_Nmm == pytest.approx(
        equivalent_mean_load([50e3, 90e3], U, p), rel=1e-12)
    by_hand = ((400 * t1 * 50e3 ** p + 1500 * t2 * 90e3 ** p) / (400 * t1 + 1500 * t2)) ** (1 / p)
    assert case.torque_Nmm == pytest.approx(by_hand, rel=1e-12)
    time_weighted = ((t1 * 50e3 ** p + t2 * 90e3 ** p) / (t1 + t2)) ** (1 / p)
    assert abs(case.torque_Nmm - time_weighted) > 1e3   # the two weightings differ
    assert case.speed_rpm == pytest.approx((400 * t1 + 1500 * t2) / (t1 + t2), rel=1e-12)


def test_square_wave_reduces_to_exactly_two_cases(reducer) -> None:  # type: ignore[no-untyped-def]
    """A two-level square wave (common practice, no source: a level series must come
    back as its levels): two cases with the two torques exactly and the time shares of
    the samples at each level (midpoint rule; end samples count half).
    """
    t = np.arange(0.0, 400.0, 0.1)
    high = (np.floor(t / 20.0) % 2) == 1
    T = np.where(high, 95e3, 40e3)
    n = np.full(t.size, 1460.0)
    red = reduce_duty(reducer, chunked(t, T, n), BinSettings(torque_bins=8),
                      analyse_model=False)
    cases = duty_cases(red)
    assert len(cases) == 2
    lo, hi = sorted(cases, key=lambda c: c.torque_Nmm)
    assert lo.torque_Nmm == pytest.approx(40e3, rel=1e-13)
    assert hi.torque_Nmm == pytest.approx(95e3, rel=1e-13)
    dt = midpoint_durations(t)
    assert hi.share == pytest.approx(dt[high].sum() / (t[-1] - t[0]), rel=1e-12)
    assert lo.share + hi.share == pytest.approx(1.0, rel=1e-12)


# ------------------------------------------------------------ signs: reversed, standstill
def test_reversal_gives_reversed_case_with_flipped_helical_thrust(reducer) -> None:  # type: ignore[no-untyped-def]
    """Reversed running (T < 0, n < 0) becomes its own case, and the helical thrust on
    the input shaft flips with it: Fa = Ft*tan(beta), Ft = T/(d/2) (helical gear force
    resolution, from memory), cross-checked here against the pinion's pitch diameter
    and helix angle from the model.
    """
    t = np.arange(0.0, 200.0, 0.05)
    rev = t >= 100.0
    T = np.where(rev, -70e3, 70e3)
    n = np.where(rev, -1460.0, 1460.0)
    red = reduce_duty(reducer, chunked(t, T, n), BinSettings(torque_bins=4))
    ids = {c.region: c.id for c in duty_cases(red)}
    assert set(ids) == {"forward", "reverse"}
    res = red.result
    inp = next(s for s in reducer.shafts if s.id == "input")
    Ka = {region: sum(ld.Fx_N for b in res.bearings if b.shaft_id == "input"
                      for ld in b.loads if ld.case == cid) for region, cid in ids.items()}
    assert Ka["reverse"] == pytest.approx(-Ka["forward"], rel=1e-9)
    pinion = next(e for e in inp.elements if e.id == "pinion1")
    by_hand = 70e3 / (pinion.pitch_diameter_mm / 2) * math.tan(math.radians(
        pinion.helix_angle_deg))
    assert abs(Ka["forward"]) == pytest.approx(by_hand, rel=1e-9)


def test_standstill_counts_time_not_revolutions(reducer) -> None:  # type: ignore[no-untyped-def]
    """Samples below life.min_speed count for time only (ISO 281 lives are in
    revolutions; the engine's mean speed counts standstill time, from memory): the
    standstill case carries the time share, no revolutions; a peak case holds the
    largest torque above the threshold.
    """
    t = np.arange(0.0, 100.0, 0.1)
    still = t < 25.0
    T = np.where(still, 200e3, 60e3)
    n = np.where(still, 0.0, 1460.0)
    red = reduce_duty(reducer, chunked(t, T, n),
                      BinSettings(torque_bins=4, peak_above_Nmm=150e3), analyse_model=False)
    standstill = next(c for c in red.cases if c.region == "standstill")
    dt = midpoint_durations(t)
    assert standstill.revs == 0.0
    assert standstill.share == pytest.approx(dt[still].sum() / t[-1], rel=1e-12)
    assert red.revs == pytest.approx(1460.0 * dt[~still].sum() / 60.0, rel=1e-12)
    peak = next(c for c in red.cases if c.kind == "peak")
    assert peak.torque_Nmm == 200e3


# -------------------------------------------------------------- the reduction error
def _smooth_series(seconds: float = 1800.0) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    rng = np.random.default_rng(3)
    t = np.cumsum(rng.uniform(0.05, 0.15, int(seconds / 0.1)))       # irregular sampling
    T = (80 + 30 * np.sin(t / 50) + 4 * rng.standard_normal(t.size)) * 1e3
    n = np.full(t.size, 1460.0)
    back = (t > 0.6 * t[-1]) & (t < 0.7 * t[-1])
    T[back] = -0.25 * T[back]                                      # back-driven spell
    rev = t > 0.85 * t[-1]
    T[rev], n[rev] = -0.5 * T[rev], -1460.0                         # reversed run
    return t, T, n


def test_direct_integral_equals_engine_with_every_sample_a_case(reducer) -> None:  # type: ignore[no-untyped-def]
    """The superposed direct integral (a few probe solves, loads affine in the torque)
    against the life engine with every sample of a short series made a case of its own
    (one full solve per sample; ISO 281 Palmgren-Miner in the engine): equal to 1e-9.
    """
    rng = np.random.default_rng(5)
    t = np.cumsum(rng.uniform(0.5, 1.5, 120))
    T = (70 + 25 * rng.standard_normal(t.size)) * 1e3
    n = np.where(np.arange(t.size) < 90, 1460.0, -1460.0)
    red = reduce_duty(reducer, chunked(t, T, n), BinSettings(torque_bins=2),
                      analyse_model=False)
    dt = midpoint_durations(t)
    per_sample = [DutyCase(f"s{i}", "duty", "x", float(T[i]), float(n[i]), float(dt[i]),
                           0.0, float(dt[i] / dt.sum()), 1) for i in range(t.size)]
    tmpl = template_case(reducer, None)
    result = shaftsys.analyse(model_with_cases(reducer, tmpl, per_sample))
    red2 = reduce_duty(reducer, chunked(t, T, n), BinSettings(torque_bins=2))
    direct = {e.bearing: e for e in red2.errors}
    for b in result.bearings:
        assert direct[b.bearing.id].P_direct_N == pytest.approx(b.life.P_eq_N, rel=1e-9)
        assert direct[b.bearing.id].L10_direct_h == pytest.approx(b.life.L10_h, rel=1e-9)
    assert red.affine_mismatch < 1e-9


def test_binned_converges_to_direct_as_bins_double(reducer) -> None:  # type: ignore[no-untyped-def]
    """Binned vs direct equivalent load (ISO 281 Palmgren-Miner, from memory) as the bins
    halve in width: the worst bearing's difference falls with every doubling (about
    second order: the p-mean keeps the torque's damage, the remaining error is the
    curvature of P(T) within a bin) and ends below 0.02 %.
    """
    t, T, n = _smooth_series()
    worst = []
    for bins in (2, 4, 8, 16, 32):
        red = reduce_duty(reducer, chunked(t, T, n), BinSettings(torque_bins=bins))
        worst.append(max(abs(e.P_error_pct) for e in red.errors))
    for a, b in itertools.pairwise(worst):
        assert b < 0.7 * a
    assert worst[-1] < 0.02


def test_tolerance_turns_error_into_warning(reducer) -> None:  # type: ignore[no-untyped-def]
    """A tolerance smaller than the reduction error warns (naming the bearing); a wide
    one does not (common practice, no source)."""
    t, T, n = _smooth_series(600.0)
    coarse = reduce_duty(reducer, chunked(t, T, n), BinSettings(torque_bins=1),
                         tolerance_pct=1e-4)
    assert any("more than the tolerance" in w for w in coarse.warnings)
    wide = reduce_duty(reducer, chunked(t, T, n), BinSettings(torque_bins=1),
                       tolerance_pct=50.0)
    assert not any("tolerance" in w for w in wide.warnings)


def test_chunk_size_does_not_change_the_reduction(reducer) -> None:  # type: ignore[no-untyped-def]
    """Streaming in chunks gives the same cases as one chunk (common practice, no source)."""
    t, T, n = _smooth_series(300.0)
    one = reduce_duty(reducer, chunked(t, T, n, size=t.size), BinSettings(torque_bins=6),
                      analyse_model=False)
    many = reduce_duty(reducer, chunked(t, T, n, size=97), BinSettings(torque_bins=6),
                       analyse_model=False)
    assert [c.id for c in one.cases] == [c.id for c in many.cases]
    for a, b in zip(one.cases, many.cases, strict=True):
        assert a.torque_Nmm == pytest.approx(b.torque_Nmm, rel=1e-12)
        assert a.share == pytest.approx(b.share, rel=1e-12)


def test_two_d_bins_split_by_speed(reducer) -> None:  # type: ignore[no-untyped-def]
    """Torque x speed bins keep two speeds at one torque apart; each keeps its
    revolutions (n_rep = revs/time; common practice, no source)."""
    t = np.arange(0.0, 100.0, 0.1)
    n = np.where(t < 50.0, 700.0, 1460.0)
    T = np.full(t.size, 60e3)
    red = reduce_duty(reducer, chunked(t, T, n),
                      BinSettings(torque_bins=2, speed_bins=2), analyse_model=False)
    speeds = sorted(c.speed_rpm for c in duty_cases(red))
    assert speeds == pytest.approx([700.0, 1460.0], rel=1e-12)
    assert sum(c.revs for c in red.cases) == pytest.approx(red.revs, rel=1e-12)


def test_table_path_matches_exact_evaluation(reducer) -> None:  # type: ignore[no-untyped-def]
    """Large chunks take P^p from an exact table over the torque range (linear
    interpolation, 16 385 points); small chunks evaluate every sample exactly. Both
    give the same direct equivalent loads within the stated bound, which is small
    (common practice, no source: a table is checked against the function it tabulates).
    """
    t, T, n = _smooth_series(12_000.0)
    assert t.size > 2 * 16385 * 2
    big = reduce_duty(reducer, chunked(t, T, n, size=t.size), BinSettings(torque_bins=4))
    small = reduce_duty(reducer, chunked(t, T, n, size=30_000), BinSettings(torque_bins=4))
    for a, b in zip(big.errors, small.errors, strict=True):
        assert abs(a.P_direct_N / b.P_direct_N - 1.0) <= big.interpolation_error
    assert 0.0 < big.interpolation_error < 1e-6
    assert small.interpolation_error == 0.0


FAN = ROOT / "models" / "fan_drive.yaml"


def test_process_load_channel_superposed_like_one_solve_per_sample() -> None:
    """A recorded impeller thrust (a process-load channel, Fx of 'impeller_thrust')
    varying independently of the torque: the direct integral superposes one more probe
    per channel (loads affine in torque and thrust) and must equal the life engine with
    every sample its own case, each solved in full (ISO 281 Palmgren-Miner in the
    engine); the binned cases carry the revolution-weighted mean thrust of their bin
    (hand-computed here).
    """
    fan = shaftsys.load_model(str(FAN))
    rng = np.random.default_rng(11)
    t = np.cumsum(rng.uniform(0.5, 1.5, 150))
    T = (110 + 20 * rng.standard_normal(t.size)) * 1e3
    n = np.full(t.size, 1480.0)
    F = -1400.0 + 300.0 * rng.standard_normal(t.size)
    dt = midpoint_durations(t)

    def chunks() -> Iterator[tuple[np.ndarray, ...]]:
        yield dt, T, n, F[None, :]

    targets = [("impeller_thrust", 0)]
    red = reduce_duty(fan, chunks, BinSettings(torque_bins=3), channels=("load",),
                      load_targets=targets)
    per_sample = [DutyCase(f"s{i}", "duty", "x", float(T[i]), float(n[i]), float(dt[i]),
                           0.0, float(dt[i] / dt.sum()), 1, loads_N=(float(F[i]),))
                  for i in range(t.size)]
    tmpl = template_case(fan, None)
    result = shaftsys.analyse(model_with_cases(fan, tmpl, per_sample, targets))
    direct = {e.bearing: e for e in red.errors}
    for b in result.bearings:
        assert direct[b.bearing.id].P_direct_N == pytest.approx(b.life.P_eq_N, rel=1e-9)
    case = duty_cases(red)[0]
    lo, hi = case.T_lo_Nmm, case.T_hi_Nmm
    inside = (np.abs(T) >= lo) & (np.abs(T) < hi)
    rev = n * dt / 60.0
    assert case.loads_N[0] == pytest.approx(
        float((rev[inside] * F[inside]).sum() / rev[inside].sum()), rel=1e-12)
