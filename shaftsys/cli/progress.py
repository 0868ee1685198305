"""Progress bars for slow command-line work (report rendering, studies).

A bar is drawn with tqdm on standard error, and only when that stream is a terminal
and the caller is not quiet: files, pipes, CI logs and ``--quiet`` runs never see it.
The bar removes itself when it closes (``leave=False``), so the terminal keeps only the
command's own output. Nothing here imports the numerical core, so any layer at the
edge (CLI, report, studies) can use it.

Typical use::

    from shaftsys.cli.progress import ProgressBar, track

    with ProgressBar(total=len(jobs), desc="sweep", quiet=args.quiet) as bar:
        for job in jobs:
            run(job)
            bar.advance(job.name)

    for item in track(items, desc="figures", quiet=args.quiet):
        ...
"""

from __future__ import annotations

import sys
from collections.abc import Iterable, Iterator
from types import TracebackType
from typing import Any, TextIO, TypeVar

__all__ = ["ProgressBar", "progress_wanted", "track"]

T = TypeVar("T")

#: Bar of a fixed 24 characters, so that a changing label does not make it jump.
_BAR_FORMAT = ("{desc}: {percentage:3.0f}% |{bar:24}| {n_fmt}/{total_fmt} "
               "[{elapsed}<{remaining}{postfix}]")


def progress_wanted(quiet: bool = False, stream: TextIO | None = None) -> bool:
    """Whether a progress bar should be drawn on ``stream`` (default: standard error).

    True only when ``quiet`` is False and the stream is an interactive terminal.
    """
    if quiet:
        return False
    target = sys.stderr if stream is None else stream
    isatty = getattr(target, "isatty", None)
    try:
        return bool(isatty()) if callable(isatty) else False
    except (OSError, ValueError):  # a closed or detached stream
        return False


class ProgressBar:
    """A counting progress bar on standard error that shows only on a terminal.

    Parameters
    ----------
    total:
        Number of steps expected (>= 0), or ``None`` when unknown (the bar then
        counts without a percentage).
    desc:
        Short label in front of the bar.
    quiet:
        True suppresses the bar (``--quiet``).
    stream:
        Where to draw; ``None`` = ``sys.stderr`` at construction time.
    unit:
        Name of one step.
    min_interval_s:
        Shortest time between two redraws [s] (tqdm's ``mininterval``); 0 redraws on
        every step.

    Notes
    -----
    When the bar is not wanted (quiet, not a terminal) every method is a cheap no-op,
    so callers never need their own ``if``. ``advance(label)`` counts a finished
    step and shows ``label`` after the bar; ``status(label)`` shows what runs now.
    ``count`` and ``total`` are kept whether or not the bar is drawn. Use it as a
    context manager or call :meth:`close`.
    """

    def __init__(self, total: int | None, desc: str = "", *, quiet: bool = False,
                 stream: TextIO | None = None, unit: str = "step",
                 min_interval_s: float = 0.1) -> None:
        if total is not None and total < 0:
            raise ValueError(f"total must be >= 0 or None, got {total}")
        self.total = None if total is None else int(total)
        self.count = 0
        self.enabled = progress_wanted(quiet, stream)
        self._bar: Any = None
        if self.enabled:
            from tqdm import tqdm

            fmt = None if self.total is None else _BAR_FORMAT
            self._bar = tqdm(total=self.total, desc=desc, unit=unit, leave=False,
                             file=sys.stderr if stream is None else stream,
                             dynamic_ncols=True, bar_format=fmt,
                             mininterval=min_interval_s, miniters=1)

    def advance(self, label: str | None = None, n: int = 1) -> None:
        """Count ``n`` finished steps; ``label`` names the last one on the bar."""
        self.count += n
        if self._bar is not None:
            if label is not None:
                self._bar.set_postfix_str(label, refresh=False)
            self._bar.update(n)

    def status(self, label: str) -> None:
        """Show ``label`` (what is running now) after the bar without counting."""
        if self._bar is not None:
            self._bar.set_postfix_str(label)

    def add_total(self, n: int) -> None:
        """Raise the expected number of steps by ``n`` (work found on the way)."""
        if n < 0:
            raise ValueError(f"n must be >= 0, got {n}")
        self.total = (self.total or 0) + n
        if self._bar is not None:
            self._bar.total = self.total
            self._bar.refresh()

    def close(self) -> None:
        """Remove the bar from the terminal (idempotent)."""
        if self._bar is not None:
            self._bar.close()
            self._bar = None

    def __enter__(self) -> ProgressBar:
        return self

    def __exit__(self, exc_type: type[BaseException] | None, exc: BaseException | None,
                 tb: TracebackType | None) -> None:
        self.close()


def track(items: Iterable[T], desc: str = "", *, total: int | None = None,
          quiet: bool = False, stream: TextIO | None = None,
          min_interval_s: float = 0.1) -> Iterator[T]:
    """Yield ``items`` unchanged while a :class:`ProgressBar` counts them.

    ``total`` defaults to ``len(items)`` when the iterable has a length, else the bar
    counts without a percentage.
    """
    if total is None and hasattr(items, "__len__"):
        total = len(items)  # type: ignore[arg-type]
    with ProgressBar(total, desc, quiet=quiet, stream=stream,
                     min_interval_s=min_interval_s) as bar:
        for item in items:
            yield item
            bar.advance()
