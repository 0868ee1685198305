"""Shaft checks on a solved model: slopes and deflections, critical speeds, fatigue.

``check_shafts(result) -> ShaftChecks`` reads a solved :class:`~shaftsys.analysis.Result`
and never changes it. Units follow :mod:`shaftsys.units`: mm, rad (slopes), rpm, MPa,
N*mm, N, degC.

1. **Slopes and deflections** at every bearing (support node) and every gear
   (:class:`~shaftsys.model.Gear`, :class:`~shaftsys.model.BevelGear`) in every case,
   from ``CaseSolution.displacement``: deflection = hypot(uy, uz) [mm], slope =
   hypot(ry, rz) [rad], absolute (bearing springs included). Bearings: the upper end
   of the typical range of :func:`~shaftsys.checks.bearing_slope_limit` (above it the
   slope is "exceeded"; between the low and high end "marginal", a note), or the
   per-bearing limit of :attr:`ShaftCheckSettings.bearing_slope_limits_rad`. Gears:
   slope 0.0005 rad and deflection :func:`~shaftsys.checks.gear_deflection_limit_mm`
   of the normal module (Shigley Table 7-2, from memory), or 0.13 mm when no module is
   known (common practice, no source). Every case counts (duty, peak and static).
2. **Critical speeds** per shaft: the lowest non-zero planar bending frequency of the
   non-rotating shaft (:func:`shaftsys.fe.modal.bending_modes`: consistent mass rho*A of
   the steps, lumped element masses and diametral inertias at their nodes, bearing
   radial and tilt stiffness, rigid = eliminated; thrust ball bearings give no radial
   support; Timoshenko or Euler-Bernoulli as ``model.solver.shear_deformation``) and
   the first non-zero torsional frequency of the free-free shaft with the elements'
   polar inertias (:func:`shaftsys.fe.modal.torsion_modes`; the rigid-body mode is
   skipped). Gyroscopic effects and speed-dependent bearing stiffness are left out.
   Verdict (common practice, no source): the first bending critical must exceed
   ``margin`` x the largest |speed| of the duty and peak cases (subcritical), or lie
   below that speed / ``margin`` (supercritical: accepted with a warning note).
3. **Fatigue and first-cycle yield** at every section of interest (Shigley ch. 7 via
   :mod:`shaftsys.checks`):

   * every step edge with a diameter change (``shoulder``): d = smaller, D = larger
     diameter; the fillet radius is the ``fillet_mm`` of the step that *starts* at the
     edge (the field's meaning in the model and the model-file format: "fillet radius at
     the shoulder where the step starts"); if that step gives none, the sharp-shoulder
     r = 0.02 d of Shigley Table 7-1 (from memory) is assumed and noted;
   * a step with a keyway: an end-milled (``profile``) or sled-runner keyseat at every
     element seat on the step (at the step's worst station if no element sits there);
   * a step with a retaining-ring groove: at the step's worst station (the groove's
     position is not in the model; worst = largest M^2 + 0.75 T^2 over the cases);
   * every hub seat of an element (gear, bevel gear, pulley, sprocket, coupling, lumped
     mass): a press fit (Kf applied directly), at the hub edge (x +- width/2, kept on
     the step) with the larger bending moment, or at the element's station when its
     width is not given.

   The shaft rotates: the resultant bending moment M at the section is taken as fully
   reversed (amplitude M; loads turning with the shaft, such as unbalance, are counted
   as alternating too, which is conservative); torque and axial force are mean unless
   they change sign between cases (:func:`~shaftsys.checks.classify_section_loads`,
   rule ``"reversal"``). The classification runs over the duty cases (peak and static
   cases feed the yield check only; ``fatigue_cases="duty_and_peak"`` gives an
   envelope). First-cycle yield is
   Sy over the largest peak von Mises stress of any single case (duty, peak, static)
   and of the fatigue classification. Marin factors: the section step's surface finish,
   the model's target reliability, the highest given temperature of the cases used (20
   degC when none is given). Fatigue is "not evaluated" (with the reason) when the
   material has no Su or Sy or no duty case gives loads; a required fatigue check that is
   not evaluated fails the run (``Model.fatigue_required``, the model file's
   ``checks: {fatigue: not_required}`` lifts it).
"""

from __future__ import annotations

import logging
import math
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from shaftsys.analysis.check_results import (
    DEFAULT_CRITICAL_SPEED_MARGIN,
    DEFAULT_GEAR_DEFLECTION_LIMIT_MM,
    DEFAULT_REQUIRED_FATIGUE_SAFETY,
    DEFAULT_REQUIRED_YIELD_SAFETY,
    CaseDeflection,
    DeflectionCheck,
    SectionCheck,
    ShaftCheck,
    ShaftChecks,
    ShaftCheckSettings,
)
from shaftsys.analysis.modes import MODAL_MAX_ELEMENTS, shaft_modes
from shaftsys.analysis.results import CaseSolution, Result, ShaftResult
from shaftsys.checks import (
    SPUR_GEAR_SLOPE_LIMIT_RAD,
    Feature,
    LoadClasses,
    SectionCaseLoads,
    SlopeLimit,
    bearing_slope_limit,
    check_section,
    classify_section_loads,
    gear_deflection_limit_mm,
    marin_endurance_limit,
    notch_factors,
    section_stresses,
    slope_status,
    yield_safety_factor,
)
from shaftsys.model import (
    BevelGear,
    CaseKind,
    Coupling,
    Gear,
    LumpedMass,
    Model,
    Pulley,
    Shaft,
    Sprocket,
)

log = logging.getLogger(__name__)


_CP = "common practice, no source"
#: Sharp-shoulder fillet r/d assumed when no fillet is given (Shigley 9th ed. Table 7-1).
SHARP_FILLET_R_OVER_D = 0.02
#: Temperature used for kd when no case gives one [degC].
ROOM_TEMPERATURE_C = 20.0
#: Stations closer than this are the same section [mm].
_STATION_TOL_MM = 1e-6
_SURFACE = {"forged": "as_forged"}
_KEYWAY = {"profile": Feature.KEYSEAT_END_MILL, "sled_runner": Feature.KEYSEAT_SLED_RUNNER}
_SEAT_TYPES = (Gear, BevelGear, Pulley, Sprocket, Coupling, LumpedMass)

__all__ = [
    "DEFAULT_CRITICAL_SPEED_MARGIN",
    "DEFAULT_GEAR_DEFLECTION_LIMIT_MM",
    "DEFAULT_REQUIRED_FATIGUE_SAFETY",
    "DEFAULT_REQUIRED_YIELD_SAFETY",
    "MODAL_MAX_ELEMENTS",
    "CaseDeflection",
    "DeflectionCheck",
    "SectionCheck",
    "ShaftCheck",
    "ShaftCheckSettings",
    "ShaftChecks",
    "check_shaft_results",
    "check_shafts",
    "critical_speeds_rpm",
    "gear_limits",
    "settings_from_model",
]


# ----------------------------------------------------------------------------- entry
def check_shafts(result: Result, settings: ShaftCheckSettings | None = None) -> ShaftChecks:
    """Slope/deflection, critical-speed and fatigue checks of every shaft of ``result``.

    Parameters
    ----------
    result:
        A solved model (:func:`shaftsys.analysis.analyse`).
    settings:
        Options; ``None`` = the model's ``checks:`` settings
        (:func:`settings_from_model`).

    Returns
    -------
    ShaftChecks

    Raises
    ------
    ValueError
        A bearing id in ``settings.bearing_slope_limits_rad`` is not in the model.
    NumericalError
        The eigenvalue problem is ill-posed (massless degrees of freedom).
    """
    return check_shaft_results(result.model, result.shafts, settings)


def check_shaft_results(model: Model, solved: tuple[ShaftResult, ...],
                        settings: ShaftCheckSettings | None = None,
                        stiffness: Mapping[str, tuple[float, float | None]] | None = None
                        ) -> ShaftChecks:
    """:func:`check_shafts` of solved shafts (what the pipeline calls before the
    :class:`~shaftsys.analysis.results.Result` exists). ``stiffness``: support springs
    of bearings solved with nonlinear stiffness, for the modes
    (:func:`shaftsys.analysis.modes.tangent_support_stiffness`).
    """
    st = settings or settings_from_model(model)
    known = {b.id for _, b in model.bearings()}
    unknown = sorted(set(st.bearing_slope_limits_rad) - known)
    if unknown:
        raise ValueError(f"slope limits given for unknown bearings {unknown}; "
                         f"bearings are {sorted(known)}")
    bearings: list[DeflectionCheck] = []
    gears: list[DeflectionCheck] = []
    shafts: list[ShaftCheck] = []
    for sr in solved:
        bearings.extend(_bearing_checks(sr, st))
        gears.extend(_gear_checks(sr, st))
        shafts.append(_shaft_check(model, sr, st, stiffness))
    return ShaftChecks(tuple(shafts), tuple(bearings), tuple(gears), st)


# ----------------------------------------------------------------------------- slopes
def _node_index(sol: CaseSolution, x_mm: float) -> int:
    return int(np.argmin(np.abs(sol.node_x_mm - x_mm)))


def settings_from_model(model: Model) -> ShaftCheckSettings:
    """The shaft-check settings the model file's ``checks:`` section gives
    (:class:`~shaftsys.model.CheckSettings`; defaults where it is silent).
    """
    c = model.checks
    return ShaftCheckSettings(
        bearing_slope_limits_rad={k: v.slope_rad for k, v in c.bearings.items()
                                  if v.slope_rad is not None},
        bearing_type_slope_limits_rad=dict(c.bearing_slope_by_type),
        gear_slope_limit_rad=(c.gear_slope_rad if c.gear_slope_rad is not None
                              else SPUR_GEAR_SLOPE_LIMIT_RAD),
        gear_slope_limits_rad={k: v.slope_rad for k, v in c.gears.items()
                               if v.slope_rad is not None},
        gear_slope_from_model=c.gear_slope_rad is not None,
        gear_deflection_limit_mm=c.gear_deflection_mm,
        gear_deflection_per_module=c.gear_deflection_per_module,
        gear_deflection_limits_mm={k: v.deflection_mm for k, v in c.gears.items()
                                   if v.deflection_mm is not None},
        gear_deflection_per_module_by_gear={
            k: v.deflection_per_module for k, v in c.gears.items()
            if v.deflection_per_module is not None},
        criterion=c.fatigue_criterion,
        required_fatigue_safety=c.fatigue_safety,
        required_yield_safety=c.yield_safety,
    )


def _case_deflection(sol: CaseSolution, i: int, status: str) -> CaseDeflection:
    """Resultant and per-plane deflection and slope at node ``i`` of one case."""
    u = sol.displacement[i]
    return CaseDeflection(sol.case, float(sol.deflection_mm[i]), float(sol.slope_rad[i]),
                          status, deflection_y_mm=float(u[1]), deflection_z_mm=float(u[2]),
                          slope_xy_rad=float(u[5]), slope_xz_rad=float(-u[4]))


def _bearing_checks(sr: ShaftResult, st: ShaftCheckSettings) -> list[DeflectionCheck]:
    out = []
    for b in sr.shaft.bearings:
        if b.id in st.bearing_slope_limits_rad:
            v = float(st.bearing_slope_limits_rad[b.id])
            lim = SlopeLimit(v, v, "user setting")
            rule = f"checks.bearings.{b.id}.slope"
        elif b.kind.value in st.bearing_type_slope_limits_rad:
            v = float(st.bearing_type_slope_limits_rad[b.kind.value])
            lim = SlopeLimit(v, v, "user setting")
            rule = f"checks.bearing_slope.{b.kind.value}"
        else:
            lim = bearing_slope_limit(b.kind)
            rule = f"default for {b.kind.value.replace('_', ' ')} bearings"
        cases = []
        for sol in sr.cases:
            i = _node_index(sol, b.support_x_mm)
            s = float(sol.slope_rad[i])
            cases.append(_case_deflection(sol, i, slope_status(s, lim)))
        ok = all(c.status != "exceeded" for c in cases)
        out.append(DeflectionCheck(b.id, sr.shaft.id, "bearing", b.support_x_mm,
                                   lim.high_rad, lim.low_rad, None, lim.source,
                                   tuple(cases), ok, slope_rule=rule))
    return out


def gear_limits(el: Gear | BevelGear, st: ShaftCheckSettings
                ) -> tuple[float, str, float, str, str]:
    """Slope limit [rad], its rule, deflection limit [mm], its rule and the source text
    of one gear, in the order: the gear's own setting, the model-wide setting, the
    default (slope 0.0005 rad and Shigley's deflection table by the diametral pitch
    P = 25.4/m, Table 7-2, from memory; 0.13 mm without a module, common practice).
    A fraction of the module on a gear without one falls back to that default.
    """
    module = el.normal_module_mm if isinstance(el, Gear) else None
    if el.id in st.gear_slope_limits_rad:
        slim, srule = float(st.gear_slope_limits_rad[el.id]), f"checks.gears.{el.id}.slope"
    elif st.gear_slope_from_model:
        slim, srule = st.gear_slope_limit_rad, "checks.gear_slope"
    elif st.gear_slope_limit_rad == SPUR_GEAR_SLOPE_LIMIT_RAD:
        slim, srule = st.gear_slope_limit_rad, "default 0.0005 rad (uncrowned spur gear)"
    else:
        slim, srule = st.gear_slope_limit_rad, "settings: gear_slope_limit_rad"
    fraction = st.gear_deflection_per_module_by_gear.get(el.id)
    frac_key = f"checks.gears.{el.id}.deflection_per_module"
    if fraction is None and el.id not in st.gear_deflection_limits_mm:
        fraction, frac_key = st.gear_deflection_per_module, "checks.gear_deflection_per_module"
    if el.id in st.gear_deflection_limits_mm:
        dlim = float(st.gear_deflection_limits_mm[el.id])
        drule = f"checks.gears.{el.id}.deflection"
    elif fraction is not None and module is not None:
        dlim = fraction * module
        drule = f"{frac_key}: {fraction:g} x normal module {module:g} mm"
    elif st.gear_deflection_limit_mm is not None and fraction is None:
        dlim, drule = st.gear_deflection_limit_mm, "checks.gear_deflection"
    elif module is not None:
        dlim = gear_deflection_limit_mm(module)
        drule = (f"default by diametral pitch P = 25.4/m = {25.4 / module:.3g} 1/in "
                 "(Shigley 9th ed. Table 7-2)")
    else:
        dlim = st.default_gear_deflection_limit_mm
        drule = (f"default {dlim:g} mm (no module given" +
                 (", so no fraction of it" if fraction is not None else "") + f"; {_CP})")
    user = srule.startswith("checks") or drule.startswith("checks")
    if user:
        src = "model file (checks)"
    elif module is not None:
        src = "Shigley 9th ed. Table 7-2, module-based deflection"
    else:
        src = f"slope: Shigley 9th ed. Table 7-2; deflection: {_CP}"
    return slim, srule, dlim, drule, src


def _gear_checks(sr: ShaftResult, st: ShaftCheckSettings) -> list[DeflectionCheck]:
    out = []
    for el in sr.shaft.elements:
        if not isinstance(el, Gear | BevelGear):
            continue
        slim, srule, dlim, drule, src = gear_limits(el, st)
        cases = []
        for sol in sr.cases:
            i = _node_index(sol, el.x_mm)
            d = float(sol.deflection_mm[i])
            s = float(sol.slope_rad[i])
            status = "ok" if (s <= slim and d <= dlim) else "exceeded"
            cases.append(_case_deflection(sol, i, status))
        ok = all(c.status == "ok" for c in cases)
        out.append(DeflectionCheck(el.id, sr.shaft.id, "gear", el.x_mm, slim, slim, dlim,
                                   src, tuple(cases), ok, slope_rule=srule,
                                   deflection_rule=drule))
    return out


# ----------------------------------------------------------------------------- modes
def critical_speeds_rpm(shaft: Shaft, model: Model, *, max_element_mm: float | None = None,
                        rotary_inertia: bool = False) -> tuple[float, float]:
    """First bending and first non-zero torsional natural frequency of a shaft [rpm].

    Parameters
    ----------
    shaft:
        The shaft (steps, material, bearings, elements with mass and inertias).
    model:
        The model (``solver.shear_deformation`` and ``solver.max_element_mm``).
    max_element_mm:
        Longest element of the modal mesh [mm] (``None`` = the model's solver setting).
    rotary_inertia:
        Include the shaft's distributed rotary inertia.

    Returns
    -------
    tuple of float
        (bending, torsion) as speeds 60 f [rpm]; ``inf`` when there is no such mode.
        The modes themselves: :func:`shaftsys.analysis.modes.shaft_modes`.
    """
    m = shaft_modes(shaft, model, max_element_mm=max_element_mm,
                    rotary_inertia=rotary_inertia, n_modes=1, estimates=False)
    return _first(m.bending_rpm), _first(m.torsional_rpm)


def _first(rpm: tuple[float, ...]) -> float:
    return rpm[0] if rpm else math.inf


def _shaft_check(model: Model, sr: ShaftResult, st: ShaftCheckSettings,
                 stiffness: Mapping[str, tuple[float, float | None]] | None = None
                 ) -> ShaftCheck:
    shaft = sr.shaft
    springs = {k: v for k, v in (stiffness or {}).items()
               if any(b.id == k for b in shaft.bearings)}
    notes: list[str] = ["critical speeds of the non-rotating shaft: gyroscopic effects and "
                        "speed-dependent bearing stiffness are left out"]
    if springs:
        notes.append("critical speeds with the tangent stiffness of the nonlinear bearings "
                     "(" + ", ".join(f"{k}: {v[0]:.4g} N/mm" for k, v in springs.items())
                     + ") in the fastest running case")
    modes = shaft_modes(shaft, model, max_element_mm=st.max_element_mm,
                        rotary_inertia=st.rotary_inertia, stiffness=springs or None)
    f_bend, f_tors = _first(modes.bending_rpm), _first(modes.torsional_rpm)
    kinds = {c.id: c.kind for c in model.cases}
    speeds = [abs(cs.speed_rpm) for cs in sr.cases
              if kinds[cs.case] in (CaseKind.DUTY, CaseKind.PEAK)]
    n_max = max(speeds, default=0.0)
    margin = st.critical_speed_margin
    supercritical = False
    if n_max == 0.0 or f_bend >= margin * n_max:
        crit_ok = True
    elif f_bend <= n_max / margin:
        crit_ok = True
        supercritical = True
        notes.append(f"WARNING: supercritical: the first bending critical {f_bend:.0f} rpm "
                     f"lies below the top speed {n_max:.0f} rpm / {margin:g}; the shaft "
                     "runs through it at start-up and run-down")
    else:
        crit_ok = False
        notes.append(f"first bending critical {f_bend:.0f} rpm within the margin "
                     f"{margin:g} of the top speed {n_max:.0f} rpm ({_CP})")
    if n_max > 0.0 and n_max / margin < f_tors < margin * n_max:
        notes.append(f"WARNING: first torsional frequency {f_tors:.0f} rpm lies within "
                     f"the margin {margin:g} of the top speed {n_max:.0f} rpm")
    sections, fnotes, skipped = _fatigue_sections(model, sr, st)
    notes.extend(fnotes)
    n_f = min((s.n_fatigue for s in sections), default=math.inf)
    n_y = min((s.n_yield for s in sections), default=math.inf)
    return ShaftCheck(
        id=shaft.id, first_critical_rpm=f_bend, first_torsional_rpm=f_tors,
        max_speed_rpm=n_max, critical_speed_ok=crit_ok, supercritical=supercritical,
        sections=tuple(sections), min_fatigue_safety=n_f, min_yield_safety=n_y,
        fatigue_ok=skipped is None and all(s.ok for s in sections), notes=tuple(notes),
        fatigue_not_evaluated=skipped, fatigue_required=model.fatigue_required,
        modes=modes)


# ----------------------------------------------------------------------------- fatigue
@dataclass(frozen=True)
class _Section:
    x_mm: float
    feature: Feature
    step: int          # index of the step whose diameter is the section's
    D_mm: float | None = None
    r_mm: float | None = None
    note: str | None = None


def _loads_at(sol: CaseSolution, x_mm: float) -> tuple[float, float, float]:
    """(M [N*mm] >= 0, T [N*mm], N [N]) at a station: the worst side of a jump."""
    st = sol.stations_mm
    idx = np.flatnonzero(np.abs(st - x_mm) <= _STATION_TOL_MM)
    if idx.size == 0:
        M = float(np.interp(x_mm, st, sol.M_Nmm))
        return M, float(np.interp(x_mm, st, sol.T_Nmm)), float(np.interp(x_mm, st, sol.N_N))
    M = float(np.max(sol.M_Nmm[idx]))
    T = float(sol.T_Nmm[idx[np.argmax(np.abs(sol.T_Nmm[idx]))]])
    N = float(sol.N_N[idx[np.argmax(np.abs(sol.N_N[idx]))]])
    return M, T, N


def _worst_station(sr: ShaftResult, x0: float, x1: float) -> float:
    """Station in [x0, x1] with the largest M^2 + 0.75 T^2 over all cases [mm]."""
    best_x, best = 0.5 * (x0 + x1), -1.0
    for sol in sr.cases:
        inside = (sol.stations_mm >= x0) & (sol.stations_mm <= x1)
        if not np.any(inside):
            continue
        eq = sol.M_Nmm[inside] ** 2 + 0.75 * sol.T_Nmm[inside] ** 2
        k = int(np.argmax(eq))
        if eq[k] > best:
            best, best_x = float(eq[k]), float(sol.stations_mm[inside][k])
    return best_x


def _sections(sr: ShaftResult) -> list[_Section]:
    shaft = sr.shaft
    steps = shaft.steps
    edges = shaft.step_edges_mm
    out: list[_Section] = []
    for i in range(1, len(steps)):
        left, right = steps[i - 1], steps[i]
        if left.d_mm == right.d_mm:
            continue
        small = i - 1 if left.d_mm < right.d_mm else i
        d = steps[small].d_mm
        D = max(left.d_mm, right.d_mm)
        r = right.fillet_mm
        note = None
        if r is None:
            r = SHARP_FILLET_R_OVER_D * d
            note = (f"no fillet given on the step starting at {edges[i]:g} mm: sharp "
                    f"shoulder r = 0.02 d = {r:.3g} mm assumed (Shigley 9th ed. Table 7-1)")
        out.append(_Section(edges[i], Feature.SHOULDER, small, D, r, note))
    for j, step in enumerate(steps):
        x0, x1 = edges[j], edges[j + 1]
        on_step = [e for e in shaft.elements
                   if isinstance(e, _SEAT_TYPES) and x0 <= e.x_mm <= x1]
        if step.keyway is not None:
            feat = _KEYWAY.get(step.keyway)
            if feat is None:
                raise ValueError(f"unknown keyway {step.keyway!r}; expected one of "
                                 f"{sorted(_KEYWAY)}")
            if on_step:
                out.extend(_Section(e.x_mm, feat, j) for e in on_step)
            else:
                out.append(_Section(_worst_station(sr, x0, x1), feat, j,
                                    note="keyway without an element seat: checked at the "
                                         "step's worst station"))
        if step.groove:
            out.append(_Section(_worst_station(sr, x0, x1), Feature.RETAINING_RING_GROOVE, j,
                                note="groove position not in the model: checked at the "
                                     "step's worst station (conservative)"))
    for e in shaft.elements:
        if isinstance(e, _SEAT_TYPES):
            out.append(_seat_section(sr, e.x_mm, e.width_mm))
    out.sort(key=lambda s: (s.x_mm, s.feature.value))
    return out


def _seat_section(sr: ShaftResult, x_mm: float, width_mm: float | None) -> _Section:
    """Press-fit section of a hub: at the hub edge with the larger moment, if width known."""
    shaft = sr.shaft
    j = _step_index(shaft, x_mm)
    if not width_mm:
        return _Section(x_mm, Feature.PRESS_FIT, j,
                        note="hub width not given: checked at the element's centre station")
    x0, x1 = shaft.step_edges_mm[j], shaft.step_edges_mm[j + 1]
    ends = [min(max(x_mm + s * 0.5 * width_mm, x0), x1) for s in (-1.0, 1.0)]
    worst = max(ends, key=lambda x: max(_loads_at(sol, x)[0] for sol in sr.cases))
    return _Section(worst, Feature.PRESS_FIT, j, note="press fit checked at the hub edge")


def _step_index(shaft: Shaft, x_mm: float) -> int:
    edges = shaft.step_edges_mm
    for j in range(len(shaft.steps)):
        if x_mm < edges[j + 1]:
            return j
    return len(shaft.steps) - 1


def _fatigue_sections(model: Model, sr: ShaftResult, st: ShaftCheckSettings
                      ) -> tuple[list[SectionCheck], list[str], str | None]:
    """Section checks, notes, and why fatigue was not evaluated (``None`` if it was)."""
    mat = sr.shaft.material
    if mat.Su_MPa is None or mat.Sy_MPa is None:
        missing = ", ".join(n for n, v in (("Su", mat.Su_MPa), ("Sy", mat.Sy_MPa))
                            if v is None)
        why = f"material '{mat.name}' has no {missing}"
        return [], [f"fatigue not evaluated: {why}"], why
    kinds = (CaseKind.DUTY, CaseKind.PEAK) if st.fatigue_cases == "duty_and_peak" \
        else (CaseKind.DUTY,)
    by_id = {c.id: c for c in model.cases}
    fat_sols = [s for s in sr.cases if by_id[s.case].kind in kinds]
    if not fat_sols:
        why = "no duty case gives the fatigue loads"
        return [], [f"fatigue not evaluated: {why}"], why
    temps = [by_id[s.case].temperature_C for s in fat_sols]
    temps = [t for t in temps if math.isfinite(t)]
    temperature = max(temps, default=ROOM_TEMPERATURE_C)
    notes = [f"fatigue: {st.criterion} over cases {[s.case for s in fat_sols]}, bending "
             "fully reversed (rotating shaft), Marin kd at "
             f"{temperature:g} degC, reliability {model.life.target_reliability:g}"]
    out = []
    for sec in _sections(sr):
        out.append(_section_check(model, sr, st, sec, fat_sols, temperature))
    return out, notes, None


def _section_check(model: Model, sr: ShaftResult, st: ShaftCheckSettings, sec: _Section,
                   fat_sols: list[CaseSolution], temperature_C: float) -> SectionCheck:
    mat = sr.shaft.material
    assert mat.Su_MPa is not None and mat.Sy_MPa is not None
    step = sr.shaft.steps[sec.step]
    d = step.d_mm
    notch = notch_factors(sec.feature, mat.Su_MPa, d_mm=d, D_mm=sec.D_mm, r_mm=sec.r_mm)
    finish = _SURFACE.get(step.surface, step.surface)
    marin = marin_endurance_limit(mat.Su_MPa, d, finish, temperature_C=temperature_C,
                                  reliability=model.life.target_reliability)
    per_case = [_loads_at(s, sec.x_mm) for s in fat_sols]
    classes = classify_section_loads(
        [SectionCaseLoads(M, T, N) for M, T, N in per_case], rule=st.fluctuation_rule)
    chk = check_section(classes, d, notch=notch, marin=marin, Sy_MPa=mat.Sy_MPa,
                        bore_mm=step.bore_mm, criterion=st.criterion)
    # first-cycle yield: the peak stress of every single case (duty, peak, static)
    sig_max = chk.stresses.sigma_vm_max_MPa
    for sol in sr.cases:
        M, T, N = _loads_at(sol, sec.x_mm)
        one = section_stresses(LoadClasses(M, 0.0, 0.0, T, 0.0, N), d, Kf=notch.Kf,
                               Kfs=notch.Kfs, Kf_axial=notch.Kf_axial, bore_mm=step.bore_mm)
        sig_max = max(sig_max, one.sigma_vm_max_MPa)
    n_y = yield_safety_factor(sig_max, mat.Sy_MPa)
    ok = chk.n_fatigue >= st.required_fatigue_safety and n_y >= st.required_yield_safety
    notes = tuple(n for n in (sec.note, *notch.notes) if n)
    return SectionCheck(
        x_mm=float(sec.x_mm), feature=sec.feature.value, d_mm=d, D_mm=sec.D_mm,
        r_mm=sec.r_mm if sec.feature is Feature.SHOULDER else notch.r_mm,
        Kt=notch.Kt, Kts=notch.Kts, Kf=notch.Kf, Kfs=notch.Kfs, Se_MPa=marin.Se_MPa,
        sigma_a_MPa=chk.stresses.sigma_vm_a_MPa, sigma_m_MPa=chk.stresses.sigma_vm_m_MPa,
        n_fatigue=chk.n_fatigue, n_yield=n_y, ok=ok, notes=notes, trace=chk,
        sigma_max_MPa=sig_max, step=sec.step)
