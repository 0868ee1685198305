"""Seat geometry of bearings and elements on their shaft (pure geometry, mm).

Rules (common practice, no source; tolerances stated here):

* a bearing mounted directly on the shaft (``mounting: shaft``) has its bore equal to
  the diameter of every step under its width within :data:`BORE_TOLERANCE_MM`; without
  a width, the step at its mid-width (on an edge: one of the two steps). A step under
  the width that is larger is a shoulder the ring overlaps; a smaller one leaves the
  ring unsupported;
* a bearing on a sleeve or adapter (``mounting: sleeve``) has a bore larger than every
  step under its width (the sleeve sits between);
* the widths of bearings and of elements with a hub (gears, pulleys, sprockets,
  couplings) do not overlap one another (touching is allowed, within
  :data:`OVERLAP_TOLERANCE_MM`); a matched set at one seat is one bearing.

Every function works on arrays with a leading variant axis so that a design study
checks all its variants at once; the loader calls them with one variant.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import NDArray

#: Largest |bearing bore - seat diameter| [mm] accepted as the same nominal size.
BORE_TOLERANCE_MM = 0.05
#: Overlap [mm] of two widths still taken as touching (the station snap of the mesh).
OVERLAP_TOLERANCE_MM = 1e-3

Array = NDArray[np.float64]


def seat_fit(edges_mm: Array, d_mm: Array, x_mm: Array, half_width_mm: float,
             bore_mm: float, sleeve: bool = False) -> tuple[NDArray[np.bool_], Array]:
    """Which variants seat a bearing badly, and the diameter [mm] that does not fit.

    Parameters
    ----------
    edges_mm: (B, n + 1) step edges [mm] of each variant, from 0 to the shaft length.
    d_mm: (B, n) step outer diameters [mm].
    x_mm: (B,) mid-width station of the bearing [mm].
    half_width_mm: half the bearing width [mm] (0 when the width is not given).
    bore_mm: the bearing's bore [mm].
    sleeve: the bearing sits on a sleeve or adapter (bore > every step under it).

    Returns
    -------
    (bad, diameter): ``bad[k]`` when variant k's bearing does not fit its seat;
    ``diameter[k]`` the offending step diameter [mm] (NaN where it fits).
    """
    edges = np.atleast_2d(np.asarray(edges_mm, dtype=float))
    d = np.atleast_2d(np.asarray(d_mm, dtype=float))
    x = np.asarray(x_mm, dtype=float).reshape(-1)
    lo, hi = edges[:, :-1], edges[:, 1:]
    tol = OVERLAP_TOLERANCE_MM
    if half_width_mm > 0.0:
        overlap = (np.minimum(hi, (x + half_width_mm)[:, None])
                   - np.maximum(lo, (x - half_width_mm)[:, None]))
        under = overlap > tol
    else:
        under = (lo - tol <= x[:, None]) & (x[:, None] <= hi + tol)
    misfit = d >= bore_mm if sleeve else np.abs(d - bore_mm) > BORE_TOLERANCE_MM
    if half_width_mm > 0.0:
        wrong = under & misfit
        bad = wrong.any(axis=1)
    else:  # a point on an edge: one of the two steps must fit
        fits = under & ~misfit
        bad = ~fits.any(axis=1)
        wrong = under & misfit
    diameter = np.full(bad.shape, np.nan)
    rows = np.flatnonzero(bad)     # usually few: the first misfit step of those only
    if rows.size:
        dd = np.broadcast_to(d, wrong.shape)
        diameter[rows] = dd[rows, np.argmax(wrong[rows], axis=1)]
    return np.asarray(bad, dtype=bool), diameter


def widths_overlap(c1_mm: Array, w1_mm: float, c2_mm: Array, w2_mm: float
                   ) -> NDArray[np.bool_]:
    """Intervals of width w [mm] around the centres c [mm] overlap (touching allowed)."""
    c1 = np.asarray(c1_mm, dtype=float)
    c2 = np.asarray(c2_mm, dtype=float)
    return np.asarray(np.abs(c1 - c2) < 0.5 * (w1_mm + w2_mm) - OVERLAP_TOLERANCE_MM,
                      dtype=bool)


#: Element kinds with a hub whose width occupies the shaft.
HUB_KINDS = frozenset({"gear", "bevel_gear", "pulley", "sprocket", "coupling"})

__all__ = ["BORE_TOLERANCE_MM", "HUB_KINDS", "OVERLAP_TOLERANCE_MM", "seat_fit",
           "widths_overlap"]
