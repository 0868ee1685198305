"""Couplings, point loads, weights and unbalance."""

from __future__ import annotations

import math

import numpy as np
import pytest

from shaftsys.errors import ModelError
from shaftsys.loads import (
    AxisLoad,
    coupling_load,
    point_load,
    unbalance_load,
    weight_load,
)


def test_unbalance_worked_by_hand() -> None:
    # Centrifugal force F = m e omega^2 (Newton's second law on a circular path).
    # m = 0.01 kg, e = 10 mm = 0.010 m, n = 3000 rpm -> omega = 3000 * 2 pi / 60
    # = 314.15927 rad/s, omega^2 = 98696.044; F = 0.01 * 0.010 * 98696.044 = 9.8696044 N.
    load = unbalance_load(0.01, 10.0, 3000.0, 90.0)
    assert load.details["F_N"] == pytest.approx(9.8696044, rel=1e-7)
    # Phase 90 deg: u_r = (0, 0, 1).
    np.testing.assert_allclose(load.force_N, [0.0, 0.0, 9.8696044], rtol=1e-7, atol=1e-12)
    np.testing.assert_allclose(load.moment_Nmm, 0.0)
    # Speed sign does not matter (omega squared); phase 180 -> -y.
    back = unbalance_load(0.01, 10.0, -3000.0, 180.0)
    np.testing.assert_allclose(back.force_N, [0.0, -9.8696044, 0.0], rtol=1e-7, atol=1e-12)


def test_weight() -> None:
    # W = m g: 2 kg * 9.80665 m/s^2 = 19.6133 N (standard gravity, ISO 80000-3).
    load = weight_load(2.0, (0.0, -9.80665, 0.0))
    np.testing.assert_allclose(load.force_N, [0.0, -19.6133, 0.0], rtol=1e-12)
    np.testing.assert_allclose(load.moment_Nmm, 0.0)
    with pytest.raises(ModelError):
        weight_load(-1.0, (0.0, -9.81, 0.0))
    with pytest.raises(ModelError):
        weight_load(1.0, (0.0, -9.81))


def test_coupling() -> None:
    # Torque passes through; 100 N radial at 180 deg -> u_r(180) = (0, -1, 0).
    load = coupling_load(-25_000.0, 100.0, 180.0)
    np.testing.assert_allclose(load.force_N, [0.0, -100.0, 0.0], atol=1e-12)
    np.testing.assert_allclose(load.moment_Nmm, [-25_000.0, 0.0, 0.0])
    plain = coupling_load(5000.0)
    np.testing.assert_allclose(plain.force_N, 0.0)
    assert plain.moment_Nmm[0] == 5000.0


def test_point_load_offset_reduction() -> None:
    # Statics, moment of a force about a point: M = p x F.
    # F = (0, 0, 100) N at p = (0, 50, 0) mm: p x F = (50*100 - 0*0, 0*0 - 0*100, 0*0 - 50*0)
    # = (5000, 0, 0) N*mm.
    a = point_load((0.0, 0.0, 100.0), offset_yz_mm=(50.0, 0.0))
    np.testing.assert_allclose(a.moment_Nmm, [5000.0, 0.0, 0.0])
    # F = (10, 0, 0) N at p = (0, 0, 20) mm: p x F = (0*0 - 20*0, 20*10 - 0*0, 0*0 - 0*10)
    # = (0, 200, 0) N*mm; plus a given moment (1, 2, 3).
    b = point_load((10.0, 0.0, 0.0), (1.0, 2.0, 3.0), (0.0, 20.0))
    np.testing.assert_allclose(b.moment_Nmm, [1.0, 202.0, 3.0])
    np.testing.assert_allclose(b.force_N, [10.0, 0.0, 0.0])


def test_point_load_validation() -> None:
    with pytest.raises(ModelError):
        point_load((0.0, math.inf, 0.0))
    with pytest.raises(ModelError):
        point_load((0.0, 0.0))
    with pytest.raises(ModelError):
        point_load((0.0, 0.0, 1.0), offset_yz_mm=(0.0, float("nan")))
    with pytest.raises(ModelError):
        AxisLoad(force_N=np.zeros(3), moment_Nmm=np.array([0.0, np.nan, 0.0]))


def test_unbalance_validation() -> None:
    with pytest.raises(ModelError):
        unbalance_load(0.01, -1.0, 3000.0, 0.0)
    with pytest.raises(ModelError):
        unbalance_load(0.01, 1.0, float("nan"), 0.0)
