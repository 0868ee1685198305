"""Result types of the shaft checks (settings, slopes and deflections, critical speeds,
fatigue sections). Units: mm, rad, rpm, MPa, N*mm.

They are values: :func:`shaftsys.analysis.shaft_checks.check_shafts` builds them, the
report and the JSON writer read them.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, field
from typing import Any

from shaftsys.checks import SPUR_GEAR_SLOPE_LIMIT_RAD, FatigueCriterion
from shaftsys.checks.fatigue import FatigueCheck

#: Gear deflection limit when no module is known [mm] (common practice, no source).
DEFAULT_GEAR_DEFLECTION_LIMIT_MM = 0.13
#: Critical speed margin (common practice, no source).
DEFAULT_CRITICAL_SPEED_MARGIN = 1.25
#: Required safety factors (common practice, no source).
DEFAULT_REQUIRED_FATIGUE_SAFETY = 1.5
DEFAULT_REQUIRED_YIELD_SAFETY = 1.2
_FATIGUE_CASES = ("duty_and_peak", "duty")
#: Verdict words of every check. ``marginal``: within its limit but in the caution band
#: (counts as passed); ``not evaluated``: could not be computed (the reason is given);
#: it fails the run when the check is required.
PASS = "pass"
FAIL = "fail"
MARGINAL = "marginal"
NOT_EVALUATED = "not evaluated"


def combine_verdicts(verdicts: list[str]) -> str:
    """One verdict of several checks: fail > not evaluated > marginal > pass."""
    for word in (FAIL, NOT_EVALUATED, MARGINAL):
        if word in verdicts:
            return word
    return PASS

# ----------------------------------------------------------------------------- settings
@dataclass(frozen=True)
class ShaftCheckSettings:
    """Options of :func:`check_shafts`.

    Attributes
    ----------
    bearing_slope_limits_rad: bearing id -> allowable slope [rad], replacing the
        common-practice range of its type.
    gear_slope_limit_rad: allowable slope at a gear [rad] (Shigley Table 7-2, uncrowned
        spur gears, from memory).
    default_gear_deflection_limit_mm: allowable gear deflection when no module is given
        [mm] (common practice, no source).
    critical_speed_margin: first critical >= margin x max speed (or <= max speed / margin)
        [-] (common practice, no source).
    criterion: ``"goodman"`` (DE-Goodman) or ``"asme_elliptic"`` (DE-ASME elliptic).
    fluctuation_rule: ``"reversal"`` or ``"range"`` (see ``classify_section_loads``).
    fatigue_cases: ``"duty"`` (default: peak and static cases feed the strength (yield)
        check only, as the model file defines them) or ``"duty_and_peak"`` (an envelope).
    required_fatigue_safety, required_yield_safety: required safety factors [-]
        (common practice, no source).
    rotary_inertia: include the shaft's distributed rotary inertia rho*I in the bending modes.
    max_element_mm: element length for the modal mesh [mm] (``None`` = the model's solver
        setting).
    bearing_type_slope_limits_rad: bearing type value -> allowable slope [rad] (below a
        per-bearing limit, above the type's common-practice range).
    gear_slope_limits_rad: gear id -> allowable slope [rad] (replaces
        ``gear_slope_limit_rad`` at that gear).
    gear_deflection_limit_mm: allowable deflection at every gear [mm] (``None`` = the
        rule: per module, or Shigley's table).
    gear_deflection_per_module: allowable deflection = this x the normal module [-]
        (``None`` = Shigley's table by the diametral pitch).
    gear_deflection_limits_mm: gear id -> allowable deflection [mm].
    gear_deflection_per_module_by_gear: gear id -> fraction of the module [-].
    gear_slope_from_model: ``gear_slope_limit_rad`` was set in the model file
        (``checks.gear_slope``; names the rule in the output).
    """

    bearing_slope_limits_rad: Mapping[str, float] = field(default_factory=dict)
    gear_slope_limit_rad: float = SPUR_GEAR_SLOPE_LIMIT_RAD
    default_gear_deflection_limit_mm: float = DEFAULT_GEAR_DEFLECTION_LIMIT_MM
    critical_speed_margin: float = DEFAULT_CRITICAL_SPEED_MARGIN
    criterion: str = "goodman"
    fluctuation_rule: str = "reversal"
    fatigue_cases: str = "duty"
    required_fatigue_safety: float = DEFAULT_REQUIRED_FATIGUE_SAFETY
    required_yield_safety: float = DEFAULT_REQUIRED_YIELD_SAFETY
    rotary_inertia: bool = False
    max_element_mm: float | None = None
    bearing_type_slope_limits_rad: Mapping[str, float] = field(default_factory=dict)
    gear_slope_limits_rad: Mapping[str, float] = field(default_factory=dict)
    gear_deflection_limit_mm: float | None = None
    gear_deflection_per_module: float | None = None
    gear_deflection_limits_mm: Mapping[str, float] = field(default_factory=dict)
    gear_deflection_per_module_by_gear: Mapping[str, float] = field(default_factory=dict)
    gear_slope_from_model: bool = False

    def __post_init__(self) -> None:
        if self.criterion not in tuple(c.value for c in FatigueCriterion):
            raise ValueError(f"unknown fatigue criterion {self.criterion!r}; expected one "
                             f"of {[c.value for c in FatigueCriterion]}")
        if self.fatigue_cases not in _FATIGUE_CASES:
            raise ValueError(f"unknown fatigue_cases {self.fatigue_cases!r}; "
                             f"expected one of {_FATIGUE_CASES}")
        if not self.critical_speed_margin >= 1.0:
            raise ValueError(f"critical_speed_margin = {self.critical_speed_margin!r}; "
                             "expected >= 1")
        for name in ("gear_slope_limit_rad", "default_gear_deflection_limit_mm",
                     "required_fatigue_safety", "required_yield_safety"):
            v = getattr(self, name)
            if not (math.isfinite(v) and v > 0.0):
                raise ValueError(f"{name} = {v!r}; expected a positive number")
        for name in ("bearing_slope_limits_rad", "bearing_type_slope_limits_rad",
                     "gear_slope_limits_rad", "gear_deflection_limits_mm",
                     "gear_deflection_per_module_by_gear"):
            for key, v in getattr(self, name).items():
                if not (math.isfinite(v) and v > 0.0):
                    raise ValueError(f"{name}[{key!r}] = {v!r}; expected a positive number")
        for name in ("gear_deflection_limit_mm", "gear_deflection_per_module"):
            v = getattr(self, name)
            if v is not None and not (math.isfinite(v) and v > 0.0):
                raise ValueError(f"{name} = {v!r}; expected a positive number")


# ----------------------------------------------------------------------------- results
@dataclass(frozen=True)
class CaseDeflection:
    """Deflection [mm] and slope [rad] at one station in one case: the resultants and,
    per plane, v = uy, w = uz [mm] and dv/dx = rz, dw/dx = -ry [rad] (NaN: not given).
    """

    case: str
    deflection_mm: float
    slope_rad: float
    status: str
    deflection_y_mm: float = math.nan
    deflection_z_mm: float = math.nan
    slope_xy_rad: float = math.nan
    slope_xz_rad: float = math.nan

    def to_dict(self) -> dict[str, Any]:
        """JSON-ready values."""
        return {"case": self.case, "deflection_mm": self.deflection_mm,
                "slope_rad": self.slope_rad, "status": self.status,
                "deflection_y_mm": _finite(self.deflection_y_mm),
                "deflection_z_mm": _finite(self.deflection_z_mm),
                "slope_xy_rad": _finite(self.slope_xy_rad),
                "slope_xz_rad": _finite(self.slope_xz_rad)}


@dataclass(frozen=True)
class DeflectionCheck:
    """Slope (and for gears deflection) check of one bearing or gear.

    Attributes
    ----------
    id: bearing or element id.
    shaft: shaft id.
    kind: ``"bearing"`` or ``"gear"``.
    x_mm: station [mm].
    slope_limit_rad: allowable slope [rad] (the high end of a typical range).
    slope_limit_low_rad: low end of the typical range [rad] (= the limit when overridden).
    deflection_limit_mm: allowable deflection [mm] (gears) or ``None``.
    source: where the limits come from.
    cases: per-case deflection and slope.
    ok: no case exceeds a limit.
    slope_rule: which rule gave the slope limit (the model file's key or the default).
    deflection_rule: which rule gave the deflection limit (gears), else ``None``.
    """

    id: str
    shaft: str
    kind: str
    x_mm: float
    slope_limit_rad: float
    slope_limit_low_rad: float
    deflection_limit_mm: float | None
    source: str
    cases: tuple[CaseDeflection, ...]
    ok: bool
    slope_rule: str = ""
    deflection_rule: str | None = None

    @property
    def verdict(self) -> str:
        """``fail`` (a limit exceeded), ``marginal`` (a bearing slope inside the typical
        range's caution band) or ``pass``.
        """
        if not self.ok:
            return FAIL
        return MARGINAL if any(c.status == "marginal" for c in self.cases) else PASS

    def to_dict(self) -> dict[str, Any]:
        """JSON-ready values."""
        return {"id": self.id, "shaft": self.shaft, "x_mm": self.x_mm,
                "slope_limit_rad": self.slope_limit_rad,
                "slope_limit_low_rad": self.slope_limit_low_rad,
                "deflection_limit_mm": self.deflection_limit_mm, "source": self.source,
                "cases": [c.to_dict() for c in self.cases], "ok": self.ok,
                "verdict": self.verdict, "slope_rule": self.slope_rule,
                "deflection_rule": self.deflection_rule}


@dataclass(frozen=True)
class SectionCheck:
    """Fatigue and yield result of one section (stresses in MPa, Kf applied).

    Attributes
    ----------
    x_mm: station [mm]. feature: the stress raiser. d_mm: section diameter [mm].
    D_mm, r_mm: shoulder large diameter and fillet radius [mm] (``None`` elsewhere).
    Kt, Kts, Kf, Kfs: notch factors [-]. Se_MPa: corrected endurance limit [MPa].
    sigma_a_MPa, sigma_m_MPa: von Mises alternating and mean stress [MPa].
    n_fatigue: by the settings' criterion [-]. n_yield: first-cycle yield [-].
    ok: both at least the required values. notes: assumptions and range clamps.
    """

    x_mm: float
    feature: str
    d_mm: float
    D_mm: float | None
    r_mm: float | None
    Kt: float
    Kts: float
    Kf: float
    Kfs: float
    Se_MPa: float
    sigma_a_MPa: float
    sigma_m_MPa: float
    n_fatigue: float
    n_yield: float
    ok: bool
    notes: tuple[str, ...] = ()
    #: the whole chain behind n_fatigue (loads, notch, Marin, stresses; the sheet's
    #: numbers), ``None`` when not kept
    trace: FatigueCheck | None = None
    #: largest von Mises stress of any single case [MPa] (behind n_yield)
    sigma_max_MPa: float = math.nan
    #: the shaft step the section's diameter comes from (0-based)
    step: int | None = None

    @property
    def verdict(self) -> str:
        """``pass`` or ``fail`` (both safety factors against the required ones)."""
        return PASS if self.ok else FAIL

    def to_dict(self) -> dict[str, Any]:
        """JSON-ready values (infinite safety factors as ``None``)."""
        return {"x_mm": self.x_mm, "feature": self.feature, "d_mm": self.d_mm,
                "D_mm": self.D_mm, "r_mm": self.r_mm, "Kt": self.Kt, "Kts": self.Kts,
                "Kf": self.Kf, "Kfs": self.Kfs, "Se_MPa": self.Se_MPa,
                "sigma_a_MPa": self.sigma_a_MPa, "sigma_m_MPa": self.sigma_m_MPa,
                "n_fatigue": _finite(self.n_fatigue), "n_yield": _finite(self.n_yield),
                "ok": self.ok, "verdict": self.verdict, "notes": list(self.notes)}


@dataclass(frozen=True)
class ShaftCheck:
    """Critical speeds and fatigue of one shaft.

    Attributes
    ----------
    id: shaft id.
    first_critical_rpm: first bending natural frequency as a speed [rpm] (60 f).
    first_torsional_rpm: first non-zero torsional natural frequency [rpm] (60 f).
    max_speed_rpm: largest |speed| of the duty and peak cases [rpm].
    critical_speed_ok: the margin rule holds (supercritical designs pass with a note).
    supercritical: the shaft runs above its first bending critical.
    sections: fatigue sections (empty when fatigue was skipped).
    min_fatigue_safety, min_yield_safety: smallest over the sections [-] (``inf`` if none).
    fatigue_ok: fatigue was evaluated and every section meets both required safety
        factors (``False`` when it was not evaluated).
    notes: notes and warnings for the designer.
    fatigue_not_evaluated: why fatigue could not be evaluated, or ``None``.
    fatigue_required: a fatigue check that is not evaluated fails the shaft.
    """

    id: str
    first_critical_rpm: float
    first_torsional_rpm: float
    max_speed_rpm: float
    critical_speed_ok: bool
    supercritical: bool
    sections: tuple[SectionCheck, ...]
    min_fatigue_safety: float
    min_yield_safety: float
    fatigue_ok: bool
    notes: tuple[str, ...]
    fatigue_not_evaluated: str | None = None
    fatigue_required: bool = True
    #: the shaft's modes (an ``analysis.modes.ShaftModes``; Any: that module builds on
    #: the solve, which builds on this one), ``None`` when not computed
    modes: Any = None

    @property
    def critical_speed_verdict(self) -> str:
        """``pass``, ``marginal`` (supercritical: accepted, runs through the critical at
        start-up) or ``fail`` (within the margin).
        """
        if not self.critical_speed_ok:
            return FAIL
        return MARGINAL if self.supercritical else PASS

    @property
    def fatigue_verdict(self) -> str:
        """``pass``, ``fail`` or ``not evaluated`` (see :attr:`fatigue_not_evaluated`)."""
        if self.fatigue_not_evaluated is not None:
            return NOT_EVALUATED
        return PASS if self.fatigue_ok else FAIL

    @property
    def verdict(self) -> str:
        """The shaft's verdict over its required checks (see :func:`combine_verdicts`);
        fatigue that is not evaluated and not required does not count.
        """
        parts = [self.critical_speed_verdict]
        if self.fatigue_required or self.fatigue_verdict != NOT_EVALUATED:
            parts.append(self.fatigue_verdict)
        return combine_verdicts(parts)

    @property
    def ok(self) -> bool:
        """Every required check was evaluated and passes (marginal counts as passed)."""
        return self.verdict in (PASS, MARGINAL)

    @property
    def not_evaluated_message(self) -> str | None:
        """What is missing, in the model's words, or ``None``."""
        if self.fatigue_not_evaluated is None:
            return None
        fix = (" - give them, or mark fatigue as not required (checks: {fatigue: "
               "not_required})" if "has no" in self.fatigue_not_evaluated else "")
        tail = "" if self.fatigue_required else " (not required)"
        return (f"fatigue of shaft '{self.id}' not evaluated{tail}: "
                f"{self.fatigue_not_evaluated}{fix if self.fatigue_required else ''}")

    def to_dict(self) -> dict[str, Any]:
        """JSON-ready values (infinite values as ``None``)."""
        return {"id": self.id, "first_critical_rpm": _finite(self.first_critical_rpm),
                "first_torsional_rpm": _finite(self.first_torsional_rpm),
                "max_speed_rpm": self.max_speed_rpm,
                "min_fatigue_safety": _finite(self.min_fatigue_safety),
                "min_yield_safety": _finite(self.min_yield_safety),
                "critical_speed_ok": self.critical_speed_ok,
                "supercritical": self.supercritical, "fatigue_ok": self.fatigue_ok,
                "sections": [s.to_dict() for s in self.sections], "notes": list(self.notes),
                "verdict": self.verdict,
                "critical_speed_verdict": self.critical_speed_verdict,
                "fatigue_verdict": self.fatigue_verdict,
                "fatigue_required": self.fatigue_required,
                "fatigue_not_evaluated_reason": self.fatigue_not_evaluated,
                **self._modes_dict()}

    def _modes_dict(self) -> dict[str, Any]:
        """The modes (``modes``), the list of bending criticals and their margins to the
        top speed (``critical_speeds_rpm``, ``critical_speed_margins``: n_crit / n_max).
        """
        if self.modes is None:
            return {}
        crit = [float(v) for v in self.modes.bending_rpm]
        margins = [v / self.max_speed_rpm if self.max_speed_rpm > 0 else None for v in crit]
        return {"critical_speeds_rpm": crit,
                "second_critical_rpm": crit[1] if len(crit) > 1 else None,
                "critical_speed_margins": margins, "modes": self.modes.to_dict()}


@dataclass(frozen=True)
class ShaftChecks:
    """All shaft checks of a solved model."""

    shafts: tuple[ShaftCheck, ...]
    bearings: tuple[DeflectionCheck, ...]
    gears: tuple[DeflectionCheck, ...]
    settings: ShaftCheckSettings

    @property
    def verdict(self) -> str:
        """Verdict over every slope, deflection, critical speed and fatigue check."""
        parts = [s.verdict for s in self.shafts]
        parts += [c.verdict for c in (*self.bearings, *self.gears)]
        return combine_verdicts(parts)

    @property
    def ok(self) -> bool:
        """Every required slope, deflection, critical speed and fatigue check was
        evaluated and passes (marginal counts as passed).
        """
        return self.verdict in (PASS, MARGINAL)

    @property
    def not_evaluated(self) -> tuple[str, ...]:
        """Messages of the required checks that were not evaluated."""
        return tuple(m for s in self.shafts if s.fatigue_required
                     and (m := s.not_evaluated_message) is not None)

    @property
    def failed(self) -> tuple[str, ...]:
        """The checks that fail (a limit exceeded), for the headline verdict."""
        out = [f"slope{'/deflection' if c.kind == 'gear' else ''} at {c.kind} '{c.id}' "
               f"of shaft '{c.shaft}'"
               for c in (*self.bearings, *self.gears) if c.verdict == FAIL]
        out += [f"critical speed of shaft '{s.id}'"
                for s in self.shafts if s.critical_speed_verdict == FAIL]
        out += [f"fatigue/yield of shaft '{s.id}'"
                for s in self.shafts if s.fatigue_verdict == FAIL]
        return tuple(out)

    @property
    def marginal(self) -> tuple[str, ...]:
        """The checks that pass inside their caution band, for messages."""
        out = [f"slope at {c.kind} '{c.id}' of shaft '{c.shaft}'"
               for c in (*self.bearings, *self.gears) if c.verdict == MARGINAL]
        out += [f"critical speed of shaft '{s.id}' (supercritical)"
                for s in self.shafts if s.critical_speed_verdict == MARGINAL]
        return tuple(out)

    def shaft(self, shaft_id: str) -> ShaftCheck:
        """The check of one shaft."""
        for s in self.shafts:
            if s.id == shaft_id:
                return s
        raise KeyError(shaft_id)

    def to_dict(self) -> dict[str, Any]:
        """JSON-ready dictionary: ``{"ok", "shafts", "bearings", "gears", "settings"}``."""
        st = self.settings
        return {
            "ok": self.ok,
            "verdict": self.verdict,
            "not_evaluated": list(self.not_evaluated),
            "marginal": list(self.marginal),
            "failed_checks": list(self.failed),
            "shafts": [s.to_dict() for s in self.shafts],
            "bearings": [b.to_dict() for b in self.bearings],
            "gears": [g.to_dict() for g in self.gears],
            "settings": {"criterion": st.criterion, "fluctuation_rule": st.fluctuation_rule,
                         "fatigue_cases": st.fatigue_cases,
                         "critical_speed_margin": st.critical_speed_margin,
                         "required_fatigue_safety": st.required_fatigue_safety,
                         "required_yield_safety": st.required_yield_safety,
                         "gear_slope_limit_rad": st.gear_slope_limit_rad,
                         "gear_deflection_limit_mm": st.gear_deflection_limit_mm,
                         "gear_deflection_per_module": st.gear_deflection_per_module,
                         "bearing_type_slope_limits_rad":
                             dict(st.bearing_type_slope_limits_rad),
                         "size_factor": "Shigley eq. 6-20 (rotating round bar)"},
        }


def _finite(v: float) -> float | None:
    return float(v) if math.isfinite(v) else None


