"""shaftsys: bearing reactions, ISO 281 life and shaft checks over a machine's duty cycle.

Python API::

    import shaftsys
    model = shaftsys.load_model("models/fan_drive.yaml")
    result = shaftsys.analyse(model)
    result.life_frame()      # pandas DataFrame, one row per bearing

Internal units are stated once in :mod:`shaftsys.units`.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

__version__ = "0.1.0"

if TYPE_CHECKING:
    from shaftsys.analysis.results import Result
    from shaftsys.model import Model


def load_model(path: str) -> Model:
    """Read and check a model file (see :func:`shaftsys.io.loader.load_model`)."""
    from shaftsys.io.loader import load_model as _load

    return _load(path)


def analyse(model: Model, **kwargs: Any) -> Result:
    """Solve and check a model (see :func:`shaftsys.analysis.analyse`).

    Errors of the numerical core are given the model file's line and key
    (:func:`shaftsys.io.locate.locate_error`).
    """
    from shaftsys.analysis.pipeline import analyse as _analyse
    from shaftsys.errors import ModelError
    from shaftsys.io.locate import locate_error

    try:
        return _analyse(model, **kwargs)
    except ModelError as exc:
        located = locate_error(exc, model)
        if located is exc:
            raise
        raise located from exc


__all__ = ["__version__", "analyse", "load_model"]
