"""Solve the bundled fan shaft and print its bearing loads and life verdicts.

Run: ``python examples/fan_shaft_life_table.py``. Uses the Python API only.
"""

from __future__ import annotations

from pathlib import Path

import shaftsys

MODEL = Path(__file__).resolve().parent.parent / "models" / "fan_drive.yaml"


def main() -> dict[str, float]:
    """Solve the demo, print the tables, return each bearing's life at its target [h]."""
    model = shaftsys.load_model(str(MODEL))
    result = shaftsys.analyse(model)
    loads = result.loads_frame()[["bearing", "case", "Fr_N", "Fa_N", "speed_rpm"]]
    print(loads.to_string(index=False, float_format=lambda v: f"{v:,.0f}"))
    life = result.life_frame()[["bearing", "P_eq_N", "L10_h", "Lnm_h", "C_required_N",
                                "margin", "s0", "ok"]]
    print(life.to_string(index=False, float_format=lambda v: f"{v:,.2f}"))
    return {b.bearing.id: b.life.Lnm_h for b in result.bearings if b.life is not None}


if __name__ == "__main__":
    main()
