"""A measured duty (torque/speed time series) -> the model's operating cases -> checks.

``reduce_duty(model, chunks, settings)`` makes two passes over the samples (``chunks``
is called once per pass and yields ``(dt_s, T_Nmm, n_rpm)`` arrays):

1. scan: totals and ranges per sign region of (torque, speed);
2. bin and integrate: the bins' cases (:mod:`shaftsys.analysis.duty_reduction`) and,
   from the bearing loads superposed on a few probe solves (the shaft model is affine in
   the input torque within one sign region), the direct integral of P^p over the
   revolutions of every raw sample.

The generated cases replace the model's duty cases (a template case of the model gives
the input element, the output shares, process loads and temperature; the model's peak
and static cases are kept), the model is analysed with them, and every bearing's
equivalent load and basic life from the cases is compared with the direct integral.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass, replace

import numpy as np

from shaftsys.analysis.duty_reduction import (
    REGIONS,
    AffineLoads,
    BinAccumulator,
    BinSettings,
    DirectIntegral,
    DutyCase,
    SeriesScan,
    ShaftAffine,
    affine_from_probes,
    basic_life,
)
from shaftsys.analysis.pipeline import analyse
from shaftsys.analysis.results import Result
from shaftsys.analysis.solve import solve_model
from shaftsys.errors import ModelError
from shaftsys.model import Case, CaseKind, ElementLoad, Model, ProcessLoad

Chunks = Callable[[], Iterable[tuple[np.ndarray, ...]]]

#: relative miss of the affine prediction above which the direct integral is flagged
AFFINE_TOLERANCE = 1e-6
#: relative miss of the P(T) table of the direct integral above which it is flagged
INTERPOLATION_TOLERANCE = 1e-6
#: process-load channel value of its probe solve [N]
LOAD_PROBE_N = 1000.0
#: probe torques as fractions of the region's largest |T|; the middle one checks
PROBES = (1.0 / 3.0, 2.0 / 3.0, 1.0)


@dataclass(frozen=True)
class BearingDutyError:
    """Binned against direct for one bearing.

    ``P_cases_N``: equivalent load of the generated cases (the life engine's Pm, af
    included); ``P_direct_N``: (sum n_i P_i^p / sum n_i)^(1/p) over the raw samples;
    ``L10_cases_h``, ``L10_direct_h``: basic rating lives [h] (no a1, no aISO);
    ``P_error_pct``: 100*(P_cases/P_direct - 1); ``L10_error_pct``: 100*(L_cases/L_direct - 1).
    """

    shaft: str
    bearing: str
    exponent: float
    P_cases_N: float
    P_direct_N: float
    L10_cases_h: float
    L10_direct_h: float
    P_error_pct: float
    L10_error_pct: float


@dataclass(frozen=True, eq=False)
class DutyReduction:
    """Everything the reduction produced.

    ``cases``: the generated cases; ``model``: the model with them; ``result``: its
    analysis (``None`` with ``analyse_model=False``); ``errors``: binned vs direct per
    bearing; ``affine_mismatch``: largest relative miss of the superposition check;
    ``interpolation_error``: largest relative miss of the direct integral's P(T) table;
    ``time_s``, ``revs``, ``samples``: totals of the series; ``warnings``: texts;
    ``series``: the recording's file (as given) for the output.
    """

    cases: tuple[DutyCase, ...]
    model: Model
    result: Result | None
    errors: tuple[BearingDutyError, ...]
    affine_mismatch: float
    interpolation_error: float
    time_s: float
    revs: float
    samples: int
    template: str
    warnings: tuple[str, ...]
    series: str = ""


def default_exponent(model: Model) -> float:
    """The exponent p of the bins' power mean when the user gives none: the largest life
    exponent of the model's bearings (10/3 with any roller bearing, else 3; ISO 281:2007, 7.1).
    """
    from shaftsys.bearings.arrays import BearingArrays

    arrays = BearingArrays.from_bearings([b for s in model.shafts for b in s.bearings])
    return float(arrays.life_exponent.max())


def _check_targets(model: Model, targets: Sequence[LoadTarget]) -> None:
    loads = {e.id for s in model.shafts for e in s.elements if isinstance(e, ProcessLoad)}
    for element, axis in targets:
        if element not in loads:
            raise ModelError(f"'{element}' is not a process-load element of the model",
                             file=model.source, field="--load",
                             expected="one of: " + (", ".join(sorted(loads)) or
                                                    "(no element of type load)"))
        if axis not in (0, 1, 2):
            raise ModelError(f"force component {axis}", field="--load",
                             expected="Fx, Fy or Fz")


def template_case(model: Model, case_id: str | None) -> Case:
    """The model's case whose input element and output shares the generated cases take."""
    duty = [c for c in model.cases if c.kind is CaseKind.DUTY]
    if case_id is not None:
        found = [c for c in model.cases if c.id == case_id]
        if not found:
            raise ModelError(f"no case '{case_id}' in the model", file=model.source,
                             field="--template", expected="one of: " +
                             ", ".join(c.id for c in model.cases))
        case = found[0]
    elif duty:
        case = duty[0]
    else:
        raise ModelError("the model has no duty case to take the input element and "
                         "output shares from", file=model.source, field="cases",
                         expected="a duty case with input and outputs")
    driven = [(s, d) for s, d in case.drives.items() if d.input_element is not None]
    if len(case.drives) != 1 or len(driven) != 1:
        raise ModelError(f"case '{case.id}' drives {len(case.drives)} shafts separately; "
                         "a recorded duty needs one input (a single-shaft model or a "
                         "machine model with links)", file=model.source, line=case.line,
                         field=f"cases[{case.id}]", expected="speed, input and outputs "
                         "at the case's top level", case=case.id)
    return case


#: (process-load element id, force component 0 = Fx, 1 = Fy, 2 = Fz) of a load channel
LoadTarget = tuple[str, int]


def case_loads(template: Case, targets: Sequence[LoadTarget], values: Sequence[float]
               ) -> tuple[ElementLoad, ...]:
    """The template's process loads with the channel components set to ``values`` [N]
    (``values`` empty: the template's loads unchanged).
    """
    if not values:
        return template.loads
    forces = {ld.element: list(ld.force_N) for ld in template.loads}
    moments = {ld.element: ld.moment_Nmm for ld in template.loads}
    for (element, axis), value in zip(targets, values, strict=True):
        forces.setdefault(element, [0.0, 0.0, 0.0])[axis] = float(value)
    return tuple(ElementLoad(e, (f[0], f[1], f[2]), moments.get(e, (0.0, 0.0, 0.0)))
                 for e, f in forces.items())


def _case(template: Case, cid: str, kind: CaseKind, share: float, T_Nmm: float,
          n_rpm: float, temperature_C: float = math.nan,
          targets: Sequence[LoadTarget] = (), loads_N: Sequence[float] = ()) -> Case:
    (sid, drive), = template.drives.items()
    temp = temperature_C if math.isfinite(temperature_C) else template.temperature_C
    return Case(id=cid, kind=kind, duration=share,
                drives={sid: replace(drive, speed_rpm=n_rpm, input_torque_Nmm=T_Nmm)},
                loads=case_loads(template, targets, loads_N), temperature_C=temp,
                line=template.line)


def model_with_cases(model: Model, template: Case, cases: Iterable[DutyCase],
                     targets: Sequence[LoadTarget] = ()) -> Model:
    """``model`` with its duty cases replaced by ``cases`` (its peak/static cases kept);
    ``targets``: the process-load components the cases' ``loads_N`` set.
    """
    generated = [_case(template, c.id, CaseKind(c.kind), c.share, c.torque_Nmm, c.speed_rpm,
                       c.temperature_C, targets, c.loads_N) for c in cases]
    kept = [c for c in model.cases if c.kind is not CaseKind.DUTY]
    clash = {c.id for c in generated} & {c.id for c in kept}
    if clash:
        raise ModelError(f"generated case id(s) {', '.join(sorted(clash))} clash with the "
                         "model's cases", file=model.source, field="--prefix",
                         expected="another prefix for the generated cases")
    return replace(model, cases=tuple(generated + kept), duration_in_hours=False)


def probe_affine(model: Model, template: Case, scan: SeriesScan,
                 targets: Sequence[LoadTarget] = ()) -> AffineLoads:
    """Bearing loads affine in the input torque, per sign region, from three solves each.

    In each region the model is solved at 1/3, 2/3 and 1 of the region's largest |T|
    at the region's mean speed; the loads at 1/3 and 1 give intercept and slope, the
    solve at 2/3 checks the superposition (its relative miss is ``mismatch``). With
    process-load channels (``targets``) those solves have the channels at 0 N, and one
    more solve per channel at ``LOAD_PROBE_N`` gives the change per N of it.
    """
    probes: list[Case] = []
    levels: dict[int, list[float]] = {}
    zero = [0.0] * len(targets)
    for r in scan.regions():
        name, sT, sn = REGIONS[r]
        T_ref = float(scan.T_max_Nmm[r]) if scan.T_max_Nmm[r] > 0 else 1000.0
        levels[r] = [sT * f * T_ref for f in PROBES]
        n = sn * scan.mean_speed_rpm(r)
        for k, T in enumerate(levels[r]):
            probes.append(_case(template, f"probe_{name}_{k}", CaseKind.DUTY, 1.0, T, n,
                                targets=targets, loads_N=zero))
        for c in range(len(targets)):
            unit = [LOAD_PROBE_N if j == c else 0.0 for j in range(len(targets))]
            probes.append(_case(template, f"probe_{name}_load{c}", CaseKind.DUTY, 1.0,
                                levels[r][2], n, targets=targets, loads_N=unit))
    share = 1.0 / len(probes)
    probe_model = replace(model, cases=tuple(replace(c, duration=share) for c in probes),
                          duration_in_hours=False)
    solved = solve_model(probe_model)
    comps: dict[str, dict[str, tuple[float, float, float]]] = {}
    speed_ratio: dict[tuple[str, str], float] = {}
    n_in = {c.id: next(iter(c.drives.values())).speed_rpm for c in probes}
    for b in solved.bearings:
        for ld in b.loads:
            comps.setdefault(ld.case, {})[b.bearing.id] = (ld.Fy_N, ld.Fz_N, ld.Fx_N)
            speed_ratio.setdefault((b.shaft_id, b.bearing.id),
                                   abs(ld.speed_rpm / n_in[ld.case]) if n_in[ld.case] else 1.0)
    shafts = {s.shaft.id: s.shaft for s in solved.shafts}
    out: dict[int, tuple[ShaftAffine, ...]] = {}
    mismatch = 0.0
    for r, Ts in levels.items():
        name = REGIONS[r][0]
        lo, mid, hi = (comps[f"probe_{name}_{k}"] for k in range(3))
        fy, fz, fx = affine_from_probes(Ts[0], Ts[2], lo, hi)
        scale = max(1e-9, *(abs(v) for bid in hi for v in hi[bid]))
        for bid in mid:
            pred = (fy[bid][0] + fy[bid][1] * Ts[1], fz[bid][0] + fz[bid][1] * Ts[1])
            mismatch = max(mismatch, *(abs(p - m) / scale
                                       for p, m in zip(pred, mid[bid][:2], strict=True)))
        per_shaft = []
        for sid, shaft in shafts.items():
            ids = [b.id for b in shaft.bearings]
            # single bearings' Fx follow the (nonlinear) axial rule; their sum Ka is affine
            ka_mid = sum(mid[i][2] for i in ids)
            ka_pred = sum(fx[i][0] + fx[i][1] * Ts[1] for i in ids)
            mismatch = max(mismatch, abs(ka_mid - ka_pred) / scale)
            per_load = [comps[f"probe_{name}_load{c}"] for c in range(len(targets))]
            per_shaft.append(ShaftAffine(
                shaft_id=sid, bearings=shaft.bearings,
                Fy0={i: fy[i][0] for i in ids}, Fy1={i: fy[i][1] for i in ids},
                Fz0={i: fz[i][0] for i in ids}, Fz1={i: fz[i][1] for i in ids},
                Ka0=sum(fx[i][0] for i in ids), Ka1=sum(fx[i][1] for i in ids),
                Fy2=tuple({i: (u[i][0] - hi[i][0]) / LOAD_PROBE_N for i in ids}
                          for u in per_load),
                Fz2=tuple({i: (u[i][1] - hi[i][1]) / LOAD_PROBE_N for i in ids}
                          for u in per_load),
                Ka2=tuple(sum(u[i][2] - hi[i][2] for i in ids) / LOAD_PROBE_N
                          for u in per_load)))
        out[r] = tuple(per_shaft)
    return AffineLoads(out, mismatch, speed_ratio)


def reduce_duty(model: Model, chunks: Chunks, settings: BinSettings, *,
                template: str | None = None, prefix: str = "rec",
                tolerance_pct: float | None = None, series_name: str = "the series",
                analyse_model: bool = True, channels: Sequence[str] = (),
                load_targets: Sequence[LoadTarget] = ()) -> DutyReduction:
    """Reduce a time series to cases, analyse the model with them, state the error.

    ``chunks()`` yields ``(dt_s, T_Nmm, n_rpm)`` (sample durations [s], input torques
    [N*mm], speeds of the input element's shaft [rpm]), optionally a fourth array of
    extra channels (rows; their kinds in ``channels``: ``"temperature"`` [degC], each
    case then takes its bin's time-mean temperature, or ``"load"`` [N], setting the
    process-load component of ``load_targets`` in order, revolution-weighted per bin);
    it is called twice.
    ``tolerance_pct``: a larger |difference| of equivalent load between cases and direct
    integral adds a warning. Raises :class:`ModelError` when the series never turns.
    """
    if model.open_seats:
        raise ModelError("the model has bearings still to be chosen", file=model.source,
                         field="choose", expected="a model with every bearing given "
                         "(shaftsys choose --write)")
    tmpl = template_case(model, template)
    if sum(1 for k in channels if k == "load") != len(load_targets):
        raise ValueError("one load target per load channel")
    _check_targets(model, load_targets)
    load_rows = [i for i, k in enumerate(channels) if k == "load"]
    standstill = max(model.life.min_speed_rpm, 0.0)
    scan = SeriesScan(standstill_rpm=standstill if standstill > 0 else 1e-12)
    for dt, T, n, *_ in chunks():
        scan.add(dt, T, n)
    if scan.revs <= 0.0:
        raise ModelError(f"{series_name} never turns: no sample is at or above "
                         f"{standstill:g} rpm (life.min_speed), so it has no revolutions "
                         "and gives no life", field="speed",
                         expected="a series with running samples")
    affine = probe_affine(model, tmpl, scan, load_targets)
    bins = BinAccumulator(scan, settings, tuple(channels))
    pairs = [(s.id, b) for s in model.shafts for b in s.bearings]
    ranges = {r: (float(scan.T_min_Nmm[r]), float(scan.T_max_Nmm[r]))
              for r in scan.regions()}
    direct = DirectIntegral(pairs, affine, scan.standstill_rpm, ranges,
                            model.life.application_factor)
    for dt, T, n, *extra in chunks():
        X: np.ndarray | None = extra[0] if extra else None
        bins.add(dt, T, n, X)
        direct.add(dt, T, n, X[load_rows] if X is not None and load_rows else None)
    cases = bins.cases(prefix)
    reduced = model_with_cases(model, tmpl, cases, load_targets)
    try:
        result = analyse(reduced) if analyse_model else None
    except ModelError as exc:
        hit = next((c for c in cases if f"'{c.id}'" in exc.message), None)
        if hit is None:
            raise
        raise ModelError(
            f"{exc.message} - case '{hit.id}' was made from {series_name} ({hit.region}, "
            f"{hit.torque_Nmm / 1000:.4g} N*m at {hit.speed_rpm:.5g} rpm, "
            f"{hit.samples} samples)", file=exc.file, line=exc.line, field=exc.field,
            expected=(exc.expected or "valid cases") + "; or other bins (--bins, "
            "--speed-bins to keep slow running apart)", case=exc.case) from None
    errors: list[BearingDutyError] = []
    warnings: list[str] = []
    if affine.mismatch > AFFINE_TOLERANCE:
        warnings.append(f"the bearing loads are not affine in the input torque (miss "
                        f"{affine.mismatch:.2g} of the largest load at the check probe): "
                        "the direct integral is approximate (speed-dependent loads such "
                        "as unbalance are taken at each sign region's mean speed)")
    if direct.interpolation_error > INTERPOLATION_TOLERANCE:
        warnings.append(f"the direct integral's table of P over the torque may miss Pm "
                        f"by up to {direct.interpolation_error:.2g} (relative)")
    if result is not None:
        Pd = direct.equivalent_loads_N()
        nm = direct.bearing_mean_speeds_rpm()
        by_id = {(b.shaft_id, b.bearing.id): b for b in result.bearings}
        for i, (sid, b) in enumerate(pairs):
            life = by_id[(sid, b.id)].life
            if life is None:
                continue
            p = float(direct.exponents[i])
            _, Lh_direct = basic_life(b.C_N, float(Pd[i]), p, float(nm[i]))
            P_cases = float(life.P_eq_N)
            L_cases = float(life.L10_h)
            dP = 100.0 * (P_cases / Pd[i] - 1.0) if Pd[i] > 0 else 0.0
            dL = (100.0 * (L_cases / Lh_direct - 1.0)
                  if math.isfinite(Lh_direct) and Lh_direct > 0 else 0.0)
            errors.append(BearingDutyError(sid, b.id, p, P_cases, float(Pd[i]), L_cases,
                                           Lh_direct, float(dP), float(dL)))
            if tolerance_pct is not None and abs(dP) > tolerance_pct:
                warnings.append(f"bearing '{b.id}': the cases' equivalent load differs from "
                                f"the direct integral by {dP:+.3g} % (life {dL:+.3g} %), "
                                f"more than the tolerance {tolerance_pct:g} %: use more "
                                "bins")
    return DutyReduction(tuple(cases), reduced, result, tuple(errors), affine.mismatch,
                         direct.interpolation_error,
                         scan.time_s, scan.revs, scan.samples, tmpl.id, tuple(warnings),
                         series_name)


__all__ = ["AFFINE_TOLERANCE", "LOAD_PROBE_N", "BearingDutyError", "DutyReduction",
           "LoadTarget", "case_loads", "default_exponent", "model_with_cases", "probe_affine",
           "reduce_duty", "template_case"]
