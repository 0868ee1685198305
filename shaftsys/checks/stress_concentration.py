"""Stress concentration at shaft features and the fatigue notch factors Kf, Kfs.

Shoulder fillet of a round shaft (large diameter D, small diameter d, fillet radius r)
-------------------------------------------------------------------------------------
Theoretical factor Kt from the power-law fits to Peterson's charts

    Kt ~= A * (r/d)^b      (A, b tabulated against D/d)

published in R. L. Norton, *Machine Design: An Integrated Approach*, Appendix C,
Figures C-1 (axial tension), C-2 (bending) and C-3 (torsion) (the same fits appear in
the chapter on stress concentration, Figs. 4-35 to 4-37). Coefficients are typed in
**from memory**; they reproduce the first-iteration values of Shigley's *Mechanical
Engineering Design* (9th ed., Table 7-1) to about 5 % and the chart readings of his
Example 7-1 to about 3 % (see ``tests/test_checks_kt.py``). One recalled bending row,
D/d = 1.10 (A = 0.95120, b = -0.23757), gives a larger Kt than the D/d = 1.20 row at
every r/d although Kt must grow with D/d; it is left out as a doubtful recollection, so
bending uses linear interpolation between the 1.07 and 1.20 rows there.

Between tabulated D/d rows Kt is interpolated linearly in D/d (Kt of each bracketing
row evaluated at the given r/d). Range handling (each outside-range use is logged as a
warning and listed in :attr:`NotchFactors.notes`):

* D/d <= 1 or r/d <= 0: :class:`~shaftsys.errors.ModelError` (not a shoulder).
* D/d below the lowest row: the lowest row is used (conservative: Kt grows with D/d).
* D/d above the highest row: the highest row is used (the charts saturate there).
* r/d > 0.3 (end of Peterson's charts): clamped to 0.3 (conservative: Kt falls with r/d).
* r/d < 0.01: the power law is extrapolated (Kt keeps rising as the fillet sharpens).
* Kt is never returned below 1.

Valid table span: bending 1.01 <= D/d <= 6.0, torsion 1.09 <= D/d <= 2.0, axial
1.01 <= D/d <= 2.0; 0.01 <= r/d <= 0.3. The fits are for solid shafts.

Other features (first-iteration estimates)
------------------------------------------
Shigley 9th ed. Table 7-1 (from memory): end-milled keyseat (r/d = 0.02) Kt = 2.14
bending, 3.0 torsion; sled-runner keyseat Kt = 1.7 bending; retaining-ring groove
Kt = 5.0 bending, 3.0 torsion, 5.0 axial. Where the table has no entry (keyseats in
axial load, sled-runner keyseat in torsion) the value used is stated per entry of
:data:`FEATURE_KT` and marked "common practice, no source". A press-fit seat (hub,
bearing ring) is not a geometric notch but a fretting site: Kf = 2.0 bending,
1.5 torsion, 2.0 axial (common practice, no source) is applied directly (q = 1).

Notch sensitivity
-----------------
Neuber's equation with Kuhn-Hardrath's characteristic length (Shigley 9th ed.,
eqs. 6-33 to 6-35): q = 1 / (1 + sqrt(a)/sqrt(r)) with, for Sut in kpsi and sqrt(a)
in sqrt(in) (r in inches),

    bending, axial: sqrt(a) = 0.246 - 3.08e-3 Sut + 1.51e-5 Sut^2 - 2.67e-8 Sut^3
    torsion:        sqrt(a) = 0.190 - 2.51e-3 Sut + 1.35e-5 Sut^2 - 2.67e-8 Sut^3

fitted for 50 <= Sut <= 250 kpsi (345..1724 MPa). Outside that span Sut is clamped
(warning). Kf = 1 + q (Kt - 1), Kfs = 1 + qs (Kts - 1).
"""

from __future__ import annotations

import logging
import math
from collections.abc import Mapping
from dataclasses import dataclass
from enum import StrEnum
from types import MappingProxyType

from shaftsys.errors import ModelError

_log = logging.getLogger(__name__)

KPSI_PER_MPA = 1.0 / 6.894757293168361  # 1 kpsi = 6.894757 MPa
MM_PER_INCH = 25.4


class LoadMode(StrEnum):
    """Loading mode a stress concentration factor belongs to."""

    BENDING = "bending"
    TORSION = "torsion"
    AXIAL = "axial"


class Feature(StrEnum):
    """Stress raisers shaftsys knows at a shaft section."""

    PLAIN = "plain"
    SHOULDER = "shoulder"
    KEYSEAT_END_MILL = "keyseat_end_mill"
    KEYSEAT_SLED_RUNNER = "keyseat_sled_runner"
    RETAINING_RING_GROOVE = "retaining_ring_groove"
    PRESS_FIT = "press_fit"


#: Norton, Machine Design, App. C, Fig. C-2 (shoulder fillet, bending): D/d -> (A, b).
#: From memory; the recalled D/d = 1.10 row is omitted (see module docstring).
SHOULDER_BENDING_FIT: tuple[tuple[float, float, float], ...] = (
    (1.01, 0.91938, -0.17032),
    (1.02, 0.96048, -0.17711),
    (1.03, 0.98061, -0.18381),
    (1.05, 0.98137, -0.19653),
    (1.07, 0.97527, -0.20958),
    (1.20, 0.97098, -0.21796),
    (1.50, 0.93836, -0.25759),
    (2.00, 0.90879, -0.28598),
    (3.00, 0.89334, -0.30860),
    (6.00, 0.87868, -0.33243),
)

#: Norton, Machine Design, App. C, Fig. C-3 (shoulder fillet, torsion): D/d -> (A, b).
#: From memory.
SHOULDER_TORSION_FIT: tuple[tuple[float, float, float], ...] = (
    (1.09, 0.90337, -0.12692),
    (1.20, 0.83425, -0.21649),
    (1.33, 0.84897, -0.23161),
    (2.00, 0.86331, -0.23865),
)

#: Norton, Machine Design, App. C, Fig. C-1 (shoulder fillet, axial tension): D/d -> (A, b).
#: From memory.
SHOULDER_AXIAL_FIT: tuple[tuple[float, float, float], ...] = (
    (1.01, 0.98413, -0.10474),
    (1.02, 1.01220, -0.12780),
    (1.05, 1.00480, -0.14503),
    (1.07, 0.98739, -0.16832),
    (1.10, 0.98498, -0.19548),
    (1.12, 0.98450, -0.20818),
    (1.15, 0.98084, -0.22485),
    (1.20, 0.96272, -0.25527),
    (1.30, 0.99682, -0.25751),
    (1.50, 0.99957, -0.28221),
    (2.00, 1.01470, -0.30035),
)

_SHOULDER_FITS: Mapping[LoadMode, tuple[tuple[float, float, float], ...]] = MappingProxyType(
    {
        LoadMode.BENDING: SHOULDER_BENDING_FIT,
        LoadMode.TORSION: SHOULDER_TORSION_FIT,
        LoadMode.AXIAL: SHOULDER_AXIAL_FIT,
    }
)

#: Span of r/d covered by Peterson's shoulder-fillet charts.
R_OVER_D_MIN = 0.01
R_OVER_D_MAX = 0.3

#: r/d at which Shigley's keyseat estimates are given.
KEYSEAT_R_OVER_D = 0.02

_T71 = "Shigley 9th ed. Table 7-1"
_CP = "common practice, no source"

#: First-iteration Kt of non-shoulder features: feature -> mode -> (Kt, source).
FEATURE_KT: Mapping[Feature, Mapping[LoadMode, tuple[float, str]]] = MappingProxyType(
    {
        Feature.PLAIN: MappingProxyType(
            {m: (1.0, "plain section, no stress raiser") for m in LoadMode}
        ),
        Feature.KEYSEAT_END_MILL: MappingProxyType(
            {
                LoadMode.BENDING: (2.14, _T71),
                LoadMode.TORSION: (3.0, _T71),
                LoadMode.AXIAL: (2.14, f"bending value reused, {_CP}"),
            }
        ),
        Feature.KEYSEAT_SLED_RUNNER: MappingProxyType(
            {
                LoadMode.BENDING: (1.7, _T71),
                LoadMode.TORSION: (3.0, f"end-milled keyseat value reused, {_CP}"),
                LoadMode.AXIAL: (1.7, f"bending value reused, {_CP}"),
            }
        ),
        Feature.RETAINING_RING_GROOVE: MappingProxyType(
            {
                LoadMode.BENDING: (5.0, _T71),
                LoadMode.TORSION: (3.0, _T71),
                LoadMode.AXIAL: (5.0, _T71),
            }
        ),
        Feature.PRESS_FIT: MappingProxyType(
            {
                LoadMode.BENDING: (2.0, f"fretting at a press fit, applied as Kf, {_CP}"),
                LoadMode.TORSION: (1.5, f"fretting at a press fit, applied as Kf, {_CP}"),
                LoadMode.AXIAL: (2.0, f"fretting at a press fit, applied as Kf, {_CP}"),
            }
        ),
    }
)

SHOULDER_SOURCE = (
    "Norton, Machine Design, App. C Figs. C-1/C-2/C-3 power-law fits to Peterson's "
    "charts, linear in D/d between rows"
)

# Kuhn-Hardrath sqrt(a) cubic fits of Shigley eq. 6-35 (Sut in kpsi, sqrt(a) in sqrt(in)).
_NEUBER_BENDING = (0.246, -3.08e-3, 1.51e-5, -2.67e-8)
_NEUBER_TORSION = (0.190, -2.51e-3, 1.35e-5, -2.67e-8)
NEUBER_SUT_MIN_KPSI = 50.0
NEUBER_SUT_MAX_KPSI = 250.0


def _mode(mode: LoadMode | str) -> LoadMode:
    try:
        return LoadMode(mode)
    except ValueError:
        raise ValueError(
            f"unknown load mode {mode!r}; expected one of {[m.value for m in LoadMode]}"
        ) from None


def _feature(feature: Feature | str) -> Feature:
    try:
        return Feature(feature)
    except ValueError:
        raise ValueError(
            f"unknown shaft feature {feature!r}; expected one of {[f.value for f in Feature]}"
        ) from None


def _shoulder_kt(D_over_d: float, r_over_d: float, mode: LoadMode) -> tuple[float, tuple[str, ...]]:
    """Shoulder Kt [-] and the range notes (see :func:`shoulder_fillet_kt`)."""
    if not (math.isfinite(D_over_d) and D_over_d > 1.0):
        raise ModelError(
            f"shoulder with D/d = {D_over_d:g} is not a step up",
            expected="D/d > 1",
        )
    if not (math.isfinite(r_over_d) and r_over_d > 0.0):
        raise ModelError(
            f"shoulder fillet r/d = {r_over_d:g}: a fillet radius is needed",
            expected="r/d > 0",
        )
    rows = _SHOULDER_FITS[mode]
    notes: list[str] = []
    rd = r_over_d
    if rd > R_OVER_D_MAX:
        notes.append(
            f"{mode.value} Kt: r/d = {rd:.4g} above the charts' {R_OVER_D_MAX}; "
            f"clamped to {R_OVER_D_MAX} (conservative)"
        )
        rd = R_OVER_D_MAX
    elif rd < R_OVER_D_MIN:
        notes.append(
            f"{mode.value} Kt: r/d = {rd:.4g} below {R_OVER_D_MIN}; power-law fit extrapolated"
        )
    Dd = D_over_d
    if Dd < rows[0][0]:
        notes.append(
            f"{mode.value} Kt: D/d = {Dd:.4g} below the lowest row {rows[0][0]}; "
            "that row used (conservative)"
        )
        Dd = rows[0][0]
    elif Dd > rows[-1][0]:
        notes.append(
            f"{mode.value} Kt: D/d = {Dd:.4g} above the highest row {rows[-1][0]}; that row used"
        )
        Dd = rows[-1][0]
    kts = [A * rd**b for (_, A, b) in rows]
    kt = 0.0
    for i in range(len(rows) - 1):
        lo, hi = rows[i][0], rows[i + 1][0]
        if lo <= Dd <= hi:
            w = (Dd - lo) / (hi - lo)
            kt = (1.0 - w) * kts[i] + w * kts[i + 1]
            break
    else:  # pragma: no cover - Dd is inside [rows[0], rows[-1]] by construction
        raise AssertionError("D/d interpolation fell through")
    for n in notes:
        _log.warning(n)
    return max(kt, 1.0), tuple(notes)


def shoulder_fillet_kt(D_over_d: float, r_over_d: float, mode: LoadMode | str) -> float:
    """Theoretical stress concentration factor Kt [-] at a round-shaft shoulder fillet.

    Norton's power-law fits Kt = A*(r/d)^b to Peterson's charts, linear in D/d between
    rows; range handling as in the module docstring (clamps are logged as warnings).

    Parameters
    ----------
    D_over_d:
        Large over small diameter [-], > 1.
    r_over_d:
        Fillet radius over small diameter [-], > 0.
    mode:
        ``"bending"``, ``"torsion"`` or ``"axial"`` (nominal stress on the small diameter).

    Returns
    -------
    float
        Kt [-] (>= 1).

    Raises
    ------
    ModelError
        D/d <= 1 or r/d <= 0.
    ValueError
        Unknown mode.
    """
    return _shoulder_kt(float(D_over_d), float(r_over_d), _mode(mode))[0]


def feature_kt(feature: Feature | str, mode: LoadMode | str) -> float:
    """First-iteration Kt [-] of a non-shoulder feature (table :data:`FEATURE_KT`).

    Parameters
    ----------
    feature:
        A :class:`Feature` value other than ``"shoulder"``.
    mode:
        ``"bending"``, ``"torsion"`` or ``"axial"``.

    Returns
    -------
    float
        Kt [-]; for ``"press_fit"`` this is used directly as Kf.

    Raises
    ------
    ValueError
        Unknown feature or mode, or ``"shoulder"`` (use :func:`shoulder_fillet_kt`).
    """
    f = _feature(feature)
    m = _mode(mode)
    if f is Feature.SHOULDER:
        raise ValueError("a shoulder's Kt depends on D/d and r/d: use shoulder_fillet_kt")
    return FEATURE_KT[f][m][0]


def neuber_sqrt_a_sqrt_in(Sut_MPa: float, mode: LoadMode | str) -> float:
    """Kuhn-Hardrath Neuber characteristic length sqrt(a) [sqrt(in)] (Shigley eq. 6-35).

    Parameters
    ----------
    Sut_MPa:
        Ultimate tensile strength [MPa]; converted to kpsi and clamped to the fit's
        50..250 kpsi span (warning logged when clamped).
    mode:
        ``"bending"`` and ``"axial"`` use eq. 6-35a, ``"torsion"`` eq. 6-35b.

    Returns
    -------
    float
        sqrt(a) [in^0.5]; multiply by sqrt(25.4) for mm^0.5.
    """
    m = _mode(mode)
    if not (math.isfinite(Sut_MPa) and Sut_MPa > 0.0):
        raise ModelError(f"Sut = {Sut_MPa:g} MPa", expected="Sut > 0")
    s = Sut_MPa * KPSI_PER_MPA
    if not NEUBER_SUT_MIN_KPSI <= s <= NEUBER_SUT_MAX_KPSI:
        _log.warning(
            "notch sensitivity: Sut = %.4g MPa outside the Kuhn-Hardrath fit "
            "(345..1724 MPa); clamped",
            Sut_MPa,
        )
        s = min(max(s, NEUBER_SUT_MIN_KPSI), NEUBER_SUT_MAX_KPSI)
    c0, c1, c2, c3 = _NEUBER_TORSION if m is LoadMode.TORSION else _NEUBER_BENDING
    return c0 + c1 * s + c2 * s**2 + c3 * s**3


def notch_sensitivity(r_mm: float, Sut_MPa: float, mode: LoadMode | str) -> float:
    """Notch sensitivity q [-] from Neuber's equation (Shigley eq. 6-34).

    q = 1 / (1 + sqrt(a)/sqrt(r)), sqrt(a) from :func:`neuber_sqrt_a_sqrt_in`,
    r converted to inches.

    Parameters
    ----------
    r_mm:
        Notch root radius [mm], > 0.
    Sut_MPa:
        Ultimate tensile strength [MPa].
    mode:
        ``"bending"``, ``"axial"`` (same fit) or ``"torsion"``.

    Returns
    -------
    float
        q [-] in (0, 1).
    """
    if not (math.isfinite(r_mm) and r_mm > 0.0):
        raise ModelError(f"notch radius {r_mm:g} mm", expected="r > 0 mm")
    sqrt_a = neuber_sqrt_a_sqrt_in(Sut_MPa, mode)
    if sqrt_a <= 0.0:
        # the Kuhn-Hardrath fits reach zero for very high Sut: full notch sensitivity
        _log.warning("notch sensitivity: Neuber constant <= 0 at Sut = %g MPa (%s); "
                       "q = 1 used (full notch sensitivity, conservative)", Sut_MPa, mode)
        return 1.0
    return 1.0 / (1.0 + sqrt_a / math.sqrt(r_mm / MM_PER_INCH))


def fatigue_notch_factor(Kt: float, q: float) -> float:
    """Fatigue stress concentration factor Kf = 1 + q (Kt - 1) [-] (Shigley eq. 6-32).

    Parameters
    ----------
    Kt:
        Theoretical factor [-], >= 1.
    q:
        Notch sensitivity [-], 0..1.

    Returns
    -------
    float
        Kf [-].
    """
    if Kt < 1.0 or not 0.0 <= q <= 1.0:
        raise ModelError(f"Kt = {Kt:g}, q = {q:g}", expected="Kt >= 1 and 0 <= q <= 1")
    return 1.0 + q * (Kt - 1.0)


@dataclass(frozen=True, slots=True)
class NotchFactors:
    """The full chain Kt -> q -> Kf at one section, for bending, torsion and axial load.

    Attributes
    ----------
    feature: the stress raiser.
    Kt, Kts, Kt_axial: theoretical factors in bending, torsion, axial [-].
    q, qs, q_axial: notch sensitivities [-] (1 where no radius is known or for press fits).
    Kf, Kfs, Kf_axial: fatigue notch factors [-].
    r_mm: notch radius used for q [mm], ``None`` when q = 1 was taken.
    D_over_d, r_over_d: shoulder geometry [-] (``None`` for other features).
    source: where the Kt values come from.
    notes: range clamps and assumptions, for the report.
    """

    feature: Feature
    Kt: float
    Kts: float
    Kt_axial: float
    q: float
    qs: float
    q_axial: float
    Kf: float
    Kfs: float
    Kf_axial: float
    r_mm: float | None
    D_over_d: float | None
    r_over_d: float | None
    source: str
    notes: tuple[str, ...] = ()


def notch_factors(
    feature: Feature | str,
    Sut_MPa: float,
    *,
    d_mm: float,
    D_mm: float | None = None,
    r_mm: float | None = None,
) -> NotchFactors:
    """Kt, q and Kf in bending, torsion and axial load at one shaft feature.

    Parameters
    ----------
    feature:
        A :class:`Feature` value.
    Sut_MPa:
        Ultimate tensile strength [MPa] (for q).
    d_mm:
        Small (section) diameter [mm].
    D_mm:
        Large diameter of a shoulder [mm] (required for ``"shoulder"``).
    r_mm:
        Notch root radius [mm]: the fillet radius of a shoulder (required), the keyseat
        bottom radius (default 0.02*d, the r/d of Shigley's estimate), the groove root
        radius of a retaining-ring groove (default ``None`` = q = 1, conservative).
        Ignored for ``"plain"`` and ``"press_fit"`` (q = 1).

    Returns
    -------
    NotchFactors

    Raises
    ------
    ModelError
        Missing or impossible geometry.
    ValueError
        Unknown feature.
    """
    f = _feature(feature)
    if not (math.isfinite(d_mm) and d_mm > 0.0):
        raise ModelError(f"section diameter {d_mm:g} mm", expected="d > 0 mm")
    notes: list[str] = []
    D_over_d: float | None = None
    r_over_d: float | None = None
    kt: dict[LoadMode, float] = {}
    if f is Feature.SHOULDER:
        if D_mm is None or r_mm is None:
            raise ModelError(
                "a shoulder needs its large diameter and fillet radius",
                expected="D_mm and r_mm given",
            )
        D_over_d = D_mm / d_mm
        r_over_d = r_mm / d_mm
        for m in LoadMode:
            kt[m], n = _shoulder_kt(D_over_d, r_over_d, m)
            notes.extend(n)
        source = SHOULDER_SOURCE
        radius: float | None = r_mm
    else:
        for m in LoadMode:
            kt[m], src = FEATURE_KT[f][m]
            notes.append(f"{m.value} Kt = {kt[m]:g}: {src}")
        source = "first-iteration estimates (see notes)"
        if f in (Feature.KEYSEAT_END_MILL, Feature.KEYSEAT_SLED_RUNNER):
            radius = r_mm if r_mm is not None else KEYSEAT_R_OVER_D * d_mm
        elif f is Feature.RETAINING_RING_GROOVE:
            radius = r_mm
            if radius is None:
                notes.append("groove root radius not given: q = 1 (conservative)")
        else:
            radius = None
    if radius is None:
        q = {m: 1.0 for m in LoadMode}
    else:
        q = {m: notch_sensitivity(radius, Sut_MPa, m) for m in LoadMode}
    kf = {m: fatigue_notch_factor(kt[m], q[m]) for m in LoadMode}
    return NotchFactors(
        feature=f,
        Kt=kt[LoadMode.BENDING],
        Kts=kt[LoadMode.TORSION],
        Kt_axial=kt[LoadMode.AXIAL],
        q=q[LoadMode.BENDING],
        qs=q[LoadMode.TORSION],
        q_axial=q[LoadMode.AXIAL],
        Kf=kf[LoadMode.BENDING],
        Kfs=kf[LoadMode.TORSION],
        Kf_axial=kf[LoadMode.AXIAL],
        r_mm=radius,
        D_over_d=D_over_d,
        r_over_d=r_over_d,
        source=source,
        notes=tuple(notes),
    )
