"""Sweeps: variants of a model over readable quantity paths, evaluated in blocks.

Units: values in the internal unit of each quantity (:attr:`Quantity.unit`); results
in N, mm, rad, h (column names carry the unit).

A :class:`Study` is a base model, the swept quantities with their values, how they are
combined (``grid``: cartesian product, the first quantity varying slowest; ``zip``:
the i-th values together) and optional deflection/slope limits. Variant ``i`` has the
stable id ``v{i:06d}`` (more digits above a million variants) and its values follow from
``i`` alone, so any block ``[lo, hi)`` can be evaluated anywhere (worker processes,
resumed runs) with identical numbers.

:func:`evaluate_block` uses the batched evaluator (:mod:`shaftsys.study.variant_batch`) when
the model has one shaft and every quantity is geometric (bearing and element stations,
spacings, step diameters, bores and lengths, bearing C); otherwise it runs
:func:`shaftsys.analyse` per variant (logged once per study). Shaft strength checks
(fatigue, critical speeds) are not part of a study's verdict: ``ok`` means every bearing
meets its life and static targets, every limit of the study is met and, with a heat
balance (``model.thermal``), the thermal checks of the single run pass; the lives then use
each variant's own temperatures (:mod:`shaftsys.analysis.thermal_batch`).
"""

from __future__ import annotations

import hashlib
import json
import logging
import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Any, BinaryIO

import numpy as np
from numpy.typing import NDArray

from shaftsys.analysis.thermal_batch import VariantThermal, from_result, thermal_setup
from shaftsys.errors import ModelError, NumericalError
from shaftsys.model import Model
from shaftsys.study.paths import Quantity, geometry_of, model_with, parse_quantity, parse_values
from shaftsys.study.variant_batch import BatchArrays, error_text, evaluate_geometry, prepare

if TYPE_CHECKING:
    import pandas as pd

    from shaftsys.study.variant_batch import Prepared

log = logging.getLogger(__name__)

LIMIT_KINDS = {"deflection": "deflection_mm", "slope": "slope_rad"}
LIMIT_GROUPS = ("gears", "bearings", "elements")


@dataclass(frozen=True)
class Limit:
    """A deflection [mm] or slope [rad] limit, largest over the cases.

    ``at``: bearing or element ids, or the groups ``gears``, ``bearings``,
    ``elements``.
    """

    kind: str
    at: tuple[str, ...]
    max_value: float

    def __post_init__(self) -> None:
        if self.kind not in LIMIT_KINDS:
            raise ModelError(f"unknown limit kind '{self.kind}'", field="study.limits",
                             expected=f"one of {list(LIMIT_KINDS)}")
        if not (self.max_value > 0.0 and math.isfinite(self.max_value)):
            raise ModelError(f"limit {self.kind} max = {self.max_value!r}",
                             field=f"study.limits.{self.kind}.max", expected="a value > 0")

    @property
    def label(self) -> str:
        """Short name, e.g. ``deflection@load``."""
        return f"{self.kind}@{'+'.join(self.at)}"


@dataclass(frozen=True, eq=False)
class Study:
    """A sweep definition (see the module docstring).

    Attributes
    ----------
    model: base model.
    quantities: swept quantities, in application order.
    values: one 1-D array of values per quantity (internal units).
    mode: ``"grid"`` or ``"zip"``.
    limits: deflection and slope limits.
    """

    model: Model
    quantities: tuple[Quantity, ...]
    values: tuple[NDArray[np.float64], ...]
    mode: str = "grid"
    limits: tuple[Limit, ...] = ()
    _prep: list[Any] = field(default_factory=list, repr=False)

    def __post_init__(self) -> None:
        if self.mode not in ("grid", "zip"):
            raise ModelError(f"unknown combination '{self.mode}'", field="study.combine",
                             expected="grid or zip")
        if len(self.values) != len(self.quantities) or not self.quantities:
            raise ModelError("a study needs at least one quantity with values",
                             field="study.vary", expected="PATH=VALUES")
        if self.mode == "zip" and len({v.size for v in self.values}) > 1:
            raise ModelError("zip needs the same number of values for every quantity",
                             field="study.combine", expected="equal lengths, or grid")
        paths = [q.path for q in self.quantities]
        if len(set(paths)) != len(paths):
            raise ModelError("a quantity is swept twice", field="study.vary",
                             expected="each path once")

    @property
    def shape(self) -> tuple[int, ...]:
        """Grid shape (``(n,)`` for zip)."""
        if self.mode == "zip":
            return (int(self.values[0].size),)
        return tuple(int(v.size) for v in self.values)

    @property
    def n_variants(self) -> int:
        """Number of variants."""
        return int(np.prod(self.shape))

    @property
    def batched(self) -> bool:
        """True when the batched evaluator covers this study."""
        placeholders = {b.id: b for _, b in self.model.bearings()}
        return (len(self.model.shafts) == 1 and not getattr(self.model, "links", None)
                and all(q.geometric for q in self.quantities)
                # an open adjusted pair needs the solve-choose passes of analyse
                and all(placeholders[o.bearing_id].pair is None
                        for o in self.model.open_seats)
                # a chosen row's friction changes the heat balance that its life uses
                and not (self.model.thermal is not None and self.model.open_seats)
                and not any(getattr(e, "hubs_mm", ())  # a drum's hubs: loads off its station
                            for e in self.model.shafts[0].elements)
                # nonlinear bearing stiffness: the solve of analyse
                and self.model.solver.bearing_stiffness != "nonlinear")

    def values_block(self, lo: int, hi: int) -> NDArray[np.float64]:
        """Values of variants ``lo..hi-1``, shape (hi - lo, n_quantities)."""
        idx = np.arange(lo, hi)
        if self.mode == "zip":
            return np.column_stack([v[idx] for v in self.values])
        sub = np.unravel_index(idx, self.shape)
        return np.column_stack([v[s] for v, s in zip(self.values, sub, strict=True)])

    @property
    def id_width(self) -> int:
        """Digits of the variant ids (at least 6)."""
        return max(6, len(str(self.n_variants - 1)))

    def variant_id(self, i: int) -> str:
        """Stable id of variant ``i`` (``v000123``)."""
        return f"v{i:0{self.id_width}d}"

    def prepared(self) -> Prepared:
        """Shared data of the batched evaluator (built once per process)."""
        if not self._prep:
            self._prep.append(prepare(self.model))
        return self._prep[0]  # type: ignore[no-any-return]

    def fingerprint(self) -> str:
        """SHA-256 of the definition (quantities, values, mode, limits, model source)."""
        h = hashlib.sha256()
        h.update(json.dumps({
            "quantities": [(q.path, q.seat) for q in self.quantities],
            "mode": self.mode, "limits": [(li.kind, li.at, li.max_value) for li in self.limits],
            "model": self.model.sha256 or repr(self.model),
        }, sort_keys=True, default=str).encode())
        for v in self.values:
            h.update(np.ascontiguousarray(v, dtype=float).tobytes())
        return h.hexdigest()


def make_study(model: Model, vary: Sequence[tuple[str, Any]] | dict[str, Any], *,
               mode: str = "grid", seat: Sequence[str] = (),
               limits: Sequence[Limit] = ()) -> Study:
    """Build a :class:`Study` from paths and value specifications.

    Parameters
    ----------
    model: base model.
    vary: ``{path: values}`` or ``[(path, values), ...]``; values as
        :func:`~shaftsys.study.paths.parse_values` (list, ``"start:stop:count"``, number).
    mode: ``grid`` or ``zip``.
    seat: paths (or bearing ids) whose bearing moves with its seat step.
    limits: deflection/slope limits.
    """
    items = list(vary.items()) if isinstance(vary, dict) else list(vary)
    qs = []
    vals = []
    seat_set = set(seat)
    for path, spec in items:
        q = parse_quantity(model, path)
        if path in seat_set or (q.moves_bearing and q.moves_bearing in seat_set):
            q = Quantity(q.path, q.kind, q.target, q.attr, q.shaft, q.unit, q.dimension, True)
        qs.append(q)
        vals.append(parse_values(spec, q.dimension, where=f"study.vary.{path}"))
    return Study(model, tuple(qs), tuple(vals), mode, tuple(limits))


# ------------------------------------------------------------------------- evaluation
def _names(model: Model) -> tuple[list[str], list[str], list[str]]:
    """Bearing ids, element ids and gear ids of the model (model order)."""
    bearings = [b.id for s in model.shafts for b in s.bearings]
    elements = [e.id for s in model.shafts for e in s.elements]
    gears = [e.id for s in model.shafts for e in s.elements
             if e.kind in ("gear", "bevel_gear")]
    return bearings, elements, gears


def evaluate_values(study: Study, values: NDArray[np.float64], *, batched: bool | None = None
                    ) -> tuple[BatchArrays, str]:
    """Evaluate rows of values; returns the arrays and the method (batched/analyse)."""
    use_batch = study.batched if batched is None else (batched and study.batched)
    if use_batch:
        shaft = study.model.shafts[0]
        geom = geometry_of(study.model, shaft.id, study.quantities, values)
        return evaluate_geometry(study.prepared(), geom), "batched"
    return _evaluate_each(study, values), "analyse"


def _evaluate_each(study: Study, values: NDArray[np.float64]) -> BatchArrays:
    """One :func:`shaftsys.analyse` per variant (the general path)."""
    from shaftsys.analysis import analyse

    model = study.model
    bearings, elements, _ = _names(model)
    B = values.shape[0]
    seat_ids = [o.bearing_id for o in model.open_seats]
    out = BatchArrays.empty(B, len(bearings), len(elements), len(seat_ids))
    if model.thermal is not None:
        out.thermal = VariantThermal.empty(B, len(bearings))
    for i in range(B):
        variant, reason = model_with(model, study.quantities, values[i])
        if reason:
            out.reason[i] = reason
            continue
        try:
            res = analyse(variant, with_shaft_checks=False)
        except (ModelError, NumericalError) as exc:
            out.reason[i] = error_text(exc)
            continue
        if res.selection is not None:
            mass = price = 0.0
            for k, sid in enumerate(seat_ids):
                c = res.selection.seat(sid).candidate
                out.choice[i, k] = -1 if c is None else c.row
                mass += math.nan if c is None else c.mass_kg
                price += math.nan if c is None else c.price
            out.chosen_mass_kg[i], out.chosen_price[i] = mass, price
        for j, br in enumerate(res.bearings):
            life = br.life
            out.Fr_max_N[i, j] = max((ld.Fr_N for ld in br.loads), default=0.0)
            out.Fa_max_N[i, j] = max((ld.Fa_N for ld in br.loads), default=0.0)
            out.deflection_mm[i, j] = max((ld.deflection_mm for ld in br.loads), default=0.0)
            out.slope_rad[i, j] = max((ld.slope_rad for ld in br.loads), default=0.0)
            if life is None:       # an open support with no qualifying catalogue row
                continue
            out.Lnm_h[i, j] = life.Lnm_h
            out.margin[i, j] = life.margin
            out.life_ratio[i, j] = life.life_ratio
            out.s0[i, j] = life.s0
            out.life_ok[i, j] = life.life_ok
            out.static_ok[i, j] = life.static_ok
            out.ok[i, j] = life.ok
            for oc in br.operating:
                ratios = (out.speed_ratio if oc.check == "limiting_speed"
                          else out.min_load_ratio)
                ratios[i, j] = math.nan if oc.ratio is None else oc.ratio
        j = 0
        for sr in res.shafts:
            for el in sr.shaft.elements:
                d = s = 0.0
                for sol in sr.cases:
                    node = int(np.argmin(np.abs(sol.node_x_mm - el.x_mm)))
                    disp = sol.displacement[node]
                    d = max(d, float(np.hypot(disp[1], disp[2])))
                    s = max(s, float(np.hypot(disp[4], disp[5])))
                out.el_deflection_mm[i, j] = d
                out.el_slope_rad[i, j] = s
                j += 1
        if res.thermal is not None and out.thermal is not None:
            setup = thermal_setup(res.model, [(br.bearing, br.shaft_id) for br in res.bearings])
            if setup is not None:
                out.thermal.put(np.array([i]), from_result(setup, res.thermal))
        out.system_life_h[i] = math.nan if res.system_life_h is None else res.system_life_h
        out.limiting[i] = (bearings.index(res.limiting_bearing)
                           if res.limiting_bearing in bearings else -1)
    return out


def evaluate_block(study: Study, lo: int, hi: int, *, batched: bool | None = None
                   ) -> pd.DataFrame:
    """Results of variants ``lo..hi-1`` as a DataFrame (one row per variant)."""
    values = study.values_block(lo, hi)
    arrays, method = evaluate_values(study, values, batched=batched)
    if method == "analyse" and batched is None and study.batched is False:
        _log_fallback(study)
    return results_frame(study, np.arange(lo, hi), values, arrays, method)


_LOGGED: set[str] = set()


def _log_fallback(study: Study) -> None:
    key = study.fingerprint()
    if key in _LOGGED:
        return
    _LOGGED.add(key)
    slow = [q.path for q in study.quantities if not q.geometric]
    why = ("the model has several shafts or links" if len(study.model.shafts) != 1
           or getattr(study.model, "links", None) else
           "quantities " + ", ".join(slow) + " are not geometric" if slow else
           "the model's open supports are chosen per variant, and with a heat balance "
           "the chosen bearing's friction changes the temperature its life uses"
           if study.model.thermal is not None and study.model.open_seats else
           "an adjusted pair or a drum needs the single run")
    log.warning("study: %s; the batched evaluator does not cover this study, so every "
                "variant runs shaftsys.analyse (slower)", why)


def results_frame(study: Study, index: NDArray[np.intp], values: NDArray[np.float64],
                  a: BatchArrays, method: str) -> pd.DataFrame:
    """Assemble the per-variant results table.

    Columns: ``variant``, ``index``, one per quantity path, ``valid``, ``reason``,
    ``method``; per bearing ``<id>.Lnm_h``, ``.margin``, ``.life_ratio``, ``.s0``,
    ``.ok``, ``.Fr_max_N``, ``.Fa_max_N``, ``.deflection_mm``, ``.slope_rad``; per
    element ``<id>.deflection_mm``, ``.slope_rad``; ``system_life_h``,
    ``limiting_bearing``, ``worst_margin``, ``worst_support``,
    ``max_deflection_gears_mm``, ``max_slope_gears_rad``,
    ``max_deflection_bearings_mm``, ``max_slope_bearings_rad``, ``limits_ok``,
    ``worst_limit_ratio`` (largest value/limit), ``ok``.

    Per bearing also ``<id>.min_load_ratio`` and ``<id>.speed_ratio`` (the operating
    limits; NaN: not judged); ``<id>.ok`` and ``ok`` include those the model's
    ``checks:`` section makes required, as ``check`` does.
    With a heat balance (``model.thermal``) also, per bearing, ``<id>.temperature_max_C``
    (the hottest duty case's temperature the lives use: typed wins; one housing, so the
    same for every bearing), ``.power_loss_W`` (duration-weighted mean over the duty
    cases, standstill counting as 0 W) and ``.power_loss_max_W``; per variant
    ``temperature_max_C``, ``computed_temperature_max_C`` (the balance's hottest),
    ``power_loss_W`` and ``power_loss_max_W`` (bearings plus the extra loss),
    ``heat_balance_speed_factor_min`` (>= 1 passes), ``thermal_runaway``, ``thermal_ok``
    (the single run's thermal verdict) and ``thermal_reason``; ``ok`` then needs
    ``thermal_ok``. A variant that runs away stays valid, with NaN lives, temperatures
    and losses, ``ok`` false and its reason.
    """
    import pandas as pd

    bearings, elements, gears = _names(study.model)
    B = index.size
    width = study.id_width
    valid = np.asarray(a.reason == "", dtype=bool)
    cols: dict[str, Any] = {
        "variant": [f"v{i:0{width}d}" for i in index.tolist()],
        "index": index.astype(np.int64),
    }
    for k, q in enumerate(study.quantities):
        cols[q.path] = values[:, k]
    cols["valid"] = valid
    cols["reason"] = a.reason.astype(str)
    cols["method"] = np.full(B, method)
    operating_ok = _operating_ok(study.model, bearings, a)
    for j, bid in enumerate(bearings):
        cols[f"{bid}.Lnm_h"] = a.Lnm_h[:, j]
        cols[f"{bid}.margin"] = a.margin[:, j]
        cols[f"{bid}.life_ratio"] = a.life_ratio[:, j]
        cols[f"{bid}.s0"] = a.s0[:, j]
        cols[f"{bid}.min_load_ratio"] = a.min_load_ratio[:, j]
        cols[f"{bid}.speed_ratio"] = a.speed_ratio[:, j]
        cols[f"{bid}.ok"] = a.ok[:, j] & operating_ok[:, j] & valid
        cols[f"{bid}.Fr_max_N"] = a.Fr_max_N[:, j]
        cols[f"{bid}.Fa_max_N"] = a.Fa_max_N[:, j]
        cols[f"{bid}.deflection_mm"] = a.deflection_mm[:, j]
        cols[f"{bid}.slope_rad"] = a.slope_rad[:, j]
    for j, eid in enumerate(elements):
        cols[f"{eid}.deflection_mm"] = a.el_deflection_mm[:, j]
        cols[f"{eid}.slope_rad"] = a.el_slope_rad[:, j]
    for k, seat in enumerate(study.model.open_seats):
        names = np.array([*seat.catalogue.designation, ""], dtype=object)
        cols[f"{seat.bearing_id}.choice"] = names[a.choice[:, k]].astype(str)
        cols[f"{seat.bearing_id}.D_mm"] = np.where(
            a.choice[:, k] >= 0, seat.catalogue.D_mm[np.maximum(a.choice[:, k], 0)], np.nan)
    if study.model.open_seats:
        cols["chosen_mass_kg"] = a.chosen_mass_kg
        cols["chosen_price"] = a.chosen_price
    cols["system_life_h"] = a.system_life_h
    cols["limiting_bearing"] = np.array([*bearings, ""], dtype=str)[a.limiting]
    if bearings:
        margins = np.where(np.isnan(a.margin), np.inf, a.margin)
        worst = np.argmin(margins, axis=1)
        cols["worst_margin"] = np.where(valid, a.margin[np.arange(B), worst], np.nan)
        cols["worst_support"] = np.where(valid, np.array(bearings, dtype=object)[worst],
                                         "").astype(str)
    gi = [elements.index(g) for g in gears]
    cols["max_deflection_gears_mm"] = _rowmax(a.el_deflection_mm[:, gi])
    cols["max_slope_gears_rad"] = _rowmax(a.el_slope_rad[:, gi])
    cols["max_deflection_bearings_mm"] = _rowmax(a.deflection_mm)
    cols["max_slope_bearings_rad"] = _rowmax(a.slope_rad)
    ratio = np.zeros(B)
    for li in study.limits:
        v = limit_values(li, bearings, elements, gears, a)
        ratio = np.maximum(ratio, v / li.max_value)
    cols["limits_ok"] = valid & (ratio <= 1.0)
    cols["worst_limit_ratio"] = np.where(valid, ratio, np.nan)
    thermal_ok = np.ones(B, dtype=bool)
    if study.model.thermal is not None:
        th = a.thermal if a.thermal is not None else VariantThermal.empty(B, len(bearings))
        for j, bid in enumerate(bearings):
            cols[f"{bid}.temperature_max_C"] = th.temperature_max_C[:, j]
            cols[f"{bid}.power_loss_W"] = th.power_loss_W[:, j]
            cols[f"{bid}.power_loss_max_W"] = th.power_loss_max_W[:, j]
        cols["temperature_max_C"] = th.variant_temperature_max_C
        cols["computed_temperature_max_C"] = th.computed_temperature_max_C
        cols["power_loss_W"] = th.total_power_loss_W
        cols["power_loss_max_W"] = th.total_power_loss_max_W
        cols["heat_balance_speed_factor_min"] = th.speed_factor_min
        cols["thermal_runaway"] = valid & th.runaway
        thermal_ok = valid & th.ok
        cols["thermal_ok"] = thermal_ok
        cols["thermal_reason"] = np.where(valid, th.reason, "").astype(str)
    cols["ok"] = (valid & np.all(a.ok & operating_ok, axis=1) & (ratio <= 1.0)
                  & thermal_ok)
    return pd.DataFrame(cols)


def _operating_ok(model: Model, bearings: Sequence[str], a: BatchArrays
                  ) -> NDArray[np.bool_]:
    """(B, n_bearings): the limiting-speed and minimum-load checks pass where the model's
    ``checks:`` section makes them required (as ``analysis.life.operating_checks``: speed
    passes at n/n_lim <= 1, load at P/(f C) >= 1; a ratio that is NaN, no limiting speed
    or no running case, is not judged).
    """
    out = np.ones(a.ok.shape, dtype=bool)
    if a.speed_ratio.shape != a.ok.shape:
        return out
    for j, bid in enumerate(bearings):
        if model.checks.mode("speed", bid) == "required":
            r = a.speed_ratio[:, j]
            out[:, j] &= ~(r > 1.0)
        if model.checks.mode("min_load", bid) == "required":
            r = a.min_load_ratio[:, j]
            out[:, j] &= ~(r < 1.0)
    return out


def _rowmax(x: NDArray[np.float64]) -> NDArray[np.float64]:
    if x.shape[1] == 0:
        return np.full(x.shape[0], np.nan)
    with np.errstate(invalid="ignore"):
        return np.asarray(np.max(x, axis=1), dtype=float)


def limit_values(li: Limit, bearings: list[str], elements: list[str], gears: list[str],
                 a: BatchArrays) -> NDArray[np.float64]:
    """Largest value (over the locations of ``li``) of its quantity, per variant."""
    attr = LIMIT_KINDS[li.kind]
    parts: list[NDArray[np.float64]] = []
    for name in li.at:
        if name == "gears":
            idx = [elements.index(g) for g in gears]
            parts.append(getattr(a, "el_" + attr)[:, idx])
        elif name == "elements":
            parts.append(getattr(a, "el_" + attr))
        elif name == "bearings":
            parts.append(getattr(a, attr))
        elif name in bearings:
            parts.append(getattr(a, attr)[:, [bearings.index(name)]])
        elif name in elements:
            parts.append(getattr(a, "el_" + attr)[:, [elements.index(name)]])
        else:
            raise ModelError(f"limit location '{name}' is no bearing, element or group",
                             field=f"study.limits.{li.kind}.at",
                             expected=f"one of {[*bearings, *elements, *LIMIT_GROUPS]}")
    allv = np.concatenate(parts, axis=1) if parts else np.zeros((a.reason.size, 0))
    return _rowmax(allv) if allv.shape[1] else np.zeros(a.reason.size)


def sweep(study: Study, *, block: int = 8192, batched: bool | None = None) -> pd.DataFrame:
    """Evaluate every variant in this process; one DataFrame in variant order."""
    import pandas as pd

    frames = [evaluate_block(study, lo, min(lo + block, study.n_variants), batched=batched)
              for lo in range(0, study.n_variants, block)]
    return pd.concat(frames, ignore_index=True)


# ----------------------------------------------------------------------------- output
def frame_records(df: pd.DataFrame) -> list[dict[str, Any]]:
    """JSON-ready records (inf -> "inf", nan -> null)."""
    from shaftsys.io.output import json_ready

    return [json_ready(r) for r in df.to_dict(orient="records")]


def write_results(df: pd.DataFrame, out_dir: str | Path, stem: str = "results"
                  ) -> dict[str, Path]:
    """Write ``df`` as CSV, JSON (array of records) and Parquet, each atomically."""
    import pyarrow as pa
    import pyarrow.parquet as pq

    from shaftsys.io.output import atomic_write

    out = Path(out_dir)
    paths = {"csv": out / f"{stem}.csv", "json": out / f"{stem}.json",
             "parquet": out / f"{stem}.parquet"}
    csv = df.to_csv(index=False).encode()
    text = json.dumps(frame_records(df), allow_nan=False).encode()
    table = pa.Table.from_pandas(df, preserve_index=False)

    def put(data: bytes) -> Callable[[BinaryIO], None]:
        def write(fh: BinaryIO) -> None:
            fh.write(data)
        return write

    atomic_write(paths["csv"], put(csv))
    atomic_write(paths["json"], put(text))
    atomic_write(paths["parquet"], lambda fh: pq.write_table(table, fh))
    return paths


def study_summary(study: Study, df: pd.DataFrame) -> dict[str, Any]:
    """Headline figures: counts, best variant by worst margin among the passing ones;
    with a heat balance also ``thermal_failing`` and ``thermal_runaway`` (valid variants
    whose thermal check fails, and those of them without a steady temperature).
    """
    valid = df[df["valid"]]
    passing = valid[valid["ok"]]
    best = passing if len(passing) else valid
    row = None
    if len(best):
        wm = best["worst_margin"].to_numpy(dtype=float)
        row = best.iloc[int(np.nanargmax(wm))] if np.any(~np.isnan(wm)) else best.iloc[0]
    return {
        "variants": int(study.n_variants),
        "valid": len(valid),
        "invalid": int(study.n_variants - len(valid)),
        "passing": len(passing),
        "best_variant": None if row is None else str(row["variant"]),
        "best_values": None if row is None else {q.path: float(row[q.path])
                                                 for q in study.quantities},
        "best_worst_margin": None if row is None else float(row["worst_margin"]),
        **({"thermal_failing": int((~valid["thermal_ok"].astype(bool)).sum()),
            "thermal_runaway": int(valid["thermal_runaway"].astype(bool).sum())}
           if "thermal_ok" in df.columns else {}),
    }
