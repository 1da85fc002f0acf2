"""Atomic artifact writing: nothing half-written is ever left behind."""

from __future__ import annotations

import os
import tempfile
from pathlib import Path

from .errors import PlaforgeError

__all__ = ["write_text_atomic"]


def write_text_atomic(path: str | os.PathLike[str], text: str) -> Path:
    """Write ``text`` to ``path`` through a temporary file in the same directory and a rename.

    Raises
    ------
    PlaforgeError
        If the directory does not exist or cannot be written (exit status 2).
    """
    p = Path(path)
    directory = p.parent if str(p.parent) else Path(".")
    if not directory.is_dir():
        raise PlaforgeError(f"{p}: directory {str(directory)!r} does not exist; create it or choose another path")
    try:
        fd, tmp = tempfile.mkstemp(prefix=f".{p.name}.", suffix=".tmp", dir=directory)
    except OSError as exc:
        raise PlaforgeError(f"{p}: cannot write here ({exc.strerror})") from None
    try:
        with os.fdopen(fd, "w", encoding="utf-8", newline="\n") as fh:
            fh.write(text)
        os.replace(tmp, p)
    except BaseException:
        try:
            os.unlink(tmp)
        except OSError:
            pass
        raise
    return p
