"""Bearing life engine: ISO 281:2007 rating and modified life, ISO 76 static safety.

Pure numpy functions; the entry point is :func:`evaluate_bearing`.
"""

from shaftsys.bearings.engine import (
    LIFE_BASIS_BASIC,
    LIFE_BASIS_MODIFIED,
    BearingLife,
    LoadSpectrum,
    evaluate_bearing,
    required_rating,
    system_life,
)
from shaftsys.bearings.equivalent import (
    EquivalentLoad,
    angular_contact_factors,
    deep_groove_factors,
    equivalent_dynamic_load,
    estimate_f0,
)
from shaftsys.bearings.life import (
    SpectrumLife,
    basic_rating_life,
    duty_cycle_repetitions,
    equivalent_mean_load,
    life_hours,
    mean_speed,
    revolution_weights,
    spectrum_life,
)
from shaftsys.bearings.lubrication import (
    a_iso,
    a_iso_with_ep,
    contamination_constants,
    contamination_factor,
    estimate_fatigue_load_limit,
    reference_viscosity,
    viscosity_at,
    viscosity_ratio,
    walther_constants,
)
from shaftsys.bearings.modified import combine_lives, modified_life_per_case
from shaftsys.bearings.reliability import (
    a1_iso281,
    life_factor,
    reliability_at_life_factor,
    reliability_iso281,
    weibull3_life_factor,
    weibull3_reliability,
    weibull3_required_C10,
)
from shaftsys.bearings.static import (
    StaticCheck,
    StaticLoad,
    default_s0_min,
    equivalent_static_load,
    operating_warnings,
    static_check,
    static_safety,
)
from shaftsys.bearings.system import weibull_survival

__all__ = [
    "LIFE_BASIS_BASIC",
    "LIFE_BASIS_MODIFIED",
    "BearingLife",
    "EquivalentLoad",
    "LoadSpectrum",
    "SpectrumLife",
    "StaticCheck",
    "StaticLoad",
    "a1_iso281",
    "a_iso",
    "a_iso_with_ep",
    "angular_contact_factors",
    "basic_rating_life",
    "combine_lives",
    "contamination_constants",
    "contamination_factor",
    "deep_groove_factors",
    "default_s0_min",
    "duty_cycle_repetitions",
    "equivalent_dynamic_load",
    "equivalent_mean_load",
    "equivalent_static_load",
    "estimate_f0",
    "estimate_fatigue_load_limit",
    "evaluate_bearing",
    "life_factor",
    "life_hours",
    "mean_speed",
    "modified_life_per_case",
    "operating_warnings",
    "reference_viscosity",
    "reliability_at_life_factor",
    "reliability_iso281",
    "required_rating",
    "revolution_weights",
    "spectrum_life",
    "static_check",
    "static_safety",
    "system_life",
    "viscosity_at",
    "viscosity_ratio",
    "walther_constants",
    "weibull3_life_factor",
    "weibull3_reliability",
    "weibull3_required_C10",
    "weibull_survival",
]
