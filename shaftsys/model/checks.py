"""Limits and targets of the checks, as the model file's ``checks:`` section sets them.

Units: slopes in rad, lengths in mm, lives in h. ``None`` means "the built-in default":
the common-practice slope range of the bearing's type, Shigley's Table 7-2 gear limits
(from memory), no system-life target (the system life is then information only).
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field

#: How a check counts: ``required`` (a failure fails the support and the run) or
#: ``advisory`` (shown with its numbers and verdict, does not decide the run).
CHECK_MODES = ("required", "advisory")
#: Fatigue criteria the shaft checks implement (values of ``FatigueCriterion``).
FATIGUE_CRITERIA = ("goodman", "asme_elliptic", "gerber")
#: Reliability at which a system life is stated: the model's target reliability
#: (``life.reliability``, the behaviour before the choice existed) or 90 %.
SYSTEM_RELIABILITY_CHOICES = ("target", "90_percent")
#: Lundberg-Palmgren Weibull slopes (ISO 281:2007 basis; ``BearingKind.weibull_slope``).
WEIBULL_SLOPE_BALL = 10.0 / 9.0
WEIBULL_SLOPE_ROLLER = 9.0 / 8.0


@dataclass(frozen=True, slots=True)
class BearingCheckOverride:
    """Per-bearing settings (``checks.bearings.<id>``); ``None`` = the model-wide value.

    slope_rad: allowable slope at the bearing [rad]. speed, min_load: ``required`` or
    ``advisory``.
    """

    slope_rad: float | None = None
    speed: str | None = None
    min_load: str | None = None


@dataclass(frozen=True, slots=True)
class GearCheckOverride:
    """Per-gear limits (``checks.gears.<id>``); ``None`` = the model-wide value.

    slope_rad: allowable slope [rad]; deflection_mm: allowable deflection [mm];
    deflection_per_module: allowable deflection as a fraction of the normal module [-].
    """

    slope_rad: float | None = None
    deflection_mm: float | None = None
    deflection_per_module: float | None = None


@dataclass(frozen=True, slots=True)
class CheckSettings:
    """Limits and targets of every check a model file can set.

    Attributes
    ----------
    bearing_slope_by_type: bearing type value -> allowable slope [rad] (replaces the
        type's typical range; no caution band).
    bearings: bearing id -> :class:`BearingCheckOverride`.
    gear_slope_rad: allowable slope at every gear [rad] (``None`` = 0.0005 rad).
    gear_deflection_mm: allowable deflection at every gear [mm] (``None`` = the rule).
    gear_deflection_per_module: allowable deflection = this x normal module (``None`` =
        Shigley's table by the diametral pitch, 0.13 mm without a module).
    gears: gear id -> :class:`GearCheckOverride`.
    fatigue_safety, yield_safety: required shaft safety factors [-].
    fatigue_criterion: one of :data:`FATIGUE_CRITERIA`.
    speed, min_load: model-wide mode of the limiting-speed and minimum-load checks.
    system_life_target_h: target of the machine's system life [h] (``None`` = info).
    shaft_system_life_target_h: default target of each shaft's system life [h].
    shaft_targets_h: shaft id -> target of that shaft's system life [h].
    weibull_slope_ball, weibull_slope_roller: Weibull slopes of the system life [-].
    system_reliability: ``target`` or ``90_percent`` (see
        :data:`SYSTEM_RELIABILITY_CHOICES`).
    """

    bearing_slope_by_type: Mapping[str, float] = field(default_factory=dict)
    bearings: Mapping[str, BearingCheckOverride] = field(default_factory=dict)
    gear_slope_rad: float | None = None
    gear_deflection_mm: float | None = None
    gear_deflection_per_module: float | None = None
    gears: Mapping[str, GearCheckOverride] = field(default_factory=dict)
    fatigue_safety: float = 1.5
    yield_safety: float = 1.2
    fatigue_criterion: str = "goodman"
    speed: str = "required"
    min_load: str = "required"
    system_life_target_h: float | None = None
    shaft_system_life_target_h: float | None = None
    shaft_targets_h: Mapping[str, float] = field(default_factory=dict)
    weibull_slope_ball: float = WEIBULL_SLOPE_BALL
    weibull_slope_roller: float = WEIBULL_SLOPE_ROLLER
    system_reliability: str = "target"

    def mode(self, check: str, bearing_id: str) -> str:
        """``required`` or ``advisory`` for ``check`` (``speed``/``min_load``) at a
        bearing: its override, else the model-wide mode.
        """
        over = self.bearings.get(bearing_id)
        value = getattr(over, check) if over is not None else None
        return value if value is not None else str(getattr(self, check))

    def shaft_target_h(self, shaft_id: str) -> float | None:
        """Target of a shaft's system life [h], or ``None`` (information only)."""
        return self.shaft_targets_h.get(shaft_id, self.shaft_system_life_target_h)

    def weibull_slope(self, is_roller: bool) -> float:
        """Weibull slope of a bearing in the system life [-]."""
        return self.weibull_slope_roller if is_roller else self.weibull_slope_ball
