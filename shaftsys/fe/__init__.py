"""Finite-element beam core of a straight stepped shaft (pure numpy/scipy).

Units follow :mod:`shaftsys.units`: N, mm, N*mm, MPa, kg/m^3 (converted where used).
"""

from shaftsys.fe.banded_batch import (
    BatchSolution,
    cholesky_banded_batch,
    solve_banded_batch,
    solve_planar_batch,
)
from shaftsys.fe.beam import (
    bar_stiffness,
    bar_uniform_load,
    beam_stiffness,
    shear_parameter,
    uniform_load,
)
from shaftsys.fe.mesh import COINCIDENT_TOL_MM, BeamMesh, Steps, build_mesh
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
    warn_if_ill_conditioned,
)

__all__ = [
    "COINCIDENT_TOL_MM",
    "DEFAULT_COND_WARN",
    "DEFAULT_PIVOT_TOL",
    "KG_M2_TO_T_MM2",
    "KG_M3_TO_T_MM3",
    "KG_TO_T",
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
    "cowper_shear_coefficient",
    "left_right_at_nodes",
    "planar_stiffness_banded",
    "planar_support_dofs",
    "shear_parameter",
    "solve_banded_batch",
    "solve_planar_batch",
    "torsion_modes",
    "uniform_load",
    "warn_if_ill_conditioned",
]
