"""Meshing of stepped shafts: compulsory nodes, element length, property assignment."""

from __future__ import annotations

import math

import numpy as np
import pytest

from shaftsys.errors import ModelError
from shaftsys.fe.mesh import BeamMesh, Steps, build_mesh


def _steps() -> Steps:
    return Steps.from_diameters(
        [0.0, 40.0, 130.0, 310.0, 350.0],
        [30.0, 45.0, 60.0, 40.0],
        [0.0, 0.0, 20.0, 0.0],
        E_MPa=210e3,
        poisson=0.3,
        rho_kg_m3=7850.0,
    )


def test_nodes_at_every_station_and_edge() -> None:
    steps = _steps()
    stations = [12.5, 40.0, 200.0, 333.3, 350.0, 0.0]
    mesh, idx = build_mesh(steps, stations, max_element_mm=25.0)
    np.testing.assert_array_equal(mesh.x_mm[idx], stations)
    for e in steps.edges_mm:
        assert np.min(np.abs(mesh.x_mm - e)) == 0.0


def test_max_element_length_respected_and_not_oversubdivided() -> None:
    mesh, _ = build_mesh(_steps(), [12.5, 200.0], max_element_mm=7.0)
    L = mesh.L_mm
    assert L.max() <= 7.0 + 1e-12
    assert np.all(L > 0)
    # Each compulsory interval is cut into ceil(length / 7) equal parts, no more.
    compulsory = np.array([0.0, 12.5, 40.0, 130.0, 200.0, 310.0, 350.0])
    expected = int(sum(math.ceil(g / 7.0) for g in np.diff(compulsory)))
    assert mesh.n_elements == expected
    assert mesh.x_mm[0] == 0.0
    assert mesh.x_mm[-1] == 350.0


def test_exact_multiple_is_not_split_further() -> None:
    steps = Steps.from_diameters([0.0, 100.0], [20.0], E_MPa=2e5, poisson=0.3)
    mesh, _ = build_mesh(steps, [], max_element_mm=25.0)
    assert mesh.n_elements == 4


def test_coincident_stations_share_a_node() -> None:
    mesh, idx = build_mesh(_steps(), [100.0, 100.0 + 5e-10, 40.0 - 4e-10], max_element_mm=50.0)
    assert idx[0] == idx[1]
    assert mesh.x_mm[idx[2]] == 40.0  # a step edge wins inside a cluster
    assert np.all(np.diff(mesh.x_mm) > 1e-9)


def test_element_properties_follow_steps() -> None:
    steps = _steps()
    mesh, _ = build_mesh(steps, [200.0], max_element_mm=30.0)
    mid = 0.5 * (mesh.x_mm[1:] + mesh.x_mm[:-1])
    expected_step = np.searchsorted(steps.edges_mm, mid) - 1
    np.testing.assert_array_equal(mesh.step_of_element, expected_step)
    np.testing.assert_array_equal(mesh.I_mm4, steps.I_mm4[expected_step])
    np.testing.assert_array_equal(mesh.A_mm2, steps.A_mm2[expected_step])
    # Hollow third step: I = pi (60^4 - 20^4) / 64 (Roark table A.1; from memory).
    assert mesh.I_mm4[expected_step == 2][0] == pytest.approx(math.pi * (60**4 - 20**4) / 64)
    # Isotropic G = E / (2 (1 + nu)).
    assert mesh.G_MPa[0] == pytest.approx(210e3 / 2.6)


def test_station_off_the_shaft_raises() -> None:
    with pytest.raises(ModelError, match="off the shaft"):
        build_mesh(_steps(), [360.0], max_element_mm=10.0)


def test_bad_inputs_raise() -> None:
    with pytest.raises(ModelError):
        build_mesh(_steps(), [], max_element_mm=0.0)
    with pytest.raises(ModelError):
        Steps.from_diameters([0.0, 10.0, 5.0], [10.0, 12.0], E_MPa=2e5, poisson=0.3)
    with pytest.raises(ModelError):
        Steps.from_diameters([0.0, 10.0], [10.0], [10.0], E_MPa=2e5, poisson=0.3)
    with pytest.raises(ModelError):
        BeamMesh(
            x_mm=np.array([0.0, 1.0, 1.0]),
            E_MPa=1.0,  # type: ignore[arg-type]
            G_MPa=1.0,  # type: ignore[arg-type]
            A_mm2=1.0,  # type: ignore[arg-type]
            I_mm4=1.0,  # type: ignore[arg-type]
            J_mm4=1.0,  # type: ignore[arg-type]
            k_shear=1.0,  # type: ignore[arg-type]
            rho_kg_m3=0.0,  # type: ignore[arg-type]
        )


def test_mesh_is_read_only() -> None:
    mesh, _ = build_mesh(_steps(), [], max_element_mm=100.0)
    with pytest.raises(ValueError):
        mesh.x_mm[0] = 1.0
