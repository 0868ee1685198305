"""Result types of an analysis: complete values, built once by the pipeline.

Units as :mod:`shaftsys.units` (N, mm, N*mm, rpm, h); keys and attributes name them.
Nothing here computes: the pipeline (:mod:`shaftsys.analysis.pipeline`) fills them.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import TYPE_CHECKING, Any

import numpy as np
from numpy.typing import NDArray

from shaftsys.analysis.check_results import (
    FAIL,
    MARGINAL,
    NOT_EVALUATED,
    PASS,
    ShaftChecks,
)
from shaftsys.analysis.selection_results import Selection
from shaftsys.model import Bearing, Model, Shaft

if TYPE_CHECKING:
    import pandas as pd

    from shaftsys.analysis.thermal_results import ThermalResult
    from shaftsys.bearings.engine import BearingLife
    from shaftsys.machine.flow import CaseFlow

#: Version of the JSON result contract (keys are added, never renamed or dropped).
SCHEMA_VERSION = "1.1"


@dataclass(frozen=True)
class AppliedLoad:
    """A load applied at a station in one case (shaft frame, N and N*mm).

    ``element`` is the id of the element that applies it (its node carries the load), or
    ``None`` for loads placed by station only.
    """

    source: str
    x_mm: float
    force_N: tuple[float, float, float]
    moment_Nmm: tuple[float, float, float]
    element: str | None = None
    #: the element's weight (not its working load)
    weight: bool = False
    #: the force model's diagnostics (keys end in their unit: ``W_t_N``, ``T_tight_N``)
    details: tuple[tuple[str, float], ...] = ()
    #: mesh or strand direction on the shaft [deg] when it differs from the element's own
    #: (a linked element of a machine), else None
    angle_deg: float | None = None


@dataclass(frozen=True)
class BearingCaseLoad:
    """The load the shaft puts on one bearing in one case.

    ``Fy_N, Fz_N, Fx_N``: components in the shaft frame of the force the shaft puts on
    the bearing [N]; ``Fr_N``: resultant radial load; ``Fa_N``: |axial load| the bearing
    carries, induced forces of adjusted pairs included [N]; ``Mt_Nmm``: tilting moment
    taken by a bearing with tilt stiffness [N*mm].
    """

    case: str
    Fy_N: float
    Fz_N: float
    Fx_N: float
    Fr_N: float
    Fa_N: float
    speed_rpm: float
    induced_N: float = 0.0
    My_Nmm: float = 0.0
    Mz_Nmm: float = 0.0
    deflection_mm: float = 0.0
    slope_rad: float = 0.0
    theta_y_rad: float = 0.0
    theta_z_rad: float = 0.0


@dataclass(frozen=True, eq=False)
class CaseSolution:
    """Everything along one shaft in one case.

    Arrays along the shaft are given at ``stations_mm`` (each element's two ends, so a
    point load shows as a jump): ``N_N`` axial force (tension +), ``Vy_N``, ``Vz_N``
    shear, ``T_Nmm`` torque, ``My_Nmm``, ``Mz_Nmm`` bending moment, each the action of
    the part right of the cut on the part left of it; ``M_Nmm`` resultant bending
    moment. ``displacement`` is (n_nodes, 6): ux, uy, uz [mm], rx, ry, rz [rad].
    """

    case: str
    speed_rpm: float
    torque_Nmm: float
    node_x_mm: NDArray[np.float64]
    displacement: NDArray[np.float64]
    stations_mm: NDArray[np.float64]
    N_N: NDArray[np.float64]
    Vy_N: NDArray[np.float64]
    Vz_N: NDArray[np.float64]
    T_Nmm: NDArray[np.float64]
    My_Nmm: NDArray[np.float64]
    Mz_Nmm: NDArray[np.float64]
    applied: tuple[AppliedLoad, ...]
    force_residual_N: float
    moment_residual_Nmm: float
    residual_relative: float
    nodal_residual_relative: float
    warnings: tuple[str, ...] = ()

    @property
    def M_Nmm(self) -> NDArray[np.float64]:
        """Resultant bending moment [N*mm] at ``stations_mm``."""
        return np.hypot(self.My_Nmm, self.Mz_Nmm)

    @property
    def deflection_mm(self) -> NDArray[np.float64]:
        """Radial deflection [mm] at the nodes."""
        return np.hypot(self.displacement[:, 1], self.displacement[:, 2])

    @property
    def slope_rad(self) -> NDArray[np.float64]:
        """Resultant slope [rad] at the nodes."""
        return np.hypot(self.displacement[:, 4], self.displacement[:, 5])

    @property
    def max_deflection_mm(self) -> float:
        """Largest radial deflection along the shaft [mm]."""
        return float(self.deflection_mm.max())


@dataclass(frozen=True, eq=False)
class ShaftResult:
    """Results of one shaft in every case.

    ``system_life_h``: life [h] of the shaft's bearings together at the target
    reliability (``math.inf`` when none of them wears, ``None`` when lives were not
    evaluated); ``limiting_bearing`` the one that limits it.
    """

    shaft: Shaft
    cases: tuple[CaseSolution, ...]
    condition_estimate: float
    system_life_h: float | None = None
    limiting_bearing: str | None = None
    system: SystemLife | None = None
    #: how the nonlinear bearing solve went (``analysis.nonlinear.NonlinearInfo``), or
    #: None when the shaft's supports were taken as typed
    nonlinear: Any = None

    def with_system_life(self, life_h: float | None, limiting: str | None,
                         system: SystemLife | None = None) -> ShaftResult:
        """The same shaft result with its bearings' system life [h] (built by the
        pipeline before the :class:`Result`).
        """
        return replace(self, system_life_h=life_h, limiting_bearing=limiting,
                       system=system)

    def case(self, case_id: str) -> CaseSolution:
        """The solution of one case."""
        for c in self.cases:
            if c.case == case_id:
                return c
        raise KeyError(case_id)


#: The operating checks of a bearing (names in the JSON ``check`` key).
LIMITING_SPEED = "limiting_speed"
MINIMUM_LOAD = "minimum_load"


@dataclass(frozen=True)
class OperatingCheck:
    """The limiting-speed or minimum-load check of one bearing over its running cases.

    Attributes
    ----------
    check: :data:`LIMITING_SPEED` or :data:`MINIMUM_LOAD`.
    value: largest running |n| [rpm], or smallest running equivalent load P [N].
    limit: the bearing's limiting speed [rpm], or the minimum load f*C [N] (f = 0.01
        ball, 0.02 roller; common practice, no source); ``None`` when unknown.
    ratio: value/limit (speed: passes at <= 1) or value/limit (load: passes at >= 1).
    case: the case of ``value``, or ``None``.
    mode: ``required`` (decides the support's verdict) or ``advisory``.
    reason: why the check was not evaluated (no limiting speed, no running case), or
        ``None``.
    """

    check: str
    value: float | None
    limit: float | None
    ratio: float | None
    case: str | None
    mode: str
    reason: str | None = None

    @property
    def verdict(self) -> str:
        """``pass``, ``fail`` or ``not evaluated`` (see :attr:`reason`)."""
        if self.reason is not None or self.ratio is None:
            return NOT_EVALUATED
        passed = self.ratio <= 1.0 if self.check == LIMITING_SPEED else self.ratio >= 1.0
        return PASS if passed else FAIL

    @property
    def counts(self) -> bool:
        """The check decides the support's verdict: required and evaluated (a bearing
        without a limiting speed, or without a running case, is not judged by it).
        """
        return self.mode == "required" and self.reason is None

    @property
    def unit(self) -> str:
        """Unit of ``value`` and ``limit``."""
        return "rpm" if self.check == LIMITING_SPEED else "N"

    def to_dict(self) -> dict[str, Any]:
        """JSON-ready values (units in the keys)."""
        u = self.unit
        return {"check": self.check, "case": self.case, f"value_{u}": self.value,
                f"limit_{u}": self.limit, "ratio": self.ratio, "mode": self.mode,
                "counts": self.counts, "reason": self.reason,
                "ok": self.verdict == PASS, "verdict": self.verdict}


@dataclass(frozen=True, eq=False)
class BearingResult:
    """One support: its loads in every case, its life verdict and its operating checks
    (limiting speed, minimum load).
    """

    shaft_id: str
    bearing: Bearing
    loads: tuple[BearingCaseLoad, ...]
    life: BearingLife | None = None
    operating: tuple[OperatingCheck, ...] = ()
    #: rows and converged ring displacement of a bearing in the nonlinear shaft solve
    #: (``analysis.nonlinear.InteriorState``), else None
    interior_state: Any = None

    @property
    def verdict(self) -> str:
        """``"pass"``, ``"fail"`` (life, static safety, or a required operating check
        failed) or ``"not evaluated"`` (no life was computed).
        """
        if self.life is None:
            return NOT_EVALUATED
        if not self.life.ok:
            return FAIL
        return FAIL if any(c.counts and c.verdict == FAIL for c in self.operating) else PASS

    @property
    def ok(self) -> bool:
        """The support was evaluated and meets its targets (life, static safety and the
        required operating checks).
        """
        return self.verdict == PASS

    def operating_check(self, check: str) -> OperatingCheck | None:
        """The operating check named ``check``, or ``None``."""
        return next((c for c in self.operating if c.check == check), None)


@dataclass(frozen=True)
class SystemLife:
    """The system life of a group of bearings (a shaft's, or the machine's).

    Attributes
    ----------
    life_target_reliability_h: at the model's target reliability [h] (``inf`` when no
        bearing wears, ``None`` when a bearing was not evaluated).
    life_90_h: at 90 % reliability [h].
    target_reliability: the model's target reliability [-].
    stated_at: ``target`` or ``90_percent``: which of the two the verdict uses.
    target_h: the target [h], or ``None`` (then information, no verdict).
    limiting_bearing: the bearing with the largest share of the failure probability.
    weibull_slope_ball, weibull_slope_roller: the slopes used [-].
    """

    life_target_reliability_h: float | None
    life_90_h: float | None
    target_reliability: float
    stated_at: str
    target_h: float | None
    limiting_bearing: str | None
    weibull_slope_ball: float
    weibull_slope_roller: float

    @property
    def life_h(self) -> float | None:
        """The life the verdict compares with the target [h]."""
        return self.life_90_h if self.stated_at == "90_percent" \
            else self.life_target_reliability_h

    @property
    def reliability(self) -> float:
        """The reliability at which :attr:`life_h` is stated [-]."""
        return 0.9 if self.stated_at == "90_percent" else self.target_reliability

    @property
    def verdict(self) -> str | None:
        """``pass``/``fail`` against the target, ``not evaluated`` when a bearing was
        not, ``None`` when no target is set (information only).
        """
        if self.target_h is None:
            return None
        if self.life_h is None:
            return NOT_EVALUATED
        return PASS if self.life_h >= self.target_h else FAIL

    def to_dict(self) -> dict[str, Any]:
        """The keys added to a JSON ``system`` entry (units in the keys)."""
        out: dict[str, Any] = {
            "life_target_reliability_h": self.life_target_reliability_h,
            "life_90_percent_h": self.life_90_h,
            "target_reliability": self.target_reliability,
            "stated_at": self.stated_at,
            "stated_reliability": self.reliability,
            "verdict_life_h": self.life_h,
            "target_h": self.target_h,
            "weibull_slope_ball": self.weibull_slope_ball,
            "weibull_slope_roller": self.weibull_slope_roller,
        }
        if self.verdict is not None:
            out["ok"] = self.verdict == PASS
            out["verdict"] = self.verdict
        return out


@dataclass(frozen=True, eq=False)
class Result:
    """Complete results of a model (nothing is written back onto the model)."""

    model: Model
    shafts: tuple[ShaftResult, ...]
    bearings: tuple[BearingResult, ...]
    system_life_h: float | None
    limiting_bearing: str | None
    warnings: tuple[str, ...]
    checks: ShaftChecks | None
    flows: tuple[CaseFlow, ...]
    selection: Selection | None = None
    thermal: ThermalResult | None = None
    internal: dict[str, dict[str, Any]] | None = None
    #: the reduction of the model's recording (``recording:``) that made its duty cases,
    #: an ``analysis.duty.DutyReduction`` (typed Any: that module builds on this one)
    duty_reduction: Any = None
    system: SystemLife | None = None

    def system_lives(self) -> list[tuple[str, SystemLife]]:
        """(label, system life) of every shaft and of the machine that has one."""
        out = [(f"shaft '{s.shaft.id}'", s.system) for s in self.shafts
               if s.system is not None]
        if self.system is not None:
            out.append(("the machine", self.system))
        return out

    @property
    def verdict(self) -> str:
        """``"pass"`` only when every bearing and every shaft check was evaluated and
        passed; ``"fail"`` when one was evaluated and failed; else ``"not evaluated"``.
        The heat balance's checks (when the model has heat-balance data) and the system
        lives that have a target count too.
        """
        parts = [b.verdict for b in self.bearings]
        parts += [v for _, sl in self.system_lives() if (v := sl.verdict) is not None]
        if self.thermal is not None:
            parts.append(self.thermal.verdict)
        parts.append(NOT_EVALUATED if self.checks is None else
                     PASS if self.checks.verdict == MARGINAL else self.checks.verdict)
        if FAIL in parts:
            return FAIL
        return NOT_EVALUATED if NOT_EVALUATED in parts else PASS

    @property
    def ok(self) -> bool:
        """Every check was evaluated and passes (bearings and shaft checks)."""
        return self.verdict == PASS

    @property
    def failed_checks(self) -> tuple[str, ...]:
        """The checks that were evaluated and fail, for the headline verdict: bearing
        life, bearing static safety, the heat balance and every failing shaft check.
        Empty exactly when no row of the verdict tables shows a failure.
        """
        out: list[str] = []
        for b in self.bearings:
            if b.life is None:
                continue
            if not b.life.life_ok:
                out.append(f"life of bearing '{b.bearing.id}'")
            if not b.life.static_ok:
                out.append(f"static safety of bearing '{b.bearing.id}'")
            for c in b.operating:
                if c.counts and c.verdict == FAIL:
                    out.append(f"{c.check.replace('_', ' ')} of bearing '{b.bearing.id}'")
        for label, sl in self.system_lives():
            if sl.verdict == FAIL:
                out.append(f"system life of {label}")
        if self.thermal is not None and self.thermal.verdict == FAIL:
            out.append("heat balance (operating temperature)")
        if self.checks is not None:
            out.extend(self.checks.failed)
        return tuple(out)

    @property
    def not_evaluated(self) -> tuple[str, ...]:
        """What was not evaluated (bearing ids, ``"shaft checks"``), for messages."""
        still_open = {o.bearing_id for o in self.model.open_seats}
        out = [f"bearing '{b.bearing.id}' life" + (" (no catalogue bearing qualifies)"
                                                   if b.bearing.id in still_open else "")
               for b in self.bearings if b.life is None]
        if self.checks is None:
            out.append("shaft checks")
        else:
            out.extend(self.checks.not_evaluated)
        out += [f"system life of {label} (a bearing of it was not evaluated)"
                for label, sl in self.system_lives() if sl.verdict == NOT_EVALUATED]
        return tuple(out)

    @property
    def advisory_failed(self) -> tuple[str, ...]:
        """Advisory checks that fail (shown with their numbers, not deciding the run)."""
        return tuple(f"{c.check.replace('_', ' ')} of bearing '{b.bearing.id}' (advisory)"
                     for b in self.bearings for c in b.operating
                     if c.mode == "advisory" and c.verdict == FAIL)

    def bearing(self, bearing_id: str) -> BearingResult:
        """The result of one bearing."""
        for b in self.bearings:
            if b.bearing.id == bearing_id:
                return b
        raise KeyError(bearing_id)

    def shaft(self, shaft_id: str) -> ShaftResult:
        """The result of one shaft."""
        for s in self.shafts:
            if s.shaft.id == shaft_id:
                return s
        raise KeyError(shaft_id)

    def loads_frame(self) -> pd.DataFrame:
        """Bearing loads as a pandas DataFrame, one row per bearing and case."""
        import pandas as pd

        rows = []
        for b in self.bearings:
            for ld in b.loads:
                rows.append({"bearing": b.bearing.id, "shaft": b.shaft_id,
                             "x_mm": b.bearing.support_x_mm, **ld.__dict__})
        return pd.DataFrame(rows)

    def life_frame(self) -> pd.DataFrame:
        """Bearing life verdicts as a pandas DataFrame, one row per bearing."""
        import pandas as pd

        rows = []
        for b in self.bearings:
            row: dict[str, Any] = {"bearing": b.bearing.id, "shaft": b.shaft_id,
                                   "type": b.bearing.kind.value}
            if b.life is not None:
                row.update(b.life.to_dict())
            rows.append(row)
        return pd.DataFrame(rows)
