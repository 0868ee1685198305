"""Inside the bearings: element loads, load zone, contact pressure, tangent stiffness and
reference life per bearing and case, from the solved reactions and shaft slopes.

Runs for every bearing whose model gives an ``interior`` (or whose catalogue row gave
one). The shaft's slope at the bearing is the tilt of the inner ring against the outer
ring (the housing is taken as aligned); the shaft's force on the bearing is the load of
the inner ring. The reference life follows
:mod:`shaftsys.bearings.interior_life` (ISO/TS 16281 approach) beside the ISO 281 life.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from shaftsys.analysis.results import BearingResult
from shaftsys.bearings.interior import (
    ROLLER_SLICES,
    ball_curvature_sums,
    distribution,
    hertz_point,
    line_contact_pressure,
    load_zone_factor,
    row_geometries,
    solve_displacement,
)
from shaftsys.bearings.interior_life import (
    combined_rows,
    conformity_ratio,
    reference_life,
    ring_ratings,
)


def _finite(x: float) -> float | None:
    return float(x) if math.isfinite(x) else None


def bearing_internal(b: BearingResult) -> dict[str, Any]:
    """The ``internal`` object of one bearing (JSON-ready, keys carry their units)."""
    br = b.bearing
    g = br.interior
    assert g is not None
    state = b.interior_state
    if state is not None:   # the nonlinear shaft solve: its rows and converged displacement
        rows = list(state.rows)
        u, iterations, residual = state.u, state.iterations, state.residual
    else:
        rows = row_geometries(br)
        F = np.array([[ld.Fy_N, ld.Fz_N, ld.Fx_N, 0.0, 0.0] for ld in b.loads])
        tilt = np.array([[0.0, 0.0, 0.0, ld.theta_y_rad, ld.theta_z_rad] for ld in b.loads])
        fixed = np.array([False, False, False, True, True])
        if all(r.alpha_deg == 0.0 for r in rows) and br.kind.is_roller:
            fixed[2] = True  # a cylindrical roller bearing takes no thrust on its rollers
            F[:, 2] = 0.0
        u, iterations, residual = solve_displacement(rows, F, fixed, tilt)
    dists = [distribution(r, u) for r in rows]
    Q = np.concatenate([d.Q_N for d in dists], axis=1)
    K = np.sum(np.stack([d.K for d in dists]), axis=0)
    line = br.kind.is_roller
    ratio = conformity_ratio(g.Dw_mm, g.dm_mm, g.contact_angle_deg, g.fi, g.fo, line)
    Qci, Qco = ring_ratings(br.C_N, g.Z, len(rows), g.contact_angle_deg, ratio, line)
    L_ref = combined_rows([reference_life(d.Q_N, Qci, Qco, line) for d in dists], line)
    L_iso = (np.asarray(b.life.case_L10_mrev, dtype=float) if b.life is not None
             else np.full(len(b.loads), np.nan))
    eps = load_zone_factor(rows[0], u)
    cases = []
    for k, ld in enumerate(b.loads):
        qmax = float(Q[k].max())
        if qmax <= 0.0:
            p_max = 0.0
        elif line:
            slice_max = max(float(d.Q_N[k].max()) for d in dists)
            p_max = line_contact_pressure(slice_max, g.Lwe_mm or g.Dw_mm, g.Dw_mm,
                                          g.dm_mm, g.contact_angle_deg)
        else:
            p_max = hertz_point(ball_curvature_sums(g.Dw_mm, g.dm_mm, g.contact_angle_deg,
                                                    g.fi, False), qmax)[3]
        ratio_k = L_ref[k] / L_iso[k] if math.isfinite(L_iso[k]) and L_iso[k] > 0 else math.nan
        cases.append({
            "case": ld.case,
            "ring_displacement_mm": [float(u[k, 0]), float(u[k, 1]), float(u[k, 2])],
            "ring_tilt_rad": [float(u[k, 3]), float(u[k, 4])],
            "load_zone_factor": _finite(float(eps[k])),
            "max_element_load_N": qmax,
            "max_contact_pressure_MPa": p_max,
            "element_loads_N": [float(q) for q in Q[k]],
            "stiffness_matrix": K[k].tolist(),
            "reference_life_mrev": _finite(float(L_ref[k])),
            "iso281_life_mrev": _finite(float(L_iso[k])),
            "life_ratio": _finite(float(ratio_k)),
        })
    return {
        "source": g.source, "estimated": list(g.estimated), "Dw_mm": g.Dw_mm, "Z": g.Z,
        "pitch_diameter_mm": g.dm_mm, "contact_angle_deg": g.contact_angle_deg,
        "clearance_mm": g.clearance_mm, "rows": len(rows),
        "stiffness_order": ["y_mm", "z_mm", "x_mm", "theta_y_rad", "theta_z_rad"],
        "element_angles_deg": [360.0 * j / g.Z for j in range(g.Z)] * len(rows),
        "newton_iterations": iterations, "newton_residual": residual,
        "shaft_solve_stiffness": "nonlinear" if state is not None else "rigid",
        "roller_slices": ROLLER_SLICES if line else 1,
        "cases": cases,
    }


def internal_results(bearings: tuple[BearingResult, ...]) -> dict[str, dict[str, Any]]:
    """``internal`` of every bearing with an interior, by bearing id."""
    return {b.bearing.id: bearing_internal(b) for b in bearings
            if b.bearing.interior is not None and b.loads}
