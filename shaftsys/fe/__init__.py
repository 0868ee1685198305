"""Finite-element beam core of a straight stepped shaft (pure numpy/scipy).

Units follow :mod:`shaftsys.units`: N, mm, N*mm, MPa, kg/m^3 (converted where used).

The names below are imported on first use (PEP 562): reading a model file needs only
:data:`STATION_SNAP_MM` of :mod:`shaftsys.fe.mesh`, and importing it must not import
scipy's linear algebra (start-up time of ``validate``, ``new`` and ``schema``).
"""

from __future__ import annotations

import importlib
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from shaftsys.fe.balance import global_balance
    from shaftsys.fe.banded_batch import (
        BatchSolution,
        cholesky_banded_batch,
        solve_banded_batch,
        solve_planar_batch,
        solve_supported_band,
    )
    from shaftsys.fe.beam import (
        bar_stiffness,
        bar_uniform_load,
        beam_stiffness,
        shear_parameter,
        uniform_load,
    )
    from shaftsys.fe.mesh import (
        COINCIDENT_TOL_MM,
        STATION_SNAP_MM,
        BeamMesh,
        Steps,
        build_mesh,
        cluster_nodes,
        node_order,
        snap_stations,
        snap_stations_batch,
    )
    from shaftsys.fe.modal import (
        KG_M2_TO_T_MM2,
        KG_M3_TO_T_MM3,
        KG_TO_T,
        Modes,
        bar_mass,
        beam_mass,
        bending_modes,
        torsion_modes,
    )
    from shaftsys.fe.sections import (
        Section,
        circular_section,
        circular_section_arrays,
        cowper_shear_coefficient,
    )
    from shaftsys.fe.solve import (
        DEFAULT_COND_WARN,
        DEFAULT_PIVOT_TOL,
        Bar,
        BarSupport,
        InternalForces,
        PlanarBending,
        Support,
        assemble_banded,
        banded_matmul,
        bar_stiffness_banded,
        bar_support_dofs,
        check_planar_mechanism,
        left_right_at_nodes,
        planar_stiffness_banded,
        planar_support_dofs,
        supported_scaled_band,
        warn_if_ill_conditioned,
    )

#: public name -> module of this package that holds it
_HOME = {
    "Bar": "solve",
    "BarSupport": "solve",
    "BatchSolution": "banded_batch",
    "BeamMesh": "mesh",
    "COINCIDENT_TOL_MM": "mesh",
    "DEFAULT_COND_WARN": "solve",
    "DEFAULT_PIVOT_TOL": "solve",
    "InternalForces": "solve",
    "KG_M2_TO_T_MM2": "modal",
    "KG_M3_TO_T_MM3": "modal",
    "KG_TO_T": "modal",
    "Modes": "modal",
    "PlanarBending": "solve",
    "STATION_SNAP_MM": "mesh",
    "Section": "sections",
    "Steps": "mesh",
    "Support": "solve",
    "assemble_banded": "solve",
    "banded_matmul": "solve",
    "bar_mass": "modal",
    "bar_stiffness": "beam",
    "bar_stiffness_banded": "solve",
    "bar_support_dofs": "solve",
    "bar_uniform_load": "beam",
    "beam_mass": "modal",
    "beam_stiffness": "beam",
    "bending_modes": "modal",
    "build_mesh": "mesh",
    "check_planar_mechanism": "solve",
    "cholesky_banded_batch": "banded_batch",
    "circular_section": "sections",
    "circular_section_arrays": "sections",
    "cluster_nodes": "mesh",
    "cowper_shear_coefficient": "sections",
    "global_balance": "balance",
    "left_right_at_nodes": "solve",
    "node_order": "mesh",
    "planar_stiffness_banded": "solve",
    "planar_support_dofs": "solve",
    "shear_parameter": "beam",
    "snap_stations": "mesh",
    "snap_stations_batch": "mesh",
    "solve_banded_batch": "banded_batch",
    "solve_planar_batch": "banded_batch",
    "solve_supported_band": "banded_batch",
    "supported_scaled_band": "solve",
    "torsion_modes": "modal",
    "uniform_load": "beam",
    "warn_if_ill_conditioned": "solve",
}


def __getattr__(name: str) -> Any:
    """Import a public name of the package from its module on first use."""
    module = _HOME.get(name)
    if module is None:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
    value = getattr(importlib.import_module(f"shaftsys.fe.{module}"), name)
    globals()[name] = value
    return value


__all__ = [
    "COINCIDENT_TOL_MM",
    "DEFAULT_COND_WARN",
    "DEFAULT_PIVOT_TOL",
    "KG_M2_TO_T_MM2",
    "KG_M3_TO_T_MM3",
    "KG_TO_T",
    "STATION_SNAP_MM",
    "Bar",
    "BarSupport",
    "BatchSolution",
    "BeamMesh",
    "InternalForces",
    "Modes",
    "PlanarBending",
    "Section",
    "Steps",
    "Support",
    "assemble_banded",
    "banded_matmul",
    "bar_mass",
    "bar_stiffness",
    "bar_stiffness_banded",
    "bar_support_dofs",
    "bar_uniform_load",
    "beam_mass",
    "beam_stiffness",
    "bending_modes",
    "build_mesh",
    "check_planar_mechanism",
    "cholesky_banded_batch",
    "circular_section",
    "circular_section_arrays",
    "cluster_nodes",
    "cowper_shear_coefficient",
    "global_balance",
    "left_right_at_nodes",
    "node_order",
    "planar_stiffness_banded",
    "planar_support_dofs",
    "shear_parameter",
    "snap_stations",
    "snap_stations_batch",
    "solve_banded_batch",
    "solve_planar_batch",
    "solve_supported_band",
    "supported_scaled_band",
    "torsion_modes",
    "uniform_load",
    "warn_if_ill_conditioned",
]
