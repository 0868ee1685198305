"""Best layout: the values of continuous quantities that maximise the worst life margin.

Units: quantities in their internal units (mm for stations); margins C/C_req [-];
sensitivities d(ln L_i)/dq in 1/(unit of q).

Problem: maximise min_i margin_i(q) over the bearings i, subject to the study's
deflection and slope limits and to lower <= q <= upper. The max-min objective has kinks
where the limiting bearing changes, so it is solved in epigraph form::

    maximise t  subject to  margin_i(q) - t >= 0         (every bearing with a finite
                                                            margin)
                            1 - value_j(q)/limit_j >= 0  (every limit)
                            lower <= q <= upper

with scipy.optimize.minimize (SLSQP), variables scaled to [0, 1], gradients by central
finite differences evaluated as one batch of the study evaluator, started from the best
point of a grid (the feasible grid point with the largest worst margin; else the one
closest to feasibility). At the optimum the report names the active constraints (a
limit, a bound, or a balance of margins) and the sensitivity d(ln Lnm_h,i)/dq of every
support (central differences, one-sided at a bound).
"""

from __future__ import annotations

import logging
import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np
from numpy.typing import NDArray

from shaftsys.errors import ModelError
from shaftsys.model import Model
from shaftsys.study.sweep import (
    Limit,
    Study,
    _names,
    evaluate_values,
    limit_values,
    make_study,
    sweep,
)
from shaftsys.study.variant_batch import BatchArrays

log = logging.getLogger(__name__)

#: Penalty margin given to invalid variants inside the optimiser [-].
_INVALID = -1e3


@dataclass(frozen=True)
class Optimum:
    """Result of :func:`optimise`.

    Attributes
    ----------
    values: optimal value of each quantity (path -> value, internal units).
    worst_margin: the smallest margin C/C_req at the optimum [-].
    worst_support: bearing id with that margin.
    margins: margin of every bearing [-].
    lives_h: Lnm_h of every bearing [h].
    limit_values: value / limit of every limit (label -> ratio) [-].
    active: active constraints: limit labels, ``"<path> at lower/upper bound"``, or
        ``"margins of A and B balanced"``.
    active_limit: the first active deflection/slope limit, or ``None``.
    sensitivity: bearing -> {path: d(ln Lnm_h)/dq [1/unit]}.
    start: the grid point the solver started from.
    success, message, evaluations: solver outcome and number of variant evaluations.
    """

    values: dict[str, float]
    worst_margin: float
    worst_support: str
    margins: dict[str, float]
    lives_h: dict[str, float]
    limit_values: dict[str, float]
    active: tuple[str, ...]
    active_limit: str | None
    sensitivity: dict[str, dict[str, float]]
    start: dict[str, float]
    success: bool
    message: str
    evaluations: int

    def to_dict(self) -> dict[str, Any]:
        """Plain JSON-ready values."""
        from shaftsys.io.output import json_ready

        return json_ready(dict(self.__dict__))  # type: ignore[no-any-return]


def optimise(model: Model, bounds: dict[str, tuple[float, float]], *,
             limits: Sequence[Limit] = (), seat: Sequence[str] = (), grid: int = 9,
             maxiter: int = 200, fd_step: float = 1e-6) -> Optimum:
    """Maximise the worst life margin over continuous quantities (see module docstring).

    Parameters
    ----------
    model: base model.
    bounds: ``{path: (lower, upper)}`` in the quantities' units.
    limits: deflection/slope limits (constraints).
    seat: paths or bearing ids moved with their seat (see :mod:`shaftsys.study.paths`).
    grid: grid points per quantity for the start (>= 2).
    maxiter: SLSQP iterations.
    fd_step: finite-difference step as a fraction of each bound range.

    Raises
    ------
    ModelError: bad bounds, or no valid grid point to start from.
    """
    from scipy.optimize import minimize

    if not bounds:
        raise ModelError("nothing to optimise", field="study.optimise",
                         expected="at least one {path: [lower, upper]}")
    lo = np.array([float(b[0]) for b in bounds.values()])
    hi = np.array([float(b[1]) for b in bounds.values()])
    if not np.all(np.isfinite(lo) & np.isfinite(hi) & (hi > lo)):
        raise ModelError("bounds must be finite with lower < upper", field="study.optimise",
                         expected="{path: [lower, upper]}")
    paths = list(bounds)
    study = make_study(model, [(p, f"{a}:{b}:{max(grid, 2)}") for p, a, b in zip(
        paths, lo, hi, strict=True)], seat=seat, limits=limits)
    bearings, elements, gears = _names(model)
    span = hi - lo
    k = len(paths)
    counter = [0]
    cache: dict[bytes, tuple[NDArray[np.float64], NDArray[np.float64]]] = {}

    def measures(Z: NDArray[np.float64]) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
        """Margins (r, nb) and limit slacks (r, n_limits) at scaled points Z (r, k)."""
        a, _ = evaluate_values(study, lo + Z * span)
        counter[0] += Z.shape[0]
        return _margins(a), _slacks(study, a, bearings, elements, gears)

    use = np.ones(len(bearings), dtype=bool)

    def at(z: NDArray[np.float64]) -> tuple[NDArray[np.float64], NDArray[np.float64],
                                            NDArray[np.float64], NDArray[np.float64]]:
        """Values and Jacobians (central differences) of margins and slacks at z."""
        key = z.tobytes()
        if key not in cache:
            h = fd_step
            pts = [z]
            for i in range(k):
                e = np.zeros(k)
                e[i] = h
                pts += [np.clip(z + e, 0.0, 1.0), np.clip(z - e, 0.0, 1.0)]
            M, S = measures(np.array(pts))
            cache.clear()
            cache[key] = (M, S)
        M, S = cache[key]
        jm = np.zeros((M.shape[1], k))
        js = np.zeros((S.shape[1], k))
        for i in range(k):
            up, dn = z[i] + fd_step, z[i] - fd_step
            du = min(up, 1.0) - max(dn, 0.0)
            jm[:, i] = (M[1 + 2 * i] - M[2 + 2 * i]) / du
            js[:, i] = (S[1 + 2 * i] - S[2 + 2 * i]) / du
        return M[0], S[0], jm, js

    # --- start: best grid point
    df = sweep(study)
    start_row = _best_row(df)
    z0 = (np.array([float(start_row[p]) for p in paths]) - lo) / span
    m0, _, _, _ = at(z0)
    use = np.isfinite(m0) & (m0 < 1e12)
    if not np.any(use):
        raise ModelError("no bearing has a finite life margin to optimise",
                         field="study.optimise", expected="duty cases that load the bearings")
    t0 = float(np.min(m0[use]))

    def fun(w: NDArray[np.float64]) -> tuple[float, NDArray[np.float64]]:
        g = np.zeros(k + 1)
        g[-1] = -1.0
        return -float(w[-1]), g

    def cons(w: NDArray[np.float64]) -> NDArray[np.float64]:
        M, S, _, _ = at(w[:k])
        return np.concatenate([M[use] - w[-1], S])

    def cons_jac(w: NDArray[np.float64]) -> NDArray[np.float64]:
        _, _, jm, js = at(w[:k])
        top = np.hstack([jm[use], -np.ones((int(use.sum()), 1))])
        bottom = np.hstack([js, np.zeros((js.shape[0], 1))])
        return np.vstack([top, bottom])

    res = minimize(fun, np.append(z0, t0), jac=True, method="SLSQP",
                   bounds=[(0.0, 1.0)] * k + [(None, None)],
                   constraints=[{"type": "ineq", "fun": cons, "jac": cons_jac}],
                   options={"maxiter": maxiter, "ftol": 1e-12})
    z = np.clip(res.x[:k], 0.0, 1.0)
    q = lo + z * span
    a, _ = evaluate_values(study, q[None, :])
    counter[0] += 1
    margins = _margins(a)[0]
    slack = _slacks(study, a, bearings, elements, gears)[0]
    worst = int(np.nanargmin(np.where(use, margins, np.inf)))
    active: list[str] = []
    for li, s in zip(study.limits, slack, strict=True):
        if abs(s) < 1e-6:
            active.append(li.label)
    active_limit = active[0] if active else None
    for p, zi in zip(paths, z, strict=True):
        if zi <= 1e-9:
            active.append(f"{p} at lower bound")
        elif zi >= 1.0 - 1e-9:
            active.append(f"{p} at upper bound")
    tied = [bearings[i] for i in range(len(bearings))
            if use[i] and abs(margins[i] - margins[worst]) <= 1e-6 * abs(margins[worst])]
    if len(tied) > 1:
        active.append("margins of " + " and ".join(tied) + " balanced")
    sens = _sensitivity(study, q, lo, hi, bearings)
    counter[0] += 2 * k
    return Optimum(
        values={p: float(v) for p, v in zip(paths, q, strict=True)},
        worst_margin=float(margins[worst]), worst_support=bearings[worst],
        margins={b: float(v) for b, v in zip(bearings, margins, strict=True)},
        lives_h={b: float(v) for b, v in zip(bearings, a.Lnm_h[0], strict=True)},
        limit_values={li.label: float(1.0 - s) for li, s in zip(study.limits, slack,
                                                                 strict=True)},
        active=tuple(active), active_limit=active_limit, sensitivity=sens,
        start={p: float(start_row[p]) for p in paths}, success=bool(res.success),
        message=str(res.message), evaluations=counter[0])


def _margins(a: BatchArrays) -> NDArray[np.float64]:
    return np.where(a.reason[:, None] == "", a.margin, _INVALID)


def _slacks(study: Study, a: BatchArrays, bearings: list[str], elements: list[str],
            gears: list[str]) -> NDArray[np.float64]:
    """1 - value/limit per limit, (r, n_limits); invalid variants get -1."""
    cols = [1.0 - limit_values(li, bearings, elements, gears, a) / li.max_value
            for li in study.limits]
    S = np.column_stack(cols) if cols else np.zeros((a.reason.size, 0))
    return np.where(a.reason[:, None] == "", S, -1.0)


def _best_row(df: Any) -> Any:
    valid = df[df["valid"]]
    if not len(valid):
        raise ModelError("no valid variant on the start grid", field="study.optimise",
                         expected="bounds that keep the layout possible")
    feasible = valid[valid["limits_ok"]]
    if len(feasible):
        return feasible.loc[feasible["worst_margin"].idxmax()]
    return valid.loc[valid["worst_limit_ratio"].idxmin()]


def _sensitivity(study: Study, q: NDArray[np.float64], lo: NDArray[np.float64],
                 hi: NDArray[np.float64], bearings: list[str]) -> dict[str, dict[str, float]]:
    """d(ln Lnm_h,i)/dq_j by central differences (one-sided at a bound)."""
    k = q.size
    h = 1e-5 * (hi - lo)
    pts = []
    for j in range(k):
        up = q.copy()
        dn = q.copy()
        up[j] = min(q[j] + h[j], hi[j])
        dn[j] = max(q[j] - h[j], lo[j])
        pts += [up, dn]
    a, _ = evaluate_values(study, np.array(pts))
    with np.errstate(divide="ignore", invalid="ignore"):
        lnL = np.log(a.Lnm_h)
    out: dict[str, dict[str, float]] = {b: {} for b in bearings}
    for j, quantity in enumerate(study.quantities):
        dq = pts[2 * j][j] - pts[2 * j + 1][j]
        for i, b in enumerate(bearings):
            d = (lnL[2 * j, i] - lnL[2 * j + 1, i]) / dq
            out[b][quantity.path] = float(d) if math.isfinite(d) else float("nan")
    return out
