"""Bearings as frozen input values (all quantities in the units of :mod:`shaftsys.units`)."""

from __future__ import annotations

from dataclasses import dataclass
from enum import StrEnum

from shaftsys.model.interior import Interior


class BearingKind(StrEnum):
    """Rolling bearing types shaftsys knows. The value is what a model file writes."""

    DEEP_GROOVE_BALL = "deep_groove_ball"
    ANGULAR_CONTACT_BALL = "angular_contact_ball"
    SELF_ALIGNING_BALL = "self_aligning_ball"
    CYLINDRICAL_ROLLER = "cylindrical_roller"
    TAPERED_ROLLER = "tapered_roller"
    SPHERICAL_ROLLER = "spherical_roller"
    NEEDLE_ROLLER = "needle_roller"
    THRUST_BALL = "thrust_ball"

    @property
    def is_roller(self) -> bool:
        """True for line-contact (roller) bearings: life exponent 10/3."""
        return self in _ROLLER

    @property
    def life_exponent(self) -> float:
        """Load-life exponent p of ISO 281: 3 for ball, 10/3 for roller bearings."""
        return 10.0 / 3.0 if self.is_roller else 3.0

    @property
    def weibull_slope(self) -> float:
        """Lundberg-Palmgren Weibull slope: 10/9 ball, 9/8 roller (ISO 281:2007, 6.2 basis)."""
        return 9.0 / 8.0 if self.is_roller else 10.0 / 9.0


_ROLLER = frozenset(
    {
        BearingKind.CYLINDRICAL_ROLLER,
        BearingKind.TAPERED_ROLLER,
        BearingKind.SPHERICAL_ROLLER,
        BearingKind.NEEDLE_ROLLER,
    }
)


class AxialRole(StrEnum):
    """Which shaft thrust a support takes.

    ``BOTH``: locates in both directions. ``PLUS_X``: stops the shaft moving toward +x
    (the shaft pushes the bearing toward +x). ``MINUS_X``: the opposite. ``FLOAT``: no
    axial load (a floating bearing, or a type without ribs).
    """

    BOTH = "both"
    PLUS_X = "+x"
    MINUS_X = "-x"
    FLOAT = "float"


class SetArrangement(StrEnum):
    """How the rows at one seat are arranged (ISO 281 treats pairs as one bearing)."""

    SINGLE = "single"
    BACK_TO_BACK = "back_to_back"
    FACE_TO_FACE = "face_to_face"
    TANDEM = "tandem"
    DOUBLE_ROW = "double_row"


@dataclass(frozen=True, slots=True)
class Bearing:
    """One support of a shaft.

    Ratings are for the whole support (for a matched set, the set's ratings; the loader
    converts per-row ratings with ISO 281's rule for identical bearings side by side).

    Attributes
    ----------
    id: unique bearing id in the model.
    kind: bearing type.
    x_mm: axial position of the bearing's mid-width on its shaft [mm].
    d_mm, D_mm, B_mm: bore, outside diameter and width [mm] (``B_mm`` may be ``None``).
    C_N, C0_N: basic dynamic and static load ratings of the support [N].
    Cu_N: fatigue load limit [N]; ``None`` = estimate when needed (flagged as estimate).
    limiting_speed_rpm: the maker's limiting speed [rpm] or ``None``.
    e, Y, Y0, Y1, Y2, X: maker's factors where the type needs them (``None`` = standard).
    contact_angle_deg: nominal contact angle [deg] (angular-contact, tapered, thrust).
    f0: ISO 281 geometry factor for radial ball bearings (``None`` = estimate).
    rows: number of rows or bearings in the set (i of ISO 281).
    arrangement: set arrangement.
    axial: which shaft thrust the support takes.
    pair: id of the adjusted partner bearing (single-row angular-contact/tapered pair at
        separate seats), else ``None``.
    pressure_centre_offset_mm: distance from mid-width to the pressure centre where the
        contact lines meet the axis [mm] (>= 0; the side follows from ``axial``).
    radial_stiffness_N_mm: ``None`` = rigid.
    tilt_stiffness_Nmm_rad: ``None`` = free to tilt.
    ribs: cylindrical roller bearing with ribs on both rings (can take some axial load).
    target_life_h, target_reliability: per-bearing targets (``None`` = model default).
    s0_min: required static safety (``None`` = common-practice default for the type).
    ec: contamination factor override for this bearing (``None`` = model lubrication).
    line: 1-based line of the bearing in its model file (for messages), or ``None``.
    within: id of the shaft that holds the outer ring (a pilot bearing between coaxial
        shafts, an idler on a pin); ``None`` = the housing. Such a bearing runs at the
        relative speed and carries radial load only.
    within_x_mm: station of the bearing on the ``within`` shaft [mm] (from the geometry).
    on_sleeve: the bearing sits on a sleeve or adapter (its bore is larger than the
        shaft under it) instead of directly on the shaft seat.
    interior: internal geometry of the rolling-element set (``None``: not given; then
        no load distribution is computed for the bearing).
    """

    id: str
    kind: BearingKind
    x_mm: float
    d_mm: float
    D_mm: float
    C_N: float
    C0_N: float
    B_mm: float | None = None
    Cu_N: float | None = None
    limiting_speed_rpm: float | None = None
    e: float | None = None
    Y: float | None = None
    Y0: float | None = None
    Y1: float | None = None
    Y2: float | None = None
    X: float | None = None
    contact_angle_deg: float | None = None
    f0: float | None = None
    rows: int = 1
    arrangement: SetArrangement = SetArrangement.SINGLE
    axial: AxialRole = AxialRole.FLOAT
    pair: str | None = None
    pressure_centre_offset_mm: float = 0.0
    radial_stiffness_N_mm: float | None = None
    tilt_stiffness_Nmm_rad: float | None = None
    ribs: bool = False
    target_life_h: float | None = None
    target_reliability: float | None = None
    s0_min: float | None = None
    ec: float | None = None
    line: int | None = None
    within: str | None = None
    within_x_mm: float | None = None
    on_sleeve: bool = False
    interior: Interior | None = None

    @property
    def mean_diameter_mm(self) -> float:
        """Mean diameter dm = (d + D) / 2 [mm] (ISO 281 uses it for nu1 and aISO)."""
        return 0.5 * (self.d_mm + self.D_mm)

    @property
    def support_x_mm(self) -> float:
        """Where the support acts on the shaft [mm]: the pressure centre.

        A bearing that stops the shaft moving toward +x has its pressure centre on the
        -x side of its mid-width, and vice versa; a locating (``both``) or floating
        bearing acts at mid-width.
        """
        if self.axial is AxialRole.PLUS_X:
            return self.x_mm - self.pressure_centre_offset_mm
        if self.axial is AxialRole.MINUS_X:
            return self.x_mm + self.pressure_centre_offset_mm
        return self.x_mm


@dataclass(frozen=True, slots=True)
class Lubrication:
    """Lubricant and cleanliness for ISO 281:2007 modified life.

    Attributes
    ----------
    nu40_mm2_s, nu100_mm2_s: kinematic viscosity at 40 degC and 100 degC [mm^2/s]
        (two points of the Walther relation, ASTM D341). Any two temperatures may be
        given in the file; the loader stores the pair below.
    t1_C, t2_C: the temperatures [degC] at which the two viscosities are given.
    ec: contamination factor as a number, or ``None`` to derive it from ``cleanliness``.
    cleanliness: ISO 4406 code like ``"-/15/12"`` (``None`` when ``ec`` is given).
    filtration_beta: filter rating beta_x (with ``cleanliness``) or ``None``.
    method: ``"circulating_filtered"``, ``"circulating_unfiltered"``, ``"oil_bath"``,
        ``"grease"`` (selects the ISO 281 Annex A formula for ec).
    ep_additives: lubricant contains effective EP additives (declared by the user).
    """

    nu1_at_t1_mm2_s: float
    nu2_at_t2_mm2_s: float
    t1_C: float = 40.0
    t2_C: float = 100.0
    ec: float | None = None
    cleanliness: str | None = None
    filtration_beta: float | None = None
    method: str = "circulating_filtered"
    ep_additives: bool = False


@dataclass(frozen=True, slots=True)
class LifeSettings:
    """Model-wide defaults for the life engine.

    Attributes
    ----------
    target_life_h: default target life [h] of every bearing.
    target_reliability: default target reliability (0.9 = L10).
    reliability_method: ``"iso281"`` (a1 formula) or ``"weibull3"`` (Shigley's
        three-parameter Weibull).
    application_factor: load application factor af (>= 1) applied to P.
    min_speed_rpm: cases slower than this count for static checks only [rpm].
    s0_min: model-wide required static safety (``None`` = per-type common practice).
    use_modified_life: use Lnm when lubrication data exist (True) or always a1*L10.
    from_element_loads: the life verdict of a bearing with an interior uses its modified
        reference life from the element loads (``analysis.interior``) instead.
    """

    target_life_h: float = 20000.0
    target_reliability: float = 0.9
    reliability_method: str = "iso281"
    application_factor: float = 1.0
    min_speed_rpm: float = 10.0
    s0_min: float | None = None
    use_modified_life: bool = True
    from_element_loads: bool = False
