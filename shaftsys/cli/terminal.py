"""Colour for the terminal: verdict words in colour, only where a person reads them.

Colour is used only when the stream written to is an interactive terminal and the
``NO_COLOR`` environment variable is unset or empty (the convention of no-color.org),
and ``TERM`` is not ``dumb``. Files, pipes and captured output always get plain text,
so nothing parsed downstream ever contains escape codes.

The palette (ANSI SGR codes, shaftsys' own choice): passing verdicts bold green,
failing verdicts bold red, cautions (marginal, supercritical) yellow; on standard
error the ``warning:`` prefix is yellow and ``error:`` bold red.
"""

from __future__ import annotations

import os
import re
from collections.abc import Mapping
from typing import TextIO

__all__ = ["PALETTE", "colour_wanted", "paint", "paint_verdicts"]

#: Role -> ANSI SGR parameters.
PALETTE: dict[str, str] = {
    "good": "1;32",
    "bad": "1;31",
    "caution": "33",
}

_RESET = "\x1b[0m"

#: Verdict words a table row may end with, by role (the tables' own vocabulary).
_VERDICT_ROLE = {
    "PASS": "good", "ok": "good",
    "FAIL": "bad", "EXCEEDED": "bad", "TOO CLOSE": "bad", "LOW": "bad",
    "marginal": "caution", "supercritical": "caution", "NOT EVALUATED": "bad",
    "(not required)": "caution",
}
_ROW_END = re.compile(r"(?<= )(" + "|".join(sorted((re.escape(w) for w in _VERDICT_ROLE),
                                                  key=len, reverse=True)) + r")$")
_SUMMARY = {"all supports pass": "good", "FAILING:": "bad", "VERDICT: PASS": "good",
            "VERDICT: FAIL": "bad", "VERDICT: NOT EVALUATED": "bad",
            "NOT EVALUATED (not a pass)": "bad"}


def colour_wanted(stream: TextIO, environ: Mapping[str, str] | None = None) -> bool:
    """Whether text written to ``stream`` may carry colour codes.

    Parameters
    ----------
    stream:
        The stream the text goes to (``sys.stdout`` for tables).
    environ:
        Environment to read ``NO_COLOR`` and ``TERM`` from (``None`` = ``os.environ``).
    """
    env = os.environ if environ is None else environ
    if env.get("NO_COLOR", ""):
        return False
    if env.get("TERM", "") == "dumb":
        return False
    isatty = getattr(stream, "isatty", None)
    try:
        return bool(isatty()) if callable(isatty) else False
    except (OSError, ValueError):
        return False


def paint(text: str, role: str) -> str:
    """``text`` wrapped in the colour of ``role`` (a key of :data:`PALETTE`).

    Raises
    ------
    ValueError
        ``role`` is not in the palette.
    """
    if role not in PALETTE:
        raise ValueError(f"unknown colour role {role!r}; expected one of {sorted(PALETTE)}")
    return f"\x1b[{PALETTE[role]}m{text}{_RESET}"


def paint_verdicts(text: str) -> str:
    """Colour the verdict word that ends each table row, and the summary lines.

    Table rows end in a verdict (``PASS``/``FAIL`` in the life table, ``ok``/
    ``marginal``/``EXCEEDED``/``LOW``... in the shaft checks). Lines after a line
    reading ``Notes`` are free text and stay plain. The text is otherwise unchanged.
    """
    out = []
    in_notes = False
    for line in text.split("\n"):
        if line.strip() == "Notes":
            in_notes = True
        if in_notes:
            out.append(line)
            continue
        head = next((k for k in _SUMMARY if line.startswith(k)), None)
        if head is not None:
            out.append(paint(line, _SUMMARY[head]))
            continue
        out.append(_ROW_END.sub(lambda m: paint(m.group(1), _VERDICT_ROLE[m.group(1)]),
                                line))
    return "\n".join(out)
