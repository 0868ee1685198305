"""The pipeline: model -> solve -> lives -> shaft checks -> one complete :class:`Result`.

``analyse(model)`` is the one entry point of a single run; design studies compose the
same pieces vectorised over variants (:mod:`shaftsys.study`). Nothing is written back
onto the model and the result is built once, complete: what was not evaluated is
``None`` and its verdict says so (never a pass).
"""

from __future__ import annotations

from typing import Any

import numpy as np

from shaftsys.analysis.interior import element_load_verdicts, internal_results
from shaftsys.analysis.life import evaluate_lives
from shaftsys.analysis.modes import tangent_support_stiffness
from shaftsys.analysis.results import Result
from shaftsys.analysis.selection import choose_bearings
from shaftsys.analysis.shaft_checks import check_shaft_results
from shaftsys.analysis.solve import solve_model
from shaftsys.analysis.thermal import evaluate_thermal, thermal_notes
from shaftsys.model import Model


def analyse(model: Model, *, with_life: bool = True, with_shaft_checks: bool = True
            ) -> Result:
    """Solve every shaft in every case, evaluate every bearing and check every shaft.

    A model with open supports (``model.open_seats``) first gets its bearings chosen
    (:func:`shaftsys.analysis.selection.choose_bearings`); the result holds the model
    with the choices in and the ``selection``. A support for which no catalogue row
    qualifies stays open: its life is not evaluated and the verdict is not a pass.

    ``with_life=False`` leaves every bearing's life ``None`` (verdict "not evaluated");
    ``with_shaft_checks=False`` leaves ``Result.checks`` ``None`` (likewise).

    Errors name the object and attribute of the model (``bearings[A].C_N``); the model
    file's line and key are added by :func:`shaftsys.io.locate.locate_error` (which
    :func:`shaftsys.analyse` and the command line apply).

    Raises
    ------
    ModelError: an input the solve reveals to be wrong (e.g. axial load on a needle
        bearing).
    NumericalError: a singular or ill-posed system, or an equilibrium residual above
        ``model.solver.residual_tolerance``.
    """
    selection = None
    if model.open_seats:
        model, selection = choose_bearings(model)
    solved = solve_model(model)
    shafts = solved.shafts
    bearings = solved.bearings
    system_life_h: float | None = None
    limiting: str | None = None
    machine_system = None
    thermal = evaluate_thermal(model, bearings)
    warnings = solved.warnings + (tuple(thermal_notes(thermal)) if thermal else ())
    # a case without a steady temperature leaves the lives unevaluated (not a pass)
    if with_life and not (thermal is not None and thermal.any_runaway):
        lives = evaluate_lives(model, bearings,
                               thermal.life_temperatures() if thermal else None)
        bearings = lives.bearings
        system_life_h, limiting = lives.system_life_h, lives.limiting_bearing
        machine_system = lives.machine
        shaft_lives = lives.shaft_lives or {}
        shafts = tuple(s.with_system_life(*lives.shaft_system[s.shaft.id],
                                          shaft_lives.get(s.shaft.id)) for s in shafts)
    checks = None
    if with_shaft_checks:
        springs = (tangent_support_stiffness(model, bearings)
                   if model.solver.bearing_stiffness == "nonlinear" else None)
        checks = check_shaft_results(model, shafts, stiffness=springs)
    from_loads = model.life.from_element_loads
    internal = internal_results(bearings, from_loads) if with_life else None
    if internal and from_loads:
        bearings = element_load_verdicts(bearings, internal)
    return Result(model=model, shafts=shafts, bearings=bearings,
                  system_life_h=system_life_h, limiting_bearing=limiting,
                  warnings=(*model.warnings, *warnings, *_rating_slips(model, bearings)),
                  checks=checks, flows=solved.flows, selection=selection, thermal=thermal,
                  internal=internal or None, system=machine_system)


def _rating_slips(model: Model, bearings: Any) -> list[str]:
    """A dynamic rating C below the largest static equivalent load P0 the bearing
    carries is almost certainly a unit slip (kN written as N): warned, naming the file,
    line, field and the value as read.
    """
    out = []
    for b in bearings:
        if b.life is None:
            continue
        P0 = np.asarray(b.life.P0_N, dtype=float)
        worst = float(np.nanmax(P0)) if P0.size and np.any(np.isfinite(P0)) else 0.0
        if worst > b.bearing.C_N:
            where = f"{model.source}:{b.bearing.line}: " if model.source else ""
            out.append(f"{where}shafts[{b.shaft_id}].bearings[{b.bearing.id}].C: the dynamic "
                       f"rating read as {b.bearing.C_N:.4g} N is below the largest static "
                       f"equivalent load on the bearing, {worst:.4g} N: is the unit right "
                       "(kN)?")
    return out
