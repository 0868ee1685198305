"""Heat-balance data of the housing as frozen input values (units of shaftsys.units)."""

from __future__ import annotations

from dataclasses import dataclass, field

#: Default upper operating temperature [degC] when the user gives none (common practice,
#: no source): oil-lubricated bearings 100 degC, greased bearings 80 degC.
DEFAULT_MAX_TEMPERATURE_OIL_C = 100.0
DEFAULT_MAX_TEMPERATURE_GREASE_C = 80.0
#: Default reference temperature rise of the heat-balance speed [K] (common practice, no
#: source: a 70 degC bearing in a 20 degC room).
DEFAULT_REFERENCE_RISE_K = 50.0
#: Oil properties for a circulating flow (common practice, no source): density
#: [kg/m^3] and specific heat [J/(kg*K)] of a mineral oil.
DEFAULT_OIL_DENSITY_KG_M3 = 870.0
DEFAULT_OIL_SPECIFIC_HEAT_J_KGK = 1950.0
#: Highest temperature the balance searches [degC]; none below it = thermal runaway.
DEFAULT_SEARCH_LIMIT_C = 250.0


@dataclass(frozen=True, slots=True)
class FrictionOverride:
    """The supplier's friction factors of one bearing (``None`` = the type's table)."""

    f0: float | None = None
    f1: float | None = None


@dataclass(frozen=True, slots=True)
class HeatBalance:
    """One housing around all bearings of the machine, sharing one oil temperature.

    Attributes
    ----------
    ambient_C: ambient air temperature [degC].
    conductance_W_K: heat flow to ambient per kelvin [W/K] (h*A, or 1/R_th); 0 when
        only an oil flow removes heat.
    oil_flow_W_K: heat capacity rate rho*c*Q of a circulating oil flow [W/K] (0 = none).
    oil_inlet_C: inlet temperature of the oil flow [degC] (with an oil flow).
    extra_loss_W: further heat into the housing in every case (gears, seals) [W].
    max_temperature_C: highest admissible operating temperature [degC] (``None`` =
        common-practice default for the lubrication method).
    reference_rise_K: temperature rise of the heat-balance speed [K].
    search_limit_C: the balance is sought below this temperature [degC].
    friction: bearing id -> the supplier's f0/f1.
    line: line of the section in the model file.
    """

    ambient_C: float
    conductance_W_K: float = 0.0
    oil_flow_W_K: float = 0.0
    oil_inlet_C: float | None = None
    extra_loss_W: float = 0.0
    max_temperature_C: float | None = None
    reference_rise_K: float = DEFAULT_REFERENCE_RISE_K
    search_limit_C: float = DEFAULT_SEARCH_LIMIT_C
    friction: dict[str, FrictionOverride] = field(default_factory=dict)
    line: int | None = None

    @property
    def removal_W_K(self) -> float:
        """H = G + Wc [W/K]."""
        return self.conductance_W_K + self.oil_flow_W_K

    @property
    def sink_C(self) -> float:
        """T_sink = (G*T_ambient + Wc*T_inlet) / H [degC]."""
        inlet = self.oil_inlet_C if self.oil_inlet_C is not None else self.ambient_C
        return (self.conductance_W_K * self.ambient_C
                + self.oil_flow_W_K * inlet) / self.removal_W_K

    def __hash__(self) -> int:
        return hash((self.ambient_C, self.conductance_W_K, self.oil_flow_W_K))
