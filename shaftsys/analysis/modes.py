"""Natural modes of each shaft: the first bending and torsional critical speeds, the
bending mode shapes, and Rayleigh's and Dunkerley's classical estimates beside the
eigen-solution (the figures a reviewer checks the first critical against).

Same model as the critical-speed check (:func:`shaftsys.analysis.shaft_checks.
critical_speeds_rpm`): the non-rotating shaft (no gyroscopic effects) on its bearings
(rigid, or the typed radial/tilt stiffness), consistent beam mass plus the elements'
masses and diametral inertias; torsion with the elements' polar inertias, free at both
ends (its rigid-body mode dropped). Speeds are 60 f [rpm].
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np
from numpy.typing import NDArray

from shaftsys.analysis.solve import mesh_shaft
from shaftsys.fe.modal import (
    bending_matrices,
    classical_estimates,
    solve_modes,
    torsion_modes,
)
from shaftsys.fe.solve import Support
from shaftsys.model import BearingKind, Model, Shaft

#: Most beam elements of the modal mesh of one shaft (the dense eigenproblem grows with
#: the cube of the nodes; cubic elements meet the first closed-form modes to 1e-4 with 100)
MODAL_MAX_ELEMENTS = 300
#: Bending and torsional modes kept per shaft
MODES_KEPT = 3


@dataclass(frozen=True, eq=False)
class ShaftModes:
    """The modes of one shaft.

    ``bending_rpm``, ``torsional_rpm``: the lowest non-zero natural frequencies as speeds
    [rpm], ascending (at most :data:`MODES_KEPT`); ``node_x_mm`` the modal mesh's nodes;
    ``bending_shapes``: (modes, nodes) lateral displacement of each bending mode scaled
    to a largest |value| of 1 (sign: positive largest); ``rayleigh_rpm``,
    ``dunkerley_rpm``: the classical upper and lower estimates of the first bending
    critical (``nan`` when not defined).
    """

    shaft: str
    bending_rpm: tuple[float, ...]
    torsional_rpm: tuple[float, ...]
    node_x_mm: NDArray[np.float64]
    bending_shapes: NDArray[np.float64]
    rayleigh_rpm: float
    dunkerley_rpm: float

    def to_dict(self) -> dict[str, Any]:
        """JSON-ready (``None`` for a value that is not finite)."""
        def num(v: float) -> float | None:
            return float(v) if math.isfinite(v) else None

        return {"method": "finite-element eigen-solution of the non-rotating shaft",
                "bending_rpm": [num(v) for v in self.bending_rpm],
                "torsional_rpm": [num(v) for v in self.torsional_rpm],
                "rayleigh_rpm": num(self.rayleigh_rpm),
                "dunkerley_rpm": num(self.dunkerley_rpm),
                "shapes": [{"mode": k + 1, "rpm": num(self.bending_rpm[k]),
                            "x_mm": self.node_x_mm.tolist(),
                            "deflection": self.bending_shapes[k].tolist()}
                           for k in range(len(self.bending_rpm))]}


def _to_rpm(omega_rad_s: float) -> float:
    return 60.0 * omega_rad_s / (2.0 * math.pi)


def shaft_modes(shaft: Shaft, model: Model, *, max_element_mm: float | None = None,
                rotary_inertia: bool = False, n_modes: int = MODES_KEPT,
                estimates: bool = True,
                stiffness: Mapping[str, tuple[float, float | None]] | None = None
                ) -> ShaftModes:
    """The lowest ``n_modes`` bending and torsional modes of ``shaft`` with the classical
    estimates (mesh: ``max_element_mm`` or the model's solver setting, at most
    :data:`MODAL_MAX_ELEMENTS` elements; ``estimates=False`` leaves them ``nan``).
    ``stiffness``: bearing id -> (radial [N/mm], tilt [N*mm/rad]) springs that replace
    the typed support of those bearings (:func:`tangent_support_stiffness`).
    """
    h = max_element_mm or model.solver.max_element_mm
    h = max(h, shaft.length_mm / MODAL_MAX_ELEMENTS)
    sm = mesh_shaft(shaft, h)
    n = sm.mesh.n_nodes
    mass = np.zeros(n)
    dia = np.zeros(n)
    polar = np.zeros(n)
    for el in shaft.elements:
        k = sm.element_nodes[el.id]
        mass[k] += el.mass_kg
        dia[k] += el.diametral_inertia_kgm2
        polar[k] += el.polar_inertia_kgm2
    springs = stiffness or {}
    supports = [Support(sm.bearing_nodes[b.id], *springs[b.id]) if b.id in springs else
                Support(sm.bearing_nodes[b.id],
                        b.radial_stiffness_N_mm if b.radial_stiffness_N_mm else math.inf,
                        b.tilt_stiffness_Nmm_rad)
                for b in shaft.bearings if b.kind is not BearingKind.THRUST_BALL]
    label = f"shaft '{shaft.id}', bending modes"
    tors = torsion_modes(sm.mesh, (), polar_inertia_kgm2=polar, n_modes=min(n_modes + 1, n),
                         label=f"shaft '{shaft.id}', torsion modes")
    t_rpm = tuple(float(v) for v in _nonzero(tors.rpm)[0][:n_modes])
    # free DOFs: 2 per node less those the supports hold rigidly (deflection, tilt)
    held = sum(int(math.isinf(sp.k_t_N_mm)) + int(sp.k_r_Nmm_rad is not None
                                                  and math.isinf(sp.k_r_Nmm_rad))
               for sp in supports)
    kept = min(n_modes + 2, 2 * n - held)
    if kept < 1:     # every bending DOF of the mesh is held: no bending mode
        return ShaftModes(shaft.id, (), t_rpm, sm.mesh.x_mm.copy(), np.zeros((0, n)),
                          math.nan, math.nan)
    # one assembly serves the eigen-solution and the classical estimates
    K, M, rigid = bending_matrices(sm.mesh, supports, point_mass_kg=mass,
                                   point_inertia_kgm2=dia,
                                   shear=model.solver.shear_deformation,
                                   rotary_inertia=rotary_inertia, label=label)
    bend = solve_modes(K, M, rigid, kept, label)
    b_rpm, b_idx = _nonzero(bend.rpm)
    shapes = bend.shapes[0::2, b_idx[:n_modes]].T
    peak = np.take_along_axis(shapes, np.argmax(np.abs(shapes), axis=1)[:, None], axis=1)
    shapes = shapes / np.where(peak == 0.0, 1.0, peak)
    rayleigh, dunkerley = (classical_estimates(K, M, rigid) if estimates and supports
                           else (math.nan, math.nan))
    return ShaftModes(shaft.id, tuple(float(v) for v in b_rpm[:n_modes]), t_rpm,
                      sm.mesh.x_mm.copy(), shapes, _to_rpm(rayleigh), _to_rpm(dunkerley))


def _nonzero(rpm: NDArray[np.float64]) -> tuple[NDArray[np.float64], NDArray[np.intp]]:
    """The frequencies above the rigid-body noise [rpm] and their indices."""
    if rpm.size == 0:
        return rpm, np.zeros(0, dtype=np.intp)
    scale = float(np.max(rpm))
    idx = np.flatnonzero(rpm > 1e-6 * scale) if scale > 0 else np.zeros(0, dtype=np.intp)
    return rpm[idx], idx


def tangent_support_stiffness(model: Model, bearings: Sequence[Any]
                              ) -> dict[str, tuple[float, float | None]]:
    """Bearing id -> (radial [N/mm], tilt [N*mm/rad]) support springs of the bearings
    solved with nonlinear stiffness (``BearingResult.interior_state``): the tangent
    stiffness of the bearing's rows (:func:`shaftsys.bearings.interior.distribution`) in
    the running case with the largest |speed| (duty and peak cases; the speed a critical
    is judged against), averaged over the two radial planes and the two tilt axes. Empty
    for a model whose supports are rigid or typed.
    """
    from shaftsys.bearings.interior import distribution

    kinds = {c.id: c.kind.value for c in model.cases}
    out: dict[str, tuple[float, float | None]] = {}
    for b in bearings:
        state = getattr(b, "interior_state", None)
        if state is None or not b.loads:
            continue
        speeds = [abs(ld.speed_rpm) if kinds.get(ld.case) in ("duty", "peak") else -1.0
                  for ld in b.loads]
        k = int(np.argmax(speeds))
        u = np.asarray(state.u, dtype=float)[k:k + 1]
        K = sum(distribution(row, u).K[0] for row in state.rows)
        radial = 0.5 * (float(K[0, 0]) + float(K[1, 1]))
        tilt = 0.5 * (float(K[3, 3]) + float(K[4, 4]))
        if radial > 0.0 and math.isfinite(radial):
            out[b.bearing.id] = (radial, tilt if tilt > 0.0 and math.isfinite(tilt)
                                 else None)
    return out


def model_modes(model: Model) -> dict[str, ShaftModes]:
    """:func:`shaft_modes` of every shaft, by shaft id."""
    return {s.id: shaft_modes(s, model) for s in model.shafts}


__all__ = ["MODES_KEPT", "ShaftModes", "model_modes", "shaft_modes",
           "tangent_support_stiffness"]
