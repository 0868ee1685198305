"""Orchestration: model -> element loads -> beam solve -> bearing spectra -> lives ->
shaft checks -> one complete :class:`Result`.

| module | job |
|---|---|
| ``results`` | result types (complete values) |
| ``element_forces`` | what each element puts on its shaft in a case |
| ``solve`` | mesh, bending/coupled solve, axial rule, torsion, equilibrium proof |
| ``life`` | bearing spectra -> ISO 281 lives, system lives |
| ``check_results``, ``shaft_checks`` | slopes, deflections, critical speeds, fatigue |
| ``pipeline`` | :func:`analyse` |

The names below are imported on first use (PEP 562), so that importing one module of
the package does not import them all (start-up time of the command line).
"""

from __future__ import annotations

import importlib
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from shaftsys.analysis.element_forces import (
        element_loads,
        shaft_speed,
    )
    from shaftsys.analysis.pipeline import (
        analyse,
    )
    from shaftsys.analysis.results import (
        FAIL,
        NOT_EVALUATED,
        PASS,
        SCHEMA_VERSION,
        AppliedLoad,
        BearingCaseLoad,
        BearingResult,
        CaseSolution,
        Result,
        ShaftResult,
    )
    from shaftsys.analysis.solve import (
        MAX_ELEMENTS,
        MAX_ROUNDOFF_RESIDUAL,
        ROUNDOFF_FACTOR,
        STATION_SNAP_MM,
        BendingSolution,
        ShaftMesh,
        equilibrium_residual,
        mesh_shaft,
        shaft_groups,
        shaft_weight_loads,
        snap_stations,
        solve_model,
    )

_HOME = {
    "element_loads": "element_forces",
    "shaft_speed": "element_forces",
    "analyse": "pipeline",
    "FAIL": "results",
    "NOT_EVALUATED": "results",
    "PASS": "results",
    "SCHEMA_VERSION": "results",
    "AppliedLoad": "results",
    "BearingCaseLoad": "results",
    "BearingResult": "results",
    "CaseSolution": "results",
    "Result": "results",
    "ShaftResult": "results",
    "MAX_ELEMENTS": "solve",
    "MAX_ROUNDOFF_RESIDUAL": "solve",
    "ROUNDOFF_FACTOR": "solve",
    "STATION_SNAP_MM": "solve",
    "BendingSolution": "solve",
    "ShaftMesh": "solve",
    "equilibrium_residual": "solve",
    "mesh_shaft": "solve",
    "shaft_groups": "solve",
    "shaft_weight_loads": "solve",
    "snap_stations": "solve",
    "solve_model": "solve",
}


def __getattr__(name: str) -> Any:
    """Import a public name of the package from its module on first use."""
    module = _HOME.get(name)
    if module is None:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
    value = getattr(importlib.import_module(f"shaftsys.analysis.{module}"), name)
    globals()[name] = value
    return value


__all__ = [
    "FAIL",
    "MAX_ELEMENTS",
    "MAX_ROUNDOFF_RESIDUAL",
    "NOT_EVALUATED",
    "PASS",
    "ROUNDOFF_FACTOR",
    "SCHEMA_VERSION",
    "STATION_SNAP_MM",
    "AppliedLoad",
    "BearingCaseLoad",
    "BearingResult",
    "BendingSolution",
    "CaseSolution",
    "Result",
    "ShaftMesh",
    "ShaftResult",
    "analyse",
    "element_loads",
    "equilibrium_residual",
    "mesh_shaft",
    "shaft_groups",
    "shaft_speed",
    "shaft_weight_loads",
    "snap_stations",
    "solve_model",
]
