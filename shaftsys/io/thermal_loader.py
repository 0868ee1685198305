"""The ``thermal`` section of a model file: heat-balance data of the housing."""

from __future__ import annotations

from typing import Any

from shaftsys.io import spec as S
from shaftsys.io.spec import Where, read_section, require_mapping
from shaftsys.io.yamlsource import LocatedDict
from shaftsys.model.bearing import Lubrication
from shaftsys.model.thermal import FrictionOverride, HeatBalance

#: m^3 per litre, s per min.
_M3_PER_L = 1e-3
_S_PER_MIN = 60.0


def read_thermal(top: Where, raw: Any, lubrication: Lubrication | None,
                 bearing_ids: set[str]) -> HeatBalance | None:
    """Heat-balance data, checked: one way of shedding heat to ambient (coefficient with
    area, or a thermal resistance) and/or an oil flow with its inlet temperature.
    """
    if raw is None:
        return None
    v = read_section(top, raw, S.THERMAL, "thermal")
    tw = top.child("thermal", raw)
    tw.node = require_mapping(top, "thermal", raw)
    if lubrication is None:
        raise tw.error(None, "the heat balance needs the lubricant's viscosity",
                       "a 'lubrication' section with viscosity_40C and viscosity_100C")
    h, area, r_th = v["heat_transfer_coefficient"], v["area"], v["thermal_resistance"]
    if (h is None) != (area is None):
        missing = "area" if area is None else "heat_transfer_coefficient"
        raise tw.error(missing, f"'{missing}' is missing: the housing's heat flow is "
                       "heat_transfer_coefficient x area", "both keys, or "
                       "thermal_resistance instead")
    if h is not None and r_th is not None:
        raise tw.error("thermal_resistance", "give the heat flow to ambient once: "
                       "heat_transfer_coefficient with area, or thermal_resistance",
                       "one of the two")
    conductance = h * area if h is not None else (1.0 / r_th if r_th is not None else 0.0)
    flow = v["oil_flow"]
    if flow is not None and v["oil_inlet"] is None:
        raise tw.error("oil_inlet", "an oil flow needs its inlet temperature",
                       "a key 'oil_inlet' (e.g. 40 degC)")
    if flow is None and v["oil_inlet"] is not None:
        raise tw.error("oil_flow", "an oil inlet temperature without an oil flow",
                       "a key 'oil_flow' (e.g. 2 l/min), or no 'oil_inlet'")
    flow_W_K = (v["oil_density"] * v["oil_specific_heat"] * flow * _M3_PER_L / _S_PER_MIN
                if flow is not None else 0.0)
    if not conductance + flow_W_K > 0.0:
        raise tw.error(None, "the housing sheds no heat", "heat_transfer_coefficient with "
                       "area, thermal_resistance, or oil_flow with oil_inlet")
    if not v["search_limit"] > v["ambient"]:
        raise tw.error("search_limit", "the search limit must lie above ambient",
                       f"a temperature above {v['ambient']:g} degC")
    friction: dict[str, FrictionOverride] = {}
    if v["friction"] is not None:
        fw = tw.child("friction", v["friction"])
        items = require_mapping(tw, "friction", v["friction"])
        fw.node = items
        for bid, item in items.items():
            if str(bid) not in bearing_ids:
                raise fw.error(str(bid), f"friction factors for an unknown bearing '{bid}'",
                               "one of: " + ", ".join(sorted(bearing_ids)))
            fv = read_section(fw, item, S.THERMAL_FRICTION, str(bid))
            friction[str(bid)] = FrictionOverride(f0=fv["f0"], f1=fv["f1"])
    return HeatBalance(
        ambient_C=v["ambient"], conductance_W_K=conductance, oil_flow_W_K=flow_W_K,
        oil_inlet_C=v["oil_inlet"], extra_loss_W=v["extra_loss"],
        max_temperature_C=v["max_temperature"], reference_rise_K=v["reference_rise"],
        search_limit_C=v["search_limit"], friction=friction,
        line=raw.line if isinstance(raw, LocatedDict) else None)
