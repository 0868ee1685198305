"""Batched evaluation of many geometry variants of ONE shaft (the hot path of studies).

Units: mm, N, N*mm, rad, rpm, h (as :mod:`shaftsys.units`).

What it computes, for B variants at once (arrays with the variant axis; no Python loop
over variants, elements or cases):

1. **Mesh.** Nodes only at the compulsory stations, by the rule of the single run:
   stations (bearing pressure centres, elements) snapped onto a step edge or an
   earlier station within ``STATION_SNAP_MM`` (:func:`shaftsys.fe.mesh.snap_stations_batch`),
   then edges and stations clustered as :func:`shaftsys.fe.mesh.build_mesh` does
   (:func:`~shaftsys.fe.mesh.node_order`, :func:`~shaftsys.fe.mesh.cluster_nodes`).
   Variants whose stations come in the same order share one topology and are solved
   together. ``solver.max_element_mm`` is not used: the Timoshenko element with
   interdependent interpolation (and the Euler-Bernoulli element) is nodally exact for
   point loads and for the uniform shaft weight with its consistent nodal loads, so the
   nodal displacements and the reactions do not depend on how finely a prismatic
   interval is cut (Tong's nodal exactness; Reddy, *An Introduction to the Finite
   Element Method*, beam chapter). The tests compare with :func:`shaftsys.analyse`.
2. **Bending.** Band stiffness assembled per variant; supports validated once per
   topology by :func:`shaftsys.fe.solve.planar_support_dofs` and
   ``check_planar_mechanism`` (two rigid supports on one node, a mechanism: the
   variants are invalid); springs on the diagonal, rigid DOFs eliminated, Jacobi
   scaling, batched banded Cholesky and solves in
   :func:`shaftsys.fe.banded_batch.solve_supported_band` (the solve of
   ``solve_planar_batch``); both planes and every case are right-hand sides of one
   factorisation. Reactions as K u - F at rigid DOFs and -k u at springs. Pivots below
   ``shaftsys.fe.solve.DEFAULT_PIVOT_TOL`` and a global force/moment balance
   (:func:`shaftsys.fe.balance.global_balance`, the single run's definition, as
   :func:`~shaftsys.fe.balance.planar_balance`) of a unit column above
   ``solver.residual_tolerance`` mark the variant invalid (NumericalError).
3. **Axial rule** of :func:`shaftsys.bearings.axial.axial_reactions`, vectorised (locating
   bearing, cross-locating, adjusted pair with induced forces).
4. **Lives** by the life chain the single run uses: per bearing its plan
   (:func:`shaftsys.bearings.kernel.plan_row`, built once in :func:`prepare`: all
   that does not depend on the loads and C) applied to every variant's spectrum by
   :func:`~shaftsys.bearings.kernel.evaluate_planned` (the same bits as
   :func:`~shaftsys.bearings.kernel.evaluate`); variants it flags and bearings without
   a plan go through ``evaluate`` with one row per (variant, bearing): a user error of
   a variant (e.g. C not positive) becomes its reason. Errors that do not depend on
   the loads are found once in :func:`prepare` with a zero-load evaluation and fail
   every variant. With a heat balance the temperatures of each variant come first
   (:func:`shaftsys.analysis.thermal_batch.study_balance`, the single run's core) and
   enter its lives (no plan then: kappa changes with each variant's temperature); a
   variant that runs away gets none, as the single run. System life: the Weibull
   product of :mod:`shaftsys.bearings.system` solved by a vectorised Newton iteration
   on ln L (converged to round-off, where the single-model path uses brentq).

Every variant's arithmetic is independent of the others, so a batch of one gives the
same bits as the same variant inside a large batch.
"""

from __future__ import annotations

import logging
import math
from dataclasses import dataclass, field, replace

import numpy as np
from numpy.typing import NDArray

from shaftsys.analysis.element_forces import element_loads
from shaftsys.analysis.selection import fitting_rows, qualifying, rank_order
from shaftsys.analysis.thermal_batch import (
    ThermalSetup,
    VariantThermal,
    merged,
    study_balance,
    thermal_setup,
)
from shaftsys.bearings.arrays import BearingArrays
from shaftsys.bearings.axial import axial_reactions
from shaftsys.bearings.kernel import DutyCycle, RowPlan, evaluate, evaluate_planned, plan_row
from shaftsys.errors import ModelError, NumericalError
from shaftsys.fe.balance import planar_balance
from shaftsys.fe.banded_batch import planar_band, solve_supported_band
from shaftsys.fe.mesh import cluster_nodes, node_order, snap_stations_batch
from shaftsys.fe.sections import circular_section_arrays
from shaftsys.fe.solve import (
    DEFAULT_PIVOT_TOL,
    Support,
    check_planar_mechanism,
    planar_support_dofs,
)
from shaftsys.model import BearingKind, CaseKind, Model, Shaft
from shaftsys.model.selection import Objective, OpenSeat
from shaftsys.study.paths import Geometry
from shaftsys.units import DENSITY_KG_PER_MM3

log = logging.getLogger(__name__)

Array = NDArray[np.float64]

#: Variants solved together. Measured on the shared 2-core machine with the spindle study
#: of bench_study.py (40 000 variants, CPU seconds, best of 4, sizes alternating, load
#: average 4): 512 -> 68 000/s, 768 -> 72 000/s, 1024 -> 74 000/s, 1536 -> 64 000/s,
#: 2048 -> 65 000/s, 4096 -> 61 000/s. Since the planned life chain the per-chunk Python
#: cost is small and a chunk's (case x variant) blocks staying in the L2 cache matters
#: more (2048 was best before it). Again after the in-place kernel changes (quiet machine,
#: best of 5, sizes alternating): 512 -> 83 800/s, 768 -> 88 300/s, 1024 -> 89 400/s,
#: 1536 -> 81 900/s, 2048 -> 85 200/s.
CHUNK = 1024
_LN09 = math.log(0.9)


@dataclass(frozen=True, eq=False)
class Prepared:
    """Everything about a one-shaft model that does not change with the geometry."""

    model: Model
    shaft: Shaft
    case_ids: tuple[str, ...]
    el_force: Array          # (n_elements, m, 3) [N]
    el_moment: Array         # (n_elements, m, 3) [N*mm]
    fx_elements: Array       # (m,) net element axial force [N]
    supports: tuple[tuple[int, float, float], ...]  # (bearing index, k_t, k_r)
    gravity: Array
    weight: bool
    bearings: tuple[BearingArrays, ...]   # one row per bearing
    stacked: BearingArrays                # all bearings, one row each (model order)
    kind_groups: tuple[tuple[int, ...], ...]  # bearing indices of one kind each
    duty: DutyCycle
    slopes: Array
    reliability: float
    error: str = ""
    gear_index: tuple[int, ...] = field(default=())
    open_seats: tuple[OpenChoice, ...] = ()
    thermal: ThermalSetup | None = None   # the heat balance (model.thermal), if any
    plans: tuple[RowPlan | None, ...] = ()   # per bearing: the life chain's fixed part


@dataclass(frozen=True, eq=False)
class OpenChoice:
    """An open support of the study's model: its catalogue rows that fit the seat, in
    rank order of the model's objective (ties of ``largest_margin`` by D, B), as one
    table for the life chain.

    ``index``: the support's position in the shaft's bearings; ``rows``: catalogue rows
    in rank order; ``params``: those rows at the support
    (:meth:`BearingArrays.from_catalogue`); ``by_margin``: rank by the largest margin.
    """

    index: int
    seat: OpenSeat
    rows: NDArray[np.intp]
    params: BearingArrays
    by_margin: bool


def prepare(model: Model) -> Prepared:
    """Shared data of a one-shaft model for :func:`evaluate_geometry`.

    Raises
    ------
    ValueError: the model has more than one shaft or links (use the per-variant path).
    """
    if len(model.shafts) != 1 or getattr(model, "links", None):
        raise ValueError("the batched evaluator handles one-shaft models without links")
    shaft = model.shafts[0]
    m = len(model.cases)
    ne = len(shaft.elements)
    eidx = {e.id: j for j, e in enumerate(shaft.elements)}
    F = np.zeros((ne, m, 3))
    M = np.zeros((ne, m, 3))
    error = ""
    for k, case in enumerate(model.cases):
        applied, _ = element_loads(model, shaft, case)
        for a in applied:
            j = eidx[a.element or ""]
            F[j, k] += a.force_N
            M[j, k] += a.moment_Nmm
        net = float(M[:, k, 0].sum())
        scale = float(np.abs(M[:, k, 0]).sum())
        if abs(net) > model.solver.residual_tolerance * max(scale, 1.0) and not error:
            error = (f"ModelError: the torques on shaft '{shaft.id}' do not balance in case "
                     f"'{case.id}' (net {net:.6g} N*mm about +x)")
    supports = []
    for j, b in enumerate(shaft.bearings):
        if b.kind is BearingKind.THRUST_BALL:
            continue
        supports.append((j, b.radial_stiffness_N_mm or math.inf, b.tilt_stiffness_Nmm_rad or 0.0))
    speeds = [c.drives[shaft.id].speed_rpm if shaft.id in c.drives else 0.0 for c in model.cases]
    duty = DutyCycle(
        case_ids=tuple(c.id for c in model.cases), speed_rpm=np.asarray(speeds, dtype=float),
        duration=np.asarray([c.duration for c in model.cases], dtype=float),
        duration_in_hours=model.duration_in_hours,
        static_only=np.array([c.kind is not CaseKind.DUTY for c in model.cases], dtype=bool),
        temperature_C=np.asarray([c.temperature_C for c in model.cases], dtype=float))
    preps = tuple(BearingArrays.from_bearings([b]) for b in shaft.bearings)
    still_open = {o.bearing_id for o in model.open_seats}
    thermal, zero_duty = None, duty
    try:
        thermal = thermal_setup(model, [(b, shaft.id) for b in shaft.bearings])
    except ModelError as exc:
        error = error or error_text(exc)
    if thermal is not None:   # the balance supplies the missing temperatures (>= sink)
        zero_duty = replace(duty, temperature_C=np.where(
            np.isfinite(duty.temperature_C), duty.temperature_C, thermal.sink_C))
    for b, params in zip(shaft.bearings, preps, strict=True):
        # errors that do not depend on the loads fail every variant (an open support's
        # placeholder is not evaluated: its candidates are)
        if b.id in still_open:
            continue
        first = evaluate(params, np.zeros(m), np.zeros(m), zero_duty, model.life,
                         model.lubrication).errors[0]
        if first is not None and not error:
            error = f"ModelError: {first}"
    gears = tuple(j for j, e in enumerate(shaft.elements) if e.kind in ("gear", "bevel_gear"))
    g = np.asarray(model.gravity_m_s2, dtype=float)
    opens = _open_choices(model, shaft)
    open_idx = {o.index for o in opens}
    fixed = [(j, b) for j, b in enumerate(shaft.bearings) if j not in open_idx]
    # a heat balance gives every variant its own temperatures: no fixed plan then
    plans = tuple(plan_row(params, duty, model.life, model.lubrication)
                  if j not in open_idx and not error and thermal is None else None
                  for j, params in enumerate(preps))
    return Prepared(
        model=model, shaft=shaft, case_ids=tuple(c.id for c in model.cases),
        el_force=F, el_moment=M, fx_elements=F[:, :, 0].sum(axis=0), supports=tuple(supports),
        gravity=g, weight=bool(model.solver.include_shaft_weight and np.any(g)),
        bearings=preps, stacked=BearingArrays.from_bearings(list(shaft.bearings)),
        kind_groups=tuple(tuple(j for j, b in fixed if b.kind is kind)
                          for kind in dict.fromkeys(b.kind for _, b in fixed)),
        duty=duty,
        slopes=np.array([model.checks.weibull_slope(b.kind.is_roller)
                         for b in shaft.bearings], dtype=float),
        reliability=float(model.life.target_reliability), error=error, gear_index=gears,
        open_seats=opens, thermal=thermal, plans=plans)


def _open_choices(model: Model, shaft: Shaft) -> tuple[OpenChoice, ...]:
    """The open supports of ``shaft`` with their fitting rows in rank order."""
    out = []
    index = {b.id: j for j, b in enumerate(shaft.bearings)}
    for seat in model.open_seats:
        if seat.bearing_id not in index:
            continue
        j = index[seat.bearing_id]
        p = shaft.bearings[j]
        rows, _ = fitting_rows(seat, p, shaft)
        by_margin = model.selection.objective is Objective.LARGEST_MARGIN
        order = rank_order(seat.catalogue, rows, np.zeros(rows.size),
                           Objective.SMALLEST if by_margin else model.selection.objective)
        rows = rows[order]
        params = BearingArrays.from_catalogue(
            seat.catalogue, rows, rows=p.rows, arrangement=p.arrangement,
            target_life_h=p.target_life_h, target_reliability=p.target_reliability,
            s0_min=p.s0_min, ec=p.ec, ribs=p.ribs, line=p.line)
        out.append(OpenChoice(j, seat, rows, params, by_margin))
    return tuple(out)


# ----------------------------------------------------------------------------- output
@dataclass(eq=False)
class BatchArrays:
    """Results of B variants (first axis = variant).

    Per bearing (B, n_bearings): ``Fr_max_N``, ``Fa_max_N``, ``Lnm_h``, ``margin``
    (C/C_req), ``life_ratio`` (Lnm_h/target), ``s0``, ``life_ok``, ``static_ok``, ``ok``,
    ``deflection_mm`` and ``slope_rad`` (largest over the cases, at the support node).
    Per element (B, n_elements): ``el_deflection_mm``, ``el_slope_rad``. Per variant:
    ``system_life_h``, ``limiting`` (bearing index, -1 none), ``reason`` ("" = valid).
    Per open support (B, n_open): ``choice``, the chosen catalogue row (-1: none
    qualifies); per variant ``chosen_mass_kg``, ``chosen_price`` of the chosen set
    (NaN where a row gives none or a support has no choice).
    """

    Fr_max_N: Array
    Fa_max_N: Array
    Lnm_h: Array
    margin: Array
    life_ratio: Array
    s0: Array
    life_ok: NDArray[np.bool_]
    static_ok: NDArray[np.bool_]
    ok: NDArray[np.bool_]
    deflection_mm: Array
    slope_rad: Array
    el_deflection_mm: Array
    el_slope_rad: Array
    system_life_h: Array
    limiting: NDArray[np.intp]
    reason: NDArray[np.object_]
    choice: NDArray[np.intp] = field(default_factory=lambda: np.zeros((0, 0), np.intp))
    chosen_mass_kg: Array = field(default_factory=lambda: np.zeros(0))
    chosen_price: Array = field(default_factory=lambda: np.zeros(0))
    thermal: VariantThermal | None = None   # the heat balance per variant, if any
    #: per bearing (B, n_bearings): smallest running P/(f C) and largest running
    #: |n| / limiting speed (NaN: not evaluated), as LifeArrays
    min_load_ratio: Array = field(default_factory=lambda: np.zeros((0, 0)))
    speed_ratio: Array = field(default_factory=lambda: np.zeros((0, 0)))

    @classmethod
    def empty(cls, B: int, nb: int, ne: int, n_open: int = 0) -> BatchArrays:
        """All-NaN arrays for B variants (``n_open`` open supports)."""
        def f(*shape: int) -> Array:
            return np.full(shape, np.nan)

        def z(*shape: int) -> NDArray[np.bool_]:
            return np.zeros(shape, dtype=bool)

        return cls(f(B, nb), f(B, nb), f(B, nb), f(B, nb), f(B, nb), f(B, nb), z(B, nb),
                   z(B, nb), z(B, nb), f(B, nb), f(B, nb), f(B, ne), f(B, ne), f(B),
                   np.full(B, -1, dtype=np.intp), np.full(B, "", dtype=object),
                   np.full((B, n_open), -1, dtype=np.intp), f(B), f(B), None, f(B, nb),
                   f(B, nb))

    def window(self, lo: int, hi: int) -> BatchArrays:
        """Variants ``lo:hi`` as views (writing to them writes here); no heat balance."""
        return replace(self, thermal=None, **{
            name: getattr(self, name)[lo:hi] for name in self.__dataclass_fields__
            if name != "thermal"})

    def put(self, rows: NDArray[np.intp], other: BatchArrays) -> None:
        """Copy ``other`` (len(rows) variants) into ``rows``."""
        for name in self.__dataclass_fields__:
            if name == "thermal":
                self.thermal = merged(self.thermal, rows, other.thermal, self.reason.size)
                continue
            getattr(self, name)[rows] = getattr(other, name)


# ------------------------------------------------------------------------------ solve
def evaluate_geometry(prep: Prepared, geom: Geometry) -> BatchArrays:
    """Reactions, deflections, slopes and lives of every variant in ``geom``.

    Invalid variants (geometry, solve or life errors) keep NaN results and a reason.
    """
    shaft = prep.shaft
    B = geom.size
    nb, ne, ns = len(shaft.bearings), len(shaft.elements), len(shaft.steps)
    out = BatchArrays.empty(B, nb, ne, len(prep.open_seats))
    out.reason[:] = geom.reason
    if prep.error:
        out.reason[out.reason == ""] = prep.error
    valid = np.flatnonzero(out.reason == "")
    if valid.size == 0:
        return out
    offsets = np.array([b.support_x_mm - b.x_mm for b in shaft.bearings], dtype=float)
    edges = np.concatenate([np.zeros((B, 1)), np.cumsum(geom.step_length_mm, axis=1)], axis=1)
    pts = np.concatenate([edges, geom.bearing_x_mm + offsets, geom.element_x_mm], axis=1)
    # the mesh rule of the single run: stations snapped (fe.mesh.snap_stations_batch),
    # then clustered as build_mesh does (fe.mesh.node_order / cluster_nodes)
    sel = slice(None) if valid.size == B else valid     # every variant: views, no copies
    pts[sel, ns + 1 :] = snap_stations_batch(pts[sel, ns + 1 :], edges[sel])
    order, newc = node_order(pts[sel])
    sig = np.concatenate([order, newc.astype(order.dtype)], axis=1)
    inverse = np.zeros(valid.size, dtype=np.intp)
    other = np.flatnonzero(np.any(sig != sig[0], axis=1))  # most share the first topology
    if other.size:
        _, inv = np.unique(sig[other], axis=0, return_inverse=True)
        inverse[other] = 1 + np.asarray(inv).ravel()
    for g in range(int(inverse.max()) + 1):
        members = valid[inverse == g]
        first = int(np.flatnonzero(inverse == g)[0])
        for lo in range(0, members.size, CHUNK):
            rows = members[lo : lo + CHUNK]
            _evaluate_topology(prep, geom, rows, pts[rows], order[first], newc[first],
                               ns, out)
    return out


def _evaluate_topology(prep: Prepared, geom: Geometry, rows: NDArray[np.intp], pts: Array,
                       order: NDArray[np.intp], newc: NDArray[np.bool_], ns: int,
                       out: BatchArrays) -> None:
    """Solve the variants ``rows`` that share one topology and store their results.

    Superposition: the stiffness is factored once per variant and solved for one unit
    load per loaded DOF (force and moment at each element node) plus the shaft weight
    of each plane; the cases of both planes are then linear combinations of these few
    solutions, evaluated only where results are needed (support and element nodes).
    """
    shaft = prep.shaft
    model = prep.model
    m = len(prep.case_ids)
    nb, ne = len(shaft.bearings), len(shaft.elements)
    b = rows.size
    x, cluster, step = cluster_nodes(pts, ns + 1, order, newc)   # (b, n) as build_mesh
    n = x.shape[1]
    bnode = cluster[ns + 1 : ns + 1 + nb]
    enode = cluster[ns + 1 + nb :]
    try:  # the support rules of PlanarBending (one topology: once for all rows)
        sups, rigid, springs = planar_support_dofs(
            [Support(int(bnode[j]), kt, kr) for j, kt, kr in prep.supports], n,
            f"shaft '{shaft.id}', bending")
        check_planar_mechanism(sups, x[0], f"shaft '{shaft.id}', bending")
    except (ModelError, NumericalError) as exc:
        res = BatchArrays.empty(b, nb, ne, len(prep.open_seats))
        res.reason[:] = error_text(exc)
        out.put(rows, res)
        return
    mat = shaft.material
    A, Iz, _, k = circular_section_arrays(geom.step_d_mm[rows], geom.step_bore_mm[rows],
                                          mat.poisson)
    EI = (mat.E_MPa * Iz[:, step]).T                     # (n_e, b)
    L = np.diff(x, axis=1).T                             # (n_e, b)
    if model.solver.shear_deformation:
        kGA = (k * mat.G_MPa * A)[:, step].T
        Phi: Array | float = 12.0 * EI / (kGA * L**2)
    else:
        Phi = 0.0
    ab = planar_band(EI, L, Phi)
    ndof = 2 * n
    # --- loads of both planes and every case on the nodes: F0 (ndof, 2m), shared
    F0 = np.zeros((ndof, 2 * m))
    for j in range(ne):
        nd = int(enode[j])
        F0[2 * nd, :m] += prep.el_force[j, :, 1]
        F0[2 * nd + 1, :m] += prep.el_moment[j, :, 2]
        F0[2 * nd, m:] += prep.el_force[j, :, 2]
        F0[2 * nd + 1, m:] -= prep.el_moment[j, :, 1]
    loaded = np.flatnonzero(np.any(F0 != 0.0, axis=1))
    planes = [(0, prep.gravity[1]), (1, prep.gravity[2])] if prep.weight else []
    planes = [(pl, gc) for pl, gc in planes if gc != 0.0]
    nc = loaded.size + len(planes)
    Fu = np.zeros((ndof, nc, b))                         # unit loads and weights
    Fu[loaded, np.arange(loaded.size)] = 1.0
    coef = np.zeros((nc, 2 * m))                         # case columns from unit columns
    coef[: loaded.size] = F0[loaded]
    mass_total = np.zeros(b)
    if prep.weight:
        lm = (mat.density_kg_m3 * DENSITY_KG_PER_MM3 * A)[:, step].T   # kg/mm (n_e, b)
        mass_total = (lm * L).sum(axis=0)
        n_e = n - 1
        for c, (pl, gc) in enumerate(planes, start=loaded.size):
            q = lm * gc
            qL = 0.5 * q * L
            qL2 = q * L * L / 12.0
            Fu[0 : 2 * n_e : 2, c] += qL
            Fu[1 : 2 * n_e : 2, c] += qL2
            Fu[2 : 2 * n_e + 2 : 2, c] += qL
            Fu[3 : 2 * n_e + 2 : 2, c] -= qL2
            coef[c, pl * m : (pl + 1) * m] = 1.0
    U, piv = solve_supported_band(ab, rigid, springs, Fu)   # (ndof, nc, b)
    reason = np.full(b, "", dtype=object)
    reason[~(piv >= DEFAULT_PIVOT_TOL)] = ("NumericalError: stiffness not positive definite "
                                           "or (nearly) a mechanism")
    # --- support reactions of the unit columns: K U - Fu (rigid) or -k U (spring)
    sup_nodes = np.array([int(bnode[j]) for j, _, _ in prep.supports], dtype=np.intp)
    Rf = np.zeros((len(prep.supports), nc, b))
    Rm = np.zeros((len(prep.supports), nc, b))
    kterm = np.empty((nc, b))
    for s_i, (_, kt, kr) in enumerate(prep.supports):
        for dof, kk, dest in ((2 * sup_nodes[s_i], kt, Rf), (2 * sup_nodes[s_i] + 1, kr, Rm)):
            if math.isinf(kk):      # sum in place, term by term in the same order
                ku = np.multiply(ab[3, dof][None, :], U[dof], out=dest[s_i])
                for d in range(1, 4):
                    if dof - d >= 0:
                        ku += np.multiply(ab[3 - d, dof][None, :], U[dof - d], out=kterm)
                    if dof + d < ndof:
                        ku += np.multiply(ab[3 - d, dof + d][None, :], U[dof + d], out=kterm)
                ku -= Fu[dof]
            else:
                dest[s_i] = -kk * U[dof]
    # --- global balance of every unit column (force, moment about x = 0): the nodal
    # loads and the support reactions as point loads in the x-y plane (fe.balance)
    # (planar_balance: global_balance without its passes over the zero components)
    n_items = n + len(prep.supports)
    Fy = np.empty((b, nc, n_items))
    Mz = np.empty((b, nc, n_items))
    Fy[:, :, :n] = Fu[0::2].T
    Fy[:, :, n:] = Rf.T
    Mz[:, :, :n] = Fu[1::2].T
    Mz[:, :, n:] = Rm.T
    xk = np.concatenate([x, x[:, sup_nodes]], axis=1)[:, None, :]   # (b, 1, k)
    rel = planar_balance(xk, Fy, Mz)
    worst = rel.max(axis=1) if nc else np.zeros(b)
    tol = model.solver.residual_tolerance
    for i in np.flatnonzero(~(worst <= tol) & (reason == "")):
        reason[i] = (f"NumericalError: equilibrium residual {worst[i]:.3g} of the applied "
                     f"load exceeds the tolerance {tol:.1g}")

    # --- case values of both planes from the unit columns: value[k] = sum_c Z[c]*coef[c, k],
    # summed term by term in the order c = 0, 1, ..., one output at a time so that its
    # (2m, b) block and the term stay in cache. A term whose coefficients in one plane
    # are all 0 adds nothing there and one whose coefficients are all 1 adds Z itself
    # (the shaft weight): exact, the same values up to the sign of a zero, which no
    # result reads (|R|, |u| and |phi| are taken of them).
    tmp = np.empty((2 * m, b))
    halves = (slice(0, m), slice(m, 2 * m))
    terms = [(c, h, bool(np.all(coef[c, h] == 1.0))) for c in range(nc) for h in halves
             if np.any(coef[c, h] != 0.0)]

    def combine(Z: Array, out_: Array) -> Array:
        """(nc, b) unit-column values of one output -> ``out_`` (2m, b) case values."""
        started = [False, False]
        for c, h, one in terms:
            k = 0 if h.start == 0 else 1
            dest = out_[h]
            if not started[k]:
                started[k] = True
                if one:
                    dest[...] = Z[c][None, :]
                else:
                    np.multiply(coef[c, h][:, None], Z[c][None, :], out=dest)
            elif one:
                dest += Z[c][None, :]
            else:
                t = tmp[h]
                np.multiply(coef[c, h][:, None], Z[c][None, :], out=t)
                dest += t
        for k, h in enumerate(halves):
            if not started[k]:
                out_[h] = 0.0
        return out_

    R = np.zeros((nb, 2 * m, b))     # both planes' reactions (0: no support, thrust)
    for s_i, (j, _, _) in enumerate(prep.supports):
        combine(Rf[s_i], R[j])
    Fr = np.hypot(R[:, :m], R[:, m:])                    # (nb, m, b)
    Ka = prep.fx_elements[:, None] + (mass_total * prep.gravity[0])[None, :]  # (m, b)
    Fa = _axial(shaft, Ka, Fr)                           # (nb, m, b)
    # --- deflections and slopes at the bearing and element nodes, largest over cases
    nodes = np.concatenate([bnode, enode])
    defl = np.empty((nodes.size, b))                     # (nb + ne, b)
    slope = np.empty((nodes.size, b))
    hyp = np.empty((m, b))
    block = np.empty((2 * m, b))
    first: dict[int, int] = {}      # node -> its first row (elements may share a node)
    for r, nd in enumerate(nodes.tolist()):
        if nd in first:             # the same node: the same values, computed once
            defl[r] = defl[first[nd]]
            slope[r] = slope[first[nd]]
            continue
        first[nd] = r
        for dof, largest in ((2 * nd, defl), (2 * nd + 1, slope)):
            if rigid[dof]:          # a rigid support's DOF: u = 0 in every column
                largest[r] = 0.0
                continue
            combine(U[dof], block)
            _largest_hypot(block[:m], block[m:], largest[r], hyp)
    # consecutive variants without a heat balance: results written in place (the rows
    # of ``out`` still hold the values of BatchArrays.empty), else copied by put
    direct = prep.thermal is None and int(rows[-1]) - int(rows[0]) + 1 == b
    res = (out.window(int(rows[0]), int(rows[0]) + b) if direct
           else BatchArrays.empty(b, nb, ne, len(prep.open_seats)))
    res.reason[:] = reason
    res.deflection_mm[:] = defl[:nb].T
    res.slope_rad[:] = slope[:nb].T
    res.el_deflection_mm[:] = defl[nb:].T
    res.el_slope_rad[:] = slope[nb:].T
    res.Fr_max_N[:] = Fr.max(axis=1).T
    res.Fa_max_N[:] = Fa.max(axis=1).T
    ok_rows = np.flatnonzero(reason == "")
    temps = None
    if prep.thermal is not None and ok_rows.size:   # temperatures from the heat balance
        res.thermal, temps, failed = study_balance(
            prep.thermal, np.moveaxis(Fr, 2, 0), np.moveaxis(Fa, 2, 0),
            prep.duty.speed_rpm, ok_rows)
        res.reason[ok_rows] = failed[ok_rows]
        # as the single run: without a steady temperature the lives are not evaluated
        ok_rows = ok_rows[(failed[ok_rows] == "") & ~res.thermal.runaway[ok_rows]]
    if ok_rows.size:
        C = geom.bearing_C_N[rows]
        # (nb, b, m) views of the case-major (nb, m, b) blocks: one bearing's spectra
        # are the rows of a (b, m) view (evaluate_planned takes any layout)
        _lives(prep, np.moveaxis(Fr, 2, 1), np.moveaxis(Fa, 2, 1), C, ok_rows, res, temps)
    bad_rows = np.flatnonzero(res.reason != "")
    if bad_rows.size:
        for name in ("Fr_max_N", "Fa_max_N", "deflection_mm", "slope_rad",
                     "el_deflection_mm", "el_slope_rad"):
            getattr(res, name)[bad_rows] = np.nan
    if not direct:
        out.put(rows, res)


#: Squared norms within this relative distance of the largest count as a tie.
_TIE = 1e-12


def _largest_hypot(a: Array, b: Array, out: Array, work: Array) -> None:
    """``out[v] = max_k hypot(a[k, v], b[k, v])`` with one hypot per column, bit for bit.

    hypot is the costly pass; the largest is where a^2 + b^2 is largest: computed in
    floating point that sum is within about 2.2e-16 of the exact one, so a column whose
    largest sum is ahead of every other case by more than 1e-12 (relative) has its
    largest hypot (an error below one ulp) at that case. Other columns (near ties,
    zeros, tiny or non-finite values) take the hypot of every case. ``work``: (m, b).
    """
    np.multiply(a, a, out=work)
    work += b * b
    # max over the outer axis (fast; NaN propagates as at argmax's pick) and the first
    # case near it: in a column with a single such case that is argmax's case (others
    # go to the full pass below, whatever case k names there)
    top = work.max(axis=0)
    near = work >= top * (1.0 - _TIE)
    single = np.count_nonzero(near, axis=0) == 1
    single &= top >= 1e-280                     # normal numbers: the error bound holds
    k = np.argmax(near, axis=0)
    cols = np.arange(a.shape[1])
    np.hypot(a[k, cols], b[k, cols], out=out)
    rest = np.flatnonzero(~single)
    if rest.size:
        out[rest] = np.hypot(a[:, rest], b[:, rest]).max(axis=0)


def _axial(shaft: Shaft, Ka: Array, Fr: Array) -> Array:
    """|axial load| each bearing carries (nb, m, b), by :func:`analysis.axial_reactions`."""
    radial = {b.id: Fr[j] for j, b in enumerate(shaft.bearings)}
    on_shaft, _ = axial_reactions(shaft.bearings, Ka, radial)
    return np.stack([np.broadcast_to(np.abs(on_shaft[b.id]), Ka.shape)
                     for b in shaft.bearings])


# ------------------------------------------------------------------------------ lives
#: per-(variant, bearing) results the life chains give and the study keeps (the names of
#: LifeArrays / PlannedLife and of BatchArrays agree)
_LIFE_FIELDS = ("Lnm_h", "margin", "life_ratio", "s0", "life_ok", "static_ok", "ok",
                "min_load_ratio")


def _lives(prep: Prepared, Fr: Array, Fa: Array, C: Array, rows: NDArray[np.intp],
           res: BatchArrays, temps: Array | None = None) -> None:
    """Life verdict of every bearing by the life chain of :mod:`shaftsys.bearings.kernel`.

    Fr, Fa (nb, b, m) [N] and C (b, nb) [N] of a chunk; ``rows``: the variants to
    evaluate (positions in the chunk and in ``res``). A variant with a user error gets
    its reason (that of its first bearing in model order with one) and no life results.
    ``temps`` (b, m) [degC]: per variant of the chunk the case temperatures of the heat
    balance (``None``: the model's).

    A bearing with a plan (:attr:`Prepared.plans`, built by
    :func:`~shaftsys.bearings.kernel.plan_row`: everything that does not depend on the
    loads, once per study) goes through :func:`~shaftsys.bearings.kernel.evaluate_planned`
    for all variants at once. The variants a plan does not cover (a load-dependent user
    error is possible) and the bearings without a plan go through
    :func:`~shaftsys.bearings.kernel.evaluate`, one call per group of bearings of one
    kind (:attr:`Prepared.kind_groups`) over their (variant, bearing) rows. Both give
    the same bits for a row.
    """
    b = rows.size
    nb = len(prep.bearings)
    bad = np.zeros((b, nb), dtype=bool)
    errors: dict[tuple[int, int], object] = {}
    L90 = np.full((b, nb), np.inf)
    a1 = np.ones((b, nb))
    fall = np.zeros(b, dtype=bool)
    planned: set[int] = set()
    every = rows.size == Fr.shape[1]
    for j, plan in enumerate(prep.plans):
        if plan is None:
            continue
        planned.add(j)
        pl = evaluate_planned(plan, Fr[j] if every else Fr[j][rows],
                              Fa[j] if every else Fa[j][rows], C[rows, j])
        fall |= pl.fallback
        for name in (*_LIFE_FIELDS, "speed_ratio"):
            getattr(res, name)[rows, j] = getattr(pl, name)
        L90[:, j] = pl.Lnm_h
        a1[:, j] = plan.a1
    again = np.flatnonzero(fall)
    for group in prep.kind_groups:
        rest = tuple(j for j in group if j not in planned)
        if rest:
            _evaluate_group(prep, rest, Fr, Fa, C, np.arange(b), rows, res, bad, errors,
                            L90, a1, temps)
        done = tuple(j for j in group if j in planned)
        if done and again.size:
            _evaluate_group(prep, done, Fr, Fa, C, again, rows, res, bad, errors, L90, a1,
                            temps)
    if prep.open_seats:
        Frv, Fav = np.moveaxis(Fr, 0, 1), np.moveaxis(Fa, 0, 1)   # (b, nb, m)
        for k, oc in enumerate(prep.open_seats):
            _choose_open(prep, oc, k, Frv, Fav, rows, res, L90, a1)
    failed_v = bad.any(axis=1)
    for i in np.flatnonzero(failed_v):
        first = int(np.argmax(bad[i]))
        res.reason[rows[i]] = f"ModelError: {errors[(int(i), first)]}"
    unchosen = np.isnan(L90).any(axis=1)     # an open support with no qualifying row
    with np.errstate(invalid="ignore", divide="ignore"):
        L90 = np.where(np.isfinite(L90), L90 / a1, np.inf)
    life, lim = system_life_batch(L90, prep.slopes, prep.reliability)
    res.system_life_h[rows] = np.where(unchosen, np.nan, life)
    res.limiting[rows] = np.where(unchosen, -1, lim)
    badv = rows[failed_v]
    if badv.size:
        for name in ("Lnm_h", "margin", "life_ratio", "s0", "system_life_h"):
            getattr(res, name)[badv] = np.nan
        for name in ("life_ok", "static_ok", "ok"):
            getattr(res, name)[badv] = False
        res.limiting[badv] = -1


def _evaluate_group(prep: Prepared, group: tuple[int, ...], Fr: Array, Fa: Array, C: Array,
                    sub: NDArray[np.intp], rows: NDArray[np.intp], res: BatchArrays,
                    bad: NDArray[np.bool_], errors: dict[tuple[int, int], object],
                    L90: Array, a1: Array, temps: Array | None = None) -> None:
    """The general life chain for bearings ``group`` (one kind) of the variants ``sub``
    (positions in ``rows``): one :func:`evaluate` call over their (variant, bearing) rows
    (``temps``: the chunk's heat-balance temperatures per variant, or ``None``).
    """
    g = len(group)
    cols = np.asarray(group, dtype=np.intp)
    model = prep.model
    m = Fr.shape[2]
    nv = sub.size
    which = np.tile(cols, nv)                      # row r = (variant r // g, bearing)
    at_chunk = rows[sub]
    params = replace(prep.stacked.take(which), C_N=C[at_chunk][:, cols].reshape(-1))
    duty = prep.duty if temps is None else replace(
        prep.duty, temperature_C=np.repeat(temps[at_chunk], g, axis=0))
    la = evaluate(params, np.moveaxis(Fr[cols][:, at_chunk], 0, 1).reshape(-1, m),
                  np.moveaxis(Fa[cols][:, at_chunk], 0, 1).reshape(-1, m), duty,
                  model.life, model.lubrication, per_case=False)
    failed = ~la.valid
    for r in np.flatnonzero(failed):
        errors[(int(sub[int(r) // g]), int(group[int(r) % g]))] = la.errors[int(r)]
    bad[sub[:, None], cols] = failed.reshape(nv, g)
    at = at_chunk[:, None]
    for name in _LIFE_FIELDS:
        getattr(res, name)[at, cols] = getattr(la, name).reshape(nv, g)
    res.speed_ratio[at, cols] = np.broadcast_to(la.speed_ratio, (nv * g,)).reshape(nv, g)
    L90[sub[:, None], cols] = la.Lnm_h.reshape(nv, g)
    a1[sub[:, None], cols] = la.a1.reshape(nv, g)


#: Largest (variant x candidate x case) block the choice evaluates at once.
_CHOICE_BLOCK = 1_000_000


def _choose_open(prep: Prepared, oc: OpenChoice, k: int, Fr: Array, Fa: Array,
                 rows: NDArray[np.intp], res: BatchArrays, L90: Array, a1: Array) -> None:
    """Choose open support ``oc`` for every variant ``rows`` at once.

    Every fitting catalogue row (in rank order) against every variant's spectrum is one
    table for the life chain (blocks of at most :data:`_CHOICE_BLOCK` values): per
    variant the first row in rank order that passes the hard checks, preferring those
    that also meet the minimum load (as :func:`shaftsys.analysis.selection.choose_seat`;
    ``largest_margin``: the largest margin, ties in rank order). One pass: the loads are
    those of the study's supports (the batched path is used only where the chosen row
    cannot move its support or change the thrust, i.e. no adjusted pair is open).
    """
    j = oc.index
    R = oc.rows.size
    b = rows.size
    model = prep.model
    m = Fr.shape[2]
    if R == 0:
        res.ok[rows, j] = False
        L90[:, j] = np.nan
        return
    cat = oc.seat.catalogue
    step = max(1, _CHOICE_BLOCK // max(R * m, 1))
    for lo in range(0, b, step):
        sub = rows[lo: lo + step]
        nv = sub.size
        params = oc.params.take(np.tile(np.arange(R), nv))
        la = evaluate(params, np.repeat(Fr[sub, j, :], R, axis=0),
                      np.repeat(Fa[sub, j, :], R, axis=0), prep.duty, model.life,
                      model.lubrication, per_case=False)
        hard_rows, soft_rows = qualifying(la)
        hard, soft = hard_rows.reshape(nv, R), soft_rows.reshape(nv, R)
        use = np.where(np.any(soft, axis=1)[:, None], soft, hard)
        if oc.by_margin:
            pick = np.argmax(np.where(use, la.margin.reshape(nv, R), -np.inf), axis=1)
        else:
            pick = np.argmax(use, axis=1)
        got = use.any(axis=1)
        flat = np.arange(nv) * R + pick
        sel = np.where(got, oc.rows[pick], -1)
        res.choice[sub, k] = sel
        for name in ("Lnm_h", "margin", "life_ratio", "s0"):
            getattr(res, name)[sub, j] = np.where(got, getattr(la, name)[flat], np.nan)
        for name in ("life_ok", "static_ok", "ok"):
            getattr(res, name)[sub, j] = got & np.asarray(getattr(la, name))[flat]
        pos = lo + np.arange(nv)
        L90[pos, j] = np.where(got, la.Lnm_h[flat], np.nan)
        a1[pos, j] = la.a1[flat]
        mass = np.where(got, cat.mass_kg[np.maximum(sel, 0)], np.nan)
        price = np.where(got, cat.price[np.maximum(sel, 0)], np.nan)
        prev_m = np.where(np.isnan(res.chosen_mass_kg[sub]) & (k == 0), 0.0,
                          res.chosen_mass_kg[sub])
        prev_p = np.where(np.isnan(res.chosen_price[sub]) & (k == 0), 0.0,
                          res.chosen_price[sub])
        res.chosen_mass_kg[sub] = prev_m + mass
        res.chosen_price[sub] = prev_p + price


def system_life_batch(lives: Array, slopes: Array, reliability: float
                      ) -> tuple[Array, NDArray[np.intp]]:
    """System life [unit of lives] and limiting bearing index for many variants.

    Solves sum_i ln(0.9) (L/L_i)^e_i = ln R (Lundberg-Palmgren Weibull product, as
    :func:`shaftsys.bearings.system.system_life`) by Newton's method on y = ln L,
    started right of the root (h(y) = sum (e^y/L_i)^e_i is convex and increasing, so the
    iterates decrease monotonically to the root). Infinite lives are left out; a row
    with none finite gives inf and index -1.

    Parameters
    ----------
    lives: (B, n) 90 %-reliability lives [h] (inf = never fails).
    slopes: (n,) Weibull slopes [-].
    reliability: system reliability R [-].
    """
    Lv = np.atleast_2d(np.asarray(lives, dtype=float))
    e = np.asarray(slopes, dtype=float)[None, :]
    finite = np.isfinite(Lv) & (Lv > 0.0)
    c = math.log(reliability) / _LN09
    lnL = np.where(finite, np.log(np.where(finite, Lv, 1.0)), np.inf)
    y = np.min(np.where(finite, lnL + math.log(c) / e, np.inf), axis=1)
    anyf = np.isfinite(y)
    y = np.where(anyf, y, 0.0)
    for _ in range(100):
        t = np.where(finite, np.exp(e * (y[:, None] - np.where(finite, lnL, 0.0))), 0.0)
        h = t.sum(axis=1)
        dh = (e * t).sum(axis=1)
        step = np.where(anyf & (dh > 0.0), (h - c) / np.where(dh > 0.0, dh, 1.0), 0.0)
        y = y - step
        if not np.any(np.abs(step) > 1e-15 * np.maximum(1.0, np.abs(y))):
            break
    life = np.where(anyf, np.exp(y), np.inf)
    hazard = np.where(finite, np.exp(e * (y[:, None] - np.where(finite, lnL, 0.0))), -1.0)
    lim = np.where(anyf, np.argmax(hazard, axis=1), -1).astype(np.intp)
    return life, lim


def error_text(exc: BaseException) -> str:
    """``"<Type>: message"`` of an error (what invalid variants record)."""
    return f"{type(exc).__name__}: {exc}"


__all__ = ["CHUNK", "BatchArrays", "NumericalError", "Prepared",
           "error_text", "evaluate_geometry", "prepare", "system_life_batch"]
