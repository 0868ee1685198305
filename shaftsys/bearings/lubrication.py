"""Lubrication inputs of the ISO 281:2007 modified life: viscosity, kappa, ec, Cu, aISO.

* Walther relation (ASTM D341): log10(log10(nu + 0.7)) = A - B*log10(T_K).
* Reference viscosity nu1 (ISO 281:2007, 9.3.3):
  nu1 = 45000*n^-0.83*dm^-0.5 for n < 1000 rpm, nu1 = 4500*n^-0.5*dm^-0.5 for n >= 1000.
* kappa = nu/nu1; below 0.1 is outside the method (error), above 4 is taken as 4
  (ISO 281:2007 9.3.3).
* Contamination factor ec: a number, or the ISO 281:2007 Annex A formulas
  ec = min(1, c1*kappa^0.68*dm^0.55*(1 - c2/dm^(1/3))), constants per lubrication
  method and cleanliness level FROM MEMORY of the annex (see the tables below).
* Fatigue load limit Cu estimate (ISO 281:2007 Annex B simplified approach, from
  memory): ball C0/22, roller C0/8.2 for dm <= 100 mm; times (100/dm)^0.5 (ball) or
  (100/dm)^0.3 (roller) above.
* aISO (ISO 281:2007 9.3.2, Formulae for radial/thrust, ball/roller, three kappa ranges),
  capped at 50.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

import numpy as np
import numpy.typing as npt

from shaftsys.bearings._util import FloatArray
from shaftsys.errors import ModelError
from shaftsys.model.bearing import BearingKind

KELVIN = 273.15
WALTHER_C = 0.7
KAPPA_MIN = 0.1
KAPPA_MAX = 4.0
AISO_MAX = 50.0
#: ISO 281:2007 9.3.2 (from memory): with effective EP additives, for kappa < 1 and
#: ec >= 0.2, kappa = 1 may be used, aISO then limited to 3 (but not below normal aISO).
EP_AISO_MAX = 3.0
EP_EC_MIN = 0.2

#: ISO 281:2007 Annex A (FROM MEMORY): circulating oil with on-line filters.
#: ISO 4406 code (last two numbers) -> (c1, c2, minimum filter ratio beta_x of the row).
EC_CIRCULATING_FILTERED: dict[str, tuple[float, float, float]] = {
    "13/10": (0.0864, 0.5663, 200.0),  # beta_6(c) >= 200
    "15/12": (0.0432, 0.9987, 200.0),  # beta_12(c) >= 200
    "17/14": (0.0288, 1.6329, 75.0),  # beta_25(c) >= 75
    "19/16": (0.0216, 2.3362, 75.0),  # beta_40(c) >= 75
}
#: ISO 281:2007 Annex A (FROM MEMORY): oil without filtering or with off-line filters;
#: also used here for oil bath (assumption, verify against the annex).
EC_UNFILTERED: dict[str, tuple[float, float]] = {
    "13/10": (0.0864, 0.6796),
    "15/12": (0.0288, 1.141),
    "17/14": (0.0133, 1.67),
    "19/16": (0.00864, 2.5164),
    "21/18": (0.00411, 3.8974),
}
#: ISO 281:2007 Annex A (FROM MEMORY): grease lubrication by cleanliness level.
EC_GREASE: dict[str, tuple[float, float]] = {
    "high": (0.0864, 0.6796),
    "normal": (0.0432, 1.141),
    "slight_to_typical": (0.0177, 1.887),
    "severe": (0.0115, 2.662),
    "very_severe": (0.00617, 4.06),
}
EC_METHODS = ("circulating_filtered", "circulating_unfiltered", "oil_bath", "grease")

#: ISO 281:2007 Annex B simplified Cu (FROM MEMORY).
CU_DIVISOR_BALL = 22.0
CU_DIVISOR_ROLLER = 8.2
CU_DM_REF_MM = 100.0
CU_EXP_BALL = 0.5
CU_EXP_ROLLER = 0.3


def walther_constants(
    nu_a_mm2_s: float, t_a_C: float, nu_b_mm2_s: float, t_b_C: float
) -> tuple[float, float]:
    """Constants (A, B) of log10(log10(nu + 0.7)) = A - B*log10(T_K) from two points.

    Parameters
    ----------
    nu_a_mm2_s, nu_b_mm2_s:
        Kinematic viscosities [mm^2/s] at the two temperatures.
    t_a_C, t_b_C:
        The temperatures [degC].

    Returns
    -------
    (A, B):
        Walther constants [-] (T in kelvin).
    """
    if t_a_C == t_b_C:
        raise ModelError(
            "the two viscosity points need different temperatures",
            field="lubrication",
            expected="two distinct temperatures",
        )
    if not min(nu_a_mm2_s, nu_b_mm2_s) > 0.3:  # written so that NaN fails
        raise ModelError(
            "viscosity must exceed 0.3 mm^2/s for the Walther relation",
            field="lubrication",
            expected="nu > 0.3 mm^2/s",
        )
    za = math.log10(math.log10(nu_a_mm2_s + WALTHER_C))
    zb = math.log10(math.log10(nu_b_mm2_s + WALTHER_C))
    la = math.log10(t_a_C + KELVIN)
    lb = math.log10(t_b_C + KELVIN)
    B = -(zb - za) / (lb - la)
    if not B > 0.0:
        raise ModelError(
            "viscosity must fall as temperature rises",
            field="lubrication",
            expected="the hotter point with the lower viscosity",
        )
    return za + B * la, B


def viscosity_at(
    temperature_C: npt.ArrayLike,
    nu_a_mm2_s: float,
    t_a_C: float,
    nu_b_mm2_s: float,
    t_b_C: float,
) -> FloatArray:
    """Kinematic viscosity [mm^2/s] at ``temperature_C`` [degC] by the Walther relation.

    Parameters
    ----------
    temperature_C:
        Operating temperature(s) [degC].
    nu_a_mm2_s, t_a_C, nu_b_mm2_s, t_b_C:
        Two known (viscosity [mm^2/s], temperature [degC]) points.

    Returns
    -------
    numpy.ndarray
        nu [mm^2/s], shape of ``temperature_C``.
    """
    A, B = walther_constants(nu_a_mm2_s, t_a_C, nu_b_mm2_s, t_b_C)
    t = np.asarray(temperature_C, dtype=np.float64)
    if np.any(np.isfinite(t) & ~(t > -KELVIN)):
        raise ModelError(f"a case temperature is not above absolute zero (-{KELVIN} degC)",
                         field="cases.temperature",
                         expected=f"a temperature above -{KELVIN} degC")
    return np.atleast_1d(10.0 ** (10.0 ** (A - B * np.log10(t + KELVIN))) - WALTHER_C)


def reference_viscosity(speed_rpm: npt.ArrayLike, dm_mm: npt.ArrayLike) -> FloatArray:
    """ISO 281:2007 reference kinematic viscosity nu1 [mm^2/s].

    nu1 = 45000*n^-0.83*dm^-0.5 (n < 1000 rpm); nu1 = 4500*n^-0.5*dm^-0.5 (n >= 1000).

    Parameters
    ----------
    speed_rpm:
        Speed(s) [rpm] (sign ignored, must be non-zero).
    dm_mm:
        Mean diameter (d + D)/2 [mm] (an array broadcasts against ``speed_rpm``).

    Returns
    -------
    numpy.ndarray
        nu1 [mm^2/s].
    """
    n = np.abs(np.atleast_1d(np.asarray(speed_rpm, dtype=np.float64)))
    dm = np.asarray(dm_mm, dtype=np.float64)
    if not (np.all(n > 0.0) and np.all(dm > 0.0)):  # NaN fails too
        raise ValueError("reference viscosity needs n > 0 rpm and dm > 0 mm")
    slow = 45000.0 * n**-0.83 * dm**-0.5
    fast = 4500.0 * n**-0.5 * dm**-0.5
    return np.where(n < 1000.0, slow, fast)


def viscosity_ratio(nu_mm2_s: npt.ArrayLike, nu1_mm2_s: npt.ArrayLike) -> FloatArray:
    """Unclamped viscosity ratio kappa = nu/nu1 [-]."""
    return np.atleast_1d(np.asarray(nu_mm2_s, dtype=np.float64) / np.asarray(nu1_mm2_s))


def parse_iso4406(code: str) -> str:
    """Key ``"15/12"`` (the >=6 um and >=14 um numbers) of an ISO 4406 code.

    Accepts ``"-/15/12"``, ``"18/15/12"`` or ``"15/12"``.
    """
    parts = [p.strip() for p in re.split(r"/", code.strip())]
    if len(parts) == 3:
        parts = parts[1:]
    if len(parts) != 2 or not all(p.isdigit() for p in parts):
        raise ModelError(
            f"cannot read ISO 4406 code {code!r}",
            field="lubrication.cleanliness",
            expected="a code like -/15/12",
        )
    return f"{int(parts[0])}/{int(parts[1])}"


def contamination_constants(
    method: str, cleanliness: str | None, filtration_beta: float | None = None
) -> tuple[float, float, list[str]]:
    """(c1, c2, notes) of ISO 281:2007 Annex A for a lubrication method and level.

    Constants are FROM MEMORY of the annex. ``oil_bath`` uses the table for oil without
    filtering (assumption). For ``circulating_filtered`` the row is chosen by the ISO
    4406 code; a ``filtration_beta`` below the row's filter ratio adds a note.

    Parameters
    ----------
    method:
        One of :data:`EC_METHODS`.
    cleanliness:
        ISO 4406 code (oil) or a grease level ``high``, ``normal``,
        ``slight_to_typical``, ``severe``, ``very_severe``.
    filtration_beta:
        Filter ratio beta_x [-] of the on-line filter, or ``None``.

    Returns
    -------
    (c1, c2, notes)
    """
    notes: list[str] = []
    if cleanliness is None:
        raise ModelError(
            "contamination factor needs ec or a cleanliness level",
            field="lubrication.cleanliness",
            expected="ec, or cleanliness (ISO 4406 code, grease level)",
        )
    if method == "grease":
        key = cleanliness.strip().lower().replace(" ", "_").replace("-", "_")
        if key not in EC_GREASE:
            raise ModelError(
                f"unknown grease cleanliness level {cleanliness!r}",
                field="lubrication.cleanliness",
                expected=", ".join(EC_GREASE),
            )
        c1, c2 = EC_GREASE[key]
    elif method == "circulating_filtered":
        key = parse_iso4406(cleanliness)
        if key not in EC_CIRCULATING_FILTERED:
            raise ModelError(
                f"no ISO 281 Annex A row for code {cleanliness!r} with on-line filters",
                field="lubrication.cleanliness",
                expected=", ".join("-/" + k for k in EC_CIRCULATING_FILTERED),
            )
        c1, c2, beta_row = EC_CIRCULATING_FILTERED[key]
        if filtration_beta is not None and filtration_beta < beta_row:
            notes.append(
                f"filter ratio beta = {filtration_beta:g} below the {beta_row:g} that "
                f"ISO 281 Annex A pairs with -/{key}; ec may be optimistic"
            )
    elif method in ("circulating_unfiltered", "oil_bath"):
        key = parse_iso4406(cleanliness)
        if key not in EC_UNFILTERED:
            raise ModelError(
                f"no ISO 281 Annex A row for code {cleanliness!r} without filters",
                field="lubrication.cleanliness",
                expected=", ".join("-/" + k for k in EC_UNFILTERED),
            )
        c1, c2 = EC_UNFILTERED[key]
        if method == "oil_bath":
            notes.append(
                "oil bath: ec uses the ISO 281 Annex A constants for oil without "
                "filtering (assumption)"
            )
    else:
        raise ModelError(
            f"unknown lubrication method {method!r}",
            field="lubrication.method",
            expected=", ".join(EC_METHODS),
        )
    notes.append(
        f"ec from ISO 281:2007 Annex A ({method}, {cleanliness}): c1 = {c1:g}, c2 = {c2:g}"
    )
    return c1, c2, notes


def contamination_factor(
    c1: float, c2: float, kappa: npt.ArrayLike, dm_mm: npt.ArrayLike
) -> FloatArray:
    """ISO 281:2007 Annex A ec = c1*kappa^0.68*dm^0.55*(1 - c2/dm^(1/3)), in [0, 1].

    Parameters
    ----------
    c1, c2:
        Annex A constants of the lubrication method and cleanliness level.
    kappa:
        Viscosity ratio(s) [-] (already limited to <= 4).
    dm_mm:
        Mean diameter [mm] (an array broadcasts against ``kappa``).

    Returns
    -------
    numpy.ndarray
        ec [-].
    """
    k = np.atleast_1d(np.asarray(kappa, dtype=np.float64))
    dm = np.asarray(dm_mm, dtype=np.float64)
    ec = c1 * k**0.68 * dm**0.55 * (1.0 - c2 / dm ** (1.0 / 3.0))
    return np.clip(ec, 0.0, 1.0)


def estimate_fatigue_load_limit_arrays(
    C0_N: npt.ArrayLike, dm_mm: npt.ArrayLike, roller: npt.ArrayLike
) -> FloatArray:
    """Vectorised :func:`estimate_fatigue_load_limit`: Cu [N] per row.

    Parameters
    ----------
    C0_N:
        Basic static load ratings [N].
    dm_mm:
        Mean diameters [mm].
    roller:
        True for roller rows, False for ball rows.
    """
    C0 = np.asarray(C0_N, dtype=np.float64)
    dm = np.asarray(dm_mm, dtype=np.float64)
    rol = np.asarray(roller, dtype=bool)
    cu = np.where(rol, C0 / CU_DIVISOR_ROLLER, C0 / CU_DIVISOR_BALL)
    exp = np.where(rol, CU_EXP_ROLLER, CU_EXP_BALL)
    with np.errstate(divide="ignore", invalid="ignore"):
        scaled = cu * (CU_DM_REF_MM / dm) ** exp
    return np.where(dm > CU_DM_REF_MM, scaled, cu)


def estimate_fatigue_load_limit(C0_N: float, dm_mm: float, kind: BearingKind) -> float:
    """Fatigue load limit Cu [N] estimated from C0 (ISO 281:2007 Annex B, from memory).

    Ball: Cu = C0/22 (dm <= 100 mm), C0/22*(100/dm)^0.5 above.
    Roller: Cu = C0/8.2 (dm <= 100 mm), C0/8.2*(100/dm)^0.3 above.

    Parameters
    ----------
    C0_N:
        Basic static load rating [N].
    dm_mm:
        Mean diameter [mm].
    kind:
        Bearing type (ball or roller).

    Returns
    -------
    float
        Cu [N].
    """
    if kind.is_roller:
        cu = C0_N / CU_DIVISOR_ROLLER
        exp = CU_EXP_ROLLER
    else:
        cu = C0_N / CU_DIVISOR_BALL
        exp = CU_EXP_BALL
    if dm_mm > CU_DM_REF_MM:
        cu *= (CU_DM_REF_MM / dm_mm) ** exp
    return cu


@dataclass(frozen=True, eq=False)
class AisoTerms:
    """The part of aISO (ISO 281:2007 9.3.2) that depends on kappa and the type only.

    Built by :func:`a_iso_terms` for a kappa array; :func:`a_iso_apply` adds the load
    (ec*Cu/P). A design study builds it once per bearing and case and applies it to
    every variant: the same operations as :func:`a_iso_arrays`, so the same bits.

    ``roller_coef``: 1.5859 - c/kappa^q (None without roller rows); ``ball_coef``:
    (2.5671 - c/kappa^q)^0.83 (None without ball rows); ``roller``, ``thrust_ball``:
    the type masks as given.
    """

    roller_coef: FloatArray | None
    ball_coef: FloatArray | None
    roller: npt.NDArray[np.bool_]
    thrust_ball: npt.NDArray[np.bool_]
    all_roller: bool
    no_roller: bool


def a_iso_terms(kappa: npt.ArrayLike, roller: npt.ArrayLike, thrust_ball: npt.ArrayLike
                ) -> AisoTerms:
    """The kappa part of :func:`a_iso_arrays` (ValueError outside 0.1 <= kappa <= 4)."""
    k = np.atleast_1d(np.asarray(kappa, dtype=np.float64))
    if not np.all((k >= KAPPA_MIN - 1e-12) & (k <= KAPPA_MAX + 1e-12)):  # NaN fails too
        raise ValueError(f"aISO needs {KAPPA_MIN} <= kappa <= {KAPPA_MAX}, got {k}")
    rol = np.asarray(roller, dtype=bool)
    tb = np.asarray(thrust_ball, dtype=bool)
    all_roller, no_roller = bool(np.all(rol)), not bool(np.any(rol))
    low = k < 0.4
    mid = (k >= 0.4) & (k < 1.0)
    q = np.where(low, 0.054381, np.where(mid, 0.19087, 0.071739))
    # only the branch (roller / ball) that some row needs is evaluated
    coef_r = coef_b = None
    with np.errstate(invalid="ignore"):
        kq = k**q
        if not no_roller:
            coef_r = 1.5859 - np.where(low, 1.3993, 1.2348) / kq
        if not all_roller:
            coef_b = (2.5671 - np.where(low, 2.2649, 1.9987) / kq) ** 0.83
    return AisoTerms(coef_r, coef_b, rol, tb, all_roller, no_roller)


def a_iso_apply(terms: AisoTerms, ec_Cu_over_P: npt.ArrayLike, *,
                checked: bool = False) -> FloatArray:
    """The aISO [-] (at most 50) of ``terms`` at ec*Cu/P [-] (broadcast against the terms).

    Raises ValueError where ec*Cu/P is not >= 0 (NaN included), unless ``checked`` (the
    caller has made sure of it).
    """
    r = np.atleast_1d(np.asarray(ec_Cu_over_P, dtype=np.float64))
    if not checked and not np.all(r >= 0.0):
        raise ValueError("ec*Cu/P must be >= 0")
    t = terms
    with np.errstate(invalid="ignore"):
        if t.roller_coef is not None:
            term_r = t.roller_coef * r**0.4
        if t.ball_coef is not None:
            r_b = np.where(t.thrust_ball, r / 3.0, r) if np.any(t.thrust_ball) else r
            term_b = t.ball_coef * np.cbrt(r_b)
    exponent: FloatArray | float
    if t.all_roller:
        base, exponent = 1.0 - term_r, -9.185
    elif t.no_roller:
        base, exponent = 1.0 - term_b, -9.3
    else:
        base = 1.0 - np.where(t.roller, term_r, term_b)
        exponent = np.where(t.roller, -9.185, -9.3)
    with np.errstate(divide="ignore", invalid="ignore"):
        if base.size and base.min() > 0.0:      # where(True, x, y) is x: fewer passes
            value = 0.1 * base**exponent
        else:
            value = np.where(base > 0.0, 0.1 * np.where(base > 0.0, base, 1.0) ** exponent,
                             np.inf)
    return np.minimum(value, AISO_MAX, out=value)


def a_iso_arrays(
    kappa: npt.ArrayLike,
    ec_Cu_over_P: npt.ArrayLike,
    roller: npt.ArrayLike,
    thrust_ball: npt.ArrayLike,
) -> FloatArray:
    """Vectorised :func:`a_iso` with the type as masks (broadcast against ``kappa``).

    Parameters
    ----------
    kappa:
        Viscosity ratio(s) [-], 0.1 <= kappa <= 4.
    ec_Cu_over_P:
        ec*Cu/P [-].
    roller:
        True where the row is a roller bearing.
    thrust_ball:
        True where the row is a thrust ball bearing (uses ec*Cu/(3P)).

    Returns
    -------
    numpy.ndarray
        aISO [-], at most 50.
    """
    return a_iso_apply(a_iso_terms(kappa, roller, thrust_ball), ec_Cu_over_P)


def a_iso(kappa: npt.ArrayLike, ec_Cu_over_P: npt.ArrayLike, kind: BearingKind) -> FloatArray:
    """Life modification factor aISO [-] (ISO 281:2007 9.3.2), capped at 50.

    Radial ball:   0.1*[1 - (2.5671 - c/kappa^q)^0.83 * (ec*Cu/P)^(1/3)]^-9.3
    Radial roller: 0.1*[1 - (1.5859 - c/kappa^q) * (ec*Cu/P)^0.4]^-9.185
    with (c, q) = (2.2649, 0.054381) ball / (1.3993, 0.054381) roller for
    0.1 <= kappa < 0.4; (1.9987, 0.19087) / (1.2348, 0.19087) for 0.4 <= kappa < 1;
    (1.9987, 0.071739) / (1.2348, 0.071739) for 1 <= kappa <= 4. Thrust ball bearings use
    ec*Cu/(3P), thrust roller ec*Cu/(2.5P) (not a kind here).

    Parameters
    ----------
    kappa:
        Viscosity ratio(s) [-], 0.1 <= kappa <= 4.
    ec_Cu_over_P:
        ec*Cu/P [-] (P = design equivalent load).
    kind:
        Bearing type.

    Returns
    -------
    numpy.ndarray
        aISO [-], at most 50.
    """
    return a_iso_arrays(kappa, ec_Cu_over_P, kind.is_roller, kind is BearingKind.THRUST_BALL)


def a_iso_with_ep_arrays(
    kappa: npt.ArrayLike,
    ec: npt.ArrayLike,
    Cu_over_P: npt.ArrayLike,
    roller: npt.ArrayLike,
    thrust_ball: npt.ArrayLike,
    ep_additives: bool,
) -> tuple[FloatArray, npt.NDArray[np.bool_]]:
    """Vectorised :func:`a_iso_with_ep` with the type as masks; (aISO, relief mask)."""
    k = np.atleast_1d(np.asarray(kappa, dtype=np.float64))
    ecu = np.atleast_1d(np.asarray(ec, dtype=np.float64) * np.asarray(Cu_over_P))
    ec_arr = np.broadcast_to(np.asarray(ec, dtype=np.float64), k.shape)
    plain = a_iso_arrays(k, ecu, roller, thrust_ball)
    if not ep_additives:
        return plain, np.zeros(k.shape, dtype=bool)
    use = (k < 1.0) & (ec_arr >= EP_EC_MIN)
    relieved = np.minimum(a_iso_arrays(np.ones_like(k), ecu, roller, thrust_ball), EP_AISO_MAX)
    return np.where(use, np.maximum(plain, relieved), plain), use


def a_iso_with_ep(
    kappa: npt.ArrayLike,
    ec: npt.ArrayLike,
    Cu_over_P: npt.ArrayLike,
    kind: BearingKind,
    ep_additives: bool,
) -> tuple[FloatArray, npt.NDArray[np.bool_]]:
    """Compute aISO [-] with the EP-additive relief of ISO 281:2007 9.3.2 (from memory).

    Where ``ep_additives`` and kappa < 1 and ec >= 0.2: aISO = max(aISO(kappa),
    min(aISO(kappa=1), 3)). Elsewhere plain :func:`a_iso`.

    Parameters
    ----------
    kappa:
        Viscosity ratio(s) [-] in [0.1, 4].
    ec:
        Contamination factor(s) [-].
    Cu_over_P:
        Cu/P [-].
    kind:
        Bearing type.
    ep_additives:
        The lubricant's EP additives are declared effective.

    Returns
    -------
    (aISO, relief_applied):
        Arrays, the second a boolean mask of the cases where the relief was used.
    """
    return a_iso_with_ep_arrays(
        kappa, ec, Cu_over_P, kind.is_roller, kind is BearingKind.THRUST_BALL, ep_additives
    )
