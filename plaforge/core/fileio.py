"""Artifact writing: nothing half-written is ever left behind, no input is ever overwritten, and file modes follow
POSIX custom.

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
from collections.abc import Sequence
from pathlib import Path

from .errors import PlaforgeError

__all__ = ["current_umask", "make_directory", "refuse_clobbering", "same_file", "write_text_atomic"]

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
        if directory.exists():
            raise PlaforgeError(f"{p}: {str(directory)!r} is not a directory; choose another path")
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


def same_file(a: str | os.PathLike[str], b: str | os.PathLike[str]) -> bool:
    """Whether two paths name one file: equal once resolved (symbolic links, ``..``), or hard links of one file."""
    if os.path.normcase(os.path.realpath(a)) == os.path.normcase(os.path.realpath(b)):
        return True
    try:
        return os.path.samefile(a, b)
    except OSError:  # one of them does not exist (yet): then only equal resolved paths are the same file
        return False


def refuse_clobbering(inputs: Sequence[tuple[str, str | os.PathLike[str]]],
                      outputs: Sequence[tuple[str, str | os.PathLike[str] | None]]) -> None:
    """Refuse, before any work, outputs that would overwrite an input or each other.

    Parameters
    ----------
    inputs, outputs : sequence of (label, path)
        ``label`` is what the user typed to give the path (``"SPEC"``, ``"-o"``, ``"--verilog"``); outputs given
        as ``None`` are not written and are skipped.

    Raises
    ------
    PlaforgeError
        Naming both paths and both labels (exit status 2).
    """
    given = [(label, p) for label, p in outputs if p is not None]
    for k, (label, p) in enumerate(given):
        for in_label, q in inputs:
            if same_file(p, q):
                raise PlaforgeError(f"{label} {os.fspath(p)} is {in_label} {os.fspath(q)}; writing it would destroy "
                                    f"the input, choose another output path")
        for other_label, q in given[:k]:
            if same_file(p, q):
                raise PlaforgeError(f"{other_label} {os.fspath(q)} and {label} {os.fspath(p)} are the same file; "
                                    f"give each output its own path")


def make_directory(path: str | os.PathLike[str]) -> Path:
    """``path`` as a writable directory, created (with its parents) if missing.

    Raises
    ------
    PlaforgeError
        If a file is in the way, the directory cannot be created, or it cannot be written (exit status 2).
    """
    p = Path(path)
    try:
        p.mkdir(parents=True, exist_ok=True)
    except FileExistsError:
        raise PlaforgeError(f"{p}: exists and is not a directory; choose another output directory") from None
    except OSError as exc:
        raise PlaforgeError(f"{p}: cannot create the directory ({exc.strerror})") from None
    if not os.access(p, os.W_OK | os.X_OK):
        raise PlaforgeError(f"{p}: the directory is not writable; choose another output directory")
    return p
