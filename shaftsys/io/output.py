"""Writing results: every file goes to a temporary sibling first and is renamed into
place, so an interrupted or failed write leaves the previous file intact.
"""

from __future__ import annotations

import contextlib
import json
import math
import os
import stat
import tempfile
from collections.abc import Callable
from pathlib import Path
from typing import Any, BinaryIO

from shaftsys.errors import ModelError, OutputError


def atomic_write(path: str | Path, write: Callable[[BinaryIO], None]) -> Path:
    """Write a file atomically.

    ``write`` receives a binary file object of a temporary file in the target folder;
    after it returns the file is flushed, synced and renamed over ``path``. A symbolic
    link is written through (the file it points to is replaced, the link stays); a
    FIFO or device is written as a stream, never replaced; temporary files that an
    earlier, killed write left behind are removed first.

    Raises
    ------
    OutputError: the folder is missing or read-only, or the disk is full.
    """
    given = Path(path)
    target = _through_links(given)
    if target.exists() and not target.is_file():
        if target.is_dir():
            raise OutputError(f"cannot write {given}: it is a folder")
        return _write_stream(given, target, write)
    folder = target.parent if str(target.parent) else Path(".")
    if not folder.is_dir():
        raise OutputError(f"cannot write {given}: the folder {folder} does not exist")
    _remove_stale_parts(folder, target.name)
    fd = -1
    tmp = ""
    try:
        mode = _file_mode(target)
        fd, tmp = tempfile.mkstemp(prefix=f".{target.name}.{os.getpid()}.", suffix=".part",
                                   dir=folder)
        # mkstemp creates the file readable by its owner only (0600); give the result
        # the permissions an ordinary new file (or the file it replaces) would have.
        with contextlib.suppress(OSError):
            os.chmod(tmp, mode)
        with os.fdopen(fd, "wb") as fh:
            fd = -1
            write(fh)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, target)
        tmp = ""
    except PermissionError:
        raise OutputError(f"cannot write {given}: permission denied") from None
    except OSError as exc:
        raise OutputError(f"cannot write {given}: {exc.strerror or exc}") from None
    finally:
        if fd >= 0:
            os.close(fd)
        if tmp:
            with contextlib.suppress(OSError):
                os.unlink(tmp)
    return given


#: A temporary file of a writer that is not known to be alive is removed once it is
#: this old [s] (the earlier file name had no process id).
STALE_PART_AGE_S = 600.0


def _through_links(path: Path) -> Path:
    """The file a symbolic link (chain) points to, so that the link stays a link and
    its target is replaced; ``path`` itself when it is no link.

    Raises
    ------
    OutputError: the links form a loop.
    """
    if not path.is_symlink():
        return path
    try:
        return Path(os.path.realpath(path, strict=False))
    except OSError as exc:  # a loop of links (Python >= 3.13 raises)
        raise OutputError(f"cannot write {path}: {exc.strerror or exc}") from None


def _write_stream(given: Path, target: Path, write: Callable[[BinaryIO], None]) -> Path:
    """Write into a FIFO, a device or another non-regular file as a stream: it is
    opened and written, never replaced (a rename would put a regular file in its place).
    """
    try:
        with open(target, "wb") as fh:
            write(fh)
            fh.flush()
    except PermissionError:
        raise OutputError(f"cannot write {given}: permission denied") from None
    except OSError as exc:
        raise OutputError(f"cannot write {given}: {exc.strerror or exc}") from None
    return given


def _remove_stale_parts(folder: Path, name: str) -> None:
    """Remove the temporary files of earlier writes of ``name`` that were killed
    before they could clean up: those of a process that no longer runs, and unnamed
    ones older than :data:`STALE_PART_AGE_S`. A write in progress is left alone.
    """
    import time

    now = time.time()
    try:
        candidates = list(folder.glob(f".{glob_escape(name)}.*.part"))
    except OSError:
        return
    for part in candidates:
        middle = part.name[len(name) + 2:-len(".part")]
        pid_text = middle.split(".", 1)[0] if "." in middle else ""
        try:
            if pid_text.isdigit():
                if _alive(int(pid_text)):
                    continue
            elif now - part.stat().st_mtime < STALE_PART_AGE_S:
                continue
            if part.is_file() and not part.is_symlink():
                part.unlink()
        except OSError:
            continue


def glob_escape(name: str) -> str:
    """``name`` with glob wildcards escaped."""
    import glob

    return glob.escape(name)


def _alive(pid: int) -> bool:
    """Whether a process of this id runs (another user's counts as running)."""
    if pid == os.getpid():
        return True
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except (PermissionError, OverflowError, OSError):
        return True
    return True


def _file_mode(target: Path) -> int:
    """Permission bits for ``target``.

    Those of the file it replaces, else 0o666 minus the process umask (what
    ``open(path, "w")`` would give).
    """
    try:
        return stat.S_IMODE(target.stat().st_mode)
    except OSError:
        mask = os.umask(0)
        os.umask(mask)
        return 0o666 & ~mask


def json_ready(value: Any) -> Any:
    """Plain JSON types: numpy scalars to floats, non-finite floats to ``null`` or a
    string (``"inf"``), tuples to lists.
    """
    try:
        import numpy as np

        if isinstance(value, np.generic):
            value = value.item()
        elif isinstance(value, np.ndarray):
            value = value.tolist()
    except ImportError:  # pragma: no cover
        pass
    if isinstance(value, float):
        if math.isnan(value):
            return None
        if math.isinf(value):
            return "inf" if value > 0 else "-inf"
        return value
    if isinstance(value, dict):
        return {str(k): json_ready(v) for k, v in value.items()}
    if isinstance(value, list | tuple):
        return [json_ready(v) for v in value]
    return value


def write_json(path: str | Path, data: Any) -> Path:
    """Write ``data`` as indented JSON, atomically."""
    text = json.dumps(json_ready(data), indent=2, allow_nan=False) + "\n"
    return atomic_write(path, lambda fh: _write_bytes(fh, text.encode("utf-8")))


def write_text(path: str | Path, text: str) -> Path:
    """Write UTF-8 text atomically."""
    return atomic_write(path, lambda fh: _write_bytes(fh, text.encode("utf-8")))


def _write_bytes(fh: BinaryIO, data: bytes) -> None:
    fh.write(data)


def write_figure(path: str | Path, draw: Callable[[Any], None],
                 figsize: tuple[float, float], field: str = "--plot") -> Path:
    """Draw a matplotlib figure with ``draw(fig)`` and write it atomically as .png or .svg
    (the suffix of ``path`` decides; figures are laid out tightly, labels unclipped).

    Raises
    ------
    ModelError: the suffix is not .png or .svg (named as ``field``), or ``draw`` raises.
    OutputError: the file cannot be written.
    """
    import io

    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    target = Path(path)
    fmt = target.suffix.lower().lstrip(".")
    if fmt not in ("png", "svg"):
        raise ModelError(f"figure type '.{fmt}' not supported", field=field,
                         expected="a .png or .svg file name")
    fig = plt.figure(figsize=figsize)
    try:
        draw(fig)
        fig.tight_layout()
        buf = io.BytesIO()
        fig.savefig(buf, format=fmt)
    finally:
        plt.close(fig)
    data = buf.getvalue()

    def put(fh: BinaryIO) -> None:
        fh.write(data)

    return atomic_write(target, put)

