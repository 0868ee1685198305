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
from dataclasses import replace
from typing import Any

import numpy as np
from numpy.typing import NDArray

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


def modified_reference_life(b: BearingResult, L_ref_mrev: Any, roller: bool
                            ) -> tuple[NDArray[np.float64], dict[str, Any]]:
    """The reference life from the element loads with the life factors of ISO 281:
    per case Lnmr = a1 aISO Lref / af^p (aISO and a1 of the bearing's ISO 281 life, 1 on
    its a1*L10 basis; af the application factor, applied as the ISO life applies it to P,
    p = 3 ball, 10/3 roller), combined over the duty cycle by Palmgren-Miner with the
    revolution weights, 1/L = sum U_i / L_i, and turned into hours with the mean speed.
    Returns the per-case modified reference lives [10^6 rev] and the duty-cycle values.
    """
    life = b.life
    m = len(b.loads)
    if life is None:
        return np.full(m, np.nan), {}
    p = 10.0 / 3.0 if roller else 3.0
    L_ref = np.asarray(L_ref_mrev, dtype=float) / life.application_factor**p
    a_iso = np.where(np.isfinite(life.aISO), life.aISO, 1.0)
    L_mod = life.a1 * a_iso * L_ref
    dyn = np.asarray(life.dynamic, dtype=bool) & (np.asarray(life.weights) > 0)
    to_h = 1e6 / (60.0 * life.n_m_rpm) if life.n_m_rpm > 0 else math.nan

    def miner(L: NDArray[np.float64]) -> float:
        inv = float(np.sum(np.asarray(life.weights)[dyn] / L[dyn])) if dyn.any() else 0.0
        return math.inf if inv == 0.0 else 1.0 / inv

    ref_h = miner(L_ref) * to_h
    mod_h = miner(L_mod) * to_h
    iso_h = float(life.Lnm_h)
    ratio = mod_h / iso_h if math.isfinite(mod_h) and iso_h > 0 and math.isfinite(iso_h) \
        else math.nan
    return np.where(dyn, L_mod, np.nan), {
        "reference_life_h": ref_h, "modified_reference_life_h": mod_h,
        "iso281_life_h": iso_h, "modified_life_ratio": ratio}


def bearing_internal(b: BearingResult, from_element_loads: bool = False) -> dict[str, Any]:
    """The ``internal`` object of one bearing (JSON-ready, keys carry their units);
    ``from_element_loads``: the model's ``life.from_element_loads`` (the verdict basis).
    """
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
    L_mod, duty = modified_reference_life(b, L_ref, line)
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
            "modified_reference_life_mrev": _finite(float(L_mod[k])),
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
        **duty,
        "verdict_basis": "element_loads" if from_element_loads and duty else "iso281",
    }


def internal_results(bearings: tuple[BearingResult, ...], from_element_loads: bool = False
                     ) -> dict[str, dict[str, Any]]:
    """``internal`` of every bearing with an interior, by bearing id."""
    return {b.bearing.id: bearing_internal(b, from_element_loads) for b in bearings
            if b.bearing.interior is not None and b.loads}


def element_load_verdicts(bearings: tuple[BearingResult, ...],
                          internal: dict[str, dict[str, Any]]) -> tuple[BearingResult, ...]:
    """The bearings with the life verdict of those with an interior taken from their
    modified reference life (``life.from_element_loads``): life_ok when it reaches the
    target; the ISO 281 values stay as they are (the ``internal`` object has both).
    """
    out = []
    for b in bearings:
        data = internal.get(b.bearing.id)
        if b.life is None or data is None or "modified_reference_life_h" not in data:
            out.append(b)
            continue
        life_h = data["modified_reference_life_h"]
        life_ok = bool(life_h >= b.life.target_h) if not math.isnan(life_h) else False
        out.append(replace(b, life=replace(b.life, life_ok=life_ok,
                                           ok=life_ok and b.life.static_ok)))
    return tuple(out)
