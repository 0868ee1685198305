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

from shaftsys.errors import OutputError


def atomic_write(path: str | Path, write: Callable[[BinaryIO], None]) -> Path:
    """Write a file atomically.

    ``write`` receives a binary file object of a temporary file in the target folder;
    after it returns the file is flushed, synced and renamed over ``path``.

    Raises
    ------
    OutputError: the folder is missing or read-only, or the disk is full.
    """
    target = Path(path)
    folder = target.parent if str(target.parent) else Path(".")
    if not folder.is_dir():
        raise OutputError(f"cannot write {target}: the folder {folder} does not exist")
    fd = -1
    tmp = ""
    try:
        mode = _file_mode(target)
        fd, tmp = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".part", dir=folder)
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
        raise OutputError(f"cannot write {target}: permission denied") from None
    except OSError as exc:
        raise OutputError(f"cannot write {target}: {exc.strerror or exc}") from None
    finally:
        if fd >= 0:
            os.close(fd)
        if tmp:
            with contextlib.suppress(OSError):
                os.unlink(tmp)
    return target


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
