"""The axial arrangement rule: which support of a shaft carries how much thrust.

One implementation for the single run and the design studies: every function takes
numbers (one case) or arrays of one shape (many cases or variants at once) and returns
the same form. Units: N.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from typing import Any

import numpy as np

from shaftsys.errors import ModelError
from shaftsys.model.bearing import AxialRole, Bearing, BearingKind

#: Induced axial force of a single-row angular-contact ball bearing under radial load,
#: Fi = K * Fr * tan(alpha), K = Ja/Jr of Sjoevall's integrals at a half load zone
#: (epsilon = 0.5) for point contact (Harris, Rolling Bearing Analysis, load
#: distribution chapter; from memory). Zero clearance, no preload.
ACBB_INDUCED_FACTOR = 1.32
#: Tapered roller bearings: Fi = 0.5 * Fr / Y with the maker's Y (common practice,
#: the same half-load-zone assumption for line contact).
TRB_INDUCED_FACTOR = 0.5


def induced_axial_force(b: Bearing, Fr_N: Any) -> Any:
    """Axial force [N] a single-row angular-contact or tapered bearing induces under Fr.

    ``Fr_N`` may be a number or an array (design studies evaluate many variants at once).
    Tapered roller: 0.5*Fr/Y with the maker's Y (common practice). Angular-contact
    ball: 1.32*Fr*tan(alpha) (half load zone, point contact; Harris, from memory).
    Zero clearance and no preload are assumed.
    """
    if b.kind is BearingKind.TAPERED_ROLLER:
        if not b.Y:
            raise ModelError(f"bearing '{b.id}' needs the maker's Y for its induced "
                             "axial force", line=b.line, field=f"bearings[{b.id}].Y")
        return TRB_INDUCED_FACTOR * Fr_N / b.Y
    if b.kind is BearingKind.ANGULAR_CONTACT_BALL:
        alpha = math.radians(b.contact_angle_deg or 0.0)
        return ACBB_INDUCED_FACTOR * Fr_N * math.tan(alpha)
    return 0.0


def axial_reactions(bearings: Sequence[Bearing], Ka_N: Any, Fr_N: Mapping[str, Any]
                    ) -> tuple[dict[str, Any], dict[str, Any]]:
    """Axial force each bearing puts on the shaft [N] for a net external thrust Ka_N.

    ``Ka_N`` and the radial loads may be numbers (one case) or arrays of one shape (many
    cases or variants at once); the results have the same form.

    ``bearings`` are the supports of one shaft; ``Fr_N`` maps bearing id -> radial load.

    Rules (the trade's, stated in DEVELOPERS.md):

    * one locating bearing (``axial: both``) takes all thrust;
    * cross-locating (one ``+x``, one ``-x`` bearing, no pair): the bearing that stops the
      shaft moving in the thrust's direction takes it;
    * adjusted pair (``pair``): with induced forces Fi of each bearing, bearing P
      (``+x``) and N (``-x``): if Fi_N + Ka >= Fi_P then Fa_P = Fi_N + Ka, Fa_N = Fi_N,
      else Fa_N = Fi_P - Ka, Fa_P = Fi_P.

    Returns the axial force on the shaft of every bearing and the induced forces used.
    """
    on_shaft: dict[str, Any] = {b.id: 0.0 for b in bearings}
    induced: dict[str, Any] = {}
    both = [b for b in bearings if b.axial is AxialRole.BOTH]
    if both:
        on_shaft[both[0].id] = -Ka_N
        return on_shaft, induced
    plus = next(b for b in bearings if b.axial is AxialRole.PLUS_X)
    minus = next(b for b in bearings if b.axial is AxialRole.MINUS_X)
    if plus.pair is None:
        on_shaft[plus.id] = _where(Ka_N >= 0, -Ka_N, 0.0)
        on_shaft[minus.id] = _where(Ka_N >= 0, 0.0, -Ka_N)
        return on_shaft, induced
    fi_p = induced_axial_force(plus, Fr_N[plus.id])
    fi_n = induced_axial_force(minus, Fr_N[minus.id])
    induced = {plus.id: fi_p, minus.id: fi_n}
    first = fi_n + Ka_N >= fi_p
    fa_p = _where(first, fi_n + Ka_N, fi_p)
    fa_n = _where(first, fi_n, fi_p - Ka_N)
    on_shaft[plus.id] = -fa_p   # P stops +x motion: pushes the shaft toward -x
    on_shaft[minus.id] = fa_n
    return on_shaft, induced


def _where(condition: Any, a: Any, b: Any) -> Any:
    """``np.where`` that gives a plain float for scalar arguments."""
    out = np.where(condition, a, b)
    return float(out) if out.ndim == 0 else out


__all__ = ["ACBB_INDUCED_FACTOR", "TRB_INDUCED_FACTOR", "axial_reactions",
           "induced_axial_force"]
