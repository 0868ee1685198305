"""Small shared helpers of the bearing life engine (array coercion, field paths)."""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np
import numpy.typing as npt

from shaftsys.model.bearing import Bearing

FloatArray = npt.NDArray[np.float64]
BoolArray = npt.NDArray[np.bool_]


def as_float_array(values: npt.ArrayLike, name: str) -> FloatArray:
    """Return ``values`` as a 1-D float64 array (a scalar becomes shape (1,)).

    Parameters
    ----------
    values:
        Numbers in whatever unit the caller documents.
    name:
        Argument name used in the error message.

    Returns
    -------
    numpy.ndarray
        1-D float64 array, same unit as the input.
    """
    arr = np.atleast_1d(np.asarray(values, dtype=np.float64))
    if arr.ndim != 1:
        raise ValueError(f"{name} must be 1-D (one value per case), got shape {arr.shape}")
    return arr


def field(bearing: Bearing, name: str) -> str:
    """Dotted field path of attribute ``name`` of ``bearing`` for error messages."""
    return f"bearings[{bearing.id}].{name}"


def case_name(case_ids: Sequence[str] | None, index: int) -> str:
    """Human name of case ``index`` (its id when known, else ``#index``)."""
    if case_ids is not None and index < len(case_ids):
        return f"'{case_ids[index]}'"
    return f"#{index}"


def zero_tolerance_N(bearing: Bearing) -> float:
    """Force [N] below which a load component counts as zero (solver round-off).

    1e-9 of the dynamic rating C (at least 1e-9 N).
    """
    return 1e-9 * max(abs(bearing.C_N), 1.0)
