"""The internal geometry of a rolling bearing row (frozen input values, units of
:mod:`shaftsys.units`).

A bearing's :class:`Interior` describes its rolling-element set: what the load
distribution of :mod:`shaftsys.bearings.interior` needs. It comes from the model file
(``interior:`` on a bearing), from a catalogue row (``Dw``, ``Z``, ``dm``, ``Lwe``) or is
estimated from d, D, B (:mod:`shaftsys.model.interior_rules`, common practice, no
source); every value that was not given is named in :attr:`Interior.estimated`.
"""

from __future__ import annotations

from dataclasses import dataclass

#: Default raceway osculations of a ball bearing (groove radius / Dw; common practice,
#: no source).
EST_FI = 0.52
EST_FO = 0.53


@dataclass(frozen=True, slots=True)
class Interior:
    """The rolling-element set of one bearing row.

    Attributes
    ----------
    Dw_mm: rolling element diameter [mm] (a roller's mean diameter).
    Z: rolling elements per row.
    dm_mm: pitch diameter of the element set [mm].
    contact_angle_deg: nominal (free) contact angle [deg]; 0 for radial types.
    fi, fo: raceway groove radius / Dw at the inner and outer ring (ball bearings), > 0.5.
    Lwe_mm: effective roller length [mm] (roller bearings), else ``None``.
    clearance_mm: radial internal clearance [mm], the total radial play of one ring
        against the other (diametral clearance Pd of Harris), >= 0.
    preload_N: axial preload of an adjusted pair [N] (set on either bearing of the
        pair), else ``None``.
    source: ``"model"``, ``"catalogue"`` or ``"estimated"`` (where Dw and Z came from).
    estimated: names of the values that were estimated (not given).
    """

    Dw_mm: float
    Z: int
    dm_mm: float
    contact_angle_deg: float = 0.0
    fi: float = EST_FI
    fo: float = EST_FO
    Lwe_mm: float | None = None
    clearance_mm: float = 0.0
    preload_N: float | None = None
    source: str = "model"
    estimated: tuple[str, ...] = ()
