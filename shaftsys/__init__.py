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
    from shaftsys.analysis import Result
    from shaftsys.model import Model


def load_model(path: str) -> Model:
    """Read and check a model file (see :func:`shaftsys.io.loader.load_model`)."""
    from shaftsys.io.loader import load_model as _load

    return _load(path)


def analyse(model: Model, **kwargs: Any) -> Result:
    """Solve and check a model (see :func:`shaftsys.analysis.analyse`)."""
    from shaftsys.analysis import analyse as _analyse

    return _analyse(model, **kwargs)


__all__ = ["__version__", "analyse", "load_model"]
