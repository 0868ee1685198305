"""Shaft fatigue and first-cycle yield at one section (Shigley, chapters 6 and 7).

Units: stresses and strengths MPa, lengths mm, moments and torques N*mm, forces N,
temperatures degC. All published tables are typed in from memory of Shigley's
*Mechanical Engineering Design*, 9th ed. (chapter 6 unless said otherwise).

Chain
-----
1. Endurance limit of the test specimen Se' = 0.5 Sut (Sut <= 1400 MPa), else 700 MPa
   (eq. 6-8; steels).
2. Marin factors (eq. 6-18) Se = ka kb kc kd ke kf Se':
   ka surface (eq. 6-19, Table 6-2), kb size for rotating round bars (eq. 6-20),
   kc load (eq. 6-26), kd temperature (eq. 6-27 fit or Table 6-4), ke reliability
   (Table 6-5, ke = 1 - 0.08 za), kf miscellaneous (default 1).
3. Load classes over the duty-cycle cases (:func:`classify_section_loads`).
4. Stresses with Kf applied to alternating *and* mean parts (Shigley ch. 7's
   conservative practice), combined by von Mises (eqs. 6-66/6-67, 7-5/7-6):

       sigma_a' = sqrt((Kf sigma_b,a + Kf_ax sigma_ax,a / 0.85)^2 + 3 (Kfs tau_a)^2)
       sigma_m' = sqrt((Kf sigma_b,m + Kf_ax sigma_ax,m)^2 + 3 (Kfs tau_m)^2)

   The alternating axial part alone is divided by kc,axial = 0.85, so Se must be the
   *bending* endurance limit (kc = 1); torsion's kc = 0.59 is not used (von Mises
   accounts for it). Bending and axial parts are added in magnitude (the worst
   fibre; a compressive mean axial stress is treated like a tensile one, conservative).
5. Fatigue criteria on (sigma_a', sigma_m') (Shigley eqs. 7-7, 7-8 generalised,
   Table 6-7): DE-Goodman, DE-ASME elliptic, DE-Gerber.
6. First-cycle yield (eq. 7-15): sigma'_max = sqrt((sigma_a + sigma_m)^2 +
   3 (tau_a + tau_m)^2) with bending and axial summed (no 0.85), Kf applied;
   n_y = Sy / sigma'_max. The quick, more conservative check Sy / (sigma_a' + sigma_m')
   (eq. 7-16) is reported as well.
"""

from __future__ import annotations

import itertools
import logging
import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from enum import StrEnum
from statistics import NormalDist
from types import MappingProxyType

from shaftsys.checks.stress_concentration import LoadMode, NotchFactors
from shaftsys.errors import ModelError

_log = logging.getLogger(__name__)

# --------------------------------------------------------------------------------------
# Endurance limit and Marin factors
# --------------------------------------------------------------------------------------

#: Sut above which Se' stops growing [MPa] (Shigley eq. 6-8).
SE_PRIME_SUT_KNEE_MPA = 1400.0
SE_PRIME_CAP_MPA = 700.0


class SurfaceFinish(StrEnum):
    """Surface finish classes of Shigley's surface factor table."""

    GROUND = "ground"
    MACHINED = "machined"
    COLD_DRAWN = "cold_drawn"
    HOT_ROLLED = "hot_rolled"
    AS_FORGED = "as_forged"


#: Surface factor ka = a * Sut[MPa]^b: table name -> finish -> (a [MPa^-b], b).
#: ``"shigley9"``: Shigley 9th ed. Table 6-2 (from memory; the kpsi column is
#: 1.34/2.70/14.4/39.9 with the same exponents). ``"shigley10"``: the refit printed in
#: the 10th ed. Table 6-2 (from memory; kpsi column 1.21/2.00/11.0/12.7).
SURFACE_FACTOR_TABLES: Mapping[str, Mapping[SurfaceFinish, tuple[float, float]]] = MappingProxyType(
    {
        "shigley9": MappingProxyType(
            {
                SurfaceFinish.GROUND: (1.58, -0.085),
                SurfaceFinish.MACHINED: (4.51, -0.265),
                SurfaceFinish.COLD_DRAWN: (4.51, -0.265),
                SurfaceFinish.HOT_ROLLED: (57.7, -0.718),
                SurfaceFinish.AS_FORGED: (272.0, -0.995),
            }
        ),
        "shigley10": MappingProxyType(
            {
                SurfaceFinish.GROUND: (1.38, -0.067),
                SurfaceFinish.MACHINED: (3.04, -0.217),
                SurfaceFinish.COLD_DRAWN: (3.04, -0.217),
                SurfaceFinish.HOT_ROLLED: (38.6, -0.650),
                SurfaceFinish.AS_FORGED: (54.9, -0.758),
            }
        ),
    }
)

#: Shigley 9th ed. Table 6-5 (from memory): reliability -> ke.
RELIABILITY_FACTOR_TABLE: Mapping[float, float] = MappingProxyType(
    {
        0.50: 1.000,
        0.90: 0.897,
        0.95: 0.868,
        0.99: 0.814,
        0.999: 0.753,
        0.9999: 0.702,
        0.99999: 0.659,
        0.999999: 0.620,
    }
)

#: Shigley 9th ed. Table 6-4 (from memory): temperature [degC] -> S_T/S_RT.
TEMPERATURE_FACTOR_TABLE_C: tuple[tuple[float, float], ...] = (
    (20.0, 1.000),
    (50.0, 1.010),
    (100.0, 1.020),
    (150.0, 1.025),
    (200.0, 1.020),
    (250.0, 1.000),
    (300.0, 0.975),
    (350.0, 0.943),
    (400.0, 0.900),
    (450.0, 0.843),
    (500.0, 0.768),
    (550.0, 0.672),
    (600.0, 0.549),
)

#: Span of Shigley's eq. 6-27 temperature fit, 70..1000 degF, in degC.
KD_FIT_MIN_C = (70.0 - 32.0) / 1.8
KD_FIT_MAX_C = (1000.0 - 32.0) / 1.8

#: Span of Shigley's size factor for rotating round bars [mm] (eq. 6-20).
KB_D_MIN_MM = 2.79
KB_D_KNEE_MM = 51.0
KB_D_MAX_MM = 254.0

#: Load factor kc (Shigley eq. 6-26).
LOAD_FACTOR: Mapping[LoadMode, float] = MappingProxyType(
    {LoadMode.BENDING: 1.0, LoadMode.AXIAL: 0.85, LoadMode.TORSION: 0.59}
)
KC_AXIAL = LOAD_FACTOR[LoadMode.AXIAL]


def _positive(value: float, name: str, unit: str) -> float:
    v = float(value)
    if not (math.isfinite(v) and v > 0.0):
        raise ModelError(f"{name} = {v:g} {unit}", expected=f"{name} > 0 {unit}")
    return v


def endurance_limit_prime(Sut_MPa: float) -> float:
    """Rotating-beam endurance limit estimate Se' [MPa] of a steel (Shigley eq. 6-8).

    Parameters
    ----------
    Sut_MPa:
        Ultimate tensile strength [MPa].

    Returns
    -------
    float
        0.5 Sut for Sut <= 1400 MPa, else 700 MPa.
    """
    s = _positive(Sut_MPa, "Sut", "MPa")
    return 0.5 * s if s <= SE_PRIME_SUT_KNEE_MPA else SE_PRIME_CAP_MPA


def surface_factor(Sut_MPa: float, finish: SurfaceFinish | str, table: str = "shigley9") -> float:
    """Marin surface factor ka = a Sut^b [-] (Shigley eq. 6-19, Table 6-2).

    Parameters
    ----------
    Sut_MPa:
        Ultimate tensile strength [MPa].
    finish:
        ``"ground"``, ``"machined"``, ``"cold_drawn"``, ``"hot_rolled"``, ``"as_forged"``.
    table:
        ``"shigley9"`` (default) or ``"shigley10"``, see :data:`SURFACE_FACTOR_TABLES`.

    Returns
    -------
    float
        ka [-], capped at 1 (the fit exceeds 1 for soft ground steel; cap: common
        practice, no source).
    """
    s = _positive(Sut_MPa, "Sut", "MPa")
    try:
        f = SurfaceFinish(finish)
    except ValueError:
        raise ValueError(
            f"unknown surface finish {finish!r}; expected one of {[x.value for x in SurfaceFinish]}"
        ) from None
    if table not in SURFACE_FACTOR_TABLES:
        raise ValueError(
            f"unknown surface factor table {table!r}; expected one of "
            f"{sorted(SURFACE_FACTOR_TABLES)}"
        )
    a, b = SURFACE_FACTOR_TABLES[table][f]
    return min(1.0, a * s**b)


def size_factor(d_mm: float) -> float:
    """Marin size factor kb [-] of a rotating round bar in bending or torsion (eq. 6-20).

    kb = 1.24 d^-0.107 for 2.79 <= d <= 51 mm, 1.51 d^-0.157 for 51 < d <= 254 mm.
    Above 254 mm the 254 mm value (0.633) is used with a warning; Shigley quotes
    0.60..0.75 for larger sections, so this is near the conservative end. For axial loading
    Shigley takes kb = 1 (the caller's choice; this function does not know the mode).
    For a non-rotating bar pass :func:`equivalent_diameter_nonrotating_round`.

    Parameters
    ----------
    d_mm:
        Diameter [mm].

    Returns
    -------
    float
        kb [-].

    Raises
    ------
    ModelError
        d < 2.79 mm (outside the fit).
    """
    d = _positive(d_mm, "d", "mm")
    if d < KB_D_MIN_MM:
        raise ModelError(
            f"size factor: d = {d:g} mm below the fit's range",
            expected=f"{KB_D_MIN_MM} <= d mm",
        )
    if d > KB_D_MAX_MM:
        _log.warning("size factor: d = %.4g mm above 254 mm; 254 mm value used", d)
        d = KB_D_MAX_MM
    if d <= KB_D_KNEE_MM:
        return 1.24 * d**-0.107
    return 1.51 * d**-0.157


def equivalent_diameter_nonrotating_round(d_mm: float) -> float:
    """Equivalent diameter de = 0.370 d [mm] of a non-rotating round bar in bending.

    Shigley eq. 6-24 (95 % stress area equivalence), from memory.

    Parameters
    ----------
    d_mm:
        Diameter [mm].

    Returns
    -------
    float
        de [mm] to pass to :func:`size_factor`.
    """
    return 0.370 * _positive(d_mm, "d", "mm")


def load_factor(mode: LoadMode | str) -> float:
    """Marin load factor kc [-]: 1 bending, 0.85 axial, 0.59 torsion (eq. 6-26).

    Not used with the von Mises combination of :func:`section_stresses` except for the
    alternating axial part (divided by 0.85 there).

    Parameters
    ----------
    mode:
        ``"bending"``, ``"axial"`` or ``"torsion"``.

    Returns
    -------
    float
        kc [-].
    """
    try:
        return LOAD_FACTOR[LoadMode(mode)]
    except ValueError:
        raise ValueError(
            f"unknown load mode {mode!r}; expected one of {[m.value for m in LoadMode]}"
        ) from None


def temperature_factor(temperature_C: float, method: str = "fit") -> float:
    """Marin temperature factor kd = S_T/S_RT [-].

    ``"fit"``: Shigley eq. 6-27, kd = 0.975 + 0.432e-3 T - 0.115e-5 T^2 + 0.104e-8 T^3
    - 0.595e-12 T^4 with T in degF, 70 <= T <= 1000 degF (21.1..537.8 degC).
    ``"table"``: linear interpolation of Table 6-4 (20..600 degC).
    Below the span kd = 1 (room-temperature value; low-temperature embrittlement is
    not covered). Above it: :class:`ModelError` (creep range). Use kd = 1 when Sut is
    already the strength at temperature.

    Parameters
    ----------
    temperature_C:
        Operating temperature [degC].
    method:
        ``"fit"`` (default) or ``"table"``.

    Returns
    -------
    float
        kd [-].
    """
    t = float(temperature_C)
    if not math.isfinite(t):
        raise ModelError(f"temperature {t!r}", expected="a finite temperature in degC")
    if method == "fit":
        if t > KD_FIT_MAX_C:
            raise ModelError(f"temperature {t:g} degC above the kd fit", expected="T <= 537.8 degC")
        if t <= KD_FIT_MIN_C:
            return 1.0
        tf = 1.8 * t + 32.0
        return 0.975 + 0.432e-3 * tf - 0.115e-5 * tf**2 + 0.104e-8 * tf**3 - 0.595e-12 * tf**4
    if method == "table":
        rows = TEMPERATURE_FACTOR_TABLE_C
        if t > rows[-1][0]:
            raise ModelError(f"temperature {t:g} degC above Table 6-4", expected="T <= 600 degC")
        if t <= rows[0][0]:
            return 1.0
        for (t0, k0), (t1, k1) in itertools.pairwise(rows):
            if t0 <= t <= t1:
                return k0 + (k1 - k0) * (t - t0) / (t1 - t0)
        raise AssertionError("temperature interpolation fell through")  # pragma: no cover
    raise ValueError(f"unknown temperature factor method {method!r}; expected 'fit' or 'table'")


def reliability_factor(reliability: float) -> float:
    """Marin reliability factor ke [-] (Shigley Table 6-5, ke = 1 - 0.08 za).

    Table values are returned at the table's reliabilities (0.5, 0.9, 0.95, ...,
    0.999999); elsewhere ke = 1 - 0.08 za with za the standard normal variate
    (scipy.stats.norm.ppf(R)); the table is that formula rounded to 3 decimals.

    Parameters
    ----------
    reliability:
        Required reliability [-], 0.5 <= R < 1.

    Returns
    -------
    float
        ke [-].
    """
    r = float(reliability)
    if not 0.5 <= r < 1.0:
        raise ModelError(f"reliability {r:g}", expected="0.5 <= reliability < 1")
    for key, value in RELIABILITY_FACTOR_TABLE.items():
        if abs(r - key) < 1e-12:
            return value
    return 1.0 - 0.08 * NormalDist().inv_cdf(r)  # the standard normal quantile


@dataclass(frozen=True, slots=True)
class MarinFactors:
    """Endurance limit chain Se = ka kb kc kd ke kf Se' [MPa].

    Attributes
    ----------
    Sut_MPa: ultimate tensile strength [MPa].
    Se_prime_MPa: specimen endurance limit [MPa].
    ka, kb, kc, kd, ke, kf: Marin factors [-] (kf = miscellaneous effects).
    Se_MPa: corrected endurance limit [MPa].
    finish, surface_table: inputs of ka.
    d_mm: diameter used for kb [mm].
    temperature_C: temperature used for kd [degC].
    reliability: reliability used for ke [-].
    """

    Sut_MPa: float
    Se_prime_MPa: float
    ka: float
    kb: float
    kc: float
    kd: float
    ke: float
    kf: float
    Se_MPa: float
    finish: SurfaceFinish
    surface_table: str
    d_mm: float
    temperature_C: float
    reliability: float


def marin_endurance_limit(
    Sut_MPa: float,
    d_mm: float,
    finish: SurfaceFinish | str,
    *,
    reliability: float,
    temperature_C: float = 20.0,
    kc: float = 1.0,
    kf_misc: float = 1.0,
    surface_table: str = "shigley9",
    temperature_method: str = "fit",
    Se_prime_MPa: float | None = None,
) -> MarinFactors:
    """Corrected endurance limit of a rotating round shaft section (Shigley eq. 6-18).

    Parameters
    ----------
    Sut_MPa:
        Ultimate tensile strength [MPa].
    d_mm:
        Section diameter for kb [mm] (rotating bar; pass an equivalent diameter for
        other cases).
    finish:
        Surface finish (see :func:`surface_factor`).
    reliability:
        Required reliability [-] for ke.
    temperature_C:
        Operating temperature [degC] for kd (default 20 = room temperature, kd = 1).
    kc:
        Load factor [-]; keep 1 (bending) for :func:`section_stresses`, which handles
        axial and torsion itself.
    kf_misc:
        Miscellaneous-effects factor [-] (corrosion, plating...), default 1.
    surface_table:
        ``"shigley9"`` or ``"shigley10"``.
    temperature_method:
        ``"fit"`` or ``"table"``.
    Se_prime_MPa:
        Measured specimen endurance limit [MPa]; ``None`` = estimate from Sut.

    Returns
    -------
    MarinFactors
    """
    sut = _positive(Sut_MPa, "Sut", "MPa")
    se_p = (
        endurance_limit_prime(sut)
        if Se_prime_MPa is None
        else _positive(Se_prime_MPa, "Se'", "MPa")
    )
    if not 0.0 < kc <= 1.0 or not 0.0 < kf_misc <= 1.0:
        raise ModelError(f"kc = {kc:g}, kf = {kf_misc:g}", expected="0 < kc, kf <= 1")
    ka = surface_factor(sut, finish, surface_table)
    kb = size_factor(d_mm)
    kd = temperature_factor(temperature_C, temperature_method)
    ke = reliability_factor(reliability)
    return MarinFactors(
        Sut_MPa=sut,
        Se_prime_MPa=se_p,
        ka=ka,
        kb=kb,
        kc=kc,
        kd=kd,
        ke=ke,
        kf=kf_misc,
        Se_MPa=ka * kb * kc * kd * ke * kf_misc * se_p,
        finish=SurfaceFinish(finish),
        surface_table=surface_table,
        d_mm=float(d_mm),
        temperature_C=float(temperature_C),
        reliability=float(reliability),
    )


# --------------------------------------------------------------------------------------
# Load classes over the duty cycle
# --------------------------------------------------------------------------------------


@dataclass(frozen=True, slots=True)
class SectionCaseLoads:
    """Loads at one section of a *rotating* shaft in one duty-cycle case.

    Attributes
    ----------
    M_stationary_Nmm: magnitude of the resultant bending moment of the loads fixed in
        space (gear, belt, weight) [N*mm], >= 0. A rotating fibre sees it fully reversed.
    T_Nmm: torque at the section [N*mm], signed.
    F_axial_N: axial force at the section [N], signed, + = tension.
    M_corotating_Nmm: magnitude of the resultant bending moment of loads that turn with
        the shaft (unbalance, eccentric mass) [N*mm], >= 0: steady for the fibre.
    """

    M_stationary_Nmm: float
    T_Nmm: float
    F_axial_N: float = 0.0
    M_corotating_Nmm: float = 0.0


@dataclass(frozen=True, slots=True)
class LoadClasses:
    """Alternating (a) and mean (m) parts of the section loads over all cases.

    Attributes
    ----------
    M_a_Nmm, M_m_Nmm: bending moment amplitude and mean [N*mm] (>= 0).
    T_a_Nmm, T_m_Nmm: torque amplitude (>= 0) and mean (signed) [N*mm].
    F_a_N, F_m_N: axial force amplitude (>= 0) and mean (signed, + tension) [N].
    rule: the fluctuation rule used (``"reversal"`` or ``"range"``).
    """

    M_a_Nmm: float
    M_m_Nmm: float
    T_a_Nmm: float
    T_m_Nmm: float
    F_a_N: float = 0.0
    F_m_N: float = 0.0
    rule: str = "given"


FLUCTUATION_RULES = ("reversal", "range")


def _split(values: Sequence[float], rule: str) -> tuple[float, float]:
    """Amplitude and mean of a signed quantity over the cases."""
    hi, lo = max(values), min(values)
    if rule == "range" or (hi > 0.0 and lo < 0.0):
        return 0.5 * (hi - lo), 0.5 * (hi + lo)
    return 0.0, hi if abs(hi) >= abs(lo) else lo


def classify_section_loads(
    cases: Sequence[SectionCaseLoads], *, rule: str = "reversal"
) -> LoadClasses:
    """Alternating and mean section loads of a rotating shaft over the duty-cycle cases.

    Bending: a rotating shaft under loads fixed in space sees fully reversed bending,
    M_a = max over cases of ``M_stationary``; loads rotating with the shaft give steady
    bending, M_m = max over cases of ``M_corotating``. Taking the maxima of each part
    separately is an envelope (conservative).

    Torque and axial force (signed): rule ``"reversal"`` (default) treats them as mean
    (the value of largest magnitude over the cases) unless they change sign between
    cases, then amplitude = (max - min)/2 and mean = (max + min)/2. Rule ``"range"``
    always uses (max - min)/2 and (max + min)/2 (more conservative for a torque that
    fluctuates without reversing). Case-to-case changes are counted as if they
    happened every revolution (conservative; no cycle counting).

    Parameters
    ----------
    cases:
        One :class:`SectionCaseLoads` per case [N*mm, N], at least one.
    rule:
        ``"reversal"`` or ``"range"``.

    Returns
    -------
    LoadClasses
    """
    if rule not in FLUCTUATION_RULES:
        raise ValueError(f"unknown fluctuation rule {rule!r}; expected one of {FLUCTUATION_RULES}")
    if len(cases) == 0:
        raise ModelError("no load cases at the section", expected="at least one case")
    for c in cases:
        if c.M_stationary_Nmm < 0.0 or c.M_corotating_Nmm < 0.0:
            raise ModelError(
                "bending moments are resultant magnitudes",
                expected="M_stationary_Nmm >= 0 and M_corotating_Nmm >= 0",
            )
    T_a, T_m = _split([c.T_Nmm for c in cases], rule)
    F_a, F_m = _split([c.F_axial_N for c in cases], rule)
    return LoadClasses(
        M_a_Nmm=max(c.M_stationary_Nmm for c in cases),
        M_m_Nmm=max(c.M_corotating_Nmm for c in cases),
        T_a_Nmm=T_a,
        T_m_Nmm=T_m,
        F_a_N=F_a,
        F_m_N=F_m,
        rule=rule,
    )


# --------------------------------------------------------------------------------------
# Stresses
# --------------------------------------------------------------------------------------


@dataclass(frozen=True, slots=True)
class SectionStresses:
    """Stresses at the outer fibre of one section, Kf applied [MPa].

    Attributes
    ----------
    d_mm, bore_mm: outer and bore diameter [mm].
    Kf, Kfs, Kf_axial: fatigue notch factors used [-].
    sigma_b_a_MPa, sigma_b_m_MPa: bending stress amplitude and mean (Kf applied).
    tau_a_MPa, tau_m_MPa: torsional shear amplitude and mean (Kfs applied, magnitudes).
    sigma_ax_a_MPa, sigma_ax_m_MPa: axial stress amplitude and mean (Kf_axial applied,
        magnitudes; the 0.85 is *not* in these, only in ``sigma_vm_a_MPa``).
    sigma_vm_a_MPa, sigma_vm_m_MPa: von Mises alternating and mean stresses.
    sigma_vm_max_MPa: von Mises peak stress for the first-cycle yield check.
    """

    d_mm: float
    bore_mm: float
    Kf: float
    Kfs: float
    Kf_axial: float
    sigma_b_a_MPa: float
    sigma_b_m_MPa: float
    tau_a_MPa: float
    tau_m_MPa: float
    sigma_ax_a_MPa: float
    sigma_ax_m_MPa: float
    sigma_vm_a_MPa: float
    sigma_vm_m_MPa: float
    sigma_vm_max_MPa: float


def section_stresses(
    loads: LoadClasses,
    d_mm: float,
    *,
    Kf: float,
    Kfs: float,
    Kf_axial: float | None = None,
    bore_mm: float = 0.0,
) -> SectionStresses:
    """Alternating, mean and peak von Mises stresses at a (hollow) round section.

    sigma_b = Kf 32 M d / (pi (d^4 - di^4)), tau = Kfs 16 T d / (pi (d^4 - di^4)),
    sigma_ax = Kf_axial 4 F / (pi (d^2 - di^2)); combination as in the module docstring
    (axial alternating part divided by 0.85).

    Parameters
    ----------
    loads:
        Load classes [N*mm, N].
    d_mm:
        Outer diameter of the section [mm].
    Kf, Kfs:
        Fatigue notch factors in bending and torsion [-].
    Kf_axial:
        Fatigue notch factor in axial load [-]; ``None`` = ``Kf``.
    bore_mm:
        Bore diameter [mm], 0 for a solid shaft.

    Returns
    -------
    SectionStresses
    """
    d = _positive(d_mm, "d", "mm")
    di = float(bore_mm)
    if not 0.0 <= di < d:
        raise ModelError(f"bore {di:g} mm in a {d:g} mm section", expected="0 <= bore < d")
    kfa = Kf if Kf_axial is None else Kf_axial
    if min(Kf, Kfs, kfa) < 1.0:
        raise ModelError(f"Kf = {Kf:g}, Kfs = {Kfs:g}", expected="notch factors >= 1")
    j4 = math.pi * (d**4 - di**4)
    area = 0.25 * math.pi * (d**2 - di**2)
    sb_a = Kf * 32.0 * abs(loads.M_a_Nmm) * d / j4
    sb_m = Kf * 32.0 * abs(loads.M_m_Nmm) * d / j4
    t_a = Kfs * 16.0 * abs(loads.T_a_Nmm) * d / j4
    t_m = Kfs * 16.0 * abs(loads.T_m_Nmm) * d / j4
    sx_a = kfa * abs(loads.F_a_N) / area
    sx_m = kfa * abs(loads.F_m_N) / area
    vm_a = math.sqrt((sb_a + sx_a / KC_AXIAL) ** 2 + 3.0 * t_a**2)
    vm_m = math.sqrt((sb_m + sx_m) ** 2 + 3.0 * t_m**2)
    vm_max = math.sqrt((sb_a + sb_m + sx_a + sx_m) ** 2 + 3.0 * (t_a + t_m) ** 2)
    return SectionStresses(
        d_mm=d,
        bore_mm=di,
        Kf=Kf,
        Kfs=Kfs,
        Kf_axial=kfa,
        sigma_b_a_MPa=sb_a,
        sigma_b_m_MPa=sb_m,
        tau_a_MPa=t_a,
        tau_m_MPa=t_m,
        sigma_ax_a_MPa=sx_a,
        sigma_ax_m_MPa=sx_m,
        sigma_vm_a_MPa=vm_a,
        sigma_vm_m_MPa=vm_m,
        sigma_vm_max_MPa=vm_max,
    )


# --------------------------------------------------------------------------------------
# Safety factors
# --------------------------------------------------------------------------------------


class FatigueCriterion(StrEnum):
    """Fatigue failure criteria on von Mises alternating and mean stresses."""

    GOODMAN = "goodman"
    ASME_ELLIPTIC = "asme_elliptic"
    GERBER = "gerber"


def _criterion(criterion: FatigueCriterion | str) -> FatigueCriterion:
    try:
        return FatigueCriterion(criterion)
    except ValueError:
        raise ValueError(
            f"unknown fatigue criterion {criterion!r}; expected one of "
            f"{[c.value for c in FatigueCriterion]}"
        ) from None


def fatigue_safety_factor(
    sigma_a_MPa: float,
    sigma_m_MPa: float,
    *,
    Se_MPa: float,
    Sut_MPa: float,
    Sy_MPa: float | None = None,
    criterion: FatigueCriterion | str = FatigueCriterion.GOODMAN,
) -> float:
    """Fatigue safety factor n [-] (Shigley eqs. 7-8 and 7-10 generalised, Table 6-7).

    Goodman: 1/n = sa/Se + sm/Sut. ASME elliptic: n = 1/sqrt((sa/Se)^2 + (sm/Sy)^2).
    Gerber: n = (1/2)(Sut/sm)^2 (sa/Se)(-1 + sqrt(1 + (2 sm Se/(Sut sa))^2)),
    n = Se/sa when sm = 0 and Sut/sm when sa = 0.

    Parameters
    ----------
    sigma_a_MPa, sigma_m_MPa:
        Von Mises alternating and mean stresses [MPa], >= 0.
    Se_MPa:
        Corrected endurance limit [MPa].
    Sut_MPa:
        Ultimate tensile strength [MPa].
    Sy_MPa:
        Yield strength [MPa] (required for ``"asme_elliptic"``).
    criterion:
        ``"goodman"``, ``"asme_elliptic"`` or ``"gerber"``.

    Returns
    -------
    float
        n [-]; ``inf`` when both stresses are zero.
    """
    crit = _criterion(criterion)
    sa, sm = float(sigma_a_MPa), float(sigma_m_MPa)
    if sa < 0.0 or sm < 0.0:
        raise ModelError("von Mises stresses are magnitudes", expected=">= 0 MPa")
    se = _positive(Se_MPa, "Se", "MPa")
    sut = _positive(Sut_MPa, "Sut", "MPa")
    if sa == 0.0 and sm == 0.0:
        return math.inf
    if crit is FatigueCriterion.GOODMAN:
        return 1.0 / (sa / se + sm / sut)
    if crit is FatigueCriterion.ASME_ELLIPTIC:
        if Sy_MPa is None:
            raise ModelError("the ASME elliptic criterion needs Sy", expected="Sy_MPa given")
        sy = _positive(Sy_MPa, "Sy", "MPa")
        return 1.0 / math.sqrt((sa / se) ** 2 + (sm / sy) ** 2)
    if sm == 0.0:
        return se / sa
    if sa == 0.0:
        return sut / sm
    return (
        0.5
        * (sut / sm) ** 2
        * (sa / se)
        * (-1.0 + math.sqrt(1.0 + (2.0 * sm * se / (sut * sa)) ** 2))
    )


def yield_safety_factor(sigma_vm_max_MPa: float, Sy_MPa: float) -> float:
    """First-cycle yield safety factor n_y = Sy / sigma'_max [-] (Shigley eq. 7-15).

    Parameters
    ----------
    sigma_vm_max_MPa:
        Peak von Mises stress [MPa].
    Sy_MPa:
        Yield strength [MPa].

    Returns
    -------
    float
        n_y [-]; ``inf`` for zero stress.
    """
    sy = _positive(Sy_MPa, "Sy", "MPa")
    s = float(sigma_vm_max_MPa)
    if s < 0.0:
        raise ModelError("von Mises stress is a magnitude", expected=">= 0 MPa")
    return math.inf if s == 0.0 else sy / s


@dataclass(frozen=True, slots=True)
class FatigueCheck:
    """Everything behind the fatigue and yield safety factors of one section.

    Attributes
    ----------
    loads: load classes [N*mm, N].
    notch: Kt -> q -> Kf chain.
    marin: endurance limit chain [MPa].
    stresses: stresses [MPa].
    Sy_MPa: yield strength [MPa].
    criterion: criterion behind ``n_fatigue``.
    n_fatigue: safety factor by ``criterion`` [-].
    n_goodman, n_asme_elliptic, n_gerber: the three criteria [-].
    n_yield: Sy / sigma'_max [-] (eq. 7-15).
    n_yield_quick: Sy / (sigma_a' + sigma_m') [-] (eq. 7-16, more conservative).
    """

    loads: LoadClasses
    notch: NotchFactors
    marin: MarinFactors
    stresses: SectionStresses
    Sy_MPa: float
    criterion: FatigueCriterion
    n_fatigue: float
    n_goodman: float
    n_asme_elliptic: float
    n_gerber: float
    n_yield: float
    n_yield_quick: float


def check_section(
    loads: LoadClasses,
    d_mm: float,
    *,
    notch: NotchFactors,
    marin: MarinFactors,
    Sy_MPa: float,
    bore_mm: float = 0.0,
    criterion: FatigueCriterion | str = FatigueCriterion.GOODMAN,
) -> FatigueCheck:
    """Fatigue and first-cycle yield safety factors of one round shaft section.

    Parameters
    ----------
    loads:
        Load classes [N*mm, N] (see :func:`classify_section_loads`).
    d_mm:
        Outer diameter of the section [mm] (the small diameter at a shoulder).
    notch:
        Notch factors (see :func:`~shaftsys.checks.stress_concentration.notch_factors`).
    marin:
        Endurance limit chain (see :func:`marin_endurance_limit`, kc = 1).
    Sy_MPa:
        Yield strength [MPa], <= Sut.
    bore_mm:
        Bore diameter [mm], 0 for a solid shaft.
    criterion:
        Criterion reported as ``n_fatigue``.

    Returns
    -------
    FatigueCheck
    """
    crit = _criterion(criterion)
    sy = _positive(Sy_MPa, "Sy", "MPa")
    if sy > marin.Sut_MPa:
        raise ModelError(f"Sy = {sy:g} MPa above Sut = {marin.Sut_MPa:g} MPa", expected="Sy <= Sut")
    st = section_stresses(
        loads, d_mm, Kf=notch.Kf, Kfs=notch.Kfs, Kf_axial=notch.Kf_axial, bore_mm=bore_mm
    )
    kw = {"Se_MPa": marin.Se_MPa, "Sut_MPa": marin.Sut_MPa, "Sy_MPa": sy}
    sa, sm = st.sigma_vm_a_MPa, st.sigma_vm_m_MPa
    n = {c: fatigue_safety_factor(sa, sm, criterion=c, **kw) for c in FatigueCriterion}
    quick = math.inf if sa + sm == 0.0 else sy / (sa + sm)
    return FatigueCheck(
        loads=loads,
        notch=notch,
        marin=marin,
        stresses=st,
        Sy_MPa=sy,
        criterion=crit,
        n_fatigue=n[crit],
        n_goodman=n[FatigueCriterion.GOODMAN],
        n_asme_elliptic=n[FatigueCriterion.ASME_ELLIPTIC],
        n_gerber=n[FatigueCriterion.GERBER],
        n_yield=yield_safety_factor(st.sigma_vm_max_MPa, sy),
        n_yield_quick=quick,
    )
