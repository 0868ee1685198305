"""Check a bearing that the built-in types do not cover, with the maker's own X, Y, e.

Run: ``python examples/add_own_bearing_type.py``. Uses the Python API only.

The situation: on the bundled fan shaft (``models/fan_drive.yaml``) the locating
bearing A is to be replaced by a special single-row ball bearing (think of a maker's
thin-section or filling-slot design) for which shaftsys has no factor table. Its maker
publishes the ratings C, C0, the fatigue load limit Cu and the factors for the
equivalent loads:

    P  = Fr                  for Fa/Fr <= e
    P  = X*Fr + Y*Fa         for Fa/Fr >  e         (ISO 281:2007 form, maker's X, Y, e)
    P0 = max(Fr, X0*Fr + Y0*Fa)                     (ISO 76 form, maker's Y0)

All numbers of this bearing below are INVENTED for the example.

How it is done:

1. Solve the model as it is. The bearing reactions of rigid supports do not depend on
   the bearing type, so the spectrum of seat A stays valid for the new bearing as long
   as it sits at the same station with the same axial role. (If you move it, give it a
   radial stiffness or change who locates, put it into the model and solve again.)
2. Describe the new bearing as a :class:`shaftsys.model.Bearing` of the built-in kind
   whose other rules fit (here ``deep_groove_ball``: ball life exponent 3, ball aISO
   formula, X0 = 0.6) and override X, Y, e (and Y0) with the maker's values: a given
   ``X`` replaces the built-in X/Y table.
3. Evaluate it with :func:`shaftsys.bearings.evaluate_bearing` on the spectrum of seat
   A taken from the solved model (:func:`shaftsys.analysis.life.spectrum_of`), with the
   model's own life settings and lubrication.
"""

from __future__ import annotations

import dataclasses
from pathlib import Path
from typing import Any

import shaftsys
from shaftsys.analysis.life import spectrum_of
from shaftsys.bearings import evaluate_bearing
from shaftsys.model import Bearing, BearingKind

MODEL = Path(__file__).resolve().parent.parent / "models" / "fan_drive.yaml"

#: The replacement for seat A: a special ball bearing, maker's data (invented numbers).
MAKER_DATA: dict[str, float] = {
    "d_mm": 50.0, "D_mm": 90.0, "B_mm": 20.0,
    "C_N": 52_000.0, "C0_N": 40_000.0, "Cu_N": 1_700.0,
    "e": 0.44, "X": 0.56, "Y": 1.2, "Y0": 0.9,
}


def own_bearing(seat: Bearing) -> Bearing:
    """The special bearing at the station and axial role of ``seat``.

    Units: mm and N as in :mod:`shaftsys.units`; ``e``, ``X``, ``Y``, ``Y0`` are
    dimensionless maker's factors.
    """
    return dataclasses.replace(
        seat, id=f"{seat.id}_special", kind=BearingKind.DEEP_GROOVE_BALL,
        Y1=None, Y2=None, contact_angle_deg=None, f0=None, limiting_speed_rpm=None,
        **MAKER_DATA)


def main() -> dict[str, Any]:
    """Evaluate the special bearing at seat A; print and return the headline figures.

    Returns
    -------
    dict
        ``cases``, ``Fr_N``, ``Fa_N``, ``speed_rpm``, ``duration`` (the spectrum of
        seat A, N, rpm, time shares), ``P_N``, ``X``, ``Y`` per case, ``dynamic`` (mask of
        the cases in the fatigue spectrum), ``P_eq_N`` (Pm), ``n_m_rpm``, ``L10_h``,
        ``Lnm_h`` (h), ``s0``, ``ok`` of the special bearing, and ``builtin_Lnm_h``,
        ``builtin_ok`` of the bearing the model has at seat A, for comparison.
    """
    model = shaftsys.load_model(str(MODEL))
    result = shaftsys.analyse(model)
    seat = result.bearing("A")
    spectrum = spectrum_of(model, seat)
    special = own_bearing(seat.bearing)
    life = evaluate_bearing(special, spectrum, model.life, model.lubrication)

    print(f"Seat A of '{model.name}' with a special ball bearing "
          f"(C = {special.C_N:.0f} N, C0 = {special.C0_N:.0f} N, maker's e = {special.e}, "
          f"X = {special.X}, Y = {special.Y}, Y0 = {special.Y0}; invented numbers)")
    print(f"{'case':<12} {'Fr N':>8} {'Fa N':>8} {'Fa/Fr':>6} {'X':>5} {'Y':>5} {'P N':>8}")
    for k, case in enumerate(spectrum.case_ids):
        fr, fa = spectrum.Fr_N[k], spectrum.Fa_N[k]
        ratio = fa / fr if fr > 0 else float("inf")
        print(f"{case:<12} {fr:>8.0f} {fa:>8.0f} {ratio:>6.3f} {life.X[k]:>5.2f} "
              f"{life.Y[k]:>5.2f} {life.P_N[k]:>8.0f}"
              + ("" if life.dynamic[k] else "   (static check only)"))
    builtin = seat.life
    assert builtin is not None
    print(f"special bearing: Pm = {life.P_eq_N:.0f} N, L10 = {life.L10_h:,.0f} h, "
          f"Lnm = {life.Lnm_h:,.0f} h (target {life.target_h:,.0f} h), s0 = {life.s0:.2f} "
          f"-> {'PASS' if life.ok else 'FAIL'}")
    print(f"built-in bearing at A ({seat.bearing.kind.value}): Lnm = {builtin.Lnm_h:,.0f} h "
          f"-> {'PASS' if builtin.ok else 'FAIL'}")
    return {
        "cases": spectrum.case_ids,
        "Fr_N": spectrum.Fr_N.tolist(), "Fa_N": spectrum.Fa_N.tolist(),
        "speed_rpm": spectrum.speed_rpm.tolist(), "duration": spectrum.duration.tolist(),
        "dynamic": life.dynamic.tolist(),
        "P_N": life.P_N.tolist(), "X": life.X.tolist(), "Y": life.Y.tolist(),
        "P_eq_N": life.P_eq_N, "n_m_rpm": life.n_m_rpm, "L10_h": life.L10_h,
        "Lnm_h": life.Lnm_h, "s0": life.s0, "ok": life.ok,
        "builtin_Lnm_h": builtin.Lnm_h, "builtin_ok": builtin.ok,
    }


if __name__ == "__main__":
    main()
