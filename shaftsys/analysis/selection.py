"""Choose the bearings: each open support's best catalogue row for every case at once.

Method (DEVELOPERS.md, "Choosing bearings"):

1. Solve the model with the bearings it has (placeholders at open supports: the radial
   solve does not depend on the bearing type; pressure centres and induced thrust do).
2. For every open support, take its load spectrum from the solve and evaluate every
   catalogue row that fits the seat with the one vectorised life chain
   (:func:`shaftsys.bearings.kernel.evaluate`; no Python loop over rows): life at the
   target reliability (modified life when lubrication is given), required rating,
   static safety, limiting speed in every running case, minimum load.
3. Rank the rows that pass every check by the objective; take the first.
4. Put the chosen bearings in (their pressure centres and, in adjusted pairs, their
   induced thrust change the reactions) and solve again; repeat until the choice does
   not change (bounded by ``selection.max_passes``; a choice that returns to an earlier
   set is reported as a cycle).

Units: N, mm, rpm, h, kg.
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import numpy.typing as npt

from shaftsys.analysis.life import spectrum_of
from shaftsys.analysis.results import BearingResult
from shaftsys.analysis.selection_results import STAGES, Candidate, SeatChoice, Selection
from shaftsys.analysis.solve import solve_model
from shaftsys.bearings.arrays import BearingArrays
from shaftsys.bearings.kernel import LIFE_BASIS_MODIFIED, LifeArrays, evaluate
from shaftsys.bearings.rating import E_TAN, pressure_centre_offset_mm
from shaftsys.machine.seats import BORE_TOLERANCE_MM, OVERLAP_TOLERANCE_MM
from shaftsys.model import AxialRole, Bearing, BearingKind, Model, SetArrangement, Shaft
from shaftsys.model.catalogue import KIND_CODE, Catalogue
from shaftsys.model.selection import Objective, OpenSeat

K = BearingKind
#: Types that can hold a shaft axially in both directions as one bearing (a locating
#: support); common practice, no source. Cylindrical and needle roller bearings are left
#: out (a catalogue row does not say whether it has ribs on both rings); single-row
#: angular-contact and tapered bearings take thrust one way only.
_LOCATING = frozenset({K.DEEP_GROOVE_BALL, K.SELF_ALIGNING_BALL, K.SPHERICAL_ROLLER})
#: Types that need an adjusted partner (their induced thrust must be reacted).
_ADJUSTED = frozenset({K.ANGULAR_CONTACT_BALL, K.TAPERED_ROLLER})
#: Radial types that may float (no thrust).
_FLOATING = frozenset({K.DEEP_GROOVE_BALL, K.SELF_ALIGNING_BALL, K.SPHERICAL_ROLLER,
                       K.CYLINDRICAL_ROLLER, K.NEEDLE_ROLLER})
_MATCHED_PAIRS = frozenset({SetArrangement.BACK_TO_BACK, SetArrangement.FACE_TO_FACE})


def types_for_role(axial: AxialRole, pair: str | None, arrangement: SetArrangement
                   ) -> frozenset[BearingKind]:
    """Bearing types that suit a support's axial role (common practice, no source).

    ``both`` (locating): deep-groove, self-aligning ball, spherical roller, and
    angular-contact or tapered bearings mounted as a matched pair back-to-back or
    face-to-face; ``+x``/``-x`` with a ``pair`` (an adjusted pair): single-row
    angular-contact and tapered bearings (their induced thrust is reacted by the
    partner); ``+x``/``-x``
    without a pair (cross-locating): the locating types; ``float``: radial types
    without induced thrust (a floating angular-contact or tapered bearing would have
    nothing to react its induced thrust).
    """
    if axial is AxialRole.BOTH:
        return _LOCATING | (_ADJUSTED if arrangement in _MATCHED_PAIRS else frozenset())
    if axial in (AxialRole.PLUS_X, AxialRole.MINUS_X):
        return _ADJUSTED if pair is not None else _LOCATING
    return _FLOATING


def _kind_mask(catalogue: Catalogue, kinds: frozenset[BearingKind]) -> npt.NDArray[np.bool_]:
    lut = np.zeros(max(KIND_CODE.values()) + 1, dtype=bool)
    for k in kinds:
        lut[KIND_CODE[k]] = True
    return lut[np.asarray(catalogue.kind_code, dtype=np.intp)]


def _inf_nan(a: npt.NDArray[np.float64]) -> npt.NDArray[np.float64]:
    return np.where(np.isnan(a), np.inf, a)


def rank_order(catalogue: Catalogue, rows: npt.NDArray[np.intp],
               margin: npt.NDArray[np.float64], objective: Objective
               ) -> npt.NDArray[np.intp]:
    """Positions into ``rows`` in rank order for ``objective`` (ties by the next key,
    then by catalogue order). Missing mass or price ranks last.
    """
    D = catalogue.D_mm[rows]
    B = _inf_nan(catalogue.B_mm[rows])
    mass = _inf_nan(catalogue.mass_kg[rows])
    price = _inf_nan(catalogue.price[rows])
    order = rows.astype(float)
    keys: tuple[npt.NDArray[np.float64], ...]
    if objective is Objective.SMALLEST:
        keys = (D, B, mass, price)
    elif objective is Objective.LIGHTEST:
        keys = (mass, D, B)
    elif objective is Objective.CHEAPEST:
        keys = (price, D, B)
    elif objective is Objective.LARGEST_MARGIN:
        keys = (_inf_nan(-margin), D, B)
    else:  # pragma: no cover - Objective is closed
        raise ValueError(f"unknown objective {objective!r}")
    # np.lexsort sorts by the LAST key first
    return np.lexsort((order, *reversed(keys))).astype(np.intp)


def _candidate(cat: Catalogue, rows: npt.NDArray[np.intp], params: BearingArrays,
               la: LifeArrays, j: int, basis: str) -> Candidate:
    """Candidate ``j`` of the evaluated rows (ratings as evaluated: a matched set's)."""
    row = int(rows[j])
    return Candidate(
        designation=cat.designation[row], kind=cat.kind[row].value, row=row,
        catalogue_line=cat.line[row], d_mm=float(cat.d_mm[row]), D_mm=float(cat.D_mm[row]),
        B_mm=float(cat.B_mm[row]), C_N=float(params.C_N[j]), C0_N=float(params.C0_N[j]),
        life_h=float(la.Lnm_h[j]), life_basis=basis,
        margin=float(la.margin[j]), s0=float(la.s0[j]),
        speed_ratio=float(la.speed_ratio[j]), min_load_ratio=float(la.min_load_ratio[j]),
        mass_kg=float(cat.mass_kg[row]), price=float(cat.price[row]))


def _seat_bearing(seat: OpenSeat, placeholder: Bearing, row: int) -> Bearing:
    """The catalogue row ``row`` at the support (the designer's role, targets, stiffness)."""
    cat = seat.catalogue
    kind = cat.kind[row]
    offset = 0.0
    if kind in _ADJUSTED:
        alpha = float(cat.contact_angle_deg[row])
        if not math.isfinite(alpha) and math.isfinite(float(cat.e[row])):
            alpha = math.degrees(math.atan(float(cat.e[row]) / E_TAN))  # e = 1.5 tan a
        if math.isfinite(alpha):
            offset = float(pressure_centre_offset_mm(kind, float(cat.d_mm[row]),
                                                     float(cat.D_mm[row]), alpha))
    p = placeholder
    return cat.to_bearing(
        row, id=p.id, x_mm=p.x_mm, axial=p.axial, pair=p.pair, rows=p.rows,
        arrangement=p.arrangement, target_life_h=p.target_life_h,
        target_reliability=p.target_reliability, s0_min=p.s0_min, ec=p.ec, line=p.line,
        pressure_centre_offset_mm=offset, radial_stiffness_N_mm=p.radial_stiffness_N_mm,
        tilt_stiffness_Nmm_rad=p.tilt_stiffness_Nmm_rad, ribs=p.ribs, within=p.within,
        within_x_mm=p.within_x_mm)


def _fmt(v: float, unit: str = "") -> str:
    return f"{v:.4g}{unit}" if math.isfinite(v) else "-"


def _fit_miss(seat: OpenSeat, kinds: frozenset[BearingKind]) -> str:
    """Why no row fits the seat at all, naming the nearest rows."""
    cat = seat.catalogue
    tmask = _kind_mask(cat, kinds)
    names = ", ".join(sorted(k.value for k in kinds)) or "none"
    if not tmask.any():
        return (f"the catalogue has no row of a type that suits this support ({names}); "
                f"it holds {', '.join(sorted({k.value for k in cat.kind}))}")
    bores = cat.d_mm[tmask]
    if not np.any(np.abs(bores - seat.bore_mm) <= seat.bore_tolerance_mm):
        near = bores[np.argsort(np.abs(bores - seat.bore_mm))[:3]]
        return (f"no row of types {names} has the seat's bore {seat.bore_mm:g} mm; the "
                f"nearest bores are {', '.join(f'{b:g}' for b in sorted(set(near)))} mm")
    rows = np.flatnonzero(tmask & (np.abs(cat.d_mm - seat.bore_mm) <= seat.bore_tolerance_mm))
    smallest = rows[np.argmin(cat.D_mm[rows])]
    limits = []
    if seat.max_D_mm is not None:
        limits.append(f"D <= {seat.max_D_mm:g} mm")
    if seat.max_B_mm is not None:
        limits.append(f"B <= {seat.max_B_mm:g} mm")
    if seat.housing_bores_mm:
        limits.append("D in the housing bores " + ", ".join(f"{h:g}" for h in
                                                            seat.housing_bores_mm) + " mm")
    limits.append("B within the seat, clear of the shoulders")
    return (f"no row with bore {seat.bore_mm:g} mm meets the envelope "
            f"({'; '.join(limits)}): the smallest is {cat.designation[smallest]} with "
            f"D = {cat.D_mm[smallest]:g} mm, B = {_fmt(float(cat.B_mm[smallest]), ' mm')}")


def _envelope(seat: OpenSeat) -> str:
    parts = [f"bore {seat.bore_mm:g} mm"]
    if seat.max_D_mm is not None:
        parts.append(f"D <= {seat.max_D_mm:g} mm")
    if seat.max_B_mm is not None:
        parts.append(f"B <= {seat.max_B_mm:g} mm")
    if seat.housing_bores_mm:
        parts.append("D in " + "/".join(f"{h:g}" for h in seat.housing_bores_mm) + " mm")
    return ", ".join(parts)


def seat_width_mm(shaft: Shaft | None, placeholder: Bearing, bore_mm: float) -> float:
    """Widest bearing [mm] that sits at ``placeholder.x_mm`` without overlapping a
    shoulder: twice the distance from the station to the nearer end of the run of
    steps whose diameter is the seat bore (within the seat tolerance of
    :mod:`shaftsys.machine.seats`); ``inf`` without a shaft or on a sleeve.
    """
    if shaft is None or placeholder.on_sleeve:
        return math.inf
    edges = np.asarray(shaft.step_edges_mm, dtype=float)
    d = np.array([st.d_mm for st in shaft.steps], dtype=float)
    x = placeholder.x_mm
    same = np.abs(d - bore_mm) <= BORE_TOLERANCE_MM
    k = int(np.clip(np.searchsorted(edges, x, side="right") - 1, 0, d.size - 1))
    if not same[k]:
        return 0.0
    lo_i, hi_i = k, k
    while lo_i > 0 and same[lo_i - 1]:
        lo_i -= 1
    while hi_i < d.size - 1 and same[hi_i + 1]:
        hi_i += 1
    return 2.0 * min(x - edges[lo_i], edges[hi_i + 1] - x) + 2.0 * OVERLAP_TOLERANCE_MM


def fitting_rows(seat: OpenSeat, placeholder: Bearing, shaft: Shaft | None = None
                 ) -> tuple[npt.NDArray[np.intp], frozenset[BearingKind]]:
    """Catalogue rows that fit the seat (type allowed and suited to the support's axial
    role, bore within the tolerance, envelope, housing bores, and, with ``shaft``, a
    width that stays on the seat without overlapping a shoulder) and the types allowed.
    """
    cat = seat.catalogue
    kinds = types_for_role(placeholder.axial, placeholder.pair, placeholder.arrangement)
    if seat.kinds:
        kinds = kinds & frozenset(seat.kinds)
    fit = _kind_mask(cat, kinds) & (np.abs(cat.d_mm - seat.bore_mm) <= seat.bore_tolerance_mm)
    if seat.max_D_mm is not None:
        fit &= cat.D_mm <= seat.max_D_mm + 1e-9
    if seat.max_B_mm is not None:
        fit &= ~(cat.B_mm > seat.max_B_mm + 1e-9)
    fit &= ~(cat.B_mm > seat_width_mm(shaft, placeholder, seat.bore_mm))
    if seat.housing_bores_mm:
        hb = np.asarray(seat.housing_bores_mm, dtype=float)
        fit &= np.any(np.abs(cat.D_mm[:, None] - hb[None, :]) <= seat.bore_tolerance_mm,
                      axis=1)
    return np.flatnonzero(fit), kinds


def qualifying(la: LifeArrays) -> tuple[npt.NDArray[np.bool_], npt.NDArray[np.bool_]]:
    """Rows that pass every hard check (evaluable, limiting speed, statics, life) and
    those that also meet the minimum load (the soft check).
    """
    hard = (np.asarray(la.valid, dtype=bool) & ~(la.speed_ratio > 1.0)
            & np.asarray(la.static_ok, dtype=bool) & np.asarray(la.life_ok, dtype=bool))
    return hard, hard & ~(la.min_load_ratio < 1.0)


def choose_seat(model: Model, seat: OpenSeat, placeholder: Bearing, loads: BearingResult
                ) -> SeatChoice:
    """Evaluate every catalogue row at one support and choose by the model's objective.

    ``loads`` is the support's solved result (its spectrum over every case).
    """
    cat = seat.catalogue
    rows, kinds = fitting_rows(seat, placeholder, model.shaft(seat.shaft_id))
    remaining = [int(rows.size)]
    if rows.size == 0:
        return SeatChoice(seat.bearing_id, seat.shaft_id, None, None, (), tuple(remaining),
                          _fit_miss(seat, kinds), None)
    sp = spectrum_of(model, loads)
    p = placeholder
    params = BearingArrays.from_catalogue(
        cat, rows, rows=p.rows, arrangement=p.arrangement, target_life_h=p.target_life_h,
        target_reliability=p.target_reliability, s0_min=p.s0_min, ec=p.ec, ribs=p.ribs,
        line=p.line)
    la = evaluate(params, sp.Fr_N, sp.Fa_N, sp.duty, model.life, model.lubrication)
    basis = "Lnm" if la.life_basis == LIFE_BASIS_MODIFIED else "L10"
    valid = np.asarray(la.valid, dtype=bool)
    speed_ok = ~(la.speed_ratio > 1.0)
    static_ok = np.asarray(la.static_ok, dtype=bool)
    life_ok = np.asarray(la.life_ok, dtype=bool)
    load_ok = ~(la.min_load_ratio < 1.0)
    masks = [valid, speed_ok, static_ok, life_ok, load_ok]
    alive = np.ones(rows.size, dtype=bool)
    failed_stage = None
    before = alive
    notes = []
    for k, mask in enumerate(masks):
        before = alive.copy()
        alive = alive & mask
        remaining.append(int(alive.sum()))
        if not alive.any():
            failed_stage = k
            break
    if failed_stage == len(masks) - 1:
        # minimum load is a soft constraint: when every row that passes life, statics
        # and speed is loaded below its minimum load in some running case, the choice
        # is made among them and the risk is stated (a designer then ensures a minimum
        # load, e.g. by preload springs, or accepts it)
        alive, failed_stage = before, None
        worst = float(np.nanmax(np.where(alive, la.min_load_ratio, np.nan)))
        notes.append("every bearing that passes life, statics and speed is loaded below "
                     "its minimum load (P < 0.01 C ball, 0.02 C roller) in some running "
                     f"case (best {worst:.3g} of it): risk of skidding; ensure a minimum "
                     "load (e.g. preload springs) or accept the risk")
    no_speed = int(np.sum(np.isnan(la.speed_ratio) & alive))
    if no_speed:
        notes.append(f"{no_speed} qualifying rows give no limiting speed (not checked)")
    if failed_stage is not None:
        remaining += [0] * (len(STAGES) - len(remaining))
        reason, closest = _miss(seat, cat, rows, params, la, before, failed_stage, basis)
        return SeatChoice(seat.bearing_id, seat.shaft_id, None, None, (), tuple(remaining),
                          reason, closest, tuple(notes))
    ok = np.flatnonzero(alive)
    ranked = ok[rank_order(cat, rows[ok], la.margin[ok], model.selection.objective)]
    best = int(ranked[0])
    cands = [_candidate(cat, rows, params, la, int(j), basis)
             for j in ranked[: 1 + model.selection.runners_up]]
    chosen = _seat_bearing(seat, placeholder, int(rows[best]))
    return SeatChoice(seat.bearing_id, seat.shaft_id, chosen, cands[0], tuple(cands[1:]),
                      tuple(remaining), None, None, tuple(notes))


def _miss(seat: OpenSeat, cat: Catalogue, rows: npt.NDArray[np.intp],
          params: BearingArrays, la: LifeArrays, entering: npt.NDArray[np.bool_],
          stage: int, basis: str) -> tuple[str, Candidate | None]:
    """The constraint that ruled out the last candidates and the closest of them."""
    idx = np.flatnonzero(entering)
    env = _envelope(seat)
    if stage == 0:
        reasons = sorted({str(la.reason[j]) for j in idx})
        return (f"no fitting row ({env}) can be evaluated: {reasons[0]}", None)
    if stage == 1:
        j = int(idx[np.argmin(la.speed_ratio[idx])])
        c = _candidate(cat, rows, params, la, j, basis)
        return (f"every bearing that fits ({env}) runs above its limiting speed: best is "
                f"{c.designation} at {c.speed_ratio:.3g} times its limiting speed "
                f"{_fmt(float(cat.limiting_speed_rpm[rows[j]]), ' rpm')}", c)
    if stage == 2:
        ratio = la.s0[idx] / la.s0_min[idx]
        j = int(idx[np.argmax(ratio)])
        c = _candidate(cat, rows, params, la, j, basis)
        return (f"every bearing that fits ({env}) and runs at speed lacks static safety: "
                f"best is {c.designation} with s0 = {c.s0:.3g}, {float(la.s0_min[j]):.3g} "
                "required", c)
    if stage == 3:
        j = int(idx[np.argmax(la.margin[idx])])
        c = _candidate(cat, rows, params, la, j, basis)
        return (f"every bearing that fits ({env}), runs at speed and holds statically "
                f"lacks C: best is {c.designation} with {c.margin:.3g} of the required "
                f"rating (C_req = {float(la.C_required_N[j]):.4g} N, {basis} = "
                f"{_fmt(c.life_h, ' h')} against {float(la.target_h[j]):.4g} h)", c)
    j = int(idx[np.argmax(la.min_load_ratio[idx])])
    c = _candidate(cat, rows, params, la, j, basis)
    return (f"every bearing that passes life and statics ({env}) is loaded below its "
            f"minimum load in some running case (risk of skidding): best is "
            f"{c.designation} at {c.min_load_ratio:.3g} of its minimum load", c)


def with_bearings(model: Model, chosen: dict[str, Bearing]) -> Model:
    """``model`` with the bearings ``chosen`` (by id) in place of its placeholders; the
    open supports that got a bearing are no longer open.
    """
    shafts = tuple(replace(s, bearings=tuple(chosen.get(b.id, b) for b in s.bearings))
                   for s in model.shafts)
    still_open = tuple(o for o in model.open_seats if o.bearing_id not in chosen)
    return replace(model, shafts=shafts, open_seats=still_open)


def choose_bearings(model: Model) -> tuple[Model, Selection]:
    """Choose every open support's bearing; the model with the choices in, and why.

    Raises the solve's ``ModelError``/``NumericalError`` (see
    :func:`shaftsys.analysis.solve.solve_model`).
    """
    seats = model.open_seats
    placeholders = {b.id: b for _, b in model.bearings()}
    settings = model.selection
    history: list[tuple[int, ...]] = []
    current = model
    choices: tuple[SeatChoice, ...] = ()
    settled = cycle = False
    passes = 0
    for passes in range(1, settings.max_passes + 1):  # noqa: B007 - passes is reported
        solved = solve_model(current)
        results = {b.bearing.id: b for b in solved.bearings}
        choices = tuple(choose_seat(current, seat, placeholders[seat.bearing_id],
                                    results[seat.bearing_id]) for seat in seats)
        key = tuple(-1 if c.candidate is None else c.candidate.row for c in choices)
        current = with_bearings(model, {c.bearing_id: c.chosen for c in choices
                                        if c.chosen is not None})
        if history and key == history[-1]:
            settled = True
            break
        if key in history:
            cycle = True
            break
        history.append(key)
    chosen = [c.candidate for c in choices if c.candidate is not None]
    masses = [c.mass_kg for c in chosen]
    prices = [c.price for c in chosen]
    total_mass = float(sum(masses)) if masses and all(map(math.isfinite, masses)) else None
    total_price = float(sum(prices)) if prices and all(map(math.isfinite, prices)) else None
    units = {s.catalogue.price_unit for s in seats}
    selection = Selection(seats=choices, objective=settings.objective.value, passes=passes,
                          settled=settled, cycle=cycle, total_mass_kg=total_mass,
                          total_price=total_price, price_unit=", ".join(sorted(units)))
    return current, selection


__all__ = ["choose_bearings", "choose_seat", "fitting_rows", "qualifying", "rank_order",
           "types_for_role", "with_bearings"]
