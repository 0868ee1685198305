"""Result of the heat balance: friction, power loss and temperature per bearing and case.

Filled by :func:`shaftsys.analysis.thermal.evaluate_thermal`; units in the names (N*mm,
W, degC, rpm).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import numpy as np

from shaftsys.analysis.check_results import FAIL, PASS
from shaftsys.bearings._util import FloatArray

TYPED = "typed"
COMPUTED = "computed"
NOT_COMPUTED = "not computed"


@dataclass(frozen=True, eq=False)
class ThermalResult:
    """Friction, power loss and temperature of every bearing and duty case.

    Per (bearing, case), shape (B, m): ``M0_Nmm``, ``M1_Nmm``, ``friction_moment_Nmm``,
    ``power_loss_W`` (at the temperature used), ``heat_balance_speed_rpm``.
    Per case, shape (m,): ``computed_C`` (the balance, NaN where runaway or not a duty
    case), ``typed_C`` (NaN = not typed), ``used_C``, ``source`` (``typed``,
    ``computed``, ``not computed``), ``converged``, ``runaway``, ``iterations``,
    ``residual_W``, ``total_power_W`` (bearings + extra loss), ``temperature_ok``,
    ``speed_ok``, ``speed_factor`` (the factor s on the case's speeds of the
    heat-balance speed; >= 1 passes). ``shaft_power_W``: shaft id -> (m,) bearing power.
    """

    bearing_ids: tuple[str, ...]
    shaft_ids: tuple[str, ...]
    case_ids: tuple[str, ...]
    f0: FloatArray
    f1_given: tuple[bool, ...]
    f0_given: tuple[bool, ...]
    M0_Nmm: FloatArray
    M1_Nmm: FloatArray
    friction_moment_Nmm: FloatArray
    power_loss_W: FloatArray
    heat_balance_speed_rpm: FloatArray
    computed_C: FloatArray
    typed_C: FloatArray
    used_C: FloatArray
    source: tuple[str, ...]
    converged: np.ndarray
    runaway: np.ndarray
    iterations: FloatArray
    residual_W: FloatArray
    total_power_W: FloatArray
    extra_loss_W: float
    max_temperature_C: float
    reference_C: float
    search_limit_C: float
    temperature_ok: np.ndarray
    speed_ok: np.ndarray
    evaluated: np.ndarray
    speed_factor: FloatArray = field(default_factory=lambda: np.zeros(0))

    @property
    def verdict(self) -> str:
        """``pass`` when every evaluated case balances, stays at or below the maximum
        temperature and below the heat-balance speed; else ``fail``.
        """
        ok = bool(np.all(self.temperature_ok[self.evaluated])
                  and np.all(self.speed_ok[self.evaluated])
                  and not np.any(self.runaway))
        return PASS if ok else FAIL

    @property
    def any_runaway(self) -> bool:
        """Some case has no steady temperature below the search limit."""
        return bool(np.any(self.runaway))

    def life_temperatures(self) -> dict[str, float]:
        """Case id -> temperature [degC] the life engine uses (typed wins)."""
        return {c: float(t) for c, t in zip(self.case_ids, self.used_C, strict=True)}

    def shaft_power_W(self) -> dict[str, FloatArray]:
        """Shaft id -> bearing friction power per case [W]."""
        out: dict[str, FloatArray] = {}
        for sid in dict.fromkeys(self.shaft_ids):
            rows = np.array([s == sid for s in self.shaft_ids])
            out[sid] = np.nansum(self.power_loss_W[rows], axis=0)
        return out

    def bearing_cases(self, bearing_id: str) -> list[dict[str, Any]]:
        """The JSON entries of one bearing, one per case."""
        i = self.bearing_ids.index(bearing_id)
        out = []
        for k, cid in enumerate(self.case_ids):
            out.append({
                "case": cid,
                "friction_moment_Nmm": float(self.friction_moment_Nmm[i, k]),
                "friction_moment_load_independent_Nmm": float(self.M0_Nmm[i, k]),
                "friction_moment_load_dependent_Nmm": float(self.M1_Nmm[i, k]),
                "power_loss_W": float(self.power_loss_W[i, k]),
                "temperature_C": float(self.used_C[k]),
                "temperature_source": self.source[k],
                "computed_temperature_C": float(self.computed_C[k]),
                "heat_balance_speed_rpm": float(self.heat_balance_speed_rpm[i, k]),
            })
        return out

    def to_dict(self) -> dict[str, Any]:
        """The machine's heat balance per case (JSON-ready)."""
        shaft_power = self.shaft_power_W()
        cases = []
        for k, cid in enumerate(self.case_ids):
            cases.append({
                "case": cid, "evaluated": bool(self.evaluated[k]),
                "temperature_C": float(self.used_C[k]),
                "temperature_source": self.source[k],
                "computed_temperature_C": float(self.computed_C[k]),
                "typed_temperature_C": float(self.typed_C[k]),
                "converged": bool(self.converged[k]), "runaway": bool(self.runaway[k]),
                "iterations": int(self.iterations[k]),
                "residual_W": float(self.residual_W[k]),
                "bearing_power_loss_W": float(np.nansum(self.power_loss_W[:, k])),
                "extra_loss_W": self.extra_loss_W,
                "total_power_loss_W": float(self.total_power_W[k]),
                "shaft_power_loss_W": {s: float(v[k]) for s, v in shaft_power.items()},
                "temperature_ok": bool(self.temperature_ok[k]),
                "speed_ok": bool(self.speed_ok[k]),
            })
        return {"verdict": self.verdict, "max_temperature_C": self.max_temperature_C,
                "reference_temperature_C": self.reference_C,
                "search_limit_C": self.search_limit_C,
                "method": "Palmgren friction M = M0 + M1 (f0, f1 tabulated per type unless "
                          "given); one housing, steady heat balance with Walther "
                          "viscosity",
                "cases": cases}
