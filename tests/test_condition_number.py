"""The condition number of the scaled bending stiffness: exact for ordinary shafts,
estimated (Hager-Higham, a lower bound) above ``EXACT_CONDITION_MAX_DOF`` unknowns.

Reference: the 1-norm condition number computed densely with numpy
(``numpy.linalg.cond(A, 1)``) of the same matrix (rigid rows replaced by identity,
Jacobi-scaled), as in ``tests/test_fe_bending.py``; the factor-3 bound on the
estimate is Higham's observation for the t = 1 estimator (*Accuracy and Stability of
Numerical Algorithms*, ch. 15, from memory).
"""

from __future__ import annotations

import numpy as np
import pytest

from shaftsys.fe.mesh import Steps, build_mesh
from shaftsys.fe.solve import EXACT_CONDITION_MAX_DOF, PlanarBending, Support


def _dense_condition(pb: PlanarBending) -> float:
    K = pb.stiffness_matrix(include_springs=True)
    K[pb.rigid, :] = 0.0
    K[:, pb.rigid] = 0.0
    K[pb.rigid, pb.rigid] = 1.0
    s = 1 / np.sqrt(np.diag(K))
    return float(np.linalg.cond(s[:, None] * K * s[None, :], 1))


def _beam(n_elements: int) -> PlanarBending:
    steps = Steps.from_diameters([0.0, 800.0], [40.0], E_MPa=210000.0, poisson=0.3)
    mesh, (n0, n1) = build_mesh(steps, [0.0, 800.0], max_element_mm=800.0 / n_elements)
    return PlanarBending.from_mesh(mesh, [Support(n0), Support(n1, 3e4)], shear=False,
                                   label="beam")


@pytest.mark.parametrize("n_elements", [8, 100])
def test_exact_below_the_limit(n_elements: int) -> None:
    pb = _beam(n_elements)
    assert 2 * (n_elements + 1) <= EXACT_CONDITION_MAX_DOF
    exact = _dense_condition(pb)
    # both sides carry the round-off of an inverse, about eps * cond (2e-8 at 1e8)
    assert pb.condition_estimate == pytest.approx(exact, rel=max(1e-12, 10 * 2.2e-16 * exact))


def test_estimated_above_the_limit() -> None:
    pb = _beam(EXACT_CONDITION_MAX_DOF // 2 + 50)
    exact = _dense_condition(pb)
    assert exact / 3 <= pb.condition_estimate <= exact * (1 + 1e-9)
