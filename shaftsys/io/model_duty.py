"""A model file with its duty: the model as written, or, when it names a recording
(``recording:``), the model with the cases reduced from it.
"""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING

from shaftsys.io.loader import load_model
from shaftsys.io.recording import reduce_recording

if TYPE_CHECKING:
    from shaftsys.analysis.duty import DutyReduction
    from shaftsys.model import Model


def load_model_with_duty(path: str | Path, *, analyse_model: bool = True
                         ) -> tuple[Model, DutyReduction | None]:
    """The model of the file at ``path`` and, when it names a recording, the reduction:
    then the model returned is the one with the recorded cases (its peak and static
    cases kept) and ``reduction.result`` its analysis (``None`` unless
    ``analyse_model``).
    """
    model = load_model(path)
    if model.recording is None:
        return model, None
    red = reduce_recording(model, model.recording, analyse_model=analyse_model)
    return red.model, red


__all__ = ["load_model_with_duty"]
