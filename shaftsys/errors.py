"""Exception hierarchy of shaftsys.

Every error a user can cause is a :class:`ModelError` (exit code 2) that knows the file,
the line, the field path and what would have been valid. Numerical trouble (singular or
ill-posed systems, residuals above tolerance) is a :class:`NumericalError` (exit code 3).
The command line catches :class:`ShaftsysError` and prints its message; anything else
is a bug and is allowed to show its traceback.
"""

from __future__ import annotations

EXIT_OK = 0
EXIT_TARGET_MISSED = 1
EXIT_BAD_INPUT = 2
EXIT_NUMERICAL = 3


class ShaftsysError(Exception):
    """Base of every error shaftsys raises on purpose."""

    exit_code = EXIT_NUMERICAL


class ModelError(ShaftsysError, ValueError):
    """Bad input: names the file, line, field path and what was expected.

    Parameters
    ----------
    message:
        What is wrong, in the user's terms.
    file:
        Path of the model file (``None`` for models built in Python).
    line:
        1-based line number inside ``file`` (``None`` when unknown).
    field:
        Dotted path of the offending field, e.g. ``shafts[input].bearings[A].C``.
    expected:
        What would have been valid.
    case:
        Id of the operating case the error concerns (lets the model file's line of that
        case be found when the field itself has none), or ``None``.
    """

    exit_code = 2

    def __init__(
        self,
        message: str,
        *,
        file: str | None = None,
        line: int | None = None,
        field: str | None = None,
        expected: str | None = None,
        case: str | None = None,
    ) -> None:
        self.message = message
        self.case = case
        self.file = file
        self.line = line
        self.field = field
        self.expected = expected
        super().__init__(self.render())

    def render(self) -> str:
        """One-line-first human message: ``file:line: field: message (expected ...)``."""
        where = []
        if self.file:
            where.append(self.file if self.line is None else f"{self.file}:{self.line}")
        elif self.line is not None:
            where.append(f"line {self.line}")
        if self.field:
            where.append(self.field)
        head = ": ".join(where)
        text = f"{head}: {self.message}" if head else self.message
        if self.expected:
            text += f" (expected {self.expected})"
        return text


class NumericalError(ShaftsysError, ArithmeticError):
    """A solve that cannot be trusted: singular, ill-posed, or residual above tolerance.

    ``dof`` is the index of the degree of freedom where a factorisation broke down (so
    that the analysis can name the place in the model's words), or ``None``.
    """

    exit_code = 3

    def __init__(self, message: str, *, dof: int | None = None) -> None:
        super().__init__(message)
        self.dof = dof


class OutputError(ShaftsysError, OSError):
    """A result file could not be written (missing or read-only folder, full disk)."""

    exit_code = 2
