"""Rules of a bearing's internal geometry: estimate and check (pure, units of
:mod:`shaftsys.units`).

A bearing's :class:`Interior` describes its rolling-element set: what the load
distribution of :mod:`shaftsys.bearings.interior` needs. It comes from the model file
(``interior:`` on a bearing), from a catalogue row (``Dw``, ``Z``, ``dm``, ``Lwe``) or is
estimated from d, D, B by :func:`estimate_interior` (common practice, no source); every
value that was not given is named in :attr:`Interior.estimated`.

:func:`interior_problems` states what makes a geometry impossible; the loader turns each
problem into a located :class:`~shaftsys.errors.ModelError`.
"""

from __future__ import annotations

import math

from shaftsys.model.bearing import BearingKind
from shaftsys.model.interior import EST_FI, EST_FO, Interior

#: Types the load distribution models (point contact: ball; line contact: roller).
#: Self-aligning ball (spherical outer raceway), spherical roller (barrel rollers) and
#: thrust ball bearings are not modelled.
INTERIOR_KINDS = frozenset({
    BearingKind.DEEP_GROOVE_BALL, BearingKind.ANGULAR_CONTACT_BALL,
    BearingKind.CYLINDRICAL_ROLLER, BearingKind.TAPERED_ROLLER,
    BearingKind.NEEDLE_ROLLER,
})

#: Largest contact angle [deg] of a radial bearing the distribution accepts.
MAX_CONTACT_ANGLE_DEG = 45.0

#: Estimation rule (common practice, no source): rolling element diameter as a share
#: of the ring section (D - d), share of the pitch circle filled by elements, raceway
#: osculations of a ball bearing, roller length as a share of the width B.
EST_DW_SHARE_BALL = 0.3
EST_DW_SHARE_ROLLER = 0.25
EST_FILL_BALL = 0.6
EST_FILL_ROLLER = 0.75
EST_LWE_SHARE_B = 0.6


def estimated_contact_angle(kind: BearingKind, contact_angle_deg: float | None,
                            e: float | None) -> float:
    """Contact angle [deg] of the interior: the bearing's, else from e = 1.5 tan(alpha)
    (ISO 281's relation for tapered bearings), else 0 (radial) or 15 deg for a tapered
    bearing (common practice, no source).
    """
    if contact_angle_deg is not None:
        return float(contact_angle_deg)
    if kind is BearingKind.TAPERED_ROLLER:
        return math.degrees(math.atan(e / 1.5)) if e is not None else 15.0
    return 0.0


def estimate_interior(kind: BearingKind, d_mm: float, D_mm: float, B_mm: float | None,
                      contact_angle_deg: float | None = None, e: float | None = None,
                      *, Dw_mm: float | None = None, Z: int | None = None,
                      dm_mm: float | None = None, fi: float | None = None,
                      fo: float | None = None, Lwe_mm: float | None = None,
                      clearance_mm: float | None = None, preload_N: float | None = None,
                      source: str = "model") -> Interior:
    """The :class:`Interior` with the given values and the rest estimated.

    Rule (common practice, no source): dm = (d + D)/2; Dw = 0.3 (D - d) ball,
    0.25 (D - d) roller; Z = floor(fill * pi * dm / Dw) with fill 0.6 ball, 0.75 roller
    (at least 3); fi = 0.52, fo = 0.53; Lwe = 0.6 B (B missing: Lwe = Dw); radial
    clearance 0. Every estimated value is listed in ``estimated``; ``source`` becomes
    ``"estimated"`` when Dw or Z was estimated.
    """
    roller = kind.is_roller
    est: list[str] = []
    if dm_mm is None:
        dm_mm = 0.5 * (d_mm + D_mm)
        est.append("dm")
    if Dw_mm is None:
        Dw_mm = (EST_DW_SHARE_ROLLER if roller else EST_DW_SHARE_BALL) * (D_mm - d_mm)
        est.append("Dw")
    if Z is None:
        fill = EST_FILL_ROLLER if roller else EST_FILL_BALL
        Z = max(3, math.floor(fill * math.pi * dm_mm / Dw_mm))
        est.append("Z")
    if not roller:
        if fi is None:
            fi = EST_FI
            est.append("fi")
        if fo is None:
            fo = EST_FO
            est.append("fo")
        Lwe_mm = None
    else:
        fi = fo = 0.5  # not used by line contact
        if Lwe_mm is None:
            Lwe_mm = EST_LWE_SHARE_B * B_mm if B_mm is not None else Dw_mm
            est.append("Lwe")
    if clearance_mm is None:
        clearance_mm = 0.0
        est.append("clearance")
    angle = estimated_contact_angle(kind, contact_angle_deg, e)
    if contact_angle_deg is None and kind is BearingKind.TAPERED_ROLLER:
        est.append("contact_angle")
    if "Dw" in est or "Z" in est:
        source = "estimated"
    return Interior(Dw_mm=float(Dw_mm), Z=int(Z), dm_mm=float(dm_mm),
                    contact_angle_deg=angle, fi=float(fi), fo=float(fo),
                    Lwe_mm=None if Lwe_mm is None else float(Lwe_mm),
                    clearance_mm=float(clearance_mm), preload_N=preload_N, source=source,
                    estimated=tuple(est))


def interior_problems(kind: BearingKind, d_mm: float, D_mm: float, B_mm: float | None,
                      interior: Interior) -> list[tuple[str, str, str]]:
    """What makes ``interior`` impossible for a bearing of type ``kind``, d, D, B.

    Returns ``(field, message, expected)`` triples (field as the model file's
    ``interior`` key), empty when the geometry is possible:

    * the type must be one the load distribution models (:data:`INTERIOR_KINDS`);
    * clearance >= 0 (an interference is not a clearance: an adjusted pair states its
      ``preload``);
    * contact angle 0 ..45 deg, above 0 for angular-contact and tapered bearings;
    * the elements fit between the rings: d < dm - Dw and dm + Dw < D;
    * Z elements fit around the pitch circle: Dw <= dm sin(pi / Z), Z >= 3;
    * ball osculations 0.5 < f <= 0.6; roller length Lwe <= B when B is given.
    """
    out: list[tuple[str, str, str]] = []
    g = interior
    if kind not in INTERIOR_KINDS:
        out.append(("", f"the load distribution does not model a {kind.value} bearing",
                    "a deep_groove_ball, angular_contact_ball, cylindrical_roller, "
                    "tapered_roller or needle_roller bearing; remove 'interior'"))
        return out
    if not g.clearance_mm >= 0.0:
        out.append(("clearance", f"radial clearance {g.clearance_mm:g} mm is negative; an "
                    "interference is not a clearance", "clearance >= 0 mm (an adjusted "
                    "pair states its axial 'preload')"))
    a = g.contact_angle_deg
    needs_angle = kind in {BearingKind.ANGULAR_CONTACT_BALL, BearingKind.TAPERED_ROLLER}
    if not 0.0 <= a <= MAX_CONTACT_ANGLE_DEG or (needs_angle and not a > 0.0):
        low = "above 0" if needs_angle else "0"
        out.append(("contact_angle", f"contact angle {a:g} deg is out of range for a "
                    f"{kind.value} bearing", f"a contact angle from {low} to "
                    f"{MAX_CONTACT_ANGLE_DEG:g} deg"))
    if not g.Z >= 3:
        out.append(("Z", f"{g.Z} rolling elements cannot centre a ring", "Z >= 3"))
    if not g.Dw_mm > 0.0:
        out.append(("Dw", f"rolling element diameter {g.Dw_mm:g} mm", "Dw > 0"))
        return out
    if not (d_mm < g.dm_mm - g.Dw_mm and g.dm_mm + g.Dw_mm < D_mm):
        out.append(("Dw", f"elements of Dw = {g.Dw_mm:g} mm on a pitch circle of "
                    f"{g.dm_mm:g} mm do not fit between the bore {d_mm:g} mm and the "
                    f"outside {D_mm:g} mm", f"d < dm - Dw and dm + Dw < D, i.e. Dw < "
                    f"{min(g.dm_mm - d_mm, D_mm - g.dm_mm):.4g} mm"))
    elif g.Z >= 3 and not g.Dw_mm <= g.dm_mm * math.sin(math.pi / g.Z):
        most = int(math.pi / math.asin(min(1.0, g.Dw_mm / g.dm_mm)))
        out.append(("Z", f"{g.Z} elements of Dw = {g.Dw_mm:g} mm overlap on a pitch "
                    f"circle of {g.dm_mm:g} mm", f"Z <= {most}"))
    if not kind.is_roller:
        for key, f in (("fi", g.fi), ("fo", g.fo)):
            if not 0.5 < f <= 0.6:
                out.append((key, f"osculation {key} = {f:g} (groove radius / Dw)",
                            "0.5 < f <= 0.6"))
    elif g.Lwe_mm is not None and (not g.Lwe_mm > 0.0 or (B_mm is not None
                                                          and g.Lwe_mm > B_mm)):
        out.append(("Lwe", f"effective roller length {g.Lwe_mm:g} mm", "0 < Lwe <= B"
                    + (f" = {B_mm:g} mm" if B_mm is not None else "")))
    if g.preload_N is not None and not g.preload_N >= 0.0:
        out.append(("preload", f"preload {g.preload_N:g} N", "preload >= 0 N"))
    return out
