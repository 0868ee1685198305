"""Section properties of solid and hollow round shaft sections.

Units: diameters [mm], areas [mm^2], second moments [mm^4], Poisson's ratio [-].

The shear coefficient is Cowper's (G. R. Cowper, "The shear coefficient in Timoshenko's
beam theory", J. Appl. Mech. 33 (1966) 335-340, table 1, hollow circular section):

    k = 6 (1 + nu) (1 + m^2)^2 / ((7 + 6 nu) (1 + m^2)^2 + (20 + 12 nu) m^2),
    m = d_bore / d_outer.

For a solid section (m = 0) this is 6 (1 + nu) / (7 + 6 nu); for a thin tube (m -> 1)
it tends to 2 (1 + nu) / (4 + 3 nu).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from shaftsys.errors import ModelError

__all__ = ["Section", "circular_section", "circular_section_arrays", "cowper_shear_coefficient"]


@dataclass(frozen=True)
class Section:
    """Properties of a round (solid or hollow) cross-section.

    Attributes
    ----------
    d_outer_mm:
        Outer diameter [mm].
    d_bore_mm:
        Bore diameter [mm] (0 for a solid section).
    A_mm2:
        Area [mm^2].
    I_mm4:
        Diametral second moment of area [mm^4] (the same about every diameter).
    J_mm4:
        Polar second moment of area [mm^4] (= 2 I; also the torsion constant of a
        round section).
    k_shear:
        Cowper's shear coefficient [-] (dimensionless).
    """

    d_outer_mm: float
    d_bore_mm: float
    A_mm2: float
    I_mm4: float
    J_mm4: float
    k_shear: float


def cowper_shear_coefficient(bore_ratio: ArrayLike, poisson: ArrayLike) -> NDArray[np.float64]:
    """Cowper's (1966) shear coefficient of a hollow circular section.

    Parameters
    ----------
    bore_ratio:
        m = d_bore / d_outer [-], 0 <= m < 1 (0 for a solid section).
    poisson:
        Poisson's ratio nu [-].

    Returns
    -------
    numpy.ndarray
        k [-], broadcast shape of the inputs.
    """
    m2 = np.asarray(bore_ratio, dtype=float) ** 2
    nu = np.asarray(poisson, dtype=float)
    a = (1.0 + m2) ** 2
    return 6.0 * (1.0 + nu) * a / ((7.0 + 6.0 * nu) * a + (20.0 + 12.0 * nu) * m2)


def circular_section_arrays(
    d_outer_mm: ArrayLike, d_bore_mm: ArrayLike, poisson: ArrayLike
) -> tuple[NDArray[np.float64], NDArray[np.float64], NDArray[np.float64], NDArray[np.float64]]:
    """Vectorised section properties of round sections (no validation, for design loops).

    Parameters
    ----------
    d_outer_mm:
        Outer diameters [mm].
    d_bore_mm:
        Bore diameters [mm] (0 for solid).
    poisson:
        Poisson's ratios [-].

    Returns
    -------
    tuple of numpy.ndarray
        (A [mm^2], I [mm^4] diametral, J [mm^4] polar, k [-] Cowper), broadcast shape.
    """
    do = np.asarray(d_outer_mm, dtype=float)
    di = np.asarray(d_bore_mm, dtype=float)
    do2 = do * do
    di2 = di * di
    area = math.pi / 4.0 * (do2 - di2)
    inertia = math.pi / 64.0 * (do2 * do2 - di2 * di2)
    k = cowper_shear_coefficient(di / do, poisson)
    return area, inertia, 2.0 * inertia, k


def circular_section(d_outer_mm: float, d_bore_mm: float = 0.0, poisson: float = 0.3) -> Section:
    """Section properties of a solid or hollow round section.

    Parameters
    ----------
    d_outer_mm:
        Outer diameter [mm], > 0.
    d_bore_mm:
        Bore diameter [mm], 0 <= d_bore < d_outer.
    poisson:
        Poisson's ratio nu [-], -1 < nu < 0.5 (enters only the shear coefficient).

    Returns
    -------
    Section
        A [mm^2], I [mm^4], J [mm^4], Cowper's k [-].

    Raises
    ------
    ModelError
        On non-finite or out-of-range diameters or Poisson's ratio.
    """
    if not (math.isfinite(d_outer_mm) and d_outer_mm > 0.0):
        raise ModelError(f"outer diameter {d_outer_mm!r} mm is not positive", expected="> 0 mm")
    if not (math.isfinite(d_bore_mm) and 0.0 <= d_bore_mm < d_outer_mm):
        raise ModelError(
            f"bore diameter {d_bore_mm!r} mm does not fit in outer diameter {d_outer_mm!r} mm",
            expected="0 <= bore < outer diameter",
        )
    if not (math.isfinite(poisson) and -1.0 < poisson < 0.5):
        raise ModelError(f"Poisson's ratio {poisson!r} out of range", expected="-1 < nu < 0.5")
    area, inertia, polar, k = circular_section_arrays(d_outer_mm, d_bore_mm, poisson)
    return Section(
        d_outer_mm=float(d_outer_mm),
        d_bore_mm=float(d_bore_mm),
        A_mm2=float(area),
        I_mm4=float(inertia),
        J_mm4=float(polar),
        k_shear=float(k),
    )
