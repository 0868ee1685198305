"""Pure force models of shaft load elements (gears, belts, chains, couplings, weights).

Every function returns an :class:`AxisLoad`: the load the element puts on its own shaft,
reduced to the shaft axis at the element's axial position, in the shaft frame.
"""

from shaftsys.loads.base import AxisLoad, u_r, u_t
from shaftsys.loads.belts import (
    belt_hub_load,
    capstan_limit,
    chain_hub_load,
    min_pretension_N,
    open_belt_wrap_angle_deg,
    takeup_belt_hub_load,
)
from shaftsys.loads.gears import (
    bevel_mesh_load,
    gear_pitch_diameter_mm,
    helix_hand_sign,
    reference_pitch_diameter_mm,
    spur_helical_mesh_load,
    working_pitch_diameter_mm,
)
from shaftsys.loads.misc import coupling_load, point_load, unbalance_load, weight_load

__all__ = [
    "AxisLoad",
    "belt_hub_load",
    "bevel_mesh_load",
    "capstan_limit",
    "chain_hub_load",
    "coupling_load",
    "gear_pitch_diameter_mm",
    "helix_hand_sign",
    "min_pretension_N",
    "open_belt_wrap_angle_deg",
    "point_load",
    "reference_pitch_diameter_mm",
    "spur_helical_mesh_load",
    "takeup_belt_hub_load",
    "u_r",
    "u_t",
    "unbalance_load",
    "weight_load",
    "working_pitch_diameter_mm",
]
