"""Atomic artifact writing: nothing half-written is ever left behind, and file modes follow POSIX custom.

An artifact is written to a temporary file in the target's directory and renamed over the target, so a reader sees
either the old file or the whole new one. The temporary file is created with mode 0600, so before the rename it is
given the mode an ordinary ``open(path, "w")`` would have produced: ``0o666 & ~umask`` for a new file, the existing
file's permission bits when one is replaced.
"""

from __future__ import annotations

import os
import stat
import tempfile
import threading
from pathlib import Path

from .errors import PlaforgeError

__all__ = ["current_umask", "write_text_atomic"]

_UMASK_LOCK = threading.Lock()


def current_umask() -> int:
    """The process umask, read without leaving it changed.

    POSIX offers no call that only reads it; on Linux ``/proc/self/status`` has a ``Umask:`` line, which is read
    first. Elsewhere it is set and restored at once, under a lock so threads of this process that write through this
    module never see the temporary value.
    """
    try:
        with open("/proc/self/status", encoding="ascii") as fh:
            for line in fh:
                if line.startswith("Umask:"):
                    return int(line.split()[1], 8)
    except (OSError, ValueError, IndexError):
        pass
    with _UMASK_LOCK:
        mask = os.umask(0o022)
        os.umask(mask)
    return mask


def _target_mode(p: Path) -> int:
    try:
        st = os.stat(p)
    except FileNotFoundError:
        return 0o666 & ~current_umask()
    except OSError as exc:
        raise PlaforgeError(f"{p}: cannot write here ({exc.strerror})") from None
    if not stat.S_ISREG(st.st_mode):
        raise PlaforgeError(f"{p}: exists and is not a regular file; choose another path")
    return stat.S_IMODE(st.st_mode) & 0o777


def write_text_atomic(path: str | os.PathLike[str], text: str) -> Path:
    """Write ``text`` to ``path`` through a temporary file in the same directory and a rename.

    A new file gets mode ``0o666 & ~umask``; a replaced file keeps its permission bits.

    Raises
    ------
    PlaforgeError
        If the directory does not exist or cannot be written, or ``path`` is not a regular file (exit status 2).
    """
    p = Path(path)
    directory = p.parent if str(p.parent) else Path(".")
    if not directory.is_dir():
        raise PlaforgeError(f"{p}: directory {str(directory)!r} does not exist; create it or choose another path")
    mode = _target_mode(p)
    try:
        fd, tmp = tempfile.mkstemp(prefix=f".{p.name}.", suffix=".tmp", dir=directory)
    except OSError as exc:
        raise PlaforgeError(f"{p}: cannot write here ({exc.strerror})") from None
    try:
        with os.fdopen(fd, "w", encoding="utf-8", newline="\n") as fh:
            fh.write(text)
            os.fchmod(fh.fileno(), mode)
        os.replace(tmp, p)
    except BaseException:
        try:
            os.unlink(tmp)
        except OSError:
            pass
        raise
    return p
