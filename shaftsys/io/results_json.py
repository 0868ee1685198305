"""The JSON results contract (see README: keys are added, never renamed or dropped)."""

from __future__ import annotations

import math
from typing import Any

from shaftsys import __version__
from shaftsys.analysis.results import SCHEMA_VERSION, Result, ShaftResult
from shaftsys.units import OUTPUT_UNITS


def result_to_dict(result: Result) -> dict[str, Any]:
    """The JSON-ready dictionary of a result (public contract, schema ``SCHEMA_VERSION``)."""
    model = result.model
    shares = model.shares()
    checks = result.checks.to_dict() if result.checks is not None else None
    shaft_checks = {c["id"]: c for c in checks["shafts"]} if checks else {}
    bearing_checks = {c["id"]: c for c in checks["bearings"]} if checks else {}
    data: dict[str, Any] = {
        "schema_version": SCHEMA_VERSION,
        "tool_version": __version__,
        "model_sha256": model.sha256 or "",
        "model_file": model.source,
        "model_name": model.name,
        "units": dict(OUTPUT_UNITS),
        "cases": [
            {"id": c.id, "share": shares[c.id], "kind": c.kind.value,
             "duration": c.duration,
             "duration_unit": "h" if model.duration_in_hours else "fraction",
             "temperature_C": c.temperature_C}
            for c in model.cases
        ],
        "shafts": [],
        "bearings": [],
        "ok": result.ok,
        "verdict": result.verdict,
        "not_evaluated": list(result.not_evaluated),
        "failed_checks": list(result.failed_checks),
        "marginal": list(result.checks.marginal) if result.checks is not None else [],
        "checks_required": {"fatigue": model.fatigue_required,
                            "speed": model.checks.speed == "required",
                            "min_load": model.checks.min_load == "required"},
        "warnings": list(result.warnings),
    }
    for s in result.shafts:
        entry: dict[str, Any] = {
            "id": s.shaft.id,
            "length_mm": s.shaft.length_mm,
            "condition_estimate": s.condition_estimate,
            "cases": [
                {"case": c.case, "speed_rpm": c.speed_rpm, "torque_Nmm": c.torque_Nmm,
                 "max_deflection_mm": c.max_deflection_mm,
                 "max_slope_rad": float(c.slope_rad.max()),
                 "max_bending_moment_Nmm": float(c.M_Nmm.max()),
                 "force_residual_N": c.force_residual_N,
                 "moment_residual_Nmm": c.moment_residual_Nmm,
                 "residual_relative": max(c.residual_relative, c.nodal_residual_relative)}
                for c in s.cases
            ],
            "system": {"life_h": s.system_life_h, "limiting_bearing": s.limiting_bearing,
                       **(s.system.to_dict() if s.system is not None else {})},
            "elements": _element_forces(s),
        }
        if checks is not None:
            sc = shaft_checks[s.shaft.id]
            entry["first_critical_rpm"] = sc.get("first_critical_rpm")
            entry["first_torsional_rpm"] = sc.get("first_torsional_rpm")
            entry["min_fatigue_safety"] = sc.get("min_fatigue_safety")
            entry["min_yield_safety"] = sc.get("min_yield_safety")
            entry["checks"] = sc
        data["shafts"].append(entry)
    seat_ids = ({s.bearing_id for s in result.selection.seats}
                if result.selection is not None else set())
    for b in result.bearings:
        br = b.bearing
        item: dict[str, Any] = {
            "id": br.id, "shaft": b.shaft_id, "x_mm": br.support_x_mm,
            "mid_width_x_mm": br.x_mm, "type": br.kind.value, "axial_role": br.axial.value,
            "C_N": br.C_N, "C0_N": br.C0_N,
            "loads": [
                {"case": ld.case, "Fy_N": ld.Fy_N, "Fz_N": ld.Fz_N, "Fr_N": ld.Fr_N,
                 "Fx_N": ld.Fx_N, "Fa_N": ld.Fa_N, "speed_rpm": ld.speed_rpm,
                 "induced_axial_N": ld.induced_N, "deflection_mm": ld.deflection_mm,
                 "F_housing_N": _housing(b.shaft_id, result, (ld.Fx_N, ld.Fy_N, ld.Fz_N)),
                 "slope_rad": ld.slope_rad}
                for ld in b.loads
            ],
        }
        if b.life is not None:
            item["life"] = b.life.to_dict()
        if checks is not None and br.id in bearing_checks:
            item["misalignment"] = bearing_checks[br.id]
        if result.thermal is not None:
            item["thermal"] = result.thermal.bearing_cases(br.id)
        if result.internal is not None and br.id in result.internal:
            item["internal"] = result.internal[br.id]
        if b.operating:
            item["operating"] = [c.to_dict() for c in b.operating]
        item["ok"] = b.ok
        item["verdict"] = b.verdict
        if result.selection is not None and br.id in seat_ids:
            item["selection"] = result.selection.seat(br.id).to_dict()
        data["bearings"].append(item)
    if result.flows:
        data["links"] = _links(result)
        data["power_balance"] = [
            {"case": f.case, "power_in_W": f.power_in_W, "power_out_W": f.power_out_W,
             "loss_W": f.loss_W} for f in result.flows]
    if checks is not None:
        data["gears"] = checks["gears"]
        data["shaft_checks"] = checks
    if result.selection is not None:
        data["selection"] = result.selection.to_dict()
    if result.thermal is not None:
        data["thermal"] = result.thermal.to_dict()
    if result.duty_reduction is not None:
        from shaftsys.io.duty_cases import reduction_dict

        data["duty_reduction"] = reduction_dict(result.duty_reduction)
    nonlinear = nonlinear_solve_dict(result)
    if nonlinear is not None:
        data["nonlinear_solve"] = nonlinear
    data["system"] = {"life_h": result.system_life_h,
                      "limiting_bearing": result.limiting_bearing,
                      **(result.system.to_dict() if result.system is not None else {})}
    data["advisory_failed"] = list(result.advisory_failed)
    for entry, life_h in [(e["system"], s.system_life_h)
                          for e, s in zip(data["shafts"], result.shafts, strict=True)] + [
            (data["system"], result.system_life_h)]:
        if life_h is not None and math.isinf(life_h):
            entry["life_note"] = ("unbounded: no bearing wears (no case turns at or above "
                                  "life.min_speed with a load), the verdicts rest on static "
                                  "safety")
    return finite_results(data)


def _element_forces(s: ShaftResult) -> list[dict[str, Any]]:
    """Per element of the shaft: id, type, station and, per case, the forces it puts on
    the shaft (:func:`shaftsys.analysis.element_forces.element_case_forces`).
    """
    from shaftsys.analysis.element_forces import element_case_forces

    per_case = [(c.case, element_case_forces(s.shaft, c.applied)) for c in s.cases]
    out = []
    for k, el in enumerate(s.shaft.elements):
        cases = []
        for cid, items in per_case:
            row = dict(items[k])
            row.pop("id")
            cases.append({"case": cid, **row})
        out.append({"id": el.id, "type": type(el).__name__, "x_mm": el.x_mm,
                    "cases": cases})
    return out
def nonlinear_solve_dict(result: Result) -> dict[str, Any] | None:
    """The ``nonlinear_solve`` object: how the shaft solve with nonlinear bearing
    stiffness converged, per shaft and case (``None`` with rigid supports).
    """
    solver = result.model.solver
    if solver.bearing_stiffness != "nonlinear":
        return None
    shafts = []
    for s in result.shafts:
        info = s.nonlinear
        if info is None:
            continue
        shafts.append({
            "shaft": s.shaft.id, "bearings": list(info.bearings), "axial": info.axial,
            "cases": [{"case": c.case, "iterations": int(info.iterations[k]),
                       "residual": float(info.residual[k]),
                       "axial_passes": int(info.axial_passes[k]),
                       "converged": bool(info.residual[k] <= info.tolerance)}
                      for k, c in enumerate(s.cases)]})
    return {"bearing_stiffness": solver.bearing_stiffness,
            "tolerance": solver.nonlinear_tolerance,
            "max_iterations": solver.nonlinear_max_iterations, "shafts": shafts}


def finite_results(value: Any) -> Any:
    """The same tree with no non-finite number: an infinite value under key ``k`` is
    written ``null`` with ``k_unbounded: true`` beside it (e.g. ``life_h: null,
    life_h_unbounded: true``), NaN as ``null`` with ``k_undefined: true``; in a list an
    infinite number becomes ``null``.
    """
    if isinstance(value, dict):
        out: dict[str, Any] = {}
        for k, v in value.items():
            if isinstance(v, float) and not math.isfinite(v):
                out[k] = None
                out[f"{k}_unbounded" if math.isinf(v) else f"{k}_undefined"] = True
            else:
                out[k] = finite_results(v)
        return out
    if isinstance(value, list | tuple):
        return [None if isinstance(v, float) and not math.isfinite(v) else finite_results(v)
                for v in value]
    return value


def _housing(shaft_id: str, result: Result, force: tuple[float, float, float]
             ) -> list[float]:
    """A shaft-frame force in the housing frame (identity for unplaced single shafts)."""
    from shaftsys.machine.geometry import to_housing

    shaft = result.model.shaft(shaft_id)
    return [float(v) for v in to_housing(shaft, force)]


def _links(result: Result) -> list[dict[str, Any]]:
    """Per link and case: driver, power, loss and the force on each member (housing)."""
    out: list[dict[str, Any]] = []
    for link in result.model.links:
        cases = []
        for flow in result.flows:
            lf = next(x for x in flow.links if x.link_id == link.id)
            cases.append({
                "case": flow.case,
                "driver": lf.members[lf.driver],
                "power_W": lf.power_W,
                "loss_W": lf.loss_W,
                "members": [
                    {"element": lf.members[i], "F_housing_N": list(lf.force_housing_N[i])}
                    for i in (0, 1)
                ],
            })
        out.append({"id": link.id, "type": link.kind, "members": list(link.members),
                    "efficiency": link.efficiency, "cases": cases})
    return out
