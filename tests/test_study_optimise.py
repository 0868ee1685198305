"""Best layout: an analytic optimum and a limit-bound optimum worked out by hand.

Shaft: uniform d = 50 mm, E = 210 000 MPa, Euler-Bernoulli, no weight; bearing A fixed at
x = 0, a 10 kN load at x_L = a = 200 mm, bearing B free in [250, 550] mm; two identical
deep groove ball bearings, radial load only, so margin_i = C/C_req,i is proportional to
1/R_i (ISO 281: P = Fr, L10 = (C/P)^3).
"""

from __future__ import annotations

import logging
import math

import pytest

from shaftsys.errors import ModelError
from shaftsys.study.optimise import optimise
from shaftsys.study.sweep import Limit
from tests.test_study_sweep import _two_bearing_model


@pytest.fixture(autouse=True)
def _quiet():
    logging.getLogger("shaftsys.bearings").setLevel(logging.ERROR)


def test_equal_reactions_optimum():
    """Statics: R_A = F (x_B - a)/x_B, R_B = F a/x_B; max-min of 1/R is at R_A = R_B,
    i.e. x_B = 2 a = 400 mm. The start grid (6 points: 250, 310, ..., 550) does not
    contain 400 mm, so the solver has to find it.

    Sensitivities at the optimum (ln L_i = -3 ln R_i + const):
    d ln L_A/dx_B = -3/(x_B - a) + 3/x_B = -3/200 + 3/400 = -0.0075 1/mm,
    d ln L_B/dx_B = 3/x_B = 0.0075 1/mm.
    """
    opt = optimise(_two_bearing_model(), {"bearing.B.at": (250.0, 550.0)}, grid=6)
    assert opt.start["bearing.B.at"] in (370.0, 430.0)
    assert opt.values["bearing.B.at"] == pytest.approx(400.0, abs=1e-3)
    assert opt.margins["A"] == pytest.approx(opt.margins["B"], rel=1e-6)
    assert opt.active_limit is None
    assert "margins of A and B balanced" in opt.active
    assert opt.sensitivity["A"]["bearing.B.at"] == pytest.approx(-0.0075, rel=1e-4)
    assert opt.sensitivity["B"]["bearing.B.at"] == pytest.approx(0.0075, rel=1e-4)


def test_deflection_limit_moves_optimum_to_boundary():
    """Deflection under the load <= 0.1 mm (Roark's Formulas for Stress and Strain,
    Table 8.1 case 1e, simply supported, intermediate load; from memory):
    y = F a^2 b^2 / (3 E I L), b = x_B - a, L = x_B. At x_B = 400 mm, y = 0.20695 mm,
    so the limit is active. For x_B < 400 B is the worse bearing and its margin grows
    with x_B, while y grows with x_B: the optimum is the largest x_B with y = 0.1 mm.

    Hand arithmetic: I = pi*50^4/64 = 306 796.16 mm^4, EI = 6.442719e10 N*mm^2,
    k = 3 EI y / (F a^2) = 3 * 6.442719e10 * 0.1 / (1e4 * 4e4) = 48.32039 mm;
    (x_B - a)^2 = k x_B  ->  x_B^2 - (2a + k) x_B + a^2 = 0,
    x_B = [(2a + k) + sqrt((2a + k)^2 - 4a^2)]/2
        = [448.32039 + sqrt(200 991.18 - 160 000)]/2 = (448.32039 + 202.46278)/2
        = 325.3916 mm.
    Sensitivities: d ln L_A/dx_B = -3/125.3916 + 3/325.3916 = -0.023925 + 0.0092197
    = -0.014705 1/mm; d ln L_B/dx_B = 3/325.3916 = 0.0092197 1/mm.
    """
    lim = Limit("deflection", ("load",), 0.1)
    opt = optimise(_two_bearing_model(), {"bearing.B.at": (250.0, 550.0)}, limits=[lim],
                   grid=6)
    assert opt.values["bearing.B.at"] == pytest.approx(325.3916, abs=2e-3)
    assert opt.active_limit == "deflection@load"
    assert opt.worst_support == "B"
    assert opt.limit_values["deflection@load"] == pytest.approx(1.0, abs=1e-6)
    assert opt.sensitivity["A"]["bearing.B.at"] == pytest.approx(-0.014705, rel=1e-3)
    assert opt.sensitivity["B"]["bearing.B.at"] == pytest.approx(0.0092197, rel=1e-3)
    assert math.isfinite(opt.lives_h["A"]) and opt.lives_h["A"] > opt.lives_h["B"]


def test_bad_bounds_are_input_errors():
    with pytest.raises(ModelError, match="lower < upper"):
        optimise(_two_bearing_model(), {"bearing.B.at": (500.0, 300.0)})
